//! Where each model element (compartment, metabolite, reaction, scenario)
//! is written in its file, for outputs that point into the source (SARIF
//! `region.startLine`).
//!
//! SBML lines are recorded while the document is read (roxmltree keeps each
//! element's byte offset). A YAML model file keeps its text and the ids of
//! its sections; the lines are found only when asked for (a second parse
//! with the event parser of [`super::sourcemap`]), so a run that writes no
//! SARIF never pays for it.

use super::sourcemap::{Segment, SourceMap};
use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::sync::Arc;

/// Sections of a model YAML file whose items have an `id`, in the order a
/// lookup prefers them when one id is used in two sections.
pub const YAML_SECTIONS: [&str; 4] = ["reactions", "metabolites", "compartments", "scenarios"];

/// Element lines of a project's model files.
#[derive(Debug, Clone, Default)]
pub struct SourceLines {
    files: Vec<FileLines>,
}

#[derive(Debug, Clone)]
enum FileLines {
    /// (id, 1-based line), recorded while reading.
    Known {
        file: PathBuf,
        lines: Arc<Vec<(String, usize)>>,
    },
    /// A YAML model file and, per section of [`YAML_SECTIONS`], the ids of
    /// its items in file order.
    Yaml {
        file: PathBuf,
        text: Arc<str>,
        ids: Arc<Vec<Vec<String>>>,
    },
}

/// Resolved element lines: id → (file, line). The first file and section
/// that has an id wins.
#[derive(Debug, Clone, Default)]
pub struct Located {
    by_id: HashMap<String, (usize, usize)>,
    files: Vec<PathBuf>,
}

impl Located {
    /// The file and 1-based line where element `id` is written.
    pub fn get(&self, id: &str) -> Option<(&Path, usize)> {
        self.by_id
            .get(id)
            .map(|&(f, line)| (self.files[f].as_path(), line))
    }

    pub fn is_empty(&self) -> bool {
        self.by_id.is_empty()
    }
}

impl SourceLines {
    /// Lines recorded while reading `file` (SBML).
    pub fn known(file: &Path, lines: Vec<(String, usize)>) -> SourceLines {
        SourceLines {
            files: vec![FileLines::Known {
                file: file.to_path_buf(),
                lines: Arc::new(lines),
            }],
        }
    }

    /// A YAML model file: its text and the ids of each section of
    /// [`YAML_SECTIONS`] (in that order, items in file order).
    pub fn add_yaml(&mut self, file: &Path, text: String, ids: Vec<Vec<String>>) {
        self.files.push(FileLines::Yaml {
            file: file.to_path_buf(),
            text: Arc::from(text),
            ids: Arc::new(ids),
        });
    }

    /// Every element's line (parses YAML files now).
    pub fn locate(&self) -> Located {
        let mut located = Located::default();
        for (f, entry) in self.files.iter().enumerate() {
            match entry {
                FileLines::Known { file, lines } => {
                    located.files.push(file.clone());
                    for (id, line) in lines.iter() {
                        located.by_id.entry(id.clone()).or_insert((f, *line));
                    }
                }
                FileLines::Yaml { file, text, ids } => {
                    located.files.push(file.clone());
                    let map = SourceMap::build(text);
                    for (section, items) in YAML_SECTIONS.iter().zip(ids.iter()) {
                        for (i, id) in items.iter().enumerate() {
                            let path = [
                                Segment::Key((*section).to_string()),
                                Segment::Index(i),
                                Segment::Key("id".to_string()),
                            ];
                            if let Some(at) = map.key(&path) {
                                located.by_id.entry(id.clone()).or_insert((f, at.line));
                            }
                        }
                    }
                }
            }
        }
        located
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn yaml_items_are_located_by_their_id_key() {
        let text = "id: m\nreactions:\n  - id: R1\n    equation: a -> b\n  - {id: R2, equation: b -> a}\nmetabolites:\n  - id: a\n";
        let mut lines = SourceLines::default();
        lines.add_yaml(
            Path::new("model.yaml"),
            text.to_string(),
            vec![
                vec!["R1".into(), "R2".into()],
                vec!["a".into()],
                vec![],
                vec![],
            ],
        );
        let located = lines.locate();
        assert_eq!(located.get("R1"), Some((Path::new("model.yaml"), 3)));
        assert_eq!(located.get("R2"), Some((Path::new("model.yaml"), 5)));
        assert_eq!(located.get("a"), Some((Path::new("model.yaml"), 7)));
        assert_eq!(located.get("b"), None);
    }
}
