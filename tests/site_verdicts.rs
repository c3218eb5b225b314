//! How verdicts read on the rendered demo site (issue 12, point 5): badges
//! follow the severity of the finding behind them, boundary reactions are
//! "not judged", every reaction and metabolite page opens with a one-line
//! verdict, evidence carries labels and units, one prime and one minus
//! throughout, formulas with subscripts.
//!
//! The demo's numbers come from `projects/lakeside` (our own invented
//! scenario); which reaction gets which finding is checked against its
//! report.json, so the tests follow the analysis rather than fixed text.

use gibbsite::report::Report;
use std::fs;
use std::path::Path;

fn demo_site(out: &Path) -> Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let report = gibbsite::Project::load(&dir)
        .expect("the demo project loads")
        .analyse();
    gibbsite::site::render(&report, None, out).expect("the demo renders");
    report
}

fn page(out: &Path, path: &str) -> String {
    fs::read_to_string(out.join(path)).unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// The text of the HTML element starting at `from` up to its first
/// closing `</tag>`, tags removed.
fn text(html: &str) -> String {
    let mut out = String::new();
    let mut inside = false;
    for c in html.chars() {
        match c {
            '<' => inside = true,
            '>' => inside = false,
            c if !inside => out.push(c),
            _ => {}
        }
    }
    out.split_whitespace().collect::<Vec<_>>().join(" ")
}

/// The two verdict cells (forward, backward) of a reaction's row on the
/// reactions index: (class list, text).
fn index_badges(index: &str, slug: &str) -> Vec<(String, String)> {
    let row_start = index
        .find(&format!("<a href=\"{slug}.html\">"))
        .unwrap_or_else(|| panic!("{slug} not on the index"));
    let row = &index[row_start..row_start + index[row_start..].find("</tr>").unwrap()];
    row.match_indices("<span class=\"verdict ")
        .map(|(i, _)| {
            let rest = &row[i + "<span class=\"verdict ".len()..];
            let class = rest[..rest.find('"').unwrap()].to_string();
            let body = &rest[..rest.find("</span></").unwrap()];
            (class, text(&format!("<{body}")))
        })
        .collect()
}

#[test]
fn badges_follow_the_severity_of_the_finding_behind_them() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = demo_site(&out);
    let index = page(&out, "reactions/index.html");
    let findings_of = |id: &str| -> Vec<(&str, &str)> {
        report
            .findings
            .iter()
            .filter(|f| f.subjects.first().map(String::as_str) == Some(id) && f.scenario.is_none())
            .map(|f| (f.kind.as_str(), f.severity.slug()))
            .collect()
    };

    // HEX is declared reversible but cannot run backward: a note
    // (`one-way-reversible`), so its badge is a note, not a red
    // contradiction (the defect issue 12 reported).
    assert_eq!(findings_of("HEX"), vec![("one-way-reversible", "note")]);
    let hex = index_badges(&index, "HEX");
    assert_eq!(hex[1], ("v-note".into(), "● cannot run this way".into()));
    assert_eq!(hex[0].0, "v-consistent");

    // PEPS is irreversible and its only direction is impossible: an error,
    // shown as the red contradiction.
    assert!(findings_of("PEPS").contains(&("infeasible-direction", "error")));
    let peps = index_badges(&index, "PEPS");
    assert_eq!(
        peps[0],
        ("v-contradiction".into(), "✖ contradiction".into())
    );
    assert_eq!(peps[1].1, "– not allowed by bounds");

    // No red badge anywhere without an error about that reaction.
    for r in &report.reactions {
        let badges = index_badges(&index, &r.slug);
        assert_eq!(badges.len(), 2, "{}", r.id);
        let has_error = report
            .findings
            .iter()
            .any(|f| f.severity.slug() == "error" && f.subjects.first() == Some(&r.id));
        for (class, words) in &badges {
            if class == "v-contradiction" {
                assert!(has_error, "{}: red badge {words:?} without an error", r.id);
            }
        }
    }

    // Boundary reactions with bounds [−1000, 1000]: not judged, both ways;
    // a demand reaction [0, 1000] cannot run backward by its bounds.
    let ex = report
        .reactions
        .iter()
        .find(|r| r.id == "EX_glc_e")
        .unwrap();
    assert_eq!((ex.lower_bound, ex.upper_bound), (-1000.0, 1000.0));
    let badges = index_badges(&index, &ex.slug);
    assert_eq!(
        badges,
        vec![
            ("v-not-judged".into(), "○ not judged (boundary)".into()),
            ("v-not-judged".into(), "○ not judged (boundary)".into())
        ]
    );
    let dm = index_badges(&index, "DM_stor_c");
    assert_eq!(dm[0].1, "○ not judged (boundary)");
    assert_eq!(dm[1].1, "– not allowed by bounds");

    // The reaction page shows the same badges as the index.
    let hex_page = page(&out, "reactions/HEX.html");
    assert!(hex_page
        .contains("<div><dt>Backward</dt><dd><span class=\"verdict v-note\" title=\"note\">"));
}

#[test]
fn every_entity_page_opens_with_a_one_line_verdict() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = demo_site(&out);
    let pages = report
        .reactions
        .iter()
        .map(|r| format!("reactions/{}.html", r.slug))
        .chain(
            report
                .metabolites
                .iter()
                .map(|m| format!("metabolites/{}.html", m.slug)),
        );
    for path in pages {
        let html = page(&out, &path);
        let h1 = html
            .find("</h1>")
            .unwrap_or_else(|| panic!("{path}: no title"));
        let after = html[h1 + "</h1>".len()..].trim_start();
        assert!(
            after.starts_with("<p class=\"verdict-line "),
            "{path}: the title is not followed by the verdict line"
        );
        // Before any table (the terms table in particular).
        let line = h1 + html[h1..].find("verdict-line").unwrap();
        let first_table = html.find("<table").unwrap_or(html.len());
        assert!(line < first_table, "{path}");
    }
    let line = |path: &str| {
        let html = page(&out, path);
        let start = html.find("<p class=\"verdict-line").unwrap();
        text(&html[start..start + html[start..].find("</p>").unwrap()])
    };
    // PEPS: the error and the kinds behind it, counted as in report.json.
    let peps_findings = report
        .findings
        .iter()
        .filter(|f| f.subjects.iter().any(|s| s == "PEPS"))
        .count();
    let peps = line("reactions/PEPS.html");
    assert!(
        peps.starts_with("✖ Error: forward contradiction; backward not allowed by bounds."),
        "{peps}"
    );
    assert!(
        peps.contains(&format!("{peps_findings} findings below")),
        "{peps}"
    );
    assert!(peps.contains("infeasible-direction"), "{peps}");
    assert_eq!(
        line("reactions/EX_glc_e.html"),
        "○ Not judged: an exchange reaction crosses the model’s boundary, so no ΔrG′° applies to it. No findings."
    );
    assert_eq!(
        line("reactions/PGI.html"),
        "✔ No findings: forward consistent; backward consistent."
    );
    // A metabolite without ΔfG′° is not assessed; stor_c has a note.
    let stor = report
        .metabolites
        .iter()
        .find(|m| m.id == "stor_c")
        .unwrap();
    assert!(stor.dfg_prime.is_none());
    assert!(line(&format!("metabolites/{}.html", stor.slug))
        .starts_with("● Note: 1 finding below (1 note): no-energy-data"));
    let glc = report.metabolites.iter().find(|m| m.id == "glc_c").unwrap();
    assert!(glc.dfg_prime.is_some());
    assert_eq!(
        line(&format!("metabolites/{}.html", glc.slug)),
        "✔ No findings: its ΔfG′° is known and no check raised a problem about it."
    );
}

#[test]
fn evidence_is_labelled_with_units_and_rounded_as_the_message() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = demo_site(&out);
    // The full list carries every finding's evidence.
    let findings = page(&out, "findings/list-1.html");
    let peps = report
        .findings
        .iter()
        .find(|f| f.kind == "infeasible-direction")
        .unwrap();
    let dg_min = peps.evidence["dg_min"];
    // The message writes energies with two decimals (checks::kj).
    let shown = format!("{:.2}", dg_min.abs());
    assert!(
        peps.message.contains(&shown)
            || peps
                .message
                .contains(&format!("{:.2}", -peps.evidence["dg_max"]))
    );
    let expected = format!(
        "<div><dt title=\"dg_min\">ΔG′ min</dt><dd class=\"num\">{}{shown} kJ/mol</dd></div>",
        if dg_min < 0.0 { "−" } else { "" }
    );
    assert!(findings.contains(&expected), "missing {expected}");
    for label in [
        "<dt title=\"drg0\">ΔrG′°</dt>",
        "<dt title=\"sigma\">σ</dt>",
    ] {
        assert!(findings.contains(label), "missing {label}");
    }
    // No raw key is shown as a label.
    for raw in [">dg_min<", ">drg0<", ">dg_min_of_suggested<", ">sigma<"] {
        assert!(!findings.contains(raw), "raw key {raw} shown");
    }
    // report.json keeps the raw keys.
    let json = page(&out, "report.json");
    assert!(json.contains("\"dg_min\""));
}

/// The visible text of every page: outside tags, scripts and styles.
fn visible_text(html: &str) -> String {
    let mut s = html.to_string();
    for tag in ["script", "style", "code"] {
        while let Some(a) = s.find(&format!("<{tag}")) {
            let close = format!("</{tag}>");
            let b = s[a..].find(&close).map_or(s.len(), |b| a + b + close.len());
            s.replace_range(a..b, " ");
        }
    }
    text(&s)
}

#[test]
fn one_prime_and_one_minus_throughout_and_formulas_with_subscripts() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = demo_site(&out);
    let mut pages = Vec::new();
    for entry in walk(&out) {
        if entry.extension().is_some_and(|e| e == "html") {
            pages.push(entry);
        }
    }
    assert!(pages.len() > 60, "{}", pages.len());
    for path in &pages {
        let text = visible_text(&fs::read_to_string(path).unwrap());
        for ascii in [
            "ΔG&#x27;",
            "ΔrG&#x27;",
            "ΔfG&#x27;",
            "ΔG'",
            "ΔrG'",
            "ΔfG'",
            "K&#x27; ",
        ] {
            assert!(!text.contains(ascii), "{}: {ascii}", path.display());
        }
        // A hyphen used as a sign: after a space or bracket, before a digit.
        let chars: Vec<char> = text.chars().collect();
        for w in chars.windows(3) {
            assert!(
                !(matches!(w[0], ' ' | '(' | '[' | '≤' | '=')
                    && w[1] == '-'
                    && w[2].is_ascii_digit()),
                "{}: ASCII minus in {:?}",
                path.display(),
                text.split(&format!("{}-{}", w[0], w[2]))
                    .next()
                    .map(|s| &s[s.len().saturating_sub(40)..])
            );
        }
    }
    // The checks' own messages keep ASCII (terminal, SARIF, report.json).
    assert!(report.findings.iter().any(|f| f.message.contains("ΔG'")));
    // Formulas: glucose C6H12O6 (from the demo model) with subscripts.
    let glc = report.metabolites.iter().find(|m| m.id == "glc_c").unwrap();
    assert_eq!(glc.formula.as_deref(), Some("C6H12O6"));
    let html = page(&out, &format!("metabolites/{}.html", glc.slug));
    assert!(html.contains("<dt>Formula</dt><dd>C₆H₁₂O₆</dd>"));
    assert!(page(&out, "metabolites/index.html").contains("<td class=\"secondary\">C₆H₁₂O₆</td>"));
}

fn walk(dir: &Path) -> Vec<std::path::PathBuf> {
    let mut out = Vec::new();
    for e in fs::read_dir(dir).unwrap() {
        let p = e.unwrap().path();
        if p.is_dir() {
            out.extend(walk(&p));
        } else {
            out.push(p);
        }
    }
    out.sort();
    out
}
