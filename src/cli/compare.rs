//! `diptych compare`: a series of molecules (files, projects or series documents) analysed
//! one by one and written as one table (CSV, Markdown), the plots (SVG) or JSON; printed
//! as Markdown or JSON when no output file is given.

use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Args, ValueEnum};

use diptych::series::project::{SeriesProject, is_series_path, of_files};
use diptych::series::svg::{SeriesSvgOptions, series_svg};
use diptych::series::{self, DonorChoice, SeriesInput, csv, markdown};

use super::output::{check_replaceable, extension_among, write_output};
use super::print_or_fail;

#[derive(Args, Debug)]
pub(super) struct CompareArgs {
    /// Molecule files (.xyz, .mol, .sdf), projects (.diptych.ron) or series documents
    /// (.diptych-series.ron), at most 100 molecules in all.
    #[arg(required = true)]
    files: Vec<PathBuf>,
    /// Output file: .csv (one row per molecule), .md (table and fits), .svg (plots) or
    /// .json; without it the Markdown (or --format json) goes to standard output.
    #[arg(short, long, value_name = "OUT.csv|OUT.md|OUT.svg|OUT.json")]
    output: Option<PathBuf>,
    /// What is printed when no output file is given.
    #[arg(long, value_enum, default_value_t = PrintFormat::Markdown)]
    format: PrintFormat,
    /// Donor of every molecule that a series document does not choose itself: auto (the
    /// highest lone pair of an atom with two or more bonded partners, else the highest),
    /// highest (the highest occupied lone pair), or richest-in-s (on the auto donor's
    /// atom, the lone pair richest in s: the σ donor).
    #[arg(long, value_enum, default_value_t = DonorArg::Auto)]
    donor: DonorArg,
    /// Replace OUT if it exists.
    #[arg(long)]
    force: bool,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum PrintFormat {
    Markdown,
    Json,
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum DonorArg {
    Auto,
    Highest,
    RichestInS,
}

pub(super) fn compare(args: &CompareArgs) -> ExitCode {
    let extension = match &args.output {
        Some(output) => match extension_among(output, &["csv", "md", "markdown", "svg", "json"]) {
            Ok(extension) => Some(extension),
            Err(code) => return code,
        },
        None => None,
    };
    if let Some(output) = &args.output
        && let Err(code) = check_replaceable(output, args.force)
    {
        return code;
    }
    let inputs = match read_inputs(&args.files, args.donor) {
        Ok(inputs) => inputs,
        Err(message) => {
            eprintln!("diptych: {message}");
            return ExitCode::from(2);
        }
    };
    let compared = match series::compare(&inputs) {
        Ok(compared) => compared,
        Err(error) => {
            eprintln!("diptych: {error}");
            return ExitCode::from(2);
        }
    };
    for row in &compared.rows {
        for note in &row.notes {
            eprintln!("diptych: note: {}: {note}", row.name);
        }
    }
    let text = match extension.as_deref() {
        Some("csv") => csv::to_csv(&compared),
        Some("svg") => series_svg(&compared, &SeriesSvgOptions::default()),
        Some("json") => series::to_json(&compared) + "\n",
        Some(_) => markdown::to_markdown(&compared),
        None if args.format == PrintFormat::Json => series::to_json(&compared) + "\n",
        None => markdown::to_markdown(&compared),
    };
    match &args.output {
        Some(output) => write_output(output, text.as_bytes(), args.force),
        None => print_or_fail(&text),
    }
}

/// Every file's members, series documents expanded; one line of text when one fails.
fn read_inputs(files: &[PathBuf], donor: DonorArg) -> Result<Vec<SeriesInput>, String> {
    series::check_size(files.len()).map_err(|e| e.to_string())?;
    let mut inputs = Vec::new();
    for file in files {
        let document = if is_series_path(file) {
            SeriesProject::load(file).map_err(|e| format!("{}: {e}", file.display()))?
        } else {
            of_files("", std::slice::from_ref(file))
        };
        let folder = match file.parent() {
            Some(parent) if is_series_path(file) => parent.to_path_buf(),
            _ => PathBuf::new(),
        };
        let mut read = document
            .inputs(&folder)
            .map_err(|e| format!("{}: {e}", file.display()))?;
        let chosen = match donor {
            DonorArg::Auto => DonorChoice::Auto,
            DonorArg::Highest => DonorChoice::Highest,
            DonorArg::RichestInS => DonorChoice::RichestInSOnDonorAtom,
        };
        for input in &mut read {
            if input.donor == DonorChoice::Auto {
                input.donor = chosen.clone();
            }
        }
        inputs.extend(read);
        series::check_size(inputs.len()).map_err(|e| e.to_string())?;
    }
    Ok(inputs)
}
