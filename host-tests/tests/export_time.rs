//! Exported UTC time stamps against astropy (a general-purpose astronomy library on PyPI)
//! [C: astropy 7.1.1 with its bundled leap-second table, pinned in
//! tools/refvectors/requirements.txt]. tools/refvectors/gen_times.py converts a handful of
//! GPS instants (GPS-week boundaries, the first second after the 2016-12-31 leap second, UTC
//! year ends, a leap day, recent dates) to UTC and writes the GPS − UTC offset, the ISO 8601
//! stamp and the NMEA time and date fields; `cargo xtask test` regenerates the file and fails
//! on any difference when Python is present.
//!
//! Each instant goes through every writer that prints a time: NMEA GGA, RMC (time and date)
//! and GST, with and without a fix; the GPX `<time>` of the metadata and of the track point;
//! the CSV `gps_week`, `tow_s` and `utc` columns; the GeoJSON `times_utc`, `start_utc` and
//! `end_utc` properties. Tolerance: exact (the instants are whole hundredths of a second,
//! so every printed field is exact).

use trackfix_engine::{FixKind, GnssTime, IonoCorrection};
use trackfix_harness::export::{csv, geojson, gpx, iso8601, nmea, GPS_MINUS_UTC_S};
use trackfix_harness::metrics::Summary;
use trackfix_harness::record::{EpochRecord, FixSummary};

const VECTORS: &str = include_str!("../../tools/refvectors/times_astropy.csv");

struct Row {
    week: u32,
    tow_s: f64,
    gps_minus_utc_s: i32,
    iso: String,
    nmea_time: String,
    nmea_date: String,
    note: String,
}

fn rows() -> Vec<Row> {
    assert!(VECTORS.starts_with("# generator: tools/refvectors/gen_times.py; library: astropy"));
    let rows: Vec<Row> = VECTORS
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| {
            let f: Vec<&str> = l.splitn(7, ',').collect();
            Row {
                week: f[0].parse().unwrap(),
                tow_s: f[1].parse().unwrap(),
                gps_minus_utc_s: f[2].parse().unwrap(),
                iso: f[3].to_string(),
                nmea_time: f[4].to_string(),
                nmea_date: f[5].to_string(),
                note: f[6].to_string(),
            }
        })
        .collect();
    assert!(rows.len() >= 10, "only {} vectors", rows.len());
    rows
}

fn record(time: GnssTime, with_fix: bool) -> EpochRecord {
    let fix = FixSummary {
        kind: FixKind::ThreeD,
        ecef_m: [4_331_297.0, 567_555.0, 4_633_134.0],
        lat_lon_h: [46.9, 7.46, 560.0],
        enu_error_m: None,
        hdop: 0.9,
        vdop: 1.4,
        pdop: 1.7,
        sigma_enu_m: [1.0, 1.2, 2.0],
        used: 9,
        residual_rms_m: 0.8,
        iono: IonoCorrection::Klobuchar,
        velocity_enu_mps: None,
        velocity_sigma_enu_mps: None,
        source: trackfix_engine::FixSource::Snapshot,
    };
    EpochRecord {
        time,
        truth_ecef_m: None,
        fix: with_fix.then_some(fix),
        no_fix: None,
        wake_start: false,
        truth_velocity_ecef_mps: None,
        filter_event: trackfix_engine::FilterEvent::None,
        integrity: trackfix_engine::Integrity::default(),
        reflected_truth: vec![],
        sats: vec![],
    }
}

/// The comma-separated fields of the NMEA sentence of type `kind` (e.g. "GGA"), without
/// the checksum.
fn nmea_fields(text: &str, kind: &str) -> Vec<String> {
    let line = text
        .lines()
        .find(|l| l.get(3..6) == Some(kind))
        .unwrap_or_else(|| panic!("no {kind} in {text}"));
    let body = &line[1..line.find('*').unwrap()];
    body.split(',').map(str::to_string).collect()
}

/// Every `<time>` element of a GPX document.
fn gpx_times(doc: &str) -> Vec<&str> {
    doc.split("<time>")
        .skip(1)
        .map(|s| &s[..s.find("</time>").unwrap()])
        .collect()
}

#[test]
fn the_offset_in_use_is_astropys_for_every_instant() {
    for r in rows() {
        assert_eq!(
            GPS_MINUS_UTC_S, r.gps_minus_utc_s,
            "GPS − UTC at week {} TOW {} ({})",
            r.week, r.tow_s, r.note
        );
    }
}

#[test]
fn nmea_time_and_date_match_astropy() {
    for r in rows() {
        let t = GnssTime::from_week_tow(r.week, r.tow_s).unwrap();
        let ctx = format!("week {} TOW {} ({})", r.week, r.tow_s, r.note);
        for with_fix in [true, false] {
            let text = nmea::write_run(&[record(t, with_fix)]);
            let gga = nmea_fields(&text, "GGA");
            let rmc = nmea_fields(&text, "RMC");
            assert_eq!(gga[1], r.nmea_time, "GGA time, fix {with_fix}, {ctx}");
            assert_eq!(rmc[1], r.nmea_time, "RMC time, fix {with_fix}, {ctx}");
            assert_eq!(rmc[9], r.nmea_date, "RMC date, fix {with_fix}, {ctx}");
            if with_fix {
                let gst = nmea_fields(&text, "GST");
                assert_eq!(gst[1], r.nmea_time, "GST time, {ctx}");
            }
        }
    }
}

#[test]
fn gpx_times_match_astropy() {
    for r in rows() {
        let t = GnssTime::from_week_tow(r.week, r.tow_s).unwrap();
        let doc = gpx::write_run("t", &[record(t, true)]);
        // The metadata time (first record) and the track point's time.
        assert_eq!(gpx_times(&doc), [r.iso.as_str(); 2], "{}", r.note);
        assert_eq!(iso8601(t), r.iso, "{}", r.note);
    }
}

#[test]
fn csv_week_tow_and_utc_match_astropy() {
    for r in rows() {
        let t = GnssTime::from_week_tow(r.week, r.tow_s).unwrap();
        for with_fix in [true, false] {
            let doc = csv::write_run(&[record(t, with_fix)]);
            let mut lines = doc.lines();
            assert_eq!(lines.next(), Some(csv::HEADER));
            let cols: Vec<&str> = lines.next().unwrap().split(',').collect();
            assert_eq!(cols[0], r.week.to_string(), "{}", r.note);
            assert_eq!(cols[1], format!("{:.3}", r.tow_s), "{}", r.note);
            assert_eq!(cols[2], r.iso, "{}", r.note);
        }
    }
}

#[test]
fn geojson_times_match_astropy() {
    let rows = rows();
    let records: Vec<EpochRecord> = rows
        .iter()
        .map(|r| record(GnssTime::from_week_tow(r.week, r.tow_s).unwrap(), true))
        .collect();
    let doc = geojson::write_run("t", &records, &Summary::of(&records));
    let v: serde_json::Value = serde_json::from_str(&doc).unwrap();
    let p = &v["features"][0]["properties"];
    let times: Vec<&str> = p["times_utc"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| t.as_str().unwrap())
        .collect();
    let want: Vec<&str> = rows.iter().map(|r| r.iso.as_str()).collect();
    assert_eq!(times, want);
    assert_eq!(p["start_utc"], want[0]);
    assert_eq!(p["end_utc"], want[want.len() - 1]);
}

// NMEA time fields never show 60 seconds: 23:59:59.996 is 235959.99, not 235960.00
// (NMEA 0183 hhmmss.ss; seconds 00–59 outside a leap second, common practice).
#[test]
fn nmea_seconds_are_truncated_not_rounded_up() {
    assert_eq!(nmea::time_field(23, 59, 59.996, 2), "235959.99");
    assert_eq!(nmea::time_field(12, 35, 19.0, 2), "123519.00");
    assert_eq!(nmea::time_field(12, 35, 19.34, 2), "123519.34");
}
