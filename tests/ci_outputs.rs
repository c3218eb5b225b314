//! Outputs for CI: SARIF, the Markdown summary, and failing only on findings
//! that are new since a baseline report.

use gibbsite::report::{sarif, summary};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::Command;

fn demo() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

#[test]
fn sarif_lists_every_finding_with_level_rule_and_stable_fingerprint() {
    let report = Project::load(&demo()).unwrap().analyse();
    let text = sarif::to_sarif(&report, Some("projects/lakeside/model.yaml"));
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(v["version"], "2.1.0");
    let results = v["runs"][0]["results"].as_array().unwrap();
    assert_eq!(results.len(), report.findings.len());
    let errors = results.iter().filter(|r| r["level"] == "error").count();
    assert_eq!(errors, report.summary.errors);
    let first = &results[0];
    assert_eq!(first["ruleId"], "infeasible-direction");
    assert_eq!(first["locations"][0]["logicalLocations"][0]["name"], "PEPS");
    assert_eq!(
        first["locations"][0]["physicalLocation"]["artifactLocation"]["uri"],
        "projects/lakeside/model.yaml"
    );
    let rules = v["runs"][0]["tool"]["driver"]["rules"].as_array().unwrap();
    assert!(rules.iter().any(|r| r["id"] == "scenario-contradiction"));
    // Same finding, same fingerprint, run after run; different findings differ.
    let again = Project::load(&demo()).unwrap().analyse();
    assert_eq!(
        sarif::fingerprint(&report.findings[0]),
        sarif::fingerprint(&again.findings[0])
    );
    assert_ne!(
        sarif::fingerprint(&report.findings[1]),
        sarif::fingerprint(&report.findings[2])
    );
}

#[test]
fn markdown_summary_has_counts_table_and_caution() {
    let mut report = Project::load(&demo()).unwrap().analyse();
    report.findings[0].message = "a | b <script>".into();
    let md = summary::to_markdown(&report, 2);
    assert!(md.contains("**5 errors, 5 warnings, 4 notes**"), "{md}");
    assert!(md.contains("a \\| b &lt;script&gt;"), "{md}");
    assert!(md.contains("… and 8 more in the report."), "{md}");
    assert!(md.contains("expert review"));
}

fn gibbsite(args: &[&str], dir: &Path) -> i32 {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .arg(dir)
        .output()
        .unwrap()
        .status
        .code()
        .unwrap()
}

#[test]
fn baseline_makes_only_new_findings_fail() {
    let tmp = tempfile::tempdir().unwrap();
    let baseline = tmp.path().join("report.json");
    std::fs::write(
        &baseline,
        gibbsite::report::json::to_json(&Project::load(&demo()).unwrap().analyse()),
    )
    .unwrap();
    let b = baseline.to_str().unwrap();
    // Nothing new since the baseline: exit 0 even with errors in the report.
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 0);
    // A baseline without the errors: they are new, exit 1.
    let mut old = Project::load(&demo()).unwrap().analyse();
    old.findings.retain(|f| f.kind != "scenario-contradiction");
    std::fs::write(&baseline, gibbsite::report::json::to_json(&old)).unwrap();
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 1);
    // A broken baseline is bad input.
    std::fs::write(&baseline, "{ not json").unwrap();
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 2);
}

/// The joint verdict of every scenario reaches SARIF (run properties) and the
/// terminal listing, feasible ones included.
#[test]
fn sarif_and_text_carry_the_joint_scenario_verdicts() {
    let report = Project::load(&demo()).unwrap().analyse();
    let v: serde_json::Value =
        serde_json::from_str(&sarif::to_sarif(&report, None)).expect("SARIF is JSON");
    let verdicts = v["runs"][0]["properties"]["scenarioVerdicts"]
        .as_array()
        .unwrap();
    let pairs: Vec<(&str, &str)> = verdicts
        .iter()
        .map(|s| {
            (
                s["scenario"].as_str().unwrap(),
                s["verdict"].as_str().unwrap(),
            )
        })
        .collect();
    assert_eq!(
        pairs,
        [
            ("irreversible-directions", "infeasible"),
            ("noon", "feasible"),
            ("bloom", "infeasible"),
            ("refit", "infeasible"),
            ("dusk", "infeasible"),
        ]
    );
    let text = gibbsite::report::text::scenario_verdicts_text(&report);
    assert!(text.contains("scenario noon as a whole: feasible (max-min driving force "));
    assert!(text.contains("scenario refit as a whole: infeasible"));
    assert!(text.contains("the flux carries 1 internal cycle(s)"));
}
