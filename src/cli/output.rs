//! Writing a subcommand's output file: the extension picks the format, the target is
//! checked before any work (`check_replaceable`), and the bytes go through the library's
//! one writer (`chem::io::write_file`), whose last step refuses a file that appeared
//! meanwhile unless `--force` was given.

use std::path::Path;
use std::process::ExitCode;

use diptych::chem::io::{Overwrite, WriteError, check_target, write_file};

/// The output's extension in lower case, if it is one of `allowed`; else prints why not.
pub(super) fn extension_among(output: &Path, allowed: &[&str]) -> Result<String, ExitCode> {
    let extension = output
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    match extension {
        Some(extension) if allowed.contains(&extension.as_str()) => Ok(extension),
        _ => {
            let choices: Vec<String> = allowed.iter().map(|e| format!(".{e}")).collect();
            eprintln!(
                "diptych: the output '{}' must end in {}",
                output.display(),
                choices.join(", ")
            );
            Err(ExitCode::from(2))
        }
    }
}

/// `--force` as the writer's rule.
pub(super) fn overwrite(force: bool) -> Overwrite {
    if force {
        Overwrite::Replace
    } else {
        Overwrite::Refuse
    }
}

/// Before any work: refuses an existing output (a dangling link counts) unless `force`,
/// a folder where a file should go, and a folder that does not exist or takes no file.
pub(super) fn check_replaceable(output: &Path, force: bool) -> Result<(), ExitCode> {
    check_target(output, overwrite(force)).map_err(|error| {
        match error {
            WriteError::Exists(_) => eprintln!("diptych: {error}; add --force to replace it"),
            _ => eprintln!("diptych: {error}"),
        }
        ExitCode::from(2)
    })
}

/// Writes the bytes with the `--force` rule; exit code 2 with the reason when that fails.
pub(super) fn write_output(output: &Path, bytes: &[u8], force: bool) -> ExitCode {
    match write_file(output, bytes, overwrite(force)) {
        Ok(()) => ExitCode::SUCCESS,
        Err(WriteError::Exists(shown)) => {
            eprintln!(
                "diptych: '{shown}' appeared while the work ran and was kept; add --force to replace it"
            );
            ExitCode::from(2)
        }
        Err(error) => {
            eprintln!("diptych: {error}");
            ExitCode::from(2)
        }
    }
}
