//! Physical dimensions as exponent vectors, and their algebra for `*`, `/` and `^`.
//!
//! A dimension is a product of base dimensions raised to integer powers. gonogo tracks four
//! base dimensions: length, mass, time and plane angle. Counts and ratios are dimensionless.

use std::fmt;

/// Number of base dimensions tracked.
const BASES: usize = 4;
/// Symbols of the base dimensions, in exponent-vector order.
const BASE_SYMBOLS: [&str; BASES] = ["L", "M", "T", "A"];

/// A physical dimension: integer exponents of length, mass, time and angle.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Default)]
pub struct Dimension {
    exponents: [i8; BASES],
}

impl Dimension {
    /// The dimension of pure numbers (counts, ratios).
    pub const NONE: Dimension = Dimension::new(0, 0, 0, 0);
    /// Length (metre).
    pub const LENGTH: Dimension = Dimension::new(1, 0, 0, 0);
    /// Area (square metre).
    pub const AREA: Dimension = Dimension::new(2, 0, 0, 0);
    /// Volume (cubic metre).
    pub const VOLUME: Dimension = Dimension::new(3, 0, 0, 0);
    /// Mass (kilogram).
    pub const MASS: Dimension = Dimension::new(0, 1, 0, 0);
    /// Time (second).
    pub const TIME: Dimension = Dimension::new(0, 0, 1, 0);
    /// Force (newton).
    pub const FORCE: Dimension = Dimension::new(1, 1, -2, 0);
    /// Pressure (pascal).
    pub const PRESSURE: Dimension = Dimension::new(-1, 1, -2, 0);
    /// Volumetric airflow (cubic metre per second).
    pub const AIRFLOW: Dimension = Dimension::new(3, 0, -1, 0);
    /// Plane angle (radian).
    pub const ANGLE: Dimension = Dimension::new(0, 0, 0, 1);
    /// Rotational speed in revolutions per unit time (revolutions are counts).
    pub const SPEED: Dimension = Dimension::new(0, 0, -1, 0);
    /// Power (watt).
    pub const POWER: Dimension = Dimension::new(2, 1, -3, 0);

    /// Builds a dimension from its exponents of length, mass, time and angle.
    pub const fn new(length: i8, mass: i8, time: i8, angle: i8) -> Dimension {
        Dimension {
            exponents: [length, mass, time, angle],
        }
    }

    /// True for counts and ratios.
    pub fn is_dimensionless(self) -> bool {
        self == Dimension::NONE
    }

    /// The dimension of a product.
    pub fn times(self, other: Dimension) -> Dimension {
        self.combine(other, |a, b| a.saturating_add(b))
    }

    /// The dimension of a quotient.
    pub fn divided_by(self, other: Dimension) -> Dimension {
        self.combine(other, |a, b| a.saturating_sub(b))
    }

    /// The dimension raised to an integer power.
    pub fn power(self, exponent: i8) -> Dimension {
        let mut out = self;
        for e in &mut out.exponents {
            *e = e.saturating_mul(exponent);
        }
        out
    }

    /// The dimension of a square root, if every exponent is even.
    pub fn square_root(self) -> Option<Dimension> {
        let mut out = self;
        for e in &mut out.exponents {
            if *e % 2 != 0 {
                return None;
            }
            *e /= 2;
        }
        Some(out)
    }

    /// The everyday name of this dimension (`length`, `volume`, ...), if it has one.
    pub fn common_name(self) -> Option<&'static str> {
        NAMED
            .iter()
            .find(|(_, dim)| *dim == self)
            .map(|(name, _)| *name)
    }

    fn combine(self, other: Dimension, op: impl Fn(i8, i8) -> i8) -> Dimension {
        let mut out = self;
        for (e, o) in out.exponents.iter_mut().zip(other.exponents) {
            *e = op(*e, o);
        }
        out
    }
}

/// Names a measurement schema may use for a dimension, and what each means.
/// `count` and `ratio` are both dimensionless; `text` is not a dimension and is handled apart.
pub const NAMED: [(&str, Dimension); 14] = [
    ("length", Dimension::LENGTH),
    ("area", Dimension::AREA),
    ("volume", Dimension::VOLUME),
    ("mass", Dimension::MASS),
    ("time", Dimension::TIME),
    ("force", Dimension::FORCE),
    ("pressure", Dimension::PRESSURE),
    ("airflow", Dimension::AIRFLOW),
    ("angle", Dimension::ANGLE),
    ("speed", Dimension::SPEED),
    ("power", Dimension::POWER),
    ("count", Dimension::NONE),
    ("ratio", Dimension::NONE),
    ("number", Dimension::NONE),
];

/// Looks up a schema dimension name (`length`, `airflow`, ...).
pub fn dimension_named(name: &str) -> Option<Dimension> {
    NAMED.iter().find(|(n, _)| *n == name).map(|(_, d)| *d)
}

impl fmt::Display for Dimension {
    /// Writes the everyday name where there is one, else the base exponents (`L^3·T^-1`).
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(name) = self.common_name() {
            return f.write_str(if name == "count" {
                "plain number"
            } else {
                name
            });
        }
        let parts: Vec<String> = BASE_SYMBOLS
            .iter()
            .zip(self.exponents)
            .filter(|(_, e)| *e != 0)
            .map(|(s, e)| {
                if e == 1 {
                    s.to_string()
                } else {
                    format!("{s}^{e}")
                }
            })
            .collect();
        f.write_str(&parts.join("·"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn airflow_is_volume_per_time() {
        assert_eq!(
            Dimension::VOLUME.divided_by(Dimension::TIME),
            Dimension::AIRFLOW
        );
    }

    #[test]
    fn area_is_length_squared_and_roots_back() {
        assert_eq!(Dimension::LENGTH.power(2), Dimension::AREA);
        assert_eq!(Dimension::AREA.square_root(), Some(Dimension::LENGTH));
        assert_eq!(Dimension::VOLUME.square_root(), None);
    }

    #[test]
    fn pressure_times_area_is_force() {
        assert_eq!(Dimension::PRESSURE.times(Dimension::AREA), Dimension::FORCE);
    }

    #[test]
    fn display_uses_common_names_then_exponents() {
        assert_eq!(Dimension::VOLUME.to_string(), "volume");
        assert_eq!(Dimension::NONE.to_string(), "plain number");
        assert_eq!(Dimension::new(4, 0, 0, 0).to_string(), "L^4");
        assert_eq!(Dimension::new(1, 0, -1, 0).to_string(), "L·T^-1");
    }
}
