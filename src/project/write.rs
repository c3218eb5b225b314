//! Writing a [`Model`] as a gibbsite project (model format v1 + settings),
//! the output of `gibbsite import`. Reading the written YAML back gives the
//! identical model (tested).
//!
//! Each compartment, metabolite, reaction and scenario is one flow mapping on
//! one line: compact for genome-scale models, easy to diff and to edit.
//! String values are written as JSON strings, which are valid YAML
//! double-quoted scalars; numbers use Rust's shortest round-trip form.

use super::model_file::detect_special;
use crate::error::{Error, Result};
use crate::model::{Energy, Model, Range, Role, Special};
use std::fmt::Write as _;
use std::path::Path;

/// The model file in format v1.
pub fn model_to_yaml(model: &Model) -> String {
    let mut out = String::with_capacity(300 * (model.metabolites.len() + model.reactions.len()));
    out.push_str("# Written by gibbsite import. Format: gibbsite-model/1 (see the README).\n");
    out.push_str("format: gibbsite-model/1\n");
    let _ = writeln!(out, "id: {}", q(&model.id));
    let _ = writeln!(out, "title: {}", q(&model.title));
    let _ = writeln!(out, "temperature: {} K", n(model.temperature_k));
    if !model.objective.is_empty() {
        out.push_str("objective: {");
        let items: Vec<String> = model
            .objective
            .iter()
            .map(|&(j, c)| format!("{}: {}", q(&model.reactions[j].id), n(c)))
            .collect();
        out.push_str(&items.join(", "));
        out.push_str("}\n");
    }

    out.push_str("\ncompartments:\n");
    for c in &model.compartments {
        let mut f = Flow::default();
        f.str("id", &c.id);
        f.str("name", &c.name);
        // Defaults are left out, so that the project still says nobody
        // stated them (SBML carries no pH or potential).
        if c.ph != super::model_file::DEFAULT_PH {
            f.raw("ph", n(c.ph));
        }
        if c.ionic_strength_m != super::model_file::DEFAULT_IONIC_STRENGTH_M {
            f.raw("ionic_strength", format!("{} M", n(c.ionic_strength_m)));
        }
        if c.potential_mv != 0.0 {
            f.raw("potential", format!("{} mV", n(c.potential_mv)));
        }
        if let Some(t) = c.temperature_k {
            f.raw("temperature", format!("{} K", n(t)));
        }
        if let Some(p) = c.pmg {
            f.raw("pmg", n(p));
        }
        f.line(&mut out);
    }

    out.push_str("\nmetabolites:\n");
    for m in &model.metabolites {
        let mut f = Flow::default();
        f.str("id", &m.id);
        f.str("name", &m.name);
        f.str("compartment", &model.compartments[m.compartment].id);
        if let Some(x) = &m.formula {
            f.str("formula", x);
        }
        if let Some(z) = m.charge {
            f.raw("charge", z.to_string());
        }
        if let Some(e) = &m.dfg_prime {
            f.raw("formation_energy", energy(e));
        }
        if let Some(s) = &m.species {
            let forms: Vec<String> = s
                .species
                .iter()
                .map(|sp| {
                    let mut g = Flow::default();
                    g.raw("dfg0", format!("{} kJ/mol", n(sp.dfg0_kj)));
                    if let Some(h) = sp.dfh0_kj {
                        g.raw("dfh0", format!("{} kJ/mol", n(h)));
                    }
                    g.raw("charge", sp.charge.to_string());
                    g.raw("hydrogens", sp.hydrogens.to_string());
                    if sp.magnesium > 0 {
                        g.raw("magnesium", sp.magnesium.to_string());
                    }
                    g.finish()
                })
                .collect();
            let mut g = Flow::default();
            g.raw("sigma", format!("{} kJ/mol", n(s.sigma_kj)));
            if !s.source.is_empty() {
                g.str("source", &s.source);
            }
            g.raw("forms", format!("[{}]", forms.join(", ")));
            f.raw("species", g.finish());
        }
        if let Some(l) = &m.library {
            f.str("library", l);
        }
        if let Some(r) = &m.concentration {
            f.raw("concentration", range(r));
        }
        if let Some(v) = m.measured_m {
            f.raw("measured", format!("{} M", n(v)));
        }
        if m.special != detect_special(m.formula.as_deref(), m.charge) {
            f.raw(
                "special",
                match m.special {
                    Special::None => "none",
                    Special::Proton => "proton",
                    Special::Water => "water",
                }
                .into(),
            );
        }
        if !m.xrefs.is_empty() {
            f.raw("xrefs", xrefs(&m.xrefs));
        }
        if let Some(s) = &m.sbo {
            f.str("sbo", s);
        }
        f.line(&mut out);
    }

    out.push_str("\nreactions:\n");
    for (j, r) in model.reactions.iter().enumerate() {
        let mut f = Flow::default();
        f.str("id", &r.id);
        f.str("name", &r.name);
        f.str("equation", &equation(model, j));
        f.raw(
            "bounds",
            format!("[{}, {}]", n(r.lower_bound), n(r.upper_bound)),
        );
        if let Some(e) = &r.drg_prime {
            f.raw("reaction_energy", energy(e));
        }
        if let Some(g) = &r.group {
            f.str("group", g);
        }
        if r.role != Role::Internal {
            f.raw("role", r.role.slug().into());
        }
        if let Some(s) = &r.sbo {
            f.str("sbo", s);
        }
        if !r.xrefs.is_empty() {
            f.raw("xrefs", xrefs(&r.xrefs));
        }
        f.line(&mut out);
    }

    if !model.scenarios.is_empty() {
        out.push_str("\nscenarios:\n");
        for s in &model.scenarios {
            let mut f = Flow::default();
            f.str("id", &s.id);
            if !s.description.is_empty() {
                f.str("description", &s.description);
            }
            let fluxes: Vec<String> = s
                .fluxes
                .iter()
                .map(|&(j, v)| format!("{}: {}", q(&model.reactions[j].id), n(v)))
                .collect();
            f.raw("fluxes", format!("{{{}}}", fluxes.join(", ")));
            f.line(&mut out);
        }
    }
    out
}

/// Settings for an imported model: defaults written out so users see them.
pub fn settings_yaml(title: &str, model_file: &str) -> String {
    format!(
        "# Project settings (see the README for every key).\n\
         title: {}\n\
         model: {}\n\
         confidence: 0.95\n\
         default_concentration: {{min: 1 uM, max: 10 mM}}\n\
         min_driving_force: 1 kJ/mol\n\
         # Side tables of ΔG data and concentrations (CSV or TSV):\n\
         # tables: [dfg.csv, drg.csv]\n\
         # Override an inferred reaction role:\n\
         # roles: {{R_ATPM: internal}}\n",
        q(title),
        q(model_file)
    )
}

/// Write `model.yaml` and `gibbsite.yaml` into `dir` (created if needed);
/// refuses when `dir` already holds either file.
pub fn write_project(model: &Model, dir: &Path) -> Result<()> {
    write_project_with_conditions(model, dir, &[], false)
}

/// As [`write_project`], with compartment conditions written into
/// `gibbsite.yaml` (`gibbsite import --conditions`); with `force`, existing
/// files are replaced (only after both new ones were written completely).
pub fn write_project_with_conditions(
    model: &Model,
    dir: &Path,
    conditions: &[(usize, super::conditions::CompartmentConditions)],
    force: bool,
) -> Result<()> {
    if !force {
        let existing: Vec<&str> = ["model.yaml", super::SETTINGS_FILE]
            .into_iter()
            .filter(|name| std::fs::symlink_metadata(dir.join(name)).is_ok())
            .collect();
        if !existing.is_empty() {
            return Err(Error::input(
                crate::error::Diagnostic::new(
                    dir,
                    format!(
                        "already holds {}; refusing to overwrite a project",
                        existing.join(" and ")
                    ),
                )
                .hint("pass --force to replace it, or choose another folder"),
            ));
        }
    }
    std::fs::create_dir_all(dir).map_err(|e| Error::output(dir, e))?;
    let mut settings = settings_yaml(&model.title, "model.yaml");
    if !conditions.is_empty() {
        settings.push_str(&super::conditions::to_yaml(model, conditions));
    }
    let files = [
        ("model.yaml", model_to_yaml(model)),
        (super::SETTINGS_FILE, settings),
    ];
    let mut staged = Vec::new();
    for (name, text) in &files {
        let tmp = dir.join(format!(".{name}.partial"));
        if let Err(e) = std::fs::write(&tmp, text) {
            for t in &staged {
                let _ = std::fs::remove_file(t);
            }
            let _ = std::fs::remove_file(&tmp);
            return Err(Error::output(&tmp, e));
        }
        staged.push(tmp);
    }
    for ((name, _), tmp) in files.iter().zip(&staged) {
        let target = dir.join(name);
        std::fs::rename(tmp, &target).map_err(|e| Error::output(&target, e))?;
    }
    Ok(())
}

/// `2 a + b -> c`, with the arrow matching the bounds.
fn equation(model: &Model, j: usize) -> String {
    let r = &model.reactions[j];
    let side = |negative: bool| {
        r.stoichiometry
            .iter()
            .filter(|(_, c)| (*c < 0.0) == negative)
            .map(|&(i, c)| {
                let id = &model.metabolites[i].id;
                if c.abs() == 1.0 {
                    id.clone()
                } else {
                    format!("{} {id}", n(c.abs()))
                }
            })
            .collect::<Vec<_>>()
            .join(" + ")
    };
    let arrow = if r.lower_bound >= 0.0 {
        "->"
    } else if r.upper_bound <= 0.0 {
        "<-"
    } else {
        "<->"
    };
    format!("{} {arrow} {}", side(true), side(false))
        .trim()
        .to_string()
}

fn energy(e: &Energy) -> String {
    let mut f = Flow::default();
    f.raw("value", format!("{} kJ/mol", n(e.value_kj)));
    f.raw("sigma", format!("{} kJ/mol", n(e.sigma_kj)));
    if !e.source.is_empty() {
        f.str("source", &e.source);
    }
    if let Some(at) = &e.at {
        let mut a = Flow::default();
        if let Some(ph) = at.ph {
            a.raw("ph", n(ph));
        }
        if let Some(i) = at.ionic_strength_m {
            a.raw("ionic_strength", format!("{} M", n(i)));
        }
        if let Some(t) = at.temperature_k {
            a.raw("temperature", format!("{} K", n(t)));
        }
        f.raw("at", a.finish());
    }
    f.finish()
}

fn range(r: &Range) -> String {
    format!("{{min: {} M, max: {} M}}", n(r.min), n(r.max))
}

fn xrefs(map: &std::collections::BTreeMap<String, Vec<String>>) -> String {
    let items: Vec<String> = map
        .iter()
        .map(|(k, v)| {
            let ids: Vec<String> = v.iter().map(|s| q(s)).collect();
            format!("{}: [{}]", q(k), ids.join(", "))
        })
        .collect();
    format!("{{{}}}", items.join(", "))
}

/// A flow mapping built key by key.
#[derive(Default)]
struct Flow {
    items: Vec<String>,
}

impl Flow {
    fn str(&mut self, key: &str, value: &str) {
        self.items.push(format!("{key}: {}", q(value)));
    }
    fn raw(&mut self, key: &str, value: String) {
        self.items.push(format!("{key}: {value}"));
    }
    fn finish(self) -> String {
        format!("{{{}}}", self.items.join(", "))
    }
    fn line(self, out: &mut String) {
        out.push_str("  - ");
        out.push_str(&self.finish());
        out.push('\n');
    }
}

/// A YAML double-quoted scalar that reads back to exactly `s`: every
/// character YAML does not allow as-is (C0 and C1 controls, DEL, U+FFFE/F)
/// and those libyaml takes for line breaks (U+0085, U+2028, U+2029) or a
/// byte-order mark (U+FEFF) is written as an escape.
fn q(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + 2);
    out.push('"');
    for c in s.chars() {
        match c {
            '"' => out.push_str("\\\""),
            '\\' => out.push_str("\\\\"),
            '\n' => out.push_str("\\n"),
            '\t' => out.push_str("\\t"),
            '\r' => out.push_str("\\r"),
            '\u{0}'..='\u{1f}'
            | '\u{7f}'..='\u{9f}'
            | '\u{2028}'
            | '\u{2029}'
            | '\u{feff}'
            | '\u{fffe}'
            | '\u{ffff}' => out.push_str(&format!("\\u{:04X}", c as u32)),
            c => out.push(c),
        }
    }
    out.push('"');
    out
}

/// Shortest decimal that reads back to the same f64.
fn n(v: f64) -> String {
    format!("{v}")
}
