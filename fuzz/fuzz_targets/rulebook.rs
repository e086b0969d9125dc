//! Any text as a rulebook: parse it, check it, render every problem, and when it parses
//! cleanly print it in canonical form and parse that back to the same tree. Nothing may
//! panic, and the canonical form must mean what the text meant.

#![no_main]

use gonogo::diagnostic::{RenderStyle, render};
use gonogo::parse::ast::Rulebook;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::parse::print::canonical;
use gonogo::source::SourceMap;
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let mut sources = SourceMap::default();
    let id = sources.add("fuzz.rules".into(), text.to_string());
    let (book, mut problems) = parse_rulebook(id, text);
    let parsed_cleanly = problems.is_empty();
    let files = RulebookFiles {
        files: vec![(id, book)],
    };
    if parsed_cleanly {
        let (_, check_problems) = gonogo::check::check(&files);
        problems.extend(check_problems);
    }
    for problem in &problems {
        let _ = render(problem, &sources, RenderStyle::PLAIN);
    }
    if parsed_cleanly {
        round_trip(&files.files[0].1);
    }
});

/// The canonical text parses, without a problem, to the same tree.
fn round_trip(book: &Rulebook) {
    let printed = canonical(book);
    let (again, problems) = parse_rulebook(0, &printed);
    assert!(
        problems.is_empty(),
        "the canonical form does not parse: {problems:?}\n{printed}"
    );
    assert!(
        again == *book,
        "the canonical form means something else:\n{printed}"
    );
}
