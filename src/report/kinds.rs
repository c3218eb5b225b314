//! Finding kinds as CI outputs see them: a one-line summary and a help text
//! per kind (SARIF rules, the Markdown summary, kinds.html), and the
//! `--only` / `--skip` filter. The list of kinds comes from the check
//! catalogue the report carries (`report.summary.checks`), or, where there
//! is no report yet (the filter), from the caller.

use super::{Report, Severity};
use std::collections::{BTreeMap, BTreeSet};

/// What one finding kind means and what to do about it.
pub struct KindHelp {
    pub kind: &'static str,
    /// One line: what was found.
    pub summary: &'static str,
    /// What it means and what to do.
    pub help: &'static str,
}

/// Every kind the report's checks may report, in catalogue order, each once.
pub fn report_kinds(report: &Report) -> Vec<&str> {
    let mut seen = BTreeSet::new();
    report
        .summary
        .checks
        .iter()
        .flat_map(|c| c.kinds.iter().map(String::as_str))
        .filter(|k| seen.insert(*k))
        .collect()
}

/// The title and description of the check that reports `kind`.
pub fn check_of<'r>(report: &'r Report, kind: &str) -> Option<(&'r str, &'r str)> {
    report
        .summary
        .checks
        .iter()
        .find(|c| c.kinds.iter().any(|k| k == kind))
        .map(|c| (c.title.as_str(), c.description.as_str()))
}

/// Every kind that has an entry in the help table.
pub fn helped_kinds() -> impl Iterator<Item = &'static str> {
    HELP.iter().map(|h| h.kind)
}

/// Help for `kind`, when the table below has it.
pub fn help(kind: &str) -> Option<&'static KindHelp> {
    HELP.iter().find(|h| h.kind == kind)
}

/// Our wording for each kind. Every registered kind must have an entry
/// (tested); a kind without one falls back to its check's description.
const HELP: &[KindHelp] = &[
    KindHelp {
        kind: "mass-imbalance",
        summary: "A reaction does not conserve the atoms of its formulas.",
        help: "The elements on both sides of the equation differ, so its ΔrG'° describes a different reaction. Fix the equation or the formulas of its metabolites; verdicts on it are unreliable until then.",
    },
    KindHelp {
        kind: "charge-imbalance",
        summary: "A reaction does not conserve charge.",
        help: "The charges on both sides differ. Within one compartment this often means a metabolite's charge is wrong (for example a proton written with charge 0); across a membrane it changes the electrical term of ΔrG'°. Check the charges of its metabolites.",
    },
    KindHelp {
        kind: "proton-only-imbalance",
        summary: "A reaction balances except for H+ within one compartment.",
        help: "H+ is fixed by the compartment's pH in the transformed convention, so ΔrG'° is not affected. Write the H+ if the model should balance protons for flux analysis.",
    },
    KindHelp {
        kind: "unbalance-unchecked",
        summary: "The balance of a reaction could not be checked.",
        help: "Some metabolite lacks a formula or charge (or has a generic group), so atoms or charge could not be counted. Add the missing formula or charge.",
    },
    KindHelp {
        kind: "condition-outside-range",
        summary: "A compartment's conditions lie outside the range the methods hold for.",
        help: "pH, ionic strength or temperature are outside the range of the transform used, so the energies computed there are extrapolations. Check the compartment's conditions and their units.",
    },
    KindHelp {
        kind: "copied-formation-energy",
        summary: "One ΔfG'° is given unchanged for compartments of different conditions.",
        help: "A transformed formation energy holds at one pH, ionic strength and temperature. State where it holds with `at:` (or give species data) so it is moved to each compartment's conditions.",
    },
    KindHelp {
        kind: "infeasible-direction",
        summary: "A direction the bounds allow needs ΔG' < 0 where the data say ΔG' > 0.",
        help: "Over every allowed concentration, even after the uncertainty allowance, the reaction cannot run this way. Check its bounds, its ΔrG'° and the concentration ranges of its metabolites; the estimate may also be wrong, so treat this as a prompt for expert review.",
    },
    KindHelp {
        kind: "marginal-direction",
        summary: "A direction the bounds allow is possible only near the concentration limits or within the uncertainty.",
        help: "The reaction can run this way only at the edge of the allowed concentrations or thanks to the uncertainty allowance. Worth a look when it carries flux.",
    },
    KindHelp {
        kind: "one-way-reversible",
        summary: "A reaction declared reversible can only run one way.",
        help: "Its ΔG' keeps one sign over every allowed concentration. Consider constraining its bounds to that direction.",
    },
    KindHelp {
        kind: "scenario-contradiction",
        summary: "A step of a flux scenario runs against its ΔG'.",
        help: "The flux direction observed or required in the scenario needs ΔG' < 0, but the data say ΔG' > 0 for every allowed concentration. Review the flux data, the ΔrG'° and the concentration ranges.",
    },
    KindHelp {
        kind: "scenario-marginal",
        summary: "A step of a flux scenario is possible only marginally.",
        help: "The step can run as the scenario says only near the concentration limits or within the uncertainty allowance.",
    },
    KindHelp {
        kind: "scenario-infeasible",
        summary: "The active steps of a scenario cannot run together.",
        help: "Each step may be possible alone, but no single set of concentrations lets all of them run at once. The report names a smallest conflicting set of reactions to review.",
    },
    KindHelp {
        kind: "scenario-not-decided",
        summary: "A scenario's joint feasibility or loop law could not be decided.",
        help: "The linear program behind the joint verdict did not give a trustworthy answer; the message says why.",
    },
    KindHelp {
        kind: "scenario-internal-cycle",
        summary: "A scenario's flux carries an internal cycle.",
        help: "Part of the given flux goes round a cycle with no net reaction, which no potentials can drive. The scenario page shows a loop-free flux with the same exchanges.",
    },
    KindHelp {
        kind: "no-energy-data",
        summary: "Reactions without a ΔrG'°, so without a direction verdict.",
        help: "Their metabolites lack formation energies (or the reaction lacks one of its own). Add data for the metabolites the coverage page ranks first; they unlock the most reactions.",
    },
    KindHelp {
        kind: "unset-compartment-conditions",
        summary: "A compartment runs at default pH and potential.",
        help: "Nobody stated its pH or electrical potential, so the defaults are used and verdicts there are softened. State its conditions in gibbsite.yaml.",
    },
    KindHelp {
        kind: "internal-loop",
        summary: "Reactions that can carry flux with every boundary reaction shut.",
        help: "Around such a loop the net reaction is nothing, so no cell can run it, yet flux-balance solutions may. Constrain the direction the report suggests, or correct the reactions that make the loop possible.",
    },
    KindHelp {
        kind: "inconsistent-cycle-energy",
        summary: "ΔrG'° values around a cycle do not add up to zero.",
        help: "Energies around a closed cycle must sum to zero; these differ by more than their uncertainty allowance, so at least one of them is wrong.",
    },
    KindHelp {
        kind: "forced-flux",
        summary: "Bounds that force flux were relaxed for the loop search.",
        help: "A reaction whose bounds exclude zero would make the closed network infeasible, so the loop search allowed it to stop. Check whether the forcing bound is intended.",
    },
    KindHelp {
        kind: "loop-analysis-incomplete",
        summary: "The loop or energy-cycle analysis did not finish or was cut short.",
        help: "Some loops or cycles may be missing from the report; the message says what was not assessed.",
    },
    KindHelp {
        kind: "energy-generating-cycle",
        summary: "The model regenerates an energy currency from nothing.",
        help: "With every boundary reaction shut, a dissipation reaction of the currency can still carry flux, so the model makes energy out of nothing. Constrain the directions of the example reactions that should not run that way.",
    },
    KindHelp {
        kind: "bare-number-unit-slip",
        summary: "A number written without a unit is read in a unit it was probably not meant in.",
        help: "A bare concentration is read as mol/L, a bare temperature as kelvin and a bare ionic strength as mol/L; the value given reads as implausible in that unit. Write the unit (for example `50 mM` or `25 °C`); the computed energies use the value as read until then.",
    },
    KindHelp {
        kind: "implausible-concentration",
        summary: "A concentration lies above 1 M or below 1 pM.",
        help: "Metabolite concentrations in cells lie far inside this range; a value outside it usually is a unit slip. Check the value and its unit; every ΔG' computed from it shifts by RT ln of the error.",
    },
    KindHelp {
        kind: "implausible-temperature",
        summary: "A temperature lies outside 273–373 K.",
        help: "Liquid water and the tabulated data cover this range only; a value outside it is usually a unit slip (°C written as K). Check the value and its unit.",
    },
    KindHelp {
        kind: "implausible-ionic-strength",
        summary: "An ionic strength lies above 0.5 M.",
        help: "Cellular ionic strength is about 0.1–0.25 M and the extended Debye–Hückel correction is not meant for much more; a larger value is usually a unit slip. Check the value and its unit.",
    },
    KindHelp {
        kind: "implausible-potential",
        summary: "A membrane potential has magnitude above 300 mV.",
        help: "Biological membranes sustain potentials of at most a few hundred millivolts; a larger value is usually a unit slip (V written for mV). Check the value and its unit.",
    },
    KindHelp {
        kind: "implausible-ph",
        summary: "A pH lies outside 4–10.",
        help: "Compartments of living cells lie inside this range; a value outside it is usually a typing slip. Check the value.",
    },
];

/// One row of the site's `kinds.html` (the page SARIF rules link to).
#[derive(Debug, Clone, serde::Serialize)]
pub struct KindRow {
    pub kind: String,
    pub summary: String,
    pub help: &'static str,
    pub check: String,
    /// Findings of this kind in the report.
    pub findings: usize,
}

/// Every registered kind with its help and count in `report`.
pub fn site_rows(report: &Report) -> Vec<KindRow> {
    report_kinds(report)
        .into_iter()
        .map(|kind| {
            let (check, description) = check_of(report, kind).unwrap_or(("", ""));
            KindRow {
                kind: kind.to_string(),
                summary: help(kind).map_or(description, |h| h.summary).to_string(),
                help: help(kind).map_or("", |h| h.help),
                check: check.to_string(),
                findings: report.summary.by_kind.get(kind).copied().unwrap_or(0),
            }
        })
        .collect()
}

/// Which kinds `--only` and `--skip` keep.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct KindFilter {
    only: BTreeSet<String>,
    skip: BTreeSet<String>,
}

impl KindFilter {
    /// A filter from `--only` and `--skip` values; a kind not in `valid`
    /// (the registered kinds) is an error naming it and listing them.
    pub fn new(only: &[String], skip: &[String], valid: &[&str]) -> Result<KindFilter, String> {
        let unknown: Vec<&str> = only
            .iter()
            .chain(skip)
            .map(String::as_str)
            .filter(|k| !valid.contains(k))
            .collect();
        if !unknown.is_empty() {
            let quoted: Vec<String> = unknown.iter().map(|k| format!("`{k}`")).collect();
            let mut sorted = valid.to_vec();
            sorted.sort_unstable();
            return Err(format!(
                "unknown finding kind {}; valid kinds: {}",
                quoted.join(", "),
                sorted.join(", ")
            ));
        }
        Ok(KindFilter {
            only: only.iter().cloned().collect(),
            skip: skip.iter().cloned().collect(),
        })
    }

    pub fn is_empty(&self) -> bool {
        self.only.is_empty() && self.skip.is_empty()
    }

    pub fn keeps(&self, kind: &str) -> bool {
        (self.only.is_empty() || self.only.contains(kind)) && !self.skip.contains(kind)
    }

    /// Drops the findings of other kinds and recounts the summary (per
    /// severity, per kind, per check), so every output agrees.
    pub fn apply(&self, report: &mut Report) {
        if self.is_empty() {
            return;
        }
        report.findings.retain(|f| self.keeps(&f.kind));
        let count = |s: Severity| report.findings.iter().filter(|f| f.severity == s).count();
        report.summary.errors = count(Severity::Error);
        report.summary.warnings = count(Severity::Warning);
        report.summary.notes = count(Severity::Note);
        let mut by_kind: BTreeMap<String, usize> = BTreeMap::new();
        for f in &report.findings {
            *by_kind.entry(f.kind.clone()).or_default() += 1;
        }
        for check in &mut report.summary.checks {
            check.findings = check
                .kinds
                .iter()
                .map(|k| by_kind.get(k).copied().unwrap_or(0))
                .sum();
        }
        report.summary.by_kind = by_kind;
        // The headline counts errors and root causes point at findings.
        report.headline = Some(super::headline::headline(report));
        report.root_causes = super::root_causes::root_causes(report);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Three of the registered kinds (the full list is tested through the
    /// CLI in tests/ci_outputs.rs).
    const VALID: &[&str] = &["internal-loop", "forced-flux", "energy-generating-cycle"];

    #[test]
    fn unknown_kind_is_refused_with_the_valid_list() {
        let e = KindFilter::new(&["internal-lop".into()], &[], VALID).unwrap_err();
        assert!(
            e.starts_with("unknown finding kind `internal-lop`; valid kinds: "),
            "{e}"
        );
        assert!(
            e.ends_with("energy-generating-cycle, forced-flux, internal-loop"),
            "{e}"
        );
        assert!(e.contains("energy-generating-cycle"), "{e}");
        let f = KindFilter::new(&[], &["forced-flux".into()], VALID).unwrap();
        assert!(!f.keeps("forced-flux") && f.keeps("internal-loop"));
        let f = KindFilter::new(&["internal-loop".into()], &[], VALID).unwrap();
        assert!(f.keeps("internal-loop") && !f.keeps("forced-flux"));
    }
}
