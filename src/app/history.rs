//! Undo and redo for every edit of the document: snapshots of the whole project, taken by
//! comparing the document before and after each frame, so no edit can bypass the history.
//! Bursts (typing a title, dragging a slider) are merged into one step.

use diptych::project::Project;

/// Most steps kept; older ones are dropped.
const MAX_STEPS: usize = 200;
/// Changes of one burst kind closer together than this (s) merge into one step.
const MERGE_WINDOW: f64 = 1.0;

#[derive(Default)]
pub struct History {
    undo: Vec<Project>,
    redo: Vec<Project>,
    /// Kind and time of the last recorded change, for merging bursts.
    last_burst: Option<(Burst, f64)>,
}

/// Changes that come in bursts (typing a title, dragging a slider or a number) and are
/// merged into one undo step when they follow each other closely.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Burst {
    Titles,
    Geometry,
}

fn burst_of(before: &Project, after: &Project) -> Option<Burst> {
    let same_except_titles = Project {
        titles: after.titles.clone(),
        ..before.clone()
    } == *after;
    if before.titles != after.titles && same_except_titles {
        return Some(Burst::Titles);
    }
    let same_atoms_kinds = before.molecule.atoms.len() == after.molecule.atoms.len()
        && before
            .molecule
            .atoms
            .iter()
            .zip(&after.molecule.atoms)
            .all(|(a, b)| a.element == b.element);
    let mut moved = before.clone();
    for (atom, new) in moved.molecule.atoms.iter_mut().zip(&after.molecule.atoms) {
        atom.position = new.position;
    }
    (same_atoms_kinds && moved == *after).then_some(Burst::Geometry)
}

/// What changed between two states of the document.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Change {
    None,
    /// Titles or view options only: the diagram is laid out again.
    Presentation,
    /// Molecule or settings: the analysis must run again.
    Document,
}

pub fn classify(before: &Project, after: &Project) -> Change {
    if before.molecule != after.molecule || before.settings != after.settings {
        Change::Document
    } else if !same_presentation(before, after) {
        Change::Presentation
    } else {
        Change::None
    }
}

/// Everything but the molecule and settings is equal, the theme aside: the theme is how
/// the window looks, not part of the work, so it makes no undo step and no unsaved mark.
/// Written out field by field, so that a new field must be placed here to compile.
fn same_presentation(before: &Project, after: &Project) -> bool {
    let Project {
        version,
        molecule: _,
        settings: _,
        titles,
        view,
        selected_orbital,
        ionization,
    } = before;
    let diptych::project::ViewOptions {
        show_energies,
        link_threshold,
        dark_theme: _,
    } = view;
    *version == after.version
        && *titles == after.titles
        && *selected_orbital == after.selected_orbital
        && *ionization == after.ionization
        && *show_energies == after.view.show_energies
        && *link_threshold == after.view.link_threshold
}

impl History {
    /// Records `before` as an undo step for a change made at time `now` (seconds).
    pub fn record(&mut self, before: Project, after: &Project, now: f64) {
        let burst = burst_of(&before, after);
        let merge = burst.is_some()
            && self
                .last_burst
                .is_some_and(|(kind, time)| Some(kind) == burst && now - time < MERGE_WINDOW);
        self.last_burst = burst.map(|kind| (kind, now));
        self.redo.clear();
        if merge {
            return;
        }
        self.undo.push(before);
        if self.undo.len() > MAX_STEPS {
            self.undo.remove(0);
        }
    }

    /// The state to go back to, given the current one (which becomes redoable).
    pub fn undo(&mut self, current: &Project) -> Option<Project> {
        let previous = self.undo.pop()?;
        self.redo.push(current.clone());
        self.last_burst = None;
        Some(previous)
    }

    pub fn redo(&mut self, current: &Project) -> Option<Project> {
        let next = self.redo.pop()?;
        self.undo.push(current.clone());
        self.last_burst = None;
        Some(next)
    }

    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }

    /// Forgets everything (a new document was opened).
    pub fn clear(&mut self) {
        *self = History::default();
    }
}
