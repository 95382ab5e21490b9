//! XYZ files: an atom count, a comment line, then one `symbol x y z` line per atom (Å).
//!
//! The format is a de-facto standard with no formal specification (common practice, no
//! source). Diptych reads an optional `charge=N` token from the comment line; for a file
//! with several frames it reads the first and reports a notice.

use super::{ParseError, Parsed};
use crate::chem::element::Element;
use crate::chem::molecule::{Atom, MAX_ATOMS, MAX_CHARGE, Molecule};

/// Parses XYZ text; `name` becomes the molecule's name.
pub fn parse_xyz(text: &str, name: &str) -> Result<Parsed, ParseError> {
    let lines: Vec<&str> = text.lines().collect();
    let first = lines
        .iter()
        .position(|line| !line.trim().is_empty())
        .ok_or(ParseError::Empty)?;
    let count_text = lines[first].trim();
    let count: usize = count_text.parse().map_err(|_| {
        ParseError::at(
            first + 1,
            format!(
                "expected the number of atoms, found '{}'",
                shorten(count_text)
            ),
        )
    })?;
    if count == 0 {
        return Err(ParseError::at(first + 1, "the atom count is 0"));
    }
    if count > MAX_ATOMS {
        return Err(ParseError::at(
            first + 1,
            format!("{count} atoms is more than the limit of {MAX_ATOMS}"),
        ));
    }
    let comment_index = first + 1;
    let comment = lines.get(comment_index).copied().unwrap_or("").trim();
    let charge = parse_charge_token(comment, comment_index + 1)?;
    let mut atoms = Vec::with_capacity(count);
    for offset in 0..count {
        let index = comment_index + 1 + offset;
        let line = lines.get(index).ok_or_else(|| {
            ParseError::at(
                index + 1,
                format!(
                    "expected atom {} of {count}, but the file ends (truncated?)",
                    offset + 1
                ),
            )
        })?;
        atoms.push(parse_atom_line(line, index + 1)?);
    }
    let rest = &lines[comment_index + 1 + count..];
    let mut notices = Vec::new();
    if rest.iter().any(|line| !line.trim().is_empty()) {
        notices.push(format!(
            "the file has more lines after the first {count} atoms (another frame?); only the first frame was read"
        ));
    }
    // The comment line usually carries a source citation, so the name comes from the file.
    // XYZ has no bond orders: they are perceived from the usual valences.
    let mut molecule = Molecule::new(name, atoms, charge);
    molecule.perceive_bond_orders();
    Ok(Parsed { molecule, notices })
}

fn parse_atom_line(line: &str, line_number: usize) -> Result<Atom, ParseError> {
    let fields: Vec<&str> = line.split_whitespace().collect();
    if fields.len() < 4 {
        return Err(ParseError::at(
            line_number,
            format!(
                "expected 'element x y z', found {} field(s): '{}'",
                fields.len(),
                shorten(line.trim())
            ),
        ));
    }
    let element = match fields[0].parse::<u32>() {
        Ok(number) => Element::from_atomic_number(number),
        Err(_) => Element::from_symbol(fields[0]),
    }
    .map_err(|error| ParseError::at(line_number, error.to_string()))?;
    let mut position = [0.0; 3];
    for (axis, slot) in position.iter_mut().enumerate() {
        let text = fields[axis + 1];
        let value: f64 = text.parse().map_err(|_| {
            ParseError::at(
                line_number,
                format!(
                    "expected a number for the {} coordinate, found '{}'",
                    ["x", "y", "z"][axis],
                    shorten(text)
                ),
            )
        })?;
        if !value.is_finite() {
            return Err(ParseError::at(
                line_number,
                format!(
                    "the {} coordinate '{}' is not finite",
                    ["x", "y", "z"][axis],
                    shorten(text)
                ),
            ));
        }
        *slot = value;
    }
    Ok(Atom::new(element, position))
}

/// Finds `charge=N` (case-insensitive) in the comment line.
fn parse_charge_token(comment: &str, line_number: usize) -> Result<i32, ParseError> {
    for token in comment.split_whitespace() {
        let lower = token.to_ascii_lowercase();
        if let Some(value) = lower.strip_prefix("charge=") {
            let value = value.trim_end_matches([',', ';']);
            let Ok(charge) = value.parse::<i64>() else {
                return Err(ParseError::at(
                    line_number,
                    format!("expected an integer charge in '{}'", shorten(token)),
                ));
            };
            return i32::try_from(charge)
                .ok()
                .filter(|c| c.unsigned_abs() <= MAX_CHARGE.unsigned_abs())
                .ok_or_else(|| {
                    ParseError::at(
                        line_number,
                        format!(
                            "the charge {charge} is out of range (it must be -{MAX_CHARGE} to {MAX_CHARGE})"
                        ),
                    )
                });
        }
    }
    Ok(0)
}

/// Writes a molecule as XYZ, with its name and a `charge=N` token in the comment line.
pub fn write_xyz(molecule: &Molecule) -> String {
    let mut text = format!("{}\n", molecule.atoms.len());
    let name: String = molecule.name.chars().filter(|c| !c.is_control()).collect();
    text.push_str(&format!("{name} charge={}\n", molecule.charge));
    for atom in &molecule.atoms {
        text.push_str(&format!(
            "{:<2} {:>14.8} {:>14.8} {:>14.8}\n",
            atom.element.symbol(),
            atom.position.x,
            atom.position.y,
            atom.position.z
        ));
    }
    text
}

/// At most 40 characters of user text for an error message, control characters escaped.
pub(crate) fn shorten(text: &str) -> String {
    crate::message::shown(text)
}

#[cfg(test)]
mod tests {
    use super::*;

    const WATER: &str =
        "3\nwater charge=0\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692\n";

    #[test]
    fn reads_atoms_and_bonds() -> Result<(), ParseError> {
        let parsed = parse_xyz(WATER, "water")?;
        assert_eq!(parsed.molecule.atoms.len(), 3);
        assert_eq!(parsed.molecule.bonds.len(), 2);
        assert!(parsed.notices.is_empty());
        Ok(())
    }

    #[test]
    fn charge_token_and_round_trip() -> Result<(), ParseError> {
        let text = "2\nhydroxide charge=-1\nO 0 0 0\nH 0 0 0.97\n";
        let molecule = parse_xyz(text, "x")?.molecule;
        assert_eq!(molecule.charge, -1);
        assert_eq!(molecule.electron_count(), 8);
        let again = parse_xyz(&write_xyz(&molecule), "x")?.molecule;
        assert_eq!(again.charge, -1);
        assert!((again.atoms[1].position.z - 0.97).abs() < 1e-8);
        Ok(())
    }

    #[test]
    fn second_frame_gives_a_notice() -> Result<(), ParseError> {
        let text = format!("{WATER}{WATER}");
        let parsed = parse_xyz(&text, "w")?;
        assert_eq!(parsed.notices.len(), 1);
        Ok(())
    }

    #[test]
    fn errors_name_the_line() -> Result<(), ParseError> {
        let error = parse_xyz("3\nw\nO 0 0 0\nH 0 x 0\n", "w").unwrap_err();
        assert_eq!(
            error.to_string(),
            "line 4: expected a number for the y coordinate, found 'x'"
        );
        let error = parse_xyz("3\nw\nO 0 0 0\n", "w").unwrap_err();
        assert!(
            error
                .to_string()
                .starts_with("line 4: expected atom 2 of 3"),
            "{error}"
        );
        let error = parse_xyz("three\n", "w").unwrap_err();
        assert!(
            error
                .to_string()
                .starts_with("line 1: expected the number of atoms")
        );
        let error = parse_xyz("1\n\nQq 0 0 0\n", "w").unwrap_err();
        assert!(error.to_string().contains("'Qq'"));
        let parsed = parse_xyz("1\n\n6 0 0 0 \n", "w")?;
        assert_eq!(parsed.molecule.atoms[0].element, Element::C);
        Ok(())
    }
}
