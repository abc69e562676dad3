//! Bad input never panics and never yields a silent wrong fix: a table of cases, each with
//! the typed error or per-satellite status it must produce.

use proptest::prelude::*;
use rand::SeedableRng;
use trackfix_engine::{
    BroadcastEphemeris, Config, DopplerUse, Engine, EphemerisError, Epoch, EpochError, FixOutcome,
    Geodetic, GnssTime, NoFixReason, Observation, SatId, SatStatus, Signal, System,
};
use trackfix_harness::synth::{constellation, observe, StaticReceiver};

type TestEngine = Engine<40, 64>;

fn t0() -> GnssTime {
    GnssTime::from_week_tow(2300, 200_000.0).unwrap()
}

fn setup() -> (TestEngine, Epoch<40>, Vec<BroadcastEphemeris>) {
    let cons = constellation(11, t0(), &[System::Gps]);
    let mut e = TestEngine::new(Config::default()).unwrap();
    for eph in &cons.ephemerides {
        e.ingest_ephemeris(*eph).unwrap();
    }
    let rx = StaticReceiver {
        position: Geodetic::from_degrees(-33.62, 150.31, 10.0).to_ecef(),
        horizon_deg: 15.0,
        clock_bias_m: 0.0,
        inter_system_bias_m: 0.0,
    };
    let mut rng = rand::rngs::StdRng::seed_from_u64(2);
    let epoch = observe::<40>(&rx, &cons, t0(), 0.5, &mut rng);
    (e, epoch, cons.ephemerides)
}

/// Replaces the first observation's pseudorange, processes, returns its status and the
/// epoch outcome.
fn with_first(f: impl FnOnce(&mut Observation)) -> (SatStatus, FixOutcome) {
    let (mut engine, mut epoch, _) = setup();
    f(&mut epoch.obs[0]);
    let sol = engine.process(&epoch).unwrap();
    (sol.sats[0].status, sol.outcome)
}

#[test]
fn per_observation_table() {
    let cases: Vec<(&str, Box<dyn FnOnce(&mut Observation)>, SatStatus)> = vec![
        (
            "NaN pseudorange",
            Box::new(|o| o.pseudorange_m = f64::NAN),
            SatStatus::BadPseudorange,
        ),
        (
            "+inf pseudorange",
            Box::new(|o| o.pseudorange_m = f64::INFINITY),
            SatStatus::BadPseudorange,
        ),
        (
            "-inf pseudorange",
            Box::new(|o| o.pseudorange_m = f64::NEG_INFINITY),
            SatStatus::BadPseudorange,
        ),
        (
            "negative pseudorange",
            Box::new(|o| o.pseudorange_m = -2.2e7),
            SatStatus::BadPseudorange,
        ),
        (
            "absurd pseudorange",
            Box::new(|o| o.pseudorange_m = 4.0e9),
            SatStatus::BadPseudorange,
        ),
        (
            "zero = not measured",
            Box::new(|o| o.pseudorange_m = 0.0),
            SatStatus::NotMeasured,
        ),
        (
            "unknown satellite",
            Box::new(|o| o.sat = SatId::gps(32)),
            SatStatus::NoEphemeris,
        ),
        (
            "wrong signal",
            Box::new(|o| o.signal = Signal::GpsL2),
            SatStatus::SignalNotUsed,
        ),
        (
            "weak C/N0",
            Box::new(|o| o.cn0_dbhz = Some(12.0)),
            SatStatus::WeakSignal,
        ),
        (
            "satellite with no ephemeris held (system enabled)",
            Box::new(|o| {
                o.sat = SatId::beidou(7);
                o.signal = Signal::BdsB1I;
            }),
            SatStatus::NoEphemeris,
        ),
    ];
    for (name, f, want) in cases {
        let (got, outcome) = with_first(f);
        assert_eq!(got, want, "{name}");
        // The rest of the epoch still gives a fix: one bad observation costs one satellite.
        assert!(matches!(outcome, FixOutcome::Fix(_)), "{name}: {outcome:?}");
    }
    // NaN or zero C/N0 means "not reported", not "weak".
    let (got, _) = with_first(|o| o.cn0_dbhz = Some(f32::NAN));
    assert_eq!(got, SatStatus::Used);
    let (got, _) = with_first(|o| o.cn0_dbhz = Some(0.0));
    assert_eq!(got, SatStatus::Used);
}

#[test]
fn duplicate_satellite_is_flagged_not_double_counted() {
    let (mut engine, mut epoch, _) = setup();
    let first = epoch.obs[0];
    epoch.obs.push(first).unwrap();
    let sol = engine.process(&epoch).unwrap();
    assert_eq!(sol.sats.last().unwrap().status, SatStatus::Duplicate);
    assert_eq!(sol.sats[0].status, SatStatus::Used);
}

#[test]
fn unhealthy_and_stale_ephemerides() {
    let (mut engine, epoch, ephs) = setup();
    let target = epoch.obs[0].sat;
    let mut sick = *ephs.iter().find(|e| e.sat == target).unwrap();
    sick.health = 1;
    sick.iode = 2;
    sick.iodc = 2;
    engine.ingest_ephemeris(sick).unwrap();
    let sol = engine.process(&epoch).unwrap();
    assert_eq!(sol.sats[0].status, SatStatus::Unhealthy);

    // Three hours after toe the default 2-hour validity has lapsed for every satellite.
    let (mut engine, mut epoch, _) = setup();
    epoch.time = t0().add_seconds(3.0 * 3600.0);
    let sol = engine.process(&epoch).unwrap();
    assert!(sol.sats.iter().all(|s| s.status == SatStatus::Stale));
    assert_eq!(
        sol.outcome,
        FixOutcome::NoFix(NoFixReason::TooFewSatellites {
            usable: 0,
            needed: 3
        })
    );
}

#[test]
fn disabled_system_is_named() {
    let (mut engine, mut epoch, _) = setup();
    let cfg = Config::default().with_systems(&[System::Gps, System::Galileo]);
    engine.set_config(cfg).unwrap();
    epoch.obs[0].sat = SatId {
        system: System::Beidou,
        prn: 7,
    };
    epoch.obs[0].signal = Signal::BdsB1I;
    let sol = engine.process(&epoch).unwrap();
    assert_eq!(sol.sats[0].status, SatStatus::SystemDisabled);
}

#[test]
fn time_going_backwards_is_refused() {
    let (mut engine, epoch, _) = setup();
    engine.process(&epoch).unwrap();
    let err = engine.process(&epoch).unwrap_err();
    assert_eq!(
        err,
        EpochError::TimeNotIncreasing {
            previous: epoch.time,
            got: epoch.time
        }
    );
    let mut earlier = epoch.clone();
    earlier.time = epoch.time.add_seconds(-1.0);
    assert!(engine.process(&earlier).is_err());
    engine.reset_time();
    assert!(engine.process(&earlier).is_ok());
}

#[test]
fn corrupted_ephemeris_fields_are_refused() {
    let (mut engine, _, ephs) = setup();
    let good = ephs[0];
    let cases: Vec<(&str, BroadcastEphemeris, EphemerisError)> = vec![
        (
            "NaN M0",
            BroadcastEphemeris {
                m0: f64::NAN,
                ..good
            },
            EphemerisError::NotFinite,
        ),
        (
            "inf af0",
            BroadcastEphemeris {
                af0: f64::INFINITY,
                ..good
            },
            EphemerisError::NotFinite,
        ),
        (
            "e = 0.9",
            BroadcastEphemeris { e: 0.9, ..good },
            EphemerisError::Eccentricity,
        ),
        (
            "√A = 0",
            BroadcastEphemeris {
                sqrt_a: 0.0,
                ..good
            },
            EphemerisError::SemiMajorAxis,
        ),
        (
            "toe = 700000",
            BroadcastEphemeris {
                toe_s: 700_000.0,
                ..good
            },
            EphemerisError::TimeOfWeek,
        ),
        (
            "IODC ≠ IODE",
            BroadcastEphemeris {
                iodc: 0x105,
                iode: 6,
                ..good
            },
            EphemerisError::IssueMismatch,
        ),
        (
            "PRN 0",
            BroadcastEphemeris {
                sat: SatId::gps(0),
                ..good
            },
            EphemerisError::Prn,
        ),
    ];
    for (name, eph, want) in cases {
        assert_eq!(engine.ingest_ephemeris(eph), Err(want), "{name}");
    }
}

#[test]
fn epoch_of_garbage_gives_no_fix_with_reasons() {
    let (mut engine, mut epoch, _) = setup();
    for o in epoch.obs.iter_mut() {
        o.pseudorange_m = f64::NAN;
    }
    let sol = engine.process(&epoch).unwrap();
    assert!(sol
        .sats
        .iter()
        .all(|s| s.status == SatStatus::BadPseudorange));
    assert!(matches!(
        sol.outcome,
        FixOutcome::NoFix(NoFixReason::TooFewSatellites { usable: 0, .. })
    ));
}

// Pseudoranges wrong by growing amounts (1,000 km more per satellite) fit no point near the
// Earth: the epoch says it has no fix rather than reporting one.
#[test]
fn wildly_inconsistent_ranges_give_no_fix() {
    let (mut engine, mut epoch, _) = setup();
    for (i, o) in epoch.obs.iter_mut().enumerate() {
        o.pseudorange_m += 1.0e6 * (i as f64);
    }
    let sol = engine.process(&epoch).unwrap();
    assert!(
        matches!(
            sol.outcome,
            FixOutcome::NoFix(NoFixReason::NoConvergence | NoFixReason::ImplausiblePosition)
        ),
        "{:?}",
        sol.outcome
    );
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]
    // Property: any pseudoranges, C/N0 values and time tags give a result, never a panic,
    // and any fix reported has finite coordinates and a height inside the configured span.
    #[test]
    fn arbitrary_measurements_never_panic(
        prs in proptest::collection::vec(prop_oneof![any::<f64>(), 1.9e7f64..2.6e7], 0..40),
        cn0 in proptest::option::of(any::<f32>()),
        dt in -1.0e7f64..1.0e7,
    ) {
        let (mut engine, _, ephs) = setup();
        let mut epoch: Epoch<40> = Epoch::new(t0().add_seconds(dt));
        for (i, pr) in prs.iter().enumerate() {
            let sat = ephs[i % ephs.len()].sat;
            let mut o = Observation::code(sat, Signal::GpsL1Ca, *pr);
            o.cn0_dbhz = cn0;
            epoch.push(o).unwrap();
        }
        let sol = engine.process(&epoch).unwrap();
        prop_assert_eq!(sol.sats.len(), prs.len());
        if let Some(f) = sol.fix() {
            prop_assert!(f.ecef_m.iter().all(|v| v.is_finite()));
            let span = Config::default().snapshot.height_span_m;
            prop_assert!(f.geodetic.height_m >= span.0 && f.geodetic.height_m <= span.1);
        }
    }
}

// A bad Doppler costs only that Doppler: NaN, ±∞ and 100 km/s (beyond any satellite's range
// rate plus a receiver oscillator's offset) are refused by status, the pseudorange is still
// used and the position fix stands. The rest of the epoch has no Doppler, so no velocity.
#[test]
fn bad_doppler_is_refused_alone() {
    let hz_for_100_km_s = 100_000.0 * 1_575.42e6 / 299_792_458.0;
    for bad in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY, hz_for_100_km_s] {
        let (mut engine, mut epoch, _) = setup();
        epoch.obs[0].doppler_hz = Some(bad);
        let sol = engine.process(&epoch).unwrap();
        assert_eq!(sol.sats[0].doppler, DopplerUse::Rejected, "{bad}");
        assert_eq!(sol.sats[0].status, SatStatus::Used, "{bad}");
        let fix = sol.fix().expect("the position fix stands");
        assert!(fix.velocity.is_none());
    }
    // Zero means not measured (receivers report missing values so).
    let (mut engine, mut epoch, _) = setup();
    epoch.obs[0].doppler_hz = Some(0.0);
    let sol = engine.process(&epoch).unwrap();
    assert_eq!(sol.sats[0].doppler, DopplerUse::NotReported);
}

// A ten-year jump between epochs: the filter does not predict across it (longer than
// `filter.max_gap_s`), the ephemerides are far too old to use, and the epoch gives no fix
// with its reasons — no panic, no NaN, and the filter says it restarted.
#[test]
fn a_ten_year_step_is_not_predicted_across() {
    let (mut engine, epoch, _) = setup();
    assert!(engine.process(&epoch).unwrap().fix().is_some());
    let mut later = epoch.clone();
    later.time = epoch.time.add_seconds(10.0 * 365.25 * 86_400.0);
    let sol = engine.process(&later).unwrap();
    assert!(sol.fix().is_none());
    assert_eq!(
        sol.filter_event,
        trackfix_engine::FilterEvent::RestartedAfterGap
    );
    assert!(sol.sats.iter().all(|s| s.status == SatStatus::Stale));
}
