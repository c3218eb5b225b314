//! Which reactions are boundary reactions (exchange, demand, sink, biomass)
//! and which are internal. SBML has no field for it, so the role is read
//! from the clues a model gives; the project can override it later.

use crate::model::{Compartment, Role};

/// What a reaction tells about its role.
#[derive(Debug, Clone, Copy)]
pub struct RoleClues<'a> {
    pub id: &'a str,
    pub name: &'a str,
    /// SBO term, e.g. `SBO:0000627`.
    pub sbo: Option<&'a str>,
    /// Signed coefficients of the participants left after boundary species
    /// were dropped, each with whether its compartment is extracellular.
    pub participants: &'a [(f64, bool)],
    /// Flux lower bound (a one-sided consumer that may run backwards is a
    /// sink, not a demand).
    pub lower_bound: f64,
    /// True when the reaction named a boundary species (`boundaryCondition`),
    /// i.e. it exchanges matter with the outside world.
    pub had_boundary_species: bool,
}

/// The role of a reaction, from the first rule that applies:
///
/// 1. SBO term: SBO:0000629 biomass, SBO:0000627 exchange, SBO:0000628
///    demand, SBO:0000632 sink.
/// 2. Id prefix, after an optional `R_`: `EX_` exchange, `DM_` demand,
///    `SK_` or `sink_` sink (BiGG naming, common practice).
/// 3. Id or name containing "biomass" (any case): biomass.
/// 4. A reaction that named a boundary species (it moves matter to or
///    from the outside world): exchange.
/// 5. One-sided (every participant on the same side, or none): exchange
///    when all participants are extracellular (or there are none);
///    otherwise demand when it only consumes and cannot run backwards;
///    otherwise sink.
/// 6. Otherwise internal.
pub fn infer_role(clues: &RoleClues) -> Role {
    match clues.sbo {
        Some("SBO:0000629") => return Role::Biomass,
        Some("SBO:0000627") => return Role::Exchange,
        Some("SBO:0000628") => return Role::Demand,
        Some("SBO:0000632") => return Role::Sink,
        _ => {}
    }
    let bare = clues.id.strip_prefix("R_").unwrap_or(clues.id);
    if bare.starts_with("EX_") {
        return Role::Exchange;
    }
    if bare.starts_with("DM_") {
        return Role::Demand;
    }
    if bare.starts_with("SK_") || bare.starts_with("sink_") {
        return Role::Sink;
    }
    if contains_biomass(clues.id) || contains_biomass(clues.name) {
        return Role::Biomass;
    }
    if clues.had_boundary_species {
        return Role::Exchange;
    }
    let consumes = clues.participants.iter().any(|(c, _)| *c < 0.0);
    let produces = clues.participants.iter().any(|(c, _)| *c > 0.0);
    if consumes && produces {
        return Role::Internal;
    }
    if clues.participants.iter().all(|(_, outside)| *outside) {
        Role::Exchange
    } else if consumes && clues.lower_bound >= 0.0 {
        Role::Demand
    } else {
        Role::Sink
    }
}

fn contains_biomass(text: &str) -> bool {
    text.to_ascii_lowercase().contains("biomass")
}

/// True for the compartment outside the cell: id `e`, `e0`, `ex`, `ext`,
/// `C_e` or `extracellular`, or a name containing "extracellular",
/// "extra-cellular", "external" or "boundary" (common practice in
/// constraint-based models).
pub fn is_extracellular(compartment: &Compartment) -> bool {
    let id = compartment.id.to_ascii_lowercase();
    if matches!(
        id.as_str(),
        "e" | "e0" | "ex" | "ext" | "c_e" | "extracellular"
    ) {
        return true;
    }
    let name = compartment.name.to_ascii_lowercase();
    ["extracellular", "extra-cellular", "external", "boundary"]
        .iter()
        .any(|word| name.contains(word))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn clues<'a>(id: &'a str, participants: &'a [(f64, bool)]) -> RoleClues<'a> {
        RoleClues {
            id,
            name: "",
            sbo: None,
            participants,
            lower_bound: 0.0,
            had_boundary_species: false,
        }
    }

    const TWO_SIDED: [(f64, bool); 2] = [(-1.0, false), (1.0, false)];

    #[test]
    fn sbo_terms_come_first() {
        // SBO:0000627 exchange, 0000628 demand, 0000629 biomass, 0000632 sink
        // (Systems Biology Ontology terms under "flux balance framework").
        let both = TWO_SIDED;
        for (sbo, role) in [
            ("SBO:0000627", Role::Exchange),
            ("SBO:0000628", Role::Demand),
            ("SBO:0000629", Role::Biomass),
            ("SBO:0000632", Role::Sink),
        ] {
            let c = RoleClues {
                sbo: Some(sbo),
                ..clues("R_EX_glc__D_e", &both)
            };
            assert_eq!(infer_role(&c), role, "{sbo}");
        }
        // A plain biochemical-reaction term leaves the decision to the shape.
        let c = RoleClues {
            sbo: Some("SBO:0000176"),
            ..clues("R_PGI", &both)
        };
        assert_eq!(infer_role(&c), Role::Internal);
    }

    #[test]
    fn id_prefixes() {
        let both = TWO_SIDED;
        assert_eq!(infer_role(&clues("R_EX_glc__D_e", &both)), Role::Exchange);
        assert_eq!(infer_role(&clues("EX_glc__D_e", &both)), Role::Exchange);
        assert_eq!(infer_role(&clues("R_DM_4crsol_c", &both)), Role::Demand);
        assert_eq!(infer_role(&clues("R_SK_dd2coa_c", &both)), Role::Sink);
        assert_eq!(infer_role(&clues("sink_x_c", &both)), Role::Sink);
        // Prefixes are case-sensitive: `R_Ex_` is not the BiGG exchange prefix.
        assert_eq!(infer_role(&clues("R_Ex_1", &both)), Role::Internal);
    }

    #[test]
    fn biomass_by_id_or_name() {
        let both = TWO_SIDED;
        assert_eq!(
            infer_role(&clues("R_BIOMASS_Ecoli_core_w_GAM", &both)),
            Role::Biomass
        );
        let c = RoleClues {
            name: "Generic Human Biomass Reaction",
            ..clues("R_X", &both)
        };
        assert_eq!(infer_role(&c), Role::Biomass);
    }

    #[test]
    fn one_sided_reactions() {
        // Only extracellular participants: exchange.
        assert_eq!(infer_role(&clues("R_a", &[(-1.0, true)])), Role::Exchange);
        // Consuming an internal metabolite, irreversible: demand.
        assert_eq!(infer_role(&clues("R_b", &[(-1.0, false)])), Role::Demand);
        // Consuming but allowed to run backwards: sink.
        let c = RoleClues {
            lower_bound: -1000.0,
            ..clues("R_c", &[(-1.0, false)])
        };
        assert_eq!(infer_role(&c), Role::Sink);
        // Producing an internal metabolite: sink.
        assert_eq!(infer_role(&clues("R_d", &[(1.0, false)])), Role::Sink);
        // Nothing left once boundary species are dropped: exchange.
        assert_eq!(infer_role(&clues("R_e", &[])), Role::Exchange);
    }

    #[test]
    fn boundary_species_make_an_exchange() {
        let c = RoleClues {
            had_boundary_species: true,
            ..clues("R_f", &TWO_SIDED)
        };
        assert_eq!(infer_role(&c), Role::Exchange);
        // Even when what is left would look like a sink (uptake into the cytosol).
        let c = RoleClues {
            had_boundary_species: true,
            ..clues("R_g", &[(1.0, false)])
        };
        assert_eq!(infer_role(&c), Role::Exchange);
        // But an explicit demand prefix still wins.
        let c = RoleClues {
            had_boundary_species: true,
            ..clues("R_DM_g", &[(-1.0, false)])
        };
        assert_eq!(infer_role(&c), Role::Demand);
        assert_eq!(infer_role(&clues("R_f", &TWO_SIDED)), Role::Internal);
    }

    #[test]
    fn extracellular_compartments() {
        let compartment = |id: &str, name: &str| Compartment {
            id: id.into(),
            name: name.into(),
            ph: 7.0,
            ionic_strength_m: 0.25,
            potential_mv: 0.0,
            temperature_k: None,
            pmg: None,
        };
        assert!(is_extracellular(&compartment("e", "")));
        assert!(is_extracellular(&compartment("C_e", "")));
        assert!(is_extracellular(&compartment("x1", "Extracellular space")));
        assert!(!is_extracellular(&compartment("c", "cytosol")));
        assert!(!is_extracellular(&compartment("p", "periplasm")));
    }
}
