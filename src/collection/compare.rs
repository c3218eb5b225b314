//! Comparison across a collection: reactions that are loop members or
//! contradictions in some models and not in others, with the models on
//! each side.
//!
//! Reactions are matched by id; where ids differ, by an identity cross
//! reference they share (e.g. `kegg.reaction:R00200`). A cross reference
//! is used only where it names one reaction per model, and two ids are
//! joined only if no model has both (in one model, two ids are two
//! reactions), so a matched group holds at most one reaction per model.

use super::digest::Digest;
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// A model loaded into the comparison: its report folder name and digest.
pub struct Compared<'a> {
    pub name: &'a str,
    pub digest: &'a Digest,
}

/// What sets a reaction apart in some models.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Difference {
    /// Can carry flux in the closed network (member of an internal loop).
    Loop,
    /// An allowed or scenario flux direction is a contradiction.
    Contradiction,
}

/// One model's side of a row: the model and its id for the reaction.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ModelReaction {
    pub model: String,
    pub reaction: String,
    /// Page name of the reaction in that model's report.
    pub slug: String,
    /// Link to the reaction's page, relative to the overview.
    pub href: String,
}

/// A reaction (group) flagged in some models and not in others.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct DifferenceRow {
    pub difference: Difference,
    /// The ids the reaction has across the collection, sorted.
    pub reactions: Vec<String>,
    /// Cross references that matched differing ids.
    pub matched_by: Vec<String>,
    /// Models where it is flagged.
    pub flagged: Vec<ModelReaction>,
    /// Models that have it but where it is not flagged.
    pub not_flagged: Vec<ModelReaction>,
    /// Compared models without this reaction.
    pub absent: Vec<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Comparison {
    /// Models whose loop analysis finished (compared for loops).
    pub loop_models: usize,
    /// Models compared for contradictions (every loaded model).
    pub contradiction_models: usize,
    /// Loop rows first, then contradictions; within each, the rarest first.
    pub rows: Vec<DifferenceRow>,
}

/// Groups of matching reaction ids across models.
struct Groups {
    /// id → group index.
    group_of: BTreeMap<String, usize>,
    /// group → (its ids, the xrefs that joined them).
    members: Vec<(Vec<String>, Vec<String>)>,
}

fn find(parent: &mut [usize], mut x: usize) -> usize {
    while parent[x] != x {
        parent[x] = parent[parent[x]];
        x = parent[x];
    }
    x
}

fn match_reactions(models: &[Compared]) -> Groups {
    // One node per distinct id, with the models that have it.
    let mut node_of: BTreeMap<&str, usize> = BTreeMap::new();
    let mut node_models: Vec<BTreeSet<usize>> = Vec::new();
    let mut ids: Vec<&str> = Vec::new();
    for (m, c) in models.iter().enumerate() {
        for id in c.digest.reaction_slugs.keys() {
            let n = *node_of.entry(id).or_insert_with(|| {
                ids.push(id);
                node_models.push(BTreeSet::new());
                ids.len() - 1
            });
            node_models[n].insert(m);
        }
    }
    // xref → (model, id) pairs, in sorted order for a deterministic result.
    let mut by_xref: BTreeMap<&str, BTreeSet<(usize, &str)>> = BTreeMap::new();
    for (m, c) in models.iter().enumerate() {
        for (id, xref) in &c.digest.xrefs {
            by_xref.entry(xref).or_default().insert((m, id));
        }
    }
    let mut parent: Vec<usize> = (0..ids.len()).collect();
    let mut group_models = node_models.clone();
    let mut joined_by: BTreeMap<usize, Vec<String>> = BTreeMap::new();
    for (xref, holders) in &by_xref {
        let per_model: BTreeMap<usize, usize> =
            holders.iter().fold(BTreeMap::new(), |mut acc, (m, _)| {
                *acc.entry(*m).or_insert(0) += 1;
                acc
            });
        if per_model.values().any(|&n| n > 1) {
            continue; // names several reactions in one model: not an identity
        }
        let nodes: BTreeSet<usize> = holders.iter().map(|(_, id)| node_of[id]).collect();
        let mut nodes = nodes.into_iter();
        let Some(first) = nodes.next() else { continue };
        for other in nodes {
            let (a, b) = (find(&mut parent, first), find(&mut parent, other));
            if a == b || !group_models[a].is_disjoint(&group_models[b]) {
                continue;
            }
            let (keep, gone) = (a.min(b), a.max(b));
            parent[gone] = keep;
            let moved = std::mem::take(&mut group_models[gone]);
            group_models[keep].extend(moved);
            let mut joined = joined_by.remove(&gone).unwrap_or_default();
            joined.push(xref.to_string());
            joined_by.entry(keep).or_default().extend(joined);
        }
    }
    let mut root_index: BTreeMap<usize, usize> = BTreeMap::new();
    let mut members: Vec<(Vec<String>, Vec<String>)> = Vec::new();
    let mut group_of = BTreeMap::new();
    for (n, id) in ids.iter().enumerate() {
        let root = find(&mut parent, n);
        let g = *root_index.entry(root).or_insert_with(|| {
            let mut xrefs = joined_by.get(&root).cloned().unwrap_or_default();
            xrefs.sort();
            xrefs.dedup();
            members.push((Vec::new(), xrefs));
            members.len() - 1
        });
        members[g].0.push(id.to_string());
        group_of.insert(id.to_string(), g);
    }
    for (ids, _) in &mut members {
        ids.sort();
    }
    Groups { group_of, members }
}

/// Rows for every reaction group flagged in some compared models and not
/// in all of them. `models` must be in collection order.
pub fn compare(models: &[Compared]) -> Comparison {
    let groups = match_reactions(models);
    let loop_models: Vec<usize> = (0..models.len())
        .filter(|&m| matches!(&models[m].digest.loops, Some(l) if l.error.is_none()))
        .collect();
    let all_models: Vec<usize> = (0..models.len()).collect();
    // Per model: group → its id there.
    let ids_in: Vec<BTreeMap<usize, &str>> = models
        .iter()
        .map(|c| {
            c.digest
                .reaction_slugs
                .keys()
                .map(|id| (groups.group_of[id], id.as_str()))
                .collect()
        })
        .collect();
    let flagged_sets: Vec<[BTreeSet<&str>; 2]> = models
        .iter()
        .map(|c| {
            let looping = c
                .digest
                .loops
                .iter()
                .flat_map(|l| &l.capable)
                .map(String::as_str)
                .collect();
            let contradicting = c.digest.contradictions.iter().map(String::as_str).collect();
            [looping, contradicting]
        })
        .collect();
    let mut rows = Vec::new();
    for (difference, slot, compared) in [
        (Difference::Loop, 0, &loop_models),
        (Difference::Contradiction, 1, &all_models),
    ] {
        let mut candidates: BTreeSet<usize> = BTreeSet::new();
        for &m in compared {
            for id in &flagged_sets[m][slot] {
                if let Some(&g) = groups.group_of.get(*id) {
                    candidates.insert(g);
                }
            }
        }
        let mut kind_rows = Vec::new();
        for g in candidates {
            let mut row = DifferenceRow {
                difference,
                reactions: groups.members[g].0.clone(),
                matched_by: groups.members[g].1.clone(),
                flagged: Vec::new(),
                not_flagged: Vec::new(),
                absent: Vec::new(),
            };
            for &m in compared {
                let Some(&id) = ids_in[m].get(&g) else {
                    row.absent.push(models[m].name.to_string());
                    continue;
                };
                let slug = &models[m].digest.reaction_slugs[id];
                let side = ModelReaction {
                    model: models[m].name.to_string(),
                    reaction: id.to_string(),
                    slug: slug.clone(),
                    href: format!("{}/reactions/{slug}.html", models[m].name),
                };
                if flagged_sets[m][slot].contains(id) {
                    row.flagged.push(side);
                } else {
                    row.not_flagged.push(side);
                }
            }
            if !row.flagged.is_empty() && (!row.not_flagged.is_empty() || !row.absent.is_empty()) {
                kind_rows.push(row);
            }
        }
        kind_rows
            .sort_by(|a, b| (a.flagged.len(), &a.reactions).cmp(&(b.flagged.len(), &b.reactions)));
        rows.extend(kind_rows);
    }
    Comparison {
        loop_models: loop_models.len(),
        contradiction_models: models.len(),
        rows,
    }
}

#[cfg(test)]
mod tests {
    use super::super::digest::LoopDigest;
    use super::*;

    /// Models "a" and "b" side by side.
    fn two<'a>(a: &'a Digest, b: &'a Digest) -> [Compared<'a>; 2] {
        [
            Compared {
                name: "a",
                digest: a,
            },
            Compared {
                name: "b",
                digest: b,
            },
        ]
    }

    fn digest(
        reactions: &[&str],
        capable: &[&str],
        contradictions: &[&str],
        xrefs: &[(&str, &str)],
    ) -> Digest {
        Digest {
            model_id: "m".into(),
            title: "m".into(),
            reactions: reactions.len(),
            internal_reactions: reactions.len(),
            metabolites: 0,
            errors: 0,
            warnings: 0,
            notes: 0,
            reactions_with_energy: 0,
            metabolites_with_energy: 0,
            loops: Some(LoopDigest {
                error: None,
                capable: capable.iter().map(|s| s.to_string()).collect(),
                elementary: 0,
                truncated: false,
                energy_cycles: 0,
            }),
            contradictions: contradictions.iter().map(|s| s.to_string()).collect(),
            reaction_slugs: reactions
                .iter()
                .map(|r| (r.to_string(), r.to_string()))
                .collect(),
            xrefs: xrefs
                .iter()
                .map(|(a, b)| (a.to_string(), b.to_string()))
                .collect(),
        }
    }

    #[test]
    fn loops_and_contradictions_in_some_models_only_with_models_on_each_side() {
        // A: R1 loops, R2 contradicts. B: R1 does not loop, R2 contradicts.
        // C: has no R1; R2 does not contradict.
        let a = digest(&["R1", "R2"], &["R1"], &["R2"], &[]);
        let b = digest(&["R1", "R2"], &[], &["R2"], &[]);
        let c = digest(&["R2"], &[], &[], &[]);
        let models = [
            Compared {
                name: "a",
                digest: &a,
            },
            Compared {
                name: "b",
                digest: &b,
            },
            Compared {
                name: "c",
                digest: &c,
            },
        ];
        let cmp = compare(&models);
        assert_eq!(cmp.rows.len(), 2, "{cmp:#?}");
        let looping = &cmp.rows[0];
        assert_eq!(looping.difference, Difference::Loop);
        assert_eq!(looping.reactions, ["R1"]);
        assert_eq!(
            looping
                .flagged
                .iter()
                .map(|s| s.model.as_str())
                .collect::<Vec<_>>(),
            ["a"]
        );
        assert_eq!(looping.flagged[0].href, "a/reactions/R1.html");
        assert_eq!(
            looping
                .not_flagged
                .iter()
                .map(|s| s.model.as_str())
                .collect::<Vec<_>>(),
            ["b"]
        );
        assert_eq!(looping.absent, ["c"]);
        let contra = &cmp.rows[1];
        assert_eq!(contra.difference, Difference::Contradiction);
        assert_eq!(contra.flagged.len(), 2);
        assert_eq!(contra.not_flagged[0].model, "c");
        assert!(contra.absent.is_empty());
    }

    #[test]
    fn a_reaction_flagged_wherever_it_exists_in_every_model_is_no_difference() {
        let a = digest(&["R1"], &["R1"], &[], &[]);
        let b = digest(&["R1"], &["R1"], &[], &[]);
        let models = two(&a, &b);
        assert!(compare(&models).rows.is_empty());
    }

    #[test]
    fn differing_ids_are_matched_by_a_shared_identity_xref() {
        // Same reaction, PGI in one model and pgi_c in the other.
        let a = digest(&["PGI"], &["PGI"], &[], &[("PGI", "kegg.reaction:R00771")]);
        let b = digest(&["pgi_c"], &[], &[], &[("pgi_c", "kegg.reaction:R00771")]);
        let models = two(&a, &b);
        let cmp = compare(&models);
        assert_eq!(cmp.rows.len(), 1);
        let row = &cmp.rows[0];
        assert_eq!(row.reactions, ["PGI", "pgi_c"]);
        assert_eq!(row.matched_by, ["kegg.reaction:R00771"]);
        assert_eq!(row.not_flagged[0].reaction, "pgi_c");
        assert!(row.absent.is_empty());
    }

    #[test]
    fn an_xref_naming_two_reactions_in_one_model_matches_nothing() {
        // Transport steps sharing a KEGG id in model a: not an identity.
        let a = digest(
            &["T1", "T2"],
            &["T1"],
            &[],
            &[("T1", "kegg.reaction:R1"), ("T2", "kegg.reaction:R1")],
        );
        let b = digest(&["T3"], &[], &[], &[("T3", "kegg.reaction:R1")]);
        let models = two(&a, &b);
        let cmp = compare(&models);
        assert_eq!(cmp.rows.len(), 1);
        assert_eq!(cmp.rows[0].reactions, ["T1"]);
        assert_eq!(cmp.rows[0].absent, ["b"]);
    }

    #[test]
    fn ids_present_together_in_one_model_are_never_joined() {
        // a has R1 and R2 (two reactions); b's R3 shares an xref with R1 and
        // another with R2: only the first join is made.
        let a = digest(
            &["R1", "R2"],
            &["R1", "R2"],
            &[],
            &[("R1", "rhea:1"), ("R2", "rhea:2")],
        );
        let b = digest(&["R3"], &[], &[], &[("R3", "rhea:1"), ("R3", "rhea:2")]);
        let models = two(&a, &b);
        let cmp = compare(&models);
        let groups: Vec<&Vec<String>> = cmp.rows.iter().map(|r| &r.reactions).collect();
        assert_eq!(
            groups,
            [
                &vec!["R1".to_string(), "R3".to_string()],
                &vec!["R2".to_string()]
            ]
        );
    }
}
