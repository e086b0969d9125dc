//! The JSON report of `gonogo check`, schema `gonogo.check/1` (documented in README.md).
//! Numbers are given in the unit named beside them, the unit the rulebook wrote the limit in.

use serde::Serialize;

use crate::check::model::Origin;
use crate::evaluate::finding::{Finding, Verdict};
use crate::evaluate::outcome::{Applies, EngineReport, Numeric, Outcome, Trace};
use crate::exit::Exit;
use crate::load::UncertaintySource;
use crate::units::{self, Unit};

/// Schema name and version of the document.
pub const SCHEMA: &str = "gonogo.check/1";

/// The document for one or more engines.
pub fn document(reports: &[EngineReport]) -> String {
    let doc = Document {
        schema: SCHEMA,
        engines: reports.iter().map(engine).collect(),
    };
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

#[derive(Serialize)]
struct Document {
    schema: &'static str,
    engines: Vec<Engine>,
}

#[derive(Serialize)]
struct Engine {
    file: String,
    engine: Option<String>,
    car: Option<String>,
    event: Option<String>,
    date: Option<String>,
    measured_by: Option<String>,
    series: String,
    edition: String,
    effective: String,
    bulletins: Vec<String>,
    class: String,
    decision: &'static str,
    decision_from: &'static str,
    result: &'static str,
    exit_status: u8,
    counts: Counts,
    rules: Vec<Rule>,
}

#[derive(Serialize)]
struct Counts {
    legal: usize,
    illegal: usize,
    not_checked: usize,
    not_applicable: usize,
    conditional: usize,
}

#[derive(Serialize)]
struct Rule {
    section: String,
    title: String,
    verdict: Verdict,
    finding: Option<Finding>,
    applies: Applies,
    requirement: String,
    conditions: Vec<String>,
    from: String,
    penalty: Option<String>,
    note: Option<String>,
    numeric: Option<Number>,
    observed: Option<String>,
    missing: Vec<String>,
    not_finite: bool,
    trace: Vec<TraceEntry>,
}

#[derive(Serialize)]
struct Number {
    unit: Option<&'static str>,
    value: f64,
    limit: f64,
    range: Option<[f64; 2]>,
    margin: f64,
    expanded_uncertainty: f64,
    coverage_factor: f64,
    probability_of_conformance: f64,
    cylinder: Option<usize>,
}

#[derive(Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
enum TraceEntry {
    Input {
        label: String,
        unit: Option<&'static str>,
        value: f64,
        standard_uncertainty: f64,
        uncertainty_from: String,
        origin: String,
    },
    Text {
        label: String,
        value: String,
        origin: String,
    },
    Derived {
        name: String,
        formula: String,
        unit: Option<&'static str>,
        values: Vec<f64>,
        standard_uncertainties: Vec<f64>,
    },
    Missing {
        name: String,
    },
}

fn engine(r: &EngineReport) -> Engine {
    let [legal, illegal, not_checked, not_applicable] = r.counts();
    let exit = r.exit();
    let id = &r.declaration.identity;
    Engine {
        file: r.declaration.path.display().to_string(),
        engine: id.engine.clone(),
        car: id.car.clone(),
        event: id.event.clone(),
        date: id.date.map(|d| d.to_string()),
        measured_by: id.measured_by.clone(),
        series: r.rulebook.series.clone(),
        edition: r.rulebook.edition.clone(),
        effective: r.rulebook.effective.to_string(),
        bulletins: r.bulletins.to_vec(),
        class: r.class.name.clone(),
        decision: r.decision.words(),
        decision_from: if r.decision_overridden {
            "command line"
        } else {
            "rulebook"
        },
        result: match exit {
            Exit::Illegal => "illegal",
            Exit::Uncertain => "not_all_clear",
            _ => "legal",
        },
        exit_status: exit as u8,
        counts: Counts {
            legal,
            illegal,
            not_checked,
            not_applicable,
            conditional: r.conditional_count(),
        },
        rules: r.outcomes.iter().map(|o| rule(o, r)).collect(),
    }
}

fn rule(o: &Outcome, r: &EngineReport) -> Rule {
    Rule {
        section: o.section().to_string(),
        title: o.title().to_string(),
        verdict: o.verdict,
        finding: o.checked.as_ref().map(|c| c.finding),
        applies: o.applies,
        requirement: o.rule.requirement.clone(),
        conditions: o.rule.condition_texts.clone(),
        from: match &o.rule.origin {
            Origin::Class(c) => format!("class {c}"),
            Origin::Bulletin(b) => format!("bulletin {b}"),
        },
        penalty: o.penalty().map(str::to_string),
        note: o.note().map(str::to_string),
        numeric: o
            .checked
            .as_ref()
            .and_then(|c| c.numeric.as_ref())
            .map(number),
        observed: o.checked.as_ref().and_then(|c| c.observed.clone()),
        missing: o.missing.clone(),
        not_finite: o.not_finite,
        trace: o.trace.iter().map(|t| trace(t, r)).collect(),
    }
}

fn scale(unit: Option<&Unit>) -> f64 {
    unit.map_or(1.0, |u| u.to_si)
}

fn number(n: &Numeric) -> Number {
    let s = scale(n.unit);
    Number {
        unit: n.unit.map(|u| u.symbol),
        value: n.value / s,
        limit: n.limit / s,
        range: n.range.map(|(a, b)| [a / s, b / s]),
        margin: n.margin / s,
        expanded_uncertainty: n.expanded / s,
        coverage_factor: n.k,
        probability_of_conformance: n.probability,
        cylinder: n.cylinder,
    }
}

fn trace(t: &Trace, r: &EngineReport) -> TraceEntry {
    match t {
        Trace::Input(id) => {
            let input = r.input(*id);
            let unit = input.unit.and_then(units::lookup);
            TraceEntry::Input {
                label: input.label(r.rulebook),
                unit: unit.map(|u| u.symbol),
                value: input.value / scale(unit),
                standard_uncertainty: input.standard_uncertainty / scale(unit),
                uncertainty_from: match &input.source {
                    UncertaintySource::Stated { k } => format!("stated, k = {k}"),
                    UncertaintySource::Instrument(i) => format!("instrument {i}"),
                    UncertaintySource::Rulebook => "rulebook".to_string(),
                    UncertaintySource::None => "none stated".to_string(),
                },
                origin: input.origin(r.rulebook),
            }
        }
        Trace::Text { name, value, place } => TraceEntry::Text {
            label: name.to_string(),
            value: value.to_string(),
            origin: format!("{}.{name}", place.key()),
        },
        Trace::Derived {
            derived,
            values,
            uncertainties,
        } => {
            let unit = derived_unit(derived);
            TraceEntry::Derived {
                name: derived.name.clone(),
                formula: derived.formula.clone(),
                unit: unit.map(|u| u.symbol),
                values: values.iter().map(|v| v / scale(unit)).collect(),
                standard_uncertainties: uncertainties.iter().map(|u| u / scale(unit)).collect(),
            }
        }
        Trace::Missing { name } => TraceEntry::Missing {
            name: name.to_string(),
        },
    }
}

/// The unit a derived value is shown in.
pub fn derived_unit(d: &crate::check::model::Derived) -> Option<&'static Unit> {
    match d.ty.kind {
        crate::check::model::ValueKind::Number(dim) => units::display_unit(dim),
        crate::check::model::ValueKind::Text => None,
    }
}
