//! Units of measure: dimensions, the unit table and lookups with a "did you mean".

mod dimension;
mod table;

pub use dimension::{Dimension, NAMED as DIMENSION_NAMES, dimension_named};
pub use table::{UNITS, Unit, display_unit, lookup};

/// Spelled-out names people write for a unit, and the symbol gonogo uses.
const SPELLED_OUT: &[(&str, &str)] = &[
    ("inch", "in"),
    ("inches", "in"),
    ("cid", "ci"),
    ("lbs", "lb"),
    ("pound", "lb"),
    ("pounds", "lb"),
    ("millimetre", "mm"),
    ("millimeter", "mm"),
    ("litre", "L"),
    ("liter", "L"),
    ("degree", "deg"),
    ("degrees", "deg"),
    ("thousandths", "thou"),
];

/// The known unit symbol closest to `symbol`, for a "did you mean" help line.
pub fn closest_unit(symbol: &str) -> Option<&'static str> {
    let lower = symbol.to_lowercase();
    if let Some((_, unit)) = SPELLED_OUT.iter().find(|(name, _)| *name == lower) {
        return Some(unit);
    }
    if let Some(u) = UNITS.iter().find(|u| u.symbol.to_lowercase() == lower) {
        return Some(u.symbol);
    }
    crate::suggest::closest(symbol, UNITS.iter().map(|u| u.symbol))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Relative difference of two factors.
    fn rel(a: f64, b: f64) -> f64 {
        ((a - b) / b).abs()
    }

    fn factor(symbol: &str) -> f64 {
        lookup(symbol).map(|u| u.to_si).unwrap_or(f64::NAN)
    }

    /// NIST SP 811 (2008), Appendix B.8, "Factors for units listed alphabetically".
    /// Each row: our symbol, the factor NIST prints, the tolerance that print allows
    /// (exact factors to 1e-15; seven-significant-digit ones to half their last digit).
    const NIST_SP_811_B8: &[(&str, f64, f64)] = &[
        ("in", 2.54e-2, 1e-15),         // inch to metre, exact
        ("ft", 3.048e-1, 1e-15),        // foot to metre, exact
        ("in^2", 6.4516e-4, 1e-15),     // square inch to square metre, exact
        ("ci", 1.638_706_4e-5, 1e-15),  // cubic inch to cubic metre, exact
        ("in³", 1.638_706_4e-5, 1e-15), // same, other spelling
        ("L", 1e-3, 1e-15),             // litre to cubic metre, exact
        ("cc", 1e-6, 1e-15),            // cubic centimetre, exact
        ("lb", 4.535_923_7e-1, 1e-15),  // pound (avoirdupois) to kilogram, exact
        ("lbf", 4.448_222, 1e-7),       // pound-force to newton
        ("inHg", 3.386_389e3, 1e-7),    // inch of mercury (conventional) to pascal
        ("psi", 6.894_757e3, 1e-7),     // pound-force per square inch to pascal
        ("cfm", 4.719_474e-4, 1e-7),    // cubic foot per minute to m³/s
        ("hp", 7.456_999e2, 1e-7),      // horsepower (550 ft·lbf/s) to watt
        ("deg", 1.745_329e-2, 1e-6),    // degree to radian
        ("kPa", 1e3, 1e-15),            // SI prefix
    ];

    #[test]
    fn factors_match_nist_sp_811_appendix_b8() {
        for (symbol, nist, tolerance) in NIST_SP_811_B8 {
            let ours = factor(symbol);
            assert!(
                rel(ours, *nist) <= *tolerance,
                "{symbol}: ours {ours:e}, NIST SP 811 {nist:e}"
            );
        }
    }

    #[test]
    fn thou_is_a_thousandth_of_an_inch() {
        // common practice, no source
        assert!(rel(factor("thou") * 1000.0, factor("in")) < 1e-15);
    }

    #[test]
    fn cubic_inch_is_16_387064_cc() {
        // NIST SP 811 B.8: 1 in³ = 16.387064 cm³ exactly
        assert!(rel(factor("ci") / factor("cc"), 16.387_064) < 1e-14);
    }

    #[test]
    fn every_unit_has_a_positive_finite_factor_and_unique_symbol() {
        for (i, u) in UNITS.iter().enumerate() {
            assert!(u.to_si.is_finite() && u.to_si > 0.0, "{}", u.symbol);
            assert!(
                UNITS[i + 1..].iter().all(|v| v.symbol != u.symbol),
                "duplicate symbol {}",
                u.symbol
            );
        }
    }

    #[test]
    fn schema_dimension_names_resolve() {
        assert_eq!(dimension_named("airflow"), Some(Dimension::AIRFLOW));
        assert_eq!(dimension_named("lenght"), None);
    }

    #[test]
    fn a_misspelt_unit_gets_a_suggestion() {
        assert_eq!(closest_unit("inhg"), Some("inHg"));
        assert_eq!(closest_unit("cfn"), Some("cfm"));
        assert_eq!(closest_unit("inch"), Some("in"));
        assert_eq!(closest_unit("KG"), Some("kg"));
    }
}
