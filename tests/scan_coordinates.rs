//! The scan coordinates set what they claim: after `apply(value)`, `measure` reads the
//! value back, symmetric deformations keep bond lengths and equal X–A–X angles, and other
//! atoms are not moved (geometry identities; common practice, no source).

use std::path::Path;

use diptych::chem::Molecule;
use diptych::project::open_path;
use diptych::scan::Coordinate;

type TestResult = Result<(), Box<dyn std::error::Error>>;

fn demo(name: &str) -> Result<Molecule, Box<dyn std::error::Error>> {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("demo_molecules")
        .join(format!("{name}.xyz"));
    Ok(open_path(&path)?.project.molecule)
}

#[test]
fn every_coordinate_reads_back_the_value_it_set() -> TestResult {
    let ammonia = demo("ammonia")?;
    let water = demo("water")?;
    let ethylene = demo("ethylene")?;
    let cases = [
        (&ammonia, Coordinate::Bond { i: 0, j: 1 }, 1.3),
        (&ammonia, Coordinate::Angle { i: 1, j: 0, k: 2 }, 95.0),
        (
            &ethylene,
            Coordinate::Dihedral {
                i: 2,
                j: 0,
                k: 1,
                l: 4,
            },
            35.0,
        ),
        (&ammonia, Coordinate::Pyramidalize { centre: 0 }, 120.0),
        (&ammonia, Coordinate::Pyramidalize { centre: 0 }, 91.5),
        (&water, Coordinate::SymmetricBend { centre: 0 }, 180.0),
        (&water, Coordinate::SymmetricBend { centre: 0 }, 70.0),
        (&ammonia, Coordinate::SymmetricStretch { centre: 0 }, 1.2),
    ];
    for (molecule, coordinate, value) in cases {
        let moved = coordinate.apply(molecule, value)?;
        let read = coordinate.measure(&moved)?;
        assert!(
            (read - value).abs() < 1e-6,
            "{coordinate:?}: set {value}, read {read}"
        );
        assert_eq!(moved.bonds, molecule.bonds, "the bond list is kept");
    }
    Ok(())
}

#[test]
fn pyramidalization_keeps_bond_lengths_and_makes_all_angles_equal() -> TestResult {
    let ammonia = demo("ammonia")?;
    let before: Vec<f64> = (1..4)
        .map(|h| ammonia.distance(0, h))
        .collect::<Result<_, _>>()?;
    for value in [80.0, 100.0, 119.0, 120.0] {
        let moved = Coordinate::Pyramidalize { centre: 0 }.apply(&ammonia, value)?;
        for h in 1..4 {
            assert!((moved.distance(0, h)? - before[h - 1]).abs() < 1e-9);
        }
        for (a, b) in [(1, 2), (2, 3), (1, 3)] {
            assert!((moved.angle(a, 0, b)? - value).abs() < 1e-6);
        }
        assert_eq!(
            moved.atoms[0].position, ammonia.atoms[0].position,
            "the centre stays"
        );
    }
    Ok(())
}

#[test]
fn symmetric_stretch_moves_every_ligand_and_keeps_the_angles() -> TestResult {
    let water = demo("water")?;
    let angle = water.angle(1, 0, 2)?;
    let moved = Coordinate::SymmetricStretch { centre: 0 }.apply(&water, 1.5)?;
    assert!((moved.distance(0, 1)? - 1.5).abs() < 1e-9);
    assert!((moved.distance(0, 2)? - 1.5).abs() < 1e-9);
    assert!((moved.angle(1, 0, 2)? - angle).abs() < 1e-9);
    Ok(())
}
