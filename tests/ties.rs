//! A value exactly on a limit, across units, allowances and decision rules.
//!
//! ISO 14253-1 and ILAC-G8:09/2019 §4.2 put a value on a `<=` or `>=` limit inside it and a
//! value on a `<` or `>` limit outside; JCGM 106:2012 gives it a probability of conformance of
//! 0.5 with an uncertainty (Φ(0)) and 1 or 0 without. Each tie below is exact by NIST SP 811
//! (2008) B.8: 1 in = 25.4 mm, 1 in³ = 16.387 064 cm³, 1 lb = 0.453 592 37 kg, all exactly.
//! In binary floating point none of them is a tie, and before gonogo decided ties exactly
//! most of these cases came out on the wrong side of the limit. Beside each tie, a value one
//! digit of its last place either side, decided by the float as always.

use std::path::Path;

use gonogo::check::check;
use gonogo::check::model::CheckedRulebook;
use gonogo::evaluate::check_engine;
use gonogo::evaluate::finding::{Finding, Verdict};
use gonogo::load::declaration_from_text;
use gonogo::parse::ast::DecisionRule;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::source::SourceMap;

mod common;
use common::gonogo;

/// The three decision rules, in the order of [`Expected::verdicts`].
const RULES: [DecisionRule; 3] = [
    DecisionRule::GuardedRejection,  // --as inspector
    DecisionRule::GuardedAcceptance, // --as builder
    DecisionRule::SimpleAcceptance,  // --as simple
];

use Verdict::{Illegal as I, Legal as L};

/// What a case must give: the finding, the probability of conformance and the verdict under
/// each decision rule (inspector, builder, simple).
#[derive(Clone, Copy, Debug)]
struct Expected {
    finding: Finding,
    probability: f64,
    verdicts: [Verdict; 3],
}

/// Inside with no uncertainty: conformity proven (ISO 14253-1), p = 1 (JCGM 106).
const PASS: Expected = Expected {
    finding: Finding::Pass,
    probability: 1.0,
    verdicts: [L, L, L],
};
/// Outside with no uncertainty: nonconformity proven, p = 0.
const FAIL: Expected = Expected {
    finding: Finding::Fail,
    probability: 0.0,
    verdicts: [I, I, I],
};
/// On a `<=` or `>=` limit with an uncertainty: inside, within U, p = Φ(0) = 0.5 (JCGM 106).
/// The inspector (guarded rejection) cannot prove a fail, the builder (guarded acceptance)
/// cannot prove a pass, simple acceptance goes by the value, which is inside.
const ON_INCLUDED: Expected = Expected {
    finding: Finding::ConditionalPass,
    probability: 0.5,
    verdicts: [L, I, L],
};
/// On a `<` or `>` limit with an uncertainty: outside, within U, p = 0.5.
const ON_EXCLUDED: Expected = Expected {
    finding: Finding::ConditionalFail,
    probability: 0.5,
    verdicts: [L, I, I],
};

/// One rule on one measured value.
struct Case {
    /// What the case shows.
    what: &'static str,
    /// The measurement's schema line.
    measure: &'static str,
    /// The rule's test.
    test: &'static str,
    /// The declaration's `measurements:` entry.
    reading: &'static str,
    /// What it must give.
    expected: Expected,
    /// Whether the value is exactly on the limit, so the margin must be exactly 0.
    tie: bool,
}

const PRIMARY: &str = "measure header.primary_od: length \"Caliper on the primary tube\"";
const BORE: &str = "measure bore: length per cylinder \"Bore gauge\"";
const CHAMBER: &str = "measure chamber: volume \"Burette\"";
const WEIGHT: &str = "measure car.weight: mass \"Club scale\"";
const ETHANOL: &str = "measure fuel.ethanol: ratio \"Ethanol share by volume, from the test kit\"";

const CASES: &[Case] = &[
    // in and mm: 1-3/4 in = 44.45 mm (NIST SP 811 B.8, 1 in = 25.4 mm exactly)
    Case {
        what: "44.45 mm on <= 1-3/4 in",
        measure: PRIMARY,
        test: "header.primary_od <= 1-3/4 in",
        reading: "header.primary_od: \"44.45 mm\"",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "44.45 mm ± 0.02 mm on <= 1-3/4 in",
        measure: PRIMARY,
        test: "header.primary_od <= 1-3/4 in",
        reading: "header.primary_od: \"44.45 mm ± 0.02 mm\"",
        expected: ON_INCLUDED,
        tie: true,
    },
    Case {
        what: "44.45 mm on < 1-3/4 in",
        measure: PRIMARY,
        test: "header.primary_od < 1-3/4 in",
        reading: "header.primary_od: \"44.45 mm\"",
        expected: FAIL,
        tie: true,
    },
    Case {
        what: "44.46 mm on <= 1-3/4 in, a digit outside",
        measure: PRIMARY,
        test: "header.primary_od <= 1-3/4 in",
        reading: "header.primary_od: \"44.46 mm\"",
        expected: FAIL,
        tie: false,
    },
    Case {
        what: "44.44 mm on <= 1-3/4 in, a digit inside",
        measure: PRIMARY,
        test: "header.primary_od <= 1-3/4 in",
        reading: "header.primary_od: \"44.44 mm\"",
        expected: PASS,
        tie: false,
    },
    Case {
        what: "44.46 mm ± 0.02 mm on <= 1-3/4 in: u = 0.01 mm, p = Φ(−1) (JCGM 106)",
        measure: PRIMARY,
        test: "header.primary_od <= 1-3/4 in",
        reading: "header.primary_od: \"44.46 mm ± 0.02 mm\"",
        expected: Expected {
            finding: Finding::ConditionalFail,
            probability: 0.158_655_25, // Φ(−1), the normal distribution's lower tail
            verdicts: [L, I, I],
        },
        tie: false,
    },
    // 4.030 in = 102.362 mm; 3-1/2 in = 88.9 mm (NIST SP 811 B.8)
    Case {
        what: "102.362 mm on >= 4.030 in",
        measure: BORE,
        test: "bore >= 4.030 in",
        reading: "bore: [\"102.362 mm\"]",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "102.362 mm on < 4.030 in",
        measure: BORE,
        test: "bore < 4.030 in",
        reading: "bore: [\"102.362 mm\"]",
        expected: FAIL,
        tie: true,
    },
    Case {
        what: "88.9 mm on > 3-1/2 in",
        measure: PRIMARY,
        test: "header.primary_od > 3-1/2 in",
        reading: "header.primary_od: \"88.9 mm\"",
        expected: FAIL,
        tie: true,
    },
    Case {
        what: "88.9 mm ± 0.01 mm on > 3-1/2 in",
        measure: PRIMARY,
        test: "header.primary_od > 3-1/2 in",
        reading: "header.primary_od: \"88.9 mm ± 0.01 mm\"",
        expected: ON_EXCLUDED,
        tie: true,
    },
    // cc, L and ci: 4.6 in³ = 75.380 494 4 cm³, 4.4 in³ = 0.072 103 081 6 L (NIST SP 811 B.8,
    // 1 in³ = 16.387 064 cm³ exactly)
    Case {
        what: "75.3804944 cc on <= 4.6 ci",
        measure: CHAMBER,
        test: "chamber <= 4.6 ci",
        reading: "chamber: \"75.3804944 cc\"",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "75.3804944 cc ± 0.2 cc on <= 4.6 ci",
        measure: CHAMBER,
        test: "chamber <= 4.6 ci",
        reading: "chamber: \"75.3804944 cc ± 0.2 cc\"",
        expected: ON_INCLUDED,
        tie: true,
    },
    Case {
        what: "75.3804945 cc on <= 4.6 ci, a digit outside",
        measure: CHAMBER,
        test: "chamber <= 4.6 ci",
        reading: "chamber: \"75.3804945 cc\"",
        expected: FAIL,
        tie: false,
    },
    Case {
        what: "75.3804943 cc on <= 4.6 ci, a digit inside",
        measure: CHAMBER,
        test: "chamber <= 4.6 ci",
        reading: "chamber: \"75.3804943 cc\"",
        expected: PASS,
        tie: false,
    },
    Case {
        what: "0.0721030816 L on >= 4.4 ci",
        measure: CHAMBER,
        test: "chamber >= 4.4 ci",
        reading: "chamber: \"0.0721030816 L\"",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "0.0721030816 L on > 4.4 ci",
        measure: CHAMBER,
        test: "chamber > 4.4 ci",
        reading: "chamber: \"0.0721030816 L\"",
        expected: FAIL,
        tie: true,
    },
    // lb, kg and g: 3100 lb = 1406.136 347 kg, 2900 lb = 1 315 417.873 g (NIST SP 811 B.8,
    // 1 lb = 0.453 592 37 kg exactly)
    Case {
        what: "1406.136347 kg on >= 3100 lb",
        measure: WEIGHT,
        test: "car.weight >= 3100 lb",
        reading: "car.weight: \"1406.136347 kg\"",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "1406.136347 kg ± 2 kg on >= 3100 lb",
        measure: WEIGHT,
        test: "car.weight >= 3100 lb",
        reading: "car.weight: \"1406.136347 kg ± 2 kg\"",
        expected: ON_INCLUDED,
        tie: true,
    },
    Case {
        what: "1406.136347 kg on < 3100 lb",
        measure: WEIGHT,
        test: "car.weight < 3100 lb",
        reading: "car.weight: \"1406.136347 kg\"",
        expected: FAIL,
        tie: true,
    },
    Case {
        what: "1406.136346 kg on >= 3100 lb, a digit outside",
        measure: WEIGHT,
        test: "car.weight >= 3100 lb",
        reading: "car.weight: \"1406.136346 kg\"",
        expected: FAIL,
        tie: false,
    },
    Case {
        what: "1406.136348 kg on >= 3100 lb, a digit inside",
        measure: WEIGHT,
        test: "car.weight >= 3100 lb",
        reading: "car.weight: \"1406.136348 kg\"",
        expected: PASS,
        tie: false,
    },
    Case {
        what: "1315417.873 g on >= 2900 lb",
        measure: WEIGHT,
        test: "car.weight >= 2900 lb",
        reading: "car.weight: \"1315417.873 g\"",
        expected: PASS,
        tie: true,
    },
    // allowances: 4.060 in + 0.005 in = 4.065 in = 103.251 mm
    Case {
        what: "4.0650 in on <= 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore <= 4.060 in allowing 0.005 in",
        reading: "bore: [\"4.0650 in\"]",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "4.0650 in ± 0.0004 in on <= 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore <= 4.060 in allowing 0.005 in",
        reading: "bore: [\"4.0650 in ± 0.0004 in\"]",
        expected: ON_INCLUDED,
        tie: true,
    },
    Case {
        what: "4.0650 in on < 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore < 4.060 in allowing 0.005 in",
        reading: "bore: [\"4.0650 in\"]",
        expected: FAIL,
        tie: true,
    },
    Case {
        what: "4.0651 in on <= 4.060 in allowing 0.005 in, a digit outside",
        measure: BORE,
        test: "bore <= 4.060 in allowing 0.005 in",
        reading: "bore: [\"4.0651 in\"]",
        expected: FAIL,
        tie: false,
    },
    Case {
        what: "4.0649 in on <= 4.060 in allowing 0.005 in, a digit inside",
        measure: BORE,
        test: "bore <= 4.060 in allowing 0.005 in",
        reading: "bore: [\"4.0649 in\"]",
        expected: PASS,
        tie: false,
    },
    Case {
        what: "103.251 mm on <= 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore <= 4.060 in allowing 0.005 in",
        reading: "bore: [\"103.251 mm\"]",
        expected: PASS,
        tie: true,
    },
    // ranges: 4.060 in = 103.124 mm; 4.000 in − 0.005 in = 3.995 in = 101.473 mm
    Case {
        what: "103.124 mm on between 4.000 in and 4.060 in",
        measure: BORE,
        test: "bore between 4.000 in and 4.060 in",
        reading: "bore: [\"103.124 mm\"]",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "103.125 mm on between 4.000 in and 4.060 in, a digit outside",
        measure: BORE,
        test: "bore between 4.000 in and 4.060 in",
        reading: "bore: [\"103.125 mm\"]",
        expected: FAIL,
        tie: false,
    },
    Case {
        what: "103.251 mm on between 4.000 in and 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore between 4.000 in and 4.060 in allowing 0.005 in",
        reading: "bore: [\"103.251 mm\"]",
        expected: PASS,
        tie: true,
    },
    Case {
        what: "101.473 mm on between 4.000 in and 4.060 in allowing 0.005 in",
        measure: BORE,
        test: "bore between 4.000 in and 4.060 in allowing 0.005 in",
        reading: "bore: [\"101.473 mm\"]",
        expected: PASS,
        tie: true,
    },
    // arithmetic on readings stays exact: the mean of 4.0650 in and 4.0550 in is 4.0600 in
    Case {
        what: "mean of 4.0650 in and 4.0550 in on <= 4.060 in",
        measure: BORE,
        test: "mean(bore) <= 4.060 in",
        reading: "bore: [\"4.0650 in\", \"4.0550 in\"]",
        expected: PASS,
        tie: true,
    },
    // a bare YAML number is read as the decimal written: 0.7 is 70 % (% = 0.01 exactly)
    Case {
        what: "bare 0.7 on >= 70 %",
        measure: ETHANOL,
        test: "fuel.ethanol >= 70 %",
        reading: "fuel.ethanol: 0.7",
        expected: PASS,
        tie: true,
    },
];

/// The rulebook of one case: the invented club's header, one measurement and one rule.
fn rulebook(measure: &str, test: &str) -> CheckedRulebook {
    let text = format!(
        "series \"Tamsin Valley Stock Car Club\"\nedition \"2027\" effective 2027-04-01\n\
         decision guarded rejection\n\n{measure}\n\nclass tie \"Tie\"\n  \
         rule 1 \"At the limit\" require {test} end\nend\n"
    );
    let (book, problems) = parse_rulebook(0, &text);
    assert!(problems.is_empty(), "{text}\n{problems:?}");
    let (checked, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    checked.unwrap_or_else(|| panic!("{text}\n{problems:?}"))
}

/// The finding, margin, probability, deciding cylinder and verdict of a case's one rule.
fn decide(c: &Case, decision: DecisionRule) -> (Finding, f64, f64, Option<usize>, Verdict) {
    let rulebook = rulebook(c.measure, c.test);
    let yaml = format!("class: tie\nmeasurements:\n  {}\n", c.reading);
    let declaration = declaration_from_text(
        Path::new("tie.yaml"),
        yaml,
        &rulebook,
        &mut SourceMap::default(),
    )
    .unwrap_or_else(|p| panic!("{}: {p:?}", c.what));
    let class = rulebook.class("tie").unwrap_or_else(|| panic!("no class"));
    let report = check_engine(&rulebook, class, &declaration, Some(decision));
    let outcome = &report.outcomes[0];
    let checked = outcome
        .checked
        .as_ref()
        .unwrap_or_else(|| panic!("{}: not checked", c.what));
    let n = checked
        .numeric
        .as_ref()
        .unwrap_or_else(|| panic!("{}: no number", c.what));
    (
        checked.finding,
        n.margin,
        n.probability,
        n.cylinder,
        outcome.verdict,
    )
}

#[test]
fn values_on_a_limit_are_decided_exactly_under_every_decision_rule() {
    let mut wrong = Vec::new();
    for c in CASES {
        for (rule, verdict) in RULES.iter().zip(c.expected.verdicts) {
            let (finding, margin, p, _, got) = decide(c, *rule);
            let e = c.expected;
            let ok = finding == e.finding
                && got == verdict
                && (p - e.probability).abs() < 1e-6
                && (!c.tie || margin == 0.0);
            if !ok {
                wrong.push(format!(
                    "{} under {rule:?}: {finding:?} p = {p} margin {margin:e} {got:?}; \
                     expected {:?} p = {} {verdict:?}{}",
                    c.what,
                    e.finding,
                    e.probability,
                    if c.tie { " margin 0" } else { "" }
                ));
            }
        }
    }
    assert!(wrong.is_empty(), "\n{}", wrong.join("\n"));
}

#[test]
fn the_cylinder_on_the_limit_is_the_one_shown() {
    // 4.060 in = 103.124 mm (NIST SP 811 B.8): cylinder 2 is on the limit, the others inside
    let c = Case {
        what: "three bores, the second on the limit",
        measure: BORE,
        test: "bore <= 4.060 in",
        reading: "bore: [\"4.0302 in\", \"103.124 mm\", \"4.0301 in\"]",
        expected: PASS,
        tie: true,
    };
    let (finding, margin, p, cylinder, verdict) = decide(&c, DecisionRule::GuardedAcceptance);
    assert_eq!(
        (finding, margin, p, cylinder, verdict),
        (Finding::Pass, 0.0, 1.0, Some(2), Verdict::Legal)
    );
}

#[test]
fn a_value_moved_from_its_text_is_decided_by_its_float() {
    // headroom moves an input's value and leaves its text: the text is then not the value, so
    // the exact route must not use it. 44.45 mm moved up by 1e-13 m is outside 1-3/4 in by
    // 1e-13 m (1 in = 25.4 mm exactly, NIST SP 811 B.8).
    let rulebook = rulebook(PRIMARY, "header.primary_od <= 1-3/4 in");
    let yaml = "class: tie\nmeasurements:\n  header.primary_od: \"44.45 mm\"\n".to_string();
    let mut declaration = declaration_from_text(
        Path::new("tie.yaml"),
        yaml,
        &rulebook,
        &mut SourceMap::default(),
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    declaration.inputs[0].value += 1e-13;
    let class = rulebook.class("tie").unwrap_or_else(|| panic!("no class"));
    let report = check_engine(&rulebook, class, &declaration, None);
    let checked = report.outcomes[0].checked.as_ref();
    assert_eq!(checked.map(|c| c.finding), Some(Finding::Fail));
    let margin = checked.and_then(|c| c.numeric.as_ref()).map(|n| n.margin);
    assert!(
        margin.is_some_and(|m| (m + 1e-13).abs() < 1e-16),
        "{margin:?}"
    );
}

#[test]
fn the_header_on_the_limit_is_legal_and_headroom_says_it_needs_no_move() {
    // issue 9: 44.45 mm against <= 1-3/4 in (equal by NIST SP 811 B.8) was "ILLEGAL · fail,
    // 0.00 %" with exit 1, and headroom said it "must fall 0 mm"
    let rules = "tests/ties/header.rules";
    let engine = "tests/ties/header-on-the-limit.yaml";
    for role in ["inspector", "builder", "simple"] {
        let run = gonogo(&["check", "--rules", rules, "--as", role, engine]);
        assert_eq!(run.code, 0, "--as {role}\n{}{}", run.stdout, run.stderr);
        assert!(run.stdout.contains("LEGAL · pass"), "{}", run.stdout);
        assert!(!run.stdout.contains("ILLEGAL"), "{}", run.stdout);
    }
    let run = gonogo(&["headroom", "--rules", rules, engine]);
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
    // worded as `check` words it (the review found "0.00000 in inside the limit")
    assert!(
        run.stdout.contains("pass, on the limit of 44.45 mm"),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("header.primary_od alone — limit: on the limit, and inside it"),
        "{}",
        run.stdout
    );
    assert!(!run.stdout.contains("must fall"), "{}", run.stdout);
}

#[test]
fn a_value_on_a_strict_limit_is_outside_and_headroom_says_which_way_to_go() {
    // ISO 14253-1: `<` excludes the limit value, so 44.45 mm fails `< 1-3/4 in`
    let rules = "tests/ties/header-strict.rules";
    let engine = "tests/ties/header-on-the-limit.yaml";
    let run = gonogo(&["check", "--rules", rules, "--as", "inspector", engine]);
    assert_eq!(run.code, 1, "{}{}", run.stdout, run.stderr);
    assert!(run.stdout.contains("ILLEGAL · fail"), "{}", run.stdout);
    let run = gonogo(&["headroom", "--rules", rules, engine]);
    assert!(
        run.stdout.contains("fail, on the limit of 44.45 mm"),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout.contains(
            "header.primary_od alone — limit: on the limit, which the rule excludes: it must fall, \
             by any amount"
        ),
        "{}",
        run.stdout
    );
}
