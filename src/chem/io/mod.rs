//! Reading and writing molecule files: XYZ and MDL molfile V2000.
//!
//! Every parse error names the 1-based line number and what was expected there.

pub mod molfile;
pub mod xyz;

use std::path::Path;

use thiserror::Error;

use super::molecule::Molecule;

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

/// Bytes to text; a NUL byte or invalid UTF-8 means a binary file.
pub fn text_from_bytes(bytes: &[u8]) -> Result<String, ParseError> {
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
        .to_string();
    match format {
        MoleculeFormat::Xyz => xyz::parse_xyz(&text, &name),
        MoleculeFormat::Molfile => molfile::parse_molfile(&text, &name),
    }
}

/// Writes `contents` to `path` atomically: a temporary file in the same folder, flushed,
/// then renamed over the target, so a crash never leaves a half-written file.
pub fn write_atomically(path: &Path, contents: &[u8]) -> std::io::Result<()> {
    use std::io::Write;
    let folder = match path.parent() {
        Some(parent) if !parent.as_os_str().is_empty() => parent.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    let file_name = path
        .file_name()
        .ok_or_else(|| std::io::Error::new(std::io::ErrorKind::InvalidInput, "no file name"))?;
    let temporary = folder.join(format!(
        ".{}.{}.tmp",
        file_name.to_string_lossy(),
        std::process::id()
    ));
    let result = (|| {
        let mut file = std::fs::File::create(&temporary)?;
        file.write_all(contents)?;
        file.sync_all()?;
        std::fs::rename(&temporary, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&temporary);
    }
    result
}
