//! Autosave and recovery (DESIGN §5.2): while the document has unsaved changes it is
//! written to a recovery file every 60 s; on the next start, a leftover recovery file is
//! offered for restoring. A clean save or a clean exit removes it.

use std::path::{Path, PathBuf};

use diptych::project::Project;

/// Seconds of unsaved changes between two autosaves.
pub const AUTOSAVE_SECONDS: f64 = 60.0;

/// Where the recovery file lives: $DIPTYCH_RECOVERY_DIR, else the XDG data folder
/// ($XDG_DATA_HOME or ~/.local/share) under `diptych/`.
pub fn default_path() -> Option<PathBuf> {
    let folder = std::env::var_os("DIPTYCH_RECOVERY_DIR")
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("XDG_DATA_HOME").map(|d| PathBuf::from(d).join("diptych")))
        .or_else(|| {
            std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".local/share/diptych"))
        })?;
    Some(folder.join("recovery.diptych.ron"))
}

/// Writes the project to the recovery file (creating its folder); errors are returned as
/// text for the status bar — autosave must never interrupt the user.
pub fn write(path: &Path, project: &Project) -> Result<(), String> {
    if let Some(folder) = path.parent() {
        std::fs::create_dir_all(folder).map_err(|e| e.to_string())?;
    }
    project.save(path).map_err(|e| e.to_string())
}

/// The recovered project, if a readable recovery file exists.
pub fn read(path: &Path) -> Option<Project> {
    path.exists().then(|| Project::load(path).ok()).flatten()
}

pub fn remove(path: &Path) {
    let _ = std::fs::remove_file(path);
}
