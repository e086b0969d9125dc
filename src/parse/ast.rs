//! The syntax tree of a rulebook, exactly as written. Every node keeps its [`Span`], and every
//! span field is marked `#[derive_where(skip)]`, so the trees' equality leaves spans out: two
//! trees compare equal when their structure does, wherever they were written. [`Span`] itself
//! has real equality.

use derive_where::derive_where;

use crate::source::Span;

/// A whole rulebook file: its items in the order written.
#[derive(Clone, Debug, PartialEq)]
pub struct Rulebook {
    /// Top-level items.
    pub items: Vec<Item>,
}

/// One top-level item.
#[derive(Clone, Debug, PartialEq)]
#[allow(
    clippy::large_enum_variant,
    reason = "a rulebook's tree is small and built once; boxing would only add indirection"
)]
pub enum Item {
    /// `series "..."`
    Series(Text),
    /// `edition "..." effective DATE`
    Edition(Edition),
    /// `decision guarded rejection`
    Decision(Decision),
    /// `coverage k = 2` or `coverage 95 %`
    Coverage(Coverage),
    /// `include "file.rules"`
    Include(Text),
    /// `measure ...`
    Measure(Measure),
    /// `define NAME = EXPR`
    Define(Define),
    /// `approved list ... end` or `banned list ... end`
    List(PartsList),
    /// `class ... end`
    Class(Class),
    /// `bulletin ... end`
    Bulletin(Bulletin),
}

/// A string literal with escapes resolved.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Text {
    /// The value after escapes.
    pub value: String,
    /// Where it was written, quotes included.
    #[derive_where(skip)]
    pub span: Span,
}

/// A name: a single identifier or a dotted path (`carburetor.airflow`).
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Name {
    /// The full dotted text.
    pub text: String,
    /// Where it was written.
    #[derive_where(skip)]
    pub span: Span,
}

/// A calendar date written `YYYY-MM-DD`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord)]
pub struct Date {
    /// Year.
    pub year: u16,
    /// Month, 1 to 12.
    pub month: u8,
    /// Day of the month.
    pub day: u8,
}

impl std::fmt::Display for Date {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{:04}-{:02}-{:02}", self.year, self.month, self.day)
    }
}

/// A date with the span it was written at.
#[derive(Clone, Copy, Debug)]
#[derive_where(PartialEq)]
pub struct DateAt {
    /// The date.
    pub date: Date,
    /// Where.
    #[derive_where(skip)]
    pub span: Span,
}

/// `edition "2027" effective 2027-03-06`
#[derive(Clone, Debug, PartialEq)]
pub struct Edition {
    /// The edition's name.
    pub name: Text,
    /// From when it is in force.
    pub effective: DateAt,
}

/// How a finding becomes a verdict (DESIGN.md section 5).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum DecisionRule {
    /// Illegal only on a proven fail: the inspector's rule.
    GuardedRejection,
    /// Legal only on a proven pass: the builder's rule.
    GuardedAcceptance,
    /// Compare the measured value alone.
    SimpleAcceptance,
}

impl DecisionRule {
    /// The words a rulebook writes after `decision`.
    pub fn words(self) -> &'static str {
        match self {
            DecisionRule::GuardedRejection => "guarded rejection",
            DecisionRule::GuardedAcceptance => "guarded acceptance",
            DecisionRule::SimpleAcceptance => "simple acceptance",
        }
    }
}

/// `decision guarded rejection`, in the header or in a rule.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Decision {
    /// The rule chosen.
    pub rule: DecisionRule,
    /// Where.
    #[derive_where(skip)]
    pub span: Span,
}

/// How the rulebook's expanded uncertainties are taken, as written.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum CoverageSpec {
    /// `coverage k = 2`: a fixed coverage factor.
    Factor(f64),
    /// `coverage 95 %`: a coverage probability in percent, k from the t-distribution.
    Percent(f64),
}

/// `coverage k = 2` or `coverage 95 %`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Coverage {
    /// The factor or probability.
    pub spec: CoverageSpec,
    /// The number as written, for printing it back.
    pub written: String,
    /// Where the number is.
    #[derive_where(skip)]
    pub number: Span,
    /// The whole line.
    #[derive_where(skip)]
    pub span: Span,
}

/// `measure NAME: DIMENSION [per cylinder] [required|optional] [range A to B] ["procedure"]`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Measure {
    /// What the declaration calls it.
    pub name: Name,
    /// The dimension word (`length`, `text`, ...), resolved by the checker.
    pub dimension: Name,
    /// One value per cylinder, or one for the engine.
    pub per_cylinder: bool,
    /// Whether a declaration must supply it.
    pub required: bool,
    /// The range a plausible value lies in, if the rulebook states one.
    pub range: Option<(Expr, Expr)>,
    /// The one-line procedure printed on the measurement sheet.
    pub procedure: Option<Text>,
    /// The whole item.
    #[derive_where(skip)]
    pub span: Span,
}

/// `define NAME = EXPR`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Define {
    /// The derived value's name.
    pub name: Name,
    /// How it is computed.
    pub expr: Expr,
    /// The whole item.
    #[derive_where(skip)]
    pub span: Span,
}

/// Whether a parts list names what is allowed or what is not.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ListKind {
    /// `approved list`
    Approved,
    /// `banned list`
    Banned,
}

/// `approved list NAME "title" [ignoring case] ENTRY... end`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct PartsList {
    /// Approved or banned.
    pub kind: ListKind,
    /// The list's name, used by `in`.
    pub name: Name,
    /// A title for reports.
    pub title: Option<Text>,
    /// `ignoring case`: an entry matches a value that differs from it only in case.
    pub ignore_case: bool,
    /// Exact identifiers and patterns.
    pub entries: Vec<ListEntry>,
    /// The whole item.
    #[derive_where(skip)]
    pub span: Span,
}

/// One entry of a parts list.
#[derive(Clone, Debug, PartialEq)]
pub enum ListEntry {
    /// An exact part or casting number.
    Exact(Text),
    /// A family of numbers, as a regular expression.
    Pattern(Pattern),
}

/// A regular expression literal `/.../` with an optional `i` flag.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Pattern {
    /// The expression, with `\/` turned back into `/`.
    pub source: String,
    /// The `i` flag.
    pub ignore_case: bool,
    /// Where, slashes included.
    #[derive_where(skip)]
    pub span: Span,
}

/// `class NAME "title" [extends NAME] BODY end`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Class {
    /// The class's name.
    pub name: Name,
    /// A title for reports.
    pub title: Option<Text>,
    /// The class it builds on.
    pub extends: Option<Name>,
    /// Rules, conditional groups and drops.
    pub body: Vec<ClassItem>,
    /// The whole item.
    #[derive_where(skip)]
    pub span: Span,
}

/// `bulletin "ID" ["title"] effective DATE amends CLASS BODY end`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Bulletin {
    /// The bulletin's identifier.
    pub id: Text,
    /// A title for reports.
    pub title: Option<Text>,
    /// From when it is in force.
    pub effective: DateAt,
    /// The class it changes.
    pub amends: Name,
    /// New rules, overrides and drops.
    pub body: Vec<ClassItem>,
    /// The whole item.
    #[derive_where(skip)]
    pub span: Span,
}

/// One item in a class or bulletin body.
#[derive(Clone, Debug, PartialEq)]
#[allow(
    clippy::large_enum_variant,
    reason = "a rulebook's tree is small and built once; boxing would only add indirection"
)]
pub enum ClassItem {
    /// A rule.
    Rule(Rule),
    /// `when COND ... end`: rules that apply only when the condition holds.
    When(WhenGroup),
    /// `drop SECTION`: remove an inherited rule.
    Drop(Section),
}

/// `when COND BODY end`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct WhenGroup {
    /// When the body applies.
    pub condition: Condition,
    /// The items it guards.
    pub body: Vec<ClassItem>,
    /// The whole group.
    #[derive_where(skip)]
    pub span: Span,
}

/// A section number as the rulebook writes it (`3.1`, `7.4.2`, `12a`).
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Section {
    /// The text.
    pub text: String,
    /// Where.
    #[derive_where(skip)]
    pub span: Span,
}

/// `[override] rule SECTION "title" [when COND] require TEST [decision RULE] [penalty "..."]
/// [note "..."] end`
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Rule {
    /// Replaces an inherited rule of the same section.
    pub overrides: bool,
    /// The rulebook's own section number.
    pub section: Section,
    /// The rule's title.
    pub title: Text,
    /// A condition on this rule alone.
    pub condition: Option<Condition>,
    /// The limit.
    pub require: Test,
    /// The rule's own decision rule, when it states one instead of the rulebook's.
    pub decision: Option<Decision>,
    /// The penalty class.
    pub penalty: Option<Text>,
    /// A note for the report.
    pub note: Option<Text>,
    /// The whole rule.
    #[derive_where(skip)]
    pub span: Span,
}

/// A comparison operator.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CompareOp {
    /// `<=`
    AtMost,
    /// `<`
    Below,
    /// `>=`
    AtLeast,
    /// `>`
    Above,
    /// `==`
    Equal,
    /// `!=`
    NotEqual,
}

impl CompareOp {
    /// The same comparison with its sides swapped: `3 < x` is `x > 3`.
    pub fn flipped(self) -> CompareOp {
        match self {
            CompareOp::AtMost => CompareOp::AtLeast,
            CompareOp::Below => CompareOp::Above,
            CompareOp::AtLeast => CompareOp::AtMost,
            CompareOp::Above => CompareOp::Below,
            other => other,
        }
    }

    /// The operator as written.
    pub fn symbol(self) -> &'static str {
        match self {
            CompareOp::AtMost => "<=",
            CompareOp::Below => "<",
            CompareOp::AtLeast => ">=",
            CompareOp::Above => ">",
            CompareOp::Equal => "==",
            CompareOp::NotEqual => "!=",
        }
    }
}

/// A single test: what a rule requires, or one atom of a condition.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Test {
    /// What is tested.
    pub kind: TestKind,
    /// The whole test.
    #[derive_where(skip)]
    pub span: Span,
}

/// The kinds of test.
#[derive(Clone, Debug, PartialEq)]
#[allow(
    clippy::large_enum_variant,
    reason = "a rulebook's tree is small and built once; boxing would only add indirection"
)]
pub enum TestKind {
    /// `A <= B [allowing C]`
    Compare {
        /// Left side.
        left: Expr,
        /// Operator.
        op: CompareOp,
        /// Right side.
        right: Expr,
        /// Written allowance added to the limit.
        allowance: Option<Expr>,
    },
    /// `A between LOW and HIGH [allowing C]`
    Between {
        /// What is tested.
        subject: Expr,
        /// Lower limit.
        low: Expr,
        /// Upper limit.
        high: Expr,
        /// Written allowance widening both limits.
        allowance: Option<Expr>,
    },
    /// `A in LIST` or `A not in LIST`
    Member {
        /// The identifier tested.
        subject: Expr,
        /// `not in`
        negated: bool,
        /// The parts list.
        list: Name,
    },
    /// `A matches /re/` or `A not matches /re/`
    Matches {
        /// The identifier tested.
        subject: Expr,
        /// `not matches`
        negated: bool,
        /// The pattern.
        pattern: Pattern,
    },
}

/// A condition: tests joined by `and`, `or`, `not`.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub enum Condition {
    /// One test (boxed: a rule holds its optional condition inline, and a rule without one
    /// should not pay for a test's size).
    Test(Box<Test>),
    /// Both hold.
    And(Box<Condition>, Box<Condition>),
    /// Either holds.
    Or(Box<Condition>, Box<Condition>),
    /// Does not hold.
    Not(Box<Condition>, #[derive_where(skip)] Span),
}

impl Condition {
    /// The span the condition covers.
    pub fn span(&self) -> Span {
        match self {
            Condition::Test(t) => t.span,
            Condition::And(a, b) | Condition::Or(a, b) => a.span().to(b.span()),
            Condition::Not(_, span) => *span,
        }
    }
}

/// An arithmetic expression.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Expr {
    /// What kind.
    pub kind: ExprKind,
    /// Where.
    #[derive_where(skip)]
    pub span: Span,
}

/// Arithmetic operators.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum BinaryOp {
    /// `+`
    Add,
    /// `-`
    Subtract,
    /// `*`
    Multiply,
    /// `/`
    Divide,
    /// `^`
    Power,
}

impl BinaryOp {
    /// The operator as written.
    pub fn symbol(self) -> char {
        match self {
            BinaryOp::Add => '+',
            BinaryOp::Subtract => '-',
            BinaryOp::Multiply => '*',
            BinaryOp::Divide => '/',
            BinaryOp::Power => '^',
        }
    }
}

/// The kinds of expression.
#[derive(Clone, Debug, PartialEq)]
pub enum ExprKind {
    /// A number with an optional unit and uncertainty (boxed: it is by far the largest kind,
    /// and every expression would otherwise be its size).
    Quantity(Box<Quantity>),
    /// A string.
    Text(Text),
    /// A measurement or derived value.
    Name(Name),
    /// A built-in function.
    Call {
        /// The function.
        function: Name,
        /// Its arguments.
        args: Vec<Arg>,
    },
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
}

/// One argument of a call, optionally labelled with the parameter name (`stroke: 3.48 in`).
#[derive(Clone, Debug, PartialEq)]
pub struct Arg {
    /// The parameter name written before a colon.
    pub label: Option<Name>,
    /// The value.
    pub value: Expr,
}

/// A number as written, with the value it denotes. Two numbers are equal when their values
/// are: the digits as written (`4.0`, `4.000`) are kept for printing, not for equality.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct Number {
    /// The value.
    pub value: f64,
    /// The text written (`1-5/8`, `4.030`), kept for printing.
    #[derive_where(skip)]
    pub text: String,
}

/// A unit symbol as written, resolved by the checker.
#[derive(Clone, Debug)]
#[derive_where(PartialEq)]
pub struct UnitRef {
    /// The symbol.
    pub symbol: String,
    /// Where.
    #[derive_where(skip)]
    pub span: Span,
}

/// `VALUE [UNIT] [± U [UNIT] [(k = K)]]`
#[derive(Clone, Debug, PartialEq)]
pub struct Quantity {
    /// The value.
    pub value: Number,
    /// Its unit.
    pub unit: Option<UnitRef>,
    /// A stated expanded uncertainty.
    pub uncertainty: Option<Uncertainty>,
}

/// `± U [UNIT] [(k = K)]`
#[derive(Clone, Debug, PartialEq)]
pub struct Uncertainty {
    /// The expanded uncertainty.
    pub value: Number,
    /// Its unit; when absent it is the value's unit.
    pub unit: Option<UnitRef>,
    /// The coverage factor, 2 when not written.
    pub coverage: Option<Number>,
}

impl Expr {
    /// Every name the expression reads, in the order written (repeats included).
    pub fn names<'e>(&'e self, out: &mut Vec<&'e str>) {
        match &self.kind {
            ExprKind::Name(n) => out.push(&n.text),
            ExprKind::Negate(inner) => inner.names(out),
            ExprKind::Binary { left, right, .. } => {
                left.names(out);
                right.names(out);
            }
            ExprKind::Call { args, .. } => args.iter().for_each(|a| a.value.names(out)),
            ExprKind::Quantity(_) | ExprKind::Text(_) => {}
        }
    }
}

impl Test {
    /// Every name the test reads.
    pub fn names<'e>(&'e self, out: &mut Vec<&'e str>) {
        match &self.kind {
            TestKind::Compare {
                left,
                right,
                allowance,
                ..
            } => {
                left.names(out);
                right.names(out);
                if let Some(a) = allowance {
                    a.names(out);
                }
            }
            TestKind::Between {
                subject,
                low,
                high,
                allowance,
            } => {
                subject.names(out);
                low.names(out);
                high.names(out);
                if let Some(a) = allowance {
                    a.names(out);
                }
            }
            TestKind::Member { subject, .. } | TestKind::Matches { subject, .. } => {
                subject.names(out)
            }
        }
    }
}

impl Condition {
    /// Every name the condition reads.
    pub fn names<'e>(&'e self, out: &mut Vec<&'e str>) {
        match self {
            Condition::Test(t) => t.names(out),
            Condition::Not(inner, _) => inner.names(out),
            Condition::And(a, b) | Condition::Or(a, b) => {
                a.names(out);
                b.names(out);
            }
        }
    }
}
