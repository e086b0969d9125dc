//! What can be wrong with a declaration, as data: each variant holds the facts (the key, the
//! unit written, the dimension expected …), and its code, message, label and help are derived
//! from them here and nowhere else. [`LoadProblem`] adds where it is and becomes a
//! [`Problem`] for miette.

use crate::diagnostic::codes;
use std::path::PathBuf;

use super::path::DeclPath;
use crate::diagnostic::{Problem, first_few};
use crate::parse::QuantityFault;
use crate::parse::ast::Date;
use crate::report::format::count as count_of;
use crate::source::Span;
use crate::suggest::UnknownClass;
use crate::units::Dimension;

/// What kind of mapping a key was found in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum KeyKind {
    /// The top of the declaration.
    Declaration,
    /// `measurements:` or a component's mapping.
    Measurement,
    /// `components:`.
    Component,
    /// A measurement's `value`, `values`, `instrument`.
    Value,
    /// An instrument's `resolution`, `uncertainty`, `k`.
    Instrument,
    /// `inspection:`, its `seals:` and `reason: {other: …}`.
    Inspection,
    /// One seal's `number` and `at`.
    Seal,
    /// One gauge result's `plug` or `ring`, `size` and `result`.
    Gauge,
}

impl KeyKind {
    /// How a message names a key of this mapping, with its article.
    pub fn words(self) -> &'static str {
        match self {
            KeyKind::Declaration => "a declaration key",
            KeyKind::Measurement => "a measurement",
            KeyKind::Component => "a component",
            KeyKind::Value => "a value key",
            KeyKind::Instrument => "an instrument key",
            KeyKind::Inspection => "an inspection key",
            KeyKind::Seal => "a seal key",
            KeyKind::Gauge => "a gauge key",
        }
    }
}

/// A YAML feature a declaration may not use, because its meaning would be hidden from the
/// reader of the declaration (or from gonogo).
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum YamlFeature {
    /// A merge key `<<:`.
    MergeKey,
    /// A tag such as `!foo`.
    Tag {
        /// The tag as written.
        tag: String,
    },
}

/// What was given twice.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Twice {
    /// A key of a fixed mapping.
    Key,
    /// A measurement, perhaps once under `measurements` and once under its component.
    Measurement,
    /// An instrument of `instruments:`.
    Instrument,
}

/// Where a coverage factor was written.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum CoverageAt {
    /// In a value, `(k = 2)`.
    Literal,
    /// As an instrument's `k:`.
    Key,
}

/// What is wrong with an entry of `inspection.scope`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum ScopeFault {
    /// Text that is not a section number like `6.2`.
    NotASection {
        /// As written.
        written: String,
    },
    /// A YAML decimal number, whose trailing zeros YAML has already lost (`6.10` is `6.1`).
    Decimal {
        /// As YAML read it.
        read: String,
    },
    /// An empty list: a scope that inspects nothing.
    Empty,
    /// A section listed twice.
    Twice {
        /// The section.
        section: String,
    },
}

/// What is wrong with a seal of `inspection.seals`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum SealFault {
    /// A seal without its number.
    NoNumber,
    /// A seal number listed twice in the same list.
    Twice {
        /// The number.
        number: String,
    },
}

/// What is wrong with a gauge result of a measurement's `gauges:`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum GaugeFault {
    /// Neither `plug` nor `ring`, or one without the gauge's tag.
    NoKind,
    /// Both `plug` and `ring` in one result.
    TwoKinds,
    /// No `size`.
    NoSize,
    /// A size without its `± U`: a gauge's size is known only to its calibration.
    NoUncertainty,
    /// No `result`.
    NoResult {
        /// The gauge's kind.
        kind: super::gauge::GaugeKind,
    },
    /// A result that is not one of the kind's two.
    UnknownResult {
        /// As written.
        written: String,
        /// The gauge's kind.
        kind: super::gauge::GaugeKind,
    },
    /// An empty list of results.
    Empty,
    /// Plug and ring results on one measurement: a feature is a hole or a shaft.
    MixedKinds,
}

/// One thing wrong with a declaration.
#[derive(Clone, Debug, PartialEq)]
pub enum LoadError {
    /// A key that this mapping does not have.
    UnknownKey {
        /// The key as written.
        key: String,
        /// The mapping it is in.
        kind: KeyKind,
        /// The allowed key nearest to it.
        suggestion: Option<String>,
        /// Every allowed key.
        allowed: Vec<String>,
    },
    /// A YAML feature declarations do not use: a merge key or a tag.
    Unsupported(YamlFeature),
    /// A key given twice.
    DuplicateKey {
        /// The name, in full.
        name: String,
        /// What it is.
        what: Twice,
    },
    /// A class the rulebook does not have.
    UnknownClass(UnknownClass),
    /// A declaration that names no class, with no `--class` either.
    NoClass {
        /// The declaration.
        file: PathBuf,
    },
    /// A declaration dated before the edition took effect.
    BeforeEdition {
        /// The declaration.
        file: PathBuf,
        /// Its date.
        date: Date,
        /// The edition's name.
        edition: String,
        /// The edition's effective date.
        effective: Date,
    },
    /// A date that is not a calendar date.
    BadDate {
        /// As written.
        written: String,
    },
    /// Text that is not a quantity.
    BadQuantity {
        /// What is wrong with the text.
        fault: QuantityFault,
        /// An example of a good one, in backticks.
        example: String,
    },
    /// A coverage factor of zero or less.
    BadCoverage(CoverageAt),
    /// A number without its unit for a measurement that has a dimension.
    MissingUnit {
        /// The measurement.
        measurement: String,
        /// Its dimension.
        dimension: Dimension,
        /// An example in its display unit.
        example: String,
        /// A bare YAML number rather than a string.
        bare: bool,
    },
    /// A unit of another dimension than the measurement's.
    WrongUnit {
        /// The measurement.
        measurement: String,
        /// Its dimension.
        wants: Dimension,
        /// The unit written.
        unit: String,
        /// That unit's dimension.
        found: Dimension,
        /// An example in the measurement's display unit.
        example: String,
    },
    /// A unit gonogo does not know.
    UnknownUnit {
        /// The symbol written.
        symbol: String,
        /// The known unit nearest to it.
        suggestion: Option<&'static str>,
    },
    /// An infinite or not-a-number value.
    NotFinite,
    /// A fraction where the rulebook counts (`cylinders: 7.5`).
    NotWhole {
        /// The measurement.
        measurement: String,
        /// The value written.
        value: f64,
    },
    /// A negative value where the rulebook allows none.
    Negative {
        /// The measurement.
        measurement: String,
    },
    /// A value outside the range the rulebook declares.
    OutOfRange {
        /// The measurement.
        measurement: String,
        /// The range, in display units.
        expected: String,
    },
    /// An instrument's resolution or uncertainty of zero or less.
    NotPositive,
    /// An instrument with neither resolution nor uncertainty.
    InstrumentEmpty,
    /// An instrument whose resolution and uncertainty are of different dimensions.
    InstrumentMixed,
    /// An instrument used for a measurement of another dimension.
    InstrumentWrongDimension {
        /// The instrument.
        instrument: String,
        /// What it measures.
        measures: Dimension,
        /// The measurement.
        measurement: String,
        /// What that is.
        wants: Dimension,
    },
    /// An instrument the declaration does not list.
    UnknownInstrument {
        /// The name as written.
        name: String,
        /// The listed instrument nearest to it.
        suggestion: Option<String>,
    },
    /// One value for a per-cylinder measurement.
    NeedsList {
        /// The measurement.
        measurement: String,
    },
    /// A list for a measurement that has one value.
    NotAList {
        /// The measurement.
        measurement: String,
        /// The measurement is text.
        text: bool,
    },
    /// An empty per-cylinder list.
    EmptyList,
    /// More measured values than gonogo can number.
    TooManyValues,
    /// A per-cylinder list whose length disagrees with the cylinder count.
    CylinderCount {
        /// How many this list gives.
        count: usize,
        /// How many the earlier one gives.
        earlier: usize,
        /// Where the earlier count was given.
        from: String,
    },
    /// A `±` and an instrument for the same value.
    TwoUncertainties,
    /// Two of `value`, `values` and `readings`.
    ValueAndValues {
        /// The one written first in the order `value`, `values`, `readings`.
        first: &'static str,
        /// The other.
        second: &'static str,
    },
    /// Repeated readings of one quantity that are fewer than two: a Type A standard
    /// deviation needs at least two (GUM 4.2.2).
    TooFewReadings {
        /// How many were given.
        count: usize,
    },
    /// A repeated reading with its own `±`: their spread is their uncertainty.
    StatedInReadings,
    /// Not YAML, or not the shape a declaration has there.
    Yaml {
        /// serde_yaml's words, without its location.
        message: String,
    },
    /// Reading stopped after this many problems.
    TooMany {
        /// How many were reported.
        shown: usize,
    },
    /// Repeated readings that are all the same, with no instrument named: their spread is
    /// zero, which says nothing of the resolution (GUM JCGM 100:2008, F.2.2.1), and would be
    /// taken as an uncertainty of zero.
    IdenticalReadings {
        /// How many readings there are.
        count: usize,
    },
    /// Flow collections (`[ … ]`, `{ … }`) nested deeper than the cap, found before the
    /// YAML parser reads the file.
    TooDeep {
        /// The deepest nesting allowed.
        limit: usize,
    },
    /// An inspection reason gonogo does not know.
    UnknownReason {
        /// As written.
        written: String,
        /// The known reason nearest to it.
        suggestion: Option<&'static str>,
    },
    /// A protest or a claim without its reference.
    NoReference {
        /// `protest` or `claim`.
        reason: &'static str,
    },
    /// A bad entry of `inspection.scope`.
    BadScope(ScopeFault),
    /// A bad seal.
    BadSeal(SealFault),
    /// A bad gauge result.
    BadGauge(GaugeFault),
    /// Gauge results beside a measured value (`value`, `values`, `readings`, `instrument`).
    GaugedAndMeasured {
        /// The measured form written beside `gauges`.
        beside: &'static str,
    },
    /// Gauge results for a measurement that cannot be gauged.
    CannotGauge {
        /// The measurement.
        measurement: String,
        /// True when it is text, false when it is measured on every cylinder.
        text: bool,
    },
    /// Two gauge results that no single size gives together.
    GaugesDisagree {
        /// The result bounding from below, in words (`plug TV-G-0412 1.6875 in entered`).
        low: String,
        /// The result bounding from above.
        high: String,
    },
}

impl LoadError {
    /// The stable code.
    pub fn code(&self) -> codes::Code {
        match self {
            LoadError::UnknownKey { .. } => codes::load::UNKNOWN_KEY,
            LoadError::Unsupported(_) => codes::load::YAML_UNSUPPORTED,
            LoadError::DuplicateKey { .. } => codes::load::DUPLICATE_KEY,
            LoadError::UnknownClass(e) => e.code(),
            LoadError::NoClass { .. } => codes::load::NO_CLASS,
            LoadError::BeforeEdition { .. } => codes::check::BEFORE_EDITION,
            LoadError::BadDate { .. } => codes::load::BAD_DATE,
            LoadError::BadQuantity { .. } => codes::load::BAD_QUANTITY,
            LoadError::BadCoverage(_) => codes::load::BAD_COVERAGE,
            LoadError::MissingUnit { .. } => codes::load::MISSING_UNIT,
            LoadError::WrongUnit { .. }
            | LoadError::InstrumentMixed
            | LoadError::InstrumentWrongDimension { .. } => codes::load::WRONG_DIMENSION,
            LoadError::UnknownUnit { .. } => codes::load::UNKNOWN_UNIT,
            LoadError::NotFinite => codes::load::NOT_FINITE,
            LoadError::NotWhole { .. } => codes::load::NOT_WHOLE,
            LoadError::Negative { .. } => codes::load::NEGATIVE,
            LoadError::OutOfRange { .. } => codes::load::OUT_OF_RANGE,
            LoadError::NotPositive => codes::load::NOT_POSITIVE,
            LoadError::InstrumentEmpty => codes::load::INSTRUMENT_EMPTY,
            LoadError::UnknownInstrument { .. } => codes::load::UNKNOWN_INSTRUMENT,
            LoadError::NeedsList { .. } => codes::load::NEEDS_LIST,
            LoadError::NotAList { .. } => codes::load::NOT_A_LIST,
            LoadError::EmptyList => codes::load::EMPTY_LIST,
            LoadError::TooManyValues => codes::load::TOO_MANY_VALUES,
            LoadError::CylinderCount { .. } => codes::load::CYLINDER_COUNT,
            LoadError::TwoUncertainties => codes::load::TWO_UNCERTAINTIES,
            LoadError::ValueAndValues { .. } => codes::load::VALUE_AND_VALUES,
            LoadError::TooFewReadings { .. } => codes::load::TOO_FEW_READINGS,
            LoadError::StatedInReadings => codes::load::STATED_IN_READINGS,
            LoadError::Yaml { .. } => codes::load::YAML,
            LoadError::TooMany { .. } => codes::load::TOO_MANY,
            LoadError::IdenticalReadings { .. } => codes::load::IDENTICAL_READINGS,
            LoadError::TooDeep { .. } => codes::load::TOO_DEEP,
            LoadError::UnknownReason { .. } => codes::load::UNKNOWN_REASON,
            LoadError::NoReference { .. } => codes::load::NO_REFERENCE,
            LoadError::BadScope(_) => codes::load::BAD_SCOPE,
            LoadError::BadSeal(_) => codes::load::BAD_SEAL,
            LoadError::BadGauge(_) => codes::load::BAD_GAUGE,
            LoadError::GaugedAndMeasured { .. } => codes::load::GAUGED_AND_MEASURED,
            LoadError::CannotGauge { .. } => codes::load::CANNOT_GAUGE,
            LoadError::GaugesDisagree { .. } => codes::load::GAUGES_DISAGREE,
        }
    }

    /// What is wrong, without where.
    pub fn message(&self) -> String {
        match self {
            LoadError::UnknownKey { key, kind, .. } => {
                format!("`{key}` is not {} gonogo knows here", kind.words())
            }
            LoadError::Unsupported(YamlFeature::MergeKey) => {
                "merge keys (`<<`) are not supported in a declaration".to_string()
            }
            LoadError::Unsupported(YamlFeature::Tag { tag }) => {
                format!("YAML tags like `{tag}` are not supported in a declaration")
            }
            LoadError::DuplicateKey { name, what } => match what {
                Twice::Instrument => format!("instrument `{name}` is given twice"),
                Twice::Key | Twice::Measurement => format!("`{name}` is given twice"),
            },
            LoadError::UnknownClass(e) => e.message(),
            LoadError::NoClass { file } => format!("`{}` names no class", file.display()),
            LoadError::BeforeEdition {
                file,
                date,
                edition,
                effective,
            } => format!(
                "`{}` is dated {date}, before edition {edition} took effect on {effective}",
                file.display()
            ),
            LoadError::BadDate { written } => format!("`{written}` is not a calendar date"),
            LoadError::BadQuantity { fault, .. } => fault.message(),
            LoadError::BadCoverage(_) => "the coverage factor must be above zero".to_string(),
            LoadError::MissingUnit {
                measurement,
                dimension,
                bare,
                ..
            } => {
                let what = if *bare { "number" } else { "value" };
                format!("`{measurement}` is a {dimension}, and this {what} has no unit")
            }
            LoadError::WrongUnit {
                measurement,
                wants,
                unit,
                found,
                ..
            } => format!("`{measurement}` is a {wants}, but `{unit}` is a unit of {found}"),
            LoadError::UnknownUnit { symbol, .. } => {
                format!("`{symbol}` is not a unit gonogo knows")
            }
            LoadError::NotFinite => "this value is not a finite number".to_string(),
            LoadError::NotWhole { measurement, value } => {
                format!("`{measurement}` is a count, and {value} is not a whole number")
            }
            LoadError::Negative { measurement } => format!("`{measurement}` cannot be negative"),
            LoadError::OutOfRange { measurement, .. } => {
                format!("this value is outside the range the rulebook declares for `{measurement}`")
            }
            LoadError::NotPositive => "a resolution or uncertainty must be above zero".to_string(),
            LoadError::InstrumentEmpty => {
                "this instrument has neither a resolution nor an uncertainty".to_string()
            }
            LoadError::InstrumentMixed => {
                "the resolution and the uncertainty are of different dimensions".to_string()
            }
            LoadError::InstrumentWrongDimension {
                instrument,
                measures,
                measurement,
                wants,
            } => format!(
                "instrument `{instrument}` measures a {measures}, but `{measurement}` is a {wants}"
            ),
            LoadError::UnknownInstrument { name, .. } => {
                format!("`{name}` is not an instrument of this declaration")
            }
            LoadError::NeedsList { measurement } => format!(
                "`{measurement}` is measured on every cylinder: give a list, cylinder 1 first"
            ),
            LoadError::NotAList { measurement, text } => {
                if *text {
                    format!("`{measurement}` is text, not a list")
                } else {
                    format!("`{measurement}` is one value for the engine, not a list")
                }
            }
            LoadError::EmptyList => "this list has no values".to_string(),
            LoadError::TooManyValues => {
                "the declaration gives more measured values than gonogo can number".to_string()
            }
            LoadError::CylinderCount {
                count,
                earlier,
                from,
            } => format!(
                "this gives {}, but `{from}` gives {earlier}",
                count_of(*count, "cylinder", "cylinders")
            ),
            LoadError::TwoUncertainties => {
                "this value has its own `±` and also names an instrument".to_string()
            }
            LoadError::ValueAndValues { first, second } => {
                format!("give `{first}` or `{second}`, not both")
            }
            LoadError::TooFewReadings { count } => format!(
                "repeated readings need at least two, and {}",
                match count {
                    0 => "this list has none".to_string(),
                    _ => "this list has one".to_string(),
                }
            ),
            LoadError::StatedInReadings => {
                "a repeated reading has its own `±`, but their spread is their uncertainty"
                    .to_string()
            }
            LoadError::Yaml { message } => message.clone(),
            LoadError::TooMany { shown } => {
                format!(
                    "reading stopped after {}",
                    count_of(*shown, "problem", "problems")
                )
            }
            LoadError::IdenticalReadings { count } => format!(
                "these {count} readings are all the same and name no instrument: a spread of \
                 zero says nothing of the resolution (GUM F.2.2.1), and would give an \
                 uncertainty of zero"
            ),
            LoadError::TooDeep { limit } => {
                format!("brackets are nested more than {limit} deep")
            }
            LoadError::UnknownReason { written, .. } => {
                format!("`{written}` is not a reason for an inspection gonogo knows")
            }
            LoadError::NoReference { reason } => {
                format!("a {reason} needs its `reference`")
            }
            LoadError::BadScope(fault) => match fault {
                ScopeFault::NotASection { written } => {
                    format!("`{written}` is not a section number")
                }
                ScopeFault::Decimal { read } => {
                    format!("this section is a YAML number, which YAML reads as {read}")
                }
                ScopeFault::Empty => "the scope lists no section".to_string(),
                ScopeFault::Twice { section } => format!("section {section} is listed twice"),
            },
            LoadError::BadSeal(SealFault::NoNumber) => "this seal has no number".to_string(),
            LoadError::BadSeal(SealFault::Twice { number }) => {
                format!("seal `{number}` is listed twice")
            }
            LoadError::BadGauge(fault) => gauge_message(fault),
            LoadError::GaugedAndMeasured { beside } => {
                format!("this measurement gives both gauge results and `{beside}`")
            }
            LoadError::CannotGauge { measurement, text } => {
                if *text {
                    format!("`{measurement}` is text, which a gauge does not measure")
                } else {
                    format!(
                        "`{measurement}` is measured on every cylinder, and gauge results are \
                         read for one value of the engine"
                    )
                }
            }
            LoadError::GaugesDisagree { low, high } => {
                format!(
                    "no size gives both results, even with the gauges' uncertainties counted: \
                     {low}, but {high}"
                )
            }
        }
    }

    /// The short label under the offending text.
    pub fn label(&self) -> String {
        match self {
            LoadError::UnknownKey { .. } => "unknown key".to_string(),
            LoadError::Unsupported(YamlFeature::MergeKey) => "merge key".to_string(),
            LoadError::Unsupported(YamlFeature::Tag { .. }) => "tag".to_string(),
            LoadError::DuplicateKey { .. } => "given again here".to_string(),
            LoadError::UnknownClass(_) => "unknown class".to_string(),
            LoadError::BadDate { .. } => "not a date".to_string(),
            LoadError::BadQuantity { fault, .. } => fault.label().to_string(),
            LoadError::BadCoverage(_) => "coverage factor".to_string(),
            LoadError::MissingUnit { .. } => "no unit".to_string(),
            LoadError::WrongUnit { found, .. } => format!("a {found}"),
            LoadError::UnknownUnit { .. } => "unknown unit".to_string(),
            LoadError::NotFinite => "not finite".to_string(),
            LoadError::NotWhole { .. } => "not a whole number".to_string(),
            LoadError::Negative { .. } => "negative".to_string(),
            LoadError::OutOfRange { .. } => "out of range".to_string(),
            LoadError::NotPositive => "not above zero".to_string(),
            LoadError::InstrumentEmpty => "no resolution or uncertainty".to_string(),
            LoadError::InstrumentMixed => "two dimensions".to_string(),
            LoadError::InstrumentWrongDimension { measures, .. } => {
                format!("measures a {measures}")
            }
            LoadError::UnknownInstrument { .. } => "unknown instrument".to_string(),
            LoadError::NeedsList { .. } => "one value".to_string(),
            LoadError::NotAList { .. } => "a list".to_string(),
            LoadError::EmptyList => "empty".to_string(),
            LoadError::TooManyValues => "one value too many".to_string(),
            LoadError::CylinderCount { count, .. } => count_of(*count, "cylinder", "cylinders"),
            LoadError::TwoUncertainties | LoadError::ValueAndValues { .. } => "here".to_string(),
            LoadError::TooFewReadings { .. } => "fewer than two readings".to_string(),
            LoadError::StatedInReadings => "its own uncertainty".to_string(),
            LoadError::Yaml { .. }
            | LoadError::NoClass { .. }
            | LoadError::BeforeEdition { .. }
            | LoadError::TooMany { .. } => "here".to_string(),
            LoadError::IdenticalReadings { .. } => "no spread".to_string(),
            LoadError::TooDeep { limit } => format!("level {}", limit + 1),
            LoadError::UnknownReason { .. } => "unknown reason".to_string(),
            LoadError::NoReference { .. } => "no reference".to_string(),
            LoadError::BadScope(ScopeFault::Twice { .. }) => "listed again here".to_string(),
            LoadError::BadScope(ScopeFault::Empty) => "empty".to_string(),
            LoadError::BadScope(_) => "not a section".to_string(),
            LoadError::BadSeal(SealFault::NoNumber) => "no number".to_string(),
            LoadError::BadSeal(SealFault::Twice { .. }) => "listed again here".to_string(),
            LoadError::BadGauge(fault) => gauge_label(fault).to_string(),
            LoadError::GaugedAndMeasured { .. } => "here".to_string(),
            LoadError::CannotGauge { .. } => "gauge results".to_string(),
            LoadError::GaugesDisagree { .. } => "these results".to_string(),
        }
    }

    /// How to fix it.
    pub fn help(&self) -> String {
        match self {
            LoadError::UnknownKey {
                suggestion,
                allowed,
                ..
            } => match suggestion {
                Some(near) => format!("did you mean `{near}`?"),
                None => format!("the keys allowed here are {}", backticked(allowed)),
            },
            LoadError::DuplicateKey { what, .. } => match what {
                Twice::Measurement => {
                    "give it once, under `measurements` or under its component".to_string()
                }
                Twice::Key | Twice::Instrument => "keep one of the two entries".to_string(),
            },
            LoadError::Unsupported(YamlFeature::MergeKey) => {
                "write out each key the merge would bring in".to_string()
            }
            LoadError::Unsupported(YamlFeature::Tag { .. }) => {
                "remove the tag; write the value as plain text or a number".to_string()
            }
            LoadError::UnknownClass(e) => e.help(),
            LoadError::NoClass { .. } => {
                "add `class: NAME` to the declaration, or pass `--class NAME`".to_string()
            }
            LoadError::BeforeEdition { .. } => {
                "check the date, or check the engine against the rulebook in force on that date"
                    .to_string()
            }
            LoadError::BadDate { .. } => {
                "write the date as year-month-day, like `2027-07-19`".to_string()
            }
            LoadError::BadQuantity { fault, example } => fault.help(example),
            LoadError::BadCoverage(CoverageAt::Literal) => {
                "write `(k = 2)` for about 95 % coverage".to_string()
            }
            LoadError::BadCoverage(CoverageAt::Key) => {
                "write `k: 2` for about 95 % coverage".to_string()
            }
            LoadError::MissingUnit { example, bare, .. } => {
                if *bare {
                    format!("write it as a string with its unit, like {example}")
                } else {
                    format!("write the unit after the number, like {example}")
                }
            }
            LoadError::WrongUnit { wants, example, .. } => {
                format!("write it in a unit of {wants}, like {example}")
            }
            LoadError::UnknownUnit { suggestion, .. } => match suggestion {
                Some(near) => format!("did you mean `{near}`?"),
                None => "`gonogo units` lists the units gonogo knows".to_string(),
            },
            LoadError::NotFinite => "write the measured value".to_string(),
            LoadError::NotWhole { .. } => "write the count as a whole number".to_string(),
            LoadError::Negative { .. } => {
                "check the sign; the rulebook allows negative values only where its `range` does"
                    .to_string()
            }
            LoadError::OutOfRange { expected, .. } => {
                format!("the rulebook expects {expected}; check the value and its unit")
            }
            LoadError::NotPositive => {
                "write the instrument's resolution, like `0.0001 in`".to_string()
            }
            LoadError::InstrumentEmpty => {
                "add `resolution: \"0.0001 in\"` or `uncertainty: \"0.0002 in\"`".to_string()
            }
            LoadError::InstrumentMixed => {
                "write both in units of what the instrument measures".to_string()
            }
            LoadError::InstrumentWrongDimension { .. } => {
                "name an instrument that measures this kind of quantity".to_string()
            }
            LoadError::UnknownInstrument { suggestion, .. } => match suggestion {
                Some(near) => format!("did you mean `{near}`?"),
                None => {
                    "list it under `instruments:` with its resolution or uncertainty".to_string()
                }
            },
            LoadError::NeedsList { .. } => {
                "write the values as a list, like `[\"4.031 in\", \"4.030 in\", ...]`".to_string()
            }
            LoadError::NotAList { .. } => "write a single value".to_string(),
            LoadError::EmptyList => {
                "give one value per cylinder, or leave the measurement out".to_string()
            }
            LoadError::TooManyValues => {
                "split the inspection into several declarations".to_string()
            }
            LoadError::CylinderCount { .. } => {
                "every per-cylinder list has one value per cylinder, and `cylinders` counts them"
                    .to_string()
            }
            LoadError::TwoUncertainties => {
                "give the uncertainty one way: remove the `±` or the `instrument`".to_string()
            }
            LoadError::ValueAndValues { second, .. } => match *second {
                "readings" => {
                    "keep one: `readings` for repeated readings, else the single value or list"
                        .to_string()
                }
                _ => "use `values` for a per-cylinder list".to_string(),
            },
            LoadError::TooFewReadings { .. } => {
                "write each reading taken, like `[\"72.1 cc\", \"72.4 cc\"]`; for one reading use `value`"
                    .to_string()
            }
            LoadError::StatedInReadings => {
                "remove the `±`, and name the instrument with `instrument:` for its resolution and calibration"
                    .to_string()
            }
            LoadError::Yaml { .. } => {
                "the README's \"Engine declarations\" section shows the layout of a declaration"
                    .to_string()
            }
            LoadError::TooMany { .. } => "fix these and run again to see the rest".to_string(),
            LoadError::IdenticalReadings { .. } => {
                "name the instrument they were read with and its resolution, so that it gives \
                 their uncertainty: like `burette: {resolution: \"0.1 cc\"}` under \
                 `instruments:` and `instrument: burette` beside `readings:`"
                    .to_string()
            }
            LoadError::TooDeep { .. } => {
                "a declaration needs a list of values at most, like `values: [\"4.030 in\", \"4.031 in\"]`; look for brackets left open"
                    .to_string()
            }
            LoadError::UnknownReason { suggestion, .. } => match suggestion {
                Some(near) => format!("did you mean `{near}`?"),
                None => format!(
                    "the reasons are {}, or `{{other: \"why\"}}`",
                    backticked(&REASON_WORDS.map(str::to_string))
                ),
            },
            LoadError::NoReference { .. } => {
                "add `reference:` with the number the officials gave it, like `reference: \"PR-27-11\"`"
                    .to_string()
            }
            LoadError::BadScope(fault) => match fault {
                ScopeFault::NotASection { .. } => {
                    "write section numbers as in the rulebook, like `scope: [\"5\", \"6.2\"]`"
                        .to_string()
                }
                ScopeFault::Decimal { .. } => {
                    "quote it, so it is read as written: `scope: [\"5\", \"6.10\"]`".to_string()
                }
                ScopeFault::Empty => {
                    "list the sections inspected, or leave `scope` out to inspect every rule"
                        .to_string()
                }
                ScopeFault::Twice { .. } => "list each section once".to_string(),
            },
            LoadError::BadSeal(SealFault::NoNumber) => {
                "write the number stamped on it, like `{number: \"S-04417\", at: \"intake, front left bolt\"}`"
                    .to_string()
            }
            LoadError::BadSeal(SealFault::Twice { .. }) => {
                "list each seal once; check the number against the seal".to_string()
            }
            LoadError::BadGauge(fault) => gauge_help(fault),
            LoadError::GaugedAndMeasured { .. } => {
                "keep one: `gauges` for go/no-go results, or the measured value".to_string()
            }
            LoadError::CannotGauge { text: true, .. } => {
                "write the text as it reads on the part".to_string()
            }
            LoadError::CannotGauge { text: false, .. } => {
                "measure each cylinder and write the values under `values:`".to_string()
            }
            LoadError::GaugesDisagree { .. } => {
                "try both gauges again and check their tags and sizes against the calibration \
                 record"
                    .to_string()
            }
        }
    }

    /// Whether the error is about a mapping key, so its place is the mapping that holds it.
    fn is_about_a_key(&self) -> bool {
        matches!(
            self,
            LoadError::UnknownKey { .. }
                | LoadError::DuplicateKey { .. }
                | LoadError::Unsupported(YamlFeature::MergeKey)
        )
    }
}

impl LoadError {
    /// serde_yaml's refusal of the node whose text starts `node`, in the user's terms where
    /// gonogo knows them better: a tag (`!foo`) reaches a reader as an "enum".
    pub fn from_yaml(message: String, node: &str) -> LoadError {
        if node.starts_with('!') {
            let tag: String = node
                .chars()
                .take_while(|c| !c.is_whitespace())
                .take(40)
                .collect();
            return LoadError::Unsupported(YamlFeature::Tag { tag });
        }
        LoadError::Yaml { message }
    }
}

/// What is wrong with a gauge result, without where.
fn gauge_message(fault: &GaugeFault) -> String {
    match fault {
        GaugeFault::NoKind => "this gauge result names no gauge".to_string(),
        GaugeFault::TwoKinds => "this gauge result names both a plug and a ring".to_string(),
        GaugeFault::NoSize => "this gauge result has no `size`".to_string(),
        GaugeFault::NoUncertainty => {
            "a gauge's size needs its expanded uncertainty, from its calibration".to_string()
        }
        GaugeFault::NoResult { kind } => {
            format!(
                "this gauge result does not say whether the {} went",
                kind.words()
            )
        }
        GaugeFault::UnknownResult { written, kind } => {
            format!("`{written}` is not a result of a {} gauge", kind.words())
        }
        GaugeFault::Empty => "this list has no gauge results".to_string(),
        GaugeFault::MixedKinds => "this measurement has both plug and ring results".to_string(),
    }
}

fn gauge_label(fault: &GaugeFault) -> &'static str {
    match fault {
        GaugeFault::NoKind => "no gauge",
        GaugeFault::TwoKinds => "plug and ring",
        GaugeFault::NoSize => "no size",
        GaugeFault::NoUncertainty => "no uncertainty",
        GaugeFault::NoResult { .. } => "no result",
        GaugeFault::UnknownResult { .. } => "unknown result",
        GaugeFault::Empty => "empty",
        GaugeFault::MixedKinds => "plug and ring",
    }
}

fn gauge_help(fault: &GaugeFault) -> String {
    match fault {
        GaugeFault::NoKind | GaugeFault::TwoKinds => {
            "write `plug:` (a bore) or `ring:` (a diameter) with the gauge's tag, like \
             `plug: \"TV-G-0412\"`"
                .to_string()
        }
        GaugeFault::NoSize | GaugeFault::NoUncertainty => {
            "write the size from its calibration with its `±`, like \
             `size: \"1.6875 in ± 0.0002 in (k = 2)\"`"
                .to_string()
        }
        GaugeFault::NoResult { kind } | GaugeFault::UnknownResult { kind, .. } => {
            let [went, not] = kind.results();
            format!("write `result: {went}` or `result: {not}`")
        }
        GaugeFault::Empty => "list each gauge tried, or leave the measurement out".to_string(),
        GaugeFault::MixedKinds => {
            "a bore takes plugs and a diameter takes rings: keep the results of one kind"
                .to_string()
        }
    }
}

/// The reasons for an inspection, as a declaration writes them (`other` takes its own text).
pub const REASON_WORDS: [&str; 4] = ["after-feature", "protest", "claim", "random-draw"];

/// The merge key of YAML, `<<`, which declarations do not use.
pub const MERGE_KEY: &str = "<<";

fn backticked(items: &[String]) -> String {
    let quoted: Vec<String> = items.iter().map(|i| format!("`{i}`")).collect();
    first_few(&quoted, ", ")
}

/// A load error, where it is in the declaration, and where in the file.
#[derive(Clone, Debug, PartialEq)]
pub struct LoadProblem {
    /// What is wrong.
    pub error: LoadError,
    /// The node it is about (the key's own node for a key).
    pub path: DeclPath,
    /// Its text in the file, when known.
    pub span: Option<Span>,
}

impl LoadProblem {
    /// A problem of the whole file, at no place in it.
    pub fn unlocated(error: LoadError) -> LoadProblem {
        LoadProblem {
            error,
            path: DeclPath::root(),
            span: None,
        }
    }

    /// The problem miette renders: `path: message`, labelled at its text, with its help.
    pub fn problem(&self) -> Problem {
        let place = if self.error.is_about_a_key() {
            self.path.parent()
        } else {
            self.path.clone()
        };
        let message = if place.is_root() {
            self.error.message()
        } else {
            format!("{place}: {}", self.error.message())
        };
        let code = self.error.code();
        let problem = match self.span {
            Some(span) => Problem::error(code, message, span, &self.error.label()),
            None => Problem::unlocated(code, message),
        };
        problem.with_help(self.error.help())
    }
}

impl From<LoadProblem> for Problem {
    fn from(p: LoadProblem) -> Problem {
        p.problem()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_key_problem_is_placed_at_the_mapping_that_holds_the_key() {
        let path = DeclPath::root().key("measurements").key("strok");
        let p = LoadProblem {
            error: LoadError::UnknownKey {
                key: "strok".into(),
                kind: KeyKind::Measurement,
                suggestion: Some("stroke".into()),
                allowed: vec!["stroke".into()],
            },
            path,
            span: None,
        }
        .problem();
        assert_eq!(
            p.message,
            "measurements: `strok` is not a measurement gonogo knows here"
        );
        assert_eq!(p.help.as_deref(), Some("did you mean `stroke`?"));
        assert_eq!(p.code, codes::load::UNKNOWN_KEY);
    }

    #[test]
    fn a_value_problem_names_the_cylinder_from_one() {
        let path = DeclPath::root()
            .key("measurements")
            .key("bore")
            .wrapper("values")
            .element(0);
        let p = LoadProblem {
            error: LoadError::NotFinite,
            path,
            span: None,
        }
        .problem();
        assert_eq!(
            p.message,
            "measurements.bore[1]: this value is not a finite number"
        );
    }
}
