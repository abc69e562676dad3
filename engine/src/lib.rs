//! Trackfix engine: pseudoranges and broadcast ephemerides in, a position fix out, in fixed
//! memory, with no heap, no panics and no clock of its own.
//!
//! Data flows one way, one folder per stage: [`measurements`] (the [`Epoch`]) → [`nav`]
//! (per-satellite state at transmit time from the [`ephemeris`] in the [`store`]) →
//! [`corrections`] ([`iono`], [`tropo`]; satellite clock and Sagnac) → [`snapshot`] (weighted
//! least squares) → [`Solution`]. Only [`engine`] calls the stages, in that order.
//!
//! ```
//! use trackfix_engine::{Config, Engine, Epoch, GnssTime};
//! let mut engine: Engine<12, 32> = Engine::new(Config::default()).unwrap();
//! let epoch: Epoch<12> = Epoch::new(GnssTime::from_week_tow(2111, 345_600.0).unwrap());
//! let solution = engine.process(&epoch).unwrap();
//! assert!(solution.fix().is_none()); // no measurements, no fix, and it says why
//! ```
//!
//! # Panics
//! No public function panics, whatever its input: indexing is checked, integer arithmetic
//! saturates or is checked, and every float path tolerates NaN and infinities (they surface
//! as typed errors or per-satellite statuses).
#![no_std]
#![forbid(unsafe_code)]
#![deny(missing_docs)]
#![cfg_attr(
    test,
    allow(clippy::needless_range_loop, clippy::arithmetic_side_effects)
)]

// Shared ground: identities and constants, time, frames, small linear algebra, the
// configuration, the solution and the wire frame.
pub mod config;
pub mod duration;
mod errors;
pub mod frames;
pub mod linalg;
pub mod sat;
pub mod solution;
pub mod time;
pub(crate) mod trig;
pub mod wire;

// The stages (data flow: measurements → nav → corrections → snapshot) and `engine`, the
// only caller of the stages, which calls them in that order.
pub mod corrections;
pub mod engine;
pub mod filter;
pub mod integrity;
pub mod measurements;
pub mod nav;
pub mod snapshot;

// The modules' earlier flat paths, kept so user code does not change.
pub use corrections::{iono, tropo};
pub use measurements::observation;
pub use nav::{ephemeris, store};

pub use config::Config;
pub use duration::Duration;
pub use engine::{Engine, EpochError, InputError};
pub use ephemeris::{BroadcastEphemeris, EphemerisError, SatState};
pub use frames::{Geodetic, LocalFrame};
pub use iono::IonoCoefficients;
pub use observation::{Epoch, Observation};
pub use sat::{SatId, Signal, System, SPEED_OF_LIGHT};
pub use solution::{
    Dop, DopplerUse, FilterEvent, Fix, FixKind, FixOutcome, FixSource, Flags, Integrity,
    IntegrityState, IonoCorrection, NoFixReason, SatStatus, SatUse, Solution, Velocity,
};
pub use store::{EphemerisStore, Ingested};
pub use time::{GnssTime, TimeError, UtcDateTime};
