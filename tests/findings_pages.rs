//! The findings pages (`site::findings_pages`): findings.html grouped by
//! severity, kind and root cause in collapsed sections; the full list in
//! pages of 250 rows; findings/data.js for the filters. The demo's counts
//! are those of tests/demo.rs (14 findings: 5 errors, 5 warnings, 4 notes).

use gibbsite::site::render;
use gibbsite::Project;
use std::fs;
use std::path::Path;

fn demo() -> gibbsite::Report {
    Project::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside"))
        .unwrap()
        .analyse()
}

/// The JSON object assigned in findings/data.js.
fn data(site: &Path) -> serde_json::Value {
    let js = fs::read_to_string(site.join("findings/data.js")).unwrap();
    let start = js.find("window.gibbsiteFindings = ").unwrap() + "window.gibbsiteFindings = ".len();
    let end = js.rfind(';').unwrap();
    serde_json::from_str(&js[start..end]).unwrap()
}

#[test]
fn demo_findings_are_grouped_by_kind_and_cause() {
    let tmp = tempfile::tempdir().unwrap();
    let site = tmp.path().join("site");
    render(&demo(), None, &site).unwrap();
    let page = fs::read_to_string(site.join("findings.html")).unwrap();
    // Collapsed, with counts: three scenario contradictions, all sharing
    // pyruvate's range (root cause 1; tests/root_causes.rs).
    let group = page
        .split("<details class=\"kind-group\" id=\"kind-error-scenario-contradiction\">")
        .nth(1)
        .expect("the group")
        .split("</details>")
        .next()
        .unwrap();
    assert!(
        group.contains("<span class=\"count\">3</span> — 3 from root cause 1"),
        "{group}"
    );
    assert_eq!(group.matches("<li>").count(), 3);
    assert!(page.contains("<li id=\"cause-1\"><strong>5 contradictions share pyr_c</strong>"));
    // Without JavaScript the filter stays hidden; the groups still read.
    assert!(page.contains("<section aria-labelledby=\"filter-heading\" class=\"finding-filter\" id=\"filter\" hidden>"));
    // Every finding is in the one list page, in the report's order.
    let list = fs::read_to_string(site.join("findings/list-1.html")).unwrap();
    assert_eq!(list.matches("<tr class=\"row-").count(), 14);
    assert!(!site.join("findings/list-2.html").exists());
    // data.js: one row per finding with severity, kind and cause number.
    let data = data(&site);
    let rows = data["rows"].as_array().unwrap();
    assert_eq!(rows.len(), 14);
    let errors_with_cause = rows.iter().filter(|r| r[0] == "error" && r[2] == 1).count();
    assert_eq!(errors_with_cause, 5);
    assert_eq!(data["causes"][0], "5 contradictions share pyr_c");
    // Compartments and groups of PEPS's infeasible direction (cytosol,
    // group gluconeogenesis in model.yaml).
    let peps = rows
        .iter()
        .find(|r| r[1] == "infeasible-direction")
        .unwrap();
    assert_eq!(peps[3], serde_json::json!(["c"]));
    assert_eq!(peps[4], serde_json::json!(["gluconeogenesis"]));
    assert_eq!(peps[8], "list-1.html#finding-1");
}

/// 600 findings (the demo's repeated, invented for this test) make three
/// list pages of 250, 250 and 100 rows, each linking to its neighbours.
#[test]
fn long_lists_are_paginated() {
    let mut report = demo();
    let one = report.findings.clone();
    report.findings = (0..600).map(|k| one[k % one.len()].clone()).collect();
    let tmp = tempfile::tempdir().unwrap();
    let site = tmp.path().join("site");
    render(&report, None, &site).unwrap();
    let rows = |n: usize| {
        fs::read_to_string(site.join(format!("findings/list-{n}.html")))
            .unwrap()
            .matches("<tr class=\"row-")
            .count()
    };
    assert_eq!((rows(1), rows(2), rows(3)), (250, 250, 100));
    assert!(!site.join("findings/list-4.html").exists());
    let middle = fs::read_to_string(site.join("findings/list-2.html")).unwrap();
    assert!(middle.contains("<a href=\"list-1.html\" rel=\"prev\">"));
    assert!(middle.contains("<a href=\"list-3.html\" rel=\"next\">"));
    assert!(middle.contains("id=\"finding-251\""));
    // The grouped page shows at most 20 examples per group.
    let page = fs::read_to_string(site.join("findings.html")).unwrap();
    assert!(
        page.contains("20 of "),
        "a group with more than 20 findings says so"
    );
}
