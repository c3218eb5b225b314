//! Independent error sources behind ΔrG'° values.
//!
//! Correlated inputs are handled by writing every ΔrG'° error as a linear
//! combination of independent sources, Σ cₛ·εₛ with εₛ of standard
//! uncertainty σₛ; the σ of any combination of reactions (a single ΔrG'°, the
//! sum around a loop) is then √Σ (cₛσₛ)² over the *net* coefficients (JCGM
//! 100:2008, §5.2: correlated input quantities). The joint scenario LP uses
//! the same sources as shared deviation variables, so one error never takes
//! two values.
//!
//! Which metabolites share a source is decided where the model is built
//! (`Analysis::new`); this module only does the bookkeeping.

use std::collections::BTreeMap;

/// One independent error source.
#[derive(Debug, Clone, PartialEq)]
pub struct ErrorSource {
    /// What the error belongs to, e.g. "ΔfG'° of glc (glc_c, glc_e)" or
    /// "ΔrG'° of PGI"; for reports.
    pub label: String,
    pub sigma_kj: f64,
}

/// Error sources and, per reaction, the net coefficients of its ΔrG'° error.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ErrorModel {
    pub sources: Vec<ErrorSource>,
    /// Per reaction: (source index, net coefficient), sorted by source, no
    /// zero coefficients. Empty for reactions without ΔrG'°.
    pub reactions: Vec<Vec<(usize, f64)>>,
}

impl ErrorModel {
    /// Standard uncertainty of Σ cₛ·εₛ: √Σ (cₛσₛ)² (hypot against overflow).
    pub fn sigma(&self, terms: &[(usize, f64)]) -> f64 {
        terms.iter().fold(0.0f64, |acc, &(s, c)| {
            acc.hypot(c * self.sources[s].sigma_kj)
        })
    }

    /// σ of reaction `j`'s ΔrG'°.
    pub fn reaction_sigma(&self, j: usize) -> f64 {
        self.sigma(&self.reactions[j])
    }

    /// Net error terms of Σ wⱼ·ΔrG'°ⱼ (e.g. the sum around a loop): the
    /// coefficients of shared sources add up before squaring.
    pub fn combine<I>(&self, weighted_reactions: I) -> Vec<(usize, f64)>
    where
        I: IntoIterator<Item = (usize, f64)>,
    {
        let mut net: BTreeMap<usize, f64> = BTreeMap::new();
        for (j, w) in weighted_reactions {
            for &(s, c) in &self.reactions[j] {
                *net.entry(s).or_insert(0.0) += w * c;
            }
        }
        net_terms(net)
    }
}

/// Sorted terms without (numerically) zero coefficients.
pub fn net_terms(net: BTreeMap<usize, f64>) -> Vec<(usize, f64)> {
    net.into_iter().filter(|&(_, c)| c.abs() > 1e-12).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn model() -> ErrorModel {
        // Sources: a (σ 0.5), b (σ 0.5), own value of a third reaction (σ 2);
        // σ values invented for this test.
        ErrorModel {
            sources: vec![
                ErrorSource {
                    label: "a".into(),
                    sigma_kj: 0.5,
                },
                ErrorSource {
                    label: "b".into(),
                    sigma_kj: 0.5,
                },
                ErrorSource {
                    label: "r3".into(),
                    sigma_kj: 2.0,
                },
            ],
            // r0: a -> b; r1: b -> a; r2: given value.
            reactions: vec![
                vec![(0, -1.0), (1, 1.0)],
                vec![(0, 1.0), (1, -1.0)],
                vec![(2, 1.0)],
            ],
        }
    }

    #[test]
    fn shared_sources_cancel_around_a_cycle() {
        let m = model();
        // Each step alone: √(0.5² + 0.5²) = 0.7071 (GUM arithmetic).
        assert!((m.reaction_sigma(0) - 0.5f64.hypot(0.5)).abs() < 1e-12);
        // r0 + r1 is a closed cycle of the same two errors: σ = 0 exactly.
        let net = m.combine([(0, 1.0), (1, 1.0)]);
        assert!(net.is_empty(), "{net:?}");
        assert_eq!(m.sigma(&net), 0.0);
        // r0 + r2: independent sources add in quadrature: √(0.25+0.25+4).
        let net = m.combine([(0, 1.0), (2, 1.0)]);
        assert!((m.sigma(&net) - 4.5f64.sqrt()).abs() < 1e-12);
    }
}
