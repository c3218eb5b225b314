//! One ΔfG'° copied into compartments of different conditions.
//!
//! A `formation_energy` holds at one pH, ionic strength and temperature. The
//! same number (same value and source, e.g. one side-table row reached
//! through an xref) given for a compound in compartments whose conditions
//! differ cannot be right in all of them, and a transport step between them
//! gets a silently wrong ΔrG'° (glucose between pH 6 and pH 7: 12·RT·ln10 =
//! 68.5 kJ/mol off, where the right answer for a neutral species is near 0).
//! Values that say where they hold (`at:`) are moved to each compartment by
//! `metabolite::resolve` and are not copies in this sense.

use std::collections::BTreeMap;

use super::legendre::{Conditions, Transform};
use super::metabolite::MetaboliteThermo;
use crate::model::Model;

/// A group of metabolites sharing one unconverted ΔfG'° across
/// compartments of different conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct CopiedEnergy {
    /// Metabolite indices, ascending.
    pub metabolites: Vec<usize>,
    pub value_kj: f64,
    pub source: String,
    /// Largest error the copy can cause between two of its compartments,
    /// kJ/mol: the single-species shift with the formula's H count and the
    /// charge (Jol et al., Biophys. J. 99 (2010) 3139). `None` when it cannot
    /// be sized (no formula or charge, or different temperatures).
    pub possible_error_kj: Option<f64>,
    /// Reactions with members of the group in two or more compartments:
    /// their ΔrG'° rests on the copy.
    pub reactions: Vec<usize>,
}

/// Every copied value of the model, ordered by first metabolite.
pub fn find_copies(model: &Model, thermo: &[MetaboliteThermo]) -> Vec<CopiedEnergy> {
    // Same value, σ and source, and the same formula (a copy of one
    // compound's datum, not two compounds that happen to share a number).
    let mut groups: BTreeMap<(u64, u64, &str, Option<&str>), Vec<usize>> = BTreeMap::new();
    for (i, m) in model.metabolites.iter().enumerate() {
        let Some(e) = &m.dfg_prime else { continue };
        let used_as_given = thermo[i]
            .energy
            .as_ref()
            .is_some_and(|t| t.origin == "model");
        if e.at.is_some() || !used_as_given {
            continue;
        }
        groups
            .entry((
                e.value_kj.to_bits(),
                e.sigma_kj.to_bits(),
                e.source.as_str(),
                m.formula.as_deref(),
            ))
            .or_default()
            .push(i);
    }
    let conditions = |i: usize| {
        let c = model.metabolites[i].compartment;
        Conditions::of_compartment(&model.compartments[c], model.temperature_k)
    };
    let mut out = Vec::new();
    for members in groups.into_values() {
        let differ = members.iter().any(|&a| {
            members
                .iter()
                .any(|&b| different(&conditions(a), &conditions(b)))
        });
        if !differ {
            continue;
        }
        let first = &model.metabolites[members[0]];
        let mut reactions: Vec<usize> = model
            .reactions
            .iter()
            .enumerate()
            .filter(|(_, r)| {
                let mut compartments: Vec<usize> = r
                    .stoichiometry
                    .iter()
                    .filter(|(i, _)| members.contains(i))
                    .map(|&(i, _)| model.metabolites[i].compartment)
                    .collect();
                compartments.sort_unstable();
                compartments.dedup();
                compartments.len() > 1
            })
            .map(|(j, _)| j)
            .collect();
        reactions.sort_unstable();
        out.push(CopiedEnergy {
            possible_error_kj: possible_error(model, &members, &conditions),
            value_kj: first.dfg_prime.as_ref().map_or(0.0, |e| e.value_kj),
            source: first
                .dfg_prime
                .as_ref()
                .map(|e| e.source.clone())
                .unwrap_or_default(),
            metabolites: members,
            reactions,
        });
    }
    out
}

fn different(a: &Conditions, b: &Conditions) -> bool {
    (a.ph - b.ph).abs() > 1e-9
        || (a.ionic_strength_m - b.ionic_strength_m).abs() > 1e-12
        || (a.temperature_k - b.temperature_k).abs() > 1e-6
}

/// Largest |single-species shift| between two members' compartments.
fn possible_error(
    model: &Model,
    members: &[usize],
    conditions: &dyn Fn(usize) -> Conditions,
) -> Option<f64> {
    let m = &model.metabolites[members[0]];
    let formula = crate::chem::parse_formula(m.formula.as_deref()?).ok()?;
    if !formula.is_exact() {
        return None;
    }
    let hydrogens = formula.count("H") as f64;
    let charge = f64::from(m.charge?);
    let mut worst: f64 = 0.0;
    for &a in members {
        for &b in members {
            let from = Transform::new(conditions(a)).ok()?;
            let to = Transform::new(conditions(b)).ok()?;
            worst = worst.max(to.single_species_shift(&from, hydrogens, charge)?.abs());
        }
    }
    Some(worst)
}
