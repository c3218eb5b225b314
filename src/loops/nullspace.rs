//! Null space of a sparse stoichiometric matrix by sparse Gaussian
//! elimination (Markowitz pivot order with threshold partial pivoting).
//!
//! The pure-Rust linear-algebra crates factor square or full-rank sparse
//! matrices; the question here needs a rank-revealing elimination of a
//! rectangular, rank-deficient one, so this module does that elimination
//! itself. Each pivot expresses one reaction flux through fluxes not yet
//! eliminated; the reactions never chosen as pivots are free. Any choice of
//! free fluxes, back-substituted, gives a null-space vector, and the null
//! space has dimension = number of free reactions.

use super::tolerance::{ELIMINATION_DROP, PIVOT_THRESHOLD};
use std::collections::BTreeSet;

/// One elimination step: `coef·x[pivot] + Σ row = 0`.
#[derive(Debug, Clone)]
struct Pivot {
    column: usize,
    coefficient: f64,
    /// Remaining entries of the pivot row (columns other than `column`).
    rest: Vec<(usize, f64)>,
}

/// The eliminated form of a matrix with `column_count` columns.
#[derive(Debug, Clone)]
pub struct Elimination {
    column_count: usize,
    /// In elimination order; back substitution runs in reverse.
    pivots: Vec<Pivot>,
    /// Columns never chosen as pivot, ascending.
    free: Vec<usize>,
}

impl Elimination {
    /// Eliminates the matrix given by its columns (row index, value); rows
    /// are numbered `0..row_count`.
    pub fn new(row_count: usize, columns: &[Vec<(usize, f64)>]) -> Elimination {
        let column_count = columns.len();
        let scale = columns
            .iter()
            .flatten()
            .map(|(_, v)| v.abs())
            .fold(0.0, f64::max);
        let drop = ELIMINATION_DROP * scale;
        // Rows as sorted sparse vectors, columns as the set of rows using them.
        let mut rows: Vec<Vec<(usize, f64)>> = vec![Vec::new(); row_count];
        for (j, column) in columns.iter().enumerate() {
            for &(i, v) in column {
                if v.abs() > drop {
                    rows[i].push((j, v));
                }
            }
        }
        for row in &mut rows {
            row.sort_by_key(|(j, _)| *j);
            merge_duplicates(row);
        }
        let mut column_rows: Vec<BTreeSet<usize>> = vec![BTreeSet::new(); column_count];
        for (i, row) in rows.iter().enumerate() {
            for &(j, _) in row {
                column_rows[j].insert(i);
            }
        }
        let mut by_length: BTreeSet<(usize, usize)> = rows
            .iter()
            .enumerate()
            .filter(|(_, r)| !r.is_empty())
            .map(|(i, r)| (r.len(), i))
            .collect();
        let mut is_pivot = vec![false; column_count];
        let mut pivots = Vec::new();

        while let Some((_, i)) = by_length.pop_first() {
            let row = std::mem::take(&mut rows[i]);
            for &(j, _) in &row {
                column_rows[j].remove(&i);
            }
            if row.is_empty() {
                continue;
            }
            // Markowitz: among entries large enough to pivot on, take the
            // column used by the fewest other rows (least fill-in).
            let largest = row.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
            let &(pivot_column, pivot_value) = row
                .iter()
                .filter(|(_, v)| v.abs() >= PIVOT_THRESHOLD * largest)
                .min_by_key(|(j, _)| (column_rows[*j].len(), *j))
                .expect("a nonempty row has an entry of maximal magnitude");
            is_pivot[pivot_column] = true;
            let targets: Vec<usize> = column_rows[pivot_column].iter().copied().collect();
            for k in targets {
                let factor = value_at(&rows[k], pivot_column) / pivot_value;
                by_length.remove(&(rows[k].len(), k));
                let old: Vec<usize> = rows[k].iter().map(|(j, _)| *j).collect();
                let updated = axpy(&rows[k], &row, -factor, pivot_column, drop);
                for j in old {
                    column_rows[j].remove(&k);
                }
                for &(j, _) in &updated {
                    column_rows[j].insert(k);
                }
                rows[k] = updated;
                if !rows[k].is_empty() {
                    by_length.insert((rows[k].len(), k));
                }
            }
            pivots.push(Pivot {
                column: pivot_column,
                coefficient: pivot_value,
                rest: row
                    .into_iter()
                    .filter(|(j, _)| *j != pivot_column)
                    .collect(),
            });
        }
        let free = (0..column_count).filter(|&j| !is_pivot[j]).collect();
        Elimination {
            column_count,
            pivots,
            free,
        }
    }

    /// Dimension of the null space.
    pub fn nullity(&self) -> usize {
        self.free.len()
    }

    /// The null-space vector with the given values on the free columns (in
    /// the order of [`Elimination::free_columns`]).
    pub fn null_vector(&self, free_values: &[f64]) -> Vec<f64> {
        let mut x = vec![0.0; self.column_count];
        for (&j, &value) in self.free.iter().zip(free_values) {
            x[j] = value;
        }
        for pivot in self.pivots.iter().rev() {
            let sum: f64 = pivot.rest.iter().map(|&(j, v)| v * x[j]).sum();
            x[pivot.column] = -sum / pivot.coefficient;
        }
        x
    }
}

fn merge_duplicates(row: &mut Vec<(usize, f64)>) {
    row.dedup_by(|later, earlier| {
        if later.0 == earlier.0 {
            earlier.1 += later.1;
            true
        } else {
            false
        }
    });
    row.retain(|(_, v)| *v != 0.0);
}

fn value_at(row: &[(usize, f64)], column: usize) -> f64 {
    row.binary_search_by_key(&column, |(j, _)| *j)
        .map(|p| row[p].1)
        .unwrap_or(0.0)
}

/// `target + factor·source`, with the pivot column removed exactly and
/// cancellation residue dropped.
fn axpy(
    target: &[(usize, f64)],
    source: &[(usize, f64)],
    factor: f64,
    pivot_column: usize,
    drop: f64,
) -> Vec<(usize, f64)> {
    let mut out = Vec::with_capacity(target.len() + source.len());
    let (mut a, mut b) = (0, 0);
    while a < target.len() || b < source.len() {
        let (j, v) = match (target.get(a), source.get(b)) {
            (Some(&(ja, va)), Some(&(jb, vb))) if ja == jb => {
                a += 1;
                b += 1;
                (ja, va + factor * vb)
            }
            (Some(&(ja, va)), Some(&(jb, _))) if ja < jb => {
                a += 1;
                (ja, va)
            }
            (Some(&(ja, va)), None) => {
                a += 1;
                (ja, va)
            }
            (_, Some(&(jb, vb))) => {
                b += 1;
                (jb, factor * vb)
            }
            (None, None) => break,
        };
        if j != pivot_column && v.abs() > drop {
            out.push((j, v));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn residual(columns: &[Vec<(usize, f64)>], rows: usize, x: &[f64]) -> f64 {
        let mut r = vec![0.0; rows];
        for (j, column) in columns.iter().enumerate() {
            for &(i, v) in column {
                r[i] += v * x[j];
            }
        }
        r.iter().map(|v| v.abs()).fold(0.0, f64::max)
    }

    // Linear algebra fact (common practice): a 3-cycle A→B→C→A has a
    // one-dimensional null space spanned by (1, 1, 1).
    #[test]
    fn three_cycle_has_nullity_one() {
        let columns = vec![
            vec![(0, -1.0), (1, 1.0)],
            vec![(1, -1.0), (2, 1.0)],
            vec![(2, -1.0), (0, 1.0)],
        ];
        let e = Elimination::new(3, &columns);
        assert_eq!(e.nullity(), 1);
        let x = e.null_vector(&[2.0]);
        assert!(x.iter().all(|v| (v - 2.0).abs() < 1e-12));
    }

    // Rank–nullity (common practice): a chain A→B→C with no return has
    // rank 2 and nullity 0 over 2 columns; a dependent row changes nothing.
    #[test]
    fn chain_has_trivial_null_space_and_dependent_rows_are_dropped() {
        let columns = vec![vec![(0, -1.0), (1, 1.0)], vec![(1, -1.0), (2, 1.0)]];
        let e = Elimination::new(3, &columns);
        assert_eq!(e.nullity(), 0);

        // A → 2 B, B → A, B → C, C → E, 2 E → C (columns 0..5; A=0 B=1 C=2 E=3).
        let columns = vec![
            vec![(0, -1.0), (1, 2.0)],
            vec![(1, -1.0), (0, 1.0)],
            vec![(1, -1.0), (2, 1.0)],
            vec![(2, -1.0), (3, 1.0)],
            vec![(3, -2.0), (2, 1.0)],
        ];
        let e = Elimination::new(4, &columns);
        assert_eq!(e.nullity(), 1);
        let x = e.null_vector(&[1.0]);
        assert!(residual(&columns, 4, &x) < 1e-12);
        // Flux ratios of the only closed cycle: v1 = v2 = v3 = v4/2 ... all nonzero.
        assert!(x.iter().all(|v| v.abs() > 1e-9));
    }
}
