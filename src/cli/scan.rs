//! `diptych scan`: a Walsh scan (DESIGN §4.7) written as CSV or as an SVG Walsh diagram.
//! Every check of the request (indices, bonds, point count, collisions) runs before any
//! analysis; bad input exits with code 2 and a message.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{ArgGroup, Args};

use diptych::scan::svg::{WalshSvgOptions, walsh_svg};
use diptych::scan::{
    Coordinate, MAX_POINTS, MIN_POINTS, Scan, ScanProgress, ScanRequest, csv::to_csv, run_scan,
};

use super::open_for_cli;
use super::output::{check_replaceable, write_output};

/// The scan's coordinate: exactly one of these. Atom indices are 0-based, in file order,
/// as in the JSON report.
#[derive(Args, Debug)]
#[command(group(ArgGroup::new("coordinate").required(true).multiple(false)))]
pub(super) struct ScanArgs {
    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
    pub(super) file: PathBuf,
    /// Bond angle I–J–K in degrees (J the vertex), 0-based atom indices.
    #[arg(
        long,
        value_name = "I,J,K",
        value_delimiter = ',',
        group = "coordinate"
    )]
    pub(super) angle: Option<Vec<usize>>,
    /// Distance I–J in Å, 0-based atom indices.
    #[arg(long, value_name = "I,J", value_delimiter = ',', group = "coordinate")]
    pub(super) bond: Option<Vec<usize>>,
    /// Dihedral I–J–K–L in degrees, 0-based atom indices.
    #[arg(
        long,
        value_name = "I,J,K,L",
        value_delimiter = ',',
        group = "coordinate"
    )]
    pub(super) dihedral: Option<Vec<usize>>,
    /// Common X–A–X angle (degrees) of centre A (0-based) with ≥ 3 ligands kept symmetric
    /// about the axis; for ammonia 120° is planar.
    #[arg(long, value_name = "A", group = "coordinate")]
    pub(super) pyramidalize: Option<usize>,
    /// X–A–X angle (degrees) of an AX2 centre A (0-based), both bonds moved symmetrically.
    #[arg(long, value_name = "A", group = "coordinate")]
    pub(super) symmetric_bend: Option<usize>,
    /// All A–X bond lengths (Å) of centre A (0-based) together.
    #[arg(long, value_name = "A", group = "coordinate")]
    pub(super) symmetric_stretch: Option<usize>,
    /// First value of the coordinate (Å or degrees).
    #[arg(long, allow_hyphen_values = true)]
    pub(super) from: f64,
    /// Last value of the coordinate (Å or degrees).
    #[arg(long, allow_hyphen_values = true)]
    pub(super) to: f64,
    /// Number of points, both ends included (2 to 10000).
    #[arg(long, allow_hyphen_values = true)]
    pub(super) steps: i64,
    /// Output file: .csv (table) or .svg (Walsh diagram).
    #[arg(short, long, value_name = "OUT.csv|OUT.svg")]
    pub(super) output: PathBuf,
    /// Replace OUT if it exists.
    #[arg(long)]
    pub(super) force: bool,
    /// Net charge of the molecule (overrides the file's).
    #[arg(long, allow_hyphen_values = true)]
    pub(super) charge: Option<i32>,
}

fn indices<const N: usize>(values: &[usize], flag: &str) -> Result<[usize; N], String> {
    <[usize; N]>::try_from(values).map_err(|_| {
        format!(
            "--{flag} takes {N} atom indices separated by commas, got {}",
            values.len()
        )
    })
}

fn coordinate(args: &ScanArgs) -> Result<Coordinate, String> {
    if let Some(values) = &args.angle {
        let [i, j, k] = indices::<3>(values, "angle")?;
        return Ok(Coordinate::Angle { i, j, k });
    }
    if let Some(values) = &args.bond {
        let [i, j] = indices::<2>(values, "bond")?;
        return Ok(Coordinate::Bond { i, j });
    }
    if let Some(values) = &args.dihedral {
        let [i, j, k, l] = indices::<4>(values, "dihedral")?;
        return Ok(Coordinate::Dihedral { i, j, k, l });
    }
    if let Some(centre) = args.pyramidalize {
        return Ok(Coordinate::Pyramidalize { centre });
    }
    if let Some(centre) = args.symmetric_bend {
        return Ok(Coordinate::SymmetricBend { centre });
    }
    if let Some(centre) = args.symmetric_stretch {
        return Ok(Coordinate::SymmetricStretch { centre });
    }
    Err("give one coordinate: --angle, --bond, --dihedral, --pyramidalize, --symmetric-bend or --symmetric-stretch".into())
}

#[derive(Clone, Copy, PartialEq, Eq)]
enum Output {
    Csv,
    Svg,
}

fn output_kind(path: &Path) -> Result<Output, String> {
    match path
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase)
        .as_deref()
    {
        Some("csv") => Ok(Output::Csv),
        Some("svg") => Ok(Output::Svg),
        _ => Err(format!(
            "the output '{}' must end in .csv or .svg",
            path.display()
        )),
    }
}

/// At most this many failed points are listed one by one.
const SHOWN_FAILURES: usize = 10;

fn bad_input(message: impl std::fmt::Display) -> ExitCode {
    eprintln!("diptych: {message}");
    ExitCode::from(2)
}

/// Lists the failed points (the first [`SHOWN_FAILURES`]); when every point failed there
/// is nothing to write: exit code 2.
fn report_failures(scan: &Scan) -> Result<(), ExitCode> {
    let failed = scan.failed_points();
    for &p in failed.iter().take(SHOWN_FAILURES) {
        let point = &scan.points[p];
        eprintln!(
            "diptych: point {p} ({}) failed: {}",
            point.value,
            point.failure.as_deref().unwrap_or("")
        );
    }
    if failed.len() > SHOWN_FAILURES {
        let more = failed.len() - SHOWN_FAILURES;
        eprintln!("diptych: … and {more} more points failed");
    }
    if failed.len() == scan.points.len() {
        return Err(bad_input(format!(
            "nothing to write: all {} points of the scan failed; no file was written",
            scan.points.len()
        )));
    }
    Ok(())
}

pub(super) fn scan(args: &ScanArgs) -> ExitCode {
    let coordinate = match coordinate(args) {
        Ok(c) => c,
        Err(message) => return bad_input(message),
    };
    let kind = match output_kind(&args.output) {
        Ok(kind) => kind,
        Err(message) => return bad_input(message),
    };
    // A negative count is read, so that the message can say the range.
    let Ok(steps) = usize::try_from(args.steps) else {
        return bad_input(format!(
            "{} points: a scan has {MIN_POINTS} to {MAX_POINTS} points",
            args.steps
        ));
    };
    if let Err(code) = check_replaceable(&args.output, args.force) {
        return code;
    }
    let opened = match open_for_cli(&args.file, args.charge) {
        Ok(opened) => opened,
        Err(code) => return code,
    };
    let settings = opened.project.settings.clone();
    let molecule = &opened.project.molecule;
    let request = ScanRequest {
        coordinate,
        from: args.from,
        to: args.to,
        steps,
    };
    // All validation happens here, before any analysis.
    if let Err(error) = request.plan(molecule) {
        return bad_input(error);
    }
    let progress = ScanProgress::new();
    let scan = match run_scan(molecule, &settings, &request, &progress) {
        Ok(scan) => scan,
        Err(error) => return bad_input(error),
    };
    if let Err(code) = report_failures(&scan) {
        return code;
    }
    let text = match kind {
        Output::Csv => to_csv(&scan),
        Output::Svg => {
            let options = WalshSvgOptions {
                marker: coordinate.measure(molecule).ok(),
                ..Default::default()
            };
            walsh_svg(&scan, &options)
        }
    };
    write_output(&args.output, text.as_bytes(), args.force)
}
