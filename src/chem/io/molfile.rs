//! MDL molfile V2000 reader: header, counts line, atom block, bond block and the
//! `M  CHG` property (BIOVIA, *CTfile Formats*, 2020 edition, the V2000 connection table).
//!
//! Atom charges come from the atom block's charge code (3 → +1 … 5 → −1) unless an
//! `M  CHG` line is present, which then supersedes them, as the format prescribes.
//! The bond list of the file replaces distance-based perception. Aromatic bonds (type 4)
//! are kept as aromatic and given a Kekulé structure (`Molecule::kekulize_aromatic`); a
//! molfile whose header (line 2, columns 21–22) says 2D is refused, since a flat drawing
//! is not a geometry.

use super::xyz::shorten;
use super::{ParseError, Parsed};
use crate::chem::element::Element;
use crate::chem::molecule::{Atom, Bond, MAX_ATOMS, Molecule};

/// Parses molfile text (the first record of an SD file).
pub fn parse_molfile(text: &str, name: &str) -> Result<Parsed, ParseError> {
    let lines: Vec<&str> = text.lines().collect();
    if lines.iter().all(|line| line.trim().is_empty()) {
        return Err(ParseError::Empty);
    }
    let counts_line = lines.get(3).ok_or_else(|| {
        ParseError::at(
            lines.len() + 1,
            "expected the counts line (line 4), but the file ends",
        )
    })?;
    if counts_line.contains("V3000") {
        return Err(ParseError::at(
            4,
            "V3000 molfiles are not supported; save as V2000",
        ));
    }
    refuse_two_dimensional(&lines)?;
    let atom_count = fixed_int(counts_line, 0, 4, "the atom count (columns 1–3)")?;
    let bond_count = fixed_int(counts_line, 3, 4, "the bond count (columns 4–6)")?;
    if atom_count == 0 {
        return Err(ParseError::at(4, "the atom count is 0"));
    }
    if atom_count as usize > MAX_ATOMS {
        return Err(ParseError::at(
            4,
            format!("{atom_count} atoms is more than the limit of {MAX_ATOMS}"),
        ));
    }
    let atom_count = atom_count as usize;
    let bond_count = bond_count as usize;
    let mut atoms = Vec::with_capacity(atom_count);
    let mut block_charges = Vec::with_capacity(atom_count);
    for n in 0..atom_count {
        let index = 4 + n;
        let line = lines.get(index).ok_or_else(|| {
            ParseError::at(
                index + 1,
                format!("expected atom {} of {atom_count}, but the file ends", n + 1),
            )
        })?;
        let (atom, charge) = parse_atom_line(line, index + 1)?;
        atoms.push(atom);
        block_charges.push(charge);
    }
    let mut bonds: Vec<Bond> = Vec::with_capacity(bond_count);
    for n in 0..bond_count {
        let index = 4 + atom_count + n;
        let line = lines.get(index).ok_or_else(|| {
            ParseError::at(
                index + 1,
                format!("expected bond {} of {bond_count}, but the file ends", n + 1),
            )
        })?;
        let line_number = index + 1;
        let a = fixed_int(
            line,
            0,
            line_number,
            "the first atom of the bond (columns 1–3)",
        )? as usize;
        let b = fixed_int(
            line,
            3,
            line_number,
            "the second atom of the bond (columns 4–6)",
        )? as usize;
        let order = fixed_int(line, 6, line_number, "the bond type (columns 7–9)")?;
        for end in [a, b] {
            if end == 0 || end > atom_count {
                return Err(ParseError::at(
                    line_number,
                    format!("bond names atom {end}, but there are atoms 1 to {atom_count}"),
                ));
            }
        }
        if a == b {
            return Err(ParseError::at(
                line_number,
                format!("bond joins atom {a} to itself"),
            ));
        }
        let (order, aromatic) = match order {
            1..=3 => (order as u8, false),
            // Aromatic: single until the Kekulé structure is assigned below.
            4 => (1, true),
            // Query types (single or double, single or aromatic, …): single.
            5..=8 => (1, false),
            other => {
                return Err(ParseError::at(
                    line_number,
                    format!("bond type {other} is not 1 to 8"),
                ));
            }
        };
        let bond = Bond {
            aromatic,
            ..Bond::new(a - 1, b - 1, order)
        };
        if bonds.iter().any(|old| old.a == bond.a && old.b == bond.b) {
            return Err(ParseError::at(
                line_number,
                format!("the bond {a}–{b} is listed twice; each pair may be bonded once"),
            ));
        }
        bonds.push(bond);
    }
    let mut property_charges: Option<Vec<i32>> = None;
    for (index, line) in lines.iter().enumerate().skip(4 + atom_count + bond_count) {
        let line_number = index + 1;
        if line.starts_with("M  END") || line.starts_with("$$$$") {
            break;
        }
        if let Some(rest) = line.strip_prefix("M  CHG") {
            let charges = property_charges.get_or_insert_with(|| vec![0; atom_count]);
            let fields: Vec<&str> = rest.split_whitespace().collect();
            let count: usize = fields.first().and_then(|f| f.parse().ok()).ok_or_else(|| {
                ParseError::at(line_number, "expected the number of entries after 'M  CHG'")
            })?;
            if count > 8 || fields.len() < 1 + 2 * count {
                return Err(ParseError::at(
                    line_number,
                    format!(
                        "'M  CHG' announces {count} entries but has {} numbers",
                        fields.len().saturating_sub(1)
                    ),
                ));
            }
            for pair in 0..count {
                let atom: usize = fields[1 + 2 * pair].parse().map_err(|_| {
                    ParseError::at(
                        line_number,
                        format!(
                            "expected an atom number, found '{}'",
                            shorten(fields[1 + 2 * pair])
                        ),
                    )
                })?;
                let charge: i32 = fields[2 + 2 * pair].parse().map_err(|_| {
                    ParseError::at(
                        line_number,
                        format!(
                            "expected a charge, found '{}'",
                            shorten(fields[2 + 2 * pair])
                        ),
                    )
                })?;
                if atom == 0 || atom > atom_count {
                    return Err(ParseError::at(
                        line_number,
                        format!(
                            "'M  CHG' names atom {atom}, but there are atoms 1 to {atom_count}"
                        ),
                    ));
                }
                if charge.abs() > 15 {
                    return Err(ParseError::at(
                        line_number,
                        format!("charge {charge} is out of range ±15"),
                    ));
                }
                charges[atom - 1] = charge;
            }
        }
    }
    let charge: i32 = property_charges.unwrap_or(block_charges).iter().sum();
    let title = lines
        .first()
        .map(|line| line.trim())
        .filter(|t| !t.is_empty())
        .unwrap_or(name);
    let mut molecule = Molecule {
        name: title.chars().take(80).collect(),
        atoms,
        charge,
        bonds,
    };
    molecule.bonds.sort_by_key(|bond| (bond.a, bond.b));
    molecule.kekulize_aromatic();
    let notices = if molecule.bonds.is_empty() && atom_count > 1 {
        molecule.perceive_bonds();
        vec!["the file lists no bonds; bonds were perceived from distances".to_string()]
    } else {
        Vec::new()
    };
    Ok(Parsed { molecule, notices })
}

/// Refuses a molfile whose program line (line 2) gives the dimensional code "2D" in
/// columns 21–22 (CTfile Formats, the header block).
fn refuse_two_dimensional(lines: &[&str]) -> Result<(), ParseError> {
    let code: String = lines
        .get(1)
        .map(|line| line.chars().skip(20).take(2).collect())
        .unwrap_or_default();
    if code.eq_ignore_ascii_case("2D") {
        return Err(ParseError::at(
            2,
            "the molfile is a 2D drawing (its header says 2D); Diptych needs 3D coordinates: generate a 3D structure and save it again",
        ));
    }
    Ok(())
}

/// A 3-character right-justified integer field starting at `start`.
fn fixed_int(line: &str, start: usize, line_number: usize, what: &str) -> Result<i64, ParseError> {
    let field: String = line.chars().skip(start).take(3).collect();
    field
        .trim()
        .parse::<i64>()
        .ok()
        .filter(|v| *v >= 0)
        .ok_or_else(|| {
            ParseError::at(
                line_number,
                format!("expected {what}, found '{}'", shorten(field.trim())),
            )
        })
}

/// x, y, z, symbol, mass difference, charge code (whitespace-separated).
fn parse_atom_line(line: &str, line_number: usize) -> Result<(Atom, i32), ParseError> {
    let fields: Vec<&str> = line.split_whitespace().collect();
    if fields.len() < 4 {
        return Err(ParseError::at(
            line_number,
            format!(
                "expected an atom line 'x y z symbol …', found '{}'",
                shorten(line.trim())
            ),
        ));
    }
    let mut position = [0.0; 3];
    for (axis, slot) in position.iter_mut().enumerate() {
        let value: f64 = fields[axis]
            .parse()
            .ok()
            .filter(|v: &f64| v.is_finite())
            .ok_or_else(|| {
                ParseError::at(
                    line_number,
                    format!(
                        "expected a finite {} coordinate, found '{}'",
                        ["x", "y", "z"][axis],
                        shorten(fields[axis])
                    ),
                )
            })?;
        *slot = value;
    }
    let element = Element::from_symbol(fields[3])
        .map_err(|error| ParseError::at(line_number, error.to_string()))?;
    let charge = match fields.get(5).map(|f| f.parse::<i32>()) {
        None => 0,
        Some(Ok(code @ 0..=7)) => match code {
            1 => 3,
            2 => 2,
            3 => 1,
            5 => -1,
            6 => -2,
            7 => -3,
            _ => 0, // 0 uncharged, 4 doublet radical
        },
        Some(_) => {
            return Err(ParseError::at(
                line_number,
                format!(
                    "expected a charge code 0–7 in the sixth field, found '{}'",
                    shorten(fields[5])
                ),
            ));
        }
    };
    Ok((Atom::new(element, position), charge))
}

#[cfg(test)]
mod tests {
    use super::*;

    const FORMALDEHYDE: &str = "formaldehyde\n  hand-written\n\n  4  3  0  0  0  0  0  0  0  0999 V2000\n    0.0000    0.0000    0.5296 C   0  0  0  0  0  0  0  0  0  0  0  0\n    0.0000    0.0000   -0.6790 O   0  0  0  0  0  0  0  0  0  0  0  0\n    0.0000    0.9377    1.1126 H   0  0  0  0  0  0  0  0  0  0  0  0\n    0.0000   -0.9377    1.1126 H   0  0  0  0  0  0  0  0  0  0  0  0\n  1  2  2  0\n  1  3  1  0\n  1  4  1  0\nM  END\n";

    #[test]
    fn reads_atoms_bonds_and_orders() -> Result<(), ParseError> {
        let parsed = parse_molfile(FORMALDEHYDE, "x")?;
        let m = parsed.molecule;
        assert_eq!(m.name, "formaldehyde");
        assert_eq!(m.atoms.len(), 4);
        assert_eq!(m.bond(0, 1).map(|b| b.order), Some(2));
        assert_eq!(m.bonds.len(), 3);
        assert_eq!(m.charge, 0);
        Ok(())
    }

    #[test]
    fn charges_from_block_and_chg_property() -> Result<(), ParseError> {
        let block = FORMALDEHYDE.replace(" O   0  0", " O   0  5");
        assert_eq!(parse_molfile(&block, "x")?.molecule.charge, -1);
        let with_chg = block.replace("M  END", "M  CHG  2   2   1   1   1\nM  END");
        // M  CHG supersedes the atom block: +1 on O and +1 on C.
        assert_eq!(parse_molfile(&with_chg, "x")?.molecule.charge, 2);
        Ok(())
    }

    #[test]
    fn bad_bond_index_names_the_line() {
        let bad = FORMALDEHYDE.replace("  1  4  1  0", "  1  9  1  0");
        let error = parse_molfile(&bad, "x").unwrap_err();
        assert_eq!(
            error.to_string(),
            "line 11: bond names atom 9, but there are atoms 1 to 4"
        );
    }
}
