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

/// Nodes stored once each, linked to their parent by index: a path is
/// looked up by walking down from the root, so a deeply nested document
/// costs memory in proportion to its nodes, not to their depth.
#[derive(Debug, Default)]
struct Locations {
    root: Option<usize>,
    values: Vec<Location>,
    /// (parent node, segment) → child node.
    children: HashMap<(usize, Segment), usize>,
    /// (mapping node, key) → where the key is written.
    keys: HashMap<(usize, Segment), Location>,
}

impl Locations {
    fn node(&self, path: &[Segment]) -> Option<usize> {
        let mut node = self.root?;
        for segment in path {
            node = *self.children.get(&(node, segment.clone()))?;
        }
        Some(node)
    }
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
        let map = self.locations();
        map.node(path).map(|n| map.values[n])
    }

    /// Location of the key naming `path` (falls back to the value).
    pub fn key(&self, path: &[Segment]) -> Option<Location> {
        let map = self.locations();
        path.split_last()
            .and_then(|(last, parent)| {
                let parent = map.node(parent)?;
                map.keys.get(&(parent, last.clone())).copied()
            })
            .or_else(|| self.value(path))
    }

    /// Closest known location: the path itself or its nearest ancestor.
    pub fn nearest(&self, path: &[Segment]) -> Option<Location> {
        let map = self.locations();
        let mut node = map.root?;
        for segment in path {
            match map.children.get(&(node, segment.clone())) {
                Some(&child) => node = child,
                None => break,
            }
        }
        Some(map.values[node])
    }
}

/// Tracks the current node while events stream by.
#[derive(Default)]
struct Builder {
    map: Locations,
    stack: Vec<Frame>,
}

/// `node` is `None` inside a complex key (not part of our formats): nothing
/// below it is recorded.
enum Frame {
    Sequence {
        node: Option<usize>,
        next: usize,
    },
    /// `pending_key`: the key just read, waiting for its value.
    Mapping {
        node: Option<usize>,
        pending_key: Option<String>,
    },
}

/// Where the node that starts now goes.
enum Slot {
    Root,
    Child(usize, Segment),
    Nowhere,
}

impl Builder {
    /// Slot of the node that starts now, advancing the parent's cursor.
    fn next_slot(&mut self) -> Slot {
        match self.stack.last_mut() {
            None => Slot::Root,
            Some(Frame::Sequence { node, next }) => {
                let i = *next;
                *next += 1;
                match node {
                    Some(n) => Slot::Child(*n, Segment::Index(i)),
                    None => Slot::Nowhere,
                }
            }
            Some(Frame::Mapping { node, pending_key }) => match (node, pending_key.take()) {
                (Some(n), Some(key)) => Slot::Child(*n, Segment::Key(key)),
                _ => Slot::Nowhere,
            },
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

    /// The node for `slot` (the first one recorded wins, as for repeated
    /// keys), or `None` when nothing is recorded there.
    fn record(
        &mut self,
        slot: Slot,
        mark: Marker,
        inline_scalar: bool,
        quoted: bool,
    ) -> Option<usize> {
        let location = Location {
            line: mark.line(),
            column: mark.col() + 1,
            inline_scalar,
            quoted,
        };
        let map = &mut self.map;
        match slot {
            Slot::Nowhere => None,
            Slot::Root => Some(*map.root.get_or_insert_with(|| {
                map.values.push(location);
                map.values.len() - 1
            })),
            Slot::Child(parent, segment) => {
                let values = &mut map.values;
                Some(*map.children.entry((parent, segment)).or_insert_with(|| {
                    values.push(location);
                    values.len() - 1
                }))
            }
        }
    }
}

impl MarkedEventReceiver for Builder {
    fn on_event(&mut self, event: Event, mark: Marker) {
        match event {
            Event::Scalar(value, style, ..) => {
                if self.expecting_key() {
                    if let Some(Frame::Mapping { node, pending_key }) = self.stack.last_mut() {
                        if let Some(n) = node {
                            self.map
                                .keys
                                .entry((*n, Segment::Key(value.clone())))
                                .or_insert(Location {
                                    line: mark.line(),
                                    column: mark.col() + 1,
                                    inline_scalar: true,
                                    quoted: false,
                                });
                        }
                        *pending_key = Some(value);
                    }
                    return;
                }
                let slot = self.next_slot();
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
                self.record(slot, mark, inline, quoted);
            }
            Event::SequenceStart(..) => {
                let node = if self.expecting_key() {
                    // Complex keys are not part of our formats; keep the stack consistent.
                    None
                } else {
                    let slot = self.next_slot();
                    self.record(slot, mark, false, false)
                };
                self.stack.push(Frame::Sequence { node, next: 0 });
            }
            Event::MappingStart(..) => {
                let node = if self.expecting_key() {
                    None
                } else {
                    let slot = self.next_slot();
                    self.record(slot, mark, false, false)
                };
                self.stack.push(Frame::Mapping {
                    node,
                    pending_key: None,
                });
            }
            Event::SequenceEnd | Event::MappingEnd => {
                self.stack.pop();
            }
            Event::Alias(_) => {
                let _ = self.next_slot();
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
        let nearest = map
            .nearest(&[key("conc"), key("nope"), Segment::Index(3)])
            .unwrap();
        assert_eq!((nearest.line, nearest.column), (2, 7));
        let k = map.key(&[key("conc"), key("max")]).unwrap();
        assert_eq!((k.line, k.column), (2, 19));
    }

    #[test]
    fn deep_nesting_costs_memory_per_node_not_per_depth() {
        // 500 nested block mappings: with a path per node this held 125,000
        // segments; with parent indices it holds 501 nodes.
        let depth = 500;
        let mut text = String::new();
        for d in 0..depth {
            text.push_str(&" ".repeat(d));
            text.push_str("k:\n");
        }
        let map = SourceMap::build(&text);
        let path: Vec<Segment> = (0..depth).map(|_| key("k")).collect();
        let last = map.key(&path).unwrap();
        assert_eq!((last.line, last.column), (depth, depth));
        assert_eq!(map.locations().values.len(), depth + 1);
    }
}
