//! The in-app path field used where no system file dialog can appear. On Linux rfd asks
//! the desktop portal over the D-Bus session bus; with no session bus (no
//! `DBUS_SESSION_BUS_ADDRESS` and no `$XDG_RUNTIME_DIR/bus`, as on a bare X server or over
//! plain ssh) no dialog would ever show, so the window asks for a typed path instead and
//! says why. Elsewhere the system dialog is used.

use std::path::{Path, PathBuf};

use eframe::egui;

use super::menus::DialogAnswer;

/// Whether a system file dialog can appear on this machine (see the module comment).
pub fn system_dialog_available() -> bool {
    if !cfg!(target_os = "linux") {
        return true;
    }
    std::env::var_os("DBUS_SESSION_BUS_ADDRESS").is_some()
        || std::env::var_os("XDG_RUNTIME_DIR")
            .is_some_and(|dir| Path::new(&dir).join("bus").exists())
}

/// A path asked for in the window.
pub struct PathPrompt {
    pub title: &'static str,
    pub text: String,
    pub answer: fn(PathBuf) -> DialogAnswer,
    /// A save: an existing file at the typed path is named before OK replaces it, as a
    /// system save dialog would ask.
    pub saves: bool,
}

/// Why the field is shown, in the window.
const WHY: &str = "No system file dialog is available here (no desktop portal on the session \
                   bus). Type the path of the file:";

/// Draws the prompt; returns the answer once the user confirms, and whether it stays open.
pub fn show(ctx: &egui::Context, prompt: &mut PathPrompt) -> (Option<DialogAnswer>, bool) {
    let mut answer = None;
    let mut open = true;
    egui::Window::new(prompt.title)
        .collapsible(false)
        .resizable(false)
        .show(ctx, |ui| {
            ui.label(WHY);
            let field = ui
                .horizontal(|ui| {
                    let label = ui.label("Path");
                    ui.add(egui::TextEdit::singleline(&mut prompt.text).desired_width(420.0))
                        .labelled_by(label.id)
                })
                .inner;
            let entered = field.lost_focus() && ui.input(|i| i.key_pressed(egui::Key::Enter));
            let typed = Path::new(prompt.text.trim());
            if prompt.saves && !prompt.text.trim().is_empty() && typed.symlink_metadata().is_ok() {
                ui.colored_label(
                    ui.visuals().warn_fg_color,
                    "A file of this name exists: OK replaces it.",
                );
            }
            ui.horizontal(|ui| {
                let usable = !prompt.text.trim().is_empty();
                if (ui.add_enabled(usable, egui::Button::new("OK")).clicked() || entered) && usable
                {
                    answer = Some((prompt.answer)(PathBuf::from(prompt.text.trim())));
                    open = false;
                }
                if ui.button("Cancel").clicked() {
                    open = false;
                }
            });
        });
    (answer, open)
}
