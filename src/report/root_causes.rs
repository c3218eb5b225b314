//! Root causes: findings that share one cause, found from the report alone
//! and ranked by how many findings each explains, so a curator fixes one
//! metabolite instead of reading thousands of rows.
//!
//! Causes, in the order their fixes are applied:
//!
//! 1. `proton-species` / `water-species`: metabolites treated as H⁺ or
//!    water whose charge or formula is not that of H⁺ (H, +1) or water
//!    (H2O, 0). An imbalance finding is explained when correcting every such
//!    species balances its reaction.
//! 2. `library-mismatch`: a metabolite matched to a built-in library entry
//!    whose charge and hydrogen count fit none of the entry's species
//!    (Mg²⁺-bound species left aside). Explained: imbalances that balance
//!    once the metabolite takes the charge and hydrogens of the entry's
//!    predominant species at its compartment.
//! 3. `one-metabolite`: imbalances that all balance under one change of
//!    one metabolite's charge or formula (greedy: the change balancing most
//!    findings first; at least two findings).
//! 4. `shared-range`: contradictions whose reactions all involve one
//!    metabolite (not H⁺ or water): every ΔG' bound uses each participant's
//!    concentration bound, so that range is the first thing to check.
//!
//! A finding counts for one cause only: the first whose fix balances it
//! once the fixes of the causes found before it are applied. Ids here are
//! model ids; the site links them.

use super::{Finding, MetaboliteView, ReactionView, Report, Severity};
use crate::chem::parse_formula;
use serde::{Deserialize, Serialize};
use std::collections::{BTreeMap, BTreeSet};

/// Fewest findings for a `one-metabolite` or `shared-range` cause (one
/// finding alone shares nothing).
pub const MIN_SHARED: usize = 2;
/// Most `one-metabolite` and `shared-range` causes reported.
pub const MAX_GENERIC: usize = 25;

/// Finding kinds whose numbers say how a reaction is unbalanced.
pub const IMBALANCE_KINDS: &[&str] = &["mass-imbalance", "charge-imbalance"];
/// Finding kinds that are direction contradictions (at error severity).
pub const CONTRADICTION_KINDS: &[&str] = &[
    "infeasible-direction",
    "scenario-contradiction",
    "scenario-infeasible",
];

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RootCauseView {
    /// `proton-species`, `water-species`, `library-mismatch`,
    /// `one-metabolite` or `shared-range`.
    pub kind: String,
    /// Short heading, e.g. "Proton species with charge 0".
    pub title: String,
    /// What the findings share and what to do, in one or two sentences.
    pub sentence: String,
    /// Metabolite ids at the root.
    pub metabolites: Vec<String>,
    /// Indices into `Report::findings` of the findings it explains.
    pub findings: Vec<usize>,
    /// Kinds of those findings, sorted.
    pub finding_kinds: Vec<String>,
}

impl RootCauseView {
    pub fn explains(&self) -> usize {
        self.findings.len()
    }
}

/// Signed atom and charge counts: element symbol → count, `"charge"` → charge.
type Delta = BTreeMap<String, i64>;

const CHARGE: &str = "charge";

/// The root causes of a report's findings, most findings explained first
/// (ties: the order above, then the first metabolite id).
pub fn root_causes(report: &Report) -> Vec<RootCauseView> {
    let metabolites: BTreeMap<&str, &MetaboliteView> = report
        .metabolites
        .iter()
        .map(|m| (m.id.as_str(), m))
        .collect();
    let reactions: BTreeMap<&str, &ReactionView> = report
        .reactions
        .iter()
        .map(|r| (r.id.as_str(), r))
        .collect();
    let mut open = Ledger {
        open: open_imbalances(report, &reactions),
        credits: Vec::new(),
        alone: Vec::new(),
    };
    let mut causes = Vec::new();
    for (kind, special, expected_formula, expected_charge, what) in [
        ("proton-species", "proton", "H", 1, "H⁺"),
        ("water-species", "water", "H2O", 0, "water"),
    ] {
        if let Some(c) = special_cause(
            &metabolites,
            &mut open,
            Special {
                kind,
                special,
                formula: expected_formula,
                charge: expected_charge,
                what,
            },
        ) {
            causes.push(c);
        }
    }
    causes.extend(library_causes(&metabolites, &mut open));
    causes.extend(one_metabolite_causes(&metabolites, &mut open));
    // Every imbalance cause took one ledger entry, in order: fill in the
    // findings each one helps to balance.
    for (k, c) in causes.iter_mut().enumerate() {
        let mut findings = std::mem::take(&mut open.credits[k]);
        findings.sort_unstable();
        findings.dedup();
        c.sentence = c
            .sentence
            .replace(EXPLAINED, &explained_phrase(findings.len(), open.alone[k]));
        c.finding_kinds = kinds_of(report, &findings);
        c.findings = findings;
    }
    causes.extend(shared_range_causes(report, &metabolites, &reactions));
    // Stable sort: ties keep the order found.
    causes.sort_by_key(|c| std::cmp::Reverse(c.explains()));
    causes
}

/// An imbalance finding still to explain: its reaction's participants
/// (metabolite id → net coefficient) and what is left unbalanced.
struct Open<'a> {
    finding: usize,
    participants: BTreeMap<&'a str, i64>,
    residual: Delta,
    /// Causes (ledger entries) whose fixes changed it so far.
    touched: Vec<usize>,
}

/// Open imbalance findings and, per cause found so far, the findings its
/// fix helps to balance.
struct Ledger<'a> {
    open: Vec<Open<'a>>,
    /// Per cause: findings balanced once its fix and the fixes before it
    /// are applied, its fix among those that changed them.
    credits: Vec<Vec<usize>>,
    /// Per cause: findings its fix balances alone.
    alone: Vec<usize>,
}

/// Placeholder in a cause's sentence for the count phrase, filled once
/// every fix is known.
const EXPLAINED: &str = "{explained}";

fn explained_phrase(n: usize, alone: usize) -> String {
    match (n, alone) {
        (0, _) => "No imbalance finding balances with this fix".to_string(),
        (1, 1) => "1 imbalanced reaction balances with this fix".to_string(),
        (n, a) if n == a => format!("{} imbalanced reactions balance with this fix alone", thousands(n)),
        (n, 0) => format!(
            "{} imbalanced reactions balance with this fix once other causes listed here are fixed too",
            thousands(n)
        ),
        (n, a) => format!(
            "{} imbalanced reactions need this fix ({} balance with it alone, the others once other causes listed here are fixed too)",
            thousands(n),
            thousands(a)
        ),
    }
}

/// 2930 → "2,930".
pub fn thousands(n: usize) -> String {
    let digits = n.to_string();
    let mut out = String::new();
    for (k, ch) in digits.chars().enumerate() {
        if k > 0 && (digits.len() - k) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    out
}

fn open_imbalances<'a>(
    report: &'a Report,
    reactions: &BTreeMap<&str, &'a ReactionView>,
) -> Vec<Open<'a>> {
    report
        .findings
        .iter()
        .enumerate()
        .filter(|(_, f)| IMBALANCE_KINDS.contains(&f.kind.as_str()))
        .filter_map(|(k, f)| {
            let reaction = reactions.get(f.subjects.first()?.as_str())?;
            let mut participants = BTreeMap::new();
            for p in &reaction.participants {
                *participants.entry(p.metabolite.as_str()).or_insert(0.0) += p.coefficient;
            }
            // Fractional coefficients cannot be balanced by whole atoms.
            let participants = participants
                .into_iter()
                .map(|(m, c)| whole(c).map(|c| (m, c)))
                .collect::<Option<BTreeMap<_, _>>>()?;
            Some(Open {
                finding: k,
                participants: participants.into_iter().filter(|(_, c)| *c != 0).collect(),
                residual: imbalance_of(f)?,
                touched: Vec::new(),
            })
        })
        .collect()
}

/// The finding's imbalance from its evidence (`<El> atoms`, `charge`);
/// `None` when a number is not whole.
fn imbalance_of(f: &Finding) -> Option<Delta> {
    let mut out = Delta::new();
    for (name, value) in &f.evidence {
        let key = if name == CHARGE {
            CHARGE
        } else if let Some(element) = name.strip_suffix(" atoms") {
            element
        } else {
            continue;
        };
        let n = whole(*value)?;
        if n != 0 {
            out.insert(key.to_string(), n);
        }
    }
    (!out.is_empty()).then_some(out)
}

fn whole(x: f64) -> Option<i64> {
    (x.is_finite() && (x - x.round()).abs() < 1e-6).then(|| x.round() as i64)
}

/// Atoms and charge of a metabolite, when its formula is exact and its
/// charge known.
fn composition(m: &MetaboliteView) -> Option<Delta> {
    let formula = parse_formula(m.formula.as_deref()?).ok()?;
    if !formula.is_exact() {
        return None;
    }
    let mut out: Delta = formula.elements.into_iter().collect();
    out.insert(CHARGE.into(), i64::from(m.charge?));
    out.retain(|_, n| *n != 0);
    Some(out)
}

/// `a + times · b`, zeros dropped.
fn add(a: &Delta, b: &Delta, times: i64) -> Delta {
    let mut out = a.clone();
    for (k, n) in b {
        *out.entry(k.clone()).or_insert(0) += times * n;
    }
    out.retain(|_, n| *n != 0);
    out
}

impl Ledger<'_> {
    /// Applies one cause's per-metabolite corrections to every open
    /// finding; the ones that balance are credited to it and to every cause
    /// that changed them before. Returns nothing: the credits are read at
    /// the end, when later causes may have completed more findings.
    fn apply(&mut self, fixes: &BTreeMap<&str, Delta>) {
        let cause = self.credits.len();
        let mut credits = vec![Vec::new(); cause + 1];
        let mut alone = 0;
        self.open.retain_mut(|o| {
            let mut touched = false;
            let mut residual = o.residual.clone();
            for (m, c) in &o.participants {
                if let Some(d) = fixes.get(m) {
                    residual = add(&residual, d, *c);
                    touched = true;
                }
            }
            if !touched {
                return true;
            }
            o.touched.push(cause);
            if residual.is_empty() {
                if o.touched.len() == 1 {
                    alone += 1;
                }
                for &t in &o.touched {
                    credits[t].push(o.finding);
                }
                false
            } else {
                // The fix holds whatever else is wrong: keep it applied.
                o.residual = residual;
                true
            }
        });
        self.credits.push(Vec::new());
        self.alone.push(alone);
        for (t, found) in credits.into_iter().enumerate() {
            self.credits[t].extend(found);
        }
    }
}

fn kinds_of(report: &Report, findings: &[usize]) -> Vec<String> {
    findings
        .iter()
        .map(|&k| report.findings[k].kind.clone())
        .collect::<BTreeSet<_>>()
        .into_iter()
        .collect()
}

/// "M_h_c, M_h_m and 15 more".
fn id_list(ids: &[String], shown: usize) -> String {
    if ids.len() <= shown {
        return match ids {
            [] => String::new(),
            [one] => one.clone(),
            [init @ .., last] => format!("{} and {last}", init.join(", ")),
        };
    }
    format!("{} and {} more", ids[..shown].join(", "), ids.len() - shown)
}

fn signed(n: i64) -> String {
    if n > 0 {
        format!("+{n}")
    } else {
        // U+2212, the minus sign.
        format!("{}", n).replace('-', "−")
    }
}

/// Formula text in Hill order (C, H, then alphabetical; alphabetical
/// without carbon).
fn formula_text(d: &Delta) -> String {
    let elements: Vec<(&String, &i64)> = d.iter().filter(|(k, _)| *k != CHARGE).collect();
    let has_carbon = d.contains_key("C");
    let mut ordered: Vec<(&String, &i64)> = Vec::new();
    if has_carbon {
        for first in ["C", "H"] {
            ordered.extend(elements.iter().filter(|(k, _)| k.as_str() == first));
        }
    }
    ordered.extend(
        elements
            .iter()
            .filter(|(k, _)| !has_carbon || (k.as_str() != "C" && k.as_str() != "H")),
    );
    ordered
        .into_iter()
        .map(|(k, n)| {
            if *n == 1 {
                k.clone()
            } else {
                format!("{k}{n}")
            }
        })
        .collect()
}

struct Special<'s> {
    kind: &'s str,
    special: &'s str,
    formula: &'s str,
    charge: i64,
    what: &'s str,
}

fn special_cause(
    metabolites: &BTreeMap<&str, &MetaboliteView>,
    open: &mut Ledger<'_>,
    s: Special<'_>,
) -> Option<RootCauseView> {
    let mut expected: Delta = parse_formula(s.formula)
        .ok()?
        .elements
        .into_iter()
        .collect();
    expected.insert(CHARGE.into(), s.charge);
    expected.retain(|_, n| *n != 0);
    let mut fixes: BTreeMap<&str, Delta> = BTreeMap::new();
    let mut wrong_charges = BTreeSet::new();
    let mut wrong_formulas = BTreeSet::new();
    for m in metabolites.values().filter(|m| m.special == s.special) {
        let Some(actual) = composition(m) else {
            continue;
        };
        let fix = add(&expected, &actual, -1);
        if fix.is_empty() {
            continue;
        }
        if fix.contains_key(CHARGE) {
            wrong_charges.insert(m.charge.unwrap_or_default());
        }
        if fix.keys().any(|k| k != CHARGE) {
            wrong_formulas.insert(m.formula.clone().unwrap_or_default());
        }
        fixes.insert(m.id.as_str(), fix);
    }
    if fixes.is_empty() {
        return None;
    }
    let ids: Vec<String> = fixes.keys().map(|m| m.to_string()).collect();
    open.apply(&fixes);
    let charges = wrong_charges
        .iter()
        .map(|z| signed(i64::from(*z)))
        .collect::<Vec<_>>()
        .join(" or ");
    let formulas = wrong_formulas.into_iter().collect::<Vec<_>>().join(" or ");
    let (title, has, set) = match (charges.is_empty(), formulas.is_empty()) {
        (false, true) => (
            format!("{} species with charge {charges}", cap(s.what)),
            format!("charge {charges}"),
            format!("set it to {}", signed(s.charge)),
        ),
        (true, false) => (
            format!("{} species with formula {formulas}", cap(s.what)),
            format!("formula {formulas}"),
            format!("set it to {}", s.formula),
        ),
        _ => (
            format!(
                "{} species with formula {formulas} and charge {charges}",
                cap(s.what)
            ),
            format!("formula {formulas} and charge {charges}"),
            format!("set them to {} and {}", s.formula, signed(s.charge)),
        ),
    };
    let sentence = format!(
        "{EXPLAINED}: the model's {} species {} {} {has}, yet {} treated as {}; {set}.",
        s.what,
        id_list(&ids, 6),
        if ids.len() == 1 { "has" } else { "have" },
        if ids.len() == 1 { "it is" } else { "they are" },
        s.what,
    );
    Some(RootCauseView {
        kind: s.kind.into(),
        title,
        sentence,
        metabolites: ids,
        finding_kinds: Vec::new(),
        findings: Vec::new(),
    })
}

fn cap(s: &str) -> String {
    let mut c = s.chars();
    match c.next() {
        Some(first) => first.to_uppercase().chain(c).collect(),
        None => String::new(),
    }
}

/// Library matches whose charge and hydrogens fit none of the entry's
/// species, one cause per library entry.
fn library_causes(
    metabolites: &BTreeMap<&str, &MetaboliteView>,
    open: &mut Ledger<'_>,
) -> Vec<RootCauseView> {
    // library key → (metabolite id, its fix towards the predominant species, text)
    let mut by_key: BTreeMap<&str, Vec<(&str, Delta, String)>> = BTreeMap::new();
    for m in metabolites.values() {
        if !m.special.is_empty() {
            continue;
        }
        let (Some(key), Some(species), Some(actual)) =
            (m.library_key.as_deref(), m.species.as_ref(), composition(m))
        else {
            continue;
        };
        let plain: Vec<_> = species
            .entries
            .iter()
            .filter(|e| e.magnesium == 0)
            .collect();
        let h = actual.get("H").copied().unwrap_or(0);
        let z = actual.get(CHARGE).copied().unwrap_or(0);
        if plain.is_empty()
            || plain
                .iter()
                .any(|e| i64::from(e.charge) == z && i64::from(e.hydrogens) == h)
        {
            continue;
        }
        let Some(main) = plain
            .iter()
            .max_by(|a, b| a.fraction.total_cmp(&b.fraction))
        else {
            continue;
        };
        let mut fix = Delta::new();
        fix.insert("H".into(), i64::from(main.hydrogens) - h);
        fix.insert(CHARGE.into(), i64::from(main.charge) - z);
        fix.retain(|_, n| *n != 0);
        let species_text = plain
            .iter()
            .map(|e| {
                format!(
                    "{} (H{}, charge {})",
                    e.label,
                    e.hydrogens,
                    signed(e.charge.into())
                )
            })
            .collect::<Vec<_>>()
            .join(", ");
        let text = format!(
            "{} ({}, charge {})",
            m.id,
            m.formula.as_deref().unwrap_or(""),
            signed(z)
        );
        by_key.entry(key).or_default().push((
            m.id.as_str(),
            fix,
            format!("{text}|{species_text}|{}", main.label),
        ));
    }
    let mut out = Vec::new();
    for (key, members) in by_key {
        let fixes: BTreeMap<&str, Delta> = members
            .iter()
            .map(|(id, fix, _)| (*id, fix.clone()))
            .collect();
        open.apply(&fixes);
        let ids: Vec<String> = members.iter().map(|(id, _, _)| id.to_string()).collect();
        let mut parts = members[0].2.split('|');
        let first = parts.next().unwrap_or_default();
        let species = parts.next().unwrap_or_default();
        let main = parts.next().unwrap_or_default();
        let others = if ids.len() > 1 {
            format!(
                " (and {} more compartment{})",
                ids.len() - 1,
                if ids.len() == 2 { "" } else { "s" }
            )
        } else {
            String::new()
        };
        out.push(RootCauseView {
            kind: "library-mismatch".into(),
            title: format!("{} does not match the library's {key}", ids[0]),
            sentence: format!(
                "{first}{others} is matched to the built-in library's {key}, whose species are {species}: none has that charge and hydrogen count, so the match or the model's formula and charge are wrong — check both before trusting its ΔfG′°. {EXPLAINED} if it takes the charge and hydrogens of {main}, the species that predominates at its compartment's pH."
            ),
            metabolites: ids,
            finding_kinds: Vec::new(),
            findings: Vec::new(),
        });
    }
    out
}

/// Greedy: the (metabolite, change) that balances most open findings.
fn one_metabolite_causes(
    metabolites: &BTreeMap<&str, &MetaboliteView>,
    open: &mut Ledger<'_>,
) -> Vec<RootCauseView> {
    // Ordinary metabolites whose formula and charge are known.
    let known: BTreeMap<&str, Delta> = metabolites
        .iter()
        .filter(|(_, v)| v.special.is_empty())
        .filter_map(|(id, v)| Some((*id, composition(v)?)))
        .collect();
    let mut out = Vec::new();
    while out.len() < MAX_GENERIC {
        let mut counts: BTreeMap<(&str, Delta), usize> = BTreeMap::new();
        for o in &open.open {
            for (&m, &c) in &o.participants {
                let Some(now) = known.get(m) else {
                    continue;
                };
                // Change of m that balances: residual + c·δ = 0.
                let divisible = o.residual.values().all(|n| n % c == 0);
                if !divisible {
                    continue;
                }
                let delta: Delta = o
                    .residual
                    .iter()
                    .map(|(k, n)| (k.clone(), -n / c))
                    .collect();
                // A formula cannot lose atoms it does not have.
                let fixed = add(now, &delta, 1);
                if fixed.iter().any(|(k, n)| k != CHARGE && *n < 0) {
                    continue;
                }
                *counts.entry((m, delta)).or_default() += 1;
            }
        }
        // Most findings first; ties: first metabolite id, then change.
        let Some(((m, delta), n)) = counts
            .into_iter()
            .max_by(|a, b| a.1.cmp(&b.1).then_with(|| b.0.cmp(&a.0)))
        else {
            break;
        };
        if n < MIN_SHARED {
            break;
        }
        let fixes = BTreeMap::from([(m, delta.clone())]);
        open.apply(&fixes);
        let now = known[m].clone();
        let fixed = add(&now, &delta, 1);
        let charge_now = now.get(CHARGE).copied().unwrap_or(0);
        let charge_fixed = fixed.get(CHARGE).copied().unwrap_or(0);
        let formula_changes = delta.keys().any(|k| k != CHARGE);
        let change = match (formula_changes, delta.contains_key(CHARGE)) {
            (true, true) => format!(
                "formula {} and charge {} instead of {} and {}",
                formula_text(&fixed),
                signed(charge_fixed),
                formula_text(&now),
                signed(charge_now)
            ),
            (true, false) => format!(
                "formula {} instead of {}",
                formula_text(&fixed),
                formula_text(&now)
            ),
            _ => format!(
                "charge {} instead of {}",
                signed(charge_fixed),
                signed(charge_now)
            ),
        };
        out.push(RootCauseView {
            kind: "one-metabolite".into(),
            title: format!("{m}: {change}?"),
            sentence: format!("{EXPLAINED} if {m} had {change}: check its formula and charge."),
            metabolites: vec![m.to_string()],
            finding_kinds: Vec::new(),
            findings: Vec::new(),
        });
    }
    out
}

/// Contradictions sharing one metabolite (greedy, most first).
fn shared_range_causes(
    report: &Report,
    metabolites: &BTreeMap<&str, &MetaboliteView>,
    reactions: &BTreeMap<&str, &ReactionView>,
) -> Vec<RootCauseView> {
    let mut open: Vec<(usize, BTreeSet<&str>)> = report
        .findings
        .iter()
        .enumerate()
        .filter(|(_, f)| {
            f.severity == Severity::Error && CONTRADICTION_KINDS.contains(&f.kind.as_str())
        })
        .map(|(k, f)| {
            let involved: BTreeSet<&str> = f
                .subjects
                .iter()
                .filter_map(|s| reactions.get(s.as_str()))
                .flat_map(|r| &r.participants)
                .map(|p| p.metabolite.as_str())
                .filter(|m| metabolites.get(m).is_some_and(|v| v.special.is_empty()))
                .collect();
            (k, involved)
        })
        .collect();
    let mut out = Vec::new();
    while out.len() < MAX_GENERIC {
        let mut counts: BTreeMap<&str, usize> = BTreeMap::new();
        for (_, involved) in &open {
            for m in involved {
                *counts.entry(m).or_default() += 1;
            }
        }
        let Some((m, n)) = counts
            .into_iter()
            .max_by(|a, b| a.1.cmp(&b.1).then_with(|| b.0.cmp(a.0)))
        else {
            break;
        };
        if n < MIN_SHARED {
            break;
        }
        let mut findings: Vec<usize> = Vec::new();
        open.retain(|(k, involved)| {
            if involved.contains(m) {
                findings.push(*k);
                false
            } else {
                true
            }
        });
        let view = metabolites[m];
        let range = format!(
            "{} … {}",
            crate::number_text::concentration(view.concentration_m.min),
            crate::number_text::concentration(view.concentration_m.max)
        );
        let whose = if view.concentration_is_default {
            "the project's default range"
        } else {
            "its own range"
        };
        out.push(RootCauseView {
            kind: "shared-range".into(),
            title: format!("{} contradictions share {m}", findings.len()),
            sentence: format!(
                "{} contradictions all involve {m}, allowed {range} ({whose}): each verdict uses that range, so check it first — a corrected range may clear them together.",
                findings.len()
            ),
            metabolites: vec![m.to_string()],
            finding_kinds: kinds_of(report, &findings),
            findings,
        });
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn counts_read_as_printed() {
        // Recon3D's figures in this build (tests/root_causes.rs): 2,721
        // findings need the H⁺ fix, 2,096 balance with it alone.
        assert_eq!(thousands(2930), "2,930");
        assert_eq!(thousands(999), "999");
        assert_eq!(thousands(1_000_000), "1,000,000");
        assert_eq!(
            explained_phrase(2721, 2096),
            "2,721 imbalanced reactions need this fix (2,096 balance with it alone, the others once other causes listed here are fixed too)"
        );
        assert_eq!(
            explained_phrase(29, 0),
            "29 imbalanced reactions balance with this fix once other causes listed here are fixed too"
        );
        assert_eq!(
            explained_phrase(0, 0),
            "No imbalance finding balances with this fix"
        );
    }

    #[test]
    fn formulas_in_hill_order() {
        let d: Delta = [("C", 3), ("H", 3), ("O", 3), (CHARGE, -1)]
            .into_iter()
            .map(|(k, n)| (k.to_string(), n))
            .collect();
        assert_eq!(formula_text(&d), "C3H3O3");
        let water: Delta = [("H", 2), ("O", 1)]
            .into_iter()
            .map(|(k, n)| (k.to_string(), n))
            .collect();
        assert_eq!(formula_text(&water), "H2O");
    }
}
