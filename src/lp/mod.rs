//! Linear programming: the only module that talks to an LP solver.
//!
//! Callers state a problem in the plain types of this module
//! ([`LinearProgram`], [`Relation`], [`Sense`]) and read back an
//! [`LpSolution`]; nothing outside `lp/` names the solver crate, so the
//! backend can change (or sit behind a cargo feature) without touching the
//! analyses. The default backend is the pure-Rust simplex `microlp`, which
//! returns vertex solutions: exact zeros stay exact zeros, which the loop
//! analyses rely on when they read a flux pattern off a solution.

mod microlp_backend;

pub use microlp_backend::LpSession;

/// Optimisation direction.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Sense {
    Maximise,
    Minimise,
}

/// Row relation: `Σ coef·x  (≤ | = | ≥)  rhs`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Relation {
    LessOrEqual,
    Equal,
    GreaterOrEqual,
}

/// Handle of a variable of one [`LinearProgram`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Var(pub usize);

#[derive(Debug, Clone, PartialEq)]
struct Column {
    cost: f64,
    lower: f64,
    upper: f64,
}

#[derive(Debug, Clone, PartialEq)]
struct Row {
    terms: Vec<(Var, f64)>,
    relation: Relation,
    rhs: f64,
}

/// A linear program over continuous variables.
#[derive(Debug, Clone, PartialEq)]
pub struct LinearProgram {
    sense: Sense,
    columns: Vec<Column>,
    rows: Vec<Row>,
}

/// An optimal vertex.
#[derive(Debug, Clone, PartialEq)]
pub struct LpSolution {
    pub objective: f64,
    /// Indexed by [`Var`].
    pub values: Vec<f64>,
}

impl LpSolution {
    pub fn value(&self, var: Var) -> f64 {
        self.values[var.0]
    }
}

/// Why a linear program has no optimal solution.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum LpError {
    #[error("the linear program is infeasible")]
    Infeasible,
    #[error("the linear program is unbounded")]
    Unbounded,
    #[error("the LP solver failed: {0}")]
    Solver(String),
}

impl LinearProgram {
    pub fn new(sense: Sense) -> LinearProgram {
        LinearProgram {
            sense,
            columns: Vec::new(),
            rows: Vec::new(),
        }
    }

    /// Adds a variable with objective coefficient `cost` and bounds
    /// `lower ≤ x ≤ upper` (infinite bounds allowed on their open side).
    pub fn add_variable(&mut self, cost: f64, lower: f64, upper: f64) -> Var {
        self.columns.push(Column { cost, lower, upper });
        Var(self.columns.len() - 1)
    }

    /// Adds a row. Terms naming the same variable twice are summed.
    pub fn add_row(&mut self, terms: &[(Var, f64)], relation: Relation, rhs: f64) {
        let mut merged: Vec<(Var, f64)> = terms.to_vec();
        merged.sort_by_key(|(v, _)| *v);
        merged.dedup_by(|later, earlier| {
            if later.0 == earlier.0 {
                earlier.1 += later.1;
                true
            } else {
                false
            }
        });
        merged.retain(|(_, c)| *c != 0.0);
        self.rows.push(Row {
            terms: merged,
            relation,
            rhs,
        });
    }

    pub fn variable_count(&self) -> usize {
        self.columns.len()
    }

    pub fn row_count(&self) -> usize {
        self.rows.len()
    }

    /// Largest violation of any bound or row by `values` (0 when every
    /// constraint holds exactly). Every analysis that trusts an LP answer
    /// checks it this way: the answer substituted back into the problem.
    pub fn max_violation(&self, values: &[f64]) -> f64 {
        if values.len() != self.columns.len() {
            return f64::INFINITY;
        }
        let mut worst = 0.0f64;
        for (c, &x) in self.columns.iter().zip(values) {
            if !x.is_finite() {
                return f64::INFINITY;
            }
            worst = worst.max(c.lower - x).max(x - c.upper);
        }
        for row in &self.rows {
            let lhs: f64 = row.terms.iter().map(|(v, c)| c * values[v.0]).sum();
            let gap = match row.relation {
                Relation::LessOrEqual => lhs - row.rhs,
                Relation::GreaterOrEqual => row.rhs - lhs,
                Relation::Equal => (lhs - row.rhs).abs(),
            };
            worst = worst.max(gap);
        }
        worst
    }

    /// Objective value of `values` (to check a reported optimum).
    pub fn objective_of(&self, values: &[f64]) -> f64 {
        self.columns
            .iter()
            .zip(values)
            .map(|(c, x)| c.cost * x)
            .sum()
    }

    /// Solves from scratch.
    pub fn solve(&self) -> Result<LpSolution, LpError> {
        LpSession::start(self).map(|session| session.solution().clone())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Textbook LP (common practice): max 3x + 2y, x + y ≤ 4, x + 3y ≤ 6,
    // x ≤ 3 has its optimum 11 at the vertex (3, 1).
    #[test]
    fn solves_a_small_maximisation_at_a_vertex() {
        let mut lp = LinearProgram::new(Sense::Maximise);
        let x = lp.add_variable(3.0, 0.0, 3.0);
        let y = lp.add_variable(2.0, 0.0, f64::INFINITY);
        lp.add_row(&[(x, 1.0), (y, 1.0)], Relation::LessOrEqual, 4.0);
        lp.add_row(&[(x, 1.0), (y, 3.0)], Relation::LessOrEqual, 6.0);
        let s = lp.solve().unwrap();
        assert!((s.objective - 11.0).abs() < 1e-9);
        assert!(lp.max_violation(&s.values) < 1e-9);
        assert!((lp.objective_of(&s.values) - 11.0).abs() < 1e-9);
        // A point outside: x = 4 breaks its bound by 1 and x + y ≤ 4 by 1.
        assert!((lp.max_violation(&[4.0, 1.0]) - 1.0).abs() < 1e-12);
        assert!((s.value(x) - 3.0).abs() < 1e-9);
        assert!((s.value(y) - 1.0).abs() < 1e-9);
    }

    #[test]
    fn reports_infeasible_and_unbounded() {
        let mut lp = LinearProgram::new(Sense::Minimise);
        let x = lp.add_variable(1.0, 0.0, 1.0);
        lp.add_row(&[(x, 1.0)], Relation::GreaterOrEqual, 2.0);
        assert_eq!(lp.solve(), Err(LpError::Infeasible));

        let mut lp = LinearProgram::new(Sense::Maximise);
        let x = lp.add_variable(1.0, 0.0, f64::INFINITY);
        let y = lp.add_variable(0.0, 0.0, f64::INFINITY);
        lp.add_row(&[(x, 1.0), (y, -1.0)], Relation::Equal, 0.0);
        assert_eq!(lp.solve(), Err(LpError::Unbounded));
    }

    // Loop enumeration runs sessions on worker threads.
    #[test]
    fn session_is_send() {
        fn assert_send<T: Send>() {}
        assert_send::<LpSession>();
    }

    #[test]
    fn session_fixes_and_releases_a_variable_with_warm_restarts() {
        // min x + y, x - y = 0, 0 ≤ x, y ≤ 5: optimum 0; with x fixed at 2 it is 4.
        let mut lp = LinearProgram::new(Sense::Minimise);
        let x = lp.add_variable(1.0, 0.0, 5.0);
        let y = lp.add_variable(1.0, 0.0, 5.0);
        lp.add_row(&[(x, 1.0), (y, -1.0)], Relation::Equal, 0.0);
        let mut session = LpSession::start(&lp).unwrap();
        assert!(session.solution().objective.abs() < 1e-12);
        let fixed = session.fix(x, 2.0).unwrap();
        assert!((fixed.objective - 4.0).abs() < 1e-9);
        assert_eq!(session.fix(x, 7.0), Err(LpError::Infeasible));
        // After a failed edit the session is rebuilt and still usable.
        let released = session.release(x).unwrap();
        assert!(released.objective.abs() < 1e-9);
        let fixed = session.fix(y, 1.0).unwrap();
        assert!((fixed.value(x) - 1.0).abs() < 1e-9);
        // A fix that keeps the problem feasible, without a state copy: the
        // same optimum as `fix` (x = y = 1 → 2), then released back to 0.
        session.release(y).unwrap();
        let fixed = session.fix_feasible(x, 1.0).unwrap();
        assert!((fixed.objective - 2.0).abs() < 1e-9);
        assert!((fixed.value(y) - 1.0).abs() < 1e-9);
        let released = session.release(x).unwrap();
        assert!(released.objective.abs() < 1e-9);
    }
}
