//! Parts of the Inspector about the molecule: its summary from the last analysis and the
//! selected atom's details (position, neighbours, bond lengths and angles).

use diptych::chem::Molecule;
use eframe::egui;

use super::state::AppState;

/// Name, formula, charge (editable), electron count.
pub fn summary(ui: &mut egui::Ui, state: &mut AppState) {
    ui.heading("Molecule");
    match &state.analysis {
        Some(analysis) => {
            egui::Grid::new("summary").num_columns(2).show(ui, |ui| {
                ui.label("Name");
                ui.label(&analysis.molecule.name);
                ui.end_row();
                ui.label("Formula");
                ui.label(&analysis.formula);
                ui.end_row();
                let label = ui.label("Charge");
                ui.add(egui::DragValue::new(&mut state.project.molecule.charge).range(-8..=8))
                    .labelled_by(label.id);
                ui.end_row();
                ui.label("Valence electrons");
                ui.label(analysis.electrons.to_string());
                ui.end_row();
                ui.label("Atoms");
                ui.label(analysis.molecule.len().to_string());
                ui.end_row();
            });
        }
        None => {
            ui.label("Analysing…");
        }
    }
}

/// The selected atom's position, bonds and angles (editable), or a hint.
pub fn selected_atom(ui: &mut egui::Ui, state: &mut AppState) {
    let molecule = &mut state.project.molecule;
    match state.selected_atom.filter(|&index| index < molecule.len()) {
        Some(index) => atom_details(ui, molecule, index),
        None => {
            ui.weak(
                "Click an atom or a level to see its details. Drag to rotate, scroll to zoom, \
                 shift-drag to move the selected atom.",
            );
        }
    }
}

fn atom_details(ui: &mut egui::Ui, molecule: &mut Molecule, index: usize) {
    let element = molecule.atoms[index].element;
    let position = molecule.atoms[index].position;
    ui.strong(format!(
        "Atom {index}: {} ({})",
        element.name(),
        element.symbol()
    ));
    ui.label(format!(
        "x {:.4}  y {:.4}  z {:.4} Å",
        position.x, position.y, position.z
    ));
    let neighbours = molecule.neighbours(index);
    if neighbours.is_empty() {
        ui.label("No bonded neighbours.");
        return;
    }
    // The neighbours are the distance-based ones the builder edits; the bonds and orders
    // read from the wavefunction are in the Lewis structure section.
    ui.label("Distances to neighbours (Å; the smaller fragment moves)");
    let mut message = None;
    egui::Grid::new("bond lengths")
        .num_columns(2)
        .show(ui, |ui| {
            for &other in &neighbours {
                let Ok(mut distance) = molecule.distance(index, other) else {
                    continue;
                };
                let name = format!("{element}{index}–{}{other}", molecule.atoms[other].element);
                let label = ui.label(&name);
                let response = ui
                    .add(
                        egui::DragValue::new(&mut distance)
                            .range(0.5..=5.0)
                            .speed(0.005)
                            .max_decimals(4),
                    )
                    .labelled_by(label.id);
                if response.changed()
                    && let Err(error) = molecule.set_distance(index, other, distance)
                {
                    message = Some(error.to_string());
                }
                ui.end_row();
            }
        });
    if neighbours.len() >= 2 {
        ui.label("Angles at this atom (°)");
        egui::Grid::new("bond angles")
            .num_columns(2)
            .show(ui, |ui| {
                for (n, &a) in neighbours.iter().enumerate() {
                    for &b in &neighbours[n + 1..] {
                        let Ok(mut angle) = molecule.angle(a, index, b) else {
                            continue;
                        };
                        let name = format!(
                            "{}{a}–{element}{index}–{}{b}",
                            molecule.atoms[a].element, molecule.atoms[b].element
                        );
                        let label = ui.label(&name);
                        let response = ui
                            .add(
                                egui::DragValue::new(&mut angle)
                                    .range(1.0..=180.0)
                                    .speed(0.2)
                                    .max_decimals(2),
                            )
                            .labelled_by(label.id);
                        if response.changed()
                            && let Err(error) = molecule.set_angle(a, index, b, angle)
                        {
                            message = Some(error.to_string());
                        }
                        ui.end_row();
                    }
                }
            });
    }
    let torsions = dihedrals_from(molecule, index);
    if !torsions.is_empty() {
        ui.label("Dihedrals from this atom (°; the smaller side turns)");
        egui::Grid::new("dihedrals").num_columns(2).show(ui, |ui| {
            for [i, j, k, l] in torsions {
                let Ok(mut angle) = molecule.dihedral(i, j, k, l) else {
                    continue;
                };
                let name = [i, j, k, l]
                    .iter()
                    .map(|&atom| format!("{}{atom}", molecule.atoms[atom].element))
                    .collect::<Vec<_>>()
                    .join("–");
                let label = ui.label(&name);
                let response = ui
                    .add(
                        egui::DragValue::new(&mut angle)
                            .range(-180.0..=180.0)
                            .speed(0.5)
                            .max_decimals(2),
                    )
                    .labelled_by(label.id);
                if response.changed()
                    && let Err(error) = molecule.set_dihedral(i, j, k, l, angle)
                {
                    message = Some(error.to_string());
                }
                ui.end_row();
            }
        });
    }
    if let Some(message) = message {
        ui.colored_label(ui.visuals().error_fg_color, message);
    }
}

/// Most dihedrals listed for one atom: a crowded molecule would otherwise fill the panel.
const MAX_DIHEDRALS: usize = 8;

/// Bonded chains i–j–k–l starting at `first` (one per j–k bond, the lowest-numbered l),
/// so that each rotatable bond reachable in two steps gets one field.
fn dihedrals_from(molecule: &Molecule, first: usize) -> Vec<[usize; 4]> {
    let mut chains = Vec::new();
    for j in molecule.neighbours(first) {
        for k in molecule.neighbours(j) {
            if k == first {
                continue;
            }
            let end = molecule
                .neighbours(k)
                .into_iter()
                .filter(|&l| l != j && l != first)
                .min();
            if let Some(l) = end {
                chains.push([first, j, k, l]);
            }
        }
    }
    chains.truncate(MAX_DIHEDRALS);
    chains
}
