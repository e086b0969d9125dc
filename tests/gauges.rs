//! Attribute gauges: a measurement recorded as go/no-go plug results and the rules decided
//! from the bounds they prove. The demo's gauged throttle bore against rule 4.4 (verdict and
//! trace, snapshotted), and a small rulebook of the demo series where one go plug leaves an
//! upper limit open (legal under guarded rejection, illegal under guarded acceptance, not
//! checked under simple acceptance), meets a lower limit, and cannot give the value a formula
//! or `==` needs. The bound logic itself is tested against ISO 14253-1's rules in
//! `src/evaluate/gauge.rs`; the load errors are snapshotted from
//! `tests/bad-declarations/gauge*.yaml` by `check_demo.rs`.

mod common;

use std::path::{Path, PathBuf};

use gonogo::evaluate::finding::{Finding, Verdict};
use gonogo::evaluate::outcome::{EngineReport, GaugeWhy};
use gonogo::parse::ast::DecisionRule;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const DEMO: &str = "engines-demo/limited2-gauged-throttle.yaml";

/// The blocks of a text report (separated by blank lines) of the rules in `sections`.
fn rule_blocks(text: &str, sections: &[&str]) -> String {
    text.split("\n\n")
        .filter(|block| {
            let first = block.lines().next().unwrap_or_default();
            sections
                .iter()
                .any(|s| first.split_whitespace().nth(1) == Some(s))
        })
        .collect::<Vec<_>>()
        .join("\n\n")
}

fn rulebook(path: &Path) -> gonogo::check::model::CheckedRulebook {
    let loaded = gonogo::commands::load_rulebook(path);
    loaded
        .checked
        .unwrap_or_else(|| panic!("{} does not check", path.display()))
}

/// Loads `declaration` and checks it against its class under `decision`, giving what `read`
/// makes of the report.
fn checked<T>(
    rules: &Path,
    declaration: &Path,
    decision: Option<DecisionRule>,
    read: impl FnOnce(&EngineReport) -> T,
) -> T {
    let book = rulebook(rules);
    let mut sources = gonogo::source::SourceMap::default();
    let d = gonogo::load::load_declaration(declaration, &book, &mut sources)
        .unwrap_or_else(|p| panic!("{p:?}"));
    let class = d
        .identity
        .class
        .as_deref()
        .and_then(|c| book.class(c))
        .unwrap_or_else(|| panic!("no class"));
    let report = gonogo::evaluate::check_engine(&book, class, &d, decision);
    read(&report)
}

fn outcome<'r>(r: &'r EngineReport, section: &str) -> &'r gonogo::evaluate::outcome::Outcome<'r> {
    r.outcomes
        .iter()
        .find(|o| o.section() == section)
        .unwrap_or_else(|| panic!("no rule {section}"))
}

#[test]
fn the_demo_throttle_bore_is_proven_legal_by_its_no_go_plug() {
    // no-go plug 1.6873 in ± 0.0002 in did not enter: bore < 1.6875 in = 1-11/16 in, the
    // limit, so conformity is proven (ISO 14253-1) and both sides call it legal
    for decision in [
        None,
        Some(DecisionRule::GuardedAcceptance),
        Some(DecisionRule::SimpleAcceptance),
    ] {
        checked(Path::new(RULES), Path::new(DEMO), decision, |r| {
            let o = outcome(r, "4.4");
            assert_eq!(o.verdict, Verdict::Legal, "{decision:?}");
            let c = o.checked.as_ref().unwrap_or_else(|| panic!("checked"));
            assert_eq!(c.finding, Finding::Pass);
            let call = c.gauge.as_ref().unwrap_or_else(|| panic!("a gauge call"));
            // decided by the second result, the no-go plug
            assert_eq!(call.sides[0].decided_by, Some(1));
            assert_eq!(r.result(), gonogo::evaluate::outcome::EngineResult::Legal);
        });
    }
}

#[test]
fn the_demo_throttle_bore_reads_as_snapshotted() {
    let text = checked(Path::new(RULES), Path::new(DEMO), None, |r| {
        gonogo::report::text::engine(r)
    });
    let block = rule_blocks(&text, &["4.4"]);
    assert!(
        block.contains("plug TV-G-0413 1.6873 in did not enter"),
        "{block}"
    );
    insta::assert_snapshot!("demo_throttle_bore", block);
}

#[test]
fn every_format_says_what_the_gauge_proved() {
    let reports = checked(Path::new(RULES), Path::new(DEMO), None, |r| {
        let reports = [r.clone()];
        [
            gonogo::report::text::engine(r),
            gonogo::report::markdown::document(&reports),
            gonogo::report::html::page(&reports),
        ]
    });
    for report in reports {
        for said in [
            "plug TV-G-0411 1.6850 in (U = 0.0002 in, k = 2) entered: carburetor.throttle_bore is at least 1.6848 in",
            "plug TV-G-0413 1.6873 in (U = 0.0002 in, k = 2) did not enter: carburetor.throttle_bore is less than 1.6875 in",
        ] {
            assert!(report.contains(said), "missing {said:?} in\n{report}");
        }
    }
}

/// A rulebook and a declaration in a scratch folder, removed when dropped.
struct Case {
    dir: PathBuf,
}

impl Case {
    fn new(name: &str, rules: &str, declaration: &str) -> Case {
        let dir = std::env::temp_dir().join(format!("gonogo-gauge-{}-{name}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{}: {e}", dir.display()));
        for (file, text) in [("book.rules", rules), ("engine.yaml", declaration)] {
            std::fs::write(dir.join(file), text).unwrap_or_else(|e| panic!("{file}: {e}"));
        }
        Case { dir }
    }

    fn check<T>(&self, decision: Option<DecisionRule>, read: impl FnOnce(&EngineReport) -> T) -> T {
        checked(
            &self.dir.join("book.rules"),
            &self.dir.join("engine.yaml"),
            decision,
            read,
        )
    }
}

impl Drop for Case {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}

const GAUGE_RULES: &str = "series \"Tamsin Valley Stock Car Club\"\n\
    edition \"2027\" effective 2027-03-06\ndecision guarded rejection\n\
    measure carburetor.throttle_bore: length range 1 in to 2 in \"Go/no-go gauge\"\n\
    measure carburetor.spacer_bore: length range 1 in to 2 in \"Caliper\"\n\
    class hobby \"Hobby\"\n\
    \x20 rule 4.4 \"Throttle bores\"\n    require carburetor.throttle_bore <= 1-11/16 in\n  end\n\
    \x20 rule 4.6 \"Throttle bore, minimum\"\n    require carburetor.throttle_bore >= 1-1/2 in\n  end\n\
    \x20 rule 4.7 \"Throttle bore squared\"\n    require carburetor.throttle_bore * carburetor.throttle_bore <= 2.9 in²\n  end\n\
    \x20 rule 4.8 \"Throttle bore range\"\n    require carburetor.throttle_bore between 1-1/2 in and 1-11/16 in\n  end\n\
    \x20 rule 4.10 \"Throttle bore, measured limit\"\n    require carburetor.throttle_bore <= carburetor.spacer_bore\n  end\n\
    \x20 rule 4.9 \"Throttle bore exactly\"\n    require carburetor.throttle_bore == 1-11/16 in\n  end\n\
    \x20 when carburetor.throttle_bore > 1.6 in\n    rule 4.11 \"Spacer for a large throttle bore\"\n      \
    require carburetor.spacer_bore >= 1.69 in\n    end\n  end\n\
    \x20 when carburetor.throttle_bore > 1.69 in\n    rule 4.12 \"Spacer for a larger throttle bore\"\n      \
    require carburetor.spacer_bore >= 1.75 in\n    end\n  end\n\
    end\n";

/// Only the go plug was tried: 1.6850 in ± 0.0002 in entered, so the bore is at least
/// 1.6848 in and nothing bounds it from above. The spacer's bore, a limit of rule 4.10, is a
/// measured value with its own uncertainty.
const GO_PLUG_ONLY: &str = "class: hobby\ncomponents:\n  carburetor:\n    \
    spacer_bore: \"1.7000 in ± 0.0005 in\"\n    throttle_bore:\n      \
    gauges:\n        - {plug: \"TV-G-0411\", size: \"1.6850 in ± 0.0002 in (k = 2)\", result: entered}\n";

#[test]
fn a_go_plug_alone_leaves_an_upper_limit_open_under_each_decision_rule() {
    let case = Case::new("open", GAUGE_RULES, GO_PLUG_ONLY);
    // guarded rejection: no violation proven, legal but not certain
    case.check(None, |r| {
        let o = outcome(r, "4.4");
        assert_eq!(o.verdict, Verdict::Legal);
        assert_eq!(o.checked.as_ref().map(|c| c.finding), Some(Finding::Open));
        assert_eq!(o.mark(), "(✓)");
        assert!(o.is_uncertain());
    });
    // guarded acceptance: conformity not proven, illegal
    case.check(Some(DecisionRule::GuardedAcceptance), |r| {
        let o = outcome(r, "4.4");
        assert_eq!(o.verdict, Verdict::Illegal);
        assert_eq!(o.mark(), "(✗)");
    });
    // simple acceptance decides on a measured value; gauges give none: not checked
    case.check(Some(DecisionRule::SimpleAcceptance), |r| {
        let o = outcome(r, "4.4");
        assert_eq!(o.verdict, Verdict::NotChecked);
        assert_eq!(o.gauge_gaps.len(), 1);
        assert_eq!(o.gauge_gaps[0].why, GaugeWhy::OpenUnderSimpleAcceptance);
    });
}

#[test]
fn the_go_plug_proves_the_lower_limit() {
    // bore ≥ 1.6850 − 0.0002 = 1.6848 in ≥ 1-1/2 in: proven under every decision rule
    let case = Case::new("lower", GAUGE_RULES, GO_PLUG_ONLY);
    for decision in [None, Some(DecisionRule::GuardedAcceptance)] {
        case.check(decision, |r| {
            let o = outcome(r, "4.6");
            assert_eq!(o.verdict, Verdict::Legal);
            assert_eq!(o.checked.as_ref().map(|c| c.finding), Some(Finding::Pass));
        });
    }
}

/// The go plug and a no-go plug of 1.6873 in ± 0.0002 in that did not enter: the bore is at
/// least 1.6848 in and less than 1.6875 in.
const GO_AND_NO_GO: &str = "class: hobby\ncomponents:\n  carburetor:\n    \
    spacer_bore: \"1.7000 in\"\n    throttle_bore:\n      \
    gauges:\n        - {plug: \"TV-G-0411\", size: \"1.6850 in ± 0.0002 in (k = 2)\", result: entered}\n        \
    - {plug: \"TV-G-0413\", size: \"1.6873 in ± 0.0002 in (k = 2)\", result: did not enter}\n";

#[test]
fn a_range_is_decided_side_by_side() {
    // one go plug proves the low side (1.6848 ≥ 1.5) and leaves the high side open
    let case = Case::new("range-open", GAUGE_RULES, GO_PLUG_ONLY);
    case.check(Some(DecisionRule::GuardedAcceptance), |r| {
        let o = outcome(r, "4.8");
        let c = o.checked.as_ref().unwrap_or_else(|| panic!("checked"));
        assert_eq!(c.finding, Finding::Open);
        let sides: Vec<Finding> = c
            .gauge
            .iter()
            .flat_map(|g| &g.sides)
            .map(|s| s.finding)
            .collect();
        assert_eq!(sides, [Finding::Pass, Finding::Open]);
        assert_eq!(o.verdict, Verdict::Illegal);
    });
    // with the no-go plug both sides are proven (ISO 14253-1), even for the builder; rule
    // 4.10's limit, the spacer's bore written without an uncertainty, is exact
    let case = Case::new("range-both", GAUGE_RULES, GO_AND_NO_GO);
    case.check(Some(DecisionRule::GuardedAcceptance), |r| {
        for section in ["4.4", "4.8", "4.10"] {
            let o = outcome(r, section);
            assert_eq!(o.verdict, Verdict::Legal, "{section}");
            assert_eq!(o.checked.as_ref().map(|c| c.finding), Some(Finding::Pass));
        }
    });
}

#[test]
fn a_rule_that_needs_the_gauged_value_is_not_checked_and_names_the_gauge() {
    let case = Case::new("value", GAUGE_RULES, GO_PLUG_ONLY);
    let text = case.check(None, |r| {
        for (section, why) in [
            ("4.7", GaugeWhy::NeedsAValue),
            ("4.9", GaugeWhy::Equality),
            ("4.10", GaugeWhy::UnsureLimit),
        ] {
            let o = outcome(r, section);
            assert_eq!(o.verdict, Verdict::NotChecked, "{section}");
            assert!(
                o.missing.is_empty(),
                "{section}: a gauged value is not missing"
            );
            assert_eq!(
                o.gauge_gaps.iter().map(|g| g.why).collect::<Vec<_>>(),
                [why]
            );
        }
        gonogo::report::text::engine(r)
    });
    let blocks = rule_blocks(&text, &["4.4", "4.7", "4.9"]);
    assert!(blocks.contains("plug TV-G-0411"), "{blocks}");
    insta::assert_snapshot!("go_plug_only", blocks);
}

#[test]
fn the_json_of_a_gauged_engine_fits_its_schema_and_lists_each_result_once() {
    let run = common::gonogo(&["check", "--rules", RULES, "--format", "json", DEMO]);
    let doc: serde_json::Value =
        serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("{e}: {}", run.stdout));
    let engine = &doc["engines"][0];
    let gauges = engine["gauges"]
        .as_array()
        .unwrap_or_else(|| panic!("gauges"));
    assert_eq!(gauges.len(), 2);
    assert_eq!(gauges[1]["proves"]["side"], "less_than");
    // 1.6873 in + 0.0002 in
    let value = gauges[1]["proves"]["value"].as_f64().unwrap_or_default();
    assert!((value - 1.6875).abs() < 1e-12, "{value}");
    let rule = engine["rules"]
        .as_array()
        .into_iter()
        .flatten()
        .find(|r| r["section"] == "4.4")
        .unwrap_or_else(|| panic!("rule 4.4"));
    assert_eq!(rule["gauge"]["sides"][0]["finding"], "pass");
    assert_eq!(rule["gauge"]["sides"][0]["decided_by"], 1);
}

const RING_RULES: &str = "series \"Tamsin Valley Stock Car Club\"\n\
    edition \"2027\" effective 2027-03-06\ndecision guarded rejection\n\
    measure header.primary_od: length range 1 in to 2 in \"Ring gauge over the tube\"\n\
    class hobby \"Hobby\"\n\
    \x20 rule 6.1 \"Header primary tubes\"\n    require header.primary_od <= 1-3/4 in\n  end\n\
    end\n";

#[test]
fn a_ring_that_went_over_proves_a_diameter_at_most_its_size_plus_u() {
    // a ring of 1.7496 in ± 0.0002 in goes over only a tube of at most its true size, so the
    // tube is at most 1.7498 in ≤ 1.75 in: conformity proven (ISO 14253-1, from memory)
    let engine = "class: hobby\ncomponents:\n  header:\n    primary_od:\n      gauges:\n        \
        - {ring: \"TV-R-0031\", size: \"1.7496 in ± 0.0002 in (k = 2)\", result: went over}\n";
    let case = Case::new("ring", RING_RULES, engine);
    let text = case.check(Some(DecisionRule::GuardedAcceptance), |r| {
        let o = outcome(r, "6.1");
        assert_eq!(o.verdict, Verdict::Legal);
        assert_eq!(o.checked.as_ref().map(|c| c.finding), Some(Finding::Pass));
        gonogo::report::text::engine(r)
    });
    let said = "ring TV-R-0031 1.7496 in (U = 0.0002 in, k = 2) went over: header.primary_od is at most 1.7498 in";
    assert!(text.contains(said), "{text}");
}

#[test]
fn a_gauge_size_without_an_uncertainty_is_refused_at_load() {
    let case = Case::new("no-u", RING_RULES, "class: hobby\n");
    let book = rulebook(&case.dir.join("book.rules"));
    for size in ["1.7496 in", "1.7496 in ± 0 in"] {
        let text = format!(
            "class: hobby\ncomponents:\n  header:\n    primary_od:\n      gauges:\n        \
             - {{ring: \"TV-R-0031\", size: \"{size}\", result: went over}}\n"
        );
        let mut sources = gonogo::source::SourceMap::default();
        let problems = gonogo::load::declaration_from_text(
            Path::new("engine.yaml"),
            text,
            &book,
            &mut sources,
        )
        .err()
        .unwrap_or_else(|| panic!("{size} was accepted"));
        let codes: Vec<String> = problems.iter().map(|p| p.code.to_string()).collect();
        assert_eq!(codes, ["D36 bad-gauge"], "{size}");
    }
}

#[test]
fn a_condition_on_a_gauged_measurement_holds_only_where_the_bound_proves_it() {
    use gonogo::evaluate::outcome::Applies;
    // the go plug proves the bore at least 1.6848 in: `> 1.6 in` holds; `> 1.69 in` is open,
    // an uncertain condition, which under guarded rejection cannot prove a violation
    let case = Case::new("condition", GAUGE_RULES, GO_PLUG_ONLY);
    case.check(None, |r| {
        assert_eq!(outcome(r, "4.11").applies, Applies::Holds);
        let o = outcome(r, "4.12");
        assert_eq!(o.applies, Applies::Uncertain);
        // the spacer's 1.7000 in fails `>= 1.75 in`, but the rule may not apply
        assert_eq!(o.verdict, Verdict::Legal);
    });
}

#[test]
fn a_condition_the_gauges_leave_open_is_not_checked_under_simple_acceptance() {
    use gonogo::evaluate::outcome::Applies;
    // 4.12's condition `> 1.69 in` is open on a go plug of 1.6850 in: simple acceptance has no
    // measured value to take as true or false, so the rule is not checked, never judged as if
    // its condition held (found by trying a no-go plug under a `when`)
    let case = Case::new("condition-simple", GAUGE_RULES, GO_PLUG_ONLY);
    case.check(Some(DecisionRule::SimpleAcceptance), |r| {
        let o = outcome(r, "4.12");
        assert_eq!(o.applies, Applies::NotComputed);
        assert_eq!(o.verdict, Verdict::NotChecked);
        assert!(
            o.gauge_gaps
                .iter()
                .any(|g| g.why == GaugeWhy::OpenUnderSimpleAcceptance),
            "{:?}",
            o.gauge_gaps
        );
        // the proven condition of 4.11 still holds under simple acceptance
        assert_eq!(outcome(r, "4.11").applies, Applies::Holds);
    });
}
