//! One record per measurement, carried through the stages in data-flow order: screening
//! fills [`Measurement::sat`] (the satellite's state at transmit time and the measurement,
//! fixed from then on), the corrections and the solution — least squares or filter — fill
//! [`Measurement::out`] (corrections, σ, what became of the pseudorange and the range rate),
//! and the engine writes the observation's [`crate::SatUse`] from both.

use crate::corrections::site::{SatCorrection, SatInput};
use crate::frames::{norm, sub};
use crate::sat::System;
use crate::snapshot::wls::sagnac;

/// A screened observation: its index in the epoch, its satellite, what the stages made of it.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Measurement {
    /// Index of the observation in the epoch (and of its `SatUse` in the solution).
    pub index: usize,
    /// The satellite's state at transmit time and the measurement.
    pub sat: Candidate,
    /// What the corrections and the solution made of it.
    pub out: Outcome,
}

/// A satellite ready for the solution: its state at transmit time and its measurement.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Candidate {
    /// Satellite ECEF position at transmit time, m.
    pub pos: [f64; 3],
    /// Satellite clock offset including relativity and group delay, metres.
    pub clock_m: f64,
    /// Pseudorange, m.
    pub pr_m: f64,
    /// Index of the system's clock state (0, 1, 2).
    pub sys: usize,
    /// Multiplier of σ from C/N0 (≥ 1).
    pub cn0_factor: f32,
    /// Ionospheric scale from L1 to this signal's frequency.
    pub iono_scale: f32,
    /// Satellite ECEF velocity at transmit time, m/s.
    pub vel: [f64; 3],
    /// Satellite clock drift, m/s.
    pub clock_drift_mps: f64,
    /// Measured range rate −λ·D, m/s, when a plausible Doppler was reported.
    pub range_rate_mps: Option<f64>,
    /// Taken for a reflection (C/N0 far below what its elevation leads to expect): its
    /// `cn0_factor` carries the extra σ.
    pub reflection: bool,
}

impl Candidate {
    /// What the corrections need of this satellite.
    pub fn sat_input(&self) -> SatInput {
        SatInput {
            iono_scale: self.iono_scale,
            cn0_factor: self.cn0_factor,
        }
    }

    /// The satellite's system.
    pub fn system(&self) -> System {
        System::ALL.get(self.sys).copied().unwrap_or(System::Gps)
    }

    /// Earth rotation rate of the satellite's system, rad/s (for the Sagnac rotation).
    pub fn omega_e(&self) -> f64 {
        self.system().constants().omega_e
    }

    /// The unit line of sight from `rx` (ECEF, m) to the satellite rotated for the Earth's
    /// rotation during the signal's flight, and the range; `None` at zero range. The one
    /// geometry the least squares and the filter both linearise on.
    pub fn line_of_sight(&self, rx: [f64; 3]) -> Option<([f64; 3], f64)> {
        let sat = sagnac(self.pos, rx, self.omega_e());
        let d = sub(sat, rx);
        let rho = norm(d);
        (rho > 0.0).then(|| ([d[0] / rho, d[1] / rho, d[2] / rho], rho))
    }
}

/// What became of a measurement's pseudorange. The innovation statistic of a refused one
/// lives in its variant, so the two cannot disagree.
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub(crate) enum Fate {
    /// Not (yet) used: before the corrections, or not among the final iteration's.
    #[default]
    Pending,
    /// Below the elevation mask at the position the corrections were computed at.
    Masked,
    /// Used by the least squares' final iteration, or applied by the filter.
    Used,
    /// Refused by the filter's innovation test.
    Gated {
        /// Its normalised innovation squared.
        nis: f32,
    },
    /// Excluded by the residual test this epoch.
    Excluded {
        /// Its normalised residual when it was identified.
        statistic: f32,
    },
    /// Kept out after an earlier exclusion.
    KeptOut,
}

impl Fate {
    /// Whether this fate keeps the pseudorange out of the fix as a fault: excluded by the
    /// residual test (this epoch or earlier), or refused by the filter's innovation test
    /// beyond `limit` (the residual test's one-degree threshold).
    pub fn is_exclusion(self, limit: f32) -> bool {
        match self {
            Fate::Excluded { .. } | Fate::KeptOut => true,
            Fate::Gated { nis } => nis > limit,
            _ => false,
        }
    }
}

/// What the corrections and the solution made of one measurement.
#[derive(Clone, Copy, Debug, Default)]
pub(crate) struct Outcome {
    /// What became of the pseudorange.
    pub fate: Fate,
    /// Elevation and azimuth, rad, once corrections were on.
    pub el_az: Option<(f32, f32)>,
    /// Post-fit residual, m.
    pub residual_m: f64,
    /// σ given, m.
    pub sigma_m: f64,
    /// Variance left by the atmosphere models, m² (see `SatCorrection::model_var_m2`).
    pub model_var_m2: f64,
    /// Ionosphere and troposphere delay applied, m.
    pub delay_m: f64,
    /// Partial derivatives row (−unit line of sight), kept for the post-fit residual and
    /// the velocity solution.
    pub row: [f64; 3],
    /// The range rate's innovation in the navigation filter, m/s: kept once it is applied
    /// (cleared when it is not).
    pub rate_innovation_mps: Option<f32>,
    /// The range rate failed the filter's gate.
    pub rate_gated: bool,
}

impl Outcome {
    /// Used in the solution.
    pub fn used(&self) -> bool {
        self.fate == Fate::Used
    }

    /// Below the elevation mask.
    pub fn masked(&self) -> bool {
        self.fate == Fate::Masked
    }

    /// Excluded by integrity, this epoch or earlier: no solution may use it.
    pub fn excluded(&self) -> bool {
        matches!(self.fate, Fate::Excluded { .. } | Fate::KeptOut)
    }

    /// The variance the residual and innovation tests assume, m²: the code σ model, the
    /// signal-in-space error `ure_sigma_m` and what the atmosphere models leave, the last two
    /// times `scale` (the square of the reflection factor for a suspected reflection, whose
    /// σ already carries it, else 1: a reflection's extra path is no better known than its
    /// code). The tests need all of them, where the least-squares weights only need the
    /// ratios.
    pub fn test_variance(&self, ure_sigma_m: f64, scale: f64) -> f64 {
        self.sigma_m * self.sigma_m + (ure_sigma_m * ure_sigma_m + self.model_var_m2) * scale
    }

    /// Takes the corrections of the satellite: elevation and azimuth, the mask (masked, or
    /// still to be solved), delay, σ and the atmosphere models' residual variance.
    pub fn correct(&mut self, k: &SatCorrection) {
        self.el_az = Some(k.el_az);
        // An exclusion outlives the corrections computed again at a new position.
        if !self.excluded() {
            self.fate = if k.masked {
                Fate::Masked
            } else {
                Fate::Pending
            };
        }
        self.delay_m = k.delay_m;
        self.sigma_m = k.sigma_m;
        self.model_var_m2 = k.model_var_m2;
    }
}
