//! Undo and redo for every edit of the document: snapshots of the whole project, taken by
//! comparing the document before and after each frame, so no edit can bypass the history.
//! Bursts of typing in one text field are merged into one step.

use diptych::project::Project;

/// Most steps kept; older ones are dropped.
const MAX_STEPS: usize = 200;
/// Changes closer together than this (s) that touch only the titles merge into one step.
const MERGE_WINDOW: f64 = 1.0;

#[derive(Default)]
pub struct History {
    undo: Vec<Project>,
    redo: Vec<Project>,
    last_title_edit: Option<f64>,
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
    } else if before != after {
        Change::Presentation
    } else {
        Change::None
    }
}

impl History {
    /// Records `before` as an undo step for a change made at time `now` (seconds).
    pub fn record(&mut self, before: Project, after: &Project, now: f64) {
        let titles_only = before.titles != after.titles
            && Project {
                titles: after.titles.clone(),
                ..before.clone()
            } == *after;
        let merge = titles_only && self.last_title_edit.is_some_and(|t| now - t < MERGE_WINDOW);
        self.last_title_edit = titles_only.then_some(now);
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
        self.last_title_edit = None;
        Some(previous)
    }

    pub fn redo(&mut self, current: &Project) -> Option<Project> {
        let next = self.redo.pop()?;
        self.undo.push(current.clone());
        self.last_title_edit = None;
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
