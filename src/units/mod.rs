//! Units of measure: dimensions, the unit table, lookups with a "did you mean", and the unit
//! a computed value is shown in (metric or inch family, from the units its inputs were
//! written in).

mod dimension;
mod table;

pub use dimension::{Dimension, NAMED as DIMENSION_NAMES, dimension_named};
pub use table::{Ratio, UNITS, Unit, display_unit, lookup};

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

/// The family a unit belongs to, for choosing the unit a computed value is shown in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Family {
    /// Millimetres, cubic centimetres, kilograms, kilopascals …
    Metric,
    /// Inches, cubic inches, pounds, inches of mercury … (US customary)
    Inch,
}

/// Symbols of the metric family.
const METRIC: &[&str] = &[
    "mm", "cm", "m", "mm²", "mm^2", "cm²", "cm^2", "m²", "m^2", "cc", "cm³", "cm^3", "mL", "L",
    "m³", "m^3", "kg", "g", "N", "kPa", "bar", "Pa", "L/s", "m³/s", "m^3/s", "kW", "W",
];

/// Symbols of the inch family.
const INCH: &[&str] = &[
    "in", "thou", "ft", "in²", "in^2", "ci", "in³", "in^3", "lb", "lbf", "inHg", "psi", "cfm", "hp",
];

/// The family of a unit symbol; `None` for units both families use (degrees, rpm, seconds,
/// percent) and for plain numbers.
pub fn family(symbol: &str) -> Option<Family> {
    if METRIC.contains(&symbol) {
        Some(Family::Metric)
    } else if INCH.contains(&symbol) {
        Some(Family::Inch)
    } else {
        None
    }
}

/// The unit a value of `dimension` is shown in for a family: the inch family's is
/// [`display_unit`], the trade's convention; the metric family's is the engine shop's
/// (mm, cc, kg, kPa, L/s; common practice, no source).
pub fn family_unit(dimension: Dimension, family: Family) -> Option<&'static Unit> {
    if family == Family::Inch {
        return display_unit(dimension);
    }
    let symbol = match dimension {
        d if d == Dimension::LENGTH => "mm",
        d if d == Dimension::AREA => "mm²",
        d if d == Dimension::VOLUME => "cc",
        d if d == Dimension::MASS => "kg",
        d if d == Dimension::FORCE => "N",
        d if d == Dimension::PRESSURE => "kPa",
        d if d == Dimension::AIRFLOW => "L/s",
        d if d == Dimension::POWER => "kW",
        _ => return display_unit(dimension),
    };
    lookup(symbol)
}

/// The unit to show a computed value of `dimension` in, from the units its inputs were
/// written in (`written`): all metric, the metric family's unit; all inch family, the inch
/// family's; mixed, `declared` (the rulebook's unit for it, else the limit's unit) when it is
/// of this dimension; otherwise, and when no input has a family, [`display_unit`].
pub fn shown_unit<'a>(
    dimension: Dimension,
    written: impl IntoIterator<Item = &'a str>,
    declared: Option<&'static Unit>,
) -> Option<&'static Unit> {
    let mut families = written.into_iter().filter_map(family);
    let Some(first) = families.next() else {
        return display_unit(dimension);
    };
    if families.all(|f| f == first) {
        return family_unit(dimension, first);
    }
    match declared {
        Some(u) if u.dimension == dimension => Some(u),
        _ => display_unit(dimension),
    }
}

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

/// The units of one dimension, in the order of the unit table, for `gonogo units`.
pub struct DimensionUnits {
    /// The dimension.
    pub dimension: Dimension,
    /// Its everyday name (`length`, …; `plain number` for counts and ratios).
    pub name: &'static str,
    /// The coherent SI unit every factor converts to.
    pub si_unit: &'static str,
    /// Every unit of the dimension, aliases included.
    pub units: Vec<&'static Unit>,
}

/// Every unit grouped by dimension, the dimensions in the order the table first uses them.
pub fn by_dimension() -> Vec<DimensionUnits> {
    let mut groups: Vec<DimensionUnits> = Vec::new();
    for unit in UNITS {
        match groups.iter_mut().find(|g| g.dimension == unit.dimension) {
            Some(group) => group.units.push(unit),
            None => groups.push(DimensionUnits {
                dimension: unit.dimension,
                name: dimension_label(unit.dimension),
                si_unit: si_unit(unit.dimension),
                units: vec![unit],
            }),
        }
    }
    groups
}

/// The everyday name of a dimension, `plain number` for counts and ratios.
fn dimension_label(dimension: Dimension) -> &'static str {
    if dimension.is_dimensionless() {
        return "plain number";
    }
    dimension.common_name().unwrap_or("other")
}

/// The coherent SI unit of a dimension of the table (NIST SP 811, section 4); rotational
/// speed is in revolutions per second, revolutions being counts.
fn si_unit(dimension: Dimension) -> &'static str {
    match dimension {
        d if d == Dimension::LENGTH => "m",
        d if d == Dimension::AREA => "m²",
        d if d == Dimension::VOLUME => "m³",
        d if d == Dimension::MASS => "kg",
        d if d == Dimension::FORCE => "N",
        d if d == Dimension::PRESSURE => "Pa",
        d if d == Dimension::AIRFLOW => "m³/s",
        d if d == Dimension::ANGLE => "rad",
        d if d == Dimension::SPEED => "1/s",
        d if d == Dimension::TIME => "s",
        d if d == Dimension::POWER => "W",
        _ => "1",
    }
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
        ("inHg", 3.386_389e3, 1.5e-7),  // inch of mercury (conventional); half of 0.001 Pa
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
    fn every_symbol_finds_its_own_unit_and_nothing_else_is_found() {
        for u in UNITS {
            assert_eq!(lookup(u.symbol), Some(u), "{}", u.symbol);
        }
        for other in ["", "IN", "mm ", "furlong"] {
            assert!(lookup(other).is_none(), "{other:?}");
        }
    }

    /// Whether a unit's exact factor is `numerator / denominator`, by cross-multiplication.
    fn exactly(symbol: &str, numerator: u128, denominator: u128) -> bool {
        lookup(symbol).and_then(|u| u.exact).is_some_and(|r| {
            use num_bigint::BigUint;
            let big = |n: u128| BigUint::from(n);
            big(r.numerator) * big(denominator) == big(numerator) * big(r.denominator)
        })
    }

    #[test]
    fn exact_factors_are_the_nist_sp_811_definitions() {
        // NIST SP 811 (2008) B.8, the factors it marks exact
        assert!(exactly("in", 254, 10_000)); // 2.54 E-02
        assert!(exactly("ft", 3_048, 10_000)); // 3.048 E-01
        assert!(exactly("in^2", 64_516, 100_000_000)); // 6.4516 E-04
        assert!(exactly("ci", 16_387_064, 10u128.pow(12))); // 1.638 706 4 E-05
        assert!(exactly("L", 1, 1_000)); // 1.0 E-03
        assert!(exactly("cc", 1, 1_000_000)); // 1.0 E-06
        assert!(exactly("lb", 45_359_237, 100_000_000)); // 4.535 923 7 E-01
        assert!(exactly("thou", 254, 10_000_000)); // a thousandth of 2.54 E-02
        // products of exact definitions that NIST prints rounded to seven digits:
        // 1 lbf = 0.453 592 37 kg × 9.806 65 m/s² (g_n by definition, NIST SP 811 B.8 note)
        assert!(exactly("lbf", 44_482_216_152_605, 10u128.pow(13)));
        // 1 inHg (conventional) = 25.4 mm × 13.5951 g/cm³ × g_n = 25.4 × 133.322 387 415 Pa
        assert!(exactly("inHg", 3_386_388_640_341, 10u128.pow(9)));
        // 1 psi = 1 lbf / (0.0254 m)²
        assert!(exactly(
            "psi",
            44_482_216_152_605 * 10u128.pow(8),
            64_516 * 10u128.pow(13)
        ));
        // 1 hp = 550 ft·lbf/s
        assert!(exactly(
            "hp",
            550 * 3_048 * 44_482_216_152_605,
            10_000 * 10u128.pow(13)
        ));
        // the degree is π/180, not a rational number
        assert_eq!(lookup("deg").map(|u| u.exact), Some(None));
    }

    #[test]
    fn every_float_factor_is_its_exact_factor_to_rounding() {
        for u in UNITS {
            if let Some(r) = u.exact {
                // within two units in the last place, so a reading's float and its exact
                // value agree to the rounding of reading it
                let exact = r.numerator as f64 / r.denominator as f64;
                assert!(rel(u.to_si, exact) < 4.5e-16, "{}", u.symbol);
            }
        }
    }

    #[test]
    fn every_unit_of_a_length_area_volume_mass_force_pressure_airflow_or_power_has_a_family() {
        let family_bound = [
            Dimension::LENGTH,
            Dimension::AREA,
            Dimension::VOLUME,
            Dimension::MASS,
            Dimension::FORCE,
            Dimension::PRESSURE,
            Dimension::AIRFLOW,
            Dimension::POWER,
        ];
        for u in UNITS.iter().filter(|u| family_bound.contains(&u.dimension)) {
            assert!(family(u.symbol).is_some(), "{} has no family", u.symbol);
        }
        for f in [Family::Metric, Family::Inch] {
            for d in family_bound {
                let shown = family_unit(d, f).map(|u| (u.dimension, family(u.symbol)));
                assert_eq!(shown, Some((d, Some(f))), "{d:?} in {f:?}");
            }
        }
    }

    #[test]
    fn a_computed_value_is_shown_in_the_family_its_inputs_were_written_in() {
        let symbol = |u: Option<&Unit>| u.map(|u| u.symbol);
        let volume = |written: &[&str], declared: Option<&str>| {
            symbol(shown_unit(
                Dimension::VOLUME,
                written.iter().copied(),
                declared.and_then(lookup),
            ))
        };
        assert_eq!(volume(&["mm", "mm"], None), Some("cc"));
        assert_eq!(volume(&["in", "thou", "ci"], None), Some("ci"));
        assert_eq!(volume(&["mm", "in"], Some("L")), Some("L"));
        assert_eq!(volume(&["mm", "in"], Some("mm")), Some("ci"));
        assert_eq!(volume(&["mm", "in"], None), Some("ci"));
        assert_eq!(volume(&["deg", "rpm"], None), Some("ci"));
        assert_eq!(volume(&[], Some("cc")), Some("ci"));
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

    #[test]
    fn each_dimension_is_listed_once_with_every_unit_and_its_si_unit() {
        let groups = by_dimension();
        let listed: usize = groups.iter().map(|g| g.units.len()).sum();
        assert_eq!(listed, UNITS.len());
        for group in &groups {
            assert_eq!(
                groups
                    .iter()
                    .filter(|g| g.dimension == group.dimension)
                    .count(),
                1
            );
            assert!(group.units.iter().all(|u| u.dimension == group.dimension));
            // NIST SP 811 section 4: the coherent SI unit has the factor 1
            if let Some(si) = lookup(group.si_unit) {
                assert_eq!(si.to_si, 1.0, "{}", group.si_unit);
                assert_eq!(si.dimension, group.dimension, "{}", group.si_unit);
            }
        }
        let names: Vec<&str> = groups.iter().map(|g| g.name).collect();
        assert!(
            names.contains(&"plain number") && names.contains(&"airflow"),
            "{names:?}"
        );
    }
}
