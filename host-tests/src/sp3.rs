//! SP3-c/d precise orbit files (the IGS product format): satellite positions, km → m.

use crate::rinex::RinexError;
use std::io::BufRead;
use std::path::Path;
use trackfix_engine::{GnssTime, SatId, System};

/// One satellite's precise position at one epoch.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PrecisePosition {
    /// Epoch (GPS scale).
    pub time: GnssTime,
    /// The satellite.
    pub sat: SatId,
    /// ECEF position of the centre of mass, m.
    pub pos: [f64; 3],
    /// Clock offset, s, when given.
    pub clock_s: Option<f64>,
}

/// Reads every position record of GPS, Galileo and BeiDou satellites.
///
/// # Errors
/// A [`RinexError`] naming the file and line.
pub fn read(path: &Path) -> Result<Vec<PrecisePosition>, RinexError> {
    let f = std::fs::File::open(path).map_err(|e| RinexError::new(path, 0, e.to_string()))?;
    let mut out = Vec::new();
    let mut time = None;
    for (i, line) in std::io::BufReader::new(f).lines().enumerate() {
        let n = i + 1;
        let line = line.map_err(|e| RinexError::new(path, n, e.to_string()))?;
        if let Some(rest) = line.strip_prefix("* ") {
            let p: Vec<f64> = rest
                .split_whitespace()
                .filter_map(|s| s.parse().ok())
                .collect();
            let [y, mo, d, h, mi, s] = p[..] else {
                return Err(RinexError::new(path, n, "bad epoch line"));
            };
            time = crate::rinex::gps_time(y as i64, mo as i64, d as i64, h as i64, mi as i64, s);
            continue;
        }
        if !line.starts_with('P') || line.len() < 46 {
            continue;
        }
        let system = match line.as_bytes().get(1) {
            Some(b'G') => System::Gps,
            Some(b'E') => System::Galileo,
            Some(b'C') => System::Beidou,
            _ => continue,
        };
        let prn: u8 = line
            .get(2..4)
            .and_then(|s| s.trim().parse().ok())
            .ok_or_else(|| RinexError::new(path, n, "bad satellite id"))?;
        let v: Vec<f64> = line
            .get(4..)
            .unwrap_or("")
            .split_whitespace()
            .take(4)
            .map(|s| s.parse::<f64>())
            .collect::<Result<_, _>>()
            .map_err(|e| RinexError::new(path, n, e.to_string()))?;
        let (Some(t), &[x, y, z, c]) = (time, &v[..]) else {
            return Err(RinexError::new(
                path,
                n,
                "position record before an epoch or short",
            ));
        };
        out.push(PrecisePosition {
            time: t,
            sat: SatId { system, prn },
            pos: [x * 1e3, y * 1e3, z * 1e3],
            clock_s: (c.abs() < 999_999.0).then_some(c * 1e-6),
        });
    }
    Ok(out)
}
