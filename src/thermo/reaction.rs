//! Reaction energies: ΔrG'° from formation energies or a given value, its
//! σ, K', the ΔG' range allowed by concentration bounds, and verdicts on
//! flux directions.
//!
//! ΔrG' = ΔrG'° + RT ln Q, with Q = Π cᵢ^νᵢ over participants in mol/L
//! (standard state 1 M). Water (activity 1) and H+ (fixed by pH, already in
//! the transformed ΔG'°) are left out of Q.

use super::constants::rt;
use crate::finding::Verdict;
use crate::model::Range;

/// A participant as the range computation needs it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Participant {
    pub coefficient: f64,
    /// `None` for water and H+, which are left out of Q.
    pub concentration: Option<Range>,
    pub measured: Option<f64>,
}

/// ΔrG'° = −RT ln K'  ⇔  K' = exp(−ΔrG'°/RT).
pub fn k_prime(drg0_kj: f64, temperature_k: f64) -> f64 {
    (-drg0_kj / rt(temperature_k)).exp()
}

/// ΔrG'° from an equilibrium constant: −RT ln K'.
pub fn drg0_from_k(k_prime: f64, temperature_k: f64) -> f64 {
    -rt(temperature_k) * k_prime.ln()
}

/// Σ νᵢ·xᵢ and its σ, treating the σᵢ as independent: √Σ (νᵢσᵢ)².
pub fn weighted_sum(terms: &[(f64, f64, f64)]) -> (f64, f64) {
    let value = terms.iter().map(|(nu, x, _)| nu * x).sum();
    // hypot: no overflow of the squares for extreme values.
    let sigma = terms
        .iter()
        .fold(0.0f64, |acc, (nu, _, s)| acc.hypot(nu * s));
    (value, sigma)
}

/// The ΔG' interval over every concentration inside the bounds: the lowest
/// ΔG' puts products at their minimum and substrates at their maximum.
pub fn dg_range(drg0_kj: f64, temperature_k: f64, participants: &[Participant]) -> Range {
    let rt = rt(temperature_k);
    let (mut low, mut high) = (drg0_kj, drg0_kj);
    for p in participants {
        let Some(c) = p.concentration else { continue };
        let (at_min, at_max) = (p.coefficient * c.min.ln(), p.coefficient * c.max.ln());
        low += rt * at_min.min(at_max);
        high += rt * at_min.max(at_max);
    }
    Range {
        min: low,
        max: high,
    }
}

/// ΔG' at measured concentrations, when every participant in Q has one.
pub fn dg_measured(drg0_kj: f64, temperature_k: f64, participants: &[Participant]) -> Option<f64> {
    let mut ln_q = 0.0;
    for p in participants {
        if p.concentration.is_none() {
            continue;
        }
        ln_q += p.coefficient * p.measured?.ln();
    }
    Some(drg0_kj + rt(temperature_k) * ln_q)
}

/// Verdict on flux in `direction` (+1 forward, −1 backward), which needs
/// ΔG' < 0 in that direction.
///
/// * contradiction: even the most favourable concentrations leave ΔG' above
///   zero by more than the uncertainty allowance (`allowance` = k·σ);
/// * at equilibrium: the best achievable ΔG' is 0 within the allowance
///   (|ΔG'| ≤ k·σ): the data cannot show any driving force that way;
/// * marginal: a driving force beyond the allowance exists but is smaller
///   than the allowance plus `min_driving_force`, i.e. the step works only
///   near the bounds or only if the estimate is off;
/// * consistent otherwise.
pub fn verdict(range: Range, direction: f64, allowance: f64, min_driving_force: f64) -> Verdict {
    let best = if direction >= 0.0 {
        range.min
    } else {
        -range.max
    };
    if best > allowance {
        Verdict::Contradiction
    } else if best >= -allowance {
        Verdict::AtEquilibrium
    } else if -best < allowance + min_driving_force {
        Verdict::Marginal
    } else {
        Verdict::Consistent
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::thermo::constants::T_STANDARD_K;

    fn close(a: f64, b: f64, tol: f64) -> bool {
        (a - b).abs() <= tol
    }

    /// ΔrG'° = −RT ln K': K' = 10 at 298.15 K gives −5.708 kJ/mol
    /// (common practice: RT ln 10 = 5.708 kJ/mol at 25 °C).
    #[test]
    fn k_prime_of_ten_is_minus_5_708() {
        let g = drg0_from_k(10.0, T_STANDARD_K);
        assert!(close(g, -5.708, 0.0005), "{g}");
        assert!(close(k_prime(g, T_STANDARD_K), 10.0, 1e-9));
        assert!(close(k_prime(0.0, T_STANDARD_K), 1.0, 0.0));
    }

    /// Textbook values (common practice): ATP + H2O → ADP + Pi −30.5 kJ/mol,
    /// glucose + Pi → glucose 6-phosphate + H2O +13.8 kJ/mol; coupled (hexokinase)
    /// glucose + ATP → G6P + ADP: −16.7 kJ/mol.
    #[test]
    fn coupled_reactions_add() {
        let (sum, sigma) = weighted_sum(&[(1.0, -30.5, 0.3), (1.0, 13.8, 0.4)]);
        assert!(close(sum, -16.7, 1e-9), "{sum}");
        assert!(close(sigma, 0.5, 1e-12));
        // The coupled K' is the product of the two.
        let k = k_prime(-30.5, T_STANDARD_K) * k_prime(13.8, T_STANDARD_K);
        assert!(close(drg0_from_k(k, T_STANDARD_K), -16.7, 1e-9));
    }

    #[test]
    fn range_puts_products_low_and_substrates_high() {
        let rt = rt(T_STANDARD_K);
        // a → 2 b, both 1 µM – 10 mM (common practice default range); ΔrG'° −10
        // and the measured values invented for this test, expectations arithmetic.
        let r = Range {
            min: 1e-6,
            max: 1e-2,
        };
        let parts = [
            Participant {
                coefficient: -1.0,
                concentration: Some(r),
                measured: Some(1e-3),
            },
            Participant {
                coefficient: 2.0,
                concentration: Some(r),
                measured: Some(1e-4),
            },
            // Water: left out of Q.
            Participant {
                coefficient: 1.0,
                concentration: None,
                measured: None,
            },
        ];
        let range = dg_range(-10.0, T_STANDARD_K, &parts);
        let expect_min = -10.0 + rt * (2.0 * 1e-6f64.ln() - 1e-2f64.ln());
        let expect_max = -10.0 + rt * (2.0 * 1e-2f64.ln() - 1e-6f64.ln());
        assert!(close(range.min, expect_min, 1e-9));
        assert!(close(range.max, expect_max, 1e-9));
        // Q = (1e-4)² / 1e-3 = 1e-5 → ΔG' = −10 + RT ln 1e-5 = −10 − 28.54.
        let m = dg_measured(-10.0, T_STANDARD_K, &parts).unwrap();
        assert!(close(m, -10.0 - 5.0 * rt * 10f64.ln(), 1e-9));
        assert!(close(m, -38.54, 0.01));
    }

    #[test]
    fn verdicts() {
        // Ranges, σ and k invented for this test around the verdict boundaries.
        let r = |min, max| Range { min, max };
        assert_eq!(verdict(r(5.0, 20.0), 1.0, 2.0, 1.0), Verdict::Contradiction);
        // Best ΔG' within ±k·σ of 0: at equilibrium as far as the data tell.
        assert_eq!(verdict(r(1.5, 20.0), 1.0, 2.0, 1.0), Verdict::AtEquilibrium);
        assert_eq!(
            verdict(r(-2.0, 20.0), 1.0, 2.0, 1.0),
            Verdict::AtEquilibrium
        );
        // ΔG' exactly 0 with no uncertainty and no minimum driving force is
        // at equilibrium too, never consistent.
        assert_eq!(verdict(r(0.0, 0.0), 1.0, 0.0, 0.0), Verdict::AtEquilibrium);
        assert_eq!(verdict(r(-2.5, 20.0), 1.0, 2.0, 1.0), Verdict::Marginal);
        assert_eq!(verdict(r(-3.5, 20.0), 1.0, 2.0, 1.0), Verdict::Consistent);
        // Backward needs ΔG' > 0 somewhere: best case is −max.
        assert_eq!(verdict(r(5.0, 20.0), -1.0, 2.0, 1.0), Verdict::Consistent);
        assert_eq!(
            verdict(r(-30.0, -5.0), -1.0, 2.0, 1.0),
            Verdict::Contradiction
        );
    }
}
