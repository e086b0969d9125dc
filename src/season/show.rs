//! The season log as documents: a listing of inspections (table, JSON, CSV), one engine's
//! history (text, JSON, HTML with a small plot per changed measurement) and the report of a
//! verification. Nothing here reads the log; [`super::query`] and [`super::verify`] do.

use std::fmt::Write as _;

use serde_json::{Value, json};

use super::query::Stored;
use super::seals::{Changes, SealMismatch, compare, measurements};
use super::verify::Verification;
use crate::report::html::escape;

/// How `season list` writes its listing.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum ListFormat {
    /// Aligned columns for a terminal.
    Table,
    /// One JSON array of inspections.
    Json,
    /// Comma-separated values with a header line (RFC 4180 quoting).
    Csv,
}

/// How `season history` writes an engine's history.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum HistoryFormat {
    /// Plain text.
    Text,
    /// One JSON document.
    Json,
    /// A page with one small plot per changed measurement.
    Html,
}

const HEADERS: [&str; 8] = [
    "#",
    "date",
    "event",
    "engine",
    "car",
    "class",
    "result",
    "measured by",
];

fn cells(stored: &Stored) -> [String; 8] {
    let e = &stored.entry;
    let or_dash = |v: &Option<String>| v.clone().unwrap_or_else(|| "-".to_string());
    [
        stored.seq.to_string(),
        or_dash(&e.date),
        or_dash(&e.event),
        or_dash(&e.engine),
        or_dash(&e.car),
        e.class.clone(),
        e.result.clone(),
        or_dash(&e.measured_by),
    ]
}

/// The listing in `format`.
pub fn list(rows: &[Stored], format: ListFormat) -> String {
    match format {
        ListFormat::Table => table(rows),
        ListFormat::Json => {
            let items: Vec<Value> = rows.iter().map(list_item).collect();
            pretty(&Value::Array(items))
        }
        ListFormat::Csv => csv(rows),
    }
}

fn table(rows: &[Stored]) -> String {
    let lines: Vec<[String; 8]> = rows.iter().map(cells).collect();
    let mut widths = HEADERS.map(|h| h.chars().count());
    for line in &lines {
        for (w, cell) in widths.iter_mut().zip(line) {
            *w = (*w).max(cell.chars().count());
        }
    }
    let render = |cells: &[String]| -> String {
        let joined: Vec<String> = cells
            .iter()
            .zip(widths)
            .map(|(c, w)| format!("{c:<w$}"))
            .collect();
        format!("{}\n", joined.join("  ").trim_end())
    };
    let mut out = render(&HEADERS.map(str::to_string));
    for line in &lines {
        out.push_str(&render(line));
    }
    let _ = writeln!(out, "{} inspection(s)", rows.len());
    out
}

fn csv(rows: &[Stored]) -> String {
    let quote = |c: &str| {
        if c.contains([',', '"', '\n', '\r']) {
            format!("\"{}\"", c.replace('"', "\"\""))
        } else {
            c.to_string()
        }
    };
    let header = "seq,date,event,engine,car,class,result,measured_by,decision,gonogo_version,\
                  entry_hash";
    let mut out = format!("{header}\r\n");
    for stored in rows {
        let e = &stored.entry;
        let opt = |v: &Option<String>| v.clone().unwrap_or_default();
        let fields = [
            stored.seq.to_string(),
            opt(&e.date),
            opt(&e.event),
            opt(&e.engine),
            opt(&e.car),
            e.class.clone(),
            e.result.clone(),
            opt(&e.measured_by),
            e.decision.clone(),
            e.gonogo_version.clone(),
            stored.entry_hash.clone(),
        ];
        let line: Vec<String> = fields.iter().map(|f| quote(f)).collect();
        let _ = write!(out, "{}\r\n", line.join(","));
    }
    out
}

fn list_item(stored: &Stored) -> Value {
    let e = &stored.entry;
    json!({
        "seq": stored.seq,
        "date": e.date,
        "event": e.event,
        "engine": e.engine,
        "car": e.car,
        "class": e.class,
        "result": e.result,
        "measured_by": e.measured_by,
        "reason": e.reason,
        "reference": e.reference,
        "scope": e.scope,
        "decision": e.decision,
        "gonogo_version": e.gonogo_version,
        "recorded_at": e.recorded_at,
        "rulebook_sha256": e.rulebook,
        "declaration_sha256": e.declaration,
        "entry_hash": stored.entry_hash,
    })
}

fn pretty(value: &Value) -> String {
    let mut text = serde_json::to_string_pretty(value).unwrap_or_default();
    text.push('\n');
    text
}

/// One engine's history: each inspection, with what changed since the one before.
pub fn history(engine: &str, rows: &[Stored], format: HistoryFormat) -> String {
    let steps: Vec<(&Stored, Option<Changes>)> = rows
        .iter()
        .enumerate()
        .map(|(i, s)| (s, i.checked_sub(1).map(|p| compare(&rows[p], s))))
        .collect();
    match format {
        HistoryFormat::Text => history_text(engine, &steps),
        HistoryFormat::Json => history_json(engine, &steps),
        HistoryFormat::Html => history_html(engine, rows, &steps),
    }
}

fn headline(stored: &Stored) -> String {
    let e = &stored.entry;
    let or_dash = |v: &Option<String>| v.clone().unwrap_or_else(|| "-".to_string());
    format!(
        "#{}  {}  {}  {}  {}  (measured by {})",
        stored.seq,
        or_dash(&e.date),
        or_dash(&e.event),
        e.class,
        e.result,
        or_dash(&e.measured_by)
    )
}

/// A seal mismatch in words.
pub fn mismatch_words(m: &SealMismatch) -> String {
    let place = m
        .place
        .as_ref()
        .map_or(String::new(), |p| format!(" at {p}"));
    match (&m.applied, &m.found) {
        (Some(a), Some(f)) => format!("seal{place}: {a} applied, {f} found"),
        (Some(a), None) => format!("seal{place}: {a} applied, none found"),
        (None, Some(f)) => format!("seal{place}: {f} found, none applied"),
        (None, None) => format!("seal{place}"),
    }
}

fn history_text(engine: &str, steps: &[(&Stored, Option<Changes>)]) -> String {
    let flagged = steps
        .iter()
        .filter(|(_, c)| c.as_ref().is_some_and(Changes::flagged))
        .count();
    let mut out = format!(
        "Engine {engine}: {} inspection(s), {flagged} flagged\n",
        steps.len()
    );
    for (stored, changes) in steps {
        let _ = writeln!(out, "\n{}", headline(stored));
        let Some(changes) = changes else {
            continue;
        };
        if changes.changed.is_empty() {
            out.push_str("  no measurement changed\n");
        }
        for (label, before, after) in &changes.changed {
            let _ = writeln!(out, "  changed  {label}: {before} -> {after}");
        }
        for m in &changes.seal_mismatches {
            let _ = writeln!(out, "  FLAG     {}", mismatch_words(m));
        }
        for (label, before, after) in &changes.sealed_moved {
            let _ = writeln!(
                out,
                "  FLAG     sealed engine, {label} moved beyond its uncertainty: {before} -> {after}"
            );
        }
    }
    out
}

fn history_json(engine: &str, steps: &[(&Stored, Option<Changes>)]) -> String {
    let items: Vec<Value> = steps
        .iter()
        .map(|(stored, changes)| {
            let mut item = list_item(stored);
            if let Some(c) = changes {
                let triple = |v: &[(String, String, String)]| -> Vec<Value> {
                    v.iter()
                        .map(|(l, b, a)| json!({"label": l, "before": b, "after": a}))
                        .collect()
                };
                item["changed"] = Value::Array(triple(&c.changed));
                item["sealed_moved"] = Value::Array(triple(&c.sealed_moved));
                item["seal_mismatches"] = c
                    .seal_mismatches
                    .iter()
                    .map(|m| json!({"place": m.place, "applied": m.applied, "found": m.found}))
                    .collect();
                item["flagged"] = Value::Bool(c.flagged());
            }
            item
        })
        .collect();
    pretty(&json!({"engine": engine, "inspections": items}))
}

/// The limit a rule puts on one measurement alone: a numeric rule whose trace is that one
/// input and whose value is in the measurement's unit.
fn limit_of(report: &str, label: &str) -> Option<f64> {
    let doc: Value = serde_json::from_str(report).ok()?;
    let engine = doc.get("engines")?.get(0)?;
    let input = engine
        .get("inputs")?
        .as_array()?
        .iter()
        .find(|i| i.get("label").and_then(Value::as_str) == Some(label))?;
    let (id, unit) = (input.get("id")?, input.get("unit")?);
    engine.get("rules")?.as_array()?.iter().find_map(|rule| {
        let trace = rule.get("trace")?.as_array()?;
        let numeric = rule.get("numeric")?;
        let alone = trace.len() == 1 && trace[0].get("input") == Some(id);
        (alone && numeric.get("unit") == Some(unit))
            .then(|| numeric.get("limit")?.as_f64())
            .flatten()
    })
}

/// The values of one measurement over the inspections (seq, value), numeric ones only.
fn series_of(rows: &[Stored], label: &str) -> Vec<(i64, f64)> {
    rows.iter()
        .filter_map(|s| {
            let m = measurements(&s.entry.report);
            let v = m.iter().find(|m| m.label == label)?.value?;
            Some((s.seq, v))
        })
        .collect()
}

/// A small inline SVG of a measurement over the season, with its limit as a dashed line.
pub fn plot(label: &str, points: &[(i64, f64)], limit: Option<f64>) -> String {
    const W: f64 = 240.0;
    const H: f64 = 80.0;
    const PAD: f64 = 8.0;
    let values = points.iter().map(|p| p.1).chain(limit);
    let (lo, hi) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), v| {
        (l.min(v), h.max(v))
    });
    let span = if hi > lo { hi - lo } else { 1.0 };
    let y = |v: f64| PAD + (hi - v) / span * (H - 2.0 * PAD);
    let step = if points.len() > 1 {
        (W - 2.0 * PAD) / (points.len() - 1) as f64
    } else {
        0.0
    };
    let xy: Vec<String> = points
        .iter()
        .enumerate()
        .map(|(i, p)| format!("{:.1},{:.1}", PAD + step * i as f64, y(p.1)))
        .collect();
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{W}\" height=\"{H}\" \
         role=\"img\" aria-label=\"{}\">",
        escape(label)
    );
    if let Some(l) = limit {
        let _ = write!(
            svg,
            "<line class=\"limit\" x1=\"{PAD}\" x2=\"{}\" y1=\"{:.1}\" y2=\"{:.1}\" \
             stroke=\"#b00\" stroke-dasharray=\"4 3\"/>",
            W - PAD,
            y(l),
            y(l)
        );
    }
    let _ = write!(
        svg,
        "<polyline fill=\"none\" stroke=\"#036\" stroke-width=\"2\" points=\"{}\"/>",
        xy.join(" ")
    );
    for point in &xy {
        let (cx, cy) = point.split_once(',').unwrap_or(("0", "0"));
        let _ = write!(
            svg,
            "<circle cx=\"{cx}\" cy=\"{cy}\" r=\"3\" fill=\"#036\"/>"
        );
    }
    svg.push_str("</svg>");
    svg
}

fn history_html(engine: &str, rows: &[Stored], steps: &[(&Stored, Option<Changes>)]) -> String {
    let mut out = format!(
        "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\
         <title>Engine {0}</title><style>body{{font-family:sans-serif;margin:2em}}\
         .flag{{color:#b00;font-weight:bold}}td,th{{padding:2px 8px;text-align:left}}</style>\
         </head><body>\n<h1>Engine {0}</h1>\n<table>\n<tr><th>#</th><th>date</th><th>event</th>\
         <th>class</th><th>result</th><th>measured by</th><th>changes</th></tr>\n",
        escape(engine)
    );
    let mut changed_labels: Vec<String> = Vec::new();
    for (stored, changes) in steps {
        let c = cells(stored);
        let mut notes = Vec::new();
        if let Some(changes) = changes {
            for (label, before, after) in &changes.changed {
                if !changed_labels.contains(label) {
                    changed_labels.push(label.clone());
                }
                notes.push(escape(&format!("{label}: {before} -> {after}")));
            }
            for m in &changes.seal_mismatches {
                notes.push(format!(
                    "<span class=\"flag\">{}</span>",
                    escape(&mismatch_words(m))
                ));
            }
            for (label, _, _) in &changes.sealed_moved {
                notes.push(format!(
                    "<span class=\"flag\">sealed engine, {} moved</span>",
                    escape(label)
                ));
            }
        }
        let _ = writeln!(
            out,
            "<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
            c[0],
            escape(&c[1]),
            escape(&c[2]),
            escape(&c[5]),
            escape(&c[6]),
            escape(&c[7]),
            notes.join("<br>")
        );
    }
    out.push_str("</table>\n");
    for label in &changed_labels {
        let points = series_of(rows, label);
        if points.is_empty() {
            continue;
        }
        let limit = rows.last().and_then(|s| limit_of(&s.entry.report, label));
        let limit_words = limit.map_or(String::from(" (no limit of its own)"), |l| {
            format!(" (limit {})", short_number(l))
        });
        let _ = writeln!(
            out,
            "<figure><figcaption>{}{}</figcaption>{}</figure>",
            escape(label),
            escape(&limit_words),
            plot(label, &points, limit)
        );
    }
    out.push_str("</body></html>\n");
    out
}

/// A limit as a reader writes it: at most six decimals, trailing zeros dropped (a limit
/// converted through SI, 2.9999999999999996, reads 3).
fn short_number(value: f64) -> String {
    let text = format!("{value:.6}");
    let text = text.trim_end_matches('0').trim_end_matches('.');
    if text == "-0" { "0" } else { text }.to_string()
}

/// The report of a verification.
pub fn verification(log: &str, v: &Verification) -> String {
    let mut out = format!("Season log {log}: {} inspection(s)\n", v.inspections);
    if v.breaks.is_empty() {
        out.push_str("chain: intact\n");
    } else {
        let _ = writeln!(out, "chain: BROKEN at {} place(s)", v.breaks.len());
        for b in &v.breaks {
            let at = if b.seq == 0 {
                "stored file".to_string()
            } else {
                format!("inspection #{}", b.seq)
            };
            let _ = writeln!(out, "  {at}: {}", b.why);
        }
    }
    let differing: Vec<_> = v.reruns.iter().filter(|r| r.differs()).collect();
    let _ = writeln!(
        out,
        "checked again: {}, {} would differ",
        v.reruns.len(),
        differing.len()
    );
    for r in differing {
        let now = match &r.now {
            Ok(now) => format!("now {now}"),
            Err(why) => format!("cannot be checked again: {why}"),
        };
        let _ = writeln!(
            out,
            "  inspection #{} ({}): recorded {}, {now}",
            r.seq, r.engine, r.recorded
        );
        for (section, before, after) in &r.differing {
            let _ = writeln!(out, "    rule {section}: recorded {before}, now {after}");
        }
    }
    out.push_str(if v.clean() {
        "verdict: clean\n"
    } else {
        "verdict: NOT clean\n"
    });
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_plot_puts_the_highest_value_at_the_top_and_the_limit_dashed() {
        let svg = plot("bore[1]", &[(1, 4.0), (2, 4.5)], Some(5.0));
        // span 4.0..5.0 over 64 px: 4.5 sits at 8 + 0.5 * 64 = 40, the limit at the top (8)
        assert!(svg.contains("points=\"8.0,72.0 232.0,40.0\""), "{svg}");
        assert!(svg.contains("y1=\"8.0\""), "{svg}");
    }

    #[test]
    fn a_limit_through_si_reads_as_written() {
        assert_eq!(short_number(2.9999999999999996), "3");
        assert_eq!(short_number(1.625), "1.625");
        assert_eq!(short_number(362.0), "362");
    }

    #[test]
    fn csv_quotes_commas_and_quotes_as_rfc_4180_says() {
        // RFC 4180, 2.6 and 2.7: fields with commas or quotes are quoted, quotes doubled
        let mut stored = Stored {
            seq: 1,
            entry: Default::default(),
            entry_hash: "h".into(),
        };
        stored.entry.event = Some("Pellridge, \"round\" 4".into());
        let text = csv(&[stored]);
        assert!(text.contains(",\"Pellridge, \"\"round\"\" 4\","), "{text}");
    }
}
