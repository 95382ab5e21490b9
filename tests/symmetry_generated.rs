//! Self-consistency over every group up to order 8 of the axial families (and S4…S16, the
//! cubic and icosahedral groups): a "molecule" made of the orbits of three generic seed atoms
//! under the group's ideal operations has exactly that group by construction; after a random
//! rotation, a shift and 1e-4 Å noise, detection must return it. (Not an outside reference:
//! it checks the detection route against the construction, family by family.)

mod symmetry_support;

use diptych::chem::{Atom, Molecule};
use diptych::symmetry::ops::standard_operations;
use diptych::symmetry::{PointGroup, SymmetrySettings, detect, symmetrize};
use nalgebra::Vector3;
use symmetry_support::*;

fn orbit_molecule(group: PointGroup, seeds: &[(&str, [f64; 3])]) -> Molecule {
    let ops = standard_operations(group);
    let mut atoms: Vec<Atom> = Vec::new();
    for (sym, seed) in seeds {
        let s = Vector3::from(*seed);
        let mut pts: Vec<Vector3<f64>> = Vec::new();
        for g in &ops {
            let q = g * s;
            if !pts.iter().any(|r| (r - q).norm() < 1e-6) {
                pts.push(q);
            }
        }
        atoms.extend(pts.into_iter().map(|q| Atom::new(el(sym), [q.x, q.y, q.z])));
    }
    Molecule::new(group.to_string(), atoms, 0)
}

fn groups() -> Vec<PointGroup> {
    use PointGroup::*;
    let mut v = vec![Cs, Ci];
    for n in 2..=8 {
        v.extend([Cn(n), Cnv(n), Cnh(n), Dn(n), Dnh(n), Dnd(n)]);
    }
    v.extend([
        S(4),
        S(6),
        S(8),
        S(10),
        S(12),
        S(16),
        T,
        Td,
        Th,
        O,
        Oh,
        I,
        Ih,
    ]);
    v
}

#[test]
fn every_group_is_recovered_from_a_generic_orbit() {
    let mut seed = 5u64;
    let mut noise = || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((seed >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 2e-4
    };
    let mut failures = Vec::new();
    for g in groups() {
        let scale = if g.order() > 40 { 4.0 } else { 1.0 };
        let m = orbit_molecule(
            g,
            &[
                ("C", [1.31 * scale, 0.42 * scale, 0.77 * scale]),
                ("H", [-0.52 * scale, 1.93 * scale, -1.21 * scale]),
                ("O", [0.23 * scale, -1.37 * scale, 2.11 * scale]),
            ],
        );
        for (k, (axis, angle)) in [([0.3, -0.8, 0.5], 0.9), ([-0.6, 0.1, 0.9], 2.3)]
            .iter()
            .enumerate()
        {
            let mut moved = rotated(&m, *axis, *angle, [1.5, -2.0, 0.7]);
            for a in &mut moved.atoms {
                for c in 0..3 {
                    a.position[c] += noise();
                }
            }
            match detect(&moved, &SymmetrySettings::default()) {
                Ok(sym) => {
                    if sym.group != g {
                        failures.push(format!("{g} (orientation {k}): got {}", sym.group));
                        continue;
                    }
                    assert_eq!(sym.operations.len(), g.order());
                    // Every operation is the standard one seen through the frame.
                    for op in &sym.operations {
                        let back = sym.frame * op.matrix * sym.frame.transpose();
                        assert!((back - op.standard).abs().max() < 1e-9);
                    }
                    let s = symmetrize(&moved, &sym);
                    for (a, b) in moved.atoms.iter().zip(&s.atoms) {
                        assert!((a.position - b.position).norm() < 1e-3);
                    }
                }
                Err(e) => failures.push(format!("{g} (orientation {k}): {e}")),
            }
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn a_481_atom_icosahedral_cluster_is_detected_quickly() {
    let mut seeds = vec![
        ("C", [1.31, 0.42, 0.77]),
        ("C", [-0.52, 1.93, -1.21]),
        ("H", [0.23, -1.37, 2.11]),
        ("O", [2.2, 0.9, -0.4]),
    ];
    for s in &mut seeds {
        for x in &mut s.1 {
            *x *= 4.0;
        }
    }
    let mut m = orbit_molecule(PointGroup::Ih, &seeds);
    m.atoms.push(Atom::new(el("Fe"), [0.0, 0.0, 0.0]));
    assert_eq!(m.atoms.len(), 481);
    let moved = rotated(&m, [0.2, 0.5, -0.3], 1.7, [3.0, 0.0, -1.0]);
    let start = std::time::Instant::now();
    let sym = detect(&moved, &SymmetrySettings::default()).unwrap();
    let elapsed = start.elapsed().as_secs_f64();
    assert_eq!(sym.group, PointGroup::Ih);
    // Unoptimized (debug) builds are far slower; the bound is for release builds.
    let limit = if cfg!(debug_assertions) { 300.0 } else { 5.0 };
    assert!(elapsed < limit, "{elapsed} s");
}
