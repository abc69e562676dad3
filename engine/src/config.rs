//! Every tunable of the engine, as plain data with documented defaults.

use crate::sat::{Signal, System};

/// Engine configuration. Build it with [`Config::default`] and change the fields you need;
/// the tuning tool edits exactly this struct.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default))]
#[non_exhaustive]
pub struct Config {
    /// Satellites below this elevation are not used. Default 10° (common practice: below
    /// it multipath and troposphere errors grow fast).
    pub elevation_mask_deg: f64,
    /// Systems the engine uses, in order GPS, Galileo, BeiDou. Default all three.
    pub systems: [bool; 3],
    /// The code signal used for each system (single frequency). Defaults: GPS L1 C/A,
    /// Galileo E1, BeiDou B1I: the signals every tracker-class receiver tracks.
    pub signals: [Signal; 3],
    /// Elevation weighting σ = `sigma_floor_m` + `sigma_elevation_m`/sin E, metres.
    /// Defaults 0.3 m + 0.3 m (a textbook model for code on L1).
    pub sigma_floor_m: f64,
    /// See `sigma_floor_m`.
    pub sigma_elevation_m: f64,
    /// C/N0 at and above which no C/N0 penalty applies, dB-Hz. Below it σ grows as
    /// √(10^((ref − C/N0)/10)) (code noise variance scales with 1/(C/N0)). Default 40.
    pub cn0_reference_dbhz: f32,
    /// Observations below this C/N0 are not used, dB-Hz. Default 20 (tracking threshold of
    /// a typical mass-market receiver).
    pub cn0_mask_dbhz: f32,
    /// Apply the broadcast ionosphere model when coefficients are known. Default true.
    pub ionosphere: bool,
    /// Apply the standard-atmosphere troposphere model. Default true.
    pub troposphere: bool,
    /// An ephemeris more than this far from its toe is stale, seconds. Default 7,200 s
    /// (half the 4-hour GPS fit interval of IS-GPS-200 §20.3.4.4 either side of toe).
    pub max_ephemeris_age_s: f64,
    /// Pseudoranges outside this span are bad input, metres. Default 1.5e7–5.0e7 m: the
    /// closest MEO satellite is ≥ 19,000 km away, GEO ≤ 42,000 km, leaving ±0.8e7 m for a
    /// receiver clock offset of up to ±25 ms.
    pub pseudorange_span_m: (f64, f64),
    /// Iteration limit of the least-squares solution. Default 10.
    pub max_iterations: u8,
    /// The solution has converged when the last position update of length s leaves a
    /// linearisation error s²/(2·19,000 km) below this, metres (for 1 mm: steps under
    /// about 190 m). Default 1e-3 m.
    pub convergence_m: f64,
    /// A fix with an ellipsoidal height outside this span is refused, metres. Default
    /// −1,000…+20,000 m (ground, sea and aircraft up to balloon heights).
    pub height_span_m: (f64, f64),
    /// Standard deviation of the altitude constraint of a 2-D fix, metres. Default 5 m.
    pub altitude_hold_sigma_m: f64,
    /// How long the last 3-D height stays usable for a 2-D fix, seconds. Default 600 s.
    pub altitude_hold_max_age_s: f64,
}

impl Default for Config {
    fn default() -> Self {
        Config {
            elevation_mask_deg: 10.0,
            systems: [true; 3],
            signals: [Signal::GpsL1Ca, Signal::GalE1, Signal::BdsB1I],
            sigma_floor_m: 0.3,
            sigma_elevation_m: 0.3,
            cn0_reference_dbhz: 40.0,
            cn0_mask_dbhz: 20.0,
            ionosphere: true,
            troposphere: true,
            max_ephemeris_age_s: 7_200.0,
            pseudorange_span_m: (1.5e7, 5.0e7),
            max_iterations: 10,
            convergence_m: 1e-3,
            height_span_m: (-1_000.0, 20_000.0),
            altitude_hold_sigma_m: 5.0,
            altitude_hold_max_age_s: 600.0,
        }
    }
}

impl Config {
    /// Whether `system` is enabled.
    pub fn uses(&self, system: System) -> bool {
        self.systems.get(system.index()).copied().unwrap_or(false)
    }

    /// The signal configured for `system`.
    pub fn signal(&self, system: System) -> Option<Signal> {
        self.signals.get(system.index()).copied()
    }
}
