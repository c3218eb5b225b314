//! The report as the `report` template value, made on demand.
//!
//! Converting a whole genome-scale report into one minijinja value tree
//! costs several times its JSON size in memory (Recon3D: about 110 MB,
//! most of it for reaction, metabolite and finding rows no page reads
//! whole). Instead `report` is an object over the shared report: each field
//! is converted the first time a page reads it and kept for the other
//! pages; the three long row lists (`reactions`, `metabolites`,
//! `findings`) are sequences whose rows are converted only when a page
//! reads them (a list page's slice converts its own rows, and skipping to
//! the slice converts nothing). Templates see the same fields and values
//! as before.

use crate::report::Report;
use minijinja::value::{Enumerator, Object, ObjectRepr, Value};
use serde::Serialize;
use std::sync::{Arc, OnceLock};

/// Every field of [`Report`], in its order (a unit test holds this to the
/// serialised report).
const FIELDS: &[&str] = &[
    "schema_version",
    "tool",
    "project",
    "summary",
    "findings",
    "compartments",
    "metabolites",
    "reactions",
    "scenarios",
    "notes",
    "loops",
    "joint_scenarios",
    "coverage",
    "headline",
    "root_causes",
];

/// The `report` value of every page.
pub fn report_value(report: Arc<Report>) -> Value {
    Value::from_object(ReportObject {
        report,
        fields: std::array::from_fn(|_| OnceLock::new()),
    })
}

#[derive(Debug)]
struct ReportObject {
    report: Arc<Report>,
    fields: [OnceLock<Value>; FIELDS.len()],
}

impl ReportObject {
    fn convert(&self, field: &str) -> Option<Value> {
        let r = &self.report;
        let rows = |list| Value::from_object(Rows(Arc::clone(r), list));
        Some(match field {
            "schema_version" => Value::from(r.schema_version),
            "tool" => Value::from_serialize(&r.tool),
            "project" => Value::from_serialize(&r.project),
            "summary" => Value::from_serialize(&r.summary),
            "findings" => rows(List::Findings),
            "compartments" => Value::from_serialize(&r.compartments),
            "metabolites" => rows(List::Metabolites),
            "reactions" => rows(List::Reactions),
            "scenarios" => Value::from_serialize(&r.scenarios),
            "notes" => Value::from_serialize(&r.notes),
            "loops" => Value::from_serialize(&r.loops),
            "joint_scenarios" => Value::from_serialize(&r.joint_scenarios),
            "coverage" => Value::from_serialize(&r.coverage),
            "headline" => Value::from_serialize(&r.headline),
            "root_causes" => Value::from_serialize(&r.root_causes),
            _ => return None,
        })
    }
}

impl Object for ReportObject {
    fn repr(self: &Arc<Self>) -> ObjectRepr {
        ObjectRepr::Map
    }

    fn get_value(self: &Arc<Self>, key: &Value) -> Option<Value> {
        let k = FIELDS.iter().position(|f| Some(*f) == key.as_str())?;
        Some(
            self.fields[k]
                .get_or_init(|| self.convert(FIELDS[k]).unwrap_or_default())
                .clone(),
        )
    }

    fn enumerate(self: &Arc<Self>) -> Enumerator {
        Enumerator::Str(FIELDS)
    }
}

#[derive(Debug, Clone, Copy)]
enum List {
    Findings,
    Metabolites,
    Reactions,
}

/// One long row list of the report, converted row by row when read.
#[derive(Debug)]
struct Rows(Arc<Report>, List);

impl Rows {
    fn len(&self) -> usize {
        match self.1 {
            List::Findings => self.0.findings.len(),
            List::Metabolites => self.0.metabolites.len(),
            List::Reactions => self.0.reactions.len(),
        }
    }

    fn row(&self, index: usize) -> Option<Value> {
        fn at<T: Serialize>(rows: &[T], index: usize) -> Option<Value> {
            rows.get(index).map(Value::from_serialize)
        }
        match self.1 {
            List::Findings => at(&self.0.findings, index),
            List::Metabolites => at(&self.0.metabolites, index),
            List::Reactions => at(&self.0.reactions, index),
        }
    }
}

impl Object for Rows {
    fn repr(self: &Arc<Self>) -> ObjectRepr {
        ObjectRepr::Seq
    }

    fn get_value(self: &Arc<Self>, key: &Value) -> Option<Value> {
        self.row(key.as_usize()?)
    }

    fn enumerate(self: &Arc<Self>) -> Enumerator {
        Enumerator::Iter(Box::new(RowIter {
            rows: Arc::clone(self),
            next: 0,
            end: self.len(),
        }))
    }

    fn enumerator_len(self: &Arc<Self>) -> Option<usize> {
        Some(self.len())
    }
}

/// Rows in order; skipping ahead (`nth`, which slicing uses) converts
/// nothing on the way.
struct RowIter {
    rows: Arc<Rows>,
    next: usize,
    end: usize,
}

impl Iterator for RowIter {
    type Item = Value;

    fn next(&mut self) -> Option<Value> {
        if self.next >= self.end {
            return None;
        }
        self.next += 1;
        self.rows.row(self.next - 1)
    }

    fn nth(&mut self, n: usize) -> Option<Value> {
        self.next = self.next.saturating_add(n).min(self.end);
        self.next()
    }

    fn size_hint(&self) -> (usize, Option<usize>) {
        let left = self.end - self.next;
        (left, Some(left))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use minijinja::Environment;

    fn demo() -> Report {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
        crate::Project::load(&dir).expect("demo loads").analyse()
    }

    #[test]
    fn every_report_field_is_served() {
        let report = demo();
        let whole = Value::from_serialize(&report);
        let keys: Vec<String> = whole
            .try_iter()
            .unwrap()
            .map(|k| k.as_str().unwrap().to_string())
            .collect();
        assert_eq!(keys, FIELDS);
        let lazy = report_value(Arc::new(report));
        for key in FIELDS {
            let field = lazy.get_attr(key).unwrap();
            assert!(!field.is_undefined(), "{key}");
        }
        assert!(lazy.get_attr("no_such_field").unwrap().is_undefined());
    }

    #[test]
    fn templates_read_the_same_values_as_from_the_whole_tree() {
        let report = demo();
        let whole = Value::from_serialize(&report);
        let lazy = report_value(Arc::new(report.clone()));
        let mut env = Environment::new();
        let source = "{{ report.project.title }}|{{ report.reactions|length }}|\
            {% for r in report.reactions[2:4] %}{{ r.id }} {{ r.participants[0].slug }};{% endfor %}|\
            {{ report.metabolites[1].name }}|{{ report.findings|length }}|\
            {{ report.findings[0].message }}|{{ report.loops.loops|length }}|\
            {{ report.reactions[-1:]|map(attribute='id')|join(',') }}|\
            {{ 'yes' if report.findings else 'no' }}";
        env.add_template("t", source).unwrap();
        let t = env.get_template("t").unwrap();
        let a = t.render(minijinja::context! { report => whole }).unwrap();
        let b = t.render(minijinja::context! { report => lazy }).unwrap();
        assert_eq!(a, b);
        assert!(a.contains(&report.reactions[2].id), "{a}");
    }

    #[test]
    fn skipping_to_a_slice_converts_no_row_on_the_way() {
        let report = Arc::new(demo());
        let rows = Arc::new(Rows(Arc::clone(&report), List::Reactions));
        let mut iter = RowIter {
            rows,
            next: 0,
            end: report.reactions.len(),
        };
        let third = iter.nth(2).unwrap();
        assert_eq!(
            third.get_attr("id").unwrap().as_str(),
            Some(report.reactions[2].id.as_str())
        );
        assert_eq!(iter.size_hint().0, report.reactions.len() - 3);
        assert!(iter.nth(usize::MAX).is_none());
    }
}
