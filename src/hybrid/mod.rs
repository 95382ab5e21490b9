//! The geometric and maximum-overlap hybrid models (DESIGN §4.4), applied on the Lewis
//! structure read from the wavefunction (`crate::localized`): which partners, how many π
//! orbitals and lone pairs each centre has come from the localized orbitals, so CO is
//! treated as C≡O whatever the distances suggest.
//!
//! - [`centres`]: the centre descriptions from the localized picture;
//! - [`coulson`]: the geometric model (Coulson, *Valence*, 1952);
//! - [`max_overlap`]: the maximum-overlap model (Löwdin symmetric orthogonalization,
//!   iterated over centres; Coulson and Moffitt, Phil. Mag. 40, 1 (1949) for bent bonds);
//! - [`energies`]: ε(sp^λ) = (ε_s + λ ε_p)/(1+λ);
//! - [`substitute`]: a model's hybrids put in place of the wavefunction's for the ladder.
//!
//! [`analyze`] runs a model for the centres it can describe. Results are partial: a centre
//! that cannot be described is recorded in `errors` and the others are still reported;
//! the wavefunction's own hybrids stand in for it.

pub mod centres;
pub mod coulson;
pub mod energies;
pub mod max_overlap;
pub mod substitute;

use nalgebra::{Vector3, Vector4};
use serde::{Deserialize, Serialize};
use thiserror::Error;

pub use crate::localized::hybrids::{HybridKind, HybridModel};
pub use centres::CentreSpec;
pub use coulson::{CoulsonError, GeometricHybrids, LonePairConvention, SpHybrid};
pub use energies::{gap_fraction, hybrid_energy};

use crate::chem::ao::AngularKind;
use crate::chem::molecule::{Molecule, angle_between, any_perpendicular};
use crate::eht::EhtResult;

/// Settings of the hybrid stage.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(default)]
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

/// Describes one local (s, px, py, pz) orbital of `centre`: λ, shares, direction, bending
/// (when `axis` to the partner is given), energy, and the full AO vector. Public so that
/// other stages (hybrids from localized MOs) report their hybrids the same way.
#[allow(clippy::too_many_arguments)]
pub fn describe_hybrid(
    kind: HybridKind,
    partner: Option<usize>,
    local: &Vector4<f64>,
    axis: Option<&Vector3<f64>>,
    eps_s: f64,
    eps_p: f64,
    sp_indices: [usize; 4],
    basis_size: usize,
) -> Hybrid {
    let norm = local.norm();
    let v = if norm > 0.0 { local / norm } else { *local };
    let kinds = [
        AngularKind::S,
        AngularKind::Px,
        AngularKind::Py,
        AngularKind::Pz,
    ];
    let shape = crate::localized::read_shape(v.as_slice(), &kinds);
    let direction = Vector3::from(shape.direction);
    let bending = match (kind, axis) {
        (HybridKind::Bond, Some(u)) if direction.norm() > 0.0 => {
            Some(angle_between(&direction, u).to_degrees())
        }
        _ => None,
    };
    let mut coefficients = vec![0.0; basis_size];
    for (&i, &c) in sp_indices.iter().zip(v.iter()) {
        if let Some(slot) = coefficients.get_mut(i) {
            *slot = c;
        }
    }
    Hybrid {
        kind,
        partner,
        local: [v[0], v[1], v[2], v[3]],
        coefficients,
        lambda: shape.lambda,
        s_percent: 100.0 * shape.s_share,
        p_percent: 100.0 * shape.p_share,
        direction: shape.direction,
        bending_degrees: bending,
        energy_ev: hybrid_energy(eps_s, eps_p, shape.lambda),
        gap_fraction: gap_fraction(shape.lambda),
    }
}

/// Working state of one centre.
struct State {
    spec: CentreSpec,
    /// Unit vectors to the σ partners (in `spec.sigma_partners` order).
    units: Vec<Vector3<f64>>,
    pi: Vec<Vector4<f64>>,
    bonds: Vec<Vector4<f64>>,
    model: HybridModel,
    frozen: bool,
    failed: bool,
    residual: Option<f64>,
    notes: Vec<String>,
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
    let n = eht.basis.len();
    if eht.basis.atom_ranges.len() != molecule.atoms.len()
        || eht.overlap.nrows() != n
        || eht.overlap.ncols() != n
        || eht.hamiltonian.nrows() != n
        || eht.hamiltonian.ncols() != n
    {
        analysis.errors.push(HybridError::BasisMismatch {
            atoms: molecule.atoms.len(),
            basis_atoms: eht.basis.atom_ranges.len(),
        });
        return analysis;
    }
    if let Some(atom) = molecule
        .atoms
        .iter()
        .position(|a| a.position.iter().any(|x| !x.is_finite()))
    {
        analysis
            .errors
            .push(HybridError::NonFiniteCoordinate { atom });
        return analysis;
    }
    if settings.model == HybridModel::Localized {
        return analysis;
    }
    let model = settings.model;
    let (s_index, sp_index) = atom_orbital_indices(molecule, eht);
    let position = |atom: usize| molecule.atoms[atom].position;
    let unit = |from: usize, to: usize| {
        let v = position(to) - position(from);
        if v.norm() > 1e-8 {
            v.normalize()
        } else {
            Vector3::z()
        }
    };
    let mut states: Vec<State> = Vec::new();
    let mut state_of: Vec<Option<usize>> = vec![None; molecule.atoms.len()];
    for spec in specs {
        let atom = spec.atom;
        let units: Vec<Vector3<f64>> = spec.sigma_partners.iter().map(|&p| unit(atom, p)).collect();
        let pi_dirs: Vec<Vector3<f64>> = spec.pi.iter().map(|(_, d)| *d).collect();
        let mut state = State {
            units,
            pi: Vec::new(),
            bonds: Vec::new(),
            model: HybridModel::MaxOverlap,
            frozen: false,
            failed: false,
            residual: None,
            notes: Vec::new(),
            spec,
        };
        if model == HybridModel::Geometric {
            match state.spec.sigma_partners.len() {
                0 => state.notes.push(
                    "no σ bonds: the lone pairs are the centre's s and p orbitals".to_string(),
                ),
                1 => state.notes.push(
                    "a single σ bond does not fix the hybridization from geometry alone; maximum overlap used"
                        .to_string(),
                ),
                _ => match coulson::geometric_hybrids(
                    &state.units,
                    &pi_dirs,
                    state.spec.lone_pair_orbitals(),
                    settings.lone_pair_convention,
                ) {
                    Ok(geometric) => {
                        let bonds: Vec<Vector4<f64>> =
                            geometric.bonds.iter().map(|h| h.coefficients).collect();
                        state.pi = max_overlap::pi_vectors(&pi_dirs, &bonds);
                        state.bonds = bonds;
                        state.model = HybridModel::Geometric;
                        state.frozen = true;
                        state.residual =
                            (state.spec.sigma_partners.len() >= 4).then_some(geometric.residual);
                    }
                    Err(error) => state.notes.push(format!(
                        "geometric model not applicable: {error}; maximum overlap used"
                    )),
                },
            }
        }
        if !state.frozen {
            state.pi = max_overlap::pi_vectors(&pi_dirs, &[]);
            let guesses: Vec<Vector4<f64>> = state.units.iter().map(max_overlap::guess).collect();
            match max_overlap::centre_step(&guesses, &guesses, &state.pi) {
                Some(bonds) => state.bonds = bonds,
                None => {
                    state.failed = true;
                    analysis
                        .errors
                        .push(HybridError::DependentPartners { atom });
                }
            }
        }
        if state.pi.len() != state.spec.pi.len() && !state.failed {
            state.failed = true;
            analysis
                .errors
                .push(HybridError::DependentPartners { atom });
        }
        state_of[atom] = Some(states.len());
        states.push(state);
    }

    // Maximum-overlap iteration (Gauss–Seidel over the centres that are not frozen).
    let active: Vec<usize> = (0..states.len())
        .filter(|&k| !states[k].frozen && !states[k].failed && !states[k].bonds.is_empty())
        .collect();
    let overlap = &eht.overlap;
    let target = |states: &[State], k: usize, slot: usize| -> Vector4<f64> {
        let state = &states[k];
        let atom = state.spec.atom;
        let partner = state.spec.sigma_partners[slot];
        let Some(mine) = sp_index[atom] else {
            return Vector4::zeros();
        };
        let project = |indices: &[usize], coefficients: &[f64]| {
            let mut t = Vector4::zeros();
            for (mu, &i) in mine.iter().enumerate() {
                t[mu] = indices
                    .iter()
                    .zip(coefficients)
                    .map(|(&j, &c)| overlap[(i, j)] * c)
                    .sum();
            }
            t
        };
        if let Some(theirs) = sp_index[partner] {
            let from_partner = state_of[partner]
                .map(|j| &states[j])
                .filter(|other| !other.failed)
                .and_then(|other| {
                    let back = other.spec.sigma_partners.iter().position(|&x| x == atom)?;
                    other.bonds.get(back).copied()
                })
                .unwrap_or_else(|| max_overlap::guess(&unit(partner, atom)));
            return project(&theirs, from_partner.as_slice());
        }
        if let Some(s) = s_index[partner] {
            return project(&[s], &[1.0]);
        }
        Vector4::zeros()
    };
    let mut iterations = 0;
    let mut change = 0.0;
    if !active.is_empty() {
        analysis.converged = false;
        while iterations < max_overlap::MAX_ITERATIONS {
            iterations += 1;
            change = 0.0f64;
            for &k in &active {
                if states[k].failed {
                    continue;
                }
                let count = states[k].bonds.len();
                let targets: Vec<Vector4<f64>> =
                    (0..count).map(|slot| target(&states, k, slot)).collect();
                let fallback: Vec<Vector4<f64>> =
                    states[k].units.iter().map(max_overlap::guess).collect();
                let Some(new) = max_overlap::centre_step(&targets, &fallback, &states[k].pi) else {
                    states[k].failed = true;
                    analysis.errors.push(HybridError::DependentPartners {
                        atom: states[k].spec.atom,
                    });
                    continue;
                };
                for (old, fresh) in states[k].bonds.iter().zip(&new) {
                    change = change.max((old - fresh).norm());
                }
                states[k].bonds = new;
            }
            if change < max_overlap::CONVERGENCE {
                analysis.converged = true;
                break;
            }
        }
        if !analysis.converged {
            analysis
                .errors
                .push(HybridError::NotConverged { iterations, change });
        }
    }
    analysis.iterations = iterations;

    // Complete each centre's set and describe it.
    for state in states {
        if state.failed {
            continue;
        }
        let atom = state.spec.atom;
        let Some(set) = complete_set(&state, settings.lone_pair_convention) else {
            analysis
                .errors
                .push(HybridError::DependentPartners { atom });
            continue;
        };
        let (bond_count, pi_count, lone_count) = (
            state.bonds.len(),
            state.pi.len(),
            state.spec.lone_pair_orbitals(),
        );
        let mut orbitals = Vec::with_capacity(4);
        for (k, v) in set.iter().enumerate() {
            let (kind, partner) = if k < bond_count {
                (HybridKind::Bond, Some(state.spec.sigma_partners[k]))
            } else if k < bond_count + pi_count {
                (HybridKind::Pi, Some(state.spec.pi[k - bond_count].0))
            } else if k < bond_count + pi_count + lone_count {
                (HybridKind::LonePair, None)
            } else {
                (HybridKind::Vacant, None)
            };
            // Sign conventions: bonds point at the partner, π along its chosen direction,
            // lone pairs and vacant orbitals with a non-negative s coefficient.
            let p = Vector3::new(v[1], v[2], v[3]);
            let flip = match kind {
                HybridKind::Bond => v[0] + p.dot(&state.units[k]) < 0.0,
                HybridKind::Pi => p.dot(&state.spec.pi[k - bond_count].1) < 0.0,
                _ => v[0] < -1e-12,
            };
            orbitals.push((kind, partner, if flip { -v } else { *v }));
        }
        let Some(mut centre) = describe_centre(molecule, eht, atom, &orbitals, state.model) else {
            continue;
        };
        centre.lone_pairs = state.spec.lone_pairs;
        centre.single_electron = state.spec.single_electron;
        centre.formal_charge = state.spec.formal_charge;
        centre.steric_number = state.spec.steric_number();
        centre.residual = state.residual;
        centre.notes = state.notes;
        analysis.centres.push(centre);
    }
    analysis
}

/// Describes a centre from its orbitals given as (kind, partner, local (s, px, py, pz)
/// coefficients), in the order and with the signs given: each [`Hybrid`] (λ, shares,
/// direction, bending toward the partner, energy, AO vector) and the interorbital angles
/// between bond and lone-pair hybrids. The Lewis fields are counted from the kinds
/// (formal charge 0, no odd electron). `None` when `atom` has no valence s,p functions
/// in the basis. Public so that hybrids from another source (localized MOs) are reported
/// exactly like the built-in models.
pub fn describe_centre(
    molecule: &Molecule,
    eht: &EhtResult,
    atom: usize,
    orbitals: &[(HybridKind, Option<usize>, Vector4<f64>)],
    model: HybridModel,
) -> Option<CentreHybrids> {
    let n = eht.basis.len();
    if eht.hamiltonian.nrows() != n || eht.hamiltonian.ncols() != n {
        return None;
    }
    let (_, sp_index) = atom_orbital_indices(molecule, eht);
    let indices = sp_index.get(atom).copied().flatten()?;
    let eps_s = eht.hamiltonian[(indices[0], indices[0])];
    let eps_p = (1..4)
        .map(|k| eht.hamiltonian[(indices[k], indices[k])])
        .sum::<f64>()
        / 3.0;
    let centre_position = molecule.atoms[atom].position;
    let hybrids: Vec<Hybrid> = orbitals
        .iter()
        .map(|(kind, partner, v)| {
            let axis = partner
                .filter(|&p| p < molecule.atoms.len())
                .map(|p| molecule.atoms[p].position - centre_position)
                .filter(|d| d.norm() > 1e-8)
                .map(|d| d.normalize());
            describe_hybrid(*kind, *partner, v, axis.as_ref(), eps_s, eps_p, indices, n)
        })
        .collect();
    let mut angles = Vec::new();
    let directed = |h: &Hybrid| {
        matches!(h.kind, HybridKind::Bond | HybridKind::LonePair) && h.p_percent > 1e-6
    };
    for i in 0..hybrids.len() {
        for j in i + 1..hybrids.len() {
            if directed(&hybrids[i]) && directed(&hybrids[j]) {
                let a = Vector3::from(hybrids[i].direction);
                let b = Vector3::from(hybrids[j].direction);
                angles.push(InterorbitalAngle {
                    first: i,
                    second: j,
                    degrees: angle_between(&a, &b).to_degrees(),
                });
            }
        }
    }
    let count = |kind: HybridKind| hybrids.iter().filter(|h| h.kind == kind).count();
    let sigma_partners: Vec<usize> = hybrids
        .iter()
        .filter(|h| h.kind == HybridKind::Bond)
        .filter_map(|h| h.partner)
        .collect();
    Some(CentreHybrids {
        atom,
        element: molecule.atoms[atom].element.symbol().to_string(),
        model,
        steric_number: sigma_partners.len() + count(HybridKind::LonePair),
        sigma_partners,
        pi_bonds: count(HybridKind::Pi),
        lone_pairs: count(HybridKind::LonePair),
        single_electron: false,
        formal_charge: 0,
        eps_s,
        eps_p,
        hybrids,
        interorbital_angles: angles,
        residual: None,
        notes: Vec::new(),
    })
}

/// Bonds, π, lone pairs and vacant orbitals as one orthonormal set of four.
fn complete_set(state: &State, convention: LonePairConvention) -> Option<Vec<Vector4<f64>>> {
    let mut taken: Vec<Vector4<f64>> = state.bonds.clone();
    taken.extend(state.pi.iter().copied());
    let orthonormal = coulson::gram_schmidt(&taken);
    if orthonormal.len() != taken.len() {
        return None;
    }
    let free = coulson::orthonormal_complement(&orthonormal);
    let lone_count = state.spec.lone_pair_orbitals();
    let units = if state.units.is_empty() {
        vec![any_perpendicular(&Vector3::z())]
    } else {
        state.units.clone()
    };
    let lone: Vec<Vector4<f64>> = coulson::lone_pair_hybrids(&free, lone_count, &units, convention)
        .into_iter()
        .map(|h| h.coefficients)
        .collect();
    if lone.len() != lone_count {
        return None;
    }
    let mut all = taken;
    all.extend(lone.iter().copied());
    let vacant = coulson::orthonormal_complement(&coulson::gram_schmidt(&all));
    all.extend(vacant);
    if all.len() != 4 {
        return None;
    }
    max_overlap::orthonormalize_set(&all)
}
