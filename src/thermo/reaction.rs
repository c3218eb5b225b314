//! Reaction energies and ΔG' ranges.
