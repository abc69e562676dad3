//! A signed span of time in integer nanoseconds: the difference of two [`GnssTime`]s, and
//! what filter steps, gaps and ages are measured in. It stays an integer until the one place
//! that needs seconds as a float calls [`Duration::as_secs_f64`], so comparisons of ages and
//! gaps are exact and a span never loses resolution however long it is.

use crate::time::GnssTime;

/// Nanoseconds in one second.
const NS_PER_S: i64 = 1_000_000_000;

/// A signed span of time, nanoseconds (±292 years).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Duration {
    ns: i64,
}

impl Duration {
    /// No time.
    pub const ZERO: Duration = Duration { ns: 0 };

    /// From whole nanoseconds.
    pub const fn from_nanos(ns: i64) -> Self {
        Duration { ns }
    }

    /// From whole seconds (saturating at ±292 years).
    pub const fn from_secs(s: i64) -> Self {
        Duration {
            ns: s.saturating_mul(NS_PER_S),
        }
    }

    /// From seconds as a float, rounded to the nanosecond; `None` when not finite or beyond
    /// ±292 years.
    pub fn from_secs_f64(s: f64) -> Option<Self> {
        let ns = libm::round(s * 1e9);
        (ns.is_finite() && ns.abs() < 9.2e18).then_some(Duration { ns: ns as i64 })
    }

    /// Whole nanoseconds.
    pub const fn as_nanos(self) -> i64 {
        self.ns
    }

    /// Seconds as a float: the one conversion a computation in seconds makes.
    pub fn as_secs_f64(self) -> f64 {
        self.ns as f64 * 1e-9
    }

    /// The magnitude of the span.
    pub const fn abs(self) -> Self {
        Duration {
            ns: self.ns.saturating_abs(),
        }
    }

    /// True for a span longer than zero.
    pub const fn is_positive(self) -> bool {
        self.ns > 0
    }
}

impl GnssTime {
    /// The span from `earlier` to `self` (negative if `earlier` is later), saturating.
    pub fn since(self, earlier: GnssTime) -> Duration {
        Duration {
            ns: self.as_nanos().saturating_sub(earlier.as_nanos()),
        }
    }

    /// This instant moved by `d`, saturating.
    pub fn plus(self, d: Duration) -> GnssTime {
        GnssTime::from_nanos(self.as_nanos().saturating_add(d.ns))
    }
}

#[cfg(test)]
#[path = "duration_tests.rs"]
mod tests;
