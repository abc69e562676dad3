//! The integrity stage's cost on the host, 12 satellites, snapshot fixes (the least squares
//! alone is the "plain fix"): `plain` with integrity off, `checked` with the residual test
//! and the protection levels, `excluded` with one satellite 100 m off (test, identification,
//! rank-one exclusion, test again, and the least squares solved once more without it).
//! Run: `cargo bench -p trackfix-harness --bench integrity`.

use criterion::{criterion_group, criterion_main, BatchSize, Criterion};
use rand::SeedableRng;
use std::hint::black_box;
use trackfix_engine::config::FilterMode;
use trackfix_engine::{Config, Engine, Epoch, GnssTime, System};
use trackfix_harness::synth::observe_with;

mod common;

fn bench(c: &mut Criterion) {
    let t0 = GnssTime::from_week_tow(2300, 100_000.0).unwrap();
    let (cons, rx, iono, errors) = common::scene(t0, &[System::Gps, System::Galileo]);
    let mut rng = rand::rngs::StdRng::seed_from_u64(9);
    let full: Epoch<32> = observe_with(&rx, &cons, t0, &errors, &mut rng);
    assert!(full.obs.len() >= 12, "only {} in view", full.obs.len());
    let mut first = full.clone();
    first.obs.truncate(12);
    // The next second, observed afresh (the same satellites): a consistent epoch.
    let later: Epoch<32> = observe_with(&rx, &cons, t0.add_seconds(1.0), &errors, &mut rng);
    let mut next = later.clone();
    next.obs
        .retain(|o| first.obs.iter().any(|f| f.sat == o.sat));
    let mut faulty = next.clone();
    faulty.obs[5].pseudorange_m += 100.0;
    let mut group = c.benchmark_group("integrity");
    for (name, enabled, epoch) in [
        ("plain", false, &next),
        ("checked", true, &next),
        ("excluded", true, &faulty),
    ] {
        let mut cfg = Config::default();
        cfg.snapshot.elevation_mask_deg = 5.0;
        cfg.filter.mode = FilterMode::Snapshot;
        cfg.integrity.enabled = enabled;
        let mut engine: Engine<32, 96> = Engine::new(cfg).expect("a valid configuration");
        for e in &cons.ephemerides {
            engine.ingest_ephemeris(*e).unwrap();
        }
        engine.set_ionosphere(iono).expect("finite coefficients");
        assert!(engine.process(&first).unwrap().fix().is_some());
        group.bench_function(name, |b| {
            b.iter_batched_ref(
                || engine.clone(),
                |e| black_box(e.process(black_box(epoch))),
                BatchSize::SmallInput,
            )
        });
    }
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
