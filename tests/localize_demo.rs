//! Localized orbitals and correlation weights on every demo molecule
//! (demo_molecules/*.xyz through the extended Hückel stage).
//!
//! Checks (reasoning named beside each):
//! - the localized orbitals of each space (doubly, partly occupied, empty) are an
//!   orthogonal rotation U of that space's canonical MOs (b = C̃_space U, over the
//!   orthonormal basis), so w_kj = U_jk² within the space and 0 outside it: rows and
//!   columns add to 1, and each orbital's occupancy Σ_j n_j w_kj is the picture's (1e-8);
//! - completeness: the MOs of the full valence basis satisfy C Cᵀ = S⁻¹ (C̃ C̃ᵀ = 1), so
//!   Σ_j w_kj = 1 for any orbital (1e-8), checked on fixed arbitrary vectors in both
//!   metrics;
//! - the localized ladder is one orthonormal basis of the valence space, so its weights
//!   to the canonical MOs add to 1 both ways (DESIGN §4.6);
//! - the localizer converges, and the ladder's labels are those of the Lewis structure.

use std::path::PathBuf;

use diptych::analysis::{Analysis, Settings};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{DEGENERACY_TOLERANCE_EV, EhtResult, EhtSettings, run};
use diptych::localized::weights::{LINK_THRESHOLD, LevelSets, Links, Metric, link, weights};
use diptych::localized::{LocalizedKind, OrbitalSpace};
use nalgebra::DMatrix;

fn load(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    let text = std::fs::read_to_string(&path).expect("demo geometry");
    parse_xyz(&text, name).expect("valid XYZ").molecule
}

fn demo(name: &str) -> (Molecule, EhtResult) {
    let molecule = load(name);
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

fn space_of(occupation: f64) -> OrbitalSpace {
    if occupation >= 2.0 - 1e-9 {
        OrbitalSpace::Doubly
    } else if occupation <= 1e-9 {
        OrbitalSpace::Virtual
    } else {
        OrbitalSpace::Partly
    }
}

fn sparse_list_adds_up(links: &Links, name: &str) {
    for k in 0..links.weights.nrows() {
        let listed: f64 = links
            .entries
            .iter()
            .filter(|e| e.localized == k)
            .map(|e| e.weight)
            .sum();
        assert!(
            listed > 1.0 - LINK_THRESHOLD * links.sets.len() as f64 && listed <= 1.0 + 1e-8,
            "{name}: orbital {k} listed {listed}"
        );
    }
}

#[test]
fn weights_are_unitary_and_complete_for_every_demo_molecule() {
    for name in demo_names() {
        let molecule = load(&name);
        let analysis = Analysis::run(&molecule, &Settings::default()).expect("analyses");
        let eht = analysis.eht.as_ref().expect("EHT ran");
        let picture = analysis.picture.as_ref().expect("localized picture");
        assert!(
            picture.spaces.iter().all(|s| s.converged),
            "{name}: {:?}",
            picture.spaces
        );
        let n = eht.energies.len();
        assert_eq!(
            picture.vectors.ncols(),
            n,
            "{name}: every valence MO localized"
        );
        let links = link(
            &picture.vectors,
            &eht.orthonormal.coefficients,
            Metric::Orthonormal,
            &eht.occupations,
            LevelSets::ByEnergy {
                energies: &eht.energies,
                tolerance: DEGENERACY_TOLERANCE_EV,
            },
            LINK_THRESHOLD,
        )
        .expect("links");
        let w = &links.weights;
        for (k, orbital) in picture.orbitals.iter().enumerate() {
            let inside: f64 = (0..n)
                .filter(|&j| space_of(eht.occupations[j]) == orbital.space)
                .map(|j| w[(k, j)])
                .sum();
            let all: f64 = w.row(k).sum();
            assert!(
                (inside - 1.0).abs() < 1e-8,
                "{name}: orbital {k} share of its own space {inside}"
            );
            assert!((all - 1.0).abs() < 1e-8, "{name}: orbital {k} total {all}");
            assert!(
                (links.occupancy[k] - orbital.occupancy).abs() < 1e-8,
                "{name}: occupancy {} vs {}",
                links.occupancy[k],
                orbital.occupancy
            );
            if orbital.space == OrbitalSpace::Doubly {
                assert!((orbital.occupancy - 2.0).abs() < 1e-8, "{name}");
                assert!((links.captured[k] - 1.0).abs() < 1e-8, "{name}");
            }
            if orbital.space == OrbitalSpace::Virtual {
                assert!(orbital.occupancy.abs() < 1e-8, "{name}");
                assert!(links.captured[k].abs() < 1e-8, "{name}");
            }
        }
        for j in 0..n {
            let column: f64 = w.column(j).sum();
            assert!(
                (column - 1.0).abs() < 1e-8,
                "{name}: canonical {j} column {column}"
            );
        }
        sparse_list_adds_up(&links, &name);

        // The ladder, over the AOs with S: a partition both ways, and the analysis reports
        // the same captured shares and occupancies.
        let ladder = DMatrix::from_columns(
            &analysis
                .localized
                .iter()
                .map(|o| nalgebra::DVector::from_column_slice(&o.coefficients))
                .collect::<Vec<_>>(),
        );
        assert_eq!(
            ladder.ncols(),
            n,
            "{name}: the ladder spans the valence space"
        );
        let ladder_links = link(
            &ladder,
            &eht.coefficients,
            Metric::Overlap(&eht.overlap),
            &eht.occupations,
            LevelSets::None,
            LINK_THRESHOLD,
        )
        .expect("ladder links");
        for (k, level) in analysis.localized.iter().enumerate() {
            let row: f64 = ladder_links.weights.row(k).sum();
            assert!(
                (row - 1.0).abs() < 1e-8,
                "{name}: {} row {row}",
                level.label
            );
            assert!((ladder_links.captured[k] - level.captured).abs() < 1e-8);
            assert!((ladder_links.occupancy[k] - level.occupancy).abs() < 1e-8);
        }
        for j in 0..n {
            let column: f64 = ladder_links.weights.column(j).sum();
            assert!(
                (column - 1.0).abs() < 1e-8,
                "{name}: MO {j} column {column}"
            );
        }
        sparse_list_adds_up(&ladder_links, &name);
    }
}

/// Fixed arbitrary orbitals (not in the occupied space) still have Σ_j w_kj = 1, over
/// the AOs with S and over the orthonormal basis.
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
        let over_aos =
            weights(&b, &eht.coefficients, Metric::Overlap(&eht.overlap)).expect("weights");
        let orthonormal =
            weights(&b, &eht.orthonormal.coefficients, Metric::Orthonormal).expect("weights");
        for w in [over_aos, orthonormal] {
            for k in 0..5 {
                let total: f64 = w.row(k).sum();
                assert!(
                    (total - 1.0).abs() < 1e-8,
                    "{name}: arbitrary orbital {k}: Σ_j w = {total}"
                );
            }
        }
    }
}

/// The Lewis structures of the demo molecules (textbook counts): the occupied levels of
/// the localized ladder are these bonds, lone pairs and π bonds, and each lone pair sits
/// on its atom alone.
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
        let molecule = load(name);
        let analysis = Analysis::run(&molecule, &Settings::default()).expect("analyses");
        let occupied: Vec<_> = analysis
            .localized
            .iter()
            .filter(|o| o.lewis_occupancy > 1.0)
            .collect();
        let labels: Vec<&String> = occupied.iter().map(|o| &o.label).collect();
        let total: usize = counts.iter().map(|(_, n)| n).sum();
        assert_eq!(occupied.len(), total, "{name}: {labels:?}");
        for (label, n) in counts.iter() {
            let found = occupied.iter().filter(|o| o.label == *label).count();
            assert_eq!(found, *n, "{name}: {label}: {labels:?}");
        }
        for o in &occupied {
            if o.kind == LocalizedKind::LonePair {
                assert_eq!(o.atoms.len(), 1, "{name}: {}", o.label);
            }
        }
    }
}
