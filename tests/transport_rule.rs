//! Pure transport steps get ΔrG'° from compartment conditions alone (the
//! single-species rule), marked as such in report.json and on the page.

use gibbsite::Project;

// Compartment conditions invented for this test (bacterial-like pH and
// membrane potential); lactate C3H5O3⁻, z −1: from its formula.
const MODEL: &str = "id: t
compartments:
  - {id: e, ph: 7.0, ionic_strength: 0.25 M, potential: 0 mV}
  - {id: c, ph: 7.6, ionic_strength: 0.15 M, potential: -150 mV}
metabolites:
  - {id: lac_e, compartment: e, formula: C3H5O3, charge: -1}
  - {id: lac_c, compartment: c, formula: C3H5O3, charge: -1}
  - {id: h_e, compartment: e, formula: H, charge: 1}
  - {id: h_c, compartment: c, formula: H, charge: 1}
  - {id: pyr_c, compartment: c, formula: C3H3O3, charge: -1}
reactions:
  - {id: LACt, equation: lac_e + h_e -> lac_c + h_c}
  - {id: LDH, equation: lac_c -> pyr_c + h_c}
";

#[test]
fn symport_gets_a_marked_verdict_and_chemistry_does_not() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("model.yaml");
    std::fs::write(&path, MODEL).unwrap();
    let report = Project::load(&path).unwrap().analyse();
    let lact = &report.reactions[0];
    assert_eq!(lact.energy_origin.as_deref(), Some("transport-rule"));
    // −3.19945 kJ/mol: the hand calculation in
    // src/thermo/transport_only.rs (Jol et al., Biophys. J. 99 (2010) 3139).
    let e = lact.drg_prime.as_ref().unwrap();
    assert!((e.value_kj + 3.19945).abs() < 2e-4, "{}", e.value_kj);
    assert!(e
        .source
        .starts_with("transport, single-species approximation"));
    assert!(lact.forward_verdict.is_some());
    let json = gibbsite::report::json::to_json(&report);
    // Compact JSON (report::json): no space after the colon.
    assert!(json.contains("\"energy_origin\":\"transport-rule\""));
    // Lactate dehydrogenase-like chemistry has no data: no rule applies.
    assert!(report.reactions[1].drg_prime.is_none());

    let out = dir.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let page = std::fs::read_to_string(out.join("reactions/LACt.html")).unwrap();
    assert!(page.contains("<strong>transport, single-species approximation (Jol et al."));
    assert!(page.contains("Transport, single-species approximation</h2>"));
}
