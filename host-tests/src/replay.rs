//! Replays recorded RINEX observations through the engine, feeding navigation records in
//! the order a receiver would have decoded them, and measures errors against a known
//! antenna position.

use crate::metrics::Stats;
use crate::rinex::{NavFile, NavRecord, ObsEpoch, ObsHeader, ObsReader, RinexError};
use std::path::{Path, PathBuf};
use trackfix_engine::{
    Config, Engine, Epoch, Fix, FixOutcome, GnssTime, LocalFrame, NoFixReason, Observation, SatId,
    Signal, System,
};

/// Observations per epoch the replay engine accepts.
pub const REPLAY_N: usize = 64;
/// Ephemeris slots of the replay engine.
pub const REPLAY_EPH: usize = 128;

/// The engine type used by replays.
pub type ReplayEngine = Engine<REPLAY_N, REPLAY_EPH>;

/// A recorded dataset: observations, navigation files and a truth.
#[derive(Clone, Debug)]
pub struct Dataset {
    /// Observation file.
    pub obs: PathBuf,
    /// Navigation files.
    pub nav: Vec<PathBuf>,
    /// Known marker position (ECEF, m); the antenna offset of the header is added.
    pub marker: Option<[f64; 3]>,
}

/// One epoch's outcome.
#[derive(Clone, Debug)]
pub struct EpochResult {
    /// Receiver time tag.
    pub time: GnssTime,
    /// The fix or why not.
    pub outcome: FixOutcome,
    /// East/north/up error of the fix against the truth, m.
    pub enu_error_m: Option<[f64; 3]>,
}

impl EpochResult {
    /// The fix, if any.
    pub fn fix(&self) -> Option<&Fix> {
        match &self.outcome {
            FixOutcome::Fix(f) => Some(f),
            FixOutcome::NoFix(_) => None,
        }
    }

    /// The reason for no fix, if any.
    pub fn no_fix(&self) -> Option<NoFixReason> {
        match self.outcome {
            FixOutcome::NoFix(r) => Some(r),
            FixOutcome::Fix(_) => None,
        }
    }
}

/// Horizontal and vertical error statistics of a run.
#[derive(Clone, Copy, Debug, Default)]
pub struct Accuracy {
    /// Epochs replayed.
    pub epochs: usize,
    /// Epochs with a fix.
    pub fixes: usize,
    /// Horizontal error.
    pub horizontal: Stats,
    /// Absolute vertical error.
    pub vertical: Stats,
}

impl Accuracy {
    /// Statistics of a run's errors.
    pub fn of(results: &[EpochResult]) -> Accuracy {
        let errs: Vec<[f64; 3]> = results.iter().filter_map(|r| r.enu_error_m).collect();
        let h: Vec<f64> = errs.iter().map(|e| e[0].hypot(e[1])).collect();
        let v: Vec<f64> = errs.iter().map(|e| e[2].abs()).collect();
        Accuracy {
            epochs: results.len(),
            fixes: results.iter().filter(|r| r.fix().is_some()).count(),
            horizontal: Stats::of(&h),
            vertical: Stats::of(&v),
        }
    }
}

/// The codes tried for each system, in order of preference, with their C/N0 code.
fn code_choices(system: System) -> &'static [(&'static str, &'static str, Signal)] {
    match system {
        System::Gps => &[("C1C", "S1C", Signal::GpsL1Ca)],
        System::Galileo => &[("C1C", "S1C", Signal::GalE1), ("C1X", "S1X", Signal::GalE1)],
        System::Beidou => &[
            ("C2I", "S2I", Signal::BdsB1I),
            ("C2X", "S2X", Signal::BdsB1I),
            ("C1I", "S1I", Signal::BdsB1I),
        ],
    }
}

/// Converts one RINEX epoch into an engine epoch (first-choice code per satellite;
/// observations beyond the capacity are dropped and counted).
pub fn to_engine_epoch(header: &ObsHeader, e: &ObsEpoch) -> (Epoch<REPLAY_N>, usize) {
    let mut out = Epoch::new(e.time);
    let mut dropped = 0;
    for s in &e.sats {
        let system = match s.system {
            'G' => System::Gps,
            'E' => System::Galileo,
            'C' => System::Beidou,
            _ => continue,
        };
        for (code, snr, signal) in code_choices(system) {
            if let Some(pr) = e.value(header, s, code) {
                let mut o = Observation::code(SatId { system, prn: s.prn }, *signal, pr);
                o.cn0_dbhz = e.value(header, s, snr).map(|v| v as f32);
                if out.push(o).is_err() {
                    dropped += 1;
                }
                break;
            }
        }
    }
    (out, dropped)
}

/// Reads and merges navigation files into transmission order. Galileo records other than
/// I/NAV (whose clock is referenced to E1/E5b, the E1 user's set) are left out.
///
/// # Errors
/// The first reading error.
pub fn load_nav(
    paths: &[PathBuf],
) -> Result<(Vec<NavRecord>, Option<trackfix_engine::IonoCoefficients>), RinexError> {
    let mut all = Vec::new();
    let mut iono = None;
    for p in paths {
        let f = NavFile::read(p)?;
        iono = iono.or(f.iono);
        all.extend(
            f.records
                .into_iter()
                .filter(|r| r.galileo_sources.is_none_or(|s| s & (1 << 9) != 0)),
        );
    }
    all.sort_by_key(|r| r.transmitted);
    Ok((all, iono))
}

/// The antenna reference point: the marker plus the header's H/E/N offset.
pub fn antenna_position(marker: [f64; 3], delta_hen: [f64; 3]) -> [f64; 3] {
    let f = LocalFrame::at_ecef(marker);
    let [e, n, u] = f.axes;
    let [h, de, dn] = delta_hen;
    [0, 1, 2].map(|k| marker[k] + h * u[k] + de * e[k] + dn * n[k])
}

/// Replays a dataset with `config`.
///
/// # Errors
/// The first reading error of any file.
pub fn replay(ds: &Dataset, config: Config) -> Result<Vec<EpochResult>, RinexError> {
    let (nav, iono) = load_nav(&ds.nav)?;
    let reader = ObsReader::open(&ds.obs)?;
    let truth = ds
        .marker
        .map(|m| antenna_position(m, reader.header.antenna_delta_hen));
    let frame = truth.map(LocalFrame::at_ecef);
    let mut engine = Box::new(ReplayEngine::new(config));
    if let Some(k) = iono {
        engine.set_ionosphere(k);
    }
    let header = reader.header.clone();
    let mut next_nav = 0;
    let mut out = Vec::new();
    for e in reader {
        let e = e?;
        while let Some(r) = nav.get(next_nav).filter(|r| r.transmitted <= e.time) {
            // Invalid records are reported by the store and simply not used.
            let _ = engine.ingest_ephemeris(r.eph);
            next_nav += 1;
        }
        let (epoch, _) = to_engine_epoch(&header, &e);
        let Ok(sol) = engine.process(&epoch) else {
            continue;
        };
        let enu_error_m = match (sol.fix(), frame) {
            (Some(f), Some(fr)) => Some(fr.enu(f.ecef_m)),
            _ => None,
        };
        out.push(EpochResult {
            time: sol.time,
            outcome: sol.outcome,
            enu_error_m,
        });
    }
    Ok(out)
}

/// Convenience: a dataset from paths inside a data folder.
pub fn dataset(dir: &Path, obs: &str, nav: &[&str], marker: Option<[f64; 3]>) -> Dataset {
    Dataset {
        obs: dir.join(obs),
        nav: nav.iter().map(|n| dir.join(n)).collect(),
        marker,
    }
}
