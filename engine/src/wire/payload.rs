//! Payload layouts (little-endian) and their encoders and decoders.
//!
//! Epoch: time (i64 ns, GPS scale), count (u8), then per observation: system (u8), PRN (u8),
//! signal (u8), flags (u8: bit 0 Doppler, bit 1 C/N0, bit 2 lock time present), pseudorange
//! (f64 m), Doppler (f32 Hz), C/N0 (f32 dB-Hz), lock time (f32 s).
//! Ephemeris: system, PRN, week (u16), IODE, IODC, health (u16 each), then 22 f64 in the
//! order of [`FIELDS`]. Ionosphere: α0–α3, β0–β3 as f64.

use super::{Message, WireError, EPHEMERIS_BYTES, EPOCH_HEADER_BYTES, IONO_BYTES, OBS_BYTES};
use crate::corrections::iono::IonoCoefficients;
use crate::measurements::observation::{Epoch, Observation};
use crate::nav::ephemeris::BroadcastEphemeris;
use crate::sat::{SatId, Signal, System};
use crate::time::GnssTime;

/// Names of the ephemeris f64 fields, in wire order.
pub const FIELDS: [&str; 22] = BroadcastEphemeris::FIELD_NAMES;

/// The wire code of a signal.
pub const fn signal_code(s: Signal) -> u8 {
    match s {
        Signal::GpsL1Ca => 1,
        Signal::GpsL1P => 2,
        Signal::GpsL2 => 3,
        Signal::GpsL5 => 4,
        Signal::GalE1 => 10,
        Signal::GalE5a => 11,
        Signal::GalE5b => 12,
        Signal::GalE6 => 13,
        Signal::BdsB1I => 20,
        Signal::BdsB2I => 21,
        Signal::BdsB3I => 22,
    }
}

/// The signal of a wire code.
pub const fn signal_from_code(c: u8) -> Option<Signal> {
    Some(match c {
        1 => Signal::GpsL1Ca,
        2 => Signal::GpsL1P,
        3 => Signal::GpsL2,
        4 => Signal::GpsL5,
        10 => Signal::GalE1,
        11 => Signal::GalE5a,
        12 => Signal::GalE5b,
        13 => Signal::GalE6,
        20 => Signal::BdsB1I,
        21 => Signal::BdsB2I,
        22 => Signal::BdsB3I,
        _ => return None,
    })
}

const fn system_code(s: System) -> u8 {
    match s {
        System::Gps => 1,
        System::Galileo => 2,
        System::Beidou => 3,
    }
}

fn system_from_code(c: u8) -> Result<System, WireError> {
    match c {
        1 => Ok(System::Gps),
        2 => Ok(System::Galileo),
        3 => Ok(System::Beidou),
        _ => Err(WireError::UnknownSystem(c)),
    }
}

/// A checked little-endian reader.
struct Reader<'a> {
    b: &'a [u8],
}

impl<'a> Reader<'a> {
    fn take<const K: usize>(&mut self) -> Result<[u8; K], WireError> {
        let (head, rest) = self.b.split_at_checked(K).ok_or(WireError::PayloadLength)?;
        self.b = rest;
        head.try_into().map_err(|_| WireError::PayloadLength)
    }
    fn u8(&mut self) -> Result<u8, WireError> {
        Ok(self.take::<1>()?[0])
    }
    fn u16(&mut self) -> Result<u16, WireError> {
        Ok(u16::from_le_bytes(self.take()?))
    }
    fn f32(&mut self) -> Result<f32, WireError> {
        Ok(f32::from_le_bytes(self.take()?))
    }
    fn f64(&mut self) -> Result<f64, WireError> {
        Ok(f64::from_le_bytes(self.take()?))
    }
    fn i64(&mut self) -> Result<i64, WireError> {
        Ok(i64::from_le_bytes(self.take()?))
    }
    fn done(&self) -> Result<(), WireError> {
        if self.b.is_empty() {
            Ok(())
        } else {
            Err(WireError::PayloadLength)
        }
    }
}

/// A checked little-endian writer.
struct Writer<'a> {
    b: &'a mut [u8],
    at: usize,
}

impl Writer<'_> {
    fn put(&mut self, bytes: &[u8]) -> Result<(), WireError> {
        let end = self
            .at
            .checked_add(bytes.len())
            .ok_or(WireError::BufferTooSmall)?;
        self.b
            .get_mut(self.at..end)
            .ok_or(WireError::BufferTooSmall)?
            .copy_from_slice(bytes);
        self.at = end;
        Ok(())
    }
}

pub(super) fn decode<const N: usize>(kind: u8, payload: &[u8]) -> Result<Message<N>, WireError> {
    let mut r = Reader { b: payload };
    let msg = match kind {
        1 => {
            let time = GnssTime::from_nanos(r.i64()?);
            let count = r.u8()?;
            if usize::from(count) > N {
                return Err(WireError::TooManyObservations(count));
            }
            let mut epoch = Epoch::new(time);
            for _ in 0..count {
                let system = system_from_code(r.u8()?)?;
                let prn = r.u8()?;
                let code = r.u8()?;
                let signal = signal_from_code(code).ok_or(WireError::UnknownSignal(code))?;
                let flags = r.u8()?;
                let pr = r.f64()?;
                let (dop, cn0, lock) = (r.f32()?, r.f32()?, r.f32()?);
                let obs = Observation {
                    sat: SatId { system, prn },
                    signal,
                    pseudorange_m: pr,
                    doppler_hz: (flags & 1 != 0).then_some(f64::from(dop)),
                    cn0_dbhz: (flags & 2 != 0).then_some(cn0),
                    lock_s: (flags & 4 != 0).then_some(lock),
                };
                epoch
                    .push(obs)
                    .map_err(|_| WireError::TooManyObservations(count))?;
            }
            Message::Epoch(epoch)
        }
        2 => {
            let system = system_from_code(r.u8()?)?;
            let prn = r.u8()?;
            let week = u32::from(r.u16()?);
            let (iode, iodc, health) = (r.u16()?, r.u16()?, r.u16()?);
            let mut v = [0.0f64; 22];
            for x in v.iter_mut() {
                *x = r.f64()?;
            }
            Message::Ephemeris(
                BroadcastEphemeris {
                    sat: SatId { system, prn },
                    week,
                    iode,
                    iodc,
                    health,
                    ..BroadcastEphemeris::default()
                }
                .with_fields(v),
            )
        }
        3 => {
            let mut v = [0.0f64; 8];
            for x in v.iter_mut() {
                *x = r.f64()?;
            }
            let [a0, a1, a2, a3, b0, b1, b2, b3] = v;
            Message::Ionosphere(IonoCoefficients {
                alpha: [a0, a1, a2, a3],
                beta: [b0, b1, b2, b3],
            })
        }
        k => return Err(WireError::UnknownKind(k)),
    };
    r.done()?;
    Ok(msg)
}

/// Writes sync, version, kind and length, calls `body` for the payload, appends the CRC.
fn frame(
    out: &mut [u8],
    kind: u8,
    len: usize,
    body: impl FnOnce(&mut Writer<'_>) -> Result<(), WireError>,
) -> Result<usize, WireError> {
    let len16 = u16::try_from(len).map_err(|_| WireError::BufferTooSmall)?;
    let mut w = Writer { b: out, at: 0 };
    w.put(&super::SYNC)?;
    w.put(&[super::VERSION, kind])?;
    w.put(&len16.to_le_bytes())?;
    body(&mut w)?;
    let crc = super::CRC.checksum(w.b.get(2..w.at).ok_or(WireError::BufferTooSmall)?);
    w.put(&crc.to_le_bytes())?;
    Ok(w.at)
}

/// Encodes an epoch frame into `out`, returning its length.
///
/// # Errors
/// [`WireError::BufferTooSmall`] when `out` cannot hold it.
pub fn encode_epoch<const N: usize>(epoch: &Epoch<N>, out: &mut [u8]) -> Result<usize, WireError> {
    let n = epoch.obs.len();
    let count = u8::try_from(n).map_err(|_| WireError::TooManyObservations(u8::MAX))?;
    frame(
        out,
        1,
        EPOCH_HEADER_BYTES.saturating_add(n.saturating_mul(OBS_BYTES)),
        |w| {
            w.put(&epoch.time.as_nanos().to_le_bytes())?;
            w.put(&[count])?;
            for o in &epoch.obs {
                let flags = u8::from(o.doppler_hz.is_some())
                    | u8::from(o.cn0_dbhz.is_some()) << 1
                    | u8::from(o.lock_s.is_some()) << 2;
                w.put(&[
                    system_code(o.sat.system),
                    o.sat.prn,
                    signal_code(o.signal),
                    flags,
                ])?;
                w.put(&o.pseudorange_m.to_le_bytes())?;
                // Doppler travels as f32: 0.5 mHz resolution at 5 kHz, ample for what it feeds.
                w.put(&(o.doppler_hz.unwrap_or(0.0) as f32).to_le_bytes())?;
                w.put(&o.cn0_dbhz.unwrap_or(0.0).to_le_bytes())?;
                w.put(&o.lock_s.unwrap_or(0.0).to_le_bytes())?;
            }
            Ok(())
        },
    )
}

/// Encodes an ephemeris frame into `out`, returning its length.
///
/// # Errors
/// [`WireError::BufferTooSmall`] when `out` cannot hold it.
pub fn encode_ephemeris(e: &BroadcastEphemeris, out: &mut [u8]) -> Result<usize, WireError> {
    let week = u16::try_from(e.week).map_err(|_| WireError::PayloadLength)?;
    frame(out, 2, EPHEMERIS_BYTES, |w| {
        w.put(&[system_code(e.sat.system), e.sat.prn])?;
        for v in [week, e.iode, e.iodc, e.health] {
            w.put(&v.to_le_bytes())?;
        }
        let v = e.fields();
        for x in v {
            w.put(&x.to_le_bytes())?;
        }
        Ok(())
    })
}

/// Encodes an ionosphere frame into `out`, returning its length.
///
/// # Errors
/// [`WireError::BufferTooSmall`] when `out` cannot hold it.
pub fn encode_iono(k: &IonoCoefficients, out: &mut [u8]) -> Result<usize, WireError> {
    frame(out, 3, IONO_BYTES, |w| {
        for x in k.alpha.iter().chain(k.beta.iter()) {
            w.put(&x.to_le_bytes())?;
        }
        Ok(())
    })
}
