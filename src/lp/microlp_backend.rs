//! Backend on the pure-Rust simplex solver `microlp`.

use super::{LinearProgram, LpError, LpSolution, Relation, Sense, Var};
use std::collections::BTreeMap;

/// A solved linear program kept open for cheap edits: fixing a variable and
/// releasing it again re-solve from the last basis (dual simplex warm
/// start) instead of from scratch. Many analyses ask one problem the same
/// question about many variables, which is where this pays.
pub struct LpSession {
    program: LinearProgram,
    vars: Vec<microlp::Variable>,
    /// `None` only transiently after a failed edit consumed the solver state.
    state: Option<microlp::Solution>,
    current: LpSolution,
    /// Variables fixed by [`LpSession::fix`] and not yet released.
    fixes: BTreeMap<usize, f64>,
}

impl std::fmt::Debug for LpSession {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("LpSession")
            .field("variables", &self.program.variable_count())
            .field("rows", &self.program.row_count())
            .field("fixes", &self.fixes)
            .finish()
    }
}

fn convert_error(error: microlp::Error) -> LpError {
    match error {
        microlp::Error::Infeasible => LpError::Infeasible,
        microlp::Error::Unbounded => LpError::Unbounded,
        other => LpError::Solver(other.to_string()),
    }
}

fn read_outcome(
    outcome: microlp::SolveOutcome,
    vars: &[microlp::Variable],
) -> Result<(microlp::Solution, LpSolution), LpError> {
    let solution = outcome
        .into_solution()
        .map_err(|_| LpError::Solver("the solve stopped before an optimum".to_string()))?;
    let values = vars.iter().map(|v| solution.var_value(*v)).collect();
    let read = LpSolution {
        objective: solution.objective(),
        values,
    };
    Ok((solution, read))
}

fn build(program: &LinearProgram) -> (microlp::Problem, Vec<microlp::Variable>) {
    let direction = match program.sense {
        Sense::Maximise => microlp::OptimizationDirection::Maximize,
        Sense::Minimise => microlp::OptimizationDirection::Minimize,
    };
    let mut problem = microlp::Problem::new(direction);
    let vars: Vec<_> = program
        .columns
        .iter()
        .map(|c| problem.add_var(c.cost, (c.lower, c.upper)))
        .collect();
    for row in &program.rows {
        let op = match row.relation {
            Relation::LessOrEqual => microlp::ComparisonOp::Le,
            Relation::Equal => microlp::ComparisonOp::Eq,
            Relation::GreaterOrEqual => microlp::ComparisonOp::Ge,
        };
        let expr: Vec<(microlp::Variable, f64)> =
            row.terms.iter().map(|(v, c)| (vars[v.0], *c)).collect();
        problem.add_constraint(expr.as_slice(), op, row.rhs);
    }
    (problem, vars)
}

impl LpSession {
    /// Solves `program` from scratch and keeps the solver state.
    pub fn start(program: &LinearProgram) -> Result<LpSession, LpError> {
        let (problem, vars) = build(program);
        let outcome = problem.solve().map_err(convert_error)?;
        let (state, current) = read_outcome(outcome, &vars)?;
        Ok(LpSession {
            program: program.clone(),
            vars,
            state: Some(state),
            current,
            fixes: BTreeMap::new(),
        })
    }

    /// The optimum after the last successful edit.
    pub fn solution(&self) -> &LpSolution {
        &self.current
    }

    /// Fixes `var` at `value` and re-solves. On error the session returns to
    /// the state before this call.
    pub fn fix(&mut self, var: Var, value: f64) -> Result<&LpSolution, LpError> {
        // A failed edit consumes the solver state; a copy of the basis is far
        // cheaper than solving again from scratch, and infeasible fixes are
        // ordinary answers for the feasibility questions asked here.
        self.fix_then(var, value, true)
    }

    /// As [`LpSession::fix`], for an edit the caller knows keeps the problem
    /// feasible (e.g. a flux fixed at 0 in a cone that contains 0): no copy
    /// of the solver state is kept to return to, which [`LpSession::fix`]
    /// pays on every call. Should the solver fail anyway, the session is
    /// rebuilt without this fix and the error returned.
    pub fn fix_feasible(&mut self, var: Var, value: f64) -> Result<&LpSolution, LpError> {
        self.fix_then(var, value, false)
    }

    /// The edit behind both fixes; on error the session returns to the copy
    /// kept (`keep_copy`) or is rebuilt without the fix.
    fn fix_then(&mut self, var: Var, value: f64, keep_copy: bool) -> Result<&LpSolution, LpError> {
        let state = self.take_state()?;
        let backup = keep_copy.then(|| state.clone());
        match state.fix_var(self.vars[var.0], value) {
            Ok(outcome) => {
                let (state, current) = read_outcome(outcome, &self.vars)?;
                self.state = Some(state);
                self.current = current;
                self.fixes.insert(var.0, value);
                Ok(&self.current)
            }
            Err(error) => {
                match backup {
                    Some(backup) => self.state = Some(backup),
                    None => self.rebuild()?,
                }
                Err(convert_error(error))
            }
        }
    }

    /// Restores the bounds of a variable fixed by [`LpSession::fix`] and
    /// re-solves.
    pub fn release(&mut self, var: Var) -> Result<&LpSolution, LpError> {
        if !self.fixes.contains_key(&var.0) {
            return Ok(&self.current);
        }
        let state = self.take_state()?;
        match state.unfix_var(self.vars[var.0]) {
            Ok((outcome, _)) => {
                self.fixes.remove(&var.0);
                let (state, current) = read_outcome(outcome, &self.vars)?;
                self.state = Some(state);
                self.current = current;
                Ok(&self.current)
            }
            Err(error) => {
                self.fixes.remove(&var.0);
                self.rebuild()?;
                Err(convert_error(error))
            }
        }
    }

    fn take_state(&mut self) -> Result<microlp::Solution, LpError> {
        if self.state.is_none() {
            self.rebuild()?;
        }
        self.state
            .take()
            .ok_or_else(|| LpError::Solver("no solver state".to_string()))
    }

    /// Solves again from scratch and re-applies the fixes still in force
    /// (through the solver, so a later release restores the original
    /// bounds); used after a failed edit consumed the solver state.
    fn rebuild(&mut self) -> Result<(), LpError> {
        let (problem, vars) = build(&self.program);
        let outcome = problem.solve().map_err(convert_error)?;
        let (mut state, mut current) = read_outcome(outcome, &vars)?;
        for (&index, &value) in &self.fixes {
            let outcome = state.fix_var(vars[index], value).map_err(convert_error)?;
            (state, current) = read_outcome(outcome, &vars)?;
        }
        self.vars = vars;
        self.state = Some(state);
        self.current = current;
        Ok(())
    }
}
