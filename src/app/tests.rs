//! GUI tests without a display: egui_kittest drives the real app state and frame code.

use std::time::{Duration, Instant};

use eframe::egui;
use egui_kittest::Harness;
use egui_kittest::kittest::{NodeT, Queryable};

use super::DiptychApp;
use super::bond_sticks::BondDrawing;
use super::diagram_view::LevelRef;
use diptych::localized::held::{HeldLonePairs, HoldConvention};

fn harness() -> Harness<'static, DiptychApp> {
    let app = DiptychApp::new(egui::Context::default(), None, None);
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut DiptychApp| app.frame_ui(ui), app)
}

/// The labels of the delocalized ladder as laid out in the diagram.
fn delocalized_labels(harness: &Harness<'static, DiptychApp>) -> Vec<String> {
    let diagram = harness
        .state()
        .state
        .diagram
        .as_ref()
        .expect("diagram laid out");
    diagram.ladders[0]
        .levels
        .iter()
        .map(|l| l.label.clone())
        .collect()
}

/// Steps frames until the worker's analysis of the current document has arrived.
fn wait_for_analysis(harness: &mut Harness<'static, DiptychApp>) {
    step_until(harness, "the analysis", DiptychApp::is_analysed);
    harness.step();
}

/// Steps frames until `done` holds for the app (work on background threads arrives), or
/// fails naming `what` after 60 s.
fn step_until(
    harness: &mut Harness<'static, DiptychApp>,
    what: &str,
    done: impl Fn(&DiptychApp) -> bool,
) {
    let start = Instant::now();
    loop {
        harness.step();
        if done(harness.state()) {
            return;
        }
        assert!(
            start.elapsed() < Duration::from_secs(60),
            "{what} never came"
        );
        std::thread::sleep(Duration::from_millis(5));
    }
}

/// The point group of the analysis on screen.
fn point_group_of(harness: &Harness<'static, DiptychApp>) -> String {
    let analysis = harness.state().state.analysis.as_ref().expect("analysed");
    let symmetry = analysis.symmetry.as_ref().expect("symmetry found");
    symmetry.group.to_string()
}

/// The highest occupied canonical orbital of the analysis on screen.
fn homo_of(harness: &Harness<'static, DiptychApp>) -> diptych::analysis::OrbitalSummary {
    let analysis = harness.state().state.analysis.as_ref().expect("analysed");
    analysis
        .orbitals
        .iter()
        .rfind(|o| o.occupancy > 0.0)
        .expect("occupied orbitals")
        .clone()
}

#[test]
fn starts_on_ammonia_with_its_labelled_diagram() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.formula(), "H3N");
    let labels = delocalized_labels(&harness);
    assert!(
        labels.iter().any(|l| l == "3a1") && labels.iter().any(|l| l == "1e"),
        "{labels:?}"
    );
    harness.get_by_label("ammonia");
    harness.get_by_label("8");
}

#[test]
fn renaming_a_ladder_retitles_the_diagram_and_marks_unsaved() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Left title").click();
    harness.run_steps(2);
    harness.get_by_label("Left title").type_text(" — NH3");
    harness.run_steps(3);
    let app = harness.state();
    let title = &app.state.project.titles.delocalized;
    assert!(title.contains(" — NH3"), "{title}");
    assert_eq!(
        app.state.diagram.as_ref().unwrap().ladders[0].title,
        app.state.project.titles.delocalized
    );
    assert!(app.state.dirty);
    assert!(
        app.state.title().ends_with('•'),
        "title bar marks unsaved changes"
    );
}

#[test]
fn energies_checkbox_is_a_document_option() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    assert!(harness.state().state.project.view.show_energies);
    harness.get_by_label("Energies").click();
    harness.run_steps(2);
    assert!(!harness.state().state.project.view.show_energies);
}

#[test]
fn selecting_a_level_shows_its_composition() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    // The HOMO of ammonia (index 3, the 3a1 lone-pair level).
    harness.state_mut().state.selected_level = Some(LevelRef { ladder: 0, key: 3 });
    harness.run_steps(2);
    harness.get_by_label("Orbital 3a1");
    harness.get_by_label_contains("Composition");
    // Nitrogen carries most of the lone pair.
    let nitrogen_share = harness.get_by_label("N0").rect();
    assert!(nitrogen_share.width() > 0.0);
}

#[test]
fn a_damaged_file_shows_an_error_and_keeps_the_document() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    let bad = folder.path().join("broken.xyz");
    std::fs::write(&bad, "3\nbroken\nN 0 0 0\nH 0 zero 0\n").unwrap();
    harness.state_mut().state.open(bad);
    harness.run_steps(2);
    assert_eq!(harness.state().state.project.molecule.name, "ammonia");
    harness.get_by_label("Problem");
    harness.get_by_label_contains("line 4: expected a number for the y coordinate");
    harness.get_by_label("OK").click();
    harness.run_steps(2);
    assert!(harness.state().state.error_dialog.is_none());
}

#[test]
fn a_saved_project_reopens_identically() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("nh3");
    {
        let state = &mut harness.state_mut().state;
        state.project.titles.localized = "Lewis & <donor> pairs".into();
        state.project.view.link_threshold = 0.2;
        state.save_to(path.clone());
        assert!(!state.dirty);
    }
    let saved = harness.state().state.project.clone();
    let reopened_path = folder.path().join("nh3.diptych.ron");
    assert!(reopened_path.exists(), "the project extension is added");
    let mut other = self::harness();
    wait_for_analysis(&mut other);
    other.state_mut().state.open(reopened_path);
    wait_for_analysis(&mut other);
    assert_eq!(other.state().state.project, saved);
}

#[test]
fn clicking_an_atom_selects_it() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.selected_atom = Some(0);
    harness.run_steps(2);
    harness.get_by_label("Atom 0: nitrogen (N)");
    harness.get_by_label_contains("Angles at this atom");
}

#[test]
fn undo_and_redo_walk_through_edits() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let original = harness.state().state.project.clone();
    harness.get_by_label("Energies").click();
    harness.run_steps(2);
    harness.get_by_label("Charge").click();
    harness.run_steps(1);
    harness.get_by_label("Charge").type_text("1");
    harness.key_press(egui::Key::Enter);
    harness.run_steps(1);
    // Click elsewhere so the field lets go of the keyboard.
    harness.get_by_label("Inspector").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    assert_eq!(
        harness.state().state.analysis.as_ref().unwrap().electrons,
        7,
        "charge change re-analysed"
    );
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.charge, 0);
    assert_eq!(
        harness.state().state.analysis.as_ref().unwrap().electrons,
        8
    );
    harness.state_mut().state.undo();
    harness.run_steps(2);
    assert_eq!(harness.state().state.project, original);
    harness.state_mut().state.redo();
    harness.run_steps(2);
    assert!(!harness.state().state.project.view.show_energies);
}

#[test]
fn valence_only_numbering_relabels_the_diagram() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.settings_open = true;
    harness.run_steps(2);
    harness.get_by_label("valence only (1a1, 2a1 …)").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    let labels = delocalized_labels(&harness);
    // Valence-only numbering: ammonia's lone pair is 2a1 (core-inclusive 3a1).
    assert!(
        labels.iter().any(|l| l == "2a1") && labels.iter().any(|l| l == "1a1"),
        "{labels:?}"
    );
    assert!(harness.state().state.history.can_undo());
}

#[test]
fn selecting_a_bond_shows_its_constituents_and_hybrids() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let key = {
        let analysis = harness.state().state.analysis.as_ref().unwrap();
        let n = analysis
            .localized
            .iter()
            .position(|l| l.label == "σ(N–H)")
            .expect("an N–H bond");
        diptych::diagram::build::LOCALIZED_KEY_OFFSET + n
    };
    harness.state_mut().state.selected_level = Some(LevelRef { ladder: 1, key });
    harness.run_steps(2);
    harness.get_by_label("Localized σ(N–H)");
    harness.get_by_label("Canonical constituents (weights)");
    // The e pair is the largest constituent of an N–H bond (group theory: a1 + e); the
    // Diagram's 1e level is a node of its own, so ask for the Inspector's text.
    harness.get_by_role_and_label(egui::accesskit::Role::Label, "1e");
    // The default hybrids are read from the wavefunction: sp^2.44 for N–H (the library's
    // value for the demo geometry, `diptych analyze demo_molecules/ammonia.xyz`).
    harness.get_by_label("sp^2.44");
    // Coulson's λ for the 106.7° demo geometry with the geometric model. The Settings
    // window's wrapped explanations take two frames to settle before it can be clicked.
    harness.state_mut().state.settings_open = true;
    harness.run_steps(4);
    harness.get_by_label("geometric (Coulson)").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    harness.get_by_label("sp^3.48");
}

#[test]
fn the_lone_pair_switch_moves_the_lone_pair_level() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let homo = |harness: &Harness<'static, DiptychApp>| homo_of(harness).energy_ev;
    let before = homo(&harness);
    harness.get_by_label("Lone-pair mixing").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    let after = homo(&harness);
    assert!(!harness.state().state.project.settings.lone_pair_mixing);
    // Held non-bonding, ammonia's lone pair sits at the N 2p VSIP (−13.4 eV, Hoffmann 1963).
    assert!((after + 13.4).abs() < 1e-6, "{after}");
    assert!((after - before).abs() > 0.1);
}

#[test]
fn the_inspector_chooses_lone_pairs_and_the_convention() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Lone-pair mixing").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    // The caption under the axis states the switch (first-order convention).
    let caption = harness
        .state()
        .state
        .diagram
        .as_ref()
        .map(|d| d.caption.clone());
    let state = caption.and_then(|c| c.switch_state).unwrap_or_default();
    assert!(
        state.starts_with("Lone-pair mixing off: n(N) on N0 held non-bonding"),
        "{state}"
    );
    // The hybrid convention holds the lone-pair hybrid at the ladder's n(N) energy.
    harness.get_by_label("hybrid").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    let settings = &harness.state().state.project.settings;
    assert_eq!(settings.hold_convention, HoldConvention::Hybrid);
    let analysis = harness.state().state.analysis.clone().expect("analysis");
    let held = &analysis.lone_pair_switch.as_ref().unwrap().held[0];
    let ladder_n = analysis
        .localized
        .iter()
        .find(|l| l.label == "n(N)")
        .unwrap();
    assert!((held.energy_off_ev - ladder_n.energy_ev).abs() < 1e-9);
    // Unticking the only lone pair leaves nothing held: an explicit, empty choice.
    harness.get_by_label("n(N) on N0 (#1)").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert_eq!(
        harness.state().state.project.settings.held_lone_pairs,
        HeldLonePairs::Chosen(Vec::new())
    );
    let analysis = harness.state().state.analysis.clone().expect("analysis");
    assert!(
        analysis
            .lone_pair_switch
            .as_ref()
            .unwrap()
            .disabled
            .is_some()
    );
}

#[test]
fn editing_a_bond_angle_reshapes_the_molecule_and_is_undoable() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.selected_atom = Some(0);
    harness.run_steps(2);
    let field = "H1–N0–H2";
    harness.get_by_label(field).click();
    harness.run_steps(1);
    harness.get_by_label(field).type_text("100");
    harness.key_press(egui::Key::Enter);
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    let angle = harness
        .state()
        .state
        .project
        .molecule
        .angle(1, 0, 2)
        .unwrap();
    assert!((angle - 100.0).abs() < 1e-6, "{angle}");
    // H2 turned within the H1–N–H2 plane: the three H–N–H angles now all differ, which
    // leaves no symmetry element (C1).
    let group = point_group_of(&harness);
    assert_eq!(group, "C1");
    harness.get_by_label("Inspector").click();
    harness.run_steps(1);
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    let angle = harness
        .state()
        .state
        .project
        .molecule
        .angle(1, 0, 2)
        .unwrap();
    assert!(
        (angle - 106.7).abs() < 1e-6,
        "undo restores 106.7°, got {angle}"
    );
}

#[test]
fn symmetrize_makes_a_slightly_distorted_molecule_exact() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    {
        let state = &mut harness.state_mut().state;
        state.project.molecule.atoms[1].position.x += 0.003;
        state.document_changed();
    }
    wait_for_analysis(&mut harness);
    harness.get_by_label("Symmetrize").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    let molecule = &harness.state().state.project.molecule;
    let lengths: Vec<f64> = (1..4).map(|h| molecule.distance(0, h).unwrap()).collect();
    assert!(
        (lengths[0] - lengths[1]).abs() < 1e-9 && (lengths[1] - lengths[2]).abs() < 1e-9,
        "{lengths:?}"
    );
    assert!(
        harness.state().state.history.can_undo(),
        "Symmetrize is an undoable edit"
    );
}

#[test]
fn exporting_writes_the_diagram_on_screen_as_svg() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("nh3.svg");
    harness.state_mut().state.project.titles.localized = "Bonds & <lone> pairs".into();
    harness.state_mut().state.rebuild_diagram();
    harness.state_mut().state.export_diagram(path.clone());
    let svg = std::fs::read_to_string(&path).unwrap();
    assert!(svg.starts_with("<?xml"));
    assert!(svg.contains("Bonds &amp; &lt;lone&gt; pairs"));
    assert!(
        svg.contains("<tspan>3a</tspan>"),
        "the 3a1 label with its subscript"
    );
    // An unwritable place gives an error dialog, not a panic.
    harness
        .state_mut()
        .state
        .export_diagram(folder.path().join("no/such/folder/x.svg"));
    assert!(harness.state().state.error_dialog.is_some());
}

#[test]
fn a_zoomed_screen_exports_the_whole_diagram_unless_asked() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    {
        let state = &mut harness.state_mut().state;
        state.energy_window = Some((-18.0, -12.0));
        state.rebuild_diagram();
    }
    let whole = folder.path().join("whole.svg");
    harness.state_mut().state.export_diagram(whole.clone());
    let svg = std::fs::read_to_string(&whole).unwrap();
    assert!(svg.contains("<tspan>2a</tspan>"), "2a1 is in the export");
    assert!(
        !svg.contains("lower level(s) not shown"),
        "nothing below left out"
    );
    harness.state_mut().state.export.zoomed = true;
    let zoomed = folder.path().join("zoomed.svg");
    harness.state_mut().state.export_diagram(zoomed.clone());
    let svg = std::fs::read_to_string(&zoomed).unwrap();
    assert!(!svg.contains("<tspan>2a</tspan>"));
    assert!(
        svg.contains("+1 lower level(s) not shown"),
        "the figure says so"
    );
}

#[test]
fn flattening_a_pyramidal_template_moves_the_lone_pair_level() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Build").click();
    harness.run_steps(2);
    harness.get_by_label("Apply template").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    let homo = homo_of;
    let pyramidal = homo(&harness);
    assert_eq!(pyramidal.label.as_deref(), Some("3a1"));
    // Flatten to 120°: Walsh (J. Chem. Soc. 1953, from memory) — the lone pair rises and
    // becomes a pure p level (1a2″ in D3h).
    harness.state_mut().state.builder.angle = 120.0;
    harness.get_by_label("Apply template").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    let planar = homo(&harness);
    assert_eq!(planar.label.as_deref(), Some("1a2''"), "{planar:?}");
    assert!(planar.energy_ev > pyramidal.energy_ev);
    let group = point_group_of(&harness);
    assert_eq!(group, "D3h");
}

#[test]
fn builder_adds_and_deletes_atoms_with_undo() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Build").click();
    harness.run_steps(2);
    harness.state_mut().state.selected_atom = Some(1);
    harness.run_steps(1);
    harness.get_by_label("Delete atom").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.formula(), "H2N");
    assert_eq!(
        harness.state().state.analysis.as_ref().unwrap().electrons,
        7,
        "NH2 radical"
    );
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.formula(), "H3N");
}

#[test]
fn unsaved_changes_are_autosaved_and_can_be_restored() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    let recovery = folder.path().join("recovery.diptych.ron");
    harness.state_mut().state.recovery_path = Some(recovery.clone());
    harness.get_by_label("Energies").click();
    harness.run_steps(2);
    let edited = harness.state().state.project.clone();
    let state = &mut harness.state_mut().state;
    // The frames above started the clock at a harness time of a fraction of a second.
    state.autosave(30.0);
    assert!(!recovery.exists(), "not before 60 s of unsaved changes");
    state.autosave(100.0);
    assert!(recovery.exists(), "written after 60 s");
    // A new session offers it; Restore brings the edited document back.
    let mut next = self::harness();
    wait_for_analysis(&mut next);
    next.state_mut().state.recovery_path = Some(recovery.clone());
    next.state_mut().state.recovery_offer = super::recovery::read(&recovery);
    next.run_steps(2);
    next.get_by_label("Restore").click();
    next.run_steps(2);
    assert_eq!(next.state().state.project, edited);
}

#[test]
fn opening_another_file_asks_before_discarding_changes() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Energies").click();
    harness.run_steps(2);
    let water = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/water.xyz");
    harness.state_mut().state.request_open(water.clone());
    harness.run_steps(2);
    harness.get_by_label("Unsaved changes");
    harness.get_by_label("Keep editing").click();
    harness.run_steps(2);
    assert_eq!(harness.state().state.project.molecule.name, "ammonia");
    harness.state_mut().state.request_open(water);
    harness.run_steps(2);
    harness.get_by_label("Discard changes").click();
    harness.run_steps(2);
    assert_eq!(harness.state().state.project.molecule.name, "water");
}

#[test]
fn the_energy_axis_zooms_and_fits() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let fitted = {
        let d = harness.state().state.diagram.as_ref().unwrap();
        (d.energy_min, d.energy_max)
    };
    {
        let state = &mut harness.state_mut().state;
        state.energy_window = Some((-18.0, -12.0));
        state.rebuild_diagram();
    }
    harness.run_steps(2);
    let zoomed = harness.state().state.diagram.as_ref().unwrap();
    assert_eq!((zoomed.energy_min, zoomed.energy_max), (-18.0, -12.0));
    assert_eq!(zoomed.ladders[0].hidden_below, 1, "2a1 is below the window");
    harness.get_by_label("Fit").click();
    harness.run_steps(2);
    let back = harness.state().state.diagram.as_ref().unwrap();
    assert_eq!((back.energy_min, back.energy_max), fitted);
}

#[test]
fn flipping_the_switch_glides_the_levels_then_settles() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    assert!(harness.state().state.transition.is_none());
    harness.get_by_label("Lone-pair mixing").click();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert!(
        harness.state().state.transition.is_some(),
        "the new levels glide in from the old layout"
    );
    // egui_kittest advances time by a fixed step per frame; 60 frames outlast the glide.
    harness.run_steps(60);
    assert!(harness.state().state.transition.is_none(), "the glide ends");
    // A geometry edit is not the switch: no glide.
    harness.state_mut().state.project.molecule.atoms[1]
        .position
        .x += 0.01;
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert!(harness.state().state.transition.is_none());
}

#[test]
fn a_dihedral_field_is_listed_for_a_terminal_atom() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let ethylene =
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ethylene.xyz");
    harness.state_mut().state.open(ethylene);
    wait_for_analysis(&mut harness);
    let molecule = harness.state().state.project.molecule.clone();
    let hydrogen = (0..molecule.len())
        .find(|&i| molecule.atoms[i].element == diptych::chem::Element::H)
        .expect("ethylene has hydrogens");
    harness.state_mut().state.selected_atom = Some(hydrogen);
    harness.run_steps(2);
    harness.get_by_label_contains("Dihedrals from this atom");
    let carbon = molecule.neighbours(hydrogen)[0];
    let other_carbon = molecule
        .neighbours(carbon)
        .into_iter()
        .find(|&n| molecule.atoms[n].element == diptych::chem::Element::C)
        .expect("C=C");
    let far_hydrogen = molecule
        .neighbours(other_carbon)
        .into_iter()
        .filter(|&n| n != carbon)
        .min()
        .expect("far hydrogen");
    let name = format!("H{hydrogen}–C{carbon}–C{other_carbon}–H{far_hydrogen}");
    harness.get_by_label(&name);
}

#[test]
fn opened_files_are_remembered_as_recent() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules");
    for name in ["water.xyz", "methane.xyz", "water.xyz"] {
        harness.state_mut().state.open(folder.join(name));
        harness.run_steps(1);
    }
    let recent = &harness.state().state.recent_files;
    assert_eq!(recent.len(), 2, "no duplicates: {recent:?}");
    assert!(recent[0].ends_with("water.xyz"), "newest first: {recent:?}");
    harness.get_by_label("File").click();
    harness.run_steps(2);
    harness.get_by_label("Open recent").hover();
    harness.run_steps(2);
    harness.get_by_label("methane.xyz").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.name, "methane");
}

#[test]
fn a_parameter_override_changes_the_levels_and_is_undoable() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let homo = |harness: &Harness<'static, DiptychApp>| homo_of(harness).energy_ev;
    let before = homo(&harness);
    harness.state_mut().state.settings_open = true;
    harness.run_steps(2);
    harness.get_by_label("Parameter overrides").click();
    harness.run_steps(2);
    harness.get_by_label("override N").click();
    harness.run_steps(2);
    let overrides = harness.state().state.project.settings.eht.overrides.clone();
    assert_eq!(overrides.len(), 1);
    assert_eq!(overrides[0].element, diptych::chem::Element::N);
    // A copy of the built-in row changes nothing yet.
    wait_for_analysis(&mut harness);
    assert!((homo(&harness) - before).abs() < 1e-9);
    // Raise the N 2p H_ii by 1 eV: the lone-pair HOMO, mostly N 2p, rises.
    if let Some(p_shell) = harness.state_mut().state.project.settings.eht.overrides[0]
        .shells
        .iter_mut()
        .find(|shell| shell.l == 1)
    {
        p_shell.vsip += 1.0;
    }
    // Edits made outside a frame are announced by hand (the frame diff cannot see them).
    harness.state_mut().state.document_changed();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    let raised = homo(&harness);
    assert!(raised > before + 0.3, "{before} → {raised}");
    harness.state_mut().state.undo();
    harness.run_steps(1);
    harness.state_mut().state.undo();
    harness.run_steps(1);
    wait_for_analysis(&mut harness);
    assert!(
        harness
            .state()
            .state
            .project
            .settings
            .eht
            .overrides
            .is_empty()
    );
    assert!((homo(&harness) - before).abs() < 1e-9);
}

#[test]
fn the_frame_time_overlay_is_shown_from_the_view_menu() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    assert!(harness.query_by_label_contains("frame CPU").is_none());
    harness.get_by_label("View").click();
    harness.run_steps(2);
    harness.get_by_label("Frame time (debug)").click();
    harness.run_steps(3);
    harness.get_by_label_contains("frame CPU");
}

#[test]
fn a_walsh_scan_runs_off_the_ui_thread_and_a_point_sets_the_geometry() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.get_by_label("Walsh scan…").click();
    harness.run_steps(2);
    // The default form is ammonia's pyramidalization from 90° to 120°.
    harness.get_by_label("Run scan").click();
    step_until(&mut harness, "the scan", |app| {
        app.state.walsh.scan.is_some()
    });
    harness.run_steps(2);
    let scan = harness.state().state.walsh.scan.clone().expect("scan");
    assert_eq!(scan.points.len(), 31);
    harness.get_by_label_contains("31 points");
    // Walsh 1953 (from memory): the lone-pair level rises on flattening.
    let homo = scan
        .curves
        .iter()
        .filter(|curve| curve.occupancies[0].is_some_and(|o| o > 0.0))
        .max_by(|a, b| {
            a.energies[0]
                .unwrap_or(f64::MIN)
                .total_cmp(&b.energies[0].unwrap_or(f64::MIN))
        })
        .expect("occupied curves");
    assert!(homo.energies[30] > homo.energies[0], "{:?}", homo.energies);

    let original = harness.state().state.project.molecule.clone();
    super::walsh_view::take_point_geometry(&mut harness.state_mut().state, &scan, 30);
    // The geometry change is seen by the frame's history diff like any other edit.
    harness.state_mut().state.document_changed();
    wait_for_analysis(&mut harness);
    assert_eq!(point_group_of(&harness), "D3h", "planar ammonia");
    assert_ne!(harness.state().state.project.molecule, original);
}

#[test]
fn a_bad_walsh_coordinate_is_refused_before_any_work() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    {
        let walsh = &mut harness.state_mut().state.walsh;
        walsh.open = true;
        // A symmetric bend needs exactly two ligands; ammonia's N has three.
        walsh.kind = super::walsh_view::CoordinateKind::SymmetricBend;
    }
    harness.run_steps(2);
    harness.get_by_label("Run scan").click();
    harness.run_steps(2);
    assert!(harness.state().state.walsh.job.is_none(), "nothing started");
    let error = harness
        .state()
        .state
        .walsh
        .error
        .clone()
        .expect("error shown");
    assert!(error.contains("neighbours"), "{error}");
    harness.get_by_label_contains("neighbours");
}

#[test]
fn the_export_window_previews_and_writes_svg_and_png() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::E);
    harness.run_steps(3);
    harness.get_by_label("Export diagram");
    harness.get_by_label("Export preview");
    harness.get_by_label("PNG (image)").click();
    harness.run_steps(2);
    harness.get_by_label("Export PNG…");
    let folder = tempfile::tempdir().unwrap();
    harness.state_mut().state.export.dpi = 48.0;
    let png_path = folder.path().join("nh3.png");
    harness.state_mut().state.export_diagram(png_path.clone());
    let bytes = std::fs::read(&png_path).expect("PNG written");
    assert_eq!(&bytes[1..4], b"PNG");
    // 1000 × 700 CSS pixels at 48 dpi (half of 96): 500 × 350 pixels (IHDR width, height).
    let width = u32::from_be_bytes([bytes[16], bytes[17], bytes[18], bytes[19]]);
    let height = u32::from_be_bytes([bytes[20], bytes[21], bytes[22], bytes[23]]);
    assert_eq!((width, height), (500, 350));
    // An empty title is refused with a message and nothing is written.
    harness.state_mut().state.project.titles.delocalized = "  ".into();
    harness.state_mut().state.rebuild_diagram();
    harness.run_steps(2);
    harness.get_by_label_contains("title of the delocalized ladder is empty");
    let refused = folder.path().join("untitled.svg");
    harness.state_mut().state.export_diagram(refused.clone());
    assert!(!refused.exists());
    assert!(harness.state().state.error_dialog.is_some());
}

#[test]
fn a_report_is_written_in_the_format_of_its_extension() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let folder = tempfile::tempdir().unwrap();
    let markdown = folder.path().join("nh3.md");
    harness.state_mut().state.export_report(markdown.clone());
    let text = std::fs::read_to_string(&markdown).expect("report written");
    assert!(text.contains("| ") && text.contains("3a"), "{text}");
    let json = folder.path().join("nh3.json");
    harness.state_mut().state.export_report(json.clone());
    let value: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&json).unwrap()).expect("JSON");
    assert_eq!(value["electrons"], 8);
    let unknown = folder.path().join("nh3.docx");
    harness.state_mut().state.export_report(unknown.clone());
    assert!(!unknown.exists());
    assert!(harness.state().state.error_dialog.is_some());
}

#[test]
fn a_selected_level_shows_its_orbital_map() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.selected_level = Some(LevelRef { ladder: 0, key: 3 });
    step_until(&mut harness, "the map", |app| {
        app.state.current_map().is_some()
    });
    harness.run_steps(2);
    harness.get_by_label("Export map SVG…");
    let map = harness.state().state.current_map().expect("map");
    // The lone pair has lobes of both signs (a p-rich hybrid) and a nodal line.
    assert!(map.contours.iter().any(|line| line.level > 0.0));
    assert!(map.contours.iter().any(|line| line.level < 0.0));
    let folder = tempfile::tempdir().unwrap();
    let path = folder.path().join("map.svg");
    harness.state_mut().state.export_map(path.clone());
    let svg = std::fs::read_to_string(&path).expect("map SVG");
    assert!(svg.starts_with("<?xml") && svg.contains("<path"));
    // Another plane: through the three hydrogens (the lone pair's nodal region).
    harness.state_mut().state.map.plane = super::orbital_map_view::PlaneChoice::Atoms([1, 2, 3]);
    harness.run_steps(1);
    step_until(&mut harness, "the new plane's map", |app| {
        app.state
            .current_map()
            .is_some_and(|m| m.plane != map.plane)
    });
    // A plane through N normal to the N–H1 bond: N sits on it, H1 is off it.
    harness.state_mut().state.map.plane =
        super::orbital_map_view::PlaneChoice::NormalToBond([0, 1]);
    step_until(&mut harness, "the bond-normal map", |app| {
        app.state.current_map().is_some_and(|m| {
            matches!(
                m.plane.kind,
                diptych::orbital_map::PlaneKind::NormalToBond { .. }
            )
        })
    });
    let map = harness.state().state.current_map().expect("map");
    let height = |index: usize| {
        map.atoms
            .iter()
            .find(|atom| atom.index == index)
            .map(|atom| atom.height.abs())
            .expect("atom projected")
    };
    assert!(height(0) < 1e-9, "N lies on the plane");
    assert!(height(1) > 0.9, "H1 lies a bond length off the plane");
    // Typed contour levels: only ±0.1 is drawn (plus the node).
    harness.get_by_label("Contours at ±").click();
    harness.run_steps(1);
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    harness.run_steps(1);
    harness.get_by_label("Contours at ±").type_text("0.1");
    harness.run_steps(1);
    step_until(&mut harness, "the map with one level", |app| {
        app.state.current_map().is_some_and(|m| {
            m.contours
                .iter()
                .all(|line| (line.level.abs() - 0.1).abs() < 1e-12)
        })
    });
}

#[test]
fn a_hybrid_of_a_bond_can_be_mapped_and_edit_menu_symmetrizes() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    // The first localized level: a σ(N–H) bond.
    harness.state_mut().state.selected_level = Some(LevelRef {
        ladder: 1,
        key: diptych::diagram::build::LOCALIZED_KEY_OFFSET,
    });
    harness.run_steps(2);
    harness.get_by_label("map N0").click();
    step_until(&mut harness, "the hybrid's map", |app| {
        app.state.current_map().is_some_and(|m| {
            matches!(
                m.orbital.reference,
                Some(diptych::orbital_map::OrbitalRef::Hybrid(_))
            )
        })
    });
    // Edit ▸ Symmetrize is offered only when the geometry is not already exact.
    {
        let state = &mut harness.state_mut().state;
        state.project.molecule.atoms[1].position.x += 0.003;
        state.document_changed();
    }
    wait_for_analysis(&mut harness);
    assert!(harness.state().state.can_symmetrize());
    harness.get_by_label("Edit").click();
    harness.run_steps(2);
    harness.get_by_label("Symmetrize geometry").click();
    harness.run_steps(2);
    wait_for_analysis(&mut harness);
    assert!(!harness.state().state.can_symmetrize());
}

#[test]
fn shift_drag_in_the_structure_view_moves_the_selected_atom() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.selected_atom = Some(1);
    harness.run_steps(2);
    let before = harness.state().state.project.molecule.clone();
    // A point inside the Structure panel's 3D view (the left panel, below the toolbar).
    let start = egui::pos2(190.0, 600.0);
    let shift = egui::Modifiers::SHIFT;
    harness
        .input_mut()
        .events
        .push(egui::Event::ModifiersChanged(shift));
    harness
        .input_mut()
        .events
        .push(egui::Event::PointerMoved(start));
    harness.step();
    harness.input_mut().events.push(egui::Event::PointerButton {
        pos: start,
        button: egui::PointerButton::Primary,
        pressed: true,
        modifiers: shift,
    });
    harness.step();
    for step in 1..=10 {
        let at = start + egui::vec2(6.0 * step as f32, 0.0);
        harness
            .input_mut()
            .events
            .push(egui::Event::PointerMoved(at));
        harness.step();
    }
    harness.input_mut().events.push(egui::Event::PointerButton {
        pos: start + egui::vec2(60.0, 0.0),
        button: egui::PointerButton::Primary,
        pressed: false,
        modifiers: shift,
    });
    harness.step();
    let after = harness.state().state.project.molecule.clone();
    let moved = (after.atoms[1].position - before.atoms[1].position).norm();
    assert!(moved > 0.05, "the selected atom moved ({moved} Å)");
    for index in [0, 2, 3] {
        assert_eq!(
            after.atoms[index].position, before.atoms[index].position,
            "atom {index} stays"
        );
    }
    // The move is one undoable edit.
    harness
        .input_mut()
        .events
        .push(egui::Event::ModifiersChanged(egui::Modifiers::NONE));
    harness.step();
    harness.state_mut().state.undo();
    harness.run_steps(2);
    assert_eq!(harness.state().state.project.molecule, before);
}

#[test]
fn opening_another_molecule_drops_the_old_scan() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    harness.state_mut().state.walsh.open = true;
    harness.run_steps(2);
    harness.get_by_label("Run scan").click();
    step_until(&mut harness, "the scan", |app| {
        app.state.walsh.scan.is_some()
    });
    // Phosphine has as many atoms as ammonia: the old scan's geometries must not apply.
    let phosphine =
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/phosphine.xyz");
    harness.state_mut().state.open(phosphine);
    wait_for_analysis(&mut harness);
    assert_eq!(harness.state().state.project.molecule.name, "phosphine");
    assert!(harness.state().state.walsh.scan.is_none());
    harness.get_by_label_contains("Run a scan");
}

/// A harness showing the analysis of `demo_molecules/<file>`.
fn harness_on(file: &str) -> Harness<'static, DiptychApp> {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(file);
    harness.state_mut().state.open(path);
    wait_for_analysis(&mut harness);
    harness.run_steps(2);
    harness
}

/// How many levels of the Diagram carry exactly this label (each level is a node of the
/// accessibility tree named by its label).
fn levels_labelled(harness: &Harness<'static, DiptychApp>, label: &str) -> usize {
    harness
        .query_all_by_label(label)
        .filter(|node| node.accesskit_node().role() == egui::accesskit::Role::ListItem)
        .count()
}

/// The lines of the notes strip under the Diagram that come from the localized picture.
fn localized_notes(harness: &Harness<'static, DiptychApp>) -> Vec<String> {
    harness
        .query_all_by_label_contains("Localized picture: ")
        .filter_map(|node| node.value())
        .collect()
}

/// Selects the first localized level labelled `label`.
fn select_localized(harness: &mut Harness<'static, DiptychApp>, label: &str) {
    let key = {
        let analysis = harness.state().state.analysis.as_ref().unwrap();
        let n = analysis
            .localized
            .iter()
            .position(|l| l.label == label)
            .unwrap_or_else(|| panic!("a {label} level"));
        diptych::diagram::build::LOCALIZED_KEY_OFFSET + n
    };
    harness.state_mut().state.selected_level = Some(LevelRef { ladder: 1, key });
    harness.run_steps(2);
}

/// The bonds the Structure view draws for the molecule and analysis on screen.
fn drawn_bonds(harness: &Harness<'static, DiptychApp>) -> BondDrawing {
    let state = &harness.state().state;
    BondDrawing::for_view(&state.project.molecule, state.analysis.as_deref())
}

#[test]
fn diborane_shows_its_three_centre_bonds_everywhere() {
    let mut harness = harness_on("diborane.xyz");
    // Diagram: two B–H–B bonding levels, and the note on the multicentre bonds.
    assert_eq!(levels_labelled(&harness, "3c(B–H–B)"), 2);
    assert_eq!(levels_labelled(&harness, "σ(B–H)"), 4);
    let notes = localized_notes(&harness);
    assert!(notes.iter().any(|n| n.contains("multicentre")), "{notes:?}");
    harness.get_by_label_contains("notes about the localized picture — see the Diagram");
    // Inspector: the Lewis share and its sentence, the two bridges in chain order.
    harness.get_by_label("Lewis share 67 % of the electrons");
    harness.get_by_label_contains("only in part: see the multicentre bonds");
    harness.get_by_label("3-centre bond B0–H2–B1 (2.00 e)");
    // Structure: two three-centre bonds drawn as such, four B–H sticks, no B–B stick.
    let bonds = drawn_bonds(&harness);
    assert_eq!(bonds.stars.len(), 2, "{bonds:?}");
    assert_eq!(bonds.sticks.len(), 4, "{bonds:?}");
    assert!(bonds.sticks.iter().all(|s| s.lines == 1 && !s.half));
    assert!(!bonds.sticks.iter().any(|s| [s.a, s.b] == [0, 1]));
    // A selected bridge: its kind in words, true and Lewis occupancies.
    select_localized(&mut harness, "3c(B–H–B)");
    harness.get_by_label("multicentre bond (bonding level)");
    harness.get_by_label("1.990 (in the canonical MOs)");
    harness.get_by_label("2.00");
    // A selected boron: formal charge and its bonds with order and Wiberg index.
    harness.state_mut().state.selected_level = None;
    harness.state_mut().state.selected_atom = Some(0);
    harness.run_steps(2);
    harness.get_by_label("B0: formal charge −0.02, no lone pairs");
    // B0–B1 twice: the builder's distance field and the Lewis structure's row, whose
    // order is 0 with a Wiberg index of 0.525.
    assert_eq!(harness.query_all_by_label("B0–B1").count(), 2);
    harness.get_by_label("0.525");
}

#[test]
fn dioxygen_shows_its_open_shell() {
    let mut harness = harness_on("dioxygen.xyz");
    assert_eq!(levels_labelled(&harness, "π*(O–O)"), 2);
    let notes = localized_notes(&harness);
    assert!(notes.iter().any(|n| n.contains("open shell")), "{notes:?}");
    harness.get_by_label("Unpaired electrons: 2.00 in 2 orbitals over O0–O1.");
    // The π* levels hold one electron each in the Lewis structure.
    select_localized(&mut harness, "π*(O–O)");
    harness.get_by_label("π antibond");
    harness.get_by_label("1.00");
    // A double bond: two lines.
    let bonds = drawn_bonds(&harness);
    assert_eq!(bonds.sticks.len(), 1);
    assert_eq!((bonds.sticks[0].lines, bonds.sticks[0].half), (2, false));
}

#[test]
fn sulfur_hexafluoride_says_its_sulfur_is_over_complete() {
    let mut harness = harness_on("sulfur_hexafluoride.xyz");
    let notes = localized_notes(&harness);
    assert!(
        notes.iter().any(|n| n.contains("valence functions")),
        "{notes:?}"
    );
    assert!(levels_labelled(&harness, "7c(SF6)") >= 1);
    // Sulfur's six bond hybrids are each two thirds of an orbital; fluorine's are whole.
    select_localized(&mut harness, "7c(SF6)");
    assert_eq!(harness.query_all_by_label("sp^3.00").count(), 6);
    harness.get_by_label_contains("S0: each hybrid here is a share 0.67 of an orbital");
    assert_eq!(
        harness.query_all_by_label_contains("of an orbital").count(),
        1
    );
    let bonds = drawn_bonds(&harness);
    assert_eq!(bonds.sticks.len(), 6);
    assert!(bonds.stars.is_empty());
}

#[test]
fn carbon_monoxide_has_a_lone_pair_on_carbon_and_a_triple_bond() {
    let mut harness = harness_on("carbon_monoxide.xyz");
    for label in ["σ(C–O)", "π(C–O)", "n(C)", "n(O)"] {
        assert!(levels_labelled(&harness, label) >= 1, "{label}");
    }
    assert_eq!(levels_labelled(&harness, "π(C–O)"), 2);
    assert_eq!(levels_labelled(&harness, "v(C)"), 0);
    harness.get_by_label("One Lewis structure describes the molecule well.");
    harness.get_by_label("No notes: every stage ran without remarks.");
    let bonds = drawn_bonds(&harness);
    assert_eq!(bonds.sticks.len(), 1);
    assert_eq!((bonds.sticks[0].lines, bonds.sticks[0].half), (3, false));
    // :C≡O: carries −1 on carbon.
    harness.state_mut().state.selected_atom = Some(0);
    harness.run_steps(2);
    harness.get_by_label("C0: formal charge −1.00, 1 lone pair");
}

#[test]
fn a_failed_analysis_is_said_under_the_diagram_and_the_last_result_stays() {
    let mut harness = harness();
    wait_for_analysis(&mut harness);
    // Two atoms on top of each other cannot be analysed.
    let position = harness.state().state.project.molecule.atoms[0].position;
    harness.state_mut().state.project.molecule.atoms[1].position = position;
    harness.state_mut().state.document_changed();
    step_until(&mut harness, "the failure", |app| {
        app.state.analysis_error.is_some()
    });
    harness.run_steps(2);
    harness.get_by_label_contains("The latest change could not be analysed");
    assert!(harness.state().state.diagram.is_some());
    assert_eq!(levels_labelled(&harness, "n(N)"), 1);
}
