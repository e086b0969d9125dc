//! The `gonogo` command line: argument parsing and dispatch to [`gonogo::commands`].

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{CommandFactory, FromArgMatches, Parser, Subcommand, ValueEnum};
use gonogo::color::{self, ColorChoice, Stream};
use gonogo::commands::check::{self, CheckFormat, CheckRequest, CheckSort, Role};
use gonogo::commands::sheet::{self, SheetFormat};
use gonogo::commands::{Failure, diff, explain, field, fmt, headroom, impact, lint, season, units};
use gonogo::diagnostic::{Problem, RenderStyle, codes};
use gonogo::evaluate::montecarlo::{self, Draws};
use gonogo::exit::Exit;
use gonogo::output::{Destination, to_stderr};
use gonogo::report::diff::DiffFormat;
use gonogo::report::headroom::HeadroomFormat;
use gonogo::report::impact::ImpactFormat;
use gonogo::report::units::UnitsFormat;
use gonogo::season::show::{HistoryFormat, ListFormat};

/// Stack for the worker thread: deep but bounded syntax trees are walked recursively.
const STACK_BYTES: usize = 256 * 1024 * 1024;

/// gonogo checks racing engines against a series' class rules.
#[derive(Parser)]
#[command(name = "gonogo", version, about, long_about = None)]
struct Cli {
    /// Write the output to this file instead of standard output (`-` is standard output).
    /// A file is written beside its final place and renamed into it, so it is never left
    /// half-written, and keeps its mode; a link is written through to its file; a device or
    /// FIFO is written directly. A file the run reads and a read-only file are refused.
    #[arg(long, global = true, value_name = "FILE")]
    output: Option<PathBuf>,
    /// When to colour diagnostics and help: auto follows the destination and NO_COLOR,
    /// CLICOLOR, CLICOLOR_FORCE and TERM (a file named by --output is never coloured in auto);
    /// always and never override them.
    #[arg(long, global = true, value_enum, default_value_t = ColorChoice::Auto, value_name = "WHEN")]
    color: ColorChoice,
    #[command(subcommand)]
    command: Command,
}

/// The dates each edition is taken on, and a draft bulletin (`diff`, `impact`).
#[derive(clap::Args, Clone, Debug, Default)]
struct SideArgs {
    /// Take both editions on this date: each with the bulletins in force by then.
    #[arg(long, value_name = "DATE")]
    on: Option<String>,
    /// Take the old edition on this date (default: with every bulletin it has, or as
    /// published when both are one edition).
    #[arg(long, value_name = "DATE")]
    old_on: Option<String>,
    /// Take the new edition on this date (default: as published, or on a draft's date).
    #[arg(long, value_name = "DATE")]
    new_on: Option<String>,
    /// Add this draft bulletin (a file of `bulletin … end` items) to the new edition.
    #[arg(long, value_name = "FILE")]
    with_bulletin: Option<PathBuf>,
}

impl SideArgs {
    /// The request, `--on` standing for whichever of `--old-on` and `--new-on` is not given.
    fn request(&self) -> gonogo::commands::sides::SideRequest<'_> {
        gonogo::commands::sides::SideRequest {
            old_on: self.old_on.as_deref().or(self.on.as_deref()),
            new_on: self.new_on.as_deref().or(self.on.as_deref()),
            draft: self.with_bulletin.as_deref(),
        }
    }
}

#[derive(Subcommand)]
enum Command {
    /// Check engine declarations against a class: a verdict for every rule, with its reasons.
    Check {
        /// The rulebook.
        #[arg(long)]
        rules: PathBuf,
        /// Check every declaration against this class instead of the one it names.
        #[arg(long)]
        class: Option<String>,
        /// Whose decision rule to apply: inspector (guarded rejection), builder (guarded
        /// acceptance) or simple (simple acceptance); the rulebook's by default.
        #[arg(long = "as", value_enum)]
        role: Option<Role>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = CheckFormat::Text)]
        format: CheckFormat,
        /// Threads for a field of declarations (every core by default; at least 1).
        #[arg(long, value_parser = clap::builder::RangedU64ValueParser::<usize>::new().range(1..))]
        jobs: Option<usize>,
        /// Check the propagation of uncertainty by Monte Carlo (JCGM 101) on every numeric
        /// rule: `--monte-carlo` alone draws adaptively until the results settle (at most
        /// 1 000 000 draws), `--monte-carlo=N` makes N draws.
        #[arg(long, value_name = "DRAWS", num_args = 0..=1, require_equals = true,
              value_parser = draws)]
        monte_carlo: Option<Option<usize>>,
        /// The seed of the Monte Carlo generator (2027 by default); the report prints it.
        #[arg(long, requires = "monte_carlo")]
        seed: Option<u64>,
        /// Append one inspection per engine checked to this season log (an SQLite file,
        /// created when missing), in one transaction; nothing is recorded when any
        /// declaration cannot be read.
        #[arg(long, value_name = "FILE")]
        record: Option<PathBuf>,
        /// The order of the engines: `file` (as named, the default) or `result` (illegal
        /// first, then not all clear, then legal; file order within each).
        #[arg(long, value_enum, default_value_t = CheckSort::File)]
        sort: CheckSort,
        /// Inspect only these sections, joined by commas (`--sections 5,6.2`: section 5 and
        /// 6.2 with everything under them); the other rules are reported as not in scope.
        /// Wins over the scope in a declaration's `inspection:` block.
        #[arg(long, value_name = "SECTIONS", value_delimiter = ',', value_parser = section)]
        sections: Option<Vec<String>>,
        /// Engine declarations (YAML), or folders of them (searched recursively).
        #[arg(required = true)]
        declarations: Vec<PathBuf>,
    },
    /// Run the static checks on rulebooks: names, units, dimensions, classes, limits.
    Lint {
        /// Rulebook files.
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = lint::LintFormat::Text)]
        format: lint::LintFormat,
    },
    /// Compare two editions rule by rule: added, dropped, tightened, loosened, changed.
    Diff {
        /// The old edition.
        old: PathBuf,
        /// The new edition.
        new: PathBuf,
        /// Only this class.
        #[arg(long)]
        class: Option<String>,
        #[command(flatten)]
        sides: SideArgs,
        /// Output format.
        #[arg(long, value_enum, default_value_t = DiffFormat::Text)]
        format: DiffFormat,
    },
    /// Check a field of engines under two editions and list the verdicts that change.
    ///
    /// Each edition is applied as published on its effective date, whatever the declarations'
    /// dates.
    Impact {
        /// The old edition.
        old: PathBuf,
        /// The new edition.
        new: PathBuf,
        /// Engine declarations, or folders of them (searched recursively).
        #[arg(required_unless_present = "log")]
        declarations: Vec<PathBuf>,
        /// A season log (`check --record`): each engine's latest recorded declaration joins
        /// the field, read from the bytes stored in the log.
        #[arg(long, value_name = "FILE")]
        log: Option<PathBuf>,
        /// Whose decision rule to apply (the new edition's by default).
        #[arg(long = "as", value_enum)]
        role: Option<Role>,
        #[command(flatten)]
        sides: SideArgs,
        /// List every engine, not only those that became illegal or close to a limit.
        #[arg(long)]
        all: bool,
        /// Output format.
        #[arg(long, value_enum, default_value_t = ImpactFormat::Text)]
        format: ImpactFormat,
    },
    /// For an official: one numeric rule swept over candidate limits across a field; how many
    /// engines each leaves legal, conditional and illegal.
    Sweep {
        /// The rulebook.
        #[arg(long)]
        rules: PathBuf,
        /// The class.
        #[arg(long)]
        class: String,
        /// The rule's section number.
        #[arg(long)]
        rule: String,
        /// The first candidate limit, in the unit the rule writes its limit in.
        #[arg(long, allow_negative_numbers = true)]
        from: f64,
        /// The last candidate limit.
        #[arg(long, allow_negative_numbers = true)]
        to: f64,
        /// How many candidates, evenly spaced, both ends included.
        #[arg(long, default_value_t = 11)]
        steps: usize,
        /// The share of the field, in per cent, the chosen candidate must keep legal.
        #[arg(long, default_value_t = 90.0)]
        keep: f64,
        /// Whose decision rule to apply (the rulebook's by default).
        #[arg(long = "as", value_enum)]
        role: Option<Role>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = gonogo::report::sweep::SweepFormat::Text)]
        format: gonogo::report::sweep::SweepFormat,
        /// Engine declarations, or folders of them (searched recursively).
        #[arg(required = true)]
        declarations: Vec<PathBuf>,
    },
    /// For a builder: the margin on each numeric rule, and how far each input may move before
    /// the limit is reached.
    Headroom {
        /// The rulebook.
        #[arg(long)]
        rules: PathBuf,
        /// Use this class instead of the one each declaration names.
        #[arg(long)]
        class: Option<String>,
        /// Whose decision rule to apply (it changes the findings shown, not the moves).
        #[arg(long = "as", value_enum)]
        role: Option<Role>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = HeadroomFormat::Text)]
        format: HeadroomFormat,
        /// Engine declarations, or folders of them.
        #[arg(required = true)]
        declarations: Vec<PathBuf>,
    },
    /// One rule in plain words: what it requires, what is measured, when it applies, where it
    /// is written and how the class came to have it.
    Explain {
        /// The rulebook.
        #[arg(long)]
        rules: PathBuf,
        /// Only this class (every class that has the rule otherwise).
        #[arg(long)]
        class: Option<String>,
        /// The rule's section number.
        section: String,
    },
    /// The blank measurement sheet of a class: Markdown to print, or a YAML template to fill in.
    Sheet {
        /// The rulebook.
        #[arg(long)]
        rules: PathBuf,
        /// The class.
        #[arg(long)]
        class: String,
        /// Output format.
        #[arg(long, value_enum, default_value_t = SheetFormat::Markdown)]
        format: SheetFormat,
    },
    /// Serve the Language Server Protocol on standard input and output, for editors:
    /// diagnostics as you type, hover, definition, references, completion, outline, format.
    Lsp,
    /// Read a season log back (made by `check --record`): list its inspections, show one
    /// engine's history, verify it, export its files.
    Season {
        #[command(subcommand)]
        action: SeasonAction,
    },
    /// Print a shell completion script (bash, zsh, fish, elvish or powershell).
    Completions {
        /// The shell.
        shell: clap_complete::Shell,
    },
    /// Print a manual page (roff), made from these same definitions: gonogo(1), or the page of
    /// one subcommand.
    Man {
        /// The subcommand whose page to print (gonogo-COMMAND(1)); the top page without one.
        #[arg(value_parser = clap::builder::PossibleValuesParser::new(gonogo::manual::page_names()))]
        command: Option<String>,
    },
    /// List every unit a rulebook or declaration may use, by dimension, with its factor to SI
    /// as a decimal and as an exact fraction.
    Units {
        /// Output format.
        #[arg(long, value_enum, default_value_t = UnitsFormat::Text)]
        format: UnitsFormat,
    },
    /// Print a rulebook in canonical form, its comments and blank lines kept; or check that
    /// rulebooks are in it (`--check`), or put it back in each file (`--write`).
    Fmt {
        /// The rulebook files (one, unless `--check` or `--write`).
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Print nothing but the files not in canonical form; exit 1 when there is one.
        #[arg(long, conflicts_with = "write")]
        check: bool,
        /// Write the canonical form back to each file not in it, atomically, keeping its mode.
        #[arg(long)]
        write: bool,
    },
}

/// What `season` does with a log.
#[derive(Subcommand)]
enum SeasonAction {
    /// The inspections recorded, in order, narrowed by any filter given.
    ///
    /// Example: gonogo season list season.sqlite --class street_stock --result illegal
    List {
        /// The season log.
        log: PathBuf,
        /// Only this engine.
        #[arg(long)]
        engine: Option<String>,
        /// Only this car number.
        #[arg(long)]
        car: Option<String>,
        /// Only this class.
        #[arg(long)]
        class: Option<String>,
        /// Only this event, exactly as declared.
        #[arg(long)]
        event: Option<String>,
        /// Only inspections on or after this date (YYYY-MM-DD).
        #[arg(long, value_name = "DATE")]
        from: Option<String>,
        /// Only inspections on or before this date (YYYY-MM-DD).
        #[arg(long, value_name = "DATE")]
        to: Option<String>,
        /// Only this result.
        #[arg(long, value_enum)]
        result: Option<SeasonResult>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = ListFormat::Table)]
        format: ListFormat,
    },
    /// Every inspection of one engine in order, the measurements that changed between them,
    /// seals that do not match and sealed measurements that moved.
    ///
    /// Example: gonogo season history season.sqlite TV-27-003 --format html
    History {
        /// The season log.
        log: PathBuf,
        /// The engine's identifier, as declared.
        engine: String,
        /// Output format.
        #[arg(long, value_enum, default_value_t = HistoryFormat::Text)]
        format: HistoryFormat,
    },
    /// Check the hash chain and every stored file, and check every inspection again with this
    /// gonogo; exit 1 when the chain is broken or any verdict would differ.
    ///
    /// Example: gonogo season verify season.sqlite
    Verify {
        /// The season log.
        log: PathBuf,
    },
    /// Write every stored declaration and rulebook into a folder; refused, writing nothing,
    /// when any of the files exists.
    ///
    /// Example: gonogo season export season.sqlite season-files
    Export {
        /// The season log.
        log: PathBuf,
        /// The folder to write into (created when missing).
        folder: PathBuf,
    },
}

/// A result a listing can be narrowed to.
#[derive(Clone, Copy, Debug, ValueEnum)]
enum SeasonResult {
    /// Every rule legal.
    Legal,
    /// At least one rule illegal.
    Illegal,
    /// Nothing illegal, but not every call clear.
    NotAllClear,
}

impl SeasonResult {
    /// The word stored in the log.
    fn word(self) -> &'static str {
        match self {
            SeasonResult::Legal => "legal",
            SeasonResult::Illegal => "illegal",
            SeasonResult::NotAllClear => "not-all-clear",
        }
    }
}

/// Runs one `season` action.
fn run_season(reply: &Reply, action: SeasonAction) -> Exit {
    let done =
        |result: Result<String, Failure>| reply.finish(result.map(|text| (text, Exit::Clean)));
    match action {
        SeasonAction::List {
            log,
            engine,
            car,
            class,
            event,
            from,
            to,
            result,
            format,
        } => {
            let filter = gonogo::season::query::Filter {
                engine,
                car,
                class,
                event,
                from,
                to,
                result: result.map(|r| r.word().to_string()),
            };
            done(season::list(&log, &filter, format))
        }
        SeasonAction::History {
            log,
            engine,
            format,
        } => done(season::history(&log, &engine, format)),
        SeasonAction::Verify { log } => reply.finish(season::verify(&log)),
        SeasonAction::Export { log, folder } => done(season::export(&log, &folder)),
    }
}

/// `--monte-carlo=N`: a whole number of draws, at least [`montecarlo::MIN_DRAWS`].
fn draws(text: &str) -> Result<usize, String> {
    let n: usize = text
        .parse()
        .map_err(|_| format!("`{text}` is not a whole number of draws"))?;
    if n < montecarlo::MIN_DRAWS {
        return Err(format!(
            "{n} draws are too few for a 95 % coverage interval; give at least {}",
            montecarlo::MIN_DRAWS
        ));
    }
    Ok(n)
}

/// One section of `--sections`: whole numbers joined by dots, as a declaration's scope.
fn section(text: &str) -> Result<String, String> {
    let written = text.trim();
    if gonogo::load::inspection::is_section_number(written) {
        return Ok(written.to_string());
    }
    Err(format!(
        "`{text}` is not a section number; give section numbers like 6.2, joined by commas \
         (`--sections 5,6.2`)"
    ))
}

/// The allocator: mimalloc, whose small allocations cost far less than the system's (a check
/// of a field spends about a third of its instructions allocating and freeing otherwise).
#[global_allocator]
static ALLOCATOR: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() -> ExitCode {
    // an interrupted run leaves no temporary file beside its --output: 130, as a shell reports
    // a process ended by Ctrl-C
    let _ = ctrlc::set_handler(|| gonogo::output::abandon(130));
    let parsed = gonogo::manual::with_help_notes(Cli::command())
        .try_get_matches()
        .and_then(|matches| Cli::from_arg_matches(&matches));
    let cli = match parsed {
        Ok(cli) => cli,
        Err(e) => return clap_message(&e).into(),
    };
    if let Command::Fmt {
        files,
        check: false,
        write: false,
    } = &cli.command
        && files.len() > 1
    {
        let e = Cli::command().error(
            clap::error::ErrorKind::TooManyValues,
            "`fmt` prints one file; name one, or add `--check` or `--write` for several",
        );
        return clap_message(&e).into();
    }
    let worker = std::thread::Builder::new()
        .stack_size(STACK_BYTES)
        .spawn(move || run(cli));
    match worker.map(|handle| handle.join()) {
        Ok(Ok(exit)) => exit.into(),
        _ => {
            to_stderr("gonogo: internal error\n");
            Exit::BadInput.into()
        }
    }
}

/// Prints clap's help, version or usage error where clap would, with every write checked:
/// help that cannot be written is exit 2, not a silent 0. The arguments were not parsed, so
/// `--color` is looked for in them directly.
fn clap_message(e: &clap::Error) -> Exit {
    let styled = e.render();
    let choice = color_in_raw_arguments(std::env::args_os());
    let stream = if e.use_stderr() {
        Stream::Stderr
    } else {
        Stream::Stdout
    };
    let text = if color::enabled(choice, stream) {
        styled.ansi().to_string()
    } else {
        styled.to_string()
    };
    if e.use_stderr() {
        to_stderr(&text);
        return Exit::BadInput;
    }
    match Destination::Stdout.write(&text) {
        Ok(()) => Exit::Clean,
        Err(problem) => Reply::new(&Destination::Stdout, choice).fail(Failure::one(problem)),
    }
}

/// The last `--color WHEN` or `--color=WHEN` before `--`, for messages about arguments that
/// did not parse; `auto` when there is none or it is not a choice.
fn color_in_raw_arguments(args: impl Iterator<Item = std::ffi::OsString>) -> ColorChoice {
    let args: Vec<String> = args
        .map(|a| a.to_string_lossy().into_owned())
        .take_while(|a| a != "--")
        .collect();
    let mut choice = ColorChoice::Auto;
    for (i, arg) in args.iter().enumerate() {
        let value = match arg.strip_prefix("--color") {
            Some("") => args.get(i + 1).map(String::as_str),
            Some(rest) => rest.strip_prefix('='),
            None => None,
        };
        if let Some(found) = value.and_then(|v| ColorChoice::from_str(v, false).ok()) {
            choice = found;
        }
    }
    choice
}

/// Says on standard error what a walk of the folders left out.
fn say_note(note: &str) {
    to_stderr(&format!("gonogo: note: {note}\n"));
}

/// Where a command's document and problems go, and how each is coloured.
struct Reply<'a> {
    /// Standard output or `--output`.
    output: &'a Destination,
    /// The `--color` choice.
    color: ColorChoice,
}

impl<'a> Reply<'a> {
    fn new(output: &'a Destination, color: ColorChoice) -> Reply<'a> {
        Reply { output, color }
    }

    /// How problems are rendered for `stream`: colour as [`color::enabled`] decides.
    fn style(&self, stream: Stream) -> RenderStyle {
        RenderStyle {
            colour: color::enabled(self.color, stream),
            width: 100,
        }
    }

    /// The stream the document goes to.
    fn document_stream(&self) -> Stream {
        match self.output {
            Destination::Stdout => Stream::Stdout,
            Destination::File(_) => Stream::File,
        }
    }

    /// Renders a command's problems on standard error (the one place diagnostics are
    /// rendered); exit 2.
    fn fail(&self, failure: Failure) -> Exit {
        to_stderr(&failure.render(self.style(Stream::Stderr)));
        Exit::BadInput
    }

    /// Writes a command's document with its exit status, or renders its problems; exit 2.
    fn finish(&self, result: Result<(String, Exit), Failure>) -> Exit {
        match result {
            Ok((text, exit)) => self.write(&text, exit),
            Err(failure) => self.fail(failure),
        }
    }

    /// A document the command writes as it goes: into a [`gonogo::output::Pending`], given to the
    /// destination only when the whole command succeeded, so a failure leaves it untouched.
    fn stream(&self, run: impl FnOnce(&mut dyn std::io::Write) -> Result<Exit, Failure>) -> Exit {
        let mut pending = match self.output.pending() {
            Ok(pending) => pending,
            Err(problem) => return self.fail(Failure::one(problem)),
        };
        match run(&mut pending) {
            Ok(exit) => match pending.commit() {
                Ok(()) => exit,
                Err(problem) => self.fail(Failure::one(problem)),
            },
            Err(failure) => self.fail(failure),
        }
    }

    /// Writes the document; a failed write is rendered and exit 2.
    fn write(&self, text: &str, exit: Exit) -> Exit {
        match self.output.write(text) {
            Ok(()) => exit,
            Err(problem) => self.fail(Failure::one(problem)),
        }
    }

    /// `lint`'s report: written as any document when it found no error. With errors no file
    /// is written: to standard output the report goes as before, while for `--output FILE`
    /// it goes to standard error instead, where the other commands' problems go, coloured
    /// for standard error.
    fn lint(&self, linted: &lint::Linted, format: lint::LintFormat) -> Exit {
        let exit = linted.exit();
        if exit != Exit::Clean && matches!(self.output, Destination::File(_)) {
            to_stderr(&linted.render(format, self.style(Stream::Stderr)));
            return exit;
        }
        let text = linted.render(format, self.style(self.document_stream()));
        self.write(&text, exit)
    }

    /// The declaration files of a field, each once; what the walk left out is noted on
    /// standard error. A folder that cannot be read or holds no declaration is rendered and
    /// refused.
    fn walk_field(&self, named: &[PathBuf]) -> Result<Vec<PathBuf>, Exit> {
        match field::walk(named) {
            Ok(found) => {
                for note in found.notes() {
                    say_note(&note);
                }
                Ok(found.files)
            }
            Err(problem) => Err(self.fail(Failure::one(problem))),
        }
    }
}

fn run(cli: Cli) -> Exit {
    let output = match Destination::resolve(cli.output.as_deref()) {
        Ok(destination) => destination,
        Err(problem) => {
            return Reply::new(&Destination::Stdout, cli.color).fail(Failure::one(problem));
        }
    };
    let reply = Reply::new(&output, cli.color);
    if let Err(problem) = stdin_at_most_once(&cli.command) {
        return reply.fail(Failure::one(problem));
    }
    let done =
        |result: Result<String, Failure>| reply.finish(result.map(|text| (text, Exit::Clean)));
    match cli.command {
        Command::Check {
            rules,
            class,
            role,
            format,
            jobs,
            monte_carlo,
            seed,
            record,
            sort,
            sections,
            declarations,
        } => {
            let draws = monte_carlo.map(|n| n.map_or(Draws::Adaptive, Draws::Fixed));
            let request = CheckRequest {
                rules: &rules,
                class: class.as_deref(),
                role,
                format,
                declarations: &declarations,
                notes: Some(&say_note),
                jobs,
                monte_carlo: draws.map(|d| (d, seed.unwrap_or(montecarlo::DEFAULT_SEED))),
                produced: gonogo::report::provenance::produced_now(),
                sort,
                sections: sections.as_deref(),
            };
            match record {
                Some(log) => reply.stream(|out| check::run_recording_to(&request, &log, out)),
                None => reply.stream(|out| check::run_to(&request, out)),
            }
        }
        Command::Lint { files, format } => reply.lint(&lint::run(&files), format),
        Command::Diff {
            old,
            new,
            class,
            sides,
            format,
        } => done(diff::run(
            &old,
            &new,
            class.as_deref(),
            sides.request(),
            format,
        )),
        Command::Impact {
            old,
            new,
            declarations,
            log,
            role,
            sides,
            all,
            format,
        } => {
            let Ok(declarations) = reply.walk_field(&declarations) else {
                return Exit::BadInput;
            };
            let request = impact::ImpactRequest {
                old: &old,
                new: &new,
                declarations: &declarations,
                log: log.as_deref(),
                role,
                sides: sides.request(),
                all,
                format,
            };
            done(impact::run(&request))
        }
        Command::Headroom {
            rules,
            class,
            role,
            format,
            declarations,
        } => {
            let Ok(declarations) = reply.walk_field(&declarations) else {
                return Exit::BadInput;
            };
            done(headroom::run(
                &rules,
                class.as_deref(),
                role,
                &declarations,
                format,
            ))
        }
        Command::Sweep {
            rules,
            class,
            rule,
            from,
            to,
            steps,
            keep,
            role,
            format,
            declarations,
        } => {
            let Ok(declarations) = reply.walk_field(&declarations) else {
                return Exit::BadInput;
            };
            let request = gonogo::commands::sweep::SweepRequest {
                rules: &rules,
                class: &class,
                section: &rule,
                from,
                to,
                steps,
                share: keep / 100.0,
                role,
                declarations: &declarations,
                format,
            };
            done(gonogo::commands::sweep::run(&request))
        }
        Command::Explain {
            rules,
            class,
            section,
        } => done(explain::run(&rules, class.as_deref(), &section)),
        Command::Sheet {
            rules,
            class,
            format,
        } => done(sheet::run(&rules, &class, format)),
        Command::Lsp => match gonogo::lsp::run() {
            Ok(()) => Exit::Clean,
            Err(why) => {
                to_stderr(&format!(
                    "gonogo lsp: the conversation with the editor broke off: {why}\n"
                ));
                Exit::BadInput
            }
        },
        Command::Season { action } => run_season(&reply, action),
        Command::Completions { shell } => {
            let mut script = Vec::new();
            clap_complete::generate(shell, &mut Cli::command(), "gonogo", &mut script);
            reply.write(&String::from_utf8_lossy(&script), Exit::Clean)
        }
        Command::Man { command } => {
            match gonogo::manual::page(Cli::command(), command.as_deref()) {
                Some(page) => reply.write(&page, Exit::Clean),
                None => {
                    to_stderr("gonogo: cannot make the manual page\n");
                    Exit::BadInput
                }
            }
        }
        Command::Units { format } => reply.write(&units::run(format), Exit::Clean),
        Command::Fmt {
            files,
            check,
            write,
        } => {
            let mode = match (check, write) {
                (true, _) => fmt::Mode::Check,
                (_, true) => fmt::Mode::Write,
                _ => fmt::Mode::Print,
            };
            reply.finish(fmt::run(&files, mode))
        }
    }
}

/// Every path of the run that reads standard input (`-`), refused when more than one does:
/// standard input can be read once.
fn stdin_at_most_once(command: &Command) -> Result<(), Problem> {
    let named: Vec<&Path> = match command {
        Command::Check {
            rules,
            declarations,
            ..
        }
        | Command::Headroom {
            rules,
            declarations,
            ..
        }
        | Command::Sweep {
            rules,
            declarations,
            ..
        } => std::iter::once(rules)
            .chain(declarations)
            .map(PathBuf::as_path)
            .collect(),
        Command::Impact {
            old,
            new,
            declarations,
            log,
            sides,
            ..
        } => [old, new]
            .into_iter()
            .chain(&sides.with_bulletin)
            .chain(declarations)
            .chain(log)
            .map(PathBuf::as_path)
            .collect(),
        Command::Diff {
            old, new, sides, ..
        } => [old, new]
            .into_iter()
            .chain(&sides.with_bulletin)
            .map(PathBuf::as_path)
            .collect(),
        Command::Lint { files, .. } => files.iter().map(PathBuf::as_path).collect(),
        Command::Explain { rules, .. } | Command::Sheet { rules, .. } => vec![rules],
        Command::Fmt { files, .. } => files.iter().map(PathBuf::as_path).collect(),
        Command::Completions { .. }
        | Command::Man { .. }
        | Command::Units { .. }
        | Command::Lsp
        | Command::Season { .. } => Vec::new(),
    };
    if named.iter().filter(|p| gonogo::source::is_stdin(p)).count() > 1 {
        return Err(Problem::unlocated(
            codes::write::STDIN_TWICE,
            "standard input (`-`) is named more than once",
        )
        .with_help("standard input can be read only once: name files for the others"));
    }
    Ok(())
}
