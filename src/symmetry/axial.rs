//! Character tables of the axial groups (Cn, Cnv, Cnh, Dn, Dnh, Dnd, S2n), generated.
//! Every operation of an axial group in its standard frame keeps the z axis, so it acts on
//! the functions cos mφ and sin mφ (times 1 or z) as an element of O(2)×Z2; the irreducible
//! characters are the distinct, mutually orthogonal characters among those functions
//! (norm h for an absolutely irreducible representation, 2h for a complex-conjugate pair
//! of the cyclic groups combined into one real E). Labels follow Mulliken's rules as used
//! in Cotton, *Chemical Applications of Group Theory*, 3rd ed., ch. 4: A/B by the principal
//! rotation (S2n where the group has no inversion), 1/2 by C2′ (or σv), g/u by i, ′/″ by
//! σh, E indices by the character of the principal rotation.

use nalgebra::{Matrix3, Vector3};

use super::ops::{PointGroup, find_matrix, reflection, rotation};
use super::tables::IrrepLabel;

/// Character function of a candidate for an axial group.
#[derive(Clone, Copy, Debug)]
enum Planar {
    Sym,
    Anti,
    Pair(u32),
    Cos(u32),
    Sin(u32),
}

struct OpGeometry {
    det_m: f64,
    theta: f64,
    alpha2: f64,
    s: f64,
}

fn planar_geometry(r: &Matrix3<f64>) -> OpGeometry {
    let det_m = r[(0, 0)] * r[(1, 1)] - r[(0, 1)] * r[(1, 0)];
    let angle = r[(1, 0)].atan2(r[(0, 0)]);
    OpGeometry {
        det_m: det_m.signum(),
        theta: angle,
        alpha2: angle,
        s: r[(2, 2)].signum(),
    }
}

fn planar_character(kind: Planar, g: &OpGeometry) -> f64 {
    let rot = g.det_m > 0.0;
    match kind {
        Planar::Sym => 1.0,
        Planar::Anti => g.det_m,
        Planar::Pair(m) => {
            if rot {
                2.0 * (m as f64 * g.theta).cos()
            } else {
                0.0
            }
        }
        Planar::Cos(m) => {
            if rot {
                (m as f64 * g.theta).cos()
            } else {
                (m as f64 * g.alpha2).cos()
            }
        }
        Planar::Sin(m) => {
            if rot {
                (m as f64 * g.theta).cos()
            } else {
                -(m as f64 * g.alpha2).cos()
            }
        }
    }
}

fn inner(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

/// Irreducible characters (per operation) of an axial group.
pub(super) fn axial_characters(ops: &[Matrix3<f64>]) -> Vec<(Vec<f64>, u8)> {
    let h = ops.len() as f64;
    let geo: Vec<OpGeometry> = ops.iter().map(planar_geometry).collect();
    // In-plane rotation order: the smallest N with every in-plane angle a multiple of 2π/N.
    let mut n_in = 1u32;
    for n in 1..=240u32 {
        let ok = geo.iter().all(|g| {
            let t = g.theta * n as f64 / (2.0 * std::f64::consts::PI);
            (t - t.round()).abs() < 1e-6
        });
        if ok {
            n_in = n;
            break;
        }
    }
    let mut candidates: Vec<Planar> = vec![Planar::Sym, Planar::Anti];
    for m in 1..=n_in / 2 + 1 {
        let valid = geo.iter().all(|g| {
            let x = if g.det_m > 0.0 {
                (m as f64 * g.theta).sin()
            } else {
                (m as f64 * g.alpha2).sin()
            };
            x.abs() < 1e-6
        });
        if valid {
            candidates.push(Planar::Cos(m));
            candidates.push(Planar::Sin(m));
        }
    }
    for m in 1..=n_in / 2 + 1 {
        candidates.push(Planar::Pair(m));
    }
    let mut accepted: Vec<(Vec<f64>, u8)> = Vec::new();
    let mut total = 0.0;
    for kind in candidates {
        for p in 0..2 {
            let chi: Vec<f64> = geo
                .iter()
                .map(|g| planar_character(kind, g) * if p == 1 { g.s } else { 1.0 })
                .collect();
            let norm = inner(&chi, &chi) / h;
            let reality = if (norm - 1.0).abs() < 1e-6 {
                1
            } else if (norm - 2.0).abs() < 1e-6 {
                2
            } else {
                continue;
            };
            if accepted.iter().any(|(a, _)| inner(a, &chi).abs() > 1e-6) {
                continue;
            }
            total += chi[0] * chi[0] / reality as f64;
            accepted.push((chi, reality));
        }
    }
    debug_assert!((total - h).abs() < 1e-6, "incomplete axial table");
    accepted
}

/// Axial-group Mulliken labelling from the characters (per operation).
pub(super) fn axial_labels(
    group: PointGroup,
    ops: &[Matrix3<f64>],
    irreps: &[(Vec<f64>, u8)],
) -> Vec<IrrepLabel> {
    use std::f64::consts::PI;
    let zax = Vector3::z();
    let find = |m: &Matrix3<f64>| find_matrix(ops, m);
    let inversion = find(&(-Matrix3::identity()));
    let sigma_h = find(&reflection(&zax));
    let c2x = find(&rotation(&Vector3::x(), PI));
    let sigma_xz = find(&reflection(&Vector3::y()));
    let c2y = find(&rotation(&Vector3::y(), PI));
    let c2z = find(&rotation(&zax, PI));
    // Principal generator.
    let (n_p, principal): (u32, Option<usize>) = match group {
        PointGroup::S(m) if inversion.is_none() => {
            (m, find(&super::ops::improper(&zax, 2.0 * PI / m as f64)))
        }
        PointGroup::S(m) => (m / 2, find(&rotation(&zax, 2.0 * PI / (m / 2) as f64))),
        PointGroup::Dnd(n) if inversion.is_none() => {
            (2 * n, find(&super::ops::improper(&zax, PI / n as f64)))
        }
        PointGroup::Cn(n)
        | PointGroup::Cnv(n)
        | PointGroup::Cnh(n)
        | PointGroup::Dn(n)
        | PointGroup::Dnh(n)
        | PointGroup::Dnd(n) => (n, find(&rotation(&zax, 2.0 * PI / n as f64))),
        _ => (1, None),
    };
    let d2 = matches!(group, PointGroup::Dn(2) | PointGroup::Dnh(2));
    let ks: Vec<u32> = irreps
        .iter()
        .filter(|(chi, _)| chi[0] > 1.5)
        .map(|(chi, _)| e_index(chi, principal, n_p))
        .collect();
    let mut distinct = ks.clone();
    distinct.sort_unstable();
    distinct.dedup();
    irreps
        .iter()
        .map(|(chi, _)| {
            let dim = chi[0].round() as usize;
            let at = |i: Option<usize>| i.map(|i| chi[i]);
            let mut sub = String::new();
            let letter;
            if dim >= 2 {
                letter = "e";
                if distinct.len() > 1 {
                    sub.push_str(&e_index(chi, principal, n_p).to_string());
                }
            } else {
                let a = at(principal).is_none_or(|c| c > 0.0);
                if d2 {
                    let sym = |i: Option<usize>| at(i).is_some_and(|c| c > 0.0);
                    if sym(c2z) && sym(c2y) && sym(c2x) {
                        letter = "a";
                    } else {
                        letter = "b";
                        if sym(c2z) {
                            sub.push('1');
                        } else if sym(c2y) {
                            sub.push('2');
                        } else {
                            sub.push('3');
                        }
                    }
                } else {
                    letter = if a { "a" } else { "b" };
                    if let Some(c) = at(c2x).or(at(sigma_xz))
                        && !matches!(group, PointGroup::Cs | PointGroup::Ci | PointGroup::C1)
                    {
                        sub.push(if c > 0.0 { '1' } else { '2' });
                    }
                }
            }
            let mut primes = 0;
            if let Some(c) = at(inversion) {
                sub.push(if c > 0.0 { 'g' } else { 'u' });
            } else if let Some(c) = at(sigma_h) {
                primes = if c > 0.0 { 1 } else { 2 };
            }
            IrrepLabel::new(letter, &sub, primes)
        })
        .collect()
}

fn e_index(chi: &[f64], principal: Option<usize>, n_p: u32) -> u32 {
    match principal {
        Some(p) => {
            let c = (chi[p] / chi[0]).clamp(-1.0, 1.0);
            let k = (c.acos() * n_p as f64 / (2.0 * std::f64::consts::PI)).round() as u32;
            k.max(1)
        }
        None => 1,
    }
}
