//! The series document (`*.diptych-series.ron`, RON like the single-molecule project, with
//! a `version` field, read strictly and written atomically): a title and a list of members,
//! each a molecule file or project (path relative to the series file) or an embedded
//! molecule, with optional settings, the donor choice and the measured ionization energies.

use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};
use thiserror::Error;

use super::measured::IonizationRecord;
use super::{DonorChoice, SeriesInput};
use crate::analysis::Settings;
use crate::chem::io::{read_text, write_atomically};
use crate::chem::molecule::Molecule;
use crate::project::open_path;

/// The series format this build writes and the newest it reads.
pub const SERIES_VERSION: u32 = 1;
/// File-name ending of series documents.
pub const SERIES_EXTENSION: &str = ".diptych-series.ron";
/// Longest title (characters).
pub const MAX_TITLE_CHARS: usize = 200;
/// Longest member label (characters): it is drawn beside a plot point.
pub const MAX_LABEL_CHARS: usize = 40;

/// Where a member's molecule comes from.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub enum MemberSource {
    /// A molecule file or project, relative to the series file (or absolute).
    File(PathBuf),
    /// A molecule kept in the series document itself.
    Embedded(Molecule),
}

/// One molecule of a series document.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SeriesMember {
    pub source: MemberSource,
    /// Settings for this member; `None`: the project's own (for a project file) or the
    /// defaults.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub settings: Option<Settings>,
    #[serde(default)]
    pub donor: DonorChoice,
    /// Name on the table and plots (at most [`MAX_LABEL_CHARS`] characters); `None`: the
    /// formula as chemists write it.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub label: Option<String>,
    /// Measured vertical ionization energies; `None`: the project's own, else the bundled
    /// table.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub ionization: Option<IonizationRecord>,
}

/// A saved series.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SeriesProject {
    pub version: u32,
    #[serde(default)]
    pub title: String,
    pub members: Vec<SeriesMember>,
}

/// A series document that cannot be read, resolved or written.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SeriesFileError {
    #[error("cannot read the series: {0}")]
    Read(String),
    #[error("the series file is damaged: {0}")]
    Damaged(String),
    #[error("the series was written by a newer Diptych (format version {0})")]
    TooNew(u32),
    #[error("the series is invalid: {0}")]
    Invalid(String),
    #[error("member {index}: {message}")]
    Member { index: usize, message: String },
    #[error("cannot save the series to '{path}': {message}")]
    Write { path: String, message: String },
}

#[derive(Deserialize)]
struct VersionProbe {
    version: u32,
}

fn one_line(text: &str) -> String {
    text.split_whitespace().collect::<Vec<_>>().join(" ")
}

/// A RON reading error as line, column and plain words (the project reader's wording).
fn damaged(error: ron::error::SpannedError) -> SeriesFileError {
    let (line, column, message) = crate::project::ron_error::plain(&error);
    SeriesFileError::Damaged(format!(
        "line {line}, column {column}: {}",
        one_line(&message)
    ))
}

impl SeriesProject {
    /// Parses series text: the version first, then everything, then the limits.
    pub fn from_ron(text: &str) -> Result<SeriesProject, SeriesFileError> {
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let probe: VersionProbe = ron::from_str(text).map_err(damaged)?;
        if probe.version == 0 || probe.version > SERIES_VERSION {
            return Err(SeriesFileError::TooNew(probe.version));
        }
        let series: SeriesProject = ron::from_str(text).map_err(damaged)?;
        series.check()?;
        Ok(series)
    }

    /// The limits: 1 to `MAX_MOLECULES` members, a short title, valid embedded molecules
    /// and measured values.
    pub fn check(&self) -> Result<(), SeriesFileError> {
        super::check_size(self.members.len())
            .map_err(|e| SeriesFileError::Invalid(e.to_string()))?;
        if self.title.chars().count() > MAX_TITLE_CHARS {
            return Err(SeriesFileError::Invalid(format!(
                "the title is longer than {MAX_TITLE_CHARS} characters"
            )));
        }
        for (index, member) in self.members.iter().enumerate() {
            let fail = |message: String| SeriesFileError::Member { index, message };
            if let MemberSource::Embedded(molecule) = &member.source {
                molecule.validate().map_err(|e| fail(e.to_string()))?;
            }
            if let Some(label) = &member.label
                && label.chars().count() > MAX_LABEL_CHARS
            {
                return Err(fail(format!(
                    "the label is longer than {MAX_LABEL_CHARS} characters"
                )));
            }
            if let Some(record) = &member.ionization {
                record.check().map_err(|e| fail(e.to_string()))?;
            }
        }
        Ok(())
    }

    /// Reads a series file.
    pub fn load(path: &Path) -> Result<SeriesProject, SeriesFileError> {
        let text = read_text(path).map_err(|e| SeriesFileError::Read(e.to_string()))?;
        SeriesProject::from_ron(&text)
    }

    /// The document as pretty RON text.
    pub fn to_ron(&self) -> Result<String, SeriesFileError> {
        let config = ron::ser::PrettyConfig::new()
            .depth_limit(4)
            .indentor("  ".to_string());
        ron::ser::to_string_pretty(self, config).map_err(|e| SeriesFileError::Write {
            path: String::new(),
            message: one_line(&e.to_string()),
        })
    }

    /// Writes the series atomically.
    pub fn save(&self, path: &Path) -> Result<(), SeriesFileError> {
        let text = self.to_ron()?;
        write_atomically(path, text.as_bytes()).map_err(|e| SeriesFileError::Write {
            path: path.display().to_string(),
            message: e.reason(),
        })
    }

    /// Every member read and ready for `series::compare`; files are found relative to
    /// `folder` (the series file's folder).
    pub fn inputs(&self, folder: &Path) -> Result<Vec<SeriesInput>, SeriesFileError> {
        self.members
            .iter()
            .enumerate()
            .map(|(index, member)| {
                member_input(member, folder)
                    .map_err(|message| SeriesFileError::Member { index, message })
            })
            .collect()
    }
}

/// One member as an analysis input.
fn member_input(member: &SeriesMember, folder: &Path) -> Result<SeriesInput, String> {
    let (molecule, settings, record) = match &member.source {
        MemberSource::Embedded(molecule) => (molecule.clone(), Settings::default(), None),
        MemberSource::File(path) => {
            let full = if path.is_absolute() {
                path.clone()
            } else {
                folder.join(path)
            };
            let opened = open_path(&full).map_err(|e| e.to_string())?;
            let project = opened.project;
            (project.molecule, project.settings, project.ionization)
        }
    };
    let record = member.ionization.clone().or(record);
    Ok(SeriesInput {
        molecule,
        settings: member.settings.clone().unwrap_or(settings),
        donor: member.donor.clone(),
        label: member.label.clone(),
        measured: record.as_ref().and_then(IonizationRecord::first),
    })
}

/// Whether a path names a series document.
pub fn is_series_path(path: &Path) -> bool {
    path.to_str()
        .is_some_and(|s| s.to_ascii_lowercase().ends_with(SERIES_EXTENSION))
}

/// A series of the given files (paths as given), default donors, no measured overrides.
pub fn of_files(title: &str, files: &[PathBuf]) -> SeriesProject {
    SeriesProject {
        version: SERIES_VERSION,
        title: title.to_string(),
        members: files
            .iter()
            .map(|file| SeriesMember {
                source: MemberSource::File(file.clone()),
                settings: None,
                donor: DonorChoice::Auto,
                label: None,
                ionization: None,
            })
            .collect(),
    }
}
