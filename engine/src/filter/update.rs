//! The sequential scalar measurement update with its χ²(1) gate, in Joseph form.
//!
//! For a measurement row `h`, innovation `ν = z − h(x)` (computed by the caller from its
//! non-linear model) and measurement variance `R`:
//! ```text
//! u = P h          S = hᵀu + R          NIS = ν²/S          k = u/S
//! x' = x + k ν
//! P' = (I − k hᵀ) P (I − k hᵀ)ᵀ + k R kᵀ
//!    = P − k uᵀ − u kᵀ + (hᵀP h + R) k kᵀ          (expanded: h is a vector, P symmetric)
//!    = P − k dᵀ − u kᵀ,   d = u − S k
//! ```
//! The expanded Joseph form equals the textbook `P − u uᵀ/S` in exact arithmetic, and stays
//! the covariance of the estimate for any rounding of `k` (Bar-Shalom, Li & Kirubarajan 2001,
//! the Joseph form of the covariance update \[M\]); `d` carries exactly that rounding. Only
//! the upper triangle is computed, then mirrored, so `P'` is exactly symmetric.
//!
//! Cost, n = 10 and a row with m non-zero coefficients (4 for a Doppler, 4–5 for a
//! pseudorange), counted from the code: `u` 10·m, `hᵀu` m, `k` 10, `d` 10, the state 10,
//! the diagonal 20, the 45 off-diagonal elements 90, NIS and the precision check 2 — about
//! 142 + 11·m multiplications (≈ 197 for a pseudorange with an inter-system bias, 186 for a
//! Doppler) and two divisions, against ≈ 2·n³ = 2,000 for the dense Joseph form. Stack: five
//! 10-vectors (`u`, `k`, `d`, the new state and diagonal), 400 bytes.

use core::fmt;

use super::state::{
    at, mirror_upper, put, FilterState, StateVector, ISB_BEIDOU, ISB_GALILEO, MAX_ABS_STATE,
    MAX_VARIANCE, STATE_LEN,
};
use crate::System;

/// Largest magnitude of a measurement-row coefficient. A line-of-sight row holds unit
/// components and ones; the bound keeps `hᵀPh` far from overflow.
pub const MAX_ROW_COEFFICIENT: f64 = 1e6;

/// Largest reduction of the variance along `h` that one update may make, `hᵀPh / R`. The
/// posterior variance of `h·x` is `R·hᵀPh/S`; when it is a tiny fraction of the prior, f64
/// rounding in `P'` (relative 2.2e-16 per element) can leave `P'` indefinite — the property
/// test (host-tests/tests/filter_properties.rs) found exactly that with R = 1e-300, and with
/// this limit raised to 1e16; it passes 30,000 random sequences with 1e14. 10¹² keeps two
/// decades of margin and admits every realistic GNSS case: a pseudorange of σ = 1 m against
/// a clock reseated after a wake-up (σ ≈ 3·10⁵ m) is a ratio of 10¹¹.
pub const MAX_VARIANCE_RATIO: f64 = 1e12;

/// One row `h` of the measurement model, `∂z/∂x`, in the state layout.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct MeasurementRow {
    h: StateVector,
    /// Indices of the non-zero coefficients, the first `nonzero_len` of them: the batch
    /// update and the innovation variance visit only these (a GNSS row has four or five),
    /// which saves comparing every coefficient with zero in software floating point.
    nonzero: [u8; STATE_LEN],
    nonzero_len: u8,
}

/// The inter-system bias state a satellite of `system` adds to its pseudorange.
fn isb_state(system: System) -> Option<usize> {
    match system {
        System::Gps => None,
        System::Galileo => Some(ISB_GALILEO),
        System::Beidou => Some(ISB_BEIDOU),
    }
}

impl MeasurementRow {
    /// Any row, in the state layout. The update refuses a row with a coefficient that is not
    /// finite or above [`MAX_ROW_COEFFICIENT`] in magnitude.
    pub fn new(h: StateVector) -> Self {
        Self::from_coefficients(h)
    }

    fn from_coefficients(h: StateVector) -> Self {
        let mut row = MeasurementRow {
            h,
            nonzero: [0; STATE_LEN],
            nonzero_len: 0,
        };
        for (i, v) in h.iter().enumerate() {
            if *v != 0.0 {
                if let Some(slot) = row.nonzero.get_mut(usize::from(row.nonzero_len)) {
                    *slot = i as u8;
                    row.nonzero_len = row.nonzero_len.saturating_add(1);
                }
            }
        }
        row
    }

    /// The non-zero coefficients with their state indices.
    pub fn nonzero(&self) -> impl Iterator<Item = (usize, f64)> + '_ {
        self.nonzero
            .iter()
            .take(usize::from(self.nonzero_len))
            .map(|&i| {
                (
                    usize::from(i),
                    self.h.get(usize::from(i)).copied().unwrap_or(0.0),
                )
            })
    }

    /// A pseudorange `ρ = |s − p| + b + isb(system)`: `−e` on position, 1 on the clock bias
    /// and on the system's inter-system bias. `line_of_sight` is the unit vector from the
    /// receiver to the satellite, ECEF.
    pub fn pseudorange(line_of_sight: [f64; 3], system: System) -> Self {
        let [ex, ey, ez] = line_of_sight;
        // Layout: position, velocity, clock bias, drift, the two inter-system biases.
        let mut h = [-ex, -ey, -ez, 0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 0.0];
        if let Some(k) = isb_state(system).and_then(|k| h.get_mut(k)) {
            *k = 1.0;
        }
        Self::from_coefficients(h)
    }

    /// A range rate from Doppler, `ρ̇ = −e·v + ḃ` (satellite velocity and clock rate are the
    /// caller's part of `h(x)`): `−e` on velocity, 1 on the clock drift. The inter-system
    /// biases are constant in the model and do not enter.
    pub fn range_rate(line_of_sight: [f64; 3]) -> Self {
        let [ex, ey, ez] = line_of_sight;
        // Layout: position, velocity, clock bias, drift, the two inter-system biases.
        let h = [0.0, 0.0, 0.0, -ex, -ey, -ez, 0.0, 1.0, 0.0, 0.0];
        Self::from_coefficients(h)
    }

    /// A direct measurement of one state (for instance a zero-velocity pseudo-measurement on
    /// one axis); an index outside the layout gives an all-zero row, which the update refuses.
    pub fn single(index: usize, coefficient: f64) -> Self {
        let mut h = [0.0; STATE_LEN];
        if let Some(v) = h.get_mut(index) {
            *v = coefficient;
        }
        Self::from_coefficients(h)
    }

    /// The coefficients.
    pub fn coefficients(&self) -> &StateVector {
        &self.h
    }

    /// `h·x`, the linear part of the prediction of the measurement.
    pub fn dot(&self, x: &StateVector) -> f64 {
        self.h
            .iter()
            .zip(x)
            .filter(|(h, _)| **h != 0.0)
            .map(|(h, x)| h * x)
            .sum()
    }
}

/// What an update did. Both carry the normalised innovation squared `NIS = ν²/S`.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum UpdateOutcome {
    /// The measurement passed the gate and was applied.
    Applied {
        /// ν²/S.
        nis: f64,
    },
    /// The measurement failed the gate; the state is unchanged.
    Gated {
        /// ν²/S (infinite for an innovation whose square overflows).
        nis: f64,
    },
}

impl UpdateOutcome {
    /// The normalised innovation squared.
    pub fn nis(&self) -> f64 {
        match self {
            UpdateOutcome::Applied { nis } | UpdateOutcome::Gated { nis } => *nis,
        }
    }
}

/// Why an update was refused. The state is left unchanged.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum UpdateError {
    /// The innovation is NaN or infinite.
    InvalidInnovation,
    /// The measurement variance is not finite or not above zero.
    InvalidVariance,
    /// The gate is NaN or not above zero (`f64::INFINITY` disables gating).
    InvalidGate,
    /// The row has a coefficient that is not finite or beyond [`MAX_ROW_COEFFICIENT`], or no
    /// non-zero coefficient.
    InvalidRow,
    /// The innovation variance `S = hᵀPh + R` is not finite or not above zero.
    InnovationVariance,
    /// The measurement is more than [`MAX_VARIANCE_RATIO`] times more precise than the state
    /// along `h` (`hᵀPh > 10¹² R`): f64 cannot keep the result positive definite. Inflate
    /// `R`, or reseat the states it measures, to use it.
    TooPrecise,
    /// The updated state or a variance would leave the state's bounds, or a variance would
    /// fall to zero or below through rounding.
    OutOfRange,
    /// A batch update's factorisation failed: f64 could not keep the information matrix
    /// positive definite.
    NotPositiveDefinite,
}

impl fmt::Display for UpdateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            UpdateError::InvalidInnovation => "innovation is NaN or infinite",
            UpdateError::InvalidVariance => "measurement variance not finite or not positive",
            UpdateError::InvalidGate => "gate threshold is NaN or not positive",
            UpdateError::InvalidRow => "measurement row not finite, too large or all zero",
            UpdateError::InnovationVariance => "innovation variance not finite or not positive",
            UpdateError::TooPrecise => "measurement over 1e12 times more precise than the state",
            UpdateError::OutOfRange => "updated state or covariance out of range",
            UpdateError::NotPositiveDefinite => "information matrix not positive definite",
        })
    }
}

impl core::error::Error for UpdateError {}

/// One element of the expanded Joseph form, `P_ij − k_i d_j − u_i k_j`.
fn joseph(pij: f64, ki: f64, ui: f64, kj: f64, dj: f64) -> f64 {
    pij - ki * dj - ui * kj
}

impl FilterState {
    /// The innovation variance `S = hᵀPh + R` of a measurement with row `row` and variance
    /// `variance`, without updating (for tests of several innovations at once).
    pub fn innovation_variance(&self, row: &MeasurementRow, variance: f64) -> f64 {
        // Σ_i h_i (h_i P_ii / 2 + Σ_{j>i} P_ij h_j), doubled: the symmetric form visits each
        // pair once.
        let mut s = 0.0;
        for (a, (i, hi)) in row.nonzero().enumerate() {
            let mut inner = 0.5 * hi * at(&self.p, i, i);
            for (j, hj) in row.nonzero().skip(a.saturating_add(1)) {
                inner += at(&self.p, i, j) * hj;
            }
            s += hi * inner;
        }
        2.0 * s + variance
    }

    /// Applies one scalar measurement: row `h`, innovation `ν = z − h(x)`, measurement
    /// variance `variance` (`R`, in the measurement's unit squared), unless its NIS exceeds
    /// `gate` (a χ²(1) quantile: 3.841 for 95 %, 6.635 for 99 %, 10.83 for 99.9 % \[C:
    /// scipy.stats.chi2.ppf\]; `f64::INFINITY` applies every measurement). A measurement with
    /// NIS equal to the gate is applied.
    ///
    /// # Errors
    /// [`UpdateError`] for invalid inputs, a non-positive innovation variance, a measurement
    /// too precise for f64 ([`MAX_VARIANCE_RATIO`]) or a result out of range; the state is unchanged after an error and after a gated measurement.
    pub fn update(
        &mut self,
        row: &MeasurementRow,
        innovation: f64,
        variance: f64,
        gate: f64,
    ) -> Result<UpdateOutcome, UpdateError> {
        if !innovation.is_finite() {
            return Err(UpdateError::InvalidInnovation);
        }
        if !(variance > 0.0 && variance.is_finite()) {
            return Err(UpdateError::InvalidVariance);
        }
        if gate.is_nan() || gate <= 0.0 {
            return Err(UpdateError::InvalidGate);
        }
        let h = &row.h;
        if !h.iter().all(|v| v.abs() <= MAX_ROW_COEFFICIENT) || h.iter().all(|v| *v == 0.0) {
            return Err(UpdateError::InvalidRow);
        }

        // u = P h, skipping the zero coefficients (most of a GNSS row).
        let mut u = [0.0; STATE_LEN];
        for (ui, prow) in u.iter_mut().zip(&self.p) {
            *ui = prow
                .iter()
                .zip(h)
                .filter(|(_, hj)| **hj != 0.0)
                .map(|(pij, hj)| pij * hj)
                .sum();
        }
        let hph: f64 = h
            .iter()
            .zip(&u)
            .filter(|(hj, _)| **hj != 0.0)
            .map(|(hj, uj)| hj * uj)
            .sum();
        let s = hph + variance;
        if !(s > 0.0 && s.is_finite()) {
            return Err(UpdateError::InnovationVariance);
        }
        if hph > MAX_VARIANCE_RATIO * variance {
            return Err(UpdateError::TooPrecise);
        }
        let nis = innovation * innovation / s;
        if nis > gate {
            return Ok(UpdateOutcome::Gated { nis });
        }

        let inv_s = 1.0 / s;
        let k = u.map(|ui| ui * inv_s);
        let mut d = [0.0; STATE_LEN];
        for ((di, ui), ki) in d.iter_mut().zip(&u).zip(&k) {
            *di = ui - s * ki;
        }
        let mut x = self.x;
        for (xi, ki) in x.iter_mut().zip(&k) {
            *xi += ki * innovation;
        }
        if !x.iter().all(|v| v.abs() <= MAX_ABS_STATE) {
            return Err(UpdateError::OutOfRange);
        }
        let mut diag = [0.0; STATE_LEN];
        for (i, ((v, ki), (ui, di))) in diag.iter_mut().zip(&k).zip(u.iter().zip(&d)).enumerate() {
            *v = joseph(at(&self.p, i, i), *ki, *ui, *ki, *di);
        }
        if !diag.iter().all(|&v| v > 0.0 && v <= MAX_VARIANCE) {
            return Err(UpdateError::OutOfRange);
        }

        // Upper triangle in place (each element reads only itself and the vectors), then the
        // diagonal checked above, then the mirror.
        for (i, (prow, (ki, ui))) in self.p.iter_mut().zip(k.iter().zip(&u)).enumerate() {
            let right = prow
                .iter_mut()
                .zip(k.iter().zip(&d))
                .skip(i.saturating_add(1));
            for (pij, (kj, dj)) in right {
                *pij = joseph(*pij, *ki, *ui, *kj, *dj);
            }
        }
        for (i, v) in diag.into_iter().enumerate() {
            put(&mut self.p, i, i, v);
        }
        mirror_upper(&mut self.p);
        self.x = x;
        Ok(UpdateOutcome::Applied { nis })
    }
}

#[cfg(test)]
#[path = "update_tests.rs"]
mod tests;
