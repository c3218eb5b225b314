//! The analysed data every check reads: the model, its network, and the
//! energies computed once (per metabolite ΔfG'°, per reaction ΔrG'°, K' and
//! ΔG' range), loops and scenarios. Checks read it; none of them changes it.
//! This module knows nothing of checks, findings' consumers or the report:
//! `pipeline` runs the stages in order.

use crate::finding::Verdict;
use crate::loops::{
    self, CurrencyOptions, DeltaGRange, EnergyCycleAnalysis, LoopAnalysis, LoopEnergy,
    LoopEnergyOptions, LoopError, StandardDeltaG,
};
use crate::model::{Model, Range, Role, Special};
use crate::network::Network;
use crate::project::Settings;
use crate::thermo::errors::{ErrorModel, ErrorSource};
use crate::thermo::reaction::{self, Participant};
use crate::thermo::transport::{self, CompartmentState, Participant as TransportParticipant};

pub use crate::thermo::metabolite::{MetaboliteEnergy, MetaboliteThermo};

/// Where a reaction's ΔrG'° came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EnergyOrigin {
    /// Given for the reaction in the model.
    Reaction,
    /// Σ ν·ΔfG'° of its participants.
    Formation,
    /// A pure transport step without formation energies: the single-species
    /// rule of `thermo::transport_only`.
    TransportRule,
}

impl EnergyOrigin {
    pub fn slug(self) -> &'static str {
        match self {
            EnergyOrigin::Reaction => "reaction",
            EnergyOrigin::Formation => "formation",
            EnergyOrigin::TransportRule => "transport-rule",
        }
    }
}

/// ΔrG'° of a reaction spanning compartments, split into its terms (Jol et
/// al., Biophys. J. 99 (2010) 3139; see `thermo::transport`).
#[derive(Debug, Clone, PartialEq)]
pub struct TransportTerms {
    pub formation_sum_kj: f64,
    pub proton_term_kj: f64,
    pub electrical_term_kj: f64,
    /// False when H or charge is unbalanced, so the split depends on the
    /// reference compartment chosen.
    pub reference_independent: bool,
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
    /// Present when participants sit in more than one compartment.
    pub transport: Option<TransportTerms>,
}

/// Why a reaction has no ΔrG'°.
#[derive(Debug, Clone, PartialEq)]
pub struct MissingEnergy {
    /// Metabolites without a usable ΔfG'°.
    pub metabolites: Vec<usize>,
    /// Other reasons (e.g. a formula needed for a transport step).
    pub reasons: Vec<String>,
}

/// Results of the loop analysis (see `loops`).
#[derive(Debug, Clone)]
/// The part of the loop analysis that needs the model only (no energies),
/// so that it can run beside the thermodynamics.
pub struct LoopSearch {
    loops: Result<LoopAnalysis, LoopError>,
    energy_cycles: Result<EnergyCycleAnalysis, LoopError>,
}

impl LoopSearch {
    /// Internal loops and energy-generating cycles, side by side (each is
    /// single-threaded for long stretches).
    pub fn run(model: &Model, settings: &Settings) -> LoopSearch {
        let options = CurrencyOptions {
            overrides: settings.currencies.clone(),
            proton_gradients: None,
        };
        let (loops, energy_cycles) = rayon::join(
            || loops::analyse_loops(model, &loops::LoopOptions::default()),
            || loops::energy_generating_cycles(model, &options),
        );
        LoopSearch {
            loops,
            energy_cycles,
        }
    }
}

pub struct LoopResults {
    pub loops: Result<LoopAnalysis, LoopError>,
    /// ΔrG'° around each listed loop.
    pub energies: Result<Vec<LoopEnergy>, LoopError>,
    pub energy_cycles: Result<EnergyCycleAnalysis, LoopError>,
}

pub struct Analysis<'a> {
    pub model: &'a Model,
    pub settings: &'a Settings,
    pub network: Network,
    /// `None` when the project switched the loop analysis off.
    pub loops: Option<LoopResults>,
    pub metabolites: Vec<MetaboliteThermo>,
    pub reaction_thermo: Vec<Result<ReactionThermo, MissingEnergy>>,
    /// Independent error sources behind every ΔrG'° (shared by verdicts,
    /// loop sums and the joint scenario LP).
    pub errors: ErrorModel,
    /// Compound of each metabolite for error purposes: the index of the
    /// first metabolite sharing its ΔfG'° error (`thermo::compounds`).
    pub compound_of: Vec<usize>,
    /// ΔfG'° values copied unconverted into compartments of different
    /// conditions (`thermo::copies`).
    pub copied_energies: Vec<crate::thermo::copies::CopiedEnergy>,
    /// k in the k·σ allowance, from the confidence level.
    pub sigma_multiplier: f64,
    /// Every scenario judged jointly (the model's irreversible directions
    /// first), see `scenarios`.
    pub scenarios: Vec<crate::scenarios::ScenarioResult>,
}

/// What one independent error source belongs to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum ErrorKey {
    /// The ΔfG'° error of one metabolite.
    Metabolite(usize),
    /// The ΔfG'° error shared by every metabolite of one compound (named by
    /// its first metabolite; see `thermo::compounds`).
    Compound(usize),
    /// A reaction's own `reaction_energy`.
    Reaction(usize),
}

impl<'a> Analysis<'a> {
    pub fn new(model: &'a Model, settings: &'a Settings) -> Analysis<'a> {
        let mut analysis = Analysis::without_loops(model, settings);
        analysis.add_loops();
        analysis
    }

    /// Everything but the loop analysis: energies, error model, scenarios
    /// (`pipeline` times the two parts as separate stages).
    pub fn without_loops(model: &'a Model, settings: &'a Settings) -> Analysis<'a> {
        let network = Network::build(model);
        let metabolites: Vec<MetaboliteThermo> = (0..model.metabolites.len())
            .map(|i| crate::thermo::metabolite::resolve(model, i))
            .collect();
        // The loader accepts confidence in [0.5, 0.9999] only, so this cannot fail.
        let sigma_multiplier =
            crate::thermo::uncertainty::sigma_multiplier(settings.confidence).unwrap_or(1.96);
        let compound_of = crate::thermo::compounds::group_compounds(model, &metabolites);
        let copied_energies = crate::thermo::copies::find_copies(model, &metabolites);
        let mut analysis = Analysis {
            model,
            settings,
            network,
            loops: None,
            metabolites,
            reaction_thermo: Vec::new(),
            errors: ErrorModel::default(),
            compound_of,
            copied_energies,
            sigma_multiplier,
            scenarios: Vec::new(),
        };
        analysis.reaction_thermo = (0..model.reactions.len())
            .map(|j| analysis.compute_reaction(j))
            .collect();
        analysis.errors = analysis.build_error_model();
        // Every σ(ΔrG'°) is that of its net error per compound.
        for (j, t) in analysis.reaction_thermo.iter_mut().enumerate() {
            if let Ok(t) = t {
                t.sigma_kj = analysis.errors.reaction_sigma(j);
            }
        }
        analysis.scenarios = crate::scenarios::analyse(
            &analysis,
            &crate::scenarios::ScenarioOptions {
                extra_conflict_sets: settings.extra_conflict_sets,
            },
        );
        analysis
    }

    /// The loop analysis, when the project has it switched on.
    pub fn add_loops(&mut self) {
        if self.settings.loops {
            let search = LoopSearch::run(self.model, self.settings);
            self.add_loop_search(search);
        }
    }

    /// Loop energies from a [`LoopSearch`] of this analysis's model.
    pub fn add_loop_search(&mut self, search: LoopSearch) {
        self.loops = Some(self.loop_results(search));
    }

    /// Internal loops with their energies, and energy-generating cycles.
    fn loop_results(&self, search: LoopSearch) -> LoopResults {
        let LoopSearch {
            loops,
            energy_cycles,
        } = search;
        let energies = match &loops {
            Ok(found) => {
                let standard: Vec<Option<StandardDeltaG>> = self
                    .reaction_thermo
                    .iter()
                    .map(|t| {
                        t.as_ref().ok().map(|t| StandardDeltaG {
                            value_kj: t.drg0_kj,
                            sigma_kj: t.sigma_kj,
                        })
                    })
                    .collect();
                // The same allowance as every verdict: range widened by k·σ.
                let ranges: Vec<Option<DeltaGRange>> = self
                    .reaction_thermo
                    .iter()
                    .map(|t| {
                        t.as_ref().ok().map(|t| DeltaGRange {
                            min_kj: t.range.min - self.sigma_multiplier * t.sigma_kj,
                            max_kj: t.range.max + self.sigma_multiplier * t.sigma_kj,
                        })
                    })
                    .collect();
                let options = LoopEnergyOptions {
                    confidence: self.sigma_multiplier,
                    ..LoopEnergyOptions::default()
                };
                loops::assess_loop_energies_correlated(
                    self.model,
                    found,
                    &standard,
                    &ranges,
                    &self.errors,
                    &options,
                )
            }
            Err(e) => Err(e.clone()),
        };
        LoopResults {
            loops,
            energies,
            energy_cycles,
        }
    }

    /// The independent error source behind metabolite `i`'s ΔfG'°: its
    /// compound's.
    pub fn metabolite_error_key(&self, i: usize) -> ErrorKey {
        ErrorKey::Compound(self.compound_of[i])
    }

    /// "ΔfG'° of glucose (glc_c, glc_e)": label of a compound's error source.
    fn compound_label(&self, i: usize) -> String {
        let rep = self.compound_of[i];
        let members: Vec<&str> = (0..self.model.metabolites.len())
            .filter(|&k| self.compound_of[k] == rep)
            .map(|k| self.model.metabolites[k].id.as_str())
            .collect();
        let m = &self.model.metabolites[rep];
        let name = if m.name.is_empty() { &m.id } else { &m.name };
        format!("ΔfG'° of {name} ({})", members.join(", "))
    }

    /// Error sources of every ΔrG'°: a reaction's own value is one source;
    /// a Σ ν·ΔfG'° has one term per participant's source, net coefficients
    /// summed per source.
    fn build_error_model(&self) -> ErrorModel {
        let mut index: std::collections::BTreeMap<ErrorKey, usize> = Default::default();
        let mut sources: Vec<ErrorSource> = Vec::new();
        let mut source_of = |key: ErrorKey, label: &dyn Fn() -> String, sigma: f64| -> usize {
            *index.entry(key).or_insert_with(|| {
                sources.push(ErrorSource {
                    label: label(),
                    sigma_kj: sigma,
                });
                sources.len() - 1
            })
        };
        let mut reactions = Vec::with_capacity(self.model.reactions.len());
        for (j, thermo) in self.reaction_thermo.iter().enumerate() {
            let r = &self.model.reactions[j];
            let mut net: std::collections::BTreeMap<usize, f64> = Default::default();
            match thermo {
                Ok(t) if t.origin != EnergyOrigin::Formation => {
                    // A given ΔrG'° or the transport rule: one source per reaction.
                    let s = source_of(
                        ErrorKey::Reaction(j),
                        &|| format!("ΔrG'° of {}", r.id),
                        t.sigma_kj,
                    );
                    net.insert(s, 1.0);
                }
                Ok(_) => {
                    for &(i, c) in &r.stoichiometry {
                        let Some(e) = self.metabolite_energy(i) else {
                            continue;
                        };
                        let s = source_of(
                            self.metabolite_error_key(i),
                            &|| self.compound_label(i),
                            e.sigma_kj,
                        );
                        *net.entry(s).or_insert(0.0) += c;
                    }
                }
                Err(_) => {}
            }
            reactions.push(crate::thermo::errors::net_terms(net));
        }
        ErrorModel { sources, reactions }
    }

    /// The copied ΔfG'° a reaction's ΔrG'° rests on (a step between two of
    /// the compartments it was copied into), if any.
    pub fn copied_energy_behind(&self, j: usize) -> Option<&crate::thermo::copies::CopiedEnergy> {
        self.copied_energies
            .iter()
            .find(|c| c.reactions.contains(&j))
    }

    /// ΔfG'° of metabolite i, when known.
    pub fn metabolite_energy(&self, i: usize) -> Option<&MetaboliteEnergy> {
        self.metabolites[i].energy.as_ref()
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
                // Water, H+ (fixed by pH) and free Mg²⁺ fixed by pMg.
                let fixed = self.metabolites[i]
                    .energy
                    .as_ref()
                    .is_some_and(|e| e.origin == "fixed-pmg");
                let in_q = m.special == Special::None && !fixed;
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

    fn compute_reaction(&self, j: usize) -> Result<ReactionThermo, MissingEnergy> {
        let r = &self.model.reactions[j];
        if !self.is_thermodynamic(j) {
            // Exchange, demand, sink and biomass steps move matter across the
            // model's boundary; a Gibbs energy of them means nothing.
            return Err(MissingEnergy {
                metabolites: Vec::new(),
                reasons: vec![format!(
                    "{} reactions cross the model boundary and have no ΔrG'°",
                    r.role.slug()
                )],
            });
        }
        let temperature_k = self.reaction_temperature(j);
        let (drg0_kj, sigma_kj, origin, source, transport) = match &r.drg_prime {
            Some(e) => (
                e.value_kj,
                e.sigma_kj,
                EnergyOrigin::Reaction,
                e.source.clone(),
                None,
            ),
            None => match self.formation_energy_sum(j) {
                Ok((value, transport)) => (
                    value,
                    // Filled in from the error model once every reaction is
                    // known (errors are shared per compound, not per term).
                    0.0,
                    EnergyOrigin::Formation,
                    "Σ ν·ΔfG'°".to_string(),
                    transport,
                ),
                Err(missing) => self.transport_rule(j).ok_or(missing)?,
            },
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
            transport,
        })
    }

    /// Σ ν·ΔfG'°; for a reaction spanning compartments, plus the proton and
    /// electrical terms of moving H and charge across membranes. (Its σ comes
    /// from the error model.)
    fn formation_energy_sum(
        &self,
        j: usize,
    ) -> Result<(f64, Option<TransportTerms>), MissingEnergy> {
        let r = &self.model.reactions[j];
        let mut missing = MissingEnergy {
            metabolites: Vec::new(),
            reasons: Vec::new(),
        };
        let mut terms = Vec::new();
        for &(i, c) in &r.stoichiometry {
            match self.metabolite_energy(i) {
                Some(e) => terms.push(c * e.value_kj),
                None => missing.metabolites.push(i),
            }
        }
        if !missing.metabolites.is_empty() {
            return Err(missing);
        }
        let value: f64 = terms.iter().sum();
        let compartment_of = |i: usize| self.model.metabolites[i].compartment;
        let first = r.stoichiometry.first().map(|&(i, _)| compartment_of(i));
        if r.stoichiometry
            .iter()
            .all(|&(i, _)| Some(compartment_of(i)) == first)
        {
            return Ok((value, None));
        }
        let states: Vec<CompartmentState> = self
            .model
            .compartments
            .iter()
            .map(|c| CompartmentState::of_compartment(c, self.model.temperature_k))
            .collect();
        let mut parts = Vec::new();
        for &(i, c) in &r.stoichiometry {
            let m = &self.model.metabolites[i];
            if m.special == Special::Proton {
                parts.push(TransportParticipant::proton(c, m.compartment));
                continue;
            }
            match carried_hydrogens_and_charge(m, &self.metabolites[i]) {
                Some((hydrogens, charge)) => parts.push(TransportParticipant {
                    coefficient: c,
                    compartment: m.compartment,
                    dfg_prime_kj: self.metabolite_energy(i).map(|e| e.value_kj).unwrap_or(0.0),
                    hydrogens,
                    charge,
                    is_proton: false,
                }),
                None => missing.reasons.push(format!(
                    "`{}` crosses a membrane but has no formula and charge to count the H and charge it carries",
                    m.id
                )),
            }
        }
        if !missing.reasons.is_empty() {
            return Err(missing);
        }
        match transport::standard_reaction_energy(&states, &parts, None) {
            Ok(b) => Ok((
                b.total_kj,
                Some(TransportTerms {
                    formation_sum_kj: b.formation_sum_kj,
                    proton_term_kj: b.proton_term_kj,
                    electrical_term_kj: b.electrical_term_kj,
                    reference_independent: b.is_reference_independent(),
                }),
            )),
            Err(e) => {
                missing
                    .reasons
                    .push(format!("transport terms cannot be computed: {e}"));
                Err(missing)
            }
        }
    }

    /// ΔrG'° of a pure transport step from compartment conditions alone.
    fn transport_rule(
        &self,
        j: usize,
    ) -> Option<(f64, f64, EnergyOrigin, String, Option<TransportTerms>)> {
        let e = crate::thermo::transport_only::estimate(self.model, j).ok()?;
        let b = &e.breakdown;
        let terms = TransportTerms {
            formation_sum_kj: b.formation_sum_kj,
            proton_term_kj: b.proton_term_kj,
            electrical_term_kj: b.electrical_term_kj,
            reference_independent: b.is_reference_independent(),
        };
        Some((
            e.value_kj,
            e.sigma_kj,
            EnergyOrigin::TransportRule,
            crate::thermo::transport_only::SOURCE.to_string(),
            Some(terms),
        ))
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
}

/// H atoms and charge a metabolite carries across a membrane as written:
/// from its formula and charge (the same in every compartment, so balanced
/// equations stay balanced), else the species averages.
fn carried_hydrogens_and_charge(
    m: &crate::model::Metabolite,
    thermo: &MetaboliteThermo,
) -> Option<(f64, f64)> {
    let from_formula = m
        .formula
        .as_deref()
        .and_then(|f| crate::chem::parse_formula(f).ok())
        .filter(|f| f.is_exact())
        .map(|f| f.count("H") as f64);
    match (from_formula, m.charge) {
        (Some(h), Some(z)) => Some((h, f64::from(z))),
        _ => thermo
            .species
            .as_ref()
            .map(|s| (s.state.mean_hydrogens, s.state.mean_charge)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::project::Project;

    /// The demo's compounds: what crosses the membrane is one compound on
    /// both sides (same library entry or identical species data); the rest
    /// are their own.
    #[test]
    fn demo_metabolites_group_into_compounds() {
        let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
        let project = Project::load(&dir).expect("demo loads");
        let analysis = Analysis::new(&project.model, &project.settings);
        let id = |k: usize| project.model.metabolites[k].id.as_str();
        let mut shared: Vec<(&str, &str)> = (0..project.model.metabolites.len())
            .filter(|&k| analysis.compound_of[k] != k)
            .map(|k| (id(analysis.compound_of[k]), id(k)))
            .collect();
        shared.sort();
        assert_eq!(
            shared,
            [
                ("co2_e", "co2_c"),
                ("etoh_e", "etoh_c"),
                ("glc_e", "glc_c"),
                ("lac_e", "lac_c"),
            ]
        );
        // One source per compound, named with its members.
        let glc = analysis.metabolite_error_key(project.model.metabolite_index("glc_c").unwrap());
        assert_eq!(glc, ErrorKey::Compound(0));
        assert!(analysis
            .errors
            .sources
            .iter()
            .any(|s| s.label == "ΔfG'° of D-glucose (glc_e, glc_c)"));
    }
}
