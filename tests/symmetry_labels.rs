//! Orbital labels. The extended Hückel engine is built in parallel, so the orbitals here
//! are made from SALCs with made-up energies, or from random Hamiltonians averaged over the
//! group (which commute with every operation, so their eigenvectors carry irreps). Expected
//! labels: ammonia's valence MOs 2a1, 1e, 3a1 and water's 2a1, 1b2, 3a1, 1b1 with the O 1s /
//! N 1s core counted as 1a1 (photoelectron assignments; e.g. Cotton ch. 8 and the usual MO
//! diagrams; from memory); ethylene's π is 1b3u with x perpendicular to the plane
//! (Mulliken 1955); N2's valence ordering 2σg+, 2σu+, 1πu, 3σg+, 1πg, 3σu+.

mod symmetry_support;

use diptych::chem::Molecule;
use diptych::chem::ao::{AngularKind, AtomicOrbital};
use diptych::symmetry::{
    AxisConvention, Numbering, Symmetry, SymmetrySettings, average_over_group, detect,
    label_orbitals, salcs, span,
};
use nalgebra::{DMatrix, DVector, Vector3};
use symmetry_support::*;

fn index(basis: &[AtomicOrbital], atom: usize, kind: AngularKind) -> usize {
    basis
        .iter()
        .position(|a| a.atom == atom && a.kind == kind)
        .unwrap()
}

/// Coefficient vector of the p orbital on `atom` along `dir` (molecule frame).
fn p_along(basis: &[AtomicOrbital], atom: usize, dir: Vector3<f64>) -> DVector<f64> {
    let mut v = DVector::zeros(basis.len());
    let d = dir.normalize();
    v[index(basis, atom, AngularKind::Px)] = d.x;
    v[index(basis, atom, AngularKind::Py)] = d.y;
    v[index(basis, atom, AngularKind::Pz)] = d.z;
    v
}

fn unit(basis: &[AtomicOrbital], atom: usize, kind: AngularKind) -> DVector<f64> {
    let mut v = DVector::zeros(basis.len());
    v[index(basis, atom, kind)] = 1.0;
    v
}

fn labels_of(
    sym: &Symmetry,
    m: &Molecule,
    basis: &[AtomicOrbital],
    orbitals: &[(f64, DVector<f64>)],
    numbering: Numbering,
) -> Vec<String> {
    let c = DMatrix::from_columns(&orbitals.iter().map(|o| o.1.clone()).collect::<Vec<_>>());
    let e: Vec<f64> = orbitals.iter().map(|o| o.0).collect();
    let s = DMatrix::identity(basis.len(), basis.len());
    label_orbitals(sym, m, basis, &c, &e, &s, numbering)
        .into_iter()
        .map(|l| l.text)
        .collect()
}

fn salc_vectors(sym: &Symmetry, basis: &[AtomicOrbital], label: &str) -> Vec<DVector<f64>> {
    salcs(sym, basis)
        .unwrap()
        .into_iter()
        .filter(|s| s.label.to_string() == label)
        .map(|s| s.coefficients)
        .collect()
}

fn ammonia_orbitals(sym: &Symmetry, basis: &[AtomicOrbital]) -> Vec<(f64, DVector<f64>)> {
    // a1 SALCs come out as N 2s, N 2p along the axis, H a1; e as N (px, py) and the H pair.
    let a1 = salc_vectors(sym, basis, "a1");
    let e = salc_vectors(sym, basis, "e");
    assert_eq!((a1.len(), e.len()), (3, 4));
    let n2s = &a1[0];
    let h_a1 = &a1[2];
    vec![
        (-30.0, n2s * 0.8 + h_a1 * 0.6),
        (-16.0, e[2].clone()),
        (-16.0, e[3].clone()),
        (-11.0, a1[1].clone()),
        (5.0, e[0].clone()),
        (5.0, e[1].clone()),
        (8.0, n2s * 0.6 - h_a1 * 0.8),
    ]
}

#[test]
fn ammonia_valence_labels() {
    for (k, m) in [
        ammonia(),
        rotated(&ammonia(), [0.3, -0.7, 0.2], 1.1, [2.0, -1.0, 0.5]),
    ]
    .iter()
    .enumerate()
    {
        let sym = detect(m, &SymmetrySettings::default()).unwrap();
        let basis = valence_basis(m);
        let orbitals = ammonia_orbitals(&sym, &basis);
        let core = labels_of(&sym, m, &basis, &orbitals, Numbering::CoreInclusive);
        assert_eq!(
            core,
            ["2a1", "1e", "1e", "3a1", "2e", "2e", "4a1"],
            "orientation {k}"
        );
        let valence = labels_of(&sym, m, &basis, &orbitals, Numbering::ValenceOnly);
        assert_eq!(valence, ["1a1", "1e", "1e", "2a1", "2e", "2e", "3a1"]);
    }
}

#[test]
fn water_valence_labels_in_both_conventions() {
    let m = water();
    let basis = valence_basis(&m);
    let normal = Vector3::z(); // the builder puts water in the xy plane
    let axis = Vector3::y(); // C2 axis
    let inplane = Vector3::x();
    let h_sum = (unit(&basis, 1, AngularKind::S) + unit(&basis, 2, AngularKind::S)) / 2f64.sqrt();
    let h_diff = (unit(&basis, 1, AngularKind::S) - unit(&basis, 2, AngularKind::S)) / 2f64.sqrt();
    let o2s = unit(&basis, 0, AngularKind::S);
    let orbitals = vec![
        (-32.0, &o2s * 0.9 + &h_sum * 0.435_889_894_354_067_4),
        (-18.0, (p_along(&basis, 0, inplane) + &h_diff) / 2f64.sqrt()),
        (-14.0, p_along(&basis, 0, axis)),
        (-12.0, p_along(&basis, 0, normal)),
        (4.0, (p_along(&basis, 0, inplane) - &h_diff) / 2f64.sqrt()),
        (6.0, &o2s * 0.435_889_894_354_067_4 - &h_sum * 0.9),
    ];
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    let labels = labels_of(&sym, &m, &basis, &orbitals, Numbering::CoreInclusive);
    assert_eq!(labels, ["2a1", "1b2", "3a1", "1b1", "2b2", "4a1"]);
    let other = SymmetrySettings {
        axis_convention: AxisConvention::InPlaneX,
        ..SymmetrySettings::default()
    };
    let sym2 = detect(&m, &other).unwrap();
    let labels = labels_of(&sym2, &m, &basis, &orbitals, Numbering::CoreInclusive);
    assert_eq!(labels, ["2a1", "1b1", "3a1", "1b2", "2b1", "4a1"]);
}

#[test]
fn ethylene_pi_is_b3u_with_x_perpendicular() {
    let m = ethylene();
    let basis = valence_basis(&m);
    let pi = (p_along(&basis, 0, Vector3::z()) + p_along(&basis, 1, Vector3::z())) / 2f64.sqrt();
    let pi_star =
        (p_along(&basis, 0, Vector3::z()) - p_along(&basis, 1, Vector3::z())) / 2f64.sqrt();
    let orbitals = vec![(-13.0, pi), (-8.0, pi_star)];
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "D2h");
    let labels = labels_of(&sym, &m, &basis, &orbitals, Numbering::ValenceOnly);
    assert_eq!(labels, ["1b3u", "1b2g"]);
    let other = SymmetrySettings {
        axis_convention: AxisConvention::InPlaneX,
        ..SymmetrySettings::default()
    };
    let sym2 = detect(&m, &other).unwrap();
    let labels = labels_of(&sym2, &m, &basis, &orbitals, Numbering::ValenceOnly);
    assert_eq!(labels, ["1b1u", "1b2g"]);
}

#[test]
fn dinitrogen_sigma_pi_labels() {
    let m = dinitrogen(); // atom 0 at +z, atom 1 at −z
    let basis = valence_basis(&m);
    let r = 1.0 / 2f64.sqrt();
    let s = |a| unit(&basis, a, AngularKind::S);
    let p = |a, k| unit(&basis, a, k);
    use AngularKind::*;
    let orbitals = vec![
        (-40.0, (s(0) + s(1)) * r),
        (-20.0, (s(0) - s(1)) * r),
        (-16.0, (p(0, Px) + p(1, Px)) * r),
        (-16.0, (p(0, Py) + p(1, Py)) * r),
        (-15.0, (p(0, Pz) - p(1, Pz)) * r),
        (5.0, (p(0, Px) - p(1, Px)) * r),
        (5.0, (p(0, Py) - p(1, Py)) * r),
        (20.0, (p(0, Pz) + p(1, Pz)) * r),
    ];
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "D∞h");
    let labels = labels_of(&sym, &m, &basis, &orbitals, Numbering::CoreInclusive);
    assert_eq!(
        labels,
        ["2σg+", "2σu+", "1πu", "1πu", "3σg+", "1πg", "1πg", "3σu+"]
    );
    // C∞v: carbon monoxide, both 1s cores are σ+, so the first valence σ is 3σ+.
    let co = carbon_monoxide();
    let sym = detect(&co, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "C∞v");
    let basis = valence_basis(&co);
    let orbitals = vec![
        (-30.0, unit(&basis, 1, AngularKind::S)),
        (-15.0, unit(&basis, 0, AngularKind::Px)),
        (-15.0, unit(&basis, 0, AngularKind::Py)),
    ];
    let labels = labels_of(&sym, &co, &basis, &orbitals, Numbering::CoreInclusive);
    assert_eq!(labels, ["3σ+", "1π", "1π"]);
}

/// Eigenvectors of a random invariant Hamiltonian with a non-trivial invariant overlap:
/// every orbital gets an irrep, the irrep counts equal the reduction of the basis, and
/// members of a degenerate set share one label.
fn check_invariant(m: &Molecule, seed: u64) {
    let sym = detect(m, &SymmetrySettings::default()).unwrap();
    let basis = valence_basis(m);
    let n = basis.len();
    let h = average_over_group(&sym, &basis, &(pseudo_random_symmetric(n, seed) * 10.0)).unwrap();
    let b = pseudo_random_symmetric(n, seed + 1) * 0.05;
    let s = average_over_group(
        &sym,
        &basis,
        &(DMatrix::identity(n, n) + &b * b.transpose()),
    )
    .unwrap();
    // Löwdin: X = S^{-1/2}; eigenvectors of Xᵀ H X; C = X U.
    let es = s.clone().symmetric_eigen();
    let x = &es.eigenvectors
        * DMatrix::from_diagonal(&es.eigenvalues.map(|v| 1.0 / v.sqrt()))
        * es.eigenvectors.transpose();
    let eig = (&x * &h * &x).symmetric_eigen();
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by(|&a, &b| eig.eigenvalues[a].total_cmp(&eig.eigenvalues[b]));
    let c = DMatrix::from_fn(n, n, |r, k| (&x * &eig.eigenvectors)[(r, order[k])]);
    let e: Vec<f64> = order.iter().map(|&k| eig.eigenvalues[k]).collect();
    let labels = label_orbitals(&sym, m, &basis, &c, &e, &s, Numbering::ValenceOnly);
    let mult = span(&sym, &basis).unwrap();
    for l in &labels {
        assert!(l.irrep.is_some(), "{}: {:?}", m.name, l.reason);
    }
    for (k, ir) in sym.table.irreps.iter().enumerate() {
        let count = labels
            .iter()
            .filter(|l| l.irrep.as_ref() == Some(&ir.label))
            .count();
        assert_eq!(count, mult[k] * ir.dimension, "{}: {}", m.name, ir.label);
        // Valence-only numbers run 1..=multiplicity.
        let mut numbers: Vec<String> = labels
            .iter()
            .filter(|l| l.irrep.as_ref() == Some(&ir.label))
            .map(|l| l.text.clone())
            .collect();
        numbers.dedup();
        let want: Vec<String> = (1..=mult[k]).map(|i| format!("{i}{}", ir.label)).collect();
        assert_eq!(numbers, want, "{}", m.name);
    }
    for w in labels.windows(2) {
        if w[0].degenerate_set == w[1].degenerate_set {
            assert_eq!(w[0].text, w[1].text);
        }
    }
}

#[test]
fn invariant_hamiltonians_are_fully_labelled() {
    check_invariant(&ammonia(), 1);
    check_invariant(
        &rotated(&ammonia(), [1.0, 2.0, 3.0], 0.4, [0.0, 1.0, 0.0]),
        2,
    );
    check_invariant(&water(), 3);
    check_invariant(&methane(), 4);
    check_invariant(&benzene(), 5);
    check_invariant(&ethylene(), 6);
    check_invariant(&sf6(), 7);
    check_invariant(&dinitrogen(), 8);
    check_invariant(&carbon_monoxide(), 9);
}

#[test]
fn broken_symmetry_gives_a_question_mark_with_a_reason() {
    let m = ammonia();
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    let basis = valence_basis(&m);
    let mut orbitals = ammonia_orbitals(&sym, &basis);
    // Mix an a1 and an e orbital.
    let mixed = (&orbitals[0].1 + &orbitals[1].1) / 2f64.sqrt();
    orbitals[0].1 = mixed;
    let c = DMatrix::from_columns(&orbitals.iter().map(|o| o.1.clone()).collect::<Vec<_>>());
    let e: Vec<f64> = orbitals.iter().map(|o| o.0).collect();
    let s = DMatrix::identity(basis.len(), basis.len());
    let labels = label_orbitals(&sym, &m, &basis, &c, &e, &s, Numbering::CoreInclusive);
    assert_eq!(labels[0].text, "?");
    assert!(labels[0].irrep.is_none());
    assert!(
        labels[0].reason.as_ref().unwrap().contains("mixes"),
        "{:?}",
        labels[0].reason
    );
    // An e pair split by 0.3 eV is reported as a broken degeneracy …
    let mut split = ammonia_orbitals(&sym, &basis);
    split[2].0 = -15.7;
    let c = DMatrix::from_columns(&split.iter().map(|o| o.1.clone()).collect::<Vec<_>>());
    let e: Vec<f64> = split.iter().map(|o| o.0).collect();
    let labels = label_orbitals(&sym, &m, &basis, &c, &e, &s, Numbering::CoreInclusive);
    assert_eq!(labels[1].text, "?");
    assert!(
        labels[1].reason.as_ref().unwrap().contains("degenera"),
        "{:?}",
        labels[1].reason
    );
    // … but a split of 0.01 eV still gives 1e.
    split[2].0 = -15.99;
    let e: Vec<f64> = split.iter().map(|o| o.0).collect();
    let labels = label_orbitals(&sym, &m, &basis, &c, &e, &s, Numbering::CoreInclusive);
    assert_eq!(labels[1].text, "1e");
    assert_eq!(labels[2].text, "1e");
    assert_eq!(labels[3].text, "3a1");
    // Mismatched sizes: every orbital "?" with the reason.
    let labels = label_orbitals(&sym, &m, &basis[..3], &c, &e, &s, Numbering::CoreInclusive);
    assert!(labels.iter().all(|l| l.text == "?" && l.reason.is_some()));
}

#[test]
fn c1_molecules_are_numbered_a() {
    // CHFClBr: C1; cores C 1s, F 1s, Cl 1s2s2p (5), Br through 3d (14) = 21 a core sets.
    let m = mol(
        "CHFClBr",
        &[
            ("C", [0.0, 0.0, 0.0]),
            ("H", [0.63, 0.63, 0.63]),
            ("F", [-0.78, -0.78, 0.78]),
            ("Cl", [-1.02, 1.02, -1.02]),
            ("Br", [1.12, -1.12, -1.12]),
        ],
    );
    let sym = detect(&m, &SymmetrySettings::default()).unwrap();
    assert_eq!(sym.group.to_string(), "C1");
    let basis = valence_basis(&m);
    let n = basis.len();
    let (c, e) = invariant_orbitals(&sym, &basis, 3);
    let s = DMatrix::identity(n, n);
    let labels = label_orbitals(&sym, &m, &basis, &c, &e, &s, Numbering::CoreInclusive);
    assert_eq!(labels[0].text, "22a");
    let labels = label_orbitals(&sym, &m, &basis, &c, &e, &s, Numbering::ValenceOnly);
    assert_eq!(labels[n - 1].text, format!("{n}a"));
}

/// A geometry that is symmetric only within the tolerance still gets labels (the small
/// splitting of e pairs is bridged), and its symmetrized version gets the same labels.
#[test]
fn slightly_distorted_geometries_are_still_labelled() {
    for (base, group) in [(ammonia(), "C3v"), (methane(), "Td"), (benzene(), "D6h")] {
        let mut m = base.clone();
        // Push one atom by 0.004 Å (inside the default 0.01 Å tolerance).
        m.atoms[1].position += Vector3::new(0.003, -0.002, 0.002);
        let sym = detect(&m, &SymmetrySettings::default()).unwrap();
        assert_eq!(sym.group.to_string(), group);
        let basis = valence_basis(&m);
        let label = |geometry: &Molecule| -> Vec<String> {
            let h = two_centre_matrix(geometry, &basis, 12.0, true);
            let s = two_centre_matrix(geometry, &basis, 0.3, false);
            let (c, e) = solve(&h, &s);
            label_orbitals(&sym, geometry, &basis, &c, &e, &s, Numbering::CoreInclusive)
                .into_iter()
                .map(|l| {
                    assert!(l.irrep.is_some(), "{}: {:?}", geometry.name, l.reason);
                    l.text
                })
                .collect()
        };
        let distorted = label(&m);
        let ideal = label(&diptych::symmetry::symmetrize(&m, &sym));
        assert_eq!(distorted, ideal, "{group}");
    }
}

/// With no atom on any in-plane axis (rectangular C4H4, D2h), the frame is still the same
/// in every orientation: the b2u/b3u labels of the σ framework do not swap.
#[test]
fn d2h_frame_does_not_depend_on_orientation() {
    let base = mol(
        "rectangular cyclobutadiene",
        &[
            ("C", [0.79, 0.67, 0.0]),
            ("C", [-0.79, 0.67, 0.0]),
            ("C", [0.79, -0.67, 0.0]),
            ("C", [-0.79, -0.67, 0.0]),
            ("H", [1.55, 1.42, 0.0]),
            ("H", [-1.55, 1.42, 0.0]),
            ("H", [1.55, -1.42, 0.0]),
            ("H", [-1.55, -1.42, 0.0]),
        ],
    );
    let mut reference: Option<Vec<String>> = None;
    for (k, (axis, angle)) in [
        ([0.0, 0.0, 1.0], 0.0),
        ([0.0, 0.0, 1.0], std::f64::consts::FRAC_PI_2),
        ([1.0, 2.0, 3.0], 2.0),
        ([-3.0, 1.0, 0.5], 4.0),
    ]
    .iter()
    .enumerate()
    {
        let m = rotated(&base, *axis, *angle, [0.5, 0.5, 0.5]);
        let sym = detect(&m, &SymmetrySettings::default()).unwrap();
        assert_eq!(sym.group.to_string(), "D2h");
        let basis = valence_basis(&m);
        // One H 1s orbital per SALC irrep, in basis order: their labels fix the frame.
        let labels: Vec<String> = salcs(&sym, &basis[basis.len() - 4..])
            .unwrap()
            .iter()
            .map(|s| s.label.to_string())
            .collect();
        match &reference {
            None => reference = Some(labels),
            Some(r) => assert_eq!(&labels, r, "orientation {k}"),
        }
    }
    // z runs along the longer (C–C 1.58 Å) direction, x is perpendicular to the plane.
    let sym = detect(&base, &SymmetrySettings::default()).unwrap();
    let z: Vector3<f64> = sym.frame.row(2).transpose();
    let x: Vector3<f64> = sym.frame.row(0).transpose();
    assert!(z.cross(&Vector3::x()).norm() < 1e-6, "{z}");
    assert!(x.cross(&Vector3::z()).norm() < 1e-6, "{x}");
}
