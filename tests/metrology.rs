//! The leftovers of issue 9 in the metrologist's terms: `==` and `!=` of numbers decided
//! exactly where the values are exact.
//!
//! Exact factors from NIST SP 811 (2008) B.8: 1 in = 25.4 mm, 1 in³ = 16.387 064 cm³,
//! 1 lb = 0.453 592 37 kg, each exactly.

use std::path::Path;

use gonogo::check::check;
use gonogo::check::model::CheckedRulebook;
use gonogo::evaluate::check_engine;
use gonogo::evaluate::finding::Finding;
use gonogo::load::declaration_from_text;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::source::SourceMap;

/// The rulebook of one case: the invented club's header, one measurement and one rule.
fn rulebook(measure: &str, test: &str) -> CheckedRulebook {
    let text = format!(
        "series \"Tamsin Valley Stock Car Club\"\nedition \"2027\" effective 2027-04-01\n\
         decision guarded rejection\n\n{measure}\n\nclass one \"One rule\"\n  \
         rule 1 \"The rule\" require {test} end\nend\n"
    );
    let (book, problems) = parse_rulebook(0, &text);
    assert!(problems.is_empty(), "{text}\n{problems:?}");
    let (checked, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    checked.unwrap_or_else(|| panic!("{text}\n{problems:?}"))
}

/// The finding and the value shown of a rule without uncertainty on one reading.
fn binary(measure: &str, test: &str, reading: &str) -> (Finding, String) {
    let rulebook = rulebook(measure, test);
    let yaml = format!("class: one\nmeasurements:\n  {reading}\n");
    let declaration = declaration_from_text(
        Path::new("one.yaml"),
        yaml,
        &rulebook,
        &mut SourceMap::default(),
    )
    .unwrap_or_else(|p| panic!("{reading}: {p:?}"));
    let class = rulebook.class("one").unwrap_or_else(|| panic!("no class"));
    let report = check_engine(&rulebook, class, &declaration, None);
    let checked = report.outcomes[0]
        .checked
        .as_ref()
        .unwrap_or_else(|| panic!("{test} on {reading}: not checked"));
    (
        checked.finding,
        checked.observed.clone().unwrap_or_default(),
    )
}

const PRIMARY: &str = "measure header.primary_od: length \"Caliper on the primary tube\"";
const WEIGHT: &str = "measure car.weight: mass \"Club scale\"";
const CHAMBER: &str = "measure chamber: volume \"Burette\"";

#[test]
fn equality_of_exact_values_is_decided_exactly() {
    use Finding::{Fail, Pass};
    // (measure, test, reading, finding, value shown). A reading is shown as written, with its
    // value in the limit's unit to at least the resolution written: 2 places of a mm are 4 of
    // an inch (1 in = 25.4 mm), 6 of a kg 6 of a lb, 6 of a cc 8 of a ci.
    let cases = [
        // 1-3/4 in = 44.45 mm exactly (NIST SP 811 B.8)
        (
            PRIMARY,
            "header.primary_od == 1-3/4 in",
            "header.primary_od: \"44.45 mm\"",
            Pass,
            "44.45 mm (1.7500 in)",
        ),
        (
            PRIMARY,
            "header.primary_od == 1-3/4 in",
            "header.primary_od: \"44.4501 mm\"",
            Fail,
            "44.4501 mm (1.750004 in)",
        ),
        // 1e-11 mm off: inside a float tolerance of 1e-9, so it was taken as equal before
        (
            PRIMARY,
            "header.primary_od == 1-3/4 in",
            "header.primary_od: \"44.45000000001 mm\"",
            Fail,
            "44.45000000001 mm (1.7500000000004 in)",
        ),
        (
            PRIMARY,
            "header.primary_od != 1-3/4 in",
            "header.primary_od: \"44.45 mm\"",
            Fail,
            "44.45 mm (1.7500 in)",
        ),
        (
            PRIMARY,
            "header.primary_od != 1-3/4 in",
            "header.primary_od: \"44.45000000001 mm\"",
            Pass,
            "44.45000000001 mm (1.7500000000004 in)",
        ),
        (
            PRIMARY,
            "header.primary_od == 1.75 in",
            "header.primary_od: \"1.7500 in\"",
            Pass,
            "1.7500 in",
        ),
        // 3100 lb = 1406.136347 kg exactly (NIST SP 811 B.8, 1 lb = 0.453 592 37 kg)
        (
            WEIGHT,
            "car.weight == 3100 lb",
            "car.weight: \"1406.136347 kg\"",
            Pass,
            "1406.136347 kg (3100.000000 lb)",
        ),
        (
            WEIGHT,
            "car.weight == 3100 lb",
            "car.weight: \"1406.1363470001 kg\"",
            Fail,
            "1406.1363470001 kg (3100.0000000002 lb)",
        ),
        // 4 in³ = 65.548256 cm³ exactly (NIST SP 811 B.8)
        (
            CHAMBER,
            "chamber == 4 ci",
            "chamber: \"65.548256 cc\"",
            Pass,
            "65.548256 cc (4.00000000 ci)",
        ),
        (
            CHAMBER,
            "chamber == 4 ci",
            "chamber: \"65.548257 cc\"",
            Fail,
            "65.548257 cc (4.00000006 ci)",
        ),
    ];
    let mut wrong = Vec::new();
    for (measure, test, reading, finding, shown) in cases {
        let got = binary(measure, test, reading);
        if got != (finding, shown.to_string()) {
            wrong.push(format!(
                "{test} on {reading}: {got:?}, expected {finding:?} {shown:?}"
            ));
        }
    }
    assert!(wrong.is_empty(), "\n{}", wrong.join("\n"));
}

#[test]
fn equality_that_needs_pi_falls_back_to_the_float_with_its_tolerance() {
    // π · 25.4 mm = 79.796 453 401 18… mm: the reading is 2e-12 of it away, which no exact
    // arithmetic can settle (π is irrational), so the float's tolerance of 1e-9 decides
    let (finding, _) = binary(
        PRIMARY,
        "header.primary_od == pi * 1 in",
        "header.primary_od: \"79.796453401 mm\"",
    );
    assert_eq!(finding, Finding::Pass);
    let (finding, _) = binary(
        PRIMARY,
        "header.primary_od == pi * 1 in",
        "header.primary_od: \"79.7965 mm\"",
    );
    assert_eq!(finding, Finding::Fail);
}

/// The finding's probability of conformance and effective degrees of freedom of one rule.
fn probability(measure: &str, test: &str, reading: &str) -> (f64, f64) {
    let rulebook = rulebook(measure, test);
    let yaml = format!("class: one\nmeasurements:\n  {reading}\n");
    let declaration = declaration_from_text(
        Path::new("one.yaml"),
        yaml,
        &rulebook,
        &mut SourceMap::default(),
    )
    .unwrap_or_else(|p| panic!("{reading}: {p:?}"));
    let class = rulebook.class("one").unwrap_or_else(|| panic!("no class"));
    let report = check_engine(&rulebook, class, &declaration, None);
    let n = report.outcomes[0]
        .checked
        .as_ref()
        .and_then(|c| c.numeric.as_ref())
        .unwrap_or_else(|| panic!("{test} on {reading}: no number"));
    (n.probability, n.degrees_of_freedom)
}

#[test]
fn three_readings_give_the_probability_of_the_t_distribution_not_the_normal() {
    // REFERENCES.md (GUM 4.2): 72.1, 72.4, 72.2 cc → mean 72.2333 cc, u = s/√3 = 0.08819 cc,
    // ν = 2. Against <= 72.5 cc the margin is 3.024 u. The measurand is a t with 2 degrees of
    // freedom (JCGM 101 6.4.9; JCGM 106 7.5, from memory), whose distribution function has the
    // closed form F(t) = 1/2 + t / (2√(2 + t²)): p = 95.29 %, where Φ(3.024) = 99.88 %
    let readings = "chamber: {readings: [\"72.1 cc\", \"72.4 cc\", \"72.2 cc\"]}";
    let (p, nu) = probability(CHAMBER, "chamber <= 72.5 cc", readings);
    assert_eq!(nu, 2.0);
    let (mean, s) = (72.233_333, 0.152_753);
    let u = s / 3f64.sqrt();
    let z = (72.5 - mean) / u;
    let t2 = 0.5 + z / (2.0 * (2.0 + z * z).sqrt());
    assert!((z - 3.024).abs() < 5e-4, "z {z}");
    assert!((p - t2).abs() < 1e-6, "p {p}, t₂ gives {t2}");
    assert!((p - 0.9529).abs() < 5e-4, "p {p}");
    // the same margin from a Type B uncertainty keeps the normal figure: Φ(3.024) = 0.99875
    let stated = format!("chamber: \"{mean} cc ± {u} cc (k = 1)\"");
    let (p, nu) = probability(CHAMBER, "chamber <= 72.5 cc", &stated);
    assert_eq!(nu, f64::INFINITY);
    assert!((p - 0.998_75).abs() < 5e-5, "p {p}");
}

/// The limit (or the two limits of a range) as the reports show it, for one rule on one
/// reading.
fn limit_shown(measure: &str, test: &str, reading: &str) -> Vec<String> {
    let rulebook = rulebook(measure, test);
    let yaml = format!("class: one\nmeasurements:\n  {reading}\n");
    let declaration = declaration_from_text(
        Path::new("one.yaml"),
        yaml,
        &rulebook,
        &mut SourceMap::default(),
    )
    .unwrap_or_else(|p| panic!("{reading}: {p:?}"));
    let class = rulebook.class("one").unwrap_or_else(|| panic!("no class"));
    let report = check_engine(&rulebook, class, &declaration, None);
    let view = gonogo::report::view::EngineView::new(&report);
    let n = view.rules[0]
        .numeric
        .as_ref()
        .unwrap_or_else(|| panic!("{test}: no numbers"));
    match &n.shown.range {
        Some([low, high]) => vec![low.clone(), high.clone()],
        None => vec![n.shown.limit.clone()],
    }
}

#[test]
fn a_limit_is_shown_as_the_rulebook_wrote_it() {
    const STROKE: &str = "measure stroke: length \"Dial indicator\"";
    const RATIO: &str = "measure ratio: ratio \"Computed\"";
    let stroke = "stroke: \"3.480 in\"";
    // the digits written say how the limit was set: 3.470 in is not 3.47 in to a reader
    assert_eq!(
        limit_shown(STROKE, "stroke between 3.470 in and 3.490 in", stroke),
        ["3.470 in", "3.490 in"]
    );
    assert_eq!(
        limit_shown(STROKE, "stroke <= 3-1/2 in", stroke),
        ["3-1/2 in"]
    );
    assert_eq!(
        limit_shown(STROKE, "stroke >= -0.010 in", stroke),
        ["-0.010 in"]
    );
    assert_eq!(
        limit_shown(RATIO, "ratio <= 10.0", "ratio: \"8.6\""),
        ["10.0"]
    );
    // with an allowance, the sum to the finer place of the two (4.030 + 0.0050 = 4.0350)
    assert_eq!(
        limit_shown(STROKE, "stroke <= 3.490 in allowing 0.0050 in", stroke),
        ["3.4950 in"]
    );
    assert_eq!(
        limit_shown(
            STROKE,
            "stroke between 3.47 in and 3.49 in allowing 0.005 in",
            stroke
        ),
        ["3.465 in", "3.495 in"]
    );
    // a limit in another unit than the numbers are shown in, or computed, keeps six digits
    assert_eq!(
        limit_shown(STROKE, "stroke <= 2 * 1.745 in", stroke),
        ["3.49 in"]
    );
}
