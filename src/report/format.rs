//! Formatting numbers for people: values to six significant digits, uncertainties to two,
//! probabilities as percentages, always in the unit the rulebook or declaration wrote.

use crate::units::Unit;

/// A value to six significant digits, trailing zeros trimmed.
pub fn number(v: f64) -> String {
    significant(v, 6)
}

/// An uncertainty to two significant digits.
pub fn uncertainty(v: f64) -> String {
    significant(v, 2)
}

fn significant(v: f64, digits: i32) -> String {
    if v == 0.0 || !v.is_finite() {
        return if v.is_nan() {
            "n/a".to_string()
        } else {
            format!("{v}")
        };
    }
    let magnitude = v.abs().log10().floor() as i32;
    let decimals = (digits - 1 - magnitude).clamp(0, 10) as usize;
    let text = format!("{v:.decimals$}");
    let text = if text.contains('.') {
        text.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        text
    };
    if text == "-0" { "0".to_string() } else { text }
}

/// A value in SI units shown in `unit` (`4.0312 in`), or as a plain number.
pub fn quantity(si: f64, unit: Option<&Unit>) -> String {
    match unit {
        Some(u) => format!("{} {}", number(si / u.to_si), u.symbol),
        None => number(si),
    }
}

/// An uncertainty in SI units shown in `unit`.
pub fn uncertainty_in(si: f64, unit: Option<&Unit>) -> String {
    match unit {
        Some(u) => format!("{} {}", uncertainty(si / u.to_si), u.symbol),
        None => uncertainty(si),
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
