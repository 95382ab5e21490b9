//! End-to-end tests of the `diptych` command line: exit codes, messages and JSON shape.

use std::path::{Path, PathBuf};
use std::process::Command;

fn diptych() -> Command {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
}

fn repository() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn demo_files() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(repository().join("demo_molecules"))
        .expect("demo_molecules exists")
        .filter_map(|entry| entry.ok().map(|e| e.path()))
        .filter(|path| {
            let name = path.to_string_lossy();
            name.ends_with(".xyz") || name.ends_with(".diptych.ron")
        })
        .collect();
    files.sort();
    files
}

#[test]
fn ammonia_json_has_four_atoms_and_eight_electrons() {
    let output = diptych()
        .args(["analyze", "demo_molecules/ammonia.xyz", "--format", "json"])
        .current_dir(repository())
        .output()
        .unwrap();
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).expect("valid JSON");
    assert_eq!(json["molecule"]["atoms"].as_array().map(Vec::len), Some(4));
    assert_eq!(json["electrons"], 8);
    assert_eq!(json["molecule"]["formula"], "H3N");
    assert_eq!(json["molecule"]["bonds"].as_array().map(Vec::len), Some(3));
}

#[test]
fn charge_flag_changes_the_electron_count() {
    let output = diptych()
        .args([
            "analyze",
            "demo_molecules/ammonia.xyz",
            "--format",
            "json",
            "--charge",
            "-1",
        ])
        .current_dir(repository())
        .output()
        .unwrap();
    assert!(output.status.success());
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(json["electrons"], 9);
}

#[test]
fn every_demo_file_analyzes() {
    let files = demo_files();
    assert!(
        files.len() >= 11,
        "the demo set of DESIGN §7 has 11 molecules"
    );
    for file in files {
        for format in ["text", "json"] {
            let output = diptych()
                .args(["analyze", &file.to_string_lossy(), "--format", format])
                .output()
                .unwrap();
            assert!(
                output.status.success(),
                "{}: {}",
                file.display(),
                String::from_utf8_lossy(&output.stderr)
            );
        }
    }
}

#[test]
fn every_bad_input_gives_exit_2_and_a_one_line_message() {
    let folder = repository().join("tests/bad_inputs");
    let expected = std::fs::read_to_string(folder.join("expected.tsv")).unwrap();
    let mut checked = 0;
    for line in expected
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
    {
        let (file, message) = line.split_once('\t').expect("file<TAB>message");
        let path = folder.join(file);
        assert!(path.exists(), "{file} is listed but missing");
        let output = diptych()
            .args(["analyze", &path.to_string_lossy()])
            .output()
            .unwrap();
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(output.status.code(), Some(2), "{file}: {stderr}");
        assert!(!stderr.contains("panicked"), "{file}: {stderr}");
        assert_eq!(
            stderr.trim_end().lines().count(),
            1,
            "{file}: one line expected, got {stderr}"
        );
        assert!(
            stderr.contains(message),
            "{file}: expected '{message}' in '{stderr}'"
        );
        assert!(output.stdout.is_empty(), "{file}: nothing on stdout");
        checked += 1;
    }
    let on_disk = std::fs::read_dir(&folder).unwrap().count() - 1;
    assert_eq!(
        checked, on_disk,
        "every file in tests/bad_inputs is listed in expected.tsv"
    );
    assert!(checked >= 20);
}

#[test]
fn missing_file_and_bad_flags_are_bad_input() {
    let output = diptych()
        .args(["analyze", "no/such/file.xyz"])
        .output()
        .unwrap();
    assert_eq!(output.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&output.stderr).contains("cannot read"));
    let output = diptych()
        .args(["analyze", "demo_molecules/water.xyz", "--format", "yaml"])
        .current_dir(repository())
        .output()
        .unwrap();
    assert_eq!(output.status.code(), Some(2));
}

#[test]
fn help_explains_every_subcommand() {
    let output = diptych().arg("--help").output().unwrap();
    let text = String::from_utf8_lossy(&output.stdout);
    assert!(output.status.success());
    for word in ["analyze", "--screenshot", "FILE"] {
        assert!(text.contains(word), "help lacks {word}: {text}");
    }
}

#[test]
fn project_file_round_trips_through_the_cli() {
    let folder = tempfile::tempdir().unwrap();
    let opened =
        diptych::project::open_path(Path::new(&repository().join("demo_molecules/water.xyz")))
            .unwrap();
    let path = folder.path().join("water.diptych.ron");
    opened.project.save(&path).unwrap();
    let output = diptych()
        .args(["analyze", &path.to_string_lossy(), "--format", "json"])
        .output()
        .unwrap();
    assert!(output.status.success());
    let json: serde_json::Value = serde_json::from_slice(&output.stdout).unwrap();
    assert_eq!(json["electrons"], 8);
}
