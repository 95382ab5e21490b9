//! Criterion benchmark of an orbital map: 256 × 256 points for a 20-atom molecule
//! (all-anti n-hexane, C6H14, built in code with textbook bond lengths and tetrahedral
//! angles; common practice, no source). Target (issue 9): under 30 ms, grid values,
//! contour lines at the default levels and the projected atoms together.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::analysis::{Analysis, Settings};
use diptych::chem::element::Element;
use diptych::chem::molecule::{Atom, Molecule};
use diptych::orbital_map::{
    DEFAULT_LEVELS, Grid, MapOptions, OrbitalEvaluator, OrbitalRef, Plane, compute_map,
    contour_lines,
};
use nalgebra::Vector3;

/// All-anti n-hexane in the xy plane: C–C 1.53 Å, C–C–C 112°, C–H 1.09 Å, H–C–H and
/// H–C–C tetrahedral (109.47°).
fn hexane() -> Molecule {
    let half_angle = (112.0f64 / 2.0).to_radians();
    let (dx, dy) = (1.53 * half_angle.sin(), 1.53 * half_angle.cos());
    let carbons: Vec<Vector3<f64>> = (0..6)
        .map(|k| Vector3::new(k as f64 * dx, if k % 2 == 1 { dy } else { 0.0 }, 0.0))
        .collect();
    let mut atoms: Vec<Atom> = carbons
        .iter()
        .map(|c| Atom::new(Element::C, [c.x, c.y, c.z]))
        .collect();
    let tetrahedral = 109.47f64.to_radians();
    let mut add_h = |position: Vector3<f64>| {
        atoms.push(Atom::new(Element::H, [position.x, position.y, position.z]));
    };
    for (k, carbon) in carbons.iter().enumerate() {
        let neighbours: Vec<Vector3<f64>> = [k.checked_sub(1), Some(k + 1)]
            .into_iter()
            .flatten()
            .filter(|&j| j < carbons.len())
            .map(|j| (carbons[j] - carbon).normalize())
            .collect();
        if neighbours.len() == 2 {
            // CH2: the two H in the plane normal to the chain, bisecting the H–C–H angle.
            let back = -(neighbours[0] + neighbours[1]).normalize();
            let half = tetrahedral / 2.0;
            for sign in [1.0, -1.0] {
                add_h(carbon + 1.09 * (back * half.cos() + Vector3::z() * sign * half.sin()));
            }
        } else {
            // CH3: three H at the tetrahedral angle from the C–C bond, one in the plane.
            let axis = neighbours[0];
            let e1 = Vector3::z().cross(&axis).normalize();
            let e1 = if e1.dot(&(carbon - carbons[2])) < 0.0 {
                -e1
            } else {
                e1
            };
            for k in 0..3 {
                let phi = (k as f64 * 120.0).to_radians();
                let side = e1 * phi.cos() + Vector3::z() * phi.sin();
                add_h(carbon + 1.09 * (axis * tetrahedral.cos() + side * tetrahedral.sin()));
            }
        }
    }
    Molecule::new("hexane", atoms, 0)
}

fn orbital_map(c: &mut Criterion) {
    let molecule = hexane();
    assert_eq!(molecule.atoms.len(), 20);
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
    let homo = analysis.eht.as_ref().and_then(|e| e.homo()).expect("HOMO");
    let plane = Plane::through_atoms(&molecule, [0, 1, 2]).expect("plane");
    let options = MapOptions {
        points: 256,
        ..MapOptions::default()
    };
    c.bench_function("orbital_map/hexane_homo_256", |b| {
        b.iter(|| {
            compute_map(
                black_box(&analysis),
                OrbitalRef::Canonical(homo),
                black_box(&plane),
                black_box(&options),
            )
            .expect("map")
        })
    });
}

/// The parts of one map: grid values alone and contour lines alone.
fn map_parts(c: &mut Criterion) {
    let molecule = hexane();
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
    let eht = analysis.eht.as_ref().expect("EHT");
    let homo = eht.homo().expect("HOMO");
    let plane = Plane::through_atoms(&molecule, [0, 1, 2]).expect("plane");
    let coefficients: Vec<f64> = eht.coefficients.column(homo).iter().copied().collect();
    let evaluator = OrbitalEvaluator::new(&eht.basis, &coefficients);
    let map = compute_map(
        &analysis,
        OrbitalRef::Canonical(homo),
        &plane,
        &MapOptions {
            points: 256,
            ..MapOptions::default()
        },
    )
    .expect("map");
    let spec = map.grid.spec.clone();
    c.bench_function("orbital_map/hexane_grid_only_256", |b| {
        b.iter(|| Grid::evaluate(black_box(&evaluator), black_box(&plane), black_box(&spec)))
    });
    c.bench_function("orbital_map/hexane_contours_only_256", |b| {
        b.iter(|| {
            DEFAULT_LEVELS
                .iter()
                .map(|&level| {
                    contour_lines(black_box(&map.grid), level).len()
                        + contour_lines(black_box(&map.grid), -level).len()
                })
                .sum::<usize>()
        })
    });
}

criterion_group!(benches, orbital_map, map_parts);
criterion_main!(benches);
