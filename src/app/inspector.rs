//! The Inspector panel: the molecule's summary, its Lewis structure and the lone-pair
//! switch, then the selected
//! orbital (energy, label, kind, occupancies, composition by atom and AO, hybrids, its
//! orbital map) and the selected atom.

use diptych::analysis::{Analysis, HybridEntry, LocalizedSummary};
use diptych::diagram::build::LOCALIZED_KEY_OFFSET;
use diptych::hybrid::HybridKind;
use diptych::localized::LocalizedKind;
use eframe::egui;

use diptych::diagram::style::{format_energy, lambda_text};

use super::diagram_view::LevelRef;
use super::lewis_section;
use super::menus::Dialogs;
use super::molecule_panel;
use super::orbital_map_view;
use super::state::AppState;
use super::switch_section::{self, SwitchEdit};
use diptych::orbital_map::OrbitalRef;

pub fn show(ui: &mut egui::Ui, state: &mut AppState, dialogs: &Dialogs) {
    molecule_panel::summary(ui, state);
    ui.separator();
    if let Some(analysis) = state.analysis.clone() {
        lewis_section::show(ui, &analysis, state.selected_atom);
        ui.separator();
        let settings = &mut state.project.settings;
        match switch_section::show(ui, &analysis, &settings.held_lone_pairs) {
            Some(SwitchEdit::Held(held)) => settings.held_lone_pairs = held,
            Some(SwitchEdit::Convention(convention)) => settings.hold_convention = convention,
            None => {}
        }
        if analysis.lone_pair_switch.is_some() {
            ui.separator();
        }
    }
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
    let index = level.key - LOCALIZED_KEY_OFFSET;
    let atom_name = |atom: usize| format!("{}{atom}", analysis.molecule.atoms[atom].element);
    // Three centres in chain order (B0–H2–B1), as the notes name them.
    let atoms: Vec<String> =
        diptych::localized::ladder::chain_order(&orbital.atoms, &analysis.molecule)
            .into_iter()
            .map(atom_name)
            .collect();
    ui.heading(format!("Localized {}", orbital.label));
    egui::Grid::new("localized facts")
        .num_columns(2)
        .show(ui, |ui| {
            ui.label("Kind");
            ui.label(lewis_section::kind_in_words(orbital.kind));
            ui.end_row();
            ui.label("Atoms");
            ui.label(atoms.join("–"));
            ui.end_row();
            ui.label("Energy");
            ui.label(format!("{} eV", format_energy(orbital.energy_ev, 3)));
            ui.end_row();
            ui.label("Occupancy");
            ui.label(format!("{:.3} (in the canonical MOs)", orbital.occupancy))
                .on_hover_text("Electrons of this orbital in the extended Hückel density");
            ui.end_row();
            ui.label("Lewis occupancy");
            ui.label(format!("{:.2}", orbital.lewis_occupancy))
                .on_hover_text("Electrons the Lewis structure puts here (drawn in the ladder)");
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
    hybrids_grid(ui, analysis, orbital, shown_hybrid)
}

/// The level's hybrids with a button each to map it; returns the user's choice as
/// `localized_orbital` does. Hybrids that are only part of an orbital (an over-complete
/// atom) are said under the grid, so that the rows stay narrow.
fn hybrids_grid(
    ui: &mut egui::Ui,
    analysis: &Analysis,
    orbital: &LocalizedSummary,
    shown_hybrid: Option<usize>,
) -> Option<Option<usize>> {
    let atom_name = |atom: usize| format!("{}{atom}", analysis.molecule.atoms[atom].element);
    let hybrids = level_hybrids(analysis, orbital);
    let mut choice = None;
    ui.strong("Hybrids");
    egui::Grid::new("hybrids of orbital")
        .num_columns(5)
        .striped(true)
        .show(ui, |ui| {
            for &(index, entry) in &hybrids {
                ui.label(atom_name(entry.center));
                ui.label(lambda_text(entry.lambda));
                ui.label(composition_text(entry));
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
    let mut partial: Vec<(usize, String)> = hybrids
        .iter()
        .filter(|(_, entry)| entry.share < 0.995)
        .map(|(_, entry)| (entry.center, format!("{:.2}", entry.share)))
        .collect();
    partial.dedup();
    for (centre, share) in partial {
        ui.add(
            egui::Label::new(format!(
                "{}: each hybrid here is a share {share} of an orbital (the atom has fewer valence functions than orbitals using it).",
                atom_name(centre)
            ))
            .wrap(),
        );
    }
    choice
}

/// The hybrids of a level, with their indices in `hybrid_entries`: on its atoms, of the
/// matching kind, and for a two-centre level toward the other atom. A multicentre level
/// takes its atoms' multicentre and π hybrids, or failing those (the bonds of an
/// over-complete centre such as SF6's sulfur) the bond hybrids among its atoms.
fn level_hybrids<'a>(
    analysis: &'a Analysis,
    level: &LocalizedSummary,
) -> Vec<(usize, &'a HybridEntry)> {
    let of_kinds = |kinds: &[HybridKind]| -> Vec<(usize, &'a HybridEntry)> {
        analysis
            .hybrid_entries
            .iter()
            .enumerate()
            .filter(|(_, h)| level.atoms.contains(&h.center) && kinds.contains(&h.kind))
            .filter(|(_, h)| match level.atoms.as_slice() {
                [_] => h.partner.is_none(),
                [a, b] => h.partner == Some(if h.center == *a { *b } else { *a }),
                atoms => h.partner.is_none_or(|partner| atoms.contains(&partner)),
            })
            .collect()
    };
    match level.kind {
        LocalizedKind::Bond | LocalizedKind::Antibond => of_kinds(&[HybridKind::Bond]),
        LocalizedKind::Pi | LocalizedKind::PiStar => of_kinds(&[HybridKind::Pi]),
        LocalizedKind::LonePair => of_kinds(&[HybridKind::LonePair]),
        LocalizedKind::SingleElectron => of_kinds(&[HybridKind::SingleElectron]),
        LocalizedKind::Vacant => of_kinds(&[HybridKind::Vacant]),
        LocalizedKind::Multicentre
        | LocalizedKind::MulticentreNonbonding
        | LocalizedKind::MulticentreAntibond => {
            let found = of_kinds(&[HybridKind::Multicentre, HybridKind::Pi]);
            if found.is_empty() {
                of_kinds(&[HybridKind::Bond])
            } else {
                found
            }
        }
    }
}

/// "25 % s", with %d when there is any.
fn composition_text(entry: &HybridEntry) -> String {
    let mut text = format!("{:.0} % s", entry.s_percent);
    if entry.d_percent >= 0.5 {
        text.push_str(&format!(", {:.0} % d", entry.d_percent));
    }
    text
}
