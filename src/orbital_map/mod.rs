//! Orbital maps (DESIGN §2, Inspector): the value of a canonical MO, a localized orbital or
//! a hybrid on a plane, from the extended Hückel Slater basis, with contour lines at
//! chosen levels and the atoms and bonds projected onto the plane.
//!
//! - [`sto`]: point values of the Slater basis, consistent with the overlap matrix;
//! - [`orbital`]: which orbital ([`OrbitalRef`]), its AO coefficients, label parsing;
//! - [`plane`]: the plane (three atoms, normal to a bond, or a default);
//! - [`grid`]: the n × n grid of values; [`contour`]: marching squares;
//! - [`projection`]: atoms and bonds on the plane; [`svg`]: the SVG writer.
//!
//! Values are in atomic units, bohr^(−3/2) (ψ² integrates to 1 over bohr³); plane
//! coordinates in Å. Contour levels are magnitudes drawn at ±level; the default doubling
//! sequence 0.02 … 0.32 bohr^(−3/2) spans valence orbitals from their tails to near the
//! nuclei (common practice, no source). The nodal line (ψ = 0) is traced separately.
//!
//! [`compute_map`] is the whole job for one orbital and plane; it does no I/O.

pub mod contour;
pub mod grid;
pub mod orbital;
pub mod plane;
pub mod projection;
pub mod sto;
pub mod svg;

use thiserror::Error;

use crate::analysis::Analysis;
use crate::chem::molecule::Molecule;
use crate::eht::basis::Basis;

pub use contour::{ContourLine, contour_lines, contour_set};
pub use grid::{Grid, GridSpec};
pub use orbital::{OrbitalRef, ResolvedOrbital, find_orbital, resolve};
pub use plane::{Plane, PlaneKind};
pub use projection::{ProjectedAtom, bond_pairs, project_atoms};
pub use sto::OrbitalEvaluator;
pub use svg::{MapSvgOptions, map_to_svg};

/// Smallest and largest grid (points a side).
pub const MIN_GRID: usize = 8;
pub const MAX_GRID: usize = 2048;

/// Default contour magnitudes, bohr^(−3/2).
pub const DEFAULT_LEVELS: [f64; 5] = [0.02, 0.04, 0.08, 0.16, 0.32];

/// Why a map cannot be made.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum MapError {
    #[error("no orbitals to map: the extended Hückel stage did not run for this molecule")]
    NoOrbitals,
    #[error("there is no {kind} {index} (there are {count}; indices are 0-based)")]
    OrbitalOutOfRange {
        kind: &'static str,
        index: usize,
        count: usize,
    },
    #[error("the orbital {label} has no AO coefficients to map")]
    NoCoefficients { label: String },
    #[error("unknown orbital '{label}'; valid names include: {}", examples.join(", "))]
    UnknownOrbital {
        label: String,
        examples: Vec<String>,
    },
    #[error("atom {atom} does not exist (the molecule has {atoms} atoms; indices are 0-based)")]
    AtomOutOfRange { atom: usize, atoms: usize },
    #[error("atom {atom} is given twice; a plane needs distinct atoms")]
    RepeatedAtom { atom: usize },
    #[error(
        "atoms {} are collinear (or coincide) and do not define a plane",
        format_atoms(atoms)
    )]
    CollinearAtoms { atoms: [usize; 3] },
    #[error("atoms {a} and {b} coincide; they define no bond direction")]
    CoincidentAtoms { a: usize, b: usize },
    #[error("a grid of {n} points a side is not usable (it must be {MIN_GRID} to {MAX_GRID})")]
    GridSize { n: usize },
    #[error("the contour level {value} is not usable (levels must be finite and positive)")]
    BadLevel { value: f64 },
    #[error("the margin {value} Å is not usable (it must be finite and 0 to 100 Å)")]
    BadMargin { value: f64 },
}

fn format_atoms(atoms: &[usize; 3]) -> String {
    format!("{}, {}, {}", atoms[0], atoms[1], atoms[2])
}

/// How to sample and contour a map.
#[derive(Clone, Debug, PartialEq)]
pub struct MapOptions {
    /// Grid points a side.
    pub points: usize,
    /// Space around the atoms' projections (Å).
    pub margin: f64,
    /// Contour magnitudes (bohr^(−3/2)), each drawn at + and −.
    pub levels: Vec<f64>,
    /// Trace the nodal line ψ = 0 as well.
    pub nodal_line: bool,
}

impl Default for MapOptions {
    fn default() -> Self {
        MapOptions {
            points: 128,
            margin: 2.0,
            levels: DEFAULT_LEVELS.to_vec(),
            nodal_line: true,
        }
    }
}

impl MapOptions {
    /// Checks the grid size, margin and levels; returns the levels sorted and deduplicated.
    pub fn validated_levels(&self) -> Result<Vec<f64>, MapError> {
        if !(MIN_GRID..=MAX_GRID).contains(&self.points) {
            return Err(MapError::GridSize { n: self.points });
        }
        if !self.margin.is_finite() || !(0.0..=100.0).contains(&self.margin) {
            return Err(MapError::BadMargin { value: self.margin });
        }
        let mut levels = Vec::with_capacity(self.levels.len());
        for &value in &self.levels {
            if !value.is_finite() || value <= 0.0 {
                return Err(MapError::BadLevel { value });
            }
            levels.push(value);
        }
        levels.sort_by(f64::total_cmp);
        levels.dedup();
        Ok(levels)
    }
}

/// A computed orbital map.
#[derive(Clone, Debug, PartialEq)]
pub struct OrbitalMap {
    pub orbital: ResolvedOrbital,
    pub plane: Plane,
    pub grid: Grid,
    /// Contour magnitudes used (ascending).
    pub levels: Vec<f64>,
    /// Contour lines at +level and −level (their `level` carries the sign).
    pub contours: Vec<ContourLine>,
    /// The nodal line ψ = 0 (empty when not asked for or when ψ vanishes on the plane).
    pub nodal: Vec<ContourLine>,
    pub atoms: Vec<ProjectedAtom>,
    pub bonds: Vec<(usize, usize)>,
}

impl OrbitalMap {
    /// True when the orbital is (numerically) zero everywhere on the plane, e.g. a π
    /// orbital on the molecular plane.
    pub fn vanishes(&self) -> bool {
        self.grid.max_abs() < VANISHING
    }
}

/// Below this |ψ| (bohr^(−3/2)) everywhere, the orbital is taken to vanish on the plane.
const VANISHING: f64 = 1e-8;

/// The default plane for mapping `reference`: among the plane of [`Plane::default_for`]
/// through the orbital's atoms, the plane through its first two atoms perpendicular to
/// that, and (for a pyramidal first atom) [`Plane::outward`], the one holding most of the
/// orbital (Σψ² on a coarse grid); so a π orbital is not shown on its own nodal plane and
/// the lone pair of a pyramidal centre is cut along its axis.
pub fn default_plane(analysis: &Analysis, reference: OrbitalRef) -> Result<Plane, MapError> {
    let orbital = resolve(analysis, reference)?;
    let eht = analysis.eht.as_ref().ok_or(MapError::NoOrbitals)?;
    let molecule = &analysis.molecule;
    let first = Plane::default_for(molecule, &orbital.atoms).ok_or(MapError::NoOrbitals)?;
    let mut candidates = vec![match &first.kind {
        PlaneKind::ThroughAtoms(atoms) => first.turned_about_u(PlaneKind::PerpendicularTo(*atoms)),
        _ => first.turned_about_u(PlaneKind::Free),
    }];
    if orbital.atoms.len() == 1
        && let Some(plane) = Plane::outward(molecule, orbital.atoms[0])
    {
        candidates.push(plane);
    }
    let evaluator = OrbitalEvaluator::new(&eht.basis, &orbital.coefficients);
    let weight = |plane: &Plane| {
        let positions: Vec<(f64, f64)> = project_atoms(molecule, plane)
            .iter()
            .map(|a| (a.x, a.y))
            .collect();
        let spec = GridSpec::covering(&positions, 2.0, 32);
        let sum: f64 = Grid::evaluate(&evaluator, plane, &spec)
            .values
            .iter()
            .map(|v| v * v)
            .sum();
        sum * spec.step * spec.step
    };
    // Another plane must clearly win: a near tie keeps the plane through three atoms.
    let mut best = (weight(&first) * 1.05, first);
    for plane in candidates {
        let value = weight(&plane);
        if value > best.0 {
            best = (value, plane);
        }
    }
    Ok(best.1)
}

/// Computes the map of `reference` on `plane`.
pub fn compute_map(
    analysis: &Analysis,
    reference: OrbitalRef,
    plane: &Plane,
    options: &MapOptions,
) -> Result<OrbitalMap, MapError> {
    options.validated_levels()?;
    let orbital = resolve(analysis, reference)?;
    let eht = analysis.eht.as_ref().ok_or(MapError::NoOrbitals)?;
    map_orbital(&analysis.molecule, &eht.basis, orbital, plane, options)
}

/// Computes the map of any orbital given by its AO coefficients in `basis` (the basis of
/// `molecule`), e.g. a single basis function.
pub fn map_orbital(
    molecule: &Molecule,
    basis: &Basis,
    orbital: ResolvedOrbital,
    plane: &Plane,
    options: &MapOptions,
) -> Result<OrbitalMap, MapError> {
    let levels = options.validated_levels()?;
    let evaluator = OrbitalEvaluator::new(basis, &orbital.coefficients);
    let atoms = project_atoms(molecule, plane);
    let positions: Vec<(f64, f64)> = atoms.iter().map(|a| (a.x, a.y)).collect();
    let spec = GridSpec::covering(&positions, options.margin, options.points);
    let grid = Grid::evaluate(&evaluator, plane, &spec);
    let max_abs = grid.max_abs();
    // +level and −level for each magnitude, and the nodal line last.
    let mut wanted: Vec<f64> = Vec::new();
    let mut nodal_level = None;
    if max_abs >= VANISHING {
        for &level in &levels {
            wanted.push(level);
            wanted.push(-level);
        }
        if options.nodal_line {
            // Just above zero, so that grid points lying exactly on a symmetry node count
            // as one side and the line does not flicker through rounding noise.
            let level = max_abs * 1e-9;
            wanted.push(level);
            nodal_level = Some(level);
        }
    }
    let lines = contour_set(&grid, &wanted);
    // The nodal lines are the last ones (contour_set keeps the order of the levels).
    let nodal_count = match nodal_level {
        Some(level) => lines.iter().rev().take_while(|l| l.level == level).count(),
        None => 0,
    };
    let mut contours = lines;
    let nodal = contours.split_off(contours.len() - nodal_count);
    Ok(OrbitalMap {
        orbital,
        plane: plane.clone(),
        grid,
        levels,
        contours,
        nodal,
        atoms,
        bonds: bond_pairs(molecule),
    })
}
