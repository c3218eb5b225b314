//! Loops meet thermodynamics.
//!
//! Around a loop the net reaction is nothing, so Σ coef·ΔrG'° must vanish
//! (Hess's law, common practice); a sum beyond k·σ means the ΔrG'° data of
//! the loop are mutually inconsistent. Whatever the data, a loop cannot run:
//! the member whose loop direction is least plausible (largest ΔG'_min in
//! that direction) is the natural one to constrain, and re-checking the
//! loop-capable network with that direction forbidden (`recheck`) tells
//! whether doing so stops the loop's reactions from looping.

use super::network::ClosedNetwork;
use super::recheck::{Forbid, Rechecker, Witnesses};
use super::tolerance::ENERGY_SUM_ROUNDOFF;
use super::{LoopAnalysis, LoopError};
use crate::lp::LpError;
use crate::model::Model;
use crate::thermo::errors::ErrorModel;
use rayon::prelude::*;
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// ΔrG'° of a reaction as written, with its standard uncertainty (kJ/mol).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StandardDeltaG {
    pub value_kj: f64,
    pub sigma_kj: f64,
}

/// Range of ΔrG' of a reaction as written over the allowed concentrations
/// (kJ/mol), uncertainty allowance included as the caller sees fit.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct DeltaGRange {
    pub min_kj: f64,
    pub max_kj: f64,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LoopEnergyOptions {
    /// Confidence multiplier k: a sum beyond k·σ is inconsistent.
    pub confidence: f64,
    /// Re-check at most this many suggested constraints (each costs a few
    /// warm LP edits on the loop-capable network); `None` = all.
    pub recheck_limit: Option<usize>,
}

impl Default for LoopEnergyOptions {
    fn default() -> LoopEnergyOptions {
        LoopEnergyOptions {
            confidence: 1.96,
            recheck_limit: Some(200),
        }
    }
}

/// Where the ΔG'_min used to pick the member to constrain came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum DeltaGBasis {
    /// The given ΔG'_min/ΔG'_max range.
    Range,
    /// ΔrG'° ∓ k·σ (no range given for that reaction).
    Standard,
}

/// The member to constrain and what constraining it does.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ConstraintSuggestion {
    pub reaction: String,
    pub index: usize,
    /// Direction the loop uses and the constraint forbids: "forward" or "backward".
    pub forbid: &'static str,
    /// Smallest ΔG' of the reaction in the loop's direction (kJ/mol).
    pub dg_min_in_loop_direction_kj: f64,
    pub basis: DeltaGBasis,
    /// `None` when the re-check limit was reached.
    pub rechecked: Option<Recheck>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Recheck {
    /// Loop members still loop-capable in their loop direction with the
    /// constraint in place.
    pub still_looping: Vec<String>,
    /// No member of the loop can still loop in its loop direction.
    pub breaks_loop: bool,
}

/// Thermodynamic view of one loop.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoopEnergy {
    pub loop_id: String,
    /// Σ coef·ΔrG'° over members with data (kJ/mol).
    pub sum_kj: f64,
    /// σ of the sum (kJ/mol): of its net error per independent source when
    /// the caller gives an error model ([`assess_loop_energies_correlated`]),
    /// else √Σ (coef·σ)² with members taken as independent.
    pub sigma_kj: f64,
    /// Members with no ΔrG'°; the sum is partial when nonempty.
    pub members_without_data: Vec<String>,
    /// Complete data and |sum| > k·σ.
    pub inconsistent: bool,
    /// |sum| / σ when complete and σ > 0.
    pub deviation_sigmas: Option<f64>,
    pub constrain: Option<ConstraintSuggestion>,
    /// For a reversible loop, the same for the loop run backwards (every
    /// coefficient negated), which the loop list does not repeat.
    pub constrain_reversed: Option<ConstraintSuggestion>,
}

/// Confronts every loop of `analysis` with ΔrG'° (`standard`) and ΔG'
/// ranges (`ranges`), both indexed like `model.reactions` (missing entries
/// or a shorter slice mean no data). The members' errors are taken as
/// independent; see [`assess_loop_energies_correlated`].
pub fn assess_loop_energies(
    model: &Model,
    analysis: &LoopAnalysis,
    standard: &[Option<StandardDeltaG>],
    ranges: &[Option<DeltaGRange>],
    options: &LoopEnergyOptions,
) -> Result<Vec<LoopEnergy>, LoopError> {
    let independent = |members: &[(usize, f64)]| {
        members.iter().fold(0.0f64, |acc, &(j, c)| {
            acc.hypot(
                c * standard
                    .get(j)
                    .copied()
                    .flatten()
                    .map_or(0.0, |d| d.sigma_kj),
            )
        })
    };
    assess(model, analysis, standard, ranges, &independent, options)
}

/// As [`assess_loop_energies`], with the σ of each loop sum from the net
/// coefficients of shared error sources (`errors`, indexed like
/// `model.reactions`): a compound's error met twice around the loop cancels
/// instead of being counted twice (JCGM 100:2008, §5.2).
pub fn assess_loop_energies_correlated(
    model: &Model,
    analysis: &LoopAnalysis,
    standard: &[Option<StandardDeltaG>],
    ranges: &[Option<DeltaGRange>],
    errors: &ErrorModel,
    options: &LoopEnergyOptions,
) -> Result<Vec<LoopEnergy>, LoopError> {
    let correlated = |members: &[(usize, f64)]| {
        errors.sigma(
            &errors.combine(
                members
                    .iter()
                    .copied()
                    .filter(|&(j, _)| j < errors.reactions.len()),
            ),
        )
    };
    assess(model, analysis, standard, ranges, &correlated, options)
}

/// σ of Σ coef·ΔrG'° over (reaction index, coefficient) pairs.
type SigmaOf<'a> = dyn Fn(&[(usize, f64)]) -> f64 + 'a;

/// The work of both entry points; `sigma_of` gives the σ of Σ coef·ΔrG'°
/// over (reaction index, coefficient) pairs that all have data.
fn assess(
    model: &Model,
    analysis: &LoopAnalysis,
    standard: &[Option<StandardDeltaG>],
    ranges: &[Option<DeltaGRange>],
    sigma_of: &SigmaOf,
    options: &LoopEnergyOptions,
) -> Result<Vec<LoopEnergy>, LoopError> {
    let k = options.confidence;
    let mut rechecks: Vec<PendingRecheck> = Vec::new();
    let mut out = Vec::with_capacity(analysis.loops.len());
    for (position, cycle) in analysis.loops.iter().enumerate() {
        let mut sum = 0.0;
        let mut with_data = Vec::new();
        let mut without = Vec::new();
        for member in &cycle.members {
            match standard.get(member.index).copied().flatten() {
                Some(d) => {
                    sum += member.coefficient * d.value_kj;
                    with_data.push((member.index, member.coefficient));
                }
                None => without.push(member.reaction.clone()),
            }
        }
        let sigma = sigma_of(&with_data);
        let complete = without.is_empty();
        let inconsistent = complete && sum.abs() > k * sigma + ENERGY_SUM_ROUNDOFF;
        let deviation_sigmas = (complete && sigma > 0.0).then(|| sum.abs() / sigma);
        let orientations: &[f64] = if cycle.reversible {
            &[1.0, -1.0]
        } else {
            &[1.0]
        };
        let mut suggestions = Vec::new();
        for &orientation in orientations {
            let Some((dg_min, index, c, basis)) =
                least_plausible(cycle, orientation, standard, ranges, k)
            else {
                suggestions.push(None);
                continue;
            };
            if options.recheck_limit.is_none_or(|l| rechecks.len() < l) {
                rechecks.push(PendingRecheck {
                    position,
                    reversed: orientation < 0.0,
                    orientation,
                    index,
                    coefficient: c,
                });
            }
            suggestions.push(Some(ConstraintSuggestion {
                reaction: model.reactions[index].id.clone(),
                index,
                forbid: if c > 0.0 { "forward" } else { "backward" },
                dg_min_in_loop_direction_kj: dg_min,
                basis,
                rechecked: None,
            }));
        }
        let mut suggestions = suggestions.into_iter();
        let constrain = suggestions.next().flatten();
        let constrain_reversed = suggestions.next().flatten();
        out.push(LoopEnergy {
            loop_id: cycle.id.clone(),
            sum_kj: sum,
            sigma_kj: sigma,
            members_without_data: without,
            inconsistent,
            deviation_sigmas,
            constrain,
            constrain_reversed,
        });
    }
    if rechecks.is_empty() {
        return Ok(out);
    }
    let lp_error = |source| LoopError {
        model: model.id.clone(),
        stage: "constraint re-check",
        source,
    };
    let capable = analysis.capable_directions(model.reactions.len());
    let (network, _) = ClosedNetwork::close(model);
    let forbids: Vec<Forbid> = rechecks
        .iter()
        .map(|p| (p.index, p.coefficient.signum()))
        .collect();
    let wanted: Vec<Vec<(usize, f64)>> = rechecks
        .iter()
        .map(|pending| {
            analysis.loops[pending.position]
                .members
                .iter()
                .map(|m| (m.index, pending.orientation * m.coefficient))
                .collect()
        })
        .collect();
    // Answers the listed loops already give; only the rest go to the LP.
    let witnesses = Witnesses::new(&analysis.loops);
    let known: Vec<Vec<Option<bool>>> = wanted
        .iter()
        .zip(&forbids)
        .map(|(wanted, &forbid)| {
            wanted
                .iter()
                .map(|&w| witnesses.shows(w, forbid).then_some(true))
                .collect()
        })
        .collect();
    // The answer to an open question (forbidden direction, member, sign)
    // depends on nothing else, so a question several re-checks share is
    // asked once. Questions are independent feasibility questions (the
    // answers do not depend on the LP's warm state): sorted, cut into one
    // chunk per core, each with its own session, one forbidding edit per
    // run of questions with the same forbidden direction.
    let questions: Vec<Question> = wanted
        .iter()
        .zip(&forbids)
        .zip(&known)
        .flat_map(|((wanted, &(r, s)), known)| {
            wanted
                .iter()
                .zip(known)
                .filter(|(_, k)| k.is_none())
                .map(move |(&(m, t), _)| (r, s > 0.0, m, t > 0.0))
        })
        .collect::<BTreeSet<Question>>()
        .into_iter()
        .collect();
    let workers = rayon::current_num_threads().max(1);
    let chunk = questions.len().div_ceil(workers).max(1);
    let answered: BTreeMap<Question, bool> = questions
        .par_chunks(chunk)
        .map(|part| {
            let mut rechecker = Rechecker::new(
                network.metabolite_count,
                &network.columns,
                &capable,
                &forbids,
            )?;
            let mut out = Vec::with_capacity(part.len());
            for group in part.chunk_by(|a, b| (a.0, a.1) == (b.0, b.1)) {
                let forbid = (group[0].0, sign_of(group[0].1));
                let asked: Vec<(usize, f64)> = group.iter().map(|q| (q.2, sign_of(q.3))).collect();
                let (flags, _) =
                    rechecker.still_capable(forbid, &asked, &vec![None; asked.len()])?;
                out.extend(group.iter().copied().zip(flags));
            }
            Ok(out)
        })
        .collect::<Result<Vec<Vec<(Question, bool)>>, LpError>>()
        .map_err(lp_error)?
        .into_iter()
        .flatten()
        .collect();
    let answers: Vec<Vec<bool>> = wanted
        .iter()
        .zip(&forbids)
        .zip(&known)
        .map(|((wanted, &(r, s)), known)| {
            wanted
                .iter()
                .zip(known)
                .map(|(&(m, t), k)| k.unwrap_or_else(|| answered[&(r, s > 0.0, m, t > 0.0)]))
                .collect()
        })
        .collect();
    for (pending, looping) in rechecks.iter().zip(answers) {
        let cycle = &analysis.loops[pending.position];
        let still_looping: Vec<String> = cycle
            .members
            .iter()
            .zip(looping)
            .filter(|(_, still)| *still)
            .map(|(m, _)| m.reaction.clone())
            .collect();
        let energy = &mut out[pending.position];
        let slot = if pending.reversed {
            &mut energy.constrain_reversed
        } else {
            &mut energy.constrain
        };
        if let Some(suggestion) = slot {
            suggestion.rechecked = Some(Recheck {
                breaks_loop: still_looping.is_empty(),
                still_looping,
            });
        }
    }
    Ok(out)
}

/// An open re-check question: (forbidden reaction, forbids forward?,
/// member, asked forward?).
type Question = (usize, bool, usize, bool);

fn sign_of(forward: bool) -> f64 {
    if forward {
        1.0
    } else {
        -1.0
    }
}

/// A suggested constraint waiting for its re-check.
struct PendingRecheck {
    /// Index of the loop in the analysis.
    position: usize,
    /// The suggestion is for the loop run backwards.
    reversed: bool,
    orientation: f64,
    /// Reaction whose loop direction is forbidden, and its signed coefficient.
    index: usize,
    coefficient: f64,
}

/// The member with the largest ΔG'_min in its loop direction (coefficients
/// multiplied by `orientation`): (ΔG'_min, index, signed coefficient, basis).
fn least_plausible(
    cycle: &super::ElementaryLoop,
    orientation: f64,
    standard: &[Option<StandardDeltaG>],
    ranges: &[Option<DeltaGRange>],
    k: f64,
) -> Option<(f64, usize, f64, DeltaGBasis)> {
    let mut worst: Option<(f64, usize, f64, DeltaGBasis)> = None;
    for member in &cycle.members {
        let c = orientation * member.coefficient;
        let range = ranges.get(member.index).copied().flatten();
        let data = standard.get(member.index).copied().flatten();
        let candidate = match (range, data) {
            (Some(r), _) => Some((
                if c > 0.0 { r.min_kj } else { -r.max_kj },
                DeltaGBasis::Range,
            )),
            (None, Some(d)) => Some((
                c.signum() * d.value_kj - k * d.sigma_kj,
                DeltaGBasis::Standard,
            )),
            (None, None) => None,
        };
        if let Some((dg_min, basis)) = candidate {
            if worst.is_none_or(|(best, ..)| dg_min > best) {
                worst = Some((dg_min, member.index, c, basis));
            }
        }
    }
    worst
}
