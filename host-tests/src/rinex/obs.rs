//! RINEX observation files, versions 2.11, 3.x and 4.00, read one epoch at a time.

use super::{cols, float_field, gps_time, int_field, version_line, RinexError};
use std::collections::HashMap;
use std::io::{BufRead, Lines};
use std::path::{Path, PathBuf};
use trackfix_engine::GnssTime;

/// What the observation header says that a replay needs.
#[derive(Clone, Debug, Default)]
pub struct ObsHeader {
    /// RINEX version, e.g. 3.05.
    pub version: f64,
    /// Marker name.
    pub marker: String,
    /// `APPROX POSITION XYZ`, m.
    pub approx_position: Option<[f64; 3]>,
    /// `ANTENNA: DELTA H/E/N`, m: antenna reference point above the marker, east, north.
    pub antenna_delta_hen: [f64; 3],
    /// Observation codes per system letter, as three-letter RINEX 3 codes (RINEX 2 codes are
    /// translated: C1→C1C, P1→C1W, P2→C2W, L1→L1C, D1→D1C, S1→S1C, …).
    pub codes: HashMap<char, Vec<String>>,
}

/// One observation value with its signal-strength indicator.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct ObsValue {
    /// The value (m, cycles, Hz or dB-Hz by code).
    pub value: f64,
    /// Loss-of-lock indicator, if given.
    pub lli: Option<u8>,
}

/// One satellite's observations in an epoch.
#[derive(Clone, Debug, PartialEq)]
pub struct SatObs {
    /// System letter (G, E, C, R, J, S, I).
    pub system: char,
    /// PRN.
    pub prn: u8,
    /// Values in the order of the header's codes for the system.
    pub values: Vec<Option<ObsValue>>,
}

/// One epoch of observations.
#[derive(Clone, Debug, PartialEq)]
pub struct ObsEpoch {
    /// Receiver time tag.
    pub time: GnssTime,
    /// Epoch flag (0 = OK, 1 = power failure before this epoch).
    pub flag: u8,
    /// The satellites.
    pub sats: Vec<SatObs>,
}

impl ObsEpoch {
    /// The value of `code` for a satellite, using the header's code order.
    pub fn value(&self, header: &ObsHeader, sat: &SatObs, code: &str) -> Option<f64> {
        let list = header.codes.get(&sat.system)?;
        let i = list.iter().position(|c| c == code)?;
        sat.values.get(i).copied().flatten().map(|v| v.value)
    }
}

/// Streaming reader: the header on open, then one epoch per `next()`.
pub struct ObsReader<R: BufRead> {
    lines: Lines<R>,
    line_no: usize,
    bytes: u64,
    path: PathBuf,
    /// The header.
    pub header: ObsHeader,
    done: bool,
}

impl ObsReader<std::io::BufReader<std::fs::File>> {
    /// Opens a file and reads its header.
    ///
    /// # Errors
    /// A [`RinexError`] naming the file, line and field.
    pub fn open(path: &Path) -> Result<Self, RinexError> {
        let f = std::fs::File::open(path).map_err(|e| RinexError::new(path, 0, e.to_string()))?;
        Self::new(std::io::BufReader::new(f), path)
    }
}

fn v2_code(c: &str) -> String {
    let map = [
        ("C1", "C1C"),
        ("P1", "C1W"),
        ("P2", "C2W"),
        ("C2", "C2C"),
        ("C5", "C5X"),
        ("L1", "L1C"),
        ("L2", "L2W"),
        ("L5", "L5X"),
        ("D1", "D1C"),
        ("D2", "D2W"),
        ("D5", "D5X"),
        ("S1", "S1C"),
        ("S2", "S2W"),
        ("S5", "S5X"),
    ];
    map.iter()
        .find(|(a, _)| *a == c)
        .map_or_else(|| c.to_string(), |(_, b)| (*b).to_string())
}

impl<R: BufRead> ObsReader<R> {
    /// Reads the header from `reader`; `path` names the source in errors.
    ///
    /// # Errors
    /// A [`RinexError`] naming the file, line and field.
    pub fn new(reader: R, path: &Path) -> Result<Self, RinexError> {
        let mut me = ObsReader {
            lines: reader.lines(),
            line_no: 0,
            bytes: 0,
            path: path.to_path_buf(),
            header: ObsHeader::default(),
            done: false,
        };
        let first = me.next_line()?.ok_or_else(|| me.err("empty file"))?;
        let (version, kind) = version_line(&first)
            .ok_or_else(|| me.err("first line is not a RINEX VERSION / TYPE line"))?;
        if kind != 'O' {
            return Err(me.err(format!("not an observation file (type {kind:?})")));
        }
        if !(2.0..5.0).contains(&version) {
            return Err(me.err(format!("unsupported RINEX version {version}")));
        }
        me.header.version = version;
        let mut v2_codes: Vec<String> = Vec::new();
        let mut v2_expected = 0usize;
        let mut v3_sys: Option<(char, usize)> = None;
        loop {
            let line = me
                .next_line()?
                .ok_or_else(|| me.err("file ends inside the header"))?;
            let label = cols(&line, 60, 80).trim().to_string();
            match label.as_str() {
                "END OF HEADER" => break,
                "MARKER NAME" => me.header.marker = cols(&line, 0, 60).trim().to_string(),
                "APPROX POSITION XYZ" => me.header.approx_position = Some(me.three(&line)?),
                "ANTENNA: DELTA H/E/N" => me.header.antenna_delta_hen = me.three(&line)?,
                "# / TYPES OF OBSERV" => {
                    if v2_codes.is_empty() {
                        v2_expected = me.int(cols(&line, 0, 6))? as usize;
                    }
                    for k in 0..9 {
                        let c = cols(&line, 10 + 6 * k, 12 + 6 * k).trim();
                        if !c.is_empty() {
                            v2_codes.push(v2_code(c));
                        }
                    }
                }
                "SYS / # / OBS TYPES" => {
                    let letter = line.chars().next().unwrap_or(' ');
                    if letter != ' ' {
                        let n = me.int(cols(&line, 3, 6))? as usize;
                        v3_sys = Some((letter, n));
                        me.header.codes.insert(letter, Vec::new());
                    }
                    let Some((letter, _)) = v3_sys else {
                        return Err(me.err("obs types continuation without a system"));
                    };
                    let list = me.header.codes.entry(letter).or_default();
                    for k in 0..13 {
                        let c = cols(&line, 7 + 4 * k, 10 + 4 * k).trim();
                        if !c.is_empty() {
                            list.push(c.to_string());
                        }
                    }
                }
                _ => {}
            }
        }
        if version < 3.0 {
            if v2_codes.len() != v2_expected || v2_codes.is_empty() {
                return Err(me.err(format!(
                    "header lists {} observation types but announces {v2_expected}",
                    v2_codes.len()
                )));
            }
            for s in ['G', 'R', 'E', 'S', 'C', 'J', 'I'] {
                me.header.codes.insert(s, v2_codes.clone());
            }
        } else if me.header.codes.is_empty() {
            return Err(me.err("header has no SYS / # / OBS TYPES line"));
        }
        for (letter, n) in me.header.codes.iter().map(|(k, v)| (*k, v.len())) {
            if n == 0 {
                return Err(me.err(format!("system {letter} has no observation types")));
            }
        }
        Ok(me)
    }

    /// Bytes read so far (for progress reports).
    pub fn bytes_read(&self) -> u64 {
        self.bytes
    }

    fn err(&self, what: impl Into<String>) -> RinexError {
        RinexError::new(&self.path, self.line_no, what)
    }

    fn next_line(&mut self) -> Result<Option<String>, RinexError> {
        match self.lines.next() {
            None => Ok(None),
            Some(Ok(l)) => {
                self.line_no += 1;
                self.bytes += l.len() as u64 + 1;
                Ok(Some(l))
            }
            Some(Err(e)) => Err(self.err(e.to_string())),
        }
    }

    fn int(&self, s: &str) -> Result<i64, RinexError> {
        int_field(s)
            .map_err(|e| self.err(e))?
            .ok_or_else(|| self.err("blank integer field"))
    }

    fn three(&self, line: &str) -> Result<[f64; 3], RinexError> {
        let mut v = [0.0; 3];
        for (k, x) in v.iter_mut().enumerate() {
            *x = float_field(cols(line, 14 * k, 14 * (k + 1)))
                .map_err(|e| self.err(e))?
                .unwrap_or(0.0);
        }
        Ok(v)
    }

    fn obs_fields(
        &self,
        line: &str,
        count: usize,
        out: &mut Vec<Option<ObsValue>>,
    ) -> Result<(), RinexError> {
        for k in 0..count {
            let f = cols(line, 16 * k, 16 * k + 14);
            let value = float_field(f).map_err(|e| self.err(e))?;
            let lli = cols(line, 16 * k + 14, 16 * k + 15)
                .trim()
                .parse::<u8>()
                .ok();
            out.push(value.map(|value| ObsValue { value, lli }));
        }
        Ok(())
    }

    fn read_epoch(&mut self) -> Result<Option<ObsEpoch>, RinexError> {
        loop {
            let Some(line) = self.next_line()? else {
                return Ok(None);
            };
            if line.trim().is_empty() {
                continue;
            }
            let v3 = self.header.version >= 3.0;
            let (date_cols, flag_col, n_cols): ([(usize, usize); 6], usize, (usize, usize)) = if v3
            {
                if !line.starts_with('>') {
                    return Err(self.err("expected an epoch line starting with '>'"));
                }
                (
                    [(2, 6), (7, 9), (10, 12), (13, 15), (16, 18), (18, 29)],
                    31,
                    (32, 35),
                )
            } else {
                (
                    [(1, 3), (4, 6), (7, 9), (10, 12), (13, 15), (15, 26)],
                    28,
                    (29, 32),
                )
            };
            let flag = self.int(cols(&line, flag_col, flag_col + 1))? as u8;
            let count = self.int(cols(&line, n_cols.0, n_cols.1))?;
            let count = usize::try_from(count).map_err(|_| self.err("negative satellite count"))?;
            if flag >= 2 && flag != 6 {
                // Event: `count` header-type lines follow.
                for _ in 0..count {
                    self.next_line()?
                        .ok_or_else(|| self.err("file ends inside an event record"))?;
                }
                continue;
            }
            let mut d = [0.0f64; 6];
            for (x, (a, b)) in d.iter_mut().zip(date_cols) {
                *x = float_field(cols(&line, a, b))
                    .map_err(|e| self.err(e))?
                    .ok_or_else(|| self.err("blank date field in epoch line"))?;
            }
            let time = gps_time(
                d[0] as i64,
                d[1] as i64,
                d[2] as i64,
                d[3] as i64,
                d[4] as i64,
                d[5],
            )
            .ok_or_else(|| self.err("impossible epoch date"))?;
            let mut ids: Vec<(char, u8)> = Vec::with_capacity(count);
            if !v3 {
                let mut l = line.clone();
                for k in 0..count {
                    if k > 0 && k % 12 == 0 {
                        l = self
                            .next_line()?
                            .ok_or_else(|| self.err("file ends in satellite list"))?;
                    }
                    let s = cols(&l, 32 + 3 * (k % 12), 35 + 3 * (k % 12));
                    ids.push(self.sat_id(s)?);
                }
            }
            let mut sats = Vec::with_capacity(count);
            for k in 0..count {
                let mut values = Vec::new();
                let (system, prn, n_codes) = if v3 {
                    let l = self
                        .next_line()?
                        .ok_or_else(|| self.err("file ends inside an epoch"))?;
                    let (system, prn) = self.sat_id(cols(&l, 0, 3))?;
                    let n = self.header.codes.get(&system).map_or(0, Vec::len);
                    let rest = cols(&l, 3, l.len()).to_string();
                    self.obs_fields(&rest, n, &mut values)?;
                    (system, prn, n)
                } else {
                    let (system, prn) = ids.get(k).copied().unwrap_or((' ', 0));
                    let n = self.header.codes.get(&system).map_or(0, Vec::len);
                    let mut left = n;
                    while left > 0 {
                        let l = self
                            .next_line()?
                            .ok_or_else(|| self.err("file ends inside an epoch"))?;
                        let take = left.min(5);
                        self.obs_fields(&l, take, &mut values)?;
                        left -= take;
                    }
                    (system, prn, n)
                };
                if n_codes == 0 {
                    return Err(
                        self.err(format!("satellite of system {system:?} not in the header"))
                    );
                }
                if flag != 6 {
                    sats.push(SatObs {
                        system,
                        prn,
                        values,
                    });
                }
            }
            if flag == 6 {
                continue;
            }
            return Ok(Some(ObsEpoch { time, flag, sats }));
        }
    }

    fn sat_id(&self, s: &str) -> Result<(char, u8), RinexError> {
        let mut ch = s.chars();
        let first = ch.next().unwrap_or(' ');
        let (system, rest) = if first == ' ' || first.is_ascii_digit() {
            ('G', s) // RINEX 2: a blank system letter means GPS
        } else {
            (first, ch.as_str())
        };
        let prn = rest
            .trim()
            .parse::<u8>()
            .map_err(|_| self.err(format!("bad satellite identifier {s:?}")))?;
        Ok((system, prn))
    }
}

impl<R: BufRead> Iterator for ObsReader<R> {
    type Item = Result<ObsEpoch, RinexError>;

    fn next(&mut self) -> Option<Self::Item> {
        if self.done {
            return None;
        }
        let r = self.read_epoch().transpose();
        if matches!(r, None | Some(Err(_))) {
            self.done = true;
        }
        r
    }
}
