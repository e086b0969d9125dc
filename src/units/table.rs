//! The unit table: every unit symbol a rulebook or declaration may write, its dimension and
//! its factor to the coherent SI unit of that dimension, as a float for propagation and, where
//! the factor is a rational number, exactly, for deciding a value that lies on a limit.
//!
//! Factors are those of NIST SP 811 (2008), Appendix B.8. Every one of them is an exact
//! decimal or a product and quotient of exact definitions: 1 in = 0.0254 m, 1 ft = 0.3048 m,
//! 1 lb = 0.453 592 37 kg, standard gravity g_n = 9.806 65 m/s² (so 1 lbf = 1 lb × g_n), the
//! conventional mercury column 13.5951 g/cm³ × g_n (1 mmHg = 133.322 387 415 Pa), and the
//! horsepower 550 ft·lbf/s. NIST prints the last four rounded to seven digits; here they are
//! the products themselves. Only the degree (π/180) has no exact factor. `thou` is the trade's
//! thousandth of an inch. Tests in `units/mod.rs` check each factor against the NIST table.

use super::Dimension;

/// A factor as an exact fraction of whole numbers.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Ratio {
    /// The numerator.
    pub numerator: u128,
    /// The denominator, above zero.
    pub denominator: u128,
}

impl Ratio {
    const fn new(numerator: u128, denominator: u128) -> Ratio {
        Ratio {
            numerator,
            denominator,
        }
    }

    const fn whole(n: u128) -> Ratio {
        Ratio::new(n, 1)
    }

    /// `10^-n`.
    const fn milli(n: u32) -> Ratio {
        Ratio::new(1, 10u128.pow(n))
    }

    const fn times(self, other: Ratio) -> Ratio {
        Ratio::new(
            self.numerator * other.numerator,
            self.denominator * other.denominator,
        )
    }

    const fn over(self, other: Ratio) -> Ratio {
        Ratio::new(
            self.numerator * other.denominator,
            self.denominator * other.numerator,
        )
    }

    /// The nearest float, for the propagation factor.
    const fn float(self) -> f64 {
        self.numerator as f64 / self.denominator as f64
    }
}

/// One unit of measure.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Unit {
    /// The symbol as it is written, for example `in` or `cm³`.
    pub symbol: &'static str,
    /// The unit's dimension.
    pub dimension: Dimension,
    /// Multiply a value in this unit by this factor to get the coherent SI unit.
    pub to_si: f64,
    /// The same factor exactly, when it is a rational number (all but the degree).
    pub exact: Option<Ratio>,
}

const INCH: f64 = 0.0254;
const FOOT: f64 = 0.3048;
const POUND: f64 = 0.453_592_37;

/// NIST SP 811 B.8: 1 in = 2.54 × 10⁻² m exactly.
const INCH_X: Ratio = Ratio::new(254, 10_000);
/// NIST SP 811 B.8: 1 ft = 3.048 × 10⁻¹ m exactly.
const FOOT_X: Ratio = Ratio::new(3_048, 10_000);
/// NIST SP 811 B.8: 1 lb (avoirdupois) = 4.535 923 7 × 10⁻¹ kg exactly.
const POUND_X: Ratio = Ratio::new(45_359_237, 100_000_000);
/// Standard acceleration of gravity, 9.806 65 m/s² by definition (NIST SP 811 B.8, note).
const GRAVITY_X: Ratio = Ratio::new(980_665, 100_000);
/// 1 lbf = 1 lb × g_n = 4.448 221 615 260 5 N (NIST SP 811 B.8 prints 4.448 222).
const POUND_FORCE_X: Ratio = POUND_X.times(GRAVITY_X);
/// 1 psi = 1 lbf / in² (NIST SP 811 B.8 prints 6.894 757 × 10³ Pa).
const PSI_X: Ratio = POUND_FORCE_X.over(INCH_X.times(INCH_X));
/// The conventional inch of mercury: 25.4 mm × 13.5951 g/cm³ × g_n = 3 386.388 640 341 Pa
/// (NIST SP 811 B.8 prints 3.386 389 × 10³).
const INCH_OF_MERCURY_X: Ratio = INCH_X.times(Ratio::new(135_951, 10)).times(GRAVITY_X);
/// 1 hp = 550 ft·lbf/s = 745.699 871 582 270 22 W (NIST SP 811 B.8 prints 7.456 999 × 10²).
const HORSEPOWER_X: Ratio = Ratio::whole(550).times(FOOT_X).times(POUND_FORCE_X);

/// A unit whose factor is exact; `to_si` is its float, given as written where it already is.
const fn unit(symbol: &'static str, dimension: Dimension, to_si: f64, exact: Ratio) -> Unit {
    Unit {
        symbol,
        dimension,
        to_si,
        exact: Some(exact),
    }
}

/// A unit whose factor is exact, its float computed from the fraction.
const fn derived(symbol: &'static str, dimension: Dimension, exact: Ratio) -> Unit {
    unit(symbol, dimension, exact.float(), exact)
}

/// A unit whose factor is not a rational number.
const fn inexact(symbol: &'static str, dimension: Dimension, to_si: f64) -> Unit {
    Unit {
        symbol,
        dimension,
        to_si,
        exact: None,
    }
}

/// Every unit gonogo knows. Aliases (`in³` and `ci`) are separate rows with the same factor.
pub const UNITS: &[Unit] = &[
    // length
    unit("in", Dimension::LENGTH, INCH, INCH_X),
    unit(
        "thou",
        Dimension::LENGTH,
        INCH / 1000.0,
        INCH_X.times(Ratio::milli(3)),
    ),
    unit("ft", Dimension::LENGTH, FOOT, FOOT_X),
    unit("mm", Dimension::LENGTH, 1e-3, Ratio::milli(3)),
    unit("cm", Dimension::LENGTH, 1e-2, Ratio::milli(2)),
    unit("m", Dimension::LENGTH, 1.0, Ratio::whole(1)),
    // area
    unit("in²", Dimension::AREA, INCH * INCH, INCH_X.times(INCH_X)),
    unit("in^2", Dimension::AREA, INCH * INCH, INCH_X.times(INCH_X)),
    unit("mm²", Dimension::AREA, 1e-6, Ratio::milli(6)),
    unit("mm^2", Dimension::AREA, 1e-6, Ratio::milli(6)),
    unit("cm²", Dimension::AREA, 1e-4, Ratio::milli(4)),
    unit("cm^2", Dimension::AREA, 1e-4, Ratio::milli(4)),
    unit("m²", Dimension::AREA, 1.0, Ratio::whole(1)),
    unit("m^2", Dimension::AREA, 1.0, Ratio::whole(1)),
    // volume
    unit(
        "ci",
        Dimension::VOLUME,
        INCH * INCH * INCH,
        INCH_X.times(INCH_X).times(INCH_X),
    ),
    unit(
        "in³",
        Dimension::VOLUME,
        INCH * INCH * INCH,
        INCH_X.times(INCH_X).times(INCH_X),
    ),
    unit(
        "in^3",
        Dimension::VOLUME,
        INCH * INCH * INCH,
        INCH_X.times(INCH_X).times(INCH_X),
    ),
    unit("cc", Dimension::VOLUME, 1e-6, Ratio::milli(6)),
    unit("cm³", Dimension::VOLUME, 1e-6, Ratio::milli(6)),
    unit("cm^3", Dimension::VOLUME, 1e-6, Ratio::milli(6)),
    unit("mL", Dimension::VOLUME, 1e-6, Ratio::milli(6)),
    unit("L", Dimension::VOLUME, 1e-3, Ratio::milli(3)),
    unit("m³", Dimension::VOLUME, 1.0, Ratio::whole(1)),
    unit("m^3", Dimension::VOLUME, 1.0, Ratio::whole(1)),
    // mass
    unit("lb", Dimension::MASS, POUND, POUND_X),
    unit("kg", Dimension::MASS, 1.0, Ratio::whole(1)),
    unit("g", Dimension::MASS, 1e-3, Ratio::milli(3)),
    // force
    derived("lbf", Dimension::FORCE, POUND_FORCE_X),
    unit("N", Dimension::FORCE, 1.0, Ratio::whole(1)),
    // pressure
    derived("inHg", Dimension::PRESSURE, INCH_OF_MERCURY_X),
    derived("psi", Dimension::PRESSURE, PSI_X),
    unit("kPa", Dimension::PRESSURE, 1e3, Ratio::whole(1_000)),
    unit("bar", Dimension::PRESSURE, 1e5, Ratio::whole(100_000)),
    unit("Pa", Dimension::PRESSURE, 1.0, Ratio::whole(1)),
    // airflow
    unit(
        "cfm",
        Dimension::AIRFLOW,
        FOOT * FOOT * FOOT / 60.0,
        FOOT_X.times(FOOT_X).times(FOOT_X).over(Ratio::whole(60)),
    ),
    unit("L/s", Dimension::AIRFLOW, 1e-3, Ratio::milli(3)),
    unit("m³/s", Dimension::AIRFLOW, 1.0, Ratio::whole(1)),
    unit("m^3/s", Dimension::AIRFLOW, 1.0, Ratio::whole(1)),
    // angle
    inexact("deg", Dimension::ANGLE, std::f64::consts::PI / 180.0),
    inexact("°", Dimension::ANGLE, std::f64::consts::PI / 180.0),
    unit("rad", Dimension::ANGLE, 1.0, Ratio::whole(1)),
    // rotational speed: revolutions are counts, so rpm is per minute
    unit("rpm", Dimension::SPEED, 1.0 / 60.0, Ratio::new(1, 60)),
    // time
    unit("s", Dimension::TIME, 1.0, Ratio::whole(1)),
    unit("min", Dimension::TIME, 60.0, Ratio::whole(60)),
    // power
    derived("hp", Dimension::POWER, HORSEPOWER_X),
    unit("kW", Dimension::POWER, 1e3, Ratio::whole(1_000)),
    unit("W", Dimension::POWER, 1.0, Ratio::whole(1)),
    // pure numbers
    unit("%", Dimension::NONE, 0.01, Ratio::milli(2)),
];

/// Finds a unit by its exact symbol (every symbol is one unit's: the units tests check it).
pub fn lookup(symbol: &str) -> Option<&'static Unit> {
    type BySymbol = std::collections::HashMap<&'static str, &'static Unit>;
    static BY_SYMBOL: std::sync::OnceLock<BySymbol> = std::sync::OnceLock::new();
    BY_SYMBOL
        .get_or_init(|| UNITS.iter().map(|u| (u.symbol, u)).collect())
        .get(symbol)
        .copied()
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
