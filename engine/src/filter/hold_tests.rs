use super::*;
use crate::config::FilterConfig;

fn at(s: i64) -> GnssTime {
    GnssTime::from_week_tow(2300, 0.0)
        .unwrap()
        .plus(crate::Duration::from_secs(s))
}

#[test]
fn held_after_the_configured_still_time_and_released_at_once() {
    let cfg = FilterConfig::DEFAULT;
    let mut s = Stillness::Moving;
    for k in 0..=5 {
        s = s.after(&cfg, at(k), 0.02, 0.03);
    }
    assert!(s.held(), "still for hold_after_s = 5 s");
    let s = s.after(&cfg, at(6), 0.5, 0.03);
    assert_eq!(s, Stillness::Moving);
}

#[test]
fn an_uncertain_velocity_is_not_still() {
    let cfg = FilterConfig::DEFAULT;
    let mut s = Stillness::Moving;
    for k in 0..20 {
        s = s.after(&cfg, at(k), 0.0, 1.0);
    }
    assert_eq!(s, Stillness::Moving);
}

#[test]
fn the_hold_can_be_switched_off() {
    let mut cfg = FilterConfig::DEFAULT;
    cfg.hold = HoldMode::Off;
    let mut s = Stillness::Moving;
    for k in 0..20 {
        s = s.after(&cfg, at(k), 0.0, 0.0);
    }
    assert_eq!(s, Stillness::Moving);
}

#[test]
fn motion_shows_above_the_quantile() {
    // χ²(8) 0.999 = 26.12 [C: scipy.stats.chi2.ppf(0.999, 8)].
    assert!(!shows_motion(20.0, 8));
    assert!(shows_motion(40.0, 8));
    assert!(!shows_motion(1e9, 0));
}
