//! The geometric and maximum-overlap hybrid models (DESIGN §4.4), applied on the Lewis
//! structure read from the wavefunction (`crate::localized`): which partners, how many π
//! orbitals and lone pairs each centre has come from the localized orbitals, so CO is
//! treated as C≡O whatever the distances suggest.
//!
//! - [`centres`]: the centre descriptions from the localized picture;
//! - [`coulson`]: the geometric model (Coulson, *Valence*, 1952);
//! - [`max_overlap`]: the maximum-overlap model (Löwdin symmetric orthogonalization,
//!   iterated over centres; Coulson and Moffitt, Phil. Mag. 40, 1 (1949) for bent bonds);
//! - `iterate`: each centre's working σ hybrids, from the geometric model or a
//!   maximum-overlap start, and the maximum-overlap iteration over the centres;
//! - `complete`: a centre's working hybrids completed (lone pairs, vacant), labelled and
//!   signed into its set of four;
//! - `describe`: [`describe_hybrid`] and [`describe_centre`], how a set is reported;
//! - [`energies`]: ε(sp^λ) = (ε_s + λ ε_p)/(1+λ);
//! - [`substitute`]: a model's hybrids put in place of the wavefunction's for the ladder.
//!
//! [`analyze`] runs a model for the centres it can describe. Results are partial: a centre
//! that cannot be described is recorded in `errors` and the others are still reported;
//! the wavefunction's own hybrids stand in for it.

pub mod centres;
mod complete;
pub mod coulson;
mod describe;
pub mod energies;
mod iterate;
pub mod max_overlap;
pub mod substitute;

use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use crate::localized::hybrids::{HybridKind, HybridModel};
pub use centres::CentreSpec;
pub use coulson::{CoulsonError, GeometricHybrids, LonePairConvention, SpHybrid};
pub use describe::{describe_centre, describe_hybrid};
pub use energies::{gap_fraction, hybrid_energy};

use crate::chem::ao::AngularKind;
use crate::chem::molecule::Molecule;
use crate::eht::EhtResult;

/// Settings of the hybrid stage.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct HybridSettings {
    pub model: HybridModel,
    pub lone_pair_convention: LonePairConvention,
}

/// Why a centre (or the stage) could not be described. Each names the atoms concerned.
#[derive(Debug, Clone, PartialEq, Error, Serialize, Deserialize)]
#[serde(tag = "error", rename_all = "snake_case")]
pub enum HybridError {
    #[error(
        "the orbital basis covers {basis_atoms} atoms but the molecule has {atoms}; hybrids need the extended Hückel result of this molecule"
    )]
    BasisMismatch { atoms: usize, basis_atoms: usize },
    #[error("atom {atom} has a non-finite coordinate")]
    NonFiniteCoordinate { atom: usize },
    #[error(
        "atom {atom}: its partners' orbitals are linearly dependent on it (coincident bond directions)"
    )]
    DependentPartners { atom: usize },
    #[error(
        "the maximum-overlap iteration did not converge in {iterations} steps (last change {change:.2e}); the last hybrids are shown"
    )]
    NotConverged { iterations: usize, change: f64 },
}

/// One orbital of a centre's orthonormal s,p set.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Hybrid {
    pub kind: HybridKind,
    /// Partner atom (bond and π orbitals), `None` for lone pairs and vacant orbitals.
    pub partner: Option<usize>,
    /// Coefficients of the centre's (s, px, py, pz).
    pub local: [f64; 4],
    /// The same as a full AO coefficient vector (length = basis size).
    pub coefficients: Vec<f64>,
    /// λ = p share / s share; `None` for a pure p orbital.
    pub lambda: Option<f64>,
    pub s_percent: f64,
    pub p_percent: f64,
    /// Unit vector of the p part (zero for pure s).
    pub direction: [f64; 3],
    /// Angle between the hybrid and the internuclear axis, degrees (bond hybrids).
    pub bending_degrees: Option<f64>,
    /// ε(sp^λ) = (ε_s + λ ε_p)/(1+λ), eV.
    pub energy_ev: f64,
    /// λ/(1+λ): how far up the s–p gap the hybrid lies.
    pub gap_fraction: f64,
}

/// Angle between the directions of two hybrids of one centre.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct InterorbitalAngle {
    /// Indices into the centre's `hybrids`.
    pub first: usize,
    pub second: usize,
    pub degrees: f64,
}

/// The hybrids of one centre.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct CentreHybrids {
    pub atom: usize,
    pub element: String,
    /// The model actually used for this centre.
    pub model: HybridModel,
    pub sigma_partners: Vec<usize>,
    pub pi_bonds: usize,
    /// Doubly occupied lone pairs.
    pub lone_pairs: usize,
    /// One more lone-pair orbital carries a single electron (radical).
    pub single_electron: bool,
    pub formal_charge: i32,
    pub steric_number: usize,
    /// H_ss and the mean H_pp of the centre, eV.
    pub eps_s: f64,
    pub eps_p: f64,
    /// Bonds (in partner order), π orbitals, lone pairs (s-richest first), vacant: always
    /// the full orthonormal set of four.
    pub hybrids: Vec<Hybrid>,
    /// Between every two bond or lone-pair hybrids.
    pub interorbital_angles: Vec<InterorbitalAngle>,
    /// RMS of Coulson's orthogonality conditions (geometric model with ≥ 4 bonds).
    pub residual: Option<f64>,
    /// Why a model was replaced, and other remarks.
    pub notes: Vec<String>,
}

/// Everything the hybrid stage computes.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
pub struct HybridAnalysis {
    /// The model asked for.
    pub model: HybridModel,
    pub centres: Vec<CentreHybrids>,
    pub errors: Vec<HybridError>,
    pub notes: Vec<String>,
    /// Iterations of the maximum-overlap loop (0 when no centre needed it).
    pub iterations: usize,
    pub converged: bool,
}

impl HybridAnalysis {
    /// The hybrids of `atom`, if it is a centre.
    pub fn centre(&self, atom: usize) -> Option<&CentreHybrids> {
        self.centres.iter().find(|c| c.atom == atom)
    }
}

/// For every atom: the index of its valence s function and of its (s, px, py, pz).
pub(crate) fn atom_orbital_indices(
    molecule: &Molecule,
    eht: &EhtResult,
) -> (Vec<Option<usize>>, Vec<Option<[usize; 4]>>) {
    let atoms = molecule.atoms.len();
    let mut s = vec![None; atoms];
    let mut sp = vec![None; atoms];
    for (atom, range) in eht.basis.atom_ranges.iter().enumerate().take(atoms) {
        let find = |kind: AngularKind| {
            range
                .clone()
                .find(|&i| eht.basis.orbitals.get(i).is_some_and(|o| o.kind == kind))
        };
        s[atom] = find(AngularKind::S);
        if let (Some(a), Some(x), Some(y), Some(z)) = (
            s[atom],
            find(AngularKind::Px),
            find(AngularKind::Py),
            find(AngularKind::Pz),
        ) {
            sp[atom] = Some([a, x, y, z]);
        }
    }
    (s, sp)
}

/// Runs the geometric or maximum-overlap model (`settings.model`) for the centres
/// `specs` (from [`centres::from_picture`]). Never panics on molecule data; problems are in
/// `errors` and `notes`. The localized model is not run here (it is the wavefunction's
/// own reading): its result is empty.
pub fn analyze(
    molecule: &Molecule,
    eht: &EhtResult,
    settings: &HybridSettings,
    specs: Vec<CentreSpec>,
) -> HybridAnalysis {
    let mut analysis = HybridAnalysis {
        model: settings.model,
        converged: true,
        ..HybridAnalysis::default()
    };
    if let Some(error) = input_error(molecule, eht) {
        analysis.errors.push(error);
        return analysis;
    }
    if settings.model == HybridModel::Localized {
        return analysis;
    }
    let (s_index, sp_index) = atom_orbital_indices(molecule, eht);
    let mut states = iterate::start_states(molecule, settings, specs, &mut analysis.errors);
    let projection = iterate::Projection {
        molecule,
        overlap: &eht.overlap,
        s_index: &s_index,
        sp_index: &sp_index,
    };
    (analysis.iterations, analysis.converged) =
        iterate::iterate(&mut states, &projection, &mut analysis.errors);
    for state in states.states.into_iter().filter(|state| !state.failed) {
        match complete::centre_of_state(molecule, eht, state, settings.lone_pair_convention) {
            Ok(Some(centre)) => analysis.centres.push(centre),
            Ok(None) => {}
            Err(error) => analysis.errors.push(error),
        }
    }
    analysis
}

/// Why the stage cannot run at all: a basis or matrices not of this molecule, or a
/// non-finite coordinate (the models would turn it into NaN hybrids).
fn input_error(molecule: &Molecule, eht: &EhtResult) -> Option<HybridError> {
    let n = eht.basis.len();
    if eht.basis.atom_ranges.len() != molecule.atoms.len()
        || eht.overlap.nrows() != n
        || eht.overlap.ncols() != n
        || eht.hamiltonian.nrows() != n
        || eht.hamiltonian.ncols() != n
    {
        return Some(HybridError::BasisMismatch {
            atoms: molecule.atoms.len(),
            basis_atoms: eht.basis.atom_ranges.len(),
        });
    }
    molecule
        .atoms
        .iter()
        .position(|a| a.position.iter().any(|x| !x.is_finite()))
        .map(|atom| HybridError::NonFiniteCoordinate { atom })
}
