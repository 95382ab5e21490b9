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
                ui.label("Atoms / bonds");
                ui.label(format!(
                    "{} / {}",
                    analysis.molecule.len(),
                    analysis.molecule.bonds.len()
                ));
                ui.end_row();
            });
        }
        None => {
            ui.label("Analysing…");
        }
    }
}

/// The selected atom's position, bonds and angles, or a hint.
pub fn selected_atom(ui: &mut egui::Ui, state: &AppState) {
    let molecule = &state.project.molecule;
    match state.selected_atom.filter(|&index| index < molecule.len()) {
        Some(index) => atom_details(ui, molecule, index),
        None => {
            ui.weak("Click an atom or a level to see its details. Drag to rotate, scroll to zoom.");
        }
    }
}

fn atom_details(ui: &mut egui::Ui, molecule: &Molecule, index: usize) {
    let atom = &molecule.atoms[index];
    ui.strong(format!(
        "Atom {index}: {} ({})",
        atom.element.name(),
        atom.element.symbol()
    ));
    ui.label(format!(
        "x {:.4}  y {:.4}  z {:.4} Å",
        atom.position.x, atom.position.y, atom.position.z
    ));
    let neighbours = molecule.neighbours(index);
    if neighbours.is_empty() {
        ui.label("No bonded neighbours.");
        return;
    }
    ui.label("Bonds");
    for &other in &neighbours {
        let order = molecule.bond(index, other).map_or(1, |bond| bond.order);
        if let Ok(distance) = molecule.distance(index, other) {
            ui.label(format!(
                "  –{}{other}  {distance:.4} Å  (order {order})",
                molecule.atoms[other].element
            ));
        }
    }
    if neighbours.len() >= 2 {
        ui.label("Angles at this atom");
        for (n, &a) in neighbours.iter().enumerate() {
            for &b in &neighbours[n + 1..] {
                if let Ok(angle) = molecule.angle(a, index, b) {
                    ui.label(format!(
                        "  {}{a}–{}{index}–{}{b}  {angle:.2}°",
                        molecule.atoms[a].element, atom.element, molecule.atoms[b].element
                    ));
                }
            }
        }
    }
}
