//! Quantities written with units in the value (`1 mM`, `-30.5 kJ/mol`,
//! `37 °C`, `150 mV`). A bare number means the documented default unit of
//! the quantity kind. Every value is converted to the internal unit of
//! `model.rs` on the way in.

use serde::Deserialize;

/// A quantity as written in YAML: a bare number or a string with a unit.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(untagged)]
pub enum RawQuantity {
    Number(f64),
    Text(String),
}

/// The kinds of quantity the model format knows, each with its units.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// Internal unit kJ/mol; bare numbers are kJ/mol.
    Energy,
    /// Internal unit mol/L; bare numbers are mol/L (M).
    Concentration,
    /// Internal unit K; bare numbers are K.
    Temperature,
    /// Internal unit mV; bare numbers are mV.
    Potential,
    /// Ionic strength, internal unit mol/L; bare numbers are mol/L.
    IonicStrength,
    /// Flux or bound in the model's flux units; no unit accepted.
    Flux,
    /// pH, pMg, confidence: no unit accepted.
    Plain,
}

impl Kind {
    /// What a user may write, for error messages.
    pub fn expected(self) -> &'static str {
        match self {
            Kind::Energy => {
                "an energy such as `-30.5 kJ/mol` or `-7.3 kcal/mol` (bare number: kJ/mol)"
            }
            Kind::Concentration | Kind::IonicStrength => {
                "a concentration such as `1 mM`, `50 uM` or `0.2 M` (bare number: M)"
            }
            Kind::Temperature => "a temperature such as `310.15 K` or `37 °C` (bare number: K)",
            Kind::Potential => {
                "an electrical potential such as `-150 mV` or `-0.15 V` (bare number: mV)"
            }
            Kind::Flux => "a plain number (flux units)",
            Kind::Plain => "a plain number",
        }
    }
}

/// Convert a written quantity to the internal unit of `kind`.
/// The error text says what was expected.
pub fn parse(raw: &RawQuantity, kind: Kind) -> Result<f64, String> {
    let value = match raw {
        RawQuantity::Number(n) => *n,
        RawQuantity::Text(text) => parse_text(text, kind)?,
    };
    if value.is_finite() {
        Ok(value)
    } else {
        Err(format!("value is not finite; expected {}", kind.expected()))
    }
}

fn parse_text(text: &str, kind: Kind) -> Result<f64, String> {
    let trimmed = text.trim();
    let (number, unit) = split_number(trimmed)
        .ok_or_else(|| format!("cannot read `{text}`; expected {}", kind.expected()))?;
    let unit = unit.trim();
    let factor_or_offset = unit_conversion(kind, unit).ok_or_else(|| {
        if unit.is_empty() {
            format!("cannot read `{text}`; expected {}", kind.expected())
        } else {
            format!(
                "unknown unit `{unit}` in `{text}`; expected {}",
                kind.expected()
            )
        }
    })?;
    Ok(match factor_or_offset {
        Conversion::Scale(f) => number * f,
        Conversion::Offset(o) => number + o,
    })
}

enum Conversion {
    Scale(f64),
    Offset(f64),
}

/// Split a leading number (with a Unicode minus accepted) from its unit.
fn split_number(text: &str) -> Option<(f64, &str)> {
    let normalised_minus = text.starts_with('−');
    let body = if normalised_minus {
        &text['−'.len_utf8()..]
    } else {
        text
    };
    let end = body
        .char_indices()
        .find(|&(i, c)| {
            !(c.is_ascii_digit()
                || c == '.'
                || c == '+'
                || (c == '-' && i == 0)
                || ((c == 'e' || c == 'E') && is_exponent(body, i))
                || (c == '-' && i > 0 && matches!(body.as_bytes()[i - 1], b'e' | b'E')))
        })
        .map(|(i, _)| i)
        .unwrap_or(body.len());
    let number: f64 = body[..end].parse().ok()?;
    let number = if normalised_minus { -number } else { number };
    Some((number, &body[end..]))
}

/// `e` at `i` starts an exponent only when a digit or sign follows it.
fn is_exponent(body: &str, i: usize) -> bool {
    let rest = &body.as_bytes()[i + 1..];
    match rest.first() {
        Some(b'0'..=b'9') => true,
        Some(b'+' | b'-') => matches!(rest.get(1), Some(b'0'..=b'9')),
        _ => false,
    }
}

/// 1 thermochemical calorie = 4.184 J exactly (common practice; ISO 80000-5).
const KCAL_IN_KJ: f64 = 4.184;

fn unit_conversion(kind: Kind, unit: &str) -> Option<Conversion> {
    use Conversion::{Offset, Scale};
    let c = match kind {
        Kind::Energy => match unit {
            "" | "kJ/mol" | "kJ mol-1" | "kJ·mol⁻¹" => Scale(1.0),
            "J/mol" => Scale(1e-3),
            "kcal/mol" => Scale(KCAL_IN_KJ),
            "cal/mol" => Scale(KCAL_IN_KJ * 1e-3),
            _ => return None,
        },
        Kind::Concentration | Kind::IonicStrength => match unit {
            "" | "M" | "mol/L" | "mol/l" => Scale(1.0),
            "mM" | "mmol/L" | "mmol/l" => Scale(1e-3),
            "uM" | "µM" | "μM" | "umol/L" | "µmol/L" => Scale(1e-6),
            "nM" | "nmol/L" => Scale(1e-9),
            "pM" => Scale(1e-12),
            _ => return None,
        },
        Kind::Temperature => match unit {
            "" | "K" => Scale(1.0),
            "°C" | "C" | "degC" | "℃" => Offset(273.15),
            _ => return None,
        },
        Kind::Potential => match unit {
            "" | "mV" => Scale(1.0),
            "V" => Scale(1e3),
            _ => return None,
        },
        Kind::Flux | Kind::Plain => match unit {
            "" => Scale(1.0),
            _ => return None,
        },
    };
    Some(c)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn text(s: &str, kind: Kind) -> Result<f64, String> {
        parse(&RawQuantity::Text(s.to_string()), kind)
    }

    fn close(a: f64, b: f64) -> bool {
        (a - b).abs() <= 1e-12 * b.abs().max(1.0)
    }

    #[test]
    fn concentrations_convert_to_molar() {
        assert!(close(text("1 mM", Kind::Concentration).unwrap(), 1e-3));
        assert!(close(text("50 uM", Kind::Concentration).unwrap(), 50e-6));
        assert!(close(text("50 µM", Kind::Concentration).unwrap(), 50e-6));
        assert!(close(
            text("2.5e-3 M", Kind::Concentration).unwrap(),
            2.5e-3
        ));
        assert!(close(text("0.2", Kind::Concentration).unwrap(), 0.2));
        assert!(close(
            parse(&RawQuantity::Number(0.01), Kind::Concentration).unwrap(),
            0.01
        ));
    }

    #[test]
    fn energies_convert_to_kj_per_mol() {
        assert!(close(text("-30.5 kJ/mol", Kind::Energy).unwrap(), -30.5));
        assert!(close(text("−30.5 kJ/mol", Kind::Energy).unwrap(), -30.5));
        // 1 kcal = 4.184 kJ (thermochemical calorie; common practice):
        // −7.3 kcal/mol = −30.5432 kJ/mol.
        assert!(close(
            text("-7.3 kcal/mol", Kind::Energy).unwrap(),
            -30.5432
        ));
        assert!(close(text("1500 J/mol", Kind::Energy).unwrap(), 1.5));
    }

    #[test]
    fn temperatures_and_potentials() {
        // 0 °C = 273.15 K by definition of the Celsius scale.
        assert!(close(text("37 °C", Kind::Temperature).unwrap(), 310.15));
        assert!(close(text("25 C", Kind::Temperature).unwrap(), 298.15));
        assert!(close(text("298.15 K", Kind::Temperature).unwrap(), 298.15));
        assert!(close(text("150 mV", Kind::Potential).unwrap(), 150.0));
        assert!(close(text("-0.15 V", Kind::Potential).unwrap(), -150.0));
    }

    #[test]
    fn bad_values_say_what_was_expected() {
        let e = text("1 parsec", Kind::Concentration).unwrap_err();
        assert!(e.contains("unknown unit `parsec`"), "{e}");
        assert!(e.contains("1 mM"), "{e}");
        let e = text("mM", Kind::Concentration).unwrap_err();
        assert!(e.contains("cannot read `mM`"), "{e}");
        assert!(text("3 kJ/mol", Kind::Concentration).is_err());
        assert!(text("5 mM", Kind::Plain).is_err());
        assert!(text("1e", Kind::Concentration).is_err());
        assert!(parse(&RawQuantity::Number(f64::NAN), Kind::Energy).is_err());
    }
}
