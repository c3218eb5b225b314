//! Whether a run passes, and the one line CI logs end with.
//!
//! The findings that count are all of the report's, or with a baseline
//! those it does not have; the run fails when one of them is at or above the
//! `--fail-on` level. The coverage figure comes from [`coverage`], the one
//! place CI outputs (text, Markdown, SARIF) take it from.

use crate::collection::FailLevel;
use crate::report::{baseline, Report, Severity};

/// How much of the model could be judged: internal reactions with a
/// ΔrG'° (so with a direction verdict) out of all internal reactions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Coverage {
    pub judged: usize,
    pub internal: usize,
}

impl Coverage {
    /// Percentage of internal reactions judged (0 when there are none).
    pub fn percent(self) -> f64 {
        if self.internal == 0 {
            0.0
        } else {
            100.0 * self.judged as f64 / self.internal as f64
        }
    }

    /// `judged 4 of 74 internal reactions (5 %)`; a share that rounds to 0
    /// but is not 0 reads `< 1 %`.
    pub fn phrase(self) -> String {
        let p = self.percent();
        let share = if self.judged > 0 && p < 0.5 {
            "< 1 %".to_string()
        } else {
            format!("{p:.0} %")
        };
        format!(
            "judged {} of {} internal reactions ({share})",
            self.judged, self.internal
        )
    }
}

/// The coverage figure of a report: from its headline (the figure the site
/// opens with), else its coverage view, else the summary's counts.
pub fn coverage(report: &Report) -> Option<Coverage> {
    if let Some(h) = &report.headline {
        return Some(Coverage {
            judged: h.judged,
            internal: h.internal_reactions,
        });
    }
    match &report.coverage {
        Some(c) => Some(Coverage {
            judged: c.with_energy,
            internal: c.internal_reactions,
        }),
        None => Some(Coverage {
            judged: report.summary.reactions_with_energy,
            internal: report.summary.internal_reactions,
        }),
    }
}

/// Counts of the findings that decide the exit code.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Counted {
    pub errors: usize,
    pub warnings: usize,
    pub notes: usize,
}

/// The verdict of a run.
#[derive(Debug, Clone, PartialEq)]
pub struct Outcome {
    pub fail_on: FailLevel,
    /// Findings that count (all, or new since the baseline).
    pub counted: Counted,
    /// With a baseline: how many of the report's findings it already had.
    pub known_from_baseline: Option<usize>,
    pub coverage: Option<Coverage>,
    /// Set when coverage is below `--min-coverage`: the line saying so.
    pub coverage_short: Option<String>,
    pub failing: bool,
}

impl Outcome {
    pub fn decide(report: &Report, fail_on: FailLevel, baseline: Option<&Report>) -> Outcome {
        let counted_findings = match baseline {
            Some(b) => baseline::new_findings(report, b),
            None => report.findings.iter().collect(),
        };
        let count = |s: Severity| counted_findings.iter().filter(|f| f.severity == s).count();
        let counted = Counted {
            errors: count(Severity::Error),
            warnings: count(Severity::Warning),
            notes: count(Severity::Note),
        };
        let failing = match fail_on {
            FailLevel::Never => false,
            FailLevel::Error => counted.errors > 0,
            FailLevel::Warning => counted.errors + counted.warnings > 0,
        };
        Outcome {
            fail_on,
            counted,
            known_from_baseline: baseline.map(|_| report.findings.len() - counted_findings.len()),
            coverage: coverage(report),
            coverage_short: None,
            failing,
        }
    }

    /// Fail the run too when fewer internal reactions than `min_percent`
    /// could be judged, so "no error" on a barely covered model does not pass.
    pub fn require_coverage(&mut self, report: &Report, min_percent: Option<f64>) {
        let Some(min) = min_percent else { return };
        let headline = match &report.headline {
            Some(h) => h.clone(),
            None => crate::report::headline::headline(report),
        };
        if let Some(line) = crate::report::headline::below_minimum(&headline, min) {
            self.coverage_short = Some(line);
            self.failing = true;
        }
    }

    /// 0 = pass, 1 = a counted finding at or above the fail level (or
    /// coverage below `--min-coverage`).
    pub fn exit_code(&self) -> u8 {
        u8::from(self.failing)
    }

    /// The closing line, e.g. `FAIL: 5 errors, 5 warnings, 4 notes (fails
    /// on errors); judged 4 of 74 internal reactions (5 %)`.
    pub fn line(&self) -> String {
        let c = self.counted;
        let plural = |n: usize, one: &str| {
            if n == 1 {
                format!("1 {one}")
            } else {
                format!("{n} {one}s")
            }
        };
        let counts = format!(
            "{}, {}, {}",
            plural(c.errors, "error"),
            plural(c.warnings, "warning"),
            plural(c.notes, "note")
        );
        let counts = match self.known_from_baseline {
            Some(known) => format!("{counts} new since the baseline ({known} already in it)"),
            None => counts,
        };
        let rule = match self.fail_on {
            FailLevel::Error => "fails on errors",
            FailLevel::Warning => "fails on errors and warnings",
            FailLevel::Never => "never fails (--fail-on never)",
        };
        let mut line = format!(
            "{}: {counts} ({rule})",
            if self.failing { "FAIL" } else { "PASS" }
        );
        if let Some(cov) = self.coverage {
            line.push_str("; ");
            line.push_str(&cov.phrase());
        }
        if let Some(short) = &self.coverage_short {
            line.push_str("; ");
            line.push_str(short);
        }
        line
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coverage_phrase_rounds_and_never_shows_zero_for_some() {
        let c = Coverage {
            judged: 4,
            internal: 74,
        };
        // 4 / 74 = 5.4 %.
        assert_eq!(c.phrase(), "judged 4 of 74 internal reactions (5 %)");
        let tiny = Coverage {
            judged: 1,
            internal: 8791,
        };
        assert_eq!(tiny.phrase(), "judged 1 of 8791 internal reactions (< 1 %)");
        let none = Coverage {
            judged: 0,
            internal: 0,
        };
        assert_eq!(none.percent(), 0.0);
    }
}
