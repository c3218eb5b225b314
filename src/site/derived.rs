//! Small sums the pages show beside the report's own numbers, computed here
//! once so templates stay free of arithmetic loops.

use crate::report::{ReactionView, SpeciesView};
use crate::thermo::constants::R_KJ;
use serde::Serialize;

/// Σ ν·ΔfG'° of a reaction, term by term, and the transport total.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Breakdown {
    /// Σ ν·ΔfG'° over the report's `energy_terms`.
    pub terms_sum_kj: f64,
    /// Formation sum + proton term + electrical term, for transport steps.
    pub transport_total_kj: Option<f64>,
}

/// The breakdown of `reaction`'s ΔrG'°, when it was built from formation
/// energies (its `energy_terms` are not empty).
pub fn breakdown(reaction: &ReactionView) -> Option<Breakdown> {
    if reaction.energy_terms.is_empty() {
        return None;
    }
    Some(Breakdown {
        terms_sum_kj: reaction
            .energy_terms
            .iter()
            .map(|t| t.coefficient * t.dfg_prime_kj)
            .sum(),
        transport_total_kj: reaction
            .transport
            .as_ref()
            .map(|t| t.formation_sum_kj + t.proton_term_kj + t.electrical_term_kj),
    })
}

/// ΔfG'° of the reactant made of the species counted at the compartment:
/// −RT ln Σ exp(−ΔfG'°ᵢ/RT), the sum over species of Alberty 2003 (his
/// printed programs, pp. 222 and 289), written as a log-sum-exp so large
/// energies do not overflow. None when no species
/// was counted or the temperature is not usable.
pub fn reactant_dfg_prime_kj(species: &SpeciesView) -> Option<f64> {
    let rt = R_KJ * species.temperature_k;
    if !(rt.is_finite() && rt > 0.0) {
        return None;
    }
    let scaled: Vec<f64> = species
        .entries
        .iter()
        .filter_map(|e| e.dfg_prime_kj)
        .filter(|g| g.is_finite())
        .map(|g| -g / rt)
        .collect();
    let top = scaled.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if !top.is_finite() {
        return None;
    }
    let sum: f64 = scaled.iter().map(|s| (s - top).exp()).sum();
    Some(-rt * (top + sum.ln()))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::SpeciesEntryView;

    fn species(dfg_prime: &[Option<f64>]) -> SpeciesView {
        SpeciesView {
            entries: dfg_prime
                .iter()
                .map(|&g| SpeciesEntryView {
                    label: "x".into(),
                    charge: 0,
                    hydrogens: 0,
                    magnesium: 0,
                    dfg0_kj: 0.0,
                    dfh0_kj: None,
                    dfg_prime_kj: g,
                    fraction: 0.0,
                })
                .collect(),
            ph: 7.0,
            ionic_strength_m: 0.25,
            temperature_k: 298.15,
            pmg: None,
            mean_hydrogens: 0.0,
            mean_charge: 0.0,
            curve: vec![],
            provenance: vec![],
        }
    }

    #[test]
    fn reactant_energy_is_the_boltzmann_sum_over_counted_species() {
        // One species: the reactant is that species (common practice);
        // −2000 kJ/mol invented for this test.
        let one = reactant_dfg_prime_kj(&species(&[Some(-2000.0)])).unwrap();
        assert!((one - -2000.0).abs() < 1e-9, "{one}");
        // Two species of equal energy: −RT ln 2 lower; a left-out species
        // (None) does not count (definition of the sum over species).
        let rt = R_KJ * 298.15;
        let two = reactant_dfg_prime_kj(&species(&[Some(-2000.0), None, Some(-2000.0)])).unwrap();
        assert!((two - (-2000.0 - rt * 2f64.ln())).abs() < 1e-9, "{two}");
        // Nothing counted: no value.
        assert_eq!(reactant_dfg_prime_kj(&species(&[None])), None);
    }
}
