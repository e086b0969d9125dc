//! Benchmark of the season log. Run with `cargo bench --bench season_log` (`SEASON_BENCH_N`
//! sets the field size, 2,000 by default). It prints:
//! - the time to check a generated field of N engines with the binary, with and without
//!   `--record` into a fresh log, best of three interleaved rounds, and their ratio;
//! - the time to read one engine's history out of a log of 100,000 inspections (1,000 engines
//!   with 100 each), recorded in bulk through the library in one transaction.
//!
//! The bulk inspections store a real declaration (stored once, content-addressed) but a
//! minimal report document, `{"schema":"gonogo.check/2","engines":[]}`, instead of the
//! 37–47 kB a real one takes, to keep the file near 100 MB rather than 4 GB: the history
//! figure measures the index lookup and the rows, not reading 100 full reports.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use gonogo::commands::load_rulebook;
use gonogo::load::declaration_from_text;
use gonogo::season::record::{Given, Inspected, RulebookBytes, record};
use gonogo::season::schema::{Log, Mode};
use gonogo::source::SourceMap;

const RULES: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/rulebooks-demo/tamsin-2027.rules"
);
const TEMPLATE: &str = concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/season-demo/round3/open4-44.yaml"
);
const ROUNDS: usize = 3;
const ENGINES: usize = 1_000;
const EACH: usize = 100;

fn scratch(name: &str) -> PathBuf {
    std::env::temp_dir().join(format!("gonogo-bench-{}-{name}", std::process::id()))
}

/// A folder of `n` copies of the template, each its own engine number.
fn field(n: usize) -> PathBuf {
    let dir = scratch("field");
    let _ = std::fs::remove_dir_all(&dir);
    let template = std::fs::read_to_string(TEMPLATE).unwrap_or_default();
    let made = std::fs::create_dir_all(&dir).is_ok()
        && (0..n).all(|i| {
            let text = template.replace("TV-27-044", &format!("TV-27-{i:05}"));
            std::fs::write(dir.join(format!("engine-{i:05}.yaml")), text).is_ok()
        });
    if !made {
        fail("the generated field could not be written");
    }
    dir
}

fn fail(why: &str) -> ! {
    eprintln!("season_log bench: {why}");
    std::process::exit(2);
}

/// One `check` of the folder, recording into a fresh log when `log` is given.
fn check(dir: &Path, log: Option<&Path>) -> Duration {
    let mut command = Command::new(env!("CARGO_BIN_EXE_gonogo"));
    command.args(["check", "--rules", RULES]).arg(dir);
    if let Some(log) = log {
        let _ = std::fs::remove_file(log);
        command.arg("--record").arg(log);
    }
    let start = Instant::now();
    let status = command.stdout(Stdio::null()).status();
    let took = start.elapsed();
    if !status.is_ok_and(|s| s.code().is_some_and(|c| c < 2)) {
        fail("check failed");
    }
    took
}

fn bulk_log() -> (PathBuf, Duration) {
    let path = scratch("bulk.sqlite");
    let _ = std::fs::remove_file(&path);
    let book = load_rulebook(Path::new(RULES))
        .checked
        .unwrap_or_else(|| fail("the demo rulebook does not check"));
    let text = std::fs::read_to_string(TEMPLATE).unwrap_or_default();
    let mut sources = SourceMap::default();
    let declaration = declaration_from_text(Path::new(TEMPLATE), text.clone(), &book, &mut sources)
        .unwrap_or_else(|_| fail("the template does not load"));
    let identities: Vec<_> = (0..ENGINES)
        .map(|i| {
            let mut identity = declaration.identity.clone();
            identity.engine = Some(format!("TV-27-{i:05}"));
            identity
        })
        .collect();
    let shared: std::sync::Arc<str> = text.as_str().into();
    let engines: Vec<Inspected> = (0..ENGINES * EACH)
        .map(|n| Inspected {
            text: shared.clone(),
            file: "open4-44.yaml".to_string(),
            identity: identities[n % ENGINES].clone(),
            inspection: declaration.inspection.clone(),
            class: "open4".to_string(),
            decision: "guarded rejection".to_string(),
            result: "legal".to_string(),
            report: r#"{"schema":"gonogo.check/2","engines":[]}"#.to_string(),
        })
        .collect();
    let rulebook = RulebookBytes {
        fingerprint: "bench".to_string(),
        files: vec![(String::new(), std::fs::read(RULES).unwrap_or_default())],
    };
    let mut log = Log::open(&path, Mode::Create).unwrap_or_else(|_| fail("no log"));
    let start = Instant::now();
    let recorded = record(&mut log, &rulebook, &engines, &Given::default());
    let took = start.elapsed();
    if !recorded.is_ok_and(|s| s.len() == ENGINES * EACH) {
        fail("the bulk recording failed");
    }
    (path, took)
}

fn main() {
    let n: usize = std::env::var("SEASON_BENCH_N")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(2_000);
    let dir = field(n);
    let log = scratch("record.sqlite");
    let (mut plain, mut recorded) = (Duration::MAX, Duration::MAX);
    for _ in 0..ROUNDS {
        plain = plain.min(check(&dir, None));
        recorded = recorded.min(check(&dir, Some(&log)));
    }
    let size = std::fs::metadata(&log).map(|m| m.len()).unwrap_or(0);
    println!("check of {n} engines, best of {ROUNDS} interleaved rounds");
    println!("  without --record: {:>9.1} ms", plain.as_secs_f64() * 1e3);
    println!(
        "  with --record:    {:>9.1} ms  (log {:.1} MB)",
        recorded.as_secs_f64() * 1e3,
        size as f64 / 1e6
    );
    println!(
        "  ratio:            {:>9.2}",
        recorded.as_secs_f64() / plain.as_secs_f64()
    );

    let (bulk, took) = bulk_log();
    println!(
        "{} inspections recorded in one transaction: {:.1} s",
        ENGINES * EACH,
        took.as_secs_f64()
    );
    let opened = Log::open(&bulk, Mode::Existing).unwrap_or_else(|_| fail("no bulk log"));
    let mut best = Duration::MAX;
    let mut rows = 0;
    for i in 0..20 {
        let start = Instant::now();
        rows = opened
            .history(&format!("TV-27-{:05}", (i * 37) % ENGINES))
            .map(|h| h.len())
            .unwrap_or(0);
        best = best.min(start.elapsed());
    }
    println!(
        "  one engine's history ({rows} inspections), best of 20: {:.3} ms",
        best.as_secs_f64() * 1e3
    );
    drop(opened);
    for path in [&log, &bulk] {
        let _ = std::fs::remove_file(path);
    }
    let _ = std::fs::remove_dir_all(&dir);
}
