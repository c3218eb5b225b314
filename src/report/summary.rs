//! A short Markdown summary for CI job pages and pull-request comments.
//!
//! Everything from the model is made inert: ids go into code spans fenced
//! longer than any backtick run they contain, other text has Markdown and
//! HTML punctuation escaped and `@` kept from mentioning anyone, so an id
//! like `![t](https://host/x.png)` never becomes an image that loads when
//! the comment is opened.

use super::{Report, Severity};
use std::fmt::Write;

/// Counts, the error and warning findings (at most `limit`), and the caution.
pub fn to_markdown(report: &Report, limit: usize) -> String {
    let s = &report.summary;
    let mut out = String::new();
    let _ = writeln!(out, "## gibbsite: {}\n", text(&report.project.title));
    let _ = writeln!(
        out,
        "**{} errors, {} warnings, {} notes** — {} reactions ({} internal, {} with ΔrG'°), {} metabolites, {} scenarios.\n",
        s.errors, s.warnings, s.notes, s.reactions, s.internal_reactions, s.reactions_with_energy, s.metabolites, s.scenarios
    );
    let shown: Vec<_> = report
        .findings
        .iter()
        .filter(|f| f.severity != Severity::Note)
        .collect();
    if !shown.is_empty() {
        out.push_str("| severity | kind | subject | scenario | message |\n|---|---|---|---|---|\n");
        for f in shown.iter().take(limit) {
            let _ = writeln!(
                out,
                "| {} | `{}` | {} | {} | {} |",
                f.severity.slug(),
                f.kind,
                code(f.subjects.first().map(String::as_str).unwrap_or("")),
                code(f.scenario.as_deref().unwrap_or("")),
                message(&f.message)
            );
        }
        if shown.len() > limit {
            let _ = writeln!(out, "\n… and {} more in the report.", shown.len() - limit);
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
