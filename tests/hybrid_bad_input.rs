//! Unusual and impossible inputs for the hybrid stage: an answer, a note or a typed error
//! naming the atom, never a panic, and one bad centre never loses the others.

use diptych::analysis::{Analysis, Settings, Stage};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::centres::{CentreSpec, from_picture};
use diptych::hybrid::{
    HybridAnalysis, HybridError, HybridKind, HybridModel, HybridSettings, analyze,
};
use diptych::localized::{
    self, LocalizationMethod, LocalizationSettings, LocalizedError, LocalizedKind,
};

fn molecule(text: &str) -> Molecule {
    parse_xyz(text, "test").expect("valid XYZ").molecule
}

fn settings(model: HybridModel) -> Settings {
    Settings {
        hybrid: HybridSettings {
            model,
            ..HybridSettings::default()
        },
        ..Settings::default()
    }
}

fn analyse(text: &str, model: HybridModel) -> Analysis {
    Analysis::run(&molecule(text), &settings(model)).expect("analyses")
}

fn model_of(analysis: &Analysis) -> &HybridAnalysis {
    analysis.hybrids.as_ref().expect("the hybrid stage ran")
}

fn both_models(text: &str) -> Vec<Analysis> {
    [HybridModel::Geometric, HybridModel::MaxOverlap]
        .into_iter()
        .map(|model| analyse(text, model))
        .collect()
}

/// The centre specs of the wavefunction's Lewis structure (atoms with s and p functions).
fn specs(m: &Molecule, eht: &diptych::eht::EhtResult) -> Vec<CentreSpec> {
    let picture = localized::analyze(m, eht, &LocalizationSettings::default()).expect("picture");
    let has_sp = |atom: usize| {
        picture.layout.kinds[picture.layout.ranges[atom].clone()]
            .iter()
            .any(|k| k.l() == 1)
    };
    from_picture(&picture, m, &has_sp).0
}

const PF5: &str = "6\nPF5 (trigonal bipyramid, approximate)\nP 0 0 0\nF 0 0 1.58\nF 0 0 -1.58\nF 1.53 0 0\nF -0.765 1.325 0\nF -0.765 -1.325 0\n";
const SF6: &str = "7\nSF6 (octahedron, approximate)\nS 0 0 0\nF 1.56 0 0\nF -1.56 0 0\nF 0 1.56 0\nF 0 -1.56 0\nF 0 0 1.56\nF 0 0 -1.56\n";
const AMMONIA: &str = "4\nammonia\nN 0 0 0\nH 0.93752957 0 -0.38102795\nH -0.46876479 0.81192443 -0.38102795\nH -0.46876479 -0.81192443 -0.38102795\n";
const FORMALDEHYDE: &str = "4\nformaldehyde\nC 0 0 0\nO 0 0 1.205\nH 0 0.94269485 -0.58791787\nH 0 -0.94269485 -0.58791787\n";

#[test]
fn hypervalent_centres_are_skipped_not_fatal() {
    // s,p hybrids cannot make five or six two-centre bonds: the central atom is left to the
    // wavefunction's hybrids with a note naming it, and the fluorines are still described.
    for (text, symbol, ligands) in [(PF5, "P", 5), (SF6, "S", 6)] {
        for analysis in both_models(text) {
            assert!(analysis.errors.is_empty(), "{:?}", analysis.errors);
            let hybrids = model_of(&analysis);
            assert!(hybrids.centre(0).is_none());
            assert!(
                analysis.notes.iter().any(|n| n.stage == Stage::Hybrids
                    && n.message.starts_with(&format!("atom 0 ({symbol})"))
                    && n.message.contains("outside the two-centre hybrid models")),
                "{:?}",
                analysis.notes
            );
            // The fluorines: a bond hybrid toward the centre and three lone pairs each.
            assert_eq!(hybrids.centres.len(), ligands);
            for centre in &hybrids.centres {
                assert_eq!(centre.lone_pairs, 3);
                assert_eq!(centre.hybrids[0].kind, HybridKind::Bond);
                assert_eq!(centre.hybrids[0].partner, Some(0));
            }
            // The ladder shows the multicentre orbitals of the central atom, no two-centre
            // bond to it.
            assert!(
                analysis
                    .localized
                    .iter()
                    .filter(|o| o.atoms.contains(&0))
                    .all(|o| matches!(
                        o.kind,
                        LocalizedKind::Multicentre | LocalizedKind::MulticentreAntibond
                    ))
            );
        }
    }
}

#[test]
fn radicals_get_a_singly_occupied_lone_pair() {
    // NH2 (H–N–H 103.4°, N–H 1.024 Å, from memory) and planar CH3: odd electron counts.
    let nh2 = "3\nNH2 radical\nN 0 0 0\nH 0 0.8033 -0.6350\nH 0 -0.8033 -0.6350\n";
    let ch3 = "4\nCH3 radical\nC 0 0 0\nH 1.079 0 0\nH -0.5395 0.93444 0\nH -0.5395 -0.93444 0\n";
    for (text, full_lone_pairs) in [(nh2, 1), (ch3, 0)] {
        for analysis in both_models(text) {
            let centre = model_of(&analysis).centre(0).unwrap();
            assert!(centre.single_electron);
            assert_eq!(centre.lone_pairs, full_lone_pairs);
            assert_eq!(centre.steric_number, 4);
            let singles: Vec<_> = analysis
                .localized
                .iter()
                .filter(|o| (o.lewis_occupancy - 1.0).abs() < 1e-9)
                .collect();
            assert_eq!(singles.len(), 1);
            assert_eq!(singles[0].kind, LocalizedKind::SingleElectron);
            assert_eq!(singles[0].atoms, vec![0]);
        }
    }
    // Planar CH3 in the geometric model: sp2 bonds and the odd electron in a pure p orbital
    // (Coulson: 120° gives λ = 2).
    let analysis = analyse(ch3, HybridModel::Geometric);
    let centre = model_of(&analysis).centre(0).unwrap();
    assert_eq!(centre.model, HybridModel::Geometric);
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
fn charged_molecules() {
    // Ammonium: four equivalent bonds, tetrahedral sp3 (Coulson: 109.47° gives λ = 3), no
    // lone pair. Chloride: a bare atom, its four lone pairs are its s and p orbitals.
    let ammonium = "5\nammonium charge=1\nN 0 0 0\nH 0.5947 0.5947 0.5947\nH -0.5947 -0.5947 0.5947\nH -0.5947 0.5947 -0.5947\nH 0.5947 -0.5947 -0.5947\n";
    let analysis = analyse(ammonium, HybridModel::Geometric);
    let n = model_of(&analysis).centre(0).unwrap();
    assert_eq!(n.lone_pairs, 0);
    assert!(!n.single_electron);
    assert_eq!(n.sigma_partners, vec![1, 2, 3, 4]);
    for h in &n.hybrids {
        assert!((h.lambda.unwrap() - 3.0).abs() < 1e-3, "tetrahedral sp3");
    }
    let chloride = "1\nchloride charge=-1\nCl 0 0 0\n";
    for analysis in both_models(chloride) {
        let cl = model_of(&analysis).centre(0).unwrap();
        assert_eq!(cl.lone_pairs, 4);
        assert!(cl.sigma_partners.is_empty());
        let s: Vec<f64> = cl.hybrids.iter().map(|h| h.s_percent).collect();
        assert!((s[0] - 100.0).abs() < 1e-9 && s[1..].iter().all(|x| x.abs() < 1e-9));
    }
}

#[test]
fn linear_and_planar_centres() {
    // Planar ammonia (120°): sp2 bonds and a pure p lone pair; linear water (180°): sp bonds
    // and two pure p lone pairs; CO2: sp carbon with two perpendicular π orbitals (Coulson,
    // Valence, 1952).
    let planar = "4\nplanar NH3\nN 0 0 0\nH 1.012 0 0\nH -0.506 0.87642 0\nH -0.506 -0.87642 0\n";
    let linear = "3\nlinear H2O\nO 0 0 0\nH 0 0 0.96\nH 0 0 -0.96\n";
    let co2 = "3\nCO2\nC 0 0 0\nO 0 0 1.16\nO 0 0 -1.16\n";
    for analysis in both_models(planar) {
        let n = model_of(&analysis).centre(0).unwrap();
        let lone = n
            .hybrids
            .iter()
            .find(|h| h.kind == HybridKind::LonePair)
            .unwrap();
        assert!(lone.s_percent < 1e-6, "pure p: {}", lone.s_percent);
        assert!(lone.direction[2].abs() > 0.999);
    }
    // Linear water's σ MOs stay three-centre under intrinsic bond orbitals (the p = 4
    // function prefers them to two O–H bonds), so O may be skipped with a note; with
    // Pipek–Mezey (p = 2) localization the O–H bonds are two-centre and the geometric
    // model applies.
    let default = analyse(linear, HybridModel::Geometric);
    let skipped = default
        .notes
        .iter()
        .any(|n| n.stage == Stage::Hybrids && n.message.starts_with("atom 0 (O)"));
    let mut pipek_mezey = settings(HybridModel::Geometric);
    pipek_mezey.localization.method = LocalizationMethod::PipekMezey;
    let pm = Analysis::run(&molecule(linear), &pipek_mezey).unwrap();
    let mut described = vec![&pm];
    if !skipped {
        described.push(&default);
    }
    for analysis in described {
        let o = model_of(analysis).centre(0).unwrap();
        assert_eq!(o.model, HybridModel::Geometric);
        assert_eq!(o.lone_pairs, 2);
        for h in &o.hybrids {
            match h.kind {
                HybridKind::Bond => assert!((h.lambda.unwrap() - 1.0).abs() < 1e-9),
                _ => assert!(h.lambda.is_none()),
            }
        }
    }
    for analysis in both_models(co2) {
        let c = model_of(&analysis).centre(0).unwrap();
        for h in c.hybrids.iter().filter(|h| h.kind == HybridKind::Bond) {
            assert!((h.lambda.unwrap() - 1.0).abs() < 1e-9);
        }
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
        assert!(dot.abs() < 1e-9, "the two π orbitals are perpendicular");
        for h in &pi {
            assert!(h.direction[2].abs() < 1e-9, "perpendicular to the axis");
        }
    }
}

#[test]
fn a_mismatched_orbital_basis_is_an_error_not_a_panic() {
    let ammonia = molecule(AMMONIA);
    let water = molecule("3\nwater\nO 0 0 0\nH 0 0.757 -0.586\nH 0 -0.757 -0.586\n");
    let eht = run(&water, &EhtSettings::default()).unwrap();
    let analysis = analyze(&ammonia, &eht, &HybridSettings::default(), Vec::new());
    assert!(matches!(
        analysis.errors.as_slice(),
        [HybridError::BasisMismatch {
            atoms: 4,
            basis_atoms: 3
        }]
    ));
    assert!(analysis.centres.is_empty());
    assert_eq!(
        localized::analyze(&ammonia, &eht, &LocalizationSettings::default()),
        Err(LocalizedError::BasisMismatch {
            atoms: 4,
            basis_atoms: 3
        })
    );
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
        let mut solved = false;
        for model in [
            HybridModel::Geometric,
            HybridModel::MaxOverlap,
            HybridModel::Localized,
        ] {
            let analysis = Analysis::run(&m, &settings(model)).expect("a valid molecule runs");
            if analysis.eht.is_none() {
                continue;
            }
            solved = true;
            for centre in analysis.hybrids.iter().flat_map(|h| &h.centres) {
                assert_eq!(centre.hybrids.len(), 4);
                let s: f64 = centre.hybrids.iter().map(|h| h.s_percent).sum();
                assert!((s - 100.0).abs() < 1e-8, "trial {trial}");
                for h in &centre.hybrids {
                    assert!(h.energy_ev.is_finite());
                }
            }
            for e in &analysis.hybrid_entries {
                assert!(
                    e.s_percent.is_finite() && e.p_percent.is_finite(),
                    "trial {trial}"
                );
            }
            for o in &analysis.localized {
                assert!(o.energy_ev.is_finite(), "trial {trial}: {}", o.label);
                assert!(o.occupancy.is_finite(), "trial {trial}: {}", o.label);
            }
        }
        analysed += usize::from(solved);
    }
    assert!(analysed > 100, "{analysed}");
}

#[test]
fn a_non_finite_coordinate_is_a_typed_error() {
    let good = molecule(AMMONIA);
    let eht = run(&good, &EhtSettings::default()).unwrap();
    let centres = specs(&good, &eht);
    assert_eq!(centres.len(), 1);
    let mut bad = good.clone();
    bad.atoms[2].position.x = f64::NAN;
    let analysis = analyze(&bad, &eht, &HybridSettings::default(), centres);
    assert_eq!(
        analysis.errors,
        vec![HybridError::NonFiniteCoordinate { atom: 2 }]
    );
    assert!(analysis.centres.is_empty());
    // Through the pipeline the molecule is refused before any stage runs.
    assert!(Analysis::run(&bad, &Settings::default()).is_err());
}

#[test]
fn coincident_bond_directions_fail_only_that_centre() {
    // Formaldehyde plus a hydrogen far out beyond C on the O=C axis, given to O as a σ
    // partner by hand (with one lone pair, so that O needs exactly four orbitals): O's two
    // partners lie in one direction, so no orthonormal hybrids can face both. O is
    // reported; C is still described.
    let text = "5\nbad\nC 0 0 0\nO 0 0 1.205\nH 0 0.94269485 -0.58791787\nH 0 -0.94269485 -0.58791787\nH 0 0 -2.0\n";
    let m = molecule(text);
    let eht = run(&m, &EhtSettings::default()).unwrap();
    let mut centres = specs(
        &molecule(FORMALDEHYDE),
        &run(&molecule(FORMALDEHYDE), &EhtSettings::default()).unwrap(),
    );
    let o = centres.iter_mut().find(|c| c.atom == 1).expect("O centre");
    o.sigma_partners.push(4);
    o.lone_pairs = 1;
    for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
        let settings = HybridSettings {
            model,
            ..HybridSettings::default()
        };
        let analysis = analyze(&m, &eht, &settings, centres.clone());
        assert_eq!(
            analysis.errors,
            vec![HybridError::DependentPartners { atom: 1 }]
        );
        assert!(analysis.errors[0].to_string().contains("atom 1"));
        assert!(analysis.centre(1).is_none());
        assert!(analysis.centre(0).is_some());
    }
}
