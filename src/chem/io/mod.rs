//! Reading and writing molecule files: XYZ and MDL molfile V2000; `write` is the one
//! writer of every output file.
//!
//! Every parse error names the 1-based line number and what was expected there.

pub mod molfile;
pub mod write;
pub mod xyz;

use std::path::Path;

use thiserror::Error;

use super::molecule::Molecule;
pub use write::{Overwrite, WriteError, check_target, write_file};

/// A file that could not be read as a molecule.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ParseError {
    #[error("line {line}: {message}")]
    Line { line: usize, message: String },
    #[error("the file is empty")]
    Empty,
    #[error("the file is not text (UTF-8): {0}")]
    NotText(String),
    #[error("cannot read '{path}': {message}")]
    Io { path: String, message: String },
    #[error("unknown file type '{0}' (expected .xyz, .mol, .sdf or .diptych.ron)")]
    UnknownFormat(String),
}

impl ParseError {
    pub(crate) fn at(line: usize, message: impl Into<String>) -> ParseError {
        ParseError::Line {
            line,
            message: message.into(),
        }
    }
}

/// What was read, plus notices that do not stop the reading (e.g. skipped frames).
#[derive(Debug, Clone, PartialEq)]
pub struct Parsed {
    pub molecule: Molecule,
    pub notices: Vec<String>,
}

/// Molecule file formats known by extension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MoleculeFormat {
    Xyz,
    Molfile,
}

impl MoleculeFormat {
    /// The format implied by a file name, if it is a molecule format.
    pub fn from_path(path: &Path) -> Option<MoleculeFormat> {
        let extension = path.extension()?.to_str()?.to_ascii_lowercase();
        match extension.as_str() {
            "xyz" => Some(MoleculeFormat::Xyz),
            "mol" | "sdf" | "mdl" => Some(MoleculeFormat::Molfile),
            _ => None,
        }
    }
}

/// Reads a file's bytes as UTF-8 text, rejecting binary content clearly.
pub fn read_text(path: &Path) -> Result<String, ParseError> {
    let bytes = std::fs::read(path).map_err(|error| ParseError::Io {
        path: path.display().to_string(),
        message: error.to_string(),
    })?;
    text_from_bytes(&bytes)
}

/// Bytes to text; a NUL byte or invalid UTF-8 means a binary file. A UTF-8 byte-order
/// mark (EF BB BF, which some editors write) is skipped.
pub fn text_from_bytes(bytes: &[u8]) -> Result<String, ParseError> {
    let bytes = bytes.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(bytes);
    if bytes.contains(&0) {
        return Err(ParseError::NotText("it contains NUL bytes".into()));
    }
    String::from_utf8(bytes.to_vec()).map_err(|error| {
        ParseError::NotText(format!(
            "invalid UTF-8 at byte {}",
            error.utf8_error().valid_up_to()
        ))
    })
}

/// Reads a molecule from an XYZ or molfile, chosen by extension.
pub fn read_molecule_file(path: &Path) -> Result<Parsed, ParseError> {
    let format = MoleculeFormat::from_path(path)
        .ok_or_else(|| ParseError::UnknownFormat(path.display().to_string()))?;
    let text = read_text(path)?;
    let name = path
        .file_stem()
        .and_then(|s| s.to_str())
        .unwrap_or("molecule")
        .chars()
        // A name taken from the file name is cut to the limit, not refused.
        .take(super::molecule::MAX_NAME_CHARACTERS)
        .collect::<String>();
    match format {
        MoleculeFormat::Xyz => xyz::parse_xyz(&text, &name),
        MoleculeFormat::Molfile => molfile::parse_molfile(&text, &name),
    }
}

/// Writes `contents` to `path`, replacing what is there: [`write::write_file`] with
/// [`Overwrite::Replace`] (temporary file, then a rename that keeps the old permissions).
pub fn write_atomically(path: &Path, contents: &[u8]) -> Result<(), WriteError> {
    write::write_file(path, contents, Overwrite::Replace)
}
