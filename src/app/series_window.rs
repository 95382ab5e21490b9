//! The Series window: a series document (`*.diptych-series.ron`) opened, analysed off the
//! UI thread by the library's `series::compare` (so the window and `diptych compare` give
//! the same numbers), shown as a sortable table and two plots (`series_view.rs`); saved
//! and reopened like a project. File dialogs run on their own thread.

use std::path::{Path, PathBuf};
use std::sync::mpsc::{Receiver, Sender, TryRecvError, channel};

use diptych::series::project::{SERIES_EXTENSION, SeriesProject};
use diptych::series::{self, DonorChoice, Series};
use eframe::egui;

use super::series_view;

/// What a file dialog answered.
enum Picked {
    Open(PathBuf),
    SaveAs(PathBuf),
}

/// The window's state; off until a series is opened or the button is pressed.
pub struct SeriesWindow {
    pub open: bool,
    pub(super) document: Option<(PathBuf, SeriesProject)>,
    /// The document differs from its file (a donor was chosen in the table).
    modified: bool,
    job: Option<Receiver<Result<Series, String>>>,
    pub(super) series: Option<Series>,
    pub(super) sort: Option<(usize, bool)>,
    message: Option<String>,
    picked_sender: Sender<Picked>,
    picked: Receiver<Picked>,
}

impl Default for SeriesWindow {
    fn default() -> Self {
        let (picked_sender, picked) = channel();
        SeriesWindow {
            open: false,
            document: None,
            modified: false,
            job: None,
            series: None,
            sort: None,
            message: None,
            picked_sender,
            picked,
        }
    }
}

impl SeriesWindow {
    /// Whether nothing is being computed (screenshots wait for this).
    pub fn is_ready(&self) -> bool {
        self.job.is_none()
    }

    /// Reads a series document and starts its analysis; errors are shown in the window.
    pub fn open_path(&mut self, context: &egui::Context, path: &Path) {
        self.open = true;
        match SeriesProject::load(path) {
            Ok(document) => {
                let folder = path.parent().map(Path::to_path_buf).unwrap_or_default();
                self.start(context, &document, folder);
                self.document = Some((path.to_path_buf(), document));
                self.modified = false;
            }
            Err(error) => self.message = Some(format!("{}: {error}", path.display())),
        }
    }

    /// Analyses the document's members on a thread of their own.
    fn start(&mut self, context: &egui::Context, document: &SeriesProject, folder: PathBuf) {
        let (sender, receiver) = channel();
        let document = document.clone();
        let context = context.clone();
        let spawned = std::thread::Builder::new()
            .name("series".into())
            .spawn(move || {
                let result = document
                    .inputs(&folder)
                    .map_err(|e| e.to_string())
                    .and_then(|inputs| series::compare(&inputs).map_err(|e| e.to_string()));
                let _ = sender.send(result);
                context.request_repaint();
            });
        match spawned {
            Ok(_) => {
                self.job = Some(receiver);
                self.message = None;
            }
            Err(error) => self.message = Some(format!("cannot start the series thread: {error}")),
        }
    }

    /// Takes a finished result and a dialog's answer.
    fn poll(&mut self, context: &egui::Context) {
        if let Some(job) = &self.job {
            match job.try_recv() {
                Ok(Ok(series)) => {
                    self.series = Some(series);
                    self.job = None;
                }
                Ok(Err(message)) => {
                    self.message = Some(message);
                    self.job = None;
                }
                Err(TryRecvError::Empty) => {}
                Err(TryRecvError::Disconnected) => {
                    self.message = Some("the series thread stopped".into());
                    self.job = None;
                }
            }
        }
        while let Ok(picked) = self.picked.try_recv() {
            match picked {
                Picked::Open(path) => self.open_path(context, &path),
                Picked::SaveAs(path) => self.save(&path),
            }
        }
    }

    /// A donor chosen in the table: the document changes and the series is analysed
    /// again; the table on screen stays until the new one arrives.
    pub(super) fn choose_donor(
        &mut self,
        context: &egui::Context,
        member: usize,
        choice: DonorChoice,
    ) {
        let Some((path, document)) = &mut self.document else {
            return;
        };
        let Some(entry) = document.members.get_mut(member) else {
            return;
        };
        entry.donor = choice;
        self.modified = true;
        let folder = path.parent().map(Path::to_path_buf).unwrap_or_default();
        let document = document.clone();
        self.start(context, &document, folder);
    }

    fn save(&mut self, path: &Path) {
        let Some((_, document)) = &self.document else {
            return;
        };
        self.message = Some(match document.save(path) {
            Ok(()) => {
                self.modified = false;
                format!("saved {}", path.display())
            }
            Err(error) => error.to_string(),
        });
    }

    fn ask(&self, save: bool) {
        let sender = self.picked_sender.clone();
        std::thread::spawn(move || {
            let dialog = rfd::FileDialog::new()
                .set_title(if save {
                    "Save the series"
                } else {
                    "Open a series"
                })
                .add_filter("Diptych series", &["ron"]);
            let picked = if save {
                dialog
                    .set_file_name(format!("series{SERIES_EXTENSION}"))
                    .save_file()
                    .map(Picked::SaveAs)
            } else {
                dialog.pick_file().map(Picked::Open)
            };
            if let Some(answer) = picked {
                let _ = sender.send(answer);
            }
        });
    }

    /// The window, when open.
    pub fn show(&mut self, context: &egui::Context) {
        self.poll(context);
        let mut open = self.open;
        egui::Window::new("Series")
            .open(&mut open)
            .default_size([1150.0, 720.0])
            .show(context, |ui| self.contents(ui));
        self.open = open;
    }

    fn contents(&mut self, ui: &mut egui::Ui) {
        ui.horizontal(|ui| {
            if ui.button("Open series…").clicked() {
                self.ask(false);
            }
            let can_save = self.document.is_some();
            if ui
                .add_enabled(can_save, egui::Button::new("Save series as…"))
                .clicked()
            {
                self.ask(true);
            }
            if let Some((path, document)) = &self.document {
                ui.separator();
                let title = if document.title.is_empty() {
                    path.display().to_string()
                } else {
                    document.title.clone()
                };
                ui.label(if self.modified {
                    format!("{title} (changed, not saved)")
                } else {
                    title
                });
            }
            if self.job.is_some() {
                ui.spinner();
            }
        });
        if let Some(message) = &self.message {
            ui.label(message);
        }
        if let Some(series) = &self.series {
            let mut sort = self.sort;
            let choices: Option<Vec<DonorChoice>> = self
                .document
                .as_ref()
                .filter(|(_, d)| d.members.len() == series.rows.len())
                .map(|(_, d)| d.members.iter().map(|m| m.donor.clone()).collect());
            let change = series_view::show(ui, series, &mut sort, choices.as_deref());
            self.sort = sort;
            if let Some((member, choice)) = change {
                self.choose_donor(ui.ctx(), member, choice);
            }
        } else if self.document.is_none() {
            ui.label("Open a series document (*.diptych-series.ron) to compare its molecules.");
        }
    }
}
