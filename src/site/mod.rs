//! Rendering a Report into a static site (the full renderer lands on its own branch).

use crate::error::{Error, Result};
use crate::report::Report;
use std::path::Path;

pub fn render(report: &Report, _theme_dir: Option<&Path>, out: &Path) -> Result<()> {
    std::fs::create_dir_all(out).map_err(|e| Error::io(out, e))?;
    let path = out.join("report.json");
    std::fs::write(&path, crate::report::json::to_json(report)).map_err(|e| Error::io(&path, e))
}
