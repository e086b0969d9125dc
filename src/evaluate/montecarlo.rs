//! The Monte Carlo check of the law of propagation (JCGM 101:2008, GUM Supplement 1).
//!
//! Each input is drawn from its components' distributions (normal, rectangular for a
//! resolution, a scaled and shifted t for the mean of repeated readings), every component
//! independently; each rulebook literal with a stated uncertainty from a normal distribution.
//! The declaration is evaluated again with the drawn values by the same evaluator that checks
//! it ([`Evaluator`]), and each numeric rule's value and margins are taken from that. Per rule
//! the draws give the Monte Carlo estimate (their mean), its standard uncertainty, the
//! probabilistically symmetric 95 % coverage interval (JCGM 101 7.7) and the probability of
//! conformance (the fraction of draws inside the limit, at the closest cylinder and on every
//! cylinder), and the GUM uncertainty framework is validated against them (JCGM 101 8.2):
//! the ends of its coverage interval y ± k₉₅·u(y) must lie within the numerical tolerance δ of
//! the Monte Carlo ends, δ being half a unit in the last of the two significant digits of u.
//! k₉₅ is the interval the GUM framework itself gives for 95 % (JCGM 101 5.11.3 and 8.1, GUM
//! G.3 and G.6.4): the t-distribution's quantile at the effective degrees of freedom of u(y)
//! (Welch–Satterthwaite), 1.96 when every component is of Type B. So the mean of three
//! re-cc'd readings is compared with y ± 4.30·u, not with a normal interval it cannot match.
//!
//! The draws come in batches of 10 000 (JCGM 101 7.9.4: max(100/(1 − p), 10⁴)), each from its
//! own stream of a ChaCha8 generator seeded with the run's seed, so the result is the same on
//! every machine and with any number of threads. With no number of draws given the run is
//! adaptive (JCGM 101 7.9): batches are added until twice the standard deviation of the batch
//! estimates of y, u(y) and both interval ends is at most δ for every rule, or the cap is
//! reached; with a number given, that many draws are made and the report says whether they
//! settled. A rule whose condition is not evaluated again: the check is of the requirement, as
//! the linear check judged it.

use rand::{RngExt, SeedableRng};
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution as _, StandardNormal, StudentT};

use super::coverage::coverage_factor;
use super::expr::Evaluator;
use super::outcome::EngineReport;
use super::value::Value;
use crate::check::limit::{Limit, Side};
use crate::check::model::Coverage;
use crate::check::resolved::{Expr, TestKind};
use crate::load::{Component, Declaration, Distribution};

/// Draws in one batch (JCGM 101 7.9.4 for p = 95 %).
pub const BATCH: usize = 10_000;

/// The size of each batch: [`BATCH`] for an adaptive run; a fixed run of N draws is cut into
/// at least [`MIN_BATCHES`] batches, so its validation can tell noise from a difference.
fn batch_size(draws: Draws) -> usize {
    match draws {
        Draws::Adaptive => BATCH,
        Draws::Fixed(n) => n.div_ceil(MIN_BATCHES).clamp(1, BATCH),
    }
}

/// The fewest draws `--monte-carlo=N` accepts: below it a 95 % interval rests on a handful of
/// draws in each tail (JCGM 101 7.2.2 asks for M much larger than 1/(1 − p); from memory).
pub const MIN_DRAWS: usize = 1_000;

/// The batches a run needs before its spread is trusted: the standard deviation of the batch
/// estimates (JCGM 101 7.9.4) from fewer has too few degrees of freedom to say the run has
/// settled or that an interval end differs from the GUM one (from two batches it is a guess
/// with one degree of freedom, which let sampling noise read as "not adequate").
pub const MIN_BATCHES: usize = 10;

/// The most draws an adaptive run makes.
pub const ADAPTIVE_CAP: usize = 1_000_000;

/// The seed when none is given.
pub const DEFAULT_SEED: u64 = 2027;

/// The coverage probability of the intervals compared.
pub const COVERAGE_PROBABILITY: f64 = 0.95;

/// The coverage factor of the GUM framework's 95 % interval for a normal distribution,
/// Φ⁻¹(0.975) (JCGM 100:2008 G.3.2, Table G.1 gives 1.960): k₉₅ at infinite degrees of freedom.
pub const K95: f64 = 1.959_963_984_540_054;

/// The coverage factor of the GUM framework's 95 % interval for a combined uncertainty of
/// `nu` effective degrees of freedom: t₀.₉₇₅(ν) (GUM G.3.4, Table G.2), [`K95`] when ν is
/// infinite.
pub fn linear_k(nu: f64) -> f64 {
    if nu.is_finite() {
        coverage_factor(Coverage::Probability(COVERAGE_PROBABILITY), nu)
    } else {
        K95
    }
}

/// Significant digits of u(y) regarded as meaningful (JCGM 101 7.9.2, the usual choice).
pub const SIGNIFICANT_DIGITS: i32 = 2;

/// How many draws to make.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Draws {
    /// JCGM 101 7.9: batches until the results are stable, at most [`ADAPTIVE_CAP`] draws.
    Adaptive,
    /// This many.
    Fixed(usize),
}

/// What a Monte Carlo check was asked to do.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Settings {
    /// How many draws.
    pub draws: Draws,
    /// The generator's seed.
    pub seed: u64,
    /// Threads to share the batches.
    pub threads: usize,
}

/// Whether the law of propagation is adequate for a rule, by JCGM 101 8.2.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Validation {
    /// Both ends of the GUM interval lie within δ of the Monte Carlo ends.
    Adequate,
    /// An end lies further than δ from the Monte Carlo one: the linear figures are not to be
    /// relied on for this rule.
    NotAdequate,
    /// The Monte Carlo results did not settle to δ with the draws made: no comparison.
    Unsettled,
}

impl Validation {
    /// The words a report uses.
    pub fn words(self) -> &'static str {
        match self {
            Validation::Adequate => "the law of propagation is adequate",
            Validation::NotAdequate => "the law of propagation is NOT adequate here",
            Validation::Unsettled => "not settled with these draws: no comparison",
        }
    }
}

/// The Monte Carlo check of one numeric rule, SI units.
#[derive(Clone, Debug, PartialEq)]
pub struct MonteCarlo {
    /// Draws made.
    pub draws: usize,
    /// Draws for which the value tested had no finite value (left out of the statistics and
    /// counted as not conforming).
    pub undefined: usize,
    /// The generator's seed.
    pub seed: u64,
    /// Whether the number of draws was chosen adaptively.
    pub adaptive: bool,
    /// Whether the estimates settled to within the tolerance (JCGM 101 7.9).
    pub settled: bool,
    /// The Monte Carlo estimate of the value tested: the mean of the draws.
    pub value: f64,
    /// Its standard uncertainty: the standard deviation of the draws.
    pub standard_uncertainty: f64,
    /// The probabilistically symmetric 95 % coverage interval.
    pub interval: (f64, f64),
    /// The fraction of draws inside the limit at the closest cylinder.
    pub probability: f64,
    /// For a rule on every cylinder, the fraction of draws with every cylinder inside.
    pub all_cylinders: Option<f64>,
    /// The GUM framework's estimate.
    pub linear_value: f64,
    /// Its standard uncertainty.
    pub linear_uncertainty: f64,
    /// The coverage factor of its 95 % interval: t₀.₉₇₅ at the effective degrees of freedom,
    /// 1.96 when they are infinite ([`linear_k`]).
    pub linear_k: f64,
    /// Its 95 % interval, y ± k·u(y) with k = [`MonteCarlo::linear_k`].
    pub linear_interval: (f64, f64),
    /// The numerical tolerance δ.
    pub tolerance: f64,
    /// The larger distance between the two intervals' ends.
    pub distance: f64,
    /// The verdict on the law of propagation.
    pub validation: Validation,
}

/// Runs the check on every numeric rule of a report that was checked, and attaches the result
/// to each rule's numbers.
pub fn attach(report: &mut EngineReport, settings: &Settings) {
    let rulebook = report.rulebook;
    let declaration = report.declaration;
    let jobs = jobs(report);
    if jobs.is_empty() {
        return;
    }
    let model = Model::new(
        declaration,
        rulebook.literals.iter().map(|l| l.standard_uncertainty),
    );
    let mut batches: Vec<Batch> = Vec::new();
    let wanted = match settings.draws {
        Draws::Fixed(n) => n.max(1),
        Draws::Adaptive => ADAPTIVE_CAP,
    };
    loop {
        let done: usize = batches.iter().map(|b| b.size).sum();
        let finished = (0..jobs.len()).all(|j| jobs[j].decided(j, &batches));
        if done >= wanted || (settings.draws == Draws::Adaptive && finished) {
            break;
        }
        let round = settings.threads.max(1);
        let sizes: Vec<(usize, usize)> = (0..round)
            .map(|i| batches.len() + i)
            .scan(done, |start, index| {
                let size = batch_size(settings.draws).min(wanted.saturating_sub(*start));
                *start += size;
                Some((index, size))
            })
            .filter(|(_, size)| *size > 0)
            .collect();
        // a rule that has settled draws no more (each rule is its own adaptive run); the
        // inputs are drawn all the same, so every rule sees the same draws in any case
        let active: Vec<bool> = (0..jobs.len())
            .map(|j| settings.draws != Draws::Adaptive || !jobs[j].decided(j, &batches))
            .collect();
        batches.extend(run_round(
            &model,
            report,
            &jobs,
            &active,
            &sizes,
            settings.seed,
        ));
    }
    let adaptive = settings.draws == Draws::Adaptive;
    for (j, job) in jobs.iter().enumerate() {
        let result = job.result(j, &batches, settings.seed, adaptive);
        if let Some(numeric) = report.outcomes[job.outcome]
            .checked
            .as_mut()
            .and_then(|c| c.numeric.as_mut())
        {
            numeric.monte_carlo = Some(result);
        }
    }
}

/// One numeric rule to draw: its limit, the closest cylinder and the linear estimate.
struct Job<'a> {
    outcome: usize,
    /// The size of the unit the limit is written in, SI per unit: the significant digits of
    /// u(y) are counted in it.
    scale: f64,
    limit: &'a Limit<Expr>,
    cylinder: usize,
    value: f64,
    uncertainty: f64,
    /// The coverage factor of the GUM framework's 95 % interval ([`linear_k`]).
    k: f64,
}

/// The rules checked with a numeric limit on one side or a range, with the linear figures.
fn jobs<'a>(report: &EngineReport<'a>) -> Vec<Job<'a>> {
    let mut evaluator = Evaluator::new(report.rulebook, report.declaration);
    let mut jobs = Vec::new();
    for (i, outcome) in report.outcomes.iter().enumerate() {
        let Some(numeric) = outcome.checked.as_ref().filter(|c| c.is_finite()) else {
            continue;
        };
        let Some(numeric) = &numeric.numeric else {
            continue;
        };
        let TestKind::Limit { limit, unit } = &outcome.rule.test.kind else {
            continue;
        };
        if matches!(limit.side, Side::Equal { .. } | Side::NotEqual { .. }) {
            continue;
        }
        let cylinder = numeric.cylinder.map_or(0, |c| c.saturating_sub(1));
        let Ok(subject) = evaluator.number(&limit.subject) else {
            continue;
        };
        let Ok(at) = subject.at(cylinder) else {
            continue;
        };
        let uncertainty = evaluator.combined(at);
        let (_, nu) = evaluator.coverage(at);
        jobs.push(Job {
            outcome: i,
            scale: unit.map_or(1.0, |u| u.to_si),
            limit,
            cylinder,
            value: at.value,
            uncertainty,
            k: linear_k(nu),
        });
    }
    jobs
}

/// What one batch found for each job.
struct Batch {
    size: usize,
    rules: Vec<Drawn>,
}

/// One job's draws in one batch: the value tested at the closest cylinder, less the linear
/// estimate (kept in single precision: the deviations are of the order of u).
#[derive(Default)]
struct Drawn {
    draws: usize,
    deviations: Vec<f32>,
    /// Mean, u and the interval ends of this batch's deviations.
    summary: Option<Summary>,
    undefined: usize,
    conforming: usize,
    all_conforming: usize,
    cylinders: usize,
}

/// The inputs to draw: each declared input's value and components, each literal's
/// standard uncertainty.
struct Model {
    inputs: Vec<(f64, Vec<Sampler>)>,
    literals: Vec<f64>,
}

/// One component's distribution, ready to draw from.
#[derive(Clone)]
enum Sampler {
    Normal(f64),
    Rectangular(f64),
    T(f64, StudentT<f64>),
}

impl Sampler {
    fn new(c: &Component) -> Sampler {
        let u = c.standard_uncertainty;
        match c.distribution {
            Distribution::Normal => Sampler::Normal(u),
            Distribution::Rectangular => Sampler::Rectangular(u * 3f64.sqrt()),
            Distribution::StudentT { degrees_of_freedom } => {
                match StudentT::new(degrees_of_freedom) {
                    Ok(t) => Sampler::T(u, t),
                    Err(_) => Sampler::Normal(u),
                }
            }
        }
    }

    fn draw(&self, rng: &mut ChaCha8Rng) -> f64 {
        match self {
            Sampler::Normal(u) => u * normal(rng),
            Sampler::Rectangular(half) => half * (2.0 * rng.random::<f64>() - 1.0),
            Sampler::T(u, t) => u * t.sample(rng),
        }
    }
}

/// A standard normal draw.
fn normal(rng: &mut ChaCha8Rng) -> f64 {
    StandardNormal.sample(rng)
}

impl Model {
    fn new(declaration: &Declaration, literals: impl Iterator<Item = f64>) -> Model {
        let inputs = declaration
            .inputs
            .iter()
            .map(|input| {
                let mut samplers: Vec<Sampler> = input
                    .components
                    .iter()
                    .filter(|c| c.standard_uncertainty > 0.0)
                    .map(Sampler::new)
                    .collect();
                if input.components.is_empty() && input.standard_uncertainty > 0.0 {
                    samplers.push(Sampler::Normal(input.standard_uncertainty));
                }
                (input.value, samplers)
            })
            .collect();
        Model {
            inputs,
            literals: literals.collect(),
        }
    }
}

/// Runs batches `(index, size)` side by side, one thread each.
fn run_round(
    model: &Model,
    report: &EngineReport,
    jobs: &[Job],
    active: &[bool],
    sizes: &[(usize, usize)],
    seed: u64,
) -> Vec<Batch> {
    std::thread::scope(|scope| {
        let handles: Vec<_> = sizes
            .iter()
            .map(|&(index, size)| {
                scope.spawn(move || batch(model, report, jobs, active, index, size, seed))
            })
            .collect();
        handles.into_iter().filter_map(|h| h.join().ok()).collect()
    })
}

/// One batch of draws from stream `index` of the seeded generator.
fn batch(
    model: &Model,
    report: &EngineReport,
    jobs: &[Job],
    active: &[bool],
    index: usize,
    size: usize,
    seed: u64,
) -> Batch {
    let mut rng = ChaCha8Rng::seed_from_u64(seed);
    rng.set_stream(index as u64);
    let mut declaration = report.declaration.clone();
    let mut rules: Vec<Drawn> = jobs
        .iter()
        .map(|_| Drawn {
            deviations: Vec::with_capacity(size),
            ..Drawn::default()
        })
        .collect();
    let mut shifts = vec![0.0; model.literals.len()];
    for _ in 0..size {
        for (input, (value, samplers)) in declaration.inputs.iter_mut().zip(&model.inputs) {
            input.value = value + samplers.iter().map(|s| s.draw(&mut rng)).sum::<f64>();
        }
        for (shift, u) in shifts.iter_mut().zip(&model.literals) {
            *shift = u * normal(&mut rng);
        }
        let mut evaluator = Evaluator::new(report.rulebook, &declaration);
        evaluator.literal_shifts = std::mem::take(&mut shifts);
        evaluator.values_only = true;
        for ((job, drawn), _) in jobs
            .iter()
            .zip(rules.iter_mut())
            .zip(active)
            .filter(|(_, active)| **active)
        {
            drawn.record(job, draw(&mut evaluator, job));
        }
        shifts = std::mem::take(&mut evaluator.literal_shifts);
    }
    for drawn in &mut rules {
        drawn.summary = statistics(&mut drawn.deviations);
    }
    Batch { size, rules }
}

/// One draw of a job: the value tested at its cylinder, whether that cylinder conforms, and
/// whether every cylinder does, with the number of cylinders.
struct Draw {
    value: f64,
    conforms: bool,
    all: bool,
    cylinders: usize,
}

fn draw(evaluator: &mut Evaluator, job: &Job) -> Option<Draw> {
    let limit = job.limit;
    let subject = evaluator.number(&limit.subject).ok()?;
    let (first, second) = limit.limits();
    let first = evaluator.number(first).ok()?;
    let second = match second {
        Some(e) => Some(evaluator.number(e).ok()?),
        None => None,
    };
    let slack = match &limit.allowance {
        Some(e) => evaluator.number(e).ok()?.at(0).ok()?.value,
        None => 0.0,
    };
    let cylinders = [Some(&subject), Some(&first), second.as_ref()]
        .into_iter()
        .flatten()
        .map(|v| v.numbers().len())
        .max()?;
    let mut all = true;
    let mut conforms = false;
    for i in 0..cylinders {
        let inside = inside(&limit.side, &subject, &first, second.as_ref(), slack, i)?;
        all &= inside;
        if i == job.cylinder {
            conforms = inside;
        }
    }
    let value = subject.at(job.cylinder).ok()?.value;
    value.is_finite().then_some(Draw {
        value,
        conforms,
        all,
        cylinders,
    })
}

/// Whether cylinder `i` is inside the limit, the allowance included.
fn inside(
    side: &Side<Expr>,
    subject: &Value,
    first: &Value,
    second: Option<&Value>,
    slack: f64,
    i: usize,
) -> Option<bool> {
    let s = subject.at(i).ok()?.value;
    let l = first.at(i).ok()?.value;
    let (margin, strict) = match side {
        Side::Upper { strict, .. } => (l + slack - s, *strict),
        Side::Lower { strict, .. } => (s - (l - slack), *strict),
        Side::Between { .. } => {
            let h = second?.at(i).ok()?.value;
            ((s - (l - slack)).min(h + slack - s), false)
        }
        Side::Equal { .. } | Side::NotEqual { .. } => return None,
    };
    Some(if strict { margin > 0.0 } else { margin >= 0.0 })
}

impl Drawn {
    fn record(&mut self, job: &Job, d: Option<Draw>) {
        self.draws += 1;
        match d {
            Some(d) => {
                self.deviations.push((d.value - job.value) as f32);
                self.conforming += usize::from(d.conforms);
                self.all_conforming += usize::from(d.all);
                self.cylinders = self.cylinders.max(d.cylinders);
            }
            None => self.undefined += 1,
        }
    }
}

/// Mean, standard deviation and the probabilistically symmetric 95 % interval of deviations.
fn statistics(values: &mut [f32]) -> Option<(f64, f64, f64, f64)> {
    let m = values.len();
    if m == 0 {
        return None;
    }
    let mean = values.iter().map(|v| f64::from(*v)).sum::<f64>() / m as f64;
    let variance = values
        .iter()
        .map(|v| (f64::from(*v) - mean).powi(2))
        .sum::<f64>()
        / (m.max(2) - 1) as f64;
    let (low, high) = interval(values)?;
    Some((mean, variance.sqrt(), low, high))
}

/// JCGM 101 7.7.2: with q = pM (rounded to the nearest integer) and r = (M − q)/2 (rounded
/// up), the r-th and (r + q)-th of the sorted values.
fn interval(values: &mut [f32]) -> Option<(f64, f64)> {
    let m = values.len();
    let q = (COVERAGE_PROBABILITY * m as f64 + 0.5).floor() as usize;
    let r = (m - q.min(m)).div_ceil(2).max(1);
    let low = *values.select_nth_unstable_by(r - 1, f32::total_cmp).1;
    let high_index = (r + q).min(m) - 1;
    let high = *values.select_nth_unstable_by(high_index, f32::total_cmp).1;
    Some((f64::from(low), f64::from(high)))
}

/// δ for u(y) in SI units, its digits counted in a unit of `scale` SI units.
fn tolerance_in(u: f64, scale: f64) -> f64 {
    tolerance(u / scale) * scale
}

/// JCGM 101 7.9.2: u(y) written as c·10ˡ with c of two digits gives δ = 10ˡ/2.
pub fn tolerance(u: f64) -> f64 {
    if u <= 0.0 || !u.is_finite() {
        return 0.0;
    }
    let l = u.log10().floor() as i32 - (SIGNIFICANT_DIGITS - 1);
    0.5 * 10f64.powi(l)
}

/// The figures of one batch for one job: mean, u, interval ends, as deviations.
type Summary = (f64, f64, f64, f64);

/// The standard deviation of the mean of the batches' figure `f` (JCGM 101 7.9.4 b), and
/// the number of batches; infinite with fewer than two.
fn spread(summaries: &[Summary], f: impl Fn(&Summary) -> f64) -> f64 {
    let h = summaries.len();
    if h < 2 {
        return f64::INFINITY;
    }
    let mean = summaries.iter().map(&f).sum::<f64>() / h as f64;
    let variance = summaries.iter().map(|s| (f(s) - mean).powi(2)).sum::<f64>() / (h - 1) as f64;
    (variance / h as f64).sqrt()
}

/// u(y) from every defined draw of job `j` so far.
fn pooled_uncertainty(j: usize, batches: &[Batch]) -> f64 {
    let (mut n, mut sum, mut squares) = (0usize, 0.0, 0.0);
    for b in batches {
        for v in &b.rules[j].deviations {
            let v = f64::from(*v);
            n += 1;
            sum += v;
            squares += v * v;
        }
    }
    if n < 2 {
        return 0.0;
    }
    let mean = sum / n as f64;
    ((squares - n as f64 * mean * mean).max(0.0) / (n - 1) as f64).sqrt()
}

fn summaries(j: usize, batches: &[Batch]) -> Vec<Summary> {
    batches.iter().filter_map(|b| b.rules[j].summary).collect()
}

/// JCGM 101 7.9.4: twice the standard deviation of the mean of the batch estimates of y, u(y)
/// and the two interval ends is at most δ, δ from u(y) of every draw so far. A job with no
/// defined draw has nothing to settle.
fn settled(j: usize, scale: f64, batches: &[Batch]) -> bool {
    let s = summaries(j, batches);
    if s.is_empty() {
        return true;
    }
    if s.len() < MIN_BATCHES {
        return false;
    }
    let delta = tolerance_in(pooled_uncertainty(j, batches), scale);
    [
        spread(&s, |x| x.0),
        spread(&s, |x| x.1),
        spread(&s, |x| x.2),
        spread(&s, |x| x.3),
    ]
    .iter()
    .all(|sd| 2.0 * sd <= delta)
}

impl Job<'_> {
    /// Whether an adaptive run may stop drawing for job `j`: settled, and its validation
    /// decided either way (a difference within the sampling noise of δ needs more draws).
    fn decided(&self, j: usize, batches: &[Batch]) -> bool {
        batches.len() >= MIN_BATCHES
            && settled(j, self.scale, batches)
            && self.result(j, batches, 0, true).validation != Validation::Unsettled
    }

    /// The Monte Carlo figures of job `j` from every batch, with the validation of the GUM
    /// framework (JCGM 101 8.2). An interval end is shown to differ only when it is further
    /// from the GUM one than δ by more than twice its own standard deviation (sampling noise
    /// is not a difference), and only once at least [`MIN_BATCHES`] batches say how large
    /// that deviation is; it agrees when the run has settled and both ends are within δ;
    /// anything between is not yet decided.
    fn result(&self, j: usize, batches: &[Batch], seed: u64, adaptive: bool) -> MonteCarlo {
        let rules = batches.iter().map(|b| &b.rules[j]);
        let draws: usize = rules.clone().map(|r| r.draws).sum();
        let undefined: usize = rules.clone().map(|r| r.undefined).sum();
        let conforming: usize = rules.clone().map(|r| r.conforming).sum();
        let all_conforming: usize = rules.clone().map(|r| r.all_conforming).sum();
        let cylinders = rules.clone().map(|r| r.cylinders).max().unwrap_or(0);
        let mut values: Vec<f32> = rules.flat_map(|r| r.deviations.iter().copied()).collect();
        let (mean, u, low, high) = statistics(&mut values).unwrap_or((0.0, 0.0, 0.0, 0.0));
        let y = self.value;
        let half = self.k * self.uncertainty;
        let linear_interval = (y - half, y + half);
        // both ends as deviations from y, as the draws are kept
        let d_low = (linear_interval.0 - y - low).abs();
        let d_high = (linear_interval.1 - y - high).abs();
        let delta = tolerance_in(u, self.scale);
        let summaries = summaries(j, batches);
        let (s_low, s_high) = (spread(&summaries, |x| x.2), spread(&summaries, |x| x.3));
        let settled = settled(j, self.scale, batches);
        let trusted = summaries.len() >= MIN_BATCHES;
        let validation =
            if trusted && (d_low > delta + 2.0 * s_low || d_high > delta + 2.0 * s_high) {
                Validation::NotAdequate
            } else if settled && d_low <= delta && d_high <= delta {
                Validation::Adequate
            } else {
                Validation::Unsettled
            };
        let share = |n: usize| n as f64 / draws.max(1) as f64;
        MonteCarlo {
            draws,
            undefined,
            seed,
            adaptive,
            settled,
            value: y + mean,
            standard_uncertainty: u,
            interval: (y + low, y + high),
            probability: share(conforming),
            all_cylinders: (cylinders > 1).then(|| share(all_conforming)),
            linear_value: y,
            linear_uncertainty: self.uncertainty,
            linear_k: self.k,
            linear_interval,
            tolerance: delta,
            distance: d_low.max(d_high),
            validation,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_linear_interval_takes_k_from_the_t_table() {
        // GUM JCGM 100:2008 Table G.2, p = 95 %: ν = 2 → 4.30, 9 → 2.26, ∞ → 1.960
        assert!((linear_k(2.0) - 4.30).abs() < 0.005);
        assert!((linear_k(9.0) - 2.26).abs() < 0.005);
        assert_eq!(linear_k(f64::INFINITY), K95);
    }

    #[test]
    fn the_tolerance_is_half_a_unit_in_the_second_significant_digit_of_u() {
        // JCGM 101:2008 7.9.2 (from memory): u = 0.0123 is 12 × 10⁻³, so δ = 0.0005
        assert!((tolerance(0.0123) - 0.0005).abs() < 1e-15);
        assert!((tolerance(1.0) - 0.05).abs() < 1e-15);
        assert!((tolerance(99.0) - 0.5).abs() < 1e-12);
        assert_eq!(tolerance(0.0), 0.0);
    }

    #[test]
    fn the_symmetric_interval_takes_the_r_th_and_r_plus_q_th_values() {
        // JCGM 101:2008 7.7.2 (from memory): M = 200, q = 190, r = 5: the 5th and 195th
        let mut values: Vec<f32> = (1..=200).rev().map(|v| v as f32).collect();
        assert_eq!(interval(&mut values), Some((5.0, 195.0)));
    }
}
