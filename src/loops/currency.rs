//! Currency metabolites and their dissipation reactions, for the
//! energy-generating-cycle test of Fritzemeier et al., PLoS Comput. Biol. 13
//! (2017) e1005494.
//!
//! A metabolite is recognised, in this order, by: an explicit list of
//! metabolite ids per compound key (the override map), its id base in the
//! BiGG style (`atp_c`, `M_atp_c` → `atp`), or a cross reference (KEGG
//! compound or ChEBI id). The KEGG and ChEBI ids below are recalled from
//! memory (not looked up); the BiGG-style bases follow the ids used by the
//! published models in ../shared/models.

use crate::model::Model;
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// A compound the dissipation reactions are written with.
struct Compound {
    key: &'static str,
    /// KEGG compound ids (from memory).
    kegg: &'static [&'static str],
    /// ChEBI ids (from memory).
    chebi: &'static [&'static str],
}

const COMPOUNDS: &[Compound] = &[
    Compound {
        key: "atp",
        kegg: &["C00002"],
        chebi: &["15422", "30616"],
    },
    Compound {
        key: "adp",
        kegg: &["C00008"],
        chebi: &["16761", "456216"],
    },
    Compound {
        key: "gtp",
        kegg: &["C00044"],
        chebi: &["15996", "37565"],
    },
    Compound {
        key: "gdp",
        kegg: &["C00035"],
        chebi: &["17552", "58189"],
    },
    Compound {
        key: "ctp",
        kegg: &["C00063"],
        chebi: &["17677", "37563"],
    },
    Compound {
        key: "cdp",
        kegg: &["C00112"],
        chebi: &["17239", "58069"],
    },
    Compound {
        key: "utp",
        kegg: &["C00075"],
        chebi: &["15713", "46398"],
    },
    Compound {
        key: "udp",
        kegg: &["C00015"],
        chebi: &["17659", "58223"],
    },
    Compound {
        key: "itp",
        kegg: &["C00081"],
        chebi: &["16039", "61402"],
    },
    Compound {
        key: "idp",
        kegg: &["C00104"],
        chebi: &["17808", "58280"],
    },
    Compound {
        key: "pi",
        kegg: &["C00009"],
        chebi: &["18367", "43474"],
    },
    Compound {
        key: "h2o",
        kegg: &["C00001"],
        chebi: &["15377"],
    },
    Compound {
        key: "h",
        kegg: &["C00080"],
        chebi: &["15378", "24636"],
    },
    Compound {
        key: "nadh",
        kegg: &["C00004"],
        chebi: &["16908", "57945"],
    },
    Compound {
        key: "nad",
        kegg: &["C00003"],
        chebi: &["15846", "57540"],
    },
    Compound {
        key: "nadph",
        kegg: &["C00005"],
        chebi: &["16474", "57783"],
    },
    Compound {
        key: "nadp",
        kegg: &["C00006"],
        chebi: &["18009", "58349"],
    },
    Compound {
        key: "fadh2",
        kegg: &["C01352"],
        chebi: &["17877", "58307"],
    },
    Compound {
        key: "fad",
        kegg: &["C00016"],
        chebi: &["16238", "57692"],
    },
    Compound {
        key: "fmnh2",
        kegg: &["C01847"],
        chebi: &["16048", "57618"],
    },
    Compound {
        key: "fmn",
        kegg: &["C00061"],
        chebi: &["17621", "58210"],
    },
    // Quinones differ by chain length; generic xrefs would pair a quinol with
    // a quinone of another length, so these match by id (or override) only.
    Compound {
        key: "q8h2",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "q8",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "q10h2",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "q10",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "mql8",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "mqn8",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "2dmmql8",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "2dmmq8",
        kegg: &[],
        chebi: &[],
    },
    Compound {
        key: "accoa",
        kegg: &["C00024"],
        chebi: &["15351", "57288"],
    },
    Compound {
        key: "coa",
        kegg: &["C00010"],
        chebi: &["15346", "57287"],
    },
    Compound {
        key: "ac",
        kegg: &["C00033"],
        chebi: &["15366", "30089"],
    },
];

/// Dissipation reactions, one per currency, in one compartment (the set of
/// Fritzemeier et al. 2017, recalled from memory): (currency, equation).
const DISSIPATIONS: &[(&str, &[(&str, f64)])] = &[
    (
        "atp",
        &[
            ("atp", -1.0),
            ("h2o", -1.0),
            ("adp", 1.0),
            ("pi", 1.0),
            ("h", 1.0),
        ],
    ),
    (
        "gtp",
        &[
            ("gtp", -1.0),
            ("h2o", -1.0),
            ("gdp", 1.0),
            ("pi", 1.0),
            ("h", 1.0),
        ],
    ),
    (
        "ctp",
        &[
            ("ctp", -1.0),
            ("h2o", -1.0),
            ("cdp", 1.0),
            ("pi", 1.0),
            ("h", 1.0),
        ],
    ),
    (
        "utp",
        &[
            ("utp", -1.0),
            ("h2o", -1.0),
            ("udp", 1.0),
            ("pi", 1.0),
            ("h", 1.0),
        ],
    ),
    (
        "itp",
        &[
            ("itp", -1.0),
            ("h2o", -1.0),
            ("idp", 1.0),
            ("pi", 1.0),
            ("h", 1.0),
        ],
    ),
    ("nadh", &[("nadh", -1.0), ("nad", 1.0), ("h", 1.0)]),
    ("nadph", &[("nadph", -1.0), ("nadp", 1.0), ("h", 1.0)]),
    ("fadh2", &[("fadh2", -1.0), ("fad", 1.0), ("h", 2.0)]),
    ("fmnh2", &[("fmnh2", -1.0), ("fmn", 1.0), ("h", 2.0)]),
    ("ubiquinol-8", &[("q8h2", -1.0), ("q8", 1.0), ("h", 2.0)]),
    ("ubiquinol-10", &[("q10h2", -1.0), ("q10", 1.0), ("h", 2.0)]),
    ("menaquinol-8", &[("mql8", -1.0), ("mqn8", 1.0), ("h", 2.0)]),
    (
        "2-demethylmenaquinol-8",
        &[("2dmmql8", -1.0), ("2dmmq8", 1.0), ("h", 2.0)],
    ),
    (
        "acetyl-coa",
        &[
            ("accoa", -1.0),
            ("h2o", -1.0),
            ("coa", 1.0),
            ("ac", 1.0),
            ("h", 1.0),
        ],
    ),
];

/// Settings of the energy-generating-cycle test.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CurrencyOptions {
    /// Compound key (`atp`, `adp`, `pi`, `h`, `h2o`, `nadh`, `nad`, …) →
    /// metabolite ids, replacing automatic recognition for that key.
    pub overrides: BTreeMap<String, Vec<String>>,
    /// Proton-gradient dissipations as (from compartment id, to compartment
    /// id); `None` = the default (periplasm or else extracellular space into
    /// the cytosol, and cytosol into mitochondria), by BiGG compartment ids.
    pub proton_gradients: Option<Vec<(String, String)>>,
}

/// One dissipation reaction to test.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DissipationTest {
    /// `atp`, `nadh`, …, or `proton-gradient`.
    pub currency: String,
    /// Compartment id (for a proton gradient: `from->to`).
    pub compartment: String,
    /// (metabolite id, coefficient); negative = consumed.
    pub equation: Vec<(String, f64)>,
    /// Same as `equation`, by metabolite index.
    #[serde(skip)]
    pub column: Vec<(usize, f64)>,
}

/// Id of a compartment without an SBML `C_` prefix.
fn compartment_key(id: &str) -> &str {
    id.strip_prefix("C_").unwrap_or(id)
}

/// BiGG-style base of a metabolite id: `M_atp_c` in compartment `c` → `atp`.
fn id_base<'a>(id: &'a str, compartment: &str) -> &'a str {
    let id = id.strip_prefix("M_").unwrap_or(id);
    id.strip_suffix(compartment)
        .and_then(|rest| rest.strip_suffix('_'))
        .unwrap_or(id)
}

fn xref_matches(model: &Model, metabolite: usize, compound: &Compound) -> bool {
    xrefs_match(&model.metabolites[metabolite].xrefs, compound)
}

fn xrefs_match(xrefs: &BTreeMap<String, Vec<String>>, compound: &Compound) -> bool {
    let any = |namespaces: &[&str], wanted: &[&str], strip: &str| {
        namespaces.iter().any(|ns| {
            xrefs.get(*ns).is_some_and(|ids| {
                ids.iter().any(|id| {
                    let id = id.trim();
                    let bare = id
                        .strip_prefix(strip)
                        .or_else(|| id.strip_prefix(&strip.to_lowercase()))
                        .unwrap_or(id);
                    wanted.contains(&bare)
                })
            })
        })
    };
    any(&["kegg.compound", "kegg"], compound.kegg, "") || any(&["chebi"], compound.chebi, "CHEBI:")
}

/// The currency compound key (`atp`, `h2o`, `nadh`, `coa`, …) a metabolite
/// is recognised as, by its id base or its cross references (the automatic
/// part of [`recognise`], for one metabolite; the network maps use it).
pub fn compound_key(
    id: &str,
    compartment: &str,
    xrefs: &BTreeMap<String, Vec<String>>,
) -> Option<&'static str> {
    let base = id_base(id, compartment_key(compartment));
    COMPOUNDS
        .iter()
        .find(|c| c.key == base)
        .or_else(|| COMPOUNDS.iter().find(|c| xrefs_match(xrefs, c)))
        .map(|c| c.key)
}

/// Metabolite index per (compound key, compartment index).
fn recognise(model: &Model, options: &CurrencyOptions) -> BTreeMap<(&'static str, usize), usize> {
    let mut found = BTreeMap::new();
    for compound in COMPOUNDS {
        if let Some(ids) = options.overrides.get(compound.key) {
            for id in ids {
                if let Some(m) = model.metabolite_index(id) {
                    found.insert((compound.key, model.metabolites[m].compartment), m);
                }
            }
            continue;
        }
        let mut by_id = BTreeMap::new();
        let mut by_xref = BTreeMap::new();
        for (m, metabolite) in model.metabolites.iter().enumerate() {
            let compartment = model
                .compartments
                .get(metabolite.compartment)
                .map(|c| compartment_key(&c.id))
                .unwrap_or("");
            if id_base(&metabolite.id, compartment) == compound.key {
                by_id.entry(metabolite.compartment).or_insert(m);
            } else if xref_matches(model, m, compound) {
                by_xref.entry(metabolite.compartment).or_insert(m);
            }
        }
        for (compartment, m) in by_xref {
            by_id.entry(compartment).or_insert(m);
        }
        for (compartment, m) in by_id {
            found.insert((compound.key, compartment), m);
        }
    }
    found
}

/// The dissipation reactions to test in a model.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct DissipationPlan {
    pub tests: Vec<DissipationTest>,
    /// Currencies for which no compartment has all participants.
    pub not_testable: Vec<String>,
    /// Dissipations that could be written but were left out because no
    /// reaction of the model makes or consumes the charged form in that
    /// compartment (it is only carried there, if at all): "atp in e".
    pub not_used: Vec<String>,
}

/// Whether some reaction converts `metabolite` chemically rather than only
/// carrying it between compartments: the reaction's net coefficient over
/// every compartment's form of the same compound (`same_compound`) is not
/// zero. ATP hydrolysis in the cytosol counts; an ATP exporter or the
/// mitochondrial ATP/ADP exchanger does not.
fn converted_by_some_reaction(
    model: &Model,
    metabolite: usize,
    same_compound: &BTreeSet<usize>,
) -> bool {
    model.reactions.iter().any(|r| {
        r.stoichiometry.iter().any(|&(m, _)| m == metabolite)
            && r.stoichiometry
                .iter()
                .filter(|(m, _)| same_compound.contains(m))
                .map(|(_, c)| c)
                .sum::<f64>()
                .abs()
                > 1e-9
    })
}

/// The dissipation reactions that can be written in `model`, the
/// currencies for which no compartment has all participants, and the
/// dissipations left out because the currency is not used as one in that
/// compartment (issue: extracellular ATP is tested only when some reaction
/// makes or consumes extracellular ATP).
pub fn dissipation_tests(model: &Model, options: &CurrencyOptions) -> DissipationPlan {
    let found = recognise(model, options);
    let mut tests = Vec::new();
    let mut missing = Vec::new();
    let mut not_used = Vec::new();
    for (currency, equation) in DISSIPATIONS {
        let before = tests.len();
        let mut writable = false;
        // The charged form: the first compound the dissipation consumes.
        let charged = equation[0].0;
        let forms: BTreeSet<usize> = found
            .iter()
            .filter(|((key, _), _)| *key == charged)
            .map(|(_, &m)| m)
            .collect();
        for (c, compartment) in model.compartments.iter().enumerate() {
            let column: Option<Vec<(usize, f64)>> = equation
                .iter()
                .map(|(key, coef)| found.get(&(*key, c)).map(|&m| (m, *coef)))
                .collect();
            let Some(column) = column else { continue };
            writable = true;
            let place = compartment_key(&compartment.id);
            if converted_by_some_reaction(model, column[0].0, &forms) {
                tests.push(test(model, currency, place, column));
            } else {
                not_used.push(format!("{currency} in {place}"));
            }
        }
        if tests.len() == before && !writable {
            missing.push((*currency).to_string());
        }
    }
    let compartment_of = |key: &str| {
        model
            .compartments
            .iter()
            .position(|c| compartment_key(&c.id) == key)
    };
    let gradients: Vec<(String, String)> = match &options.proton_gradients {
        Some(pairs) => pairs.clone(),
        None => {
            let mut pairs = Vec::new();
            let outer = ["p", "e"].into_iter().find(|k| compartment_of(k).is_some());
            if let Some(outer) = outer {
                pairs.push((outer.to_string(), "c".to_string()));
            }
            pairs.push(("c".to_string(), "m".to_string()));
            pairs
        }
    };
    let before = tests.len();
    for (from, to) in gradients {
        let (Some(a), Some(b)) = (compartment_of(&from), compartment_of(&to)) else {
            continue;
        };
        if let (Some(&h_from), Some(&h_to)) = (found.get(&("h", a)), found.get(&("h", b))) {
            let label = format!("{from}->{to}");
            tests.push(test(
                model,
                "proton-gradient",
                &label,
                vec![(h_from, -1.0), (h_to, 1.0)],
            ));
        }
    }
    if tests.len() == before {
        missing.push("proton-gradient".to_string());
    }
    DissipationPlan {
        tests,
        not_testable: missing,
        not_used,
    }
}

impl DissipationTest {
    /// The dissipation as an equation of metabolite names (ids where a
    /// metabolite has no name), e.g. `ATP + H2O → ADP + phosphate + H+`;
    /// when it spans compartments every name carries its compartment,
    /// `H+ [e] → H+ [c]`.
    pub fn named_equation(&self, model: &Model) -> String {
        let compartments: BTreeSet<usize> = self
            .column
            .iter()
            .map(|&(m, _)| model.metabolites[m].compartment)
            .collect();
        let name = |m: usize| {
            let metabolite = &model.metabolites[m];
            let mut name = if metabolite.name.trim().is_empty() {
                metabolite.id.clone()
            } else {
                metabolite.name.trim().to_string()
            };
            if compartments.len() > 1 {
                let place = model
                    .compartments
                    .get(metabolite.compartment)
                    .map_or("?", |c| compartment_key(&c.id));
                name.push_str(&format!(" [{place}]"));
            }
            name
        };
        let side = |consumed: bool| {
            self.column
                .iter()
                .filter(|&&(_, c)| (c < 0.0) == consumed)
                .map(|&(m, c)| {
                    if c.abs() == 1.0 {
                        name(m)
                    } else {
                        format!("{} {}", c.abs(), name(m))
                    }
                })
                .collect::<Vec<_>>()
                .join(" + ")
        };
        format!("{} → {}", side(true), side(false))
    }
}

fn test(
    model: &Model,
    currency: &str,
    compartment: &str,
    column: Vec<(usize, f64)>,
) -> DissipationTest {
    DissipationTest {
        currency: currency.to_string(),
        compartment: compartment.to_string(),
        equation: column
            .iter()
            .map(|&(m, c)| (model.metabolites[m].id.clone(), c))
            .collect(),
        column,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // BiGG identifier convention (common practice): base_compartment, with
    // the SBML prefix M_.
    #[test]
    fn id_base_strips_prefix_and_compartment() {
        assert_eq!(id_base("M_atp_c", "c"), "atp");
        assert_eq!(id_base("atp_c", "c"), "atp");
        assert_eq!(id_base("h2o_e", "e"), "h2o");
        assert_eq!(id_base("atp", "c"), "atp");
        assert_eq!(id_base("M_q8h2_c", "c"), "q8h2");
        assert_eq!(compartment_key("C_c"), "c");
    }
}
