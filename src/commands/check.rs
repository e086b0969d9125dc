//! `gonogo check`: declarations checked against a class of a rulebook, reported as text, JSON,
//! HTML or Markdown. The field is walked lazily and checked in batches of [`BATCH`]
//! declarations, each batch's reports written into the document as they come, so memory does
//! not grow with the field; the document reaches its destination only when every declaration
//! has loaded, so bad input gives its diagnostics and exit 2, never half a report.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::sync::Arc;

use super::{Failure, ProblemSet, checked_rulebook};
use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::evaluate::check_engine_scoped;
use crate::evaluate::montecarlo::{self, Draws, Settings};
use crate::evaluate::outcome::EngineReport;
use crate::exit::Exit;
use crate::load::{Declaration, LoadError, LoadProblem, load_declaration};
use crate::parallel;
use crate::parse::ast::DecisionRule;
use crate::report::document::{Document, Layout, Rendered};
use crate::season::hook::inspected;
use crate::season::record::Staging;
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
    /// The declaration files and folders named, walked as [`super::field::walk`] walks them
    /// (each file once, folders' files sorted), one batch at a time.
    pub declarations: &'a [PathBuf],
    /// Where what the walk of the folders left out is said (see [`super::field::Field::notes`]),
    /// once the walk is done; `None` drops it.
    pub notes: Option<&'a (dyn Fn(&str) + Sync)>,
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
    in_memory(|out| run_to(request, out))
}

/// Runs `check --record LOG`: as [`run`], and every engine checked is appended to the season
/// log in one transaction ([`crate::season::record`]); the report then carries what the log
/// shows of each engine's seals and sealed measurements. Nothing is recorded when any
/// declaration could not be read.
pub fn run_recording(request: &CheckRequest, log: &Path) -> Result<(String, Exit), Failure> {
    in_memory(|out| run_recording_to(request, log, out))
}

/// Runs `check`, writing the report to `out` one batch of engines at a time, so memory does
/// not grow with the field (see [`Document`]); the exit status, or every problem of every
/// declaration. On a failure `out` holds part of a report: give it a spool that is thrown
/// away unless this succeeds ([`crate::output::Pending`]).
pub fn run_to(request: &CheckRequest, out: &mut dyn Write) -> Result<Exit, Failure> {
    run_with(request, None, out)
}

/// [`run_recording`], writing to `out` as [`run_to`] does. What the log keeps of each engine
/// (its declaration, report and identity) is staged in a spool as it is checked and recorded
/// at the end of the run in one transaction, so memory does not grow with the field here
/// either.
pub fn run_recording_to(
    request: &CheckRequest,
    log: &Path,
    out: &mut dyn Write,
) -> Result<Exit, Failure> {
    run_with(request, Some(log), out)
}

/// A run's report gathered in memory.
fn in_memory(
    run: impl FnOnce(&mut dyn Write) -> Result<Exit, Failure>,
) -> Result<(String, Exit), Failure> {
    let mut out = Vec::new();
    let exit = run(&mut out)?;
    // every layout writes only strings, so the bytes are UTF-8
    Ok((String::from_utf8_lossy(&out).into_owned(), exit))
}

/// Declarations loaded, checked and rendered together: enough to keep every thread busy,
/// few enough that a batch's declarations and reports stay small whatever the field.
pub const BATCH: usize = 128;

/// A declaration read, the position of its class, and its text as read.
type Loaded = (Declaration, usize, Arc<str>);

fn run_with(
    request: &CheckRequest,
    log: Option<&Path>,
    out: &mut dyn Write,
) -> Result<Exit, Failure> {
    let rulebook = checked_rulebook(request.rules)?;
    let mut walk = super::field::Walk::new(request.declarations);
    let progress = Progress::default();
    let mut field = Field::new(request, log.is_some());
    loop {
        let mut batch = Vec::with_capacity(BATCH);
        for next in walk.by_ref().take(BATCH) {
            match next {
                Ok(path) => batch.push(path),
                Err(problem) => field.failures.extend(Failure::one(problem).0),
            }
        }
        if batch.is_empty() {
            break;
        }
        field.batch(&rulebook, &batch, &progress)?;
    }
    progress.finish();
    if let Some(say) = request.notes {
        walk.notes().iter().for_each(|note| say(note));
    }
    field.finish(log, out)
}

/// A run's state as its batches go by: the document so far, or the problems found.
struct Field<'r> {
    request: &'r CheckRequest<'r>,
    threads: usize,
    layout: Layout,
    document: Document,
    exit: Exit,
    /// Every problem of every declaration that could not be read.
    failures: Vec<ProblemSet>,
    /// The first engine whose scope names no rule (C66).
    scope: Option<Problem>,
    /// What the log will keep of each engine, staged, when recording.
    kept: Option<Staging>,
}

impl<'r> Field<'r> {
    fn new(request: &'r CheckRequest<'r>, recording: bool) -> Field<'r> {
        let layout = layout(request.format);
        let groups = match request.sort {
            CheckSort::File => 1,
            CheckSort::Result => 3,
        };
        Field {
            request,
            threads: parallel::threads(request.jobs),
            layout,
            document: Document::new(layout, groups),
            exit: Exit::Clean,
            failures: Vec::new(),
            scope: None,
            kept: recording.then(|| crate::season::hook::staging(request)),
        }
    }

    /// Loads a batch of declarations; when every declaration so far has loaded, checks them
    /// and adds them to the document. After a problem the rest are only loaded, so every
    /// declaration's problems are reported together.
    fn batch(
        &mut self,
        rulebook: &CheckedRulebook,
        paths: &[PathBuf],
        progress: &Progress,
    ) -> Result<(), Failure> {
        let request = self.request;
        let loaded = parallel::map(paths, self.threads, |path| {
            let mut sources = SourceMap::default();
            let engine = load_with_class(path, rulebook, request.class, &mut sources)
                .map(|(d, class)| (d, class, sources.file(0).text.clone()))
                .map_err(|problems| Failure::new(problems, sources));
            progress.advance();
            engine
        });
        let mut engines: Vec<Loaded> = Vec::with_capacity(loaded.len());
        for engine in loaded {
            match engine {
                Ok(engine) => engines.push(engine),
                Err(failure) => self.failures.extend(failure.0),
            }
        }
        if self.failures.is_empty() && self.scope.is_none() {
            self.check(rulebook, &engines)?;
        }
        Ok(())
    }

    /// Checks a batch of loaded declarations and adds their reports to the document.
    fn check(&mut self, rulebook: &CheckedRulebook, engines: &[Loaded]) -> Result<(), Failure> {
        let request = self.request;
        let decision = request.role.map(Role::decision);
        let mut reports: Vec<EngineReport> =
            parallel::map(engines, self.threads, |(declaration, class, _)| {
                let class = &rulebook.classes[*class];
                check_engine_scoped(rulebook, class, declaration, decision, request.sections)
            });
        if let Some(problem) = reports.iter().find_map(scope_problem) {
            self.scope = Some(problem);
            return Ok(());
        }
        for report in &mut reports {
            report.produced = Some(request.produced.clone());
        }
        if let Some((draws, seed)) = request.monte_carlo {
            let settings = Settings {
                draws,
                seed,
                threads: self.threads,
            };
            reports
                .iter_mut()
                .for_each(|r| montecarlo::attach(r, &settings));
        }
        if let Some(kept) = &mut self.kept {
            for (report, (_, _, text)) in reports.iter().zip(engines) {
                kept.add(&inspected(report, text))
                    .map_err(|e| Failure::one(crate::output::spool_failed(&e)))?;
            }
        }
        let layout = self.layout;
        let rendered = parallel::map(&reports, self.threads, |r| Rendered::new(layout, r));
        for (report, engine) in reports.iter().zip(rendered) {
            self.exit = worse(self.exit, report.exit());
            let group = group_of(report, request.sort);
            self.document
                .add(group, engine)
                .map_err(|e| Failure::one(crate::output::spool_failed(&e)))?;
        }
        Ok(())
    }

    /// The document written out, with the season log's notes when recording; or every
    /// problem found, and nothing recorded.
    fn finish(mut self, log: Option<&Path>, out: &mut dyn Write) -> Result<Exit, Failure> {
        if !self.failures.is_empty() {
            return Err(Failure(self.failures));
        }
        if let Some(problem) = self.scope {
            return Err(Failure::one(problem));
        }
        let closing = match (log, &mut self.kept) {
            (Some(log), Some(kept)) => {
                let recorded = crate::season::hook::run_check(log, self.request, kept)?;
                recorded.closing(self.request.format)
            }
            _ => String::new(),
        };
        self.document
            .finish(out, &closing)
            .map_err(|e| Failure::one(crate::output::spool_failed(&e)))?;
        Ok(self.exit)
    }
}

/// The layout of a format.
fn layout(format: CheckFormat) -> Layout {
    match format {
        CheckFormat::Text => Layout::Text,
        CheckFormat::Json => Layout::Json,
        CheckFormat::Html => Layout::Html,
        CheckFormat::Markdown => Layout::Markdown,
    }
}

/// The document group an engine's report goes to under `--sort`: one group in file order;
/// illegal, then not all clear, then legal engines by result. Each group keeps file order,
/// whatever the thread count.
fn group_of(report: &EngineReport, sort: CheckSort) -> usize {
    use crate::evaluate::outcome::EngineResult;
    match sort {
        CheckSort::File => 0,
        CheckSort::Result => match report.result() {
            EngineResult::Illegal => 0,
            EngineResult::NotAllClear => 1,
            EngineResult::Legal => 2,
        },
    }
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

/// A count of the declarations read on standard error for long runs, only when standard
/// error is a terminal (never in pipes or CI); it appears once a run reaches
/// [`Progress::LONG_RUN`] declarations (the walk does not count the field beforehand).
#[derive(Default)]
struct Progress {
    read: std::sync::atomic::AtomicUsize,
    bar: std::sync::OnceLock<Option<indicatif::ProgressBar>>,
}

impl Progress {
    /// Declarations from which a run counts as long.
    const LONG_RUN: usize = 200;

    fn advance(&self) {
        use std::sync::atomic::Ordering;
        let read = self.read.fetch_add(1, Ordering::Relaxed) + 1;
        if read < Self::LONG_RUN {
            return;
        }
        if let Some(bar) = self.bar.get_or_init(Self::bar) {
            bar.set_position(read as u64);
        }
    }

    /// The counter, when standard error is a terminal outside CI.
    fn bar() -> Option<indicatif::ProgressBar> {
        use std::io::IsTerminal;
        if !std::io::stderr().is_terminal() || std::env::var_os("CI").is_some() {
            return None;
        }
        let style =
            indicatif::ProgressStyle::with_template("{spinner} {pos} declarations read").ok()?;
        Some(indicatif::ProgressBar::new_spinner().with_style(style))
    }

    fn finish(&self) {
        if let Some(Some(bar)) = self.bar.get() {
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
