//! Parts lists and patterns: every regular expression compiled once, under a size limit, with
//! a diagnostic for one that does not compile or is too large, and at most [`MAX_PATTERNS`]
//! of them in a rulebook and its includes together.

use std::collections::HashSet;

use regex::RegexBuilder;

use super::Checker;
use super::error::CheckError;
use super::model::{PartEntry, PartsList};
use crate::parse::ast::{ListEntry, Pattern};
use crate::source::Span;

/// Largest compiled program a pattern may have, in bytes.
pub const PATTERN_SIZE_LIMIT: usize = 256 * 1024;

/// Most patterns a rulebook and its includes may hold together. A compiled pattern of a
/// part number takes a few kilobytes, so this keeps the whole within tens of megabytes
/// (and a quarter of a gigabyte even if every one were near [`PATTERN_SIZE_LIMIT`]); a
/// rulebook that needs more should list its parts as exact entries.
pub const MAX_PATTERNS: usize = 1000;

impl<'a> Checker<'a> {
    /// Compiles every parts list.
    pub(super) fn compile_lists(&mut self) {
        let lists: Vec<_> = self.lists.iter().map(|(k, v)| (*k, *v)).collect();
        for (name, list) in lists {
            let mut entries = Vec::new();
            let mut seen: HashSet<String> = HashSet::new();
            let mut patterns: Vec<(regex::Regex, Span)> = Vec::new();
            for entry in &list.entries {
                match entry {
                    ListEntry::Exact(text) => {
                        let key = if list.ignore_case {
                            text.value.to_lowercase()
                        } else {
                            text.value.clone()
                        };
                        if !seen.insert(key) {
                            self.error(
                                CheckError::DuplicateEntry {
                                    entry: text.value.clone(),
                                    list: name.to_string(),
                                    at: text.span,
                                }
                                .into(),
                            );
                        }
                        entries.push(PartEntry::Exact(text.value.clone()));
                    }
                    ListEntry::Pattern(p) => {
                        if let Some(re) = self.compile_pattern(p, list.ignore_case) {
                            patterns.push((re.clone(), p.span));
                            entries.push(PartEntry::Pattern(re, p.source.clone()));
                        }
                    }
                }
            }
            self.warn_covered_entries(name, &list.entries, &patterns);
            self.compiled_lists.insert(
                name,
                PartsList {
                    name: name.to_string(),
                    kind: list.kind,
                    title: list.title.as_ref().map(|t| t.value.clone()),
                    ignore_case: list.ignore_case,
                    entries,
                    span: list.name.span,
                },
            );
        }
    }

    /// Warns about each exact entry of a list that a pattern of the same list (compiled as the
    /// list reads, `ignoring case` included) already matches: the entry adds nothing.
    fn warn_covered_entries(
        &mut self,
        list: &str,
        entries: &[ListEntry],
        patterns: &[(regex::Regex, Span)],
    ) {
        for entry in entries {
            let ListEntry::Exact(text) = entry else {
                continue;
            };
            if let Some((_, pattern_at)) = patterns.iter().find(|(re, _)| re.is_match(&text.value))
            {
                self.error(
                    CheckError::EntryCoveredByPattern {
                        entry: text.value.clone(),
                        list: list.to_string(),
                        at: text.span,
                        pattern_at: *pattern_at,
                    }
                    .into(),
                );
            }
        }
    }

    /// Warns about each pattern of an approved list that also matches an entry of a banned list:
    /// the rulebook would approve and ban the same part.
    pub(super) fn check_approved_against_banned(&mut self) {
        if self.patterns_compiled > MAX_PATTERNS {
            return; // reported once, where the limit was passed
        }
        let banned: Vec<(&str, String, crate::source::Span)> = self
            .lists
            .values()
            .filter(|l| l.kind == crate::parse::ast::ListKind::Banned)
            .flat_map(|l| {
                l.entries.iter().filter_map(move |e| match e {
                    ListEntry::Exact(t) => Some((l.name.text.as_str(), t.value.clone(), t.span)),
                    ListEntry::Pattern(_) => None,
                })
            })
            .collect();
        let mut found = Vec::new();
        for list in self
            .lists
            .values()
            .filter(|l| l.kind == crate::parse::ast::ListKind::Approved)
        {
            for entry in &list.entries {
                let pattern = match entry {
                    ListEntry::Pattern(pattern) => pattern,
                    ListEntry::Exact(part) => {
                        let same = banned.iter().filter(|(_, id, _)| *id == part.value);
                        for (banned_list, _, span) in same {
                            found.push(
                                CheckError::PartApprovedAndBanned {
                                    part: part.value.clone(),
                                    approved: list.name.text.clone(),
                                    banned: banned_list.to_string(),
                                    at: part.span,
                                    banned_at: *span,
                                }
                                .into(),
                            );
                        }
                        continue;
                    }
                };
                let compiled = RegexBuilder::new(&pattern.source)
                    .case_insensitive(pattern.ignore_case || list.ignore_case)
                    .size_limit(PATTERN_SIZE_LIMIT)
                    .build();
                let Ok(re) = compiled else { continue }; // reported where the list is compiled
                for (banned_list, id, span) in banned.iter().filter(|(_, id, _)| re.is_match(id)) {
                    found.push(
                        CheckError::ApprovedAndBanned {
                            approved: list.name.text.clone(),
                            part: id.clone(),
                            banned: banned_list.to_string(),
                            at: pattern.span,
                            banned_at: *span,
                        }
                        .into(),
                    );
                }
            }
        }
        self.problems.extend(found);
    }

    /// Compiles one pattern, anchored as written, reporting why it cannot be; `ignore_case`
    /// (its list's `ignoring case`) makes it case-insensitive whatever its own flag.
    pub(super) fn compile_pattern(
        &mut self,
        pattern: &Pattern,
        ignore_case: bool,
    ) -> Option<regex::Regex> {
        self.patterns_compiled += 1;
        if self.patterns_compiled > MAX_PATTERNS {
            if self.patterns_compiled == MAX_PATTERNS + 1 {
                self.error(CheckError::TooManyPatterns { at: pattern.span }.into());
            }
            return None;
        }
        let case_insensitive = pattern.ignore_case || ignore_case;
        let key = (pattern.source.clone(), case_insensitive);
        if let Some(re) = self.regex_by_text.get(&key) {
            return Some(re.clone());
        }
        let built = RegexBuilder::new(&pattern.source)
            .case_insensitive(case_insensitive)
            .size_limit(PATTERN_SIZE_LIMIT)
            .build();
        match built {
            Ok(re) => {
                self.regex_by_text.insert(key, re.clone());
                Some(re)
            }
            Err(regex::Error::CompiledTooBig(limit)) => {
                self.error(
                    CheckError::PatternTooLarge {
                        limit,
                        at: pattern.span,
                    }
                    .into(),
                );
                None
            }
            Err(e) => {
                let detail = e.to_string();
                let last = detail
                    .lines()
                    .last()
                    .unwrap_or("")
                    .trim()
                    .trim_start_matches("error: ");
                self.error(
                    CheckError::BadPattern {
                        reason: last.to_string(),
                        at: pattern.span,
                    }
                    .into(),
                );
                None
            }
        }
    }
}
