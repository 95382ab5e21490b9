//! Text and JSON reports of an `Analysis` (DESIGN §5.5). The JSON keys are documented in
//! the README; atom indices are 0-based in file order.

use serde::Serialize;

use crate::analysis::{Analysis, OrbitalSummary, StageError};

#[derive(Serialize)]
struct AtomEntry {
    index: usize,
    element: &'static str,
    x: f64,
    y: f64,
    z: f64,
}

#[derive(Serialize)]
struct BondEntry {
    a: usize,
    b: usize,
    order: u8,
    length: f64,
}

#[derive(Serialize)]
struct MoleculeEntry {
    name: String,
    formula: String,
    charge: i32,
    electrons: usize,
    atoms: Vec<AtomEntry>,
    bonds: Vec<BondEntry>,
}

#[derive(Serialize)]
struct JsonReport<'a> {
    molecule: MoleculeEntry,
    /// Schoenflies symbol ("C3v", "C∞v"); null if detection failed.
    point_group: Option<String>,
    symmetry: Option<&'a crate::symmetry::SymmetrySummary>,
    electrons: usize,
    orbitals: &'a [OrbitalSummary],
    /// Mulliken charge per atom (null when the MO stage failed).
    charges: Option<&'a [f64]>,
    /// Σ occupancy × energy over the occupied orbitals (eV).
    sum_occupied_energy_ev: Option<f64>,
    open_shell: Option<bool>,
    errors: &'a [StageError],
}

fn molecule_entry(analysis: &Analysis) -> MoleculeEntry {
    let molecule = &analysis.molecule;
    MoleculeEntry {
        name: molecule.name.clone(),
        formula: analysis.formula.clone(),
        charge: molecule.charge,
        electrons: analysis.electrons,
        atoms: molecule
            .atoms
            .iter()
            .enumerate()
            .map(|(index, atom)| AtomEntry {
                index,
                element: atom.element.symbol(),
                x: atom.position.x,
                y: atom.position.y,
                z: atom.position.z,
            })
            .collect(),
        bonds: molecule
            .bonds
            .iter()
            .map(|bond| BondEntry {
                a: bond.a,
                b: bond.b,
                order: bond.order,
                length: (molecule.atoms[bond.a].position - molecule.atoms[bond.b].position).norm(),
            })
            .collect(),
    }
}

/// The analysis as a pretty-printed JSON document.
pub fn to_json(analysis: &Analysis) -> String {
    let report = JsonReport {
        molecule: molecule_entry(analysis),
        point_group: analysis
            .symmetry
            .as_ref()
            .map(|found| found.group.to_string()),
        symmetry: analysis.symmetry_summary.as_ref(),
        electrons: analysis.electrons,
        orbitals: &analysis.orbitals,
        charges: analysis.eht.as_ref().map(|eht| eht.charges()),
        sum_occupied_energy_ev: analysis.eht.as_ref().map(|eht| eht.sum_occupied_energy),
        open_shell: analysis.eht.as_ref().map(|eht| eht.open_shell),
        errors: &analysis.errors,
    };
    serde_json::to_string_pretty(&report)
        .unwrap_or_else(|error| format!("{{\"internal_error\": \"{error}\"}}"))
}

/// The analysis as a plain-text report for the terminal.
pub fn to_text(analysis: &Analysis) -> String {
    let molecule = &analysis.molecule;
    let mut text = String::new();
    text.push_str(&format!(
        "{} ({}), charge {}, {} valence electrons\n\n",
        molecule.name, analysis.formula, molecule.charge, analysis.electrons
    ));
    text.push_str("Atoms (Å)\n");
    for (index, atom) in molecule.atoms.iter().enumerate() {
        text.push_str(&format!(
            "  {index:>3} {:<2} {:>11.5} {:>11.5} {:>11.5}\n",
            atom.element.symbol(),
            atom.position.x,
            atom.position.y,
            atom.position.z
        ));
    }
    text.push_str("\nBonds\n");
    if molecule.bonds.is_empty() {
        text.push_str("  (none)\n");
    }
    for bond in &molecule.bonds {
        let length = (molecule.atoms[bond.a].position - molecule.atoms[bond.b].position).norm();
        text.push_str(&format!(
            "  {}{}–{}{}  order {}  {:.4} Å\n",
            molecule.atoms[bond.a].element,
            bond.a,
            molecule.atoms[bond.b].element,
            bond.b,
            bond.order,
            length
        ));
    }
    if let Some(summary) = &analysis.symmetry_summary {
        text.push_str(&symmetry_text(analysis, summary));
    }
    if let Some(eht) = &analysis.eht {
        text.push_str(&orbital_table(analysis, eht));
    }
    for error in &analysis.errors {
        text.push_str(&format!(
            "\n{:?} stage failed: {}\n",
            error.stage, error.message
        ));
    }
    text
}

/// The MO table: energy, occupancy, label and the largest AO contributions.
fn orbital_table(analysis: &Analysis, eht: &crate::eht::EhtResult) -> String {
    let mut text = String::from("\nMolecular orbitals (extended Hückel, eV)\n");
    text.push_str("    #   energy   occ  label   largest contributions (Mulliken gross shares)\n");
    for orbital in analysis.orbitals.iter().rev() {
        let parts: Vec<String> = orbital
            .composition
            .iter()
            .take(3)
            .filter(|part| part.share.abs() >= 0.05)
            .map(|part| {
                let element = analysis.molecule.atoms[part.atom].element;
                format!(
                    "{:.0}% {}{} {}",
                    100.0 * part.share,
                    element,
                    part.atom,
                    part.orbital
                )
            })
            .collect();
        text.push_str(&format!(
            "  {:>3} {:>8.3} {:>5.2}  {:<6}  {}\n",
            orbital.index,
            orbital.energy_ev,
            orbital.occupancy,
            orbital.label.as_deref().unwrap_or("–"),
            parts.join(", ")
        ));
    }
    if eht.open_shell {
        text.push_str("  (open shell: a partly filled degenerate set shares its electrons)\n");
    }
    text
}

fn symmetry_text(analysis: &Analysis, summary: &crate::symmetry::SymmetrySummary) -> String {
    let mut text = format!(
        "\nPoint group {} (order {}, tolerance {} Å)\n",
        summary.point_group, summary.order, summary.tolerance
    );
    if let Some(centre) = summary.central_atom {
        let element = analysis.molecule.atoms[centre].element;
        for (shell, irreps) in &summary.central_orbitals {
            text.push_str(&format!(
                "  central atom {element}{centre} {shell}: {irreps}\n"
            ));
        }
    }
    if let Some(ligands) = &summary.ligand_sigma {
        text.push_str(&format!("  ligand σ SALCs: {ligands}\n"));
    }
    for note in &summary.notes {
        text.push_str(&format!("  note: {note}\n"));
    }
    text
}
