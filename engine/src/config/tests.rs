use super::*;

#[test]
fn the_defaults_are_valid() {
    assert_eq!(Config::default().validate(), Ok(()));
    assert_eq!(Config::default(), Config::DEFAULT);
}

// Each kind of bad value is refused by the name of its field.
#[test]
fn bad_fields_are_named() {
    let mut c = Config::default();
    c.snapshot.elevation_mask_deg = f64::NAN;
    let e = c.validate().unwrap_err();
    assert_eq!(e.field, "snapshot.elevation_mask_deg");
    assert_eq!(e.problem, Problem::NotFinite);

    let mut c = Config::default();
    c.snapshot.sigma_floor_m = -1.0;
    assert_eq!(c.validate().unwrap_err().field, "snapshot.sigma_floor_m");

    let mut c = Config::default();
    c.measurements.pseudorange_span_m = (5.0e7, 1.5e7);
    let e = c.validate().unwrap_err();
    assert_eq!(e.field, "measurements.pseudorange_span_m");
    assert_eq!(e.problem, Problem::EmptySpan);

    let mut c = Config::default();
    c.measurements.systems = SystemSet::only(&[]);
    assert_eq!(c.validate().unwrap_err().problem, Problem::NoSystem);

    let mut c = Config::default();
    c.measurements.signals.galileo = Signal::GpsL1Ca;
    let e = c.validate().unwrap_err();
    assert_eq!(e.field, "measurements.signals.galileo");
    assert_eq!(e.problem, Problem::SignalOfOtherSystem);

    let mut c = Config::default();
    c.snapshot.max_iterations = 0;
    assert_eq!(c.validate().unwrap_err().field, "snapshot.max_iterations");
}

#[test]
fn with_systems_enables_exactly_those() {
    let c = Config::default().with_systems(&[System::Gps, System::Beidou]);
    assert!(c.uses(System::Gps) && c.uses(System::Beidou) && !c.uses(System::Galileo));
}

#[test]
fn filter_fields_are_named() {
    let mut c = Config::default();
    c.filter.motion.accel_psd_horizontal = 0.0;
    assert_eq!(
        c.validate().unwrap_err().field,
        "filter.motion.accel_psd_horizontal"
    );
    let mut c = Config::default();
    c.filter.clock.h0 = -1.0;
    assert_eq!(c.validate().unwrap_err().field, "filter.clock.h0");
    let mut c = Config::default();
    c.filter.gate = f64::INFINITY;
    assert_eq!(c.validate().unwrap_err().problem, Problem::NotFinite);
}

/// Integrity probabilities outside (0, 1), NaN, or an integrity risk below what the
/// non-central search can evaluate are refused with the field named, never used.
#[test]
fn integrity_fields_are_named() {
    for (set, field) in [
        (
            (|c: &mut Config| c.integrity.false_alarm = 0.0) as fn(&mut Config),
            "integrity.false_alarm",
        ),
        (|c| c.integrity.false_alarm = 1.0, "integrity.false_alarm"),
        (|c| c.integrity.false_alarm = -0.1, "integrity.false_alarm"),
        (
            |c| c.integrity.false_alarm = f64::NAN,
            "integrity.false_alarm",
        ),
        (
            |c| c.integrity.integrity_risk = 1e-12,
            "integrity.integrity_risk",
        ),
        (
            |c| c.integrity.integrity_risk = 1.5,
            "integrity.integrity_risk",
        ),
        (
            |c| c.integrity.integrity_risk = f64::NAN,
            "integrity.integrity_risk",
        ),
        (
            |c| c.integrity.max_exclusions = 3,
            "integrity.max_exclusions",
        ),
        (
            |c| c.integrity.exclusion_hold_s = -1.0,
            "integrity.exclusion_hold_s",
        ),
        (
            |c| c.integrity.reflection_sigma_factor = 0.5,
            "integrity.reflection_sigma_factor",
        ),
        (
            |c| c.integrity.max_speed_mps = f64::INFINITY,
            "integrity.max_speed_mps",
        ),
    ] {
        let mut c = Config::default();
        set(&mut c);
        assert_eq!(c.validate().unwrap_err().field, field);
    }
    let mut c = Config::default();
    c.integrity.false_alarm = f64::NAN;
    assert_eq!(c.validate().unwrap_err().problem, Problem::NotFinite);
}

/// Without the `any-probability` feature only the built-in table's probabilities are
/// accepted; with it, any in range.
#[test]
fn probabilities_outside_the_table() {
    let mut c = Config::default();
    c.integrity.false_alarm = 1e-3;
    let r = c.validate();
    #[cfg(not(feature = "any-probability"))]
    assert_eq!(
        r.unwrap_err(),
        ConfigError {
            field: "integrity.false_alarm",
            problem: Problem::NotTabulated
        }
    );
    #[cfg(feature = "any-probability")]
    assert!(r.is_ok());
    let mut c = Config::default();
    c.integrity.integrity_risk = 1e-5;
    let r = c.validate();
    #[cfg(not(feature = "any-probability"))]
    assert_eq!(r.unwrap_err().field, "integrity.integrity_risk");
    #[cfg(feature = "any-probability")]
    assert!(r.is_ok());
}
