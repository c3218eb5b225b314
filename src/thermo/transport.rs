//! Standard transformed reaction energy of reactions whose participants sit in
//! different compartments (membrane transport, alone or coupled to chemistry).
//!
//! Follows the approach of Jol et al., "Thermodynamic calculations for
//! biochemical transport and reaction processes in metabolic networks",
//! Biophys. J. 99 (2010) 3139–3144 (their equations recalled from memory;
//! everything below is derived from first principles and tested on those).
//!
//! # Conventions
//!
//! * Each participant has a signed coefficient ν (negative = consumed), a
//!   compartment, its reactant's ΔfG'° at that compartment's pH, I and T, and
//!   the hydrogen atoms nH and charge z it carries *as written in the
//!   equation* (the species the equation is balanced with: the metabolite's
//!   formula and charge; a reactant's average N̄H, z̄ is the fallback).
//! * Each compartment c has a pH, an ionic strength, a temperature and an
//!   electrical potential ψ_c in mV, measured against one common reference
//!   (e.g. the extracellular space at 0 mV). "Inside negative" means
//!   ψ_in < ψ_out; a membrane potential Δψ = ψ_in − ψ_out = −150 mV.
//! * H⁺ written in the equation is fixed by its compartment's pH: its ΔfG'° is
//!   0 and it never enters the mass-action ratio. Within one compartment it
//!   therefore contributes nothing; H⁺ (as an explicit metabolite or as the
//!   hydrogen carried by a transported reactant) moved between compartments
//!   contributes its change of chemical potential.
//!
//! # Formula
//!
//! With μ_H,c = RT_c·ln(10^−pH_c) − RTα(T_c)·√I_c/(1 + 1.6√I_c) the chemical
//! potential of H⁺ in compartment c (the quantity Alberty's transform
//! subtracts nH times), η_c = Σ_{i in c} νᵢ·nHᵢ the hydrogen gained by
//! compartment c's participants and q_c = Σ_{i in c} νᵢ·zᵢ their charge gained:
//!
//! ```text
//! ΔrG'° = Σ νᵢ·ΔfG'°ᵢ                     formation term
//!       + Σ_c η_c·(μ_H,c − μ_H,r)          proton term
//!       + F·Σ_c q_c·(ψ_c − ψ_r)            electrical term (ψ in V)
//! ```
//!
//! The first line is the ΔrG'° of the transformed (biochemical) convention,
//! in which every compartment exchanges H⁺ with its own pool. The two
//! correction terms turn it into the energy of the process as written, in
//! which hydrogen and charge cross the membrane. For an equation balanced in
//! H and charge, Σ η_c = Σ q_c = 0 and the reference compartment r drops out.
//! If it is not balanced, the unbalanced H⁺ and charge are taken as exchanged
//! with compartment r, by default the compartment holding the most
//! participants (ties: the lowest index); the breakdown reports the imbalance
//! so that the caller can warn. When all participants share one compartment
//! both terms are exactly 0 and ΔrG'° = Σ νᵢ·ΔfG'°ᵢ.
//!
//! Mg²⁺ moved across a membrane under a pMg transform is not accounted for.
//!
//! # Worked example: proton import
//!
//! H⁺(out) → H⁺(in) at 298.15 K, pH_out = 7.00, pH_in = 7.75 (inside alkaline),
//! equal ionic strength, ψ_out = 0 mV, ψ_in = −150 mV (inside negative):
//!
//! ```text
//! formation term   = 1·0 − 1·0                                    =   0
//! proton term      = μ_H,in − μ_H,out = −RT·ln10·(7.75 − 7.00)
//!                  = −5.7080 kJ/mol × 0.75                        =  −4.281 kJ/mol
//! electrical term  = F·(+1)·(ψ_in − ψ_out) = 96.485 kJ/(mol·V) × (−0.150 V)
//!                                                                 = −14.473 kJ/mol
//! ΔrG'°            =                                                −18.754 kJ/mol
//! ```
//!
//! Negative: protons flow inward on their own, the chemiosmotic driving force
//! (Δμ̃H⁺ = F·Δψ − RT·ln10·ΔpH, common practice).

use crate::model::Compartment;
use crate::thermo::constants::F_KJ_PER_V;
use crate::thermo::legendre::{Conditions, Transform, TransformError};

/// Conditions of one compartment, including its electrical potential.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CompartmentState {
    pub conditions: Conditions,
    /// Electrical potential against the common reference, mV.
    pub potential_mv: f64,
}

impl CompartmentState {
    /// The state of a model compartment; `default_temperature_k` applies when
    /// the compartment has no temperature of its own.
    pub fn of_compartment(
        compartment: &Compartment,
        default_temperature_k: f64,
    ) -> CompartmentState {
        CompartmentState {
            conditions: Conditions::of_compartment(compartment, default_temperature_k),
            potential_mv: compartment.potential_mv,
        }
    }
}

/// One participant of a reaction.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Participant {
    /// Signed stoichiometric coefficient: negative = consumed.
    pub coefficient: f64,
    /// Index into the compartment slice passed alongside.
    pub compartment: usize,
    /// ΔfG'° of the reactant at its compartment's conditions, kJ/mol.
    /// Ignored for H⁺ (taken as 0).
    pub dfg_prime_kj: f64,
    /// Hydrogen atoms carried as written (formula, or N̄H). Ignored for H⁺ (1).
    pub hydrogens: f64,
    /// Charge carried as written (formula, or z̄). Ignored for H⁺ (+1).
    pub charge: f64,
    /// The participant is the H⁺ metabolite of its compartment.
    pub is_proton: bool,
}

impl Participant {
    /// An explicit H⁺ of a compartment.
    pub fn proton(coefficient: f64, compartment: usize) -> Participant {
        Participant {
            coefficient,
            compartment,
            dfg_prime_kj: 0.0,
            hydrogens: 1.0,
            charge: 1.0,
            is_proton: true,
        }
    }

    /// (ΔfG'°, nH, z) used in the sums.
    fn effective(&self) -> (f64, f64, f64) {
        if self.is_proton {
            (0.0, 1.0, 1.0)
        } else {
            (self.dfg_prime_kj, self.hydrogens, self.charge)
        }
    }
}

/// ΔrG'° of a reaction split into its parts, kJ/mol.
#[derive(Debug, Clone, PartialEq)]
pub struct TransportBreakdown {
    /// Σ νᵢ·ΔfG'°ᵢ, each at its own compartment (H⁺ counts 0).
    pub formation_sum_kj: f64,
    /// Σ_c η_c·(μ_H,c − μ_H,r): hydrogen moved between compartments.
    pub proton_term_kj: f64,
    /// F·Σ_c q_c·(ψ_c − ψ_r): charge moved across potential differences.
    pub electrical_term_kj: f64,
    /// Sum of the three terms.
    pub total_kj: f64,
    /// Compartment r that takes up any H⁺ or charge imbalance.
    pub reference_compartment: usize,
    /// Σ νᵢ·nHᵢ over all participants (0 for an H-balanced equation).
    pub hydrogen_imbalance: f64,
    /// Σ νᵢ·zᵢ over all participants (0 for a charge-balanced equation).
    pub charge_imbalance: f64,
    /// Compartments that hold participants, ascending.
    pub compartments: Vec<usize>,
}

/// Imbalances smaller than this (in H atoms or elementary charges) count as
/// balanced; model coefficients are often written with a few decimals.
const BALANCE_TOLERANCE: f64 = 1e-6;

impl TransportBreakdown {
    /// True when participants sit in more than one compartment.
    pub fn spans_compartments(&self) -> bool {
        self.compartments.len() > 1
    }

    /// True when the result does not depend on which compartment takes up
    /// imbalances: one compartment only, or an equation balanced in H and charge.
    pub fn is_reference_independent(&self) -> bool {
        !self.spans_compartments()
            || (self.hydrogen_imbalance.abs() < BALANCE_TOLERANCE
                && self.charge_imbalance.abs() < BALANCE_TOLERANCE)
    }
}

/// Why a reaction energy could not be computed.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TransportError {
    #[error("the reaction has no participants")]
    NoParticipants,
    #[error("participant {participant} names compartment {compartment}, but only {count} exist")]
    UnknownCompartment {
        participant: usize,
        compartment: usize,
        count: usize,
    },
    #[error("reference compartment {compartment} does not exist ({count} compartments)")]
    UnknownReference { compartment: usize, count: usize },
    #[error("participant {participant} has a non-finite {quantity}")]
    NonFinite {
        participant: usize,
        quantity: &'static str,
    },
    #[error("compartment {compartment}: {source}")]
    Conditions {
        compartment: usize,
        #[source]
        source: TransformError,
    },
}

/// ΔrG'° of a reaction whose participants may sit in several compartments,
/// with the CODATA 2018 gas and Faraday constants. `reference` picks the
/// compartment that takes up H⁺ and charge imbalances (see module docs);
/// `None` chooses the compartment with the most participants.
pub fn standard_reaction_energy(
    compartments: &[CompartmentState],
    participants: &[Participant],
    reference: Option<usize>,
) -> Result<TransportBreakdown, TransportError> {
    if participants.is_empty() {
        return Err(TransportError::NoParticipants);
    }
    let count = compartments.len();
    let mut participants_per_compartment = vec![0usize; count];
    for (index, p) in participants.iter().enumerate() {
        if p.compartment >= count {
            return Err(TransportError::UnknownCompartment {
                participant: index,
                compartment: p.compartment,
                count,
            });
        }
        let (dfg, n_h, z) = p.effective();
        for (quantity, value) in [
            ("coefficient", p.coefficient),
            ("ΔfG'°", dfg),
            ("hydrogen count", n_h),
            ("charge", z),
        ] {
            if !value.is_finite() {
                return Err(TransportError::NonFinite {
                    participant: index,
                    quantity,
                });
            }
        }
        participants_per_compartment[p.compartment] += 1;
    }
    let reference = match reference {
        Some(r) if r >= count => {
            return Err(TransportError::UnknownReference {
                compartment: r,
                count,
            })
        }
        Some(r) => r,
        // max_by_key returns the last maximum; iterate in reverse so that
        // ties go to the lowest index.
        None => (0..count)
            .rev()
            .max_by_key(|&c| participants_per_compartment[c])
            .unwrap_or(0),
    };

    let involved: Vec<usize> = (0..count)
        .filter(|&c| participants_per_compartment[c] > 0)
        .collect();
    let proton_potential = |c: usize| -> Result<f64, TransportError> {
        Transform::new(compartments[c].conditions)
            .map(|t| t.proton_potential())
            .map_err(|source| TransportError::Conditions {
                compartment: c,
                source,
            })
    };
    let reference_proton = proton_potential(reference)?;
    let reference_potential_v = compartments[reference].potential_mv / 1000.0;
    if !reference_potential_v.is_finite() {
        return Err(TransportError::Conditions {
            compartment: reference,
            source: TransformError::BadCondition {
                quantity: "electrical potential",
                value: compartments[reference].potential_mv,
                expected: "a finite number (mV)",
            },
        });
    }

    let mut formation_sum = 0.0;
    let mut proton_term = 0.0;
    let mut electrical_term = 0.0;
    let mut hydrogen_imbalance = 0.0;
    let mut charge_imbalance = 0.0;
    for &c in &involved {
        let mut hydrogen_gained = 0.0;
        let mut charge_gained = 0.0;
        for p in participants.iter().filter(|p| p.compartment == c) {
            let (dfg, n_h, z) = p.effective();
            formation_sum += p.coefficient * dfg;
            hydrogen_gained += p.coefficient * n_h;
            charge_gained += p.coefficient * z;
        }
        let potential_mv = compartments[c].potential_mv;
        if !potential_mv.is_finite() {
            return Err(TransportError::Conditions {
                compartment: c,
                source: TransformError::BadCondition {
                    quantity: "electrical potential",
                    value: potential_mv,
                    expected: "a finite number (mV)",
                },
            });
        }
        // Differences against the reference: exactly 0 for c == reference,
        // so a one-compartment reaction gets exactly the plain sum.
        proton_term += hydrogen_gained * (proton_potential(c)? - reference_proton);
        electrical_term +=
            F_KJ_PER_V * charge_gained * (potential_mv / 1000.0 - reference_potential_v);
        hydrogen_imbalance += hydrogen_gained;
        charge_imbalance += charge_gained;
    }

    Ok(TransportBreakdown {
        formation_sum_kj: formation_sum,
        proton_term_kj: proton_term,
        electrical_term_kj: electrical_term,
        total_kj: formation_sum + proton_term + electrical_term,
        reference_compartment: reference,
        hydrogen_imbalance,
        charge_imbalance,
        compartments: involved,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::Species;
    use crate::thermo::constants::R_KJ;
    use crate::thermo::legendre::tests::{adp, atp, phosphate, water};

    fn state(ph: f64, ionic_strength: f64, potential_mv: f64) -> CompartmentState {
        CompartmentState {
            conditions: Conditions::new(ph, ionic_strength, 298.15),
            potential_mv,
        }
    }

    fn transform(c: &CompartmentState) -> Transform {
        Transform::new(c.conditions).unwrap()
    }

    /// A participant made from species data, with nH and z of species `which`.
    fn from_species(
        coefficient: f64,
        compartment: usize,
        compartments: &[CompartmentState],
        species: &[Species],
        which: usize,
    ) -> Participant {
        Participant {
            coefficient,
            compartment,
            dfg_prime_kj: transform(&compartments[compartment])
                .reactant_dfg_prime(species)
                .unwrap(),
            hydrogens: f64::from(species[which].hydrogens),
            charge: f64::from(species[which].charge),
            is_proton: false,
        }
    }

    #[test]
    fn proton_import_gives_the_chemiosmotic_driving_force() {
        // ΔpH = 0.75 (inside alkaline), Δψ = −150 mV (inside negative), 298.15 K:
        // Δμ̃H+ = F·Δψ − RT·ln10·ΔpH ≈ −18.8 kJ/mol (Mitchell's chemiosmotic
        // relation; common practice). The given ΔfG'° of H+ is ignored.
        let compartments = [state(7.0, 0.15, 0.0), state(7.75, 0.15, -150.0)];
        let mut inward = Participant::proton(1.0, 1);
        inward.dfg_prime_kj = 123.0;
        let result =
            standard_reaction_energy(&compartments, &[Participant::proton(-1.0, 0), inward], None)
                .unwrap();
        assert_eq!(result.formation_sum_kj, 0.0);
        let rt_ln10 = R_KJ * 298.15 * std::f64::consts::LN_10;
        assert!((result.proton_term_kj - -0.75 * rt_ln10).abs() < 1e-9);
        assert!((result.proton_term_kj - -4.281).abs() < 1e-3);
        assert!((result.electrical_term_kj - -14.473).abs() < 1e-3);
        assert!(
            (result.total_kj - -18.754).abs() < 1e-3,
            "{}",
            result.total_kj
        );
        assert!(result.is_reference_independent());
    }

    #[test]
    fn uncharged_compound_between_equal_compartments_gives_zero() {
        // Moving a neutral compound between identical compartments does no work
        // (first principles). Glucose: single species, ΔfG° −915.9, nH 12
        // (Alberty 2003, p. 333).
        let glucose = [Species {
            dfg0_kj: -915.9,
            dfh0_kj: None,
            charge: 0,
            hydrogens: 12,
            magnesium: 0,
        }];
        let compartments = [state(7.2, 0.2, -80.0), state(7.2, 0.2, -80.0)];
        let participants = [
            from_species(-1.0, 0, &compartments, &glucose, 0),
            from_species(1.0, 1, &compartments, &glucose, 0),
        ];
        let result = standard_reaction_energy(&compartments, &participants, None).unwrap();
        assert_eq!(result.total_kj, 0.0);

        // Also at different pH, ionic strength and potential: a neutral single
        // species has the same standard chemical potential everywhere (its
        // ΔfG'° shift nH·RT·ln10·ΔpH is exactly undone by the H it carries).
        let compartments = [state(5.5, 0.05, 0.0), state(7.5, 0.25, -150.0)];
        let participants = [
            from_species(-1.0, 0, &compartments, &glucose, 0),
            from_species(1.0, 1, &compartments, &glucose, 0),
        ];
        let result = standard_reaction_energy(&compartments, &participants, None).unwrap();
        assert!(result.formation_sum_kj > 100.0);
        assert!(result.total_kj.abs() < 1e-9, "{}", result.total_kj);
    }

    #[test]
    fn transported_species_fraction_sets_the_energy_across_a_ph_gradient() {
        // ATP moved as ATP4− from pH 7 to pH 8 (equal I and ψ). At 1 M total in
        // each compartment only the ATP4− fraction r differs, so
        // ΔrG'° = RT·ln(r_in/r_out) (first principles: μ(ATP4−) = μ° + RT ln(r·c)).
        let compartments = [state(7.0, 0.25, 0.0), state(8.0, 0.25, 0.0)];
        let fraction = |c: &CompartmentState| transform(c).reactant(&atp()).unwrap().fractions[0];
        let expected =
            R_KJ * 298.15 * (fraction(&compartments[1]) / fraction(&compartments[0])).ln();
        let participants = [
            from_species(-1.0, 0, &compartments, &atp(), 0),
            from_species(1.0, 1, &compartments, &atp(), 0),
        ];
        let result = standard_reaction_energy(&compartments, &participants, None).unwrap();
        // ATP4− is more abundant at pH 8, so carrying it there costs work.
        assert!(expected > 0.5, "{expected}");
        assert!(
            (result.total_kj - expected).abs() < 1e-9,
            "{}",
            result.total_kj
        );
        // The plain transformed sum would miss the 12 H carried: it differs.
        assert!((result.formation_sum_kj - expected).abs() > 50.0);
    }

    #[test]
    fn charge_moved_into_a_negative_inside_costs_electrical_work() {
        // One negative charge into a compartment at −150 mV: +F·0.150 V
        // = +14.473 kJ/mol (F·Δψ per unit charge; CODATA 2018 F). The anion's
        // ΔfG'° and nH are invented for this test (they cancel).
        let compartments = [state(7.0, 0.1, 0.0), state(7.0, 0.1, -150.0)];
        let anion = |coefficient: f64, compartment: usize| Participant {
            coefficient,
            compartment,
            dfg_prime_kj: -500.0,
            hydrogens: 3.0,
            charge: -1.0,
            is_proton: false,
        };
        let result =
            standard_reaction_energy(&compartments, &[anion(-1.0, 0), anion(1.0, 1)], None)
                .unwrap();
        assert_eq!(result.proton_term_kj, 0.0);
        assert!((result.electrical_term_kj - F_KJ_PER_V * 0.150).abs() < 1e-12);
        assert!((result.total_kj - 14.473).abs() < 1e-3);
    }

    #[test]
    fn one_compartment_reaction_equals_the_plain_sum() {
        // ATP + H2O = ADP + Pi + H+ in one compartment: the explicit H+ and the
        // potential contribute nothing; exactly Σ ν·ΔfG'° (rule of the
        // transformed convention, Alberty 2003).
        let compartments = [state(6.0, 0.1, 0.0), state(7.3, 0.15, -160.0)];
        let c = 1;
        let participants = [
            from_species(-1.0, c, &compartments, &atp(), 0),
            from_species(-1.0, c, &compartments, &water(), 0),
            from_species(1.0, c, &compartments, &adp(), 0),
            from_species(1.0, c, &compartments, &phosphate(), 0),
            Participant::proton(1.0, c),
        ];
        let plain: f64 = participants
            .iter()
            .map(|p| p.coefficient * p.effective().0)
            .sum();
        let result = standard_reaction_energy(&compartments, &participants, None).unwrap();
        assert_eq!(result.total_kj, plain);
        assert_eq!(result.proton_term_kj, 0.0);
        assert_eq!(result.electrical_term_kj, 0.0);
        assert!(!result.spans_compartments());
        assert_eq!(result.compartments, vec![1]);
        // Without the H+ the equation is unbalanced, still the plain sum.
        let result = standard_reaction_energy(&compartments, &participants[..4], None).unwrap();
        assert_eq!(result.total_kj, plain);
        assert!((result.hydrogen_imbalance - -1.0).abs() < 1e-12);
        assert!(result.is_reference_independent());
    }

    #[test]
    fn balanced_symport_does_not_depend_on_the_reference() {
        // H+ + lactate⁻ symport (nH 5, z −1; common practice example): balanced
        // in H and charge, so any reference compartment gives the same ΔrG'°.
        // Conditions and ΔfG'° values invented for this test.
        let compartments = [state(6.5, 0.15, 30.0), state(7.4, 0.15, -120.0)];
        let lactate = |coefficient: f64, compartment: usize| Participant {
            coefficient,
            compartment,
            dfg_prime_kj: if compartment == 0 { -300.0 } else { -290.0 },
            hydrogens: 5.0,
            charge: -1.0,
            is_proton: false,
        };
        let participants = [
            Participant::proton(-1.0, 0),
            lactate(-1.0, 0),
            Participant::proton(1.0, 1),
            lactate(1.0, 1),
        ];
        let via_0 = standard_reaction_energy(&compartments, &participants, Some(0)).unwrap();
        let via_1 = standard_reaction_energy(&compartments, &participants, Some(1)).unwrap();
        assert!(via_0.is_reference_independent());
        assert!((via_0.total_kj - via_1.total_kj).abs() < 1e-9);
        // Neutral overall (H+ + A−): no electrical work; 6 H moved up the pH.
        assert!(via_0.electrical_term_kj.abs() < 1e-9);
        let rt_ln10 = R_KJ * 298.15 * std::f64::consts::LN_10;
        assert!((via_0.proton_term_kj - -6.0 * rt_ln10 * 0.9).abs() < 1e-9);
    }

    #[test]
    fn unbalanced_multi_compartment_reaction_is_flagged_and_uses_the_reference() {
        // A cytosolic reaction releasing one H that is not written, coupled to
        // an import: the imbalance goes to the compartment with the most
        // participants (here the cytosol, index 1), and the result depends on
        // that choice.
        let compartments = [state(6.0, 0.1, 0.0), state(7.5, 0.1, -100.0)];
        let p = |coefficient: f64, compartment: usize, hydrogens: f64, charge: f64| Participant {
            coefficient,
            compartment,
            dfg_prime_kj: 0.0,
            hydrogens,
            charge,
            is_proton: false,
        };
        let participants = [
            p(-1.0, 0, 4.0, 0.0),
            p(1.0, 1, 4.0, 0.0),
            p(-1.0, 1, 12.0, -4.0),
            p(1.0, 1, 11.0, -4.0),
        ];
        let default = standard_reaction_energy(&compartments, &participants, None).unwrap();
        assert_eq!(default.reference_compartment, 1);
        assert!(!default.is_reference_independent());
        assert!((default.hydrogen_imbalance - -1.0).abs() < 1e-12);
        // Reference in the cytosol: only the 4 imported H count (up 1.5 pH units).
        let rt_ln10 = R_KJ * 298.15 * std::f64::consts::LN_10;
        assert!((default.proton_term_kj - -4.0 * rt_ln10 * 1.5).abs() < 1e-9);
        let other = standard_reaction_energy(&compartments, &participants, Some(0)).unwrap();
        assert!((other.total_kj - default.total_kj).abs() > 1.0);
    }

    #[test]
    fn bad_input_gives_errors() {
        let compartments = [state(7.0, 0.1, 0.0)];
        assert_eq!(
            standard_reaction_energy(&compartments, &[], None),
            Err(TransportError::NoParticipants)
        );
        assert_eq!(
            standard_reaction_energy(&compartments, &[Participant::proton(1.0, 3)], None),
            Err(TransportError::UnknownCompartment {
                participant: 0,
                compartment: 3,
                count: 1
            })
        );
        assert_eq!(
            standard_reaction_energy(&compartments, &[Participant::proton(1.0, 0)], Some(2)),
            Err(TransportError::UnknownReference {
                compartment: 2,
                count: 1
            })
        );
        let mut nan = Participant::proton(1.0, 0);
        nan.coefficient = f64::NAN;
        assert!(matches!(
            standard_reaction_energy(&compartments, &[nan], None),
            Err(TransportError::NonFinite {
                quantity: "coefficient",
                ..
            })
        ));
        let bad = [state(7.0, -1.0, 0.0)];
        assert!(matches!(
            standard_reaction_energy(&bad, &[Participant::proton(1.0, 0)], None),
            Err(TransportError::Conditions { compartment: 0, .. })
        ));
    }
}
