//! The molecule model: atoms with positions in Å, a net charge, a name and a bond list.
//!
//! Bond perception: two atoms are bonded when their distance is below 1.15 × the sum of
//! their covalent radii (DESIGN §4.1; the 15 % margin is common practice, no source).
//! Internal coordinates follow the usual definitions (e.g. Wilson, Decius and Cross,
//! *Molecular Vibrations*, 1955): the dihedral I–J–K–L is the signed angle between the
//! planes IJK and JKL, positive clockwise looking along J→K (IUPAC).

use nalgebra::{Rotation3, Unit, Vector3};
use serde::{Deserialize, Serialize};
use thiserror::Error;

use super::element::Element;

/// Largest molecule the program accepts.
pub const MAX_ATOMS: usize = 500;
/// Atoms closer than this (Å) are rejected as coincident.
pub const MIN_SEPARATION: f64 = 0.5;
/// Coordinates beyond this magnitude (Å) are rejected as absurd.
pub const MAX_COORDINATE: f64 = 1.0e4;
/// Bonded when d < BOND_TOLERANCE × (r_a + r_b).
pub const BOND_TOLERANCE: f64 = 1.15;
/// Two hydrogens are bonded closer than this (Å). Cordero's r(H) = 0.31 Å comes from X–H
/// bonds, so 1.15 × 2 r(H) = 0.713 Å would miss H₂ itself (0.741 Å, NIST CCCBDB, from
/// memory) and H₃⁺ (0.87 Å); hydrogens that are not bonded sit 1.5 Å or more apart in
/// molecules (geminal H···H in water and methane). Common practice, no source.
pub const H_H_BOND_LIMIT: f64 = 1.0;
/// Longest molecule name, ladder title or orbital label a document may hold (characters):
/// long enough for any real name, short enough that no figure or report chokes on it.
pub const MAX_NAME_CHARACTERS: usize = 200;
/// Most bonds one atom may have: 12 is the most neighbours of close packing; no molecule
/// with elements up to Kr needs more (common practice, no source).
pub const MAX_BONDS_PER_ATOM: usize = 12;
/// Largest net charge magnitude accepted: far beyond any molecular ion, small enough that
/// the electron count stays meaningful (common practice, no source).
pub const MAX_CHARGE: i32 = 100;
/// Highest bond order a bond list may hold: quadruple (distance perception gives C₂ one,
/// each carbon filling its valence of 4 on its one partner; metal–metal bonds reach it).
pub const MAX_BOND_ORDER: u8 = 4;

/// One atom: element and Cartesian position in Å.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Atom {
    pub element: Element,
    pub position: Vector3<f64>,
}

impl Atom {
    pub fn new(element: Element, position: [f64; 3]) -> Atom {
        Atom {
            element,
            position: Vector3::from(position),
        }
    }
}

/// A bond between atoms `a` < `b` (0-based) with a formal order (1 to 4). An aromatic
/// bond (from a molfile's bond type 4) keeps its flag for drawing and reports; its `order`
/// is that of one Kekulé structure (1 or 2).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Bond {
    pub a: usize,
    pub b: usize,
    pub order: u8,
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub aromatic: bool,
}

impl Bond {
    /// A bond with its ends stored in ascending order.
    pub fn new(a: usize, b: usize, order: u8) -> Bond {
        Bond {
            a: a.min(b),
            b: a.max(b),
            order,
            aromatic: false,
        }
    }

    pub fn other(&self, atom: usize) -> Option<usize> {
        if self.a == atom {
            Some(self.b)
        } else if self.b == atom {
            Some(self.a)
        } else {
            None
        }
    }
}

/// Why a molecule is not acceptable for analysis.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum MoleculeError {
    #[error("the molecule has no atoms")]
    Empty,
    #[error("{count} atoms is more than the limit of {MAX_ATOMS}")]
    TooManyAtoms { count: usize },
    #[error("atom {atom} has a non-finite coordinate")]
    NonFiniteCoordinate { atom: usize },
    #[error("atom {atom} has a coordinate beyond ±{MAX_COORDINATE} Å")]
    AbsurdCoordinate { atom: usize },
    #[error("atoms {a} and {b} are {distance:.3} Å apart, closer than {MIN_SEPARATION} Å")]
    CoincidentAtoms { a: usize, b: usize, distance: f64 },
    #[error(
        "the molecule has {electrons} valence electrons (charge {charge}); at least one is needed"
    )]
    NoElectrons { electrons: i64, charge: i32 },
    #[error("atom index {index} is out of range (the molecule has {count} atoms)")]
    AtomIndexOutOfRange { index: usize, count: usize },
    #[error("atoms {0:?} must all be different")]
    RepeatedAtoms(Vec<usize>),
    #[error("atoms {a} and {b} are not bonded")]
    NotBonded { a: usize, b: usize },
    #[error("bond {a}–{b} lies in a ring; its fragments cannot be moved apart")]
    BondInRing { a: usize, b: usize },
    #[error(
        "atoms {a} and {b} are not bonded to each other but are joined through other atoms, so neither side can move alone; scan a bond, or a distance between separate fragments"
    )]
    JoinedElsewhere { a: usize, b: usize },
    #[error("{what} of {value} is not possible (it must be {allowed})")]
    ImpossibleValue {
        what: &'static str,
        value: f64,
        allowed: &'static str,
    },
    #[error("the charge {charge} is out of range (it must be -{MAX_CHARGE} to {MAX_CHARGE})")]
    ChargeOutOfRange { charge: i32 },
    #[error("the name has {count} characters; the limit is {MAX_NAME_CHARACTERS}")]
    NameTooLong { count: usize },
    #[error("bond {a}–{b} names an atom that does not exist (the atoms are 0 to {last})")]
    BondAtomOutOfRange { a: usize, b: usize, last: usize },
    #[error("bond {a}–{a} joins atom {a} to itself")]
    BondToItself { a: usize },
    #[error("bond {a}–{b} is listed twice; each pair of atoms may be bonded once")]
    DuplicateBond { a: usize, b: usize },
    #[error(
        "bond {a}–{b} has order {order}; the orders are 1 to {MAX_BOND_ORDER} (1 or 2 for an aromatic bond)"
    )]
    BadBondOrder { a: usize, b: usize, order: u8 },
    #[error("atom {atom} has {count} bonds; the limit is {MAX_BONDS_PER_ATOM} per atom")]
    TooManyBonds { atom: usize, count: usize },
}

/// A molecule: atoms, net charge, a name and its bonds.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Molecule {
    pub name: String,
    pub atoms: Vec<Atom>,
    pub charge: i32,
    pub bonds: Vec<Bond>,
}

impl Molecule {
    /// A molecule with bonds perceived from distances.
    pub fn new(name: impl Into<String>, atoms: Vec<Atom>, charge: i32) -> Molecule {
        let mut molecule = Molecule {
            name: name.into(),
            atoms,
            charge,
            bonds: Vec::new(),
        };
        molecule.perceive_bonds();
        molecule
    }

    pub fn len(&self) -> usize {
        self.atoms.len()
    }

    pub fn is_empty(&self) -> bool {
        self.atoms.is_empty()
    }

    /// The distance (Å) below which atoms `a` and `b` are bonded: 1.15 × (r_a + r_b), and
    /// [`H_H_BOND_LIMIT`] for two hydrogens.
    pub fn bond_limit(&self, a: usize, b: usize) -> f64 {
        let (ea, eb) = (self.atoms[a].element, self.atoms[b].element);
        if ea == Element::H && eb == Element::H {
            return H_H_BOND_LIMIT;
        }
        BOND_TOLERANCE * (ea.covalent_radius() + eb.covalent_radius())
    }

    /// Replaces the bond list with single bonds between atoms closer than
    /// [`Molecule::bond_limit`]. Orders and aromatic flags of bonds that survive are kept.
    pub fn perceive_bonds(&mut self) {
        let old = std::mem::take(&mut self.bonds);
        for a in 0..self.atoms.len() {
            for b in a + 1..self.atoms.len() {
                let limit = self.bond_limit(a, b);
                if self.distance_unchecked(a, b) < limit {
                    let kept = old.iter().find(|bond| bond.a == a && bond.b == b);
                    self.bonds.push(kept.copied().unwrap_or(Bond::new(a, b, 1)));
                }
            }
        }
    }

    /// Raises bond orders so that atoms reach their usual valence (H 1, B 3, C 4, N 3,
    /// O 2, halogens 1, Si 4, P 3, S 2): a greedy matching that first serves the atom
    /// with the fewest unsaturated partners (common practice, no source). Gives C=O in
    /// formaldehyde, C≡N in HCN and a Kekulé structure for benzene. Deterministic.
    pub fn perceive_bond_orders(&mut self) {
        self.raise_orders(|_| true);
    }

    /// A Kekulé structure for the aromatic bonds: the same greedy matching as
    /// [`Molecule::perceive_bond_orders`], raising aromatic bonds only, so that explicit
    /// single and double bonds of a file are never changed.
    pub fn kekulize_aromatic(&mut self) {
        if self.bonds.iter().any(|bond| bond.aromatic) {
            self.raise_orders(|bond| bond.aromatic);
        }
    }

    fn raise_orders(&mut self, may_raise: impl Fn(&Bond) -> bool) {
        let mut free: Vec<i32> = self
            .atoms
            .iter()
            .map(|atom| usual_valence(atom.element).map_or(0, i32::from))
            .collect();
        for bond in &self.bonds {
            free[bond.a] -= bond.order as i32;
            free[bond.b] -= bond.order as i32;
        }
        loop {
            let open = |bond: &Bond| {
                may_raise(bond)
                    && free[bond.a] > 0
                    && free[bond.b] > 0
                    && (!bond.aromatic || bond.order < 2)
            };
            let candidates = |atom: usize| {
                self.bonds
                    .iter()
                    .filter(|bond| open(bond) && bond.other(atom).is_some())
                    .count()
            };
            let choice = self
                .bonds
                .iter()
                .enumerate()
                .filter(|(_, bond)| open(bond))
                .min_by_key(|(index, bond)| {
                    let (ca, cb) = (candidates(bond.a), candidates(bond.b));
                    (ca.min(cb), ca.max(cb), *index)
                })
                .map(|(index, _)| index);
            let Some(index) = choice else { break };
            let bond = &mut self.bonds[index];
            bond.order += 1;
            free[bond.a] -= 1;
            free[bond.b] -= 1;
        }
    }

    /// Sets the order of bond a–b, adding it if absent; order 0 removes it.
    pub fn set_bond_order(&mut self, a: usize, b: usize, order: u8) -> Result<(), MoleculeError> {
        self.check_indices(&[a, b])?;
        let key = Bond::new(a, b, order);
        self.bonds
            .retain(|bond| !(bond.a == key.a && bond.b == key.b));
        if order > 0 {
            self.bonds.push(key);
            self.bonds.sort_by_key(|bond| (bond.a, bond.b));
        }
        Ok(())
    }

    pub fn bond(&self, a: usize, b: usize) -> Option<&Bond> {
        let (a, b) = (a.min(b), a.max(b));
        self.bonds.iter().find(|bond| bond.a == a && bond.b == b)
    }

    /// Indices of the atoms bonded to `atom`, ascending.
    pub fn neighbours(&self, atom: usize) -> Vec<usize> {
        let mut list: Vec<usize> = self.bonds.iter().filter_map(|b| b.other(atom)).collect();
        list.sort_unstable();
        list
    }

    /// Σ valence electrons − charge (may be ≤ 0 for absurd charges; see `validate`).
    pub fn electron_count(&self) -> i64 {
        let valence: i64 = self
            .atoms
            .iter()
            .map(|atom| atom.element.valence_electrons() as i64)
            .sum();
        valence - self.charge as i64
    }

    /// Checks everything the analysis relies on; errors name the atoms.
    pub fn validate(&self) -> Result<(), MoleculeError> {
        if self.atoms.is_empty() {
            return Err(MoleculeError::Empty);
        }
        if self.atoms.len() > MAX_ATOMS {
            return Err(MoleculeError::TooManyAtoms {
                count: self.atoms.len(),
            });
        }
        for (index, atom) in self.atoms.iter().enumerate() {
            if atom.position.iter().any(|x| !x.is_finite()) {
                return Err(MoleculeError::NonFiniteCoordinate { atom: index });
            }
            if atom.position.iter().any(|x| x.abs() > MAX_COORDINATE) {
                return Err(MoleculeError::AbsurdCoordinate { atom: index });
            }
        }
        for a in 0..self.atoms.len() {
            for b in a + 1..self.atoms.len() {
                let distance = self.distance_unchecked(a, b);
                if distance < MIN_SEPARATION {
                    return Err(MoleculeError::CoincidentAtoms { a, b, distance });
                }
            }
        }
        if self.charge.unsigned_abs() > MAX_CHARGE.unsigned_abs() {
            return Err(MoleculeError::ChargeOutOfRange {
                charge: self.charge,
            });
        }
        let electrons = self.electron_count();
        if electrons <= 0 {
            return Err(MoleculeError::NoElectrons {
                electrons,
                charge: self.charge,
            });
        }
        let count = self.name.chars().count();
        if count > MAX_NAME_CHARACTERS {
            return Err(MoleculeError::NameTooLong { count });
        }
        self.validate_bonds()
    }

    /// The bond list: atoms that exist, no atom bonded to itself, each pair once, orders
    /// 1 to [`MAX_BOND_ORDER`], at most [`MAX_BONDS_PER_ATOM`] bonds per atom.
    pub fn validate_bonds(&self) -> Result<(), MoleculeError> {
        let count = self.atoms.len();
        let mut per_atom = vec![0usize; count];
        let mut seen = std::collections::HashSet::new();
        for bond in &self.bonds {
            let (a, b) = (bond.a, bond.b);
            if a >= count || b >= count {
                let last = count.saturating_sub(1);
                return Err(MoleculeError::BondAtomOutOfRange { a, b, last });
            }
            if a == b {
                return Err(MoleculeError::BondToItself { a });
            }
            if !seen.insert((a.min(b), a.max(b))) {
                return Err(MoleculeError::DuplicateBond { a, b });
            }
            let highest = if bond.aromatic { 2 } else { MAX_BOND_ORDER };
            if !(1..=highest).contains(&bond.order) {
                let order = bond.order;
                return Err(MoleculeError::BadBondOrder { a, b, order });
            }
            for atom in [a, b] {
                per_atom[atom] += 1;
                if per_atom[atom] > MAX_BONDS_PER_ATOM {
                    let count = per_atom[atom];
                    return Err(MoleculeError::TooManyBonds { atom, count });
                }
            }
        }
        Ok(())
    }

    /// Formula in Hill order with the charge ("H3N", "CH3Cl"): see [`super::formula::hill`].
    pub fn formula(&self) -> String {
        super::formula::hill(&self.elements(), self.charge)
    }

    /// The formula as chemists write it ("NH3", "H2O"): see
    /// [`super::formula::conventional`].
    pub fn conventional_formula(&self) -> String {
        super::formula::conventional(&self.elements(), self.charge)
    }

    fn elements(&self) -> Vec<Element> {
        self.atoms.iter().map(|a| a.element).collect()
    }

    pub fn total_mass(&self) -> f64 {
        self.atoms.iter().map(|a| a.element.mass()).sum()
    }

    /// Mass-weighted centre (Å).
    pub fn centre_of_mass(&self) -> Vector3<f64> {
        let mass = self.total_mass();
        if mass <= 0.0 {
            return Vector3::zeros();
        }
        self.atoms
            .iter()
            .map(|a| a.position * a.element.mass())
            .sum::<Vector3<f64>>()
            / mass
    }

    pub(crate) fn check_indices(&self, indices: &[usize]) -> Result<(), MoleculeError> {
        for &index in indices {
            if index >= self.atoms.len() {
                return Err(MoleculeError::AtomIndexOutOfRange {
                    index,
                    count: self.atoms.len(),
                });
            }
        }
        for (i, a) in indices.iter().enumerate() {
            if indices[i + 1..].contains(a) {
                return Err(MoleculeError::RepeatedAtoms(indices.to_vec()));
            }
        }
        Ok(())
    }

    fn distance_unchecked(&self, a: usize, b: usize) -> f64 {
        (self.atoms[a].position - self.atoms[b].position).norm()
    }

    /// Distance a–b in Å.
    pub fn distance(&self, a: usize, b: usize) -> Result<f64, MoleculeError> {
        self.check_indices(&[a, b])?;
        Ok(self.distance_unchecked(a, b))
    }

    /// Angle i–j–k in degrees (j is the vertex).
    pub fn angle(&self, i: usize, j: usize, k: usize) -> Result<f64, MoleculeError> {
        self.check_indices(&[i, j, k])?;
        let u = self.atoms[i].position - self.atoms[j].position;
        let v = self.atoms[k].position - self.atoms[j].position;
        Ok(angle_between(&u, &v).to_degrees())
    }

    /// Dihedral i–j–k–l in degrees, in (−180, 180].
    pub fn dihedral(&self, i: usize, j: usize, k: usize, l: usize) -> Result<f64, MoleculeError> {
        self.check_indices(&[i, j, k, l])?;
        let p = |n: usize| self.atoms[n].position;
        let b1 = p(j) - p(i);
        let b2 = p(k) - p(j);
        let b3 = p(l) - p(k);
        let n1 = b1.cross(&b2);
        let n2 = b2.cross(&b3);
        // IUPAC sign (Gold Book, "torsion angle"): positive when the front bond turns
        // clockwise to eclipse the rear bond, looking along j→k.
        let y = b2.norm() * b1.dot(&n2);
        let x = n1.dot(&n2);
        Ok(y.atan2(x).to_degrees())
    }

    /// Atoms reachable from `start` through bonds without crossing the bond start–`blocked`.
    fn fragment(&self, start: usize, blocked: usize) -> Vec<bool> {
        let mut seen = vec![false; self.atoms.len()];
        let mut stack = vec![start];
        seen[start] = true;
        while let Some(atom) = stack.pop() {
            for next in self.neighbours(atom) {
                if (atom == start && next == blocked) || seen[next] {
                    continue;
                }
                seen[next] = true;
                stack.push(next);
            }
        }
        seen
    }

    /// The side of the i–j bond (or pseudo-bond) to move: the smaller one. Returns
    /// (mask of atoms to move, whether the moved side is j's). Errors if i and j are
    /// joined by another path (a ring).
    fn moving_side(&self, i: usize, j: usize) -> Result<(Vec<bool>, bool), MoleculeError> {
        let side_j = self.fragment(j, i);
        if side_j[i] && self.bond(i, j).is_none() {
            return Err(MoleculeError::JoinedElsewhere { a: i, b: j });
        }
        if side_j[i] {
            return Err(MoleculeError::BondInRing { a: i, b: j });
        }
        let side_i = self.fragment(i, j);
        let count = |mask: &[bool]| mask.iter().filter(|&&m| m).count();
        if count(&side_j) <= count(&side_i) {
            Ok((side_j, true))
        } else {
            Ok((side_i, false))
        }
    }

    /// Sets distance i–j to `length` Å by moving the smaller fragment along the axis.
    pub fn set_distance(&mut self, i: usize, j: usize, length: f64) -> Result<(), MoleculeError> {
        self.check_indices(&[i, j])?;
        if !(length.is_finite() && length >= MIN_SEPARATION) {
            return Err(MoleculeError::ImpossibleValue {
                what: "a bond length",
                value: length,
                allowed: "at least 0.5 Å",
            });
        }
        let (mask, moves_j) = self.moving_side(i, j)?;
        let axis = self.atoms[j].position - self.atoms[i].position;
        let current = axis.norm();
        let direction = axis / current;
        let shift = direction * (length - current) * if moves_j { 1.0 } else { -1.0 };
        self.translate_mask(&mask, shift);
        Ok(())
    }

    /// Sets angle i–j–k to `degrees` by rotating the smaller of the fragments on i's or
    /// k's side about the normal of the i–j–k plane through j.
    pub fn set_angle(
        &mut self,
        i: usize,
        j: usize,
        k: usize,
        degrees: f64,
    ) -> Result<(), MoleculeError> {
        self.check_indices(&[i, j, k])?;
        if !(degrees.is_finite() && degrees > 0.0 && degrees <= 180.0) {
            return Err(MoleculeError::ImpossibleValue {
                what: "an angle",
                value: degrees,
                allowed: "above 0° and at most 180°",
            });
        }
        let (mask, moves_k) = self.moving_side(j, k)?;
        let mask = if moves_k && !mask[i] {
            mask
        } else {
            let (mask_i, _) = self.moving_side(j, i)?;
            if mask_i[k] {
                return Err(MoleculeError::BondInRing { a: i, b: k });
            }
            // Rotate i's side the other way instead.
            let current = self.angle(i, j, k)?;
            let axis = self.angle_axis(i, j, k);
            self.rotate_mask(&mask_i, j, axis, -(degrees - current).to_radians());
            return Ok(());
        };
        let current = self.angle(i, j, k)?;
        let axis = self.angle_axis(i, j, k);
        self.rotate_mask(&mask, j, axis, (degrees - current).to_radians());
        Ok(())
    }

    /// Unit normal of the i–j–k plane, oriented so that a positive rotation about it
    /// takes j→i toward j→k; any perpendicular for a straight angle.
    fn angle_axis(&self, i: usize, j: usize, k: usize) -> Unit<Vector3<f64>> {
        let u = self.atoms[i].position - self.atoms[j].position;
        let v = self.atoms[k].position - self.atoms[j].position;
        let normal = u.cross(&v);
        if normal.norm() > 1e-8 * u.norm() * v.norm() {
            Unit::new_normalize(normal)
        } else {
            Unit::new_normalize(any_perpendicular(&u))
        }
    }

    /// Sets dihedral i–j–k–l to `degrees` by rotating the smaller side about the j–k axis.
    pub fn set_dihedral(
        &mut self,
        i: usize,
        j: usize,
        k: usize,
        l: usize,
        degrees: f64,
    ) -> Result<(), MoleculeError> {
        self.check_indices(&[i, j, k, l])?;
        if !degrees.is_finite() {
            return Err(MoleculeError::ImpossibleValue {
                what: "a dihedral",
                value: degrees,
                allowed: "a finite number of degrees",
            });
        }
        let (mask, moves_k) = self.moving_side(j, k)?;
        let current = self.dihedral(i, j, k, l)?;
        let axis_vector = self.atoms[k].position - self.atoms[j].position;
        if axis_vector.norm() < 1e-8 {
            return Err(MoleculeError::CoincidentAtoms {
                a: j,
                b: k,
                distance: 0.0,
            });
        }
        let axis = Unit::new_normalize(axis_vector);
        // A right-handed turn of l's side about j→k looks clockwise along j→k, so it
        // raises the dihedral; turning i's side instead lowers it.
        let delta = (degrees - current).to_radians();
        let signed = if moves_k { delta } else { -delta };
        self.rotate_mask(&mask, j, axis, signed);
        Ok(())
    }

    fn translate_mask(&mut self, mask: &[bool], shift: Vector3<f64>) {
        for (atom, &moves) in self.atoms.iter_mut().zip(mask) {
            if moves {
                atom.position += shift;
            }
        }
    }

    fn rotate_mask(&mut self, mask: &[bool], pivot: usize, axis: Unit<Vector3<f64>>, angle: f64) {
        let centre = self.atoms[pivot].position;
        let rotation = Rotation3::from_axis_angle(&axis, angle);
        for (atom, &moves) in self.atoms.iter_mut().zip(mask) {
            if moves {
                atom.position = centre + rotation * (atom.position - centre);
            }
        }
    }

    /// Removes atom `index` and its bonds; later atoms shift down by one.
    pub fn remove_atom(&mut self, index: usize) -> Result<(), MoleculeError> {
        self.check_indices(&[index])?;
        self.atoms.remove(index);
        self.bonds.retain(|bond| bond.a != index && bond.b != index);
        for bond in &mut self.bonds {
            if bond.a > index {
                bond.a -= 1;
            }
            if bond.b > index {
                bond.b -= 1;
            }
        }
        Ok(())
    }

    /// Moves every atom by `shift` Å.
    pub fn translate(&mut self, shift: Vector3<f64>) {
        for atom in &mut self.atoms {
            atom.position += shift;
        }
    }

    /// Rotates every atom about `centre`.
    pub fn rotate_about(&mut self, rotation: &Rotation3<f64>, centre: Vector3<f64>) {
        for atom in &mut self.atoms {
            atom.position = centre + rotation * (atom.position - centre);
        }
    }
}

/// The number of bonds a neutral main-group atom usually forms; None where no single
/// value is usual (metals, noble gases, hypervalent-prone heavier atoms keep their bonds).
pub fn usual_valence(element: Element) -> Option<u8> {
    match element.symbol() {
        "H" | "F" | "Cl" | "Br" | "Li" | "Na" | "K" => Some(1),
        "O" | "S" | "Se" | "Be" | "Mg" | "Ca" => Some(2),
        "B" | "N" | "P" | "As" | "Al" | "Ga" => Some(3),
        "C" | "Si" | "Ge" => Some(4),
        _ => None,
    }
}

/// Angle between two vectors in radians, robust near 0 and π.
pub fn angle_between(u: &Vector3<f64>, v: &Vector3<f64>) -> f64 {
    u.cross(v).norm().atan2(u.dot(v))
}

/// A unit vector perpendicular to `v` (v must be non-zero).
pub fn any_perpendicular(v: &Vector3<f64>) -> Vector3<f64> {
    let trial = if v.x.abs() < 0.9 * v.norm() {
        Vector3::x()
    } else {
        Vector3::y()
    };
    v.cross(&trial).normalize()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Methane with C at the origin and H on alternate cube corners (ideal Td).
    fn methane() -> Molecule {
        let s = 1.087 / 3f64.sqrt();
        Molecule::new(
            "methane",
            vec![
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::H, [s, s, s]),
                Atom::new(Element::H, [-s, -s, s]),
                Atom::new(Element::H, [-s, s, -s]),
                Atom::new(Element::H, [s, -s, -s]),
            ],
            0,
        )
    }

    fn hydrogen_peroxide() -> Molecule {
        Molecule::new(
            "hydrogen peroxide",
            vec![
                Atom::new(Element::H, [0.9, 0.6, 0.3]),
                Atom::new(Element::O, [0.0, 0.7, 0.0]),
                Atom::new(Element::O, [0.0, -0.7, 0.0]),
                Atom::new(Element::H, [0.9, -0.6, -0.3]),
            ],
            0,
        )
    }

    #[test]
    fn tetrahedral_angle_is_arccos_minus_one_third() {
        // Hand value: arccos(−1/3) = 109.4712206…°.
        let m = methane();
        for (i, k) in [(1, 2), (1, 3), (2, 4), (3, 4)] {
            assert!((m.angle(i, 0, k).unwrap() - 109.471_220_634).abs() < 1e-8);
        }
        assert!((m.distance(0, 1).unwrap() - 1.087).abs() < 1e-12);
    }

    #[test]
    fn bonds_are_perceived_from_covalent_radii() {
        let m = methane();
        assert_eq!(m.bonds.len(), 4);
        assert_eq!(m.neighbours(0), vec![1, 2, 3, 4]);
        assert!(m.bond(1, 2).is_none());
    }

    #[test]
    fn dihedral_sign_and_value() {
        // Hand-built: H on +x above O1, other H rotated by 90° about the O–O axis.
        let m = Molecule::new(
            "h2o2",
            vec![
                Atom::new(Element::H, [1.0, 0.0, 0.0]),
                Atom::new(Element::O, [0.0, 0.0, 0.0]),
                Atom::new(Element::O, [0.0, 0.0, 1.4]),
                Atom::new(Element::H, [0.0, 1.0, 1.4]),
            ],
            0,
        );
        // Looking along O1→O2 (+z), the front H on +x turns clockwise by 90° onto the
        // rear H on +y: +90° by the IUPAC convention.
        assert!((m.dihedral(0, 1, 2, 3).unwrap() - 90.0).abs() < 1e-9);
    }

    #[test]
    fn set_internal_coordinates() {
        let mut m = hydrogen_peroxide();
        m.set_distance(1, 2, 1.475).unwrap();
        assert!((m.distance(1, 2).unwrap() - 1.475).abs() < 1e-12);
        m.set_angle(0, 1, 2, 94.8).unwrap();
        assert!((m.angle(0, 1, 2).unwrap() - 94.8).abs() < 1e-9);
        for target in [111.5, -60.0, 180.0, 0.0] {
            m.set_dihedral(0, 1, 2, 3, target).unwrap();
            let got = m.dihedral(0, 1, 2, 3).unwrap();
            let diff = (got - target + 540.0).rem_euclid(360.0) - 180.0;
            assert!(diff.abs() < 1e-8, "wanted {target}, got {got}");
        }
        // Bond lengths survive angle and dihedral changes.
        assert!((m.distance(1, 2).unwrap() - 1.475).abs() < 1e-10);
    }

    #[test]
    fn set_angle_moves_the_smaller_fragment_only() {
        let mut m = methane();
        let before = m.atoms[1].position;
        m.set_angle(1, 0, 2, 100.0).unwrap();
        assert!((m.angle(1, 0, 2).unwrap() - 100.0).abs() < 1e-9);
        let moved = (0..5)
            .filter(|&n| (m.atoms[n].position - methane().atoms[n].position).norm() > 1e-12)
            .count();
        assert_eq!(moved, 1);
        let _ = before;
    }

    #[test]
    fn ring_bonds_cannot_be_stretched_alone() {
        let r = 1.51 / 3f64.sqrt();
        let mut ring = Molecule::new(
            "c3",
            vec![
                Atom::new(Element::C, [r, 0.0, 0.0]),
                Atom::new(Element::C, [-r / 2.0, 0.755, 0.0]),
                Atom::new(Element::C, [-r / 2.0, -0.755, 0.0]),
            ],
            0,
        );
        assert_eq!(ring.bonds.len(), 3);
        assert!(matches!(
            ring.set_distance(0, 1, 1.6),
            Err(MoleculeError::BondInRing { .. })
        ));
    }

    #[test]
    fn bond_orders_follow_usual_valences() {
        let hcn = Molecule::new(
            "hcn",
            vec![
                Atom::new(Element::H, [0.0, 0.0, -1.065]),
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::N, [0.0, 0.0, 1.153]),
            ],
            0,
        );
        let mut hcn = hcn;
        hcn.perceive_bond_orders();
        assert_eq!(hcn.bond(1, 2).map(|b| b.order), Some(3));
        assert_eq!(hcn.bond(0, 1).map(|b| b.order), Some(1));
        // Benzene: a Kekulé structure, every carbon with exactly one double bond.
        let mut atoms = Vec::new();
        for k in 0..6 {
            let phi = std::f64::consts::PI / 3.0 * k as f64;
            atoms.push(Atom::new(
                Element::C,
                [1.39 * phi.cos(), 1.39 * phi.sin(), 0.0],
            ));
            atoms.push(Atom::new(
                Element::H,
                [2.47 * phi.cos(), 2.47 * phi.sin(), 0.0],
            ));
        }
        let mut benzene = Molecule::new("benzene", atoms, 0);
        benzene.perceive_bond_orders();
        for carbon in (0..12).step_by(2) {
            let doubles = benzene
                .bonds
                .iter()
                .filter(|b| b.order == 2 && b.other(carbon).is_some())
                .count();
            assert_eq!(doubles, 1, "carbon {carbon}");
        }
        // Methane stays single-bonded.
        let mut m = methane();
        m.perceive_bond_orders();
        assert!(m.bonds.iter().all(|b| b.order == 1));
    }

    #[test]
    fn builder_edits_keep_bonds_consistent() {
        let mut m = methane();
        let extra = m.add_bonded_atom(1, Element::H).unwrap();
        // Beside the single C–H1 bond at the tetrahedral angle (src/chem/edit.rs), at
        // r(H) + r(H) (Cordero 2008).
        assert!((m.angle(0, 1, extra).unwrap() - 109.471_220_634_490_7).abs() < 1e-9);
        assert!((m.distance(1, extra).unwrap() - 0.62).abs() < 1e-12);
        m.remove_atom(2).unwrap();
        assert_eq!(m.atoms.len(), 5);
        assert!(m.bonds.iter().all(|b| b.a < 5 && b.b < 5 && b.a != b.b));
        assert_eq!(m.neighbours(0), vec![1, 2, 3]);
        m.set_element(0, Element::N).unwrap();
        assert_eq!(m.atoms[0].element, Element::N);
        assert!(m.remove_atom(9).is_err());
    }

    #[test]
    fn formula_in_hill_order() {
        assert_eq!(methane().formula(), "CH4");
        assert_eq!(hydrogen_peroxide().formula(), "H2O2");
        let mut ion = Molecule::new(
            "nh4+",
            vec![
                Atom::new(Element::N, [0.0, 0.0, 0.0]),
                Atom::new(Element::H, [0.6, 0.6, 0.6]),
            ],
            1,
        );
        assert_eq!(ion.formula(), "HN+");
        ion.charge = -2;
        assert_eq!(ion.formula(), "HN2−");
    }

    /// A centre with `n` hydrogens on a sphere of 1.1 Å (golden-spiral points), all bonded.
    fn hedgehog(n: usize) -> Molecule {
        let mut atoms = vec![Atom::new(Element::C, [0.0, 0.0, 0.0])];
        for k in 0..n {
            let z = 1.0 - 2.0 * (k as f64 + 0.5) / n as f64;
            let r = (1.0 - z * z).sqrt();
            let phi = k as f64 * std::f64::consts::PI * (3.0 - 5f64.sqrt());
            atoms.push(Atom::new(
                Element::H,
                [1.1 * r * phi.cos(), 1.1 * r * phi.sin(), 1.1 * z],
            ));
        }
        let mut molecule = Molecule::new("hedgehog", atoms, 0);
        molecule.bonds = (1..=n).map(|h| Bond::new(0, h, 1)).collect();
        molecule
    }

    #[test]
    fn bond_lists_are_checked() {
        assert_eq!(hedgehog(12).validate(), Ok(()));
        assert_eq!(
            hedgehog(13).validate(),
            Err(MoleculeError::TooManyBonds { atom: 0, count: 13 })
        );
        let mut twice = hedgehog(4);
        twice.bonds.push(Bond {
            a: 1,
            b: 0,
            order: 1,
            aromatic: false,
        });
        assert_eq!(
            twice.validate(),
            Err(MoleculeError::DuplicateBond { a: 1, b: 0 })
        );
        let mut triple_plus = hedgehog(4);
        triple_plus.bonds[0].order = 9;
        assert!(matches!(
            triple_plus.validate(),
            Err(MoleculeError::BadBondOrder { order: 9, .. })
        ));
        let mut long_name = hedgehog(4);
        long_name.name = "x".repeat(MAX_NAME_CHARACTERS + 1);
        assert_eq!(
            long_name.validate(),
            Err(MoleculeError::NameTooLong { count: 201 })
        );
    }

    #[test]
    fn validation_names_the_atoms() {
        let mut m = methane();
        assert_eq!(m.validate(), Ok(()));
        assert_eq!(m.electron_count(), 8);
        m.atoms[3].position = m.atoms[2].position + Vector3::new(0.1, 0.0, 0.0);
        assert!(matches!(
            m.validate(),
            Err(MoleculeError::CoincidentAtoms { a: 2, b: 3, .. })
        ));
        let mut m = methane();
        m.atoms[4].position.x = f64::NAN;
        assert_eq!(
            m.validate(),
            Err(MoleculeError::NonFiniteCoordinate { atom: 4 })
        );
        let mut m = methane();
        m.atoms[1].position.y = 2e4;
        assert_eq!(
            m.validate(),
            Err(MoleculeError::AbsurdCoordinate { atom: 1 })
        );
        let mut m = methane();
        m.charge = 8;
        assert!(matches!(
            m.validate(),
            Err(MoleculeError::NoElectrons { .. })
        ));
        assert!(m.angle(0, 0, 1).is_err());
        assert!(m.distance(0, 9).is_err());
    }

    #[test]
    fn centre_of_mass_of_symmetric_molecule_is_the_centre() {
        let m = methane();
        assert!(m.centre_of_mass().norm() < 1e-12);
    }
}
