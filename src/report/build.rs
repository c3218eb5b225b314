//! Turning an analysis into the Report: the one place that reads model
//! types on the output side.

use super::*;
use crate::analysis::Analysis;
use crate::model::{Model, Special};
use crate::project::Note;
use crate::slug::unique_slugs;

/// The standing caution printed on every report.
pub const CAUTION: &str = "ΔG values here are estimates and carry uncertainty (σ is shown beside each). \
A flagged contradiction or marginal step is a prompt for expert review against measurements and the literature, \
not a verdict on the biology.";

pub use crate::finding::sort_findings;

/// The report from the analysed data, the findings of the checks, the
/// catalogue of checks that ran (their `findings` counts are filled in here)
/// and the project's notes. It reads results only: nothing here runs an
/// analysis or a check (`pipeline` does, before).
pub fn build(
    analysis: &Analysis,
    findings: Vec<Finding>,
    checks: Vec<CheckInfo>,
    notes: &[Note],
) -> Report {
    let model = analysis.model;
    let settings = analysis.settings;
    let mut by_kind: BTreeMap<String, usize> = BTreeMap::new();
    for f in &findings {
        *by_kind.entry(f.kind.clone()).or_default() += 1;
    }
    let count = |s: Severity| findings.iter().filter(|f| f.severity == s).count();
    let summary = Summary {
        reactions: model.reactions.len(),
        internal_reactions: (0..model.reactions.len())
            .filter(|&j| analysis.is_thermodynamic(j))
            .count(),
        metabolites: model.metabolites.len(),
        compartments: model.compartments.len(),
        scenarios: model.scenarios.len(),
        errors: count(Severity::Error),
        warnings: count(Severity::Warning),
        notes: count(Severity::Note),
        reactions_with_energy: analysis
            .reaction_thermo
            .iter()
            .filter(|t| t.is_ok())
            .count(),
        metabolites_with_energy: analysis
            .metabolites
            .iter()
            .filter(|m| m.energy.is_some())
            .count(),
        by_kind,
        checks: checks
            .into_iter()
            .map(|c| CheckInfo {
                findings: findings
                    .iter()
                    .filter(|f| c.kinds.contains(&f.kind))
                    .count(),
                ..c
            })
            .collect(),
    };
    let mut report = Report {
        schema_version: REPORT_SCHEMA_VERSION,
        tool: ToolInfo {
            name: "gibbsite".into(),
            version: env!("CARGO_PKG_VERSION").into(),
            generated: generated_timestamp(),
        },
        project: ProjectInfo {
            title: settings.title.clone(),
            model_id: model.id.clone(),
            model_title: model.title.clone(),
            temperature_k: model.temperature_k,
            confidence: settings.confidence,
            sigma_multiplier: analysis.sigma_multiplier,
            min_driving_force_kj: settings.min_driving_force_kj,
            default_concentration_m: RangeView {
                min: settings.default_concentration.min,
                max: settings.default_concentration.max,
            },
            caution: CAUTION.into(),
            map_side: settings.map_side.clone(),
            map_main: settings.map_main.clone(),
        },
        summary,
        findings,
        compartments: model
            .compartments
            .iter()
            .enumerate()
            .map(|(c, x)| CompartmentView {
                id: x.id.clone(),
                name: x.name.clone(),
                ph: x.ph,
                ionic_strength_m: x.ionic_strength_m,
                potential_mv: x.potential_mv,
                temperature_k: model.compartment_temperature(c),
                pmg: x.pmg,
                conditions_stated: !settings.unset_conditions.contains(&c),
                conditions_source: settings.condition_sources.get(&c).cloned(),
            })
            .collect(),
        metabolites: metabolite_views(model, analysis),
        reactions: reaction_views(model, analysis),
        scenarios: scenario_views(model, analysis),
        notes: notes
            .iter()
            .map(|n| NoteView {
                slug: n.slug.clone(),
                title: n.title.clone(),
                markdown: n.markdown.clone(),
            })
            .collect(),
        loops: loops_view(model, analysis),
        joint_scenarios: super::scenario_build::joint_views(
            model,
            analysis,
            &super::scenario_build::Slugs {
                reactions: &unique_slugs(model.reactions.iter().map(|r| r.id.as_str())),
                metabolites: &metabolite_slugs(model),
            },
        ),
        coverage: Some(super::coverage::coverage(analysis)),
        headline: None,
        root_causes: Vec::new(),
    };
    report.headline = Some(super::headline::headline(&report));
    report.root_causes = super::root_causes::root_causes(&report);
    report
}

/// SOURCE_DATE_EPOCH as seconds: `Ok(None)` when unset or empty, an error
/// naming the value when it is not a whole number of seconds between 1970
/// and 9999 (a malformed value must not silently become "now").
pub fn source_date_epoch() -> Result<Option<i64>, String> {
    let Some(raw) = std::env::var_os("SOURCE_DATE_EPOCH") else {
        return Ok(None);
    };
    let text = raw.to_string_lossy();
    if text.trim().is_empty() {
        return Ok(None);
    }
    text.trim()
        .parse::<i64>()
        .ok()
        .filter(|s| (0..=253_402_300_799).contains(s))
        .map(Some)
        .ok_or_else(|| {
            format!(
                "SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC, found `{text}`"
            )
        })
}

/// RFC 3339 UTC time of the run; SOURCE_DATE_EPOCH (seconds) makes it fixed
/// for reproducible builds.
pub(crate) fn generated_timestamp() -> String {
    let secs = source_date_epoch().ok().flatten().unwrap_or_else(|| {
        std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map(|d| d.as_secs() as i64)
            .unwrap_or(0)
    });
    time::OffsetDateTime::from_unix_timestamp(secs)
        .ok()
        .and_then(|t| {
            t.format(&time::format_description::well_known::Rfc3339)
                .ok()
        })
        .unwrap_or_else(|| "1970-01-01T00:00:00Z".into())
}

fn metabolite_views(model: &Model, analysis: &Analysis) -> Vec<MetaboliteView> {
    let slugs = metabolite_slugs(model);
    model
        .metabolites
        .iter()
        .enumerate()
        .map(|(i, m)| {
            let (consumers, producers) = analysis.network.consumers_and_producers(i);
            let ids = |v: Vec<usize>| {
                v.into_iter()
                    .map(|j| model.reactions[j].id.clone())
                    .collect()
            };
            let thermo = &analysis.metabolites[i];
            let energy = thermo.energy.as_ref();
            let range = analysis.concentration(i);
            MetaboliteView {
                id: m.id.clone(),
                slug: slugs[i].clone(),
                name: m.name.clone(),
                compartment: model.compartments[m.compartment].id.clone(),
                formula: m.formula.clone(),
                charge: m.charge,
                dfg_prime: energy.map(|e| EnergyView {
                    value_kj: e.value_kj,
                    sigma_kj: e.sigma_kj,
                    source: e.source.clone(),
                }),
                energy_origin: energy.map(|e| e.origin.to_string()),
                concentration_m: RangeView {
                    min: range.min,
                    max: range.max,
                },
                concentration_is_default: m.concentration.is_none(),
                measured_m: m.measured_m,
                special: match m.special {
                    Special::None => String::new(),
                    Special::Proton => "proton".into(),
                    Special::Water => "water".into(),
                },
                xrefs: m.xrefs.clone(),
                consumed_by: ids(consumers),
                produced_by: ids(producers),
                library_key: thermo.library_key.clone(),
                energy_problem: thermo.problem.clone(),
                species: thermo.species.as_ref().map(species_view),
            }
        })
        .collect()
}

/// `2 a + b -> c` with the arrow the bounds imply.
pub fn equation_text(model: &Model, j: usize) -> String {
    let r = &model.reactions[j];
    let terms: Vec<(f64, &str)> = r
        .stoichiometry
        .iter()
        .map(|&(i, c)| (c, model.metabolites[i].id.as_str()))
        .collect();
    equation_from_terms(&terms, r.allows_forward(), r.allows_backward())
}

/// `2 a + b -> c` from (coefficient, metabolite id) in their order, with
/// the arrow of the allowed directions; `report.json`'s reader rebuilds
/// the same text through it.
pub(crate) fn equation_from_terms(terms: &[(f64, &str)], forward: bool, backward: bool) -> String {
    let side = |sign: f64| {
        terms
            .iter()
            .filter(|(c, _)| c.signum() == sign)
            .map(|&(c, id)| {
                if c.abs() == 1.0 {
                    id.to_string()
                } else {
                    format!("{} {id}", c.abs())
                }
            })
            .collect::<Vec<_>>()
            .join(" + ")
    };
    let arrow = match (forward, backward) {
        (true, true) => "<->",
        (false, true) => "<-",
        _ => "->",
    };
    format!("{} {arrow} {}", side(-1.0), side(1.0))
        .trim()
        .to_string()
}

fn metabolite_slugs(model: &Model) -> Vec<String> {
    unique_slugs(model.metabolites.iter().map(|m| m.id.as_str()))
}

fn reaction_views(model: &Model, analysis: &Analysis) -> Vec<ReactionView> {
    let slugs = unique_slugs(model.reactions.iter().map(|r| r.id.as_str()));
    let metabolite_slugs = metabolite_slugs(model);
    model
        .reactions
        .iter()
        .enumerate()
        .map(|(j, r)| {
            let thermo = analysis.reaction_thermo[j].as_ref().ok();
            let judged = analysis.is_thermodynamic(j);
            let verdict_for =
                |allowed: bool, d: f64| (judged && allowed).then(|| analysis.verdict(j, d));
            ReactionView {
                id: r.id.clone(),
                slug: slugs[j].clone(),
                name: r.name.clone(),
                equation: equation_text(model, j),
                participants: participant_views(model, j, &metabolite_slugs),
                reversible: r.is_reversible(),
                lower_bound: r.lower_bound,
                upper_bound: r.upper_bound,
                role: r.role.slug().into(),
                group: r.group.clone(),
                drg_prime: thermo.map(|t| EnergyView {
                    value_kj: t.drg0_kj,
                    sigma_kj: t.sigma_kj,
                    source: t.source.clone(),
                }),
                energy_origin: thermo.map(|t| t.origin.slug().into()),
                k_prime: thermo.map(|t| t.k_prime).filter(|k| k.is_finite()),
                dg_range: thermo.map(|t| RangeView {
                    min: t.range.min,
                    max: t.range.max,
                }),
                dg_measured: thermo.and_then(|t| t.measured_kj),
                forward_verdict: verdict_for(r.allows_forward(), 1.0),
                backward_verdict: verdict_for(r.allows_backward(), -1.0),
                scenario_verdicts: model
                    .scenarios
                    .iter()
                    .filter_map(|s| {
                        let flux = s.fluxes.iter().find(|(k, _)| *k == j)?.1;
                        let verdict = if judged {
                            analysis.verdict(j, flux.signum())
                        } else {
                            Verdict::NoData
                        };
                        Some(ScenarioVerdictView {
                            scenario: s.id.clone(),
                            flux,
                            verdict,
                            alone_only: matches!(verdict, Verdict::Consistent | Verdict::Marginal)
                                && joint_verdict(analysis, &s.id)
                                    == Some(crate::scenarios::JointVerdict::Infeasible),
                        })
                    })
                    .collect(),
                missing_data: match &analysis.reaction_thermo[j] {
                    Err(m) => m
                        .metabolites
                        .iter()
                        .map(|&i| model.metabolites[i].id.clone())
                        .collect(),
                    Ok(_) => Vec::new(),
                },
                missing_reasons: match &analysis.reaction_thermo[j] {
                    Err(m) => m.reasons.clone(),
                    Ok(_) => Vec::new(),
                },
                energy_terms: match thermo {
                    Some(t) if t.origin == crate::analysis::EnergyOrigin::Formation => r
                        .stoichiometry
                        .iter()
                        .filter_map(|&(i, c)| {
                            let e = analysis.metabolite_energy(i)?;
                            let m = &model.metabolites[i];
                            Some(EnergyTermView {
                                metabolite: m.id.clone(),
                                slug: metabolite_slugs[i].clone(),
                                compartment: model.compartments[m.compartment].id.clone(),
                                coefficient: c,
                                dfg_prime_kj: e.value_kj,
                                sigma_kj: e.sigma_kj,
                                origin: e.origin.to_string(),
                            })
                        })
                        .collect(),
                    _ => Vec::new(),
                },
                transport: thermo
                    .and_then(|t| t.transport.as_ref())
                    .map(|b| TransportView {
                        formation_sum_kj: b.formation_sum_kj,
                        proton_term_kj: b.proton_term_kj,
                        electrical_term_kj: b.electrical_term_kj,
                        reference_independent: b.reference_independent,
                    }),
                loop_capable: capable_of(analysis, j),
                loops: loops_of(analysis, j),
                xrefs: r.xrefs.clone(),
            }
        })
        .collect()
}

/// The participants of reaction `j`, linked to their metabolite pages.
fn participant_views(model: &Model, j: usize, metabolite_slugs: &[String]) -> Vec<ParticipantView> {
    model.reactions[j]
        .stoichiometry
        .iter()
        .map(|&(i, c)| ParticipantView {
            metabolite: model.metabolites[i].id.clone(),
            slug: metabolite_slugs[i].clone(),
            name: model.metabolites[i].name.clone(),
            coefficient: c,
        })
        .collect()
}

fn found_loops<'a>(analysis: &'a Analysis) -> Option<&'a crate::loops::LoopAnalysis> {
    analysis.loops.as_ref()?.loops.as_ref().ok()
}

fn capable_of(analysis: &Analysis, j: usize) -> Option<String> {
    let c = found_loops(analysis)?
        .loop_capable
        .iter()
        .find(|c| c.index == j)?;
    Some(
        match (c.forward, c.backward) {
            (true, true) => "both",
            (true, false) => "forward",
            _ => "backward",
        }
        .to_string(),
    )
}

fn loops_of(analysis: &Analysis, j: usize) -> Vec<String> {
    found_loops(analysis)
        .map(|f| {
            f.loops
                .iter()
                .filter(|l| l.members.iter().any(|m| m.index == j))
                .map(|l| l.id.clone())
                .collect()
        })
        .unwrap_or_default()
}

/// Reaction and metabolite slugs, computed once per report.
struct Slugs {
    reactions: Vec<String>,
    metabolites: Vec<String>,
}

fn member_view(
    model: &Model,
    analysis: &Analysis,
    slugs: &Slugs,
    m: &crate::loops::LoopMember,
) -> LoopMemberView {
    let thermo = analysis
        .reaction_thermo
        .get(m.index)
        .and_then(|t| t.as_ref().ok());
    let metabolite_slugs = &slugs.metabolites;
    LoopMemberView {
        reaction: m.reaction.clone(),
        slug: slugs.reactions[m.index].clone(),
        name: model.reactions[m.index].name.clone(),
        equation: equation_text(model, m.index),
        coefficient: m.coefficient,
        drg0_kj: thermo.map(|t| t.drg0_kj),
        sigma_kj: thermo.map(|t| t.sigma_kj),
        participants: participant_views(model, m.index, metabolite_slugs),
    }
}

fn constraint_view(slugs: &[String], c: &crate::loops::ConstraintSuggestion) -> ConstraintView {
    ConstraintView {
        reaction: c.reaction.clone(),
        slug: slugs[c.index].clone(),
        forbid: c.forbid.to_string(),
        dg_min_kj: c.dg_min_in_loop_direction_kj,
        basis: match c.basis {
            crate::loops::DeltaGBasis::Range => "range",
            crate::loops::DeltaGBasis::Standard => "standard",
        }
        .to_string(),
        breaks_loop: c.rechecked.as_ref().map(|r| r.breaks_loop),
        still_looping: c
            .rechecked
            .as_ref()
            .map(|r| r.still_looping.clone())
            .unwrap_or_default(),
    }
}

fn loops_view(model: &Model, analysis: &Analysis) -> Option<LoopsView> {
    let results = analysis.loops.as_ref()?;
    let all = Slugs {
        reactions: unique_slugs(model.reactions.iter().map(|r| r.id.as_str())),
        metabolites: metabolite_slugs(model),
    };
    let slugs = &all.reactions;
    let slug_of = |id: &str| {
        model
            .reaction_index(id)
            .map(|j| slugs[j].clone())
            .unwrap_or_else(|| crate::slug::slug(id))
    };
    let mut view = LoopsView {
        error: None,
        shut_reactions: 0,
        relaxed_bounds: Vec::new(),
        reactions_after_pruning: 0,
        pruned_reactions: 0,
        capable: Vec::new(),
        loops: Vec::new(),
        truncated: false,
        limit: None,
        uncovered: Vec::new(),
        energy_cycles: Vec::new(),
        not_testable: Vec::new(),
        not_used: Vec::new(),
    };
    match &results.loops {
        Err(e) => view.error = Some(e.to_string()),
        Ok(found) => {
            view.shut_reactions = found.closure.shut_reactions.len();
            view.relaxed_bounds = found
                .closure
                .relaxed_bounds
                .iter()
                .map(|r| RelaxedBoundView {
                    reaction: r.reaction.clone(),
                    slug: slug_of(&r.reaction),
                    lower_bound: r.lower_bound,
                    upper_bound: r.upper_bound,
                    relaxed_lower_bound: r.relaxed_lower_bound,
                    relaxed_upper_bound: r.relaxed_upper_bound,
                })
                .collect();
            view.reactions_after_pruning = found.stats.reactions_after_pruning;
            view.pruned_reactions = found.pruning.removed_reactions;
            view.capable = found
                .loop_capable
                .iter()
                .map(|c| CapableView {
                    reaction: c.reaction.clone(),
                    slug: slugs[c.index].clone(),
                    forward: c.forward,
                    backward: c.backward,
                })
                .collect();
            view.truncated = found.loops_truncated;
            view.limit = found.loop_limit;
            view.uncovered = found.uncovered_reactions.clone();
            let energies = results.energies.as_ref().ok();
            view.loops = found
                .loops
                .iter()
                .enumerate()
                .map(|(k, l)| {
                    let e = energies
                        .and_then(|es| es.get(k))
                        .filter(|e| e.loop_id == l.id);
                    let complete = e.is_some_and(|e| e.members_without_data.is_empty());
                    LoopView {
                        id: l.id.clone(),
                        members: l
                            .members
                            .iter()
                            .map(|m| member_view(model, analysis, &all, m))
                            .collect(),
                        metabolites: l.metabolites.clone(),
                        reversible: l.reversible,
                        verified: l.verified,
                        drg0_sum_kj: e.filter(|_| complete).map(|e| e.sum_kj),
                        sigma_kj: e.filter(|_| complete).map(|e| e.sigma_kj),
                        members_without_data: e
                            .map(|e| e.members_without_data.clone())
                            .unwrap_or_default(),
                        inconsistent: e.is_some_and(|e| e.inconsistent),
                        constrain: e
                            .and_then(|e| e.constrain.as_ref())
                            .map(|c| constraint_view(slugs, c)),
                        constrain_reversed: e
                            .and_then(|e| e.constrain_reversed.as_ref())
                            .map(|c| constraint_view(slugs, c)),
                    }
                })
                .collect();
        }
    }
    match &results.energy_cycles {
        Err(e) => {
            if view.error.is_none() {
                view.error = Some(e.to_string());
            }
        }
        Ok(cycles) => {
            view.not_testable = cycles.not_testable.clone();
            view.not_used = cycles.not_used.clone();
            view.energy_cycles = cycles
                .results
                .iter()
                .map(|r| {
                    let side = |negative: bool| {
                        r.test
                            .equation
                            .iter()
                            .filter(|(_, c)| (*c < 0.0) == negative)
                            .map(|(m, c)| {
                                if c.abs() == 1.0 {
                                    m.clone()
                                } else {
                                    format!("{} {m}", c.abs())
                                }
                            })
                            .collect::<Vec<_>>()
                            .join(" + ")
                    };
                    EnergyCycleView {
                        id: r.cycle_exists.then(|| energy_cycle_id(r)),
                        currency: r.test.currency.clone(),
                        compartment: r.test.compartment.clone(),
                        equation: format!("{} -> {}", side(true), side(false)),
                        named_equation: r.test.named_equation(model),
                        slug: energy_cycle_slug(&r.test.currency, &r.test.compartment),
                        cycle_exists: r.cycle_exists,
                        trivial: r.trivial,
                        example: r
                            .example
                            .iter()
                            .map(|m| member_view(model, analysis, &all, m))
                            .collect(),
                    }
                })
                .collect();
        }
    }
    Some(view)
}

fn scenario_views(model: &Model, analysis: &Analysis) -> Vec<ScenarioView> {
    model
        .scenarios
        .iter()
        .map(|s| {
            let mut view = ScenarioView {
                id: s.id.clone(),
                description: s.description.clone(),
                active_reactions: 0,
                contradictions: 0,
                marginal: 0,
                at_equilibrium: 0,
                consistent: 0,
                no_data: 0,
                joint_verdict: joint_verdict(analysis, &s.id).map(|v| v.slug().to_string()),
            };
            for &(j, flux) in &s.fluxes {
                if !analysis.is_thermodynamic(j) {
                    continue;
                }
                view.active_reactions += 1;
                match analysis.verdict(j, flux.signum()) {
                    Verdict::Contradiction => view.contradictions += 1,
                    Verdict::Marginal => view.marginal += 1,
                    Verdict::AtEquilibrium => view.at_equilibrium += 1,
                    Verdict::Consistent => view.consistent += 1,
                    Verdict::NoData => view.no_data += 1,
                }
            }
            view
        })
        .collect()
}

/// The joint verdict on the given scenario `id`.
fn joint_verdict(analysis: &Analysis, id: &str) -> Option<crate::scenarios::JointVerdict> {
    analysis
        .scenarios
        .iter()
        .find(|s| !s.is_default && s.id == id)
        .map(|s| s.verdict())
}

/// Species chart range: pH 4–10 in steps of 0.1 (where enzymes work).
const CURVE_PH: (f64, f64, usize) = (4.0, 10.0, 60);

fn species_view(s: &crate::thermo::metabolite::SpeciesSummary) -> SpeciesView {
    SpeciesView {
        entries: s
            .species
            .iter()
            .enumerate()
            .map(|(k, sp)| SpeciesEntryView {
                label: match s.labels.get(k) {
                    Some(l) if !l.is_empty() => l.clone(),
                    _ => species_label(sp),
                },
                charge: sp.charge,
                hydrogens: sp.hydrogens,
                magnesium: sp.magnesium,
                dfg0_kj: sp.dfg0_kj,
                dfh0_kj: sp.dfh0_kj,
                dfg_prime_kj: s.state.species_dfg_prime_kj.get(k).copied().flatten(),
                fraction: s.state.fractions.get(k).copied().unwrap_or(0.0),
            })
            .collect(),
        ph: s.conditions.ph,
        ionic_strength_m: s.conditions.ionic_strength_m,
        temperature_k: s.conditions.temperature_k,
        pmg: s.conditions.pmg,
        mean_hydrogens: s.state.mean_hydrogens,
        mean_charge: s.state.mean_charge,
        reactant_dfg_prime_kj: Some(s.state.dfg_prime_kj).filter(|g| g.is_finite()),
        curve: crate::thermo::metabolite::distribution_curve(s, CURVE_PH.0, CURVE_PH.1, CURVE_PH.2)
            .into_iter()
            .map(|(ph, fractions)| CurvePoint { ph, fractions })
            .collect(),
        provenance: s.provenance.clone(),
    }
}

/// "z = −2, nH = 11" style label for species without a name.
fn species_label(sp: &crate::model::Species) -> String {
    let mut label = format!("nH {}, z {:+}", sp.hydrogens, sp.charge);
    if sp.magnesium > 0 {
        label.push_str(&format!(", Mg {}", sp.magnesium));
    }
    label
}

/// Page name of an energy-generating cycle: `cycle-<currency>-<compartment>`
/// (`e->c` written `e-to-c`), sanitised like every page name.
pub fn energy_cycle_slug(currency: &str, compartment: &str) -> String {
    crate::slug::slug(&format!(
        "cycle-{currency}-{}",
        compartment.replace("->", "-to-")
    ))
}

/// The id of an energy-generating cycle from its members: the dissipation
/// tested and the example's reactions (order-free, see `loops::ids`).
fn energy_cycle_id(r: &crate::loops::EnergyCycleResult) -> String {
    let dissipation = format!("{} in {}", r.test.currency, r.test.compartment);
    crate::loops::ids::member_set_id(
        "cycle",
        std::iter::once(dissipation.as_str()).chain(r.example.iter().map(|m| m.reaction.as_str())),
    )
}
