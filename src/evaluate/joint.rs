//! The probability that every cylinder conforms, beside the closest cylinder's.
//!
//! An input that appears in more than one cylinder's margin (a single stroke in every
//! cylinder's displacement, a rulebook literal with a stated uncertainty, an instrument's
//! calibration shared by every reading) makes the cylinders' margins correlated. Given the
//! shared inputs, the cylinders are independent, so
//!
//! P(all) = ∫ Π_i p_i(z) φ(z) dz,  p_i(z) = Φ((m_i + Σ_s b_is z_s) / u_i′),
//!
//! with z the shared inputs' deviations in standard units (b_is = c_is·u_s, the linearised
//! model of the GUM, each shared input normal), m_i the margin of cylinder i and u_i′ the part
//! of its standard uncertainty that is its own. Shared inputs whose columns of coefficients are
//! proportional are one dimension (a gasket's bore and thickness enter every cylinder's
//! clearance volume in the same proportion). With no shared dimension P(all) is the product of
//! the cylinders' probabilities; with one or two it is integrated by Gauss–Legendre quadrature
//! on panels split where a cylinder's margin crosses its limit (so a cylinder with no
//! uncertainty of its own, a step in z, is integrated as exactly as a smooth one; Gauss–Hermite
//! quadrature would not be); with more it is sampled with a seeded generator.
//!
//! The finding and the decision stay with the closest cylinder (ISO 14253-1 judges each
//! characteristic against its limit); the probability that all conform is reported beside it.

use rand::SeedableRng;
use rand_chacha::ChaCha8Rng;
use rand_distr::{Distribution, StandardNormal};

use super::dual::Dual;
use super::finding::{probability, probability_between};
use crate::load::InputId;

/// The probability that every cylinder conforms, and how it was computed.
#[derive(Clone, Debug, PartialEq)]
pub struct AllCylinders {
    /// The probability that every cylinder conforms, 0 to 1.
    pub probability: f64,
    /// How many cylinders.
    pub cylinders: usize,
    /// The inputs that appear in more than one cylinder's margin, by id.
    pub shared: Vec<InputId>,
    /// How it was computed.
    pub method: JointMethod,
}

/// How the probability that every cylinder conforms was computed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum JointMethod {
    /// No input is shared between cylinders: the product of their probabilities.
    Product,
    /// Gauss–Legendre quadrature over one or two shared dimensions.
    Quadrature {
        /// The shared dimensions integrated over.
        dimensions: usize,
    },
    /// Sampled over more than two shared dimensions, each draw the product of the cylinders'
    /// conditional probabilities.
    Sampled {
        /// The shared dimensions.
        dimensions: usize,
        /// Draws.
        samples: usize,
        /// The generator's seed.
        seed: u64,
        /// The standard error of the estimate.
        standard_error: f64,
    },
}

/// The degrees of freedom every cylinder's own part is taken with: infinite, a normal
/// distribution, even where a cylinder's finding uses Student's t for its repeated readings.
const NORMAL: f64 = f64::INFINITY;

/// Draws for more than two shared dimensions.
pub const SAMPLES: usize = 20_000;

/// The seed for more than two shared dimensions: fixed, so every run gives the same figure.
pub const SEED: u64 = 20_270_306;

/// Half-width of the integration range in standard units: Φ(−8.5) is below 10⁻¹⁶.
const REACH: f64 = 8.5;

/// Uniform panels over the range, before the cuts at each cylinder's limit.
const PANELS: usize = 16;

/// Gauss–Legendre points per panel.
const POINTS: usize = 10;

/// For a limit on one side, per cylinder: `margins` with the allowance already in them.
/// `None` with fewer than two cylinders.
pub fn one_sided(
    margins: &[Dual],
    strict: bool,
    u: impl Fn(InputId) -> f64,
) -> Option<AllCylinders> {
    let sides: Vec<Vec<(&Dual, bool)>> = margins.iter().map(|m| vec![(m, strict)]).collect();
    all_cylinders(&sides, &u)
}

/// For a range, per cylinder: the margins to the lower and the upper limit, each with the
/// allowance already in it. `None` with fewer than two cylinders.
pub fn between(low: &[Dual], high: &[Dual], u: impl Fn(InputId) -> f64) -> Option<AllCylinders> {
    let sides: Vec<Vec<(&Dual, bool)>> = low
        .iter()
        .zip(high)
        .map(|(l, h)| vec![(l, false), (h, false)])
        .collect();
    all_cylinders(&sides, &u)
}

/// One side of a cylinder's margin as a function of the shared dimensions z:
/// `a + b·z`, with its own standard uncertainty.
#[derive(Clone, Debug)]
struct Term {
    a: f64,
    b: Vec<f64>,
    own: f64,
    strict: bool,
}

impl Term {
    fn at(&self, z: &[f64]) -> f64 {
        self.a + self.b.iter().zip(z).map(|(b, z)| b * z).sum::<f64>()
    }
}

/// A cylinder's probability of conformance given the shared dimensions.
fn conditional(sides: &[Term], z: &[f64]) -> f64 {
    match sides {
        [one] => one_side(one.at(z), one.own, one.strict),
        [low, high] => both_sides(low.at(z), low.own, high.at(z), high.own),
        _ => 0.0,
    }
}

/// Φ(x) is exactly 1 in binary64 for every x from here on: libm's `erfc` returns 2 − e for
/// arguments below −0.84375, and beyond 6 (x ≥ 6√2 ≈ 8.49) e is below 2.2·10⁻¹⁷, under half
/// the spacing of doubles just below 2 (2⁻⁵³), so 2 − e rounds to 2 and Φ = 2/2 = 1
/// (`tests::normal_is_exactly_one_from_the_shortcut_on` checks it). A side this far inside
/// its limit needs no `erfc`.
const CERTAIN: f64 = 8.5;

/// The probability of one side, `margin` away with its own standard uncertainty `own`:
/// [`probability`] with a normal distribution, skipping its `erfc` where it is exactly 1.
fn one_side(margin: f64, own: f64, strict: bool) -> f64 {
    if surely_inside(margin, own) {
        1.0
    } else {
        probability(margin, own, NORMAL, strict)
    }
}

/// [`probability_between`] with a normal distribution on both sides, exactly 1 without
/// computing it when both sides are [`CERTAIN`]ly inside.
fn both_sides(low: f64, low_own: f64, high: f64, high_own: f64) -> f64 {
    if surely_inside(low, low_own) && surely_inside(high, high_own) {
        1.0
    } else {
        probability_between((low, low_own, NORMAL), (high, high_own, NORMAL))
    }
}

/// True when Φ(margin / own) is exactly 1 (see [`CERTAIN`]).
fn surely_inside(margin: f64, own: f64) -> bool {
    own > 0.0 && margin / own >= CERTAIN
}

fn all_cylinders(sides: &[Vec<(&Dual, bool)>], u: &dyn Fn(InputId) -> f64) -> Option<AllCylinders> {
    if sides.len() < 2 {
        return None;
    }
    let shared = shared_inputs(sides, u);
    let cylinders: Vec<Vec<Term>> = sides
        .iter()
        .map(|c| c.iter().map(|s| term(s, &shared, u)).collect())
        .collect();
    let cylinders = merge_proportional(cylinders);
    let dimensions = dimensions(&cylinders);
    let (probability, method) = match dimensions {
        0 => (
            cylinders.iter().map(|c| conditional(c, &[])).product(),
            JointMethod::Product,
        ),
        1 | 2 => (
            quadrature(&cylinders, dimensions),
            JointMethod::Quadrature { dimensions },
        ),
        _ => sampled(&cylinders, dimensions),
    };
    Some(AllCylinders {
        probability: probability.clamp(0.0, 1.0),
        cylinders: sides.len(),
        shared,
        method,
    })
}

/// Inputs with an uncertainty that appear in more than one cylinder's margin, sorted.
fn shared_inputs(sides: &[Vec<(&Dual, bool)>], u: &dyn Fn(InputId) -> f64) -> Vec<InputId> {
    let mut seen: Vec<(InputId, usize)> = Vec::new();
    for (cylinder, c) in sides.iter().enumerate() {
        for (m, _) in c {
            for (id, _) in &m.partials {
                match seen.iter_mut().find(|(i, _)| i == id) {
                    Some(entry) if entry.1 != cylinder && entry.1 != usize::MAX => {
                        entry.1 = usize::MAX;
                    }
                    Some(_) => {}
                    None => seen.push((*id, cylinder)),
                }
            }
        }
    }
    let mut shared: Vec<InputId> = seen
        .into_iter()
        .filter(|(id, c)| *c == usize::MAX && u(*id) > 0.0)
        .map(|(id, _)| id)
        .collect();
    shared.sort_unstable();
    shared
}

fn term(side: &(&Dual, bool), shared: &[InputId], u: &dyn Fn(InputId) -> f64) -> Term {
    let (m, strict) = *side;
    let b = shared.iter().map(|id| m.partial(*id) * u(*id)).collect();
    let own = m
        .partials
        .iter()
        .filter(|(id, _)| !shared.contains(id))
        .map(|(id, c)| (c * u(*id)).powi(2))
        .sum::<f64>()
        .sqrt();
    Term {
        a: m.value,
        b,
        own,
        strict,
    }
}

/// Shared dimensions whose coefficients are proportional over every side of every cylinder
/// merged into one: col·z_s + λ·col·z_t is col·√(1 + λ²)·z′ with z′ standard normal, exactly.
fn merge_proportional(mut cylinders: Vec<Vec<Term>>) -> Vec<Vec<Term>> {
    let column =
        |cs: &[Vec<Term>], s: usize| -> Vec<f64> { cs.iter().flatten().map(|t| t.b[s]).collect() };
    let mut s = 0;
    while s < dimensions(&cylinders) {
        let mut t = s + 1;
        while t < dimensions(&cylinders) {
            match ratio(&column(&cylinders, t), &column(&cylinders, s)) {
                Some(lambda) => {
                    for term in cylinders.iter_mut().flatten() {
                        term.b[s] *= (1.0 + lambda * lambda).sqrt();
                        term.b.remove(t);
                    }
                }
                None => t += 1,
            }
        }
        s += 1;
    }
    cylinders
}

/// The shared dimensions left.
fn dimensions(cylinders: &[Vec<Term>]) -> usize {
    cylinders
        .first()
        .and_then(|c| c.first())
        .map_or(0, |t| t.b.len())
}

/// λ with `column = λ·reference` to within rounding, if there is one.
fn ratio(column: &[f64], reference: &[f64]) -> Option<f64> {
    let (at, r) = reference
        .iter()
        .enumerate()
        .max_by(|a, b| a.1.abs().total_cmp(&b.1.abs()))?;
    if *r == 0.0 {
        return None;
    }
    let lambda = column.get(at)? / r;
    let scale = column
        .iter()
        .chain(reference)
        .fold(0.0_f64, |m, x| m.max(x.abs()));
    column
        .iter()
        .zip(reference)
        .all(|(c, r)| (c - lambda * r).abs() <= 1e-12 * scale)
        .then_some(lambda)
}

/// ∫ Π_i p_i(z) φ(z) dz over one or two dimensions by [`nested`], leaving out the cylinders
/// whose conditional probability is exactly 1 at every node and whose cuts all fall on the
/// ends of the range ([`certain_everywhere`]): each only multiplies the integrand by 1 and
/// adds panel ends that are already there, so the sum is the same to the last bit. With none
/// left the integrand is 1 and the sum is the same for every engine ([`uniform`]).
fn quadrature(cylinders: &[Vec<Term>], dimensions: usize) -> f64 {
    let active: Vec<Vec<Term>> = cylinders
        .iter()
        .filter(|c| !c.iter().all(certain_everywhere))
        .cloned()
        .collect();
    if active.is_empty() {
        return uniform(dimensions);
    }
    nested(
        &active,
        &mut Vec::with_capacity(dimensions),
        dimensions,
        &mut Scratch::default(),
    )
}

/// The quadrature of an integrand that is 1 everywhere, over one or two dimensions: the same
/// sum [`nested`] makes for cylinders that are all [`certain_everywhere`], made once.
fn uniform(dimensions: usize) -> f64 {
    static SUMS: std::sync::OnceLock<[f64; 2]> = std::sync::OnceLock::new();
    let sums = SUMS
        .get_or_init(|| [1, 2].map(|d| nested(&[], &mut Vec::new(), d, &mut Scratch::default())));
    match dimensions {
        1 => sums[0],
        2 => sums[1],
        _ => nested(&[], &mut Vec::new(), dimensions, &mut Scratch::default()),
    }
}

/// True when a side's conditional probability is exactly 1 at every node of the range
/// (|z_s| ≤ [`REACH`]) and every cut it makes in any dimension lies beyond the range, so
/// that [`cuts`] clamps it onto an end. Both are decided on the least margin over the range,
/// a − Σ|b_s|·REACH, with a relative allowance of 10⁻⁹ for the rounding at the nodes.
fn certain_everywhere(t: &Term) -> bool {
    let reach: f64 = t.b.iter().map(|b| b.abs() * REACH).sum();
    let lowest = t.a - reach - 1e-9 * (t.a.abs() + reach);
    let inside = if t.own > 0.0 {
        lowest >= CERTAIN * t.own
    } else {
        lowest > 0.0
    };
    inside && (0..t.b.len()).all(|level| cuts_beyond_range(t, level))
}

/// True when every cut of side `t` in dimension `level` lies beyond the range whatever the
/// earlier dimensions are: the crossing is at −offset/slope, the cuts at most 6 widths from
/// it, the width √(own² + Σ_later b²)/|slope| (as [`cuts`] makes them).
fn cuts_beyond_range(t: &Term, level: usize) -> bool {
    let slope = t.b[level];
    if slope == 0.0 {
        return true;
    }
    let before: f64 = t.b[..level].iter().map(|b| b.abs() * REACH).sum();
    let later: f64 = t.b[level + 1..].iter().map(|b| b * b).sum();
    let least_offset = t.a - before;
    let needed = REACH * slope.abs() + 6.0 * (t.own * t.own + later).sqrt();
    least_offset - needed > 1e-9 * (t.a.abs() + before + needed)
}

/// Buffers [`nested`] reuses: the panel ends of each dimension, the sides at the last one.
#[derive(Default)]
struct Scratch {
    ends: Vec<Vec<f64>>,
    last: Vec<Sides>,
}

/// A cylinder's sides in the last dimension, the earlier ones fixed.
#[derive(Clone, Copy)]
enum Sides {
    One(Line),
    Two(Line, Line),
    Other,
}

/// One side in the last dimension z: `a + (base + slope·z)`, where base is Σ b_s·z_s over the
/// dimensions already fixed, summed in the order [`Term::at`] sums them, so the margin at
/// every node is the same double.
#[derive(Clone, Copy)]
struct Line {
    a: f64,
    base: f64,
    slope: f64,
    own: f64,
    strict: bool,
}

impl Line {
    fn of(t: &Term, fixed: &[f64], level: usize) -> Line {
        Line {
            a: t.a,
            base: t.b[..level]
                .iter()
                .zip(fixed)
                .map(|(b, z)| b * z)
                .sum::<f64>(),
            slope: t.b[level],
            own: t.own,
            strict: t.strict,
        }
    }

    fn at(&self, z: f64) -> f64 {
        self.a + (self.base + self.slope * z)
    }
}

impl Sides {
    fn of(sides: &[Term], fixed: &[f64], level: usize) -> Sides {
        match sides {
            [one] => Sides::One(Line::of(one, fixed, level)),
            [low, high] => Sides::Two(Line::of(low, fixed, level), Line::of(high, fixed, level)),
            _ => Sides::Other,
        }
    }

    /// [`conditional`] at z in the last dimension.
    fn conditional(&self, z: f64) -> f64 {
        match self {
            Sides::One(one) => one_side(one.at(z), one.own, one.strict),
            Sides::Two(low, high) => both_sides(low.at(z), low.own, high.at(z), high.own),
            Sides::Other => 0.0,
        }
    }
}

/// ∫ φ(z_level) … over the dimensions from `fixed.len()` on, the earlier ones fixed.
fn nested(
    cylinders: &[Vec<Term>],
    fixed: &mut Vec<f64>,
    dimensions: usize,
    scratch: &mut Scratch,
) -> f64 {
    let level = fixed.len();
    if level >= dimensions {
        return cylinders.iter().map(|c| conditional(c, fixed)).product();
    }
    if scratch.ends.len() <= level {
        scratch.ends.resize_with(level + 1, Vec::new);
    }
    let mut ends = std::mem::take(&mut scratch.ends[level]);
    cuts(&mut ends, cylinders, fixed, level);
    let last = level + 1 == dimensions;
    if last {
        scratch.last.clear();
        scratch
            .last
            .extend(cylinders.iter().map(|c| Sides::of(c, fixed, level)));
    }
    let (nodes, weights) = legendre();
    let mut total = 0.0;
    for panel in ends.windows(2) {
        let (low, high) = (panel[0], panel[1]);
        if high <= low {
            continue;
        }
        let (middle, half) = ((low + high) / 2.0, (high - low) / 2.0);
        for (x, w) in nodes.iter().zip(weights) {
            let z = middle + half * x;
            let inner = if last {
                scratch.last.iter().map(|c| c.conditional(z)).product()
            } else {
                fixed.push(z);
                let inner = nested(cylinders, fixed, dimensions, scratch);
                fixed.pop();
                inner
            };
            total += w * half * normal_density(z) * inner;
        }
    }
    scratch.ends[level] = ends;
    total
}

/// Panel ends for dimension `level`, into `ends`: a uniform grid, and around each side's
/// crossing of its limit, at multiples of the width over which its probability goes from 0 to
/// 1 (its own uncertainty and the dimensions still to integrate, over its slope in this one).
/// A cut clamped onto an end of the range is the grid's end already and is not added twice.
fn cuts(ends: &mut Vec<f64>, cylinders: &[Vec<Term>], fixed: &[f64], level: usize) {
    ends.clear();
    ends.extend((0..=PANELS).map(|i| -REACH + 2.0 * REACH * i as f64 / PANELS as f64));
    for t in cylinders.iter().flatten() {
        let slope = t.b[level];
        if slope == 0.0 {
            continue;
        }
        let offset = t.a + t.b.iter().zip(fixed).map(|(b, z)| b * z).sum::<f64>();
        let later: f64 = t.b[level + 1..].iter().map(|b| b * b).sum();
        let width = (t.own * t.own + later).sqrt() / slope.abs();
        let centre = -offset / slope;
        for k in [0.0, 0.5, -0.5, 1.5, -1.5, 3.0, -3.0, 6.0, -6.0] {
            let cut = (centre + k * width).clamp(-REACH, REACH);
            if cut.abs() != REACH {
                ends.push(cut);
            }
        }
    }
    ends.sort_by(f64::total_cmp);
    ends.dedup();
}

/// Standard normal density φ.
fn normal_density(z: f64) -> f64 {
    (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt()
}

/// Gauss–Legendre nodes and weights on [−1, 1], found once by Newton's method on the Legendre
/// polynomial P_n (its recurrence (k+1)P_{k+1} = (2k+1)xP_k − kP_{k−1}).
fn legendre() -> &'static ([f64; POINTS], [f64; POINTS]) {
    static RULE: std::sync::OnceLock<([f64; POINTS], [f64; POINTS])> = std::sync::OnceLock::new();
    RULE.get_or_init(|| {
        let n = POINTS;
        let mut nodes = [0.0; POINTS];
        let mut weights = [0.0; POINTS];
        for i in 0..n {
            let mut x = (std::f64::consts::PI * (i as f64 + 0.75) / (n as f64 + 0.5)).cos();
            for _ in 0..100 {
                let (p, dp) = legendre_at(n, x);
                let step = p / dp;
                x -= step;
                if step.abs() < 1e-16 {
                    break;
                }
            }
            let (_, slope) = legendre_at(n, x);
            nodes[i] = x;
            weights[i] = 2.0 / ((1.0 - x * x) * slope * slope);
        }
        (nodes, weights)
    })
}

/// P_n(x) and P_n′(x).
fn legendre_at(n: usize, x: f64) -> (f64, f64) {
    let (mut previous, mut p) = (1.0, x);
    for k in 1..n {
        let k = k as f64;
        let next = ((2.0 * k + 1.0) * x * p - k * previous) / (k + 1.0);
        previous = p;
        p = next;
    }
    let n = n as f64;
    (p, n * (x * p - previous) / (x * x - 1.0))
}

/// The mean of the cylinders' conditional product over seeded standard normal draws.
fn sampled(cylinders: &[Vec<Term>], dimensions: usize) -> (f64, JointMethod) {
    let mut rng = ChaCha8Rng::seed_from_u64(SEED);
    let mut z = vec![0.0; dimensions];
    let (mut sum, mut squares) = (0.0, 0.0);
    for _ in 0..SAMPLES {
        for x in z.iter_mut() {
            *x = StandardNormal.sample(&mut rng);
        }
        let p: f64 = cylinders.iter().map(|c| conditional(c, &z)).product();
        sum += p;
        squares += p * p;
    }
    let n = SAMPLES as f64;
    let mean = sum / n;
    let variance = (squares / n - mean * mean).max(0.0) * n / (n - 1.0);
    (
        mean,
        JointMethod::Sampled {
            dimensions,
            samples: SAMPLES,
            seed: SEED,
            standard_error: (variance / n).sqrt(),
        },
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gauss_legendre_is_exact_for_polynomials_of_degree_2n_minus_1() {
        // a property of the rule (any numerical analysis text): ∫₋₁¹ x^k dx = 2/(k+1), k even
        let (nodes, weights) = legendre();
        for k in (0..2 * POINTS).step_by(2) {
            let sum: f64 = nodes
                .iter()
                .zip(weights)
                .map(|(x, w)| w * x.powi(k as i32))
                .sum();
            assert!(
                (sum - 2.0 / (k as f64 + 1.0)).abs() < 1e-13,
                "k = {k}: {sum}"
            );
        }
    }

    #[test]
    fn normal_is_exactly_one_from_the_shortcut_on() {
        // the claim behind CERTAIN, on the function itself: Φ(x) is the double 1 for every x
        // sampled from 8.4 (below CERTAIN, for the rounding of margin/own) to beyond erfc's
        // last branch (|x/√2| ≥ 28) and at infinity; and it is not 1 at 8 (Φ(8) = 1 − 6.2e-16,
        // any table of the normal distribution), so the shortcut does skip a real computation
        let mut x = 8.4;
        while x < 45.0 {
            assert_eq!(
                probability(x, 1.0, NORMAL, false).to_bits(),
                1.0_f64.to_bits(),
                "{x}"
            );
            x += 1e-4;
        }
        for x in [1e3, 1e100, f64::MAX, f64::INFINITY] {
            assert_eq!(probability(x, 1.0, NORMAL, true), 1.0, "{x}");
        }
        assert!(probability(8.0, 1.0, NORMAL, false) < 1.0);
        assert!(one_side(8.5, 1.0, false) == 1.0 && one_side(8.0, 1.0, false) < 1.0);
    }

    /// The quadrature as it was before the cylinders certain everywhere were left out and the
    /// margins at the last dimension were summed from their fixed part: the reference the
    /// faster one must equal to the last bit.
    fn reference(cylinders: &[Vec<Term>], fixed: &mut Vec<f64>, dimensions: usize) -> f64 {
        let plain = |sides: &[Term], z: &[f64]| match sides {
            [one] => probability(one.at(z), one.own, NORMAL, one.strict),
            [low, high] => {
                probability_between((low.at(z), low.own, NORMAL), (high.at(z), high.own, NORMAL))
            }
            _ => 0.0,
        };
        let level = fixed.len();
        if level == dimensions {
            return cylinders.iter().map(|c| plain(c, fixed)).product();
        }
        let mut cuts: Vec<f64> = (0..=PANELS)
            .map(|i| -REACH + 2.0 * REACH * i as f64 / PANELS as f64)
            .collect();
        for t in cylinders.iter().flatten() {
            let slope = t.b[level];
            if slope == 0.0 {
                continue;
            }
            let offset = t.a
                + t.b
                    .iter()
                    .zip(fixed.iter())
                    .map(|(b, z)| b * z)
                    .sum::<f64>();
            let later: f64 = t.b[level + 1..].iter().map(|b| b * b).sum();
            let width = (t.own * t.own + later).sqrt() / slope.abs();
            let centre = -offset / slope;
            for k in [0.0, 0.5, -0.5, 1.5, -1.5, 3.0, -3.0, 6.0, -6.0] {
                cuts.push((centre + k * width).clamp(-REACH, REACH));
            }
        }
        cuts.sort_by(f64::total_cmp);
        cuts.dedup();
        let (nodes, weights) = legendre();
        let mut total = 0.0;
        for panel in cuts.windows(2) {
            let (low, high) = (panel[0], panel[1]);
            if high <= low {
                continue;
            }
            let (middle, half) = ((low + high) / 2.0, (high - low) / 2.0);
            for (x, w) in nodes.iter().zip(weights) {
                let z = middle + half * x;
                fixed.push(z);
                total += w * half * normal_density(z) * reference(cylinders, fixed, dimensions);
                fixed.pop();
            }
        }
        total
    }

    #[test]
    fn the_quadrature_equals_the_plain_one_to_the_last_bit() {
        // seeded cases of one and two dimensions mixing cylinders far inside (left out),
        // near their limit, outside it, without an uncertainty of their own, and ranges
        let mut rng = ChaCha8Rng::seed_from_u64(14);
        let mut left_out = 0;
        for case in 0..120 {
            let dimensions = 1 + case % 2;
            let two_sided = case % 3 == 0;
            let cylinders: Vec<Vec<Term>> = (0..2 + case % 7)
                .map(|_| {
                    let mut side = |strict: bool| {
                        let own = if rand::RngExt::random_bool(&mut rng, 0.15) {
                            0.0
                        } else {
                            rand::RngExt::random_range(&mut rng, 0.05..1.0)
                        };
                        let b: Vec<f64> = (0..dimensions)
                            .map(|_| rand::RngExt::random_range(&mut rng, -0.6..0.6))
                            .collect();
                        let reach: f64 = b.iter().map(|b| b.abs() * REACH).sum();
                        let far = reach + CERTAIN * own;
                        let a = far * rand::RngExt::random_range(&mut rng, -0.3..1.6);
                        Term { a, b, own, strict }
                    };
                    if two_sided {
                        vec![side(false), side(false)]
                    } else {
                        vec![side(case % 5 == 0)]
                    }
                })
                .collect();
            left_out += cylinders
                .iter()
                .filter(|c| c.iter().all(certain_everywhere))
                .count();
            let fast = quadrature(&cylinders, dimensions);
            let plain = reference(&cylinders, &mut Vec::new(), dimensions);
            assert_eq!(
                fast.to_bits(),
                plain.to_bits(),
                "case {case}: {fast} {plain}"
            );
        }
        // the cases do exercise the cylinders left out, and the integrand that is 1 throughout
        assert!(left_out > 50, "{left_out}");
        assert_eq!(
            quadrature(
                &[vec![Term {
                    a: 40.0,
                    b: vec![1.0],
                    own: 1.0,
                    strict: false
                }]],
                1
            )
            .to_bits(),
            reference(&[], &mut Vec::new(), 1).to_bits()
        );
    }

    #[test]
    fn proportional_shared_inputs_are_one_dimension() {
        // cylinder i's margin reads inputs 0 and 1 in the same proportion (2:1) everywhere
        let margin = |value: f64, c: f64| Dual {
            value,
            partials: vec![(0, 2.0 * c), (1, c), (10 + c as InputId, 1.0)],
        };
        let margins = [margin(1.0, 1.0), margin(1.5, 2.0), margin(2.0, 3.0)];
        let all = one_sided(&margins, false, |_| 0.5);
        let all = all.as_ref().map(|a| (a.method, a.shared.clone()));
        assert_eq!(
            all,
            Some((JointMethod::Quadrature { dimensions: 1 }, vec![0, 1]))
        );
    }
}
