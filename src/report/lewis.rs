//! Report tables of the localized picture's Lewis structure (bonds with their order and
//! Wiberg index, lone pairs, multicentre bonds, unpaired electrons, formal charges, the
//! Lewis share) and of the analysis's messages (stage errors and notes), shared by the
//! Markdown and CSV writers.

use crate::analysis::Analysis;
use crate::localized::MulticentreKind;

use super::tables::{Table, atom_name, fixed};

/// Every stage error and note, errors first.
pub fn messages_table(analysis: &Analysis) -> Table {
    let errors = analysis.errors.iter().map(|e| {
        vec![
            "error".to_string(),
            format!("{:?}", e.stage).to_lowercase(),
            e.message.clone(),
        ]
    });
    let notes = analysis.notes.iter().map(|n| {
        vec![
            "note".to_string(),
            format!("{:?}", n.stage).to_lowercase(),
            n.message.clone(),
        ]
    });
    Table {
        id: "messages",
        title: "Errors and notes",
        columns: vec!["kind", "stage", "message"],
        rows: errors.chain(notes).collect(),
    }
}

/// The Lewis structure read from the wavefunction, one row per item.
pub fn lewis_table(analysis: &Analysis) -> Table {
    let mut rows: Vec<Vec<String>> = Vec::new();
    if let Some(picture) = &analysis.picture {
        let lewis = &picture.lewis;
        let names = |atoms: &[usize]| {
            atoms
                .iter()
                .map(|&a| atom_name(analysis, a))
                .collect::<Vec<_>>()
                .join("–")
        };
        for bond in &lewis.bonds {
            let detail = format!("Wiberg index {}", fixed(bond.index, 3));
            rows.push(row(
                "bond",
                names(&bond.atoms),
                fixed(bond.order, 2),
                detail,
            ));
        }
        for pairs in &lewis.lone_pairs {
            let atom = atom_name(analysis, pairs.atom);
            rows.push(row(
                "lone_pairs",
                atom,
                pairs.count.to_string(),
                String::new(),
            ));
        }
        for bond in &lewis.multicentre {
            let kind = match bond.kind {
                MulticentreKind::Delocalized => "delocalized",
                MulticentreKind::ThreeCentreFourElectron => "three_centre_four_electron",
            };
            let electrons = fixed(bond.electrons, 2);
            rows.push(row(
                "multicentre",
                names(&bond.atoms),
                electrons,
                kind.into(),
            ));
        }
        for unpaired in &lewis.unpaired {
            let electrons = fixed(unpaired.electrons, 3);
            rows.push(row(
                "unpaired",
                names(&unpaired.atoms),
                electrons,
                String::new(),
            ));
        }
        for (atom, charge) in lewis.formal_charges.iter().enumerate() {
            let atom = atom_name(analysis, atom);
            rows.push(row("formal_charge", atom, fixed(*charge, 2), String::new()));
        }
        let share = fixed(lewis.lewis_share, 3);
        rows.push(row("lewis_share", String::new(), share, String::new()));
    }
    Table {
        id: "lewis",
        title: "Lewis structure (from the localized orbitals)",
        columns: vec!["item", "atoms", "value", "detail"],
        rows,
    }
}

fn row(item: &str, atoms: String, value: String, detail: String) -> Vec<String> {
    vec![item.to_string(), atoms, value, detail]
}
