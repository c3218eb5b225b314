//! Checks: one file per check.

pub mod balance;
