use super::*;

fn utc(year: i32, month: u8, day: u8, hour: u8, minute: u8, second: u8) -> UtcDateTime {
    UtcDateTime {
        year,
        month,
        day,
        hour,
        minute,
        second,
        nanosecond: 0,
    }
}

// 10-bit broadcast week 247 near 2024 resolves to week 2295 (2295 mod 1024 = 247). The
// conversions against astropy and the BeiDou/Galileo time scales are checked in
// host-tests/tests/models_reference.rs.
#[test]
fn ten_bit_week_resolves_near_reference() {
    let near = GnssTime::from_week_tow(2290, 0.0).unwrap();
    assert_eq!(resolve_week_rollover(247, near), 2295);
    // A week just past a rollover, seen from just before it.
    let near = GnssTime::from_week_tow(2047, 600_000.0).unwrap();
    assert_eq!(resolve_week_rollover(0, near), 2048);
    assert_eq!(resolve_week_rollover(1023, near), 2047);
}

#[test]
fn week_crossover_wrap() {
    // IS-GPS-200 §20.3.3.4.3: t − toe above 302,400 s has 604,800 s removed, and vice versa.
    assert_eq!(wrap_half_week(302_401.0), 302_401.0 - 604_800.0);
    assert_eq!(wrap_half_week(-302_401.0), -302_401.0 + 604_800.0);
    assert_eq!(wrap_half_week(1000.0), 1000.0);
}

#[test]
fn sub_nanosecond_difference_is_exact_across_a_week() {
    let a = GnssTime::from_week_tow(2111, 604_799.5).unwrap();
    let b = GnssTime::from_week_tow(2112, 0.25).unwrap();
    assert_eq!(b.seconds_since(a), 0.75);
    assert_eq!(a.add_seconds(0.75), b);
}

#[test]
fn bad_fields_are_typed_errors() {
    assert_eq!(
        GnssTime::from_week_tow(1, -1.0),
        Err(TimeError::TimeOfWeekOutOfRange)
    );
    assert_eq!(
        GnssTime::from_week_tow(1, 604_800.0),
        Err(TimeError::TimeOfWeekOutOfRange)
    );
    assert_eq!(
        GnssTime::from_week_tow(1, f64::NAN),
        Err(TimeError::TimeOfWeekOutOfRange)
    );
    assert_eq!(
        GnssTime::from_utc(utc(2023, 2, 29, 0, 0, 0), 18),
        Err(TimeError::CalendarField)
    );
    assert_eq!(
        GnssTime::from_utc(utc(2024, 13, 1, 0, 0, 0), 18),
        Err(TimeError::CalendarField)
    );
    assert_eq!(
        GnssTime::from_week_tow(u32::MAX, 0.0),
        Err(TimeError::OutOfSpan)
    );
}
