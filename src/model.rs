//! The validated, typed model every later stage works on.
//!
//! Quantities are stored in fixed internal units so no later code has to
//! think about units again: energies in kJ/mol, concentrations in mol/L,
//! temperatures in kelvin, electrical potentials in millivolts, ionic strength
//! in mol/L. Cross references between entities are indices, resolved by the
//! loader, so a `Model` cannot name a metabolite that does not exist.

use std::collections::BTreeMap;

/// Flux bound used when an equation arrow implies a direction and no bound is
/// given (common practice in constraint-based models: ±1000 flux units).
pub const DEFAULT_FLUX_BOUND: f64 = 1000.0;

#[derive(Debug, Clone, PartialEq)]
pub struct Model {
    pub id: String,
    pub title: String,
    /// Default temperature of every compartment, in K.
    pub temperature_k: f64,
    pub compartments: Vec<Compartment>,
    pub metabolites: Vec<Metabolite>,
    pub reactions: Vec<Reaction>,
    pub scenarios: Vec<Scenario>,
    /// Reaction ids with their objective coefficients (from SBML fbc), if any.
    pub objective: Vec<(usize, f64)>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Compartment {
    pub id: String,
    pub name: String,
    pub ph: f64,
    /// Ionic strength, mol/L.
    pub ionic_strength_m: f64,
    /// Electrical potential relative to the model's reference, mV.
    pub potential_mv: f64,
    /// Temperature override, K; `None` means the model default.
    pub temperature_k: Option<f64>,
    /// −log10 of free Mg2+, when species data include Mg-bound species.
    pub pmg: Option<f64>,
}

/// A value with its standard uncertainty and where it came from.
#[derive(Debug, Clone, PartialEq)]
pub struct Energy {
    /// kJ/mol.
    pub value_kj: f64,
    /// Standard uncertainty (one σ), kJ/mol.
    pub sigma_kj: f64,
    /// Free text: citation, database, or "estimate".
    pub source: String,
    /// Conditions the value was stated at, when the data say so (a ΔfG'°
    /// copied from elsewhere); `None` means "at the compartment's
    /// conditions". Unset parts mean "the compartment's".
    pub at: Option<StatedConditions>,
}

/// Conditions a transformed value holds at (internal units).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StatedConditions {
    pub ph: Option<f64>,
    /// mol/L.
    pub ionic_strength_m: Option<f64>,
    /// K.
    pub temperature_k: Option<f64>,
}

/// One chemical species of a reactant (Alberty's species-level data), at I = 0.
#[derive(Debug, Clone, PartialEq)]
pub struct Species {
    /// ΔfG° at 298.15 K and I = 0, kJ/mol.
    pub dfg0_kj: f64,
    /// ΔfH° at 298.15 K and I = 0, kJ/mol, needed only away from 298.15 K.
    pub dfh0_kj: Option<f64>,
    pub charge: i32,
    pub hydrogens: u32,
    /// Number of Mg atoms bound (for pMg dependence), usually 0.
    pub magnesium: u32,
}

/// How a metabolite is treated in the mass-action ratio.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Special {
    #[default]
    None,
    /// H+: fixed by the compartment pH, left out of Q.
    Proton,
    /// Water: activity 1, left out of Q.
    Water,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Metabolite {
    pub id: String,
    pub name: String,
    /// Index into `Model::compartments`.
    pub compartment: usize,
    pub formula: Option<String>,
    pub charge: Option<i32>,
    /// ΔfG'° given directly, at the compartment's conditions.
    pub dfg_prime: Option<Energy>,
    /// Species-level data (alternative to `dfg_prime`), with σ and source.
    pub species: Option<SpeciesData>,
    /// Explicit key into the built-in library.
    pub library: Option<String>,
    /// Allowed concentration range, mol/L; `None` means the project default.
    pub concentration: Option<Range>,
    /// Measured concentration, mol/L.
    pub measured_m: Option<f64>,
    pub special: Special,
    /// Cross references: namespace (e.g. "chebi", "kegg.compound") → ids.
    pub xrefs: BTreeMap<String, Vec<String>>,
    pub sbo: Option<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesData {
    pub species: Vec<Species>,
    pub sigma_kj: f64,
    pub source: String,
}

/// A closed interval.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Range {
    pub min: f64,
    pub max: f64,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
pub enum Role {
    #[default]
    Internal,
    Exchange,
    Demand,
    Sink,
    Biomass,
}

impl Role {
    pub fn slug(self) -> &'static str {
        match self {
            Role::Internal => "internal",
            Role::Exchange => "exchange",
            Role::Demand => "demand",
            Role::Sink => "sink",
            Role::Biomass => "biomass",
        }
    }

    pub fn from_slug(s: &str) -> Option<Role> {
        Some(match s {
            "internal" => Role::Internal,
            "exchange" => Role::Exchange,
            "demand" => Role::Demand,
            "sink" => Role::Sink,
            "biomass" => Role::Biomass,
            _ => return None,
        })
    }

    /// Boundary reactions are shut when the network is closed.
    pub fn is_boundary(self) -> bool {
        self != Role::Internal
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Reaction {
    pub id: String,
    pub name: String,
    /// (metabolite index, signed coefficient): negative = consumed.
    /// Sorted by metabolite index, no duplicates, no zeros.
    pub stoichiometry: Vec<(usize, f64)>,
    pub lower_bound: f64,
    pub upper_bound: f64,
    /// ΔrG'° given for the reaction, overriding the formation-energy sum.
    pub drg_prime: Option<Energy>,
    pub group: Option<String>,
    pub role: Role,
    pub sbo: Option<String>,
    /// Cross references: namespace (e.g. "kegg.reaction", "ec-code") → ids.
    pub xrefs: BTreeMap<String, Vec<String>>,
}

impl Reaction {
    /// Reversible means the bounds allow both directions (derived, never
    /// stored, so it cannot disagree with the bounds).
    pub fn is_reversible(&self) -> bool {
        self.allows_forward() && self.allows_backward()
    }
    pub fn allows_forward(&self) -> bool {
        self.upper_bound > 0.0
    }
    pub fn allows_backward(&self) -> bool {
        self.lower_bound < 0.0
    }
}

/// A named flux vector (observed or predicted fluxes).
#[derive(Debug, Clone, PartialEq)]
pub struct Scenario {
    pub id: String,
    pub description: String,
    /// (reaction index, flux), sorted by reaction index; zero fluxes dropped.
    pub fluxes: Vec<(usize, f64)>,
}

impl Model {
    pub fn metabolite_index(&self, id: &str) -> Option<usize> {
        self.metabolites.iter().position(|m| m.id == id)
    }
    pub fn reaction_index(&self, id: &str) -> Option<usize> {
        self.reactions.iter().position(|r| r.id == id)
    }
    /// Temperature of a compartment, K.
    pub fn compartment_temperature(&self, compartment: usize) -> f64 {
        self.compartments[compartment]
            .temperature_k
            .unwrap_or(self.temperature_k)
    }
}
