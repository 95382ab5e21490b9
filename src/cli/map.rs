//! `diptych map`: the orbital map of the Inspector (DESIGN §2) written as an SVG file.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::Args;

use diptych::analysis::Analysis;
use diptych::orbital_map::{
    MAX_GRID, MIN_GRID, MapOptions, MapSvgOptions, Plane, compute_map, default_plane, find_orbital,
    map_to_svg,
};

use super::output::{check_replaceable, write_output};
use super::{MethodArgs, analyse_file, require_orbitals};

/// Arguments of `diptych map`.
#[derive(Args, Debug)]
pub(super) struct MapArgs {
    /// Molecule (.xyz, .mol, .sdf) or project (.diptych.ron) file.
    file: PathBuf,
    /// The orbital: an MO label ("3a1", "1e"; "1e#2" for the second member of a set),
    /// "HOMO", "LUMO", a localized label ("n(N)", "σ(N–H)#2", ASCII "sigma(N-H)"), or by
    /// 0-based index "mo:K", "loc:K", "hyb:K".
    #[arg(long, value_name = "LABEL")]
    orbital: String,
    /// Plane through atoms I,J,K (0-based). Default: through the orbital's atoms, or the plane
    /// perpendicular to that through its first two atoms when it holds more of the orbital.
    #[arg(long, value_name = "I,J,K", conflicts_with = "normal_to")]
    plane: Option<String>,
    /// Plane through atom I normal to the bond I–J (0-based).
    #[arg(long, value_name = "I,J")]
    normal_to: Option<String>,
    /// Output file (.svg).
    #[arg(short, long, value_name = "OUT.svg")]
    output: PathBuf,
    /// Grid points a side (8 to 2048).
    #[arg(long, default_value_t = 200, allow_hyphen_values = true)]
    grid: i64,
    /// Contour magnitudes in bohr^-3/2, each drawn at + and − (default 0.02,0.04,0.08,0.16,0.32).
    #[arg(long, value_name = "A,B,...", allow_hyphen_values = true)]
    levels: Option<String>,
    /// Space around the atoms, Å.
    #[arg(long, default_value_t = 2.0, allow_hyphen_values = true)]
    margin: f64,
    #[command(flatten)]
    method: MethodArgs,
    /// Replace OUT if it exists.
    #[arg(long)]
    force: bool,
}

fn bad_input(message: impl std::fmt::Display) -> ExitCode {
    eprintln!("diptych: {message}");
    ExitCode::from(2)
}

/// "0,1,2" → [0, 1, 2] with exactly `count` entries.
fn parse_indices(text: &str, count: usize, what: &str) -> Result<Vec<usize>, String> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    if parts.len() != count {
        return Err(format!(
            "{what} needs {count} comma-separated 0-based atom indices, got '{text}'"
        ));
    }
    parts
        .iter()
        .map(|p| {
            p.parse::<usize>()
                .map_err(|_| format!("{what}: '{p}' is not an atom index (0-based)"))
        })
        .collect()
}

fn parse_levels(text: &str) -> Result<Vec<f64>, String> {
    text.split(',')
        .map(str::trim)
        .map(|p| {
            p.parse::<f64>()
                .map_err(|_| format!("--levels: '{p}' is not a number"))
        })
        .collect()
}

fn choose_plane(
    args: &MapArgs,
    analysis: &Analysis,
    reference: diptych::orbital_map::OrbitalRef,
) -> Result<Plane, String> {
    let molecule = &analysis.molecule;
    if let Some(text) = &args.plane {
        let atoms = parse_indices(text, 3, "--plane")?;
        return Plane::through_atoms(molecule, [atoms[0], atoms[1], atoms[2]])
            .map_err(|e| e.to_string());
    }
    if let Some(text) = &args.normal_to {
        let atoms = parse_indices(text, 2, "--normal-to")?;
        return Plane::normal_to_bond(molecule, atoms[0], atoms[1]).map_err(|e| e.to_string());
    }
    default_plane(analysis, reference).map_err(|e| e.to_string())
}

pub(super) fn map(args: &MapArgs) -> ExitCode {
    // A negative count is read, so that the message can say the range.
    let Ok(points) = usize::try_from(args.grid) else {
        return bad_input(format!(
            "a grid of {} points a side is not usable (it must be {MIN_GRID} to {MAX_GRID})",
            args.grid
        ));
    };
    let options = MapOptions {
        points,
        margin: args.margin,
        levels: match &args.levels {
            Some(text) => match parse_levels(text) {
                Ok(levels) => levels,
                Err(message) => return bad_input(message),
            },
            None => MapOptions::default().levels,
        },
        nodal_line: true,
    };
    if let Err(error) = options.validated_levels() {
        return bad_input(error);
    }
    let output: &Path = &args.output;
    let extension = output
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase);
    if extension.as_deref() != Some("svg") {
        return bad_input(format!(
            "the output '{}' must end in .svg",
            output.display()
        ));
    }
    if let Err(code) = check_replaceable(output, args.force) {
        return code;
    }
    let analysis = match analyse_file(&args.file, &args.method) {
        Ok((_, analysis)) => analysis,
        Err(code) => return code,
    };
    if let Err(code) = require_orbitals(&analysis) {
        return code;
    }
    let reference = match find_orbital(&analysis, &args.orbital) {
        Ok(reference) => reference,
        Err(error) => return bad_input(error),
    };
    let plane = match choose_plane(args, &analysis, reference) {
        Ok(plane) => plane,
        Err(message) => return bad_input(message),
    };
    let map = match compute_map(&analysis, reference, &plane, &options) {
        Ok(map) => map,
        Err(error) => return bad_input(error),
    };
    let svg = map_to_svg(&map, &MapSvgOptions::default());
    write_output(output, svg.as_bytes(), args.force)
}
