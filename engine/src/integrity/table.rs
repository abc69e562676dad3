//! The thresholds of the residual test and the detectable non-centralities of the
//! protection levels for every degree of freedom an epoch of `N` observations can meet,
//! computed once for the configured probabilities and kept.
//!
//! Stored in single precision: a threshold or `√λ` to 6e-8 relative moves a protection
//! level by less than a micrometre per 10 m and a test decision only for a statistic within
//! that distance of its threshold (table_tests.rs compares the stored values with scipy's).
//! Cost: the first epoch after a configuration change computes each entry on first use (a
//! χ² quantile and a non-central search); every later epoch reads the table.

use super::chi2::isf;
use super::ncx2::detectable_noncentrality;

/// χ² thresholds and `√λ` by degree of freedom 1..=N, for one pair of probabilities.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Thresholds<const N: usize> {
    false_alarm: f64,
    integrity_risk: f64,
    /// Threshold per dof − 1; NaN until computed.
    threshold: [f32; N],
    /// `√λ` per dof − 1; NaN until computed (or when no λ reaches the risk).
    sqrt_lambda: [f32; N],
    /// The two-sided normal quantile of the integrity risk; NaN until computed.
    k_md: f32,
}

impl<const N: usize> Thresholds<N> {
    /// An empty table (every entry computed on first use).
    pub const fn new() -> Self {
        Thresholds {
            false_alarm: f64::NAN,
            integrity_risk: f64::NAN,
            threshold: [f32::NAN; N],
            sqrt_lambda: [f32::NAN; N],
            k_md: f32::NAN,
        }
    }

    /// The two-sided normal quantile `K` with `P(|z| > K) = integrity_risk`: `√` of the
    /// χ²(1) quantile (the square of a unit normal is χ²(1)); `None` outside (0, 1).
    pub fn k_md(&mut self, false_alarm: f64, integrity_risk: f64) -> Option<f64> {
        self.reset_for(false_alarm, integrity_risk);
        if self.k_md.is_nan() {
            self.k_md = isf(integrity_risk, 1).map_or(f32::NAN, |x| libm::sqrt(x) as f32);
        }
        self.k_md.is_finite().then(|| f64::from(self.k_md))
    }

    /// Empties the table when the probabilities changed.
    fn reset_for(&mut self, false_alarm: f64, integrity_risk: f64) {
        if self.false_alarm.to_bits() != false_alarm.to_bits()
            || self.integrity_risk.to_bits() != integrity_risk.to_bits()
        {
            *self = Self::new();
            self.false_alarm = false_alarm;
            self.integrity_risk = integrity_risk;
        }
    }

    /// The threshold χ²(dof) at `false_alarm` and the detectable `√λ` at `integrity_risk`;
    /// `None` for a dof of 0 or above `N`, or probabilities the search cannot meet.
    pub fn get(&mut self, dof: usize, false_alarm: f64, integrity_risk: f64) -> Option<(f64, f64)> {
        self.reset_for(false_alarm, integrity_risk);
        let k = dof.checked_sub(1)?;
        let (t, l) = (self.threshold.get_mut(k)?, self.sqrt_lambda.get_mut(k)?);
        if t.is_nan() {
            let dof = u32::try_from(dof).ok()?;
            let x = isf(false_alarm, dof)?;
            *t = x as f32;
            *l = detectable_noncentrality(dof, x, integrity_risk)
                .map_or(f32::NAN, |lambda| libm::sqrt(lambda) as f32);
        }
        (t.is_finite() && l.is_finite()).then(|| (f64::from(*t), f64::from(*l)))
    }
}

#[cfg(test)]
#[path = "table_tests.rs"]
mod tests;
