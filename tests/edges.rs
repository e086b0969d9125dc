//! What an inspector reads at the edges of a report, through the binary: a margin between
//! a fraction and a decimal limit, a fail by a few millionths, a function with no derivative
//! at the value it is given, a condition that could not be computed, the mean of repeated
//! readings, the effective degrees of freedom. Each case is a small invented rulebook of the
//! Tamsin Valley Stock Car Club.

mod common;

use common::gonogo;

/// A rulebook and a declaration in a scratch folder, removed when dropped.
struct Case {
    dir: std::path::PathBuf,
}

impl Case {
    fn new(name: &str, rules: &str, declaration: &str) -> Case {
        let dir = std::env::temp_dir().join(format!("gonogo-edges-{}-{name}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
        std::fs::write(dir.join("r.rules"), rules).unwrap_or_else(|e| panic!("{e}"));
        std::fs::write(dir.join("d.yaml"), declaration).unwrap_or_else(|e| panic!("{e}"));
        Case { dir }
    }

    /// A command on the rulebook and declaration with extra arguments; its output.
    fn run(&self, command: &str, extra: &[&str]) -> common::Run {
        let rules = self.dir.join("r.rules");
        let declaration = self.dir.join("d.yaml");
        let mut args = vec![command, "--rules", rules.to_str().unwrap_or_default()];
        args.extend_from_slice(extra);
        args.push(declaration.to_str().unwrap_or_default());
        gonogo(&args)
    }

    /// `check` in one format; the text of the report.
    fn check(&self, format: &str) -> String {
        let run = self.run("check", &["--format", format]);
        assert!(
            run.code == 0 || run.code == 1 || run.code == 3,
            "exit {}: {}{}",
            run.code,
            run.stdout,
            run.stderr
        );
        run.stdout
    }
}

impl Drop for Case {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.dir);
    }
}

/// The text of one rule's block in a text report: from its heading line to the next blank.
fn block<'t>(text: &'t str, heading: &str) -> &'t str {
    let start = text
        .find(heading)
        .unwrap_or_else(|| panic!("no {heading:?} in\n{text}"));
    let rest = &text[start..];
    &rest[..rest.find("\n\n").unwrap_or(rest.len())]
}

const HEADER: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2027" effective 2027-03-06
decision guarded rejection
"#;

#[test]
fn a_margin_from_a_fraction_shows_the_fraction_exactly() {
    let rules = format!(
        r#"{HEADER}
measure header.primary_od: length "Caliper"
measure header.collector_od: length "Caliper"
class street_stock "Street Stock"
  rule 6.1 "Header primary tubes"
    require header.primary_od <= 1.7 in
  end
  rule 6.2 "Collector"
    require header.collector_od <= 2 in
  end
end
"#
    );
    let case = Case::new(
        "fraction",
        &rules,
        "engine: \"TV-0412\"\nclass: street_stock\ndate: \"2027-05-01\"\nmeasurements:\n  \
         header.primary_od: \"1-3/4 in\"\n  header.collector_od: \"2-1/4 in\"\n",
    );
    let text = case.check("text");
    // 1-3/4 in − 1.7 in = 0.05 in and 2-1/4 in − 2 in = 0.25 in: a fraction is exact
    assert!(
        block(&text, "6.1").contains("margin     0.05 in outside"),
        "{text}"
    );
    assert!(
        block(&text, "6.2").contains("margin     0.25 in outside"),
        "{text}"
    );
}

#[test]
fn a_fail_by_millionths_never_reads_as_a_zero_margin() {
    let rules = format!(
        r#"{HEADER}
measure bore: length per cylinder "Bore gauge"
measure car.weight: mass "Scale"
class street_stock "Street Stock"
  rule 2.1 "Bore"
    require bore <= 4.030 in allowing 0.127 mm
  end
  rule 2.2 "Weight"
    require car.weight >= 3100 lb allowing 0.5 kg
  end
end
"#
    );
    // 4.035 in = 102.489 mm (1 in = 25.4 mm exactly, NIST SP 811 B.8): 102.4891 mm is
    // 0.0001 mm = 0.0000039 in over; 3100 lb = 1406.136347 kg (1 lb = 0.45359237 kg exactly,
    // NIST SP 811 B.8), less 0.5 kg is 1405.636347 kg, 0.000001 kg = 0.0000022 lb under
    let case = Case::new(
        "millionths",
        &rules,
        "engine: \"TV-0413\"\nclass: street_stock\ndate: \"2027-05-01\"\nmeasurements:\n  \
         bore: [\"102.4891 mm\", \"4.0 in\"]\n  car.weight: \"1405.636346 kg\"\n",
    );
    let text = case.check("text");
    assert!(
        block(&text, "2.1").contains("margin     0.000004 in outside"),
        "{text}"
    );
    assert!(
        block(&text, "2.2").contains("margin     0.000002 lb outside"),
        "{text}"
    );
}

/// Two readings of the same deck height, one each side, and an exact pair; `abs` and `sqrt`
/// of what they give.
const DERIVATIVE_RULES: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2027" effective 2027-03-06
decision guarded rejection
measure deck.left: length "Depth gauge"
measure deck.right: length "Depth gauge"
measure plate.a: length "Caliper"
measure plate.b: length "Caliper"
define deck_skew = abs(deck.left - deck.right)
define plate_root = sqrt(plate.a * 1 in - plate.b * plate.b)
define plate_power = ((plate.a - plate.b) / 1 in) ^ 0.5
class street_stock "Street Stock"
  rule 3.1 "Deck skew"
    require deck_skew <= 0 in
  end
  rule 3.2 "Plate root"
    require plate_root <= 1 in
  end
  rule 3.3 "Plate power"
    require plate_power <= 1
  end
end
"#;

#[test]
fn a_function_without_a_derivative_at_an_uncertain_point_is_never_a_proven_pass() {
    let case = Case::new(
        "no-derivative",
        DERIVATIVE_RULES,
        "engine: \"TV-0414\"\nclass: street_stock\ndate: \"2027-05-01\"\nmeasurements:\n  \
         deck.left: \"1.0000 in ± 0.0010 in\"\n  deck.right: \"1.0000 in ± 0.0010 in\"\n  \
         plate.a: \"1 in ± 0.001 in\"\n  plate.b: \"1 in\"\n",
    );
    let text = case.check("text");
    // |a − b| at a = b has no derivative, and a − b is uncertain: the first-order law gives
    // u = 0 (GUM JCGM 100:2008, 5.1.2 needs a derivative); the rule is not checked
    for rule in ["3.1  Deck skew", "3.2  Plate root", "3.3  Plate power"] {
        let b = block(&text, rule);
        assert!(b.contains("NOT CHECKED"), "{b}");
        assert!(b.contains("a Monte Carlo propagation (JCGM 101)"), "{b}");
    }
    assert!(!text.contains("LEGAL · pass"), "{text}");
    let json = case.check("json");
    assert!(!json.contains("\"pass\""), "{json}");
}

#[test]
fn a_function_at_an_exact_point_with_exact_inputs_is_computed() {
    let case = Case::new(
        "exact-zero",
        DERIVATIVE_RULES,
        "engine: \"TV-0415\"\nclass: street_stock\ndate: \"2027-05-01\"\nmeasurements:\n  \
         deck.left: \"1.0000 in\"\n  deck.right: \"25.4 mm\"\n  \
         plate.a: \"1 in\"\n  plate.b: \"25.4 mm\"\n",
    );
    let text = case.check("text");
    // 1 in = 25.4 mm exactly (NIST SP 811 B.8): every value is exactly 0 with no uncertainty
    for rule in ["3.1  Deck skew", "3.2  Plate root", "3.3  Plate power"] {
        let b = block(&text, rule);
        assert!(b.contains("LEGAL · pass"), "{b}");
        assert!(b.contains("value      0"), "{b}");
    }
    for format in ["text", "markdown", "html", "json"] {
        let out = case.check(format);
        assert!(
            !out.contains("-0 ") && !out.contains("-0.0,"),
            "{format}: {out}"
        );
    }
}

/// A rule whose condition divides by a measurement, and one whose condition reads a part
/// number given and whose test reads an optional measurement not given.
const CONDITION_RULES: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2027" effective 2027-03-06
decision guarded rejection
measure car.weight: mass "Club scale"
measure ballast: mass range -500 lb to 500 lb "Ballast"
measure carburetor.part: text "Casting number"
measure carburetor.spacer: length optional "Caliper"
define per_ballast = car.weight / ballast
class street_stock "Street Stock"
  rule 5.1 "Weight with heavy ballast"
    when per_ballast < 10
    require car.weight >= 2800 lb
  end
  rule 5.2 "Spacer"
    when carburetor.part matches /^TVC-5/
    require carburetor.spacer <= 1 in
  end
end
"#;

#[test]
fn a_condition_that_could_not_be_computed_is_not_known_in_every_format() {
    let case = Case::new(
        "condition",
        CONDITION_RULES,
        "engine: \"TV-0416\"\nclass: street_stock\ndate: \"2027-05-01\"\ncomponents:\n  \
         carburetor:\n    part: \"TVC-512\"\nmeasurements:\n  car.weight: \"3000 lb\"\n  \
         ballast: \"0 lb\"\n",
    );
    let json: serde_json::Value =
        serde_json::from_str(&case.check("json")).unwrap_or_else(|e| panic!("{e}"));
    let rules = &json["engines"][0]["rules"];
    assert_eq!(rules[0]["applies"], "not_computed", "{rules}");
    assert_eq!(rules[0]["verdict"], "not_checked");
    for format in ["text", "markdown", "html"] {
        let out = case.check(format);
        assert!(
            out.contains("(not known: it could not be computed)"),
            "{format}: {out}"
        );
    }
    // the condition of 5.2 reads only the part number, which is given: the words are of the
    // rule, which reads the optional spacer
    assert_eq!(rules[1]["applies"], "not_measured");
    let text = case.check("text");
    let spacer = block(&text, "5.2  Spacer");
    assert!(
        spacer.contains("(not judged: the rule reads an optional measurement that is not given)"),
        "{spacer}"
    );
}

const CHAMBER_RULES: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2027" effective 2027-03-06
decision guarded rejection
coverage 95 %
measure chamber: volume "Burette"
class street_stock "Street Stock"
  rule 4.1 "Chamber"
    require chamber <= 72.5 cc
  end
end
"#;

#[test]
fn repeated_readings_show_their_mean_with_the_digits_its_uncertainty_supports() {
    let case = Case::new(
        "mean",
        CHAMBER_RULES,
        "engine: \"TV-0417\"\nclass: street_stock\ndate: \"2027-05-01\"\nmeasurements:\n  \
         chamber:\n    readings: [\"72.1 cc\", \"72.4 cc\", \"72.2 cc\"]\n",
    );
    let text = case.check("text");
    // REFERENCES.md [computed from GUM 4.2]: mean 72.2333 cc, u = 0.08819 cc, ν = 2,
    // k = t_95(2) = 4.30 (GUM G.3.4 table G.2), U = 0.38 cc: the mean to hundredths (GUM 7.2.6)
    let b = block(&text, "4.1  Chamber");
    assert!(
        b.contains("value      72.23 cc (the mean of 3 readings)\n"),
        "{b}"
    );
    // the readings themselves stay in the trace
    assert!(b.contains("chamber = 72.1 cc, 72.4 cc, 72.2 cc"), "{b}");
}

#[test]
fn identical_readings_without_an_instrument_are_refused() {
    let yaml = |instrument: &str| {
        format!(
            "engine: \"TV-0418\"\nclass: street_stock\ndate: \"2027-05-01\"\n{instrument}\
             measurements:\n  chamber:\n    readings: [\"72.1 cc\", \"72.1 cc\", \"72.1 cc\"]\n"
        )
    };
    let case = Case::new("identical", CHAMBER_RULES, &yaml(""));
    let run = case.run("check", &[]);
    // a spread of zero says nothing of the resolution (GUM JCGM 100:2008, F.2.2.1): not a
    // proven pass with u = 0
    assert_eq!(run.code, 2, "{}{}", run.stdout, run.stderr);
    assert!(
        run.stderr.contains("D30 identical-readings"),
        "{}",
        run.stderr
    );
    assert!(run.stderr.contains("resolution"), "{}", run.stderr);
    // with the burette named, its resolution gives the uncertainty
    let named = yaml("instruments:\n  burette: {resolution: \"0.1 cc\"}\n")
        .replace("72.1 cc\"]\n", "72.1 cc\"]\n    instrument: burette\n");
    let case = Case::new("identical-named", CHAMBER_RULES, &named);
    let text = case.check("text");
    assert!(text.contains("LEGAL"), "{text}");
}

#[test]
fn a_plus_minus_in_a_condition_is_not_told_to_become_an_allowance() {
    let rules = format!(
        r#"{HEADER}
measure car.weight: mass "Club scale"
measure header.primary_od: length "Caliper"
define scale_weight = car.weight + 0 lb ± 4 lb
class street_stock "Street Stock"
  rule 6.5 "Headers on heavy cars"
    when scale_weight > 3000 lb ± 1 lb
    require header.primary_od <= 1-3/4 in
  end
end
"#
    );
    let case = Case::new("condition-pm", &rules, "");
    let rules = case.dir.join("r.rules");
    let run = gonogo(&["lint", rules.to_str().unwrap_or_default()]);
    assert_ne!(run.code, 0);
    let out = format!("{}{}", run.stdout, run.stderr);
    assert!(out.contains("C59 uncertain-limit"), "{out}");
    // `allowing` is a parse error in a condition (P01)
    assert!(!out.contains("allowing"), "{out}");
    assert!(out.contains("remove `± 1 lb`"), "{out}");
    assert!(
        out.contains("the value a condition compares with cannot carry an uncertainty"),
        "{out}"
    );
}
