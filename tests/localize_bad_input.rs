//! Bad and degenerate input for the localizer and the links: a deterministic answer, never
//! a hang or a panic (issue 6, "Bad input").

use diptych::chem::{Atom, Element, Molecule};
use diptych::eht::{EhtSettings, run};
use diptych::link::{LINK_THRESHOLD, LevelSets, LinkError, link, weights};
use diptych::localize::{
    LocalizeError, LocalizeOptions, LocalizedKind, Start, describe, localization_function,
    localize_occupied, pipek_mezey,
};
use nalgebra::DMatrix;

fn atom(symbol: &str, position: [f64; 3]) -> Atom {
    Atom::new(Element::from_symbol(symbol).expect("element"), position)
}

#[test]
fn no_occupied_orbitals() {
    let s = DMatrix::identity(4, 4);
    let c = DMatrix::zeros(4, 0);
    let map = [0, 0, 1, 1];
    let result = pipek_mezey(&c, &s, &map, &LocalizeOptions::default()).expect("empty is fine");
    assert_eq!(result.orbitals.ncols(), 0);
    assert_eq!(result.function_value, 0.0);
    assert!(result.converged);
    assert_eq!(result.sweeps, 0);
    let canonical = DMatrix::identity(4, 4);
    let links = link(
        &c,
        &canonical,
        &s,
        &[0.0; 4],
        LevelSets::None,
        LINK_THRESHOLD,
    )
    .expect("empty links");
    assert!(links.entries.is_empty());
    assert_eq!(links.weights.nrows(), 0);
}

/// One atom: every rotation among its orbitals leaves P unchanged (each orbital is wholly
/// on the atom), so nothing rotates and the input comes back, converged.
#[test]
fn single_atoms_are_left_as_they_are() {
    for symbol in ["H", "N", "O", "Cl", "P"] {
        let molecule = Molecule::new(symbol, vec![atom(symbol, [0.0; 3])], 0);
        let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
        let first = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
        let second = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
        assert_eq!(first, second, "{symbol}: deterministic");
        assert!(first.converged, "{symbol}");
        assert!(first.sweeps <= 1, "{symbol}: {} sweeps", first.sweeps);
        let n = first.orbitals.ncols();
        // From the input orbitals, nothing rotates at all.
        let input = LocalizeOptions {
            start: Start::Input,
            ..Default::default()
        };
        let plain = localize_occupied(&eht, &input).expect("localizes");
        assert!((plain.rotation.clone() - DMatrix::identity(n, n)).amax() < 1e-12);
        assert!(plain.sweeps <= 1);
        assert!((first.function_value - n as f64).abs() < 1e-12);
        let described = describe(
            &first.orbitals,
            &eht.overlap,
            &eht.hamiltonian,
            &eht.basis,
            &molecule,
        )
        .expect("describe");
        assert!(described.iter().all(|d| d.kind == LocalizedKind::LonePair));
    }
}

/// Many equivalent maxima: six well-separated H2 molecules on a ring (every canonical MO
/// delocalized over all of them; degenerate sets) and a neon-like closed shell of lone
/// pairs (F⁻). Deterministic, converged, and the H2 bonds are found.
#[test]
fn many_degenerate_rotations() {
    let mut atoms = Vec::new();
    for k in 0..6 {
        let phi = std::f64::consts::PI * k as f64 / 3.0;
        let (x, y) = (6.0 * phi.cos(), 6.0 * phi.sin());
        atoms.push(atom("H", [x, y, 0.37]));
        atoms.push(atom("H", [x, y, -0.37]));
    }
    let molecule = Molecule::new("(H2)6", atoms, 0);
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    let a = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
    let b = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
    assert_eq!(a, b);
    assert!(a.converged);
    let described = describe(
        &a.orbitals,
        &eht.overlap,
        &eht.hamiltonian,
        &eht.basis,
        &molecule,
    )
    .expect("describe");
    assert!(
        described.iter().all(|d| d.label == "σ(H–H)"),
        "{described:?}"
    );
    let fluoride = Molecule::new("F-", vec![atom("F", [0.0; 3])], -1);
    let eht = run(&fluoride, &EhtSettings::default()).expect("EHT runs");
    let f = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
    assert!(f.converged);
    assert_eq!(f.orbitals.ncols(), 4);
}

#[test]
fn sweep_cap_reports_non_convergence() {
    // Two atoms with one AO each, S = I, orbitals (a ± b)/√2: a saddle point (B = 0,
    // A > 0); one rotation by π/4 localizes them (P from 1 to 2).
    let s = DMatrix::identity(2, 2);
    let h = std::f64::consts::FRAC_1_SQRT_2;
    let c = DMatrix::from_row_slice(2, 2, &[h, h, h, -h]);
    let map = [0, 1];
    assert!((localization_function(&c, &s, &map).unwrap() - 1.0).abs() < 1e-12);
    let none = LocalizeOptions {
        max_sweeps: 0,
        ..Default::default()
    };
    let r = pipek_mezey(&c, &s, &map, &none).expect("runs");
    assert!(!r.converged);
    assert_eq!(r.sweeps, 0);
    let r = pipek_mezey(&c, &s, &map, &LocalizeOptions::default()).expect("runs");
    assert!(r.converged);
    assert!((r.function_value - 2.0).abs() < 1e-12);
}

#[test]
fn malformed_matrices_are_typed_errors() {
    let s = DMatrix::identity(3, 3);
    let c = DMatrix::identity(3, 2);
    let opts = LocalizeOptions::default();
    assert!(matches!(
        pipek_mezey(&c, &DMatrix::identity(2, 2), &[0, 0, 1], &opts),
        Err(LocalizeError::DimensionMismatch { .. })
    ));
    assert!(matches!(
        pipek_mezey(&c, &s, &[0, 1], &opts),
        Err(LocalizeError::AtomMapLength { .. })
    ));
    let mut bad = c.clone();
    bad[(0, 0)] = f64::NAN;
    assert!(matches!(
        pipek_mezey(&bad, &s, &[0, 0, 1], &opts),
        Err(LocalizeError::NonFinite)
    ));
    assert!(matches!(weights(&bad, &s, &s), Err(LinkError::NonFinite)));
    assert!(matches!(
        weights(&c, &DMatrix::identity(2, 2), &s),
        Err(LinkError::DimensionMismatch { .. })
    ));
    assert!(matches!(
        link(&c, &s, &s, &[2.0], LevelSets::None, LINK_THRESHOLD),
        Err(LinkError::LengthMismatch { .. })
    ));
    assert!(matches!(
        link(
            &c,
            &s,
            &s,
            &[2.0, 2.0, 0.0],
            LevelSets::ByEnergy {
                energies: &[1.0, 2.0, 3.0],
                tolerance: f64::NAN
            },
            LINK_THRESHOLD
        ),
        Err(LinkError::BadTolerance(_))
    ));
}
