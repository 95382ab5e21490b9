//! Symmetric deformations of one centre A with ligands X₁…Xₙ: the ligands are placed
//! symmetrically about an axis through A (equal angle α to the axis, azimuths spaced
//! 2π/n), so that neighbouring ligands make the angle θ with
//! cos θ = cos²α + sin²α cos(2π/n) (spherical law of cosines; common practice, no source).
//! For n = 3, θ = 120° is planar (D3h for ammonia); for n = 2 this is the symmetric bend,
//! θ = 2α. Each ligand's fragment (everything bonded beyond it) moves rigidly with it and
//! keeps its A–X distance. The symmetric stretch moves every fragment along its bond.

use std::ops::RangeInclusive;

use nalgebra::{Rotation3, Unit, Vector3};

use super::ScanError;
use crate::chem::molecule::{Molecule, any_perpendicular};

/// Bonded neighbours of `centre`, checked against the count the deformation needs.
pub(super) fn ligands(
    molecule: &Molecule,
    centre: usize,
    allowed: RangeInclusive<usize>,
) -> Result<Vec<usize>, ScanError> {
    let found = molecule.neighbours(centre);
    if !allowed.contains(&found.len()) {
        let needed = match (*allowed.start(), *allowed.end()) {
            (a, b) if a == b => format!("exactly {a}"),
            (a, _) => format!("at least {a}"),
        };
        return Err(ScanError::LigandCount {
            centre,
            found: found.len(),
            needed,
        });
    }
    Ok(found)
}

/// Atoms on `ligand`'s side of the centre–ligand bond (ligand included). A ring through
/// the centre makes the deformation undefined.
fn fragment(molecule: &Molecule, centre: usize, ligand: usize) -> Result<Vec<usize>, ScanError> {
    let mut seen = vec![false; molecule.len()];
    seen[ligand] = true;
    let mut stack = vec![ligand];
    while let Some(atom) = stack.pop() {
        for next in molecule.neighbours(atom) {
            if next == centre {
                if atom != ligand {
                    return Err(ScanError::RingAtCentre { centre, ligand });
                }
                continue;
            }
            if !seen[next] {
                seen[next] = true;
                stack.push(next);
            }
        }
    }
    Ok((0..molecule.len()).filter(|&a| seen[a]).collect())
}

/// Unit vectors centre → ligand.
fn bond_directions(molecule: &Molecule, centre: usize, ligands: &[usize]) -> Vec<Vector3<f64>> {
    let origin = molecule.atoms[centre].position;
    ligands
        .iter()
        .map(|&x| (molecule.atoms[x].position - origin).normalize())
        .collect()
}

/// The symmetry axis and the ligands' azimuths about it, ordered by azimuth.
struct Frame {
    axis: Vector3<f64>,
    e1: Vector3<f64>,
    e2: Vector3<f64>,
    /// Ligand positions in `ligands` order by increasing azimuth.
    order: Vec<usize>,
}

fn frame(
    centre: usize,
    ligands: &[usize],
    directions: &[Vector3<f64>],
) -> Result<Frame, ScanError> {
    let sum: Vector3<f64> = directions.iter().sum();
    let axis = if sum.norm() > 1e-6 {
        sum.normalize()
    } else {
        // Planar or linear: the normal of the ligands' plane.
        directions
            .iter()
            .skip(1)
            .map(|d| directions[0].cross(d))
            .find(|n| n.norm() > 1e-6)
            .map(|n| n.normalize())
            .unwrap_or_else(|| any_perpendicular(&directions[0]).normalize())
    };
    let project = |d: &Vector3<f64>| d - axis * axis.dot(d);
    let first = project(&directions[0]);
    let mut azimuths = Vec::with_capacity(ligands.len());
    for (&ligand, direction) in ligands.iter().zip(directions) {
        if project(direction).norm() < 1e-6 {
            return Err(ScanError::LigandOnAxis { centre, ligand });
        }
    }
    let e1 = first.normalize();
    let e2 = axis.cross(&e1);
    for direction in directions {
        let angle = direction.dot(&e2).atan2(direction.dot(&e1));
        azimuths.push(angle.rem_euclid(std::f64::consts::TAU));
    }
    let mut order: Vec<usize> = (0..ligands.len()).collect();
    order.sort_by(|&a, &b| azimuths[a].total_cmp(&azimuths[b]));
    Ok(Frame {
        axis,
        e1,
        e2,
        order,
    })
}

/// Mean angle (degrees) between ligands that are neighbours around the axis.
pub(super) fn mean_neighbour_angle(molecule: &Molecule, centre: usize) -> Result<f64, ScanError> {
    let ligands = ligands(molecule, centre, 2..=usize::MAX)?;
    let directions = bond_directions(molecule, centre, &ligands);
    let found = frame(centre, &ligands, &directions)?;
    let n = ligands.len();
    let pairs = if n == 2 { 1 } else { n };
    let total: f64 = (0..pairs)
        .map(|r| {
            let a = directions[found.order[r]];
            let b = directions[found.order[(r + 1) % n]];
            a.dot(&b).clamp(-1.0, 1.0).acos().to_degrees()
        })
        .sum();
    Ok(total / pairs as f64)
}

/// Mean centre–ligand distance (Å).
pub(super) fn mean_bond_length(molecule: &Molecule, centre: usize) -> Result<f64, ScanError> {
    let ligands = ligands(molecule, centre, 1..=usize::MAX)?;
    let origin = molecule.atoms[centre].position;
    let total: f64 = ligands
        .iter()
        .map(|&x| (molecule.atoms[x].position - origin).norm())
        .sum();
    Ok(total / ligands.len() as f64)
}

/// Places the ligands symmetrically with neighbouring X–A–X angles of `degrees`.
pub(super) fn set_symmetric_angle(
    molecule: &mut Molecule,
    centre: usize,
    degrees: f64,
) -> Result<(), ScanError> {
    let ligands = ligands(molecule, centre, 2..=usize::MAX)?;
    let n = ligands.len();
    let widest = 360.0 / n as f64;
    if !(degrees.is_finite() && degrees > 0.0 && degrees <= widest + 1e-9) {
        return Err(ScanError::SymmetricAngle {
            value: degrees,
            ligands: n,
            widest,
        });
    }
    let fragments = ligands
        .iter()
        .map(|&x| fragment(molecule, centre, x))
        .collect::<Result<Vec<_>, _>>()?;
    let directions = bond_directions(molecule, centre, &ligands);
    let found = frame(centre, &ligands, &directions)?;
    let spacing = std::f64::consts::TAU / n as f64;
    let c = spacing.cos();
    let cos2 = ((degrees.to_radians().cos() - c) / (1.0 - c)).clamp(0.0, 1.0);
    let (cos_a, sin_a) = (cos2.sqrt(), (1.0 - cos2).sqrt());
    let origin = molecule.atoms[centre].position;
    for (rank, &slot) in found.order.iter().enumerate() {
        let phi = spacing * rank as f64;
        let target = found.axis * cos_a + (found.e1 * phi.cos() + found.e2 * phi.sin()) * sin_a;
        let rotation = rotation_between(&directions[slot], &target);
        for &atom in &fragments[slot] {
            let position = &mut molecule.atoms[atom].position;
            *position = origin + rotation * (*position - origin);
        }
    }
    Ok(())
}

/// Sets every centre–ligand distance to `length` Å, moving each fragment along its bond.
pub(super) fn set_bond_lengths(
    molecule: &mut Molecule,
    centre: usize,
    length: f64,
) -> Result<(), ScanError> {
    if !(length.is_finite() && length > 0.0) {
        return Err(ScanError::BondLength { value: length });
    }
    let ligands = ligands(molecule, centre, 1..=usize::MAX)?;
    let origin = molecule.atoms[centre].position;
    for ligand in ligands {
        let atoms = fragment(molecule, centre, ligand)?;
        let bond = molecule.atoms[ligand].position - origin;
        let shift = bond.normalize() * (length - bond.norm());
        for atom in atoms {
            molecule.atoms[atom].position += shift;
        }
    }
    Ok(())
}

/// The rotation taking unit vector `from` to unit vector `to` (a half turn about any
/// perpendicular when they are opposite).
fn rotation_between(from: &Vector3<f64>, to: &Vector3<f64>) -> Rotation3<f64> {
    Rotation3::rotation_between(from, to).unwrap_or_else(|| {
        Rotation3::from_axis_angle(
            &Unit::new_normalize(any_perpendicular(from)),
            std::f64::consts::PI,
        )
    })
}
