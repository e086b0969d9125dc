//! The evaluator on small rulebooks and declarations written here, each number checked against
//! an independent computation: the ISO 14253-1 / ILAC-G8 findings, the JCGM 106 probability
//! Φ(margin/u) with Φ from the error function, and GUM propagation for a sum (u added in
//! quadrature) — not against gonogo's own output.

use std::path::Path;

use gonogo::check::check;
use gonogo::check::model::CheckedRulebook;
use gonogo::evaluate::check_engine;
use gonogo::evaluate::finding::{Finding, Verdict};
use gonogo::evaluate::outcome::Applies;
use gonogo::load::{Declaration, Supplied, declaration_from_text};
use gonogo::parse::ast::DecisionRule;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::source::SourceMap;

const RULES: &str = r#"
series "Brackenfold Oval Club"
edition "2027" effective 2027-04-01
decision guarded rejection

measure bore: length per cylinder "Bore gauge"
measure car.weight: mass "Scale"
measure ballast: mass optional "Ballast weighed apart"
measure head.material: text "cast iron or aluminium"
measure stroke: length "Dial indicator"
measure head.casting: text optional "Casting number"

banned list banned_heads "Banned heads"
  "BF-290"
end

define total = car.weight + ballast
define weight_per_ballast = car.weight / ballast

class hobby "Hobby"
  rule 1 "Bore" require bore <= 4.030 in end
  rule 2 "Weight" require car.weight >= 3000 lb end
  rule 3 "Weight under the strict limit" require car.weight > 3000 lb end
  rule 4 "Stroke window" require stroke between 3.470 in and 3.490 in end
  rule 5 "Total" require total >= 3100 lb end
  rule 6 "Heavy cars only" when car.weight >= 3050 lb require stroke <= 3.48 in end
  rule 7 "Aluminium" when head.material == "aluminium" require car.weight >= 3200 lb end
  rule 8 "Ballast share" require weight_per_ballast <= 100 end
  rule 9 "Stock bore" require bore == 4.000 in end
  rule 10 "Not the stock bore" require bore != 4.000 in end
  rule 11 "Bore window" require bore between 3.990 in and 4.040 in end
  rule 12 "Head not banned" require head.casting not in banned_heads end
  rule 13 "Stroke of the engine" require displacement(4.000 in, stroke, 8) <= 360 ci end
  rule 14 "Bore, limit first" require 4.030 in >= bore end
  rule 15 "Weight, limit first" require 3000 lb < car.weight end
end
"#;

fn rulebook() -> CheckedRulebook {
    let (book, problems) = parse_rulebook(0, RULES);
    assert!(problems.is_empty(), "{problems:?}");
    let (checked, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    checked.unwrap_or_else(|| panic!("{problems:?}"))
}

/// The standard normal distribution function Φ(z) = (1 + erf(z/√2))/2, with erf summed from
/// its Maclaurin series (gonogo itself uses libm's erfc, so this is an independent route);
/// 200 terms are ample for |z| ≤ 4.
fn phi(z: f64) -> f64 {
    let x = z / std::f64::consts::SQRT_2;
    let mut term = x;
    let mut sum = x;
    for n in 1..200 {
        term *= -x * x / n as f64;
        sum += term / (2 * n + 1) as f64;
    }
    0.5 * (1.0 + 2.0 / std::f64::consts::PI.sqrt() * sum)
}

struct Case {
    rulebook: CheckedRulebook,
}

impl Case {
    fn new() -> Case {
        Case {
            rulebook: rulebook(),
        }
    }

    /// The declaration written in `yaml`.
    fn declaration(&self, yaml: &str) -> Declaration {
        let mut sources = SourceMap::default();
        declaration_from_text(
            Path::new("case.yaml"),
            yaml.to_string(),
            &self.rulebook,
            &mut sources,
        )
        .unwrap_or_else(|p| panic!("{p:?}"))
    }

    /// The outcome of every rule for `yaml` under `decision`.
    fn run(&self, yaml: &str, decision: DecisionRule) -> Vec<Row> {
        self.run_declaration(&self.declaration(yaml), decision)
    }

    /// The outcome of every rule for a declaration under `decision`.
    fn run_declaration(&self, d: &Declaration, decision: DecisionRule) -> Vec<Row> {
        let class = self
            .rulebook
            .class("hobby")
            .unwrap_or_else(|| panic!("no class"));
        check_engine(&self.rulebook, class, d, Some(decision))
            .outcomes
            .iter()
            .map(|o| Row {
                verdict: o.verdict,
                finding: o.checked.as_ref().map(|c| c.finding),
                margin: o
                    .checked
                    .as_ref()
                    .and_then(|c| c.numeric.as_ref())
                    .map(|n| n.margin),
                expanded: o
                    .checked
                    .as_ref()
                    .and_then(|c| c.numeric.as_ref())
                    .map(|n| n.expanded),
                probability: o
                    .checked
                    .as_ref()
                    .and_then(|c| c.numeric.as_ref())
                    .map(|n| n.probability),
                cylinder: o
                    .checked
                    .as_ref()
                    .and_then(|c| c.numeric.as_ref())
                    .and_then(|n| n.cylinder),
                observed: o.checked.as_ref().and_then(|c| c.observed.clone()),
                applies: o.applies,
                missing: o.missing.clone(),
                not_finite: o.not_finite,
                error: o.error.clone(),
            })
            .collect()
    }
}

#[derive(Debug)]
struct Row {
    verdict: Verdict,
    finding: Option<Finding>,
    margin: Option<f64>,
    expanded: Option<f64>,
    probability: Option<f64>,
    cylinder: Option<usize>,
    observed: Option<String>,
    applies: Applies,
    missing: Vec<String>,
    not_finite: bool,
    error: Option<String>,
}

const IN: f64 = 0.0254; // NIST SP 811 B.8
const LB: f64 = 0.453_592_37; // NIST SP 811 B.8

fn declaration(bores: &str, weight: &str, extra: &str) -> String {
    format!(
        "class: hobby\nmeasurements:\n  bore: [{bores}]\n  car.weight: \"{weight}\"\n  stroke: \"3.480 in ± 0.002 in\"\n  head.material: \"cast iron\"\n{extra}"
    )
}

fn close(a: f64, b: f64, tolerance: f64) -> bool {
    (a - b).abs() <= tolerance * b.abs().max(1e-300)
}

#[test]
fn the_worst_cylinder_decides_and_its_margin_and_probability_are_exact() {
    // cylinder 3 is nearest the 4.030 in limit: margin 0.0004 in, u = 0.0003 in (U 0.0006 in, k = 2)
    let rows = Case::new().run(
        &declaration(
            "\"4.0290 in ± 0.0006 in\", \"4.0280 in ± 0.0006 in\", \"4.0296 in ± 0.0006 in\"",
            "3100 lb",
            "",
        ),
        DecisionRule::GuardedRejection,
    );
    let bore = &rows[0];
    assert_eq!(bore.cylinder, Some(3));
    assert!(
        close(bore.margin.unwrap_or_default(), 0.0004 * IN, 1e-9),
        "{bore:?}"
    );
    assert!(close(bore.expanded.unwrap_or_default(), 0.0006 * IN, 1e-9));
    assert_eq!(bore.finding, Some(Finding::ConditionalPass)); // ILAC-G8: inside by less than U
    // JCGM 106: Φ(0.0004 / 0.0003)
    assert!(close(
        bore.probability.unwrap_or_default(),
        phi(4.0 / 3.0),
        1e-9
    ));
    assert_eq!(bore.verdict, Verdict::Legal);
}

#[test]
fn decision_rules_turn_one_finding_into_different_verdicts() {
    let yaml = declaration("\"4.0296 in ± 0.0006 in\"", "3100 lb", "");
    let case = Case::new();
    assert_eq!(
        case.run(&yaml, DecisionRule::GuardedRejection)[0].verdict,
        Verdict::Legal
    );
    assert_eq!(
        case.run(&yaml, DecisionRule::GuardedAcceptance)[0].verdict,
        Verdict::Illegal
    );
    assert_eq!(
        case.run(&yaml, DecisionRule::SimpleAcceptance)[0].verdict,
        Verdict::Legal
    );
}

#[test]
fn a_value_on_an_inclusive_limit_passes_and_on_a_strict_one_fails() {
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3000 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[1].finding, Some(Finding::Pass)); // >= 3000 lb, no uncertainty
    assert_eq!(rows[2].finding, Some(Finding::Fail)); // > 3000 lb
    assert_eq!(rows[1].margin, Some(0.0));
}

#[test]
fn between_takes_the_nearer_limit_and_both_tails() {
    // 3.480 in ± 0.002 in (k = 2): u = 0.001 in, 0.010 in from each end of 3.470..3.490
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    let window = &rows[3];
    assert!(
        close(window.margin.unwrap_or_default(), 0.010 * IN, 1e-9),
        "{window:?}"
    );
    // JCGM 106 two-sided: Φ(10) − Φ(−10), which is 1 to within 1e-20
    assert!(window.probability.unwrap_or_default() > 1.0 - 1e-12);
    assert_eq!(window.finding, Some(Finding::Pass));
}

#[test]
fn uncertainties_of_a_sum_add_in_quadrature() {
    // GUM eq. 10 for total = weight + ballast: u = √(u_w² + u_b²) = √(3² + 4²) lb = 5 lb
    let yaml = declaration(
        "\"4.0 in\"",
        "3050 lb ± 6 lb",
        "  ballast: \"60 lb ± 8 lb\"\n",
    );
    let rows = Case::new().run(&yaml, DecisionRule::GuardedRejection);
    let total = &rows[4];
    assert!(
        close(total.expanded.unwrap_or_default(), 10.0 * LB, 1e-9),
        "{total:?}"
    );
    assert!(close(total.margin.unwrap_or_default(), 10.0 * LB, 1e-9));
    assert!(close(total.probability.unwrap_or_default(), phi(2.0), 1e-9));
}

#[test]
fn a_missing_optional_measurement_makes_its_rule_not_applicable_and_named() {
    // rule 5 reads the required car.weight, given, and the optional ballast, not given
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[4].verdict, Verdict::NotApplicable);
    assert_eq!(rows[4].applies, Applies::NotMeasured);
    assert_eq!(rows[4].missing, vec!["ballast".to_string()]);
}

#[test]
fn a_condition_inside_the_uncertainty_band_is_uncertain() {
    // 3049 lb ± 4 lb against `car.weight >= 3050 lb`: inside the band, so rule 6 may apply
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3049 lb ± 4 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[5].applies, Applies::Uncertain);
    // simple acceptance decides the condition by the value alone: 3049 < 3050, so it does not apply
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3049 lb ± 4 lb", ""),
        DecisionRule::SimpleAcceptance,
    );
    assert_eq!(rows[5].verdict, Verdict::NotApplicable);
}

#[test]
fn an_uncertain_condition_cannot_prove_a_violation_for_the_inspector() {
    // stroke 3.490 in fails rule 6 (<= 3.48 in) outright; whether rule 6 applies is uncertain
    let yaml = "class: hobby\nmeasurements:\n  bore: [\"4.0 in\"]\n  car.weight: \"3049 lb ± 4 lb\"\n  stroke: \"3.490 in\"\n  head.material: \"cast iron\"\n";
    let case = Case::new();
    let inspector = case.run(yaml, DecisionRule::GuardedRejection);
    assert_eq!(
        (inspector[5].finding, inspector[5].verdict),
        (Some(Finding::Fail), Verdict::Legal)
    );
    let builder = case.run(yaml, DecisionRule::GuardedAcceptance);
    assert_eq!(builder[5].verdict, Verdict::Illegal);
}

#[test]
fn a_false_text_condition_makes_a_rule_not_applicable() {
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(
        (rows[6].applies, rows[6].verdict),
        (Applies::DoesNotHold, Verdict::NotApplicable)
    );
}

#[test]
fn an_instrument_resolution_is_a_rectangular_distribution() {
    // GUM F.2.2.1: resolution δ gives u = δ/(2√3); 0.001 in → u = 0.000288675 in
    let yaml = "class: hobby\ninstruments:\n  gauge: {resolution: \"0.001 in\"}\nmeasurements:\n  bore:\n    values: [\"4.0295 in\"]\n    instrument: gauge\n  car.weight: \"3100 lb\"\n  stroke: \"3.480 in\"\n  head.material: \"cast iron\"\n";
    let rows = Case::new().run(yaml, DecisionRule::GuardedRejection);
    let u = 0.001 * IN / (2.0 * 3f64.sqrt());
    assert!(
        close(rows[0].expanded.unwrap_or_default(), 2.0 * u, 1e-9),
        "{:?}",
        rows[0]
    );
    assert!(close(
        rows[0].probability.unwrap_or_default(),
        phi(0.0005 * IN / u),
        1e-9
    ));
}

#[test]
fn a_value_that_is_not_a_number_decides_nothing() {
    // ballast 0 lb makes weight / ballast infinite: bad input must not become "illegal"
    let rows = Case::new().run(
        &declaration("\"4.0 in\"", "3100 lb", "  ballast: \"0 lb\"\n"),
        DecisionRule::GuardedRejection,
    );
    assert!(rows[7].not_finite, "{:?}", rows[7]);
    assert_eq!(rows[7].verdict, Verdict::NotChecked);
}

#[test]
fn per_cylinder_equality_holds_on_every_cylinder_and_names_the_deciding_one() {
    // issue 8: `bore == 4.000 in` with 4.000, 4.200, 4.300, 4.100 in was LEGAL, because only
    // cylinder 1 was compared; cylinder 2 is the first that is not 4.000 in. Each reading is
    // shown as written (issue 9)
    let case = Case::new();
    let bores = "\"4.000 in\", \"4.200 in\", \"4.300 in\", \"4.100 in\"";
    let rows = case.run(
        &declaration(bores, "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[8].finding, Some(Finding::Fail), "{:?}", rows[8]);
    assert_eq!(rows[8].verdict, Verdict::Illegal);
    assert_eq!(
        rows[8].observed.as_deref(),
        Some("4.200 in on cylinder 2; cylinders 2, 3, 4 break the rule")
    );
    // `!=` likewise: cylinder 3 is the stock bore, so the rule fails there
    let bores = "\"4.100 in\", \"4.200 in\", \"4.000 in\", \"4.300 in\"";
    let rows = case.run(
        &declaration(bores, "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[9].verdict, Verdict::Illegal, "{:?}", rows[9]);
    assert_eq!(rows[9].observed.as_deref(), Some("4.000 in on cylinder 3"));
    // every cylinder at 4.000 in: `==` passes, `!=` fails at cylinder 1
    let bores = "\"4.000 in\", \"4.000 in\", \"4.000 in\", \"4.000 in\"";
    let rows = case.run(
        &declaration(bores, "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[8].verdict, Verdict::Legal, "{:?}", rows[8]);
    assert_eq!(
        rows[8].observed.as_deref(),
        Some("4.000 in on every cylinder")
    );
    assert_eq!(rows[9].verdict, Verdict::Illegal, "{:?}", rows[9]);
    assert_eq!(
        rows[9].observed.as_deref(),
        Some("4.000 in on cylinder 1; cylinders 1, 2, 3, 4 break the rule")
    );
}

/// A declaration whose bores are a per-cylinder list of no cylinders, which the loader never
/// makes: a state evaluation must meet with "not checked", not with a finding.
fn no_bores(case: &Case) -> Declaration {
    let mut d = case.declaration(&declaration("\"4.0 in\"", "3100 lb", ""));
    let bore = case
        .rulebook
        .measurement_index("bore")
        .unwrap_or_else(|| panic!("no bore"));
    d.supplied[bore] = Some(Supplied::PerCylinder(Vec::new()));
    d
}

#[test]
fn a_between_with_no_number_is_not_checked() {
    // issue 8: a `between` over no value gave `fail`, so ILLEGAL
    let case = Case::new();
    let rows = case.run_declaration(&no_bores(&case), DecisionRule::GuardedRejection);
    assert_eq!(rows[10].verdict, Verdict::NotChecked, "{:?}", rows[10]);
    assert_eq!(rows[10].finding, None);
    let why = rows[10].error.as_deref().unwrap_or_default();
    assert!(why.contains("no number"), "{why}");
    // and so are the other per-cylinder tests of it
    assert_eq!(rows[0].verdict, Verdict::NotChecked, "{:?}", rows[0]);
    assert_eq!(rows[8].verdict, Verdict::NotChecked, "{:?}", rows[8]);
}

#[test]
fn a_parts_list_missing_from_the_model_is_not_a_pass() {
    // issue 8: a list that could not be found counted as "not on it", so `not in` passed
    let case = Case::new();
    let d = case.declaration(&declaration(
        "\"4.0 in\"",
        "3100 lb",
        "  head.casting: \"BF-290\"\n",
    ));
    let rows = case.run_declaration(&d, DecisionRule::GuardedRejection);
    assert_eq!(rows[11].verdict, Verdict::Illegal, "banned: {:?}", rows[11]);
    let mut broken = Case::new();
    broken.rulebook.lists.clear();
    let rows = broken.run_declaration(&d, DecisionRule::GuardedRejection);
    assert_eq!(rows[11].verdict, Verdict::NotChecked, "{:?}", rows[11]);
}

#[test]
fn evaluation_reads_the_resolved_call_not_the_name_as_written() {
    // issue 8: an unknown formula name evaluated to NaN. The checker refuses an unknown name,
    // and evaluation folds over the call it bound, so even a written name changed after
    // checking cannot reach evaluation. π/4 · 4² · 3.480 · 8 in³ = 349.85 ci (by hand)
    let mut case = Case::new();
    let rows = case.run(
        &declaration("\"4.0 in\"", "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[12].verdict, Verdict::Legal, "{:?}", rows[12]);
    let by_hand = (360.0 - std::f64::consts::PI * 4.0 * 3.480 * 8.0) * IN * IN * IN;
    assert!(close(rows[12].margin.unwrap_or(f64::NAN), by_hand, 1e-9));
    for class in &mut case.rulebook.classes {
        for rule in &mut class.rules {
            rename_calls(&mut rule.written.rule.require);
        }
    }
    let rows = case.run(
        &declaration("\"4.0 in\"", "3100 lb", ""),
        DecisionRule::GuardedRejection,
    );
    assert_eq!(rows[12].verdict, Verdict::Legal, "{:?}", rows[12]);
    assert!(!rows[12].not_finite);
}

/// Renames every call written in a test to a function that does not exist.
fn rename_calls(test: &mut gonogo::parse::ast::Test) {
    use gonogo::parse::ast::{ExprKind, TestKind};
    if let TestKind::Compare { left, .. } = &mut test.kind
        && let ExprKind::Call { function, .. } = &mut left.kind
    {
        function.text = "nonesuch".to_string();
    }
}

#[test]
fn a_limit_written_first_is_decided_exactly_as_the_same_limit_written_last() {
    // rule 14 is rule 1 and rule 15 is rule 3 with the sides swapped: one normal form, one
    // decision (issue 8: the evaluator reads the same limit as diff, lint and headroom)
    let rows = Case::new().run(
        &declaration(
            "\"4.0290 in ± 0.0006 in\", \"4.0280 in ± 0.0006 in\", \"4.0296 in ± 0.0006 in\"",
            "3000 lb",
            "",
        ),
        DecisionRule::GuardedRejection,
    );
    for (written_last, written_first) in [(0, 13), (2, 14)] {
        let (a, b) = (&rows[written_last], &rows[written_first]);
        assert_eq!(a.finding, b.finding, "{a:?} {b:?}");
        assert_eq!(a.verdict, b.verdict);
        assert_eq!(a.margin, b.margin);
        assert_eq!(a.probability, b.probability);
        assert_eq!(a.cylinder, b.cylinder);
    }
    assert_eq!(rows[13].cylinder, Some(3));
    assert_eq!(rows[14].finding, Some(Finding::Fail)); // 3000 lb is not above 3000 lb
}
