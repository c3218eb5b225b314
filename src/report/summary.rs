//! A short Markdown summary for CI job pages and pull-request comments.
//!
//! Everything from the model is made inert: ids go into code spans fenced
//! longer than any backtick run they contain, other text has Markdown and
//! HTML punctuation escaped and `@` kept from mentioning anyone, so an id
//! like `![t](https://host/x.png)` never becomes an image that loads when
//! the comment is opened.

use super::kinds;
use super::text::groups;
use super::Report;
use crate::outcome::Outcome;
use std::fmt::Write;

/// Example rows shown per kind; the rest are in the report.
pub const EXAMPLES_PER_KIND: usize = 10;

/// Root causes listed in the summary (the most explaining first).
pub const ROOT_CAUSES_SHOWN: usize = 5;

/// The pass/fail line, coverage, counts by kind, the report's root causes
/// (when it has any), at most [`EXAMPLES_PER_KIND`] example rows per kind,
/// and the caution.
pub fn to_markdown(report: &Report, outcome: &Outcome) -> String {
    let s = &report.summary;
    let mut out = String::new();
    let _ = writeln!(out, "## gibbsite: {}\n", text(&report.project.title));
    let line = outcome.line();
    let (verdict, rest) = line.split_once(": ").unwrap_or((&line, ""));
    // Our own wording, no model text: written as is.
    let _ = writeln!(out, "**{verdict}**: {rest}\n");
    if let Some(c) = outcome.coverage {
        let _ = writeln!(
            out,
            "Coverage: {} have a ΔrG'° and so a direction verdict; the other {} could not be judged.\n",
            c.phrase().replacen("judged ", "", 1),
            c.internal - c.judged.min(c.internal)
        );
    }
    let _ = writeln!(
        out,
        "{} errors, {} warnings, {} notes — {} reactions ({} internal), {} metabolites, {} scenarios.\n",
        s.errors, s.warnings, s.notes, s.reactions, s.internal_reactions, s.metabolites, s.scenarios
    );
    let groups = groups(report);
    if !groups.is_empty() {
        out.push_str("### Findings by kind\n\n| severity | kind | count | what it means |\n|---|---|---:|---|\n");
        for ((severity, kind), findings) in &groups {
            let meaning = kinds::help(kind)
                .map(|h| h.summary.to_string())
                .or_else(|| kinds::check_of(report, kind).map(|(title, _)| title.to_string()))
                .unwrap_or_default();
            let _ = writeln!(
                out,
                "| {} | `{kind}` | {} | {} |",
                severity.slug(),
                findings.len(),
                message(&meaning)
            );
        }
        out.push('\n');
    }
    if !report.root_causes.is_empty() {
        out.push_str("### Root causes\n\n| cause | findings it explains |\n|---|---:|\n");
        for r in report.root_causes.iter().take(ROOT_CAUSES_SHOWN) {
            // The title holds model ids: written inert.
            let _ = writeln!(out, "| {} | {} |", text(&r.title), r.explains());
        }
        let more = report.root_causes.len().saturating_sub(ROOT_CAUSES_SHOWN);
        if more > 0 {
            let _ = writeln!(out, "\n… and {more} more on the site's findings page.");
        }
        out.push('\n');
    }
    for ((severity, kind), findings) in &groups {
        let _ = writeln!(
            out,
            "### {} `{kind}` ({})\n\n| subject | scenario | message |\n|---|---|---|",
            severity.slug(),
            findings.len()
        );
        for f in findings.iter().take(EXAMPLES_PER_KIND) {
            let _ = writeln!(
                out,
                "| {} | {} | {} |",
                code(f.subjects.first().map(String::as_str).unwrap_or("")),
                code(f.scenario.as_deref().unwrap_or("")),
                message(&f.message)
            );
        }
        if findings.len() > EXAMPLES_PER_KIND {
            let _ = writeln!(
                out,
                "\n… and {} more of this kind in the report.",
                findings.len() - EXAMPLES_PER_KIND
            );
        }
        out.push('\n');
    }
    let _ = writeln!(out, "> {}", text(&report.project.caution));
    out
}

/// An id as a code span inside a table cell: fenced with one backtick more
/// than its longest run, padded when it starts or ends with a backtick,
/// pipes escaped (GFM tables split on them even inside code).
fn code(id: &str) -> String {
    if id.is_empty() {
        return String::new();
    }
    let flat = id.replace(['\n', '\r'], " ").replace('|', "\\|");
    let mut longest = 0;
    let mut run = 0;
    for c in flat.chars() {
        run = if c == '`' { run + 1 } else { 0 };
        longest = longest.max(run);
    }
    let fence = "`".repeat(longest + 1);
    let pad = if flat.starts_with('`') || flat.ends_with('`') {
        " "
    } else {
        ""
    };
    format!("{fence}{pad}{flat}{pad}{fence}")
}

/// A message of ours: its `quoted` ids become code spans, the rest is text.
fn message(m: &str) -> String {
    let parts: Vec<&str> = m.split('`').collect();
    let mut out = String::new();
    for (i, part) in parts.iter().enumerate() {
        let quoted = i % 2 == 1 && i + 1 < parts.len();
        if quoted {
            out.push_str(&code(part));
        } else {
            if i > 0 && i % 2 == 1 {
                // An unmatched backtick: keep it, escaped.
                out.push_str("\\`");
            }
            out.push_str(&text(part));
        }
    }
    out
}

/// Model text inside a Markdown table cell: no pipes, no line breaks, no
/// HTML (angle brackets become entities), no links or emphasis (their
/// punctuation escaped), and no `@mention` (a word joiner follows `@`).
fn text(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '\n' | '\r' => out.push(' '),
            '@' => out.push_str("@\u{2060}"),
            '\\' | '`' | '*' | '_' | '[' | ']' | '(' | ')' | '!' | '|' | '~' | '#' => {
                out.push('\\');
                out.push(c);
            }
            c => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ids_become_safely_fenced_code_spans() {
        assert_eq!(code("PGI"), "`PGI`");
        assert_eq!(code("a`b"), "``a`b``");
        assert_eq!(code("`x``"), "``` `x`` ```");
        assert_eq!(
            code("![t](https://host/x.png)"),
            "`![t](https://host/x.png)`"
        );
        assert_eq!(code("a|b\nc"), "`a\\|b c`");
    }

    #[test]
    fn text_is_inert() {
        assert_eq!(text("@octocat"), "@\u{2060}octocat");
        assert_eq!(
            text("![t](https://host/x.png)"),
            "\\!\\[t\\]\\(https://host/x.png\\)"
        );
        assert_eq!(text("<img src=x>"), "&lt;img src=x&gt;");
        assert_eq!(
            message("reaction `@team` needs ΔG' < 0"),
            "reaction `@team` needs ΔG' &lt; 0"
        );
    }
}
