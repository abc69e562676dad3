//! GNSS time: one continuous count of nanoseconds on the GPS time scale.
//!
//! Holding time as an integer count keeps a whole week (and many decades) exact to the
//! nanosecond; an `f64` seconds-of-week would lose ~0.1 ns resolution but, worse, invites
//! mixing weeks. Differences between two times are taken as integers first and only then
//! turned into `f64` seconds, so `t − toe` is exact before the orbit arithmetic sees it.
//!
//! Galileo System Time shares the GPS second count (GST week 0 = GPS week 1024, Galileo OS
//! SIS ICD §5.1.2); BeiDou Time runs 14 s behind GPS time and its week 0 began on
//! 2006-01-01 = GPS week 1356 (BeiDou ICD §5.2.4.1).

/// Nanoseconds in one second.
const NS_PER_S: i64 = 1_000_000_000;
/// Seconds in one week.
pub const SECONDS_PER_WEEK: i64 = 604_800;
/// Half a week, the limit of the `t − toe` crossover correction (IS-GPS-200 §20.3.3.4.3).
pub const HALF_WEEK_S: f64 = 302_400.0;
/// GPS week at which Galileo System Time week 0 starts.
pub const GST_WEEK_OFFSET: u32 = 1024;
/// GPS week at which BeiDou Time week 0 starts.
pub const BDT_WEEK_OFFSET: u32 = 1356;
/// BeiDou Time lags GPS time by this many seconds.
pub const BDT_LAG_S: i64 = 14;
/// Days from 0000-03-01 (proleptic Gregorian) to the GPS epoch 1980-01-06.
const GPS_EPOCH_DAYS: i64 = days_from_civil(1980, 1, 6);

/// An instant on the GPS time scale, in nanoseconds since 1980-01-06 00:00:00 GPST.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct GnssTime {
    ns: i64,
}

/// Why a time could not be built.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum TimeError {
    /// Time of week was negative, not finite, or not below 604,800 s.
    TimeOfWeekOutOfRange,
    /// A calendar field (month, day, hour, minute, second) was out of range.
    CalendarField,
    /// The instant lies outside the ±292-year span the count can hold.
    OutOfSpan,
}

/// A UTC calendar date and time (proleptic Gregorian), nanosecond resolution.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct UtcDateTime {
    /// Year, e.g. 2024.
    pub year: i32,
    /// Month, 1–12.
    pub month: u8,
    /// Day of month, 1–31.
    pub day: u8,
    /// Hour, 0–23.
    pub hour: u8,
    /// Minute, 0–59.
    pub minute: u8,
    /// Second, 0–60 (60 only during a leap second).
    pub second: u8,
    /// Nanoseconds within the second.
    pub nanosecond: u32,
}

/// Wraps a time difference into ±302,400 s, the week-crossover rule of IS-GPS-200
/// §20.3.3.4.3 applied to every `t − toe` and `t − toc`.
pub fn wrap_half_week(dt_s: f64) -> f64 {
    if dt_s > HALF_WEEK_S {
        dt_s - 2.0 * HALF_WEEK_S
    } else if dt_s < -HALF_WEEK_S {
        dt_s + 2.0 * HALF_WEEK_S
    } else {
        dt_s
    }
}

/// Resolves a broadcast 10-bit GPS week number (0–1023) into the full week closest to
/// `near` (a time the receiver already trusts, e.g. its real-time clock or a build date).
#[expect(
    clippy::arithmetic_side_effects,
    reason = "weeks are bounded by the i64 nanosecond span (about ±15,250 weeks)"
)]
pub fn resolve_week_rollover(week_mod_1024: u16, near: GnssTime) -> u32 {
    let near_week = near.week();
    let w10 = i64::from(week_mod_1024 & 0x3ff);
    let base = near_week - near_week.rem_euclid(1024);
    // Three candidates around the reference; pick the closest.
    let mut best = base + w10;
    for cand in [base - 1024 + w10, base + 1024 + w10] {
        if (cand - near_week).abs() < (best - near_week).abs() {
            best = cand;
        }
    }
    u32::try_from(best.max(0)).unwrap_or(0)
}

impl GnssTime {
    /// The GPS epoch, 1980-01-06 00:00:00 GPST.
    pub const EPOCH: GnssTime = GnssTime { ns: 0 };

    /// From a raw count of nanoseconds since the GPS epoch.
    pub const fn from_nanos(ns: i64) -> Self {
        GnssTime { ns }
    }

    /// Nanoseconds since the GPS epoch.
    pub const fn as_nanos(self) -> i64 {
        self.ns
    }

    /// From a GPS week and time of week in seconds.
    ///
    /// # Errors
    /// [`TimeError::TimeOfWeekOutOfRange`] unless `0 ≤ tow_s < 604800`.
    pub fn from_week_tow(week: u32, tow_s: f64) -> Result<Self, TimeError> {
        if !(0.0..SECONDS_PER_WEEK as f64).contains(&tow_s) {
            return Err(TimeError::TimeOfWeekOutOfRange);
        }
        let whole = libm::floor(tow_s);
        // Exact: `whole` < 604800 and the fraction is rounded to the nanosecond.
        let frac_ns = libm::round((tow_s - whole) * 1e9) as i64;
        let secs = i64::from(week)
            .checked_mul(SECONDS_PER_WEEK)
            .and_then(|w| w.checked_add(whole as i64))
            .ok_or(TimeError::OutOfSpan)?;
        secs.checked_mul(NS_PER_S)
            .and_then(|n| n.checked_add(frac_ns))
            .map(GnssTime::from_nanos)
            .ok_or(TimeError::OutOfSpan)
    }

    /// From a Galileo System Time week and time of week.
    ///
    /// # Errors
    /// As [`GnssTime::from_week_tow`].
    pub fn from_gst(gst_week: u32, tow_s: f64) -> Result<Self, TimeError> {
        Self::from_week_tow(gst_week.saturating_add(GST_WEEK_OFFSET), tow_s)
    }

    /// From a BeiDou Time week and time of week.
    ///
    /// # Errors
    /// As [`GnssTime::from_week_tow`].
    pub fn from_bdt(bdt_week: u32, tow_s: f64) -> Result<Self, TimeError> {
        let t = Self::from_week_tow(bdt_week.saturating_add(BDT_WEEK_OFFSET), tow_s)?;
        Ok(t.add_nanos(BDT_LAG_S.saturating_mul(NS_PER_S)))
    }

    /// GPS week number (negative before the GPS epoch).
    pub fn week(self) -> i64 {
        self.ns.div_euclid(NS_PER_S).div_euclid(SECONDS_PER_WEEK)
    }

    /// GPS time of week in seconds, `0 ≤ tow < 604800`.
    pub fn tow_s(self) -> f64 {
        let secs = self.ns.div_euclid(NS_PER_S);
        let sub = self.ns.rem_euclid(NS_PER_S);
        secs.rem_euclid(SECONDS_PER_WEEK) as f64 + sub as f64 * 1e-9
    }

    /// BeiDou week and time of week of this instant.
    pub fn bdt_week_tow(self) -> (i64, f64) {
        let b = self.add_nanos(BDT_LAG_S.saturating_mul(NS_PER_S).saturating_neg());
        (
            b.week().saturating_sub(i64::from(BDT_WEEK_OFFSET)),
            b.tow_s(),
        )
    }

    /// Seconds from `earlier` to `self` (negative if `earlier` is later). The difference is
    /// taken in integer nanoseconds, so it is exact to 1 ns for spans below ~100 days.
    pub fn seconds_since(self, earlier: GnssTime) -> f64 {
        self.ns.saturating_sub(earlier.ns) as f64 * 1e-9
    }

    /// This instant shifted by `dt_s` seconds, rounded to the nanosecond (saturating; a
    /// non-finite shift leaves the time unchanged).
    pub fn add_seconds(self, dt_s: f64) -> GnssTime {
        if !dt_s.is_finite() {
            return self;
        }
        self.add_nanos(libm::round(dt_s * 1e9) as i64)
    }

    fn add_nanos(self, ns: i64) -> GnssTime {
        GnssTime {
            ns: self.ns.saturating_add(ns),
        }
    }

    /// From a UTC calendar time, given GPS − UTC in whole seconds (18 s since 2017-01-01,
    /// from the broadcast UTC parameters or a table the integrator keeps).
    ///
    /// # Errors
    /// [`TimeError::CalendarField`] for an impossible calendar field.
    pub fn from_utc(utc: UtcDateTime, gps_minus_utc_s: i32) -> Result<Self, TimeError> {
        let ok = (1..=12).contains(&utc.month)
            && (1..=days_in_month(utc.year, utc.month)).contains(&utc.day)
            && utc.hour < 24
            && utc.minute < 60
            && utc.second <= 60
            && utc.nanosecond < 1_000_000_000;
        if !ok {
            return Err(TimeError::CalendarField);
        }
        let days = days_from_civil(
            i64::from(utc.year),
            i64::from(utc.month),
            i64::from(utc.day),
        )
        .saturating_sub(GPS_EPOCH_DAYS);
        let secs = days
            .saturating_mul(86_400)
            .saturating_add(i64::from(utc.hour).saturating_mul(3600))
            .saturating_add(i64::from(utc.minute).saturating_mul(60))
            .saturating_add(i64::from(utc.second))
            .saturating_add(i64::from(gps_minus_utc_s));
        secs.checked_mul(NS_PER_S)
            .and_then(|n| n.checked_add(i64::from(utc.nanosecond)))
            .map(GnssTime::from_nanos)
            .ok_or(TimeError::OutOfSpan)
    }

    /// The UTC calendar time of this instant, given GPS − UTC in whole seconds. (An instant
    /// inside a leap second reads as the following second 0.)
    pub fn to_utc(self, gps_minus_utc_s: i32) -> UtcDateTime {
        let ns = self
            .ns
            .saturating_sub(i64::from(gps_minus_utc_s).saturating_mul(NS_PER_S));
        let secs = ns.div_euclid(NS_PER_S);
        let nanosecond = u32::try_from(ns.rem_euclid(NS_PER_S)).unwrap_or(0);
        let days = secs.div_euclid(86_400).saturating_add(GPS_EPOCH_DAYS);
        let sod = secs.rem_euclid(86_400);
        let (year, month, day) = civil_from_days(days);
        UtcDateTime {
            year,
            month,
            day,
            hour: (sod / 3600) as u8,
            minute: (sod % 3600 / 60) as u8,
            second: (sod % 60) as u8,
            nanosecond,
        }
    }
}

fn is_leap(y: i32) -> bool {
    (y % 4 == 0 && y % 100 != 0) || y % 400 == 0
}

fn days_in_month(y: i32, m: u8) -> u8 {
    match m {
        2 if is_leap(y) => 29,
        2 => 28,
        4 | 6 | 9 | 11 => 30,
        _ => 31,
    }
}

/// Days since 0000-03-01 of a proleptic Gregorian date (the "days from civil" algorithm
/// of H. Hinnant, public domain), valid far beyond any GNSS need.
#[expect(
    clippy::arithmetic_side_effects,
    reason = "inputs are calendar-bounded"
)]
const fn days_from_civil(y: i64, m: i64, d: i64) -> i64 {
    let y = if m <= 2 { y - 1 } else { y };
    let era = y.div_euclid(400);
    let yoe = y - era * 400;
    let mp = (m + 9) % 12;
    let doy = (153 * mp + 2) / 5 + d - 1;
    let doe = yoe * 365 + yoe / 4 - yoe / 100 + doy;
    era * 146_097 + doe
}

/// Inverse of [`days_from_civil`].
fn civil_from_days(days: i64) -> (i32, u8, u8) {
    let days = days.clamp(-100_000_000, 100_000_000);
    #[expect(clippy::arithmetic_side_effects, reason = "days clamped above")]
    let (y, m, d) = {
        let era = days.div_euclid(146_097);
        let doe = days - era * 146_097;
        let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
        let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
        let mp = (5 * doy + 2) / 153;
        let d = doy - (153 * mp + 2) / 5 + 1;
        let m = if mp < 10 { mp + 3 } else { mp - 9 };
        let y = yoe + era * 400 + i64::from(m <= 2);
        (y, m, d)
    };
    (y as i32, m as u8, d as u8)
}

#[cfg(test)]
#[path = "time_tests.rs"]
mod tests;
