//! Criterion benchmarks of the workbench's per-edit work (issue 7), library side:
//! - layout of the Diagram model for 200 levels (target < 0.5 ms);
//! - one step of dragging an atom of a 30-atom molecule: `Analysis::run` on the moved
//!   geometry plus the Diagram layout (target: within one 60 Hz frame, 16.7 ms).
//!
//! The idle-frame cost of the window itself is in benches/frame.rs.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::analysis::{Analysis, Settings};
use diptych::chem::{Atom, Element, Molecule};
use diptych::diagram::{DiagramOptions, LadderInput, LevelInput, LinkInput, diagram_for, layout};

/// A ladder of `count` levels with some degenerate pairs and near-degenerate clusters
/// (what makes label spreading work hard).
fn synthetic_ladder(title: &str, count: usize, key_base: usize) -> LadderInput {
    let mut levels = Vec::with_capacity(count);
    let mut group = key_base;
    for index in 0..count {
        // Every third level joins the previous one's degenerate set; clusters of close
        // levels every tenth.
        if index % 3 != 1 {
            group = key_base + index;
        }
        let cluster = (index / 10) as f64 * 1.1;
        let energy_ev = -35.0 + cluster + (index % 10) as f64 * 0.02;
        levels.push(LevelInput {
            energy_ev,
            occupancy: if index < count / 2 { 2.0 } else { 0.0 },
            label: format!("{}a", index + 1),
            group,
            key: key_base + index,
            shift_ev: 0.0,
        });
    }
    LadderInput {
        title: title.into(),
        levels,
    }
}

fn layout_of_200_levels(c: &mut Criterion) {
    let ladders = [
        synthetic_ladder("Delocalized", 200, 0),
        synthetic_ladder("Localized", 200, 1_000_000),
    ];
    let links: Vec<LinkInput> = (0..200)
        .map(|index| LinkInput {
            localized_key: 1_000_000 + index,
            delocalized_group: ladders[0].levels[index].group,
            weight: 0.5,
        })
        .collect();
    c.bench_function("diagram_layout_200_levels_per_ladder", |b| {
        b.iter(|| layout(black_box(&ladders), black_box(&links), 5.0))
    });
}

/// n-Decane, C10H22 (32 atoms), as an all-anti zigzag with tetrahedral angles
/// (C–C 1.54 Å, C–H 1.09 Å: common practice, no source).
fn decane() -> Molecule {
    let half_angle = (109.47_f64 / 2.0).to_radians();
    let (step_x, step_y) = (1.54 * half_angle.sin(), 1.54 * half_angle.cos());
    let mut atoms = Vec::new();
    let carbons = 10;
    for index in 0..carbons {
        let up = if index % 2 == 0 { 0.0 } else { step_y };
        atoms.push(Atom::new(Element::C, [index as f64 * step_x, up, 0.0]));
    }
    for index in 0..carbons {
        let outward = if index % 2 == 0 { -1.0 } else { 1.0 };
        let [x, y, _] = [
            index as f64 * step_x,
            if index % 2 == 0 { 0.0 } else { step_y },
            0.0,
        ];
        // Two hydrogens above and below the carbon plane, leaning away from the chain.
        for side in [-1.0, 1.0] {
            atoms.push(Atom::new(Element::H, [x, y + outward * 0.63, side * 0.89]));
        }
        if index == 0 || index == carbons - 1 {
            let along = if index == 0 { -1.0 } else { 1.0 };
            atoms.push(Atom::new(
                Element::H,
                [x + along * 1.03, y + outward * 0.36, 0.0],
            ));
        }
    }
    let mut molecule = Molecule::new("decane", atoms, 0);
    molecule.perceive_bonds();
    molecule
}

fn dragging_an_atom(c: &mut Criterion) {
    let settings = Settings::default();
    let base = decane();
    assert_eq!(base.len(), 32);
    let options = DiagramOptions::default();
    let mut step = 0usize;
    let mut group = c.benchmark_group("drag_step");
    group.sample_size(30);
    group.bench_function("decane_32_atoms_analysis_and_layout", |b| {
        b.iter(|| {
            // Each iteration sees a slightly different geometry, as during a drag.
            step += 1;
            let mut moved = base.clone();
            moved.atoms[11].position.y += 0.001 * (step % 50) as f64;
            let analysis = Analysis::run(black_box(&moved), &settings).expect("decane analyses");
            diagram_for(&analysis, &options)
        })
    });
    group.finish();
}

criterion_group!(benches, layout_of_200_levels, dragging_an_atom);
criterion_main!(benches);
