//! Messages say what the chemist needs (issue 18, item 6): a UTF-8 byte-order mark is
//! skipped, control characters in a shown token are escaped, range errors state the
//! range, a scan of two atoms that are not bonded says so, and negative numbers reach our
//! own range checks instead of the argument parser's "use '-- -1'" hint.

mod cli_support;
use cli_support::{assert_refused, diptych};

#[test]
fn a_byte_order_mark_is_skipped() {
    let folder = tempfile::tempdir().expect("temp");
    let path = folder.path().join("water.xyz");
    let text = "\u{feff}3\nwater\nO 0 0 0\nH 0 0.757 -0.586\nH 0 -0.757 -0.586\n";
    std::fs::write(&path, text).expect("written");
    let output = diptych(&["analyze", &path.to_string_lossy(), "--format", "json"]);
    let stderr = String::from_utf8_lossy(&output.stderr);
    assert!(output.status.success(), "{stderr}");
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).expect("json");
    assert_eq!(json["molecule"]["atoms"].as_array().map(Vec::len), Some(3));
}

#[test]
fn negative_values_get_our_range_messages() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("out.svg");
    let out = out.to_string_lossy();
    let water = "demo_molecules/water.xyz";
    let cases: [(Vec<&str>, &str); 5] = [
        (
            vec![
                "scan", water, "--bond", "0,1", "--from", "-1", "--to", "1", "--steps", "2",
            ],
            "a bond length of -1 is not possible (it must be at least 0.5 Å)",
        ),
        (
            vec![
                "scan", water, "--bond", "0,1", "--from", "1", "--to", "2", "--steps", "-2",
            ],
            "-2 points: a scan has 2 to 10000 points",
        ),
        (
            vec!["map", water, "--orbital", "HOMO", "--grid", "-5"],
            "a grid of -5 points a side is not usable (it must be 8 to 2048)",
        ),
        (
            vec!["map", water, "--orbital", "HOMO", "--margin", "-1"],
            "it must be finite and 0 to 100 Å",
        ),
        (
            vec!["analyze", water, "--charge", "-999"],
            "the charge -999 is out of range (it must be -100 to 100)",
        ),
    ];
    for (mut args, message) in cases {
        if args[0] != "analyze" {
            args.extend(["-o", &out]);
        }
        let output = diptych(&args);
        assert_refused(&output, message);
        assert!(!String::from_utf8_lossy(&output.stderr).contains("'-- -"));
    }
}

#[test]
fn a_scan_between_atoms_that_are_not_bonded_says_so() {
    let folder = tempfile::tempdir().expect("temp");
    let out = folder.path().join("out.csv");
    // Water's two hydrogens: joined through O, not bonded — formerly called "in a ring".
    let args = [
        "scan",
        "demo_molecules/water.xyz",
        "--bond",
        "1,2",
        "--from",
        "1",
        "--to",
        "2",
        "--steps",
        "2",
        "-o",
        &out.to_string_lossy(),
    ];
    let output = diptych(&args);
    assert_refused(&output, "atoms 1 and 2 are not bonded to each other");
    assert!(!String::from_utf8_lossy(&output.stderr).contains("ring"));
    assert!(!out.exists());
}
