use super::*;

// Exact across a week boundary and over decades (integer arithmetic); the float
// conversion happens once.
#[test]
fn spans_are_exact_integers() {
    let a = GnssTime::from_week_tow(2047, 604_799.5).unwrap();
    let b = GnssTime::from_week_tow(2048, 0.25).unwrap();
    assert_eq!(b.since(a), Duration::from_nanos(750_000_000));
    assert_eq!(a.plus(b.since(a)), b);
    assert_eq!(b.since(a).as_secs_f64(), 0.75);
    let far = GnssTime::from_week_tow(3000, 0.0).unwrap();
    let d = far.since(GnssTime::EPOCH);
    assert_eq!(d.as_nanos(), 3000 * 604_800 * NS_PER_S);
    assert_eq!(
        GnssTime::EPOCH.since(far),
        Duration::from_nanos(-d.as_nanos())
    );
    assert_eq!(GnssTime::EPOCH.since(far).abs(), d);
}

#[test]
fn float_seconds_are_checked() {
    assert_eq!(
        Duration::from_secs_f64(1.5),
        Some(Duration::from_nanos(1_500_000_000))
    );
    assert_eq!(Duration::from_secs_f64(f64::NAN), None);
    assert_eq!(Duration::from_secs_f64(1e12), None);
    assert_eq!(
        Duration::from_secs(60),
        Duration::from_secs_f64(60.0).unwrap()
    );
}
