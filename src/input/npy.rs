//! Reading a 3-way array from a `.npy` file (the array format of numpy, versions 1.0, 2.0
//! and 3.0): a magic string, a header (a Python dictionary literal with `descr`,
//! `fortran_order` and `shape`), then the values in C (last index fastest) or Fortran
//! (first index fastest) order.
//!
//! Accepted element types: signed and unsigned integers of 1, 2, 4 and 8 bytes, booleans,
//! and floats of 2, 4 and 8 bytes, in either byte order; floats are read exactly or
//! refused (see [`super::numbers`]). The array `T` of shape `(a, b, c)` is the bilinear map
//! with `c[i][j][k] = T[i, j, k]` (or the algebra, when asked and `a = b = c`).
//!
//! Every refusal is located: a byte offset in the header (`byte 23`), or the index of an
//! element (`element [2, 0, 1]`). The shape is checked against the limits before any value
//! is read, and the nonzero values are counted (at most [`crate::tensor::MAX_NONZERO`])
//! before any is stored. Cost: linear in the file.

use super::ReadOptions;
use super::numbers::{f32_value, float_value};
use crate::error::{Error, Result};
use crate::scalar::{FieldSpec, Q};
use crate::tensor::{Kind, Tensor, check_nonzero, check_shape};
use num_bigint::BigInt;

/// The magic bytes that open every `.npy` file.
pub const NPY_MAGIC: &[u8] = b"\x93NUMPY";

/// The type of the elements.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Elem {
    Int(usize),
    UInt(usize),
    Float(usize),
    Bool,
}

/// A Python literal of the header.
#[derive(Clone, Debug, PartialEq)]
enum Py {
    Str(String),
    Bool(bool),
    Int(u64),
    Tuple(Vec<Py>),
}

fn err(file: &str, at: String, message: impl Into<String>) -> Error {
    Error::Data {
        file: file.to_string(),
        at,
        message: message.into(),
    }
}

/// A parser of the header's dictionary literal, with byte offsets in the file.
struct Header<'a> {
    b: &'a [u8],
    i: usize,
    base: usize,
    file: &'a str,
}

impl Header<'_> {
    fn fail(&self, message: impl Into<String>) -> Error {
        err(self.file, format!("byte {}", self.base + self.i), message)
    }

    fn ws(&mut self) {
        while self.i < self.b.len() && matches!(self.b[self.i], b' ' | b'\t' | b'\n' | b'\r') {
            self.i += 1;
        }
    }

    fn found(&self) -> String {
        match self.b.get(self.i) {
            None => "the end of the header".into(),
            Some(c) if c.is_ascii_graphic() => format!("`{}`", *c as char),
            Some(c) => format!("the byte 0x{c:02X}"),
        }
    }

    fn expect(&mut self, c: u8) -> Result<()> {
        self.ws();
        if self.b.get(self.i) == Some(&c) {
            self.i += 1;
            Ok(())
        } else {
            Err(self.fail(format!(
                "invalid .npy header: expected `{}`, found {}",
                c as char,
                self.found()
            )))
        }
    }

    fn value(&mut self, depth: usize) -> Result<Py> {
        self.ws();
        match self.b.get(self.i) {
            Some(b'\'' | b'"') => {
                let q = self.b[self.i];
                let start = self.i + 1;
                let len = self.b[start..]
                    .iter()
                    .position(|&c| c == q)
                    .ok_or_else(|| self.fail("invalid .npy header: a string is not closed"))?;
                let s = &self.b[start..start + len];
                if !s.iter().all(|c| c.is_ascii_graphic() || *c == b' ') {
                    return Err(self.fail("invalid .npy header: a string holds binary data"));
                }
                self.i = start + len + 1;
                Ok(Py::Str(String::from_utf8_lossy(s).into_owned()))
            }
            Some(b'(') if depth < 2 => {
                self.i += 1;
                let mut items = Vec::new();
                loop {
                    self.ws();
                    if self.b.get(self.i) == Some(&b')') {
                        self.i += 1;
                        return Ok(Py::Tuple(items));
                    }
                    items.push(self.value(depth + 1)?);
                    self.ws();
                    match self.b.get(self.i) {
                        Some(b',') => self.i += 1,
                        Some(b')') => {}
                        _ => {
                            return Err(self.fail(format!(
                                "invalid .npy header: expected `,` or `)`, found {}",
                                self.found()
                            )));
                        }
                    }
                }
            }
            Some(c) if c.is_ascii_digit() => {
                let start = self.i;
                while self.b.get(self.i).is_some_and(u8::is_ascii_digit) {
                    self.i += 1;
                }
                let text = std::str::from_utf8(&self.b[start..self.i]).unwrap_or("");
                if self.b.get(self.i) == Some(&b'L') {
                    self.i += 1;
                }
                text.parse().map(Py::Int).map_err(|_| {
                    err(
                        self.file,
                        format!("byte {}", self.base + start),
                        format!("the number {text} is too large for a dimension"),
                    )
                })
            }
            _ => {
                for (w, v) in [("True", true), ("False", false)] {
                    if self.b[self.i..].starts_with(w.as_bytes()) {
                        self.i += w.len();
                        return Ok(Py::Bool(v));
                    }
                }
                Err(self.fail(format!(
                    "invalid .npy header: expected a value (a string, True, False, a number \
                     or a tuple), found {}",
                    self.found()
                )))
            }
        }
    }

    /// The dictionary: `(key, byte offset of its value, value)`.
    fn dict(&mut self) -> Result<Vec<(String, usize, Py)>> {
        self.expect(b'{')?;
        let mut out: Vec<(String, usize, Py)> = Vec::new();
        loop {
            self.ws();
            if self.b.get(self.i) == Some(&b'}') {
                self.i += 1;
                break;
            }
            let kat = self.base + self.i;
            let Py::Str(key) = self.value(0)? else {
                return Err(err(
                    self.file,
                    format!("byte {kat}"),
                    "invalid .npy header: expected a key in quotes",
                ));
            };
            if !["descr", "fortran_order", "shape"].contains(&key.as_str()) {
                return Err(err(
                    self.file,
                    format!("byte {kat}"),
                    format!(
                        "invalid .npy header: unknown key '{key}' (expected 'descr', \
                         'fortran_order', 'shape')"
                    ),
                ));
            }
            if out.iter().any(|e| e.0 == key) {
                return Err(err(
                    self.file,
                    format!("byte {kat}"),
                    format!("invalid .npy header: the key '{key}' is given twice"),
                ));
            }
            self.expect(b':')?;
            self.ws();
            let vat = self.base + self.i;
            let v = self.value(0)?;
            out.push((key, vat, v));
            self.ws();
            match self.b.get(self.i) {
                Some(b',') => self.i += 1,
                Some(b'}') => {}
                _ => {
                    return Err(self.fail(format!(
                        "invalid .npy header: expected `,` or `}}`, found {}",
                        self.found()
                    )));
                }
            }
        }
        self.ws();
        if self.i < self.b.len() {
            return Err(self.fail(format!(
                "invalid .npy header: expected the end of the header, found {}",
                self.found()
            )));
        }
        Ok(out)
    }
}

/// The element type and byte order of a `descr` such as `<f8`.
fn parse_descr(d: &str) -> std::result::Result<(Elem, bool), String> {
    let bad = || {
        format!(
            "unsupported element type '{d}': expected integers (<i1, <i2, <i4, <i8, <u1, ..., \
             <u8), booleans (|b1) or floats (<f2, <f4, <f8), in either byte order"
        )
    };
    let b = d.as_bytes();
    if b.len() < 3 {
        return Err(bad());
    }
    let big = match b[0] {
        b'<' | b'|' | b'=' => false,
        b'>' => true,
        _ => return Err(bad()),
    };
    let size: usize = d[2..].parse().map_err(|_| bad())?;
    let e = match (b[1], size) {
        (b'i', 1 | 2 | 4 | 8) => Elem::Int(size),
        (b'u', 1 | 2 | 4 | 8) => Elem::UInt(size),
        (b'f', 2 | 4 | 8) => Elem::Float(size),
        (b'b', 1) => Elem::Bool,
        _ => return Err(bad()),
    };
    Ok((e, big))
}

fn size_of(e: Elem) -> usize {
    match e {
        Elem::Int(s) | Elem::UInt(s) | Elem::Float(s) => s,
        Elem::Bool => 1,
    }
}

/// A half-precision float as a 32-bit float (exact).
fn f16_to_f32(h: u16) -> f32 {
    let sign = u32::from(h >> 15) << 31;
    let exp = u32::from((h >> 10) & 0x1f);
    let frac = u32::from(h & 0x3ff);
    let bits = match (exp, frac) {
        (0, 0) => sign,
        (0, f) => {
            // subnormal: f * 2^-24
            let v = f as f32 * (1.0 / 16_777_216.0);
            return if sign != 0 { -v } else { v };
        }
        (31, 0) => sign | 0x7f80_0000,
        (31, f) => sign | 0x7f80_0000 | (f << 13),
        (e, f) => sign | ((e + 112) << 23) | (f << 13),
    };
    f32::from_bits(bits)
}

/// The value of one element (little- or big-endian bytes), or `None` for zero.
fn element(
    raw: &[u8],
    e: Elem,
    big: bool,
    opts: &ReadOptions,
) -> std::result::Result<Option<Q>, String> {
    let mut buf = [0u8; 8];
    let n = raw.len();
    if big {
        for (k, &x) in raw.iter().rev().enumerate() {
            buf[k] = x;
        }
    } else {
        buf[..n].copy_from_slice(raw);
    }
    let u = u64::from_le_bytes(buf);
    if u == 0 {
        return Ok(None);
    }
    let round = opts.rationalize.as_ref();
    let q = match e {
        Elem::Bool => {
            if u != 1 {
                return Err(format!("expected a boolean (0 or 1), found the byte {u}"));
            }
            Q::from_integer(1.into())
        }
        Elem::UInt(_) => Q::from_integer(BigInt::from(u)),
        Elem::Int(s) => {
            let shift = 64 - 8 * s as u32;
            let v = ((u << shift) as i64) >> shift;
            Q::from_integer(BigInt::from(v))
        }
        Elem::Float(8) => {
            let x = f64::from_bits(u);
            if x == 0.0 {
                return Ok(None);
            }
            if x.fract() == 0.0 && x.abs() < 9.0e15 {
                Q::from_integer(BigInt::from(x as i64))
            } else {
                float_value(x, round)?
            }
        }
        Elem::Float(4) => {
            let x = f32::from_bits(u as u32);
            if x == 0.0 {
                return Ok(None);
            }
            f32_value(x, round)?
        }
        Elem::Float(_) => {
            let x = f16_to_f32(u as u16);
            if x == 0.0 {
                return Ok(None);
            }
            f32_value(x, round)?
        }
    };
    Ok(Some(q))
}

/// Parse the bytes of a `.npy` file holding a 3-way array. `source` names it in errors.
pub fn parse_npy(bytes: &[u8], source: &str, opts: &ReadOptions) -> Result<Tensor> {
    if !bytes.starts_with(NPY_MAGIC) {
        return Err(err(
            source,
            "byte 0".into(),
            "not a .npy file: expected the magic string \\x93NUMPY",
        ));
    }
    let (hlen, start): (usize, usize) = match (bytes.get(6), bytes.len()) {
        (Some(1), len) if len >= 10 => (u16::from_le_bytes([bytes[8], bytes[9]]) as usize, 10),
        (Some(2 | 3), len) if len >= 12 => (
            u32::from_le_bytes([bytes[8], bytes[9], bytes[10], bytes[11]]) as usize,
            12,
        ),
        (Some(1..=3), _) => {
            return Err(err(
                source,
                format!("byte {}", bytes.len()),
                "the .npy file ends inside its preamble",
            ));
        }
        (v, _) => {
            return Err(err(
                source,
                "byte 6".into(),
                format!(
                    "unsupported .npy format version {} (expected 1, 2 or 3)",
                    v.copied().unwrap_or(0)
                ),
            ));
        }
    };
    let end = start.saturating_add(hlen);
    if end > bytes.len() {
        return Err(err(
            source,
            format!("byte {}", start - 4),
            format!(
                "the header length {hlen} runs past the end of the file ({} bytes)",
                bytes.len()
            ),
        ));
    }
    let mut h = Header {
        b: &bytes[start..end],
        i: 0,
        base: start,
        file: source,
    };
    let dict = h.dict()?;
    let get = |k: &str| dict.iter().find(|e| e.0 == k);
    let missing = |k: &str| {
        err(
            source,
            format!("byte {start}"),
            format!("invalid .npy header: the key '{k}' is missing"),
        )
    };
    let (_, dat, descr) = get("descr").ok_or_else(|| missing("descr"))?;
    let (elem, big) = match descr {
        Py::Str(d) => parse_descr(d).map_err(|m| err(source, format!("byte {dat}"), m))?,
        _ => {
            return Err(err(
                source,
                format!("byte {dat}"),
                "'descr' must be a type string such as '<f8' (structured arrays are not read)",
            ));
        }
    };
    let (_, fat, fortran) = get("fortran_order").ok_or_else(|| missing("fortran_order"))?;
    let Py::Bool(fortran) = *fortran else {
        return Err(err(
            source,
            format!("byte {fat}"),
            "'fortran_order' must be True or False",
        ));
    };
    let (_, sat, shape) = get("shape").ok_or_else(|| missing("shape"))?;
    let dims: Vec<u64> = match shape {
        Py::Tuple(items) => items
            .iter()
            .map(|x| match x {
                Py::Int(d) => Ok(*d),
                _ => Err(err(
                    source,
                    format!("byte {sat}"),
                    "'shape' must be a tuple of integers",
                )),
            })
            .collect::<Result<_>>()?,
        _ => {
            return Err(err(
                source,
                format!("byte {sat}"),
                "'shape' must be a tuple of integers",
            ));
        }
    };
    if dims.len() != 3 {
        return Err(err(
            source,
            format!("byte {sat}"),
            format!(
                "expected a 3-way array (a shape (a, b, c)), found {} axes",
                dims.len()
            ),
        ));
    }
    let too_big = |d: &u64| *d > crate::tensor::MAX_DIM as u64 || *d == 0;
    if let Some(d) = dims.iter().find(|d| too_big(d)) {
        return Err(err(
            source,
            format!("byte {sat}"),
            format!(
                "dimension {d}: each dimension must be between 1 and {}",
                crate::tensor::MAX_DIM
            ),
        ));
    }
    let dims = [dims[0] as usize, dims[1] as usize, dims[2] as usize];
    check_shape(dims).map_err(|m| err(source, format!("byte {sat}"), m))?;
    let kind = kind_for(dims, opts).map_err(|m| err(source, format!("byte {sat}"), m))?;
    let size = size_of(elem);
    let count = dims[0] * dims[1] * dims[2];
    let data = &bytes[end..];
    if data.len() != count * size {
        return Err(err(
            source,
            format!("byte {end}"),
            format!(
                "the data holds {} bytes, but a {} x {} x {} array of '{}' needs {}",
                data.len(),
                dims[0],
                dims[1],
                dims[2],
                match descr {
                    Py::Str(d) => d.as_str(),
                    _ => "",
                },
                count * size
            ),
        ));
    }
    let index = |pos: usize| {
        if fortran {
            (
                pos % dims[0],
                (pos / dims[0]) % dims[1],
                pos / (dims[0] * dims[1]),
            )
        } else {
            (
                pos / (dims[1] * dims[2]),
                (pos / dims[2]) % dims[1],
                pos % dims[2],
            )
        }
    };
    let at = |pos: usize| {
        let (i, j, k) = index(pos);
        format!("element [{i}, {j}, {k}] (byte {})", end + pos * size)
    };
    // count the nonzero values before storing any (a float's sign bit alone is -0.0)
    let sign_byte = if big { 0 } else { size - 1 };
    let mut nonzero = 0usize;
    for (pos, raw) in data.chunks_exact(size).enumerate() {
        let zero = raw.iter().enumerate().all(|(b, &x)| {
            let x = if matches!(elem, Elem::Float(_)) && b == sign_byte {
                x & 0x7f
            } else {
                x
            };
            x == 0
        });
        if !zero {
            nonzero += 1;
            check_nonzero(nonzero).map_err(|m| err(source, at(pos), m))?;
        }
    }
    let mut t = Tensor::zero(FieldSpec::Rational, kind, dims, None);
    // visit in an order where, for each product (i, j), k increases (appends)
    for (pos, raw) in data.chunks_exact(size).enumerate() {
        match element(raw, elem, big, opts) {
            Ok(None) => {}
            Ok(Some(v)) => {
                let (i, j, k) = index(pos);
                t.set(i, j, k, v)
            }
            Err(m) => return Err(err(source, at(pos), m)),
        }
    }
    Ok(t)
}

/// The kind of an array's tensor: a bilinear map, or an algebra when asked (equal
/// dimensions required).
pub(super) fn kind_for(dims: [usize; 3], opts: &ReadOptions) -> std::result::Result<Kind, String> {
    if !opts.algebra {
        return Ok(Kind::Bilinear);
    }
    if dims[0] == dims[1] && dims[1] == dims[2] {
        Ok(Kind::Algebra)
    } else {
        Err(format!(
            "--as-algebra needs an n x n x n array, found {} x {} x {}",
            dims[0], dims[1], dims[2]
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scalar::q;

    /// A .npy file as numpy writes it (format 1.0, header padded to a multiple of 64).
    pub(crate) fn npy(descr: &str, fortran: bool, shape: [usize; 3], data: &[u8]) -> Vec<u8> {
        let mut h = format!(
            "{{'descr': '{descr}', 'fortran_order': {}, 'shape': ({}, {}, {}), }}",
            if fortran { "True" } else { "False" },
            shape[0],
            shape[1],
            shape[2]
        );
        while (10 + h.len() + 1) % 64 != 0 {
            h.push(' ');
        }
        h.push('\n');
        let mut out = NPY_MAGIC.to_vec();
        out.extend([1, 0]);
        out.extend((h.len() as u16).to_le_bytes());
        out.extend(h.as_bytes());
        out.extend(data);
        out
    }

    #[test]
    fn orders_and_types() {
        // T[i][j][k] = 100 i + 10 j + k on a 2 x 3 x 2 array
        let val = |i: usize, j: usize, k: usize| (100 * i + 10 * j + k) as i64;
        let mut c = Vec::new();
        let mut f = Vec::new();
        for i in 0..2 {
            for j in 0..3 {
                for k in 0..2 {
                    c.extend(val(i, j, k).to_le_bytes());
                }
            }
        }
        for k in 0..2 {
            for j in 0..3 {
                for i in 0..2 {
                    f.extend((val(i, j, k) as f64).to_be_bytes());
                }
            }
        }
        let o = ReadOptions::default();
        let a = parse_npy(&npy("<i8", false, [2, 3, 2], &c), "a", &o).unwrap();
        let b = parse_npy(&npy(">f8", true, [2, 3, 2], &f), "b", &o).unwrap();
        assert_eq!(a, b);
        assert_eq!(a.get(1, 2, 1), q(121, 1));
        assert_eq!(a.kind(), Kind::Bilinear);
        let e = parse_npy(
            &npy("<f8", false, [1, 1, 1], &0.1f64.to_le_bytes()),
            "z",
            &o,
        )
        .unwrap_err()
        .to_string();
        assert!(
            e.starts_with("z: element [0, 0, 0] (byte 128): the floating-point number 0.1"),
            "{e}"
        );
        let e = parse_npy(&npy("<c16", false, [1, 1, 1], &[0; 16]), "z", &o).unwrap_err();
        assert!(
            e.to_string().contains("unsupported element type '<c16'"),
            "{e}"
        );
        let e = parse_npy(&npy("<i4", false, [1, 1, 2], &[0; 4]), "z", &o).unwrap_err();
        assert!(e.to_string().contains("needs 8"), "{e}");
        assert_eq!(f16_to_f32(0x3800), 0.5);
        assert_eq!(f16_to_f32(0xc000), -2.0);
    }
}

#[cfg(test)]
mod limit_tests {
    use super::tests::npy;
    use super::*;

    /// More than 2^22 nonzero values are refused at the first one beyond the limit, before
    /// any is stored; zeros and -0.0 do not count.
    #[test]
    fn nonzero_limit_is_checked_before_storing() {
        let o = ReadOptions::default();
        let shape = [2048, 2048, 2];
        let e = parse_npy(&npy("|i1", false, shape, &vec![1u8; 1 << 23]), "z", &o)
            .unwrap_err()
            .to_string();
        assert!(e.starts_with("z: element [1024, 0, 0] (byte "), "{e}");
        assert!(e.contains("more than 2^22 = 4194304 nonzero"), "{e}");
        // 2^23 values -0.0 (float16, sign bit only) but three 1.0: three nonzero values
        let mut data = [0x00, 0x80].repeat(1 << 23);
        for n in [0, 5, (1 << 23) - 1] {
            data[2 * n + 1] = 0x3c;
        }
        let t = parse_npy(&npy("<f2", false, shape, &data), "z", &o).unwrap();
        assert_eq!(t.nnz(), 3);
    }
}
