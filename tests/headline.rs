//! The headline (`report::headline`): coverage = judged internal reactions
//! over internal reactions, its state and sentence, and `--min-coverage`.
//!
//! Figures: the demo (projects/lakeside) has 25 internal reactions, 24 with
//! a ΔrG'° (stor_c, its storage polymer unit, has no formation energy);
//! e_coli_core (tests/data, Orth, Fleming & Palsson 2010) has 74 internal
//! reactions (95 minus 20 exchanges and the biomass reaction), of which 20
//! get a ΔrG'° from the built-in library and the transport rule (counted by
//! this build; each such reaction is listed on its coverage page).

use gibbsite::report::headline::{headline, HeadlineState};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::Command;

fn repo(path: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join(path)
}

#[test]
fn demo_is_assessed() {
    let report = Project::load(&repo("projects/lakeside")).unwrap().analyse();
    let h = report.headline.as_ref().unwrap();
    assert_eq!((h.judged, h.internal_reactions), (24, 25));
    assert_eq!(h.percent, 96.0);
    assert_eq!(h.state, HeadlineState::Assessed);
    assert_eq!(
        h.sentence,
        "Judged 24 of 25 internal reactions (96 %): 5 errors and 5 warnings to review; 1 could not be judged for lack of ΔG′° data — see what is missing."
    );
    // The stored headline is the one computed from the report.
    assert_eq!(&headline(&report), h);
}

#[test]
fn e_coli_core_is_partly_assessed() {
    let report = Project::load(&repo("tests/data/e_coli_core.xml.gz"))
        .unwrap()
        .analyse();
    let h = report.headline.as_ref().unwrap();
    assert_eq!((h.judged, h.internal_reactions), (20, 74));
    assert_eq!(h.percent_text, "27 %");
    assert_eq!(h.state, HeadlineState::PartlyAssessed);
    assert!(h
        .sentence
        .starts_with("Judged 20 of 74 internal reactions (27 %): no contradiction"));
    assert!(h.sentence.contains("54 could not be judged"));
    // report.json carries the same figure.
    let json: serde_json::Value =
        serde_json::from_str(&gibbsite::report::json::to_json(&report)).unwrap();
    assert_eq!(json["headline"]["judged"], 20);
    assert_eq!(json["headline"]["state"], "partly-assessed");
}

/// A model with nothing to judge is "not assessed", never "0 errors".
#[test]
fn nothing_judged_is_not_assessed() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("model.yaml");
    std::fs::write(
        &path,
        "id: t
compartments: [{id: c, ph: 7}]
metabolites:
  - {id: a_c, compartment: c, formula: C2H4O2, charge: 0}
  - {id: b_c, compartment: c, formula: C2H4O2, charge: 0}
reactions:
  - {id: R1, equation: a_c -> b_c}
",
    )
    .unwrap();
    let report = Project::load(&path).unwrap().analyse();
    let h = report.headline.as_ref().unwrap();
    assert_eq!((h.judged, h.internal_reactions), (0, 1));
    assert_eq!(h.state, HeadlineState::NotAssessed);
    assert!(h
        .sentence
        .starts_with("Not assessed: none of the 1 internal reaction"));
}

fn gibbsite(args: &[&str]) -> std::process::Output {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .output()
        .unwrap()
}

#[test]
fn min_coverage_fails_below_the_figure() {
    let model = repo("tests/data/e_coli_core.xml.gz");
    let model = model.to_str().unwrap();
    // 27 % judged: 27 passes, 28 fails with one clear line.
    let ok = gibbsite(&["check", model, "--min-coverage", "27"]);
    assert_eq!(ok.status.code(), Some(0));
    let low = gibbsite(&["check", model, "--min-coverage", "28"]);
    assert_eq!(low.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&low.stderr);
    assert!(
        stderr.contains(
            "coverage 27 % is below --min-coverage 28 %: 20 of 74 internal reactions judged"
        ),
        "{stderr}"
    );
    // The closing pass/fail line of the text output says why it failed.
    let stdout = String::from_utf8_lossy(&low.stdout);
    let last = stdout.lines().last().unwrap_or_default();
    assert!(last.starts_with("FAIL: 0 errors"), "{last}");
    assert!(
        last.ends_with("below --min-coverage 28 %: 20 of 74 internal reactions judged"),
        "{last}"
    );
    let passing = String::from_utf8_lossy(&ok.stdout);
    assert!(passing
        .lines()
        .last()
        .unwrap_or_default()
        .starts_with("PASS: "));
    let bad = gibbsite(&["check", model, "--min-coverage", "120"]);
    assert_eq!(bad.status.code(), Some(2));
    // build writes the site and still fails.
    let out = tempfile::tempdir().unwrap();
    let site = out.path().join("site");
    let built = gibbsite(&[
        "build",
        model,
        "-o",
        site.to_str().unwrap(),
        "--min-coverage",
        "50",
    ]);
    assert_eq!(built.status.code(), Some(1));
    assert!(site.join("index.html").exists());
}
