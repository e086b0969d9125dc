//! The unit table: every unit symbol a rulebook or declaration may write, its dimension and
//! its exact factor to the coherent SI unit of that dimension.
//!
//! Factors are those of NIST SP 811 (2008), Appendix B.8, where that table gives them; exact
//! definitions are written as products so no rounding creeps in. `thou` is the trade's
//! thousandth of an inch. Tests in `units/mod.rs` check each factor against the NIST table.

use super::Dimension;

/// One unit of measure.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Unit {
    /// The symbol as it is written, for example `in` or `cm³`.
    pub symbol: &'static str,
    /// The unit's dimension.
    pub dimension: Dimension,
    /// Multiply a value in this unit by this factor to get the coherent SI unit.
    pub to_si: f64,
}

const INCH: f64 = 0.0254;
const FOOT: f64 = 0.3048;
const POUND: f64 = 0.453_592_37;

const fn unit(symbol: &'static str, dimension: Dimension, to_si: f64) -> Unit {
    Unit {
        symbol,
        dimension,
        to_si,
    }
}

/// Every unit gonogo knows. Aliases (`in³` and `ci`) are separate rows with the same factor.
pub const UNITS: &[Unit] = &[
    // length
    unit("in", Dimension::LENGTH, INCH),
    unit("thou", Dimension::LENGTH, INCH / 1000.0),
    unit("ft", Dimension::LENGTH, FOOT),
    unit("mm", Dimension::LENGTH, 1e-3),
    unit("cm", Dimension::LENGTH, 1e-2),
    unit("m", Dimension::LENGTH, 1.0),
    // area
    unit("in²", Dimension::AREA, INCH * INCH),
    unit("in^2", Dimension::AREA, INCH * INCH),
    unit("mm²", Dimension::AREA, 1e-6),
    unit("mm^2", Dimension::AREA, 1e-6),
    unit("cm²", Dimension::AREA, 1e-4),
    unit("cm^2", Dimension::AREA, 1e-4),
    unit("m²", Dimension::AREA, 1.0),
    unit("m^2", Dimension::AREA, 1.0),
    // volume
    unit("ci", Dimension::VOLUME, INCH * INCH * INCH),
    unit("in³", Dimension::VOLUME, INCH * INCH * INCH),
    unit("in^3", Dimension::VOLUME, INCH * INCH * INCH),
    unit("cc", Dimension::VOLUME, 1e-6),
    unit("cm³", Dimension::VOLUME, 1e-6),
    unit("cm^3", Dimension::VOLUME, 1e-6),
    unit("mL", Dimension::VOLUME, 1e-6),
    unit("L", Dimension::VOLUME, 1e-3),
    unit("m³", Dimension::VOLUME, 1.0),
    unit("m^3", Dimension::VOLUME, 1.0),
    // mass
    unit("lb", Dimension::MASS, POUND),
    unit("kg", Dimension::MASS, 1.0),
    unit("g", Dimension::MASS, 1e-3),
    // force
    unit("lbf", Dimension::FORCE, 4.448_222),
    unit("N", Dimension::FORCE, 1.0),
    // pressure
    unit("inHg", Dimension::PRESSURE, 3_386.389),
    unit("psi", Dimension::PRESSURE, 6_894.757),
    unit("kPa", Dimension::PRESSURE, 1e3),
    unit("bar", Dimension::PRESSURE, 1e5),
    unit("Pa", Dimension::PRESSURE, 1.0),
    // airflow
    unit("cfm", Dimension::AIRFLOW, FOOT * FOOT * FOOT / 60.0),
    unit("L/s", Dimension::AIRFLOW, 1e-3),
    unit("m³/s", Dimension::AIRFLOW, 1.0),
    unit("m^3/s", Dimension::AIRFLOW, 1.0),
    // angle
    unit("deg", Dimension::ANGLE, std::f64::consts::PI / 180.0),
    unit("°", Dimension::ANGLE, std::f64::consts::PI / 180.0),
    unit("rad", Dimension::ANGLE, 1.0),
    // rotational speed: revolutions are counts, so rpm is per minute
    unit("rpm", Dimension::SPEED, 1.0 / 60.0),
    // time
    unit("s", Dimension::TIME, 1.0),
    unit("min", Dimension::TIME, 60.0),
    // power
    unit("hp", Dimension::POWER, 745.699_9),
    unit("kW", Dimension::POWER, 1e3),
    unit("W", Dimension::POWER, 1.0),
    // pure numbers
    unit("%", Dimension::NONE, 0.01),
];

/// Finds a unit by its exact symbol.
pub fn lookup(symbol: &str) -> Option<&'static Unit> {
    static SORTED: std::sync::OnceLock<Vec<&'static Unit>> = std::sync::OnceLock::new();
    let sorted = SORTED.get_or_init(|| {
        let mut all: Vec<&'static Unit> = UNITS.iter().collect();
        all.sort_by_key(|u| u.symbol);
        all
    });
    sorted
        .binary_search_by_key(&symbol, |u| u.symbol)
        .ok()
        .map(|i| sorted[i])
}

/// The symbol gonogo uses when it shows a value of this dimension in US customary terms,
/// the convention of the trade (common practice, no source).
pub fn display_unit(dimension: Dimension) -> Option<&'static Unit> {
    let symbol = match dimension {
        d if d == Dimension::LENGTH => "in",
        d if d == Dimension::AREA => "in²",
        d if d == Dimension::VOLUME => "ci",
        d if d == Dimension::MASS => "lb",
        d if d == Dimension::FORCE => "lbf",
        d if d == Dimension::PRESSURE => "inHg",
        d if d == Dimension::AIRFLOW => "cfm",
        d if d == Dimension::ANGLE => "deg",
        d if d == Dimension::SPEED => "rpm",
        d if d == Dimension::TIME => "s",
        d if d == Dimension::POWER => "hp",
        _ => return None,
    };
    lookup(symbol)
}
