//! Property (issue 18, checks): a project file the program writes and then corrupts at
//! random (characters replaced, ranges deleted or repeated, text inserted) either loads or
//! is refused with a one-line message, never a panic. The library is tried on many
//! corruptions; the binary on fewer, where a refusal must be exit code 2 with one line on
//! stderr and a load must analyse (exit 0), and a run that never ends fails the test.

use std::process::Command;

use diptych::chem::{Atom, Element, Molecule};
use diptych::project::Project;
use proptest::prelude::*;

/// Characters that matter to RON, numbers and messages.
const ALPHABET: &[char] = &[
    '(', ')', '[', ']', '{', '}', ',', ':', '"', '\'', '0', '1', '9', '-', '+', '.', 'e', 'E', 'N',
    'a', 'I', 'i', 'n', 'f', '_', 'x', ' ', '\n', '\t', '\u{0}', '\u{1b}', '\u{feff}', 'σ', '/',
    '*', '#', '!',
];

/// One edit of the text, positions as fractions of its length.
#[derive(Clone, Debug)]
enum Edit {
    Replace(f64, char),
    Delete(f64, usize),
    Repeat(f64, usize),
    Insert(f64, String),
}

fn edit() -> impl Strategy<Value = Edit> {
    let char_of = proptest::sample::select(ALPHABET);
    prop_oneof![
        (0.0..1.0, char_of.clone()).prop_map(|(at, c)| Edit::Replace(at, c)),
        (0.0..1.0, 1usize..40).prop_map(|(at, n)| Edit::Delete(at, n)),
        (0.0..1.0, 1usize..40).prop_map(|(at, n)| Edit::Repeat(at, n)),
        (0.0..1.0, proptest::collection::vec(char_of, 1..12))
            .prop_map(|(at, cs)| Edit::Insert(at, cs.into_iter().collect())),
    ]
}

fn apply(text: &str, edits: &[Edit]) -> String {
    let mut chars: Vec<char> = text.chars().collect();
    for edit in edits {
        let at = |f: f64| ((chars.len() as f64 * f) as usize).min(chars.len());
        match edit {
            Edit::Replace(f, c) => {
                let i = at(*f).min(chars.len().saturating_sub(1));
                if let Some(slot) = chars.get_mut(i) {
                    *slot = *c;
                }
            }
            Edit::Delete(f, n) => {
                let i = at(*f);
                let end = (i + n).min(chars.len());
                chars.drain(i..end);
            }
            Edit::Repeat(f, n) => {
                let i = at(*f);
                let end = (i + n).min(chars.len());
                let copy: Vec<char> = chars[i..end].to_vec();
                chars.splice(end..end, copy);
            }
            Edit::Insert(f, s) => {
                let i = at(*f);
                chars.splice(i..i, s.chars());
            }
        }
    }
    chars.into_iter().collect()
}

/// A project as the program writes it: ammonia with a title and a selected orbital.
fn written_project() -> String {
    let s = 0.94;
    let molecule = Molecule::new(
        "ammonia",
        vec![
            Atom::new(Element::N, [0.0, 0.0, 0.1]),
            Atom::new(Element::H, [s, 0.0, -0.27]),
            Atom::new(Element::H, [-0.47, 0.81, -0.27]),
            Atom::new(Element::H, [-0.47, -0.81, -0.27]),
        ],
        0,
    );
    let mut project = Project::new(molecule);
    project.selected_orbital = Some("3a1".into());
    project.to_ron().expect("the project writes")
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(512))]

    #[test]
    fn a_corrupted_project_loads_or_is_refused_in_one_line(
        edits in proptest::collection::vec(edit(), 1..5)
    ) {
        let text = apply(&written_project(), &edits);
        if let Err(error) = Project::from_ron(&text) {
            let message = error.to_string();
            prop_assert!(!message.trim().is_empty());
            prop_assert!(!message.contains('\n'), "one line: {message:?}");
            prop_assert!(!message.contains("u32") && !message.contains("f64"), "{message}");
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]

    #[test]
    fn the_binary_analyses_or_refuses_a_corrupted_project(
        edits in proptest::collection::vec(edit(), 1..4)
    ) {
        let folder = tempfile::tempdir().expect("temp");
        let path = folder.path().join("corrupt.diptych.ron");
        std::fs::write(&path, apply(&written_project(), &edits)).expect("written");
        let output = run_without_hanging(&path);
        let stderr = String::from_utf8_lossy(&output.stderr);
        prop_assert!(!stderr.contains("panicked"), "{stderr}");
        match output.status.code() {
            Some(0) => {}
            Some(2) => prop_assert_eq!(stderr.trim().lines().count(), 1, "{}", stderr),
            other => prop_assert!(false, "exit {other:?}: {stderr}"),
        }
    }
}

/// `diptych analyze FILE`, killed and failed if it has not finished after a generous
/// minute: a hang detector, not a measure of speed (an analysis of ammonia takes ms).
fn run_without_hanging(path: &std::path::Path) -> std::process::Output {
    use std::process::Stdio;
    let mut child = Command::new(env!("CARGO_BIN_EXE_diptych"))
        .args(["analyze", &path.to_string_lossy()])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("diptych runs");
    let start = std::time::Instant::now();
    while child.try_wait().expect("waits").is_none() {
        if start.elapsed() > std::time::Duration::from_secs(60) {
            let _ = child.kill();
            panic!("diptych hung on {}", path.display());
        }
        std::thread::sleep(std::time::Duration::from_millis(5));
    }
    child.wait_with_output().expect("output")
}

#[test]
fn the_uncorrupted_project_loads() {
    assert!(Project::from_ron(&written_project()).is_ok());
    assert_eq!(apply("abc", &[Edit::Delete(0.0, 1)]), "bc");
    assert_eq!(apply("abc", &[Edit::Repeat(0.0, 2)]), "ababc");
}
