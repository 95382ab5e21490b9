//! Shape templates AXn for the structure builder (DESIGN §2): ideal VSEPR directions
//! (Gillespie and Nyholm, Q. Rev. Chem. Soc. 11, 339 (1957)) with bonds at the sum of the
//! covalent radii, and an adjustable X–A–X angle for the bent and pyramidal shapes.

use nalgebra::Vector3;
use serde::{Deserialize, Serialize};

use super::element::Element;
use super::molecule::{Atom, Molecule};

/// The template shapes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub enum Shape {
    Linear,
    Bent,
    TrigonalPlanar,
    Pyramidal,
    Tetrahedral,
    Seesaw,
    TShaped,
    SquarePlanar,
    TrigonalBipyramidal,
    SquarePyramidal,
    Octahedral,
}

impl Shape {
    pub const ALL: [Shape; 11] = [
        Shape::Linear,
        Shape::Bent,
        Shape::TrigonalPlanar,
        Shape::Pyramidal,
        Shape::Tetrahedral,
        Shape::Seesaw,
        Shape::TShaped,
        Shape::SquarePlanar,
        Shape::TrigonalBipyramidal,
        Shape::SquarePyramidal,
        Shape::Octahedral,
    ];

    pub fn name(self) -> &'static str {
        match self {
            Shape::Linear => "linear",
            Shape::Bent => "bent",
            Shape::TrigonalPlanar => "trigonal planar",
            Shape::Pyramidal => "pyramidal",
            Shape::Tetrahedral => "tetrahedral",
            Shape::Seesaw => "seesaw",
            Shape::TShaped => "T-shaped",
            Shape::SquarePlanar => "square planar",
            Shape::TrigonalBipyramidal => "trigonal bipyramidal",
            Shape::SquarePyramidal => "square pyramidal",
            Shape::Octahedral => "octahedral",
        }
    }

    /// (smallest, largest, default) X–A–X angle in degrees, for the shapes that have one.
    pub fn angle_range(self) -> Option<(f64, f64, f64)> {
        match self {
            Shape::Bent => Some((60.0, 180.0, 104.5)),
            // 120° is the planar limit of a pyramid whose three angles are equal.
            Shape::Pyramidal => Some((60.0, 120.0, 107.0)),
            _ => None,
        }
    }

    /// Unit vectors from the centre to the ligands; `angle` (degrees) is used by the
    /// shapes with an adjustable angle and clamped to their range.
    pub fn directions(self, angle: f64) -> Vec<Vector3<f64>> {
        let v = Vector3::new;
        let equatorial = |k: usize| {
            let phi = 2.0 * std::f64::consts::PI * k as f64 / 3.0;
            v(phi.cos(), phi.sin(), 0.0)
        };
        let angle = match self.angle_range() {
            Some((low, high, _)) => angle.clamp(low, high).to_radians(),
            None => 0.0,
        };
        match self {
            Shape::Linear => vec![v(0.0, 0.0, 1.0), v(0.0, 0.0, -1.0)],
            Shape::Bent => {
                let h = angle / 2.0;
                vec![v(0.0, h.sin(), -h.cos()), v(0.0, -h.sin(), -h.cos())]
            }
            Shape::TrigonalPlanar => (0..3).map(equatorial).collect(),
            Shape::Pyramidal => {
                // Equal X–A–X angles θ: cos²β = (2 cos θ + 1)/3 for the angle β between
                // each bond and the threefold axis (ligands below the centre).
                let square = (2.0 * angle.cos() + 1.0) / 3.0;
                // Rounding leaves ~1e-16 at 120°: snap to the exact plane.
                let cos_beta = if square < 1e-12 { 0.0 } else { -square.sqrt() };
                let sin_beta = (1.0 - cos_beta * cos_beta).sqrt();
                (0..3)
                    .map(|k| {
                        let e = equatorial(k);
                        v(sin_beta * e.x, sin_beta * e.y, cos_beta)
                    })
                    .collect()
            }
            Shape::Tetrahedral => {
                let s = 1.0 / 3f64.sqrt();
                vec![v(s, s, s), v(-s, -s, s), v(-s, s, -s), v(s, -s, -s)]
            }
            Shape::Seesaw => vec![
                v(0.0, 0.0, 1.0),
                v(0.0, 0.0, -1.0),
                equatorial(0),
                equatorial(1),
            ],
            Shape::TShaped => vec![v(0.0, 0.0, 1.0), v(0.0, 0.0, -1.0), v(1.0, 0.0, 0.0)],
            Shape::SquarePlanar => vec![
                v(1.0, 0.0, 0.0),
                v(-1.0, 0.0, 0.0),
                v(0.0, 1.0, 0.0),
                v(0.0, -1.0, 0.0),
            ],
            Shape::TrigonalBipyramidal => {
                let mut list = vec![v(0.0, 0.0, 1.0), v(0.0, 0.0, -1.0)];
                list.extend((0..3).map(equatorial));
                list
            }
            Shape::SquarePyramidal => vec![
                v(0.0, 0.0, 1.0),
                v(1.0, 0.0, 0.0),
                v(-1.0, 0.0, 0.0),
                v(0.0, 1.0, 0.0),
                v(0.0, -1.0, 0.0),
            ],
            Shape::Octahedral => vec![
                v(1.0, 0.0, 0.0),
                v(-1.0, 0.0, 0.0),
                v(0.0, 1.0, 0.0),
                v(0.0, -1.0, 0.0),
                v(0.0, 0.0, 1.0),
                v(0.0, 0.0, -1.0),
            ],
        }
    }
}

/// The molecule AXn of `shape` with centre `central` and ligands `ligand`.
pub fn build(shape: Shape, central: Element, ligand: Element, angle: f64) -> Molecule {
    let length = central.covalent_radius() + ligand.covalent_radius();
    let mut atoms = vec![Atom::new(central, [0.0; 3])];
    for direction in shape.directions(angle) {
        let p = direction * length;
        atoms.push(Atom::new(ligand, [p.x, p.y, p.z]));
    }
    let count = atoms.len() - 1;
    let name = format!("{central}{ligand}{count} ({} template)", shape.name());
    let mut molecule = Molecule::new(name, atoms, 0);
    molecule.perceive_bond_orders();
    molecule
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pyramidal_angle_is_exact_and_reaches_planarity() {
        for target in [90.0, 100.0, 107.0, 119.0] {
            let m = build(Shape::Pyramidal, Element::N, Element::H, target);
            for (i, k) in [(1, 2), (1, 3), (2, 3)] {
                assert!((m.angle(i, 0, k).unwrap() - target).abs() < 1e-9);
            }
        }
        // At 120° the three bonds lie in a plane (sum of angles 360°).
        let flat = build(Shape::Pyramidal, Element::N, Element::H, 120.0);
        assert!(flat.atoms.iter().all(|a| a.position.z.abs() < 1e-9));
    }

    #[test]
    fn every_shape_has_unit_directions_and_the_right_count() {
        let counts = [2, 2, 3, 3, 4, 4, 3, 4, 5, 5, 6];
        for (shape, count) in Shape::ALL.iter().zip(counts) {
            let directions = shape.directions(100.0);
            assert_eq!(directions.len(), count, "{}", shape.name());
            assert!(directions.iter().all(|d| (d.norm() - 1.0).abs() < 1e-12));
            let m = build(*shape, Element::S, Element::F, 100.0);
            assert_eq!(m.bonds.len(), count, "every ligand bonded to the centre");
        }
        // Tetrahedral: arccos(−1/3) between any two bonds.
        let t = build(Shape::Tetrahedral, Element::C, Element::H, 0.0);
        assert!((t.angle(1, 0, 2).unwrap() - 109.471_220_634).abs() < 1e-8);
    }
}
