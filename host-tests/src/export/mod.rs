//! Track exports in open formats: NMEA 0183 sentences, GPX 1.1, GeoJSON (RFC 7946), CSV,
//! and a JSON summary. Heights are ellipsoidal (WGS-84) everywhere; see docs/exports.md.

pub mod csv;
pub mod geojson;
pub mod gpx;
pub mod json;
pub mod nmea;

use trackfix_engine::{GnssTime, UtcDateTime};

/// GPS − UTC in seconds used for UTC time stamps: 18 s since 2017-01-01 (IERS Bulletin C;
/// CHECKS.md [C: astropy]). Recordings before 2017 need another value.
pub const GPS_MINUS_UTC_S: i32 = 18;

/// UTC of a GPS time.
pub fn utc(t: GnssTime) -> UtcDateTime {
    t.to_utc(GPS_MINUS_UTC_S)
}

/// ISO 8601 UTC time stamp with milliseconds, e.g. `2020-06-25T00:00:00.000Z`.
pub fn iso8601(t: GnssTime) -> String {
    let u = utc(t);
    format!(
        "{:04}-{:02}-{:02}T{:02}:{:02}:{:02}.{:03}Z",
        u.year,
        u.month,
        u.day,
        u.hour,
        u.minute,
        u.second,
        u.nanosecond / 1_000_000
    )
}
