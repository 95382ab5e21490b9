//! Bad and degenerate input for the localizer, the localized picture and the links: a
//! deterministic answer or a typed error, never a hang or a panic (issue 6, "Bad input").

use std::path::PathBuf;

use diptych::analysis::{Analysis, AnalysisError, Settings, Stage};
use diptych::chem::ao::AngularKind;
use diptych::chem::io::xyz::parse_xyz;
use diptych::chem::{Atom, Element, Molecule};
use diptych::eht::{EhtSettings, run};
use diptych::localized::localize::{
    LocalizationMethod, LocalizationOptions, localization_function, localize,
};
use diptych::localized::weights::{LINK_THRESHOLD, LevelSets, LinkError, Metric, link, weights};
use diptych::localized::{
    self, AtomLayout, LocalizationSettings, LocalizedError, OrbitalClass, OrbitalSpace,
};
use nalgebra::DMatrix;

fn atom(symbol: &str, position: [f64; 3]) -> Atom {
    Atom::new(Element::from_symbol(symbol).expect("element"), position)
}

fn one_function_atoms(count: usize) -> AtomLayout {
    let map: Vec<usize> = (0..count).collect();
    AtomLayout::from_atom_map(&map, vec![AngularKind::S; count]).expect("layout")
}

#[test]
fn no_orbitals_to_localize() {
    let layout = AtomLayout::from_atom_map(&[0, 0, 1, 1], vec![AngularKind::S; 4]).unwrap();
    let c = DMatrix::zeros(4, 0);
    for method in [
        LocalizationMethod::IntrinsicBond,
        LocalizationMethod::PipekMezey,
    ] {
        let options = LocalizationOptions {
            method,
            ..Default::default()
        };
        let result = localize(&c, &layout, &options);
        assert_eq!(result.orbitals.ncols(), 0);
        assert_eq!(result.function_value, 0.0);
        assert!(result.converged);
        assert_eq!(result.sweeps, 0);
    }
    let s = DMatrix::identity(4, 4);
    let canonical = DMatrix::identity(4, 4);
    for metric in [Metric::Overlap(&s), Metric::Orthonormal] {
        let links = link(
            &c,
            &canonical,
            metric,
            &[0.0; 4],
            LevelSets::None,
            LINK_THRESHOLD,
        )
        .expect("empty links");
        assert!(links.entries.is_empty());
        assert_eq!(links.weights.nrows(), 0);
    }
}

#[test]
fn molecules_without_occupied_orbitals_do_not_panic() {
    // No electrons at all: the molecule is refused with a typed error before any stage.
    let bare = Molecule::new(
        "H2 2+",
        vec![atom("H", [0.0; 3]), atom("H", [0.74, 0.0, 0.0])],
        2,
    );
    assert!(matches!(
        Analysis::run(&bare, &Settings::default()),
        Err(AnalysisError::InvalidMolecule(_))
    ));
    // A solution whose orbitals are all empty: only the virtual space is localized.
    let h2 = Molecule::new(
        "H2",
        vec![atom("H", [0.0; 3]), atom("H", [0.74, 0.0, 0.0])],
        0,
    );
    let mut eht = run(&h2, &EhtSettings::default()).expect("EHT runs");
    eht.occupations.iter_mut().for_each(|n| *n = 0.0);
    let picture = localized::analyze(&h2, &eht, &LocalizationSettings::default()).expect("picture");
    assert_eq!(picture.spaces.len(), 1);
    assert_eq!(picture.spaces[0].space, OrbitalSpace::Virtual);
    assert_eq!(picture.orbitals.len(), 2);
    assert!(picture.orbitals.iter().all(|o| o.occupancy == 0.0));
    assert!(picture.lewis.bonds.iter().all(|b| b.order == 0.0));
}

/// One atom: every rotation among its orbitals leaves the populations unchanged (each
/// orbital is wholly on the atom), so the function is flat, nothing needs rotating, and
/// each localized orbital is a one-centre orbital.
#[test]
fn single_atoms_are_left_as_they_are() {
    for symbol in ["H", "N", "O", "Cl", "P"] {
        let molecule = Molecule::new(symbol, vec![atom(symbol, [0.0; 3])], 0);
        let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
        let settings = LocalizationSettings::default();
        let first = localized::analyze(&molecule, &eht, &settings).expect("localizes");
        let second = localized::analyze(&molecule, &eht, &settings).expect("localizes");
        assert_eq!(first, second, "{symbol}: deterministic");
        assert_eq!(first.vectors, second.vectors, "{symbol}: deterministic");
        assert!(!first.spaces.is_empty());
        for space in &first.spaces {
            assert!(space.converged, "{symbol}: {space:?}");
            assert!(space.sweeps <= 1, "{symbol}: {} sweeps", space.sweeps);
            // F_p = Σ_i q_A(i)^p with q_A = 1 for every orbital.
            assert!(
                (space.function_value - space.orbitals as f64).abs() < 1e-12,
                "{symbol}: {space:?}"
            );
        }
        assert!(
            first
                .orbitals
                .iter()
                .all(|o| o.class == OrbitalClass::OneCentre && o.centres == vec![0])
        );
    }
}

/// Many equivalent maxima: six well-separated H2 molecules on a ring (every canonical MO
/// delocalized over all of them; degenerate sets) and a neon-like closed shell of lone
/// pairs (F⁻). Deterministic, converged, and the H2 bonds are found.
#[test]
fn many_degenerate_rotations() {
    let mut atoms = Vec::new();
    for k in 0..6 {
        let phi = std::f64::consts::PI * k as f64 / 3.0;
        let (x, y) = (6.0 * phi.cos(), 6.0 * phi.sin());
        atoms.push(atom("H", [x, y, 0.37]));
        atoms.push(atom("H", [x, y, -0.37]));
    }
    let molecule = Molecule::new("(H2)6", atoms, 0);
    let eht = run(&molecule, &EhtSettings::default()).expect("EHT runs");
    let settings = LocalizationSettings::default();
    let a = localized::analyze(&molecule, &eht, &settings).expect("localizes");
    let b = localized::analyze(&molecule, &eht, &settings).expect("localizes");
    assert_eq!(a, b);
    assert!(a.spaces.iter().all(|s| s.converged), "{:?}", a.spaces);
    let doubly: Vec<_> = a
        .orbitals
        .iter()
        .filter(|o| o.space == OrbitalSpace::Doubly)
        .collect();
    assert_eq!(doubly.len(), 6);
    for o in doubly {
        let mut centres = o.centres.clone();
        centres.sort_unstable();
        assert_eq!(centres.len(), 2, "{o:?}");
        assert_eq!(
            centres[0] / 2,
            centres[1] / 2,
            "one H2 molecule: {centres:?}"
        );
        assert!(!o.antibonding);
    }
    let fluoride = Molecule::new("F-", vec![atom("F", [0.0; 3])], -1);
    let eht = run(&fluoride, &EhtSettings::default()).expect("EHT runs");
    let f = localized::analyze(&fluoride, &eht, &settings).expect("localizes");
    assert!(f.spaces.iter().all(|s| s.converged));
    assert_eq!(f.orbitals.len(), 4);
    assert!(f.orbitals.iter().all(|o| o.space == OrbitalSpace::Doubly));
}

#[test]
fn sweep_cap_reports_non_convergence() {
    // Two one-function atoms, orbitals (a ± b)/√2: both populations ½, so F_2 = 1 and
    // F_4 = ¼. The Cholesky start alone gives a and b (F = 2), converged at once.
    let layout = one_function_atoms(2);
    let h = std::f64::consts::FRAC_1_SQRT_2;
    let c = DMatrix::from_row_slice(2, 2, &[h, h, h, -h]);
    assert!((localization_function(&c, &layout, 2) - 1.0).abs() < 1e-12);
    assert!((localization_function(&c, &layout, 4) - 0.25).abs() < 1e-12);
    let r = localize(&c, &layout, &LocalizationOptions::default());
    assert!(r.converged);
    assert!((r.function_value - 2.0).abs() < 1e-12);
    // Ammonia's occupied space needs several sweeps: capped at one (or none), the result
    // says it did not converge; through the pipeline, a note says so.
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz");
    let molecule = parse_xyz(&std::fs::read_to_string(path).unwrap(), "ammonia")
        .unwrap()
        .molecule;
    let eht = run(&molecule, &EhtSettings::default()).unwrap();
    let layout = AtomLayout::of(&eht);
    let occupied: Vec<usize> = (0..eht.occupations.len())
        .filter(|&k| eht.occupations[k] > 1.0)
        .collect();
    let c = eht.orthonormal.coefficients.select_columns(&occupied);
    for max_sweeps in [0, 1] {
        let options = LocalizationOptions {
            max_sweeps,
            ..Default::default()
        };
        let capped = localize(&c, &layout, &options);
        assert!(!capped.converged, "{max_sweeps} sweeps");
        assert_eq!(capped.sweeps, max_sweeps);
    }
    let full = localize(&c, &layout, &LocalizationOptions::default());
    assert!(full.converged && full.sweeps > 1, "{} sweeps", full.sweeps);
    let mut settings = Settings::default();
    settings.localization.max_sweeps = 1;
    let analysis = Analysis::run(&molecule, &settings).unwrap();
    let picture = analysis.picture.as_ref().expect("picture");
    assert!(picture.spaces.iter().any(|s| !s.converged));
    assert!(
        analysis
            .notes
            .iter()
            .any(|n| n.stage == Stage::Localization && n.message.contains("without converging")),
        "{:?}",
        analysis.notes
    );
}

#[test]
fn malformed_matrices_are_typed_errors() {
    let s = DMatrix::identity(3, 3);
    let c = DMatrix::identity(3, 2);
    let mut bad = c.clone();
    bad[(0, 0)] = f64::NAN;
    assert!(matches!(
        weights(&bad, &s, Metric::Overlap(&s)),
        Err(LinkError::NonFinite)
    ));
    assert!(matches!(
        weights(&bad, &s, Metric::Orthonormal),
        Err(LinkError::NonFinite)
    ));
    let mut bad_s = s.clone();
    bad_s[(1, 2)] = f64::INFINITY;
    assert!(matches!(
        weights(&c, &s, Metric::Overlap(&bad_s)),
        Err(LinkError::NonFinite)
    ));
    assert!(matches!(
        weights(&c, &s, Metric::Overlap(&DMatrix::identity(2, 2))),
        Err(LinkError::DimensionMismatch { .. })
    ));
    assert!(matches!(
        weights(&c, &DMatrix::identity(2, 2), Metric::Orthonormal),
        Err(LinkError::DimensionMismatch { .. })
    ));
    assert!(matches!(
        weights(&DMatrix::zeros(3, 1), &s, Metric::Orthonormal),
        Err(LinkError::ZeroNorm { index: 0, .. })
    ));
    assert!(matches!(
        link(
            &c,
            &s,
            Metric::Overlap(&s),
            &[2.0],
            LevelSets::None,
            LINK_THRESHOLD
        ),
        Err(LinkError::LengthMismatch { .. })
    ));
    assert!(matches!(
        link(
            &c,
            &s,
            Metric::Overlap(&s),
            &[2.0, 2.0, 0.0],
            LevelSets::ByEnergy {
                energies: &[1.0, 2.0, 3.0],
                tolerance: f64::NAN
            },
            LINK_THRESHOLD
        ),
        Err(LinkError::BadTolerance(_))
    ));
    assert!(matches!(
        link(
            &c,
            &s,
            Metric::Orthonormal,
            &[2.0, 2.0, 0.0],
            LevelSets::Ids(&[0, 1]),
            LINK_THRESHOLD
        ),
        Err(LinkError::LengthMismatch { .. })
    ));
    // The localized picture refuses non-finite orbitals.
    let water = Molecule::new(
        "water",
        vec![
            atom("O", [0.0; 3]),
            atom("H", [0.0, 0.757, -0.586]),
            atom("H", [0.0, -0.757, -0.586]),
        ],
        0,
    );
    let mut eht = run(&water, &EhtSettings::default()).unwrap();
    eht.orthonormal.coefficients[(0, 0)] = f64::NAN;
    assert_eq!(
        localized::analyze(&water, &eht, &LocalizationSettings::default()),
        Err(LocalizedError::NonFinite)
    );
}
