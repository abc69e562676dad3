//! Satellite clock and broadcast group delays, apart from the engine's implementation.

use super::{orbit, Mutation};
use trackfix_engine::{BroadcastEphemeris, GnssTime, Signal, SPEED_OF_LIGHT};

/// Satellite clock offset at GPS-scale time `t`, with the relativistic term and without
/// group delay, s: af0 + af1·dt + af2·dt² (IS-GPS-200 §20.3.3.3.3.1) + Δtr with
/// Δtr = −2 r·v / c², the vector form the same section states F·e·√A·sin Ek equals.
/// The velocity comes from a central difference of the orbit over ±0.5 s (its error,
/// of order h²·jerk/6, is below 1 µm/s), and r·v is the same in the Earth-fixed and the
/// inertial frame because r·(ω × r) = 0.
pub fn offset_s(eph: &BroadcastEphemeris, t: GnssTime, m: &Mutation) -> f64 {
    let dt = orbit::since_reference(eph, eph.toc_s, t);
    let poly = eph.af0 + eph.af1 * dt + eph.af2 * dt * dt;
    let r = orbit::position(eph, t);
    let ahead = orbit::position(eph, orbit::shift(t, 0.5));
    let behind = orbit::position(eph, orbit::shift(t, -0.5));
    let v = [0, 1, 2].map(|k| ahead[k] - behind[k]);
    let r_dot_v = r[0] * v[0] + r[1] * v[1] + r[2] * v[2];
    poly + m.relativity * (-2.0 * r_dot_v / (SPEED_OF_LIGHT * SPEED_OF_LIGHT))
}

/// Carrier frequencies as multiples of 10.23 MHz (IS-GPS-200 §3.3.1.1, IS-GPS-705,
/// Galileo OS SIS ICD §2.3, BeiDou B1I/B3I ICDs [M]).
fn multiple_of_10_23_mhz(signal: Signal) -> f64 {
    match signal {
        Signal::GpsL1Ca | Signal::GpsL1P | Signal::GalE1 => 154.0,
        Signal::GpsL2 => 120.0,
        Signal::GpsL5 | Signal::GalE5a => 115.0,
        Signal::GalE5b | Signal::BdsB2I => 118.0,
        Signal::GalE6 => 125.0,
        Signal::BdsB1I => 152.6,
        Signal::BdsB3I => 124.0,
        _ => 154.0,
    }
}

/// The broadcast group delay the satellite clock takes for `signal`, s:
/// - GPS: T_GD on L1, γ·T_GD on L2 with γ = (77/60)² (IS-GPS-200 §20.3.3.3.3.2);
/// - Galileo: BGD(E1,E5b) on E1 (I/NAV), (f_E1/f_E5b)²·BGD(E1,E5b) on E5b,
///   (f_E1/f_E5a)²·BGD(E1,E5a) on E5a (OS SIS ICD §5.1.5);
/// - BeiDou: TGD1 on B1I, TGD2 on B2I, none on B3I, the clock's reference (B1I ICD
///   §5.2.4.10).
///
/// L5 and E6 are given none (the CNAV inter-signal corrections are not in the record).
pub fn group_delay_s(eph: &BroadcastEphemeris, signal: Signal) -> f64 {
    let ratio_sq = |num: f64, den: f64| (num / den) * (num / den);
    let f = multiple_of_10_23_mhz(signal);
    match signal {
        Signal::GpsL1Ca | Signal::GpsL1P => eph.tgd_s,
        Signal::GpsL2 => (77.0f64 / 60.0).powi(2) * eph.tgd_s,
        Signal::GalE1 => eph.tgd_s,
        Signal::GalE5b => ratio_sq(154.0, f) * eph.tgd_s,
        Signal::GalE5a => ratio_sq(154.0, f) * eph.tgd2_s,
        Signal::BdsB1I => eph.tgd_s,
        Signal::BdsB2I => eph.tgd2_s,
        _ => 0.0,
    }
}

/// Carrier frequency of `signal`, Hz.
pub fn frequency_hz(signal: Signal) -> f64 {
    multiple_of_10_23_mhz(signal) * 10.23e6
}

/// Ionospheric delay on `signal` per metre of delay on L1: (f_L1/f)², the first-order
/// dispersion law (common practice).
pub fn iono_scale_from_l1(signal: Signal) -> f64 {
    let r = 154.0 / multiple_of_10_23_mhz(signal);
    r * r
}
