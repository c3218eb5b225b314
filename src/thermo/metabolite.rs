//! Where a metabolite's ΔfG'° comes from, resolved once per metabolite.
//!
//! Order (a model value always wins over the library):
//! 1. `formation_energy` given in the model (taken as valid at the
//!    compartment's conditions);
//! 2. `species` data given in the model, transformed with Alberty's method
//!    at the compartment's pH, ionic strength, temperature (and pMg);
//! 3. the built-in library, by the `library:` key or by cross-reference
//!    (water is matched by its role too), transformed the same way.
//!
//! H+ is fixed by the pH: its transformed ΔfG'° is 0 by definition.

use super::legendre::{Conditions, ReactantState, Transform};
use super::library::{self, LibraryEntry};
use crate::model::{Model, Special, Species};

/// σ assigned to library values, kJ/mol. The printed tables carry no
/// uncertainty; 0.5 kJ/mol is our allowance for the rounding and the
/// Debye–Hückel approximation (our assumption, stated in the README).
pub const LIBRARY_SIGMA_KJ: f64 = 0.5;

/// A metabolite's ΔfG'° at its compartment's conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct MetaboliteEnergy {
    pub value_kj: f64,
    pub sigma_kj: f64,
    /// "model", "species", "library" or "fixed" (H+).
    pub origin: &'static str,
    pub source: String,
}

/// Species data and their state at the compartment's conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesSummary {
    pub species: Vec<Species>,
    /// Name of each species where known (library), else empty.
    pub labels: Vec<String>,
    pub conditions: Conditions,
    pub state: ReactantState,
    /// Per-value provenance lines (library entries).
    pub provenance: Vec<String>,
}

/// Everything resolved for one metabolite.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct MetaboliteThermo {
    pub energy: Option<MetaboliteEnergy>,
    pub species: Option<SpeciesSummary>,
    /// Library key when the library supplied (or could supply) data.
    pub library_key: Option<String>,
    /// Why data that exist could not be used (e.g. ΔfH° missing away from 298.15 K).
    pub problem: Option<String>,
}

/// Resolve the ΔfG'° of metabolite `i`.
pub fn resolve(model: &Model, i: usize) -> MetaboliteThermo {
    let m = &model.metabolites[i];
    let compartment = &model.compartments[m.compartment];
    let conditions = Conditions::of_compartment(compartment, model.temperature_k);
    let library_entry = library_entry_for(model, i);
    let mut out = MetaboliteThermo {
        library_key: library_entry.map(|e| e.key.clone()),
        ..MetaboliteThermo::default()
    };
    if m.special == Special::Proton {
        out.energy = Some(MetaboliteEnergy {
            value_kj: 0.0,
            sigma_kj: 0.0,
            origin: "fixed",
            source: "H+ is fixed by the compartment pH (transformed ΔfG'° = 0)".into(),
        });
        return out;
    }
    if let Some(e) = &m.dfg_prime {
        out.energy = Some(MetaboliteEnergy {
            value_kj: e.value_kj,
            sigma_kj: e.sigma_kj,
            origin: "model",
            source: e.source.clone(),
        });
    }
    // Species data: the model's own, else the library's.
    let (species, labels, sigma, source, origin, provenance) = match (&m.species, library_entry) {
        (Some(data), _) => (
            data.species.clone(),
            vec![String::new(); data.species.len()],
            data.sigma_kj,
            data.source.clone(),
            "species",
            Vec::new(),
        ),
        (None, Some(entry)) => (
            entry.species_list(),
            entry.species.iter().map(|s| s.label.clone()).collect(),
            LIBRARY_SIGMA_KJ,
            entry.source(),
            "library",
            provenance_lines(entry),
        ),
        (None, None) => return out,
    };
    let state = Transform::new(conditions).and_then(|t| t.reactant(&species));
    match state {
        Ok(state) => {
            if out.energy.is_none() {
                out.energy = Some(MetaboliteEnergy {
                    value_kj: state.dfg_prime_kj,
                    sigma_kj: sigma,
                    origin,
                    source,
                });
            }
            out.species = Some(SpeciesSummary {
                species,
                labels,
                conditions,
                state,
                provenance,
            });
        }
        Err(e) => {
            if out.energy.is_none() {
                out.problem = Some(format!("species data cannot be transformed: {e}"));
            }
        }
    }
    out
}

/// The library entry for a metabolite: explicit key, else cross-references,
/// else water by its role.
pub fn library_entry_for(model: &Model, i: usize) -> Option<&'static LibraryEntry> {
    let m = &model.metabolites[i];
    if let Some(key) = &m.library {
        return library::lookup_key(key);
    }
    library::lookup_xrefs(&m.xrefs).or_else(|| {
        (m.special == Special::Water)
            .then(|| library::lookup_key("water"))
            .flatten()
    })
}

fn provenance_lines(entry: &LibraryEntry) -> Vec<String> {
    let mut lines: Vec<String> = entry
        .species
        .iter()
        .map(|s| {
            let mut line = format!("{}: ΔfG° — {}", s.label, s.dfg0_source);
            if let Some(h) = &s.dfh0_source {
                line.push_str(&format!("; ΔfH° — {h}"));
            }
            line
        })
        .collect();
    if !entry.xref_source.is_empty() {
        lines.push(format!("cross-references: {}", entry.xref_source));
    }
    if !entry.note.is_empty() {
        lines.push(entry.note.clone());
    }
    lines
}

/// Mole fractions of each species over a pH grid at otherwise unchanged
/// conditions: (pH, fractions) pairs for the species chart.
pub fn distribution_curve(
    summary: &SpeciesSummary,
    from: f64,
    to: f64,
    steps: usize,
) -> Vec<(f64, Vec<f64>)> {
    (0..=steps)
        .filter_map(|k| {
            let ph = from + (to - from) * k as f64 / steps as f64;
            let mut c = summary.conditions;
            c.ph = ph;
            let state = Transform::new(c)
                .and_then(|t| t.reactant(&summary.species))
                .ok()?;
            Some((ph, state.fractions))
        })
        .collect()
}
