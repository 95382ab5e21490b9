//! A short animation between two layouts of the Diagram (after the lone-pair switch is
//! flipped): levels, labels and correlation lines glide from where they were to where the
//! new analysis puts them, so the eye can follow which level moved. Pure geometry on the
//! library's `Diagram`; nothing is recomputed.

use std::collections::HashMap;

use diptych::diagram::layout::Diagram;

/// Length of the glide in seconds (short enough not to slow work down).
pub const TRANSITION_SECONDS: f64 = 0.45;

/// A running glide from an older layout.
#[derive(Clone, Debug)]
pub struct Transition {
    from: Diagram,
    started: f64,
}

impl Transition {
    pub fn new(from: Diagram, started: f64) -> Transition {
        Transition { from, started }
    }

    /// Progress in 0..=1 at time `now`.
    pub fn progress(&self, now: f64) -> f64 {
        ((now - self.started) / TRANSITION_SECONDS).clamp(0.0, 1.0)
    }

    pub fn finished(&self, now: f64) -> bool {
        self.progress(now) >= 1.0
    }

    /// The layout at time `now`: `to` with every level and line that also existed in the
    /// older layout placed part of the way between the two positions.
    pub fn frame(&self, to: &Diagram, now: f64) -> Diagram {
        blend(&self.from, to, ease(self.progress(now)))
    }
}

/// Smooth start and stop (cubic ease-in-out).
fn ease(t: f64) -> f64 {
    if t < 0.5 {
        4.0 * t * t * t
    } else {
        1.0 - (-2.0 * t + 2.0).powi(3) / 2.0
    }
}

fn lerp(a: f64, b: f64, t: f64) -> f64 {
    a + (b - a) * t
}

/// `to` with positions moved back toward `from` by (1 − t). Levels are matched by ladder
/// and key, lines by their two ends; anything new simply appears at its final place.
pub fn blend(from: &Diagram, to: &Diagram, t: f64) -> Diagram {
    let mut out = to.clone();
    for (ladder_index, ladder) in out.ladders.iter_mut().enumerate() {
        let Some(old_ladder) = from.ladders.get(ladder_index) else {
            continue;
        };
        let old: HashMap<usize, _> = old_ladder
            .levels
            .iter()
            .map(|level| (level.key, level))
            .collect();
        for level in &mut ladder.levels {
            if let Some(previous) = old.get(&level.key) {
                let label_offset = level.label_y - level.y;
                level.y = lerp(previous.y, level.y, t);
                level.x_left = lerp(previous.x_left, level.x_left, t);
                level.x_right = lerp(previous.x_right, level.x_right, t);
                level.label_y = level.y + label_offset;
            }
        }
    }
    let old_links: HashMap<(usize, usize), _> = from
        .links
        .iter()
        .map(|link| ((link.localized_key, link.delocalized_group), link))
        .collect();
    for link in &mut out.links {
        if let Some(previous) = old_links.get(&(link.localized_key, link.delocalized_group)) {
            link.from = (
                lerp(previous.from.0, link.from.0, t),
                lerp(previous.from.1, link.from.1, t),
            );
            link.to = (
                lerp(previous.to.0, link.to.0, t),
                lerp(previous.to.1, link.to.1, t),
            );
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use diptych::analysis::{Analysis, Settings};
    use diptych::diagram::{DiagramOptions, diagram_for};

    fn ammonia_diagrams() -> (Diagram, Diagram) {
        let molecule = crate::app::state::default_molecule();
        let mut settings = Settings::default();
        let mixed = Analysis::run(&molecule, &settings).expect("ammonia analyses");
        settings.lone_pair_mixing = false;
        let held = Analysis::run(&molecule, &settings).expect("ammonia analyses");
        // One shared energy window, as on screen, so the y values are comparable.
        let options = DiagramOptions {
            energy_window: Some((-35.0, 5.0)),
            ..DiagramOptions::default()
        };
        (diagram_for(&mixed, &options), diagram_for(&held, &options))
    }

    /// Every level's height and every line's ends (labels of hidden levels carry NaN
    /// positions, so whole layouts are not compared with ==).
    fn positions(diagram: &Diagram) -> Vec<f64> {
        let levels = diagram
            .ladders
            .iter()
            .flat_map(|ladder| ladder.levels.iter().map(|level| level.y));
        let links = diagram
            .links
            .iter()
            .flat_map(|link| [link.from.0, link.from.1, link.to.0, link.to.1]);
        levels.chain(links).collect()
    }

    #[test]
    fn ends_of_the_glide_are_the_two_layouts() {
        let (from, to) = ammonia_diagrams();
        assert!(positions(&blend(&from, &to, 1.0)) == positions(&to));
        assert!(
            positions(&from) != positions(&to),
            "the switch moves something"
        );
        let start = blend(&from, &to, 0.0);
        for (old, new) in from.ladders[0].levels.iter().zip(&start.ladders[0].levels) {
            assert!(
                (old.y - new.y).abs() < 1e-9,
                "level {} starts where it was",
                old.key
            );
        }
    }

    #[test]
    fn the_lone_pair_level_moves_monotonically() {
        let (from, to) = ammonia_diagrams();
        // The level that moves most between the two states is the lone-pair a1.
        let (key, distance) = to.ladders[0]
            .levels
            .iter()
            .filter_map(|level| {
                let old = from.ladders[0].levels.iter().find(|o| o.key == level.key)?;
                Some((level.key, (level.y - old.y).abs()))
            })
            .max_by(|a, b| a.1.total_cmp(&b.1))
            .expect("levels in both layouts");
        assert!(
            distance > 3.0,
            "the switch moves a level visibly ({distance})"
        );
        let transition = Transition::new(from.clone(), 10.0);
        let y_at = |now: f64| {
            transition.frame(&to, now).ladders[0]
                .levels
                .iter()
                .find(|level| level.key == key)
                .map(|level| level.y)
                .expect("level present")
        };
        let samples: Vec<f64> = (0..=10)
            .map(|step| y_at(10.0 + TRANSITION_SECONDS * step as f64 / 10.0))
            .collect();
        let direction = (samples[10] - samples[0]).signum();
        for pair in samples.windows(2) {
            assert!(
                (pair[1] - pair[0]) * direction >= -1e-9,
                "no overshoot: {samples:?}"
            );
        }
        assert!(transition.finished(10.0 + TRANSITION_SECONDS + 1e-9));
        assert!(!transition.finished(10.0 + TRANSITION_SECONDS / 2.0));
    }
}
