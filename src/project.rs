//! The project document (`*.diptych.ron`, DESIGN §5.2): the molecule with its charge and
//! bonds, the analysis settings, the two ladder titles and view options, with a `version`
//! field. Stored as RON (Rusty Object Notation, an open text format) and written
//! atomically (temporary file + rename), so a crash never leaves half a project.
//!
//! Reading is strict: a field this build does not know is an error naming the field and
//! its line (a misspelled setting must never pass unnoticed; `ron_error.rs` says reading
//! errors in plain words), and every value is range-checked before use (`check.rs`).

mod check;
pub(crate) mod ron_error;

pub use check::{K_RANGE, MAX_SWEEPS};

use std::path::Path;

use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::analysis::Settings;
use crate::chem::io::{read_text, write_atomically};
use crate::chem::molecule::Molecule;

/// The project format this build writes and the newest it reads.
pub const PROJECT_VERSION: u32 = 1;
/// File-name ending of project documents.
pub const PROJECT_EXTENSION: &str = ".diptych.ron";

/// Default title of the delocalized ladder (DESIGN §2).
pub const DEFAULT_DELOCALIZED_TITLE: &str = "Delocalized (symmetry MOs)";
/// Default title of the localized ladder (DESIGN §2).
pub const DEFAULT_LOCALIZED_TITLE: &str = "Localized (directed hybrids)";

/// The user's names for the two ladders of the Diagram.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct LadderTitles {
    pub delocalized: String,
    pub localized: String,
}

impl Default for LadderTitles {
    fn default() -> Self {
        LadderTitles {
            delocalized: DEFAULT_DELOCALIZED_TITLE.into(),
            localized: DEFAULT_LOCALIZED_TITLE.into(),
        }
    }
}

/// Display options kept with the document.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct ViewOptions {
    pub show_energies: bool,
    /// Correlation lines below this weight are hidden.
    pub link_threshold: f64,
    pub dark_theme: bool,
}

impl Default for ViewOptions {
    fn default() -> Self {
        ViewOptions {
            show_energies: true,
            link_threshold: 0.05,
            dark_theme: false,
        }
    }
}

/// Everything a user saves.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Project {
    pub version: u32,
    pub molecule: Molecule,
    #[serde(default)]
    pub settings: Settings,
    #[serde(default)]
    pub titles: LadderTitles,
    #[serde(default)]
    pub view: ViewOptions,
    /// The orbital shown in the Inspector, by its label.
    #[serde(default)]
    pub selected_orbital: Option<String>,
    /// Measured vertical ionization energies of the molecule with their source (for series).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub ionization: Option<crate::series::measured::IonizationRecord>,
}

/// A project file that could not be read or written.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ProjectError {
    #[error("cannot read the project: {0}")]
    Read(String),
    #[error("line {line}, column {column}: {message}")]
    Syntax {
        line: usize,
        column: usize,
        message: String,
    },
    #[error("{0}")]
    OutOfRange(String),
    #[error(
        "the project was written by a newer Diptych (format version {found}; this build reads up to {PROJECT_VERSION})"
    )]
    TooNew { found: u32 },
    #[error("the project has format version 0, which no Diptych writes")]
    InvalidVersion,
    #[error("the project's molecule is invalid: {0}")]
    InvalidMolecule(String),
    #[error("cannot save the project to '{path}': {message}")]
    Write { path: String, message: String },
}

/// Just the version, read before the rest so that a future format gets a clear message.
#[derive(Deserialize)]
struct VersionProbe {
    version: u32,
}

impl Project {
    /// A new project around `molecule` with default settings and titles.
    pub fn new(molecule: Molecule) -> Project {
        Project {
            version: PROJECT_VERSION,
            molecule,
            settings: Settings::default(),
            titles: LadderTitles::default(),
            view: ViewOptions::default(),
            selected_orbital: None,
            ionization: None,
        }
    }

    /// Parses project text, checking the version first and every value after.
    pub fn from_ron(text: &str) -> Result<Project, ProjectError> {
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let probe: VersionProbe = ron::from_str(text).map_err(syntax)?;
        if probe.version == 0 {
            return Err(ProjectError::InvalidVersion);
        }
        if probe.version > PROJECT_VERSION {
            return Err(ProjectError::TooNew {
                found: probe.version,
            });
        }
        let project: Project = ron::from_str(text).map_err(syntax)?;
        check::check(&project)?;
        Ok(project)
    }

    /// Reads a project file.
    pub fn load(path: &Path) -> Result<Project, ProjectError> {
        let text = read_text(path).map_err(|error| ProjectError::Read(error.to_string()))?;
        Project::from_ron(&text)
    }

    /// The document as pretty RON text. Fails only for values RON cannot write, which
    /// must never reach a file as an empty document.
    pub fn to_ron(&self) -> Result<String, ProjectError> {
        let config = ron::ser::PrettyConfig::new()
            .depth_limit(4)
            .indentor("  ".to_string());
        ron::ser::to_string_pretty(self, config).map_err(|error| ProjectError::Write {
            path: String::new(),
            message: one_line(&error.to_string()),
        })
    }

    /// Writes the project atomically (temporary file + rename).
    pub fn save(&self, path: &Path) -> Result<(), ProjectError> {
        let failed = |message: String| ProjectError::Write {
            path: path.display().to_string(),
            message,
        };
        let text = self.to_ron().map_err(|error| match error {
            ProjectError::Write { message, .. } => failed(message),
            other => other,
        })?;
        write_atomically(path, text.as_bytes()).map_err(|error| failed(error.reason()))
    }
}

/// Whether a path names a project document.
pub fn is_project_path(path: &Path) -> bool {
    path.to_str()
        .is_some_and(|s| s.to_ascii_lowercase().ends_with(PROJECT_EXTENSION))
}

/// A RON reading error as line, column and plain words.
fn syntax(error: ron::error::SpannedError) -> ProjectError {
    let (line, column, message) = ron_error::plain(&error);
    ProjectError::Syntax {
        line,
        column,
        message: one_line(&message),
    }
}

/// Error texts from RON can span lines; messages here are one line each.
fn one_line(text: &str) -> String {
    text.split_whitespace().collect::<Vec<_>>().join(" ")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::{Atom, Element};

    fn ammonia() -> Molecule {
        Molecule::new(
            "ammonia",
            vec![
                Atom::new(Element::N, [0.0, 0.0, 0.1]),
                Atom::new(Element::H, [0.94, 0.0, -0.27]),
                Atom::new(Element::H, [-0.47, 0.81, -0.27]),
                Atom::new(Element::H, [-0.47, -0.81, -0.27]),
            ],
            0,
        )
    }

    type TestResult = Result<(), Box<dyn std::error::Error>>;

    #[test]
    fn round_trip_through_a_file() -> TestResult {
        let mut project = Project::new(ammonia());
        project.titles.delocalized = "Symmetry <MOs> & \"friends\" — σ/π 軌道".into();
        project.selected_orbital = Some("3a1".into());
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("nh3.diptych.ron");
        project.save(&path)?;
        let again = Project::load(&path)?;
        assert_eq!(again, project);
        // No temporary file is left behind.
        assert_eq!(std::fs::read_dir(folder.path())?.count(), 1);
        Ok(())
    }

    #[test]
    fn future_versions_are_refused_clearly() -> TestResult {
        let text = Project::new(ammonia())
            .to_ron()?
            .replacen("version: 1", "version: 7", 1);
        assert_eq!(
            Project::from_ron(&text),
            Err(ProjectError::TooNew { found: 7 })
        );
        Ok(())
    }

    #[test]
    fn missing_optional_sections_take_defaults() -> TestResult {
        let full = Project::new(ammonia());
        let text = format!(
            "(version: 1, molecule: {})",
            ron::to_string(&full.molecule)?
        );
        let project = Project::from_ron(&text)?;
        assert_eq!(project.titles, LadderTitles::default());
        Ok(())
    }

    #[test]
    fn damaged_text_is_an_error() -> TestResult {
        let text = Project::new(ammonia()).to_ron()?;
        let cut = &text[..text.len() / 2];
        assert!(matches!(
            Project::from_ron(cut),
            Err(ProjectError::Syntax { .. })
        ));
        Ok(())
    }

    #[test]
    fn an_unwritable_molecule_is_an_error_not_an_empty_file() -> TestResult {
        let mut project = Project::new(ammonia());
        project.molecule.atoms[0].position.x = f64::INFINITY;
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("bad.diptych.ron");
        assert!(
            matches!(project.save(&path), Err(ProjectError::Write { .. })) || {
                // RON may write "inf"; then the file must still read back as this project's
                // invalid molecule, never as an empty document.
                matches!(Project::load(&path), Err(ProjectError::InvalidMolecule(_)))
            }
        );
        Ok(())
    }
}

/// A file opened by the user: a project, or a molecule file wrapped in a new project.
#[derive(Debug, Clone, PartialEq)]
pub struct Opened {
    pub project: Project,
    /// Things worth telling the user that did not stop the reading.
    pub notices: Vec<String>,
}

/// Why a file could not be opened.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum OpenError {
    #[error("{path}: {source}")]
    Molecule {
        path: String,
        source: crate::chem::io::ParseError,
    },
    #[error("{path}: {source}")]
    Project { path: String, source: ProjectError },
    #[error("{path}: {source}")]
    Invalid {
        path: String,
        source: crate::chem::molecule::MoleculeError,
    },
}

/// Opens a project (`*.diptych.ron`) or a molecule file (XYZ, molfile).
pub fn open_path(path: &Path) -> Result<Opened, OpenError> {
    let shown = path.display().to_string();
    if is_project_path(path) {
        let project = Project::load(path).map_err(|source| OpenError::Project {
            path: shown,
            source,
        })?;
        return Ok(Opened {
            project,
            notices: Vec::new(),
        });
    }
    let parsed =
        crate::chem::io::read_molecule_file(path).map_err(|source| OpenError::Molecule {
            path: shown.clone(),
            source,
        })?;
    parsed
        .molecule
        .validate()
        .map_err(|source| OpenError::Invalid {
            path: shown,
            source,
        })?;
    Ok(Opened {
        project: Project::new(parsed.molecule),
        notices: parsed.notices,
    })
}
