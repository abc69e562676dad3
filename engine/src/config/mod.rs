//! Every tunable of the engine, as plain data with documented defaults, one part per stage
//! ([`MeasurementConfig`], [`NavConfig`], [`CorrectionConfig`], [`SnapshotConfig`],
//! [`FilterConfig`], [`IntegrityConfig`]).
//! [`Config::validate`] names the first field outside its documented range; the engine
//! refuses such a configuration. With the `serde` feature every part reads from and writes
//! to TOML (or any serde format) with its defaults for missing keys and an error for
//! unknown ones, so the command line and the tuning tool load exactly this struct.

mod stages;
mod validate;

pub use stages::IntegrityConfig;
pub use stages::{
    CorrectionConfig, FilterConfig, FilterMode, HoldMode, IonoModel, MeasurementConfig, NavConfig,
    SnapshotConfig, SystemSet, SystemSignals, TropoModel,
};
pub use validate::{ConfigError, Problem};

use crate::sat::{Signal, System};

/// Engine configuration: one part per pipeline stage. Build it from [`Config::default`]
/// and change what you need; the tuning tool edits exactly this struct.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct Config {
    /// Which measurements are taken and which are screened out.
    pub measurements: MeasurementConfig,
    /// The ephemeris store.
    pub nav: NavConfig,
    /// Atmospheric corrections.
    pub corrections: CorrectionConfig,
    /// The snapshot (least-squares) solution.
    pub snapshot: SnapshotConfig,
    /// The navigation filter.
    pub filter: FilterConfig,
    /// Integrity: fault detection and exclusion, protection levels, indicators.
    pub integrity: IntegrityConfig,
}

impl Config {
    /// The defaults, usable in `const` context (a generic asset tracker: every system on,
    /// the signals every tracker-class receiver tracks, broadcast ionosphere, standard
    /// troposphere, 10° mask).
    pub const DEFAULT: Config = Config {
        measurements: MeasurementConfig::DEFAULT,
        nav: NavConfig::DEFAULT,
        corrections: CorrectionConfig::DEFAULT,
        snapshot: SnapshotConfig::DEFAULT,
        filter: FilterConfig::DEFAULT,
        integrity: IntegrityConfig::DEFAULT,
    };

    /// Whether `system` is enabled.
    pub fn uses(&self, system: System) -> bool {
        self.measurements.systems.contains(system)
    }

    /// The signal configured for `system`.
    pub fn signal(&self, system: System) -> Signal {
        self.measurements.signals.of(system)
    }

    /// This configuration with only `systems` enabled.
    #[must_use]
    pub fn with_systems(mut self, systems: &[System]) -> Self {
        self.measurements.systems = SystemSet::only(systems);
        self
    }
}

impl Default for Config {
    fn default() -> Self {
        Config::DEFAULT
    }
}

#[cfg(test)]
#[path = "tests.rs"]
mod tests;
