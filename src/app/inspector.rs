//! The Inspector panel: the molecule's summary, then the selected orbital (energy, label,
//! occupancy, composition by atom and AO) or, failing that, the selected atom.

use diptych::analysis::Analysis;
use diptych::diagram::build::LOCALIZED_KEY_OFFSET;
use eframe::egui;

use super::diagram_view::{LevelRef, format_energy};
use super::molecule_panel;
use super::state::AppState;

pub fn show(ui: &mut egui::Ui, state: &mut AppState) {
    molecule_panel::summary(ui, state);
    ui.separator();
    if let (Some(level), Some(analysis)) = (state.selected_level, &state.analysis) {
        if level.ladder == 0 {
            canonical_orbital(ui, analysis, level);
        } else {
            localized_orbital(ui, analysis, level);
        }
        ui.separator();
    }
    molecule_panel::selected_atom(ui, state);
}

fn canonical_orbital(ui: &mut egui::Ui, analysis: &Analysis, level: LevelRef) {
    let Some(orbital) = analysis.orbitals.get(level.key) else {
        return;
    };
    let name = orbital
        .label
        .clone()
        .unwrap_or_else(|| format!("ψ{}", orbital.index + 1));
    ui.heading(format!("Orbital {name}"));
    egui::Grid::new("orbital facts")
        .num_columns(2)
        .show(ui, |ui| {
            ui.label("Energy");
            ui.label(format!("{} eV", format_energy(orbital.energy_ev, 3)));
            ui.end_row();
            ui.label("Irrep");
            ui.label(orbital.irrep.clone().unwrap_or_else(|| "–".into()));
            ui.end_row();
            ui.label("Occupancy");
            ui.label(format!("{:.2}", orbital.occupancy));
            ui.end_row();
        });
    ui.add_space(4.0);
    ui.strong("Composition (Mulliken gross shares)");
    let mut by_atom: Vec<(usize, f64)> = Vec::new();
    for part in &orbital.composition {
        match by_atom.iter_mut().find(|(atom, _)| *atom == part.atom) {
            Some((_, total)) => *total += part.share,
            None => by_atom.push((part.atom, part.share)),
        }
    }
    by_atom.sort_by(|a, b| b.1.abs().total_cmp(&a.1.abs()));
    egui::Grid::new("by atom")
        .num_columns(2)
        .striped(true)
        .show(ui, |ui| {
            for (atom, share) in &by_atom {
                ui.label(format!("{}{atom}", analysis.molecule.atoms[*atom].element));
                ui.label(format!("{:.1} %", 100.0 * share));
                ui.end_row();
            }
        });
    ui.add_space(4.0);
    egui::Grid::new("by orbital")
        .num_columns(2)
        .striped(true)
        .show(ui, |ui| {
            for part in &orbital.composition {
                ui.label(format!(
                    "{}{} {}",
                    analysis.molecule.atoms[part.atom].element, part.atom, part.orbital
                ));
                ui.label(format!("{:.1} %", 100.0 * part.share));
                ui.end_row();
            }
        });
}

fn localized_orbital(ui: &mut egui::Ui, analysis: &Analysis, level: LevelRef) {
    let Some(orbital) = level
        .key
        .checked_sub(LOCALIZED_KEY_OFFSET)
        .and_then(|n| analysis.localized.get(n))
    else {
        return;
    };
    ui.heading(format!("Localized {}", orbital.label));
    ui.label(format!(
        "{} eV, occupancy {:.2}",
        format_energy(orbital.energy_ev, 3),
        orbital.occupancy
    ));
}
