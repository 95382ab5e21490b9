//! The lone-pair switch's table of the text, Markdown and CSV reports (DESIGN §4.6): the
//! state and convention, each lone pair the switch could hold, and each held level's
//! energy with mixing off and on.

use super::tables::{Table, atom_name, fixed};
use crate::analysis::{Analysis, HeldLevel};

/// The atoms of a held level by name ("O0", "N0 N3").
pub fn held_atoms(analysis: &Analysis, level: &HeldLevel) -> String {
    let names: Vec<String> = level
        .atoms
        .iter()
        .map(|&a| atom_name(analysis, a))
        .collect();
    names.join(" ")
}

/// One row per lone pair the switch could hold, then one per held level; empty without a
/// localized picture.
pub fn switch_table(analysis: &Analysis) -> Table {
    let mut rows = Vec::new();
    if let Some(summary) = &analysis.lone_pair_switch {
        let state = if summary.mixing { "on" } else { "off" };
        rows.push(vec![
            "mixing".to_string(),
            state.to_string(),
            summary.convention.description().to_string(),
            String::new(),
            String::new(),
        ]);
        if let Some(reason) = &summary.disabled {
            rows.push(vec![
                "disabled".to_string(),
                String::new(),
                reason.clone(),
                String::new(),
                String::new(),
            ]);
        }
        for choice in &summary.choices {
            let atom = atom_name(analysis, choice.lone_pair.atom);
            rows.push(vec![
                "lone_pair".to_string(),
                format!("{} {atom} #{}", choice.label, choice.lone_pair.index + 1),
                if choice.held { "held" } else { "free" }.to_string(),
                String::new(),
                String::new(),
            ]);
        }
        for level in &summary.held {
            rows.push(vec![
                "held_level".to_string(),
                held_atoms(analysis, level),
                fixed(level.occupancy, 2),
                fixed(level.energy_off_ev, 3),
                fixed(level.energy_on_ev, 3),
            ]);
        }
    }
    Table {
        id: "lone_pair_switch",
        title: "Lone-pair switch",
        columns: vec!["item", "what", "state", "energy_off_ev", "energy_on_ev"],
        rows,
    }
}
