//! Chemistry helpers that do not depend on the model: chemical formulas.

pub mod formula;

pub use formula::{parse_formula, Formula, FormulaError};
