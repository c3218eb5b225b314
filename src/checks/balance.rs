//! Element and charge balance of internal reactions.
//!
//! A reaction that does not conserve atoms or charge has no meaningful ΔrG,
//! so every internal reaction is checked from its metabolites' formulas and
//! charges. Boundary reactions (exchange, demand, sink, biomass) exchange
//! matter with the outside by design and are skipped.
//!
//! Differences are products minus substrates: `H: -1` means one hydrogen
//! atom goes missing when the reaction runs forward.
//!
//! Kinds: `mass-imbalance` (warning; atoms differ, the message also gives
//! the charge difference if any), `charge-imbalance` (warning; only the
//! charge differs, or atoms could not be counted), `proton-only-imbalance`
//! (note; only H+ differs inside one compartment, which the transformed
//! convention allows: set by the analysis-aware `run`), `unbalance-unchecked`
//! (note; a formula is missing, unreadable, has a generic group such as `R`
//! or a repeat unit such as `(C5H8O4)n`, or a charge is missing).

use crate::chem::{parse_formula, Formula};
use crate::finding::{Finding, Severity};
use crate::model::{Model, Role};
use std::collections::BTreeMap;
use std::fmt::Write;

/// Differences smaller than this are rounding of fractional coefficients.
const TOLERANCE: f64 = 1e-6;

/// Balance of one reaction.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Imbalance {
    /// Net atoms per element, products minus substrates; only non-zero
    /// entries, and empty when the atoms could not be counted.
    pub elements: BTreeMap<String, f64>,
    /// Net charge, products minus substrates; `None` when a charge is missing.
    pub charge: Option<f64>,
    /// Why atoms could not be counted (empty when they were).
    pub unchecked: Vec<Unchecked>,
    /// Metabolites (indices) without a charge.
    pub missing_charge: Vec<usize>,
}

/// A metabolite that keeps the atom count from being made.
#[derive(Debug, Clone, PartialEq)]
pub struct Unchecked {
    pub metabolite: usize,
    pub reason: UncheckedReason,
}

#[derive(Debug, Clone, PartialEq)]
pub enum UncheckedReason {
    MissingFormula,
    /// The formula could not be read; the parser's message.
    Unreadable(String),
    /// Generic groups (`R`, `X`, …) in the formula.
    GenericGroups(Vec<String>),
    /// Symbolic repeat counts (`n` in `(C5H8O4)n`).
    RepeatUnits(Vec<String>),
}

impl Imbalance {
    /// True when the atoms were counted.
    pub fn mass_checked(&self) -> bool {
        self.unchecked.is_empty()
    }

    pub fn is_mass_balanced(&self) -> bool {
        self.mass_checked() && self.elements.is_empty()
    }

    pub fn is_charge_balanced(&self) -> bool {
        self.charge == Some(0.0)
    }

    /// The differences as text, e.g. `H: -1, charge: +1`; elements in Hill
    /// order (C, H, then alphabetical). Empty when nothing differs.
    pub fn text(&self) -> String {
        let mut parts: Vec<String> = hill_order(&self.elements)
            .into_iter()
            .map(|(element, n)| format!("{element}: {}", signed(n)))
            .collect();
        if let Some(charge) = self.charge.filter(|c| *c != 0.0) {
            parts.push(format!("charge: {}", signed(charge)));
        }
        parts.join(", ")
    }
}

/// Element and charge balance of reaction `reaction` (an index into
/// `model.reactions`), whatever its role.
pub const CHECK: super::Check = super::Check {
    slug: "balance",
    title: "Element and charge balance",
    description: "Every internal reaction must conserve atoms and charge (from formulas and charges); ΔG of an unbalanced reaction is meaningless.",
    kinds: &[
        "mass-imbalance",
        "charge-imbalance",
        "proton-only-imbalance",
        "unbalance-unchecked",
    ],
    run,
};

/// The balance findings, worded for what an imbalance does to the reaction's
/// ΔrG'°. In the transformed convention (Alberty 2003) H+ is fixed by the pH
/// and biochemical equations are written without it: inside one compartment
/// a difference of H+ alone (H and charge off by the same amount) changes
/// nothing (transformed ΔfG'° of H+ is 0), so it is only a note. Across
/// compartments the missing H+ must come from one side, and which side
/// changes ΔrG'°. Charges do not enter Σ ν·ΔfG'° within one compartment; they
/// do enter the electrical term of a membrane step.
fn run(analysis: &crate::analysis::Analysis) -> Vec<Finding> {
    let model = analysis.model;
    let mut out = findings(model);
    for f in &mut out {
        if f.kind != "mass-imbalance" && f.kind != "charge-imbalance" {
            continue;
        }
        let Some(j) = model.reaction_index(&f.subjects[0]) else {
            continue;
        };
        let balance = reaction_imbalance(model, j);
        let spans = spans_compartments(model, j);
        let drg0 = analysis.reaction_thermo[j].as_ref().ok().map(|t| t.drg0_kj);
        if let Some(g) = drg0 {
            f.evidence.insert("drg0".into(), g);
        }
        let unreliable = |why: &str| match drg0 {
            Some(g) => format!("; its ΔrG'° ({g:.2} kJ/mol) is unreliable until {why}"),
            None => String::new(),
        };
        let h = balance.elements.get("H").copied().unwrap_or(0.0);
        let protons_only = balance.elements.len() == 1
            && h != 0.0
            && balance.charge.is_some_and(|z| (z - h).abs() < TOLERANCE);
        let id = &model.reactions[j].id;
        if f.kind == "mass-imbalance" && protons_only && !spans {
            f.kind = "proton-only-imbalance".into();
            f.severity = Severity::Note;
            f.message = format!(
                "{id} balances except for H+ ({}): in the transformed convention H+ is fixed by the compartment's pH (transformed ΔfG'° 0), so its ΔrG'° is not affected; write the H+ if the model is meant to balance protons for flux analysis",
                balance.text()
            );
        } else if f.kind == "mass-imbalance" && protons_only {
            f.message.push_str(
                "; only H+ is missing, but the reaction spans compartments: which compartment's H+ makes up the difference changes ΔrG'° by RT·ln 10 per pH unit between them plus the electrical term of its charge",
            );
            f.message
                .push_str(&unreliable("the H+ is written in its compartment"));
        } else if f.kind == "mass-imbalance" {
            f.message.push_str(&unreliable("the equation is balanced"));
        } else if balance.mass_checked() && !spans {
            f.message.push_str(
                "; the atoms balance, so a metabolite's charge is probably wrong; ΔrG'° from transformed formation energies does not use charges and is not affected",
            );
        } else if balance.mass_checked() {
            f.message.push_str(
                "; the atoms balance, but charge moved across a membrane enters the electrical term",
            );
            f.message.push_str(&unreliable("the charges are right"));
        } else {
            f.message.push_str(
                "; the atoms could not be counted, so whether only a charge is wrong is unknown",
            );
        }
    }
    out
}

/// Participants in more than one compartment.
fn spans_compartments(model: &Model, reaction: usize) -> bool {
    let st = &model.reactions[reaction].stoichiometry;
    st.iter()
        .any(|&(i, _)| model.metabolites[i].compartment != model.metabolites[st[0].0].compartment)
}

/// The imbalance of one reaction.
pub fn reaction_imbalance(model: &Model, reaction: usize) -> Imbalance {
    let mut formulas = FormulaCache::new(model);
    imbalance(model, reaction, &mut formulas)
}

/// Findings for every internal reaction that is unbalanced or cannot be
/// checked.
pub fn findings(model: &Model) -> Vec<Finding> {
    let mut formulas = FormulaCache::new(model);
    let mut out = Vec::new();
    for (index, reaction) in model.reactions.iter().enumerate() {
        if reaction.role != Role::Internal {
            continue;
        }
        let balance = imbalance(model, index, &mut formulas);
        let id = &reaction.id;
        let charge_off = balance.charge.filter(|c| *c != 0.0);
        if balance.mass_checked() && !balance.elements.is_empty() {
            let mut evidence: BTreeMap<String, f64> = balance
                .elements
                .iter()
                .map(|(element, n)| (format!("{element} atoms"), *n))
                .collect();
            if let Some(charge) = charge_off {
                evidence.insert("charge".into(), charge);
            }
            out.push(Finding {
                kind: "mass-imbalance".into(),
                severity: Severity::Warning,
                subjects: vec![id.clone()],
                scenario: None,
                message: format!(
                    "{id} is not mass balanced (products minus substrates): {}",
                    balance.text()
                ),
                evidence,
            });
        } else if let Some(charge) = charge_off {
            out.push(Finding {
                kind: "charge-imbalance".into(),
                severity: Severity::Warning,
                subjects: vec![id.clone()],
                scenario: None,
                message: format!(
                    "{id} is not charge balanced (products minus substrates): charge: {}",
                    signed(charge)
                ),
                evidence: BTreeMap::from([("charge".to_string(), charge)]),
            });
        }
        if !balance.mass_checked() || !balance.missing_charge.is_empty() {
            out.push(unchecked_finding(model, index, &balance));
        }
    }
    out
}

fn unchecked_finding(model: &Model, reaction: usize, balance: &Imbalance) -> Finding {
    let id = &model.reactions[reaction].id;
    let mut reasons = Vec::new();
    let mut subjects = vec![id.clone()];
    for item in &balance.unchecked {
        let metabolite = &model.metabolites[item.metabolite];
        let formula = metabolite.formula.as_deref().unwrap_or("");
        reasons.push(match &item.reason {
            UncheckedReason::MissingFormula => format!("{} has no formula", metabolite.id),
            UncheckedReason::Unreadable(why) => {
                format!(
                    "formula {formula} of {} cannot be read: {why}",
                    metabolite.id
                )
            }
            UncheckedReason::GenericGroups(groups) => format!(
                "formula {formula} of {} has generic group {}",
                metabolite.id,
                groups.join(", ")
            ),
            UncheckedReason::RepeatUnits(units) => format!(
                "formula {formula} of {} has a repeat unit of unknown length ({})",
                metabolite.id,
                units.join(", ")
            ),
        });
        subjects.push(metabolite.id.clone());
    }
    for &m in &balance.missing_charge {
        reasons.push(format!("{} has no charge", model.metabolites[m].id));
        if !subjects.contains(&model.metabolites[m].id) {
            subjects.push(model.metabolites[m].id.clone());
        }
    }
    let what = match (balance.mass_checked(), balance.missing_charge.is_empty()) {
        (false, false) => "mass and charge balance",
        (false, true) => "mass balance",
        _ => "charge balance",
    };
    Finding {
        kind: "unbalance-unchecked".into(),
        severity: Severity::Note,
        subjects,
        scenario: None,
        message: format!("{id}: {what} not checked: {}", reasons.join("; ")),
        evidence: BTreeMap::new(),
    }
}

/// Formulas parsed once per metabolite, on first use.
struct FormulaCache {
    parsed: Vec<Option<Result<Formula, String>>>,
}

impl FormulaCache {
    fn new(model: &Model) -> FormulaCache {
        FormulaCache {
            parsed: vec![None; model.metabolites.len()],
        }
    }

    /// `None` when the metabolite has no formula.
    fn get(&mut self, model: &Model, metabolite: usize) -> Option<&Result<Formula, String>> {
        let text = model.metabolites[metabolite].formula.as_deref()?;
        Some(
            self.parsed[metabolite]
                .get_or_insert_with(|| parse_formula(text).map_err(|e| e.to_string())),
        )
    }
}

fn imbalance(model: &Model, reaction: usize, formulas: &mut FormulaCache) -> Imbalance {
    let mut result = Imbalance::default();
    let mut charge = 0.0;
    for &(metabolite, coefficient) in &model.reactions[reaction].stoichiometry {
        match model.metabolites[metabolite].charge {
            Some(z) => charge += coefficient * f64::from(z),
            None => result.missing_charge.push(metabolite),
        }
        let reason = match formulas.get(model, metabolite) {
            None => Some(UncheckedReason::MissingFormula),
            Some(Err(why)) => Some(UncheckedReason::Unreadable(why.clone())),
            Some(Ok(formula)) if !formula.generic.is_empty() => Some(
                UncheckedReason::GenericGroups(formula.generic.keys().cloned().collect()),
            ),
            Some(Ok(formula)) if !formula.repeat_units.is_empty() => {
                Some(UncheckedReason::RepeatUnits(formula.repeat_units.clone()))
            }
            Some(Ok(formula)) => {
                for (element, n) in &formula.elements {
                    *result.elements.entry(element.clone()).or_insert(0.0) +=
                        coefficient * *n as f64;
                }
                None
            }
        };
        if let Some(reason) = reason {
            result.unchecked.push(Unchecked { metabolite, reason });
        }
    }
    if result.unchecked.is_empty() {
        result.elements.retain(|_, n| n.abs() > TOLERANCE);
    } else {
        result.elements.clear();
    }
    if result.missing_charge.is_empty() {
        result.charge = Some(if charge.abs() > TOLERANCE {
            charge
        } else {
            0.0
        });
    }
    result
}

/// C first, H second, then alphabetical (Hill system, common practice).
fn hill_order(elements: &BTreeMap<String, f64>) -> Vec<(&str, f64)> {
    let mut out: Vec<(&str, f64)> = Vec::with_capacity(elements.len());
    let has_carbon = elements.contains_key("C");
    if has_carbon {
        for first in ["C", "H"] {
            if let Some(n) = elements.get(first) {
                out.push((first, *n));
            }
        }
    }
    for (element, n) in elements {
        if has_carbon && (element == "C" || element == "H") {
            continue;
        }
        out.push((element, *n));
    }
    out
}

/// `+1`, `-2`, `+0.5`: always signed, no trailing zeros.
fn signed(value: f64) -> String {
    let mut text = String::new();
    if value > 0.0 {
        text.push('+');
    }
    if (value - value.round()).abs() < TOLERANCE {
        let _ = write!(text, "{}", value.round() as i64);
    } else {
        let formatted = format!("{value:.6}");
        text.push_str(formatted.trim_end_matches('0'));
    }
    text
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Compartment, Metabolite, Reaction, Special};

    fn metabolite(id: &str, formula: Option<&str>, charge: Option<i32>) -> Metabolite {
        Metabolite {
            id: id.into(),
            name: id.into(),
            compartment: 0,
            formula: formula.map(String::from),
            charge,
            dfg_prime: None,
            species: None,
            library: None,
            concentration: None,
            measured_m: None,
            special: Special::None,
            xrefs: BTreeMap::new(),
            sbo: None,
        }
    }

    fn reaction(id: &str, stoichiometry: Vec<(usize, f64)>, role: Role) -> Reaction {
        Reaction {
            id: id.into(),
            name: id.into(),
            stoichiometry,
            lower_bound: -1000.0,
            upper_bound: 1000.0,
            drg_prime: None,
            group: None,
            role,
            sbo: None,
            xrefs: BTreeMap::new(),
        }
    }

    /// Metabolites as written in e_coli_core (Orth, Fleming & Palsson,
    /// EcoSal Plus 2010; BiGG formulas and charges at pH 7.2).
    fn model(reactions: Vec<Reaction>) -> Model {
        Model {
            id: "m".into(),
            title: "m".into(),
            temperature_k: 298.15,
            compartments: vec![Compartment {
                id: "c".into(),
                name: "cytosol".into(),
                ph: 7.0,
                ionic_strength_m: 0.25,
                potential_mv: 0.0,
                temperature_k: None,
                pmg: None,
            }],
            metabolites: vec![
                metabolite("atp", Some("C10H12N5O13P3"), Some(-4)), // 0
                metabolite("adp", Some("C10H12N5O10P2"), Some(-3)), // 1
                metabolite("f6p", Some("C6H11O9P"), Some(-2)),      // 2
                metabolite("fdp", Some("C6H10O12P2"), Some(-4)),    // 3
                metabolite("h", Some("H"), Some(1)),                // 4
                metabolite("acyl", Some("C5H6O5R2"), Some(0)),      // 5
                metabolite("xylan", Some("(C5H8O4)n"), Some(0)),    // 6
                metabolite("nothing", None, None),                  // 7
                metabolite("o2", Some("O2"), Some(0)),              // 8
                metabolite("bad", Some("C6H+"), Some(0)),           // 9
            ],
            reactions,
            scenarios: vec![],
            objective: vec![],
        }
    }

    // PFK: atp + f6p -> adp + fdp + h (e_coli_core R_PFK), balanced.
    fn pfk() -> Vec<(usize, f64)> {
        vec![(0, -1.0), (1, 1.0), (2, -1.0), (3, 1.0), (4, 1.0)]
    }

    #[test]
    fn phosphofructokinase_is_balanced() {
        let m = model(vec![reaction("PFK", pfk(), Role::Internal)]);
        let b = reaction_imbalance(&m, 0);
        assert!(b.is_mass_balanced() && b.is_charge_balanced(), "{b:?}");
        assert_eq!(b.text(), "");
        assert!(findings(&m).is_empty());
    }

    #[test]
    fn missing_proton_shows_hydrogen_and_charge() {
        // PFK without its H+: products lack one H and one positive charge.
        let mut s = pfk();
        s.pop();
        let m = model(vec![reaction("PFK_noh", s, Role::Internal)]);
        let b = reaction_imbalance(&m, 0);
        assert_eq!(b.elements, BTreeMap::from([("H".to_string(), -1.0)]));
        assert_eq!(b.charge, Some(-1.0));
        assert_eq!(b.text(), "H: -1, charge: -1");
        let f = findings(&m);
        assert_eq!(f.len(), 1);
        assert_eq!(f[0].kind, "mass-imbalance");
        assert_eq!(f[0].severity, Severity::Warning);
        assert_eq!(f[0].subjects, vec!["PFK_noh".to_string()]);
        assert_eq!(
            f[0].message,
            "PFK_noh is not mass balanced (products minus substrates): H: -1, charge: -1"
        );
        assert_eq!(f[0].evidence.get("H atoms"), Some(&-1.0));
        assert_eq!(f[0].evidence.get("charge"), Some(&-1.0));
    }

    #[test]
    fn charge_only_imbalance() {
        // Forcing the proton charge to 0 (a data error) leaves atoms balanced.
        let mut m = model(vec![reaction("PFK", pfk(), Role::Internal)]);
        m.metabolites[4].charge = Some(0);
        let f = findings(&m);
        assert_eq!(f.len(), 1);
        assert_eq!(f[0].kind, "charge-imbalance");
        assert_eq!(f[0].evidence.get("charge"), Some(&-1.0));
        assert_eq!(
            f[0].message,
            "PFK is not charge balanced (products minus substrates): charge: -1"
        );
    }

    #[test]
    fn fractional_coefficients_and_order() {
        // 2 f6p -> fdp + 0.5 o2 (nonsense on purpose): C: -6, H: -12, O: -5, P: -0.
        let m = model(vec![reaction(
            "X",
            vec![(2, -2.0), (3, 1.0), (8, 0.5)],
            Role::Internal,
        )]);
        let b = reaction_imbalance(&m, 0);
        // 2·C6H11O9P = C12H22O18P2 (charge −4); fdp + ½O2 = C6H10O13P2 (charge −4).
        assert_eq!(b.text(), "C: -6, H: -12, O: -5");
        assert_eq!(b.charge, Some(0.0));
        let m = model(vec![reaction(
            "Y",
            vec![(8, -1.0), (4, 1.0)],
            Role::Internal,
        )]);
        assert_eq!(reaction_imbalance(&m, 0).text(), "H: +1, O: -2, charge: +1");
        let m = model(vec![reaction("Z", vec![(8, -0.25)], Role::Internal)]);
        assert_eq!(reaction_imbalance(&m, 0).text(), "O: -0.5");
    }

    #[test]
    fn generic_groups_repeat_units_and_missing_data_are_notes() {
        let m = model(vec![
            reaction("G", vec![(5, -1.0), (4, 1.0)], Role::Internal),
            reaction("P", vec![(6, -1.0), (8, 1.0)], Role::Internal),
            reaction("N", vec![(7, -1.0), (8, 1.0)], Role::Internal),
            reaction("B", vec![(9, -1.0), (8, 1.0)], Role::Internal),
        ]);
        let f = findings(&m);
        let summary: Vec<(&str, &str, Severity)> = f
            .iter()
            .map(|f| (f.kind.as_str(), f.subjects[0].as_str(), f.severity))
            .collect();
        assert_eq!(
            summary,
            vec![
                // G still has a checkable charge: 0 → +1.
                ("charge-imbalance", "G", Severity::Warning),
                ("unbalance-unchecked", "G", Severity::Note),
                ("unbalance-unchecked", "P", Severity::Note),
                ("unbalance-unchecked", "N", Severity::Note),
                ("unbalance-unchecked", "B", Severity::Note),
            ]
        );
        assert_eq!(
            f[1].message,
            "G: mass balance not checked: formula C5H6O5R2 of acyl has generic group R"
        );
        assert_eq!(
            f[2].message,
            "P: mass balance not checked: formula (C5H8O4)n of xylan has a repeat unit of unknown length (n)"
        );
        assert_eq!(
            f[3].message,
            "N: mass and charge balance not checked: nothing has no formula; nothing has no charge"
        );
        assert_eq!(f[3].subjects, vec!["N".to_string(), "nothing".to_string()]);
        assert!(f[4]
            .message
            .contains("cannot be read: unexpected character `+`"));
    }

    #[test]
    fn boundary_reactions_are_skipped() {
        let m = model(vec![
            reaction("EX", vec![(8, -1.0)], Role::Exchange),
            reaction("BIO", vec![(0, -30.0), (1, 30.0)], Role::Biomass),
        ]);
        assert!(findings(&m).is_empty());
        // The per-reaction function still computes it.
        assert_eq!(reaction_imbalance(&m, 0).text(), "O: -2");
    }

    #[test]
    fn signed_numbers() {
        assert_eq!(signed(1.0), "+1");
        assert_eq!(signed(-2.0), "-2");
        assert_eq!(signed(0.5), "+0.5");
        assert_eq!(signed(-0.125), "-0.125");
        assert_eq!(signed(1.0 + 1e-9), "+1");
    }
}
