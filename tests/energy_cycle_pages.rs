//! Energy-generating cycles as a reviewer reads them (the test of
//! Fritzemeier et al., PLoS Comput. Biol. 13 (2017) e1005494: with every
//! boundary reaction shut, a dissipation of a currency must not carry flux):
//! the dissipation as an equation of names, the trivial case in words, only
//! compartments where the currency is used as one, and one page per cycle
//! with its map.
//!
//! The fixture `tests/cases/energy_cycles` is invented for this test; its
//! cycles follow from S·v = 0 by hand: FREE_ATP (ADP + Pi + H+ → ATP + H2O)
//! is the ATP dissipation reversed, and XDH + YX add up to NAD+ + H+ → NADH,
//! the NADH dissipation reversed.

mod common;

use gibbsite::loops::{energy_generating_cycles, CurrencyOptions};
use gibbsite::project::Project;
use gibbsite::report::Report;
use std::path::{Path, PathBuf};

fn fixture() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/energy_cycles")
}

fn report() -> Report {
    Project::load(&fixture()).expect("fixture loads").analyse()
}

fn site(report: &Report) -> tempfile::TempDir {
    let tmp = tempfile::tempdir().unwrap();
    gibbsite::site::render(report, None, &tmp.path().join("site")).expect("renders");
    tmp
}

fn read(dir: &tempfile::TempDir, path: &str) -> String {
    std::fs::read_to_string(dir.path().join("site").join(path))
        .unwrap_or_else(|e| panic!("{path}: {e}"))
}

#[test]
fn dissipation_is_an_equation_of_names_not_a_vector() {
    let report = report();
    let cycles = &report.loops.as_ref().expect("loops analysed").energy_cycles;
    let atp = cycles
        .iter()
        .find(|c| c.currency == "atp" && c.compartment == "c")
        .expect("atp in c tested");
    // ATP + H2O → ADP + Pi + H+ (the ATP dissipation of Fritzemeier et al.
    // 2017), with the fixture's metabolite names.
    assert_eq!(atp.named_equation, "ATP + H2O → ADP + phosphate + H+");
    let finding = report
        .findings
        .iter()
        .find(|f| f.kind == "energy-generating-cycle" && f.subjects[0] == "atp in c")
        .expect("atp cycle reported");
    assert!(
        finding
            .message
            .contains("the dissipation ATP + H2O → ADP + phosphate + H+ can carry flux"),
        "{}",
        finding.message
    );
    // No flat stoichiometry vector ("-1 atp_c -1 h2o_c +1 adp_c …").
    assert!(!finding.message.contains("-1 atp_c"), "{}", finding.message);
    assert!(!finding.message.contains("+1 "), "{}", finding.message);
}

#[test]
fn the_trivial_case_is_told_in_words() {
    let report = report();
    let cycles = &report.loops.as_ref().unwrap().energy_cycles;
    let atp = cycles.iter().find(|c| c.currency == "atp").unwrap();
    assert!(atp.cycle_exists && atp.trivial);
    assert_eq!(atp.example.len(), 1);
    assert_eq!(atp.example[0].reaction, "FREE_ATP");
    let nadh = cycles.iter().find(|c| c.currency == "nadh").unwrap();
    assert!(nadh.cycle_exists && !nadh.trivial);
    let mut members: Vec<&str> = nadh.example.iter().map(|m| m.reaction.as_str()).collect();
    members.sort_unstable();
    assert_eq!(members, ["XDH", "YX"]);
    let message = &report
        .findings
        .iter()
        .find(|f| f.kind == "energy-generating-cycle" && f.subjects[0] == "atp in c")
        .unwrap()
        .message;
    assert!(
        message.contains(
            "one reaction does it alone: FREE_ATP run forward is exactly the reverse of the dissipation"
        ),
        "{message}"
    );
    let two = &report
        .findings
        .iter()
        .find(|f| f.kind == "energy-generating-cycle" && f.subjects[0] == "nadh in c")
        .unwrap()
        .message;
    assert!(two.contains("an example uses 2 reactions"), "{two}");
    assert!(!two.contains("alone"), "{two}");
}

#[test]
fn a_currency_only_carried_into_a_compartment_is_not_tested_there() {
    // The fixture can write ATP + H2O → ADP + Pi + H+ outside (all five
    // compounds are there), but outside they are only carried across.
    let report = report();
    let lv = report.loops.as_ref().unwrap();
    assert!(lv
        .energy_cycles
        .iter()
        .all(|c| !(c.currency == "atp" && c.compartment == "e")));
    assert_eq!(lv.not_used, ["atp in e"]);

    // An ecto-ATPase (ATP hydrolysis outside) makes extracellular ATP a
    // currency there: then it is tested.
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path().join("project");
    std::fs::create_dir(&dir).unwrap();
    std::fs::copy(fixture().join("gibbsite.yaml"), dir.join("gibbsite.yaml")).unwrap();
    let model = std::fs::read_to_string(fixture().join("model.yaml")).unwrap()
        + "  - {id: ECTO, name: ecto-ATPase, equation: atp_e + h2o_e -> adp_e + pi_e + h_e}\n";
    std::fs::write(dir.join("model.yaml"), model).unwrap();
    let report = Project::load(&dir).unwrap().analyse();
    let lv = report.loops.as_ref().unwrap();
    assert!(lv
        .energy_cycles
        .iter()
        .any(|c| c.currency == "atp" && c.compartment == "e"));
    assert!(lv.not_used.is_empty(), "{:?}", lv.not_used);
}

#[test]
fn e_coli_core_tests_no_extracellular_dissipation() {
    let Some(model) = common::shared_model("e_coli_core.xml.gz") else {
        return;
    };
    let result = energy_generating_cycles(&model, &CurrencyOptions::default()).unwrap();
    for r in &result.results {
        if r.test.currency == "proton-gradient" {
            // A gradient spans two compartments by definition: protons
            // flowing from outside into the cytosol (e->c).
            assert_eq!(r.test.compartment, "e->c");
            continue;
        }
        assert_eq!(r.test.compartment, "c", "{:?}", r.test);
        assert!(
            r.test.equation.iter().all(|(m, _)| m.ends_with("_c")),
            "{:?}",
            r.test
        );
    }
    // The cytosolic ATP test is there (common practice: ATP hydrolysis is
    // the first test of Fritzemeier et al. 2017).
    assert!(result
        .results
        .iter()
        .any(|r| r.test.currency == "atp" && r.test.compartment == "c"));
}

#[test]
fn one_page_per_cycle_with_its_map() {
    let report = report();
    let dir = site(&report);
    let atp = read(&dir, "loops/cycle-atp-c.html");
    assert!(atp.contains("ATP + H2O → ADP + phosphate + H+"));
    assert!(atp.contains("One reaction does it alone."));
    assert!(atp.contains("href=\"../reactions/FREE_ATP.html\""));
    assert!(atp.contains("class=\"nm net-map\""), "no map on the page");
    assert!(atp.contains("the model regenerates atp in c from nothing"));
    let nadh = read(&dir, "loops/cycle-nadh-c.html");
    assert!(!nadh.contains("One reaction does it alone."));
    for id in ["XDH", "YX"] {
        assert!(nadh.contains(&format!("href=\"../reactions/{id}.html\"")));
    }
    assert!(nadh.contains("class=\"nm net-map\""));
    // No page for a test that found nothing, nor for one not run.
    let loops = dir.path().join("site/loops");
    assert!(!loops.join("cycle-proton-gradient-e-to-c.html").exists());
    assert!(!loops.join("cycle-atp-e.html").exists());
    // The index links each cycle's page and says what was not tested.
    let index = read(&dir, "loops/index.html");
    assert!(index.contains("href=\"cycle-atp-c.html\""));
    assert!(index.contains("href=\"cycle-nadh-c.html\""));
    assert!(index.contains("one reaction reversed"));
    assert!(index.contains("not used as a currency in that compartment"));
    assert!(index.contains("atp in e"));
    // Findings name the cycle with a link to its page.
    let findings = read(&dir, "findings.html");
    assert!(findings.contains("href=\"loops/cycle-atp-c.html\""));
}
