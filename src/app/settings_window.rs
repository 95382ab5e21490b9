//! The Settings window: the method options of the document (extended Hückel K,
//! weighting and parameter overrides, symmetry tolerance, axis and numbering conventions,
//! how the localized orbitals are found and which model gives the hybrids). Every change
//! is an ordinary document edit: undoable, saved with the project, re-analysed off the UI
//! thread.

use diptych::analysis::Settings;
use diptych::chem::Element;
use diptych::hybrid::HybridModel;
use diptych::hybrid::coulson::LonePairConvention;
use diptych::localized::LocalizationMethod;
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
            localized_options(ui, settings);
            if ui.button("Restore defaults").clicked() {
                *settings = Settings {
                    lone_pair_mixing: settings.lone_pair_mixing,
                    ..Settings::default()
                };
            }
        });
}

/// Localization method, hybrid model and lone-pair convention, each choice with a short
/// explanation under it.
fn localized_options(ui: &mut egui::Ui, settings: &mut Settings) {
    egui::Grid::new("localized settings")
        .num_columns(2)
        .show(ui, |ui| {
            ui.label("Localization");
            ui.vertical(|ui| {
                choice(
                    ui,
                    &mut settings.localization.method,
                    LocalizationMethod::IntrinsicBond,
                    "intrinsic bond orbitals (p = 4)",
                    "Each orbital is made to sit on as few atoms as the wavefunction allows \
                     (the fourth powers of its atomic populations are maximized; Knizia 2013). \
                     The default.",
                );
                choice(
                    ui,
                    &mut settings.localization.method,
                    LocalizationMethod::PipekMezey,
                    "Pipek–Mezey (p = 2)",
                    "The older, softer measure: squares of the Löwdin populations (Pipek and \
                     Mezey 1989). Usually the same bonds; kept for comparison.",
                );
            });
            ui.end_row();
            ui.label("Hybrid model");
            ui.vertical(|ui| {
                choice(
                    ui,
                    &mut settings.hybrid.model,
                    HybridModel::Localized,
                    "read from the wavefunction",
                    "Each atom's part of its localized orbitals is its hybrid: what the \
                     extended Hückel wavefunction itself says. The default.",
                );
                choice(
                    ui,
                    &mut settings.hybrid.model,
                    HybridModel::Geometric,
                    "geometric (Coulson)",
                    "Orthogonal hybrids from the bond angles alone, on the Lewis structure \
                     read from the wavefunction: the textbook construction.",
                );
                choice(
                    ui,
                    &mut settings.hybrid.model,
                    HybridModel::MaxOverlap,
                    "maximum overlap",
                    "Hybrids turned to overlap their partners' orbitals as much as possible; \
                     this leans toward pointing straight at the partner atoms.",
                );
            });
            ui.end_row();
            ui.label("Two lone pairs");
            ui.add_enabled_ui(settings.hybrid.model != HybridModel::Localized, |ui| {
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
                })
            })
            .response
            .on_disabled_hover_text(
                "The wavefunction decides its own lone pairs; this applies to the geometric \
                 and maximum-overlap models.",
            );
            ui.end_row();
        });
}

/// A radio button with a wrapped explanation in small, weak text beneath it.
fn choice<T: PartialEq>(ui: &mut egui::Ui, current: &mut T, value: T, text: &str, why: &str) {
    ui.radio_value(current, value, text);
    ui.horizontal(|ui| {
        ui.add_space(22.0);
        ui.set_max_width(320.0);
        ui.add(egui::Label::new(egui::RichText::new(why).small().weak()).wrap());
    });
}
