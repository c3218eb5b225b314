//! Exact null-space vector of a loop's support, in rational arithmetic.
//!
//! The simplex works in floating point; on nearly degenerate supports (a few
//! columns that almost, but not exactly, cancel) its vertex can be far from
//! any steady state even though the support itself is a genuine elementary
//! loop. Given the support, the loop is determined up to scale by the
//! stoichiometry alone: the null space of the support's columns is one-
//! dimensional exactly when the support is elementary. This module computes
//! that vector exactly (Gauss–Jordan elimination over the rationals, common
//! practice), so a loop found by the LP can be repaired rather than reported
//! with a large residual.
//!
//! Coefficients enter as the decimal numbers a model states: each `f64` is
//! read back through its shortest round-trip decimal (Rust's `Display`), so
//! `0.1` is 1/10 and not the binary fraction nearest to it.

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};
use std::collections::BTreeMap;

/// The exact decimal a finite `f64` prints as (`None` for NaN or ±∞).
pub fn decimal(x: f64) -> Option<BigRational> {
    if !x.is_finite() {
        return None;
    }
    let text = format!("{x}");
    let (negative, digits) = match text.strip_prefix('-') {
        Some(rest) => (true, rest),
        None => (false, text.as_str()),
    };
    let (whole, fraction) = digits.split_once('.').unwrap_or((digits, ""));
    let numerator: BigInt = format!("{whole}{fraction}").parse().ok()?;
    let denominator = num_traits::pow(BigInt::from(10), fraction.len());
    let value = BigRational::new(numerator, denominator);
    Some(if negative { -value } else { value })
}

/// The null-space vector of the matrix given by its columns (row index,
/// value), as coprime integers with the first nonzero entry positive, when
/// the null space is exactly one-dimensional; `None` otherwise (or when a
/// coefficient is not finite).
pub fn unique_null_vector(columns: &[Vec<(usize, f64)>]) -> Option<Vec<BigInt>> {
    let n = columns.len();
    if n == 0 {
        return None;
    }
    // Dense rows over the metabolites the support touches.
    let mut row_of: BTreeMap<usize, usize> = BTreeMap::new();
    for column in columns {
        for &(m, _) in column {
            let next = row_of.len();
            row_of.entry(m).or_insert(next);
        }
    }
    let mut rows = vec![vec![BigRational::zero(); n]; row_of.len()];
    for (j, column) in columns.iter().enumerate() {
        for &(m, v) in column {
            rows[row_of[&m]][j] += decimal(v)?;
        }
    }
    // Gauss–Jordan to reduced row echelon form.
    let mut pivot_of_row: Vec<usize> = Vec::new();
    let mut rank = 0;
    for col in 0..n {
        let Some(p) = (rank..rows.len()).find(|&i| !rows[i][col].is_zero()) else {
            continue;
        };
        rows.swap(rank, p);
        let pivot = rows[rank][col].clone();
        for v in rows[rank].iter_mut() {
            *v = &*v / &pivot;
        }
        let pivot_row = rows[rank].clone();
        for (i, row) in rows.iter_mut().enumerate() {
            if i == rank || row[col].is_zero() {
                continue;
            }
            let factor = row[col].clone();
            for (v, p) in row.iter_mut().zip(&pivot_row) {
                if !p.is_zero() {
                    *v -= &factor * p;
                }
            }
        }
        pivot_of_row.push(col);
        rank += 1;
        if rank == rows.len() {
            break;
        }
    }
    if rank + 1 != n {
        return None;
    }
    let free = (0..n).find(|j| !pivot_of_row.contains(j))?;
    let mut x = vec![BigRational::zero(); n];
    x[free] = BigRational::one();
    for (i, &col) in pivot_of_row.iter().enumerate() {
        x[col] = -rows[i][free].clone();
    }
    // Coprime integers: multiply by the lcm of denominators, divide by the gcd.
    let lcm = x.iter().fold(BigInt::one(), |acc, v| {
        num_integer::Integer::lcm(&acc, v.denom())
    });
    let mut ints: Vec<BigInt> = x
        .iter()
        .map(|v| (v * BigRational::from_integer(lcm.clone())).to_integer())
        .collect();
    let gcd = ints
        .iter()
        .fold(BigInt::zero(), |acc, v| num_integer::Integer::gcd(&acc, v));
    if gcd.is_zero() {
        return None;
    }
    for v in &mut ints {
        *v = &*v / &gcd;
    }
    if ints
        .iter()
        .find(|v| !v.is_zero())
        .is_some_and(|v| v.is_negative())
    {
        for v in &mut ints {
            *v = -&*v;
        }
    }
    Some(ints)
}

/// An integer as `f64` (`None` when out of range).
pub fn to_f64(v: &BigInt) -> Option<f64> {
    v.to_f64().filter(|x| x.is_finite())
}

#[cfg(test)]
mod tests {
    use super::*;

    // Decimal reading (common practice): 0.1 is 1/10 exactly, −2.5 is −5/2.
    #[test]
    fn reads_the_printed_decimal() {
        assert_eq!(
            decimal(0.1),
            Some(BigRational::new(BigInt::from(1), BigInt::from(10)))
        );
        assert_eq!(
            decimal(-2.5),
            Some(BigRational::new(BigInt::from(-5), BigInt::from(2)))
        );
        assert_eq!(decimal(1e-7).map(|r| r.to_f64()), Some(Some(1e-7)));
        assert_eq!(decimal(f64::NAN), None);
    }

    // Steady-state balance by hand: A → B, B → 2 C, C → ½ A balances as
    // (2, 2, 4) / 2 = (1, 1, 2); one column fewer leaves no null space and
    // a repeated column leaves a two-dimensional one.
    #[test]
    fn null_vector_of_a_three_step_cycle() {
        let columns = vec![
            vec![(0, -1.0), (1, 1.0)],
            vec![(1, -1.0), (2, 2.0)],
            vec![(2, -1.0), (0, 0.5)],
        ];
        let v = unique_null_vector(&columns).unwrap();
        assert_eq!(v, vec![BigInt::from(1), BigInt::from(1), BigInt::from(2)]);
        assert_eq!(unique_null_vector(&columns[..2]), None);
        let mut doubled = columns.clone();
        doubled.push(columns[0].clone());
        assert_eq!(unique_null_vector(&doubled), None);
    }

    // Decimals that cancel exactly only as decimals: 0.1 + 0.2 = 0.3 (in
    // binary floating point the sum misses 0.3 by one unit in the last place).
    #[test]
    fn decimal_coefficients_cancel_exactly() {
        let columns = vec![vec![(0, 0.1)], vec![(0, 0.2)], vec![(0, -0.3)]];
        // Null space of a 1 × 3 row is two-dimensional: none unique.
        assert_eq!(unique_null_vector(&columns), None);
        let columns = vec![
            vec![(0, 0.1), (1, 1.0)],
            vec![(0, 0.2), (1, 1.0)],
            vec![(0, -0.3), (1, -2.0)],
        ];
        let v = unique_null_vector(&columns).unwrap();
        assert_eq!(v, vec![BigInt::from(1), BigInt::from(1), BigInt::from(1)]);
    }
}
