//! Human-readable text for every error and refusal the engine returns (`Display`), and
//! `core::error::Error` so callers can box, chain or report them like any other error.
//! The wording names what was wrong, for logs and the command line.

use crate::engine::{EpochError, InputError};
use crate::nav::ephemeris::EphemerisError;
use crate::solution::NoFixReason;
use crate::time::TimeError;
use crate::wire::WireError;
use core::fmt;

impl fmt::Display for TimeError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            TimeError::TimeOfWeekOutOfRange => {
                f.write_str("time of week not finite or outside 0 ≤ tow < 604800 s")
            }
            TimeError::CalendarField => f.write_str("calendar field out of range"),
            TimeError::OutOfSpan => f.write_str("instant outside the ±292-year span of the count"),
        }
    }
}

impl fmt::Display for EphemerisError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            EphemerisError::NotFinite => f.write_str("ephemeris field is NaN or infinite"),
            EphemerisError::Eccentricity => f.write_str("eccentricity outside 0 ≤ e < 0.3"),
            EphemerisError::SemiMajorAxis => f.write_str("√A outside 4000–7000 √m"),
            EphemerisError::TimeOfWeek => f.write_str("toe or toc outside the week"),
            EphemerisError::IssueMismatch => f.write_str("IODC's low 8 bits differ from IODE"),
            EphemerisError::Prn => f.write_str("PRN zero or above the system's range"),
            EphemerisError::Week => f.write_str("week number cannot be placed on the time line"),
            EphemerisError::StoreFull(e) => write!(
                f,
                "ephemeris store full of newer records; {}{:02} handed back",
                e.sat.system.rinex_letter(),
                e.sat.prn
            ),
        }
    }
}

impl fmt::Display for EpochError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            EpochError::TimeNotIncreasing { previous, got } => write!(
                f,
                "epoch time {} ns is not after the previous epoch's {} ns",
                got.as_nanos(),
                previous.as_nanos()
            ),
        }
    }
}

impl fmt::Display for InputError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            InputError::NotFinite => f.write_str("a value is NaN or infinite"),
            InputError::HeightOutOfSpan { height_m } => {
                write!(f, "height {height_m} m outside the configured span")
            }
        }
    }
}

impl fmt::Display for WireError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            WireError::BadCrc => f.write_str("frame CRC mismatch"),
            WireError::Oversize { declared } => {
                write!(f, "declared payload of {declared} B exceeds the buffer")
            }
            WireError::UnsupportedVersion(v) => write!(f, "unsupported frame version {v}"),
            WireError::UnknownKind(k) => write!(f, "unknown frame kind {k}"),
            WireError::PayloadLength => f.write_str("payload length does not fit its kind"),
            WireError::TooManyObservations(n) => {
                write!(f, "{n} observations exceed the epoch capacity")
            }
            WireError::UnknownSystem(s) => write!(f, "unknown system code {s}"),
            WireError::UnknownSignal(s) => write!(f, "unknown signal code {s}"),
            WireError::BufferTooSmall => f.write_str("destination buffer too small"),
        }
    }
}

impl fmt::Display for NoFixReason {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            NoFixReason::TooFewSatellites { usable, needed } => write!(
                f,
                "{usable} usable satellites, {needed} needed (3 position + 1 clock per system)"
            ),
            NoFixReason::SingularGeometry => f.write_str("singular geometry"),
            NoFixReason::NoConvergence => f.write_str("least squares did not converge"),
            NoFixReason::ImplausiblePosition => {
                f.write_str("solution outside the configured height span")
            }
        }
    }
}

impl core::error::Error for TimeError {}
impl core::error::Error for EphemerisError {}
impl core::error::Error for EpochError {}
impl core::error::Error for WireError {}
impl core::error::Error for InputError {}
impl core::error::Error for NoFixReason {}

#[cfg(test)]
#[path = "errors_tests.rs"]
mod tests;
