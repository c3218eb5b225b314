//! The closed network: boundary reactions shut, every bound made to include
//! zero, each reaction reduced to the flux directions its bounds allow.

use crate::model::Model;
use serde::Serialize;

/// Flux directions of one reaction (relative to its equation as written).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
pub struct Directions {
    pub forward: bool,
    pub backward: bool,
}

impl Directions {
    pub const NONE: Directions = Directions {
        forward: false,
        backward: false,
    };
    pub const BOTH: Directions = Directions {
        forward: true,
        backward: true,
    };
    pub const FORWARD: Directions = Directions {
        forward: true,
        backward: false,
    };
    pub const BACKWARD: Directions = Directions {
        forward: false,
        backward: true,
    };

    pub fn any(self) -> bool {
        self.forward || self.backward
    }

    pub fn both(self) -> bool {
        self.forward && self.backward
    }

    /// Whether flux of this sign (+1 forward, −1 backward) is allowed.
    pub fn allows(self, sign: f64) -> bool {
        if sign > 0.0 {
            self.forward
        } else if sign < 0.0 {
            self.backward
        } else {
            true
        }
    }

    pub fn intersect(self, other: Directions) -> Directions {
        Directions {
            forward: self.forward && other.forward,
            backward: self.backward && other.backward,
        }
    }
}

/// A bound that forced flux through a reaction, relaxed to include zero so
/// that the closed network admits the zero flux.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RelaxedBound {
    pub reaction: String,
    pub lower_bound: f64,
    pub upper_bound: f64,
    pub relaxed_lower_bound: f64,
    pub relaxed_upper_bound: f64,
}

/// Stoichiometry as columns plus the allowed directions; only the signs of
/// the bounds matter for loop capability (see `tolerance`).
#[derive(Debug, Clone, PartialEq)]
pub struct ClosedNetwork {
    pub metabolite_count: usize,
    /// Per reaction (model order): (metabolite index, coefficient).
    pub columns: Vec<Vec<(usize, f64)>>,
    /// Per reaction: directions allowed in the closed network.
    pub allowed: Vec<Directions>,
}

/// What closing the network did.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Closure {
    /// Boundary reactions (exchange, demand, sink, biomass) shut.
    pub shut_reactions: Vec<String>,
    /// Bounds with lower > 0 or upper < 0, relaxed to include zero.
    pub relaxed_bounds: Vec<RelaxedBound>,
}

impl ClosedNetwork {
    /// Closes `model`: boundary reactions get no direction, forcing bounds
    /// are relaxed to include zero.
    pub fn close(model: &Model) -> (ClosedNetwork, Closure) {
        let mut allowed = Vec::with_capacity(model.reactions.len());
        let mut shut_reactions = Vec::new();
        let mut relaxed_bounds = Vec::new();
        for reaction in &model.reactions {
            if reaction.role.is_boundary() {
                shut_reactions.push(reaction.id.clone());
                allowed.push(Directions::NONE);
                continue;
            }
            let (lower, upper) = (reaction.lower_bound, reaction.upper_bound);
            if lower > 0.0 || upper < 0.0 {
                relaxed_bounds.push(RelaxedBound {
                    reaction: reaction.id.clone(),
                    lower_bound: lower,
                    upper_bound: upper,
                    relaxed_lower_bound: lower.min(0.0),
                    relaxed_upper_bound: upper.max(0.0),
                });
            }
            allowed.push(Directions {
                forward: upper > 0.0,
                backward: lower < 0.0,
            });
        }
        let network = ClosedNetwork {
            metabolite_count: model.metabolites.len(),
            columns: model
                .reactions
                .iter()
                .map(|r| {
                    r.stoichiometry
                        .iter()
                        .copied()
                        .filter(|(_, c)| *c != 0.0 && c.is_finite())
                        .collect()
                })
                .collect(),
            allowed,
        };
        (
            network,
            Closure {
                shut_reactions,
                relaxed_bounds,
            },
        )
    }

    /// Adds a reaction (e.g. a test dissipation reaction); returns its index.
    pub fn add_reaction(&mut self, column: Vec<(usize, f64)>, allowed: Directions) -> usize {
        self.columns.push(column);
        self.allowed.push(allowed);
        self.columns.len() - 1
    }
}
