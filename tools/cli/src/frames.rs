//! Wire-frame streams for the firmware example: converted from recorded RINEX or from a
//! synthetic scenario, and the host run of such a stream, printing exactly the lines the
//! firmware prints so the two can be compared.

use std::path::Path;
use trackfix_engine::wire::{
    buffer_for, encode_ephemeris, encode_epoch, encode_iono, FrameDecoder, Message,
};
use trackfix_engine::{Engine, Epoch, FixOutcome, Solution};
use trackfix_harness::replay::{load_nav, to_engine_epoch};
use trackfix_harness::rinex::ObsReader;
use trackfix_harness::scenario::generate::{Generator, SCENARIO_IONO};
use trackfix_harness::scenario::parse;

/// Ephemeris slots of the firmware example's engine.
pub const FW_EPH: usize = 16;

fn push_frame(
    out: &mut Vec<u8>,
    f: impl FnOnce(&mut [u8]) -> Result<usize, trackfix_engine::wire::WireError>,
) -> Result<(), String> {
    let mut buf = vec![0u8; 4096];
    let n = f(&mut buf).map_err(|e| format!("encoding: {e:?}"))?;
    out.extend_from_slice(&buf[..n]);
    Ok(())
}

/// Frames from a recorded dataset: the ionosphere, then per epoch the ephemerides of its
/// satellites that have been broadcast by then (as a receiver decodes them from the
/// satellites it tracks), then the epoch with its first `n` observations of the
/// configured signals.
pub fn from_rinex(
    obs: &Path,
    nav: &[std::path::PathBuf],
    systems: [bool; 3],
    n: usize,
    max_epochs: usize,
) -> Result<Vec<u8>, String> {
    let (records, iono) = load_nav(nav).map_err(|e| e.to_string())?;
    let reader = ObsReader::open(obs).map_err(|e| e.to_string())?;
    let header = reader.header.clone();
    let mut out = Vec::new();
    if let Some(k) = iono {
        push_frame(&mut out, |b| encode_iono(&k, b))?;
    }
    let mut sent: Vec<(trackfix_engine::SatId, u16, f64)> = Vec::new();
    for e in reader.take(max_epochs) {
        let e = e.map_err(|e| e.to_string())?;
        let (full, _) = to_engine_epoch(&header, &e);
        let mut epoch: Epoch<64> = Epoch::new(full.time);
        for o in full
            .obs
            .iter()
            .filter(|o| systems[o.sat.system.index()])
            .take(n)
        {
            let _ = epoch.push(*o);
        }
        for o in &epoch.obs {
            // The newest record of this satellite broadcast by now.
            let newest = records
                .iter()
                .filter(|r| r.eph.sat == o.sat && r.transmitted <= e.time)
                .max_by_key(|r| r.transmitted);
            if let Some(r) = newest {
                let key = (r.eph.sat, r.eph.iode, r.eph.toe_s);
                if !sent.contains(&key) {
                    sent.push(key);
                    push_frame(&mut out, |b| encode_ephemeris(&r.eph, b))?;
                }
            }
        }
        push_frame(&mut out, |b| encode_epoch(&epoch, b))?;
    }
    Ok(out)
}

/// Frames from a synthetic open-sky scenario (GPS + Galileo + BeiDou, static): for each
/// count in `counts`, `each` epochs cut to that many observations.
pub fn synthetic(counts: &[usize], each: usize) -> Result<Vec<u8>, String> {
    let spec = parse(
        "seed = 404\nduration_s = 600\norigin = [47.62, 8.91, 412.0]\nsystems = [\"gps\", \"galileo\", \"beidou\"]\n",
        "firmware scenario",
    )?;
    let mut out = Vec::new();
    push_frame(&mut out, |b| encode_iono(&SCENARIO_IONO, b))?;
    let mut gen = Generator::new(&spec)?;
    let mut latest = std::collections::HashMap::new();
    let mut sent = std::collections::HashSet::new();
    for &count in counts {
        let mut done = 0;
        for g in gen.by_ref() {
            for eph in &g.new_ephemerides {
                latest.insert(eph.sat, *eph);
            }
            if g.epoch.obs.len() < count {
                continue;
            }
            let mut e: Epoch<64> = Epoch::new(g.epoch.time);
            for o in g.epoch.obs.iter().take(count) {
                let _ = e.push(*o);
            }
            // The newest set of each satellite in this epoch, once each.
            for o in &e.obs {
                if let Some(eph) = latest.get(&o.sat) {
                    if sent.insert((eph.sat, eph.iode)) {
                        push_frame(&mut out, |b| encode_ephemeris(eph, b))?;
                    }
                }
            }
            push_frame(&mut out, |b| encode_epoch(&e, b))?;
            done += 1;
            if done == each {
                break;
            }
        }
        if done < each {
            return Err(format!("the scenario never shows {count} satellites"));
        }
    }
    Ok(out)
}

/// Runs a frame stream through the engine on the host, printing one line per epoch in the
/// firmware's format.
pub fn run_host<const N: usize>(stream: &[u8]) -> Vec<String> {
    let mut lines = Vec::new();
    let mut engine: Box<Engine<N, FW_EPH>> = Box::new(Engine::with_defaults());
    // A larger buffer than the firmware's decodes the same frames the same way.
    let mut dec: FrameDecoder<{ buffer_for(64) }> = FrameDecoder::new();
    let mut k = 0u32;
    for &b in stream {
        while dec.feed(b).is_err() {
            let _ = dec.poll::<N>();
        }
        while let Some(m) = dec.poll::<N>() {
            match m {
                Ok(Message::Ephemeris(e)) => {
                    let _ = engine.ingest_ephemeris(e);
                }
                Ok(Message::Ionosphere(i)) => {
                    // Refused coefficients leave the model off, as on the target.
                    let _ = engine.set_ionosphere(i);
                }
                Ok(Message::Epoch(e)) => {
                    lines.push(line(k, &e, engine.process(&e).ok().as_ref()));
                    k += 1;
                }
                Err(_) => {}
            }
        }
    }
    lines
}

/// The result lines both sides print: the fix's position bits, then its integrity state and
/// the bits of its horizontal protection level.
pub fn line<const N: usize>(k: u32, e: &Epoch<N>, sol: Option<&Solution<N>>) -> String {
    match sol.map(|s| (&s.outcome, &s.integrity)) {
        Some((FixOutcome::Fix(f), i)) => format!(
            "FIX {k} {} {} {} {} {}\nINTEGRITY {k} {} {}",
            e.obs.len(),
            f.used,
            f.ecef_m[0].to_bits(),
            f.ecef_m[1].to_bits(),
            f.ecef_m[2].to_bits(),
            i.state as u8,
            i.hpl_m.map_or(0, f32::to_bits)
        ),
        _ => format!("NOFIX {k} {}", e.obs.len()),
    }
}
