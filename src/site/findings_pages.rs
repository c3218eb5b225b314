//! The findings pages: `findings.html` groups findings by severity, kind
//! and root cause in collapsed sections with counts and a few example rows;
//! the full list is paginated (`findings/list-N.html`); `findings/data.js`
//! carries one compact row per finding for the filters (severity, kind,
//! cause, group, compartment) run by the theme's `findings.js`. Every page
//! reads without JavaScript.

use crate::report::{Report, Severity};
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// Rows per page of the full list, at most.
pub const PER_PAGE: usize = 250;
/// Bytes of rows a page of the full list holds, about: a finding about a
/// long loop names every member, so such pages hold fewer rows.
pub const PAGE_BUDGET: usize = 350_000;
/// Example rows shown in each collapsed group of `findings.html`.
pub const SHOWN: usize = 20;
/// Root causes shown under "what to fix first" on the overview.
pub const FIX_FIRST: usize = 5;
/// Path of the filter data, from the site root.
pub const DATA_JS: &str = "findings/data.js";

/// How the full list is split into pages: the finding range of each page.
pub struct Split(Vec<(usize, usize)>);

/// The pages of the full list: at most [`PER_PAGE`] rows and about
/// [`PAGE_BUDGET`] bytes each (estimated from message, subjects and
/// evidence), at least one page so the link always lands.
pub fn split(report: &Report) -> Split {
    let sizes = report.findings.iter().map(|f| {
        let subjects: usize = f.subjects.iter().map(|s| 2 * s.len() + 40).sum();
        400 + f.message.len() + subjects + 120 * f.evidence.len()
    });
    Split(super::lists::split_by_size(sizes, PER_PAGE, PAGE_BUDGET, 0))
}

impl Split {
    /// Number of list pages.
    pub fn pages(&self) -> usize {
        self.0.len()
    }

    /// File name of the page (in `findings/`) holding finding `index`.
    pub fn page_name(&self, index: usize) -> String {
        let page = self.0.partition_point(|&(_, end)| end <= index);
        format!("list-{}.html", page.min(self.0.len() - 1) + 1)
    }
}

#[derive(Serialize)]
pub struct Grouped {
    pub severities: Vec<SeverityGroup>,
    /// Root causes in rank order (index = cause number − 1).
    pub causes: Vec<CauseSummary>,
    pub list_pages: usize,
    pub per_page: usize,
}

#[derive(Serialize)]
pub struct SeverityGroup {
    pub slug: &'static str,
    pub heading: &'static str,
    pub count: usize,
    pub kinds: Vec<KindGroup>,
}

#[derive(Serialize)]
pub struct KindGroup {
    pub kind: String,
    pub count: usize,
    /// List page (in `findings/`) of its first finding (the list is sorted by severity and
    /// kind, so the kind's findings start there).
    pub list: String,
    /// Index of that first finding.
    pub first: usize,
    /// Findings of this kind per root cause, then those with none.
    pub parts: Vec<Part>,
}

#[derive(Serialize)]
pub struct Part {
    /// Index into `Grouped::causes`, or none for "no shared cause".
    pub cause: Option<usize>,
    pub count: usize,
    /// Indices into `site.findings` of the rows shown.
    pub shown: Vec<usize>,
}

#[derive(Serialize)]
pub struct CauseSummary {
    pub anchor: String,
    pub kind: String,
    pub title: String,
    pub sentence: String,
    pub count: usize,
    /// `count` with thousands separated, as printed.
    pub count_text: String,
    pub metabolites: Vec<String>,
}

/// The cause each finding is grouped under: the highest-ranked cause that
/// explains it.
pub fn cause_of(report: &Report) -> Vec<Option<usize>> {
    let mut out = vec![None; report.findings.len()];
    for (c, cause) in report.root_causes.iter().enumerate() {
        for &k in &cause.findings {
            if let Some(slot) = out.get_mut(k) {
                slot.get_or_insert(c);
            }
        }
    }
    out
}

pub fn causes(report: &Report) -> Vec<CauseSummary> {
    report
        .root_causes
        .iter()
        .enumerate()
        .map(|(k, c)| CauseSummary {
            anchor: format!("cause-{}", k + 1),
            kind: c.kind.clone(),
            title: c.title.clone(),
            sentence: c.sentence.clone(),
            count: c.findings.len(),
            count_text: crate::report::root_causes::thousands(c.findings.len()),
            metabolites: c.metabolites.clone(),
        })
        .collect()
}

/// Finding indices per root cause (`None`: no shared cause).
type ByCause = BTreeMap<Option<usize>, Vec<usize>>;

pub fn grouped(report: &Report) -> Grouped {
    let cause = cause_of(report);
    let pages = split(report);
    let mut severities = Vec::new();
    for (severity, heading) in [
        (Severity::Error, "Errors"),
        (Severity::Warning, "Warnings"),
        (Severity::Note, "Notes"),
    ] {
        // kind → (first index, cause → indices)
        let mut kinds: BTreeMap<&str, (usize, ByCause)> = BTreeMap::new();
        let mut count = 0;
        for (k, f) in report.findings.iter().enumerate() {
            if f.severity != severity {
                continue;
            }
            count += 1;
            let entry = kinds.entry(f.kind.as_str()).or_insert((k, BTreeMap::new()));
            entry.1.entry(cause[k]).or_default().push(k);
        }
        let mut groups: Vec<KindGroup> = kinds
            .into_iter()
            .map(|(kind, (first, by_cause))| {
                // Causes first (rank order), then the rest: `None` sorts
                // first in a BTreeMap, so move it last.
                let mut parts: Vec<Part> = by_cause
                    .into_iter()
                    .map(|(cause, indices)| Part {
                        cause,
                        count: indices.len(),
                        shown: indices.into_iter().take(SHOWN).collect(),
                    })
                    .collect();
                parts.sort_by_key(|p| p.cause.map_or(usize::MAX, |c| c));
                KindGroup {
                    kind: kind.to_string(),
                    count: parts.iter().map(|p| p.count).sum(),
                    list: pages.page_name(first),
                    first,
                    parts,
                }
            })
            .collect();
        // Most findings first; ties by kind.
        groups.sort_by(|a, b| b.count.cmp(&a.count).then_with(|| a.kind.cmp(&b.kind)));
        severities.push(SeverityGroup {
            slug: severity.slug(),
            heading,
            count,
            kinds: groups,
        });
    }
    Grouped {
        severities,
        causes: causes(report),
        list_pages: pages.pages(),
        per_page: PER_PAGE,
    }
}

/// `findings/data.js`: one array per finding, [severity, kind, cause
/// number (0 = none), compartment ids, group labels, subjects, scenario,
/// message, list page + anchor from the findings folder]; plus the cause
/// titles. Strings are JSON-escaped; the script inserts them as text.
pub fn data_js(report: &Report) -> String {
    let cause = cause_of(report);
    let pages = split(report);
    let compartments: BTreeMap<&str, &str> = report
        .metabolites
        .iter()
        .map(|m| (m.id.as_str(), m.compartment.as_str()))
        .collect();
    let reactions: BTreeMap<&str, &crate::report::ReactionView> = report
        .reactions
        .iter()
        .map(|r| (r.id.as_str(), r))
        .collect();
    let rows: Vec<serde_json::Value> = report
        .findings
        .iter()
        .enumerate()
        .map(|(k, f)| {
            let mut places = BTreeSet::new();
            let mut groups = BTreeSet::new();
            for s in &f.subjects {
                if let Some(r) = reactions.get(s.as_str()) {
                    if let Some(g) = &r.group {
                        groups.insert(g.as_str());
                    }
                    for p in &r.participants {
                        if let Some(c) = compartments.get(p.metabolite.as_str()) {
                            places.insert(*c);
                        }
                    }
                } else if let Some(c) = compartments.get(s.as_str()) {
                    places.insert(*c);
                }
            }
            let page = pages.page_name(k);
            serde_json::json!([
                f.severity.slug(),
                f.kind,
                cause[k].map_or(0, |c| c + 1),
                places,
                groups,
                f.subjects.join(", "),
                f.scenario.as_deref().unwrap_or(""),
                f.message,
                format!("{page}#finding-{}", k + 1),
            ])
        })
        .collect();
    let causes: Vec<&str> = report
        .root_causes
        .iter()
        .map(|c| c.title.as_str())
        .collect();
    let data = serde_json::json!({ "causes": causes, "rows": rows });
    let text = serde_json::to_string(&data).unwrap_or_else(|_| "{}".into());
    format!("// Findings for the filters of findings.html (written by gibbsite).\nwindow.gibbsiteFindings = {text};\n")
}

/// A kind of finding with its count, for the overview.
#[derive(Serialize)]
pub struct KindCount {
    pub severity: &'static str,
    pub kind: String,
    pub count: usize,
    /// Fragment id of its group on findings.html.
    pub anchor: String,
}

/// Every (severity, kind) with its count: most serious first, then most
/// findings.
pub fn kind_counts(report: &Report) -> Vec<KindCount> {
    let mut counts: BTreeMap<(Severity, &str), usize> = BTreeMap::new();
    for f in &report.findings {
        *counts.entry((f.severity, f.kind.as_str())).or_default() += 1;
    }
    let mut out: Vec<KindCount> = counts
        .into_iter()
        .map(|((severity, kind), count)| KindCount {
            severity: severity.slug(),
            kind: kind.to_string(),
            count,
            anchor: format!("kind-{}-{}", severity.slug(), crate::slug::slug(kind)),
        })
        .collect();
    out.sort_by(|a, b| {
        (
            severity_rank(a.severity),
            std::cmp::Reverse(a.count),
            &a.kind,
        )
            .cmp(&(
                severity_rank(b.severity),
                std::cmp::Reverse(b.count),
                &b.kind,
            ))
    });
    out
}

fn severity_rank(slug: &str) -> usize {
    ["error", "warning", "note"]
        .iter()
        .position(|s| *s == slug)
        .unwrap_or(3)
}

/// Context of one list page: its number and the finding range it holds.
#[derive(Serialize)]
pub struct ListPage {
    pub number: usize,
    pub pages: usize,
    pub start: usize,
    pub end: usize,
    pub total: usize,
}

pub fn list(report: &Report) -> Vec<ListPage> {
    let total = report.findings.len();
    let Split(ranges) = split(report);
    let pages = ranges.len();
    ranges
        .into_iter()
        .enumerate()
        .map(|(p, (start, end))| ListPage {
            number: p + 1,
            pages,
            start,
            end,
            total,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn list_pages_hold_per_page_rows() {
        // 0 findings: still one (empty) page; 250 fit one page, 251 need two.
        let split = Split(super::super::lists::split_by_size(
            [100; 0],
            PER_PAGE,
            PAGE_BUDGET,
            0,
        ));
        assert_eq!(
            (split.pages(), split.page_name(0)),
            (1, "list-1.html".into())
        );
        let split = Split(super::super::lists::split_by_size(
            [100; 251],
            PER_PAGE,
            PAGE_BUDGET,
            0,
        ));
        assert_eq!(split.pages(), 2);
        assert_eq!(split.page_name(0), "list-1.html");
        assert_eq!(split.page_name(PER_PAGE - 1), "list-1.html");
        assert_eq!(split.page_name(PER_PAGE), "list-2.html");
        // Long rows: fewer a page.
        let split = Split(super::super::lists::split_by_size(
            [5_000; 251],
            PER_PAGE,
            PAGE_BUDGET,
            0,
        ));
        assert_eq!(split.pages(), 4);
        assert_eq!(split.page_name(70), "list-2.html");
    }
}
