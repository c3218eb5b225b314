//! The numbers behind a finding, as a reader sees them: a label in words
//! and symbols (ΔG′ min, ΔrG′°, σ …), the value rounded as the message
//! rounds it, and its unit. The raw keys (`dg_min`, `drg0` …) stay in
//! report.json, where programs read them.

use super::format;
use serde::Serialize;
use std::collections::BTreeMap;

/// One labelled value of a finding's evidence.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Item {
    pub label: String,
    pub value: String,
    /// Unit after the value ("kJ/mol", "K" …), empty for counts.
    pub unit: &'static str,
    /// The raw key, kept as a tooltip for readers of report.json.
    pub key: String,
}

/// How a key's value is written.
#[derive(Clone, Copy)]
enum Kind {
    /// kJ/mol, two decimals (as the messages write energies).
    Energy,
    /// A whole number of things.
    Count,
    /// A flux or bound, in the model's flux units.
    Flux,
    /// Temperature in K.
    Kelvin,
    /// Concentration in mol/L, with an SI prefix.
    Molar,
    /// Plain number (pH, an element balance).
    Plain,
}

/// Label and kind of every key the checks write; unknown keys fall back to
/// their name with underscores as spaces.
fn describe(key: &str) -> (String, Kind) {
    let known: Option<(&str, Kind)> = match key {
        "drg0" => Some(("ΔrG′°", Kind::Energy)),
        "sigma" => Some(("σ", Kind::Energy)),
        "allowance" => Some(("uncertainty allowance", Kind::Energy)),
        "dg_min" => Some(("ΔG′ min", Kind::Energy)),
        "dg_max" => Some(("ΔG′ max", Kind::Energy)),
        "drg0_sum" => Some(("Σ ν·ΔrG′° around the loop", Kind::Energy)),
        "dg_min_of_suggested" => Some(("ΔG′ min of the suggested step", Kind::Energy)),
        "allowance_of_suggested" => Some(("allowance of the suggested step", Kind::Energy)),
        "overall_dg" => Some(("overall ΔG′ of the set", Kind::Energy)),
        "required_dg" => Some(("ΔG′ the set needs", Kind::Energy)),
        "max_min_driving_force" => Some(("max-min driving force", Kind::Energy)),
        "value" => Some(("ΔfG′° given", Kind::Energy)),
        "possible_error" => Some(("possible error", Kind::Energy)),
        "flux" => Some(("flux", Kind::Flux)),
        "cycle_flux" => Some(("flux around the cycle", Kind::Flux)),
        "lower_bound" => Some(("lower bound", Kind::Flux)),
        "upper_bound" => Some(("upper bound", Kind::Flux)),
        "members" => Some(("reactions in the loop", Kind::Count)),
        "set_size" => Some(("reactions in the set", Kind::Count)),
        "metabolites" => Some(("metabolites", Kind::Count)),
        "missing_metabolites" => Some(("metabolites without ΔfG′°", Kind::Count)),
        "reactions_without_energy" => Some(("internal reactions without ΔrG′°", Kind::Count)),
        "internal_reactions" => Some(("internal reactions", Kind::Count)),
        "example_reactions" => Some(("reactions in the example", Kind::Count)),
        "unset_compartments" => Some(("compartments without conditions", Kind::Count)),
        "compartments" => Some(("compartments", Kind::Count)),
        "affected_reactions" => Some(("reactions affected", Kind::Count)),
        "temperature" => Some(("temperature", Kind::Kelvin)),
        "ionic_strength" => Some(("ionic strength", Kind::Molar)),
        "ph" => Some(("pH", Kind::Plain)),
        "charge" => Some(("charge (products − substrates)", Kind::Plain)),
        _ => None,
    };
    match known {
        Some((label, kind)) => (label.to_string(), kind),
        // Element balances are written "C atoms", "H atoms".
        None if key.ends_with(" atoms") => (format!("{key} (products − substrates)"), Kind::Plain),
        None => (key.replace('_', " "), Kind::Plain),
    }
}

/// The evidence of a finding as labelled, rounded values with units, in the
/// order of the keys (report.json's order).
pub fn items(evidence: &BTreeMap<String, f64>) -> Vec<Item> {
    evidence
        .iter()
        .map(|(key, &v)| {
            let (label, kind) = describe(key);
            let (value, unit) = match kind {
                Kind::Energy => (format::energy(v), "kJ/mol"),
                Kind::Count if v.fract() == 0.0 && v.abs() < 1e15 => {
                    (format!("{}", v as i64).replace('-', "−"), "")
                }
                Kind::Count | Kind::Flux | Kind::Plain => (format::number(v), ""),
                Kind::Kelvin => (format::number(v), "K"),
                Kind::Molar => (format::concentration(v), ""),
            };
            Item {
                label,
                value,
                unit,
                key: key.clone(),
            }
        })
        .collect()
}

/// Registers the `evidence_items` filter.
pub fn register(env: &mut minijinja::Environment<'_>) {
    env.add_filter(
        "evidence_items",
        |v: minijinja::value::Value| -> Result<minijinja::value::Value, minijinja::Error> {
            let map: BTreeMap<String, f64> = serde::Deserialize::deserialize(v)?;
            Ok(minijinja::value::Value::from_serialize(items(&map)))
        },
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keys_become_labels_with_units_and_the_messages_rounding() {
        let ev: BTreeMap<String, f64> = [
            ("dg_min", 6.29652),
            ("drg0", -30.456),
            ("sigma", 1.2),
            ("members", 3.0),
            ("H atoms", -1.0),
            ("ionic_strength", 0.25),
            ("temperature", 310.15),
            ("some_new_key", 2.5),
        ]
        .iter()
        .map(|(k, v)| (k.to_string(), *v))
        .collect();
        let got: Vec<(String, String, &str)> = items(&ev)
            .into_iter()
            .map(|i| (i.label, i.value, i.unit))
            .collect();
        assert_eq!(
            got,
            vec![
                ("H atoms (products − substrates)".into(), "−1".into(), ""),
                ("ΔG′ min".into(), "6.30".into(), "kJ/mol"),
                ("ΔrG′°".into(), "−30.46".into(), "kJ/mol"),
                ("ionic strength".into(), "250 mM".into(), ""),
                ("reactions in the loop".into(), "3".into(), ""),
                ("σ".into(), "1.20".into(), "kJ/mol"),
                ("some new key".into(), "2.5".into(), ""),
                ("temperature".into(), "310.15".into(), "K"),
            ]
        );
    }
}
