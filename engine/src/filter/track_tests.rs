use super::*;
use crate::linalg::lower_median as median;

#[test]
fn the_median_is_the_lower_middle_value() {
    assert_eq!(median::<f64>(&[]), None);
    assert_eq!(median(&[4.0]), Some(4.0));
    assert_eq!(median(&[3.0, 1.0, 2.0]), Some(2.0));
    assert_eq!(median(&[5.0, 1.0, 4.0, 2.0]), Some(4.0));
    assert_eq!(median(&[2.0, 2.0, 2.0, 9.0]), Some(2.0));
}

// A millisecond step moves every pseudorange by c·1 ms = 299,792.458 m: the median carries
// it into the clock; the position is kept. A common shift of 10 m is not an event.
#[test]
fn a_millisecond_step_reseats_the_clock_and_a_small_shift_does_not() {
    let prior = FixPrior {
        position_m: [4.0e6, 3.0e5, 4.9e6],
        position_var_m2: 4.0,
        velocity_mps: [0.0; 3],
        velocity_var_m2ps2: 0.01,
        clock_bias_m: 100.0,
        clock_bias_var_m2: 4.0,
        clock_drift_mps: 0.0,
        clock_drift_var_m2ps2: 0.01,
        isb_m: [0.0; 2],
        isb_var_m2: 1.0,
    };
    let mut s = FilterState::from_fix(&prior).unwrap();
    assert_eq!(reseat_on_clock_event(&mut s, &[10.0, 11.0, 9.0, 10.5]), 0.0);
    assert_eq!(s.clock().0, 100.0);
    let ms = 299_792.458;
    let shift = reseat_on_clock_event(&mut s, &[ms + 1.0, ms - 2.0, ms, ms + 40.0, 3.0]);
    assert_eq!(shift, ms);
    assert!((s.clock().0 - (100.0 + ms)).abs() < 2.0);
    assert_eq!(s.position(), prior.position_m);
}
