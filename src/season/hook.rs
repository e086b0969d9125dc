//! What `check --record LOG` calls once the engines are checked: the rulebook's files and
//! each engine's declaration text and report gathered, recorded in one transaction, and what
//! the log then shows of each engine's seals added to the report.

use std::path::Path;

use super::record::{Given, Inspected, RulebookBytes, Staging, record_staged};
use super::schema::{Log, Mode};
use super::seals::{Changes, compare};
use crate::commands::Failure;
use crate::commands::check::{CheckFormat, CheckRequest, Role};
use crate::evaluate::outcome::EngineReport;
use crate::report::json;
use crate::source::SourceMap;

/// What recording a run found: the sequence numbers given, and each engine whose seals or
/// sealed measurements do not match its previous inspection.
#[derive(Debug, Default)]
pub struct Recorded {
    /// The log's file name.
    pub log: String,
    /// The first and last sequence numbers given (the run's engines, in report order, were
    /// numbered from one to the other); `None` when no engine was recorded.
    pub sequence: Option<(i64, i64)>,
    /// Engine, its previous inspection's number, and what changed, for flagged engines.
    pub flagged: Vec<(String, i64, Changes)>,
}

/// The staging of a `check --record` run: what its command line gives every entry.
pub fn staging(request: &CheckRequest) -> Staging {
    Staging::new(Given {
        class: request.class.map(str::to_string),
        role: request.role.map(|r| role_word(r).to_string()),
    })
}

/// Records a checked run's staged engines into `log` (created when missing), in one
/// transaction; then reads them back once more for the engines whose seals the log flags.
pub fn run_check(
    log: &Path,
    request: &CheckRequest,
    staged: &mut Staging,
) -> Result<Recorded, Failure> {
    let rulebook = rulebook_bytes(request.rules)?;
    let mut opened = Log::open(log, Mode::Create).map_err(Failure::one)?;
    let unreadable = |e: std::io::Error| Failure::one(super::spool_unreadable(log, &e));
    let entries = staged.entries().map_err(unreadable)?;
    let (first, last) = record_staged(&mut opened, &rulebook, entries).map_err(Failure::one)?;
    let mut flagged: Vec<(String, i64, Changes)> = Vec::new();
    for next in staged.entries().map_err(unreadable)? {
        let (entry, _) = next.map_err(unreadable)?;
        let Some(engine) = entry.engine else {
            continue;
        };
        if flagged.iter().any(|(e, _, _)| *e == engine) {
            continue;
        }
        let history = opened.history(&engine).map_err(Failure::one)?;
        if let [.., before, after] = history.as_slice() {
            let changes = compare(before, after);
            if changes.flagged() {
                flagged.push((engine, before.seq, changes));
            }
        }
    }
    Ok(Recorded {
        log: log.display().to_string(),
        sequence: first.zip(last),
        flagged,
    })
}

/// `--as`'s word.
pub fn role_word(role: Role) -> &'static str {
    match role {
        Role::Inspector => "inspector",
        Role::Builder => "builder",
        Role::Simple => "simple",
    }
}

/// What the log keeps of a checked engine whose declaration read as `text`.
pub fn inspected(report: &EngineReport, text: &std::sync::Arc<str>) -> Inspected {
    let document = json::document(std::slice::from_ref(report));
    Inspected {
        text: text.clone(),
        file: report.declaration.path.display().to_string(),
        identity: report.declaration.identity.clone(),
        inspection: report.declaration.inspection.clone(),
        class: report.class.name.clone(),
        decision: report.decision.words().to_string(),
        result: super::verify::result_of(&document),
        report: document,
    }
}

/// The rulebook's files as read for its fingerprint.
fn rulebook_bytes(path: &Path) -> Result<RulebookBytes, Failure> {
    let mut sources = SourceMap::default();
    let (files, problems) = crate::parse::includes::read_rulebook(path, &mut sources);
    if files.files.is_empty() {
        return Err(Failure::new(problems, sources));
    }
    let parts = crate::digest::rulebook_parts(&files, &sources);
    Ok(RulebookBytes {
        fingerprint: crate::digest::rulebook_sha256(&files, &sources),
        files: parts
            .into_iter()
            .map(|(name, bytes)| (name, bytes.to_vec()))
            .collect(),
    })
}

impl Recorded {
    /// What the log's notes add to the report, written after its engines (and the text
    /// field table) and before an HTML page's end: a closing section in text and Markdown, a
    /// section in the HTML page. The JSON document is left as its schema fixes it; `season
    /// history` gives the same flags as JSON.
    pub fn closing(&self, format: CheckFormat) -> String {
        match format {
            CheckFormat::Json => String::new(),
            CheckFormat::Text => format!("\n{}", self.text("")),
            CheckFormat::Markdown => format!("\n## Season log\n\n{}", self.text("- ")),
            CheckFormat::Html => {
                let lines: String = self
                    .text("")
                    .lines()
                    .map(|l| format!("<li>{}</li>", crate::report::html::escape(l)))
                    .collect();
                format!("<section class=\"season\"><h2>Season log</h2><ul>{lines}</ul></section>\n")
            }
        }
    }

    fn text(&self, bullet: &str) -> String {
        let mut lines = vec![format!(
            "{bullet}recorded in {}: {}",
            self.log,
            match self.sequence {
                Some((a, b)) if a == b => format!("inspection #{a}"),
                Some((a, b)) => format!("inspections #{a} to #{b}"),
                None => "no inspection".to_string(),
            }
        )];
        for (engine, previous, changes) in &self.flagged {
            lines.extend(
                flag_lines(engine, *previous, changes)
                    .into_iter()
                    .map(|l| format!("{bullet}{l}")),
            );
        }
        lines.join("\n") + "\n"
    }
}

/// The lines that flag an engine's seals and sealed measurements against inspection
/// `previous`.
pub fn flag_lines(engine: &str, previous: i64, changes: &Changes) -> Vec<String> {
    let mut lines = Vec::new();
    for m in &changes.seal_mismatches {
        let place = m
            .place
            .as_deref()
            .map(|p| format!(" ({p})"))
            .unwrap_or_default();
        let line = match (&m.applied, &m.found) {
            (Some(a), Some(f)) => {
                format!("SEAL MISMATCH {engine}{place}: found {f}, #{previous} applied {a}")
            }
            (Some(a), None) => {
                format!("SEAL MISSING {engine}{place}: {a} applied at #{previous} not found")
            }
            (None, Some(f)) => {
                format!("SEAL UNKNOWN {engine}{place}: found {f}, not applied at #{previous}")
            }
            (None, None) => continue,
        };
        lines.push(line);
    }
    for (label, before, after) in &changes.sealed_moved {
        lines.push(format!(
            "SEALED MEASUREMENT MOVED {engine}: {label} {before} at #{previous}, now {after}"
        ));
    }
    lines
}
