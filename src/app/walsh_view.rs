//! The Walsh scan window (DESIGN §2): choose a coordinate, a range and a point count; the
//! library's scan engine (`diptych::scan`) runs off the UI thread with progress and
//! cancel; the result is drawn with egui_plot as MO energies against the coordinate
//! (coloured by irrep, legend, end labels), λ of every bond and lone pair, and the sum of
//! occupied orbital energies, on linked x axes, with a marker at the current geometry.
//! Clicking a plot sets the document's geometry to the nearest scan point (an ordinary,
//! undoable edit). Walsh diagrams: A. D. Walsh, J. Chem. Soc. 1953, 2260.

use std::sync::Arc;

use diptych::scan::{Coordinate, Scan, ScanRequest};
use eframe::egui;
use egui_plot::{Legend, Line, Plot, PlotPoints, Points, Text, VLine};

use super::menus::Dialogs;
use super::scan_job::ScanJob;
use super::state::AppState;
use super::walsh_plot::{LAMBDA_TOP, WalshPlot};

/// A λ curve's colour, as in the SVG: lone pairs in the n colour, bonds in the σ colour.
fn lambda_colour(group: &super::walsh_plot::LambdaPlot, ink: egui::Color32) -> egui::Color32 {
    let family = if group.lone_pair { "n" } else { "σ" };
    diptych::diagram::style::level_rgb(family)
        .map_or(ink, |[r, g, b]| egui::Color32::from_rgb(r, g, b))
}

/// The λ plot's key, above it and so never over a curve: each curve's name in its colour,
/// and the marks.
fn lambda_key(ui: &mut egui::Ui, groups: &[super::walsh_plot::LambdaPlot], ink: egui::Color32) {
    ui.horizontal_wrapped(|ui| {
        for group in groups {
            ui.colored_label(lambda_colour(group, ink), format!("━ {}", group.name));
        }
        if groups.iter().any(|g| !g.pure_p.is_empty()) {
            ui.label("● pure p (λ = ∞)");
        }
        if groups.iter().any(|g| !g.unsolved.is_empty()) {
            ui.label("× no solution of Coulson's relations");
        }
    });
}

/// One width for the three plots' y axes (points), so that their x axes line up: wide
/// enough for "−163.0" and a rotated axis title.
const Y_AXIS_WIDTH: f32 = 64.0;

/// The coordinates offered in the window (the library's `Coordinate` without atoms).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CoordinateKind {
    Pyramidalize,
    SymmetricBend,
    SymmetricStretch,
    Angle,
    Bond,
    Dihedral,
}

impl CoordinateKind {
    const ALL: [CoordinateKind; 6] = [
        CoordinateKind::Pyramidalize,
        CoordinateKind::SymmetricBend,
        CoordinateKind::SymmetricStretch,
        CoordinateKind::Angle,
        CoordinateKind::Bond,
        CoordinateKind::Dihedral,
    ];

    fn name(self) -> &'static str {
        match self {
            CoordinateKind::Pyramidalize => "pyramidalization of AXn (X–A–X angle)",
            CoordinateKind::SymmetricBend => "symmetric bend of AX2 (X–A–X angle)",
            CoordinateKind::SymmetricStretch => "symmetric stretch (all A–X bonds)",
            CoordinateKind::Angle => "bond angle I–J–K",
            CoordinateKind::Bond => "bond length I–J",
            CoordinateKind::Dihedral => "dihedral I–J–K–L",
        }
    }

    /// How many atom indices the coordinate needs.
    fn atom_count(self) -> usize {
        match self {
            CoordinateKind::Pyramidalize
            | CoordinateKind::SymmetricBend
            | CoordinateKind::SymmetricStretch => 1,
            CoordinateKind::Bond => 2,
            CoordinateKind::Angle => 3,
            CoordinateKind::Dihedral => 4,
        }
    }

    fn coordinate(self, atoms: [usize; 4]) -> Coordinate {
        let [i, j, k, l] = atoms;
        match self {
            CoordinateKind::Pyramidalize => Coordinate::Pyramidalize { centre: i },
            CoordinateKind::SymmetricBend => Coordinate::SymmetricBend { centre: i },
            CoordinateKind::SymmetricStretch => Coordinate::SymmetricStretch { centre: i },
            CoordinateKind::Angle => Coordinate::Angle { i, j, k },
            CoordinateKind::Bond => Coordinate::Bond { i, j },
            CoordinateKind::Dihedral => Coordinate::Dihedral { i, j, k, l },
        }
    }

    /// A range that shows the classic Walsh argument for this coordinate.
    fn default_range(self) -> (f64, f64) {
        match self {
            CoordinateKind::Pyramidalize => (90.0, 120.0),
            CoordinateKind::SymmetricBend | CoordinateKind::Angle => (90.0, 180.0),
            CoordinateKind::SymmetricStretch | CoordinateKind::Bond => (0.8, 1.6),
            CoordinateKind::Dihedral => (0.0, 180.0),
        }
    }
}

/// The window's form, the running job and the last finished scan.
pub struct WalshPanel {
    pub open: bool,
    pub kind: CoordinateKind,
    pub atoms: [usize; 4],
    pub from: f64,
    pub to: f64,
    pub steps: usize,
    pub job: Option<ScanJob>,
    pub scan: Option<Arc<Scan>>,
    /// What the plots draw, derived from `scan` when it arrived.
    plot: Option<Arc<WalshPlot>>,
    pub error: Option<String>,
    pub lambda_model: LambdaModel,
}

impl Default for WalshPanel {
    fn default() -> Self {
        let kind = CoordinateKind::Pyramidalize;
        let (from, to) = kind.default_range();
        WalshPanel {
            open: false,
            kind,
            atoms: [0, 1, 2, 3],
            from,
            to,
            steps: 31,
            job: None,
            scan: None,
            plot: None,
            error: None,
            lambda_model: LambdaModel::Geometric,
        }
    }
}

impl WalshPanel {
    /// The request the form describes.
    pub fn request(&self) -> ScanRequest {
        ScanRequest {
            coordinate: self.kind.coordinate(self.atoms),
            from: self.from,
            to: self.to,
            steps: self.steps,
        }
    }

    /// Drops the last scan and stops a running one (the document was replaced).
    pub fn forget_scan(&mut self) {
        if let Some(job) = self.job.take() {
            job.cancel();
        }
        self.scan = None;
        self.plot = None;
        self.error = None;
    }

    /// Takes a finished scan from the job.
    pub fn poll(&mut self) {
        let Some(job) = &self.job else {
            return;
        };
        match job.poll() {
            Some(Ok(scan)) => {
                let scan = Arc::new(scan);
                // Everything drawn is derived once here, not every frame.
                self.plot = Some(Arc::new(WalshPlot::new(Arc::clone(&scan))));
                self.scan = Some(scan);
                self.error = None;
                self.job = None;
            }
            Some(Err(message)) => {
                self.error = Some(message);
                self.job = None;
            }
            None => {}
        }
    }

    /// Checks the form against the molecule before anything runs (the engine checks
    /// again; this gives the message at once).
    fn start(
        &mut self,
        context: &egui::Context,
        state_molecule: &diptych::chem::Molecule,
        settings: &diptych::analysis::Settings,
    ) {
        if let Some(job) = &self.job {
            job.cancel();
        }
        let request = self.request();
        if let Err(error) = request.plan(state_molecule) {
            self.error = Some(error.to_string());
            self.job = None;
            return;
        }
        self.error = None;
        self.job = Some(ScanJob::start(
            context.clone(),
            state_molecule.clone(),
            settings.clone(),
            request,
        ));
    }
}

/// Draws the window when it is open.
pub fn show(ctx: &egui::Context, state: &mut AppState, dialogs: &Dialogs) {
    state.walsh.poll();
    let mut open = state.walsh.open;
    egui::Window::new("Walsh scan")
        .open(&mut open)
        .default_size([900.0, 780.0])
        .resizable(true)
        .show(ctx, |ui| {
            form(ui, state);
            ui.separator();
            plots(ui, state, dialogs);
        });
    state.walsh.open = open;
}

fn form(ui: &mut egui::Ui, state: &mut AppState) {
    let atom_count = state.project.molecule.len();
    let walsh = &mut state.walsh;
    ui.horizontal_wrapped(|ui| {
        let label = ui.label("Coordinate");
        let before = walsh.kind;
        egui::ComboBox::from_id_salt("walsh coordinate")
            .selected_text(walsh.kind.name())
            .show_ui(ui, |ui| {
                for kind in CoordinateKind::ALL {
                    ui.selectable_value(&mut walsh.kind, kind, kind.name());
                }
            })
            .response
            .labelled_by(label.id);
        if walsh.kind != before {
            (walsh.from, walsh.to) = walsh.kind.default_range();
        }
    });
    ui.horizontal_wrapped(|ui| {
        let names = ["I", "J", "K", "L"];
        let count = walsh.kind.atom_count();
        for (slot, name) in names.iter().enumerate().take(count) {
            let shown = if count == 1 { "centre atom" } else { name };
            let label = ui.label(shown);
            ui.add(
                egui::DragValue::new(&mut walsh.atoms[slot])
                    .range(0..=atom_count.saturating_sub(1)),
            )
            .labelled_by(label.id);
        }
        if let Some(selected) = state.selected_atom
            && ui
                .button(format!("use selected atom {selected}"))
                .on_hover_text("Put the atom selected in the Structure panel in the first field")
                .clicked()
        {
            walsh.atoms[0] = selected;
        }
        ui.weak("(atom numbers as in the Structure panel, from 0)");
    });
    let unit = walsh.kind.coordinate(walsh.atoms).unit();
    let run_clicked = ui.horizontal_wrapped(|ui| {
        let label = ui.label(format!("from ({unit})"));
        ui.add(
            egui::DragValue::new(&mut walsh.from)
                .speed(0.1)
                .max_decimals(3),
        )
        .labelled_by(label.id);
        let label = ui.label(format!("to ({unit})"));
        ui.add(
            egui::DragValue::new(&mut walsh.to)
                .speed(0.1)
                .max_decimals(3),
        )
        .labelled_by(label.id);
        let label = ui.label("points");
        ui.add(egui::DragValue::new(&mut walsh.steps).range(2..=diptych::scan::MAX_POINTS))
            .labelled_by(label.id);
        let running = walsh.job.is_some();
        let run = ui
            .add_enabled(!running, egui::Button::new("Run scan"))
            .clicked();
        if let Some(job) = &walsh.job {
            ui.add(
                egui::ProgressBar::new(job.progress.fraction() as f32)
                    .desired_width(160.0)
                    .show_percentage(),
            );
            if ui.button("Cancel scan").clicked() {
                job.cancel();
            }
            ui.ctx()
                .request_repaint_after(std::time::Duration::from_millis(100));
        }
        run
    });
    if run_clicked.inner {
        let molecule = state.project.molecule.clone();
        let settings = state.project.settings.clone();
        state.walsh.start(ui.ctx(), &molecule, &settings);
    }
    if let Some(error) = &state.walsh.error {
        ui.colored_label(ui.visuals().error_fg_color, error);
    }
}

fn plots(ui: &mut egui::Ui, state: &mut AppState, dialogs: &Dialogs) {
    let Some(scan) = state.walsh.scan.clone() else {
        ui.weak(
            "Run a scan to see how each orbital's energy, the hybridization index λ and the \
             sum of occupied orbital energies change with the coordinate.",
        );
        return;
    };
    ui.horizontal(|ui| {
        ui.strong(format!(
            "{} — {} points",
            scan.request.coordinate.describe(),
            scan.points.len()
        ));
        let failed = scan.failed_points().len();
        if failed > 0 {
            ui.colored_label(
                ui.visuals().warn_fg_color,
                format!("{failed} point(s) failed and are left out"),
            );
        }
        if ui.button("Export SVG…").clicked() {
            dialogs.ask_export_walsh_svg(state.project.molecule.name.clone());
        }
        if ui.button("Export CSV…").clicked() {
            dialogs.ask_export_walsh_csv(state.project.molecule.name.clone());
        }
    });
    ui.weak("Click a plot to take the geometry of the nearest point (Ctrl+Z undoes it).");
    let marker = scan
        .request
        .coordinate
        .measure(&state.project.molecule)
        .ok();
    let link = egui::Id::unique("walsh x axes");
    let available = ui.available_height().max(300.0);
    let ink = ui.visuals().text_color();
    let mut clicked_at = None;

    let data = state.walsh.plot.clone();
    let Some(data) = data.filter(|data| Arc::ptr_eq(&data.scan, &scan)) else {
        return;
    };
    let (low, high) = data.energy_window;
    let (x_min, x_max) = data.x_bounds;
    let response = Plot::new("walsh energies")
        .y_axis_min_width(Y_AXIS_WIDTH)
        .default_x_bounds(x_min, x_max)
        .height(available * 0.55)
        .legend(Legend::default())
        .link_axis(link, [true, false])
        .y_axis_label("E / eV")
        .default_y_bounds(low, high)
        .allow_scroll(false)
        .show(ui, |plot| {
            for curve in &data.curves {
                let colour = curve
                    .rgb
                    .map_or(ink, |[r, g, b]| egui::Color32::from_rgb(r, g, b));
                for segment in &curve.segments {
                    plot.line(
                        Line::new(curve.legend.clone(), PlotPoints::from(segment.clone()))
                            .color(colour)
                            .width(1.8),
                    );
                }
                if let Some(([x, y], text)) = &curve.end
                    && (low..=high).contains(y)
                {
                    plot.text(
                        // No name: end labels stay out of the legend, whose entries take
                        // their colour from the curves.
                        Text::new(
                            "",
                            [*x, *y].into(),
                            egui::RichText::new(text).color(colour).size(13.0),
                        )
                        .anchor(egui::Align2::LEFT_CENTER),
                    );
                }
            }
            if let Some(value) = marker {
                plot.vline(current_geometry_marker(value, ink));
            }
            plot.pointer_coordinate()
        });
    if response.response.clicked() {
        clicked_at = response.inner;
    }

    ui.horizontal(|ui| {
        ui.label("λ from");
        ui.radio_value(
            &mut state.walsh.lambda_model,
            LambdaModel::Geometric,
            "bond angles (Coulson)",
        );
        ui.radio_value(
            &mut state.walsh.lambda_model,
            LambdaModel::Localized,
            "localized MOs",
        );
    });
    let groups = data.lambdas(state.walsh.lambda_model == LambdaModel::Localized);
    lambda_key(ui, groups, ink);
    let response = Plot::new("walsh lambda")
        .y_axis_min_width(Y_AXIS_WIDTH)
        .default_x_bounds(x_min, x_max)
        .height(available * 0.22)
        .link_axis(link, [true, false])
        .y_axis_label("λ (sp^λ)")
        .default_y_bounds(0.0, LAMBDA_TOP)
        .allow_scroll(false)
        .show(ui, |plot| {
            for group in groups {
                let colour = lambda_colour(group, ink);
                for segment in &group.segments {
                    plot.line(
                        Line::new(group.name.clone(), PlotPoints::from(segment.clone()))
                            .color(colour)
                            .width(1.8),
                    );
                }
                let marks = [
                    (&group.pure_p, egui_plot::MarkerShape::Circle),
                    (&group.unsolved, egui_plot::MarkerShape::Cross),
                ];
                for (points, shape) in marks {
                    if !points.is_empty() {
                        plot.points(
                            Points::new(group.name.clone(), PlotPoints::from(points.clone()))
                                .shape(shape)
                                .color(colour)
                                .radius(4.5),
                        );
                    }
                }
            }
            if let Some(value) = marker {
                plot.vline(current_geometry_marker(value, ink));
            }
            plot.pointer_coordinate()
        });
    if response.response.clicked() {
        clicked_at = response.inner;
    }

    let response = Plot::new("walsh sum")
        .y_axis_min_width(Y_AXIS_WIDTH)
        .default_x_bounds(x_min, x_max)
        .height(available * 0.18)
        .link_axis(link, [true, false])
        .y_axis_label("Σ occ·ε / eV")
        .x_axis_label(scan.request.coordinate.describe())
        .allow_scroll(false)
        .show(ui, |plot| {
            for segment in &data.sums {
                plot.line(
                    Line::new(
                        "sum of occupied orbital energies",
                        PlotPoints::from(segment.clone()),
                    )
                    .color(ink),
                );
            }
            if let Some(value) = marker {
                plot.vline(current_geometry_marker(value, ink));
            }
            plot.pointer_coordinate()
        });
    if response.response.clicked() {
        clicked_at = response.inner;
    }

    if let Some(at) = clicked_at
        && let Some(index) = scan.nearest_point(at.x)
        && scan.points[index].failure.is_none()
    {
        take_point_geometry(state, &scan, index);
    }
}

/// The dashed vertical line at the document's geometry (neutral ink, so it is not read
/// as one of the irrep colours).
fn current_geometry_marker(value: f64, ink: egui::Color32) -> VLine {
    VLine::new("current geometry", value)
        .color(ink.gamma_multiply(0.6))
        .width(1.5)
        .style(egui_plot::LineStyle::dashed_loose())
}

/// Which model's λ the second plot shows.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LambdaModel {
    Geometric,
    Localized,
}

/// Sets the document's geometry to scan point `index` (recorded as one undoable edit by
/// the frame's history diff).
pub fn take_point_geometry(state: &mut AppState, scan: &Scan, index: usize) {
    let Some(point) = scan.points.get(index) else {
        return;
    };
    if point.geometry.len() != state.project.molecule.len() {
        state.status = "The scan was made on a different molecule".into();
        return;
    }
    for (atom, placed) in state
        .project
        .molecule
        .atoms
        .iter_mut()
        .zip(&point.geometry.atoms)
    {
        atom.position = placed.position;
    }
    state.status = format!(
        "Geometry of scan point {} ({:.3} {})",
        index + 1,
        point.value,
        scan.request.coordinate.unit()
    );
}
