//! gonogo's formulas and uncertainty propagation against outside references: GUM
//! propagation vectors made once with the Python package GTC (GUM Tree Calculator,
//! JCGM 100:2008) by `tests/vectors/make_gum_vectors.py`, committed as `tests/vectors/gum.json`.

use gonogo::check::builtins;
use gonogo::evaluate::dual::Dual;
use serde_json::Value;

fn vectors() -> Vec<Value> {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/vectors/gum.json"
    ))
    .unwrap_or_default();
    let doc: Value = serde_json::from_str(&text).unwrap_or(Value::Null);
    doc["cases"].as_array().cloned().unwrap_or_default()
}

/// The case's inputs as duals (input ids in the order listed) and their standard uncertainties.
fn inputs(case: &Value, order: &[&str]) -> (Vec<Dual>, Vec<f64>) {
    let mut duals = Vec::new();
    let mut us = Vec::new();
    for (i, name) in order.iter().enumerate() {
        let pair = &case["inputs"][*name];
        let (v, u) = (
            pair[0].as_f64().unwrap_or(f64::NAN),
            pair[1].as_f64().unwrap_or(f64::NAN),
        );
        duals.push(Dual::input(u32::try_from(i).unwrap_or(0), v));
        us.push(u);
    }
    (duals, us)
}

fn ours(name: &str, x: &[Dual]) -> Dual {
    // the GTC cases are named after the formulas; the dome case is the same formula
    let formula = if name == "compression_ratio_dome" {
        "compression_ratio"
    } else {
        name
    };
    let args: Vec<&Dual> = x.iter().collect();
    builtins::formula(formula)
        .and_then(|f| f.apply_to(&args))
        .unwrap_or_else(|| panic!("no formula for case {name}"))
}

const ORDERS: &[(&str, &[&str])] = &[
    ("displacement", &["bore", "stroke", "cylinders"]),
    (
        "compression_ratio",
        &[
            "bore",
            "stroke",
            "chamber",
            "gasket_bore",
            "gasket_thickness",
            "deck_clearance",
            "piston_volume",
        ],
    ),
    (
        "compression_ratio_dome",
        &[
            "bore",
            "stroke",
            "chamber",
            "gasket_bore",
            "gasket_thickness",
            "deck_clearance",
            "piston_volume",
        ],
    ),
    ("airflow_at", &["flow", "rated_drop", "target_drop"]),
    ("net_valve_lift", &["lobe_lift", "rocker_ratio", "lash"]),
];

#[test]
fn propagation_matches_gtc_for_every_formula() {
    let cases = vectors();
    assert_eq!(
        cases.len(),
        ORDERS.len(),
        "tests/vectors/gum.json is missing cases"
    );
    for case in &cases {
        let name = case["name"].as_str().unwrap_or_default();
        let order = ORDERS
            .iter()
            .find(|(n, _)| *n == name)
            .map(|(_, o)| *o)
            .unwrap_or_else(|| panic!("unknown case {name}"));
        let (x, us) = inputs(case, order);
        let y = ours(name, &x);
        let u = y.combined_uncertainty(|id| us[id as usize]);
        let (want_v, want_u) = (
            case["value"].as_f64().unwrap_or(f64::NAN),
            case["standard_uncertainty"].as_f64().unwrap_or(f64::NAN),
        );
        assert!(
            ((y.value - want_v) / want_v).abs() < 1e-12,
            "{name}: value {} vs GTC {want_v}",
            y.value
        );
        assert!(
            ((u - want_u) / want_u).abs() < 1e-9,
            "{name}: u {u} vs GTC {want_u}"
        );
    }
}

#[test]
fn displacement_relative_uncertainty_follows_the_closed_form() {
    // REFERENCES.md [computed]: u(V)/V = √((2·u_B/B)² + (u_S/S)²) for V = π/4·B²·S·n
    let (b, s) = (Dual::input(0, 0.102_362), Dual::input(1, 0.088_392));
    let (ub, us) = (1.27e-5, 2.54e-5);
    let v = builtins::displacement(&b, &s, &Dual::constant(8.0));
    let u = v.combined_uncertainty(|id| if id == 0 { ub } else { us });
    let closed = ((2.0 * ub / b.value).powi(2) + (us / s.value).powi(2)).sqrt();
    assert!((u / v.value - closed).abs() < 1e-14);
}
