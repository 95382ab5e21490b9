//! `diptych report`: the analysis written as a file, the format chosen by the extension
//! (Markdown or CSV tables, the JSON of DESIGN §5.5, or the plain-text report).

use std::path::PathBuf;
use std::process::ExitCode;

use clap::Args;

use diptych::report::{ReportFormat, render};

use super::output::{check_replaceable, extension_among, write_output};
use super::{MethodArgs, analyse_file, require_orbitals};

#[derive(Args, Debug)]
pub(super) struct ReportArgs {
    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
    file: PathBuf,
    /// Output file: .md (Markdown tables), .csv (one long table), .json or .txt.
    #[arg(short, long, value_name = "OUT.md|OUT.csv|OUT.json")]
    output: PathBuf,
    #[command(flatten)]
    method: MethodArgs,
    /// Replace OUT if it exists.
    #[arg(long)]
    force: bool,
}

pub(super) fn report(args: &ReportArgs) -> ExitCode {
    let extension = match extension_among(&args.output, &["md", "markdown", "csv", "json", "txt"]) {
        Ok(extension) => extension,
        Err(code) => return code,
    };
    let Some(format) = ReportFormat::from_extension(&extension) else {
        eprintln!("diptych: no report format for '.{extension}'");
        return ExitCode::from(2);
    };
    if let Err(code) = check_replaceable(&args.output, args.force) {
        return code;
    }
    match analyse_file(&args.file, &args.method) {
        Ok((_, analysis)) if require_orbitals(&analysis).is_err() => ExitCode::from(2),
        Ok((_, analysis)) => write_output(
            &args.output,
            render(&analysis, format).as_bytes(),
            args.force,
        ),
        Err(code) => code,
    }
}
