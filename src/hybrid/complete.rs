//! A centre's working hybrids made into its reported set of four: the σ bonds and π
//! orbitals completed by the lone pairs (as in the geometric model) and vacant orbitals,
//! each labelled with its kind and partner and given its conventional sign, then
//! described with the centre's Lewis bookkeeping.

use nalgebra::{Vector3, Vector4};

use super::iterate::State;
use super::{
    CentreHybrids, HybridError, HybridKind, LonePairConvention, coulson, describe_centre,
    max_overlap,
};
use crate::chem::molecule::{Molecule, any_perpendicular};
use crate::eht::EhtResult;

/// The reported hybrids of a centre whose iteration did not fail. `Err` when its set
/// cannot be completed (dependent orbitals); `Ok(None)` when the atom has no valence s,p
/// functions to describe it with.
pub(super) fn centre_of_state(
    molecule: &Molecule,
    eht: &EhtResult,
    state: State,
    convention: LonePairConvention,
) -> Result<Option<CentreHybrids>, HybridError> {
    let atom = state.spec.atom;
    let set = complete_set(&state, convention).ok_or(HybridError::DependentPartners { atom })?;
    let orbitals = labelled_orbitals(&state, &set);
    let Some(mut centre) = describe_centre(molecule, eht, atom, &orbitals, state.model) else {
        return Ok(None);
    };
    // The Lewis fields come from the wavefunction's structure, not from counting kinds.
    centre.lone_pairs = state.spec.lone_pairs;
    centre.single_electron = state.spec.single_electron;
    centre.formal_charge = state.spec.formal_charge;
    centre.steric_number = state.spec.steric_number();
    centre.residual = state.residual;
    centre.notes = state.notes;
    Ok(Some(centre))
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
    // With no bonds, any direction serves to orient the lone pairs.
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

/// The completed `set` (bonds, π, lone pairs, vacant, in that order) with each orbital's
/// kind and partner, and signed by convention: bonds point at the partner, π orbitals
/// along their chosen direction, lone pairs and vacant orbitals with a non-negative s
/// coefficient.
fn labelled_orbitals(
    state: &State,
    set: &[Vector4<f64>],
) -> Vec<(HybridKind, Option<usize>, Vector4<f64>)> {
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
        let p = Vector3::new(v[1], v[2], v[3]);
        let flip = match kind {
            HybridKind::Bond => v[0] + p.dot(&state.units[k]) < 0.0,
            HybridKind::Pi => p.dot(&state.spec.pi[k - bond_count].1) < 0.0,
            _ => v[0] < -1e-12,
        };
        orbitals.push((kind, partner, if flip { -v } else { *v }));
    }
    orbitals
}
