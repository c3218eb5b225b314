//! CSV side tables. A flux scenario table has a header `reaction,flux` and
//! one row per reaction; blank lines and `#` comments are ignored.

use super::units::{self, Kind, RawQuantity};
use crate::error::Diagnostic;
use std::collections::HashMap;
use std::path::Path;

/// Read `reaction,flux` rows. All problems are reported, each with its line.
pub fn read_flux_csv(
    path: &Path,
    reaction_ids: &HashMap<String, usize>,
) -> Result<Vec<(usize, f64)>, Vec<Diagnostic>> {
    let mut reader = match csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .from_path(path)
    {
        Ok(r) => r,
        Err(e) => {
            return Err(vec![Diagnostic::new(
                path,
                format!("cannot read flux table: {}", io_text(&e)),
            )])
        }
    };
    let headers = match reader.headers() {
        Ok(h) => h.clone(),
        Err(e) => return Err(vec![csv_error(path, &e)]),
    };
    let column = |name: &str| headers.iter().position(|h| h == name);
    let (Some(rc), Some(fc)) = (column("reaction"), column("flux")) else {
        return Err(vec![Diagnostic::new(
            path,
            format!(
                "expected a header with columns `reaction` and `flux`, found `{}`",
                headers.iter().collect::<Vec<_>>().join(",")
            ),
        )
        .at(1, 1)]);
    };
    let mut rows = Vec::new();
    let mut problems = Vec::new();
    for record in reader.records() {
        let record = match record {
            Ok(r) => r,
            Err(e) => {
                problems.push(csv_error(path, &e));
                continue;
            }
        };
        let line = record.position().map(|p| p.line() as usize).unwrap_or(0);
        let id = record.get(rc).unwrap_or("");
        let flux_text = record.get(fc).unwrap_or("");
        let Some(&idx) = reaction_ids.get(id) else {
            let mut d = Diagnostic::new(path, format!("unknown reaction `{id}`")).at(line, 1);
            if let Some(best) =
                super::schema::did_you_mean(id, reaction_ids.keys().map(String::as_str))
            {
                d = d.hint(format!("did you mean `{best}`?"));
            }
            problems.push(d);
            continue;
        };
        match units::parse(&RawQuantity::Text(flux_text.to_string()), Kind::Flux) {
            Ok(v) => rows.push((idx, v)),
            Err(e) => {
                problems.push(Diagnostic::new(path, format!("flux of `{id}`: {e}")).at(line, 1))
            }
        }
    }
    if problems.is_empty() {
        Ok(rows)
    } else {
        Err(problems)
    }
}

fn csv_error(path: &Path, e: &csv::Error) -> Diagnostic {
    let d = Diagnostic::new(path, format!("malformed CSV: {}", io_text(e)));
    match e.position() {
        Some(p) => d.at(p.line() as usize, 1),
        None => d,
    }
}

fn io_text(e: &csv::Error) -> String {
    match e.kind() {
        csv::ErrorKind::Io(io) => io.to_string(),
        _ => e.to_string(),
    }
}
