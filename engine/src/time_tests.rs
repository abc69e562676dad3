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

// Source: CHECKS.md "GPS time" [C: astropy with its bundled leap-second table]:
// 1999-08-22 00:00 UTC = week 1024, TOW 13 s (GPS − UTC was 13 s then).
#[test]
fn first_rollover_matches_astropy() {
    let t = GnssTime::from_utc(utc(1999, 8, 22, 0, 0, 0), 13).unwrap();
    assert_eq!(t.week(), 1024);
    assert_eq!(t.tow_s(), 13.0);
}

// Same source: 2019-04-07 00:00 UTC = week 2048, TOW 18 s.
#[test]
fn second_rollover_matches_astropy() {
    let t = GnssTime::from_utc(utc(2019, 4, 7, 0, 0, 0), 18).unwrap();
    assert_eq!(t.week(), 2048);
    assert_eq!(t.tow_s(), 18.0);
}

// Same source: 2024-01-01 00:00:00 UTC = GPS second 1,388,102,418 = week 2295, TOW 86,418 s.
#[test]
fn new_year_2024_matches_astropy() {
    let t = GnssTime::from_utc(utc(2024, 1, 1, 0, 0, 0), 18).unwrap();
    assert_eq!(t.as_nanos(), 1_388_102_418 * 1_000_000_000);
    assert_eq!(t.week(), 2295);
    assert_eq!(t.tow_s(), 86_418.0);
    assert_eq!(t.to_utc(18), utc(2024, 1, 1, 0, 0, 0));
}

// 10-bit broadcast week 247 near 2024 resolves to week 2295 (2295 mod 1024 = 247; same source).
#[test]
fn ten_bit_week_resolves_near_reference() {
    let near = GnssTime::from_week_tow(2290, 0.0).unwrap();
    assert_eq!(resolve_week_rollover(247, near), 2295);
    // A week just past a rollover, seen from just before it.
    let near = GnssTime::from_week_tow(2047, 600_000.0).unwrap();
    assert_eq!(resolve_week_rollover(0, near), 2048);
    assert_eq!(resolve_week_rollover(1023, near), 2047);
}

// BDT = GPST − 14 s, BDT week 0 = GPS week 1356 (CHECKS.md "Galileo and BeiDou" [M];
// BeiDou B1I ICD §5.2.4.1).
#[test]
fn beidou_time_scale() {
    let t = GnssTime::from_bdt(0, 0.0).unwrap();
    assert_eq!(t.week(), 1356);
    assert_eq!(t.tow_s(), 14.0);
    assert_eq!(t.bdt_week_tow(), (0, 0.0));
}

// GST week 0 = GPS week 1024, same second count (Galileo OS SIS ICD §5.1.2) [M].
#[test]
fn galileo_time_scale() {
    let t = GnssTime::from_gst(1087, 345_600.0).unwrap();
    assert_eq!(t.week(), 2111);
    assert_eq!(t.tow_s(), 345_600.0);
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
