//! Dual-frequency ionosphere removal (issue 10, first part; **not yet called by
//! `engine.rs`**): the first-order ionospheric delay scales as 1/f², so two pseudoranges of
//! one satellite on frequencies f₁ and f₂, each corrected for its own broadcast group delay,
//! combine into one free of it:
//! ```text
//! P_IF = a₁ P₁ + a₂ P₂,   a₁ = f₁² / (f₁² − f₂²),   a₂ = −f₂² / (f₁² − f₂²)   (a₁ + a₂ = 1)
//! ```
//! (IS-GPS-200 §20.3.3.3.3.3 for L1/L2; the same form for any pair, common practice). The
//! combination keeps the geometry, the clocks and the troposphere, and multiplies
//! uncorrelated code noise by `√(a₁² + a₂²)`: about 3.0 for L1/L2, 2.6 for L1/L5 and E1/E5a.
//!
//! Group delays: each signal's broadcast group delay ([`crate::BroadcastEphemeris::group_delay_s`])
//! is taken from its own pseudorange first. For GPS L1/L2 the TGD terms then cancel exactly
//! (the LNAV clock refers to the L1/L2 P(Y) combination, IS-GPS-200 §20.3.3.3.3.2); Galileo's
//! BGD(E1,E5a) and BGD(E1,E5b) likewise for the pair their clock refers to; GPS L5 needs the
//! CNAV inter-signal corrections, which the LNAV message does not carry, so an L1/L5 pair
//! keeps an uncorrected bias of up to a metre (../shared/data README; stated per measurement
//! once the engine uses pairs).

use crate::sat::Signal;

/// The coefficients of an ionosphere-free pair.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct IonoFree {
    /// Coefficient of the first signal's pseudorange.
    pub a1: f64,
    /// Coefficient of the second signal's pseudorange.
    pub a2: f64,
}

/// Why two signals do not form an ionosphere-free pair.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub enum PairError {
    /// The signals belong to different systems.
    OtherSystem,
    /// The signals share a frequency: nothing to separate.
    SameFrequency,
}

impl core::fmt::Display for PairError {
    fn fmt(&self, f: &mut core::fmt::Formatter<'_>) -> core::fmt::Result {
        f.write_str(match self {
            PairError::OtherSystem => "the two signals belong to different systems",
            PairError::SameFrequency => "the two signals share a frequency",
        })
    }
}

impl core::error::Error for PairError {}

impl IonoFree {
    /// The coefficients for the pair (`first`, `second`).
    ///
    /// # Errors
    /// [`PairError`] when the signals are of two systems or on one frequency.
    pub fn of(first: Signal, second: Signal) -> Result<Self, PairError> {
        if first.system() != second.system() {
            return Err(PairError::OtherSystem);
        }
        let (f1, f2) = (first.frequency_hz(), second.frequency_hz());
        let (q1, q2) = (f1 * f1, f2 * f2);
        let d = q1 - q2;
        if d == 0.0 {
            return Err(PairError::SameFrequency);
        }
        Ok(IonoFree {
            a1: q1 / d,
            a2: -q2 / d,
        })
    }

    /// The combination of the two pseudoranges (each already corrected for its own group
    /// delay), m.
    pub fn combine(&self, p1_m: f64, p2_m: f64) -> f64 {
        self.a1 * p1_m + self.a2 * p2_m
    }

    /// The factor on uncorrelated code noise of equal σ on both signals, `√(a₁² + a₂²)`.
    pub fn noise_factor(&self) -> f64 {
        libm::sqrt(self.a1 * self.a1 + self.a2 * self.a2)
    }
}

#[cfg(test)]
#[path = "dual_tests.rs"]
mod tests;
