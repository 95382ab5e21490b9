//! Equivariance of the hybrids under the molecule's point group: every operation that
//! carries atom c to c' and partner p to p' must carry the hybrid of c toward p onto the
//! hybrid of c' toward p' (same λ, rotated direction). The operations come from the
//! symmetry engine (detection of the point group, DESIGN §4.2); the demo geometries are
//! symmetric to the rounding of their coordinates (1e-8 Å), hence the tight tolerances.
//! Checked for the geometric and maximum-overlap models and for the default model (the
//! hybrids read from the localized orbitals of the wavefunction).

use std::path::PathBuf;

use diptych::analysis::{Analysis, HybridEntry, Settings};
use diptych::chem::Molecule;
use diptych::chem::io::xyz::parse_xyz;
use diptych::hybrid::{CentreHybrids, HybridKind, HybridModel, HybridSettings};
use diptych::localized::LocalizedKind;
use diptych::symmetry::{Symmetry, SymmetrySettings, detect};
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

fn run(molecule: &Molecule, model: HybridModel) -> Analysis {
    let settings = Settings {
        hybrid: HybridSettings {
            model,
            ..HybridSettings::default()
        },
        ..Settings::default()
    };
    Analysis::run(molecule, &settings).expect("analyses")
}

/// Equivalent bonds have equal ladder energies.
fn check_ladder(path: &PathBuf, model: HybridModel, analysis: &Analysis, symmetry: &Symmetry) {
    for orbital in &analysis.localized {
        if orbital.kind != LocalizedKind::Bond {
            continue;
        }
        for op in &symmetry.operations {
            let mut image: Vec<usize> = orbital.atoms.iter().map(|&a| op.permutation[a]).collect();
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
            assert!(
                (partner.energy_ev - orbital.energy_ev).abs() < 1e-4,
                "{path:?} {model:?}: {} {} vs {}",
                orbital.label,
                orbital.energy_ev,
                partner.energy_ev
            );
        }
    }
}

#[test]
fn model_hybrids_follow_the_point_group() {
    let mut checked = 0;
    for path in geometries() {
        let molecule = load(path.clone());
        let symmetry = detect(&molecule, &SymmetrySettings::default()).expect("point group");
        assert!(symmetry.operations.len() > 1, "{path:?}");
        for model in [HybridModel::Geometric, HybridModel::MaxOverlap] {
            let analysis = run(&molecule, model);
            let hybrids = analysis.hybrids.as_ref().expect("hybrid stage");
            for op in &symmetry.operations {
                // A centre the model skips has skipped images too.
                for atom in 0..molecule.atoms.len() {
                    assert_eq!(
                        hybrids.centre(atom).is_some(),
                        hybrids.centre(op.permutation[atom]).is_some(),
                        "{path:?} {model:?}: atom {atom}"
                    );
                }
                for centre in &hybrids.centres {
                    let image = hybrids
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
                    let s_rich = |c: &CentreHybrids| {
                        c.hybrids
                            .iter()
                            .filter(|h| h.kind == HybridKind::LonePair)
                            .map(|h| h.s_percent)
                            .fold(0.0, f64::max)
                    };
                    assert!((s_rich(centre) - s_rich(image)).abs() < 1e-4);
                }
            }
            check_ladder(&path, model, &analysis, &symmetry);
        }
    }
    assert!(checked > 0);
}

/// The classes in which hybrids are compared. With `merge_pi`, π and multicentre hybrids
/// are one class: a localized picture of a resonance π system (benzene's) must read some
/// atoms' π orbitals as two-centre π bonds and others as multicentre units, since no
/// Kekulé structure has the point group's symmetry; the hybrids themselves are pure p
/// either way.
fn classes(merge_pi: bool) -> Vec<Vec<HybridKind>> {
    let mut out = vec![
        vec![HybridKind::Bond],
        vec![HybridKind::LonePair],
        vec![HybridKind::SingleElectron],
        vec![HybridKind::Vacant],
    ];
    if merge_pi {
        out.push(vec![HybridKind::Pi, HybridKind::Multicentre]);
    } else {
        out.push(vec![HybridKind::Pi]);
        out.push(vec![HybridKind::Multicentre]);
    }
    out
}

/// The s percentages of an atom's hybrids of one class, sorted.
fn s_shares(entries: &[HybridEntry], atom: usize, class: &[HybridKind]) -> Vec<f64> {
    let mut shares: Vec<f64> = entries
        .iter()
        .filter(|e| e.center == atom && class.contains(&e.kind))
        .map(|e| e.s_percent)
        .collect();
    shares.sort_by(f64::total_cmp);
    shares
}

/// The default model's hybrids of symmetry-equivalent atoms are the same: the same s
/// shares class by class (λ equal), bond hybrids mapped onto the image bond with the
/// rotated direction. Lone pairs of one atom can be a degenerate set (rotated among
/// themselves by the localization), so they are compared as sorted lists. Returns the
/// number of bond hybrids mapped.
fn check_wavefunction_hybrids(label: &str, molecule: &Molecule, merge_pi: bool) -> usize {
    let symmetry = detect(molecule, &SymmetrySettings::default()).expect("point group");
    let analysis = run(molecule, HybridModel::Localized);
    let entries = &analysis.hybrid_entries;
    assert!(
        entries.iter().all(|e| e.model == HybridModel::Localized),
        "{label}"
    );
    let mut checked = 0;
    for op in &symmetry.operations {
        for atom in 0..molecule.atoms.len() {
            let image = op.permutation[atom];
            for class in classes(merge_pi) {
                let (a, b) = (
                    s_shares(entries, atom, &class),
                    s_shares(entries, image, &class),
                );
                assert_eq!(a.len(), b.len(), "{label}: {class:?} on {atom} vs {image}");
                for (x, y) in a.iter().zip(&b) {
                    assert!(
                        (x - y).abs() < 1e-4,
                        "{label}: {class:?} s share on atom {atom} {x} vs atom {image} {y}"
                    );
                }
            }
            for h in entries
                .iter()
                .filter(|e| e.center == atom && e.kind == HybridKind::Bond)
            {
                let partner = op.permutation[h.partner.unwrap()];
                let g = entries
                    .iter()
                    .find(|g| {
                        g.center == image
                            && g.kind == HybridKind::Bond
                            && g.partner == Some(partner)
                    })
                    .expect("image bond");
                assert!(
                    (h.s_percent - g.s_percent).abs() < 1e-4,
                    "{label}: bond s share {} vs {}",
                    h.s_percent,
                    g.s_percent
                );
                let rotated = op.matrix * Vector3::from(h.direction);
                let deviation = (rotated - Vector3::from(g.direction)).norm();
                assert!(deviation < 1e-4, "{label}: direction {deviation}");
                checked += 1;
            }
        }
    }
    checked
}

#[test]
fn wavefunction_hybrids_follow_the_point_group() {
    let mut checked = 0;
    for path in geometries() {
        let molecule = load(path.clone());
        checked += check_wavefunction_hybrids(&format!("{path:?}"), &molecule, false);
        let symmetry = detect(&molecule, &SymmetrySettings::default()).expect("point group");
        let analysis = run(&molecule, HybridModel::Localized);
        check_ladder(&path, HybridModel::Localized, &analysis, &symmetry);
    }
    assert!(checked > 0);
}

/// The RDKit reference geometries (tests/reference/rdkit_geometries/, force-field
/// minima, symmetric only to about 1e-3 Å), made exactly symmetric by the symmetry
/// engine's Symmetrize (the average over the point group), except C60 (below).
fn symmetrized_reference(name: &str) -> Molecule {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR"))
        .join("tests/reference/rdkit_geometries")
        .join(format!("{name}.xyz"));
    let raw = load(path);
    let symmetry = detect(&raw, &SymmetrySettings::default()).expect("point group");
    diptych::symmetry::symmetrize(&raw, &symmetry)
}

#[test]
fn wavefunction_hybrids_follow_the_point_group_of_the_reference_geometries() {
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/reference/rdkit_geometries");
    let mut names: Vec<String> = std::fs::read_dir(dir)
        .expect("reference directory")
        .filter_map(|e| {
            let path = e.ok()?.path();
            (path.extension()? == "xyz").then(|| path.file_stem()?.to_str().map(String::from))?
        })
        .filter(|name| name != "c60")
        .collect();
    names.sort();
    assert!(names.len() > 30);
    let mut checked = 0;
    for name in &names {
        checked += check_wavefunction_hybrids(name, &symmetrized_reference(name), true);
    }
    assert!(checked > 100, "{checked}");
}

/// C60 (Ih) has a Lewis structure with its full symmetry (the 30 double bonds on the
/// hexagon–hexagon edges), yet the localized picture reads it with three-centre units and
/// over-complete atoms that differ between equivalent carbons: σ hybrid s shares differ
/// by up to 9 percentage points (found). Reported; kept as a check to turn on.
#[test]
#[ignore = "C60's localized picture breaks Ih (σ hybrid s shares of equivalent carbons differ by up to 9 points); reported to the lead"]
fn c60_wavefunction_hybrids_follow_ih() {
    check_wavefunction_hybrids("c60", &symmetrized_reference("c60"), true);
}
