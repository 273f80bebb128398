//! `bilin scheme ...`: work with schemes as data — convert, cost, polish, equivalence, and
//! build new schemes (kron, sum, permute, cyclic, transpose, restrict, standard). Every
//! scheme printed is verified exactly against its tensor first.

use super::scheme_io::{fail, load_scheme, load_tensor, matmul_format};
use super::{EXIT_FALSE, EXIT_OK};
use bilin::error::Error;
use bilin::scheme::construct as cs;
use bilin::scheme::cost::{Objective, count_cost};
use bilin::scheme::polish::{PolishParams, exponent, polish};
use bilin::scheme::{Scheme, json, text, verify};
use bilin::tensor::Tensor;
use clap::Subcommand;

#[derive(clap::Args)]
pub struct Args {
    #[command(subcommand)]
    pub op: Op,
}

/// One input tensor and one scheme file.
#[derive(clap::Args)]
pub struct One {
    /// The tensor: a file, a generator spec such as matmul:2,2,2, or a catalog name.
    pub input: String,
    /// The scheme file (text or JSON form), or the name of a scheme stored with the catalog
    /// (`matmul222.strassen`; see `bilin catalog show`).
    pub scheme: String,
    /// Read the input over this field (Q or GF(p)).
    #[arg(long)]
    pub field: Option<String>,
    /// Print the JSON form instead of the text form.
    #[arg(long)]
    pub json: bool,
}

/// Two tensors with a scheme each.
#[derive(clap::Args)]
pub struct Two {
    pub input1: String,
    pub scheme1: String,
    pub input2: String,
    pub scheme2: String,
    #[arg(long)]
    pub field: Option<String>,
    #[arg(long)]
    pub json: bool,
}

#[derive(Subcommand)]
pub enum Op {
    /// Print a scheme in the text form (or JSON with --json).
    Convert(One),
    /// The standard scheme of a tensor (one multiplication per nonzero coefficient).
    Standard {
        input: String,
        #[arg(long)]
        field: Option<String>,
        #[arg(long)]
        json: bool,
    },
    /// Every measure of the cost model: multiplications, additions before and after
    /// common-subexpression elimination, multiplications by constants, nonzeros, the
    /// largest numerator and denominator.
    Cost {
        #[command(flatten)]
        one: One,
        /// The matrix format n,m,p for the exponent (default: from a matmul:n,m,p input).
        #[arg(long)]
        format: Option<String>,
    },
    /// Search the tensor's symmetries for a scheme better on an objective (never worse);
    /// re-verified.
    Polish {
        #[command(flatten)]
        one: One,
        /// The matrix format n,m,p (default: from a matmul:n,m,p input): enables the
        /// sandwich moves and the cyclic and transposed forms.
        #[arg(long)]
        format: Option<String>,
        /// What to lower: multiplications, additions, scalings (multiplications by
        /// constants other than +-1), nonzeros or coefficients (largest denominator, then
        /// numerator).
        #[arg(long, default_value = "additions")]
        objective: String,
        /// Most candidate schemes to evaluate (bounds the work).
        #[arg(long, default_value_t = 3000)]
        evaluations: usize,
    },
    /// Decide whether two schemes of one tensor are equivalent under its symmetries
    /// (exit 0: equivalent, with a verified transformation; 1: not equivalent, with a
    /// separating invariant, or undecided).
    Equiv {
        /// The tensor: a file, a generator spec such as matmul:2,2,2, or a catalog name.
        input: String,
        /// The first scheme file.
        scheme1: String,
        /// The second scheme file.
        scheme2: String,
        #[arg(long)]
        field: Option<String>,
        /// The matrix format n,m,p (default: from a matmul:n,m,p input).
        #[arg(long)]
        format: Option<String>,
        /// Most search nodes per form of the first scheme.
        #[arg(long, default_value_t = 200_000)]
        max_nodes: usize,
        /// Print a JSON report.
        #[arg(long)]
        json: bool,
    },
    /// Kronecker product; with --matmul both inputs are matmul:n,m,p and the result is
    /// reordered to matmul:nn',mm',pp'.
    Kron {
        #[command(flatten)]
        two: Two,
        #[arg(long)]
        matmul: bool,
    },
    /// Direct sum (block diagonal).
    Sum(Two),
    /// Matrix multiplication: join schemes of matmul:n,m,p and one that agrees on the two
    /// other sides along --axis n, m or p (e.g. <2,2,3> and <2,2,1> along p give <2,2,4>;
    /// rank r1 + r2).
    Join {
        #[command(flatten)]
        two: Two,
        #[arg(long)]
        axis: String,
    },
    /// Matrix multiplication: the best scheme of matmul:n,m,p that products, joins along an
    /// axis and the symmetries build from the catalog's stored schemes and schoolbook
    /// schemes, verified exactly (its construction on the title line).
    Build {
        input: String,
        /// Build the scheme over this field (Q or GF(p); stored schemes with denominators
        /// divisible by p are left out).
        #[arg(long)]
        field: Option<String>,
        #[arg(long)]
        json: bool,
    },
    /// Permute the axes: --axes 1,2,0 means new axis a is old axis axes[a].
    Permute {
        #[command(flatten)]
        one: One,
        #[arg(long)]
        axes: String,
    },
    /// Matrix multiplication: a scheme for <n,m,p> gives one for <m,p,n>.
    Cyclic {
        #[command(flatten)]
        one: One,
        #[arg(long)]
        format: Option<String>,
    },
    /// Matrix multiplication: a scheme for <n,m,p> gives one for <p,m,n> ((AB)^T = B^T A^T).
    Transpose {
        #[command(flatten)]
        one: One,
        #[arg(long)]
        format: Option<String>,
    },
    /// Matrix multiplication: restrict a scheme for <n,m,p> to <n',m',p'> (--to n',m',p').
    Restrict {
        #[command(flatten)]
        one: One,
        #[arg(long)]
        to: String,
        #[arg(long)]
        format: Option<String>,
    },
}

fn both(one: &One) -> Result<(Tensor, Scheme), Error> {
    let t = load_tensor(&one.input, one.field.as_deref())?;
    let s = load_scheme(&one.scheme, &t)?;
    Ok((t, s))
}

fn fmt_of(input: &str, explicit: Option<&str>) -> Result<[usize; 3], Error> {
    matmul_format(input, explicit).ok_or_else(|| {
        Error::Invalid(format!(
            "give the matrix format with --format n,m,p (input `{input}` is not matmul:n,m,p)"
        ))
    })
}

fn matmul_tensor(f: [usize; 3], field: Option<&str>) -> Result<Tensor, Error> {
    load_tensor(&format!("matmul:{},{},{}", f[0], f[1], f[2]), field)
}

/// Verify and print; exit 1 if the result does not verify (a bug or a bad input scheme).
fn show(s: &Scheme, t: &Tensor, title: &str, json_out: bool) -> i32 {
    if let Err(m) = verify(s, t) {
        eprintln!(
            "error: the resulting scheme does not verify ({} wrong coefficients); was the input scheme correct? (`bilin verify`)",
            m.count
        );
        return EXIT_FALSE;
    }
    if json_out {
        print!("{}", json::write_json(s));
    } else {
        print!(
            "{}",
            text::write_text(
                s,
                t,
                &format!("{title}\nrank {} scheme, verified exactly", s.rank())
            )
        );
    }
    EXIT_OK
}

pub(super) fn parse_list(s: &str) -> Result<Vec<usize>, Error> {
    s.split(',')
        .map(|x| {
            x.trim()
                .parse()
                .map_err(|_| Error::Invalid(format!("expected a list of integers, found `{s}`")))
        })
        .collect()
}

pub fn run(a: &Args) -> i32 {
    match run_op(&a.op) {
        Ok(code) => code,
        Err(e) => fail(&e),
    }
}

fn run_op(op: &Op) -> Result<i32, Error> {
    Ok(match op {
        Op::Convert(one) => {
            let (t, s) = both(one)?;
            show(&s, &t, &one.input, one.json)
        }
        Op::Standard { input, field, json } => {
            let t = load_tensor(input, field.as_deref())?;
            show(
                &Scheme::standard(&t),
                &t,
                &format!("standard scheme for {input}"),
                *json,
            )
        }
        Op::Cost { one, format } => {
            let (t, s) = both(one)?;
            if let Err(m) = verify(&s, &t) {
                eprintln!(
                    "error: the scheme does not verify ({} wrong coefficients)",
                    m.count
                );
                return Ok(EXIT_FALSE);
            }
            let c = count_cost(&s);
            let fmt = matmul_format(&one.input, format.as_deref());
            if one.json {
                let v = serde_json::json!({
                    "schema": "bilin.scheme-cost/1",
                    "input": one.input,
                    "rank": s.rank(),
                    "cost": c.to_json(),
                    "exponent": fmt.map(|f| exponent(s.rank(), f)),
                });
                println!("{}", serde_json::to_string_pretty(&v).unwrap_or_default());
            } else {
                let d = t.dims();
                println!(
                    "rank {} scheme for {} ({}x{}x{}), verified",
                    s.rank(),
                    one.input,
                    d[0],
                    d[1],
                    d[2]
                );
                for l in c.lines() {
                    println!("{l}");
                }
                if let Some(f) = fmt {
                    println!(
                        "exponent 3 log r / log(nmp) for <{},{},{}>: {:.4}",
                        f[0],
                        f[1],
                        f[2],
                        exponent(s.rank(), f)
                    );
                }
            }
            EXIT_OK
        }
        Op::Polish {
            one,
            format,
            objective,
            evaluations,
        } => {
            let (t, s) = both(one)?;
            let fmt = matmul_format(&one.input, format.as_deref());
            let params = PolishParams {
                objective: Objective::parse(objective)?,
                matmul: fmt,
                evaluations: *evaluations,
                ..PolishParams::default()
            };
            let p = polish(&s, &t, &params)?;
            let mut title = vec![format!(
                "polished scheme for {} (objective: {}; {}; {} candidates evaluated)",
                one.input,
                params.objective.name(),
                if p.improved() {
                    format!("improved, from the {} form", p.start)
                } else {
                    "no better scheme found, the input is kept".to_string()
                },
                p.evaluations
            )];
            title.extend(p.before.compare_lines(&p.after));
            if let Some(f) = fmt {
                title.push(format!(
                    "exponent 3 log r / log(nmp): {:.4}",
                    exponent(p.scheme.rank(), f)
                ));
            }
            let title = title.join("\n");
            eprintln!("{title}");
            show(&p.scheme, &t, &title, one.json)
        }
        Op::Equiv {
            input,
            scheme1,
            scheme2,
            field,
            format,
            max_nodes,
            json,
        } => {
            let t = load_tensor(input, field.as_deref())?;
            let s1 = load_scheme(scheme1, &t)?;
            let s2 = load_scheme(scheme2, &t)?;
            for (path, s) in [(scheme1, &s1), (scheme2, &s2)] {
                if let Err(m) = verify(s, &t) {
                    eprintln!(
                        "error: {path} does not verify for {input} ({} wrong coefficients; `bilin verify` shows them)",
                        m.count
                    );
                    return Ok(EXIT_FALSE);
                }
            }
            let params = bilin::scheme::equiv::EquivParams {
                matmul: matmul_format(input, format.as_deref()),
                max_nodes: *max_nodes,
                ..Default::default()
            };
            let e = bilin::scheme::equiv::equivalence(&s1, &s2, &t, &params);
            super::equiv::render(&e, &t, [&s1, &s2], [scheme1, scheme2], *json)
        }
        Op::Kron { two, matmul } => {
            let f = two.field.as_deref();
            let t1 = load_tensor(&two.input1, f)?;
            let s1 = load_scheme(&two.scheme1, &t1)?;
            let t2 = load_tensor(&two.input2, f)?;
            let s2 = load_scheme(&two.scheme2, &t2)?;
            let ks = cs::kron(&s1, &s2)?;
            if *matmul {
                let f1 = fmt_of(&two.input1, None)?;
                let f2 = fmt_of(&two.input2, None)?;
                let perm = cs::matmul_kron_order(f1, f2);
                let fm = [f1[0] * f2[0], f1[1] * f2[1], f1[2] * f2[2]];
                let t = matmul_tensor(fm, f)?;
                let title = format!(
                    "Kronecker product of {} and {} as matmul:{},{},{}",
                    two.scheme1, two.scheme2, fm[0], fm[1], fm[2]
                );
                show(&cs::relabel(&ks, &perm)?, &t, &title, two.json)
            } else {
                let t = cs::kron_tensor(&t1, &t2)?;
                show(
                    &ks,
                    &t,
                    &format!("Kronecker product of {} and {}", two.scheme1, two.scheme2),
                    two.json,
                )
            }
        }
        Op::Sum(two) => {
            let f = two.field.as_deref();
            let t1 = load_tensor(&two.input1, f)?;
            let s1 = load_scheme(&two.scheme1, &t1)?;
            let t2 = load_tensor(&two.input2, f)?;
            let s2 = load_scheme(&two.scheme2, &t2)?;
            let t = cs::direct_sum_tensor(&t1, &t2)?;
            show(
                &cs::direct_sum(&s1, &s2)?,
                &t,
                &format!("direct sum of {} and {}", two.scheme1, two.scheme2),
                two.json,
            )
        }
        Op::Join { two, axis } => {
            let f = two.field.as_deref();
            let t1 = load_tensor(&two.input1, f)?;
            let s1 = load_scheme(&two.scheme1, &t1)?;
            let t2 = load_tensor(&two.input2, f)?;
            let s2 = load_scheme(&two.scheme2, &t2)?;
            let (f1, f2) = (fmt_of(&two.input1, None)?, fmt_of(&two.input2, None)?);
            let ax = match axis.trim().to_ascii_lowercase().as_str() {
                "n" | "0" => 0,
                "m" | "1" => 1,
                "p" | "2" => 2,
                a => {
                    return Err(Error::Invalid(format!(
                        "--axis: expected n, m or p, found `{a}`"
                    )));
                }
            };
            let j = bilin::scheme::build::matmul_join(&s1, f1, &s2, f2, ax)?;
            let mut fm = f1;
            fm[ax] += f2[ax];
            let t = matmul_tensor(fm, f)?;
            let title = format!(
                "{} and {} joined along {axis}: matmul:{},{},{}",
                two.scheme1, two.scheme2, fm[0], fm[1], fm[2]
            );
            show(&j, &t, &title, two.json)
        }
        Op::Build { input, field, json } => {
            let fmt = fmt_of(input, None)?;
            let t = matmul_tensor(fmt, field.as_deref())?;
            let b = bilin::catalog::schemes::best_matmul_scheme(fmt, t.field())?;
            show(&b.scheme, &t, &format!("{input} built as {}", b.how), *json)
        }
        Op::Permute { one, axes } => {
            let (t, s) = both(one)?;
            let v = parse_list(axes)?;
            if v.len() != 3 {
                return Err(Error::Invalid(
                    "--axes needs three entries, e.g. 1,2,0".into(),
                ));
            }
            let perm = [v[0], v[1], v[2]];
            let ps = cs::permute_axes(&s, perm)?;
            show(
                &ps,
                &t.permute_axes(perm),
                &format!("{} with axes permuted to {axes}", one.scheme),
                one.json,
            )
        }
        Op::Cyclic { one, format } | Op::Transpose { one, format } => {
            let (_, s) = both(one)?;
            let [n, m, p] = fmt_of(&one.input, format.as_deref())?;
            let (ns, nf) = if matches!(op, Op::Cyclic { .. }) {
                (cs::matmul_cyclic(&s, [n, m, p])?, [m, p, n])
            } else {
                (cs::matmul_transpose(&s, [n, m, p])?, [p, m, n])
            };
            let t = matmul_tensor(nf, one.field.as_deref())?;
            show(
                &ns,
                &t,
                &format!("matmul:{},{},{} from {}", nf[0], nf[1], nf[2], one.scheme),
                one.json,
            )
        }
        Op::Restrict { one, to, format } => {
            let (_, s) = both(one)?;
            let f = fmt_of(&one.input, format.as_deref())?;
            let v = parse_list(to)?;
            if v.len() != 3 {
                return Err(Error::Invalid("--to needs n,m,p".into()));
            }
            let sub = [v[0], v[1], v[2]];
            let keep = cs::matmul_subformat(f, sub)?;
            let t = matmul_tensor(sub, one.field.as_deref())?;
            show(
                &cs::restrict(&s, &keep)?,
                &t,
                &format!("restriction of {} to matmul:{to}", one.scheme),
                one.json,
            )
        }
    })
}
