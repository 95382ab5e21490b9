//! Nothing silent (DESIGN §3): the stage errors and notes of the analysis on screen, in a
//! collapsible strip under the Diagram (open whenever there is something new to say) and
//! as a count in the status bar. A failed newer analysis is said here too; the last good
//! result stays on screen.

use std::hash::{Hash, Hasher};

use diptych::analysis::{Analysis, Stage};
use eframe::egui;

/// Tallest the strip's list grows before it scrolls, in points: the ladders keep the rest.
const MAX_LIST_HEIGHT: f32 = 96.0;

/// What a stage is called on screen.
pub fn stage_name(stage: Stage) -> &'static str {
    match stage {
        Stage::Symmetry => "Symmetry",
        Stage::Orbitals => "Orbitals",
        Stage::Hybrids => "Hybrids",
        Stage::Localization => "Localized picture",
        Stage::Links => "Correlation lines",
    }
}

/// One line of the strip.
struct Line {
    error: bool,
    text: String,
}

fn lines(analysis: Option<&Analysis>, failed: Option<&str>) -> Vec<Line> {
    let mut lines = Vec::new();
    if let Some(message) = failed {
        lines.push(Line {
            error: true,
            text: format!(
                "The latest change could not be analysed: {message}. The diagram shows the last good result."
            ),
        });
    }
    if let Some(analysis) = analysis {
        for error in &analysis.errors {
            lines.push(Line {
                error: true,
                text: format!("{} failed: {}", stage_name(error.stage), error.message),
            });
        }
        for note in &analysis.notes {
            lines.push(Line {
                error: false,
                text: format!("{}: {}", stage_name(note.stage), note.message),
            });
        }
    }
    lines
}

/// "2 errors, 3 notes", or None when there is nothing to say.
fn tally(errors: usize, notes: usize) -> Option<String> {
    let plural = |n: usize, word: &str| format!("{n} {word}{}", if n == 1 { "" } else { "s" });
    match (errors, notes) {
        (0, 0) => None,
        (0, n) => Some(plural(n, "note")),
        (e, 0) => Some(plural(e, "error")),
        (e, n) => Some(format!("{}, {}", plural(e, "error"), plural(n, "note"))),
    }
}

/// The strip: a bottom panel inside the Diagram panel, to be shown before the diagram so
/// that the diagram takes the space above it.
pub fn strip(ui: &mut egui::Ui, analysis: Option<&Analysis>, failed: Option<&str>) {
    let lines = lines(analysis, failed);
    egui::Panel::bottom("analysis notes")
        .resizable(false)
        .show(ui, |ui| {
            let errors = lines.iter().filter(|line| line.error).count();
            let Some(count) = tally(errors, lines.len() - errors) else {
                ui.weak("No notes: every stage ran without remarks.");
                return;
            };
            // A new set of messages gets a new header, open by default; the user's
            // collapsing holds while the messages stay the same.
            let mut hasher = std::collections::hash_map::DefaultHasher::new();
            for line in &lines {
                line.text.hash(&mut hasher);
            }
            let header = egui::RichText::new(format!("Notes on this analysis ({count})"));
            let header = if errors > 0 {
                header.color(ui.visuals().error_fg_color)
            } else {
                header
            };
            egui::CollapsingHeader::new(header)
                .id_salt(("analysis notes", hasher.finish()))
                .default_open(true)
                .show(ui, |ui| {
                    egui::ScrollArea::vertical()
                        .max_height(MAX_LIST_HEIGHT)
                        .auto_shrink([false, true])
                        .show(ui, |ui| show_lines(ui, &lines));
                });
        });
}

fn show_lines(ui: &mut egui::Ui, lines: &[Line]) {
    ui.spacing_mut().item_spacing.y = 2.0;
    let error_colour = ui.visuals().error_fg_color;
    for line in lines {
        let text = egui::RichText::new(&line.text).small();
        let text = if line.error {
            text.color(error_colour)
        } else {
            text
        };
        ui.add(egui::Label::new(text).wrap());
    }
}

/// The status bar's count, e.g. "2 notes about the localized picture — see the Diagram",
/// or None when the analysis has nothing to say.
pub fn status_summary(analysis: &Analysis) -> Option<String> {
    let count = tally(analysis.errors.len(), analysis.notes.len())?;
    let localized =
        |stage: Stage| matches!(stage, Stage::Hybrids | Stage::Localization | Stage::Links);
    let all_localized = analysis.errors.iter().all(|e| localized(e.stage))
        && analysis.notes.iter().all(|n| localized(n.stage));
    let topic = if all_localized {
        "about the localized picture"
    } else {
        "about this analysis"
    };
    Some(format!("{count} {topic} — see the Diagram"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_tally_counts_errors_and_notes_in_words() {
        assert_eq!(tally(0, 0), None);
        assert_eq!(tally(0, 1).as_deref(), Some("1 note"));
        assert_eq!(tally(2, 0).as_deref(), Some("2 errors"));
        assert_eq!(tally(1, 3).as_deref(), Some("1 error, 3 notes"));
    }
}
