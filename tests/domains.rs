//! Values outside the domain of a formula or operation (issue 9, "impossible values"): the
//! rule is not checked, with a reason naming the formula and the inputs as written; it has no
//! finding and no probability in any format, the schema refuses one, and the engine is "not
//! all clear" (exit 3), never legal.

mod common;

use std::path::{Path, PathBuf};

use serde_json::{Value, json};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

/// A file in a temporary folder of this test process.
fn temp(name: &str, text: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gonogo-{}-domains", std::process::id()));
    let path = dir.join(name);
    if let Some(parent) = path.parent() {
        std::fs::create_dir_all(parent).unwrap_or_else(|e| panic!("{}: {e}", parent.display()));
    }
    // tests running at once write the same file: each writes its own and renames it into
    // place, so none reads a file another is halfway through writing
    let own = dir.join(format!("{name}.{:?}", std::thread::current().id()));
    std::fs::write(&own, text).unwrap_or_else(|e| panic!("{}: {e}", own.display()));
    std::fs::rename(&own, &path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    path
}

fn read(path: &str) -> String {
    let full = Path::new(env!("CARGO_MANIFEST_DIR")).join(path);
    std::fs::read_to_string(&full).unwrap_or_else(|e| panic!("{}: {e}", full.display()))
}

/// `text` with `from` replaced by `to`, which must be there.
fn replaced(text: &str, from: &str, to: &str) -> String {
    assert!(text.contains(from), "`{from}` is not in the text");
    text.replacen(from, to, 1)
}

/// The demo rulebook with the piston volume's range widened to domes of 40 cc. With the
/// demo's own ranges the clearance volume cannot go below zero: the least is a 40 cc chamber,
/// no gasket, a 4.5 in bore 0.050 in above the deck (−13.03 cc) and a 20 cc dome, 6.97 cc.
/// A rulebook that admits larger domes admits the sign slip of the issue.
fn wide_dome_rulebook() -> PathBuf {
    temp(
        "parts/tamsin-parts.rules",
        &read("rulebooks-demo/parts/tamsin-parts.rules"),
    );
    let text = replaced(
        &read(RULES),
        "measure piston.volume: volume per cylinder range -20 cc to 40 cc",
        "measure piston.volume: volume per cylinder range -40 cc to 40 cc",
    );
    temp("tamsin-2027-wide-dome.rules", &text)
}

/// The demo's legal Limited Two-Barrel with cylinder 3 measured with a sign slip: a 40.0 cc
/// chamber, the piston 0.050 in above the deck and a 39.0 cc dome, each inside the ranges.
fn sign_slip() -> PathBuf {
    let legal = read("engines-demo/limited2-legal.yaml");
    let text = replaced(
        &legal,
        r#"values: ["72.1 cc", "72.4 cc", "71.9 cc","#,
        r#"values: ["72.1 cc", "72.4 cc", "40.0 cc","#,
    );
    let text = replaced(
        &text,
        r#"values: ["0.012 in", "0.011 in", "0.013 in","#,
        r#"values: ["0.012 in", "0.011 in", "-0.050 in","#,
    );
    let text = replaced(
        &text,
        r#"values: ["12.1 cc", "12.0 cc", "12.2 cc","#,
        r#"values: ["12.1 cc", "12.0 cc", "-39.0 cc","#,
    );
    temp("limited2-sign-slip.yaml", &text)
}

/// The demo's legal Limited Two-Barrel with its carburetor rated at a pressure drop of zero,
/// which the demo rulebook admits (the rating has no range).
fn zero_rating() -> PathBuf {
    let text = replaced(
        &read("engines-demo/limited2-legal.yaml"),
        r#"rated_at: "3.0 inHg""#,
        r#"rated_at: "0 inHg""#,
    );
    temp("limited2-zero-rating.yaml", &text)
}

fn check(rules: &Path, declaration: &Path, format: &str) -> common::Run {
    let (rules, declaration) = (rules.to_string_lossy(), declaration.to_string_lossy());
    common::gonogo(&["check", "--rules", &rules, "--format", format, &declaration])
}

fn rule<'v>(doc: &'v Value, section: &str) -> &'v Value {
    doc["engines"][0]["rules"]
        .as_array()
        .into_iter()
        .flatten()
        .find(|r| r["section"] == section)
        .unwrap_or_else(|| panic!("no rule {section}"))
}

fn json(run: &common::Run) -> Value {
    serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("{e}: {}", run.stderr))
}

#[test]
fn a_negative_clearance_volume_is_not_checked_and_never_legal() {
    // issue 9: chamber, deck and dome inside the ranges adding up to a negative clearance gave
    // a ratio below zero, LEGAL · pass, exit 0. Cylinder 3 by hand (Heywood, Internal
    // Combustion Engine Fundamentals, ch. 2; 1 in³ = 16.387064 cc, NIST SP 811):
    // 40.0 + π/4 · 4.100² · 0.041 + π/4 · 4.0301² · (−0.050) − 39.0
    // = 40.0 + 8.870388 − 10.451838 − 39.0 = −0.581451 cc.
    let by_hand = 40.0 + 8.870_388 - 10.451_838 - 39.0;
    let (rules, engine) = (wide_dome_rulebook(), sign_slip());
    let text = check(&rules, &engine, "text");
    assert_eq!(
        text.code, 3,
        "not all clear: {}{}",
        text.stdout, text.stderr
    );
    assert!(
        text.stdout
            .contains("result: NO PROVEN VIOLATION, BUT NOT ALL CLEAR"),
        "{}",
        text.stdout
    );
    assert!(
        text.stdout
            .contains("? 3.4  Compression ratio, every cylinder — NOT CHECKED\n"),
        "{}",
        text.stdout
    );
    let reason = "compression_ratio needs a positive clearance volume (Heywood, Internal \
                  Combustion Engine Fundamentals, ch. 2); on cylinder 3, bore[3] 4.0301 in, \
                  chamber[3] 40.0 cc, gasket.bore 4.100 in, gasket.thickness 0.041 in, \
                  deck_clearance[3] -0.050 in, piston.volume[3] -39.0 cc give a clearance \
                  volume of -0.581451 cc\n";
    assert!(text.stdout.contains(reason), "{}", text.stdout);

    let run = check(&rules, &engine, "json");
    assert_eq!(run.code, 3);
    let doc = json(&run);
    assert_eq!(doc["engines"][0]["result"], "not_all_clear");
    assert_eq!(doc["engines"][0]["exit_status"], 3);
    let cr = rule(&doc, "3.4");
    assert_eq!(cr["verdict"], "not_checked");
    assert_eq!(cr["finding"], Value::Null);
    assert_eq!(cr["numeric"], Value::Null);
    assert_eq!(cr["not_finite"], true);
    let breach = &cr["outside_domain"][0];
    assert_eq!(breach["by"], "compression_ratio");
    assert_eq!(breach["quantity"], "clearance volume");
    assert_eq!(
        (breach["unit"].clone(), breach["cylinder"].clone()),
        (json!("cc"), json!(3))
    );
    let value = breach["value"].as_f64().unwrap_or(f64::NAN);
    assert!(
        (value - by_hand).abs() < 1e-5,
        "{value} cc, by hand {by_hand} cc"
    );
    assert_eq!(cr["outside_domain"].as_array().map(Vec::len), Some(1));
    // the inputs it names are the engine's, as written
    let inputs = &doc["engines"][0]["inputs"];
    let named: Vec<&str> = breach["inputs"]
        .as_array()
        .into_iter()
        .flatten()
        .filter_map(|id| inputs[id.as_u64().unwrap_or(u64::MAX) as usize]["written"].as_str())
        .collect();
    assert_eq!(
        named,
        [
            "4.0301 in",
            "40.0 cc",
            "4.100 in",
            "0.041 in",
            "-0.050 in",
            "-39.0 cc"
        ]
    );
}

#[test]
fn a_pressure_drop_of_zero_is_not_checked_without_a_finding() {
    // issue 9: the demo rulebook admits a rating at 0 inHg; the conversion divided by zero
    // and the rule said "NOT CHECKED · fail" with a probability of 0 in the JSON
    let engine = zero_rating();
    let text = check(Path::new(RULES), &engine, "text");
    assert_eq!(text.code, 3, "{}{}", text.stdout, text.stderr);
    assert!(!text.stdout.contains("NOT CHECKED ·"), "{}", text.stdout);
    assert!(
        text.stdout.contains(
            "airflow_at needs a positive rated pressure drop (the orifice law, flow ∝ √(pressure \
             drop); common practice, no source); carburetor.rated_at 0 inHg gives a rated \
             pressure drop of 0 inHg"
        ),
        "{}",
        text.stdout
    );
    let doc = json(&check(Path::new(RULES), &engine, "json"));
    let airflow = rule(&doc, "4.3");
    assert_eq!(airflow["verdict"], "not_checked");
    assert_eq!(airflow["finding"], Value::Null);
    assert_eq!(airflow["numeric"], Value::Null);
    for format in ["markdown", "html"] {
        let run = check(Path::new(RULES), &engine, format);
        assert_eq!(run.code, 3);
        assert!(!run.stdout.contains("NOT CHECKED ·"), "{format}");
        assert!(
            run.stdout.contains("needs a positive rated pressure drop"),
            "{format}"
        );
    }
}

/// A small rulebook whose rules divide, take a root and raise a power of measured values.
const ARITHMETIC: &str = r#"series "Brackenfold Oval Club"
edition "2027" effective 2027-04-01
decision guarded rejection

measure car.weight: mass "Club scale"
measure ballast: mass range -500 lb to 500 lb "Ballast, negative when taken off"
measure lean: ratio range -1 to 1 "Lean of the car"

define per_ballast = car.weight / ballast
define ballast_root = sqrt(ballast * 1 lb)
define lean_root = lean ^ 0.5

class hobby "Hobby Stock"
  rule 1.1 "Weight per ballast"
    require per_ballast <= 40
  end
  rule 1.2 "Ballast root"
    require ballast_root <= 20 lb
  end
  rule 1.3 "Lean"
    require lean_root <= 0.5
  end
  rule 1.4 "Weight with heavy ballast"
    when per_ballast < 10
    require car.weight >= 2800 lb
  end
end
"#;

fn arithmetic(ballast: &str, lean: &str) -> Value {
    let rules = temp("arithmetic.rules", ARITHMETIC);
    let engine = temp(
        &format!("arithmetic-{ballast}-{lean}.yaml").replace(' ', "_"),
        &format!(
            "class: hobby\nmeasurements:\n  car.weight: \"3000 lb\"\n  ballast: \"{ballast}\"\n  lean: {lean}\n"
        ),
    );
    let run = check(&rules, &engine, "json");
    assert!([0, 1, 3].contains(&run.code), "{}", run.stderr);
    json(&run)
}

fn reason(doc: &Value, section: &str) -> String {
    rule(doc, section)["outside_domain"][0]["reason"]
        .as_str()
        .unwrap_or_default()
        .to_string()
}

#[test]
fn division_by_zero_roots_of_negatives_and_fractional_powers_are_not_computed() {
    // arithmetic, no source needed: x / 0, √(−x) and (−x)^0.5 have no real value
    let doc = arithmetic("0 lb", "0.25");
    assert_eq!(rule(&doc, "1.1")["verdict"], "not_checked");
    assert_eq!(
        reason(&doc, "1.1"),
        "/ needs a divisor other than zero; ballast 0 lb gives a divisor of 0 lb"
    );
    // the condition of 1.4 cannot be computed either: the rule is not checked, as with a
    // missing measurement, rather than held uncertain
    assert_eq!(rule(&doc, "1.4")["verdict"], "not_checked");
    assert_eq!(rule(&doc, "1.4")["applies"], "not_computed");
    // the root of 0 lb² is 0 lb, at the edge of its domain; its sensitivity there has no
    // bound, but a ballast of exactly 0 lb has no uncertainty to propagate: 0 lb, u = 0
    // (an uncertain ballast at 0 is not checked: tests/edges.rs)
    assert_eq!(rule(&doc, "1.2")["verdict"], "legal");
    assert_eq!(rule(&doc, "1.2")["numeric"]["value"], 0.0);
    assert_eq!(doc["engines"][0]["exit_status"], 3);

    let doc = arithmetic("-10 lb", "-0.25");
    assert_eq!(
        rule(&doc, "1.1")["verdict"],
        "legal",
        "3000 / −10 is a number"
    );
    assert_eq!(
        reason(&doc, "1.2"),
        "sqrt needs a value of at least zero; ballast -10 lb gives a value under the root \
         below zero"
    );
    assert_eq!(
        reason(&doc, "1.3"),
        "^ needs a base of at least zero for a power that is not a whole number; lean -0.25 \
         gives a base of -0.25"
    );
    assert_eq!(rule(&doc, "1.3")["finding"], Value::Null);
    assert_eq!(doc["engines"][0]["result"], "not_all_clear");

    let doc = arithmetic("100 lb", "0.25");
    for section in ["1.1", "1.2", "1.3", "1.4"] {
        assert_ne!(rule(&doc, section)["verdict"], "not_checked", "{section}");
    }
}

fn check_schema() -> jsonschema::Validator {
    let path = format!("{}/schemas/check.schema.json", env!("CARGO_MANIFEST_DIR"));
    let schema: Value = serde_json::from_str(&read("schemas/check.schema.json"))
        .unwrap_or_else(|e| panic!("{path}: {e}"));
    jsonschema::validator_for(&schema).unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// Every demo engine, the sign slip and the zero rating, checked under each decision rule.
fn every_output() -> Vec<Value> {
    let mut docs = Vec::new();
    let demo: Vec<String> = common::files_under("engines-demo", ".yaml")
        .iter()
        .map(|p| p.to_string_lossy().into_owned())
        .collect();
    let wide = wide_dome_rulebook().to_string_lossy().into_owned();
    let slip = sign_slip().to_string_lossy().into_owned();
    let zero = zero_rating().to_string_lossy().into_owned();
    for role in ["inspector", "builder", "simple"] {
        let mut args = vec!["check", "--rules", RULES, "--as", role, "--format", "json"];
        args.extend(demo.iter().map(String::as_str));
        args.push(&zero);
        let run = common::gonogo(&args);
        docs.push(json(&run));
        let run = common::gonogo(&[
            "check", "--rules", &wide, "--as", role, "--format", "json", &slip,
        ]);
        docs.push(json(&run));
    }
    docs
}

#[test]
fn no_rule_not_checked_carries_a_finding_or_a_probability() {
    // issue 9: a rule that could not be computed said `finding: "fail"` and
    // `probability_of_conformance: 0.0`. The demo engines (limited2-missing-deck.yaml has two
    // rules not checked for missing measurements) and the two declarations outside a domain.
    let validator = check_schema();
    let mut not_checked = 0;
    for doc in every_output() {
        let errors: Vec<String> = validator.iter_errors(&doc).map(|e| e.to_string()).collect();
        assert!(errors.is_empty(), "{errors:?}");
        for engine in doc["engines"].as_array().into_iter().flatten() {
            for r in engine["rules"].as_array().into_iter().flatten() {
                if r["verdict"] != "not_checked" {
                    continue;
                }
                not_checked += 1;
                let what = format!("{} {}", engine["file"], r["section"]);
                assert_eq!(r["finding"], Value::Null, "{what}");
                assert_eq!(r["numeric"], Value::Null, "{what}");
                assert_eq!(r["observed"], Value::Null, "{what}");
                let why = r["missing"].as_array().is_some_and(|m| !m.is_empty())
                    || r["outside_domain"].is_array()
                    || r["internal_error"].is_string();
                assert!(why, "{what} says why it is not checked");
            }
        }
    }
    // rules on an absent optional measurement are not applicable, not "not checked"
    assert!(not_checked >= 9, "{not_checked} rules not checked");
}

#[test]
fn the_check_schema_refuses_a_finding_on_a_rule_not_checked() {
    let validator = check_schema();
    let doc = json(&check(Path::new(RULES), &zero_rating(), "json"));
    assert!(validator.is_valid(&doc));
    let at = doc["engines"][0]["rules"]
        .as_array()
        .and_then(|rules| rules.iter().position(|r| r["verdict"] == "not_checked"))
        .unwrap_or_else(|| panic!("no rule not checked"));
    let spoiled = |doc: &Value, key: &str, value: Value| {
        let mut spoiled = doc.clone();
        spoiled["engines"][0]["rules"][at][key] = value;
        spoiled
    };
    let fail = spoiled(&doc, "finding", json!("fail"));
    assert!(
        !validator.is_valid(&fail),
        "a finding on a rule not checked"
    );
    let numbers = json!({
        "unit": "cfm", "value": null, "limit": 500.0, "range": null, "margin": null,
        "expanded_uncertainty": null, "coverage_factor": 2.0,
        "probability_of_conformance": 0.0, "cylinder": null
    });
    let probability = spoiled(&doc, "numeric", numbers);
    assert!(
        !validator.is_valid(&probability),
        "a probability on a rule not checked"
    );
    let silent = spoiled(&doc, "outside_domain", Value::Null);
    assert!(
        !validator.is_valid(&silent),
        "not computed without a reason"
    );
    let legal = spoiled(&doc, "verdict", json!("legal"));
    assert!(!validator.is_valid(&legal), "legal without a finding");
}
