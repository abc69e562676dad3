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
