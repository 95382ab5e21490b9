//! Point-group detection plus orbital labelling (DESIGN §4.2 speed targets: ammonia
//! < 0.2 ms, benzene < 2 ms, C60 < 20 ms). Orbitals come from a random Hamiltonian averaged
//! over the group (valence s, p basis), prepared outside the timed loop.

#[path = "../tests/symmetry_support/mod.rs"]
mod support;

use criterion::{Criterion, criterion_group, criterion_main};
use diptych::chem::Molecule;
use diptych::symmetry::{Numbering, SymmetrySettings, detect, label_orbitals};
use nalgebra::DMatrix;
use std::hint::black_box;

fn case(c: &mut Criterion, name: &str, m: Molecule) {
    let settings = SymmetrySettings::default();
    let sym = detect(&m, &settings).expect("symmetric test molecule");
    let basis = support::valence_basis(&m);
    let (coefficients, energies) = support::invariant_orbitals(&sym, &basis, 11);
    let overlap = DMatrix::identity(basis.len(), basis.len());
    c.bench_function(&format!("detect+label {name}"), |b| {
        b.iter(|| {
            let sym = detect(black_box(&m), &settings).expect("detects");
            let labels = label_orbitals(
                &sym,
                &m,
                &basis,
                &coefficients,
                &energies,
                &overlap,
                Numbering::CoreInclusive,
            );
            black_box(labels)
        })
    });
    c.bench_function(&format!("detect {name}"), |b| {
        b.iter(|| black_box(detect(black_box(&m), &settings).expect("detects")))
    });
}

fn benches(c: &mut Criterion) {
    case(c, "ammonia", support::ammonia());
    case(c, "benzene", support::benzene());
    case(c, "C60", support::c60());
}

criterion_group!(symmetry, benches);
criterion_main!(symmetry);
