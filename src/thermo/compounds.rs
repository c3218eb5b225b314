//! Which of a model's metabolites are the same compound as far as the error
//! of their ΔfG'° is concerned.
//!
//! The error of a formation energy belongs to the data it was taken from,
//! not to the compartment the metabolite sits in: glucose outside and glucose
//! inside computed from the same species data carry the same error, so a
//! transport step between them has none (JCGM 100:2008, §5.2: correlated
//! input quantities). Two metabolites share one error source when the ΔfG'°
//! actually used for both comes from
//!
//! 1. the same entry of the built-in library;
//! 2. identical `species` data (every form's ΔfG°, ΔfH°, z, nH, nMg, and the
//!    same σ and source text);
//! 3. a `formation_energy` with the same value, σ and source text, and the
//!    same cross-references (both without any counts as the same); or
//! 4. a `formation_energy` with the same non-empty source text and σ and the
//!    same non-empty cross-references, whatever the value (one source's
//!    estimate for one compound, e.g. given per compartment).
//!
//! The rules are applied together (a group joined by one rule and another
//! is one compound). Anything else is independent. H+ is fixed by the pH and
//! has no error at all.

use std::collections::BTreeMap;

use super::metabolite::MetaboliteThermo;
use crate::model::{Model, Species};

/// Compound of each metabolite: the index of the first metabolite of its
/// group (a metabolite without a ΔfG'° is its own compound).
pub fn group_compounds(model: &Model, thermo: &[MetaboliteThermo]) -> Vec<usize> {
    let n = model.metabolites.len();
    let mut parent: Vec<usize> = (0..n).collect();
    let mut first_with: BTreeMap<Key, usize> = BTreeMap::new();
    for i in 0..n {
        for key in keys(model, thermo, i) {
            match first_with.get(&key) {
                Some(&first) => union(&mut parent, first, i),
                None => {
                    first_with.insert(key, i);
                }
            }
        }
    }
    (0..n).map(|i| find(&mut parent, i)).collect()
}

/// What makes two ΔfG'° the same datum (see the module comment). Floats
/// are compared by their bits: a copied number is bit-identical.
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord)]
enum Key {
    Library(String),
    Species {
        forms: Vec<(u64, Option<u64>, i32, u32, u32)>,
        sigma: u64,
        source: String,
    },
    SameValue {
        value: u64,
        sigma: u64,
        source: String,
        xrefs: BTreeMap<String, Vec<String>>,
    },
    SameSource {
        sigma: u64,
        source: String,
        xrefs: BTreeMap<String, Vec<String>>,
    },
}

fn keys(model: &Model, thermo: &[MetaboliteThermo], i: usize) -> Vec<Key> {
    let m = &model.metabolites[i];
    let Some(energy) = &thermo[i].energy else {
        return Vec::new();
    };
    match energy.origin {
        "library" => thermo[i]
            .library_key
            .clone()
            .map(Key::Library)
            .into_iter()
            .collect(),
        "species" => m
            .species
            .as_ref()
            .map(|data| Key::Species {
                forms: data.species.iter().map(form_bits).collect(),
                sigma: data.sigma_kj.to_bits(),
                source: data.source.clone(),
            })
            .into_iter()
            .collect(),
        "model" | "model-converted" => {
            let Some(e) = &m.dfg_prime else {
                return Vec::new();
            };
            let xrefs = normalised_xrefs(m);
            let mut out = vec![Key::SameValue {
                value: e.value_kj.to_bits(),
                sigma: e.sigma_kj.to_bits(),
                source: e.source.clone(),
                xrefs: xrefs.clone(),
            }];
            if !e.source.trim().is_empty() && !xrefs.is_empty() {
                out.push(Key::SameSource {
                    sigma: e.sigma_kj.to_bits(),
                    source: e.source.clone(),
                    xrefs,
                });
            }
            out
        }
        _ => Vec::new(),
    }
}

fn form_bits(s: &Species) -> (u64, Option<u64>, i32, u32, u32) {
    (
        s.dfg0_kj.to_bits(),
        s.dfh0_kj.map(f64::to_bits),
        s.charge,
        s.hydrogens,
        s.magnesium,
    )
}

/// Cross-references with sorted, de-duplicated ids, so the order they were
/// written in does not matter.
fn normalised_xrefs(m: &crate::model::Metabolite) -> BTreeMap<String, Vec<String>> {
    m.xrefs
        .iter()
        .filter(|(_, ids)| !ids.is_empty())
        .map(|(ns, ids)| {
            let mut ids = ids.clone();
            ids.sort();
            ids.dedup();
            (ns.clone(), ids)
        })
        .collect()
}

fn find(parent: &mut [usize], mut i: usize) -> usize {
    while parent[i] != i {
        parent[i] = parent[parent[i]];
        i = parent[i];
    }
    i
}

/// Joins two groups; the smaller index stays the representative.
fn union(parent: &mut [usize], a: usize, b: usize) {
    let (ra, rb) = (find(parent, a), find(parent, b));
    if ra != rb {
        let (keep, drop) = (ra.min(rb), ra.max(rb));
        parent[drop] = keep;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Compartment, Energy, Metabolite, SpeciesData};

    fn compartment(id: &str, ph: f64) -> Compartment {
        Compartment {
            id: id.into(),
            name: id.into(),
            ph,
            ionic_strength_m: 0.25,
            potential_mv: 0.0,
            temperature_k: None,
            pmg: None,
        }
    }

    fn metabolite(id: &str, compartment: usize) -> Metabolite {
        Metabolite {
            id: id.into(),
            name: id.into(),
            compartment,
            formula: None,
            charge: None,
            dfg_prime: None,
            species: None,
            library: None,
            concentration: None,
            measured_m: None,
            special: Default::default(),
            xrefs: Default::default(),
            sbo: None,
        }
    }

    fn energy(value: f64, source: &str) -> Option<Energy> {
        Some(Energy {
            value_kj: value,
            sigma_kj: 0.5,
            source: source.into(),
            at: None,
        })
    }

    fn model(metabolites: Vec<Metabolite>) -> Model {
        Model {
            id: "m".into(),
            title: String::new(),
            temperature_k: 298.15,
            compartments: vec![compartment("c", 7.0), compartment("e", 7.0)],
            metabolites,
            reactions: Vec::new(),
            scenarios: Vec::new(),
            objective: Vec::new(),
        }
    }

    fn groups(model: &Model) -> Vec<usize> {
        let thermo: Vec<MetaboliteThermo> = (0..model.metabolites.len())
            .map(|i| super::super::metabolite::resolve(model, i))
            .collect();
        group_compounds(model, &thermo)
    }

    #[test]
    fn each_rule_joins_what_it_should_and_nothing_else() {
        let xref = |m: &mut Metabolite, id: &str| {
            m.xrefs.insert("chebi".into(), vec![id.into()]);
        };
        let mut ms = Vec::new();
        // 0, 1: the library's glucose in two compartments (rule 1).
        for c in [0, 1] {
            let mut m = metabolite(&format!("glc{c}"), c);
            m.library = Some("glucose".into());
            ms.push(m);
        }
        // 2, 3: identical species data (rule 2); 4: same forms, other σ.
        // Species values: origin not recorded, treat as invented for this
        // test (only the equality of the data matters).
        let data = |sigma: f64| SpeciesData {
            species: vec![Species {
                dfg0_kj: -508.17,
                dfh0_kj: None,
                charge: -1,
                hydrogens: 5,
                magnesium: 0,
            }],
            sigma_kj: sigma,
            source: "s".into(),
        };
        for (c, sigma) in [(0, 0.6), (1, 0.6), (1, 0.7)] {
            let mut m = metabolite(&format!("lac{}", ms.len()), c);
            m.species = Some(data(sigma));
            ms.push(m);
        }
        // 5, 6: the same number copied, no xrefs (rule 3); 7: same number,
        // another source: independent.
        for source in ["db", "db", "other"] {
            let mut m = metabolite(&format!("x{}", ms.len()), ms.len() % 2);
            m.dfg_prime = energy(-100.0, source);
            ms.push(m);
        }
        // 8, 9: one source, same xref, values differ per compartment (rule 4);
        // 10: same source, other xref: independent.
        for (value, id) in [
            (-200.0, "CHEBI:1"),
            (-203.0, "CHEBI:1"),
            (-200.0, "CHEBI:2"),
        ] {
            let mut m = metabolite(&format!("y{}", ms.len()), ms.len() % 2);
            m.dfg_prime = energy(value, "db");
            xref(&mut m, id);
            ms.push(m);
        }
        // 11: no energy at all.
        ms.push(metabolite("z", 0));
        let g = groups(&model(ms));
        assert_eq!(g, [0, 0, 2, 2, 4, 5, 5, 7, 8, 8, 10, 11]);
    }
}
