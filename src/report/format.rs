//! Formatting numbers for people. A reading is shown as it was written (the view keeps its
//! text); a value computed from readings is shown with the digits its uncertainty supports
//! (GUM 7.2.6, [`Digits::supported_by`]): the uncertainty to two significant digits and the
//! value rounded to the same decimal place. A value without an uncertainty keeps six
//! significant digits, trailing zeros trimmed. Probabilities are percentages. A count is
//! printed with its noun in the singular or the plural ([`count`]).

use crate::units::Unit;

/// `n` and its noun, singular for one and plural otherwise: `1 engine`, `0 engines`,
/// `3 classes`. The plural is given, since English forms it in more than one way.
pub fn count(n: usize, one: &str, many: &str) -> String {
    format!("{n} {}", if n == 1 { one } else { many })
}

/// How many digits to show of a value.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Digits {
    /// Rounded to this decimal place: 3 is thousandths, 0 units, −1 tens. Set by an
    /// uncertainty (GUM 7.2.6) or by the digits a value was written with.
    Place(i32),
    /// Six significant digits, trailing zeros trimmed: a value known without an uncertainty.
    Significant,
}

/// No value is shown with more significant digits than this: a double holds about 15.
const MAX_SIGNIFICANT: i32 = 15;

/// The most decimal places a fraction as written is given: `1/3` has no end, and `1/64`
/// (0.015625) is the finest fraction the trade writes.
pub const FRACTION_PLACES: i32 = 6;

/// The decimal places of a fraction `N/D` or mixed fraction `W-N/D` as written: those of its
/// exact decimal expansion, at most [`FRACTION_PLACES`]; `None` when it is not a fraction.
fn fraction_places(number: &str) -> Option<i32> {
    let (whole, fraction) = number.split_once('-').unwrap_or(("0", number));
    let (numerator, denominator) = fraction.split_once('/')?;
    let digits = |s: &str| !s.is_empty() && s.chars().all(|c| c.is_ascii_digit());
    if !digits(whole) || !digits(numerator) || !digits(denominator) {
        return None;
    }
    let (numerator, mut denominator) = (
        numerator.parse::<u64>().ok()?,
        denominator.parse::<u64>().ok()?,
    );
    if denominator == 0 {
        return None;
    }
    denominator /= gcd(numerator, denominator);
    // 1/D ends after max(a, b) places when D = 2^a 5^b, and never otherwise
    let (mut twos, mut fives) = (0, 0);
    while denominator % 2 == 0 {
        denominator /= 2;
        twos += 1;
    }
    while denominator % 5 == 0 {
        denominator /= 5;
        fives += 1;
    }
    let places = if denominator == 1 {
        twos.max(fives)
    } else {
        FRACTION_PLACES
    };
    Some(places.min(FRACTION_PLACES))
}

fn gcd(a: u64, b: u64) -> u64 {
    if b == 0 { a } else { gcd(b, a % b) }
}

impl Digits {
    /// The digits an uncertainty `u` supports (GUM JCGM 100:2008, 7.2.6): `u` to two
    /// significant digits, and every value it belongs to rounded to the same decimal place.
    /// Without an uncertainty (zero, or not a finite number), six significant digits.
    pub fn supported_by(u: f64) -> Digits {
        if !u.is_finite() || u <= 0.0 {
            return Digits::Significant;
        }
        // two significant digits in decimal, as `{:.1e}` rounds them: 0.0999 gives 1.0e-1
        match two_digit_exponent(u) {
            Some(exponent) => Digits::Place(1 - exponent),
            None => Digits::Significant,
        }
    }

    /// The digits an uncertainty `u_si` in SI units supports for a value shown in `unit`.
    pub fn supported_in(u_si: f64, unit: Option<&Unit>) -> Digits {
        Digits::supported_by(u_si / unit.map_or(1.0, |u| u.to_si))
    }

    /// The decimal places of a number as written (`4.0346 in` has 4, `3200 lb` has 0); a
    /// fraction is exact, so it has the places of its decimal expansion (`1-3/4 in` has 2,
    /// `5/64 in` 6), at most [`FRACTION_PLACES`]; a number in exponent form gives six
    /// significant digits.
    pub fn as_written(text: &str) -> Digits {
        let number = text.split_whitespace().next().unwrap_or_default();
        let number = number.trim_start_matches(['-', '+', '−']);
        if let Some(places) = fraction_places(number) {
            return Digits::Place(places);
        }
        let (whole, fraction) = number.split_once('.').unwrap_or((number, ""));
        let all_digits = |s: &str| s.chars().all(|c| c.is_ascii_digit());
        if whole.is_empty() && fraction.is_empty() || !all_digits(whole) || !all_digits(fraction) {
            return Digits::Significant;
        }
        Digits::Place(fraction.len() as i32)
    }

    /// These digits, made finer where `v` would round to zero, so that a nonzero `v` shows
    /// at least one significant digit (a fail by 0.0000039 in is never `0.000 in`).
    pub fn showing(self, v: f64) -> Digits {
        let Digits::Place(place) = self else {
            return self;
        };
        if v == 0.0 || !v.is_finite() || v.abs() >= 0.5 * 10f64.powi(-place) {
            return self;
        }
        Digits::Place(place.max(-(v.abs().log10().floor() as i32)))
    }

    /// The finer of two: the one that shows more decimal places.
    pub fn finer(self, other: Digits) -> Digits {
        match (self, other) {
            (Digits::Place(a), Digits::Place(b)) => Digits::Place(a.max(b)),
            (Digits::Significant, d) | (d, Digits::Significant) => d,
        }
    }

    /// `v` with these digits.
    pub fn number(self, v: f64) -> String {
        match self {
            Digits::Significant => significant(v, 6),
            Digits::Place(place) => fixed(v, place),
        }
    }

    /// A value in SI units shown in `unit` with these digits (`4.0312 in`), or a plain number.
    pub fn quantity(self, si: f64, unit: Option<&Unit>) -> String {
        match unit {
            Some(u) => with_symbol(self.number(si / u.to_si), u.symbol),
            None => self.number(si),
        }
    }
}

/// `number` and then ` symbol`, in the one string.
fn with_symbol(mut number: String, symbol: &str) -> String {
    number.reserve(1 + symbol.len());
    number.push(' ');
    number.push_str(symbol);
    number
}

/// The decimal exponent `{:.1e}` prints for `u` (positive, finite): the E with
/// 10 ≤ round(u·10^(1−E)) ≤ 99, the rounding exact and halves to even ([`scaled`]).
/// Where [`scaled`] cannot reach, the formatter is asked.
fn two_digit_exponent(u: f64) -> Option<i32> {
    let mut exponent = u.log10().floor() as i32;
    // log10 can be one off next to a power of ten; the exact rounding decides
    for _ in 0..4 {
        match scaled(u, 1 - exponent) {
            Some(q) if q >= 100 => exponent += 1,
            Some(q) if q < 10 => exponent -= 1,
            Some(_) => return Some(exponent),
            None => break,
        }
    }
    let text = format!("{u:.1e}");
    text.split_once('e')
        .and_then(|(_, e)| e.parse::<i32>().ok())
}

/// |v|·10^place rounded to an integer, computed exactly from the double's binary value
/// m·2^e, a half going to the even neighbour: the rounding Rust's `{:.N}` and `{:.Ne}`
/// make. `None` when v is not finite or the exact fraction does not fit 128 bits.
fn scaled(v: f64, place: i32) -> Option<u128> {
    if !v.is_finite() {
        return None;
    }
    let bits = v.abs().to_bits();
    let (biased, fraction) = ((bits >> 52) as i32, bits & ((1 << 52) - 1));
    let (m, e) = if biased == 0 {
        (fraction, -1074)
    } else {
        (fraction | 1 << 52, biased - 1075)
    };
    if m == 0 {
        return Some(0);
    }
    let ten = 10u128.checked_pow(place.unsigned_abs())?;
    let (mut numerator, mut denominator) = if place >= 0 {
        ((m as u128).checked_mul(ten)?, 1u128)
    } else {
        (m as u128, ten)
    };
    if e >= 0 {
        numerator = shifted(numerator, e.unsigned_abs())?;
    } else {
        denominator = shifted(denominator, e.unsigned_abs())?;
    }
    if denominator > 1 << 126 {
        return None;
    }
    let (q, r) = if denominator.is_power_of_two() {
        let shift = denominator.trailing_zeros();
        (numerator >> shift, numerator & (denominator - 1))
    } else {
        (numerator / denominator, numerator % denominator)
    };
    let twice = 2 * r;
    Some(
        if twice > denominator || (twice == denominator && q % 2 == 1) {
            q + 1
        } else {
            q
        },
    )
}

/// x·2^s, `None` when it does not fit.
fn shifted(x: u128, s: u32) -> Option<u128> {
    (s < 128 && x.leading_zeros() >= s).then(|| x << s)
}

/// `format!("{v:.decimals$}")`, the same text, made from [`scaled`] without the formatter
/// where the exact value fits (the sign of a negative value kept, as the formatter keeps it).
fn decimal(v: f64, decimals: usize) -> String {
    let exact = i32::try_from(decimals)
        .ok()
        .and_then(|d| scaled(v, d))
        .and_then(|q| u64::try_from(q).ok());
    let Some(q) = exact else {
        return format!("{v:.decimals$}");
    };
    // the digits of q, at least one before the point, from the right
    let mut digits = [0u8; 48];
    let mut at = digits.len();
    let mut rest = q;
    while rest > 0 || digits.len() - at <= decimals {
        at -= 1;
        digits[at] = b'0' + (rest % 10) as u8;
        rest /= 10;
    }
    let (whole, fraction) = digits[at..].split_at(digits.len() - at - decimals);
    let mut text = String::with_capacity(whole.len() + fraction.len() + 2);
    if v.is_sign_negative() {
        text.push('-');
    }
    text.push_str(std::str::from_utf8(whole).unwrap_or_default());
    if !fraction.is_empty() {
        text.push('.');
        text.push_str(std::str::from_utf8(fraction).unwrap_or_default());
    }
    text
}

/// A bare number as serde_yaml hands it over (a double, its text lost): the shortest text
/// that reads back as the same double, so `1.5` stays `1.5` but `1.50` becomes `1.5`.
pub fn shortest(v: f64) -> String {
    format!("{v}")
}

/// A value and its uncertainty with the digits the uncertainty supports (GUM 7.2.6): the
/// uncertainty to two significant digits, the value to the same decimal place. Without an
/// uncertainty the value has six significant digits and the uncertainty reads `0`.
pub fn with_uncertainty(value: f64, u: f64) -> (String, String) {
    match Digits::supported_by(u) {
        Digits::Significant => (number(value), uncertainty(u)),
        digits => (digits.number(value), digits.number(u)),
    }
}

/// The digits of a margin `limit − value` and of its expanded uncertainty: with an
/// uncertainty, the place two significant digits of `expanded_si` end at (GUM 7.2.6); without
/// one, the finer decimal place of the value and the limit as shown, so the difference of the
/// two numbers a reader sees is given exactly.
pub fn margin_digits(
    expanded_si: f64,
    unit: Option<&Unit>,
    value_shown: &str,
    limit_shown: &str,
) -> Digits {
    match Digits::supported_in(expanded_si, unit) {
        Digits::Significant => {
            Digits::as_written(value_shown).finer(Digits::as_written(limit_shown))
        }
        place => place,
    }
}

/// `v` rounded to `place` decimals (negative: tens, hundreds …), at most 15 significant
/// digits, never `-0`.
fn fixed(v: f64, place: i32) -> String {
    if !v.is_finite() {
        return significant(v, 6);
    }
    let magnitude = if v == 0.0 {
        0
    } else {
        v.abs().log10().floor() as i32
    };
    let place = place.min(MAX_SIGNIFICANT - 1 - magnitude).min(20);
    let mut text = if place >= 0 {
        decimal(v, place as usize)
    } else {
        let scale = 10f64.powi(-place);
        match decimal((v / scale).round(), 0) {
            t if t == "0" || t == "-0" => "0".to_string(),
            mut t => {
                t.extend(std::iter::repeat_n('0', (-place) as usize));
                t
            }
        }
    };
    if text.starts_with('-') && text.chars().all(|c| matches!(c, '-' | '0' | '.')) {
        text.remove(0);
    }
    text
}

/// A value to six significant digits, trailing zeros trimmed.
pub fn number(v: f64) -> String {
    significant(v, 6)
}

/// An uncertainty to two significant digits.
pub fn uncertainty(v: f64) -> String {
    significant(v, 2)
}

fn significant(v: f64, digits: i32) -> String {
    if v == 0.0 {
        // `-0` is zero: never printed with a sign
        return "0".to_string();
    }
    if !v.is_finite() {
        return if v.is_nan() {
            "n/a".to_string()
        } else {
            format!("{v}")
        };
    }
    let magnitude = v.abs().log10().floor() as i32;
    let decimals = (digits - 1 - magnitude).clamp(0, 10) as usize;
    let mut text = decimal(v, decimals);
    if text.contains('.') {
        let kept = text.trim_end_matches('0').trim_end_matches('.').len();
        text.truncate(kept);
    }
    if text == "-0" { "0".to_string() } else { text }
}

/// A value in SI units shown in `unit` (`4.0312 in`), or as a plain number.
pub fn quantity(si: f64, unit: Option<&Unit>) -> String {
    match unit {
        Some(u) => with_symbol(number(si / u.to_si), u.symbol),
        None => number(si),
    }
}

/// A probability as a percentage. With an uncertainty the ends are shown as bounds, never as
/// a certain 100 % or 0 %.
pub fn probability(p: f64, uncertain: bool) -> String {
    if p >= 0.9999 && (p < 1.0 || uncertain) {
        "≥ 99.99 %".to_string()
    } else if p <= 0.0001 && (p > 0.0 || uncertain) {
        "≤ 0.01 %".to_string()
    } else {
        format!("{:.2} %", p * 100.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::SeedableRng;

    #[test]
    fn a_count_takes_the_singular_for_one_only() {
        assert_eq!(count(1, "engine", "engines"), "1 engine");
        assert_eq!(count(0, "engine", "engines"), "0 engines");
        assert_eq!(count(3, "class", "classes"), "3 classes");
    }

    #[test]
    fn gum_7_2_6_two_significant_digits_of_u_and_the_value_to_the_same_place() {
        // GUM JCGM 100:2008, 7.2.2 (from memory): m_S = 100.021 47 g with u_c = 0.35 mg
        assert_eq!(
            with_uncertainty(100.021_47, 0.000_35),
            ("100.02147".to_string(), "0.00035".to_string())
        );
        // GUM 7.2.6 (from memory): y = 10.057 62 Ω with u_c(y) = 27 mΩ is rounded to 10.058 Ω
        assert_eq!(
            with_uncertainty(10.057_62, 0.027),
            ("10.058".to_string(), "0.027".to_string())
        );
        // 7.2.4's form (from memory): m_S = (100.021 47 ± 0.000 79) g with U = 0.79 mg, k = 2.26
        assert_eq!(
            with_uncertainty(100.021_47, 0.000_79),
            ("100.02147".to_string(), "0.00079".to_string())
        );
    }

    #[test]
    fn the_place_follows_u_after_its_rounding_and_keeps_a_trailing_zero() {
        // two significant digits of 0.0999 are 0.10: the place is the hundredths
        assert_eq!(Digits::supported_by(0.0999), Digits::Place(2));
        assert_eq!(with_uncertainty(2.718_49, 0.0999).0, "2.72");
        assert_eq!(with_uncertainty(8.643_53, 0.014).0, "8.644");
        assert_eq!(
            with_uncertainty(3080.0, 2.0),
            ("3080.0".into(), "2.0".into())
        );
        // u of 270 ends at the tens: the value is rounded to tens
        assert_eq!(
            with_uncertainty(12_345.0, 270.0),
            ("12350".into(), "270".into())
        );
        assert_eq!(
            with_uncertainty(-0.000_01, 0.0012),
            ("0.0000".into(), "0.0012".into())
        );
    }

    #[test]
    fn without_an_uncertainty_six_significant_digits() {
        assert_eq!(Digits::supported_by(0.0), Digits::Significant);
        assert_eq!(Digits::supported_by(f64::NAN), Digits::Significant);
        assert_eq!(
            with_uncertainty(355.926_300_6, 0.0),
            ("355.926".into(), "0".into())
        );
    }

    #[test]
    fn decimals_are_the_formatters_to_the_byte() {
        // the reference is Rust's own `{:.N}` (exact, halves to even): random doubles over
        // every magnitude the reports meet and beyond, each place from 0 to 20, exact ties
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(7);
        for _ in 0..20_000 {
            let bits: u64 = rand::RngExt::random(&mut rng);
            let v = f64::from_bits(bits);
            let magnitude: i32 = rand::RngExt::random_range(&mut rng, -30..30);
            let w = rand::RngExt::random_range(&mut rng, -10.0..10.0) * 10f64.powi(magnitude);
            for x in [v, w] {
                let d: usize = rand::RngExt::random_range(&mut rng, 0..=20);
                assert_eq!(decimal(x, d), format!("{x:.d$}"), "{x:e} to {d}");
            }
        }
        for (x, d) in [
            (0.125, 2),
            (0.375, 2),
            (2.5, 0),
            (3.5, 0),
            (-2.5, 0),
            (0.5, 0),
        ] {
            assert_eq!(decimal(x, d), format!("{x:.d$}"), "{x} to {d}");
        }
        for x in [
            0.0,
            -0.0,
            -0.001,
            1e21,
            1e300,
            5e-324,
            f64::MAX,
            f64::MIN_POSITIVE,
        ] {
            for d in [0, 1, 2, 6, 20] {
                assert_eq!(decimal(x, d), format!("{x:.d$}"), "{x:e} to {d}");
            }
        }
    }

    #[test]
    fn the_two_digit_exponent_is_the_formatters() {
        // against `{:.1e}`: random positive doubles, and the values beside the powers of ten
        // and beside 9.95·10^k where the rounding carries into the next decade
        let reference = |u: f64| {
            let text = format!("{u:.1e}");
            text.split_once('e')
                .and_then(|(_, e)| e.parse::<i32>().ok())
        };
        let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(8);
        let mut values: Vec<f64> = (0..20_000)
            .map(|_| f64::from_bits(rand::RngExt::random::<u64>(&mut rng) >> 1))
            .filter(|u| u.is_finite() && *u > 0.0)
            .collect();
        for k in -30..30 {
            for base in [1.0, 9.95, 9.9499, 9.9501, 0.999_999_999_999] {
                let u = base * 10f64.powi(k);
                values.extend([
                    u,
                    f64::from_bits(u.to_bits() + 1),
                    f64::from_bits(u.to_bits() - 1),
                ]);
            }
        }
        for u in values {
            assert_eq!(two_digit_exponent(u), reference(u), "{u:e}");
        }
    }

    #[test]
    fn a_margin_has_the_place_of_u_or_else_of_the_finer_of_value_and_limit() {
        let inch = crate::units::lookup("in");
        // U = 0.00058 in (0.000014732 m; 1 in = 0.0254 m exactly, NIST SP 811 B.8)
        assert_eq!(
            margin_digits(0.000_58 * 0.0254, inch, "3.480 in", "3.49 in"),
            Digits::Place(5)
        );
        assert_eq!(
            margin_digits(0.0, inch, "1.622999999 in", "1.75 in"),
            Digits::Place(9)
        );
        assert_eq!(margin_digits(0.0, None, "8", "10.5"), Digits::Place(1));
    }

    #[test]
    fn the_places_of_a_number_as_written() {
        assert_eq!(Digits::as_written("1.6200 in"), Digits::Place(4));
        assert_eq!(Digits::as_written("3200 lb"), Digits::Place(0));
        assert_eq!(Digits::as_written("-0.012 in"), Digits::Place(3));
        // a fraction is exact: the places of its decimal expansion (1-3/4 = 1.75)
        assert_eq!(Digits::as_written("1-3/4 in"), Digits::Place(2));
        assert_eq!(Digits::as_written("2-1/4 in"), Digits::Place(2));
        assert_eq!(Digits::as_written("5/8 in"), Digits::Place(3));
        assert_eq!(Digits::as_written("2/4 in"), Digits::Place(1));
        assert_eq!(Digits::as_written("1/64 in"), Digits::Place(6));
        assert_eq!(
            Digits::as_written("1-1/3 in"),
            Digits::Place(FRACTION_PLACES)
        );
        assert_eq!(Digits::as_written("1/0 in"), Digits::Significant);
        assert_eq!(Digits::as_written("1e3"), Digits::Significant);
        assert_eq!(Digits::Place(3).finer(Digits::Place(5)), Digits::Place(5));
        assert_eq!(
            Digits::Significant.finer(Digits::Place(1)),
            Digits::Place(1)
        );
    }

    #[test]
    fn a_nonzero_value_shows_at_least_one_significant_digit() {
        // a fail by 0.0000039 in, written to thousandths, is not `0.000`
        assert_eq!(
            Digits::Place(3).showing(0.000_003_9).number(0.000_003_9),
            "0.000004"
        );
        assert_eq!(Digits::Place(1).showing(-0.02).number(-0.02), "-0.02");
        assert_eq!(Digits::Place(3).showing(0.0005), Digits::Place(3));
        assert_eq!(Digits::Place(3).showing(0.0), Digits::Place(3));
        assert_eq!(Digits::Place(-1).showing(120.0), Digits::Place(-1));
        assert_eq!(Digits::Significant.showing(1e-9), Digits::Significant);
    }

    #[test]
    fn zero_is_never_negative() {
        assert_eq!(number(-0.0), "0");
        assert_eq!(uncertainty(-0.0), "0");
        assert_eq!(Digits::Place(2).number(-0.0), "0.00");
        assert_eq!(Digits::Place(2).number(-0.001), "0.00");
        assert_eq!(quantity(-0.0, crate::units::lookup("in")), "0 in");
    }

    #[test]
    fn a_bare_number_keeps_its_shortest_round_trip_text() {
        assert_eq!(shortest(1.62), "1.62");
        assert_eq!(shortest(1.622_999_999), "1.622999999");
        assert_eq!(shortest(8.0), "8");
    }

    #[test]
    fn six_significant_digits_for_values() {
        assert_eq!(number(360.142_349), "360.142");
        assert_eq!(number(4.0312), "4.0312");
        assert_eq!(number(0.000_028_87), "0.00002887");
        assert_eq!(number(3200.0), "3200");
        assert_eq!(number(-0.000_000_1), "-0.0000001");
    }

    #[test]
    fn two_significant_digits_for_uncertainties() {
        assert_eq!(uncertainty(0.000_288_7), "0.00029");
        assert_eq!(uncertainty(0.214), "0.21");
        assert_eq!(uncertainty(4.0), "4");
    }

    #[test]
    fn probabilities_never_claim_certainty_they_do_not_have() {
        assert_eq!(probability(0.999_999, true), "≥ 99.99 %");
        assert_eq!(probability(1.0, true), "≥ 99.99 %");
        assert_eq!(probability(1.0, false), "100.00 %");
        assert_eq!(probability(0.841_344_7, true), "84.13 %");
        assert_eq!(probability(0.0, true), "≤ 0.01 %");
        assert_eq!(probability(0.0, false), "0.00 %");
    }
}
