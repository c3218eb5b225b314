//! Sane ranges for numbers in a model. Values far outside them are typing
//! slips or hostile input; accepting them would overflow sums of squares
//! (a coefficient of 10³⁰⁰ made σ infinite) or give physically meaningless
//! corrections. Each check returns the message naming the range.

/// Largest |stoichiometric coefficient| (genome-scale biomass reactions use
/// coefficients up to about 10², common practice).
pub const MAX_COEFFICIENT: f64 = 1e6;
/// Most hydrogen atoms in one species.
pub const MAX_HYDROGENS: u32 = 1_000;
/// Largest |charge| of one species.
pub const MAX_CHARGE: i32 = 100;
/// Temperatures the thermodynamic corrections are meant for, K.
pub const TEMPERATURE_K: (f64, f64) = (250.0, 400.0);
/// Largest ionic strength, M: the extended Debye–Hückel form used for
/// activity corrections holds up to about 0.25–0.5 M (Alberty 2003); 1 M is
/// the outer limit accepted.
pub const MAX_IONIC_STRENGTH_M: f64 = 1.0;
/// Largest |membrane potential|, mV (biological membranes: below 0.3 V).
pub const MAX_POTENTIAL_MV: f64 = 1_000.0;

pub fn coefficient(c: f64) -> Result<(), String> {
    if c.abs() <= MAX_COEFFICIENT {
        Ok(())
    } else {
        Err(format!(
            "coefficient {c:e} is outside the accepted range (at most 1e6 in size)"
        ))
    }
}

pub fn charge(z: i64) -> Result<(), String> {
    if z.abs() <= MAX_CHARGE as i64 {
        Ok(())
    } else {
        Err(format!(
            "charge {z} is outside the accepted range -100 to 100"
        ))
    }
}

pub fn hydrogens(h: i64) -> Result<(), String> {
    if (0..=MAX_HYDROGENS as i64).contains(&h) {
        Ok(())
    } else {
        Err(format!(
            "hydrogens {h} is outside the accepted range 0 to 1,000"
        ))
    }
}

pub fn temperature(t: f64) -> Result<(), String> {
    if (TEMPERATURE_K.0..=TEMPERATURE_K.1).contains(&t) {
        Ok(())
    } else {
        Err(format!(
            "temperature must be between 250 K and 400 K (−23 °C to 127 °C), found {t} K"
        ))
    }
}

pub fn ionic_strength(i: f64) -> Result<(), String> {
    if (0.0..=MAX_IONIC_STRENGTH_M).contains(&i) {
        Ok(())
    } else {
        Err(format!(
            "ionic strength must be between 0 and 1 M, found {i} M"
        ))
    }
}

pub fn potential(mv: f64) -> Result<(), String> {
    if mv.abs() <= MAX_POTENTIAL_MV {
        Ok(())
    } else {
        Err(format!(
            "electrical potential must be between -1 V and 1 V, found {mv} mV"
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bounds_are_inclusive_and_name_the_range() {
        assert!(coefficient(1e6).is_ok() && coefficient(-1e6).is_ok());
        assert!(coefficient(1e300).unwrap_err().contains("1e6"));
        assert!(charge(-100).is_ok() && charge(101).is_err());
        assert!(hydrogens(1000).is_ok() && hydrogens(1001).is_err() && hydrogens(-1).is_err());
        assert!(temperature(298.15).is_ok() && temperature(401.0).is_err());
        assert!(temperature(0.0).unwrap_err().contains("250 K and 400 K"));
        assert!(ionic_strength(0.25).is_ok() && ionic_strength(1.5).is_err());
        assert!(ionic_strength(-0.1).is_err());
        assert!(potential(-150.0).is_ok() && potential(1500.0).is_err());
    }
}
