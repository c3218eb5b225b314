//! Validating raw model files (format v1) into a typed [`Model`].
//!
//! Every problem is collected, with the file, line and column of the value
//! concerned, so a user fixes a file in one pass.

use super::equation::{self, Arrow};
use super::plausibility::{unit_slip, Quantity};
use super::schema::{did_you_mean, RawEnergy, RawModelFile, RawRange, RawScenario};
use super::sourcemap::{Segment, SourceMap};
use super::units::{self, Kind, RawQuantity};
use crate::error::Diagnostic;
use crate::model::{
    Compartment, Energy, Metabolite, Model, Range, Reaction, Role, Scenario, Special, Species,
    SpeciesData, StatedConditions, DEFAULT_FLUX_BOUND,
};
use crate::thermo::constants::T_STANDARD_K;
use std::collections::{BTreeMap, HashMap};
use std::path::{Path, PathBuf};

/// Compartment defaults when a value is not given (documented in the README).
pub const DEFAULT_PH: f64 = 7.0;
pub const DEFAULT_IONIC_STRENGTH_M: f64 = 0.25;

/// Index given to an entity that failed validation: its id stays known so
/// references to it raise no second error. Never used to index: a model
/// with any diagnostic is discarded.
const INVALID: usize = usize::MAX;

/// One model file after parsing.
pub struct ModelSource {
    pub file: PathBuf,
    pub raw: RawModelFile,
    pub map: SourceMap,
}

/// A path into a YAML document, built from keys and indices.
fn path(parts: &[PathPart<'_>]) -> Vec<Segment> {
    parts
        .iter()
        .map(|p| match p {
            PathPart::K(k) => Segment::Key((*k).to_string()),
            PathPart::I(i) => Segment::Index(*i),
        })
        .collect()
}

enum PathPart<'a> {
    K(&'a str),
    I(usize),
}
use PathPart::{I, K};

/// Collects diagnostics for one file with its source map.
struct Reporter<'a, 'm> {
    file: &'a Path,
    map: &'m SourceMap,
    out: &'a mut Vec<Diagnostic>,
}

impl Reporter<'_, '_> {
    fn at(&mut self, segments: &[Segment], message: impl Into<String>) -> &mut Diagnostic {
        let loc = self.map.nearest(segments).map(|l| l.pair());
        self.out
            .push(Diagnostic::new(self.file, message).at_opt(loc));
        self.out.last_mut().expect("just pushed")
    }

    fn at_key(&mut self, segments: &[Segment], message: impl Into<String>) -> &mut Diagnostic {
        let loc = self.map.key(segments).map(|l| l.pair());
        self.out
            .push(Diagnostic::new(self.file, message).at_opt(loc));
        self.out.last_mut().expect("just pushed")
    }

    /// Convert a quantity or report why not.
    fn quantity(&mut self, raw: &RawQuantity, kind: Kind, segments: &[Segment]) -> Option<f64> {
        match units::parse(raw, kind) {
            Ok(v) => Some(v),
            Err(e) => {
                self.at(segments, e);
                None
            }
        }
    }

    fn energy(&mut self, raw: &RawEnergy, segments: &[Segment]) -> Option<Energy> {
        let mut value_path = segments.to_vec();
        value_path.push(Segment::Key("value".into()));
        let value = self.quantity(&raw.value, Kind::Energy, &value_path);
        let mut sigma_path = segments.to_vec();
        sigma_path.push(Segment::Key("sigma".into()));
        let sigma = match &raw.sigma {
            Some(s) => self.quantity(s, Kind::Energy, &sigma_path),
            None => Some(0.0),
        };
        if let Some(s) = sigma {
            if s < 0.0 {
                self.at(
                    &sigma_path,
                    format!("sigma must not be negative, found {s}"),
                );
                return None;
            }
        }
        let at = match &raw.at {
            Some(at) => {
                let mut at_path = segments.to_vec();
                at_path.push(Segment::Key("at".into()));
                Some(self.stated_conditions(at, &at_path)?)
            }
            None => None,
        };
        Some(Energy {
            value_kj: value?,
            sigma_kj: sigma?,
            source: raw.source.clone().unwrap_or_default(),
            at,
        })
    }

    /// `at: {ph, ionic_strength, temperature}` of a formation energy.
    fn stated_conditions(
        &mut self,
        raw: &super::schema::RawStatedConditions,
        segments: &[Segment],
    ) -> Option<StatedConditions> {
        let path = |key: &str| {
            let mut p = segments.to_vec();
            p.push(Segment::Key(key.into()));
            p
        };
        let mut ok = true;
        let mut read = |q: &Option<RawQuantity>, kind: Kind, key: &str| match q {
            Some(q) => {
                let v = self.quantity(q, kind, &path(key));
                ok &= v.is_some();
                v
            }
            None => None,
        };
        let ph = read(&raw.ph, Kind::Plain, "ph");
        let ionic = read(&raw.ionic_strength, Kind::IonicStrength, "ionic_strength");
        let temperature = read(&raw.temperature, Kind::Temperature, "temperature");
        if !ok {
            return None;
        }
        if let Some(i) = ionic.filter(|&i| i < 0.0) {
            self.at(
                &path("ionic_strength"),
                format!("ionic strength must not be negative, found {i} M"),
            );
            return None;
        }
        if let Some(t) = temperature.filter(|&t| t <= 0.0) {
            self.at(
                &path("temperature"),
                format!("temperature must be above 0 K, found {t} K"),
            );
            return None;
        }
        Some(StatedConditions {
            ph,
            ionic_strength_m: ionic,
            temperature_k: temperature,
        })
    }

    /// A concentration range: both positive, min ≤ max. `owner` names
    /// whose range it is in messages ("metabolite `atp_c`").
    fn range(&mut self, raw: &RawRange, segments: &[Segment], owner: &str) -> Option<Range> {
        let mut min_path = segments.to_vec();
        min_path.push(Segment::Key("min".into()));
        let mut max_path = segments.to_vec();
        max_path.push(Segment::Key("max".into()));
        let min = self.quantity(&raw.min, Kind::Concentration, &min_path);
        let max = self.quantity(&raw.max, Kind::Concentration, &max_path);
        let (min, max) = (min?, max?);
        let mut ok = true;
        if min <= 0.0 {
            self.at(
                &min_path,
                format!("concentration must be positive, found {min} M"),
            );
            ok = false;
        }
        if max <= 0.0 {
            self.at(
                &max_path,
                format!("concentration must be positive, found {max} M"),
            );
            ok = false;
        }
        if ok && min > max {
            // Echo the values as written: a slip in a unit shows itself.
            let written = |q: &RawQuantity| match q {
                RawQuantity::Number(n) => n.to_string(),
                RawQuantity::Text(t) => t.trim().to_string(),
            };
            self.at(
                &min_path,
                format!(
                    "min `{}` is greater than max `{}` in the concentration range of {owner}",
                    written(&raw.min),
                    written(&raw.max)
                ),
            );
            ok = false;
        }
        ok.then_some(Range { min, max })
    }
}

/// Validate a concentration range written in `gibbsite.yaml`.
pub fn validate_range(
    file: &Path,
    map: &SourceMap,
    raw: &RawRange,
    segments: &[Segment],
    out: &mut Vec<Diagnostic>,
) -> Option<Range> {
    Reporter { file, map, out }.range(raw, segments, "`default_concentration`")
}

/// Build the model from one or more files sharing one id namespace.
/// `extra_scenarios` come from `gibbsite.yaml` (file, map, scenario, index).
pub fn build(
    sources: &[ModelSource],
    extra_scenarios: &[(PathBuf, &SourceMap, RawScenario, usize)],
    diagnostics: &mut Vec<Diagnostic>,
) -> Option<Model> {
    let before = diagnostics.len();
    let first = sources.first()?;
    let mut model = Model {
        id: first
            .raw
            .id
            .clone()
            .unwrap_or_else(|| file_stem(&first.file)),
        title: String::new(),
        temperature_k: T_STANDARD_K,
        compartments: Vec::new(),
        metabolites: Vec::new(),
        reactions: Vec::new(),
        scenarios: Vec::new(),
        objective: Vec::new(),
    };
    model.title = first.raw.title.clone().unwrap_or_else(|| model.id.clone());
    if let Some(t) = &first.raw.temperature {
        let mut r = Reporter {
            file: &first.file,
            map: &first.map,
            out: diagnostics,
        };
        if let Some(value) = r.quantity(t, Kind::Temperature, &path(&[K("temperature")])) {
            match super::limits::temperature(value) {
                Err(message) => {
                    r.at(&path(&[K("temperature")]), message).hint =
                        unit_slip(Quantity::Temperature, t);
                }
                Ok(()) => model.temperature_k = value,
            }
        }
    }

    // Compartments first: metabolites refer to them.
    let mut compartment_ids: HashMap<String, usize> = HashMap::new();
    let mut first_seen: FirstSeen<'_> = HashMap::new();
    for src in sources {
        let mut r = Reporter {
            file: &src.file,
            map: &src.map,
            out: diagnostics,
        };
        for (i, raw) in src.raw.compartments.iter().enumerate() {
            let here = path(&[K("compartments"), I(i)]);
            if duplicate(&mut r, &mut first_seen, 0, &raw.id, &here, "compartment") {
                continue;
            }
            match compartment(&mut r, raw, &here) {
                Some(c)
                    if c.pmg.is_some()
                        && (c.temperature_k.unwrap_or(model.temperature_k) - T_STANDARD_K)
                            .abs()
                            > 1e-6 =>
                {
                    let t = c.temperature_k.unwrap_or(model.temperature_k);
                    let d = r.at(
                        &[here.clone(), vec![Segment::Key("pmg".into())]].concat(),
                        format!(
                            "pMg is supported at 298.15 K only, but compartment `{}` is at {t} K: gibbsite's printed sources give no ΔfH° for Mg²⁺ and its complexes, so the Mg part of the transform cannot be moved to another temperature",
                            c.id
                        ),
                    );
                    d.hint = Some(
                        "remove `pmg` (Mg complexes are then left out) or set the temperature to 25 °C"
                            .into(),
                    );
                    compartment_ids.insert(raw.id.clone(), INVALID);
                }
                Some(c) => {
                    compartment_ids.insert(c.id.clone(), model.compartments.len());
                    model.compartments.push(c);
                }
                // Keep the id known so references to it do not cascade into
                // more errors; the model is discarded anyway.
                None => {
                    compartment_ids.insert(raw.id.clone(), INVALID);
                }
            }
        }
    }

    let mut metabolite_ids: HashMap<String, usize> = HashMap::new();
    for src in sources {
        let mut r = Reporter {
            file: &src.file,
            map: &src.map,
            out: diagnostics,
        };
        for (i, raw) in src.raw.metabolites.iter().enumerate() {
            let here = path(&[K("metabolites"), I(i)]);
            if duplicate(&mut r, &mut first_seen, 1, &raw.id, &here, "metabolite") {
                continue;
            }
            match metabolite(&mut r, raw, &here, &compartment_ids) {
                Some(m) => {
                    metabolite_ids.insert(m.id.clone(), model.metabolites.len());
                    model.metabolites.push(m);
                }
                None => {
                    metabolite_ids.insert(raw.id.clone(), INVALID);
                }
            }
        }
    }

    let mut reaction_ids: HashMap<String, usize> = HashMap::new();
    for src in sources {
        let mut r = Reporter {
            file: &src.file,
            map: &src.map,
            out: diagnostics,
        };
        for (i, raw) in src.raw.reactions.iter().enumerate() {
            let here = path(&[K("reactions"), I(i)]);
            if duplicate(&mut r, &mut first_seen, 2, &raw.id, &here, "reaction") {
                continue;
            }
            match reaction(&mut r, raw, &here, &metabolite_ids, &model.metabolites) {
                Some(reaction) => {
                    reaction_ids.insert(reaction.id.clone(), model.reactions.len());
                    model.reactions.push(reaction);
                }
                None => {
                    reaction_ids.insert(raw.id.clone(), INVALID);
                }
            }
        }
    }

    for src in sources {
        let mut r = Reporter {
            file: &src.file,
            map: &src.map,
            out: diagnostics,
        };
        for (id, q) in &src.raw.objective {
            let p = path(&[K("objective"), K(id)]);
            let value = r.quantity(q, Kind::Plain, &p);
            match (reaction_ids.get(id), value) {
                (Some(&j), Some(v)) => model.objective.push((j, v)),
                (None, _) => {
                    r.at_key(&p, format!("objective names unknown reaction `{id}`"));
                }
                _ => {}
            }
        }
    }
    // Reactions in model order, whatever order the mapping was written in.
    model.objective.sort_by_key(|&(j, _)| j);

    for src in sources {
        for (i, raw) in src.raw.scenarios.iter().enumerate() {
            let mut r = Reporter {
                file: &src.file,
                map: &src.map,
                out: diagnostics,
            };
            let here = path(&[K("scenarios"), I(i)]);
            if duplicate(&mut r, &mut first_seen, 3, &raw.id, &here, "scenario") {
                continue;
            }
            if let Some(s) = scenario(&mut r, raw, &here, &reaction_ids) {
                model.scenarios.push(s);
            }
        }
    }
    for (file, map, raw, i) in extra_scenarios {
        let mut r = Reporter {
            file,
            map,
            out: diagnostics,
        };
        let here = path(&[K("scenarios"), I(*i)]);
        if duplicate(&mut r, &mut first_seen, 3, &raw.id, &here, "scenario") {
            continue;
        }
        if let Some(s) = scenario(&mut r, raw, &here, &reaction_ids) {
            model.scenarios.push(s);
        }
    }

    // An empty file, `{}` or a model without reactions would pass every
    // check by having nothing to check: say so instead (when nothing else
    // is wrong, to keep other errors in front).
    if diagnostics.len() == before && sources.iter().all(|s| s.raw.reactions.is_empty()) {
        let at = first
            .map
            .key(&[Segment::Key("reactions".into())])
            .map_or((1, 1), |l| l.pair());
        diagnostics.push(
            Diagnostic::new(&first.file, "the model defines no reactions")
                .at(at.0, at.1)
                .hint("a model file lists its reactions under `reactions:`"),
        );
    }
    (diagnostics.len() == before).then_some(model)
}

fn file_stem(file: &Path) -> String {
    file.file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "model".to_string())
}

/// Where each id was first defined: (namespace, id) → (file, map, path).
type FirstSeen<'a> = HashMap<(u8, String), (PathBuf, &'a SourceMap, Vec<Segment>)>;

/// Report a duplicate id (namespaced by `space`), pointing at both places.
fn duplicate<'m>(
    r: &mut Reporter<'_, 'm>,
    seen: &mut FirstSeen<'m>,
    space: u8,
    id: &str,
    here: &[Segment],
    what: &str,
) -> bool {
    let mut id_path = here.to_vec();
    id_path.push(Segment::Key("id".into()));
    if id.trim().is_empty() {
        r.at(&id_path, format!("{what} id must not be empty"));
        return true;
    }
    match seen.get(&(space, id.to_string())) {
        Some((file, map, path)) => {
            let first_line = map.value(path).map(|l| l.line).unwrap_or(0);
            let hint = format!("first defined at {}:{first_line}", file.display());
            let d = r.at(&id_path, format!("duplicate {what} id `{id}`"));
            d.hint = Some(hint);
            true
        }
        None => {
            seen.insert(
                (space, id.to_string()),
                (r.file.to_path_buf(), r.map, id_path),
            );
            false
        }
    }
}

fn compartment(
    r: &mut Reporter<'_, '_>,
    raw: &super::schema::RawCompartment,
    here: &[Segment],
) -> Option<Compartment> {
    let sub = |k: &str| {
        let mut p = here.to_vec();
        p.push(Segment::Key(k.into()));
        p
    };
    let mut ok = true;
    let ph = match &raw.ph {
        Some(q) => r.quantity(q, Kind::Plain, &sub("ph")),
        None => Some(DEFAULT_PH),
    };
    if let Some(ph) = ph {
        if !(0.0..=14.0).contains(&ph) {
            r.at(
                &sub("ph"),
                format!("pH must be between 0 and 14, found {ph}"),
            );
            ok = false;
        }
    }
    let ionic = match &raw.ionic_strength {
        Some(q) => r.quantity(q, Kind::IonicStrength, &sub("ionic_strength")),
        None => Some(DEFAULT_IONIC_STRENGTH_M),
    };
    if let Some(i) = ionic {
        if let Err(message) = super::limits::ionic_strength(i) {
            r.at(&sub("ionic_strength"), message).hint = raw
                .ionic_strength
                .as_ref()
                .and_then(|q| unit_slip(Quantity::IonicStrength, q));
            ok = false;
        }
    }
    let potential = match &raw.potential {
        Some(q) => r.quantity(q, Kind::Potential, &sub("potential")),
        None => Some(0.0),
    };
    if let Some(Err(message)) = potential.map(super::limits::potential) {
        r.at(&sub("potential"), message);
        ok = false;
    }
    let temperature = match &raw.temperature {
        Some(q) => match r.quantity(q, Kind::Temperature, &sub("temperature")) {
            Some(t) if super::limits::temperature(t).is_err() => {
                let message = super::limits::temperature(t).unwrap_err();
                r.at(&sub("temperature"), message).hint = unit_slip(Quantity::Temperature, q);
                None
            }
            Some(t) => Some(Some(t)),
            None => None,
        },
        None => Some(None),
    };
    let pmg = match &raw.pmg {
        Some(q) => r.quantity(q, Kind::Plain, &sub("pmg")).map(Some),
        None => Some(None),
    };
    if !ok {
        return None;
    }
    Some(Compartment {
        id: raw.id.clone(),
        name: raw.name.clone().unwrap_or_else(|| raw.id.clone()),
        ph: ph?,
        ionic_strength_m: ionic?,
        potential_mv: potential?,
        temperature_k: temperature?,
        pmg: pmg?,
    })
}

fn metabolite(
    r: &mut Reporter<'_, '_>,
    raw: &super::schema::RawMetabolite,
    here: &[Segment],
    compartments: &HashMap<String, usize>,
) -> Option<Metabolite> {
    let sub = |k: &str| {
        let mut p = here.to_vec();
        p.push(Segment::Key(k.into()));
        p
    };
    let mut ok = true;
    let compartment = compartments.get(&raw.compartment).copied();
    if compartment.is_none() {
        let d = r.at(
            &sub("compartment"),
            format!("unknown compartment `{}`", raw.compartment),
        );
        if let Some(best) = did_you_mean(&raw.compartment, compartments.keys().map(String::as_str))
        {
            d.hint = Some(format!("did you mean `{best}`?"));
        }
        ok = false;
    }
    let dfg_prime = match &raw.formation_energy {
        Some(e) => match r.energy(e, &sub("formation_energy")) {
            Some(e) => Some(e),
            None => {
                ok = false;
                None
            }
        },
        None => None,
    };
    let species = match &raw.species {
        Some(s) => species(r, s, &sub("species")),
        None => Some(None),
    };
    if species.is_none() {
        ok = false;
    }
    let concentration = match &raw.concentration {
        Some(c) => match r.range(
            c,
            &sub("concentration"),
            &format!("metabolite `{}`", raw.id),
        ) {
            Some(range) => Some(range),
            None => {
                ok = false;
                None
            }
        },
        None => None,
    };
    let measured = match &raw.measured {
        Some(q) => match r.quantity(q, Kind::Concentration, &sub("measured")) {
            Some(v) if v > 0.0 => Some(v),
            Some(v) => {
                r.at(
                    &sub("measured"),
                    format!("concentration must be positive, found {v} M"),
                );
                ok = false;
                None
            }
            None => {
                ok = false;
                None
            }
        },
        None => None,
    };
    if let Some(key) = &raw.library {
        if crate::thermo::library::lookup_key(key).is_none() {
            let keys = crate::thermo::library::Library::builtin()
                .entries()
                .iter()
                .map(|e| e.key.as_str());
            let d = r.at(&sub("library"), format!("unknown library entry `{key}`"));
            if let Some(best) = did_you_mean(&key.to_lowercase(), keys) {
                d.hint = Some(format!("did you mean `{best}`?"));
            }
            ok = false;
        }
    }
    let special = match raw.special.as_deref() {
        None => detect_special(raw.formula.as_deref(), raw.charge),
        Some("proton") => Special::Proton,
        Some("water") => Special::Water,
        Some("none") => Special::None,
        Some(other) => {
            r.at(
                &sub("special"),
                format!("unknown special `{other}`; expected `proton`, `water` or `none`"),
            );
            ok = false;
            Special::None
        }
    };
    if let Some(Err(message)) = raw.charge.map(|z| super::limits::charge(z.into())) {
        r.at(&sub("charge"), message);
        ok = false;
    }
    if !ok {
        return None;
    }
    Some(Metabolite {
        id: raw.id.clone(),
        name: raw.name.clone().unwrap_or_else(|| raw.id.clone()),
        compartment: compartment?,
        formula: raw.formula.clone(),
        charge: raw.charge,
        dfg_prime,
        species: species?,
        library: raw.library.clone(),
        concentration,
        measured_m: measured,
        special,
        xrefs: raw
            .xrefs
            .iter()
            .map(|(k, v)| (k.clone(), v.0.clone()))
            .collect::<BTreeMap<_, _>>(),
        sbo: raw.sbo.clone(),
    })
}

/// H+ (formula `H`, charge +1) and water (`H2O`) are recognised by formula;
/// `special:` in the model overrides.
pub fn detect_special(formula: Option<&str>, charge: Option<i32>) -> Special {
    match (formula.map(str::trim), charge) {
        (Some("H"), Some(1)) => Special::Proton,
        (Some("H2O") | Some("OH2"), Some(0) | None) => Special::Water,
        _ => Special::None,
    }
}

fn species(
    r: &mut Reporter<'_, '_>,
    raw: &super::schema::RawSpeciesData,
    here: &[Segment],
) -> Option<Option<SpeciesData>> {
    let sub = |k: &str| {
        let mut p = here.to_vec();
        p.push(Segment::Key(k.into()));
        p
    };
    if raw.forms.is_empty() {
        r.at(&sub("forms"), "species data need at least one form");
        return None;
    }
    let sigma = match &raw.sigma {
        Some(q) => r.quantity(q, Kind::Energy, &sub("sigma"))?,
        None => 0.0,
    };
    let mut forms = Vec::new();
    let mut ok = true;
    for (j, f) in raw.forms.iter().enumerate() {
        let mut p = sub("forms");
        p.push(Segment::Index(j));
        let mut dfg = p.clone();
        dfg.push(Segment::Key("dfg0".into()));
        let mut dfh = p.clone();
        dfh.push(Segment::Key("dfh0".into()));
        let g = r.quantity(&f.dfg0, Kind::Energy, &dfg);
        let h = match &f.dfh0 {
            Some(q) => r.quantity(q, Kind::Energy, &dfh).map(Some),
            None => Some(None),
        };
        let mut in_range = true;
        for (key, check) in [
            ("charge", super::limits::charge(f.charge.into())),
            ("hydrogens", super::limits::hydrogens(f.hydrogens.into())),
        ] {
            if let Err(message) = check {
                let mut at = p.clone();
                at.push(Segment::Key(key.into()));
                r.at(&at, message);
                in_range = false;
            }
        }
        match (g, h) {
            _ if !in_range => ok = false,
            (Some(dfg0_kj), Some(dfh0_kj)) => forms.push(Species {
                dfg0_kj,
                dfh0_kj,
                charge: f.charge,
                hydrogens: f.hydrogens,
                magnesium: f.magnesium,
            }),
            _ => ok = false,
        }
    }
    ok.then(|| {
        Some(SpeciesData {
            species: forms,
            sigma_kj: sigma,
            source: raw.source.clone().unwrap_or_default(),
        })
    })
}

fn reaction(
    r: &mut Reporter<'_, '_>,
    raw: &super::schema::RawReaction,
    here: &[Segment],
    metabolite_ids: &HashMap<String, usize>,
    metabolites: &[Metabolite],
) -> Option<Reaction> {
    let sub = |k: &str| {
        let mut p = here.to_vec();
        p.push(Segment::Key(k.into()));
        p
    };
    let mut ok = true;
    let eq_path = sub("equation");
    let map = r.map;
    let eq_loc = || map.value(&eq_path);
    let mut stoichiometry: Vec<(usize, f64)> = Vec::new();
    let mut arrow = Arrow::Forward;
    match equation::parse(&raw.equation) {
        Ok(eq) => {
            arrow = eq.arrow;
            for term in &eq.terms {
                match metabolite_ids.get(&term.id) {
                    // A metabolite with its own errors (already reported): the
                    // equation cannot be judged, and saying more would mislead
                    // (two invalid ids would look like one that cancels).
                    Some(&INVALID) => ok = false,
                    Some(&m) => match stoichiometry.iter_mut().find(|(i, _)| *i == m) {
                        Some(entry) => entry.1 += term.coefficient,
                        None => stoichiometry.push((m, term.coefficient)),
                    },
                    None => {
                        let mut d = Diagnostic::new(
                            r.file,
                            format!(
                                "unknown metabolite `{}` in equation of reaction `{}`",
                                term.id, raw.id
                            ),
                        )
                        .at_opt(eq_loc().map(|l| l.inside(term.offset)));
                        if let Some(best) =
                            did_you_mean(&term.id, metabolites.iter().map(|m| m.id.as_str()))
                        {
                            d = d.hint(format!("did you mean `{best}`?"));
                        } else if term.id.len() > 1 && term.id.contains('+') {
                            // `a_c+b_c`: terms need ` + ` between them.
                            d = d.hint(format!(
                                "put spaces around '+': `{}`",
                                term.id
                                    .split('+')
                                    .filter(|t| !t.is_empty())
                                    .collect::<Vec<_>>()
                                    .join(" + ")
                            ));
                        }
                        r.out.push(d);
                        ok = false;
                    }
                }
            }
        }
        Err(e) => {
            r.out.push(
                Diagnostic::new(
                    r.file,
                    format!(
                        "cannot read equation of reaction `{}`: {}",
                        raw.id, e.message
                    ),
                )
                .at_opt(eq_loc().map(|l| l.inside(e.offset))),
            );
            ok = false;
        }
    }
    stoichiometry.retain(|(_, c)| *c != 0.0);
    stoichiometry.sort_by_key(|(m, _)| *m);

    let (default_lower, default_upper) = match arrow {
        Arrow::Forward => (0.0, DEFAULT_FLUX_BOUND),
        Arrow::Backward => (-DEFAULT_FLUX_BOUND, 0.0),
        Arrow::Both => (-DEFAULT_FLUX_BOUND, DEFAULT_FLUX_BOUND),
    };
    let (mut lower, mut upper) = (default_lower, default_upper);
    if let Some(bounds) = &raw.bounds {
        let bp = sub("bounds");
        if bounds.len() != 2 {
            r.at(
                &bp,
                format!(
                    "bounds need two numbers `[lower, upper]`, found {}",
                    bounds.len()
                ),
            );
            ok = false;
        } else {
            let mut lp = bp.clone();
            lp.push(Segment::Index(0));
            let mut up = bp.clone();
            up.push(Segment::Index(1));
            match (
                r.quantity(&bounds[0], Kind::Flux, &lp),
                r.quantity(&bounds[1], Kind::Flux, &up),
            ) {
                (Some(l), Some(u)) if l > u => {
                    r.at(
                        &lp,
                        format!("lower bound {l} is greater than upper bound {u}"),
                    );
                    ok = false;
                }
                (Some(l), Some(u)) => {
                    lower = l;
                    upper = u;
                    let arrow_text = match arrow {
                        Arrow::Forward => Some("->"),
                        Arrow::Backward => Some("<-"),
                        Arrow::Both => None,
                    };
                    // The arrow states intent; bounds that contradict it are a typo.
                    let against = match arrow {
                        Arrow::Forward => l < 0.0,
                        Arrow::Backward => u > 0.0,
                        Arrow::Both => false,
                    };
                    if let (true, Some(a)) = (against, arrow_text) {
                        let d = r.at(
                            &bp,
                            format!(
                                "bounds [{l}, {u}] allow the direction the arrow `{a}` excludes"
                            ),
                        );
                        d.hint = Some("write `<->` for a reversible reaction".into());
                        ok = false;
                    }
                }
                _ => ok = false,
            }
        }
    }
    let role = match raw.role.as_deref() {
        None => Role::Internal,
        Some(s) => match Role::from_slug(s) {
            Some(role) => role,
            None => {
                r.at(
                    &sub("role"),
                    format!(
                    "unknown role `{s}`; expected one of internal, exchange, demand, sink, biomass"
                ),
                );
                ok = false;
                Role::Internal
            }
        },
    };
    let drg_prime = match &raw.reaction_energy {
        Some(e) if e.at.is_some() => {
            r.at(
                &[sub("reaction_energy"), vec![Segment::Key("at".into())]].concat(),
                "`at` (conditions a value was stated at) applies to a metabolite's formation_energy only; give a reaction energy at the reaction's own conditions".to_string(),
            );
            ok = false;
            None
        }
        Some(e) => match r.energy(e, &sub("reaction_energy")) {
            Some(e) => Some(e),
            None => {
                ok = false;
                None
            }
        },
        None => None,
    };
    if ok && stoichiometry.is_empty() {
        r.at(
            &eq_path,
            format!("equation of reaction `{}` cancels to nothing", raw.id),
        );
        ok = false;
    }
    ok.then(|| Reaction {
        id: raw.id.clone(),
        name: raw.name.clone().unwrap_or_else(|| raw.id.clone()),
        stoichiometry,
        lower_bound: lower,
        upper_bound: upper,
        drg_prime,
        group: raw.group.clone(),
        role,
        sbo: raw.sbo.clone(),
        xrefs: raw
            .xrefs
            .iter()
            .map(|(k, v)| (k.clone(), v.0.clone()))
            .collect(),
    })
}

fn scenario(
    r: &mut Reporter<'_, '_>,
    raw: &RawScenario,
    here: &[Segment],
    reaction_ids: &HashMap<String, usize>,
) -> Option<Scenario> {
    let mut ok = true;
    let mut fluxes: BTreeMap<usize, f64> = BTreeMap::new();
    for (id, q) in &raw.fluxes {
        let mut p = here.to_vec();
        p.push(Segment::Key("fluxes".into()));
        p.push(Segment::Key(id.clone()));
        let value = r.quantity(q, Kind::Flux, &p);
        match reaction_ids.get(id) {
            Some(&idx) => {
                if let Some(v) = value {
                    fluxes.insert(idx, v);
                } else {
                    ok = false;
                }
            }
            None => {
                let d = r.at_key(
                    &p,
                    format!("scenario `{}` names unknown reaction `{id}`", raw.id),
                );
                if let Some(best) = did_you_mean(id, reaction_ids.keys().map(String::as_str)) {
                    d.hint = Some(format!("did you mean `{best}`?"));
                }
                ok = false;
            }
        }
    }
    if let Some(file) = &raw.file {
        let base = r.file.parent().unwrap_or(Path::new("."));
        let csv_path = base.join(file);
        match super::tables::read_flux_csv(&csv_path, reaction_ids) {
            Ok(rows) => {
                for (idx, v) in rows {
                    fluxes.insert(idx, v);
                }
            }
            Err(mut ds) => {
                if ds.iter().all(|d| d.line.is_none()) {
                    // The file itself is unreadable: point at where it is named too.
                    let mut p = here.to_vec();
                    p.push(Segment::Key("file".into()));
                    if let Some(l) = r.map.value(&p) {
                        for d in &mut ds {
                            let named =
                                format!("named at {}:{}:{}", r.file.display(), l.line, l.column);
                            // Keep a "did you mean" the reader found.
                            d.hint = Some(match d.hint.take() {
                                Some(h) => format!("{h} ({named})"),
                                None => named,
                            });
                        }
                    }
                }
                r.out.extend(ds);
                ok = false;
            }
        }
    }
    ok.then(|| Scenario {
        id: raw.id.clone(),
        description: raw.description.clone().unwrap_or_default(),
        fluxes: fluxes.into_iter().filter(|(_, v)| *v != 0.0).collect(),
    })
}
