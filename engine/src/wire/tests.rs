use super::*;
use crate::measurements::observation::Observation;
use crate::sat::{SatId, Signal};
use crate::time::GnssTime;

// CRC-32/ISO-HDLC check value of the ASCII string "123456789" is 0xCBF43926 (the CRC
// catalogue's published check value [M]; C: Python `zlib.crc32(b"123456789")`).
#[test]
fn crc_check_value() {
    assert_eq!(CRC.checksum(b"123456789"), 0xCBF4_3926);
}

fn epoch(n: usize) -> Epoch<8> {
    let mut e = Epoch::new(GnssTime::from_week_tow(2111, 345_600.5).unwrap());
    for k in 0..n {
        let mut o = Observation::code(
            SatId::gps(k as u8 + 1),
            Signal::GpsL1Ca,
            2.1e7 + k as f64 * 1234.567_891,
        );
        o.cn0_dbhz = Some(41.25);
        if k % 2 == 0 {
            o.doppler_hz = Some(-1234.5);
        }
        e.push(o).unwrap();
    }
    e
}

fn decode_all<const B: usize>(
    d: &mut FrameDecoder<B>,
    bytes: &[u8],
) -> std::vec::Vec<Result<Message<8>, WireError>> {
    let mut out = std::vec::Vec::new();
    for &b in bytes {
        if d.feed(b).is_err() {
            while let Some(m) = d.poll::<8>() {
                out.push(m);
            }
            d.feed(b).unwrap();
        }
        while let Some(m) = d.poll::<8>() {
            out.push(m);
        }
    }
    out
}

extern crate std;

#[test]
fn round_trip_every_kind() {
    let mut buf = [0u8; 512];
    let e = epoch(5);
    let n = encode_epoch(&e, &mut buf).unwrap();
    assert_eq!(n, OVERHEAD + EPOCH_HEADER_BYTES + 5 * OBS_BYTES);
    let mut d: FrameDecoder<{ buffer_for(8) }> = FrameDecoder::new();
    let got = decode_all(&mut d, &buf[..n]);
    assert_eq!(got, [Ok(Message::Epoch(e))]);

    let eph = crate::BroadcastEphemeris {
        sat: SatId::galileo(11),
        week: 2111,
        toe_s: 1234.0,
        sqrt_a: 5440.6,
        e: 1e-4,
        iode: 77,
        iodc: 77,
        health: 0,
        tgd2_s: -2.3e-9,
        ..Default::default()
    };
    let n = encode_ephemeris(&eph, &mut buf).unwrap();
    assert_eq!(decode_all(&mut d, &buf[..n]), [Ok(Message::Ephemeris(eph))]);
    let k = crate::IonoCoefficients {
        alpha: [1.0, 2.0, 3.0, 4.0],
        beta: [5.0, 6.0, 7.0, 8.0],
    };
    let n = encode_iono(&k, &mut buf).unwrap();
    assert_eq!(decode_all(&mut d, &buf[..n]), [Ok(Message::Ionosphere(k))]);
    assert_eq!(d.stats().frames, 3);
}

#[test]
fn resynchronises_after_garbage_and_bad_crc() {
    let mut buf = [0u8; 512];
    let e = epoch(3);
    let n = encode_epoch(&e, &mut buf).unwrap();
    let mut stream = std::vec::Vec::new();
    stream.extend_from_slice(&[0x00, 0xA7, 0x55, 0xA7, 0xA7, 0x13]); // garbage with false starts
    let mut corrupt = buf[..n].to_vec();
    corrupt[20] ^= 0x40; // flips a payload bit: CRC fails
    stream.extend_from_slice(&corrupt);
    stream.extend_from_slice(&buf[..n]);
    let mut d: FrameDecoder<{ buffer_for(8) }> = FrameDecoder::new();
    let got = decode_all(&mut d, &stream);
    assert_eq!(got.first(), Some(&Err(WireError::BadCrc)));
    assert_eq!(got.last(), Some(&Ok(Message::Epoch(e))));
    assert_eq!(d.stats().frames, 1);
}

#[test]
fn oversize_and_unknown_frames_are_named() {
    // Declares 60,000 payload bytes: more than the buffer.
    let big = [0xA7, 0x1C, 1, 1, 0x60, 0xEA];
    let mut d: FrameDecoder<{ buffer_for(8) }> = FrameDecoder::new();
    assert_eq!(
        decode_all(&mut d, &big),
        [Err(WireError::Oversize { declared: 60_000 })]
    );
    let v2 = [0xA7, 0x1C, 2, 1, 0, 0];
    assert_eq!(
        decode_all(&mut d, &v2),
        [Err(WireError::UnsupportedVersion(2))]
    );
    // A well-formed frame of an unknown kind: CRC passes, payload is refused.
    let mut f = std::vec![0xA7, 0x1C, 1, 9, 0, 0];
    let c = CRC.checksum(&f[2..6]).to_le_bytes();
    f.extend_from_slice(&c);
    assert_eq!(decode_all(&mut d, &f), [Err(WireError::UnknownKind(9))]);
}

#[test]
fn epoch_larger_than_capacity_is_refused() {
    let mut big: Epoch<12> = Epoch::new(GnssTime::EPOCH);
    for k in 0..10 {
        big.push(Observation::code(SatId::gps(k + 1), Signal::GpsL1Ca, 2.2e7))
            .unwrap();
    }
    let mut buf = [0u8; 512];
    let n = encode_epoch(&big, &mut buf).unwrap();
    let mut d: FrameDecoder<512> = FrameDecoder::new();
    assert_eq!(
        decode_all(&mut d, &buf[..n]),
        [Err(WireError::TooManyObservations(10))]
    );
}

#[test]
fn encoder_refuses_small_buffers() {
    let mut tiny = [0u8; 20];
    assert_eq!(
        encode_epoch(&epoch(3), &mut tiny),
        Err(WireError::BufferTooSmall)
    );
}
