//! How a reaction's direction verdicts are shown: one place decides the
//! badge (style, icon, words) of every direction, so the reactions index,
//! the reaction page and its one-line verdict agree.
//!
//! The badge follows the severity of the finding behind it, not the raw
//! verdict: a reversible reaction that cannot run one way carries a note
//! (`one-way-reversible`), so its badge is a note, never the red
//! "contradiction" of an error; a verdict softened to a note (compartment
//! conditions not set) is shown as a note too. A verdict with no finding
//! behind it keeps its words in a neutral style. Boundary reactions
//! (exchange, demand, sink) and biomass are not judged: their badge says
//! so instead of pretending the bounds forbid them.

use crate::report::{Finding, ReactionView, Report, Severity, Verdict};
use serde::Serialize;
use std::collections::BTreeMap;

/// What a badge shows; `style` is a CSS class of the theme.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Badge {
    /// `v-contradiction` (error), `v-marginal` (warning), `v-note`,
    /// `v-consistent`, `v-no-data`, `v-plain` (a verdict without a
    /// finding), `v-not-judged`, `v-blocked`.
    pub style: &'static str,
    pub icon: &'static str,
    pub words: String,
    /// Severity of the finding behind the badge, when there is one.
    pub severity: Option<&'static str>,
}

/// Badges of one reaction: both directions, each scenario, and the
/// sentence shown under the page title.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ReactionVerdicts {
    pub forward: Badge,
    pub backward: Badge,
    /// Scenario id → badge of the reaction's flux there.
    pub scenarios: BTreeMap<String, Badge>,
    pub line: Line,
}

/// The one-line verdict under a page title.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Line {
    /// Same vocabulary as [`Badge::style`].
    pub style: &'static str,
    pub icon: &'static str,
    /// Short lead word(s) in bold, e.g. "Error", "Not judged".
    pub lead: String,
    /// The rest of the sentence.
    pub text: String,
}

fn rank(s: Severity) -> u8 {
    match s {
        Severity::Error => 3,
        Severity::Warning => 2,
        Severity::Note => 1,
    }
}

/// The most severe of `severities`.
fn worst(severities: impl Iterator<Item = Severity>) -> Option<Severity> {
    severities.max_by_key(|s| rank(*s))
}

fn severity_style(s: Severity) -> (&'static str, &'static str) {
    match s {
        Severity::Error => ("v-contradiction", "✖"),
        Severity::Warning => ("v-marginal", "▲"),
        Severity::Note => ("v-note", "●"),
    }
}

/// Words of a verdict that needs a finding, given the finding's severity.
fn problem_words(v: Verdict, severity: Option<Severity>) -> &'static str {
    match (v, severity) {
        (Verdict::Contradiction, Some(Severity::Error)) => "contradiction",
        // A reversible reaction that can only run the other way, or a
        // verdict resting on unset conditions: worth a look, not an error.
        (Verdict::Contradiction, _) => "cannot run this way",
        (Verdict::Marginal, _) => "marginal",
        (Verdict::AtEquilibrium, _) => "at equilibrium",
        (Verdict::Consistent, _) => "consistent",
        (Verdict::NoData, _) => "no data",
    }
}

/// The badge of one direction judged `verdict`, with the severity of the
/// findings about it (None: no finding).
pub fn badge(verdict: Verdict, severity: Option<Severity>) -> Badge {
    match verdict {
        Verdict::Consistent => Badge {
            style: "v-consistent",
            icon: "✔",
            words: "consistent".into(),
            severity: None,
        },
        Verdict::NoData => Badge {
            style: "v-no-data",
            icon: "○",
            words: "no data".into(),
            severity: None,
        },
        v => {
            let (style, icon) = match severity {
                Some(s) => severity_style(s),
                None => (
                    "v-plain",
                    if v == Verdict::AtEquilibrium {
                        "≈"
                    } else {
                        "◇"
                    },
                ),
            };
            let icon = if v == Verdict::AtEquilibrium && severity.is_some() {
                "≈"
            } else {
                icon
            };
            Badge {
                style,
                icon,
                words: problem_words(v, severity).into(),
                severity: severity.map(Severity::slug),
            }
        }
    }
}

/// Exchange, demand and sink reactions cross the model's boundary.
fn is_boundary(role: &str) -> bool {
    matches!(role, "exchange" | "demand" | "sink")
}

/// The badge of a direction without a verdict.
fn unjudged(r: &ReactionView, allowed: bool) -> Badge {
    if !allowed {
        return Badge {
            style: "v-blocked",
            icon: "–",
            words: "not allowed by bounds".into(),
            severity: None,
        };
    }
    let why = if is_boundary(&r.role) {
        "boundary"
    } else {
        r.role.as_str()
    };
    Badge {
        style: "v-not-judged",
        icon: "○",
        words: format!("not judged ({why})"),
        severity: None,
    }
}

fn allows_forward(r: &ReactionView) -> bool {
    r.upper_bound > 0.0
}

fn allows_backward(r: &ReactionView) -> bool {
    r.lower_bound < 0.0
}

/// The finding kinds of the check `slug`, as the report lists them.
fn kinds_of<'a>(report: &'a Report, slug: &str) -> Vec<&'a str> {
    report
        .summary
        .checks
        .iter()
        .filter(|c| c.slug == slug)
        .flat_map(|c| c.kinds.iter().map(String::as_str))
        .collect()
}

/// Badges and the one-line verdict of every reaction, by id.
pub fn reaction_verdicts(report: &Report) -> BTreeMap<&str, ReactionVerdicts> {
    // The check that judges each reaction's declared directions, and the
    // one that judges scenarios as a whole (its findings are not about one
    // reaction's direction).
    let kinds = Kinds {
        own: kinds_of(report, "bounds"),
        joint: kinds_of(report, "scenario-joint"),
    };
    let mut about: BTreeMap<&str, Vec<&Finding>> = BTreeMap::new();
    for f in &report.findings {
        let mut seen = Vec::new();
        for s in &f.subjects {
            if !seen.contains(&s) {
                seen.push(s);
                about.entry(s.as_str()).or_default().push(f);
            }
        }
    }
    report
        .reactions
        .iter()
        .map(|r| {
            let findings = about.get(r.id.as_str()).map_or(&[][..], |v| v.as_slice());
            (r.id.as_str(), verdicts_of(r, findings, &kinds))
        })
        .collect()
}

/// Is `f` a verdict about this reaction's direction (its first subject)?
fn direction_finding(f: &Finding, r: &ReactionView, kinds: &[&str]) -> bool {
    f.subjects.first() == Some(&r.id) && kinds.contains(&f.kind.as_str())
}

struct Kinds<'a> {
    own: Vec<&'a str>,
    joint: Vec<&'a str>,
}

fn verdicts_of(r: &ReactionView, findings: &[&Finding], kinds: &Kinds<'_>) -> ReactionVerdicts {
    let own = worst(
        findings
            .iter()
            .filter(|f| f.scenario.is_none() && direction_finding(f, r, &kinds.own))
            .map(|f| f.severity),
    );
    let direction = |v: Option<Verdict>, allowed: bool| match v {
        Some(v) => badge(v, own),
        None => unjudged(r, allowed),
    };
    let forward = direction(r.forward_verdict, allows_forward(r));
    let backward = direction(r.backward_verdict, allows_backward(r));
    let scenarios = r
        .scenario_verdicts
        .iter()
        .map(|sv| {
            let severity = worst(
                findings
                    .iter()
                    .filter(|f| {
                        // Whatever a scenario says about this reaction's
                        // own flux; verdicts on the scenario as a whole
                        // (conflicting sets, cycles) are not about its
                        // direction alone.
                        f.scenario.as_deref() == Some(sv.scenario.as_str())
                            && f.subjects.first() == Some(&r.id)
                            && !kinds.joint.contains(&f.kind.as_str())
                    })
                    .map(|f| f.severity),
            );
            let b = if is_boundary(&r.role) || r.role == "biomass" {
                unjudged(r, true)
            } else {
                badge(sv.verdict, severity)
            };
            (sv.scenario.clone(), b)
        })
        .collect();
    let line = reaction_line(r, findings, &forward, &backward);
    ReactionVerdicts {
        forward,
        backward,
        scenarios,
        line,
    }
}

/// "3 findings below (2 warnings, 1 note): scenario-marginal ×2, one-way-reversible".
fn count_words(findings: &[&Finding]) -> String {
    let n = findings.len();
    let mut parts = Vec::new();
    for s in [Severity::Error, Severity::Warning, Severity::Note] {
        let k = findings.iter().filter(|f| f.severity == s).count();
        if k > 0 {
            parts.push(format!("{k} {}{}", s.slug(), if k == 1 { "" } else { "s" }));
        }
    }
    let mut kinds: BTreeMap<&str, usize> = BTreeMap::new();
    for f in findings {
        *kinds.entry(f.kind.as_str()).or_default() += 1;
    }
    let kinds: Vec<String> = kinds
        .into_iter()
        .map(|(k, c)| {
            if c > 1 {
                format!("{k} ×{c}")
            } else {
                k.to_string()
            }
        })
        .collect();
    format!(
        "{n} finding{} below ({}): {}",
        if n == 1 { "" } else { "s" },
        parts.join(", "),
        kinds.join(", ")
    )
}

fn lead_of(s: Severity) -> &'static str {
    match s {
        Severity::Error => "Error",
        Severity::Warning => "Warning",
        Severity::Note => "Note",
    }
}

fn reaction_line(r: &ReactionView, findings: &[&Finding], fw: &Badge, bw: &Badge) -> Line {
    let directions = format!("forward {}; backward {}", fw.words, bw.words);
    let judged = r.forward_verdict.is_some() || r.backward_verdict.is_some();
    let worst_finding = worst(findings.iter().map(|f| f.severity));
    if let Some(s) = worst_finding {
        let (style, icon) = severity_style(s);
        let what = if judged {
            format!("{directions}. ")
        } else {
            String::new()
        };
        return Line {
            style,
            icon,
            lead: lead_of(s).into(),
            text: format!("{what}{}.", count_words(findings)),
        };
    }
    if is_boundary(&r.role) || r.role == "biomass" {
        return Line {
            style: "v-not-judged",
            icon: "○",
            lead: "Not judged".into(),
            text: format!(
                "{} {} reaction crosses the model’s boundary, so no ΔrG′° applies to it. No findings.",
                if r.role.starts_with(['a', 'e', 'i', 'o', 'u']) { "an" } else { "a" },
                r.role
            ),
        };
    }
    if r.drg_prime.is_none() {
        return Line {
            style: "v-no-data",
            icon: "○",
            lead: "Not judged".into(),
            text: "no ΔrG′° is known (see “Missing data” below). No findings.".into(),
        };
    }
    let all_consistent = [r.forward_verdict, r.backward_verdict]
        .iter()
        .flatten()
        .all(|v| *v == Verdict::Consistent);
    let (style, icon) = if all_consistent {
        ("v-consistent", "✔")
    } else {
        ("v-plain", "◇")
    };
    Line {
        style,
        icon,
        lead: "No findings".into(),
        text: format!("{directions}."),
    }
}

/// The one-line verdict of a metabolite page, from the findings about it
/// and whether its ΔfG′° is known.
pub fn metabolite_line(
    findings: &[&Finding],
    has_energy: bool,
    reactions: usize,
    special: &str,
) -> Line {
    if let Some(s) = worst(findings.iter().map(|f| f.severity)) {
        let (style, icon) = severity_style(s);
        return Line {
            style,
            icon,
            lead: lead_of(s).into(),
            text: format!("{}.", count_words(findings)),
        };
    }
    if has_energy || !special.is_empty() {
        Line {
            style: "v-consistent",
            icon: "✔",
            lead: "No findings".into(),
            text: "its ΔfG′° is known and no check raised a problem about it.".into(),
        }
    } else {
        Line {
            style: "v-no-data",
            icon: "○",
            lead: "Not assessed".into(),
            text: format!(
                "no ΔfG′° is known, so the {reactions} reaction{} it takes part in cannot be judged through it. No findings.",
                if reactions == 1 { "" } else { "s" }
            ),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn badge_style_follows_the_severity_not_the_verdict() {
        let error = badge(Verdict::Contradiction, Some(Severity::Error));
        assert_eq!(
            (error.style, error.words.as_str()),
            ("v-contradiction", "contradiction")
        );
        // The `one-way-reversible` note: never red, never "contradiction".
        let note = badge(Verdict::Contradiction, Some(Severity::Note));
        assert_eq!(note.style, "v-note");
        assert_eq!(note.words, "cannot run this way");
        assert_eq!(note.severity, Some("note"));
        let plain = badge(Verdict::Contradiction, None);
        assert_eq!(plain.style, "v-plain");
        let warn = badge(Verdict::Marginal, Some(Severity::Warning));
        assert_eq!((warn.style, warn.icon), ("v-marginal", "▲"));
        assert_eq!(badge(Verdict::Consistent, None).style, "v-consistent");
        assert_eq!(
            badge(Verdict::NoData, Some(Severity::Note)).style,
            "v-no-data"
        );
    }
}
