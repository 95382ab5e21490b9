//! Command-line parsing (clap) and the subcommands of DESIGN §5.4.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{Parser, Subcommand, ValueEnum};

use diptych::analysis::{Analysis, Settings};
use diptych::project::{Opened, open_path};
use diptych::report;

/// Diptych puts a molecule's two bonding pictures side by side: the delocalized,
/// symmetry-labelled molecular orbitals and the localized directed hybrids, bonds and
/// lone pairs, with correlation lines showing how they are the same wavefunction.
///
/// Run without a subcommand to open the desktop window (optionally on FILE).
#[derive(Parser, Debug)]
#[command(name = "diptych", version, args_conflicts_with_subcommands = true)]
struct Cli {
    #[command(subcommand)]
    command: Option<Command>,

    /// Open the real window, render a few frames, save a PNG screenshot and exit.
    #[arg(long, value_name = "OUT.png")]
    screenshot: Option<PathBuf>,

    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) to open in the window.
    file: Option<PathBuf>,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Analyse a molecule file and print the results (text or JSON).
    Analyze {
        /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
        file: PathBuf,
        /// Net charge of the molecule (overrides the file's).
        #[arg(long, allow_hyphen_values = true)]
        charge: Option<i32>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = Format::Text)]
        format: Format,
    },
    /// Export the correlation diagram as a standalone SVG file.
    Export {
        /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
        file: PathBuf,
        /// Output file (.svg).
        #[arg(short, long, value_name = "OUT.svg")]
        output: PathBuf,
        /// Titles of the two ladders (delocalized, localized).
        #[arg(long, num_args = 2, value_names = ["LEFT", "RIGHT"])]
        names: Option<Vec<String>>,
        /// Net charge of the molecule (overrides the file's).
        #[arg(long, allow_hyphen_values = true)]
        charge: Option<i32>,
        /// Grey tones only (for print).
        #[arg(long)]
        greyscale: bool,
        /// Width of the drawing in pixels.
        #[arg(long, default_value_t = 1000.0)]
        width: f64,
        /// Height of the drawing in pixels.
        #[arg(long, default_value_t = 700.0)]
        height: f64,
        /// Replace OUT if it exists.
        #[arg(long)]
        force: bool,
    },
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum Format {
    Text,
    Json,
}

/// Parses the arguments and runs the chosen command.
pub fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        Some(Command::Analyze {
            file,
            charge,
            format,
        }) => analyze(&file, charge, format),
        Some(Command::Export {
            file,
            output,
            names,
            charge,
            greyscale,
            width,
            height,
            force,
        }) => {
            let request = ExportRequest {
                names,
                greyscale,
                width,
                height,
                force,
            };
            export(&file, &output, charge, &request)
        }
        None => open_window(cli.file, cli.screenshot),
    }
}

/// Reads a file for a subcommand; prints the error and returns exit code 2 when it fails.
fn open_for_cli(file: &Path, charge: Option<i32>) -> Result<Opened, ExitCode> {
    let mut opened = open_path(file).map_err(|error| {
        eprintln!("diptych: {error}");
        ExitCode::from(2)
    })?;
    for notice in &opened.notices {
        eprintln!("diptych: note: {notice}");
    }
    if let Some(charge) = charge {
        opened.project.molecule.charge = charge;
    }
    Ok(opened)
}

fn run_analysis(opened: &Opened, settings: &Settings) -> Result<Analysis, ExitCode> {
    let analysis = Analysis::run(&opened.project.molecule, settings).map_err(|error| {
        eprintln!("diptych: {error}");
        ExitCode::from(2)
    })?;
    for error in &analysis.errors {
        eprintln!("diptych: {:?} stage failed: {}", error.stage, error.message);
    }
    Ok(analysis)
}

fn analyze(file: &Path, charge: Option<i32>, format: Format) -> ExitCode {
    let result = open_for_cli(file, charge).and_then(|opened| {
        let settings = opened.project.settings.clone();
        run_analysis(&opened, &settings)
    });
    let analysis = match result {
        Ok(analysis) => analysis,
        Err(code) => return code,
    };
    let output = match format {
        Format::Text => report::to_text(&analysis),
        Format::Json => report::to_json(&analysis) + "\n",
    };
    print_or_fail(&output)
}

struct ExportRequest {
    names: Option<Vec<String>>,
    greyscale: bool,
    width: f64,
    height: f64,
    force: bool,
}

fn export(file: &Path, output: &Path, charge: Option<i32>, request: &ExportRequest) -> ExitCode {
    let valid_size = |v: f64| v.is_finite() && (1.0..=100_000.0).contains(&v);
    if !valid_size(request.width) || !valid_size(request.height) {
        eprintln!(
            "diptych: the size {}×{} is not usable (width and height must be 1 to 100000 pixels)",
            request.width, request.height
        );
        return ExitCode::from(2);
    }
    let extension = output
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    if extension.as_deref() != Some("svg") {
        eprintln!(
            "diptych: the output '{}' must end in .svg",
            output.display()
        );
        return ExitCode::from(2);
    }
    if output.exists() && !request.force {
        eprintln!(
            "diptych: '{}' exists; add --force to replace it",
            output.display()
        );
        return ExitCode::from(2);
    }
    let result = open_for_cli(file, charge).and_then(|opened| {
        let settings = opened.project.settings.clone();
        run_analysis(&opened, &settings).map(|analysis| (opened, analysis))
    });
    let (opened, analysis) = match result {
        Ok(pair) => pair,
        Err(code) => return code,
    };
    let mut titles = opened.project.titles.clone();
    if let Some([left, right]) = request.names.as_deref() {
        titles.delocalized = left.clone();
        titles.localized = right.clone();
    }
    let options = diptych::diagram::DiagramOptions {
        titles,
        link_threshold: opened.project.view.link_threshold,
        ..Default::default()
    };
    let diagram = diptych::diagram::diagram_for(&analysis, &options);
    let svg_options = diptych::diagram::SvgOptions {
        width: request.width,
        height: request.height,
        greyscale: request.greyscale,
        show_energies: opened.project.view.show_energies,
        ..Default::default()
    };
    let svg = diptych::diagram::to_svg(&diagram, &svg_options);
    match diptych::chem::io::write_atomically(output, svg.as_bytes()) {
        Ok(()) => ExitCode::SUCCESS,
        Err(error) => {
            eprintln!("diptych: cannot write '{}': {error}", output.display());
            ExitCode::from(2)
        }
    }
}

fn print_or_fail(output: &str) -> ExitCode {
    let mut stdout = std::io::stdout().lock();
    match stdout
        .write_all(output.as_bytes())
        .and_then(|_| stdout.flush())
    {
        Ok(()) => ExitCode::SUCCESS,
        // A closed pipe (e.g. `| head`) is not an error of ours.
        Err(error) if error.kind() == std::io::ErrorKind::BrokenPipe => ExitCode::SUCCESS,
        Err(error) => {
            eprintln!("diptych: cannot write the output: {error}");
            ExitCode::from(1)
        }
    }
}

#[cfg(feature = "gui")]
fn open_window(file: Option<PathBuf>, screenshot: Option<PathBuf>) -> ExitCode {
    let opened = match file {
        Some(path) => match open_for_cli(&path, None) {
            Ok(opened) => Some((opened, path)),
            Err(code) => return code,
        },
        None => None,
    };
    match crate::app::run(opened, screenshot) {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("diptych: {message}");
            ExitCode::from(1)
        }
    }
}

#[cfg(not(feature = "gui"))]
fn open_window(_file: Option<PathBuf>, _screenshot: Option<PathBuf>) -> ExitCode {
    eprintln!(
        "diptych: this build has no window (built without the 'gui' feature); use a subcommand, see --help"
    );
    ExitCode::from(2)
}
