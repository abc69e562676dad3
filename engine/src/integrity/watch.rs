//! What integrity remembers between epochs: the satellites kept out after an exclusion and
//! the recent C/N0 level the jamming indicator compares with.

use crate::measurements::observation::Observation;
use crate::measurements::record::{Fate, Measurement};
use crate::sat::SatId;
use crate::time::GnssTime;

/// Satellites kept out at once; a further exclusion replaces the one released soonest.
const KEPT: usize = 4;

/// Time constant of the recent C/N0 level, s: long against a jammer approaching within
/// seconds, short against a satellite rising or setting (common practice for a slow
/// reference level).
const LEVEL_TIME_S: f64 = 30.0;

/// A gap after which the recent C/N0 level starts afresh, s.
const LEVEL_GAP_S: f64 = 60.0;

/// Integrity's memory.
#[derive(Clone, Debug, PartialEq)]
pub(crate) struct Watch {
    /// Satellites kept out, with the time they may be tested again (a time in the past:
    /// a free slot).
    kept: [(SatId, GnssTime); KEPT],
    /// Recent mean C/N0, dB-Hz, and the time of its last update.
    level: Option<(f32, GnssTime)>,
}

impl Watch {
    /// Nothing remembered.
    pub const fn new() -> Self {
        Watch {
            kept: [(SatId::gps(1), GnssTime::EPOCH); KEPT],
            level: None,
        }
    }

    /// Marks [`Fate::KeptOut`] every measurement of a satellite still kept out at `t` (the
    /// others are tested again); `obs` are the epoch's observations the measurements index.
    pub fn keep_out(&self, meas: &mut [Measurement], obs: &[Observation], t: GnssTime) {
        for m in meas.iter_mut() {
            let Some(id) = obs.get(m.index).map(|o| o.sat) else {
                continue;
            };
            if self.kept.iter().any(|(s, until)| *s == id && *until > t) {
                m.out.fate = Fate::KeptOut;
            }
        }
    }

    /// Remembers until `t + hold_s` the satellites the residual test excluded this epoch
    /// (on the least squares' residuals or the filter's innovations), each in its own slot
    /// if it has one, else in the slot released soonest. A pseudorange the filter's gate
    /// refuses is tested again at the next epoch: in a street canyon reflections come and
    /// go, and keeping gated satellites out for the hold time raised the canyon drive's
    /// 95 % horizontal error from 2.8 to 5.1 m (truck-city-tunnel, docs/integrity.md).
    pub fn remember(
        &mut self,
        meas: &[Measurement],
        obs: &[Observation],
        t: GnssTime,
        hold_s: f64,
    ) {
        let Some(hold) = crate::Duration::from_secs_f64(hold_s) else {
            return;
        };
        let until = t.plus(hold);
        for m in meas {
            if !matches!(m.out.fate, Fate::Excluded { .. }) {
                continue;
            }
            let Some(id) = obs.get(m.index).map(|o| o.sat) else {
                continue;
            };
            let slot = self
                .kept
                .iter_mut()
                .min_by_key(|(s, u)| if *s == id { GnssTime::EPOCH } else { *u });
            if let Some(slot) = slot {
                *slot = (id, until);
            }
        }
    }

    /// The drop of this epoch's mean C/N0 below the recent level, dB (0 when there is no
    /// level yet), updating the level with the mean.
    pub fn cn0_drop(&mut self, mean_dbhz: f32, t: GnssTime) -> f32 {
        let (drop, level) = match self.level {
            Some((level, at)) => {
                let dt = t.since(at).as_secs_f64();
                if dt > LEVEL_GAP_S {
                    (0.0, mean_dbhz)
                } else {
                    let alpha = (dt / LEVEL_TIME_S).clamp(0.0, 1.0) as f32;
                    (level - mean_dbhz, level + alpha * (mean_dbhz - level))
                }
            }
            None => (0.0, mean_dbhz),
        };
        self.level = Some((level, t));
        drop
    }
}
