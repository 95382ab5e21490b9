//! A RON reading error in plain words: the line and column where reading stopped and what
//! was wrong there, without the reader's internal names (Rust types such as `u32` or
//! struct names). An unknown field is named with the section it is in and the closest
//! known field (edit distance, Levenshtein 1966), so a misspelled setting is found at once.

use ron::error::{Error, SpannedError};

use crate::message::{escaped, shown};

/// The error as (line, column, message).
pub(crate) fn plain(error: &SpannedError) -> (usize, usize, String) {
    let start = error.span.start;
    (start.line, start.col, words(&error.code))
}

fn words(code: &Error) -> String {
    match code {
        Error::NoSuchStructField {
            expected,
            found,
            outer,
        } => unknown_field(found, expected, outer.as_deref()),
        Error::MissingStructField { field, outer } => {
            format!(
                "the field '{field}'{} is missing",
                section(outer.as_deref())
            )
        }
        Error::DuplicateStructField { field, outer } => {
            format!(
                "the field '{field}'{} is given twice",
                section(outer.as_deref())
            )
        }
        Error::NoSuchEnumVariant {
            expected, found, ..
        } => format!(
            "'{}' is not one of the choices ({})",
            shown(found),
            expected.join(", ")
        ),
        Error::Message(text) | Error::Io(text) => plain_types(text),
        Error::InvalidValueForType { expected, found } => {
            format!("expected {}, found {}", plain_types(expected), shown(found))
        }
        Error::Eof => "the file ends too early (a bracket or quote is not closed)".into(),
        Error::UnexpectedChar(c) => format!("unexpected character '{}'", shown(&c.to_string())),
        Error::TrailingCharacters => "there is text after the end of the project".into(),
        Error::ExpectedComma => "a comma is missing".into(),
        Error::ExpectedMapColon => "a ':' is missing after a field name".into(),
        Error::ExpectedStructLike | Error::ExpectedNamedStructLike(_) => {
            "expected '(' to open a group of fields".into()
        }
        Error::ExpectedStructLikeEnd | Error::ExpectedOptionEnd => {
            "expected ')' to close a group".into()
        }
        Error::ExpectedArray => "expected '[' to open a list".into(),
        Error::ExpectedArrayEnd => "expected ']' to close a list".into(),
        Error::ExpectedString | Error::ExpectedStringEnd => "expected text in quotes".into(),
        Error::ExpectedFloat => "expected a number".into(),
        Error::ExpectedInteger | Error::InvalidIntegerDigit { .. } => {
            "expected a whole number".into()
        }
        Error::IntegerOutOfBounds => "a whole number is too large or negative here".into(),
        Error::ExpectedBoolean => "expected true or false".into(),
        Error::ExceededRecursionLimit => "the brackets nest too deeply".into(),
        Error::UnclosedBlockComment | Error::UnclosedLineComment => {
            "a comment is not closed".into()
        }
        other => plain_types(&other.to_string()),
    }
}

fn unknown_field(found: &str, expected: &[&str], outer: Option<&str>) -> String {
    let mut text = format!("unknown field '{}'{}", shown(found), section(outer));
    if let Some(closest) = expected
        .iter()
        .min_by_key(|known| edit_distance(found, known))
        .filter(|known| edit_distance(found, known) <= 1 + known.len() / 4)
    {
        text.push_str(&format!(" (did you mean '{closest}'?)"));
    } else if !expected.is_empty() {
        text.push_str(&format!(" (known fields: {})", expected.join(", ")));
    }
    text
}

/// The user's name of the section a struct is read into; unknown structs are not named.
fn section(outer: Option<&str>) -> String {
    let name = match outer {
        Some("Project") => "the project",
        Some("Molecule") => "molecule",
        Some("Atom") => "an atom",
        Some("Bond") => "a bond",
        Some("Settings") => "settings",
        Some("SymmetrySettings") => "settings.symmetry",
        Some("EhtSettings") => "settings.eht",
        Some("HybridSettings") => "settings.hybrid",
        Some("LocalizationSettings") => "settings.localization",
        Some("ElementParameters") => "settings.eht.overrides",
        Some("ShellParameters") => "a shell of settings.eht.overrides",
        Some("LadderTitles") => "titles",
        Some("ViewOptions") => "view",
        _ => return String::new(),
    };
    format!(" in {name}")
}

/// Serde's messages name Rust types ("expected u32"); these are said in words.
fn plain_types(text: &str) -> String {
    let mut out = String::new();
    for (n, word) in text.split(' ').enumerate() {
        if n > 0 {
            out.push(' ');
        }
        let (core, tail) = split_punctuation(word);
        let plain = match core {
            "u8" | "u16" | "u32" | "u64" | "usize" => "a whole number ≥ 0",
            "i8" | "i16" | "i32" | "i64" | "isize" => "a whole number",
            "f32" | "f64" => "a number",
            other => other,
        };
        out.push_str(plain);
        out.push_str(tail);
    }
    escaped(
        &out.replace('`', "'")
            .replace("Expected a matrix array", "expected 3 coordinates")
            .replace("struct ", "a group ")
            .replace("enum ", "a choice "),
    )
}

fn split_punctuation(word: &str) -> (&str, &str) {
    let end = word.trim_end_matches([',', '.', ';', ')']).len();
    word.split_at(end)
}

/// Levenshtein distance in characters.
fn edit_distance(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut row: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.chars().enumerate() {
        let mut diagonal = row[0];
        row[0] = i + 1;
        for (j, cb) in b.iter().enumerate() {
            let substitution = diagonal + usize::from(ca != *cb);
            diagonal = row[j + 1];
            row[j + 1] = substitution.min(row[j] + 1).min(row[j + 1] + 1);
        }
    }
    row[b.len()]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn edit_distance_counts_single_changes() {
        assert_eq!(edit_distance("lone_pair_mixng", "lone_pair_mixing"), 1);
        assert_eq!(edit_distance("", "abc"), 3);
        assert_eq!(edit_distance("kitten", "sitting"), 3);
    }

    #[test]
    fn rust_type_names_become_words() {
        assert_eq!(
            plain_types("invalid type: floating point `1.5`, expected u32"),
            "invalid type: floating point '1.5', expected a whole number ≥ 0"
        );
    }
}
