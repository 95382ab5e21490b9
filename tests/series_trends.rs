//! The chemistry a series must show in the default model: the s character of donor lone
//! pairs (Bent's rule, H. A. Bent, Chem. Rev. 61, 275 (1961); Coulson's relations on the
//! experimental angles, C. A. Coulson, *Valence*, 1952: the smaller the H–X–H angle, the
//! more p in the bonds and the more s in the lone pair), and −ε against the measured first
//! ionization energies of the bundled table (Koopmans' theorem, T. Koopmans, Physica 1,
//! 104 (1934)), whose values are recalled from the NIST Chemistry WebBook (from memory).

mod series_support;

use diptych::series::fit::misordered_pairs;
use diptych::series::{self, DonorChoice, OrderingPair, SeriesRow, bundled_ionization};
use series_support::{DEMO_DONORS, demo_input, demo_inputs, input_from, repository};

fn row(name: &str, donor: DonorChoice) -> SeriesRow {
    let compared = series::compare(&[demo_input(name, donor)]).expect("analyses");
    compared.rows.into_iter().next().expect("one row")
}

fn donor_s(row: &SeriesRow) -> f64 {
    row.donor
        .as_ref()
        .and_then(|d| d.s_percent)
        .unwrap_or_else(|| panic!("{}: no donor %s", row.name))
}

#[test]
fn phosphine_and_nitrogen_trifluoride_lone_pairs_are_richer_in_s_than_ammonia() {
    let nh3 = row("ammonia", DonorChoice::Auto);
    let ph3 = row("phosphine", DonorChoice::Auto);
    let nf3 = row("nitrogen_trifluoride", DonorChoice::Auto);
    for (r, element) in [(&nh3, "N"), (&ph3, "P"), (&nf3, "N")] {
        let donor = r.donor.as_ref().expect("a donor");
        assert_eq!(
            (donor.atom, donor.element.as_str()),
            (0, element),
            "{}",
            r.name
        );
        // C3v: the lone pair lies on the C3 axis.
        let angle = donor.axis_angle_degrees.expect("C3v has a principal axis");
        assert!(angle < 1.0, "{}: {angle}° off the axis", r.name);
    }
    // Taken literally, "the highest lone pair" of NF3 is a fluorine p lone pair (F 2p
    // at −18.1 eV sits above the nitrogen hybrid in the localized ladder): the reason the
    // automatic donor prefers atoms with two or more bonded partners.
    let literal = row("nitrogen_trifluoride", DonorChoice::Highest);
    assert_eq!(
        literal.donor.as_ref().map(|d| d.element.as_str()),
        Some("F")
    );
    // PH3 (H–P–H 93.3°) is far richer in s than NH3 (106.7°).
    assert!(
        donor_s(&ph3) > donor_s(&nh3) + 15.0,
        "{} vs {}",
        donor_s(&ph3),
        donor_s(&nh3)
    );
    // NF3: electronegative ligands take p, the lone pair keeps s (Bent's rule).
    assert!(
        donor_s(&nf3) > donor_s(&nh3),
        "{} vs {}",
        donor_s(&nf3),
        donor_s(&nh3)
    );
}

#[test]
fn hydrogen_sulfide_sigma_lone_pair_is_richer_in_s_than_water() {
    let h2o = row("water", DonorChoice::RichestInS(0));
    let h2s = series::compare(&[input_from(
        repository().join("tests/hard_molecules/hydrogen_sulfide.xyz"),
        DonorChoice::RichestInS(0),
    )])
    .expect("analyses")
    .rows
    .remove(0);
    assert!(
        donor_s(&h2s) > donor_s(&h2o),
        "{} vs {}",
        donor_s(&h2s),
        donor_s(&h2o)
    );
}

#[test]
fn water_has_two_different_lone_pairs_and_the_highest_is_the_p_lone_pair() {
    let water = row("water", DonorChoice::Auto);
    let on_oxygen: Vec<_> = water.lone_pairs.iter().filter(|lp| lp.atom == 0).collect();
    assert_eq!(on_oxygen.len(), 2, "{:?}", water.lone_pairs);
    let (low, high) = (on_oxygen[0], on_oxygen[1]);
    assert!(high.energy_ev > low.energy_ev + 1.0);
    let (s_low, s_high) = (
        low.s_percent.unwrap_or(-1.0),
        high.s_percent.unwrap_or(-1.0),
    );
    // The out-of-plane lone pair (1b1) is pure p, perpendicular to the C2 axis; the
    // in-plane one is an s-rich hybrid along the axis.
    assert!(s_high < 1.0 && s_low > 20.0, "{s_low} / {s_high}");
    let donor = water.donor.as_ref().expect("donor");
    assert_eq!(donor.energy_ev, high.energy_ev);
    assert!((donor.axis_angle_degrees.unwrap_or(0.0) - 90.0).abs() < 1.0);
    assert_eq!(donor.lambda, None, "pure p: λ → ∞");
    assert_eq!(
        water.homo.as_ref().and_then(|h| h.label.clone()).as_deref(),
        Some("1b1")
    );
}

#[test]
fn rows_without_lone_pairs_say_so_and_an_asked_atom_without_one_is_noted() {
    let methane = row("methane", DonorChoice::Auto);
    assert!(methane.donor.is_none() && methane.lone_pairs.is_empty());
    assert!(
        methane
            .notes
            .iter()
            .any(|n| n.contains("no occupied lone pair"))
    );
    let ammonia_h = row("ammonia", DonorChoice::Atom(1));
    assert!(ammonia_h.donor.is_none());
    assert!(ammonia_h.notes.iter().any(|n| n.contains("atom 1")));
}

#[test]
fn every_demo_molecule_has_a_sourced_measured_value() {
    for name in std::fs::read_dir(repository().join("demo_molecules")).expect("folder") {
        let path = name.expect("entry").path();
        if path.extension().is_none_or(|e| e != "xyz") {
            continue;
        }
        let molecule = diptych::project::open_path(&path)
            .expect("opens")
            .project
            .molecule;
        let measured = bundled_ionization(&molecule)
            .unwrap_or_else(|| panic!("{}: no bundled ionization energy", path.display()));
        assert!(measured.source.contains("from memory"), "{measured:?}");
        assert!(measured.energy_ev > 9.0 && measured.energy_ev < 17.0);
    }
}

#[test]
fn the_koopmans_fit_of_the_demo_set_is_reported() {
    let compared = series::compare(&demo_inputs()).expect("analyses");
    assert_eq!(compared.rows.len(), 11);
    let homo = compared.homo_fit.as_ref().expect("a HOMO line");
    assert_eq!(homo.points, 11);
    assert!((0.0..=1.0).contains(&homo.r_squared));
    // Measured with this build (default model): printed so a change is seen in the log.
    eprintln!("−ε(HOMO) fit: {homo:?}");
    let lone_pair = compared.lone_pair_fit.as_ref().expect("a lone-pair line");
    eprintln!("−ε(lone pair) fit: {lone_pair:?}");
    // Three of the eleven (methane, ethylene, cyclopropane) have no lone pair.
    assert_eq!(lone_pair.points, 8);
    // −ε rises with the measured energy across the set: the slope is positive.
    assert!(homo.slope > 0.0, "{homo:?}");
}

fn pair(lower: &str, higher: &str) -> OrderingPair {
    OrderingPair {
        lower_measured: lower.into(),
        higher_measured: higher.into(),
    }
}

#[test]
fn extended_huckel_orders_these_demo_pairs_against_the_measured_energies() {
    let compared = series::compare(&demo_inputs()).expect("analyses");
    let names: Vec<&str> = compared.rows.iter().map(|r| r.name.as_str()).collect();
    assert_eq!(names.len(), DEMO_DONORS.len());
    // Pairs measured within 0.1 eV are not compared (formaldehyde 10.89 and ammonia 10.85
    // differ by less than the width of either band).
    let wrong = misordered_pairs(
        &compared.rows,
        |r| r.homo.as_ref().map(|h| -h.energy_ev),
        0.1,
    );
    // −ε(HOMO) of this build (eV): NH3 13.72, PH3 14.95, NF3 14.01, H2O 14.80, CH4 15.56,
    // BF3 17.77, H2CO 13.87, C2H4 13.22, HCN 14.23, C3H6 13.21, CH3Cl 13.33. VSIPs below
    // are those of assets/eht_parameters.ron. 13 of the 55 pairs are ordered wrongly.
    let expected: Vec<OrderingPair> = vec![
        // PH3 is measured 0.26 eV below NH3, but its 5a1 lies deeper: the P 3p VSIP
        // (−14.0 eV) is below N 2p (−13.4 eV), and the s-rich P lone pair (39 % s) takes
        // more of P 3s (−18.6 eV). The same too-deep PH3 level misorders it against every
        // molecule measured above it, in the next six pairs.
        pair("phosphine", "ammonia"),
        // CH3Cl's 3e is the Cl 3p lone pair (VSIP −14.2 eV) raised by antibonding with the
        // CH3 e set; NH3's 3a1 is lowered by its s admixture. Measured, the chlorine lone
        // pair is 0.44 eV deeper; in extended Hückel it ends 0.39 eV higher.
        pair("ammonia", "chloromethane"),
        pair("phosphine", "nitrogen_trifluoride"),
        pair("phosphine", "water"),
        pair("phosphine", "formaldehyde"),
        pair("phosphine", "hydrogen_cyanide"),
        pair("phosphine", "cyclopropane"),
        pair("phosphine", "chloromethane"),
        // Water's 1b1 is a pure O 2p lone pair at exactly the O 2p VSIP (−14.8 eV): no
        // charge self-consistency, so neither the negative oxygen of water (which would
        // raise it) nor the positive nitrogen of NF3 (which would lower NF3's 6a1 from
        // −14.01 eV) is felt. Measured, water ionizes 1.1 eV more easily than NF3.
        pair("water", "nitrogen_trifluoride"),
        // The same missing charge effect on NF3 against HCN's 1π (measured 0.12 eV apart).
        pair("hydrogen_cyanide", "nitrogen_trifluoride"),
        // Water's 1b1 again at the bare O 2p VSIP, below HCN's π bond (−14.23 eV), where
        // the measured order is water 1 eV easier to ionize.
        pair("water", "hydrogen_cyanide"),
        // Formaldehyde's 2b2 is the O in-plane lone pair, from O 2p (−14.8 eV) raised by
        // antibonding with C–H; CH3Cl's comes from Cl 3p (−14.2 eV): the parameters put
        // chlorine's p 0.6 eV above oxygen's, the measured lone pairs are the other way.
        pair("formaldehyde", "chloromethane"),
        // Ethylene's π (−13.22 eV) and cyclopropane's Walsh 3e′ (−13.21 eV) are 0.01 eV
        // apart in extended Hückel; measured (band centres) cyclopropane's is 0.4 eV deeper.
        pair("ethylene", "cyclopropane"),
    ];
    assert_eq!(wrong, expected, "{wrong:#?}");
}
