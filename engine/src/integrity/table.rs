//! The thresholds of the residual test and the detectable non-centralities of the
//! protection levels for every degree of freedom an epoch can meet.
//!
//! For the default probabilities they come from the built-in table
//! ([`super::default_table`], from scipy, pinned): no search runs on the target. With the
//! `any-probability` feature, other probabilities are computed by the engine's own χ² and
//! non-central χ² searches on first use and kept, per degree of freedom up to `N`; without
//! it, [`crate::Config::validate`] refuses them. Stored in single precision: a threshold or
//! `√λ` to 6e-8 relative moves a protection level by less than a micrometre per 10 m, and a
//! test decision only for a statistic within that distance of its threshold.
//!
//! Cost: a table read per epoch. A computed entry costs a χ² quantile and a non-central
//! search once: about 3e8 instructions on the Cortex-M4F (docs/firmware.md), a host
//! millisecond.

use super::default_table::{
    DEFAULT_FALSE_ALARM, DEFAULT_INTEGRITY_RISK, DEFAULT_K_MD, DEFAULT_TABLE,
};

/// Whether the probabilities are the ones the built-in table is for.
pub(crate) fn tabulated(false_alarm: f64, integrity_risk: f64) -> bool {
    false_alarm == DEFAULT_FALSE_ALARM && integrity_risk == DEFAULT_INTEGRITY_RISK
}

/// The threshold χ²(dof) at `false_alarm` and the detectable `√λ` at `integrity_risk`, by
/// the engine's own searches; `None` when the searches cannot meet them.
#[cfg_attr(not(feature = "any-probability"), allow(dead_code))]
pub(crate) fn compute(dof: u32, false_alarm: f64, integrity_risk: f64) -> Option<(f64, f64)> {
    let x = super::chi2::isf(false_alarm, dof)?;
    let lambda = super::ncx2::detectable_noncentrality(dof, x, integrity_risk)?;
    Some((x, libm::sqrt(lambda)))
}

/// The two-sided normal quantile `K` with `P(|z| > K) = p`: `√` of the χ²(1) quantile (the
/// square of a unit normal is χ²(1)).
#[cfg_attr(not(feature = "any-probability"), allow(dead_code))]
pub(crate) fn normal_quantile(p: f64) -> Option<f64> {
    super::chi2::isf(p, 1).map(libm::sqrt)
}

/// Thresholds by degree of freedom for the configured probabilities.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) struct Thresholds<const N: usize> {
    /// Entries computed for non-default probabilities: the probabilities, then per dof − 1
    /// the threshold and `√λ` (NaN until computed), then `K`.
    #[cfg(feature = "any-probability")]
    cache: (f64, f64, [(f32, f32); N], f32),
}

impl<const N: usize> Thresholds<N> {
    /// An empty table.
    pub const fn new() -> Self {
        Thresholds {
            #[cfg(feature = "any-probability")]
            cache: (f64::NAN, f64::NAN, [(f32::NAN, f32::NAN); N], f32::NAN),
        }
    }

    /// The threshold χ²(dof) at `false_alarm` and the detectable `√λ` at `integrity_risk`;
    /// `None` for a dof of 0, probabilities without an entry, or a search that fails.
    pub fn get(&mut self, dof: usize, false_alarm: f64, integrity_risk: f64) -> Option<(f64, f64)> {
        let k = dof.checked_sub(1)?;
        if tabulated(false_alarm, integrity_risk) {
            if let Some((t, l)) = DEFAULT_TABLE.get(k) {
                return Some((f64::from(*t), f64::from(*l)));
            }
        }
        self.computed(k, false_alarm, integrity_risk)
    }

    /// The two-sided normal quantile of `integrity_risk`.
    pub fn k_md(&mut self, false_alarm: f64, integrity_risk: f64) -> Option<f64> {
        if tabulated(false_alarm, integrity_risk) {
            return Some(f64::from(DEFAULT_K_MD));
        }
        self.computed_k(false_alarm, integrity_risk)
    }

    #[cfg(feature = "any-probability")]
    fn reset_for(&mut self, false_alarm: f64, integrity_risk: f64) {
        let c = &mut self.cache;
        if c.0.to_bits() != false_alarm.to_bits() || c.1.to_bits() != integrity_risk.to_bits() {
            *self = Self::new();
            self.cache.0 = false_alarm;
            self.cache.1 = integrity_risk;
        }
    }

    #[cfg(feature = "any-probability")]
    fn computed(&mut self, k: usize, false_alarm: f64, integrity_risk: f64) -> Option<(f64, f64)> {
        self.reset_for(false_alarm, integrity_risk);
        let e = self.cache.2.get_mut(k)?;
        if e.0.is_nan() {
            let dof = u32::try_from(k.saturating_add(1)).ok()?;
            let (t, l) = compute(dof, false_alarm, integrity_risk).unwrap_or((f64::NAN, f64::NAN));
            *e = (t as f32, l as f32);
        }
        (e.0.is_finite() && e.1.is_finite()).then(|| (f64::from(e.0), f64::from(e.1)))
    }

    #[cfg(feature = "any-probability")]
    fn computed_k(&mut self, false_alarm: f64, integrity_risk: f64) -> Option<f64> {
        self.reset_for(false_alarm, integrity_risk);
        if self.cache.3.is_nan() {
            self.cache.3 = normal_quantile(integrity_risk).map_or(f32::NAN, |k| k as f32);
        }
        self.cache.3.is_finite().then(|| f64::from(self.cache.3))
    }

    #[cfg(not(feature = "any-probability"))]
    fn computed(&mut self, _: usize, _: f64, _: f64) -> Option<(f64, f64)> {
        None
    }

    #[cfg(not(feature = "any-probability"))]
    fn computed_k(&mut self, _: f64, _: f64) -> Option<f64> {
        None
    }
}

#[cfg(test)]
#[path = "table_tests.rs"]
mod tests;
