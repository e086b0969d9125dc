//! Digits and units as written (issue 9, deliverable 10), through the binary: a reading is
//! shown with the digits and unit it was written with in every format, a derived value with
//! the digits its uncertainty supports (GUM JCGM 100:2008, 7.2.6) and in the unit family its
//! inputs were written in, and JSON keeps every number at full precision.

mod common;

use common::gonogo;

/// A rulebook and a declaration in a scratch folder, removed when dropped.
struct Case {
    dir: std::path::PathBuf,
}

impl Case {
    fn new(name: &str, rules: &str, declaration: &str) -> Case {
        let dir = std::env::temp_dir().join(format!("gonogo-digits-{}-{name}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
        std::fs::write(dir.join("r.rules"), rules).unwrap_or_else(|e| panic!("{e}"));
        std::fs::write(dir.join("d.yaml"), declaration).unwrap_or_else(|e| panic!("{e}"));
        Case { dir }
    }

    /// `check` in one format; the text of the report.
    fn check(&self, format: &str) -> String {
        let rules = self.dir.join("r.rules");
        let declaration = self.dir.join("d.yaml");
        let run = gonogo(&[
            "check",
            "--rules",
            rules.to_str().unwrap_or_default(),
            "--format",
            format,
            declaration.to_str().unwrap_or_default(),
        ]);
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

/// An inch rulebook: a header tube limit on a reading, and a rulebook literal certified to
/// six decimals (a reference plate from its calibration certificate).
const INCH_RULES: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2027" effective 2027-03-06
decision guarded rejection

measure header.primary_od: length "Caliper"
measure plate.gap: length "Feeler gauge"
measure rocker.ratio: ratio range 1.2 to 2.0 "Stamped on the rocker arm"

define plate_check = plate.gap + 50.000623 mm ± 0.000040 mm (k = 2)

class street_stock "Street Stock"
  rule 6.1 "Header primary tubes"
    require header.primary_od <= 1-3/4 in
  end
  rule 6.2 "Plate"
    require plate_check <= 2 in
  end
  rule 6.3 "Rocker ratio"
    require rocker.ratio <= 1.8
  end
  rule 6.4 "Plate gap"
    require plate.gap <= 0.030 in allowing 0.0050 in
  end
end
"#;

fn inch_declaration(primary: &str) -> String {
    format!(
        r#"engine: "TV-27-101"
class: street_stock
date: "2027-05-22"
measurements:
  plate.gap: "0.0100 in"
  rocker.ratio: 1.622999999
components:
  header:
    primary_od: "{primary}"
"#
    )
}

/// The lines of the text report that start with `label` (after the indent).
fn lines<'t>(text: &'t str, label: &str) -> Vec<&'t str> {
    text.lines()
        .map(str::trim_start)
        .filter(|l| l.starts_with(label))
        .collect()
}

#[test]
fn a_reading_written_with_nine_decimals_is_shown_with_nine_in_every_format() {
    let case = Case::new("nine", INCH_RULES, &inch_declaration("1.622999999 in"));
    let text = case.check("text");
    assert!(
        lines(&text, "value").contains(&"value      1.622999999 in"),
        "{text}"
    );
    for format in ["markdown", "html"] {
        let out = case.check(format);
        assert!(
            out.matches("1.622999999 in").count() >= 2,
            "{format}: the value and the trace\n{out}"
        );
        assert!(!out.contains("1.623 in"), "{format}\n{out}");
    }
    // the margin is given to the reading's nine decimals: 1.75 − 1.622999999 = 0.127000001
    assert!(text.contains("margin     0.127000001 in inside"), "{text}");
}

#[test]
fn a_bare_yaml_number_keeps_every_digit_it_was_written_with() {
    let case = Case::new("bare", INCH_RULES, &inch_declaration("1.625 in"));
    let text = case.check("text");
    assert!(
        text.contains("rocker.ratio = 1.622999999  no uncertainty stated"),
        "{text}"
    );
    assert!(text.contains("value      1.622999999\n"), "{text}");
}

#[test]
fn trailing_zeros_written_to_show_the_resolution_are_kept() {
    let case = Case::new("zeros", INCH_RULES, &inch_declaration("1.6200 in"));
    let text = case.check("text");
    assert!(
        lines(&text, "value").contains(&"value      1.6200 in"),
        "{text}"
    );
    assert!(
        text.contains("header.primary_od = 1.6200 in  no uncertainty stated"),
        "{text}"
    );
}

#[test]
fn a_certified_value_is_shown_with_all_its_digits() {
    let case = Case::new("certificate", INCH_RULES, &inch_declaration("1.625 in"));
    let text = case.check("text");
    // the rulebook literal in the trace, as the certificate gives it
    assert!(
        text.contains("= 50.000623 mm  u 0.000020 mm (rulebook)"),
        "{text}"
    );
    assert!(!text.contains("50.0006 mm"), "{text}");
    // a declaration reading with a stated uncertainty, in the value line and the trace
    let reading = Case::new(
        "certified-reading",
        INCH_RULES,
        &inch_declaration("50.000623 mm ± 0.000040 mm (k = 2)"),
    );
    let text = reading.check("text");
    let value = lines(&text, "value");
    assert!(
        value
            .first()
            .is_some_and(|v| v.starts_with("value      50.000623 mm (")),
        "{text}"
    );
    assert!(!text.contains("50.0006 mm"), "{text}");
}

#[test]
fn a_derived_value_has_the_digits_its_uncertainty_supports() {
    let case = Case::new("derived", INCH_RULES, &inch_declaration("1.625 in"));
    let text = case.check("text");
    // 0.0100 in + 50.000623 mm = 1.978528464… in; u = 0.000020 mm = 0.00000079 in
    // (1 in = 25.4 mm exactly, NIST SP 811 B.8): two significant digits of u end at the
    // eighth decimal, so the value is given to eight (GUM 7.2.6)
    assert!(text.contains("= 1.97852846 in (u 0.00000079 in)"), "{text}");
}

/// A metric rulebook: every unit it writes is metric.
const METRIC_RULES: &str = r#"series "Tamsin Valley Stock Car Club"
edition "2028" effective 2028-03-04
decision guarded rejection

measure cylinders: count range 4 to 8 "Count the cylinders"
measure bore: length per cylinder range 90 mm to 110 mm "Bore gauge"
measure stroke: length range 60 mm to 110 mm "Dial indicator"
measure deck.height: length "Depth gauge, block on the bench"

define swept = displacement(bore: max(bore), stroke: stroke, cylinders: cylinders)
define bore_spread = max(bore) - min(bore)

class metric_stock "Metric Stock"
  rule 3.1 "Displacement"
    require swept <= 5.9 L
  end
  rule 3.2 "Bores alike"
    require bore_spread <= 0.05 mm
  end
  rule 3.3 "Deck height"
    require deck.height >= 200 mm
  end
end
"#;

fn metric_declaration(stroke: &str) -> String {
    format!(
        r#"engine: "TV-28-014"
class: metric_stock
date: "2028-05-20"
instruments:
  bore_gauge: {{uncertainty: "0.004 mm", k: 2}}
measurements:
  cylinders: 4
  bore:
    values: ["101.60 mm", "101.61 mm", "101.62 mm", "101.60 mm"]
    instrument: bore_gauge
  stroke: "{stroke}"
  deck.height: "228.60 mm"
"#
    )
}

#[test]
fn a_metric_rulebook_with_metric_readings_sees_metric_derived_values() {
    let case = Case::new("metric", METRIC_RULES, &metric_declaration("88.90 mm"));
    let text = case.check("text");
    let derived: Vec<&str> = text
        .lines()
        .map(str::trim_start)
        .filter(|l| l.starts_with("= "))
        .collect();
    assert_eq!(derived.len(), 2, "{text}");
    assert!(text.contains("value      228.60 mm"), "{text}");
    assert!(derived[0].ends_with(" cc)"), "displacement in cc: {text}");
    assert!(derived[1].ends_with(" mm)"), "bore spread in mm: {text}");
    assert!(!text.contains(" ci") && !text.contains(" in)"), "{text}");
}

#[test]
fn mixed_families_show_a_derived_value_in_its_limits_unit() {
    let case = Case::new("mixed", METRIC_RULES, &metric_declaration("3.500 in"));
    let text = case.check("text");
    let derived: Vec<&str> = text
        .lines()
        .map(str::trim_start)
        .filter(|l| l.starts_with("= "))
        .collect();
    assert!(
        derived.first().is_some_and(|d| d.ends_with(" L)")),
        "displacement in the limit's litres: {text}"
    );
}

#[test]
fn json_keeps_full_precision_and_the_written_text() {
    let case = Case::new("json", INCH_RULES, &inch_declaration("1.622999999 in"));
    let json = case.check("json");
    let doc: serde_json::Value =
        serde_json::from_str(&json).unwrap_or_else(|e| panic!("{e}\n{json}"));
    let engine = &doc["engines"][0];
    let primary = engine["inputs"]
        .as_array()
        .and_then(|a| a.iter().find(|i| i["label"] == "header.primary_od"))
        .unwrap_or_else(|| panic!("{json}"));
    assert_eq!(primary["written"], "1.622999999 in");
    assert_eq!(primary["value"].as_f64(), Some(1.622999999));
    let numeric = &engine["rules"][0]["numeric"];
    assert_eq!(numeric["value"].as_f64(), Some(1.622999999));
    // 1.75 − 1.622999999, unrounded
    let margin = numeric["margin"].as_f64().unwrap_or(f64::NAN);
    assert!((margin - 0.127_000_001).abs() < 1e-12, "{margin}");
}

#[test]
fn a_metric_rulebooks_sheet_asks_for_metric_readings() {
    let case = Case::new("sheet", METRIC_RULES, &metric_declaration("88.90 mm"));
    let rules = case.dir.join("r.rules");
    let run = gonogo(&[
        "sheet",
        "--rules",
        rules.to_str().unwrap_or_default(),
        "--class",
        "metric_stock",
        "--format",
        "yaml",
    ]);
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
    // deck.height has no range of its own: the rulebook's other ranges are all in mm
    assert!(
        run.stdout.contains("# length in mm — Depth gauge"),
        "{}",
        run.stdout
    );
}

#[test]
fn explain_sums_a_limit_and_its_allowance_to_the_finer_place_written() {
    let case = Case::new("explain", INCH_RULES, &inch_declaration("1.625 in"));
    let rules = case.dir.join("r.rules");
    let run = gonogo(&[
        "explain",
        "--rules",
        rules.to_str().unwrap_or_default(),
        "6.4",
    ]);
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
    // 0.030 in + 0.0050 in, to the ten-thousandths the allowance is written to
    assert!(
        run.stdout.contains("(so at most 0.0350 in)"),
        "{}",
        run.stdout
    );
}
