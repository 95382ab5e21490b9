//! The eframe desktop shell (DESIGN §2): menu bar, Structure panel, Diagram panel,
//! Inspector, status bar. It renders results of `Analysis::run` and computes no chemistry.

mod analysis_notes;
mod bond_sticks;
mod builder;
mod diagram_view;
mod export_window;
mod frame_timer;
mod guard;
mod history;
mod inspector;
mod lewis_section;
mod menus;
mod molecule_panel;
mod orbital_map_view;
mod parameter_editor;
mod path_prompt;
mod recovery;
mod scan_job;
mod screenshot;
mod series_view;
mod series_window;
mod settings_window;
mod state;
mod structure_view;
mod switch_section;
mod theme;
mod transition;
mod walsh_plot;
mod walsh_view;
mod worker;

#[cfg(test)]
mod series_tests;
#[cfg(test)]
mod tests;
#[cfg(test)]
mod window_tests;

use std::path::PathBuf;

use diptych::chem::molecule::MAX_NAME_CHARACTERS;
use diptych::project::Opened;
use eframe::egui;

use menus::Dialogs;
pub use screenshot::ScreenshotTarget;
use screenshot::ScreenshotTask;
use state::AppState;

/// The running application.
pub struct DiptychApp {
    state: AppState,
    dialogs: Dialogs,
    screenshot: Option<ScreenshotTask>,
    /// The Series window (issue 20), off until opened.
    series: series_window::SeriesWindow,
    last_title: String,
    /// Whether the fallback font has been given to the drawing context.
    fonts_installed: bool,
}

impl DiptychApp {
    pub fn new(
        context: egui::Context,
        opened: Option<(Opened, PathBuf)>,
        screenshot: Option<ScreenshotTarget>,
    ) -> Self {
        DiptychApp {
            state: AppState::new(context, opened),
            dialogs: Dialogs::default(),
            screenshot: screenshot.map(ScreenshotTask::new),
            series: series_window::SeriesWindow::default(),
            last_title: String::new(),
            fonts_installed: false,
        }
    }

    /// Whether the analysis of the current document is on screen (tests, benchmarks).
    pub fn is_analysed(&self) -> bool {
        self.state.analysis.is_some() && !self.state.is_computing()
    }

    /// Draws one frame into `ui` (the whole window).
    pub fn frame_ui(&mut self, ui: &mut egui::Ui) {
        let started = std::time::Instant::now();
        self.panels_ui(ui);
        self.state.frame_timer.record(started.elapsed());
        self.state.frame_timer.show(ui.ctx());
    }

    /// The panels, dialogs and bookkeeping of one frame.
    fn panels_ui(&mut self, ui: &mut egui::Ui) {
        if !self.fonts_installed {
            // On the context that really draws (the window's, or a test harness's).
            theme::install_fonts(ui.ctx());
            self.fonts_installed = true;
        }
        self.state.receive_results(ui.input(|input| input.time));
        self.dialogs.apply(&mut self.state);
        // Every edit of this frame is compared against this copy (undo, recompute).
        let before = self.state.project.clone();
        menus::handle_shortcuts(ui, &mut self.state, &self.dialogs);
        let visuals = if self.state.project.view.dark_theme {
            egui::Visuals::dark()
        } else {
            egui::Visuals::light()
        };
        ui.ctx().set_visuals(visuals);

        egui::Panel::top("menu").show(ui, |ui| {
            menus::menu_bar(ui, &mut self.state, &self.dialogs);
        });
        egui::Panel::bottom("status").show(ui, |ui| {
            ui.horizontal(|ui| {
                if self.state.is_computing() {
                    ui.spinner();
                }
                if let Some(error) = &self.state.analysis_error {
                    ui.colored_label(
                        ui.visuals().error_fg_color,
                        format!("Analysis failed: {error} (showing the last good result)"),
                    );
                } else {
                    ui.label(&self.state.status);
                    let summary = self
                        .state
                        .analysis
                        .as_deref()
                        .filter(|_| !self.state.is_computing())
                        .and_then(analysis_notes::status_summary);
                    if let Some(summary) = summary {
                        if !self.state.status.is_empty() {
                            ui.separator();
                        }
                        ui.label(summary);
                    }
                }
            });
        });
        egui::Panel::left("structure")
            .default_size(380.0)
            .resizable(true)
            .show(ui, |ui| self.structure_panel(ui));
        egui::Panel::right("inspector")
            .default_size(300.0)
            .resizable(true)
            .show(ui, |ui| {
                ui.heading("Inspector");
                egui::ScrollArea::vertical()
                    .show(ui, |ui| inspector::show(ui, &mut self.state, &self.dialogs));
            });
        egui::CentralPanel::default_margins().show(ui, |ui| self.diagram_panel(ui));
        let elements = parameter_editor::elements_of(&self.state.project.molecule);
        settings_window::show(
            ui.ctx(),
            &mut self.state.settings_open,
            &mut self.state.project.settings,
            &elements,
        );
        walsh_view::show(ui.ctx(), &mut self.state, &self.dialogs);
        self.series.show(ui.ctx());
        export_window::show(ui.ctx(), &mut self.state, &self.dialogs);
        self.dialogs.show_prompt(ui.ctx());
        self.error_dialog(ui);

        let now = ui.input(|input| input.time);
        self.state.after_frame(before, now);
        self.state.autosave(now);
        self.discard_dialog(ui);
        self.recovery_dialog(ui);

        let title = self.state.title();
        if title != self.last_title {
            ui.ctx()
                .send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.last_title = title;
        }
    }

    fn structure_panel(&mut self, ui: &mut egui::Ui) {
        ui.horizontal(|ui| {
            ui.heading("Structure");
            self.point_group_badge(ui);
            if ui
                .button("Walsh scan…")
                .on_hover_text("Follow the orbitals while one coordinate changes")
                .clicked()
            {
                self.state.walsh.open = true;
            }
            if ui
                .button("Series…")
                .on_hover_text("Compare the donor lone pairs of a series of molecules")
                .clicked()
            {
                self.series.open = true;
            }
        });
        builder::show(ui, &mut self.state);
        if ui.input(|input| input.key_pressed(egui::Key::Delete))
            && !ui.ctx().egui_wants_keyboard_input()
        {
            builder::delete_selected(&mut self.state);
        }
        let highlight = self.state.atom_weights_of_focused_level();
        let bonds = bond_sticks::BondDrawing::for_view(
            &self.state.project.molecule,
            self.state.analysis.as_deref(),
        );
        let events = structure_view::show(
            ui,
            &self.state.project.molecule,
            &bonds,
            &mut self.state.camera,
            self.state.selected_atom,
            &highlight,
        );
        if let Some((atom, shift)) = events.moved_atom
            && let Some(moved) = self.state.project.molecule.atoms.get_mut(atom)
        {
            moved.position += shift;
        }
        if let Some(atom) = events.clicked_atom {
            self.state.selected_atom = Some(atom);
        } else if events.clicked_background {
            self.state.selected_atom = None;
        }
    }

    /// Point group, tolerance and the Symmetrize action (the averaged geometry comes from
    /// the analysis; applying it is an ordinary, undoable edit).
    fn point_group_badge(&mut self, ui: &mut egui::Ui) {
        let Some(analysis) = &self.state.analysis else {
            return;
        };
        let group = analysis.symmetry.as_ref().map_or_else(
            || "point group unknown".to_string(),
            |found| found.group.to_string(),
        );
        ui.label(egui::RichText::new(group).strong().color(theme::ACCENT))
            .on_hover_text(format!(
                "Point group within {} Å (Settings, Method options)",
                self.state.project.settings.symmetry.tolerance
            ));
        if ui
            .add_enabled(self.state.can_symmetrize(), egui::Button::new("Symmetrize"))
            .on_hover_text(
                "Average the geometry over the point group so that it is exactly symmetric",
            )
            .clicked()
        {
            self.state.symmetrize();
        }
    }

    fn diagram_panel(&mut self, ui: &mut egui::Ui) {
        ui.horizontal_wrapped(|ui| {
            ui.heading("Diagram");
            ui.add_space(8.0);
            let titles = &mut self.state.project.titles;
            let left_label = ui.label("Left title");
            ui.add(
                egui::TextEdit::singleline(&mut titles.delocalized)
                    .desired_width(160.0)
                    .char_limit(MAX_NAME_CHARACTERS),
            )
            .labelled_by(left_label.id);
            let right_label = ui.label("Right title");
            ui.add(
                egui::TextEdit::singleline(&mut titles.localized)
                    .desired_width(160.0)
                    .char_limit(MAX_NAME_CHARACTERS),
            )
            .labelled_by(right_label.id);
        });
        ui.horizontal_wrapped(|ui| {
            let settings = &mut self.state.project.settings;
            // Nothing to hold (CO, N2 by default): the switch cannot be turned off, and
            // the hover says why; once off (from a project file) it can always go on.
            let disabled = self
                .state
                .analysis
                .as_ref()
                .and_then(|a| a.lone_pair_switch.as_ref())
                .and_then(|s| s.disabled.clone())
                .filter(|_| settings.lone_pair_mixing);
            let hover = disabled.clone().unwrap_or_else(|| {
                "On: the full solution. Off: the lone pairs chosen in the Inspector are held \
                 non-bonding (the first-order diagram). Dotted bars show where levels go when \
                 flipped."
                    .to_string()
            });
            ui.add_enabled(
                disabled.is_none(),
                egui::Checkbox::new(&mut settings.lone_pair_mixing, "Lone-pair mixing"),
            )
            .on_hover_text(&hover)
            .on_disabled_hover_text(&hover);
            ui.checkbox(&mut self.state.project.view.show_energies, "Energies");
            ui.add(
                egui::Slider::new(&mut self.state.project.view.link_threshold, 0.0..=0.5)
                    .text("hide lines below this weight"),
            );
            if ui
                .add_enabled(self.state.energy_window.is_some(), egui::Button::new("Fit"))
                .on_hover_text(
                    "Wheel zooms the energy axis, dragging pans it; Fit shows every occupied level",
                )
                .clicked()
            {
                self.state.energy_window = None;
                self.state.rebuild_diagram();
            }
        });
        analysis_notes::strip(
            ui,
            self.state.analysis.as_deref(),
            self.state.analysis_error.as_deref(),
        );
        let show_energies = self.state.project.view.show_energies;
        let now = ui.input(|input| input.time);
        if self
            .state
            .transition
            .as_ref()
            .is_some_and(|transition| transition.finished(now))
        {
            self.state.transition = None;
        }
        let Some(diagram) = &self.state.diagram else {
            ui.centered_and_justified(|ui| {
                ui.label(match &self.state.analysis_error {
                    Some(error) => format!("No diagram: {error}"),
                    None => "Computing…".to_string(),
                })
            });
            return;
        };
        let gliding = self
            .state
            .transition
            .as_ref()
            .map(|transition| transition.frame(diagram, now));
        if gliding.is_some() {
            ui.ctx().request_repaint();
        }
        let shown = gliding.as_ref().unwrap_or(diagram);
        let events = diagram_view::show(ui, shown, self.state.selected_level, show_energies);
        self.state.hovered_level = events.hovered;
        if let Some(window) = events.new_window {
            self.state.energy_window = Some(window);
            self.state.rebuild_diagram();
        }
        if let Some(level) = events.clicked {
            self.state.selected_level = Some(level);
        } else if events.clicked_background {
            self.state.selected_level = None;
        }
    }

    /// Asks before an action throws away unsaved changes; also catches the window's close.
    fn discard_dialog(&mut self, ui: &egui::Ui) {
        let close_requested = ui.input(|input| input.viewport().close_requested());
        if close_requested
            && self.state.dirty
            && self.state.pending_discard != Some(state::Discard::Quit)
        {
            ui.ctx()
                .send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.state.pending_discard = Some(state::Discard::Quit);
        } else if close_requested
            && !self.state.dirty
            && let Some(path) = &self.state.recovery_path
        {
            recovery::remove(path);
        }
        let Some(action) = self.state.pending_discard.clone() else {
            return;
        };
        let modal = egui::Modal::new(egui::Id::unique("discard dialog")).show(ui.ctx(), |ui| {
            ui.heading("Unsaved changes");
            ui.label("The document has changes that are not saved. Discard them?");
            ui.horizontal(|ui| {
                if ui.button("Discard changes").clicked() {
                    return Some(true);
                }
                if ui.button("Keep editing").clicked() {
                    return Some(false);
                }
                None
            })
            .inner
        });
        match modal.inner {
            Some(true) => {
                self.state.pending_discard = None;
                self.state.dirty = false;
                match action {
                    state::Discard::Open(path) => self.state.open(path),
                    state::Discard::New => self.state.new_document(),
                    state::Discard::Quit => {
                        if let Some(path) = &self.state.recovery_path {
                            recovery::remove(path);
                        }
                        ui.ctx().send_viewport_cmd(egui::ViewportCommand::Close);
                    }
                }
            }
            Some(false) => self.state.pending_discard = None,
            None if modal.should_close() => self.state.pending_discard = None,
            None => {}
        }
    }

    /// Offers the project left in the recovery file by a session that ended unsaved.
    fn recovery_dialog(&mut self, ui: &egui::Ui) {
        let Some(offer) = self.state.recovery_offer.clone() else {
            return;
        };
        let modal = egui::Modal::new(egui::Id::unique("recovery dialog")).show(ui.ctx(), |ui| {
            ui.heading("Restore unsaved work?");
            ui.label(format!(
                "Diptych found unsaved work on {} from an earlier session.",
                offer.molecule.name
            ));
            ui.horizontal(|ui| {
                if ui.button("Restore").clicked() {
                    return Some(true);
                }
                if ui.button("Discard it").clicked() {
                    return Some(false);
                }
                None
            })
            .inner
        });
        match modal.inner {
            Some(true) => {
                self.state.recovery_offer = None;
                self.state.replace_document(offer, None);
                self.state.dirty = true;
            }
            Some(false) => {
                self.state.recovery_offer = None;
                if let Some(path) = &self.state.recovery_path {
                    recovery::remove(path);
                }
            }
            None => {}
        }
    }

    fn error_dialog(&mut self, ui: &egui::Ui) {
        let Some(message) = self.state.error_dialog.clone() else {
            return;
        };
        let modal = egui::Modal::new(egui::Id::unique("error dialog")).show(ui.ctx(), |ui| {
            ui.set_max_width(420.0);
            ui.heading("Problem");
            ui.label(message);
            ui.add_space(8.0);
            ui.button("OK").clicked()
        });
        if modal.inner || modal.should_close() {
            self.state.error_dialog = None;
        }
    }
}

/// Key of the recent-files list in eframe's storage.
const RECENT_FILES_KEY: &str = "diptych.recent_files";

impl eframe::App for DiptychApp {
    fn save(&mut self, storage: &mut dyn eframe::Storage) {
        eframe::set_value(storage, RECENT_FILES_KEY, &self.state.recent_files);
    }

    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.frame_ui(ui);
        let analysed = self.is_analysed() && self.series.is_ready();
        if let Some(task) = &mut self.screenshot {
            task.step(ui.ctx(), analysed);
        }
    }
}

/// Opens the main window; with `screenshot`, saves a PNG of it and closes.
/// `series` opens a series document in the Series window.
pub fn run(
    opened: Option<(Opened, PathBuf)>,
    screenshot: Option<ScreenshotTarget>,
    series: Option<PathBuf>,
) -> Result<(), String> {
    let result_slot = screenshot
        .as_ref()
        .map(|_| screenshot::ResultSlot::default());
    let mut last_error = String::new();
    // wgpu finds Mesa's software adapter on machines without a GPU; the glow (OpenGL)
    // backend is the fallback when wgpu cannot start at all.
    for renderer in [eframe::Renderer::Wgpu, eframe::Renderer::Glow] {
        let options = eframe::NativeOptions {
            renderer,
            // Window size and panel widths persist between real sessions; a screenshot
            // starts from the defaults and leaves nothing behind.
            persist_window: screenshot.is_none(),
            persistence_path: screenshot.as_ref().map(|_| {
                std::env::temp_dir().join(format!("diptych-screenshot-{}.ron", std::process::id()))
            }),
            viewport: egui::ViewportBuilder::default()
                .with_title("Diptych")
                .with_inner_size([1400.0, 900.0]),
            ..Default::default()
        };
        let opened = opened.clone();
        let screenshot = screenshot.clone();
        let series = series.clone();
        let slot = result_slot.clone();
        let outcome = eframe::run_native(
            "Diptych",
            options,
            Box::new(move |creation| {
                let interactive = screenshot.is_none();
                let fresh_start = opened.is_none();
                let mut app = DiptychApp::new(creation.egui_ctx.clone(), opened, screenshot);
                if let Some(path) = &series {
                    app.series.open_path(&creation.egui_ctx, path);
                }
                if interactive {
                    // Autosave and the recovery offer belong to real sessions, not to
                    // screenshots.
                    app.state.recovery_path = recovery::default_path();
                    if let Some(storage) = creation.storage {
                        app.state.recent_files =
                            eframe::get_value(storage, RECENT_FILES_KEY).unwrap_or_default();
                    }
                    // A file named on the command line counts as opened.
                    if let Some(path) = app.state.path.clone() {
                        app.state.remember_recent(&path);
                    }
                    if fresh_start {
                        app.state.recovery_offer =
                            app.state.recovery_path.as_deref().and_then(recovery::read);
                    }
                }
                if let (Some(task), Some(slot)) = (&mut app.screenshot, slot) {
                    task.report_to(slot);
                }
                Ok(Box::new(app))
            }),
        );
        match outcome {
            Ok(()) => {
                return match &result_slot {
                    Some(slot) => slot.result(),
                    None => Ok(()),
                };
            }
            Err(error) => last_error = format!("cannot open the window: {error}"),
        }
    }
    Err(last_error)
}
