//! The check stage's errors and warnings as data. Each [`CheckError`] variant holds what went
//! wrong as fields (the names involved, the places, a suggested name) and derives its code,
//! level, message, labels and help in one match each; `Problem::from` turns it into the
//! [`Problem`] that miette renders.

use crate::diagnostic::codes;
use crate::diagnostic::{Level, Problem, first_few, shortened};
use crate::parse::ast::{CompareOp, Date};
use crate::report::format::count;
use crate::source::Span;
use crate::units::{self, Dimension};

use super::classes::MAX_EXTENDS;
use super::model::{Origin, ValueKind};
use super::patterns::MAX_PATTERNS;

/// One of the three header lines a rulebook's main file must have.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum HeaderLine {
    /// `series "..."`
    Series,
    /// `edition "..." effective DATE`
    Edition,
    /// `decision ...`
    Decision,
    /// `coverage ...`
    Coverage,
}

impl HeaderLine {
    /// The keyword that starts the line.
    pub fn keyword(self) -> &'static str {
        match self {
            HeaderLine::Series => "series",
            HeaderLine::Edition => "edition",
            HeaderLine::Decision => "decision",
            HeaderLine::Coverage => "coverage",
        }
    }

    /// A complete line of the invented demo series, for a help line.
    pub fn example(self) -> &'static str {
        match self {
            HeaderLine::Series => "series \"Tamsin Valley Stock Car Club\"",
            HeaderLine::Edition => "edition \"2027\" effective 2027-03-06",
            HeaderLine::Decision => "decision guarded rejection",
            HeaderLine::Coverage => "coverage 95 %",
        }
    }
}

/// The part of a limit a `±` was written on.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LimitPart {
    /// An upper or lower limit, or an end of a `between`.
    Limit,
    /// The value of `==` or `!=`.
    Equality,
    /// The amount after `allowing`.
    Allowance,
    /// The value a `when` condition compares with (where `allowing` has no place).
    Condition,
}

/// A kind of named definition that must be unique in a rulebook.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Definition {
    /// `approved list` or `banned list`.
    PartsList,
    /// `class`.
    Class,
}

impl Definition {
    fn words(self) -> &'static str {
        match self {
            Definition::PartsList => "parts list",
            Definition::Class => "class",
        }
    }
}

/// What names a class that does not exist.
#[derive(Clone, Debug, PartialEq)]
pub enum ClassReference {
    /// A bulletin's `amends` (the bulletin's id).
    Amends(String),
    /// A class's `extends` (the extending class).
    Extends(String),
}

/// A problem found by the static checks.
#[derive(Clone, Debug, PartialEq)]
pub enum CheckError {
    /// A header line in an included file.
    HeaderInInclude {
        /// The line.
        at: Span,
    },
    /// A header line written twice.
    DuplicateHeader {
        /// Which line.
        line: HeaderLine,
        /// The second one.
        at: Span,
    },
    /// A header line missing from the main file.
    MissingHeader {
        /// Which line.
        line: HeaderLine,
        /// The start of the main file.
        at: Span,
    },
    /// A measurement or derived value named twice (they share one namespace).
    DuplicateValueName {
        /// The name.
        name: String,
        /// The second declaration.
        at: Span,
        /// The first.
        first: Span,
    },
    /// A parts list or class defined twice.
    DuplicateDefinition {
        /// What kind of definition.
        kind: Definition,
        /// The name.
        name: String,
        /// The second definition.
        at: Span,
        /// The first.
        first: Span,
    },
    /// Two bulletins with one identifier.
    DuplicateBulletin {
        /// The identifier.
        id: String,
        /// The second bulletin's identifier.
        at: Span,
        /// The first's.
        first: Span,
    },
    /// `amends` or `extends` names no class of the rulebook.
    UnknownClass {
        /// The name written.
        name: String,
        /// What names it.
        from: ClassReference,
        /// A near class name, if there is one.
        suggestion: Option<String>,
        /// Where it is written.
        at: Span,
    },
    /// A bulletin dated before the edition it amends.
    BulletinBeforeEdition {
        /// The bulletin.
        id: String,
        /// Its date.
        date: Date,
        /// The edition's date.
        edition_date: Date,
        /// The bulletin's date as written.
        at: Span,
        /// The edition's date as written.
        edition_at: Span,
    },
    /// A bulletin with no rules (a warning).
    EmptyBulletin {
        /// The bulletin.
        id: String,
        /// Its identifier.
        at: Span,
    },
    /// Classes that extend each other in a loop.
    ExtendsCycle {
        /// The classes of the loop in order, the first repeated at the end.
        chain: Vec<String>,
        /// The `extends` that closes it.
        at: Span,
    },
    /// A class more than [`MAX_EXTENDS`] `extends` below its root class.
    ExtendsTooLong {
        /// The class.
        class: String,
        /// The class at the top of its chain, which extends none.
        root: String,
        /// Its `extends`.
        at: Span,
    },
    /// More patterns in the rulebook and its includes than [`MAX_PATTERNS`].
    TooManyPatterns {
        /// The first pattern past the limit.
        at: Span,
    },
    /// An override that says the same as the rule it replaces (a warning).
    OverrideChangesNothing {
        /// The section.
        section: String,
        /// The override.
        at: Span,
        /// The rule it replaces.
        replaced: Span,
    },
    /// `override` with no inherited rule of that section.
    NothingToOverride {
        /// The class the override sits in.
        class: String,
        /// The section.
        section: String,
        /// Where.
        at: Span,
    },
    /// Two rules with one section number in one class (or one bulletin).
    DuplicateSection {
        /// The class.
        class: String,
        /// The section.
        section: String,
        /// The second rule.
        at: Span,
        /// The first.
        first: Span,
    },
    /// A rule with the number of one inherited from elsewhere, without `override`.
    SectionClash {
        /// The section.
        section: String,
        /// Where the inherited rule comes from.
        from: Origin,
        /// The new rule.
        at: Span,
        /// The inherited one.
        first: Span,
    },
    /// `drop` inside a `when` group.
    ConditionalDrop {
        /// The section.
        section: String,
        /// Where.
        at: Span,
    },
    /// `drop` of a section the class does not have.
    NothingToDrop {
        /// The class.
        class: String,
        /// The section.
        section: String,
        /// Where.
        at: Span,
    },
    /// One entry twice in a parts list (a warning).
    DuplicateEntry {
        /// The entry.
        entry: String,
        /// The list.
        list: String,
        /// The second one.
        at: Span,
    },
    /// An exact entry that a pattern of its own list already matches (a warning).
    EntryCoveredByPattern {
        /// The entry.
        entry: String,
        /// The list.
        list: String,
        /// The entry as written.
        at: Span,
        /// The pattern that matches it.
        pattern_at: Span,
    },
    /// A pattern of an approved list that matches an entry of a banned list (a warning).
    ApprovedAndBanned {
        /// The approved list.
        approved: String,
        /// The banned part.
        part: String,
        /// The banned list.
        banned: String,
        /// The pattern.
        at: Span,
        /// The banned entry.
        banned_at: Span,
    },
    /// One part number written exactly on an approved list and on a banned list.
    PartApprovedAndBanned {
        /// The part.
        part: String,
        /// The approved list.
        approved: String,
        /// The banned list.
        banned: String,
        /// The approved entry.
        at: Span,
        /// The banned entry.
        banned_at: Span,
    },
    /// A pattern whose compiled program is over the size limit.
    PatternTooLarge {
        /// The limit, bytes.
        limit: usize,
        /// The pattern.
        at: Span,
    },
    /// A pattern that does not compile.
    BadPattern {
        /// The regular-expression library's reason, its last line.
        reason: String,
        /// The pattern.
        at: Span,
    },
    /// A measurement no rule reads (a warning).
    UnusedMeasurement {
        /// Its name.
        name: String,
        /// Where it is declared.
        at: Span,
    },
    /// A derived value no rule reads (a warning).
    UnusedDefine {
        /// Its name.
        name: String,
        /// Where it is defined.
        at: Span,
    },
    /// A text measurement declared `per cylinder`.
    PerCylinderText {
        /// The measurement.
        name: String,
        /// Its dimension word.
        at: Span,
    },
    /// A dimension word gonogo does not know.
    UnknownDimension {
        /// The word written.
        word: String,
        /// A near dimension name, if there is one.
        suggestion: Option<String>,
        /// Where.
        at: Span,
    },
    /// A `range` on a text measurement.
    RangeOnText {
        /// The measurement.
        name: String,
        /// The range.
        at: Span,
    },
    /// A `range` whose low end is not below its high end.
    EmptyRange {
        /// The measurement.
        name: String,
        /// The range.
        at: Span,
    },
    /// A derived value that depends on itself.
    DefineCycle {
        /// The derived value.
        name: String,
        /// The use that closes the loop.
        at: Span,
        /// Its definition.
        defined_at: Span,
    },
    /// An uncertainty in a unit of another dimension than its value's.
    UncertaintyDimension {
        /// The uncertainty's dimension.
        uncertainty: Dimension,
        /// The value's.
        value: Dimension,
        /// The quantity.
        at: Span,
    },
    /// A coverage factor not above zero.
    BadCoverage {
        /// The quantity.
        at: Span,
    },
    /// A `coverage` line whose factor is not above zero or whose probability is not between
    /// 0 % and 100 %.
    CoverageOutOfRange {
        /// True for a probability, false for a factor.
        probability: bool,
        /// The number.
        at: Span,
    },
    /// A unit symbol gonogo does not know.
    UnknownUnit {
        /// The symbol written.
        symbol: String,
        /// A near unit symbol, if there is one.
        suggestion: Option<String>,
        /// Where.
        at: Span,
    },
    /// A name that is neither a measurement nor a derived value.
    UnknownName {
        /// The name written.
        name: String,
        /// A near name, if there is one.
        suggestion: Option<String>,
        /// Where.
        at: Span,
    },
    /// An exponent that is not a whole number from -6 to 6 (or a dimensioned base).
    BadExponent {
        /// The base's dimension.
        base: Dimension,
        /// The exponent.
        at: Span,
    },
    /// A function name that is not a built-in.
    UnknownFunction {
        /// The name written.
        name: String,
        /// A near function name, if there is one.
        suggestion: Option<String>,
        /// Where.
        at: Span,
    },
    /// A formula argument of the wrong dimension.
    ArgumentDimension {
        /// The formula.
        function: String,
        /// The parameter.
        param: String,
        /// The parameter's dimension.
        expected: Dimension,
        /// The argument's.
        found: Dimension,
        /// The argument.
        at: Span,
    },
    /// A per-cylinder argument where a formula takes one value.
    NeedsSingleValue {
        /// The formula.
        function: String,
        /// The parameter.
        param: String,
        /// The argument.
        at: Span,
    },
    /// A label that names no parameter of the formula.
    UnknownArgument {
        /// The formula.
        function: String,
        /// Its parameters in order, as `(a, b, c)`.
        signature: String,
        /// The label written.
        label: String,
        /// A near parameter name, if there is one.
        suggestion: Option<String>,
        /// The label.
        at: Span,
    },
    /// A label given to a function that takes none (`max`, `sqrt`, ...).
    LabelNotTaken {
        /// The function.
        function: String,
        /// The label.
        at: Span,
    },
    /// One parameter given twice.
    ArgumentTwice {
        /// The formula.
        function: String,
        /// Its parameters in order, as `(a, b, c)`.
        signature: String,
        /// The parameter.
        param: String,
        /// The second value.
        at: Span,
    },
    /// More arguments than the formula has parameters.
    TooManyArguments {
        /// The formula.
        function: String,
        /// Its parameters in order, as `(a, b, c)`.
        signature: String,
        /// How many it takes.
        takes: usize,
        /// How many were given.
        given: usize,
        /// The first one too many.
        at: Span,
    },
    /// Parameters left without a value.
    ArgumentMissing {
        /// The formula.
        function: String,
        /// Its parameters in order, as `(a, b, c)`.
        signature: String,
        /// The parameters missing.
        missing: Vec<String>,
        /// The call.
        at: Span,
    },
    /// `max` or `min` of values of different dimensions.
    MixedDimensions {
        /// The function.
        function: String,
        /// The call.
        at: Span,
    },
    /// The square root of a dimension with no name.
    BadRoot {
        /// The dimension under the root.
        dimension: Dimension,
        /// The call.
        at: Span,
    },
    /// A generic function given the wrong number of values.
    GenericArgumentCount {
        /// The function.
        function: String,
        /// Whether it aggregates cylinders (`max`, `min`, `mean`).
        aggregate: bool,
        /// The call.
        at: Span,
    },
    /// Text in arithmetic.
    TextInArithmetic {
        /// What it is used in (`` `+` ``, a function's name).
        used_in: String,
        /// The text value.
        at: Span,
    },
    /// A value of another dimension than the place needs (a range limit, the allowance).
    WrongDimension {
        /// The place, in words (`a range limit`).
        what: String,
        /// The dimension needed.
        expected: Dimension,
        /// What the value is.
        found: ValueKind,
        /// The value.
        at: Span,
    },
    /// Two sides of `+`, `-` or a comparison of different dimensions.
    DimensionMismatch {
        /// What joins them.
        joined_by: Joined,
        /// The left side's dimension.
        left: Dimension,
        /// The right side's.
        right: Dimension,
        /// The left side.
        left_at: Span,
        /// The right side.
        right_at: Span,
        /// When one side is a bare number: the dimension the other side has, for the hint.
        bare_number_beside: Option<Dimension>,
    },
    /// Text compared with a number.
    KindMismatch {
        /// The left side's kind.
        left: ValueKind,
        /// The right side's.
        right: ValueKind,
        /// The left side.
        left_at: Span,
        /// The right side.
        right_at: Span,
    },
    /// `in` names no parts list of the rulebook.
    UnknownList {
        /// The name written.
        name: String,
        /// A near list name, if there is one.
        suggestion: Option<String>,
        /// Where.
        at: Span,
    },
    /// A number looked up in a list or matched by a pattern.
    NotText {
        /// What the value is.
        found: ValueKind,
        /// The value.
        at: Span,
    },
    /// Text compared with an ordering operator.
    TextOrder {
        /// The operator.
        op: CompareOp,
        /// The comparison.
        at: Span,
    },
    /// A per-cylinder value in a condition.
    PerCylinderCondition {
        /// The value.
        at: Span,
    },
    /// An allowance on `==` or `!=`.
    AllowanceOnEquality {
        /// The allowance.
        at: Span,
    },
    /// A negative allowance.
    NegativeAllowance {
        /// The allowance.
        at: Span,
    },
    /// A `±` on a limit or an allowance, which are exact.
    UncertainLimit {
        /// Where on the limit.
        part: LimitPart,
        /// The uncertainty as written, with its unit (`0.001 in`).
        uncertainty: String,
        /// The `define` the limit names, when the `±` is inside it.
        through: Option<String>,
        /// The literal, or the name written on the limit when it is reached through a `define`.
        at: Span,
        /// The literal.
        literal: Span,
    },
    /// An allowance that is not a fixed amount.
    AllowanceNotConstant {
        /// The allowance.
        at: Span,
    },
    /// A rule the declared ranges keep always inside its limit (a warning).
    NeverFails {
        /// What the rule tests, as written.
        subject: String,
        /// The test.
        at: Span,
    },
    /// A rule the declared ranges keep always outside its limit (a warning).
    NeverMet {
        /// What the rule tests, as written.
        subject: String,
        /// The test.
        at: Span,
    },
    /// Limits on one subject in one class that leave no legal value.
    ContradictoryLimits {
        /// What the limits bound, as written.
        subject: String,
        /// The class.
        class: String,
        /// One limit.
        at: Span,
        /// The limit it conflicts with, when it is another one.
        other: Option<Span>,
    },
    /// A condition that can never hold.
    NeverHolds {
        /// The primary place and its label.
        at: (Span, &'static str),
        /// The clashing parts, each with its label.
        parts: Vec<(Span, &'static str)>,
    },
    /// A built-in whose parameter list and implementation disagree: a mistake in gonogo's
    /// formula table, never in the rulebook.
    FormulaTableMismatch {
        /// The built-in.
        function: String,
        /// How many parameters its table entry lists.
        params: usize,
        /// How many values its implementation takes.
        arity: usize,
        /// The call.
        at: Span,
    },
    /// The checks passed but the checked rulebook could not be built: a mistake in gonogo,
    /// never in the rulebook.
    Internal {
        /// What could not be built, in words.
        what: String,
        /// Where, when there is a place to point at.
        at: Span,
    },
    /// A derived value standing on a chain of more than `MAX_DEFINE_DEPTH` (64) others.
    DefineTooDeep {
        /// The first derived value past the cap.
        name: String,
        /// The cap.
        limit: usize,
        /// Its definition.
        at: Span,
    },
    /// A division whose divisor is a constant zero.
    DivisionByZero {
        /// The divisor.
        at: Span,
    },
    /// Arithmetic on constants whose result is not a finite number (it overflows).
    NotFinite {
        /// The expression.
        at: Span,
    },
    /// More rules in the classes together, once flattened, than `MAX_RULES` (25,000).
    TooManyRules {
        /// The class whose rules passed the limit.
        class: String,
        /// The limit.
        limit: usize,
        /// Whether the limit is passed only by counting inherited rules (else as written).
        inherited: bool,
        /// The class's name, or the first rule written past the limit.
        at: Span,
    },
}

/// What joins two sides whose dimensions differ.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Joined {
    /// `+`
    Add,
    /// `-`
    Subtract,
    /// A comparison.
    Compare,
}

impl CheckError {
    /// The stable code.
    pub fn code(&self) -> codes::Code {
        match self {
            CheckError::HeaderInInclude { .. } => codes::check::HEADER_IN_INCLUDE,
            CheckError::DuplicateHeader { .. } => codes::check::DUPLICATE_HEADER,
            CheckError::MissingHeader { .. } => codes::check::MISSING_HEADER,
            CheckError::DuplicateValueName { .. } | CheckError::DuplicateDefinition { .. } => {
                codes::check::DUPLICATE_NAME
            }
            CheckError::DuplicateBulletin { .. } => codes::check::DUPLICATE_BULLETIN,
            CheckError::UnknownClass { .. } => codes::check::UNKNOWN_CLASS,
            CheckError::BulletinBeforeEdition { .. } => codes::check::BULLETIN_BEFORE_EDITION,
            CheckError::EmptyBulletin { .. } => codes::check::EMPTY_BULLETIN,
            CheckError::ExtendsCycle { .. } => codes::check::EXTENDS_CYCLE,
            CheckError::ExtendsTooLong { .. } => codes::check::EXTENDS_TOO_LONG,
            CheckError::TooManyPatterns { .. } => codes::check::TOO_MANY_PATTERNS,
            CheckError::OverrideChangesNothing { .. } => codes::check::OVERRIDE_CHANGES_NOTHING,
            CheckError::NothingToOverride { .. } => codes::check::NOTHING_TO_OVERRIDE,
            CheckError::DuplicateSection { .. } | CheckError::SectionClash { .. } => {
                codes::check::DUPLICATE_SECTION
            }
            CheckError::ConditionalDrop { .. } => codes::check::CONDITIONAL_DROP,
            CheckError::NothingToDrop { .. } => codes::check::NOTHING_TO_DROP,
            CheckError::DuplicateEntry { .. } => codes::check::DUPLICATE_ENTRY,
            CheckError::EntryCoveredByPattern { .. } => codes::check::ENTRY_COVERED_BY_PATTERN,
            CheckError::ApprovedAndBanned { .. } => codes::check::APPROVED_AND_BANNED,
            CheckError::PartApprovedAndBanned { .. } => codes::check::PART_APPROVED_AND_BANNED,
            CheckError::PatternTooLarge { .. } => codes::check::PATTERN_TOO_LARGE,
            CheckError::BadPattern { .. } => codes::check::BAD_PATTERN,
            CheckError::UnusedMeasurement { .. } => codes::check::UNUSED_MEASUREMENT,
            CheckError::UnusedDefine { .. } => codes::check::UNUSED_DEFINE,
            CheckError::PerCylinderText { .. } => codes::check::PER_CYLINDER_TEXT,
            CheckError::UnknownDimension { .. } => codes::check::UNKNOWN_DIMENSION,
            CheckError::RangeOnText { .. } => codes::check::RANGE_ON_TEXT,
            CheckError::EmptyRange { .. } => codes::check::EMPTY_RANGE,
            CheckError::DefineCycle { .. } => codes::check::DEFINE_CYCLE,
            CheckError::UncertaintyDimension { .. } => codes::check::UNCERTAINTY_DIMENSION,
            CheckError::BadCoverage { .. } => codes::check::BAD_COVERAGE,
            CheckError::CoverageOutOfRange { .. } => codes::check::COVERAGE_OUT_OF_RANGE,
            CheckError::UnknownUnit { .. } => codes::check::UNKNOWN_UNIT,
            CheckError::UnknownName { .. } => codes::check::UNKNOWN_NAME,
            CheckError::BadExponent { .. } => codes::check::BAD_EXPONENT,
            CheckError::UnknownFunction { .. } => codes::check::UNKNOWN_FUNCTION,
            CheckError::ArgumentDimension { .. } => codes::check::ARGUMENT_DIMENSION,
            CheckError::NeedsSingleValue { .. } => codes::check::NEEDS_SINGLE_VALUE,
            CheckError::UnknownArgument { .. } | CheckError::LabelNotTaken { .. } => {
                codes::check::UNKNOWN_ARGUMENT
            }
            CheckError::ArgumentTwice { .. } => codes::check::ARGUMENT_TWICE,
            CheckError::TooManyArguments { .. } | CheckError::GenericArgumentCount { .. } => {
                codes::check::ARGUMENT_COUNT
            }
            CheckError::ArgumentMissing { .. } => codes::check::ARGUMENT_MISSING,
            CheckError::MixedDimensions { .. }
            | CheckError::WrongDimension { .. }
            | CheckError::DimensionMismatch { .. }
            | CheckError::KindMismatch { .. } => codes::check::DIMENSION_MISMATCH,
            CheckError::BadRoot { .. } => codes::check::BAD_ROOT,
            CheckError::TextInArithmetic { .. } => codes::check::TEXT_IN_ARITHMETIC,
            CheckError::UnknownList { .. } => codes::check::UNKNOWN_LIST,
            CheckError::NotText { .. } => codes::check::NOT_TEXT,
            CheckError::TextOrder { .. } => codes::check::TEXT_ORDER,
            CheckError::PerCylinderCondition { .. } => codes::check::PER_CYLINDER_CONDITION,
            CheckError::AllowanceOnEquality { .. } => codes::check::ALLOWANCE_ON_EQUALITY,
            CheckError::NegativeAllowance { .. } => codes::check::NEGATIVE_ALLOWANCE,
            CheckError::AllowanceNotConstant { .. } => codes::check::ALLOWANCE_NOT_CONSTANT,
            CheckError::UncertainLimit { .. } => codes::check::UNCERTAIN_LIMIT,
            CheckError::NeverFails { .. } => codes::check::NEVER_FAILS,
            CheckError::NeverMet { .. } => codes::check::NEVER_MET,
            CheckError::ContradictoryLimits { .. } => codes::check::CONTRADICTORY_LIMITS,
            CheckError::NeverHolds { .. } => codes::check::NEVER_HOLDS,
            CheckError::FormulaTableMismatch { .. } | CheckError::Internal { .. } => {
                codes::check::INTERNAL
            }
            CheckError::DefineTooDeep { .. } => codes::check::DEFINE_TOO_DEEP,
            CheckError::DivisionByZero { .. } => codes::check::DIVISION_BY_ZERO,
            CheckError::NotFinite { .. } => codes::check::NOT_FINITE,
            CheckError::TooManyRules { .. } => codes::check::TOO_MANY_RULES,
        }
    }

    /// Error or warning.
    pub fn level(&self) -> Level {
        match self {
            CheckError::EmptyBulletin { .. }
            | CheckError::OverrideChangesNothing { .. }
            | CheckError::DuplicateEntry { .. }
            | CheckError::EntryCoveredByPattern { .. }
            | CheckError::ApprovedAndBanned { .. }
            | CheckError::UnusedMeasurement { .. }
            | CheckError::UnusedDefine { .. }
            | CheckError::NeverFails { .. }
            | CheckError::NeverMet { .. } => Level::Warning,
            _ => Level::Error,
        }
    }

    /// What is wrong.
    pub fn message(&self) -> String {
        match self {
            CheckError::HeaderInInclude { .. } => {
                "an included file cannot set the rulebook's header".to_string()
            }
            CheckError::DuplicateHeader { line, .. } => {
                format!("the rulebook sets `{}` twice", line.keyword())
            }
            CheckError::MissingHeader { line, .. } => {
                format!("the rulebook has no `{}` line", line.keyword())
            }
            CheckError::DuplicateValueName { name, .. } => format!("`{name}` is declared twice"),
            CheckError::DuplicateDefinition { kind, name, .. } => {
                format!("{} `{name}` is defined twice", kind.words())
            }
            CheckError::DuplicateBulletin { id, .. } => format!("bulletin `{id}` is issued twice"),
            CheckError::UnknownClass { name, from, .. } => match from {
                ClassReference::Amends(id) => {
                    format!(
                        "bulletin `{id}` amends `{name}`, which is not a class of this rulebook"
                    )
                }
                ClassReference::Extends(class) => {
                    format!(
                        "class `{class}` extends `{name}`, which is not a class of this rulebook"
                    )
                }
            },
            CheckError::BulletinBeforeEdition {
                id,
                date,
                edition_date,
                ..
            } => format!(
                "bulletin `{id}` takes effect on {date}, before the edition it amends ({edition_date})"
            ),
            CheckError::EmptyBulletin { id, .. } => format!("bulletin `{id}` changes nothing"),
            CheckError::ExtendsCycle { chain, .. } => {
                let quoted: Vec<String> = chain.iter().map(|c| format!("`{c}`")).collect();
                format!(
                    "classes extend each other in a loop: {}",
                    first_few(&quoted, " → ")
                )
            }
            CheckError::ExtendsTooLong { class, root, .. } => format!(
                "`{class}` stands more than {MAX_EXTENDS} `extends` below its root class `{root}`"
            ),
            CheckError::TooManyPatterns { .. } => {
                format!("the rulebook and its includes hold more than {MAX_PATTERNS} patterns")
            }
            CheckError::OverrideChangesNothing { section, .. } => {
                format!("this override of rule {section} changes nothing")
            }
            CheckError::NothingToOverride { class, section, .. } => {
                format!("`{class}` has no rule {section} to override")
            }
            CheckError::DuplicateSection { class, section, .. } => {
                format!("section {section} appears twice in `{class}`")
            }
            CheckError::SectionClash { section, from, .. } => {
                let from = match from {
                    Origin::Class(c) => format!("class `{c}`"),
                    Origin::Bulletin(b) => format!("bulletin `{b}`"),
                };
                format!("section {section} already comes from {from}")
            }
            CheckError::ConditionalDrop { section, .. } => {
                format!("`drop {section}` cannot sit inside a `when` group")
            }
            CheckError::NothingToDrop { class, section, .. } => {
                format!("`{class}` has no rule {section} to drop")
            }
            CheckError::DuplicateEntry { entry, list, .. } => {
                format!("`{entry}` is listed twice in `{list}`")
            }
            CheckError::EntryCoveredByPattern { entry, list, .. } => {
                format!("`{entry}` is already matched by a pattern of `{list}`")
            }
            CheckError::ApprovedAndBanned {
                approved,
                part,
                banned,
                ..
            } => format!(
                "this pattern of approved list `{approved}` also matches `{part}`, which banned list `{banned}` bans"
            ),
            CheckError::PartApprovedAndBanned {
                part,
                approved,
                banned,
                ..
            } => format!(
                "`{part}` is both on approved list `{approved}` and on banned list `{banned}`"
            ),
            CheckError::PatternTooLarge { limit, .. } => {
                format!("this pattern compiles to more than {limit} bytes")
            }
            CheckError::BadPattern { reason, .. } => {
                format!("this pattern does not compile: {reason}")
            }
            CheckError::UnusedMeasurement { name, .. } => {
                format!("`{name}` is measured but no rule reads it")
            }
            CheckError::UnusedDefine { name, .. } => {
                format!("`{name}` is defined but no rule reads it")
            }
            CheckError::PerCylinderText { name, .. } => {
                format!("`{name}` is text, and text is recorded once for the engine")
            }
            CheckError::UnknownDimension { word, .. } => {
                format!("`{word}` is not a dimension gonogo knows")
            }
            CheckError::RangeOnText { name, .. } => {
                format!("`{name}` is text and cannot have a range")
            }
            CheckError::EmptyRange { name, .. } => {
                format!("the range of `{name}` is empty: its low end is not below its high end")
            }
            CheckError::DefineCycle { name, .. } => {
                format!("`{name}` is defined in terms of itself")
            }
            CheckError::UncertaintyDimension {
                uncertainty, value, ..
            } => format!("the uncertainty is a {uncertainty}, but the value is a {value}"),
            CheckError::BadCoverage { .. } => "the coverage factor must be above zero".to_string(),
            CheckError::CoverageOutOfRange {
                probability: false, ..
            } => "the coverage factor must be above zero".to_string(),
            CheckError::CoverageOutOfRange {
                probability: true, ..
            } => "the coverage probability must be above 0 % and below 100 %".to_string(),
            CheckError::UnknownUnit { symbol, .. } => {
                format!("`{symbol}` is not a unit gonogo knows")
            }
            CheckError::UnknownName { name, .. } => {
                format!("`{name}` is not a measurement or derived value of this rulebook")
            }
            CheckError::BadExponent { base, .. } => {
                format!("a {base} can only be raised to a whole number from -6 to 6")
            }
            CheckError::UnknownFunction { name, .. } => {
                format!("`{name}` is not a built-in function")
            }
            CheckError::ArgumentDimension {
                function,
                param,
                expected,
                found,
                ..
            } => format!("`{param}` of `{function}` must be a {expected}, but this is a {found}"),
            CheckError::NeedsSingleValue {
                function, param, ..
            } => format!(
                "`{param}` of `{function}` takes one value for the engine, not one per cylinder"
            ),
            CheckError::UnknownArgument {
                function, label, ..
            } => format!("`{function}` has no parameter `{label}`"),
            CheckError::LabelNotTaken { function, .. } => {
                format!("`{function}` takes no labelled arguments")
            }
            CheckError::ArgumentTwice { param, .. } => format!("`{param}` is given twice"),
            CheckError::TooManyArguments {
                function,
                takes,
                given,
                ..
            } => format!(
                "`{function}` takes {}, not {given}",
                count(*takes, "argument", "arguments")
            ),
            CheckError::ArgumentMissing {
                function, missing, ..
            } => {
                let quoted: Vec<String> = missing.iter().map(|n| format!("`{n}`")).collect();
                format!("`{function}` is missing {}", first_few(&quoted, ", "))
            }
            CheckError::MixedDimensions { function, .. } => {
                format!("the values of `{function}` must all have one dimension")
            }
            CheckError::BadRoot { dimension, .. } => {
                format!("the square root of a {dimension} has no dimension gonogo can name")
            }
            CheckError::GenericArgumentCount {
                function,
                aggregate,
                ..
            } => {
                let expects = if *aggregate {
                    "one value measured per cylinder (or, for max and min, two or more values)"
                } else {
                    "exactly one value"
                };
                format!("`{function}` takes {expects}")
            }
            CheckError::TextInArithmetic { used_in, .. } => {
                format!("text cannot be used in {used_in}")
            }
            CheckError::WrongDimension {
                what,
                expected,
                found,
                ..
            } => format!("{what} must be a {expected}, but this is a {found}"),
            CheckError::DimensionMismatch {
                joined_by,
                left,
                right,
                ..
            } => match joined_by {
                Joined::Add => format!("cannot add a {right} and a {left}"),
                Joined::Subtract => format!("cannot subtract a {right} and a {left}"),
                Joined::Compare => format!("cannot compare a {left} with a {right}"),
            },
            CheckError::KindMismatch { left, right, .. } => {
                format!("cannot compare {left} with {right}")
            }
            CheckError::UnknownList { name, .. } => {
                format!("`{name}` is not a parts list of this rulebook")
            }
            CheckError::NotText { found, .. } => {
                format!("a {found} cannot be looked up in a parts list or matched by a pattern")
            }
            CheckError::TextOrder { op, .. } => {
                format!("text cannot be compared with `{}`", op.symbol())
            }
            CheckError::PerCylinderCondition { .. } => {
                "a condition needs one value for the engine, not one per cylinder".to_string()
            }
            CheckError::AllowanceOnEquality { .. } => {
                "an allowance widens a limit, and `==` or `!=` has none to widen".to_string()
            }
            CheckError::NegativeAllowance { .. } => "an allowance cannot be negative".to_string(),
            CheckError::AllowanceNotConstant { .. } => {
                "an allowance must be a fixed amount, not a measured one".to_string()
            }
            CheckError::UncertainLimit {
                part: LimitPart::Allowance,
                ..
            } => "an allowance cannot carry an uncertainty".to_string(),
            CheckError::UncertainLimit {
                part: LimitPart::Condition,
                ..
            } => "the value a condition compares with cannot carry an uncertainty".to_string(),
            CheckError::UncertainLimit {
                through: Some(name),
                ..
            } => format!("`{name}` is used as a limit, and a limit cannot carry an uncertainty"),
            CheckError::UncertainLimit { .. } => "a limit cannot carry an uncertainty".to_string(),
            CheckError::NeverFails { subject, .. } => format!(
                "this rule can never fail: the declared measurement ranges keep `{subject}` inside its limit"
            ),
            CheckError::NeverMet { subject, .. } => format!(
                "this rule can never be met: the declared measurement ranges keep `{subject}` outside its limit"
            ),
            CheckError::ContradictoryLimits { subject, class, .. } => {
                format!("the limits on `{subject}` in class `{class}` leave no legal value")
            }
            CheckError::NeverHolds { .. } => "this condition can never hold".to_string(),
            CheckError::FormulaTableMismatch {
                function,
                params,
                arity,
                ..
            } => format!(
                "the built-in `{function}` has {params} parameters, but its implementation takes {arity}"
            ),
            CheckError::Internal { what, .. } => {
                format!("the checked rulebook could not be built: {what}")
            }
            CheckError::DefineTooDeep { name, limit, .. } => {
                format!(
                    "`{name}` is derived through a chain of {} definitions, more than the {limit} allowed",
                    limit + 1
                )
            }
            CheckError::DivisionByZero { .. } => "this divides by zero".to_string(),
            CheckError::NotFinite { .. } => {
                "this arithmetic overflows: its result is too large to be a number".to_string()
            }
            CheckError::TooManyRules {
                class,
                limit,
                inherited: true,
                ..
            } => format!(
                "with `{class}`, the classes hold more than {limit} rules, counting every rule each inherits"
            ),
            CheckError::TooManyRules { limit, .. } => {
                format!("the rulebook's classes and bulletins hold more than {limit} rules")
            }
        }
    }

    /// Where, each place with its label; the first is the primary one.
    pub fn labels(&self) -> Vec<(Span, String)> {
        let fixed: Vec<(Span, &str)> = match self {
            CheckError::HeaderInInclude { at } => vec![(*at, "header line")],
            CheckError::DuplicateHeader { at, .. } => vec![(*at, "second time")],
            CheckError::MissingHeader { at, .. } => vec![(*at, "")],
            CheckError::DuplicateValueName { at, first, .. } => vec![
                (*at, "declared again here"),
                (*first, "first declared here"),
            ],
            CheckError::DuplicateDefinition { at, first, .. } => {
                vec![(*at, "defined again here"), (*first, "first defined here")]
            }
            CheckError::DuplicateBulletin { at, first, .. } => {
                vec![(*at, "second time"), (*first, "first time")]
            }
            CheckError::UnknownClass { at, .. } => vec![(*at, "unknown class")],
            CheckError::BulletinBeforeEdition { at, edition_at, .. } => {
                vec![(*at, "too early"), (*edition_at, "edition takes effect")]
            }
            CheckError::EmptyBulletin { at, .. } => vec![(*at, "no rules")],
            CheckError::ExtendsCycle { at, .. } => vec![(*at, "closes the loop")],
            CheckError::ExtendsTooLong { at, .. } => vec![(*at, "one step too many")],
            CheckError::TooManyPatterns { at } => vec![(*at, "past the limit")],
            CheckError::OverrideChangesNothing { at, replaced, .. } => vec![
                (*at, "same as the rule it replaces"),
                (*replaced, "the rule it replaces"),
            ],
            CheckError::NothingToOverride { at, .. } | CheckError::NothingToDrop { at, .. } => {
                vec![(*at, "no such rule")]
            }
            CheckError::DuplicateSection { at, first, .. } => vec![
                (*at, "second rule with this number"),
                (*first, "first rule with this number"),
            ],
            CheckError::SectionClash { at, first, .. } => vec![
                (*at, "same section number"),
                (*first, "the rule it would clash with"),
            ],
            CheckError::ConditionalDrop { at, .. } => vec![(*at, "inside `when`")],
            CheckError::DuplicateEntry { at, .. } => vec![(*at, "listed again")],
            CheckError::EntryCoveredByPattern { at, pattern_at, .. } => {
                vec![(*at, "already covered"), (*pattern_at, "by this pattern")]
            }
            CheckError::ApprovedAndBanned { at, banned_at, .. } => {
                vec![(*at, "matches a banned part"), (*banned_at, "banned here")]
            }
            CheckError::PartApprovedAndBanned { at, banned_at, .. } => {
                vec![(*at, "approved here"), (*banned_at, "banned here")]
            }
            CheckError::PatternTooLarge { at, .. } => vec![(*at, "too large")],
            CheckError::BadPattern { at, .. } => vec![(*at, "bad pattern")],
            CheckError::UnusedMeasurement { at, .. } | CheckError::UnusedDefine { at, .. } => {
                vec![(*at, "never used")]
            }
            CheckError::PerCylinderText { at, .. } | CheckError::TextInArithmetic { at, .. } => {
                vec![(*at, "text")]
            }
            CheckError::UnknownDimension { at, .. } => vec![(*at, "unknown dimension")],
            CheckError::RangeOnText { at, .. } => vec![(*at, "range")],
            CheckError::EmptyRange { at, .. } => vec![(*at, "low end first, then high end")],
            CheckError::DefineCycle { at, defined_at, .. } => {
                vec![(*at, "used here"), (*defined_at, "defined here")]
            }
            CheckError::UncertaintyDimension { at, .. } => vec![(*at, "uncertainty unit")],
            CheckError::BadCoverage { at } => vec![(*at, "coverage factor")],
            CheckError::CoverageOutOfRange { probability, at } => {
                vec![(
                    *at,
                    if *probability {
                        "probability"
                    } else {
                        "coverage factor"
                    },
                )]
            }
            CheckError::UnknownUnit { at, .. } => vec![(*at, "unknown unit")],
            CheckError::UnknownName { at, .. } => vec![(*at, "unknown name")],
            CheckError::BadExponent { at, .. } => vec![(*at, "exponent")],
            CheckError::UnknownFunction { at, .. } => vec![(*at, "unknown function")],
            CheckError::ArgumentDimension { at, found, .. } => {
                return vec![(*at, format!("a {found}"))];
            }
            CheckError::NeedsSingleValue { at, .. } | CheckError::PerCylinderCondition { at } => {
                vec![(*at, "one value per cylinder")]
            }
            CheckError::UnknownArgument { at, .. } => vec![(*at, "unknown parameter")],
            CheckError::LabelNotTaken { at, .. } => vec![(*at, "label")],
            CheckError::ArgumentTwice { at, .. } => vec![(*at, "second value")],
            CheckError::TooManyArguments { at, .. } => vec![(*at, "one too many")],
            CheckError::ArgumentMissing { at, .. } => vec![(*at, "incomplete call")],
            CheckError::MixedDimensions { at, .. } => vec![(*at, "mixed dimensions")],
            CheckError::BadRoot { at, .. } => vec![(*at, "square root")],
            CheckError::GenericArgumentCount { at, .. } => vec![(*at, "here")],
            CheckError::WrongDimension { at, found, .. } | CheckError::NotText { at, found } => {
                return vec![(*at, format!("a {found}"))];
            }
            CheckError::DimensionMismatch {
                left,
                right,
                left_at,
                right_at,
                ..
            } => {
                return vec![
                    (*right_at, format!("a {right}")),
                    (*left_at, format!("a {left}")),
                ];
            }
            CheckError::KindMismatch {
                left,
                right,
                left_at,
                right_at,
            } => return vec![(*right_at, right.to_string()), (*left_at, left.to_string())],
            CheckError::UnknownList { at, .. } => vec![(*at, "unknown list")],
            CheckError::TextOrder { at, .. } => vec![(*at, "text comparison")],
            CheckError::AllowanceOnEquality { at } => vec![(*at, "allowance")],
            CheckError::NegativeAllowance { at } => vec![(*at, "negative")],
            CheckError::AllowanceNotConstant { at } => vec![(*at, "not a fixed amount")],
            CheckError::UncertainLimit {
                part,
                uncertainty,
                through,
                at,
                literal,
            } => {
                let written = format!("`± {uncertainty}`");
                let (on, used) = match part {
                    LimitPart::Allowance => ("on the allowance", "used as a limit here"),
                    LimitPart::Limit | LimitPart::Equality => {
                        ("on the limit", "used as a limit here")
                    }
                    LimitPart::Condition => ("in the condition", "compared with here"),
                };
                return match through {
                    Some(_) => vec![
                        (*at, used.to_string()),
                        (*literal, format!("{written} written here")),
                    ],
                    None => vec![(*at, format!("{written} {on}"))],
                };
            }
            CheckError::NeverFails { at, .. } => vec![(*at, "always met")],
            CheckError::NeverMet { at, .. } => vec![(*at, "never met")],
            CheckError::ContradictoryLimits { at, other, .. } => {
                let mut labels = vec![(*at, "this limit")];
                labels.extend(other.map(|o| (o, "conflicts with this one")));
                labels
            }
            CheckError::NeverHolds { at, parts } => {
                std::iter::once(*at).chain(parts.iter().copied()).collect()
            }
            CheckError::FormulaTableMismatch { at, .. } => vec![(*at, "this call")],
            CheckError::Internal { at, .. } => vec![(*at, "here")],
            CheckError::DefineTooDeep { at, .. } => vec![(*at, "one derived value too many")],
            CheckError::DivisionByZero { at } => vec![(*at, "always zero")],
            CheckError::NotFinite { at } => vec![(*at, "not a finite number")],
            CheckError::TooManyRules { at, .. } => vec![(*at, "past the limit")],
        };
        fixed
            .into_iter()
            .map(|(span, label)| (span, label.to_string()))
            .collect()
    }

    /// How to fix it.
    pub fn help(&self) -> String {
        let fixed = match self {
            CheckError::HeaderInInclude { .. } => {
                "move `series`, `edition` and `decision` to the main rulebook file"
            }
            CheckError::DuplicateHeader { line, .. } => {
                return format!("keep one `{}` line", line.keyword());
            }
            CheckError::MissingHeader { line, .. } => {
                return format!(
                    "add a line like `{}` at the top of the file",
                    line.example()
                );
            }
            CheckError::DuplicateValueName { .. } => {
                "measurements and derived values share one set of names; rename or remove one"
            }
            CheckError::DuplicateDefinition { kind, .. } => {
                return format!(
                    "rename or remove one of the two {} definitions",
                    kind.words()
                );
            }
            CheckError::DuplicateBulletin { .. } => {
                "give each bulletin its own identifier, or merge the two"
            }
            CheckError::UnknownClass { suggestion, .. } => match suggestion {
                Some(near) => return did_you_mean(near),
                None => "name a class defined in this rulebook",
            },
            CheckError::BulletinBeforeEdition { .. } => {
                "a bulletin amends an edition already in force; correct the date"
            }
            CheckError::EmptyBulletin { .. } => "add the rules it changes, or remove it",
            CheckError::ExtendsCycle { .. } => {
                "one class of the loop must stand on its own; remove its `extends`"
            }
            CheckError::ExtendsTooLong { .. } => {
                "let this class extend one nearer the root, and repeat here the rules it needs"
            }
            CheckError::TooManyPatterns { .. } => {
                "list part numbers as exact entries in quotes, or join related patterns into one like `/^TV-(12|13)[0-9]{2}$/`"
            }
            CheckError::OverrideChangesNothing { .. } => {
                "remove the override, or write the change it was meant to make"
            }
            CheckError::NothingToOverride { .. } => {
                "remove `override` to add a new rule, or check the section number"
            }
            CheckError::DuplicateSection { .. } => "give each rule its own section number",
            CheckError::SectionClash { section, .. } => {
                return format!(
                    "write `override rule {section}` to replace it, or use a new section number"
                );
            }
            CheckError::ConditionalDrop { .. } => {
                "to make a rule conditional, `override` it with a `when` line instead"
            }
            CheckError::NothingToDrop { .. } => {
                "check the section number against the class it extends"
            }
            CheckError::DuplicateEntry { .. } => "remove the second entry",
            CheckError::EntryCoveredByPattern { .. } => {
                "remove the entry, or narrow the pattern if the entry is the only part meant"
            }
            CheckError::ApprovedAndBanned { .. } => {
                "narrow the pattern so it leaves out the banned part"
            }
            CheckError::PartApprovedAndBanned { .. } => {
                "a part is either approved or banned: remove it from one of the two lists"
            }
            CheckError::PatternTooLarge { .. } => {
                "a casting-number family is a short pattern; list long families as several smaller patterns"
            }
            CheckError::BadPattern { .. } => {
                "check the brackets and escapes; write `\\/` for a slash"
            }
            CheckError::UnusedMeasurement { .. } => {
                "remove it from the schema, or write the rule that needs it"
            }
            CheckError::UnusedDefine { .. } => "remove the definition, or use it in a rule",
            CheckError::PerCylinderText { .. } => {
                "remove `per cylinder`, or declare one text measurement per part"
            }
            CheckError::UnknownDimension { suggestion, .. } => match suggestion {
                Some(near) => return did_you_mean(near),
                None => {
                    "use one of length, area, volume, mass, time, force, pressure, airflow, angle, \
                     speed, power, count, ratio, number or text"
                }
            },
            CheckError::RangeOnText { .. } => {
                "remove the range, or give the measurement a numeric dimension"
            }
            CheckError::EmptyRange { .. } => {
                "write the range low to high, like `range 3.9 in to 4.2 in`"
            }
            CheckError::DefineCycle { .. } => {
                "a derived value cannot depend on itself, directly or through others; break the loop"
            }
            CheckError::UncertaintyDimension { .. } => {
                "write the uncertainty in a unit of the same dimension as the value"
            }
            CheckError::BadCoverage { .. } => "write `(k = 2)` for about 95 % coverage",
            CheckError::CoverageOutOfRange { .. } => {
                "write `coverage k = 2` for a fixed factor, or `coverage 95 %` for k from the t-distribution"
            }
            CheckError::UnknownUnit { suggestion, .. } => match suggestion {
                Some(near) => {
                    return format!(
                        "did you mean `{near}`? `gonogo units` lists every unit gonogo knows"
                    );
                }
                None => {
                    "use a unit gonogo knows, such as `in`, `mm`, `ci` or `lb`: `gonogo units` lists \
                     them all"
                }
            },
            CheckError::UnknownName {
                name, suggestion, ..
            } => {
                return match suggestion {
                    Some(near) => did_you_mean(near),
                    None => {
                        format!("declare it with `measure {name}: ...` or `define {name} = ...`")
                    }
                };
            }
            CheckError::BadExponent { .. } => {
                "write the exponent as a plain whole number, like `bore^2`; use `sqrt(...)` for roots"
            }
            CheckError::UnknownFunction { suggestion, .. } => match suggestion {
                Some(near) => return did_you_mean(near),
                None => "the built-in functions are listed in grammar/rulebook.ebnf",
            },
            CheckError::ArgumentDimension { expected, .. } => {
                return format!("pass a {expected} here");
            }
            CheckError::NeedsSingleValue { .. } => {
                "reduce it to one value with `max(...)`, `min(...)` or `mean(...)`"
            }
            CheckError::UnknownArgument {
                function,
                signature,
                suggestion,
                ..
            } => {
                return match suggestion {
                    Some(near) => did_you_mean(near),
                    None => format!("`{function}` takes {signature}"),
                };
            }
            CheckError::LabelNotTaken { function, .. } => {
                return format!("write `{function}(value)` without a label");
            }
            CheckError::ArgumentTwice {
                function,
                signature,
                ..
            }
            | CheckError::TooManyArguments {
                function,
                signature,
                ..
            }
            | CheckError::ArgumentMissing {
                function,
                signature,
                ..
            } => return format!("`{function}` takes {signature}"),
            CheckError::MixedDimensions { .. } => "compare like with like, converting where needed",
            CheckError::BadRoot { .. } => {
                "take the square root of an area or a dimensionless ratio"
            }
            CheckError::GenericArgumentCount { function, .. } => {
                return format!(
                    "write `{function}(bore)` with a per-cylinder measurement, for example"
                );
            }
            CheckError::TextInArithmetic { .. } => {
                "only numbers take part in arithmetic; compare text with `==`, `in` or `matches`"
            }
            CheckError::WrongDimension { expected, .. } => return unit_hint(*expected),
            CheckError::DimensionMismatch {
                bare_number_beside, ..
            } => match bare_number_beside {
                Some(d) => return format!("the number has no unit: {}", unit_hint(*d)),
                None => {
                    "both sides must have the same dimension; check the units and the quantities compared"
                }
            },
            CheckError::KindMismatch { .. } => {
                "text is compared with text in quotes, numbers with numbers"
            }
            CheckError::UnknownList {
                name, suggestion, ..
            } => {
                return match suggestion {
                    Some(near) => did_you_mean(near),
                    None => format!("define it with `approved list {name} ... end`"),
                };
            }
            CheckError::NotText { .. } => {
                "test a part or casting number, a measurement declared as `text`"
            }
            CheckError::TextOrder { .. } => {
                "compare text with `==` or `!=`, or test it with `in` or `matches`"
            }
            CheckError::PerCylinderCondition { .. } => {
                "reduce it with `max(...)`, `min(...)` or `mean(...)`"
            }
            CheckError::AllowanceOnEquality { .. } => {
                "use `<=`, `>=` or `between` with the allowance, or drop it"
            }
            CheckError::NegativeAllowance { .. } => {
                "an allowance loosens the limit; to tighten it, change the limit itself"
            }
            CheckError::AllowanceNotConstant { .. } => {
                "write the allowance as a number with a unit, like `allowing 0.005 in`"
            }
            CheckError::UncertainLimit {
                part, uncertainty, ..
            } => {
                return match part {
                    LimitPart::Limit => format!(
                        "a limit is exact (ISO 14253-1); for a tolerance on it write \
                         `allowing {uncertainty}`, and give the measured value its uncertainty \
                         in the declaration"
                    ),
                    LimitPart::Equality => "a limit is exact (ISO 14253-1); for a tolerance \
                         around the value write the range with `between`, and give the measured \
                         value its uncertainty in the declaration"
                        .to_string(),
                    LimitPart::Allowance => {
                        "an allowance is an exact amount: write it without `±`".to_string()
                    }
                    LimitPart::Condition => format!(
                        "the value a condition compares with is exact: remove `± {uncertainty}`; \
                         the value tested keeps its own uncertainty (from the declaration, or a \
                         `±` in the rulebook's `define`), and a condition within it is reported \
                         as uncertain"
                    ),
                };
            }
            CheckError::NeverFails { .. } => {
                "tighten the limit, or widen the `range` of the measurements it reads if real engines go further"
            }
            CheckError::NeverMet { .. } => {
                "check the limit and its unit against the `range` of the measurements it reads"
            }
            CheckError::ContradictoryLimits { .. } => {
                "no engine can pass both; correct one limit, or make one rule conditional with `when`"
            }
            CheckError::NeverHolds { .. } => {
                "the rules under it would never apply; correct the condition or remove the rules"
            }
            CheckError::FormulaTableMismatch { .. } => {
                "this is a mistake in gonogo's formula table, not in the rulebook; please report it"
            }
            CheckError::Internal { .. } => {
                "this is a mistake in gonogo, not in the rulebook; please report it"
            }
            CheckError::DefineTooDeep { .. } => {
                "write this value from measurements or from values nearer them, not through every step"
            }
            CheckError::DivisionByZero { .. } => {
                "correct the divisor: no value can come of dividing by zero"
            }
            CheckError::NotFinite { .. } => {
                "correct the numbers or their units so that the result is a number a measurement can be compared with"
            }
            CheckError::TooManyRules {
                inherited: true, ..
            } => {
                "a class holds a copy of every rule it inherits: let fewer classes extend a large one, or keep one rulebook per group of classes"
            }
            CheckError::TooManyRules { .. } => {
                "a series needs a few hundred rules a class; keep one rulebook per group of classes"
            }
        };
        fixed.to_string()
    }
}

/// The help line for a near name.
fn did_you_mean(near: &str) -> String {
    format!("did you mean `{near}`?")
}

/// How to write a value of dimension `d`, with the unit reports show it in.
fn unit_hint(d: Dimension) -> String {
    match units::display_unit(d) {
        Some(u) => format!("write a {d} with its unit, like `1 {}`", u.symbol),
        None => format!("write a {d}"),
    }
}

impl From<CheckError> for Problem {
    fn from(e: CheckError) -> Problem {
        Problem {
            code: e.code(),
            level: e.level(),
            message: shortened(e.message()),
            labels: e
                .labels()
                .into_iter()
                .map(|(span, label)| (span, shortened(label)))
                .collect(),
            help: Some(shortened(e.help())),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_problem_takes_its_code_level_labels_and_help_from_the_error() {
        let (at, first) = (Span::new(0, 40, 45), Span::new(0, 10, 15));
        let p: Problem = CheckError::DuplicateDefinition {
            kind: Definition::Class,
            name: "hobby".to_string(),
            at,
            first,
        }
        .into();
        assert_eq!(p.level, Level::Error);
        assert_eq!(p.message, "class `hobby` is defined twice");
        assert_eq!(
            p.labels,
            vec![
                (at, "defined again here".to_string()),
                (first, "first defined here".to_string())
            ]
        );
        assert_eq!(
            p.help.as_deref(),
            Some("rename or remove one of the two class definitions")
        );
    }

    #[test]
    fn an_unknown_class_suggests_a_near_name_when_there_is_one() {
        let unknown = |suggestion: Option<&str>| CheckError::UnknownClass {
            name: "hoby".to_string(),
            from: ClassReference::Extends("pro".to_string()),
            suggestion: suggestion.map(str::to_string),
            at: Span::default(),
        };
        assert_eq!(unknown(Some("hobby")).help(), "did you mean `hobby`?");
        assert_eq!(
            unknown(None).help(),
            "name a class defined in this rulebook"
        );
    }

    #[test]
    fn a_bare_number_compared_with_a_volume_gets_the_unit_hint() {
        // the texts of tests/malformed/limit-without-unit.rules, as the checker writes them
        let volume = crate::units::lookup("ci")
            .map(|u| u.dimension)
            .unwrap_or_default();
        let (left_at, right_at) = (Span::new(0, 10, 50), Span::new(0, 54, 57));
        let p: Problem = CheckError::DimensionMismatch {
            joined_by: Joined::Compare,
            left: volume,
            right: Dimension::NONE,
            left_at,
            right_at,
            bare_number_beside: Some(volume),
        }
        .into();
        assert_eq!(p.message, "cannot compare a volume with a plain number");
        assert_eq!(
            p.labels,
            vec![
                (right_at, "a plain number".to_string()),
                (left_at, "a volume".to_string())
            ]
        );
        assert_eq!(
            p.help.as_deref(),
            Some("the number has no unit: write a volume with its unit, like `1 ci`")
        );
    }

    #[test]
    fn an_unknown_unit_without_a_near_one_lists_some() {
        let e = CheckError::UnknownUnit {
            symbol: "furlong".to_string(),
            suggestion: None,
            at: Span::default(),
        };
        assert_eq!(
            e.help(),
            "use a unit gonogo knows, such as `in`, `mm`, `ci` or `lb`: `gonogo units` lists them all"
        );
    }

    #[test]
    fn a_formula_table_mismatch_blames_gonogo_not_the_rulebook() {
        let at = Span::new(0, 20, 48);
        let p: Problem = CheckError::FormulaTableMismatch {
            function: "displacement".to_string(),
            params: 3,
            arity: 2,
            at,
        }
        .into();
        assert_eq!(p.level, Level::Error);
        assert_eq!(
            p.message,
            "the built-in `displacement` has 3 parameters, but its implementation takes 2"
        );
        assert_eq!(p.labels, vec![(at, "this call".to_string())]);
        assert_eq!(
            p.help.as_deref(),
            Some(
                "this is a mistake in gonogo's formula table, not in the rulebook; please report it"
            )
        );
        assert_eq!(
            p.code,
            CheckError::Internal {
                what: String::new(),
                at
            }
            .code()
        );
    }

    #[test]
    fn unused_names_are_warnings() {
        let unused = CheckError::UnusedDefine {
            name: "spare".to_string(),
            at: Span::default(),
        };
        assert_eq!(unused.level(), Level::Warning);
    }
}
