//! Comparing two checked editions of a series: what changed, rule by rule and in the schema,
//! as data. Rules are matched by section number, then by title (a renumbered rule); limits are
//! compared by value after unit conversion, so `360 ci` to `5.9 L` is seen for what it is.
//! Formatting and order of the rulebook text are not changes: the comparison works on the
//! checked rulebooks and their canonical texts.
//!
//! Each side is an edition on a date ([`When`]): the bulletins in force by then are applied.
//! What each bulletin changes is set out as a step of its own ([`BulletinStep`]), so a limit a
//! bulletin already moved mid-season is not reported again as the new edition's change, and a
//! rule the bulletin brought in that the new edition does not carry forward is said to lapse.

use crate::check::interval::{End, Interval};
use crate::check::limit::SideKind;
use crate::check::model::{
    CheckedRulebook, Class, ClassRule, Measurement, Origin, PartEntry, ValueKind,
};
use crate::parse::ast::{Date, Expr, ExprKind};
use crate::units::{self, Unit};

/// What happened to one rule.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum RuleChange {
    /// New in the new edition.
    Added,
    /// Gone from the new edition.
    Dropped,
    /// The limit allows less than before.
    Tightened,
    /// The limit allows more than before.
    Loosened,
    /// Something else changed: the test, a condition, the penalty, the title.
    Changed,
}

/// A numeric limit's old and new value, in one unit.
#[derive(Clone, Debug, PartialEq)]
pub struct Limits {
    /// The old limit (low end first for a range), SI units.
    pub old: (f64, Option<f64>),
    /// The new limit, SI units.
    pub new: (f64, Option<f64>),
    /// The unit to show both in.
    pub unit: Option<&'static Unit>,
}

/// One rule's change in one class.
#[derive(Clone, Debug)]
pub struct RuleDiff {
    /// The class.
    pub class: String,
    /// Section number in the new edition (the old one for a dropped rule).
    pub section: String,
    /// Section number in the old edition when the rule was renumbered.
    pub renumbered_from: Option<String>,
    /// Title.
    pub title: String,
    /// What happened.
    pub change: RuleChange,
    /// The old requirement and conditions, in canonical words.
    pub old: Option<String>,
    /// The new ones.
    pub new: Option<String>,
    /// The limits compared, for tightened and loosened rules.
    pub limits: Option<Limits>,
    /// What else differs, in words (`condition`, `penalty`, `decision`, ...).
    pub notes: Vec<String>,
    /// The decision rule that decides the rule, old and new, when the rule's own changed it
    /// (`simple acceptance, this rule's own` → `guarded rejection, the rulebook's`). A change of
    /// the rulebook's decision rule alone is [`EditionDiff::decision`].
    pub decision: Option<(String, String)>,
    /// The bulletin whose version of the rule the new edition does not carry forward: the
    /// old side's rule came from it, and the new edition drops or changes it.
    pub lapses: Option<String>,
}

/// Which of an edition's rules a side takes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum When {
    /// As published, on its effective date: no later bulletin.
    Published,
    /// On this date: every bulletin in force by then.
    On(Date),
    /// With every bulletin it has.
    Latest,
}

impl When {
    /// Whether a bulletin effective `from` is in force.
    fn admits(self, from: Date) -> bool {
        match self {
            When::Published => false,
            When::On(d) => from <= d,
            When::Latest => true,
        }
    }

    /// The rules of `class` in force, and the bulletins applied.
    pub fn rules(self, class: &Class) -> (&[ClassRule], &[String]) {
        match class.amended.iter().rev().find(|a| self.admits(a.from)) {
            Some(a) => (&a.rules, &a.bulletins),
            None => (&class.rules, &class.edition_bulletins),
        }
    }

    /// `as published`, `on 2027-07-01`, `with every bulletin`.
    pub fn words(self) -> String {
        match self {
            When::Published => "as published".to_string(),
            When::On(d) => format!("on {d}"),
            When::Latest => "with every bulletin".to_string(),
        }
    }
}

/// What the bulletins coming into force on one date change in one class of one edition.
#[derive(Clone, Debug)]
pub struct BulletinStep {
    /// The class.
    pub class: String,
    /// The edition the bulletins belong to.
    pub edition: String,
    /// The date they come into force.
    pub from: String,
    /// The bulletins that come into force then.
    pub bulletins: Vec<String>,
    /// The rules they change, each against the rules in force just before.
    pub rules: Vec<RuleDiff>,
}

/// What happened to one measurement of the schema.
#[derive(Clone, Debug, serde::Serialize)]
pub struct MeasurementDiff {
    /// Its name.
    pub name: String,
    /// `added`, `dropped` or `changed`.
    pub change: &'static str,
    /// Its description in the old edition.
    pub old: Option<String>,
    /// In the new one.
    pub new: Option<String>,
}

/// Entries added to and removed from one parts list.
#[derive(Clone, Debug, serde::Serialize)]
pub struct ListDiff {
    /// The list.
    pub name: String,
    /// Entries only in the new edition.
    pub added: Vec<String>,
    /// Entries only in the old edition.
    pub removed: Vec<String>,
    /// Whether the list ignores case, old then new, when that changed: a list that starts
    /// ignoring case takes every case of its entries, one that stops takes only the case
    /// written.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub ignoring_case: Option<CaseChange>,
}

/// A parts list's `ignoring case`, before and after.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
pub struct CaseChange {
    /// In the old edition.
    pub old: bool,
    /// In the new edition.
    pub new: bool,
}

/// Everything that differs between two editions.
#[derive(Clone, Debug)]
pub struct EditionDiff {
    /// The old edition's name and effective date.
    pub old: (String, String),
    /// The new edition's.
    pub new: (String, String),
    /// The series.
    pub series: String,
    /// The decision rule, when it changed: old, new.
    pub decision: Option<(&'static str, &'static str)>,
    /// Measurement schema changes.
    pub measurements: Vec<MeasurementDiff>,
    /// Parts list changes.
    pub lists: Vec<ListDiff>,
    /// Bulletins of the old edition not in the new, and of the new not in the old.
    pub bulletins: (Vec<String>, Vec<String>),
    /// Classes only in the old edition, and only in the new.
    pub classes: (Vec<String>, Vec<String>),
    /// Rule changes from the old side to the new edition, class by class in the new
    /// edition's order (none when both sides are one edition).
    pub rules: Vec<RuleDiff>,
    /// What the old edition's bulletins in force on the old side changed, in date order.
    pub old_steps: Vec<BulletinStep>,
    /// What the new edition's bulletins in force on the new side changed (for one edition
    /// on two dates: the bulletins between the dates).
    pub new_steps: Vec<BulletinStep>,
    /// Which rules each side takes.
    pub sides: (When, When),
}

/// Why two rulebooks cannot be compared.
#[derive(Clone, Debug, PartialEq)]
pub enum Incomparable {
    /// They belong to different series.
    DifferentSeries(String, String),
}

/// Compares two editions as published, limited to one class when `class` is given.
pub fn compare(
    old: &CheckedRulebook,
    new: &CheckedRulebook,
    class: Option<&str>,
) -> Result<EditionDiff, Incomparable> {
    compare_on(old, new, (When::Published, When::Published), class)
}

/// Whether two checked rulebooks are one edition (the same name and effective date).
pub fn same_edition(a: &CheckedRulebook, b: &CheckedRulebook) -> bool {
    a.edition == b.edition && a.effective == b.effective
}

/// Compares the old edition taken `sides.0` with the new taken `sides.1`. Between two
/// editions: the old edition's bulletin steps, the change to the new edition as published
/// (marking what lapses), then the new edition's bulletin steps. One edition on two sides:
/// the bulletin steps after the old side's date, up to the new side's.
pub fn compare_on(
    old: &CheckedRulebook,
    new: &CheckedRulebook,
    sides: (When, When),
    class: Option<&str>,
) -> Result<EditionDiff, Incomparable> {
    if old.series != new.series {
        return Err(Incomparable::DifferentSeries(
            old.series.clone(),
            new.series.clone(),
        ));
    }
    let names = |b: &CheckedRulebook| -> Vec<String> {
        b.classes
            .iter()
            .map(|c| c.name.clone())
            .filter(|n| class.is_none_or(|c| c == n))
            .collect()
    };
    let (old_classes, new_classes) = (names(old), names(new));
    let mut rules = Vec::new();
    let (mut old_steps, mut new_steps) = (Vec::new(), Vec::new());
    let one_edition = same_edition(old, new);
    for name in new_classes.iter().filter(|n| old_classes.contains(n)) {
        let (Some(o), Some(n)) = (old.class(name), new.class(name)) else {
            continue;
        };
        if one_edition {
            let (_, known) = sides.0.rules(o);
            new_steps.extend(steps(new, n, known, sides.1));
            continue;
        }
        old_steps.extend(steps(old, o, &[], sides.0));
        let (before, _) = sides.0.rules(o);
        let mut changes = class_rules(old, new, name, before, &n.rules);
        mark_lapses(&mut changes, before);
        rules.extend(changes);
        new_steps.extend(steps(new, n, &[], sides.1));
    }
    let ids =
        |b: &CheckedRulebook| -> Vec<String> { b.bulletins.iter().map(|x| x.id.clone()).collect() };
    let (old_ids, new_ids) = (ids(old), ids(new));
    Ok(EditionDiff {
        old: (old.edition.clone(), old.effective.to_string()),
        new: (new.edition.clone(), new.effective.to_string()),
        series: new.series.clone(),
        decision: (old.decision != new.decision)
            .then(|| (old.decision.words(), new.decision.words())),
        measurements: measurements(old, new),
        lists: lists(old, new),
        bulletins: (only_in(&old_ids, &new_ids), only_in(&new_ids, &old_ids)),
        classes: (
            only_in(&old_classes, &new_classes),
            only_in(&new_classes, &old_classes),
        ),
        rules,
        old_steps,
        new_steps,
        sides,
    })
}

/// The bulletin steps of `class` in force `until` that bring a bulletin not in `known`, each
/// compared with the rules in force just before it.
fn steps(
    book: &CheckedRulebook,
    class: &Class,
    known: &[String],
    until: When,
) -> Vec<BulletinStep> {
    let mut out = Vec::new();
    let (mut rules, mut applied): (&[ClassRule], &[String]) =
        (&class.rules, &class.edition_bulletins);
    for a in class.amended.iter().filter(|a| until.admits(a.from)) {
        let bulletins: Vec<String> = only_in(&a.bulletins, applied);
        if bulletins.iter().any(|b| !known.contains(b)) {
            out.push(BulletinStep {
                class: class.name.clone(),
                edition: book.edition.clone(),
                from: a.from.to_string(),
                rules: class_rules(book, book, &class.name, rules, &a.rules),
                bulletins,
            });
        }
        (rules, applied) = (&a.rules, &a.bulletins);
    }
    out
}

/// Marks each change whose old rule a bulletin wrote: the new edition does not carry that
/// bulletin's version forward.
fn mark_lapses(changes: &mut [RuleDiff], old: &[ClassRule]) {
    for c in changes.iter_mut().filter(|c| c.change != RuleChange::Added) {
        let section = c.renumbered_from.as_deref().unwrap_or(&c.section);
        if let Some(Origin::Bulletin(b)) = old
            .iter()
            .find(|r| r.rule.section.text == section)
            .map(|r| &r.origin)
        {
            c.lapses = Some(b.clone());
        }
    }
}

fn only_in(a: &[String], b: &[String]) -> Vec<String> {
    entries_only_in(a, b, false)
}

/// The entries of `a` not in `b`; with `fold`, compared without case.
fn entries_only_in(a: &[String], b: &[String], fold: bool) -> Vec<String> {
    let same = |x: &String, y: &String| {
        if fold {
            x.eq_ignore_ascii_case(y)
        } else {
            x == y
        }
    };
    a.iter()
        .filter(|x| !b.iter().any(|y| same(x, y)))
        .cloned()
        .collect()
}

fn class_rules(
    old_book: &CheckedRulebook,
    new_book: &CheckedRulebook,
    class: &str,
    old: &[ClassRule],
    new: &[ClassRule],
) -> Vec<RuleDiff> {
    let mut out = Vec::new();
    let mut matched_old: Vec<usize> = Vec::new();
    for n in new {
        let by_section = old
            .iter()
            .position(|o| o.rule.section.text == n.rule.section.text);
        let by_title = || {
            old.iter().enumerate().position(|(i, o)| {
                o.rule.title.value == n.rule.title.value
                    && !new
                        .iter()
                        .any(|x| x.rule.section.text == o.rule.section.text)
                    && !matched_old.contains(&i)
            })
        };
        let Some(i) = by_section.or_else(by_title) else {
            out.push(rule_diff(
                class,
                n,
                None,
                RuleChange::Added,
                None,
                Some(words(n)),
            ));
            continue;
        };
        matched_old.push(i);
        let o = &old[i];
        let mut diff = compare_rule(old_book, new_book, class, o, n);
        if o.rule.section.text != n.rule.section.text {
            diff.renumbered_from = Some(o.rule.section.text.clone());
            if diff.change == RuleChange::Changed && diff.notes.is_empty() && diff.limits.is_none()
            {
                diff.notes.push("renumbered".to_string());
            }
        }
        if diff.change != RuleChange::Changed
            || !diff.notes.is_empty()
            || diff.renumbered_from.is_some()
        {
            out.push(diff);
        }
    }
    for (i, o) in old.iter().enumerate() {
        if !matched_old.contains(&i) {
            out.push(rule_diff(
                class,
                o,
                None,
                RuleChange::Dropped,
                Some(words(o)),
                None,
            ));
        }
    }
    out
}

fn rule_diff(
    class: &str,
    r: &ClassRule,
    limits: Option<Limits>,
    change: RuleChange,
    old: Option<String>,
    new: Option<String>,
) -> RuleDiff {
    RuleDiff {
        class: class.to_string(),
        section: r.rule.section.text.clone(),
        renumbered_from: None,
        title: r.rule.title.value.clone(),
        change,
        old,
        new,
        limits,
        notes: Vec::new(),
        decision: None,
        lapses: None,
    }
}

/// A rule's requirement and conditions in canonical words.
fn words(r: &ClassRule) -> String {
    let mut text = r.requirement.clone();
    for c in &r.condition_texts {
        text.push_str(&format!(" when {c}"));
    }
    text
}

/// Compares a matched pair; `Changed` with no notes and no limits means nothing differs.
fn compare_rule(
    old_book: &CheckedRulebook,
    new_book: &CheckedRulebook,
    class: &str,
    o: &ClassRule,
    n: &ClassRule,
) -> RuleDiff {
    let mut notes = Vec::new();
    if o.condition_texts != n.condition_texts {
        notes.push("condition".to_string());
    }
    if o.rule.title.value != n.rule.title.value {
        notes.push("title".to_string());
    }
    if o.rule.penalty.as_ref().map(|p| &p.value) != n.rule.penalty.as_ref().map(|p| &p.value) {
        notes.push("penalty".to_string());
    }
    let mut limits = None;
    let mut change = RuleChange::Changed;
    if o.requirement != n.requirement {
        match (bound(old_book, o), bound(new_book, n)) {
            (Some(a), Some(b)) if a.subject == b.subject && a.side == b.side => {
                // `None`: the same limit, written another way
                if let Some(moved) = direction(&a, &b) {
                    change = moved;
                    if moved == RuleChange::Changed {
                        notes.push("limit".to_string());
                    }
                    limits = Some(Limits {
                        old: a.values(),
                        new: b.values(),
                        unit: a.unit.or(b.unit),
                    });
                }
            }
            _ => notes.push("requirement".to_string()),
        }
    }
    let decision = decision_change(old_book, new_book, o, n);
    if decision.is_some() {
        notes.push("decision".to_string());
    }
    let mut diff = rule_diff(class, n, limits, change, Some(words(o)), Some(words(n)));
    diff.notes = notes;
    diff.decision = decision;
    diff
}

/// The decision rule that decides a matched pair in each edition, in words, when the rule's
/// own `decision` line changed and with it the decision rule in force; `None` when the same
/// decision rule decides it in both (a rule that now states the rulebook's own decision rule
/// is decided as before).
fn decision_change(
    old_book: &CheckedRulebook,
    new_book: &CheckedRulebook,
    o: &ClassRule,
    n: &ClassRule,
) -> Option<(String, String)> {
    let own = |r: &ClassRule| r.rule.decision.as_ref().map(|d| d.rule);
    let in_force = |r: &ClassRule, book: &CheckedRulebook| r.decision_in_force(None, book.decision);
    let (before, after) = (in_force(o, old_book), in_force(n, new_book));
    if own(o) == own(n) || before == after {
        return None;
    }
    let whose = |r: &ClassRule| {
        if own(r).is_some() {
            "this rule's own"
        } else {
            "the rulebook's"
        }
    };
    Some((
        format!("{}, {}", before.words(), whose(o)),
        format!("{}, {}", after.words(), whose(n)),
    ))
}

/// A numeric limit on a subject: the values it allows in SI units, allowance included.
struct Bound {
    subject: String,
    side: SideKind,
    allowed: Interval,
    unit: Option<&'static Unit>,
}

impl Bound {
    /// The limit's value, or the low and high ends of a range.
    fn values(&self) -> (f64, Option<f64>) {
        match (self.allowed.low, self.allowed.high) {
            (Some(low), Some(high)) => (low.value, Some(high.value)),
            (Some(end), None) | (None, Some(end)) => (end.value, None),
            (None, None) => (f64::NAN, None),
        }
    }
}

/// The numeric limit a rule sets, when it is a one-sided limit or a range whose limits are
/// constants, whichever side they are written on.
fn bound(book: &CheckedRulebook, r: &ClassRule) -> Option<Bound> {
    let limit = r.limit.as_ref()?;
    if !matches!(
        limit.kind(),
        SideKind::Upper | SideKind::Lower | SideKind::Between
    ) {
        return None;
    }
    let numbers = limit.evaluated(|e| book.constant(e).filter(|v| v.is_finite()))?;
    Some(Bound {
        subject: crate::parse::print::expr_text(&limit.subject),
        side: limit.kind(),
        allowed: numbers.interval()?,
        unit: first_unit(limit.limits().0),
    })
}

fn first_unit(e: &Expr) -> Option<&'static Unit> {
    match &e.kind {
        ExprKind::Quantity(q) => q.unit.as_ref().and_then(|u| units::lookup(&u.symbol)),
        ExprKind::Negate(inner) => first_unit(inner),
        ExprKind::Binary { left, right, .. } => first_unit(left).or_else(|| first_unit(right)),
        _ => None,
    }
}

/// How one end of the allowed values moved.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Moved {
    /// It allows as much as before.
    Same,
    /// It allows less.
    In,
    /// It allows more.
    Out,
}

/// How an end moved from `old` to `new`; `lower` for the low end. Ends equal but for the
/// rounding of a unit conversion are the same; at the same value a closed end allows more.
fn moved(old: Option<End>, new: Option<End>, lower: bool) -> Moved {
    let same = |a: f64, b: f64| (a - b).abs() <= 1e-12 * a.abs().max(b.abs());
    match (old, new) {
        (None, None) => Moved::Same,
        (None, Some(_)) => Moved::In,
        (Some(_), None) => Moved::Out,
        (Some(a), Some(b)) if same(a.value, b.value) => match (a.closed, b.closed) {
            (true, false) => Moved::In,
            (false, true) => Moved::Out,
            _ => Moved::Same,
        },
        (Some(a), Some(b)) => {
            if (b.value > a.value) == lower {
                Moved::In
            } else {
                Moved::Out
            }
        }
    }
}

/// Tightened, loosened, changed (a range that grew at one end and shrank at the other), or
/// `None` when the limit is the same.
fn direction(old: &Bound, new: &Bound) -> Option<RuleChange> {
    let low = moved(old.allowed.low, new.allowed.low, true);
    let high = moved(old.allowed.high, new.allowed.high, false);
    match (low, high) {
        (Moved::Same, Moved::Same) => None,
        (Moved::Same | Moved::In, Moved::Same | Moved::In) => Some(RuleChange::Tightened),
        (Moved::Same | Moved::Out, Moved::Same | Moved::Out) => Some(RuleChange::Loosened),
        _ => Some(RuleChange::Changed),
    }
}

fn describe(m: &Measurement) -> String {
    let kind = match m.kind {
        ValueKind::Text => "text".to_string(),
        ValueKind::Number(_) => m.dimension_word.clone(),
    };
    let shape = if m.per_cylinder { ", per cylinder" } else { "" };
    let need = if m.required {
        ", required"
    } else {
        ", optional"
    };
    format!("{kind}{shape}{need}")
}

fn measurements(old: &CheckedRulebook, new: &CheckedRulebook) -> Vec<MeasurementDiff> {
    let mut out = Vec::new();
    for n in &new.measurements {
        match old.measurement(&n.name) {
            None => out.push(MeasurementDiff {
                name: n.name.clone(),
                change: "added",
                old: None,
                new: Some(describe(n)),
            }),
            Some(o) if describe(o) != describe(n) => out.push(MeasurementDiff {
                name: n.name.clone(),
                change: "changed",
                old: Some(describe(o)),
                new: Some(describe(n)),
            }),
            Some(_) => {}
        }
    }
    for o in old
        .measurements
        .iter()
        .filter(|o| new.measurement(&o.name).is_none())
    {
        out.push(MeasurementDiff {
            name: o.name.clone(),
            change: "dropped",
            old: Some(describe(o)),
            new: None,
        });
    }
    out
}

fn entry_text(e: &PartEntry) -> String {
    match e {
        PartEntry::Exact(s) => format!("\"{s}\""),
        PartEntry::Pattern(_, source) => format!("/{source}/"),
    }
}

fn lists(old: &CheckedRulebook, new: &CheckedRulebook) -> Vec<ListDiff> {
    let list = |b: &'_ CheckedRulebook, name: &str| -> (Vec<String>, bool) {
        b.lists
            .iter()
            .find(|l| l.name == name)
            .map(|l| (l.entries.iter().map(entry_text).collect(), l.ignore_case))
            .unwrap_or_default()
    };
    let mut names: Vec<String> = new
        .lists
        .iter()
        .chain(&old.lists)
        .map(|l| l.name.clone())
        .collect();
    names.sort();
    names.dedup();
    names
        .into_iter()
        .filter_map(|name| {
            let ((o, old_case), (n, new_case)) = (list(old, &name), list(new, &name));
            // entries of a list ignoring case on both sides compare without case
            let fold = old_case && new_case;
            let diff = ListDiff {
                added: entries_only_in(&n, &o, fold),
                removed: entries_only_in(&o, &n, fold),
                ignoring_case: (old_case != new_case).then_some(CaseChange {
                    old: old_case,
                    new: new_case,
                }),
                name,
            };
            let changed =
                !diff.added.is_empty() || !diff.removed.is_empty() || diff.ignoring_case.is_some();
            changed.then_some(diff)
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    const CI: f64 = 0.0254 * 0.0254 * 0.0254; // NIST SP 811 B.8
    const LITRE: f64 = 1e-3;

    fn bound(side: SideKind, values: (f64, Option<f64>)) -> Bound {
        let allowed = match (side, values) {
            (SideKind::Upper, (v, _)) => Interval::below(v, true),
            (SideKind::Lower, (v, _)) => Interval::above(v, true),
            (_, (low, high)) => Interval::closed(low, high.unwrap_or(low)),
        };
        Bound {
            subject: "x".to_string(),
            side,
            allowed,
            unit: None,
        }
    }

    #[test]
    fn an_upper_limit_lowered_is_tightened_across_units() {
        // 365 ci to 5.9 L: 5.9 L is 360.04 ci, so the cap came down
        let d = direction(
            &bound(SideKind::Upper, (365.0 * CI, None)),
            &bound(SideKind::Upper, (5.9 * LITRE, None)),
        );
        assert_eq!(d, Some(RuleChange::Tightened));
        // 360 ci to 5.9 L: 5.9 L is a little more than 360 ci, so the cap went up
        let d = direction(
            &bound(SideKind::Upper, (360.0 * CI, None)),
            &bound(SideKind::Upper, (5.9 * LITRE, None)),
        );
        assert_eq!(d, Some(RuleChange::Loosened));
    }

    #[test]
    fn a_lower_limit_lowered_is_loosened() {
        let lb = 0.453_592_37;
        assert_eq!(
            direction(
                &bound(SideKind::Lower, (3000.0 * lb, None)),
                &bound(SideKind::Lower, (2950.0 * lb, None))
            ),
            Some(RuleChange::Loosened)
        );
        assert_eq!(
            direction(
                &bound(SideKind::Lower, (1360.0, None)),
                &bound(SideKind::Lower, (3000.0 * lb, None))
            ),
            Some(RuleChange::Tightened)
        );
    }

    #[test]
    fn the_same_limit_in_another_unit_is_no_change() {
        // 1 in is 25.4 mm exactly (NIST SP 811 B.8)
        assert_eq!(
            direction(
                &bound(SideKind::Upper, (0.0254, None)),
                &bound(SideKind::Upper, (25.4e-3, None))
            ),
            None
        );
    }

    #[test]
    fn a_range_narrowed_is_tightened_and_one_shifted_is_changed() {
        let r = |a: f64, b: f64| bound(SideKind::Between, (a, Some(b)));
        assert_eq!(
            direction(&r(1.0, 3.0), &r(1.5, 2.5)),
            Some(RuleChange::Tightened)
        );
        assert_eq!(
            direction(&r(1.0, 3.0), &r(0.5, 3.5)),
            Some(RuleChange::Loosened)
        );
        assert_eq!(
            direction(&r(1.0, 3.0), &r(2.0, 4.0)),
            Some(RuleChange::Changed)
        );
    }
}
