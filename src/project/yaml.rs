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
            let location = error.location().map(|l| (l.line(), l.column()));
            diagnostics
                .push(Diagnostic::new(file, clean_message(&error.to_string())).at_opt(location));
            None
        }
    }
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
        trimmed.to_string()
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
