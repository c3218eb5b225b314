//! The demo project is a complete input with deliberate problems; the report
//! must catch each of them, with the numbers worked out by hand below.

use gibbsite::report::{Severity, Verdict};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::Command;

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

fn findings(report: &gibbsite::Report) -> Vec<(Severity, String, String, Option<String>)> {
    report
        .findings
        .iter()
        .map(|f| {
            (
                f.severity,
                f.kind.clone(),
                f.subjects[0].clone(),
                f.scenario.clone(),
            )
        })
        .collect()
}

#[test]
fn demo_report_lists_the_deliberate_problems() {
    let project = Project::load(&demo_dir()).expect("demo loads");
    let report = project.analyse();
    let s = |x: &str| x.to_string();
    assert_eq!(
        findings(&report),
        vec![
            (Severity::Error, s("infeasible-direction"), s("PEPS"), None),
            (
                Severity::Error,
                s("scenario-contradiction"),
                s("LDH"),
                Some(s("dusk"))
            ),
            (
                Severity::Error,
                s("scenario-contradiction"),
                s("PEPS"),
                Some(s("dusk"))
            ),
            (
                Severity::Warning,
                s("scenario-marginal"),
                s("GAPD"),
                Some(s("noon"))
            ),
            (Severity::Note, s("no-energy-data"), s("STOR"), None),
            (Severity::Note, s("one-way-reversible"), s("HEX"), None),
            (Severity::Note, s("one-way-reversible"), s("LDH"), None),
        ]
    );
    assert_eq!(
        (
            report.summary.errors,
            report.summary.warnings,
            report.summary.notes
        ),
        (3, 1, 3)
    );
    assert_eq!(report.summary.reactions, 27);
    assert_eq!(report.summary.scenarios, 2);
    assert_eq!(report.compartments.len(), 2);
}

/// PEPS as annotated: pyr + ATP → PEP + ADP (+ H+, fixed by pH).
/// ΔrG'° = ΔfG'°(PEP) + ΔfG'°(ADP) − ΔfG'°(pyr) − ΔfG'°(ATP)
///       = −1179.05 − 1424.70 + 342.65 + 2292.50 = +31.40 kJ/mol (demo values),
/// σ = √(0.8² + 0.5² + 0.6² + 0.5²) = √1.5 = 1.2247 kJ/mol.
/// Lowest ΔG' at 303.15 K: PEP and ADP at their minimum (10 µM, 0.1 mM), pyruvate
/// and ATP at their maximum (5 mM each): 31.40 + RT ln(4e-5) = 31.40 − 25.524 = 5.876.
#[test]
fn demo_numbers_match_hand_calculation() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let peps = report.reactions.iter().find(|r| r.id == "PEPS").unwrap();
    let e = peps.drg_prime.as_ref().unwrap();
    assert!((e.value_kj - 31.40).abs() < 1e-9, "{}", e.value_kj);
    assert!((e.sigma_kj - 1.5f64.sqrt()).abs() < 1e-12);
    let rt = 8.314_462_618e-3 * 303.15;
    let expected_min = 31.40 + rt * (4e-5f64).ln();
    let range = peps.dg_range.unwrap();
    assert!((range.min - expected_min).abs() < 1e-9, "{}", range.min);
    assert!((range.min - 5.876).abs() < 0.001);
    assert_eq!(peps.forward_verdict, Some(Verdict::Contradiction));
    // K' = exp(−31.40 / RT) at 303.15 K.
    assert!((peps.k_prime.unwrap() - (-31.40 / rt).exp()).abs() < 1e-15);
    let stor = report.reactions.iter().find(|r| r.id == "STOR").unwrap();
    assert_eq!(stor.missing_data, vec!["stor_c".to_string()]);
    assert!(stor.drg_prime.is_none());
    // GAPD at noon is feasible only near its bounds: best ΔG' −1.71 kJ/mol.
    let gapd = report.reactions.iter().find(|r| r.id == "GAPD").unwrap();
    let noon = gapd
        .scenario_verdicts
        .iter()
        .find(|v| v.scenario == "noon")
        .unwrap();
    assert_eq!(noon.verdict, Verdict::Marginal);
    assert!((gapd.dg_range.unwrap().min + 1.71).abs() < 0.01);
}

fn copy_dir(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).unwrap();
    for entry in std::fs::read_dir(from).unwrap() {
        let path = entry.unwrap().path();
        let target = to.join(path.file_name().unwrap());
        if path.is_dir() {
            if path.file_name().unwrap() != "site" {
                copy_dir(&path, &target);
            }
        } else {
            std::fs::copy(&path, &target).unwrap();
        }
    }
}

fn run_check(dir: &Path) -> i32 {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .arg("check")
        .arg(dir)
        .output()
        .unwrap()
        .status
        .code()
        .unwrap()
}

/// Copy the demo and repair its deliberate errors: PEPS written the right way
/// round is no longer uphill, and the dusk scenario (lactate oxidation against
/// the NAD ratio) is dropped.
fn consistent_copy(into: &Path) {
    copy_dir(&demo_dir(), into);
    let model = std::fs::read_to_string(into.join("model.yaml")).unwrap();
    let fixed = model.replace(
        "equation: pyr_c + atp_c -> pep_c + adp_c + h_c",
        "equation: pep_c + adp_c + h_c -> pyr_c + atp_c",
    );
    assert_ne!(model, fixed);
    std::fs::write(into.join("model.yaml"), fixed).unwrap();
    let settings = std::fs::read_to_string(into.join("gibbsite.yaml")).unwrap();
    let cut = settings.find("scenarios:").unwrap();
    std::fs::write(into.join("gibbsite.yaml"), &settings[..cut]).unwrap();
}

#[test]
fn check_exits_1_on_the_demo_and_0_on_a_consistent_copy() {
    assert_eq!(run_check(&demo_dir()), 1);
    let tmp = tempfile::tempdir().unwrap();
    consistent_copy(tmp.path());
    assert_eq!(run_check(tmp.path()), 0);
    let report = Project::load(tmp.path()).unwrap().analyse();
    assert_eq!(report.summary.errors, 0);
    // --fail-on warning still fails on the marginal GAPD step at noon.
    let code = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(["check", "--fail-on", "warning"])
        .arg(tmp.path())
        .output()
        .unwrap()
        .status
        .code();
    assert_eq!(code, Some(1));
}

#[test]
fn build_writes_a_site_with_report_json() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let status = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .arg("build")
        .arg(demo_dir())
        .arg("-o")
        .arg(&out)
        .env("SOURCE_DATE_EPOCH", "1700000000")
        .output()
        .unwrap();
    assert_eq!(
        status.status.code(),
        Some(1),
        "errors in the demo give exit 1"
    );
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("report.json")).unwrap()).unwrap();
    assert_eq!(json["tool"]["generated"], "2023-11-14T22:13:20Z");
    assert_eq!(json["summary"]["errors"], 3);
    assert!(json["project"]["caution"]
        .as_str()
        .unwrap()
        .contains("expert review"));
}
