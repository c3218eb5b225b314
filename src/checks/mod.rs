//! Checks: one file per check.
