//! Differential corrections (issue 10, second part; **not yet called by `engine.rs`**): a
//! reference receiver at a known position measures each satellite's combined error (orbit,
//! clock, atmosphere) as a pseudorange correction and its rate; receivers nearby add them to
//! their own pseudoranges (differential GNSS, common practice; the correction, rate,
//! reference time, ephemeris issue and quality of the RTCM SC-104 message family's
//! differential corrections, from memory \[M\]).
//!
//! [`CorrectionStore`] keeps the latest correction of each satellite and signal in fixed
//! memory. [`CorrectionStore::lookup`] gives the correction to apply at a time, or why none
//! applies: missing, computed with another ephemeris issue (the orbit and clock it cancels
//! would not be the ones the receiver uses), older than the configured age, or from the
//! future. A correction is never applied wrongly: what cannot be checked is not applied.

use crate::sat::{SatId, Signal};
use crate::time::GnssTime;
use heapless::Vec;

/// Largest correction accepted, m: the RTCM message family's field spans ±655 m \[M\]; no
/// healthy satellite's combined error comes near it.
pub const MAX_CORRECTION_M: f64 = 655.0;

/// Largest correction rate accepted, m/s (the same family's ±4.1 m/s \[M\]).
pub const MAX_RATE_MPS: f64 = 4.1;

/// A reference time more than this ahead of the epoch is "from the future", s (clock
/// rounding between the two receivers is far below it).
const FUTURE_TOLERANCE_S: f64 = 1.0;

/// One satellite's pseudorange correction.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct RangeCorrection {
    /// The satellite.
    pub sat: SatId,
    /// The signal whose pseudorange it corrects.
    pub signal: Signal,
    /// Correction to add to the measured pseudorange at the reference time, m.
    pub correction_m: f64,
    /// Its rate of change, m/s.
    pub rate_mps: f64,
    /// When it was measured.
    pub reference_time: GnssTime,
    /// Issue of the ephemeris the reference used (IODE; IODnav for Galileo, AODE for
    /// BeiDou).
    pub iode: u16,
    /// Its 1-σ, m.
    pub sigma_m: f32,
}

/// Why a correction was refused.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum CorrectionError {
    /// A value is NaN or infinite.
    NotFinite,
    /// The correction exceeds [`MAX_CORRECTION_M`].
    TooLarge {
        /// The correction given, m.
        correction_m: f64,
    },
    /// The rate exceeds [`MAX_RATE_MPS`].
    RateTooLarge {
        /// The rate given, m/s.
        rate_mps: f64,
    },
    /// The σ is not positive.
    BadSigma,
}

impl core::fmt::Display for CorrectionError {
    fn fmt(&self, f: &mut core::fmt::Formatter<'_>) -> core::fmt::Result {
        match self {
            CorrectionError::NotFinite => f.write_str("correction: a value is not finite"),
            CorrectionError::TooLarge { correction_m } => write!(
                f,
                "correction: {correction_m} m exceeds ±{MAX_CORRECTION_M} m"
            ),
            CorrectionError::RateTooLarge { rate_mps } => write!(
                f,
                "correction: rate {rate_mps} m/s exceeds ±{MAX_RATE_MPS} m/s"
            ),
            CorrectionError::BadSigma => f.write_str("correction: σ is not positive"),
        }
    }
}

impl core::error::Error for CorrectionError {}

/// What a lookup found.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum Lookup {
    /// Apply it.
    Apply {
        /// Correction at the epoch (with its rate), m.
        correction_m: f64,
        /// Its σ, m.
        sigma_m: f32,
        /// Its age, s.
        age_s: f32,
    },
    /// No correction for this satellite and signal.
    Missing,
    /// Computed with another ephemeris issue.
    OtherIssue {
        /// The issue the correction was computed with.
        iode: u16,
    },
    /// Older than the configured age.
    TooOld {
        /// Its age, s.
        age_s: f32,
    },
    /// Its reference time is after the epoch.
    FromTheFuture,
}

/// The latest correction of up to `K` satellite signals.
#[derive(Clone, Debug, PartialEq)]
pub struct CorrectionStore<const K: usize> {
    entries: Vec<RangeCorrection, K>,
}

impl<const K: usize> Default for CorrectionStore<K> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const K: usize> CorrectionStore<K> {
    /// An empty store.
    pub const fn new() -> Self {
        CorrectionStore {
            entries: Vec::new(),
        }
    }

    /// Checks and keeps a correction, in place of an earlier one for the same satellite and
    /// signal; when full, in place of the one with the oldest reference time.
    ///
    /// # Errors
    /// What is wrong with it; the store is unchanged.
    pub fn ingest(&mut self, c: RangeCorrection) -> Result<(), CorrectionError> {
        if !(c.correction_m.is_finite() && c.rate_mps.is_finite() && c.sigma_m.is_finite()) {
            return Err(CorrectionError::NotFinite);
        }
        if c.correction_m.abs() > MAX_CORRECTION_M {
            return Err(CorrectionError::TooLarge {
                correction_m: c.correction_m,
            });
        }
        if c.rate_mps.abs() > MAX_RATE_MPS {
            return Err(CorrectionError::RateTooLarge {
                rate_mps: c.rate_mps,
            });
        }
        if c.sigma_m <= 0.0 {
            return Err(CorrectionError::BadSigma);
        }
        let same = |e: &RangeCorrection| e.sat == c.sat && e.signal == c.signal;
        if let Some(e) = self.entries.iter_mut().find(|e| same(e)) {
            *e = c;
        } else if let Err(c) = self.entries.push(c) {
            if let Some(e) = self.entries.iter_mut().min_by_key(|e| e.reference_time) {
                *e = c;
            }
        }
        Ok(())
    }

    /// The correction of `sat` on `signal` at time `t` for a receiver using ephemeris issue
    /// `iode`, no older than `max_age_s`, or why there is none.
    pub fn lookup(
        &self,
        sat: SatId,
        signal: Signal,
        iode: u16,
        t: GnssTime,
        max_age_s: f64,
    ) -> Lookup {
        let Some(c) = self
            .entries
            .iter()
            .find(|e| e.sat == sat && e.signal == signal)
        else {
            return Lookup::Missing;
        };
        if c.iode != iode {
            return Lookup::OtherIssue { iode: c.iode };
        }
        let age = t.since(c.reference_time).as_secs_f64();
        if age < -FUTURE_TOLERANCE_S {
            return Lookup::FromTheFuture;
        }
        if age > max_age_s {
            return Lookup::TooOld { age_s: age as f32 };
        }
        Lookup::Apply {
            correction_m: c.correction_m + c.rate_mps * age,
            sigma_m: c.sigma_m,
            age_s: age as f32,
        }
    }

    /// Corrections held.
    pub fn len(&self) -> usize {
        self.entries.len()
    }

    /// No correction held.
    pub fn is_empty(&self) -> bool {
        self.entries.is_empty()
    }
}

#[cfg(test)]
#[path = "dgnss_tests.rs"]
mod tests;
