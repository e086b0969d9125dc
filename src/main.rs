//! The `gonogo` command line: argument parsing and dispatch to [`gonogo::commands`].

use std::io::{IsTerminal, Write};
use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Parser, Subcommand};
use gonogo::commands::{fmt, lint};
use gonogo::diagnostic::RenderStyle;
use gonogo::exit::Exit;

/// Stack for the worker thread: deep but bounded syntax trees are walked recursively.
const STACK_BYTES: usize = 256 * 1024 * 1024;

/// gonogo checks racing engines against a series' class rules.
#[derive(Parser)]
#[command(name = "gonogo", version, about, long_about = None)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand)]
enum Command {
    /// Run the static checks on rulebooks: names, units, dimensions, classes, limits.
    #[command(
        after_help = "Examples:\n  gonogo lint rulebooks-demo/*.rules\n  gonogo lint --format json season.rules"
    )]
    Lint {
        /// Rulebook files.
        #[arg(required = true)]
        files: Vec<PathBuf>,
        /// Output format.
        #[arg(long, value_enum, default_value_t = lint::LintFormat::Text)]
        format: lint::LintFormat,
    },
    /// Print a rulebook in canonical form (comments are not kept).
    #[command(after_help = "Example:\n  gonogo fmt rulebooks-demo/lakeshore-2027.rules")]
    Fmt {
        /// The rulebook file.
        file: PathBuf,
    },
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let worker = std::thread::Builder::new()
        .stack_size(STACK_BYTES)
        .spawn(move || run(cli));
    match worker.map(|handle| handle.join()) {
        Ok(Ok(exit)) => exit.into(),
        _ => {
            eprintln!("gonogo: internal error");
            Exit::BadInput.into()
        }
    }
}

fn style_for(stream_is_terminal: bool) -> RenderStyle {
    let colour = stream_is_terminal && std::env::var_os("NO_COLOR").is_none_or(|v| v.is_empty());
    RenderStyle { colour, width: 100 }
}

fn run(cli: Cli) -> Exit {
    match cli.command {
        Command::Lint { files, format } => {
            let (out, exit) = lint::run(&files, format, style_for(std::io::stdout().is_terminal()));
            write_out(&out);
            exit
        }
        Command::Fmt { file } => {
            match fmt::run(&file, style_for(std::io::stderr().is_terminal())) {
                Ok(text) => {
                    write_out(&text);
                    Exit::Clean
                }
                Err((diagnostics, exit)) => {
                    eprint!("{diagnostics}");
                    exit
                }
            }
        }
    }
}

fn write_out(text: &str) {
    let mut stdout = std::io::stdout().lock();
    let _ = stdout.write_all(text.as_bytes());
    let _ = stdout.flush();
}
