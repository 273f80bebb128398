//! Resolving an input argument for the catalog commands: an existing file (table format),
//! then a catalog name.

use bilin::error::Error;
use bilin::tensor::Tensor;

/// Load an input: a table file if the path exists, otherwise a catalog name.
pub fn load(arg: &str) -> Result<Tensor, Error> {
    if std::path::Path::new(arg).exists() {
        let text = std::fs::read_to_string(arg).map_err(|e| Error::Io {
            path: arg.to_string(),
            message: e.to_string(),
        })?;
        return bilin::input::parse_table(&text, arg);
    }
    if let Ok(t) = bilin::generators::generate(arg) {
        return Ok(t);
    }
    bilin::catalog::catalog_tensor(arg).ok_or_else(|| {
        Error::Invalid(format!(
            "`{arg}` is neither a file, a generator nor a catalog name"
        ))
    })
}
