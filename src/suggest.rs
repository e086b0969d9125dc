//! "Did you mean" suggestions: the known name nearest to a misspelt one, and the one look-up
//! of a class by name that every command and the declaration loader share.

use crate::check::model::{CheckedRulebook, Class};
use crate::diagnostic::Problem;
use crate::diagnostic::codes;
use crate::source::Span;

/// The candidate closest to `word` by Jaro-Winkler similarity, if any is close enough to be a
/// plausible typo. Case is ignored for the comparison, not for the answer.
pub fn closest<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    let lower = word.to_lowercase();
    candidates
        .into_iter()
        .map(|c| (strsim::jaro_winkler(&lower, &c.to_lowercase()), c))
        .filter(|(score, _)| *score >= 0.8)
        .max_by(|a, b| a.0.total_cmp(&b.0))
        .map(|(_, c)| c)
}

/// Where a class was looked for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ClassScope {
    /// One rulebook.
    Rulebook,
    /// Either of two editions (`diff`).
    EitherEdition,
}

/// A class name that names no class: what was written, the nearest known name and every
/// known name.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct UnknownClass {
    /// The name as written.
    pub name: String,
    /// Where it was looked for.
    pub scope: ClassScope,
    /// The known class nearest to it, when one is a plausible typo.
    pub suggestion: Option<String>,
    /// Every known class, in rulebook order.
    pub known: Vec<String>,
}

impl UnknownClass {
    /// Builds the error for `name` among the `known` classes.
    pub fn new(name: &str, scope: ClassScope, known: Vec<String>) -> UnknownClass {
        let suggestion = closest(name, known.iter().map(String::as_str)).map(str::to_string);
        UnknownClass {
            name: name.to_string(),
            scope,
            suggestion,
            known,
        }
    }

    /// The stable code.
    pub fn code(&self) -> codes::Code {
        codes::load::UNKNOWN_CLASS
    }

    /// What is wrong.
    pub fn message(&self) -> String {
        match self.scope {
            ClassScope::Rulebook => format!("the rulebook has no class `{}`", self.name),
            ClassScope::EitherEdition => format!("neither edition has a class `{}`", self.name),
        }
    }

    /// How to fix it: the near name, or every name.
    pub fn help(&self) -> String {
        match &self.suggestion {
            Some(near) => format!("did you mean `{near}`?"),
            None => {
                let all: Vec<String> = self.known.iter().map(|k| format!("`{k}`")).collect();
                format!("the classes are {}", all.join(", "))
            }
        }
    }

    /// The problem, at `span` when the name was written in a file (none for `--class`).
    pub fn problem(&self, span: Option<Span>) -> Problem {
        let problem = match span {
            Some(span) => Problem::error(self.code(), self.message(), span, "unknown class"),
            None => Problem::unlocated(self.code(), self.message()),
        };
        problem.with_help(self.help())
    }
}

/// The class of `rulebook` named `name`, with its position.
pub fn find_class<'r>(
    rulebook: &'r CheckedRulebook,
    name: &str,
) -> Result<(usize, &'r Class), UnknownClass> {
    rulebook
        .classes
        .iter()
        .enumerate()
        .find(|(_, c)| c.name == name)
        .ok_or_else(|| UnknownClass::new(name, ClassScope::Rulebook, class_names(rulebook)))
}

/// Every class name of `rulebook`, in order.
pub fn class_names(rulebook: &CheckedRulebook) -> Vec<String> {
    rulebook.classes.iter().map(|c| c.name.clone()).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_a_near_name_and_rejects_a_far_one() {
        let names = ["displacement", "stroke", "bore"];
        assert_eq!(closest("displacment", names), Some("displacement"));
        assert_eq!(closest("weight", names), None);
    }

    #[test]
    fn an_unknown_class_suggests_the_near_one_or_lists_them_all() {
        let known = vec!["limited2".to_string(), "open4".to_string()];
        let near = UnknownClass::new("limited3", ClassScope::Rulebook, known.clone());
        assert_eq!(near.help(), "did you mean `limited2`?");
        let far = UnknownClass::new("sprint", ClassScope::Rulebook, known);
        assert_eq!(far.help(), "the classes are `limited2`, `open4`");
    }
}
