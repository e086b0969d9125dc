//! Every diagnostic code gonogo reports, in one table.
//!
//! A code is a stage letter and a number beside a readable name, `C56 unknown-unit`: F for
//! reading rulebook files, P for parsing, C for checking a rulebook, D for loading an engine
//! declaration, A for comparing editions and fields, W for writing the output, L for the season log. A code is never reused for another
//! problem; a new one takes the next free number of its stage. README.md lists them all (a
//! test keeps the two in step).

use std::fmt;

/// The stage of the pipeline a problem is found in.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Stage {
    /// Reading rulebook files and their includes.
    Read,
    /// Parsing rulebook text.
    Parse,
    /// Checking a parsed rulebook.
    Check,
    /// Loading an engine declaration.
    Load,
    /// Comparing editions and fields (`diff`, `impact`).
    Analyze,
    /// Writing the output (`--output`, standard output) and naming the inputs.
    Write,
    /// Reading and writing the season log (`check --record`, `season`).
    Log,
}

impl Stage {
    /// The letter codes of this stage begin with.
    pub const fn letter(self) -> char {
        match self {
            Stage::Read => 'F',
            Stage::Parse => 'P',
            Stage::Check => 'C',
            Stage::Load => 'D',
            Stage::Analyze => 'A',
            Stage::Write => 'W',
            Stage::Log => 'L',
        }
    }
}

/// One diagnostic code: stage, number and name.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct Code {
    /// The stage.
    pub stage: Stage,
    /// Its number within the stage.
    pub number: u8,
    /// The readable name, lowercase words joined by hyphens.
    pub name: &'static str,
}

impl Code {
    /// A code; used only by the table below.
    const fn new(stage: Stage, number: u8, name: &'static str) -> Code {
        Code {
            stage,
            number,
            name,
        }
    }

    /// The short tag, `C56`.
    pub fn tag(self) -> String {
        format!("{}{:02}", self.stage.letter(), self.number)
    }
}

impl fmt::Display for Code {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{:02} {}", self.stage.letter(), self.number, self.name)
    }
}

impl serde::Serialize for Code {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// Codes of reading rulebook files.
pub mod read {
    use super::{Code, Stage};

    /// `F01 include-cycle`
    pub const INCLUDE_CYCLE: Code = Code::new(Stage::Read, 1, "include-cycle");
    /// `F02 include-link-loop`
    pub const INCLUDE_LINK_LOOP: Code = Code::new(Stage::Read, 2, "include-link-loop");
    /// `F03 include-missing`
    pub const INCLUDE_MISSING: Code = Code::new(Stage::Read, 3, "include-missing");
    /// `F04 include-not-a-file`
    pub const INCLUDE_NOT_A_FILE: Code = Code::new(Stage::Read, 4, "include-not-a-file");
    /// `F05 include-outside`
    pub const INCLUDE_OUTSIDE: Code = Code::new(Stage::Read, 5, "include-outside");
    /// `F06 io`
    pub const IO: Code = Code::new(Stage::Read, 6, "io");
    /// `F07 not-utf8`
    pub const NOT_UTF8: Code = Code::new(Stage::Read, 7, "not-utf8");
    /// `F08 too-large`
    pub const TOO_LARGE: Code = Code::new(Stage::Read, 8, "too-large");
}

/// Codes of parsing rulebook text.
pub mod parse {
    use super::{Code, Stage};

    /// `P01 allowance-in-condition`
    pub const ALLOWANCE_IN_CONDITION: Code = Code::new(Stage::Parse, 1, "allowance-in-condition");
    /// `P02 allowance-on-list`
    pub const ALLOWANCE_ON_LIST: Code = Code::new(Stage::Parse, 2, "allowance-on-list");
    /// `P03 bad-date`
    pub const BAD_DATE: Code = Code::new(Stage::Parse, 3, "bad-date");
    /// `P04 bad-escape`
    pub const BAD_ESCAPE: Code = Code::new(Stage::Parse, 4, "bad-escape");
    /// `P05 bad-fraction`
    pub const BAD_FRACTION: Code = Code::new(Stage::Parse, 5, "bad-fraction");
    /// `P06 control-character`
    pub const CONTROL_CHARACTER: Code = Code::new(Stage::Parse, 6, "control-character");
    /// `P07 empty-pattern`
    pub const EMPTY_PATTERN: Code = Code::new(Stage::Parse, 7, "empty-pattern");
    /// `P08 joined-require`
    pub const JOINED_REQUIRE: Code = Code::new(Stage::Parse, 8, "joined-require");
    /// `P09 number-too-large`
    pub const NUMBER_TOO_LARGE: Code = Code::new(Stage::Parse, 9, "number-too-large");
    /// `P10 too-deep`
    pub const TOO_DEEP: Code = Code::new(Stage::Parse, 10, "too-deep");
    /// `P11 too-long`
    pub const TOO_LONG: Code = Code::new(Stage::Parse, 11, "too-long");
    /// `P12 unexpected`
    pub const UNEXPECTED: Code = Code::new(Stage::Parse, 12, "unexpected");
    /// `P13 unterminated-pattern`
    pub const UNTERMINATED_PATTERN: Code = Code::new(Stage::Parse, 13, "unterminated-pattern");
    /// `P14 unterminated-string`
    pub const UNTERMINATED_STRING: Code = Code::new(Stage::Parse, 14, "unterminated-string");
}

/// Codes of checking a rulebook.
pub mod check {
    use super::{Code, Stage};

    /// `C01 allowance-not-constant`
    pub const ALLOWANCE_NOT_CONSTANT: Code = Code::new(Stage::Check, 1, "allowance-not-constant");
    /// `C02 allowance-on-equality`
    pub const ALLOWANCE_ON_EQUALITY: Code = Code::new(Stage::Check, 2, "allowance-on-equality");
    /// `C03 approved-and-banned`
    pub const APPROVED_AND_BANNED: Code = Code::new(Stage::Check, 3, "approved-and-banned");
    /// `C65 part-approved-and-banned`
    pub const PART_APPROVED_AND_BANNED: Code =
        Code::new(Stage::Check, 65, "part-approved-and-banned");
    /// `C04 argument-count`
    pub const ARGUMENT_COUNT: Code = Code::new(Stage::Check, 4, "argument-count");
    /// `C05 argument-dimension`
    pub const ARGUMENT_DIMENSION: Code = Code::new(Stage::Check, 5, "argument-dimension");
    /// `C06 argument-missing`
    pub const ARGUMENT_MISSING: Code = Code::new(Stage::Check, 6, "argument-missing");
    /// `C07 argument-twice`
    pub const ARGUMENT_TWICE: Code = Code::new(Stage::Check, 7, "argument-twice");
    /// `C08 bad-coverage`
    pub const BAD_COVERAGE: Code = Code::new(Stage::Check, 8, "bad-coverage");
    /// `C09 bad-exponent`
    pub const BAD_EXPONENT: Code = Code::new(Stage::Check, 9, "bad-exponent");
    /// `C10 bad-pattern`
    pub const BAD_PATTERN: Code = Code::new(Stage::Check, 10, "bad-pattern");
    /// `C11 bad-root`
    pub const BAD_ROOT: Code = Code::new(Stage::Check, 11, "bad-root");
    /// `C12 before-edition`
    pub const BEFORE_EDITION: Code = Code::new(Stage::Check, 12, "before-edition");
    /// `C13 bulletin-before-edition`
    pub const BULLETIN_BEFORE_EDITION: Code =
        Code::new(Stage::Check, 13, "bulletin-before-edition");
    /// `C14 conditional-drop`
    pub const CONDITIONAL_DROP: Code = Code::new(Stage::Check, 14, "conditional-drop");
    /// `C15 contradictory-limits`
    pub const CONTRADICTORY_LIMITS: Code = Code::new(Stage::Check, 15, "contradictory-limits");
    /// `C16 define-cycle`
    pub const DEFINE_CYCLE: Code = Code::new(Stage::Check, 16, "define-cycle");
    /// `C17 dimension-mismatch`
    pub const DIMENSION_MISMATCH: Code = Code::new(Stage::Check, 17, "dimension-mismatch");
    /// `C18 duplicate-bulletin`
    pub const DUPLICATE_BULLETIN: Code = Code::new(Stage::Check, 18, "duplicate-bulletin");
    /// `C67 entry-covered-by-pattern`
    pub const ENTRY_COVERED_BY_PATTERN: Code =
        Code::new(Stage::Check, 67, "entry-covered-by-pattern");
    /// `C19 duplicate-entry`
    pub const DUPLICATE_ENTRY: Code = Code::new(Stage::Check, 19, "duplicate-entry");
    /// `C20 duplicate-header`
    pub const DUPLICATE_HEADER: Code = Code::new(Stage::Check, 20, "duplicate-header");
    /// `C21 duplicate-name`
    pub const DUPLICATE_NAME: Code = Code::new(Stage::Check, 21, "duplicate-name");
    /// `C22 duplicate-section`
    pub const DUPLICATE_SECTION: Code = Code::new(Stage::Check, 22, "duplicate-section");
    /// `C23 empty-bulletin`
    pub const EMPTY_BULLETIN: Code = Code::new(Stage::Check, 23, "empty-bulletin");
    /// `C24 empty-folder`
    pub const EMPTY_FOLDER: Code = Code::new(Stage::Check, 24, "empty-folder");
    /// `C25 empty-range`
    pub const EMPTY_RANGE: Code = Code::new(Stage::Check, 25, "empty-range");
    /// `C26 extends-cycle`
    pub const EXTENDS_CYCLE: Code = Code::new(Stage::Check, 26, "extends-cycle");
    /// `C27 extends-too-long`
    pub const EXTENDS_TOO_LONG: Code = Code::new(Stage::Check, 27, "extends-too-long");
    /// `C28 header-in-include`
    pub const HEADER_IN_INCLUDE: Code = Code::new(Stage::Check, 28, "header-in-include");
    /// `C29 internal`
    pub const INTERNAL: Code = Code::new(Stage::Check, 29, "internal");
    /// `C30 missing-header`
    pub const MISSING_HEADER: Code = Code::new(Stage::Check, 30, "missing-header");
    /// `C31 needs-single-value`
    pub const NEEDS_SINGLE_VALUE: Code = Code::new(Stage::Check, 31, "needs-single-value");
    /// `C32 negative-allowance`
    pub const NEGATIVE_ALLOWANCE: Code = Code::new(Stage::Check, 32, "negative-allowance");
    /// `C33 never-fails`
    pub const NEVER_FAILS: Code = Code::new(Stage::Check, 33, "never-fails");
    /// `C34 never-holds`
    pub const NEVER_HOLDS: Code = Code::new(Stage::Check, 34, "never-holds");
    /// `C35 never-met`
    pub const NEVER_MET: Code = Code::new(Stage::Check, 35, "never-met");
    /// `C37 not-text`
    pub const NOT_TEXT: Code = Code::new(Stage::Check, 37, "not-text");
    /// `C38 nothing-to-drop`
    pub const NOTHING_TO_DROP: Code = Code::new(Stage::Check, 38, "nothing-to-drop");
    /// `C39 nothing-to-override`
    pub const NOTHING_TO_OVERRIDE: Code = Code::new(Stage::Check, 39, "nothing-to-override");
    /// `C40 override-changes-nothing`
    pub const OVERRIDE_CHANGES_NOTHING: Code =
        Code::new(Stage::Check, 40, "override-changes-nothing");
    /// `C41 pattern-too-large`
    pub const PATTERN_TOO_LARGE: Code = Code::new(Stage::Check, 41, "pattern-too-large");
    /// `C42 per-cylinder-condition`
    pub const PER_CYLINDER_CONDITION: Code = Code::new(Stage::Check, 42, "per-cylinder-condition");
    /// `C43 per-cylinder-text`
    pub const PER_CYLINDER_TEXT: Code = Code::new(Stage::Check, 43, "per-cylinder-text");
    /// `C44 range-on-text`
    pub const RANGE_ON_TEXT: Code = Code::new(Stage::Check, 44, "range-on-text");
    /// `C45 text-in-arithmetic`
    pub const TEXT_IN_ARITHMETIC: Code = Code::new(Stage::Check, 45, "text-in-arithmetic");
    /// `C46 text-order`
    pub const TEXT_ORDER: Code = Code::new(Stage::Check, 46, "text-order");
    /// `C47 too-many-patterns`
    pub const TOO_MANY_PATTERNS: Code = Code::new(Stage::Check, 47, "too-many-patterns");
    /// `C48 uncertainty-dimension`
    pub const UNCERTAINTY_DIMENSION: Code = Code::new(Stage::Check, 48, "uncertainty-dimension");
    /// `C49 unknown-argument`
    pub const UNKNOWN_ARGUMENT: Code = Code::new(Stage::Check, 49, "unknown-argument");
    /// `C50 unknown-class`
    pub const UNKNOWN_CLASS: Code = Code::new(Stage::Check, 50, "unknown-class");
    /// `C51 unknown-dimension`
    pub const UNKNOWN_DIMENSION: Code = Code::new(Stage::Check, 51, "unknown-dimension");
    /// `C52 unknown-function`
    pub const UNKNOWN_FUNCTION: Code = Code::new(Stage::Check, 52, "unknown-function");
    /// `C53 unknown-list`
    pub const UNKNOWN_LIST: Code = Code::new(Stage::Check, 53, "unknown-list");
    /// `C54 unknown-name`
    pub const UNKNOWN_NAME: Code = Code::new(Stage::Check, 54, "unknown-name");
    /// `C55 unknown-section`
    pub const UNKNOWN_SECTION: Code = Code::new(Stage::Check, 55, "unknown-section");
    /// `C56 unknown-unit`
    pub const UNKNOWN_UNIT: Code = Code::new(Stage::Check, 56, "unknown-unit");
    /// `C57 unused-define`
    pub const UNUSED_DEFINE: Code = Code::new(Stage::Check, 57, "unused-define");
    /// `C58 unused-measurement`
    pub const UNUSED_MEASUREMENT: Code = Code::new(Stage::Check, 58, "unused-measurement");
    /// `C59 uncertain-limit`
    pub const UNCERTAIN_LIMIT: Code = Code::new(Stage::Check, 59, "uncertain-limit");
    /// `C60 coverage-out-of-range`
    pub const COVERAGE_OUT_OF_RANGE: Code = Code::new(Stage::Check, 60, "coverage-out-of-range");
    /// `C61 define-too-deep`
    pub const DEFINE_TOO_DEEP: Code = Code::new(Stage::Check, 61, "define-too-deep");
    /// `C62 division-by-zero`
    pub const DIVISION_BY_ZERO: Code = Code::new(Stage::Check, 62, "division-by-zero");
    /// `C63 not-finite`
    pub const NOT_FINITE: Code = Code::new(Stage::Check, 63, "not-finite");
    /// `C64 too-many-rules`
    pub const TOO_MANY_RULES: Code = Code::new(Stage::Check, 64, "too-many-rules");
    /// `C66 bad-sections`: a section of an inspection's scope (`--sections` or the
    /// declaration's) that names no rule of the class checked.
    pub const BAD_SECTIONS: Code = Code::new(Stage::Check, 66, "bad-sections");
}

/// Codes of loading an engine declaration.
pub mod load {
    use super::{Code, Stage};

    /// `D01 bad-coverage`
    pub const BAD_COVERAGE: Code = Code::new(Stage::Load, 1, "bad-coverage");
    /// `D02 bad-date`
    pub const BAD_DATE: Code = Code::new(Stage::Load, 2, "bad-date");
    /// `D03 bad-quantity`
    pub const BAD_QUANTITY: Code = Code::new(Stage::Load, 3, "bad-quantity");
    /// `D04 cylinder-count`
    pub const CYLINDER_COUNT: Code = Code::new(Stage::Load, 4, "cylinder-count");
    /// `D05 duplicate-key`
    pub const DUPLICATE_KEY: Code = Code::new(Stage::Load, 5, "duplicate-key");
    /// `D06 empty-list`
    pub const EMPTY_LIST: Code = Code::new(Stage::Load, 6, "empty-list");
    /// `D07 instrument-empty`
    pub const INSTRUMENT_EMPTY: Code = Code::new(Stage::Load, 7, "instrument-empty");
    /// `D08 missing-unit`
    pub const MISSING_UNIT: Code = Code::new(Stage::Load, 8, "missing-unit");
    /// `D09 needs-list`
    pub const NEEDS_LIST: Code = Code::new(Stage::Load, 9, "needs-list");
    /// `D10 negative`
    pub const NEGATIVE: Code = Code::new(Stage::Load, 10, "negative");
    /// `D11 not-a-list`
    pub const NOT_A_LIST: Code = Code::new(Stage::Load, 11, "not-a-list");
    /// `D12 not-finite`
    pub const NOT_FINITE: Code = Code::new(Stage::Load, 12, "not-finite");
    /// `D13 not-positive`
    pub const NOT_POSITIVE: Code = Code::new(Stage::Load, 13, "not-positive");
    /// `D14 out-of-range`
    pub const OUT_OF_RANGE: Code = Code::new(Stage::Load, 14, "out-of-range");
    /// `D15 too-many`
    pub const TOO_MANY: Code = Code::new(Stage::Load, 15, "too-many");
    /// `D16 two-uncertainties`
    pub const TWO_UNCERTAINTIES: Code = Code::new(Stage::Load, 16, "two-uncertainties");
    /// `D17 unknown-class`
    pub const UNKNOWN_CLASS: Code = Code::new(Stage::Load, 17, "unknown-class");
    /// `D18 unknown-instrument`
    pub const UNKNOWN_INSTRUMENT: Code = Code::new(Stage::Load, 18, "unknown-instrument");
    /// `D19 unknown-key`
    pub const UNKNOWN_KEY: Code = Code::new(Stage::Load, 19, "unknown-key");
    /// `D20 unknown-unit`
    pub const UNKNOWN_UNIT: Code = Code::new(Stage::Load, 20, "unknown-unit");
    /// `D21 value-and-values`
    pub const VALUE_AND_VALUES: Code = Code::new(Stage::Load, 21, "value-and-values");
    /// `D22 wrong-dimension`
    pub const WRONG_DIMENSION: Code = Code::new(Stage::Load, 22, "wrong-dimension");
    /// `D23 yaml`
    pub const YAML: Code = Code::new(Stage::Load, 23, "yaml");
    /// `D25 no-class` (was `C36`, retired: a declaration problem belongs to this stage)
    pub const NO_CLASS: Code = Code::new(Stage::Load, 25, "no-class");
    /// `D24 too-many-values`
    pub const TOO_MANY_VALUES: Code = Code::new(Stage::Load, 24, "too-many-values");
    /// `D26 not-whole`
    pub const NOT_WHOLE: Code = Code::new(Stage::Load, 26, "not-whole");
    /// `D27 too-few-readings`
    pub const TOO_FEW_READINGS: Code = Code::new(Stage::Load, 27, "too-few-readings");
    /// `D28 stated-in-readings`
    pub const STATED_IN_READINGS: Code = Code::new(Stage::Load, 28, "stated-in-readings");
    /// `D29 yaml-unsupported`
    pub const YAML_UNSUPPORTED: Code = Code::new(Stage::Load, 29, "yaml-unsupported");
    /// `D30 identical-readings`
    pub const IDENTICAL_READINGS: Code = Code::new(Stage::Load, 30, "identical-readings");
    /// `D31 too-deep`
    pub const TOO_DEEP: Code = Code::new(Stage::Load, 31, "too-deep");
    /// `D32 unknown-reason`
    pub const UNKNOWN_REASON: Code = Code::new(Stage::Load, 32, "unknown-reason");
    /// `D33 no-reference`
    pub const NO_REFERENCE: Code = Code::new(Stage::Load, 33, "no-reference");
    /// `D34 bad-scope`
    pub const BAD_SCOPE: Code = Code::new(Stage::Load, 34, "bad-scope");
    /// `D35 bad-seal`
    pub const BAD_SEAL: Code = Code::new(Stage::Load, 35, "bad-seal");
    /// `D36 bad-gauge`
    pub const BAD_GAUGE: Code = Code::new(Stage::Load, 36, "bad-gauge");
    /// `D37 gauged-and-measured`
    pub const GAUGED_AND_MEASURED: Code = Code::new(Stage::Load, 37, "gauged-and-measured");
    /// `D38 cannot-gauge`
    pub const CANNOT_GAUGE: Code = Code::new(Stage::Load, 38, "cannot-gauge");
    /// `D39 gauges-disagree`
    pub const GAUGES_DISAGREE: Code = Code::new(Stage::Load, 39, "gauges-disagree");
}

/// Codes of comparing editions and fields.
pub mod analyze {
    use super::{Code, Stage};

    /// `A01 different-series`
    pub const DIFFERENT_SERIES: Code = Code::new(Stage::Analyze, 1, "different-series");
    /// `A02 nothing-to-compare`
    pub const NOTHING_TO_COMPARE: Code = Code::new(Stage::Analyze, 2, "nothing-to-compare");
    /// `A03 draft-not-bulletins`
    pub const DRAFT_NOT_BULLETINS: Code = Code::new(Stage::Analyze, 3, "draft-not-bulletins");
    /// `A04 bad-date-option`
    pub const BAD_DATE_OPTION: Code = Code::new(Stage::Analyze, 4, "bad-date-option");
    /// `A05 draft-not-in-force`
    pub const DRAFT_NOT_IN_FORCE: Code = Code::new(Stage::Analyze, 5, "draft-not-in-force");
    /// `A06 sweep-unknown-rule`
    pub const SWEEP_UNKNOWN_RULE: Code = Code::new(Stage::Analyze, 6, "sweep-unknown-rule");
    /// `A07 sweep-not-a-limit`
    pub const SWEEP_NOT_A_LIMIT: Code = Code::new(Stage::Analyze, 7, "sweep-not-a-limit");
    /// `A08 sweep-bad-range`
    pub const SWEEP_BAD_RANGE: Code = Code::new(Stage::Analyze, 8, "sweep-bad-range");
    /// `A09 sweep-empty-field`
    pub const SWEEP_EMPTY_FIELD: Code = Code::new(Stage::Analyze, 9, "sweep-empty-field");
}

/// Codes of writing the output and naming the inputs.
pub mod write {
    use super::{Code, Stage};

    /// `W01 output-is-input`
    pub const OUTPUT_IS_INPUT: Code = Code::new(Stage::Write, 1, "output-is-input");
    /// `W02 output-read-only`
    pub const OUTPUT_READ_ONLY: Code = Code::new(Stage::Write, 2, "output-read-only");
    /// `W03 output-not-a-file`
    pub const OUTPUT_NOT_A_FILE: Code = Code::new(Stage::Write, 3, "output-not-a-file");
    /// `W04 output-dangling-link`
    pub const OUTPUT_DANGLING_LINK: Code = Code::new(Stage::Write, 4, "output-dangling-link");
    /// `W05 write-failed`
    pub const WRITE_FAILED: Code = Code::new(Stage::Write, 5, "write-failed");
    /// `W06 stdin-twice`
    pub const STDIN_TWICE: Code = Code::new(Stage::Write, 6, "stdin-twice");
    /// `W07 input-changed`
    pub const INPUT_CHANGED: Code = Code::new(Stage::Write, 7, "input-changed");
    /// `W08 rewrite-stdin`
    pub const REWRITE_STDIN: Code = Code::new(Stage::Write, 8, "rewrite-stdin");
}

/// Numbers no longer given, and never given again: the problem moved to another stage.
pub const RETIRED: &[(Stage, u8)] = &[(Stage::Check, 36)];

/// Codes of the season log.
pub mod log {
    use super::{Code, Stage};

    /// `L01 log-not-sqlite`
    pub const NOT_SQLITE: Code = Code::new(Stage::Log, 1, "log-not-sqlite");
    /// `L02 log-foreign`
    pub const FOREIGN: Code = Code::new(Stage::Log, 2, "log-foreign");
    /// `L03 log-newer`
    pub const NEWER: Code = Code::new(Stage::Log, 3, "log-newer");
    /// `L04 log-failed`
    pub const FAILED: Code = Code::new(Stage::Log, 4, "log-failed");
    /// `L05 log-missing`
    pub const MISSING: Code = Code::new(Stage::Log, 5, "log-missing");
    /// `L06 export-exists`
    pub const EXPORT_EXISTS: Code = Code::new(Stage::Log, 6, "export-exists");
    /// `L07 no-inspection`
    pub const NO_INSPECTION: Code = Code::new(Stage::Log, 7, "no-inspection");
    /// `L08 bad-date-filter`
    pub const BAD_DATE_FILTER: Code = Code::new(Stage::Log, 8, "bad-date-filter");
    /// `L09 stored-input-unusable`
    pub const STORED_INPUT_UNUSABLE: Code = Code::new(Stage::Log, 9, "stored-input-unusable");
}

/// Every code, stage by stage.
pub const ALL: &[Code] = &[
    read::INCLUDE_CYCLE,
    read::INCLUDE_LINK_LOOP,
    read::INCLUDE_MISSING,
    read::INCLUDE_NOT_A_FILE,
    read::INCLUDE_OUTSIDE,
    read::IO,
    read::NOT_UTF8,
    read::TOO_LARGE,
    parse::ALLOWANCE_IN_CONDITION,
    parse::ALLOWANCE_ON_LIST,
    parse::BAD_DATE,
    parse::BAD_ESCAPE,
    parse::BAD_FRACTION,
    parse::CONTROL_CHARACTER,
    parse::EMPTY_PATTERN,
    parse::JOINED_REQUIRE,
    parse::NUMBER_TOO_LARGE,
    parse::TOO_DEEP,
    parse::TOO_LONG,
    parse::UNEXPECTED,
    parse::UNTERMINATED_PATTERN,
    parse::UNTERMINATED_STRING,
    check::ALLOWANCE_NOT_CONSTANT,
    check::ALLOWANCE_ON_EQUALITY,
    check::APPROVED_AND_BANNED,
    check::PART_APPROVED_AND_BANNED,
    check::ARGUMENT_COUNT,
    check::ARGUMENT_DIMENSION,
    check::ARGUMENT_MISSING,
    check::ARGUMENT_TWICE,
    check::BAD_COVERAGE,
    check::BAD_EXPONENT,
    check::BAD_PATTERN,
    check::BAD_ROOT,
    check::BEFORE_EDITION,
    check::BULLETIN_BEFORE_EDITION,
    check::CONDITIONAL_DROP,
    check::CONTRADICTORY_LIMITS,
    check::DEFINE_CYCLE,
    check::DIMENSION_MISMATCH,
    check::DUPLICATE_BULLETIN,
    check::DUPLICATE_ENTRY,
    check::ENTRY_COVERED_BY_PATTERN,
    check::DUPLICATE_HEADER,
    check::DUPLICATE_NAME,
    check::DUPLICATE_SECTION,
    check::EMPTY_BULLETIN,
    check::EMPTY_FOLDER,
    check::EMPTY_RANGE,
    check::EXTENDS_CYCLE,
    check::EXTENDS_TOO_LONG,
    check::HEADER_IN_INCLUDE,
    check::INTERNAL,
    check::MISSING_HEADER,
    check::NEEDS_SINGLE_VALUE,
    check::NEGATIVE_ALLOWANCE,
    check::NEVER_FAILS,
    check::NEVER_HOLDS,
    check::NEVER_MET,
    check::NOT_TEXT,
    check::NOTHING_TO_DROP,
    check::NOTHING_TO_OVERRIDE,
    check::OVERRIDE_CHANGES_NOTHING,
    check::PATTERN_TOO_LARGE,
    check::PER_CYLINDER_CONDITION,
    check::PER_CYLINDER_TEXT,
    check::RANGE_ON_TEXT,
    check::TEXT_IN_ARITHMETIC,
    check::TEXT_ORDER,
    check::TOO_MANY_PATTERNS,
    check::UNCERTAINTY_DIMENSION,
    check::UNKNOWN_ARGUMENT,
    check::UNKNOWN_CLASS,
    check::UNKNOWN_DIMENSION,
    check::UNKNOWN_FUNCTION,
    check::UNKNOWN_LIST,
    check::UNKNOWN_NAME,
    check::UNKNOWN_SECTION,
    check::UNKNOWN_UNIT,
    check::UNUSED_DEFINE,
    check::UNUSED_MEASUREMENT,
    check::UNCERTAIN_LIMIT,
    check::COVERAGE_OUT_OF_RANGE,
    check::DEFINE_TOO_DEEP,
    check::DIVISION_BY_ZERO,
    check::NOT_FINITE,
    check::TOO_MANY_RULES,
    check::BAD_SECTIONS,
    load::BAD_COVERAGE,
    load::BAD_DATE,
    load::BAD_QUANTITY,
    load::CYLINDER_COUNT,
    load::DUPLICATE_KEY,
    load::EMPTY_LIST,
    load::INSTRUMENT_EMPTY,
    load::MISSING_UNIT,
    load::NEEDS_LIST,
    load::NEGATIVE,
    load::NOT_A_LIST,
    load::NOT_FINITE,
    load::NOT_POSITIVE,
    load::OUT_OF_RANGE,
    load::TOO_MANY,
    load::TWO_UNCERTAINTIES,
    load::UNKNOWN_CLASS,
    load::UNKNOWN_INSTRUMENT,
    load::UNKNOWN_KEY,
    load::UNKNOWN_UNIT,
    load::VALUE_AND_VALUES,
    load::WRONG_DIMENSION,
    load::YAML,
    load::TOO_MANY_VALUES,
    load::NO_CLASS,
    load::NOT_WHOLE,
    load::TOO_FEW_READINGS,
    load::STATED_IN_READINGS,
    load::YAML_UNSUPPORTED,
    load::IDENTICAL_READINGS,
    load::TOO_DEEP,
    load::UNKNOWN_REASON,
    load::NO_REFERENCE,
    load::BAD_SCOPE,
    load::BAD_SEAL,
    analyze::DIFFERENT_SERIES,
    analyze::NOTHING_TO_COMPARE,
    analyze::DRAFT_NOT_BULLETINS,
    analyze::BAD_DATE_OPTION,
    analyze::DRAFT_NOT_IN_FORCE,
    analyze::SWEEP_UNKNOWN_RULE,
    analyze::SWEEP_NOT_A_LIMIT,
    analyze::SWEEP_BAD_RANGE,
    analyze::SWEEP_EMPTY_FIELD,
    write::OUTPUT_IS_INPUT,
    write::OUTPUT_READ_ONLY,
    write::OUTPUT_NOT_A_FILE,
    write::OUTPUT_DANGLING_LINK,
    write::WRITE_FAILED,
    write::STDIN_TWICE,
    write::INPUT_CHANGED,
    write::REWRITE_STDIN,
    log::NOT_SQLITE,
    log::FOREIGN,
    log::NEWER,
    log::FAILED,
    log::MISSING,
    log::EXPORT_EXISTS,
    log::NO_INSPECTION,
    log::BAD_DATE_FILTER,
    log::STORED_INPUT_UNUSABLE,
];

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_rise_within_each_stage_and_only_retired_ones_are_missing() {
        for stage in [
            Stage::Read,
            Stage::Parse,
            Stage::Check,
            Stage::Load,
            Stage::Analyze,
        ] {
            let numbers: Vec<u8> = ALL
                .iter()
                .filter(|c| c.stage == stage)
                .map(|c| c.number)
                .collect();
            let highest = numbers.iter().copied().max().unwrap_or(0);
            let expected: Vec<u8> = (1..=highest)
                .filter(|n| !RETIRED.contains(&(stage, *n)))
                .collect();
            let mut sorted = numbers.clone();
            sorted.sort_unstable();
            assert_eq!(sorted, expected, "{stage:?}");
        }
    }

    #[test]
    fn names_are_unique_within_a_stage() {
        for (i, a) in ALL.iter().enumerate() {
            for b in &ALL[i + 1..] {
                assert!(a.stage != b.stage || a.name != b.name, "{a} and {b}");
            }
        }
    }

    #[test]
    fn the_readme_lists_every_code() {
        let readme = include_str!("../../README.md");
        for code in ALL {
            assert!(
                readme.contains(&format!("`{code}`")),
                "README.md does not list `{code}`"
            );
        }
    }

    #[test]
    fn a_code_reads_as_tag_and_name() {
        assert_eq!(
            check::UNKNOWN_UNIT.to_string(),
            format!("{} unknown-unit", check::UNKNOWN_UNIT.tag())
        );
        assert!(check::UNKNOWN_UNIT.tag().starts_with('C'));
    }
}
