//! The symmetry engine: point-group detection, character tables, AO representations,
//! SALCs and Mulliken labels of molecular orbitals (DESIGN §4.2).
//!
//! Method: the standard detection route (centre of mass, inertia tensor, candidate axes and
//! planes from the atoms, each operation tested against the geometry with a tolerance in Å;
//! see e.g. Cotton, *Chemical Applications of Group Theory*, 3rd ed., ch. 3 for the
//! classification flow chart), then the group's ideal operations are placed in a standard
//! frame fitted to the molecule, so that every operation set is an exact group. Character
//! tables and labels follow Cotton and Atkins, Child and Phillips, *Tables for Group Theory*.

pub mod adapt;
mod axial;
pub mod detect;
mod frame;
pub mod label;
pub mod ops;
pub mod salc;
pub mod summary;
pub mod tables;

use nalgebra::{Matrix3, Vector3};
use serde::{Deserialize, Serialize};
use thiserror::Error;

use crate::chem::Molecule;

pub use adapt::{SetRotation, degenerate_set_rotations};
pub use detect::detect;
pub use label::{OrbitalLabel, core_irrep_counts, label_orbitals};
pub use ops::{OperationKind, PointGroup};
pub use salc::{
    Salc, ao_representation, average_over_group, reduce, salcs, shell_matrix, span, span_text,
};
pub use summary::{SymmetrySummary, central_atom, summarize};
pub use tables::{CharacterTable, ClassInfo, Irrep, IrrepLabel, LinearSign, character_table};

/// Largest tolerance accepted (Å): beyond it distinct atoms could match each other.
pub const MAX_TOLERANCE: f64 = 0.5;

/// Which in-plane axis is x for planar C2v and D2h molecules.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum AxisConvention {
    /// Mulliken (1955): x perpendicular to the molecular plane (water's out-of-plane lone
    /// pair is b1, ethylene's π is b3u).
    #[default]
    MullikenPerpendicularX,
    /// x in the molecular plane (water's out-of-plane lone pair is b2; for D2h the plane
    /// normal is z, so ethylene's π is b1u).
    InPlaneX,
}

/// How orbitals are numbered within each irrep.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub enum Numbering {
    /// Core orbitals of the heavy atoms counted first (water's HOMO is 1b1, lowest valence
    /// a1 is 2a1).
    #[default]
    CoreInclusive,
    /// Valence orbitals only (the lowest a1 is 1a1).
    ValenceOnly,
}

/// User settings of the symmetry stage.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct SymmetrySettings {
    /// Largest displacement (Å) for which an operation still counts as a symmetry.
    pub tolerance: f64,
    pub axis_convention: AxisConvention,
    pub numbering: Numbering,
}

impl Default for SymmetrySettings {
    fn default() -> Self {
        SymmetrySettings {
            tolerance: 0.01,
            axis_convention: AxisConvention::default(),
            numbering: Numbering::default(),
        }
    }
}

/// Why the symmetry stage could not give an answer.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum SymmetryError {
    #[error("the symmetry tolerance must be a finite number of Å in (0, {MAX_TOLERANCE}]; got {0}")]
    InvalidTolerance(f64),
    #[error("the molecule has no atoms")]
    NoAtoms,
    #[error("a single atom has spherical symmetry (Kh), which is not a molecular point group")]
    SingleAtom,
    #[error("{0} atoms is more than the limit of {max}", max = crate::chem::molecule::MAX_ATOMS)]
    TooManyAtoms(usize),
    #[error("atom {0} has a non-finite coordinate")]
    NonFiniteCoordinate(usize),
    #[error("atoms {0} and {1} coincide, so no symmetry operation can be tested")]
    CoincidentAtoms(usize, usize),
    #[error(
        "the symmetry elements found point to {0}, but its operations do not all map the molecule \
         onto itself within the tolerance; try a larger tolerance or symmetrize"
    )]
    Inconsistent(String),
    #[error("the orbitals are not closed under the group's operations: {0}")]
    BasisNotClosed(String),
    #[error("the representation does not reduce to whole numbers of irreps: {0}")]
    NonIntegerReduction(String),
    #[error("sizes do not match: {0}")]
    DimensionMismatch(String),
}

/// One symmetry operation of the molecule.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct SymmetryOperation {
    /// The operation in the molecule's own Cartesian frame, about `Symmetry::origin`.
    pub matrix: Matrix3<f64>,
    /// The same operation in the standard frame (rows of `Symmetry::frame` as x, y, z).
    pub standard: Matrix3<f64>,
    pub kind: OperationKind,
    /// Index into `CharacterTable::classes`.
    pub class: usize,
    /// Atom i is carried onto atom `permutation[i]`.
    pub permutation: Vec<usize>,
}

/// The point group of a molecule with its operations, frame and character table.
#[derive(Clone, Debug, PartialEq)]
pub struct Symmetry {
    pub group: PointGroup,
    pub operations: Vec<SymmetryOperation>,
    /// Centre of mass (Å), the fixed point of every operation.
    pub origin: Vector3<f64>,
    /// Rows: the standard x, y, z axes expressed in molecule coordinates.
    pub frame: Matrix3<f64>,
    pub table: CharacterTable,
    /// The tolerance used (Å).
    pub tolerance: f64,
    /// Largest distance (Å) between an atom's image and its partner under any operation.
    pub max_deviation: f64,
    /// Remarks for the user (e.g. a lower group reported because a higher one did not fit).
    pub notes: Vec<String>,
}

impl Symmetry {
    /// Sets of symmetry-equivalent atoms (orbits), each ascending, ordered by first atom.
    pub fn equivalent_atoms(&self) -> Vec<Vec<usize>> {
        let n = self.operations.first().map_or(0, |op| op.permutation.len());
        let mut seen = vec![false; n];
        let mut sets = Vec::new();
        for i in 0..n {
            if seen[i] {
                continue;
            }
            let mut set: Vec<usize> = self.operations.iter().map(|op| op.permutation[i]).collect();
            set.sort_unstable();
            set.dedup();
            for &j in &set {
                seen[j] = true;
            }
            sets.push(set);
        }
        sets
    }
}

/// The geometry averaged over the group's operations: exactly symmetric (to rounding) and
/// no atom moves more than the tolerance used for detection.
pub fn symmetrize(molecule: &Molecule, symmetry: &Symmetry) -> Molecule {
    let mut out = molecule.clone();
    let h = symmetry.operations.len() as f64;
    if h == 0.0 {
        return out;
    }
    for (i, atom) in out.atoms.iter_mut().enumerate() {
        let mut sum = Vector3::zeros();
        let mut ok = true;
        for op in &symmetry.operations {
            let Some(&j) = op.permutation.get(i) else {
                ok = false;
                break;
            };
            let Some(partner) = molecule.atoms.get(j) else {
                ok = false;
                break;
            };
            sum += op.matrix.transpose() * (partner.position - symmetry.origin);
        }
        if ok {
            atom.position = symmetry.origin + sum / h;
        }
    }
    out
}
