//! A scenario as plain data, read from TOML (the manifest) with every key checked: an
//! unknown key is an error naming the file, line and key.

use serde::Deserialize;
use trackfix_engine::System;

/// One synthetic scenario.
#[derive(Clone, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct ScenarioSpec {
    /// Seed of every random draw: the same spec and seed give the same epochs, bit for bit.
    #[serde(default = "one")]
    pub seed: u64,
    /// Length, seconds.
    pub duration_s: f64,
    /// Epoch interval, seconds. Default 1.
    #[serde(default = "one_f")]
    pub interval_s: f64,
    /// Start as GPS week and time of week. Default week 2300, 200,000 s.
    #[serde(default = "default_start")]
    pub start: (u32, f64),
    /// Systems transmitting. Default GPS and Galileo.
    #[serde(default = "default_systems")]
    pub systems: Vec<SystemName>,
    /// Start point: latitude °, longitude °, ellipsoidal height m.
    pub origin: [f64; 3],
    /// How the receiver moves.
    #[serde(default)]
    pub motion: Motion,
    /// Sleep/wake cycle of the tracker; absent = always on.
    #[serde(default)]
    pub duty_cycle: Option<DutyCycle>,
    /// Error sources.
    #[serde(default)]
    pub errors: ErrorSpec,
    /// Satellite faults.
    #[serde(default)]
    pub faults: Vec<FaultSpec>,
    /// Total signal outages (tunnels), `[start_s, end_s]` from the scenario start.
    #[serde(default)]
    pub outages: Vec<[f64; 2]>,
    /// How the tracker gets ephemerides.
    #[serde(default)]
    pub ephemeris: EphemerisSource,
    /// Also emit a second-frequency code observation per satellite (GPS L2, Galileo E5a,
    /// BeiDou B2I).
    #[serde(default)]
    pub dual_frequency: bool,
}

fn one() -> u64 {
    1
}
fn one_f() -> f64 {
    1.0
}
fn default_start() -> (u32, f64) {
    (2300, 200_000.0)
}
fn default_systems() -> Vec<SystemName> {
    vec![SystemName::Gps, SystemName::Galileo]
}

/// A system by its name in scenario files.
#[derive(Clone, Copy, Debug, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "lowercase")]
pub enum SystemName {
    /// GPS.
    Gps,
    /// Galileo.
    Galileo,
    /// BeiDou.
    Beidou,
}

impl From<SystemName> for System {
    fn from(s: SystemName) -> System {
        match s {
            SystemName::Gps => System::Gps,
            SystemName::Galileo => System::Galileo,
            SystemName::Beidou => System::Beidou,
        }
    }
}

/// Receiver motion profiles.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "lowercase")]
pub enum Motion {
    /// Not moving.
    #[default]
    Static,
    /// Walking at about 1.4 m/s with pauses and turns.
    Pedestrian,
    /// City delivery truck: up to 50 km/h, stops, right-angle turns.
    Truck,
    /// Container ship at 15 kn with slow course changes; antenna at the origin height.
    Ship,
    /// Freight train: up to 120 km/h, long straights, station stops.
    Train,
}

/// Tracker sleep/wake cycle.
#[derive(Clone, Copy, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct DutyCycle {
    /// Time from one wake-up to the next, s.
    pub period_s: f64,
    /// Time awake per period, s.
    pub awake_s: f64,
    /// Time after wake-up before the receiver reports measurements (re-acquisition), s.
    /// Default 2 s (a hot start of a mass-market receiver, common practice).
    #[serde(default = "two")]
    pub acquisition_s: f64,
}

fn two() -> f64 {
    2.0
}

/// Error sources and their magnitudes. Defaults are the open-sky values noted per field.
#[derive(Clone, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields, default)]
pub struct ErrorSpec {
    /// Code noise σ at 45 dB-Hz, m; scales as 10^((45 − C/N0)/20) (DLL thermal noise goes as
    /// 1/√(C/N0), common practice). Default 0.5 m.
    pub code_sigma_m: f64,
    /// Signal-in-space range error RMS per satellite, m. Default 1.0 m: what
    /// host-tests/tests/precise_orbits.rs measures for GPS on real broadcast data (1.05 m).
    pub sis_rms_m: f64,
    /// True ionosphere = broadcast model × (scale + wander·sin(slow)). Defaults 1.3 and 0.2:
    /// the broadcast model removes roughly half of the delay (common practice).
    pub iono_scale: f64,
    /// See `iono_scale`.
    pub iono_wander: f64,
    /// True troposphere = standard atmosphere × (1 + this). Default 0.05.
    pub tropo_error: f64,
    /// Multipath σ at the horizon, m, falling as exp(−E/20°) with a 15 s correlation time.
    /// Default 0.3 m (open sky).
    pub multipath_m: f64,
    /// Buildings on both sides of the street; absent = open sky.
    pub urban_canyon: Option<Canyon>,
    /// Receiver clock: a TCXO random walk with millisecond steering, or ideal. Default TCXO.
    pub clock: ClockKind,
    /// Satellites below this elevation are not tracked, °. Default 5.
    pub horizon_deg: f64,
    /// Doppler noise σ at 45 dB-Hz as a range rate, m/s, scaling with C/N0 like the code
    /// noise. Default 0.05 m/s (a mass-market receiver's Doppler is good to a few cm/s in
    /// open sky, common practice).
    pub doppler_sigma_mps: f64,
}

impl Default for ErrorSpec {
    fn default() -> Self {
        ErrorSpec {
            code_sigma_m: 0.5,
            sis_rms_m: 1.0,
            iono_scale: 1.3,
            iono_wander: 0.2,
            tropo_error: 0.05,
            multipath_m: 0.3,
            urban_canyon: None,
            clock: ClockKind::Tcxo,
            horizon_deg: 5.0,
            doppler_sigma_mps: 0.05,
        }
    }
}

/// Receiver clock models.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "lowercase")]
pub enum ClockKind {
    /// Temperature-compensated crystal: bias and drift random walks (h0 = 2e-19,
    /// h−2 = 2e-20, typical TCXO Allan coefficients [from memory]), steered back by whole
    /// milliseconds when the bias passes ±0.5 ms, as many receivers do.
    #[default]
    Tcxo,
    /// No clock error at all.
    Ideal,
}

/// A street canyon: elevation mask high across the street, low along it.
#[derive(Clone, Copy, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct Canyon {
    /// Mask elevation across the street (building tops), °.
    pub across_deg: f64,
    /// Mask elevation along the street, °.
    pub along_deg: f64,
    /// Share of masked satellites still received by reflection (NLOS), 0–1.
    pub nlos_share: f64,
    /// NLOS extra path is drawn uniformly from 5 m to this, m.
    pub nlos_max_m: f64,
}

/// A satellite fault.
#[derive(Clone, Debug, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct FaultSpec {
    /// Satellite as in RINEX, e.g. "G07".
    pub sat: String,
    /// Seconds from the scenario start.
    pub start_s: f64,
    /// A clock step of this many metres at `start_s`.
    #[serde(default)]
    pub step_m: f64,
    /// A clock ramp of this many metres per second from `start_s`.
    #[serde(default)]
    pub ramp_mps: f64,
}

/// Where ephemerides come from.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "lowercase")]
pub enum EphemerisSource {
    /// Downloaded over the network: every set is available from its broadcast time.
    #[default]
    Downloaded,
    /// Decoded from the sky: a set is available only after 30 s of continuous tracking after
    /// its broadcast time (one LNAV subframe 1–3 cycle, IS-GPS-200).
    Decoded,
}
