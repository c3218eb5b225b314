//! Which reactions can carry flux in a closed network, and in which
//! directions: exact, with few LPs.
//!
//! All bounds include zero, so only their signs matter and the question is
//! about the cone C = {v : S·v = 0, v_r ≥ 0 for forward-only r, v_r ≤ 0 for
//! backward-only r}. The method:
//!
//! 0. Linear chains are compressed (`compress`, exact).
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
//! 3. Directions of reversible reactions, on the network of the reactions
//!    found in 1–2, compressed again (the blocked ones gone, many more chains
//!    appear): read off v° and v° ± t·w; a reversible column whose
//!    null-space row is a multiple of an irreversible column's row (fully
//!    coupled) has only that sign; what remains gets one feasibility LP per
//!    direction (flux fixed at ±1 in the unboxed cone), warm-started, each
//!    solution settling every other direction it shows.

use super::compress::{compress, Compressed};
use super::network::Directions;
use super::nullspace::Elimination;
use super::tolerance::{
    COUPLING_MATCH, FASTCC_EPSILON, FASTCC_SETTLED, FLUX_NONZERO, NULLSPACE_NONZERO,
    NULLSPACE_SAMPLES, RANDOM_SEED,
};
use crate::lp::{LinearProgram, LpError, LpSession, LpSolution, Relation, Sense, Var};
use std::collections::BTreeMap;

/// Result of the capability analysis, indexed like the input.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Capability {
    /// Per reaction: directions in which it can carry nonzero flux.
    pub capable: Vec<Directions>,
    /// Number of LP solves (fresh or warm edits).
    pub lp_solves: usize,
    /// Reversible reactions shown blocked by the null-space test.
    pub reversible_blocked_by_null_space: usize,
    /// Directions of reversible (merged) columns that needed their own LP.
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
    fn new(columns: &[Vec<(usize, f64)>], allowed: &[Directions]) -> Oriented {
        let mut row_of: BTreeMap<usize, usize> = BTreeMap::new();
        let mut out = Oriented {
            reaction: Vec::new(),
            sign: Vec::new(),
            reversible: Vec::new(),
            columns: Vec::new(),
            row_count: 0,
        };
        for (r, column) in columns.iter().enumerate() {
            if !allowed[r].any() {
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

    /// The LP skeleton over the local columns with `keep_local`: oriented
    /// fluxes, unbounded on their open side (the cone itself; a box only
    /// adds bound-flipping work for the simplex), and the steady-state rows.
    /// A column marked in `split` is written as z + s with z ∈ [0, ε]
    /// carrying cost 1 and s ≥ 0: the FASTCC objective Σ min(v, ε) without
    /// an extra row per target, which keeps the LP basis small.
    fn flux_lp(&self, keep_local: &[bool], split: &[bool]) -> FluxLp {
        let mut lp = LinearProgram::new(Sense::Maximise);
        let parts: Vec<Vec<Var>> = (0..self.len())
            .map(|k| {
                if !keep_local[k] {
                    Vec::new()
                } else if split[k] {
                    vec![
                        lp.add_variable(1.0, 0.0, FASTCC_EPSILON),
                        lp.add_variable(0.0, 0.0, f64::INFINITY),
                    ]
                } else {
                    let lower = if self.reversible[k] {
                        f64::NEG_INFINITY
                    } else {
                        0.0
                    };
                    vec![lp.add_variable(0.0, lower, f64::INFINITY)]
                }
            })
            .collect();
        let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); self.row_count];
        for (k, column) in self.columns.iter().enumerate() {
            for &var in &parts[k] {
                for &(i, c) in column {
                    rows[i].push((var, c));
                }
            }
        }
        for row in rows.iter().filter(|r| !r.is_empty()) {
            lp.add_row(row, Relation::Equal, 0.0);
        }
        FluxLp { lp, parts }
    }
}

/// An LP over oriented fluxes; a flux may be the sum of several variables.
struct FluxLp {
    lp: LinearProgram,
    parts: Vec<Vec<Var>>,
}

impl FluxLp {
    /// Flux of local column `k` in a solution (0 when not in the LP).
    fn flux(&self, solution: &LpSolution, k: usize) -> f64 {
        self.parts[k].iter().map(|&v| solution.value(v)).sum()
    }

    /// The single variable of an unsplit column.
    fn var(&self, k: usize) -> Option<Var> {
        match self.parts[k][..] {
            [v] => Some(v),
            _ => None,
        }
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
/// in the cone given by `columns` and `allowed`.
pub fn capable_directions(
    columns: &[Vec<(usize, f64)>],
    allowed: &[Directions],
) -> Result<Capability, LpError> {
    let metabolite_count = columns
        .iter()
        .flatten()
        .map(|(m, _)| m + 1)
        .max()
        .unwrap_or(0);
    let mut result = Capability {
        capable: vec![Directions::NONE; columns.len()],
        ..Capability::default()
    };

    // Stages 1 and 2: which reactions carry flux at all.
    let first = compress(metabolite_count, columns, allowed);
    let support = support_of(&first, &mut result)?;
    let mut support_allowed = vec![Directions::NONE; columns.len()];
    let mut interior = vec![0.0; columns.len()];
    for (j, merged) in first.merged.iter().enumerate() {
        if support.carries[j] {
            for &(r, factor) in &merged.members {
                support_allowed[r] = follow(merged.allowed, factor);
                interior[r] = factor * support.interior[j];
            }
        }
    }

    // Stage 3: directions, on the support compressed again.
    let second = compress(metabolite_count, columns, &support_allowed);
    let second_interior: Vec<f64> = second
        .merged
        .iter()
        .map(|m| {
            let (r, factor) = m.members[0];
            interior[r] / factor
        })
        .collect();
    let directions = directions_of(&second, &second_interior, &mut result)?;
    result.capable = second.expand(&directions, columns.len());
    Ok(result)
}

/// Directions of a member reaction that follows a merged flux with `factor`.
fn follow(directions: Directions, factor: f64) -> Directions {
    if factor > 0.0 {
        directions
    } else {
        Directions {
            forward: directions.backward,
            backward: directions.forward,
        }
    }
}

fn merged_network(compressed: &Compressed) -> Oriented {
    let columns: Vec<Vec<(usize, f64)>> =
        compressed.merged.iter().map(|m| m.column.clone()).collect();
    let allowed: Vec<Directions> = compressed.merged.iter().map(|m| m.allowed).collect();
    let net = Oriented::new(&columns, &allowed);
    // Merged columns all have a direction, so local index = merged index.
    debug_assert_eq!(net.len(), compressed.merged.len());
    net
}

/// Which merged columns carry flux, and a flux (merged coordinates) with
/// every capable irreversible column strictly inside its direction.
struct Support {
    carries: Vec<bool>,
    interior: Vec<f64>,
}

fn support_of(compressed: &Compressed, result: &mut Capability) -> Result<Support, LpError> {
    let net = merged_network(compressed);
    let n = net.len();
    let mut seen = Seen {
        positive: vec![false; n],
        negative: vec![false; n],
    };

    // Step 1: FASTCC-style LP over the irreversible columns. In the
    // unboxed cone every capable target can reach z = ε at once (add the
    // fluxes that show each one and scale up), so the optimum is ε times the
    // number of capable targets and every optimal solution has z = ε on each
    // of them: one proven-optimal solve settles all targets whose z is 0 or ε.
    // Only if round-off leaves a z in between does another round follow.
    let all = vec![true; n];
    let mut targets: Vec<usize> = (0..n).filter(|&k| !net.reversible[k]).collect();
    let mut interior = vec![0.0; n];
    while !targets.is_empty() {
        let mut split = vec![false; n];
        for &k in &targets {
            split[k] = true;
        }
        let fastcc = net.flux_lp(&all, &split);
        let solution = fastcc.lp.solve()?;
        result.lp_solves += 1;
        if solution.objective < FLUX_NONZERO {
            break;
        }
        for (k, value) in interior.iter_mut().enumerate() {
            let flux = fastcc.flux(&solution, k);
            seen.record(k, flux);
            *value += flux;
        }
        let settled = targets.iter().all(|&k| {
            let z = solution.value(fastcc.parts[k][0]);
            z <= FLUX_NONZERO || z >= FASTCC_EPSILON * (1.0 - FASTCC_SETTLED)
        });
        let before = targets.len();
        targets.retain(|&k| !seen.positive[k]);
        if settled {
            break;
        }
        if targets.len() == before {
            // Objective spread too thin to read: settle the rest one by one.
            result.lp_solves +=
                single_irreversible_checks(&net, &targets, &mut seen, &mut interior)?;
            break;
        }
    }
    let mut carries: Vec<bool> = (0..n)
        .map(|k| !net.reversible[k] && seen.positive[k])
        .collect();

    // Step 2: reversible columns by the null space without blocked columns.
    let reduced: Vec<usize> = (0..n)
        .filter(|&k| net.reversible[k] || carries[k])
        .collect();
    let samples = null_space_samples(&net, &reduced);
    for (local, &k) in reduced.iter().enumerate() {
        if net.reversible[k] {
            carries[k] = samples.iter().any(|w| w[local].abs() >= NULLSPACE_NONZERO);
            if !carries[k] {
                result.reversible_blocked_by_null_space += 1;
            }
        }
    }
    Ok(Support {
        carries,
        interior: (0..n).map(|k| net.sign[k] * interior[k]).collect(),
    })
}

/// A few random null-space vectors of the columns `reduced` of `net`, each
/// scaled to largest |coordinate| 1, indexed like `reduced`.
fn null_space_samples(net: &Oriented, reduced: &[usize]) -> Vec<Vec<f64>> {
    let columns: Vec<Vec<(usize, f64)>> = reduced.iter().map(|&k| net.columns[k].clone()).collect();
    let elimination = Elimination::new(net.row_count, &columns);
    let mut rng = fastrand::Rng::with_seed(RANDOM_SEED);
    (0..NULLSPACE_SAMPLES)
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
        .collect()
}

/// Capable directions of every merged column of a network in which every
/// column carries flux; `interior` (merged coordinates) is a flux of the
/// cone with the irreversible columns strictly inside their direction.
fn directions_of(
    compressed: &Compressed,
    interior: &[f64],
    result: &mut Capability,
) -> Result<Vec<Directions>, LpError> {
    let net = merged_network(compressed);
    let n = net.len();
    let oriented: Vec<f64> = (0..n).map(|k| net.sign[k] * interior[k]).collect();
    let mut seen = Seen {
        positive: vec![false; n],
        negative: vec![false; n],
    };
    for (k, &value) in oriented.iter().enumerate() {
        seen.record(k, value);
    }
    let everything: Vec<usize> = (0..n).collect();
    let samples = null_space_samples(&net, &everything);

    // Signs along v° ± t·w, t up to where an irreversible flux hits 0.
    for w in &samples {
        for direction in [1.0, -1.0] {
            let mut t_max = f64::INFINITY;
            for k in 0..n {
                let step = direction * w[k];
                if !net.reversible[k] && step < 0.0 {
                    t_max = t_max.min(oriented[k].max(0.0) / -step);
                }
            }
            let t = if t_max.is_finite() { 0.9 * t_max } else { 1.0 };
            for k in 0..n {
                if net.reversible[k] {
                    seen.record(k, oriented[k] + t * direction * w[k]);
                }
            }
        }
    }

    // A null-space vector of the reversible columns alone is a loop that
    // runs both ways (it and its negative lie in the cone).
    let reversible: Vec<usize> = (0..n).filter(|&k| net.reversible[k]).collect();
    for w in null_space_samples(&net, &reversible) {
        for (local, &k) in reversible.iter().enumerate() {
            if w[local].abs() >= NULLSPACE_NONZERO {
                seen.positive[k] = true;
                seen.negative[k] = true;
            }
        }
    }

    // Full coupling to an irreversible column fixes the sign.
    let (impossible_positive, impossible_negative) = coupled_signs(&net, &samples, &seen);

    let mut open: Vec<(usize, f64)> = Vec::new();
    for k in 0..n {
        if net.reversible[k] {
            if !seen.positive[k] && !impossible_positive[k] {
                open.push((k, 1.0));
            }
            if !seen.negative[k] && !impossible_negative[k] {
                open.push((k, -1.0));
            }
        }
    }
    result.direction_lps += open.len();
    if !open.is_empty() {
        result.lp_solves += direction_checks(&net, &open, &mut seen)?;
    }
    Ok((0..n)
        .map(|k| {
            let (positive, negative) = if net.reversible[k] {
                (seen.positive[k], seen.negative[k])
            } else {
                (true, false)
            };
            if net.sign[k] > 0.0 {
                Directions {
                    forward: positive,
                    backward: negative,
                }
            } else {
                Directions {
                    forward: negative,
                    backward: positive,
                }
            }
        })
        .collect())
}

/// Reversible columns whose null-space row is a multiple of an irreversible
/// column's row: u_k = c·u_p with u_p ≥ 0, so u_k has the sign of c only.
/// Returns (positive impossible, negative impossible) per column.
fn coupled_signs(net: &Oriented, samples: &[Vec<f64>], seen: &Seen) -> (Vec<bool>, Vec<bool>) {
    let n = net.len();
    let mut impossible_positive = vec![false; n];
    let mut impossible_negative = vec![false; n];
    let pivot_of = |k: usize| {
        samples
            .iter()
            .map(|w| w[k])
            .find(|x| x.abs() >= NULLSPACE_NONZERO)
    };
    let key_of = |k: usize| -> Option<(Vec<f64>, f64)> {
        let pivot = pivot_of(k)?;
        Some((samples.iter().map(|w| w[k] / pivot).collect(), pivot))
    };
    let mut irreversible_rows: Vec<(Vec<f64>, f64)> = (0..n)
        .filter(|&k| !net.reversible[k])
        .filter_map(key_of)
        .collect();
    irreversible_rows.sort_by(|a, b| compare_keys(&a.0, &b.0));
    for k in 0..n {
        if !net.reversible[k] || (seen.positive[k] && seen.negative[k]) {
            continue;
        }
        let Some((key, own_pivot)) = key_of(k) else {
            continue;
        };
        let position = irreversible_rows.partition_point(|row| compare_keys(&row.0, &key).is_lt());
        if let Some((candidate, pivot)) = irreversible_rows.get(position) {
            if keys_match(candidate, &key) {
                if own_pivot / pivot > 0.0 {
                    impossible_negative[k] = true;
                } else {
                    impossible_positive[k] = true;
                }
            }
        }
    }
    (impossible_positive, impossible_negative)
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
        let mut split = vec![false; net.len()];
        split[k] = true;
        let single = net.flux_lp(&keep, &split);
        let solution = single.lp.solve()?;
        solves += 1;
        if solution.objective >= FLUX_NONZERO {
            for (j, value) in interior.iter_mut().enumerate() {
                let flux = single.flux(&solution, j);
                seen.record(j, flux);
                *value += flux;
            }
        }
    }
    Ok(solves)
}

/// Settles the open (column, sign) pairs on the unboxed cone: fixing the
/// flux at ±1 is feasible exactly when that direction is possible (scale any
/// flux of that sign). One warm-started session serves all pairs; a fix the
/// solver proves infeasible settles the pair as impossible.
fn direction_checks(
    net: &Oriented,
    open: &[(usize, f64)],
    seen: &mut Seen,
) -> Result<usize, LpError> {
    let keep = vec![true; net.len()];
    let split = vec![false; net.len()];
    let cone = net.flux_lp(&keep, &split);
    let mut session = LpSession::start(&cone.lp)?;
    let mut solves = 1;
    for &(k, sign) in open {
        let already = if sign > 0.0 {
            seen.positive[k]
        } else {
            seen.negative[k]
        };
        if already {
            continue;
        }
        let var = cone.var(k).expect("columns are not split here");
        let attempt = session.fix(var, sign).cloned();
        solves += 1;
        match attempt {
            Ok(solution) => {
                for j in 0..net.len() {
                    seen.record(j, cone.flux(&solution, j));
                }
                session.release(var)?;
                solves += 1;
            }
            Err(LpError::Infeasible) => {}
            Err(other) => return Err(other),
        }
    }
    Ok(solves)
}
