//! The YAML formats as written by users (model format v1 and `gibbsite.yaml`),
//! before validation. Values with units stay raw here; `load` converts them.
//!
//! Unknown keys are not rejected by serde (that would stop at the first);
//! `load` collects all of them with `serde_ignored` and this module's
//! [`expected_fields`] supplies the "did you mean" candidates.

use super::sourcemap::Segment;
use super::units::RawQuantity;
use serde::de::{self, Deserialize, Deserializer, Visitor};
use std::collections::BTreeMap;

/// A model file (format v1).
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawModelFile {
    /// Optional format marker, `gibbsite-model/1`.
    pub format: Option<String>,
    pub id: Option<String>,
    pub title: Option<String>,
    pub temperature: Option<RawQuantity>,
    /// Reaction id → objective coefficient (flux-balance objective).
    #[serde(default)]
    pub objective: BTreeMap<String, RawQuantity>,
    #[serde(default)]
    pub compartments: Vec<RawCompartment>,
    #[serde(default)]
    pub metabolites: Vec<RawMetabolite>,
    #[serde(default)]
    pub reactions: Vec<RawReaction>,
    #[serde(default)]
    pub scenarios: Vec<RawScenario>,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawCompartment {
    pub id: String,
    pub name: Option<String>,
    pub ph: Option<RawQuantity>,
    pub ionic_strength: Option<RawQuantity>,
    pub potential: Option<RawQuantity>,
    pub temperature: Option<RawQuantity>,
    pub pmg: Option<RawQuantity>,
}

/// An energy with its uncertainty and source.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawEnergy {
    pub value: RawQuantity,
    pub sigma: Option<RawQuantity>,
    pub source: Option<String>,
    /// Conditions a ΔfG'° was stated at (formation energies only).
    pub at: Option<RawStatedConditions>,
}

/// `at: {ph, ionic_strength, temperature}`: any subset.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawStatedConditions {
    pub ph: Option<RawQuantity>,
    pub ionic_strength: Option<RawQuantity>,
    pub temperature: Option<RawQuantity>,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawRange {
    pub min: RawQuantity,
    pub max: RawQuantity,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawSpecies {
    pub dfg0: RawQuantity,
    pub dfh0: Option<RawQuantity>,
    pub charge: i32,
    pub hydrogens: u32,
    #[serde(default)]
    pub magnesium: u32,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawSpeciesData {
    pub sigma: Option<RawQuantity>,
    pub source: Option<String>,
    pub forms: Vec<RawSpecies>,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawMetabolite {
    pub id: String,
    pub name: Option<String>,
    pub compartment: String,
    pub formula: Option<String>,
    pub charge: Option<i32>,
    /// ΔfG'° at the compartment's conditions.
    pub formation_energy: Option<RawEnergy>,
    pub species: Option<RawSpeciesData>,
    pub library: Option<String>,
    pub concentration: Option<RawRange>,
    pub measured: Option<RawQuantity>,
    /// `proton` or `water`; detected from the formula when absent.
    pub special: Option<String>,
    #[serde(default)]
    pub xrefs: BTreeMap<String, OneOrMany>,
    pub sbo: Option<String>,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawReaction {
    pub id: String,
    pub name: Option<String>,
    pub equation: String,
    pub bounds: Option<Vec<RawQuantity>>,
    /// ΔrG'°, overriding the formation-energy sum.
    pub reaction_energy: Option<RawEnergy>,
    pub group: Option<String>,
    pub role: Option<String>,
    pub sbo: Option<String>,
    #[serde(default)]
    pub xrefs: BTreeMap<String, OneOrMany>,
}

#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawScenario {
    pub id: String,
    pub description: Option<String>,
    /// Reaction id → flux.
    #[serde(default)]
    pub fluxes: BTreeMap<String, RawQuantity>,
    /// CSV file (`reaction,flux`) relative to the file naming it.
    pub file: Option<String>,
}

/// `gibbsite.yaml`: project settings.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawSettings {
    pub title: Option<String>,
    /// Model file or files, relative to the project folder.
    pub model: OneOrMany,
    /// Folder of Markdown notes (default `notes` when present).
    pub notes: Option<String>,
    /// Folder overriding theme files one by one.
    pub theme: Option<String>,
    /// Confidence level of verdicts, between 0.5 and 0.9999 (default 0.95).
    pub confidence: Option<f64>,
    pub default_concentration: Option<RawRange>,
    /// Smallest driving force counted as comfortable (default 1 kJ/mol).
    pub min_driving_force: Option<RawQuantity>,
    /// Extra flux scenarios from CSV files.
    #[serde(default)]
    pub scenarios: Vec<RawScenario>,
    /// Side tables (CSV/TSV) of ΔfG'°, species data, ΔrG'° or concentrations.
    pub tables: Option<OneOrMany>,
    /// Look for internal loops and energy-generating cycles (default true).
    pub loops: Option<bool>,
    /// Further independent conflicting sets searched after the first in an
    /// infeasible scenario (default 5).
    pub conflict_sets: Option<usize>,
    /// Currency key (`atp`, `adp`, `pi`, `h`, `h2o`, `nadh`, …) → metabolite
    /// ids, replacing automatic recognition for energy-generating cycles.
    #[serde(default)]
    pub currencies: BTreeMap<String, OneOrMany>,
    /// Reaction id → role, overriding the model (and SBML inference).
    #[serde(default)]
    pub roles: BTreeMap<String, String>,
    /// Compartment id → conditions, overriding the model's (SBML has none).
    #[serde(default)]
    pub compartments: BTreeMap<String, RawConditions>,
    /// How the network maps draw metabolites.
    pub maps: Option<RawMapSettings>,
}

/// `maps:` in `gibbsite.yaml`: metabolite ids overriding the automatic
/// choice of side compounds (drawn as small labels on their reactions).
#[derive(Debug, Clone, Default, serde::Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMapSettings {
    /// Always drawn as side labels.
    #[serde(default)]
    pub side: Vec<String>,
    /// Always drawn as nodes, even when recognised as side compounds.
    #[serde(default)]
    pub main: Vec<String>,
}

/// Conditions of one compartment set in `gibbsite.yaml` or a conditions file.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawConditions {
    pub ph: Option<RawQuantity>,
    pub ionic_strength: Option<RawQuantity>,
    pub potential: Option<RawQuantity>,
    pub temperature: Option<RawQuantity>,
    /// Where the values come from (shown in the report).
    pub source: Option<String>,
}

/// A conditions file for `gibbsite import --conditions`.
#[derive(Debug, Clone, serde::Deserialize)]
pub struct RawConditionsFile {
    #[serde(default)]
    pub compartments: BTreeMap<String, RawConditions>,
}

/// A string or a list of strings.
#[derive(Debug, Clone, PartialEq)]
pub struct OneOrMany(pub Vec<String>);

impl<'de> Deserialize<'de> for OneOrMany {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        struct V;
        impl<'de> Visitor<'de> for V {
            type Value = OneOrMany;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("a string or a list of strings")
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<OneOrMany, E> {
                Ok(OneOrMany(vec![v.to_string()]))
            }
            fn visit_seq<A: de::SeqAccess<'de>>(self, mut seq: A) -> Result<OneOrMany, A::Error> {
                let mut out = Vec::new();
                while let Some(s) = seq.next_element::<String>()? {
                    out.push(s);
                }
                Ok(OneOrMany(out))
            }
        }
        deserializer.deserialize_any(V)
    }
}

/// Which file format a path belongs to, for [`expected_fields`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileKind {
    Model,
    Settings,
    /// A compartment conditions file (`import --conditions`).
    Conditions,
}

/// Field names valid at `path` (the parent of an unknown key), if it is a struct.
pub fn expected_fields(kind: FileKind, path: &[Segment]) -> Option<&'static [&'static str]> {
    use Segment::{Index, Key};
    let k = |s: &Segment, name: &str| matches!(s, Key(x) if x == name);
    let fields = match (kind, path) {
        (FileKind::Model, []) => fields_of::<RawModelFile>(),
        (FileKind::Model, [a, Index(_)]) if k(a, "compartments") => fields_of::<RawCompartment>(),
        (FileKind::Model, [a, Index(_)]) if k(a, "metabolites") => fields_of::<RawMetabolite>(),
        (FileKind::Model, [a, Index(_), b]) if k(a, "metabolites") && k(b, "formation_energy") => {
            fields_of::<RawEnergy>()
        }
        (FileKind::Model, [a, Index(_), b, c])
            if k(a, "metabolites") && k(b, "formation_energy") && k(c, "at") =>
        {
            fields_of::<RawStatedConditions>()
        }
        (FileKind::Model, [a, Index(_), b]) if k(a, "metabolites") && k(b, "concentration") => {
            fields_of::<RawRange>()
        }
        (FileKind::Model, [a, Index(_), b]) if k(a, "metabolites") && k(b, "species") => {
            fields_of::<RawSpeciesData>()
        }
        (FileKind::Model, [a, Index(_), b, c, Index(_)])
            if k(a, "metabolites") && k(b, "species") && k(c, "forms") =>
        {
            fields_of::<RawSpecies>()
        }
        (FileKind::Model, [a, Index(_)]) if k(a, "reactions") => fields_of::<RawReaction>(),
        (FileKind::Model, [a, Index(_), b]) if k(a, "reactions") && k(b, "reaction_energy") => {
            fields_of::<RawEnergy>()
        }
        (FileKind::Model, [a, Index(_)]) if k(a, "scenarios") => fields_of::<RawScenario>(),
        (FileKind::Settings, []) => fields_of::<RawSettings>(),
        (FileKind::Settings, [a]) if k(a, "default_concentration") => fields_of::<RawRange>(),
        (FileKind::Settings, [a, Index(_)]) if k(a, "scenarios") => fields_of::<RawScenario>(),
        (FileKind::Settings | FileKind::Conditions, [a, Key(_)]) if k(a, "compartments") => {
            fields_of::<RawConditions>()
        }
        (FileKind::Conditions, []) => fields_of::<RawConditionsFile>(),
        _ => return None,
    };
    Some(fields)
}

/// The field names serde knows for a struct, read by asking the type to
/// deserialise itself from a probe that records the names and then fails.
fn fields_of<'de, T: Deserialize<'de>>() -> &'static [&'static str] {
    struct Probe<'a>(&'a mut &'static [&'static str]);

    #[derive(Debug)]
    struct Stop;
    impl std::fmt::Display for Stop {
        fn fmt(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
            f.write_str("field probe")
        }
    }
    impl std::error::Error for Stop {}
    impl de::Error for Stop {
        fn custom<M: std::fmt::Display>(_: M) -> Self {
            Stop
        }
    }

    impl<'de> Deserializer<'de> for Probe<'_> {
        type Error = Stop;
        fn deserialize_any<V: Visitor<'de>>(self, _: V) -> Result<V::Value, Stop> {
            Err(Stop)
        }
        fn deserialize_struct<V: Visitor<'de>>(
            self,
            _: &'static str,
            fields: &'static [&'static str],
            _: V,
        ) -> Result<V::Value, Stop> {
            *self.0 = fields;
            Err(Stop)
        }
        serde::forward_to_deserialize_any! {
            bool i8 i16 i32 i64 i128 u8 u16 u32 u64 u128 f32 f64 char str string
            bytes byte_buf option unit unit_struct newtype_struct seq tuple
            tuple_struct map enum identifier ignored_any
        }
    }

    let mut fields: &'static [&'static str] = &[];
    let _ = T::deserialize(Probe(&mut fields));
    fields
}

/// Names longer than this get no "did you mean" (no id is that long; the
/// comparison would cost time in proportion to the square of the length).
pub const MAX_SUGGESTED_LENGTH: usize = 200;

/// Suggestions made per load: each compares against every id of the model,
/// so 10,000 unknown names in a Recon3D project would cost 10⁸ comparisons.
/// Past this many, unknown names are still reported, without a hint.
pub const MAX_SUGGESTIONS: usize = 100;

thread_local! {
    static SUGGESTIONS_LEFT: std::cell::Cell<usize> = const { std::cell::Cell::new(MAX_SUGGESTIONS) };
}

/// Give a new load its full number of suggestions.
pub fn reset_suggestions() {
    SUGGESTIONS_LEFT.with(|left| left.set(MAX_SUGGESTIONS));
}

/// The closest candidate to a misspelt name, if one is close enough. Only
/// candidates of similar length are compared (a close match cannot differ
/// much in length), and at most [`MAX_SUGGESTIONS`] names per load are
/// looked up, so a model with thousands of ids and many unknown names stays
/// fast.
pub fn did_you_mean<'a>(
    unknown: &str,
    candidates: impl IntoIterator<Item = &'a str>,
) -> Option<&'a str> {
    let length = unknown.chars().count();
    if length > MAX_SUGGESTED_LENGTH {
        return None;
    }
    let budget_left = SUGGESTIONS_LEFT.with(|left| {
        let n = left.get();
        left.set(n.saturating_sub(1));
        n > 0
    });
    if !budget_left {
        return None;
    }
    let slack = length / 4 + 2;
    candidates
        .into_iter()
        .filter(|c| c.len().abs_diff(unknown.len()) <= 4 * slack)
        .filter(|c| c.chars().count().abs_diff(length) <= slack)
        .map(|c| (strsim::jaro_winkler(unknown, c), c))
        .filter(|(score, _)| *score > 0.8)
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .map(|(_, c)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn probe_reads_struct_fields() {
        let fields = fields_of::<RawRange>();
        assert_eq!(fields, &["min", "max"]);
        let reaction = expected_fields(
            FileKind::Model,
            &[Segment::Key("reactions".into()), Segment::Index(4)],
        )
        .unwrap();
        assert!(reaction.contains(&"equation"));
        assert!(reaction.contains(&"reaction_energy"));
    }

    #[test]
    fn suggestions_for_typos() {
        assert_eq!(
            did_you_mean("equaton", ["id", "equation", "bounds"]),
            Some("equation")
        );
        assert_eq!(did_you_mean("zzz", ["id", "equation"]), None);
        // Long names and far-off lengths are not compared at all.
        let long = "x".repeat(MAX_SUGGESTED_LENGTH + 1);
        assert_eq!(did_you_mean(&long, [long.as_str()]), None);
        assert_eq!(did_you_mean("atp_c", ["atp_c_and_much_more"]), None);
        assert_eq!(did_you_mean("atpc", ["atp_c"]), Some("atp_c"));
        // The per-load budget: after it, no more lookups until a reset.
        for _ in 0..MAX_SUGGESTIONS {
            did_you_mean("x", ["y"]);
        }
        assert_eq!(did_you_mean("atpc", ["atp_c"]), None);
        reset_suggestions();
        assert_eq!(did_you_mean("atpc", ["atp_c"]), Some("atp_c"));
    }
}
