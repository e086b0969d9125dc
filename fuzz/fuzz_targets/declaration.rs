//! Any text as an engine declaration against the demo rulebook (2027 edition): load it,
//! check it against its class, and render the report in every format. Nothing may panic.

#![no_main]

use std::path::Path;
use std::sync::OnceLock;

use gonogo::check::model::CheckedRulebook;
use gonogo::diagnostic::{RenderStyle, render};
use gonogo::evaluate::check_engine;
use gonogo::load::declaration_from_text;
use gonogo::report::{html, json, markdown, text};
use gonogo::source::SourceMap;
use libfuzzer_sys::fuzz_target;

fn demo() -> &'static CheckedRulebook {
    static DEMO: OnceLock<CheckedRulebook> = OnceLock::new();
    DEMO.get_or_init(|| {
        let path =
            Path::new(env!("CARGO_MANIFEST_DIR")).join("../rulebooks-demo/tamsin-2027.rules");
        let loaded = gonogo::commands::load_rulebook(&path);
        match loaded.checked {
            Some(rulebook) => rulebook,
            None => panic!("the demo rulebook does not check: {:?}", loaded.problems),
        }
    })
}

fuzz_target!(|data: &[u8]| {
    let Ok(yaml) = std::str::from_utf8(data) else {
        return;
    };
    let rulebook = demo();
    let mut sources = SourceMap::default();
    let declaration = match declaration_from_text(
        Path::new("fuzz.yaml"),
        yaml.to_string(),
        rulebook,
        &mut sources,
    ) {
        Ok(declaration) => declaration,
        Err(problems) => {
            for problem in &problems {
                let _ = render(problem, &sources, RenderStyle::PLAIN);
            }
            return;
        }
    };
    let class = declaration
        .identity
        .class
        .as_deref()
        .and_then(|name| rulebook.classes.iter().find(|c| c.name == name));
    let Some(class) = class else {
        return;
    };
    let report = check_engine(rulebook, class, &declaration, None);
    let reports = [report];
    let _ = text::engine(&reports[0]);
    let _ = text::field_summary(&reports);
    let _ = json::document(&reports);
    let _ = markdown::document(&reports);
    let _ = html::page(&reports);
});
