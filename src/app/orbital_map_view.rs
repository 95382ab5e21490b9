//! The Inspector's orbital map (DESIGN §2): the selected canonical or localized orbital on
//! a plane, as contour lines from the library's `orbital_map` (STO basis values, marching
//! squares), positive and negative lobes in two colours, the nodal line, atoms and bonds
//! projected onto the plane. The map is computed on a background thread and cached per
//! (analysis, orbital, plane); the painter only draws the finished lines.

use std::sync::Arc;
use std::sync::mpsc::{Receiver, channel};

use diptych::analysis::Analysis;
use diptych::orbital_map::{
    MapOptions, OrbitalMap, OrbitalRef, Plane, compute_map, default_plane, map_to_svg,
};
use eframe::egui::{self, Align2, Color32, FontId, Pos2, Sense, Stroke, Vec2};

use super::guard::guarded;
use super::theme::element_colour;

/// Positive lobes: a deep blue; negative lobes: a burnt orange (our own pair, chosen to
/// stay distinct in greyscale print and for red–green colour blindness).
const POSITIVE: Color32 = Color32::from_rgb(30, 90, 170);
const NEGATIVE: Color32 = Color32::from_rgb(200, 100, 20);

/// Points per side of the on-screen map (a coarser grid than an export's; enough for a
/// panel a few hundred pixels wide).
const SCREEN_GRID: usize = 120;

/// Which plane the map lies in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PlaneChoice {
    /// The plane that holds most of the orbital (the library's default).
    Automatic,
    /// Through three atoms.
    Atoms([usize; 3]),
    /// Through the first atom, normal to its bond to the second (a π orbital end-on).
    NormalToBond([usize; 2]),
}

/// What a map was made for: the analysis (by address), the orbital and the plane.
#[derive(Clone, Debug, PartialEq)]
struct MapKey {
    analysis: usize,
    orbital: OrbitalRef,
    plane: PlaneChoice,
    levels: Vec<f64>,
}

/// The Inspector's map state.
pub struct MapPanel {
    pub plane: PlaneChoice,
    /// A hybrid of the selected localized orbital shown instead of the orbital itself
    /// (the level it belongs to, its index in `hybrid_entries`).
    pub hybrid: Option<(super::diagram_view::LevelRef, usize)>,
    /// Contour magnitudes (bohr^-3/2, each drawn at ±) as typed, and as last parsed.
    pub levels_text: String,
    levels: Vec<f64>,
    levels_error: Option<String>,
    shown: Option<(MapKey, Result<Arc<OrbitalMap>, String>)>,
    pending: Option<(MapKey, Receiver<Result<OrbitalMap, String>>)>,
}

/// Positive numbers separated by commas or spaces; a clear message otherwise.
fn parse_levels(text: &str) -> Result<Vec<f64>, String> {
    let mut levels = Vec::new();
    for part in text.split([',', ' ', ';']).filter(|p| !p.trim().is_empty()) {
        match part.trim().parse::<f64>() {
            Ok(value) if value.is_finite() && value > 0.0 => levels.push(value),
            _ => return Err(format!("'{}' is not a positive number", part.trim())),
        }
    }
    if levels.is_empty() {
        return Err("give at least one contour level".into());
    }
    Ok(levels)
}

impl Default for MapPanel {
    fn default() -> Self {
        MapPanel {
            plane: PlaneChoice::Automatic,
            hybrid: None,
            levels_text: diptych::orbital_map::DEFAULT_LEVELS
                .iter()
                .map(|level| level.to_string())
                .collect::<Vec<_>>()
                .join(", "),
            levels: diptych::orbital_map::DEFAULT_LEVELS.to_vec(),
            levels_error: None,
            shown: None,
            pending: None,
        }
    }
}

impl MapPanel {
    /// The finished map, if it was made from `analysis` (a map of an older analysis is
    /// not offered for export while the new one is computed).
    pub fn current_for(&self, analysis: &Arc<Analysis>) -> Option<Arc<OrbitalMap>> {
        self.shown.as_ref().and_then(|(key, result)| {
            (key.analysis == Arc::as_ptr(analysis) as usize)
                .then(|| result.as_ref().ok().cloned())
                .flatten()
        })
    }

    /// Starts computing `orbital`'s map unless it is shown or under way.
    fn request(&mut self, context: &egui::Context, analysis: &Arc<Analysis>, orbital: OrbitalRef) {
        let key = MapKey {
            analysis: Arc::as_ptr(analysis) as usize,
            orbital,
            plane: self.plane,
            levels: self.levels.clone(),
        };
        if self.shown.as_ref().is_some_and(|(shown, _)| *shown == key)
            || self
                .pending
                .as_ref()
                .is_some_and(|(pending, _)| *pending == key)
        {
            return;
        }
        let (sender, receiver) = channel();
        let analysis = Arc::clone(analysis);
        let plane_choice = self.plane;
        let levels = self.levels.clone();
        let context = context.clone();
        let spawned = std::thread::Builder::new()
            .name("orbital map".into())
            .spawn(move || {
                let result = guarded("the orbital map", || {
                    map_for(&analysis, orbital, plane_choice, levels)
                });
                let _ = sender.send(result);
                context.request_repaint();
            });
        match spawned {
            Ok(_) => self.pending = Some((key, receiver)),
            Err(error) => self.shown = Some((key, Err(format!("cannot start: {error}")))),
        }
    }

    /// Takes a finished map from the background thread.
    fn poll(&mut self) {
        let Some((_, receiver)) = &self.pending else {
            return;
        };
        let result = match receiver.try_recv() {
            Ok(result) => result,
            Err(std::sync::mpsc::TryRecvError::Empty) => return,
            Err(std::sync::mpsc::TryRecvError::Disconnected) => {
                Err("the orbital map thread stopped".to_string())
            }
        };
        if let Some((key, _)) = self.pending.take() {
            self.shown = Some((key, result.map(Arc::new)));
        }
    }
}

/// The library call, off the UI thread.
fn map_for(
    analysis: &Analysis,
    orbital: OrbitalRef,
    choice: PlaneChoice,
    levels: Vec<f64>,
) -> Result<OrbitalMap, String> {
    let plane = match choice {
        PlaneChoice::Automatic => default_plane(analysis, orbital),
        PlaneChoice::Atoms(atoms) => Plane::through_atoms(&analysis.molecule, atoms),
        PlaneChoice::NormalToBond([atom, partner]) => {
            Plane::normal_to_bond(&analysis.molecule, atom, partner)
        }
    }
    .map_err(|error| error.to_string())?;
    let options = MapOptions {
        points: SCREEN_GRID,
        levels,
        ..MapOptions::default()
    };
    compute_map(analysis, orbital, &plane, &options).map_err(|error| error.to_string())
}

/// The map section of the Inspector for `orbital`; returns true when the user asks to
/// export it as SVG.
pub fn show(
    ui: &mut egui::Ui,
    panel: &mut MapPanel,
    analysis: &Arc<Analysis>,
    orbital: OrbitalRef,
) -> bool {
    panel.poll();
    panel.request(ui.ctx(), analysis, orbital);
    let mut export = false;
    egui::CollapsingHeader::new("Orbital map")
        .default_open(true)
        .show(ui, |ui| {
            plane_form(ui, panel, analysis.molecule.len());
            let key_matches = panel.shown.as_ref().is_some_and(|(key, _)| {
                key.orbital == orbital
                    && key.plane == panel.plane
                    && key.levels == panel.levels
                    && key.analysis == Arc::as_ptr(analysis) as usize
            });
            match &panel.shown {
                Some((_, Ok(map))) if key_matches => {
                    ui.label(&map.orbital.label);
                    draw(ui, map);
                    ui.horizontal(|ui| {
                        ui.colored_label(POSITIVE, "positive");
                        ui.colored_label(NEGATIVE, "negative (dashed)");
                        ui.weak("grey dots: node");
                        if ui.button("Export map SVG…").clicked() {
                            export = true;
                        }
                    });
                }
                Some((_, Err(message))) if key_matches => {
                    ui.colored_label(ui.visuals().error_fg_color, message);
                }
                _ => {
                    ui.horizontal(|ui| {
                        ui.spinner();
                        ui.weak("Computing the map…");
                    });
                }
            }
        });
    export
}

fn plane_form(ui: &mut egui::Ui, panel: &mut MapPanel, atom_count: usize) {
    let last = atom_count.saturating_sub(1);
    ui.horizontal(|ui| {
        let label = ui.label("Contours at ±");
        let edit = ui
            .add(egui::TextEdit::singleline(&mut panel.levels_text).desired_width(170.0))
            .labelled_by(label.id)
            .on_hover_text("Magnitudes of ψ in bohr^-3/2, separated by commas");
        if edit.changed() {
            match parse_levels(&panel.levels_text) {
                Ok(levels) => {
                    panel.levels = levels;
                    panel.levels_error = None;
                }
                Err(message) => panel.levels_error = Some(message),
            }
        }
    });
    if let Some(message) = &panel.levels_error {
        ui.colored_label(ui.visuals().error_fg_color, message);
    }
    ui.horizontal_wrapped(|ui| {
        let choice = panel.plane;
        if ui
            .radio(choice == PlaneChoice::Automatic, "best plane")
            .on_hover_text("The plane that holds most of the orbital")
            .clicked()
        {
            panel.plane = PlaneChoice::Automatic;
        }
        if ui
            .radio(matches!(choice, PlaneChoice::Atoms(_)), "through atoms")
            .clicked()
            && !matches!(choice, PlaneChoice::Atoms(_))
        {
            panel.plane = PlaneChoice::Atoms([0, 1.min(last), 2.min(last)]);
        }
        if ui
            .radio(
                matches!(choice, PlaneChoice::NormalToBond(_)),
                "normal to a bond",
            )
            .clicked()
            && !matches!(choice, PlaneChoice::NormalToBond(_))
        {
            panel.plane = PlaneChoice::NormalToBond([0, 1.min(last)]);
        }
    });
    ui.horizontal_wrapped(|ui| {
        let index_field = |ui: &mut egui::Ui, name: &str, value: &mut usize| {
            let label = ui.label(name);
            ui.add(egui::DragValue::new(value).range(0..=last))
                .labelled_by(label.id);
        };
        match &mut panel.plane {
            PlaneChoice::Automatic => {}
            PlaneChoice::Atoms(atoms) => {
                for (slot, name) in ["I", "J", "K"].iter().enumerate() {
                    index_field(ui, name, &mut atoms[slot]);
                }
            }
            PlaneChoice::NormalToBond(atoms) => {
                index_field(ui, "through atom", &mut atoms[0]);
                index_field(ui, "bond to", &mut atoms[1]);
            }
        }
    });
}

/// Paints the contours, nodal line, bonds and atoms into a square.
fn draw(ui: &mut egui::Ui, map: &OrbitalMap) {
    let side = ui.available_width().clamp(160.0, 420.0);
    let (response, painter) = ui.allocate_painter(Vec2::splat(side), Sense::hover());
    let rect = response.rect;
    painter.rect_filled(rect, 2.0, ui.visuals().extreme_bg_color);
    let spec = &map.grid.spec;
    let extent = spec.side().max(1e-9);
    let to_screen = |x: f64, y: f64| -> Pos2 {
        let fx = ((x - spec.x0) / extent) as f32;
        let fy = ((y - spec.y0) / extent) as f32;
        // Plane y grows upwards, screen y downwards.
        Pos2::new(
            rect.left() + fx * rect.width(),
            rect.bottom() - fy * rect.height(),
        )
    };
    let clip = painter.with_clip_rect(rect);
    for line in &map.nodal {
        let points: Vec<Pos2> = line.points.iter().map(|p| to_screen(p[0], p[1])).collect();
        clip.add(egui::Shape::dashed_line(
            &points,
            Stroke::new(1.0, Color32::GRAY),
            1.5,
            3.0,
        ));
    }
    for line in &map.contours {
        let points: Vec<Pos2> = line.points.iter().map(|p| to_screen(p[0], p[1])).collect();
        if line.level > 0.0 {
            clip.add(egui::Shape::line(points, Stroke::new(1.2, POSITIVE)));
        } else {
            // Negative lobes dashed, as in the SVG (5 on, 3 off), so the sign reads in
            // greyscale print and for colour-blind readers too.
            clip.add(egui::Shape::dashed_line(
                &points,
                Stroke::new(1.2, NEGATIVE),
                5.0,
                3.0,
            ));
        }
    }
    let ink = ui.visuals().text_color();
    for &(a, b) in &map.bonds {
        let (Some(first), Some(second)) = (
            map.atoms.iter().find(|atom| atom.index == a),
            map.atoms.iter().find(|atom| atom.index == b),
        ) else {
            continue;
        };
        clip.line_segment(
            [to_screen(first.x, first.y), to_screen(second.x, second.y)],
            Stroke::new(1.5, ink.gamma_multiply(0.5)),
        );
    }
    for atom in &map.atoms {
        let centre = to_screen(atom.x, atom.y);
        if !rect.contains(centre) {
            continue;
        }
        let colour =
            diptych::chem::Element::from_symbol(&atom.symbol).map_or(Color32::GRAY, element_colour);
        let radius = if atom.in_plane() { 5.0 } else { 3.5 };
        clip.circle_filled(centre, radius, colour);
        clip.circle_stroke(centre, radius, Stroke::new(1.0, ink));
        clip.text(
            centre + Vec2::new(6.0, -6.0),
            Align2::LEFT_BOTTOM,
            format!("{}{}", atom.symbol, atom.index),
            FontId::proportional(11.0),
            ink,
        );
    }
    // A 1 Å scale bar in the lower left corner.
    let one_angstrom = rect.width() / extent as f32;
    let start = Pos2::new(rect.left() + 8.0, rect.bottom() - 10.0);
    clip.line_segment(
        [start, start + Vec2::new(one_angstrom, 0.0)],
        Stroke::new(2.0, ink),
    );
    clip.text(
        start + Vec2::new(one_angstrom + 4.0, 0.0),
        Align2::LEFT_CENTER,
        "1 Å",
        FontId::proportional(11.0),
        ink,
    );
}

/// The map as an SVG document (the library's writer).
pub fn svg_of(map: &OrbitalMap) -> String {
    map_to_svg(map, &diptych::orbital_map::MapSvgOptions::default())
}

#[cfg(test)]
mod tests {
    use super::parse_levels;

    #[test]
    fn contour_levels_are_parsed_or_refused_with_a_reason() {
        assert_eq!(parse_levels("0.05, 0.1 0.2").unwrap(), vec![0.05, 0.1, 0.2]);
        assert!(parse_levels("").unwrap_err().contains("at least one"));
        assert!(parse_levels("0.1, -2").unwrap_err().contains("'-2'"));
        assert!(parse_levels("0.1, x").unwrap_err().contains("'x'"));
    }
}
