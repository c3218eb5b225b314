//! Recon3D (Brunk et al., Nat. Biotechnol. 36 (2018) 272) in
//! ../shared/models: the transport rule reaches its transport steps, and its
//! mitochondrial ATP synthase is judged on stated conditions only.
//! Skipped (with a visible message) when the model folder is absent.

use gibbsite::report::{Report, Severity};
use gibbsite::Project;
use std::path::Path;

mod common;

fn analyse(conditions: bool) -> Option<Report> {
    let model = common::shared_model_path("Recon3D.xml.gz")?;
    let dir = tempfile::tempdir().unwrap();
    let mut settings = format!(
        "model: {}\nloops: false\n",
        serde_json::to_string(&model).unwrap()
    );
    if conditions {
        let file = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/conditions/recon3d.yaml");
        settings.push_str(&std::fs::read_to_string(file).unwrap());
    }
    std::fs::write(dir.path().join("gibbsite.yaml"), settings).unwrap();
    // The model lives outside the temporary project: allow its folder, as
    // `--allow-dir` does on the command line.
    let options = gibbsite::project::LoadOptions {
        allowed_dirs: vec![model.parent().unwrap().to_path_buf()],
    };
    Some(Project::load_with(dir.path(), &options).unwrap().analyse())
}

fn transport_rule_count(report: &Report) -> usize {
    report
        .reactions
        .iter()
        .filter(|r| r.energy_origin.as_deref() == Some("transport-rule"))
        .count()
}

#[test]
fn recon3d_with_conditions() {
    let Some(report) = analyse(true) else {
        return;
    };
    // Measured 2026-12-02 (see the closing note of issue 11); the issue
    // expects well over a thousand.
    let covered = transport_rule_count(&report);
    assert!(covered > 1000, "{covered}");
    assert!(report
        .findings
        .iter()
        .all(|f| f.kind != "unset-compartment-conditions"));
    let coverage = report.coverage.as_ref().unwrap();
    let rule = coverage
        .by_source
        .iter()
        .find(|s| s.source == "transport-rule")
        .unwrap();
    assert_eq!(rule.reactions, covered);
    // ATP synthase, ADP + Pi + 4 H+(intermembrane space) → ATP + H2O +
    // 3 H+(matrix): with the stated potentials it is no contradiction.
    let atps = report
        .reactions
        .iter()
        .find(|r| r.id == "R_ATPS4mi")
        .unwrap();
    assert!(atps.drg_prime.is_some());
    assert!(report
        .findings
        .iter()
        .all(|f| !(f.kind == "infeasible-direction"
            && f.subjects.first().map(String::as_str) == Some("R_ATPS4mi"))));
}

#[test]
fn recon3d_without_conditions_softens_transport_verdicts() {
    let Some(report) = analyse(false) else {
        return;
    };
    let unset: Vec<_> = report
        .findings
        .iter()
        .filter(|f| f.kind == "unset-compartment-conditions")
        .collect();
    assert_eq!(unset.len(), 1);
    assert!(unset[0].message.starts_with("9 of 9 compartments"));
    // Every direction verdict on a step between compartments is a note.
    for f in &report.findings {
        if f.message
            .ends_with("(depends on unset compartment conditions)")
        {
            assert_eq!(f.severity, Severity::Note);
        }
    }
    assert!(report
        .findings
        .iter()
        .all(|f| !(f.severity == Severity::Error
            && f.subjects.first().map(String::as_str) == Some("R_ATPS4mi"))));
}
