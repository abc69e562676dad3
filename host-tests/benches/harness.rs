//! Harness throughput: epochs per second per core for a synthetic scenario (generation +
//! engine + records) and for a recorded replay (RINEX parsing + engine).
//! Run: `cargo bench -p trackfix-harness --bench harness`.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use trackfix_engine::{Config, System};
use trackfix_harness::data::data_dir;
use trackfix_harness::replay::{dataset, replay};
use trackfix_harness::scenario::{parse, run};

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("harness");
    g.sample_size(10);
    let spec = parse(
        "duration_s = 599\norigin = [47.6, 8.9, 400.0]\nsystems = [\"gps\", \"galileo\", \"beidou\"]\n",
        "bench",
    )
    .unwrap();
    let n = run(&spec, Config::default()).unwrap().len() as u64;
    g.throughput(Throughput::Elements(n));
    g.bench_function("synthetic GPS+Galileo+BeiDou, epochs", |b| {
        b.iter(|| run(&spec, Config::default()).unwrap())
    });
    if let Some(dir) = data_dir() {
        let ds = dataset(
            &dir,
            "esbc_2020177/ESBC00DNK_R_20201770000_01D_30S_MO_first2h.rnx",
            &["esbc_2020177/ESBC00DNK_R_20201770000_01D_MN.rnx"],
            None,
        );
        let cfg = Config::default().with_systems(&[System::Gps, System::Galileo]);
        g.throughput(Throughput::Elements(240));
        g.bench_function("recorded ESBC replay, epochs", |b| {
            b.iter(|| replay(&ds, cfg).unwrap())
        });
    }
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
