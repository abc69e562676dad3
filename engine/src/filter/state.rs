//! The filter's state vector and covariance: ten states in a fixed layout.
//!
//! | index | state | unit |
//! |---|---|---|
//! | 0, 1, 2 | ECEF position x, y, z | m |
//! | 3, 4, 5 | ECEF velocity x, y, z | m/s |
//! | 6 | receiver clock bias (GPS time), c·δt | m |
//! | 7 | receiver clock drift, c·δṫ | m/s |
//! | 8 | Galileo − GPS inter-system bias | m |
//! | 9 | BeiDou − GPS inter-system bias | m |
//!
//! The covariance is kept as a full 10×10 array. A packed triangle (55 values) would save
//! 360 bytes, but every kernel here reads rows at random (`P h`, the mirrored triangle), and
//! the packed index arithmetic costs more than it saves on a 10-state filter; the kernels
//! write only the upper triangle and mirror it, so the work is that of the packed form.
//!
//! # Invariants
//! Every [`FilterState`] holds finite numbers, `|x_i| ≤` [`MAX_ABS_STATE`], an exactly
//! symmetric `P` with every variance in `(0,` [`MAX_VARIANCE`]`]`. The constructors refuse
//! anything else, and [`FilterState::predict`] and [`FilterState::update`] refuse a step whose
//! result would break them, leaving the state as it was. Bounded values keep every product
//! of two of them far from overflow (10¹² · 10²⁴ ≪ 10³⁰⁸).

use core::fmt;

/// Number of states.
pub const STATE_LEN: usize = 10;
/// ECEF position x, m.
pub const POS_X: usize = 0;
/// ECEF position y, m.
pub const POS_Y: usize = 1;
/// ECEF position z, m.
pub const POS_Z: usize = 2;
/// ECEF velocity x, m/s.
pub const VEL_X: usize = 3;
/// ECEF velocity y, m/s.
pub const VEL_Y: usize = 4;
/// ECEF velocity z, m/s.
pub const VEL_Z: usize = 5;
/// Receiver clock bias against GPS time, metres (c·δt).
pub const CLOCK_BIAS: usize = 6;
/// Receiver clock drift, m/s (c·δṫ).
pub const CLOCK_DRIFT: usize = 7;
/// Galileo − GPS inter-system bias, metres.
pub const ISB_GALILEO: usize = 8;
/// BeiDou − GPS inter-system bias, metres.
pub const ISB_BEIDOU: usize = 9;

/// Largest magnitude of any state: 10¹² m (or m/s) is far beyond any position, velocity or
/// clock bias a receiver can report (a clock bias of 10¹² m is 55 minutes).
pub const MAX_ABS_STATE: f64 = 1e12;
/// Largest variance: 10²⁴ (σ = 10¹² m). A state this uncertain carries no information.
pub const MAX_VARIANCE: f64 = 1e24;
/// Largest variance [`FilterState::free_velocity`] gives, m²/s²: σ = 1,000 m/s, beyond any
/// asset a tracker rides. Larger values would let one prediction build position-velocity
/// blocks whose determinant cancels in f64 (the property test found one at 1e21).
pub const MAX_FREED_VELOCITY_VAR: f64 = 1e6;
/// Largest variance [`FilterState::widen_position`] adds, m²: σ = 1,000 km, for the same
/// reason.
pub const MAX_WIDENING_VAR: f64 = 1e12;
/// Asymmetry accepted by [`FilterState::from_parts`] and [`FilterState::is_healthy`]:
/// `|P_ij − P_ji| ≤ 1e-9 · √(P_ii P_jj)`.
pub const SYMMETRY_TOLERANCE: f64 = 1e-9;

/// A state vector in the layout above.
pub type StateVector = [f64; STATE_LEN];
/// A covariance matrix in the layout above, row-major.
pub type Covariance = [[f64; STATE_LEN]; STATE_LEN];

/// Element (i, j) of a covariance; 0 outside the matrix (never reached with the indices here).
pub(super) fn at(p: &Covariance, i: usize, j: usize) -> f64 {
    p.get(i).and_then(|r| r.get(j)).copied().unwrap_or(0.0)
}

/// Sets element (i, j); indices outside the matrix are ignored.
/// Sets element `i` of a state vector; an index outside the layout is ignored.
fn set(x: &mut StateVector, i: usize, v: f64) {
    if let Some(e) = x.get_mut(i) {
        *e = v;
    }
}

pub(super) fn put(p: &mut Covariance, i: usize, j: usize, v: f64) {
    if let Some(e) = p.get_mut(i).and_then(|r| r.get_mut(j)) {
        *e = v;
    }
}

/// Copies the upper triangle onto the lower one, so that `P` is exactly symmetric.
pub(super) fn mirror_upper(p: &mut Covariance) {
    for i in 0..STATE_LEN {
        for j in i.saturating_add(1)..STATE_LEN {
            let v = at(p, i, j);
            put(p, j, i, v);
        }
    }
}

/// Why a filter state was refused.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum StateError {
    /// A state or covariance element is NaN or infinite.
    NonFinite,
    /// A state's magnitude exceeds [`MAX_ABS_STATE`].
    StateOutOfRange,
    /// A variance is not above zero or exceeds [`MAX_VARIANCE`].
    VarianceOutOfRange,
    /// `P` is not symmetric within [`SYMMETRY_TOLERANCE`].
    Asymmetric,
    /// `P` has no Cholesky factor: it is not positive definite.
    NotPositiveDefinite,
}

impl fmt::Display for StateError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            StateError::NonFinite => "filter state or covariance holds NaN or infinity",
            StateError::StateOutOfRange => "filter state magnitude above 1e12",
            StateError::VarianceOutOfRange => "filter variance not in (0, 1e24]",
            StateError::Asymmetric => "filter covariance is not symmetric",
            StateError::NotPositiveDefinite => "filter covariance is not positive definite",
        })
    }
}

impl core::error::Error for StateError {}

/// A position/clock fix to start the filter from, each part with its variance (the
/// covariance starts diagonal). A least-squares fix gives position, clock and inter-system
/// biases; velocity and drift may come from a Doppler solution or be zero with a large
/// variance.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FixPrior {
    /// ECEF position, m.
    pub position_m: [f64; 3],
    /// Variance of each position axis, m².
    pub position_var_m2: f64,
    /// ECEF velocity, m/s.
    pub velocity_mps: [f64; 3],
    /// Variance of each velocity axis, m²/s².
    pub velocity_var_m2ps2: f64,
    /// Receiver clock bias, m.
    pub clock_bias_m: f64,
    /// Its variance, m².
    pub clock_bias_var_m2: f64,
    /// Receiver clock drift, m/s.
    pub clock_drift_mps: f64,
    /// Its variance, m²/s².
    pub clock_drift_var_m2ps2: f64,
    /// Galileo − GPS and BeiDou − GPS inter-system biases, m.
    pub isb_m: [f64; 2],
    /// Variance of each inter-system bias, m².
    pub isb_var_m2: f64,
}

/// The filter's state vector `x` and covariance `P` (layout in the module documentation).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct FilterState {
    pub(super) x: StateVector,
    pub(super) p: Covariance,
}

impl FilterState {
    /// The state of a fix with a diagonal covariance.
    ///
    /// # Errors
    /// As [`FilterState::from_parts`]: a non-finite value, a state beyond [`MAX_ABS_STATE`]
    /// or a variance outside `(0,` [`MAX_VARIANCE`]`]`.
    pub fn from_fix(fix: &FixPrior) -> Result<Self, StateError> {
        let [px, py, pz] = fix.position_m;
        let [vx, vy, vz] = fix.velocity_mps;
        let [gal, bds] = fix.isb_m;
        let x = [
            px,
            py,
            pz,
            vx,
            vy,
            vz,
            fix.clock_bias_m,
            fix.clock_drift_mps,
            gal,
            bds,
        ];
        let (pv, vv, iv) = (fix.position_var_m2, fix.velocity_var_m2ps2, fix.isb_var_m2);
        let var = [
            pv,
            pv,
            pv,
            vv,
            vv,
            vv,
            fix.clock_bias_var_m2,
            fix.clock_drift_var_m2ps2,
            iv,
            iv,
        ];
        // A diagonal with positive variances is positive definite: checking the values is
        // enough (no factorisation, which keeps a restart cheap on the target).
        check_values(&x, var.iter(), var.iter().copied())?;
        let mut state = FilterState {
            x,
            p: [[0.0; STATE_LEN]; STATE_LEN],
        };
        for (i, v) in var.into_iter().enumerate() {
            put(&mut state.p, i, i, v);
        }
        Ok(state)
    }

    /// A state from a full vector and covariance (for instance a least-squares fix with its
    /// correlated covariance). `P` is symmetrised (the mean of both triangles) before it is
    /// stored.
    ///
    /// # Errors
    /// [`StateError::NonFinite`], [`StateError::StateOutOfRange`],
    /// [`StateError::VarianceOutOfRange`], [`StateError::Asymmetric`] or
    /// [`StateError::NotPositiveDefinite`].
    pub fn from_parts(x: StateVector, p: Covariance) -> Result<Self, StateError> {
        check_values(&x, p.iter().flatten(), (0..STATE_LEN).map(|i| at(&p, i, i)))?;
        if !symmetric(&p) {
            return Err(StateError::Asymmetric);
        }
        let mut p = p;
        for i in 0..STATE_LEN {
            for j in i.saturating_add(1)..STATE_LEN {
                let mean = 0.5 * (at(&p, i, j) + at(&p, j, i));
                put(&mut p, i, j, mean);
            }
        }
        mirror_upper(&mut p);
        let state = FilterState { x, p };
        if !state.is_positive_definite() {
            return Err(StateError::NotPositiveDefinite);
        }
        Ok(state)
    }

    /// The state vector.
    pub fn x(&self) -> &StateVector {
        &self.x
    }

    /// The covariance.
    pub fn p(&self) -> &Covariance {
        &self.p
    }

    /// ECEF position, m.
    pub fn position(&self) -> [f64; 3] {
        let [x, y, z, ..] = self.x;
        [x, y, z]
    }

    /// ECEF velocity, m/s.
    pub fn velocity(&self) -> [f64; 3] {
        let [_, _, _, x, y, z, ..] = self.x;
        [x, y, z]
    }

    /// Receiver clock bias (m) and drift (m/s).
    pub fn clock(&self) -> (f64, f64) {
        let [_, _, _, _, _, _, bias, drift, _, _] = self.x;
        (bias, drift)
    }

    /// Galileo − GPS and BeiDou − GPS inter-system biases, m.
    pub fn inter_system_biases(&self) -> [f64; 2] {
        let [.., galileo, beidou] = self.x;
        [galileo, beidou]
    }

    /// The covariance block of states `first..first + K`.
    fn block<const K: usize>(&self, first: usize) -> [[f64; K]; K] {
        let mut out = [[0.0; K]; K];
        for (i, row) in out.iter_mut().enumerate() {
            for (j, v) in row.iter_mut().enumerate() {
                *v = at(&self.p, first.saturating_add(i), first.saturating_add(j));
            }
        }
        out
    }

    /// ECEF position covariance, m².
    pub fn position_cov(&self) -> [[f64; 3]; 3] {
        self.block(POS_X)
    }

    /// ECEF velocity covariance, m²/s².
    pub fn velocity_cov(&self) -> [[f64; 3]; 3] {
        self.block(VEL_X)
    }

    /// Covariance of clock bias and drift: `[[σ²_b, σ_bd], [σ_bd, σ²_d]]` (m², m²/s, m²/s²).
    pub fn clock_cov(&self) -> [[f64; 2]; 2] {
        self.block(CLOCK_BIAS)
    }

    /// Covariance of the two inter-system biases, m².
    pub fn inter_system_bias_cov(&self) -> [[f64; 2]; 2] {
        self.block(ISB_GALILEO)
    }

    /// Every element finite, `P` symmetric within [`SYMMETRY_TOLERANCE`], every variance
    /// above zero. Holds for every state this module builds; meant for checks on states
    /// from elsewhere and for tests.
    pub fn is_healthy(&self) -> bool {
        self.x
            .iter()
            .chain(self.p.iter().flatten())
            .all(|v| v.is_finite())
            && (0..STATE_LEN).all(|i| at(&self.p, i, i) > 0.0)
            && symmetric(&self.p)
    }

    /// Whether `P` has a Cholesky factor `L Lᵀ` with positive, finite pivots (positive
    /// definite). Reads the lower triangle. Cost: about n³/6 ≈ 170 multiply-adds and ten
    /// square roots, with the engine's one Cholesky kernel (an 800-byte factor).
    pub fn is_positive_definite(&self) -> bool {
        let mut a = self.p;
        crate::linalg::factor_in_place(&mut a)
    }

    /// Restarts the receiver clock: bias and drift take the given values and variances and
    /// lose every correlation with the other states (a receiver that re-initialised its clock
    /// after a wake-up, or a clock step too large to be a millisecond jump). The result stays
    /// positive definite: a principal block of a positive-definite matrix beside a positive
    /// diagonal.
    ///
    /// # Errors
    /// [`StateError::NonFinite`], [`StateError::StateOutOfRange`] or
    /// [`StateError::VarianceOutOfRange`]; the state is left unchanged.
    pub fn reseat_clock(
        &mut self,
        bias_m: f64,
        bias_var_m2: f64,
        drift_mps: f64,
        drift_var_m2ps2: f64,
    ) -> Result<(), StateError> {
        let values = [bias_m, bias_var_m2, drift_mps, drift_var_m2ps2];
        if !values.iter().all(|v| v.is_finite()) {
            return Err(StateError::NonFinite);
        }
        if bias_m.abs() > MAX_ABS_STATE || drift_mps.abs() > MAX_ABS_STATE {
            return Err(StateError::StateOutOfRange);
        }
        if ![bias_var_m2, drift_var_m2ps2]
            .iter()
            .all(|&v| v > 0.0 && v <= MAX_VARIANCE)
        {
            return Err(StateError::VarianceOutOfRange);
        }
        self.decorrelate(CLOCK_BIAS, bias_m, bias_var_m2);
        self.decorrelate(CLOCK_DRIFT, drift_mps, drift_var_m2ps2);
        Ok(())
    }

    /// Frees the velocity: each axis keeps its value, takes the variance `var_m2ps2` and
    /// loses every correlation (an asset that was held still and now moves).
    ///
    /// # Errors
    /// [`StateError::VarianceOutOfRange`] for a variance that is not finite or outside
    /// `(0,` [`MAX_FREED_VELOCITY_VAR`]`]`; the state is left unchanged.
    pub fn free_velocity(&mut self, var_m2ps2: f64) -> Result<(), StateError> {
        if !(var_m2ps2 > 0.0 && var_m2ps2 <= MAX_FREED_VELOCITY_VAR) {
            return Err(StateError::VarianceOutOfRange);
        }
        for k in [VEL_X, VEL_Y, VEL_Z] {
            let v = self.x.get(k).copied().unwrap_or(0.0);
            self.decorrelate(k, v, var_m2ps2);
        }
        Ok(())
    }

    /// Adds `var_m2` to the variance of each position axis (an asset found moving after it
    /// was held: it may be that far from where it was). A positive diagonal added to a
    /// positive-definite matrix leaves it positive definite.
    ///
    /// # Errors
    /// [`StateError::VarianceOutOfRange`] for an addition that is not finite and positive or
    /// exceeds [`MAX_WIDENING_VAR`]; the state is left unchanged.
    pub fn widen_position(&mut self, var_m2: f64) -> Result<(), StateError> {
        if !(var_m2 > 0.0 && var_m2 <= MAX_WIDENING_VAR) {
            return Err(StateError::VarianceOutOfRange);
        }
        for i in 0..3 {
            let v = at(&self.p, i, i) + var_m2;
            put(&mut self.p, i, i, v);
        }
        Ok(())
    }

    /// Sets state `k` to `value` with variance `var` and no correlation with the others. The
    /// result stays positive definite: a principal block of a positive-definite matrix
    /// beside a positive diagonal element.
    fn decorrelate(&mut self, k: usize, value: f64, var: f64) {
        for j in 0..STATE_LEN {
            put(&mut self.p, k, j, 0.0);
            put(&mut self.p, j, k, 0.0);
        }
        put(&mut self.p, k, k, var);
        set(&mut self.x, k, value);
    }

    /// Moves the clock bias by `delta_m` without touching its uncertainty: a receiver's
    /// whole-millisecond clock step (±299,792.458 m per millisecond) is known exactly.
    ///
    /// # Errors
    /// [`StateError::NonFinite`] or [`StateError::StateOutOfRange`]; the state is left
    /// unchanged.
    pub fn shift_clock_bias(&mut self, delta_m: f64) -> Result<(), StateError> {
        let (bias, _) = self.clock();
        let b = bias + delta_m;
        if !b.is_finite() {
            return Err(StateError::NonFinite);
        }
        if b.abs() > MAX_ABS_STATE {
            return Err(StateError::StateOutOfRange);
        }
        set(&mut self.x, CLOCK_BIAS, b);
        Ok(())
    }
}

/// The checks every constructor makes, in this order: every number finite (the state and
/// `numbers`), every state within [`MAX_ABS_STATE`], every variance in `(0,` [`MAX_VARIANCE`]`]`.
fn check_values<'a>(
    x: &'a StateVector,
    numbers: impl Iterator<Item = &'a f64>,
    mut variances: impl Iterator<Item = f64>,
) -> Result<(), StateError> {
    if !x.iter().chain(numbers).all(|v| v.is_finite()) {
        return Err(StateError::NonFinite);
    }
    if !x.iter().all(|v| v.abs() <= MAX_ABS_STATE) {
        return Err(StateError::StateOutOfRange);
    }
    if !variances.all(|v| v > 0.0 && v <= MAX_VARIANCE) {
        return Err(StateError::VarianceOutOfRange);
    }
    Ok(())
}

/// `|P_ij − P_ji| ≤ SYMMETRY_TOLERANCE · √(P_ii P_jj)` for every pair.
fn symmetric(p: &Covariance) -> bool {
    (0..STATE_LEN).all(|i| {
        (i.saturating_add(1)..STATE_LEN).all(|j| {
            let scale = libm::sqrt((at(p, i, i) * at(p, j, j)).abs());
            (at(p, i, j) - at(p, j, i)).abs() <= SYMMETRY_TOLERANCE * scale
        })
    })
}

#[cfg(test)]
#[path = "state_tests.rs"]
mod tests;
