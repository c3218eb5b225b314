//! Conditions outside the range where the thermodynamic model holds, once
//! per compartment:
//!
//! - ionic strength above 0.35 M: the extended Debye–Hückel equation with
//!   B = 1.6 is meant for about 0 – 0.35 M (Alberty 2003, *Thermodynamics of
//!   Biochemical Reactions*; the limit from memory);
//! - temperature outside 273.15 – 313.15 K: temperature effects use ΔfH°
//!   with ΔCp = 0 and the book's RTα(T) polynomial, fitted over 0 – 40 °C
//!   (Alberty 2003, pp. 49, 266 and 268: Table 3.1 and the fitted values
//!   are printed for 273.15 – 313.15 K);
//! - pH outside 5 – 9 where the built-in library supplies data: the library
//!   is checked against printed values at pH 5 – 9 only (Alberty 2003, pp.
//!   79, 220, 290).

use super::{evidence, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "validity",
    title: "Validity of the conditions",
    description: "Ionic strength, temperature and pH of each compartment must lie where the Debye–Hückel, Gibbs–Helmholtz and library data hold.",
    kinds: &["condition-outside-range"],
    run,
};

/// Upper end of the extended Debye–Hückel equation's range, mol/L.
pub const MAX_IONIC_STRENGTH_M: f64 = 0.35;
/// Temperatures covered by the book's fitted functions, K.
pub const TEMPERATURE_RANGE_K: (f64, f64) = (273.15, 313.15);
/// pH range over which the library is checked against printed values.
pub const LIBRARY_PH_RANGE: (f64, f64) = (5.0, 9.0);

fn run(analysis: &Analysis) -> Vec<Finding> {
    let model = analysis.model;
    let mut out = Vec::new();
    for (k, c) in model.compartments.iter().enumerate() {
        let t = model.compartment_temperature(k);
        let mut problems = Vec::new();
        let mut ev = Vec::new();
        if c.ionic_strength_m > MAX_IONIC_STRENGTH_M {
            problems.push(format!(
                "ionic strength {} M is above {MAX_IONIC_STRENGTH_M} M, the range of the extended Debye–Hückel equation used for every transformed ΔfG'° and proton term",
                c.ionic_strength_m
            ));
            ev.push(("ionic_strength", c.ionic_strength_m));
        }
        if t < TEMPERATURE_RANGE_K.0 - 1e-9 || t > TEMPERATURE_RANGE_K.1 + 1e-9 {
            problems.push(format!(
                "temperature {t} K is outside {}–{} K, where ΔCp = 0 and the fitted RTα(T) hold",
                TEMPERATURE_RANGE_K.0, TEMPERATURE_RANGE_K.1
            ));
            ev.push(("temperature", t));
        }
        let library_users: Vec<&str> = model
            .metabolites
            .iter()
            .enumerate()
            .filter(|(i, m)| {
                // The library supplies (or would supply) its data.
                m.compartment == k
                    && analysis.metabolites[*i].library_key.is_some()
                    && m.dfg_prime.is_none()
                    && m.species.is_none()
            })
            .map(|(_, m)| m.id.as_str())
            .collect();
        if !library_users.is_empty() && (c.ph < LIBRARY_PH_RANGE.0 || c.ph > LIBRARY_PH_RANGE.1) {
            problems.push(format!(
                "pH {} is outside {}–{}, where the built-in library is checked against printed values ({} from the library)",
                c.ph,
                LIBRARY_PH_RANGE.0,
                LIBRARY_PH_RANGE.1,
                library_users.join(", ")
            ));
            ev.push(("ph", c.ph));
        }
        if problems.is_empty() {
            continue;
        }
        out.push(Finding {
            kind: "condition-outside-range".into(),
            severity: Severity::Warning,
            subjects: vec![c.id.clone()],
            scenario: None,
            message: format!(
                "compartment {}: {}; energies computed there are extrapolations",
                c.id,
                problems.join("; ")
            ),
            evidence: evidence(&ev),
        });
    }
    out
}
