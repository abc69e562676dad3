//! Fixes on real reference-station recordings against their known coordinates.
//!
//! Two gates on every row:
//! - the published bound: the GPS SPS Performance Standard, 2001 edition [V: excerpt, via
//!   CHECKS.md], ≤ 13 m horizontal and ≤ 22 m vertical (95 %);
//! - the regression gate: each of the 50 % and 95 % horizontal and vertical errors at most
//!   `MARGIN` × the value measured on these files (quoted beside each row and in the README).
//!   The replay is deterministic, so the margin is not for noise: it leaves room for a
//!   legitimate model change of a few decimetres and none for a model error (a sign error
//!   in a clock, group-delay or Sagnac term moves these errors by metres).

use trackfix_engine::{Config, NoFixReason, SatStatus, System};
use trackfix_harness::data::{data_dir_or_skip, verify};
use trackfix_harness::metrics::Summary as Accuracy;
use trackfix_harness::replay::{dataset, replay};

const SPS_2001_H95_M: f64 = 13.0;
const SPS_2001_V95_M: f64 = 22.0;
/// Regression margin over the measured errors (see the module documentation).
const MARGIN: f64 = 1.25;

/// Measured errors of one row, m: horizontal 50 / 95 %, vertical 50 / 95 %.
struct Measured {
    h50: f64,
    h95: f64,
    v50: f64,
    v95: f64,
}

/// Both gates (see the module documentation).
fn gate(name: &str, a: &Accuracy, m: &Measured) {
    assert!(a.horizontal.p95 <= SPS_2001_H95_M, "{name}: above SPS 2001");
    assert!(a.vertical.p95 <= SPS_2001_V95_M, "{name}: above SPS 2001");
    for (what, got, measured) in [
        ("H 50 %", a.horizontal.p50, m.h50),
        ("H 95 %", a.horizontal.p95, m.h95),
        ("V 50 %", a.vertical.p50, m.v50),
        ("V 95 %", a.vertical.p95, m.v95),
    ] {
        assert!(
            got <= MARGIN * measured,
            "{name}: {what} {got:.2} m above {MARGIN} × the measured {measured:.2} m"
        );
    }
}

fn gps_only() -> Config {
    Config::default().with_systems(&[System::Gps])
}

fn gps_galileo() -> Config {
    Config::default().with_systems(&[System::Gps, System::Galileo])
}

fn report(name: &str, a: &Accuracy) {
    println!(
        "{name}: {} epochs, {} fixes; horizontal 50/95 % = {:.2} / {:.2} m, vertical 50/95 % = {:.2} / {:.2} m",
        a.epochs, a.fixes, a.horizontal.p50, a.horizontal.p95, a.vertical.p50, a.vertical.p95
    );
}

// ESBC truth from shared/data/README.md: X 3582104.7655, Y 532590.1789, Z 5232755.1393 m
// (marker, ITRF-type frame, epoch 2020.48, interpolated between two published solutions).
const ESBC: [f64; 3] = [3_582_104.7655, 532_590.1789, 5_232_755.1393];
const ESBC_OBS: &str = "esbc_2020177/ESBC00DNK_R_20201770000_01D_30S_MO_first2h.rnx";
const ESBC_NAV: &str = "esbc_2020177/ESBC00DNK_R_20201770000_01D_MN.rnx";

#[test]
fn esbc_gps_l1_klobuchar() {
    let Some(dir) = data_dir_or_skip("esbc_gps_l1_klobuchar") else {
        return;
    };
    verify(&dir, ESBC_OBS).unwrap();
    verify(&dir, ESBC_NAV).unwrap();
    let ds = dataset(&dir, ESBC_OBS, &[ESBC_NAV], Some(ESBC));
    let r = replay(&ds, gps_only()).unwrap();
    let a = Accuracy::of(&r);
    report("ESBC GPS L1 C/A + Klobuchar", &a);
    assert_eq!(a.epochs, 240);
    assert_eq!(
        a.fixes, 240,
        "every epoch of a reference station has ≥ 6 GPS satellites"
    );
    let measured = Measured {
        h50: 2.09,
        h95: 2.44,
        v50: 0.63,
        v95: 1.71,
    };
    gate("ESBC GPS", &a, &measured);
    // Each satellite's mean residual over the two hours: a wrong group delay or clock term
    // of one satellite shows as its own bias even when the fix absorbs most of it. The
    // shared/data README measured residuals of about 1 m RMS with an independent
    // dual-frequency fix; a single-frequency fix adds the ionosphere's model error (the
    // Klobuchar amplitude clips to zero in 2020, README pitfalls), so the bound is
    // MARGIN × the worst mean measured here.
    let worst = worst_mean_residual(&r);
    println!("ESBC GPS: worst per-satellite mean residual {worst:.2} m");
    assert!(
        worst <= MARGIN * ESBC_GPS_WORST_MEAN_RESIDUAL_M,
        "a satellite's mean residual is {worst:.2} m"
    );
}

/// Measured worst per-satellite mean residual of the ESBC GPS row, m.
const ESBC_GPS_WORST_MEAN_RESIDUAL_M: f64 = 1.53;

/// The largest |mean post-fit residual| of any satellite used in at least 20 epochs.
fn worst_mean_residual(r: &[trackfix_harness::record::EpochRecord]) -> f64 {
    let mut per_sat: std::collections::BTreeMap<_, (f64, u32)> = Default::default();
    for e in r {
        for s in e.sats.iter().filter(|s| s.status == SatStatus::Used) {
            if let Some(res) = s.residual_m {
                let x = per_sat.entry(s.sat).or_insert((0.0, 0));
                x.0 += f64::from(res);
                x.1 += 1;
            }
        }
    }
    per_sat
        .values()
        .filter(|(_, n)| *n >= 20)
        .map(|(sum, n)| (sum / f64::from(*n)).abs())
        .fold(0.0, f64::max)
}

/// The smallest number of `system` satellites used in any epoch with a fix, from the
/// `from`-th epoch on.
fn fewest_used(r: &[trackfix_harness::record::EpochRecord], system: System, from: usize) -> usize {
    r.iter()
        .skip(from)
        .filter(|e| e.fix.is_some())
        .map(|e| {
            e.sats
                .iter()
                .filter(|s| s.sat.system == system && s.status == SatStatus::Used)
                .count()
        })
        .min()
        .unwrap_or(0)
}

#[test]
fn esbc_gps_galileo_l1() {
    let Some(dir) = data_dir_or_skip("esbc_gps_galileo_l1") else {
        return;
    };
    let ds = dataset(&dir, ESBC_OBS, &[ESBC_NAV], Some(ESBC));
    let r = replay(&ds, gps_galileo()).unwrap();
    let a = Accuracy::of(&r);
    report("ESBC GPS L1 C/A + Galileo E1", &a);
    assert_eq!(a.fixes, 240);
    let measured = Measured {
        h50: 1.17,
        h95: 1.54,
        v50: 0.66,
        v95: 1.24,
    };
    gate("ESBC GPS + Galileo", &a, &measured);
    // Both systems contribute at every epoch (Galileo had 22 satellites in service in 2020;
    // a reference station sees 5–9 above 10°, common practice).
    let fewest = fewest_used(&r, System::Galileo, 0);
    println!("ESBC GPS + Galileo: at least {fewest} Galileo satellites used in every fix");
    assert!(
        fewest >= 4,
        "an epoch used only {fewest} Galileo satellites"
    );
}

// NYA1 truth: header APPROX POSITION (shared/data/README.md: no independent published
// value; good to about 1 m).
const NYA1: [f64; 3] = [1_202_434.1303, 252_632.2212, 6_237_772.4351];
const NYA1_OBS: &str = "nya1_2024124/NYA100NOR_S_20241240000_01D_30S_MO_first2h.rnx";

#[test]
fn nya1_high_latitude_gps_galileo_beidou() {
    let Some(dir) = data_dir_or_skip("nya1_high_latitude") else {
        return;
    };
    verify(&dir, NYA1_OBS).unwrap();
    let nav = [
        "nya1_2024124/NYA100NOR_S_20241240000_01D_GN.rnx",
        "nya1_2024124/NYA100NOR_S_20241240000_01D_EN.rnx",
        "nya1_2024124/NYA100NOR_S_20241240000_01D_CN.rnx",
    ];
    let ds = dataset(&dir, NYA1_OBS, &nav, Some(NYA1));
    let gps = Measured {
        h50: 0.24,
        h95: 0.53,
        v50: 0.66,
        v95: 1.81,
    };
    let all = Measured {
        h50: 0.25,
        h95: 0.53,
        v50: 0.83,
        v95: 1.87,
    };
    for (name, cfg, measured) in [
        ("NYA1 GPS L1 C/A + Klobuchar", gps_only(), gps),
        ("NYA1 GPS + Galileo + BeiDou", Config::default(), all),
    ] {
        let r = replay(&ds, cfg).unwrap();
        let a = Accuracy::of(&r);
        report(name, &a);
        // The day's navigation files begin at 00:00, so at the first epoch no record has
        // yet been transmitted (BeiDou excepted): that epoch alone lacks satellites and must say so.
        for e in r.iter().filter(|e| e.fix.is_none()) {
            assert_eq!(e.time, r[0].time, "only the first epoch may lack a fix");
            assert!(matches!(
                e.no_fix,
                Some(NoFixReason::TooFewSatellites { .. })
            ));
        }
        assert!(a.fixes + 1 >= a.epochs);
        gate(name, &a, &measured);
        if cfg.uses(System::Galileo) && cfg.uses(System::Beidou) {
            // Every system contributes: a wrong BeiDou week or time offset would drop
            // BeiDou silently and barely move this fix. From the tenth epoch (5 min) on:
            // the day's navigation files begin at 00:00, so the first records a receiver
            // would hold arrive during the first minutes (shared/data README pitfalls).
            for system in [System::Galileo, System::Beidou] {
                let fewest = fewest_used(&r, system, 10);
                println!(
                    "{name}: at least {fewest} {system:?} satellites used in every fix after 5 min"
                );
                assert!(
                    fewest >= 4,
                    "an epoch used only {fewest} {system:?} satellites"
                );
            }
        }
    }
}

// KMS3 truth: header APPROX POSITION (shared/data/README.md: about 1 m). RINEX 4.00 files,
// codes only (no C/N0): 19 epochs.
const KMS3: [f64; 3] = [3_516_213.4380, 781_859.8595, 5_246_037.9660];

#[test]
fn kms3_rinex4_gps_galileo() {
    let Some(dir) = data_dir_or_skip("kms3_rinex4_gps_galileo") else {
        return;
    };
    let obs = "kms3_2022159/KMS300DNK_R_20221591000_01H_30S_MO.rnx";
    let nav = "kms3_2022159/KMS300DNK_R_20221591000_01H_MN.rnx";
    verify(&dir, obs).unwrap();
    verify(&dir, nav).unwrap();
    let ds = dataset(&dir, obs, &[nav], Some(KMS3));
    let r = replay(&ds, gps_galileo()).unwrap();
    let a = Accuracy::of(&r);
    report("KMS3 GPS L1 C/A + Galileo E1 (RINEX 4)", &a);
    assert_eq!(a.epochs, 19);
    // RINEX 4 carries Klobuchar in an `ION … LNAV` record, not the header: it must be used.
    assert_eq!(
        r[0].fix.unwrap().iono,
        trackfix_engine::IonoCorrection::Klobuchar
    );
    assert_eq!(a.fixes, 19);
    let measured = Measured {
        h50: 1.29,
        h95: 1.58,
        v50: 0.98,
        v95: 1.32,
    };
    gate("KMS3", &a, &measured);
}

// Velocity from Doppler on a fixed reference station, whose true velocity is zero: the RMS of
// each component over the two hours. The σ model (0.1 m/s per Doppler, velocity DOP 1–2)
// allows a few decimetres per second; a geodetic receiver's Doppler does far better
// (measured 0.005 / 0.010 / 0.013 m/s, rounded up to the next mm/s here), and the gate is
// MARGIN × that. A wrong sign of the satellite velocity or clock drift moves these by
// metres per second.
#[test]
fn esbc_velocity_of_a_fixed_station_is_near_zero() {
    let Some(dir) = data_dir_or_skip("esbc_velocity_of_a_fixed_station_is_near_zero") else {
        return;
    };
    let ds = dataset(&dir, ESBC_OBS, &[ESBC_NAV], Some(ESBC));
    let r = replay(
        &ds,
        Config::default().with_systems(&[System::Gps, System::Galileo]),
    )
    .unwrap();
    let errors: Vec<[f64; 3]> = r
        .iter()
        .filter_map(|e| e.velocity_error_enu_mps())
        .collect();
    assert_eq!(errors.len(), 240, "every fix has a velocity");
    let rms =
        |k: usize| (errors.iter().map(|e| e[k] * e[k]).sum::<f64>() / errors.len() as f64).sqrt();
    let (e, n, u) = (rms(0), rms(1), rms(2));
    println!("ESBC velocity error RMS east {e:.3}, north {n:.3}, up {u:.3} m/s");
    for (what, got, measured) in [("east", e, 0.006), ("north", n, 0.011), ("up", u, 0.014)] {
        assert!(got <= MARGIN * measured, "{what} RMS {got:.3} m/s");
    }
}
