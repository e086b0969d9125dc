//! `gonogo impact`: a field of engines checked under two sides (an edition on a date, perhaps
//! with a draft bulletin); whose verdicts change.

use crate::diagnostic::codes;
use std::path::PathBuf;

use super::Failure;
use super::check::{Role, class_of, declaration_files};
use super::sides::{SideRequest, Sides, load_sides};
use crate::analyze::compare::When;
use crate::analyze::impact::{Engine, impact};
use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::load::{Declaration, LoadProblem, declaration_from_text, load_declaration};
use crate::report::impact::{Heading, ImpactFormat, render};
use crate::season::schema::{Log, Mode};
use crate::source::SourceMap;

/// What `impact` was asked.
pub struct ImpactRequest<'a> {
    /// The old edition.
    pub old: &'a std::path::Path,
    /// The new edition.
    pub new: &'a std::path::Path,
    /// Declarations and folders of them, already walked.
    pub declarations: &'a [PathBuf],
    /// A season log whose recorded declarations join the field (each engine's latest).
    pub log: Option<&'a std::path::Path>,
    /// Whose decision rule, when not the rulebook's.
    pub role: Option<Role>,
    /// The dates each edition is taken on, and a draft bulletin.
    pub sides: SideRequest<'a>,
    /// Every row, not only the engines that became illegal or close.
    pub all: bool,
    /// The output format.
    pub format: ImpactFormat,
}

/// The declarations of a field, each read under both editions, and the files that could not
/// be (with why). The one place the field is gathered.
pub type Field = (
    Vec<(Declaration, Declaration, String)>,
    Vec<(String, String)>,
);

/// The impact report, or the problems when nothing could be compared (exit 2).
pub fn run(request: &ImpactRequest) -> Result<String, Failure> {
    let sides = load_sides(request.old, request.new, request.sides)?;
    let (old_book, new_book) = (&sides.old.book, &sides.new.book);
    let (loaded, unreadable) = gather_field(request.declarations, request.log, old_book, new_book)?;
    if loaded.is_empty() {
        let list: Vec<String> = unreadable
            .iter()
            .map(|(f, w)| format!("{f}: {w}"))
            .collect();
        let problem = Problem::unlocated(
            codes::analyze::NOTHING_TO_COMPARE,
            "no declaration could be compared under both editions",
        )
        .with_help(if list.is_empty() {
            "name declaration files or folders that hold some".to_string()
        } else {
            list.join("\n")
        });
        return Err(Failure::one(problem));
    }
    let engines: Vec<Engine> = loaded
        .iter()
        .map(|(o, n, c)| Engine {
            old: o,
            new: n,
            class: c,
        })
        .collect();
    let decision = request.role.map(Role::decision);
    let result = impact(
        (old_book, sides.old.when),
        (new_book, sides.new.when),
        &engines,
        decision,
    );
    let (old_label, new_label) = labels(&sides);
    let heading = Heading {
        series: &new_book.series,
        old: &old_label,
        new: &new_label,
        decision: decision.unwrap_or(new_book.decision).words(),
        all: request.all,
    };
    Ok(render(&heading, &result, &unreadable, request.format))
}

/// Every declaration named, then each engine's latest declaration recorded in the season log,
/// read under both editions.
fn gather_field(
    named: &[PathBuf],
    log: Option<&std::path::Path>,
    old: &CheckedRulebook,
    new: &CheckedRulebook,
) -> Result<Field, Failure> {
    let files = declaration_files(named).map_err(Failure::one)?;
    let mut loaded = Vec::new();
    let mut unreadable = Vec::new();
    for path in &files {
        match load_both(path, None, old, new) {
            Ok(both) => loaded.push(both),
            Err(why) => unreadable.push((path.display().to_string(), why)),
        }
    }
    for (path, text) in log.map(recorded).transpose()?.into_iter().flatten() {
        match text.and_then(|t| load_both(&path, Some(t), old, new)) {
            Ok(both) => loaded.push(both),
            Err(why) => unreadable.push((path.display().to_string(), why)),
        }
    }
    Ok((loaded, unreadable))
}

/// A recorded declaration: its name, and its text or why it is not text.
type Recorded = (PathBuf, Result<String, String>);

/// Each engine's latest recorded declaration, named `LOG#SEQ (FILE)`, with its stored text
/// (or why it is not text).
fn recorded(log: &std::path::Path) -> Result<Vec<Recorded>, Failure> {
    let opened = Log::open(log, Mode::Existing).map_err(Failure::one)?;
    let latest = opened.latest_of_each_engine().map_err(Failure::one)?;
    let mut field = Vec::with_capacity(latest.len());
    for stored in latest {
        let name = format!("{}#{} ({})", log.display(), stored.seq, stored.entry.file);
        let bytes = opened
            .blob(&stored.entry.declaration)
            .map_err(Failure::one)?;
        let text = String::from_utf8(bytes)
            .map_err(|_| "the recorded declaration is not UTF-8 text".to_string());
        field.push((PathBuf::from(name), text));
    }
    Ok(field)
}

/// `edition 2027 with its bulletins`, `edition 2027 on 2027-07-01 with draft TVB-27-09`.
fn labels(sides: &Sides) -> (String, String) {
    let side = |book: &CheckedRulebook, when: When| match when {
        When::Published => format!("edition {} as published", book.edition),
        When::Latest if book.bulletins.is_empty() => format!("edition {}", book.edition),
        When::Latest => format!("edition {} with its bulletins", book.edition),
        When::On(d) => format!("edition {} on {d}", book.edition),
    };
    let mut new = side(&sides.new.book, sides.new.when);
    if let Some(d) = &sides.draft {
        new.push_str(&format!(" with draft {}", d.ids.join(", ")));
    }
    (side(&sides.old.book, sides.old.when), new)
}

/// Every problem of a declaration on one line each, with its line and column and code:
/// `15:40 \`bore\` is a length, … (D22 wrong-dimension)`.
fn every_problem(problems: &[Problem], sources: &SourceMap) -> String {
    if problems.is_empty() {
        return "the declaration could not be read".to_string();
    }
    let lines: Vec<String> = problems
        .iter()
        .map(|p| {
            let at = p.primary_span().map(|span| {
                let (line, column) = sources.file(span.file).line_column(span.start);
                format!("{line}:{column} ")
            });
            format!("{}{} ({})", at.unwrap_or_default(), p.message, p.code)
        })
        .collect();
    lines.join("; ")
}

/// The declaration read against each edition's schema, and its class (in both editions),
/// found as `check` finds it. It is not dated against the editions: the field is checked
/// under each edition as published, whatever season its declarations were measured in.
/// `text` is the declaration's when it does not come from the file (a recorded one).
fn load_both(
    path: &std::path::Path,
    text: Option<String>,
    old: &CheckedRulebook,
    new: &CheckedRulebook,
) -> Result<(Declaration, Declaration, String), String> {
    let mut sources = SourceMap::default();
    let read = |book: &CheckedRulebook, sources: &mut SourceMap| match &text {
        Some(t) => declaration_from_text(path, t.clone(), book, sources),
        None => load_declaration(path, book, sources),
    };
    let o = read(old, &mut sources).map_err(|p| every_problem(&p, &sources))?;
    let n = read(new, &mut sources).map_err(|p| every_problem(&p, &sources))?;
    let (_, found) = class_of(path, &n, new, None)
        .map_err(|e| every_problem(&[LoadProblem::unlocated(e).problem()], &sources))?;
    let class = found.name.clone();
    if old.class(&class).is_none() {
        return Err(format!("class `{class}` is not in edition {}", old.edition));
    }
    Ok((o, n, class))
}
