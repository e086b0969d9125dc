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
