//! The Trackfix wire frame: measurement epochs, ephemerides and ionosphere coefficients over
//! a serial link, with a length, a version and a CRC-32. Layout in `docs/wire-frame.md`.
//!
//! ```text
//! offset  size  field
//! 0       2     sync 0xA7 0x1C
//! 2       1     version (1)
//! 3       1     kind: 1 epoch, 2 ephemeris, 3 ionosphere
//! 4       2     payload length L, little-endian
//! 6       L     payload
//! 6+L     4     CRC-32/ISO-HDLC of bytes 2..6+L, little-endian
//! ```
//!
//! The decoder ([`FrameDecoder`]) keeps `B` bytes, resynchronises after garbage, refuses
//! frames whose CRC fails or whose declared length exceeds its buffer, and never panics.

mod decoder;
mod payload;

pub use decoder::{DecoderStats, FrameDecoder};
pub use payload::{
    encode_ephemeris, encode_epoch, encode_iono, signal_code, signal_from_code,
    FIELDS as EPHEMERIS_FIELDS,
};

use crate::corrections::iono::IonoCoefficients;
use crate::measurements::observation::Epoch;
use crate::nav::ephemeris::BroadcastEphemeris;

/// First sync byte.
pub const SYNC: [u8; 2] = [0xA7, 0x1C];
/// The frame version this code reads and writes.
pub const VERSION: u8 = 1;
/// Bytes around the payload: sync (2), version (1), kind (1), length (2), CRC (4).
pub const OVERHEAD: usize = 10;
/// Payload bytes of one observation.
pub const OBS_BYTES: usize = 24;
/// Payload bytes of an epoch header (time + count).
pub const EPOCH_HEADER_BYTES: usize = 9;
/// Payload bytes of an ephemeris.
pub const EPHEMERIS_BYTES: usize = 186;
/// Payload bytes of the ionosphere coefficients.
pub const IONO_BYTES: usize = 64;

/// Frame buffer bytes needed for epochs of up to `n` observations (and every other kind).
pub const fn buffer_for(n: usize) -> usize {
    let epoch = EPOCH_HEADER_BYTES.saturating_add(n.saturating_mul(OBS_BYTES));
    let p = if epoch > EPHEMERIS_BYTES {
        epoch
    } else {
        EPHEMERIS_BYTES
    };
    p.saturating_add(OVERHEAD)
}

/// CRC-32/ISO-HDLC (poly 0x04C11DB7, reflected, init and xorout 0xFFFFFFFF; check value of
/// "123456789" = 0xCBF43926), bitwise: no table, 1 KiB of flash saved at ~8 shifts a byte.
pub const CRC: crc::Crc<u32, crc::NoTable> =
    crc::Crc::<u32, crc::NoTable>::new(&crc::CRC_32_ISO_HDLC);

/// Frame kinds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum FrameKind {
    /// A measurement epoch.
    Epoch = 1,
    /// A broadcast ephemeris.
    Ephemeris = 2,
    /// Klobuchar coefficients.
    Ionosphere = 3,
}

/// A decoded frame.
#[derive(Clone, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub enum Message<const N: usize> {
    /// A measurement epoch.
    Epoch(Epoch<N>),
    /// A broadcast ephemeris (not yet validated: the store does that).
    Ephemeris(BroadcastEphemeris),
    /// Klobuchar coefficients.
    Ionosphere(IonoCoefficients),
}

/// What was wrong with a frame or its payload.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum WireError {
    /// The CRC did not match: the frame was dropped and the decoder resynchronised.
    BadCrc,
    /// The declared payload length does not fit the decoder's buffer.
    Oversize {
        /// Declared payload length.
        declared: u16,
    },
    /// A frame version this code does not read.
    UnsupportedVersion(u8),
    /// A frame kind this code does not know.
    UnknownKind(u8),
    /// The payload is shorter or longer than its kind requires.
    PayloadLength,
    /// An epoch holds more observations than the epoch capacity `N`.
    TooManyObservations(u8),
    /// An unknown system code.
    UnknownSystem(u8),
    /// An unknown signal code.
    UnknownSignal(u8),
    /// The destination buffer is too small for the frame being encoded.
    BufferTooSmall,
}

#[cfg(test)]
#[path = "tests.rs"]
mod tests;
