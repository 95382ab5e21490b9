//! The localized ladder: the levels of the localized picture, built from the hybrids.
//!
//! The hybrids of all atoms, in the orthonormal basis, are one orthonormal set spanning
//! the whole valence space (hybrids of different atoms are orthogonal because the atoms'
//! orthonormalized functions are). Hybrids joined by a localized orbital form one *unit*
//! (connected components: the two hybrids of a bond; the three of a 3c–4e bond or of
//! diborane's B–H–B; every function of an over-complete atom with all the hybrids its
//! orbitals reach); the levels of a unit are the eigenvectors of H̃ in its hybrids — the
//! 2×2 problem of a two-centre bond (σ below, σ* above: the textbook bond-orbital
//! construction, Coulson, *Valence*, 1952), the n×n problem of a multicentre unit (our
//! choice, stated in the README), and for a lone pair, a radical's orbital or a vacant
//! orbital its atomic energy Σ_μ h_μ² α_μ, (α_s + λ α_p)/(1 + λ) for an sp^λ hybrid (the
//! textbook hybrid energy; Löwdin's ⟨h|H̃|h⟩ is not an atomic energy in extended Hückel's
//! strongly overlapping basis, see [`super::switch`]). So the levels are one orthonormal basis of the valence space: their
//! occupancies in the canonical density add up to the electron count, and the weights
//! between them and the canonical MOs add to 1 both ways.
//!
//! Each unit holds the electrons of its localized orbitals in the Lewis picture
//! (`lewis_occupancy`, filled from the bottom). Names: σ/σ*, π/π*, n (lone pair), n•
//! (less than two electrons), v (vacant); multicentre units π/πnb/π* (a π 3c–4e bond),
//! σ/σnb/σ* (a σ one), otherwise kc/kc* with k the number of atoms.

use nalgebra::{DMatrix, DVector, SymmetricEigen};
use serde::{Deserialize, Serialize};

use super::classify::{BondCharacter, LocalizedOrbital, ThreeCentreUnit};
use super::hybrids::AtomHybrids;
use super::orthonormal::AtomLayout;
use crate::chem::molecule::Molecule;

/// What a level of the localized ladder is.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum LocalizedKind {
    Bond,
    Antibond,
    Pi,
    PiStar,
    LonePair,
    /// A one-centre level with less than two electrons (a radical's).
    SingleElectron,
    Vacant,
    /// A bonding multicentre level (3c–2e, the bonding level of a 3c–4e bond).
    Multicentre,
    /// The middle, nonbonding level of a 3c–4e bond.
    MulticentreNonbonding,
    /// An empty multicentre level.
    MulticentreAntibond,
}

impl LocalizedKind {
    /// The JSON name (the serde name).
    pub fn as_str(self) -> &'static str {
        match self {
            LocalizedKind::Bond => "bond",
            LocalizedKind::Antibond => "antibond",
            LocalizedKind::Pi => "pi",
            LocalizedKind::PiStar => "pi_star",
            LocalizedKind::LonePair => "lone_pair",
            LocalizedKind::SingleElectron => "single_electron",
            LocalizedKind::Vacant => "vacant",
            LocalizedKind::Multicentre => "multicentre",
            LocalizedKind::MulticentreNonbonding => "multicentre_nonbonding",
            LocalizedKind::MulticentreAntibond => "multicentre_antibond",
        }
    }
}

/// One level of the ladder.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LadderLevel {
    pub kind: LocalizedKind,
    /// "σ(N–H)", "n(N)", "3c(B–H–B)".
    pub label: String,
    pub atoms: Vec<usize>,
    /// The unit's eigenvalue of H̃ (the atomic energy for a one-centre level), eV.
    pub energy_ev: f64,
    /// Electrons the Lewis structure puts here (2, 1, 0 or a share of an open shell).
    pub lewis_occupancy: f64,
    /// The unit the level belongs to.
    pub unit: usize,
}

/// The ladder: levels ascending in energy and their vectors over the orthonormal basis.
#[derive(Clone, Debug, PartialEq)]
pub struct Ladder {
    pub levels: Vec<LadderLevel>,
    pub vectors: DMatrix<f64>,
}

/// One basis vector of a unit: local coefficients on one atom.
struct Piece {
    atom: usize,
    local: Vec<f64>,
}

/// Builds the ladder from the atoms' hybrids (see the module doc).
pub fn build(
    hybrids: &[AtomHybrids],
    orbitals: &[LocalizedOrbital],
    units: &[ThreeCentreUnit],
    layout: &AtomLayout,
    hamiltonian: &DMatrix<f64>,
    atomic: &[f64],
    molecule: &Molecule,
) -> Ladder {
    let (pieces, groups) = unit_pieces(hybrids, orbitals, layout);
    let mut levels = Vec::new();
    let mut columns: Vec<DVector<f64>> = Vec::new();
    for (unit, (members, lo_members)) in groups.iter().enumerate() {
        let unit_pieces: Vec<&Piece> = members.iter().map(|&p| &pieces[p]).collect();
        let electrons =
            super::lewis::rounded(lo_members.iter().map(|&k| orbitals[k].occupancy).sum());
        let naming = Naming::of(&unit_pieces, lo_members, orbitals, units, hybrids, molecule);
        let (mut energies, coefficients) = solve_unit(&unit_pieces, hamiltonian, layout);
        if let ([piece], [energy], [vector]) =
            (&unit_pieces[..], &mut energies[..], &coefficients[..])
        {
            // A one-centre level (lone pair, radical, vacant orbital) at its atomic energy.
            *energy = super::held::atomic_energy(&dense(&[*piece], vector, layout), atomic);
        }
        let mut remaining = electrons;
        for (rank, (&energy, vector)) in energies.iter().zip(&coefficients).enumerate() {
            // `electrons` is rounded at 1e-9 above, so no rounding residue (1e-15) is left to
            // draw an empty level as occupied.
            let lewis_occupancy = remaining.clamp(0.0, 2.0);
            remaining -= lewis_occupancy;
            let (kind, label) = naming.level(rank, energies.len(), lewis_occupancy);
            levels.push(LadderLevel {
                kind,
                label,
                atoms: naming.atoms.clone(),
                energy_ev: energy,
                lewis_occupancy,
                unit,
            });
            columns.push(dense(&unit_pieces, vector, layout));
        }
    }
    let mut order: Vec<usize> = (0..levels.len()).collect();
    order.sort_by(|&a, &b| {
        levels[a]
            .energy_ev
            .total_cmp(&levels[b].energy_ev)
            .then(levels[a].unit.cmp(&levels[b].unit))
    });
    let vectors = if columns.is_empty() {
        DMatrix::zeros(layout.functions(), 0)
    } else {
        DMatrix::from_columns(
            &order
                .iter()
                .map(|&k| columns[k].clone())
                .collect::<Vec<_>>(),
        )
    };
    let levels = order.iter().map(|&k| levels[k].clone()).collect();
    Ladder { levels, vectors }
}

/// The pieces (hybrids, or the functions of over-complete atoms) and, per unit, its
/// pieces and localized orbitals.
#[allow(clippy::type_complexity)]
fn unit_pieces(
    hybrids: &[AtomHybrids],
    orbitals: &[LocalizedOrbital],
    layout: &AtomLayout,
) -> (Vec<Piece>, Vec<(Vec<usize>, Vec<usize>)>) {
    let mut pieces = Vec::new();
    // For each localized orbital, the pieces it reaches.
    let mut reach: Vec<Vec<usize>> = vec![Vec::new(); orbitals.len()];
    let mut joined: Vec<Vec<usize>> = Vec::new();
    for atom_hybrids in hybrids {
        let atom = atom_hybrids.atom;
        let first = pieces.len();
        if atom_hybrids.over_complete {
            let size = layout.ranges[atom].len();
            for i in 0..size {
                let local = (0..size).map(|r| f64::from(u8::from(r == i))).collect();
                pieces.push(Piece { atom, local });
            }
            joined.push((first..pieces.len()).collect());
            for hybrid in &atom_hybrids.hybrids {
                for &k in &hybrid.orbitals {
                    reach[k].push(first);
                }
            }
        } else {
            for hybrid in &atom_hybrids.hybrids {
                for &k in &hybrid.orbitals {
                    reach[k].push(pieces.len());
                }
                pieces.push(Piece {
                    atom,
                    local: hybrid.vector.clone(),
                });
            }
        }
    }
    let mut sets = DisjointSets::new(pieces.len());
    for group in joined.iter().chain(reach.iter()) {
        for pair in group.windows(2) {
            sets.union(pair[0], pair[1]);
        }
    }
    let mut groups: Vec<(Vec<usize>, Vec<usize>)> = Vec::new();
    let mut group_of_root = std::collections::HashMap::new();
    for piece in 0..pieces.len() {
        let root = sets.find(piece);
        let index = *group_of_root.entry(root).or_insert_with(|| {
            groups.push((Vec::new(), Vec::new()));
            groups.len() - 1
        });
        groups[index].0.push(piece);
    }
    for (k, pieces_reached) in reach.iter().enumerate() {
        if let Some(&piece) = pieces_reached.first() {
            let index = group_of_root[&sets.find(piece)];
            groups[index].1.push(k);
        }
    }
    (pieces, groups)
}

/// Eigenvalues (ascending) and eigenvectors of H̃ within the unit's pieces.
fn solve_unit(
    pieces: &[&Piece],
    hamiltonian: &DMatrix<f64>,
    layout: &AtomLayout,
) -> (Vec<f64>, Vec<DVector<f64>>) {
    let n = pieces.len();
    let m = DMatrix::from_fn(n, n, |a, b| {
        let (pa, pb) = (pieces[a], pieces[b]);
        let (ra, rb) = (&layout.ranges[pa.atom], &layout.ranges[pb.atom]);
        let mut total = 0.0;
        for (i, &ca) in pa.local.iter().enumerate() {
            for (j, &cb) in pb.local.iter().enumerate() {
                total += ca * hamiltonian[(ra.start + i, rb.start + j)] * cb;
            }
        }
        total
    });
    let eigen = SymmetricEigen::new(m);
    let mut order: Vec<usize> = (0..n).collect();
    order.sort_by(|&a, &b| eigen.eigenvalues[a].total_cmp(&eigen.eigenvalues[b]));
    let energies = order.iter().map(|&k| eigen.eigenvalues[k]).collect();
    let vectors = order
        .iter()
        .map(|&k| {
            let v = eigen.eigenvectors.column(k).into_owned();
            // Sign: the largest component positive (deterministic output).
            if v[v.iamax()] < 0.0 { -v } else { v }
        })
        .collect();
    (energies, vectors)
}

fn dense(pieces: &[&Piece], coefficients: &DVector<f64>, layout: &AtomLayout) -> DVector<f64> {
    let mut out = DVector::zeros(layout.functions());
    for (piece, &c) in pieces.iter().zip(coefficients.iter()) {
        let start = layout.ranges[piece.atom].start;
        for (i, &v) in piece.local.iter().enumerate() {
            out[start + i] += c * v;
        }
    }
    out
}

/// How the levels of one unit are named.
struct Naming {
    atoms: Vec<usize>,
    /// The atoms as written in labels: "N–H", "O–C–O", "SF6".
    written: String,
    /// One-centre, two-centre or multicentre, with the prefix of multicentre labels.
    shape: UnitShape,
}

enum UnitShape {
    OneCentre,
    TwoCentre(BondCharacter),
    /// The prefix ("π", "σ", "3c") and whether it is a 3c–4e bond.
    Multicentre(String, bool),
}

impl Naming {
    fn of(
        pieces: &[&Piece],
        lo_members: &[usize],
        orbitals: &[LocalizedOrbital],
        units: &[ThreeCentreUnit],
        hybrids: &[AtomHybrids],
        molecule: &Molecule,
    ) -> Naming {
        let mut atoms: Vec<usize> = pieces.iter().map(|p| p.atom).collect();
        atoms.sort_unstable();
        atoms.dedup();
        let unit = lo_members
            .iter()
            .find_map(|&k| orbitals[k].unit)
            .map(|u| &units[u]);
        let pi = !lo_members.is_empty()
            && lo_members
                .iter()
                .all(|&k| orbitals[k].character == Some(BondCharacter::Pi));
        let shape = if pieces.len() == 1 {
            UnitShape::OneCentre
        } else if pieces.len() == 2 && atoms.len() == 2 {
            UnitShape::TwoCentre(if pi {
                BondCharacter::Pi
            } else {
                BondCharacter::Sigma
            })
        } else {
            let three_centre = unit.is_some() && atoms.len() == 3 && pieces.len() == 3;
            let prefix = match unit {
                Some(u) if three_centre && u.character == BondCharacter::Pi => "π".to_string(),
                Some(_) if three_centre => "σ".to_string(),
                _ => format!("{}c", atoms.len()),
            };
            UnitShape::Multicentre(prefix, three_centre)
        };
        let over_complete: Vec<usize> = hybrids
            .iter()
            .filter(|h| h.over_complete && atoms.contains(&h.atom))
            .map(|h| h.atom)
            .collect();
        let written = written_atoms(&atoms, unit, &over_complete, molecule);
        Naming {
            atoms,
            written,
            shape,
        }
    }

    /// Kind and label of level `rank` of `count`, holding `lewis` electrons.
    fn level(&self, rank: usize, count: usize, lewis: f64) -> (LocalizedKind, String) {
        let w = &self.written;
        match &self.shape {
            UnitShape::OneCentre => {
                if lewis >= 1.5 {
                    (LocalizedKind::LonePair, format!("n({w})"))
                } else if lewis > 1e-9 {
                    (LocalizedKind::SingleElectron, format!("n•({w})"))
                } else {
                    (LocalizedKind::Vacant, format!("v({w})"))
                }
            }
            UnitShape::TwoCentre(character) => {
                let pi = *character == BondCharacter::Pi;
                match (rank, pi) {
                    (0, false) => (LocalizedKind::Bond, format!("σ({w})")),
                    (0, true) => (LocalizedKind::Pi, format!("π({w})")),
                    (_, false) => (LocalizedKind::Antibond, format!("σ*({w})")),
                    (_, true) => (LocalizedKind::PiStar, format!("π*({w})")),
                }
            }
            UnitShape::Multicentre(prefix, true) if count == 3 => match rank {
                // A 3c–4e unit: bonding, nonbonding, antibonding by construction.
                0 => (LocalizedKind::Multicentre, format!("{prefix}({w})")),
                1 => (
                    LocalizedKind::MulticentreNonbonding,
                    format!("{prefix}nb({w})"),
                ),
                _ => (
                    LocalizedKind::MulticentreAntibond,
                    format!("{prefix}*({w})"),
                ),
            },
            UnitShape::Multicentre(prefix, _) => {
                if lewis > 1e-9 {
                    (LocalizedKind::Multicentre, format!("{prefix}({w})"))
                } else {
                    (
                        LocalizedKind::MulticentreAntibond,
                        format!("{prefix}*({w})"),
                    )
                }
            }
        }
    }
}

/// Atoms as written in a label: two atoms non-hydrogen first; three in chain order (the
/// 3c–4e centre, or the atom nearest the other two, in the middle); more as a formula
/// led by an over-complete atom.
fn written_atoms(
    atoms: &[usize],
    unit: Option<&ThreeCentreUnit>,
    over_complete: &[usize],
    molecule: &Molecule,
) -> String {
    let symbol = |a: usize| molecule.atoms[a].element.symbol();
    let is_h = |a: usize| molecule.atoms[a].element.atomic_number() == 1;
    let join = |list: &[usize]| {
        list.iter()
            .map(|&a| symbol(a))
            .collect::<Vec<_>>()
            .join("–")
    };
    match atoms.len() {
        0 => "?".into(),
        1 => symbol(atoms[0]).into(),
        2 => {
            let mut pair = atoms.to_vec();
            pair.sort_by_key(|&a| (is_h(a), a));
            join(&pair)
        }
        3 => match unit.map(|u| u.atoms[1]).filter(|m| atoms.contains(m)) {
            Some(middle) => {
                let mut ends: Vec<usize> = atoms.iter().copied().filter(|&a| a != middle).collect();
                ends.sort_by_key(|&a| (is_h(a), a));
                join(&[ends[0], middle, ends[1]])
            }
            None => join(&chain_order(atoms, molecule)),
        },
        _ => {
            let mut counts: Vec<(&str, usize)> = Vec::new();
            let lead = over_complete.first().copied();
            let mut ordered: Vec<usize> = lead.into_iter().collect();
            ordered.extend(atoms.iter().copied().filter(|&a| Some(a) != lead));
            for a in ordered {
                match counts.iter_mut().find(|(s, _)| *s == symbol(a)) {
                    Some((_, n)) => *n += 1,
                    None => counts.push((symbol(a), 1)),
                }
            }
            counts
                .iter()
                .map(|(s, n)| {
                    if *n > 1 {
                        format!("{s}{n}")
                    } else {
                        (*s).to_string()
                    }
                })
                .collect()
        }
    }
}

/// Three atoms in chain order (the one nearest the other two in the middle, the ends
/// non-hydrogen first); other counts as given.
pub fn chain_order(atoms: &[usize], molecule: &Molecule) -> Vec<usize> {
    if atoms.len() != 3 {
        return atoms.to_vec();
    }
    let distance =
        |a: usize, b: usize| (molecule.atoms[a].position - molecule.atoms[b].position).norm();
    let spread = |a: usize| atoms.iter().map(|&o| distance(a, o)).sum::<f64>();
    let middle = *atoms
        .iter()
        .min_by(|&&a, &&b| spread(a).total_cmp(&spread(b)).then(a.cmp(&b)))
        .unwrap_or(&atoms[1]);
    let is_h = |a: usize| molecule.atoms[a].element.atomic_number() == 1;
    let mut ends: Vec<usize> = atoms.iter().copied().filter(|&a| a != middle).collect();
    ends.sort_by_key(|&a| (is_h(a), a));
    vec![ends[0], middle, ends[1]]
}

/// Union–find over the pieces.
struct DisjointSets {
    parent: Vec<usize>,
}

impl DisjointSets {
    fn new(n: usize) -> Self {
        DisjointSets {
            parent: (0..n).collect(),
        }
    }

    fn find(&mut self, mut x: usize) -> usize {
        while self.parent[x] != x {
            self.parent[x] = self.parent[self.parent[x]];
            x = self.parent[x];
        }
        x
    }

    fn union(&mut self, a: usize, b: usize) {
        let (ra, rb) = (self.find(a), self.find(b));
        if ra != rb {
            self.parent[ra.max(rb)] = ra.min(rb);
        }
    }
}
