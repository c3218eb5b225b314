//! The headline: how much of the model was judged, and one sentence that
//! joins the verdict with that figure, so a clean result on a handful of
//! reactions never reads as a clean model.
//!
//! Coverage here is judged internal reactions over internal reactions: a
//! reaction is judged when it has a ΔrG'° (and so a direction verdict).
//! Boundary reactions (exchange, demand, sink, biomass) are never judged
//! and never counted.

use super::{Report, Severity};
use serde::{Deserialize, Serialize};

/// Below this share of judged internal reactions the model counts as not
/// assessed (our own threshold: under a tenth, a clean result says little).
pub const NOT_ASSESSED_BELOW_PERCENT: f64 = 10.0;
/// From this share on the model counts as assessed (our own threshold).
pub const ASSESSED_FROM_PERCENT: f64 = 90.0;

/// How far the verdicts can be trusted to speak for the whole model.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum HeadlineState {
    /// Nothing judged, or under [`NOT_ASSESSED_BELOW_PERCENT`]: no verdict on the model.
    NotAssessed,
    PartlyAssessed,
    Assessed,
}

impl HeadlineState {
    pub fn slug(self) -> &'static str {
        match self {
            HeadlineState::NotAssessed => "not-assessed",
            HeadlineState::PartlyAssessed => "partly-assessed",
            HeadlineState::Assessed => "assessed",
        }
    }

    pub fn label(self) -> &'static str {
        match self {
            HeadlineState::NotAssessed => "not assessed",
            HeadlineState::PartlyAssessed => "partly assessed",
            HeadlineState::Assessed => "assessed",
        }
    }
}

/// The coverage figure and the sentence every output prints.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct HeadlineView {
    /// Internal reactions with a ΔrG'° (so with a direction verdict).
    pub judged: usize,
    pub internal_reactions: usize,
    /// 100 · judged / internal (0 when the model has no internal reaction).
    pub percent: f64,
    /// `percent` as printed, e.g. "5 %", "0.7 %".
    pub percent_text: String,
    pub state: HeadlineState,
    /// Findings of error severity.
    pub errors: usize,
    pub warnings: usize,
    /// The verdict joined with the coverage, e.g. "Judged 4 of 74 internal
    /// reactions (5 %): no contradiction among them; 70 could not be judged
    /// for lack of ΔG′° data — see what is missing."
    pub sentence: String,
}

/// The headline of a report.
pub fn headline(report: &Report) -> HeadlineView {
    let (judged, internal) = match &report.coverage {
        Some(c) => (c.with_energy, c.internal_reactions),
        None => (
            report.summary.reactions_with_energy,
            report.summary.internal_reactions,
        ),
    };
    let judged = judged.min(internal);
    let percent = if internal == 0 {
        0.0
    } else {
        100.0 * judged as f64 / internal as f64
    };
    let state = if judged == 0 || percent < NOT_ASSESSED_BELOW_PERCENT {
        HeadlineState::NotAssessed
    } else if percent < ASSESSED_FROM_PERCENT {
        HeadlineState::PartlyAssessed
    } else {
        HeadlineState::Assessed
    };
    let errors = report.count(Severity::Error);
    let warnings = report.count(Severity::Warning);
    let percent_text = percent_text(judged, internal);
    let sentence = sentence(judged, internal, &percent_text, state, errors, warnings);
    HeadlineView {
        judged,
        internal_reactions: internal,
        percent,
        percent_text,
        state,
        errors,
        warnings,
        sentence,
    }
}

/// Whole percent, except that a share that is neither none nor all never
/// rounds to "0 %" or "100 %" (one decimal then, or 99 %).
pub fn percent_text(part: usize, whole: usize) -> String {
    if whole == 0 {
        return "0 %".into();
    }
    let p = 100.0 * part as f64 / whole as f64;
    if part > 0 && p < 1.0 {
        // Keep one significant digit visible: 0.7 %, 0.05 %.
        let decimals = (-p.log10()).ceil().max(1.0) as usize;
        return format!("{p:.decimals$} %");
    }
    if part < whole && p.round() >= 100.0 {
        return "99 %".into();
    }
    format!("{:.0} %", p)
}

fn plural(n: usize, one: &str, many: &str) -> String {
    format!("{} {}", thousands(n), if n == 1 { one } else { many })
}

use super::root_causes::thousands;

fn sentence(
    judged: usize,
    internal: usize,
    percent: &str,
    state: HeadlineState,
    errors: usize,
    warnings: usize,
) -> String {
    if internal == 0 {
        return "Not assessed: the model has no internal reaction to judge (only exchange, demand, sink or biomass reactions).".into();
    }
    if judged == 0 {
        return format!(
            "Not assessed: none of the {} has a ΔG′° estimate, so no direction could be judged — see what is missing.",
            plural(internal, "internal reaction", "internal reactions")
        );
    }
    let verdict = match (errors, warnings) {
        (0, 0) => "no contradiction and no warning".to_string(),
        (0, w) => format!(
            "no contradiction, {} to review",
            plural(w, "warning", "warnings")
        ),
        (e, 0) => format!("{} to review", plural(e, "error", "errors")),
        (e, w) => format!(
            "{} and {} to review",
            plural(e, "error", "errors"),
            plural(w, "warning", "warnings")
        ),
    };
    let unjudged = internal - judged;
    let mut s = format!(
        "Judged {} of {} internal reactions ({percent}): {verdict}",
        thousands(judged),
        thousands(internal)
    );
    if unjudged > 0 {
        s.push_str(&format!(
            "; {} could not be judged for lack of ΔG′° data — see what is missing",
            thousands(unjudged)
        ));
    }
    if state == HeadlineState::NotAssessed {
        s.push_str(". Too little was judged for a verdict on the model");
    }
    s.push('.');
    s
}

/// The line printed when coverage falls short of `--min-coverage`, or
/// `None` when it does not.
pub fn below_minimum(h: &HeadlineView, min_percent: f64) -> Option<String> {
    (h.percent < min_percent).then(|| {
        format!(
            "coverage {} is below --min-coverage {} %: {} of {} internal reactions judged",
            h.percent_text,
            trim_number(min_percent),
            thousands(h.judged),
            thousands(h.internal_reactions)
        )
    })
}

fn trim_number(x: f64) -> String {
    let s = format!("{x:.2}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// `--min-coverage` values: a percentage from 0 to 100 (a trailing `%` allowed).
pub fn parse_min_coverage(text: &str) -> Result<f64, String> {
    let trimmed = text.trim().trim_end_matches('%').trim();
    let value: f64 = trimmed
        .parse()
        .map_err(|_| format!("expected a percentage from 0 to 100, e.g. 50, found {text:?}"))?;
    if !(0.0..=100.0).contains(&value) {
        return Err(format!(
            "expected a percentage from 0 to 100, found {text:?}"
        ));
    }
    Ok(value)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn percent_never_rounds_to_none_or_all() {
        // Invented for this test: 4 of 74, 65 of 8,791 (Recon3D's figures
        // in issue 12), 1 of 100,000, 999 of 1,000.
        assert_eq!(percent_text(4, 74), "5 %");
        assert_eq!(percent_text(65, 8791), "0.7 %");
        assert_eq!(percent_text(1, 100_000), "0.001 %");
        assert_eq!(percent_text(999, 1000), "99 %");
        assert_eq!(percent_text(1000, 1000), "100 %");
        assert_eq!(percent_text(0, 74), "0 %");
    }

    #[test]
    fn sentence_joins_verdict_and_coverage() {
        let s = sentence(4, 74, "5 %", HeadlineState::NotAssessed, 0, 0);
        assert_eq!(
            s,
            "Judged 4 of 74 internal reactions (5 %): no contradiction and no warning; 70 could not be judged for lack of ΔG′° data — see what is missing. Too little was judged for a verdict on the model."
        );
        let s = sentence(74, 74, "100 %", HeadlineState::Assessed, 2, 1);
        assert_eq!(
            s,
            "Judged 74 of 74 internal reactions (100 %): 2 errors and 1 warning to review."
        );
        // Recon3D's figures (this build): thousands separated.
        let s = sentence(3434, 8791, "39 %", HeadlineState::PartlyAssessed, 4, 4230);
        assert!(s.starts_with("Judged 3,434 of 8,791 internal reactions (39 %): 4 errors and 4,230 warnings to review; 5,357 could not be judged"), "{s}");
    }

    #[test]
    fn min_coverage_values() {
        assert_eq!(parse_min_coverage("50"), Ok(50.0));
        assert_eq!(parse_min_coverage("12.5%"), Ok(12.5));
        assert!(parse_min_coverage("150").is_err());
        assert!(parse_min_coverage("half").is_err());
    }
}
