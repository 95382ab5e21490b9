//! The plain-text report for the terminal (`diptych analyze`): atoms, bonds, symmetry,
//! the MO table, the Lewis structure, hybrids and localized orbitals with their canonical
//! constituents, errors and notes.

use crate::analysis::{Analysis, LinkSummary};
use crate::diagram::style::lambda_text;

use super::tables::atom_name;

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
    text.push_str("\nBonds by distance (a first guess for drawing; the Lewis structure below is the wavefunction's)\n");
    if molecule.bonds.is_empty() {
        text.push_str("  (none)\n");
    }
    for bond in &molecule.bonds {
        let length = (molecule.atoms[bond.a].position - molecule.atoms[bond.b].position).norm();
        let aromatic = if bond.aromatic { " (aromatic)" } else { "" };
        text.push_str(&format!(
            "  {}{}–{}{}  order {}{aromatic}  {:.4} Å\n",
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
    text.push_str(&lewis_text(analysis));
    text.push_str(&hybrid_table(analysis));
    text.push_str(&localized_table(analysis));
    text.push_str(&switch_text(analysis));
    for error in &analysis.errors {
        text.push_str(&format!(
            "\n{:?} stage failed: {}\n",
            error.stage, error.message
        ));
    }
    if !analysis.notes.is_empty() {
        text.push_str("\nNotes\n");
        for note in &analysis.notes {
            text.push_str(&format!(
                "  [{}] {}\n",
                format!("{:?}", note.stage).to_lowercase(),
                note.message
            ));
        }
    }
    text
}

/// The Lewis structure read from the localized orbitals, one line per item (the same
/// rows as the report table).
fn lewis_text(analysis: &Analysis) -> String {
    let table = super::lewis::lewis_table(analysis);
    if table.rows.is_empty() {
        return String::new();
    }
    let mut text = format!("\n{}\n", table.title);
    for row in &table.rows {
        let detail = if row[3].is_empty() {
            String::new()
        } else {
            format!("  ({})", row[3])
        };
        text.push_str(&format!(
            "  {:<14} {:<14} {}{}\n",
            row[0], row[1], row[2], detail
        ));
    }
    text
}

/// The lone-pair switch, one line per row of its report table.
fn switch_text(analysis: &Analysis) -> String {
    let table = super::switch::switch_table(analysis);
    if table.rows.is_empty() {
        return String::new();
    }
    let mut text = format!("\n{}\n", table.title);
    for row in &table.rows {
        let energies = if row[3].is_empty() {
            String::new()
        } else {
            format!("  off {} eV, on {} eV", row[3], row[4])
        };
        text.push_str(&format!(
            "  {:<11} {:<16} {}{}\n",
            row[0], row[1], row[2], energies
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

/// Per centre: partner, λ, %s, hybrid energy, bending.
fn hybrid_table(analysis: &Analysis) -> String {
    if analysis.hybrid_entries.is_empty() {
        return String::new();
    }
    let mut text = String::from("\nHybrids (");
    text.push_str(analysis.hybrid_entries[0].model.as_str());
    text.push_str(
        " model)\n  centre  kind       partner  hybrid        %s    energy/eV  bending\n",
    );
    for entry in &analysis.hybrid_entries {
        text.push_str(&format!(
            "  {:<7} {:<10} {:<8} {:<12} {:>5.1}  {:>9}  {}\n",
            atom_name(analysis, entry.center),
            entry.kind.as_str(),
            entry.partner.map_or("–".into(), |p| atom_name(analysis, p)),
            lambda_text(entry.lambda),
            entry.s_percent,
            entry.energy_ev.map_or("–".into(), |e| format!("{e:.3}")),
            entry
                .bending_degrees
                .map_or("–".into(), |b| format!("{b:.1}°")),
        ));
    }
    text
}

/// Each localized orbital with its canonical constituents, then each canonical level with
/// the localized orbitals it feeds.
fn localized_table(analysis: &Analysis) -> String {
    if analysis.localized.is_empty() {
        return String::new();
    }
    let name = |canonical: usize| {
        analysis
            .orbitals
            .get(canonical)
            .and_then(|o| o.label.clone())
            .unwrap_or_else(|| format!("ψ{}", canonical + 1))
    };
    let mut text =
        String::from("\nLocalized orbitals and their canonical constituents (weights)\n");
    for (k, orbital) in analysis.localized.iter().enumerate() {
        let mut parts: Vec<&LinkSummary> = analysis
            .links
            .iter()
            .filter(|l| l.localized == k && l.weight >= 0.01)
            .collect();
        parts.sort_by(|a, b| b.weight.total_cmp(&a.weight));
        let list: Vec<String> = parts
            .iter()
            .map(|l| format!("{} {:.2}", name(l.canonical), l.weight))
            .collect();
        let atoms: Vec<String> = orbital
            .atoms
            .iter()
            .map(|&a| atom_name(analysis, a))
            .collect();
        text.push_str(&format!(
            "  {:<10} {:<8} {:>8.3} eV  occ {:.3} (Lewis {:.1})  captured {:.2}:  {}\n",
            orbital.label,
            atoms.join("–"),
            orbital.energy_ev,
            orbital.occupancy,
            orbital.lewis_occupancy,
            orbital.captured,
            list.join(", ")
        ));
    }
    text.push_str("\nCanonical levels and the localized orbitals they feed (weights)\n");
    let mut seen = Vec::new();
    for link in &analysis.links {
        if seen.contains(&link.canonical) {
            continue;
        }
        seen.push(link.canonical);
    }
    seen.sort_unstable();
    for canonical in seen {
        let mut parts: Vec<&LinkSummary> = analysis
            .links
            .iter()
            .filter(|l| l.canonical == canonical && l.weight >= 0.01)
            .collect();
        parts.sort_by(|a, b| b.weight.total_cmp(&a.weight));
        let list: Vec<String> = parts
            .iter()
            .map(|l| {
                let orbital = &analysis.localized[l.localized];
                let atoms: Vec<String> = orbital
                    .atoms
                    .iter()
                    .map(|&a| atom_name(analysis, a))
                    .collect();
                format!("{}[{}] {:.2}", orbital.label, atoms.join("–"), l.weight)
            })
            .collect();
        if !list.is_empty() {
            text.push_str(&format!("  {:<8} {}\n", name(canonical), list.join(", ")));
        }
    }
    text
}
