//! Compartment conditions set outside the model: the `compartments:` section
//! of `gibbsite.yaml` and the conditions file of `gibbsite import
//! --conditions`. SBML carries no pH or membrane potential, so an imported
//! model gets them here; a compartment nobody gave a pH or potential keeps
//! the defaults and is reported as unset.

use super::schema::{FileKind, RawConditions, RawConditionsFile};
use super::sourcemap::{Segment, SourceMap};
use super::units::{self, Kind};
use crate::error::{Diagnostic, Error, Result};
use crate::model::Model;
use std::collections::BTreeMap;
use std::path::Path;

/// Validated conditions of one compartment (internal units); unset parts
/// keep the model's value.
#[derive(Debug, Clone, PartialEq)]
pub struct CompartmentConditions {
    pub ph: Option<f64>,
    pub ionic_strength_m: Option<f64>,
    pub potential_mv: Option<f64>,
    pub temperature_k: Option<f64>,
    pub source: Option<String>,
}

impl CompartmentConditions {
    /// A pH or a potential was given (what transport verdicts hinge on).
    pub fn states_ph_or_potential(&self) -> bool {
        self.ph.is_some() || self.potential_mv.is_some()
    }
}

/// Validate a `compartments:` mapping against the model's compartments.
/// Problems go to `diagnostics` with the file and line of the entry.
pub fn validate(
    file: &Path,
    map: &SourceMap,
    raw: &BTreeMap<String, RawConditions>,
    model: &Model,
    diagnostics: &mut Vec<Diagnostic>,
) -> Vec<(usize, CompartmentConditions)> {
    let mut out = Vec::new();
    for (id, r) in raw {
        let here = vec![
            Segment::Key("compartments".into()),
            Segment::Key(id.clone()),
        ];
        let at = |key: Option<&str>| {
            let mut p = here.clone();
            if let Some(k) = key {
                p.push(Segment::Key(k.into()));
            }
            map.nearest(&p).map(|l| l.pair())
        };
        let Some(index) = model.compartments.iter().position(|c| &c.id == id) else {
            let mut d =
                Diagnostic::new(file, format!("conditions name unknown compartment `{id}`"))
                    .at_opt(map.key(&here).map(|l| l.pair()));
            d = match super::schema::did_you_mean(
                id,
                model.compartments.iter().map(|c| c.id.as_str()),
            ) {
                Some(best) => d.hint(format!("did you mean `{best}`?")),
                None => d.hint(format!(
                    "the model's compartments: {}",
                    model
                        .compartments
                        .iter()
                        .map(|c| c.id.as_str())
                        .collect::<Vec<_>>()
                        .join(", ")
                )),
            };
            diagnostics.push(d);
            continue;
        };
        let mut quantity = |key: &str, q: &Option<super::units::RawQuantity>, kind: Kind| {
            let q = q.as_ref()?;
            match units::parse(q, kind) {
                Ok(v) => Some(v),
                Err(e) => {
                    diagnostics
                        .push(Diagnostic::new(file, format!("`{key}`: {e}")).at_opt(at(Some(key))));
                    None
                }
            }
        };
        let c = CompartmentConditions {
            ph: quantity("ph", &r.ph, Kind::Plain),
            ionic_strength_m: quantity("ionic_strength", &r.ionic_strength, Kind::IonicStrength),
            potential_mv: quantity("potential", &r.potential, Kind::Potential),
            temperature_k: quantity("temperature", &r.temperature, Kind::Temperature),
            source: r.source.clone().filter(|s| !s.trim().is_empty()),
        };
        let mut ok = true;
        let mut bad = |key: &str, message: String| {
            let raw = match key {
                "ionic_strength" => r.ionic_strength.as_ref(),
                "temperature" => r.temperature.as_ref(),
                _ => None,
            };
            let slip = raw.and_then(|q| {
                let quantity = match key {
                    "ionic_strength" => super::plausibility::Quantity::IonicStrength,
                    _ => super::plausibility::Quantity::Temperature,
                };
                super::plausibility::unit_slip(quantity, q)
            });
            let mut d = Diagnostic::new(file, message).at_opt(at(Some(key)));
            d.hint = slip;
            diagnostics.push(d);
            ok = false;
        };
        if let Some(ph) = c.ph {
            if !(0.0..=14.0).contains(&ph) {
                bad("ph", format!("pH must be between 0 and 14, found {ph}"));
            }
        }
        if let Some(i) = c.ionic_strength_m {
            if !(0.0..=10.0).contains(&i) {
                bad(
                    "ionic_strength",
                    format!("ionic strength must be between 0 and 10 M, found {i} M"),
                );
            }
        }
        if let Some(t) = c.temperature_k {
            if t <= 0.0 {
                bad(
                    "temperature",
                    format!("temperature must be above 0 K, found {t} K"),
                );
            }
        }
        if let Some(p) = c.potential_mv {
            if !p.is_finite() {
                bad("potential", format!("potential must be finite, found {p}"));
            }
        }
        if ok {
            out.push((index, c));
        }
    }
    out
}

/// Set the given conditions on the model's compartments.
pub fn apply(model: &mut Model, conditions: &[(usize, CompartmentConditions)]) {
    for (index, c) in conditions {
        let compartment = &mut model.compartments[*index];
        if let Some(v) = c.ph {
            compartment.ph = v;
        }
        if let Some(v) = c.ionic_strength_m {
            compartment.ionic_strength_m = v;
        }
        if let Some(v) = c.potential_mv {
            compartment.potential_mv = v;
        }
        if let Some(v) = c.temperature_k {
            compartment.temperature_k = Some(v);
        }
    }
}

/// Read a conditions file (`compartments:` as in `gibbsite.yaml`) for
/// `model`; every problem is reported with its line.
pub fn read_file(path: &Path, model: &Model) -> Result<Vec<(usize, CompartmentConditions)>> {
    let text = super::read_text(path)?;
    let mut diagnostics = Vec::new();
    let Some(parsed) = super::yaml::parse::<RawConditionsFile>(
        path,
        &text,
        FileKind::Conditions,
        &mut diagnostics,
    ) else {
        return Err(Error::Input(diagnostics));
    };
    let out = validate(
        path,
        &parsed.map,
        &parsed.value.compartments,
        model,
        &mut diagnostics,
    );
    if parsed.value.compartments.is_empty() {
        diagnostics.push(Diagnostic::new(
            path,
            "the conditions file sets no compartment; expected `compartments: {<id>: {ph: …, potential: …}}`",
        ));
    }
    if diagnostics.is_empty() {
        Ok(out)
    } else {
        Err(Error::Input(diagnostics))
    }
}

/// The `compartments:` section of `gibbsite.yaml` for these conditions.
pub fn to_yaml(model: &Model, conditions: &[(usize, CompartmentConditions)]) -> String {
    let mut out = String::from(
        "# Conditions per compartment (SBML carries none; see the README):\ncompartments:\n",
    );
    for (index, c) in conditions {
        let mut parts = Vec::new();
        if let Some(v) = c.ph {
            parts.push(format!("ph: {v}"));
        }
        if let Some(v) = c.ionic_strength_m {
            parts.push(format!("ionic_strength: {v} M"));
        }
        if let Some(v) = c.potential_mv {
            parts.push(format!("potential: {v} mV"));
        }
        if let Some(v) = c.temperature_k {
            parts.push(format!("temperature: {v} K"));
        }
        if let Some(s) = &c.source {
            parts.push(format!("source: {}", json_string(s)));
        }
        out.push_str(&format!(
            "  {}: {{{}}}\n",
            json_string(&model.compartments[*index].id),
            parts.join(", ")
        ));
    }
    out
}

/// A JSON string is a valid YAML double-quoted scalar.
fn json_string(s: &str) -> String {
    serde_json::to_string(s).unwrap_or_else(|_| "\"\"".into())
}
