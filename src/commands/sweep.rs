//! `gonogo sweep`: one numeric rule of one class, a range of candidate limits and a field of
//! engines; how many engines each candidate leaves legal, conditional and illegal.

use std::path::{Path, PathBuf};

use super::check::{Role, declaration_files, load_with_class};
use super::{Failure, checked_rulebook};
use crate::analyze::sweep::{Point, Side, Tally, candidates, keeping, tally};
use crate::check::model::{CheckedRulebook, Class};
use crate::diagnostic::{Problem, codes};
use crate::evaluate::check_against;
use crate::report::sweep::{SweepFormat, SweepView, render};
use crate::source::SourceMap;

/// What `sweep` was asked.
pub struct SweepRequest<'a> {
    /// The rulebook.
    pub rules: &'a Path,
    /// The class.
    pub class: &'a str,
    /// The rule's section number.
    pub section: &'a str,
    /// The first and last candidate limit, in the unit the rule writes its limit in.
    pub from: f64,
    /// The last candidate.
    pub to: f64,
    /// How many candidates, evenly spaced, both ends included.
    pub steps: usize,
    /// The share of the field (0 to 1) the chosen candidate must keep legal.
    pub share: f64,
    /// Whose decision rule, when not the rulebook's.
    pub role: Option<Role>,
    /// Declarations and folders of them, already walked.
    pub declarations: &'a [PathBuf],
    /// The output format.
    pub format: SweepFormat,
}

fn refuse(code: crate::diagnostic::Code, message: String, help: &str) -> Failure {
    Failure::one(Problem::unlocated(code, message).with_help(help))
}

/// The sweep's report, or the problem that prevents it (exit 2).
pub fn run(r: &SweepRequest) -> Result<String, Failure> {
    let book = checked_rulebook(r.rules)?;
    let Some(class) = book.class(r.class) else {
        return Err(refuse(
            codes::analyze::SWEEP_UNKNOWN_RULE,
            format!("the rulebook has no class `{}`", r.class),
            "name a class the rulebook defines (`gonogo sheet` lists what each needs)",
        ));
    };
    if !class.rules.iter().any(|x| x.rule.section.text == r.section) {
        return Err(refuse(
            codes::analyze::SWEEP_UNKNOWN_RULE,
            format!("class `{}` has no rule {}", r.class, r.section),
            "give the section number of one of the class's rules, as `gonogo explain` takes it",
        ));
    }
    let sound = r.from.is_finite()
        && r.to.is_finite()
        && r.from < r.to
        && (2..=1000).contains(&r.steps)
        && (0.0..=1.0).contains(&r.share);
    if !sound {
        return Err(refuse(
            codes::analyze::SWEEP_BAD_RANGE,
            format!(
                "candidates from {} to {} in {} steps, keeping {} legal, cannot be swept",
                r.from, r.to, r.steps, r.share
            ),
            "give --from below --to, --steps from 2 to 1000 and --keep from 0 to 100 (per cent)",
        ));
    }
    let decision = r.role.map(Role::decision);
    let (field, today, unreadable) =
        gather_field(r.declarations, &book, class, r.section, decision)?;
    let Some((limit, side, unit)) = today else {
        return Err(refuse(
            codes::analyze::SWEEP_NOT_A_LIMIT,
            format!(
                "rule {} gave no numeric value with a limit on any engine",
                r.section
            ),
            "sweep a rule with one numeric limit (`<=` or `>=`) on engines that have its measurements",
        ));
    };
    let scale = unit.map_or(1.0, |u| u.to_si);
    let rule_decision = decision.unwrap_or(book.decision);
    let tallies: Vec<Tally> = candidates(r.from, r.to, r.steps)
        .into_iter()
        .map(|c| tally(&field, side, c * scale, rule_decision))
        .collect();
    let view = SweepView {
        series: &book.series,
        edition: &book.edition,
        class: r.class,
        section: r.section,
        decision: rule_decision.words(),
        unit,
        side,
        today: limit,
        chosen: keeping(&tallies, side, r.share, field.len()),
        places: places(r.from, r.to, r.steps),
        share: r.share,
        field: &field,
        tallies: &tallies,
        unreadable: &unreadable,
    };
    Ok(render(&view, r.format))
}

/// The decimal places that show every candidate apart: those of the step between them.
fn places(from: f64, to: f64, steps: usize) -> usize {
    let step = (to - from) / (steps.max(2) - 1) as f64;
    (-step.log10() - 1e-9).ceil().clamp(0.0, 9.0) as usize
}

/// Today's limit (SI), which way it bounds, and its unit, when the rule gave one.
type Today = Option<(f64, Side, Option<&'static crate::units::Unit>)>;

/// The engines' values, today's limit, and the files left out with why.
type SweepField = (Vec<Point>, Today, Vec<(String, String)>);

/// The field: each declaration of the class read and checked, the rule's value with its U
/// taken; files that could not be read or did not give the value are listed with why. The one
/// place the field is gathered (a season log would be another source of declarations here).
fn gather_field(
    named: &[PathBuf],
    book: &CheckedRulebook,
    class: &Class,
    section: &str,
    decision: Option<crate::parse::ast::DecisionRule>,
) -> Result<SweepField, Failure> {
    let files = declaration_files(named).map_err(Failure::one)?;
    let (mut field, mut today, mut unreadable) = (Vec::new(), None, Vec::new());
    for path in &files {
        let mut sources = SourceMap::default();
        let Ok((d, at)) = load_with_class(path, book, None, &mut sources) else {
            unreadable.push((path.display().to_string(), "could not be read".to_string()));
            continue;
        };
        if book.classes[at].name != class.name {
            continue;
        }
        let report = check_against(
            book,
            class,
            &class.rules,
            &class.edition_bulletins,
            &d,
            decision,
        );
        let numeric = report
            .outcomes
            .iter()
            .find(|o| o.section() == section)
            .and_then(|o| o.checked.as_ref())
            .and_then(|c| c.numeric.as_ref());
        let Some(n) = numeric else {
            unreadable.push((
                path.display().to_string(),
                format!("rule {section} not checked"),
            ));
            continue;
        };
        let upper = (n.limit - n.value - n.margin).abs() <= (n.value - n.limit - n.margin).abs();
        let side = if upper { Side::Upper } else { Side::Lower };
        today.get_or_insert((n.limit, side, n.unit));
        field.push(Point {
            engine: d
                .identity
                .engine
                .clone()
                .unwrap_or_else(|| path.display().to_string()),
            value: n.value,
            expanded: n.expanded,
        });
    }
    if field.is_empty() && unreadable.len() == files.len() && today.is_none() {
        let why: Vec<String> = unreadable
            .iter()
            .map(|(f, w)| format!("{f}: {w}"))
            .collect();
        return Err(Failure::one(
            Problem::unlocated(
                codes::analyze::SWEEP_EMPTY_FIELD,
                format!(
                    "no declaration of class `{}` gave rule {section} a value",
                    class.name
                ),
            )
            .with_help(if why.is_empty() {
                "name declaration files or folders of the class".to_string()
            } else {
                why.join("\n")
            }),
        ));
    }
    Ok((field, today, unreadable))
}
