//! Benchmark: check 10,000 generated declarations against the demo's Limited Two-Barrel class,
//! and compare with the floor, merely parsing the same YAML with serde_yaml into a `Value`.
//! Run with `cargo bench --bench check_field`; it prints both times and their ratio.

use std::path::Path;
use std::time::{Duration, Instant};

use gonogo::commands::load_rulebook;
use gonogo::evaluate::check_engine;
use gonogo::load::declaration_from_text;
use gonogo::source::SourceMap;

const ENGINES: usize = 10_000;
const ROUNDS: usize = 5;

/// A small deterministic generator (64-bit linear congruential, Knuth's MMIX constants).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// The demo's legal Limited Two-Barrel engine with every bore, chamber and weight varied.
fn declarations() -> Vec<String> {
    let template = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-legal.yaml"
    ))
    .unwrap_or_default();
    let mut rng = Lcg(2027);
    (0..ENGINES)
        .map(|i| {
            let bores: Vec<String> = (0..8)
                .map(|_| format!("\"{:.4} in\"", 4.0300 + 0.0008 * rng.next()))
                .collect();
            let chambers: Vec<String> = (0..8)
                .map(|_| format!("\"{:.1} cc\"", 71.5 + 1.0 * rng.next()))
                .collect();
            let mut text = template.replace("TV-27-014", &format!("TV-27-{i:05}"));
            text = replace_line(
                &text,
                "    values: [\"4.0302 in\"",
                &format!("    values: [{}]", bores.join(", ")),
            );
            text = replace_line(
                &text,
                "    values: [\"72.1 cc\"",
                &format!("    values: [{}]", chambers.join(", ")),
            );
            replace_line(
                &text,
                "  car.weight:",
                &format!("  car.weight: \"{:.0} lb\"", 3000.0 + 150.0 * rng.next()),
            )
        })
        .collect()
}

fn replace_line(text: &str, starts: &str, with: &str) -> String {
    text.lines()
        .map(|l| if l.starts_with(starts) { with } else { l })
        .collect::<Vec<_>>()
        .join("\n")
        + "\n"
}

fn best_of(mut f: impl FnMut() -> usize) -> (Duration, usize) {
    let mut best = Duration::MAX;
    let mut work = 0;
    for _ in 0..ROUNDS {
        let start = Instant::now();
        work = f();
        best = best.min(start.elapsed());
    }
    (best, work)
}

fn main() {
    let loaded = load_rulebook(Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/rulebooks-demo/tamsin-2027.rules"
    )));
    let Some(rulebook) = loaded.checked else {
        eprintln!("the demo rulebook does not check");
        std::process::exit(2);
    };
    let Some(class) = rulebook.class("limited2") else {
        eprintln!("the demo rulebook has no class limited2");
        std::process::exit(2);
    };
    let texts = declarations();

    let (floor, values) = best_of(|| {
        texts
            .iter()
            .filter(|t| serde_yaml::from_str::<serde_yaml::Value>(t).is_ok())
            .count()
    });
    let (checked, rules) = best_of(|| {
        let mut rules = 0;
        for t in &texts {
            let mut sources = SourceMap::default();
            if let Ok(d) =
                declaration_from_text(Path::new("bench.yaml"), t.clone(), &rulebook, &mut sources)
            {
                rules += check_engine(&rulebook, class, &d, None).outcomes.len();
            }
        }
        rules
    });
    let (load_only, _) = best_of(|| {
        texts
            .iter()
            .filter(|t| {
                let mut sources = SourceMap::default();
                declaration_from_text(
                    Path::new("bench.yaml"),
                    (*t).clone(),
                    &rulebook,
                    &mut sources,
                )
                .is_ok()
            })
            .count()
    });
    println!(
        "  load only:                       {:>8.1} ms",
        load_only.as_secs_f64() * 1e3
    );
    let (reported, bytes) = best_of(|| {
        let mut bytes = 0;
        for t in &texts {
            let mut sources = SourceMap::default();
            if let Ok(d) =
                declaration_from_text(Path::new("bench.yaml"), t.clone(), &rulebook, &mut sources)
            {
                bytes +=
                    gonogo::report::text::engine(&check_engine(&rulebook, class, &d, None)).len();
            }
        }
        bytes
    });

    println!("{ENGINES} declarations, best of {ROUNDS} rounds");
    println!(
        "  serde_yaml into a Value (floor): {:>8.1} ms  ({values} parsed)",
        floor.as_secs_f64() * 1e3
    );
    println!(
        "  load and check:                  {:>8.1} ms  ({rules} rule outcomes)",
        checked.as_secs_f64() * 1e3
    );
    println!(
        "  load, check and text report:     {:>8.1} ms  ({bytes} bytes)",
        reported.as_secs_f64() * 1e3
    );
    println!(
        "  ratio check / floor:             {:>8.2}",
        checked.as_secs_f64() / floor.as_secs_f64()
    );
    println!(
        "  ratio with report / floor:       {:>8.2}",
        reported.as_secs_f64() / floor.as_secs_f64()
    );
}
