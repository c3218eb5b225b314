//! SARIF 2.1.0 (OASIS Static Analysis Results Interchange Format) view of a
//! report, for code-scanning dashboards. Findings have no line in a source
//! file of their own, so each result carries logical locations (the ids of
//! its subjects) and, when known, the model file as artifact.

use super::{Finding, Report, Severity};
use serde_json::{json, Value};
use std::collections::BTreeMap;

/// SARIF JSON text for `report`; `model_file` is the model's path as the CI
/// job sees it (relative to the repository root), when there is one.
pub fn to_sarif(report: &Report, model_file: Option<&str>) -> String {
    let mut rules: BTreeMap<&str, &Finding> = BTreeMap::new();
    for f in &report.findings {
        rules.entry(f.kind.as_str()).or_insert(f);
    }
    let rules: Vec<Value> = rules
        .keys()
        .map(|kind| {
            json!({
                "id": kind,
                "name": kind,
                "shortDescription": {"text": describe(kind, report)},
            })
        })
        .collect();
    let results: Vec<Value> = report
        .findings
        .iter()
        .map(|f| {
            let mut location = json!({
                "logicalLocations": f.subjects.iter().map(|s| json!({
                    "name": s,
                    "kind": subject_kind(report, s),
                })).collect::<Vec<_>>(),
            });
            if let Some(file) = model_file {
                location["physicalLocation"] = json!({"artifactLocation": {"uri": file}});
            }
            let mut text = f.message.clone();
            if let Some(s) = &f.scenario {
                text = format!(
                    "{} (scenario {s}): {text}",
                    f.subjects.first().map(String::as_str).unwrap_or("-")
                );
            } else if let Some(first) = f.subjects.first() {
                text = format!("{first}: {text}");
            }
            json!({
                "ruleId": f.kind,
                "level": level(f.severity),
                "message": {"text": text},
                "locations": [location],
                "partialFingerprints": {"gibbsiteFinding/v1": fingerprint(f)},
                "properties": {"evidence": f.evidence, "scenario": f.scenario},
            })
        })
        .collect();
    let sarif = json!({
        "$schema": "https://json.schemastore.org/sarif-2.1.0.json",
        "version": "2.1.0",
        "runs": [{
            "tool": {"driver": {
                "name": report.tool.name,
                "version": report.tool.version,
                "rules": rules,
            }},
            "results": results,
            // The joint verdict of every scenario, found or not.
            "properties": {"scenarioVerdicts": report.joint_scenarios.iter().map(|s| json!({
                "scenario": s.id,
                "verdict": s.verdict,
                "maxMinDrivingForceKj": s.mdf.as_ref().map(|m| m.value_kj),
                "conflictingSets": s.conflicts.len(),
                "internalCycles": s.loop_law.as_ref().map(|l| l.cycles.len()),
            })).collect::<Vec<_>>()},
        }],
    });
    let mut text = serde_json::to_string_pretty(&sarif).expect("SARIF values are plain JSON");
    text.push('\n');
    text
}

fn level(severity: Severity) -> &'static str {
    match severity {
        Severity::Error => "error",
        Severity::Warning => "warning",
        Severity::Note => "note",
    }
}

/// The check description that reports `kind`, else the kind itself.
fn describe(kind: &str, report: &Report) -> String {
    report
        .summary
        .checks
        .iter()
        .find(|c| c.kinds.iter().any(|k| k == kind))
        .map(|c| format!("{}: {}", c.title, c.description))
        .unwrap_or_else(|| kind.to_string())
}

fn subject_kind(report: &Report, id: &str) -> &'static str {
    if report.reactions.iter().any(|r| r.id == id) {
        "function"
    } else if report.metabolites.iter().any(|m| m.id == id) {
        "variable"
    } else {
        "object"
    }
}

/// Stable identity of a finding across runs (kind, subjects, scenario), so a
/// dashboard can tell new results from old ones.
pub fn fingerprint(f: &Finding) -> String {
    let key = format!(
        "{}|{}|{}",
        f.kind,
        f.subjects.join(","),
        f.scenario.as_deref().unwrap_or("")
    );
    // FNV-1a 64: tiny, stable across platforms and releases.
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for b in key.bytes() {
        hash ^= u64::from(b);
        hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
    }
    format!("{hash:016x}")
}
