//! Shared by the command-line tests: running the binary from the repository root, and the
//! check that a refusal is exit 2 with one line naming the problem.

#![allow(dead_code)]

use std::process::{Command, Output};

/// Runs the program with `args` from the repository root.
pub fn diptych(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("diptych runs")
}

/// Exit 2 and exactly one line on stderr that contains `message`.
pub fn assert_refused(output: &Output, message: &str) {
    let stderr = String::from_utf8_lossy(&output.stderr);
    assert_eq!(output.status.code(), Some(2), "{stderr}");
    assert!(
        stderr.contains(message),
        "expected '{message}' in '{stderr}'"
    );
    assert_eq!(stderr.trim().lines().count(), 1, "one line: {stderr}");
}
