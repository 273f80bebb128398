//! `bilin verify INPUT SCHEME_FILE`: exact verification of a scheme.

use super::scheme_io::{fail, load_scheme, load_tensor};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::scalar::q_to_string;

#[derive(clap::Args)]
pub struct Args {
    /// The tensor: a file, a generator spec such as matmul:2,2,2, or a catalog name.
    pub input: String,
    /// The scheme file (text or JSON form, see docs/schemes.md).
    pub scheme: String,
    /// Read the input over this field (Q or GF(p)).
    #[arg(long)]
    pub field: Option<String>,
    /// Also write a picture of the scheme (U, V, W side by side, SVG) to this file.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<String>,
}

pub fn run(a: &Args) -> i32 {
    let t = match load_tensor(&a.input, a.field.as_deref()) {
        Ok(t) => t,
        Err(e) => return fail(&e),
    };
    let s = match load_scheme(&a.scheme, &t) {
        Ok(s) => s,
        Err(e) => return fail(&e),
    };
    if let Some(path) = &a.svg
        && let Err(code) = super::draw::write_scheme_picture(&s, &t, &a.scheme, path)
    {
        return code;
    }
    let d = t.dims();
    match bilin::scheme::verify(&s, &t) {
        Ok(()) => {
            println!(
                "verified: rank {} scheme for {} ({}x{}x{}, over {})",
                s.rank(),
                a.input,
                d[0],
                d[1],
                d[2],
                t.field().name()
            );
            EXIT_OK
        }
        Err(m) => {
            let [i, j, k] = m.index;
            println!(
                "NOT verified: the coefficient of {} in {}*{} is {} but the scheme gives {}; {} coefficient{} wrong",
                t.name(2, k),
                t.name(0, i),
                t.name(1, j),
                q_to_string(&m.expected),
                q_to_string(&m.got),
                m.count,
                if m.count == 1 { " is" } else { "s are" }
            );
            EXIT_FALSE
        }
    }
}
