//! The report's tables as plain rows of text, shared by the Markdown and CSV writers:
//! the molecule, the canonical MOs (energy, occupancy, label, composition as Mulliken
//! gross shares, R. S. Mulliken, J. Chem. Phys. 23, 1833 (1955)), the hybrids per centre
//! (partner, λ of spλ with ∞ for a pure p orbital, %s, energy, bending), the localized
//! orbitals and the correlation weights; the messages and the Lewis structure come from
//! `super::lewis`. Numbers use an ASCII minus and fixed decimals so
//! that spreadsheets read them; atom indices are 0-based in file order, as in the JSON.

use crate::analysis::Analysis;

/// One table of the report.
#[derive(Clone, Debug, PartialEq)]
pub struct Table {
    /// Machine name, used as the `table` column of the CSV.
    pub id: &'static str,
    /// Heading in the Markdown report.
    pub title: &'static str,
    pub columns: Vec<&'static str>,
    pub rows: Vec<Vec<String>>,
}

/// Shares below this are left out of the composition column (as in the text report).
const COMPOSITION_CUTOFF: f64 = 0.05;
/// λ at or above this is printed as ∞ (a pure p orbital), as `style::lambda_text` does.
const PURE_P_LAMBDA: f64 = 1e3;

/// "N0" for atom 0 being nitrogen; "?7" for an index outside the molecule.
pub fn atom_name(analysis: &Analysis, atom: usize) -> String {
    analysis
        .molecule
        .atoms
        .get(atom)
        .map_or_else(|| format!("?{atom}"), |a| format!("{}{atom}", a.element))
}

/// All tables of the report, in order.
pub fn tables(analysis: &Analysis) -> Vec<Table> {
    vec![
        super::lewis::messages_table(analysis),
        molecule_table(analysis),
        orbital_table(analysis),
        super::lewis::lewis_table(analysis),
        hybrid_table(analysis),
        localized_table(analysis),
        super::switch::switch_table(analysis),
        weight_table(analysis),
    ]
}

/// A number with fixed decimals, never "-0.000".
pub(super) fn fixed(value: f64, decimals: usize) -> String {
    let text = format!("{value:.decimals$}");
    // "-0.000" reads as a sign where there is none.
    if text.starts_with('-') && text[1..].chars().all(|c| c == '0' || c == '.') {
        text[1..].to_string()
    } else {
        text
    }
}

fn optional(value: Option<f64>, decimals: usize) -> String {
    value.map_or_else(String::new, |v| fixed(v, decimals))
}

fn molecule_table(analysis: &Analysis) -> Table {
    let molecule = &analysis.molecule;
    let point_group = analysis
        .symmetry
        .as_ref()
        .map_or_else(String::new, |found| found.group.to_string());
    let rows = [
        ("name", molecule.name.clone()),
        ("formula", analysis.formula.clone()),
        ("charge", molecule.charge.to_string()),
        ("electrons", analysis.electrons.to_string()),
        ("point_group", point_group),
        (
            "hybrid_model",
            analysis.settings.hybrid.model.as_str().to_string(),
        ),
        (
            "lone_pair_mixing",
            analysis.settings.lone_pair_mixing.to_string(),
        ),
        (
            "localization",
            analysis
                .settings
                .localization
                .method
                .description()
                .to_string(),
        ),
    ];
    Table {
        id: "molecule",
        title: "Molecule",
        columns: vec!["property", "value"],
        rows: rows
            .into_iter()
            .map(|(key, value)| vec![key.to_string(), value])
            .collect(),
    }
}

fn orbital_table(analysis: &Analysis) -> Table {
    let rows = analysis
        .orbitals
        .iter()
        .map(|orbital| {
            let composition: Vec<String> = orbital
                .composition
                .iter()
                .filter(|part| part.share.abs() >= COMPOSITION_CUTOFF)
                .map(|part| {
                    format!(
                        "{} {} {:.0}%",
                        atom_name(analysis, part.atom),
                        part.orbital,
                        100.0 * part.share
                    )
                })
                .collect();
            vec![
                orbital.index.to_string(),
                fixed(orbital.energy_ev, 3),
                fixed(orbital.occupancy, 2),
                orbital.irrep.clone().unwrap_or_default(),
                orbital.label.clone().unwrap_or_default(),
                composition.join("; "),
            ]
        })
        .collect();
    Table {
        id: "canonical_mos",
        title: "Canonical molecular orbitals (extended Hückel)",
        columns: vec![
            "index",
            "energy_ev",
            "occupancy",
            "irrep",
            "label",
            "composition",
        ],
        rows,
    }
}

fn lambda_cell(lambda: Option<f64>) -> String {
    match lambda {
        Some(value) if value < PURE_P_LAMBDA => fixed(value, 3),
        _ => "∞".into(),
    }
}

fn hybrid_table(analysis: &Analysis) -> Table {
    let mut entries: Vec<_> = analysis.hybrid_entries.iter().collect();
    // Grouped per centre; the analysis's own order inside a centre.
    entries.sort_by_key(|entry| entry.center);
    let rows = entries
        .into_iter()
        .map(|entry| {
            vec![
                atom_name(analysis, entry.center),
                entry.kind.as_str().to_string(),
                entry
                    .partner
                    .map_or_else(String::new, |p| atom_name(analysis, p)),
                lambda_cell(entry.lambda),
                fixed(entry.s_percent, 1),
                fixed(entry.p_percent, 1),
                fixed(entry.d_percent, 1),
                fixed(entry.share, 3),
                optional(entry.energy_ev, 3),
                optional(entry.bending_degrees, 1),
                entry.model.as_str().to_string(),
            ]
        })
        .collect();
    Table {
        id: "hybrids",
        title: "Hybrids per centre",
        columns: vec![
            "centre",
            "kind",
            "partner",
            "lambda",
            "s_percent",
            "p_percent",
            "d_percent",
            "share",
            "energy_ev",
            "bending_degrees",
            "model",
        ],
        rows,
    }
}

fn localized_table(analysis: &Analysis) -> Table {
    let rows = analysis
        .localized
        .iter()
        .enumerate()
        .map(|(index, orbital)| {
            let atoms: Vec<String> = orbital
                .atoms
                .iter()
                .map(|&a| atom_name(analysis, a))
                .collect();
            vec![
                index.to_string(),
                orbital.label.clone(),
                orbital.kind.as_str().to_string(),
                atoms.join("–"),
                fixed(orbital.energy_ev, 3),
                fixed(orbital.occupancy, 3),
                fixed(orbital.lewis_occupancy, 2),
                fixed(orbital.captured, 3),
            ]
        })
        .collect();
    Table {
        id: "localized",
        title: "Localized orbitals",
        columns: vec![
            "index",
            "label",
            "kind",
            "atoms",
            "energy_ev",
            "occupancy",
            "lewis_occupancy",
            "captured",
        ],
        rows,
    }
}

fn weight_table(analysis: &Analysis) -> Table {
    let canonical_label = |index: usize| {
        analysis
            .orbitals
            .get(index)
            .and_then(|o| o.label.clone())
            .unwrap_or_default()
    };
    let rows = analysis
        .links
        .iter()
        .map(|link| {
            vec![
                link.localized.to_string(),
                analysis
                    .localized
                    .get(link.localized)
                    .map_or_else(String::new, |l| l.label.clone()),
                link.canonical.to_string(),
                canonical_label(link.canonical),
                fixed(link.weight, 4),
            ]
        })
        .collect();
    Table {
        id: "correlation_weights",
        title: "Correlation weights (localized ↔ canonical)",
        columns: vec![
            "localized",
            "localized_label",
            "canonical",
            "canonical_label",
            "weight",
        ],
        rows,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_are_fixed_and_never_negative_zero() {
        assert_eq!(fixed(-0.0004, 3), "0.000");
        assert_eq!(fixed(-13.7246, 3), "-13.725");
        assert_eq!(lambda_cell(None), "∞");
        assert_eq!(lambda_cell(Some(1e6)), "∞");
        assert_eq!(lambda_cell(Some(2.8752)), "2.875");
    }
}
