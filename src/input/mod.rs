//! Reading and writing structure tensors in the formats of `docs/formats.md`.
//!
//! - [`parse_table`]: the plain-text table format (product lines, `unit`, grid blocks);
//! - [`parse_json`]: the coordinate JSON form;
//! - [`parse_npy`], [`parse_csv`], [`parse_nested_list`]: 3-way arrays as data tools write
//!   them (`.npy`, CSV slices or `i,j,k,value` rows, nested JSON lists), read as bilinear
//!   maps (or algebras when [`ReadOptions::algebra`] says so), floats exactly
//!   ([`numbers`]);
//! - [`write_table`], [`write_grid`], [`write_json`]: the inverse writers, with
//!   `parse(write(t)) == t` for every tensor whose names are valid basis names;
//! - [`load_input`]: resolve a command-line input (file, generator, catalog hook);
//! - [`parse_basis_file`], [`apply_basis_change`]: change-of-basis files.
//!
//! Invariants: parsers never panic; every refusal is an [`crate::error::Error::Parse`] with
//! a 1-based line and column (in characters) and a message saying what was expected and
//! what was found (an array file: [`crate::error::Error::Data`] at a byte or an element
//! index). Limits (documented): dimension 4096 per axis, 2^22 products (`dims[0] *
//! dims[1]`), 4096 digits per integer, 64 MiB per file.

mod basis_file;
mod combination;
mod csv_array;
mod cursor;
mod grid;
mod json;
pub mod json_tree;
mod load;
mod npy;
pub mod numbers;
mod products;
mod resolve;
mod table;
mod write;

#[cfg(test)]
mod limits_tests;
#[cfg(test)]
mod proptests;
#[cfg(test)]
mod tests;

pub use basis_file::{
    BasisChange, MatrixBlock, NamesLine, apply_basis_change, parse_basis_file, random_basis_change,
};
pub use csv_array::parse_csv;
pub use json::{
    json_coefficient, json_dims, json_field, json_list, json_required, json_value, parse_json,
    parse_json_with, parse_nested_list,
};
pub use load::{
    MAX_FILE_BYTES, load_input, load_input_with, parse_any, parse_any_with, parse_bytes,
    read_binary_file, read_text_file, text_from_bytes,
};
pub use npy::{NPY_MAGIC, parse_npy};
pub use numbers::Rationalize;
pub use resolve::{Resolver, register_resolver, resolve_registered};
pub use table::parse_table;
pub use write::{format_combination, write_grid, write_json, write_slices, write_table};

/// How input files are read (the options of the array readers).
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct ReadOptions {
    /// Read a 3-way array (`.npy`, CSV, nested JSON list) as an algebra (its three
    /// dimensions equal) instead of a bilinear map.
    pub algebra: bool,
    /// Round each float that is not exactly what it says to the simplest fraction within
    /// a tolerance (refused by default).
    pub rationalize: Option<Rationalize>,
}

/// Largest number of decimal digits accepted in a numerator or denominator.
pub const MAX_DIGITS: usize = 4096;

/// Check that a coefficient obtained by adding coefficients of an input (a name repeated
/// in a combination) still has at most [`MAX_DIGITS`] digits in its numerator and
/// denominator, so that everything read can be written and read back.
/// Cost: O(1) below about 13,600 bits, else one conversion to decimal.
pub fn check_digits(q: &crate::scalar::Q) -> std::result::Result<(), String> {
    let too_long =
        |x: &num_bigint::BigInt| x.bits() > 13_600 && x.magnitude().to_string().len() > MAX_DIGITS;
    if too_long(q.numer()) || too_long(q.denom()) {
        return Err(format!(
            "the coefficients here add up to a number with more than {MAX_DIGITS} digits \
             (the limit of docs/formats.md)"
        ));
    }
    Ok(())
}

/// True when `s` is a valid basis name: a letter or `_`, then letters, digits, `_`, `'`, `.`.
pub fn is_valid_name(s: &str) -> bool {
    let mut it = s.chars();
    match it.next() {
        Some(c) if cursor::is_name_start(c) => it.all(cursor::is_name_char),
        _ => false,
    }
}
