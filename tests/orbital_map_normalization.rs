//! Orbital-map values are normalized wavefunctions: the point values of the Slater basis
//! agree with the analytic overlap matrix, single Slater functions and canonical MOs
//! (cᵀSc = 1) integrate to 1 over space, and the radial factor has the textbook form.

use diptych::analysis::{Analysis, Settings};
use diptych::chem::element::Element;
use diptych::chem::molecule::{Atom, Molecule};
use diptych::eht::overlap::radial_normalization;
use diptych::eht::{BOHR_IN_ANGSTROM, ParameterSet, build_basis, overlap_matrix};
use diptych::orbital_map::sto::basis_values_at;
use diptych::orbital_map::{Grid, GridSpec, OrbitalEvaluator, Plane};
use nalgebra::Vector3;

fn water() -> Molecule {
    // NIST CCCBDB experimental geometry (from memory), as demo_molecules/water.xyz.
    Molecule::new(
        "water",
        vec![
            Atom::new(Element::O, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [0.0, 0.756_950_33, -0.585_882_28]),
            Atom::new(Element::H, [0.0, -0.756_950_33, -0.585_882_28]),
        ],
        0,
    )
}

fn ammonia() -> Molecule {
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz"),
    )
    .expect("demo ammonia");
    diptych::chem::io::xyz::parse_xyz(&text, "ammonia")
        .expect("valid XYZ")
        .molecule
}

/// ∫ f over a cube of half-width `half` (bohr) around `centre`, spacing `h`, as a stack of
/// planes filled by the map's own grid code (midpoint sum; the integrands decay
/// exponentially, so the sum converges fast in h apart from the nuclear cusps).
fn integrate_by_planes(orbital: &OrbitalEvaluator, centre: Vector3<f64>, half: f64, h: f64) -> f64 {
    let n = (2.0 * half / h).round() as usize + 1;
    let h_angstrom = h * BOHR_IN_ANGSTROM;
    let spec = GridSpec {
        x0: -half * BOHR_IN_ANGSTROM,
        y0: -half * BOHR_IN_ANGSTROM,
        step: h_angstrom,
        n,
    };
    let centre_angstrom = centre * BOHR_IN_ANGSTROM;
    let mut sum = 0.0;
    for k in 0..n {
        let z = -half * BOHR_IN_ANGSTROM + k as f64 * h_angstrom;
        let plane = Plane {
            origin: centre_angstrom + Vector3::new(0.0, 0.0, z),
            u: Vector3::x(),
            v: Vector3::y(),
            kind: diptych::orbital_map::PlaneKind::Free,
        };
        let grid = Grid::evaluate(orbital, &plane, &spec);
        sum += grid.values.iter().map(|v| v * v).sum::<f64>();
    }
    sum * h * h * h
}

#[test]
fn single_slater_functions_integrate_to_one() {
    // ∫ |χ|² dV = 1 for a normalized STO, N = (2ζ)^(n+½)/√((2n)!) (Levine, Quantum
    // Chemistry, from memory). Checked for H 1s and N 2s, 2px, 2pz through the map's
    // grid evaluation; centres off the grid points so the sampling is generic.
    let nitrogen = Molecule::new(
        "N",
        vec![Atom::new(Element::N, [0.0123, -0.0211, 0.0077])],
        0,
    );
    let hydrogen = Molecule::new("H", vec![Atom::new(Element::H, [0.031, 0.017, -0.023])], 0);
    let params = ParameterSet::builtin().expect("parameters");
    for molecule in [hydrogen, nitrogen] {
        let basis = build_basis(&molecule, params, &[]).expect("basis");
        for function in 0..basis.len() {
            let mut coefficients = vec![0.0; basis.len()];
            coefficients[function] = 1.0;
            let evaluator = OrbitalEvaluator::new(&basis, &coefficients);
            let integral = integrate_by_planes(&evaluator, basis.shells[0].centre, 12.0, 0.12);
            assert!(
                (integral - 1.0).abs() < 0.01,
                "{} {}: ∫χ² = {integral}",
                molecule.name,
                basis.orbitals[function].label()
            );
        }
    }
}

#[test]
fn canonical_mos_of_water_and_ammonia_integrate_to_one() {
    // A canonical MO is normalized with the overlap matrix (cᵀSc = 1); if the point values
    // use the same functions as S (normalization, harmonics, signs, Å→bohr factor), its
    // density integrates to 1 (common practice, no source).
    for molecule in [water(), ammonia()] {
        let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
        let eht = analysis.eht.as_ref().expect("EHT result");
        let homo = eht.homo().expect("a HOMO");
        for index in [0, homo] {
            let c: Vec<f64> = eht.coefficients.column(index).iter().copied().collect();
            let evaluator = OrbitalEvaluator::new(&eht.basis, &c);
            let integral = integrate_by_planes(&evaluator, Vector3::zeros(), 12.0, 0.12);
            assert!(
                (integral - 1.0).abs() < 0.01,
                "{} MO {index}: ∫ψ² = {integral}",
                molecule.name
            );
        }
    }
}

#[test]
fn numerical_overlaps_match_the_analytic_overlap_matrix() {
    // ∫ χ_μ χ_ν dV by a 3D sum must reproduce S_μν of the analytic engine (Mulliken, Rieke,
    // Orloff and Orloff, J. Chem. Phys. 17, 1248 (1949)) for every pair: a sign or axis
    // convention that differed between the two would show here.
    let molecule = water();
    let params = ParameterSet::builtin().expect("parameters");
    let basis = build_basis(&molecule, params, &[]).expect("basis");
    let s = overlap_matrix(&basis);
    let size = basis.len();
    let (half, h): (f64, f64) = (11.0, 0.11);
    let n = (2.0 * half / h).round() as i64;
    let mut sums = vec![0.0; size * size];
    let mut values = vec![0.0; size];
    for a in 0..=n {
        for b in 0..=n {
            for c in 0..=n {
                let point = Vector3::new(
                    -half + a as f64 * h + 0.013,
                    -half + b as f64 * h - 0.007,
                    -half + c as f64 * h + 0.019,
                );
                basis_values_at(&basis, &point, &mut values);
                for i in 0..size {
                    if values[i] == 0.0 {
                        continue;
                    }
                    for j in i..size {
                        sums[i * size + j] += values[i] * values[j];
                    }
                }
            }
        }
    }
    let volume = h * h * h;
    for i in 0..size {
        for j in i..size {
            let numeric = sums[i * size + j] * volume;
            assert!(
                (numeric - s[(i, j)]).abs() < 0.005,
                "S[{i},{j}] ({} / {}): numeric {numeric:.5}, analytic {:.5}",
                basis.orbitals[i].label(),
                basis.orbitals[j].label(),
                s[(i, j)]
            );
        }
    }
}

#[test]
fn radial_factor_has_the_textbook_normalization() {
    // R(r) = (2ζ)^(n+½)/√((2n)!) r^(n−1) e^(−ζr), ∫ R² r² dr = 1 (Levine, Quantum
    // Chemistry, from memory). Written out for n = 1, 2, 3 and checked against the
    // constant the basis uses, and the radial integral done by a fine Simpson sum.
    let zeta = 1.7_f64;
    let written_out = [
        2.0 * zeta.powf(1.5),                   // (2ζ)^(3/2)/√2
        (2.0 * zeta).powf(2.5) / 24f64.sqrt(),  // 4! = 24
        (2.0 * zeta).powf(3.5) / 720f64.sqrt(), // 6! = 720
    ];
    for (k, expected) in written_out.iter().enumerate() {
        let n = k as u8 + 1;
        let constant = radial_normalization(n, zeta);
        assert!(
            ((constant - expected) / expected).abs() < 1e-12,
            "n = {n}: {constant} vs {expected}"
        );
        let steps = 20_000;
        let (end, h) = (40.0 / zeta, 40.0 / zeta / steps as f64);
        let f = |r: f64| {
            let radial = constant * r.powi(i32::from(n) - 1) * (-zeta * r).exp();
            radial * radial * r * r
        };
        let mut sum = f(0.0) + f(end);
        for i in 1..steps {
            sum += f(i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
        }
        let integral = sum * h / 3.0;
        assert!(
            (integral - 1.0).abs() < 1e-9,
            "n = {n}: ∫R²r²dr = {integral}"
        );
    }
}

#[test]
fn point_values_follow_the_slater_formula() {
    // χ_1s(r) = (2ζ)^(3/2)/√2 e^(−ζr) / √(4π) and χ_2pz = N r e^(−ζr) √(3/4π) cos θ
    // (Levine, from memory), at a few points, from the basis-function evaluator.
    let molecule = Molecule::new(
        "NH",
        vec![
            Atom::new(Element::N, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [0.0, 0.0, 1.05]),
        ],
        0,
    );
    let params = ParameterSet::builtin().expect("parameters");
    let basis = build_basis(&molecule, params, &[]).expect("basis");
    let mut values = vec![0.0; basis.len()];
    let four_pi = 4.0 * std::f64::consts::PI;
    let h_shell = basis.shells.iter().find(|s| s.atom == 1).expect("H shell");
    let p_shell = basis
        .shells
        .iter()
        .find(|s| s.atom == 0 && s.l == 1)
        .expect("N p shell");
    for point in [
        Vector3::new(0.3, -0.2, 0.4),
        Vector3::new(-1.1, 0.5, 2.9),
        Vector3::new(0.0, 0.0, 1.05 / BOHR_IN_ANGSTROM),
    ] {
        basis_values_at(&basis, &point, &mut values);
        let d = point - h_shell.centre;
        let r = d.norm();
        let expected_1s = 2.0 * h_shell.zeta.powf(1.5) * (-h_shell.zeta * r).exp() / four_pi.sqrt();
        assert!((values[h_shell.first] - expected_1s).abs() < 1e-12);
        let d = point - p_shell.centre;
        let r = d.norm();
        let n2 = (2.0 * p_shell.zeta).powf(2.5) / 24f64.sqrt();
        let expected_pz = n2 * r * (-p_shell.zeta * r).exp() * (3.0 / four_pi).sqrt() * d.z / r;
        assert!((values[p_shell.first + 2] - expected_pz).abs() < 1e-12);
    }
}

#[test]
fn localized_orbitals_and_hybrids_integrate_to_one() {
    // Localized orbitals carry S-normalized AO coefficients and a hybrid is built as
    // (s + √λ p)/√(1+λ) from orthonormal one-centre functions (Coulson, Valence, 1952):
    // both densities integrate to 1.
    use diptych::orbital_map::{OrbitalRef, resolve};
    let analysis = Analysis::run(&ammonia(), &Settings::default()).expect("analysis");
    let eht = analysis.eht.as_ref().expect("EHT result");
    for reference in [
        OrbitalRef::Localized(0),
        OrbitalRef::Hybrid(0),
        OrbitalRef::Hybrid(analysis.hybrid_entries.len() - 1),
    ] {
        let orbital = resolve(&analysis, reference).expect("orbital");
        let evaluator = OrbitalEvaluator::new(&eht.basis, &orbital.coefficients);
        let integral = integrate_by_planes(&evaluator, Vector3::zeros(), 12.0, 0.12);
        assert!(
            (integral - 1.0).abs() < 0.01,
            "{reference:?} ({}): ∫ψ² = {integral}",
            orbital.label
        );
    }
}
