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

// ---------------------------------------------------------------- through the whole pipeline

/// A small rulebook of the invented series for the reference cases below.
const RULES: &str = r#"
series "Tamsin Valley Stock Car Club"
edition "reference" effective 2027-01-01
decision guarded rejection

measure cylinders: count
measure bore: length per cylinder "Bore gauge"
measure stroke: length "Dial indicator"
measure chamber: volume per cylinder "Burette"
measure piston.volume: volume per cylinder "Burette"

define mean_bore_displacement = displacement(bore: mean(bore), stroke: stroke, cylinders: cylinders)
define chamber_and_piston = chamber + piston.volume

class reference "Reference"
  rule 1 "Displacement" require mean_bore_displacement <= 400 ci end
  rule 2 "Chamber and piston" require chamber_and_piston >= 60 cc end
end
"#;

/// `RULES` with `header` written after its decision line.
fn checked(header: &str) -> gonogo::check::model::CheckedRulebook {
    let text = RULES.replace(
        "decision guarded rejection\n",
        &format!("decision guarded rejection\n{header}"),
    );
    let (book, problems) = gonogo::parse::parse_rulebook(0, &text);
    assert!(problems.is_empty(), "{problems:?}");
    let (checked, problems) = gonogo::check::check(&gonogo::parse::includes::RulebookFiles {
        files: vec![(0, book)],
    });
    checked.unwrap_or_else(|| panic!("{problems:?}"))
}

/// The engine report of `yaml` against `rulebook`.
fn run<T>(
    rulebook: &gonogo::check::model::CheckedRulebook,
    yaml: &str,
    look: impl Fn(&gonogo::evaluate::outcome::EngineReport) -> T,
) -> T {
    let mut sources = gonogo::source::SourceMap::default();
    let d = gonogo::load::declaration_from_text(
        std::path::Path::new("reference.yaml"),
        yaml.to_string(),
        rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    let class = rulebook
        .class("reference")
        .unwrap_or_else(|| panic!("no class"));
    look(&gonogo::evaluate::check_engine(rulebook, class, &d, None))
}

/// The value and combined standard uncertainty of derived value `name` in rule `rule`'s trace.
fn derived(r: &gonogo::evaluate::outcome::EngineReport, rule: usize, name: &str) -> (f64, f64) {
    use gonogo::evaluate::outcome::Trace;
    r.outcomes[rule]
        .trace
        .iter()
        .find_map(|t| match t {
            Trace::Derived {
                derived,
                values,
                uncertainties,
            } if derived.name == name => Some((values[0], uncertainties[0])),
            _ => None,
        })
        .unwrap_or_else(|| panic!("no {name} in the trace"))
}

/// A declaration of eight bores with `gauge` as the bore gauge, the stroke read with a
/// 0.001 in dial indicator, and one chamber and piston volume per cylinder.
fn bores_with(gauge: &str, bores: &[&str]) -> String {
    let list: Vec<String> = bores.iter().map(|b| format!("\"{b}\"")).collect();
    let cc = vec!["\"72.1 cc\""; bores.len()].join(", ");
    format!(
        r#"class: reference
instruments:
  bore_gauge: {gauge}
  dial_indicator: {{resolution: "0.001 in"}}
measurements:
  cylinders: {n}
  bore:
    values: [{bores}]
    instrument: bore_gauge
  stroke:
    value: "3.480 in"
    instrument: dial_indicator
  chamber: [{cc}]
  piston.volume: [{cc}]
"#,
        n = bores.len(),
        bores = list.join(", "),
    )
}

fn gtc(section: &str, name: &str) -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/vectors/gum.json"
    ))
    .unwrap_or_default();
    let doc: Value = serde_json::from_str(&text).unwrap_or(Value::Null);
    doc[section]
        .as_array()
        .and_then(|cases| cases.iter().find(|c| c["name"] == name).cloned())
        .unwrap_or_else(|| panic!("no {section} case {name} in gum.json"))
}

fn number(v: &Value) -> f64 {
    v.as_f64().unwrap_or(f64::NAN)
}

const OPEN4_BORES: [&str; 8] = [
    "4.0302 in",
    "4.0305 in",
    "4.0301 in",
    "4.0306 in",
    "4.0303 in",
    "4.0304 in",
    "4.0302 in",
    "4.0305 in",
];

#[test]
fn a_gauge_calibration_shared_by_eight_bores_matches_gtc() {
    // GTC 1.5.1 (tests/vectors/gum.json): each bore ureal(b, u_res) + one ureal(0, u_cal)
    let case = gtc("correlated", "mean_bore_displacement_shared_gauge");
    let rulebook = checked("");
    let gauge = r#"{resolution: "0.0001 in", calibration: "0.0004 in", k: 2}"#;
    let (v, u) = run(&rulebook, &bores_with(gauge, &OPEN4_BORES), |r| {
        derived(r, 0, "mean_bore_displacement")
    });
    let (want_v, want_u) = (
        number(&case["value"]),
        number(&case["standard_uncertainty"]),
    );
    assert!(
        ((v - want_v) / want_v).abs() < 1e-12,
        "value {v} vs GTC {want_v}"
    );
    assert!(
        ((u - want_u) / want_u).abs() < 1e-9,
        "u {u} vs GTC {want_u}"
    );
}

#[test]
fn a_calibration_shared_by_eight_bores_weighs_sqrt_8_times_an_independent_one() {
    // issue 9; GUM JCGM 100:2008 5.2 and F.1.2.3: the shared input's sensitivity is the sum
    // of the eight equal sensitivities (8c), against √8·c for eight independent errors
    let rulebook = checked("");
    let bores = ["4.030 in"; 8];
    let u_of = |gauge: &str| {
        run(&rulebook, &bores_with(gauge, &bores), |r| {
            derived(r, 0, "mean_bore_displacement").1
        })
    };
    let exact_stroke = |gauge: &str| {
        let yaml = bores_with(gauge, &bores).replace(
            "  stroke:\n    value: \"3.480 in\"\n    instrument: dial_indicator\n",
            "  stroke: \"3.480 in\"\n",
        );
        run(&rulebook, &yaml, |r| {
            derived(r, 0, "mean_bore_displacement").1
        })
    };
    let shared = exact_stroke(r#"{calibration: "0.0004 in", k: 2}"#);
    let independent = exact_stroke(r#"{uncertainty: "0.0004 in", k: 2}"#);
    assert!(
        (shared / independent - 8f64.sqrt()).abs() < 1e-12,
        "shared {shared} independent {independent}"
    );
    // REFERENCES.md [computed]: with no random part, u(mean bore) = u_cal; so u(V)/V = 2·u_cal/B
    let v = 4.030 * 0.0254;
    let u_cal = 0.0004 * 0.0254 / 2.0;
    let displacement = std::f64::consts::PI / 4.0 * v * v * 3.480 * 0.0254 * 8.0;
    assert!((shared / displacement - 2.0 * u_cal / v).abs() < 1e-12);
    // with the stroke's own uncertainty the bores' share is smaller but still there
    assert!(u_of(r#"{calibration: "0.0004 in", k: 2}"#) > shared);
}

#[test]
fn chamber_and_piston_read_with_one_burette_match_gtc_with_set_correlation() {
    // GTC 1.5.1: the two totals given r = u_cal²/(u₁u₂) by set_correlation, against gonogo's
    // one shared calibration input added to both readings
    let case = gtc("correlated", "compression_ratio_shared_burette");
    let order = ORDERS[1].1;
    let (mut x, mut us) = inputs(&case, order);
    let shared = u32::try_from(order.len()).unwrap_or(0);
    for name in ["chamber", "piston_volume"] {
        let at = order.iter().position(|n| *n == name).unwrap_or(0);
        x[at] = Dual::reading(at as u32, x[at].value, Some((shared, 0.0)));
    }
    us.push(number(&case["shared"]["u"]));
    let y = ours("compression_ratio", &x);
    let u = y.combined_uncertainty(|id| us[id as usize]);
    let want = number(&case["standard_uncertainty"]);
    assert!(((u - want) / want).abs() < 1e-9, "u {u} vs GTC {want}");
    // and it is not the uncorrelated answer
    let uncorrelated = y.combined_uncertainty(|id| {
        let base = us[id as usize];
        if id == 2 || id == 6 {
            base.hypot(us[shared as usize])
        } else if id == shared {
            0.0
        } else {
            base
        }
    });
    assert!(((uncorrelated - want) / want).abs() > 1e-3);
}

/// The declaration of `yaml` against `rulebook`.
fn load(rulebook: &gonogo::check::model::CheckedRulebook, yaml: &str) -> gonogo::load::Declaration {
    let mut sources = gonogo::source::SourceMap::default();
    gonogo::load::declaration_from_text(
        std::path::Path::new("reference.yaml"),
        yaml.to_string(),
        rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"))
}

#[test]
fn repeated_readings_give_the_type_a_mean_and_uncertainty_of_gtc() {
    // GTC 1.5.1 type_a.estimate (GUM JCGM 100:2008 4.2.1 to 4.2.3): mean, s/√n and n − 1
    use gonogo::load::Distribution;
    let rulebook = checked("");
    for (name, measurement, readings) in [
        (
            "chamber_recc",
            "chamber",
            r#"["72.1 cc", "72.4 cc", "72.2 cc"]"#,
        ),
        (
            "bore_three",
            "bore",
            r#"["4.0331 in", "4.0338 in", "4.0335 in"]"#,
        ),
    ] {
        let case = gtc("type_a", name);
        let yaml = format!(
            "class: reference\nmeasurements:\n  cylinders: 1\n  {measurement}:\n    readings:\n      - {readings}\n"
        );
        let d = load(&rulebook, &yaml);
        let input = d
            .inputs
            .iter()
            .find(|i| i.label(&rulebook) == format!("{measurement}[1]"))
            .unwrap_or_else(|| panic!("no {measurement}[1]"));
        let (want_v, want_u) = (
            number(&case["value"]),
            number(&case["standard_uncertainty"]),
        );
        assert!(((input.value - want_v) / want_v).abs() < 1e-12, "{name}");
        assert!(
            ((input.standard_uncertainty - want_u) / want_u).abs() < 1e-9,
            "{name}"
        );
        assert_eq!(
            input.components.first().map(|c| c.distribution),
            Some(Distribution::StudentT {
                degrees_of_freedom: number(&case["degrees_of_freedom"])
            }),
            "{name}"
        );
    }
}

#[test]
fn repeated_readings_with_an_instrument_add_its_components_to_their_spread() {
    // GUM JCGM 100:2008 5.1.2 with unit sensitivities: u² = (s/√n)² + u_instrument²
    let rulebook = checked("");
    let yaml = "class: reference\ninstruments:\n  burette: {uncertainty: \"0.2 cc\", k: 2, calibration: \"0.1 cc\"}\nmeasurements:\n  cylinders: 1\n  chamber:\n    readings: [[\"72.1 cc\", \"72.4 cc\", \"72.2 cc\"]]\n    instrument: burette\n";
    let d = load(&rulebook, yaml);
    let chamber = &d.inputs[1];
    let type_a = 0.152_752_523_165_195_1e-6 / 3f64.sqrt(); // s = √(0.07/3) cc, n = 3 [computed]
    let want = type_a.hypot(0.1e-6);
    assert!(((chamber.standard_uncertainty - want) / want).abs() < 1e-9);
    assert_eq!(chamber.components.len(), 2);
    // the calibration is kept apart, as one shared input
    let shared = d
        .calibration_of(1)
        .unwrap_or_else(|| panic!("no calibration"));
    assert!((d.inputs[shared as usize].standard_uncertainty - 0.05e-6).abs() < 1e-18);
}

/// The numbers behind rule `rule`'s finding.
fn numeric(r: &gonogo::evaluate::outcome::EngineReport, rule: usize) -> (f64, f64, f64) {
    let n = r.outcomes[rule]
        .checked
        .as_ref()
        .and_then(|c| c.numeric.as_ref())
        .unwrap_or_else(|| panic!("rule {rule} has no numbers"));
    let factor = n.k;
    (factor, n.degrees_of_freedom, n.expanded / factor)
}

/// One cylinder: a chamber cc'd three times and a piston volume read once, both with a
/// burette of U = 0.2 cc at k = 2.
const RECC: &str = r#"class: reference
instruments:
  burette: {uncertainty: "0.2 cc", k: 2}
measurements:
  cylinders: 1
  chamber:
    readings: [["72.1 cc", "72.4 cc", "72.2 cc"]]
    instrument: burette
  piston.volume:
    values: ["12.1 cc"]
    instrument: burette
"#;

#[test]
fn a_coverage_probability_takes_k_from_t_at_the_welch_satterthwaite_degrees_of_freedom() {
    // GTC 1.5.1: dof() of the sum (Welch–Satterthwaite, GUM G.4) and reporting.k_factor
    let case = gtc("coverage", "chamber_recc_plus_piston");
    let (k, nu, u) = run(&checked("coverage 95 %\n"), RECC, |r| numeric(r, 1));
    let want_nu = number(&case["effective_degrees_of_freedom"]);
    assert!(
        ((nu - want_nu) / want_nu).abs() < 1e-9,
        "ν_eff {nu} vs GTC {want_nu}"
    );
    let want_k = number(&case["k95"]);
    assert!((k - want_k).abs() < 1e-9, "k {k} vs GTC {want_k}");
    let want_u = number(&case["standard_uncertainty"]);
    assert!(
        ((u - want_u) / want_u).abs() < 1e-9,
        "u {u} vs GTC {want_u}"
    );
}

#[test]
fn k_from_statrs_agrees_with_gtc_at_several_degrees_of_freedom() {
    // GTC 1.5.1 reporting.k_factor (Student t, 95 %) at ν = 2, 5, 10, 19, 50
    use gonogo::check::model::Coverage;
    use gonogo::evaluate::coverage::coverage_factor;
    for nu in [2, 5, 10, 19, 50] {
        let want = number(&gtc("coverage", &format!("t_{nu}"))["k95"]);
        let k = coverage_factor(Coverage::Probability(0.95), f64::from(nu));
        assert!((k - want).abs() < 1e-9, "ν = {nu}: k {k} vs GTC {want}");
    }
}

#[test]
fn without_a_coverage_line_k_stays_2_and_a_fixed_factor_is_used_as_written() {
    // issue 9: a rulebook without `coverage` keeps k = 2 for every finding, as before
    let (k, nu, _) = run(&checked(""), RECC, |r| numeric(r, 1));
    assert_eq!(k, 2.0);
    assert!(
        nu.is_finite(),
        "the Type A chamber gives finite degrees of freedom"
    );
    let (k, _, _) = run(&checked("coverage k = 3\n"), RECC, |r| numeric(r, 1));
    assert_eq!(k, 3.0);
    // Type B inputs alone: ν_eff infinite, so 95 % gives the normal 1.96 (GUM G.3.3)
    let yaml = RECC.replace(
        "readings: [[\"72.1 cc\", \"72.4 cc\", \"72.2 cc\"]]",
        "values: [\"72.2 cc\"]",
    );
    let (k, nu, _) = run(&checked("coverage 95 %\n"), &yaml, |r| numeric(r, 1));
    assert!(nu.is_infinite());
    assert!((k - 1.959_964).abs() < 1e-6);
}
