//! Command-line parsing (clap) and the subcommands of DESIGN §5.4; each subcommand that
//! writes a file lives in its own module here.

mod compare;
mod export;
mod map;
mod output;
mod report;
mod scan;

use diptych::localized::held::{HeldLonePairs, HoldConvention};
use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{Args, Parser, Subcommand, ValueEnum};

use diptych::analysis::{Analysis, Settings};
use diptych::project::{Opened, open_path};

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

    /// With --screenshot: replace OUT.png if it exists.
    #[arg(long, requires = "screenshot")]
    force: bool,

    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) to open in the window.
    file: Option<PathBuf>,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Analyse a molecule file and print the results (text or JSON).
    Analyze {
        /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
        file: PathBuf,
        /// Output format.
        #[arg(long, value_enum, default_value_t = Format::Text)]
        format: Format,
        #[command(flatten)]
        method: MethodArgs,
    },
    /// Export the correlation diagram as a standalone SVG or PNG file.
    Export(export::ExportArgs),
    /// Write the analysis to a file: Markdown or CSV tables, JSON or text.
    Report(report::ReportArgs),
    /// Walsh scan: step one coordinate and write every level's energy, λ and Σε as CSV
    /// or a Walsh diagram as SVG. Atom indices are 0-based, as in the JSON report.
    Scan(scan::ScanArgs),
    /// Write the map of one orbital on a plane (contours, atoms, bonds) as an SVG file.
    Map(map::MapArgs),
    /// Compare a series of molecules: donor lone pairs, frontier orbitals and charges, and
    /// −ε against measured ionization energies, as CSV, Markdown, SVG plots or JSON.
    Compare(compare::CompareArgs),
}

/// The hybrid models of DESIGN §4.4.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum ModelArg {
    /// Read from the localized orbitals of the wavefunction (the default).
    Localized,
    /// Coulson's relations from the bond angles, on the wavefunction's Lewis structure.
    Geometric,
    /// Maximum overlap with the partners' orbitals, on the same Lewis structure.
    MaxOverlap,
}

/// How the localized orbitals are found.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum LocalizationArg {
    /// Intrinsic bond orbitals: maximize Σ q⁴ of the Löwdin populations (the default).
    Ibo,
    /// Pipek–Mezey with Löwdin populations: maximize Σ q².
    PipekMezey,
}

impl From<LocalizationArg> for diptych::localized::LocalizationMethod {
    fn from(value: LocalizationArg) -> Self {
        match value {
            LocalizationArg::Ibo => diptych::localized::LocalizationMethod::IntrinsicBond,
            LocalizationArg::PipekMezey => diptych::localized::LocalizationMethod::PipekMezey,
        }
    }
}

impl From<ModelArg> for diptych::hybrid::HybridModel {
    fn from(value: ModelArg) -> Self {
        match value {
            ModelArg::Geometric => diptych::hybrid::HybridModel::Geometric,
            ModelArg::MaxOverlap => diptych::hybrid::HybridModel::MaxOverlap,
            ModelArg::Localized => diptych::hybrid::HybridModel::Localized,
        }
    }
}

/// What the lone-pair switch holds (DESIGN §4.6).
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
enum HoldConventionArg {
    /// The centre's p orbital along each held lone pair (the hand-drawn diagram).
    FirstOrder,
    /// The lone-pair hybrid itself (its level then equals the localized ladder's).
    Hybrid,
}

/// `central`, `all` or atom numbers as the reports print them (from 0), comma-separated.
fn parse_held_lone_pairs(text: &str) -> Result<HeldLonePairs, String> {
    match text.trim() {
        "central" => Ok(HeldLonePairs::Central),
        "all" => Ok(HeldLonePairs::All),
        list => list
            .split(',')
            .map(|item| {
                item.trim().parse::<usize>().map_err(|_| {
                    format!(
                        "'{}' is not central, all or an atom number (from 0)",
                        item.trim()
                    )
                })
            })
            .collect::<Result<Vec<usize>, String>>()
            .map(HeldLonePairs::Atoms),
    }
}

/// The charge and method choices every analysing subcommand takes, applied over the
/// file's (or project's) own values.
#[derive(Args, Clone, Debug, Default)]
pub(super) struct MethodArgs {
    /// Net charge of the molecule (overrides the file's).
    #[arg(long, allow_hyphen_values = true)]
    pub(super) charge: Option<i32>,
    /// Hold lone pairs non-bonding (the first-order diagram).
    #[arg(long)]
    no_lone_pair_mixing: bool,
    /// Which lone pairs are held with mixing off: central (atoms with two or more bonded
    /// partners, the default), all, or atom numbers as the reports print them (from 0).
    #[arg(long, value_name = "central|all|ATOM,...", value_parser = parse_held_lone_pairs)]
    hold_lone_pairs: Option<HeldLonePairs>,
    /// What is held: the centre's p orbital along the lone pair, or the lone-pair hybrid.
    #[arg(long, value_enum)]
    hold_convention: Option<HoldConventionArg>,
    /// Hybrid model for the localized picture.
    #[arg(long, value_enum)]
    model: Option<ModelArg>,
    /// Localization method of the localized picture.
    #[arg(long, value_enum)]
    localization: Option<LocalizationArg>,
}

impl MethodArgs {
    pub(super) fn apply(&self, settings: &mut Settings) {
        if self.no_lone_pair_mixing {
            settings.lone_pair_mixing = false;
        }
        if let Some(held) = &self.hold_lone_pairs {
            settings.held_lone_pairs = held.clone();
        }
        if let Some(convention) = self.hold_convention {
            settings.hold_convention = match convention {
                HoldConventionArg::FirstOrder => HoldConvention::FirstOrder,
                HoldConventionArg::Hybrid => HoldConvention::Hybrid,
            };
        }
        if let Some(model) = self.model {
            settings.hybrid.model = model.into();
        }
        if let Some(method) = self.localization {
            settings.localization.method = method.into();
        }
    }
}

/// Opens `file` and analyses it with `method` applied; on failure the message is printed
/// and the exit code returned.
pub(super) fn analyse_file(
    file: &Path,
    method: &MethodArgs,
) -> Result<(Opened, Analysis), ExitCode> {
    let opened = open_for_cli(file, method.charge)?;
    let mut settings = opened.project.settings.clone();
    method.apply(&mut settings);
    let analysis = run_analysis(&opened, &settings)?;
    Ok((opened, analysis))
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
            format,
            method,
        }) => analyze(&file, format, &method),
        Some(Command::Export(args)) => export::export(&args),
        Some(Command::Report(args)) => report::report(&args),
        Some(Command::Scan(args)) => scan::scan(&args),
        Some(Command::Map(args)) => map::map(&args),
        Some(Command::Compare(args)) => compare::compare(&args),
        None => open_window(cli.file, cli.screenshot, cli.force),
    }
}

/// Reads a file for a subcommand; prints the error and returns exit code 2 when it fails.
pub(super) fn open_for_cli(file: &Path, charge: Option<i32>) -> Result<Opened, ExitCode> {
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

pub(super) fn run_analysis(opened: &Opened, settings: &Settings) -> Result<Analysis, ExitCode> {
    let analysis = Analysis::run(&opened.project.molecule, settings).map_err(|error| {
        eprintln!("diptych: {error}");
        ExitCode::from(2)
    })?;
    for error in &analysis.errors {
        eprintln!("diptych: {:?} stage failed: {}", error.stage, error.message);
    }
    Ok(analysis)
}

/// A file output needs orbitals: without them (the orbital stage failed, e.g. more
/// electrons than spin orbitals) there is nothing to draw or tabulate, so the command
/// stops with exit code 2 and writes nothing.
pub(super) fn require_orbitals(analysis: &Analysis) -> Result<(), ExitCode> {
    if !analysis.orbitals.is_empty() {
        return Ok(());
    }
    let reason = analysis
        .errors
        .first()
        .map_or("no stage gave a reason", |error| error.message.as_str());
    eprintln!(
        "diptych: nothing to write: the analysis has no molecular orbitals ({reason}); no file was written"
    );
    Err(ExitCode::from(2))
}

fn analyze(file: &Path, format: Format, method: &MethodArgs) -> ExitCode {
    let analysis = match analyse_file(file, method) {
        Ok((_, analysis)) => analysis,
        Err(code) => return code,
    };
    let output = match format {
        Format::Text => diptych::report::to_text(&analysis),
        Format::Json => diptych::report::to_json(&analysis) + "\n",
    };
    print_or_fail(&output)
}

pub(super) fn print_or_fail(output: &str) -> ExitCode {
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
fn open_window(file: Option<PathBuf>, screenshot: Option<PathBuf>, force: bool) -> ExitCode {
    // The screenshot's name and folder are checked before the window opens.
    if let Some(path) = &screenshot {
        if let Err(code) = output::extension_among(path, &["png"]) {
            return code;
        }
        if let Err(code) = output::check_replaceable(path, force) {
            return code;
        }
    }
    let screenshot = screenshot.map(|path| crate::app::ScreenshotTarget {
        path,
        overwrite: output::overwrite(force),
    });
    let (file, series) = match file {
        Some(path) if diptych::series::project::is_series_path(&path) => {
            if let Err(error) = diptych::series::project::SeriesProject::load(&path) {
                eprintln!("diptych: {}: {error}", path.display());
                return ExitCode::from(2);
            }
            (None, Some(path))
        }
        other => (other, None),
    };
    let opened = match file {
        Some(path) => match open_for_cli(&path, None) {
            Ok(opened) => Some((opened, path)),
            Err(code) => return code,
        },
        None => None,
    };
    match crate::app::run(opened, screenshot, series) {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("diptych: {message}");
            ExitCode::from(1)
        }
    }
}

#[cfg(not(feature = "gui"))]
fn open_window(_file: Option<PathBuf>, _screenshot: Option<PathBuf>, _force: bool) -> ExitCode {
    eprintln!(
        "diptych: this build has no window (built without the 'gui' feature); use a subcommand, see --help"
    );
    ExitCode::from(2)
}
