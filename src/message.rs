//! How text from a user's file is quoted in a message: control characters are shown
//! escaped (`\t`, `\u{1b}`; Rust's `char::escape_debug` notation) rather than stripped or
//! sent raw to a terminal, and a long token is cut to [`SHOWN_CHARACTERS`] with an
//! ellipsis, so that a message stays one short line whatever the input.

/// At most this many characters of a token are quoted in a message.
pub const SHOWN_CHARACTERS: usize = 40;

/// `text` fit for a one-line message: escaped and cut to [`SHOWN_CHARACTERS`].
pub fn shown(text: &str) -> String {
    let count = text.chars().count();
    let kept: String = text.chars().take(SHOWN_CHARACTERS).collect();
    let mut out = escaped(&kept);
    if count > SHOWN_CHARACTERS {
        out.push('…');
    }
    out
}

/// `text` with its control characters (and a byte-order mark) escaped, not cut.
pub fn escaped(text: &str) -> String {
    let mut out = String::new();
    for c in text.chars() {
        if c.is_control() || c == '\u{feff}' {
            out.extend(c.escape_debug());
        } else {
            out.push(c);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn control_characters_are_escaped_not_stripped() {
        assert_eq!(shown("a\tb"), "a\\tb");
        assert_eq!(shown("x\u{1b}[31m"), "x\\u{1b}[31m");
        assert_eq!(shown("line\nbreak"), "line\\nbreak");
        assert_eq!(shown("σ(N–H)"), "σ(N–H)");
    }

    #[test]
    fn long_tokens_are_cut() {
        let long = "x".repeat(10_000);
        assert_eq!(shown(&long).chars().count(), SHOWN_CHARACTERS + 1);
    }
}
