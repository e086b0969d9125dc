//! Loading engine declarations: a YAML file read against the rulebook's measurement schema,
//! every value converted to SI with its standard uncertainty and origin. Bad input is a
//! problem pointing at the YAML line and column; nothing is guessed.

pub mod declaration;
mod reading;
mod seed;

use std::cell::RefCell;
use std::path::Path;

use serde::de::DeserializeSeed;

pub use declaration::{
    Declaration, Identity, Input, InputName, Place, Supplied, UncertaintySource,
};
pub use reading::{Reading, read_text};

use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::parse::includes::read_problem;
use crate::source::{FileId, SourceMap, Span};
use seed::{DeclarationSeed, SEPARATOR, State};

/// Reads one declaration. The file is added to `sources` so problems can show it.
pub fn load_declaration(
    path: &Path,
    rulebook: &CheckedRulebook,
    sources: &mut SourceMap,
) -> Result<Declaration, Problem> {
    let id = sources.read(path).map_err(|f| read_problem(path, f))?;
    read_declaration(id, path, rulebook, sources)
}

/// Reads a declaration from text, named `path` in diagnostics.
pub fn declaration_from_text(
    path: &Path,
    text: String,
    rulebook: &CheckedRulebook,
    sources: &mut SourceMap,
) -> Result<Declaration, Problem> {
    let id = sources.add(path.to_path_buf(), text);
    read_declaration(id, path, rulebook, sources)
}

fn read_declaration(
    id: FileId,
    path: &Path,
    rulebook: &CheckedRulebook,
    sources: &SourceMap,
) -> Result<Declaration, Problem> {
    let text = sources.file(id).text.clone();
    let state = RefCell::new(State::default());
    let seed = DeclarationSeed {
        rulebook,
        state: &state,
    };
    seed.deserialize(serde_yaml::Deserializer::from_str(&text))
        .map_err(|e| yaml_problem(&e, id, &text))?;
    let mut state = state.into_inner();
    resolve_instruments(&mut state).map_err(|p| locate_at_start(p, id))?;
    state.declaration.path = path.to_path_buf();
    Ok(state.declaration)
}

/// Gives each input that names an instrument the instrument's standard uncertainty.
fn resolve_instruments(state: &mut State) -> Result<(), Problem> {
    for usage in &state.uses {
        let Some(instrument) = state.instruments.get(&usage.instrument) else {
            let e: serde_yaml::Error =
                seed::unknown_instrument(&usage.instrument, &state.instruments);
            let (code, message, help) = split_refusal(&e.to_string());
            return Err(
                Problem::unlocated(code, format!("{}: {message}", usage.path)).with_help(help),
            );
        };
        if instrument.dimension != usage.dimension {
            return Err(Problem::unlocated(
                "gonogo::load::wrong-dimension",
                format!(
                    "{}: instrument `{}` measures a {}, but this is a {}",
                    usage.path, usage.instrument, instrument.dimension, usage.dimension
                ),
            )
            .with_help("name an instrument that measures this kind of quantity"));
        }
        for id in &usage.inputs {
            if let Some(input) = state.declaration.inputs.get_mut(*id as usize) {
                input.standard_uncertainty = instrument.standard_uncertainty;
            }
        }
    }
    Ok(())
}

fn locate_at_start(mut p: Problem, file: FileId) -> Problem {
    p.labels.push((Span::new(file, 0, 0), String::new()));
    p
}

/// Turns a serde_yaml error into a problem at its line and column.
fn yaml_problem(e: &serde_yaml::Error, file: FileId, text: &str) -> Problem {
    let full = e.to_string();
    let location = regex::Regex::new(r" at line \d+ column \d+")
        .map(|re| re.replace_all(&full, "").into_owned());
    let without_location = location.unwrap_or(full);
    let (code, message, help) = split_refusal(&without_location);
    let span = e
        .location()
        .map(|l| token_span(file, text, l.line(), l.column()))
        .unwrap_or_else(|| Span::new(file, 0, 0));
    Problem::error(code, message, span, "here").with_help(help)
}

/// Code, message and help from a refusal's text (`path: code␟message␟help`), or a plain
/// serde_yaml message.
fn split_refusal(text: &str) -> (&'static str, String, String) {
    let mut parts = text.split(SEPARATOR);
    let head = parts.next().unwrap_or_default();
    match (parts.next(), parts.next()) {
        (Some(message), Some(help)) => {
            let (path, code) = match head.rsplit_once(": ") {
                Some((path, code)) => (Some(path), code),
                None => (None, head),
            };
            let message = match path {
                Some(p) => format!("{p}: {message}"),
                None => message.to_string(),
            };
            (intern_code(code), message, help.to_string())
        }
        _ => (
            "gonogo::load::yaml",
            head.to_string(),
            "the README's \"Engine declarations\" section shows the layout of a declaration"
                .to_string(),
        ),
    }
}

/// Refusal codes are written as literals in `seed.rs` and `reading.rs`; map them back to
/// static strings (an unknown one, which would be a bug, keeps a generic code).
fn intern_code(code: &str) -> &'static str {
    const CODES: &[&str] = &[
        "gonogo::load::unknown-key",
        "gonogo::load::duplicate-key",
        "gonogo::load::unknown-class",
        "gonogo::load::bad-date",
        "gonogo::load::bad-quantity",
        "gonogo::load::bad-coverage",
        "gonogo::load::missing-unit",
        "gonogo::load::wrong-dimension",
        "gonogo::load::unknown-unit",
        "gonogo::load::not-finite",
        "gonogo::load::negative",
        "gonogo::load::out-of-range",
        "gonogo::load::not-positive",
        "gonogo::load::instrument-empty",
        "gonogo::load::needs-list",
        "gonogo::load::not-a-list",
        "gonogo::load::empty-list",
        "gonogo::load::cylinder-count",
        "gonogo::load::two-uncertainties",
        "gonogo::load::value-and-values",
        "gonogo::load::unknown-instrument",
    ];
    CODES
        .iter()
        .find(|c| **c == code)
        .copied()
        .unwrap_or("gonogo::load::invalid")
}

/// The span of the token at a one-based line and column.
fn token_span(file: FileId, text: &str, line: usize, column: usize) -> Span {
    let line_start: usize = text
        .split_inclusive('\n')
        .take(line.saturating_sub(1))
        .map(str::len)
        .sum();
    let line_text = text[line_start.min(text.len())..]
        .lines()
        .next()
        .unwrap_or("");
    let start = line_start
        + line_text
            .chars()
            .take(column.saturating_sub(1))
            .map(char::len_utf8)
            .sum::<usize>();
    let rest = &text[start.min(text.len())..];
    let len = match rest.strip_prefix('"') {
        Some(quoted) => quoted.find('"').map_or(1, |end| end + 2),
        None => rest
            .find(['\n', ',', ']', '}', '#', ':'])
            .unwrap_or(rest.len())
            .max(1),
    };
    let len = rest[..len.min(rest.len())].trim_end().len().max(1);
    Span::new(file, start, (start + len).min(text.len()))
}
