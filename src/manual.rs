//! The manual pages: `gonogo(1)` and one page per subcommand (`gonogo-check(1)`, …), each
//! made from the command definitions (clap_mangen: name, synopsis, description, options)
//! and from the table here: its exit statuses, environment and examples. The same table
//! gives each subcommand's `--help` its examples and exit statuses, so the two never differ.

use clap_mangen::Man;
use clap_mangen::roff::{Roff, bold, italic, roman};

/// One example: a command line and what it does.
pub struct Example {
    /// The command line.
    pub command: &'static str,
    /// What it does, in a few words.
    pub what: &'static str,
}

/// What a subcommand's manual page says beyond its options.
pub struct Notes {
    /// The subcommand's name.
    pub name: &'static str,
    /// Its exit statuses and what each means.
    pub exit: &'static [(u8, &'static str)],
    /// Examples.
    pub examples: &'static [Example],
    /// Variables read beside [`ENVIRONMENT`].
    pub environment: &'static [(&'static str, &'static str)],
}

/// The statuses of a command that gives a document or refuses its input.
const DOCUMENT_OR_REFUSAL: &[(u8, &str)] = &[
    (0, "the document was written"),
    (
        2,
        "the input could not be used (usage, an unreadable file, a rulebook or declaration \
         error) or the output could not be written",
    ),
];

/// The statuses of `fmt`, whose `--check` says no with 1.
const FMT_STATUSES: &[(u8, &str)] = &[
    (
        0,
        "the text was printed or written; with `--check`, every file is in canonical form",
    ),
    (1, "with `--check`: a file is not in canonical form"),
    (
        2,
        "a file could not be read or parsed, or the output could not be written; nothing was written",
    ),
];

/// The variables every command reads: the colour conventions (no-color.org,
/// bixense.com/clicolors), as `src/color.rs` applies them.
pub const ENVIRONMENT: &[(&str, &str)] = &[
    (
        "NO_COLOR",
        "set and not empty: no colour in auto (no-color.org); --color always still colours",
    ),
    (
        "CLICOLOR_FORCE",
        "set and not 0: colour in auto even when not a terminal, never into an --output file \
         (bixense.com/clicolors)",
    ),
    ("CLICOLOR", "0: no colour in auto (bixense.com/clicolors)"),
    (
        "TERM",
        "unset or dumb: no colour in auto, the terminal cannot show it",
    ),
];

/// Every subcommand's notes, in the order `gonogo --help` lists them.
pub const PAGES: &[Notes] = &[
    Notes {
        name: "check",
        exit: &[
            (
                0,
                "every rule legal, no conditional finding, nothing unchecked",
            ),
            (
                1,
                "at least one rule illegal under the decision rule in force",
            ),
            (
                2,
                "the input could not be used (usage, an unreadable file, a rulebook or \
                 declaration error) or the output could not be written",
            ),
            (
                3,
                "nothing illegal, but a finding is conditional or a rule could not be checked",
            ),
        ],
        examples: &[
            Example {
                command: "gonogo check --rules rulebooks-demo/tamsin-2027.rules engines-demo/limited2-legal.yaml",
                what: "check one declaration against the class it names",
            },
            Example {
                command: "gonogo check --rules rulebooks-demo/tamsin-2027.rules --as builder engines-demo/*.yaml",
                what: "a field, under the builder's decision rule",
            },
            Example {
                command: "gonogo check --rules season.rules --class open4 --format json car14.yaml",
                what: "against another class, as JSON",
            },
        ],
        environment: &[(
            "CI",
            "set: no progress bar for a long field, even on a terminal",
        )],
    },
    Notes {
        name: "lint",
        exit: &[
            (0, "no rulebook has an error (warnings allowed)"),
            (1, "a rulebook has an error"),
            (
                2,
                "a file could not be read at all (missing, unreadable, over the size cap, not \
                 UTF-8), a usage error, or the output could not be written",
            ),
        ],
        examples: &[
            Example {
                command: "gonogo lint rulebooks-demo/*.rules",
                what: "the static checks of every demo rulebook",
            },
            Example {
                command: "gonogo lint --format json season.rules",
                what: "for an editor, as JSON",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "diff",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo diff rulebooks-demo/tamsin-2027.rules rulebooks-demo/tamsin-2028.rules",
                what: "every rule added, dropped, tightened, loosened or changed",
            },
            Example {
                command: "gonogo diff --class limited2 --format markdown old.rules new.rules",
                what: "one class, as Markdown",
            },
            Example {
                command: "gonogo diff --old-on 2027-06-01 --new-on 2027-07-01 season.rules season.rules",
                what: "what the bulletins between two dates changed",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "impact",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo impact rulebooks-demo/tamsin-2027.rules rulebooks-demo/tamsin-2028.rules engines-demo/",
                what: "the demo field's verdicts that the 2028 edition changes",
            },
            Example {
                command: "gonogo impact --as builder --format markdown old.rules new.rules season/",
                what: "under the builder's decision rule, as Markdown",
            },
            Example {
                command: "gonogo impact --with-bulletin draft.rules --format html season.rules season.rules season/",
                what: "a draft bulletin tried on the field before it is issued, as a page for the meeting",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "sweep",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo sweep --rules rulebooks-demo/tamsin-2027.rules --class street_stock --rule 3.3 --from 9.0 --to 10.0 engines-demo/",
                what: "the street-stock compression limit from 9.0 to 10.0, in 11 candidates",
            },
            Example {
                command: "gonogo sweep --rules season.rules --class limited2 --rule 3.2 --from 4.030 --to 4.040 --keep 95 --format html --output bore.html field/",
                what: "the picture, and the tightest limit keeping 95 % legal",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "headroom",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo headroom --rules rulebooks-demo/tamsin-2027.rules engines-demo/limited2-close-bore.yaml",
                what: "the margins of a close engine",
            },
            Example {
                command: "gonogo headroom --rules season.rules --format json car14.yaml",
                what: "as JSON",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "explain",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo explain --rules rulebooks-demo/tamsin-2027.rules 3.2",
                what: "rule 3.2 in every class that has it",
            },
            Example {
                command: "gonogo explain --rules rulebooks-demo/tamsin-2027.rules --class open4 3.1",
                what: "rule 3.1 of one class",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "season",
        exit: &[
            (
                0,
                "the document was written; for `verify`, the chain is intact and every \
                 inspection checked again gives the recorded verdicts",
            ),
            (
                1,
                "`verify` only: the chain or a stored file is broken, or a verdict would now \
                 differ",
            ),
            (
                2,
                "the log could not be used (missing, not a gonogo log, from a newer gonogo), \
                 no inspection of the engine, a bad date, an export file exists, or the output \
                 could not be written",
            ),
        ],
        examples: &[
            Example {
                command: "gonogo season list season.sqlite --class street_stock --result illegal",
                what: "the illegal Street Stock inspections of the season, as a table",
            },
            Example {
                command: "gonogo season list season.sqlite --from 2027-05-01 --to 2027-05-31 --format csv",
                what: "May's inspections for a spreadsheet",
            },
            Example {
                command: "gonogo season history season.sqlite TV-27-003 --format html --output tv-27-003.html",
                what: "one engine over the season, with a plot per changed measurement",
            },
            Example {
                command: "gonogo season verify season.sqlite",
                what: "check the chain and make every call again; exit 1 if anything differs",
            },
            Example {
                command: "gonogo season export season.sqlite season-files",
                what: "every stored declaration and rulebook written back out as files",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "sheet",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo sheet --rules rulebooks-demo/tamsin-2027.rules --class limited2",
                what: "the blank measurement sheet, as Markdown",
            },
            Example {
                command: "gonogo sheet --rules rulebooks-demo/tamsin-2027.rules --class open4 --format yaml > car44.yaml",
                what: "a declaration template to fill in",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "units",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo units",
                what: "every unit a rulebook or declaration may use, by dimension",
            },
            Example {
                command: "gonogo units --format json",
                what: "the same as JSON, with each exact factor as a fraction",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "lsp",
        exit: &[
            (0, "the editor said `shutdown`, then `exit`"),
            (
                2,
                "the conversation broke off: the editor went away or sent what is not the protocol",
            ),
        ],
        examples: &[Example {
            command: "gonogo lsp",
            what: "started by an editor, which speaks the Language Server Protocol on its standard input and output",
        }],
        environment: &[],
    },
    Notes {
        name: "completions",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[Example {
            command: "gonogo completions bash > /etc/bash_completion.d/gonogo",
            what: "install the bash completions",
        }],
        environment: &[],
    },
    Notes {
        name: "man",
        exit: DOCUMENT_OR_REFUSAL,
        examples: &[
            Example {
                command: "gonogo man > gonogo.1 && man ./gonogo.1",
                what: "read the top page",
            },
            Example {
                command: "gonogo man check > gonogo-check.1",
                what: "the page of one subcommand",
            },
        ],
        environment: &[],
    },
    Notes {
        name: "fmt",
        exit: FMT_STATUSES,
        examples: &[
            Example {
                command: "gonogo fmt rulebooks-demo/tamsin-2027.rules",
                what: "the rulebook in canonical form, comments kept",
            },
            Example {
                command: "gonogo fmt --check rulebooks-demo/*.rules",
                what: "for CI: name each file not in canonical form, exit 1 if one is not",
            },
            Example {
                command: "gonogo fmt --write rulebooks-demo/tamsin-2028.rules",
                what: "put the canonical form back in the file",
            },
        ],
        environment: &[],
    },
];

/// The names of the subcommands that have a page, for `gonogo man COMMAND`.
pub fn page_names() -> Vec<&'static str> {
    PAGES.iter().map(|notes| notes.name).collect()
}

/// The notes of one subcommand.
fn notes(name: &str) -> Option<&'static Notes> {
    PAGES.iter().find(|notes| notes.name == name)
}

/// `cmd` with each subcommand's `--help` ending in its examples and exit statuses.
pub fn with_help_notes(cmd: clap::Command) -> clap::Command {
    PAGES.iter().fold(cmd, |cmd, notes| {
        cmd.mut_subcommand(notes.name, |sub| sub.after_help(help_notes(notes)))
    })
}

/// A subcommand's examples and exit statuses as `--help` ends with them.
fn help_notes(notes: &Notes) -> String {
    let examples: String = notes
        .examples
        .iter()
        .map(|e| format!("\n  {}", e.command))
        .collect();
    let exit: String = notes
        .exit
        .iter()
        .map(|(code, meaning)| format!("\n  {code}  {meaning}"))
        .collect();
    format!("Examples:{examples}\n\nExit status:{exit}")
}

/// The manual page of `gonogo` (no subcommand) or of one subcommand, as roff; `None` for a
/// name that is not a subcommand with a page.
pub fn page(cmd: clap::Command, subcommand: Option<&str>) -> Option<String> {
    let mut cmd = cmd.disable_help_subcommand(true);
    cmd.build();
    let mut page = Page::default();
    match subcommand {
        None => {
            let top = Man::new(cmd.clone());
            page.clap_sections(&top, true);
            page.exit_section(&[
                (
                    0,
                    "the command succeeded; check: every rule legal and certain",
                ),
                (
                    1,
                    "check: a rule is illegal; lint: a rulebook has an error (see each page)",
                ),
                (
                    2,
                    "the input could not be used or the output could not be written",
                ),
                (3, "check: nothing illegal, but not all clear"),
            ]);
            page.environment_section(&[(
                "CI",
                "set: check shows no progress bar (gonogo-check(1))",
            )]);
            page.examples_section(&[
                Example {
                    command: "gonogo check --rules rulebooks-demo/tamsin-2027.rules engines-demo/",
                    what: "check the demo field",
                },
                Example {
                    command: "gonogo --color never lint rulebooks-demo/*.rules",
                    what: "lint without colour",
                },
            ]);
            page.see_also(
                cmd.get_subcommands()
                    .map(|sub| format!("gonogo-{}(1)", sub.get_name())),
            );
        }
        Some(name) => {
            let notes = notes(name)?;
            let sub = cmd.find_subcommand(name)?.clone();
            let source = format!("gonogo {}", cmd.get_version().unwrap_or_default());
            page.clap_sections(&Man::new(sub).source(source), false);
            page.exit_section(notes.exit);
            page.environment_section(notes.environment);
            page.examples_section(notes.examples);
            page.see_also(std::iter::once("gonogo(1)".to_string()));
        }
    }
    Some(page.text)
}

/// A page being put together from clap_mangen's sections and gonogo's own.
#[derive(Default)]
struct Page {
    text: String,
}

impl Page {
    /// Adds roff text, with roff's apostrophe preamble only at the top of the page.
    fn push(&mut self, roff: &str) {
        let body = if self.text.is_empty() {
            roff
        } else {
            without_preamble(roff)
        };
        self.text.push_str(body);
    }

    /// Adds what one clap_mangen section renderer writes.
    fn push_rendered(&mut self, render: impl FnOnce(&mut Vec<u8>) -> Result<(), std::io::Error>) {
        let mut bytes = Vec::new();
        if render(&mut bytes).is_ok() {
            self.push(&String::from_utf8_lossy(&bytes));
        }
    }

    /// The title, name, synopsis, description and options (and the subcommands of the top
    /// page) from the command definitions.
    fn clap_sections(&mut self, man: &Man, top: bool) {
        self.push_rendered(|w| man.render_title(w));
        self.push_rendered(|w| man.render_name_section(w));
        self.push_rendered(|w| man.render_synopsis_section(w));
        self.push_rendered(|w| man.render_description_section(w));
        self.push_rendered(|w| man.render_options_section(w));
        if top {
            self.push_rendered(|w| man.render_subcommands_section(w));
        }
    }

    fn exit_section(&mut self, statuses: &[(u8, &str)]) {
        let mut roff = Roff::default();
        roff.control("SH", ["EXIT STATUS"]);
        for (code, meaning) in statuses {
            roff.control("TP", []);
            roff.text([bold(code.to_string())]);
            roff.text([roman(*meaning)]);
        }
        self.push(&roff.render());
    }

    fn environment_section(&mut self, extra: &[(&str, &str)]) {
        let mut roff = Roff::default();
        roff.control("SH", ["ENVIRONMENT"]);
        for (name, meaning) in ENVIRONMENT.iter().chain(extra) {
            roff.control("TP", []);
            roff.text([bold(*name)]);
            roff.text([roman(*meaning)]);
        }
        self.push(&roff.render());
    }

    fn examples_section(&mut self, examples: &[Example]) {
        let mut roff = Roff::default();
        roff.control("SH", ["EXAMPLES"]);
        for example in examples {
            roff.control("TP", []);
            roff.text([bold(example.command)]);
            roff.text([roman(example.what)]);
        }
        self.push(&roff.render());
    }

    fn see_also(&mut self, pages: impl Iterator<Item = String>) {
        let mut roff = Roff::default();
        roff.control("SH", ["SEE ALSO"]);
        let pages: Vec<String> = pages.collect();
        roff.text([italic(pages.join(", "))]);
        self.push(&roff.render());
    }
}

/// Roff text without the apostrophe preamble `Roff::render` starts every fragment with.
fn without_preamble(roff: &str) -> &str {
    let mut rest = roff;
    for prefix in [".ie \\n(.g .ds Aq", ".el .ds Aq"] {
        if rest.starts_with(prefix) {
            rest = rest.split_once('\n').map_or("", |(_, after)| after);
        }
    }
    rest
}
