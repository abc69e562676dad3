//! NMEA 0183 sentences: GGA, RMC, GSA and GST with correct checksums.
//!
//! Layout per the NMEA 0183 sentence definitions (widely published; the examples in
//! CHECKS.md are reproduced by the tests). Talker `GN` (several systems). The GGA altitude
//! field carries the ellipsoidal height with a geoid separation of 0.0, so that their sum is
//! the WGS-84 height the engine computed (the engine has no geoid model).

use crate::export::utc;
use crate::record::EpochRecord;
use std::fmt::Write as _;
use trackfix_engine::{FixKind, SatStatus, System};

/// The XOR checksum of the characters between `$` and `*`.
pub fn checksum(body: &str) -> u8 {
    body.bytes().fold(0, |a, b| a ^ b)
}

/// A complete sentence from its body (without `$`, `*` or checksum).
pub fn sentence(body: &str) -> String {
    format!("${body}*{:02X}", checksum(body))
}

/// Formatting choices (published examples use fewer decimals than a modern receiver).
#[derive(Clone, Copy, Debug)]
pub struct Style {
    /// Talker identifier, e.g. "GN" or "GP".
    pub talker: &'static str,
    /// Decimals of the seconds in time fields.
    pub time_decimals: usize,
    /// Decimals of the minutes in latitude/longitude.
    pub minute_decimals: usize,
}

impl Default for Style {
    fn default() -> Self {
        Style {
            talker: "GN",
            time_decimals: 2,
            minute_decimals: 5,
        }
    }
}

/// `hhmmss.ss` UTC. The seconds are truncated to `decimals` places, never rounded up:
/// rounding 59.996 s to two places would print the impossible `60.00`.
pub fn time_field(h: u8, m: u8, s: f64, decimals: usize) -> String {
    let width = if decimals > 0 { 3 + decimals } else { 2 };
    let scale = 10f64.powi(i32::try_from(decimals).unwrap_or(0));
    // A nanosecond of slack keeps 12.34 s, stored as 12.3399999…, at 12.34.
    let s = ((s * scale) + 1e-9 * scale).floor() / scale;
    format!("{h:02}{m:02}{s:0width$.decimals$}")
}

/// `ddmm.mmm,N` or `dddmm.mmm,E` from degrees.
pub fn angle_field(deg: f64, lat: bool, decimals: usize) -> String {
    let hemi = match (lat, deg >= 0.0) {
        (true, true) => 'N',
        (true, false) => 'S',
        (false, true) => 'E',
        (false, false) => 'W',
    };
    let a = deg.abs();
    let mut d = a.floor();
    let mut m = (a - d) * 60.0;
    // Rounding the minutes to 60.000 carries into the degrees.
    if format!("{m:.decimals$}").starts_with("60") {
        d += 1.0;
        m = 0.0;
    }
    let dw = if lat { 2 } else { 3 };
    let mw = 3 + decimals;
    format!("{:0dw$}{m:0mw$.decimals$},{hemi}", d as u32)
}

/// GGA: time, position, fix quality, satellites, HDOP, altitude.
#[expect(clippy::too_many_arguments, reason = "one argument per sentence field")]
pub fn gga(
    style: &Style,
    hms: (u8, u8, f64),
    lat: f64,
    lon: f64,
    quality: u8,
    sats: u8,
    hdop: f64,
    alt_m: f64,
    sep_m: f64,
) -> String {
    sentence(&format!(
        "{}GGA,{},{},{},{quality},{sats:02},{hdop:.1},{alt_m:.1},M,{sep_m:.1},M,,",
        style.talker,
        time_field(hms.0, hms.1, hms.2, style.time_decimals),
        angle_field(lat, true, style.minute_decimals),
        angle_field(lon, false, style.minute_decimals),
    ))
}

/// GSA: mode, fix type, up to 12 satellite ids, PDOP, HDOP, VDOP.
pub fn gsa(style: &Style, fix_type: u8, ids: &[u8], pdop: f64, hdop: f64, vdop: f64) -> String {
    let mut slots: Vec<String> = ids.iter().take(12).map(|i| format!("{i:02}")).collect();
    slots.resize(12, String::new());
    sentence(&format!(
        "{}GSA,A,{fix_type},{},{pdop:.1},{hdop:.1},{vdop:.1}",
        style.talker,
        slots.join(",")
    ))
}

/// GST: RMS of residuals, error ellipse (semi-major, semi-minor σ, orientation from true
/// north), σ latitude, σ longitude, σ altitude.
#[expect(clippy::too_many_arguments, reason = "one argument per sentence field")]
pub fn gst(
    style: &Style,
    hms: (u8, u8, f64),
    rms: f64,
    major: f64,
    minor: f64,
    orient_deg: f64,
    s_lat: f64,
    s_lon: f64,
    s_alt: f64,
    decimals: usize,
) -> String {
    let d = decimals;
    sentence(&format!(
        "{}GST,{},{rms:.d$},{major:.d$},{minor:.d$},{orient_deg:.1},{s_lat:.d$},{s_lon:.d$},{s_alt:.d$}",
        style.talker,
        time_field(hms.0, hms.1, hms.2, style.time_decimals),
    ))
}

/// RMC: time, status, position, speed (knots), course (°), date.
#[expect(clippy::too_many_arguments, reason = "one argument per sentence field")]
pub fn rmc(
    style: &Style,
    hms: (u8, u8, f64),
    valid: bool,
    lat: f64,
    lon: f64,
    knots: f64,
    course: f64,
    dmy: (u8, u8, u16),
) -> String {
    sentence(&format!(
        "{}RMC,{},{},{},{},{knots:.1},{course:.1},{:02}{:02}{:02},,,{}",
        style.talker,
        time_field(hms.0, hms.1, hms.2, style.time_decimals),
        if valid { 'A' } else { 'V' },
        angle_field(lat, true, style.minute_decimals),
        angle_field(lon, false, style.minute_decimals),
        dmy.0,
        dmy.1,
        dmy.2 % 100,
        if valid { 'A' } else { 'N' },
    ))
}

/// The NMEA id of a satellite in GSA: GPS 1–32, Galileo 301–336 style ids do not fit two
/// digits, so GSA lists GPS PRNs only when several systems are used (common practice of
/// multi-GNSS receivers is one GSA per system; we emit the GPS one).
fn gsa_ids(r: &EpochRecord) -> Vec<u8> {
    r.sats
        .iter()
        .filter(|s| s.status == SatStatus::Used && s.sat.system == System::Gps)
        .map(|s| s.sat.prn)
        .collect()
}

/// Error ellipse (semi-major, semi-minor, orientation ° from north) of a 2×2 east/north
/// covariance given as σe, σn (uncorrelated: the summary keeps diagonal σ only).
fn ellipse(se: f64, sn: f64) -> (f64, f64, f64) {
    if se > sn {
        (se, sn, 90.0)
    } else {
        (sn, se, 0.0)
    }
}

/// GGA, RMC, GSA and GST for every epoch of a run (RMC with status V and GGA quality 0
/// when there is no fix). Speed and course come from consecutive fixes.
pub fn write_run(records: &[EpochRecord]) -> String {
    let style = Style::default();
    let mut out = String::new();
    let mut prev: Option<&EpochRecord> = None;
    for r in records {
        let u = utc(r.time);
        let hms = (
            u.hour,
            u.minute,
            f64::from(u.second) + f64::from(u.nanosecond) * 1e-9,
        );
        let dmy = (u.day, u.month, u.year as u16);
        match r.fix {
            Some(f) => {
                let [lat, lon, h] = f.lat_lon_h;
                // Quality 1: autonomous GNSS fix.
                let _ = writeln!(
                    out,
                    "{}",
                    gga(&style, hms, lat, lon, 1, f.used, f.hdop, h, 0.0)
                );
                let (mut knots, mut course) = (0.0, 0.0);
                if let Some((p, pf)) = prev.and_then(|p| p.fix.map(|pf| (p, pf))) {
                    let dt = r.time.seconds_since(p.time);
                    if dt > 0.0 {
                        let fr = trackfix_engine::LocalFrame::at_ecef(pf.ecef_m);
                        let d = fr.enu(f.ecef_m);
                        knots = d[0].hypot(d[1]) / dt * 3600.0 / 1852.0;
                        course = d[0].atan2(d[1]).to_degrees().rem_euclid(360.0);
                    }
                }
                let _ = writeln!(
                    out,
                    "{}",
                    rmc(&style, hms, true, lat, lon, knots, course, dmy)
                );
                let fix_type = if f.kind == FixKind::ThreeD { 3 } else { 2 };
                let _ = writeln!(
                    out,
                    "{}",
                    gsa(&style, fix_type, &gsa_ids(r), f.pdop, f.hdop, f.vdop)
                );
                let [se, sn, su] = f.sigma_enu_m;
                let (ma, mi, or) = ellipse(se, sn);
                let _ = writeln!(
                    out,
                    "{}",
                    gst(&style, hms, f.residual_rms_m, ma, mi, or, sn, se, su, 2)
                );
            }
            None => {
                let _ = writeln!(
                    out,
                    "{}",
                    sentence(&format!(
                        "GNGGA,{},,,,,0,00,,,M,,M,,",
                        time_field(hms.0, hms.1, hms.2, 2)
                    ))
                );
                let _ = writeln!(
                    out,
                    "{}",
                    sentence(&format!(
                        "GNRMC,{},V,,,,,,,{:02}{:02}{:02},,,N",
                        time_field(hms.0, hms.1, hms.2, 2),
                        dmy.0,
                        dmy.1,
                        dmy.2 % 100
                    ))
                );
            }
        }
        prev = Some(r);
    }
    out
}
