//! Problems found in the input, and their rendering through miette.
//!
//! Every stage (parse, check) reports [`Problem`]s: a stable code, a severity, a lowercase
//! message, labelled spans and a help line that says how to fix the input. A problem becomes a
//! miette diagnostic only when it is rendered, together with the source it points into.

pub mod codes;
mod excerpt;
mod window;

pub use codes::Code;

use std::fmt;

use miette::{
    Diagnostic, GraphicalReportHandler, GraphicalTheme, LabeledSpan, MietteError, Severity,
    SourceCode, SourceSpan, SpanContents,
};

use crate::report::format::count;
use crate::source::{SourceMap, Span};
use excerpt::Excerpt;
use window::Window;

/// How bad a problem is.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub enum Level {
    /// Worth fixing; the rulebook can still be used.
    Warning,
    /// The rulebook cannot be used until this is fixed.
    Error,
}

/// One problem found in the input.
#[derive(Clone, Debug)]
pub struct Problem {
    /// Stable code from the one table in [`codes`], for example `C54 unknown-name`.
    pub code: Code,
    /// Error or warning.
    pub level: Level,
    /// What is wrong, lowercase, no final period, the user's words in backticks.
    pub message: String,
    /// Where, with a short label each; the first is the primary location.
    pub labels: Vec<(Span, String)>,
    /// How to fix it.
    pub help: Option<String>,
}

impl Problem {
    /// An error with one labelled span.
    pub fn error(code: Code, message: impl Into<String>, span: Span, label: &str) -> Self {
        Problem {
            code,
            level: Level::Error,
            message: shortened(message.into()),
            labels: vec![(span, shortened(label.to_string()))],
            help: None,
        }
    }

    /// A warning with one labelled span.
    pub fn warning(code: Code, message: impl Into<String>, span: Span, label: &str) -> Self {
        Problem {
            level: Level::Warning,
            ..Problem::error(code, message, span, label)
        }
    }

    /// A problem that points at no text (an unreadable file, say).
    pub fn unlocated(code: Code, message: impl Into<String>) -> Self {
        Problem {
            code,
            level: Level::Error,
            message: shortened(message.into()),
            labels: Vec::new(),
            help: None,
        }
    }

    /// Adds the help line.
    pub fn with_help(mut self, help: impl Into<String>) -> Self {
        self.help = Some(shortened(help.into()));
        self
    }

    /// Adds a secondary label.
    pub fn with_label(mut self, span: Span, label: impl Into<String>) -> Self {
        self.labels.push((span, shortened(label.into())));
        self
    }

    /// The primary span, if the problem has one.
    pub fn primary_span(&self) -> Option<Span> {
        self.labels.first().map(|(s, _)| *s)
    }
}

/// Most characters of the user's words a message quotes in backticks; a longer quote keeps
/// its start and its end around `…`.
const MAX_QUOTED: usize = 60;

/// Most characters of a message, a label or a help line, whatever they quote.
const MAX_TEXT: usize = 2_000;

/// `text` with each backticked quote cut to [`MAX_QUOTED`] characters and the whole to
/// [`MAX_TEXT`]: a 100,000-character value named in a message gives a message of one line.
pub fn shortened(text: String) -> String {
    let long_quote = text
        .split('`')
        .skip(1)
        .step_by(2)
        .any(|q| q.chars().count() > MAX_QUOTED);
    let mut text = if long_quote {
        text.split('`')
            .enumerate()
            .map(|(i, part)| {
                if i % 2 == 1 {
                    cut_middle(part)
                } else {
                    part.to_string()
                }
            })
            .collect::<Vec<_>>()
            .join("`")
    } else {
        text
    };
    if text.chars().count() > MAX_TEXT {
        text = text.chars().take(MAX_TEXT).collect::<String>() + "…";
    }
    text
}

/// A quote of more than [`MAX_QUOTED`] characters as its first and last few around `…`.
fn cut_middle(quote: &str) -> String {
    let count = quote.chars().count();
    if count <= MAX_QUOTED {
        return quote.to_string();
    }
    let keep = MAX_QUOTED / 2;
    let head: String = quote.chars().take(keep).collect();
    let tail: String = quote.chars().skip(count - keep).collect();
    format!("{head}…{tail}")
}

/// A problem together with the source text it points into: what miette renders.
#[derive(Debug)]
pub struct Located {
    problem: Problem,
    source: Option<Shown>,
    notes: Vec<String>,
}

/// The source a problem echoes: the lines of its file around the labels, as they are or cut
/// around the labels when one is long (see [`window`]).
#[derive(Debug)]
struct Shown {
    excerpt: Excerpt,
    cut: Option<Window>,
}

impl Shown {
    fn span(&self, span: Span) -> SourceSpan {
        let at = self.excerpt.span(span.start, span.end);
        match &self.cut {
            None => at,
            Some(window) => window.span(at.offset(), at.offset() + at.len()),
        }
    }
}

impl SourceCode for Shown {
    fn read_span<'a>(
        &'a self,
        span: &SourceSpan,
        before: usize,
        after: usize,
    ) -> Result<Box<dyn SpanContents<'a> + 'a>, MietteError> {
        match &self.cut {
            None => self.excerpt.read_span(span, before, after),
            Some(window) => {
                let contents = window.read_span(span, before, after)?;
                Ok(self.excerpt.renumbered(contents.as_ref()))
            }
        }
    }
}

impl Located {
    /// Pairs a problem with its file from the source map. Labels in other files than the
    /// primary one are turned into notes naming the file and line.
    pub fn new(problem: Problem, sources: &SourceMap) -> Located {
        let Some(primary) = problem.primary_span() else {
            return Located {
                problem,
                source: None,
                notes: Vec::new(),
            };
        };
        let file = sources.file(primary.file);
        let notes = problem
            .labels
            .iter()
            .filter(|(s, _)| s.file != primary.file)
            .map(|(s, label)| {
                let other = sources.file(s.file);
                let (line, col) = other.line_column(s.start);
                format!("{label}: {}:{line}:{col}", other.path.display())
            })
            .collect();
        let here: Vec<(usize, usize)> = problem
            .labels
            .iter()
            .filter(|(s, _)| s.file == primary.file)
            .map(|(s, _)| (s.start, s.end))
            .collect();
        let excerpt = Excerpt::new(file, &here);
        let shifted: Vec<(usize, usize)> = here
            .iter()
            .map(|&(a, b)| (a - excerpt.base.min(a), b - excerpt.base.min(b)))
            .collect();
        let name = file.path.display().to_string();
        let cut = Window::new(name, excerpt.text.clone(), &shifted);
        let source = Shown { excerpt, cut };
        Located {
            problem,
            source: Some(source),
            notes,
        }
    }
}

impl fmt::Display for Located {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.problem.message)
    }
}

impl std::error::Error for Located {}

impl Diagnostic for Located {
    fn code<'a>(&'a self) -> Option<Box<dyn fmt::Display + 'a>> {
        Some(Box::new(self.problem.code))
    }

    fn severity(&self) -> Option<Severity> {
        Some(match self.problem.level {
            Level::Error => Severity::Error,
            Level::Warning => Severity::Warning,
        })
    }

    fn help<'a>(&'a self) -> Option<Box<dyn fmt::Display + 'a>> {
        let mut lines: Vec<String> = self.notes.clone();
        lines.extend(self.problem.help.clone());
        (!lines.is_empty()).then(|| Box::new(lines.join("\n")) as Box<dyn fmt::Display>)
    }

    fn source_code(&self) -> Option<&dyn miette::SourceCode> {
        self.source.as_ref().map(|s| s as &dyn miette::SourceCode)
    }

    fn labels(&self) -> Option<Box<dyn Iterator<Item = LabeledSpan> + '_>> {
        let primary = self.problem.primary_span()?;
        let labels = self
            .problem
            .labels
            .iter()
            .enumerate()
            .filter(move |(_, (s, _))| s.file == primary.file)
            .map(|(i, (s, label))| {
                let text = (!label.is_empty()).then(|| label.clone());
                let at = self
                    .source
                    .as_ref()
                    .map_or_else(|| s.source_span(), |shown| shown.span(*s));
                if i == 0 {
                    LabeledSpan::new_primary_with_span(text, at)
                } else {
                    LabeledSpan::new_with_span(text, at)
                }
            });
        Some(Box::new(labels))
    }
}

/// Options for turning problems into text.
#[derive(Clone, Copy, Debug)]
pub struct RenderStyle {
    /// Use ANSI colour.
    pub colour: bool,
    /// Wrap width in columns.
    pub width: usize,
}

impl RenderStyle {
    /// Plain text at a fixed width: what snapshot tests and pipes get.
    pub const PLAIN: RenderStyle = RenderStyle {
        colour: false,
        width: 100,
    };
}

/// Renders one problem as miette's graphical report.
pub fn render(problem: &Problem, sources: &SourceMap, style: RenderStyle) -> String {
    let theme = if style.colour {
        GraphicalTheme::unicode()
    } else {
        GraphicalTheme::unicode_nocolor()
    };
    let handler = GraphicalReportHandler::new_themed(theme).with_width(style.width);
    let mut out = String::new();
    let located = Located::new(problem.clone(), sources);
    if handler.render_report(&mut out, &located).is_err() {
        out = format!("{}: {}\n", problem.code, problem.message);
    }
    out
}

/// Most items a message lists; the rest are counted, so that a list of a million entries
/// gives a message of one line.
pub const MAX_LISTED: usize = 12;

/// `items` joined by `separator`, the first [`MAX_LISTED`] of them and a count of the rest:
/// `` `a`, `b`, `c` `` or `` `a`, `b` … and 98 more ``.
pub fn first_few(items: &[String], separator: &str) -> String {
    let shown = items.len().min(MAX_LISTED);
    let mut text = items[..shown].join(separator);
    if items.len() > shown {
        text.push_str(&format!(" … and {} more", items.len() - shown));
    }
    text
}

/// Counts of errors and warnings, as a closing line (`2 errors, 1 warning`).
pub fn summary(problems: &[Problem]) -> String {
    let errors = problems.iter().filter(|p| p.level == Level::Error).count();
    let warnings = problems.len() - errors;
    format!(
        "{}, {}",
        count(errors, "error", "errors"),
        count(warnings, "warning", "warnings")
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_long_list_shows_its_first_few_and_counts_the_rest() {
        let items: Vec<String> = (0..1_000_000).map(|i| format!("`k{i}`")).collect();
        let text = first_few(&items, ", ");
        assert!(text.starts_with("`k0`, `k1`, "), "{text}");
        assert!(text.ends_with("`k11` … and 999988 more"), "{text}");
        assert_eq!(first_few(&items[..2], " → "), "`k0` → `k1`");
    }

    #[test]
    fn a_long_quote_keeps_its_ends_and_a_long_message_is_cut() {
        let quote = format!("a{}z", "m".repeat(100_000));
        let p = Problem::unlocated(
            codes::load::UNKNOWN_UNIT,
            format!("`{quote}` is not a unit"),
        );
        assert!(p.message.starts_with("`ammm"), "{}", p.message);
        assert!(p.message.ends_with("mmz` is not a unit"), "{}", p.message);
        assert!(p.message.chars().count() < 100, "{}", p.message);
        let plain = Problem::unlocated(codes::load::YAML, "x".repeat(100_000));
        assert_eq!(plain.message.chars().count(), MAX_TEXT + 1);
        let short = Problem::unlocated(codes::load::YAML, "`bore` is short");
        assert_eq!(short.message, "`bore` is short");
    }

    /// A problem on a line of 100,000 characters, labelled at column 70,000.
    fn far_along() -> (SourceMap, Problem) {
        let line = format!("{}furlongs{}", "x".repeat(69_999), "y".repeat(29_993));
        let mut sources = SourceMap::default();
        let id = sources.add(
            "long.rules".into(),
            format!("first line\n{line}\nlast line\n"),
        );
        let start = "first line\n".len() + 69_999;
        let at = Span::new(id, start, start + "furlongs".len());
        let problem = Problem::error(codes::check::UNKNOWN_UNIT, "unknown unit", at, "here")
            .with_help("use a unit gonogo knows");
        (sources, problem)
    }

    #[test]
    fn a_label_far_along_a_long_line_renders_a_short_window() {
        let (sources, problem) = far_along();
        let out = render(&problem, &sources, RenderStyle::PLAIN);
        assert!(out.contains("long.rules:2:70000"), "{out}");
        assert!(
            out.contains("│ …xxxx") && out.contains("xxxxfurlongsyyyy"),
            "{out}"
        );
        assert!(out.contains("here"), "{out}");
        assert!(out.len() < 2_000, "{} bytes:\n{out}", out.len());
        assert!(out.lines().all(|l| l.chars().count() < 200), "{out}");
    }

    #[test]
    fn short_lines_render_as_they_are() {
        let mut sources = SourceMap::default();
        let id = sources.add("a.rules".into(), "series \"S\"\nrule 1\n".into());
        let problem = Problem::error(codes::check::INTERNAL, "bad", Span::new(id, 12, 16), "here");
        let out = render(&problem, &sources, RenderStyle::PLAIN);
        assert!(out.contains("a.rules:2:2") && out.contains("rule 1") && !out.contains('…'));
    }
}
