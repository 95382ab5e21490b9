//! Atoms and bonds projected orthogonally onto the map's plane, with each atom's height
//! above the plane so that drawings can tell in-plane atoms from those behind or in front.

use crate::chem::molecule::Molecule;

use super::plane::Plane;

/// Atoms closer to the plane than this (Å) count as lying in it (common practice, no
/// source: well below any bond length, above coordinate rounding).
pub const IN_PLANE_TOLERANCE: f64 = 0.05;

/// One atom seen on the plane.
#[derive(Clone, Debug, PartialEq)]
pub struct ProjectedAtom {
    pub index: usize,
    pub symbol: String,
    /// Plane coordinates (Å).
    pub x: f64,
    pub y: f64,
    /// Signed distance from the plane along its normal (Å).
    pub height: f64,
}

impl ProjectedAtom {
    pub fn in_plane(&self) -> bool {
        self.height.abs() <= IN_PLANE_TOLERANCE
    }
}

/// Every atom of `molecule` projected onto `plane`.
pub fn project_atoms(molecule: &Molecule, plane: &Plane) -> Vec<ProjectedAtom> {
    molecule
        .atoms
        .iter()
        .enumerate()
        .map(|(index, atom)| {
            let (x, y, height) = plane.project(&atom.position);
            ProjectedAtom {
                index,
                symbol: atom.element.symbol().to_string(),
                x,
                y,
                height,
            }
        })
        .collect()
}

/// The molecule's bonds as pairs of atom indices (both valid), for drawing between the
/// projected atoms.
pub fn bond_pairs(molecule: &Molecule) -> Vec<(usize, usize)> {
    let count = molecule.atoms.len();
    molecule
        .bonds
        .iter()
        .filter(|bond| bond.a < count && bond.b < count && bond.a != bond.b)
        .map(|bond| (bond.a, bond.b))
        .collect()
}
