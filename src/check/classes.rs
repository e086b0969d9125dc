//! Classes: `extends` resolved (unknown and cyclic parents reported), and each class's rules
//! flattened through inheritance, `override`, `drop`, `when` groups and bulletins.

use std::collections::{BTreeMap, HashMap, HashSet};

use super::Checker;
use super::error::{CheckError, ClassReference};
use super::model::{Origin, WrittenRule as ClassRule};
use crate::parse::ast::{ClassItem, Condition, Date};
use crate::suggest::closest;

/// Most `extends` a class may stand below the root class of its chain. Flattening a class
/// copies every rule of the classes above it, so a longer chain would make the work grow
/// with the square of its length; real series nest classes two or three deep.
pub const MAX_EXTENDS: usize = 64;

/// Most rules the classes may hold together once flattened: every class at the edition's date
/// and at each later bulletin's date, each counting the rules it inherits. A class copies
/// every rule it inherits, so many classes extending one large class multiply its rules
/// (2,000 classes extending one of 5,000 rules took 71 s and 24 GB); a real series holds a
/// few thousand.
pub const MAX_RULES: usize = 25_000;

/// The classes flattened so far, by class and date, so that each is flattened once however
/// many classes extend it, and the count of their rules against [`MAX_RULES`]. Only a class
/// some class extends is kept (`parents`): any other is flattened once at each of its dates,
/// so a copy kept of its rules would never be read.
#[derive(Default)]
struct Flattened<'a> {
    done: BTreeMap<(&'a str, Option<Date>), Vec<ClassRule>>,
    parents: HashSet<&'a str>,
    rules: usize,
    over: bool,
}

/// What the walk up a class's `extends` found.
#[derive(Clone, Copy, Debug)]
enum Ancestry<'a> {
    /// Every class above is known, and the chain is within [`MAX_EXTENDS`].
    Sound {
        /// How many `extends` below the root.
        depth: usize,
        /// The class at the top.
        root: &'a str,
    },
    /// The chain reaches an unknown class, a loop or a class too deep.
    Unsound,
}

/// A class's rules as they stand from one date on.
pub(super) struct ClassState {
    /// The class.
    pub class: String,
    /// From when: the edition's date or a bulletin's.
    pub from: Option<Date>,
    /// The rules in force.
    pub rules: Vec<ClassRule>,
}

/// Where a body being applied comes from.
#[derive(Clone)]
struct Source {
    origin: Origin,
    /// The class the body belongs to (for a bulletin, the class it amends).
    class: String,
}

impl<'a> Checker<'a> {
    /// Reports unknown, cyclic and too long `extends`, and bulletins that amend no class or
    /// are dated before the edition; remembers the classes whose ancestry is sound.
    pub(super) fn check_class_graph(&mut self) {
        let ancestry = self.resolve_ancestry();
        self.sound_classes.extend(
            ancestry
                .into_iter()
                .filter(|(_, a)| matches!(a, Ancestry::Sound { .. }))
                .map(|(name, _)| name),
        );
        for bulletin in self.bulletins.clone() {
            if !self.classes.contains_key(bulletin.amends.text.as_str()) {
                self.error(
                    CheckError::UnknownClass {
                        name: bulletin.amends.text.clone(),
                        from: ClassReference::Amends(bulletin.id.value.clone()),
                        suggestion: self.near_class(&bulletin.amends.text),
                        at: bulletin.amends.span,
                    }
                    .into(),
                );
            }
            if let Some(edition) = self.edition
                && bulletin.effective.date < edition.effective.date
            {
                self.error(
                    CheckError::BulletinBeforeEdition {
                        id: bulletin.id.value.clone(),
                        date: bulletin.effective.date,
                        edition_date: edition.effective.date,
                        at: bulletin.effective.span,
                        edition_at: edition.effective.span,
                    }
                    .into(),
                );
            }
            if bulletin.body.is_empty() {
                self.error(
                    CheckError::EmptyBulletin {
                        id: bulletin.id.value.clone(),
                        at: bulletin.id.span,
                    }
                    .into(),
                );
            }
        }
    }

    /// The ancestry of every class, each class visited once: a walk up the `extends` links
    /// stops at a root, at a class already resolved, at an unknown parent or where the walk
    /// meets itself (a loop). Each unknown parent and each loop is reported once, and so is
    /// each class that stands one step deeper than [`MAX_EXTENDS`].
    fn resolve_ancestry(&mut self) -> HashMap<&'a str, Ancestry<'a>> {
        let mut resolved: HashMap<&'a str, Ancestry<'a>> = HashMap::new();
        for name in self.class_order.clone() {
            let mut path: Vec<&'a str> = Vec::new();
            let mut on_path: HashMap<&'a str, usize> = HashMap::new();
            let mut current = name;
            let end = loop {
                if let Some(known) = resolved.get(current) {
                    break *known;
                }
                if let Some(&at) = on_path.get(current) {
                    self.report_cycle(&path[at..]);
                    break Ancestry::Unsound;
                }
                on_path.insert(current, path.len());
                path.push(current);
                let Some(parent) = self.classes.get(current).and_then(|c| c.extends.as_ref())
                else {
                    path.pop();
                    resolved.insert(
                        current,
                        Ancestry::Sound {
                            depth: 0,
                            root: current,
                        },
                    );
                    break Ancestry::Sound {
                        depth: 0,
                        root: current,
                    };
                };
                match self.classes.get_key_value(parent.text.as_str()) {
                    Some((key, _)) => current = key,
                    None => {
                        self.error(
                            CheckError::UnknownClass {
                                name: parent.text.clone(),
                                from: ClassReference::Extends(current.to_string()),
                                suggestion: self.near_class(&parent.text),
                                at: parent.span,
                            }
                            .into(),
                        );
                        break Ancestry::Unsound;
                    }
                }
            };
            self.settle_path(&path, end, &mut resolved);
        }
        resolved
    }

    /// Gives each class of a walked path, from the top down, its ancestry below `end`.
    fn settle_path(
        &mut self,
        path: &[&'a str],
        end: Ancestry<'a>,
        resolved: &mut HashMap<&'a str, Ancestry<'a>>,
    ) {
        let mut above = end;
        for &class in path.iter().rev() {
            above = match above {
                Ancestry::Sound { depth, root } if depth < MAX_EXTENDS => Ancestry::Sound {
                    depth: depth + 1,
                    root,
                },
                Ancestry::Sound { root, .. } => {
                    if let Some(at) = self
                        .classes
                        .get(class)
                        .and_then(|c| c.extends.as_ref())
                        .map(|e| e.span)
                    {
                        self.error(
                            CheckError::ExtendsTooLong {
                                class: class.to_string(),
                                root: root.to_string(),
                                at,
                            }
                            .into(),
                        );
                    }
                    Ancestry::Unsound
                }
                Ancestry::Unsound => Ancestry::Unsound,
            };
            resolved.insert(class, above);
        }
    }

    /// Reports a loop of classes once, starting from its first member in alphabetical order.
    fn report_cycle(&mut self, members: &[&'a str]) {
        let Some(first) = members
            .iter()
            .enumerate()
            .min_by_key(|(_, name)| **name)
            .map(|(i, _)| i)
        else {
            return;
        };
        let mut chain: Vec<String> = members[first..]
            .iter()
            .chain(&members[..first])
            .map(|c| c.to_string())
            .collect();
        let last = chain.last().cloned().unwrap_or_default();
        let Some(at) = self
            .classes
            .get(last.as_str())
            .and_then(|c| c.extends.as_ref())
            .map(|e| e.span)
        else {
            return;
        };
        chain.push(chain[0].clone());
        self.error(CheckError::ExtendsCycle { chain, at }.into());
    }

    /// The class name nearest to `name`, for a "did you mean".
    fn near_class(&self, name: &str) -> Option<String> {
        closest(name, self.classes.keys().copied()).map(str::to_string)
    }

    /// Whether the rules as written, in every class and bulletin, are within [`MAX_RULES`];
    /// if not, the first past it is reported and nothing is typed or flattened, so the work
    /// stops at a cost linear in the text.
    pub(super) fn rules_within_cap(&mut self) -> bool {
        let bodies = self
            .classes
            .values()
            .map(|c| (c.name.text.as_str(), c.body.as_slice()))
            .chain(
                self.bulletins
                    .iter()
                    .map(|b| (b.amends.text.as_str(), b.body.as_slice())),
            );
        let mut count = 0;
        let mut past = None;
        for (class, body) in bodies {
            past = past_the_cap(class, body, &mut count);
            if past.is_some() {
                break;
            }
        }
        let Some((class, at)) = past else {
            return true;
        };
        self.error(
            CheckError::TooManyRules {
                class: class.to_string(),
                limit: MAX_RULES,
                inherited: false,
                at,
            }
            .into(),
        );
        false
    }

    /// Every sound class flattened at the edition's date and at each later bulletin's date.
    pub(super) fn flatten_all(&mut self) -> Vec<ClassState> {
        let edition_date = self.edition.map(|e| e.effective.date);
        let mut states = Vec::new();
        let mut flattened = Flattened {
            parents: self
                .classes
                .values()
                .filter_map(|c| c.extends.as_ref())
                .filter_map(|p| self.classes.get_key_value(p.text.as_str()))
                .map(|(key, _)| *key)
                .collect(),
            ..Flattened::default()
        };
        for name in self.class_order.clone() {
            if !self.sound_classes.contains(name) {
                continue;
            }
            let mut dates = vec![edition_date];
            for b in &self.bulletins {
                if self.is_ancestor_or_self(b.amends.text.as_str(), name)
                    && Some(b.effective.date) > edition_date
                {
                    dates.push(Some(b.effective.date));
                }
            }
            dates.sort();
            dates.dedup();
            for from in dates {
                let rules = self.flatten(name, from, &mut flattened);
                states.push(ClassState {
                    class: name.to_string(),
                    from,
                    rules,
                });
            }
        }
        states
    }

    /// The bulletins on `class` or a class it extends in force by `date`, in order of date.
    pub(super) fn bulletins_in_force(&self, class: &str, date: Date) -> Vec<String> {
        let mut applied: Vec<_> = self
            .bulletins
            .iter()
            .filter(|b| {
                b.effective.date <= date && self.is_ancestor_or_self(b.amends.text.as_str(), class)
            })
            .map(|b| (b.effective.date, b.id.value.clone()))
            .collect();
        applied.sort();
        applied.into_iter().map(|(_, id)| id).collect()
    }

    fn is_ancestor_or_self(&self, ancestor: &str, class: &str) -> bool {
        let mut current = Some(class);
        let mut steps = 0;
        while let Some(c) = current {
            if c == ancestor {
                return true;
            }
            steps += 1;
            if steps > self.classes.len() {
                return false;
            }
            current = self
                .classes
                .get(c)
                .and_then(|k| k.extends.as_ref())
                .map(|n| n.text.as_str());
        }
        false
    }

    /// The rules of `name` in force from `date` (the edition's date when `None`), flattened
    /// once and remembered in `flattened`; none once the classes hold more than [`MAX_RULES`].
    fn flatten(
        &mut self,
        name: &'a str,
        date: Option<Date>,
        flattened: &mut Flattened<'a>,
    ) -> Vec<ClassRule> {
        if let Some(done) = flattened.done.get(&(name, date)) {
            return done.clone();
        }
        let Some(class) = self.classes.get(name).copied() else {
            return Vec::new();
        };
        if flattened.over {
            return Vec::new();
        }
        let inherited = match class.extends.as_ref() {
            Some(parent) => match self.classes.get_key_value(parent.text.as_str()) {
                Some((key, _)) => {
                    let key = *key;
                    self.flatten(key, date, flattened)
                }
                None => Vec::new(),
            },
            None => Vec::new(),
        };
        let rules = self.flatten_own(name, class, date, inherited);
        flattened.rules += rules.len();
        if flattened.rules > MAX_RULES {
            if !flattened.over {
                self.error(
                    CheckError::TooManyRules {
                        class: name.to_string(),
                        limit: MAX_RULES,
                        inherited: true,
                        at: class.name.span,
                    }
                    .into(),
                );
            }
            flattened.over = true;
            return Vec::new();
        }
        if flattened.parents.contains(name) {
            flattened.done.insert((name, date), rules.clone());
        }
        rules
    }

    /// The rules of one class from `date` on: what it inherits, then its body, then its
    /// bulletins in force by then.
    fn flatten_own(
        &mut self,
        name: &'a str,
        class: &'a crate::parse::ast::Class,
        date: Option<Date>,
        inherited: Vec<ClassRule>,
    ) -> Vec<ClassRule> {
        let mut rules = Flat::new(inherited);
        rules.reserve(rules_in(&class.body));
        let own = Source {
            origin: Origin::Class(name.to_string()),
            class: name.to_string(),
        };
        self.apply_body(&mut rules, &class.body, &mut Vec::new(), &own);
        let mut bulletins: Vec<_> = self
            .bulletins
            .iter()
            .filter(|b| b.amends.text == name && date.is_some_and(|d| b.effective.date <= d))
            .copied()
            .collect();
        bulletins.sort_by_key(|b| b.effective.date);
        for b in bulletins {
            let source = Source {
                origin: Origin::Bulletin(b.id.value.clone()),
                class: name.to_string(),
            };
            self.apply_body(&mut rules, &b.body, &mut Vec::new(), &source);
        }
        rules.into_rules()
    }

    fn apply_body(
        &mut self,
        rules: &mut Flat,
        body: &'a [ClassItem],
        conditions: &mut Vec<Condition>,
        source: &Source,
    ) {
        for item in body {
            match item {
                ClassItem::Rule(rule) => {
                    let mut all = conditions.clone();
                    all.extend(rule.condition.clone());
                    let entry = ClassRule::new(rule.clone(), all, source.origin.clone());
                    let existing = rules.find(&rule.section.text);
                    match (rule.overrides, existing) {
                        (true, Some(old)) if same_rule(old, &entry) => {
                            self.error(
                                CheckError::OverrideChangesNothing {
                                    section: rule.section.text.clone(),
                                    at: rule.section.span,
                                    replaced: old.rule.section.span,
                                }
                                .into(),
                            );
                            rules.place(entry);
                        }
                        (false, None) | (true, Some(_)) => rules.place(entry),
                        (false, Some(old)) => {
                            let old = old.clone();
                            self.report_duplicate(&old, rule, source);
                        }
                        (true, None) => self.report_nothing_to_override(rule, source),
                    }
                }
                ClassItem::When(group) => {
                    conditions.push(group.condition.clone());
                    self.apply_body(rules, &group.body, conditions, source);
                    conditions.pop();
                }
                ClassItem::Drop(section) => {
                    if !conditions.is_empty() {
                        self.error(
                            CheckError::ConditionalDrop {
                                section: section.text.clone(),
                                at: section.span,
                            }
                            .into(),
                        );
                    } else if !rules.remove(&section.text) {
                        self.error(
                            CheckError::NothingToDrop {
                                class: source.class.clone(),
                                section: section.text.clone(),
                                at: section.span,
                            }
                            .into(),
                        );
                    }
                }
            }
        }
    }

    fn report_duplicate(
        &mut self,
        existing: &ClassRule,
        rule: &crate::parse::ast::Rule,
        source: &Source,
    ) {
        let (section, at, first) = (
            rule.section.text.clone(),
            rule.section.span,
            existing.rule.section.span,
        );
        let error = if existing.origin == source.origin {
            CheckError::DuplicateSection {
                class: source.class.clone(),
                section,
                at,
                first,
            }
        } else {
            CheckError::SectionClash {
                section,
                from: existing.origin.clone(),
                at,
                first,
            }
        };
        self.error(error.into());
    }

    fn report_nothing_to_override(&mut self, rule: &crate::parse::ast::Rule, source: &Source) {
        self.error(
            CheckError::NothingToOverride {
                class: source.class.clone(),
                section: rule.section.text.clone(),
                at: rule.section.span,
            }
            .into(),
        );
    }
}

/// Whether two versions of a rule say the same thing (the origin aside).
fn same_rule(a: &ClassRule, b: &ClassRule) -> bool {
    let (x, y) = (&a.rule, &b.rule);
    a.requirement == b.requirement
        && a.condition_texts == b.condition_texts
        && x.title == y.title
        && x.decision == y.decision
        && x.penalty == y.penalty
        && x.note == y.note
}

/// Counts the rules of `body` (in `when` groups too) into `count`; the class and section of
/// the first that brings it past [`MAX_RULES`].
fn past_the_cap<'b>(
    class: &'b str,
    body: &'b [ClassItem],
    count: &mut usize,
) -> Option<(&'b str, crate::source::Span)> {
    for item in body {
        match item {
            ClassItem::Rule(rule) => {
                *count += 1;
                if *count > MAX_RULES {
                    return Some((class, rule.section.span));
                }
            }
            ClassItem::When(group) => {
                if let Some(past) = past_the_cap(class, &group.body, count) {
                    return Some(past);
                }
            }
            ClassItem::Drop(_) => {}
        }
    }
    None
}

/// A class's rules while its body and bulletins are applied: in order, with each found by
/// its section number in constant time. A dropped rule leaves a hole, closed at the end, so
/// that neither finding, replacing nor dropping grows with the number of rules.
struct Flat {
    rules: Vec<Option<ClassRule>>,
    by_section: HashMap<String, usize>,
}

/// The rules a class body writes, those under `when` included.
fn rules_in(body: &[ClassItem]) -> usize {
    body.iter()
        .map(|item| match item {
            ClassItem::Rule(_) => 1,
            ClassItem::When(group) => rules_in(&group.body),
            _ => 0,
        })
        .sum()
}

impl Flat {
    /// Starts from the rules a class inherits.
    fn new(inherited: Vec<ClassRule>) -> Flat {
        let by_section = inherited
            .iter()
            .enumerate()
            .map(|(i, r)| (r.rule.section.text.clone(), i))
            .collect();
        Flat {
            rules: inherited.into_iter().map(Some).collect(),
            by_section,
        }
    }

    /// Room for `more` rules placed after these.
    fn reserve(&mut self, more: usize) {
        self.rules.reserve(more);
    }

    /// The rule with this section number.
    fn find(&self, section: &str) -> Option<&ClassRule> {
        let at = *self.by_section.get(section)?;
        self.rules.get(at)?.as_ref()
    }

    /// Replaces the rule with the entry's section number where it stands, or appends it.
    fn place(&mut self, entry: ClassRule) {
        match self.by_section.get(&entry.rule.section.text) {
            Some(&at) => self.rules[at] = Some(entry),
            None => {
                self.by_section
                    .insert(entry.rule.section.text.clone(), self.rules.len());
                self.rules.push(Some(entry));
            }
        }
    }

    /// Drops the rule with this section number; false when there is none.
    fn remove(&mut self, section: &str) -> bool {
        match self.by_section.remove(section) {
            Some(at) => {
                self.rules[at] = None;
                true
            }
            None => false,
        }
    }

    /// The rules in section order, whichever class or bulletin placed them: numbered parts
    /// compare as numbers, so 4.10 follows 4.9 (a stable sort keeps equal numbers as placed).
    fn into_rules(self) -> Vec<ClassRule> {
        // room for every rule at once: a rule is large, and growing copies them all
        let mut rules: Vec<ClassRule> = Vec::with_capacity(self.rules.len());
        rules.extend(self.rules.into_iter().flatten());
        rules.sort_by_cached_key(|r| section_key(&r.rule.section.text));
        rules
    }
}

/// The sort key of a section number: each dot-separated part as a number where it starts
/// with digits (`4.10` → 4, 10), the rest of the part as text (`4.6a` → 4, 6, "a").
pub fn section_key(section: &str) -> Vec<(u64, String)> {
    section
        .split('.')
        .map(|part| {
            let digits = part.len() - part.trim_start_matches(|c: char| c.is_ascii_digit()).len();
            let number = part[..digits].parse().unwrap_or(u64::MAX);
            (number, part[digits..].to_string())
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::section_key;

    #[test]
    fn sections_sort_by_their_numbers() {
        // a rulebook's section numbers are read part by part as numbers (common practice,
        // no source): 4.9 before 4.10, 4.6 before 4.6a, 8.2 before 10.1
        let mut sections = ["10.1", "4.10", "4.6a", "8.2", "4.9", "4.6", "3.1"];
        sections.sort_by_key(|s| section_key(s));
        assert_eq!(
            sections,
            ["3.1", "4.6", "4.6a", "4.9", "4.10", "8.2", "10.1"]
        );
    }
}
