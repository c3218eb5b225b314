//! gibbsite: a static report on the thermodynamic consistency of a metabolic
//! model.
//!
//! The pipeline runs one way (see DEVELOPERS.md), driven by [`pipeline`]:
//! `project` (load) → [`model::Model`] → [`network::Network`] →
//! [`analysis`] → [`checks`] ([`finding::Finding`]) → [`report::Report`] →
//! [`site`] (render).

pub mod analysis;
pub mod checks;
pub mod chem;
pub mod collection;
pub mod error;
pub mod finding;
pub mod loops;
pub mod lp;
pub mod model;
pub mod network;
pub mod number_text;
pub mod outcome;
pub mod pipeline;
pub mod progress;
pub mod project;
pub mod report;
pub mod scenarios;
pub mod site;
pub mod slug;
pub mod thermo;

pub use error::{Diagnostic, Error, Result};
pub use project::Project;
pub use report::Report;
