//! The joint scenario results (`crate::scenarios`) as report views; called
//! from `build.rs`.

use super::scenario_view::*;
use super::ParticipantView;
use crate::analysis::Analysis;
use crate::model::Model;
use crate::scenarios::{
    mdf::reading, Binding, JointOutcome, JointProblem, JointVarKind, MdfResult, Repair,
    ScenarioResult,
};
use crate::slug::unique_slugs;
use std::collections::{BTreeMap, BTreeSet};

pub(super) struct Slugs<'a> {
    pub reactions: &'a [String],
    pub metabolites: &'a [String],
}

pub(super) fn joint_views(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
) -> Vec<JointScenarioView> {
    let page_slugs = unique_slugs(analysis.scenarios.iter().map(|s| s.id.as_str()));
    analysis
        .scenarios
        .iter()
        .zip(page_slugs)
        .map(|(s, slug)| one(model, analysis, slugs, s, slug))
        .collect()
}

fn direction_word(d: f64) -> &'static str {
    if d >= 0.0 {
        "forward"
    } else {
        "backward"
    }
}

fn one(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
    s: &ScenarioResult,
    slug: String,
) -> JointScenarioView {
    let problem = &s.problem;
    let mut view = JointScenarioView {
        id: s.id.clone(),
        slug,
        description: s.description.clone(),
        is_default: s.is_default,
        verdict: s.verdict().slug().to_string(),
        reason: s.outcome.as_ref().err().map(|e| e.to_string()),
        constrained: problem.steps.len(),
        without_data: s
            .without_data
            .iter()
            .map(|&j| model.reactions[j].id.clone())
            .collect(),
        mdf: None,
        conflicts: Vec::new(),
        more_conflicts_possible: false,
        profile: Vec::new(),
        loop_law: s.loop_law.as_ref().map(|l| loop_law_view(model, slugs, l)),
    };
    let mdf = match &s.outcome {
        Ok(JointOutcome::Feasible(mdf)) => mdf.as_ref(),
        Ok(JointOutcome::Infeasible {
            mdf,
            conflicts,
            more_sets_possible,
        }) => {
            view.conflicts = conflicts
                .iter()
                .map(|c| conflict_view(model, analysis, slugs, problem, c))
                .collect();
            view.more_conflicts_possible = *more_sets_possible;
            Some(mdf)
        }
        Err(_) => None,
    };
    if let Some(mdf) = mdf {
        view.mdf = Some(mdf_view(model, slugs, problem, mdf));
        view.profile = profile(model, analysis, slugs, problem, mdf);
    }
    view
}

fn mdf_view(model: &Model, slugs: &Slugs, problem: &JointProblem, mdf: &MdfResult) -> MdfView {
    let window: BTreeMap<usize, (f64, f64)> = problem
        .vars
        .iter()
        .filter_map(|v| match v.kind {
            JointVarKind::LnConcentration { metabolite } => {
                Some((metabolite, (v.lower.exp(), v.upper.exp())))
            }
            _ => None,
        })
        .collect();
    MdfView {
        value_kj: mdf.value_kj,
        reading: reading(mdf.value_kj),
        bottlenecks: mdf
            .bottlenecks
            .iter()
            .map(|&(step, dual)| {
                let j = problem.steps[step].reaction;
                BottleneckView {
                    reaction: model.reactions[j].id.clone(),
                    slug: slugs.reactions[j].clone(),
                    dual,
                }
            })
            .collect(),
        concentrations: mdf
            .concentrations
            .iter()
            .map(|&(i, value)| {
                let (min, max) = window.get(&i).copied().unwrap_or((value, value));
                let near = |b: f64| (value / b - 1.0).abs() < 1e-6;
                ConcentrationView {
                    metabolite: model.metabolites[i].id.clone(),
                    slug: slugs.metabolites[i].clone(),
                    value_m: value,
                    min_m: min,
                    max_m: max,
                    at_bound: if near(max) {
                        Some("upper".into())
                    } else if near(min) {
                        Some("lower".into())
                    } else {
                        None
                    },
                }
            })
            .collect(),
    }
}

fn participant_views(model: &Model, slugs: &Slugs, j: usize) -> Vec<ParticipantView> {
    model.reactions[j]
        .stoichiometry
        .iter()
        .map(|&(i, c)| ParticipantView {
            metabolite: model.metabolites[i].id.clone(),
            slug: slugs.metabolites[i].clone(),
            name: model.metabolites[i].name.clone(),
            coefficient: c,
        })
        .collect()
}

fn conflict_view(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
    problem: &JointProblem,
    c: &crate::scenarios::ConflictSet,
) -> ConflictSetView {
    let members = c
        .steps
        .iter()
        .zip(&c.weights)
        .map(|(&s, &w)| {
            let step = &problem.steps[s];
            let j = step.reaction;
            ConflictMemberView {
                reaction: model.reactions[j].id.clone(),
                slug: slugs.reactions[j].clone(),
                equation: super::build::equation_text(model, j),
                direction: direction_word(step.direction).into(),
                weight: w,
                drg0_kj: step.drg0_kj,
                sigma_kj: step.sigma_kj,
                participants: participant_views(model, slugs, j),
            }
        })
        .collect();
    // A reaction's own ΔrG'° is both an error source and an allowance row:
    // list it once.
    let mut seen = BTreeSet::new();
    let binding = c
        .binding
        .iter()
        .map(|b| binding_view(model, analysis, slugs, problem, b))
        .filter(|b| seen.insert((b.subject.clone(), b.side.clone())))
        .collect();
    let repairs = c
        .repairs
        .iter()
        .map(|r| match *r {
            Repair::WidenRange {
                metabolite,
                decades,
                upper,
                new_bound_m,
            } => {
                let id = &model.metabolites[metabolite].id;
                let side = if upper { "upper" } else { "lower" };
                RepairView {
                    kind: "widen-range".into(),
                    subject: id.clone(),
                    slug: slugs.metabolites[metabolite].clone(),
                    amount: decades,
                    new_bound_m: Some(new_bound_m),
                    side: Some(side.into()),
                    sigmas: None,
                    text: format!(
                        "widen the {side} bound of {id} by {decades:.2} decades (to {})",
                        concentration_text(new_bound_m)
                    ),
                }
            }
            Repair::ShiftEnergy {
                step,
                shift_kj,
                sigmas,
            } => {
                let j = problem.steps[step].reaction;
                let id = &model.reactions[j].id;
                let dir = direction_word(problem.steps[step].direction);
                RepairView {
                    kind: "shift-energy".into(),
                    subject: id.clone(),
                    slug: slugs.reactions[j].clone(),
                    amount: shift_kj,
                    new_bound_m: None,
                    side: None,
                    sigmas,
                    text: match sigmas {
                        Some(n) => format!(
                            "ΔrG'° of {id} ({dir}) {shift_kj:.2} kJ/mol lower than the allowance permits ({n:.1} σ more)"
                        ),
                        None => format!(
                            "ΔrG'° of {id} ({dir}) {shift_kj:.2} kJ/mol lower (its value has no σ)"
                        ),
                    },
                }
            }
        })
        .collect();
    ConflictSetView {
        members,
        overall_kj: c.overall_kj,
        required_kj: c.required_kj,
        binding,
        repairs,
    }
}

fn binding_view(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
    problem: &JointProblem,
    b: &Binding,
) -> BindingView {
    let side = |upper: bool| if upper { "upper" } else { "lower" }.to_string();
    match *b {
        Binding::Variable(k, upper) => {
            let v = &problem.vars[k];
            let bound = if upper { v.upper } else { v.lower };
            match v.kind {
                JointVarKind::LnConcentration { metabolite } => BindingView {
                    kind: "concentration".into(),
                    subject: model.metabolites[metabolite].id.clone(),
                    slug: slugs.metabolites[metabolite].clone(),
                    side: side(upper),
                    value: bound.exp(),
                },
                JointVarKind::Deviation { source } => BindingView {
                    kind: "uncertainty".into(),
                    subject: analysis.errors.sources[source].label.clone(),
                    slug: String::new(),
                    side: side(upper),
                    value: bound,
                },
            }
        }
        Binding::Allowance(s, upper) => {
            let step = &problem.steps[s];
            let limit = step.allowance.unwrap_or(0.0);
            BindingView {
                kind: "uncertainty".into(),
                subject: format!("ΔrG'° of {}", model.reactions[step.reaction].id),
                slug: String::new(),
                side: side(upper),
                value: if upper { limit } else { -limit },
            }
        }
    }
}

/// "2.5 mM" style text for repair messages.
fn concentration_text(m: f64) -> String {
    let (value, unit) = if m >= 1.0 {
        (m, "M")
    } else if m >= 1e-3 {
        (m * 1e3, "mM")
    } else if m >= 1e-6 {
        (m * 1e6, "µM")
    } else {
        (m * 1e9, "nM")
    };
    format!("{value:.3} {unit}")
}

/// Cumulative ΔG' along the longest chain of active steps linked by
/// pathway intermediates (metabolites made by exactly one active step and
/// used by exactly one other), at the MDF concentrations with central
/// ΔrG'°; the band is k·σ of each partial sum, shared errors counted once.
fn profile(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
    problem: &JointProblem,
    mdf: &MdfResult,
) -> Vec<ProfileStepView> {
    let chain = longest_chain(problem);
    let mut cumulative = 0.0;
    let mut prefix: Vec<(usize, f64)> = Vec::new();
    chain
        .into_iter()
        .map(|s| {
            let step = &problem.steps[s];
            let dg = step
                .terms
                .iter()
                .filter(|&&(k, _)| {
                    matches!(problem.vars[k].kind, JointVarKind::LnConcentration { .. })
                })
                .map(|&(k, a)| a * mdf.values[k])
                .sum::<f64>()
                - step.rhs;
            cumulative += dg;
            prefix.push((step.reaction, step.direction));
            let band = analysis.sigma_multiplier
                * analysis
                    .errors
                    .sigma(&analysis.errors.combine(prefix.iter().copied()));
            ProfileStepView {
                reaction: model.reactions[step.reaction].id.clone(),
                slug: slugs.reactions[step.reaction].clone(),
                dg_kj: dg,
                cumulative_kj: cumulative,
                band_kj: band,
            }
        })
        .collect()
}

/// Longest path over steps linked by intermediates (see [`profile`]);
/// cycles are cut where the search meets a step already on its path.
pub fn longest_chain(problem: &JointProblem) -> Vec<usize> {
    let mut producers: BTreeMap<usize, Vec<usize>> = BTreeMap::new();
    let mut consumers: BTreeMap<usize, Vec<usize>> = BTreeMap::new();
    for (s, step) in problem.steps.iter().enumerate() {
        for &(k, a) in &step.terms {
            if !matches!(problem.vars[k].kind, JointVarKind::LnConcentration { .. }) {
                continue;
            }
            if a > 0.0 {
                producers.entry(k).or_default().push(s);
            } else {
                consumers.entry(k).or_default().push(s);
            }
        }
    }
    let mut next: Vec<BTreeSet<usize>> = vec![BTreeSet::new(); problem.steps.len()];
    let mut has_previous = vec![false; problem.steps.len()];
    for (k, made) in &producers {
        if let (Some(used), [from]) = (consumers.get(k), made.as_slice()) {
            if let [to] = used.as_slice() {
                if from != to {
                    next[*from].insert(*to);
                    has_previous[*to] = true;
                }
            }
        }
    }
    // Memoised longest path from each step (intermediates have one producer
    // and one consumer, so every step has few successors).
    let mut memo: Vec<Option<Vec<usize>>> = vec![None; problem.steps.len()];
    let mut on_path = vec![false; problem.steps.len()];
    fn walk(
        s: usize,
        next: &[BTreeSet<usize>],
        memo: &mut [Option<Vec<usize>>],
        on_path: &mut [bool],
    ) -> Vec<usize> {
        if let Some(done) = &memo[s] {
            return done.clone();
        }
        on_path[s] = true;
        let mut best: Vec<usize> = Vec::new();
        for &t in &next[s] {
            if on_path[t] {
                continue;
            }
            let path = walk(t, next, memo, on_path);
            if path.len() > best.len() {
                best = path;
            }
        }
        on_path[s] = false;
        let mut path = vec![s];
        path.extend(best);
        memo[s] = Some(path.clone());
        path
    }
    let mut best: Vec<usize> = Vec::new();
    let starts: Vec<usize> = (0..problem.steps.len())
        .filter(|&s| !has_previous[s])
        .chain(0..problem.steps.len())
        .collect();
    for s in starts {
        let path = walk(s, &next, &mut memo, &mut on_path);
        if path.len() > best.len() {
            best = path;
        }
    }
    best
}

fn loop_law_view(
    model: &Model,
    slugs: &Slugs,
    result: &Result<crate::scenarios::LoopLawResult, crate::scenarios::Undecided>,
) -> LoopLawView {
    match result {
        Err(e) => LoopLawView {
            error: Some(e.to_string()),
            loop_free: false,
            cycles: Vec::new(),
            fluxes: Vec::new(),
        },
        Ok(r) => LoopLawView {
            error: None,
            loop_free: r.loop_free,
            cycles: r
                .cycles
                .iter()
                .map(|c| FluxCycleView {
                    members: c
                        .members
                        .iter()
                        .map(|&(j, coefficient)| CycleMemberView {
                            reaction: model.reactions[j].id.clone(),
                            slug: slugs.reactions[j].clone(),
                            coefficient,
                        })
                        .collect(),
                    flux: c.flux,
                })
                .collect(),
            fluxes: r
                .cycle_free
                .iter()
                .map(|&(j, given, free)| FluxPairView {
                    reaction: model.reactions[j].id.clone(),
                    slug: slugs.reactions[j].clone(),
                    given,
                    loop_free: free,
                    differs: (given - free).abs() > 1e-9 * given.abs().max(1.0),
                })
                .collect(),
        },
    }
}
