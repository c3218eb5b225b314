//! SBML import (being written on its own branch).

use crate::error::{Diagnostic, Error, Result};
use crate::model::Model;
use std::path::Path;

pub fn read_sbml(path: &Path) -> Result<Model> {
    Err(Error::input(Diagnostic::new(
        path,
        "SBML import is not available yet",
    )))
}
