//! `diptych scan` end to end: CSV and SVG outputs, and bad input refused with exit code 2
//! and a message before any work (DESIGN §5.4 exit codes).

use std::path::PathBuf;
use std::process::{Command, Output};

type TestResult = Result<(), Box<dyn std::error::Error>>;

fn ammonia() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz")
}

fn run(args: &[&str]) -> Result<Output, std::io::Error> {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(args)
        .output()
}

#[test]
fn csv_has_one_row_per_point_and_svg_is_deterministic() -> TestResult {
    let dir = tempfile::tempdir()?;
    let input = ammonia();
    let input = input.to_str().ok_or("path")?;
    let csv_path = dir.path().join("walsh.csv");
    let csv = csv_path.to_str().ok_or("path")?;
    let output = run(&[
        "scan",
        input,
        "--pyramidalize",
        "0",
        "--from",
        "90",
        "--to",
        "120",
        "--steps",
        "91",
        "-o",
        csv,
    ])?;
    assert!(
        output.status.success(),
        "{}",
        String::from_utf8_lossy(&output.stderr)
    );
    let text = std::fs::read_to_string(&csv_path)?;
    assert_eq!(text.lines().count(), 92, "header + 91 points");
    assert!(text.lines().next().is_some_and(|h| h.contains("3a1 (eV)")));
    // Without --force an existing file is not replaced.
    let again = run(&[
        "scan",
        input,
        "--pyramidalize",
        "0",
        "--from",
        "90",
        "--to",
        "120",
        "--steps",
        "5",
        "-o",
        csv,
    ])?;
    assert_eq!(again.status.code(), Some(2));
    assert_eq!(std::fs::read_to_string(&csv_path)?, text);

    let mut svgs = Vec::new();
    for name in ["a.svg", "b.svg"] {
        let path = dir.path().join(name);
        let out = path.to_str().ok_or("path")?;
        let output = run(&[
            "scan", input, "--angle", "1,0,2", "--from", "95", "--to", "115", "--steps", "21",
            "-o", out,
        ])?;
        assert!(
            output.status.success(),
            "{}",
            String::from_utf8_lossy(&output.stderr)
        );
        svgs.push(std::fs::read_to_string(&path)?);
    }
    assert_eq!(svgs[0], svgs[1], "the same scan gives the same bytes");
    assert!(svgs[0].starts_with("<?xml") && svgs[0].trim_end().ends_with("</svg>"));
    assert!(svgs[0].contains("<polyline") && svgs[0].contains("id=\"legend\""));
    Ok(())
}

#[test]
fn bad_input_exits_2_with_a_message_and_writes_nothing() -> TestResult {
    let dir = tempfile::tempdir()?;
    let input = ammonia();
    let input = input.to_str().ok_or("path")?;
    let out_path = dir.path().join("out.csv");
    let out = out_path.to_str().ok_or("path")?;
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (vec!["--angle", "1,0,7"], "out of range"),
        (vec!["--angle", "1,0,1"], "named twice"),
        (vec!["--angle", "1,0"], "takes 3 atom indices"),
        (
            vec!["--bond", "0,1", "--angle", "1,0,2"],
            "cannot be used with",
        ),
        (
            vec!["--pyramidalize", "0", "--steps-override"],
            "unexpected argument",
        ),
    ];
    for (coordinate, expected) in cases {
        let mut args = vec!["scan", input];
        args.extend(&coordinate);
        args.extend(["--from", "100", "--to", "110", "--steps", "5", "-o", out]);
        let output = run(&args)?;
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(output.status.code(), Some(2), "{coordinate:?}: {stderr}");
        assert!(
            stderr.contains(expected),
            "{coordinate:?}: '{stderr}' lacks '{expected}'"
        );
        assert!(!out_path.exists());
    }
    for (steps, expected) in [("0", "at least 2"), ("10001", "more than the limit")] {
        let output = run(&[
            "scan",
            input,
            "--pyramidalize",
            "0",
            "--from",
            "100",
            "--to",
            "110",
            "--steps",
            steps,
            "-o",
            out,
        ])?;
        let stderr = String::from_utf8_lossy(&output.stderr);
        assert_eq!(output.status.code(), Some(2));
        assert!(
            stderr.starts_with("diptych: ") && stderr.contains(expected),
            "{stderr}"
        );
        assert!(!out_path.exists());
    }
    let wrong_extension = dir.path().join("out.txt");
    let output = run(&[
        "scan",
        input,
        "--pyramidalize",
        "0",
        "--from",
        "100",
        "--to",
        "110",
        "--steps",
        "5",
        "-o",
        wrong_extension.to_str().ok_or("path")?,
    ])?;
    assert_eq!(output.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&output.stderr).contains(".csv or .svg"));
    Ok(())
}
