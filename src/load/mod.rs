//! Loading engine declarations: a YAML file read against the rulebook's measurement schema,
//! every value converted to SI with its standard uncertainty and origin. Every problem of a
//! file is reported, each at its YAML line and column; nothing is guessed, and a file with a
//! problem never gives a declaration.

mod collect;
pub mod declaration;
pub mod depth;
pub mod error;
pub mod gauge;
pub mod inspection;
pub mod path;
mod reading;
mod repeated;
mod seed;

use std::cell::RefCell;
use std::path::Path;

use serde::Deserialize;
use serde::de::{DeserializeSeed, IgnoredAny};

pub use declaration::{
    Component, Declaration, Distribution, Identity, Input, InputId, InputName, Place, Supplied,
    UncertaintySource,
};
pub use error::{LoadError, LoadProblem};
pub use path::DeclPath;
pub use reading::{Reading, read_text};

use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::parse::includes::read_problem;
use crate::source::{FileId, SourceMap, Span};
use collect::{Collector, Pending};
use seed::{Context, DeclarationSeed, State, instrument_problem};

/// Reading a file stops after this many problems (each costs one more reading of the file).
const MOST_PROBLEMS: usize = 50;

/// Reads one declaration. The file is added to `sources` so problems can show it.
pub fn load_declaration(
    path: &Path,
    rulebook: &CheckedRulebook,
    sources: &mut SourceMap,
) -> Result<Declaration, Vec<Problem>> {
    let id = sources
        .read(path)
        .map_err(|f| vec![read_problem(path, f)])?;
    read_declaration(id, path, rulebook, sources)
}

/// Reads a declaration from text, named `path` in diagnostics.
pub fn declaration_from_text(
    path: &Path,
    text: String,
    rulebook: &CheckedRulebook,
    sources: &mut SourceMap,
) -> Result<Declaration, Vec<Problem>> {
    let id = sources.add(path.to_path_buf(), text);
    read_declaration(id, path, rulebook, sources)
}

fn read_declaration(
    id: FileId,
    path: &Path,
    rulebook: &CheckedRulebook,
    sources: &SourceMap,
) -> Result<Declaration, Vec<Problem>> {
    let text: &str = &sources.file(id).text;
    if let Some(at) = depth::too_deep(text) {
        let error = LoadError::TooDeep {
            limit: depth::MAX_FLOW_DEPTH,
        };
        let span = Some(Span::new(id, at, at + 1));
        let path = DeclPath::root();
        return Err(vec![LoadProblem { error, path, span }.problem()]);
    }
    match read_all(text, id, rulebook) {
        Ok(mut declaration) => {
            declaration.path = path.to_path_buf();
            declaration.sha256 = crate::digest::sha256_hex(text.as_bytes());
            Ok(declaration)
        }
        Err(mut found) => {
            found.sort_by_key(|p| p.span.map_or(usize::MAX, |s| s.start));
            Err(found.iter().map(LoadProblem::problem).collect())
        }
    }
}

/// Reads the file again and again, each time skipping what was already reported, until it
/// reads clean or only a YAML syntax error is left.
fn read_all(
    text: &str,
    file: FileId,
    rulebook: &CheckedRulebook,
) -> Result<Declaration, Vec<LoadProblem>> {
    let mut collector = Collector::default();
    let mut found: Vec<LoadProblem> = Vec::new();
    let mut syntax: Option<Option<String>> = None;
    while found.len() < MOST_PROBLEMS {
        collector.begin();
        let state = RefCell::new(State::default());
        let seed = DeclarationSeed {
            cx: Context {
                rulebook,
                state: &state,
                collector: &collector,
            },
        };
        match seed.deserialize(serde_yaml::Deserializer::from_str(text)) {
            Ok(()) => {
                let mut state = state.into_inner();
                let late = resolve_instruments(&mut state);
                if late.is_empty() {
                    return if found.is_empty() {
                        Ok(state.declaration)
                    } else {
                        Err(found)
                    };
                }
                if late.iter().all(|(path, _)| collector.is_deferred(path)) {
                    // raised nowhere on the last reading: report them without a place
                    found.extend(late.into_iter().map(|(path, error)| LoadProblem {
                        error,
                        path,
                        span: None,
                    }));
                    return Err(found);
                }
                for (path, error) in late {
                    collector.defer(path, error);
                }
            }
            Err(e) => {
                let span = location(&e, file, text);
                let node = span.and_then(|s| text.get(s.start..)).unwrap_or_default();
                let syntax = syntax.get_or_insert_with(|| syntax_error(text));
                let pending = collector.take_pending();
                let (error, path) = match pending {
                    Some(Pending { path, error }) if syntax.as_ref() != Some(&e.to_string()) => {
                        let error =
                            error.unwrap_or_else(|| LoadError::from_yaml(yaml_message(&e), node));
                        (error, path)
                    }
                    _ => {
                        found.push(LoadProblem {
                            error: LoadError::from_yaml(yaml_message(&e), node),
                            path: DeclPath::root(),
                            span,
                        });
                        return Err(found);
                    }
                };
                found.push(LoadProblem {
                    error,
                    path: path.clone(),
                    span,
                });
                if !collector.skip(path) {
                    return Err(found);
                }
            }
        }
    }
    found.push(LoadProblem::unlocated(LoadError::TooMany {
        shown: found.len(),
    }));
    Err(found)
}

/// Gives each input that names an instrument the instrument's standard uncertainty; the
/// uses that name no instrument of the file, or one of another dimension, are returned.
fn resolve_instruments(state: &mut State) -> Vec<(DeclPath, LoadError)> {
    let mut late = Vec::new();
    let mut calibrations = std::collections::BTreeMap::new();
    if state.instruments_unusable {
        return late;
    }
    for usage in &state.uses {
        if state.broken_instruments.contains(&usage.instrument) {
            continue;
        }
        let problem = instrument_problem(
            &state.instruments,
            &usage.instrument,
            &usage.measurement,
            usage.dimension,
        );
        if let Some(error) = problem {
            late.push((usage.path.clone(), error));
            continue;
        }
        let Some(instrument) = state.instruments.get(&usage.instrument) else {
            continue;
        };
        for id in &usage.inputs {
            if let Some(input) = state.declaration.inputs.get_mut(*id as usize) {
                take_instrument(input, instrument);
            }
        }
        if let Some(u) = instrument.calibration {
            share_calibration(
                &mut state.declaration,
                &mut calibrations,
                &usage.instrument,
                u,
                &usage.inputs,
            );
        }
    }
    late
}

/// Gives one input its instrument's components: in place of none, or beside the spread of
/// repeated readings (Type A), which the instrument's resolution and uncertainty add to.
fn take_instrument(input: &mut Input, instrument: &seed::Instrument) {
    if matches!(input.source, UncertaintySource::Repeated { .. }) {
        input.components.extend_from_slice(&instrument.components);
        input.standard_uncertainty = input
            .standard_uncertainty
            .hypot(instrument.standard_uncertainty);
    } else {
        input.standard_uncertainty = instrument.standard_uncertainty;
        input.components.clone_from(&instrument.components);
    }
}

/// Adds the readings `inputs` to the shared calibration input of `instrument` (value 0, an
/// additive correction with a normal distribution), made the first time it is used.
fn share_calibration(
    declaration: &mut Declaration,
    made: &mut std::collections::BTreeMap<String, InputId>,
    instrument: &str,
    u: f64,
    inputs: &[InputId],
) {
    let unit = inputs
        .first()
        .and_then(|id| declaration.inputs.get(*id as usize))
        .and_then(|i| i.unit);
    let id = match made.get(instrument) {
        Some(id) => *id,
        None => {
            let Ok(id) = InputId::try_from(declaration.inputs.len()) else {
                return;
            };
            declaration.inputs.push(Input {
                name: InputName::Calibration {
                    instrument: instrument.to_string(),
                },
                value: 0.0,
                standard_uncertainty: u,
                components: vec![Component::normal(u)],
                unit,
                written: Some(match unit {
                    Some(symbol) => format!("0 {symbol}"),
                    None => "0".to_string(),
                }),
                source: UncertaintySource::Calibration {
                    instrument: instrument.to_string(),
                    readings: 0,
                },
            });
            made.insert(instrument.to_string(), id);
            id
        }
    };
    for reading in inputs {
        declaration.calibrations.insert(*reading, id);
    }
    if let Some(UncertaintySource::Calibration { readings, .. }) = declaration
        .inputs
        .get_mut(id as usize)
        .map(|i| &mut i.source)
    {
        *readings += inputs.len();
    }
}

/// The YAML syntax error of the file, if it has one, as serde_yaml words it.
fn syntax_error(text: &str) -> Option<String> {
    IgnoredAny::deserialize(serde_yaml::Deserializer::from_str(text))
        .err()
        .map(|e| e.to_string())
}

/// serde_yaml's message without its location (`at line 3 column 7`) and without its own
/// path (`measurements.bore[0]: `, which counts from 0).
fn yaml_message(e: &serde_yaml::Error) -> String {
    let text = without_positions(&e.to_string());
    match text.split_once(": ") {
        Some((head, rest)) if !head.is_empty() && !head.contains(' ') => rest.to_string(),
        _ => text,
    }
}

/// `text` with every ` at line N column M` and ` at position N` taken out.
fn without_positions(text: &str) -> String {
    let mut out = String::new();
    let mut rest = text;
    while let Some(at) = rest.find(" at ") {
        out.push_str(&rest[..at]);
        let after = &rest[at + 4..];
        match position_length(after) {
            Some(len) => rest = &after[len..],
            None => {
                out.push_str(" at ");
                rest = after;
            }
        }
    }
    out.push_str(rest);
    out
}

/// The length of `line N column M` or `position N` at the start of `text`.
fn position_length(text: &str) -> Option<usize> {
    let digits = |s: &str| s.len() - s.trim_start_matches(|c: char| c.is_ascii_digit()).len();
    if let Some(after) = text.strip_prefix("line ") {
        let line = digits(after);
        let column = after[line..].strip_prefix(" column ")?;
        let n = digits(column);
        return (line > 0 && n > 0).then_some("line ".len() + line + " column ".len() + n);
    }
    let after = text.strip_prefix("position ")?;
    let n = digits(after);
    (n > 0).then_some("position ".len() + n)
}

/// The span of the token serde_yaml's error points at.
fn location(e: &serde_yaml::Error, file: FileId, text: &str) -> Option<Span> {
    e.location()
        .map(|l| token_span(file, text, l.line(), l.column()))
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

#[cfg(test)]
mod tests {
    use super::without_positions;

    #[test]
    fn positions_are_taken_out_of_serde_yaml_words() {
        assert_eq!(
            without_positions(
                "did not find expected key at line 36 column 4, while parsing a block mapping at line 34 column 3"
            ),
            "did not find expected key, while parsing a block mapping"
        );
        assert_eq!(without_positions("look at this"), "look at this");
        assert_eq!(without_positions("stop at position 12"), "stop");
    }
}
