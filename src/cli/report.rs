//! `diptych report`: the analysis written as a file, the format chosen by the extension
//! (Markdown or CSV tables, the JSON of DESIGN §5.5, or the plain-text report).

use std::path::PathBuf;
use std::process::ExitCode;

use clap::Args;

use diptych::report::{ReportFormat, render};

use super::output::{check_replaceable, extension_among, write_output};
use super::{MethodFlags, ModelArg, open_for_cli, run_analysis};

#[derive(Args, Debug)]
pub(super) struct ReportArgs {
    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
    file: PathBuf,
    /// Output file: .md (Markdown tables), .csv (one long table), .json or .txt.
    #[arg(short, long, value_name = "OUT.md|OUT.csv|OUT.json")]
    output: PathBuf,
    /// Net charge of the molecule (overrides the file's).
    #[arg(long, allow_hyphen_values = true)]
    charge: Option<i32>,
    /// Hold each lone pair's p orbital non-bonding (the first-order diagram).
    #[arg(long)]
    no_lone_pair_mixing: bool,
    /// Hybrid model for the localized picture.
    #[arg(long, value_enum)]
    model: Option<ModelArg>,
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
    let flags = MethodFlags {
        no_lone_pair_mixing: args.no_lone_pair_mixing,
        model: args.model,
    };
    let result = open_for_cli(&args.file, args.charge).and_then(|opened| {
        let mut settings = opened.project.settings.clone();
        flags.apply(&mut settings);
        run_analysis(&opened, &settings)
    });
    match result {
        Ok(analysis) => write_output(&args.output, render(&analysis, format).as_bytes()),
        Err(code) => code,
    }
}
