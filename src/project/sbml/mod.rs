//! SBML import: SBML Level 3 Version 1 or 2 with the `fbc` (version 1, 2;
//! version 3 read as 2) and `groups` packages, plain or gzipped, into a
//! [`Model`].
//!
//! What is read, and the choices made where SBML says nothing:
//!
//! - Ids are kept as written (`M_glc__D_c`, `R_PGI`); names default to ids.
//! - Compartments get the biochemical defaults [`DEFAULT_PH`],
//!   [`DEFAULT_IONIC_STRENGTH_M`] and [`DEFAULT_POTENTIAL_MV`]: SBML has no
//!   standard place for pH, ionic strength or membrane potential, so the
//!   project sets them. The model temperature is [`DEFAULT_TEMPERATURE_K`].
//! - Metabolites take formula and charge from `fbc:chemicalFormula` and
//!   `fbc:charge`, cross references from `bqbiol:is` annotations
//!   ([`parse_xref_uri`]); H+ and water are recognised by formula or cross
//!   reference ([`special_of`]).
//! - Species with `boundaryCondition="true"` stand for the outside world:
//!   they are not metabolites of the model and are dropped from every
//!   reaction, which then counts as a boundary reaction ([`infer_role`]).
//! - Flux bounds: `fbc:lowerFluxBound` / `fbc:upperFluxBound` parameter
//!   references (fbc 2; a number written in place of the reference is
//!   accepted), `fbc:fluxBound` elements (fbc 1), or `LOWER_BOUND` /
//!   `UPPER_BOUND` local parameters of a kinetic law (older files).
//!   Without any: 0 or −[`DEFAULT_FLUX_BOUND`] by the `reversible` attribute, and
//!   [`DEFAULT_FLUX_BOUND`]. Infinite values are kept.
//! - The `reversible` attribute only chooses default bounds; in the model a
//!   reaction is reversible when its bounds allow both directions.
//! - A missing `stoichiometry` counts as 1 (common practice; SBML Level 3
//!   leaves it undefined). A metabolite on both sides gets its net
//!   coefficient.
//! - The objective is the active `fbc:objective` (or the first), stored as
//!   coefficients to maximise: a `minimize` objective is negated.
//! - A reaction's group is the name (else id) of the first `groups:group`
//!   that lists it, by `idRef` or `metaIdRef`.
//!
//! Every problem found is reported at once with its line and column; the
//! file is never half-imported.

mod annotation;
mod position;
mod roles;

pub use annotation::{normalise as normalise_xref, parse_uri as parse_xref_uri};
pub use roles::{infer_role, is_extracellular, RoleClues};

use crate::error::{Diagnostic, Error};
use crate::model::{Compartment, Metabolite, Model, Reaction, Special, DEFAULT_FLUX_BOUND};
use crate::project::locations::SourceLines;
use crate::project::read;
use position::LineIndex;
use roxmltree::Node;
use std::collections::{BTreeMap, HashMap};
use std::path::Path;

/// pH of a compartment unless the project says otherwise.
pub const DEFAULT_PH: f64 = 7.0;
/// Ionic strength of a compartment unless the project says otherwise, mol/L
/// (the value Alberty's tables use for cellular conditions).
pub const DEFAULT_IONIC_STRENGTH_M: f64 = 0.25;
/// Electrical potential of a compartment unless the project says otherwise, mV.
pub const DEFAULT_POTENTIAL_MV: f64 = 0.0;
/// Model temperature, K (biochemical standard state, 25 °C).
pub const DEFAULT_TEMPERATURE_K: f64 = 298.15;

const CORE_L3V1: &str = "http://www.sbml.org/sbml/level3/version1/core";
const CORE_L3V2: &str = "http://www.sbml.org/sbml/level3/version2/core";
const PACKAGE_PREFIX: &str = "http://www.sbml.org/sbml/level3/version1/";

/// Reads an SBML file, gzipped or not (recognised by its content); the file
/// and its decompressed text are capped (see [`crate::project::read`]).
pub fn read_sbml(path: &Path) -> Result<Model, Error> {
    read_sbml_located(path).map(|(model, _)| model)
}

/// [`read_sbml`], with the line of every compartment, species and reaction.
pub fn read_sbml_located(path: &Path) -> Result<(Model, SourceLines), Error> {
    let bytes = read::read_bytes(path).map_err(Error::input)?;
    let text = decode(bytes, path)?;
    parse_sbml_located(&text, path)
}

/// Parses SBML text; `file` is only used in error messages.
pub fn parse_sbml(text: &str, file: &Path) -> Result<Model, Error> {
    parse_sbml_located(text, file).map(|(model, _)| model)
}

/// [`parse_sbml`], with element lines recorded while reading.
pub fn parse_sbml_located(text: &str, file: &Path) -> Result<(Model, SourceLines), Error> {
    let options = roxmltree::ParsingOptions {
        allow_dtd: false,
        ..Default::default()
    };
    let document = roxmltree::Document::parse_with_options(text, options)
        .map_err(|e| Error::input(xml_error(&e, text, file)))?;
    let mut reader = Reader {
        problems: Vec::new(),
    };
    let model = reader.read(&document, file);
    if model.as_ref().is_some_and(|m| m.reactions.is_empty()) {
        // Nothing to check is not a pass.
        let offset = document
            .descendants()
            .find(|n| n.has_tag_name("model"))
            .map_or(0, |n| n.range().start);
        reader.problems.push(Problem {
            offset,
            message: "the model defines no reactions".to_string(),
            hint: Some("an SBML model lists its reactions in <listOfReactions>".to_string()),
        });
    }
    if reader.problems.is_empty() {
        if let Some(model) = model {
            let lines = SourceLines::known(file, element_lines(&document, text));
            return Ok((model, lines));
        }
    }
    let index = LineIndex::new(text.as_bytes());
    let mut problems = reader.problems;
    problems.sort_by_key(|p| p.offset);
    Err(Error::Input(
        problems
            .into_iter()
            .map(|p| {
                let (line, column) = index.locate(p.offset);
                let mut diagnostic = Diagnostic::new(file, p.message).at(line, column);
                diagnostic.hint = p.hint;
                diagnostic
            })
            .collect(),
    ))
}

/// (id, 1-based line) of every compartment, species and reaction element.
fn element_lines(document: &roxmltree::Document, text: &str) -> Vec<(String, usize)> {
    let index = LineIndex::new(text.as_bytes());
    document
        .descendants()
        .filter(|n| {
            n.is_element() && matches!(n.tag_name().name(), "compartment" | "species" | "reaction")
        })
        .filter_map(|n| Some((n.attribute("id")?.to_string(), index.line(n.range().start))))
        .collect()
}

/// Gunzips when the bytes start with the gzip magic number, then checks UTF-8.
pub fn decode(bytes: Vec<u8>, path: &Path) -> Result<String, Error> {
    let bytes = if bytes.starts_with(&[0x1f, 0x8b]) {
        read::gunzip(&bytes, path).map_err(Error::input)?
    } else {
        bytes
    };
    read::decode_utf8(bytes, path).map_err(Error::input)
}

fn xml_error(error: &roxmltree::Error, text: &str, file: &Path) -> Diagnostic {
    use roxmltree::Error as E;
    let pos = error.pos();
    let message = error.to_string().replace(&format!(" at {pos}"), "");
    let diagnostic = Diagnostic::new(file, format!("malformed XML: {message}"));
    match error {
        // These carry no position of their own: the end of the file is where
        // the reader noticed.
        E::UnexpectedEndOfStream | E::UnclosedRootNode | E::NoRootNode => {
            let (line, column) = LineIndex::new(text.as_bytes()).locate(text.len());
            diagnostic.at(line, column)
        }
        E::DtdDetected => {
            let offset = text.find("<!DOCTYPE").unwrap_or(0);
            let (line, column) = LineIndex::new(text.as_bytes()).locate(offset);
            diagnostic
                .at(line, column)
                .hint("SBML files have no DOCTYPE; remove it")
        }
        _ => diagnostic.at(pos.row as usize, pos.col as usize),
    }
}

/// One problem, located by byte offset until the end.
struct Problem {
    offset: usize,
    message: String,
    hint: Option<String>,
}

/// Namespaces of the packages this document uses.
struct Packages<'a> {
    core: &'a str,
    fbc: Option<(&'a str, u32)>,
    groups: Option<&'a str>,
}

/// Where a species id leads.
#[derive(Clone, Copy)]
enum SpeciesSlot {
    Metabolite(usize),
    /// `boundaryCondition="true"`: the outside world, not a metabolite.
    Boundary,
}

struct Reader {
    problems: Vec<Problem>,
}

impl Reader {
    fn problem(&mut self, offset: usize, message: impl Into<String>) {
        self.problems.push(Problem {
            offset,
            message: message.into(),
            hint: None,
        });
    }

    fn problem_with_hint(&mut self, offset: usize, message: impl Into<String>, hint: &str) {
        self.problems.push(Problem {
            offset,
            message: message.into(),
            hint: Some(hint.to_string()),
        });
    }

    /// Reads what it can; `None` when the document is not usable SBML at all.
    fn read(&mut self, document: &roxmltree::Document, file: &Path) -> Option<Model> {
        let root = document.root_element();
        let packages = self.packages(root)?;
        let core = packages.core;
        let Some(model_node) = child(root, core, "model") else {
            self.problem(
                root.range().start,
                "the SBML document has no <model> element",
            );
            return None;
        };
        let mut ids = IdRegistry::default();

        let compartments = self.compartments(model_node, core, &mut ids);
        let compartment_index: HashMap<&str, usize> = compartments
            .iter()
            .enumerate()
            .map(|(i, c)| (c.id.as_str(), i))
            .collect();
        let parameters = self.parameters(model_node, core, &mut ids);
        let (metabolites, species_slots) =
            self.species(model_node, &packages, &compartment_index, &mut ids);
        let outside: Vec<bool> = compartments.iter().map(is_extracellular).collect();
        let metabolite_outside: Vec<bool> =
            metabolites.iter().map(|m| outside[m.compartment]).collect();

        let mut reactions =
            self.reactions(model_node, &packages, &species_slots, &parameters, &mut ids);
        let mut objective = match packages.fbc {
            Some((fbc, version)) => {
                if version == 1 {
                    self.flux_bounds_v1(model_node, fbc, &mut reactions);
                }
                self.objective(model_node, fbc, &reactions)
            }
            None => Vec::new(),
        };
        objective.sort_by_key(|&(j, _)| j);
        if let Some(groups) = packages.groups {
            self.groups(model_node, groups, &mut reactions);
        }
        let mut finished = Vec::with_capacity(reactions.len());
        for read in reactions {
            let mut reaction = read.reaction;
            if reaction.lower_bound > reaction.upper_bound {
                self.problem(
                    read.offset,
                    format!(
                        "reaction `{}` has lower flux bound {} above its upper flux bound {}",
                        reaction.id, reaction.lower_bound, reaction.upper_bound
                    ),
                );
            }
            let participants: Vec<(f64, bool)> = reaction
                .stoichiometry
                .iter()
                .map(|&(m, c)| (c, metabolite_outside[m]))
                .collect();
            reaction.role = infer_role(&RoleClues {
                id: &reaction.id,
                name: &reaction.name,
                sbo: reaction.sbo.as_deref(),
                participants: &participants,
                lower_bound: reaction.lower_bound,
                had_boundary_species: read.had_boundary_species,
            });
            finished.push(reaction);
        }

        let id = model_node
            .attribute("id")
            .map(str::to_string)
            .or_else(|| {
                file.file_name()
                    .and_then(|n| n.to_str())
                    .map(|n| n.split('.').next().unwrap_or(n).to_string())
            })
            .unwrap_or_else(|| "model".to_string());
        let title = model_node
            .attribute("name")
            .map(str::to_string)
            .unwrap_or_else(|| id.clone());
        Some(Model {
            id,
            title,
            temperature_k: DEFAULT_TEMPERATURE_K,
            compartments,
            metabolites,
            reactions: finished,
            scenarios: Vec::new(),
            objective,
        })
    }

    /// Checks level, version and required packages; finds package namespaces.
    fn packages<'a>(&mut self, root: Node<'a, 'a>) -> Option<Packages<'a>> {
        let at = root.range().start;
        if root.tag_name().name() != "sbml" {
            self.problem(
                at,
                format!(
                    "not an SBML document: the root element is <{}>, expected <sbml>",
                    root.tag_name().name()
                ),
            );
            return None;
        }
        let level = root.attribute("level").unwrap_or("?");
        let version = root.attribute("version").unwrap_or("?");
        let core = match (level, version, root.tag_name().namespace()) {
            ("3", "1", Some(CORE_L3V1)) => CORE_L3V1,
            ("3", "2", Some(CORE_L3V2)) => CORE_L3V2,
            ("3", "1" | "2", namespace) => {
                self.problem(
                    at,
                    format!(
                        "the <sbml> element is in namespace `{}`, expected `{}` for SBML Level 3 Version {version}",
                        namespace.unwrap_or(""),
                        if version == "1" { CORE_L3V1 } else { CORE_L3V2 }
                    ),
                );
                return None;
            }
            _ => {
                self.problem_with_hint(
                    at,
                    format!(
                        "SBML Level {level} Version {version} is not supported (expected Level 3 Version 1 or 2)"
                    ),
                    "save the model as SBML Level 3 with the fbc package",
                );
                return None;
            }
        };
        let mut packages = Packages {
            core,
            fbc: None,
            groups: None,
        };
        let mut unsupported = false;
        for namespace in root.namespaces() {
            let uri = namespace.uri();
            let Some(rest) = uri.strip_prefix(PACKAGE_PREFIX) else {
                continue;
            };
            let Some((name, package_version)) = rest.split_once("/version") else {
                continue;
            };
            let package_version: u32 = package_version.parse().unwrap_or(0);
            match (name, package_version) {
                ("fbc", 1..=3) => packages.fbc = Some((uri, package_version)),
                ("groups", 1) => packages.groups = Some(uri),
                _ => {
                    if root.attribute((uri, "required")) == Some("true") {
                        unsupported = true;
                        let attribute = root
                            .attributes()
                            .find(|a| a.namespace() == Some(uri) && a.name() == "required");
                        self.problem_with_hint(
                            attribute.map_or(at, |a| a.range().start),
                            format!(
                                "the model requires the SBML package `{name}` version {package_version}, which is not supported"
                            ),
                            "supported packages: fbc (versions 1 to 3) and groups (version 1)",
                        );
                    }
                }
            }
        }
        if unsupported {
            return None;
        }
        Some(packages)
    }

    fn compartments<'a>(
        &mut self,
        model: Node<'a, 'a>,
        core: &'a str,
        ids: &mut IdRegistry<'a>,
    ) -> Vec<Compartment> {
        let mut compartments = Vec::new();
        for node in list(model, core, "listOfCompartments", "compartment") {
            let Some(id) = self.required_id(node, "compartment") else {
                continue;
            };
            if !self.register(ids, id, node, "compartment") {
                continue;
            }
            compartments.push(Compartment {
                id: id.to_string(),
                name: node.attribute("name").unwrap_or(id).to_string(),
                ph: DEFAULT_PH,
                ionic_strength_m: DEFAULT_IONIC_STRENGTH_M,
                potential_mv: DEFAULT_POTENTIAL_MV,
                temperature_k: None,
                pmg: None,
            });
        }
        compartments
    }

    /// Global parameters with their values (flux bounds refer to them).
    fn parameters<'a>(
        &mut self,
        model: Node<'a, 'a>,
        core: &'a str,
        ids: &mut IdRegistry<'a>,
    ) -> HashMap<&'a str, f64> {
        let mut parameters = HashMap::new();
        for node in list(model, core, "listOfParameters", "parameter") {
            let Some(id) = self.required_id(node, "parameter") else {
                continue;
            };
            if !self.register(ids, id, node, "parameter") {
                continue;
            }
            match node.attribute_node("value") {
                // A parameter without a value is legal SBML; it only matters
                // if a flux bound uses it (reported there).
                None => {}
                Some(value) => match parse_number(value.value()) {
                    Some(v) => {
                        parameters.insert(id, v);
                    }
                    None => self.problem(
                        value.range().start,
                        format!(
                            "parameter `{id}` has value `{}`, expected a number",
                            value.value()
                        ),
                    ),
                },
            }
        }
        parameters
    }

    fn species<'a>(
        &mut self,
        model: Node<'a, 'a>,
        packages: &Packages<'a>,
        compartment_index: &HashMap<&str, usize>,
        ids: &mut IdRegistry<'a>,
    ) -> (Vec<Metabolite>, HashMap<&'a str, SpeciesSlot>) {
        let mut metabolites = Vec::new();
        let mut slots = HashMap::new();
        for node in list(model, packages.core, "listOfSpecies", "species") {
            let Some(id) = self.required_id(node, "species") else {
                continue;
            };
            if !self.register(ids, id, node, "species") {
                continue;
            }
            if node.attribute("boundaryCondition") == Some("true") {
                slots.insert(id, SpeciesSlot::Boundary);
                continue;
            }
            let compartment = match node.attribute_node("compartment") {
                None => {
                    self.problem(
                        node.range().start,
                        format!("species `{id}` has no `compartment` attribute"),
                    );
                    continue;
                }
                Some(attribute) => match compartment_index.get(attribute.value()) {
                    Some(&index) => index,
                    None => {
                        self.problem(
                            attribute.range().start,
                            format!(
                                "species `{id}` is in compartment `{}`, which is not declared",
                                attribute.value()
                            ),
                        );
                        continue;
                    }
                },
            };
            let (formula, charge) = match packages.fbc {
                Some((fbc, _)) => (
                    node.attribute((fbc, "chemicalFormula"))
                        .map(str::trim)
                        .filter(|f| !f.is_empty())
                        .map(str::to_string),
                    self.charge(node, fbc, id),
                ),
                None => (None, None),
            };
            let xrefs = child(node, packages.core, "annotation")
                .map(annotation::cross_references)
                .unwrap_or_default();
            let special = special_of(formula.as_deref(), charge, &xrefs);
            slots.insert(id, SpeciesSlot::Metabolite(metabolites.len()));
            metabolites.push(Metabolite {
                id: id.to_string(),
                name: node.attribute("name").unwrap_or(id).to_string(),
                compartment,
                formula,
                charge,
                dfg_prime: None,
                species: None,
                library: None,
                concentration: None,
                measured_m: None,
                special,
                xrefs,
                sbo: node.attribute("sboTerm").map(str::to_string),
            });
        }
        (metabolites, slots)
    }

    /// `fbc:charge`: an integer (`-2.0` is accepted as −2).
    fn charge(&mut self, node: Node, fbc: &str, id: &str) -> Option<i32> {
        let attribute = node.attribute_node((fbc, "charge"))?;
        let text = attribute.value().trim();
        let charge = match text.parse::<i32>() {
            Ok(charge) => Some(charge),
            Err(_) => match parse_number(text) {
                Some(v) if v.fract() == 0.0 && v.abs() < 1e6 => Some(v as i32),
                _ => None,
            },
        };
        if let Some(Err(message)) = charge.map(|z| crate::project::limits::charge(z.into())) {
            self.problem(
                attribute.range().start,
                format!("species `{id}`: {message}"),
            );
            return None;
        }
        match charge {
            Some(z) => Some(z),
            _ => {
                self.problem(
                    attribute.range().start,
                    format!("species `{id}` has charge `{text}`, expected an integer"),
                );
                None
            }
        }
    }

    fn reactions<'a>(
        &mut self,
        model: Node<'a, 'a>,
        packages: &Packages<'a>,
        species: &HashMap<&str, SpeciesSlot>,
        parameters: &HashMap<&str, f64>,
        ids: &mut IdRegistry<'a>,
    ) -> Vec<ReadReaction<'a>> {
        let core = packages.core;
        let mut reactions = Vec::new();
        for node in list(model, core, "listOfReactions", "reaction") {
            let Some(id) = self.required_id(node, "reaction") else {
                continue;
            };
            if !self.register(ids, id, node, "reaction") {
                continue;
            }
            let mut had_boundary_species = false;
            let mut coefficients: BTreeMap<usize, f64> = BTreeMap::new();
            for (list_name, sign) in [("listOfReactants", -1.0), ("listOfProducts", 1.0)] {
                for reference in list(node, core, list_name, "speciesReference") {
                    let Some(species_attribute) = reference.attribute_node("species") else {
                        self.problem(
                            reference.range().start,
                            format!(
                                "a species reference in reaction `{id}` has no `species` attribute"
                            ),
                        );
                        continue;
                    };
                    let species_id = species_attribute.value();
                    let coefficient = match reference.attribute_node("stoichiometry") {
                        None => 1.0,
                        Some(s) => match parse_number(s.value()) {
                            Some(v) if v.is_finite() && v >= 0.0 => {
                                if let Err(message) = crate::project::limits::coefficient(v) {
                                    self.problem(
                                        s.range().start,
                                        format!(
                                            "stoichiometry of `{species_id}` in reaction `{id}`: {message}"
                                        ),
                                    );
                                    continue;
                                }
                                v
                            }
                            Some(_) => {
                                self.problem(
                                    s.range().start,
                                    format!(
                                        "stoichiometry `{}` of `{species_id}` in reaction `{id}` must be a finite number not below 0",
                                        s.value()
                                    ),
                                );
                                continue;
                            }
                            None => {
                                self.problem(
                                    s.range().start,
                                    format!(
                                        "stoichiometry `{}` of `{species_id}` in reaction `{id}` is not a number",
                                        s.value()
                                    ),
                                );
                                continue;
                            }
                        },
                    };
                    match species.get(species_id) {
                        Some(SpeciesSlot::Metabolite(index)) => {
                            *coefficients.entry(*index).or_insert(0.0) += sign * coefficient;
                        }
                        Some(SpeciesSlot::Boundary) => had_boundary_species = true,
                        None => {
                            self.problem_with_hint(
                                species_attribute.range().start,
                                format!(
                                    "reaction `{id}` names species `{species_id}`, which is not declared"
                                ),
                                "declare it in <listOfSpecies> or correct the id",
                            );
                        }
                    }
                }
            }
            // Sorted by metabolite index (a BTreeMap), as the YAML loader builds it.
            let stoichiometry: Vec<(usize, f64)> = coefficients
                .into_iter()
                .filter(|(_, c)| *c != 0.0)
                .collect();
            let reversible_attribute = node.attribute("reversible");
            let (lower, upper) = self.bounds(node, packages, parameters, id);
            let reversible = match reversible_attribute {
                Some("true") => true,
                Some("false") => false,
                _ => lower.is_some_and(|l| l < 0.0),
            };
            let lower_bound = lower.unwrap_or(if reversible { -DEFAULT_FLUX_BOUND } else { 0.0 });
            let upper_bound = upper.unwrap_or(DEFAULT_FLUX_BOUND);
            let xrefs = child(node, core, "annotation")
                .map(annotation::cross_references)
                .unwrap_or_default();
            reactions.push(ReadReaction {
                offset: node.range().start,
                metaid: node.attribute("metaid"),
                had_boundary_species,
                reaction: Reaction {
                    id: id.to_string(),
                    name: node.attribute("name").unwrap_or(id).to_string(),
                    stoichiometry,
                    lower_bound,
                    upper_bound,
                    drg_prime: None,
                    group: None,
                    role: Default::default(),
                    sbo: node.attribute("sboTerm").map(str::to_string),
                    xrefs,
                },
            });
        }
        reactions
    }

    /// (lower, upper) flux bounds given for a reaction by fbc 2 attributes or
    /// kinetic-law parameters; `None` where not given.
    fn bounds(
        &mut self,
        node: Node,
        packages: &Packages,
        parameters: &HashMap<&str, f64>,
        id: &str,
    ) -> (Option<f64>, Option<f64>) {
        let mut bounds = [None, None];
        if let Some((fbc, version)) = packages.fbc {
            if version >= 2 {
                for (slot, attribute_name, what) in [
                    (0, "lowerFluxBound", "lower"),
                    (1, "upperFluxBound", "upper"),
                ] {
                    let Some(attribute) = node.attribute_node((fbc, attribute_name)) else {
                        continue;
                    };
                    let reference = attribute.value().trim();
                    bounds[slot] = match parameters.get(reference) {
                        Some(&value) => Some(value),
                        None => match parse_number(reference) {
                            Some(value) => Some(value),
                            None => {
                                self.problem_with_hint(
                                    attribute.range().start,
                                    format!(
                                        "the {what} flux bound of reaction `{id}` is parameter `{reference}`, which is not declared or has no value"
                                    ),
                                    "declare it in <listOfParameters> with a numeric `value`",
                                );
                                None
                            }
                        },
                    };
                }
            }
        }
        if bounds == [None, None] {
            // Older files keep bounds as local parameters of a kinetic law.
            let local = child(node, packages.core, "kineticLaw")
                .into_iter()
                .flat_map(|law| {
                    list(
                        law,
                        packages.core,
                        "listOfLocalParameters",
                        "localParameter",
                    )
                });
            for parameter in local {
                let slot = match parameter.attribute("id") {
                    Some("LOWER_BOUND") => 0,
                    Some("UPPER_BOUND") => 1,
                    _ => continue,
                };
                let value = parameter.attribute_node("value");
                match value.as_ref().and_then(|v| parse_number(v.value())) {
                    Some(v) => bounds[slot] = Some(v),
                    None => self.problem(
                        value.map_or(parameter.range().start, |v| v.range().start),
                        format!("flux bound parameter of reaction `{id}` has no numeric `value`"),
                    ),
                }
            }
        }
        (bounds[0], bounds[1])
    }

    /// fbc 1: `<fbc:listOfFluxBounds><fbc:fluxBound fbc:reaction=…
    /// fbc:operation="lessEqual|greaterEqual|equal" fbc:value=…/>`.
    fn flux_bounds_v1(&mut self, model: Node, fbc: &str, reactions: &mut [ReadReaction]) {
        let index: HashMap<&str, usize> = reactions
            .iter()
            .enumerate()
            .map(|(i, r)| (r.reaction.id.as_str(), i))
            .collect();
        let mut updates = Vec::new();
        for bound in list(model, fbc, "listOfFluxBounds", "fluxBound") {
            let at = bound.range().start;
            let Some(reaction_id) = bound.attribute((fbc, "reaction")) else {
                self.problem(at, "flux bound without an `fbc:reaction` attribute");
                continue;
            };
            let Some(&reaction) = index.get(reaction_id) else {
                self.problem(
                    at,
                    format!("flux bound names reaction `{reaction_id}`, which is not declared"),
                );
                continue;
            };
            let value_attribute = bound.attribute((fbc, "value"));
            let Some(value) = value_attribute.and_then(parse_number) else {
                self.problem(
                    at,
                    format!(
                        "flux bound of reaction `{reaction_id}` has value `{}`, expected a number",
                        value_attribute.unwrap_or("")
                    ),
                );
                continue;
            };
            let operation = bound.attribute((fbc, "operation")).unwrap_or("");
            let (lower, upper) = match operation {
                "lessEqual" | "less" => (None, Some(value)),
                "greaterEqual" | "greater" => (Some(value), None),
                "equal" => (Some(value), Some(value)),
                other => {
                    self.problem(
                        at,
                        format!(
                            "flux bound of reaction `{reaction_id}` has operation `{other}`, expected `lessEqual`, `greaterEqual` or `equal`"
                        ),
                    );
                    continue;
                }
            };
            updates.push((reaction, lower, upper));
        }
        for (reaction, lower, upper) in updates {
            let r = &mut reactions[reaction].reaction;
            if let Some(lower) = lower {
                r.lower_bound = lower;
            }
            if let Some(upper) = upper {
                r.upper_bound = upper;
            }
        }
    }

    fn objective(
        &mut self,
        model: Node,
        fbc: &str,
        reactions: &[ReadReaction],
    ) -> Vec<(usize, f64)> {
        let Some(objectives) = child(model, fbc, "listOfObjectives") else {
            return Vec::new();
        };
        let all: Vec<Node> = children(objectives, fbc, "objective").collect();
        let active = objectives.attribute((fbc, "activeObjective"));
        let chosen = match active {
            Some(active) => match all
                .iter()
                .find(|o| o.attribute((fbc, "id")) == Some(active))
            {
                Some(o) => *o,
                None => {
                    self.problem(
                        objectives.range().start,
                        format!("the active objective `{active}` is not declared"),
                    );
                    return Vec::new();
                }
            },
            None => match all.first() {
                Some(o) => *o,
                None => return Vec::new(),
            },
        };
        let sense = if chosen.attribute((fbc, "type")) == Some("minimize") {
            -1.0
        } else {
            1.0
        };
        let index: HashMap<&str, usize> = reactions
            .iter()
            .enumerate()
            .map(|(i, r)| (r.reaction.id.as_str(), i))
            .collect();
        let mut objective = Vec::new();
        for flux_objective in list(chosen, fbc, "listOfFluxObjectives", "fluxObjective") {
            let at = flux_objective.range().start;
            let reaction_id = flux_objective.attribute((fbc, "reaction")).unwrap_or("");
            let Some(&reaction) = index.get(reaction_id) else {
                self.problem(
                    at,
                    format!("the objective names reaction `{reaction_id}`, which is not declared"),
                );
                continue;
            };
            let coefficient_text = flux_objective.attribute((fbc, "coefficient")).unwrap_or("");
            match parse_number(coefficient_text) {
                Some(c) if c.is_finite() => objective.push((reaction, sense * c)),
                _ => self.problem(
                    at,
                    format!(
                        "objective coefficient `{coefficient_text}` of reaction `{reaction_id}` is not a number"
                    ),
                ),
            }
        }
        objective.sort_by_key(|(r, _)| *r);
        objective
    }

    /// Group of each reaction: the first group listing it.
    fn groups(&mut self, model: Node, groups: &str, reactions: &mut [ReadReaction]) {
        let mut by_id: HashMap<String, usize> = HashMap::new();
        let mut by_metaid: HashMap<String, usize> = HashMap::new();
        for (i, r) in reactions.iter().enumerate() {
            by_id.insert(r.reaction.id.clone(), i);
            if let Some(metaid) = r.metaid {
                by_metaid.insert(metaid.to_string(), i);
            }
        }
        for group in list(model, groups, "listOfGroups", "group") {
            let label = group
                .attribute((groups, "name"))
                .or_else(|| group.attribute((groups, "id")))
                .map(str::to_string);
            let Some(label) = label else { continue };
            for member in list(group, groups, "listOfMembers", "member") {
                let reaction = member
                    .attribute((groups, "idRef"))
                    .and_then(|id| by_id.get(id))
                    .or_else(|| {
                        member
                            .attribute((groups, "metaIdRef"))
                            .and_then(|m| by_metaid.get(m))
                    });
                // Members that are not reactions (species, other groups) do
                // not give a reaction its group.
                if let Some(&reaction) = reaction {
                    let slot = &mut reactions[reaction].reaction.group;
                    if slot.is_none() {
                        *slot = Some(label.clone());
                    }
                }
            }
        }
    }

    fn required_id<'a>(&mut self, node: Node<'a, 'a>, what: &str) -> Option<&'a str> {
        match node.attribute("id").map(str::trim) {
            Some(id) if !id.is_empty() => Some(id),
            _ => {
                self.problem(
                    node.range().start,
                    format!("a {what} has no `id` attribute"),
                );
                None
            }
        }
    }

    /// Records an id; SBML ids are unique across the whole model.
    fn register<'a>(
        &mut self,
        ids: &mut IdRegistry<'a>,
        id: &'a str,
        node: Node,
        what: &'static str,
    ) -> bool {
        match ids.seen.get(id) {
            Some(&kind) => {
                self.problem(
                    node.attribute_node("id")
                        .map_or(node.range().start, |a| a.range().start),
                    format!("{what} id `{id}` is already used by a {kind}"),
                );
                false
            }
            None => {
                ids.seen.insert(id, what);
                true
            }
        }
    }
}

/// Ids seen so far, with their kind.
#[derive(Default)]
struct IdRegistry<'a> {
    seen: HashMap<&'a str, &'static str>,
}

/// A reaction with what is needed to finish it.
struct ReadReaction<'a> {
    offset: usize,
    metaid: Option<&'a str>,
    had_boundary_species: bool,
    reaction: Reaction,
}

/// H+ and water are treated specially in the mass-action ratio. The formula
/// decides when there is one: `H` with any charge but −1 (which would be
/// hydride) is H+, `H2O` is water. The charge is not required to be +1
/// because some models give H+ the charge 0 (Recon3D as distributed by BiGG
/// does, in every compartment). Without a formula, the BiGG id (`h`, `h2o`)
/// or the ChEBI id decides (CHEBI:15378 hydron, CHEBI:24636 proton,
/// CHEBI:15377 water; as annotated on M_h_c and M_h2o_c in e_coli_core).
pub fn special_of(
    formula: Option<&str>,
    charge: Option<i32>,
    xrefs: &BTreeMap<String, Vec<String>>,
) -> Special {
    if let Some(formula) = formula {
        return match formula {
            "H" if charge != Some(-1) => Special::Proton,
            "H2O" => Special::Water,
            _ => Special::None,
        };
    }
    let has = |namespace: &str, ids: &[&str]| {
        xrefs
            .get(namespace)
            .is_some_and(|list| list.iter().any(|id| ids.contains(&id.as_str())))
    };
    if has("bigg.metabolite", &["h"]) || has("chebi", &["CHEBI:15378", "CHEBI:24636"]) {
        Special::Proton
    } else if has("bigg.metabolite", &["h2o"]) || has("chebi", &["CHEBI:15377"]) {
        Special::Water
    } else {
        Special::None
    }
}

/// A number as SBML writes it (`1000`, `-1e3`, `INF`, `-INF`); NaN refused.
fn parse_number(text: &str) -> Option<f64> {
    text.trim().parse::<f64>().ok().filter(|v| !v.is_nan())
}

/// Element children of `node` with the given namespace and local name.
fn children<'a, 'input: 'a>(
    node: Node<'a, 'input>,
    namespace: &'a str,
    name: &'a str,
) -> impl Iterator<Item = Node<'a, 'input>> + 'a {
    node.children()
        .filter(move |c| c.is_element() && c.has_tag_name((namespace, name)))
}

fn child<'a, 'input: 'a>(
    node: Node<'a, 'input>,
    namespace: &'a str,
    name: &'a str,
) -> Option<Node<'a, 'input>> {
    children(node, namespace, name).next()
}

/// Items of a `listOf…` child: `list(model, ns, "listOfSpecies", "species")`.
fn list<'a, 'input: 'a>(
    node: Node<'a, 'input>,
    namespace: &'a str,
    list_name: &'a str,
    item: &'a str,
) -> impl Iterator<Item = Node<'a, 'input>> + 'a {
    children(node, namespace, list_name).flat_map(move |l| children(l, namespace, item))
}
