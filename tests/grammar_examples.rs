//! Every example in `grammar/` and every demo rulebook parses, passes the static checks
//! without an error, and prints in a canonical form that parses back to the same tree.

mod common;

use gonogo::commands::load_rulebook;
use gonogo::diagnostic::{Level, RenderStyle};
use gonogo::parse::print::{canonical, formatted};
use gonogo::parse::{parse_rulebook, parse_with_comments};

fn rulebooks() -> Vec<std::path::PathBuf> {
    let mut all = common::files_under("grammar/examples", ".rules");
    all.extend(common::files_under("rulebooks-demo", ".rules"));
    assert!(
        all.len() >= 6,
        "examples and demo rulebooks are missing: {all:?}"
    );
    all
}

#[test]
fn every_example_and_demo_rulebook_parses() {
    for path in rulebooks() {
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        let (_, problems) = parse_rulebook(0, &text);
        assert!(problems.is_empty(), "{}: {problems:?}", path.display());
    }
}

#[test]
fn every_example_and_demo_rulebook_lints_without_error() {
    // files under `parts/` are fragments that a rulebook includes; they have no header
    let whole_rulebooks = rulebooks()
        .into_iter()
        .filter(|p| !p.to_string_lossy().contains("/parts/"));
    for path in whole_rulebooks {
        let loaded = load_rulebook(&path);
        let errors: Vec<_> = loaded
            .problems
            .iter()
            .filter(|p| p.level == Level::Error)
            .collect();
        let shown =
            gonogo::commands::render_all(&loaded.problems, &loaded.sources, RenderStyle::PLAIN);
        assert!(errors.is_empty(), "{}:\n{shown}", path.display());
        assert!(
            loaded.checked.is_some(),
            "{} gave no checked rulebook",
            path.display()
        );
    }
}

/// The text of every comment of `text`, in order, as the lexer found them.
fn comment_texts(text: &str, comments: &[gonogo::source::Span]) -> Vec<String> {
    comments
        .iter()
        .map(|c| text[c.start..c.end].trim_end().to_string())
        .collect()
}

#[test]
fn canonical_form_round_trips_for_every_file() {
    for path in rulebooks() {
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        let (first, _, comments) = parse_with_comments(0, &text);
        for printed in [canonical(&first), formatted(&first, &text, &comments)] {
            let (second, problems, again) = parse_with_comments(0, &printed);
            assert!(
                problems.is_empty(),
                "{}: canonical text does not parse: {problems:?}\n{printed}",
                path.display()
            );
            assert_eq!(
                first,
                second,
                "{}: round trip changed the tree",
                path.display()
            );
            assert_eq!(
                formatted(&second, &printed, &again),
                printed,
                "{}: canonical form is not stable",
                path.display()
            );
        }
    }
}

#[test]
fn fmt_keeps_every_comment_of_every_file_in_order() {
    let mut seen = 0;
    for path in rulebooks() {
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        let (book, _, comments) = parse_with_comments(0, &text);
        let printed = formatted(&book, &text, &comments);
        let (_, _, again) = parse_with_comments(0, &printed);
        assert_eq!(
            comment_texts(&printed, &again),
            comment_texts(&text, &comments),
            "{}: comments lost or moved out of order\n{printed}",
            path.display()
        );
        // every comment line of the file is one the lexer found (none is missed)
        let hashes = text.lines().filter(|l| l.contains('#')).count();
        assert!(comments.len() <= hashes, "{}", path.display());
        seen += comments.len();
    }
    assert!(seen >= 20, "the examples hold only {seen} comments");
}

#[test]
fn the_grammar_names_every_keyword() {
    let grammar = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/grammar/rulebook.ebnf"
    ))
    .unwrap_or_default();
    for keyword in gonogo::parse::KEYWORDS {
        assert!(
            grammar.contains(&format!("\"{keyword}\""))
                || grammar.contains(&format!(" {keyword} ")),
            "`{keyword}` is not in grammar/rulebook.ebnf"
        );
    }
}

#[test]
fn the_readme_lists_every_unit() {
    let readme = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/README.md"))
        .unwrap_or_default();
    for unit in gonogo::units::UNITS {
        assert!(
            readme.contains(&format!("`{}`", unit.symbol)),
            "README.md does not list `{}`",
            unit.symbol
        );
    }
}
