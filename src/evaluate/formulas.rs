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
    let bore_area = circle_area(c.bore);
    let swept = bore_area.mul(c.stroke);
    let gasket = circle_area(c.gasket_bore).mul(c.gasket_thickness);
    let deck = bore_area.mul(c.deck_clearance);
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

/// Applies the built-in formula `name` to its arguments in parameter order (as in
/// `check::builtins::FORMULAS`); `None` for an unknown name or a wrong number of arguments.
pub fn apply(name: &str, x: &[&Dual]) -> Option<Dual> {
    Some(match (name, x) {
        ("displacement", [b, s, n]) => displacement(b, s, n),
        (
            "compression_ratio",
            [
                bore,
                stroke,
                chamber,
                gasket_bore,
                gasket_thickness,
                deck_clearance,
                piston_volume,
            ],
        ) => compression_ratio(&Cylinder {
            bore,
            stroke,
            chamber,
            gasket_bore,
            gasket_thickness,
            deck_clearance,
            piston_volume,
        }),
        ("valve_lift", [l, r]) => valve_lift(l, r),
        ("net_valve_lift", [l, r, lash]) => net_valve_lift(l, r, lash),
        ("airflow_at", [f, rated, target]) => airflow_at(f, rated, target),
        ("airflow_demand", [d, s, e]) => airflow_demand(d, s, e),
        _ => return None,
    })
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
}
