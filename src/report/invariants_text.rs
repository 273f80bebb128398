//! Text rendering of the invariants report ([`InvariantsReport`]): one section per
//! invariant, bases of vector spaces as combinations of basis names, small map bases as
//! matrices (larger ones are left to `--json`).

use super::invariants::{InvariantsReport, MapSpaceReport, VectorSpaceReport};

fn yes_no(b: Option<bool>) -> &'static str {
    match b {
        Some(true) => "yes",
        Some(false) => "no",
        None => "not decided",
    }
}

/// Render the report as text sections.
pub fn render_text(r: &InvariantsReport, names: &[String]) -> String {
    let mut s = if r.kind == "algebra" {
        format!(
            "invariants over {} of an algebra of dimension {}\n",
            r.field, r.dims[0]
        )
    } else {
        format!(
            "invariants over {} of a bilinear map of dims {:?}\n",
            r.field, r.dims
        )
    };
    if let Some(a) = r.associative {
        s += &format!(
            "associative: {}   Lie algebra: {}\n",
            yes_no(Some(a)),
            yes_no(r.lie_algebra)
        );
    }
    let vs = |s: &mut String, title: &str, v: &Option<VectorSpaceReport>| {
        if let Some(v) = v {
            *s += &format!("\n{title}: dim {}\n", v.dim);
            for (i, b) in v.basis.iter().enumerate().take(24) {
                *s += &format!("  [{i}] {b}\n");
            }
            if v.basis.len() > 24 {
                *s += &format!("  ... {} more (see --json)\n", v.basis.len() - 24);
            }
            if let Some(why) = &v.basis_omitted {
                *s += &format!("  (basis not written: {why})\n");
            }
        }
    };
    let stated = std::cell::Cell::new(false);
    let ms = |s: &mut String, title: &str, v: &MapSpaceReport| {
        *s += &format!("\n{title}: dim {}\n", v.dim);
        if !v.basis.is_empty() && v.dim <= 8 && v.basis[0][0].len() <= 4 {
            if !stated.replace(true) {
                *s += "  (matrices are written [row; row; ...] in the basis: column i is the \
                       image of the i-th basis vector, X[l][i] = coefficient of e_l in X(e_i))\n";
            }
            for (i, tuple) in v.basis.iter().enumerate() {
                let mats: Vec<String> = tuple
                    .iter()
                    .map(|m| {
                        let rows: Vec<String> = m.iter().map(|row| row.join(" ")).collect();
                        format!("[{}]", rows.join("; "))
                    })
                    .collect();
                *s += &format!("  [{i}] {}\n", mats.join(" , "));
            }
        } else if !v.basis.is_empty() {
            *s += "  (basis matrices in --json)\n";
        }
        if let Some(why) = &v.basis_omitted {
            *s += &format!("  (basis not written: {why})\n");
        }
    };
    vs(
        &mut s,
        "commutative centre {z : za = az}",
        &r.commutative_centre,
    );
    vs(
        &mut s,
        "centre (commutes and associates with everything)",
        &r.centre,
    );
    vs(&mut s, "left nucleus", &r.left_nucleus);
    vs(&mut s, "middle nucleus", &r.middle_nucleus);
    vs(&mut s, "right nucleus", &r.right_nucleus);
    vs(&mut s, "nucleus", &r.nucleus);
    vs(&mut s, "left annihilator {x : xA = 0}", &r.left_annihilator);
    vs(
        &mut s,
        "right annihilator {x : Ax = 0}",
        &r.right_annihilator,
    );
    vs(&mut s, "two-sided annihilator", &r.annihilator);
    if let Some(u) = &r.unit {
        s += &format!("\nunit: {}\n", u.unit.as_deref().unwrap_or("none"));
    }
    if let Some(c) = &r.centroid {
        ms(&mut s, "centroid {X : X(ab) = X(a)b = aX(b)}", &c.space);
        s += &format!(
            "  commutative: {} ({})\n  a field: {}\n",
            yes_no(c.commutative),
            c.commutative_reason,
            match c.field {
                Some(true) => "yes (the ground field)",
                _ => "not decided",
            }
        );
    }
    if let Some(d) = &r.derivations {
        ms(&mut s, "derivations {D : D(ab) = D(a)b + aD(b)}", &d.space);
        match (&d.inner_kind, d.inner_dim, d.outer_dim) {
            (Some(k), Some(i), Some(o)) => {
                s += &format!("  inner ({k}): dim {i}   dim Der - dim Inn = {o}\n")
            }
            _ => s += "  inner derivations: defined here for associative or Lie algebras only\n",
        }
    }
    if let Some(a) = &r.adjoint {
        ms(&mut s, "adjoint algebra {(f, g) : f(a)b = a g(b)}", a);
    }
    if let Some(rad) = &r.radical {
        if rad.available {
            vs(
                &mut s,
                "radical (trace form Tr(L_xy), char 0)",
                &rad.radical,
            );
            s += &format!(
                "  semisimple: {}   dim A/rad = {}   dim centre of A/rad = {}\n",
                yes_no(rad.semisimple),
                rad.quotient_dim.unwrap_or(0),
                rad.quotient_centre_dim.unwrap_or(0)
            );
        } else {
            s += &format!(
                "\nradical: not available ({})\n",
                rad.note.as_deref().unwrap_or("")
            );
        }
    }
    if let Some(l) = &r.lie {
        s += &format!(
            "\nLie algebra:\n  derived series dims: {:?}   solvable: {}\n  lower central series dims: {:?}   nilpotent: {}\n  Killing form rank: {}   semisimple (Cartan): {}\n",
            l.derived_series,
            yes_no(Some(l.solvable)),
            l.lower_central_series,
            yes_no(Some(l.nilpotent)),
            l.killing_rank,
            yes_no(l.semisimple)
        );
    }
    if let Some(v) = &r.centroid_triples {
        ms(
            &mut s,
            "centroid triples (X,Y,Z): T(Xu,v) = T(u,Yv) = Z T(u,v)",
            v,
        );
    }
    if let Some(v) = &r.derivation_triples {
        ms(
            &mut s,
            "derivation triples: T(D1 u,v) + T(u,D2 v) = D3 T(u,v)",
            v,
        );
    }
    if let Some(v) = &r.adjoint_pairs {
        ms(&mut s, "adjoint pairs (f,g): T(fu,v) = T(u,gv)", v);
    }
    vs(&mut s, "left radical {u : T(u,V) = 0}", &r.left_radical);
    vs(&mut s, "right radical {v : T(U,v) = 0}", &r.right_radical);
    for sk in &r.skipped {
        s += &format!("\n{}: skipped: {}\n", sk.part, sk.reason);
    }
    let _ = names;
    s
}
