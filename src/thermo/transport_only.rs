//! ΔrG'° of a pure transport step without any formation energy.
//!
//! A reaction that only moves compounds between compartments (every
//! participant pairs with the same compound on the other side, H⁺ and water
//! included) needs no ΔfG'° at all: each compound's ΔfG° cancels, and what is
//! left depends only on the compartments' pH, ionic strength and electrical
//! potential. Without species data we treat each compound as the one species
//! its formula and charge describe — the single-species approximation Jol et
//! al. describe for compounds without species data (Biophys. J. 99 (2010)
//! 3139–3144). For a compound moved from A to B:
//!
//! ```text
//! ΔfG'°_B − ΔfG'°_A = nH·RT·ln10·(pH_B − pH_A) − (z² − nH)·Δ[RTα·√I/(1 + 1.6·√I)]
//! ```
//!
//! (`Transform::single_species_shift`); the proton and electrical terms of
//! `thermo::transport` are then added as for any reaction spanning
//! compartments. For one compound moved alone the pH parts cancel and
//! ΔrG'° = −z²·Δ[RTα·√I/(1 + 1.6·√I)] + z·F·Δψ.
//!
//! # Uncertainty (our choice, stated in the README)
//!
//! The approximation is exact when the formula's species dominates in both
//! compartments. It errs when a pKa lies between the two pH values: then the
//! compound's mean H binding changes across the step, by at most about one
//! H⁺ for one pKa, and its ΔfG'° difference is off by at most RT·ln10·|ΔpH|
//! (nothing for a compound without H atoms, or water).
//! Likewise the charge of the dominant species may differ from the formula's
//! by one, changing z² by up to 2|z| + 1 in the Debye–Hückel term. We take the
//! error of each moved compound as uniform within ±(RT·ln10·|ΔpH| +
//! (2|z| + 1)·|Δ(RTα·√I/(1 + 1.6·√I))|) times its coefficient, i.e. σ =
//! half-width/√3 (rectangular distribution, JCGM 100:2008 §4.3.7), and
//! combine compounds as independent. A step between compartments of equal pH
//! and I gets σ = 0: the approximation is then exact.

use super::legendre::{debye_huckel_factor, rt_alpha, Conditions, Transform};
use super::transport::{self, CompartmentState, Participant, TransportBreakdown};
use crate::model::{Metabolite, Model, Special};

/// Source of every such value (report.json and the reaction page); it
/// starts with the name the report gives the approximation.
pub const SOURCE: &str = "transport, single-species approximation (Jol et al., Biophys. J. 99 (2010) 3139): from the compartments' pH, ionic strength and potential alone";

/// Coefficient sums below this count as zero (compound fully moved).
const BALANCE_TOLERANCE: f64 = 1e-9;

/// ΔrG'° of a pure transport step.
#[derive(Debug, Clone, PartialEq)]
pub struct TransportEstimate {
    pub value_kj: f64,
    pub sigma_kj: f64,
    pub breakdown: TransportBreakdown,
    /// Compounds moved (one metabolite id per compound, the first written).
    pub moved: Vec<String>,
}

/// Why a reaction is not covered by the rule (for the reaction page).
#[derive(Debug, Clone, PartialEq)]
pub enum NotCovered {
    /// All participants sit in one compartment, or chemistry happens.
    NotPureTransport,
    /// A pure transport, but something needed is missing.
    Problem(String),
}

/// ΔrG'° of reaction `j` by the single-species rule, when it only moves
/// compounds between compartments.
pub fn estimate(model: &Model, j: usize) -> Result<TransportEstimate, NotCovered> {
    let reaction = &model.reactions[j];
    let parts: Vec<(usize, f64)> = reaction.stoichiometry.clone();
    let compartment_of = |i: usize| model.metabolites[i].compartment;
    let first = parts.first().map(|&(i, _)| compartment_of(i));
    if parts.iter().all(|&(i, _)| Some(compartment_of(i)) == first) {
        return Err(NotCovered::NotPureTransport);
    }
    // Compounds other than H⁺ (fixed by pH, handled by the transport terms).
    let movable: Vec<(usize, f64)> = parts
        .iter()
        .copied()
        .filter(|&(i, _)| model.metabolites[i].special != Special::Proton)
        .collect();
    let identities: Vec<Option<Identity>> = movable
        .iter()
        .map(|&(i, _)| Identity::of(model, &model.metabolites[i]))
        .collect();
    let groups = group_same_compounds(&movable, &identities, model);
    for group in &groups {
        let net: f64 = group.iter().map(|&k| movable[k].1).sum();
        if group.len() < 2 || net.abs() > BALANCE_TOLERANCE {
            return Err(NotCovered::NotPureTransport);
        }
    }
    // Every member is paired; now every member needs H count and charge.
    for (k, identity) in identities.iter().enumerate() {
        if identity.is_none() {
            let m = &model.metabolites[movable[k].0];
            return Err(NotCovered::Problem(format!(
                "`{}` needs an exact formula and a charge for the single-species transport rule",
                m.id
            )));
        }
    }
    let temperature = |c: usize| model.compartment_temperature(c);
    let t0 = temperature(compartment_of(parts[0].0));
    if parts
        .iter()
        .any(|&(i, _)| (temperature(compartment_of(i)) - t0).abs() > 1e-6)
    {
        return Err(NotCovered::Problem(
            "the compartments differ in temperature; a lone ΔfG'° cannot be moved across temperatures without ΔfH°".into(),
        ));
    }
    let conditions: Vec<Conditions> = model
        .compartments
        .iter()
        .map(|c| Conditions::of_compartment(c, model.temperature_k))
        .collect();
    let transforms: Vec<Transform> = conditions
        .iter()
        .enumerate()
        .map(|(c, cond)| {
            Transform::new(*cond).map_err(|e| {
                NotCovered::Problem(format!("compartment `{}`: {e}", model.compartments[c].id))
            })
        })
        .collect::<Result<_, _>>()?;
    let ionic = |c: usize| rt_alpha(t0) * debye_huckel_factor(conditions[c].ionic_strength_m);

    let mut participants = Vec::with_capacity(parts.len());
    let mut variance = 0.0;
    let mut moved = Vec::new();
    for group in &groups {
        let (base_index, _) = movable[group[0]];
        let base = compartment_of(base_index);
        moved.push(model.metabolites[base_index].id.clone());
        for &k in group {
            let (i, coefficient) = movable[k];
            let identity = identities[k].as_ref().expect("checked above");
            let c = compartment_of(i);
            let shift = transforms[c]
                .single_species_shift(&transforms[base], identity.hydrogens, identity.charge)
                .ok_or_else(|| {
                    NotCovered::Problem("the compartments differ in temperature".into())
                })?;
            // No acid–base step to miss without H atoms, or for water.
            let can_shift_protons =
                identity.hydrogens > 0.0 && model.metabolites[i].special != Special::Water;
            let ph_part = if can_shift_protons {
                transforms[c].rt()
                    * std::f64::consts::LN_10
                    * (conditions[c].ph - conditions[base].ph).abs()
            } else {
                0.0
            };
            let half_width =
                ph_part + (2.0 * identity.charge.abs() + 1.0) * (ionic(c) - ionic(base)).abs();
            variance += (coefficient * half_width / 3f64.sqrt()).powi(2);
            participants.push(Participant {
                coefficient,
                compartment: c,
                // Relative to the compound in the base compartment: the
                // common ΔfG° cancels because the group's coefficients sum to 0.
                dfg_prime_kj: shift,
                hydrogens: identity.hydrogens,
                charge: identity.charge,
                is_proton: false,
            });
        }
    }
    for &(i, coefficient) in &parts {
        if model.metabolites[i].special == Special::Proton {
            participants.push(Participant::proton(coefficient, compartment_of(i)));
        }
    }
    let states: Vec<CompartmentState> = model
        .compartments
        .iter()
        .map(|c| CompartmentState::of_compartment(c, model.temperature_k))
        .collect();
    let breakdown = transport::standard_reaction_energy(&states, &participants, None)
        .map_err(|e| NotCovered::Problem(format!("transport terms cannot be computed: {e}")))?;
    Ok(TransportEstimate {
        value_kj: breakdown.total_kj,
        sigma_kj: variance.sqrt(),
        breakdown,
        moved,
    })
}

/// What makes two metabolites in different compartments the same compound.
#[derive(Debug, Clone, PartialEq)]
struct Identity {
    formula: crate::chem::Formula,
    hydrogens: f64,
    charge: f64,
    stem: String,
    xrefs: Vec<(String, String)>,
}

impl Identity {
    /// `None` without an exact formula and a charge (nothing to count).
    fn of(model: &Model, m: &Metabolite) -> Option<Identity> {
        let formula = crate::chem::parse_formula(m.formula.as_deref()?).ok()?;
        if !formula.is_exact() {
            return None;
        }
        let charge = m.charge?;
        let mut xrefs: Vec<(String, String)> = m
            .xrefs
            .iter()
            .filter(|(ns, _)| !NOT_IDENTITY.contains(&ns.as_str()))
            .flat_map(|(ns, ids)| ids.iter().map(move |id| (ns.clone(), id.clone())))
            .collect();
        xrefs.sort();
        Some(Identity {
            hydrogens: formula.count("H") as f64,
            formula,
            charge: f64::from(charge),
            stem: id_stem(&m.id, &model.compartments[m.compartment].id).to_string(),
            xrefs,
        })
    }

    fn same_compound(&self, other: &Identity) -> bool {
        self.formula == other.formula
            && self.charge == other.charge
            && (self.stem == other.stem || self.xrefs.iter().any(|x| other.xrefs.contains(x)))
    }
}

/// Cross-reference namespaces that name classes or processes, not compounds.
const NOT_IDENTITY: &[&str] = &["sbo", "go", "ec-code", "pubmed", "taxonomy"];

/// The id without its compartment suffix: `atp_c` → `atp`, `atp[c]` → `atp`,
/// `M_atp_c` → `M_atp`.
pub fn id_stem<'a>(id: &'a str, compartment: &str) -> &'a str {
    for (open, close) in [("_", ""), ("[", "]"), ("(", ")")] {
        let suffix = format!("{open}{compartment}{close}");
        if let Some(stem) = id.strip_suffix(suffix.as_str()) {
            if !stem.is_empty() {
                return stem;
            }
        }
    }
    id
}

/// Participants grouped into compounds (indices into `movable`), each
/// group in stoichiometry order. A participant without identity forms its
/// own group, which then fails the pairing test.
fn group_same_compounds(
    movable: &[(usize, f64)],
    identities: &[Option<Identity>],
    model: &Model,
) -> Vec<Vec<usize>> {
    let mut group_of: Vec<usize> = (0..movable.len()).collect();
    for a in 0..movable.len() {
        for b in 0..a {
            let (Some(x), Some(y)) = (&identities[a], &identities[b]) else {
                continue;
            };
            let ca = model.metabolites[movable[a].0].compartment;
            let cb = model.metabolites[movable[b].0].compartment;
            if ca != cb && x.same_compound(y) && group_of[a] == a {
                group_of[a] = group_of[b];
            }
        }
    }
    let mut groups: Vec<Vec<usize>> = Vec::new();
    let mut index_of_root: std::collections::BTreeMap<usize, usize> = Default::default();
    for (k, &root) in group_of.iter().enumerate() {
        let g = *index_of_root.entry(root).or_insert_with(|| {
            groups.push(Vec::new());
            groups.len() - 1
        });
        groups[g].push(k);
    }
    groups
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::thermo::constants::{F_KJ_PER_V, R_KJ};

    fn compartment(id: &str, ph: f64, ionic: f64, potential_mv: f64) -> crate::model::Compartment {
        crate::model::Compartment {
            id: id.into(),
            name: id.into(),
            ph,
            ionic_strength_m: ionic,
            potential_mv,
            temperature_k: None,
            pmg: None,
        }
    }

    fn metabolite(id: &str, compartment: usize, formula: &str, charge: i32) -> Metabolite {
        let special = match formula {
            "H" if charge == 1 => Special::Proton,
            "H2O" => Special::Water,
            _ => Special::None,
        };
        Metabolite {
            id: id.into(),
            name: id.into(),
            compartment,
            formula: Some(formula.into()),
            charge: Some(charge),
            dfg_prime: None,
            species: None,
            library: None,
            concentration: None,
            measured_m: None,
            special,
            xrefs: Default::default(),
            sbo: None,
        }
    }

    fn reaction(id: &str, stoichiometry: Vec<(usize, f64)>) -> crate::model::Reaction {
        let mut stoichiometry = stoichiometry;
        stoichiometry.sort_by_key(|&(i, _)| i);
        crate::model::Reaction {
            id: id.into(),
            name: id.into(),
            stoichiometry,
            lower_bound: -1000.0,
            upper_bound: 1000.0,
            drg_prime: None,
            group: None,
            role: crate::model::Role::Internal,
            sbo: None,
            xrefs: Default::default(),
        }
    }

    /// Two compartments at 298.15 K: outside pH 7.0, I = 0.25 M, 0 mV;
    /// inside pH 7.6, I = 0.15 M, −150 mV.
    fn model(reactions: Vec<crate::model::Reaction>) -> Model {
        Model {
            id: "t".into(),
            title: "t".into(),
            temperature_k: 298.15,
            compartments: vec![
                compartment("e", 7.0, 0.25, 0.0),
                compartment("c", 7.6, 0.15, -150.0),
            ],
            metabolites: vec![
                metabolite("lac_e", 0, "C3H5O3", -1), // 0
                metabolite("lac_c", 1, "C3H5O3", -1), // 1
                metabolite("h_e", 0, "H", 1),         // 2
                metabolite("h_c", 1, "H", 1),         // 3
                metabolite("na1_e", 0, "Na", 1),      // 4
                metabolite("na1_c", 1, "Na", 1),      // 5
                metabolite("glc_e", 0, "C6H12O6", 0), // 6
                metabolite("glc_c", 1, "C6H12O6", 0), // 7
                metabolite("pyr_c", 1, "C3H3O3", -1), // 8
            ],
            reactions,
            scenarios: Vec::new(),
            objective: Vec::new(),
        }
    }

    /// Debye–Hückel term per z² at I (kJ/mol), RTα = 2.91482 kJ/mol at
    /// 298.15 K (Alberty 2003, Table 3.1 / p. 49), B = 1.6.
    fn dh(i: f64) -> f64 {
        2.91482 * i.sqrt() / (1.0 + 1.6 * i.sqrt())
    }

    /// Lactate–H⁺ symport, lac⁻(e) + H⁺(e) → lac⁻(c) + H⁺(c).
    ///
    /// Hand calculation (Jol et al., Biophys. J. 99 (2010) 3139, the
    /// single-species approximation; RT = 2.47896 kJ/mol at 298.15 K with the
    /// CODATA 2018 R, RT·ln10·0.6 = 3.42481, F·0.150 V = 14.47280 kJ/mol,
    /// DH(0.15) = 0.69699, DH(0.25) = 0.80967, ΔDH = −0.11268 kJ/mol):
    /// lactate C3H5O3⁻ has nH = 5, z = −1.
    /// * lactate: ΔfG'° shift = 5·3.42481 − (1 − 5)·(−0.11268) = 16.67331;
    ///   proton term of its 5 H: 5·(μH,c − μH,e) = 5·(−3.42481 + 0.11268)
    ///   = −16.56064; electrical: −1·F·(−0.150 V) = +14.47280.
    /// * H⁺: proton term −3.42481 + 0.11268 = −3.31213; electrical
    ///   +1·F·(−0.150 V) = −14.47280.
    ///
    /// Sum: 16.67331 − 16.56064 + 14.47280 − 3.31213 − 14.47280 = −3.19945
    /// kJ/mol (the lactate's own part reduces to −z²·ΔDH = +0.11268; the H⁺
    /// moved into the alkaline inside brings −3.31213; the charges cancel).
    #[test]
    fn lactate_proton_symport_matches_hand_calculation() {
        let m = model(vec![reaction(
            "LACt",
            vec![(0, -1.0), (2, -1.0), (1, 1.0), (3, 1.0)],
        )]);
        let e = estimate(&m, 0).expect("pure transport");
        let rt = R_KJ * 298.15;
        let ddh = dh(0.15) - dh(0.25);
        let hand = -ddh // lactate: −z²·ΔDH with z = −1
            + (-rt * std::f64::consts::LN_10 * 0.6 - ddh); // H⁺ into the alkaline side
        assert!((e.value_kj - hand).abs() < 1e-3, "{} vs {hand}", e.value_kj);
        assert!((e.value_kj - (-3.19945)).abs() < 2e-4, "{}", e.value_kj);
        // Charge moved cancels: lactate⁻ and H⁺ cross together.
        assert!(e.breakdown.is_reference_independent());
        // σ: lactate's half-width RT·ln10·0.6 + 3·|ΔDH| over √3; H⁺ is exact.
        let sigma = (rt * std::f64::consts::LN_10 * 0.6 + 3.0 * ddh.abs()) / 3f64.sqrt();
        assert!((e.sigma_kj - sigma).abs() < 1e-9, "{}", e.sigma_kj);
        assert_eq!(e.moved, vec!["lac_e".to_string()]);
    }

    /// Na⁺/H⁺ antiport, 1 Na⁺(c) + 1 H⁺(e) → 1 Na⁺(e) + 1 H⁺(c).
    ///
    /// Hand calculation (same constants): Na⁺ (nH = 0, z = +1) moved c → e:
    /// −z²·(DH(0.25) − DH(0.15)) + F·(0 − (−0.150 V)) = −0.11268 + 14.47280;
    /// H⁺ moved e → c: −RT·ln10·0.6 − (DH(0.15) − DH(0.25)) + F·(−0.150 V)
    /// = −3.42481 + 0.11268 − 14.47280. Sum −3.42481 kJ/mol: the electrical
    /// terms cancel (one charge each way), and the Debye–Hückel parts too;
    /// only the pH difference drives the exchange.
    #[test]
    fn sodium_proton_antiport_matches_hand_calculation() {
        let m = model(vec![reaction(
            "NAt",
            vec![(5, -1.0), (2, -1.0), (4, 1.0), (3, 1.0)],
        )]);
        let e = estimate(&m, 0).expect("pure transport");
        let rt = R_KJ * 298.15;
        let hand = -rt * std::f64::consts::LN_10 * 0.6;
        assert!((e.value_kj - hand).abs() < 1e-9, "{} vs {hand}", e.value_kj);
        assert!((e.value_kj - (-3.42481)).abs() < 1e-4);
        assert!(e.breakdown.electrical_term_kj.abs() < 1e-9);
        // Na⁺ has no H: its half-width is 3·|ΔDH| (2|z| + 1 = 3), no pH part.
        let sigma = 3.0 * (dh(0.15) - dh(0.25)).abs() / 3f64.sqrt();
        assert!((e.sigma_kj - sigma).abs() < 1e-9);
    }

    /// Two Na⁺ with one glucose (electrogenic symport): 2 Na⁺(e) + glc(e) →
    /// 2 Na⁺(c) + glc(c). Glucose (z = 0, nH = 12): its shift 12·3.42481 +
    /// 12·ΔDH cancels its proton term 12·(−3.42481 − ΔDH), so it contributes
    /// 0; each Na⁺: −ΔDH + F·(−0.150 V) = 0.11268 − 14.47280. Sum
    /// 2·(−14.36012) = −28.72024 kJ/mol.
    #[test]
    fn electrogenic_symport_counts_each_charge() {
        let m = model(vec![reaction(
            "GLCNAt",
            vec![(4, -2.0), (6, -1.0), (5, 2.0), (7, 1.0)],
        )]);
        let e = estimate(&m, 0).expect("pure transport");
        let hand = 2.0 * (-(dh(0.15) - dh(0.25)) + F_KJ_PER_V * -0.150);
        assert!((e.value_kj - hand).abs() < 1e-6, "{} vs {hand}", e.value_kj);
        assert!((e.value_kj - (-28.72024)).abs() < 1e-4, "{}", e.value_kj);
    }

    #[test]
    fn chemistry_or_one_compartment_is_not_covered() {
        let m = model(vec![
            // lactate → pyruvate across: not the same compound.
            reaction("X", vec![(0, -1.0), (8, 1.0)]),
            // one compartment only.
            reaction("Y", vec![(1, -1.0), (8, 1.0)]),
            // lactate moved, but only half of it arrives.
            reaction("Z", vec![(0, -2.0), (1, 1.0)]),
        ]);
        for j in 0..3 {
            assert_eq!(estimate(&m, j), Err(NotCovered::NotPureTransport), "{j}");
        }
    }

    #[test]
    fn pairs_by_cross_reference_when_ids_differ() {
        let mut m = model(vec![reaction("T", vec![(0, -1.0), (1, 1.0)])]);
        m.metabolites[0].id = "lactate_out".into();
        m.metabolites[1].id = "L-lac_in".into();
        assert_eq!(estimate(&m, 0), Err(NotCovered::NotPureTransport));
        for i in [0, 1] {
            m.metabolites[i]
                .xrefs
                .insert("chebi".into(), vec!["CHEBI:16651".into()]);
        }
        assert!(estimate(&m, 0).is_ok());
    }

    #[test]
    fn stems_strip_the_compartment_suffix() {
        assert_eq!(id_stem("atp_c", "c"), "atp");
        assert_eq!(id_stem("M_atp_c", "c"), "M_atp");
        assert_eq!(id_stem("atp[m]", "m"), "atp");
        assert_eq!(id_stem("atp", "c"), "atp");
        assert_eq!(id_stem("_c", "c"), "_c");
    }
}
