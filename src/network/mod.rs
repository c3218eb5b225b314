//! The model as a network, built once and shared by every check: a petgraph
//! bipartite graph of metabolites and reactions whose edges follow the flux
//! directions the bounds allow, and the sparse stoichiometric matrix S
//! (metabolites × reactions) stored both by column and by row.

use crate::model::Model;
use petgraph::graph::{DiGraph, NodeIndex};

/// A node of the metabolite–reaction graph.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Node {
    Metabolite(usize),
    Reaction(usize),
}

/// Sparse stoichiometric matrix.
#[derive(Debug, Clone, PartialEq)]
pub struct Stoichiometry {
    pub metabolites: usize,
    pub reactions: usize,
    /// Column j: (metabolite, coefficient) of reaction j, sorted by metabolite.
    pub columns: Vec<Vec<(usize, f64)>>,
    /// Row i: (reaction, coefficient) of metabolite i, sorted by reaction.
    pub rows: Vec<Vec<(usize, f64)>>,
}

impl Stoichiometry {
    pub fn from_model(model: &Model) -> Stoichiometry {
        let columns: Vec<Vec<(usize, f64)>> = model
            .reactions
            .iter()
            .map(|r| r.stoichiometry.clone())
            .collect();
        let mut rows = vec![Vec::new(); model.metabolites.len()];
        for (j, column) in columns.iter().enumerate() {
            for &(i, c) in column {
                rows[i].push((j, c));
            }
        }
        Stoichiometry {
            metabolites: model.metabolites.len(),
            reactions: model.reactions.len(),
            columns,
            rows,
        }
    }

    /// Number of non-zero entries.
    pub fn nnz(&self) -> usize {
        self.columns.iter().map(Vec::len).sum()
    }

    /// S·v for a flux vector given as (reaction, flux) pairs.
    pub fn times(&self, fluxes: &[(usize, f64)]) -> Vec<f64> {
        let mut out = vec![0.0; self.metabolites];
        for &(j, v) in fluxes {
            for &(i, c) in &self.columns[j] {
                out[i] += c * v;
            }
        }
        out
    }
}

#[derive(Debug, Clone)]
pub struct Network {
    pub graph: DiGraph<Node, f64>,
    /// Graph node of metabolite i.
    pub metabolite_nodes: Vec<NodeIndex>,
    /// Graph node of reaction j.
    pub reaction_nodes: Vec<NodeIndex>,
    pub stoichiometry: Stoichiometry,
}

impl Network {
    /// Edges: for a direction the bounds allow, consumed metabolite →
    /// reaction → produced metabolite, weighted by |coefficient|.
    pub fn build(model: &Model) -> Network {
        let mut graph = DiGraph::with_capacity(
            model.metabolites.len() + model.reactions.len(),
            2 * model
                .reactions
                .iter()
                .map(|r| r.stoichiometry.len())
                .sum::<usize>(),
        );
        let metabolite_nodes: Vec<NodeIndex> = (0..model.metabolites.len())
            .map(|i| graph.add_node(Node::Metabolite(i)))
            .collect();
        let reaction_nodes: Vec<NodeIndex> = (0..model.reactions.len())
            .map(|j| graph.add_node(Node::Reaction(j)))
            .collect();
        for (j, reaction) in model.reactions.iter().enumerate() {
            let rn = reaction_nodes[j];
            for &(i, c) in &reaction.stoichiometry {
                let mn = metabolite_nodes[i];
                let (forward_in, backward_in) = (c < 0.0, c > 0.0);
                if reaction.allows_forward() {
                    if forward_in {
                        graph.add_edge(mn, rn, c.abs());
                    } else {
                        graph.add_edge(rn, mn, c.abs());
                    }
                }
                if reaction.allows_backward() {
                    if backward_in {
                        graph.add_edge(mn, rn, c.abs());
                    } else {
                        graph.add_edge(rn, mn, c.abs());
                    }
                }
            }
        }
        Network {
            graph,
            metabolite_nodes,
            reaction_nodes,
            stoichiometry: Stoichiometry::from_model(model),
        }
    }

    /// Reactions that consume (negative coefficient) / produce metabolite i,
    /// as written in the equation, independent of bounds.
    pub fn consumers_and_producers(&self, metabolite: usize) -> (Vec<usize>, Vec<usize>) {
        let mut consumers = Vec::new();
        let mut producers = Vec::new();
        for &(j, c) in &self.stoichiometry.rows[metabolite] {
            if c < 0.0 {
                consumers.push(j);
            } else {
                producers.push(j);
            }
        }
        (consumers, producers)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{Compartment, Metabolite, Reaction, Role, Special};
    use petgraph::Direction;

    fn metabolite(id: &str) -> Metabolite {
        Metabolite {
            id: id.into(),
            name: id.into(),
            compartment: 0,
            formula: None,
            charge: None,
            dfg_prime: None,
            species: None,
            library: None,
            concentration: None,
            measured_m: None,
            special: Special::None,
            xrefs: Default::default(),
            sbo: None,
        }
    }

    fn reaction(id: &str, st: Vec<(usize, f64)>, lb: f64, ub: f64) -> Reaction {
        Reaction {
            id: id.into(),
            name: id.into(),
            stoichiometry: st,
            lower_bound: lb,
            upper_bound: ub,
            drg_prime: None,
            group: None,
            role: Role::Internal,
            sbo: None,
            xrefs: Default::default(),
        }
    }

    fn tiny() -> Model {
        Model {
            id: "t".into(),
            title: "t".into(),
            temperature_k: 298.15,
            compartments: vec![Compartment {
                id: "c".into(),
                name: "c".into(),
                ph: 7.0,
                ionic_strength_m: 0.25,
                potential_mv: 0.0,
                temperature_k: None,
                pmg: None,
            }],
            metabolites: vec![metabolite("a"), metabolite("b")],
            reactions: vec![
                reaction("R1", vec![(0, -2.0), (1, 1.0)], 0.0, 10.0),
                reaction("R2", vec![(0, 1.0), (1, -1.0)], -10.0, 10.0),
            ],
            scenarios: vec![],
            objective: vec![],
        }
    }

    #[test]
    fn edges_follow_allowed_directions() {
        let model = tiny();
        let net = Network::build(&model);
        // R1 irreversible: a → R1 → b (2 edges); R2 reversible: 4 edges.
        assert_eq!(net.graph.edge_count(), 6);
        let r1 = net.reaction_nodes[0];
        let into_r1: Vec<_> = net
            .graph
            .neighbors_directed(r1, Direction::Incoming)
            .collect();
        assert_eq!(into_r1, vec![net.metabolite_nodes[0]]);
        let e = net.graph.find_edge(net.metabolite_nodes[0], r1).unwrap();
        assert_eq!(net.graph[e], 2.0);
    }

    #[test]
    fn stoichiometric_matrix_rows_and_product() {
        let model = tiny();
        let s = Stoichiometry::from_model(&model);
        assert_eq!(s.nnz(), 4);
        assert_eq!(s.rows[0], vec![(0, -2.0), (1, 1.0)]);
        // v = (1, 2): a: −2 + 2 = 0, b: 1 − 2 = −1.
        assert_eq!(s.times(&[(0, 1.0), (1, 2.0)]), vec![0.0, -1.0]);
    }
}
