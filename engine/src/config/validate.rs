//! [`Config::validate`]: every field against its documented range, the first one outside
//! named in a typed error.

use super::Config;
use crate::sat::System;
use core::fmt;

/// What is wrong with a field.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum Problem {
    /// NaN or infinite.
    NotFinite,
    /// Outside the documented range.
    OutOfRange {
        /// The value found.
        value: f64,
        /// Lowest allowed.
        min: f64,
        /// Highest allowed.
        max: f64,
    },
    /// A span whose lower end is not below its upper end.
    EmptySpan,
    /// No system is enabled.
    NoSystem,
    /// The signal belongs to another system.
    SignalOfOtherSystem,
    /// A probability other than the built-in table's, in a build without the engine's
    /// `any-probability` feature.
    NotTabulated,
}

/// A configuration the engine refuses: the field (its path in the TOML form, e.g.
/// `snapshot.elevation_mask_deg`) and what is wrong with it.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct ConfigError {
    /// The field.
    pub field: &'static str,
    /// What is wrong.
    pub problem: Problem,
}

impl fmt::Display for ConfigError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: ", self.field)?;
        match self.problem {
            Problem::NotFinite => f.write_str("not a finite number"),
            Problem::OutOfRange { value, min, max } => {
                write!(f, "{value} is outside {min}…{max}")
            }
            Problem::EmptySpan => f.write_str("the lower end is not below the upper end"),
            Problem::NoSystem => f.write_str("no system is enabled"),
            Problem::SignalOfOtherSystem => f.write_str("the signal belongs to another system"),
            Problem::NotTabulated => f.write_str(
                "only the default probability is built in: enable the engine feature `any-probability`",
            ),
        }
    }
}

impl core::error::Error for ConfigError {}

/// `value` within `min..=max`, finite.
fn range(field: &'static str, value: f64, min: f64, max: f64) -> Result<(), ConfigError> {
    let problem = if !value.is_finite() {
        Problem::NotFinite
    } else if !(min..=max).contains(&value) {
        Problem::OutOfRange { value, min, max }
    } else {
        return Ok(());
    };
    Err(ConfigError { field, problem })
}

/// A span (lo, hi) with both ends within `min..=max` and lo < hi.
fn span(field: &'static str, (lo, hi): (f64, f64), min: f64, max: f64) -> Result<(), ConfigError> {
    range(field, lo, min, max)?;
    range(field, hi, min, max)?;
    if lo < hi {
        Ok(())
    } else {
        Err(ConfigError {
            field,
            problem: Problem::EmptySpan,
        })
    }
}

impl Config {
    /// Checks every field against its documented range (see each field's documentation).
    ///
    /// # Errors
    /// The first field found outside its range, by name.
    pub fn validate(&self) -> Result<(), ConfigError> {
        let m = &self.measurements;
        if m.systems.is_empty() {
            return Err(ConfigError {
                field: "measurements.systems",
                problem: Problem::NoSystem,
            });
        }
        for (system, field) in [
            (System::Gps, "measurements.signals.gps"),
            (System::Galileo, "measurements.signals.galileo"),
            (System::Beidou, "measurements.signals.beidou"),
        ] {
            if m.signals.of(system).system() != system {
                return Err(ConfigError {
                    field,
                    problem: Problem::SignalOfOtherSystem,
                });
            }
        }
        range(
            "measurements.cn0_mask_dbhz",
            f64::from(m.cn0_mask_dbhz),
            0.0,
            60.0,
        )?;
        span(
            "measurements.pseudorange_span_m",
            m.pseudorange_span_m,
            1.0,
            1e8,
        )?;
        range(
            "measurements.max_range_rate_mps",
            m.max_range_rate_mps,
            1_000.0,
            20_000.0,
        )?;
        range(
            "nav.max_ephemeris_age_s",
            self.nav.max_ephemeris_age_s,
            60.0,
            86_400.0,
        )?;
        let s = &self.snapshot;
        range(
            "snapshot.elevation_mask_deg",
            s.elevation_mask_deg,
            0.0,
            60.0,
        )?;
        range("snapshot.sigma_floor_m", s.sigma_floor_m, 0.01, 100.0)?;
        range(
            "snapshot.sigma_elevation_m",
            s.sigma_elevation_m,
            0.0,
            100.0,
        )?;
        range(
            "snapshot.cn0_reference_dbhz",
            f64::from(s.cn0_reference_dbhz),
            20.0,
            60.0,
        )?;
        range(
            "snapshot.max_iterations",
            f64::from(s.max_iterations),
            1.0,
            50.0,
        )?;
        range("snapshot.convergence_m", s.convergence_m, 1e-6, 10.0)?;
        span(
            "snapshot.height_span_m",
            s.height_span_m,
            -12_000.0,
            100_000.0,
        )?;
        range(
            "snapshot.altitude_hold_sigma_m",
            s.altitude_hold_sigma_m,
            0.1,
            1_000.0,
        )?;
        range(
            "snapshot.altitude_hold_max_age_s",
            s.altitude_hold_max_age_s,
            0.0,
            86_400.0,
        )?;
        range(
            "snapshot.doppler_sigma_mps",
            s.doppler_sigma_mps,
            0.001,
            10.0,
        )?;
        self.validate_filter()
    }

    fn validate_filter(&self) -> Result<(), ConfigError> {
        use crate::filter::noise::{ACCEL_PSD_RANGE, H0_RANGE, H_MINUS2_RANGE, ISB_PSD_RANGE};
        let f = &self.filter;
        let m = &f.motion;
        let psd = ACCEL_PSD_RANGE;
        range(
            "filter.motion.accel_psd_horizontal",
            m.accel_psd_horizontal,
            psd.0,
            psd.1,
        )?;
        range(
            "filter.motion.accel_psd_vertical",
            m.accel_psd_vertical,
            psd.0,
            psd.1,
        )?;
        range("filter.clock.h0", f.clock.h0, H0_RANGE.0, H0_RANGE.1)?;
        range(
            "filter.clock.h_minus2",
            f.clock.h_minus2,
            H_MINUS2_RANGE.0,
            H_MINUS2_RANGE.1,
        )?;
        range(
            "filter.isb_psd",
            f.isb_psd,
            ISB_PSD_RANGE.0,
            ISB_PSD_RANGE.1,
        )?;
        range("filter.gate", f.gate, 1.0, 1_000.0)?;
        range("filter.ure_sigma_m", f.ure_sigma_m, 0.0, 30.0)?;
        range("filter.max_coast_s", f.max_coast_s, 0.0, 3_600.0)?;
        range("filter.max_gap_s", f.max_gap_s, 1.0, 86_400.0)?;
        range("filter.hold_speed_mps", f.hold_speed_mps, 0.01, 5.0)?;
        range("filter.hold_after_s", f.hold_after_s, 1.0, 600.0)?;
        self.validate_integrity()
    }

    fn validate_integrity(&self) -> Result<(), ConfigError> {
        let i = &self.integrity;
        range("integrity.false_alarm", i.false_alarm, 1e-9, 0.5)?;
        range("integrity.integrity_risk", i.integrity_risk, 1e-9, 0.5)?;
        #[cfg(not(feature = "any-probability"))]
        if !crate::integrity::table::tabulated(i.false_alarm, i.integrity_risk) {
            let field = if crate::integrity::table::tabulated(i.false_alarm, 1e-3) {
                "integrity.integrity_risk"
            } else {
                "integrity.false_alarm"
            };
            return Err(ConfigError {
                field,
                problem: Problem::NotTabulated,
            });
        }
        range(
            "integrity.max_exclusions",
            f64::from(i.max_exclusions),
            0.0,
            2.0,
        )?;
        range(
            "integrity.exclusion_hold_s",
            i.exclusion_hold_s,
            0.0,
            3_600.0,
        )?;
        range(
            "integrity.reflection_margin_db",
            i.reflection_margin_db,
            1.0,
            40.0,
        )?;
        range(
            "integrity.reflection_sigma_factor",
            i.reflection_sigma_factor,
            1.0,
            100.0,
        )?;
        range("integrity.jamming_drop_db", i.jamming_drop_db, 1.0, 40.0)?;
        range("integrity.uniform_cn0_db", i.uniform_cn0_db, 0.0, 10.0)?;
        range("integrity.max_speed_mps", i.max_speed_mps, 1.0, 1_000.0)
    }
}
