//! Truth for the synthetic measurements, written apart from the engine's models.
//!
//! The synthetic scenarios and the physical-limit test must be able to catch a wrong sign
//! or constant in the engine's orbit, clock, group-delay, ionosphere and troposphere code,
//! so the ranges they are built from never call those functions. Everything here is a
//! second implementation from the published texts, deliberately in another form where one
//! exists:
//! - orbit ([`orbit`]): IS-GPS-200 Table 20-IV with the true anomaly by `atan2`, Kepler's
//!   equation by fixed-point iteration, every angle by its own sine and cosine, BeiDou GEO
//!   by explicit rotation matrices (B1I ICD §5.2.4.12); its own μ and Ω̇e per ICD and its
//!   own week and time-scale arithmetic;
//! - satellite clock ([`clock`]): polynomial plus the relativistic term in its vector form
//!   Δtr = −2 r·v / c² (IS-GPS-200 §20.3.3.3.3.1 gives it as the equivalent of F·e·√A·sin Ek),
//!   with the velocity by central differences of the orbit; group delays from a table of
//!   the ICDs' carrier frequencies;
//! - atmosphere ([`atmosphere`]): Klobuchar and Saastamoinen written again from the ICD and
//!   the Davis et al. (1985) formula.
//!
//! Shared with the engine, as ground both sides stand on: the integer-nanosecond time type,
//! the WGS-84 frame conversions (checked against pymap3d in `tests/frames_reference.rs`),
//! the speed of light and the ephemeris record itself.

pub mod atmosphere;
pub mod clock;
pub mod orbit;

use trackfix_engine::{BroadcastEphemeris, GnssTime, Signal, SPEED_OF_LIGHT};

/// WGS-84 Earth rotation rate, rad/s (NGA TR8350.2), for the rotation of the Earth during
/// the signal's flight (Sagnac).
pub const EARTH_ROTATION: f64 = 7.292_115_146_7e-5;

/// Deliberate model errors, for the test that shows a model mistake reaches the gates.
/// The default is the truth.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Mutation {
    /// Multiplies the relativistic clock term (−1 flips its sign).
    pub relativity: f64,
    /// Multiplies the broadcast group delay (−1 flips its sign).
    pub group_delay: f64,
    /// Multiplies the Earth-rotation (Sagnac) angle (−1 flips its sign).
    pub sagnac: f64,
}

impl Default for Mutation {
    fn default() -> Self {
        Mutation {
            relativity: 1.0,
            group_delay: 1.0,
            sagnac: 1.0,
        }
    }
}

/// One satellite as a receiver at true time `t_true` sees it on `signal`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TrueRange {
    /// Pseudorange without atmosphere or noise: geometric range + receiver clock − satellite
    /// clock (with relativity and group delay), m.
    pub pseudorange_m: f64,
    /// Satellite position at transmit time, in the Earth-fixed frame of reception, m.
    pub sat_ecef_m: [f64; 3],
    /// Signal travel time, s.
    pub travel_s: f64,
}

/// The true pseudorange of `eph`'s satellite on `signal` received at true time `t_true` at
/// `rx` by a receiver whose clock runs `rx_clock_m` ahead (in metres).
pub fn pseudorange(
    eph: &BroadcastEphemeris,
    signal: Signal,
    t_true: GnssTime,
    rx: [f64; 3],
    rx_clock_m: f64,
    m: &Mutation,
) -> TrueRange {
    let mut tau = 0.075;
    let mut sat = [0.0; 3];
    // Light time by fixed-point iteration: each pass shrinks the error by v/c ≈ 1e-5.
    for _ in 0..4 {
        let t_tx = orbit::shift(t_true, -tau);
        let s = orbit::position(eph, t_tx);
        let th = m.sagnac * EARTH_ROTATION * tau;
        sat = [
            s[0] * th.cos() + s[1] * th.sin(),
            -s[0] * th.sin() + s[1] * th.cos(),
            s[2],
        ];
        let d = [sat[0] - rx[0], sat[1] - rx[1], sat[2] - rx[2]];
        tau = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt() / SPEED_OF_LIGHT;
    }
    let t_tx = orbit::shift(t_true, -tau);
    let dt_sat = clock::offset_s(eph, t_tx, m) - m.group_delay * clock::group_delay_s(eph, signal);
    TrueRange {
        pseudorange_m: SPEED_OF_LIGHT * (tau - dt_sat) + rx_clock_m,
        sat_ecef_m: sat,
        travel_s: tau,
    }
}

#[cfg(test)]
#[path = "tests.rs"]
mod tests;
