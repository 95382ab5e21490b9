//! Mulliken labels of molecular orbitals: orbitals are grouped into degenerate sets by
//! energy, the character of each operation over a set is Σ_m c_mᵀ S Γ(R) c_m (the trace of
//! the representation on the set's span), and the reduction of those characters gives the
//! set's irrep (Cotton, *Chemical Applications of Group Theory*, 3rd ed., §4.3 and ch. 8).
//! Sets are numbered by energy within each irrep; in the core-inclusive convention the core
//! orbitals of the heavy atoms (1s for Li–Ne; 1s2s2p for Na–Ar; through 3p, and 3d for
//! Ga–Kr, from K on), reduced over the symmetry-equivalent atoms, are counted first
//! (common practice in photoelectron and MO texts, e.g. water's 1a1 is the O 1s core).
//! A set that carries no single irrep within tolerance is labelled "?" with the reason.

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};

use super::salc::{AoAction, ao_actions, reduce_by_class, shell_matrix};
use super::tables::IrrepLabel;
use super::{Numbering, Symmetry};
use crate::chem::Molecule;
use crate::chem::ao::AtomicOrbital;

/// Orbitals closer in energy than this (eV) form one degenerate set.
pub const DEGENERACY_EV: f64 = 1e-3;
/// A set that carries no single irrep on its own is tried together with the following sets
/// within this window (eV): a degeneracy split by a geometry that is symmetric only within
/// the tolerance (common practice, no source; sets that are pure alone are never merged).
pub const NEAR_DEGENERACY_EV: f64 = 0.2;

/// The label of one orbital.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct OrbitalLabel {
    pub irrep: Option<IrrepLabel>,
    /// "2a1", "1e", "1b3u", "3σg+", or "?".
    pub text: String,
    /// Index of the degenerate set (ascending energy) the orbital belongs to.
    pub degenerate_set: usize,
    /// Why the label is "?".
    pub reason: Option<String>,
}

/// Core shells (n, l) of an element.
fn core_shells(z: u8) -> Vec<(u8, u8)> {
    match z {
        0..=2 => vec![],
        3..=10 => vec![(1, 0)],
        11..=18 => vec![(1, 0), (2, 0), (2, 1)],
        19..=30 => vec![(1, 0), (2, 0), (2, 1), (3, 0), (3, 1)],
        _ => vec![(1, 0), (2, 0), (2, 1), (3, 0), (3, 1), (3, 2)],
    }
}

/// Number of core orbital sets of each irrep (index into `symmetry.table.irreps`).
pub fn core_irrep_counts(symmetry: &Symmetry, molecule: &Molecule) -> Vec<usize> {
    let traces: Vec<[f64; 3]> = symmetry
        .operations
        .iter()
        .map(|op| {
            let mut t = [0.0; 3];
            for (l, slot) in t.iter_mut().enumerate() {
                *slot = shell_matrix(l as u8, &op.matrix).trace();
            }
            t
        })
        .collect();
    let chars: Vec<f64> = symmetry
        .operations
        .iter()
        .zip(&traces)
        .map(|(op, t)| {
            let mut c = 0.0;
            for (i, atom) in molecule.atoms.iter().enumerate() {
                if op.permutation.get(i) == Some(&i) {
                    for (_, l) in core_shells(atom.element.atomic_number()) {
                        c += t[l as usize];
                    }
                }
            }
            c
        })
        .collect();
    reduce_by_class(symmetry, &chars)
        .iter()
        .map(|x| x.round().max(0.0) as usize)
        .collect()
}

fn unknown(set: usize, reason: String) -> OrbitalLabel {
    OrbitalLabel {
        irrep: None,
        text: "?".into(),
        degenerate_set: set,
        reason: Some(reason),
    }
}

/// Result of analysing a group of orbitals.
enum SetResult {
    /// One irrep (index).
    Pure(usize),
    /// Per-orbital irreps (accidental degeneracy of different irreps).
    Split(Vec<usize>),
    Mixed(String),
}

struct Context<'a> {
    symmetry: &'a Symmetry,
    actions: Vec<AoAction>,
    sc: DMatrix<f64>,
    coefficients: &'a DMatrix<f64>,
    /// First operation of each class.
    class_reps: Vec<usize>,
    class_sizes: Vec<f64>,
}

/// Leakage (1 − captured norm) above which a set's span is not invariant.
const LEAK: f64 = 1e-3;

impl Context<'_> {
    fn column(&self, m: usize) -> Vec<f64> {
        self.coefficients.column(m).iter().copied().collect()
    }

    fn sc_dot(&self, m: usize, v: &[f64]) -> f64 {
        self.sc.column(m).iter().zip(v).map(|(a, b)| a * b).sum()
    }

    /// cᵀ S Γ(R) c for orbital m and the operations `ops`.
    fn characters(&self, m: usize, ops: &[usize]) -> Vec<f64> {
        let c = self.coefficients.column(m);
        let sc = self.sc.column(m);
        ops.iter()
            .map(|&k| {
                // Σ_j c_j Σ_i Γ_ij (Sc)_i without forming the image.
                self.actions[k]
                    .columns
                    .iter()
                    .enumerate()
                    .map(|(j, col)| {
                        let cj = c[j];
                        if cj == 0.0 {
                            0.0
                        } else {
                            cj * col.iter().map(|&(i, g)| g * sc[i]).sum::<f64>()
                        }
                    })
                    .sum()
            })
            .collect()
    }

    /// Multiplicities from characters at the class representatives.
    fn reduce_classes(&self, chi: &[f64]) -> Vec<f64> {
        let h: f64 = self.class_sizes.iter().sum();
        self.symmetry
            .table
            .irreps
            .iter()
            .map(|ir| {
                let s: f64 = chi
                    .iter()
                    .enumerate()
                    .map(|(c, x)| self.class_sizes[c] * ir.characters[c] * x)
                    .sum();
                s / (h * ir.reality as f64)
            })
            .collect()
    }

    /// Whether the span of `members` is carried into itself by the generators.
    fn invariant(&self, members: &[usize]) -> bool {
        let n = self.coefficients.nrows();
        let mut image = vec![0.0; n];
        for &g in &self.symmetry.table.generators {
            let Some(action) = self.actions.get(g) else {
                return false;
            };
            for &v in members {
                let c = self.column(v);
                let norm = self.sc_dot(v, &c);
                action.apply(&c, &mut image);
                let captured: f64 = members
                    .iter()
                    .map(|&m| self.sc_dot(m, &image).powi(2))
                    .sum();
                if norm <= 0.0 || (norm - captured) / norm > LEAK {
                    return false;
                }
            }
        }
        true
    }

    fn analyse(&self, members: &[usize], class_chars: &[Vec<f64>]) -> SetResult {
        let table = &self.symmetry.table;
        let mut total = vec![0.0; self.class_reps.len()];
        for &m in members {
            for (t, c) in total.iter_mut().zip(&class_chars[m]) {
                *t += c;
            }
        }
        let mult = self.reduce_classes(&total);
        let k = members.len();
        if let Some(best) = (0..mult.len()).find(|&i| (mult[i] - 1.0).abs() < 0.1)
            && table.irreps[best].dimension == k
            && mult
                .iter()
                .enumerate()
                .all(|(i, x)| i == best || x.abs() < 0.1)
            && self.invariant(members)
        {
            return SetResult::Pure(best);
        }
        // Accidental degeneracy or broken symmetry: each orbital on its own, with the
        // characters of every operation.
        let all: Vec<usize> = (0..self.actions.len()).collect();
        let mut each = Vec::new();
        for &m in members {
            let weights = reduce_by_class(self.symmetry, &self.characters(m, &all));
            // Projection weight of irrep Γ: d_Γ × multiplicity of the 1-orbital "trace".
            let w: Vec<f64> = weights
                .iter()
                .zip(&table.irreps)
                .map(|(x, ir)| x * ir.dimension as f64)
                .collect();
            let (best, wb) =
                w.iter().enumerate().fold(
                    (0, f64::MIN),
                    |acc, (i, &x)| if x > acc.1 { (i, x) } else { acc },
                );
            if wb < 0.9 {
                let mut parts: Vec<(f64, String)> = w
                    .iter()
                    .zip(&table.irreps)
                    .filter(|(x, _)| **x > 0.02)
                    .map(|(x, ir)| (*x, format!("{:.0}% {}", 100.0 * x, ir.label)))
                    .collect();
                parts.sort_by(|a, b| b.0.total_cmp(&a.0));
                let text: Vec<String> = parts.into_iter().map(|p| p.1).collect();
                return SetResult::Mixed(format!(
                    "the orbital mixes irreps ({}); the geometry is not symmetric enough within the tolerance",
                    text.join(", ")
                ));
            }
            each.push(best);
        }
        // Each irrep of dimension d must occur a multiple of d times.
        for (i, ir) in table.irreps.iter().enumerate() {
            let count = each.iter().filter(|&&b| b == i).count();
            if count % ir.dimension != 0 {
                return SetResult::Mixed(format!(
                    "only {count} orbital(s) of the {}-dimensional irrep {} lie within {} eV of \
                     each other; the degeneracy is broken",
                    ir.dimension, ir.label, NEAR_DEGENERACY_EV
                ));
            }
        }
        SetResult::Split(each)
    }
}

/// Labels orbitals (columns of `coefficients`, rows = `basis`) with energies ascending (eV)
/// and AO overlap matrix `overlap`. Never fails: problems give "?" with a reason.
pub fn label_orbitals(
    symmetry: &Symmetry,
    molecule: &Molecule,
    basis: &[AtomicOrbital],
    coefficients: &DMatrix<f64>,
    energies: &[f64],
    overlap: &DMatrix<f64>,
    numbering: Numbering,
) -> Vec<OrbitalLabel> {
    let m = coefficients.ncols();
    let n = basis.len();
    if coefficients.nrows() != n
        || overlap.nrows() != n
        || overlap.ncols() != n
        || energies.len() != m
    {
        let reason = format!(
            "sizes do not match: {n} basis functions, coefficients {}×{}, overlap {}×{}, {} energies",
            coefficients.nrows(),
            coefficients.ncols(),
            overlap.nrows(),
            overlap.ncols(),
            energies.len()
        );
        return (0..m).map(|i| unknown(i, reason.clone())).collect();
    }
    let actions = ao_actions(symmetry, basis);
    let actions = match actions {
        Ok(a) => a,
        Err(e) => return (0..m).map(|i| unknown(i, e.to_string())).collect(),
    };
    if symmetry.operations.len() == 1 && symmetry.table.irreps.len() == 1 {
        // C1: every orbital is a; only the numbering needs work.
        return label_trivial(symmetry, molecule, energies, numbering);
    }
    let n_classes = symmetry.table.classes.len();
    let mut class_reps = vec![usize::MAX; n_classes];
    for (k, op) in symmetry.operations.iter().enumerate() {
        if let Some(slot) = class_reps.get_mut(op.class)
            && *slot == usize::MAX
        {
            *slot = k;
        }
    }
    if class_reps.contains(&usize::MAX) {
        let reason = "the operations do not cover every class of the table".to_string();
        return (0..m).map(|i| unknown(i, reason.clone())).collect();
    }
    let ctx = Context {
        symmetry,
        actions,
        sc: overlap * coefficients,
        coefficients,
        class_reps,
        class_sizes: symmetry
            .table
            .classes
            .iter()
            .map(|c| c.size as f64)
            .collect(),
    };
    let chars: Vec<Vec<f64>> = (0..m).map(|k| ctx.characters(k, &ctx.class_reps)).collect();
    // Degenerate sets by energy.
    let mut sets: Vec<Vec<usize>> = Vec::new();
    for k in 0..m {
        match sets.last_mut() {
            Some(last)
                if last
                    .last()
                    .is_some_and(|&prev| (energies[k] - energies[prev]).abs() < DEGENERACY_EV) =>
            {
                last.push(k)
            }
            _ => sets.push(vec![k]),
        }
    }
    let mut counters: Vec<usize> = match numbering {
        Numbering::CoreInclusive => core_irrep_counts(symmetry, molecule),
        Numbering::ValenceOnly => vec![0; symmetry.table.irreps.len()],
    };
    let mut labels: Vec<Option<OrbitalLabel>> = vec![None; m];
    let mut s = 0;
    let mut set_index = 0;
    while s < sets.len() {
        let mut members = sets[s].clone();
        let mut result = ctx.analyse(&members, &chars);
        let mut used = 1;
        // A degeneracy split a little by an imperfect geometry: try with the following
        // sets while they stay within NEAR_DEGENERACY_EV of this one (at most 5 orbitals,
        // the largest irrep dimension).
        if matches!(result, SetResult::Mixed(_)) {
            let start = energies[sets[s][0]];
            let mut joined = members.clone();
            let mut count = 1;
            while let Some(next) = sets.get(s + count) {
                if (energies[next[0]] - start).abs() >= NEAR_DEGENERACY_EV
                    || joined.len() + next.len() > 5
                {
                    break;
                }
                joined.extend(next.iter().copied());
                count += 1;
                let r2 = ctx.analyse(&joined, &chars);
                if !matches!(r2, SetResult::Mixed(_)) {
                    members = joined.clone();
                    result = r2;
                    used = count;
                    break;
                }
            }
        }
        match result {
            SetResult::Pure(irrep) => {
                counters[irrep] += 1;
                let label = symmetry.table.irreps[irrep].label.clone();
                for &k in &members {
                    labels[k] = Some(OrbitalLabel {
                        text: format!("{}{}", counters[irrep], label),
                        irrep: Some(label.clone()),
                        degenerate_set: set_index,
                        reason: None,
                    });
                }
            }
            SetResult::Split(each) => {
                let mut seen: Vec<(usize, usize)> = Vec::new();
                for (&k, &irrep) in members.iter().zip(&each) {
                    let pos = seen.iter().position(|(i, _)| *i == irrep);
                    let count = match pos {
                        Some(p) => {
                            seen[p].1 += 1;
                            seen[p].1
                        }
                        None => {
                            seen.push((irrep, 1));
                            1
                        }
                    };
                    let dim = symmetry.table.irreps[irrep].dimension;
                    if count % dim == 1 || dim == 1 {
                        counters[irrep] += 1;
                    }
                    let label = symmetry.table.irreps[irrep].label.clone();
                    labels[k] = Some(OrbitalLabel {
                        text: format!("{}{}", counters[irrep], label),
                        irrep: Some(label),
                        degenerate_set: set_index,
                        reason: None,
                    });
                }
            }
            SetResult::Mixed(reason) => {
                for &k in &members {
                    labels[k] = Some(unknown(set_index, reason.clone()));
                }
            }
        }
        s += used;
        set_index += 1;
    }
    labels
        .into_iter()
        .enumerate()
        .map(|(k, l)| l.unwrap_or_else(|| unknown(k, "not analysed".into())))
        .collect()
}

/// Labels for the trivial group: sets by energy, all of irrep a.
fn label_trivial(
    symmetry: &Symmetry,
    molecule: &Molecule,
    energies: &[f64],
    numbering: Numbering,
) -> Vec<OrbitalLabel> {
    let mut counter = match numbering {
        Numbering::CoreInclusive => core_irrep_counts(symmetry, molecule)
            .first()
            .copied()
            .unwrap_or(0),
        Numbering::ValenceOnly => 0,
    };
    let Some(irrep) = symmetry.table.irreps.first() else {
        return Vec::new();
    };
    let label = irrep.label.clone();
    let mut out = Vec::with_capacity(energies.len());
    for set in 0..energies.len() {
        counter += 1;
        out.push(OrbitalLabel {
            irrep: Some(label.clone()),
            text: format!("{counter}{label}"),
            degenerate_set: set,
            reason: None,
        });
    }
    out
}
