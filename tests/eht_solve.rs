//! The extended Hückel solution: photoelectron ordering of ammonia, the generalized
//! eigenproblem itself, occupations, populations, settings, parameters and bad input.

use diptych::chem::{Atom, Element, Molecule};
use diptych::eht::{
    EhtError, EhtSettings, ElementParameters, ParameterSet, ShellParameters, build_basis,
    effective_k, hamiltonian_matrix, overlap_matrix, run, solve,
};
use nalgebra::DMatrix;

fn ammonia_experimental() -> Molecule {
    // N–H 1.012 Å, H–N–H 106.7° (NIST CCCBDB experimental geometry; values from memory),
    // C3 axis along z.
    let (r, angle) = (1.012f64, 106.7f64.to_radians());
    let cos_beta = ((2.0 * angle.cos() + 1.0) / 3.0).sqrt();
    let sin_beta = (1.0 - cos_beta * cos_beta).sqrt();
    let mut atoms = vec![Atom::new(Element::N, [0.0, 0.0, 0.0])];
    for k in 0..3 {
        let phi = 2.0 * std::f64::consts::PI * k as f64 / 3.0;
        atoms.push(Atom::new(
            Element::H,
            [
                r * sin_beta * phi.cos(),
                r * sin_beta * phi.sin(),
                -r * cos_beta,
            ],
        ));
    }
    Molecule::new("ammonia", atoms, 0)
}

fn element(symbol: &str) -> Element {
    Element::from_symbol(symbol).unwrap()
}

fn diatomic(a: Element, b: Element, distance: f64, charge: i32) -> Molecule {
    Molecule::new(
        "diatomic",
        vec![
            Atom::new(a, [0.0, 0.0, 0.0]),
            Atom::new(b, [0.0, 0.0, distance]),
        ],
        charge,
    )
}

/// Ammonia's photoelectron spectrum (handbook data, from memory: 10.8 eV 3a1 lone pair,
/// 16 eV 1e, 27 eV 2a1) read through Koopmans' theorem: lone-pair a1 highest occupied,
/// the e pair below it, the lowest a1 below that; 7 valence orbitals, 8 electrons.
#[test]
fn ammonia_valence_ordering_matches_photoelectron_spectrum() {
    let result = run(&ammonia_experimental(), &EhtSettings::default()).unwrap();
    assert_eq!(result.energies.len(), 7);
    assert_eq!(result.electrons, 8);
    assert_eq!(result.occupations, vec![2.0, 2.0, 2.0, 2.0, 0.0, 0.0, 0.0]);
    assert!(!result.open_shell);
    let e = &result.energies;
    let c = &result.coefficients;
    // Basis: N 2s, 2px, 2py, 2pz, then H1, H2, H3 1s.
    // HOMO (index 3): a1 — no N px/py, equal H coefficients, large N pz (lone pair).
    assert!(c[(1, 3)].abs() < 1e-8 && c[(2, 3)].abs() < 1e-8);
    assert!((c[(4, 3)] - c[(5, 3)]).abs() < 1e-8 && (c[(4, 3)] - c[(6, 3)]).abs() < 1e-8);
    assert!(c[(3, 3)].abs() > 0.5);
    // e pair (1, 2): degenerate, no N s or pz.
    assert!((e[1] - e[2]).abs() < 1e-8);
    assert!(e[2] < e[3] - 1.0);
    for k in [1, 2] {
        assert!(c[(0, k)].abs() < 1e-8 && c[(3, k)].abs() < 1e-8);
    }
    // Lowest a1: mostly N 2s, clearly below the e pair.
    assert!(e[0] < e[1] - 1.0);
    assert!(c[(0, 0)].abs() > 0.5);
    let ionizations = result.koopmans_ionization_energies();
    assert_eq!(
        ionizations.iter().map(|i| i.orbital).collect::<Vec<_>>(),
        vec![3, 2, 1, 0]
    );
    assert!((ionizations[0].energy_ev + e[3]).abs() < 1e-12);
    assert_eq!(result.homo(), Some(3));
    assert_eq!(result.lumo(), Some(4));
}

/// HC = SCE is solved: residual H C − S C E ≈ 0, Cᵀ S C = 1, energies ascending, and the
/// Mulliken populations add up to the electron count (definitions, Mulliken 1955).
#[test]
fn solution_satisfies_the_generalized_eigenproblem() {
    let molecule = Molecule::new(
        "formaldehyde",
        vec![
            Atom::new(Element::C, [0.0, 0.0, 0.0]),
            Atom::new(Element::O, [0.0, 0.0, 1.205]),
            Atom::new(Element::H, [0.0, 0.94, -0.587]),
            Atom::new(Element::H, [0.0, -0.94, -0.587]),
        ],
        0,
    );
    let r = run(&molecule, &EhtSettings::default()).unwrap();
    let c = &r.coefficients;
    let e = DMatrix::from_diagonal(&nalgebra::DVector::from_vec(r.energies.clone()));
    let residual = (&r.hamiltonian * c - &r.overlap * c * e).abs().max();
    assert!(residual < 1e-10, "residual {residual:e}");
    let identity = c.transpose() * &r.overlap * c;
    let n = c.ncols();
    assert!((identity - DMatrix::identity(n, n)).abs().max() < 1e-10);
    assert!(r.energies.windows(2).all(|w| w[0] <= w[1]));
    let total: f64 = r.populations.atom_populations.iter().sum();
    assert!((total - 12.0).abs() < 1e-10);
    let charge: f64 = r.charges().iter().sum();
    assert!(charge.abs() < 1e-10);
    // Overlap populations: bonded C=O positive; the H···H pair is small.
    assert!(r.populations.bond_index(0, 1) > 0.5);
    assert!(r.populations.bond_index(2, 3).abs() < 0.1);
    assert_eq!(
        r.populations.bond_index(0, 1),
        r.populations.bond_index(1, 0)
    );
    let sum: f64 = r
        .occupations
        .iter()
        .zip(&r.energies)
        .map(|(o, e)| o * e)
        .sum();
    assert!((sum - r.sum_occupied_energy).abs() < 1e-12);
}

/// Charged species: the charges sum to the net charge.
#[test]
fn charges_sum_to_the_net_charge() {
    let hydroxide = diatomic(Element::O, Element::H, 0.97, -1);
    let r = run(&hydroxide, &EhtSettings::default()).unwrap();
    assert_eq!(r.electrons, 8);
    let total: f64 = r.charges().iter().sum();
    assert!((total + 1.0).abs() < 1e-10, "{total}");
}

/// The pieces of the pipeline can be used separately: holding a function non-bonding by
/// zeroing its rows of H and S (keeping S_ii = 1) and re-solving leaves its VSIP as an
/// eigenvalue with the function as the eigenvector (the "lone-pair mixing off" use).
#[test]
fn pieces_can_be_modified_and_resolved() {
    let molecule = ammonia_experimental();
    let params = ParameterSet::builtin().unwrap();
    let basis = build_basis(&molecule, params, &[]).unwrap();
    let mut s = overlap_matrix(&basis);
    let mut h = hamiltonian_matrix(&basis, &s, 1.75, true);
    let full = solve(&h, &s, 8).unwrap();
    let pz = 3;
    for j in 0..basis.len() {
        if j != pz {
            for m in [&mut s, &mut h] {
                m[(pz, j)] = 0.0;
                m[(j, pz)] = 0.0;
            }
        }
    }
    let held = solve(&h, &s, 8).unwrap();
    let vsip = basis.vsip[pz];
    assert_eq!(vsip, -13.4);
    let k = held
        .energies
        .iter()
        .position(|e| (e - vsip).abs() < 1e-10)
        .expect("the held orbital keeps its VSIP");
    assert!((held.coefficients[(pz, k)].abs() - 1.0).abs() < 1e-10);
    // With mixing allowed, the lone-pair level (HOMO) moves away from the bare VSIP.
    assert!((full.energies[3] - vsip).abs() > 0.05);
}

/// Ammeter et al. (1978) weighting and the user-set K reach H as the formulas say.
#[test]
fn weighted_unweighted_and_k_settings() {
    let molecule = diatomic(Element::C, Element::O, 1.128, 0);
    let params = ParameterSet::builtin().unwrap();
    let basis = build_basis(&molecule, params, &[]).unwrap();
    let s = overlap_matrix(&basis);
    let (i, j) = (0, 4); // C 2s, O 2s
    let (hi, hj) = (basis.vsip[i], basis.vsip[j]);
    let delta = (hi - hj) / (hi + hj);
    let k_weighted = 1.75 + delta.powi(2) + delta.powi(4) * (1.0 - 1.75);
    assert!((effective_k(1.75, hi, hj, true) - k_weighted).abs() < 1e-15);
    let weighted = hamiltonian_matrix(&basis, &s, 1.75, true);
    let plain = hamiltonian_matrix(&basis, &s, 1.75, false);
    let doubled = hamiltonian_matrix(&basis, &s, 2.0, false);
    let base = s[(i, j)] * (hi + hj) / 2.0;
    assert!((weighted[(i, j)] - k_weighted * base).abs() < 1e-12);
    assert!((plain[(i, j)] - 1.75 * base).abs() < 1e-12);
    assert!((doubled[(i, j)] - 2.0 * base).abs() < 1e-12);
    assert!((weighted[(i, i)] - hi).abs() < 1e-15);
    // Through run(): the unweighted setting changes heteronuclear levels...
    let unweighted = EhtSettings {
        weighted: false,
        ..EhtSettings::default()
    };
    let a = run(&molecule, &EhtSettings::default()).unwrap();
    let b = run(&molecule, &unweighted).unwrap();
    assert!((a.energies[0] - b.energies[0]).abs() > 1e-3);
    // ...but not homonuclear ones between equal VSIPs (Δ = 0): H2.
    let h2 = diatomic(Element::H, Element::H, 0.74, 0);
    let a = run(&h2, &EhtSettings::default()).unwrap();
    let b = run(&h2, &unweighted).unwrap();
    assert!((a.energies[0] - b.energies[0]).abs() < 1e-12);
}

/// O₂ has two electrons in its degenerate π* pair (triplet ground state; textbook MO
/// diagram, from memory): they are shared equally and the result is flagged open shell.
#[test]
fn degenerate_partly_filled_set_is_shared_and_flagged() {
    let o2 = diatomic(Element::O, Element::O, 1.208, 0);
    let r = run(&o2, &EhtSettings::default()).unwrap();
    assert_eq!(r.electrons, 12);
    assert!(r.open_shell);
    let homo = r.homo().unwrap();
    assert!((r.occupations[homo] - 1.0).abs() < 1e-12);
    assert!((r.occupations[homo - 1] - 1.0).abs() < 1e-12);
    assert!((r.energies[homo] - r.energies[homo - 1]).abs() < 1e-8);
    let total: f64 = r.occupations.iter().sum();
    assert!((total - 12.0).abs() < 1e-12);
}

/// An odd electron count leaves a singly occupied HOMO, flagged open shell (H₂O⁺).
#[test]
fn odd_electron_count_is_flagged() {
    let mut water = Molecule::new(
        "water cation",
        vec![
            Atom::new(Element::O, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [0.0, 0.757, 0.587]),
            Atom::new(Element::H, [0.0, -0.757, 0.587]),
        ],
        1,
    );
    let r = run(&water, &EhtSettings::default()).unwrap();
    assert_eq!(r.electrons, 7);
    assert!(r.open_shell);
    assert_eq!(r.occupations[r.homo().unwrap()], 1.0);
    water.charge = 0;
    assert!(!run(&water, &EhtSettings::default()).unwrap().open_shell);
}

/// Atoms far apart: no overlap, levels at the VSIPs, nothing NaN.
#[test]
fn atoms_far_apart_do_not_interact() {
    let molecule = diatomic(Element::H, Element::F, 200.0, 0);
    let r = run(&molecule, &EhtSettings::default()).unwrap();
    assert!(r.overlap.iter().all(|x| x.is_finite()));
    let off = r.overlap[(0, 1)].abs().max(r.overlap[(0, 4)].abs());
    assert!(off < 1e-30, "{off}");
    let mut expected = vec![-40.0, -18.1, -18.1, -18.1, -13.6];
    expected.sort_by(f64::total_cmp);
    for (a, b) in r.energies.iter().zip(&expected) {
        assert!((a - b).abs() < 1e-9);
    }
}

#[test]
fn near_coincident_atoms_are_a_typed_error() {
    let molecule = diatomic(Element::H, Element::H, 1e-4, 0);
    match run(&molecule, &EhtSettings::default()) {
        Err(EhtError::SingularOverlap {
            smallest_eigenvalue,
            closest_atoms: Some((0, 1, d)),
        }) => {
            assert!(smallest_eigenvalue < 1e-5);
            assert!((d - 1e-4).abs() < 1e-9);
        }
        other => panic!("expected SingularOverlap, got {other:?}"),
    }
    let message = run(&molecule, &EhtSettings::default())
        .unwrap_err()
        .to_string();
    assert!(message.contains("atoms 0 and 1"), "{message}");
    match run(&molecule, &EhtSettings::default()) {
        Err(EhtError::SingularOverlap { .. }) => {}
        other => panic!("expected SingularOverlap, got {other:?}"),
    }
    // Two carbon atoms exactly on top of each other: identical functions, S singular.
    // (Different elements at one point are not singular: their STOs differ in ζ.)
    let molecule = diatomic(Element::C, Element::C, 0.0, 0);
    assert!(matches!(
        run(&molecule, &EhtSettings::default()),
        Err(EhtError::SingularOverlap { .. })
    ));
}

#[test]
fn electron_counts_out_of_range_are_errors() {
    // H2 2+: no electrons left.
    let molecule = diatomic(Element::H, Element::H, 0.74, 2);
    assert!(matches!(
        run(&molecule, &EhtSettings::default()),
        Err(EhtError::NoElectrons { electrons: 0 })
    ));
    // H2 3−: 5 electrons in 2 orbitals.
    let molecule = diatomic(Element::H, Element::H, 0.74, -3);
    assert_eq!(
        run(&molecule, &EhtSettings::default()),
        Err(EhtError::TooManyElectrons {
            electrons: 5,
            capacity: 4
        })
    );
}

#[test]
fn missing_parameters_name_the_element() {
    let molecule = diatomic(Element::C, element("Ar"), 3.0, 0);
    let error = run(&molecule, &EhtSettings::default()).unwrap_err();
    assert_eq!(
        error,
        EhtError::MissingParameters {
            element: element("Ar")
        }
    );
    assert!(error.to_string().contains("Ar"));
    let zinc = diatomic(element("Zn"), Element::H, 1.5, 0);
    assert!(matches!(
        run(&zinc, &EhtSettings::default()),
        Err(EhtError::MissingParameters { .. })
    ));
}

#[test]
fn other_bad_input_is_a_typed_error() {
    let empty = Molecule::new("empty", vec![], 0);
    assert_eq!(
        run(&empty, &EhtSettings::default()),
        Err(EhtError::EmptyMolecule)
    );
    let mut nan = diatomic(Element::H, Element::H, 0.74, 0);
    nan.atoms[1].position.x = f64::NAN;
    assert_eq!(
        run(&nan, &EhtSettings::default()),
        Err(EhtError::NonFiniteCoordinate { atom: 1 })
    );
    let h2 = diatomic(Element::H, Element::H, 0.74, 0);
    for k in [f64::NAN, -1.0, 0.0, f64::INFINITY] {
        let settings = EhtSettings {
            k,
            ..EhtSettings::default()
        };
        assert!(matches!(
            run(&h2, &settings),
            Err(EhtError::InvalidK { .. })
        ));
    }
    let h = DMatrix::<f64>::zeros(2, 2);
    let s = DMatrix::<f64>::identity(3, 3);
    assert!(matches!(
        solve(&h, &s, 2),
        Err(EhtError::DimensionMismatch { .. })
    ));
    let mut h = DMatrix::<f64>::identity(2, 2);
    h[(0, 1)] = f64::NAN;
    assert_eq!(
        solve(&h, &DMatrix::identity(2, 2), 2),
        Err(EhtError::NonFiniteMatrix)
    );
}

#[test]
fn parameter_files_load_fail_clearly_and_override() {
    let builtin = ParameterSet::builtin().unwrap();
    // Every element the issue names has parameters, except the noble gases Ar and Kr, for
    // which the reference table has none.
    for symbol in [
        "H", "Li", "Be", "B", "C", "N", "O", "F", "Ne", "Na", "Mg", "Al", "Si", "P", "S", "Cl",
        "K", "Ca", "Ga", "Ge", "As", "Se", "Br",
    ] {
        let row = builtin.get(element(symbol)).unwrap();
        assert!(row.source.contains("YAeHMOP"), "{symbol}");
    }
    // Hoffmann 1963: H 1s −13.6 eV, ζ 1.3; C 2s −21.4, 2p −11.4, ζ 1.625.
    let carbon = builtin.get(Element::C).unwrap();
    assert_eq!(
        (
            carbon.shells[0].vsip,
            carbon.shells[1].vsip,
            carbon.shells[0].zeta
        ),
        (-21.4, -11.4, 1.625)
    );
    // Loadable from a path: the same text gives the same table.
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("params.ron");
    std::fs::write(&path, diptych::eht::params::BUILTIN_PARAMETERS).unwrap();
    assert_eq!(&ParameterSet::from_path(&path).unwrap(), builtin);
    // Damaged text and missing files are clear errors.
    let damaged = ParameterSet::parse("(version: 1, description: \"x\", elements: [", "test");
    assert!(matches!(damaged, Err(EhtError::ParameterFile { .. })));
    assert!(damaged.unwrap_err().to_string().contains("damaged"));
    assert!(matches!(
        ParameterSet::from_path(&dir.path().join("absent.ron")),
        Err(EhtError::ParameterFile { .. })
    ));
    let bad_row = "(version: 1, description: \"x\", elements: [(element: \"H\", shells: [(n: 1, l: 0, vsip: -13.6, zeta: -1.0)], source: \"x\")])";
    assert!(matches!(
        ParameterSet::parse(bad_row, "test"),
        Err(EhtError::InvalidParameters {
            element: Element::H,
            ..
        })
    ));
    // Overrides take precedence and must themselves be valid.
    let h2 = diatomic(Element::H, Element::H, 0.74, 0);
    let mut settings = EhtSettings::default();
    settings.overrides.push(ElementParameters {
        element: Element::H,
        shells: vec![ShellParameters {
            n: 1,
            l: 0,
            vsip: -12.0,
            zeta: 1.3,
        }],
        source: "test".into(),
    });
    let r = run(&h2, &settings).unwrap();
    assert_eq!(r.hamiltonian[(0, 0)], -12.0);
    settings.overrides[0].shells[0].zeta = 0.0;
    assert!(matches!(
        run(&h2, &settings),
        Err(EhtError::InvalidParameters { .. })
    ));
    // Settings round-trip through RON (they are stored in project files).
    let text = ron::to_string(&settings).unwrap();
    let back: EhtSettings = ron::from_str(&text).unwrap();
    assert_eq!(back, settings);
}
