//! Walsh scans (DESIGN §4.7; A. D. Walsh, J. Chem. Soc. 1953, 2260–2331): one coordinate
//! is stepped over a range and the whole analysis (`Analysis::run`) runs at every point,
//! in parallel over points, cancellable, with progress. The canonical levels are then
//! followed from point to point ([`follow`]) so that each curve keeps one name, and per
//! point the hybridization index λ of every centre's bonds and lone pairs (geometric and
//! localized-MO models) and the sum of occupied orbital energies are kept.
//!
//! - [`coordinate`]: what can be scanned; [`symmetric`]: the symmetric deformations;
//! - [`engine`]: planning (all validation before any work), the parallel run, progress;
//! - [`point`]: what is kept of each point's analysis;
//! - [`follow`]: level following and curve names;
//! - [`csv`] and [`svg`]: the exports.

pub mod coordinate;
pub mod csv;
pub mod engine;
pub mod follow;
pub mod palette;
pub mod point;
pub mod svg;
mod symmetric;

use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use coordinate::Coordinate;
pub use engine::{ScanProgress, run_scan, run_scan_with};
pub use point::{Lambda, LambdaKey, PointData};

use crate::chem::molecule::{MIN_SEPARATION, Molecule, MoleculeError};

/// Fewest points a scan may have: one point is not a scan.
pub const MIN_POINTS: usize = 2;
/// Most points a scan may have.
pub const MAX_POINTS: usize = 10_000;

/// Why a scan cannot start (or was stopped). Every check runs before any analysis.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ScanError {
    #[error(
        "atom index {index} is out of range (the molecule has {count} atoms; indices start at 0)"
    )]
    AtomOutOfRange { index: usize, count: usize },
    #[error("atom {index} is named twice; the coordinate needs different atoms")]
    RepeatedAtom { index: usize },
    #[error("atoms {a} and {b} are not bonded; this coordinate needs that bond")]
    NotBonded { a: usize, b: usize },
    #[error("atom {centre} has {found} bonded neighbours; this deformation needs {needed}")]
    LigandCount {
        centre: usize,
        found: usize,
        needed: String,
    },
    #[error(
        "ligand {ligand} of atom {centre} lies in a ring through it; the ligands cannot move independently"
    )]
    RingAtCentre { centre: usize, ligand: usize },
    #[error("ligand {ligand} of atom {centre} lies on the symmetry axis of the other ligands")]
    LigandOnAxis { centre: usize, ligand: usize },
    #[error(
        "a symmetric X–A–X angle of {value}° is not possible with {ligands} ligands (0° to {widest}°, the planar value)"
    )]
    SymmetricAngle {
        value: f64,
        ligands: usize,
        widest: f64,
    },
    #[error("a bond length of {value} Å is not possible (it must be at least {MIN_SEPARATION} Å)")]
    BondLength { value: f64 },
    #[error("the range {from} to {to} is not a pair of finite numbers")]
    NonFiniteRange { from: f64, to: f64 },
    #[error(
        "{points} points: a scan needs at least {MIN_POINTS} (one point is a single analysis; the range is {MIN_POINTS} to {MAX_POINTS})"
    )]
    TooFewPoints { points: usize },
    #[error(
        "{points} points is more than the limit of {MAX_POINTS} (the range is {MIN_POINTS} to {MAX_POINTS})"
    )]
    TooManyPoints { points: usize },
    #[error("the starting molecule is not valid: {0}")]
    InvalidMolecule(MoleculeError),
    #[error("cannot set the geometry: {0}")]
    Geometry(#[from] MoleculeError),
    #[error("at point {point} ({value}): {message}")]
    AtPoint {
        point: usize,
        value: f64,
        message: String,
    },
    #[error(
        "at point {point} ({value}) atoms {a} and {b} would be {distance:.3} Å apart, closer than {MIN_SEPARATION} Å"
    )]
    Collision {
        point: usize,
        value: f64,
        a: usize,
        b: usize,
        distance: f64,
    },
    #[error("the scan was cancelled after {done} of {total} points")]
    Cancelled { done: usize, total: usize },
    #[error("a scan worker stopped unexpectedly: {0}")]
    Worker(String),
}

/// A scan to run: `steps` evenly spaced values of `coordinate` from `from` to `to`
/// (both ends included), in the coordinate's unit (Å or degrees).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct ScanRequest {
    pub coordinate: Coordinate,
    pub from: f64,
    pub to: f64,
    /// Number of points (the CLI's `--steps`), ends included: 2 to 10 000.
    pub steps: usize,
}

impl ScanRequest {
    /// The coordinate values of the points.
    pub fn values(&self) -> Vec<f64> {
        let last = self.steps.saturating_sub(1).max(1) as f64;
        (0..self.steps)
            .map(|k| self.from + (self.to - self.from) * k as f64 / last)
            .collect()
    }

    /// Validates the request against `molecule` and builds every point's geometry:
    /// indices, bonds, the point count, the range, and that no two atoms come closer than
    /// the molecule's minimum separation at any point. Nothing is analysed here.
    pub fn plan(&self, molecule: &Molecule) -> Result<Vec<(f64, Molecule)>, ScanError> {
        if self.steps < MIN_POINTS {
            return Err(ScanError::TooFewPoints { points: self.steps });
        }
        if self.steps > MAX_POINTS {
            return Err(ScanError::TooManyPoints { points: self.steps });
        }
        if !(self.from.is_finite() && self.to.is_finite()) {
            return Err(ScanError::NonFiniteRange {
                from: self.from,
                to: self.to,
            });
        }
        molecule.validate().map_err(ScanError::InvalidMolecule)?;
        self.coordinate.check(molecule)?;
        let mut plan = Vec::with_capacity(self.steps);
        for (point, value) in self.values().into_iter().enumerate() {
            let geometry =
                self.coordinate
                    .apply(molecule, value)
                    .map_err(|error| ScanError::AtPoint {
                        point,
                        value,
                        message: error.to_string(),
                    })?;
            if let Some((a, b, distance)) = closest_pair_below(&geometry, MIN_SEPARATION) {
                return Err(ScanError::Collision {
                    point,
                    value,
                    a,
                    b,
                    distance,
                });
            }
            plan.push((value, geometry));
        }
        Ok(plan)
    }
}

/// The first pair of atoms closer than `limit` Å, if any.
fn closest_pair_below(molecule: &Molecule, limit: f64) -> Option<(usize, usize, f64)> {
    let atoms = &molecule.atoms;
    for a in 0..atoms.len() {
        for b in a + 1..atoms.len() {
            let distance = (atoms[a].position - atoms[b].position).norm();
            if distance.is_nan() || distance < limit {
                return Some((a, b, distance));
            }
        }
    }
    None
}

/// One followed level across the scan.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Curve {
    /// The level's label at the reference point (see [`Scan::reference_point`]); the
    /// members of a degenerate level share it.
    pub label: String,
    /// `label`, made unique with " [1]", " [2]" for degenerate partners (CSV headers).
    pub name: String,
    /// Irrep at the reference point, when symmetry is known.
    pub irrep: Option<String>,
    /// Energy (eV) at each point; `None` where the point failed.
    pub energies: Vec<Option<f64>>,
    /// The level's own label at each point (e.g. 3a1 at C3v points, 1a2″ at planar D3h).
    pub labels: Vec<Option<String>>,
    /// Occupation at each point.
    pub occupancies: Vec<Option<f64>>,
}

/// λ of one hybrid across the scan.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LambdaSeries {
    pub key: LambdaKey,
    /// e.g. "λ geometric N0–H1", "λ localized n(N0)".
    pub name: String,
    /// At each point; `None` where the point failed or the hybrid is absent.
    pub values: Vec<Option<Lambda>>,
}

/// One point of a scan.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ScanPoint {
    /// Coordinate value (Å or degrees).
    pub value: f64,
    /// The geometry analysed (for "set this geometry" in the GUI).
    #[serde(skip)]
    pub geometry: Molecule,
    /// Schoenflies symbol, when the symmetry stage succeeded.
    pub point_group: Option<String>,
    /// Σ occupancy × ε over the canonical levels (eV).
    pub sum_occupied_ev: Option<f64>,
    /// Why the point has no results; the scan went on without it.
    pub failure: Option<String>,
    /// Stages that failed at this point while the MOs were still computed.
    pub notes: Vec<String>,
}

/// A finished scan: the points, the followed curves, the λ series.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Scan {
    pub request: ScanRequest,
    pub points: Vec<ScanPoint>,
    pub curves: Vec<Curve>,
    pub lambdas: Vec<LambdaSeries>,
    /// The point whose labels name the curves: the first point of the point group that
    /// most points share (the scan's generic symmetry), so a curve is named in the
    /// symmetry that holds along most of the scan, not at a special end point.
    pub reference_point: Option<usize>,
}

impl Scan {
    /// The coordinate values of the points.
    pub fn values(&self) -> Vec<f64> {
        self.points.iter().map(|p| p.value).collect()
    }

    /// Indices of the points that failed.
    pub fn failed_points(&self) -> Vec<usize> {
        (0..self.points.len())
            .filter(|&k| self.points[k].failure.is_some())
            .collect()
    }

    /// The point nearest to `value` (for a marker at the current geometry).
    pub fn nearest_point(&self, value: f64) -> Option<usize> {
        (0..self.points.len()).min_by(|&a, &b| {
            (self.points[a].value - value)
                .abs()
                .total_cmp(&(self.points[b].value - value).abs())
        })
    }
}
