//! The localized ladder: two-centre bonds from the 2×2 generalized eigenproblem
//! H c = ε S c of the two hybrids that face each other (or a hybrid and a hydrogen 1s), with
//! the same extended Hückel matrix elements as the canonical MOs (h_Aᵀ H h_B, h_Aᵀ S h_B in
//! the AO basis); σ below, σ* above. π bonds the same way from the p orbitals left over on
//! the two atoms; lone pairs and vacant orbitals at their hybrid energy ⟨h|H|h⟩. This is the
//! textbook bond-orbital construction of the localized picture (Coulson, *Valence*, 1952;
//! common practice, no source for the label style). Occupancies follow the Lewis count.

use nalgebra::DMatrix;
use serde::{Deserialize, Serialize};

use super::{CentreHybrids, HybridError, HybridKind, atom_orbital_indices};
use crate::chem::molecule::Molecule;
use crate::eht::EhtResult;

/// What a localized orbital is.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LocalizedKind {
    /// σ bond (bonding combination).
    Bond,
    /// σ* (antibonding combination).
    Antibond,
    LonePair,
    Pi,
    PiStar,
    /// An empty valence orbital of a centre (BF3's p, a carbocation's p).
    Vacant,
}

impl LocalizedKind {
    /// The JSON name: "bond", "antibond", "lone_pair", "pi", "pi_star" or "vacant".
    pub fn as_str(self) -> &'static str {
        match self {
            LocalizedKind::Bond => "bond",
            LocalizedKind::Antibond => "antibond",
            LocalizedKind::LonePair => "lone_pair",
            LocalizedKind::Pi => "pi",
            LocalizedKind::PiStar => "pi_star",
            LocalizedKind::Vacant => "vacant",
        }
    }
}

/// One level of the localized ladder.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LocalizedOrbital {
    pub kind: LocalizedKind,
    /// Short label such as σ(N–H), σ*(N–H), n(N), π(C–O), π*(C–O), v(B).
    pub label: String,
    /// The atoms involved, 0-based (the pair of a bond, the centre of a lone pair).
    pub atoms: Vec<usize>,
    /// ⟨φ|H|φ⟩ / ⟨φ|S|φ⟩ in eV.
    pub energy_ev: f64,
    /// Electrons in the Lewis picture: 2, 1 (a radical's odd electron) or 0.
    pub occupancy: f64,
    /// AO coefficients (length = basis size), normalized with S.
    pub coefficients: Vec<f64>,
}

/// A sparse AO vector.
type Sparse = Vec<(usize, f64)>;

fn bilinear(m: &DMatrix<f64>, x: &Sparse, y: &Sparse) -> f64 {
    let mut total = 0.0;
    for &(i, a) in x {
        for &(j, b) in y {
            total += a * m[(i, j)] * b;
        }
    }
    total
}

/// Eigenpairs of the 2×2 problem [[a, b], [b, d]] c = ε [[saa, s], [s, sbb]] c, lower first;
/// each c normalized with the metric. `None` when the metric is singular.
#[allow(clippy::type_complexity)]
pub fn two_by_two(h: [[f64; 2]; 2], s: [[f64; 2]; 2]) -> Option<[(f64, [f64; 2]); 2]> {
    let det_s = s[0][0] * s[1][1] - s[0][1] * s[1][0];
    if det_s.is_nan() || det_s <= 1e-12 || s[0][0].is_nan() || s[0][0] <= 0.0 {
        return None;
    }
    // det(H − εS) = det_s ε² − (h00 s11 + h11 s00 − 2 h01 s01) ε + det_h.
    let b = h[0][0] * s[1][1] + h[1][1] * s[0][0] - 2.0 * h[0][1] * s[0][1];
    let det_h = h[0][0] * h[1][1] - h[0][1] * h[1][0];
    let discriminant = (b * b - 4.0 * det_s * det_h).max(0.0);
    let root = discriminant.sqrt();
    let energies = [(b - root) / (2.0 * det_s), (b + root) / (2.0 * det_s)];
    let mut out = [(0.0, [0.0; 2]); 2];
    for (k, &e) in energies.iter().enumerate() {
        let m00 = h[0][0] - e * s[0][0];
        let m01 = h[0][1] - e * s[0][1];
        let m11 = h[1][1] - e * s[1][1];
        let first = [m01, -m00];
        let second = [-m11, m01];
        let mut c = if first[0].hypot(first[1]) >= second[0].hypot(second[1]) {
            first
        } else {
            second
        };
        if c[0].hypot(c[1]) < 1e-300 {
            // H is a multiple of S: any vector; take the bonding/antibonding pair.
            c = if k == 0 { [1.0, 0.0] } else { [0.0, 1.0] };
        }
        let norm =
            (c[0] * c[0] * s[0][0] + 2.0 * c[0] * c[1] * s[0][1] + c[1] * c[1] * s[1][1]).sqrt();
        if !norm.is_finite() || norm <= 0.0 {
            return None;
        }
        let mut c = [c[0] / norm, c[1] / norm];
        if c[0] < 0.0 || (c[0] == 0.0 && c[1] < 0.0) {
            c = [-c[0], -c[1]];
        }
        out[k] = (e, c);
    }
    Some(out)
}

fn dense(n: usize, parts: &[(&Sparse, f64)]) -> Vec<f64> {
    let mut v = vec![0.0; n];
    for (sparse, factor) in parts {
        for &(i, c) in sparse.iter() {
            v[i] += factor * c;
        }
    }
    v
}

fn symbol(molecule: &Molecule, atom: usize) -> &'static str {
    molecule.atoms[atom].element.symbol()
}

/// The two atoms in label order: the heavier-element end (non-hydrogen) first, then by index.
fn label_order(molecule: &Molecule, a: usize, b: usize) -> (usize, usize) {
    let is_h = |x: usize| molecule.atoms[x].element.atomic_number() == 1;
    match (is_h(a), is_h(b)) {
        (true, false) => (b, a),
        (false, true) => (a, b),
        _ => (a.min(b), a.max(b)),
    }
}

/// Builds the localized ladder from the centres' hybrids. Bonds whose ends lack an
/// orbital (a skipped centre) are left out with a note; the result is sorted by energy.
pub fn localized_ladder(
    molecule: &Molecule,
    eht: &EhtResult,
    centres: &[CentreHybrids],
) -> (Vec<LocalizedOrbital>, Vec<HybridError>, Vec<String>) {
    let mut orbitals = Vec::new();
    let mut errors = Vec::new();
    let mut notes = Vec::new();
    let n = eht.basis.len();
    if eht.basis.atom_ranges.len() != molecule.atoms.len()
        || eht.hamiltonian.nrows() != n
        || eht.overlap.nrows() != n
    {
        errors.push(HybridError::BasisMismatch {
            atoms: molecule.atoms.len(),
            basis_atoms: eht.basis.atom_ranges.len(),
        });
        return (orbitals, errors, notes);
    }
    let (s_index, sp_index) = atom_orbital_indices(molecule, eht);
    let mut centre_of = vec![None; molecule.atoms.len()];
    for (k, centre) in centres.iter().enumerate() {
        if let Some(slot) = centre_of.get_mut(centre.atom) {
            *slot = Some(k);
        }
    }
    let local = |atom: usize, v: &[f64; 4]| -> Option<Sparse> {
        let idx = sp_index.get(atom).copied().flatten()?;
        Some(idx.iter().zip(v).map(|(&i, &c)| (i, c)).collect())
    };
    // The orbital of `atom` that faces `partner` in a σ bond.
    let sigma_orbital = |atom: usize, partner: usize| -> Option<Sparse> {
        if let Some(k) = centre_of[atom] {
            let hybrid = centres[k]
                .hybrids
                .iter()
                .find(|h| h.kind == HybridKind::Bond && h.partner == Some(partner))?;
            return local(atom, &hybrid.local);
        }
        if sp_index[atom].is_none() && molecule.neighbours(atom).len() == 1 {
            return s_index[atom].map(|i| vec![(i, 1.0)]);
        }
        None
    };
    let (h, s) = (&eht.hamiltonian, &eht.overlap);
    let mut pair = |orbitals: &mut Vec<LocalizedOrbital>,
                    a: usize,
                    b: usize,
                    x: &Sparse,
                    y: &Sparse,
                    kinds: (LocalizedKind, LocalizedKind),
                    names: (&str, &str)|
     -> bool {
        let hm = [
            [bilinear(h, x, x), bilinear(h, x, y)],
            [bilinear(h, y, x), bilinear(h, y, y)],
        ];
        let sm = [
            [bilinear(s, x, x), bilinear(s, x, y)],
            [bilinear(s, y, x), bilinear(s, y, y)],
        ];
        let Some(levels) = two_by_two(hm, sm) else {
            errors.push(HybridError::SingularPair { a, b });
            return false;
        };
        let (first, second) = label_order(molecule, a, b);
        let atoms_label = format!("{}–{}", symbol(molecule, first), symbol(molecule, second));
        for (k, (energy, c)) in levels.iter().enumerate() {
            let (kind, name, occupancy) = if k == 0 {
                (kinds.0, names.0, 2.0)
            } else {
                (kinds.1, names.1, 0.0)
            };
            orbitals.push(LocalizedOrbital {
                kind,
                label: format!("{name}({atoms_label})"),
                atoms: vec![first, second],
                energy_ev: *energy,
                occupancy,
                coefficients: dense(n, &[(x, c[0]), (y, c[1])]),
            });
        }
        true
    };
    for bond in &molecule.bonds {
        let (a, b) = (bond.a, bond.b);
        if a >= molecule.atoms.len() || b >= molecule.atoms.len() {
            continue;
        }
        match (sigma_orbital(a, b), sigma_orbital(b, a)) {
            (Some(x), Some(y)) => {
                pair(
                    &mut orbitals,
                    a,
                    b,
                    &x,
                    &y,
                    (LocalizedKind::Bond, LocalizedKind::Antibond),
                    ("σ", "σ*"),
                );
            }
            _ => notes.push(format!(
                "σ({}{a}–{}{b}) left out of the localized ladder: an end has no two-centre hybrid (see errors)",
                symbol(molecule, a),
                symbol(molecule, b)
            )),
        }
        if bond.order < 2 {
            continue;
        }
        let pi_of = |atom: usize, partner: usize| -> Vec<Sparse> {
            centre_of[atom]
                .map(|k| {
                    centres[k]
                        .hybrids
                        .iter()
                        .filter(|h| h.kind == HybridKind::Pi && h.partner == Some(partner))
                        .filter_map(|h| local(atom, &h.local))
                        .collect()
                })
                .unwrap_or_default()
        };
        let (pa, pb) = (pi_of(a, b), pi_of(b, a));
        if pa.len() != pb.len() || pa.is_empty() {
            notes.push(format!(
                "π({}{a}–{}{b}) left out of the localized ladder: the two ends do not both have π orbitals for it",
                symbol(molecule, a),
                symbol(molecule, b)
            ));
            continue;
        }
        for (x, y) in pa.iter().zip(&pb) {
            pair(
                &mut orbitals,
                a,
                b,
                x,
                y,
                (LocalizedKind::Pi, LocalizedKind::PiStar),
                ("π", "π*"),
            );
        }
    }
    for centre in centres {
        let atom = centre.atom;
        if atom >= molecule.atoms.len() {
            continue;
        }
        let lone: Vec<_> = centre
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::LonePair)
            .collect();
        for (k, hybrid) in lone.iter().enumerate() {
            let Some(x) = local(atom, &hybrid.local) else {
                continue;
            };
            let norm = bilinear(s, &x, &x);
            let occupancy = if centre.single_electron && k + 1 == lone.len() {
                1.0
            } else {
                2.0
            };
            orbitals.push(LocalizedOrbital {
                kind: LocalizedKind::LonePair,
                label: format!("n({})", symbol(molecule, atom)),
                atoms: vec![atom],
                energy_ev: bilinear(h, &x, &x) / norm,
                occupancy,
                coefficients: dense(n, &[(&x, 1.0 / norm.sqrt())]),
            });
        }
        for hybrid in centre
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Vacant)
        {
            let Some(x) = local(atom, &hybrid.local) else {
                continue;
            };
            let norm = bilinear(s, &x, &x);
            orbitals.push(LocalizedOrbital {
                kind: LocalizedKind::Vacant,
                label: format!("v({})", symbol(molecule, atom)),
                atoms: vec![atom],
                energy_ev: bilinear(h, &x, &x) / norm,
                occupancy: 0.0,
                coefficients: dense(n, &[(&x, 1.0 / norm.sqrt())]),
            });
        }
    }
    orbitals.sort_by(|p, q| p.energy_ev.total_cmp(&q.energy_ev));
    let electrons: f64 = orbitals.iter().map(|o| o.occupancy).sum();
    if (electrons - eht.electrons as f64).abs() > 1e-9 && !orbitals.is_empty() {
        notes.push(format!(
            "the localized ladder holds {electrons} electrons, the molecule {}: the Lewis picture is incomplete here",
            eht.electrons
        ));
    }
    (orbitals, errors, notes)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn two_by_two_matches_the_homonuclear_closed_form() {
        // Equal diagonals α, coupling β, overlap s: ε± = (α ± β)/(1 ± s) (Hückel with
        // overlap; common practice, no source).
        let (alpha, beta, s) = (-13.6, -14.0, 0.6);
        let levels = two_by_two([[alpha, beta], [beta, alpha]], [[1.0, s], [s, 1.0]]).unwrap();
        assert!((levels[0].0 - (alpha + beta) / (1.0 + s)).abs() < 1e-12);
        assert!((levels[1].0 - (alpha - beta) / (1.0 - s)).abs() < 1e-12);
        let c = levels[0].1;
        assert!((c[0] - c[1]).abs() < 1e-12, "bonding is the in-phase sum");
        let norm = c[0] * c[0] + c[1] * c[1] + 2.0 * s * c[0] * c[1];
        assert!((norm - 1.0).abs() < 1e-12);
        assert!(two_by_two([[0.0; 2]; 2], [[1.0, 1.0], [1.0, 1.0]]).is_none());
    }
}
