//! The coordinates a Walsh scan can drive (DESIGN §4.7): a bond length, a bond angle, a
//! dihedral, or a symmetric deformation of one centre (pyramidalization of AXn, the
//! symmetric bend of AX2, the symmetric stretch of all A–X bonds). Each coordinate can be
//! measured on a molecule and set to a value; the internal coordinates use the molecule's
//! own geometry editors, the symmetric ones live in [`super::symmetric`].

use serde::{Deserialize, Serialize};

use super::ScanError;
use super::symmetric;
use crate::chem::molecule::Molecule;

/// What a scan varies. Atom indices are 0-based, in file order (as in the JSON report).
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum Coordinate {
    /// Distance i–j in Å; the smaller fragment moves along the axis.
    Bond { i: usize, j: usize },
    /// Angle i–j–k in degrees, j the vertex.
    Angle { i: usize, j: usize, k: usize },
    /// Dihedral i–j–k–l in degrees, about the j–k bond.
    Dihedral {
        i: usize,
        j: usize,
        k: usize,
        l: usize,
    },
    /// The common X–A–X angle (degrees, between neighbouring ligands around the axis) of an
    /// AXn centre (n ≥ 3) whose ligands are kept symmetric about the axis: ammonia goes
    /// from pyramidal C3v to planar D3h at 120°.
    Pyramidalize { centre: usize },
    /// The X–A–X angle (degrees) of an AX2 centre, both bonds moved symmetrically about
    /// the bisector.
    SymmetricBend { centre: usize },
    /// All A–X bond lengths of a centre together (Å).
    SymmetricStretch { centre: usize },
}

impl Coordinate {
    /// The unit of the coordinate's value: "Å" or "°".
    pub fn unit(&self) -> &'static str {
        match self {
            Coordinate::Bond { .. } | Coordinate::SymmetricStretch { .. } => "Å",
            _ => "°",
        }
    }

    /// A short description for axis titles and CSV headers, e.g. "angle 1–0–2 (°)".
    pub fn describe(&self) -> String {
        let text = match *self {
            Coordinate::Bond { i, j } => format!("bond {i}–{j}"),
            Coordinate::Angle { i, j, k } => format!("angle {i}–{j}–{k}"),
            Coordinate::Dihedral { i, j, k, l } => format!("dihedral {i}–{j}–{k}–{l}"),
            Coordinate::Pyramidalize { centre } => {
                format!("pyramidalization X–A–X at atom {centre}")
            }
            Coordinate::SymmetricBend { centre } => {
                format!("symmetric bend X–A–X at atom {centre}")
            }
            Coordinate::SymmetricStretch { centre } => {
                format!("symmetric stretch A–X at atom {centre}")
            }
        };
        format!("{text} ({})", self.unit())
    }

    /// The atoms the coordinate names.
    fn atoms(&self) -> Vec<usize> {
        match *self {
            Coordinate::Bond { i, j } => vec![i, j],
            Coordinate::Angle { i, j, k } => vec![i, j, k],
            Coordinate::Dihedral { i, j, k, l } => vec![i, j, k, l],
            Coordinate::Pyramidalize { centre }
            | Coordinate::SymmetricBend { centre }
            | Coordinate::SymmetricStretch { centre } => vec![centre],
        }
    }

    /// Checks the indices (in range, distinct) and the bonds the coordinate needs: the
    /// angle's two arms, the dihedral's three bonds, the centre's ligands (≥ 3 for a
    /// pyramidalization, exactly 2 for a symmetric bend, ≥ 1 for a stretch).
    pub fn check(&self, molecule: &Molecule) -> Result<(), ScanError> {
        let atoms = self.atoms();
        for &index in &atoms {
            if index >= molecule.len() {
                return Err(ScanError::AtomOutOfRange {
                    index,
                    count: molecule.len(),
                });
            }
        }
        for (n, a) in atoms.iter().enumerate() {
            if atoms[n + 1..].contains(a) {
                return Err(ScanError::RepeatedAtom { index: *a });
            }
        }
        let bonded = |a: usize, b: usize| -> Result<(), ScanError> {
            match molecule.bond(a, b) {
                Some(_) => Ok(()),
                None => Err(ScanError::NotBonded { a, b }),
            }
        };
        match *self {
            Coordinate::Bond { .. } => Ok(()),
            Coordinate::Angle { i, j, k } => {
                bonded(i, j)?;
                bonded(j, k)
            }
            Coordinate::Dihedral { i, j, k, l } => {
                bonded(i, j)?;
                bonded(j, k)?;
                bonded(k, l)
            }
            Coordinate::Pyramidalize { centre } => {
                symmetric::ligands(molecule, centre, 3..=usize::MAX).map(|_| ())
            }
            Coordinate::SymmetricBend { centre } => {
                symmetric::ligands(molecule, centre, 2..=2).map(|_| ())
            }
            Coordinate::SymmetricStretch { centre } => {
                symmetric::ligands(molecule, centre, 1..=usize::MAX).map(|_| ())
            }
        }
    }

    /// The coordinate's value at `molecule`'s geometry (for a symmetric deformation, the
    /// mean over the ligands).
    pub fn measure(&self, molecule: &Molecule) -> Result<f64, ScanError> {
        self.check(molecule)?;
        match *self {
            Coordinate::Bond { i, j } => Ok(molecule.distance(i, j)?),
            Coordinate::Angle { i, j, k } => Ok(molecule.angle(i, j, k)?),
            Coordinate::Dihedral { i, j, k, l } => Ok(molecule.dihedral(i, j, k, l)?),
            Coordinate::Pyramidalize { centre } | Coordinate::SymmetricBend { centre } => {
                symmetric::mean_neighbour_angle(molecule, centre)
            }
            Coordinate::SymmetricStretch { centre } => {
                symmetric::mean_bond_length(molecule, centre)
            }
        }
    }

    /// A copy of `molecule` with the coordinate set to `value`. The bond list is kept as it
    /// is (the scan follows one bonding topology).
    pub fn apply(&self, molecule: &Molecule, value: f64) -> Result<Molecule, ScanError> {
        let mut moved = molecule.clone();
        match *self {
            Coordinate::Bond { i, j } => moved.set_distance(i, j, value)?,
            Coordinate::Angle { i, j, k } => moved.set_angle(i, j, k, value)?,
            Coordinate::Dihedral { i, j, k, l } => moved.set_dihedral(i, j, k, l, value)?,
            Coordinate::Pyramidalize { centre } | Coordinate::SymmetricBend { centre } => {
                symmetric::set_symmetric_angle(&mut moved, centre, value)?
            }
            Coordinate::SymmetricStretch { centre } => {
                symmetric::set_bond_lengths(&mut moved, centre, value)?
            }
        }
        Ok(moved)
    }
}
