//! The Inspector's "Lone-pair switch" section (DESIGN §4.6): the state and convention, one
//! checkbox per lone pair the switch could hold (a choice lone pair by lone pair, saved in
//! the project as an explicit list), and each held level's energy with mixing off and on.
//! The numbers come from `Analysis::run` (`analysis.lone_pair_switch`).

use diptych::analysis::{Analysis, SwitchSummary};
use diptych::diagram::style::format_energy;
use diptych::localized::held::{HeldLonePairs, HoldConvention, LonePairCandidate, LonePairRef};
use diptych::report::switch::held_atoms;
use diptych::report::tables::atom_name;
use eframe::egui;

/// What the user changed in the section, for the caller to apply as an undoable edit.
pub enum SwitchEdit {
    Held(HeldLonePairs),
    Convention(HoldConvention),
}

/// The section; returns the edit made, if any.
pub fn show(
    ui: &mut egui::Ui,
    analysis: &Analysis,
    selection: &HeldLonePairs,
) -> Option<SwitchEdit> {
    let summary = analysis.lone_pair_switch.as_ref()?;
    ui.strong("Lone-pair switch");
    let mut edit = None;
    let state = if summary.mixing { "on" } else { "off" };
    ui.label(format!(
        "Mixing {state}; {}.",
        summary.convention.description()
    ));
    if let Some(reason) = &summary.disabled {
        ui.label(egui::RichText::new(format!("Nothing held: {reason}.")).italics());
    }
    ui.horizontal(|ui| {
        ui.label("Hold");
        for convention in [HoldConvention::FirstOrder, HoldConvention::Hybrid] {
            let label = match convention {
                HoldConvention::FirstOrder => "p orbital",
                HoldConvention::Hybrid => "hybrid",
            };
            if ui
                .selectable_label(summary.convention == convention, label)
                .on_hover_text(convention.description())
                .clicked()
                && summary.convention != convention
            {
                edit = Some(SwitchEdit::Convention(convention));
            }
        }
    });
    if let Some(toggled) = choices(ui, analysis, summary) {
        edit = Some(SwitchEdit::Held(
            selection.toggled(&candidates(summary), toggled),
        ));
    }
    held_levels(ui, analysis, summary);
    edit
}

/// The lone pairs as candidates again (the summary lists them in ladder order).
fn candidates(summary: &SwitchSummary) -> Vec<LonePairCandidate> {
    summary
        .choices
        .iter()
        .map(|c| LonePairCandidate {
            lone_pair: c.lone_pair,
            level: 0,
            central: c.central,
        })
        .collect()
}

/// Above this many lone pairs the checkboxes fold away (SF6 has eighteen).
const FOLD_ABOVE: usize = 6;

/// One checkbox per lone pair, folded when there are many; returns the one clicked.
fn choices(ui: &mut egui::Ui, analysis: &Analysis, summary: &SwitchSummary) -> Option<LonePairRef> {
    if summary.choices.len() <= FOLD_ABOVE {
        return checkboxes(ui, analysis, summary);
    }
    let held = summary.choices.iter().filter(|c| c.held).count();
    let title = format!("Lone pairs ({held} of {} held)", summary.choices.len());
    egui::CollapsingHeader::new(title)
        .id_salt("lone pair choices")
        .show(ui, |ui| checkboxes(ui, analysis, summary))
        .body_returned
        .flatten()
}

fn checkboxes(
    ui: &mut egui::Ui,
    analysis: &Analysis,
    summary: &SwitchSummary,
) -> Option<LonePairRef> {
    let mut clicked = None;
    for choice in &summary.choices {
        let mut held = choice.held;
        let text = format!(
            "{} on {} (#{}){}",
            choice.label,
            atom_name(analysis, choice.lone_pair.atom),
            choice.lone_pair.index + 1,
            if choice.central { "" } else { ", terminal" }
        );
        if ui.checkbox(&mut held, text).changed() {
            clicked = Some(choice.lone_pair);
        }
    }
    clicked
}

/// Each held level: its atoms and its energy in both states.
fn held_levels(ui: &mut egui::Ui, analysis: &Analysis, summary: &SwitchSummary) {
    for level in &summary.held {
        ui.label(format!(
            "Held on {}: {} eV with mixing off, {} eV with mixing on",
            held_atoms(analysis, level),
            format_energy(level.energy_off_ev, 2),
            format_energy(level.energy_on_ev, 2)
        ));
    }
}
