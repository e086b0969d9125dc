//! The probability that every cylinder conforms (issue 9, deliverable 6), checked against
//! independent computations: the product of independent probabilities with Φ summed from its
//! series here; the worst cylinder's probability when one input is all there is; orthant
//! probabilities of the multivariate normal distribution from scipy (tests/vectors/joint.json,
//! made once by tests/vectors/make_joint_vectors.py); and one rulebook checked end to end.

mod common;

use common::OrPanic;
use gonogo::check::check;
use gonogo::evaluate::check_engine;
use gonogo::evaluate::dual::Dual;
use gonogo::evaluate::joint::{self, JointMethod};
use gonogo::load::{InputId, declaration_from_text};
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::source::SourceMap;

/// Φ(z) = (1 + erf(z/√2))/2 with erf from its Maclaurin series (good to 1e-14 for |z| ≤ 4),
/// and beyond |z| = 5 from the asymptotic series of the tail, φ(z)/z·(1 − 1/z² + 3/z⁴)
/// (Abramowitz and Stegun 26.2.12): independent of gonogo's erfc.
fn phi(z: f64) -> f64 {
    if z.abs() > 5.0 {
        let density = (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
        let tail = density / z.abs() * (1.0 - 1.0 / (z * z) + 3.0 / z.powi(4));
        return if z > 0.0 { 1.0 - tail } else { tail };
    }
    let x = z / std::f64::consts::SQRT_2;
    let (mut term, mut sum) = (x, x);
    for n in 1..200 {
        term *= -x * x / n as f64;
        sum += term / (2 * n + 1) as f64;
    }
    0.5 * (1.0 + 2.0 / std::f64::consts::PI.sqrt() * sum)
}

/// A margin `value` with partials `(input, ∂margin/∂input)`, sorted as a `Dual` keeps them.
fn margin(value: f64, partials: &[(InputId, f64)]) -> Dual {
    let mut partials = partials.to_vec();
    partials.sort_by_key(|p| p.0);
    Dual { value, partials }
}

#[test]
fn eight_independent_cylinders_each_at_95_2_percent_all_conform_at_about_68_percent() {
    // issue 9: "(95.2 %) where the probability that all eight conform is far lower (about 68 %
    // if independent)". Φ⁻¹(0.952) = 1.66456 (scipy.stats.norm.ppf); 0.952⁸ = 0.67468.
    let z = 1.664_562_861_202_721;
    let u = 0.0003;
    let margins: Vec<Dual> = (0..8).map(|i| margin(z * u, &[(i, -1.0)])).collect();
    let all = joint::one_sided(&margins, false, |_| u).or_panic("eight cylinders");
    assert_eq!(all.method, JointMethod::Product);
    assert!(all.shared.is_empty());
    assert!((phi(z) - 0.952).abs() < 1e-12);
    assert!((all.probability - phi(z).powi(8)).abs() < 1e-12);
    assert!(
        (all.probability - 0.674_677).abs() < 1e-6,
        "{}",
        all.probability
    );
}

#[test]
fn one_input_in_every_margin_and_nothing_else_gives_the_worst_cylinders_probability() {
    // every margin moves with the one input: all conform exactly when the worst one does
    let u = 0.0004;
    let values = [0.0010, 0.0004, 0.0008, 0.0012];
    let margins: Vec<Dual> = values.iter().map(|m| margin(*m, &[(0, -1.0)])).collect();
    let all = joint::one_sided(&margins, false, |_| u).or_panic("four cylinders");
    assert_eq!(all.method, JointMethod::Quadrature { dimensions: 1 });
    assert_eq!(all.shared, vec![0]);
    let worst = phi(0.0004 / u);
    assert!(
        (all.probability - worst).abs() < 1e-9,
        "{}",
        all.probability
    );
}

#[test]
fn a_range_with_one_shared_input_and_nothing_else_is_the_narrowest_window() {
    // low margins ml_i + δ, high margins mh_i − δ: all conform when δ lies in every window,
    // that is from −min ml to min mh
    let u = 0.5;
    let windows = [(1.0, 2.0), (1.5, 0.7), (0.9, 1.4)];
    let low: Vec<Dual> = windows.iter().map(|w| margin(w.0, &[(0, 1.0)])).collect();
    let high: Vec<Dual> = windows.iter().map(|w| margin(w.1, &[(0, -1.0)])).collect();
    let all = joint::between(&low, &high, |_| u).or_panic("three cylinders");
    let expected = phi(0.7 / u) - phi(-0.9 / u);
    assert!(
        (all.probability - expected).abs() < 1e-9,
        "{}",
        all.probability
    );
}

#[test]
fn one_cylinder_has_no_every_cylinder_figure() {
    let margins = [margin(1.0, &[(0, -1.0)])];
    assert!(joint::one_sided(&margins, false, |_| 1.0).is_none());
}

/// One case of tests/vectors/joint.json, read without a JSON crate's derive: the fields named.
struct Case {
    name: String,
    kind: String,
    margins: Vec<serde_json::Value>,
    own: Vec<f64>,
    shared: Vec<Vec<f64>>,
    u_shared: Vec<f64>,
    probability: f64,
}

fn cases() -> Vec<Case> {
    let text = include_str!("vectors/joint.json");
    let doc: serde_json::Value = serde_json::from_str(text).or_panic("joint.json");
    let numbers = |v: &serde_json::Value| -> Vec<f64> {
        v.as_array()
            .or_panic("array")
            .iter()
            .map(|x| x.as_f64().or_panic("number"))
            .collect()
    };
    doc["cases"]
        .as_array()
        .or_panic("cases")
        .iter()
        .map(|c| Case {
            name: c["name"].as_str().or_panic("name").to_string(),
            kind: c["kind"].as_str().or_panic("kind").to_string(),
            margins: c["margins"].as_array().or_panic("margins").clone(),
            own: numbers(&c["own_uncertainties"]),
            shared: c["shared_coefficients"]
                .as_array()
                .or_panic("coefficients")
                .iter()
                .map(numbers)
                .collect(),
            u_shared: numbers(&c["shared_uncertainties"]),
            probability: c["probability"].as_f64().or_panic("probability"),
        })
        .collect()
}

#[test]
fn shared_inputs_agree_with_scipys_multivariate_normal_orthant_probabilities() {
    // tests/vectors/joint.json: scipy 1.17.1 multivariate_normal.cdf (Genz), error about 1e-6
    for case in cases() {
        let n = case.own.len();
        // ids: cylinder i's own input is i, shared input s is n + s
        let uncertainty = |id: InputId| {
            let id = id as usize;
            if id < n {
                case.own[id]
            } else {
                case.u_shared[id - n]
            }
        };
        // the value's deviation is own_i + Σ c_is d_s; an upper margin falls with it, a lower
        // margin rises with it
        let partials = |i: usize, sign: f64| -> Vec<(InputId, f64)> {
            let mut p = vec![(i as InputId, sign)];
            for (s, c) in case.shared[i].iter().enumerate() {
                p.push(((n + s) as InputId, sign * c));
            }
            p
        };
        let all = if case.kind == "one_sided" {
            let margins: Vec<Dual> = (0..n)
                .map(|i| margin(case.margins[i].as_f64().or_panic("m"), &partials(i, -1.0)))
                .collect();
            joint::one_sided(&margins, false, uncertainty)
        } else {
            let side = |i: usize, k: usize| case.margins[i][k].as_f64().or_panic("m");
            let low: Vec<Dual> = (0..n)
                .map(|i| margin(side(i, 0), &partials(i, 1.0)))
                .collect();
            let high: Vec<Dual> = (0..n)
                .map(|i| margin(side(i, 1), &partials(i, -1.0)))
                .collect();
            joint::between(&low, &high, uncertainty)
        }
        .or_panic("several cylinders");
        let tolerance = match all.method {
            JointMethod::Sampled { standard_error, .. } => 4.0 * standard_error + 1e-5,
            _ => 1e-5,
        };
        assert!(
            (all.probability - case.probability).abs() < tolerance,
            "{}: {} against scipy's {} ({:?})",
            case.name,
            all.probability,
            case.probability,
            all.method
        );
        // and the shared inputs make it differ from the product of the cylinders' own figures
        assert_eq!(all.shared.len(), case.u_shared.len(), "{}", case.name);
    }
}

const RULES: &str = r#"
series "Brackenfold Oval Club"
edition "2027" effective 2027-04-01
decision guarded rejection

measure bore: length per cylinder "Bore gauge"
measure stroke: length "Dial indicator"

class hobby "Hobby"
  rule 1 "Bore" require bore <= 4.030 in end
  rule 2 "Swept volume of each cylinder" require pi / 4 * bore ^ 2 * stroke <= 44.395 ci end
end
"#;

const DECLARATION: &str = r#"
engine: "BF-0417"
class: hobby
date: "2027-05-01"
instruments:
  bore_gauge: {resolution: "0.0001 in"}
  dial: {resolution: "0.001 in"}
measurements:
  bore:
    values: ["4.0299 in", "4.0299 in", "4.0298 in", "4.0299 in"]
    instrument: bore_gauge
  stroke:
    value: "3.480 in"
    instrument: dial
"#;

#[test]
fn a_check_reports_every_cylinder_beside_the_closest_and_a_shared_stroke_is_integrated() {
    let (book, problems) = parse_rulebook(0, RULES);
    assert!(problems.is_empty(), "{problems:?}");
    let (checked, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    let rulebook = checked.unwrap_or_else(|| panic!("{problems:?}"));
    let mut sources = SourceMap::default();
    let declaration = declaration_from_text(
        std::path::Path::new("bf-0417.yaml"),
        DECLARATION.to_string(),
        &rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    let report = check_engine(&rulebook, &rulebook.classes[0], &declaration, None);
    let numeric = |i: usize| {
        report.outcomes[i]
            .checked
            .as_ref()
            .and_then(|c| c.numeric.clone())
            .or_panic("numeric")
    };
    // rule 1: four bores, each its own reading: the product of the four
    let bore = numeric(0);
    let all = bore.all_cylinders.clone().or_panic("every cylinder");
    assert_eq!(all.method, JointMethod::Product);
    assert_eq!(all.cylinders, 4);
    // resolution 0.0001 in gives u = 0.0001/√12 in (GUM F.2.2.1); each margin to 4.030 in
    let u = 0.0001 / 12f64.sqrt();
    let u_bore = u * 0.0254;
    let expected: f64 = [4.0299, 4.0299, 4.0298, 4.0299]
        .iter()
        .map(|b| phi((4.030 - b) / u))
        .product();
    assert!(
        (all.probability - expected).abs() < 1e-9,
        "{} {expected}",
        all.probability
    );
    assert!(all.probability < bore.probability);
    // rule 2: the one stroke is in every cylinder's swept volume: one shared dimension. The
    // margins are positively correlated, so every cylinder conforming is likelier than the
    // product of their probabilities and less likely than the closest one (Slepian's
    // inequality for normal vectors with non-negative correlations).
    let swept = numeric(1);
    let all = swept.all_cylinders.clone().or_panic("every cylinder");
    assert_eq!(all.method, JointMethod::Quadrature { dimensions: 1 });
    assert_eq!(all.shared.len(), 1);
    // V = π/4·B²·S; u² = (π/2·B·S·u_B)² + (π/4·B²·u_S)² (GUM eq. 10), 1 ci = 16.387064 cm³
    let (ci, inch, s) = (16.387064e-6, 0.0254, 3.480 * 0.0254);
    let u_s = 0.001 * inch / 12f64.sqrt();
    let product: f64 = [4.0299, 4.0299, 4.0298, 4.0299]
        .iter()
        .map(|b| {
            let b = b * inch;
            let v = std::f64::consts::PI / 4.0 * b * b * s;
            let ub = std::f64::consts::PI / 2.0 * b * s * u_bore;
            let us = std::f64::consts::PI / 4.0 * b * b * u_s;
            phi((44.395 * ci - v) / (ub * ub + us * us).sqrt())
        })
        .product();
    assert!(product < 0.95, "a test that can tell: {product}");
    assert!(
        all.probability > product + 1e-3,
        "{} {product}",
        all.probability
    );
    assert!(all.probability < swept.probability, "{}", all.probability);
}

/// Every demo engine as JSON under the 2027 rulebook.
fn demo_json() -> serde_json::Value {
    let run = common::gonogo(&[
        "check",
        "--rules",
        "rulebooks-demo/tamsin-2027.rules",
        "--format",
        "json",
        "engines-demo",
    ]);
    serde_json::from_str(&run.stdout).or_panic("the check is JSON")
}

#[test]
fn every_cylinder_together_is_never_likelier_than_the_closest_cylinder_alone() {
    // P(all conform) ≤ P(the closest conforms), since the event "all conform" lies inside
    // "the closest conforms" (a property of probability, no source needed). This caught the
    // allowance counted twice (rule 3.2 of limited2-close-bore: 90.88 % closest, ≥ 99.99 % all).
    let doc = demo_json();
    let mut compared = 0;
    for engine in doc["engines"].as_array().into_iter().flatten() {
        for rule in engine["rules"].as_array().into_iter().flatten() {
            let numeric = &rule["numeric"];
            let (Some(closest), Some(all)) = (
                numeric["probability_of_conformance"].as_f64(),
                numeric["all_cylinders"]["probability_of_conformance"].as_f64(),
            ) else {
                continue;
            };
            compared += 1;
            let what = format!("{} {}", engine["file"], rule["section"]);
            assert!(
                all <= closest + 1e-12,
                "{what}: all {all}, closest {closest}"
            );
        }
    }
    assert!(
        compared >= 20,
        "only {compared} per-cylinder rules compared"
    );
}
