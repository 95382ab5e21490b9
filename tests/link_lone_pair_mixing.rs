//! The lone-pair mixing switch (DESIGN §4.6) on ammonia (demo geometry, N on the C3 axis z,
//! the H atoms below it, so the lone pair points along +z).
//!
//! Reasoning checked: with mixing off, the lone-pair orbital l has no H or S element to any
//! other function, so it is itself an eigenvector with ε = ⟨l|H|l⟩ — the N 2p VSIP for a
//! pure p lone pair, the hybrid energy (ε_s + λ ε_p)/(1 + λ) for an sp^λ one (Hoffmann's
//! parameters: N 2s −26.0, 2p −13.4 eV). l is a1 in C3v, so only a1 levels can change:
//! the e levels are untouched by symmetry (to 1e-8 here).

use std::path::PathBuf;

use diptych::chem::ao::AngularKind;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtResult, EhtSettings, run};
use diptych::localized::switch::{MixingComparison, compare_mixing};
use nalgebra::DVector;

fn ammonia() -> EhtResult {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz");
    let text = std::fs::read_to_string(path).expect("demo geometry");
    let molecule = parse_xyz(&text, "ammonia").expect("valid XYZ").molecule;
    run(&molecule, &EhtSettings::default()).expect("EHT runs")
}

fn index_of(eht: &EhtResult, atom: usize, kind: AngularKind) -> usize {
    eht.basis
        .orbitals
        .iter()
        .position(|o| o.atom == atom && o.kind == kind)
        .expect("basis function")
}

/// Indices of the levels in degenerate pairs (1e-6 eV).
fn e_levels(energies: &[f64]) -> Vec<usize> {
    (0..energies.len())
        .filter(|&j| {
            (0..energies.len()).any(|i| i != j && (energies[i] - energies[j]).abs() < 1e-6)
        })
        .collect()
}

fn check_e_unchanged(comparison: &MixingComparison) {
    let on_e = e_levels(&comparison.on.energies);
    let off_e = e_levels(&comparison.off.solution.energies);
    assert_eq!(on_e.len(), 4, "ammonia has two e pairs");
    assert_eq!(off_e.len(), 4);
    for (&a, &b) in on_e.iter().zip(&off_e) {
        let (e_on, e_off) = (
            comparison.on.energies[a],
            comparison.off.solution.energies[b],
        );
        assert!((e_on - e_off).abs() < 1e-8, "e level {e_on} vs {e_off}");
    }
    // The matching pairs e with e, and their shift is zero.
    for &j in &off_e {
        let k = comparison.off_to_on[j];
        assert!(on_e.contains(&k), "off e level {j} matched to on level {k}");
        assert!(comparison.shifts[j].abs() < 1e-8);
    }
}

#[test]
fn pure_p_lone_pair_sits_at_the_p_vsip_and_only_a1_levels_move() {
    let eht = ammonia();
    let n = eht.overlap.nrows();
    let (s, pz) = (
        index_of(&eht, 0, AngularKind::S),
        index_of(&eht, 0, AngularKind::Pz),
    );
    let mut lone_pair = DVector::zeros(n);
    lone_pair[pz] = 1.0;
    let comparison = compare_mixing(&eht, &[lone_pair]).expect("switch");
    let off = &comparison.off.solution;
    // The permutation property of the matching.
    let mut seen = comparison.off_to_on.clone();
    seen.sort_unstable();
    assert_eq!(seen, (0..n).collect::<Vec<_>>());
    // Off: a level that is pure N 2pz at the N 2p VSIP.
    let vsip_p = eht.basis.vsip[pz];
    assert!((vsip_p + 13.4).abs() < 1e-12, "Hoffmann's N 2p VSIP");
    let j = (0..n)
        .find(|&j| (off.energies[j] - vsip_p).abs() < 1e-8)
        .expect("a level at the N 2p VSIP");
    for mu in 0..n {
        let c = off.coefficients[(mu, j)];
        if mu == pz {
            assert!((c.abs() - 1.0).abs() < 1e-10, "pure pz: {c}");
        } else {
            assert!(
                c.abs() < 1e-10,
                "no other AO in the held lone pair: {mu} {c}"
            );
        }
    }
    // It is the HOMO of the first-order diagram (above the e bonding pair).
    assert_eq!(Some(j), off.homo());
    // On: its partner is the real HOMO, with N 2s character, and it has moved.
    let k = comparison.off_to_on[j];
    assert_eq!(Some(k), eht.homo());
    let s_coefficient = eht.coefficients[(s, k)];
    assert!(
        s_coefficient.abs() > 0.1,
        "the lone pair gains s: {s_coefficient}"
    );
    assert!(
        comparison.shifts[j].abs() > 0.1,
        "shift {}",
        comparison.shifts[j]
    );
    eprintln!(
        "lone pair: off {:.4} eV (pure 2pz), on {:.4} eV (N 2s coefficient {:.3}), shift {:+.4} eV",
        off.energies[j], eht.energies[k], s_coefficient, comparison.shifts[j]
    );
    check_e_unchanged(&comparison);
    // Non-e levels: at least two a1 levels move (the lone pair and one it mixed with).
    let moved = comparison.shifts.iter().filter(|d| d.abs() > 1e-3).count();
    assert!(moved >= 2, "a1 levels moved: {moved}");
}

#[test]
fn hybrid_lone_pair_sits_at_the_hybrid_energy() {
    let eht = ammonia();
    let n = eht.overlap.nrows();
    let (s, pz) = (
        index_of(&eht, 0, AngularKind::S),
        index_of(&eht, 0, AngularKind::Pz),
    );
    // An sp^λ lone pair with λ = 3 along +z (given unnormalized: the switch normalizes).
    let lambda: f64 = 3.0;
    let mut lone_pair = DVector::zeros(n);
    lone_pair[s] = 2.0;
    lone_pair[pz] = 2.0 * lambda.sqrt();
    let comparison = compare_mixing(&eht, &[lone_pair]).expect("switch");
    let expected = (eht.basis.vsip[s] + lambda * eht.basis.vsip[pz]) / (1.0 + lambda);
    assert!((comparison.off.lone_pair_energies[0] - expected).abs() < 1e-10);
    assert!(
        comparison
            .off
            .solution
            .energies
            .iter()
            .any(|e| (e - expected).abs() < 1e-8),
        "a level at the sp³ hybrid energy {expected}"
    );
    check_e_unchanged(&comparison);
    // The held level is the normalized hybrid itself: (s + √3 pz)/2.
    let off = &comparison.off.solution;
    let j = (0..n)
        .find(|&j| (off.energies[j] - expected).abs() < 1e-8)
        .expect("held level");
    let (cs, cp) = (off.coefficients[(s, j)], off.coefficients[(pz, j)]);
    let sign = cs.signum();
    assert!((sign * cs - 0.5).abs() < 1e-10 && (sign * cp - 0.75f64.sqrt()).abs() < 1e-10);
    // Note: the held MOs are orthonormal in the modified overlap (l's S elements zeroed),
    // not in the original S; that is the first-order model, not an error.
}

#[test]
fn bad_lone_pairs_are_typed_errors() {
    use diptych::localized::switch::MixingError;
    let eht = ammonia();
    let n = eht.overlap.nrows();
    let zero = DVector::zeros(n);
    assert!(matches!(
        compare_mixing(&eht, &[zero]),
        Err(MixingError::Empty { index: 0 })
    ));
    let mut two_atoms = DVector::zeros(n);
    two_atoms[0] = 1.0;
    two_atoms[n - 1] = 1.0;
    assert!(matches!(
        compare_mixing(&eht, &[two_atoms]),
        Err(MixingError::SeveralAtoms { .. })
    ));
    assert!(matches!(
        compare_mixing(&eht, &[DVector::zeros(3)]),
        Err(MixingError::Length { .. })
    ));
    let mut a = DVector::zeros(n);
    a[1] = 1.0;
    let b = a.clone() * 2.0;
    assert!(matches!(
        compare_mixing(&eht, &[a, b]),
        Err(MixingError::Dependent { index: 1, atom: 0 })
    ));
    let mut nan = DVector::zeros(n);
    nan[0] = f64::NAN;
    assert!(compare_mixing(&eht, &[nan]).is_err());
    // No lone pairs: the held solution is the ordinary one.
    let none = compare_mixing(&eht, &[]).expect("switch");
    for (a, b) in none.on.energies.iter().zip(&none.off.solution.energies) {
        assert!((a - b).abs() < 1e-10);
    }
}

/// The localized picture's lone pair: the n(N) orbital (intrinsic bond orbital, taken
/// back to the AOs) restricted to nitrogen, held non-bonding. It gives a level at its own
/// ⟨l|H|l⟩ and leaves the e levels alone (it is a1 by symmetry).
#[test]
fn localized_lone_pair_restricted_to_its_centre() {
    use diptych::localized::switch::restrict_to_atom;
    use diptych::localized::{LocalizationSettings, OrbitalClass, OrbitalSpace, analyze};
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz");
    let text = std::fs::read_to_string(path).expect("demo geometry");
    let molecule = parse_xyz(&text, "ammonia").expect("valid XYZ").molecule;
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    let picture = analyze(&molecule, &eht, &LocalizationSettings::default()).expect("picture");
    let k = picture
        .orbitals
        .iter()
        .position(|o| o.space == OrbitalSpace::Doubly && o.class == OrbitalClass::OneCentre)
        .expect("n(N)");
    assert_eq!(picture.orbitals[k].centres, vec![0]);
    let over_aos = &eht.orthonormal.orthogonalizer * picture.vectors.column(k);
    let lp = restrict_to_atom(&over_aos, eht.basis.atom_ranges[0].clone());
    let comparison = compare_mixing(&eht, &[lp]).expect("switch");
    let e = comparison.off.lone_pair_energies[0];
    assert!(
        comparison
            .off
            .solution
            .energies
            .iter()
            .any(|x| (x - e).abs() < 1e-8)
    );
    check_e_unchanged(&comparison);
}

#[test]
fn mismatched_matrices_are_typed_errors() {
    use diptych::localized::switch::{MixingError, hold_non_bonding};
    use nalgebra::DMatrix;
    let h = DMatrix::<f64>::identity(3, 3);
    let s = DMatrix::<f64>::identity(4, 4);
    let lp = DVector::from_vec(vec![1.0, 0.0, 0.0, 0.0]);
    let ranges = [0..2, 2..4];
    assert!(matches!(
        hold_non_bonding(&h, &s, &ranges, std::slice::from_ref(&lp), 2),
        Err(MixingError::Solve(_))
    ));
    let h = DMatrix::<f64>::identity(4, 4);
    assert!(matches!(
        hold_non_bonding(&h, &s, &[0..1, 1..2], &[lp], 2),
        Err(MixingError::Ranges { .. })
    ));
}
