//! The one writer of every output file (reports, figures, scans, maps, screenshots,
//! projects). Two steps: [`check_target`] before any work (the folder exists and takes a
//! file, nothing is in the way unless replacing is allowed), then [`write_file`], whose
//! last step is exclusive. The bytes go to a new temporary file in the target's folder,
//! flushed to disk, and then
//! - without replacing: the temporary file is hard-linked to the target name, which the
//!   operating system refuses if anything at all is there (a file created meanwhile, a
//!   dangling symbolic link), so nothing is ever replaced by surprise; where the file
//!   system has no hard links, the target is opened create-new instead (equally exclusive,
//!   not atomic);
//! - with replacing: the temporary file takes the old file's permissions and is renamed
//!   over it, so a read-only file stays read-only.
//!
//! Method: POSIX link(2) fails with EEXIST on any existing name; rename(2) replaces
//! atomically (both in IEEE Std 1003.1-2017). Source: common practice, no source.

use std::fs::{File, OpenOptions};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicUsize, Ordering};

use thiserror::Error;

/// Whether an existing file at the target may be replaced.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Overwrite {
    /// Something at the target (even a dangling link) stops the write.
    Refuse,
    /// An existing file is replaced; its permissions are kept.
    Replace,
}

/// Why an output could not be written. Every message names the path.
#[derive(Debug, Error)]
pub enum WriteError {
    #[error("'{0}' exists")]
    Exists(String),
    #[error("'{0}' is a folder, not a file")]
    IsFolder(String),
    #[error("cannot write '{path}': {reason}")]
    Unwritable { path: String, reason: String },
}

impl WriteError {
    /// What went wrong, without the path (for messages that name the path already).
    pub fn reason(&self) -> String {
        match self {
            WriteError::Unwritable { reason, .. } => reason.clone(),
            WriteError::Exists(_) => "a file of that name exists".into(),
            WriteError::IsFolder(_) => "it is a folder".into(),
        }
    }

    fn unwritable(path: &Path, reason: impl std::fmt::Display) -> WriteError {
        WriteError::Unwritable {
            path: path.display().to_string(),
            reason: reason.to_string(),
        }
    }
}

/// The folder a path's file goes into (the current folder for a bare name).
fn folder_of(path: &Path) -> PathBuf {
    match path.parent() {
        Some(parent) if !parent.as_os_str().is_empty() => parent.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// A fresh temporary name beside `path`, unique within this process.
fn temporary_name(path: &Path) -> Result<PathBuf, WriteError> {
    static COUNTER: AtomicUsize = AtomicUsize::new(0);
    let name = path
        .file_name()
        .ok_or_else(|| WriteError::unwritable(path, "the path has no file name"))?;
    let serial = COUNTER.fetch_add(1, Ordering::Relaxed);
    Ok(folder_of(path).join(format!(
        ".{}.{}-{serial}.tmp",
        name.to_string_lossy(),
        std::process::id()
    )))
}

/// Checks, before any work, that `path` can be written: its folder exists and takes a new
/// file, and nothing is at `path` (a dangling link counts) unless `overwrite` allows it.
pub fn check_target(path: &Path, overwrite: Overwrite) -> Result<(), WriteError> {
    let shown = || path.display().to_string();
    if let Ok(metadata) = std::fs::symlink_metadata(path) {
        if metadata.is_dir() {
            return Err(WriteError::IsFolder(shown()));
        }
        if overwrite == Overwrite::Refuse {
            return Err(WriteError::Exists(shown()));
        }
    }
    let folder = folder_of(path);
    if !folder.is_dir() {
        return Err(WriteError::unwritable(
            path,
            format!("the folder '{}' does not exist", folder.display()),
        ));
    }
    // A probe file: a read-only folder or a full disk is found now, not after the work.
    let probe = temporary_name(path)?;
    File::options()
        .write(true)
        .create_new(true)
        .open(&probe)
        .map_err(|error| WriteError::unwritable(path, error))?;
    let _ = std::fs::remove_file(&probe);
    Ok(())
}

/// Writes `bytes` to `path`: a flushed temporary file, then the exclusive last step
/// described in the module comment. On failure nothing new is left behind.
pub fn write_file(path: &Path, bytes: &[u8], overwrite: Overwrite) -> Result<(), WriteError> {
    let temporary = temporary_name(path)?;
    let result = write_temporary(&temporary, bytes)
        .map_err(|error| WriteError::unwritable(path, error))
        .and_then(|()| match overwrite {
            Overwrite::Refuse => link_new(&temporary, path, bytes),
            Overwrite::Replace => replace(&temporary, path),
        });
    let _ = std::fs::remove_file(&temporary);
    result
}

fn write_temporary(temporary: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let mut file = File::options()
        .write(true)
        .create_new(true)
        .open(temporary)?;
    file.write_all(bytes)?;
    file.sync_all()
}

/// The temporary file gets the name `path` only if nothing is there.
fn link_new(temporary: &Path, path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    match std::fs::hard_link(temporary, path) {
        Ok(()) => Ok(()),
        Err(error) if error.kind() == std::io::ErrorKind::AlreadyExists => {
            Err(WriteError::Exists(path.display().to_string()))
        }
        // No hard links on this file system (FAT, some network shares): create-new.
        Err(_) => create_new(path, bytes),
    }
}

fn create_new(path: &Path, bytes: &[u8]) -> Result<(), WriteError> {
    let mut file = match OpenOptions::new().write(true).create_new(true).open(path) {
        Ok(file) => file,
        Err(error) if error.kind() == std::io::ErrorKind::AlreadyExists => {
            return Err(WriteError::Exists(path.display().to_string()));
        }
        Err(error) => return Err(WriteError::unwritable(path, error)),
    };
    let written = file.write_all(bytes).and_then(|()| file.sync_all());
    written.map_err(|error| {
        let _ = std::fs::remove_file(path);
        WriteError::unwritable(path, error)
    })
}

/// Renames the temporary file over `path`, giving it the replaced file's permissions.
fn replace(temporary: &Path, path: &Path) -> Result<(), WriteError> {
    if let Ok(metadata) = std::fs::symlink_metadata(path) {
        if metadata.is_dir() {
            return Err(WriteError::IsFolder(path.display().to_string()));
        }
        if metadata.is_file() {
            std::fs::set_permissions(temporary, metadata.permissions())
                .map_err(|error| WriteError::unwritable(path, error))?;
        }
    }
    std::fs::rename(temporary, path).map_err(|error| WriteError::unwritable(path, error))
}

#[cfg(test)]
mod tests {
    use super::*;

    type TestResult = Result<(), Box<dyn std::error::Error>>;

    #[test]
    fn a_file_that_appears_after_the_check_is_kept() -> TestResult {
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("out.svg");
        check_target(&path, Overwrite::Refuse)?;
        std::fs::write(&path, b"someone else's")?;
        let result = write_file(&path, b"ours", Overwrite::Refuse);
        assert!(matches!(result, Err(WriteError::Exists(_))), "{result:?}");
        assert_eq!(std::fs::read(&path)?, b"someone else's");
        assert_eq!(
            std::fs::read_dir(folder.path())?.count(),
            1,
            "no temporary left"
        );
        Ok(())
    }

    #[cfg(unix)]
    #[test]
    fn a_dangling_link_counts_as_existing() -> TestResult {
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("out.csv");
        std::os::unix::fs::symlink(folder.path().join("nowhere"), &path)?;
        assert!(matches!(
            check_target(&path, Overwrite::Refuse),
            Err(WriteError::Exists(_))
        ));
        assert!(matches!(
            write_file(&path, b"x", Overwrite::Refuse),
            Err(WriteError::Exists(_))
        ));
        assert!(!folder.path().join("nowhere").exists());
        Ok(())
    }

    #[cfg(unix)]
    #[test]
    fn replacing_keeps_a_read_only_file_read_only() -> TestResult {
        use std::os::unix::fs::PermissionsExt;
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("out.md");
        std::fs::write(&path, b"old")?;
        std::fs::set_permissions(&path, std::fs::Permissions::from_mode(0o444))?;
        write_file(&path, b"new", Overwrite::Replace)?;
        assert_eq!(std::fs::read(&path)?, b"new");
        let mode = std::fs::metadata(&path)?.permissions().mode() & 0o777;
        assert_eq!(mode, 0o444);
        Ok(())
    }

    #[test]
    fn a_missing_folder_is_found_before_the_work() -> TestResult {
        let folder = tempfile::tempdir()?;
        let path = folder.path().join("no/such/out.png");
        let message = check_target(&path, Overwrite::Replace)
            .err()
            .ok_or("accepted")?
            .to_string();
        assert!(message.contains("does not exist"), "{message}");
        assert!(matches!(
            check_target(folder.path(), Overwrite::Replace),
            Err(WriteError::IsFolder(_))
        ));
        Ok(())
    }
}
