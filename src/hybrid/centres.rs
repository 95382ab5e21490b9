//! Hybridization centres from the Lewis structure: σ partners from the bond list, π bonds
//! from the bond orders (Σ (order − 1)), lone pairs from the electron count
//! (valence electrons − Σ bond orders − formal charge, halved) and the steric number
//! (σ partners + lone pairs), the usual valence-bond bookkeeping (Coulson, *Valence*,
//! 1952, ch. VIII; common practice, no source for the formal-charge heuristic below).
//!
//! A centre needs at most the four s,p orbitals of its valence shell. More (PF5, SF6) is
//! reported as a hypervalent centre that s,p hybrids cannot describe; a negative lone-pair
//! count is an impossible assignment. Both name the atom and skip only that centre.
//!
//! This module also fixes the directions of the p orbitals used by π bonds: perpendicular
//! to the bond axis and, where the σ framework of either end (or of a neighbour) defines a
//! plane, perpendicular to that plane, so that the two ends of a π bond use parallel p
//! orbitals and the π bonds of one centre are mutually orthogonal.

use nalgebra::{Matrix3, Vector3};

use super::{HybridError, HybridSettings};
use crate::chem::molecule::{Molecule, any_perpendicular};

/// The Lewis-structure description of one centre.
#[derive(Clone, Debug, PartialEq)]
pub struct CentreSpec {
    pub atom: usize,
    /// σ partners (atom indices), ascending.
    pub sigma_partners: Vec<usize>,
    /// π orbitals: (partner, global p direction), one per π bond.
    pub pi: Vec<(usize, Vector3<f64>)>,
    /// Doubly occupied lone pairs.
    pub lone_pairs: usize,
    /// One more lone-pair orbital holds a single electron (a radical centre).
    pub single_electron: bool,
    /// Formal charge used in the count (override, automatic or 0).
    pub formal_charge: i32,
}

impl CentreSpec {
    /// σ partners + lone-pair orbitals (the singly occupied one included).
    pub fn steric_number(&self) -> usize {
        self.sigma_partners.len() + self.lone_pair_orbitals()
    }

    /// Lone-pair orbitals, the singly occupied one included.
    pub fn lone_pair_orbitals(&self) -> usize {
        self.lone_pairs + usize::from(self.single_electron)
    }
}

/// Classification of every atom.
#[derive(Clone, Debug, Default)]
pub struct Classification {
    /// Centres that s,p hybrids can describe, ascending by atom.
    pub centres: Vec<CentreSpec>,
    /// Atoms that have valence p orbitals but were skipped (with the reason in `errors`).
    pub skipped: Vec<usize>,
    pub errors: Vec<HybridError>,
    pub notes: Vec<String>,
}

/// Nonbonding electron count of `atom` for formal charge `charge`.
fn nonbonding(molecule: &Molecule, atom: usize, charge: i32) -> i32 {
    let valence = i32::from(molecule.atoms[atom].element.valence_electrons());
    let bonded: i32 = molecule
        .bonds
        .iter()
        .filter(|bond| bond.other(atom).is_some())
        .map(|bond| i32::from(bond.order))
        .sum();
    valence - bonded - charge
}

/// Formal charges: the user's overrides, then the rest of the molecular charge placed on
/// atoms whose count is otherwise impossible (negative) or odd, in atom order (NH4+ puts
/// +1 on N, BH4− puts −1 on B, acetate puts −1 on an O). Hydrogen never takes one.
fn formal_charges(
    molecule: &Molecule,
    settings: &HybridSettings,
    notes: &mut Vec<String>,
) -> Vec<i32> {
    let mut charges = vec![0; molecule.atoms.len()];
    for (&atom, &charge) in &settings.formal_charges {
        if let Some(slot) = charges.get_mut(atom) {
            *slot = charge;
        } else {
            notes.push(format!(
                "formal-charge override for atom {atom} ignored: the molecule has {} atoms",
                molecule.atoms.len()
            ));
        }
    }
    let free = |atom: usize| {
        !settings.formal_charges.contains_key(&atom)
            && !settings.lone_pair_overrides.contains_key(&atom)
            && molecule.atoms[atom].element.atomic_number() > 2
    };
    // Charge-separated pairs first: two bonded atoms whose counts are both impossible
    // (odd or negative) take +1 and −1 when that leaves both with an even, non-negative
    // count that fits four orbitals (S+–O− in DMSO, P+–O− in phosphoric acid, N+–B− in
    // ammonia borane); if both signs fit, the more electronegative atom takes −1.
    let bad = |n: i32| n < 0 || n.rem_euclid(2) == 1;
    for bond in &molecule.bonds {
        let (a, b) = (bond.a, bond.b);
        if a >= charges.len() || b >= charges.len() || a == b {
            continue;
        }
        if !free(a) || !free(b) || charges[a] != 0 || charges[b] != 0 {
            continue;
        }
        let (na, nb) = (nonbonding(molecule, a, 0), nonbonding(molecule, b, 0));
        if !bad(na) || !bad(nb) {
            continue;
        }
        let fits = |atom: usize, n: i32| {
            let orbitals = molecule
                .bonds
                .iter()
                .filter(|bond| bond.other(atom).is_some())
                .map(|bond| i32::from(bond.order))
                .sum::<i32>()
                + n / 2;
            n >= 0 && n % 2 == 0 && orbitals <= 4
        };
        let plus_a = fits(a, na - 1) && fits(b, nb + 1);
        let minus_a = fits(a, na + 1) && fits(b, nb - 1);
        let a_takes = match (plus_a, minus_a) {
            (true, true) => {
                if electronegativity(molecule, a) > electronegativity(molecule, b) {
                    -1
                } else {
                    1
                }
            }
            (true, false) => 1,
            (false, true) => -1,
            (false, false) => continue,
        };
        charges[a] = a_takes;
        charges[b] = -a_takes;
        notes.push(format!(
            "formal charges {:+} on atom {a} ({}) and {:+} on atom {b} ({}) complete the Lewis structure",
            a_takes,
            molecule.atoms[a].element.symbol(),
            -a_takes,
            molecule.atoms[b].element.symbol()
        ));
    }
    let assigned: i32 = charges.iter().sum();
    let mut remaining = molecule.charge - assigned;
    // First pass: counts that are negative; second: odd counts.
    for pass in 0..2 {
        #[allow(clippy::needless_range_loop)]
        for atom in 0..molecule.atoms.len() {
            if remaining == 0 {
                break;
            }
            if !free(atom) || charges[atom] != 0 {
                continue;
            }
            let n = nonbonding(molecule, atom, 0);
            let step = remaining.signum();
            let wanted = if pass == 0 {
                n < 0 && step < 0
            } else {
                n.rem_euclid(2) == 1
            };
            if wanted {
                charges[atom] = step;
                remaining -= step;
                notes.push(format!(
                    "formal charge {step:+} placed on atom {atom} ({}) to match the molecular charge",
                    molecule.atoms[atom].element.symbol()
                ));
            }
        }
    }
    if remaining != 0 {
        notes.push(format!(
            "formal charges do not add up to the molecular charge ({} left unplaced); lone-pair counts assume neutral atoms there",
            remaining
        ));
    }
    charges
}

/// Pauling electronegativity of the atom's element (common values, from memory); 2.0 for
/// elements not listed. Used only to break ties between charge-separated structures.
fn electronegativity(molecule: &Molecule, atom: usize) -> f64 {
    match molecule.atoms[atom].element.symbol() {
        "H" => 2.20,
        "B" => 2.04,
        "C" => 2.55,
        "N" => 3.04,
        "O" => 3.44,
        "F" => 3.98,
        "Si" => 1.90,
        "P" => 2.19,
        "S" => 2.58,
        "Cl" => 3.16,
        "Br" => 2.96,
        _ => 2.0,
    }
}

/// Classifies every atom. `has_p(atom)` says whether the atom has valence p functions
/// (hydrogen and helium do not and are never centres).
pub fn classify(
    molecule: &Molecule,
    settings: &HybridSettings,
    has_p: &dyn Fn(usize) -> bool,
) -> Classification {
    let mut out = Classification::default();
    for bond in &molecule.bonds {
        if bond.order > 3 {
            out.errors.push(HybridError::BondOrderTooHigh {
                a: bond.a,
                b: bond.b,
                order: bond.order,
            });
        }
    }
    for &atom in settings.lone_pair_overrides.keys() {
        if atom >= molecule.atoms.len() {
            out.notes.push(format!(
                "lone-pair override for atom {atom} ignored: the molecule has {} atoms",
                molecule.atoms.len()
            ));
        }
    }
    let charges = formal_charges(molecule, settings, &mut out.notes);
    let pi = pi_directions(molecule);
    #[allow(clippy::needless_range_loop)]
    for atom in 0..molecule.atoms.len() {
        let element = molecule.atoms[atom].element;
        let symbol = element.symbol().to_string();
        let partners = molecule.neighbours(atom);
        if !has_p(atom) {
            if partners.len() > 1 {
                out.errors.push(HybridError::MultiCentre {
                    atom,
                    element: symbol,
                    partners: partners.len(),
                });
            }
            continue;
        }
        let pi_count: usize = molecule
            .bonds
            .iter()
            .filter(|bond| bond.other(atom).is_some())
            .map(|bond| usize::from(bond.order.saturating_sub(1)))
            .sum();
        let n = nonbonding(molecule, atom, charges[atom]);
        let (lone_pairs, single) = match settings.lone_pair_overrides.get(&atom) {
            Some(&count) => (usize::from(count), false),
            None => {
                if n < 0 {
                    out.errors.push(HybridError::NegativeLonePairs {
                        atom,
                        element: symbol,
                        electrons: n,
                    });
                    out.skipped.push(atom);
                    continue;
                }
                ((n / 2) as usize, n % 2 == 1)
            }
        };
        let needed = partners.len() + pi_count + lone_pairs + usize::from(single);
        if needed > 4 || partners.len() > 4 {
            let error = if element.period() >= 3 {
                HybridError::Hypervalent {
                    atom,
                    element: symbol,
                    needed,
                }
            } else {
                HybridError::TooManyOrbitals {
                    atom,
                    element: symbol,
                    needed,
                }
            };
            out.errors.push(error);
            out.skipped.push(atom);
            continue;
        }
        if molecule
            .bonds
            .iter()
            .any(|bond| bond.other(atom).is_some() && bond.order > 3)
        {
            out.skipped.push(atom);
            continue;
        }
        if single {
            out.notes.push(format!(
                "atom {atom} ({symbol}) has an odd electron: one lone-pair orbital is singly occupied (open shell)"
            ));
        }
        let pi_orbitals: Vec<(usize, Vector3<f64>)> = pi
            .iter()
            .filter_map(|(a, b, d)| {
                if *a == atom {
                    Some((*b, *d))
                } else if *b == atom {
                    Some((*a, *d))
                } else {
                    None
                }
            })
            .collect();
        out.centres.push(CentreSpec {
            atom,
            sigma_partners: partners,
            pi: pi_orbitals,
            lone_pairs,
            single_electron: single,
            formal_charge: charges[atom],
        });
    }
    out
}

/// Unit vectors from `atom` to its σ partners (zero-length bonds skipped).
pub fn bond_units(molecule: &Molecule, atom: usize) -> Vec<Vector3<f64>> {
    molecule
        .neighbours(atom)
        .iter()
        .filter_map(|&other| {
            let v = molecule.atoms[other].position - molecule.atoms[atom].position;
            (v.norm() > 1e-8).then(|| v.normalize())
        })
        .collect()
}

/// The normal of the plane of an atom's σ bonds, when they span a plane (two
/// non-collinear bonds, or three or more bonds not all on one line).
fn plane_normal(molecule: &Molecule, atom: usize) -> Option<Vector3<f64>> {
    let units = bond_units(molecule, atom);
    if units.len() < 2 {
        return None;
    }
    let scatter: Matrix3<f64> = units.iter().map(|u| u * u.transpose()).sum();
    let eigen = scatter.symmetric_eigen();
    let mut order = [0, 1, 2];
    order.sort_by(|&i, &j| eigen.eigenvalues[i].total_cmp(&eigen.eigenvalues[j]));
    // Collinear bonds spread in one dimension only: no plane.
    if eigen.eigenvalues[order[1]] < 0.05 {
        return None;
    }
    Some(eigen.eigenvectors.column(order[0]).into_owned())
}

/// π directions for every bond of order 2 or 3: (a, b, direction), one entry per π bond.
pub fn pi_directions(molecule: &Molecule) -> Vec<(usize, usize, Vector3<f64>)> {
    let mut out: Vec<(usize, usize, Vector3<f64>)> = Vec::new();
    for bond in &molecule.bonds {
        if bond.order < 2 || bond.order > 3 {
            continue;
        }
        let (a, b) = (bond.a, bond.b);
        let axis = molecule.atoms[b].position - molecule.atoms[a].position;
        if axis.norm() < 1e-8 {
            continue;
        }
        let axis = axis.normalize();
        let perpendicular = |v: Vector3<f64>| v - axis * axis.dot(&v);
        let mut candidates: Vec<Vector3<f64>> = Vec::new();
        candidates.extend(plane_normal(molecule, a));
        candidates.extend(plane_normal(molecule, b));
        for end in [a, b] {
            for other in molecule.neighbours(end) {
                if other != a && other != b {
                    candidates.extend(plane_normal(molecule, other));
                }
            }
        }
        candidates.push(any_perpendicular(&axis));
        let mut reference = candidates
            .into_iter()
            .map(perpendicular)
            .find(|v| v.norm() > 0.1)
            .unwrap_or_else(|| any_perpendicular(&axis))
            .normalize();
        // Orthogonal to π orbitals already placed at either end (CO2, allene).
        let existing: Vec<Vector3<f64>> = out
            .iter()
            .filter(|(x, y, _)| [a, b].contains(x) || [a, b].contains(y))
            .map(|(_, _, d)| perpendicular(*d))
            .filter(|d| d.norm() > 0.5)
            .map(|d| d.normalize())
            .collect();
        for e in &existing {
            reference -= e * e.dot(&reference);
        }
        if reference.norm() < 0.1 {
            reference = existing
                .first()
                .map_or_else(|| any_perpendicular(&axis), |e| axis.cross(e).normalize());
        }
        let first = reference.normalize();
        out.push((a, b, first));
        if bond.order == 3 {
            out.push((a, b, axis.cross(&first).normalize()));
        }
    }
    out
}
