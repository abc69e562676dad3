use super::*;

/// A prior with every part distinct (realistic scales: ECEF metres, a 0.3 ms clock).
fn prior() -> FixPrior {
    FixPrior {
        position_m: [4_194_304.0, 815_000.5, 4_716_000.25],
        position_var_m2: 25.0,
        velocity_mps: [1.5, -2.0, 0.25],
        velocity_var_m2ps2: 4.0,
        clock_bias_m: 99_000.0,
        clock_bias_var_m2: 1e6,
        clock_drift_mps: 150.0,
        clock_drift_var_m2ps2: 100.0,
        isb_m: [12.0, -30.0],
        isb_var_m2: 9.0,
    }
}

/// A symmetric positive-definite matrix B Bᵀ + I with a full, deterministic B (common
/// practice: a Gram matrix plus the identity is positive definite).
fn correlated() -> Covariance {
    let mut b = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            b[i][j] = libm::sin((3 * i + 7 * j + 1) as f64);
        }
    }
    let mut p = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            p[i][j] = (0..STATE_LEN).map(|k| b[i][k] * b[j][k]).sum::<f64>();
        }
        p[i][i] += 1.0;
    }
    p
}

#[test]
fn from_fix_places_each_part_at_its_index() {
    let s = FilterState::from_fix(&prior()).unwrap();
    assert_eq!(s.position(), [4_194_304.0, 815_000.5, 4_716_000.25]);
    assert_eq!(s.velocity(), [1.5, -2.0, 0.25]);
    assert_eq!(s.clock(), (99_000.0, 150.0));
    assert_eq!(s.inter_system_biases(), [12.0, -30.0]);
    assert_eq!(s.x()[CLOCK_BIAS], 99_000.0);
    assert_eq!(s.x()[ISB_BEIDOU], -30.0);
    assert_eq!(
        s.position_cov(),
        [[25.0, 0.0, 0.0], [0.0, 25.0, 0.0], [0.0, 0.0, 25.0]]
    );
    assert_eq!(
        s.velocity_cov(),
        [[4.0, 0.0, 0.0], [0.0, 4.0, 0.0], [0.0, 0.0, 4.0]]
    );
    assert_eq!(s.clock_cov(), [[1e6, 0.0], [0.0, 100.0]]);
    assert_eq!(s.inter_system_bias_cov(), [[9.0, 0.0], [0.0, 9.0]]);
    assert!(s.is_healthy());
    assert!(s.is_positive_definite());
}

#[test]
fn blocks_read_the_matching_rows_and_columns() {
    let p = correlated();
    let s = FilterState::from_parts([1.0; STATE_LEN], p).unwrap();
    let c = s.clock_cov();
    assert_eq!(c[0][1], p[CLOCK_BIAS][CLOCK_DRIFT]);
    assert_eq!(c[1][1], p[CLOCK_DRIFT][CLOCK_DRIFT]);
    assert_eq!(s.velocity_cov()[2][0], p[VEL_Z][VEL_X]);
    assert_eq!(s.position_cov()[1][2], p[POS_Y][POS_Z]);
    assert_eq!(s.inter_system_bias_cov()[0][1], p[ISB_GALILEO][ISB_BEIDOU]);
}

#[test]
fn from_fix_refuses_bad_numbers() {
    let mut f = prior();
    f.position_m[1] = f64::NAN;
    assert_eq!(FilterState::from_fix(&f), Err(StateError::NonFinite));
    let mut f = prior();
    f.clock_bias_var_m2 = f64::INFINITY;
    assert_eq!(FilterState::from_fix(&f), Err(StateError::NonFinite));
    let mut f = prior();
    f.isb_var_m2 = 0.0;
    assert_eq!(
        FilterState::from_fix(&f),
        Err(StateError::VarianceOutOfRange)
    );
    let mut f = prior();
    f.velocity_var_m2ps2 = -1.0;
    assert_eq!(
        FilterState::from_fix(&f),
        Err(StateError::VarianceOutOfRange)
    );
    let mut f = prior();
    f.position_var_m2 = 2e24;
    assert_eq!(
        FilterState::from_fix(&f),
        Err(StateError::VarianceOutOfRange)
    );
    let mut f = prior();
    f.clock_bias_m = 2e12;
    assert_eq!(FilterState::from_fix(&f), Err(StateError::StateOutOfRange));
}

#[test]
fn from_parts_refuses_asymmetric_and_indefinite_matrices() {
    let mut p = correlated();
    p[2][7] += 1e-6 * libm::sqrt(p[2][2] * p[7][7]);
    assert_eq!(
        FilterState::from_parts([0.0; STATE_LEN], p),
        Err(StateError::Asymmetric)
    );
    // A correlation above one between two states: symmetric, positive diagonal, indefinite.
    let mut p = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        p[i][i] = 1.0;
    }
    p[3][4] = 1.01;
    p[4][3] = 1.01;
    assert_eq!(
        FilterState::from_parts([0.0; STATE_LEN], p),
        Err(StateError::NotPositiveDefinite)
    );
    // Exactly singular (two identical states): refused too.
    p[3][4] = 1.0;
    p[4][3] = 1.0;
    assert_eq!(
        FilterState::from_parts([0.0; STATE_LEN], p),
        Err(StateError::NotPositiveDefinite)
    );
}

#[test]
fn from_parts_symmetrises_a_small_asymmetry() {
    let mut p = correlated();
    let (a, b) = (p[1][8], p[8][1]);
    p[1][8] = a + 1e-12;
    let s = FilterState::from_parts([0.0; STATE_LEN], p).unwrap();
    assert_eq!(s.p()[1][8], s.p()[8][1]);
    assert!((s.p()[1][8] - 0.5 * (a + 1e-12 + b)).abs() < 1e-15);
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            assert_eq!(s.p()[i][j], s.p()[j][i]);
        }
    }
}

#[test]
fn health_checks_see_each_fault() {
    let good = FilterState::from_parts([0.0; STATE_LEN], correlated()).unwrap();
    assert!(good.is_healthy() && good.is_positive_definite());

    let mut s = good;
    s.x[5] = f64::NAN;
    assert!(!s.is_healthy());
    let mut s = good;
    s.p[9][0] = f64::INFINITY;
    assert!(!s.is_healthy());
    let mut s = good;
    s.p[6][6] = 0.0;
    assert!(!s.is_healthy());
    assert!(!s.is_positive_definite());
    let mut s = good;
    s.p[0][1] += 1e-3;
    assert!(!s.is_healthy());
    // Positive diagonal and symmetric but indefinite: healthy by the cheap test, refused by
    // the Cholesky test.
    let mut s = FilterState::from_fix(&prior()).unwrap();
    let c = 2.0 * libm::sqrt(s.p[0][0] * s.p[1][1]);
    s.p[0][1] = c;
    s.p[1][0] = c;
    assert!(s.is_healthy());
    assert!(!s.is_positive_definite());
}

#[test]
fn reseat_clock_cuts_correlations_and_keeps_the_rest() {
    let mut s = FilterState::from_parts([3.0; STATE_LEN], correlated()).unwrap();
    let before = s;
    s.reseat_clock(-250_000.0, 9e10, 0.0, 1e4).unwrap();
    assert_eq!(s.clock(), (-250_000.0, 0.0));
    assert_eq!(s.clock_cov(), [[9e10, 0.0], [0.0, 1e4]]);
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            let clock = [CLOCK_BIAS, CLOCK_DRIFT];
            if clock.contains(&i) || clock.contains(&j) {
                if i != j {
                    assert_eq!(s.p[i][j], 0.0);
                }
            } else {
                assert_eq!(s.p[i][j], before.p[i][j]);
            }
        }
    }
    assert_eq!(s.position(), before.position());
    assert!(s.is_positive_definite());

    assert_eq!(
        s.reseat_clock(0.0, -1.0, 0.0, 1.0),
        Err(StateError::VarianceOutOfRange)
    );
    assert_eq!(
        s.reseat_clock(f64::NAN, 1.0, 0.0, 1.0),
        Err(StateError::NonFinite)
    );
    assert_eq!(
        s.reseat_clock(0.0, 1.0, 2e12, 1.0),
        Err(StateError::StateOutOfRange)
    );
    assert_eq!(s.clock(), (-250_000.0, 0.0));
}

#[test]
fn clock_step_moves_only_the_bias() {
    let mut s = FilterState::from_fix(&prior()).unwrap();
    let before = s;
    // One whole millisecond of receiver clock steering: c × 1 ms.
    s.shift_clock_bias(-299_792.458).unwrap();
    assert_eq!(s.clock().0, 99_000.0 - 299_792.458);
    assert_eq!(s.p, before.p);
    assert_eq!(s.position(), before.position());
    assert_eq!(s.shift_clock_bias(f64::NAN), Err(StateError::NonFinite));
    assert_eq!(s.shift_clock_bias(1e13), Err(StateError::StateOutOfRange));
    assert_eq!(s.clock().0, 99_000.0 - 299_792.458);
}

#[test]
fn errors_print_their_reason() {
    extern crate std;
    use std::string::ToString;
    assert_eq!(
        StateError::NotPositiveDefinite.to_string(),
        "filter covariance is not positive definite"
    );
    let e: &dyn core::error::Error = &StateError::NonFinite;
    assert!(e.source().is_none());
}
