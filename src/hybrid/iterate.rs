//! The σ hybrids of every centre, from their start to self-consistency.
//!
//! Each centre gets a working [`State`]: in the geometric model, Coulson's hybrids when
//! the geometry fixes them (frozen from then on); otherwise a maximum-overlap start from
//! sp³-like guesses along the bonds. The centres that are not frozen are then iterated
//! Gauss–Seidel fashion: each takes the maximum-overlap step ([`max_overlap::centre_step`])
//! against its partners' current hybrids, projected onto its own s,p functions through
//! the overlap matrix, until no hybrid moves by more than [`max_overlap::CONVERGENCE`].

use nalgebra::{DMatrix, Vector3, Vector4};

use super::centres::CentreSpec;
use super::{HybridError, HybridModel, HybridSettings, LonePairConvention, coulson, max_overlap};
use crate::chem::molecule::Molecule;

/// Working state of one centre.
pub(super) struct State {
    pub spec: CentreSpec,
    /// Unit vectors to the σ partners (in `spec.sigma_partners` order).
    pub units: Vec<Vector3<f64>>,
    pub pi: Vec<Vector4<f64>>,
    pub bonds: Vec<Vector4<f64>>,
    pub model: HybridModel,
    /// The geometric model fixed the hybrids: the iteration leaves them alone.
    pub frozen: bool,
    /// The centre cannot be described (its error is recorded); it is left out.
    pub failed: bool,
    pub residual: Option<f64>,
    pub notes: Vec<String>,
}

/// The working states, in the order of the specs, and for every atom the index of its
/// state (the iteration looks partners up by atom).
pub(super) struct States {
    pub states: Vec<State>,
    pub state_of: Vec<Option<usize>>,
}

/// What the target projection reads: the geometry, the overlap matrix, and every atom's
/// valence s function and (s, px, py, pz) functions.
pub(super) struct Projection<'a> {
    pub molecule: &'a Molecule,
    pub overlap: &'a DMatrix<f64>,
    pub s_index: &'a [Option<usize>],
    pub sp_index: &'a [Option<[usize; 4]>],
}

/// Unit vector from atom `from` to atom `to`; z when they coincide, so that a degenerate
/// geometry still gives a direction (the basis check has already passed).
pub(super) fn unit(molecule: &Molecule, from: usize, to: usize) -> Vector3<f64> {
    let v = molecule.atoms[to].position - molecule.atoms[from].position;
    if v.norm() > 1e-8 {
        v.normalize()
    } else {
        Vector3::z()
    }
}

/// The starting state of every centre. A centre whose partners or π orbitals are
/// linearly dependent is marked failed and its error recorded.
pub(super) fn start_states(
    molecule: &Molecule,
    settings: &HybridSettings,
    specs: Vec<CentreSpec>,
    errors: &mut Vec<HybridError>,
) -> States {
    let mut states: Vec<State> = Vec::new();
    let mut state_of: Vec<Option<usize>> = vec![None; molecule.atoms.len()];
    for spec in specs {
        let atom = spec.atom;
        let state = start_state(molecule, settings, spec, errors);
        state_of[atom] = Some(states.len());
        states.push(state);
    }
    States { states, state_of }
}

/// One centre's starting state: the geometric hybrids when that model is asked for and
/// applies, the maximum-overlap start otherwise.
fn start_state(
    molecule: &Molecule,
    settings: &HybridSettings,
    spec: CentreSpec,
    errors: &mut Vec<HybridError>,
) -> State {
    let atom = spec.atom;
    let units: Vec<Vector3<f64>> = spec
        .sigma_partners
        .iter()
        .map(|&p| unit(molecule, atom, p))
        .collect();
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
    if settings.model == HybridModel::Geometric {
        geometric_start(&mut state, &pi_dirs, settings.lone_pair_convention);
    }
    if !state.frozen {
        max_overlap_start(&mut state, &pi_dirs, errors);
    }
    // Gram–Schmidt drops a π direction that lies in the span of the others (or of the
    // frozen bonds): the centre cannot hold all its π orbitals.
    if state.pi.len() != state.spec.pi.len() && !state.failed {
        state.failed = true;
        errors.push(HybridError::DependentPartners { atom });
    }
    state
}

/// Coulson's hybrids, frozen, when the bond angles fix them (two or more σ bonds and an
/// applicable geometry); otherwise a note on why maximum overlap is used instead.
fn geometric_start(state: &mut State, pi_dirs: &[Vector3<f64>], convention: LonePairConvention) {
    match state.spec.sigma_partners.len() {
        0 => state
            .notes
            .push("no σ bonds: the lone pairs are the centre's s and p orbitals".to_string()),
        1 => state.notes.push(
            "a single σ bond does not fix the hybridization from geometry alone; maximum overlap used"
                .to_string(),
        ),
        _ => match coulson::geometric_hybrids(
            &state.units,
            pi_dirs,
            state.spec.lone_pair_orbitals(),
            convention,
        ) {
            Ok(geometric) => {
                let bonds: Vec<Vector4<f64>> =
                    geometric.bonds.iter().map(|h| h.coefficients).collect();
                state.pi = max_overlap::pi_vectors(pi_dirs, &bonds);
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

/// The maximum-overlap start: pure p π orbitals along their directions and σ hybrids
/// closest to sp³-like guesses along the bonds (the guesses are also the fallback).
fn max_overlap_start(state: &mut State, pi_dirs: &[Vector3<f64>], errors: &mut Vec<HybridError>) {
    state.pi = max_overlap::pi_vectors(pi_dirs, &[]);
    let guesses: Vec<Vector4<f64>> = state.units.iter().map(max_overlap::guess).collect();
    match max_overlap::centre_step(&guesses, &guesses, &state.pi) {
        Some(bonds) => state.bonds = bonds,
        None => {
            state.failed = true;
            errors.push(HybridError::DependentPartners {
                atom: state.spec.atom,
            });
        }
    }
}

/// The maximum-overlap iteration over the centres that are neither frozen nor failed and
/// have bonds. Returns (iterations, converged); 0 and true when no centre needs it.
/// Failing to converge is recorded in `errors`, and the last hybrids are kept.
pub(super) fn iterate(
    states: &mut States,
    projection: &Projection,
    errors: &mut Vec<HybridError>,
) -> (usize, bool) {
    let active: Vec<usize> = (0..states.states.len())
        .filter(|&k| {
            let state = &states.states[k];
            !state.frozen && !state.failed && !state.bonds.is_empty()
        })
        .collect();
    if active.is_empty() {
        return (0, true);
    }
    let mut iterations = 0;
    let mut change = 0.0;
    while iterations < max_overlap::MAX_ITERATIONS {
        iterations += 1;
        change = sweep(states, &active, projection, errors);
        if change < max_overlap::CONVERGENCE {
            return (iterations, true);
        }
    }
    errors.push(HybridError::NotConverged { iterations, change });
    (iterations, false)
}

/// One Gauss–Seidel sweep: each active centre in turn takes the maximum-overlap step
/// against its partners' latest hybrids. Returns the largest change of any hybrid.
fn sweep(
    states: &mut States,
    active: &[usize],
    projection: &Projection,
    errors: &mut Vec<HybridError>,
) -> f64 {
    let mut change = 0.0f64;
    for &k in active {
        let state = &states.states[k];
        if state.failed {
            continue;
        }
        let targets: Vec<Vector4<f64>> = (0..state.bonds.len())
            .map(|slot| target(states, projection, k, slot))
            .collect();
        let fallback: Vec<Vector4<f64>> = state.units.iter().map(max_overlap::guess).collect();
        let new = max_overlap::centre_step(&targets, &fallback, &state.pi);
        let state = &mut states.states[k];
        let Some(new) = new else {
            state.failed = true;
            errors.push(HybridError::DependentPartners {
                atom: state.spec.atom,
            });
            continue;
        };
        for (old, fresh) in state.bonds.iter().zip(&new) {
            change = change.max((old - fresh).norm());
        }
        state.bonds = new;
    }
    change
}

/// The target of bond `slot` of centre `k`: the partner's orbital toward the centre (its
/// hybrid, or its valence s when it has no p functions, e.g. hydrogen) projected onto
/// the centre's (s, px, py, pz) through the overlap, ⟨χ_μ|φ⟩. Zero when either atom has
/// no such functions.
fn target(states: &States, projection: &Projection, k: usize, slot: usize) -> Vector4<f64> {
    let state = &states.states[k];
    let atom = state.spec.atom;
    let partner = state.spec.sigma_partners[slot];
    let Some(mine) = projection.sp_index[atom] else {
        return Vector4::zeros();
    };
    if let Some(theirs) = projection.sp_index[partner] {
        let from_partner = partner_hybrid(states, projection.molecule, atom, partner);
        return project(projection.overlap, &mine, &theirs, from_partner.as_slice());
    }
    if let Some(s) = projection.s_index[partner] {
        return project(projection.overlap, &mine, &[s], &[1.0]);
    }
    Vector4::zeros()
}

/// The partner's current hybrid toward `atom`; an sp³-like guess along the bond when the
/// partner has no working state (skipped or failed), as it then has no hybrid of ours.
fn partner_hybrid(
    states: &States,
    molecule: &Molecule,
    atom: usize,
    partner: usize,
) -> Vector4<f64> {
    states.state_of[partner]
        .map(|j| &states.states[j])
        .filter(|other| !other.failed)
        .and_then(|other| {
            let back = other.spec.sigma_partners.iter().position(|&x| x == atom)?;
            other.bonds.get(back).copied()
        })
        .unwrap_or_else(|| max_overlap::guess(&unit(molecule, partner, atom)))
}

/// ⟨χ_μ|Σ_j c_j χ_j⟩ for each of the centre's functions `mine`, the orbital given by the
/// basis `indices` and their `coefficients`.
fn project(
    overlap: &DMatrix<f64>,
    mine: &[usize; 4],
    indices: &[usize],
    coefficients: &[f64],
) -> Vector4<f64> {
    let mut t = Vector4::zeros();
    for (mu, &i) in mine.iter().enumerate() {
        t[mu] = indices
            .iter()
            .zip(coefficients)
            .map(|(&j, &c)| overlap[(i, j)] * c)
            .sum();
    }
    t
}
