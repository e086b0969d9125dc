//! `gonogo sweep`: the street-stock compression limit swept over 9.0–10.0 on a field generated
//! in a temporary folder (the legal demo engine with its chambers milled step by step). The
//! counts at today's limit are checked against `gonogo check` of the same field, run apart,
//! and the HTML picture is read back for what it must draw.

mod common;

use common::{OrPanic, gonogo};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

/// Eight street-stock engines, chambers of 58.0 cc to 69.2 cc on every cylinder: compression
/// ratios from about 10.0 down to about 9.0 (worked out by hand from the demo's bore and
/// stroke, swept volume about 727 cc; "from memory" that the ratio is (V_s + V_c) / V_c).
fn field() -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("gonogo-{}-sweep-field", std::process::id()));
    std::fs::create_dir_all(&dir).or_panic("sweep test");
    let legal =
        std::fs::read_to_string("engines-demo/street-stock-legal.yaml").or_panic("sweep test");
    let chambers = "[\"76.2 cc\", \"76.0 cc\", \"76.4 cc\", \"76.1 cc\", \"76.3 cc\", \"76.2 cc\", \"76.0 cc\", \"76.1 cc\"]";
    assert!(legal.contains(chambers), "the demo engine's chambers moved");
    for i in 0..8 {
        let cc = format!("\"{:.1} cc\"", 58.0 + 1.6 * f64::from(i));
        let text = legal
            .replace(chambers, &format!("[{}]", vec![cc; 8].join(", ")))
            .replace(
                "engine: \"TV-27-003\"",
                &format!("engine: \"TV-SW-{i:02}\""),
            );
        std::fs::write(dir.join(format!("e{i}.yaml")), text).or_panic("sweep test");
    }
    dir
}

fn sweep(dir: &str, format: &str) -> String {
    let run = gonogo(&[
        "sweep",
        "--rules",
        RULES,
        "--class",
        "street_stock",
        "--rule",
        "3.3",
        "--from",
        "9.0",
        "--to",
        "10.0",
        "--keep",
        "50",
        "--format",
        format,
        dir,
    ]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    run.stdout
}

#[test]
fn a_sweep_of_the_compression_limit_counts_and_draws_the_field() {
    let dir = field();
    let path = dir.to_str().unwrap_or_default();
    let doc: serde_json::Value = serde_json::from_str(&sweep(path, "json")).or_panic("sweep test");
    let candidates = doc["candidates"].as_array().cloned().unwrap_or_default();
    assert_eq!(candidates.len(), 11);
    // at today's 9.5 the sweep must agree with `check` of the same field, rule by rule
    let check = gonogo(&["check", "--rules", RULES, "--format", "json", path]);
    let checked: serde_json::Value = serde_json::from_str(&check.stdout).or_panic("sweep test");
    let illegal_by_check = checked["engines"]
        .as_array()
        .cloned()
        .unwrap_or_default()
        .iter()
        .filter(|e| {
            e["rules"].as_array().is_some_and(|rules| {
                rules
                    .iter()
                    .any(|r| r["section"] == "3.3" && r["verdict"] == "illegal")
            })
        })
        .count();
    let today = candidates
        .iter()
        .find(|c| (c["limit"].as_f64().unwrap_or_default() - 9.5).abs() < 1e-9)
        .cloned()
        .unwrap_or_default();
    assert_eq!(today["illegal"].as_u64(), Some(illegal_by_check as u64));
    assert!(
        illegal_by_check > 0 && illegal_by_check < 8,
        "{illegal_by_check}"
    );
    // a looser limit never makes more engines illegal
    let illegal: Vec<u64> = candidates
        .iter()
        .map(|c| c["illegal"].as_u64().unwrap_or_default())
        .collect();
    assert!(illegal.windows(2).all(|w| w[1] <= w[0]), "{illegal:?}");
    // guarded rejection (ILAC-G8:09/2019 4.2.2, ISO 14253-1): illegal only when the value is
    // over the limit by more than U; conditional when within U of it either way
    let engines = doc["engines"].as_array().cloned().unwrap_or_default();
    let vu: Vec<(f64, f64)> = engines
        .iter()
        .map(|e| {
            (
                e["value"].as_f64().unwrap_or_default(),
                e["expanded"].as_f64().unwrap_or_default(),
            )
        })
        .collect();
    for c in &candidates {
        let limit = c["limit"].as_f64().unwrap_or_default();
        let over = vu.iter().filter(|(v, u)| v - limit > *u).count() as u64;
        let close = vu.iter().filter(|(v, u)| (v - limit).abs() < *u).count() as u64;
        assert_eq!(c["illegal"].as_u64(), Some(over), "{c}");
        assert_eq!(c["conditional"].as_u64(), Some(close), "{c}");
        assert_eq!(c["legal"].as_u64(), Some(8 - over), "{c}");
    }
    assert_eq!(
        illegal.last(),
        Some(&0),
        "every engine is under 10.0 or within U of it"
    );
    assert!(
        illegal[0] >= 5,
        "most of the field is over 9.0: {illegal:?}"
    );
    let html = sweep(path, "html");
    assert!(html.contains("<svg"), "{html}");
    assert_eq!(html.matches("<g class=\"engine\">").count(), 8);
    assert_eq!(html.matches("class=\"candidate\"").count(), 11);
    assert_eq!(html.matches("class=\"today\"").count(), 1);
    assert_eq!(html.matches("class=\"chosen\"").count(), 1);
    assert!(!html.contains("<script") && !html.contains("http://www.w3.org/1999"));
    let text = sweep(path, "text");
    assert!(
        text.contains("the tightest candidate keeping 50 % legal:"),
        "{text}"
    );
    let _ = std::fs::remove_dir_all(&dir);
}

#[test]
fn a_rule_the_class_does_not_have_is_refused() {
    let run = gonogo(&[
        "sweep",
        "--rules",
        RULES,
        "--class",
        "street_stock",
        "--rule",
        "9.9",
        "--from",
        "9",
        "--to",
        "10",
        "engines-demo",
    ]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("A06 sweep-unknown-rule"),
        "{}",
        run.stderr
    );
    let run = gonogo(&[
        "sweep",
        "--rules",
        RULES,
        "--class",
        "street_stock",
        "--rule",
        "3.3",
        "--from",
        "10",
        "--to",
        "9",
        "engines-demo",
    ]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("A08 sweep-bad-range"), "{}", run.stderr);
}
