//! The navigation filter in the engine's pipeline, on synthetic scenarios whose truth the
//! generator knows (independent truth models, tests/model_mutations.rs).

use std::path::Path;
use trackfix_engine::config::FilterMode;
use trackfix_engine::{Config, FixSource};
use trackfix_harness::manifest::{config_for, Manifest, ScenarioRow, MANIFEST};
use trackfix_harness::metrics::Summary;
use trackfix_harness::record::EpochRecord;
use trackfix_harness::scenario::run;

fn row(name: &str) -> ScenarioRow {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let m = Manifest::read(&root.join(MANIFEST)).unwrap();
    m.scenario.into_iter().find(|r| r.name == name).unwrap()
}

fn tracking(mut c: Config) -> Config {
    c.filter.mode = FilterMode::Tracking;
    c
}

fn snapshot(mut c: Config) -> Config {
    c.filter.mode = FilterMode::Snapshot;
    c
}

fn both(name: &str) -> (Vec<EpochRecord>, Vec<EpochRecord>) {
    let r = row(name);
    let cfg = config_for(r.engine_systems.as_deref().unwrap_or(&r.spec.systems));
    (
        run(&r.spec, snapshot(cfg)).unwrap(),
        run(&r.spec, tracking(cfg)).unwrap(),
    )
}

fn h_error(e: &EpochRecord) -> Option<f64> {
    let d = e.fix?.enu_error_m?;
    Some(d[0].hypot(d[1]))
}

// Through the 90 s tunnel of the truck row: predicted fixes, marked so, with a σ that grows
// every epoch, for the configured 30 s of coasting; then no fix until the signals return;
// the first epoch after it is filtered again. The error at that epoch, against the truth,
// is printed for the closing figures and bounded by the row's own 95 % threshold.
#[test]
fn the_tunnel_is_coasted_then_given_up() {
    let r = row("truck-city-tunnel");
    let cfg = tracking(config_for(&r.spec.systems));
    let rec = run(&r.spec, cfg).unwrap();
    let start = rec[0].time;
    let inside: Vec<&EpochRecord> = rec
        .iter()
        .filter(|e| (1500.0..1590.0).contains(&e.time.seconds_since(start)))
        .collect();
    let coasted = inside.iter().take_while(|e| e.fix.is_some()).count();
    assert!(
        (20..=31).contains(&coasted),
        "{coasted} predicted epochs: coasting lasts the configured 30 s from the last update"
    );
    let mut last_sigma = 0.0;
    for e in &inside[..coasted] {
        let f = e.fix.unwrap();
        assert_eq!(f.source, FixSource::Predicted);
        let sigma = f.sigma_enu_m[0].hypot(f.sigma_enu_m[1]);
        assert!(sigma > last_sigma, "σ grows while coasting");
        last_sigma = sigma;
    }
    assert!(inside[coasted..].iter().all(|e| e.fix.is_none()));
    println!("tunnel: {coasted} predicted epochs, horizontal σ at the last {last_sigma:.1} m");
    let after = rec
        .iter()
        .find(|e| e.time.seconds_since(start) >= 1590.0 && e.fix.is_some())
        .unwrap();
    let err = h_error(after).unwrap();
    println!(
        "first fix after the tunnel: {:?}, {:.1} s after it, horizontal error {err:.2} m",
        after.fix.unwrap().source,
        after.time.seconds_since(start) - 1590.0
    );
    assert!(err <= r.threshold.h95_m.unwrap());
}

// A receiver that steers its clock in whole milliseconds: every pseudorange jumps by
// 299,792.458 m at once. The filter re-seats its clock, keeps the position (no restart) and
// the static receiver's position does not move at the step more than it does from noise.
#[test]
fn a_millisecond_clock_step_moves_no_position() {
    let spec = trackfix_harness::scenario::parse(
        "seed = 22\nduration_s = 1800\norigin = [47.62, 8.91, 412.0]\n",
        "clock",
    )
    .unwrap();
    let g: Vec<_> = trackfix_harness::scenario::generate::Generator::new(&spec)
        .unwrap()
        .collect();
    let jumped: Vec<usize> = g
        .windows(2)
        .enumerate()
        .filter(|(_, w)| {
            let (a, b) = (&w[0].epoch.obs, &w[1].epoch.obs);
            a.iter().any(|o| {
                b.iter()
                    .any(|p| p.sat == o.sat && (p.pseudorange_m - o.pseudorange_m).abs() > 2.0e5)
            })
        })
        .map(|(k, _)| k + 1)
        .collect();
    assert!(
        jumped.len() >= 2,
        "this seed's receiver steers its clock twice"
    );
    let rec = run(&spec, tracking(Config::default())).unwrap();
    assert_eq!(rec.len(), g.len());
    assert!(rec.iter().skip(1).all(|e| matches!(
        e.fix.map(|f| f.source),
        Some(FixSource::Filtered | FixSource::Held)
    )));
    for &k in &jumped {
        assert_eq!(
            rec[k].filter_event,
            trackfix_engine::FilterEvent::ClockReseated
        );
    }
    let step = |k: usize| {
        let (a, b) = (rec[k - 1].fix.unwrap().ecef_m, rec[k].fix.unwrap().ecef_m);
        (0..3).map(|i| (a[i] - b[i]).powi(2)).sum::<f64>().sqrt()
    };
    let at_jumps = jumped.iter().map(|&k| step(k)).fold(0.0, f64::max);
    let elsewhere = (2..rec.len())
        .filter(|k| !jumped.contains(k))
        .map(step)
        .fold(0.0, f64::max);
    println!(
        "{} clock steps; position change at them {at_jumps:.3} m, largest elsewhere {elsewhere:.3} m",
        jumped.len()
    );
    // The step leaves no mark: the position moves at a clock step no more than it does from
    // noise on some other epoch (a step left in the range would move it by kilometres).
    assert!(at_jumps <= elsewhere, "{at_jumps} m at a clock step");
}

// Snapshot against filtered on the manifest's rows (printed for the closing figures). Where
// the snapshot's 95 % error comes from noise and reflections (the truck in its canyon, the
// parked pallet, the duty-cycled sleeper) the filter's gate and smoothing must not do worse.
// The rows' dominant error otherwise is the slowly varying signal-in-space error (1 m,
// periods of hours), which no filter of this model removes: the "2× better" figure
// is not reached here and is left open in docs/filter.md.
#[test]
fn filtered_against_snapshot_per_row() {
    for name in [
        "static-depot",
        "static-gps-only",
        "pedestrian-park",
        "truck-city-tunnel",
        "ship-open-sea",
        "train-freight",
        "sleeper-downloaded",
        "sleeper-decoded",
        "fault-clock-step",
        "fault-clock-ramp",
    ] {
        let (s, f) = both(name);
        let (a, b) = (Summary::of(&s), Summary::of(&f));
        let kinds = |r: &[EpochRecord]| {
            let mut k = std::collections::BTreeMap::new();
            for e in r {
                *k.entry(e.fix.map_or("none", |f| f.source.as_str()))
                    .or_insert(0) += 1;
            }
            k
        };
        println!("{name}: {:?}", kinds(&f));
        let mut ev = std::collections::BTreeMap::new();
        for e in &f {
            *ev.entry(e.filter_event.as_str()).or_insert(0) += 1;
        }
        println!("{name}: {ev:?}");
        println!(
            "{name}: snapshot H50/95 {:.2}/{:.2} V95 {:.2} availability {:.1} %; filtered H50/95 {:.2}/{:.2} V95 {:.2} availability {:.1} %",
            a.horizontal.p50,
            a.horizontal.p95,
            a.vertical.p95,
            a.availability_pct,
            b.horizontal.p50,
            b.horizontal.p95,
            b.vertical.p95,
            b.availability_pct
        );
        if matches!(
            name,
            "static-depot" | "truck-city-tunnel" | "sleeper-downloaded"
        ) {
            assert!(b.horizontal.p95 <= a.horizontal.p95, "{name}");
            assert!(b.availability_pct >= a.availability_pct, "{name}");
        }
    }
}

// A duty-cycled wake-up: a parked tracker is tracked for two minutes, sleeps five minutes,
// and wakes with a new receiver clock (its pseudoranges all 123,456.7 m longer, inside the
// ±1 ms a wake-up may bring) and only three satellites in its first epoch. The filter,
// which kept its state through the sleep, re-seats the clock from the median innovation
// and gives a fix from three satellites; an engine without the prior (a fresh one, as after
// a reset) has none, and needs its least squares from the Earth's centre on the next full
// epoch. Iterations and errors are printed for the closing figures.
#[test]
fn a_wake_up_keeps_the_position_prior() {
    use trackfix_engine::{Engine, FilterEvent, FixOutcome, NoFixReason};
    use trackfix_harness::scenario::generate::{Generator, GEN_N, SCENARIO_IONO};
    use trackfix_harness::scenario::SCENARIO_EPH;
    let spec = trackfix_harness::scenario::parse(
        "seed = 31\nduration_s = 600\norigin = [46.81, 2.47, 160.0]\nsystems = [\"gps\", \"galileo\"]\n",
        "wake-up",
    )
    .unwrap();
    let gen: Vec<_> = Generator::new(&spec).unwrap().collect();
    let mut kept: Box<Engine<GEN_N, SCENARIO_EPH>> =
        Box::new(Engine::new(Config::default()).unwrap());
    let mut fresh: Box<Engine<GEN_N, SCENARIO_EPH>> =
        Box::new(Engine::new(Config::default()).unwrap());
    for e in [&mut kept, &mut fresh] {
        e.set_ionosphere(SCENARIO_IONO).unwrap();
    }
    for g in &gen {
        for e in &g.new_ephemerides {
            let _ = kept.ingest_ephemeris(*e);
            let _ = fresh.ingest_ephemeris(*e);
        }
    }
    for g in &gen[..120] {
        kept.process(&g.epoch).unwrap();
    }
    // Wake-up at 420 s: three satellites, a new clock.
    let wake = &gen[420];
    let mut first = wake.epoch.clone();
    first.obs.truncate(3);
    for o in first.obs.iter_mut() {
        o.pseudorange_m += 123_456.7;
    }
    let sol = kept.process(&first).unwrap();
    assert_eq!(sol.filter_event, FilterEvent::ClockReseated);
    let FixOutcome::Fix(fix) = sol.outcome else {
        panic!(
            "no fix from three satellites with the prior: {:?}",
            sol.outcome
        )
    };
    let err = trackfix_engine::LocalFrame::at_ecef(wake.truth_ecef).enu(fix.ecef_m);
    println!(
        "wake-up with a new clock, 3 satellites: {:?} fix, {} least-squares iterations, horizontal error {:.2} m",
        fix.source,
        fix.iterations,
        err[0].hypot(err[1])
    );
    // The prior is the held position of two minutes: the error stays that of a fix, far
    // inside the snapshot's 95 % threshold of the static rows (2.1 m, host-tests/manifest.toml).
    assert!(err[0].hypot(err[1]) < 2.1);
    assert_eq!(fix.iterations, 0);
    let cold = fresh.process(&first).unwrap();
    assert!(matches!(
        cold.outcome,
        FixOutcome::NoFix(NoFixReason::TooFewSatellites { .. })
    ));
    // The next full epoch: the fresh engine's least squares from the Earth's centre.
    let next = &gen[421];
    let FixOutcome::Fix(cold_fix) = fresh.process(&next.epoch).unwrap().outcome else {
        panic!("the fresh engine has no fix from a full epoch")
    };
    let mut shifted = next.epoch.clone();
    for o in shifted.obs.iter_mut() {
        o.pseudorange_m += 123_456.7;
    }
    let warm = kept.process(&shifted).unwrap();
    let warm_fix = warm.fix().unwrap();
    println!(
        "next full epoch ({} satellites): without the prior {} iterations from the Earth's centre; with it {:?}, {} iterations",
        next.epoch.obs.len(),
        cold_fix.iterations,
        warm_fix.source,
        warm_fix.iterations
    );
    assert!(cold_fix.iterations >= 3);
    assert_eq!(warm_fix.iterations, 0);
}
