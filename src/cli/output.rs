//! Writing a subcommand's output file: the extension picks the format, an existing file is
//! replaced only with `--force`, and the bytes go through `write_atomically` (temporary
//! file and rename), so a failure never leaves a partial file behind.

use std::path::Path;
use std::process::ExitCode;

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

/// Refuses an existing output unless `force` is set, and a folder where a file should go.
pub(super) fn check_replaceable(output: &Path, force: bool) -> Result<(), ExitCode> {
    if output.is_dir() {
        eprintln!("diptych: '{}' is a folder", output.display());
        return Err(ExitCode::from(2));
    }
    if output.exists() && !force {
        eprintln!(
            "diptych: '{}' exists; add --force to replace it",
            output.display()
        );
        return Err(ExitCode::from(2));
    }
    Ok(())
}

/// Writes the bytes atomically; exit code 2 with the reason when that fails.
pub(super) fn write_output(output: &Path, bytes: &[u8]) -> ExitCode {
    match diptych::chem::io::write_atomically(output, bytes) {
        Ok(()) => ExitCode::SUCCESS,
        Err(error) => {
            eprintln!("diptych: cannot write '{}': {error}", output.display());
            ExitCode::from(2)
        }
    }
}
