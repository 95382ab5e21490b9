//! Character tables against the published ones. Expected values are written from Cotton,
//! *Chemical Applications of Group Theory*, 3rd ed., appendix IIA, and Atkins, Child and
//! Phillips, *Tables for Group Theory* (from memory). Each class is given by a representative
//! operation in the books' standard orientation (principal axis z, C2′ along x, σv ∋ x).
//! Where a book lists a complex-conjugate pair {E} (C3h, S4, T, Th), the real form used
//! here is the sum of the pair, and the classes C_n^k and C_n^−k become one column.

use diptych::symmetry::ops::{icosahedral_c5_axis, improper, reflection, rotation};
use diptych::symmetry::{PointGroup, character_table};
use nalgebra::{Matrix3, Vector3};
use std::f64::consts::PI;

fn e() -> Matrix3<f64> {
    Matrix3::identity()
}
fn inv() -> Matrix3<f64> {
    -Matrix3::identity()
}
fn c(n: f64, axis: [f64; 3]) -> Matrix3<f64> {
    rotation(&Vector3::from(axis), 2.0 * PI / n)
}
fn ck(n: f64, k: f64, axis: [f64; 3]) -> Matrix3<f64> {
    rotation(&Vector3::from(axis), 2.0 * PI * k / n)
}
fn s(n: f64, axis: [f64; 3]) -> Matrix3<f64> {
    improper(&Vector3::from(axis), 2.0 * PI / n)
}
fn sk(n: f64, k: f64, axis: [f64; 3]) -> Matrix3<f64> {
    improper(&Vector3::from(axis), 2.0 * PI * k / n)
}
fn sigma(normal: [f64; 3]) -> Matrix3<f64> {
    reflection(&Vector3::from(normal))
}
const Z: [f64; 3] = [0.0, 0.0, 1.0];
const X: [f64; 3] = [1.0, 0.0, 0.0];
const Y: [f64; 3] = [0.0, 1.0, 0.0];

struct Book {
    group: &'static str,
    classes: Vec<(usize, Matrix3<f64>)>,
    irreps: Vec<(&'static str, Vec<f64>)>,
}

fn check(book: &Book) {
    let group: PointGroup = book.group.parse().unwrap();
    let table = character_table(group);
    assert_eq!(
        table.irreps.len(),
        book.irreps.len(),
        "{}: number of irreps",
        book.group
    );
    assert_eq!(
        table.classes.len(),
        book.classes.len(),
        "{}: number of classes",
        book.group
    );
    let h: usize = book.classes.iter().map(|(n, _)| n).sum();
    assert_eq!(table.order, h, "{}: order", book.group);
    let mut class_index = Vec::new();
    for (k, (size, m)) in book.classes.iter().enumerate() {
        let ci = table
            .class_of(m)
            .unwrap_or_else(|| panic!("{}: class {k} not an operation", book.group));
        assert_eq!(
            table.classes[ci].size, *size,
            "{}: size of class {k}",
            book.group
        );
        class_index.push(ci);
    }
    for (label, chars) in &book.irreps {
        let ir = table
            .irrep_index(label)
            .unwrap_or_else(|| panic!("{}: no irrep {label}", book.group));
        for (k, want) in chars.iter().enumerate() {
            let got = table.irreps[ir].characters[class_index[k]];
            assert!(
                (got - want).abs() < 1e-9,
                "{} {label} class {k}: got {got}, book {want}",
                book.group
            );
        }
    }
}

fn golden() -> f64 {
    (1.0 + 5f64.sqrt()) / 2.0
}

#[test]
fn c2v_c3v_c4v() {
    check(&Book {
        group: "C2v",
        classes: vec![(1, e()), (1, c(2.0, Z)), (1, sigma(Y)), (1, sigma(X))],
        irreps: vec![
            ("A1", vec![1., 1., 1., 1.]),
            ("A2", vec![1., 1., -1., -1.]),
            ("B1", vec![1., -1., 1., -1.]),
            ("B2", vec![1., -1., -1., 1.]),
        ],
    });
    check(&Book {
        group: "C3v",
        classes: vec![(1, e()), (2, c(3.0, Z)), (3, sigma(Y))],
        irreps: vec![
            ("A1", vec![1., 1., 1.]),
            ("A2", vec![1., 1., -1.]),
            ("E", vec![2., -1., 0.]),
        ],
    });
    check(&Book {
        group: "C4v",
        classes: vec![
            (1, e()),
            (2, c(4.0, Z)),
            (1, c(2.0, Z)),
            (2, sigma(Y)),
            (2, sigma([1., -1., 0.])),
        ],
        irreps: vec![
            ("A1", vec![1., 1., 1., 1., 1.]),
            ("A2", vec![1., 1., 1., -1., -1.]),
            ("B1", vec![1., -1., 1., 1., -1.]),
            ("B2", vec![1., -1., 1., -1., 1.]),
            ("E", vec![2., 0., -2., 0., 0.]),
        ],
    });
}

#[test]
fn c2h_c3h_s4() {
    check(&Book {
        group: "C2h",
        classes: vec![(1, e()), (1, c(2.0, Z)), (1, inv()), (1, sigma(Z))],
        irreps: vec![
            ("Ag", vec![1., 1., 1., 1.]),
            ("Bg", vec![1., -1., 1., -1.]),
            ("Au", vec![1., 1., -1., -1.]),
            ("Bu", vec![1., -1., -1., 1.]),
        ],
    });
    // Cotton lists E', E'' as complex pairs {ε, ε*}; summed here (ε + ε* = −1).
    check(&Book {
        group: "C3h",
        classes: vec![(1, e()), (2, c(3.0, Z)), (1, sigma(Z)), (2, s(3.0, Z))],
        irreps: vec![
            ("A'", vec![1., 1., 1., 1.]),
            ("E'", vec![2., -1., 2., -1.]),
            ("A''", vec![1., 1., -1., -1.]),
            ("E''", vec![2., -1., -2., 1.]),
        ],
    });
    // The other members of the merged classes are in the same column.
    let t = character_table("C3h".parse().unwrap());
    assert_eq!(t.class_of(&c(3.0, Z)), t.class_of(&ck(3.0, 2.0, Z)));
    assert_eq!(t.class_of(&s(3.0, Z)), t.class_of(&sk(3.0, 5.0, Z)));
    check(&Book {
        group: "S4",
        classes: vec![(1, e()), (2, s(4.0, Z)), (1, c(2.0, Z))],
        irreps: vec![
            ("A", vec![1., 1., 1.]),
            ("B", vec![1., -1., 1.]),
            ("E", vec![2., 0., -2.]),
        ],
    });
}

#[test]
fn d2h_d3h_d3d() {
    check(&Book {
        group: "D2h",
        classes: vec![
            (1, e()),
            (1, c(2.0, Z)),
            (1, c(2.0, Y)),
            (1, c(2.0, X)),
            (1, inv()),
            (1, sigma(Z)),
            (1, sigma(Y)),
            (1, sigma(X)),
        ],
        irreps: vec![
            ("Ag", vec![1., 1., 1., 1., 1., 1., 1., 1.]),
            ("B1g", vec![1., 1., -1., -1., 1., 1., -1., -1.]),
            ("B2g", vec![1., -1., 1., -1., 1., -1., 1., -1.]),
            ("B3g", vec![1., -1., -1., 1., 1., -1., -1., 1.]),
            ("Au", vec![1., 1., 1., 1., -1., -1., -1., -1.]),
            ("B1u", vec![1., 1., -1., -1., -1., -1., 1., 1.]),
            ("B2u", vec![1., -1., 1., -1., -1., 1., -1., 1.]),
            ("B3u", vec![1., -1., -1., 1., -1., 1., 1., -1.]),
        ],
    });
    check(&Book {
        group: "D3h",
        classes: vec![
            (1, e()),
            (2, c(3.0, Z)),
            (3, c(2.0, X)),
            (1, sigma(Z)),
            (2, s(3.0, Z)),
            (3, sigma(Y)),
        ],
        irreps: vec![
            ("A1'", vec![1., 1., 1., 1., 1., 1.]),
            ("A2'", vec![1., 1., -1., 1., 1., -1.]),
            ("E'", vec![2., -1., 0., 2., -1., 0.]),
            ("A1''", vec![1., 1., 1., -1., -1., -1.]),
            ("A2''", vec![1., 1., -1., -1., -1., 1.]),
            ("E''", vec![2., -1., 0., -2., 1., 0.]),
        ],
    });
    check(&Book {
        group: "D3d",
        classes: vec![
            (1, e()),
            (2, c(3.0, Z)),
            (3, c(2.0, X)),
            (1, inv()),
            (2, s(6.0, Z)),
            (3, sigma(X)),
        ],
        irreps: vec![
            ("A1g", vec![1., 1., 1., 1., 1., 1.]),
            ("A2g", vec![1., 1., -1., 1., 1., -1.]),
            ("Eg", vec![2., -1., 0., 2., -1., 0.]),
            ("A1u", vec![1., 1., 1., -1., -1., -1.]),
            ("A2u", vec![1., 1., -1., -1., -1., 1.]),
            ("Eu", vec![2., -1., 0., -2., 1., 0.]),
        ],
    });
}

#[test]
fn d4h_d5h_d6h_d2d() {
    check(&Book {
        group: "D4h",
        classes: vec![
            (1, e()),
            (2, c(4.0, Z)),
            (1, c(2.0, Z)),
            (2, c(2.0, X)),
            (2, c(2.0, [1., 1., 0.])),
            (1, inv()),
            (2, s(4.0, Z)),
            (1, sigma(Z)),
            (2, sigma(Y)),
            (2, sigma([1., -1., 0.])),
        ],
        irreps: vec![
            ("A1g", vec![1., 1., 1., 1., 1., 1., 1., 1., 1., 1.]),
            ("A2g", vec![1., 1., 1., -1., -1., 1., 1., 1., -1., -1.]),
            ("B1g", vec![1., -1., 1., 1., -1., 1., -1., 1., 1., -1.]),
            ("B2g", vec![1., -1., 1., -1., 1., 1., -1., 1., -1., 1.]),
            ("Eg", vec![2., 0., -2., 0., 0., 2., 0., -2., 0., 0.]),
            ("A1u", vec![1., 1., 1., 1., 1., -1., -1., -1., -1., -1.]),
            ("A2u", vec![1., 1., 1., -1., -1., -1., -1., -1., 1., 1.]),
            ("B1u", vec![1., -1., 1., 1., -1., -1., 1., -1., -1., 1.]),
            ("B2u", vec![1., -1., 1., -1., 1., -1., 1., -1., 1., -1.]),
            ("Eu", vec![2., 0., -2., 0., 0., -2., 0., 2., 0., 0.]),
        ],
    });
    let c72 = 2.0 * (2.0 * PI / 5.0).cos();
    let c144 = 2.0 * (4.0 * PI / 5.0).cos();
    check(&Book {
        group: "D5h",
        classes: vec![
            (1, e()),
            (2, c(5.0, Z)),
            (2, ck(5.0, 2.0, Z)),
            (5, c(2.0, X)),
            (1, sigma(Z)),
            (2, s(5.0, Z)),
            (2, sk(5.0, 3.0, Z)),
            (5, sigma(Y)),
        ],
        irreps: vec![
            ("A1'", vec![1., 1., 1., 1., 1., 1., 1., 1.]),
            ("A2'", vec![1., 1., 1., -1., 1., 1., 1., -1.]),
            ("E1'", vec![2., c72, c144, 0., 2., c72, c144, 0.]),
            ("E2'", vec![2., c144, c72, 0., 2., c144, c72, 0.]),
            ("A1''", vec![1., 1., 1., 1., -1., -1., -1., -1.]),
            ("A2''", vec![1., 1., 1., -1., -1., -1., -1., 1.]),
            ("E1''", vec![2., c72, c144, 0., -2., -c72, -c144, 0.]),
            ("E2''", vec![2., c144, c72, 0., -2., -c144, -c72, 0.]),
        ],
    });
    let sd = [(2.0 * PI / 3.0).cos(), (2.0 * PI / 3.0).sin(), 0.0];
    check(&Book {
        group: "D6h",
        classes: vec![
            (1, e()),
            (2, c(6.0, Z)),
            (2, c(3.0, Z)),
            (1, c(2.0, Z)),
            (3, c(2.0, X)),
            (3, c(2.0, [(PI / 6.0).cos(), (PI / 6.0).sin(), 0.0])),
            (1, inv()),
            (2, s(3.0, Z)),
            (2, s(6.0, Z)),
            (1, sigma(Z)),
            (3, sigma(sd)),
            (3, sigma(Y)),
        ],
        irreps: vec![
            ("A1g", vec![1., 1., 1., 1., 1., 1., 1., 1., 1., 1., 1., 1.]),
            (
                "A2g",
                vec![1., 1., 1., 1., -1., -1., 1., 1., 1., 1., -1., -1.],
            ),
            (
                "B1g",
                vec![1., -1., 1., -1., 1., -1., 1., -1., 1., -1., 1., -1.],
            ),
            (
                "B2g",
                vec![1., -1., 1., -1., -1., 1., 1., -1., 1., -1., -1., 1.],
            ),
            (
                "E1g",
                vec![2., 1., -1., -2., 0., 0., 2., 1., -1., -2., 0., 0.],
            ),
            (
                "E2g",
                vec![2., -1., -1., 2., 0., 0., 2., -1., -1., 2., 0., 0.],
            ),
            (
                "A1u",
                vec![1., 1., 1., 1., 1., 1., -1., -1., -1., -1., -1., -1.],
            ),
            (
                "A2u",
                vec![1., 1., 1., 1., -1., -1., -1., -1., -1., -1., 1., 1.],
            ),
            (
                "B1u",
                vec![1., -1., 1., -1., 1., -1., -1., 1., -1., 1., -1., 1.],
            ),
            (
                "B2u",
                vec![1., -1., 1., -1., -1., 1., -1., 1., -1., 1., 1., -1.],
            ),
            (
                "E1u",
                vec![2., 1., -1., -2., 0., 0., -2., -1., 1., 2., 0., 0.],
            ),
            (
                "E2u",
                vec![2., -1., -1., 2., 0., 0., -2., 1., 1., -2., 0., 0.],
            ),
        ],
    });
    check(&Book {
        group: "D2d",
        classes: vec![
            (1, e()),
            (2, s(4.0, Z)),
            (1, c(2.0, Z)),
            (2, c(2.0, X)),
            (2, sigma([1., -1., 0.])),
        ],
        irreps: vec![
            ("A1", vec![1., 1., 1., 1., 1.]),
            ("A2", vec![1., 1., 1., -1., -1.]),
            ("B1", vec![1., -1., 1., 1., -1.]),
            ("B2", vec![1., -1., 1., -1., 1.]),
            ("E", vec![2., 0., -2., 0., 0.]),
        ],
    });
}

#[test]
fn cubic_and_icosahedral() {
    let d3 = [1.0, 1.0, 1.0];
    check(&Book {
        group: "Td",
        classes: vec![
            (1, e()),
            (8, c(3.0, d3)),
            (3, c(2.0, Z)),
            (6, s(4.0, Z)),
            (6, sigma([1., -1., 0.])),
        ],
        irreps: vec![
            ("A1", vec![1., 1., 1., 1., 1.]),
            ("A2", vec![1., 1., 1., -1., -1.]),
            ("E", vec![2., -1., 2., 0., 0.]),
            ("T1", vec![3., 0., -1., 1., -1.]),
            ("T2", vec![3., 0., -1., -1., 1.]),
        ],
    });
    check(&Book {
        group: "Oh",
        classes: vec![
            (1, e()),
            (8, c(3.0, d3)),
            (6, c(2.0, [1., 1., 0.])),
            (6, c(4.0, Z)),
            (3, c(2.0, Z)),
            (1, inv()),
            (6, s(4.0, Z)),
            (8, s(6.0, d3)),
            (3, sigma(Z)),
            (6, sigma([1., -1., 0.])),
        ],
        irreps: vec![
            ("A1g", vec![1., 1., 1., 1., 1., 1., 1., 1., 1., 1.]),
            ("A2g", vec![1., 1., -1., -1., 1., 1., -1., 1., 1., -1.]),
            ("Eg", vec![2., -1., 0., 0., 2., 2., 0., -1., 2., 0.]),
            ("T1g", vec![3., 0., -1., 1., -1., 3., 1., 0., -1., -1.]),
            ("T2g", vec![3., 0., 1., -1., -1., 3., -1., 0., -1., 1.]),
            ("A1u", vec![1., 1., 1., 1., 1., -1., -1., -1., -1., -1.]),
            ("A2u", vec![1., 1., -1., -1., 1., -1., 1., -1., -1., 1.]),
            ("Eu", vec![2., -1., 0., 0., 2., -2., 0., 1., -2., 0.]),
            ("T1u", vec![3., 0., -1., 1., -1., -3., -1., 0., 1., 1.]),
            ("T2u", vec![3., 0., 1., -1., -1., -3., 1., 0., 1., -1.]),
        ],
    });
    // Th: {E} pairs summed (ε + ε* = −1).
    check(&Book {
        group: "Th",
        classes: vec![
            (1, e()),
            (8, c(3.0, d3)),
            (3, c(2.0, Z)),
            (1, inv()),
            (8, s(6.0, d3)),
            (3, sigma(Z)),
        ],
        irreps: vec![
            ("Ag", vec![1., 1., 1., 1., 1., 1.]),
            ("Eg", vec![2., -1., 2., 2., -1., 2.]),
            ("Tg", vec![3., 0., -1., 3., 0., -1.]),
            ("Au", vec![1., 1., 1., -1., -1., -1.]),
            ("Eu", vec![2., -1., 2., -2., 1., -2.]),
            ("Tu", vec![3., 0., -1., -3., 0., 1.]),
        ],
    });
    let a5 = icosahedral_c5_axis();
    let a5 = [a5.x, a5.y, a5.z];
    let p = golden();
    let q = 1.0 - golden(); // (1 − √5)/2
    check(&Book {
        group: "Ih",
        classes: vec![
            (1, e()),
            (12, c(5.0, a5)),
            (12, ck(5.0, 2.0, a5)),
            (20, c(3.0, d3)),
            (15, c(2.0, Z)),
            (1, inv()),
            (12, s(10.0, a5)),
            (12, sk(10.0, 3.0, a5)),
            (20, s(6.0, d3)),
            (15, sigma(Z)),
        ],
        irreps: vec![
            ("Ag", vec![1., 1., 1., 1., 1., 1., 1., 1., 1., 1.]),
            ("T1g", vec![3., p, q, 0., -1., 3., q, p, 0., -1.]),
            ("T2g", vec![3., q, p, 0., -1., 3., p, q, 0., -1.]),
            ("Gg", vec![4., -1., -1., 1., 0., 4., -1., -1., 1., 0.]),
            ("Hg", vec![5., 0., 0., -1., 1., 5., 0., 0., -1., 1.]),
            ("Au", vec![1., 1., 1., 1., 1., -1., -1., -1., -1., -1.]),
            ("T1u", vec![3., p, q, 0., -1., -3., -q, -p, 0., 1.]),
            ("T2u", vec![3., q, p, 0., -1., -3., -p, -q, 0., 1.]),
            ("Gu", vec![4., -1., -1., 1., 0., -4., 1., 1., -1., 0.]),
            ("Hu", vec![5., 0., 0., -1., 1., -5., 0., 0., 1., -1.]),
        ],
    });
}

fn all_groups() -> Vec<PointGroup> {
    let mut v = vec![PointGroup::C1, PointGroup::Cs, PointGroup::Ci];
    for n in 2..=8 {
        v.extend([
            PointGroup::Cn(n),
            PointGroup::Cnv(n),
            PointGroup::Cnh(n),
            PointGroup::Dn(n),
            PointGroup::Dnh(n),
            PointGroup::Dnd(n),
        ]);
    }
    for m in [4, 6, 8, 10, 12, 16] {
        v.push(PointGroup::S(m));
    }
    v.extend([
        PointGroup::T,
        PointGroup::Td,
        PointGroup::Th,
        PointGroup::O,
        PointGroup::Oh,
        PointGroup::I,
        PointGroup::Ih,
        PointGroup::CInfV,
        PointGroup::DInfH,
    ]);
    v
}

/// The great orthogonality theorem in real form (Cotton §4.2): rows are orthogonal with
/// norm h·ν (ν = 2 for a complex-conjugate pair), columns with norm h/|class|, and
/// Σ d²/ν = h; as many irreps as (real) classes.
#[test]
fn every_table_is_orthogonal_and_complete() {
    for g in all_groups() {
        let t = character_table(g);
        let h = t.order as f64;
        assert_eq!(t.irreps.len(), t.classes.len(), "{g}: square table");
        let sizes: Vec<f64> = t.classes.iter().map(|c| c.size as f64).collect();
        assert_eq!(
            sizes.iter().sum::<f64>(),
            h,
            "{g}: classes partition the group"
        );
        let mut sum_d2 = 0.0;
        for (i, a) in t.irreps.iter().enumerate() {
            sum_d2 += (a.dimension * a.dimension) as f64 / a.reality as f64;
            assert_eq!(
                a.characters[t.operation_class[0]], a.dimension as f64,
                "{g}: χ(E) = d"
            );
            for (j, b) in t.irreps.iter().enumerate() {
                let dot: f64 = (0..sizes.len())
                    .map(|c| sizes[c] * a.characters[c] * b.characters[c])
                    .sum();
                let want = if i == j { h * a.reality as f64 } else { 0.0 };
                assert!(
                    (dot - want).abs() < 1e-8,
                    "{g}: rows {i},{j}: {dot} vs {want}"
                );
            }
        }
        assert!((sum_d2 - h).abs() < 1e-8, "{g}: Σd²/ν = {sum_d2}, h = {h}");
        for c1 in 0..sizes.len() {
            for c2 in 0..sizes.len() {
                let dot: f64 = t
                    .irreps
                    .iter()
                    .map(|ir| ir.characters[c1] * ir.characters[c2] / ir.reality as f64)
                    .sum();
                let want = if c1 == c2 { h / sizes[c1] } else { 0.0 };
                assert!(
                    (dot - want).abs() < 1e-8,
                    "{g}: columns {c1},{c2}: {dot} vs {want}"
                );
            }
        }
        let mut labels: Vec<String> = t.irreps.iter().map(|ir| ir.label.upper()).collect();
        labels.sort();
        labels.dedup();
        assert_eq!(
            labels.len(),
            t.irreps.len(),
            "{g}: labels unique: {labels:?}"
        );
    }
}

#[test]
fn linear_groups_are_labelled_sigma_pi_delta_phi() {
    let t = character_table(PointGroup::DInfH);
    for name in [
        "Σg+", "Σu+", "Σg-", "Σu-", "Πg", "Πu", "Δg", "Δu", "Φg", "Φu",
    ] {
        assert!(t.irrep_index(name).is_some(), "D∞h has {name}");
    }
    let t = character_table(PointGroup::CInfV);
    for name in ["Σ+", "Σ-", "Π", "Δ", "Φ"] {
        assert!(t.irrep_index(name).is_some(), "C∞v has {name}");
    }
    // z is Σu+ in D∞h and Σ+ in C∞v (Cotton, appendix IIA): χ(σv) = +1, χ(i) = −1.
    let t = character_table(PointGroup::DInfH);
    let su = &t.irreps[t.irrep_index("Σu+").unwrap()];
    assert_eq!(su.characters[t.class_of(&sigma(Y)).unwrap()], 1.0);
    assert_eq!(su.characters[t.class_of(&inv()).unwrap()], -1.0);
    assert_eq!(format!("{}", su.label), "σu+");
}

#[test]
fn schoenflies_text_round_trips() {
    for g in all_groups() {
        let text = g.to_string();
        assert_eq!(text.parse::<PointGroup>().unwrap(), g, "{text}");
    }
    assert_eq!(PointGroup::CInfV.to_string(), "C∞v");
    assert_eq!(PointGroup::DInfH.to_string(), "D∞h");
    assert_eq!(PointGroup::S(4).to_string(), "S4");
}

#[test]
fn labels_print_in_lower_and_upper_case() {
    let t = character_table("D3h".parse().unwrap());
    let e1 = &t.irreps[t.irrep_index("E'").unwrap()].label;
    assert_eq!(e1.to_string(), "e'");
    assert_eq!(
        (e1.letter.as_str(), e1.subscript.as_str(), e1.primes),
        ("e", "", 1)
    );
    let a2 = &t.irreps[t.irrep_index("A2''").unwrap()].label;
    assert_eq!(
        (a2.letter.as_str(), a2.subscript.as_str(), a2.primes),
        ("a", "2", 2)
    );
    let t = character_table("D6h".parse().unwrap());
    let e = &t.irreps[t.irrep_index("E1g").unwrap()].label;
    assert_eq!((e.letter.as_str(), e.subscript.as_str()), ("e", "1g"));
    assert_eq!(e.to_string(), "e1g");
}

#[test]
fn class_names_follow_the_books() {
    let names = |g: &str| -> Vec<String> {
        character_table(g.parse().unwrap())
            .classes
            .iter()
            .map(|c| c.name.clone())
            .collect()
    };
    assert_eq!(names("C3v"), ["E", "2C3", "3σv"]);
    assert_eq!(names("Td"), ["E", "3C2", "8C3", "6S4", "6σd"]);
    assert!(names("Ih").contains(&"15σ".to_string()));
    assert!(names("D4h").contains(&"2C2''".to_string()));
}
