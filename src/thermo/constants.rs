//! Physical constants and standard conditions.
//!
//! R and F are exact since the 2019 SI redefinition (CODATA 2018):
//! R = N_A·k = 8.314 462 618… J K⁻¹ mol⁻¹, F = N_A·e = 96 485.332 12… C mol⁻¹.

/// Molar gas constant, kJ K⁻¹ mol⁻¹ (CODATA 2018, exact: N_A·k).
pub const R_KJ: f64 = 8.314_462_618_153_24e-3;
/// Faraday constant, kJ mol⁻¹ V⁻¹ (CODATA 2018, exact: N_A·e).
pub const F_KJ_PER_V: f64 = 96.485_332_123_310_0;
/// Standard temperature of biochemical tables, K.
pub const T_STANDARD_K: f64 = 298.15;

/// RT in kJ/mol at temperature `t_k`.
pub fn rt(t_k: f64) -> f64 {
    R_KJ * t_k
}

/// Convert Celsius to kelvin (0 °C = 273.15 K, exact by definition).
pub fn celsius_to_kelvin(c: f64) -> f64 {
    c + 273.15
}

#[cfg(test)]
mod tests {
    use super::*;

    /// CODATA 2018: N_A = 6.022 140 76e23 mol⁻¹, k = 1.380 649e-23 J/K,
    /// e = 1.602 176 634e-19 C, all exact; R = N_A·k, F = N_A·e.
    #[test]
    fn r_and_f_match_codata_2018() {
        let na = 6.022_140_76e23_f64;
        let k = 1.380_649e-23_f64;
        let e = 1.602_176_634e-19_f64;
        assert!((R_KJ * 1e3 - na * k).abs() < 1e-12);
        assert!((F_KJ_PER_V * 1e3 - na * e).abs() < 1e-7);
        assert!((R_KJ * 1e3 - 8.314_462_618).abs() < 1e-9);
        assert!((F_KJ_PER_V * 1e3 - 96_485.332_12).abs() < 1e-5);
    }
}
