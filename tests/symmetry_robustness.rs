//! Degenerate and hostile inputs give an answer or a typed error, never a panic or a hang;
//! detection does not depend on orientation or position (property test); symmetrize is
//! exact and moves no atom more than the tolerance.

mod symmetry_support;

use diptych::chem::{Atom, Molecule};
use diptych::symmetry::{SymmetryError, SymmetrySettings, detect, symmetrize};
use proptest::prelude::*;
use symmetry_support::*;

fn tol(t: f64) -> SymmetrySettings {
    SymmetrySettings {
        tolerance: t,
        ..SymmetrySettings::default()
    }
}

#[test]
fn one_atom_is_a_typed_error() {
    let m = mol("neon", &[("Ne", [1.0, 2.0, 3.0])]);
    assert_eq!(
        detect(&m, &SymmetrySettings::default()),
        Err(SymmetryError::SingleAtom)
    );
    let empty = Molecule::new("empty", vec![], 0);
    assert_eq!(
        detect(&empty, &SymmetrySettings::default()),
        Err(SymmetryError::NoAtoms)
    );
}

#[test]
fn two_atoms_and_collinear_molecules_are_linear() {
    let hcl = mol("HCl", &[("H", [0.3, 0.1, 0.2]), ("Cl", [1.1, 0.9, 1.0])]);
    assert_eq!(
        detect(&hcl, &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "C∞v"
    );
    let h2 = mol("H2", &[("H", [0.0, 0.0, 0.0]), ("H", [0.5, 0.5, 0.0])]);
    assert_eq!(
        detect(&h2, &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "D∞h"
    );
    let hcn = rotated(
        &mol(
            "HCN",
            &[
                ("H", [0.0, 0.0, -1.07]),
                ("C", [0.0, 0.0, 0.0]),
                ("N", [0.0, 0.0, 1.16]),
            ],
        ),
        [1.0, 1.0, 0.0],
        0.7,
        [1.0, 2.0, 3.0],
    );
    let sym = detect(&hcn, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "C∞v");
    assert_eq!(sym.operations.len(), 16, "through C8v");
}

#[test]
fn nearly_linear_is_not_linear() {
    // CO2 bent so that C is 0.05 Å off the O–O line: C2v at 0.01 Å, D∞h at 0.2 Å.
    let co2 = mol(
        "bent CO2",
        &[
            ("C", [0.0, 0.05, 0.0]),
            ("O", [1.16, 0.0, 0.0]),
            ("O", [-1.16, 0.0, 0.0]),
        ],
    );
    assert_eq!(
        detect(&co2, &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "C2v"
    );
    assert_eq!(detect(&co2, &tol(0.2)).unwrap().group.to_string(), "D∞h");
}

#[test]
fn bad_tolerances_are_typed_errors() {
    let m = ammonia();
    for t in [0.0, -0.01, f64::NAN, f64::INFINITY, 10.0, 1e9] {
        match detect(&m, &tol(t)) {
            Err(SymmetryError::InvalidTolerance(_)) => {}
            other => panic!("tolerance {t}: {other:?}"),
        }
    }
    // The largest accepted tolerance still gives an answer or a typed error.
    let _ = detect(&m, &tol(diptych::symmetry::MAX_TOLERANCE));
    let _ = detect(&benzene(), &tol(0.5));
    let _ = detect(&sf6(), &tol(0.4));
}

#[test]
fn non_finite_and_coincident_atoms_are_typed_errors() {
    let mut m = ammonia();
    m.atoms[1].position.x = f64::NAN;
    assert_eq!(
        detect(&m, &SymmetrySettings::default()),
        Err(SymmetryError::NonFiniteCoordinate(1))
    );
    let two = mol(
        "same place",
        &[
            ("H", [0.0, 0.0, 0.0]),
            ("H", [0.0, 0.0, 0.0001]),
            ("O", [1.0, 0.0, 0.0]),
        ],
    );
    assert!(matches!(
        detect(&two, &SymmetrySettings::default()),
        Err(SymmetryError::CoincidentAtoms(..))
    ));
}

fn lcg(seed: &mut u64) -> f64 {
    *seed = seed
        .wrapping_mul(6364136223846793005)
        .wrapping_add(1442695040888963407);
    (*seed >> 11) as f64 / (1u64 << 53) as f64
}

#[test]
fn five_hundred_atoms_answer_quickly() {
    // Unoptimized (debug) builds are far slower; the bounds are for release builds.
    let slack = if cfg!(debug_assertions) { 60.0 } else { 1.0 };
    // Random cloud: C1.
    let mut seed = 7u64;
    let atoms: Vec<Atom> = (0..500)
        .map(|k| {
            let p = [
                (k % 10) as f64 * 1.5 + lcg(&mut seed) * 0.3,
                ((k / 10) % 10) as f64 * 1.5 + lcg(&mut seed) * 0.3,
                (k / 100) as f64 * 1.5 + lcg(&mut seed) * 0.3,
            ];
            Atom::new(el(if k % 3 == 0 { "C" } else { "H" }), p)
        })
        .collect();
    let m = Molecule::new("cloud", atoms, 0);
    let start = std::time::Instant::now();
    assert_eq!(
        detect(&m, &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "C1"
    );
    assert!(start.elapsed().as_secs_f64() < slack * 5.0, "bounded");
    // A 10×10×5 simple-cubic block of one element: D4h (square 10×10 base, height 5).
    let atoms: Vec<Atom> = (0..500)
        .map(|k| {
            Atom::new(
                el("C"),
                [
                    (k % 10) as f64 * 1.5,
                    ((k / 10) % 10) as f64 * 1.5,
                    (k / 100) as f64 * 1.5,
                ],
            )
        })
        .collect();
    let m = Molecule::new("block", atoms, 0);
    let start = std::time::Instant::now();
    assert_eq!(
        detect(&m, &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "D4h"
    );
    assert!(start.elapsed().as_secs_f64() < slack * 10.0, "bounded");
    // 501 atoms: typed error.
    let atoms: Vec<Atom> = (0..501)
        .map(|k| Atom::new(el("H"), [k as f64, 0.0, 0.0]))
        .collect();
    assert!(matches!(
        detect(
            &Molecule::new("long", atoms, 0),
            &SymmetrySettings::default()
        ),
        Err(SymmetryError::TooManyAtoms(501))
    ));
}

#[test]
fn a_twisted_ethane_is_d3_and_c60_is_ih() {
    let t = 70.5f64.to_radians();
    let mut atoms = vec![("C", [0.0, 0.0, 0.77]), ("C", [0.0, 0.0, -0.77])];
    for k in 0..3 {
        let a = 2.0 * std::f64::consts::PI * k as f64 / 3.0;
        let b = a + 0.5;
        atoms.push((
            "H",
            [
                1.09 * t.sin() * a.cos(),
                1.09 * t.sin() * a.sin(),
                0.77 + 1.09 * t.cos(),
            ],
        ));
        atoms.push((
            "H",
            [
                1.09 * t.sin() * b.cos(),
                1.09 * t.sin() * b.sin(),
                -0.77 - 1.09 * t.cos(),
            ],
        ));
    }
    assert_eq!(
        detect(&mol("ethane", &atoms), &SymmetrySettings::default())
            .unwrap()
            .group
            .to_string(),
        "D3"
    );
    let sym = detect(&c60(), &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "Ih");
    assert_eq!(sym.operations.len(), 120);
    assert_eq!(sym.equivalent_atoms().len(), 1);
}

#[test]
fn symmetrize_idealizes_a_distorted_geometry() {
    // Ammonia with one N–H stretched by 0.004 Å: still C3v at 0.01 Å; symmetrize makes the
    // three N–H distances equal and moves no atom more than the tolerance.
    let mut m = ammonia();
    let d = m.atoms[1].position - m.atoms[0].position;
    m.atoms[1].position += d.normalize() * 0.004;
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "C3v");
    let s = symmetrize(&m, &sym);
    let r: Vec<f64> = (1..4)
        .map(|i| (s.atoms[i].position - s.atoms[0].position).norm())
        .collect();
    assert!(
        (r[0] - r[1]).abs() < 1e-12 && (r[1] - r[2]).abs() < 1e-12,
        "{r:?}"
    );
    for (a, b) in m.atoms.iter().zip(&s.atoms) {
        assert!((a.position - b.position).norm() <= 0.01);
    }
    let again = detect(&s, &tol(1e-6)).unwrap();
    assert_eq!(again.group.to_string(), "C3v");
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    #[test]
    fn detection_is_invariant_to_orientation_and_position(
        ax in prop::array::uniform3(-1.0f64..1.0),
        angle in 0.0f64..6.3,
        shift in prop::array::uniform3(-20.0f64..20.0),
        pick in 0usize..6,
    ) {
        prop_assume!(ax.iter().map(|x| x * x).sum::<f64>() > 1e-3);
        let base = [ammonia(), water(), methane(), sf6(), benzene(), ethylene()][pick].clone();
        let want = detect(&base, &SymmetrySettings::default()).unwrap();
        let moved = rotated(&base, ax, angle, shift);
        let got = detect(&moved, &SymmetrySettings::default()).unwrap();
        prop_assert_eq!(got.group, want.group);
        prop_assert_eq!(got.operations.len(), want.operations.len());
        prop_assert!(got.max_deviation < 1e-6);
    }
}
