//! Which reactions can carry flux in a closed network, and in which
//! directions: exact, with few LPs.
//!
//! All bounds include zero, so only their signs matter and the question is
//! about the cone C = {v : S·v = 0, v_r ≥ 0 for forward-only r, v_r ≤ 0 for
//! backward-only r}. The method:
//!
//! 1. Irreversible reactions (one allowed direction), oriented forward: a
//!    FASTCC-style LP (Vlassis et al., PLoS Comput. Biol. 10 (2014)
//!    e1003424) maximises Σ min(vᵢ, ε) over those not yet seen carrying
//!    flux, repeated until its optimum vanishes, which proves the rest
//!    blocked. The sum v° of the LP solutions has every capable irreversible
//!    reaction strictly positive at once.
//! 2. Reversible reactions: with v° strictly inside the irreversible
//!    orthant, v° + t·w stays in C for any null-space vector w of the
//!    reduced matrix (blocked columns dropped) and small |t|. So a reversible
//!    reaction can carry flux exactly when its coordinate is not identically
//!    zero on that null space: one sparse elimination and a few random
//!    null-space vectors decide all of them together.
//! 3. Directions of reversible reactions: read off v° and v° ± t·w; a
//!    reversible reaction whose null-space row is a multiple of a capable
//!    irreversible reaction's row (fully coupled) has only that sign;
//!    what remains gets one small LP per direction, warm-started.

use super::network::Directions;
use super::nullspace::Elimination;
use super::tolerance::{
    COUPLING_MATCH, FASTCC_EPSILON, FLUX_BOX, FLUX_NONZERO, NULLSPACE_NONZERO, NULLSPACE_SAMPLES,
    RANDOM_SEED,
};
use crate::lp::{LinearProgram, LpError, LpSession, Relation, Sense, Var};
use std::collections::BTreeMap;

/// Result of the capability analysis, indexed like the input.
#[derive(Debug, Clone, PartialEq)]
pub struct Capability {
    /// Per reaction: directions in which it can carry nonzero flux.
    pub capable: Vec<Directions>,
    /// Number of LP solves (fresh or warm edits).
    pub lp_solves: usize,
    /// Reversible reactions decided by the null-space test alone.
    pub reversible_decided_by_null_space: usize,
    /// Directions of reversible reactions that needed their own LP.
    pub direction_lps: usize,
}

/// Reduced problem: the reactions still allowed, oriented so that an
/// irreversible reaction runs forward.
struct Oriented {
    /// Model reaction index per local column.
    reaction: Vec<usize>,
    /// +1 or −1: local flux u = sign·v.
    sign: Vec<f64>,
    reversible: Vec<bool>,
    /// Local columns (row index local too).
    columns: Vec<Vec<(usize, f64)>>,
    row_count: usize,
}

impl Oriented {
    fn new(columns: &[Vec<(usize, f64)>], allowed: &[Directions], keep: &[bool]) -> Oriented {
        let mut row_of: BTreeMap<usize, usize> = BTreeMap::new();
        let mut out = Oriented {
            reaction: Vec::new(),
            sign: Vec::new(),
            reversible: Vec::new(),
            columns: Vec::new(),
            row_count: 0,
        };
        for (r, column) in columns.iter().enumerate() {
            if !keep[r] || !allowed[r].any() {
                continue;
            }
            let sign = if allowed[r].forward { 1.0 } else { -1.0 };
            let local: Vec<(usize, f64)> = column
                .iter()
                .map(|&(m, c)| {
                    let next = row_of.len();
                    (*row_of.entry(m).or_insert(next), sign * c)
                })
                .collect();
            out.reaction.push(r);
            out.sign.push(sign);
            out.reversible.push(allowed[r].both());
            out.columns.push(local);
        }
        out.row_count = row_of.len();
        out
    }

    fn len(&self) -> usize {
        self.reaction.len()
    }

    /// The LP skeleton: oriented fluxes in the normalised box and the
    /// steady-state rows, over the local columns with `keep_local`.
    fn flux_lp(&self, sense: Sense, keep_local: &[bool]) -> (LinearProgram, Vec<Option<Var>>) {
        let mut lp = LinearProgram::new(sense);
        let vars: Vec<Option<Var>> = (0..self.len())
            .map(|k| {
                keep_local[k].then(|| {
                    let lower = if self.reversible[k] { -FLUX_BOX } else { 0.0 };
                    lp.add_variable(0.0, lower, FLUX_BOX)
                })
            })
            .collect();
        let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); self.row_count];
        for (k, column) in self.columns.iter().enumerate() {
            if let Some(var) = vars[k] {
                for &(i, c) in column {
                    rows[i].push((var, c));
                }
            }
        }
        for row in rows.iter().filter(|r| !r.is_empty()) {
            lp.add_row(row, Relation::Equal, 0.0);
        }
        (lp, vars)
    }
}

/// Sign observations of local fluxes: seen positive / seen negative.
struct Seen {
    positive: Vec<bool>,
    negative: Vec<bool>,
}

impl Seen {
    fn record(&mut self, k: usize, value: f64) {
        if value >= FLUX_NONZERO {
            self.positive[k] = true;
        } else if value <= -FLUX_NONZERO {
            self.negative[k] = true;
        }
    }
}

/// Decides, for every reaction, the directions in which it can carry flux
/// in the cone given by `columns` and `allowed` (directions already pruned).
pub fn capable_directions(
    columns: &[Vec<(usize, f64)>],
    allowed: &[Directions],
) -> Result<Capability, LpError> {
    let keep = vec![true; columns.len()];
    let net = Oriented::new(columns, allowed, &keep);
    let n = net.len();
    let mut lp_solves = 0;
    let mut seen = Seen {
        positive: vec![false; n],
        negative: vec![false; n],
    };

    // Step 1: FASTCC-style rounds over the irreversible reactions.
    let all = vec![true; n];
    let mut targets: Vec<usize> = (0..n).filter(|&k| !net.reversible[k]).collect();
    let mut interior = vec![0.0; n];
    while !targets.is_empty() {
        let (mut lp, vars) = net.flux_lp(Sense::Maximise, &all);
        for &k in &targets {
            let z = lp.add_variable(1.0, 0.0, FASTCC_EPSILON);
            let v = vars[k].expect("all local columns kept");
            lp.add_row(&[(z, 1.0), (v, -1.0)], Relation::LessOrEqual, 0.0);
        }
        let solution = lp.solve()?;
        lp_solves += 1;
        if solution.objective < FLUX_NONZERO {
            break;
        }
        for k in 0..n {
            let value = solution.value(vars[k].expect("kept"));
            seen.record(k, value);
            interior[k] += value;
        }
        let before = targets.len();
        targets.retain(|&k| !seen.positive[k]);
        if targets.len() == before {
            // Objective spread too thin to read: settle the rest one by one.
            lp_solves += single_irreversible_checks(&net, &targets, &mut seen, &mut interior)?;
            break;
        }
    }
    let irreversible_capable: Vec<bool> = (0..n)
        .map(|k| !net.reversible[k] && seen.positive[k])
        .collect();

    // Step 2: null space of the matrix without blocked irreversible columns.
    let in_reduced: Vec<bool> = (0..n)
        .map(|k| net.reversible[k] || irreversible_capable[k])
        .collect();
    let reduced_index: Vec<usize> = (0..n).filter(|&k| in_reduced[k]).collect();
    let reduced_columns: Vec<Vec<(usize, f64)>> = reduced_index
        .iter()
        .map(|&k| net.columns[k].clone())
        .collect();
    let elimination = Elimination::new(net.row_count, &reduced_columns);
    let mut rng = fastrand::Rng::with_seed(RANDOM_SEED);
    let samples: Vec<Vec<f64>> = (0..NULLSPACE_SAMPLES)
        .map(|_| {
            let free: Vec<f64> = (0..elimination.nullity())
                .map(|_| rng.f64() * 2.0 - 1.0)
                .collect();
            let w = elimination.null_vector(&free);
            let largest = w.iter().map(|x| x.abs()).fold(0.0, f64::max);
            if largest > 0.0 {
                w.iter().map(|x| x / largest).collect()
            } else {
                w
            }
        })
        .collect();
    let mut null_nonzero = vec![false; n];
    for (local, &k) in reduced_index.iter().enumerate() {
        null_nonzero[k] = samples.iter().any(|w| w[local].abs() >= NULLSPACE_NONZERO);
    }
    let reversible_decided_by_null_space = (0..n)
        .filter(|&k| net.reversible[k] && !null_nonzero[k])
        .count();

    // Step 3a: signs along v° ± t·w, t up to where an irreversible flux hits 0.
    for w in &samples {
        for direction in [1.0, -1.0] {
            let mut t_max = f64::INFINITY;
            for (local, &k) in reduced_index.iter().enumerate() {
                let step = direction * w[local];
                if !net.reversible[k] && step < 0.0 {
                    t_max = t_max.min(interior[k] / -step);
                }
            }
            let t = if t_max.is_finite() { 0.9 * t_max } else { 1.0 };
            for (local, &k) in reduced_index.iter().enumerate() {
                if net.reversible[k] && null_nonzero[k] {
                    seen.record(k, interior[k] + t * direction * w[local]);
                }
            }
        }
    }

    // Step 3b: full coupling to a capable irreversible reaction fixes the sign.
    let mut impossible_positive = vec![false; n];
    let mut impossible_negative = vec![false; n];
    let coupling_key = |local: usize| -> Option<Vec<f64>> {
        let row: Vec<f64> = samples.iter().map(|w| w[local]).collect();
        let pivot = row.iter().copied().find(|x| x.abs() >= NULLSPACE_NONZERO)?;
        Some(row.iter().map(|x| x / pivot).collect())
    };
    let mut irreversible_rows: Vec<(Vec<f64>, f64, usize)> = Vec::new();
    for (local, &k) in reduced_index.iter().enumerate() {
        if !net.reversible[k] {
            if let Some(key) = coupling_key(local) {
                let pivot = samples
                    .iter()
                    .map(|w| w[local])
                    .find(|x| x.abs() >= NULLSPACE_NONZERO)
                    .expect("key exists");
                irreversible_rows.push((key, pivot, k));
            }
        }
    }
    irreversible_rows.sort_by(|a, b| compare_keys(&a.0, &b.0));
    for (local, &k) in reduced_index.iter().enumerate() {
        if !net.reversible[k] || !null_nonzero[k] || (seen.positive[k] && seen.negative[k]) {
            continue;
        }
        let Some(key) = coupling_key(local) else {
            continue;
        };
        let position = irreversible_rows.partition_point(|row| compare_keys(&row.0, &key).is_lt());
        for candidate in irreversible_rows[position..]
            .iter()
            .take_while(|row| keys_match(&row.0, &key))
            .take(1)
        {
            let own_pivot = samples
                .iter()
                .map(|w| w[local])
                .find(|x| x.abs() >= NULLSPACE_NONZERO)
                .expect("key exists");
            // u_k = (own_pivot / candidate_pivot)·u_p with u_p ≥ 0.
            if own_pivot / candidate.1 > 0.0 {
                impossible_negative[k] = true;
            } else {
                impossible_positive[k] = true;
            }
        }
    }

    // Step 3c: one warm-started LP per direction still open.
    let mut open: Vec<(usize, f64)> = Vec::new();
    for k in 0..n {
        if net.reversible[k] && null_nonzero[k] {
            if !seen.positive[k] && !impossible_positive[k] {
                open.push((k, 1.0));
            }
            if !seen.negative[k] && !impossible_negative[k] {
                open.push((k, -1.0));
            }
        }
    }
    let direction_lps = open.len();
    if !open.is_empty() {
        lp_solves += direction_checks(&net, &in_reduced, &open, &mut seen)?;
    }

    let mut capable = vec![Directions::NONE; columns.len()];
    for k in 0..n {
        let (positive, negative) = if net.reversible[k] {
            (
                null_nonzero[k] && seen.positive[k],
                null_nonzero[k] && seen.negative[k],
            )
        } else {
            (irreversible_capable[k], false)
        };
        let (forward, backward) = if net.sign[k] > 0.0 {
            (positive, negative)
        } else {
            (negative, positive)
        };
        capable[net.reaction[k]] = Directions { forward, backward };
    }
    Ok(Capability {
        capable,
        lp_solves,
        reversible_decided_by_null_space,
        direction_lps,
    })
}

fn compare_keys(a: &[f64], b: &[f64]) -> std::cmp::Ordering {
    for (x, y) in a.iter().zip(b) {
        if (x - y).abs() > COUPLING_MATCH * x.abs().max(y.abs()).max(1.0) {
            return x.total_cmp(y);
        }
    }
    std::cmp::Ordering::Equal
}

fn keys_match(a: &[f64], b: &[f64]) -> bool {
    compare_keys(a, b).is_eq()
}

/// Fallback when a FASTCC round cannot be read: max min(u_k, ε) for each
/// remaining irreversible target on its own. Returns the number of solves.
fn single_irreversible_checks(
    net: &Oriented,
    targets: &[usize],
    seen: &mut Seen,
    interior: &mut [f64],
) -> Result<usize, LpError> {
    let keep = vec![true; net.len()];
    let mut solves = 0;
    for &k in targets {
        if seen.positive[k] {
            continue;
        }
        let (mut single, vars) = net.flux_lp(Sense::Maximise, &keep);
        let t = single.add_variable(1.0, 0.0, FASTCC_EPSILON);
        let u = vars[k].expect("kept");
        single.add_row(&[(t, 1.0), (u, -1.0)], Relation::LessOrEqual, 0.0);
        let solution = single.solve()?;
        solves += 1;
        if solution.objective >= FLUX_NONZERO {
            for (j, var) in vars.iter().enumerate() {
                let value = solution.value(var.expect("kept"));
                seen.record(j, value);
                interior[j] += value;
            }
        }
    }
    Ok(solves)
}

/// Settles the open (reaction, sign) pairs: max t with t ≤ sign·u_k, gated so
/// that one LP serves all pairs. Each pair has a gate g ∈ [0, 2] in the row
/// t − sign·u_k − g ≤ 0; with the gate free the row never binds (t ≤ ε and
/// |u| ≤ 1), fixing it at 0 makes it the question for that pair.
fn direction_checks(
    net: &Oriented,
    in_reduced: &[bool],
    open: &[(usize, f64)],
    seen: &mut Seen,
) -> Result<usize, LpError> {
    let (mut lp, vars) = net.flux_lp(Sense::Maximise, in_reduced);
    let t = lp.add_variable(1.0, 0.0, FASTCC_EPSILON);
    let gates: Vec<Var> = open
        .iter()
        .map(|&(k, sign)| {
            let gate = lp.add_variable(0.0, 0.0, 2.0 * FLUX_BOX);
            let u = vars[k].expect("open pairs are in the reduced problem");
            lp.add_row(
                &[(t, 1.0), (u, -sign), (gate, -1.0)],
                Relation::LessOrEqual,
                0.0,
            );
            gate
        })
        .collect();
    let mut session = LpSession::start(&lp)?;
    let mut solves = 1;
    for (&(k, sign), &gate) in open.iter().zip(&gates) {
        let already = if sign > 0.0 {
            seen.positive[k]
        } else {
            seen.negative[k]
        };
        if already {
            continue;
        }
        let solution = session.fix(gate, 0.0)?.clone();
        solves += 1;
        if solution.objective >= FLUX_NONZERO {
            for (j, var) in vars.iter().enumerate() {
                if let Some(var) = var {
                    seen.record(j, solution.value(*var));
                }
            }
        }
        session.release(gate)?;
        solves += 1;
    }
    Ok(solves)
}
