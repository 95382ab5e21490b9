//! The Inspector panel: the molecule's summary, then the selected orbital (energy, label,
//! occupancy, composition by atom and AO, its orbital map) or, failing that, the selected
//! atom.

use diptych::analysis::Analysis;
use diptych::diagram::build::LOCALIZED_KEY_OFFSET;
use eframe::egui;

use diptych::diagram::style::{format_energy, lambda_text};

use super::diagram_view::LevelRef;
use super::menus::Dialogs;
use super::molecule_panel;
use super::orbital_map_view;
use super::state::AppState;
use diptych::orbital_map::OrbitalRef;

pub fn show(ui: &mut egui::Ui, state: &mut AppState, dialogs: &Dialogs) {
    molecule_panel::summary(ui, state);
    ui.separator();
    if let (Some(level), Some(analysis)) = (state.selected_level, state.analysis.clone()) {
        let orbital = if level.ladder == 0 {
            canonical_orbital(ui, &analysis, level);
            Some(OrbitalRef::Canonical(level.key))
        } else {
            let shown_hybrid = state
                .map
                .hybrid
                .filter(|(focused, _)| *focused == level)
                .map(|(_, index)| index);
            if let Some(choice) = localized_orbital(ui, &analysis, level, shown_hybrid) {
                state.map.hybrid = choice.map(|index| (level, index));
            }
            let hybrid = state
                .map
                .hybrid
                .filter(|(focused, _)| *focused == level)
                .map(|(_, index)| OrbitalRef::Hybrid(index));
            hybrid.or(level
                .key
                .checked_sub(LOCALIZED_KEY_OFFSET)
                .map(OrbitalRef::Localized))
        };
        if let Some(orbital) = orbital
            && orbital_map_view::show(ui, &mut state.map, &analysis, orbital)
        {
            dialogs.ask_export_map(state.project.molecule.name.clone());
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
    let by_atom = orbital.atom_shares();
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

/// The localized orbital's facts, constituents and hybrids. Returns the user's choice of
/// map: `Some(Some(i))` to map hybrid `i`, `Some(None)` to map the orbital itself again.
fn localized_orbital(
    ui: &mut egui::Ui,
    analysis: &Analysis,
    level: LevelRef,
    shown_hybrid: Option<usize>,
) -> Option<Option<usize>> {
    let orbital = level
        .key
        .checked_sub(LOCALIZED_KEY_OFFSET)
        .and_then(|n| analysis.localized.get(n))?;
    let mut choice = None;
    let index = level.key - LOCALIZED_KEY_OFFSET;
    let atom_name = |atom: usize| format!("{}{atom}", analysis.molecule.atoms[atom].element);
    let atoms: Vec<String> = orbital.atoms.iter().map(|&a| atom_name(a)).collect();
    ui.heading(format!("Localized {}", orbital.label));
    egui::Grid::new("localized facts")
        .num_columns(2)
        .show(ui, |ui| {
            ui.label("Atoms");
            ui.label(atoms.join("–"));
            ui.end_row();
            ui.label("Energy");
            ui.label(format!("{} eV", format_energy(orbital.energy_ev, 3)));
            ui.end_row();
            ui.label("Occupancy");
            ui.label(format!("{:.2}", orbital.occupancy));
            ui.end_row();
            ui.label("In occupied MOs");
            ui.label(format!("{:.1} %", 100.0 * orbital.captured));
            ui.end_row();
        });
    ui.add_space(4.0);
    ui.strong("Canonical constituents (weights)");
    let mut parts: Vec<_> = analysis
        .links
        .iter()
        .filter(|l| l.localized == index)
        .collect();
    parts.sort_by(|a, b| b.weight.total_cmp(&a.weight));
    egui::Grid::new("constituents")
        .num_columns(2)
        .striped(true)
        .show(ui, |ui| {
            for link in parts.iter().filter(|l| l.weight >= 0.005) {
                let name = analysis
                    .orbitals
                    .get(link.canonical)
                    .and_then(|o| o.label.clone())
                    .unwrap_or_else(|| format!("ψ{}", link.canonical + 1));
                ui.label(name);
                ui.label(format!("{:.3}", link.weight));
                ui.end_row();
            }
        });
    ui.add_space(4.0);
    ui.strong("Hybrids");
    egui::Grid::new("hybrids of orbital")
        .num_columns(5)
        .striped(true)
        .show(ui, |ui| {
            let members = analysis.hybrid_entries.iter().enumerate().filter(|(_, h)| {
                orbital.atoms.contains(&h.center)
                    && match orbital.atoms.as_slice() {
                        [_] => h.partner.is_none(),
                        [a, b] => h.partner == Some(if h.center == *a { *b } else { *a }),
                        _ => false,
                    }
            });
            for (index, entry) in members {
                ui.label(atom_name(entry.center));
                ui.label(lambda_text(entry.lambda));
                ui.label(format!("{:.0} % s", entry.s_percent));
                ui.label(
                    entry
                        .bending_degrees
                        .map_or(String::new(), |b| format!("bent {b:.1}°")),
                );
                let mapped = shown_hybrid == Some(index);
                if ui
                    .selectable_label(mapped, format!("map {}", atom_name(entry.center)))
                    .on_hover_text("Show this hybrid in the orbital map")
                    .clicked()
                {
                    choice = Some(if mapped { None } else { Some(index) });
                }
                ui.end_row();
            }
        });
    choice
}
