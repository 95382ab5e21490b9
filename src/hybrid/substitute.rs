//! A hybrid model's orbitals in place of the wavefunction's, so that the localized ladder
//! shows the model chosen: on each centre the model describes, each of its four
//! orthonormal (s, px, py, pz) hybrids replaces the wavefunction hybrid it overlaps most
//! (a greedy assignment by |overlap|, largest first), taken as coefficients over the
//! centre's orthonormalized functions. The set stays orthonormal and complete, so the
//! ladder built on it is still one orthonormal basis of the valence space.

use crate::chem::ao::AngularKind;
use crate::localized::{AtomHybrids, AtomLayout};

use super::HybridAnalysis;

/// Replaces the hybrid vectors of every centre `model` describes; returns how many
/// centres were replaced.
pub fn substitute(
    hybrids: &mut [AtomHybrids],
    model: &HybridAnalysis,
    layout: &AtomLayout,
) -> usize {
    let sp = [
        AngularKind::S,
        AngularKind::Px,
        AngularKind::Py,
        AngularKind::Pz,
    ];
    let mut replaced = 0;
    for centre in &model.centres {
        let Some(target) = hybrids.iter_mut().find(|h| h.atom == centre.atom) else {
            continue;
        };
        let range = layout.ranges[centre.atom].clone();
        if target.over_complete
            || target.hybrids.len() != 4
            || centre.hybrids.len() != 4
            || layout.kinds[range] != sp
        {
            continue;
        }
        let model_vectors: Vec<[f64; 4]> = centre.hybrids.iter().map(|h| h.local).collect();
        for (slot, vector) in assignment(target, &model_vectors) {
            let current = &target.hybrids[slot].vector;
            let dot: f64 = current.iter().zip(&vector).map(|(a, b)| a * b).sum();
            let sign = if dot < 0.0 { -1.0 } else { 1.0 };
            target.hybrids[slot].vector = vector.iter().map(|c| sign * c).collect();
            target.hybrids[slot].share = 1.0;
        }
        replaced += 1;
    }
    replaced
}

/// Pairs (wavefunction slot, model vector), largest |overlap| first.
fn assignment(target: &AtomHybrids, model: &[[f64; 4]]) -> Vec<(usize, [f64; 4])> {
    let mut scores: Vec<(f64, usize, usize)> = Vec::new();
    for (slot, hybrid) in target.hybrids.iter().enumerate() {
        for (k, vector) in model.iter().enumerate() {
            let dot: f64 = hybrid.vector.iter().zip(vector).map(|(a, b)| a * b).sum();
            scores.push((dot.abs(), slot, k));
        }
    }
    scores.sort_by(|a, b| b.0.total_cmp(&a.0).then((a.1, a.2).cmp(&(b.1, b.2))));
    let (mut slot_used, mut model_used) =
        (vec![false; target.hybrids.len()], vec![false; model.len()]);
    let mut pairs = Vec::new();
    for (_, slot, k) in scores {
        if !slot_used[slot] && !model_used[k] {
            slot_used[slot] = true;
            model_used[k] = true;
            pairs.push((slot, model[k]));
        }
    }
    pairs
}
