//! The GUI's state: the open document (a `Project`), where it lives on disk, whether it
//! has unsaved changes, the last good `Analysis` and the view state of the panels.

use std::path::PathBuf;
use std::sync::Arc;

use diptych::analysis::Analysis;
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::diagram::{Diagram, DiagramOptions, diagram_for};
use diptych::project::{Opened, Project, open_path};
use eframe::egui;

use super::builder::BuilderState;
use super::diagram_view::LevelRef;
use super::history::{Change, History, classify};
use super::structure_view::Camera;
use super::transition::Transition;
use super::worker::AnalysisWorker;

/// The demo molecule shown at start-up (DESIGN §7).
const DEFAULT_MOLECULE: &str = include_str!("../../demo_molecules/ammonia.xyz");

/// Length of File ▸ Open recent.
pub const MAX_RECENT: usize = 8;

/// What the user asked for that would discard unsaved changes.
#[derive(Clone, Debug, PartialEq)]
pub enum Discard {
    Open(PathBuf),
    New,
    Quit,
}

/// Everything the window shows.
pub struct AppState {
    pub project: Project,
    pub path: Option<PathBuf>,
    pub dirty: bool,
    /// The last successful analysis; kept on screen when a newer run fails.
    pub analysis: Option<Arc<Analysis>>,
    /// Generation of the document that `analysis` belongs to.
    analysed_generation: u64,
    pub analysis_error: Option<String>,
    generation: u64,
    worker: AnalysisWorker,
    pub selected_atom: Option<usize>,
    /// The level selected in the Diagram for the Inspector.
    pub selected_level: Option<LevelRef>,
    /// The level under the pointer in the Diagram (last frame).
    pub hovered_level: Option<LevelRef>,
    /// The diagram of `analysis` with the current titles and threshold.
    pub diagram: Option<Diagram>,
    /// The glide from the previous layout after the lone-pair switch flipped.
    pub transition: Option<Transition>,
    /// The zoomed energy window of the Diagram (view state); None fits the levels.
    pub energy_window: Option<(f64, f64)>,
    pub camera: Camera,
    pub history: History,
    pub builder: BuilderState,
    /// Autosave target; None disables autosave and recovery (tests, screenshots).
    pub recovery_path: Option<PathBuf>,
    /// A project found in the recovery file at start, offered for restoring.
    pub recovery_offer: Option<Project>,
    /// Time of the last autosave (or of the first unsaved change after it).
    last_autosave: Option<f64>,
    /// An action waiting for the user to confirm discarding unsaved changes.
    pub pending_discard: Option<Discard>,
    /// Whether the Settings window is shown.
    pub settings_open: bool,
    /// Set by undo/redo: this frame's change is a history step, not a new edit.
    skip_recording: bool,
    /// Recently opened or saved files, newest first (kept between sessions).
    pub recent_files: Vec<PathBuf>,
    /// The Inspector's orbital map (plane choice, cached map).
    pub map: super::orbital_map_view::MapPanel,
    /// The export window's options and preview.
    pub export: super::export_window::ExportPanel,
    /// Counts diagram rebuilds (the export preview redraws when it changes).
    pub diagram_revision: u64,
    /// The Walsh scan window: form, running scan, last result.
    pub walsh: super::walsh_view::WalshPanel,
    /// The debug overlay's frame-time counter (View menu).
    pub frame_timer: super::frame_timer::FrameTimer,
    /// One-line message for the status bar.
    pub status: String,
    /// An error to show in a dialog until dismissed.
    pub error_dialog: Option<String>,
}

/// The built-in ammonia molecule.
pub fn default_molecule() -> Molecule {
    // The embedded file is part of the program; if it were ever broken, a one-atom
    // placeholder keeps the window usable.
    parse_xyz(DEFAULT_MOLECULE, "ammonia")
        .map(|parsed| parsed.molecule)
        .unwrap_or_else(|_| {
            Molecule::new(
                "nitrogen",
                vec![diptych::chem::Atom::new(
                    diptych::chem::Element::N,
                    [0.0; 3],
                )],
                0,
            )
        })
}

impl AppState {
    pub fn new(context: egui::Context, opened: Option<(Opened, PathBuf)>) -> AppState {
        let (project, path, status) = match opened {
            Some((opened, path)) => {
                let status = opened.notices.join("; ");
                (opened.project, Some(path), status)
            }
            None => (Project::new(default_molecule()), None, String::new()),
        };
        let mut state = AppState {
            project,
            path,
            dirty: false,
            analysis: None,
            analysed_generation: 0,
            analysis_error: None,
            generation: 0,
            worker: AnalysisWorker::start(context),
            selected_atom: None,
            selected_level: None,
            hovered_level: None,
            diagram: None,
            transition: None,
            energy_window: None,
            camera: Camera::default(),
            history: History::default(),
            builder: BuilderState::default(),
            recovery_path: None,
            recovery_offer: None,
            last_autosave: None,
            pending_discard: None,
            settings_open: false,
            skip_recording: false,
            recent_files: Vec::new(),
            map: Default::default(),
            export: Default::default(),
            diagram_revision: 0,
            walsh: Default::default(),
            frame_timer: Default::default(),
            status,
            error_dialog: None,
        };
        state.camera = Camera::facing(&state.project.molecule);
        state.document_changed();
        state.dirty = false;
        state
    }

    /// Call after every change of the molecule or settings: schedules a new analysis.
    pub fn document_changed(&mut self) {
        self.generation += 1;
        self.dirty = true;
        self.worker.request(
            self.generation,
            &self.project.molecule,
            &self.project.settings,
        );
    }

    /// Whether an analysis of the current document is still running.
    pub fn is_computing(&self) -> bool {
        self.analysed_generation < self.generation && self.analysis_error.is_none()
    }

    /// Takes finished analyses from the worker (stale ones are dropped); `now` starts the
    /// glide of the levels when only the lone-pair switch differs from the shown result.
    pub fn receive_results(&mut self, now: f64) {
        for outcome in self.worker.poll() {
            if outcome.generation < self.analysed_generation {
                continue;
            }
            match outcome.result {
                Ok(analysis) => {
                    let switch_flipped = self.analysis.as_ref().is_some_and(|shown| {
                        shown.molecule == analysis.molecule
                            && shown.settings.lone_pair_mixing != analysis.settings.lone_pair_mixing
                    });
                    let previous = self.diagram.take();
                    self.analysis = Some(analysis);
                    self.analysis_error = None;
                    self.rebuild_diagram();
                    self.transition = previous
                        .filter(|_| switch_flipped)
                        .map(|from| Transition::new(from, now));
                }
                Err(message) => {
                    // Keep the last good analysis on screen; say why it is not current.
                    self.analysis_error = Some(message);
                }
            }
            self.analysed_generation = outcome.generation;
        }
    }

    /// Per-atom weights of the hovered (else selected) level, for the Structure panel:
    /// Mulliken atom shares of a canonical MO, equal shares over a localized orbital's
    /// atoms. Read from the analysis, not computed here.
    pub fn atom_weights_of_focused_level(&self) -> Vec<(usize, f64)> {
        let (Some(level), Some(analysis)) =
            (self.hovered_level.or(self.selected_level), &self.analysis)
        else {
            return Vec::new();
        };
        if level.ladder == 0 {
            let mut weights = analysis
                .orbitals
                .get(level.key)
                .map(|orbital| orbital.atom_shares())
                .unwrap_or_default();
            weights.retain(|(_, w)| *w > 0.05);
            weights
        } else {
            level
                .key
                .checked_sub(diptych::diagram::build::LOCALIZED_KEY_OFFSET)
                .and_then(|n| analysis.localized.get(n))
                .map(|orbital| {
                    let share = 1.0 / orbital.atoms.len().max(1) as f64;
                    orbital.atoms.iter().map(|&atom| (atom, share)).collect()
                })
                .unwrap_or_default()
        }
    }

    /// Call once per frame with the document as it was before the frame's UI ran: records
    /// an undo step and schedules the analysis or the layout as the change requires.
    pub fn after_frame(&mut self, before: Project, now: f64) {
        if std::mem::take(&mut self.skip_recording) {
            return;
        }
        let change = classify(&before, &self.project);
        if change == Change::None {
            return;
        }
        self.history.record(before, &self.project, now);
        self.apply_change(change);
    }

    fn apply_change(&mut self, change: Change) {
        match change {
            Change::None => {}
            Change::Presentation => {
                self.dirty = true;
                self.rebuild_diagram();
            }
            Change::Document => self.document_changed(),
        }
    }

    /// Steps back one edit.
    pub fn undo(&mut self) {
        let previous = self.history.undo(&self.project);
        self.step_to(previous, "Undone");
    }

    /// Steps forward one undone edit.
    pub fn redo(&mut self) {
        let next = self.history.redo(&self.project);
        self.step_to(next, "Redone");
    }

    /// Shows a state taken from the history (not recorded as a new edit).
    fn step_to(&mut self, target: Option<Project>, message: &str) {
        let Some(target) = target else {
            return;
        };
        let change = classify(&target, &self.project);
        self.project = target;
        self.apply_change(change);
        self.skip_recording = true;
        self.status = message.into();
    }

    /// Lays the diagram out again (after a new analysis, or new titles or threshold).
    pub fn rebuild_diagram(&mut self) {
        self.diagram_revision += 1;
        let options = self.diagram_options(self.energy_window);
        self.diagram = self
            .analysis
            .as_ref()
            .map(|analysis| diagram_for(analysis, &options));
    }

    fn diagram_options(&self, energy_window: Option<(f64, f64)>) -> DiagramOptions {
        DiagramOptions {
            titles: self.project.titles.clone(),
            link_threshold: self.project.view.link_threshold,
            energy_window,
            ..DiagramOptions::default()
        }
    }

    /// The diagram an export draws: the one on screen, or, while the screen is zoomed and
    /// the export window does not ask for the zoomed window, the whole diagram (a zoom
    /// never crops an export by surprise; a zoomed export says what it leaves out).
    pub fn diagram_to_export(&self) -> Option<std::borrow::Cow<'_, Diagram>> {
        let shown = self.diagram.as_ref()?;
        if self.energy_window.is_none() || self.export.zoomed {
            return Some(std::borrow::Cow::Borrowed(shown));
        }
        let analysis = self.analysis.as_ref()?;
        let whole = diagram_for(analysis, &self.diagram_options(None));
        Some(std::borrow::Cow::Owned(whole))
    }

    /// Replaces the document with a file's contents; on failure the current document stays.
    pub fn open(&mut self, path: PathBuf) {
        match open_path(&path) {
            Ok(opened) => {
                let status = if opened.notices.is_empty() {
                    format!("Opened {}", path.display())
                } else {
                    opened.notices.join("; ")
                };
                self.remember_recent(&path);
                self.replace_document(opened.project, Some(path));
                self.status = status;
            }
            Err(error) => {
                self.error_dialog = Some(format!("Could not open the file.\n\n{error}"));
            }
        }
    }

    /// Starts a new document (the default molecule) unless changes would be lost.
    pub fn new_document(&mut self) {
        if self.dirty {
            self.pending_discard = Some(Discard::New);
            return;
        }
        self.replace_document(Project::new(default_molecule()), None);
    }

    /// Opens `path` unless changes would be lost.
    pub fn request_open(&mut self, path: PathBuf) {
        if self.dirty {
            self.pending_discard = Some(Discard::Open(path));
        } else {
            self.open(path);
        }
    }

    /// Replaces the document (no questions asked).
    pub fn replace_document(&mut self, project: Project, path: Option<PathBuf>) {
        self.project = project;
        self.path = path;
        self.history.clear();
        self.builder.template_live = false;
        self.selected_atom = None;
        self.selected_level = None;
        self.energy_window = None;
        self.transition = None;
        self.map.hybrid = None;
        // A scan belongs to the molecule it was made on; its points must not be applied
        // to another one.
        self.walsh.forget_scan();
        self.camera = Camera::facing(&self.project.molecule);
        self.document_changed();
        self.dirty = false;
        // A new or opened document is not an edit of the old one: no undo step, no mark.
        self.skip_recording = true;
    }

    /// Writes the recovery file when changes have been unsaved for a while.
    pub fn autosave(&mut self, now: f64) {
        let Some(path) = self.recovery_path.clone() else {
            return;
        };
        if !self.dirty {
            self.last_autosave = None;
            return;
        }
        match self.last_autosave {
            None => self.last_autosave = Some(now),
            Some(since) if now - since >= super::recovery::AUTOSAVE_SECONDS => {
                if let Err(error) = super::recovery::write(&path, &self.project) {
                    self.status = format!("Autosave failed: {error}");
                }
                self.last_autosave = Some(now);
            }
            Some(_) => {}
        }
    }

    /// Saves the project to `path` (atomically) and remembers the path.
    pub fn save_to(&mut self, path: PathBuf) {
        let path = with_project_extension(path);
        match self.project.save(&path) {
            Ok(()) => {
                self.status = format!("Saved {}", path.display());
                self.remember_recent(&path);
                self.path = Some(path);
                self.dirty = false;
                if let Some(recovery) = &self.recovery_path {
                    super::recovery::remove(recovery);
                }
            }
            Err(error) => {
                self.error_dialog = Some(format!("Could not save the project.\n\n{error}"))
            }
        }
    }

    /// Writes the diagram on screen with the export window's options, as SVG or PNG by
    /// the file's extension (atomically).
    pub fn export_diagram(&mut self, path: PathBuf) {
        let Some(diagram) = self.diagram_to_export().map(std::borrow::Cow::into_owned) else {
            self.error_dialog = Some("There is no diagram to export yet.".into());
            return;
        };
        let extension = path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase);
        let format = match extension.as_deref() {
            Some("svg") => super::export_window::ExportFormat::Svg,
            Some("png") => super::export_window::ExportFormat::Png,
            _ => {
                self.error_dialog = Some(format!(
                    "Could not export the diagram.\n\n{}: the name must end in .svg or .png",
                    path.display()
                ));
                return;
            }
        };
        let rendered = self
            .export
            .render(&diagram, self.project.view.show_energies, format);
        match rendered {
            Ok(bytes) => self.write_export(&path, &bytes, "the diagram"),
            Err(message) => {
                self.error_dialog = Some(format!("Could not export the diagram.\n\n{message}"))
            }
        }
    }

    /// Writes the report tables of the current analysis; the format follows the extension
    /// (.md, .csv, .json, .txt).
    pub fn export_report(&mut self, path: PathBuf) {
        let Some(analysis) = self.analysis.clone() else {
            self.error_dialog = Some("There is no analysis to report yet.".into());
            return;
        };
        let format = path
            .extension()
            .and_then(|e| e.to_str())
            .and_then(diptych::report::ReportFormat::from_extension);
        let Some(format) = format else {
            self.error_dialog = Some(format!(
                "Could not export the report.\n\n{}: the name must end in .md, .csv, .json or .txt",
                path.display()
            ));
            return;
        };
        let text = diptych::report::render(&analysis, format);
        self.write_export(&path, text.as_bytes(), "the report");
    }

    /// Whether Symmetrize would move some atom noticeably (beyond rounding).
    pub fn can_symmetrize(&self) -> bool {
        self.analysis
            .as_ref()
            .and_then(|analysis| analysis.symmetrized.as_ref())
            .is_some_and(|ideal| {
                ideal
                    .atoms
                    .iter()
                    .zip(&self.project.molecule.atoms)
                    .any(|(a, b)| (a.position - b.position).norm() > 1e-7)
            })
    }

    /// Replaces the geometry by the analysis's point-group average (an ordinary edit,
    /// undoable through the frame's history diff).
    pub fn symmetrize(&mut self) {
        if !self.can_symmetrize() {
            return;
        }
        if let Some(ideal) = self
            .analysis
            .as_ref()
            .and_then(|analysis| analysis.symmetrized.clone())
            && ideal.atoms.len() == self.project.molecule.atoms.len()
        {
            for (atom, placed) in self.project.molecule.atoms.iter_mut().zip(ideal.atoms) {
                atom.position = placed.position;
            }
        }
    }

    /// Puts `path` first in the recent-files list (no duplicates, at most `MAX_RECENT`).
    pub fn remember_recent(&mut self, path: &std::path::Path) {
        let path = std::fs::canonicalize(path).unwrap_or_else(|_| path.to_path_buf());
        self.recent_files.retain(|known| *known != path);
        self.recent_files.insert(0, path);
        self.recent_files.truncate(MAX_RECENT);
    }

    /// The Inspector's orbital map, if it belongs to the analysis on screen.
    pub fn current_map(&self) -> Option<Arc<diptych::orbital_map::OrbitalMap>> {
        self.analysis
            .as_ref()
            .and_then(|analysis| self.map.current_for(analysis))
    }

    /// Writes the orbital map shown in the Inspector as SVG (the library's writer).
    pub fn export_map(&mut self, path: PathBuf) {
        let Some(map) = self.current_map() else {
            self.error_dialog = Some("There is no orbital map to export yet.".into());
            return;
        };
        let svg = super::orbital_map_view::svg_of(&map);
        self.write_export(&path, svg.as_bytes(), "the orbital map");
    }

    /// Writes the last Walsh scan as an SVG plot (our writer), atomically.
    pub fn export_walsh_svg(&mut self, path: PathBuf) {
        let Some(scan) = self.walsh.scan.clone() else {
            self.error_dialog = Some("There is no Walsh scan to export yet.".into());
            return;
        };
        let options = diptych::scan::svg::WalshSvgOptions {
            marker: scan.request.coordinate.measure(&self.project.molecule).ok(),
            ..Default::default()
        };
        let svg = diptych::scan::svg::walsh_svg(&scan, &options);
        self.write_export(&path, svg.as_bytes(), "the Walsh diagram");
    }

    /// Writes the last Walsh scan as a CSV table, atomically.
    pub fn export_walsh_csv(&mut self, path: PathBuf) {
        let Some(scan) = self.walsh.scan.clone() else {
            self.error_dialog = Some("There is no Walsh scan to export yet.".into());
            return;
        };
        let csv = diptych::scan::csv::to_csv(&scan);
        self.write_export(&path, csv.as_bytes(), "the Walsh scan");
    }

    /// Writes an exported file atomically; the status line or an error dialog says how
    /// it went.
    pub fn write_export(&mut self, path: &std::path::Path, bytes: &[u8], what: &str) {
        match diptych::chem::io::write_atomically(path, bytes) {
            Ok(()) => self.status = format!("Exported {}", path.display()),
            Err(error) => {
                self.error_dialog = Some(format!(
                    "Could not export {what}.\n\n{}: {}",
                    path.display(),
                    error.reason()
                ))
            }
        }
    }

    /// The path to save to without asking, if the document came from a project file.
    pub fn project_path(&self) -> Option<PathBuf> {
        self.path
            .clone()
            .filter(|path| diptych::project::is_project_path(path))
    }

    /// Window title: name, file and an unsaved-changes mark.
    pub fn title(&self) -> String {
        let mark = if self.dirty { " •" } else { "" };
        match &self.path {
            Some(path) => format!("Diptych — {}{mark}", path.display()),
            None => format!("Diptych — {}{mark}", self.project.molecule.name),
        }
    }
}

/// Adds `.diptych.ron` unless the name already ends with it.
fn with_project_extension(path: PathBuf) -> PathBuf {
    if diptych::project::is_project_path(&path) {
        return path;
    }
    let mut name = path
        .file_name()
        .map(|n| n.to_os_string())
        .unwrap_or_default();
    if name.is_empty() {
        name.push("untitled");
    }
    name.push(diptych::project::PROJECT_EXTENSION);
    path.with_file_name(name)
}
