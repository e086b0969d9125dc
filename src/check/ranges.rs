//! Rules that the declared measurement ranges make impossible to break or impossible to meet,
//! found by interval arithmetic: each measurement's `range`, carried through the rulebook's
//! arithmetic and the monotone engine formulas. Anything this reasoning cannot bound (a
//! measurement without a range, the compression ratio) is left alone: no false alarm.

use super::Checker;
use super::classes::ClassState;
use super::error::CheckError;
use super::interval::Interval;
use super::limit::SideKind;
use super::model::WrittenRule;
use crate::diagnostic::Problem;
use crate::parse::ast::{BinaryOp, Expr, ExprKind};
use crate::parse::print::expr_text;

/// A closed interval of values, in SI units.
#[derive(Clone, Copy, Debug, PartialEq)]
struct Span {
    low: f64,
    high: f64,
}

impl Span {
    fn point(v: f64) -> Span {
        Span { low: v, high: v }
    }

    fn add(self, o: Span) -> Span {
        Span {
            low: self.low + o.low,
            high: self.high + o.high,
        }
    }

    fn sub(self, o: Span) -> Span {
        Span {
            low: self.low - o.high,
            high: self.high - o.low,
        }
    }

    fn mul(self, o: Span) -> Span {
        let products = [
            self.low * o.low,
            self.low * o.high,
            self.high * o.low,
            self.high * o.high,
        ];
        Span {
            low: products.iter().copied().fold(f64::INFINITY, f64::min),
            high: products.iter().copied().fold(f64::NEG_INFINITY, f64::max),
        }
    }

    fn div(self, o: Span) -> Option<Span> {
        (o.low > 0.0 || o.high < 0.0).then(|| {
            self.mul(Span {
                low: 1.0 / o.high,
                high: 1.0 / o.low,
            })
        })
    }

    fn scale(self, k: f64) -> Span {
        self.mul(Span::point(k))
    }

    fn sqrt(self) -> Option<Span> {
        (self.low >= 0.0).then(|| Span {
            low: self.low.sqrt(),
            high: self.high.sqrt(),
        })
    }

    fn powi(self, n: i32) -> Span {
        let (a, b) = (self.low.powi(n), self.high.powi(n));
        if n % 2 == 0 && self.low < 0.0 && self.high > 0.0 {
            Span {
                low: 0.0,
                high: a.max(b),
            }
        } else {
            Span {
                low: a.min(b),
                high: a.max(b),
            }
        }
    }

    fn is_finite(self) -> bool {
        self.low.is_finite() && self.high.is_finite()
    }
}

impl Checker<'_> {
    /// Warns about each rule of a class that its measurement ranges decide in advance.
    pub(super) fn check_ranges(&mut self, states: &[ClassState]) {
        for state in states {
            for r in &state.rules {
                if let Some(problem) = self.decided_in_advance(r) {
                    self.error(problem);
                }
            }
        }
    }

    /// A warning when the declared ranges keep the rule's subject wholly inside or wholly
    /// outside its limit, whichever side the limit is written on.
    fn decided_in_advance(&self, rule: &WrittenRule) -> Option<Problem> {
        let limit = rule.limit.as_ref()?;
        if !matches!(
            limit.kind(),
            SideKind::Upper | SideKind::Lower | SideKind::Between
        ) {
            return None;
        }
        let allowed = limit.evaluated(|e| self.constant(e))?.interval()?;
        let subject = &limit.subject;
        let test = &rule.rule.require;
        if self.error_within(test.span) {
            return None; // the error already reported says what is wrong with this test
        }
        let reach = self.interval(subject, 0)?;
        if !reach.is_finite() {
            return None;
        }
        let name = expr_text(subject);
        let reach = Interval::closed(reach.low, reach.high);
        if allowed.contains(reach) {
            return Some(
                CheckError::NeverFails {
                    subject: name,
                    at: test.span,
                }
                .into(),
            );
        }
        if allowed.intersect(reach).is_empty() {
            return Some(
                CheckError::NeverMet {
                    subject: name,
                    at: test.span,
                }
                .into(),
            );
        }
        None
    }

    /// The values an expression can take given the declared ranges, if they bound it.
    fn interval(&self, e: &Expr, depth: u32) -> Option<Span> {
        if depth > 32 {
            return None;
        }
        if let Some(v) = self.constant(e) {
            return Some(Span::point(v));
        }
        match &e.kind {
            ExprKind::Name(n) => {
                if let Some(m) = self.measurements.get(n.text.as_str()) {
                    return m.range.map(|(low, high)| Span { low, high });
                }
                self.interval(&self.defines.get(n.text.as_str())?.expr, depth + 1)
            }
            ExprKind::Negate(inner) => self.interval(inner, depth).map(|s| s.scale(-1.0)),
            ExprKind::Binary { op, left, right } => {
                let (a, b) = (self.interval(left, depth)?, self.interval(right, depth));
                match op {
                    BinaryOp::Add => Some(a.add(b?)),
                    BinaryOp::Subtract => Some(a.sub(b?)),
                    BinaryOp::Multiply => Some(a.mul(b?)),
                    BinaryOp::Divide => a.div(b?),
                    BinaryOp::Power => {
                        let n = self.constant(right)?;
                        (n.fract() == 0.0 && n.abs() <= 6.0).then(|| a.powi(n as i32))
                    }
                }
            }
            ExprKind::Call { function, args } => {
                let ordered = in_parameter_order(&function.text, args)?;
                let spans: Option<Vec<Span>> = ordered
                    .iter()
                    .map(|a| self.interval(a, depth + 1))
                    .collect();
                formula_interval(&function.text, &spans?)
            }
            ExprKind::Quantity(_) | ExprKind::Text(_) => None,
        }
    }
}

/// A call's arguments in the order of the function's parameters (labels resolved), or `None`
/// when they do not fill the parameters exactly.
fn in_parameter_order<'e>(
    function: &str,
    args: &'e [crate::parse::ast::Arg],
) -> Option<Vec<&'e Expr>> {
    let Some(super::builtins::Function::Formula(f)) = super::builtins::function(function) else {
        return Some(args.iter().map(|a| &a.value).collect());
    };
    let mut slots: Vec<Option<&Expr>> = vec![None; f.params.len()];
    for (i, arg) in args.iter().enumerate() {
        let at = match &arg.label {
            Some(label) => f.params.iter().position(|p| p.name == label.text)?,
            None => i,
        };
        *slots.get_mut(at)? = Some(&arg.value);
    }
    slots.into_iter().collect()
}

/// The engine formulas and generic functions over intervals, where they are monotone in every
/// argument over the intervals given.
fn formula_interval(name: &str, x: &[Span]) -> Option<Span> {
    let positive = x.iter().all(|s| s.low >= 0.0);
    match (name, x) {
        ("max" | "min" | "mean" | "abs", [one]) if name != "abs" || one.low >= 0.0 => Some(*one),
        ("sqrt", [one]) => one.sqrt(),
        ("displacement", [b, s, n]) if positive => {
            Some(b.powi(2).mul(*s).mul(*n).scale(std::f64::consts::PI / 4.0))
        }
        ("valve_lift", [l, r]) => Some(l.mul(*r)),
        ("net_valve_lift", [l, r, lash]) => Some(l.mul(*r).sub(*lash)),
        ("airflow_at", [f, rated, target]) => Some(f.mul(target.div(*rated)?.sqrt()?)),
        ("airflow_demand", [d, s, e]) => Some(d.mul(*s).mul(*e).scale(0.5)),
        _ => None,
    }
}
