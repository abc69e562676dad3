//! All of an epoch's measurements in one update, in information form: the equivalent of
//! the sequential scalar updates of [`super::update`] for measurements linearised at the
//! same state, at a fixed cost.
//!
//! ```text
//! J = Σ h hᵀ / R        j = Σ h ν / R        χ = Σ ν² / R          (accumulated, O(m))
//! P' = (P⁻¹ + J)⁻¹      x' = x + P' j
//! NIS = νᵀ (H P Hᵀ + R)⁻¹ ν = χ − jᵀ P' j                           (Woodbury identity)
//! ```
//! P⁻¹ + J is positive definite whenever P is (J is a sum of positive semi-definite terms),
//! so P' is symmetric positive definite by construction: both inverses go through a
//! Cholesky factor and are mirrored from one triangle. This is the information filter's
//! measurement update (Bar-Shalom, Li & Kirubarajan 2001, the information filter \[M\]);
//! for linear measurements it equals the sequential updates up to rounding, which
//! filter/batch_tests.rs checks against [`FilterState::update`] (itself checked against
//! filterpy), and the epoch NIS is χ²(m) for a consistent filter.
//!
//! Cost, n = 10 and m measurements of at most five non-zero coefficients: accumulating
//! about 20 multiply-adds per measurement; the update two Cholesky factorisations and
//! inverses (about n³/2 ≈ 500 multiply-adds, 10 square roots and 10 divisions each) and
//! n² for the state — for 12 pseudoranges and 12 range rates about 1,600 multiply-adds
//! against about 4,700 for 24 sequential Joseph updates. Stack: two 10×10 matrices.

use super::state::{at, mirror_upper, put, Covariance, FilterState, StateVector, MAX_ABS_STATE};
use super::state::{MAX_VARIANCE, STATE_LEN};
use super::update::{MeasurementRow, UpdateError, MAX_ROW_COEFFICIENT, MAX_VARIANCE_RATIO};
use crate::linalg::invert_spd_in_place;

/// Each state's variance given all the others must stay above this share of its own, in P
/// and in P⁻¹ + J, for the update to go ahead: below it f64 has lost the state (a
/// measurement far more precise than the state along a combination of states, which the
/// per-state variance check cannot see; the property test found one with R = 2e-17).
const CONDITION_MARGIN: f64 = 1e-12;

/// The accumulated information of a set of measurements (see the module documentation).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Batch {
    /// J, upper triangle.
    info: Covariance,
    /// j.
    vector: StateVector,
    /// χ = Σ ν²/R.
    chi: f64,
    count: u16,
}

impl Default for Batch {
    fn default() -> Self {
        Self::new()
    }
}

impl Batch {
    /// No measurement yet.
    pub const fn new() -> Self {
        Batch {
            info: [[0.0; STATE_LEN]; STATE_LEN],
            vector: [0.0; STATE_LEN],
            chi: 0.0,
            count: 0,
        }
    }

    /// Measurements added.
    pub fn count(&self) -> u16 {
        self.count
    }

    /// Adds one scalar measurement: row `h`, innovation `ν = z − h(x)` at the state the
    /// batch will update, variance `R`.
    ///
    /// # Errors
    /// [`UpdateError::InvalidInnovation`], [`UpdateError::InvalidVariance`] or
    /// [`UpdateError::InvalidRow`], as for a sequential update; the batch is unchanged.
    pub fn add(
        &mut self,
        row: &MeasurementRow,
        innovation: f64,
        variance: f64,
    ) -> Result<(), UpdateError> {
        if !(variance > 0.0 && variance.is_finite()) {
            return Err(UpdateError::InvalidVariance);
        }
        self.add_weighted(row, innovation, 1.0 / variance)
    }

    /// As [`Batch::add`] with the weight `1/R` already computed (the stage shares it with
    /// its motion test: one division per measurement fewer on the target).
    pub(crate) fn add_weighted(
        &mut self,
        row: &MeasurementRow,
        innovation: f64,
        w: f64,
    ) -> Result<(), UpdateError> {
        if !innovation.is_finite() {
            return Err(UpdateError::InvalidInnovation);
        }
        if !(w > 0.0 && w.is_finite()) {
            return Err(UpdateError::InvalidVariance);
        }
        // Only the non-zero coefficients can be out of range (NaN is non-zero).
        let mut coefficients = row.nonzero().peekable();
        if coefficients.peek().is_none()
            || !coefficients.all(|(_, v)| v.abs() <= MAX_ROW_COEFFICIENT)
        {
            return Err(UpdateError::InvalidRow);
        }
        for (i, hi) in row.nonzero() {
            let whi = w * hi;
            if let Some(v) = self.vector.get_mut(i) {
                *v += whi * innovation;
            }
            // Both orders of each pair land in the upper triangle.
            for (j, hj) in row.nonzero().filter(|(j, _)| *j >= i) {
                let e = at(&self.info, i, j) + whi * hj;
                put(&mut self.info, i, j, e);
            }
        }
        self.chi += w * innovation * innovation;
        self.count = self.count.saturating_add(1);
        Ok(())
    }
}

impl FilterState {
    /// Applies every measurement of `batch` at once (see the module documentation) and
    /// returns their joint normalised innovation squared (0 for an empty batch).
    ///
    /// # Errors
    /// [`UpdateError::NotPositiveDefinite`] when a factorisation fails (f64 could not keep
    /// the information matrix positive definite: the state's variances span too many
    /// decades), [`UpdateError::TooPrecise`] when a variance would shrink by more than
    /// [`MAX_VARIANCE_RATIO`], [`UpdateError::OutOfRange`] when the result would leave the
    /// state's bounds (or a variance grow, which only rounding can do).
    /// The state is unchanged after an error.
    #[inline(never)]
    pub fn apply(&mut self, batch: &Batch) -> Result<f64, UpdateError> {
        if batch.count == 0 {
            return Ok(0.0);
        }
        let mut y = self.p;
        if !invert_spd_in_place(&mut y, CONDITION_MARGIN) {
            return Err(UpdateError::NotPositiveDefinite);
        }
        for i in 0..STATE_LEN {
            for j in i..STATE_LEN {
                let v = at(&y, i, j) + at(&batch.info, i, j);
                put(&mut y, i, j, v);
            }
        }
        mirror_upper(&mut y);
        if !invert_spd_in_place(&mut y, CONDITION_MARGIN) {
            return Err(UpdateError::NotPositiveDefinite);
        }
        let p = &y;
        let mut x = self.x;
        let mut correction = 0.0;
        for (i, xi) in x.iter_mut().enumerate() {
            let dx: f64 = (0..STATE_LEN)
                .map(|j| at(p, i, j) * batch.vector.get(j).copied().unwrap_or(0.0))
                .sum();
            *xi += dx;
            correction += dx * batch.vector.get(i).copied().unwrap_or(0.0);
        }
        if !x.iter().all(|v| v.abs() <= MAX_ABS_STATE) {
            return Err(UpdateError::OutOfRange);
        }
        // Information only shrinks variances, and by at most MAX_VARIANCE_RATIO in one
        // update (the sequential update's limit, for the same reason: beyond it f64 cannot
        // keep P positive definite; the property test found variances of 1e-308 without it).
        for i in 0..STATE_LEN {
            let (before, after) = (at(&self.p, i, i), at(p, i, i));
            if !(after > 0.0 && after <= MAX_VARIANCE) || after > before * (1.0 + 1e-9) {
                return Err(UpdateError::OutOfRange);
            }
            if after * MAX_VARIANCE_RATIO < before {
                return Err(UpdateError::TooPrecise);
            }
        }
        self.x = x;
        self.p = y;
        Ok((batch.chi - correction).max(0.0))
    }
}

#[cfg(test)]
#[path = "batch_tests.rs"]
mod tests;
