//! Propagation of standard uncertainties and the confidence multiplier used
//! by verdicts.
//!
//! For independent inputs the standard uncertainty of a sum Σ νᵢ·xᵢ is
//! √(Σ (νᵢ·σᵢ)²) (first-order propagation: JCGM 100:2008, the GUM, eq. 10
//! (equation number from memory), with zero correlations). Formation
//! energies of one compound are not independent; `errors` and `compounds`
//! sum their coefficients per compound first (GUM §5.2). A verdict "ΔG'° > 0
//! at confidence p" compares ΔG'° against k·σ with k the two-sided normal
//! quantile Φ⁻¹((1 + p)/2).

use statrs::distribution::{ContinuousCDF, Normal};

/// Standard uncertainty of Σ νᵢ·xᵢ for independent xᵢ with standard
/// uncertainties σᵢ, given as (νᵢ, σᵢ) pairs: √(Σ (νᵢ·σᵢ)²).
pub fn combined_sigma<I>(terms: I) -> f64
where
    I: IntoIterator<Item = (f64, f64)>,
{
    // hypot avoids overflow and underflow of the squares for extreme inputs.
    terms
        .into_iter()
        .fold(0.0, |acc: f64, (coefficient, sigma)| {
            acc.hypot(coefficient * sigma)
        })
}

/// The confidence level is not strictly between 0 and 1.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[error("confidence {0} is outside (0, 1); use e.g. 0.95 for 95 %")]
pub struct BadConfidence(pub f64);

/// Two-sided multiplier k of a normal distribution: P(|X − μ| ≤ kσ) = confidence.
/// k = Φ⁻¹((1 + confidence)/2); 0.95 → 1.959964.
///
/// Φ⁻¹ comes from the `statrs` crate (inverse complementary error function,
/// after Boost's erf_inv).
pub fn sigma_multiplier(confidence: f64) -> Result<f64, BadConfidence> {
    if !(confidence > 0.0 && confidence < 1.0) {
        return Err(BadConfidence(confidence));
    }
    // Checked above, so the argument lies in (0.5, 1): inverse_cdf cannot panic.
    Ok(Normal::standard().inverse_cdf((1.0 + confidence) / 2.0))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn combined_sigma_is_root_sum_of_squares() {
        // ATP + H2O = ADP + Pi with σ 0.3, 0.1, 0.4, 1.2: √(0.09+0.01+0.16+1.44)
        // = √1.70 (arithmetic of the GUM formula).
        let sigma = combined_sigma([(-1.0, 0.3), (-1.0, 0.1), (1.0, 0.4), (1.0, 1.2)]);
        assert!((sigma - 1.7f64.sqrt()).abs() < 1e-12);
        // A coefficient of 2 doubles the σ of that term: √((2·3)² + 8²) = 10.
        assert!((combined_sigma([(2.0, 3.0), (-1.0, 8.0)]) - 10.0).abs() < 1e-12);
        assert_eq!(combined_sigma(std::iter::empty()), 0.0);
    }

    #[test]
    fn sigma_multiplier_matches_normal_quantiles() {
        // Two-sided standard normal quantiles (common practice; digits from
        // memory, as tabulated e.g. in the NIST/SEMATECH e-Handbook of
        // Statistical Methods, section 1.3.6.7.1):
        // 68.27 % → 1.0, 90 % → 1.644854, 95 % → 1.959964, 99 % → 2.575829,
        // 99.9 % → 3.290527.
        for (confidence, k) in [
            (0.682_689_492_137_086, 1.0),
            (0.90, 1.644_853_627),
            (0.95, 1.959_963_985),
            (0.99, 2.575_829_304),
            (0.999, 3.290_526_731),
        ] {
            let value = sigma_multiplier(confidence).unwrap();
            assert!((value - k).abs() < 1e-8, "{confidence}: {value}");
        }
    }

    #[test]
    fn sigma_multiplier_rejects_levels_outside_the_open_interval() {
        for bad in [0.0, 1.0, -0.5, 95.0, f64::NAN] {
            assert!(sigma_multiplier(bad).is_err(), "{bad}");
        }
        assert_eq!(
            sigma_multiplier(95.0).unwrap_err().to_string(),
            "confidence 95 is outside (0, 1); use e.g. 0.95 for 95 %"
        );
    }
}
