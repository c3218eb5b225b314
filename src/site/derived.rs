//! Small sums the pages show beside the report's own numbers, computed here
//! once so templates stay free of arithmetic loops. Plain additions only:
//! every thermodynamic quantity (anything needing RT) comes from the report.

use crate::report::ReactionView;
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
