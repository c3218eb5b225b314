//! The joint LP of one flux scenario.
//!
//! Variables (all in one LP):
//!
//! * `xᵢ = ln(cᵢ / 1 M)` for every metabolite in Q of an active reaction,
//!   within ln of its allowed range (a measured one within
//!   [`MEASURED_FACTOR`] of its measurement); water and H+ are not variables
//!   (left out of Q, as everywhere);
//! * `εₛ` (kJ/mol) for every independent error source `s` behind the active
//!   ΔrG'° values, within ±k·σₛ: a source shared by several reactions is
//!   one variable, so it cannot take two values;
//! * `B` (kJ/mol), the driving force every active step must at least have.
//!
//! Each active reaction `j` with flux direction `dⱼ` (±1) and a ΔrG'° gives
//! one row `dⱼ·(ΔrG'°ⱼ + Σₛ cⱼₛεₛ + RTⱼ·Σᵢ νᵢⱼxᵢ) + B ≤ 0`, written
//! `aⱼ·z + B ≤ bⱼ` with `bⱼ = −dⱼ·ΔrG'°ⱼ`, and, when its ΔrG'° has error
//! sources, the allowance rows `|Σₛ cⱼₛεₛ| ≤ k·σⱼ`: the sources of one
//! reaction together never move its ΔrG'° beyond the k·σ the per-step
//! verdicts allow (a box of ±k·σₛ per source alone would allow
//! k·Σ|cₛ|σₛ, more than k·√Σ(cₛσₛ)²). Maximising `B` gives the max-min
//! driving force (Noor et al., PLoS Comput. Biol. 10 (2014) e1003483); the
//! scenario is feasible exactly when that maximum reaches the project's
//! `min_driving_force`. The dual of the same LP is solved as its own LP:
//!
//! minimise `Σⱼ yⱼbⱼ + Σⱼ (μ⁺ⱼ + μ⁻ⱼ)·k·σⱼ − Σₖ (lₖpₖ − uₖqₖ)` subject to
//! `Σⱼ yⱼaⱼₖ + Σⱼ (μ⁺ⱼ − μ⁻ⱼ)·eⱼₖ = pₖ − qₖ` (e: the allowance rows),
//! `Σⱼ yⱼ = 1`, `y, μ, p, q ≥ 0`;
//!
//! its optimum equals the MDF (strong duality, checked), its `yⱼ` are the
//! dual values of the rows (how much the MDF rises per kJ/mol of extra
//! driving force of step `j`), and when the MDF falls short of the required
//! force the same `y` is a Farkas certificate: `min over the box of
//! yᵀ(A·z − b) + Σy·min_driving_force > 0`, which no concentration set can
//! meet (the allowance multipliers take part in the certificate).

use super::tolerance::{DECIDE_KJ, DUALITY_GAP_KJ, SUBSTITUTION_KJ};
use crate::lp::{LinearProgram, LpError, Relation, Sense, Var};
use std::collections::BTreeMap;

/// A measurement stated without an error is taken to hold within this
/// factor either way (our choice: two-fold, a generous allowance for
/// extraction and calibration; documented in README).
pub const MEASURED_FACTOR: f64 = 2.0;

/// What a variable of the joint LP stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum JointVarKind {
    /// ln of a metabolite's concentration in mol/L.
    LnConcentration { metabolite: usize },
    /// Deviation of one error source, kJ/mol.
    Deviation { source: usize },
}

#[derive(Debug, Clone, PartialEq)]
pub struct JointVar {
    pub kind: JointVarKind,
    pub lower: f64,
    pub upper: f64,
}

/// One active reaction: the row `Σ a·z + B ≤ rhs`.
#[derive(Debug, Clone, PartialEq)]
pub struct JointStep {
    pub reaction: usize,
    /// +1 forward, −1 backward.
    pub direction: f64,
    pub drg0_kj: f64,
    pub sigma_kj: f64,
    pub rt_kj: f64,
    /// (variable index, coefficient) over concentrations and deviations.
    pub terms: Vec<(usize, f64)>,
    pub rhs: f64,
    /// k·σ of this ΔrG'°: `|Σ (deviation terms)| ≤ allowance`; `None`
    /// when it has no error source.
    pub allowance: Option<f64>,
}

/// The joint LP's data, independent of the solver.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct JointProblem {
    pub vars: Vec<JointVar>,
    pub steps: Vec<JointStep>,
    /// Driving force every step must have, kJ/mol.
    pub min_driving_force_kj: f64,
}

/// An optimal point of the MDF LP over some steps.
#[derive(Debug, Clone, PartialEq)]
pub struct MdfPoint {
    /// Largest B, kJ/mol.
    pub value_kj: f64,
    /// Value of every variable of the problem (variables no chosen step
    /// uses sit at the middle of their range).
    pub values: Vec<f64>,
}

/// An optimal point of the dual LP: the row weights.
#[derive(Debug, Clone, PartialEq)]
pub struct DualPoint {
    pub value_kj: f64,
    /// (step index, yⱼ > 0), Σ yⱼ = 1.
    pub weights: Vec<(usize, f64)>,
    /// (step index, μ⁺ⱼ − μ⁻ⱼ) of the allowance rows, non-zero only.
    pub allowance_weights: Vec<(usize, f64)>,
}

/// A bound that limits the best overall ΔG' of a set of steps.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Binding {
    /// A variable at its upper (true) or lower bound.
    Variable(usize, bool),
    /// A step's ΔrG'° at the end of its ±k·σ allowance (true: +k·σ).
    Allowance(usize, bool),
}

/// The verdict on a set of steps, with the evidence of both LPs.
#[derive(Debug, Clone, PartialEq)]
pub enum Decision {
    Feasible { primal: MdfPoint, dual: DualPoint },
    Infeasible { primal: MdfPoint, dual: DualPoint },
}

impl Decision {
    pub fn is_feasible(&self) -> bool {
        matches!(self, Decision::Feasible { .. })
    }
    pub fn primal(&self) -> &MdfPoint {
        match self {
            Decision::Feasible { primal, .. } | Decision::Infeasible { primal, .. } => primal,
        }
    }
    pub fn dual(&self) -> &DualPoint {
        match self {
            Decision::Feasible { dual, .. } | Decision::Infeasible { dual, .. } => dual,
        }
    }
}

/// Why a set of steps could not be decided.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[error("{0}")]
pub struct Undecided(pub String);

impl From<LpError> for Undecided {
    fn from(e: LpError) -> Undecided {
        Undecided(format!("the LP solver gave no answer ({e})"))
    }
}

/// Builder of a [`JointProblem`] from plain numbers (the analysis fills it;
/// tests may too).
#[derive(Debug, Default)]
pub struct ProblemBuilder {
    problem: JointProblem,
    index: BTreeMap<JointVarKind, usize>,
}

impl ProblemBuilder {
    pub fn new(min_driving_force_kj: f64) -> ProblemBuilder {
        ProblemBuilder {
            problem: JointProblem {
                min_driving_force_kj,
                ..JointProblem::default()
            },
            index: BTreeMap::new(),
        }
    }

    /// The variable of `kind`, added with `range()` on first use.
    pub fn variable(&mut self, kind: JointVarKind, range: impl FnOnce() -> (f64, f64)) -> usize {
        if let Some(&k) = self.index.get(&kind) {
            return k;
        }
        let (lower, upper) = range();
        self.problem.vars.push(JointVar { kind, lower, upper });
        self.index.insert(kind, self.problem.vars.len() - 1);
        self.problem.vars.len() - 1
    }

    /// Adds the row of reaction `reaction` running in `direction`:
    /// `d·(ΔrG'° + Σ c·ε + RT·Σ ν·x) + B ≤ 0`. `q_terms` are (x variable, ν),
    /// `error_terms` (ε variable, c).
    #[allow(clippy::too_many_arguments)]
    pub fn step(
        &mut self,
        reaction: usize,
        direction: f64,
        drg0_kj: f64,
        sigma_kj: f64,
        rt_kj: f64,
        q_terms: &[(usize, f64)],
        error_terms: &[(usize, f64)],
        allowance: Option<f64>,
    ) {
        let d = direction.signum();
        let mut terms: BTreeMap<usize, f64> = BTreeMap::new();
        for &(k, nu) in q_terms {
            *terms.entry(k).or_default() += d * rt_kj * nu;
        }
        for &(k, c) in error_terms {
            *terms.entry(k).or_default() += d * c;
        }
        self.problem.steps.push(JointStep {
            reaction,
            direction: d,
            drg0_kj,
            sigma_kj,
            rt_kj,
            terms: terms.into_iter().filter(|(_, a)| *a != 0.0).collect(),
            rhs: -d * drg0_kj,
            allowance: allowance.filter(|_| !error_terms.is_empty()),
        });
    }

    pub fn finish(self) -> JointProblem {
        self.problem
    }
}

impl JointProblem {
    /// Variables used by the given steps, sorted.
    fn used_vars(&self, subset: &[usize]) -> Vec<usize> {
        let mut used: Vec<usize> = subset
            .iter()
            .flat_map(|&s| self.steps[s].terms.iter().map(|&(k, _)| k))
            .collect();
        used.sort_unstable();
        used.dedup();
        used
    }

    /// The MDF LP over `subset` (step indices), with its variable map.
    pub fn mdf_program(&self, subset: &[usize]) -> (LinearProgram, Vec<usize>, Var) {
        let used = self.used_vars(subset);
        let position: BTreeMap<usize, usize> =
            used.iter().enumerate().map(|(p, &k)| (k, p)).collect();
        let mut lp = LinearProgram::new(Sense::Maximise);
        let vars: Vec<Var> = used
            .iter()
            .map(|&k| lp.add_variable(0.0, self.vars[k].lower, self.vars[k].upper))
            .collect();
        let b = lp.add_variable(1.0, f64::NEG_INFINITY, f64::INFINITY);
        for &s in subset {
            let step = &self.steps[s];
            let mut row: Vec<(Var, f64)> = step
                .terms
                .iter()
                .map(|&(k, a)| (vars[position[&k]], a))
                .collect();
            row.push((b, 1.0));
            lp.add_row(&row, Relation::LessOrEqual, step.rhs);
        }
        self.add_allowance_rows(&mut lp, subset, &|k| vars[position[&k]]);
        (lp, used, b)
    }

    /// Deviation terms of step `s` (kJ/mol per unit of each ε).
    pub fn deviation_terms(&self, s: usize) -> impl Iterator<Item = (usize, f64)> + '_ {
        self.steps[s]
            .terms
            .iter()
            .copied()
            .filter(|&(k, _)| matches!(self.vars[k].kind, JointVarKind::Deviation { .. }))
    }

    /// `−k·σⱼ ≤ Σ (deviation terms of j) ≤ k·σⱼ` for the steps of `subset`.
    pub(crate) fn add_allowance_rows(
        &self,
        lp: &mut LinearProgram,
        subset: &[usize],
        var: &dyn Fn(usize) -> Var,
    ) {
        for &s in subset {
            let Some(limit) = self.steps[s].allowance else {
                continue;
            };
            let row: Vec<(Var, f64)> = self.deviation_terms(s).map(|(k, a)| (var(k), a)).collect();
            lp.add_row(&row, Relation::LessOrEqual, limit);
            lp.add_row(&row, Relation::GreaterOrEqual, -limit);
        }
    }

    /// Solves the MDF LP over `subset` and checks the answer by
    /// substitution. `None` for an empty subset (no step, no bound on B).
    pub fn solve_mdf(&self, subset: &[usize]) -> Result<Option<MdfPoint>, Undecided> {
        if subset.is_empty() {
            return Ok(None);
        }
        let (lp, used, b) = self.mdf_program(subset);
        let solution = lp.solve()?;
        let violation = lp.max_violation(&solution.values);
        if violation > SUBSTITUTION_KJ {
            return Err(Undecided(format!(
                "the LP answer violates its constraints by {violation:.2e} when substituted back"
            )));
        }
        let mut values: Vec<f64> = self
            .vars
            .iter()
            .map(|v| 0.5 * (v.lower + v.upper))
            .collect();
        for (p, &k) in used.iter().enumerate() {
            values[k] = solution.values[p];
        }
        Ok(Some(MdfPoint {
            value_kj: solution.value(b),
            values,
        }))
    }

    /// The dual LP over `subset` (see the module documentation).
    #[allow(clippy::type_complexity)]
    pub fn dual_program(
        &self,
        subset: &[usize],
    ) -> (LinearProgram, Vec<Var>, Vec<(usize, Var, Var)>) {
        let used = self.used_vars(subset);
        let position: BTreeMap<usize, usize> =
            used.iter().enumerate().map(|(p, &k)| (k, p)).collect();
        let mut lp = LinearProgram::new(Sense::Minimise);
        let y: Vec<Var> = subset
            .iter()
            .map(|&s| lp.add_variable(self.steps[s].rhs, 0.0, f64::INFINITY))
            .collect();
        let mut columns: Vec<Vec<(Var, f64)>> = vec![Vec::new(); used.len()];
        for (&s, &yv) in subset.iter().zip(&y) {
            for &(k, a) in &self.steps[s].terms {
                columns[position[&k]].push((yv, a));
            }
        }
        let mut mu = Vec::new();
        for &s in subset {
            let Some(limit) = self.steps[s].allowance else {
                continue;
            };
            let plus = lp.add_variable(limit, 0.0, f64::INFINITY);
            let minus = lp.add_variable(limit, 0.0, f64::INFINITY);
            for (k, a) in self.deviation_terms(s) {
                columns[position[&k]].push((plus, a));
                columns[position[&k]].push((minus, -a));
            }
            mu.push((s, plus, minus));
        }
        for (p, &k) in used.iter().enumerate() {
            let var = &self.vars[k];
            let plus = lp.add_variable(-var.lower, 0.0, f64::INFINITY);
            let minus = lp.add_variable(var.upper, 0.0, f64::INFINITY);
            let mut row = columns[p].clone();
            row.push((plus, -1.0));
            row.push((minus, 1.0));
            lp.add_row(&row, Relation::Equal, 0.0);
        }
        let sum: Vec<(Var, f64)> = y.iter().map(|&v| (v, 1.0)).collect();
        lp.add_row(&sum, Relation::Equal, 1.0);
        (lp, y, mu)
    }

    /// Solves the dual LP over `subset`, checked by substitution.
    pub fn solve_dual(&self, subset: &[usize]) -> Result<DualPoint, Undecided> {
        let (lp, y, mu) = self.dual_program(subset);
        let solution = lp.solve()?;
        let violation = lp.max_violation(&solution.values);
        if violation > SUBSTITUTION_KJ {
            return Err(Undecided(format!(
                "the dual LP answer violates its constraints by {violation:.2e} when substituted back"
            )));
        }
        let weights = subset
            .iter()
            .zip(&y)
            .map(|(&s, &v)| (s, solution.value(v)))
            .filter(|&(_, w)| w > 1e-9)
            .collect();
        let allowance_weights = mu
            .iter()
            .map(|&(s, plus, minus)| (s, solution.value(plus) - solution.value(minus)))
            .filter(|&(_, m)| m.abs() > 1e-12)
            .collect();
        Ok(DualPoint {
            value_kj: solution.objective,
            weights,
            allowance_weights,
        })
    }

    /// Decides whether the steps of `subset` can all run with at least the
    /// required driving force, from both LPs; their optima must agree.
    pub fn decide(&self, subset: &[usize]) -> Result<Option<Decision>, Undecided> {
        // The two LPs are independent: solved side by side (rayon), the
        // primal's answer taken first, as if solved in turn.
        let (primal, dual) = rayon::join(|| self.solve_mdf(subset), || self.solve_dual(subset));
        let Some(primal) = primal? else {
            return Ok(None);
        };
        let dual = dual?;
        let gap = (primal.value_kj - dual.value_kj).abs();
        if gap > DUALITY_GAP_KJ * (1.0 + primal.value_kj.abs()) {
            return Err(Undecided(format!(
                "the MDF LP ({:.6} kJ/mol) and its dual ({:.6} kJ/mol) disagree",
                primal.value_kj, dual.value_kj
            )));
        }
        let feasible = primal.value_kj >= self.min_driving_force_kj - DECIDE_KJ;
        if !feasible {
            // The dual weights must prove it on their own.
            let proof = self.certificate_margin(&dual);
            if proof <= 0.0 {
                return Err(Undecided(format!(
                    "the infeasibility certificate does not hold when evaluated ({proof:.2e})"
                )));
            }
        }
        Ok(Some(if feasible {
            Decision::Feasible { primal, dual }
        } else {
            Decision::Infeasible { primal, dual }
        }))
    }

    /// Smallest `Σ wⱼ·dⱼ·ΔG'ⱼ` (the weighted overall ΔG' in the flux
    /// directions) over the allowed concentrations and deviations (box and
    /// allowance rows of these steps), solved as an LP and checked by
    /// substitution, with the bounds that limit it.
    pub fn best_overall(&self, weights: &[(usize, f64)]) -> Result<(f64, Vec<Binding>), Undecided> {
        let subset: Vec<usize> = weights.iter().map(|&(s, _)| s).collect();
        let used = self.used_vars(&subset);
        let position: BTreeMap<usize, usize> =
            used.iter().enumerate().map(|(p, &k)| (k, p)).collect();
        let mut net: BTreeMap<usize, f64> = BTreeMap::new();
        let mut constant = 0.0;
        for &(s, w) in weights {
            constant -= w * self.steps[s].rhs;
            for &(k, a) in &self.steps[s].terms {
                *net.entry(k).or_default() += w * a;
            }
        }
        let mut lp = LinearProgram::new(Sense::Minimise);
        let vars: Vec<Var> = used
            .iter()
            .map(|&k| {
                let v = &self.vars[k];
                lp.add_variable(net.get(&k).copied().unwrap_or(0.0), v.lower, v.upper)
            })
            .collect();
        self.add_allowance_rows(&mut lp, &subset, &|k| vars[position[&k]]);
        let solution = lp.solve()?;
        let violation = lp.max_violation(&solution.values);
        if violation > SUBSTITUTION_KJ {
            return Err(Undecided(format!(
                "the overall-ΔG' LP answer violates its constraints by {violation:.2e}"
            )));
        }
        let mut binding = Vec::new();
        for (p, &k) in used.iter().enumerate() {
            let g = net.get(&k).copied().unwrap_or(0.0);
            let v = &self.vars[k];
            let x = solution.values[p];
            // A fixed variable (σ = 0) has no bound to relax.
            if g.abs() < 1e-12 || v.upper <= v.lower {
                continue;
            }
            if (x - v.upper).abs() < 1e-9 {
                binding.push(Binding::Variable(k, true));
            } else if (x - v.lower).abs() < 1e-9 {
                binding.push(Binding::Variable(k, false));
            }
        }
        for &s in &subset {
            let Some(limit) = self.steps[s].allowance else {
                continue;
            };
            let total: f64 = self
                .deviation_terms(s)
                .map(|(k, a)| a * solution.values[position[&k]])
                .sum();
            if limit > 0.0 && (total.abs() - limit).abs() < 1e-9 {
                // In the flux direction: lower ΔG' means −k·σ along d.
                binding.push(Binding::Allowance(s, total > 0.0));
            }
        }
        Ok((constant + solution.objective, binding))
    }

    /// `min over the box of Σyⱼ(aⱼ·z − bⱼ) + Σμⱼ(eⱼ·z) − Σ|μⱼ|·k·σⱼ +
    /// Σy·min_driving_force`: positive means the dual point proves the
    /// steps cannot all run (Farkas' lemma), evaluated directly.
    pub fn certificate_margin(&self, dual: &DualPoint) -> f64 {
        let mut net: BTreeMap<usize, f64> = BTreeMap::new();
        let mut constant = 0.0;
        for &(s, y) in &dual.weights {
            constant -= y * self.steps[s].rhs;
            constant += y * self.min_driving_force_kj;
            for &(k, a) in &self.steps[s].terms {
                *net.entry(k).or_default() += y * a;
            }
        }
        for &(s, m) in &dual.allowance_weights {
            constant -= m.abs() * self.steps[s].allowance.unwrap_or(0.0);
            for (k, a) in self.deviation_terms(s) {
                *net.entry(k).or_default() += m * a;
            }
        }
        let mut total = constant;
        for (k, g) in net {
            let v = &self.vars[k];
            total += if g < 0.0 { g * v.upper } else { g * v.lower };
        }
        total
    }

    /// ΔG' of step `s` in its flux direction at `values` (deviations
    /// included).
    pub fn step_dg(&self, s: usize, values: &[f64]) -> f64 {
        let step = &self.steps[s];
        step.terms.iter().map(|&(k, a)| a * values[k]).sum::<f64>() - step.rhs
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::thermo::constants::{rt, T_STANDARD_K};

    /// a → b → c with ΔrG'° −5 and −1 kJ/mol (σ 0; invented for this test),
    /// every concentration in [1 µM, 10 mM] (common practice default range). Hand MDF: adding the two rows, −6 + RT·ln(c/a) ≤ −2B;
    /// ln(c/a) ≥ ln(1e-6/1e-2) = ln 1e-4, so 2B ≤ 6 + RT·ln 1e4 =
    /// 6 + 22.832 (RT = 2.478957 kJ/mol at 298.15 K, R from CODATA 2018)
    /// → B = 14.416 kJ/mol, both steps binding with dual value ½ each.
    #[test]
    fn two_step_mdf_and_its_dual_agree() {
        let rt = rt(T_STANDARD_K);
        let mut b = ProblemBuilder::new(1.0);
        let range = || (1e-6f64.ln(), 1e-2f64.ln());
        let (a, bb, c) = (
            b.variable(JointVarKind::LnConcentration { metabolite: 0 }, range),
            b.variable(JointVarKind::LnConcentration { metabolite: 1 }, range),
            b.variable(JointVarKind::LnConcentration { metabolite: 2 }, range),
        );
        b.step(0, 1.0, -5.0, 0.0, rt, &[(a, -1.0), (bb, 1.0)], &[], None);
        b.step(1, 1.0, -1.0, 0.0, rt, &[(bb, -1.0), (c, 1.0)], &[], None);
        let p = b.finish();
        let decision = p.decide(&[0, 1]).unwrap().unwrap();
        assert!(decision.is_feasible());
        let expect = (6.0 + rt * 1e4f64.ln()) / 2.0;
        assert!((expect - 14.416).abs() < 0.001, "{expect}");
        assert!((decision.primal().value_kj - expect).abs() < 1e-6);
        assert!((decision.dual().value_kj - expect).abs() < 1e-6);
        for &(_, y) in &decision.dual().weights {
            assert!((y - 0.5).abs() < 1e-6, "{y}");
        }
        // Substituted back: every step has at least B of driving force.
        let v = &decision.primal().values;
        for s in 0..2 {
            assert!(p.step_dg(s, v) <= -expect + 1e-6);
        }
        let (lp, _, _) = p.mdf_program(&[0, 1]);
        let mut z: Vec<f64> = vec![v[a], v[bb], v[c]];
        z.push(decision.primal().value_kj);
        assert!(lp.max_violation(&z) < 1e-9);
    }
}
