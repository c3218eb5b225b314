//! Every numerical tolerance of the scenario analyses, in one place.

/// A scenario is feasible when its max-min driving force reaches the
/// required force within this many kJ/mol (the solver works to ~1e-9 on
/// rows of order RT; 1e-6 kJ/mol is far below any meaningful energy).
pub const DECIDE_KJ: f64 = 1e-6;

/// An LP answer substituted back into its constraints may miss them by at
/// most this much (kJ/mol, or ln units for concentration bounds).
pub const SUBSTITUTION_KJ: f64 = 1e-6;

/// Relative disagreement allowed between the MDF LP and its dual.
pub const DUALITY_GAP_KJ: f64 = 1e-6;

/// A row weight (dual value) above this counts as binding.
pub const BINDING_WEIGHT: f64 = 1e-7;

/// Fluxes smaller than this (relative to the largest given flux) are zero
/// in the loop-law analysis.
pub const FLUX_ZERO: f64 = 1e-9;
