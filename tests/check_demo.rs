//! `gonogo check` on the demo: a snapshot of the text report of every demo engine, one table of
//! every demo engine's verdicts read from the JSON report, the exit statuses the demo is built
//! to show, and every bad declaration's diagnostic. (Every JSON report is checked against its
//! schema in `schemas.rs`.)

mod common;

use std::path::{Path, PathBuf};

use gonogo::commands::check::{self, CheckFormat, CheckRequest, Role};
use gonogo::diagnostic::RenderStyle;
use gonogo::exit::Exit;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

fn relative(path: &Path) -> PathBuf {
    path.strip_prefix(env!("CARGO_MANIFEST_DIR"))
        .unwrap_or(path)
        .to_path_buf()
}

fn run(
    declaration: &Path,
    format: CheckFormat,
    role: Option<Role>,
) -> Result<(String, Exit), String> {
    let declarations = [relative(declaration)];
    let request = CheckRequest {
        notes: None,
        rules: Path::new(RULES),
        class: None,
        role,
        format,
        declarations: &declarations,
        jobs: None,
        monte_carlo: None,
        produced: "2027-05-11T01:46:40Z".to_string(),
        sort: gonogo::commands::check::CheckSort::File,
        sections: None,
    };
    check::run(&request).map_err(|failure| failure.render(RenderStyle::PLAIN))
}

#[test]
fn every_demo_engine_reports_as_in_its_snapshots() {
    insta::glob!("../engines-demo", "*.yaml", |path| {
        let (text, exit) = run(path, CheckFormat::Text, None)
            .unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        insta::assert_snapshot!("text", format!("exit {}\n{text}", exit as u8));
    });
}

/// The short name of a demo engine: its file name without the class and `.yaml`.
fn short_name(file: &str, class: &str) -> String {
    let stem = Path::new(file)
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let prefix = format!("{}-", class.replace('_', "-"));
    stem.strip_prefix(&prefix).unwrap_or(&stem).to_string()
}

/// A rule's cell in the verdict table: the verdict's mark and the finding's letter.
fn cell(rule: &serde_json::Value) -> String {
    let mark = match (rule["verdict"].as_str(), rule["uncertain"].as_bool()) {
        (Some("legal"), Some(true)) => "~",
        (Some("legal"), Some(false)) => "✓",
        (Some("illegal"), _) => "✗",
        (Some("not_checked"), _) => "?",
        (Some("not_applicable"), _) => "–",
        other => panic!("a verdict outside the schema: {other:?}"),
    };
    let finding = match rule["finding"].as_str() {
        Some("pass") => "P",
        Some("conditional_pass") => "p",
        Some("conditional_fail") => "f",
        Some("fail") => "F",
        Some("open") => "o",
        None => "",
        Some(other) => panic!("a finding outside the schema: {other}"),
    };
    format!("{mark}{finding}")
}

/// One table per class: a row per rule (in rulebook order, bulletin rules last), a column per
/// demo engine, then each engine's result and exit status.
fn verdict_table(engines: &[serde_json::Value]) -> String {
    let mut classes: Vec<&str> = engines.iter().filter_map(|e| e["class"].as_str()).collect();
    classes.dedup();
    let mut out = String::from(
        "✓ legal  ~ legal, not certain  ✗ illegal  ? not checked  – not applicable  · not in force\n\
         P pass  p conditional pass  f conditional fail  F fail  o open (gauge results)\n",
    );
    for class in classes {
        let of_class: Vec<&serde_json::Value> =
            engines.iter().filter(|e| e["class"] == class).collect();
        let mut rows: Vec<(String, String)> = Vec::new();
        for rule in of_class
            .iter()
            .flat_map(|e| e["rules"].as_array().into_iter().flatten())
        {
            let section = rule["section"].as_str().unwrap_or_default().to_string();
            if !rows.iter().any(|(s, _)| *s == section) {
                let title = rule["title"].as_str().unwrap_or_default().to_string();
                rows.push((section, title));
            }
        }
        let mut table: Vec<Vec<String>> = vec![
            std::iter::once(format!("class {class}"))
                .chain(
                    of_class
                        .iter()
                        .map(|e| short_name(e["file"].as_str().unwrap_or_default(), class)),
                )
                .collect(),
        ];
        for (section, title) in &rows {
            let cells = of_class.iter().map(|e| {
                e["rules"]
                    .as_array()
                    .and_then(|rules| rules.iter().find(|r| r["section"] == section.as_str()))
                    .map_or("·".to_string(), cell)
            });
            table.push(
                std::iter::once(format!("{section} {title}"))
                    .chain(cells)
                    .collect(),
            );
        }
        for key in ["result", "exit_status"] {
            let cells = of_class.iter().map(|e| e[key].to_string().replace('"', ""));
            table.push(std::iter::once(key.to_string()).chain(cells).collect());
        }
        out.push('\n');
        out.push_str(&columns(&table));
    }
    out
}

/// Rows of cells in left-aligned columns.
fn columns(table: &[Vec<String>]) -> String {
    let width = |c: usize| {
        table
            .iter()
            .filter_map(|row| row.get(c))
            .map(|cell| cell.chars().count())
            .max()
            .unwrap_or(0)
    };
    let widths: Vec<usize> = (0..table.first().map_or(0, Vec::len)).map(width).collect();
    table
        .iter()
        .map(|row| {
            let cells: Vec<String> = row
                .iter()
                .zip(&widths)
                .map(|(cell, w)| format!("{cell:<w$}"))
                .collect();
            format!("{}\n", cells.join("  ").trim_end())
        })
        .collect()
}

#[test]
fn the_verdicts_of_every_demo_engine() {
    let declarations: Vec<PathBuf> = common::files_under("engines-demo", ".yaml")
        .iter()
        .map(|p| relative(p))
        .collect();
    let request = CheckRequest {
        notes: None,
        rules: Path::new(RULES),
        class: None,
        role: None,
        format: CheckFormat::Json,
        declarations: &declarations,
        jobs: Some(1),
        monte_carlo: None,
        produced: "2027-05-11T01:46:40Z".to_string(),
        sort: gonogo::commands::check::CheckSort::File,
        sections: None,
    };
    let (json, _) =
        check::run(&request).unwrap_or_else(|e| panic!("{}", e.render(RenderStyle::PLAIN)));
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap_or_else(|e| panic!("{e}"));
    let engines = doc["engines"].as_array().cloned().unwrap_or_default();
    assert_eq!(engines.len(), declarations.len());
    insta::assert_snapshot!(verdict_table(&engines));
}

#[test]
fn the_demo_shows_every_exit_status_and_a_disagreement() {
    let mut inspector = Vec::new();
    let mut disagreements = Vec::new();
    for path in common::files_under("engines-demo", ".yaml") {
        let (_, as_inspector) =
            run(&path, CheckFormat::Text, Some(Role::Inspector)).unwrap_or_else(|e| panic!("{e}"));
        let (_, as_builder) =
            run(&path, CheckFormat::Text, Some(Role::Builder)).unwrap_or_else(|e| panic!("{e}"));
        inspector.push(as_inspector);
        if as_inspector != as_builder {
            disagreements.push(path);
        }
    }
    assert!(
        inspector.len() >= 15,
        "only {} demo engines",
        inspector.len()
    );
    for exit in [Exit::Clean, Exit::Illegal, Exit::Uncertain] {
        assert!(inspector.contains(&exit), "no demo engine exits {exit:?}");
    }
    assert!(
        !disagreements.is_empty(),
        "inspector and builder agree on every demo engine"
    );
}

#[test]
fn json_reports_carry_the_schema_and_a_result_that_follows_from_the_verdicts() {
    for path in common::files_under("engines-demo", ".yaml") {
        for role in [Role::Inspector, Role::Builder, Role::Simple] {
            let (json, exit) =
                run(&path, CheckFormat::Json, Some(role)).unwrap_or_else(|e| panic!("{e}"));
            let doc: serde_json::Value =
                serde_json::from_str(&json).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
            assert_eq!(doc["schema"], "gonogo.check/2");
            let engine = &doc["engines"][0];
            assert_eq!(engine["exit_status"], exit as u8);
            let rules = engine["rules"].as_array().cloned().unwrap_or_default();
            // README "Exit status": any illegal rule makes the engine illegal; else any call
            // not certain makes it not all clear; else it is legal
            let expected = if rules.iter().any(|r| r["verdict"] == "illegal") {
                ("illegal", Exit::Illegal)
            } else if rules.iter().any(|r| r["uncertain"] == true) {
                ("not_all_clear", Exit::Uncertain)
            } else {
                ("legal", Exit::Clean)
            };
            assert_eq!(
                (engine["result"].as_str(), exit),
                (Some(expected.0), expected.1),
                "{}",
                path.display()
            );
        }
    }
}

#[test]
fn bad_declarations_give_their_diagnostics() {
    let mut count = 0;
    insta::glob!("bad-declarations/*.yaml", |path| {
        count += 1;
        let problem = run(path, CheckFormat::Text, None)
            .err()
            .unwrap_or_else(|| panic!("{} was accepted", path.display()));
        insta::assert_snapshot!(problem);
    });
    assert!(count >= 20, "only {count} bad declarations");
}

/// The demo's after-bulletin engine with its date moved.
fn after_bulletin_dated(date: &str) -> String {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-after-bulletin.yaml"
    ))
    .unwrap_or_default();
    text.replace("date: \"2027-07-10\"", &format!("date: \"{date}\""))
}

#[test]
fn a_declaration_gets_the_rules_in_force_on_its_date() {
    let loaded = gonogo::commands::load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let class = rulebook
        .class("limited2")
        .unwrap_or_else(|| panic!("limited2"));
    let verdict_of = |date: &str, section: &str| {
        let mut sources = gonogo::source::SourceMap::default();
        let d = gonogo::load::declaration_from_text(
            Path::new("dated.yaml"),
            after_bulletin_dated(date),
            &rulebook,
            &mut sources,
        )
        .unwrap_or_else(|p| panic!("{p:?}"));
        let report = gonogo::evaluate::check_engine(&rulebook, class, &d, None);
        let bulletins = report.bulletins.to_vec();
        (
            report
                .outcomes
                .iter()
                .find(|o| o.section() == section)
                .map(|o| o.verdict),
            bulletins,
        )
    };
    use gonogo::evaluate::finding::Verdict;
    // TVB-27-04 takes effect on 2027-06-14: the day before, 0.485 in is over the 0.480 in limit
    assert_eq!(
        verdict_of("2027-06-13", "5.3"),
        (Some(Verdict::Illegal), vec![])
    );
    assert_eq!(
        verdict_of("2027-06-13", "4.8").0,
        None,
        "the bulletin's new rule is not in force yet"
    );
    // from that day on the limit is 0.490 in and rule 4.8 exists
    assert_eq!(
        verdict_of("2027-06-14", "5.3"),
        (Some(Verdict::Legal), vec!["TVB-27-04".to_string()])
    );
    assert_eq!(
        verdict_of("2027-06-14", "4.8").0,
        Some(Verdict::NotApplicable)
    );
}

#[test]
fn a_declaration_dated_before_the_edition_is_refused() {
    let path = std::env::temp_dir().join(format!("gonogo-{}-early.yaml", std::process::id()));
    std::fs::write(&path, after_bulletin_dated("2027-01-10")).unwrap_or_else(|e| panic!("{e}"));
    let message = run(&path, CheckFormat::Text, None)
        .err()
        .unwrap_or_default();
    let _ = std::fs::remove_file(&path);
    assert!(message.contains("C12 before-edition"), "{message}");
    assert!(
        message.contains("is dated 2027-01-10, before edition 2027 took effect"),
        "{message}"
    );
}

/// The report of one engine in each format, split into its header and one block per rule.
struct Blocks {
    format: &'static str,
    header: String,
    rules: Vec<String>,
}

fn unescape_html(text: &str) -> String {
    text.replace("&lt;", "<")
        .replace("&gt;", ">")
        .replace("&quot;", "\"")
        .replace("&#39;", "'")
        .replace("&amp;", "&")
}

/// Every string in a JSON value, one a line.
fn strings_of(value: &serde_json::Value, out: &mut String) {
    match value {
        serde_json::Value::String(s) => {
            out.push_str(s);
            out.push('\n');
        }
        serde_json::Value::Array(items) => items.iter().for_each(|v| strings_of(v, out)),
        serde_json::Value::Object(map) => map.values().for_each(|v| strings_of(v, out)),
        _ => {}
    }
}

/// The JSON report's blocks: each rule with the inputs and derived values its trace names.
fn json_blocks(json: &str) -> Blocks {
    let doc: serde_json::Value = serde_json::from_str(json).unwrap_or_else(|e| panic!("{e}"));
    let engine = &doc["engines"][0];
    let mut header = String::new();
    for key in ["heading", "class", "file"] {
        strings_of(&engine[key], &mut header);
    }
    let rules = engine["rules"]
        .as_array()
        .into_iter()
        .flatten()
        .map(|rule| {
            let mut block = String::new();
            strings_of(rule, &mut block);
            let source = &rule["source"];
            block.push_str(&format!(
                "{} {}\n",
                source["kind"].as_str().unwrap_or("?"),
                source["name"].as_str().unwrap_or("?")
            ));
            for entry in rule["trace"].as_array().into_iter().flatten() {
                let target = match (
                    entry["input"].as_u64(),
                    entry["derived"].as_u64(),
                    entry["gauge"].as_u64(),
                ) {
                    (Some(id), _, _) => &engine["inputs"][id as usize],
                    (_, Some(id), _) => &engine["derived"][id as usize],
                    (_, _, Some(id)) => &engine["gauges"][id as usize],
                    _ => entry,
                };
                strings_of(target, &mut block);
                // the JSON states an exact value as its source of uncertainty, `none`
                if target["uncertainty_from"] == "none" {
                    block.push_str("no uncertainty stated\n");
                }
            }
            block
        })
        .collect();
    Blocks {
        format: "json",
        header,
        rules,
    }
}

fn split_blocks(
    format: &'static str,
    report: &str,
    separator: &str,
    header_blocks: usize,
) -> Blocks {
    let parts: Vec<String> = report.split(separator).map(unescape_html).collect();
    let (header, rules) = parts.split_at(header_blocks.min(parts.len()));
    Blocks {
        format,
        header: header.join("\n"),
        rules: rules.to_vec(),
    }
}

/// The facts a rule's report must state in every format, from the rulebook and the
/// declaration themselves: its note, penalty and source, and each trace value as written.
fn facts_of(
    o: &gonogo::evaluate::outcome::Outcome,
    r: &gonogo::evaluate::outcome::EngineReport,
) -> Vec<String> {
    use gonogo::check::model::Origin;
    use gonogo::evaluate::outcome::Trace;
    use gonogo::load::{InputName, UncertaintySource};
    let mut facts: Vec<String> = o
        .note()
        .into_iter()
        .chain(o.penalty())
        .map(str::to_string)
        .collect();
    if let Origin::Bulletin(b) = &o.rule.origin {
        facts.push(format!("bulletin {b}"));
    }
    for t in &o.trace {
        match t {
            Trace::Input(id) => {
                let input = r.input(*id);
                match (&input.name, input.written.as_deref()) {
                    (InputName::Literal(text), _) => facts.push(text.clone()),
                    (_, Some(written)) => {
                        let value = written.split(['±']).next().unwrap_or(written).trim();
                        let bare = value.split_whitespace().next().unwrap_or(value);
                        facts.push(bare.to_string());
                    }
                    (_, None) => panic!("a declared input without its text"),
                }
                facts.push(
                    input
                        .label(r.rulebook)
                        .split('[')
                        .next()
                        .unwrap_or_default()
                        .to_string(),
                );
                match &input.source {
                    UncertaintySource::None => facts.push("no uncertainty stated".to_string()),
                    UncertaintySource::Instrument(i)
                    | UncertaintySource::Calibration { instrument: i, .. }
                    | UncertaintySource::Repeated {
                        instrument: Some(i),
                        ..
                    } => facts.push(i.clone()),
                    UncertaintySource::Stated { .. }
                    | UncertaintySource::Rulebook
                    | UncertaintySource::Repeated { .. } => {}
                }
            }
            Trace::Text { value, .. } => facts.push(value.to_string()),
            Trace::Derived { derived, .. } => facts.push(derived.formula.clone()),
            Trace::Missing { name } => facts.push(name.to_string()),
            // a gauge result: its tag and what it did, as the declaration writes them
            Trace::Gauge { result, .. } => {
                facts.push(result.tag.clone());
                facts.push(result.kind.result_words(result.went).to_string());
            }
        }
    }
    facts
}

#[test]
fn every_format_states_the_same_facts_of_every_demo_engine() {
    use gonogo::check::model::Origin;
    let loaded = gonogo::commands::load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut checked = 0;
    for path in common::files_under("engines-demo", ".yaml") {
        let path = relative(&path);
        let mut sources = gonogo::source::SourceMap::default();
        let d = gonogo::load::load_declaration(&path, &rulebook, &mut sources)
            .unwrap_or_else(|p| panic!("{p:?}"));
        let class = d
            .identity
            .class
            .as_deref()
            .and_then(|c| rulebook.class(c))
            .unwrap_or_else(|| panic!("{}: no class", path.display()));
        let report = gonogo::evaluate::check_engine(&rulebook, class, &d, None);
        let reports = [report];
        let formats = [
            split_blocks(
                "text",
                &gonogo::report::text::engine(&reports[0]),
                "\n\n",
                2,
            ),
            split_blocks(
                "markdown",
                &gonogo::report::markdown::document(&reports),
                "\n## ",
                1,
            ),
            split_blocks(
                "html",
                &gonogo::report::html::page(&reports),
                "<section class=\"rule",
                1,
            ),
            json_blocks(&gonogo::report::json::document(&reports)),
        ];
        let report = &reports[0];
        for blocks in &formats {
            let at = format!("{} ({})", path.display(), blocks.format);
            assert_eq!(
                blocks.rules.len(),
                report.outcomes.len(),
                "{at}: rule count"
            );
            for (o, block) in report.outcomes.iter().zip(&blocks.rules) {
                assert!(
                    block.contains(o.section()),
                    "{at}: rule {} out of place",
                    o.section()
                );
                for fact in facts_of(o, report) {
                    assert!(
                        block.contains(&fact),
                        "{at}: rule {} does not state `{fact}`:\n{block}",
                        o.section()
                    );
                    checked += 1;
                }
                if let Origin::Class(c) = &o.rule.origin {
                    let named = format!("class {c}");
                    let shown = if *c == class.name {
                        &blocks.header
                    } else {
                        block
                    };
                    assert!(
                        shown.contains(&named)
                            || (blocks.format == "json" && block.contains(c.as_str())),
                        "{at}: rule {} does not say it comes from {named}",
                        o.section()
                    );
                }
            }
        }
    }
    assert!(checked > 1000, "only {checked} facts checked");
}
