//! Pipek–Mezey orbitals and correlation weights on every demo molecule
//! (demo_molecules/*.xyz through the extended Hückel stage).
//!
//! Checks (reasoning named beside each):
//! - PM orbitals are an orthogonal rotation U of the occupied MOs (b = C_occ U), so
//!   w_kj = U_jk² for occupied j: rows and columns of the occupied block add to 1 (1e-8);
//! - completeness: the MOs of the full valence basis satisfy C Cᵀ = S⁻¹, so Σ_j w_kj = 1 for
//!   any orbital (1e-8), checked on PM orbitals and on fixed arbitrary vectors;
//! - the localizer converges and the labels are those of the Lewis structure.

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{DEGENERACY_TOLERANCE_EV, EhtResult, EhtSettings, run};
use diptych::link::{LINK_THRESHOLD, LevelSets, link, weights};
use diptych::localize::{LocalizeOptions, LocalizedKind, describe, localize_occupied};
use nalgebra::DMatrix;

fn demo(name: &str) -> (Molecule, EhtResult) {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("demo geometry");
    let molecule = parse_xyz(&text, name).expect("valid XYZ").molecule;
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    (molecule, eht)
}

fn demo_names() -> Vec<String> {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules");
    let mut names: Vec<String> = std::fs::read_dir(dir)
        .expect("demo directory")
        .filter_map(|e| {
            let name = e.ok()?.file_name().into_string().ok()?;
            name.strip_suffix(".xyz").map(str::to_owned)
        })
        .collect();
    names.sort();
    assert!(names.len() >= 11, "demo molecules: {names:?}");
    names
}

#[test]
fn weights_are_unitary_and_complete_for_every_demo_molecule() {
    for name in demo_names() {
        let (molecule, eht) = demo(&name);
        let localized = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
        assert!(localized.converged, "{name}: not converged");
        let links = link(
            &localized.orbitals,
            &eht.coefficients,
            &eht.overlap,
            &eht.occupations,
            LevelSets::ByEnergy {
                energies: &eht.energies,
                tolerance: DEGENERACY_TOLERANCE_EV,
            },
            LINK_THRESHOLD,
        )
        .expect("links");
        let occupied: Vec<usize> = (0..eht.energies.len())
            .filter(|&j| eht.occupations[j] > 0.0)
            .collect();
        let w = &links.weights;
        for k in 0..w.nrows() {
            let occ: f64 = occupied.iter().map(|&j| w[(k, j)]).sum();
            let all: f64 = w.row(k).sum();
            assert!(
                (occ - 1.0).abs() < 1e-8,
                "{name}: orbital {k} occupied share {occ}"
            );
            assert!((all - 1.0).abs() < 1e-8, "{name}: orbital {k} total {all}");
            assert!((links.captured[k] - 1.0).abs() < 1e-8);
            // Closed shell: each PM orbital holds two electrons.
            assert!((links.occupancy[k] - 2.0).abs() < 1e-8, "{name}: occupancy");
            // Sparse list: the set weights above the threshold add to ~1.
            let listed: f64 = links
                .entries
                .iter()
                .filter(|e| e.localized == k)
                .map(|e| e.weight)
                .sum();
            assert!(
                listed > 1.0 - LINK_THRESHOLD * links.sets.len() as f64 && listed <= 1.0 + 1e-8
            );
        }
        for &j in &occupied {
            let column: f64 = w.column(j).sum();
            assert!(
                (column - 1.0).abs() < 1e-8,
                "{name}: canonical {j} column {column}"
            );
        }
        let described = describe(
            &localized.orbitals,
            &eht.overlap,
            &eht.hamiltonian,
            &eht.basis,
            &molecule,
        )
        .expect("describe");
        let labels: Vec<String> = described
            .iter()
            .map(|d| format!("{} {:.2} eV", d.label, d.energy_ev))
            .collect();
        eprintln!(
            "{name}: P = {:.6} in {} sweeps; {labels:?}",
            localized.function_value, localized.sweeps
        );
    }
}

/// Fixed arbitrary orbitals (not in the occupied space) still have Σ_j w_kj = 1.
#[test]
fn completeness_for_arbitrary_orbitals() {
    for name in ["ammonia", "formaldehyde", "cyclopropane", "chloromethane"] {
        let (_, eht) = demo(name);
        let n = eht.overlap.nrows();
        let mut state: u64 = 12345;
        let b = DMatrix::from_fn(n, 5, |_, _| {
            state = state
                .wrapping_mul(6_364_136_223_846_793_005)
                .wrapping_add(1);
            (state >> 11) as f64 / (1u64 << 53) as f64 - 0.5
        });
        let w = weights(&b, &eht.coefficients, &eht.overlap).expect("weights");
        for k in 0..5 {
            let total: f64 = w.row(k).sum();
            assert!(
                (total - 1.0).abs() < 1e-8,
                "{name}: arbitrary orbital {k}: Σ_j w = {total}"
            );
        }
    }
}

/// The Lewis structures of the demo molecules (textbook counts): bonds, lone pairs, π bonds.
#[test]
fn demo_labels_follow_the_lewis_structure() {
    let expected: &[(&str, &[(&str, usize)])] = &[
        ("ammonia", &[("σ(N–H)", 3), ("n(N)", 1)]),
        ("water", &[("σ(O–H)", 2), ("n(O)", 2)]),
        ("methane", &[("σ(C–H)", 4)]),
        ("ethylene", &[("σ(C–H)", 4), ("σ(C–C)", 1), ("π(C–C)", 1)]),
        (
            "formaldehyde",
            &[("σ(C–H)", 2), ("σ(C–O)", 1), ("π(C–O)", 1), ("n(O)", 2)],
        ),
        (
            "hydrogen_cyanide",
            &[("σ(C–H)", 1), ("σ(C–N)", 1), ("π(C–N)", 2), ("n(N)", 1)],
        ),
    ];
    for (name, counts) in expected {
        let (molecule, eht) = demo(name);
        let localized = localize_occupied(&eht, &LocalizeOptions::default()).expect("localizes");
        let described = describe(
            &localized.orbitals,
            &eht.overlap,
            &eht.hamiltonian,
            &eht.basis,
            &molecule,
        )
        .expect("describe");
        let total: usize = counts.iter().map(|(_, n)| n).sum();
        assert_eq!(described.len(), total, "{name}");
        for (label, n) in counts.iter() {
            let found = described.iter().filter(|d| d.label == *label).count();
            assert_eq!(
                found,
                *n,
                "{name}: {label}: {:?}",
                described.iter().map(|d| &d.label).collect::<Vec<_>>()
            );
        }
        for d in &described {
            if d.kind == LocalizedKind::LonePair {
                assert_eq!(d.hybrids.len(), 1);
            }
        }
    }
}
