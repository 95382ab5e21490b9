//! Formulae of a molecule, two ways:
//! - [`hill`]: Hill order (E. A. Hill, J. Am. Chem. Soc. 22, 478 (1900)): C first, then H,
//!   then the rest alphabetically; without carbon, all alphabetically. The order of
//!   indexes and of the reports ("H3N").
//! - [`conventional`]: the way chemists write a binary compound, by the element sequence
//!   of the IUPAC Red Book (Nomenclature of Inorganic Chemistry, IUPAC Recommendations
//!   2005, Table VI and IR-2.15.3.1(a)): the element met last along the sequence
//!   F → At, O → Po, H, N → Bi, C → Pb, B → Tl, group 12 → group 3, group 2, group 1 is
//!   cited first ("NH3", "H2O", "OF2", "SF6", "CO"). The noble gases are put at the end of
//!   the sequence, so "XeF2" (common practice, no source). Compounds of three or more
//!   elements have no such rule; they keep Hill order.
//!
//! A charge is appended as "+", "2−" style text in both.

use std::collections::BTreeMap;

use super::element::Element;

/// Hill-order formula with the charge appended.
pub fn hill(elements: &[Element], charge: i32) -> String {
    let counts = counts(elements);
    let mut order: Vec<Element> = Vec::new();
    let carbon = counts.keys().copied().find(|e| e.symbol() == "C");
    let hydrogen = counts.keys().copied().find(|e| e.symbol() == "H");
    if let Some(carbon) = carbon {
        order.push(carbon);
        order.extend(hydrogen);
    }
    let mut rest: Vec<Element> = counts
        .keys()
        .copied()
        .filter(|e| !order.contains(e))
        .collect();
    rest.sort_by_key(|e| e.symbol());
    order.extend(rest);
    written(&order, &counts, charge)
}

/// The formula as chemists write it: binary compounds by the IUPAC element sequence,
/// everything else in Hill order.
pub fn conventional(elements: &[Element], charge: i32) -> String {
    let counts = counts(elements);
    if counts.len() != 2 {
        return hill(elements, charge);
    }
    let mut order: Vec<Element> = counts.keys().copied().collect();
    order.sort_by_key(|&e| std::cmp::Reverse(sequence_position(e)));
    written(&order, &counts, charge)
}

fn counts(elements: &[Element]) -> BTreeMap<Element, usize> {
    let mut counts = BTreeMap::new();
    for &element in elements {
        *counts.entry(element).or_default() += 1;
    }
    counts
}

fn written(order: &[Element], counts: &BTreeMap<Element, usize>, charge: i32) -> String {
    let mut text = String::new();
    for element in order {
        text.push_str(element.symbol());
        if counts[element] > 1 {
            text.push_str(&counts[element].to_string());
        }
    }
    text.push_str(&charge_suffix(charge));
    text
}

/// "+", "−", "2+", "3−" (a true minus sign); nothing for a neutral molecule.
pub fn charge_suffix(charge: i32) -> String {
    match charge {
        0 => String::new(),
        1 => "+".into(),
        -1 => "−".into(),
        c if c > 0 => format!("{c}+"),
        c => format!("{}−", c.unsigned_abs()),
    }
}

/// A formula or label cut into runs, `true` for a subscript: a run of digits right after
/// a letter or a closing bracket ("NH3", "Cr(CO)5"); other digits stay on the line
/// ("2-butene", "1,3-butadiene").
pub fn subscript_runs(text: &str) -> Vec<(String, bool)> {
    let mut runs: Vec<(String, bool)> = Vec::new();
    let mut previous: Option<char> = None;
    for c in text.chars() {
        let subscript = c.is_ascii_digit()
            && previous.is_some_and(|p| {
                p.is_alphabetic() || p == ')' || (p.is_ascii_digit() && runs_end_sub(&runs))
            });
        match runs.last_mut() {
            Some((run, kind)) if *kind == subscript => run.push(c),
            _ => runs.push((c.to_string(), subscript)),
        }
        previous = Some(c);
    }
    runs
}

fn runs_end_sub(runs: &[(String, bool)]) -> bool {
    runs.last().is_some_and(|(_, subscript)| *subscript)
}

/// Position along the IUPAC element sequence (Table VI): (column step, period).
fn sequence_position(element: Element) -> (u8, u8) {
    let step = match group(element) {
        None => 2, // hydrogen, between group 16 and group 15
        Some(17) => 0,
        Some(16) => 1,
        Some(18) => 19,
        // Groups 15 down to 1 follow hydrogen in that order.
        Some(g) => 3 + (15 - g),
    };
    (step, element.period())
}

/// Group number 1–18 of the periodic table; `None` for hydrogen.
fn group(element: Element) -> Option<u8> {
    let z = element.atomic_number();
    Some(match z {
        1 => return None,
        2 => 18,
        3 | 4 | 11 | 12 => z - 2 - 8 * u8::from(z > 4),
        5..=10 => z + 8,
        13..=18 => z,
        _ => z - 18,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn elements(symbols: &[&str]) -> Vec<Element> {
        symbols
            .iter()
            .map(|s| Element::from_symbol(s).unwrap())
            .collect()
    }

    #[test]
    fn groups_of_the_table() {
        let of = |s: &str| group(Element::from_symbol(s).unwrap());
        let expected = [
            ("He", 18),
            ("Li", 1),
            ("Be", 2),
            ("B", 13),
            ("Ne", 18),
            ("Na", 1),
            ("Mg", 2),
            ("Al", 13),
            ("Cl", 17),
            ("K", 1),
            ("Ca", 2),
            ("Sc", 3),
            ("Zn", 12),
            ("Ga", 13),
            ("Br", 17),
            ("Kr", 18),
        ];
        for (symbol, g) in expected {
            assert_eq!(of(symbol), Some(g), "{symbol}");
        }
        assert_eq!(of("H"), None);
    }

    #[test]
    fn binary_compounds_as_chemists_write_them() {
        // Examples of the Red Book 2005 (IR-2.15.3.1: S2Cl2, O2Cl, H2Te, AlH3) and the
        // textbook formulae of the demo molecules (from memory).
        let cases: [(&[&str], &str); 12] = [
            (&["N", "H", "H", "H"], "NH3"),
            (&["H", "H", "O"], "H2O"),
            (&["P", "H", "H", "H"], "PH3"),
            (&["F", "F", "F", "N"], "NF3"),
            (&["C", "H", "H", "H", "H"], "CH4"),
            (&["B", "F", "F", "F"], "BF3"),
            (&["O", "C"], "CO"),
            (&["S", "F", "F", "F", "F", "F", "F"], "SF6"),
            (&["Cl", "Cl", "S", "S"], "S2Cl2"),
            (&["Cl", "O", "O"], "O2Cl"),
            (&["H", "H", "Se"], "H2Se"),
            (&["H", "H", "H", "Al"], "AlH3"),
        ];
        for (symbols, expected) in cases {
            assert_eq!(conventional(&elements(symbols), 0), expected);
        }
        assert_eq!(conventional(&elements(&["F", "F", "O"]), 0), "OF2");
        assert_eq!(conventional(&elements(&["H", "Cl"]), 0), "HCl");
    }

    #[test]
    fn other_compounds_keep_hill_order_and_charges_are_written() {
        assert_eq!(conventional(&elements(&["H", "C", "N"]), 0), "CHN");
        assert_eq!(
            conventional(&elements(&["N", "H", "H", "H", "H"]), 1),
            "NH4+"
        );
        assert_eq!(conventional(&elements(&["O", "H"]), -1), "HO−");
        assert_eq!(conventional(&elements(&["O", "O"]), 0), "O2");
        assert_eq!(hill(&elements(&["N", "H", "H", "H"]), 0), "H3N");
        assert_eq!(hill(&elements(&["Cl", "C", "H", "H", "H"]), 2), "CH3Cl2+");
        assert_eq!(charge_suffix(-3), "3−");
    }

    #[test]
    fn only_digits_after_a_symbol_are_subscripts() {
        let runs = |t: &str| subscript_runs(t);
        assert_eq!(
            runs("NH3"),
            vec![("NH".to_string(), false), ("3".to_string(), true)]
        );
        assert_eq!(
            runs("Cr(CO)15L"),
            vec![
                ("Cr(CO)".to_string(), false),
                ("15".to_string(), true),
                ("L".to_string(), false)
            ]
        );
        assert_eq!(runs("2-butene"), vec![("2-butene".to_string(), false)]);
        assert_eq!(runs("1,3-C4H6").len(), 4);
    }
}
