//! What hovering over a name shows, in Markdown: a measurement's dimension, unit, range and
//! procedure; a derived value's formula and type; a rule in plain words as `gonogo explain`
//! gives it; a unit's dimension and its factor to SI; a list's and a class's title and size;
//! a built-in function's meaning.

use super::index::{Kind, Occurrence};
use super::workspace::Analysis;
use crate::check::builtins;
use crate::parse::ast::{ClassItem, Item, ListKind, Measure, Rulebook};
use crate::parse::print::{expr_text, test_text};
use crate::report::explain;
use crate::units;

/// The hover text for the occurrence, if there is something to say.
pub fn text(analysis: &Analysis, at: &Occurrence) -> Option<String> {
    match at.kind {
        Kind::Value => value(analysis, &at.name),
        Kind::Rule => rule(analysis, at),
        Kind::Unit => unit(&at.name),
        Kind::List => list(analysis, &at.name),
        Kind::Class => class(analysis, &at.name),
        Kind::Function => function(&at.name),
    }
}

fn books(analysis: &Analysis) -> impl Iterator<Item = &Rulebook> {
    analysis.loaded.files.files.iter().map(|(_, b)| b)
}

fn items(analysis: &Analysis) -> impl Iterator<Item = &Item> {
    books(analysis).flat_map(|b| b.items.iter())
}

fn value(analysis: &Analysis, name: &str) -> Option<String> {
    for item in items(analysis) {
        match item {
            Item::Measure(m) if m.name.text == name => return Some(measure(analysis, m)),
            Item::Define(d) if d.name.text == name => {
                let mut out = format!(
                    "**{name}**: derived value\n\n    {name} = {}\n",
                    expr_text(&d.expr)
                );
                let checked = analysis.loaded.checked.as_ref();
                if let Some(derived) = checked.and_then(|c| c.derived_value(name)) {
                    let per = if derived.ty.per_cylinder {
                        ", per cylinder"
                    } else {
                        ""
                    };
                    out.push_str(&format!("\n{}{per}\n", derived.ty.kind));
                }
                return Some(out);
            }
            _ => {}
        }
    }
    None
}

fn measure(analysis: &Analysis, m: &Measure) -> String {
    let mut out = format!("**{}**: measurement, {}", m.name.text, m.dimension.text);
    if m.per_cylinder {
        out.push_str(" per cylinder");
    }
    out.push_str(if m.required {
        ", required"
    } else {
        ", optional"
    });
    out.push('\n');
    let checked = analysis.loaded.checked.as_ref();
    if let Some(unit) = checked
        .and_then(|c| c.measurement(&m.name.text))
        .and_then(|x| x.unit)
    {
        out.push_str(&format!("\nunit: {unit}\n"));
    }
    if let Some((low, high)) = &m.range {
        out.push_str(&format!(
            "\nrange: {} to {}\n",
            expr_text(low),
            expr_text(high)
        ));
    }
    if let Some(p) = &m.procedure {
        out.push_str(&format!("\nprocedure: {}\n", p.value));
    }
    out
}

fn rule(analysis: &Analysis, at: &Occurrence) -> Option<String> {
    let class = at.class.as_deref()?;
    if let Some(checked) = &analysis.loaded.checked {
        let found = explain::find(checked, Some(class), &at.name);
        if !found.is_empty() {
            let words: Vec<String> = found
                .iter()
                .map(|f| explain::explain(checked, &analysis.loaded.sources, f))
                .collect();
            return Some(format!("```text\n{}```\n", words.join("\n")));
        }
    }
    // the rulebook has errors: the rule as written
    for item in items(analysis) {
        let body = match item {
            Item::Class(c) if c.name.text == class => &c.body,
            Item::Bulletin(b) if b.amends.text == class => &b.body,
            _ => continue,
        };
        if let Some(text) = written_rule(body, &at.name) {
            return Some(text);
        }
    }
    None
}

fn written_rule(body: &[ClassItem], section: &str) -> Option<String> {
    body.iter().find_map(|item| match item {
        ClassItem::Rule(r) if r.section.text == section => Some(format!(
            "**{} \"{}\"**\n\n    require {}\n\n(the rulebook has errors: fix them for the full explanation)\n",
            r.section.text,
            r.title.value,
            test_text(&r.require)
        )),
        ClassItem::When(w) => written_rule(&w.body, section),
        _ => None,
    })
}

fn unit(symbol: &str) -> Option<String> {
    let u = units::lookup(symbol)?;
    let groups = units::by_dimension();
    let group = groups.iter().find(|g| g.dimension == u.dimension)?;
    let mut out = format!(
        "**{}**: unit of {}\n\n1 {} = {} {}",
        u.symbol, group.name, u.symbol, u.to_si, group.si_unit
    );
    match u.exact {
        Some(r) if r.denominator != 1 => {
            out.push_str(&format!(" exactly ({}/{})", r.numerator, r.denominator))
        }
        Some(_) => out.push_str(" exactly"),
        None => out.push_str(" (no exact fraction)"),
    }
    out.push_str("\n\nfactors from NIST SP 811, Appendix B.8; `gonogo units` lists them all\n");
    Some(out)
}

fn list(analysis: &Analysis, name: &str) -> Option<String> {
    items(analysis).find_map(|item| match item {
        Item::List(l) if l.name.text == name => {
            let kind = match l.kind {
                ListKind::Approved => "approved",
                ListKind::Banned => "banned",
            };
            let title = l
                .title
                .as_ref()
                .map(|t| format!(" \"{}\"", t.value))
                .unwrap_or_default();
            Some(format!(
                "**{name}**: {kind} list{title}, {} entries\n",
                l.entries.len()
            ))
        }
        _ => None,
    })
}

fn class(analysis: &Analysis, name: &str) -> Option<String> {
    items(analysis).find_map(|item| match item {
        Item::Class(c) if c.name.text == name => {
            let title = c
                .title
                .as_ref()
                .map(|t| format!(" \"{}\"", t.value))
                .unwrap_or_default();
            let parent = c
                .extends
                .as_ref()
                .map(|p| format!(", extends {}", p.text))
                .unwrap_or_default();
            let rules = analysis
                .loaded
                .checked
                .as_ref()
                .and_then(|k| k.class(name))
                .map(|k| format!("\n\n{} rules in force from the edition", k.rules.len()))
                .unwrap_or_default();
            Some(format!("**{name}**: class{title}{parent}{rules}\n"))
        }
        _ => None,
    })
}

fn function(name: &str) -> Option<String> {
    if let Some(f) = builtins::formula(name) {
        let params: Vec<&str> = f.params.iter().map(|p| p.name).collect();
        return Some(format!(
            "**{name}**({}): {}\n\nsource: {}\n",
            params.join(", "),
            f.summary,
            f.source
        ));
    }
    builtins::GENERICS
        .iter()
        .find(|(n, _)| *n == name)
        .map(|(n, g)| format!("**{n}**: {}\n", g.summary()))
}
