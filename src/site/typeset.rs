//! Typography of the pages: one prime (′, U+2032) and one minus (−,
//! U+2212) throughout, and chemical formulas with subscript counts.
//!
//! The checks write their messages in ASCII (`ΔG'`, `-2`), which suits a
//! terminal, SARIF and report.json. Pages get the typographic forms by a
//! last pass over each rendered page's text (never inside tags, attribute
//! values, `<code>`, `<pre>`, `<script>` or `<style>`), so every template —
//! including a user's theme — shows the same symbols.

/// The ASCII prime after these symbols is a prime (ΔG', ΔrG'°, K').
const PRIMED: [&str; 4] = ["ΔG", "ΔrG", "ΔfG", "K"];

/// Elements whose text is left exactly as written.
const VERBATIM: [&str; 5] = ["code", "pre", "script", "style", "textarea"];

/// A rendered page with primes and minus signs set in its text.
pub fn html(page: &str) -> String {
    let mut out = String::with_capacity(page.len() + 64);
    let mut rest = page;
    let mut verbatim: Option<&str> = None;
    while !rest.is_empty() {
        match rest.find('<') {
            Some(0) => {
                let end = rest.find('>').map_or(rest.len(), |e| e + 1);
                let tag = &rest[..end];
                let name = tag_name(tag);
                match verbatim {
                    Some(v) if tag.starts_with("</") && name.eq_ignore_ascii_case(v) => {
                        verbatim = None
                    }
                    None if !tag.starts_with("</") && !tag.ends_with("/>") => {
                        verbatim = VERBATIM
                            .iter()
                            .find(|v| name.eq_ignore_ascii_case(v))
                            .copied();
                    }
                    _ => {}
                }
                out.push_str(tag);
                rest = &rest[end..];
            }
            found => {
                let end = found.unwrap_or(rest.len());
                let text = &rest[..end];
                if verbatim.is_some() {
                    out.push_str(text);
                } else {
                    text_node(&mut out, text);
                }
                rest = &rest[end..];
            }
        }
    }
    out
}

fn tag_name(tag: &str) -> &str {
    let inner = tag.trim_start_matches('<').trim_start_matches('/');
    let end = inner
        .find(|c: char| c.is_whitespace() || c == '>' || c == '/')
        .unwrap_or(inner.len());
    &inner[..end]
}

/// Primes and minus signs in one run of (escaped) text, appended to
/// `page`; what comes before a sign is looked up in this run only.
fn text_node(page: &mut String, text: &str) {
    // Most text has nothing to set: copy it whole.
    if !text.bytes().any(|b| matches!(b, b'\'' | b'-' | b'&')) {
        page.push_str(text);
        return;
    }
    let start = page.len();
    let mut rest = text;
    while let Some(c) = rest.chars().next() {
        // A prime, escaped by the template engine or written plain.
        let quote = if rest.starts_with("&#x27;") {
            Some("&#x27;")
        } else if rest.starts_with("&#39;") {
            Some("&#39;")
        } else if c == '\'' {
            Some("'")
        } else {
            None
        };
        if let Some(q) = quote {
            if is_primed(&page[start..]) {
                page.push('′');
                rest = &rest[q.len()..];
                continue;
            }
        }
        if c == '-' && is_sign(&page[start..], &rest[1..]) {
            page.push('−');
            rest = &rest[1..];
            continue;
        }
        page.push(c);
        rest = &rest[c.len_utf8()..];
    }
}

/// Does `before` end in a symbol that takes a prime (and not inside a
/// longer word: "OK'" is no K′)?
fn is_primed(before: &str) -> bool {
    PRIMED.iter().any(|p| {
        before.strip_suffix(p).is_some_and(|head| {
            !head
                .chars()
                .next_back()
                .is_some_and(|c| c.is_alphanumeric() || c == '_')
        })
    })
}

/// A hyphen is a minus sign when a number follows and nothing that could
/// make it a dash or part of a name comes before it.
fn is_sign(before: &str, after: &str) -> bool {
    let mut next = after.chars();
    let number_follows = match next.next() {
        Some(d) if d.is_ascii_digit() || d == '∞' => true,
        Some('.') => next.next().is_some_and(|d| d.is_ascii_digit()),
        _ => false,
    };
    if !number_follows {
        return false;
    }
    match before.chars().next_back() {
        None => true,
        Some(p) => p.is_whitespace() || "([{=≤≥±,:;/".contains(p) || before.ends_with("&lt;"),
    }
}

/// A chemical formula with its counts as subscripts: "C6H12O6" → "C₆H₁₂O₆",
/// "(C5H8O4)n" → "(C₅H₈O₄)ₙ". A leading number (as in a hydrate's "2H2O"
/// after a dot) stays on the line.
pub fn formula(text: &str) -> String {
    let mut out = String::with_capacity(text.len() + 8);
    let mut previous: Option<char> = None;
    for c in text.chars() {
        let after_symbol = previous.is_some_and(|p| p.is_ascii_alphabetic() || p == ')');
        let after_subscript = previous.is_some_and(|p| subscript(p).is_some() || is_sub(p));
        let shown = match c {
            '0'..='9' if after_symbol || after_subscript => subscript(c).unwrap_or(c),
            'n' if previous == Some(')') => 'ₙ',
            _ => c,
        };
        out.push(shown);
        previous = Some(if shown != c { shown } else { c });
    }
    out
}

fn subscript(c: char) -> Option<char> {
    c.to_digit(10)
        .and_then(|d| char::from_u32(0x2080 + d))
        .filter(|_| c.is_ascii_digit())
}

fn is_sub(c: char) -> bool {
    ('\u{2080}'..='\u{2089}').contains(&c)
}

/// Registers the `formula` filter.
pub fn register(env: &mut minijinja::Environment<'_>) {
    env.add_filter("formula", |s: &str| formula(s));
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn primes_and_minus_signs_in_text_only() {
        let page = "<p title=\"ΔG' -1\">best ΔG&#x27; is -2.50 kJ/mol (needs ≤ -1.00), ΔrG&#x27;° and K&#x27; = 3; \
                    the model&#x27;s OK&#x27; R_X-1 pH 4-10 1e-5 -x</p><code>ΔG' -1</code><p>-3</p>";
        assert_eq!(
            html(page),
            "<p title=\"ΔG' -1\">best ΔG′ is −2.50 kJ/mol (needs ≤ −1.00), ΔrG′° and K′ = 3; \
             the model&#x27;s OK&#x27; R_X-1 pH 4-10 1e-5 -x</p><code>ΔG' -1</code><p>−3</p>"
        );
        // Scripts are left alone.
        let script = "<script>var a = x -1;</script>";
        assert_eq!(html(script), script);
    }

    #[test]
    fn formulas_get_subscripts() {
        assert_eq!(formula("C6H12O6"), "C₆H₁₂O₆");
        assert_eq!(formula("C10H12N5O13P3"), "C₁₀H₁₂N₅O₁₃P₃");
        assert_eq!(formula("(C5H8O4)n"), "(C₅H₈O₄)ₙ");
        assert_eq!(formula("HO4P"), "HO₄P");
        assert_eq!(formula("H"), "H");
        assert_eq!(formula("CH4.2H2O"), "CH₄.2H₂O");
        assert_eq!(formula("C21H26N7O17P3R"), "C₂₁H₂₆N₇O₁₇P₃R");
    }
}
