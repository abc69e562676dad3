//! Golden wire frames: one frame of each kind, built here byte by byte from the layout in
//! docs/wire-frame.md (fields with `to_le_bytes`, the CRC with the bit-by-bit routine below,
//! written from the CRC-32/ISO-HDLC parameters the document names), independently of the
//! engine's encoder. Each frame must equal the hex dump in the document's "Golden frames"
//! section (read from the file, so the document cannot drift), must be what the engine's
//! encoder writes, and must decode into the values it was built from.

use trackfix_engine::wire::{
    buffer_for, encode_ephemeris, encode_epoch, encode_iono, FrameDecoder, Message,
};
use trackfix_engine::{
    BroadcastEphemeris, Epoch, GnssTime, IonoCoefficients, Observation, SatId, Signal,
};

const DOC: &str = include_str!("../../docs/wire-frame.md");
const N: usize = 12;

/// CRC-32/ISO-HDLC, one bit at a time: polynomial 0x04C11DB7 reflected (0xEDB88320),
/// reflected input and output, initial value and final XOR 0xFFFFFFFF (docs/wire-frame.md).
fn crc32_bitwise(bytes: &[u8]) -> u32 {
    let mut c = 0xFFFF_FFFFu32;
    for &b in bytes {
        c ^= u32::from(b);
        for _ in 0..8 {
            c = if c & 1 != 0 {
                (c >> 1) ^ 0xEDB8_8320
            } else {
                c >> 1
            };
        }
    }
    !c
}

// The catalogue check value of CRC-32/ISO-HDLC: "123456789" → 0xCBF43926 [M; C: Python
// `zlib.crc32(b"123456789")`], so the routine above is the CRC the document names.
#[test]
fn reference_crc_has_the_published_check_value() {
    assert_eq!(crc32_bitwise(b"123456789"), 0xCBF4_3926);
}

/// Sync, version, kind, payload length, payload, CRC of bytes 2..: the frame table of
/// docs/wire-frame.md.
fn frame(kind: u8, payload: &[u8]) -> Vec<u8> {
    let mut f = vec![0xA7, 0x1C, 1, kind];
    f.extend_from_slice(&u16::try_from(payload.len()).unwrap().to_le_bytes());
    f.extend_from_slice(payload);
    let crc = crc32_bitwise(&f[2..]);
    f.extend_from_slice(&crc.to_le_bytes());
    f
}

/// The bytes of the hex dump in the fenced block ```` ```text golden-NAME ````, checking
/// that each line's offset is the running byte count.
fn doc_bytes(name: &str) -> Vec<u8> {
    let open = format!("```text golden-{name}\n");
    let start = DOC
        .find(&open)
        .unwrap_or_else(|| panic!("no {open:?} block"))
        + open.len();
    let len = DOC[start..].find("```").unwrap();
    let mut out = Vec::new();
    for line in DOC[start..start + len].lines() {
        let (hex, field) = line.split_once('|').unwrap_or_else(|| panic!("{line}"));
        assert!(
            !field.trim().is_empty(),
            "a line without a field name: {line}"
        );
        let mut words = hex.split_whitespace();
        let offset: usize = words.next().unwrap().parse().unwrap();
        assert_eq!(offset, out.len(), "offset column in {line}");
        for w in words {
            assert_eq!(w.len(), 2, "{line}");
            out.push(u8::from_str_radix(w, 16).unwrap());
        }
    }
    out
}

fn decode(bytes: &[u8]) -> Message<N> {
    let mut d: FrameDecoder<{ buffer_for(N) }> = FrameDecoder::new();
    for &b in bytes {
        d.feed(b).unwrap();
    }
    let m = d
        .poll::<N>()
        .expect("a whole frame")
        .expect("a valid frame");
    assert!(d.poll::<N>().is_none(), "one frame, nothing left over");
    m
}

// GPS week 2300, TOW 200000.5 s, in nanoseconds since 1980-01-06 on the GPS scale.
const EPOCH_NS: i64 = (2300 * 604_800 + 200_000) * 1_000_000_000 + 500_000_000;

#[test]
fn epoch_frame_is_golden() {
    let mut p = Vec::new();
    p.extend_from_slice(&EPOCH_NS.to_le_bytes());
    // Three observations.
    p.push(3);
    // GPS PRN 5, L1 C/A (1), flags 0b111: Doppler, C/N0 and lock time present.
    p.extend_from_slice(&[1, 5, 1, 0b111]);
    p.extend_from_slice(&21_234_567.125f64.to_le_bytes());
    p.extend_from_slice(&(-1234.5f32).to_le_bytes());
    p.extend_from_slice(&45.25f32.to_le_bytes());
    p.extend_from_slice(&120.5f32.to_le_bytes());
    // Galileo E11, E5a (11), flags 0b010: C/N0 only; absent values travel as 0.
    p.extend_from_slice(&[2, 11, 11, 0b010]);
    p.extend_from_slice(&24_876_543.375f64.to_le_bytes());
    p.extend_from_slice(&0f32.to_le_bytes());
    p.extend_from_slice(&38.75f32.to_le_bytes());
    p.extend_from_slice(&0f32.to_le_bytes());
    // BeiDou C23, B1I (20), flags 0b101: Doppler and lock time.
    p.extend_from_slice(&[3, 23, 20, 0b101]);
    p.extend_from_slice(&22_345_678.5f64.to_le_bytes());
    p.extend_from_slice(&512.25f32.to_le_bytes());
    p.extend_from_slice(&0f32.to_le_bytes());
    p.extend_from_slice(&3.0f32.to_le_bytes());
    assert_eq!(p.len(), 9 + 3 * 24);
    let golden = frame(1, &p);
    assert_eq!(golden.len(), 91);
    assert_eq!(doc_bytes("epoch"), golden, "docs/wire-frame.md epoch dump");

    let mut e: Epoch<N> = Epoch::new(GnssTime::from_nanos(EPOCH_NS));
    assert_eq!(GnssTime::from_week_tow(2300, 200_000.5), Ok(e.time));
    let mut o = Observation::code(SatId::gps(5), Signal::GpsL1Ca, 21_234_567.125);
    o.doppler_hz = Some(-1234.5);
    o.cn0_dbhz = Some(45.25);
    o.lock_s = Some(120.5);
    e.push(o).unwrap();
    let mut o = Observation::code(SatId::galileo(11), Signal::GalE5a, 24_876_543.375);
    o.cn0_dbhz = Some(38.75);
    e.push(o).unwrap();
    let mut o = Observation::code(SatId::beidou(23), Signal::BdsB1I, 22_345_678.5);
    o.doppler_hz = Some(512.25);
    o.lock_s = Some(3.0);
    e.push(o).unwrap();

    let mut buf = [0u8; buffer_for(N)];
    let n = encode_epoch(&e, &mut buf).unwrap();
    assert_eq!(&buf[..n], golden.as_slice(), "encoder");
    assert_eq!(decode(&golden), Message::Epoch(e), "decoder");
}

fn golden_ephemeris() -> BroadcastEphemeris {
    BroadcastEphemeris {
        sat: SatId::gps(31),
        week: 2300,
        toe_s: 201_600.0,
        toc_s: 201_600.0,
        af0: -1.2e-4,
        af1: -3.4e-12,
        af2: 0.0,
        sqrt_a: 5153.65,
        e: 0.0123,
        i0: 0.958,
        idot: 2.5e-10,
        omega0: -1.05,
        omega_dot: -8.1e-9,
        omega: 0.72,
        m0: 1.9,
        delta_n: 4.6e-9,
        cuc: -2.1e-6,
        cus: 8.4e-6,
        crc: 231.5,
        crs: -41.25,
        cic: 1.1e-7,
        cis: -6.5e-8,
        tgd_s: -25.0 / 2f64.powi(31),
        tgd2_s: 0.0,
        iode: 45,
        iodc: 301,
        health: 0,
    }
}

#[test]
fn ephemeris_frame_is_golden() {
    // GPS, PRN 31; week, IODE, IODC, health.
    let mut p = vec![1, 31];
    for v in [2300u16, 45, 301, 0] {
        p.extend_from_slice(&v.to_le_bytes());
    }
    // toe, toc, af0, af1, af2, √A, e, i0, IDOT, Ω0, Ω̇, ω, M0, Δn, Cuc, Cus, Crc, Crs, Cic,
    // Cis, TGD, TGD₂: the order of docs/wire-frame.md.
    for v in [
        201_600.0,
        201_600.0,
        -1.2e-4,
        -3.4e-12,
        0.0,
        5153.65,
        0.0123,
        0.958,
        2.5e-10,
        -1.05,
        -8.1e-9,
        0.72,
        1.9,
        4.6e-9,
        -2.1e-6,
        8.4e-6,
        231.5,
        -41.25,
        1.1e-7,
        -6.5e-8,
        -25.0 / 2f64.powi(31),
        0.0f64,
    ] {
        p.extend_from_slice(&v.to_le_bytes());
    }
    assert_eq!(p.len(), 186);
    let golden = frame(2, &p);
    assert_eq!(golden.len(), 196);
    assert_eq!(
        doc_bytes("ephemeris"),
        golden,
        "docs/wire-frame.md ephemeris dump"
    );

    let eph = golden_ephemeris();
    let mut buf = [0u8; buffer_for(N)];
    let n = encode_ephemeris(&eph, &mut buf).unwrap();
    assert_eq!(&buf[..n], golden.as_slice(), "encoder");
    assert_eq!(decode(&golden), Message::Ephemeris(eph), "decoder");
}

#[test]
fn ionosphere_frame_is_golden() {
    let alpha = [2.0489e-8, 7.4506e-9, -1.1921e-7, 5.9605e-8];
    let beta = [124_930.0, 49_152.0, -196_610.0, -131_070.0];
    let mut p = Vec::new();
    for v in alpha.iter().chain(&beta) {
        p.extend_from_slice(&f64::to_le_bytes(*v));
    }
    assert_eq!(p.len(), 64);
    let golden = frame(3, &p);
    assert_eq!(golden.len(), 74);
    assert_eq!(
        doc_bytes("ionosphere"),
        golden,
        "docs/wire-frame.md ionosphere dump"
    );

    let k = IonoCoefficients { alpha, beta };
    let mut buf = [0u8; buffer_for(N)];
    let n = encode_iono(&k, &mut buf).unwrap();
    assert_eq!(&buf[..n], golden.as_slice(), "encoder");
    assert_eq!(decode(&golden), Message::Ionosphere(k), "decoder");
}
