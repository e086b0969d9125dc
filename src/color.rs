//! Whether a stream gets colour: the one decision, from `--color` and the environment.
//!
//! `--color never` and `--color always` are the user's explicit choice for this run and
//! win over everything. `--color auto` (the default) follows the ecosystem's conventions,
//! read through `anstyle-query`, in this order:
//!
//! 1. `NO_COLOR` set and not empty: no colour (<https://no-color.org>: "when present and not
//!    an empty string (regardless of its value), prevents the addition of ANSI color";
//!    command-line arguments override it, so `--color always` still colours);
//! 2. `CLICOLOR_FORCE` set and not `0`: colour on standard output and standard error even
//!    when they are not a terminal (<https://bixense.com/clicolors/>: "CLICOLOR_FORCE != 0:
//!    ANSI colors should be enabled no matter what");
//! 3. `CLICOLOR=0`: no colour (bixense: "CLICOLOR == 0: Don't output ANSI color escape
//!    codes");
//! 4. otherwise colour only on a terminal whose `TERM` is set and not `dumb`.
//!
//! A file named by `--output` is a stored document, not a stream: in `auto` it never gets
//! colour, whatever the environment says (the session-wide `CLICOLOR_FORCE` included). Only
//! an explicit `--color always` puts escapes into a file.

use std::ffi::OsString;
use std::io::IsTerminal;

/// The `--color` flag.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum ColorChoice {
    /// Follow the destination and the environment (`NO_COLOR`, `CLICOLOR`,
    /// `CLICOLOR_FORCE`, `TERM`).
    #[default]
    Auto,
    /// Colour everywhere, a file named by `--output` included.
    Always,
    /// No colour anywhere.
    Never,
}

/// Where text is going, as far as colour is concerned.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Stream {
    /// Standard output.
    Stdout,
    /// Standard error.
    Stderr,
    /// A file named by `--output` (a device or FIFO named there too).
    File,
}

/// The variables the conventions read, as one value so that the decision can be tested
/// without changing the process's environment.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Environment {
    /// `NO_COLOR` set and not empty.
    pub no_color: bool,
    /// `CLICOLOR_FORCE` set, not empty and not `0`.
    pub clicolor_force: bool,
    /// `CLICOLOR=0`.
    pub clicolor_off: bool,
    /// `TERM` set and not `dumb`.
    pub term_supports_color: bool,
}

impl Environment {
    /// The process's environment, read through `anstyle-query`.
    pub fn current() -> Environment {
        let force_value = std::env::var_os("CLICOLOR_FORCE");
        Environment {
            no_color: anstyle_query::no_color(),
            clicolor_force: anstyle_query::clicolor_force()
                && force_value != Some(OsString::from("0")),
            clicolor_off: anstyle_query::clicolor() == Some(false),
            term_supports_color: anstyle_query::term_supports_color(),
        }
    }
}

/// Whether text going to `stream` gets colour: the decision described in the module's
/// documentation, for a stream that is or is not a terminal.
pub fn decide(choice: ColorChoice, env: &Environment, stream: Stream, is_terminal: bool) -> bool {
    match choice {
        ColorChoice::Never => false,
        ColorChoice::Always => true,
        ColorChoice::Auto if stream == Stream::File || env.no_color => false,
        ColorChoice::Auto if env.clicolor_force => true,
        ColorChoice::Auto if env.clicolor_off => false,
        ColorChoice::Auto => is_terminal && env.term_supports_color,
    }
}

/// Whether text going to `stream` in this process gets colour.
pub fn enabled(choice: ColorChoice, stream: Stream) -> bool {
    let is_terminal = match stream {
        Stream::Stdout => std::io::stdout().is_terminal(),
        Stream::Stderr => std::io::stderr().is_terminal(),
        Stream::File => false,
    };
    decide(choice, &Environment::current(), stream, is_terminal)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A terminal with `TERM` set to a colour terminal, and no colour variable.
    fn plain_terminal() -> Environment {
        Environment {
            term_supports_color: true,
            ..Environment::default()
        }
    }

    #[test]
    fn auto_colours_a_colour_terminal_only() {
        let env = plain_terminal();
        assert!(decide(ColorChoice::Auto, &env, Stream::Stdout, true));
        assert!(decide(ColorChoice::Auto, &env, Stream::Stderr, true));
        assert!(!decide(ColorChoice::Auto, &env, Stream::Stdout, false));
    }

    #[test]
    fn a_dumb_terminal_gets_no_colour() {
        // bixense.com/clicolors and terminfo: TERM=dumb has no colour capability
        let env = Environment::default();
        assert!(!decide(ColorChoice::Auto, &env, Stream::Stderr, true));
    }

    #[test]
    fn clicolor_zero_turns_colour_off_on_a_terminal() {
        let env = Environment {
            clicolor_off: true,
            ..plain_terminal()
        };
        assert!(!decide(ColorChoice::Auto, &env, Stream::Stdout, true));
    }

    #[test]
    fn no_color_wins_over_clicolor_force_but_not_over_the_flag() {
        let env = Environment {
            no_color: true,
            clicolor_force: true,
            ..plain_terminal()
        };
        assert!(!decide(ColorChoice::Auto, &env, Stream::Stdout, true));
        assert!(decide(ColorChoice::Always, &env, Stream::Stdout, true));
    }

    #[test]
    fn clicolor_force_colours_a_pipe_but_never_a_file() {
        let env = Environment {
            clicolor_force: true,
            ..Environment::default()
        };
        assert!(decide(ColorChoice::Auto, &env, Stream::Stdout, false));
        assert!(!decide(ColorChoice::Auto, &env, Stream::File, false));
        assert!(decide(ColorChoice::Always, &env, Stream::File, false));
    }

    #[test]
    fn never_is_never() {
        let env = Environment {
            clicolor_force: true,
            ..plain_terminal()
        };
        assert!(!decide(ColorChoice::Never, &env, Stream::Stdout, true));
    }
}
