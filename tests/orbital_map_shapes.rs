//! Shapes of orbital maps: a 1s map is radially symmetric and follows e^(−ζr); a 2p map
//! changes sign across the plane through the nucleus normal to the p axis and vanishes on
//! it; marching squares traces a circle on x² + y² = r²; the nonbonding HOMO of water lies
//! out of the molecular plane; contour lines are closed or end on the map's border.

use diptych::analysis::{Analysis, Settings};
use diptych::chem::element::Element;
use diptych::chem::molecule::{Atom, Molecule};
use diptych::eht::{BOHR_IN_ANGSTROM, ParameterSet, build_basis};
use diptych::orbital_map::{
    Grid, GridSpec, MapOptions, OrbitalRef, Plane, PlaneKind, ResolvedOrbital, compute_map,
    contour_lines, map_orbital,
};
use nalgebra::Vector3;

fn single_function_map(
    element: Element,
    function: usize,
    plane: &Plane,
    options: &MapOptions,
) -> (diptych::orbital_map::OrbitalMap, f64) {
    let molecule = Molecule::new("atom", vec![Atom::new(element, [0.0, 0.0, 0.0])], 0);
    let basis =
        build_basis(&molecule, ParameterSet::builtin().expect("parameters"), &[]).expect("basis");
    let mut coefficients = vec![0.0; basis.len()];
    coefficients[function] = 1.0;
    let zeta = basis.exponents[function];
    let orbital = ResolvedOrbital {
        reference: None,
        coefficients,
        label: basis.orbitals[function].label(),
        energy_ev: None,
        atoms: vec![0],
    };
    let map = map_orbital(&molecule, &basis, orbital, plane, options).expect("map");
    (map, zeta)
}

fn plane(u: Vector3<f64>, v: Vector3<f64>) -> Plane {
    Plane {
        origin: Vector3::zeros(),
        u,
        v,
        kind: PlaneKind::Free,
    }
}

#[test]
fn hydrogen_1s_map_is_radially_symmetric() {
    // χ_1s = ζ^(3/2)/√π e^(−ζr) depends on r alone (Levine, Quantum Chemistry, from
    // memory). An odd number of points puts the nucleus on the central grid point.
    let options = MapOptions {
        points: 101,
        margin: 2.0,
        ..MapOptions::default()
    };
    let tilted = plane(
        Vector3::new(1.0, 1.0, 0.0).normalize(),
        Vector3::new(-1.0, 1.0, 1.0).normalize(),
    );
    let (map, zeta) = single_function_map(Element::H, 0, &tilted, &options);
    let n = map.grid.spec.n;
    let centre = n / 2;
    let (cx, cy) = map.grid.spec.coordinates(centre, centre);
    assert!(
        cx.abs() < 1e-12 && cy.abs() < 1e-12,
        "nucleus at the centre"
    );
    for j in 0..n {
        for i in 0..n {
            let v = map.grid.value(i, j);
            // The eight images of (i, j) under the square's symmetries are at the same r.
            let (a, b) = (i as i64 - centre as i64, j as i64 - centre as i64);
            for (p, q) in [(-a, b), (a, -b), (b, a), (-b, -a)] {
                let image = map
                    .grid
                    .value((centre as i64 + p) as usize, (centre as i64 + q) as usize);
                assert!((image - v).abs() <= 1e-12 * v.abs().max(1e-300));
            }
            let (x, y) = map.grid.spec.coordinates(i, j);
            let r = (x * x + y * y).sqrt() / BOHR_IN_ANGSTROM;
            let expected = zeta.powf(1.5) / std::f64::consts::PI.sqrt() * (-zeta * r).exp();
            assert!(
                (v - expected).abs() < 1e-12,
                "({i}, {j}): {v} vs {expected}"
            );
        }
    }
    // Every contour is a closed circle about the nucleus at the radius where ψ = level.
    assert!(!map.contours.is_empty());
    let top = zeta.powf(1.5) / std::f64::consts::PI.sqrt();
    for line in &map.contours {
        assert!(line.level > 0.0, "a 1s orbital has no negative lobe");
        assert!(line.closed);
        let radius = (top / line.level).ln() / zeta * BOHR_IN_ANGSTROM;
        for p in &line.points {
            let r = (p[0] * p[0] + p[1] * p[1]).sqrt();
            assert!((r - radius).abs() < map.grid.spec.step, "{r} vs {radius}");
        }
    }
    assert!(map.nodal.is_empty(), "a 1s orbital has no node");
}

#[test]
fn p_orbital_nodal_plane_is_where_it_should_be() {
    // 2pz ∝ z e^(−ζr): positive above the xy plane, negative below, zero on it (the nodal
    // plane of a p orbital through the nucleus normal to its axis; Levine, from memory).
    let options = MapOptions {
        points: 64,
        ..MapOptions::default()
    };
    // Basis order on N: 2s, 2px, 2py, 2pz.
    let xz = plane(Vector3::x(), Vector3::z());
    let (map, _) = single_function_map(Element::N, 3, &xz, &options);
    let n = map.grid.spec.n;
    let mut positive = 0;
    let mut negative = 0;
    for j in 0..n {
        for i in 0..n {
            let (_, z) = map.grid.spec.coordinates(i, j);
            let v = map.grid.value(i, j);
            if z > 1e-9 {
                assert!(v > 0.0, "above the node: {v}");
                positive += 1;
            } else if z < -1e-9 {
                assert!(v < 0.0, "below the node: {v}");
                negative += 1;
            } else {
                assert!(v.abs() < 1e-14, "on the node: {v}");
            }
        }
    }
    assert_eq!(positive, negative, "the two lobes are mirror images");
    assert!(!map.nodal.is_empty());
    for line in &map.nodal {
        for p in &line.points {
            assert!(
                p[1].abs() <= map.grid.spec.step,
                "node point off z = 0: {p:?}"
            );
        }
    }
    assert!(map.contours.iter().any(|l| l.level > 0.0));
    assert!(map.contours.iter().any(|l| l.level < 0.0));
    // On the nodal plane itself the map is empty.
    let xy = plane(Vector3::x(), Vector3::y());
    let (flat, _) = single_function_map(Element::N, 3, &xy, &options);
    assert!(
        flat.vanishes(),
        "2pz on the xy plane: max {}",
        flat.grid.max_abs()
    );
    assert!(flat.contours.is_empty() && flat.nodal.is_empty());
}

#[test]
fn marching_squares_traces_a_circle() {
    // The level set x² + y² = r² is a circle (analytic geometry); linear interpolation on
    // the cell edges places every point within a grid step of it.
    let n = 81;
    let spec = GridSpec {
        x0: -2.0,
        y0: -2.0,
        step: 4.0 / (n - 1) as f64,
        n,
    };
    let mut values = Vec::with_capacity(n * n);
    for j in 0..n {
        for i in 0..n {
            let (x, y) = spec.coordinates(i, j);
            values.push(x * x + y * y);
        }
    }
    let grid = Grid {
        spec: spec.clone(),
        values,
    };
    let radius: f64 = 1.3;
    let lines = contour_lines(&grid, radius * radius);
    assert_eq!(lines.len(), 1, "one closed curve");
    let line = &lines[0];
    assert!(line.closed);
    assert!(line.points.len() > 50);
    for p in &line.points {
        let r = (p[0] * p[0] + p[1] * p[1]).sqrt();
        assert!((r - radius).abs() < spec.step, "point at r = {r}");
    }
    // It goes once around: the polar angle advances monotonically through 2π.
    let mut turned = 0.0;
    for k in 0..line.points.len() {
        let a = line.points[k];
        let b = line.points[(k + 1) % line.points.len()];
        let step = (a[0] * b[1] - a[1] * b[0]).atan2(a[0] * b[0] + a[1] * b[1]);
        turned += step;
    }
    assert!((turned.abs() - 2.0 * std::f64::consts::PI).abs() < 1e-9);
    // A circle that leaves the window gives open arcs ending on the border.
    let arcs = contour_lines(&grid, 2.4 * 2.4);
    assert!(!arcs.is_empty());
    for arc in &arcs {
        assert!(!arc.closed);
        for end in [arc.points[0], arc.points[arc.points.len() - 1]] {
            let on_border = end.iter().any(|c| (c.abs() - 2.0).abs() < 1e-9);
            assert!(on_border, "arc end {end:?} inside the window");
        }
    }
}

#[test]
fn saddle_cells_are_resolved_by_the_centre_value() {
    // One cell with opposite corners high: the centre value (the mean) decides whether the
    // high corners are joined (common practice for marching squares, no source).
    let spec = GridSpec {
        x0: 0.0,
        y0: 0.0,
        step: 1.0,
        n: 2,
    };
    // Corners (0,0) and (1,1) high, (1,0) and (0,1) low; mean 0.55.
    let grid = Grid {
        spec,
        values: vec![1.0, 0.1, 0.1, 1.0],
    };
    // Level 0.5 < mean: the high corners connect, the lines cut off the low corners.
    let lines = contour_lines(&grid, 0.5);
    assert_eq!(lines.len(), 2);
    for line in &lines {
        let mid = [
            0.5 * (line.points[0][0] + line.points[1][0]),
            0.5 * (line.points[0][1] + line.points[1][1]),
        ];
        let near_low = (mid[0] > 0.5) != (mid[1] > 0.5);
        assert!(near_low, "segment {line:?} should cut off a low corner");
    }
    // Level 0.6 > mean: the low corners connect, the lines cut off the high corners.
    for line in contour_lines(&grid, 0.6) {
        let mid = [
            0.5 * (line.points[0][0] + line.points[1][0]),
            0.5 * (line.points[0][1] + line.points[1][1]),
        ];
        let near_high = (mid[0] > 0.5) == (mid[1] > 0.5);
        assert!(near_high, "segment {line:?} should cut off a high corner");
    }
}

fn water() -> Molecule {
    // NIST CCCBDB experimental geometry (from memory), as demo_molecules/water.xyz.
    Molecule::new(
        "water",
        vec![
            Atom::new(Element::O, [0.0, 0.0, 0.0]),
            Atom::new(Element::H, [0.0, 0.756_950_33, -0.585_882_28]),
            Atom::new(Element::H, [0.0, -0.756_950_33, -0.585_882_28]),
        ],
        0,
    )
}

#[test]
fn water_homo_is_out_of_the_molecular_plane() {
    // Water's HOMO (1b1) is the oxygen 2p orbital perpendicular to the molecular plane, a
    // pure nonbonding π-type lone pair (e.g. Albright, Burdett and Whangbo, Orbital
    // Interactions in Chemistry, from memory): its map vanishes on the molecular plane and
    // is antisymmetric on the perpendicular plane through the O atom and the H–H bisector.
    let analysis = Analysis::run(&water(), &Settings::default()).expect("analysis");
    let homo = analysis.eht.as_ref().and_then(|e| e.homo()).expect("HOMO");
    let options = MapOptions {
        points: 64,
        ..MapOptions::default()
    };
    let molecular = Plane::through_atoms(&analysis.molecule, [0, 1, 2]).expect("plane");
    let map =
        compute_map(&analysis, OrbitalRef::Canonical(homo), &molecular, &options).expect("map");
    assert!(map.vanishes(), "max |ψ| {}", map.grid.max_abs());
    assert!(map.atoms.iter().all(|a| a.in_plane()));
    let perpendicular = Plane {
        origin: Vector3::zeros(),
        u: Vector3::x(),
        v: Vector3::z(),
        kind: PlaneKind::Free,
    };
    let side = compute_map(
        &analysis,
        OrbitalRef::Canonical(homo),
        &perpendicular,
        &options,
    )
    .expect("map");
    assert!(side.grid.max_abs() > 0.1);
    let n = side.grid.spec.n;
    for j in 0..n {
        for i in 0..n {
            let mirrored = side.grid.value(n - 1 - i, j);
            assert!((side.grid.value(i, j) + mirrored).abs() < 1e-10);
        }
    }
}

#[test]
fn contour_lines_are_closed_or_end_on_the_border() {
    // A level set of a continuous field cannot end inside the window (topology of level
    // sets; common practice, no source): every open polyline must start and end on it.
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz"),
    )
    .expect("demo ammonia");
    let molecule = diptych::chem::io::xyz::parse_xyz(&text, "ammonia")
        .expect("valid XYZ")
        .molecule;
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
    let plane = Plane::through_atoms(&molecule, [0, 1, 2]).expect("plane");
    for index in 0..analysis.orbitals.len() {
        let map = compute_map(
            &analysis,
            OrbitalRef::Canonical(index),
            &plane,
            &MapOptions::default(),
        )
        .expect("map");
        let spec = &map.grid.spec;
        let (x1, y1) = spec.coordinates(spec.n - 1, spec.n - 1);
        let tolerance = 1e-9;
        let on_border = |p: &[f64; 2]| {
            (p[0] - spec.x0).abs() < tolerance
                || (p[0] - x1).abs() < tolerance
                || (p[1] - spec.y0).abs() < tolerance
                || (p[1] - y1).abs() < tolerance
        };
        for line in map.contours.iter().chain(&map.nodal) {
            assert!(line.points.len() >= 2);
            if !line.closed {
                assert!(
                    on_border(&line.points[0]),
                    "MO {index}: open line starts inside"
                );
                assert!(on_border(&line.points[line.points.len() - 1]));
            }
        }
    }
}

#[test]
fn default_plane_shows_pi_orbitals_from_the_side() {
    // Ethylene's HOMO is the C=C π orbital (1b3u), odd under reflection in the molecular
    // plane (e.g. Albright, Burdett and Whangbo, from memory): the default plane must not
    // be the molecular plane for it, while the σ(C–C) bond is shown in that plane.
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ethylene.xyz"),
    )
    .expect("demo ethylene");
    let molecule = diptych::chem::io::xyz::parse_xyz(&text, "ethylene")
        .expect("valid XYZ")
        .molecule;
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
    let homo = analysis.eht.as_ref().and_then(|e| e.homo()).expect("HOMO");
    let options = MapOptions {
        points: 48,
        ..MapOptions::default()
    };
    let pi_plane =
        diptych::orbital_map::default_plane(&analysis, OrbitalRef::Canonical(homo)).expect("plane");
    assert!(matches!(pi_plane.kind, PlaneKind::PerpendicularTo(_)));
    let pi_map =
        compute_map(&analysis, OrbitalRef::Canonical(homo), &pi_plane, &options).expect("map");
    assert!(!pi_map.vanishes());
    assert!(pi_map.contours.iter().any(|l| l.level < 0.0));
    let sigma = diptych::orbital_map::find_orbital(&analysis, "σ(C–C)").expect("σ(C–C)");
    let sigma_plane = diptych::orbital_map::default_plane(&analysis, sigma).expect("plane");
    assert!(matches!(sigma_plane.kind, PlaneKind::ThroughAtoms(_)));
    for atom in &molecule.atoms {
        assert!(sigma_plane.project(&atom.position).2.abs() < 1e-9);
    }
}

#[test]
fn ammonia_lone_pair_is_cut_along_its_axis() {
    // The lone pair of pyramidal NH3 lies on the C3 axis (VSEPR; e.g. Albright, Burdett and
    // Whangbo, from memory): the default plane for n(N) contains N, H1 and that axis, which
    // makes it a mirror plane σv, so H2 and H3 lie at opposite heights.
    let text = std::fs::read_to_string(
        std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo_molecules/ammonia.xyz"),
    )
    .expect("demo ammonia");
    let molecule = diptych::chem::io::xyz::parse_xyz(&text, "ammonia")
        .expect("valid XYZ")
        .molecule;
    let analysis = Analysis::run(&molecule, &Settings::default()).expect("analysis");
    let lone_pair = diptych::orbital_map::find_orbital(&analysis, "n(N)").expect("n(N)");
    let plane = diptych::orbital_map::default_plane(&analysis, lone_pair).expect("plane");
    assert!(matches!(
        plane.kind,
        PlaneKind::Outward {
            atom: 0,
            neighbour: 1
        }
    ));
    let heights: Vec<f64> = molecule
        .atoms
        .iter()
        .map(|a| plane.project(&a.position).2)
        .collect();
    assert!(heights[0].abs() < 1e-9 && heights[1].abs() < 1e-9);
    assert!((heights[2] + heights[3]).abs() < 1e-6, "{heights:?}");
    assert!(heights[2].abs() > 0.5);
}
