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
    assert_eq!(json["schema_version"], 3);
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

fn e_coli_core_report() -> gibbsite::Report {
    let file = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz");
    Project::load(&file).expect("e_coli_core loads").analyse()
}

#[test]
fn report_json_of_an_sbml_model_round_trips() {
    // e_coli_core has loops, energy-cycle tests, transport-rule energies,
    // reactions without ΔrG'° and metabolites used by many reactions: every
    // field report.json leaves out or writes only when set is exercised.
    let report = e_coli_core_report();
    let back = from_json(&to_json(&report)).expect("reads back");
    assert_eq!(back, report);
    assert!(report.reactions.iter().any(|r| r.drg_prime.is_none()));
    assert!(report
        .reactions
        .iter()
        .any(|r| r.energy_origin.as_deref() == Some("transport-rule")));
    assert!(report
        .metabolites
        .iter()
        .all(|m| !m.consumed_by.is_empty() || !m.produced_by.is_empty()));
    assert!(report.reactions.iter().any(|r| !r.loops.is_empty()));
}

#[test]
fn report_json_leaves_out_defaults_and_what_other_rows_say() {
    let report = e_coli_core_report();
    let text = to_json(&report);
    // Nothing at its default: no null, false, empty text, list or map as a
    // value (`conditions_stated` defaults to true, so its false is written).
    let unstated = text.matches("\"conditions_stated\":false").count();
    assert_eq!(text.matches(":false").count(), unstated);
    for empty in [":null", ":\"\"", ":[]", ":{}"] {
        assert!(!text.contains(empty), "report.json writes {empty}");
    }
    let json: serde_json::Value = serde_json::from_str(&text).unwrap();
    for r in json["reactions"].as_array().unwrap() {
        let r = r.as_object().unwrap();
        for derived in ["equation", "loops"] {
            assert!(!r.contains_key(derived), "reaction repeats {derived}");
        }
        // Page names equal to the id are not written (e_coli_core's ids are
        // all safe file names).
        assert!(!r.contains_key("slug"), "{r:?}");
        if let Some(e) = r.get("drg_prime") {
            assert!(
                e.get("source").is_some() || r["energy_origin"] == "transport-rule",
                "{r:?}"
            );
        }
    }
    for m in json["metabolites"].as_array().unwrap() {
        let m = m.as_object().unwrap();
        for derived in ["slug", "consumed_by", "produced_by"] {
            assert!(!m.contains_key(derived), "metabolite repeats {derived}");
        }
    }
    for l in json["loops"]["loops"].as_array().unwrap() {
        for m in l["members"].as_array().unwrap() {
            let keys: Vec<&str> = m.as_object().unwrap().keys().map(|k| k.as_str()).collect();
            assert_eq!(keys, ["coefficient", "reaction"], "{m}");
        }
    }
}

#[test]
fn a_page_name_that_differs_from_the_id_is_kept() {
    let mut report = demo_report();
    let r = &mut report.reactions[0];
    r.slug = gibbsite::slug::slug("R/with slash");
    assert!(r.slug.ends_with(|c: char| c.is_ascii_hexdigit()));
    let text = to_json(&report);
    assert!(text.contains(&format!("\"slug\":\"{}\"", report.reactions[0].slug)));
    assert_eq!(from_json(&text).unwrap(), report);
}
