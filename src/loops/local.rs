//! Loops searched near their target first.
//!
//! Most elementary loops of a genome-scale model are short and local (a
//! transport pair with a co-transported ion, a carrier shuttle). Restricting
//! the loop LP to the columns a few steps from the target keeps every other
//! flux at zero, so any loop it finds is a loop of the whole network, and a
//! vertex of the small LP is an elementary mode of the whole network too (a
//! loop with a smaller support would lie in the same column set). A small LP
//! solved from scratch is far cheaper than a re-solve of the whole network;
//! when the neighbourhood holds no loop the caller falls back to the global
//! LP, so coverage is unchanged. Metabolites shared by many columns (protons,
//! water, ATP) stay balanced but are not walked through, or every
//! neighbourhood would be the whole network. The columns of the loops listed
//! just before join each neighbourhood: loops of one family (one lipid
//! species after another through the same ATP-driven cycle) share a far part
//! no short walk reaches.
//!
//! The loop found is L1-minimal within the neighbourhood, not always within
//! the whole network; any elementary loop through the target serves the
//! cover, and each is checked back like every other.

use super::compress::Merged;
use crate::lp::{LinearProgram, LpError, Relation, Sense};

/// Neighbourhoods tried in turn before the global LP: per step out from the
/// target, the largest number of merged columns a metabolite may be in and
/// still be walked through (more: balanced but not walked, as currency
/// metabolites should be; common practice, the counts are ours).
const STEPS: [&[usize]; 3] = [&[80], &[80, 16], &[80, 80]];

/// A neighbourhood larger than this goes straight to the global LP.
const MAX_COLUMNS: usize = 1500;

/// Neighbourhood searches tried before their success rate is judged.
const TRIAL_SEARCHES: usize = 32;

/// Below this share of searches that found a loop, the rest of the targets go
/// straight to the global LP: in a model whose loops run through currency
/// metabolites (lipid models where every loop uses the ATP machinery) the
/// neighbourhood rarely holds one, and each miss costs a small LP.
const MIN_SUCCESS_SHARE: f64 = 0.25;

/// How the neighbourhood searches have fared so far. Updated in target
/// order, so the choice to keep searching does not depend on timing.
#[derive(Debug, Default)]
pub struct Record {
    tried: usize,
    found: usize,
}

impl Record {
    pub fn worth_trying(&self) -> bool {
        self.tried < TRIAL_SEARCHES || self.found as f64 >= MIN_SUCCESS_SHARE * self.tried as f64
    }

    /// Counts one search's outcome.
    pub fn note(&mut self, found: bool) {
        self.tried += 1;
        self.found += usize::from(found);
    }
}

/// Merged columns per metabolite, and which metabolites are hubs.
pub struct Neighbourhoods {
    columns_of: Vec<Vec<usize>>,
}

impl Neighbourhoods {
    pub fn new(metabolite_count: usize, merged: &[Merged]) -> Neighbourhoods {
        let mut columns_of = vec![Vec::new(); metabolite_count];
        for (j, column) in merged.iter().enumerate() {
            for &(m, _) in &column.column {
                columns_of[m].push(j);
            }
        }
        Neighbourhoods { columns_of }
    }

    /// Columns reached from `target` in one step per entry of `walk` (a
    /// step through metabolites in at most that many columns), sorted, or
    /// none when that is more than `MAX_COLUMNS`.
    fn around(
        &self,
        merged: &[Merged],
        target: usize,
        walk: &[usize],
        shared: &[usize],
    ) -> Option<Vec<usize>> {
        let mut seen = std::collections::BTreeSet::from([target]);
        let mut frontier = vec![target];
        for &hub in walk {
            let mut next = Vec::new();
            for &j in &frontier {
                for &(m, _) in &merged[j].column {
                    if self.columns_of[m].len() > hub {
                        continue;
                    }
                    for &k in &self.columns_of[m] {
                        if seen.insert(k) {
                            next.push(k);
                        }
                    }
                }
            }
            if seen.len() > MAX_COLUMNS {
                return None;
            }
            if next.is_empty() {
                break;
            }
            frontier = next;
        }
        seen.extend(shared);
        Some(seen.into_iter().collect())
    }
}

/// Merged (column, λ) of a flux.
type Flux = Vec<(usize, f64)>;

/// The L1-minimal loop through `target` within its neighbourhoods, each
/// joined by the `shared` columns (target at +1 first, then −1, per
/// neighbourhood), as merged (column, λ), or none.
pub fn local_loop(
    metabolite_count: usize,
    merged: &[Merged],
    near: &Neighbourhoods,
    target: usize,
    shared: &[usize],
) -> Result<Option<Flux>, LpError> {
    first_found(merged, near, target, shared, |columns| {
        for sign in [1.0, -1.0] {
            if !merged[target].allowed.allows(sign) {
                continue;
            }
            let found = solve_within(metabolite_count, merged, columns, (target, sign), None)?;
            if found.is_some() {
                return Ok(found);
            }
        }
        Ok(None)
    })
}

/// A flux through merged column `target` with sign `sign` (λ_target =
/// sign) within its neighbourhoods, with the `forbidden` (column, sign), if
/// any, not used, as merged (column, λ), or none. For the constraint re-checks:
/// a flux found here answers "still looping" without the global LP.
pub fn flux_avoiding(
    metabolite_count: usize,
    merged: &[Merged],
    near: &Neighbourhoods,
    (target, sign): (usize, f64),
    forbidden: Option<(usize, f64)>,
) -> Result<Option<Flux>, LpError> {
    first_found(merged, near, target, &[], |columns| {
        solve_within(metabolite_count, merged, columns, (target, sign), forbidden)
    })
}

/// `solve` over each neighbourhood of `target` in turn (`STEPS`, each
/// joined by `shared`; one the same size as the last is skipped), up to the
/// first answer.
fn first_found(
    merged: &[Merged],
    near: &Neighbourhoods,
    target: usize,
    shared: &[usize],
    mut solve: impl FnMut(&[usize]) -> Result<Option<Flux>, LpError>,
) -> Result<Option<Flux>, LpError> {
    let mut tried = 0;
    for walk in STEPS {
        let Some(columns) = near.around(merged, target, walk, shared) else {
            break;
        };
        if columns.len() == tried {
            continue; // the same set as the smaller neighbourhood
        }
        tried = columns.len();
        if let Some(found) = solve(&columns)? {
            return Ok(Some(found));
        }
    }
    Ok(None)
}

/// min Σ weight·|λ| over `columns` with S·λ = 0 and λ_target = sign, the
/// `forbidden` (column, sign) left out.
fn solve_within(
    metabolite_count: usize,
    merged: &[Merged],
    columns: &[usize],
    (target, sign): (usize, f64),
    forbidden: Option<(usize, f64)>,
) -> Result<Option<Flux>, LpError> {
    let mut lp = LinearProgram::new(Sense::Minimise);
    let mut rows: Vec<Vec<(crate::lp::Var, f64)>> = vec![Vec::new(); metabolite_count];
    let mut parts = Vec::with_capacity(columns.len());
    for &j in columns {
        let column = &merged[j];
        let weight: f64 = column.members.iter().map(|(_, f)| f.abs()).sum();
        let (forward, backward) = if j == target {
            // The target is fixed at ±1: one part with both bounds at 1.
            if sign > 0.0 {
                (Some(lp.add_variable(weight, 1.0, 1.0)), None)
            } else {
                (None, Some(lp.add_variable(weight, 1.0, 1.0)))
            }
        } else {
            let usable = |s: f64| column.allowed.allows(s) && forbidden != Some((j, s));
            (
                usable(1.0).then(|| lp.add_variable(weight, 0.0, f64::INFINITY)),
                usable(-1.0).then(|| lp.add_variable(weight, 0.0, f64::INFINITY)),
            )
        };
        for &(m, c) in &column.column {
            if let Some(p) = forward {
                rows[m].push((p, c));
            }
            if let Some(n) = backward {
                rows[m].push((n, -c));
            }
        }
        parts.push((j, forward, backward));
    }
    for row in rows.iter().filter(|row| !row.is_empty()) {
        lp.add_row(row, Relation::Equal, 0.0);
    }
    let solution = match lp.solve() {
        Ok(solution) => solution,
        Err(LpError::Infeasible) => return Ok(None),
        Err(other) => return Err(other),
    };
    let lambdas = parts
        .iter()
        .map(|&(j, p, n)| {
            let value = p.map_or(0.0, |p| solution.value(p)) - n.map_or(0.0, |n| solution.value(n));
            (j, value)
        })
        .filter(|(_, lambda)| *lambda != 0.0)
        .collect();
    Ok(Some(lambdas))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::loops::network::Directions;

    fn column(entries: &[(usize, f64)], reaction: usize, allowed: Directions) -> Merged {
        Merged {
            column: entries.to_vec(),
            members: vec![(reaction, 1.0)],
            allowed,
        }
    }

    /// S·λ over the merged columns.
    fn residual(merged: &[Merged], lambdas: &[(usize, f64)], metabolites: usize) -> f64 {
        let mut balance = vec![0.0; metabolites];
        for &(j, lambda) in lambdas {
            for &(m, c) in &merged[j].column {
                balance[m] += c * lambda;
            }
        }
        balance.iter().map(|b: &f64| b.abs()).fold(0.0, f64::max)
    }

    // Two transporters of one solute with opposite proton coupling form a
    // loop (a futile transport cycle; common practice): 0 = A_out, 1 = A_in,
    // 2 = H_out, 3 = H_in. T1: A_out + H_out → A_in + H_in (symport);
    // T2: A_in → A_out (uniport, reversible). T1 forward with T2 forward
    // leaves the protons unbalanced, so the loop needs the proton leak
    // L: H_in → H_out too.
    fn symport_network() -> Vec<Merged> {
        vec![
            column(
                &[(0, -1.0), (1, 1.0), (2, -1.0), (3, 1.0)],
                0,
                Directions::FORWARD,
            ),
            column(&[(0, 1.0), (1, -1.0)], 1, Directions::BOTH),
            column(&[(2, 1.0), (3, -1.0)], 2, Directions::BOTH),
        ]
    }

    #[test]
    fn finds_the_loop_through_the_target_in_its_neighbourhood() {
        let merged = symport_network();
        let near = Neighbourhoods::new(4, &merged);
        let found = local_loop(4, &merged, &near, 0, &[]).unwrap().unwrap();
        // T1 + T2 + L, each at 1: the L1-minimal (and only) loop.
        assert_eq!(found, vec![(0, 1.0), (1, 1.0), (2, 1.0)]);
        assert_eq!(residual(&merged, &found, 4), 0.0);
        // The reversible uniport as target: the same loop, with the
        // uniport forward (A_in → A_out), the direction tried first.
        let found = local_loop(4, &merged, &near, 1, &[]).unwrap().unwrap();
        assert_eq!(found, vec![(0, 1.0), (1, 1.0), (2, 1.0)]);
    }

    #[test]
    fn a_loop_only_through_a_hub_is_left_to_the_global_lp() {
        // The proton pair (2, 3) is shared by 100 more columns, so it is
        // not walked through: from T1 the leak is out of reach, and the
        // search says no loop (the caller then asks the whole network).
        let mut merged = symport_network();
        for k in 0..100 {
            let own = 4 + k;
            merged.push(column(
                &[(2, 1.0), (3, 1.0), (own, 1.0)],
                3 + k,
                Directions::FORWARD,
            ));
        }
        // The leak's two metabolites are hubs now; T1 reaches T2 over A.
        let near = Neighbourhoods::new(104, &merged);
        assert_eq!(local_loop(104, &merged, &near, 0, &[]).unwrap(), None);
        // With the leak among the shared columns (a loop listed just
        // before used it), the loop is found again.
        let found = local_loop(104, &merged, &near, 0, &[2]).unwrap().unwrap();
        assert_eq!(found, vec![(0, 1.0), (1, 1.0), (2, 1.0)]);
        assert_eq!(residual(&merged, &found, 104), 0.0);
    }

    #[test]
    fn a_forbidden_direction_is_left_out_of_the_neighbourhood_flux() {
        let merged = symport_network();
        let near = Neighbourhoods::new(4, &merged);
        // Forbidding the leak's backward direction leaves the loop (it
        // uses the leak forward); forbidding the symport forward, the only
        // way the symport runs, leaves the uniport no flux.
        let found = flux_avoiding(4, &merged, &near, (1, 1.0), Some((2, -1.0))).unwrap();
        assert_eq!(found, Some(vec![(0, 1.0), (1, 1.0), (2, 1.0)]));
        let found = flux_avoiding(4, &merged, &near, (1, 1.0), Some((0, 1.0))).unwrap();
        assert_eq!(found, None);
    }

    #[test]
    fn searching_stops_when_few_searches_find_a_loop() {
        let mut record = Record::default();
        for _ in 0..TRIAL_SEARCHES {
            assert!(record.worth_trying());
            record.note(false);
        }
        assert!(!record.worth_trying());
        // A quarter found keeps the searches going.
        let mut record = Record::default();
        for k in 0..TRIAL_SEARCHES {
            record.note(k % 4 == 0);
        }
        assert!(record.worth_trying());
    }
}
