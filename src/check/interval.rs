//! Intervals of real numbers with open or closed ends: the set of values that a group of
//! limits or conditions allows.

/// One end of an interval.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct End {
    /// Where.
    pub value: f64,
    /// Whether the end value itself is inside.
    pub closed: bool,
}

/// An interval; a missing end is unbounded.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct Interval {
    /// Lower end.
    pub low: Option<End>,
    /// Upper end.
    pub high: Option<End>,
}

impl Interval {
    /// Values at or above (`closed`) or above `value`.
    pub fn above(value: f64, closed: bool) -> Interval {
        Interval {
            low: Some(End { value, closed }),
            high: None,
        }
    }

    /// Values at or below (`closed`) or below `value`.
    pub fn below(value: f64, closed: bool) -> Interval {
        Interval {
            low: None,
            high: Some(End { value, closed }),
        }
    }

    /// The closed interval from `low` to `high`.
    pub fn closed(low: f64, high: f64) -> Interval {
        Interval {
            low: Some(End {
                value: low,
                closed: true,
            }),
            high: Some(End {
                value: high,
                closed: true,
            }),
        }
    }

    /// Values in both.
    pub fn intersect(self, other: Interval) -> Interval {
        Interval {
            low: tighter(self.low, other.low, true),
            high: tighter(self.high, other.high, false),
        }
    }

    /// True when every value of `other` is inside this interval.
    pub fn contains(self, other: Interval) -> bool {
        self.intersect(other) == other
    }

    /// True when no value is inside.
    pub fn is_empty(self) -> bool {
        match (self.low, self.high) {
            (Some(l), Some(h)) => {
                l.value > h.value || (l.value == h.value && !(l.closed && h.closed))
            }
            _ => false,
        }
    }
}

/// The tighter of two ends: the larger lower end, or the smaller upper end.
fn tighter(a: Option<End>, b: Option<End>, lower: bool) -> Option<End> {
    match (a, b) {
        (Some(a), Some(b)) => {
            let a_wins = if a.value == b.value {
                !a.closed
            } else {
                (a.value > b.value) == lower
            };
            Some(if a_wins { a } else { b })
        }
        (a, None) => a,
        (None, b) => b,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn overlapping_limits_leave_values() {
        let i = Interval::above(1.0, true).intersect(Interval::below(2.0, true));
        assert!(!i.is_empty());
        assert_eq!(i, Interval::closed(1.0, 2.0));
    }

    #[test]
    fn disjoint_limits_leave_nothing() {
        assert!(
            Interval::above(3.0, true)
                .intersect(Interval::below(2.0, true))
                .is_empty()
        );
    }

    #[test]
    fn touching_ends_are_empty_only_when_one_is_open() {
        assert!(
            !Interval::above(2.0, true)
                .intersect(Interval::below(2.0, true))
                .is_empty()
        );
        assert!(
            Interval::above(2.0, false)
                .intersect(Interval::below(2.0, true))
                .is_empty()
        );
    }

    #[test]
    fn containment_respects_open_ends() {
        let reach = Interval::closed(1.0, 2.0);
        assert!(Interval::below(2.0, true).contains(reach));
        assert!(!Interval::below(2.0, false).contains(reach));
        assert!(Interval::above(0.5, false).contains(reach));
        assert!(!reach.contains(Interval::above(1.0, true)));
    }

    #[test]
    fn the_open_end_is_tighter_at_the_same_value() {
        let i = Interval::above(2.0, true).intersect(Interval::above(2.0, false));
        assert_eq!(
            i.low,
            Some(End {
                value: 2.0,
                closed: false
            })
        );
    }
}
