//! Replays recorded RINEX observations through the engine, feeding navigation records in
//! the order a receiver would have decoded them, and measures errors against a known
//! antenna position.

use crate::record::EpochRecord;
use crate::rinex::{NavFile, NavRecord, ObsEpoch, ObsHeader, ObsReader, RinexError};
use std::path::{Path, PathBuf};
use trackfix_engine::{
    Config, Engine, Epoch, GnssTime, LocalFrame, Observation, SatId, Signal, System,
};

/// Observations per epoch the replay engine accepts.
pub const REPLAY_N: usize = 64;
/// Ephemeris slots of the replay engine.
pub const REPLAY_EPH: usize = 128;

/// The engine type used by replays.
pub type ReplayEngine = Engine<REPLAY_N, REPLAY_EPH>;

/// Where the truth of a recorded dataset comes from.
#[derive(Clone, Debug, PartialEq)]
pub enum Truth {
    /// A fixed marker (ECEF, m); the header's antenna offset is added.
    Marker([f64; 3]),
    /// A trajectory of antenna positions, linearly interpolated (see [`read_truth_csv`]).
    Trajectory(Vec<(GnssTime, [f64; 3])>),
}

/// A recorded dataset: observations, navigation files and a truth.
#[derive(Clone, Debug)]
pub struct Dataset {
    /// Observation file.
    pub obs: PathBuf,
    /// Navigation files.
    pub nav: Vec<PathBuf>,
    /// The truth, if known.
    pub truth: Option<Truth>,
}

/// Reads a truth trajectory: a CSV file with a header line and the columns
/// `gps_week,tow_s,x_m,y_m,z_m` (antenna reference point, WGS-84 ECEF), in time order.
/// Lines starting with `#` are comments.
///
/// # Errors
/// A message naming the file, line and field.
pub fn read_truth_csv(path: &Path) -> Result<Vec<(GnssTime, [f64; 3])>, String> {
    let text = std::fs::read_to_string(path).map_err(|e| format!("{}: {e}", path.display()))?;
    let mut out: Vec<(GnssTime, [f64; 3])> = Vec::new();
    let mut header_seen = false;
    for (i, line) in text.lines().enumerate() {
        let n = i + 1;
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        if !header_seen {
            if line.replace(' ', "") != "gps_week,tow_s,x_m,y_m,z_m" {
                return Err(format!(
                    "{}:{n}: header must be gps_week,tow_s,x_m,y_m,z_m",
                    path.display()
                ));
            }
            header_seen = true;
            continue;
        }
        let f: Vec<&str> = line.split(',').map(str::trim).collect();
        if f.len() != 5 {
            return Err(format!(
                "{}:{n}: expected 5 fields, found {}",
                path.display(),
                f.len()
            ));
        }
        let names = ["gps_week", "tow_s", "x_m", "y_m", "z_m"];
        let mut v = [0.0; 5];
        for k in 0..5 {
            v[k] = f[k].parse::<f64>().map_err(|_| {
                format!(
                    "{}:{n}: field {} is not a number: {:?}",
                    path.display(),
                    names[k],
                    f[k]
                )
            })?;
        }
        let t = GnssTime::from_week_tow(v[0] as u32, v[1])
            .map_err(|e| format!("{}:{n}: bad time: {e:?}", path.display()))?;
        if out.last().is_some_and(|(p, _)| *p >= t) {
            return Err(format!("{}:{n}: times must increase", path.display()));
        }
        out.push((t, [v[2], v[3], v[4]]));
    }
    Ok(out)
}

/// The interpolated truth at `t`, if inside the trajectory's span.
pub fn truth_at(traj: &[(GnssTime, [f64; 3])], t: GnssTime) -> Option<[f64; 3]> {
    let i = traj.partition_point(|(tt, _)| *tt <= t);
    let (t1, p1) = traj.get(i.checked_sub(1)?)?;
    if *t1 == t {
        return Some(*p1);
    }
    let (t2, p2) = traj.get(i)?;
    let w = t.seconds_since(*t1) / t2.seconds_since(*t1);
    Some([0, 1, 2].map(|k| p1[k] + w * (p2[k] - p1[k])))
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
                // The Doppler of the same signal: D with the code's band and attribute.
                let doppler = format!("D{}", code.get(1..).unwrap_or(""));
                o.doppler_hz = e.value(header, s, &doppler);
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

/// Replays a dataset with `config`, calling `progress` with the fraction of the file read.
///
/// # Errors
/// The first reading error of any file.
pub fn replay_with_progress(
    ds: &Dataset,
    config: Config,
    mut progress: impl FnMut(f64),
) -> Result<Vec<EpochRecord>, RinexError> {
    let (nav, iono) = load_nav(&ds.nav)?;
    let size = std::fs::metadata(&ds.obs).map_or(1, |m| m.len().max(1));
    let mut reader = ObsReader::open(&ds.obs)?;
    let marker = match &ds.truth {
        Some(Truth::Marker(m)) => Some(antenna_position(*m, reader.header.antenna_delta_hen)),
        _ => None,
    };
    let mut engine = Box::new(ReplayEngine::new(config).map_err(|e| RinexError {
        file: ds.obs.clone(),
        line: 0,
        what: format!("engine configuration refused: {e}"),
    })?);
    // The navigation reader parses every coefficient as a finite number, so this cannot be
    // refused; were it, the fixes would say `IonoCorrection::None`.
    if let Some(k) = iono {
        let _ = engine.set_ionosphere(k);
    }
    let header = reader.header.clone();
    let mut next_nav = 0;
    let mut out = Vec::new();
    while let Some(e) = reader.next() {
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
        let truth = match &ds.truth {
            Some(Truth::Trajectory(t)) => truth_at(t, e.time),
            _ => marker,
        };
        let mut record = EpochRecord::from_solution(&sol, truth, out.is_empty());
        // A marker is a fixed station: its true velocity is zero.
        if marker.is_some() && matches!(ds.truth, Some(Truth::Marker(_))) {
            record.truth_velocity_ecef_mps = Some([0.0; 3]);
        }
        out.push(record);
        if out.len() % 64 == 0 {
            progress(reader.bytes_read() as f64 / size as f64);
        }
    }
    progress(1.0);
    Ok(out)
}

/// Replays a dataset with `config`.
///
/// # Errors
/// The first reading error of any file.
pub fn replay(ds: &Dataset, config: Config) -> Result<Vec<EpochRecord>, RinexError> {
    replay_with_progress(ds, config, |_| {})
}

/// Convenience: a dataset from paths inside a data folder.
pub fn dataset(dir: &Path, obs: &str, nav: &[&str], marker: Option<[f64; 3]>) -> Dataset {
    Dataset {
        obs: dir.join(obs),
        nav: nav.iter().map(|n| dir.join(n)).collect(),
        truth: marker.map(Truth::Marker),
    }
}
