//! Every numerical tolerance of the loop analyses, in one place.
//!
//! Capability questions do not depend on the size of the flux bounds: every
//! bound of the closed network includes zero, so a reaction can carry flux
//! within its bounds exactly when it can carry flux in the cone cut out by
//! the signs the bounds allow (scale any flux down until it fits). The LPs
//! therefore work in that cone, unbounded; flux thresholds below are
//! relative to the FASTCC level ε.

/// The ε of the FASTCC-style LP (Vlassis et al., PLoS Comput. Biol. 10 (2014)
/// e1003424): the LP maximises Σ min(vᵢ, ε) over the irreversible targets.
/// In the unbounded cone its size only sets the scale of the solution.
pub const FASTCC_EPSILON: f64 = 1e-3;

/// A FASTCC target whose min(v, ε) is within this fraction of ε (or below
/// [`FLUX_NONZERO`]) is settled by the optimality argument of `capable`.
pub const FASTCC_SETTLED: f64 = 1e-6;

/// A flux at least this large counts as carried: ten times the solver's
/// feasibility tolerance (1e-7), so solver round-off is never read as flux,
/// and 1/1000 of the FASTCC level ε.
pub const FLUX_NONZERO: f64 = 1e-6;

/// Entries of the eliminated stoichiometric matrix at most this fraction of
/// its largest entry are cancellation residue and dropped (exact
/// cancellation of small integer coefficients leaves ~1e-16).
pub const ELIMINATION_DROP: f64 = 1e-9;

/// Only entries at least this fraction of the largest entry in their row may
/// serve as pivots (threshold partial pivoting: bounds element growth).
pub const PIVOT_THRESHOLD: f64 = 0.1;

/// A coordinate of a random null-space vector counts as nonzero when its
/// magnitude is at least this fraction of the vector's largest coordinate.
/// Coordinates that vanish identically on the null space come out as exact
/// zeros or round-off near 1e-15; genuine ones are of order one.
pub const NULLSPACE_NONZERO: f64 = 1e-9;

/// Number of random null-space vectors drawn. A coordinate that is nonzero
/// on the null space vanishes on a random vector with probability zero; more
/// vectors guard against unlucky round-off and make coupling tests reliable.
pub const NULLSPACE_SAMPLES: usize = 4;

/// Two reactions count as fully coupled when their normalised null-space
/// rows agree to this relative tolerance.
pub const COUPLING_MATCH: f64 = 1e-8;

/// Loop verification: |S·v| per metabolite, relative to the largest
/// |S_mr·v_r| term, must not exceed this.
pub const LOOP_RESIDUAL: f64 = 1e-7;

/// Loop coefficients are rounded to integers when every scaled coefficient
/// lies this close (relative) to an integer, trying multipliers up to
/// [`INTEGER_MULTIPLIER_MAX`].
pub const INTEGER_SNAP: f64 = 1e-6;

/// Largest multiplier tried when turning loop coefficients into integers.
pub const INTEGER_MULTIPLIER_MAX: u32 = 12;

/// Seed of the random null-space vectors: fixed, so reports are reproducible.
pub const RANDOM_SEED: u64 = 0x6769_6262_7369_7465;

/// Round-off allowance (kJ/mol) when a loop's ΔrG'° sum is compared with
/// k·σ, so that σ = 0 data that cancel exactly are not flagged.
pub const ENERGY_SUM_ROUNDOFF: f64 = 1e-6;

/// Two merged columns count as proportional (a two-reaction loop read off
/// the structure) when every coefficient matches the factor to this
/// relative tolerance; the loop is verified afterwards like any other.
pub const PROPORTIONAL_MATCH: f64 = 1e-9;

/// Normalised coefficients are rounded to multiples of 1/this to group
/// candidate proportional columns (a grouping key only).
pub const PROPORTIONAL_KEY_SCALE: f64 = 1e6;
