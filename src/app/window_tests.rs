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
