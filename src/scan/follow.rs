//! Level following across a scan. Consecutive successful points are matched level to level:
//!
//! 1. When both points have the same point group, every level has an irrep, each irrep
//!    has as many levels at both points, and each irrep's levels span nearly the same
//!    space at both points (Σ|⟨ψᵢ|ψ'ⱼ⟩|² over the irrep's block ≥ half its size, which
//!    catches a change of axis convention between points), the levels of each irrep are
//!    paired in energy order. Levels of one irrep never cross (non-crossing rule: J. von
//!    Neumann and E. Wigner, Phys. Z. 30, 467 (1929)), so an avoided crossing shows as
//!    two curves that approach and turn away, however coarse the step.
//! 2. Otherwise (the group changes, e.g. C3v → D3h at planar ammonia, or labels are
//!    missing) the levels are paired greedily by the overlap |C_prevᵀ S C_curr| of the MOs,
//!    using this point's AO overlap matrix S: the AO list is the same at every point,
//!    only the centres move.
//!
//! A curve is named by its level's label at the reference point: the first point of the
//! point group most points share, so that curves are named in the scan's generic symmetry
//! (C3v for ammonia's pyramidalization; the labels at every point are kept as well, so
//! the planar end's a2″ is still reported there).

use std::collections::BTreeMap;

use nalgebra::{DMatrix, DVector};

use super::point::{Lambda, LambdaKey, PointData};
use super::{Curve, LambdaSeries};
use crate::chem::molecule::Molecule;

/// Follows levels point by point as points arrive in order, keeping only the previous
/// point's matrices, so a long scan does not hold every point's MO coefficients.
#[derive(Debug, Default)]
pub struct Follower {
    previous: Option<(usize, PointData)>,
    level_count: usize,
    /// mo_of[p][k]: the level index of curve k at point p (None: failed or not matched).
    mo_of: Vec<Option<Vec<usize>>>,
}

impl Follower {
    /// Adds point `index` (indices must increase); failed points are simply not pushed.
    pub fn push(&mut self, index: usize, point: &PointData) {
        if self.mo_of.len() <= index {
            self.mo_of.resize(index + 1, None);
        }
        let map = match &self.previous {
            None => {
                self.level_count = point.levels.len();
                (0..self.level_count).collect()
            }
            Some((before_index, before)) => {
                if point.levels.len() != self.level_count {
                    return;
                }
                let pairing = match_levels(before, point);
                let map = match &self.mo_of[*before_index] {
                    Some(map) => map.iter().map(|&mo| pairing[mo]).collect(),
                    None => return,
                };
                let mut kept = point.clone();
                align_degenerate(before, &pairing, &mut kept);
                self.mo_of[index] = Some(map);
                self.previous = Some((index, kept));
                return;
            }
        };
        self.mo_of[index] = Some(map);
        self.previous = Some((index, point.clone()));
    }
}

/// Levels closer than this (eV) form one degenerate set (the solver's own tolerance).
const DEGENERATE_EV: f64 = crate::eht::DEGENERACY_TOLERANCE_EV;

/// Inside a degenerate set any rotation of the MOs is as good as another, so the solver's
/// choice says nothing about where each component goes next. For following only, each
/// component is replaced by the previous point's matched MO projected onto the set
/// (then S-orthonormalized in order), so that levels that split linearly on leaving a
/// high-symmetry point continue smoothly through it.
fn align_degenerate(before: &PointData, pairing: &[usize], now: &mut PointData) {
    let count = now.levels.len();
    let mut start = 0;
    while start < count {
        let mut end = start + 1;
        while end < count
            && (now.levels[end].energy_ev - now.levels[end - 1].energy_ev).abs() < DEGENERATE_EV
        {
            end += 1;
        }
        if end - start > 1 {
            let set = now.coefficients.columns(start, end - start).into_owned();
            let s_set = &now.overlap * &set;
            let mut placed: Vec<DVector<f64>> = Vec::new();
            for (from, &to) in pairing.iter().enumerate() {
                if !(start..end).contains(&to) {
                    continue;
                }
                let previous = before.coefficients.column(from);
                let mut vector = &set * (s_set.transpose() * previous);
                for other in &placed {
                    let projection = (other.transpose() * &now.overlap * &vector)[(0, 0)];
                    vector -= other * projection;
                }
                let norm = (vector.transpose() * &now.overlap * &vector)[(0, 0)].sqrt();
                if norm > 1e-6 {
                    vector /= norm;
                    now.coefficients.set_column(to, &vector);
                    placed.push(vector);
                }
            }
        }
        start = end;
    }
}

/// The followed curves and the reference point that names them, from the points' levels
/// (`data`) and the pairing found by `follower`.
pub fn follow_levels(
    data: &[Result<PointData, String>],
    follower: Follower,
) -> (Vec<Curve>, Option<usize>) {
    let mut mo_of = follower.mo_of;
    mo_of.resize(data.len(), None);
    let Some(first) = mo_of.iter().position(Option::is_some) else {
        return (Vec::new(), None);
    };
    let level_count = follower.level_count;
    let reference = reference_point(data, &mo_of).unwrap_or(first);
    let mut curves: Vec<Curve> = (0..level_count)
        .map(|k| {
            let at = |p: usize| -> Option<&super::point::PointLevel> {
                let mo = mo_of[p].as_ref()?[k];
                data[p].as_ref().ok()?.levels.get(mo)
            };
            let label = at(reference)
                .and_then(|l| l.label.clone())
                .unwrap_or_else(|| format!("MO {}", k + 1));
            Curve {
                name: label.clone(),
                label,
                irrep: at(reference).and_then(|l| l.irrep.clone()),
                energies: (0..data.len())
                    .map(|p| at(p).map(|l| l.energy_ev))
                    .collect(),
                labels: (0..data.len())
                    .map(|p| at(p).and_then(|l| l.label.clone()))
                    .collect(),
                occupancies: (0..data.len())
                    .map(|p| at(p).map(|l| l.occupancy))
                    .collect(),
            }
        })
        .collect();
    make_names_unique(&mut curves);
    (curves, Some(reference))
}

/// The first point of the most common point group (ties: the group seen first).
fn reference_point(
    data: &[Result<PointData, String>],
    mo_of: &[Option<Vec<usize>>],
) -> Option<usize> {
    let mut counts: Vec<(String, usize, usize)> = Vec::new(); // group, count, first point
    for (p, result) in data.iter().enumerate() {
        let (Ok(point), Some(_)) = (result, &mo_of[p]) else {
            continue;
        };
        let Some(group) = &point.point_group else {
            continue;
        };
        match counts.iter_mut().find(|(g, _, _)| g == group) {
            Some(entry) => entry.1 += 1,
            None => counts.push((group.clone(), 1, p)),
        }
    }
    counts
        .iter()
        .max_by(|a, b| a.1.cmp(&b.1).then(b.2.cmp(&a.2)))
        .map(|(_, _, p)| *p)
}

/// Degenerate partners share a label; their names get " [1]", " [2]", … in curve order.
fn make_names_unique(curves: &mut [Curve]) {
    let mut totals: BTreeMap<String, usize> = BTreeMap::new();
    for curve in curves.iter() {
        *totals.entry(curve.label.clone()).or_default() += 1;
    }
    let mut seen: BTreeMap<String, usize> = BTreeMap::new();
    for curve in curves.iter_mut() {
        if totals[&curve.label] > 1 {
            let n = seen.entry(curve.label.clone()).or_default();
            *n += 1;
            curve.name = format!("{} [{}]", curve.label, n);
        }
    }
}

/// For each level of `before`, the matching level of `now`.
pub fn match_levels(before: &PointData, now: &PointData) -> Vec<usize> {
    let overlap = (before.coefficients.transpose() * &now.overlap * &now.coefficients).abs();
    by_irrep(before, now, &overlap).unwrap_or_else(|| by_overlap(&overlap))
}

fn by_irrep(before: &PointData, now: &PointData, overlap: &DMatrix<f64>) -> Option<Vec<usize>> {
    if before.point_group.is_none() || before.point_group != now.point_group {
        return None;
    }
    let groups = |point: &PointData| -> Option<BTreeMap<String, Vec<usize>>> {
        let mut map: BTreeMap<String, Vec<usize>> = BTreeMap::new();
        for (index, level) in point.levels.iter().enumerate() {
            map.entry(level.irrep.clone()?).or_default().push(index);
        }
        Some(map)
    };
    let (old, new) = (groups(before)?, groups(now)?);
    if old.len() != new.len() {
        return None;
    }
    let mut pairing = vec![0; before.levels.len()];
    for (irrep, old_levels) in &old {
        let new_levels = new.get(irrep)?;
        if new_levels.len() != old_levels.len() {
            return None;
        }
        let kept: f64 = old_levels
            .iter()
            .flat_map(|&i| new_levels.iter().map(move |&j| overlap[(i, j)].powi(2)))
            .sum();
        if kept < 0.5 * old_levels.len() as f64 {
            return None;
        }
        // Both lists are in ascending energy: pair in order.
        for (&i, &j) in old_levels.iter().zip(new_levels) {
            pairing[i] = j;
        }
    }
    Some(pairing)
}

/// Greedy assignment, largest |overlap| first.
fn by_overlap(overlap: &DMatrix<f64>) -> Vec<usize> {
    let n = overlap.nrows().min(overlap.ncols());
    let mut pairs: Vec<(usize, usize)> = (0..n).flat_map(|i| (0..n).map(move |j| (i, j))).collect();
    pairs.sort_by(|a, b| overlap[*b].total_cmp(&overlap[*a]).then(a.cmp(b)));
    let mut pairing = vec![usize::MAX; n];
    let mut taken = vec![false; n];
    for (i, j) in pairs {
        if pairing[i] == usize::MAX && !taken[j] {
            pairing[i] = j;
            taken[j] = true;
        }
    }
    pairing
}

/// One λ series per hybrid seen at any point, sorted by model, centre and partner.
pub fn lambda_series(data: &[Result<PointData, String>], molecule: &Molecule) -> Vec<LambdaSeries> {
    let mut series: BTreeMap<LambdaKey, Vec<Option<Lambda>>> = BTreeMap::new();
    for (p, result) in data.iter().enumerate() {
        let Ok(point) = result else { continue };
        for (key, lambda) in &point.lambdas {
            series
                .entry(key.clone())
                .or_insert_with(|| vec![None; data.len()])[p] = Some(*lambda);
        }
    }
    series
        .into_iter()
        .map(|(key, values)| LambdaSeries {
            name: key.name(molecule),
            key,
            values,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scan::point::PointLevel;

    fn point(group: &str, irreps: &[&str], energies: &[f64], columns: &[[f64; 2]]) -> PointData {
        PointData {
            point_group: Some(group.into()),
            levels: irreps
                .iter()
                .zip(energies)
                .map(|(irrep, &energy_ev)| PointLevel {
                    energy_ev,
                    occupancy: 2.0,
                    irrep: Some((*irrep).into()),
                    label: Some(format!("1{irrep}")),
                })
                .collect(),
            coefficients: DMatrix::from_fn(2, 2, |mu, k| columns[k][mu]),
            overlap: DMatrix::identity(2, 2),
            lambdas: Vec::new(),
            sum_occupied_ev: 0.0,
            notes: Vec::new(),
        }
    }

    /// Two levels of one irrep whose characters exchange are paired in energy order
    /// (non-crossing rule, von Neumann and Wigner 1929), not by overlap.
    #[test]
    fn same_irrep_levels_keep_their_order_through_an_exchange_of_character() {
        let before = point(
            "C2v",
            &["a1", "a1"],
            &[-2.0, -1.0],
            &[[1.0, 0.0], [0.0, 1.0]],
        );
        let after = point(
            "C2v",
            &["a1", "a1"],
            &[-1.9, -1.1],
            &[[0.0, 1.0], [1.0, 0.0]],
        );
        assert_eq!(match_levels(&before, &after), vec![0, 1]);
    }

    /// When the irrep names swap between points (an axis convention flip) the irrep blocks
    /// do not overlap, and the levels are followed by overlap instead.
    #[test]
    fn swapped_irrep_names_fall_back_to_overlap() {
        let before = point(
            "C2v",
            &["b1", "b2"],
            &[-2.0, -1.0],
            &[[1.0, 0.0], [0.0, 1.0]],
        );
        let after = point(
            "C2v",
            &["b2", "b1"],
            &[-2.0, -1.0],
            &[[1.0, 0.0], [0.0, 1.0]],
        );
        assert_eq!(match_levels(&before, &after), vec![0, 1]);
        // With the functions exchanged as well the names agree again and pair them.
        let exchanged = point(
            "C2v",
            &["b2", "b1"],
            &[-2.0, -1.0],
            &[[0.0, 1.0], [1.0, 0.0]],
        );
        assert_eq!(match_levels(&before, &exchanged), vec![1, 0]);
    }

    /// A change of point group is bridged by overlap.
    #[test]
    fn a_group_change_is_followed_by_overlap() {
        let before = point(
            "C3v",
            &["a1", "a1"],
            &[-2.0, -1.0],
            &[[0.6, 0.8], [0.8, -0.6]],
        );
        let after = point(
            "D3h",
            &["a1'", "a2''"],
            &[-2.0, -1.0],
            &[[0.8, -0.6], [0.6, 0.8]],
        );
        assert_eq!(match_levels(&before, &after), vec![1, 0]);
    }
}
