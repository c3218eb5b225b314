//! Project notes (Markdown) to HTML, safely.
//!
//! Notes are user text shown to reviewers, so nothing in them may run or
//! load: raw HTML is turned into text (escaped), links with a scheme other
//! than http, https or mailto lose their link (the text stays), and only
//! images with a plain relative path stay images: every other image
//! (absolute URL, protocol-relative `//host/x.png`, `\\host`, a rooted
//! path) becomes a plain link, so opening a page never makes a network
//! request. URLs are judged the way a browser reads them: tabs and line
//! breaks removed, leading control characters and spaces stripped.

use pulldown_cmark::{html, CodeBlockKind, Event, LinkType, Options, Parser, Tag, TagEnd};

/// What to do with the end event of an open link or image.
enum Open {
    Keep,
    Drop,
    ImageAsLink,
}

/// Renders Markdown to an HTML fragment without raw HTML passthrough.
pub fn to_html(markdown: &str) -> String {
    let options = Options::ENABLE_TABLES
        | Options::ENABLE_FOOTNOTES
        | Options::ENABLE_STRIKETHROUGH
        | Options::ENABLE_TASKLISTS;
    let mut open: Vec<Open> = Vec::new();
    let events = Parser::new_ext(markdown, options).filter_map(|event| match event {
        Event::Html(raw) | Event::InlineHtml(raw) => Some(Event::Text(raw)),
        // An HTML block is shown as the source the author wrote.
        Event::Start(Tag::HtmlBlock) => Some(Event::Start(Tag::CodeBlock(CodeBlockKind::Indented))),
        Event::End(TagEnd::HtmlBlock) => Some(Event::End(TagEnd::CodeBlock)),
        Event::Start(Tag::Link {
            link_type,
            dest_url,
            title,
            id,
        }) => {
            if has_safe_scheme(&dest_url) {
                open.push(Open::Keep);
                Some(Event::Start(Tag::Link {
                    link_type,
                    dest_url,
                    title,
                    id,
                }))
            } else {
                open.push(Open::Drop);
                None
            }
        }
        Event::Start(Tag::Image {
            link_type,
            dest_url,
            title,
            id,
        }) => {
            if is_plain_relative(&dest_url) {
                open.push(Open::Keep);
                Some(Event::Start(Tag::Image {
                    link_type,
                    dest_url,
                    title,
                    id,
                }))
            } else if has_safe_scheme(&dest_url) {
                open.push(Open::ImageAsLink);
                Some(Event::Start(Tag::Link {
                    link_type: LinkType::Inline,
                    dest_url,
                    title,
                    id,
                }))
            } else {
                open.push(Open::Drop);
                None
            }
        }
        Event::End(end @ (TagEnd::Link | TagEnd::Image)) => match open.pop() {
            Some(Open::Drop) => None,
            Some(Open::ImageAsLink) => Some(Event::End(TagEnd::Link)),
            Some(Open::Keep) | None => Some(Event::End(end)),
        },
        other => Some(other),
    });
    let mut out = String::with_capacity(markdown.len() * 3 / 2);
    html::push_html(&mut out, events);
    out
}

/// The URL as a browser's URL parser sees it: ASCII tab and line breaks
/// removed anywhere, leading and trailing C0 controls and spaces stripped.
fn as_browser_reads(url: &str) -> String {
    url.chars()
        .filter(|c| !matches!(c, '\t' | '\n' | '\r'))
        .collect::<String>()
        .trim_matches(|c: char| c <= ' ')
        .to_string()
}

/// A path relative to the page, which loads from the site itself: no
/// scheme, not rooted or protocol-relative (`/`, `//host`), no backslash
/// (browsers read `\\` as `/`).
fn is_plain_relative(url: &str) -> bool {
    let url = as_browser_reads(url);
    scheme(&url).is_none() && !url.starts_with('/') && !url.contains('\\')
}

/// The URL scheme (lower case), if the URL has one.
fn scheme(url: &str) -> Option<String> {
    let url = as_browser_reads(url);
    let (candidate, _) = url.split_once(':')?;
    let mut chars = candidate.chars();
    let first = chars.next()?;
    let valid = first.is_ascii_alphabetic()
        && chars.all(|c| c.is_ascii_alphanumeric() || matches!(c, '+' | '-' | '.'));
    valid.then(|| candidate.to_ascii_lowercase())
}

fn has_safe_scheme(url: &str) -> bool {
    match scheme(url) {
        None => true,
        Some(s) => matches!(s.as_str(), "http" | "https" | "mailto"),
    }
}

#[cfg(test)]
mod tests {
    use super::to_html;

    #[test]
    fn raw_html_is_escaped_text() {
        let html = to_html("Hi <script>alert(1)</script>\n\n<div onclick=\"x()\">block</div>\n");
        assert!(!html.contains("<script"), "{html}");
        assert!(!html.contains("<div"), "{html}");
        assert!(
            html.contains("&lt;script&gt;alert(1)&lt;/script&gt;"),
            "{html}"
        );
    }

    #[test]
    fn markdown_still_renders() {
        let html = to_html("# Title\n\n*a* and [b](other.html)\n\n| x |\n|---|\n| 1 |\n");
        assert!(html.contains("<h1>Title</h1>"), "{html}");
        assert!(html.contains("<em>a</em>"));
        assert!(html.contains(r#"<a href="other.html">b</a>"#));
        assert!(html.contains("<table>"));
    }

    #[test]
    fn unsafe_links_lose_their_target_and_remote_images_do_not_load() {
        let html =
            to_html("[x](javascript:alert(1)) [y](JavaScript:1) ![pic](https://example.org/a.png)");
        assert!(!html.to_lowercase().contains("javascript:"), "{html}");
        assert!(html.contains('x') && html.contains('y'));
        assert!(!html.contains("<img"), "{html}");
        assert!(
            html.contains(r#"<a href="https://example.org/a.png">pic</a>"#),
            "{html}"
        );
    }

    #[test]
    fn only_plain_relative_images_load() {
        let html = to_html(
            "![a](//host/a.png) ![b](\\\\host\\b.png) ![c](/etc/c.png) ![d](pics/d.png) ![e](<\u{1}//host/e.png>)",
        );
        assert_eq!(html.matches("<img").count(), 1, "{html}");
        assert!(
            html.contains(r#"<img src="pics/d.png" alt="d" />"#),
            "{html}"
        );
        assert!(html.contains(r#"<a href="//host/a.png">a</a>"#), "{html}");
        assert!(html.contains(">b</a>") && html.contains(">c</a>"), "{html}");
    }

    #[test]
    fn schemes_are_read_as_a_browser_reads_them() {
        let html = to_html("[x](<java\tscript:alert(1)>) [y](<\u{1}javascript:alert(1)>)");
        assert!(!html.contains("<a"), "{html}");
    }
}
