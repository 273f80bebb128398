//! The catalog files, embedded in the binary: `(file name, contents)` for every
//! `catalog/*.bilin`, in file-name order. A test checks that this list matches the directory.

/// Every catalog file: (file name, text).
pub const ENTRIES: &[(&str, &str)] = &[
    ("C2.bilin", include_str!("../../catalog/C2.bilin")),
    ("C3.bilin", include_str!("../../catalog/C3.bilin")),
    ("C4.bilin", include_str!("../../catalog/C4.bilin")),
    ("C5.bilin", include_str!("../../catalog/C5.bilin")),
    ("C6.bilin", include_str!("../../catalog/C6.bilin")),
    ("Cl0-2.bilin", include_str!("../../catalog/Cl0-2.bilin")),
    ("Cl0-3.bilin", include_str!("../../catalog/Cl0-3.bilin")),
    ("Cl1-1.bilin", include_str!("../../catalog/Cl1-1.bilin")),
    ("Cl2-0.bilin", include_str!("../../catalog/Cl2-0.bilin")),
    ("Cl3-0.bilin", include_str!("../../catalog/Cl3-0.bilin")),
    ("D4.bilin", include_str!("../../catalog/D4.bilin")),
    ("GF16.bilin", include_str!("../../catalog/GF16.bilin")),
    ("GF4.bilin", include_str!("../../catalog/GF4.bilin")),
    ("GF8.bilin", include_str!("../../catalog/GF8.bilin")),
    ("M2-plus.bilin", include_str!("../../catalog/M2-plus.bilin")),
    ("M2.bilin", include_str!("../../catalog/M2.bilin")),
    ("M3.bilin", include_str!("../../catalog/M3.bilin")),
    ("Q-cbrt2.bilin", include_str!("../../catalog/Q-cbrt2.bilin")),
    ("Q-sqrt2.bilin", include_str!("../../catalog/Q-sqrt2.bilin")),
    ("Q-sqrt3.bilin", include_str!("../../catalog/Q-sqrt3.bilin")),
    ("Q-sqrt5.bilin", include_str!("../../catalog/Q-sqrt5.bilin")),
    (
        "Q-sqrtm2.bilin",
        include_str!("../../catalog/Q-sqrtm2.bilin"),
    ),
    (
        "Q-sqrtm3.bilin",
        include_str!("../../catalog/Q-sqrtm3.bilin"),
    ),
    ("Q-zeta3.bilin", include_str!("../../catalog/Q-zeta3.bilin")),
    ("Q-zeta5.bilin", include_str!("../../catalog/Q-zeta5.bilin")),
    ("Q8.bilin", include_str!("../../catalog/Q8.bilin")),
    ("S3.bilin", include_str!("../../catalog/S3.bilin")),
    ("T2.bilin", include_str!("../../catalog/T2.bilin")),
    ("T3.bilin", include_str!("../../catalog/T3.bilin")),
    ("V4.bilin", include_str!("../../catalog/V4.bilin")),
    (
        "abelian3.bilin",
        include_str!("../../catalog/abelian3.bilin"),
    ),
    ("aff1.bilin", include_str!("../../catalog/aff1.bilin")),
    ("complex.bilin", include_str!("../../catalog/complex.bilin")),
    (
        "cross-product.bilin",
        include_str!("../../catalog/cross-product.bilin"),
    ),
    (
        "dual-numbers.bilin",
        include_str!("../../catalog/dual-numbers.bilin"),
    ),
    (
        "exterior2.bilin",
        include_str!("../../catalog/exterior2.bilin"),
    ),
    (
        "exterior3.bilin",
        include_str!("../../catalog/exterior3.bilin"),
    ),
    ("gl2.bilin", include_str!("../../catalog/gl2.bilin")),
    (
        "heisenberg3.bilin",
        include_str!("../../catalog/heisenberg3.bilin"),
    ),
    (
        "heisenberg5.bilin",
        include_str!("../../catalog/heisenberg5.bilin"),
    ),
    (
        "matmul222.bilin",
        include_str!("../../catalog/matmul222.bilin"),
    ),
    (
        "matmul223.bilin",
        include_str!("../../catalog/matmul223.bilin"),
    ),
    (
        "matmul224.bilin",
        include_str!("../../catalog/matmul224.bilin"),
    ),
    (
        "matmul225.bilin",
        include_str!("../../catalog/matmul225.bilin"),
    ),
    (
        "matmul233.bilin",
        include_str!("../../catalog/matmul233.bilin"),
    ),
    (
        "matmul234.bilin",
        include_str!("../../catalog/matmul234.bilin"),
    ),
    (
        "matmul235.bilin",
        include_str!("../../catalog/matmul235.bilin"),
    ),
    (
        "matmul244.bilin",
        include_str!("../../catalog/matmul244.bilin"),
    ),
    (
        "matmul245.bilin",
        include_str!("../../catalog/matmul245.bilin"),
    ),
    (
        "matmul255.bilin",
        include_str!("../../catalog/matmul255.bilin"),
    ),
    (
        "matmul333.bilin",
        include_str!("../../catalog/matmul333.bilin"),
    ),
    (
        "matmul334.bilin",
        include_str!("../../catalog/matmul334.bilin"),
    ),
    (
        "matmul335.bilin",
        include_str!("../../catalog/matmul335.bilin"),
    ),
    (
        "matmul344.bilin",
        include_str!("../../catalog/matmul344.bilin"),
    ),
    (
        "matmul345.bilin",
        include_str!("../../catalog/matmul345.bilin"),
    ),
    (
        "matmul355.bilin",
        include_str!("../../catalog/matmul355.bilin"),
    ),
    (
        "matmul444.bilin",
        include_str!("../../catalog/matmul444.bilin"),
    ),
    (
        "matmul445.bilin",
        include_str!("../../catalog/matmul445.bilin"),
    ),
    (
        "matmul455.bilin",
        include_str!("../../catalog/matmul455.bilin"),
    ),
    (
        "matmul555.bilin",
        include_str!("../../catalog/matmul555.bilin"),
    ),
    (
        "octonions.bilin",
        include_str!("../../catalog/octonions.bilin"),
    ),
    (
        "polymul2.bilin",
        include_str!("../../catalog/polymul2.bilin"),
    ),
    (
        "polymul3.bilin",
        include_str!("../../catalog/polymul3.bilin"),
    ),
    (
        "polymul4.bilin",
        include_str!("../../catalog/polymul4.bilin"),
    ),
    (
        "quaternions.bilin",
        include_str!("../../catalog/quaternions.bilin"),
    ),
    (
        "sedenions.bilin",
        include_str!("../../catalog/sedenions.bilin"),
    ),
    ("sl2.bilin", include_str!("../../catalog/sl2.bilin")),
    ("sl3.bilin", include_str!("../../catalog/sl3.bilin")),
    ("so3.bilin", include_str!("../../catalog/so3.bilin")),
    (
        "solv3-L2.bilin",
        include_str!("../../catalog/solv3-L2.bilin"),
    ),
    (
        "solv3-L3-0.bilin",
        include_str!("../../catalog/solv3-L3-0.bilin"),
    ),
    (
        "solv3-L4-1.bilin",
        include_str!("../../catalog/solv3-L4-1.bilin"),
    ),
    (
        "solv3-L4-m1.bilin",
        include_str!("../../catalog/solv3-L4-m1.bilin"),
    ),
    ("spin3.bilin", include_str!("../../catalog/spin3.bilin")),
    ("spin4.bilin", include_str!("../../catalog/spin4.bilin")),
    (
        "split-complex.bilin",
        include_str!("../../catalog/split-complex.bilin"),
    ),
    (
        "split-octonions.bilin",
        include_str!("../../catalog/split-octonions.bilin"),
    ),
    (
        "split-quaternions.bilin",
        include_str!("../../catalog/split-quaternions.bilin"),
    ),
    ("sym2.bilin", include_str!("../../catalog/sym2.bilin")),
    ("sym3.bilin", include_str!("../../catalog/sym3.bilin")),
    ("trunc3.bilin", include_str!("../../catalog/trunc3.bilin")),
    ("trunc4.bilin", include_str!("../../catalog/trunc4.bilin")),
    ("trunc5.bilin", include_str!("../../catalog/trunc5.bilin")),
];
