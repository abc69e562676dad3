//! One epoch through the engine for 8, 12 and 24 satellites, on the host: `filtered` (the
//! default configuration: ephemeris evaluation, corrections, the navigation filter's
//! prediction and update) and `snapshot` (ephemeris evaluation, corrections, weighted least
//! squares and the Doppler velocity). Run: `cargo bench -p trackfix-harness --bench epoch`.

use criterion::{criterion_group, criterion_main, BatchSize, BenchmarkId, Criterion};
use rand::SeedableRng;
use std::hint::black_box;
use trackfix_engine::config::FilterMode;
use trackfix_engine::{Config, Engine, Epoch, GnssTime, System};
use trackfix_harness::synth::observe_with;

mod common;

fn bench(c: &mut Criterion) {
    let t0 = GnssTime::from_week_tow(2300, 100_000.0).unwrap();
    let (cons, rx, iono, errors) =
        common::scene(t0, &[System::Gps, System::Galileo, System::Beidou]);
    for (name, mode) in [
        ("filtered", FilterMode::Tracking),
        ("snapshot", FilterMode::Snapshot),
    ] {
        let mut rng = rand::rngs::StdRng::seed_from_u64(9);
        let mut group = c.benchmark_group(format!("epoch/{name}"));
        for n in [8usize, 12, 24] {
            let full: Epoch<32> = observe_with(&rx, &cons, t0, &errors, &mut rng);
            assert!(
                full.obs.len() >= n,
                "only {} satellites in view",
                full.obs.len()
            );
            let mut first = full.clone();
            first.obs.truncate(n);
            // The next second, observed afresh (the same satellites): a consistent epoch.
            let later: Epoch<32> = observe_with(&rx, &cons, t0.add_seconds(1.0), &errors, &mut rng);
            let mut next = later.clone();
            next.obs
                .retain(|o| first.obs.iter().any(|f| f.sat == o.sat));
            let mut cfg = Config::default();
            cfg.snapshot.elevation_mask_deg = 5.0;
            cfg.filter.mode = mode;
            let mut engine: Engine<32, 96> = Engine::new(cfg).expect("a valid configuration");
            for e in &cons.ephemerides {
                engine.ingest_ephemeris(*e).unwrap();
            }
            engine.set_ionosphere(iono).expect("finite coefficients");
            // Warm start: the previous epoch started the filter (or seeds the least squares).
            assert!(engine.process(&first).unwrap().fix().is_some());
            group.bench_with_input(BenchmarkId::from_parameter(n), &n, |b, _| {
                b.iter_batched_ref(
                    || engine.clone(),
                    |e| black_box(e.process(black_box(&next))),
                    BatchSize::SmallInput,
                )
            });
        }
        group.finish();
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
