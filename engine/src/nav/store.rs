//! Fixed-capacity store of broadcast ephemerides: at most one per satellite.
//!
//! Replacement rules, in order:
//! 1. A record for a satellite not yet held is added; when the store is full the held
//!    record with the oldest toe is evicted if it is older than the newcomer, otherwise the
//!    newcomer is handed back in [`EphemerisError::StoreFull`].
//! 2. A record with a later toe replaces the held one (a receiver always prefers the
//!    newest broadcast set).
//! 3. A record with the same toe and a different issue of data replaces the held one
//!    (a new upload at the same reference time).
//! 4. An identical or older record changes nothing.
//!
//! The store never looks at wall time: a replay must feed records in the order a receiver
//! would have decoded them (by transmission time), so no record is used before it existed.

use crate::nav::ephemeris::{BroadcastEphemeris, EphemerisError, SatState};
use crate::sat::{SatId, SPEED_OF_LIGHT};
use crate::time::GnssTime;
use heapless::Vec;

/// What ingesting an ephemeris did.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum Ingested {
    /// A first record for this satellite.
    Added,
    /// Replaced a held record (newer toe or new issue of data).
    Replaced,
    /// Evicted the oldest record of another satellite to make room.
    Evicted(SatId),
    /// The same or an older record was already held; nothing changed.
    Unchanged,
}

/// A held ephemeris with its absolute reference times precomputed.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct StoredEphemeris {
    /// The broadcast record.
    pub eph: BroadcastEphemeris,
    /// toe on the GPS time line.
    pub toe: GnssTime,
    /// toc on the GPS time line.
    pub toc: GnssTime,
}

impl StoredEphemeris {
    /// Seconds from toe to the transmit time of a signal received at `t_rx` with
    /// pseudorange `pr_m` (the age the staleness test uses).
    pub fn age_at_transmit_s(&self, t_rx: GnssTime, pr_m: f64) -> f64 {
        t_rx.seconds_since(self.toe) - pr_m / SPEED_OF_LIGHT
    }

    /// The satellite's state at the transmit time of a signal received at `t_rx` with
    /// pseudorange `pr_m`: the time of transmission by the satellite clock, t_rx − P/c,
    /// corrected to system time by the clock polynomial (IS-GPS-200 §20.3.3.3.3.1:
    /// t = tsv − Δtsv, one iteration suffices).
    pub fn state_at_transmit(&self, t_rx: GnssTime, pr_m: f64) -> SatState {
        let tau = pr_m / SPEED_OF_LIGHT;
        let dt_toe = t_rx.seconds_since(self.toe) - tau;
        let dt_toc = t_rx.seconds_since(self.toc) - tau;
        let dtsv = self.eph.clock_polynomial_s(dt_toc);
        self.eph.evaluate(dt_toe - dtsv, dt_toc - dtsv)
    }
}

/// Up to `EPH` ephemerides, one per satellite. Memory: `EPH × size_of::<StoredEphemeris>()`
/// (232 bytes each) plus a length word.
#[derive(Clone, Debug)]
pub struct EphemerisStore<const EPH: usize> {
    slots: Vec<StoredEphemeris, EPH>,
}

impl<const EPH: usize> Default for EphemerisStore<EPH> {
    fn default() -> Self {
        Self::new()
    }
}

impl<const EPH: usize> EphemerisStore<EPH> {
    /// An empty store.
    pub const fn new() -> Self {
        const { assert!(EPH > 0, "an ephemeris store needs at least one slot") };
        EphemerisStore { slots: Vec::new() }
    }

    /// Number of satellites held.
    pub fn len(&self) -> usize {
        self.slots.len()
    }

    /// True when nothing is held.
    pub fn is_empty(&self) -> bool {
        self.slots.is_empty()
    }

    /// The record held for `sat`.
    pub fn get(&self, sat: SatId) -> Option<&StoredEphemeris> {
        self.slots.iter().find(|s| s.eph.sat == sat)
    }

    /// Every held record.
    pub fn iter(&self) -> impl Iterator<Item = &StoredEphemeris> {
        self.slots.iter()
    }

    /// Forgets every record (e.g. after a long sleep when they are all stale).
    pub fn clear(&mut self) {
        self.slots.clear();
    }

    /// Validates and stores `eph` by the rules in the module documentation.
    ///
    /// # Errors
    /// The validation error, or [`EphemerisError::StoreFull`] with the record handed back.
    pub fn ingest(&mut self, eph: BroadcastEphemeris) -> Result<Ingested, EphemerisError> {
        eph.validate()?;
        let new = StoredEphemeris {
            eph,
            toe: eph.toe()?,
            toc: eph.toc()?,
        };
        if let Some(held) = self.slots.iter_mut().find(|s| s.eph.sat == eph.sat) {
            let newer = new.toe > held.toe;
            let reissued = new.toe == held.toe && new.eph.iode != held.eph.iode;
            if newer || reissued {
                *held = new;
                return Ok(Ingested::Replaced);
            }
            return Ok(Ingested::Unchanged);
        }
        match self.slots.push(new) {
            Ok(()) => Ok(Ingested::Added),
            Err(new) => {
                let oldest = self.slots.iter_mut().min_by_key(|s| s.toe);
                match oldest {
                    Some(slot) if slot.toe < new.toe => {
                        let gone = slot.eph.sat;
                        *slot = new;
                        Ok(Ingested::Evicted(gone))
                    }
                    _ => Err(EphemerisError::StoreFull(new.eph)),
                }
            }
        }
    }
}

#[cfg(test)]
#[path = "store_tests.rs"]
mod tests;
