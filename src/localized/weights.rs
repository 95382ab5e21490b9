//! Correlation weights between localized orbitals and canonical MOs (DESIGN §4.6): the
//! weight of canonical MO ψ_j in localized orbital b_k is
//! w_kj = (b_kᵀ S ψ_j)² / (b_kᵀ S b_k),
//! the squared S-projection of the normalized b_k on ψ_j (S = 1 in the orthonormal basis
//! of the localized picture). Because the canonical MOs of the full valence basis are
//! orthonormal and complete, Σ_j w_kj = 1 for any b_k; and when the localized set is
//! itself an orthonormal basis of the valence space (the localized ladder is), also
//! Σ_k w_kj = 1 for every ψ_j: the weights are then a partition both ways. The sum over the
//! occupied MOs is the share of b_k that the occupied space captures. Weights to the
//! members of a degenerate set are summed into one line; the sets come from energies within
//! a tolerance or from ids given by the caller (e.g. the symmetry stage).
//!
//! Text helpers write, for each localized orbital, its canonical constituents and, for each
//! canonical level, the localized orbitals it feeds.

use std::fmt::Write as _;

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};
use thiserror::Error;

/// Entries of the sparse list have a weight above this (DESIGN §5.5 `links`).
pub const LINK_THRESHOLD: f64 = 1e-4;

/// Errors of the link stage.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum LinkError {
    #[error(
        "localized orbitals have {localized} rows, canonical MOs {canonical}, overlap is {overlap:?}"
    )]
    DimensionMismatch {
        localized: usize,
        canonical: usize,
        overlap: (usize, usize),
    },
    #[error("{what} has {got} entries for {expected} canonical orbitals")]
    LengthMismatch {
        what: &'static str,
        got: usize,
        expected: usize,
    },
    #[error("localized orbital {index} has zero or negative norm bᵀSb = {norm:e}")]
    ZeroNorm { index: usize, norm: f64 },
    #[error("the orbitals or the overlap matrix contain a non-finite number")]
    NonFinite,
    #[error("the degeneracy tolerance {0} must be finite and not negative")]
    BadTolerance(f64),
}

/// How canonical MOs are grouped into degenerate sets.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum LevelSets<'a> {
    /// Each MO its own set.
    None,
    /// Consecutive (by energy) MOs closer than `tolerance` eV are one set.
    ByEnergy { energies: &'a [f64], tolerance: f64 },
    /// MOs with the same id are one set (e.g. one degenerate irrep level).
    Ids(&'a [usize]),
}

/// A weight above the threshold between localized orbital `localized` and a canonical set.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LinkEntry {
    pub localized: usize,
    /// Index of the set in [`Links::sets`].
    pub set: usize,
    /// The set's first (lowest-index) canonical MO.
    pub canonical: usize,
    /// All canonical MOs of the set.
    pub members: Vec<usize>,
    /// Summed weight over the set's members.
    pub weight: f64,
}

/// The correlation between a localized set and the canonical MOs.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Links {
    /// w_kj: rows localized orbitals, columns canonical MOs.
    pub weights: DMatrix<f64>,
    /// Degenerate sets of canonical MOs (ascending first member).
    pub sets: Vec<Vec<usize>>,
    /// Weights summed over each set: rows localized orbitals, columns sets.
    pub set_weights: DMatrix<f64>,
    /// Σ over occupied j of w_kj, per localized orbital.
    pub captured: Vec<f64>,
    /// Σ_j n_j w_kj: the electrons of each localized orbital in the canonical density.
    pub occupancy: Vec<f64>,
    /// Set weights above the threshold, by localized orbital then set.
    pub entries: Vec<LinkEntry>,
}

/// The metric of the vectors given to [`weights`] and [`link`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Metric<'a> {
    /// Vectors over the original AOs, with their overlap matrix S.
    Overlap(&'a DMatrix<f64>),
    /// Vectors over an orthonormal basis (S = 1), as the localized picture's.
    Orthonormal,
}

/// w_kj = (b_kᵀ S ψ_j)² / (b_kᵀ S b_k) for columns b_k of `localized` and ψ_j of
/// `canonical`; rows k, columns j.
pub fn weights(
    localized: &DMatrix<f64>,
    canonical: &DMatrix<f64>,
    metric: Metric<'_>,
) -> Result<DMatrix<f64>, LinkError> {
    let n = canonical.nrows();
    let overlap_shape = match metric {
        Metric::Overlap(s) => (s.nrows(), s.ncols()),
        Metric::Orthonormal => (n, n),
    };
    if overlap_shape != (n, n) || localized.nrows() != n {
        return Err(LinkError::DimensionMismatch {
            localized: localized.nrows(),
            canonical: canonical.nrows(),
            overlap: overlap_shape,
        });
    }
    let overlap_finite = match metric {
        Metric::Overlap(s) => s.iter().all(|x| x.is_finite()),
        Metric::Orthonormal => true,
    };
    if !overlap_finite
        || localized
            .iter()
            .chain(canonical.iter())
            .any(|x| !x.is_finite())
    {
        return Err(LinkError::NonFinite);
    }
    let sb = match metric {
        Metric::Overlap(overlap) => overlap * localized,
        Metric::Orthonormal => localized.clone(),
    };
    let projections = sb.transpose() * canonical;
    let mut w = projections;
    for k in 0..localized.ncols() {
        let norm = localized.column(k).dot(&sb.column(k));
        if norm.is_nan() || norm <= 1e-300 {
            return Err(LinkError::ZeroNorm { index: k, norm });
        }
        for x in w.row_mut(k).iter_mut() {
            *x = *x * *x / norm;
        }
    }
    Ok(w)
}

/// Groups canonical MOs `0..count` into degenerate sets (each set ascending, sets ordered by
/// their first member).
pub fn level_sets(count: usize, sets: LevelSets<'_>) -> Result<Vec<Vec<usize>>, LinkError> {
    match sets {
        LevelSets::None => Ok((0..count).map(|j| vec![j]).collect()),
        LevelSets::ByEnergy {
            energies,
            tolerance,
        } => {
            if energies.len() != count {
                return Err(LinkError::LengthMismatch {
                    what: "energies",
                    got: energies.len(),
                    expected: count,
                });
            }
            if !(tolerance.is_finite() && tolerance >= 0.0) {
                return Err(LinkError::BadTolerance(tolerance));
            }
            let mut order: Vec<usize> = (0..count).collect();
            order.sort_by(|&a, &b| energies[a].total_cmp(&energies[b]).then(a.cmp(&b)));
            let mut out: Vec<Vec<usize>> = Vec::new();
            let mut previous: Option<f64> = None;
            for j in order {
                match (previous, out.last_mut()) {
                    (Some(e), Some(set)) if (energies[j] - e).abs() < tolerance => set.push(j),
                    _ => out.push(vec![j]),
                }
                previous = Some(energies[j]);
            }
            for set in &mut out {
                set.sort_unstable();
            }
            out.sort_by_key(|set| set[0]);
            Ok(out)
        }
        LevelSets::Ids(ids) => {
            if ids.len() != count {
                return Err(LinkError::LengthMismatch {
                    what: "set ids",
                    got: ids.len(),
                    expected: count,
                });
            }
            let mut out: Vec<(usize, Vec<usize>)> = Vec::new();
            for (j, &id) in ids.iter().enumerate() {
                match out.iter_mut().find(|(other, _)| *other == id) {
                    Some((_, set)) => set.push(j),
                    None => out.push((id, vec![j])),
                }
            }
            Ok(out.into_iter().map(|(_, set)| set).collect())
        }
    }
}

/// Weights, set sums, captured shares, occupancies and the sparse list (entries above
/// `threshold`, usually [`LINK_THRESHOLD`]). `occupations` are the canonical MOs'.
pub fn link(
    localized: &DMatrix<f64>,
    canonical: &DMatrix<f64>,
    metric: Metric<'_>,
    occupations: &[f64],
    sets: LevelSets<'_>,
    threshold: f64,
) -> Result<Links, LinkError> {
    let count = canonical.ncols();
    if occupations.len() != count {
        return Err(LinkError::LengthMismatch {
            what: "occupations",
            got: occupations.len(),
            expected: count,
        });
    }
    let weights = weights(localized, canonical, metric)?;
    let sets = level_sets(count, sets)?;
    let n_loc = localized.ncols();
    let set_weights = DMatrix::from_fn(n_loc, sets.len(), |k, s| {
        sets[s].iter().map(|&j| weights[(k, j)]).sum()
    });
    let captured = (0..n_loc)
        .map(|k| {
            (0..count)
                .filter(|&j| occupations[j] > 0.0)
                .map(|j| weights[(k, j)])
                .sum()
        })
        .collect();
    let occupancy = (0..n_loc)
        .map(|k| (0..count).map(|j| occupations[j] * weights[(k, j)]).sum())
        .collect();
    let mut entries = Vec::new();
    for k in 0..n_loc {
        for (s, set) in sets.iter().enumerate() {
            let weight = set_weights[(k, s)];
            if weight > threshold {
                entries.push(LinkEntry {
                    localized: k,
                    set: s,
                    canonical: set[0],
                    members: set.clone(),
                    weight,
                });
            }
        }
    }
    Ok(Links {
        weights,
        sets,
        set_weights,
        captured,
        occupancy,
        entries,
    })
}

/// The label of a canonical set: its members' labels, once if they are all the same
/// (a degenerate irrep level), else joined with "/"; "#j" for a missing label.
fn set_label(set: &[usize], canonical_labels: &[String]) -> String {
    let labels: Vec<String> = set
        .iter()
        .map(|&j| {
            canonical_labels
                .get(j)
                .cloned()
                .unwrap_or_else(|| format!("#{j}"))
        })
        .collect();
    if labels.iter().all(|l| *l == labels[0]) {
        labels[0].clone()
    } else {
        labels.join("/")
    }
}

fn localized_label(k: usize, labels: &[String]) -> String {
    labels.get(k).cloned().unwrap_or_else(|| format!("L{k}"))
}

/// For each localized orbital: its canonical constituents (set weights above the entry
/// threshold, largest first) and the occupied share, e.g.
/// `σ(N–H)  captured 1.0000: 2a1 0.3001, 1e 0.6650, 3a1 0.0349`.
pub fn constituents_text(
    links: &Links,
    localized_labels: &[String],
    canonical_labels: &[String],
) -> String {
    let mut out = String::new();
    for k in 0..links.weights.nrows() {
        let mut parts: Vec<&LinkEntry> =
            links.entries.iter().filter(|e| e.localized == k).collect();
        parts.sort_by(|a, b| b.weight.total_cmp(&a.weight).then(a.set.cmp(&b.set)));
        let list = parts
            .iter()
            .map(|e| {
                format!(
                    "{} {:.4}",
                    set_label(&links.sets[e.set], canonical_labels),
                    e.weight
                )
            })
            .collect::<Vec<_>>()
            .join(", ");
        let _ = writeln!(
            out,
            "{}  captured {:.4}: {}",
            localized_label(k, localized_labels),
            links.captured.get(k).copied().unwrap_or(0.0),
            list
        );
    }
    out
}

/// For each canonical level (set): the localized orbitals it feeds (weights above the entry
/// threshold, largest first), e.g. `1e: σ(N–H) 0.6650, σ(N–H) 0.6650, σ(N–H) 0.6650`.
/// Levels that feed nothing are left out.
pub fn feeds_text(
    links: &Links,
    localized_labels: &[String],
    canonical_labels: &[String],
) -> String {
    let mut out = String::new();
    for (s, set) in links.sets.iter().enumerate() {
        let mut parts: Vec<&LinkEntry> = links.entries.iter().filter(|e| e.set == s).collect();
        if parts.is_empty() {
            continue;
        }
        parts.sort_by(|a, b| {
            b.weight
                .total_cmp(&a.weight)
                .then(a.localized.cmp(&b.localized))
        });
        let list = parts
            .iter()
            .map(|e| {
                format!(
                    "{} {:.4}",
                    localized_label(e.localized, localized_labels),
                    e.weight
                )
            })
            .collect::<Vec<_>>()
            .join(", ");
        let _ = writeln!(out, "{}: {}", set_label(set, canonical_labels), list);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sets_by_energy_chain_and_sort() {
        let e = [-20.0, -15.0, -15.0005, -12.0, -11.9999];
        let sets = level_sets(
            5,
            LevelSets::ByEnergy {
                energies: &e,
                tolerance: 1e-3,
            },
        )
        .unwrap();
        assert_eq!(sets, vec![vec![0], vec![1, 2], vec![3, 4]]);
        let ids = [3, 1, 1, 7, 3];
        let sets = level_sets(5, LevelSets::Ids(&ids)).unwrap();
        assert_eq!(sets, vec![vec![0, 4], vec![1, 2], vec![3]]);
    }

    #[test]
    fn zero_orbital_is_an_error() {
        let s = DMatrix::identity(2, 2);
        let b = DMatrix::zeros(2, 1);
        let c = DMatrix::identity(2, 2);
        assert!(matches!(
            weights(&b, &c, Metric::Overlap(&s)),
            Err(LinkError::ZeroNorm { index: 0, .. })
        ));
    }
}
