//! SARIF 2.1.0 (OASIS Static Analysis Results Interchange Format) view of a
//! report, for code-scanning dashboards.
//!
//! One rule per finding kind (our summary and help text, a help URI into
//! the published report when `--report-url` is given). Each result points
//! at the model file where its first locatable subject is written, with
//! `region.startLine` (YAML: the item's `id` line; SBML: the element's start
//! tag), the path relative to the SARIF root (`--sarif-root`, default the
//! current folder), and names its subjects as logical locations. The run's
//! properties carry the coverage figure and the joint scenario verdicts.

use super::{kinds, Finding, Report, Severity};
use crate::outcome;
use crate::project::locations::Located;
use serde_json::{json, Value};
use std::collections::{BTreeMap, HashMap};
use std::path::{Component, Path, PathBuf};

/// Where SARIF paths and links point.
#[derive(Debug, Clone, Default)]
pub struct SarifOptions {
    /// Folder artifact URIs are relative to (the repository root in CI).
    pub root: PathBuf,
    /// Absolute URL where the report site is published; rules link into it.
    pub report_url: Option<String>,
    /// The model files, for findings whose subjects have no line.
    pub model_files: Vec<PathBuf>,
    /// Where each model element is written.
    pub lines: Located,
}

/// SARIF JSON text for `report`.
pub fn to_sarif(report: &Report, options: &SarifOptions) -> String {
    let mut kinds_used: Vec<&str> = report.findings.iter().map(|f| f.kind.as_str()).collect();
    kinds_used.sort_unstable();
    kinds_used.dedup();
    let rule_index: BTreeMap<&str, usize> = kinds_used
        .iter()
        .enumerate()
        .map(|(i, k)| (*k, i))
        .collect();
    let rules: Vec<Value> = kinds_used
        .iter()
        .map(|kind| rule(report, kind, options))
        .collect();
    let subject_kinds = subject_kinds(report);
    let results: Vec<Value> = report
        .findings
        .iter()
        .map(|f| result(&subject_kinds, f, rule_index[f.kind.as_str()], options))
        .collect();
    let coverage = outcome::coverage(report).map(|c| {
        json!({
            "internalReactions": c.internal,
            "judgedReactions": c.judged,
            "percent": (c.percent() * 10.0).round() / 10.0,
        })
    });
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
            "properties": {
                "modelId": report.project.model_id,
                "coverage": coverage,
                // The joint verdict of every scenario, found or not.
                "scenarioVerdicts": report.joint_scenarios.iter().map(|s| json!({
                    "scenario": s.id,
                    "verdict": s.verdict,
                    "maxMinDrivingForceKj": s.mdf.as_ref().map(|m| m.value_kj),
                    "conflictingSets": s.conflicts.len(),
                    "internalCycles": s.loop_law.as_ref().map(|l| l.cycles.len()),
                })).collect::<Vec<_>>(),
            },
        }],
    });
    let mut text = serde_json::to_string_pretty(&sarif).expect("SARIF values are plain JSON");
    text.push('\n');
    text
}

/// The rule of one finding kind.
fn rule(report: &Report, kind: &str, options: &SarifOptions) -> Value {
    let help = kinds::help(kind);
    let check = kinds::check_of(report, kind);
    let summary = help
        .map(|h| h.summary.to_string())
        .or_else(|| check.map(|(title, _)| format!("{title}.")))
        .unwrap_or_else(|| kind.to_string());
    let mut help_text = help.map(|h| h.help.to_string()).unwrap_or_default();
    if let Some((title, description)) = check {
        if !help_text.is_empty() {
            help_text.push(' ');
        }
        help_text.push_str(&format!("Check \u{201c}{title}\u{201d}: {description}"));
    }
    let mut rule = json!({
        "id": kind,
        "name": rule_name(kind),
        "shortDescription": {"text": summary},
        "fullDescription": {"text": help_text},
        "help": {"text": help_text},
        "defaultConfiguration": {"enabled": true},
    });
    if let Some(url) = help_uri(kind, options) {
        rule["helpUri"] = json!(url);
    }
    rule
}

/// `internal-loop` → `InternalLoop` (SARIF suggests a readable rule name).
fn rule_name(kind: &str) -> String {
    kind.split('-')
        .map(|w| {
            let mut c = w.chars();
            c.next()
                .map(|f| f.to_uppercase().chain(c).collect::<String>())
                .unwrap_or_default()
        })
        .collect()
}

/// Checks `--report-url`: SARIF help links must be absolute URIs
/// (`scheme://…`, RFC 3986), without spaces.
pub fn parse_report_url(text: &str) -> Result<String, String> {
    let absolute = text.split_once("://").is_some_and(|(scheme, rest)| {
        !rest.is_empty()
            && scheme.starts_with(|c: char| c.is_ascii_alphabetic())
            && scheme
                .chars()
                .all(|c| c.is_ascii_alphanumeric() || "+-.".contains(c))
    });
    if absolute && !text.chars().any(char::is_whitespace) {
        Ok(text.to_string())
    } else {
        Err("expected an absolute URL such as https://example.org/report/ (SARIF needs absolute help links)".to_string())
    }
}

/// `<report-url>/kinds.html#kind-<kind>` (the site's page on finding kinds)
/// when the report's address is known.
pub fn help_uri(kind: &str, options: &SarifOptions) -> Option<String> {
    let base = options.report_url.as_deref()?.trim_end_matches('/');
    Some(format!("{base}/kinds.html#kind-{kind}"))
}

fn result(
    subject_kinds: &HashMap<&str, &'static str>,
    f: &Finding,
    rule_index: usize,
    options: &SarifOptions,
) -> Value {
    let mut location = json!({
        "logicalLocations": f.subjects.iter().map(|s| json!({
            "name": s,
            "kind": subject_kinds.get(s.as_str()).copied().unwrap_or("object"),
        })).collect::<Vec<_>>(),
    });
    // The first subject written somewhere (a loop's id is not; its member
    // reactions are), else the model file alone.
    let located = f.subjects.iter().find_map(|s| options.lines.get(s));
    let physical = match located {
        Some((file, line)) => Some(json!({
            "artifactLocation": {"uri": relative_uri(file, &options.root)},
            "region": {"startLine": line},
        })),
        None => options
            .model_files
            .first()
            .map(|file| json!({"artifactLocation": {"uri": relative_uri(file, &options.root)}})),
    };
    if let Some(p) = physical {
        location["physicalLocation"] = p;
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
        "ruleIndex": rule_index,
        "level": level(f.severity),
        "message": {"text": text},
        "locations": [location],
        "partialFingerprints": {"gibbsiteFinding/v1": fingerprint(f)},
        "properties": {"evidence": f.evidence, "scenario": f.scenario},
    })
}

/// `file` relative to `root` as a URI reference with `/` separators
/// (`..` where the file is outside the root), percent-encoding what a URI
/// path may not hold. Both are made absolute against the current folder
/// first (symlinks resolved when they exist).
pub fn relative_uri(file: &Path, root: &Path) -> String {
    let absolute = |p: &Path| {
        p.canonicalize().unwrap_or_else(|_| {
            std::env::current_dir()
                .map(|d| d.join(p))
                .unwrap_or_else(|_| p.to_path_buf())
        })
    };
    let file = absolute(file);
    let root = absolute(root);
    let f: Vec<Component> = file.components().collect();
    let r: Vec<Component> = root.components().collect();
    let common = f.iter().zip(&r).take_while(|(a, b)| a == b).count();
    let mut parts: Vec<String> = vec!["..".to_string(); r.len() - common];
    parts.extend(
        f[common..]
            .iter()
            .map(|c| encode(&c.as_os_str().to_string_lossy())),
    );
    parts.join("/")
}

/// Percent-encoding of one path segment (RFC 3986: unreserved characters
/// and sub-delimiters stay, everything else as UTF-8 bytes).
fn encode(segment: &str) -> String {
    let mut out = String::new();
    for b in segment.bytes() {
        if b.is_ascii_alphanumeric() || b"-._~!$&'()*+,;=@".contains(&b) {
            out.push(b as char);
        } else {
            out.push_str(&format!("%{b:02X}"));
        }
    }
    out
}

fn level(severity: Severity) -> &'static str {
    match severity {
        Severity::Error => "error",
        Severity::Warning => "warning",
        Severity::Note => "note",
    }
}

/// Logical-location kind of each reaction ("function") and metabolite
/// ("variable"); anything else is an "object".
fn subject_kinds(report: &Report) -> HashMap<&str, &'static str> {
    let mut kinds: HashMap<&str, &'static str> = HashMap::new();
    for m in &report.metabolites {
        kinds.insert(m.id.as_str(), "variable");
    }
    for r in &report.reactions {
        kinds.insert(r.id.as_str(), "function");
    }
    kinds
}

/// Stable identity of a finding across runs (kind, the set of its subjects,
/// scenario), so a dashboard can tell new results from old ones. The
/// subjects are sorted first: their order follows the model file (a loop's
/// members, a cycle's reactions), which must not make a finding "new".
pub fn fingerprint(f: &Finding) -> String {
    let mut subjects: Vec<&str> = f.subjects.iter().map(String::as_str).collect();
    subjects.sort_unstable();
    let key = format!(
        "{}|{}|{}",
        f.kind,
        subjects.join(","),
        f.scenario.as_deref().unwrap_or("")
    );
    // FNV-1a 64: tiny, stable across platforms and releases.
    format!("{:016x}", crate::loops::ids::fnv1a64(key.as_bytes()))
}
