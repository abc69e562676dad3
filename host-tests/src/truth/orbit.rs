//! Satellite position from broadcast elements, written from IS-GPS-200 Table 20-IV, the
//! Galileo OS SIS ICD §5.1.1 and the BeiDou B1I ICD §5.2.4.12, apart from the engine's
//! implementation (see the module above).

use trackfix_engine::{BroadcastEphemeris, GnssTime, System};

const WEEK_S: i64 = 604_800;
const NS: i64 = 1_000_000_000;

/// GPS week of Galileo week 0 (Galileo OS SIS ICD §5.1.2: GST starts 1999-08-22, GPS week
/// 1024 [M]).
const GST_WEEK0_IN_GPS: i64 = 1_024;
/// GPS week of BeiDou week 0 (BDT starts 2006-01-01 00:00:00 UTC, B1I ICD §5.1.2 [M]):
/// 2006-01-01 is GPS week 1356 (CHECKS.md).
const BDT_WEEK0_IN_GPS: i64 = 1_356;
/// GPS time − BDT, s (B1I ICD: BDT is 14 s behind GPS time, the leap seconds between 1980
/// and 2006 [M; CHECKS.md]).
const GPS_MINUS_BDT_S: i64 = 14;

/// (μ m³/s², Ω̇e rad/s) of a system's user algorithm: IS-GPS-200 Table 20-IV; Galileo OS SIS
/// ICD §5.1.1; BeiDou B1I ICD §5.2.4.12 (CHECKS.md).
fn constants(system: System) -> (f64, f64) {
    match system {
        System::Gps => (3.986_005e14, 7.292_115_146_7e-5),
        System::Galileo => (3.986_004_418e14, 7.292_115_146_7e-5),
        System::Beidou => (3.986_004_418e14, 7.292_115e-5),
    }
}

/// BeiDou GEO satellites: PRN 1–5 and 59–63 (B1I ICD PRN allocation [M]).
fn is_geo(eph: &BroadcastEphemeris) -> bool {
    eph.sat.system == System::Beidou && !(6..=58).contains(&eph.sat.prn)
}

/// `t` moved by `dt_s` seconds.
pub fn shift(t: GnssTime, dt_s: f64) -> GnssTime {
    GnssTime::from_nanos(t.as_nanos() + (dt_s * 1e9).round() as i64)
}

/// Nanoseconds on the GPS scale of `tow_s` in `week` of `system`'s own scale.
fn system_instant_ns(system: System, week: u32, tow_s: f64) -> i64 {
    let week = i64::from(week);
    let (gps_week, offset_s) = match system {
        System::Gps => (week, 0),
        // Galileo weeks as RINEX writes them are already GPS-aligned; a raw GST week
        // (below 1024) is moved by the GST week offset.
        System::Galileo if week < GST_WEEK0_IN_GPS => (week + GST_WEEK0_IN_GPS, 0),
        System::Galileo => (week, 0),
        System::Beidou => (week + BDT_WEEK0_IN_GPS, GPS_MINUS_BDT_S),
    };
    (gps_week * WEEK_S + offset_s) * NS + (tow_s * 1e9).round() as i64
}

/// Seconds from the reference time `tow_s` (toe or toc, in `eph.week`) to `t`, taken in the
/// half week around it (IS-GPS-200 §20.3.3.4.3: "tk shall be the actual total time
/// difference … accounting for beginning or end of week crossovers").
pub fn since_reference(eph: &BroadcastEphemeris, tow_s: f64, t: GnssTime) -> f64 {
    let reference = system_instant_ns(eph.sat.system, eph.week, tow_s);
    let mut dt = (t.as_nanos() - reference) as f64 * 1e-9;
    let week = WEEK_S as f64;
    if dt > week / 2.0 {
        dt -= week;
    } else if dt < -week / 2.0 {
        dt += week;
    }
    dt
}

/// Solves M = E − e·sin E by fixed-point iteration E ← M + e·sin E (converges for e < 1;
/// 40 passes take e = 0.3 below 1e-16 rad).
fn eccentric_anomaly(m: f64, e: f64) -> f64 {
    let mut ek = m;
    for _ in 0..60 {
        let next = m + e * ek.sin();
        if (next - ek).abs() < 1e-15 {
            return next;
        }
        ek = next;
    }
    ek
}

/// The satellite's position at GPS-scale time `t`, in the Earth-fixed frame of that
/// instant, m.
pub fn position(eph: &BroadcastEphemeris, t: GnssTime) -> [f64; 3] {
    let (mu, we) = constants(eph.sat.system);
    let tk = since_reference(eph, eph.toe_s, t);
    let a = eph.sqrt_a.powi(2);
    let n = (mu / a.powi(3)).sqrt() + eph.delta_n;
    let ek = eccentric_anomaly(eph.m0 + n * tk, eph.e);
    let nu = ((1.0 - eph.e * eph.e).sqrt() * ek.sin()).atan2(ek.cos() - eph.e);
    let phi = nu + eph.omega;
    let (s2, c2) = ((2.0 * phi).sin(), (2.0 * phi).cos());
    let u = phi + eph.cus * s2 + eph.cuc * c2;
    let r = a * (1.0 - eph.e * ek.cos()) + eph.crs * s2 + eph.crc * c2;
    let i = eph.i0 + eph.cis * s2 + eph.cic * c2 + eph.idot * tk;
    let (x, y) = (r * u.cos(), r * u.sin());
    let geo = is_geo(eph);
    let node = if geo {
        eph.omega0 + eph.omega_dot * tk - we * eph.toe_s
    } else {
        eph.omega0 + (eph.omega_dot - we) * tk - we * eph.toe_s
    };
    let p = [
        x * node.cos() - y * i.cos() * node.sin(),
        x * node.sin() + y * i.cos() * node.cos(),
        y * i.sin(),
    ];
    if geo {
        let tilt = (-5.0f64).to_radians();
        let rx = [
            [1.0, 0.0, 0.0],
            [0.0, tilt.cos(), tilt.sin()],
            [0.0, -tilt.sin(), tilt.cos()],
        ];
        let z = we * tk;
        let rz = [
            [z.cos(), z.sin(), 0.0],
            [-z.sin(), z.cos(), 0.0],
            [0.0, 0.0, 1.0],
        ];
        mat_vec(&rz, mat_vec(&rx, p))
    } else {
        p
    }
}

fn mat_vec(m: &[[f64; 3]; 3], v: [f64; 3]) -> [f64; 3] {
    m.map(|row| row[0] * v[0] + row[1] * v[1] + row[2] * v[2])
}
