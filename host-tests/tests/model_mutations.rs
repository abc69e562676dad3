//! A model error reaches the accuracy gates: the synthetic measurements are built by the
//! independent truth models of `trackfix_harness::truth`, so when those and the engine's
//! models disagree — here by a deliberate sign error on the truth side, which the engine
//! sees exactly as it would see the same sign error in its own code — the manifest rows'
//! thresholds are crossed. Without the independence (the generator calling the engine's
//! functions) the same mistake would cancel and pass unseen.

use std::path::Path;
use trackfix_harness::manifest::{
    config_for, snapshot_config, Manifest, ScenarioRow, Threshold, MANIFEST,
};
use trackfix_harness::metrics::Summary;
use trackfix_harness::scenario::run_mutated;
use trackfix_harness::truth::Mutation;

fn row(name: &str) -> ScenarioRow {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
    let m = Manifest::read(&root.join(MANIFEST)).unwrap();
    m.scenario.into_iter().find(|r| r.name == name).unwrap()
}

/// The limits of `t` that `s` crosses, by name.
fn crossed(t: &Threshold, s: &Summary) -> Vec<&'static str> {
    let (h, v) = (&s.horizontal, &s.vertical);
    [
        ("H 50 %", h.p50, t.h50_m),
        ("H 95 %", h.p95, t.h95_m),
        ("V 50 %", v.p50, t.v50_m),
        ("V 95 %", v.p95, t.v95_m),
    ]
    .into_iter()
    .filter(|(_, got, limit)| limit.is_some_and(|l| got.is_nan() || *got > l))
    .map(|(name, _, _)| name)
    .collect()
}

/// The row's two runs under mutation `m`, each with its limits: the default (filtered)
/// and snapshot-only.
fn summaries(row: &ScenarioRow, m: Mutation) -> [(&'static str, Summary, Threshold); 2] {
    let run = |cfg| Summary::of(&run_mutated(&row.spec, cfg, m).unwrap());
    [
        ("filtered", run(config_for(row.systems())), row.filtered),
        (
            "snapshot",
            run(snapshot_config(row.systems())),
            row.threshold,
        ),
    ]
}

#[test]
fn each_sign_error_crosses_the_static_rows_thresholds() {
    let mutations = [
        (
            "relativistic clock term sign",
            Mutation {
                relativity: -1.0,
                ..Mutation::default()
            },
        ),
        (
            "group delay (TGD/BGD) sign",
            Mutation {
                group_delay: -1.0,
                ..Mutation::default()
            },
        ),
        (
            "Earth rotation (Sagnac) sign",
            Mutation {
                sagnac: -1.0,
                ..Mutation::default()
            },
        ),
    ];
    for name in ["static-depot", "static-gps-only"] {
        let r = row(name);
        for (run, clean, t) in summaries(&r, Mutation::default()) {
            assert!(
                crossed(&t, &clean).is_empty(),
                "{name} ({run}) without a mutation must pass"
            );
        }
        for (what, m) in mutations {
            for (run, s, t) in summaries(&r, m) {
                let over = crossed(&t, &s);
                println!(
                    "{name} ({run}), {what}: H 95 % {:.2} m, V 95 % {:.2} m, crosses {over:?}",
                    s.horizontal.p95, s.vertical.p95
                );
                assert!(!over.is_empty(), "{name} ({run}): {what} passed unseen");
            }
        }
    }
}
