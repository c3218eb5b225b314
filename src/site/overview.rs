//! Pieces of the overview page computed in Rust: the headline sentence
//! with its pointer to the coverage page made a link.

use crate::report::Report;

/// The words of the headline sentence that link to the coverage page.
const MISSING: &str = "see what is missing";

/// The headline sentence as HTML: escaped, with "see what is missing"
/// linking to `coverage.html` (the sentence holds our own words and
/// numbers only, but it is escaped all the same).
pub fn headline_html(report: &Report) -> Option<String> {
    let sentence = &report.headline.as_ref()?.sentence;
    let escaped = escape(sentence);
    Some(escaped.replacen(
        MISSING,
        &format!("<a href=\"coverage.html\">{MISSING}</a>"),
        1,
    ))
}

fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#x27;"),
            other => out.push(other),
        }
    }
    out
}
