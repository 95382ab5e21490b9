//! The eframe desktop shell (DESIGN §2): menu bar, Structure panel with the molecule's
//! details, status bar. It renders results of `Analysis::run` and computes no chemistry.

mod menus;
mod molecule_panel;
mod screenshot;
mod state;
mod structure_view;
mod theme;
mod worker;

use std::path::PathBuf;

use diptych::project::Opened;
use eframe::egui;

use menus::Dialogs;
use screenshot::ScreenshotTask;
use state::AppState;

/// The running application.
pub struct DiptychApp {
    state: AppState,
    dialogs: Dialogs,
    screenshot: Option<ScreenshotTask>,
    last_title: String,
}

impl DiptychApp {
    pub fn new(
        context: egui::Context,
        opened: Option<(Opened, PathBuf)>,
        screenshot: Option<PathBuf>,
    ) -> Self {
        DiptychApp {
            state: AppState::new(context, opened),
            dialogs: Dialogs::default(),
            screenshot: screenshot.map(ScreenshotTask::new),
            last_title: String::new(),
        }
    }

    /// Draws one frame into `ui` (the whole window).
    fn frame_ui(&mut self, ui: &mut egui::Ui) {
        self.state.receive_results();
        self.dialogs.apply(&mut self.state);
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
                }
            });
        });
        egui::Panel::right("molecule")
            .default_size(300.0)
            .resizable(true)
            .show(ui, |ui| {
                egui::ScrollArea::vertical().show(ui, |ui| molecule_panel::show(ui, &self.state));
            });
        egui::CentralPanel::default_margins().show(ui, |ui| {
            ui.heading("Structure");
            let events = structure_view::show(
                ui,
                &self.state.project.molecule,
                &mut self.state.camera,
                self.state.selected_atom,
            );
            if let Some(atom) = events.clicked_atom {
                self.state.selected_atom = Some(atom);
            } else if events.clicked_background {
                self.state.selected_atom = None;
            }
        });
        self.error_dialog(ui);

        let title = self.state.title();
        if title != self.last_title {
            ui.ctx()
                .send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.last_title = title;
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

impl eframe::App for DiptychApp {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        self.frame_ui(ui);
        if let Some(task) = &mut self.screenshot {
            task.step(ui.ctx(), self.state.analysis.is_some());
        }
    }
}

/// Opens the main window; with `screenshot`, saves a PNG of it and closes.
pub fn run(opened: Option<(Opened, PathBuf)>, screenshot: Option<PathBuf>) -> Result<(), String> {
    let result_slot = screenshot
        .as_ref()
        .map(|_| screenshot::ResultSlot::default());
    let mut last_error = String::new();
    // wgpu finds Mesa's software adapter on machines without a GPU; the glow (OpenGL)
    // backend is the fallback when wgpu cannot start at all.
    for renderer in [eframe::Renderer::Wgpu, eframe::Renderer::Glow] {
        let options = eframe::NativeOptions {
            renderer,
            viewport: egui::ViewportBuilder::default()
                .with_title("Diptych")
                .with_inner_size([1400.0, 900.0]),
            ..Default::default()
        };
        let opened = opened.clone();
        let screenshot = screenshot.clone();
        let slot = result_slot.clone();
        let outcome = eframe::run_native(
            "Diptych",
            options,
            Box::new(move |creation| {
                let mut app = DiptychApp::new(creation.egui_ctx.clone(), opened, screenshot);
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
