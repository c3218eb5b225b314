//! The analysis context shared by all checks: the model, its network, and
//! the energies computed once (per metabolite ΔfG'°, per reaction ΔrG'°, K'
//! and ΔG' range). Checks read it; none of them changes it.

use crate::checks;
use crate::model::{Model, Range, Role, Special};
use crate::network::Network;
use crate::project::{Project, Settings};
use crate::report::{Finding, Report, Verdict};
use crate::thermo::reaction::{self, Participant};

/// A metabolite's ΔfG'° at its compartment's conditions.
#[derive(Debug, Clone, PartialEq)]
pub struct MetaboliteEnergy {
    pub value_kj: f64,
    pub sigma_kj: f64,
    /// "model" (given as ΔfG'°), "species" or "library".
    pub origin: &'static str,
    pub source: String,
}

/// Where a reaction's ΔrG'° came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EnergyOrigin {
    /// Given for the reaction in the model.
    Reaction,
    /// Σ ν·ΔfG'° of its participants.
    Formation,
}

impl EnergyOrigin {
    pub fn slug(self) -> &'static str {
        match self {
            EnergyOrigin::Reaction => "reaction",
            EnergyOrigin::Formation => "formation",
        }
    }
}

/// Everything known about a reaction's thermodynamics.
#[derive(Debug, Clone, PartialEq)]
pub struct ReactionThermo {
    pub drg0_kj: f64,
    pub sigma_kj: f64,
    pub origin: EnergyOrigin,
    pub source: String,
    pub temperature_k: f64,
    pub k_prime: f64,
    /// ΔG' over the allowed concentrations (no σ allowance).
    pub range: Range,
    pub measured_kj: Option<f64>,
}

pub struct Analysis<'a> {
    pub model: &'a Model,
    pub settings: &'a Settings,
    pub network: Network,
    pub metabolite_energy: Vec<Option<MetaboliteEnergy>>,
    /// `Err` lists the metabolites whose missing ΔfG'° left no ΔrG'°.
    pub reaction_thermo: Vec<Result<ReactionThermo, Vec<usize>>>,
    /// k in the k·σ allowance, from the confidence level.
    pub sigma_multiplier: f64,
}

impl<'a> Analysis<'a> {
    pub fn new(model: &'a Model, settings: &'a Settings) -> Analysis<'a> {
        let network = Network::build(model);
        let metabolite_energy: Vec<Option<MetaboliteEnergy>> = model
            .metabolites
            .iter()
            .map(|m| {
                m.dfg_prime.as_ref().map(|e| MetaboliteEnergy {
                    value_kj: e.value_kj,
                    sigma_kj: e.sigma_kj,
                    origin: "model",
                    source: e.source.clone(),
                })
            })
            .collect();
        let mut analysis = Analysis {
            model,
            settings,
            network,
            metabolite_energy,
            reaction_thermo: Vec::new(),
            sigma_multiplier: sigma_multiplier(settings.confidence),
        };
        analysis.reaction_thermo = (0..model.reactions.len())
            .map(|j| analysis.compute_reaction(j))
            .collect();
        analysis
    }

    /// Allowed concentration range of a metabolite (its own or the default).
    pub fn concentration(&self, metabolite: usize) -> Range {
        self.model.metabolites[metabolite]
            .concentration
            .unwrap_or(self.settings.default_concentration)
    }

    /// Participants as the ΔG' range computation sees them.
    pub fn participants(&self, reaction: usize) -> Vec<Participant> {
        self.model.reactions[reaction]
            .stoichiometry
            .iter()
            .map(|&(i, c)| {
                let m = &self.model.metabolites[i];
                let in_q = m.special == Special::None;
                Participant {
                    coefficient: c,
                    concentration: in_q.then(|| self.concentration(i)),
                    measured: m.measured_m,
                }
            })
            .collect()
    }

    /// Temperature a reaction runs at: its compartment's when all participants
    /// share one, else the model default.
    pub fn reaction_temperature(&self, reaction: usize) -> f64 {
        let st = &self.model.reactions[reaction].stoichiometry;
        let first = st
            .first()
            .map(|&(i, _)| self.model.metabolites[i].compartment);
        match first {
            Some(c)
                if st
                    .iter()
                    .all(|&(i, _)| self.model.metabolites[i].compartment == c) =>
            {
                self.model.compartment_temperature(c)
            }
            _ => self.model.temperature_k,
        }
    }

    fn compute_reaction(&self, j: usize) -> Result<ReactionThermo, Vec<usize>> {
        let r = &self.model.reactions[j];
        let temperature_k = self.reaction_temperature(j);
        let (drg0_kj, sigma_kj, origin, source) = match &r.drg_prime {
            Some(e) => (
                e.value_kj,
                e.sigma_kj,
                EnergyOrigin::Reaction,
                e.source.clone(),
            ),
            None => {
                let mut terms = Vec::new();
                let mut missing = Vec::new();
                for &(i, c) in &r.stoichiometry {
                    if self.model.metabolites[i].special == Special::Proton {
                        // H+ is fixed by pH: its transformed ΔfG'° is zero.
                        continue;
                    }
                    match &self.metabolite_energy[i] {
                        Some(e) => terms.push((c, e.value_kj, e.sigma_kj)),
                        None => missing.push(i),
                    }
                }
                if !missing.is_empty() {
                    return Err(missing);
                }
                let (value, sigma) = reaction::weighted_sum(&terms);
                (
                    value,
                    sigma,
                    EnergyOrigin::Formation,
                    "Σ ν·ΔfG'°".to_string(),
                )
            }
        };
        let participants = self.participants(j);
        Ok(ReactionThermo {
            drg0_kj,
            sigma_kj,
            origin,
            source,
            temperature_k,
            k_prime: reaction::k_prime(drg0_kj, temperature_k),
            range: reaction::dg_range(drg0_kj, temperature_k, &participants),
            measured_kj: reaction::dg_measured(drg0_kj, temperature_k, &participants),
        })
    }

    /// Verdict for flux of reaction `j` in `direction` (+1 / −1).
    pub fn verdict(&self, j: usize, direction: f64) -> Verdict {
        match &self.reaction_thermo[j] {
            Ok(t) => reaction::verdict(
                t.range,
                direction,
                self.sigma_multiplier * t.sigma_kj,
                self.settings.min_driving_force_kj,
            ),
            Err(_) => Verdict::NoData,
        }
    }

    /// Reactions whose ΔG matters: boundary pseudo-reactions have none.
    pub fn is_thermodynamic(&self, j: usize) -> bool {
        self.model.reactions[j].role == Role::Internal
    }

    /// Run every registered check.
    pub fn findings(&self) -> Vec<Finding> {
        let mut findings: Vec<Finding> = checks::REGISTRY
            .iter()
            .flat_map(|check| (check.run)(self))
            .collect();
        crate::report::build::sort_findings(&mut findings);
        findings
    }
}

impl Project {
    /// Analyse the project and return the report every output is made from.
    pub fn analyse(&self) -> Report {
        let analysis = Analysis::new(&self.model, &self.settings);
        let findings = analysis.findings();
        crate::report::build::build(self, &analysis, findings)
    }
}

/// Two-sided normal quantile for a confidence level: 0.95 → 1.96.
/// Acklam's rational approximation of the inverse normal CDF (relative error
/// below 1.2e-9; P. J. Acklam, "An algorithm for computing the inverse normal
/// cumulative distribution function", 2003).
pub fn sigma_multiplier(confidence: f64) -> f64 {
    let p = 0.5 + confidence / 2.0;
    const A: [f64; 6] = [
        -3.969_683_028_665_376e1,
        2.209_460_984_245_205e2,
        -2.759_285_104_469_687e2,
        1.383_577_518_672_69e2,
        -3.066_479_806_614_716e1,
        2.506_628_277_459_239,
    ];
    const B: [f64; 5] = [
        -5.447_609_879_822_406e1,
        1.615_858_368_580_409e2,
        -1.556_989_798_598_866e2,
        6.680_131_188_771_972e1,
        -1.328_068_155_288_572e1,
    ];
    const C: [f64; 6] = [
        -7.784_894_002_430_293e-3,
        -3.223_964_580_411_365e-1,
        -2.400_758_277_161_838,
        -2.549_732_539_343_734,
        4.374_664_141_464_968,
        2.938_163_982_698_783,
    ];
    const D: [f64; 4] = [
        7.784_695_709_041_462e-3,
        3.224_671_290_700_398e-1,
        2.445_134_137_142_996,
        3.754_408_661_907_416,
    ];
    let p_high = 1.0 - 0.02425;
    if p <= p_high {
        let q = p - 0.5;
        let r = q * q;
        (((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q
            / (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1.0)
    } else {
        let q = (-2.0 * (1.0 - p).ln()).sqrt();
        -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5])
            / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1.0)
    }
}

#[cfg(test)]
mod tests {
    use super::sigma_multiplier;

    /// Standard normal quantiles (common practice; any statistics table):
    /// 95 % two-sided → 1.959964, 99 % → 2.575829, 68.27 % → 1.0.
    #[test]
    fn normal_quantiles() {
        assert!((sigma_multiplier(0.95) - 1.959_964).abs() < 1e-6);
        assert!((sigma_multiplier(0.99) - 2.575_829).abs() < 1e-6);
        assert!((sigma_multiplier(0.682_689_5) - 1.0).abs() < 1e-6);
    }
}
