//! Satellite, clock, group-delay, atmosphere and time-scale models against reference vectors
//! computed outside the engine, without recorded data.
//!
//! The vectors come from tools/refvectors/gen_models.py: an implementation written apart from
//! the engine, straight from the interface specifications (IS-GPS-200 §20.3.3.3.3 and Table
//! 20-IV, §20.3.3.5.2.5; Galileo OS SIS ICD §5.1.1, §5.1.2, §5.1.5; BeiDou B1I ICD §5.2.4.1,
//! §5.2.4.10, §5.2.4.12), in Python float64, plus astropy (pinned in requirements.txt, with its
//! bundled leap-second table) for the time scales. The broadcast records are the published
//! examples of the RINEX 3.04 format description (IGS/RTCM, 2018-11-23): GPS G01 (Table A11),
//! Galileo E12 (Table A9) and BeiDou GEO C01 (Table A15) [V], with af2 set to stated non-zero
//! values because all three print af2 = 0; a BeiDou MEO record is invented. The generator also
//! asserts the values of CHECKS.md (worked PRN 31 position, Klobuchar, Saastamoinen, mapping,
//! GPS time examples) at the precision they were printed. `cargo xtask test` regenerates the
//! file and fails on any difference when Python is present.
//!
//! Tolerances: 1 mm in position, 1e-12 s (0.3 mm of range) in clock terms and group delays,
//! 1e-12 rad in eccentric anomaly, 0.1 mm for the Klobuchar model in double precision and
//! 1 mm in single precision, 1 µm for zenith delays, 1e-9 for the mapping function, exact
//! nanoseconds for time scales.

use std::collections::HashMap;
use trackfix_engine::tropo::{mapping, ZenithDelay};
use trackfix_engine::{
    BroadcastEphemeris, GnssTime, IonoCoefficients, SatId, Signal, System, UtcDateTime,
};

const VECTORS: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/../tools/refvectors/models_reference.csv"
));

/// The rows of one kind, as fields after the kind.
fn rows(kind: &str) -> Vec<Vec<&'static str>> {
    let rows: Vec<Vec<&str>> = VECTORS
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
        .map(|l| l.split(',').collect::<Vec<_>>())
        .filter(|f| f[0] == kind)
        .map(|f| f[1..].to_vec())
        .collect();
    assert!(!rows.is_empty(), "no {kind} rows");
    rows
}

fn num(s: &str) -> f64 {
    s.parse().unwrap_or_else(|_| panic!("not a number: {s}"))
}

fn int<T: std::str::FromStr>(s: &str) -> T {
    s.parse()
        .ok()
        .unwrap_or_else(|| panic!("not an integer: {s}"))
}

fn system(code: &str) -> System {
    match code {
        "G" => System::Gps,
        "E" => System::Galileo,
        "C" => System::Beidou,
        _ => panic!("unknown system {code}"),
    }
}

/// The broadcast records of the vector file, by name.
fn records() -> HashMap<&'static str, BroadcastEphemeris> {
    rows("record")
        .into_iter()
        .map(|f| {
            let v: Vec<f64> = f[4..].iter().map(|s| num(s)).collect();
            let prn: u8 = int(f[2]);
            let sat = match system(f[1]) {
                System::Gps => SatId::gps(prn),
                System::Galileo => SatId::galileo(prn),
                System::Beidou => SatId::beidou(prn),
            };
            let eph = BroadcastEphemeris {
                sat,
                week: int(f[3]),
                toe_s: v[0],
                toc_s: v[1],
                af0: v[2],
                af1: v[3],
                af2: v[4],
                sqrt_a: v[5],
                e: v[6],
                i0: v[7],
                idot: v[8],
                omega0: v[9],
                omega_dot: v[10],
                omega: v[11],
                m0: v[12],
                delta_n: v[13],
                cuc: v[14],
                cus: v[15],
                crc: v[16],
                crs: v[17],
                cic: v[18],
                cis: v[19],
                tgd_s: v[20],
                tgd2_s: v[21],
                ..Default::default()
            };
            assert_eq!(eph.validate(), Ok(()), "{}", f[0]);
            (f[0], eph)
        })
        .collect()
}

/// An instant given as week and time of week in the satellite's own time scale (Galileo
/// weeks as in RINEX, continuous with GPS weeks).
fn system_time(sys: System, week: u32, tow: f64) -> GnssTime {
    match sys {
        System::Gps | System::Galileo => GnssTime::from_week_tow(week, tow).unwrap(),
        System::Beidou => GnssTime::from_bdt(week, tow).unwrap(),
    }
}

fn assert_close(got: f64, want: f64, tol: f64, what: &str) {
    assert!(
        (got - want).abs() <= tol,
        "{what}: engine {got:e}, reference {want:e}, difference {:e} > {tol:e}",
        got - want
    );
}

// IS-GPS-200 Table 20-IV (μ, Ω̇e) and §20.3.3.3.3.1 (F = −2√μ/c²); Galileo OS SIS ICD §5.1.1;
// BeiDou B1I ICD §5.2.4.12 [V: GPS μ and Ω̇e, Galileo μ, as noted in CHECKS.md; M: the rest];
// F computed by gen_models.py [C]. μ and Ω̇e exact; F to 1e-19 s/√m (the engine types F to
// 10 significant digits: 1e-19 × e√A ≈ 3e-18 s of clock).
#[test]
fn orbit_constants_match_the_icds() {
    for f in rows("const") {
        let c = system(f[0]).constants();
        assert_eq!(c.mu, num(f[1]), "μ of {}", f[0]);
        assert_eq!(c.omega_e, num(f[2]), "Ω̇e of {}", f[0]);
        assert_close(c.f_rel, num(f[3]), 1e-19, &format!("F of {}", f[0]));
    }
}

/// Every orbit row evaluated by the engine: (record name, row, engine state).
fn evaluated() -> Vec<(&'static str, Vec<&'static str>, trackfix_engine::SatState)> {
    let recs = records();
    rows("orbit")
        .into_iter()
        .map(|f| {
            let eph = recs[f[0]];
            let t = system_time(eph.sat.system, int(f[1]), num(f[2]));
            let tk = t.seconds_since(eph.toe().unwrap());
            let dt_toc = t.seconds_since(eph.toc().unwrap());
            // The engine's own time arithmetic (week crossings, BDT and GST weeks) gives the
            // generator's t − toe and t − toc to the nanosecond.
            assert_close(tk, num(f[3]), 1e-9, &format!("{} t − toe", f[0]));
            assert_close(dt_toc, num(f[4]), 1e-9, &format!("{} t − toc", f[0]));
            (f[0], f, eph.evaluate(tk, dt_toc))
        })
        .collect()
}

// Source: IS-GPS-200 Table 20-IV (GPS, and Galileo and BeiDou MEO with their μ and Ω̇e), the
// BeiDou GEO rule Rz(Ω̇e·tk)·Rx(−5°) of the B1I ICD §5.2.4.12, on the RINEX 3.04 records
// [V], the invented BeiDou MEO and the CHECKS.md PRN 31 and week-910 records; reference
// positions computed by gen_models.py [C]. Tolerance 1 mm per axis, Ek 1e-12 rad.
#[test]
fn satellite_positions_match_the_icd_algorithm_for_gps_galileo_beidou_meo_and_geo() {
    let mut worst: f64 = 0.0;
    let mut names = Vec::new();
    for (name, f, s) in evaluated() {
        for k in 0..3 {
            assert_close(
                s.pos[k],
                num(f[5 + k]),
                1e-3,
                &format!("{name} axis {k} at {}", f[3]),
            );
            worst = worst.max((s.pos[k] - num(f[5 + k])).abs());
        }
        assert_close(s.ecc_anomaly, num(f[8]), 1e-12, &format!("{name} Ek"));
        names.push(name);
    }
    println!("worst axis difference {worst:.2e} m");
    for name in [
        "G01_rinex304_A11",
        "E12_rinex304_A9",
        "C01_rinex304_A15_geo",
        "C11_invented_meo",
        "G31_worked",
        "G01_week910",
    ] {
        assert!(names.contains(&name), "no orbit rows for {name}");
    }
}

// Source: IS-GPS-200 §20.3.3.3.3.1: Δt_SV = af0 + af1·(t − toc) + af2·(t − toc)² + Δtr, with
// Δtr = F·e·√A·sin Ek (F from each system's μ), on the records above (af2 non-zero by the
// generator's stated choice) [C: gen_models.py]. Tolerance 1e-12 s; drift 1e-18 s/s.
#[test]
fn satellite_clock_polynomial_and_relativistic_term_match_is_gps_200() {
    let recs = records();
    for (name, f, s) in evaluated() {
        let at = format!("{name} at t − toe = {}", f[3]);
        assert_close(s.relativity_s, num(f[9]), 1e-12, &format!("{at}: Δtr"));
        let poly = recs[name].clock_polynomial_s(num(f[4]));
        assert_close(poly, num(f[10]), 1e-12, &format!("{at}: polynomial"));
        assert_close(s.clock_s, num(f[11]), 1e-12, &format!("{at}: clock"));
        assert_close(s.clock_drift, num(f[12]), 1e-18, &format!("{at}: drift"));
    }
    // The relativistic term is large enough on these records for a sign error to show.
    let biggest = evaluated()
        .iter()
        .map(|(_, _, s)| s.relativity_s.abs())
        .fold(0.0, f64::max);
    assert!(biggest > 1e-8, "{biggest}");
}

// Galileo records carry a raw GST week below 1024 in the navigation message (GST week 0 =
// GPS week 1024, OS SIS ICD §5.1.2): the same record with week 1849 − 1024 = 825 gives the
// same state.
#[test]
fn galileo_record_with_raw_gst_week_gives_the_same_state() {
    let recs = records();
    let rinex = recs["E12_rinex304_A9"];
    let raw = BroadcastEphemeris {
        week: rinex.week - 1024,
        ..rinex
    };
    assert_eq!(rinex.toe().unwrap(), raw.toe().unwrap());
    assert_eq!(rinex.toc().unwrap(), raw.toc().unwrap());
}

fn signal(name: &str) -> Signal {
    match name {
        "GpsL1Ca" => Signal::GpsL1Ca,
        "GpsL1P" => Signal::GpsL1P,
        "GpsL2" => Signal::GpsL2,
        "GalE1" => Signal::GalE1,
        "GalE5a" => Signal::GalE5a,
        "GalE5b" => Signal::GalE5b,
        "BdsB1I" => Signal::BdsB1I,
        "BdsB2I" => Signal::BdsB2I,
        "BdsB3I" => Signal::BdsB3I,
        _ => panic!("unknown signal {name}"),
    }
}

// Sources: IS-GPS-200 §20.3.3.3.3.2: (Δt_SV)L1 = Δt_SV − TGD, (Δt_SV)L2 = Δt_SV − γ·TGD,
// γ = (77/60)²; Galileo OS SIS ICD §5.1.5: E1 and E5b from BGD(E1,E5b) (E5b scaled by
// (154/118)²), E5a from BGD(E1,E5a) scaled by (154/115)²; BeiDou B1I ICD §5.2.4.10: B1I − TGD1,
// B2I − TGD2, B3I none. Records: RINEX 3.04 Tables A11, A9, A15 [V] (non-zero TGD, BGDs,
// TGD1/TGD2) and the invented MEO; references computed by gen_models.py [C] at toe + 1600 s.
// Tolerance 1e-12 s.
#[test]
fn group_delays_follow_tgd_bgd_and_tgd1_tgd2_rules_per_signal() {
    let recs = records();
    let mut seen = Vec::new();
    for f in rows("groupdelay") {
        let eph = recs[f[0]];
        let sig = signal(f[1]);
        assert_eq!(sig.system(), eph.sat.system);
        let d = eph.group_delay_s(sig);
        assert_close(d, num(f[2]), 1e-12, &format!("{} {}", f[0], f[1]));
        let s = eph.evaluate(1600.0, 1600.0 + eph.toe_s - eph.toc_s);
        assert_close(
            s.clock_s - d,
            num(f[3]),
            1e-12,
            &format!("{} {} clock", f[0], f[1]),
        );
        if num(f[2]) != 0.0 {
            seen.push(f[1]);
        }
    }
    for s in [
        "GpsL1Ca", "GpsL2", "GalE1", "GalE5a", "GalE5b", "BdsB1I", "BdsB2I",
    ] {
        assert!(seen.contains(&s), "no non-zero group delay checked for {s}");
    }
}

// Source: IS-GPS-200 §20.3.3.5.2.5 (Klobuchar), computed by gen_models.py [C] on the CHECKS.md
// coefficient sets and vectors (4.6629, 10.0975, 10.1641, 1.4996 m, asserted there) and the
// RINEX 3.04 Table A11 header coefficients [V], over latitudes inside and past the ±0.416
// semicircle clamp, day and night, local times wrapping. Tolerance 0.1 mm in double
// precision; 1 mm for the single-precision per-epoch path.
#[test]
fn klobuchar_delay_matches_is_gps_200_in_double_and_single_precision() {
    let (mut worst64, mut worst32): (f64, f64) = (0.0, 0.0);
    let all = rows("iono");
    assert!(all.len() > 400, "{}", all.len());
    for f in all {
        let v: Vec<f64> = f.iter().map(|s| num(s)).collect();
        let k = IonoCoefficients {
            alpha: [v[0], v[1], v[2], v[3]],
            beta: [v[4], v[5], v[6], v[7]],
        };
        let (lat, lon, az, el) = (
            v[8].to_radians(),
            v[9].to_radians(),
            v[10].to_radians(),
            v[11].to_radians(),
        );
        let (tow, want) = (v[12], v[13]);
        let d = k.delay_l1_m(lat, lon, az, el, tow);
        assert_close(d, want, 1e-4, &format!("Klobuchar {f:?}"));
        worst64 = worst64.max((d - want).abs());
        let d32 = k.delay_l1_m_f32(
            lat as f32,
            lon as f32,
            az.sin() as f32,
            az.cos() as f32,
            el as f32,
            tow,
        );
        assert_close(f64::from(d32), want, 1e-3, &format!("Klobuchar f32 {f:?}"));
        worst32 = worst32.max((f64::from(d32) - want).abs());
    }
    println!("Klobuchar worst difference: f64 {worst64:.2e} m, f32 {worst32:.2e} m");
}

// Source: Saastamoinen zenith delays, Davis et al. 1985 hydrostatic form
// ZHD = 0.0022768·P/(1 − 0.00266·cos 2φ − 2.8e-7·h), ZWD = 0.002277·(1255/T + 0.05)·e
// [V formula; C: gen_models.py, which asserts CHECKS.md's 2.3070, 2.2763 and 0.0860 m].
// Tolerance 1 µm.
#[test]
fn saastamoinen_zenith_delays_match() {
    for f in rows("zenith") {
        let v: Vec<f64> = f.iter().map(|s| num(s)).collect();
        let z = ZenithDelay::saastamoinen(v[0], v[1], v[2], v[3].to_radians(), v[4]);
        assert_close(z.hydrostatic_m, v[5], 1e-6, &format!("ZHD {f:?}"));
        assert_close(z.wet_m, v[6], 1e-6, &format!("ZWD {f:?}"));
    }
}

// Source: SBAS MOPS mapping m(E) = 1.001/√(0.002001 + sin²E) [M form; C: gen_models.py,
// which asserts CHECKS.md's 1.9940, 3.8111, 5.5823, 10.2179]. Tolerance 1e-9; the slant delay
// is the zenith total times m(E).
#[test]
fn mops_mapping_function_matches() {
    let z = ZenithDelay::saastamoinen(1013.25, 288.15, 8.574, 0.8, 0.0);
    for f in rows("mapping") {
        let (el, want) = (num(f[0]).to_radians(), num(f[1]));
        assert_close(mapping(el.sin()), want, 1e-9, &format!("m({})", f[0]));
        let slant = (z.hydrostatic_m + z.wet_m) * want;
        assert_close(
            z.slant_m(el.sin()),
            slant,
            1e-6,
            &format!("slant at {}", f[0]),
        );
    }
}

// Common practice: the ICAO standard atmosphere (1013.25 hPa, 288.15 K, −6.5 K/km, pressure
// (1 − 2.2557e-5·h)^5.2568) with 50 % relative humidity (Magnus saturation pressure), fed to
// the Saastamoinen delays above [C: gen_models.py]. Tolerance 1 µm.
#[test]
fn standard_atmosphere_zenith_delays_match() {
    for f in rows("stdatm") {
        let v: Vec<f64> = f.iter().map(|s| num(s)).collect();
        let z = ZenithDelay::standard_atmosphere(v[0].to_radians(), v[1]);
        assert_close(z.hydrostatic_m, v[2], 1e-6, &format!("ZHD {f:?}"));
        assert_close(z.wet_m, v[3], 1e-6, &format!("ZWD {f:?}"));
    }
}

struct TimeRow {
    utc: UtcDateTime,
    gps_minus_utc: i32,
    gps_ns: i64,
    gps: (i64, f64),
    bdt: (i64, f64),
    gst: (i64, f64),
}

fn time_rows() -> Vec<TimeRow> {
    rows("time")
        .into_iter()
        .map(|f| TimeRow {
            utc: UtcDateTime {
                year: int(f[0]),
                month: int(f[1]),
                day: int(f[2]),
                hour: int(f[3]),
                minute: int(f[4]),
                second: int(f[5]),
                nanosecond: int(f[6]),
            },
            gps_minus_utc: int(f[7]),
            gps_ns: int::<i64>(f[8]) * 1_000_000_000 + int::<i64>(f[6]),
            gps: (int(f[9]), num(f[10])),
            bdt: (int(f[11]), num(f[12])),
            gst: (int(f[13]), num(f[14])),
        })
        .collect()
}

// Source: astropy 7.1.1 with its bundled leap-second table [C: gen_models.py, which asserts
// CHECKS.md's week 1024/TOW 13 s, week 2048/TOW 18 s and GPS second 1,388,102,418]: GPS week,
// time of week and GPS − UTC for dates from the GPS epoch to 2024, including the leap seconds
// 2008-12-31 and 2016-12-31 23:59:60. Exact to the nanosecond (time of week to 1 ns).
#[test]
fn gps_time_from_utc_matches_astropy() {
    for r in time_rows() {
        let at = format!("{:?}", r.utc);
        let t = GnssTime::from_utc(r.utc, r.gps_minus_utc).unwrap();
        assert_eq!(t.as_nanos(), r.gps_ns, "{at}");
        assert_eq!(t.week(), r.gps.0, "{at}");
        assert_close(t.tow_s(), r.gps.1, 1e-9, &format!("{at} TOW"));
        assert_eq!(
            GnssTime::from_week_tow(u32::try_from(r.gps.0).unwrap(), r.gps.1).unwrap(),
            t,
            "{at}"
        );
        // Back to UTC (a leap second itself reads as the following second 0, by design).
        if r.utc.second < 60 {
            assert_eq!(t.to_utc(r.gps_minus_utc), r.utc, "{at}");
        }
    }
}

// Source: astropy as above; BeiDou Time counted from 2006-01-01 00:00:00 UTC (B1I ICD
// §5.2.4.1) and Galileo System Time from 1999-08-22 00:00:00 UTC when it was 13 s ahead of UTC
// (OS SIS ICD §5.1.2), both with astropy's leap seconds [C: gen_models.py]. Exact to the
// nanosecond.
#[test]
fn beidou_and_galileo_time_scales_match_astropy() {
    for r in time_rows() {
        let at = format!("{:?}", r.utc);
        let t = GnssTime::from_utc(r.utc, r.gps_minus_utc).unwrap();
        let (bw, btow) = t.bdt_week_tow();
        assert_eq!(bw, r.bdt.0, "{at} BDT week");
        assert_close(btow, r.bdt.1, 1e-9, &format!("{at} BDT TOW"));
        if let Ok(w) = u32::try_from(r.bdt.0) {
            assert_eq!(GnssTime::from_bdt(w, r.bdt.1).unwrap(), t, "{at} from BDT");
        }
        if let Ok(w) = u32::try_from(r.gst.0) {
            assert_eq!(GnssTime::from_gst(w, r.gst.1).unwrap(), t, "{at} from GST");
        }
    }
}

#[test]
fn vector_file_names_its_generator_and_libraries() {
    assert!(VECTORS.starts_with("# generator: tools/refvectors/gen_models.py; library: astropy"));
    assert!(VECTORS.contains("# command: cargo xtask vectors"));
}
