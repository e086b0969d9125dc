//! Every JSON document gonogo writes validates against its committed JSON Schema in
//! `schemas/`: `check` on every demo engine (under each decision rule), `diff` and `impact`
//! on the demo editions, `lint` on the demo and on every malformed rulebook, `headroom` on a
//! few engines. The schemas are strict enough to refuse a wrong shape, which is tested too.

mod common;

use serde_json::{Value, json};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const NEXT: &str = "rulebooks-demo/tamsin-2028.rules";

fn schema(name: &str) -> jsonschema::Validator {
    let path = format!("{}/schemas/{name}.schema.json", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
    let schema: Value = serde_json::from_str(&text).unwrap_or_else(|e| panic!("{path}: {e}"));
    jsonschema::meta::validate(&schema).unwrap_or_else(|e| panic!("{path} is no JSON Schema: {e}"));
    jsonschema::options()
        .should_validate_formats(true)
        .build(&schema)
        .unwrap_or_else(|e| panic!("{path}: {e}"))
}

/// The errors of `doc` against the schema, one a line; empty when it validates.
fn errors(validator: &jsonschema::Validator, doc: &Value) -> String {
    validator
        .iter_errors(doc)
        .map(|e| format!("{}: {e}\n", e.instance_path()))
        .collect()
}

/// Runs gonogo, expecting one of `codes`, and parses its standard output.
fn document(args: &[&str], codes: &[i32]) -> Value {
    let run = common::gonogo(args);
    assert!(
        codes.contains(&run.code),
        "gonogo {args:?} exited {}: {}",
        run.code,
        run.stderr
    );
    serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("gonogo {args:?}: {e}"))
}

fn assert_valid(name: &str, doc: &Value) {
    let found = errors(&schema(name), doc);
    assert!(
        found.is_empty(),
        "{name}: the output does not fit its schema:\n{found}"
    );
}

fn demo_engines() -> Vec<String> {
    common::files_under("engines-demo", ".yaml")
        .iter()
        .map(|p| {
            p.strip_prefix(env!("CARGO_MANIFEST_DIR"))
                .unwrap_or(p)
                .to_string_lossy()
                .trim_start_matches('/')
                .to_string()
        })
        .collect()
}

fn check_document(role: &str) -> Value {
    let engines = demo_engines();
    let mut args = vec!["check", "--rules", RULES, "--as", role, "--format", "json"];
    args.extend(engines.iter().map(String::as_str));
    let doc = document(&args, &[0, 1, 3]);
    assert_eq!(
        doc["engines"].as_array().map(Vec::len),
        Some(engines.len()),
        "every demo engine is in the document"
    );
    doc
}

#[test]
fn check_reports_of_every_demo_engine_fit_their_schema() {
    for role in ["inspector", "builder", "simple"] {
        assert_valid("check", &check_document(role));
    }
}

#[test]
fn a_check_report_refers_only_to_inputs_and_derived_values_it_lists() {
    let doc = check_document("inspector");
    for engine in doc["engines"].as_array().into_iter().flatten() {
        let count = |key: &str| engine[key].as_array().map_or(0, Vec::len) as u64;
        for (key, list) in [
            ("inputs", "inputs"),
            ("derived", "derived"),
            ("gauges", "gauges"),
        ] {
            for (at, entry) in engine[list].as_array().into_iter().flatten().enumerate() {
                assert_eq!(entry["id"], at, "{key} ids are their positions");
            }
        }
        for rule in engine["rules"].as_array().into_iter().flatten() {
            for entry in rule["trace"].as_array().into_iter().flatten() {
                if let Some(id) = entry["input"].as_u64() {
                    assert!(id < count("inputs"), "{entry} names no input");
                }
                if let Some(id) = entry["derived"].as_u64() {
                    assert!(id < count("derived"), "{entry} names no derived value");
                }
                if let Some(id) = entry["gauge"].as_u64() {
                    assert!(id < count("gauges"), "{entry} names no gauge result");
                }
            }
            let sides = rule["gauge"]["sides"].as_array().into_iter().flatten();
            for id in sides.filter_map(|s| s["decided_by"].as_u64()) {
                assert!(
                    id < count("gauges"),
                    "{rule} decided by no listed gauge result"
                );
            }
        }
    }
}

/// A change that breaks a document's shape.
type Spoil = fn(&mut Value);

#[test]
fn the_check_schema_refuses_a_wrong_shape() {
    let validator = schema("check");
    let good = check_document("inspector");
    assert!(errors(&validator, &good).is_empty());
    let wrong: [(&str, Spoil); 7] = [
        ("a verdict outside the enum", |d| {
            d["engines"][0]["rules"][0]["verdict"] = json!("maybe")
        }),
        ("a rule without its verdict", |d| {
            if let Some(rule) = d["engines"][0]["rules"][0].as_object_mut() {
                rule.remove("verdict");
            }
        }),
        ("an unknown field", |d| {
            d["engines"][0]["colour"] = json!("red")
        }),
        ("a result outside the enum", |d| {
            d["engines"][0]["result"] = json!("fine")
        }),
        ("an exit status no engine gives", |d| {
            d["engines"][0]["exit_status"] = json!(2)
        }),
        ("a trace entry of no known kind", |d| {
            d["engines"][0]["rules"][0]["trace"] = json!([{"input": 0, "derived": 1}])
        }),
        ("the first schema version", |d| {
            d["schema"] = json!("gonogo.check/1")
        }),
    ];
    for (what, spoil) in wrong {
        let mut doc = good.clone();
        spoil(&mut doc);
        assert!(
            !errors(&validator, &doc).is_empty(),
            "the check schema accepts {what}"
        );
    }
}

#[test]
fn diff_and_impact_of_the_demo_editions_fit_their_schemas() {
    assert_valid(
        "diff",
        &document(&["diff", RULES, NEXT, "--format", "json"], &[0]),
    );
    for class in ["limited2", "open4", "street_stock"] {
        let doc = document(
            &["diff", RULES, NEXT, "--class", class, "--format", "json"],
            &[0],
        );
        assert_valid("diff", &doc);
    }
    let doc = document(
        &["impact", RULES, NEXT, "engines-demo", "--format", "json"],
        &[0, 1, 3],
    );
    assert!(doc["results"].as_array().is_some_and(|r| !r.is_empty()));
    assert_valid("impact", &doc);
}

#[test]
fn lint_of_the_demo_and_of_every_malformed_rulebook_fits_its_schema() {
    assert_valid(
        "lint",
        &document(&["lint", "--format", "json", RULES, NEXT], &[0]),
    );
    let malformed: Vec<String> = common::files_under("tests/malformed", ".rules")
        .iter()
        .map(|p| p.to_string_lossy().into_owned())
        .collect();
    assert!(
        malformed.len() >= 20,
        "only {} malformed rulebooks",
        malformed.len()
    );
    let mut args = vec!["lint", "--format", "json"];
    args.extend(malformed.iter().map(String::as_str));
    let doc = document(&args, &[2]);
    let problems: usize = doc["files"]
        .as_array()
        .into_iter()
        .flatten()
        .map(|f| f["problems"].as_array().map_or(0, Vec::len))
        .sum();
    assert!(
        problems >= malformed.len(),
        "only {problems} problems found"
    );
    assert_valid("lint", &doc);
}

#[test]
fn headroom_of_a_few_engines_fits_its_schema() {
    let doc = document(
        &[
            "headroom",
            "--rules",
            RULES,
            "--format",
            "json",
            "engines-demo/limited2-close-bore.yaml",
            "engines-demo/open4-stroker.yaml",
            "engines-demo/street-stock-light.yaml",
        ],
        &[0, 1, 3],
    );
    assert_eq!(doc["engines"].as_array().map(Vec::len), Some(3));
    assert_valid("headroom", &doc);
}

/// Asserts the schema refuses `good` with `path` set to `bad`, and with an unknown field.
fn assert_refused(name: &str, good: &Value, path: &str, bad: Value) {
    let validator = schema(name);
    let mut spoilt = good.clone();
    let target = spoilt
        .pointer_mut(path)
        .unwrap_or_else(|| panic!("{name}: the demo output has no {path}"));
    *target = bad.clone();
    assert!(
        !errors(&validator, &spoilt).is_empty(),
        "the {name} schema accepts {bad} at {path}"
    );
    let mut extra = good.clone();
    extra["unexpected"] = json!(true);
    assert!(
        !errors(&validator, &extra).is_empty(),
        "the {name} schema accepts an unknown field"
    );
}

#[test]
fn the_other_schemas_refuse_a_wrong_shape() {
    let diff = document(&["diff", RULES, NEXT, "--format", "json"], &[0]);
    assert_refused("diff", &diff, "/rules/0/change", json!("renamed"));
    assert_refused("diff", &diff, "/rules/0/old_limit", json!(["365", null]));
    let impact = document(
        &["impact", RULES, NEXT, "engines-demo", "--format", "json"],
        &[0, 1, 3],
    );
    assert_refused("impact", &impact, "/changed/0/new/verdict", json!("maybe"));
    assert_refused("impact", &impact, "/results/0/3", json!("fine"));
    let lint = document(
        &[
            "lint",
            "--format",
            "json",
            "tests/malformed/bad-pattern.rules",
        ],
        &[1],
    );
    assert_refused(
        "lint",
        &lint,
        "/files/0/problems/0/severity",
        json!("fatal"),
    );
    assert_refused("lint", &lint, "/files/0/problems/0/labels/0/line", json!(0));
    let headroom = document(
        &[
            "headroom",
            "--rules",
            RULES,
            "--format",
            "json",
            "engines-demo/limited2-close-bore.yaml",
        ],
        &[0, 1, 3],
    );
    assert_refused(
        "headroom",
        &headroom,
        "/engines/0/rules/0/finding",
        json!("ok"),
    );
    assert_refused(
        "headroom",
        &headroom,
        "/engines/0/rules/0/moves/0/input",
        json!(3),
    );
}

#[test]
fn every_schema_names_its_document_and_every_writer_has_one() {
    for (name, version) in [
        ("check", "gonogo.check/2"),
        ("lint", "gonogo.lint/1"),
        ("diff", "gonogo.diff/1"),
        ("impact", "gonogo.impact/1"),
        ("headroom", "gonogo.headroom/1"),
    ] {
        let validator = schema(name);
        assert!(
            !errors(&validator, &json!({"schema": version})).is_empty(),
            "{name}: an empty document fits"
        );
        let readme = include_str!("../README.md");
        assert!(
            readme.contains(&format!("schemas/{name}.schema.json")),
            "README.md does not point to schemas/{name}.schema.json"
        );
    }
}
