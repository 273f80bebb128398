//! The catalog files, embedded in the binary: `(file name, contents)` for every
//! `catalog/*.bilin`, in file-name order. A test checks that this list matches the directory.

/// Every catalog file: (file name, text).
pub const ENTRIES: &[(&str, &str)] = &[
    ("A4.bilin", include_str!("../../catalog/A4.bilin")),
    ("C1.bilin", include_str!("../../catalog/C1.bilin")),
    ("C10.bilin", include_str!("../../catalog/C10.bilin")),
    ("C11.bilin", include_str!("../../catalog/C11.bilin")),
    ("C12.bilin", include_str!("../../catalog/C12.bilin")),
    ("C13.bilin", include_str!("../../catalog/C13.bilin")),
    ("C14.bilin", include_str!("../../catalog/C14.bilin")),
    ("C15.bilin", include_str!("../../catalog/C15.bilin")),
    ("C16.bilin", include_str!("../../catalog/C16.bilin")),
    ("C2.bilin", include_str!("../../catalog/C2.bilin")),
    (
        "C2xC2semiC4.bilin",
        include_str!("../../catalog/C2xC2semiC4.bilin"),
    ),
    (
        "C2xC2xC2.bilin",
        include_str!("../../catalog/C2xC2xC2.bilin"),
    ),
    (
        "C2xC2xC2xC2.bilin",
        include_str!("../../catalog/C2xC2xC2xC2.bilin"),
    ),
    ("C3.bilin", include_str!("../../catalog/C3.bilin")),
    ("C3xC3.bilin", include_str!("../../catalog/C3xC3.bilin")),
    ("C4.bilin", include_str!("../../catalog/C4.bilin")),
    ("C4oD4.bilin", include_str!("../../catalog/C4oD4.bilin")),
    (
        "C4semiC4.bilin",
        include_str!("../../catalog/C4semiC4.bilin"),
    ),
    ("C4xC2.bilin", include_str!("../../catalog/C4xC2.bilin")),
    (
        "C4xC2xC2.bilin",
        include_str!("../../catalog/C4xC2xC2.bilin"),
    ),
    ("C4xC4.bilin", include_str!("../../catalog/C4xC4.bilin")),
    ("C5.bilin", include_str!("../../catalog/C5.bilin")),
    ("C6.bilin", include_str!("../../catalog/C6.bilin")),
    ("C6xC2.bilin", include_str!("../../catalog/C6xC2.bilin")),
    ("C7.bilin", include_str!("../../catalog/C7.bilin")),
    ("C8.bilin", include_str!("../../catalog/C8.bilin")),
    ("C8xC2.bilin", include_str!("../../catalog/C8xC2.bilin")),
    ("C9.bilin", include_str!("../../catalog/C9.bilin")),
    ("Cl0-2.bilin", include_str!("../../catalog/Cl0-2.bilin")),
    ("Cl0-3.bilin", include_str!("../../catalog/Cl0-3.bilin")),
    ("Cl1-1.bilin", include_str!("../../catalog/Cl1-1.bilin")),
    ("Cl2-0.bilin", include_str!("../../catalog/Cl2-0.bilin")),
    ("Cl3-0.bilin", include_str!("../../catalog/Cl3-0.bilin")),
    ("D10.bilin", include_str!("../../catalog/D10.bilin")),
    ("D12.bilin", include_str!("../../catalog/D12.bilin")),
    ("D14.bilin", include_str!("../../catalog/D14.bilin")),
    ("D16.bilin", include_str!("../../catalog/D16.bilin")),
    ("D4.bilin", include_str!("../../catalog/D4.bilin")),
    ("D4xC2.bilin", include_str!("../../catalog/D4xC2.bilin")),
    ("Dic3.bilin", include_str!("../../catalog/Dic3.bilin")),
    ("GF16.bilin", include_str!("../../catalog/GF16.bilin")),
    ("GF4.bilin", include_str!("../../catalog/GF4.bilin")),
    ("GF8.bilin", include_str!("../../catalog/GF8.bilin")),
    ("M16.bilin", include_str!("../../catalog/M16.bilin")),
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
    ("Q16.bilin", include_str!("../../catalog/Q16.bilin")),
    ("Q8.bilin", include_str!("../../catalog/Q8.bilin")),
    ("Q8xC2.bilin", include_str!("../../catalog/Q8xC2.bilin")),
    ("S3.bilin", include_str!("../../catalog/S3.bilin")),
    ("SD16.bilin", include_str!("../../catalog/SD16.bilin")),
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
    ("nil1-1.bilin", include_str!("../../catalog/nil1-1.bilin")),
    ("nil2-1.bilin", include_str!("../../catalog/nil2-1.bilin")),
    ("nil4-1.bilin", include_str!("../../catalog/nil4-1.bilin")),
    ("nil4-2.bilin", include_str!("../../catalog/nil4-2.bilin")),
    ("nil4-3.bilin", include_str!("../../catalog/nil4-3.bilin")),
    ("nil5-1.bilin", include_str!("../../catalog/nil5-1.bilin")),
    ("nil5-2.bilin", include_str!("../../catalog/nil5-2.bilin")),
    ("nil5-3.bilin", include_str!("../../catalog/nil5-3.bilin")),
    ("nil5-5.bilin", include_str!("../../catalog/nil5-5.bilin")),
    ("nil5-6.bilin", include_str!("../../catalog/nil5-6.bilin")),
    ("nil5-7.bilin", include_str!("../../catalog/nil5-7.bilin")),
    ("nil5-8.bilin", include_str!("../../catalog/nil5-8.bilin")),
    ("nil5-9.bilin", include_str!("../../catalog/nil5-9.bilin")),
    ("nil6-1.bilin", include_str!("../../catalog/nil6-1.bilin")),
    ("nil6-10.bilin", include_str!("../../catalog/nil6-10.bilin")),
    ("nil6-11.bilin", include_str!("../../catalog/nil6-11.bilin")),
    ("nil6-12.bilin", include_str!("../../catalog/nil6-12.bilin")),
    ("nil6-13.bilin", include_str!("../../catalog/nil6-13.bilin")),
    ("nil6-14.bilin", include_str!("../../catalog/nil6-14.bilin")),
    ("nil6-15.bilin", include_str!("../../catalog/nil6-15.bilin")),
    ("nil6-16.bilin", include_str!("../../catalog/nil6-16.bilin")),
    ("nil6-17.bilin", include_str!("../../catalog/nil6-17.bilin")),
    ("nil6-18.bilin", include_str!("../../catalog/nil6-18.bilin")),
    (
        "nil6-19-0.bilin",
        include_str!("../../catalog/nil6-19-0.bilin"),
    ),
    (
        "nil6-19-1.bilin",
        include_str!("../../catalog/nil6-19-1.bilin"),
    ),
    (
        "nil6-19-2.bilin",
        include_str!("../../catalog/nil6-19-2.bilin"),
    ),
    (
        "nil6-19-m1.bilin",
        include_str!("../../catalog/nil6-19-m1.bilin"),
    ),
    ("nil6-2.bilin", include_str!("../../catalog/nil6-2.bilin")),
    ("nil6-20.bilin", include_str!("../../catalog/nil6-20.bilin")),
    (
        "nil6-21-0.bilin",
        include_str!("../../catalog/nil6-21-0.bilin"),
    ),
    (
        "nil6-21-1.bilin",
        include_str!("../../catalog/nil6-21-1.bilin"),
    ),
    (
        "nil6-21-2.bilin",
        include_str!("../../catalog/nil6-21-2.bilin"),
    ),
    (
        "nil6-21-m1.bilin",
        include_str!("../../catalog/nil6-21-m1.bilin"),
    ),
    (
        "nil6-22-0.bilin",
        include_str!("../../catalog/nil6-22-0.bilin"),
    ),
    (
        "nil6-22-1.bilin",
        include_str!("../../catalog/nil6-22-1.bilin"),
    ),
    (
        "nil6-22-2.bilin",
        include_str!("../../catalog/nil6-22-2.bilin"),
    ),
    (
        "nil6-22-m1.bilin",
        include_str!("../../catalog/nil6-22-m1.bilin"),
    ),
    ("nil6-23.bilin", include_str!("../../catalog/nil6-23.bilin")),
    (
        "nil6-24-0.bilin",
        include_str!("../../catalog/nil6-24-0.bilin"),
    ),
    (
        "nil6-24-1.bilin",
        include_str!("../../catalog/nil6-24-1.bilin"),
    ),
    (
        "nil6-24-2.bilin",
        include_str!("../../catalog/nil6-24-2.bilin"),
    ),
    (
        "nil6-24-m1.bilin",
        include_str!("../../catalog/nil6-24-m1.bilin"),
    ),
    ("nil6-25.bilin", include_str!("../../catalog/nil6-25.bilin")),
    ("nil6-26.bilin", include_str!("../../catalog/nil6-26.bilin")),
    ("nil6-3.bilin", include_str!("../../catalog/nil6-3.bilin")),
    ("nil6-4.bilin", include_str!("../../catalog/nil6-4.bilin")),
    ("nil6-5.bilin", include_str!("../../catalog/nil6-5.bilin")),
    ("nil6-6.bilin", include_str!("../../catalog/nil6-6.bilin")),
    ("nil6-7.bilin", include_str!("../../catalog/nil6-7.bilin")),
    ("nil6-8.bilin", include_str!("../../catalog/nil6-8.bilin")),
    ("nil6-9.bilin", include_str!("../../catalog/nil6-9.bilin")),
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
        "solv3-L3-1.bilin",
        include_str!("../../catalog/solv3-L3-1.bilin"),
    ),
    (
        "solv3-L3-m1.bilin",
        include_str!("../../catalog/solv3-L3-m1.bilin"),
    ),
    (
        "solv3-L3-m1_4.bilin",
        include_str!("../../catalog/solv3-L3-m1_4.bilin"),
    ),
    (
        "solv3-L4-1.bilin",
        include_str!("../../catalog/solv3-L4-1.bilin"),
    ),
    (
        "solv3-L4-2.bilin",
        include_str!("../../catalog/solv3-L4-2.bilin"),
    ),
    (
        "solv3-L4-m1.bilin",
        include_str!("../../catalog/solv3-L4-m1.bilin"),
    ),
    (
        "solv4-M12.bilin",
        include_str!("../../catalog/solv4-M12.bilin"),
    ),
    (
        "solv4-M13-0.bilin",
        include_str!("../../catalog/solv4-M13-0.bilin"),
    ),
    (
        "solv4-M13-1.bilin",
        include_str!("../../catalog/solv4-M13-1.bilin"),
    ),
    (
        "solv4-M13-m1.bilin",
        include_str!("../../catalog/solv4-M13-m1.bilin"),
    ),
    (
        "solv4-M14-1.bilin",
        include_str!("../../catalog/solv4-M14-1.bilin"),
    ),
    (
        "solv4-M14-m1.bilin",
        include_str!("../../catalog/solv4-M14-m1.bilin"),
    ),
    (
        "solv4-M2.bilin",
        include_str!("../../catalog/solv4-M2.bilin"),
    ),
    (
        "solv4-M3-0.bilin",
        include_str!("../../catalog/solv4-M3-0.bilin"),
    ),
    (
        "solv4-M3-1.bilin",
        include_str!("../../catalog/solv4-M3-1.bilin"),
    ),
    (
        "solv4-M3-2.bilin",
        include_str!("../../catalog/solv4-M3-2.bilin"),
    ),
    (
        "solv4-M3-m1.bilin",
        include_str!("../../catalog/solv4-M3-m1.bilin"),
    ),
    (
        "solv4-M4.bilin",
        include_str!("../../catalog/solv4-M4.bilin"),
    ),
    (
        "solv4-M6-0-0.bilin",
        include_str!("../../catalog/solv4-M6-0-0.bilin"),
    ),
    (
        "solv4-M6-1-0.bilin",
        include_str!("../../catalog/solv4-M6-1-0.bilin"),
    ),
    (
        "solv4-M6-1-1.bilin",
        include_str!("../../catalog/solv4-M6-1-1.bilin"),
    ),
    (
        "solv4-M7-0-1.bilin",
        include_str!("../../catalog/solv4-M7-0-1.bilin"),
    ),
    (
        "solv4-M7-0-m1.bilin",
        include_str!("../../catalog/solv4-M7-0-m1.bilin"),
    ),
    (
        "solv4-M7-1-0.bilin",
        include_str!("../../catalog/solv4-M7-1-0.bilin"),
    ),
    (
        "solv4-M7-1-1.bilin",
        include_str!("../../catalog/solv4-M7-1-1.bilin"),
    ),
    (
        "solv4-M8.bilin",
        include_str!("../../catalog/solv4-M8.bilin"),
    ),
    (
        "solv4-M9-1.bilin",
        include_str!("../../catalog/solv4-M9-1.bilin"),
    ),
    (
        "solv4-M9-m1.bilin",
        include_str!("../../catalog/solv4-M9-m1.bilin"),
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
