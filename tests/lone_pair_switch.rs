//! The lone-pair mixing switch (DESIGN §4.6) on the sixteen molecules of its definition.
//!
//! Reasoning checked (exact linear algebra and symmetry, no outside source): with mixing
//! off the Hamiltonian is P A P + Q H̃ Q in the orthonormal basis, so each held orbital is
//! an eigenvector at its atomic energy — N 2p −13.4 eV and O 2p −14.8 eV in the standard
//! extended Hückel parameters (Hoffmann, J. Chem. Phys. 39, 1397 (1963)) — and the levels
//! are still one orthonormal basis, so weights add to 1 both ways. A held orbital of one
//! irrep can only move levels of that irrep. Symmetry labels survive accidental
//! degeneracy (water's 3a1 and 1b1 both at the O 2p energy).

mod localized_support;

use diptych::analysis::{Analysis, Settings};
use diptych::chem::Molecule;
use diptych::hybrid::HybridModel;
use diptych::localized::held::{HeldLonePairs, HoldConvention};
use localized_support::*;

/// The molecules of the switch's definition: (file, name).
const MOLECULES: [&str; 16] = [
    "demo_molecules/ammonia.xyz",
    "demo_molecules/water.xyz",
    "demo_molecules/nitrogen_trifluoride.xyz",
    "demo_molecules/phosphine.xyz",
    "tests/reference/rdkit_geometries/hydrogen_sulfide.xyz",
    "demo_molecules/formaldehyde.xyz",
    "demo_molecules/carbon_monoxide.xyz",
    "demo_molecules/hydrogen_cyanide.xyz",
    "tests/reference/rdkit_geometries/methanol.xyz",
    "tests/switch_molecules/methylamine.xyz",
    "tests/switch_molecules/phosphorus_trifluoride.xyz",
    "tests/switch_molecules/hypochlorous_acid.xyz",
    "tests/hard_molecules/dinitrogen.xyz",
    "tests/switch_molecules/oxygen_difluoride.xyz",
    "tests/reference/rdkit_geometries/acetonitrile.xyz",
    "tests/reference/rdkit_geometries/pyridine.xyz",
];

fn molecule(path: &str) -> Molecule {
    load(&root().join(path))
}

fn run(molecule: &Molecule, held: HeldLonePairs, convention: HoldConvention) -> Analysis {
    let settings = Settings {
        lone_pair_mixing: false,
        held_lone_pairs: held,
        hold_convention: convention,
        ..Settings::default()
    };
    Analysis::run(molecule, &settings).expect("analyses")
}

/// Σ weight per localized orbital and per canonical MO, from the listed links (entries
/// below 1e-4 are not listed).
fn weight_sums(analysis: &Analysis) -> (Vec<f64>, Vec<f64>) {
    let mut by_localized = vec![0.0; analysis.localized.len()];
    let mut by_canonical = vec![0.0; analysis.orbitals.len()];
    for link in &analysis.links {
        by_localized[link.localized] += link.weight;
        // A degenerate set's weight is listed once, summed over its members.
        let share = link.weight / link.members.len() as f64;
        for &member in &link.members {
            by_canonical[member] += share;
        }
    }
    (by_localized, by_canonical)
}

fn check_sound(path: &str, analysis: &Analysis, closed_with_mixing: bool) {
    for orbital in &analysis.orbitals {
        assert!(
            orbital.irrep.is_some() && orbital.label.as_deref() != Some("?"),
            "{path}: orbital {} at {:.3} eV has no irrep label",
            orbital.index,
            orbital.energy_ev
        );
    }
    let electrons: f64 = analysis.orbitals.iter().map(|o| o.occupancy).sum();
    assert!(
        (electrons - analysis.electrons as f64).abs() < 1e-9,
        "{path}: {electrons}"
    );
    let eht = analysis.eht.as_ref().expect("orbitals");
    if closed_with_mixing {
        assert!(!eht.open_shell, "{path}: a closed shell stays closed");
    }
    let (by_localized, by_canonical) = weight_sums(analysis);
    for (k, total) in by_localized.iter().enumerate() {
        assert!(
            (total - 1.0).abs() < 0.005,
            "{path}: localized {k} weights {total}"
        );
    }
    for (j, total) in by_canonical.iter().enumerate() {
        assert!(
            (total - 1.0).abs() < 0.005,
            "{path}: canonical {j} weights {total}"
        );
    }
    let switch = analysis.lone_pair_switch.as_ref().expect("switch summary");
    for level in &switch.held {
        assert_eq!(
            level.occupancy, 2.0,
            "{path}: a held lone pair stays occupied"
        );
    }
}

#[test]
fn every_molecule_stays_sound_with_mixing_off() {
    for path in MOLECULES {
        let molecule = molecule(path);
        let on = Analysis::run(&molecule, &Settings::default()).expect("analyses");
        let closed = !on.eht.as_ref().unwrap().open_shell;
        for held in [HeldLonePairs::Central, HeldLonePairs::All] {
            for convention in [HoldConvention::FirstOrder, HoldConvention::Hybrid] {
                let off = run(&molecule, held.clone(), convention);
                assert!(off.errors.is_empty(), "{path}: {:?}", off.errors);
                check_sound(path, &off, closed);
            }
        }
    }
}

#[test]
fn ammonia_first_order_holds_pure_n_2p_at_its_vsip_and_moves_only_a1() {
    let molecule = molecule("demo_molecules/ammonia.xyz");
    let on = Analysis::run(&molecule, &Settings::default()).unwrap();
    let off = run(
        &molecule,
        HeldLonePairs::Central,
        HoldConvention::FirstOrder,
    );
    let switch = off.lone_pair_switch.as_ref().unwrap();
    assert_eq!(switch.held.len(), 1);
    let held = &switch.held[0];
    assert!(
        (held.energy_off_ev + 13.40).abs() < 1e-9,
        "{}",
        held.energy_off_ev
    );
    let eht = off.eht.as_ref().unwrap();
    let level = off
        .orbitals
        .iter()
        .position(|o| (o.energy_ev - held.energy_off_ev).abs() < 1e-9)
        .expect("the held level is a canonical level");
    // 100 % N 2p in the orthonormal basis (N's functions are 0..4: s, px, py, pz).
    let column = eht.orthonormal.coefficients.column(level);
    let p_share: f64 = (1..4).map(|mu| column[mu] * column[mu]).sum();
    assert!((p_share - 1.0).abs() < 1e-12, "p share {p_share}");
    assert_eq!(off.orbitals[level].irrep.as_deref(), Some("a1"));
    for (a, b) in on.orbitals.iter().zip(&off.orbitals) {
        if a.irrep.as_deref() != Some("a1") {
            assert!(
                (a.energy_ev - b.energy_ev).abs() < 1e-8,
                "{:?} moved",
                a.label
            );
        }
    }
}

#[test]
fn ammonia_hybrid_convention_holds_the_ladder_lone_pair() {
    let molecule = molecule("demo_molecules/ammonia.xyz");
    for model in [HybridModel::Localized, HybridModel::Geometric] {
        let mut settings = Settings {
            lone_pair_mixing: false,
            hold_convention: HoldConvention::Hybrid,
            ..Settings::default()
        };
        settings.hybrid.model = model;
        let off = Analysis::run(&molecule, &settings).unwrap();
        let held = &off.lone_pair_switch.as_ref().unwrap().held[0];
        let ladder_n = off
            .localized
            .iter()
            .find(|l| l.label == "n(N)")
            .expect("n(N) in the ladder");
        assert!(
            (held.energy_off_ev - ladder_n.energy_ev).abs() < 1e-9,
            "{model:?}: held {} vs ladder {}",
            held.energy_off_ev,
            ladder_n.energy_ev
        );
        if model == HybridModel::Geometric {
            // ε_s + λ/(1+λ)(ε_p − ε_s) with λ = 2.03 at the demo geometry: −17.56 eV.
            assert!(
                (held.energy_off_ev + 17.56).abs() < 0.01,
                "{}",
                held.energy_off_ev
            );
        }
    }
}

#[test]
fn nitrogen_trifluoride_holds_only_the_nitrogen_lone_pair_occupied() {
    let off = run(
        &molecule("demo_molecules/nitrogen_trifluoride.xyz"),
        HeldLonePairs::default(),
        HoldConvention::FirstOrder,
    );
    let switch = off.lone_pair_switch.as_ref().unwrap();
    let held: Vec<_> = switch.choices.iter().filter(|c| c.held).collect();
    assert_eq!(held.len(), 1, "{held:?}");
    assert_eq!(held[0].lone_pair.atom, 0, "the N atom");
    assert_eq!(switch.held.len(), 1);
    assert_eq!(switch.held[0].atoms, vec![0]);
    assert_eq!(switch.held[0].occupancy, 2.0);
}

#[test]
fn water_first_order_holds_a1_and_b1_at_the_o_2p_energy() {
    let off = run(
        &molecule("demo_molecules/water.xyz"),
        HeldLonePairs::default(),
        HoldConvention::FirstOrder,
    );
    let mut irreps: Vec<String> = off
        .orbitals
        .iter()
        .filter(|o| (o.energy_ev + 14.8).abs() < 1e-9)
        .map(|o| o.irrep.clone().expect("labelled"))
        .collect();
    irreps.sort();
    assert_eq!(irreps, vec!["a1", "b1"]);
}

#[test]
fn nothing_to_hold_disables_the_switch_with_a_reason() {
    for path in [
        "demo_molecules/carbon_monoxide.xyz",
        "tests/hard_molecules/dinitrogen.xyz",
    ] {
        let off = run(
            &molecule(path),
            HeldLonePairs::default(),
            HoldConvention::FirstOrder,
        );
        let switch = off.lone_pair_switch.as_ref().unwrap();
        assert!(switch.held.is_empty(), "{path}");
        let reason = switch.disabled.as_deref().expect("a reason");
        assert!(reason.contains("terminal"), "{path}: {reason}");
        // Nothing held: the canonical MOs are the ordinary ones.
        let on = Analysis::run(&molecule(path), &Settings::default()).unwrap();
        for (a, b) in on.orbitals.iter().zip(&off.orbitals) {
            assert_eq!(a.energy_ev, b.energy_ev, "{path}");
        }
    }
}

#[test]
fn chosen_terminal_lone_pairs_are_held() {
    // Carbon monoxide with the carbon lone pair chosen (atom 0).
    let off = run(
        &molecule("demo_molecules/carbon_monoxide.xyz"),
        HeldLonePairs::Atoms(vec![0]),
        HoldConvention::FirstOrder,
    );
    let switch = off.lone_pair_switch.as_ref().unwrap();
    assert!(switch.disabled.is_none());
    assert_eq!(switch.held.len(), 1);
    assert_eq!(switch.held[0].atoms, vec![0]);
    // C 2p of the standard parameters.
    assert!((switch.held[0].energy_off_ev + 11.4).abs() < 1e-9);
}

#[test]
fn project_files_choose_lone_pairs_as_the_readme_spells_it() {
    let opened =
        diptych::project::open_path(&root().join("demo_molecules/water.xyz")).expect("opens");
    let mut project = opened.project;
    project.settings.lone_pair_mixing = false;
    project.settings.held_lone_pairs =
        HeldLonePairs::Chosen(vec![diptych::localized::held::LonePairRef {
            atom: 0,
            index: 1,
        }]);
    project.settings.hold_convention = HoldConvention::Hybrid;
    let text = project.to_ron().expect("writes");
    assert!(text.contains("hold_convention: hybrid"), "{text}");
    let back = diptych::project::Project::from_ron(&text).expect("reads back");
    assert_eq!(back.settings, project.settings);
    // The spellings the README gives for project files, in place of the written choice.
    let start = text.find("held_lone_pairs:").expect("written");
    let end = text.find("hold_convention:").expect("written");
    for (spelling, expected) in [
        ("central", HeldLonePairs::Central),
        ("all", HeldLonePairs::All),
        ("atoms([0, 2])", HeldLonePairs::Atoms(vec![0, 2])),
        (
            "chosen([(atom: 0, index: 1)])",
            project.settings.held_lone_pairs.clone(),
        ),
    ] {
        let edited = format!(
            "{}held_lone_pairs: {spelling},\n    {}",
            &text[..start],
            &text[end..]
        );
        let read = diptych::project::Project::from_ron(&edited).expect("reads");
        assert_eq!(read.settings.held_lone_pairs, expected, "{spelling}");
    }
    // One lone pair of two held: a single held level.
    let analysis = Analysis::run(&project.molecule, &project.settings).unwrap();
    assert_eq!(analysis.lone_pair_switch.unwrap().held.len(), 1);
}

#[test]
fn every_test_molecule_survives_the_switch_with_every_lone_pair_held() {
    // Open shells, ions, hypervalent and electron-deficient molecules, atoms: with every
    // lone pair held the switch either holds them or says why not, the electrons add up
    // and the weights stay a partition (no closed-shell check: a held open shell may
    // refill).
    for folder in ["demo_molecules", "tests/hard_molecules"] {
        for path in xyz_files(folder) {
            let molecule = load(&path);
            let name = path.display().to_string();
            let off = run(&molecule, HeldLonePairs::All, HoldConvention::FirstOrder);
            if off.eht.is_none() {
                continue;
            }
            // A single atom has no point group (a symmetry-stage error of its own).
            let errors: Vec<_> = off
                .errors
                .iter()
                .filter(|e| e.stage != diptych::analysis::Stage::Symmetry)
                .collect();
            assert!(errors.is_empty(), "{name}: {errors:?}");
            let electrons: f64 = off.orbitals.iter().map(|o| o.occupancy).sum();
            assert!((electrons - off.electrons as f64).abs() < 1e-9, "{name}");
            let switch = off.lone_pair_switch.as_ref().expect("summary");
            assert!(
                switch.disabled.is_some() || !switch.held.is_empty(),
                "{name}"
            );
            // Holding never costs a label (a "?" appears only where symmetry gives none
            // with mixing on too).
            let on = Analysis::run(&molecule, &Settings::default()).unwrap();
            let unlabelled = |a: &Analysis| {
                a.orbitals
                    .iter()
                    .filter(|o| o.label.as_deref() == Some("?"))
                    .count()
            };
            assert!(unlabelled(&off) <= unlabelled(&on), "{name}");
            let (by_localized, by_canonical) = weight_sums(&off);
            for total in by_localized.iter().chain(&by_canonical) {
                assert!((total - 1.0).abs() < 0.01, "{name}: weights {total}");
            }
        }
    }
}
