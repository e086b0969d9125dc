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
const ROUNDS: usize = 7;

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

/// The best time of each workload over `ROUNDS` rounds, the workloads taking turns within
/// each round so that both sides of a ratio see the same machine.
fn best_of_interleaved(workloads: &mut [&mut dyn FnMut() -> usize]) -> Vec<(Duration, usize)> {
    let mut best = vec![(Duration::MAX, 0); workloads.len()];
    for _ in 0..ROUNDS {
        for (slot, work) in best.iter_mut().zip(workloads.iter_mut()) {
            let start = Instant::now();
            let done = work();
            *slot = (slot.0.min(start.elapsed()), done);
        }
    }
    best
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
    let load = |t: &String| {
        let mut sources = SourceMap::default();
        declaration_from_text(Path::new("bench.yaml"), t.clone(), &rulebook, &mut sources).ok()
    };
    let mut floor = || {
        texts
            .iter()
            .filter(|t| serde_yaml::from_str::<serde_yaml::Value>(t).is_ok())
            .count()
    };
    let mut load_only = || texts.iter().filter_map(load).count();
    let mut checked = || {
        texts
            .iter()
            .filter_map(load)
            .map(|d| check_engine(&rulebook, class, &d, None).outcomes.len())
            .sum()
    };
    let mut reported = || {
        texts
            .iter()
            .filter_map(load)
            .map(|d| gonogo::report::text::engine(&check_engine(&rulebook, class, &d, None)).len())
            .sum()
    };
    let times = best_of_interleaved(&mut [&mut floor, &mut load_only, &mut checked, &mut reported]);
    let ms = |i: usize| times[i].0.as_secs_f64() * 1e3;

    println!("{ENGINES} declarations, best of {ROUNDS} interleaved rounds");
    println!(
        "  serde_yaml into a Value (floor): {:>8.1} ms  ({} parsed)",
        ms(0),
        times[0].1
    );
    println!("  load only:                       {:>8.1} ms", ms(1));
    println!(
        "  load and check:                  {:>8.1} ms  ({} rule outcomes)",
        ms(2),
        times[2].1
    );
    println!(
        "  load, check and text report:     {:>8.1} ms  ({} bytes)",
        ms(3),
        times[3].1
    );
    println!("  ratio check / floor:             {:>8.2}", ms(2) / ms(0));
    println!("  ratio with report / floor:       {:>8.2}", ms(3) / ms(0));
}
