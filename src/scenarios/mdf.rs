//! Max-min driving force (Noor et al., PLoS Comput. Biol. 10 (2014)
//! e1003483): the largest B such that every active step has −ΔG' ≥ B, the
//! steps that limit it (binding rows, with their dual values from the
//! explicitly solved dual LP) and one concentration set achieving it.

use super::feasibility::{Decision, JointProblem, JointVarKind};
use super::tolerance::BINDING_WEIGHT;

#[derive(Debug, Clone, PartialEq)]
pub struct MdfResult {
    /// B, kJ/mol (negative: some step must run uphill).
    pub value_kj: f64,
    /// (step index, dual value): raising that step's driving force by
    /// 1 kJ/mol raises B by the dual value (they sum to 1).
    pub bottlenecks: Vec<(usize, f64)>,
    /// (metabolite, concentration in mol/L) achieving B.
    pub concentrations: Vec<(usize, f64)>,
    /// (error source, deviation in kJ/mol) used to achieve B.
    pub deviations: Vec<(usize, f64)>,
    /// Value of every LP variable at the optimum.
    pub values: Vec<f64>,
}

/// Reads the MDF, its bottlenecks and concentrations off a decision.
pub fn describe(problem: &JointProblem, decision: &Decision) -> MdfResult {
    let primal = decision.primal();
    let mut bottlenecks: Vec<(usize, f64)> = decision
        .dual()
        .weights
        .iter()
        .copied()
        .filter(|&(_, y)| y > BINDING_WEIGHT)
        .collect();
    bottlenecks.sort_by(|a, b| b.1.total_cmp(&a.1).then(a.0.cmp(&b.0)));
    let mut concentrations = Vec::new();
    let mut deviations = Vec::new();
    for (k, var) in problem.vars.iter().enumerate() {
        match var.kind {
            JointVarKind::LnConcentration { metabolite } => {
                concentrations.push((metabolite, primal.values[k].exp()))
            }
            JointVarKind::Deviation { source } => deviations.push((source, primal.values[k])),
        }
    }
    concentrations.sort_by_key(|c| c.0);
    deviations.sort_by_key(|d| d.0);
    MdfResult {
        value_kj: primal.value_kj,
        bottlenecks,
        concentrations,
        deviations,
        values: primal.values.clone(),
    }
}

/// "the weakest step has at most 3.2 kJ/mol of driving force".
pub fn reading(value_kj: f64) -> String {
    if value_kj >= 0.0 {
        format!("the weakest step has at most {value_kj:.1} kJ/mol of driving force")
    } else {
        format!(
            "even at the best concentrations one step must run {:.1} kJ/mol uphill",
            -value_kj
        )
    }
}
