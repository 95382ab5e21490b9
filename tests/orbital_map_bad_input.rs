//! Bad input to orbital maps gives clear errors, never a panic: collinear, repeated or
//! missing atoms for the plane, unknown orbital names, grids too small or too large,
//! unusable contour levels; and the `diptych map` command answers them with exit code 2.

use std::path::PathBuf;
use std::process::Command;

use diptych::analysis::{Analysis, Settings};
use diptych::chem::molecule::Molecule;
use diptych::orbital_map::{
    MapError, MapOptions, OrbitalRef, Plane, compute_map, find_orbital, resolve,
};

fn repository() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn demo(name: &str) -> Molecule {
    let text = std::fs::read_to_string(repository().join("demo_molecules").join(name))
        .expect("demo molecule");
    diptych::chem::io::xyz::parse_xyz(&text, name)
        .expect("valid XYZ")
        .molecule
}

fn ammonia() -> Analysis {
    Analysis::run(&demo("ammonia.xyz"), &Settings::default()).expect("analysis")
}

#[test]
fn planes_reject_collinear_repeated_and_missing_atoms() {
    // HCN is linear (NIST CCCBDB geometry of the demo file): its three atoms span no plane.
    let hcn = demo("hydrogen_cyanide.xyz");
    assert!(matches!(
        Plane::through_atoms(&hcn, [0, 1, 2]),
        Err(MapError::CollinearAtoms { atoms: [0, 1, 2] })
    ));
    let nh3 = demo("ammonia.xyz");
    assert!(matches!(
        Plane::through_atoms(&nh3, [0, 1, 1]),
        Err(MapError::RepeatedAtom { atom: 1 })
    ));
    assert!(matches!(
        Plane::through_atoms(&nh3, [0, 1, 4]),
        Err(MapError::AtomOutOfRange { atom: 4, atoms: 4 })
    ));
    assert!(matches!(
        Plane::normal_to_bond(&nh3, 2, 2),
        Err(MapError::RepeatedAtom { atom: 2 })
    ));
    assert!(matches!(
        Plane::normal_to_bond(&nh3, 0, 17),
        Err(MapError::AtomOutOfRange { atom: 17, .. })
    ));
    // Valid planes are orthonormal and contain what they claim to.
    let plane = Plane::through_atoms(&nh3, [0, 1, 2]).expect("plane");
    for atom in [0, 1, 2] {
        let (_, _, height) = plane.project(&nh3.atoms[atom].position);
        assert!(height.abs() < 1e-12);
    }
    let normal = Plane::normal_to_bond(&nh3, 0, 1).expect("plane");
    let axis = (nh3.atoms[1].position - nh3.atoms[0].position).normalize();
    assert!((normal.normal().dot(&axis).abs() - 1.0).abs() < 1e-12);
    // A linear molecule still gets a default plane, containing its axis.
    let default = Plane::default_for(&hcn, &[1]).expect("default plane");
    for atom in &hcn.atoms {
        assert!(default.project(&atom.position).2.abs() < 1e-12);
    }
}

#[test]
fn unknown_orbital_names_list_valid_ones() {
    let analysis = ammonia();
    for bad in ["9a1", "1e#3", "1e#0", "mo:99", "loc:x", "bogus", ""] {
        let error = find_orbital(&analysis, bad).expect_err(bad);
        let message = error.to_string();
        match error {
            MapError::UnknownOrbital { examples, .. } => {
                assert!(examples.iter().any(|e| e == "3a1"), "{message}");
                assert!(message.contains("HOMO"));
            }
            MapError::OrbitalOutOfRange { .. } => assert!(message.contains("0-based")),
            other => panic!("unexpected error for '{bad}': {other}"),
        }
    }
    // Valid spellings: members of a degenerate set, ASCII bond names, indices, HOMO.
    assert_eq!(find_orbital(&analysis, "1e"), Ok(OrbitalRef::Canonical(1)));
    assert_eq!(
        find_orbital(&analysis, "1e#2"),
        Ok(OrbitalRef::Canonical(2))
    );
    assert_eq!(
        find_orbital(&analysis, "homo"),
        Ok(OrbitalRef::Canonical(3))
    );
    assert_eq!(
        find_orbital(&analysis, "LUMO"),
        Ok(OrbitalRef::Canonical(4))
    );
    let sigma = find_orbital(&analysis, "sigma(N-H)#2").expect("ASCII σ(N–H)");
    assert_eq!(sigma, find_orbital(&analysis, "σ(N–H)#2").expect("σ(N–H)"));
    assert!(matches!(sigma, OrbitalRef::Localized(_)));
    assert!(matches!(
        resolve(&analysis, OrbitalRef::Hybrid(99)),
        Err(MapError::OrbitalOutOfRange { kind: "hybrid", .. })
    ));
}

#[test]
fn hybrid_maps_are_normalized_sp_lambda_orbitals() {
    // h = (s + √λ p)/√(1+λ) has s share 1/(1+λ) (Coulson, Valence, 1952): the built
    // coefficients must give back the entry's %s and unit length.
    let analysis = ammonia();
    for (index, entry) in analysis.hybrid_entries.iter().enumerate() {
        let orbital = resolve(&analysis, OrbitalRef::Hybrid(index)).expect("hybrid");
        let eht = analysis.eht.as_ref().expect("EHT");
        let norm: f64 = orbital.coefficients.iter().map(|c| c * c).sum();
        assert!((norm - 1.0).abs() < 1e-12);
        let s_index = eht.basis.atom_ranges[entry.center].start;
        let s_share = orbital.coefficients[s_index].powi(2);
        assert!(
            (100.0 * s_share - entry.s_percent).abs() < 0.5,
            "hybrid {index}: {s_share} vs {}%",
            entry.s_percent
        );
    }
}

#[test]
fn grid_sizes_and_levels_are_checked_before_any_work() {
    let analysis = ammonia();
    let plane = Plane::through_atoms(&analysis.molecule, [0, 1, 2]).expect("plane");
    let reference = OrbitalRef::Canonical(0);
    for points in [0, 7, 2049, usize::MAX] {
        let options = MapOptions {
            points,
            ..MapOptions::default()
        };
        assert_eq!(
            compute_map(&analysis, reference, &plane, &options).err(),
            Some(MapError::GridSize { n: points })
        );
    }
    for level in [0.0, -0.1, f64::NAN, f64::INFINITY] {
        let options = MapOptions {
            levels: vec![0.05, level],
            ..MapOptions::default()
        };
        assert!(matches!(
            compute_map(&analysis, reference, &plane, &options),
            Err(MapError::BadLevel { .. })
        ));
    }
    let options = MapOptions {
        margin: f64::NAN,
        ..MapOptions::default()
    };
    assert!(compute_map(&analysis, reference, &plane, &options).is_err());
}

fn diptych() -> Command {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
}

#[test]
fn cli_writes_a_map_and_rejects_bad_input_with_exit_code_2() {
    let folder = tempfile::tempdir().expect("temp dir");
    let out = folder.path().join("lone_pair.svg");
    let ammonia = repository().join("demo_molecules/ammonia.xyz");
    let run = |args: &[&str]| {
        diptych()
            .arg("map")
            .arg(&ammonia)
            .args(args)
            .output()
            .expect("diptych runs")
    };
    let out_text = out.to_string_lossy().to_string();
    let other = folder.path().join("x.svg").to_string_lossy().to_string();
    let other_png = folder.path().join("x.png").to_string_lossy().to_string();
    let ok = run(&["--orbital", "n(N)", "--plane", "0,1,2", "-o", &out_text]);
    assert!(
        ok.status.success(),
        "{}",
        String::from_utf8_lossy(&ok.stderr)
    );
    let svg = std::fs::read_to_string(&out).expect("written");
    assert!(svg.starts_with("<?xml") && svg.trim_end().ends_with("</svg>"));
    assert!(svg.contains("n(N)") && svg.contains("<path"));
    // Deterministic: the same command gives the same bytes.
    let again = run(&[
        "--orbital",
        "n(N)",
        "--plane",
        "0,1,2",
        "-o",
        &out_text,
        "--force",
    ]);
    assert!(again.status.success());
    assert_eq!(std::fs::read_to_string(&out).expect("rewritten"), svg);
    let cases: [(&[&str], &str); 7] = [
        (&["--orbital", "n(N)", "-o", &out_text], "exists"),
        (&["--orbital", "7z", "-o", &other], "unknown orbital"),
        (
            &["--orbital", "3a1", "--plane", "0,1,1", "-o", &other],
            "twice",
        ),
        (
            &["--orbital", "3a1", "--plane", "0,1,9", "-o", &other],
            "does not exist",
        ),
        (&["--orbital", "3a1", "--plane", "0,1", "-o", &other], "3"),
        (&["--orbital", "3a1", "--grid", "4", "-o", &other], "grid"),
        (&["--orbital", "3a1", "-o", &other_png], ".svg"),
    ];
    for (args, expected) in cases {
        let output = run(args);
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(output.status.code(), Some(2), "{args:?}: {stderr}");
        assert!(stderr.contains(expected), "{args:?}: {stderr}");
    }
    // Collinear atoms on the linear HCN.
    let hcn = repository().join("demo_molecules/hydrogen_cyanide.xyz");
    let output = diptych()
        .args(["map"])
        .arg(&hcn)
        .args(["--orbital", "HOMO", "--plane", "0,1,2", "-o", &other])
        .output()
        .expect("diptych runs");
    assert_eq!(output.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&output.stderr).contains("collinear"));
    assert!(!PathBuf::from(&other).exists());
}
