//! The extended Hückel basis: one normalized real Slater-type orbital (STO) per valence
//! function, χ = N r^(n−1) e^(−ζr) Y_lm(θ, φ) with N = (2ζ)^(n+½) / √((2n)!) and real
//! spherical harmonics (e.g. Szabo and Ostlund, *Modern Quantum Chemistry*).
//!
//! Order: atoms in file order; within an atom, shells in the parameter file's order
//! (s, p, d); within a shell, the order of `crate::chem::ao`: s; px, py, pz; dxy, dyz,
//! dz², dxz, dx²−y².

use nalgebra::Vector3;
use serde::{Deserialize, Serialize};

use super::EhtError;
use super::overlap::BOHR_IN_ANGSTROM;
use super::params::{ElementParameters, ParameterSet};
use crate::chem::ao::{AngularKind, AtomicOrbital};
use crate::chem::molecule::Molecule;

/// One shell of the basis placed on its atom.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct BasisShell {
    /// Atom index (0-based).
    pub atom: usize,
    pub n: u8,
    pub l: u8,
    /// Slater exponent in 1/bohr.
    pub zeta: f64,
    /// VSIP (H_ii) in eV.
    pub vsip: f64,
    /// Centre in bohr.
    pub centre: Vector3<f64>,
    /// Index of the shell's first function in the basis.
    pub first: usize,
}

impl BasisShell {
    /// Number of functions: 2l + 1.
    pub fn size(&self) -> usize {
        2 * self.l as usize + 1
    }
}

/// The basis of a molecule: functions, exponents and VSIPs index-aligned.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Basis {
    /// What each function is (atom, n, angular part).
    pub orbitals: Vec<AtomicOrbital>,
    /// Slater exponent of each function (1/bohr).
    pub exponents: Vec<f64>,
    /// VSIP of each function (eV), the diagonal of H.
    pub vsip: Vec<f64>,
    /// The shells the functions come from, in basis order.
    pub shells: Vec<BasisShell>,
    /// For each atom, the range of its functions in the basis.
    pub atom_ranges: Vec<std::ops::Range<usize>>,
}

impl Basis {
    pub fn len(&self) -> usize {
        self.orbitals.len()
    }

    pub fn is_empty(&self) -> bool {
        self.orbitals.is_empty()
    }

    /// Atom index of basis function `index`.
    pub fn atom_of(&self, index: usize) -> usize {
        self.orbitals[index].atom
    }
}

/// Builds the valence basis of `molecule` from `parameters`, with `overrides` taking
/// precedence per element. An element without parameters is `EhtError::MissingParameters`.
pub fn build_basis(
    molecule: &Molecule,
    parameters: &ParameterSet,
    overrides: &[ElementParameters],
) -> Result<Basis, EhtError> {
    for row in overrides {
        row.validate()?;
    }
    let mut basis = Basis {
        orbitals: Vec::new(),
        exponents: Vec::new(),
        vsip: Vec::new(),
        shells: Vec::new(),
        atom_ranges: Vec::with_capacity(molecule.atoms.len()),
    };
    for (atom_index, atom) in molecule.atoms.iter().enumerate() {
        if atom.position.iter().any(|x| !x.is_finite()) {
            return Err(EhtError::NonFiniteCoordinate { atom: atom_index });
        }
        let row = parameters.lookup(atom.element, overrides)?;
        let start = basis.orbitals.len();
        let centre = atom.position / BOHR_IN_ANGSTROM;
        let mut shells: Vec<_> = row.shells.iter().collect();
        shells.sort_by_key(|shell| shell.l);
        for shell in shells {
            basis.shells.push(BasisShell {
                atom: atom_index,
                n: shell.n,
                l: shell.l,
                zeta: shell.zeta,
                vsip: shell.vsip,
                centre,
                first: basis.orbitals.len(),
            });
            for &kind in AngularKind::shell(shell.l) {
                basis.orbitals.push(AtomicOrbital {
                    atom: atom_index,
                    n: shell.n,
                    kind,
                });
                basis.exponents.push(shell.zeta);
                basis.vsip.push(shell.vsip);
            }
        }
        basis.atom_ranges.push(start..basis.orbitals.len());
    }
    Ok(basis)
}
