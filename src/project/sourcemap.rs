//! Where each YAML node sits in its file, so errors found after typed
//! deserialisation (unknown metabolite, duplicate id, min > max, …) can still
//! name a line and column. serde_yaml does not expose spans, so the text is
//! parsed a second time with yaml-rust2's event parser, which does.

use std::collections::HashMap;
use yaml_rust2::parser::{Event, MarkedEventReceiver, Parser};
use yaml_rust2::scanner::{Marker, TScalarStyle};

/// One step of a path into a YAML document.
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub enum Segment {
    Key(String),
    Index(usize),
}

pub type Path = Vec<Segment>;

/// Display a path the way users read it: `reactions[3].equation`.
pub fn display(path: &[Segment]) -> String {
    let mut out = String::new();
    for segment in path {
        match segment {
            Segment::Key(k) => {
                if !out.is_empty() {
                    out.push('.');
                }
                out.push_str(k);
            }
            Segment::Index(i) => out.push_str(&format!("[{i}]")),
        }
    }
    out
}

/// Position of a node: 1-based line and column, plus how a scalar was
/// quoted (to place a column inside a string value).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Location {
    pub line: usize,
    pub column: usize,
    /// True for a scalar written plain or quoted on one line, so that
    /// `column + offset (+1 if quoted)` points inside it.
    pub inline_scalar: bool,
    pub quoted: bool,
}

impl Location {
    pub fn pair(self) -> (usize, usize) {
        (self.line, self.column)
    }

    /// Location of the byte `offset` inside this scalar, when that can be known.
    pub fn inside(self, offset: usize) -> (usize, usize) {
        if self.inline_scalar {
            (self.line, self.column + offset + usize::from(self.quoted))
        } else {
            (self.line, self.column)
        }
    }
}

/// Locations of a YAML text's nodes. Built lazily, on the first question:
/// a file without problems never pays for the second parse.
#[derive(Debug, Default)]
pub struct SourceMap {
    text: String,
    inner: std::cell::OnceCell<Locations>,
}

#[derive(Debug, Default)]
struct Locations {
    values: HashMap<Path, Location>,
    keys: HashMap<Path, Location>,
}

impl SourceMap {
    /// Keep the text; the event parse happens when a location is first asked
    /// for. On YAML syntax errors the map is partial (serde_yaml reports the
    /// syntax error itself).
    pub fn build(text: &str) -> SourceMap {
        SourceMap {
            text: text.to_string(),
            inner: std::cell::OnceCell::new(),
        }
    }

    fn locations(&self) -> &Locations {
        self.inner.get_or_init(|| {
            let mut builder = Builder::default();
            let mut parser = Parser::new_from_str(&self.text);
            let _ = parser.load(&mut builder, false);
            builder.map
        })
    }

    /// Location of the value at `path`.
    pub fn value(&self, path: &[Segment]) -> Option<Location> {
        self.locations().values.get(path).copied()
    }

    /// Location of the key naming `path` (falls back to the value).
    pub fn key(&self, path: &[Segment]) -> Option<Location> {
        self.locations()
            .keys
            .get(path)
            .copied()
            .or_else(|| self.value(path))
    }

    /// Closest known location: the path itself or its nearest ancestor.
    pub fn nearest(&self, path: &[Segment]) -> Option<Location> {
        (0..=path.len()).rev().find_map(|n| self.value(&path[..n]))
    }
}

/// Tracks the current path while events stream by.
#[derive(Default)]
struct Builder {
    map: Locations,
    stack: Vec<Frame>,
}

enum Frame {
    Sequence {
        path: Path,
        next: usize,
    },
    /// `pending_key`: the key just read, waiting for its value.
    Mapping {
        path: Path,
        pending_key: Option<String>,
    },
}

impl Builder {
    /// Path of the node that starts now, advancing the parent's cursor.
    fn next_path(&mut self) -> Option<Path> {
        match self.stack.last_mut() {
            None => Some(Vec::new()),
            Some(Frame::Sequence { path, next }) => {
                let mut p = path.clone();
                p.push(Segment::Index(*next));
                *next += 1;
                Some(p)
            }
            Some(Frame::Mapping { path, pending_key }) => {
                let key = pending_key.take()?;
                let mut p = path.clone();
                p.push(Segment::Key(key));
                Some(p)
            }
        }
    }

    /// In a mapping with no pending key, the next scalar is a key.
    fn expecting_key(&self) -> bool {
        matches!(
            self.stack.last(),
            Some(Frame::Mapping {
                pending_key: None,
                ..
            })
        )
    }

    fn record(&mut self, path: Path, mark: Marker, inline_scalar: bool, quoted: bool) {
        self.map.values.entry(path).or_insert(Location {
            line: mark.line(),
            column: mark.col() + 1,
            inline_scalar,
            quoted,
        });
    }
}

impl MarkedEventReceiver for Builder {
    fn on_event(&mut self, event: Event, mark: Marker) {
        match event {
            Event::Scalar(value, style, ..) => {
                if self.expecting_key() {
                    if let Some(Frame::Mapping { path, pending_key }) = self.stack.last_mut() {
                        let mut p = path.clone();
                        p.push(Segment::Key(value.clone()));
                        self.map.keys.entry(p).or_insert(Location {
                            line: mark.line(),
                            column: mark.col() + 1,
                            inline_scalar: true,
                            quoted: false,
                        });
                        *pending_key = Some(value);
                    }
                    return;
                }
                if let Some(path) = self.next_path() {
                    let quoted = matches!(
                        style,
                        TScalarStyle::SingleQuoted | TScalarStyle::DoubleQuoted
                    );
                    let inline = !value.contains('\n')
                        && matches!(
                            style,
                            TScalarStyle::Plain
                                | TScalarStyle::SingleQuoted
                                | TScalarStyle::DoubleQuoted
                        );
                    self.record(path, mark, inline, quoted);
                }
            }
            Event::SequenceStart(..) => {
                if self.expecting_key() {
                    // Complex keys are not part of our formats; keep the stack consistent.
                    self.stack.push(Frame::Sequence {
                        path: vec![Segment::Key("?".into())],
                        next: 0,
                    });
                    return;
                }
                let path = self.next_path().unwrap_or_default();
                self.record(path.clone(), mark, false, false);
                self.stack.push(Frame::Sequence { path, next: 0 });
            }
            Event::MappingStart(..) => {
                if self.expecting_key() {
                    self.stack.push(Frame::Mapping {
                        path: vec![Segment::Key("?".into())],
                        pending_key: None,
                    });
                    return;
                }
                let path = self.next_path().unwrap_or_default();
                self.record(path.clone(), mark, false, false);
                self.stack.push(Frame::Mapping {
                    path,
                    pending_key: None,
                });
            }
            Event::SequenceEnd | Event::MappingEnd => {
                self.stack.pop();
            }
            Event::Alias(_) => {
                let _ = self.next_path();
            }
            _ => {}
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn key(k: &str) -> Segment {
        Segment::Key(k.to_string())
    }

    #[test]
    fn locates_nested_values_and_keys() {
        let text = "id: demo\nreactions:\n  - id: R1\n    equation: a -> b\n  - id: R2\n    equation: \"b -> c\"\n";
        let map = SourceMap::build(text);
        let eq1 = map
            .value(&[key("reactions"), Segment::Index(0), key("equation")])
            .unwrap();
        assert_eq!((eq1.line, eq1.column), (4, 15));
        assert_eq!(eq1.inside(5), (4, 20));
        let eq2 = map
            .value(&[key("reactions"), Segment::Index(1), key("equation")])
            .unwrap();
        assert_eq!(eq2.inside(0), (6, 16));
        let k = map
            .key(&[key("reactions"), Segment::Index(1), key("id")])
            .unwrap();
        assert_eq!((k.line, k.column), (5, 5));
        assert_eq!(
            display(&[key("reactions"), Segment::Index(1), key("id")]),
            "reactions[1].id"
        );
    }

    #[test]
    fn flow_collections_are_tracked() {
        let text = "bounds: [0, 1000]\nconc: {min: 1 mM, max: 2 mM}\n";
        let map = SourceMap::build(text);
        let b1 = map.value(&[key("bounds"), Segment::Index(1)]).unwrap();
        assert_eq!((b1.line, b1.column), (1, 13));
        let max = map.value(&[key("conc"), key("max")]).unwrap();
        assert_eq!((max.line, max.column), (2, 24));
    }
}
