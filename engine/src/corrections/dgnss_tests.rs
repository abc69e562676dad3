use super::*;

fn t(s: f64) -> GnssTime {
    GnssTime::from_week_tow(2300, 300_000.0)
        .unwrap()
        .add_seconds(s)
}

fn correction(sat: u8, c: f64) -> RangeCorrection {
    RangeCorrection {
        sat: SatId::gps(sat),
        signal: Signal::GpsL1Ca,
        correction_m: c,
        rate_mps: 0.01,
        reference_time: t(0.0),
        iode: 42,
        sigma_m: 0.5,
    }
}

// A correction applies with its rate at its age (c + ṙ·age), to the satellite, signal and
// ephemeris issue it was computed for, within the configured age.
#[test]
fn a_correction_applies_with_its_rate() {
    let mut s: CorrectionStore<4> = CorrectionStore::new();
    s.ingest(correction(5, -3.0)).unwrap();
    match s.lookup(SatId::gps(5), Signal::GpsL1Ca, 42, t(30.0), 60.0) {
        Lookup::Apply {
            correction_m,
            age_s,
            ..
        } => {
            assert!((correction_m - (-3.0 + 0.01 * 30.0)).abs() < 1e-12);
            assert_eq!(age_s, 30.0);
        }
        other => panic!("{other:?}"),
    }
}

// Skipped with a reason, never applied wrongly: another satellite or signal, another
// ephemeris issue, too old, from the future.
#[test]
fn what_cannot_be_checked_is_not_applied() {
    let mut s: CorrectionStore<4> = CorrectionStore::new();
    s.ingest(correction(5, 2.0)).unwrap();
    let look = |sat, sig, iode, at| s.lookup(SatId::gps(sat), sig, iode, t(at), 60.0);
    assert_eq!(look(6, Signal::GpsL1Ca, 42, 1.0), Lookup::Missing);
    assert_eq!(look(5, Signal::GpsL5, 42, 1.0), Lookup::Missing);
    assert_eq!(
        look(5, Signal::GpsL1Ca, 43, 1.0),
        Lookup::OtherIssue { iode: 42 }
    );
    assert_eq!(
        look(5, Signal::GpsL1Ca, 42, 61.0),
        Lookup::TooOld { age_s: 61.0 }
    );
    assert_eq!(look(5, Signal::GpsL1Ca, 42, -5.0), Lookup::FromTheFuture);
}

// Bad input (issue 10): a correction of 10 km, NaN, an impossible rate or σ is refused by
// name; the store keeps what it had.
#[test]
fn bad_corrections_are_refused() {
    let mut s: CorrectionStore<4> = CorrectionStore::new();
    s.ingest(correction(5, 1.0)).unwrap();
    assert_eq!(
        s.ingest(correction(5, 10_000.0)),
        Err(CorrectionError::TooLarge {
            correction_m: 10_000.0
        })
    );
    assert_eq!(
        s.ingest(correction(5, f64::NAN)),
        Err(CorrectionError::NotFinite)
    );
    let mut fast = correction(5, 1.0);
    fast.rate_mps = 50.0;
    assert!(matches!(
        s.ingest(fast),
        Err(CorrectionError::RateTooLarge { .. })
    ));
    let mut bad = correction(5, 1.0);
    bad.sigma_m = 0.0;
    assert_eq!(s.ingest(bad), Err(CorrectionError::BadSigma));
    assert!(matches!(
        s.lookup(SatId::gps(5), Signal::GpsL1Ca, 42, t(1.0), 60.0),
        Lookup::Apply { correction_m, .. } if (correction_m - 1.01).abs() < 1e-12
    ));
}

// A newer correction replaces the satellite's earlier one; a full store replaces its oldest.
#[test]
fn replacement_and_a_full_store() {
    let mut s: CorrectionStore<2> = CorrectionStore::new();
    s.ingest(correction(1, 1.0)).unwrap();
    let mut newer = correction(2, 2.0);
    newer.reference_time = t(10.0);
    s.ingest(newer).unwrap();
    let mut again = correction(2, 3.0);
    again.reference_time = t(20.0);
    s.ingest(again).unwrap();
    assert_eq!(s.len(), 2);
    let mut third = correction(3, 4.0);
    third.reference_time = t(30.0);
    s.ingest(third).unwrap();
    assert_eq!(
        s.lookup(SatId::gps(1), Signal::GpsL1Ca, 42, t(30.0), 60.0),
        Lookup::Missing
    );
    assert!(matches!(
        s.lookup(SatId::gps(2), Signal::GpsL1Ca, 42, t(30.0), 60.0),
        Lookup::Apply { correction_m, .. } if (correction_m - 3.1).abs() < 1e-9
    ));
}
