//! `gonogo headroom`: every demo engine answers, every confirmed move reproduces its rule's
//! limit to 1e-9 relative, and two engines' reports are snapshotted.

mod common;

use std::path::Path;

use gonogo::analyze::headroom::{Move, headroom as compute};
use gonogo::commands::headroom;
use gonogo::commands::load_rulebook;
use gonogo::load::load_declaration;
use gonogo::report::headroom::HeadroomFormat;
use gonogo::source::SourceMap;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

#[test]
fn every_confirmed_move_lands_on_the_limit() {
    let loaded = load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut confirmed = 0;
    for path in common::files_under("engines-demo", ".yaml") {
        let mut sources = SourceMap::default();
        let d =
            load_declaration(&path, &rulebook, &mut sources).unwrap_or_else(|p| panic!("{p:?}"));
        let class = d
            .identity
            .class
            .as_deref()
            .and_then(|c| rulebook.class(c))
            .unwrap_or_else(|| panic!("class"));
        let rules = compute(&rulebook, class, &d, None).rules;
        assert!(!rules.is_empty(), "{}: no numeric rule", path.display());
        for r in &rules {
            for m in &r.moves {
                let (Some(_), Some(l)) = (m.limit.confirmed, m.limit.landed) else {
                    continue;
                };
                let (v, limit) = (l.value, l.limit);
                assert!(
                    ((v - limit) / limit).abs() <= 1e-9,
                    "{} {}: {v} against limit {limit}",
                    path.display(),
                    r.rule.rule.section.text
                );
                confirmed += 1;
            }
        }
    }
    assert!(confirmed > 100, "only {confirmed} moves confirmed");
}

#[test]
fn the_displacement_move_is_found_where_the_formula_is_not_linear() {
    // displacement grows with the square of the bore, so the linear estimate overshoots or
    // falls short and re-evaluation must refine it: check against the closed form instead.
    // max bore b, stroke s, 8 cylinders: b' = √(365 ci / (π/4 · s · 8))
    let loaded = load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut sources = SourceMap::default();
    let d = load_declaration(
        Path::new("engines-demo/limited2-close-bore.yaml"),
        &rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    let class = rulebook
        .class("limited2")
        .unwrap_or_else(|| panic!("class"));
    let rules = compute(&rulebook, class, &d, None).rules;
    let displacement = rules
        .iter()
        .find(|r| r.rule.rule.section.text == "3.1")
        .unwrap_or_else(|| panic!("3.1"));
    let bore = displacement
        .moves
        .iter()
        .find(|m| !m.every_cylinder() && d.inputs[m.input as usize].label(&rulebook) == "bore[5]")
        .unwrap_or_else(|| panic!("bore[5] moves"));
    let at = bore.input as usize;
    let inch: f64 = 0.0254; // NIST SP 811 B.8
    let stroke = 3.480 * inch;
    let target = (365.0 * inch.powi(3) / (std::f64::consts::PI / 4.0 * stroke * 8.0)).sqrt();
    let moved = d.inputs[at].value + bore.limit.confirmed.unwrap_or(f64::NAN);
    assert!(
        ((moved - target) / target).abs() < 1e-9,
        "{moved} against {target}"
    );
    assert!(
        (bore.limit.estimate - bore.limit.confirmed.unwrap_or_default()).abs() > 1e-7,
        "the estimate was already exact, so the test shows nothing"
    );
}

#[test]
fn reports_of_two_engines() {
    for (name, file) in [
        ("close_bore", "engines-demo/limited2-close-bore.yaml"),
        ("stroker", "engines-demo/open4-stroker.yaml"),
    ] {
        let text = headroom::run(
            Path::new(RULES),
            None,
            None,
            &[file.into()],
            HeadroomFormat::Text,
        )
        .unwrap_or_else(|e| panic!("{e}"));
        insta::assert_snapshot!(name, text);
    }
    let json = headroom::run(
        Path::new(RULES),
        None,
        None,
        &["engines-demo/open4-stroker.yaml".into()],
        HeadroomFormat::Json,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["schema"], "gonogo.headroom/1");
}

#[test]
fn a_limit_written_first_has_the_same_headroom() {
    // the demo edition with two limits written the other way round, beside the original so
    // that its include resolves
    let text = std::fs::read_to_string(RULES).unwrap_or_else(|e| panic!("{e}"));
    let reversed = text
        .replace(
            "require bore <= 4.030 in allowing 0.005 in",
            "require 4.030 in >= bore allowing 0.005 in",
        )
        .replace(
            "require scale_weight >= 3000 lb",
            "require 3000 lb <= scale_weight",
        );
    assert_ne!(reversed, text, "the demo rules to reverse are not there");
    let path =
        Path::new("rulebooks-demo").join(format!(".limit-first-{}.rules", std::process::id()));
    std::fs::write(&path, reversed).unwrap_or_else(|e| panic!("{e}"));
    let run = |rules: &Path| {
        headroom::run(
            rules,
            None,
            None,
            &["engines-demo/limited2-close-bore.yaml".into()],
            HeadroomFormat::Text,
        )
    };
    let limit_first = run(&path);
    let _ = std::fs::remove_file(&path);
    let limit_first = limit_first.unwrap_or_else(|e| panic!("{e}"));
    let original = run(Path::new(RULES)).unwrap_or_else(|e| panic!("{e}"));
    assert!(original.contains("3.2 "), "{original}");
    assert_eq!(limit_first, original);
}

/// The headroom of one input of one rule of a demo engine, with the input's value.
fn move_of(file: &str, class: &str, section: &str, label: &str) -> (Move, f64) {
    let loaded = load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut sources = SourceMap::default();
    let d = load_declaration(Path::new(file), &rulebook, &mut sources)
        .unwrap_or_else(|p| panic!("{p:?}"));
    let class = rulebook.class(class).unwrap_or_else(|| panic!("class"));
    let rules = compute(&rulebook, class, &d, None).rules;
    let rule = rules
        .iter()
        .find(|r| r.rule.rule.section.text == section)
        .unwrap_or_else(|| panic!("{section}"));
    let m = rule
        .moves
        .iter()
        .find(|m| !m.every_cylinder() && d.inputs[m.input as usize].label(&rulebook) == label)
        .unwrap_or_else(|| panic!("{label} moves"));
    (m.clone(), d.inputs[m.input as usize].value)
}

#[test]
fn a_move_whose_first_estimate_leaves_the_domain_is_still_found_inside_it() {
    // the stroker's gasket may thin to 0.00277 in before its compression ratio reaches 10.0;
    // the first-order estimate overshoots below zero thickness, where compression_ratio is not
    // defined, and headroom said the limit was not reached at all
    let (m, value) = move_of(
        "engines-demo/open4-stroker.yaml",
        "open4",
        "3.4",
        "gasket.thickness",
    );
    assert!(
        value + m.limit.estimate < 0.0,
        "the estimate stays inside the domain: no test"
    );
    let moved = value + m.limit.confirmed.unwrap_or_else(|| panic!("no move found"));
    assert!(moved > 0.0 && moved < value, "{moved}");
    let l = m
        .limit
        .landed
        .unwrap_or_else(|| panic!("no value at the limit"));
    let (v, limit) = (l.value, l.limit);
    assert!(((v - limit) / limit).abs() <= 1e-9, "{v} against {limit}");
    assert_eq!(m.limit.domain_ends, None);
}

#[test]
fn a_limit_beyond_the_domain_is_reported_where_the_domain_ends() {
    // the close bore's gasket would have to be thinner than nothing to reach the limit: it may
    // fall to exactly 0 in, where compression_ratio's domain ends, without reaching it
    let (m, value) = move_of(
        "engines-demo/limited2-close-bore.yaml",
        "limited2",
        "3.4",
        "gasket.thickness",
    );
    assert_eq!(m.limit.confirmed, None);
    assert_eq!(m.limit.domain_ends, Some(-value));
    let text = headroom::run(
        Path::new(RULES),
        None,
        None,
        &["engines-demo/limited2-close-bore.yaml".into()],
        HeadroomFormat::Text,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    assert!(
        text.contains(
            "gasket.thickness alone — limit: may fall 0.041 in, to 0 in, where the formula's \
             domain ends, without reaching the limit"
        ),
        "{text}"
    );
}

#[test]
fn every_bore_of_the_stroker_moves_to_the_limit_and_to_the_proven_pass_line() {
    // how much less (or more) bore on all eight cylinders together: displacement is taken
    // from the largest bore, V = π/4 · bore² · stroke · cylinders (handbook swept-volume
    // formula, DESIGN.md section 4), so the common move to a volume V is
    // δ = √(V / (π/4 · stroke · 8)) − max bore, solved here by hand; 1 in = 0.0254 m
    // (NIST SP 811 B.8)
    let loaded = load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut sources = SourceMap::default();
    let d = load_declaration(
        Path::new("engines-demo/open4-stroker.yaml"),
        &rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    let class = rulebook.class("open4").unwrap_or_else(|| panic!("class"));
    let rules = compute(&rulebook, class, &d, None).rules;
    let displacement = rules
        .iter()
        .find(|r| r.rule.rule.section.text == "3.1")
        .unwrap_or_else(|| panic!("3.1"));
    let every = displacement
        .moves
        .iter()
        .find(|m| m.every_cylinder())
        .unwrap_or_else(|| panic!("no move of every bore"));
    assert_eq!(every.moved.len(), 8);
    let inch: f64 = 0.0254;
    let max_bore = 4.0306 * inch; // the stroker's largest bore as declared
    let stroke = 3.750 * inch;
    let common =
        |volume: f64| (volume / (std::f64::consts::PI / 4.0 * stroke * 8.0)).sqrt() - max_bore;
    let limit = 372.0 * inch.powi(3);
    let to_limit = every.limit.confirmed.unwrap_or_else(|| panic!("not found"));
    assert!(
        ((to_limit - common(limit)) / max_bore).abs() < 1e-9,
        "{to_limit}"
    );
    // the proven-pass line is U inside the limit, U taken where the move lands
    let pass = every
        .pass
        .as_ref()
        .unwrap_or_else(|| panic!("no pass line"));
    let landed = pass.landed.unwrap_or_else(|| panic!("no landing"));
    let to_pass = pass.confirmed.unwrap_or_else(|| panic!("not found"));
    let by_hand = common(limit - landed.expanded);
    assert!(
        ((to_pass - by_hand) / max_bore).abs() < 1e-9,
        "{to_pass} against {by_hand}"
    );
    assert!(to_pass < to_limit && to_limit < 0.0, "{to_pass} {to_limit}");
    // the eight bores move together: the single bore[4] cannot bring the largest bore down
    let alone = displacement
        .moves
        .iter()
        .find(|m| !m.every_cylinder() && d.inputs[m.input as usize].label(&rulebook) == "bore[4]")
        .unwrap_or_else(|| panic!("bore[4]"));
    assert_eq!(alone.limit.confirmed, None);
}
