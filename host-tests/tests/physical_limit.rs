//! The physical limit of a snapshot fix, and facts of the trade, on synthetic data whose
//! noise is known exactly.

use nalgebra::{DMatrix, Matrix3};
use rand::SeedableRng;
use trackfix_engine::config::{IonoModel, TropoModel};
use trackfix_engine::{
    Config, Engine, FixKind, FixOutcome, Geodetic, GnssTime, LocalFrame, NoFixReason, System,
    SPEED_OF_LIGHT,
};
use trackfix_harness::synth::{constellation, observe, true_pseudorange, StaticReceiver};

type TestEngine = Engine<40, 64>;

fn start() -> GnssTime {
    GnssTime::from_week_tow(2300, 200_000.0).unwrap()
}

/// A receiver at an invented site (the "Brackwater depot", 52.1° N 7.3° E, 40 m).
fn receiver() -> StaticReceiver {
    StaticReceiver {
        position: Geodetic::from_degrees(52.1, 7.3, 40.0).to_ecef(),
        horizon_deg: 10.0,
        clock_bias_m: 12_345.6,
        inter_system_bias_m: 0.0,
    }
}

/// Equal weights σ and no atmosphere: the model matches the data exactly. Snapshot fixes:
/// these are the least-squares solution's physical limits (the filter's are in
/// filter_consistency.rs).
fn matched_config(sigma: f64) -> Config {
    let mut c = Config::default();
    c.filter.mode = trackfix_engine::config::FilterMode::Snapshot;
    c.corrections.ionosphere = IonoModel::Off;
    c.corrections.troposphere = TropoModel::Off;
    c.snapshot.sigma_floor_m = sigma;
    c.snapshot.sigma_elevation_m = 0.0;
    c.snapshot.elevation_mask_deg = 5.0;
    c
}

fn engine_with(
    cfg: Config,
    with_galileo: bool,
) -> (TestEngine, trackfix_harness::synth::Constellation) {
    let toe = start().add_seconds(5_000.0);
    let cons = constellation(
        7,
        toe,
        if with_galileo {
            &[System::Gps, System::Galileo][..]
        } else {
            &[System::Gps][..]
        },
    );
    let mut e = TestEngine::new(cfg).unwrap();
    for eph in &cons.ephemerides {
        e.ingest_ephemeris(*eph).unwrap();
    }
    (e, cons)
}

/// PDOP of the true geometry, computed independently with nalgebra's general inverse
/// (a general-purpose reference library: `(HᵀH)⁻¹`, H rows = [−unit LOS, 1]).
fn reference_pdop(rx: [f64; 3], sats: &[[f64; 3]]) -> f64 {
    let mut h = DMatrix::<f64>::zeros(sats.len(), 4);
    for (i, s) in sats.iter().enumerate() {
        let d = [s[0] - rx[0], s[1] - rx[1], s[2] - rx[2]];
        let r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
        for k in 0..3 {
            h[(i, k)] = -d[k] / r;
        }
        h[(i, 3)] = 1.0;
    }
    let q = (h.transpose() * &h).try_inverse().unwrap();
    (q[(0, 0)] + q[(1, 1)] + q[(2, 2)]).sqrt()
}

// The physical limit (DESIGN.md §5; e.g. Kaplan & Hegarty, "Understanding GPS/GNSS",
// ch. 7 [from memory]): with independent Gaussian pseudorange noise of σ and equal weights,
// the least-squares position error covariance is σ²(HᵀH)⁻¹, so RMS 3-D error = σ·PDOP.
// Tolerance 0.9–1.1 (the figure): over 1,000 independent epochs the mean of
// |e|²/(σ·PDOP)² has a relative standard deviation of at most √2/√1000 = 4.5 %, i.e. ≤ 2.3 %
// on the RMS ratio, so the band is more than 4 standard deviations wide.
#[test]
fn wls_error_matches_sigma_times_pdop() {
    let sigma = 3.0;
    let (mut engine, cons) = engine_with(matched_config(sigma), false);
    let rx = receiver();
    let mut rng = rand::rngs::StdRng::seed_from_u64(42);
    let (mut sum_e2, mut sum_dop2, mut n) = (0.0, 0.0, 0);
    let mut max_dop_diff: f64 = 0.0;
    for k in 0..1_000 {
        let t = start().add_seconds(10.0 * f64::from(k));
        let epoch = observe::<40>(&rx, &cons, t, sigma, &mut rng);
        let sol = engine.process(&epoch).unwrap();
        let FixOutcome::Fix(fix) = sol.outcome else {
            panic!("epoch {k}: {:?}", sol.outcome)
        };
        let sats: Vec<[f64; 3]> = epoch
            .obs
            .iter()
            .map(|o| {
                let eph = cons.ephemerides.iter().find(|e| e.sat == o.sat).unwrap();
                true_pseudorange(eph, t, rx.position, 0.0).1
            })
            .collect();
        let pdop = reference_pdop(rx.position, &sats);
        max_dop_diff = max_dop_diff.max((pdop - fix.dop.pdop).abs());
        let e: Vec<f64> = (0..3).map(|i| fix.ecef_m[i] - rx.position[i]).collect();
        sum_e2 += e.iter().map(|x| x * x).sum::<f64>();
        sum_dop2 += sigma * sigma * pdop * pdop;
        n += 1;
    }
    let ratio = (sum_e2 / sum_dop2).sqrt();
    println!("RMS error / (σ·PDOP) over {n} epochs = {ratio:.4}; engine PDOP vs reference max diff {max_dop_diff:.2e}");
    assert!((0.9..=1.1).contains(&ratio), "ratio {ratio}");
    // Same geometry evaluated at the fix rather than the truth: metres of position move
    // PDOP by ~1e-6, so 1e-4 is generous.
    assert!(max_dop_diff < 1e-4);
}

// The engine's own covariance is the same σ²(HᵀWH)⁻¹: its trace matches (σ·PDOP)².
#[test]
fn reported_covariance_is_sigma_squared_times_dop() {
    let sigma = 2.0;
    let (mut engine, cons) = engine_with(matched_config(sigma), false);
    let mut rng = rand::rngs::StdRng::seed_from_u64(1);
    let epoch = observe::<40>(&receiver(), &cons, start(), sigma, &mut rng);
    let fix = *engine.process(&epoch).unwrap().fix().unwrap();
    let c = Matrix3::from_fn(|i, j| fix.covariance_enu_m2[i][j]);
    let want = sigma * sigma * fix.dop.pdop * fix.dop.pdop;
    assert!((c.trace() - want).abs() < 1e-9 * want);
    let hor = sigma * sigma * fix.dop.hdop * fix.dop.hdop;
    assert!((c[(0, 0)] + c[(1, 1)] - hor).abs() < 1e-9 * hor);
}

// Fact of the trade (common practice; CHECKS.md): light covers about 300 m per
// microsecond (c = 299,792,458 m/s), so 1 µs more receiver clock error adds 299.79 m to
// the estimated clock bias and nothing to the position. Noise-free data: 1 mm.
#[test]
fn one_microsecond_is_300_metres_of_clock_bias() {
    let (mut engine, cons) = engine_with(matched_config(1.0), false);
    let mut rng = rand::rngs::StdRng::seed_from_u64(3);
    let mut rx = receiver();
    let a = *engine
        .process(&observe::<40>(&rx, &cons, start(), 0.0, &mut rng))
        .unwrap()
        .fix()
        .unwrap();
    rx.clock_bias_m += 1e-6 * SPEED_OF_LIGHT;
    let t = start().add_seconds(1.0);
    let b = *engine
        .process(&observe::<40>(&rx, &cons, t, 0.0, &mut rng))
        .unwrap()
        .fix()
        .unwrap();
    let frame = LocalFrame::at_ecef(receiver().position);
    for f in [a, b] {
        let e = frame.enu(f.ecef_m);
        assert!(e.iter().all(|x| x.abs() < 1e-3), "{e:?}");
    }
    let d = b.clock_bias_m - a.clock_bias_m;
    assert!((d - 299.792_458).abs() < 1e-3, "{d}");
}

// A receiver that steers its clock by a whole millisecond (DESIGN.md §2): every
// pseudorange jumps by 299,792.458 m, the position must not move.
#[test]
fn millisecond_clock_jump_moves_clock_not_position() {
    let (mut engine, cons) = engine_with(matched_config(1.0), false);
    let mut rng = rand::rngs::StdRng::seed_from_u64(4);
    let mut rx = receiver();
    rx.clock_bias_m += 1e-3 * SPEED_OF_LIGHT;
    let f = *engine
        .process(&observe::<40>(&rx, &cons, start(), 0.0, &mut rng))
        .unwrap()
        .fix()
        .unwrap();
    let e = LocalFrame::at_ecef(rx.position).enu(f.ecef_m);
    assert!(e.iter().all(|x| x.abs() < 1e-3), "{e:?}");
}

// Fact of the trade (common practice; CHECKS.md): a 3-D fix with an unknown receiver clock
// needs at least four satellites; with three and a known height, a 2-D fix is possible.
#[test]
fn four_satellites_for_3d_three_with_known_height() {
    let (mut engine, cons) = engine_with(matched_config(1.0), false);
    let mut rng = rand::rngs::StdRng::seed_from_u64(5);
    let rx = receiver();
    let full = observe::<40>(&rx, &cons, start(), 0.0, &mut rng);
    let mut three = full.clone();
    three.obs.truncate(3);
    let sol = engine.process(&three).unwrap();
    assert_eq!(
        sol.outcome,
        FixOutcome::NoFix(NoFixReason::TooFewSatellites {
            usable: 3,
            needed: 4
        })
    );
    let mut four = observe::<40>(&rx, &cons, start().add_seconds(1.0), 0.0, &mut rng);
    four.obs.truncate(4);
    let f = *engine.process(&four).unwrap().fix().unwrap();
    assert_eq!(f.kind, FixKind::ThreeD);
    // Now a height is known: three satellites give a 2-D fix, close to the truth.
    let mut three = observe::<40>(&rx, &cons, start().add_seconds(2.0), 0.0, &mut rng);
    three.obs.truncate(3);
    let sol = engine.process(&three).unwrap();
    let f = sol.fix().unwrap();
    assert_eq!(f.kind, FixKind::TwoD);
    let e = LocalFrame::at_ecef(rx.position).enu(f.ecef_m);
    assert!(e[0].hypot(e[1]) < 0.5, "{e:?}");
}

// Two systems: one clock each. An inter-system bias in the data shows up as the difference
// of the two clock estimates (noise-free: 1 mm), and the position is unaffected.
#[test]
fn inter_system_bias_is_estimated() {
    let (mut engine, cons) = engine_with(matched_config(1.0), true);
    let mut rng = rand::rngs::StdRng::seed_from_u64(6);
    let mut rx = receiver();
    rx.inter_system_bias_m = 17.5;
    let f = *engine
        .process(&observe::<40>(&rx, &cons, start(), 0.0, &mut rng))
        .unwrap()
        .fix()
        .unwrap();
    let [g, e, _] = f.system_clock_m;
    assert!((e.unwrap() - g.unwrap() - 17.5).abs() < 1e-3);
    let d = LocalFrame::at_ecef(rx.position).enu(f.ecef_m);
    assert!(d.iter().all(|x| x.abs() < 1e-3), "{d:?}");
}
