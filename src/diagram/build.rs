//! Turns an `Analysis` into the two ladder inputs and links of the layout: canonical MOs
//! (degenerate sets grouped) on the left, localized orbitals on the right, correlation
//! lines above the user's weight threshold.

use crate::analysis::Analysis;
use crate::localized::held::HoldConvention;
use crate::project::LadderTitles;
use crate::report::tables::atom_name;

use super::layout::{
    Caption, Diagram, LadderInput, LevelInput, LinkInput, default_window, layout_in,
};

/// Orbitals closer than this (eV) are drawn as one degenerate set (the solver's own
/// tolerance for sharing electrons in a set).
pub const DEGENERACY_EV: f64 = crate::eht::DEGENERACY_TOLERANCE_EV;

/// What the user chose to show.
#[derive(Clone, Debug, PartialEq)]
pub struct DiagramOptions {
    pub titles: LadderTitles,
    /// Correlation lines with a smaller weight are left out.
    pub link_threshold: f64,
    /// Virtual levels up to this many eV above the LUMO are shown.
    pub virtual_span_ev: f64,
    /// A zoomed energy window (eV, low to high); None fits all occupied levels.
    pub energy_window: Option<(f64, f64)>,
}

impl Default for DiagramOptions {
    fn default() -> Self {
        DiagramOptions {
            titles: LadderTitles::default(),
            link_threshold: 0.05,
            virtual_span_ev: 8.0,
            energy_window: None,
        }
    }
}

/// Offset that keeps localized keys apart from canonical ones.
pub const LOCALIZED_KEY_OFFSET: usize = 1_000_000;

/// The diagram of an analysis.
pub fn diagram_for(analysis: &Analysis, options: &DiagramOptions) -> Diagram {
    let mut group_of = Vec::with_capacity(analysis.orbitals.len());
    let mut group = 0;
    for (n, orbital) in analysis.orbitals.iter().enumerate() {
        // A set is one energy and one label: an accidental degeneracy of two irreps (water's
        // 3a1 and 1b1 with both lone pairs held) is two sets, each with its label.
        let previous = n.checked_sub(1).map(|p| &analysis.orbitals[p]);
        if previous.is_some_and(|p| {
            (orbital.energy_ev - p.energy_ev).abs() > DEGENERACY_EV
                || (orbital.label.is_some() && orbital.label != p.label)
        }) {
            group += 1;
        }
        group_of.push(group);
    }
    let delocalized = LadderInput {
        title: options.titles.delocalized.clone(),
        levels: analysis
            .orbitals
            .iter()
            .zip(&group_of)
            .map(|(orbital, &group)| LevelInput {
                energy_ev: orbital.energy_ev,
                occupancy: orbital.occupancy,
                label: orbital
                    .label
                    .clone()
                    .unwrap_or_else(|| format!("ψ{}", orbital.index + 1)),
                group,
                key: orbital.index,
                shift_ev: analysis
                    .level_shifts
                    .get(orbital.index)
                    .copied()
                    .unwrap_or(0.0),
            })
            .collect(),
    };
    // Equivalent localized orbitals (same label, same energy: the three σ(N–H) of
    // ammonia) are drawn side by side like a degenerate set.
    let mut localized_groups: Vec<(String, f64, usize)> = Vec::new();
    let localized = LadderInput {
        title: options.titles.localized.clone(),
        levels: analysis
            .localized
            .iter()
            .enumerate()
            .map(|(n, level)| {
                let existing = localized_groups
                    .iter()
                    .find(|(label, energy, _)| {
                        *label == level.label && (energy - level.energy_ev).abs() < DEGENERACY_EV
                    })
                    .map(|(_, _, group)| *group);
                let group = existing.unwrap_or_else(|| {
                    localized_groups.push((
                        level.label.clone(),
                        level.energy_ev,
                        LOCALIZED_KEY_OFFSET + n,
                    ));
                    LOCALIZED_KEY_OFFSET + n
                });
                // Electrons are drawn as the Lewis structure places them (2, 1, 0); the
                // level's true occupancy in the canonical density (1.995 for a σ bond,
                // 0.005 for its σ*) is in the Inspector and the reports.
                LevelInput {
                    energy_ev: level.energy_ev,
                    occupancy: level.lewis_occupancy,
                    label: level.label.clone(),
                    group,
                    key: LOCALIZED_KEY_OFFSET + n,
                    shift_ev: 0.0,
                }
            })
            .collect(),
    };
    // Sum weights over each degenerate set (DESIGN §4.6), then apply the threshold.
    // A map finds each pair's entry (a linear search was quadratic: C60 has 12 000 weights).
    let mut links: Vec<LinkInput> = Vec::new();
    let mut position: std::collections::HashMap<(usize, usize), usize> =
        std::collections::HashMap::new();
    for link in &analysis.links {
        let Some(&target) = group_of.get(link.canonical) else {
            continue;
        };
        let key = LOCALIZED_KEY_OFFSET + link.localized;
        match position.get(&(key, target)) {
            Some(&n) => links[n].weight += link.weight,
            None => {
                position.insert((key, target), links.len());
                links.push(LinkInput {
                    localized_key: key,
                    delocalized_group: target,
                    weight: link.weight,
                });
            }
        }
    }
    links.retain(|l| l.weight >= options.link_threshold);
    let ladders = [delocalized, localized];
    let window = options
        .energy_window
        .unwrap_or_else(|| default_window(&ladders, options.virtual_span_ev));
    let mut diagram = layout_in(&ladders, &links, window);
    diagram.caption = caption(analysis, &diagram);
    diagram
}

/// The switch's state and, when levels carry dotted marks, their legend.
fn caption(analysis: &Analysis, diagram: &Diagram) -> Caption {
    let mixing = analysis.settings.lone_pair_mixing;
    let shifted = diagram
        .ladders
        .iter()
        .any(|ladder| ladder.levels.iter().any(|level| level.shifted_y.is_some()));
    let shift_legend = shifted.then(|| {
        format!(
            "dotted bars: the levels with mixing {} (shift in eV)",
            if mixing { "off" } else { "on" }
        )
    });
    Caption {
        switch_state: switch_state(analysis),
        shift_legend,
    }
}

/// "Lone-pair mixing off: n(N) on N0 held non-bonding (its centre's p orbital)", or why
/// nothing is held when mixing is off; None when there is nothing to say.
fn switch_state(analysis: &Analysis) -> Option<String> {
    let mixing = analysis.settings.lone_pair_mixing;
    let switch = analysis.lone_pair_switch.as_ref()?;
    if let Some(reason) = &switch.disabled {
        return (!mixing).then(|| format!("Lone-pair mixing off, nothing held: {reason}"));
    }
    if mixing {
        return Some("Lone-pair mixing on".to_string());
    }
    // "n(N) on N0", or "2 n(O) on O0" for two lone pairs of one atom.
    let mut held: Vec<(String, usize)> = Vec::new();
    for choice in switch.choices.iter().filter(|c| c.held) {
        let name = format!(
            "{} on {}",
            choice.label,
            atom_name(analysis, choice.lone_pair.atom)
        );
        match held.iter_mut().find(|(known, _)| *known == name) {
            Some((_, count)) => *count += 1,
            None => held.push((name, 1)),
        }
    }
    let held: Vec<String> = held
        .into_iter()
        .map(|(name, count)| {
            if count > 1 {
                format!("{count} {name}")
            } else {
                name
            }
        })
        .collect();
    let what = match switch.convention {
        HoldConvention::FirstOrder => "its centre's p orbital",
        HoldConvention::Hybrid => "its hybrid",
    };
    Some(format!(
        "Lone-pair mixing off: {} held non-bonding ({what})",
        held.join(", ")
    ))
}
