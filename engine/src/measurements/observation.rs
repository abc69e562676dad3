//! Measurements as the receiver reports them: one epoch of observations.

use crate::sat::{SatId, Signal};
use crate::time::GnssTime;
use heapless::Vec;

/// One code measurement of one signal from one satellite.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Observation {
    /// The satellite.
    pub sat: SatId,
    /// The tracked signal.
    pub signal: Signal,
    /// Pseudorange, metres. Zero means "not measured" (receivers report missing values so).
    pub pseudorange_m: f64,
    /// Doppler, Hz, if reported.
    pub doppler_hz: Option<f64>,
    /// Carrier-to-noise density, dB-Hz, if reported (zero is treated as missing).
    pub cn0_dbhz: Option<f32>,
    /// Continuous lock time, seconds, if reported.
    pub lock_s: Option<f32>,
}

impl Observation {
    /// A code-only observation.
    pub const fn code(sat: SatId, signal: Signal, pseudorange_m: f64) -> Self {
        Observation {
            sat,
            signal,
            pseudorange_m,
            doppler_hz: None,
            cn0_dbhz: None,
            lock_s: None,
        }
    }
}

/// All observations of one receiver epoch, at most `N` of them.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct Epoch<const N: usize> {
    /// Receiver time tag of the epoch (GPS scale, as the receiver's clock reads it).
    pub time: GnssTime,
    /// The observations.
    pub obs: Vec<Observation, N>,
}

impl<const N: usize> Epoch<N> {
    /// An empty epoch at `time`.
    pub const fn new(time: GnssTime) -> Self {
        Epoch {
            time,
            obs: Vec::new(),
        }
    }

    /// Adds an observation.
    ///
    /// # Errors
    /// The observation is handed back when the epoch already holds `N`.
    pub fn push(&mut self, obs: Observation) -> Result<(), Observation> {
        self.obs.push(obs)
    }
}
