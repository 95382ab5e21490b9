//! The JSON report of DESIGN §5.5 (`serde_json`); the keys are documented in the README.
//! Atom indices are 0-based in file order.

use serde::Serialize;

use crate::analysis::{
    Analysis, HybridEntry, LinkSummary, LocalizedSummary, OrbitalSummary, StageError, StageNote,
    SwitchSummary,
};
use crate::localized::{LewisStructure, LocalizationMethod, LocalizedOrbital, SpaceReport};

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
    /// The order of one Kekulé structure for an aromatic bond.
    order: u8,
    /// Present (true) only for aromatic bonds of a molfile.
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    aromatic: bool,
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
    /// The lone-pair mixing switch (DESIGN §4.6) the orbitals were computed with.
    lone_pair_mixing: bool,
    /// Per orbital: its energy with the switch flipped minus its energy here (eV).
    level_shifts: &'a [f64],
    /// What the switch holds, each held level in both states, or why it is disabled.
    lone_pair_switch: Option<&'a SwitchSummary>,
    hybrids: &'a [HybridEntry],
    localized: &'a [LocalizedSummary],
    links: &'a [LinkSummary],
    /// The Lewis structure read from the localized orbitals (null without MOs).
    lewis: Option<&'a LewisStructure>,
    /// How the localized orbitals were found, and the orbitals themselves.
    localization: Option<LocalizationEntry<'a>>,
    errors: &'a [StageError],
    notes: &'a [StageNote],
}

#[derive(Serialize)]
struct LocalizationEntry<'a> {
    method: LocalizationMethod,
    exponent: u32,
    spaces: &'a [SpaceReport],
    orbitals: &'a [LocalizedOrbital],
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
                aromatic: bond.aromatic,
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
        lone_pair_mixing: analysis.settings.lone_pair_mixing,
        level_shifts: &analysis.level_shifts,
        lone_pair_switch: analysis.lone_pair_switch.as_ref(),
        hybrids: &analysis.hybrid_entries,
        localized: &analysis.localized,
        links: &analysis.links,
        lewis: analysis.picture.as_ref().map(|p| &p.lewis),
        localization: analysis.picture.as_ref().map(|p| LocalizationEntry {
            method: p.method,
            exponent: p.method.exponent(),
            spaces: &p.spaces,
            orbitals: &p.orbitals,
        }),
        errors: &analysis.errors,
        notes: &analysis.notes,
    };
    serde_json::to_string_pretty(&report)
        .unwrap_or_else(|error| format!("{{\"internal_error\": \"{error}\"}}"))
}
