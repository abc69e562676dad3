//! The parked hold: a stationary detector on the filter's Doppler-driven velocity, and the
//! test that releases a held asset when its measurements show motion.
//!
//! - **Enter**: the filter's speed and the σ of each velocity axis stay below
//!   `filter.hold_speed_mps` for `filter.hold_after_s`. While held, the filter predicts with
//!   [`HELD_PROFILE`] and applies a zero-velocity measurement of σ [`ZERO_VELOCITY_SIGMA_MPS`]
//!   on each axis, so the position averages the pseudoranges instead of following their
//!   noise (the "wander" of a parked tracker).
//! - **Release**: the spread of the epoch's range-rate innovations, or of its pseudorange
//!   innovations, about their weighted mean exceeds the 0.999 quantile of χ² with one degree
//!   of freedom fewer than their count (common practice: a zero-velocity detector tested on
//!   its innovations; removing the mean removes the receiver clock's common offset). Range
//!   rates see an asset that moves now; pseudoranges one that was moved while the receiver
//!   slept, however long (the hold is kept across gaps up to `filter.max_gap_s`). On release
//!   the velocity is freed with σ = [`RELEASE_SIGMA_MPS`] per axis and each position
//!   variance grows by `(RELEASE_SIGMA_MPS · Δt)²`, Δt the time since the last epoch (at
//!   least 1 s).

use super::noise::MotionProfile;
use super::window::chi2_999;
use crate::config::{FilterConfig, HoldMode};
use crate::time::GnssTime;

/// Process noise while held: 1e-6 m²/s³ on every axis (velocity σ grows by 1 mm/s in √s; the
/// zero-velocity updates pin it).
pub const HELD_PROFILE: MotionProfile = MotionProfile {
    accel_psd_horizontal: 1e-6,
    accel_psd_vertical: 1e-6,
};
/// σ of the zero-velocity measurement on each axis, m/s.
pub const ZERO_VELOCITY_SIGMA_MPS: f64 = 0.01;
/// σ of each velocity axis after a release, m/s (a vehicle pulling away reaches a few m/s in
/// the seconds before the test sees it).
pub const RELEASE_SIGMA_MPS: f64 = 5.0;

/// Where the stationary detector stands.
#[derive(Clone, Copy, Debug, PartialEq)]
pub(crate) enum Stillness {
    /// Moving, or the hold is off.
    Moving,
    /// Below the speed threshold since `since`.
    Still {
        /// First epoch of the still run.
        since: GnssTime,
    },
    /// Held.
    Held,
}

impl Stillness {
    /// The detector after an epoch whose filtered speed is `speed_mps` with per-axis
    /// velocity σ at most `sigma_mps`.
    pub fn after(self, cfg: &FilterConfig, t: GnssTime, speed_mps: f64, sigma_mps: f64) -> Self {
        if cfg.hold == HoldMode::Off {
            return Stillness::Moving;
        }
        let still = speed_mps < cfg.hold_speed_mps && sigma_mps < cfg.hold_speed_mps;
        match (self, still) {
            (_, false) => Stillness::Moving,
            (Stillness::Held, true) => Stillness::Held,
            (Stillness::Moving, true) => Stillness::Still { since: t },
            (Stillness::Still { since }, true) => {
                if t.since(since).as_secs_f64() >= cfg.hold_after_s {
                    Stillness::Held
                } else {
                    Stillness::Still { since }
                }
            }
        }
    }

    /// Whether the position is held.
    pub fn held(self) -> bool {
        self == Stillness::Held
    }
}

/// Σ NIS of `count` innovations against a held state: whether they show motion.
pub fn shows_motion(nis_sum: f64, count: u16) -> bool {
    count > 0 && nis_sum > f64::from(chi2_999(count))
}

#[cfg(test)]
#[path = "hold_tests.rs"]
mod tests;
