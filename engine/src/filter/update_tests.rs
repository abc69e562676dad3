use super::super::state::{
    Covariance, CLOCK_BIAS, CLOCK_DRIFT, POS_X, POS_Y, POS_Z, VEL_X, VEL_Y, VEL_Z,
};
use super::*;

fn diagonal(x: StateVector, var: StateVector) -> FilterState {
    let mut p = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        p[i][i] = var[i];
    }
    FilterState::from_parts(x, p).unwrap()
}

/// A correlated positive-definite covariance, B Bᵀ + D with a deterministic full B and
/// realistic scales (positions and clock in metres, velocity and drift in m/s).
fn correlated() -> FilterState {
    let scale = [30.0, 30.0, 30.0, 2.0, 2.0, 2.0, 300.0, 5.0, 3.0, 3.0];
    let mut p: Covariance = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            let b = |r: usize, k: usize| libm::cos((5 * r + 3 * k + 2) as f64) * scale[r];
            p[i][j] = (0..STATE_LEN).map(|k| b(i, k) * b(j, k)).sum::<f64>() * 0.3;
        }
        p[i][i] += scale[i] * scale[i];
    }
    let x = [
        4_194_304.0,
        815_000.5,
        4_716_000.25,
        1.5,
        -2.0,
        0.25,
        99_000.0,
        150.0,
        12.0,
        -30.0,
    ];
    FilterState::from_parts(x, p).unwrap()
}

fn unit(v: [f64; 3]) -> [f64; 3] {
    let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
    [v[0] / n, v[1] / n, v[2] / n]
}

// The scalar Kalman filter on one state (common practice): with prior variance σ² and
// measurement variance R, the gain is σ²/(σ² + R), the posterior variance σ²R/(σ² + R), and
// states uncorrelated with the measured one do not move.
#[test]
fn one_state_measurement_follows_the_scalar_filter() {
    let mut s = diagonal(
        [1.0; STATE_LEN],
        [4.0, 9.0, 16.0, 1.0, 1.0, 1.0, 25.0, 1.0, 1.0, 1.0],
    );
    let before = s;
    let out = s
        .update(
            &MeasurementRow::single(CLOCK_BIAS, 1.0),
            3.0,
            5.0,
            f64::INFINITY,
        )
        .unwrap();
    assert_eq!(out, UpdateOutcome::Applied { nis: 9.0 / 30.0 });
    assert!((s.x[CLOCK_BIAS] - (1.0 + 25.0 / 30.0 * 3.0)).abs() < 1e-15);
    assert!((s.p[CLOCK_BIAS][CLOCK_BIAS] - 25.0 * 5.0 / 30.0).abs() < 1e-14);
    for i in (0..STATE_LEN).filter(|&i| i != CLOCK_BIAS) {
        assert_eq!(s.x[i], before.x[i]);
        for j in (0..STATE_LEN).filter(|&j| j != CLOCK_BIAS) {
            assert_eq!(s.p[i][j], before.p[i][j]);
        }
        assert_eq!(s.p[i][CLOCK_BIAS], 0.0);
    }
}

// The expanded Joseph form equals the textbook update P − P h hᵀ P / S and x + P h ν / S
// (common practice), computed here with plain loops on a correlated prior.
#[test]
fn joseph_update_equals_the_textbook_update_on_a_correlated_prior() {
    let rows = [
        (
            MeasurementRow::pseudorange(unit([0.3, -0.5, 0.8]), System::Galileo),
            4.5,
            9.0,
        ),
        (
            MeasurementRow::range_rate(unit([-0.7, 0.1, 0.7])),
            -0.8,
            0.04,
        ),
        (
            MeasurementRow::pseudorange(unit([0.9, 0.4, 0.2]), System::Beidou),
            -12.0,
            25.0,
        ),
        (MeasurementRow::single(VEL_Z, 1.0), 0.1, 0.01),
    ];
    let mut s = correlated();
    for (row, nu, r) in rows {
        let (x0, p0) = (s.x, s.p);
        let h = row.coefficients();
        let mut ph = [0.0; STATE_LEN];
        for i in 0..STATE_LEN {
            ph[i] = (0..STATE_LEN).map(|j| p0[i][j] * h[j]).sum();
        }
        let sv = (0..STATE_LEN).map(|i| h[i] * ph[i]).sum::<f64>() + r;
        let out = s.update(&row, nu, r, 100.0).unwrap();
        assert!((out.nis() - nu * nu / sv).abs() <= 1e-14 * out.nis());
        for i in 0..STATE_LEN {
            let want = x0[i] + ph[i] * nu / sv;
            assert!((s.x[i] - want).abs() <= 1e-15 * want.abs().max(1.0), "x{i}");
            for j in 0..STATE_LEN {
                let want = p0[i][j] - ph[i] * ph[j] / sv;
                let scale = (p0[i][i] * p0[j][j]).sqrt();
                assert!((s.p[i][j] - want).abs() <= 1e-13 * scale, "P{i}{j}");
                assert_eq!(s.p[i][j], s.p[j][i]);
            }
        }
        assert!(s.is_positive_definite());
    }
}

#[test]
fn rows_have_the_layout_of_the_state() {
    let e = [0.6, -0.8, 0.0];
    let g = MeasurementRow::pseudorange(e, System::Gps);
    assert_eq!(
        g.coefficients(),
        &[-0.6, 0.8, -0.0, 0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 0.0]
    );
    let c = MeasurementRow::pseudorange(e, System::Beidou);
    assert_eq!(c.coefficients()[ISB_BEIDOU], 1.0);
    assert_eq!(c.coefficients()[ISB_GALILEO], 0.0);
    let gal = MeasurementRow::pseudorange(e, System::Galileo);
    assert_eq!(gal.coefficients()[ISB_GALILEO], 1.0);
    let d = MeasurementRow::range_rate(e);
    assert_eq!(
        d.coefficients(),
        &[0.0, 0.0, 0.0, -0.6, 0.8, -0.0, 0.0, 1.0, 0.0, 0.0]
    );
    assert_eq!(MeasurementRow::single(42, 1.0).coefficients(), &[0.0; 10]);
    let x = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0];
    assert_eq!(g.dot(&x), -0.6 + 1.6 + 7.0);
    assert_eq!(d.dot(&x), -2.4 + 4.0 + 8.0);
    assert_eq!(gal.dot(&x), -0.6 + 1.6 + 7.0 + 9.0);
    let _ = (POS_X, POS_Y, POS_Z, VEL_X, VEL_Y);
}

#[test]
fn the_gate_refuses_without_touching_the_state() {
    let row = MeasurementRow::pseudorange(unit([0.2, 0.3, 0.9]), System::Gps);
    let s0 = correlated();
    let h = row.coefficients();
    let mut hph = 0.0;
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            hph += h[i] * s0.p[i][j] * h[j];
        }
    }
    let r = 4.0;
    let sv = hph + r;
    // An innovation of 4 σ against a 95 % gate (χ²(1) 0.95 quantile 3.841 [C:
    // scipy.stats.chi2.ppf(0.95, 1) = 3.841458820694124]).
    let nu = 4.0 * sv.sqrt();
    let mut s = s0;
    let out = s.update(&row, nu, r, 3.841458820694124).unwrap();
    assert!(matches!(out, UpdateOutcome::Gated { .. }));
    assert!((out.nis() - 16.0).abs() < 1e-12);
    assert_eq!(s, s0);
    // The same innovation passes a gate it does not exceed, and the infinite gate.
    let mut s = s0;
    let out = s.update(&row, nu, r, 16.0 + 1e-9).unwrap();
    assert!(matches!(out, UpdateOutcome::Applied { .. }));
    assert_ne!(s, s0);
    let mut s = s0;
    let out = s.update(&row, nu, r, f64::INFINITY).unwrap();
    assert!(matches!(out, UpdateOutcome::Applied { .. }));
    // A NIS exactly at the gate is applied (the gate set to the statistic the filter reports
    // for this measurement, which the test's own sum matches only to rounding).
    let nis = out.nis();
    assert!((nis - nu * nu / sv).abs() <= 1e-14 * nis);
    let mut s = s0;
    assert!(matches!(
        s.update(&row, nu, r, nis),
        Ok(UpdateOutcome::Applied { .. })
    ));
    // A huge but finite innovation is gated with an infinite statistic.
    let mut s = s0;
    let out = s.update(&row, 1e300, r, 3.84).unwrap();
    assert_eq!(out, UpdateOutcome::Gated { nis: f64::INFINITY });
    assert_eq!(s, s0);
}

#[test]
fn invalid_inputs_are_refused_and_change_nothing() {
    let row = MeasurementRow::range_rate(unit([0.2, 0.3, 0.9]));
    let s0 = correlated();
    let mut bad_row = *row.coefficients();
    bad_row[4] = f64::NAN;
    let mut huge_row = *row.coefficients();
    huge_row[4] = 2e6;
    let cases = [
        (row, f64::NAN, 1.0, 9.0, UpdateError::InvalidInnovation),
        (row, f64::INFINITY, 1.0, 9.0, UpdateError::InvalidInnovation),
        (row, 1.0, 0.0, 9.0, UpdateError::InvalidVariance),
        (row, 1.0, -1.0, 9.0, UpdateError::InvalidVariance),
        (row, 1.0, f64::NAN, 9.0, UpdateError::InvalidVariance),
        (row, 1.0, f64::INFINITY, 9.0, UpdateError::InvalidVariance),
        (row, 1.0, 1.0, f64::NAN, UpdateError::InvalidGate),
        (row, 1.0, 1.0, 0.0, UpdateError::InvalidGate),
        (row, 1.0, 1.0, -3.0, UpdateError::InvalidGate),
        (
            MeasurementRow::new(bad_row),
            1.0,
            1.0,
            9.0,
            UpdateError::InvalidRow,
        ),
        (
            MeasurementRow::new(huge_row),
            1.0,
            1.0,
            9.0,
            UpdateError::InvalidRow,
        ),
        (
            MeasurementRow::single(10, 1.0),
            1.0,
            1.0,
            9.0,
            UpdateError::InvalidRow,
        ),
    ];
    for (row, nu, r, gate, want) in cases {
        let mut s = s0;
        assert_eq!(s.update(&row, nu, r, gate), Err(want), "{nu} {r} {gate}");
        assert_eq!(s, s0);
    }
}

// A covariance that is not positive definite (only reachable inside the crate) can give
// S ≤ 0: refused, not divided by.
#[test]
fn a_non_positive_innovation_variance_is_an_error() {
    let mut s = diagonal([0.0; STATE_LEN], [1.0; STATE_LEN]);
    s.p[0][1] = 2.0;
    s.p[1][0] = 2.0;
    let before = s;
    let mut h = [0.0; STATE_LEN];
    h[0] = 1.0;
    h[1] = -1.0; // hᵀPh = 1 − 4 + 1 = −2
    let row = MeasurementRow::new(h);
    assert_eq!(
        s.update(&row, 0.1, 1.0, 9.0),
        Err(UpdateError::InnovationVariance)
    );
    assert_eq!(s, before);
}

#[test]
fn results_out_of_range_are_refused() {
    // An innovation that would move the clock past 1e12 m.
    let mut s = diagonal([0.0; STATE_LEN], [1e20; STATE_LEN]);
    let before = s;
    let row = MeasurementRow::single(CLOCK_BIAS, 1.0);
    assert_eq!(
        s.update(&row, 5e12, 1e10, f64::INFINITY),
        Err(UpdateError::OutOfRange)
    );
    assert_eq!(s, before);
    // A measurement 10³²⁰ times more precise than the state is refused (f64 could not keep
    // P' positive definite), and so is one just past the 10¹² limit; one just inside it is
    // applied and leaves P' positive definite.
    assert_eq!(
        s.update(&row, 1.0, 1e-300, f64::INFINITY),
        Err(UpdateError::TooPrecise)
    );
    assert_eq!(
        s.update(&row, 1.0, 1e20 / 1.01e12, f64::INFINITY),
        Err(UpdateError::TooPrecise)
    );
    assert_eq!(s, before);
    assert!(s.update(&row, 1.0, 1e20 / 0.99e12, f64::INFINITY).is_ok());
    assert!(s.is_positive_definite());
}

#[test]
fn errors_and_outcomes_print() {
    extern crate std;
    use std::string::ToString;
    assert_eq!(
        UpdateError::InnovationVariance.to_string(),
        "innovation variance not finite or not positive"
    );
    assert_eq!(UpdateOutcome::Gated { nis: 12.5 }.nis(), 12.5);
}

// The literal rows follow the state layout's named indices.
#[test]
fn rows_follow_the_state_layout() {
    let u = [0.6, 0.0, 0.8];
    let h = *MeasurementRow::pseudorange(u, System::Galileo).coefficients();
    assert_eq!(
        (h[POS_X], h[POS_X + 2], h[CLOCK_BIAS], h[ISB_GALILEO]),
        (-0.6, -0.8, 1.0, 1.0)
    );
    assert_eq!(h[CLOCK_DRIFT] + h[ISB_BEIDOU] + h[VEL_X], 0.0);
    let h = *MeasurementRow::range_rate(u).coefficients();
    assert_eq!(
        (h[VEL_X], h[VEL_X + 2], h[CLOCK_DRIFT], h[CLOCK_BIAS]),
        (-0.6, -0.8, 1.0, 0.0)
    );
    let mut s = FilterState::from_parts([1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 10.0], {
        let mut p = [[0.0; STATE_LEN]; STATE_LEN];
        for (i, r) in p.iter_mut().enumerate() {
            r[i] = 1.0;
        }
        p
    })
    .unwrap();
    assert_eq!(s.clock(), (7.0, 8.0));
    assert_eq!(s.inter_system_biases(), [9.0, 10.0]);
    s.shift_clock_bias(1.0).unwrap();
    assert_eq!(s.x()[CLOCK_BIAS], 8.0);
}
