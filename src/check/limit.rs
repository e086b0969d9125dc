//! The normal form of a limit. A comparison may be written with its limit on either side
//! (`bore <= 4.030 in`, `4.030 in >= max(bore)`) or as a range (`stroke between A and B`);
//! [`Limit`] is the one shape every later pass reads: the subject (the side measured from the
//! engine), which side of it the limit stands on, the limit itself, the written allowance and
//! whether the limit value itself is excluded. Membership and pattern tests are not limits.
//!
//! The form is generic over the expression type, so that it can hold syntax-tree expressions
//! (`Limit<&ast::Expr>`, `Limit<ast::Expr>`), resolved expressions, or numbers once the limit
//! side is evaluated (`Limit<&ast::Expr, f64>`, whose [`Limit::interval`] is the set of values
//! the rule allows).
//!
//! Which side is the limit is decided by [`Operand::is_fixed`]: over the syntax tree, a side
//! is fixed when it reads no name but `pi`. A `define` whose value is a constant is a name, so
//! `cap >= bore` keeps `cap` as its subject; a resolved tree that knows which values are
//! constants can say better through its own `Operand`.

use super::interval::Interval;
use crate::parse::ast::{CompareOp, Expr, ExprKind, Name, Test, TestKind};

/// An operand of a comparison that can tell whether it is a fixed value of the rulebook (a
/// number, a unit, `pi`, arithmetic and calls on them) rather than something read from the
/// engine. The fixed side of a comparison is its limit.
pub trait Operand {
    /// True when the operand reads nothing from an engine.
    fn is_fixed(&self) -> bool;
}

impl Operand for &Expr {
    fn is_fixed(&self) -> bool {
        let mut names = Vec::new();
        self.names(&mut names);
        names.iter().all(|n| *n == "pi")
    }
}

impl Operand for Expr {
    fn is_fixed(&self) -> bool {
        <&Expr as Operand>::is_fixed(&self)
    }
}

/// Where the limit stands relative to the subject, with the limit expression(s).
#[derive(Clone, Debug, PartialEq)]
pub enum Side<E> {
    /// The subject may not exceed the limit (`<=`, or `<` when `strict`).
    Upper {
        /// The limit.
        limit: E,
        /// The limit value itself fails (`<`).
        strict: bool,
    },
    /// The subject may not fall below the limit (`>=`, or `>` when `strict`).
    Lower {
        /// The limit.
        limit: E,
        /// The limit value itself fails (`>`).
        strict: bool,
    },
    /// The subject must lie from `low` to `high`, both included (`between`).
    Between {
        /// The lower limit.
        low: E,
        /// The upper limit.
        high: E,
    },
    /// The subject must equal the value (`==`).
    Equal {
        /// The required value.
        value: E,
    },
    /// The subject must differ from the value (`!=`).
    NotEqual {
        /// The excluded value.
        value: E,
    },
}

/// Which of the five sides, without the limits: for asking whether two limits are of the
/// same kind.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SideKind {
    /// [`Side::Upper`].
    Upper,
    /// [`Side::Lower`].
    Lower,
    /// [`Side::Between`].
    Between,
    /// [`Side::Equal`].
    Equal,
    /// [`Side::NotEqual`].
    NotEqual,
}

/// A limit in normal form: the subject of type `S`, the limits and the allowance of type `L`
/// (the same type unless the limit side has been evaluated to numbers).
#[derive(Clone, Debug, PartialEq)]
pub struct Limit<S, L = S> {
    /// The side measured from the engine.
    pub subject: S,
    /// Where the limit stands, with the limit expression(s).
    pub side: Side<L>,
    /// The written allowance: it raises an upper limit, lowers a lower one and widens both ends
    /// of a range.
    pub allowance: Option<L>,
    /// Written with the limit first (`4.030 in >= max(bore)`).
    pub reversed: bool,
}

impl<E: Operand> Limit<E> {
    /// The normal form of `left op right [allowing allowance]`. The limit is the right side,
    /// unless the left side is fixed and the right is not: then the sides swap and the
    /// operator turns round (`3 < x` is `x > 3`).
    pub fn compare(left: E, op: CompareOp, right: E, allowance: Option<E>) -> Limit<E> {
        let reversed = left.is_fixed() && !right.is_fixed();
        let (subject, limit, op) = if reversed {
            (right, left, op.flipped())
        } else {
            (left, right, op)
        };
        let side = match op {
            CompareOp::AtMost => Side::Upper {
                limit,
                strict: false,
            },
            CompareOp::Below => Side::Upper {
                limit,
                strict: true,
            },
            CompareOp::AtLeast => Side::Lower {
                limit,
                strict: false,
            },
            CompareOp::Above => Side::Lower {
                limit,
                strict: true,
            },
            CompareOp::Equal => Side::Equal { value: limit },
            CompareOp::NotEqual => Side::NotEqual { value: limit },
        };
        Limit {
            subject,
            side,
            allowance,
            reversed,
        }
    }

    /// The normal form of `subject between low and high [allowing allowance]`.
    pub fn between(subject: E, low: E, high: E, allowance: Option<E>) -> Limit<E> {
        Limit {
            subject,
            side: Side::Between { low, high },
            allowance,
            reversed: false,
        }
    }
}

impl<S, L> Limit<S, L> {
    /// Which side, without the limits.
    pub fn kind(&self) -> SideKind {
        match self.side {
            Side::Upper { .. } => SideKind::Upper,
            Side::Lower { .. } => SideKind::Lower,
            Side::Between { .. } => SideKind::Between,
            Side::Equal { .. } => SideKind::Equal,
            Side::NotEqual { .. } => SideKind::NotEqual,
        }
    }

    /// True when the limit value itself fails (`<`, `>`).
    pub fn strict(&self) -> bool {
        matches!(
            self.side,
            Side::Upper { strict: true, .. } | Side::Lower { strict: true, .. }
        )
    }

    /// The operator that reads `subject OP limit` for a one-sided limit or an equality
    /// (`None` for a range).
    pub fn op(&self) -> Option<CompareOp> {
        Some(match self.side {
            Side::Upper { strict: false, .. } => CompareOp::AtMost,
            Side::Upper { strict: true, .. } => CompareOp::Below,
            Side::Lower { strict: false, .. } => CompareOp::AtLeast,
            Side::Lower { strict: true, .. } => CompareOp::Above,
            Side::Equal { .. } => CompareOp::Equal,
            Side::NotEqual { .. } => CompareOp::NotEqual,
            Side::Between { .. } => return None,
        })
    }

    /// The limit expressions, low end first for a range.
    pub fn limits(&self) -> (&L, Option<&L>) {
        match &self.side {
            Side::Upper { limit, .. } | Side::Lower { limit, .. } => (limit, None),
            Side::Equal { value } | Side::NotEqual { value } => (value, None),
            Side::Between { low, high } => (low, Some(high)),
        }
    }

    /// The same limit with the subject mapped by `subject` and every limit and the allowance
    /// by `limit`.
    pub fn map<T, M>(
        self,
        subject: impl FnOnce(S) -> T,
        mut limit: impl FnMut(L) -> M,
    ) -> Limit<T, M> {
        Limit {
            subject: subject(self.subject),
            side: self.side.map(&mut limit),
            allowance: self.allowance.map(limit),
            reversed: self.reversed,
        }
    }

    /// The limit with its limits and allowance evaluated by `constant`, the subject borrowed;
    /// `None` when any of them is not a constant.
    pub fn evaluated(&self, constant: impl FnMut(&L) -> Option<f64>) -> Option<Limit<&S, f64>> {
        self.as_ref().map(|s| s, constant).transpose()
    }

    /// The same limit with every part borrowed.
    pub fn as_ref(&self) -> Limit<&S, &L> {
        Limit {
            subject: &self.subject,
            side: self.side.as_ref(),
            allowance: self.allowance.as_ref(),
            reversed: self.reversed,
        }
    }
}

impl<L> Side<L> {
    /// The same side with each limit mapped by `f`.
    pub fn map<M>(self, mut f: impl FnMut(L) -> M) -> Side<M> {
        match self {
            Side::Upper { limit, strict } => Side::Upper {
                limit: f(limit),
                strict,
            },
            Side::Lower { limit, strict } => Side::Lower {
                limit: f(limit),
                strict,
            },
            Side::Between { low, high } => Side::Between {
                low: f(low),
                high: f(high),
            },
            Side::Equal { value } => Side::Equal { value: f(value) },
            Side::NotEqual { value } => Side::NotEqual { value: f(value) },
        }
    }

    /// The same side with each limit borrowed.
    pub fn as_ref(&self) -> Side<&L> {
        match self {
            Side::Upper { limit, strict } => Side::Upper {
                limit,
                strict: *strict,
            },
            Side::Lower { limit, strict } => Side::Lower {
                limit,
                strict: *strict,
            },
            Side::Between { low, high } => Side::Between { low, high },
            Side::Equal { value } => Side::Equal { value },
            Side::NotEqual { value } => Side::NotEqual { value },
        }
    }
}

impl<S, L> Limit<S, Option<L>> {
    /// The limit when every limit and the allowance is known; `None` when any is not (after
    /// mapping the limits to constants, a limit that is not a constant).
    pub fn transpose(self) -> Option<Limit<S, L>> {
        let side = match self.side {
            Side::Upper { limit, strict } => Side::Upper {
                limit: limit?,
                strict,
            },
            Side::Lower { limit, strict } => Side::Lower {
                limit: limit?,
                strict,
            },
            Side::Between { low, high } => Side::Between {
                low: low?,
                high: high?,
            },
            Side::Equal { value } => Side::Equal { value: value? },
            Side::NotEqual { value } => Side::NotEqual { value: value? },
        };
        let allowance = match self.allowance {
            Some(a) => Some(a?),
            None => None,
        };
        Some(Limit {
            subject: self.subject,
            side,
            allowance,
            reversed: self.reversed,
        })
    }
}

impl<S> Limit<S, f64> {
    /// The values the subject may take, the allowance applied, when the limit is a number
    /// (`None` for `!=`, which allows everything but one value).
    pub fn interval(&self) -> Option<Interval> {
        let slack = self.allowance.unwrap_or(0.0);
        Some(match self.side {
            Side::Upper { limit, strict } => Interval::below(limit + slack, !strict),
            Side::Lower { limit, strict } => Interval::above(limit - slack, !strict),
            Side::Between { low, high } => Interval::closed(low - slack, high + slack),
            Side::Equal { value } => Interval::closed(value, value),
            Side::NotEqual { .. } => return None,
        })
    }
}

/// The limit a test sets, in normal form; `None` for membership and pattern tests.
pub fn of(test: &Test) -> Option<Limit<&Expr>> {
    match &test.kind {
        TestKind::Compare {
            left,
            op,
            right,
            allowance,
        } => Some(Limit::compare(left, *op, right, allowance.as_ref())),
        TestKind::Between {
            subject,
            low,
            high,
            allowance,
        } => Some(Limit::between(subject, low, high, allowance.as_ref())),
        TestKind::Member { .. } | TestKind::Matches { .. } => None,
    }
}

/// The limit a test sets, owning its expressions (for keeping beside the rule).
pub fn owned(test: &Test) -> Option<Limit<Expr>> {
    of(test).map(|l| l.map(Expr::clone, Expr::clone))
}

/// What a test is about: a limit's subject, or the identifier a membership or pattern test
/// reads.
pub fn subject(test: &Test) -> &Expr {
    match (&test.kind, of(test)) {
        (_, Some(limit)) => limit.subject,
        (TestKind::Member { subject, .. } | TestKind::Matches { subject, .. }, None)
        | (TestKind::Between { subject, .. }, None)
        | (TestKind::Compare { left: subject, .. }, None) => subject,
    }
}

/// A `±` written where a limit stands: the literal, and the name of the `define` it was
/// reached through when the limit names one.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct UncertainOnLimit<'e> {
    /// The literal with the stated uncertainty.
    pub literal: &'e Expr,
    /// The name written on the limit, when the literal is inside that `define`.
    pub through: Option<&'e Name>,
}

/// Names are followed through `define`s at most this deep (cycles are reported elsewhere).
const MAX_LIMIT_DEPTH: u32 = 32;

/// The literals with a stated uncertainty on one side of a limit, when that side is a limit of
/// the rulebook: a side that reads no measurement, even through the `define`s it names
/// (`lookup` gives a derived value's expression, `None` for a measurement). A side that reads
/// the engine is a derived value, whose `±` is an uncertainty of its own: it gives none.
///
/// ISO 14253-1 gives a specification limit no measurement uncertainty, so the checker refuses
/// every literal this returns.
pub fn uncertain_on_limit<'e>(
    side: &'e Expr,
    lookup: &dyn Fn(&str) -> Option<&'e Expr>,
) -> Vec<UncertainOnLimit<'e>> {
    let mut found = Vec::new();
    if collect_uncertain(side, None, lookup, 0, &mut found) {
        found
    } else {
        Vec::new()
    }
}

/// Adds the uncertain literals of `e` to `found`; false when `e` reads the engine.
fn collect_uncertain<'e>(
    e: &'e Expr,
    through: Option<&'e Name>,
    lookup: &dyn Fn(&str) -> Option<&'e Expr>,
    depth: u32,
    found: &mut Vec<UncertainOnLimit<'e>>,
) -> bool {
    if depth > MAX_LIMIT_DEPTH {
        return false;
    }
    match &e.kind {
        ExprKind::Quantity(q) => {
            if q.uncertainty.is_some() {
                found.push(UncertainOnLimit {
                    literal: e,
                    through,
                });
            }
            true
        }
        ExprKind::Text(_) => true,
        ExprKind::Name(n) if n.text == "pi" => true,
        ExprKind::Name(n) => match lookup(&n.text) {
            Some(body) => collect_uncertain(body, through.or(Some(n)), lookup, depth + 1, found),
            None => false,
        },
        ExprKind::Negate(inner) => collect_uncertain(inner, through, lookup, depth, found),
        ExprKind::Binary { left, right, .. } => {
            let l = collect_uncertain(left, through, lookup, depth, found);
            l && collect_uncertain(right, through, lookup, depth, found)
        }
        ExprKind::Call { args, .. } => args
            .iter()
            .all(|a| collect_uncertain(&a.value, through, lookup, depth, found)),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::check::interval::End;
    use crate::parse::ast::{ClassItem, Item};
    use crate::parse::parse_rulebook;
    use crate::parse::print::expr_text;

    /// The `require` test of a one-rule rulebook.
    fn require(test: &str) -> Test {
        let text = format!(
            "series \"Tamsin Valley Stock Car Club\"\nedition \"1\" effective 2027-01-01\n\
             decision simple acceptance\nclass street \"Street\"\n  rule 1.1 \"Rule\"\n    \
             require {test}\n  end\nend\n"
        );
        let (book, problems) = parse_rulebook(0, &text);
        assert!(problems.is_empty(), "{test}: {problems:?}");
        let rule = book.items.into_iter().find_map(|i| match i {
            Item::Class(c) => c.body.into_iter().find_map(|b| match b {
                ClassItem::Rule(r) => Some(r),
                _ => None,
            }),
            _ => None,
        });
        rule.unwrap_or_else(|| panic!("no rule in {text}")).require
    }

    /// The normal form in words: subject, side, limit(s), allowance, strict, reversed.
    fn form(test: &str) -> (String, SideKind, String, String, bool, bool) {
        let t = require(test);
        let l = of(&t).unwrap_or_else(|| panic!("{test} is not a limit"));
        let limits = match l.limits() {
            (one, None) => expr_text(one),
            (low, Some(high)) => format!("{} .. {}", expr_text(low), expr_text(high)),
        };
        (
            expr_text(l.subject),
            l.kind(),
            limits,
            l.allowance.map(expr_text).unwrap_or_default(),
            l.strict(),
            l.reversed,
        )
    }

    fn expect(
        subject: &str,
        kind: SideKind,
        limit: &str,
        allowance: &str,
        strict: bool,
        reversed: bool,
    ) -> (String, SideKind, String, String, bool, bool) {
        (
            subject.to_string(),
            kind,
            limit.to_string(),
            allowance.to_string(),
            strict,
            reversed,
        )
    }

    #[test]
    fn an_upper_limit_written_either_way() {
        let upper = expect("max(bore)", SideKind::Upper, "4.030 in", "", false, false);
        assert_eq!(form("max(bore) <= 4.030 in"), upper);
        assert_eq!(
            form("4.030 in >= max(bore)"),
            expect("max(bore)", SideKind::Upper, "4.030 in", "", false, true)
        );
        assert_eq!(
            form("bore < 4.030 in"),
            expect("bore", SideKind::Upper, "4.030 in", "", true, false)
        );
        assert_eq!(
            form("4.030 in > bore"),
            expect("bore", SideKind::Upper, "4.030 in", "", true, true)
        );
    }

    #[test]
    fn a_lower_limit_written_either_way() {
        assert_eq!(
            form("car.weight >= 3000 lb"),
            expect("car.weight", SideKind::Lower, "3000 lb", "", false, false)
        );
        assert_eq!(
            form("3000 lb <= car.weight"),
            expect("car.weight", SideKind::Lower, "3000 lb", "", false, true)
        );
        assert_eq!(
            form("car.weight > 3000 lb"),
            expect("car.weight", SideKind::Lower, "3000 lb", "", true, false)
        );
        assert_eq!(
            form("3000 lb < car.weight"),
            expect("car.weight", SideKind::Lower, "3000 lb", "", true, true)
        );
    }

    #[test]
    fn an_allowance_is_kept_on_either_way_of_writing() {
        assert_eq!(
            form("bore <= 4.030 in allowing 0.005 in"),
            expect(
                "bore",
                SideKind::Upper,
                "4.030 in",
                "0.005 in",
                false,
                false
            )
        );
        assert_eq!(
            form("4.030 in >= bore allowing 0.005 in"),
            expect("bore", SideKind::Upper, "4.030 in", "0.005 in", false, true)
        );
        assert_eq!(
            form("3000 lb <= car.weight allowing 10 lb"),
            expect(
                "car.weight",
                SideKind::Lower,
                "3000 lb",
                "10 lb",
                false,
                true
            )
        );
    }

    #[test]
    fn a_range_with_and_without_allowance() {
        assert_eq!(
            form("stroke between 3.470 in and 3.490 in"),
            expect(
                "stroke",
                SideKind::Between,
                "3.470 in .. 3.490 in",
                "",
                false,
                false
            )
        );
        assert_eq!(
            form("stroke between 3.470 in and 3.490 in allowing 0.002 in"),
            expect(
                "stroke",
                SideKind::Between,
                "3.470 in .. 3.490 in",
                "0.002 in",
                false,
                false
            )
        );
    }

    #[test]
    fn equality_and_inequality_written_either_way() {
        assert_eq!(
            form("cylinders == 8"),
            expect("cylinders", SideKind::Equal, "8", "", false, false)
        );
        assert_eq!(
            form("8 == cylinders"),
            expect("cylinders", SideKind::Equal, "8", "", false, true)
        );
        assert_eq!(
            form("head.material != \"aluminium\""),
            expect(
                "head.material",
                SideKind::NotEqual,
                "\"aluminium\"",
                "",
                false,
                false
            )
        );
        assert_eq!(
            form("\"aluminium\" != head.material"),
            expect(
                "head.material",
                SideKind::NotEqual,
                "\"aluminium\"",
                "",
                false,
                true
            )
        );
    }

    #[test]
    fn two_engine_sides_keep_the_left_as_subject() {
        // `demand * 1.25` reads the engine, so it is the limit only because it is on the right
        assert_eq!(
            form("airflow_at_1_5 <= demand * 1.25"),
            expect(
                "airflow_at_1_5",
                SideKind::Upper,
                "demand * 1.25",
                "",
                false,
                false
            )
        );
        // `pi` is a constant of the language, not something read from the engine
        assert!(!form("pi * bore <= 13 in").5);
        assert_eq!(form("13 in >= pi * bore").0, "pi * bore");
    }

    #[test]
    fn membership_and_patterns_are_not_limits_but_have_a_subject() {
        for t in ["intake.part in intakes", "lifter.kind matches /^flat /"] {
            let test = require(t);
            assert!(of(&test).is_none(), "{t}");
            assert_eq!(
                Some(expr_text(subject(&test)).as_str()),
                t.split(' ').next()
            );
        }
        assert_eq!(expr_text(subject(&require("4.030 in >= bore"))), "bore");
    }

    #[test]
    fn the_allowed_values_apply_the_allowance_outward() {
        let n = |side: Side<f64>, allowance: Option<f64>| Limit {
            subject: (),
            side,
            allowance,
            reversed: false,
        };
        let upper = n(
            Side::Upper {
                limit: 4.0,
                strict: false,
            },
            Some(0.5),
        );
        assert_eq!(upper.interval(), Some(Interval::below(4.5, true)));
        let lower = n(
            Side::Lower {
                limit: 4.0,
                strict: true,
            },
            Some(0.5),
        );
        assert_eq!(lower.interval(), Some(Interval::above(3.5, false)));
        let range = n(
            Side::Between {
                low: 1.0,
                high: 2.0,
            },
            Some(0.25),
        );
        assert_eq!(range.interval(), Some(Interval::closed(0.75, 2.25)));
        let equal = n(Side::Equal { value: 8.0 }, None);
        assert_eq!(
            equal.interval().and_then(|i| i.high),
            Some(End {
                value: 8.0,
                closed: true
            })
        );
        assert_eq!(n(Side::NotEqual { value: 8.0 }, None).interval(), None);
    }

    /// The limit side of a one-sided test.
    fn limit_side(t: &Test) -> Option<&Expr> {
        of(t).map(|l| *l.limits().0)
    }

    /// The uncertainties written on each limit of a test (both ends of a range, the allowance
    /// last), with `cap` defined as `3 in ± 0.001 in` and `scale` as a measured value with `±`.
    fn uncertain(test: &str) -> Vec<String> {
        let (cap, scale) = (
            require("x <= 3 in ± 0.001 in"),
            require("x <= car.weight + 0 lb ± 4 lb"),
        );
        let (cap, scale) = (limit_side(&cap), limit_side(&scale));
        let lookup = |name: &str| match name {
            "cap" => cap,
            "scale" => scale,
            _ => None,
        };
        let t = require(test);
        let l = of(&t).unwrap_or_else(|| panic!("{test} is not a limit"));
        let (first, second) = l.limits();
        [Some(*first), second.copied(), l.allowance]
            .into_iter()
            .flatten()
            .flat_map(|side| uncertain_on_limit(side, &lookup))
            .map(|u| {
                let via = u
                    .through
                    .map(|n| format!(" via {}", n.text))
                    .unwrap_or_default();
                format!("{}{via}", expr_text(u.literal))
            })
            .collect()
    }

    #[test]
    fn a_plus_minus_on_any_limit_is_found() {
        assert_eq!(
            uncertain("bore <= 4.030 in ± 0.001 in"),
            ["4.030 in ± 0.001 in"]
        );
        assert_eq!(
            uncertain("3000 lb ± 4 lb <= car.weight"),
            ["3000 lb ± 4 lb"]
        );
        assert_eq!(
            uncertain("stroke between 3.47 in ± 0.002 in and 3.49 in ± 0.002 in"),
            ["3.47 in ± 0.002 in", "3.49 in ± 0.002 in"]
        );
        assert_eq!(uncertain("cylinders == 8 ± 1"), ["8 ± 1"]);
        assert_eq!(
            uncertain("bore <= 4.030 in allowing 0.005 in ± 0.001 in"),
            ["0.005 in ± 0.001 in"]
        );
        assert_eq!(
            uncertain("header.od <= cap * 2"),
            ["3 in ± 0.001 in via cap"]
        );
    }

    #[test]
    fn a_plus_minus_on_a_measured_or_derived_value_is_not_a_limit_one() {
        // the subject's own uncertainty (a scale's certified ±) is measurement uncertainty
        assert!(uncertain("scale >= 3000 lb").is_empty());
        // a limit side that reads the engine is a derived value, not a limit of the rulebook
        assert!(uncertain("airflow <= demand * 1.25 ± 0.01").is_empty());
        assert!(uncertain("x <= scale").is_empty());
        assert!(uncertain("bore <= 4.030 in allowing 0.005 in").is_empty());
    }

    #[test]
    fn limits_that_are_not_all_constants_give_no_numbers() {
        let t = require("bore <= 4.030 in allowing 0.005 in");
        let l = of(&t).unwrap_or_else(|| panic!("not a limit"));
        let known = l.clone().map(|s| s, |_| Some(1.0)).transpose();
        assert!(known.is_some_and(|k| k.allowance == Some(1.0)));
        let mut first = true;
        let unknown = l
            .map(
                |s| s,
                |_| {
                    let v = (!first).then_some(1.0);
                    first = false;
                    v
                },
            )
            .transpose();
        assert!(unknown.is_none());
    }
}
