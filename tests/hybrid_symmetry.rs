//! Equivariance of the hybrids under the molecule's point group: every operation that
//! carries atom c to c' and partner p to p' must carry the hybrid of c toward p onto the
//! hybrid of c' toward p' (same λ, rotated direction). The operations come from the
//! symmetry engine (detection of the point group, DESIGN §4.2); the demo geometries are
//! symmetric to the rounding of their coordinates (1e-8 Å), hence the tight tolerances.

use std::path::PathBuf;

use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::eht::{EhtSettings, run};
use diptych::hybrid::{HybridKind, HybridModel, HybridSettings, LocalizedKind, analyze};
use diptych::symmetry::{SymmetrySettings, detect};
use nalgebra::Vector3;

fn load(path: PathBuf) -> Molecule {
    let text = std::fs::read_to_string(&path).expect("geometry");
    parse_xyz(&text, "test").expect("valid XYZ").molecule
}

fn geometries() -> Vec<PathBuf> {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let mut paths: Vec<PathBuf> = std::fs::read_dir(root.join("demo_molecules"))
        .expect("demo directory")
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "xyz"))
        .collect();
    paths.sort();
    paths
}

#[test]
fn hybrids_follow_the_point_group() {
    for path in geometries() {
        let molecule = load(path.clone());
        let symmetry = detect(&molecule, &SymmetrySettings::default()).expect("point group");
        assert!(symmetry.operations.len() > 1, "{path:?}");
        let eht = run(&molecule, &EhtSettings::default()).unwrap();
        for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
            let settings = HybridSettings {
                model,
                ..HybridSettings::default()
            };
            let analysis = analyze(&molecule, &eht, &settings);
            let mut checked = 0;
            for op in &symmetry.operations {
                for centre in &analysis.centres {
                    let image = analysis
                        .centre(op.permutation[centre.atom])
                        .expect("equivalent atoms are both centres");
                    for h in centre.hybrids.iter().filter(|h| h.kind == HybridKind::Bond) {
                        let partner = op.permutation[h.partner.unwrap()];
                        let g = image
                            .hybrids
                            .iter()
                            .find(|g| g.kind == HybridKind::Bond && g.partner == Some(partner))
                            .expect("image bond");
                        assert!(
                            (h.s_percent - g.s_percent).abs() < 1e-4,
                            "{path:?} {model:?}: s share {} vs {}",
                            h.s_percent,
                            g.s_percent
                        );
                        let rotated = op.matrix * Vector3::from(h.direction);
                        let deviation = (rotated - Vector3::from(g.direction)).norm();
                        assert!(
                            deviation < 1e-4,
                            "{path:?} {model:?}: direction {deviation}"
                        );
                        checked += 1;
                    }
                    // The richest-in-s lone pair is unique (non-degenerate) and must map too.
                    let s_rich = |c: &diptych::hybrid::CentreHybrids| {
                        c.hybrids
                            .iter()
                            .filter(|h| h.kind == HybridKind::LonePair)
                            .map(|h| h.s_percent)
                            .fold(0.0, f64::max)
                    };
                    assert!((s_rich(centre) - s_rich(image)).abs() < 1e-4);
                }
            }
            assert!(checked > 0);
            // Equivalent bonds have equal localized energies.
            for orbital in &analysis.localized {
                if orbital.kind != LocalizedKind::Bond {
                    continue;
                }
                for op in &symmetry.operations {
                    let mut image: Vec<usize> =
                        orbital.atoms.iter().map(|&a| op.permutation[a]).collect();
                    image.sort_unstable();
                    let partner = analysis
                        .localized
                        .iter()
                        .find(|o| {
                            o.kind == LocalizedKind::Bond && {
                                let mut atoms = o.atoms.clone();
                                atoms.sort_unstable();
                                atoms == image
                            }
                        })
                        .expect("image bond orbital");
                    assert!((partner.energy_ev - orbital.energy_ev).abs() < 1e-4);
                }
            }
        }
    }
}
