//! GUI tests of the window's housekeeping (issue 18, item 7): New and the theme mark
//! nothing unsaved, Ctrl+N starts a new document, Escape closes the topmost window.

use eframe::egui;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable;

use super::DiptychApp;

fn harness() -> Harness<'static, DiptychApp> {
    let app = DiptychApp::new(egui::Context::default(), None, None);
    Harness::builder()
        .with_size(egui::vec2(1400.0, 900.0))
        .build_ui_state(|ui, app: &mut DiptychApp| app.frame_ui(ui), app)
}

#[test]
fn new_from_the_menu_and_ctrl_n_leave_nothing_unsaved() {
    let mut harness = harness();
    harness.step();
    harness.get_by_label("File").click();
    harness.run_steps(2);
    harness.get_by_label("New  (Ctrl+N)").click();
    harness.step();
    harness.step();
    assert!(
        !harness.state().state.dirty,
        "New marked the document modified"
    );
    // An edit between frames, as DEVELOPERS.md says tests make them; then saved.
    harness.state_mut().state.project.molecule.name = "edited".into();
    harness.state_mut().state.document_changed();
    harness.state_mut().state.dirty = false;
    harness.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::N);
    harness.step();
    harness.step();
    assert_eq!(harness.state().state.project.molecule.name, "ammonia");
    assert!(!harness.state().state.dirty);
}

#[test]
fn the_theme_is_not_an_edit() {
    let mut harness = harness();
    harness.step();
    harness.get_by_label("View").click();
    harness.run_steps(2);
    harness.get_by_label("Dark theme").click();
    harness.run_steps(2);
    assert!(
        harness.state().state.project.view.dark_theme,
        "the theme changed"
    );
    assert!(
        !harness.state().state.dirty,
        "the theme marked the document modified"
    );
}

#[test]
fn escape_closes_the_topmost_window() {
    let mut harness = harness();
    harness.step();
    harness.state_mut().state.settings_open = true;
    harness.state_mut().state.walsh.open = true;
    harness.step();
    harness.key_press(egui::Key::Escape);
    harness.step();
    assert!(
        !harness.state().state.settings_open,
        "settings closed first"
    );
    assert!(harness.state().state.walsh.open, "one window per Escape");
    harness.key_press(egui::Key::Escape);
    harness.step();
    assert!(!harness.state().state.walsh.open);
}

#[test]
fn the_builder_keeps_the_parent_selected_and_edits_bonds() {
    let mut harness = harness();
    harness.step();
    harness.get_by_label("Build").click();
    harness.run_steps(2);
    // Ammonia's nitrogen; two clicks add two hydrogens to it (formerly the second went
    // on the first new hydrogen).
    harness.state_mut().state.selected_atom = Some(0);
    harness.run_steps(1);
    harness.get_by_label("Add bonded atom").click();
    harness.run_steps(1);
    harness.get_by_label("Add bonded atom").click();
    harness.run_steps(1);
    let molecule = &harness.state().state.project.molecule;
    assert_eq!(molecule.len(), 6);
    assert_eq!(harness.state().state.selected_atom, Some(0));
    assert!(molecule.bond(0, 4).is_some() && molecule.bond(0, 5).is_some());
    // The bond row: N–H1 removed ("none"), then made again with order 1.
    harness.state_mut().state.builder.bond_partner = 1;
    harness.state_mut().state.builder.bond_order = 0;
    harness.run_steps(1);
    harness.get_by_label("Set bond").click();
    harness.run_steps(1);
    assert!(harness.state().state.project.molecule.bond(0, 1).is_none());
    assert!(harness.state().state.dirty, "a bond edit is an edit");
    harness.state_mut().state.builder.bond_order = 2;
    harness.run_steps(1);
    harness.get_by_label("Set bond").click();
    harness.run_steps(1);
    let bond = harness.state().state.project.molecule.bond(0, 1).copied();
    assert_eq!(bond.map(|b| b.order), Some(2));
}

#[test]
fn without_a_system_dialog_a_typed_path_opens_the_file() {
    let mut harness = harness();
    harness.step();
    harness.state_mut().dialogs = super::menus::Dialogs::with_system_dialog(false);
    harness.state().dialogs.ask_open();
    harness.run_steps(2);
    harness.get_by_label_contains("No system file dialog is available here");
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/water.xyz");
    let field = harness.get_by_role_and_label(egui::accesskit::Role::TextInput, "Path");
    field.focus();
    field.type_text(&path.to_string_lossy());
    harness.run_steps(2);
    harness.get_by_label("OK").click();
    harness.run_steps(3);
    assert_eq!(harness.state().state.project.molecule.formula(), "H2O");
    assert!(
        harness
            .query_by_label_contains("No system file dialog")
            .is_none()
    );
}

#[test]
fn a_typed_save_path_that_exists_is_named_before_it_is_replaced() {
    let mut harness = harness();
    harness.step();
    harness.state_mut().dialogs = super::menus::Dialogs::with_system_dialog(false);
    let folder = tempfile::tempdir().expect("temp");
    let existing = folder.path().join("kept.diptych.ron");
    std::fs::write(&existing, b"old").expect("written");
    harness
        .state()
        .dialogs
        .ask_save_as("no-such-file-here".into());
    harness.run_steps(2);
    assert!(
        harness.query_by_label_contains("OK replaces it").is_none(),
        "a new name"
    );
    // The suggested name is the existing file's.
    let stem = folder.path().join("kept");
    harness
        .state()
        .dialogs
        .ask_save_as(stem.to_string_lossy().into_owned());
    harness.run_steps(2);
    harness.get_by_label_contains("A file of this name exists: OK replaces it.");
    harness.get_by_label("Cancel").click();
    harness.run_steps(2);
    assert_eq!(std::fs::read(&existing).expect("still there"), b"old");
}
