//! The per-stage parts of [`super::Config`], each with its defaults and documented ranges
//! (the ranges are checked by [`super::Config::validate`]).

use crate::filter::{ClockNoise, MotionProfile};
use crate::sat::{Signal, System};

/// A set of systems, by name.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
pub struct SystemSet {
    /// GPS.
    pub gps: bool,
    /// Galileo.
    pub galileo: bool,
    /// BeiDou.
    pub beidou: bool,
}

impl SystemSet {
    /// Every system.
    pub const ALL: SystemSet = SystemSet {
        gps: true,
        galileo: true,
        beidou: true,
    };

    /// Exactly the listed systems.
    pub fn only(systems: &[System]) -> Self {
        SystemSet {
            gps: systems.contains(&System::Gps),
            galileo: systems.contains(&System::Galileo),
            beidou: systems.contains(&System::Beidou),
        }
    }

    /// Whether `system` is in the set.
    pub const fn contains(&self, system: System) -> bool {
        match system {
            System::Gps => self.gps,
            System::Galileo => self.galileo,
            System::Beidou => self.beidou,
        }
    }

    /// Whether no system is in the set.
    pub const fn is_empty(&self) -> bool {
        !(self.gps || self.galileo || self.beidou)
    }
}

impl Default for SystemSet {
    fn default() -> Self {
        SystemSet::ALL
    }
}

/// The code signal used for each system (single frequency).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
pub struct SystemSignals {
    /// GPS signal. Default L1 C/A.
    pub gps: Signal,
    /// Galileo signal. Default E1.
    pub galileo: Signal,
    /// BeiDou signal. Default B1I.
    pub beidou: Signal,
}

impl SystemSignals {
    /// L1 C/A, E1 and B1I: the signals every tracker-class receiver tracks.
    pub const DEFAULT: SystemSignals = SystemSignals {
        gps: Signal::GpsL1Ca,
        galileo: Signal::GalE1,
        beidou: Signal::BdsB1I,
    };

    /// The signal of `system`.
    pub const fn of(&self, system: System) -> Signal {
        match system {
            System::Gps => self.gps,
            System::Galileo => self.galileo,
            System::Beidou => self.beidou,
        }
    }
}

impl Default for SystemSignals {
    fn default() -> Self {
        SystemSignals::DEFAULT
    }
}

/// Screening of the measurements.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct MeasurementConfig {
    /// Systems the engine uses. Default all three; at least one.
    pub systems: SystemSet,
    /// The code signal used for each system; each must belong to its system.
    pub signals: SystemSignals,
    /// Observations below this C/N0 are not used, dB-Hz. Default 20 (tracking threshold of
    /// a typical mass-market receiver, common practice). Range 0–60.
    pub cn0_mask_dbhz: f32,
    /// Pseudoranges outside this span are bad input, metres. Default 1.5e7–5.0e7 m: the
    /// closest MEO satellite is ≥ 19,000 km away, GEO ≤ 42,000 km, leaving ±0.8e7 m for a
    /// receiver clock offset of up to ±25 ms. Range: 0 < min < max ≤ 1e8 m.
    pub pseudorange_span_m: (f64, f64),
    /// A Doppler whose range rate exceeds this magnitude is refused, m/s. Default 5,000 m/s:
    /// a MEO satellite's line-of-sight rate stays under about 1,000 m/s, a GEO's near zero;
    /// a receiver oscillator off by ±10 ppm adds ±3,000 m/s; an airliner 250 m/s (common
    /// practice). Range 1,000–20,000 m/s.
    pub max_range_rate_mps: f64,
}

impl MeasurementConfig {
    /// The defaults.
    pub const DEFAULT: MeasurementConfig = MeasurementConfig {
        systems: SystemSet::ALL,
        signals: SystemSignals::DEFAULT,
        cn0_mask_dbhz: 20.0,
        pseudorange_span_m: (1.5e7, 5.0e7),
        max_range_rate_mps: 5_000.0,
    };
}

impl Default for MeasurementConfig {
    fn default() -> Self {
        MeasurementConfig::DEFAULT
    }
}

/// The ephemeris store.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct NavConfig {
    /// An ephemeris more than this far from its toe is stale, seconds. Default 7,200 s (half
    /// the 4-hour GPS fit interval of IS-GPS-200 §20.3.4.4 either side of toe). Range
    /// 60–86,400 s.
    pub max_ephemeris_age_s: f64,
}

impl NavConfig {
    /// The defaults.
    pub const DEFAULT: NavConfig = NavConfig {
        max_ephemeris_age_s: 7_200.0,
    };
}

impl Default for NavConfig {
    fn default() -> Self {
        NavConfig::DEFAULT
    }
}

/// Which ionosphere correction a single-frequency measurement takes.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum IonoModel {
    /// No correction.
    Off,
    /// The broadcast (Klobuchar) model, when coefficients are known.
    #[default]
    Broadcast,
}

/// Which troposphere correction the measurements take.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum TropoModel {
    /// No correction.
    Off,
    /// Saastamoinen zenith delays in a standard atmosphere, MOPS mapping.
    #[default]
    StandardAtmosphere,
}

/// Atmospheric corrections.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct CorrectionConfig {
    /// Ionosphere. Default the broadcast model.
    pub ionosphere: IonoModel,
    /// Troposphere. Default the standard atmosphere.
    pub troposphere: TropoModel,
}

impl CorrectionConfig {
    /// The defaults.
    pub const DEFAULT: CorrectionConfig = CorrectionConfig {
        ionosphere: IonoModel::Broadcast,
        troposphere: TropoModel::StandardAtmosphere,
    };
}

impl Default for CorrectionConfig {
    fn default() -> Self {
        CorrectionConfig::DEFAULT
    }
}

/// The snapshot (weighted least-squares) solution.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct SnapshotConfig {
    /// Satellites below this elevation are not used, degrees. Default 10° (common practice:
    /// below it multipath and troposphere errors grow fast). Range 0–60°.
    pub elevation_mask_deg: f64,
    /// Elevation weighting σ = `sigma_floor_m` + `sigma_elevation_m`/sin E, metres. Defaults
    /// 0.3 m + 0.3 m (a textbook model for code on L1). Range: floor 0.01–100 m.
    pub sigma_floor_m: f64,
    /// See `sigma_floor_m`. Range 0–100 m.
    pub sigma_elevation_m: f64,
    /// C/N0 at and above which no C/N0 penalty applies, dB-Hz. Below it σ grows as
    /// √(10^((ref − C/N0)/10)) (code noise variance scales with 1/(C/N0)). Default 40.
    /// Range 20–60.
    pub cn0_reference_dbhz: f32,
    /// Iteration limit. Default 10. Range 1–50.
    pub max_iterations: u8,
    /// Converged when the last position update of length s leaves a linearisation error
    /// s²/(2·19,000 km) below this, metres (for 1 mm: steps under about 190 m). Default
    /// 1e-3 m. Range 1e-6–10 m.
    pub convergence_m: f64,
    /// A fix with an ellipsoidal height outside this span is refused, metres. Default
    /// −1,000…+20,000 m (ground, sea and aircraft up to balloon heights). Range: min < max,
    /// within −12,000…100,000 m.
    pub height_span_m: (f64, f64),
    /// Standard deviation of the altitude constraint of a 2-D fix, metres. Default 5 m.
    /// Range 0.1–1,000 m.
    pub altitude_hold_sigma_m: f64,
    /// How long the last 3-D height stays usable for a 2-D fix, seconds. Default 600 s.
    /// Range 0–86,400 s.
    pub altitude_hold_max_age_s: f64,
    /// Range-rate (Doppler) σ at or above the reference C/N0, m/s; it grows with C/N0 like
    /// the code σ. Default 0.1 m/s (a mass-market receiver's Doppler noise is a few cm/s to
    /// a few dm/s, common practice). Range 0.001–10 m/s.
    pub doppler_sigma_mps: f64,
}

impl SnapshotConfig {
    /// The defaults.
    pub const DEFAULT: SnapshotConfig = SnapshotConfig {
        elevation_mask_deg: 10.0,
        sigma_floor_m: 0.3,
        sigma_elevation_m: 0.3,
        cn0_reference_dbhz: 40.0,
        max_iterations: 10,
        convergence_m: 1e-3,
        height_span_m: (-1_000.0, 20_000.0),
        altitude_hold_sigma_m: 5.0,
        altitude_hold_max_age_s: 600.0,
        doppler_sigma_mps: 0.1,
    };
}

impl Default for SnapshotConfig {
    fn default() -> Self {
        SnapshotConfig::DEFAULT
    }
}

/// Whether the engine runs the navigation filter after the snapshot solution.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum FilterMode {
    /// Every fix is the epoch's own least-squares solution.
    Snapshot,
    /// A Kalman filter carries position, velocity and clock from epoch to epoch, updated
    /// with each epoch's pseudoranges and Dopplers, and predicts through short outages; a
    /// least-squares fix starts it and restarts it. The default.
    #[default]
    Tracking,
}

/// Whether the filter holds the position of a stationary asset.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum HoldMode {
    /// Never: the motion profile alone governs a still asset.
    Off,
    /// Hold once the speed has stayed below the threshold long enough; release as soon as
    /// the Doppler or pseudorange innovations show motion. The default.
    #[default]
    Auto,
}

/// The navigation filter.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct FilterConfig {
    /// Snapshot or tracking. Default tracking.
    pub mode: FilterMode,
    /// Whether a stationary asset's position is held. Default automatic.
    pub hold: HoldMode,
    /// Speed below which the asset counts as still, m/s. Default 0.15 m/s (about three
    /// times the σ of a Doppler velocity from eight satellites at 0.1 m/s each, so an asset
    /// at rest is seen as still). Range 0.01–5 m/s.
    pub hold_speed_mps: f64,
    /// Time the asset must stay below `hold_speed_mps` before its position is held, s.
    /// Default 5 s. Range 1–600 s.
    pub hold_after_s: f64,
    /// Acceleration noise of the platform. Default the road-vehicle profile: an asset
    /// tracker is parked most of the time but must follow the vehicle that moves it.
    pub motion: MotionProfile,
    /// Receiver oscillator. Default a TCXO.
    pub clock: ClockNoise,
    /// Random-walk PSD of each inter-system bias, m²/s. Default 1e-5. Range 1e-12–100.
    pub isb_psd: f64,
    /// A measurement whose normalised innovation squared exceeds this is rejected (χ² with
    /// one degree of freedom). Default 10.83, the 0.999 quantile [C: scipy.stats.chi2.isf
    /// (0.001, 1) = 10.828]. Range 1–1,000.
    pub gate: f64,
    /// σ of the signal-in-space range error (broadcast orbit and clock), m, added to each
    /// pseudorange's variance in the filter. Default 1 m: what host-tests/tests/
    /// precise_orbits.rs measures against IGS precise products (GPS 1.05 m, Galileo 0.91 m).
    /// Range 0–30 m.
    pub ure_sigma_m: f64,
    /// Longest prediction without measurements before the filter gives up and waits for a
    /// fresh fix, s. Default 30 s (a tunnel or an underpass). Range 0–3,600 s.
    pub max_coast_s: f64,
    /// Longest gap between epochs the filter predicts across; after a longer one it starts
    /// again from the next least-squares fix, s. Default 600 s. Range 1–86,400 s.
    pub max_gap_s: f64,
}

impl FilterConfig {
    /// The defaults.
    pub const DEFAULT: FilterConfig = FilterConfig {
        mode: FilterMode::Tracking,
        hold: HoldMode::Auto,
        hold_speed_mps: 0.15,
        hold_after_s: 5.0,
        motion: MotionProfile::ROAD_VEHICLE,
        clock: ClockNoise::TCXO,
        isb_psd: 1e-5,
        gate: 10.83,
        ure_sigma_m: 1.0,
        max_coast_s: 30.0,
        max_gap_s: 600.0,
    };
}

impl Default for FilterConfig {
    fn default() -> Self {
        FilterConfig::DEFAULT
    }
}

/// Integrity: the residual test with fault detection and exclusion, protection levels, the
/// satellites kept out after an exclusion, reflected-signal weighting and the interference
/// and spoofing indicators (docs/integrity.md).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default, deny_unknown_fields))]
#[non_exhaustive]
pub struct IntegrityConfig {
    /// Whether the residual test, exclusion and protection levels run. Default true.
    pub enabled: bool,
    /// False-alarm probability of the residual test per epoch. Default 0.002/30 = 6.667e-5: 0.002
    /// alarms per hour at 30 independent samples per hour (US National Research Council
    /// 1995, Table 1, via ../shared/CHECKS.md). Range 1e-9–0.5.
    pub false_alarm: f64,
    /// Integrity risk: the probability allowed for a fault the test misses to move the fix
    /// beyond its protection level (the missed-detection probability of the slope-based
    /// bound). Default 1e-3 (the detection probability of 0.999 of the same table). Range
    /// 1e-9–0.5: below 1e-9 the non-central χ² search leaves its evaluated span.
    pub integrity_risk: f64,
    /// Satellites excluded one after another in an epoch when the test still fails. Default
    /// 2. Range 0–2.
    pub max_exclusions: u8,
    /// How long an excluded satellite stays out before it is tested again, s. Default 60 s.
    /// Range 0–3,600 s.
    pub exclusion_hold_s: f64,
    /// A satellite whose C/N0 lies this far below what its elevation leads to expect (from
    /// the epoch's other satellites) is taken for a reflection: its σ is multiplied by
    /// `reflection_sigma_factor`. Default 8 dB. Range 1–40 dB.
    pub reflection_margin_db: f64,
    /// σ multiplier of a suspected reflection. Default 4 (1 turns the weighting off). Range
    /// 1–100.
    pub reflection_sigma_factor: f64,
    /// Drop of the mean C/N0 of all satellites below its recent level that raises the
    /// jamming flag, dB. Default 6 dB. Range 1–40 dB.
    pub jamming_drop_db: f64,
    /// Spread of C/N0 across at least six satellites below which the signals look like one
    /// transmitter's (the spoofing flag), dB. Default 1.5 dB. Range 0–10 dB.
    pub uniform_cn0_db: f64,
    /// Top speed of the asset, m/s: a fix farther from the last one than this speed allows
    /// (plus 200 m for the error of the two fixes) raises the inconsistent-motion flag.
    /// Default 100 m/s (360 km/h: beyond any road or rail vehicle; raise it for air
    /// freight). Range 1–1,000 m/s.
    pub max_speed_mps: f64,
}

impl IntegrityConfig {
    /// The defaults.
    pub const DEFAULT: IntegrityConfig = IntegrityConfig {
        enabled: true,
        false_alarm: 0.002 / 30.0,
        integrity_risk: 1e-3,
        max_exclusions: 2,
        exclusion_hold_s: 60.0,
        reflection_margin_db: 8.0,
        reflection_sigma_factor: 4.0,
        jamming_drop_db: 6.0,
        uniform_cn0_db: 1.5,
        max_speed_mps: 100.0,
    };
}

impl Default for IntegrityConfig {
    fn default() -> Self {
        IntegrityConfig::DEFAULT
    }
}
