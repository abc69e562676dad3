//! What the engine reports for each epoch: the fix (or why there is none) and what became
//! of every observation.

use crate::frames::Geodetic;
use crate::sat::{SatId, Signal};
use crate::time::GnssTime;
use heapless::Vec;

/// What became of one observation.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum SatStatus {
    /// Used in the fix (by the navigation filter: applied as an update; its residual is then
    /// the innovation before the update).
    Used,
    /// Below the elevation mask.
    BelowMask,
    /// C/N0 below the configured mask.
    WeakSignal,
    /// No ephemeris held for the satellite.
    NoEphemeris,
    /// The ephemeris marks the satellite unhealthy.
    Unhealthy,
    /// The ephemeris is too far from its toe.
    Stale,
    /// The pseudorange was reported as zero: not measured.
    NotMeasured,
    /// The pseudorange was NaN, infinite or outside the plausible span.
    BadPseudorange,
    /// A second observation of the same satellite and signal in one epoch.
    Duplicate,
    /// The system is disabled in the configuration.
    SystemDisabled,
    /// Not the signal configured for its system.
    SignalNotUsed,
    /// Usable, but the epoch produced no fix.
    NotSolved,
    /// Refused by the navigation filter's innovation test (χ² with one degree of freedom
    /// against `filter.gate`).
    Gated {
        /// The normalised innovation squared ν²/S that failed the test.
        nis: f32,
    },
    /// Excluded by the residual test this epoch (the satellite its identification found).
    Excluded {
        /// Its normalised residual (w-test statistic) when it was identified.
        statistic: f32,
    },
    /// Kept out after an exclusion within the last `integrity.exclusion_hold_s`; it is
    /// tested again after that.
    KeptOut,
}

/// What became of an observation's Doppler.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum DopplerUse {
    /// No Doppler reported (or reported as zero: missing).
    NotReported,
    /// Reported but NaN, infinite or beyond the plausible range rate: refused.
    Rejected,
    /// Plausible, but not used (its pseudorange was not used, or too few Dopplers for a
    /// velocity).
    NotUsed,
    /// Used in the velocity solution.
    Used {
        /// Post-fit range-rate residual, m/s.
        residual_mps: f32,
    },
}

/// One observation's satellite as seen in this epoch.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SatUse {
    /// The satellite.
    pub sat: SatId,
    /// The signal of the observation.
    pub signal: Signal,
    /// Elevation, degrees, when the satellite position and a receiver position are known.
    pub elevation_deg: Option<f32>,
    /// Azimuth, degrees from north through east, when known.
    pub azimuth_deg: Option<f32>,
    /// Post-fit residual, metres, for used satellites.
    pub residual_m: Option<f64>,
    /// Measurement σ given to the observation, metres, for used satellites.
    pub sigma_m: Option<f32>,
    /// What became of it.
    pub status: SatStatus,
    /// What became of its Doppler.
    pub doppler: DopplerUse,
    /// Its C/N0 was far below what its elevation leads to expect, or its Doppler disagreed
    /// with the filter's prediction: taken for a reflection and down-weighted.
    pub reflection: bool,
}

/// Dilution of precision, from the unweighted geometry (HᵀH)⁻¹ in east/north/up.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Dop {
    /// Geometric DOP: position and the reference clock.
    pub gdop: f64,
    /// Position DOP.
    pub pdop: f64,
    /// Horizontal DOP.
    pub hdop: f64,
    /// Vertical DOP.
    pub vdop: f64,
    /// Time DOP of the reference clock.
    pub tdop: f64,
}

/// The kind of a fix.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum FixKind {
    /// Position with the height held to an earlier 3-D fix (one satellite short).
    TwoD,
    /// Full position from the measurements alone.
    ThreeD,
}

/// Which ionosphere correction was applied.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum IonoCorrection {
    /// None: no coefficients known, or disabled.
    None,
    /// The broadcast Klobuchar model.
    Klobuchar,
}

/// Receiver velocity and clock drift from Doppler.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Velocity {
    /// Velocity, WGS-84 ECEF, m/s.
    pub ecef_mps: [f64; 3],
    /// The same in east/north/up at the fix, m/s.
    pub enu_mps: [f64; 3],
    /// Receiver clock drift, m/s (divide by c for s/s).
    pub clock_drift_mps: f64,
    /// Velocity covariance in east/north/up, (m/s)², from the Doppler σ model.
    pub covariance_enu_m2s2: [[f64; 3]; 3],
    /// Doppler measurements used.
    pub used: u8,
}

/// A position fix.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Fix {
    /// 2-D or 3-D.
    pub kind: FixKind,
    /// Antenna position, WGS-84 ECEF, metres.
    pub ecef_m: [f64; 3],
    /// The same position as latitude, longitude and ellipsoidal height.
    pub geodetic: Geodetic,
    /// Receiver clock bias against the first system used (GPS, else Galileo, else BeiDou),
    /// metres (divide by c for seconds).
    pub clock_bias_m: f64,
    /// Receiver clock bias per system (GPS, Galileo, BeiDou), metres; `None` for a system
    /// without satellites in the fix. Differences are the inter-system biases.
    pub system_clock_m: [Option<f64>; 3],
    /// Position covariance in east/north/up, m², row-major 3×3, from the measurement σ model.
    pub covariance_enu_m2: [[f64; 3]; 3],
    /// Dilution of precision.
    pub dop: Dop,
    /// Satellites used.
    pub used: u8,
    /// Least-squares iterations taken.
    pub iterations: u8,
    /// Ionosphere correction applied.
    pub iono: IonoCorrection,
    /// Weighted sum of squared residuals Σ(v/σ)² (a χ² statistic when the σ model holds).
    pub weighted_sse: f64,
    /// Velocity and clock drift, when at least four used satellites reported Doppler (or
    /// from the filter).
    pub velocity: Option<Velocity>,
    /// Where the position comes from.
    pub source: FixSource,
}

/// Where a fix's position comes from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum FixSource {
    /// This epoch's least-squares solution alone.
    Snapshot,
    /// The navigation filter, updated with this epoch's measurements.
    Filtered,
    /// The navigation filter's prediction: no measurement could be used this epoch (an
    /// outage); its σ grows with the time since the last update.
    Predicted,
    /// The navigation filter, updated with this epoch's measurements, with the asset found
    /// stationary: its velocity is pinned to zero and its position held.
    Held,
}

impl FixSource {
    /// The kind of fix in plain words, as reports print it.
    pub fn as_str(self) -> &'static str {
        match self {
            FixSource::Snapshot => "snapshot",
            FixSource::Filtered => "filtered",
            FixSource::Predicted => "predicted",
            FixSource::Held => "held",
        }
    }
}

/// What the navigation filter did at an epoch besides its usual predict and update.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum FilterEvent {
    /// Nothing besides (or the filter is off).
    #[default]
    None,
    /// Started from this epoch's least-squares fix.
    Started,
    /// The receiver clock jumped (a whole-millisecond step, or a wake-up's new clock): the
    /// clock states were re-seated, the position kept.
    ClockReseated,
    /// A held position was released: the asset moves (or a gap made the hold unsafe).
    HoldReleased,
    /// The gap since the last epoch exceeded `filter.max_gap_s`: restarted from this
    /// epoch's least-squares fix.
    RestartedAfterGap,
    /// The innovations over the last epochs failed the consistency test (the filter
    /// diverged): restarted from this epoch's least-squares fix.
    RestartedDiverged,
    /// No measurement updated the filter for `filter.max_coast_s`: prediction given up.
    CoastEnded,
}

impl FilterEvent {
    /// The event in plain words, as reports print it.
    pub fn as_str(self) -> &'static str {
        match self {
            FilterEvent::None => "",
            FilterEvent::Started => "started",
            FilterEvent::ClockReseated => "clock re-seated",
            FilterEvent::HoldReleased => "hold released",
            FilterEvent::RestartedAfterGap => "restarted after gap",
            FilterEvent::RestartedDiverged => "restarted (diverged)",
            FilterEvent::CoastEnded => "prediction given up",
        }
    }
}

/// How far a fix can be trusted, from the residual test (docs/integrity.md).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum IntegrityState {
    /// The residual test passed with every satellite used: the protection levels hold.
    Verified,
    /// The test found a faulty satellite (or one is kept out after an earlier exclusion);
    /// without it the test passes and the protection levels hold.
    FaultExcluded,
    /// Not checked: no fix, a predicted fix, too few satellites for the test (no redundancy),
    /// or integrity disabled. Never a silent "verified".
    #[default]
    Unavailable,
    /// The test failed and no exclusion made it pass: the fix must not be trusted.
    Alert,
}

impl IntegrityState {
    /// The state in plain words, as reports print it.
    pub fn as_str(self) -> &'static str {
        match self {
            IntegrityState::Verified => "verified",
            IntegrityState::FaultExcluded => "fault excluded",
            IntegrityState::Unavailable => "unavailable",
            IntegrityState::Alert => "alert",
        }
    }
}

/// Interference and spoofing indicators raised at an epoch: reasons to doubt the signals,
/// not guarantees (docs/integrity.md names the method behind each).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Flags(pub u8);

impl Flags {
    /// The mean C/N0 of all satellites fell well below its recent level at once.
    pub const JAMMING: Flags = Flags(1);
    /// C/N0 nearly equal across many satellites (one transmitter's signals).
    pub const UNIFORM_CN0: Flags = Flags(2);
    /// The receiver clock jumped by an amount that is not a whole millisecond.
    pub const CLOCK_JUMP: Flags = Flags(4);
    /// The fix moved farther from the last one than `integrity.max_speed_mps` allows.
    pub const INCONSISTENT_MOTION: Flags = Flags(8);
    /// The asset moved although its Doppler says it stands still: a held position's
    /// pseudoranges spread beyond the residual test's threshold while its range rates
    /// showed no motion.
    pub const DOPPLER_MISMATCH: Flags = Flags(16);

    /// Every flag with its name, in bit order.
    pub const ALL: [(Flags, &'static str); 5] = [
        (Flags::JAMMING, "jamming"),
        (Flags::UNIFORM_CN0, "uniform-cn0"),
        (Flags::CLOCK_JUMP, "clock-jump"),
        (Flags::INCONSISTENT_MOTION, "inconsistent-motion"),
        (Flags::DOPPLER_MISMATCH, "doppler-mismatch"),
    ];

    /// Whether every flag of `other` is raised.
    pub fn contains(self, other: Flags) -> bool {
        self.0 & other.0 == other.0 && other.0 != 0
    }

    /// Raises the flags of `other`.
    pub fn insert(&mut self, other: Flags) {
        self.0 |= other.0;
    }

    /// No flag raised.
    pub fn is_empty(self) -> bool {
        self.0 == 0
    }

    /// The names of the raised flags.
    pub fn names(self) -> impl Iterator<Item = &'static str> {
        Flags::ALL
            .into_iter()
            .filter(move |(f, _)| self.contains(*f))
            .map(|(_, n)| n)
    }
}

/// The integrity of one epoch's fix.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Integrity {
    /// How far the fix can be trusted.
    pub state: IntegrityState,
    /// Horizontal protection level, m, when the state is verified or fault excluded.
    pub hpl_m: Option<f32>,
    /// Vertical protection level, m, likewise.
    pub vpl_m: Option<f32>,
    /// The residual test statistic (weighted sum of squared residuals) after any exclusion.
    pub statistic: f32,
    /// Its threshold, χ² at the configured false-alarm probability.
    pub threshold: f32,
    /// The test's degrees of freedom (0: no test).
    pub dof: u8,
    /// Satellites excluded this epoch or kept out after an earlier exclusion.
    pub excluded: u8,
    /// Pseudoranges taken for reflections and down-weighted.
    pub reflections: u8,
    /// Interference and spoofing indicators.
    pub flags: Flags,
}

/// Why an epoch produced no fix.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub enum NoFixReason {
    /// Fewer usable satellites than unknowns (3 position + 1 clock per system), with no
    /// recent height to hold for a 2-D fix.
    TooFewSatellites {
        /// Usable satellites.
        usable: u8,
        /// Unknowns to solve for.
        needed: u8,
    },
    /// The geometry matrix is singular or numerically unusable.
    SingularGeometry,
    /// The iteration did not converge within the configured limit.
    NoConvergence,
    /// The solution lies outside the configured height span: an input is wrong.
    ImplausiblePosition,
}

/// The fix, or why there is none.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[expect(
    clippy::large_enum_variant,
    reason = "returned by value; no heap to box into"
)]
pub enum FixOutcome {
    /// A fix.
    Fix(Fix),
    /// No fix, with the reason.
    NoFix(NoFixReason),
}

/// Everything the engine says about one epoch.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Solution<const N: usize> {
    /// Receiver time tag of the epoch.
    pub time: GnssTime,
    /// The fix or why there is none.
    pub outcome: FixOutcome,
    /// What the navigation filter did besides its usual step.
    pub filter_event: FilterEvent,
    /// How far the fix can be trusted, its protection levels and the indicators.
    pub integrity: Integrity,
    /// One entry per observation of the epoch, in input order.
    pub sats: Vec<SatUse, N>,
}

impl<const N: usize> Solution<N> {
    /// The fix, if there is one.
    pub fn fix(&self) -> Option<&Fix> {
        match &self.outcome {
            FixOutcome::Fix(f) => Some(f),
            FixOutcome::NoFix(_) => None,
        }
    }
}
