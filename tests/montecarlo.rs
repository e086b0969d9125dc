//! The Monte Carlo check (JCGM 101:2008, issue 9 deliverable 7): a formula where the law of
//! propagation fails (a square at zero, where the sensitivity is zero: the GUM framework says
//! u = 0, the draws follow u²·χ²₁), one where it is adequate (a sum of normals), the same
//! figures for the same seed on any number of threads, and the command line with its JSON.

mod common;

use common::OrPanic;

use gonogo::check::check;
use gonogo::check::model::CheckedRulebook;
use gonogo::evaluate::check_engine;
use gonogo::evaluate::montecarlo::{self, Draws, MonteCarlo, Settings, Validation};
use gonogo::load::declaration_from_text;
use gonogo::parse::includes::RulebookFiles;
use gonogo::parse::parse_rulebook;
use gonogo::source::SourceMap;

const RULES: &str = r#"
series "Brackenfold Oval Club"
edition "2027" effective 2027-04-01
decision guarded rejection

measure runout: length "Dial indicator on the flywheel face"
measure deck.front: length "Depth gauge"
measure deck.rear: length "Depth gauge"

class hobby "Hobby"
  rule 1 "Runout squared" require runout ^ 2 <= 0.000004 in² end
  rule 2 "Deck heights together" require deck.front + deck.rear <= 9.002 in end
end
"#;

const DECLARATION: &str = r#"
engine: "BF-0733"
class: hobby
date: "2027-05-01"
measurements:
  runout: "0 in ± 0.002 in (k = 2)"
  deck.front: "4.000 in ± 0.002 in (k = 2)"
  deck.rear: "5.000 in ± 0.002 in (k = 2)"
"#;

fn rulebook() -> CheckedRulebook {
    let (book, problems) = parse_rulebook(0, RULES);
    assert!(problems.is_empty(), "{problems:?}");
    let (checked, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    checked.unwrap_or_else(|| panic!("{problems:?}"))
}

/// The Monte Carlo results of rules 1 and 2 and the linear probabilities.
fn run(settings: Settings) -> Vec<(MonteCarlo, f64)> {
    let rulebook = rulebook();
    let mut sources = SourceMap::default();
    let declaration = declaration_from_text(
        std::path::Path::new("bf-0733.yaml"),
        DECLARATION.to_string(),
        &rulebook,
        &mut sources,
    )
    .unwrap_or_else(|p| panic!("{p:?}"));
    let mut report = check_engine(&rulebook, &rulebook.classes[0], &declaration, None);
    montecarlo::attach(&mut report, &settings);
    report
        .outcomes
        .iter()
        .map(|o| {
            let n = o.checked.as_ref().and_then(|c| c.numeric.clone());
            let n = n.or_panic("numeric");
            (
                n.monte_carlo.or_panic("a Monte Carlo result"),
                n.probability,
            )
        })
        .collect()
}

const IN: f64 = 0.0254;

#[test]
fn a_square_at_zero_defeats_the_law_of_propagation_and_the_check_says_so() {
    // y = x², x normal with u = 0.001 in (0.002 in at k = 2): the GUM framework has
    // ∂y/∂x = 0 at x = 0, so u(y) = 0 and a certain pass; y/u² is χ² with one degree of
    // freedom: mean u², standard deviation √2·u², 2.5 % and 97.5 % points 0.000982·u² and
    // 5.0239·u², and P(y ≤ 4·u²) = P(|z| ≤ 2) = 0.9545 (scipy.stats.chi2, 1.17.1). The
    // square near zero is the case JCGM 101 9.4 treats (its comparison loss, from memory).
    let results = run(Settings {
        draws: Draws::Fixed(40_000),
        seed: 11,
        threads: 2,
    });
    let (mc, linear_p) = &results[0];
    let u2 = (0.001 * IN) * (0.001 * IN);
    assert_eq!(mc.linear_uncertainty, 0.0);
    assert_eq!(*linear_p, 1.0, "the linear check is certain");
    assert!((mc.value / u2 - 1.0).abs() < 0.03, "mean {}", mc.value / u2);
    assert!(
        (mc.standard_uncertainty / u2 - 2f64.sqrt()).abs() < 0.05,
        "u {}",
        mc.standard_uncertainty / u2
    );
    assert!(
        (mc.interval.0 / u2 - 0.000_982).abs() < 0.000_2,
        "{}",
        mc.interval.0 / u2
    );
    assert!(
        (mc.interval.1 / u2 - 5.0239).abs() < 0.15,
        "{}",
        mc.interval.1 / u2
    );
    assert!(
        (mc.probability - 0.9545).abs() < 0.005,
        "p {}",
        mc.probability
    );
    assert_eq!(mc.validation, Validation::NotAdequate);
    assert_eq!(mc.draws, 40_000);
    assert!(!mc.adaptive);
}

#[test]
fn a_sum_of_normals_is_propagated_adequately_by_the_law_of_propagation() {
    // y = a + b, each normal with u = 0.001 in: u(y) = √2·0.001 in (GUM eq. 10), exact for a
    // linear model of normals; the Monte Carlo interval agrees with y ± 1.96 u to δ, and
    // p = Φ(0.002/0.001414) = 0.92135 (scipy.stats.norm)
    let results = run(Settings {
        draws: Draws::Adaptive,
        seed: 5,
        threads: 2,
    });
    let (mc, linear_p) = &results[1];
    let u = 2f64.sqrt() * 0.001 * IN;
    assert!((mc.linear_uncertainty - u).abs() < 1e-12);
    assert!((linear_p - 0.921_35).abs() < 1e-4);
    assert!(mc.adaptive && mc.settled, "{mc:?}");
    assert_eq!(mc.validation, Validation::Adequate, "{mc:?}");
    // δ: u = 0.0014 in is 14 × 10⁻⁴ in, so δ = 0.00005 in (JCGM 101 7.9.2)
    assert!(
        (mc.tolerance / IN - 0.000_05).abs() < 1e-12,
        "{}",
        mc.tolerance / IN
    );
    assert!((mc.value - 9.0 * IN).abs() <= mc.tolerance);
    assert!((mc.standard_uncertainty - u).abs() <= mc.tolerance);
    assert!(
        (mc.probability - 0.921_35).abs() < 0.01,
        "p {}",
        mc.probability
    );
    assert!(mc.draws >= 20_000 && mc.draws % montecarlo::BATCH == 0);
}

#[test]
fn sampling_noise_is_never_read_as_a_failure_of_the_law_of_propagation() {
    // a sum of normals is exactly normal, so the GUM interval is exact (JCGM 101 9.2.2, from
    // memory): over many seeds, adaptive or fixed, the check may say "not settled" but must
    // never say "not adequate". Before, the spread of two batches (one degree of freedom)
    // judged the noise, and seeds 2027 and 5 of the review flagged exact linear models.
    for seed in 1..=12 {
        for draws in [Draws::Adaptive, Draws::Fixed(20_000)] {
            let (mc, _) = &run(Settings {
                draws,
                seed,
                threads: 2,
            })[1];
            assert_ne!(
                mc.validation,
                Validation::NotAdequate,
                "seed {seed}, {draws:?}: {mc:?}"
            );
        }
    }
}

#[test]
fn too_few_draws_are_refused_on_the_command_line() {
    for n in ["0", "999", "many"] {
        let run = common::gonogo(&[
            "check",
            "--rules",
            "rulebooks-demo/tamsin-2027.rules",
            &format!("--monte-carlo={n}"),
            "engines-demo/limited2-legal.yaml",
        ]);
        assert_eq!(run.code, 2, "{n}: {}", run.stdout);
        assert!(run.stderr.contains("draws"), "{n}: {}", run.stderr);
    }
}

#[test]
fn the_same_seed_gives_the_same_figures_on_any_number_of_threads() {
    let at = |seed, threads| {
        run(Settings {
            draws: Draws::Fixed(20_000),
            seed,
            threads,
        })
        .into_iter()
        .map(|(mc, _)| {
            (
                mc.value,
                mc.standard_uncertainty,
                mc.interval,
                mc.probability,
            )
        })
        .collect::<Vec<_>>()
    };
    assert_eq!(at(3, 1), at(3, 2));
    assert_ne!(at(3, 1), at(4, 1));
}

#[test]
fn the_command_line_prints_the_seed_and_its_json_fits_the_schema() {
    let args = [
        "check",
        "--rules",
        "rulebooks-demo/tamsin-2027.rules",
        "--monte-carlo=20000",
        "--seed",
        "7",
        "engines-demo/limited2-close-bore.yaml",
    ];
    let text = common::gonogo(&args);
    assert_eq!(text.code, 3, "{}", text.stderr);
    assert!(
        text.stdout.contains("20000 draws, seed 7, fixed"),
        "{}",
        text.stdout
    );
    assert!(text.stdout.contains("propagation"));
    let mut json_args = args.to_vec();
    json_args.splice(1..1, ["--format", "json"]);
    let run = common::gonogo(&json_args);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).or_panic("json");
    let rule = &doc["engines"][0]["rules"][1];
    assert_eq!(rule["numeric"]["monte_carlo"]["seed"], 7);
    assert!(rule["numeric"]["monte_carlo"]["coverage_interval"].is_array());
    let path = format!("{}/schemas/check.schema.json", env!("CARGO_MANIFEST_DIR"));
    let schema: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(path).or_panic("schema")).or_panic("schema");
    let validator = jsonschema::validator_for(&schema).or_panic("a schema");
    let errors: Vec<String> = validator.iter_errors(&doc).map(|e| e.to_string()).collect();
    assert!(errors.is_empty(), "{errors:?}");
    // without --monte-carlo the JSON has no Monte Carlo figures, and --seed alone is refused
    let plain = common::gonogo(&[args[0], args[1], args[2], args[6]]);
    assert!(!plain.stdout.contains("Monte Carlo"));
    let seed_alone = common::gonogo(&[args[0], args[1], args[2], "--seed", "7", args[6]]);
    assert_eq!(seed_alone.code, 2);
}

const REPEATED_RULES: &str = r#"
series "Brackenfold Oval Club"
edition "2027" effective 2027-04-01
decision guarded rejection
coverage 95 %

measure chamber: volume "Burette, re-cc'd ten times"

class hobby "Hobby"
  rule 1 "Chamber" require chamber <= 72.6 cc end
end
"#;

const REPEATED: &str = r#"
engine: "BF-0734"
class: hobby
date: "2027-05-01"
measurements:
  chamber:
    readings: ["72.1 cc", "72.4 cc", "72.2 cc", "72.3 cc", "72.5 cc", "72.0 cc", "72.2 cc", "72.4 cc", "72.3 cc", "72.1 cc"]
"#;

#[test]
fn repeated_readings_are_compared_with_the_gum_interval_from_the_t_distribution() {
    // The mean of ten readings alone: u = s/√10 with ν = 9 (GUM 4.2, G.3.3). The GUM
    // framework's 95 % interval is y ± t₀.₉₇₅(9)·u = y ± 2.26 u (GUM Table G.2), and the
    // draws, from the scaled and shifted t₉ (JCGM 101 6.4.9), have that very interval. The
    // normal y ± 1.96 u the check used before is narrower by 0.30 u, far beyond δ: it called
    // the law of propagation inadequate for a straight line.
    let (book, problems) = parse_rulebook(0, REPEATED_RULES);
    assert!(problems.is_empty(), "{problems:?}");
    let (rulebook, problems) = check(&RulebookFiles {
        files: vec![(0, book)],
    });
    let rulebook = rulebook.unwrap_or_else(|| panic!("{problems:?}"));
    let declaration = declaration_from_text(
        std::path::Path::new("bf-0734.yaml"),
        REPEATED.to_string(),
        &rulebook,
        &mut SourceMap::default(),
    )
    .or_panic("the declaration");
    let mut report = check_engine(&rulebook, &rulebook.classes[0], &declaration, None);
    montecarlo::attach(
        &mut report,
        &Settings {
            draws: Draws::Adaptive,
            seed: 9,
            threads: 2,
        },
    );
    let numeric = report.outcomes[0]
        .checked
        .as_ref()
        .and_then(|c| c.numeric.clone());
    let numeric = numeric.or_panic("numbers");
    let mc = numeric.monte_carlo.or_panic("a Monte Carlo result");
    let u = mc.linear_uncertainty;
    assert_ne!(mc.validation, Validation::NotAdequate, "{mc:?}");
    assert!(mc.distance <= mc.tolerance, "{mc:?}");
    assert!((numeric.degrees_of_freedom - 9.0).abs() < 1e-9);
    assert!((mc.linear_k - 2.26).abs() < 0.005, "k {}", mc.linear_k);
    assert!((mc.linear_interval.1 - mc.linear_value - mc.linear_k * u).abs() < 1e-12);
    // the normal interval's upper end misses the draws' by about 0.30 u
    let normal_end = mc.linear_value + montecarlo::K95 * u;
    assert!((mc.interval.1 - normal_end) > 0.25 * u, "{mc:?}");
    assert!((mc.interval.1 - normal_end) > 10.0 * mc.tolerance, "{mc:?}");
}
