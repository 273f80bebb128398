//! `bilin emit INPUT SCHEME_FILE --lang c|rust|python|latex`: code out for a verified scheme.

use super::scheme_io::{fail, load_scheme, load_tensor};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::scheme::emit::{EmitParams, Lang, emit};

#[derive(clap::Args)]
pub struct Args {
    /// The tensor: a file, a generator spec such as matmul:2,2,2, or a catalog name.
    pub input: String,
    /// The scheme file (text or JSON form).
    pub scheme: String,
    /// Target: c, rust, python or latex.
    #[arg(long)]
    pub lang: String,
    /// Name of the emitted function.
    #[arg(long, default_value = "bilin_mul")]
    pub function: String,
    /// Read the input over this field (Q or GF(p)).
    #[arg(long)]
    pub field: Option<String>,
}

pub fn run(a: &Args) -> i32 {
    let lang = match Lang::parse(&a.lang) {
        Ok(l) => l,
        Err(e) => return fail(&e),
    };
    let t = match load_tensor(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(e) => return fail(&e),
    };
    let s = match load_scheme(&a.scheme, &t) {
        Ok(s) => s,
        Err(e) => return fail(&e),
    };
    if bilin::scheme::verify(&s, &t).is_err() {
        eprintln!(
            "error: the scheme does not verify for {}; run `bilin verify` for details",
            a.input
        );
        return EXIT_FALSE;
    }
    let p = EmitParams {
        function: a.function.clone(),
        title: a.input.clone(),
    };
    match emit(&s, &t, lang, &p) {
        Ok(code) => {
            print!("{code}");
            EXIT_OK
        }
        Err(e) => fail(&e),
    }
}
