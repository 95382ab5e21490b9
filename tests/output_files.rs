//! No file is replaced by surprise (issue 18, item 4): every command that writes a file,
//! `--screenshot` included, checks its target before any work, counts a dangling symbolic
//! link as an existing file, and with `--force` keeps the replaced file's permissions.
//! (The race — a file that appears during the work — is tested on the writer itself in
//! `src/chem/io/write.rs`.)

use std::path::Path;
use std::process::{Command, Output};

mod cli_support;
use cli_support::assert_refused;

type TestResult = Result<(), Box<dyn std::error::Error>>;

fn diptych(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .env_remove("DISPLAY")
        .env_remove("WAYLAND_DISPLAY")
        .output()
        .expect("diptych runs")
}

fn text(path: &Path) -> String {
    path.to_string_lossy().into_owned()
}

/// Every file-writing command line, writing to `out`.
fn commands(out: &str, extension: &str) -> Vec<Vec<String>> {
    let water = "demo_molecules/water.xyz";
    let lines: Vec<Vec<&str>> = match extension {
        "svg" => vec![
            vec!["export", water, "-o", out],
            vec!["map", water, "--orbital", "1b1", "-o", out],
            vec!["scan", water, "--symmetric-bend", "0"],
        ],
        "csv" => vec![
            vec!["report", water, "-o", out],
            vec![
                "scan", water, "--bond", "0,1", "--from", "0.9", "--to", "1.0",
            ],
        ],
        _ => vec![vec!["--screenshot", out, water]],
    };
    lines
        .into_iter()
        .map(|mut line| {
            if line[0] == "scan" {
                if line.len() == 4 {
                    line.extend(["--from", "100", "--to", "110"]);
                }
                line.extend(["--steps", "2", "-o", out]);
            }
            line.into_iter().map(String::from).collect()
        })
        .collect()
}

#[cfg(unix)]
#[test]
fn a_dangling_link_is_never_replaced() -> TestResult {
    let folder = tempfile::tempdir()?;
    for extension in ["svg", "csv", "png"] {
        let out = folder.path().join(format!("out.{extension}"));
        let target = folder.path().join(format!("elsewhere.{extension}"));
        std::os::unix::fs::symlink(&target, &out)?;
        for line in commands(&text(&out), extension) {
            let args: Vec<&str> = line.iter().map(String::as_str).collect();
            assert_refused(&diptych(&args), "exists; add --force");
            assert!(!target.exists(), "{args:?} wrote through the link");
            assert!(std::fs::symlink_metadata(&out)?.file_type().is_symlink());
        }
    }
    Ok(())
}

#[test]
fn screenshot_checks_its_name_and_folder_before_the_window_opens() -> TestResult {
    let folder = tempfile::tempdir()?;
    let jpeg = folder.path().join("shot.jpg");
    assert_refused(
        &diptych(&["--screenshot", &text(&jpeg), "demo_molecules/water.xyz"]),
        "must end in .png",
    );
    let missing = folder.path().join("no/such/folder/shot.png");
    assert_refused(
        &diptych(&["--screenshot", &text(&missing), "demo_molecules/water.xyz"]),
        "does not exist",
    );
    let existing = folder.path().join("shot.png");
    std::fs::write(&existing, b"keep me")?;
    assert_refused(
        &diptych(&["--screenshot", &text(&existing), "demo_molecules/water.xyz"]),
        "add --force",
    );
    assert_eq!(std::fs::read(&existing)?, b"keep me");
    // --force belongs to --screenshot; alone it is a usage error, not a silent no-op.
    let output = diptych(&["--force", "demo_molecules/water.xyz"]);
    assert_eq!(output.status.code(), Some(2));
    assert_eq!(
        std::fs::read_dir(folder.path())?.count(),
        1,
        "nothing written"
    );
    Ok(())
}

#[cfg(unix)]
#[test]
fn force_keeps_a_read_only_file_read_only() -> TestResult {
    use std::os::unix::fs::PermissionsExt;
    let folder = tempfile::tempdir()?;
    for extension in ["svg", "csv"] {
        let out = folder.path().join(format!("out.{extension}"));
        for line in commands(&text(&out), extension) {
            std::fs::write(&out, b"old")?;
            std::fs::set_permissions(&out, std::fs::Permissions::from_mode(0o440))?;
            let mut args: Vec<&str> = line.iter().map(String::as_str).collect();
            args.push("--force");
            let output = diptych(&args);
            let stderr = String::from_utf8_lossy(&output.stderr);
            assert!(output.status.success(), "{args:?}: {stderr}");
            assert_ne!(std::fs::read(&out)?, b"old", "{args:?} replaced it");
            let mode = std::fs::metadata(&out)?.permissions().mode() & 0o777;
            assert_eq!(mode, 0o440, "{args:?} kept the permissions");
            std::fs::set_permissions(&out, std::fs::Permissions::from_mode(0o640))?;
        }
    }
    assert_eq!(
        std::fs::read_dir(folder.path())?.count(),
        2,
        "no temporaries"
    );
    Ok(())
}
