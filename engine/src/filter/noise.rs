//! Process-noise parameters: the motion profiles, the receiver clock's Allan coefficients
//! and the inter-system bias walk, each with its documented range and a `validate()`.
//!
//! # How the motion presets were chosen
//! The kinematic model drives velocity with white acceleration of power spectral density
//! `q` (m²/s³): the velocity variance grows by `q` per second. A platform whose
//! accelerations have a standard deviation σₐ and stay correlated for about τ seconds
//! (one manoeuvre: a start, a turn, a braking) gives `q ≈ σₐ²·τ` (common practice: the
//! white-noise equivalent of a first-order Gauss–Markov acceleration for steps longer than
//! τ). The σₐ and τ below are typical values from experience \[M\], not measurements of any
//! vehicle; they are starting points for the tuning tool, not calibrated figures.
//! Horizontal and vertical are apart because most platforms barely accelerate vertically.

use core::fmt;

/// Range of the acceleration PSDs, m²/s³: 10⁻⁸ (σₐ = 10⁻⁴ m/s² for 1 s) to 10⁴
/// (σₐ = 100 m/s², 10 g, for 1 s).
pub const ACCEL_PSD_RANGE: (f64, f64) = (1e-8, 1e4);
/// Range of the white frequency noise coefficient `h0`, seconds: several decades either side
/// of the TCXO value 2e-19 (common practice: wide enough for better oscillators and for poor
/// ones, narrow enough to catch a unit error such as a value in ns).
pub const H0_RANGE: (f64, f64) = (1e-26, 1e-15);
/// Range of the random-walk frequency noise coefficient `h₋₂`, 1/s.
pub const H_MINUS2_RANGE: (f64, f64) = (1e-32, 1e-15);
/// Range of the inter-system bias random-walk PSD, m²/s.
pub const ISB_PSD_RANGE: (f64, f64) = (1e-12, 1e2);

/// Which process-noise parameter is invalid: not finite or outside its documented range.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum ParameterError {
    /// `MotionProfile::accel_psd_horizontal` outside [`ACCEL_PSD_RANGE`].
    AccelPsdHorizontal,
    /// `MotionProfile::accel_psd_vertical` outside [`ACCEL_PSD_RANGE`].
    AccelPsdVertical,
    /// `ClockNoise::h0` outside [`H0_RANGE`].
    ClockH0,
    /// `ClockNoise::h_minus2` outside [`H_MINUS2_RANGE`].
    ClockHMinus2,
    /// `ProcessNoise::isb_psd` outside [`ISB_PSD_RANGE`].
    IsbPsd,
}

impl fmt::Display for ParameterError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            ParameterError::AccelPsdHorizontal => {
                "accel_psd_horizontal must be finite and within 1e-8..=1e4 m²/s³"
            }
            ParameterError::AccelPsdVertical => {
                "accel_psd_vertical must be finite and within 1e-8..=1e4 m²/s³"
            }
            ParameterError::ClockH0 => "h0 must be finite and within 1e-26..=1e-15 s",
            ParameterError::ClockHMinus2 => "h_minus2 must be finite and within 1e-32..=1e-15 1/s",
            ParameterError::IsbPsd => "isb_psd must be finite and within 1e-12..=1e2 m²/s",
        })
    }
}

impl core::error::Error for ParameterError {}

fn within(v: f64, (lo, hi): (f64, f64)) -> bool {
    v >= lo && v <= hi
}

/// White-acceleration power spectral densities of a platform, horizontal (east and north
/// alike) and vertical, m²/s³.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default))]
pub struct MotionProfile {
    /// Horizontal acceleration PSD, m²/s³, within [`ACCEL_PSD_RANGE`].
    pub accel_psd_horizontal: f64,
    /// Vertical acceleration PSD, m²/s³, within [`ACCEL_PSD_RANGE`].
    pub accel_psd_vertical: f64,
}

impl MotionProfile {
    /// A parked container, pallet or machine: horizontal 1e-4, vertical 1e-4 m²/s³
    /// (σₐ ≈ 0.01 m/s² for τ ≈ 1 s \[M\]). Not zero, so that the filter can still follow an
    /// asset that is moved slowly; a parked asset is pinned by the stationary hold, not by
    /// this profile. Velocity σ grows by 0.01 m/s in √s.
    pub const STATIC_ASSET: MotionProfile = MotionProfile {
        accel_psd_horizontal: 1e-4,
        accel_psd_vertical: 1e-4,
    };
    /// Walking: horizontal 0.5, vertical 0.05 m²/s³. Starts, stops and turns of
    /// σₐ ≈ 0.5 m/s² for τ ≈ 2 s \[M\] (the step-by-step oscillation of a body-worn device
    /// averages out over a second); vertically stairs and lifts, σₐ ≈ 0.15 m/s² for τ ≈ 2 s.
    pub const PEDESTRIAN: MotionProfile = MotionProfile {
        accel_psd_horizontal: 0.5,
        accel_psd_vertical: 0.05,
    };
    /// Cars, vans and trucks: horizontal 5, vertical 0.1 m²/s³. Braking, accelerating and
    /// cornering of σₐ ≈ 1.3 m/s² (about 0.13 g) held for τ ≈ 3 s \[M\]; vertically changes of
    /// road grade, σₐ ≈ 0.2 m/s² for τ ≈ 3 s. Values of 1–10 m²/s³ are common practice for
    /// land-vehicle filters.
    pub const ROAD_VEHICLE: MotionProfile = MotionProfile {
        accel_psd_horizontal: 5.0,
        accel_psd_vertical: 0.1,
    };
    /// Cargo ships and barges: horizontal 0.05, vertical 0.05 m²/s³. Course and speed change
    /// slowly, σₐ ≈ 0.04 m/s² for τ ≈ 30 s \[M\]; vertically the heave of a large hull, ±0.5 m at
    /// a 10 s period, has an acceleration of about 0.14 m/s² r.m.s. correlated for about a
    /// quarter period (0.14² · 2.5 ≈ 0.05). White acceleration overstates how far heave can
    /// wander over minutes; the position updates bound it.
    pub const SHIP: MotionProfile = MotionProfile {
        accel_psd_horizontal: 0.05,
        accel_psd_vertical: 0.05,
    };
    /// Trains: horizontal 1, vertical 0.01 m²/s³. Traction and braking of σₐ ≈ 0.3 m/s² r.m.s.
    /// (peaks near 1 m/s²) held for τ ≈ 10 s \[M\]; track grades of a few per mille give almost
    /// no vertical acceleration (σₐ ≈ 0.03 m/s² for τ ≈ 10 s).
    pub const RAIL: MotionProfile = MotionProfile {
        accel_psd_horizontal: 1.0,
        accel_psd_vertical: 0.01,
    };

    /// Checks both PSDs.
    ///
    /// # Errors
    /// The first field (in declaration order) that is not finite or lies outside
    /// [`ACCEL_PSD_RANGE`].
    pub fn validate(&self) -> Result<(), ParameterError> {
        if !within(self.accel_psd_horizontal, ACCEL_PSD_RANGE) {
            return Err(ParameterError::AccelPsdHorizontal);
        }
        if !within(self.accel_psd_vertical, ACCEL_PSD_RANGE) {
            return Err(ParameterError::AccelPsdVertical);
        }
        Ok(())
    }
}

impl Default for MotionProfile {
    /// [`MotionProfile::ROAD_VEHICLE`]: a generic tracker spends most of its time parked
    /// (held by the stationary test, not by the profile) and moves on a vehicle; a profile
    /// that cannot follow a vehicle would gate its measurements out once it drives off.
    fn default() -> Self {
        MotionProfile::ROAD_VEHICLE
    }
}

/// Allan-variance coefficients of the receiver oscillator, for the two-state clock model of
/// Brown & Hwang ("Introduction to Random Signals and Applied Kalman Filtering", clock model
/// section \[M\]): `S_f = h0/2` (white frequency noise, drives the bias) and
/// `S_g = 2π²·h₋₂` (random-walk frequency noise, drives the drift). The flicker term `h₋₁`
/// has no finite-state form and is left out, as in that model.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default))]
pub struct ClockNoise {
    /// White frequency noise coefficient `h0`, s, within [`H0_RANGE`].
    pub h0: f64,
    /// Random-walk frequency noise coefficient `h₋₂`, 1/s, within [`H_MINUS2_RANGE`].
    pub h_minus2: f64,
}

impl ClockNoise {
    /// A temperature-compensated crystal oscillator: h0 = 2e-19 s, h₋₂ = 2e-20 1/s
    /// \[M: Brown & Hwang's table of typical oscillator coefficients, TCXO row; to be
    /// confirmed against the book\]. In metres (× c²): the bias gains 9.0e-3 m²/s from white
    /// frequency noise and the drift 3.5e-2 m²/s³.
    pub const TCXO: ClockNoise = ClockNoise {
        h0: 2e-19,
        h_minus2: 2e-20,
    };

    /// Checks both coefficients.
    ///
    /// # Errors
    /// [`ParameterError::ClockH0`] or [`ParameterError::ClockHMinus2`] for a value that is
    /// not finite or outside its range.
    pub fn validate(&self) -> Result<(), ParameterError> {
        if !within(self.h0, H0_RANGE) {
            return Err(ParameterError::ClockH0);
        }
        if !within(self.h_minus2, H_MINUS2_RANGE) {
            return Err(ParameterError::ClockHMinus2);
        }
        Ok(())
    }

    /// `S_f = h0/2`, s (spectral density of the bias noise, in s²/s).
    pub fn s_f(&self) -> f64 {
        0.5 * self.h0
    }

    /// `S_g = 2π²·h₋₂`, 1/s (spectral density of the drift noise, in (s/s)²/s).
    pub fn s_g(&self) -> f64 {
        2.0 * core::f64::consts::PI * core::f64::consts::PI * self.h_minus2
    }
}

impl Default for ClockNoise {
    /// [`ClockNoise::TCXO`], the oscillator class of tracker receivers.
    fn default() -> Self {
        ClockNoise::TCXO
    }
}

/// Every process-noise parameter of the filter.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(default))]
pub struct ProcessNoise {
    /// Acceleration PSDs of the platform.
    pub motion: MotionProfile,
    /// Receiver oscillator.
    pub clock: ClockNoise,
    /// Random-walk PSD of each inter-system bias, m²/s, within [`ISB_PSD_RANGE`].
    /// Default 1e-5 m²/s: σ grows by 0.19 m in an hour and 0.93 m in a day, a slow wander of
    /// receiver-internal delays with temperature \[M\].
    pub isb_psd: f64,
}

impl ProcessNoise {
    /// Checks every parameter.
    ///
    /// # Errors
    /// The first invalid field, motion first, then clock, then `isb_psd`.
    pub fn validate(&self) -> Result<(), ParameterError> {
        self.motion.validate()?;
        self.clock.validate()?;
        if !within(self.isb_psd, ISB_PSD_RANGE) {
            return Err(ParameterError::IsbPsd);
        }
        Ok(())
    }
}

impl Default for ProcessNoise {
    fn default() -> Self {
        ProcessNoise {
            motion: MotionProfile::default(),
            clock: ClockNoise::default(),
            isb_psd: 1e-5,
        }
    }
}
