//! The blocks of one support component: the degenerate one-dimensional parts, the
//! primitive orthogonal idempotents of the centroid and their images, and the certificate
//! that each block is indecomposable (its centroid is local).

use super::*;

/// The one-dimensional pieces of a component without coefficients (an isolated index).
pub(super) fn degenerate_pieces<F: Field>(f: &F, sub: &Tensor, alg: bool) -> Vec<Piece<F::Elem>> {
    let d = sub.dims();
    let mut out = Vec::new();
    for axis in 0..3 {
        for i in 0..d[axis] {
            let v = unit_vector(f, d[axis], i);
            if alg {
                out.push(Piece {
                    kind: BlockKind::ZeroAlgebra,
                    vecs: [vec![v.clone()], vec![v.clone()], vec![v]],
                    certificate: None,
                });
            } else {
                let mut vecs = [Vec::new(), Vec::new(), Vec::new()];
                vecs[axis].push(v);
                let kind = [
                    BlockKind::LeftRadical,
                    BlockKind::RightRadical,
                    BlockKind::Cokernel,
                ][axis];
                out.push(Piece {
                    kind,
                    vecs,
                    certificate: None,
                });
            }
        }
        if alg {
            break;
        }
    }
    out
}

/// Split one support component of an algebra (see the module documentation, step 2-3).
pub(super) fn split_algebra<F: Field>(
    f: &F,
    sub: &Tensor,
    params: &BlockParams,
) -> Result<Vec<Piece<F::Elem>>> {
    let n = sub.dim();
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(sub);
    let ann = reduce(
        f,
        n,
        from_space(f, &element_space(&it, ElementSpace::Annihilator, sp)?),
    );
    if ann.dim() > 0 {
        let sq = products_span(f, sub, sp)?;
        // lines of the annihilator independent modulo A^2
        let mut chosen: Vec<Vec<F::Elem>> = Vec::new();
        let mut current = sq.clone();
        for z in &ann.basis {
            if !current.contains(f, z) {
                chosen.push(z.clone());
                let mut all = current.basis.clone();
                all.push(z.clone());
                current = span(f, &all, n, sp)?;
            }
        }
        if !chosen.is_empty() {
            // A' = A^2 + complement coordinates; the new basis is [A', Z0]
            let mut cols: Vec<Vec<F::Elem>> = sq.basis.clone();
            cols.extend(current.non_pivots().iter().map(|&i| unit_vector(f, n, i)));
            let core_dim = cols.len();
            cols.extend(chosen.iter().cloned());
            let p = columns_matrix(f, &cols, n);
            let changed = change_basis(sub, &p, &p, &p).ok_or_else(|| {
                Error::Invalid("internal error: the annihilator split is not invertible".into())
            })?;
            let idx: Vec<usize> = (0..core_dim).collect();
            let core = restrict(&changed, &[idx.clone(), idx.clone(), idx]);
            let mut out = Vec::new();
            for piece in split_algebra(f, &core, params)? {
                let v: Vec<Vec<F::Elem>> = piece.vecs[0]
                    .iter()
                    .map(|x| through(f, x, &cols[..core_dim], n))
                    .collect();
                out.push(Piece {
                    kind: piece.kind,
                    vecs: [v.clone(), v.clone(), v],
                    certificate: piece.certificate,
                });
            }
            for z in chosen {
                out.push(Piece {
                    kind: BlockKind::ZeroAlgebra,
                    vecs: [vec![z.clone()], vec![z.clone()], vec![z]],
                    certificate: None,
                });
            }
            return Ok(out);
        }
    }
    let c = match params.known_centroid_of(sub) {
        Some(space) => space,
        None => centroid(sub, &it, sp, None)?.space,
    };
    let csub = reduce(f, n * n, from_space(f, &c));
    let images = centroid_blocks(f, &csub, &[n], params)?;
    Ok(images
        .into_iter()
        .map(|(vecs, certificate)| {
            let v = vecs.into_iter().next().expect("one space");
            Piece {
                kind: BlockKind::Product,
                vecs: [v.clone(), v.clone(), v],
                certificate,
            }
        })
        .collect())
}

/// Split one support component of a bilinear map (see the module documentation).
pub(super) fn split_map<F: Field>(
    f: &F,
    sub: &Tensor,
    params: &BlockParams,
) -> Result<Vec<Piece<F::Elem>>> {
    let d = sub.dims();
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(sub);
    let lrad = reduce(
        f,
        d[0],
        from_space(f, &map_invariant(&it, MapInvariant::LeftRadical, sp)?),
    );
    let rrad = reduce(
        f,
        d[1],
        from_space(f, &map_invariant(&it, MapInvariant::RightRadical, sp)?),
    );
    let image = products_span(f, sub, sp)?;
    if lrad.dim() > 0 || rrad.dim() > 0 || image.dim() < d[2] {
        let pu: Vec<Vec<F::Elem>> = lrad
            .non_pivots()
            .iter()
            .map(|&i| unit_vector(f, d[0], i))
            .chain(lrad.basis.iter().cloned())
            .collect();
        let pv: Vec<Vec<F::Elem>> = rrad
            .non_pivots()
            .iter()
            .map(|&i| unit_vector(f, d[1], i))
            .chain(rrad.basis.iter().cloned())
            .collect();
        let pw: Vec<Vec<F::Elem>> = image
            .basis
            .iter()
            .cloned()
            .chain(image.non_pivots().iter().map(|&i| unit_vector(f, d[2], i)))
            .collect();
        let core_dims = [d[0] - lrad.dim(), d[1] - rrad.dim(), image.dim()];
        let changed = change_basis(
            sub,
            &columns_matrix(f, &pu, d[0]),
            &columns_matrix(f, &pv, d[1]),
            &columns_matrix(f, &pw, d[2]),
        )
        .ok_or_else(|| Error::Invalid("internal error: a degenerate split failed".into()))?;
        let core = restrict(&changed, &core_dims.map(|k| (0..k).collect()));
        let bases = [&pu, &pv, &pw];
        let mut out = Vec::new();
        if core.nnz() > 0 {
            for piece in split_map(f, &core, params)? {
                let vecs = [0, 1, 2].map(|a| {
                    piece.vecs[a]
                        .iter()
                        .map(|x| through(f, x, &bases[a][..core_dims[a]], d[a]))
                        .collect()
                });
                out.push(Piece { vecs, ..piece });
            }
        }
        let degenerate = [
            (0, BlockKind::LeftRadical, &pu[core_dims[0]..]),
            (1, BlockKind::RightRadical, &pv[core_dims[1]..]),
            (2, BlockKind::Cokernel, &pw[core_dims[2]..]),
        ];
        for (axis, kind, vs) in degenerate {
            for v in vs {
                let mut vecs = [Vec::new(), Vec::new(), Vec::new()];
                vecs[axis].push(v.clone());
                out.push(Piece {
                    kind,
                    vecs,
                    certificate: None,
                });
            }
        }
        return Ok(out);
    }
    let c = map_invariant(&it, MapInvariant::CentroidTriples, sp)?;
    let total = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    let csub = reduce(f, total, from_space(f, &c));
    Ok(centroid_blocks(f, &csub, &d, params)?
        .into_iter()
        .map(|(vecs, certificate)| {
            let mut it = vecs.into_iter();
            let vecs = [0, 1, 2].map(|_| it.next().expect("three spaces"));
            Piece {
                kind: BlockKind::Product,
                vecs,
                certificate,
            }
        })
        .collect())
}

/// The images of the primitive idempotents of a centroid (tuples of maps on spaces of the
/// given sizes): per idempotent, a basis of the image on each space; with a certificate
/// when the centroid is local (one block).
#[allow(clippy::type_complexity)]
pub(super) fn centroid_blocks<F: Field>(
    f: &F,
    csub: &Subspace<F::Elem>,
    sizes: &[usize],
    params: &BlockParams,
) -> Result<Vec<(Vec<Vec<Vec<F::Elem>>>, Option<Certificate>)>> {
    let calg = map_algebra(f, csub, sizes);
    let one = csub.coords(&identity_maps(f, sizes));
    let (idems, cert) = primitive_idempotents(&calg, &one, params)?;
    if idems.len() == 1 {
        let whole: Vec<Vec<Vec<F::Elem>>> = sizes
            .iter()
            .map(|&d| (0..d).map(|i| unit_vector(f, d, i)).collect())
            .collect();
        return Ok(vec![(whole, cert)]);
    }
    let mut out = Vec::new();
    for e in &idems {
        let x = csub.combine(f, e);
        let mut off = 0;
        let mut spaces = Vec::new();
        for &d in sizes {
            // the columns X e_i of the map on this space
            let cols: Vec<Vec<F::Elem>> = (0..d)
                .map(|i| (0..d).map(|l| x[off + l * d + i].clone()).collect())
                .collect();
            spaces.push(span(f, &cols, d, &params.solve)?.basis);
            off += d * d;
        }
        out.push((spaces, None));
    }
    Ok(out)
}

/// Primitive orthogonal idempotents, with the certificate of a local algebra.
pub type Idempotents<E> = (Vec<Vec<E>>, Option<Certificate>);

/// A complete set of primitive orthogonal idempotents of an associative algebra with unit
/// whose quotient by the radical is commutative (see the module documentation, step 3);
/// when there is only one (the algebra is local), also its certificate.
pub(super) fn primitive_idempotents<F: Field>(
    c: &Alg<F>,
    one: &[F::Elem],
    params: &BlockParams,
) -> Result<Idempotents<F::Elem>> {
    let f = &c.f;
    let k = c.n;
    if k == 1 {
        return Ok((
            vec![one.to_vec()],
            Some(Certificate {
                centroid_dim: 1,
                centroid_radical_dim: 0,
                residue_degree: 1,
                residue_poly: vec![Q::default(), Q::from_integer(1.into())],
            }),
        ));
    }
    let tc = c.to_tensor("c");
    let itc = IntegralTensor::from_tensor(&tc);
    let rad = crate::invariants::radical(&tc, &itc, &params.solve)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    let qm = QuotientMap::new(f, k, &from_space(f, &rad.space));
    let q = Alg::from_tensor(f, &quotient_in(f, &tc, &qm));
    let qone = qm.project(f, one);
    if !q.is_commutative() {
        return Err(Error::Invalid(
            "the centroid modulo its radical is not commutative: this decomposition is not \
             supported"
                .into(),
        ));
    }
    let parts = split_into_fields(&q, &qone, &params.solve, params.seed)?;
    if parts.len() == 1 {
        return Ok((
            vec![one.to_vec()],
            Some(Certificate {
                centroid_dim: k,
                centroid_radical_dim: rad.space.dim(),
                residue_degree: parts[0].degree,
                residue_poly: parts[0].poly.clone(),
            }),
        ));
    }
    let mut idems: Vec<Vec<F::Elem>> = Vec::new();
    let mut rest = one.to_vec();
    for part in &parts[..parts.len() - 1] {
        let x = qm.lift(f, &part.idempotent);
        let x = c.mul(&c.mul(&rest, &x), &rest);
        let e = c.lift_idempotent(&x)?;
        rest = c.sub(&rest, &e);
        idems.push(e);
    }
    idems.push(rest);
    // exact check: orthogonal idempotents summing to 1
    let mut sum = c.zero();
    for (i, a) in idems.iter().enumerate() {
        sum = c.add(&sum, a);
        for (j, b) in idems.iter().enumerate() {
            let p = c.mul(a, b);
            let ok = if i == j { p == *a } else { c.is_zero(&p) };
            if !ok || c.is_zero(a) {
                return Err(Error::Invalid(
                    "internal error: lifted idempotents are not orthogonal".into(),
                ));
            }
        }
    }
    if sum != one {
        return Err(Error::Invalid(
            "internal error: lifted idempotents do not add up to 1".into(),
        ));
    }
    Ok((idems, None))
}

/// Certify a block: its centroid is local (see the module documentation, step 4).
pub(super) fn certify<F: Field>(f: &F, t: &Tensor, params: &BlockParams) -> Result<Certificate> {
    let sp = &params.solve;
    let it = IntegralTensor::from_tensor(t);
    let d = t.dims();
    let (space, sizes) = if t.kind() == Kind::Algebra {
        let space = match params.known_centroid_of(t) {
            Some(space) => space,
            None => centroid(t, &it, sp, None)?.space,
        };
        (space, vec![d[0]])
    } else {
        (
            map_invariant(&it, MapInvariant::CentroidTriples, sp)?,
            d.to_vec(),
        )
    };
    let total: usize = sizes.iter().map(|x| x * x).sum();
    let csub = reduce(f, total, from_space(f, &space));
    let calg = map_algebra(f, &csub, &sizes);
    let one = csub.coords(&identity_maps(f, &sizes));
    if calg.n == 1 {
        return Ok(Certificate {
            centroid_dim: 1,
            centroid_radical_dim: 0,
            residue_degree: 1,
            residue_poly: vec![Q::default(), Q::from_integer(1.into())],
        });
    }
    let tc = calg.to_tensor("c");
    let itc = IntegralTensor::from_tensor(&tc);
    let rad = crate::invariants::radical(&tc, &itc, sp)?
        .ok_or_else(|| Error::Invalid("no radical over this field".into()))?;
    let qm = QuotientMap::new(f, calg.n, &from_space(f, &rad.space));
    let q = Alg::from_tensor(f, &quotient_in(f, &tc, &qm));
    match field_decision(&q, &qm.project(f, &one), sp)? {
        FieldDecision::Field { degree, poly } => Ok(Certificate {
            centroid_dim: calg.n,
            centroid_radical_dim: rad.space.dim(),
            residue_degree: degree,
            residue_poly: poly,
        }),
        FieldDecision::NotField(why) => Err(Error::Invalid(format!(
            "internal error: a block splits further (its centroid modulo the radical: {why})"
        ))),
    }
}
