//! The structure builder (DESIGN §2): an element palette, add a bonded atom along a free
//! valence direction (the parent stays selected), change element (its bond lengths reset),
//! delete, add or remove a bond and set its order; shape templates AXn with a central and a
//! ligand element and, for bent and pyramidal shapes, a live X–A–X angle. Every action is
//! an ordinary document edit (undoable); the geometry comes from the library.

use diptych::chem::Element;
use diptych::chem::templates::{Shape, build};
use eframe::egui;

use super::state::AppState;

/// Elements offered in the palette.
const PALETTE: [&str; 12] = [
    "H", "B", "C", "N", "O", "F", "Si", "P", "S", "Cl", "Br", "Se",
];

/// The builder's own choices (not part of the document).
pub struct BuilderState {
    pub element: Element,
    pub shape: Shape,
    pub central: Element,
    pub ligand: Element,
    pub angle: f64,
    /// True while the document is the template last applied, so the angle edits it live.
    pub template_live: bool,
    /// The other atom of the bond row (0-based) and the order to give that bond.
    pub bond_partner: usize,
    pub bond_order: u8,
}

impl Default for BuilderState {
    fn default() -> Self {
        BuilderState {
            element: Element::H,
            shape: Shape::Pyramidal,
            central: Element::N,
            ligand: Element::H,
            angle: 107.0,
            template_live: false,
            bond_partner: 0,
            bond_order: 1,
        }
    }
}

fn element_picker(ui: &mut egui::Ui, id: &str, value: &mut Element) {
    egui::ComboBox::from_id_salt(id)
        .selected_text(value.symbol())
        .width(52.0)
        .show_ui(ui, |ui| {
            for symbol in PALETTE {
                if let Ok(element) = Element::from_symbol(symbol) {
                    ui.selectable_value(value, element, symbol);
                }
            }
        });
}

pub fn show(ui: &mut egui::Ui, state: &mut AppState) {
    egui::CollapsingHeader::new("Build")
        .default_open(false)
        .show(ui, |ui| {
            ui.horizontal(|ui| {
                ui.label("Element");
                element_picker(ui, "builder element", &mut state.builder.element);
                let selected = state
                    .selected_atom
                    .filter(|&a| a < state.project.molecule.len());
                if ui
                    .add_enabled(selected.is_some(), egui::Button::new("Add bonded atom"))
                    .clicked()
                    && let Some(anchor) = selected
                {
                    // The parent stays selected, so repeated clicks add its ligands.
                    if let Err(error) = state
                        .project
                        .molecule
                        .add_bonded_atom(anchor, state.builder.element)
                    {
                        state.status = error.to_string();
                    }
                    state.builder.template_live = false;
                }
                if ui
                    .add_enabled(selected.is_some(), egui::Button::new("Change element"))
                    .clicked()
                    && let Some(atom) = selected
                {
                    if let Err(error) = state
                        .project
                        .molecule
                        .set_element(atom, state.builder.element)
                    {
                        state.status = error.to_string();
                    }
                    state.builder.template_live = false;
                }
                if ui
                    .add_enabled(
                        selected.is_some() && state.project.molecule.len() > 1,
                        egui::Button::new("Delete atom"),
                    )
                    .clicked()
                {
                    delete_selected(state);
                }
            });
            bond_row(ui, state);
            ui.separator();
            ui.horizontal_wrapped(|ui| {
                ui.label("Template");
                egui::ComboBox::from_id_salt("template shape")
                    .selected_text(state.builder.shape.name())
                    .show_ui(ui, |ui| {
                        for shape in Shape::ALL {
                            ui.selectable_value(&mut state.builder.shape, shape, shape.name());
                        }
                    });
                ui.label("A");
                element_picker(ui, "template centre", &mut state.builder.central);
                ui.label("X");
                element_picker(ui, "template ligand", &mut state.builder.ligand);
                if ui.button("Apply template").clicked() {
                    if let Some((_, _, default)) = state.builder.shape.angle_range()
                        && !state.builder.template_live
                    {
                        state.builder.angle = default;
                    }
                    apply_template(state);
                }
            });
            if let Some((low, high, _)) = state.builder.shape.angle_range() {
                let label = ui.label("X–A–X angle (°)");
                let slider = ui
                    .add(egui::Slider::new(&mut state.builder.angle, low..=high).fixed_decimals(1))
                    .labelled_by(label.id);
                if slider.changed() && state.builder.template_live {
                    apply_template(state);
                }
            }
        });
}

/// Bond from the selected atom to another: its order (1 to 3), or "none" to remove it.
fn bond_row(ui: &mut egui::Ui, state: &mut AppState) {
    let Some(atom) = state
        .selected_atom
        .filter(|&a| a < state.project.molecule.len())
    else {
        return;
    };
    let last = state.project.molecule.len().saturating_sub(1);
    ui.horizontal(|ui| {
        let label = ui.label(format!("Bond from atom {atom} to atom"));
        ui.add(egui::DragValue::new(&mut state.builder.bond_partner).range(0..=last))
            .labelled_by(label.id);
        let order = &mut state.builder.bond_order;
        let name = |order: u8| match order {
            0 => "none".to_string(),
            n => format!("order {n}"),
        };
        egui::ComboBox::from_id_salt("bond order")
            .selected_text(name(*order))
            .show_ui(ui, |ui| {
                for choice in 0..=3 {
                    ui.selectable_value(order, choice, name(choice));
                }
            });
        let partner = state.builder.bond_partner;
        if ui
            .add_enabled(partner != atom, egui::Button::new("Set bond"))
            .clicked()
        {
            let (molecule, order) = (&mut state.project.molecule, state.builder.bond_order);
            if let Err(error) = molecule.set_bond_order(atom, partner, order) {
                state.status = error.to_string();
            }
            state.builder.template_live = false;
        }
    });
}

fn apply_template(state: &mut AppState) {
    let builder = &state.builder;
    let mut molecule = build(
        builder.shape,
        builder.central,
        builder.ligand,
        builder.angle,
    );
    molecule.charge = state.project.molecule.charge;
    state.project.molecule = molecule;
    state.builder.template_live = true;
    state.selected_atom = None;
}

/// Deletes the selected atom (also the Delete key).
pub fn delete_selected(state: &mut AppState) {
    let Some(atom) = state.selected_atom else {
        return;
    };
    if state.project.molecule.len() <= 1 {
        state.status = "The last atom cannot be deleted.".into();
        return;
    }
    match state.project.molecule.remove_atom(atom) {
        Ok(()) => state.selected_atom = None,
        Err(error) => state.status = error.to_string(),
    }
    state.builder.template_live = false;
}
