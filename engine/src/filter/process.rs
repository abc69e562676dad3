//! Prediction: constant-velocity kinematics with white-acceleration noise, the two-state
//! receiver clock and random-walk inter-system biases, over a step of `dt` seconds.
//!
//! ```text
//! x' = F x          F = I except  ∂pos/∂vel = dt·I₃,  ∂bias/∂drift = dt
//! P' = F P Fᵀ + Q
//! Q_pos,pos = A·dt³/3   Q_pos,vel = A·dt²/2   Q_vel,vel = A·dt
//!     A = Rᵀ diag(q_h, q_h, q_v) R = q_h·I₃ + (q_v − q_h)·u uᵀ      (R: ECEF → east/north/up)
//! Q_clock = c²·[[S_f·dt + S_g·dt³/3, S_g·dt²/2], [S_g·dt²/2, S_g·dt]]
//! Q_isb   = q_isb·dt  (each inter-system bias)
//! ```
//! The white-acceleration blocks are the exact discretisation of a constant-velocity model
//! driven by white acceleration (common practice; Bar-Shalom, Li & Kirubarajan 2001, the
//! continuous white-noise acceleration model \[M\]); the clock block is Brown & Hwang's
//! two-state clock model \[M\]. Because east and north share one PSD, the rotated tensor
//! needs only the up direction `u`: here the ellipsoid normal through the point, taken as
//! the gradient of the WGS-84 ellipsoid's equation, `(x, y, z/(1 − e²))`, normalised. That is
//! exact on the ellipsoid and tilts by about `h·e′²·sin φ cos φ / (N + h)` off it
//! (`e′² = e²/(1 − e²)`; at most 5.3 µrad at 10 km height), with no trigonometry; a position at the Earth's centre has no up and gets the
//! larger PSD on all three axes.
//!
//! Cost per step, n = 10, counted from the code: F P Fᵀ touches only the rows and columns
//! of position and bias — the 10 upper-triangle elements (diagonal included) between two of
//! them take two multiplications, the 24 between one of them and another state take one
//! (44); Q's elements 21, the acceleration tensor 18, the clock and bias terms 12, the up
//! direction 6, the state 4: about 105 multiplications, four divisions (two by 3) and one
//! square root. A dense F P Fᵀ would take 2·n³ = 2,000. Stack: the new state and diagonal
//! and the noise terms, about 300 bytes.

use core::fmt;

use super::noise::{ParameterError, ProcessNoise};
use super::state::{
    at, mirror_upper, put, FilterState, StateVector, CLOCK_BIAS, CLOCK_DRIFT, ISB_BEIDOU,
    ISB_GALILEO, MAX_ABS_STATE, MAX_VARIANCE, STATE_LEN,
};
use crate::frames::WGS84_E2;
use crate::SPEED_OF_LIGHT;

/// Why a prediction was refused. The state is left unchanged.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum PredictError {
    /// The step is not finite or not above zero.
    InvalidStep,
    /// The step exceeds the caller's maximum (or the maximum is NaN).
    StepTooLong,
    /// A process-noise parameter is invalid.
    Parameter(ParameterError),
    /// The predicted state or a predicted variance would leave the bounds of
    /// [`MAX_ABS_STATE`] and [`MAX_VARIANCE`] (or lose its positive variance to rounding).
    OutOfRange,
}

impl fmt::Display for PredictError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PredictError::InvalidStep => f.write_str("prediction step not finite or not positive"),
            PredictError::StepTooLong => f.write_str("prediction step above the allowed maximum"),
            PredictError::Parameter(e) => write!(f, "process noise: {e}"),
            PredictError::OutOfRange => f.write_str("predicted state or covariance out of range"),
        }
    }
}

impl core::error::Error for PredictError {
    fn source(&self) -> Option<&(dyn core::error::Error + 'static)> {
        match self {
            PredictError::Parameter(e) => Some(e),
            _ => None,
        }
    }
}

impl From<ParameterError> for PredictError {
    fn from(e: ParameterError) -> Self {
        PredictError::Parameter(e)
    }
}

/// The state whose rate each state integrates under F: position ← velocity, bias ← drift.
const RATE_OF: [Option<usize>; STATE_LEN] = [
    Some(3),
    Some(4),
    Some(5),
    None,
    None,
    None,
    Some(CLOCK_DRIFT),
    None,
    None,
    None,
];

fn rate_of(i: usize) -> Option<usize> {
    RATE_OF.get(i).copied().flatten()
}

/// The unit up direction (ellipsoid normal) at an ECEF position, or `None` where it is not
/// defined (at or numerically at the Earth's centre).
pub(super) fn up_direction(position: [f64; 3]) -> Option<[f64; 3]> {
    let [x, y, z] = position;
    let zn = z / (1.0 - WGS84_E2);
    let norm = libm::sqrt(x * x + y * y + zn * zn);
    if !(norm > 0.0 && norm.is_finite()) {
        return None;
    }
    let inv = 1.0 / norm;
    Some([x * inv, y * inv, zn * inv])
}

/// The non-zero elements of Q for one step.
struct StepNoise {
    /// Acceleration PSD tensor in ECEF, m²/s³.
    accel: [[f64; 3]; 3],
    /// dt³/3, dt²/2, dt.
    c3: f64,
    c2: f64,
    c1: f64,
    /// Clock block, m², m²/s, m²/s².
    bias: f64,
    bias_drift: f64,
    drift: f64,
    /// Each inter-system bias, m².
    isb: f64,
}

/// Position axis (`false`) or velocity axis (`true`) and the axis number of a state.
fn kinematic(i: usize) -> Option<(bool, usize)> {
    match i {
        0..=2 => Some((false, i)),
        3 => Some((true, 0)),
        4 => Some((true, 1)),
        5 => Some((true, 2)),
        _ => None,
    }
}

impl StepNoise {
    fn new(noise: &ProcessNoise, position: [f64; 3], dt: f64) -> Self {
        let (qh, qv) = (
            noise.motion.accel_psd_horizontal,
            noise.motion.accel_psd_vertical,
        );
        let accel = match up_direction(position) {
            Some(u) => {
                let d = qv - qh;
                let mut a = [[0.0; 3]; 3];
                for (row, ui) in a.iter_mut().zip(u) {
                    for (v, uj) in row.iter_mut().zip(u) {
                        *v = d * ui * uj;
                    }
                }
                let [[a00, _, _], [_, a11, _], [_, _, a22]] = &mut a;
                *a00 += qh;
                *a11 += qh;
                *a22 += qh;
                a
            }
            None => {
                let q = qh.max(qv);
                [[q, 0.0, 0.0], [0.0, q, 0.0], [0.0, 0.0, q]]
            }
        };
        let c2m = SPEED_OF_LIGHT * SPEED_OF_LIGHT;
        let (sf, sg) = (noise.clock.s_f() * c2m, noise.clock.s_g() * c2m);
        let dt2 = dt * dt;
        let dt3 = dt2 * dt;
        StepNoise {
            accel,
            c3: dt3 / 3.0,
            c2: dt2 / 2.0,
            c1: dt,
            bias: sf * dt + sg * dt3 / 3.0,
            bias_drift: sg * dt2 / 2.0,
            drift: sg * dt,
            isb: noise.isb_psd * dt,
        }
    }

    /// Q(i, j), `None` where it is zero.
    fn entry(&self, i: usize, j: usize) -> Option<f64> {
        if let (Some((vi, ai)), Some((vj, aj))) = (kinematic(i), kinematic(j)) {
            let a = self.accel.get(ai).and_then(|r| r.get(aj)).copied()?;
            let c = match (vi, vj) {
                (false, false) => self.c3,
                (true, true) => self.c1,
                _ => self.c2,
            };
            return Some(a * c);
        }
        match (i, j) {
            (CLOCK_BIAS, CLOCK_BIAS) => Some(self.bias),
            (CLOCK_BIAS, CLOCK_DRIFT) | (CLOCK_DRIFT, CLOCK_BIAS) => Some(self.bias_drift),
            (CLOCK_DRIFT, CLOCK_DRIFT) => Some(self.drift),
            (ISB_GALILEO, ISB_GALILEO) | (ISB_BEIDOU, ISB_BEIDOU) => Some(self.isb),
            _ => None,
        }
    }
}

/// The element (i, j) of the lower triangle (or the diagonal), which the prediction reads
/// while it writes the upper one.
fn old(p: &[[f64; STATE_LEN]; STATE_LEN], i: usize, j: usize) -> f64 {
    at(p, i.max(j), i.min(j))
}

/// `(F P Fᵀ)(i, j) = P_ij + dt·(P_r(i),j + P_i,r(j)) + dt²·P_r(i),r(j)`, terms of states
/// without a rate left out.
fn propagated(p: &[[f64; STATE_LEN]; STATE_LEN], i: usize, j: usize, dt: f64, dt2: f64) -> f64 {
    let v = old(p, i, j);
    match (rate_of(i), rate_of(j)) {
        (Some(a), Some(b)) => v + dt * (old(p, a, j) + old(p, i, b)) + dt2 * old(p, a, b),
        (Some(a), None) => v + dt * old(p, a, j),
        (None, Some(b)) => v + dt * old(p, i, b),
        (None, None) => v,
    }
}

impl FilterState {
    /// Predicts the state `dt_s` seconds ahead with the process noise `noise`. The caller
    /// converts its integer time step to seconds once and states the longest step it
    /// accepts (`max_dt_s`; a longer gap calls for a fresh fix instead).
    /// The acceleration noise is rotated from east/north/up at the position before the step.
    ///
    /// # Errors
    /// [`PredictError::InvalidStep`] for a step that is not finite or not above zero,
    /// [`PredictError::StepTooLong`] above `max_dt_s`, [`PredictError::Parameter`] for an
    /// invalid noise parameter and [`PredictError::OutOfRange`] when the result would leave
    /// the state's bounds. The state is unchanged after an error.
    pub fn predict(
        &mut self,
        dt_s: f64,
        max_dt_s: f64,
        noise: &ProcessNoise,
    ) -> Result<(), PredictError> {
        if !(dt_s > 0.0 && dt_s.is_finite()) {
            return Err(PredictError::InvalidStep);
        }
        if dt_s > max_dt_s || max_dt_s.is_nan() {
            return Err(PredictError::StepTooLong);
        }
        noise.validate()?;
        let dt = dt_s;
        let dt2 = dt * dt;

        let mut x: StateVector = self.x;
        for (i, xi) in x.iter_mut().enumerate() {
            if let Some(r) = rate_of(i) {
                *xi += dt * self.x.get(r).copied().unwrap_or(0.0);
            }
        }
        if !x.iter().all(|v| v.abs() <= MAX_ABS_STATE) {
            return Err(PredictError::OutOfRange);
        }

        let q = StepNoise::new(noise, self.position(), dt);
        let mut diag = [0.0; STATE_LEN];
        for (i, d) in diag.iter_mut().enumerate() {
            *d = propagated(&self.p, i, i, dt, dt2) + q.entry(i, i).unwrap_or(0.0);
        }
        if !diag.iter().all(|&v| v > 0.0 && v <= MAX_VARIANCE) {
            return Err(PredictError::OutOfRange);
        }

        // Off-diagonal upper triangle first, reading only the lower triangle and the diagonal
        // (both untouched until the diagonal is written below), then the diagonal, then the
        // mirror: P is exactly symmetric after every step.
        for i in 0..STATE_LEN {
            for j in i.saturating_add(1)..STATE_LEN {
                let mut v = propagated(&self.p, i, j, dt, dt2);
                if let Some(qij) = q.entry(i, j) {
                    v += qij;
                }
                put(&mut self.p, i, j, v);
            }
        }
        for (i, d) in diag.into_iter().enumerate() {
            put(&mut self.p, i, i, d);
        }
        mirror_upper(&mut self.p);
        self.x = x;
        Ok(())
    }
}

#[cfg(test)]
#[path = "process_tests.rs"]
mod tests;
