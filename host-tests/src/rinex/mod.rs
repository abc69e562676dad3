//! Streaming readers for RINEX 2.11 and 3.x/4.00 observation files and RINEX 2.11/3.x
//! navigation files (the open exchange format of the IGS and RTCM), read line by line
//! with bounded memory.

mod nav;
mod obs;

pub use nav::{NavFile, NavRecord};
pub use obs::{ObsEpoch, ObsHeader, ObsReader, ObsValue, SatObs};

use std::fmt;
use std::path::{Path, PathBuf};

/// A reading problem, naming the file, the line and what was wrong.
#[derive(Debug)]
pub struct RinexError {
    /// The file.
    pub file: PathBuf,
    /// 1-based line number (0 when the file could not be opened).
    pub line: usize,
    /// What was wrong.
    pub what: String,
}

impl fmt::Display for RinexError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}:{}: {}", self.file.display(), self.line, self.what)
    }
}

impl std::error::Error for RinexError {}

impl RinexError {
    pub(crate) fn new(file: &Path, line: usize, what: impl Into<String>) -> Self {
        RinexError {
            file: file.to_path_buf(),
            line,
            what: what.into(),
        }
    }
}

/// The columns `from..to` of a line (clipped to its length; RINEX lines may be short).
pub(crate) fn cols(line: &str, from: usize, to: usize) -> &str {
    let to = to.min(line.len());
    line.get(from.min(to)..to).unwrap_or("")
}

/// A Fortran-style float field (`D` or `E` exponent); blank reads as `None`.
pub(crate) fn float_field(s: &str) -> Result<Option<f64>, String> {
    let t = s.trim();
    if t.is_empty() {
        return Ok(None);
    }
    t.replace(['D', 'd'], "E")
        .parse::<f64>()
        .map(Some)
        .map_err(|_| format!("not a number: {t:?}"))
}

/// An integer field; blank reads as `None`.
pub(crate) fn int_field(s: &str) -> Result<Option<i64>, String> {
    let t = s.trim();
    if t.is_empty() {
        return Ok(None);
    }
    t.parse::<i64>()
        .map(Some)
        .map_err(|_| format!("not an integer: {t:?}"))
}

/// The RINEX major version and file type letter from the first header line.
pub(crate) fn version_line(line: &str) -> Option<(f64, char)> {
    if !line.get(60..)?.starts_with("RINEX VERSION / TYPE") {
        return None;
    }
    let v = cols(line, 0, 9).trim().parse::<f64>().ok()?;
    let t = cols(line, 20, 21).chars().next()?;
    Some((v, t))
}

/// A calendar epoch from its parts (GPS time scale, as RINEX observation files use).
pub(crate) fn gps_time(
    y: i64,
    mo: i64,
    d: i64,
    h: i64,
    mi: i64,
    sec: f64,
) -> Option<trackfix_engine::GnssTime> {
    let y = if y < 80 {
        y + 2000
    } else if y < 100 {
        y + 1900
    } else {
        y
    };
    let whole = sec.floor();
    let utc = trackfix_engine::UtcDateTime {
        year: i32::try_from(y).ok()?,
        month: u8::try_from(mo).ok()?,
        day: u8::try_from(d).ok()?,
        hour: u8::try_from(h).ok()?,
        minute: u8::try_from(mi).ok()?,
        second: u8::try_from(whole as i64).ok()?,
        nanosecond: ((sec - whole) * 1e9).round() as u32,
    };
    // GPS calendar time: no leap seconds between the calendar and the count.
    trackfix_engine::GnssTime::from_utc(utc, 0).ok()
}

#[cfg(test)]
mod tests;
