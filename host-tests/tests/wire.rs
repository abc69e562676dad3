//! The wire-frame decoder on arbitrary input: never panics, and every intact frame that
//! follows garbage is recovered.

use proptest::prelude::*;
use trackfix_engine::wire::{buffer_for, encode_epoch, FrameDecoder, Message};
use trackfix_engine::{Epoch, GnssTime, Observation, SatId, Signal};

const N: usize = 12;

fn frame(k: u8) -> (Epoch<N>, Vec<u8>) {
    let mut e: Epoch<N> = Epoch::new(GnssTime::from_nanos(1_000_000_000 * i64::from(k)));
    for p in 1..=(k % N as u8) {
        e.push(Observation::code(
            SatId::gps(p),
            Signal::GpsL1Ca,
            2.0e7 + f64::from(p),
        ))
        .unwrap();
    }
    let mut buf = vec![0u8; buffer_for(N)];
    let n = encode_epoch(&e, &mut buf).unwrap();
    buf.truncate(n);
    (e, buf)
}

fn run(d: &mut FrameDecoder<{ buffer_for(N) }>, bytes: &[u8]) -> Vec<Epoch<N>> {
    let mut got = Vec::new();
    for &b in bytes {
        while d.feed(b).is_err() {
            if let Some(Ok(Message::Epoch(e))) = d.poll::<N>() {
                got.push(e);
            }
        }
        while let Some(m) = d.poll::<N>() {
            if let Ok(Message::Epoch(e)) = m {
                got.push(e);
            }
        }
    }
    got
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(2000))]
    #[test]
    fn arbitrary_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..2000)) {
        let mut d = FrameDecoder::new();
        let _ = run(&mut d, &bytes);
    }

    // Garbage (without the sync pair, so it cannot hide a frame start) between intact
    // frames: every frame comes out, in order.
    #[test]
    fn frames_survive_garbage(
        parts in proptest::collection::vec((proptest::collection::vec(any::<u8>(), 0..300), any::<u8>()), 1..6)
    ) {
        let mut stream = Vec::new();
        let mut want = Vec::new();
        for (garbage, k) in &parts {
            let clean: Vec<u8> = garbage.iter().map(|b| if *b == 0xA7 { 0 } else { *b }).collect();
            stream.extend_from_slice(&clean);
            let (e, f) = frame(*k);
            stream.extend_from_slice(&f);
            want.push(e);
        }
        let mut d = FrameDecoder::new();
        prop_assert_eq!(run(&mut d, &stream), want);
    }
}
