//! Exact decisions at a limit. Values propagate in floating point, where `44.45 mm` and
//! `1-3/4 in` are two different binary numbers although they are the same length (1 in =
//! 25.4 mm exactly, NIST SP 811 B.8), so a value written exactly on a limit would be decided by
//! rounding. Here the margin of a limit, allowance included, is computed again in exact
//! rational arithmetic whenever the float margin lies within rounding distance of the limit:
//! from the digits of every literal and reading as written and the exact factor of every unit.
//! An exact margin of zero is a margin of exactly 0 (inside a `<=` or `>=` limit, outside a
//! `<` or `>` one, ISO 14253-1), and where the float has the wrong sign the exact one wins.
//!
//! Addition, subtraction, multiplication, division, negation, whole powers, `abs`, `max`,
//! `min` and `mean` are exact; π, square roots, other powers and the engine formulas are not,
//! and a margin that needs any of them is left to the float as before. So is a reading whose
//! text is not the value it stands for (a value moved by `headroom`), and any number too big
//! to be worth the work: exact arithmetic only ever settles a tie, it never decides alone.

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive, Zero};

use super::dual::Dual;
use super::expr::Evaluator;
use super::value::Value;
use crate::check::builtins::Reduce;
use crate::check::limit::Limit;
use crate::check::resolved::{DerivedId, Expr, ExprKind, Literal, MeasurementId, Term};
use crate::load::{InputId, Supplied};
use crate::parse::ast::BinaryOp;
use crate::units::{self, Ratio};

/// A float margin this close to zero, relative to the numbers compared, is settled exactly:
/// far wider than the rounding of a chain of float operations (about 1e-16 each), and far
/// narrower than the last digit of any reading.
const WINDOW: f64 = 1e-9;

/// Work allowed for one exact margin: expression nodes visited.
const MAX_STEPS: usize = 10_000;

/// The largest exact number worth carrying, in bits of numerator and denominator together.
const MAX_BITS: u64 = 4_096;

/// The largest whole power taken exactly.
const MAX_POWER: i32 = 64;

/// The largest decimal exponent read exactly (`1e-400` is read, `1e-4000` is not).
const MAX_EXPONENT: i32 = 400;

/// Which margin of a limit: to an upper or lower limit, or to the low or high end of a range.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum End {
    /// `<=` or `<`: the limit plus the allowance, less the value.
    Upper,
    /// `>=` or `>`: the value, less the limit less the allowance.
    Lower,
    /// The low end of `between`: the value, less the low limit less the allowance.
    Low,
    /// The high end of `between`: the high limit plus the allowance, less the value.
    High,
}

impl End {
    /// Whether the limit is above the value.
    fn upper(self) -> bool {
        matches!(self, End::Upper | End::High)
    }

    /// The limit expression of this end.
    fn limit(self, written: &Limit<Expr>) -> Option<&Expr> {
        let (first, second) = written.limits();
        match self {
            End::Upper | End::Lower | End::Low => Some(first),
            End::High => second,
        }
    }
}

impl Evaluator<'_> {
    /// The margins of one end of `written`, cylinder by cylinder, with the allowance `slack`
    /// (SI units) added: positive inside. Each is the float margin with its sensitivities,
    /// except that one within rounding distance of zero takes its exact value where there is
    /// one, so a value exactly on the limit has a margin of exactly 0.
    pub fn margins(
        &self,
        written: &Limit<Expr>,
        end: End,
        subject: &Value,
        limit: &Value,
        slack: f64,
    ) -> Value {
        let upper = end.upper();
        let allowance = Dual::constant(slack);
        let margins = subject.zip(limit, |s, t| {
            let m = if upper { t.sub(s) } else { s.sub(t) };
            m.add(&allowance)
        });
        let near: Vec<bool> = margins
            .numbers()
            .iter()
            .enumerate()
            .map(|(i, m)| {
                let scale = [subject, limit]
                    .iter()
                    .filter_map(|v| v.at(i).ok())
                    .fold(slack.abs(), |acc, d| acc.max(d.value.abs()));
                m.value.abs() <= WINDOW * scale
            })
            .collect();
        if !near.contains(&true) {
            return margins;
        }
        let Some(exact) = Folder::new(self).margin(written, end) else {
            return margins;
        };
        let settle = |i: usize, m: &Dual| match (near.get(i), exact.at(i)) {
            (Some(true), Some(e)) => Dual {
                value: float(e),
                partials: m.partials.clone(),
            },
            _ => m.clone(),
        };
        match margins {
            Value::Single(m) => Value::Single(settle(0, &m)),
            Value::PerCylinder(ms) => {
                Value::PerCylinder(ms.iter().enumerate().map(|(i, m)| settle(i, m)).collect())
            }
        }
    }
}

impl Evaluator<'_> {
    /// Whether the subject of an `==` or `!=` limit equals its value, cylinder by cylinder.
    /// Two values apart by more than rounding differ. Two within rounding of each other are
    /// equal when their exact difference is zero, where both are exact (`44.45 mm` and
    /// `1-3/4 in`, NIST SP 811 B.8), and unequal when it is not (`44.450000001 mm`); where
    /// one is not exact (π, a square root, a formula), they are taken as equal by the float.
    pub fn equal(&self, written: &Limit<Expr>, subject: &Value, value: &Value) -> Vec<bool> {
        let close: Vec<bool> = (0..cylinders(subject, value))
            .map(|i| match (subject.at(i), value.at(i)) {
                (Ok(a), Ok(b)) => {
                    let scale = a.value.abs().max(b.value.abs()).max(f64::MIN_POSITIVE);
                    (a.value - b.value).abs() <= WINDOW * scale
                }
                _ => false,
            })
            .collect();
        if !close.contains(&true) {
            return close;
        }
        let Some(exact) = Folder::new(self).difference(written) else {
            return close;
        };
        close
            .iter()
            .enumerate()
            .map(|(i, near)| *near && exact.at(i).is_none_or(Zero::is_zero))
            .collect()
    }
}

/// How many cylinders two values cover together: a single value stands for every cylinder.
fn cylinders(a: &Value, b: &Value) -> usize {
    a.numbers().len().max(b.numbers().len())
}

/// An exact value: one, or one per cylinder.
#[derive(Clone, Debug, PartialEq)]
enum Exact {
    Single(BigRational),
    PerCylinder(Vec<BigRational>),
}

impl Exact {
    fn at(&self, i: usize) -> Option<&BigRational> {
        match self {
            Exact::Single(x) => Some(x),
            Exact::PerCylinder(xs) => xs.get(i),
        }
    }

    fn numbers(&self) -> &[BigRational] {
        match self {
            Exact::Single(x) => std::slice::from_ref(x),
            Exact::PerCylinder(xs) => xs,
        }
    }

    fn map(&self, f: impl Fn(&BigRational) -> Option<BigRational>) -> Option<Exact> {
        Some(match self {
            Exact::Single(x) => Exact::Single(fits(f(x)?)?),
            Exact::PerCylinder(xs) => {
                Exact::PerCylinder(xs.iter().map(|x| fits(f(x)?)).collect::<Option<Vec<_>>>()?)
            }
        })
    }

    /// Both values combined cylinder by cylinder; a single value stands for every cylinder.
    fn zip(
        &self,
        other: &Exact,
        f: impl Fn(&BigRational, &BigRational) -> Option<BigRational>,
    ) -> Option<Exact> {
        match (self, other) {
            (Exact::Single(a), Exact::Single(b)) => Some(Exact::Single(fits(f(a, b)?)?)),
            _ => {
                let n = self.numbers().len().max(other.numbers().len());
                let pairs = (0..n).map(|i| fits(f(self.at(i)?, other.at(i)?)?));
                Some(Exact::PerCylinder(pairs.collect::<Option<Vec<_>>>()?))
            }
        }
    }
}

/// A number kept only while it stays small enough to be worth the work.
fn fits(x: BigRational) -> Option<BigRational> {
    (x.numer().bits() + x.denom().bits() <= MAX_BITS).then_some(x)
}

/// The nearest float, keeping the sign of a number too small for a float.
fn float(x: &BigRational) -> f64 {
    let f = x.to_f64().unwrap_or(f64::NAN);
    if f == 0.0 && !x.is_zero() {
        if x.is_negative() {
            -f64::MIN_POSITIVE
        } else {
            f64::MIN_POSITIVE
        }
    } else {
        f
    }
}

/// An exact factor as a big fraction.
fn ratio(r: Ratio) -> Option<BigRational> {
    if r.denominator == 0 {
        return None;
    }
    Some(BigRational::new(
        BigInt::from(r.numerator),
        BigInt::from(r.denominator),
    ))
}

/// The exact value of a number as gonogo writes one: `42`, `4.030`, `1.5e-3`, `5/8` or
/// `1-5/8`; `None` for anything else.
pub fn written(text: &str) -> Option<BigRational> {
    let text = text.trim();
    if let Some((top, den)) = text.split_once('/') {
        let den = whole(den)?;
        if den.is_zero() {
            return None;
        }
        let value = match top.split_once('-') {
            Some((w, n)) => BigRational::from_integer(whole(w)?) + BigRational::new(whole(n)?, den),
            None => BigRational::new(whole(top)?, den),
        };
        return fits(value);
    }
    let (mantissa, exponent) = match text.split_once(['e', 'E']) {
        Some((m, e)) => (m, e.strip_prefix('+').unwrap_or(e).parse::<i32>().ok()?),
        None => (text, 0),
    };
    let (int, frac) = mantissa.split_once('.').unwrap_or((mantissa, ""));
    if int.is_empty() || !frac.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    let digits = whole(&format!("{int}{frac}"))?;
    let shift = exponent.checked_sub(i32::try_from(frac.len()).ok()?)?;
    if shift.abs() > MAX_EXPONENT {
        return None;
    }
    let ten = BigRational::from_integer(BigInt::from(10));
    fits(BigRational::from_integer(digits) * num_traits::pow::Pow::pow(&ten, shift))
}

/// A run of ASCII digits as a whole number.
fn whole(text: &str) -> Option<BigInt> {
    if text.is_empty() || !text.bytes().all(|b| b.is_ascii_digit()) {
        return None;
    }
    text.parse().ok()
}

/// A number with its unit, exactly in SI units; `None` for a unit without an exact factor.
fn in_si(value: BigRational, unit: Option<&str>) -> Option<BigRational> {
    match unit {
        None => Some(value),
        Some(symbol) => fits(value * ratio(units::lookup(symbol)?.exact?)?),
    }
}

/// Exact evaluation of one limit's margin over the resolved tree, within a budget of work.
struct Folder<'e, 'a> {
    evaluator: &'e Evaluator<'a>,
    steps: usize,
}

impl<'e, 'a> Folder<'e, 'a> {
    fn new(evaluator: &'e Evaluator<'a>) -> Self {
        Folder {
            evaluator,
            steps: 0,
        }
    }

    /// The exact margin of one end of a limit, allowance included.
    fn margin(&mut self, written: &Limit<Expr>, end: End) -> Option<Exact> {
        let subject = self.expr(&written.subject)?;
        let limit = self.expr(end.limit(written)?)?;
        let limit = match &written.allowance {
            None => limit,
            Some(a) => {
                let a = self.expr(a)?;
                let widen = if end.upper() {
                    |l, a| l + a
                } else {
                    |l, a| l - a
                };
                limit.zip(&a, |l, a| Some(widen(l.clone(), a.clone())))?
            }
        };
        if end.upper() {
            limit.zip(&subject, |l, s| Some(l - s))
        } else {
            subject.zip(&limit, |s, l| Some(s - l))
        }
    }

    /// The exact difference of an `==` or `!=` limit: the subject less the value.
    fn difference(&mut self, written: &Limit<Expr>) -> Option<Exact> {
        let subject = self.expr(&written.subject)?;
        let value = self.expr(written.limits().0)?;
        subject.zip(&value, |s, v| Some(s - v))
    }

    fn expr(&mut self, e: &Expr) -> Option<Exact> {
        self.steps += 1;
        if self.steps > MAX_STEPS {
            return None;
        }
        match &e.kind {
            ExprKind::Literal(l) => literal(l).map(Exact::Single),
            ExprKind::Measurement(id) => self.measured(*id),
            ExprKind::Derived(id) => self.derived(*id),
            ExprKind::Negate(inner) => self.expr(inner)?.map(|x| Some(-x)),
            ExprKind::Binary { op, left, right } => {
                let (l, r) = (self.expr(left)?, self.expr(right)?);
                binary(*op, &l, &r)
            }
            ExprKind::Abs(inner) => self.expr(inner)?.map(|x| Some(x.abs())),
            ExprKind::Reduce(how, inner) => self.expr(inner)?.reduce(*how).map(Exact::Single),
            ExprKind::Extreme { greater, args } => {
                let mut values = args.iter().map(|a| self.expr(a));
                let first = values.next()??;
                values.try_fold(first, |acc, v| {
                    acc.zip(&v?, |a, b| Some(pick(*greater, a, b).clone()))
                })
            }
            ExprKind::Pi | ExprKind::Sqrt(_) | ExprKind::Formula(_) => None,
        }
    }

    fn derived(&mut self, id: DerivedId) -> Option<Exact> {
        let rulebook = self.evaluator.rulebook;
        match &rulebook.derived.get(id.index())?.body {
            Term::Number(body) => self.expr(body),
            Term::Text(_) => None,
        }
    }

    fn measured(&self, id: MeasurementId) -> Option<Exact> {
        let ev = self.evaluator;
        match ev.declaration.supplied(id.index())? {
            Supplied::Single(input) => reading(ev, *input).map(Exact::Single),
            Supplied::PerCylinder(inputs) => Some(Exact::PerCylinder(
                inputs
                    .iter()
                    .map(|i| reading(ev, *i))
                    .collect::<Option<Vec<_>>>()?,
            )),
            Supplied::Text(..) => None,
        }
    }
}

impl Exact {
    /// `max`, `min` or `mean` over the cylinders, as [`Reduce::apply`] does in floats.
    fn reduce(&self, how: Reduce) -> Option<BigRational> {
        let (first, rest) = self.numbers().split_first()?;
        match how {
            Reduce::Max | Reduce::Min => {
                let greater = how == Reduce::Max;
                Some(rest.iter().fold(first, |a, b| pick(greater, a, b)).clone())
            }
            Reduce::Mean => {
                let sum = rest.iter().fold(first.clone(), |acc, x| acc + x);
                let n = BigInt::from(self.numbers().len());
                fits(sum / BigRational::from_integer(n))
            }
        }
    }
}

/// The larger (`greater`) or smaller of two values; the first when they are equal.
fn pick<'x>(greater: bool, a: &'x BigRational, b: &'x BigRational) -> &'x BigRational {
    if (b > a) == greater && b != a { b } else { a }
}

fn binary(op: BinaryOp, l: &Exact, r: &Exact) -> Option<Exact> {
    match op {
        BinaryOp::Add => l.zip(r, |a, b| Some(a + b)),
        BinaryOp::Subtract => l.zip(r, |a, b| Some(a - b)),
        BinaryOp::Multiply => l.zip(r, |a, b| Some(a * b)),
        BinaryOp::Divide => l.zip(r, |a, b| (!b.is_zero()).then(|| a / b)),
        BinaryOp::Power => l.zip(r, power),
    }
}

/// `a` to a whole power of at most [`MAX_POWER`]; `None` for any other power, and for zero
/// to a negative one.
fn power(a: &BigRational, n: &BigRational) -> Option<BigRational> {
    if !n.is_integer() {
        return None;
    }
    let n = n.to_integer().to_i32().filter(|n| n.abs() <= MAX_POWER)?;
    if n < 0 && a.is_zero() {
        return None;
    }
    fits(num_traits::pow::Pow::pow(a, n))
}

/// A rulebook literal exactly: its digits as written in its unit.
fn literal(l: &Literal) -> Option<BigRational> {
    let value = written(&l.written)?;
    let exact = match l.unit {
        None => value,
        Some(u) => fits(value * ratio(u.exact?)?)?,
    };
    agrees(&exact, l.si).then_some(exact)
}

/// A declared reading exactly: the number of its text as written, in its unit. A plain number
/// from a bare YAML number is its shortest decimal, the digits that were written whenever they
/// were fewer than sixteen. `None` when the text is not the value (a value moved since).
fn reading(ev: &Evaluator, id: InputId) -> Option<BigRational> {
    let input = ev.declaration.inputs.get(id as usize)?;
    let from_text = input.written.as_deref().and_then(|text| {
        let (negative, q) = crate::parse::quantity_literal(text).ok()?;
        let unit = q.unit.or(q.uncertainty.and_then(|u| u.unit));
        let value = in_si(written(q.value.1.text)?, unit.map(|p| p.text))?;
        Some(if negative { -value } else { value })
    });
    let exact = match from_text {
        Some(x) if agrees(&x, input.value) => x,
        _ if input.unit.is_none() => written(&format!("{:e}", input.value.abs()))
            .map(|x| if input.value < 0.0 { -x } else { x })?,
        _ => return None,
    };
    agrees(&exact, input.value).then_some(exact)
}

/// Whether an exact number is the one a float stands for, to the rounding of reading it.
fn agrees(exact: &BigRational, value: f64) -> bool {
    let f = float(exact);
    f == value || (f - value).abs() <= 1e-15 * value.abs()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(BigInt::from(n), BigInt::from(d))
    }

    #[test]
    fn written_numbers_are_read_exactly() {
        assert_eq!(written("4.0650"), Some(q(4065, 1000)));
        assert_eq!(written("1-3/4"), Some(q(7, 4)));
        assert_eq!(written("5/8"), Some(q(5, 8)));
        assert_eq!(written("1.5e-3"), Some(q(15, 10_000)));
        assert_eq!(written("25E+1"), Some(q(250, 1)));
        assert_eq!(written("42"), Some(q(42, 1)));
        assert_eq!(written("5/0"), None);
        assert_eq!(written("1e-4000"), None);
        assert_eq!(written("4.0x"), None);
        assert_eq!(written(""), None);
    }

    #[test]
    fn millimetres_and_inches_meet_exactly() {
        // NIST SP 811 B.8: 1 in = 25.4 mm exactly, so 44.45 mm is 1-3/4 in
        let mm = in_si(written("44.45").unwrap_or_default(), Some("mm"));
        let inch = in_si(written("1-3/4").unwrap_or_default(), Some("in"));
        assert!(mm.is_some());
        assert_eq!(mm, inch);
        // while the floats differ
        assert_ne!(44.45 * 1e-3, 1.75 * 0.0254);
    }

    #[test]
    fn powers_are_exact_only_when_whole_and_small() {
        assert_eq!(power(&q(3, 2), &q(2, 1)), Some(q(9, 4)));
        assert_eq!(power(&q(2, 1), &q(-1, 1)), Some(q(1, 2)));
        assert_eq!(power(&q(2, 1), &q(1, 2)), None);
        assert_eq!(power(&q(0, 1), &q(-1, 1)), None);
        assert_eq!(power(&q(2, 1), &q(65, 1)), None);
    }

    #[test]
    fn a_number_too_big_is_not_carried() {
        let huge = BigRational::from_integer(BigInt::from(10).pow(2_000));
        assert_eq!(fits(huge), None);
    }

    #[test]
    fn a_tiny_exact_number_keeps_its_sign_as_a_float() {
        let tiny = BigRational::new(BigInt::from(-1), BigInt::from(10).pow(400));
        assert!(float(&tiny) < 0.0);
    }
}
