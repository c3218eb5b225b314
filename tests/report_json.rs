//! report.json is compact and free of repetition, and `report::json::from_json`
//! restores the full report from it.

use gibbsite::report::json::{from_json, to_json};
use gibbsite::Project;
use std::path::Path;

fn demo_report() -> gibbsite::Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    Project::load(&dir).expect("demo loads").analyse()
}

#[test]
fn report_json_round_trips_to_the_full_report() {
    let report = demo_report();
    let text = to_json(&report);
    let back = from_json(&text).expect("reads back");
    // Equal field for field, floats included (serde_json's exact float
    // parsing), the left-out fields restored from the rows they repeat.
    assert_eq!(back, report);
    // The demo exercises every restored part.
    assert!(report.reactions.iter().any(|r| !r.participants.is_empty()));
    let loops = report.loops.as_ref().expect("demo has loop analysis");
    assert!(loops.loops.iter().any(|l| !l.members.is_empty()));
    assert!(!report.coverage.as_ref().unwrap().missing.is_empty());
}

#[test]
fn report_json_is_compact_and_says_each_thing_once() {
    let report = demo_report();
    let text = to_json(&report);
    assert_eq!(text.lines().count(), 1, "one line, no indentation");
    let json: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(json["schema_version"], 2);
    for r in json["reactions"].as_array().unwrap() {
        for p in r["participants"].as_array().unwrap() {
            let keys: Vec<&str> = p.as_object().unwrap().keys().map(|k| k.as_str()).collect();
            assert_eq!(keys, ["coefficient", "metabolite"], "{p}");
        }
    }
    for l in json["loops"]["loops"].as_array().unwrap() {
        for m in l["members"].as_array().unwrap() {
            let m = m.as_object().unwrap();
            for derived in ["slug", "name", "equation", "participants"] {
                assert!(!m.contains_key(derived), "member repeats {derived}");
            }
        }
    }
    for row in json["coverage"]["missing"].as_array().unwrap() {
        let keys: Vec<&str> = row
            .as_object()
            .unwrap()
            .keys()
            .map(|k| k.as_str())
            .collect();
        assert_eq!(keys, ["blocks", "metabolite", "only_gap"], "{row}");
    }
    // Template values keep every field (pages link participants by slug).
    let value = minijinja::Value::from_serialize(&report.reactions[0].participants[0]);
    assert!(value
        .get_attr("slug")
        .unwrap()
        .as_str()
        .is_some_and(|s| !s.is_empty()));
}
