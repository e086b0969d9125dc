//! Classes: `extends` resolved (unknown and cyclic parents reported), and each class's rules
//! flattened through inheritance, `override`, `drop`, `when` groups and bulletins.

use super::Checker;
use super::error::{CheckError, ClassReference};
use super::model::{Origin, WrittenRule as ClassRule};
use crate::parse::ast::{ClassItem, Condition, Date};
use crate::suggest::closest;

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
    /// Reports unknown and cyclic `extends`, and bulletins that amend no class or are dated
    /// before the edition; remembers the classes whose ancestry is sound.
    pub(super) fn check_class_graph(&mut self) {
        for name in self.class_order.clone() {
            if self.ancestry_is_sound(name) {
                self.sound_classes.insert(name);
            }
        }
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

    fn ancestry_is_sound(&mut self, name: &'a str) -> bool {
        let mut chain = vec![name];
        let mut current = name;
        while let Some(parent) = self.classes.get(current).and_then(|c| c.extends.as_ref()) {
            if !self.classes.contains_key(parent.text.as_str()) {
                if current == name {
                    self.error(
                        CheckError::UnknownClass {
                            name: parent.text.clone(),
                            from: ClassReference::Extends(current.to_string()),
                            suggestion: self.near_class(&parent.text),
                            at: parent.span,
                        }
                        .into(),
                    );
                }
                return false;
            }
            if let Some(at) = chain.iter().position(|c| *c == parent.text.as_str()) {
                let mut members: Vec<&str> = chain[at..].to_vec();
                members.sort_unstable();
                // report each loop once, from its first member in alphabetical order
                if at == 0 && members.first() == Some(&name) {
                    let chain = chain
                        .iter()
                        .chain([&parent.text.as_str()])
                        .map(|c| c.to_string())
                        .collect();
                    self.error(
                        CheckError::ExtendsCycle {
                            chain,
                            at: parent.span,
                        }
                        .into(),
                    );
                }
                return false;
            }
            current = self
                .classes
                .get_key_value(parent.text.as_str())
                .map(|(k, _)| *k)
                .unwrap_or(current);
            chain.push(current);
        }
        true
    }

    /// The class name nearest to `name`, for a "did you mean".
    fn near_class(&self, name: &str) -> Option<String> {
        closest(name, self.classes.keys().copied()).map(str::to_string)
    }

    /// Every sound class flattened at the edition's date and at each later bulletin's date.
    pub(super) fn flatten_all(&mut self) -> Vec<ClassState> {
        let edition_date = self.edition.map(|e| e.effective.date);
        let mut states = Vec::new();
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
                let rules = self.flatten(name, from);
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

    /// The rules of `name` in force from `date` (the edition's date when `None`).
    fn flatten(&mut self, name: &'a str, date: Option<Date>) -> Vec<ClassRule> {
        let Some(class) = self.classes.get(name).copied() else {
            return Vec::new();
        };
        let mut rules = match class.extends.as_ref() {
            Some(parent) => match self.classes.get_key_value(parent.text.as_str()) {
                Some((key, _)) => {
                    let key = *key;
                    self.flatten(key, date)
                }
                None => Vec::new(),
            },
            None => Vec::new(),
        };
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
        rules
    }

    fn apply_body(
        &mut self,
        rules: &mut Vec<ClassRule>,
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
                    let existing = rules
                        .iter()
                        .position(|r| r.rule.section.text == rule.section.text);
                    match (rule.overrides, existing) {
                        (true, Some(i)) if same_rule(&rules[i], &entry) => {
                            self.error(
                                CheckError::OverrideChangesNothing {
                                    section: rule.section.text.clone(),
                                    at: rule.section.span,
                                    replaced: rules[i].rule.section.span,
                                }
                                .into(),
                            );
                            place(rules, existing, entry);
                        }
                        (false, None) | (true, Some(_)) => place(rules, existing, entry),
                        (false, Some(i)) => self.report_duplicate(&rules[i], rule, source),
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
                    } else if let Some(i) = rules
                        .iter()
                        .position(|r| r.rule.section.text == section.text)
                    {
                        rules.remove(i);
                    } else {
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
        && x.penalty == y.penalty
        && x.note == y.note
}

/// Replaces the rule at `at`, or appends a new one.
fn place(rules: &mut Vec<ClassRule>, at: Option<usize>, entry: ClassRule) {
    match at {
        Some(i) => rules[i] = entry,
        None => rules.push(entry),
    }
}
