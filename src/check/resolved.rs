//! The resolved rulebook: what the checker makes of each expression and test as it types
//! them, for evaluation to fold over. Names are ids (a measurement, a derived value, a parts
//! list, the constant pi), calls are a built-in with its arguments bound in parameter order,
//! the pattern of a `matches` is compiled into its node, and a literal carries its digits as
//! written, its unit and its SI value. Numbers and text are separate trees, so arithmetic on
//! text cannot be written down. Every node keeps its span for traces and diagnostics.

use regex::Regex;

use super::builtins::{Formula, Reduce};
use super::limit::{Limit, Operand};
use crate::evaluate::dual::Dual;
use crate::parse::ast::BinaryOp;
use crate::source::Span;
use crate::units::Unit;

macro_rules! id {
    ($(#[$doc:meta])* $name:ident) => {
        $(#[$doc])*
        #[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
        pub struct $name(usize);

        impl $name {
            /// An id for the item at this position (only the checker makes ids).
            pub(super) fn new(index: usize) -> $name {
                $name(index)
            }

            /// The position of the item in its table of the checked rulebook.
            pub fn index(self) -> usize {
                self.0
            }
        }
    };
}

id!(
    /// A measurement: its position in `CheckedRulebook::measurements`.
    MeasurementId
);
id!(
    /// A derived value: its position in `CheckedRulebook::derived`.
    DerivedId
);
id!(
    /// A parts list: its position in `CheckedRulebook::lists`.
    ListId
);
id!(
    /// A rulebook literal with a stated uncertainty: its position in
    /// `CheckedRulebook::literals`.
    LiteralId
);

/// A number written in the rulebook.
#[derive(Clone, Debug)]
pub struct Literal {
    /// The digits as written (`4.100`, `1-5/8`).
    pub written: String,
    /// The unit written with it (or with its uncertainty), if any.
    pub unit: Option<&'static Unit>,
    /// Its value in SI units.
    pub si: f64,
    /// With a stated uncertainty, the literal is an input of its own.
    pub uncertain: Option<LiteralId>,
}

/// A rulebook literal with a stated uncertainty: an input of every engine checked.
#[derive(Clone, Debug, PartialEq)]
pub struct UncertainLiteral {
    /// The literal in the rulebook's canonical words (`0 lb ± 4 lb (k = 2)`).
    pub text: String,
    /// Its value in SI units.
    pub value: f64,
    /// Its standard uncertainty (the stated expanded uncertainty over its coverage factor),
    /// SI units.
    pub standard_uncertainty: f64,
    /// The unit it is written in.
    pub unit: Option<&'static Unit>,
}

/// A numeric expression, resolved.
#[derive(Clone, Debug)]
pub struct Expr {
    /// What kind.
    pub kind: ExprKind,
    /// Where it is written.
    pub span: Span,
}

/// The kinds of numeric expression.
#[derive(Clone, Debug)]
pub enum ExprKind {
    /// A number as written.
    Literal(Literal),
    /// The constant π.
    Pi,
    /// A numeric measurement.
    Measurement(MeasurementId),
    /// A numeric derived value.
    Derived(DerivedId),
    /// `-A`
    Negate(Box<Expr>),
    /// `A op B`
    Binary {
        /// Operator.
        op: BinaryOp,
        /// Left operand.
        left: Box<Expr>,
        /// Right operand.
        right: Box<Expr>,
    },
    /// An engine formula with its arguments bound.
    Formula(Call),
    /// `max`, `min` or `mean` of one per-cylinder value, over its cylinders.
    Reduce(Reduce, Box<Expr>),
    /// `max` (`greater`) or `min` of two or more values.
    Extreme {
        /// `max` rather than `min`.
        greater: bool,
        /// The values, at least two.
        args: Vec<Expr>,
    },
    /// `abs(A)`
    Abs(Box<Expr>),
    /// `sqrt(A)`
    Sqrt(Box<Expr>),
}

/// A formula's arguments in parameter order, with its implementation, bound once.
#[derive(Clone, Debug)]
pub struct Bound<const N: usize> {
    /// The implementation.
    pub apply: fn([&Dual; N]) -> Dual,
    /// One argument per parameter.
    pub args: Box<[Expr; N]>,
}

/// A formula's bound arguments, by the number of its parameters.
#[derive(Clone, Debug)]
pub enum Args {
    /// Two parameters.
    Two(Bound<2>),
    /// Three parameters.
    Three(Bound<3>),
    /// Seven parameters.
    Seven(Bound<7>),
}

/// A call of an engine formula.
#[derive(Clone, Debug)]
pub struct Call {
    /// The formula, from the one table of built-ins.
    pub formula: &'static Formula,
    /// Its arguments.
    pub args: Args,
}

impl Call {
    /// Binds arguments given in parameter order to the formula's implementation; `None` when
    /// their number is not the implementation's.
    pub(super) fn bind(formula: &'static Formula, args: Vec<Expr>) -> Option<Call> {
        use super::builtins::Apply;
        let args = match formula.apply {
            Apply::Two(apply) => Args::Two(Bound {
                apply,
                args: Box::new(args.try_into().ok()?),
            }),
            Apply::Three(apply) => Args::Three(Bound {
                apply,
                args: Box::new(args.try_into().ok()?),
            }),
            Apply::Seven(apply) => Args::Seven(Bound {
                apply,
                args: Box::new(args.try_into().ok()?),
            }),
        };
        Some(Call { formula, args })
    }

    /// The arguments in parameter order.
    pub fn args(&self) -> &[Expr] {
        match &self.args {
            Args::Two(b) => b.args.as_slice(),
            Args::Three(b) => b.args.as_slice(),
            Args::Seven(b) => b.args.as_slice(),
        }
    }
}

/// A text expression, resolved.
#[derive(Clone, Debug)]
pub struct TextExpr {
    /// What kind.
    pub kind: TextKind,
    /// Where it is written.
    pub span: Span,
}

/// The kinds of text expression.
#[derive(Clone, Debug)]
pub enum TextKind {
    /// A string as written, escapes resolved.
    Literal(String),
    /// A text measurement.
    Measurement(MeasurementId),
    /// A derived value that is text.
    Derived(DerivedId),
}

/// A typed expression: a number or a text.
#[derive(Clone, Debug)]
pub enum Term {
    /// A numeric expression.
    Number(Expr),
    /// A text expression.
    Text(TextExpr),
}

/// A test, resolved.
#[derive(Clone, Debug)]
pub struct Test {
    /// What is tested.
    pub kind: TestKind,
    /// The whole test.
    pub span: Span,
}

/// The kinds of resolved test.
#[derive(Clone, Debug)]
#[allow(
    clippy::large_enum_variant,
    reason = "a rulebook's tests are few and built once; boxing would only add indirection"
)]
pub enum TestKind {
    /// A limit on a number, in its one normal form: `<=`, `<`, `>=`, `>`, `==`, `!=` (written
    /// either way round) and `between`, each with its allowance.
    Limit {
        /// Subject, side, limit(s), allowance and strictness.
        limit: Limit<Expr>,
        /// The unit to show the numbers in.
        unit: Option<&'static Unit>,
    },
    /// `A == B` or `A != B` of texts.
    TextEqual {
        /// Left side.
        left: TextExpr,
        /// `==` rather than `!=`.
        equal: bool,
        /// Right side.
        right: TextExpr,
    },
    /// `A in LIST` or `A not in LIST`
    Member {
        /// The identifier tested.
        subject: TextExpr,
        /// `not in`
        negated: bool,
        /// The parts list.
        list: ListId,
    },
    /// `A matches /re/` or `A not matches /re/`
    Matches {
        /// The identifier tested.
        subject: TextExpr,
        /// `not matches`
        negated: bool,
        /// The compiled pattern.
        pattern: Regex,
    },
}

/// A condition, resolved.
#[derive(Clone, Debug)]
#[allow(
    clippy::large_enum_variant,
    reason = "a rulebook's conditions are few and built once; boxing would only add indirection"
)]
pub enum Condition {
    /// One test.
    Test(Test),
    /// Both hold.
    And(Box<Condition>, Box<Condition>),
    /// Either holds.
    Or(Box<Condition>, Box<Condition>),
    /// Does not hold.
    Not(Box<Condition>),
}

/// A measurement or derived value an expression reads.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Read {
    /// A measurement.
    Measurement(MeasurementId),
    /// A derived value.
    Derived(DerivedId),
}

/// Adds `read` unless it is there already, keeping the order first read.
fn push(out: &mut Vec<Read>, read: Read) {
    if !out.contains(&read) {
        out.push(read);
    }
}

impl Expr {
    /// The measurements and derived values it reads, each once, in the order written.
    pub fn reads(&self, out: &mut Vec<Read>) {
        match &self.kind {
            ExprKind::Measurement(m) => push(out, Read::Measurement(*m)),
            ExprKind::Derived(d) => push(out, Read::Derived(*d)),
            ExprKind::Literal(_) | ExprKind::Pi => {}
            ExprKind::Negate(e) | ExprKind::Reduce(_, e) | ExprKind::Abs(e) | ExprKind::Sqrt(e) => {
                e.reads(out)
            }
            ExprKind::Binary { left, right, .. } => {
                left.reads(out);
                right.reads(out);
            }
            ExprKind::Formula(call) => call.args().iter().for_each(|a| a.reads(out)),
            ExprKind::Extreme { args, .. } => args.iter().for_each(|a| a.reads(out)),
        }
    }

    /// The literals with a stated uncertainty it holds, in the order written.
    pub fn literals(&self, out: &mut Vec<LiteralId>) {
        match &self.kind {
            ExprKind::Literal(l) => out.extend(l.uncertain),
            ExprKind::Measurement(_) | ExprKind::Derived(_) | ExprKind::Pi => {}
            ExprKind::Negate(e) | ExprKind::Reduce(_, e) | ExprKind::Abs(e) | ExprKind::Sqrt(e) => {
                e.literals(out)
            }
            ExprKind::Binary { left, right, .. } => {
                left.literals(out);
                right.literals(out);
            }
            ExprKind::Formula(call) => call.args().iter().for_each(|a| a.literals(out)),
            ExprKind::Extreme { args, .. } => args.iter().for_each(|a| a.literals(out)),
        }
    }
}

impl TextExpr {
    /// The measurement or derived value it reads.
    pub fn reads(&self, out: &mut Vec<Read>) {
        match &self.kind {
            TextKind::Measurement(m) => push(out, Read::Measurement(*m)),
            TextKind::Derived(d) => push(out, Read::Derived(*d)),
            TextKind::Literal(_) => {}
        }
    }
}

impl Term {
    /// The measurements and derived values it reads.
    pub fn reads(&self, out: &mut Vec<Read>) {
        match self {
            Term::Number(e) => e.reads(out),
            Term::Text(t) => t.reads(out),
        }
    }

    /// The literals with a stated uncertainty it holds.
    pub fn literals(&self, out: &mut Vec<LiteralId>) {
        if let Term::Number(e) = self {
            e.literals(out);
        }
    }
}

impl Test {
    /// The measurements and derived values it reads, in the order written.
    pub fn reads(&self, out: &mut Vec<Read>) {
        match &self.kind {
            TestKind::Limit { limit, .. } => limit_reads(limit, out),
            TestKind::TextEqual { left, right, .. } => {
                left.reads(out);
                right.reads(out);
            }
            TestKind::Member { subject, .. } | TestKind::Matches { subject, .. } => {
                subject.reads(out)
            }
        }
    }
}

impl Condition {
    /// The measurements and derived values it reads, in the order written.
    pub fn reads(&self, out: &mut Vec<Read>) {
        match self {
            Condition::Test(t) => t.reads(out),
            Condition::Not(inner) => inner.reads(out),
            Condition::And(a, b) | Condition::Or(a, b) => {
                a.reads(out);
                b.reads(out);
            }
        }
    }
}

/// What a limit reads, in the order written: the limit side first when it was written first.
fn limit_reads(limit: &Limit<Expr>, out: &mut Vec<Read>) {
    let (first, second) = limit.limits();
    let limits = |out: &mut Vec<Read>| {
        first.reads(out);
        second.iter().for_each(|e| e.reads(out));
    };
    if limit.reversed {
        limits(out);
        limit.subject.reads(out);
    } else {
        limit.subject.reads(out);
        limits(out);
    }
    limit.allowance.iter().for_each(|a| a.reads(out));
}

impl Operand for Expr {
    /// A side is fixed when it reads no measurement and no derived value: the same rule as
    /// over the syntax tree, so the evaluator and the static passes agree on which side is
    /// the limit.
    fn is_fixed(&self) -> bool {
        let mut reads = Vec::new();
        self.reads(&mut reads);
        reads.is_empty()
    }
}
