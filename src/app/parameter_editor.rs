//! The Settings window's parameter-override table: for each element of the molecule, the
//! extended Hückel H_ii (VSIP, eV) and Slater exponents ζ (1/bohr) of its shells can be
//! replaced. An override is a copy of the built-in row (assets/eht_parameters.ron, sources
//! named there) that the user then edits; it lives in the document's settings, so it is
//! undoable and saved with the project.

use diptych::chem::Element;
use diptych::eht::EhtSettings;
use diptych::eht::params::ParameterSet;
use eframe::egui;

/// Source text given to an edited row.
const USER_SOURCE: &str = "user override (Diptych Settings)";

pub fn show(ui: &mut egui::Ui, eht: &mut EhtSettings, elements: &[Element]) {
    let builtin = match ParameterSet::builtin() {
        Ok(table) => table,
        Err(error) => {
            ui.colored_label(ui.visuals().error_fg_color, error.to_string());
            return;
        }
    };
    if elements.is_empty() {
        ui.weak("No atoms.");
        return;
    }
    for &element in elements {
        let position = eht.overrides.iter().position(|row| row.element == element);
        ui.horizontal(|ui| {
            let mut overridden = position.is_some();
            let toggle = ui.checkbox(&mut overridden, format!("override {}", element.symbol()));
            if toggle.changed() {
                match position {
                    Some(index) => {
                        eht.overrides.remove(index);
                    }
                    None => {
                        if let Some(row) = builtin.get(element) {
                            let mut copy = row.clone();
                            copy.source = USER_SOURCE.into();
                            eht.overrides.push(copy);
                        }
                    }
                }
            }
            if builtin.get(element).is_none() && position.is_none() {
                ui.weak("(no built-in parameters)");
            }
        });
        let Some(row) = eht.overrides.iter_mut().find(|row| row.element == element) else {
            continue;
        };
        egui::Grid::new(("parameter override", element.symbol()))
            .num_columns(3)
            .show(ui, |ui| {
                ui.weak("shell");
                ui.weak("H_ii (eV)");
                ui.weak("ζ (1/bohr)");
                ui.end_row();
                for shell in &mut row.shells {
                    let name = format!(
                        "{}{}{}",
                        element.symbol(),
                        shell.n,
                        ['s', 'p', 'd']
                            .get(usize::from(shell.l))
                            .copied()
                            .unwrap_or('?')
                    );
                    let label = ui.label(&name);
                    ui.add(
                        egui::DragValue::new(&mut shell.vsip)
                            .range(-60.0..=-0.5)
                            .speed(0.01)
                            .max_decimals(3),
                    )
                    .labelled_by(label.id);
                    ui.add(
                        egui::DragValue::new(&mut shell.zeta)
                            .range(0.1..=10.0)
                            .speed(0.005)
                            .max_decimals(4),
                    )
                    .labelled_by(label.id);
                    ui.end_row();
                }
            });
    }
}

/// The distinct elements of a molecule in order of first appearance.
pub fn elements_of(molecule: &diptych::chem::Molecule) -> Vec<Element> {
    let mut seen = Vec::new();
    for atom in &molecule.atoms {
        if !seen.contains(&atom.element) {
            seen.push(atom.element);
        }
    }
    seen
}
