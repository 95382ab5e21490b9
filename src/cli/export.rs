//! `diptych export`: the correlation diagram of DESIGN §5.3 written as a standalone SVG
//! file or as a PNG rendered from that same SVG.

use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Args, ValueEnum};

use diptych::diagram::{
    DiagramOptions, Ladders, Resolution, SvgOptions, check_options, check_png_options, check_title,
    diagram_for,
};

use super::output::{check_replaceable, extension_among, write_output};
use super::{MethodArgs, analyse_file, require_orbitals};

/// Which ladders go into the figure.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub(super) enum LaddersArg {
    Both,
    Delocalized,
    Localized,
}

impl From<LaddersArg> for Ladders {
    fn from(value: LaddersArg) -> Self {
        match value {
            LaddersArg::Both => Ladders::Both,
            LaddersArg::Delocalized => Ladders::DelocalizedOnly,
            LaddersArg::Localized => Ladders::LocalizedOnly,
        }
    }
}

#[derive(Args, Debug)]
pub(super) struct ExportArgs {
    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
    file: PathBuf,
    /// Output file (.svg or .png).
    #[arg(short, long, value_name = "OUT.svg|OUT.png")]
    output: PathBuf,
    /// Titles of the two ladders (delocalized, localized); neither may be empty.
    #[arg(long, num_args = 2, value_names = ["LEFT", "RIGHT"], allow_hyphen_values = true)]
    names: Option<Vec<String>>,
    #[command(flatten)]
    method: MethodArgs,
    /// Grey tones only (for print).
    #[arg(long)]
    greyscale: bool,
    /// Width of the two-ladder drawing in CSS pixels (1/96 inch).
    #[arg(long, default_value_t = 1000.0, allow_hyphen_values = true)]
    width: f64,
    /// Height of the drawing in CSS pixels (1/96 inch).
    #[arg(long, default_value_t = 700.0, allow_hyphen_values = true)]
    height: f64,
    /// PNG resolution in dots per inch (96 gives one pixel per CSS pixel).
    #[arg(long, default_value_t = 96.0, allow_hyphen_values = true)]
    dpi: f64,
    /// Which ladders to draw.
    #[arg(long, value_enum, default_value_t = LaddersArg::Both)]
    ladders: LaddersArg,
    /// Correlation lines with a smaller weight are left out (default: the project's).
    #[arg(long, allow_hyphen_values = true)]
    link_threshold: Option<f64>,
    /// Leave the orbital energies out of the labels.
    #[arg(long)]
    no_energies: bool,
    /// Leave out the markers of where levels move with the lone-pair switch flipped.
    #[arg(long)]
    no_level_shifts: bool,
    /// Transparent instead of white background.
    #[arg(long)]
    transparent: bool,
    /// Font size of level labels (the layout is 1000 units wide).
    #[arg(long, default_value_t = 16.0, allow_hyphen_values = true)]
    font_size: f64,
    /// Replace OUT if it exists.
    #[arg(long)]
    force: bool,
}

fn bad_input(message: impl std::fmt::Display) -> ExitCode {
    eprintln!("diptych: {message}");
    ExitCode::from(2)
}

/// Everything that can be checked before the analysis: names, threshold, sizes, the PNG's
/// pixel count and the output file.
fn check_before_work(args: &ExportArgs, extension: &str) -> Result<(), ExitCode> {
    if let Some(names) = &args.names {
        if names.iter().any(|name| name.trim().is_empty()) {
            return Err(bad_input("a ladder title given with --names is empty"));
        }
        for (name, ladder) in names.iter().zip(["delocalized", "localized"]) {
            check_title(name, ladder).map_err(bad_input)?;
        }
    }
    if let Some(threshold) = args.link_threshold
        && !(threshold.is_finite() && (0.0..=1.0).contains(&threshold))
    {
        return Err(bad_input(format!(
            "the link threshold {threshold} is not usable (it must be 0 to 1)"
        )));
    }
    let options = svg_options(args, true);
    let checked = if extension == "png" {
        check_png_options(&options, Resolution::Dpi(args.dpi))
    } else {
        check_options(&options)
    };
    checked.map_err(bad_input)?;
    check_replaceable(&args.output, args.force)
}

fn svg_options(args: &ExportArgs, project_energies: bool) -> SvgOptions {
    SvgOptions {
        width: args.width,
        height: args.height,
        font_size: args.font_size,
        greyscale: args.greyscale,
        show_energies: project_energies && !args.no_energies,
        white_background: !args.transparent,
        ladders: args.ladders.into(),
        show_level_shifts: !args.no_level_shifts,
        ..Default::default()
    }
}

pub(super) fn export(args: &ExportArgs) -> ExitCode {
    let output = &args.output;
    let extension = match extension_among(output, &["svg", "png"]) {
        Ok(extension) => extension,
        Err(code) => return code,
    };
    if let Err(code) = check_before_work(args, &extension) {
        return code;
    }
    let (opened, analysis) = match analyse_file(&args.file, &args.method) {
        Ok(pair) => pair,
        Err(code) => return code,
    };
    if let Err(code) = require_orbitals(&analysis) {
        return code;
    }
    let mut titles = opened.project.titles.clone();
    if let Some([left, right]) = args.names.as_deref() {
        titles.delocalized = left.clone();
        titles.localized = right.clone();
    }
    let options = DiagramOptions {
        titles,
        link_threshold: args
            .link_threshold
            .unwrap_or(opened.project.view.link_threshold),
        ..Default::default()
    };
    let diagram = diagram_for(&analysis, &options);
    let svg_options = svg_options(args, opened.project.view.show_energies);
    let bytes = if extension == "png" {
        diptych::diagram::export_png(&diagram, &svg_options, Resolution::Dpi(args.dpi))
    } else {
        diptych::diagram::export_svg(&diagram, &svg_options).map(String::into_bytes)
    };
    match bytes {
        Ok(bytes) => write_output(output, &bytes, args.force),
        Err(error) => bad_input(error),
    }
}
