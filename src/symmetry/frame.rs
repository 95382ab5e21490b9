//! Standard frames and classification: from the symmetry elements found, the Schoenflies
//! group by the usual flow chart (Cotton, *Chemical Applications of Group Theory*, 3rd ed.,
//! §3.14) and the frame that puts the molecule in the group's standard orientation:
//! principal axis z; C2′ (or the σv with most atoms) along x; for planar C2v and D2h the
//! axis convention of the settings (Mulliken 1955 by default: x perpendicular to the plane;
//! for D2h z along the in-plane axis through most atoms). Also the fallback chain of
//! subgroups used when a classification does not fit within the tolerance.

use nalgebra::{Matrix3, Vector3};

use super::AxisConvention;
use super::detect::{Elements, Prepared, parallel, perpendicular};
use super::ops::{PointGroup, icosahedral_c5_axis, improper, rotation};

pub(super) fn orthonormal_frame(x: Vector3<f64>, z: Vector3<f64>) -> Matrix3<f64> {
    let z = z.normalize();
    let mut x = x - z * x.dot(&z);
    if x.norm() < 1e-6 {
        x = any_perpendicular(&z);
    }
    let x = x.normalize();
    let y = z.cross(&x);
    Matrix3::from_rows(&[x.transpose(), y.transpose(), z.transpose()])
}

pub(super) fn any_perpendicular(z: &Vector3<f64>) -> Vector3<f64> {
    let trial = if z.x.abs() < 0.9 {
        Vector3::x()
    } else {
        Vector3::y()
    };
    (trial - z * trial.dot(z)).normalize()
}

/// A direction perpendicular to z toward the first atom off the axis.
pub(super) fn x_from_atoms(p: &Prepared, z: &Vector3<f64>) -> Vector3<f64> {
    for set in &p.sets {
        for &i in set {
            let v = p.pos[i] - z * p.pos[i].dot(z);
            if v.norm() > p.tol {
                return v;
            }
        }
    }
    any_perpendicular(z)
}

/// Picks the axis through most atoms (then most mass; then first).
fn best_axis(p: &Prepared, list: &[Vector3<f64>]) -> Option<Vector3<f64>> {
    // Ties (no atoms on any candidate) are broken by the mass-weighted extent along the
    // axis, so that the choice does not depend on the orientation of the input.
    let extent = |v: &Vector3<f64>| -> f64 {
        p.pos
            .iter()
            .zip(&p.mass)
            .map(|(x, m)| m * x.dot(v).powi(2))
            .sum()
    };
    let mut best: Option<(usize, f64, f64, Vector3<f64>)> = None;
    for v in list {
        let count = p.atoms_on_axis(v);
        let mass = p.mass_on_axis(v);
        let ext = extent(v);
        let better = match best {
            None => true,
            Some((c, m, e, _)) => {
                count > c
                    || (count == c && mass > m + 1e-6)
                    || (count == c && (mass - m).abs() <= 1e-6 && ext > e * (1.0 + 1e-6) + 1e-9)
            }
        };
        if better {
            best = Some((count, mass, ext, *v));
        }
    }
    best.map(|b| b.3)
}

/// Standard frame of a cubic or icosahedral group with z and x along two of its
/// perpendicular key axes (C2, or C4 for O/Oh); for I/Ih, x and y are swapped if needed so
/// that (0, 1, φ) is a C5 axis.
fn polyhedral_frame(
    p: &Prepared,
    group: PointGroup,
    x: Vector3<f64>,
    z: Vector3<f64>,
) -> Matrix3<f64> {
    let frame = orthonormal_frame(x, z);
    if matches!(group, PointGroup::I | PointGroup::Ih) {
        let c5 = frame.transpose() * icosahedral_c5_axis();
        if !p.is_symmetry(&rotation(&c5, 2.0 * std::f64::consts::PI / 5.0)) {
            let y: Vector3<f64> = frame.row(1).transpose();
            return orthonormal_frame(y, z);
        }
    }
    frame
}

/// Alternative frames for a polyhedral group: every perpendicular pair of key axes.
pub(super) fn polyhedral_alternatives(
    p: &Prepared,
    e: &Elements,
    group: PointGroup,
) -> Vec<Matrix3<f64>> {
    let key_order = match group {
        PointGroup::O | PointGroup::Oh => 4,
        PointGroup::T | PointGroup::Td | PointGroup::Th | PointGroup::I | PointGroup::Ih => 2,
        _ => return Vec::new(),
    };
    let key: Vec<Vector3<f64>> = e
        .axes
        .iter()
        .filter(|(_, n)| *n == key_order)
        .map(|(v, _)| *v)
        .collect();
    let mut frames = Vec::new();
    for z in &key {
        for x in &key {
            if perpendicular(x, z, p.angle) && frames.len() < 64 {
                frames.push(polyhedral_frame(p, group, *x, *z));
            }
        }
    }
    frames
}

pub(super) fn classify_elements(
    p: &Prepared,
    e: &Elements,
    convention: AxisConvention,
) -> (PointGroup, Matrix3<f64>) {
    use std::f64::consts::PI;
    let high: Vec<&(Vector3<f64>, u32)> = e.axes.iter().filter(|(_, n)| *n >= 3).collect();
    if high.len() >= 2 {
        let has = |k: u32| e.axes.iter().any(|(_, n)| *n == k);
        let (group, key_order) = if has(5) {
            (
                if e.inversion {
                    PointGroup::Ih
                } else {
                    PointGroup::I
                },
                2,
            )
        } else if has(4) {
            (
                if e.inversion {
                    PointGroup::Oh
                } else {
                    PointGroup::O
                },
                4,
            )
        } else if e.inversion {
            (PointGroup::Th, 2)
        } else if !e.mirrors.is_empty() {
            (PointGroup::Td, 2)
        } else {
            (PointGroup::T, 2)
        };
        let key: Vec<Vector3<f64>> = e
            .axes
            .iter()
            .filter(|(_, n)| *n == key_order)
            .map(|(v, _)| *v)
            .collect();
        let z = key.first().copied().unwrap_or_else(Vector3::z);
        let x = key
            .iter()
            .find(|v| perpendicular(v, &z, p.angle))
            .copied()
            .unwrap_or_else(|| any_perpendicular(&z));
        return (group, polyhedral_frame(p, group, x, z));
    }
    if e.axes.is_empty() {
        if let Some(m) = e.mirrors.first() {
            return (PointGroup::Cs, orthonormal_frame(x_from_atoms(p, m), *m));
        }
        let group = if e.inversion {
            PointGroup::Ci
        } else {
            PointGroup::C1
        };
        return (group, Matrix3::identity());
    }
    // Axial groups. Principal axis.
    let n_max = e.axes.iter().map(|(_, n)| *n).max().unwrap_or(2);
    let twofold: Vec<Vector3<f64>> = e.axes.iter().map(|(v, _)| *v).collect();
    let s4 = |v: &Vector3<f64>| p.is_symmetry(&improper(v, PI / 2.0));
    let first_axis = twofold.first().copied().unwrap_or_else(Vector3::z);
    let z = if n_max >= 3 {
        high.first().map_or(first_axis, |a| a.0)
    } else if twofold.len() >= 3 {
        twofold
            .iter()
            .find(|v| s4(v))
            .copied()
            .unwrap_or(first_axis)
    } else {
        first_axis
    };
    let n = n_max;
    let perp_c2: Vec<Vector3<f64>> = e
        .axes
        .iter()
        .filter(|(v, k)| *k >= 2 && perpendicular(v, &z, p.angle))
        .map(|(v, _)| *v)
        .collect();
    let sigma_h = e.mirrors.iter().any(|m| parallel(m, &z, p.angle));
    let sigma_v: Vec<Vector3<f64>> = e
        .mirrors
        .iter()
        .filter(|m| perpendicular(m, &z, p.angle))
        .copied()
        .collect();
    let d2_like = n == 2 && perp_c2.len() >= 2;
    let d2d = d2_like && s4(&z);
    if !perp_c2.is_empty() {
        let group = if sigma_h {
            PointGroup::Dnh(n)
        } else if !sigma_v.is_empty() {
            PointGroup::Dnd(n)
        } else {
            PointGroup::Dn(n)
        };
        if d2_like && !d2d {
            // D2 / D2h: three equivalent-looking C2 axes; choose by convention.
            let all: Vec<Vector3<f64>> = {
                let mut v = vec![z];
                v.extend(perp_c2.iter().copied());
                v
            };
            let planar_normal = all.iter().find(|v| {
                let (count, _) = p.atoms_in_plane(v);
                count == p.pos.len()
            });
            let frame = match planar_normal {
                Some(normal) => {
                    let in_plane: Vec<Vector3<f64>> = all
                        .iter()
                        .filter(|v| !parallel(v, normal, p.angle))
                        .copied()
                        .collect();
                    let main = best_axis(p, &in_plane).unwrap_or(z);
                    match convention {
                        AxisConvention::MullikenPerpendicularX => orthonormal_frame(*normal, main),
                        AxisConvention::InPlaneX => orthonormal_frame(main, *normal),
                    }
                }
                None => {
                    let main = best_axis(p, &all).unwrap_or(z);
                    let rest: Vec<Vector3<f64>> = all
                        .iter()
                        .filter(|v| !parallel(v, &main, p.angle))
                        .copied()
                        .collect();
                    let second = best_axis(p, &rest).unwrap_or_else(|| any_perpendicular(&main));
                    orthonormal_frame(second, main)
                }
            };
            return (group, frame);
        }
        let candidates: Vec<Vector3<f64>> = perp_c2
            .iter()
            .filter(|v| !parallel(v, &z, p.angle))
            .copied()
            .collect();
        let x = best_axis(p, &candidates).unwrap_or_else(|| any_perpendicular(&z));
        return (group, orthonormal_frame(x, z));
    }
    if sigma_h {
        return (
            PointGroup::Cnh(n),
            orthonormal_frame(x_from_atoms(p, &z), z),
        );
    }
    if !sigma_v.is_empty() {
        // x lies in the σv containing the most atoms (C2v: the Mulliken convention).
        let mut best: Option<(usize, f64, Vector3<f64>)> = None;
        for m in &sigma_v {
            let (count, mass) = p.atoms_in_plane(m);
            let better = match best {
                None => true,
                Some((c, ms, _)) => count > c || (count == c && mass > ms + 1e-9),
            };
            if better {
                best = Some((count, mass, *m));
            }
        }
        let normal = best.map(|b| b.2).unwrap_or_else(|| any_perpendicular(&z));
        let in_plane = z.cross(&normal);
        let x = if n == 2 && convention == AxisConvention::MullikenPerpendicularX {
            normal
        } else {
            in_plane
        };
        return (PointGroup::Cnv(n), orthonormal_frame(x, z));
    }
    if p.is_symmetry(&improper(&z, PI / n as f64)) {
        return (
            PointGroup::S(2 * n),
            orthonormal_frame(x_from_atoms(p, &z), z),
        );
    }
    (PointGroup::Cn(n), orthonormal_frame(x_from_atoms(p, &z), z))
}

/// Subgroups to try, largest first, in the same frame, when `group` does not fit.
pub(super) fn subgroup_chain(group: PointGroup) -> Vec<PointGroup> {
    use PointGroup::*;
    let cyclic = |n: u32| -> Vec<PointGroup> {
        (2..=n)
            .rev()
            .filter(|d| n.is_multiple_of(*d))
            .map(Cn)
            .collect()
    };
    let mut chain = match group {
        Dnh(n) => vec![Dn(n), Cnv(n), Cnh(n)],
        Dnd(n) => vec![Dn(n), Cnv(n), S(2 * n)],
        Dn(_) | Cnv(_) | Cnh(_) | S(_) | Cn(_) => vec![],
        _ => vec![],
    };
    match group {
        Dnh(n) | Dnd(n) | Dn(n) | Cnv(n) | Cnh(n) | Cn(n) => chain.extend(cyclic(n)),
        S(m) => chain.extend(cyclic(m / 2)),
        _ => {}
    }
    chain.retain(|g| *g != group);
    chain
}

/// Elements reduced to one principal axis (the best-determined one of highest order) with
/// the twofold axes and planes that fit an axial group about it.
pub(super) fn axial_elements(p: &Prepared, e: &Elements) -> Elements {
    let n_max = e.axes.iter().map(|(_, n)| *n).max().unwrap_or(1);
    let Some(&(z, n)) = e.axes.iter().find(|(_, k)| *k == n_max) else {
        return Elements {
            axes: Vec::new(),
            mirrors: e.mirrors.clone(),
            inversion: e.inversion,
        };
    };
    let mut axes = vec![(z, n)];
    axes.extend(
        e.axes
            .iter()
            .filter(|(v, k)| *k == 2 && perpendicular(v, &z, p.angle))
            .copied(),
    );
    let mirrors = e
        .mirrors
        .iter()
        .filter(|m| parallel(m, &z, p.angle) || perpendicular(m, &z, p.angle))
        .copied()
        .collect();
    Elements {
        axes,
        mirrors,
        inversion: e.inversion,
    }
}
