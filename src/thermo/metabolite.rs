//! Where a metabolite's ΔfG'° comes from, resolved once per metabolite.
//!
//! Order (a model value always wins over the library):
//! 1. `formation_energy` given in the model: valid at the compartment's
//!    conditions, or, when it says `at: {ph, ionic_strength, temperature}`,
//!    moved from those conditions to the compartment's (exactly with
//!    species data, else as one species with the formula's H count and the
//!    charge; a different temperature cannot be bridged without ΔfH°, so
//!    such a value is not used and the metabolite page says why);
//! 2. `species` data given in the model, transformed with Alberty's method
//!    at the compartment's pH, ionic strength, temperature (and pMg);
//! 3. the built-in library, by the `library:` key or by cross-reference
//!    (water is matched by its role too), transformed the same way.
//!
//! H+ is fixed by the pH: its transformed ΔfG'° is 0 by definition; free
//! Mg²⁺ likewise by the pMg where a compartment sets one.

use super::legendre::{Conditions, ReactantState, Transform};
use super::library::{self, LibraryEntry};
use crate::model::{Model, Special, Species, StatedConditions};

/// σ assigned to library values, kJ/mol. The printed tables carry no
/// uncertainty; 0.5 kJ/mol is our allowance for the rounding and the
/// Debye–Hückel approximation (our assumption, stated in the README).
pub const LIBRARY_SIGMA_KJ: f64 = 0.5;

/// A metabolite's ΔfG'° at its compartment's conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct MetaboliteEnergy {
    pub value_kj: f64,
    pub sigma_kj: f64,
    /// "model", "model-converted" (a model value moved from the conditions
    /// it was stated at), "species", "library", "fixed" (H+) or "fixed-pmg"
    /// (free Mg²⁺ where the compartment sets pMg).
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
    if compartment.pmg.is_some() && is_free_magnesium(model, i, library_entry) {
        out.energy = Some(MetaboliteEnergy {
            value_kj: 0.0,
            sigma_kj: 0.0,
            origin: "fixed-pmg",
            source:
                "free Mg²⁺ is fixed by the compartment's pMg (transformed ΔfG'° = 0, left out of Q)"
                    .into(),
        });
        return out;
    }
    // A model value stated at other conditions that cannot be moved here:
    // no ΔfG'° at all rather than a wrong one (or another source's).
    let mut unusable_model_value = false;
    if let (Some(e), None) = (&m.dfg_prime, e_at(m)) {
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
        (None, None) => {
            if let (Some(e), Some(at)) = (&m.dfg_prime, e_at(m)) {
                match converted(model, i, e, at, conditions, None) {
                    Ok(energy) => out.energy = Some(energy),
                    Err(problem) => out.problem = Some(problem),
                }
            }
            return out;
        }
    };
    if let (Some(e), Some(at)) = (&m.dfg_prime, e_at(m)) {
        match converted(model, i, e, at, conditions, Some(&species)) {
            Ok(energy) => out.energy = Some(energy),
            Err(problem) => {
                out.problem = Some(problem);
                unusable_model_value = true;
            }
        }
    }
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
            if out.energy.is_none() && !unusable_model_value {
                out.problem = Some(format!("species data cannot be transformed: {e}"));
            }
        }
    }
    if unusable_model_value {
        out.energy = None;
    }
    out
}

/// Free Mg²⁺: the library's entry, formula `Mg` with charge +2, or species
/// data of that one species. Where a compartment sets pMg it is fixed like
/// H+ by the pH (Alberty 2003): its transformed chemical potential is 0.
pub fn is_free_magnesium(model: &Model, i: usize, entry: Option<&LibraryEntry>) -> bool {
    let m = &model.metabolites[i];
    if entry.is_some_and(|e| e.key == "magnesium") {
        return true;
    }
    if m.formula.as_deref().map(str::trim) == Some("Mg") && m.charge == Some(2) {
        return true;
    }
    m.species.as_ref().is_some_and(|d| {
        matches!(d.species.as_slice(), [s] if s.magnesium == 1 && s.hydrogens == 0 && s.charge == 2)
    })
}

/// The conditions a model ΔfG'° was stated at, when it says so.
fn e_at(m: &crate::model::Metabolite) -> Option<StatedConditions> {
    m.dfg_prime.as_ref().and_then(|e| e.at)
}

/// A model ΔfG'° stated at `at` (unset parts: the compartment's), moved to
/// the compartment's `here` conditions. With species data the move is exact
/// (the difference of the reactant's transform at both conditions);
/// without, the compound is taken as one species with the formula's H count
/// and its charge (Jol et al., Biophys. J. 99 (2010) 3139).
fn converted(
    model: &Model,
    i: usize,
    e: &crate::model::Energy,
    at: StatedConditions,
    here: Conditions,
    species: Option<&[Species]>,
) -> Result<MetaboliteEnergy, String> {
    let m = &model.metabolites[i];
    let stated = Conditions {
        ph: at.ph.unwrap_or(here.ph),
        ionic_strength_m: at.ionic_strength_m.unwrap_or(here.ionic_strength_m),
        temperature_k: at.temperature_k.unwrap_or(here.temperature_k),
        pmg: here.pmg,
    };
    let describe = |c: &Conditions| {
        format!(
            "pH {:.2}, I = {:.3} M, {:.2} K",
            c.ph, c.ionic_strength_m, c.temperature_k
        )
    };
    if (stated.temperature_k - here.temperature_k).abs() > 1e-6 {
        return Err(format!(
            "formation_energy of `{}` is stated at {:.2} K but its compartment is at {:.2} K: a ΔfG'° alone cannot be moved to another temperature (that needs ΔfH°), so it is not used; give species data with ΔfH° or a value at {:.2} K",
            m.id, stated.temperature_k, here.temperature_k, here.temperature_k
        ));
    }
    let (from, to) = match (Transform::new(stated), Transform::new(here)) {
        (Ok(a), Ok(b)) => (a, b),
        (Err(err), _) | (_, Err(err)) => {
            return Err(format!(
                "formation_energy of `{}` cannot be moved: {err}",
                m.id
            ))
        }
    };
    let exact = species
        .and_then(|sp| Some(to.reactant_dfg_prime(sp).ok()? - from.reactant_dfg_prime(sp).ok()?));
    let (shift, how) = match exact {
        Some(shift) => (shift, "from its species data"),
        None => {
            let hydrogens = m
                .formula
                .as_deref()
                .and_then(|f| crate::chem::parse_formula(f).ok())
                .filter(|f| f.is_exact())
                .map(|f| f.count("H") as f64);
            match (hydrogens, m.charge) {
                (Some(h), Some(z)) => (
                    // Same temperature checked above, so this is Some.
                    to.single_species_shift(&from, h, f64::from(z))
                        .unwrap_or(0.0),
                    "as one species with the formula's H count and the charge",
                ),
                _ => {
                    if stated == here {
                        (0.0, "no change needed")
                    } else {
                        return Err(format!(
                            "formation_energy of `{}` is stated at {} but its compartment is at {}; moving it needs the formula and charge (or species data), which are missing, so it is not used",
                            m.id,
                            describe(&stated),
                            describe(&here)
                        ));
                    }
                }
            }
        }
    };
    let source = if e.source.is_empty() {
        String::new()
    } else {
        format!("{}; ", e.source)
    };
    Ok(MetaboliteEnergy {
        value_kj: e.value_kj + shift,
        sigma_kj: e.sigma_kj,
        origin: "model-converted",
        source: format!(
            "{source}{:.2} kJ/mol stated at {}, moved to this compartment's {} ({how}): {:+.2} kJ/mol",
            e.value_kj,
            describe(&stated),
            describe(&here),
            shift
        ),
    })
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
