//! Property test: no mutation of a demo rulebook makes the parser or the static checks panic.
//! Mutations cut, repeat and splice text, and insert the tokens most likely to confuse a
//! parser (quotes, slashes, brackets, keywords, fractions, `±`).

mod common;

use gonogo::check::check;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use proptest::prelude::*;

const TOKENS: &[&str] = &[
    "(",
    ")",
    "\"",
    "/",
    "\\",
    "#",
    "end",
    "when",
    "rule 1.1 \"x\"",
    "require",
    "override",
    "drop 3.1",
    "and",
    "or",
    "not",
    "in",
    "between",
    "allowing",
    "±",
    "+/-",
    "1-5/8",
    "5/0",
    "^",
    "^-",
    "==",
    "<=",
    "bore",
    "max(",
    "class k",
    "extends limited2",
    "2027-02-29",
    "é",
    "\n",
    "9999999999999999999999",
    "1e999",
    "/[/",
    "(k = 0)",
];

#[derive(Clone, Debug)]
enum Edit {
    Delete { at: usize, len: usize },
    Insert { at: usize, token: usize },
    Repeat { at: usize, len: usize },
    Swap { a: usize, b: usize },
}

fn edit() -> impl Strategy<Value = Edit> {
    prop_oneof![
        (any::<usize>(), 1usize..40).prop_map(|(at, len)| Edit::Delete { at, len }),
        (any::<usize>(), 0..TOKENS.len()).prop_map(|(at, token)| Edit::Insert { at, token }),
        (any::<usize>(), 1usize..200).prop_map(|(at, len)| Edit::Repeat { at, len }),
        (any::<usize>(), any::<usize>()).prop_map(|(a, b)| Edit::Swap { a, b }),
    ]
}

fn boundary(text: &str, at: usize) -> usize {
    let mut at = at % (text.len() + 1);
    while !text.is_char_boundary(at) {
        at -= 1;
    }
    at
}

fn apply(text: &mut String, edit: &Edit) {
    match *edit {
        Edit::Delete { at, len } => {
            let start = boundary(text, at);
            let end = boundary(text, start + len);
            text.replace_range(start..end.max(start), "");
        }
        Edit::Insert { at, token } => {
            let at = boundary(text, at);
            text.insert_str(at, TOKENS[token]);
        }
        Edit::Repeat { at, len } => {
            let start = boundary(text, at);
            let end = boundary(text, start + len).max(start);
            let piece = text[start..end].to_string();
            text.insert_str(end, &piece);
        }
        Edit::Swap { a, b } => {
            let (a, b) = (boundary(text, a), boundary(text, b));
            let (lo, hi) = (a.min(b), a.max(b));
            let piece = text[lo..hi].to_string();
            text.replace_range(lo..hi, "");
            text.push_str(&piece);
        }
    }
}

fn demo_texts() -> Vec<String> {
    common::files_under("rulebooks-demo", ".rules")
        .into_iter()
        .chain(common::files_under("grammar/examples", ".rules"))
        .map(|p| std::fs::read_to_string(p).unwrap_or_default())
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    #[test]
    fn mutated_rulebooks_never_panic(file in any::<usize>(), edits in prop::collection::vec(edit(), 1..6)) {
        let texts = demo_texts();
        let mut text = texts[file % texts.len()].clone();
        for e in &edits {
            apply(&mut text, e);
        }
        let (book, problems) = parse_rulebook(0, &text);
        if problems.is_empty() {
            let (_, found) = check(&RulebookFiles { files: vec![(0, book)] });
            // every problem points inside the text it is about
            for p in found {
                for (span, _) in &p.labels {
                    prop_assert!(span.end <= text.len(), "{} points past the end", p.code);
                }
            }
        }
    }
}

fn demo_rulebook() -> gonogo::check::model::CheckedRulebook {
    let loaded = gonogo::commands::load_rulebook(std::path::Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/rulebooks-demo/tamsin-2027.rules"
    )));
    loaded
        .checked
        .unwrap_or_else(|| panic!("the demo rulebook does not check"))
}

fn demo_declarations() -> Vec<String> {
    common::files_under("engines-demo", ".yaml")
        .into_iter()
        .map(|p| std::fs::read_to_string(p).unwrap_or_default())
        .collect()
}

const YAML_TOKENS: &[&str] = &[
    ":",
    "- ",
    "[",
    "]",
    "{",
    "}",
    "\"",
    "'",
    "\n  ",
    "\n",
    "#",
    "&a ",
    "*a",
    "~",
    "null",
    ".nan",
    "-.inf",
    "1e999",
    "± 0.1 in",
    "(k = 0)",
    "-",
    "cc",
    "in",
    "values:",
    "value:",
    "instrument:",
    "class: open4",
    "bore:",
    "cylinders: 3",
];

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, ..ProptestConfig::default() })]

    #[test]
    fn mutated_declarations_never_panic(file in any::<usize>(), edits in prop::collection::vec(edit(), 1..6), token in 0..YAML_TOKENS.len(), at in any::<usize>()) {
        let rulebook = demo_rulebook();
        let texts = demo_declarations();
        let mut text = texts[file % texts.len()].clone();
        for e in &edits {
            apply(&mut text, e);
        }
        let at = boundary(&text, at);
        text.insert_str(at, YAML_TOKENS[token]);
        let mut sources = gonogo::source::SourceMap::default();
        if let Ok(declaration) = gonogo::load::declaration_from_text(std::path::Path::new("mutant.yaml"), text, &rulebook, &mut sources) {
            let class = declaration.identity.class.clone().and_then(|c| rulebook.class(&c).cloned()).unwrap_or_else(|| rulebook.classes[0].clone());
            let report = gonogo::evaluate::check_engine(&rulebook, &class, &declaration, None);
            let _ = gonogo::report::text::engine(&report);
            let _ = gonogo::report::json::document(&[report]);
        }
    }
}
