//! The Settings window: the method options of the document (extended Hückel K,
//! weighting and parameter overrides, symmetry tolerance, axis and numbering conventions). Every change is an
//! ordinary document edit: undoable, saved with the project, re-analysed off the UI thread.

use diptych::analysis::Settings;
use diptych::chem::Element;
use diptych::hybrid::HybridModel;
use diptych::hybrid::coulson::LonePairConvention;
use diptych::symmetry::{AxisConvention, MAX_TOLERANCE, Numbering};
use eframe::egui;

pub fn show(ctx: &egui::Context, open: &mut bool, settings: &mut Settings, elements: &[Element]) {
    egui::Window::new("Settings")
        .open(open)
        .resizable(false)
        .show(ctx, |ui| {
            ui.strong("Extended Hückel");
            egui::Grid::new("eht settings")
                .num_columns(2)
                .show(ui, |ui| {
                    let label = ui.label("K");
                    ui.add(
                        egui::DragValue::new(&mut settings.eht.k)
                            .range(1.0..=3.0)
                            .speed(0.01),
                    )
                    .labelled_by(label.id);
                    ui.end_row();
                    ui.label("Off-diagonal formula");
                    ui.horizontal(|ui| {
                        ui.radio_value(&mut settings.eht.weighted, true, "weighted (1978)");
                        ui.radio_value(&mut settings.eht.weighted, false, "unweighted");
                    });
                    ui.end_row();
                });
            egui::CollapsingHeader::new("Parameter overrides")
                .default_open(!settings.eht.overrides.is_empty())
                .show(ui, |ui| {
                    super::parameter_editor::show(ui, &mut settings.eht, elements)
                });
            ui.separator();
            ui.strong("Symmetry");
            egui::Grid::new("symmetry settings")
                .num_columns(2)
                .show(ui, |ui| {
                    let label = ui.label("Tolerance (Å)");
                    ui.add(
                        egui::DragValue::new(&mut settings.symmetry.tolerance)
                            .range(0.0001..=MAX_TOLERANCE)
                            .speed(0.001)
                            .max_decimals(4),
                    )
                    .labelled_by(label.id);
                    ui.end_row();
                    ui.label("Planar C2v / D2h axes");
                    ui.vertical(|ui| {
                        ui.radio_value(
                            &mut settings.symmetry.axis_convention,
                            AxisConvention::MullikenPerpendicularX,
                            "x perpendicular to the plane (Mulliken 1955)",
                        );
                        ui.radio_value(
                            &mut settings.symmetry.axis_convention,
                            AxisConvention::InPlaneX,
                            "x in the plane",
                        );
                    });
                    ui.end_row();
                    ui.label("Orbital numbering");
                    ui.vertical(|ui| {
                        ui.radio_value(
                            &mut settings.symmetry.numbering,
                            Numbering::CoreInclusive,
                            "count core orbitals (2a1, 3a1 …)",
                        );
                        ui.radio_value(
                            &mut settings.symmetry.numbering,
                            Numbering::ValenceOnly,
                            "valence only (1a1, 2a1 …)",
                        );
                    });
                    ui.end_row();
                });
            ui.separator();
            ui.strong("Localized picture");
            egui::Grid::new("hybrid settings")
                .num_columns(2)
                .show(ui, |ui| {
                    ui.label("Hybrid model");
                    ui.vertical(|ui| {
                        ui.radio_value(
                            &mut settings.hybrid.model,
                            HybridModel::Geometric,
                            "geometric (Coulson)",
                        );
                        ui.radio_value(
                            &mut settings.hybrid.model,
                            HybridModel::MaxOverlap,
                            "maximum overlap",
                        );
                        ui.radio_value(
                            &mut settings.hybrid.model,
                            HybridModel::Localized,
                            "from localized MOs (Pipek–Mezey)",
                        );
                    });
                    ui.end_row();
                    ui.label("Two lone pairs");
                    ui.vertical(|ui| {
                        ui.radio_value(
                            &mut settings.hybrid.lone_pair_convention,
                            LonePairConvention::SigmaAndPi,
                            "one σ-type and one pure p",
                        );
                        ui.radio_value(
                            &mut settings.hybrid.lone_pair_convention,
                            LonePairConvention::Equivalent,
                            "equivalent hybrids",
                        );
                    });
                    ui.end_row();
                });
            if ui.button("Restore defaults").clicked() {
                *settings = Settings {
                    lone_pair_mixing: settings.lone_pair_mixing,
                    ..Settings::default()
                };
            }
        });
}
