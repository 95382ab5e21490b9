//! The builder's edits of a molecule. A new atom goes at the sum of the covalent radii
//! (Cordero 2008) along a free valence direction: away from the anchor's bonds, and next
//! to a single bond at the angle that bond's order suggests — 180° after a triple bond,
//! 120° after a double bond (in the plane of the partner's other substituents, so a double
//! bond stays planar), else the tetrahedral 109.47° (idealized VSEPR angles). Changing an
//! element resets its bond lengths to the new sum of covalent radii. Common practice, no
//! source.

use nalgebra::Vector3;

use super::element::Element;
use super::molecule::{Atom, Bond, Molecule, MoleculeError, any_perpendicular};

/// The tetrahedral angle, arccos(−1/3), in degrees.
const TETRAHEDRAL_DEGREES: f64 = 109.471_220_634_490_7;

impl Molecule {
    /// Adds an atom of `element` bonded to `anchor` (see the module comment for where).
    /// Returns the new atom's index.
    pub fn add_bonded_atom(
        &mut self,
        anchor: usize,
        element: Element,
    ) -> Result<usize, MoleculeError> {
        self.check_indices(&[anchor])?;
        let direction = self.free_direction(anchor);
        let length = self.atoms[anchor].element.covalent_radius() + element.covalent_radius();
        self.atoms.push(Atom {
            element,
            position: self.atoms[anchor].position + direction * length,
        });
        let index = self.atoms.len() - 1;
        self.bonds.push(Bond::new(anchor, index, 1));
        Ok(index)
    }

    /// Changes the element of atom `index`, resets the lengths of its bonds to the sum of
    /// the covalent radii (the smaller side moves; bonds in rings keep their length) and
    /// perceives the bond orders again from the usual valences.
    pub fn set_element(&mut self, index: usize, element: Element) -> Result<(), MoleculeError> {
        self.check_indices(&[index])?;
        self.atoms[index].element = element;
        for partner in self.neighbours(index) {
            let length = element.covalent_radius() + self.atoms[partner].element.covalent_radius();
            // A ring bond cannot be stretched alone; it keeps its length.
            let _ = self.set_distance(partner, index, length);
        }
        for bond in &mut self.bonds {
            bond.order = 1;
        }
        self.perceive_bond_orders();
        Ok(())
    }

    /// A unit vector from `anchor` where a new bond has room.
    fn free_direction(&self, anchor: usize) -> Vector3<f64> {
        let centre = self.atoms[anchor].position;
        let units: Vec<Vector3<f64>> = self
            .neighbours(anchor)
            .iter()
            .map(|&n| self.atoms[n].position - centre)
            .filter(|v| v.norm() > 1e-9)
            .map(|v| v.normalize())
            .collect();
        let sum: Vector3<f64> = units.iter().sum();
        match units.as_slice() {
            [] => Vector3::x(),
            [only] => self.beside_one_bond(anchor, only),
            _ if sum.norm() > 0.1 => -sum.normalize(),
            // Bonds that cancel (linear or planar-symmetric): perpendicular to them.
            [first, second, ..] => {
                let normal = first.cross(second);
                if normal.norm() > 1e-6 {
                    normal.normalize()
                } else {
                    any_perpendicular(first)
                }
            }
        }
    }

    /// Next to the one bond `bond` (unit vector from `anchor`), at the angle its order
    /// suggests, turned towards the partner's other substituents.
    fn beside_one_bond(&self, anchor: usize, bond: &Vector3<f64>) -> Vector3<f64> {
        let Some(&partner) = self.neighbours(anchor).first() else {
            return any_perpendicular(bond);
        };
        let degrees = match self.bond(anchor, partner).map_or(1, |b| b.order) {
            3.. => 180.0,
            2 => 120.0,
            _ => TETRAHEDRAL_DEGREES,
        };
        let origin = self.atoms[partner].position;
        let side = self
            .neighbours(partner)
            .into_iter()
            .filter(|&n| n != anchor)
            .map(|n| self.atoms[n].position - origin)
            .map(|v| v - bond * v.dot(bond))
            .find(|v| v.norm() > 1e-6)
            .map_or_else(|| any_perpendicular(bond), |v| v.normalize());
        let angle = f64::to_radians(degrees);
        (bond * angle.cos() + side * angle.sin()).normalize()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn angle_at(molecule: &Molecule, i: usize, j: usize, k: usize) -> f64 {
        molecule.angle(i, j, k).expect("valid atoms")
    }

    #[test]
    fn a_second_atom_on_a_double_bonded_carbon_goes_at_120_degrees_in_plane() {
        // Formaldehyde's carbon with only its C=O bond: the next atom at 120°.
        let mut molecule = Molecule::new(
            "CO",
            vec![
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::O, [1.21, 0.0, 0.0]),
            ],
            0,
        );
        molecule.bonds[0].order = 2;
        let h = molecule.add_bonded_atom(0, Element::H).expect("added");
        assert!((angle_at(&molecule, 1, 0, h) - 120.0).abs() < 1e-6);
        let length = molecule.distance(0, h).expect("distance");
        assert!((length - (0.76 + 0.31)).abs() < 0.02, "{length}");
        // A single bond gives the tetrahedral angle.
        let mut methyl = Molecule::new(
            "CC",
            vec![
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::C, [1.54, 0.0, 0.0]),
            ],
            0,
        );
        let x = methyl.add_bonded_atom(0, Element::H).expect("added");
        assert!((angle_at(&methyl, 1, 0, x) - TETRAHEDRAL_DEGREES).abs() < 1e-6);
    }

    #[test]
    fn a_double_bond_stays_planar() {
        // Vinyl: C1 carries two H; the new atom on C0 lies in their plane.
        let mut molecule = Molecule::new(
            "vinyl",
            vec![
                Atom::new(Element::C, [0.0, 0.0, 0.0]),
                Atom::new(Element::C, [1.33, 0.0, 0.0]),
                Atom::new(Element::H, [1.9, 0.93, 0.0]),
                Atom::new(Element::H, [1.9, -0.93, 0.0]),
            ],
            0,
        );
        let double = molecule.bond(0, 1).copied().expect("C=C");
        molecule
            .set_bond_order(double.a, double.b, 2)
            .expect("order");
        let new = molecule.add_bonded_atom(0, Element::H).expect("added");
        assert!(molecule.atoms[new].position.z.abs() < 1e-9, "in the plane");
        assert!((angle_at(&molecule, 1, 0, new) - 120.0).abs() < 1e-6);
    }

    #[test]
    fn changing_an_element_resets_its_bond_length() {
        // The failing input: O–H at 0.97 Å, H changed to F, kept 0.97 Å.
        let mut molecule = Molecule::new(
            "OH",
            vec![
                Atom::new(Element::O, [0.0, 0.0, 0.0]),
                Atom::new(Element::H, [0.97, 0.0, 0.0]),
            ],
            0,
        );
        molecule.set_element(1, Element::F).expect("changed");
        let expected = Element::O.covalent_radius() + Element::F.covalent_radius();
        let length = molecule.distance(0, 1).expect("distance");
        assert!((length - expected).abs() < 1e-9, "{length} vs {expected}");
        assert!(
            molecule.atoms[0].position.norm() < 1e-12,
            "the terminal atom moved"
        );
    }
}
