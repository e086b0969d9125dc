//! The built-in functions a rulebook may call, with their parameters' dimensions. The formulas
//! themselves are evaluated later; here they are only typed.

use crate::units::Dimension;

/// Whether a parameter accepts a per-cylinder value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Shape {
    /// One value for the engine.
    Single,
    /// One value, or one per cylinder (the result is then per cylinder too).
    Either,
}

/// One parameter of a built-in formula.
#[derive(Clone, Copy, Debug)]
pub struct Param {
    /// Its name, usable as an argument label.
    pub name: &'static str,
    /// Its dimension.
    pub dimension: Dimension,
    /// Whether it may be per cylinder.
    pub shape: Shape,
}

/// A built-in engine formula with a fixed signature.
#[derive(Clone, Copy, Debug)]
pub struct Formula {
    /// The function's name.
    pub name: &'static str,
    /// Its parameters, in positional order.
    pub params: &'static [Param],
    /// The dimension of its result.
    pub result: Dimension,
    /// What it computes, for `explain` and the docs.
    pub summary: &'static str,
}

const fn param(name: &'static str, dimension: Dimension, shape: Shape) -> Param {
    Param {
        name,
        dimension,
        shape,
    }
}

/// The engine formulas (DESIGN.md section 4).
pub const FORMULAS: &[Formula] = &[
    Formula {
        name: "displacement",
        params: &[
            param("bore", Dimension::LENGTH, Shape::Single),
            param("stroke", Dimension::LENGTH, Shape::Single),
            param("cylinders", Dimension::NONE, Shape::Single),
        ],
        result: Dimension::VOLUME,
        summary: "swept volume π/4 · bore² · stroke · cylinders",
    },
    Formula {
        name: "compression_ratio",
        params: &[
            param("bore", Dimension::LENGTH, Shape::Either),
            param("stroke", Dimension::LENGTH, Shape::Either),
            param("chamber", Dimension::VOLUME, Shape::Either),
            param("gasket_bore", Dimension::LENGTH, Shape::Either),
            param("gasket_thickness", Dimension::LENGTH, Shape::Either),
            param("deck_clearance", Dimension::LENGTH, Shape::Either),
            param("piston_volume", Dimension::VOLUME, Shape::Either),
        ],
        result: Dimension::NONE,
        summary: "static compression ratio (swept + clearance) / clearance per cylinder; \
                  piston_volume is positive for a dish, negative for a dome",
    },
    Formula {
        name: "valve_lift",
        params: &[
            param("lobe_lift", Dimension::LENGTH, Shape::Either),
            param("rocker_ratio", Dimension::NONE, Shape::Either),
        ],
        result: Dimension::LENGTH,
        summary: "gross valve lift lobe_lift · rocker_ratio",
    },
    Formula {
        name: "net_valve_lift",
        params: &[
            param("lobe_lift", Dimension::LENGTH, Shape::Either),
            param("rocker_ratio", Dimension::NONE, Shape::Either),
            param("lash", Dimension::LENGTH, Shape::Either),
        ],
        result: Dimension::LENGTH,
        summary: "net valve lift lobe_lift · rocker_ratio − lash (solid lifters)",
    },
    Formula {
        name: "airflow_at",
        params: &[
            param("flow", Dimension::AIRFLOW, Shape::Single),
            param("rated_drop", Dimension::PRESSURE, Shape::Single),
            param("target_drop", Dimension::PRESSURE, Shape::Single),
        ],
        result: Dimension::AIRFLOW,
        summary: "airflow rated at one pressure drop converted to another, flow · √(target_drop / rated_drop)",
    },
    Formula {
        name: "airflow_demand",
        params: &[
            param("displacement", Dimension::VOLUME, Shape::Single),
            param("speed", Dimension::SPEED, Shape::Single),
            param("efficiency", Dimension::NONE, Shape::Single),
        ],
        result: Dimension::AIRFLOW,
        summary: "four-stroke airflow demand displacement · speed · efficiency / 2 \
                  (cfm = ci · rpm · VE / 3456)",
    },
];

/// Functions whose result has the dimension of their argument.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Generic {
    /// Largest value: over cylinders with one argument, of the arguments with several.
    Max,
    /// Smallest value, likewise.
    Min,
    /// Arithmetic mean over cylinders.
    Mean,
    /// Absolute value.
    Abs,
    /// Square root (halves every exponent of the dimension).
    Sqrt,
}

/// The generic functions by name.
pub const GENERICS: &[(&str, Generic)] = &[
    ("max", Generic::Max),
    ("min", Generic::Min),
    ("mean", Generic::Mean),
    ("abs", Generic::Abs),
    ("sqrt", Generic::Sqrt),
];

/// A function of either kind.
#[derive(Clone, Copy, Debug)]
pub enum Function {
    /// An engine formula.
    Formula(&'static Formula),
    /// A generic function.
    Generic(Generic),
}

/// Looks up a function by name.
pub fn function(name: &str) -> Option<Function> {
    FORMULAS
        .iter()
        .find(|f| f.name == name)
        .map(Function::Formula)
        .or_else(|| {
            GENERICS
                .iter()
                .find(|(n, _)| *n == name)
                .map(|(_, g)| Function::Generic(*g))
        })
}

/// Every function name, for "did you mean".
pub fn function_names() -> impl Iterator<Item = &'static str> {
    FORMULAS
        .iter()
        .map(|f| f.name)
        .chain(GENERICS.iter().map(|(n, _)| *n))
}
