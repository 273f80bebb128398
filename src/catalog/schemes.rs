//! Schemes stored with the catalog: known bilinear algorithms for catalog entries, in the
//! text form of docs/schemes.md, embedded from `catalog/schemes/<entry>.<label>.txt`.
//! Each file's first comment line names its source: a publication, or for the label
//! `found` the `bilin search` command and seed that produced it.
//!
//! Invariant (checked by the test suite): every stored scheme reads against its entry's
//! tensor and verifies exactly; the list below matches the directory.

use super::store::find_entry;
use crate::error::{Error, Result};
use crate::scheme::build::{BaseScheme, Built, build_matmul};
use crate::scheme::{Scheme, parse_scheme, verify};

/// One stored scheme: the entry it belongs to, a short label, its file name and text.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct StoredScheme {
    pub entry: &'static str,
    pub label: &'static str,
    pub file: &'static str,
    pub text: &'static str,
}

macro_rules! stored {
    ($entry:literal, $label:literal) => {
        StoredScheme {
            entry: $entry,
            label: $label,
            file: concat!($entry, ".", $label, ".txt"),
            text: include_str!(concat!(
                "../../catalog/schemes/",
                $entry,
                ".",
                $label,
                ".txt"
            )),
        }
    };
}

/// Every stored scheme, in file-name order.
pub const STORED_SCHEMES: &[StoredScheme] = &[
    stored!("complex", "gauss"),
    stored!("matmul222", "strassen"),
    stored!("matmul223", "found"),
    stored!("matmul224", "found"),
    stored!("matmul225", "found"),
    stored!("matmul233", "found"),
    stored!("matmul234", "found"),
    stored!("matmul235", "found"),
    stored!("matmul244", "found"),
    stored!("matmul245", "found"),
    stored!("matmul255", "found"),
    stored!("matmul333", "found"),
    stored!("matmul334", "found"),
    stored!("matmul335", "found"),
    stored!("matmul344", "found"),
    stored!("matmul345", "found"),
    stored!("matmul345", "gf2"),
    stored!("matmul355", "found"),
    stored!("matmul445", "found"),
    stored!("matmul455", "found"),
    stored!("matmul455", "gf2"),
    stored!("matmul555", "found"),
    stored!("matmul555", "gf2"),
    stored!("polymul2", "karatsuba"),
    stored!("polymul3", "toom3"),
    stored!("polymul4", "found"),
];

impl StoredScheme {
    /// The source named on the file's first comment line.
    pub fn source(&self) -> &'static str {
        self.text
            .lines()
            .next()
            .and_then(|l| l.strip_prefix('#'))
            .map(str::trim)
            .unwrap_or("")
    }

    /// The field named on the file's `field` line, if any.
    pub fn field(&self) -> Option<crate::scalar::FieldSpec> {
        self.text
            .lines()
            .map(str::trim)
            .find_map(|l| l.strip_prefix("field "))
            .and_then(|f| crate::scalar::FieldSpec::parse(f.trim()).ok())
    }

    /// The dimensions of the tensor the scheme is for (its catalog entry's), without
    /// reading the scheme.
    pub fn dims(&self) -> Option<[usize; 3]> {
        find_entry(self.entry)?.tensor().ok().map(|t| t.dims())
    }

    /// The scheme read against its entry's tensor (reduced mod p for a scheme stored over
    /// GF(p)) and verified exactly. An `Err` is a defect of the catalog (the test suite
    /// catches it).
    pub fn read(&self) -> Result<Scheme> {
        let e = find_entry(self.entry).ok_or_else(|| {
            Error::Invalid(format!("{}: no catalog entry `{}`", self.file, self.entry))
        })?;
        let t = e.tensor()?;
        // a scheme stored over GF(p) (a `field GF(p)` line: found over GF(p), it does not
        // lift) is read and verified against the entry's tensor reduced mod p
        let t = match self.field() {
            Some(f) if f != t.field() => t.with_field(f).map_err(Error::Invalid)?,
            _ => t,
        };
        let s = parse_scheme(self.text, self.file, &t)?;
        verify(&s, &t).map_err(|m| {
            Error::Invalid(format!(
                "{}: the stored scheme does not verify ({} wrong coefficients)",
                self.file, m.count
            ))
        })?;
        Ok(s)
    }
}

/// The stored scheme named `entry.label` (or its file name `entry.label.txt`),
/// case-insensitive.
pub fn find_stored(name: &str) -> Option<&'static StoredScheme> {
    let n = name.trim();
    let n = n.strip_suffix(".txt").unwrap_or(n);
    STORED_SCHEMES.iter().find(|s| {
        s.file
            .strip_suffix(".txt")
            .is_some_and(|f| f.eq_ignore_ascii_case(n))
    })
}

/// The stored schemes of an entry (by its name, case-insensitive), in file-name order.
pub fn stored_schemes(entry: &str) -> Vec<&'static StoredScheme> {
    STORED_SCHEMES
        .iter()
        .filter(|s| s.entry.eq_ignore_ascii_case(entry))
        .collect()
}

/// The stored schemes of matrix formats (entries built by `matmul:n,m,p`) as building
/// blocks for [`crate::scheme::build::build_matmul`], over `field` (schemes whose
/// coefficients do not reduce into it are left out), each named `entry.label`.
/// Cost: reading and verifying the stored schemes of matrix formats.
pub fn matmul_bases(field: crate::scalar::FieldSpec) -> Vec<BaseScheme> {
    STORED_SCHEMES
        .iter()
        .filter_map(|st| {
            let e = find_entry(st.entry)?;
            let spec = e.meta.generate.as_deref()?.trim().strip_prefix("matmul:")?;
            let f: Vec<usize> = spec
                .split(',')
                .map(|x| x.trim().parse().ok())
                .collect::<Option<_>>()?;
            let format: [usize; 3] = f.try_into().ok()?;
            let scheme = st.read().ok()?.with_field(field).ok()?;
            Some(BaseScheme {
                format,
                scheme,
                name: st.file.trim_end_matches(".txt").to_string(),
            })
        })
        .collect()
}

/// The best scheme of `<n,m,p>` over `field` built from the stored schemes (products,
/// direct sums along an axis, the symmetries of the format; see
/// [`crate::scheme::build`]), verified exactly. For a format with a stored scheme of the
/// lowest rank this is that scheme. Cost: that of [`matmul_bases`] and
/// [`crate::scheme::build::build_matmul`].
pub fn best_matmul_scheme(nmp: [usize; 3], field: crate::scalar::FieldSpec) -> Result<Built> {
    build_matmul(nmp, field, &matmul_bases(field))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stored_schemes_verify_and_match_the_directory() {
        for s in STORED_SCHEMES {
            let scheme = s.read().unwrap();
            assert!(!s.source().is_empty(), "{} names no source", s.file);
            assert!(scheme.rank() > 0);
        }
        let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/catalog/schemes");
        let mut on_disk: Vec<String> = std::fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        on_disk.sort();
        let listed: Vec<&str> = STORED_SCHEMES.iter().map(|s| s.file).collect();
        assert_eq!(on_disk, listed);
        // Strassen 1969: rank 7 for <2,2,2>; Karatsuba and Ofman 1962: rank 3 for 2x2 -> 3
        assert_eq!(stored_schemes("matmul222")[0].read().unwrap().rank(), 7);
        assert_eq!(stored_schemes("POLYMUL2")[0].read().unwrap().rank(), 3);
        assert!(stored_schemes("octonions").is_empty());
    }

    /// Formats without a stored scheme get one built from the stored ones: <4,4,4> at 49
    /// (Strassen 1969, on 2 x 2 blocks), <2,4,5> at most 34 (<2,4,4> + <2,4,1>; the
    /// published 33 is Hopcroft and Kerr 1971); a stored format gets its stored rank.
    #[test]
    fn built_schemes_for_matrix_formats() {
        use crate::scalar::FieldSpec;
        let bases = matmul_bases(FieldSpec::Rational);
        assert!(
            bases
                .iter()
                .any(|b| b.format == [2, 2, 2] && b.scheme.rank() == 7)
        );
        let b = best_matmul_scheme([4, 4, 4], FieldSpec::Rational).unwrap();
        assert_eq!(b.scheme.rank(), 49, "{}", b.how);
        let b = best_matmul_scheme([2, 4, 5], FieldSpec::Rational).unwrap();
        assert!(b.scheme.rank() <= 34, "{}", b.how);
        let b = best_matmul_scheme([3, 3, 3], FieldSpec::Rational).unwrap();
        assert_eq!((b.scheme.rank(), b.how.as_str()), (23, "matmul333.found"));
        // over GF(2): only the stored schemes that reduce mod 2
        let b = best_matmul_scheme([4, 4, 4], FieldSpec::Prime(2)).unwrap();
        assert!(b.scheme.rank() <= 49);
    }
}
