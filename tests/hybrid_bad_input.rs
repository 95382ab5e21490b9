//! Unusual and impossible inputs for the hybrid stage: an answer or a typed error naming
//! the atom, never a panic, and one bad centre never loses the others.

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::{
    HybridAnalysis, HybridError, HybridKind, HybridModel, HybridSettings, LocalizedKind, analyze,
};

fn molecule(text: &str) -> Molecule {
    parse_xyz(text, "test").expect("valid XYZ").molecule
}

fn analyse(text: &str, settings: &HybridSettings) -> (Molecule, HybridAnalysis) {
    let m = molecule(text);
    let eht = run(&m, &EhtSettings::default()).expect("EHT runs");
    let analysis = analyze(&m, &eht, settings);
    (m, analysis)
}

fn both_models(text: &str) -> Vec<HybridAnalysis> {
    [HybridModel::Geometric, HybridModel::MaxOverlap]
        .into_iter()
        .map(|model| {
            analyse(
                text,
                &HybridSettings {
                    model,
                    ..HybridSettings::default()
                },
            )
            .1
        })
        .collect()
}

fn occupancy(analysis: &HybridAnalysis) -> f64 {
    analysis.localized.iter().map(|o| o.occupancy).sum()
}

const PF5: &str = "6\nPF5 (trigonal bipyramid, approximate)\nP 0 0 0\nF 0 0 1.58\nF 0 0 -1.58\nF 1.53 0 0\nF -0.765 1.325 0\nF -0.765 -1.325 0\n";
const SF6: &str = "7\nSF6 (octahedron, approximate)\nS 0 0 0\nF 1.56 0 0\nF -1.56 0 0\nF 0 1.56 0\nF 0 -1.56 0\nF 0 0 1.56\nF 0 0 -1.56\n";
const AMMONIA: &str = "4\nammonia\nN 0 0 0\nH 0.93752957 0 -0.38102795\nH -0.46876479 0.81192443 -0.38102795\nH -0.46876479 -0.81192443 -0.38102795\n";

#[test]
fn hypervalent_centres_are_skipped_not_fatal() {
    for (text, symbol, needed) in [(PF5, "P", 5), (SF6, "S", 6)] {
        for analysis in both_models(text) {
            assert!(
                analysis.errors.contains(&HybridError::Hypervalent {
                    atom: 0,
                    element: symbol.to_string(),
                    needed
                }),
                "{:?}",
                analysis.errors
            );
            let message = analysis.errors[0].to_string();
            assert!(message.contains("s,p hybrids cannot describe"), "{message}");
            assert!(analysis.centre(0).is_none());
            // The fluorines are still described: a bond hybrid toward the centre and three
            // lone pairs each.
            assert_eq!(analysis.centres.len(), needed);
            for centre in &analysis.centres {
                assert_eq!(centre.lone_pairs, 3);
                assert_eq!(centre.hybrids[0].partner, Some(0));
            }
            assert!(
                analysis
                    .localized
                    .iter()
                    .all(|o| o.kind == LocalizedKind::LonePair)
            );
            assert!(analysis.notes.iter().any(|n| n.contains("left out")));
        }
    }
}

#[test]
fn radicals_get_a_singly_occupied_lone_pair() {
    // NH2 (H–N–H 103.4°, N–H 1.024 Å, from memory) and planar CH3: odd electron counts.
    let nh2 = "3\nNH2 radical\nN 0 0 0\nH 0 0.8033 -0.6350\nH 0 -0.8033 -0.6350\n";
    let ch3 = "4\nCH3 radical\nC 0 0 0\nH 1.079 0 0\nH -0.5395 0.93444 0\nH -0.5395 -0.93444 0\n";
    for (text, electrons, full_lone_pairs) in [(nh2, 7.0, 1), (ch3, 7.0, 0)] {
        for analysis in both_models(text) {
            let centre = analysis.centre(0).unwrap();
            assert!(centre.single_electron);
            assert_eq!(centre.lone_pairs, full_lone_pairs);
            assert_eq!(centre.steric_number, 4);
            assert!(analysis.notes.iter().any(|n| n.contains("odd electron")));
            let singles: Vec<_> = analysis
                .localized
                .iter()
                .filter(|o| o.occupancy == 1.0)
                .collect();
            assert_eq!(singles.len(), 1);
            assert_eq!(singles[0].kind, LocalizedKind::LonePair);
            assert_eq!(occupancy(&analysis), electrons);
        }
    }
    // Planar CH3 in the geometric model: sp2 bonds and the odd electron in a pure p orbital
    // (Coulson: 120° gives λ = 2).
    let (_, analysis) = analyse(ch3, &HybridSettings::default());
    let centre = analysis.centre(0).unwrap();
    for h in centre.hybrids.iter().filter(|h| h.kind == HybridKind::Bond) {
        assert!((h.lambda.unwrap() - 2.0).abs() < 1e-4);
    }
    let lone = centre
        .hybrids
        .iter()
        .find(|h| h.kind == HybridKind::LonePair)
        .unwrap();
    assert!(lone.lambda.is_none());
}

#[test]
fn charged_molecules_place_formal_charges() {
    let ammonium = "5\nammonium charge=1\nN 0 0 0\nH 0.5947 0.5947 0.5947\nH -0.5947 -0.5947 0.5947\nH -0.5947 0.5947 -0.5947\nH 0.5947 -0.5947 -0.5947\n";
    let (_, analysis) = analyse(ammonium, &HybridSettings::default());
    let n = analysis.centre(0).unwrap();
    assert_eq!(n.formal_charge, 1);
    assert_eq!(n.lone_pairs, 0);
    assert!(!n.single_electron);
    for h in &n.hybrids {
        assert!((h.lambda.unwrap() - 3.0).abs() < 1e-3, "tetrahedral sp3");
    }
    assert_eq!(occupancy(&analysis), 8.0);
    let chloride = "1\nchloride charge=-1\nCl 0 0 0\n";
    let (_, analysis) = analyse(chloride, &HybridSettings::default());
    let cl = analysis.centre(0).unwrap();
    assert_eq!(cl.lone_pairs, 4);
    assert_eq!(occupancy(&analysis), 8.0);
}

#[test]
fn impossible_assignments_are_typed_errors_naming_the_atom() {
    let mut settings = HybridSettings::default();
    settings.formal_charges.insert(0, 3);
    let (_, analysis) = analyse(AMMONIA, &settings);
    assert!(matches!(
        analysis.errors.as_slice(),
        [HybridError::NegativeLonePairs {
            atom: 0,
            electrons: -1,
            ..
        }]
    ));
    assert!(analysis.errors[0].to_string().contains("atom 0 (N)"));
    assert!(analysis.centres.is_empty());

    let mut settings = HybridSettings::default();
    settings.lone_pair_overrides.insert(0, 3);
    let (_, analysis) = analyse(AMMONIA, &settings);
    assert!(matches!(
        analysis.errors.as_slice(),
        [HybridError::TooManyOrbitals {
            atom: 0,
            needed: 6,
            ..
        }]
    ));

    // Overrides of atoms that do not exist are ignored with a note.
    let mut settings = HybridSettings::default();
    settings.lone_pair_overrides.insert(99, 1);
    settings.formal_charges.insert(42, 1);
    let (_, analysis) = analyse(AMMONIA, &settings);
    assert!(analysis.errors.is_empty());
    assert_eq!(analysis.notes.len(), 2, "{:?}", analysis.notes);
}

#[test]
fn one_partner_without_lone_pairs_and_bad_overrides_still_answer() {
    // Formaldehyde with O's lone pairs overridden to 0: O has one σ partner, one π bond and
    // no lone pair; its set is completed by vacant orbitals.
    let formaldehyde = "4\nformaldehyde\nC 0 0 0\nO 0 0 1.205\nH 0 0.94269485 -0.58791787\nH 0 -0.94269485 -0.58791787\n";
    let mut settings = HybridSettings::default();
    settings.lone_pair_overrides.insert(1, 0);
    let (_, analysis) = analyse(formaldehyde, &settings);
    let o = analysis.centre(1).unwrap();
    assert_eq!(o.lone_pairs, 0);
    assert_eq!(
        o.hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Vacant)
            .count(),
        2
    );
    assert!(analysis.notes.iter().any(|n| n.contains("electrons")));
}

#[test]
fn linear_and_planar_centres() {
    // Planar ammonia (120°): sp2 bonds and a pure p lone pair; linear water (180°): sp bonds
    // and two pure p lone pairs; CO2: sp carbon with two perpendicular π bonds.
    let planar = "4\nplanar NH3\nN 0 0 0\nH 1.012 0 0\nH -0.506 0.87642 0\nH -0.506 -0.87642 0\n";
    let linear = "3\nlinear H2O\nO 0 0 0\nH 0 0 0.96\nH 0 0 -0.96\n";
    let co2 = "3\nCO2\nC 0 0 0\nO 0 0 1.16\nO 0 0 -1.16\n";
    for analysis in both_models(planar) {
        let n = analysis.centre(0).unwrap();
        let lone = n
            .hybrids
            .iter()
            .find(|h| h.kind == HybridKind::LonePair)
            .unwrap();
        assert!(lone.s_percent < 1e-6, "pure p: {}", lone.s_percent);
        assert!(lone.direction[2].abs() > 0.999);
    }
    let (_, analysis) = analyse(linear, &HybridSettings::default());
    let o = analysis.centre(0).unwrap();
    assert_eq!(o.model, HybridModel::Geometric);
    for h in &o.hybrids {
        match h.kind {
            HybridKind::Bond => assert!((h.lambda.unwrap() - 1.0).abs() < 1e-9),
            _ => assert!(h.lambda.is_none()),
        }
    }
    for analysis in both_models(co2) {
        let c = analysis.centre(0).unwrap();
        let pi: Vec<_> = c
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Pi)
            .collect();
        assert_eq!(pi.len(), 2);
        let dot: f64 = pi[0]
            .direction
            .iter()
            .zip(&pi[1].direction)
            .map(|(a, b)| a * b)
            .sum();
        assert!(dot.abs() < 1e-9, "the two π bonds are perpendicular");
        assert_eq!(
            analysis
                .localized
                .iter()
                .filter(|o| o.kind == LocalizedKind::Pi)
                .count(),
            2
        );
        assert_eq!(occupancy(&analysis), 16.0);
    }
}

#[test]
fn a_mismatched_orbital_basis_is_an_error_not_a_panic() {
    let ammonia = molecule(AMMONIA);
    let water = molecule("3\nwater\nO 0 0 0\nH 0 0.757 -0.586\nH 0 -0.757 -0.586\n");
    let eht = run(&water, &EhtSettings::default()).unwrap();
    let analysis = analyze(&ammonia, &eht, &HybridSettings::default());
    assert!(matches!(
        analysis.errors.as_slice(),
        [HybridError::BasisMismatch {
            atoms: 4,
            basis_atoms: 3
        }]
    ));
    let (ladder, ladder_errors, _) = diptych::hybrid::localized_ladder(&ammonia, &eht, &[]);
    assert!(ladder.is_empty());
    assert_eq!(ladder_errors.len(), 1);
}

/// A small deterministic generator (64-bit LCG; Knuth's MMIX constants).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

#[test]
fn random_molecules_never_panic() {
    let symbols = ["H", "H", "C", "N", "O", "F", "B", "S", "P", "Cl"];
    let mut rng = Lcg(2026);
    let mut analysed = 0;
    for trial in 0..300 {
        let count = 2 + (rng.next() * 7.0) as usize;
        let mut lines = vec![count.to_string(), format!("random {trial}")];
        for _ in 0..count {
            let symbol = symbols[(rng.next() * symbols.len() as f64) as usize % symbols.len()];
            let (x, y, z) = (rng.next() * 3.0, rng.next() * 3.0, rng.next() * 3.0);
            lines.push(format!("{symbol} {x:.4} {y:.4} {z:.4}"));
        }
        let Ok(parsed) = parse_xyz(&lines.join("\n"), "random") else {
            continue;
        };
        let m = parsed.molecule;
        if m.validate().is_err() {
            continue;
        }
        let Ok(eht) = run(&m, &EhtSettings::default()) else {
            continue;
        };
        for model in [
            HybridModel::Geometric,
            HybridModel::MaxOverlap,
            HybridModel::Localized,
        ] {
            let settings = HybridSettings {
                model,
                ..HybridSettings::default()
            };
            let analysis = analyze(&m, &eht, &settings);
            for centre in &analysis.centres {
                assert_eq!(centre.hybrids.len(), 4);
                let s: f64 = centre.hybrids.iter().map(|h| h.s_percent).sum();
                assert!((s - 100.0).abs() < 1e-8, "trial {trial}");
                for h in &centre.hybrids {
                    assert!(h.energy_ev.is_finite());
                }
            }
            for o in &analysis.localized {
                assert!(o.energy_ev.is_finite(), "trial {trial}: {}", o.label);
            }
        }
        analysed += 1;
    }
    assert!(analysed > 100, "{analysed}");
}

#[test]
fn bonds_naming_missing_atoms_are_dropped_and_reported() {
    let mut m = molecule(AMMONIA);
    let eht = run(&m, &EhtSettings::default()).unwrap();
    m.bonds.push(diptych::chem::molecule::Bond::new(0, 17, 1));
    m.bonds.push(diptych::chem::molecule::Bond::new(2, 2, 1));
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    assert!(
        analysis
            .errors
            .contains(&HybridError::InvalidBond { a: 0, b: 17 })
    );
    assert!(
        analysis
            .errors
            .contains(&HybridError::InvalidBond { a: 2, b: 2 })
    );
    assert_eq!(analysis.centre(0).unwrap().sigma_partners, vec![1, 2, 3]);
    let mut m = molecule(AMMONIA);
    m.atoms[2].position.x = f64::NAN;
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    assert_eq!(
        analysis.errors,
        vec![HybridError::NonFiniteCoordinate { atom: 2 }]
    );
}

#[test]
fn user_bond_orders_beyond_the_centre_are_typed_errors() {
    // A quadruple N–H bond and a triple bond at a three-coordinate carbon: impossible for
    // four s,p orbitals; the errors name the atoms and nothing panics.
    let mut m = molecule(AMMONIA);
    m.set_bond_order(0, 1, 4).unwrap();
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let analysis = analyze(&m, &eht, &HybridSettings::default());
    assert!(analysis.errors.contains(&HybridError::BondOrderTooHigh {
        a: 0,
        b: 1,
        order: 4
    }));
    assert!(analysis.errors.iter().any(|e| matches!(
        e,
        HybridError::TooManyOrbitals { atom: 0, .. }
            | HybridError::NegativeLonePairs { atom: 0, .. }
    )));
    let ethylene = "6\nethylene\nC 0 0 0.6695\nC 0 0 -0.6695\nH 0 0.9289 1.2321\nH 0 -0.9289 1.2321\nH 0 0.9289 -1.2321\nH 0 -0.9289 -1.2321\n";
    let mut m = molecule(ethylene);
    m.set_bond_order(0, 1, 3).unwrap();
    let eht = run(&m, &EhtSettings::default()).unwrap();
    for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
        let settings = HybridSettings {
            model,
            ..HybridSettings::default()
        };
        let analysis = analyze(&m, &eht, &settings);
        assert!(analysis.centres.is_empty());
        assert_eq!(analysis.errors.len(), 2, "{:?}", analysis.errors);
        // The C–H bonds cannot be drawn without their carbon hybrids; the notes say so.
        assert!(analysis.localized.is_empty());
        assert!(!analysis.notes.is_empty());
    }
}

#[test]
fn coincident_bond_directions_fail_only_that_centre() {
    // Formaldehyde plus a hydrogen far out beyond C on the O=C axis, bonded to O by hand:
    // O's two partners lie in one direction, so no orthonormal hybrids can face both. O is
    // reported; C is still described.
    let text = "5\nbad\nC 0 0 0\nO 0 0 1.205\nH 0 0.94269485 -0.58791787\nH 0 -0.94269485 -0.58791787\nH 0 0 -2.0\n";
    let mut m = molecule(text);
    m.bonds.push(diptych::chem::molecule::Bond::new(1, 4, 1));
    let eht = run(&m, &EhtSettings::default()).unwrap();
    for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
        let mut settings = HybridSettings {
            model,
            ..HybridSettings::default()
        };
        // One lone pair on O, so that it needs exactly four orbitals.
        settings.lone_pair_overrides.insert(1, 1);
        let analysis = analyze(&m, &eht, &settings);
        assert_eq!(
            analysis.errors,
            vec![HybridError::DependentPartners { atom: 1 }]
        );
        assert!(analysis.centre(1).is_none());
        assert!(analysis.centre(0).is_some());
    }
}
