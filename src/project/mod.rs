//! Loading a project folder: the only code that reads user files.

pub mod sbml;

/// A loaded project (placeholder until the loader lands).
pub struct Project;
