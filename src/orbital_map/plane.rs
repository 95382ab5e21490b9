//! The plane a map is drawn on: an origin and two orthonormal in-plane axes u, v (Å,
//! molecule frame), right-handed with the normal u × v. Built through three atoms, through
//! one atom normal to a bond, or chosen by default from the orbital's atoms (plain
//! analytic geometry; common practice, no source).

use nalgebra::Vector3;

use crate::chem::molecule::{Molecule, any_perpendicular};

use super::MapError;

/// Three points closer to a line than this (sine of the angle at the first, or zero
/// length) do not define a plane.
const COLLINEAR_SINE: f64 = 1e-3;

/// How the plane was chosen, for titles.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum PlaneKind {
    ThroughAtoms([usize; 3]),
    NormalToBond {
        atom: usize,
        partner: usize,
    },
    /// Through atoms i and j, perpendicular to the plane of i, j, k (shows π orbitals).
    PerpendicularTo([usize; 3]),
    /// Through `atom`, its `neighbour` and the axis pointing away from the mean of the
    /// atom's neighbours (a pyramidal centre's lone-pair axis).
    Outward {
        atom: usize,
        neighbour: usize,
    },
    /// Any other plane (given by points and axes).
    Free,
}

/// A plane with in-plane coordinates: point = origin + x u + y v (Å).
#[derive(Clone, Debug, PartialEq)]
pub struct Plane {
    pub origin: Vector3<f64>,
    pub u: Vector3<f64>,
    pub v: Vector3<f64>,
    pub kind: PlaneKind,
}

fn atom_position(molecule: &Molecule, atom: usize) -> Result<Vector3<f64>, MapError> {
    molecule
        .atoms
        .get(atom)
        .map(|a| a.position)
        .ok_or(MapError::AtomOutOfRange {
            atom,
            atoms: molecule.atoms.len(),
        })
}

/// Sine of the angle at `a` between a→b and a→c, 0 when a point coincides.
fn spread(a: &Vector3<f64>, b: &Vector3<f64>, c: &Vector3<f64>) -> f64 {
    let (ab, ac) = (b - a, c - a);
    let lengths = ab.norm() * ac.norm();
    if lengths < 1e-12 {
        0.0
    } else {
        ab.cross(&ac).norm() / lengths
    }
}

impl Plane {
    /// The plane through atoms i, j, k (0-based): origin at i, u along i → j, v in the
    /// plane toward k.
    pub fn through_atoms(molecule: &Molecule, atoms: [usize; 3]) -> Result<Plane, MapError> {
        let [i, j, k] = atoms;
        for (n, &a) in atoms.iter().enumerate() {
            if atoms[..n].contains(&a) {
                return Err(MapError::RepeatedAtom { atom: a });
            }
        }
        let (a, b, c) = (
            atom_position(molecule, i)?,
            atom_position(molecule, j)?,
            atom_position(molecule, k)?,
        );
        if spread(&a, &b, &c) < COLLINEAR_SINE {
            return Err(MapError::CollinearAtoms { atoms });
        }
        let mut plane = Plane::from_points(a, b, c).ok_or(MapError::CollinearAtoms { atoms })?;
        plane.kind = PlaneKind::ThroughAtoms(atoms);
        Ok(plane)
    }

    /// The plane through atoms i and j perpendicular to the plane of i, j, k: it contains
    /// the i–j axis and the normal of i, j, k, so it cuts through π lobes above and below.
    pub fn perpendicular_to(molecule: &Molecule, atoms: [usize; 3]) -> Result<Plane, MapError> {
        let plane = Plane::through_atoms(molecule, atoms)?;
        Ok(plane.turned_about_u(PlaneKind::PerpendicularTo(atoms)))
    }

    /// This plane turned by 90° about its u axis (same origin and u; v becomes the normal).
    pub fn turned_about_u(&self, kind: PlaneKind) -> Plane {
        Plane {
            origin: self.origin,
            u: self.u,
            v: self.normal(),
            kind,
        }
    }

    /// The plane through `atom`, its first neighbour and the axis pointing from the mean
    /// of its neighbours through it; None unless the atom has at least two neighbours and
    /// stands out of their plane (a pyramidal centre, where a lone pair lies on that axis).
    pub fn outward(molecule: &Molecule, atom: usize) -> Option<Plane> {
        let neighbours = molecule.neighbours(atom);
        let centre = molecule.atoms.get(atom)?.position;
        if neighbours.len() < 2 {
            return None;
        }
        let mean = neighbours
            .iter()
            .map(|&n| molecule.atoms[n].position)
            .sum::<Vector3<f64>>()
            / neighbours.len() as f64;
        let away = centre - mean;
        if away.norm() < 0.05 {
            return None;
        }
        let first = neighbours[0];
        let mut plane = Plane::from_points(centre, molecule.atoms[first].position, centre + away)?;
        plane.kind = PlaneKind::Outward {
            atom,
            neighbour: first,
        };
        Some(plane)
    }

    /// The plane through `atom` normal to the bond atom → `partner`.
    pub fn normal_to_bond(
        molecule: &Molecule,
        atom: usize,
        partner: usize,
    ) -> Result<Plane, MapError> {
        if atom == partner {
            return Err(MapError::RepeatedAtom { atom });
        }
        let a = atom_position(molecule, atom)?;
        let b = atom_position(molecule, partner)?;
        let axis = b - a;
        if axis.norm() < 1e-6 {
            return Err(MapError::CoincidentAtoms {
                a: atom,
                b: partner,
            });
        }
        let axis = axis.normalize();
        let u = any_perpendicular(&axis);
        let v = axis.cross(&u);
        Ok(Plane {
            origin: a,
            u,
            v,
            kind: PlaneKind::NormalToBond { atom, partner },
        })
    }

    /// The plane through three points (origin at the first), or None if they are collinear.
    pub fn from_points(a: Vector3<f64>, b: Vector3<f64>, c: Vector3<f64>) -> Option<Plane> {
        if spread(&a, &b, &c) < COLLINEAR_SINE {
            return None;
        }
        let u = (b - a).normalize();
        let normal = u.cross(&(c - a)).normalize();
        let v = normal.cross(&u);
        Some(Plane {
            origin: a,
            u,
            v,
            kind: PlaneKind::Free,
        })
    }

    /// Unit normal u × v.
    pub fn normal(&self) -> Vector3<f64> {
        self.u.cross(&self.v)
    }

    /// The 3D point (Å) at plane coordinates (x, y).
    pub fn point(&self, x: f64, y: f64) -> Vector3<f64> {
        self.origin + x * self.u + y * self.v
    }

    /// Plane coordinates of `point` and its signed height above the plane (Å).
    pub fn project(&self, point: &Vector3<f64>) -> (f64, f64, f64) {
        let d = point - self.origin;
        (d.dot(&self.u), d.dot(&self.v), d.dot(&self.normal()))
    }

    /// A sensible plane for a map of an orbital on `focus` atoms: the first three
    /// non-collinear atoms taken from the focus atoms, then their neighbours, then the rest
    /// of the molecule. A linear (or one- or two-atom) molecule gets a plane containing its
    /// axis; a single atom, the plane through it spanned by x and z.
    pub fn default_for(molecule: &Molecule, focus: &[usize]) -> Option<Plane> {
        let count = molecule.atoms.len();
        let mut order: Vec<usize> = Vec::with_capacity(count);
        let push = |atom: usize, order: &mut Vec<usize>| {
            if atom < count && !order.contains(&atom) {
                order.push(atom);
            }
        };
        for &atom in focus {
            push(atom, &mut order);
        }
        for &atom in focus {
            for neighbour in molecule.neighbours(atom) {
                push(neighbour, &mut order);
            }
        }
        for atom in 0..count {
            push(atom, &mut order);
        }
        let first = *order.first()?;
        let a = molecule.atoms[first].position;
        let second = order
            .iter()
            .skip(1)
            .copied()
            .find(|&b| (molecule.atoms[b].position - a).norm() > 1e-6);
        let Some(second) = second else {
            return Some(Plane {
                origin: a,
                u: Vector3::x(),
                v: Vector3::z(),
                kind: PlaneKind::Free,
            });
        };
        let b = molecule.atoms[second].position;
        for &third in &order {
            if third == first || third == second {
                continue;
            }
            let c = molecule.atoms[third].position;
            if spread(&a, &b, &c) >= COLLINEAR_SINE {
                let mut plane = Plane::from_points(a, b, c)?;
                plane.kind = PlaneKind::ThroughAtoms([first, second, third]);
                return Some(plane);
            }
        }
        let u = (b - a).normalize();
        let v = any_perpendicular(&u);
        Some(Plane {
            origin: a,
            u,
            v,
            kind: PlaneKind::Free,
        })
    }

    /// Short description for titles.
    pub fn describe(&self) -> String {
        match &self.kind {
            PlaneKind::ThroughAtoms([i, j, k]) => format!("plane through atoms {i}, {j}, {k}"),
            PlaneKind::NormalToBond { atom, partner } => {
                format!("plane through atom {atom} normal to bond {atom}–{partner}")
            }
            PlaneKind::PerpendicularTo([i, j, k]) => {
                format!("plane through atoms {i}, {j}, perpendicular to the plane of {i}, {j}, {k}")
            }
            PlaneKind::Outward { atom, neighbour } => format!(
                "plane through atoms {atom}, {neighbour} and the axis of atom {atom} away from its neighbours"
            ),
            PlaneKind::Free => "plane".into(),
        }
    }
}
