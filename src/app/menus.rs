//! The menu bar and the file dialogs. Dialogs run on their own thread (rfd's portal
//! dialogs block), and their answer comes back through a channel polled every frame.
//! Where no system dialog can appear, an in-app path field asks instead (`path_prompt`).

use std::cell::RefCell;
use std::path::PathBuf;
use std::sync::mpsc::{Receiver, Sender, channel};

use eframe::egui;

use super::path_prompt::{self, PathPrompt};
use super::state::AppState;

/// What a finished dialog asks for.
pub enum DialogAnswer {
    Open(PathBuf),
    SaveAs(PathBuf),
    ExportDiagram(PathBuf),
    ExportReport(PathBuf),
    ExportMap(PathBuf),
    ExportWalshSvg(PathBuf),
    ExportWalshCsv(PathBuf),
}

/// Open dialogs in flight.
pub struct Dialogs {
    sender: Sender<DialogAnswer>,
    receiver: Receiver<DialogAnswer>,
    /// False where no system file dialog can appear: the path is typed in the window.
    system_dialog: bool,
    prompt: RefCell<Option<PathPrompt>>,
}

impl Default for Dialogs {
    fn default() -> Self {
        Dialogs::with_system_dialog(path_prompt::system_dialog_available())
    }
}

impl Dialogs {
    pub fn with_system_dialog(system_dialog: bool) -> Dialogs {
        let (sender, receiver) = channel();
        Dialogs {
            sender,
            receiver,
            system_dialog,
            prompt: RefCell::new(None),
        }
    }

    /// Without a system dialog, asks in the window instead; true when it did.
    fn prompted(&self, prompt: PathPrompt) -> bool {
        if self.system_dialog {
            return false;
        }
        *self.prompt.borrow_mut() = Some(prompt);
        true
    }

    /// The in-app question for a file to save (see `prompted`).
    fn save_prompt(
        title: &'static str,
        text: String,
        answer: fn(PathBuf) -> DialogAnswer,
    ) -> PathPrompt {
        PathPrompt {
            title,
            text,
            answer,
            saves: true,
        }
    }

    /// Draws the in-app path field, if one is asked for, and passes its answer on.
    pub fn show_prompt(&self, ctx: &egui::Context) {
        let mut slot = self.prompt.borrow_mut();
        let Some(prompt) = slot.as_mut() else {
            return;
        };
        let (answer, open) = path_prompt::show(ctx, prompt);
        if let Some(answer) = answer {
            let _ = self.sender.send(answer);
        }
        if !open {
            *slot = None;
        }
    }

    pub fn ask_open(&self) {
        let prompt = PathPrompt {
            title: "Open a molecule or project",
            text: String::new(),
            answer: DialogAnswer::Open,
            saves: false,
        };
        if self.prompted(prompt) {
            return;
        }
        let sender = self.sender.clone();
        std::thread::spawn(move || {
            let picked = rfd::FileDialog::new()
                .set_title("Open a molecule or project")
                .add_filter("Molecules and projects", &["xyz", "mol", "sdf", "ron"])
                .add_filter("All files", &["*"])
                .pick_file();
            if let Some(path) = picked {
                let _ = sender.send(DialogAnswer::Open(path));
            }
        });
    }

    pub fn ask_save_as(&self, suggested: String) {
        let file_name = format!("{suggested}.diptych.ron");
        if self.prompted(Self::save_prompt(
            "Save the project",
            file_name,
            DialogAnswer::SaveAs,
        )) {
            return;
        }
        let sender = self.sender.clone();
        std::thread::spawn(move || {
            let picked = rfd::FileDialog::new()
                .set_title("Save the project")
                .set_file_name(format!("{suggested}.diptych.ron"))
                .add_filter("Diptych project", &["ron"])
                .save_file();
            if let Some(path) = picked {
                let _ = sender.send(DialogAnswer::SaveAs(path));
            }
        });
    }

    /// `extension` is "svg" or "png" (the format chosen in the export window).
    pub fn ask_export_diagram(&self, suggested: String, extension: &'static str) {
        let filter: (&'static str, &'static [&'static str]) = if extension == "png" {
            ("PNG image", &["png"])
        } else {
            ("SVG image", &["svg"])
        };
        self.ask_save(
            "Export the diagram",
            format!("{suggested}.{extension}"),
            filter,
            DialogAnswer::ExportDiagram,
        );
    }

    pub fn ask_export_report(&self, suggested: String) {
        let file_name = format!("{suggested}-report.md");
        if self.prompted(Self::save_prompt(
            "Export the report",
            file_name,
            DialogAnswer::ExportReport,
        )) {
            return;
        }
        let sender = self.sender.clone();
        std::thread::spawn(move || {
            let picked = rfd::FileDialog::new()
                .set_title("Export the report")
                .set_file_name(format!("{suggested}-report.md"))
                .add_filter("Markdown tables", &["md"])
                .add_filter("CSV table", &["csv"])
                .add_filter("JSON", &["json"])
                .add_filter("Plain text", &["txt"])
                .save_file();
            if let Some(path) = picked {
                let _ = sender.send(DialogAnswer::ExportReport(path));
            }
        });
    }

    pub fn ask_export_map(&self, suggested: String) {
        self.ask_save(
            "Export the orbital map as SVG",
            format!("{suggested}-map.svg"),
            ("SVG image", &["svg"]),
            DialogAnswer::ExportMap,
        );
    }

    pub fn ask_export_walsh_svg(&self, suggested: String) {
        self.ask_save(
            "Export the Walsh diagram as SVG",
            format!("{suggested}-walsh.svg"),
            ("SVG image", &["svg"]),
            DialogAnswer::ExportWalshSvg,
        );
    }

    pub fn ask_export_walsh_csv(&self, suggested: String) {
        self.ask_save(
            "Export the Walsh scan as CSV",
            format!("{suggested}-walsh.csv"),
            ("CSV table", &["csv"]),
            DialogAnswer::ExportWalshCsv,
        );
    }

    /// A save dialog on its own thread; `answer` wraps the chosen path.
    fn ask_save(
        &self,
        title: &'static str,
        file_name: String,
        filter: (&'static str, &'static [&'static str]),
        answer: fn(PathBuf) -> DialogAnswer,
    ) {
        if self.prompted(Self::save_prompt(title, file_name.clone(), answer)) {
            return;
        }
        let sender = self.sender.clone();
        std::thread::spawn(move || {
            let picked = rfd::FileDialog::new()
                .set_title(title)
                .set_file_name(file_name)
                .add_filter(filter.0, filter.1)
                .save_file();
            if let Some(path) = picked {
                let _ = sender.send(answer(path));
            }
        });
    }

    /// Applies the answers that arrived.
    pub fn apply(&self, state: &mut AppState) {
        for answer in self.receiver.try_iter() {
            match answer {
                DialogAnswer::Open(path) => state.request_open(path),
                DialogAnswer::SaveAs(path) => state.save_to(path),
                DialogAnswer::ExportDiagram(path) => state.export_diagram(path),
                DialogAnswer::ExportReport(path) => state.export_report(path),
                DialogAnswer::ExportMap(path) => state.export_map(path),
                DialogAnswer::ExportWalshSvg(path) => state.export_walsh_svg(path),
                DialogAnswer::ExportWalshCsv(path) => state.export_walsh_csv(path),
            }
        }
    }
}

/// Saves to the known project path, or asks for one.
pub fn save(state: &mut AppState, dialogs: &Dialogs) {
    match state.project_path() {
        Some(path) => state.save_to(path),
        None => dialogs.ask_save_as(state.project.molecule.name.clone()),
    }
}

/// Handles Ctrl+N, Ctrl+O, Ctrl+S, Ctrl+Shift+S, Ctrl+E, undo and redo, and Escape.
pub fn handle_shortcuts(ui: &egui::Ui, state: &mut AppState, dialogs: &Dialogs) {
    use egui::{Key, KeyboardShortcut, Modifiers};
    let new = KeyboardShortcut::new(Modifiers::COMMAND, Key::N);
    if ui.input_mut(|input| input.consume_shortcut(&new)) {
        state.new_document();
    }
    if ui.input_mut(|input| input.consume_key(Modifiers::NONE, Key::Escape)) {
        close_topmost_window(state);
    }
    let save_as = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::S);
    let save_shortcut = KeyboardShortcut::new(Modifiers::COMMAND, Key::S);
    let open = KeyboardShortcut::new(Modifiers::COMMAND, Key::O);
    let export = KeyboardShortcut::new(Modifiers::COMMAND, Key::E);
    if ui.input_mut(|input| input.consume_shortcut(&export)) {
        state.export.open = true;
    }
    // The longer shortcut is consumed first so that Ctrl+Shift+S is not read as Ctrl+S.
    if ui.input_mut(|input| input.consume_shortcut(&save_as)) {
        dialogs.ask_save_as(state.project.molecule.name.clone());
    } else if ui.input_mut(|input| input.consume_shortcut(&save_shortcut)) {
        save(state, dialogs);
    }
    if ui.input_mut(|input| input.consume_shortcut(&open)) {
        dialogs.ask_open();
    }
    let redo_shift = KeyboardShortcut::new(Modifiers::COMMAND | Modifiers::SHIFT, Key::Z);
    let redo_y = KeyboardShortcut::new(Modifiers::COMMAND, Key::Y);
    let undo = KeyboardShortcut::new(Modifiers::COMMAND, Key::Z);
    if ui.input_mut(|input| input.consume_shortcut(&redo_shift) || input.consume_shortcut(&redo_y))
    {
        state.redo();
    } else if ui.input_mut(|input| input.consume_shortcut(&undo)) {
        state.undo();
    }
}

/// Escape closes one window: the error message first, then the export, settings and
/// Walsh scan windows, in that order (the question about unsaved changes has its own
/// Cancel and is left alone).
fn close_topmost_window(state: &mut AppState) {
    if state.error_dialog.take().is_some() {
        return;
    }
    for open in [
        &mut state.export.open,
        &mut state.settings_open,
        &mut state.walsh.open,
    ] {
        if std::mem::take(open) {
            return;
        }
    }
}

/// File and View menus.
pub fn menu_bar(ui: &mut egui::Ui, state: &mut AppState, dialogs: &Dialogs) {
    egui::MenuBar::new().ui(ui, |ui| {
        ui.menu_button("File", |ui| {
            if ui.button("New  (Ctrl+N)").clicked() {
                state.new_document();
                ui.close();
            }
            if ui.button("Open…  (Ctrl+O)").clicked() {
                dialogs.ask_open();
                ui.close();
            }
            ui.add_enabled_ui(!state.recent_files.is_empty(), |ui| {
                ui.menu_button("Open recent", |ui| {
                    let mut chosen = None;
                    for path in &state.recent_files {
                        let name = path.file_name().map_or_else(
                            || path.display().to_string(),
                            |n| n.to_string_lossy().into_owned(),
                        );
                        if ui
                            .button(name)
                            .on_hover_text(path.display().to_string())
                            .clicked()
                        {
                            chosen = Some(path.clone());
                        }
                    }
                    if let Some(path) = chosen {
                        state.request_open(path);
                        ui.close();
                    }
                });
            });
            if ui.button("Save project  (Ctrl+S)").clicked() {
                save(state, dialogs);
                ui.close();
            }
            if ui.button("Save project as…  (Ctrl+Shift+S)").clicked() {
                dialogs.ask_save_as(state.project.molecule.name.clone());
                ui.close();
            }
            ui.separator();
            if ui
                .add_enabled(
                    state.diagram.is_some(),
                    egui::Button::new("Export diagram…  (Ctrl+E)"),
                )
                .clicked()
            {
                state.export.open = true;
                ui.close();
            }
            if ui
                .add_enabled(
                    state.analysis.is_some(),
                    egui::Button::new("Export report…"),
                )
                .clicked()
            {
                dialogs.ask_export_report(state.project.molecule.name.clone());
                ui.close();
            }
            if ui
                .add_enabled(
                    state.current_map().is_some(),
                    egui::Button::new("Export orbital map as SVG…"),
                )
                .clicked()
            {
                dialogs.ask_export_map(state.project.molecule.name.clone());
                ui.close();
            }
            let scanned = state.walsh.scan.is_some();
            if ui
                .add_enabled(scanned, egui::Button::new("Export Walsh diagram as SVG…"))
                .clicked()
            {
                dialogs.ask_export_walsh_svg(state.project.molecule.name.clone());
                ui.close();
            }
            if ui
                .add_enabled(scanned, egui::Button::new("Export Walsh scan as CSV…"))
                .clicked()
            {
                dialogs.ask_export_walsh_csv(state.project.molecule.name.clone());
                ui.close();
            }
        });
        ui.menu_button("Edit", |ui| {
            if ui
                .add_enabled(
                    state.history.can_undo(),
                    egui::Button::new("Undo  (Ctrl+Z)"),
                )
                .clicked()
            {
                state.undo();
                ui.close();
            }
            if ui
                .add_enabled(
                    state.history.can_redo(),
                    egui::Button::new("Redo  (Ctrl+Shift+Z)"),
                )
                .clicked()
            {
                state.redo();
                ui.close();
            }
            ui.separator();
            if ui
                .add_enabled(
                    state.can_symmetrize(),
                    egui::Button::new("Symmetrize geometry"),
                )
                .clicked()
            {
                state.symmetrize();
                ui.close();
            }
        });
        ui.menu_button("Settings", |ui| {
            if ui.button("Method options…").clicked() {
                state.settings_open = true;
                ui.close();
            }
        });
        ui.menu_button("View", |ui| {
            ui.checkbox(&mut state.camera.show_labels, "Atom labels");
            // The theme is a preference, not an edit: it marks nothing unsaved.
            ui.checkbox(&mut state.project.view.dark_theme, "Dark theme");
            ui.checkbox(&mut state.walsh.open, "Walsh scan window");
            ui.checkbox(&mut state.frame_timer.visible, "Frame time (debug)");
            if ui.button("Reset view").clicked() {
                state.camera = super::structure_view::Camera::facing(&state.project.molecule);
                ui.close();
            }
        });
    });
}
