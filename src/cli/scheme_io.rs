//! Shared helpers of the scheme subcommands: loading an input tensor and a scheme file.
//!
//! `load_tensor` resolves an input (file, generator spec such as `matmul:2,2,2`, or catalog
//! name) through the shared loader `bilin::input::load_input`.

use bilin::error::Error;
use bilin::scalar::FieldSpec;
use bilin::scheme::Scheme;
use bilin::tensor::Tensor;

/// Load an input (file, generator spec or catalog name), over `field` if given.
pub fn load_tensor(spec: &str, field: Option<&str>) -> Result<Tensor, Error> {
    let field = match field {
        None => None,
        Some(f) => Some(FieldSpec::parse(f).map_err(|m| Error::Invalid(format!("--field: {m}")))?),
    };
    bilin::input::load_input(spec, field)
}

/// Read a scheme file (text or JSON form) against a tensor, within the input size limit.
pub fn load_scheme(path: &str, t: &Tensor) -> Result<Scheme, Error> {
    read_scheme_file(path, t).map(|x| x.0)
}

/// Read a scheme file against a tensor, keeping the lines of the text form (`None` for a
/// JSON file) and the file's text. A name that is no file but names a scheme stored with
/// the catalog (`matmul222.strassen`, see `bilin catalog show`) reads that scheme.
pub fn read_scheme_file(
    path: &str,
    t: &Tensor,
) -> Result<(Scheme, Option<bilin::scheme::text::LineMap>, String), Error> {
    if !std::path::Path::new(path).exists()
        && let Some(s) = bilin::catalog::find_stored(path)
    {
        let (sc, lines) = bilin::scheme::parse_scheme_located(s.text, s.file, t)?;
        return Ok((sc, lines, s.text.to_string()));
    }
    let text = bilin::input::read_text_file(path)?;
    let (s, lines) = bilin::scheme::parse_scheme_located(&text, path, t)?;
    Ok((s, lines, text))
}

/// `<n,m,p>` from a spec `matmul:n,m,p`, or from an explicit `n,m,p`.
pub fn matmul_format(spec: &str, explicit: Option<&str>) -> Option<[usize; 3]> {
    let s = match explicit {
        Some(e) => e,
        None => spec.trim().strip_prefix("matmul:")?,
    };
    let v: Vec<usize> = s
        .split(',')
        .map(|x| x.trim().parse().ok())
        .collect::<Option<Vec<_>>>()?;
    (v.len() == 3).then(|| [v[0], v[1], v[2]])
}

pub use super::common::report_error as fail;
