use trackfix_engine::{IntegrityState, SatStatus};
use trackfix_harness::manifest::{config_for, Manifest};
use trackfix_harness::metrics::Summary;
fn main() {
    let args: Vec<String> = std::env::args().collect();
    let m = Manifest::read(std::path::Path::new("host-tests/manifest.toml")).unwrap();
    let row = m.scenario.iter().find(|r| r.name == args[1]);
    let ds = m.dataset.iter().find(|r| r.name == args[1]);
    for variant in ["default", "no-integrity", "no-reflect", "no-hold-out"] {
        let mut c = match (row, ds) {
            (Some(r), _) => config_for(r.systems()),
            (_, Some(d)) => config_for(&d.systems),
            _ => panic!(),
        };
        match variant {
            "no-integrity" => {
                c.integrity.enabled = false;
                c.integrity.reflection_sigma_factor = 1.0;
            }
            "no-reflect" => c.integrity.reflection_sigma_factor = 1.0,
            "no-hold-out" => c.integrity.exclusion_hold_s = 0.0,
            _ => {}
        }
        if args.get(2).is_some_and(|a| a == "snap") {
            c.filter.mode = trackfix_engine::config::FilterMode::Snapshot;
        }
        let r = match (row, ds) {
            (Some(row), _) => row.records_with(c).unwrap(),
            (_, Some(d)) => d
                .records_with(&trackfix_harness::data::data_dir().unwrap(), c)
                .unwrap(),
            _ => panic!(),
        };
        if variant == "default" && args.get(2).is_some_and(|a| a == "flags") {
            for e in &r {
                if !e.integrity.flags.is_empty() || e.integrity.state == IntegrityState::Unavailable
                {
                    println!(
                        "{:?} {:?} {:?} {:?} {:?} used {:?}",
                        e.time.tow_s(),
                        e.integrity.state,
                        e.integrity.flags.names().collect::<Vec<_>>(),
                        e.filter_event,
                        e.fix.map(|f| f.source),
                        e.fix.map(|f| f.used)
                    );
                }
            }
        }
        if variant == "default" && args.get(2).is_some_and(|a| a == "runs") {
            runs(&r);
        }
        let s = Summary::of(&r);
        let f = &s.filter;
        let states = [
            IntegrityState::Verified,
            IntegrityState::FaultExcluded,
            IntegrityState::Unavailable,
            IntegrityState::Alert,
        ]
        .map(|st| r.iter().filter(|e| e.integrity.state == st).count());
        let refl: usize = r
            .iter()
            .map(|e| e.sats.iter().filter(|s| s.reflection).count())
            .sum();
        let excl: usize = r
            .iter()
            .map(|e| {
                e.sats
                    .iter()
                    .filter(|s| matches!(s.status, SatStatus::Excluded { .. }))
                    .count()
            })
            .sum();
        let flags: usize = r.iter().filter(|e| !e.integrity.flags.is_empty()).count();
        println!("{variant}: h95 {:.2} v95 {:.2} spread {:?} drift {:?} states V/FE/U/A {:?} refl {refl} excl {excl} flagged {flags} kinds {:?}",
            s.horizontal.p95, s.vertical.p95, f.hold_spread95_m, f.hold_drift_m, states, f.kinds);
    }
}
#[allow(dead_code)]
pub fn runs(r: &[trackfix_harness::record::EpochRecord]) {
    use trackfix_engine::FixSource;
    let mut cur: Vec<(usize, [f64; 3], u8, u8, String)> = vec![];
    for (i, e) in r.iter().enumerate() {
        match e.fix {
            Some(f) if f.source == FixSource::Held => {
                let ex = e
                    .sats
                    .iter()
                    .filter(|s| matches!(s.status, SatStatus::Excluded { .. } | SatStatus::KeptOut))
                    .count() as u8;
                let rf = e
                    .sats
                    .iter()
                    .filter(|s| s.reflection && s.status == SatStatus::Used)
                    .count() as u8;
                cur.push((
                    i,
                    f.enu_error_m.unwrap(),
                    ex,
                    rf,
                    format!("{:?}", e.filter_event),
                ));
            }
            _ => {
                if cur.len() > 3 {
                    let first = cur[0].1;
                    let last = cur[cur.len() - 1].1;
                    let d = ((first[0] - last[0]).powi(2) + (first[1] - last[1]).powi(2)).sqrt();
                    if d > 0.5 {
                        println!("run at {} len {} drift {:.2}", cur[0].0, cur.len(), d);
                        for c in cur.iter().step_by((cur.len() / 12).max(1)) {
                            println!(
                                "   {} e {:.2} n {:.2} excl {} refl {} {}",
                                c.0, c.1[0], c.1[1], c.2, c.3, c.4
                            );
                        }
                    }
                }
                cur.clear();
            }
        }
    }
}
