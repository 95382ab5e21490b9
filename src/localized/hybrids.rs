//! Hybrids read from the wavefunction, and the one reader of a one-centre orbital's shape
//! that every hybrid model uses.
//!
//! **From the localized orbitals** (the default model, `localized`): on each atom, the
//! parts of the occupied localized orbitals that have the atom among their centres are its
//! hybrids. Nearly parallel parts (|cos| ≥
//! [`super::classify::PARALLEL_COSINE`]: the two orbitals of a 3c–4e unit on its centre,
//! O2's π and π* on each O) are one hybrid, the dominant direction of their
//! population-weighted projector. The hybrids of an atom are then orthonormalized among
//! themselves by Löwdin's symmetric method, F = R (RᵀR)^(−½), which changes each as little
//! as possible (P.-O. Löwdin, J. Chem. Phys. 18, 365 (1950); the same step as in natural
//! hybrid orbitals, A. E. Reed, L. A. Curtiss and F. Weinhold, Chem. Rev. 88, 899 (1988)),
//! so that the s shares of an atom add to at most 1 by construction. Directions of RᵀR
//! with an eigenvalue below [`RANK_THRESHOLD`] are dropped: an atom with more such parts
//! than valence functions (SF6's sulfur with s,p only) is *over-complete*, its hybrids
//! are shares of orbitals (`share` < 1, Σ share × s-fraction ≤ 1 still), and the ladder
//! shows the multicentre orbitals instead of two-centre bonds. The rest of the atom's space
//! is completed with vacant hybrids (from the empty one-centre localized orbitals where
//! there are some).
//!
//! **The reader** ([`read_shape`]): for coefficients over one atom's orthonormal
//! functions, the s, p and d shares, λ = p/s of sp^λ (Coulson, *Valence*, 1952), and the
//! direction of the p part, pointing where the s and p lobes add.

use nalgebra::{DMatrix, DVector, SymmetricEigen, Vector3};
use serde::{Deserialize, Serialize};

use super::classify::{
    BondCharacter, LocalizedOrbital, OrbitalClass, OrbitalSpace, PARALLEL_COSINE, ThreeCentreUnit,
    p_vector, part_on,
};
use super::orthonormal::{AtomLayout, push_orthonormal};
use crate::chem::ao::AngularKind;
use crate::chem::molecule::{Molecule, angle_between};

/// Eigenvalues of the overlap of an atom's hybrids below this are treated as zero (an
/// over-complete atom). Our choice, no source.
pub const RANK_THRESHOLD: f64 = 0.05;

/// Which model gives the hybrids.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HybridModel {
    /// Read from the localized orbitals of the wavefunction (the default).
    #[default]
    Localized,
    /// Coulson's relations from the bond angles, on the wavefunction's Lewis structure;
    /// maximum overlap where they do not apply.
    Geometric,
    /// Maximum overlap, iterated to self-consistency, on the same Lewis structure.
    MaxOverlap,
}

impl HybridModel {
    /// The JSON name (the serde name): "localized", "geometric", "max_overlap".
    pub fn as_str(self) -> &'static str {
        match self {
            HybridModel::Localized => "localized",
            HybridModel::Geometric => "geometric",
            HybridModel::MaxOverlap => "max_overlap",
        }
    }
}

/// What a hybrid of an atom is used for.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum HybridKind {
    /// σ bond toward `partner`.
    Bond,
    /// π orbital (toward `partner`; none for the centre of a π 3c–4e unit).
    Pi,
    LonePair,
    /// A one-centre orbital holding less than two electrons (a radical's).
    SingleElectron,
    /// Part of a multicentre orbital (diborane's B–H–B) or the centre of a σ 3c–4e unit.
    Multicentre,
    /// Empty orbital completing the atom's set.
    Vacant,
}

impl HybridKind {
    /// The JSON name (the serde name).
    pub fn as_str(self) -> &'static str {
        match self {
            HybridKind::Bond => "bond",
            HybridKind::Pi => "pi",
            HybridKind::LonePair => "lone_pair",
            HybridKind::SingleElectron => "single_electron",
            HybridKind::Multicentre => "multicentre",
            HybridKind::Vacant => "vacant",
        }
    }
}

/// The shape of a one-centre orbital.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct HybridShape {
    /// λ of sp^λ; None without s (pure p, λ → ∞).
    pub lambda: Option<f64>,
    pub s_share: f64,
    pub p_share: f64,
    pub d_share: f64,
    /// Unit vector of the p part (zero without p).
    pub direction: [f64; 3],
}

/// Reads the shape of coefficients `local` over functions of the given kinds.
pub fn read_shape(local: &[f64], kinds: &[AngularKind]) -> HybridShape {
    let (mut s, mut s_sign, mut d) = (0.0, 0.0, 0.0);
    for (&c, &kind) in local.iter().zip(kinds) {
        match kind.l() {
            0 => {
                s += c * c;
                s_sign += c;
            }
            1 => {}
            _ => d += c * c,
        }
    }
    let p_vec = p_vector(local, kinds);
    let p = p_vec.norm_squared();
    let total = s + p + d;
    if total <= 0.0 {
        return HybridShape {
            lambda: None,
            s_share: 0.0,
            p_share: 0.0,
            d_share: 0.0,
            direction: [0.0; 3],
        };
    }
    let direction = if p > 1e-12 * total {
        let sign = if s > 1e-12 * total && s_sign < 0.0 {
            -1.0
        } else {
            1.0
        };
        p_vec * (sign / p.sqrt())
    } else {
        Vector3::zeros()
    };
    HybridShape {
        lambda: (s > 1e-12 * total).then(|| p / s),
        s_share: s / total,
        p_share: p / total,
        d_share: d / total,
        direction: [direction.x, direction.y, direction.z],
    }
}

/// The angle (degrees) between a hybrid's direction and the axis from `atom` to
/// `partner`, when both exist.
pub fn bending(
    shape: &HybridShape,
    molecule: &Molecule,
    atom: usize,
    partner: usize,
) -> Option<f64> {
    let direction = Vector3::from(shape.direction);
    let axis = molecule.atoms.get(partner)?.position - molecule.atoms.get(atom)?.position;
    (direction.norm() > 0.5 && axis.norm() > 1e-8)
        .then(|| angle_between(&direction, &axis).to_degrees())
}

/// One hybrid of an atom in the wavefunction model.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct AtomHybrid {
    pub kind: HybridKind,
    pub partner: Option<usize>,
    /// Coefficients over the atom's orthonormal functions (norm² = `share`).
    pub vector: Vec<f64>,
    /// The fraction of an orbital this hybrid is: 1, or less on an over-complete atom.
    pub share: f64,
    /// The localized orbitals whose parts make it (none for vacant hybrids).
    pub orbitals: Vec<usize>,
    /// The 3c–4e unit its orbitals belong to.
    pub unit: Option<usize>,
    pub shape: HybridShape,
    /// Angle to the axis toward the partner (σ bonds), degrees.
    pub bending_degrees: Option<f64>,
}

/// The hybrids of one atom.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct AtomHybrids {
    pub atom: usize,
    pub hybrids: Vec<AtomHybrid>,
    /// More independent parts than the atom has functions (see the module doc).
    pub over_complete: bool,
}

/// The wavefunction hybrids of every atom; notes name the over-complete atoms.
pub fn read_hybrids(
    orbitals: &[LocalizedOrbital],
    vectors: &DMatrix<f64>,
    units: &[ThreeCentreUnit],
    layout: &AtomLayout,
    molecule: &Molecule,
) -> (Vec<AtomHybrids>, Vec<String>) {
    let mut notes = Vec::new();
    let all = (0..layout.atoms())
        .map(|atom| {
            let found = atom_hybrids(atom, orbitals, vectors, units, layout, molecule);
            if found.over_complete {
                let used = found.hybrids.iter().filter(|h| h.kind != HybridKind::Vacant).count();
                notes.push(format!(
                    "atom {atom} ({}): {used} localized orbitals share its {} valence functions (multicentre or hypervalent bonding): its hybrids are shares of orbitals, and the localized ladder shows the multicentre orbitals they form",
                    molecule.atoms[atom].element.symbol(),
                    layout.ranges[atom].len()
                ));
            }
            found
        })
        .collect();
    (all, notes)
}

/// Bent's rule (H. A. Bent, Chem. Rev. 61, 275 (1961)) says a centre's lone pairs are its
/// s-richest hybrids. Where the wavefunction's reading disagrees by more than one
/// percentage point on a centre with two or more σ bonds, a note says so with the numbers: extended Hückel puts the 2s of N and
/// O mostly into the bonds (ammonia's HOMO is 96 % N 2p and 1.3 % N 2s by Mulliken shares), so the reading follows the
/// wavefunction, not the rule.
pub fn bent_notes(hybrids: &[AtomHybrids], molecule: &Molecule) -> Vec<String> {
    let mut notes = Vec::new();
    for atom_hybrids in hybrids {
        let s_of = |kind: HybridKind| {
            atom_hybrids
                .hybrids
                .iter()
                .filter(|h| h.kind == kind)
                .map(|h| 100.0 * h.shape.s_share)
                .fold(None, |best: Option<f64>, s| {
                    Some(best.map_or(s, |b| b.max(s)))
                })
        };
        let bonds = atom_hybrids
            .hybrids
            .iter()
            .filter(|h| h.kind == HybridKind::Bond)
            .count();
        if let (Some(lone), Some(bond), true) = (
            s_of(HybridKind::LonePair),
            s_of(HybridKind::Bond),
            bonds >= 2,
        ) && lone + 1.0 < bond
        {
            notes.push(format!(
                "atom {} ({}): its s-richest lone pair has {lone:.1} % s, less than its bonds ({bond:.1} % s), against Bent's rule; this follows the extended Hückel wavefunction, which puts little s character into this lone pair (the geometric model gives the textbook reading)",
                atom_hybrids.atom,
                molecule.atoms[atom_hybrids.atom].element.symbol()
            ));
        }
    }
    notes
}

/// Per 3c–4e unit, the electrons of partly occupied orbitals whose part on the unit's
/// centre joined the centre's shared hybrid (a radical's electron in the unit's
/// antibonding level).
pub fn unit_antibonding(
    hybrids: &[AtomHybrids],
    orbitals: &[LocalizedOrbital],
    units: &[ThreeCentreUnit],
) -> Vec<f64> {
    units
        .iter()
        .map(|unit| {
            let Some(centre) = hybrids.iter().find(|h| h.atom == unit.atoms[1]) else {
                return 0.0;
            };
            centre
                .hybrids
                .iter()
                .find(|h| h.orbitals.contains(&unit.orbitals[0]))
                .map_or(0.0, |shared| {
                    shared
                        .orbitals
                        .iter()
                        .filter(|&&k| orbitals[k].space == OrbitalSpace::Partly)
                        .map(|&k| orbitals[k].occupancy)
                        .sum()
                })
        })
        .collect()
}

/// A group of nearly parallel parts on one atom.
struct Cluster {
    /// (orbital, normalized part, population), largest population first.
    members: Vec<(usize, DVector<f64>, f64)>,
}

impl Cluster {
    /// The dominant direction of Σ w p̂ p̂ᵀ, signed like the leading part.
    fn representative(&self) -> DVector<f64> {
        let lead = &self.members[0].1;
        if self.members.len() == 1 {
            return lead.clone();
        }
        let n = lead.len();
        let mut projector = DMatrix::zeros(n, n);
        for (_, part, weight) in &self.members {
            projector += part * part.transpose() * *weight;
        }
        let eigen = SymmetricEigen::new(projector);
        let top = eigen.eigenvalues.imax();
        let v = eigen.eigenvectors.column(top).into_owned();
        if v.dot(lead) < 0.0 { -v } else { v }
    }
}

fn atom_hybrids(
    atom: usize,
    orbitals: &[LocalizedOrbital],
    vectors: &DMatrix<f64>,
    units: &[ThreeCentreUnit],
    layout: &AtomLayout,
    molecule: &Molecule,
) -> AtomHybrids {
    let kinds = &layout.kinds[layout.ranges[atom].clone()];
    let clusters = clusters_on(atom, orbitals, vectors, layout);
    let representatives: Vec<DVector<f64>> = clusters.iter().map(Cluster::representative).collect();
    let (frame, rank) = lowdin_frame(&representatives, kinds.len());
    let over_complete = rank < representatives.len();
    let mut hybrids: Vec<AtomHybrid> = clusters
        .iter()
        .zip(frame)
        .map(|(cluster, vector)| {
            let lead = cluster.members[0].0;
            let (kind, partner) = kind_of(&orbitals[lead], atom, units);
            let mut hybrid = make_hybrid(kind, partner, vector, kinds, molecule, atom);
            hybrid.orbitals = cluster.members.iter().map(|m| m.0).collect();
            hybrid.unit = orbitals[lead].unit;
            hybrid
        })
        .collect();
    let taken: Vec<DVector<f64>> = hybrids
        .iter()
        .map(|h| DVector::from_vec(h.vector.clone()))
        .collect();
    for vector in vacant_completion(atom, &taken, orbitals, vectors, layout) {
        hybrids.push(make_hybrid(
            HybridKind::Vacant,
            None,
            vector,
            kinds,
            molecule,
            atom,
        ));
    }
    AtomHybrids {
        atom,
        hybrids,
        over_complete,
    }
}

/// Parts of the occupied orbitals on `atom`, grouped when nearly parallel.
fn clusters_on(
    atom: usize,
    orbitals: &[LocalizedOrbital],
    vectors: &DMatrix<f64>,
    layout: &AtomLayout,
) -> Vec<Cluster> {
    let mut parts: Vec<(usize, DVector<f64>, f64)> = Vec::new();
    for (k, orbital) in orbitals.iter().enumerate() {
        if orbital.space == OrbitalSpace::Virtual || !orbital.centres.contains(&atom) {
            continue;
        }
        let part = DVector::from_vec(part_on(vectors.column(k), layout, atom));
        let population = part.norm_squared();
        if population > 1e-12 {
            parts.push((k, part / population.sqrt(), population));
        }
    }
    // Doubly occupied parts first, largest first; then the partly occupied ones.
    let partly = |k: usize| orbitals[k].space == OrbitalSpace::Partly;
    parts.sort_by(|a, b| {
        partly(a.0)
            .cmp(&partly(b.0))
            .then(b.2.total_cmp(&a.2))
            .then(a.0.cmp(&b.0))
    });
    let dimension = layout.ranges[atom].len();
    let mut clusters: Vec<Cluster> = Vec::new();
    for part in parts {
        let best = clusters
            .iter()
            .enumerate()
            .map(|(c, cluster)| (c, cluster.members[0].1.dot(&part.1).abs()))
            .max_by(|a, b| a.1.total_cmp(&b.1));
        // A radical's orbital is made of the local orbitals already there (it is the
        // antibonding partner of a bond or lone pair): where a new hybrid would not fit,
        // it joins the most parallel one instead of making the atom over-complete.
        let crowded = partly(part.0) && clusters.len() >= dimension;
        match best {
            Some((c, cosine)) if cosine >= PARALLEL_COSINE || crowded => {
                clusters[c].members.push(part)
            }
            _ => clusters.push(Cluster {
                members: vec![part],
            }),
        }
    }
    clusters
}

/// F = R W Λ^(−½) Wᵀ over the eigenvalues of RᵀR above [`RANK_THRESHOLD`]; returns the
/// columns of F and the rank kept.
fn lowdin_frame(representatives: &[DVector<f64>], dimension: usize) -> (Vec<DVector<f64>>, usize) {
    let k = representatives.len();
    if k == 0 {
        return (Vec::new(), 0);
    }
    let r = DMatrix::from_columns(representatives);
    let eigen = SymmetricEigen::new(r.transpose() * &r);
    let mut inverse_root = DMatrix::zeros(k, k);
    let mut rank = 0;
    for (i, &lambda) in eigen.eigenvalues.iter().enumerate() {
        if lambda >= RANK_THRESHOLD && rank < dimension {
            rank += 1;
            let w = eigen.eigenvectors.column(i);
            inverse_root += w * w.transpose() / lambda.sqrt();
        }
    }
    let frame = r * inverse_root;
    (frame.column_iter().map(|c| c.into_owned()).collect(), rank)
}

/// The kind and partner of a hybrid whose leading part comes from `orbital`.
fn kind_of(
    orbital: &LocalizedOrbital,
    atom: usize,
    units: &[ThreeCentreUnit],
) -> (HybridKind, Option<usize>) {
    if let Some(unit) = orbital.unit.map(|u| &units[u]) {
        let pi = unit.character == BondCharacter::Pi;
        return if unit.atoms[1] == atom {
            (
                if pi {
                    HybridKind::Pi
                } else {
                    HybridKind::Multicentre
                },
                None,
            )
        } else {
            (
                if pi { HybridKind::Pi } else { HybridKind::Bond },
                Some(unit.atoms[1]),
            )
        };
    }
    match orbital.class {
        OrbitalClass::OneCentre if orbital.space == OrbitalSpace::Doubly => {
            (HybridKind::LonePair, None)
        }
        OrbitalClass::OneCentre => (HybridKind::SingleElectron, None),
        OrbitalClass::TwoCentre => {
            let partner = orbital.centres.iter().copied().find(|&a| a != atom);
            let kind = if orbital.character == Some(BondCharacter::Pi) {
                HybridKind::Pi
            } else {
                HybridKind::Bond
            };
            (kind, partner)
        }
        OrbitalClass::MultiCentre => (HybridKind::Multicentre, None),
    }
}

fn make_hybrid(
    kind: HybridKind,
    partner: Option<usize>,
    vector: DVector<f64>,
    kinds: &[AngularKind],
    molecule: &Molecule,
    atom: usize,
) -> AtomHybrid {
    let local: Vec<f64> = vector.iter().copied().collect();
    let shape = read_shape(&local, kinds);
    let bending_degrees = match (kind, partner) {
        (HybridKind::Bond, Some(other)) => bending(&shape, molecule, atom, other),
        _ => None,
    };
    AtomHybrid {
        kind,
        partner,
        share: vector.norm_squared(),
        vector: local,
        orbitals: Vec::new(),
        unit: None,
        shape,
        bending_degrees,
    }
}

/// An orthonormal basis of the complement of `taken` in the atom's space: the parts of
/// the empty one-centre orbitals on the atom first, then its functions, projected and
/// Gram–Schmidt orthonormalized (vectors left with norm below 0.1 skipped).
fn vacant_completion(
    atom: usize,
    taken: &[DVector<f64>],
    orbitals: &[LocalizedOrbital],
    vectors: &DMatrix<f64>,
    layout: &AtomLayout,
) -> Vec<DVector<f64>> {
    let dimension = layout.ranges[atom].len();
    let mut basis: Vec<DVector<f64>> = Vec::new();
    // The span of the (possibly non-orthonormal, over-complete) hybrids.
    for v in taken {
        push_orthonormal(&mut basis, v.clone(), 1e-6);
    }
    let occupied_rank = basis.len();
    let candidates = orbitals
        .iter()
        .enumerate()
        .filter(|(_, o)| o.space == OrbitalSpace::Virtual && o.centres.first() == Some(&atom))
        .map(|(k, _)| DVector::from_vec(part_on(vectors.column(k), layout, atom)))
        .chain(
            (0..dimension).map(|i| DVector::from_fn(dimension, |r, _| f64::from(u8::from(r == i)))),
        );
    for candidate in candidates {
        if basis.len() >= dimension {
            break;
        }
        push_orthonormal(&mut basis, candidate, 0.1);
    }
    basis.split_off(occupied_rank)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reader_gives_sp3_for_a_tetrahedral_hybrid() {
        // (s + √3 p_z)/2: λ = 3, 25 % s (Coulson, Valence, 1952).
        let kinds = [
            AngularKind::S,
            AngularKind::Px,
            AngularKind::Py,
            AngularKind::Pz,
        ];
        let shape = read_shape(&[0.5, 0.0, 0.0, 0.75f64.sqrt()], &kinds);
        assert!((shape.lambda.unwrap() - 3.0).abs() < 1e-12);
        assert!((shape.s_share - 0.25).abs() < 1e-12);
        assert_eq!(shape.direction, [0.0, 0.0, 1.0]);
        // The sign of the s coefficient decides where the hybrid points.
        let flipped = read_shape(&[-0.5, 0.0, 0.0, 0.75f64.sqrt()], &kinds);
        assert_eq!(flipped.direction, [0.0, 0.0, -1.0]);
        assert!(read_shape(&[0.0, 1.0, 0.0, 0.0], &kinds).lambda.is_none());
    }

    #[test]
    fn an_over_complete_set_gives_a_tight_frame() {
        // Six unit vectors ±x, ±y, ±z mixed with s in a 4-dimensional space: rank 4, the
        // frame's outer products add to the identity (so Σ share × s-fraction = 1).
        let mut parts = Vec::new();
        for axis in 1..4 {
            for sign in [1.0, -1.0] {
                let mut v = DVector::zeros(4);
                v[0] = 0.5;
                v[axis] = sign * 0.75f64.sqrt();
                parts.push(v);
            }
        }
        let (frame, rank) = lowdin_frame(&parts, 4);
        assert_eq!(rank, 4);
        let sum: DMatrix<f64> = frame.iter().map(|f| f * f.transpose()).sum();
        assert!((sum - DMatrix::identity(4, 4)).amax() < 1e-10);
    }
}
