//! Reading one YAML file into a raw schema type while collecting every
//! unknown key (with its location and a "did you mean" hint) instead of
//! stopping at the first.

use super::schema::{did_you_mean, expected_fields, FileKind};
use super::sourcemap::{display, Segment, SourceMap};
use crate::error::Diagnostic;
use serde::de::DeserializeOwned;
use std::path::Path;

/// A parsed file with the map from paths to locations.
pub struct Parsed<T> {
    pub value: T,
    pub map: SourceMap,
}

/// Parse `text`; problems are appended to `diagnostics`. Returns `None` when
/// the file could not be read into the schema at all (syntax or type error).
pub fn parse<T: DeserializeOwned>(
    file: &Path,
    text: &str,
    kind: FileKind,
    diagnostics: &mut Vec<Diagnostic>,
) -> Option<Parsed<T>> {
    // Checked before any parser sees the text: deep nesting makes YAML
    // parsers slow (quadratic) and recursive, and our formats need a few levels.
    if let Some((line, column)) = too_deep(text) {
        diagnostics.push(
            Diagnostic::new(
                file,
                format!("nesting deeper than {MAX_DEPTH} levels; gibbsite files need only a few"),
            )
            .at(line, column),
        );
        return None;
    }
    let map = SourceMap::build(text);
    let mut unknown: Vec<Vec<Segment>> = Vec::new();
    let deserializer = serde_yaml::Deserializer::from_str(text);
    let result: Result<T, _> = serde_ignored::deserialize(deserializer, |path| {
        unknown.push(segments(&path));
    });
    for path in &unknown {
        diagnostics.push(unknown_key(file, kind, path, &map));
    }
    match result {
        Ok(value) => Some(Parsed { value, map }),
        Err(error) => {
            let mut message = error.to_string();
            let mut location = error.location().map(|l| (l.line(), l.column()));
            // libyaml's reader errors ("control characters are not allowed
            // at position 34") carry a byte offset instead of a location.
            if let Some((before, offset)) = message.rsplit_once(" at position ") {
                if let Ok(offset) = offset.trim().parse::<usize>() {
                    location = Some(super::read::line_column(text.as_bytes(), offset));
                    message = before.to_string();
                }
            }
            diagnostics.push(Diagnostic::new(file, clean_message(&message)).at_opt(location));
            None
        }
    }
}

/// Deepest nesting of mappings and sequences a gibbsite YAML file may have
/// (the formats need at most about six).
pub const MAX_DEPTH: usize = 64;

/// Where nesting first exceeds [`MAX_DEPTH`], by a linear scan that
/// over-estimates rather than misses: block levels from indentation and
/// `- ` markers, flow levels from brackets outside quotes and comments.
pub fn too_deep(text: &str) -> Option<(usize, usize)> {
    let mut indents: Vec<usize> = Vec::new();
    let mut flow = 0usize;
    // Indentation of the line that opened a block scalar (`|`, `>`).
    let mut block_scalar: Option<usize> = None;
    for (n, line) in text.lines().enumerate() {
        let indent = line.len() - line.trim_start_matches([' ', '\t']).len();
        let rest = &line[indent..];
        if let Some(opened) = block_scalar {
            if rest.is_empty() || indent > opened {
                continue;
            }
            block_scalar = None;
        }
        let mut depth;
        let mut column = indent;
        let mut s = rest;
        if flow == 0 {
            if rest.is_empty() || rest.starts_with('#') {
                continue;
            }
            while indents.last().is_some_and(|&i| i > indent) {
                indents.pop();
            }
            if indents.last() != Some(&indent) {
                indents.push(indent);
            }
            depth = indents.len();
            // `- - - x`: each marker opens a sequence on this line.
            while s == "-" || s.starts_with("- ") || s.starts_with("-\t") {
                depth += 1;
                let next = s[1..].trim_start_matches([' ', '\t']);
                column += s.len() - next.len();
                s = next;
            }
        } else {
            depth = indents.len();
        }
        if depth + flow > MAX_DEPTH {
            return Some((n + 1, column + 1));
        }
        // Scan the rest of the line for flow brackets.
        let bytes = s.as_bytes();
        let mut i = 0;
        let mut value_start = flow == 0;
        while i < bytes.len() {
            let c = bytes[i];
            match c {
                b'"' | b'\'' if flow > 0 || value_start => {
                    // Skip the quoted string (to the end of the line at most).
                    i += 1;
                    while i < bytes.len() {
                        if c == b'"' && bytes[i] == b'\\' {
                            i += 2;
                            continue;
                        }
                        if bytes[i] == c {
                            break;
                        }
                        i += 1;
                    }
                    value_start = false;
                }
                b'#' if i == 0 || bytes[i - 1] == b' ' || bytes[i - 1] == b'\t' => break,
                b'[' | b'{' if flow > 0 || value_start => {
                    flow += 1;
                    if depth + flow > MAX_DEPTH {
                        return Some((n + 1, column + i + 1));
                    }
                }
                b']' | b'}' if flow > 0 => flow -= 1,
                b' ' | b'\t' => {}
                b':' if flow == 0 && bytes.get(i + 1).is_none_or(|b| *b == b' ' || *b == b'\t') => {
                    value_start = true;
                }
                b'|' | b'>' if flow == 0 && value_start => {
                    block_scalar = Some(indent);
                    break;
                }
                _ => {
                    if flow == 0 {
                        value_start = false;
                    }
                }
            }
            i += 1;
        }
    }
    None
}

fn unknown_key(file: &Path, kind: FileKind, path: &[Segment], map: &SourceMap) -> Diagnostic {
    let Some((Segment::Key(name), parent)) = path.split_last() else {
        return Diagnostic::new(file, format!("unexpected value at `{}`", display(path)))
            .at_opt(map.nearest(path).map(|l| l.pair()));
    };
    let place = if parent.is_empty() {
        "at the top level".to_string()
    } else {
        format!("in `{}`", display(parent))
    };
    let mut d = Diagnostic::new(file, format!("unknown key `{name}` {place}")).at_opt(
        map.key(path)
            .or_else(|| map.nearest(path))
            .map(|l| l.pair()),
    );
    if let Some(fields) = expected_fields(kind, parent) {
        d = match did_you_mean(name, fields.iter().copied()) {
            Some(best) => d.hint(format!("did you mean `{best}`?")),
            None => d.hint(format!("expected one of: {}", fields.join(", "))),
        };
    }
    d
}

/// serde_yaml appends " at line L column C" to messages; the diagnostic
/// carries the location itself.
fn clean_message(message: &str) -> String {
    let trimmed = match message.find(" at line ") {
        Some(i) => &message[..i],
        None => message,
    };
    let trimmed = trimmed.trim();
    if trimmed.is_empty() {
        "invalid YAML".to_string()
    } else {
        describe_strings(trimmed)
    }
}

/// Type errors quote the offending value (`invalid type: string "…"`); when
/// a settings key points at some other file, that value is the whole file.
/// Strings longer than a short value are described by their size instead.
fn describe_strings(message: &str) -> String {
    const KEEP: usize = 40;
    let mut out = String::new();
    let mut rest = message;
    while let Some(at) = rest.find("string \"") {
        out.push_str(&rest[..at]);
        let body = &rest[at + "string \"".len()..];
        // serde writes the value with Rust escapes; find its closing quote
        // and count the bytes it stands for.
        let mut chars = body.char_indices();
        let mut bytes = 0usize;
        let mut end = None;
        while let Some((i, c)) = chars.next() {
            match c {
                '"' => {
                    end = Some(i);
                    break;
                }
                '\\' => match chars.next() {
                    Some((_, 'u')) => {
                        // \u{XXXX}
                        let mut hex = String::new();
                        for (_, h) in chars.by_ref() {
                            if h == '}' {
                                break;
                            }
                            if h != '{' {
                                hex.push(h);
                            }
                        }
                        bytes += u32::from_str_radix(&hex, 16)
                            .ok()
                            .and_then(char::from_u32)
                            .map_or(1, char::len_utf8);
                    }
                    Some(_) => bytes += 1,
                    None => break,
                },
                c => bytes += c.len_utf8(),
            }
        }
        match end {
            Some(end) if bytes > KEEP => {
                out.push_str(&format!(
                    "a string of {} bytes",
                    super::read::group(bytes as u64)
                ));
                rest = &body[end + 1..];
            }
            Some(end) => {
                out.push_str(&rest[at..at + "string \"".len() + end + 1]);
                rest = &body[end + 1..];
            }
            None => {
                out.push_str("a string");
                rest = "";
            }
        }
    }
    out.push_str(rest);
    // Our schema types are internal names; say what the user writes.
    match out.find("expected struct ") {
        Some(at) => format!("{}expected a mapping", &out[..at]),
        None => out,
    }
}

fn segments(path: &serde_ignored::Path<'_>) -> Vec<Segment> {
    use serde_ignored::Path as P;
    match path {
        P::Root => Vec::new(),
        P::Seq { parent, index } => {
            let mut v = segments(parent);
            v.push(Segment::Index(*index));
            v
        }
        P::Map { parent, key } => {
            let mut v = segments(parent);
            v.push(Segment::Key(key.clone()));
            v
        }
        P::Some { parent } | P::NewtypeStruct { parent } | P::NewtypeVariant { parent } => {
            segments(parent)
        }
    }
}

#[cfg(test)]
mod depth_tests {
    use super::*;

    #[test]
    fn reader_errors_get_a_line_and_column() {
        let text = "reactions:\n  - id: R1\n    name: \"aé\u{7f}b\"\n";
        let mut diagnostics = Vec::new();
        let parsed = parse::<serde_yaml::Value>(
            Path::new("m.yaml"),
            text,
            FileKind::Model,
            &mut diagnostics,
        );
        assert!(parsed.is_none());
        assert_eq!(diagnostics[0].message, "control characters are not allowed");
        assert_eq!(
            (diagnostics[0].line, diagnostics[0].column),
            (Some(3), Some(14))
        );
    }

    #[test]
    fn type_errors_describe_long_strings_by_size() {
        let text = format!("root:x:0:0:{}\nnext line \"quoted\" é\n", "a".repeat(1_300));
        let mut diagnostics = Vec::new();
        let parsed = parse::<super::super::schema::RawModelFile>(
            Path::new("m.yaml"),
            &text,
            FileKind::Model,
            &mut diagnostics,
        );
        assert!(parsed.is_none());
        assert_eq!(
            diagnostics[0].message,
            "invalid type: a string of 1,333 bytes, expected a mapping"
        );
        assert_eq!(
            describe_strings("invalid type: string \"abc\", expected f64"),
            "invalid type: string \"abc\", expected f64"
        );
    }

    #[test]
    fn ordinary_files_are_not_too_deep() {
        let demo = include_str!("../../projects/lakeside/model.yaml");
        assert_eq!(too_deep(demo), None);
        let settings = include_str!("../../projects/lakeside/gibbsite.yaml");
        assert_eq!(too_deep(settings), None);
        // Brackets in plain values and block scalars are not nesting.
        let text = format!(
            "reactions:\n  - id: R1\n    equation: 2 a[c] -> b[c]\n    notes: |\n      {}\n    name: x [\n",
            "[".repeat(200)
        );
        assert_eq!(too_deep(&text), None);
    }

    #[test]
    fn deep_flow_block_and_sequence_nesting_is_caught() {
        let flow = format!("a: {}{}", "{b: ".repeat(100), "}".repeat(100));
        assert_eq!(too_deep(&flow), Some((1, 256)));
        let mut block = String::new();
        for d in 0..100 {
            block.push_str(&" ".repeat(d));
            block.push_str("k:\n");
        }
        assert_eq!(too_deep(&block), Some((65, 65)));
        let dashes = format!("{}x\n", "- ".repeat(100));
        assert_eq!(too_deep(&dashes).map(|(l, _)| l), Some(1));
        let multi_line = format!("a: {}\n{}", "[\n".repeat(100), "]\n".repeat(100));
        assert_eq!(too_deep(&multi_line).map(|(l, _)| l), Some(64));
    }

    #[test]
    fn too_deep_text_is_an_error_at_its_place() {
        let flow = format!(
            "id: x\nreactions: {}{}\n",
            "[".repeat(5000),
            "]".repeat(5000)
        );
        let mut diagnostics = Vec::new();
        let parsed = parse::<serde_yaml::Value>(
            Path::new("m.yaml"),
            &flow,
            FileKind::Model,
            &mut diagnostics,
        );
        assert!(parsed.is_none());
        assert_eq!(diagnostics.len(), 1);
        assert_eq!(diagnostics[0].line, Some(2));
        assert!(diagnostics[0].message.contains("nesting deeper than 64"));
    }
}
