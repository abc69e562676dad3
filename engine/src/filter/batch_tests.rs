use super::*;
use crate::filter::{FixPrior, UpdateOutcome};
use crate::System;

/// A deterministic sequence in [−1, 1) (a linear congruential generator; the test needs
/// variety, not statistical quality).
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        ((self.0 >> 11) as f64) / ((1u64 << 52) as f64) - 1.0
    }

    fn unit(&mut self) -> [f64; 3] {
        let v = [self.next(), self.next(), self.next() + 1.5];
        let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
        [v[0] / n, v[1] / n, v[2] / n]
    }
}

fn prior() -> FilterState {
    let mut s = FilterState::from_fix(&FixPrior {
        position_m: [4.1e6, 6.5e5, 4.8e6],
        position_var_m2: 25.0,
        velocity_mps: [1.0, -2.0, 0.5],
        velocity_var_m2ps2: 4.0,
        clock_bias_m: 1.2e4,
        clock_bias_var_m2: 100.0,
        clock_drift_mps: 30.0,
        clock_drift_var_m2ps2: 9.0,
        isb_m: [3.0, -4.0],
        isb_var_m2: 100.0,
    })
    .unwrap();
    // Correlations, as a prediction makes them.
    s.predict(1.0, 10.0, &crate::filter::ProcessNoise::default())
        .unwrap();
    s
}

// The batch equals sequential scalar updates of the same linear measurements (each
// sequential innovation taken at the state the previous update left): state and
// covariance to 1e-9 relative, and the joint NIS equals the sum of the sequential NIS
// (the innovations of sequential updates are the whitened joint innovation).
#[test]
fn one_batch_equals_sequential_updates() {
    let mut rng = Lcg(7);
    let x0 = prior();
    let mut rows: heapless::Vec<(MeasurementRow, f64, f64), 24> = heapless::Vec::new();
    for k in 0..12 {
        let sys = [System::Gps, System::Galileo, System::Beidou][k % 3];
        let u = rng.unit();
        rows.push((
            MeasurementRow::pseudorange(u, sys),
            3.0 * rng.next(),
            4.0 + rng.next(),
        ))
        .unwrap();
        rows.push((MeasurementRow::range_rate(u), 0.2 * rng.next(), 0.01))
            .unwrap();
    }
    let mut batch = Batch::new();
    let mut seq = x0;
    let mut seq_nis = 0.0;
    for (row, nu0, r) in &rows {
        batch.add(row, *nu0, *r).unwrap();
        // z = h·x0 + ν0; the sequential innovation is z − h·x at the current state.
        let nu = nu0 - row.dot(seq.x()) + row.dot(x0.x());
        match seq.update(row, nu, *r, f64::INFINITY).unwrap() {
            UpdateOutcome::Applied { nis } => seq_nis += nis,
            UpdateOutcome::Gated { .. } => unreachable!(),
        }
    }
    let mut b = x0;
    let nis = b.apply(&batch).unwrap();
    for i in 0..STATE_LEN {
        let (xb, xs) = (b.x()[i], seq.x()[i]);
        assert!(
            (xb - xs).abs() <= 1e-9 * xs.abs().max(1.0),
            "x[{i}] {xb} {xs}"
        );
        for j in 0..STATE_LEN {
            let (pb, ps) = (b.p()[i][j], seq.p()[i][j]);
            let scale = (seq.p()[i][i] * seq.p()[j][j]).sqrt();
            assert!((pb - ps).abs() <= 1e-9 * scale, "P[{i}][{j}] {pb} {ps}");
        }
    }
    assert!((nis - seq_nis).abs() <= 1e-9 * seq_nis, "{nis} {seq_nis}");
    assert!(b.is_healthy() && b.is_positive_definite());
}

#[test]
fn an_empty_batch_changes_nothing_and_bad_input_is_refused() {
    let mut s = prior();
    let before = s;
    assert_eq!(s.apply(&Batch::new()), Ok(0.0));
    assert_eq!(s, before);
    let mut b = Batch::new();
    let row = MeasurementRow::range_rate([0.0, 0.0, 1.0]);
    assert_eq!(
        b.add(&row, f64::NAN, 1.0),
        Err(UpdateError::InvalidInnovation)
    );
    assert_eq!(b.add(&row, 1.0, 0.0), Err(UpdateError::InvalidVariance));
    assert_eq!(
        b.add(&row, 1.0, f64::INFINITY),
        Err(UpdateError::InvalidVariance)
    );
    let zero = MeasurementRow::new([0.0; STATE_LEN]);
    assert_eq!(b.add(&zero, 1.0, 1.0), Err(UpdateError::InvalidRow));
    assert_eq!(b.count(), 0);
}
