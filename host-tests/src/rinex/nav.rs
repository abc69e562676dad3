//! RINEX navigation files: GPS LNAV, Galileo I/NAV and F/NAV, BeiDou D1/D2 records and
//! the broadcast ionosphere coefficients. Other systems' records are skipped.

use super::{cols, float_field, gps_time, int_field, version_line, RinexError};
use std::io::BufRead;
use std::path::Path;
use trackfix_engine::{BroadcastEphemeris, GnssTime, IonoCoefficients, SatId, System};

/// One broadcast record and when it was transmitted.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct NavRecord {
    /// The ephemeris, in engine form.
    pub eph: BroadcastEphemeris,
    /// When the message was transmitted (GPS scale): a replay may not use it earlier.
    pub transmitted: GnssTime,
    /// Galileo "data sources" word (bit 0 I/NAV E1-B, bit 1 F/NAV E5a, bit 2 I/NAV E5b,
    /// bit 8 clock for E5a/E1, bit 9 clock for E5b/E1); `None` for other systems.
    pub galileo_sources: Option<u32>,
}

/// A whole navigation file (they are small: a day is a few MB).
#[derive(Clone, Debug, Default)]
pub struct NavFile {
    /// GPS Klobuchar coefficients from the header (`GPSA`/`GPSB` or `ION ALPHA`/`ION BETA`).
    pub iono: Option<IonoCoefficients>,
    /// The records, in file order.
    pub records: Vec<NavRecord>,
}

impl NavFile {
    /// Reads a navigation file.
    ///
    /// # Errors
    /// A [`RinexError`] naming the file, line and field.
    pub fn read(path: &Path) -> Result<NavFile, RinexError> {
        let f = std::fs::File::open(path).map_err(|e| RinexError::new(path, 0, e.to_string()))?;
        Self::parse(std::io::BufReader::new(f), path)
    }

    /// Parses from any reader; `path` only names the source in errors.
    ///
    /// # Errors
    /// A [`RinexError`] naming the file, line and field.
    pub fn parse(reader: impl BufRead, path: &Path) -> Result<NavFile, RinexError> {
        let mut lines = reader.lines().enumerate().map(|(i, l)| (i + 1, l));
        let next = |lines: &mut dyn Iterator<Item = (usize, std::io::Result<String>)>| {
            lines.next().map(|(n, l)| {
                l.map(|l| (n, l))
                    .map_err(|e| RinexError::new(path, n, e.to_string()))
            })
        };
        let (n, first) = next(&mut lines)
            .transpose()?
            .ok_or_else(|| RinexError::new(path, 1, "empty file"))?;
        let (version, kind) = version_line(&first).ok_or_else(|| {
            RinexError::new(path, n, "first line is not a RINEX VERSION / TYPE line")
        })?;
        if kind != 'N' {
            return Err(RinexError::new(
                path,
                n,
                format!("not a navigation file (type {kind:?})"),
            ));
        }
        if !(2.0..5.0).contains(&version) {
            return Err(RinexError::new(
                path,
                n,
                format!("unsupported RINEX version {version}"),
            ));
        }
        let major = version.floor() as u32;
        let mut out = NavFile::default();
        let (mut alpha, mut beta) = (None, None);
        loop {
            let (n, line) = next(&mut lines)
                .transpose()?
                .ok_or_else(|| RinexError::new(path, n, "file ends inside the header"))?;
            let label = cols(&line, 60, 80).trim();
            let nums = |from: usize| -> Result<[f64; 4], RinexError> {
                let mut v = [0.0; 4];
                for (k, x) in v.iter_mut().enumerate() {
                    *x = float_field(cols(&line, from + 12 * k, from + 12 * (k + 1)))
                        .map_err(|e| RinexError::new(path, n, e))?
                        .unwrap_or(0.0);
                }
                Ok(v)
            };
            match label {
                "END OF HEADER" => break,
                "ION ALPHA" => alpha = Some(nums(2)?),
                "ION BETA" => beta = Some(nums(2)?),
                "IONOSPHERIC CORR" if line.starts_with("GPSA") => alpha = Some(nums(5)?),
                "IONOSPHERIC CORR" if line.starts_with("GPSB") => beta = Some(nums(5)?),
                _ => {}
            }
        }
        if let (Some(alpha), Some(beta)) = (alpha, beta) {
            out.iono = Some(IonoCoefficients { alpha, beta });
        }

        // Group lines into records, then parse each.
        let mut record: Vec<(usize, String)> = Vec::new();
        let mut v4_keep = true;
        let mut v4_ion = false;
        let flush =
            |record: &mut Vec<(usize, String)>, keep: bool, ion: bool, out: &mut NavFile| {
                if ion && out.iono.is_none() {
                    out.iono = Some(v4_klobuchar(record, path)?);
                } else if keep && !record.is_empty() {
                    if let Some(r) = parse_record(record, major, path)? {
                        out.records.push(r);
                    }
                }
                record.clear();
                Ok::<(), RinexError>(())
            };
        while let Some(item) = next(&mut lines) {
            let (n, line) = item?;
            if line.trim().is_empty() {
                continue;
            }
            if major >= 4 {
                if let Some(rest) = line.strip_prefix('>') {
                    flush(&mut record, v4_keep, v4_ion, &mut out)?;
                    let mut w = rest.split_whitespace();
                    let kind = w.next().unwrap_or("");
                    let _sat = w.next();
                    let msg = w.next().unwrap_or("");
                    v4_keep =
                        kind == "EPH" && matches!(msg, "LNAV" | "INAV" | "FNAV" | "D1" | "D2");
                    v4_ion = kind == "ION" && msg == "LNAV";
                    continue;
                }
                record.push((n, line));
                continue;
            }
            let starts_record = if major == 2 {
                record.len() == 8
            } else {
                !line.starts_with(' ')
            };
            if starts_record {
                flush(&mut record, true, false, &mut out)?;
            }
            record.push((n, line));
        }
        flush(
            &mut record,
            major < 4 || v4_keep,
            major >= 4 && v4_ion,
            &mut out,
        )?;
        Ok(out)
    }
}

/// The three lines of a RINEX 4 `> ION … LNAV` record: α0–α2 after the epoch, then α3 β0–β2,
/// then β3 (and a region code).
fn v4_klobuchar(record: &[(usize, String)], path: &Path) -> Result<IonoCoefficients, RinexError> {
    let mut v = Vec::with_capacity(8);
    for (k, (start, count)) in [(23, 3), (4, 4), (4, 1)].into_iter().enumerate() {
        let (n, line) = record.get(k).ok_or_else(|| {
            RinexError::new(path, record.first().map_or(0, |r| r.0), "short ION record")
        })?;
        for j in 0..count {
            let f = float_field(cols(line, start + 19 * j, start + 19 * (j + 1)))
                .map_err(|e| RinexError::new(path, *n, e))?
                .ok_or_else(|| RinexError::new(path, *n, "blank Klobuchar coefficient"))?;
            v.push(f);
        }
    }
    Ok(IonoCoefficients {
        alpha: [v[0], v[1], v[2], v[3]],
        beta: [v[4], v[5], v[6], v[7]],
    })
}

/// Parses one record; `None` for a system the engine does not use.
fn parse_record(
    record: &[(usize, String)],
    major: u32,
    path: &Path,
) -> Result<Option<NavRecord>, RinexError> {
    let Some((n0, head)) = record.first() else {
        return Ok(None);
    };
    let n0 = *n0;
    let err = |n: usize, what: String| RinexError::new(path, n, what);
    let (system, prn, date_cols, first_data, cont_data): (
        System,
        i64,
        [(usize, usize); 6],
        usize,
        usize,
    ) = if major == 2 {
        let prn = int_field(cols(head, 0, 2))
            .map_err(|e| err(n0, e))?
            .unwrap_or(0);
        (
            System::Gps,
            prn,
            [(3, 5), (6, 8), (9, 11), (12, 14), (15, 17), (17, 22)],
            22,
            3,
        )
    } else {
        let system = match head.chars().next() {
            Some('G') => System::Gps,
            Some('E') => System::Galileo,
            Some('C') => System::Beidou,
            _ => return Ok(None),
        };
        let prn = int_field(cols(head, 1, 3))
            .map_err(|e| err(n0, e))?
            .unwrap_or(0);
        (
            system,
            prn,
            [(4, 8), (9, 11), (12, 14), (15, 17), (18, 20), (21, 23)],
            23,
            4,
        )
    };
    if record.len() < 8 {
        return Err(err(
            n0,
            format!("record has {} lines, 8 expected", record.len()),
        ));
    }
    let mut date = [0.0f64; 6];
    for (d, (a, b)) in date.iter_mut().zip(date_cols) {
        *d = float_field(cols(head, a, b))
            .map_err(|e| err(n0, e))?
            .ok_or_else(|| err(n0, "blank date field in record start".into()))?;
    }
    let toc_cal = gps_time(
        date[0] as i64,
        date[1] as i64,
        date[2] as i64,
        date[3] as i64,
        date[4] as i64,
        date[5],
    )
    .ok_or_else(|| err(n0, "impossible date in record start".into()))?;
    let mut v: Vec<f64> = Vec::with_capacity(31);
    for (k, (n, line)) in record.iter().take(8).enumerate() {
        let (start, count) = if k == 0 {
            (first_data, 3)
        } else {
            (cont_data, 4)
        };
        for j in 0..count {
            let f = float_field(cols(line, start + 19 * j, start + 19 * (j + 1)))
                .map_err(|e| err(*n, e))?;
            v.push(f.unwrap_or(0.0));
        }
    }
    let g = |i: usize| v.get(i).copied().unwrap_or(0.0);
    let week = g(21);
    if !(0.0..10_000.0).contains(&week) {
        return Err(err(n0, format!("week number {week} out of range")));
    }
    let week = week as u32;
    let prn = u8::try_from(prn).map_err(|_| err(n0, format!("PRN {prn} out of range")))?;
    let (tgd_s, tgd2_s, iodc) = match system {
        System::Gps => (g(25), 0.0, g(26) as u16),
        System::Galileo => (g(26), g(25), g(3) as u16),
        System::Beidou => (g(25), g(26), g(3) as u16),
    };
    let health = match system {
        // E1-B and E5b status bits (DVS and HS): those that concern I/NAV users.
        System::Galileo => (g(24) as u32 & 0b1_1100_0111) as u16,
        _ => g(24) as u16,
    };
    let eph = BroadcastEphemeris {
        sat: SatId { system, prn },
        week,
        toe_s: g(11),
        toc_s: toc_cal.tow_s(),
        af0: g(0),
        af1: g(1),
        af2: g(2),
        iode: g(3) as u16,
        crs: g(4),
        delta_n: g(5),
        m0: g(6),
        cuc: g(7),
        e: g(8),
        cus: g(9),
        sqrt_a: g(10),
        cic: g(12),
        omega0: g(13),
        cis: g(14),
        i0: g(15),
        crc: g(16),
        omega: g(17),
        omega_dot: g(18),
        idot: g(19),
        tgd_s,
        tgd2_s,
        iodc,
        health,
    };
    let toe = eph
        .toe()
        .map_err(|e| err(n0, format!("toe cannot be placed in time: {e:?}")))?;
    let ttx = g(27);
    let transmitted = if ttx.abs() < 1.0e6 {
        let week_start = toe.add_seconds(-eph.toe_s);
        let t = week_start.add_seconds(ttx);
        // Keep within half a week of toe (the week field goes with toe, not with ttx).
        let d = t.seconds_since(toe);
        t.add_seconds(trackfix_engine::time::wrap_half_week(d) - d)
    } else {
        // 0.9999e9 marks "unknown": assume it became available at toe (never earlier).
        toe
    };
    let galileo_sources = (system == System::Galileo).then_some(g(20) as u32);
    Ok(Some(NavRecord {
        eph,
        transmitted,
        galileo_sources,
    }))
}
