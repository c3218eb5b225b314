//! The part of one model's report that the collection overview needs.
//!
//! A genome-scale `report.json` holds every reaction and metabolite with
//! its numbers (megabytes); the overview needs counts and a few reaction
//! ids. The same slim shape is filled from a [`Report`] in memory (one
//! machine) or deserialised from `report.json` (merging shards), where
//! serde skips every field not named here. Both paths go through
//! [`Digest::from_slim`], so a merged overview equals a single-run one.

use crate::error::{Diagnostic, Error, Result};
use crate::report::{Report, Verdict, REPORT_SCHEMA_VERSION};
use serde::de::IgnoredAny;
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use std::path::Path;

/// Cross-reference namespaces that name one reaction (not a class of
/// reactions such as an EC number), usable to match a reaction across
/// models whose ids differ (common practice in model comparison).
pub fn is_identity_namespace(namespace: &str) -> bool {
    namespace.ends_with(".reaction")
        || matches!(
            namespace,
            "rhea" | "reactome" | "biocyc" | "metacyc.reaction"
        )
}

/// One model, as the overview and the comparison see it.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Digest {
    pub model_id: String,
    pub title: String,
    pub reactions: usize,
    pub internal_reactions: usize,
    pub metabolites: usize,
    pub errors: usize,
    pub warnings: usize,
    pub notes: usize,
    pub reactions_with_energy: usize,
    pub metabolites_with_energy: usize,
    /// `None` when the loop analysis was switched off.
    pub loops: Option<LoopDigest>,
    /// Reactions with a contradiction verdict: the only allowed direction
    /// of an irreversible reaction, or a scenario's flux direction.
    pub contradictions: Vec<String>,
    /// Every reaction id with its page name (sorted by id).
    pub reaction_slugs: BTreeMap<String, String>,
    /// (reaction id, `namespace:id`) for identity cross references, sorted.
    pub xrefs: Vec<(String, String)>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LoopDigest {
    /// Why the analysis did not finish, if it did not.
    pub error: Option<String>,
    /// Reactions that can carry flux in the closed network, i.e. members of
    /// at least one internal loop (the exact set, not capped like the list).
    pub capable: Vec<String>,
    /// Elementary loops listed, and whether the list was capped.
    pub elementary: usize,
    pub truncated: bool,
    /// Currencies the model can regenerate from nothing.
    pub energy_cycles: usize,
}

impl Digest {
    /// Share of internal reactions with a ΔrG'° (0 when there are none).
    pub fn coverage(&self) -> f64 {
        if self.internal_reactions == 0 {
            0.0
        } else {
            self.reactions_with_energy as f64 / self.internal_reactions as f64
        }
    }

    pub fn from_report(report: &Report) -> Digest {
        let slim = SlimReport {
            schema_version: report.schema_version,
            project: SlimProject {
                title: report.project.title.clone(),
                model_id: report.project.model_id.clone(),
            },
            summary: SlimSummary {
                reactions: report.summary.reactions,
                internal_reactions: report.summary.internal_reactions,
                metabolites: report.summary.metabolites,
                errors: report.summary.errors,
                warnings: report.summary.warnings,
                notes: report.summary.notes,
                reactions_with_energy: report.summary.reactions_with_energy,
                metabolites_with_energy: report.summary.metabolites_with_energy,
            },
            reactions: report
                .reactions
                .iter()
                .map(|r| SlimReaction {
                    id: r.id.clone(),
                    slug: r.slug.clone(),
                    reversible: r.reversible,
                    forward_verdict: r.forward_verdict,
                    backward_verdict: r.backward_verdict,
                    scenario_verdicts: r
                        .scenario_verdicts
                        .iter()
                        .map(|v| SlimScenarioVerdict { verdict: v.verdict })
                        .collect(),
                    xrefs: r.xrefs.clone(),
                })
                .collect(),
            loops: report.loops.as_ref().map(|l| SlimLoops {
                error: l.error.clone(),
                capable: l
                    .capable
                    .iter()
                    .map(|c| SlimCapable {
                        reaction: c.reaction.clone(),
                    })
                    .collect(),
                loop_count: l.loops.len(),
                truncated: l.truncated,
                energy_cycles: l
                    .energy_cycles
                    .iter()
                    .map(|c| SlimCycle {
                        cycle_exists: c.cycle_exists,
                    })
                    .collect(),
            }),
        };
        Digest::from_slim(slim)
    }

    /// Reads the digest from a `report.json` written by `gibbsite build`.
    pub fn read(path: &Path) -> Result<Digest> {
        let text = std::fs::read_to_string(path).map_err(|e| Error::io(path, e))?;
        let slim: SlimReport = serde_json::from_str(&text).map_err(|e| {
            Error::input(
                Diagnostic::new(path, format!("not a gibbsite report.json: {e}"))
                    .at(e.line(), e.column()),
            )
        })?;
        if slim.schema_version > REPORT_SCHEMA_VERSION {
            return Err(Error::input(Diagnostic::new(
                path,
                format!(
                    "report.json has schema version {}, newer than this gibbsite reads ({REPORT_SCHEMA_VERSION}); merge with the version that built it",
                    slim.schema_version
                ),
            )));
        }
        Ok(Digest::from_slim(slim))
    }

    fn from_slim(slim: SlimReport) -> Digest {
        let contradiction = |v: Option<Verdict>| v == Some(Verdict::Contradiction);
        let mut contradictions: Vec<String> = slim
            .reactions
            .iter()
            .filter(|r| {
                // A reversible reaction with one impossible direction is a
                // note (`one-way-reversible`), not a contradiction.
                (!r.reversible
                    && (contradiction(r.forward_verdict) || contradiction(r.backward_verdict)))
                    || r.scenario_verdicts
                        .iter()
                        .any(|v| v.verdict == Verdict::Contradiction)
            })
            .map(|r| r.id.clone())
            .collect();
        contradictions.sort();
        let mut xrefs: Vec<(String, String)> = slim
            .reactions
            .iter()
            .flat_map(|r| {
                r.xrefs
                    .iter()
                    .filter(|(ns, _)| is_identity_namespace(ns))
                    .flat_map(move |(ns, ids)| {
                        ids.iter()
                            .map(move |id| (r.id.clone(), format!("{ns}:{id}")))
                    })
            })
            .collect();
        xrefs.sort();
        xrefs.dedup();
        let loops = slim.loops.map(|l| {
            let mut capable: Vec<String> = l.capable.into_iter().map(|c| c.reaction).collect();
            capable.sort();
            capable.dedup();
            LoopDigest {
                error: l.error,
                capable,
                elementary: l.loop_count,
                truncated: l.truncated,
                energy_cycles: l.energy_cycles.iter().filter(|c| c.cycle_exists).count(),
            }
        });
        Digest {
            model_id: slim.project.model_id,
            title: slim.project.title,
            reactions: slim.summary.reactions,
            internal_reactions: slim.summary.internal_reactions,
            metabolites: slim.summary.metabolites,
            errors: slim.summary.errors,
            warnings: slim.summary.warnings,
            notes: slim.summary.notes,
            reactions_with_energy: slim.summary.reactions_with_energy,
            metabolites_with_energy: slim.summary.metabolites_with_energy,
            loops,
            contradictions,
            reaction_slugs: slim
                .reactions
                .into_iter()
                .map(|r| {
                    let slug = if r.slug.is_empty() {
                        r.id.clone()
                    } else {
                        r.slug
                    };
                    (r.id, slug)
                })
                .collect(),
            xrefs,
        }
    }
}

// The slim shape of report.json: field names as in `crate::report`.

#[derive(Deserialize)]
struct SlimReport {
    schema_version: u32,
    project: SlimProject,
    summary: SlimSummary,
    reactions: Vec<SlimReaction>,
    loops: Option<SlimLoops>,
}

#[derive(Deserialize)]
struct SlimProject {
    title: String,
    model_id: String,
}

#[derive(Deserialize)]
struct SlimSummary {
    reactions: usize,
    internal_reactions: usize,
    metabolites: usize,
    errors: usize,
    warnings: usize,
    notes: usize,
    reactions_with_energy: usize,
    metabolites_with_energy: usize,
}

#[derive(Deserialize)]
struct SlimReaction {
    id: String,
    /// Left out when equal to the id (see `report::json`).
    #[serde(default)]
    slug: String,
    #[serde(default)]
    reversible: bool,
    forward_verdict: Option<Verdict>,
    backward_verdict: Option<Verdict>,
    #[serde(default)]
    scenario_verdicts: Vec<SlimScenarioVerdict>,
    #[serde(default)]
    xrefs: BTreeMap<String, Vec<String>>,
}

#[derive(Deserialize)]
struct SlimScenarioVerdict {
    verdict: Verdict,
}

#[derive(Deserialize)]
struct SlimLoops {
    error: Option<String>,
    capable: Vec<SlimCapable>,
    #[serde(rename = "loops", deserialize_with = "count_items")]
    loop_count: usize,
    #[serde(default)]
    truncated: bool,
    energy_cycles: Vec<SlimCycle>,
}

#[derive(Deserialize)]
struct SlimCapable {
    reaction: String,
}

#[derive(Deserialize)]
struct SlimCycle {
    #[serde(default)]
    cycle_exists: bool,
}

/// Length of a JSON array without keeping its items.
fn count_items<'de, D: serde::Deserializer<'de>>(d: D) -> std::result::Result<usize, D::Error> {
    Vec::<IgnoredAny>::deserialize(d).map(|v| v.len())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn identity_namespaces_exclude_classes_of_reactions() {
        assert!(is_identity_namespace("kegg.reaction"));
        assert!(is_identity_namespace("metanetx.reaction"));
        assert!(is_identity_namespace("rhea"));
        assert!(!is_identity_namespace("ec-code"));
        assert!(!is_identity_namespace("sbo"));
    }
}
