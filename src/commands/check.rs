//! `gonogo check`: declarations checked against a class of a rulebook, reported as text or
//! JSON. Every declaration is loaded before anything is written, so bad input gives its
//! diagnostics and exit 2, never half a report.

use std::path::{Path, PathBuf};
use std::sync::Arc;

use super::{Failure, checked_rulebook};
use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::evaluate::check_engine_scoped;
use crate::evaluate::montecarlo::{self, Draws, Settings};
use crate::evaluate::outcome::EngineReport;
use crate::exit::Exit;
use crate::load::{Declaration, LoadError, LoadProblem, load_declaration};
use crate::parallel;
use crate::parse::ast::DecisionRule;
use crate::report::{json, text};
use crate::source::SourceMap;
use crate::suggest::find_class;

/// Who is asking, which sets the decision rule.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum Role {
    /// Guarded rejection: illegal only on a proven fail.
    Inspector,
    /// Guarded acceptance: legal only on a proven pass.
    Builder,
    /// Simple acceptance: the measured value alone decides.
    Simple,
}

impl Role {
    /// The decision rule this role applies.
    pub fn decision(self) -> DecisionRule {
        match self {
            Role::Inspector => DecisionRule::GuardedRejection,
            Role::Builder => DecisionRule::GuardedAcceptance,
            Role::Simple => DecisionRule::SimpleAcceptance,
        }
    }
}

/// Output formats of `check`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum CheckFormat {
    /// The text report.
    Text,
    /// One JSON document (schema `gonogo.check/2`).
    Json,
    /// A self-contained, printable tech sheet.
    Html,
    /// The tech sheet's content in Markdown.
    Markdown,
}

/// The order of the engines in a `check` report.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum CheckSort {
    /// As the declarations were named (folders in path order).
    #[default]
    File,
    /// Illegal engines first, then those not all clear, then legal ones; file order within
    /// each group.
    Result,
}

/// What `check` was asked to do.
pub struct CheckRequest<'a> {
    /// The rulebook.
    pub rules: &'a Path,
    /// A class for every declaration, instead of each declaration's own.
    pub class: Option<&'a str>,
    /// A decision rule instead of the rulebook's.
    pub role: Option<Role>,
    /// Output format.
    pub format: CheckFormat,
    /// The declarations.
    pub declarations: &'a [PathBuf],
    /// Threads to use; every core when `None`.
    pub jobs: Option<usize>,
    /// A Monte Carlo check of every numeric rule (`--monte-carlo`): how many draws, and the
    /// seed; `None` without one.
    pub monte_carlo: Option<(Draws, u64)>,
    /// When the report is produced (RFC 3339, UTC), as its provenance states:
    /// [`crate::report::provenance::produced_now`] for a user's run, a fixed time in tests.
    pub produced: String,
    /// The order of the engines in the report (`--sort`).
    pub sort: CheckSort,
    /// The sections inspected (`--sections`), in place of each declaration's own scope;
    /// `None` leaves each declaration's (every rule when it states none).
    pub sections: Option<&'a [String]>,
}

/// Runs `check`: the report and the exit status, or every problem of every declaration.
pub fn run(request: &CheckRequest) -> Result<(String, Exit), Failure> {
    run_with(request, None)
}

/// Runs `check --record LOG`: as [`run`], and every engine checked is appended to the season
/// log in one transaction ([`crate::season::record`]); the report then carries what the log
/// shows of each engine's seals and sealed measurements. Nothing is recorded when any
/// declaration could not be read.
pub fn run_recording(request: &CheckRequest, log: &Path) -> Result<(String, Exit), Failure> {
    run_with(request, Some(log))
}

/// A declaration read, the position of its class, and its text as read.
type Loaded = (Declaration, usize, Arc<str>);

fn run_with(request: &CheckRequest, log: Option<&Path>) -> Result<(String, Exit), Failure> {
    let rulebook = checked_rulebook(request.rules)?;
    let paths = declaration_files(request.declarations).map_err(Failure::one)?;
    let threads = parallel::threads(request.jobs);
    let progress = Progress::new(paths.len());
    let loaded: Vec<Result<Loaded, Failure>> = parallel::map(&paths, threads, |path| {
        let mut sources = SourceMap::default();
        let engine = load_with_class(path, &rulebook, request.class, &mut sources)
            .map(|(d, class)| (d, class, sources.file(0).text.clone()))
            .map_err(|problems| Failure::new(problems, sources));
        progress.advance();
        engine
    });
    progress.finish();
    if loaded.iter().any(Result::is_err) {
        let sets = loaded
            .into_iter()
            .filter_map(Result::err)
            .flat_map(|f| f.0)
            .collect();
        return Err(Failure(sets));
    }
    let engines: Vec<Loaded> = loaded.into_iter().filter_map(Result::ok).collect();
    let decision = request.role.map(Role::decision);
    let mut reports: Vec<EngineReport> =
        parallel::map(&engines, threads, |(declaration, class, _)| {
            let class = &rulebook.classes[*class];
            check_engine_scoped(&rulebook, class, declaration, decision, request.sections)
        });
    if let Some(problem) = reports.iter().find_map(scope_problem) {
        return Err(Failure::one(problem));
    }
    reports
        .iter_mut()
        .for_each(|r| r.produced = Some(request.produced.clone()));
    if let Some((draws, seed)) = request.monte_carlo {
        let settings = Settings {
            draws,
            seed,
            threads,
        };
        reports
            .iter_mut()
            .for_each(|r| montecarlo::attach(r, &settings));
    }
    let texts: Vec<&str> = engines.iter().map(|(_, _, t)| &**t).collect();
    let (reports, texts) = sorted(reports, texts, request.sort);
    let exit = reports
        .iter()
        .map(EngineReport::exit)
        .fold(Exit::Clean, worse);
    let out = match request.format {
        CheckFormat::Json => json::document(&reports),
        CheckFormat::Html => crate::report::html::page(&reports),
        CheckFormat::Markdown => crate::report::markdown::document(&reports),
        CheckFormat::Text => {
            let mut out: Vec<String> = parallel::map(&reports, threads, text::engine);
            if reports.len() > 1 {
                out.push(text::field_summary(&reports));
            }
            out.join("\n")
        }
    };
    let out = match log {
        Some(log) => {
            let season = crate::season::hook::run_check(log, request, &reports, &texts)?;
            season.attach(out, request.format)
        }
        None => out,
    };
    Ok((out, exit))
}

/// The reports, with the declaration texts they came from, in the order `--sort` asks for;
/// the sort is stable, so file order holds within each group whatever the thread count.
fn sorted<'e, 't>(
    reports: Vec<EngineReport<'e>>,
    texts: Vec<&'t str>,
    sort: CheckSort,
) -> (Vec<EngineReport<'e>>, Vec<&'t str>) {
    use crate::evaluate::outcome::EngineResult;
    let mut pairs: Vec<(EngineReport, &str)> = reports.into_iter().zip(texts).collect();
    if sort == CheckSort::Result {
        pairs.sort_by_key(|(r, _)| match r.result() {
            EngineResult::Illegal => 0,
            EngineResult::NotAllClear => 1,
            EngineResult::Legal => 2,
        });
    }
    pairs.into_iter().unzip()
}

/// C66 when a section of the engine's scope names no rule of its class: a mistyped section
/// would otherwise inspect nothing and call the engine legal.
fn scope_problem(report: &EngineReport) -> Option<Problem> {
    let scope = report.scope.as_ref()?;
    let sections: Vec<&str> = report.outcomes.iter().map(|o| o.section()).collect();
    let unmatched = scope.unmatched(&sections);
    let first = unmatched.first()?;
    let message = format!(
        "section {first} of the scope ({}) names no rule of class {} for {}",
        scope.from.words(),
        report.class.name,
        report.declaration.path.display()
    );
    let help = format!(
        "give the section of a rule or of a part above one; the class's rules are {}",
        sections.join(", ")
    );
    Some(Problem::unlocated(crate::diagnostic::codes::check::BAD_SECTIONS, message).with_help(help))
}

/// A progress bar on standard error for long runs, only when standard error is a terminal
/// (never in pipes or CI) and colour is not turned off.
struct Progress(Option<indicatif::ProgressBar>);

impl Progress {
    /// Declarations from which a run counts as long.
    const LONG_RUN: usize = 200;

    fn new(total: usize) -> Progress {
        use std::io::IsTerminal;
        let show = total >= Self::LONG_RUN
            && std::io::stderr().is_terminal()
            && std::env::var_os("CI").is_none();
        Progress(show.then(|| indicatif::ProgressBar::new(total as u64)))
    }

    fn advance(&self) {
        if let Some(bar) = &self.0 {
            bar.inc(1);
        }
    }

    fn finish(&self) {
        if let Some(bar) = &self.0 {
            bar.finish_and_clear();
        }
    }
}

/// The declarations named, each file once, folders walked (see [`super::field`]).
pub(super) fn declaration_files(named: &[PathBuf]) -> Result<Vec<PathBuf>, Problem> {
    super::field::walk(named).map(|field| field.files)
}

/// A declaration and the position of the class it is checked against: dated on or after the
/// edition, its class found as `check` finds it (shared by `headroom`).
pub(super) fn load_with_class(
    path: &Path,
    rulebook: &CheckedRulebook,
    class: Option<&str>,
    sources: &mut SourceMap,
) -> Result<(Declaration, usize), Vec<Problem>> {
    let declaration = load_declaration(path, rulebook, sources)?;
    let refuse = |error: LoadError| vec![LoadProblem::unlocated(error).problem()];
    if let Some(date) = declaration.identity.date
        && date < rulebook.effective
    {
        return Err(refuse(LoadError::BeforeEdition {
            file: path.to_path_buf(),
            date,
            edition: rulebook.edition.clone(),
            effective: rulebook.effective,
        }));
    }
    let (at, _) = class_of(path, &declaration, rulebook, class).map_err(refuse)?;
    Ok((declaration, at))
}

/// The class a declaration is checked against: `--class`, else the one it names.
pub(super) fn class_of<'r>(
    path: &Path,
    declaration: &Declaration,
    rulebook: &'r CheckedRulebook,
    class: Option<&str>,
) -> Result<(usize, &'r crate::check::model::Class), LoadError> {
    let name = class
        .or(declaration.identity.class.as_deref())
        .ok_or_else(|| LoadError::NoClass {
            file: path.to_path_buf(),
        })?;
    find_class(rulebook, name).map_err(LoadError::UnknownClass)
}

/// The more serious of two exit statuses: illegal, then uncertain, then clean.
fn worse(a: Exit, b: Exit) -> Exit {
    let rank = |e: Exit| match e {
        Exit::Clean => 0,
        Exit::Uncertain => 1,
        Exit::Illegal => 2,
        Exit::BadInput => 3,
    };
    if rank(b) > rank(a) { b } else { a }
}
