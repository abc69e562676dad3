//! The integrity stage through the engine's public API, on synthetic epochs from the
//! independent truth models (crate::synth): too few satellites for the test, a faulty
//! satellite excluded, and receiver events (a millisecond clock step, a clock jump, a leap of
//! the time of week, a wake-up) that must not be taken for satellite faults.

use rand::SeedableRng;
use trackfix_engine::config::FilterMode;
use trackfix_engine::{
    Config, Engine, Epoch, Flags, GnssTime, IntegrityState, LocalFrame, SatStatus, Solution,
    System, SPEED_OF_LIGHT,
};
use trackfix_harness::synth::{
    constellation, observe_with, Constellation, ErrorModel, StaticReceiver,
};

/// Code noise of 0.5 m at the zenith growing as 1/sin(E), and C/N0 falling towards the
/// horizon like a patch antenna's gain (crate::synth): what a receiver reports.
fn errors() -> ErrorModel {
    ErrorModel {
        sigma_m: 0.5,
        ..ErrorModel::default()
    }
}

type TestEngine = Engine<40, 64>;

fn t0() -> GnssTime {
    GnssTime::from_week_tow(2300, 300_000.0).unwrap()
}

/// A receiver at an invented place (47.3° N, 9.2° E, 400 m) with GPS and Galileo in view.
fn setup(mode: FilterMode) -> (Box<TestEngine>, Constellation, StaticReceiver) {
    let c = constellation(11, t0(), &[System::Gps, System::Galileo]);
    let mut cfg = Config::default();
    cfg.filter.mode = mode;
    let mut e: Box<TestEngine> = Box::new(Engine::new(cfg).unwrap());
    for eph in &c.ephemerides {
        e.ingest_ephemeris(*eph).unwrap();
    }
    let rx = StaticReceiver {
        position: trackfix_engine::Geodetic {
            lat_rad: 47.3f64.to_radians(),
            lon_rad: 9.2f64.to_radians(),
            height_m: 400.0,
        }
        .to_ecef(),
        horizon_deg: 10.5,
        clock_bias_m: 1_000.0,
        inter_system_bias_m: 5.0,
    };
    (e, c, rx)
}

fn h_error(sol: &Solution<40>, rx: &StaticReceiver) -> f64 {
    let f = sol.fix().unwrap();
    let e = LocalFrame::at_ecef(rx.position).enu(f.ecef_m);
    e[0].hypot(e[1])
}

/// Asserts that no epoch excluded a satellite or raised a flag.
fn quiet(sols: &[Solution<40>]) {
    for (k, s) in sols.iter().enumerate() {
        assert_eq!(excluded(s), 0, "epoch {k}");
        assert!(
            s.integrity.flags.is_empty(),
            "epoch {k}: {:?}",
            s.integrity.flags
        );
    }
}

fn excluded(sol: &Solution<40>) -> usize {
    sol.sats
        .iter()
        .filter(|s| matches!(s.status, SatStatus::Excluded { .. } | SatStatus::KeptOut))
        .count()
}

// Four satellites of one system: a fix, but no redundancy for the residual test, so the
// integrity is "unavailable" with no protection level — never a silent "verified".
#[test]
fn too_few_satellites_is_unavailable() {
    let (mut e, c, rx) = setup(FilterMode::Snapshot);
    let mut rng = rand::rngs::StdRng::seed_from_u64(1);
    let full: Epoch<40> = observe_with(&rx, &c, t0(), &errors(), &mut rng);
    let mut four: Epoch<40> = Epoch::new(full.time);
    for o in full
        .obs
        .iter()
        .filter(|o| o.sat.system == System::Gps)
        .take(4)
    {
        four.push(*o).unwrap();
    }
    let sol = e.process(&four).unwrap();
    assert!(sol.fix().is_some());
    assert_eq!(sol.integrity.state, IntegrityState::Unavailable);
    assert_eq!((sol.integrity.dof, sol.integrity.hpl_m), (0, None));
    // Five: one degree of freedom, a test, protection levels.
    let mut five = four.clone();
    five.push(
        *full
            .obs
            .iter()
            .filter(|o| o.sat.system == System::Gps)
            .nth(4)
            .unwrap(),
    )
    .unwrap();
    e.reset_time();
    let sol = e.process(&five).unwrap();
    assert_eq!(sol.integrity.dof, 1);
    assert_eq!(sol.integrity.state, IntegrityState::Verified);
    assert!(sol.integrity.hpl_m.is_some_and(|h| h > 0.0));
}

// A 100 m bias on one satellite: found, excluded with its statistic, the fix within a few
// metres (the snapshot fix without the satellite), the state "fault excluded".
#[test]
fn a_faulty_satellite_is_excluded() {
    let (mut e, c, rx) = setup(FilterMode::Snapshot);
    let mut rng = rand::rngs::StdRng::seed_from_u64(2);
    let mut epoch: Epoch<40> = observe_with(&rx, &c, t0(), &errors(), &mut rng);
    let victim = epoch.obs[3].sat;
    epoch.obs[3].pseudorange_m += 100.0;
    let sol = e.process(&epoch).unwrap();
    assert_eq!(sol.integrity.state, IntegrityState::FaultExcluded);
    let s = sol.sats.iter().find(|s| s.sat == victim).unwrap();
    assert!(
        matches!(s.status, SatStatus::Excluded { statistic } if statistic.abs() > 10.0),
        "{:?}",
        s.status
    );
    assert!(h_error(&sol, &rx) < 3.0, "{} m", h_error(&sol, &rx));
    assert!(sol.integrity.statistic <= sol.integrity.threshold);
}

/// Runs `n` one-second epochs through a tracking engine, the receiver clock advanced by
/// `clock(k)` metres at epoch k and the time tag by `leap(k)` seconds; returns the solutions.
fn track(
    n: usize,
    clock: impl Fn(usize) -> f64,
    leap: impl Fn(usize) -> f64,
) -> (Vec<Solution<40>>, StaticReceiver) {
    let (mut e, c, mut rx) = setup(FilterMode::Tracking);
    let mut rng = rand::rngs::StdRng::seed_from_u64(3);
    let base = rx.clock_bias_m;
    let mut out = Vec::new();
    for k in 0..n {
        rx.clock_bias_m = base + clock(k);
        let t = t0().add_seconds(k as f64 + leap(k));
        let epoch: Epoch<40> = observe_with(&rx, &c, t, &errors(), &mut rng);
        out.push(e.process(&epoch).unwrap());
    }
    (out, rx)
}

// A steering receiver's whole-millisecond clock step is a receiver event: the filter
// re-seats its clock, nothing is excluded and no flag is raised.
#[test]
fn a_millisecond_clock_step_is_not_a_fault() {
    let ms = SPEED_OF_LIGHT * 1e-3;
    let (sols, _) = track(60, |k| if k >= 30 { ms } else { 0.0 }, |_| 0.0);
    quiet(&sols);
    assert!(sols
        .iter()
        .any(|s| s.filter_event == trackfix_engine::FilterEvent::ClockReseated));
}

// A clock jump that is no whole millisecond, within continuous tracking, raises the clock
// flag (a spoofer's takeover shows so) but still excludes no satellite.
#[test]
fn an_odd_clock_jump_is_flagged_not_excluded() {
    let (sols, _) = track(60, |k| if k >= 30 { 40_000.0 } else { 0.0 }, |_| 0.0);
    assert!(sols.iter().all(|s| excluded(s) == 0));
    assert!(sols
        .iter()
        .any(|s| s.integrity.flags.contains(Flags::CLOCK_JUMP)));
}

// A leap of the time of week (the receiver's time tag jumps an hour ahead, its measurements
// consistent with it) and a wake-up after an hour's sleep with a new clock: the filter
// starts again; no satellite is excluded, nothing is flagged, the fix stays verified.
#[test]
fn time_leaps_and_wake_ups_are_not_faults() {
    let (sols, rx) = track(
        80,
        |k| if k >= 40 { 123_456.0 } else { 0.0 },
        |k| if k >= 40 { 3_600.0 } else { 0.0 },
    );
    quiet(&sols);
    for (k, s) in sols.iter().enumerate() {
        assert_eq!(s.integrity.state, IntegrityState::Verified, "epoch {k}");
        assert!(h_error(s, &rx) < 5.0);
    }
}
