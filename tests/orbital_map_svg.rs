//! The orbital-map SVG writer: one path per contour line, user text escaped, Mulliken
//! subscripts as tspans, the same bytes for the same map (DESIGN §5.3).

use diptych::chem::element::Element;
use diptych::chem::molecule::{Atom, Molecule};
use diptych::eht::{ParameterSet, build_basis};
use diptych::orbital_map::{
    MapOptions, MapSvgOptions, Plane, ResolvedOrbital, map_orbital, map_to_svg,
};

fn methylene_like_map(label: &str) -> diptych::orbital_map::OrbitalMap {
    // A bent CH2 fragment with an s + p mixture on carbon: positive and negative lobes
    // and a nodal line in the plane of the three atoms.
    let molecule = Molecule::new(
        "CH2",
        vec![
            Atom::new(Element::C, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [0.0, 0.9, -0.6]),
            Atom::new(Element::H, [0.0, -0.9, -0.6]),
        ],
        0,
    );
    let basis =
        build_basis(&molecule, ParameterSet::builtin().expect("parameters"), &[]).expect("basis");
    let mut coefficients = vec![0.0; basis.len()];
    coefficients[0] = 0.5; // C 2s
    coefficients[3] = 0.85; // C 2pz
    let orbital = ResolvedOrbital {
        reference: None,
        coefficients,
        label: label.to_string(),
        energy_ev: Some(-11.5),
        atoms: vec![0],
    };
    let plane = Plane::through_atoms(&molecule, [0, 1, 2]).expect("plane");
    let options = MapOptions {
        points: 64,
        ..MapOptions::default()
    };
    map_orbital(&molecule, &basis, orbital, &plane, &options).expect("map")
}

#[test]
fn svg_has_a_path_per_line_and_escapes_text() {
    let map = methylene_like_map("x<y & \"z\"");
    assert!(map.contours.iter().any(|l| l.level > 0.0));
    assert!(map.contours.iter().any(|l| l.level < 0.0));
    assert!(!map.nodal.is_empty(), "an sp hybrid has a nodal surface");
    let svg = map_to_svg(&map, &MapSvgOptions::default());
    assert!(svg.starts_with("<?xml") && svg.trim_end().ends_with("</svg>"));
    assert_eq!(
        svg.matches("<path").count(),
        map.contours.len() + map.nodal.len()
    );
    assert!(svg.contains("x&lt;y &amp; &quot;z&quot;"));
    assert!(!svg.contains("x<y"));
    assert!(svg.contains("−11.50 eV"));
    assert_eq!(svg.matches("<circle").count(), 3);
    // Same map, same bytes.
    assert_eq!(svg, map_to_svg(&map, &MapSvgOptions::default()));
}

#[test]
fn mulliken_labels_get_subscripts() {
    // "3a1" is set 3a with subscript 1 (Mulliken, J. Chem. Phys. 23, 1997 (1955)).
    let svg = map_to_svg(&methylene_like_map("3a1"), &MapSvgOptions::default());
    assert!(svg.contains("<tspan>3a</tspan><tspan dy="));
    assert!(svg.contains(">1</tspan>"));
}
