//! Root causes (`report::root_causes`): small models that each build one
//! cause, whose answer is worked out beside them, and an opt-in check on
//! Recon3D (Brunk et al., Nat. Biotechnol. 36 (2018) 272), whose proton
//! species carry charge 0 in the published SBML file (issue 12).
//!
//! Formulas and charges here are those of the textbook species (H⁺: H, +1;
//! water: H2O, 0; hydrogen phosphate HPO4²⁻: H1, −2, the form that
//! predominates above its pK near 7.2 — Alberty 2003, Table 1.2, p. 7);
//! the other metabolites are invented for these tests.

use gibbsite::report::{Report, RootCauseView};
use gibbsite::Project;
use std::path::Path;

mod common;

fn analyse(yaml: &str) -> Report {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("model.yaml");
    std::fs::write(&path, yaml).unwrap();
    Project::load(&path)
        .unwrap_or_else(|e| panic!("model loads:\n{e}"))
        .analyse()
}

fn cause<'r>(report: &'r Report, kind: &str) -> &'r RootCauseView {
    report
        .root_causes
        .iter()
        .find(|c| c.kind == kind)
        .unwrap_or_else(|| panic!("no {kind} cause in {:#?}", report.root_causes))
}

/// The first subjects of the findings a cause explains.
fn explained(report: &Report, c: &RootCauseView) -> Vec<String> {
    c.findings
        .iter()
        .map(|&k| report.findings[k].subjects[0].clone())
        .collect()
}

/// Two reactions release H⁺ whose charge the model gives as 0: each is
/// charge imbalanced by exactly the missing +1 per H⁺ (R1: −1, R2: −2), so
/// both are explained; R3 is off by one charge of its own and is not.
#[test]
fn proton_species_with_charge_zero() {
    let report = analyse(
        "id: t
compartments: [{id: c, ph: 7}]
metabolites:
  - {id: a_c, compartment: c, formula: C2H4O2, charge: 0}
  - {id: b_c, compartment: c, formula: C2H3O2, charge: -1}
  - {id: d_c, compartment: c, formula: C2H2O2, charge: -2}
  - {id: e_c, compartment: c, formula: C2H4O2, charge: 1}
  - {id: h_c, compartment: c, formula: H, charge: 0, special: proton}
reactions:
  - {id: R1, equation: a_c -> b_c + h_c}
  - {id: R2, equation: a_c -> d_c + 2 h_c}
  - {id: R3, equation: a_c -> e_c}
",
    );
    let c = cause(&report, "proton-species");
    assert_eq!(explained(&report, c), ["R1", "R2"]);
    assert_eq!(c.metabolites, ["h_c"]);
    assert_eq!(c.finding_kinds, ["charge-imbalance"]);
    assert_eq!(c.title, "H⁺ species with charge 0");
    assert!(c.sentence.starts_with(
        "2 imbalanced reactions balance with this fix alone: the model's H⁺ species h_c has charge 0, yet it is treated as H⁺"
    ), "{}", c.sentence);
    assert!(c.sentence.ends_with("set it to +1."), "{}", c.sentence);
    // R3 stays unexplained by any cause: one finding shares nothing.
    assert!(report
        .root_causes
        .iter()
        .all(|c| !explained(&report, c).contains(&"R3".to_string())));
}

/// Water written as HO (formula wrong): a hydrolysis then lacks one H on
/// the substrate side; setting the formula to H2O balances it.
#[test]
fn water_species_with_a_wrong_formula() {
    let report = analyse(
        "id: t
compartments: [{id: c, ph: 7}]
metabolites:
  - {id: es_c, compartment: c, formula: C4H8O2, charge: 0}
  - {id: ac_c, compartment: c, formula: C2H4O2, charge: 0}
  - {id: et_c, compartment: c, formula: C2H6O, charge: 0}
  - {id: h2o_c, compartment: c, formula: HO, charge: 0, special: water}
reactions:
  - {id: HYD, equation: es_c + h2o_c -> ac_c + et_c}
",
    );
    let c = cause(&report, "water-species");
    assert_eq!(explained(&report, c), ["HYD"]);
    assert_eq!(c.title, "Water species with formula HO");
    assert!(c.sentence.ends_with("set it to H2O."), "{}", c.sentence);
}

/// Phosphate as HO4P with charge 0, matched to the library's phosphate
/// (species H2PO4⁻: H2, −1; HPO4²⁻: H1, −2; plus a Mg complex): no
/// species has H1 and charge 0. At pH 7.5 HPO4²⁻ predominates, and with
/// its charge −2 the phosphorylation below balances (charge off by −2
/// before: g6p −2 on the right, nothing charged on the left).
#[test]
fn library_match_with_another_charge() {
    let report = analyse(
        "id: t
compartments: [{id: c, ph: 7.5}]
metabolites:
  - {id: glc_c, compartment: c, formula: C6H12O6, charge: 0}
  - {id: g6p_c, compartment: c, formula: C6H11O9P, charge: -2}
  - {id: pi_c, compartment: c, formula: HO4P, charge: 0, library: phosphate}
  - {id: h2o_c, compartment: c, formula: H2O, charge: 0}
reactions:
  - {id: PHOS, equation: glc_c + pi_c -> g6p_c + h2o_c}
",
    );
    let c = cause(&report, "library-mismatch");
    assert_eq!(c.metabolites, ["pi_c"]);
    assert_eq!(explained(&report, c), ["PHOS"]);
    assert!(
        c.sentence.contains("pi_c (HO4P, charge 0)"),
        "{}",
        c.sentence
    );
    assert!(
        c.sentence.contains("none has that charge"),
        "{}",
        c.sentence
    );
}

/// x_c is written with charge 0 where −1 balances both reactions it takes
/// part in (R1 off by +1 with x_c a product, R2 off by −1 with x_c a
/// substrate): one change of one metabolite explains both.
#[test]
fn one_metabolite_explains_two_imbalances() {
    let report = analyse(
        "id: t
compartments: [{id: c, ph: 7}]
metabolites:
  - {id: a1_c, compartment: c, formula: C3H3O3, charge: -1}
  - {id: a2_c, compartment: c, formula: C3H3O3, charge: -1}
  - {id: x_c, compartment: c, formula: C3H3O3, charge: 0}
reactions:
  - {id: R1, equation: a1_c -> x_c}
  - {id: R2, equation: x_c -> a2_c}
",
    );
    let c = cause(&report, "one-metabolite");
    assert_eq!(c.metabolites, ["x_c"]);
    assert_eq!(explained(&report, c), ["R1", "R2"]);
    assert_eq!(c.title, "x_c: charge −1 instead of 0?");
    assert_eq!(report.root_causes.len(), 1, "{:#?}", report.root_causes);
}

/// The demo (projects/lakeside): its five error-level contradictions
/// (PEPS against its bounds; LDH and PEPS in scenario dusk; PEPS in refit;
/// the conflicting set PLC1–PLC3 in bloom, which starts from pyruvate) all
/// involve pyruvate, whose own range 50 µM … 5 mM (model.yaml) every one
/// of their ΔG' bounds uses.
#[test]
fn demo_contradictions_share_pyruvate() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let report = Project::load(&dir).unwrap().analyse();
    let c = cause(&report, "shared-range");
    assert_eq!(c.metabolites, ["pyr_c"]);
    let errors = report
        .findings
        .iter()
        .filter(|f| f.severity == gibbsite::report::Severity::Error)
        .count();
    assert_eq!(c.findings.len(), errors);
    assert_eq!(errors, 5);
    assert!(
        c.sentence.contains("allowed 50 µM … 5 mM (its own range)"),
        "{}",
        c.sentence
    );
}

/// Recon3D: every proton species has charge 0; the proton cause must
/// explain at least 90 % of the charge-imbalance findings (issue 12 counted
/// 2,930 of them). Opt-in through GIBBSITE_MODELS_DIR.
#[test]
fn recon3d_protons_explain_the_charge_imbalances() {
    let Some(model) = common::shared_model_path("Recon3D.xml.gz") else {
        return;
    };
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(
        dir.path().join("gibbsite.yaml"),
        format!(
            "model: {}\nloops: false\n",
            serde_json::to_string(&model).unwrap()
        ),
    )
    .unwrap();
    let options = gibbsite::project::LoadOptions {
        allowed_dirs: vec![model.parent().unwrap().to_path_buf()],
    };
    let report = Project::load_with(dir.path(), &options).unwrap().analyse();
    let charge = report
        .findings
        .iter()
        .filter(|f| f.kind == "charge-imbalance")
        .count();
    let c = &report.root_causes[0];
    assert_eq!(c.kind, "proton-species");
    let proton_charge = c
        .findings
        .iter()
        .filter(|&&k| report.findings[k].kind == "charge-imbalance")
        .count();
    println!(
        "Recon3D: proton cause explains {proton_charge} of {charge} charge-imbalance findings"
    );
    assert!(charge > 2000, "{charge}");
    assert!(
        10 * proton_charge >= 9 * charge,
        "{proton_charge} of {charge}"
    );
    assert!(c.sentence.ends_with("set it to +1."), "{}", c.sentence);
    // Its phosphate (HO4P, charge 0) is named as a library mismatch.
    assert!(report
        .root_causes
        .iter()
        .any(|c| c.kind == "library-mismatch" && c.metabolites.iter().any(|m| m == "M_pi_c")));
}
