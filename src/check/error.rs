//! The check stage's errors and warnings as data. Each [`CheckError`] variant holds what went
//! wrong as fields (the names involved, the places, a suggested name) and derives its code,
//! level, message, labels and help in one match each; `Problem::from` turns it into the
//! [`Problem`] that miette renders.

use crate::diagnostic::{Level, Problem};
use crate::parse::ast::Date;
use crate::source::Span;

use super::model::Origin;

/// One of the three header lines a rulebook's main file must have.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum HeaderLine {
    /// `series "..."`
    Series,
    /// `edition "..." effective DATE`
    Edition,
    /// `decision ...`
    Decision,
}

impl HeaderLine {
    /// The keyword that starts the line.
    pub fn keyword(self) -> &'static str {
        match self {
            HeaderLine::Series => "series",
            HeaderLine::Edition => "edition",
            HeaderLine::Decision => "decision",
        }
    }

    /// A complete line of the invented demo series, for a help line.
    pub fn example(self) -> &'static str {
        match self {
            HeaderLine::Series => "series \"Tamsin Valley Stock Car Club\"",
            HeaderLine::Edition => "edition \"2027\" effective 2027-03-06",
            HeaderLine::Decision => "decision guarded rejection",
        }
    }
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
}

impl CheckError {
    /// The stable code.
    pub fn code(&self) -> &'static str {
        match self {
            CheckError::HeaderInInclude { .. } => "gonogo::check::header-in-include",
            CheckError::DuplicateHeader { .. } => "gonogo::check::duplicate-header",
            CheckError::MissingHeader { .. } => "gonogo::check::missing-header",
            CheckError::DuplicateValueName { .. } | CheckError::DuplicateDefinition { .. } => {
                "gonogo::check::duplicate-name"
            }
            CheckError::DuplicateBulletin { .. } => "gonogo::check::duplicate-bulletin",
            CheckError::UnknownClass { .. } => "gonogo::check::unknown-class",
            CheckError::BulletinBeforeEdition { .. } => "gonogo::check::bulletin-before-edition",
            CheckError::EmptyBulletin { .. } => "gonogo::check::empty-bulletin",
            CheckError::ExtendsCycle { .. } => "gonogo::check::extends-cycle",
            CheckError::OverrideChangesNothing { .. } => "gonogo::check::override-changes-nothing",
            CheckError::NothingToOverride { .. } => "gonogo::check::nothing-to-override",
            CheckError::DuplicateSection { .. } | CheckError::SectionClash { .. } => {
                "gonogo::check::duplicate-section"
            }
            CheckError::ConditionalDrop { .. } => "gonogo::check::conditional-drop",
            CheckError::NothingToDrop { .. } => "gonogo::check::nothing-to-drop",
            CheckError::DuplicateEntry { .. } => "gonogo::check::duplicate-entry",
            CheckError::ApprovedAndBanned { .. } => "gonogo::check::approved-and-banned",
            CheckError::PatternTooLarge { .. } => "gonogo::check::pattern-too-large",
            CheckError::BadPattern { .. } => "gonogo::check::bad-pattern",
            CheckError::UnusedMeasurement { .. } => "gonogo::check::unused-measurement",
            CheckError::UnusedDefine { .. } => "gonogo::check::unused-define",
        }
    }

    /// Error or warning.
    pub fn level(&self) -> Level {
        match self {
            CheckError::EmptyBulletin { .. }
            | CheckError::OverrideChangesNothing { .. }
            | CheckError::DuplicateEntry { .. }
            | CheckError::ApprovedAndBanned { .. }
            | CheckError::UnusedMeasurement { .. }
            | CheckError::UnusedDefine { .. } => Level::Warning,
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
            CheckError::ExtendsCycle { chain, .. } => format!(
                "classes extend each other in a loop: `{}`",
                chain.join("` → `")
            ),
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
            CheckError::ApprovedAndBanned {
                approved,
                part,
                banned,
                ..
            } => format!(
                "this pattern of approved list `{approved}` also matches `{part}`, which banned list `{banned}` bans"
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
        }
    }

    /// Where, each place with its label; the first is the primary one.
    pub fn labels(&self) -> Vec<(Span, &'static str)> {
        match self {
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
            CheckError::ApprovedAndBanned { at, banned_at, .. } => {
                vec![(*at, "matches a banned part"), (*banned_at, "banned here")]
            }
            CheckError::PatternTooLarge { at, .. } => vec![(*at, "too large")],
            CheckError::BadPattern { at, .. } => vec![(*at, "bad pattern")],
            CheckError::UnusedMeasurement { at, .. } | CheckError::UnusedDefine { at, .. } => {
                vec![(*at, "never used")]
            }
        }
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
                Some(near) => return format!("did you mean `{near}`?"),
                None => "name a class defined in this rulebook",
            },
            CheckError::BulletinBeforeEdition { .. } => {
                "a bulletin amends an edition already in force; correct the date"
            }
            CheckError::EmptyBulletin { .. } => "add the rules it changes, or remove it",
            CheckError::ExtendsCycle { .. } => {
                "one class of the loop must stand on its own; remove its `extends`"
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
            CheckError::ApprovedAndBanned { .. } => {
                "narrow the pattern so it leaves out the banned part"
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
        };
        fixed.to_string()
    }
}

impl From<CheckError> for Problem {
    fn from(e: CheckError) -> Problem {
        Problem {
            code: e.code(),
            level: e.level(),
            message: e.message(),
            labels: e
                .labels()
                .into_iter()
                .map(|(span, label)| (span, label.to_string()))
                .collect(),
            help: Some(e.help()),
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
    fn unused_names_are_warnings() {
        let unused = CheckError::UnusedDefine {
            name: "spare".to_string(),
            at: Span::default(),
        };
        assert_eq!(unused.level(), Level::Warning);
    }
}
