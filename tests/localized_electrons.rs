//! The localized picture holds every electron of every molecule, and its ladder is one
//! orthonormal basis of the valence space, so the correlation weights are a partition both
//! ways (DESIGN §4.6; the identities below are exact linear algebra, no outside source).
//! Molecules: every file of demo_molecules/, tests/hard_molecules/ (open shells, ions,
//! hypervalent and electron-deficient molecules, single atoms, metals) and the RDKit
//! reference geometries, and the pymatgen point-group set.

mod localized_support;

use diptych::analysis::Analysis;
use diptych::chem::Molecule;
use diptych::localized::OrbitalSpace;
use localized_support::*;
use nalgebra::DMatrix;

/// Every molecule of the test sets that has extended Hückel parameters.
fn all_molecules() -> Vec<Molecule> {
    let mut molecules: Vec<Molecule> = [
        "demo_molecules",
        "tests/hard_molecules",
        "tests/reference/rdkit_geometries",
    ]
    .iter()
    .flat_map(|folder| xyz_files(folder))
    .map(|path| load(&path))
    .collect();
    molecules.extend(pymatgen_molecules());
    molecules
}

/// The ladder's vectors over the orthonormal basis (rebuilt from the AO coefficients:
/// b̃ = S^½ b).
fn ladder_vectors(analysis: &Analysis) -> DMatrix<f64> {
    let eht = analysis.eht.as_ref().unwrap();
    let n = eht.basis.len();
    let ao = DMatrix::from_fn(n, analysis.localized.len(), |mu, k| {
        analysis.localized[k].coefficients[mu]
    });
    diptych::localized::orthonormal::to_orthonormal(
        &eht.overlap,
        &eht.orthonormal.orthogonalizer,
        &ao,
    )
}

#[test]
fn every_molecule_keeps_all_its_electrons() {
    let molecules = all_molecules();
    assert!(molecules.len() >= 190, "only {} molecules", molecules.len());
    let mut checked = 0;
    for molecule in &molecules {
        let analysis = analyse(molecule);
        let Some(picture) = &analysis.picture else {
            // Only a missing parameter set may stop the MOs (and so the picture).
            assert!(
                analysis
                    .errors
                    .iter()
                    .any(|e| e.message.contains("no extended Hückel parameters")),
                "{}: no localized picture: {:?}",
                molecule.name,
                analysis.errors
            );
            continue;
        };
        let electrons = analysis.electrons as f64;
        let ladder: f64 = analysis.localized.iter().map(|l| l.occupancy).sum();
        let lewis: f64 = analysis.localized.iter().map(|l| l.lewis_occupancy).sum();
        let orbitals: f64 = picture.orbitals.iter().map(|o| o.occupancy).sum();
        assert!(
            (ladder - electrons).abs() < 1e-6,
            "{}: ladder holds {ladder} of {electrons}",
            molecule.name
        );
        assert!(
            (lewis - electrons).abs() < 1e-6,
            "{}: Lewis occupancies {lewis} of {electrons}",
            molecule.name
        );
        assert!(
            (orbitals - electrons).abs() < 1e-6,
            "{}: localized orbitals {orbitals} of {electrons}",
            molecule.name
        );
        let charges: f64 = picture.lewis.formal_charges.iter().sum();
        assert!(
            (charges - f64::from(molecule.charge)).abs() < 1e-6,
            "{}: formal charges add to {charges}",
            molecule.name
        );
        // The ladder has one level per valence function.
        assert_eq!(
            analysis.localized.len(),
            analysis.eht.as_ref().unwrap().basis.len(),
            "{}",
            molecule.name
        );
        checked += 1;
    }
    assert!(
        checked >= 185,
        "only {checked} molecules had a localized picture"
    );
}

#[test]
fn doubly_occupied_orbitals_hold_two_and_empty_ones_none() {
    for name in [
        "dioxygen_triplet",
        "nitric_oxide",
        "methyl_radical",
        "sulfur_hexafluoride",
        "nitrogen_atom",
    ] {
        let analysis = analyse(&hard(name));
        for orbital in &analysis.picture.as_ref().unwrap().orbitals {
            match orbital.space {
                OrbitalSpace::Doubly => assert!((orbital.occupancy - 2.0).abs() < 1e-9, "{name}"),
                OrbitalSpace::Virtual => assert!(orbital.occupancy.abs() < 1e-9, "{name}"),
                OrbitalSpace::Partly => {
                    assert!(orbital.occupancy > 0.0 && orbital.occupancy < 2.0, "{name}")
                }
            }
        }
    }
}

#[test]
fn ladder_is_an_orthonormal_basis_and_weights_partition_both_ways() {
    let names = [
        "dioxygen_triplet",
        "nitric_oxide",
        "sulfur_hexafluoride",
        "diborane",
        "carbon_dioxide",
        "ozone",
        "benzene",
        "trihydrogen_cation",
        "chlorine_trifluoride",
        "dodecaborate",
        "lithium_fluoride",
    ];
    for name in names {
        let analysis = analyse(&hard(name));
        let eht = analysis.eht.as_ref().unwrap();
        let b = ladder_vectors(&analysis);
        let n = b.ncols();
        assert!(
            (b.transpose() * &b - DMatrix::identity(n, n)).amax() < 1e-9,
            "{name}: not orthonormal"
        );
        let w = (b.transpose() * &eht.orthonormal.coefficients).map(|x| x * x);
        for k in 0..n {
            let row: f64 = w.row(k).sum();
            assert!(
                (row - 1.0).abs() < 1e-9,
                "{name}: level {k} weights add to {row}"
            );
        }
        for j in 0..w.ncols() {
            let column: f64 = w.column(j).sum();
            assert!(
                (column - 1.0).abs() < 1e-9,
                "{name}: MO {j} weights add to {column}"
            );
        }
        // The reported links are these weights (above 1e-4), summed over degenerate sets.
        let listed: f64 = analysis.links.iter().map(|l| l.weight).sum();
        assert!(
            (listed - n as f64).abs() < 1e-4 * (n * n) as f64,
            "{name}: links add to {listed}"
        );
    }
}
