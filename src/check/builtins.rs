//! The built-in functions a rulebook may call, in one table: for each, its parameters with
//! their dimensions and shapes, the dimension of its result, what it means in one line, and its
//! implementation on dual numbers in SI units (DESIGN.md section 4; sources are cited in the
//! tests), and its domain: what its arguments must be for the result to mean anything
//! (a positive clearance volume for a compression ratio). The checker types calls from this
//! table and binds their arguments in parameter order; evaluation tests the domain and then
//! applies the implementation the checker bound, and a call outside its domain is not
//! computed.

use std::f64::consts::PI;

use crate::evaluate::dual::Dual;
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

/// A formula's implementation, by the number of its parameters: the arguments come in
/// parameter order, one value each (a per-cylinder call applies it cylinder by cylinder).
#[derive(Clone, Copy, Debug)]
pub enum Apply {
    /// Two parameters.
    Two(fn([&Dual; 2]) -> Dual),
    /// Three parameters.
    Three(fn([&Dual; 3]) -> Dual),
    /// Seven parameters.
    Seven(fn([&Dual; 7]) -> Dual),
}

impl Apply {
    /// How many arguments the implementation takes.
    pub fn arity(self) -> usize {
        match self {
            Apply::Two(_) => 2,
            Apply::Three(_) => 3,
            Apply::Seven(_) => 7,
        }
    }
}

/// A built-in engine formula with a fixed signature. Its dimension rule is its signature:
/// each argument must have its parameter's dimension, and the result has `result`.
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
    /// How it is computed.
    pub apply: Apply,
    /// What its arguments must be, in the order they are tested; the first one broken is
    /// the reason the call is not computed.
    pub domain: &'static [Requirement],
    /// Where the formula and its domain come from: a handbook, or common practice.
    pub source: &'static str,
}

/// One condition of a formula's domain: a quantity read from its arguments must be above
/// zero (or at least zero).
#[derive(Clone, Copy, Debug)]
pub struct Requirement {
    /// The condition in words, as it follows "needs": `a positive clearance volume`.
    pub needs: &'static str,
    /// The quantity tested, in words: `clearance volume`, `bore`.
    pub quantity: &'static str,
    /// Its dimension.
    pub dimension: Dimension,
    /// What is tested: one argument, or a quantity computed from several.
    pub tested: Tested,
    /// Whether zero is inside the domain (at least zero) or not (above zero).
    pub zero_allowed: bool,
}

/// What a [`Requirement`] tests.
#[derive(Clone, Copy, Debug)]
pub enum Tested {
    /// One argument itself, by position.
    Argument(usize),
    /// A quantity computed from the arguments at `reads`.
    Computed {
        /// The positions of the arguments it reads.
        reads: &'static [usize],
        /// The quantity from the argument values in parameter order, SI units (`None` for
        /// a list of the wrong length).
        value: fn(&[f64]) -> Option<f64>,
    },
}

impl Requirement {
    /// Whether `value` meets it; a value that is not a number never does.
    pub fn holds(&self, value: f64) -> bool {
        if self.zero_allowed {
            value >= 0.0
        } else {
            value > 0.0
        }
    }

    /// The quantity it tests, from the argument values in parameter order (`None` for a list
    /// of the wrong length).
    pub fn value(&self, args: &[f64]) -> Option<f64> {
        match self.tested {
            Tested::Argument(i) => args.get(i).copied(),
            Tested::Computed { value, .. } => value(args),
        }
    }

    /// The positions of the arguments it reads.
    pub fn reads(&self) -> &[usize] {
        match &self.tested {
            Tested::Argument(i) => std::slice::from_ref(i),
            Tested::Computed { reads, .. } => reads,
        }
    }
}

/// A requirement on one argument itself: above zero, or at least zero when `zero_allowed`.
const fn on(
    position: usize,
    needs: &'static str,
    quantity: &'static str,
    dimension: Dimension,
    zero_allowed: bool,
) -> Requirement {
    Requirement {
        needs,
        quantity,
        dimension,
        tested: Tested::Argument(position),
        zero_allowed,
    }
}

const HEYWOOD: &str = "Heywood, Internal Combustion Engine Fundamentals, ch. 2";
const COMMON: &str = "common practice, no source";

/// Bore, stroke and cylinders of `displacement`: a cylinder has a positive bore and stroke,
/// an engine a positive number of cylinders.
const DISPLACEMENT_DOMAIN: &[Requirement] = &[
    on(0, "a positive bore", "bore", Dimension::LENGTH, false),
    on(1, "a positive stroke", "stroke", Dimension::LENGTH, false),
    on(
        2,
        "a positive number of cylinders",
        "cylinders",
        Dimension::NONE,
        false,
    ),
];

/// `compression_ratio`: positive bore and stroke, a gasket of no negative size, and a
/// positive clearance volume V_c. With V_c > 0 and a positive swept volume V_d the ratio
/// (V_d + V_c) / V_c is above 1, so no further test of the result is needed.
const COMPRESSION_DOMAIN: &[Requirement] = &[
    on(0, "a positive bore", "bore", Dimension::LENGTH, false),
    on(1, "a positive stroke", "stroke", Dimension::LENGTH, false),
    on(
        3,
        "a gasket bore of at least zero",
        "gasket bore",
        Dimension::LENGTH,
        true,
    ),
    on(
        4,
        "a gasket thickness of at least zero",
        "gasket thickness",
        Dimension::LENGTH,
        true,
    ),
    Requirement {
        needs: "a positive clearance volume",
        quantity: "clearance volume",
        dimension: Dimension::VOLUME,
        tested: Tested::Computed {
            reads: &[0, 2, 3, 4, 5, 6],
            value: |x| match x {
                [
                    bore,
                    _,
                    chamber,
                    gasket_bore,
                    gasket_thickness,
                    deck,
                    piston,
                ] => Some(clearance_volume(
                    *bore,
                    *chamber,
                    *gasket_bore,
                    *gasket_thickness,
                    *deck,
                    *piston,
                )),
                _ => None,
            },
        },
        zero_allowed: false,
    },
];

/// `valve_lift`: a lobe lift of at least zero and a positive rocker ratio.
const LIFT_DOMAIN: &[Requirement] = &[
    on(
        0,
        "a lobe lift of at least zero",
        "lobe lift",
        Dimension::LENGTH,
        true,
    ),
    on(
        1,
        "a positive rocker ratio",
        "rocker ratio",
        Dimension::NONE,
        false,
    ),
];

/// `net_valve_lift`: as `valve_lift`, a lash of at least zero, and a net lift of at least
/// zero (a lash larger than the gross lift would leave the valve shut, not open it by a
/// negative amount).
const NET_LIFT_DOMAIN: &[Requirement] = &[
    on(
        0,
        "a lobe lift of at least zero",
        "lobe lift",
        Dimension::LENGTH,
        true,
    ),
    on(
        1,
        "a positive rocker ratio",
        "rocker ratio",
        Dimension::NONE,
        false,
    ),
    on(
        2,
        "a lash of at least zero",
        "lash",
        Dimension::LENGTH,
        true,
    ),
    Requirement {
        needs: "a lash no larger than the gross lift",
        quantity: "net lift",
        dimension: Dimension::LENGTH,
        tested: Tested::Computed {
            reads: &[0, 1, 2],
            value: |x| match x {
                [lobe, ratio, lash] => Some(lobe * ratio - lash),
                _ => None,
            },
        },
        zero_allowed: true,
    },
];

/// `airflow_at`: a flow of at least zero and positive pressure drops (the square root of
/// their ratio needs both above zero).
const AIRFLOW_AT_DOMAIN: &[Requirement] = &[
    on(
        0,
        "a flow of at least zero",
        "flow",
        Dimension::AIRFLOW,
        true,
    ),
    on(
        1,
        "a positive rated pressure drop",
        "rated pressure drop",
        Dimension::PRESSURE,
        false,
    ),
    on(
        2,
        "a positive target pressure drop",
        "target pressure drop",
        Dimension::PRESSURE,
        false,
    ),
];

/// `airflow_demand`: positive displacement, speed and volumetric efficiency.
const DEMAND_DOMAIN: &[Requirement] = &[
    on(
        0,
        "a positive displacement",
        "displacement",
        Dimension::VOLUME,
        false,
    ),
    on(1, "a positive speed", "speed", Dimension::SPEED, false),
    on(
        2,
        "a positive volumetric efficiency",
        "efficiency",
        Dimension::NONE,
        false,
    ),
];

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
        apply: Apply::Three(|[bore, stroke, cylinders]| displacement(bore, stroke, cylinders)),
        domain: DISPLACEMENT_DOMAIN,
        source: HEYWOOD,
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
        apply: Apply::Seven(
            |[
                bore,
                stroke,
                chamber,
                gasket_bore,
                gasket_thickness,
                deck_clearance,
                piston_volume,
            ]| {
                compression_ratio(&Cylinder {
                    bore,
                    stroke,
                    chamber,
                    gasket_bore,
                    gasket_thickness,
                    deck_clearance,
                    piston_volume,
                })
            },
        ),
        domain: COMPRESSION_DOMAIN,
        source: HEYWOOD,
    },
    Formula {
        name: "valve_lift",
        params: &[
            param("lobe_lift", Dimension::LENGTH, Shape::Either),
            param("rocker_ratio", Dimension::NONE, Shape::Either),
        ],
        result: Dimension::LENGTH,
        summary: "gross valve lift lobe_lift · rocker_ratio",
        apply: Apply::Two(|[lobe_lift, rocker_ratio]| valve_lift(lobe_lift, rocker_ratio)),
        domain: LIFT_DOMAIN,
        source: COMMON,
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
        apply: Apply::Three(|[lobe_lift, rocker_ratio, lash]| {
            net_valve_lift(lobe_lift, rocker_ratio, lash)
        }),
        domain: NET_LIFT_DOMAIN,
        source: COMMON,
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
        apply: Apply::Three(|[flow, rated, target]| airflow_at(flow, rated, target)),
        domain: AIRFLOW_AT_DOMAIN,
        source: "the orifice law, flow ∝ √(pressure drop); common practice, no source",
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
        apply: Apply::Three(|[volume, speed, efficiency]| {
            airflow_demand(volume, speed, efficiency)
        }),
        domain: DEMAND_DOMAIN,
        source: COMMON,
    },
];

impl Formula {
    /// Applies the formula to arguments given as a list in parameter order, `None` when the
    /// list has the wrong length (for callers outside the checker, which binds calls once).
    pub fn apply_to(&self, args: &[&Dual]) -> Option<Dual> {
        Some(match self.apply {
            Apply::Two(f) => f(args.try_into().ok()?),
            Apply::Three(f) => f(args.try_into().ok()?),
            Apply::Seven(f) => f(args.try_into().ok()?),
        })
    }
}

impl Formula {
    /// The first requirement of its domain that arguments given in parameter order break,
    /// with the value of the quantity it tests (SI units); `None` inside the domain.
    pub fn breach(&self, args: &[f64]) -> Option<(&'static Requirement, f64)> {
        self.domain.iter().find_map(|r| {
            let value = r.value(args).unwrap_or(f64::NAN);
            (!r.holds(value)).then_some((r, value))
        })
    }
}

/// The engine formula with this name.
pub fn formula(name: &str) -> Option<&'static Formula> {
    FORMULAS.iter().find(|f| f.name == name)
}

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

impl Generic {
    /// What it computes, in one line.
    pub fn summary(self) -> &'static str {
        match self {
            Generic::Max => "the largest value: over the cylinders, or of the values given",
            Generic::Min => "the smallest value: over the cylinders, or of the values given",
            Generic::Mean => "the arithmetic mean over the cylinders",
            Generic::Abs => "the absolute value",
            Generic::Sqrt => "the square root",
        }
    }

    /// Its dimension rule: the result's dimension for an argument of dimension `d` (`None`
    /// when the square root of `d` has no whole exponents).
    pub fn result(self, d: Dimension) -> Option<Dimension> {
        match self {
            Generic::Sqrt => d.square_root(),
            Generic::Max | Generic::Min | Generic::Mean | Generic::Abs => Some(d),
        }
    }

    /// Whether it reduces one per-cylinder value to one value for the engine.
    pub fn reduces(self) -> bool {
        matches!(self, Generic::Max | Generic::Min | Generic::Mean)
    }
}

/// How `max`, `min` and `mean` reduce the cylinders' values to one.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Reduce {
    /// The largest.
    Max,
    /// The smallest.
    Min,
    /// The arithmetic mean.
    Mean,
}

impl Reduce {
    /// The reduction over the cylinders' values, `None` when there are none. `max` and `min`
    /// keep the first of equal values, so the deciding cylinder is the lowest numbered.
    pub fn apply(self, values: &[Dual]) -> Option<Dual> {
        let (first, rest) = values.split_first()?;
        Some(match self {
            Reduce::Max => rest.iter().fold(first.clone(), |a, b| extreme(true, a, b)),
            Reduce::Min => rest.iter().fold(first.clone(), |a, b| extreme(false, a, b)),
            Reduce::Mean => sum(values).scale(1.0 / values.len() as f64),
        })
    }
}

/// The sum of many values in one pass: their values added in order, and each input's
/// partials gathered, sorted by input and added in the order the values came. Adding one
/// at a time would merge an ever longer list of partials, quadratic in the cylinders.
fn sum(values: &[Dual]) -> Dual {
    let value = match values.split_first() {
        Some((first, rest)) => rest.iter().fold(first.value, |a, d| a + d.value),
        None => 0.0,
    };
    let mut all: Vec<_> = values
        .iter()
        .flat_map(|d| d.partials.iter().copied())
        .collect();
    all.sort_by_key(|(id, _)| *id); // stable: equal inputs keep the values' order
    let mut partials: Vec<(crate::load::InputId, f64)> = Vec::with_capacity(all.len());
    for (id, c) in all {
        match partials.last_mut() {
            Some((last, total)) if *last == id => *total += c,
            _ => partials.push((id, c)),
        }
    }
    partials.retain(|(_, c)| *c != 0.0);
    Dual { value, partials }
}

/// The larger (`greater`) or smaller of two values; the first when they are equal.
pub fn extreme(greater: bool, a: Dual, b: &Dual) -> Dual {
    if (b.value > a.value) == greater && b.value != a.value {
        b.clone()
    } else {
        a
    }
}

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

/// Swept volume `π/4 · bore² · stroke · cylinders` (Heywood, *Internal Combustion Engine
/// Fundamentals*, ch. 2).
pub fn displacement(bore: &Dual, stroke: &Dual, cylinders: &Dual) -> Dual {
    circle_area(bore).mul(stroke).mul(cylinders)
}

/// Area of a circle of this diameter, `π/4 · d²`.
fn circle_area(diameter: &Dual) -> Dual {
    diameter.powf(2.0).scale(PI / 4.0)
}

/// The inputs of a static compression ratio, one cylinder's worth.
pub struct Cylinder<'a> {
    /// Bore diameter.
    pub bore: &'a Dual,
    /// Stroke.
    pub stroke: &'a Dual,
    /// Combustion chamber volume in the head.
    pub chamber: &'a Dual,
    /// Gasket bore diameter.
    pub gasket_bore: &'a Dual,
    /// Gasket compressed thickness.
    pub gasket_thickness: &'a Dual,
    /// Piston top below the deck at top dead centre (positive below).
    pub deck_clearance: &'a Dual,
    /// Piston dish volume (positive) or dome volume (negative).
    pub piston_volume: &'a Dual,
}

/// Static compression ratio `(V_swept + V_clear) / V_clear` with
/// `V_clear = chamber + π/4·gasket_bore²·gasket_thickness + π/4·bore²·deck_clearance + piston`.
pub fn compression_ratio(c: &Cylinder) -> Dual {
    // the clearance volume here and in `clearance_volume` (the domain's test) are one sum
    let bore_area = circle_area(c.bore);
    let swept = bore_area.mul(c.stroke);
    let gasket = circle_area(c.gasket_bore).mul(c.gasket_thickness);
    let deck = bore_area.mul(c.deck_clearance);
    let clearance = c.chamber.add(&gasket).add(&deck).add(c.piston_volume);
    swept.add(&clearance).div(&clearance)
}

/// The clearance volume above the piston at top dead centre, SI units: chamber, gasket,
/// deck and piston (dish positive, dome negative), as [`compression_ratio`] adds them.
pub fn clearance_volume(
    bore: f64,
    chamber: f64,
    gasket_bore: f64,
    gasket_thickness: f64,
    deck_clearance: f64,
    piston_volume: f64,
) -> f64 {
    let area = |d: f64| PI / 4.0 * d * d;
    chamber + area(gasket_bore) * gasket_thickness + area(bore) * deck_clearance + piston_volume
}

/// Gross valve lift `lobe_lift · rocker_ratio`.
pub fn valve_lift(lobe_lift: &Dual, rocker_ratio: &Dual) -> Dual {
    lobe_lift.mul(rocker_ratio)
}

/// Net valve lift `lobe_lift · rocker_ratio − lash` (solid lifters).
pub fn net_valve_lift(lobe_lift: &Dual, rocker_ratio: &Dual, lash: &Dual) -> Dual {
    valve_lift(lobe_lift, rocker_ratio).sub(lash)
}

/// Airflow rated at `rated_drop` converted to `target_drop`: flow through an orifice scales
/// with the square root of the pressure drop, `flow · √(target_drop / rated_drop)`.
pub fn airflow_at(flow: &Dual, rated_drop: &Dual, target_drop: &Dual) -> Dual {
    flow.mul(&target_drop.div(rated_drop).sqrt())
}

/// Four-stroke airflow demand `displacement · speed · efficiency / 2` (one intake stroke
/// every two revolutions); in trade units `cfm = ci · rpm · VE / 3456`.
pub fn airflow_demand(displacement: &Dual, speed: &Dual, efficiency: &Dual) -> Dual {
    displacement.mul(speed).mul(efficiency).scale(0.5)
}

#[cfg(test)]
mod tests {
    use super::*;

    const INCH: f64 = 0.0254; // NIST SP 811 B.8, exact
    const CI: f64 = INCH * INCH * INCH;
    const CC: f64 = 1e-6;
    const CFM: f64 = 0.3048 * 0.3048 * 0.3048 / 60.0; // NIST SP 811 B.8, exact definition
    const INHG: f64 = 3386.389; // NIST SP 811 B.8, conventional

    fn c(v: f64) -> Dual {
        Dual::constant(v)
    }

    fn displacement_ci(bore_in: f64, stroke_in: f64) -> f64 {
        displacement(&c(bore_in * INCH), &c(stroke_in * INCH), &c(8.0)).value / CI
    }

    #[test]
    fn displacement_check_values() {
        // common practice, no source: a 4.000 in × 3.480 in V8 is "about 349.9 ci" (the exact
        // product is 349.848 ci, so the trade figure holds to a tenth of a cubic inch), and
        // 0.030 in over, 4.030 in × 3.480 in, is about 355.1 ci (exact 355.115 ci)
        assert!((displacement_ci(4.000, 3.480) - 349.9).abs() < 0.1);
        assert!((displacement_ci(4.030, 3.480) - 355.1).abs() < 0.1);
        // computed independently: π/4 · 4² · 3.52 · 8 = 4π · 28.16 = 353.869 ci
        // (REFERENCES.md prints 353.86, the same value cut off rather than rounded)
        let by_hand = 4.0 * std::f64::consts::PI * 28.16;
        assert!((displacement_ci(4.000, 3.52) - by_hand).abs() < 1e-9);
        assert!((by_hand - 353.87).abs() < 0.005);
    }

    fn ratio(
        bore: f64,
        stroke: f64,
        chamber: f64,
        gasket_bore: f64,
        gasket_thickness: f64,
        deck: f64,
        piston: f64,
    ) -> f64 {
        compression_ratio(&Cylinder {
            bore: &c(bore),
            stroke: &c(stroke),
            chamber: &c(chamber),
            gasket_bore: &c(gasket_bore),
            gasket_thickness: &c(gasket_thickness),
            deck_clearance: &c(deck),
            piston_volume: &c(piston),
        })
        .value
    }

    #[test]
    fn compression_ratio_first_worked_example() {
        // REFERENCES.md, a published magazine worked example, recomputed: bore 4.000 in,
        // stroke 3.48 in, deck 0.033 in, gasket 0.020 in at 4.000 in, dish 5 cc, chamber
        // 64 cc gives 9.97 (exact recomputation 9.967)
        let cr = ratio(
            4.0 * INCH,
            3.48 * INCH,
            64.0 * CC,
            4.0 * INCH,
            0.020 * INCH,
            0.033 * INCH,
            5.0 * CC,
        );
        assert!((cr - 9.967).abs() < 0.0005, "{cr}");
    }

    #[test]
    fn compression_ratio_second_worked_example() {
        // REFERENCES.md: bore 4.25 in, stroke 4.00 in, gasket 0.051 in at bore diameter,
        // deck 0.005 in, chamber 64 cc, dish 1.22 in³: 10.59 (published 10.60 from rounded
        // inputs; ±0.02 allowed)
        let cr = ratio(
            4.25 * INCH,
            4.0 * INCH,
            64.0 * CC,
            4.25 * INCH,
            0.051 * INCH,
            0.005 * INCH,
            1.22 * CI,
        );
        assert!((cr - 10.60).abs() <= 0.02, "{cr}");
    }

    #[test]
    fn a_dome_raises_the_ratio() {
        let dish = ratio(
            4.0 * INCH,
            3.48 * INCH,
            64.0 * CC,
            4.0 * INCH,
            0.020 * INCH,
            0.033 * INCH,
            5.0 * CC,
        );
        let dome = ratio(
            4.0 * INCH,
            3.48 * INCH,
            64.0 * CC,
            4.0 * INCH,
            0.020 * INCH,
            0.033 * INCH,
            -5.0 * CC,
        );
        assert!(dome > dish);
    }

    #[test]
    #[allow(
        clippy::approx_constant,
        reason = "0.70711 is the reference's printed value, checked as printed"
    )]
    fn airflow_converts_by_the_square_root_of_the_pressure_drops() {
        // REFERENCES.md: √(1.5/3.0) = 0.70711, so 500 cfm at 3.0 inHg is about 354 cfm at 1.5
        let at = airflow_at(&c(500.0 * CFM), &c(3.0 * INHG), &c(1.5 * INHG)).value / CFM;
        assert!((at / 500.0 - 0.707_11).abs() < 5e-6);
        assert!((at - 353.55).abs() < 0.01);
    }

    #[test]
    fn valve_lift_check() {
        // REFERENCES.md [computed]: 0.320 in × 1.70 = 0.544 in; net of 0.016 in lash 0.528 in
        assert!((valve_lift(&c(0.320), &c(1.70)).value - 0.544).abs() < 1e-12);
        assert!((net_valve_lift(&c(0.320), &c(1.70), &c(0.016)).value - 0.528).abs() < 1e-12);
    }

    #[test]
    fn airflow_demand_rule_of_thumb() {
        // REFERENCES.md [computed], common practice: cfm = ci · rpm · VE / 3456;
        // 440 ci at 6000 rpm and VE 0.90 is 687.5 cfm
        let rpm = 1.0 / 60.0; // revolutions per second, as the unit table has it
        let demand = airflow_demand(&c(440.0 * CI), &c(6000.0 * rpm), &c(0.90)).value / CFM;
        assert!((demand - 687.5).abs() < 1e-9, "{demand}");
    }

    /// The quantity of the first requirement of `name` that `args` (SI units) break.
    fn broken(name: &str, args: &[f64]) -> Option<&'static str> {
        formula(name)
            .and_then(|f| f.breach(args))
            .map(|(r, _)| r.quantity)
    }

    /// The demo's legal cylinder in SI: bore 4.030 in, stroke 3.480 in, chamber 72 cc,
    /// gasket 4.100 in × 0.041 in, deck 0.012 in, dish 12 cc.
    fn cylinder(chamber_cc: f64, deck_in: f64, piston_cc: f64) -> [f64; 7] {
        [
            4.030 * INCH,
            3.480 * INCH,
            chamber_cc * CC,
            4.100 * INCH,
            0.041 * INCH,
            deck_in * INCH,
            piston_cc * CC,
        ]
    }

    #[test]
    fn the_compression_ratio_needs_a_positive_clearance_volume() {
        // Heywood, Internal Combustion Engine Fundamentals, ch. 2: r_c = (V_d + V_c) / V_c
        // with V_c the clearance volume, which must be above zero (then r_c > 1).
        // Clearance by hand: gasket π/4 · 4.100² · 0.041 = 0.5413043 in³ = 8.870388 cc,
        // deck π/4 · 4.030² · (−0.050) = −0.6377787 in³ = −10.451320 cc (1 in³ =
        // 16.387064 cc, NIST SP 811): 40 + 8.870388 − 10.451320 − 38.419068 cc is zero.
        let edge = 40.0 + 8.870_388 - 10.451_320;
        assert_eq!(
            broken("compression_ratio", &cylinder(72.0, 0.012, 12.0)),
            None
        );
        let beyond = cylinder(40.0, -0.050, -(edge + 0.01));
        assert_eq!(
            broken("compression_ratio", &beyond),
            Some("clearance volume")
        );
        let value = formula("compression_ratio")
            .and_then(|f| f.breach(&beyond))
            .map(|(_, v)| v / CC);
        assert!(value.is_some_and(|v| (v + 0.01).abs() < 1e-5), "{value:?}");
        // just inside the edge the ratio is large but above 1, and the formula is applied
        let inside = cylinder(40.0, -0.050, -(edge - 0.01));
        assert_eq!(broken("compression_ratio", &inside), None);
        let args: Vec<Dual> = inside.iter().map(|v| c(*v)).collect();
        let refs: Vec<&Dual> = args.iter().collect();
        let cr = formula("compression_ratio").and_then(|f| f.apply_to(&refs));
        assert!(cr.is_some_and(|cr| cr.value > 1.0));
        // a zero stroke would give a ratio of exactly 1: the stroke must be above zero
        let mut flat = cylinder(72.0, 0.012, 12.0);
        flat[1] = 0.0;
        assert_eq!(broken("compression_ratio", &flat), Some("stroke"));
        let mut no_bore = cylinder(72.0, 0.012, 12.0);
        no_bore[0] = -4.030 * INCH;
        assert_eq!(broken("compression_ratio", &no_bore), Some("bore"));
        // a gasket of zero thickness is a gasket left out; a negative one is impossible
        let mut no_gasket = cylinder(72.0, 0.012, 12.0);
        no_gasket[4] = 0.0;
        assert_eq!(broken("compression_ratio", &no_gasket), None);
        no_gasket[4] = -0.001 * INCH;
        assert_eq!(
            broken("compression_ratio", &no_gasket),
            Some("gasket thickness")
        );
    }

    #[test]
    fn displacement_needs_positive_bore_stroke_and_cylinders() {
        // Heywood ch. 2: V_d = π/4 · B² · L per cylinder; each factor is above zero
        let d = |b: f64, s: f64, n: f64| broken("displacement", &[b * INCH, s * INCH, n]);
        assert_eq!(d(4.0, 3.48, 8.0), None);
        assert_eq!(d(0.0, 3.48, 8.0), Some("bore"));
        assert_eq!(d(-4.0, 3.48, 8.0), Some("bore"));
        assert_eq!(d(4.0, 0.0, 8.0), Some("stroke"));
        assert_eq!(d(4.0, 3.48, 0.0), Some("cylinders"));
        assert_eq!(d(4.0, 3.48, -8.0), Some("cylinders"));
    }

    #[test]
    fn valve_lift_needs_a_lift_of_at_least_zero() {
        // common practice, no source: gross lift = lobe lift × rocker ratio, net = gross − lash;
        // 0.320 in × 1.70 = 0.544 in gross, so a lash of 0.544 in is the edge
        assert_eq!(broken("valve_lift", &[0.320, 1.70]), None);
        assert_eq!(broken("valve_lift", &[0.0, 1.70]), None);
        assert_eq!(broken("valve_lift", &[-0.001, 1.70]), Some("lobe lift"));
        assert_eq!(broken("valve_lift", &[0.320, 0.0]), Some("rocker ratio"));
        assert_eq!(broken("net_valve_lift", &[0.320, 1.70, 0.016]), None);
        assert_eq!(broken("net_valve_lift", &[0.320, 1.70, 0.0]), None);
        assert_eq!(
            broken("net_valve_lift", &[0.320, 1.70, -0.001]),
            Some("lash")
        );
        assert_eq!(broken("net_valve_lift", &[0.320, 1.70, 0.544]), None);
        assert_eq!(
            broken("net_valve_lift", &[0.320, 1.70, 0.545]),
            Some("net lift")
        );
    }

    #[test]
    fn airflow_conversion_needs_positive_pressure_drops() {
        // the orifice law, flow ∝ √(pressure drop); common practice, no source: the ratio of
        // the drops must be defined and above zero
        let at = |f: f64, rated: f64, target: f64| {
            broken("airflow_at", &[f * CFM, rated * INHG, target * INHG])
        };
        assert_eq!(at(500.0, 3.0, 1.5), None);
        assert_eq!(at(0.0, 3.0, 1.5), None);
        assert_eq!(at(-1.0, 3.0, 1.5), Some("flow"));
        assert_eq!(at(500.0, 0.0, 1.5), Some("rated pressure drop"));
        assert_eq!(at(500.0, -3.0, 1.5), Some("rated pressure drop"));
        assert_eq!(at(500.0, 3.0, 0.0), Some("target pressure drop"));
    }

    #[test]
    fn airflow_demand_needs_positive_displacement_speed_and_efficiency() {
        // common practice, no source: cfm = ci · rpm · VE / 3456, each factor above zero
        let rpm = 1.0 / 60.0;
        let demand =
            |ci: f64, speed: f64, ve: f64| broken("airflow_demand", &[ci * CI, speed * rpm, ve]);
        assert_eq!(demand(440.0, 6000.0, 0.90), None);
        assert_eq!(demand(0.0, 6000.0, 0.90), Some("displacement"));
        assert_eq!(demand(440.0, 0.0, 0.90), Some("speed"));
        assert_eq!(demand(440.0, 6000.0, -0.1), Some("efficiency"));
    }

    #[test]
    fn every_domain_reads_parameters_of_its_formula_with_their_dimensions() {
        for f in FORMULAS {
            assert!(!f.domain.is_empty(), "{} has no domain", f.name);
            assert!(!f.source.is_empty(), "{} names no source", f.name);
            for r in f.domain {
                assert!(r.reads().iter().all(|i| *i < f.params.len()), "{}", f.name);
                if let Tested::Argument(i) = r.tested {
                    let param = f.params.get(i).map(|p| p.dimension);
                    assert_eq!(param, Some(r.dimension), "{} {}", f.name, r.quantity);
                }
                // a list of the wrong length is never inside the domain
                assert!(f.breach(&[]).is_some(), "{}", f.name);
            }
        }
    }

    #[test]
    fn every_formula_takes_as_many_arguments_as_it_has_parameters() {
        for f in FORMULAS {
            assert_eq!(f.apply.arity(), f.params.len(), "{}", f.name);
        }
    }

    #[test]
    fn max_and_min_keep_the_first_of_equal_values_and_mean_averages() {
        let values = [
            Dual::input(0, 2.0),
            Dual::input(1, 3.0),
            Dual::input(2, 3.0),
        ];
        assert_eq!(Reduce::Max.apply(&values), Some(Dual::input(1, 3.0)));
        assert_eq!(Reduce::Min.apply(&values), Some(Dual::input(0, 2.0)));
        // (2 + 3 + 3) / 3, computed by hand
        let mean = Reduce::Mean.apply(&values).map(|d| d.value);
        assert!(mean.is_some_and(|m| (m - 8.0 / 3.0).abs() < 1e-15));
        assert_eq!(Reduce::Max.apply(&[]), None);
    }

    #[test]
    fn the_mean_gathers_every_inputs_partials_as_adding_one_at_a_time_would() {
        // readings 0..n, each with a shared calibration input 1000: ∂mean/∂reading = 1/n and
        // ∂mean/∂calibration = 1 (the mean of n readings each shifted by it), by hand
        let n = 500_u32;
        let values: Vec<Dual> = (0..n)
            .rev()
            .map(|i| Dual::reading(i, 4.0 + f64::from(i) * 1e-4, Some((1000, 0.0))))
            .collect();
        let mean = Reduce::Mean
            .apply(&values)
            .unwrap_or_else(|| panic!("no mean"));
        let one_at_a_time = values[1..]
            .iter()
            .fold(values[0].clone(), |acc, d| acc.add(d))
            .scale(1.0 / f64::from(n));
        assert_eq!(mean, one_at_a_time);
        assert_eq!(mean.partials.len(), n as usize + 1);
        assert!((mean.partial(7) - 1.0 / f64::from(n)).abs() < 1e-15);
        assert!((mean.partial(1000) - 1.0).abs() < 1e-12);
    }
}
