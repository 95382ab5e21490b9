//! Reading localized orbitals: how many centres each has, σ or π, bonding or antibonding,
//! and which pairs of occupied orbitals form one three-centre four-electron bond.
//!
//! **Centres.** The fewest atoms, by decreasing Löwdin population, whose populations add
//! to at least [`CENTRE_SHARE`]: one centre is a lone pair (or a singly occupied
//! one-centre orbital), two a bond, three or more a multicentre orbital. Our threshold,
//! stated in the README.
//!
//! **σ or π.** A two-centre orbital is π when the norm-weighted share of its two parts
//! that is p perpendicular to the bond axis exceeds [`PI_PERPENDICULAR_SHARE`] (a node
//! plane containing the axis); a bent bond falls between and takes the larger name.
//!
//! **Bonding or antibonding.** The interaction of the parts on the two centres,
//! 2 Σ_{μ∈A, ν∈B} φ̃_μ H̃_μν φ̃_ν, is negative for a bonding and positive for an antibonding
//! orbital (O2's singly occupied π*).
//!
//! **Three-centre four-electron bonds** (G. C. Pimentel, J. Chem. Phys. 19, 446 (1951)):
//! two doubly occupied two-centre orbitals that share exactly one centre and whose
//! normalized parts there are nearly parallel (|cos| ≥ [`PARALLEL_COSINE`]: they use the
//! same local orbital) — the π systems of CO2, ozone and nitrite, the σ system of FHF⁻.
//! (Orbitals with three or more centres, as benzene's π orbitals, are multicentre bonds of
//! their own; hypervalent σ systems whose parts on the centre differ more, as PF5's axial
//! bonds, show up as over-complete atoms instead.) The threshold is our choice (stated in
//! the README). Each orbital joins at most one unit, best pairs first.

use nalgebra::{DMatrix, DVectorView, Vector3};
use serde::{Deserialize, Serialize};

use super::orthonormal::{AtomLayout, populations};
use crate::chem::ao::AngularKind;
use crate::chem::molecule::Molecule;

/// Atoms holding this share of an orbital are its centres (our choice, no source).
pub const CENTRE_SHARE: f64 = 0.9;
/// A two-centre orbital is π above this perpendicular-p share (our rule, no source).
pub const PI_PERPENDICULAR_SHARE: f64 = 0.5;
/// The two orbitals' parts on the shared atom are parallel to at least this |cos|.
pub const PARALLEL_COSINE: f64 = 0.9;
/// Orbitals on the same two atoms whose populations there agree to this are treated as a
/// degenerate set the localization may have rotated arbitrarily (rounding level of a
/// converged localization; our choice, no source).
const DEGENERATE_POPULATION: f64 = 1e-6;

/// Which block of the canonical occupations an orbital was localized in.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum OrbitalSpace {
    /// Doubly occupied MOs.
    Doubly,
    /// Partly occupied MOs (a radical's singly occupied MO, a partly filled degenerate
    /// set).
    Partly,
    /// Empty valence MOs.
    Virtual,
}

/// How many centres an orbital has.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum OrbitalClass {
    OneCentre,
    TwoCentre,
    MultiCentre,
}

/// σ or π character.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum BondCharacter {
    Sigma,
    Pi,
}

/// One localized orbital, classified.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct LocalizedOrbital {
    pub space: OrbitalSpace,
    /// Σ_j n_j |⟨b|ψ_j⟩|² over the canonical MOs (2, 0, or a partial value).
    pub occupancy: f64,
    /// ⟨b|H̃|b⟩, eV.
    pub energy_ev: f64,
    /// Centres by decreasing population.
    pub centres: Vec<usize>,
    /// Their Löwdin populations.
    pub centre_populations: Vec<f64>,
    pub class: OrbitalClass,
    /// σ or π (two-centre orbitals; members of a 3c–4e unit get the unit's).
    pub character: Option<BondCharacter>,
    /// A two-centre orbital whose parts repel.
    pub antibonding: bool,
    /// The 3c–4e unit it belongs to (index into the units).
    pub unit: Option<usize>,
}

/// Two doubly occupied orbitals forming one three-centre four-electron bond.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ThreeCentreUnit {
    /// Indices of the two localized orbitals.
    pub orbitals: [usize; 2],
    /// Terminal, shared centre, terminal.
    pub atoms: [usize; 3],
    pub character: BondCharacter,
}

/// Classifies one orbital (a column over the orthonormal basis) of energy ⟨b|H̃|b⟩
/// `energy_ev` (computed by the caller, for all orbitals at once).
#[allow(clippy::too_many_arguments)]
pub fn classify_orbital(
    orbital: DVectorView<'_, f64>,
    space: OrbitalSpace,
    occupancy: f64,
    energy_ev: f64,
    layout: &AtomLayout,
    hamiltonian: &DMatrix<f64>,
    molecule: &Molecule,
) -> LocalizedOrbital {
    let all = populations(orbital, layout);
    let centres = centres_of(&all);
    let class = match centres.len() {
        0 | 1 => OrbitalClass::OneCentre,
        2 => OrbitalClass::TwoCentre,
        _ => OrbitalClass::MultiCentre,
    };
    let (character, antibonding) = if class == OrbitalClass::TwoCentre {
        let (a, b) = (centres[0], centres[1]);
        (
            Some(character_of(orbital, layout, molecule, a, b)),
            interaction(orbital, layout, hamiltonian, a, b) > 0.0,
        )
    } else {
        (None, false)
    };
    LocalizedOrbital {
        space,
        occupancy,
        energy_ev,
        centre_populations: centres.iter().map(|&a| all[a]).collect(),
        centres,
        class,
        character,
        antibonding,
        unit: None,
    }
}

/// The fewest atoms, by decreasing population, reaching [`CENTRE_SHARE`] of the total.
fn centres_of(populations: &[f64]) -> Vec<usize> {
    let total: f64 = populations.iter().sum();
    let mut order: Vec<usize> = (0..populations.len()).collect();
    order.sort_by(|&a, &b| populations[b].total_cmp(&populations[a]).then(a.cmp(&b)));
    let mut sum = 0.0;
    let mut centres = Vec::new();
    for atom in order {
        centres.push(atom);
        sum += populations[atom];
        if sum >= CENTRE_SHARE * total {
            break;
        }
    }
    centres
}

/// The part of `orbital` on `atom` (its coefficients on the atom's functions).
pub fn part_on(orbital: DVectorView<'_, f64>, layout: &AtomLayout, atom: usize) -> Vec<f64> {
    layout.ranges[atom].clone().map(|mu| orbital[mu]).collect()
}

/// The p vector of a part (x, y, z components).
pub fn p_vector(part: &[f64], kinds: &[AngularKind]) -> Vector3<f64> {
    let mut p = Vector3::zeros();
    for (&c, &kind) in part.iter().zip(kinds) {
        match kind {
            AngularKind::Px => p.x += c,
            AngularKind::Py => p.y += c,
            AngularKind::Pz => p.z += c,
            _ => {}
        }
    }
    p
}

fn character_of(
    orbital: DVectorView<'_, f64>,
    layout: &AtomLayout,
    molecule: &Molecule,
    a: usize,
    b: usize,
) -> BondCharacter {
    let axis = molecule.atoms[b].position - molecule.atoms[a].position;
    if axis.norm() < 1e-8 {
        return BondCharacter::Sigma;
    }
    let axis = axis.normalize();
    let (mut perpendicular, mut total) = (0.0, 0.0);
    for atom in [a, b] {
        let part = part_on(orbital, layout, atom);
        let kinds = &layout.kinds[layout.ranges[atom].clone()];
        let p = p_vector(&part, kinds);
        perpendicular += (p - axis * p.dot(&axis)).norm_squared();
        total += part.iter().map(|c| c * c).sum::<f64>();
    }
    if total > 0.0 && perpendicular / total > PI_PERPENDICULAR_SHARE {
        BondCharacter::Pi
    } else {
        BondCharacter::Sigma
    }
}

/// 2 Σ_{μ∈A, ν∈B} φ̃_μ H̃_μν φ̃_ν.
fn interaction(
    orbital: DVectorView<'_, f64>,
    layout: &AtomLayout,
    hamiltonian: &DMatrix<f64>,
    a: usize,
    b: usize,
) -> f64 {
    let mut total = 0.0;
    for mu in layout.ranges[a].clone() {
        for nu in layout.ranges[b].clone() {
            total += orbital[mu] * hamiltonian[(mu, nu)] * orbital[nu];
        }
    }
    2.0 * total
}

/// Rotates, within each group of doubly occupied two-centre orbitals on the same pair of
/// atoms with equal populations there (a degenerate set), the orbitals so that their parts
/// on a shared atom line up with those of another group (the singular vectors of the matrix of part overlaps). The groups of a linear
/// molecule's π pairs (CO2) may be rotated arbitrarily by the localization, which leaves
/// the function unchanged; this makes the two O's π orbitals share one C p orbital each
/// before the 3c–4e search. Only groups that then meet [`PARALLEL_COSINE`] are rotated,
/// each group at most once. Returns the orbitals changed (to be classified again).
pub fn align_shared_centres(
    orbitals: &[LocalizedOrbital],
    vectors: &mut DMatrix<f64>,
    layout: &AtomLayout,
) -> Vec<usize> {
    let mut touched: Vec<bool> = vec![false; orbitals.len()];
    let mut rotated = Vec::new();
    for atom in 0..layout.atoms() {
        let groups = groups_at(orbitals, atom);
        for (a, first) in groups.iter().enumerate() {
            for second in groups.iter().skip(a + 1) {
                if first.len() + second.len() < 3 || first.iter().chain(second).any(|&k| touched[k])
                {
                    continue;
                }
                if let Some(changes) = aligned(vectors, layout, atom, first, second) {
                    for (k, vector) in changes {
                        vectors.set_column(k, &vector);
                        touched[k] = true;
                        rotated.push(k);
                    }
                }
            }
        }
    }
    rotated
}

/// The doubly occupied two-centre orbitals with `atom` as a centre, grouped by the other.
fn groups_at(orbitals: &[LocalizedOrbital], atom: usize) -> Vec<Vec<usize>> {
    let mut groups: Vec<(usize, Vec<usize>)> = Vec::new();
    for (k, orbital) in orbitals.iter().enumerate() {
        if orbital.space != OrbitalSpace::Doubly
            || orbital.class != OrbitalClass::TwoCentre
            || !orbital.centres.contains(&atom)
        {
            continue;
        }
        let Some(other) = orbital.centres.iter().copied().find(|&x| x != atom) else {
            continue;
        };
        // Only orbitals the localization could have rotated into each other (the same
        // populations on the same atoms, as a linear molecule's π pair) are one group.
        let same = |list: &Vec<usize>| {
            let first = &orbitals[list[0]];
            first.centres == orbital.centres
                && first
                    .centre_populations
                    .iter()
                    .zip(&orbital.centre_populations)
                    .all(|(a, b)| (a - b).abs() < DEGENERATE_POPULATION)
        };
        match groups
            .iter_mut()
            .find(|(x, list)| *x == other && same(list))
        {
            Some((_, list)) => list.push(k),
            None => groups.push((other, vec![k])),
        }
    }
    groups.into_iter().map(|(_, list)| list).collect()
}

/// The rotated orbitals of two groups when a singular pair of their parts on `atom` is
/// parallel to [`PARALLEL_COSINE`]; None otherwise.
fn aligned(
    vectors: &DMatrix<f64>,
    layout: &AtomLayout,
    atom: usize,
    first: &[usize],
    second: &[usize],
) -> Option<Vec<(usize, nalgebra::DVector<f64>)>> {
    let parts = |group: &[usize]| {
        let rows: Vec<Vec<f64>> = group
            .iter()
            .map(|&k| part_on(vectors.column(k), layout, atom))
            .collect();
        DMatrix::from_fn(rows.len(), rows[0].len(), |i, j| rows[i][j])
    };
    let (p1, p2) = (parts(first), parts(second));
    let svd = (&p1 * p2.transpose()).svd(true, true);
    let (u, v_t) = (svd.u?, svd.v_t?);
    let parallel = (0..svd.singular_values.len()).any(|i| {
        let (a, b) = (u.column(i).transpose() * &p1, v_t.row(i) * &p2);
        svd.singular_values[i] / (a.norm() * b.norm()).max(1e-300) >= PARALLEL_COSINE
    });
    if !parallel {
        return None;
    }
    let mut out = Vec::new();
    for (group, basis) in [
        (first, completed(&u)),
        (second, completed(&v_t.transpose())),
    ] {
        for (i, &k) in group.iter().enumerate() {
            let mut vector = nalgebra::DVector::zeros(vectors.nrows());
            for (j, &source) in group.iter().enumerate() {
                vector += vectors.column(source) * basis[(j, i)];
            }
            out.push((k, vector));
        }
    }
    Some(out)
}

/// An orthonormal k × k basis whose first columns are the orthonormal columns of `m`.
fn completed(m: &DMatrix<f64>) -> DMatrix<f64> {
    let columns = m.column_iter().map(|c| c.into_owned()).collect();
    super::orthonormal::completed_basis(columns, m.nrows())
        .unwrap_or_else(|| DMatrix::identity(m.nrows(), m.nrows()))
}

/// Finds the 3c–4e units among the doubly occupied orbitals (columns of `vectors`, in the
/// order of `orbitals`), marks their members and returns them.
pub fn three_centre_units(
    orbitals: &mut [LocalizedOrbital],
    vectors: &DMatrix<f64>,
    layout: &AtomLayout,
    molecule: &Molecule,
) -> Vec<ThreeCentreUnit> {
    let mut candidates: Vec<(f64, usize, usize, usize)> = Vec::new();
    let eligible: Vec<usize> = (0..orbitals.len())
        .filter(|&k| {
            orbitals[k].space == OrbitalSpace::Doubly
                && orbitals[k].class == OrbitalClass::TwoCentre
        })
        .collect();
    for (x, &i) in eligible.iter().enumerate() {
        for &j in eligible.iter().skip(x + 1) {
            let Some((atom, _, _)) = shared_centre(&orbitals[i], &orbitals[j]) else {
                continue;
            };
            let (pi, pj) = (
                part_on(vectors.column(i), layout, atom),
                part_on(vectors.column(j), layout, atom),
            );
            let norm = |v: &[f64]| v.iter().map(|c| c * c).sum::<f64>().sqrt();
            let dot: f64 = pi.iter().zip(&pj).map(|(a, b)| a * b).sum();
            let cosine = dot.abs() / (norm(&pi) * norm(&pj)).max(1e-300);
            if cosine >= PARALLEL_COSINE {
                candidates.push((cosine, i, j, atom));
            }
        }
    }
    candidates.sort_by(|a, b| b.0.total_cmp(&a.0).then((a.1, a.2).cmp(&(b.1, b.2))));
    let mut units = Vec::new();
    for (_, i, j, atom) in candidates {
        if orbitals[i].unit.is_some() || orbitals[j].unit.is_some() {
            continue;
        }
        let other = |k: usize| orbitals[k].centres.iter().copied().find(|&a| a != atom);
        let (Some(first), Some(second)) = (other(i), other(j)) else {
            continue;
        };
        let character = unit_character(vectors, layout, molecule, [i, j], [first, atom, second]);
        for k in [i, j] {
            orbitals[k].unit = Some(units.len());
            orbitals[k].character = Some(character);
        }
        units.push(ThreeCentreUnit {
            orbitals: [i, j],
            atoms: [first, atom, second],
            character,
        });
    }
    units
}

/// The centre two two-centre orbitals share, with their other centres, when they share
/// exactly one.
fn shared_centre(a: &LocalizedOrbital, b: &LocalizedOrbital) -> Option<(usize, usize, usize)> {
    let shared: Vec<usize> = a
        .centres
        .iter()
        .copied()
        .filter(|x| b.centres.contains(x))
        .collect();
    let [atom] = shared[..] else {
        return None;
    };
    let other = |o: &LocalizedOrbital| o.centres.iter().copied().find(|&x| x != atom);
    Some((atom, other(a)?, other(b)?))
}

/// π when the shared centre's part is mostly p perpendicular to the plane of the three
/// atoms (a bent unit: ozone's π, not the in-plane lone pairs of NO2 leaning on N), or,
/// for a linear unit (CO2), when both orbitals are π toward their terminal atom.
fn unit_character(
    vectors: &DMatrix<f64>,
    layout: &AtomLayout,
    molecule: &Molecule,
    orbitals: [usize; 2],
    atoms: [usize; 3],
) -> BondCharacter {
    let position = |a: usize| molecule.atoms[a].position;
    let normal =
        (position(atoms[0]) - position(atoms[1])).cross(&(position(atoms[2]) - position(atoms[1])));
    if normal.norm() < 1e-3 {
        let pi = |k: usize, terminal: usize| {
            character_of(vectors.column(k), layout, molecule, terminal, atoms[1])
                == BondCharacter::Pi
        };
        return if pi(orbitals[0], atoms[0]) && pi(orbitals[1], atoms[2]) {
            BondCharacter::Pi
        } else {
            BondCharacter::Sigma
        };
    }
    let normal = normal.normalize();
    let part = part_on(vectors.column(orbitals[0]), layout, atoms[1]);
    let kinds = &layout.kinds[layout.ranges[atoms[1]].clone()];
    let along = p_vector(&part, kinds).dot(&normal).powi(2);
    let total: f64 = part.iter().map(|c| c * c).sum();
    if total > 0.0 && along / total > PI_PERPENDICULAR_SHARE {
        BondCharacter::Pi
    } else {
        BondCharacter::Sigma
    }
}
