//! Numbers written for people, in every output that shows them (pages,
//! root-cause sentences): a real minus sign (U+2212, which does not break
//! across lines and reads as one), concentrations with SI prefixes and very
//! large or small numbers in scientific notation with superscript exponents
//! (no markup, so the output is a plain string an HTML auto-escaper leaves
//! alone).

/// U+2212 MINUS SIGN.
const MINUS: char = '\u{2212}';
/// Shown where a number is missing or not finite.
pub const NONE: &str = "\u{2014}";

/// Replaces an ASCII hyphen-minus used as a sign by U+2212.
fn real_minus(s: String) -> String {
    s.replace('-', &MINUS.to_string())
}

fn non_finite(v: f64) -> Option<String> {
    if v.is_nan() {
        Some(NONE.to_string())
    } else if v.is_infinite() {
        Some(if v > 0.0 {
            "∞".into()
        } else {
            format!("{MINUS}∞")
        })
    } else {
        None
    }
}

/// Energies in kJ/mol: always two decimals (the precision of tabulated
/// ΔG'° values), never "−0.00".
pub fn energy(v: f64) -> String {
    if let Some(s) = non_finite(v) {
        return s;
    }
    let s = format!("{v:.2}");
    if s == "-0.00" {
        return "0.00".into();
    }
    real_minus(s)
}

/// `v` rounded to `digits` significant digits, trailing zeros trimmed.
fn significant(v: f64, digits: i32) -> String {
    if v == 0.0 {
        return "0".into();
    }
    let exponent = v.abs().log10().floor() as i32;
    let decimals = digits - 1 - exponent;
    let s = if decimals >= 0 {
        format!("{v:.prec$}", prec = decimals as usize)
    } else {
        // Round away the digits left of the point too: 1234.5 → "1230".
        let step = 10f64.powi(-decimals);
        format!("{:.0}", (v / step).round() * step)
    };
    let s = if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    };
    if s == "-0" {
        return "0".into();
    }
    real_minus(s)
}

/// Any number: up to six significant digits (enough for 298.15 K or a
/// bound of 1000), scientific notation outside 10⁻³ ≤ |v| < 10⁶.
pub fn number(v: f64) -> String {
    if let Some(s) = non_finite(v) {
        return s;
    }
    if v != 0.0 && (v.abs() < 1e-3 || v.abs() >= 1e6) {
        return scientific(v);
    }
    significant(v, 6)
}

/// Scientific notation with three significant digits: "3.16 × 10⁻⁵".
pub fn scientific(v: f64) -> String {
    if let Some(s) = non_finite(v) {
        return s;
    }
    if v == 0.0 {
        return "0".into();
    }
    let formatted = format!("{v:.2e}");
    let (mantissa, exponent) = formatted
        .split_once('e')
        .expect("`{:e}` formatting always writes an exponent");
    let mantissa = mantissa.trim_end_matches('0').trim_end_matches('.');
    let exponent: String = exponent.chars().map(superscript).collect();
    real_minus(format!("{mantissa} × 10{exponent}"))
}

fn superscript(c: char) -> char {
    match c {
        '-' => '⁻',
        '0' => '⁰',
        '1' => '¹',
        '2' => '²',
        '3' => '³',
        '4' => '⁴',
        '5' => '⁵',
        '6' => '⁶',
        '7' => '⁷',
        '8' => '⁸',
        '9' => '⁹',
        other => other,
    }
}

/// Equilibrium constants span dozens of orders of magnitude: plain digits
/// between 10⁻³ and 10⁴, scientific notation outside.
pub fn k_prime(v: f64) -> String {
    if let Some(s) = non_finite(v) {
        return s;
    }
    if v != 0.0 && (v.abs() < 1e-3 || v.abs() >= 1e4) {
        return scientific(v);
    }
    significant(v, 3)
}

/// Mole fractions: three significant digits, scientific notation below
/// 10⁻³ so a trace species does not read as "0".
pub fn fraction(v: f64) -> String {
    if let Some(s) = non_finite(v) {
        return s;
    }
    if v != 0.0 && v.abs() < 1e-3 {
        return scientific(v);
    }
    significant(v, 3)
}

/// Concentrations given in mol/L, written with an SI prefix and three
/// significant digits: 0.001 → "1 mM", 1e-5 → "10 µM".
pub fn concentration(molar: f64) -> String {
    if let Some(s) = non_finite(molar) {
        return s;
    }
    if molar == 0.0 {
        return "0 M".into();
    }
    // Round first so 0.0009999 M becomes "1 mM", not "1000 µM".
    let rounded: f64 = format!("{molar:.2e}").parse().unwrap_or(molar);
    const PREFIXES: [(f64, &str); 6] = [
        (1.0, "M"),
        (1e-3, "mM"),
        (1e-6, "µM"),
        (1e-9, "nM"),
        (1e-12, "pM"),
        (1e-15, "fM"),
    ];
    for (scale, unit) in PREFIXES {
        // The small tolerance keeps 1e-6 (stored as 9.99…e-7) in µM.
        if rounded.abs() >= scale * (1.0 - 1e-9) {
            let scaled = rounded / scale;
            if scaled.abs() >= 1e4 {
                return format!("{} M", scientific(rounded));
            }
            return format!("{} {unit}", significant(scaled, 3));
        }
    }
    format!("{} M", scientific(rounded))
}

/// Absolute stoichiometric coefficient as written in an equation: 1 is
/// left out, others trimmed ("2", "0.5").
pub fn coefficient(v: f64) -> String {
    let a = v.abs();
    if a == 1.0 {
        String::new()
    } else {
        significant(a, 4)
    }
}

/// `part` as a share of `whole`, one decimal: "62.5 %".
pub fn percent(part: f64, whole: f64) -> String {
    if whole <= 0.0 {
        return NONE.to_string();
    }
    format!("{:.1} %", 100.0 * part / whole)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn energies_have_two_decimals_and_a_real_minus() {
        assert_eq!(energy(-12.345), "−12.35"); // round half away: f64 of -12.345 is -12.3450000000000006
        assert_eq!(energy(3.0), "3.00");
        assert_eq!(energy(-0.001), "0.00");
        assert_eq!(energy(f64::NAN), "—");
        assert_eq!(energy(f64::NEG_INFINITY), "−∞");
    }

    #[test]
    fn concentrations_use_si_prefixes() {
        assert_eq!(concentration(1e-3), "1 mM");
        assert_eq!(concentration(1e-5), "10 µM");
        assert_eq!(concentration(1e-6), "1 µM");
        assert_eq!(concentration(2.5e-4), "250 µM");
        assert_eq!(concentration(0.02), "20 mM");
        assert_eq!(concentration(0.0009999), "1 mM");
        assert_eq!(concentration(55.5), "55.5 M");
        assert_eq!(concentration(1e-8), "10 nM");
        assert_eq!(concentration(3e-17), "3 × 10⁻¹⁷ M");
        assert_eq!(concentration(0.0), "0 M");
    }

    #[test]
    fn k_prime_switches_to_scientific_when_large_or_small() {
        assert_eq!(k_prime(0.345), "0.345");
        assert_eq!(k_prime(1234.5), "1230");
        assert_eq!(k_prime(3.16e5), "3.16 × 10⁵");
        assert_eq!(k_prime(1e-12), "1 × 10⁻¹²");
        assert_eq!(k_prime(2.5e-4), "2.5 × 10⁻⁴");
    }

    #[test]
    fn fractions_keep_traces_visible() {
        assert_eq!(fraction(0.7740066774667633), "0.774");
        assert_eq!(fraction(1.0), "1");
        assert_eq!(fraction(0.5), "0.5");
        assert_eq!(fraction(1.5147864652007836e-4), "1.51 × 10⁻⁴");
        assert_eq!(fraction(0.0), "0");
    }

    #[test]
    fn general_numbers_and_coefficients() {
        assert_eq!(number(-1.5), "−1.5");
        assert_eq!(number(1000.0), "1000");
        assert_eq!(number(0.12345), "0.12345");
        assert_eq!(number(298.15), "298.15");
        assert_eq!(number(-12.3456789), "−12.3457");
        assert_eq!(number(-2e6), "−2 × 10⁶");
        assert_eq!(number(0.0), "0");
        assert_eq!(coefficient(-1.0), "");
        assert_eq!(coefficient(-2.0), "2");
        assert_eq!(coefficient(0.5), "0.5");
        assert_eq!(percent(5.0, 8.0), "62.5 %");
        assert_eq!(percent(1.0, 0.0), "—");
    }
}
