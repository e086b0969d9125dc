//! The built-in engine formulas on dual numbers, all in SI units (DESIGN.md section 4; sources
//! are cited in the tests).

use std::f64::consts::PI;

use super::dual::Dual;

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
    let swept = circle_area(c.bore).mul(c.stroke);
    let gasket = circle_area(c.gasket_bore).mul(c.gasket_thickness);
    let deck = circle_area(c.bore).mul(c.deck_clearance);
    let clearance = c.chamber.add(&gasket).add(&deck).add(c.piston_volume);
    swept.add(&clearance).div(&clearance)
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
