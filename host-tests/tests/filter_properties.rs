//! Property test of the filter core (issue 8): random sequences of predictions, scalar and
//! batch (information-form) updates, clock operations and hold releases, valid and invalid (NaN, ±∞, zero and negative variances and gates,
//! steps that are negative, zero or ten years long, out-of-range noise parameters, huge
//! innovations, measurements far more precise than the state), keep the state finite, `P`
//! exactly symmetric and positive definite (Cholesky), and leave the state untouched
//! whenever a step is refused or gated.

use proptest::prelude::*;
use trackfix_engine::filter::state::STATE_LEN;
use trackfix_engine::filter::{
    Batch, ClockNoise, FilterState, FixPrior, MeasurementRow, MotionProfile, ProcessNoise,
    UpdateOutcome,
};
use trackfix_engine::System;

#[derive(Clone, Debug)]
enum Op {
    Predict {
        dt: f64,
        max_dt: f64,
        noise: ProcessNoise,
    },
    Update {
        row: MeasurementRow,
        innovation: f64,
        variance: f64,
        gate: f64,
    },
    Reseat {
        bias: f64,
        variance: f64,
    },
    Shift(f64),
    /// Several measurements in one information-form update (the pipeline's).
    Batch(Vec<(MeasurementRow, f64, f64)>),
    /// A held asset released: velocity freed, position widened.
    Release {
        velocity_var: f64,
        position_var: f64,
    },
}

/// Mostly ordinary values from `normal`, sometimes one of the bad ones.
fn mostly(normal: impl Strategy<Value = f64> + 'static, bad: &'static [f64]) -> BoxedStrategy<f64> {
    prop_oneof![
        8 => normal.boxed(),
        1 => proptest::sample::select(bad).boxed(),
        1 => any::<f64>().boxed(),
    ]
    .boxed()
}

const BAD: &[f64] = &[
    f64::NAN,
    f64::INFINITY,
    f64::NEG_INFINITY,
    0.0,
    -1.0,
    1e-300,
    1e300,
    -1e300,
];

fn log_uniform(lo: f64, hi: f64) -> impl Strategy<Value = f64> {
    (lo.log10()..hi.log10()).prop_map(|e| 10f64.powf(e))
}

fn noise() -> impl Strategy<Value = ProcessNoise> {
    let preset = proptest::sample::select(vec![
        MotionProfile::STATIC_ASSET,
        MotionProfile::PEDESTRIAN,
        MotionProfile::ROAD_VEHICLE,
        MotionProfile::SHIP,
        MotionProfile::RAIL,
    ]);
    (
        preset,
        mostly(log_uniform(1e-8, 1e4), BAD),
        proptest::bool::weighted(0.2),
        mostly(log_uniform(1e-21, 1e-17), BAD),
        mostly(log_uniform(1e-12, 1e2), BAD),
    )
        .prop_map(|(preset, q, custom, h0, isb)| ProcessNoise {
            motion: if custom {
                MotionProfile {
                    accel_psd_horizontal: q,
                    accel_psd_vertical: q / 10.0,
                }
            } else {
                preset
            },
            clock: ClockNoise {
                h0,
                h_minus2: ClockNoise::TCXO.h_minus2,
            },
            isb_psd: isb,
        })
}

fn unit() -> impl Strategy<Value = [f64; 3]> {
    (-1.0f64..1.0, -1.0f64..1.0, -1.0f64..1.0).prop_filter_map("zero vector", |(a, b, c)| {
        let n = (a * a + b * b + c * c).sqrt();
        (n > 1e-3).then(|| [a / n, b / n, c / n])
    })
}

fn row() -> impl Strategy<Value = MeasurementRow> {
    let system = proptest::sample::select(vec![System::Gps, System::Galileo, System::Beidou]);
    let dense = proptest::collection::vec(
        prop_oneof![3 => Just(0.0), 3 => -10.0f64..10.0, 1 => proptest::sample::select(BAD)],
        STATE_LEN,
    )
    .prop_map(|v| {
        let mut h = [0.0; STATE_LEN];
        h.copy_from_slice(&v);
        MeasurementRow::new(h)
    });
    prop_oneof![
        4 => (unit(), system).prop_map(|(e, s)| MeasurementRow::pseudorange(e, s)),
        3 => unit().prop_map(MeasurementRow::range_rate),
        1 => (0usize..12, -2.0f64..2.0).prop_map(|(i, c)| MeasurementRow::single(i, c)),
        1 => dense,
    ]
}

fn op() -> impl Strategy<Value = Op> {
    prop_oneof![
        3 => (
            mostly(log_uniform(1e-3, 3_600.0), &[0.0, -1.0, f64::NAN, f64::INFINITY, 3.15e8]),
            prop_oneof![4 => Just(3_600.0), 1 => Just(f64::INFINITY), 1 => Just(f64::NAN)],
            noise(),
        )
            .prop_map(|(dt, max_dt, noise)| Op::Predict { dt, max_dt, noise }),
        8 => (
            row(),
            mostly(-300.0f64..300.0, BAD),
            mostly(log_uniform(1e-4, 1e6), BAD),
            mostly(
                proptest::sample::select(vec![3.841, 10.83, f64::INFINITY]),
                &[f64::NAN, 0.0, -1.0],
            ),
        )
            .prop_map(|(row, innovation, variance, gate)| Op::Update {
                row,
                innovation,
                variance,
                gate,
            }),
        1 => (mostly(-3e5f64..3e5, BAD), mostly(log_uniform(1.0, 1e11), BAD))
            .prop_map(|(bias, variance)| Op::Reseat { bias, variance }),
        1 => mostly(
            proptest::sample::select(vec![-299_792.458, 299_792.458]),
            BAD
        )
        .prop_map(Op::Shift),
        2 => proptest::collection::vec(
            (row(), mostly(-300.0f64..300.0, BAD), mostly(log_uniform(1e-4, 1e6), BAD)),
            1..24,
        )
        .prop_map(Op::Batch),
        1 => (mostly(log_uniform(1e-4, 1e4), BAD), mostly(log_uniform(1e-2, 1e8), BAD))
            .prop_map(|(velocity_var, position_var)| Op::Release { velocity_var, position_var }),
    ]
}

fn start() -> impl Strategy<Value = FilterState> {
    (
        unit(),
        log_uniform(1.0, 1e8),
        log_uniform(1e-2, 1e4),
        log_uniform(1.0, 1e10),
        log_uniform(1e-2, 1e5),
    )
        .prop_map(|(e, pv, vv, bv, dv)| {
            FilterState::from_fix(&FixPrior {
                position_m: [e[0] * 6.4e6, e[1] * 6.4e6, e[2] * 6.4e6],
                position_var_m2: pv,
                velocity_mps: [3.0, -1.0, 0.5],
                velocity_var_m2ps2: vv,
                clock_bias_m: 1.2e5,
                clock_bias_var_m2: bv,
                clock_drift_mps: 90.0,
                clock_drift_var_m2ps2: dv,
                isb_m: [10.0, -20.0],
                isb_var_m2: 100.0,
            })
            .unwrap()
        })
}

fn check(s: &FilterState, step: usize) {
    assert!(
        s.x().iter().all(|v| v.is_finite()),
        "step {step}: state not finite"
    );
    assert!(s.is_healthy(), "step {step}: unhealthy {s:?}");
    for i in 0..STATE_LEN {
        for j in 0..STATE_LEN {
            assert_eq!(s.p()[i][j], s.p()[j][i], "step {step}: asymmetric");
        }
    }
    assert!(
        s.is_positive_definite(),
        "step {step}: not positive definite {s:?}"
    );
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    #[test]
    fn random_steps_keep_the_state_finite_and_positive_definite(
        mut s in start(),
        ops in proptest::collection::vec(op(), 1..80),
    ) {
        check(&s, 0);
        for (n, op) in ops.into_iter().enumerate() {
            let before = s;
            let changed = match op {
                Op::Predict { dt, max_dt, noise } => s.predict(dt, max_dt, &noise).is_ok(),
                Op::Update { row, innovation, variance, gate } => {
                    matches!(
                        s.update(&row, innovation, variance, gate),
                        Ok(UpdateOutcome::Applied { .. })
                    )
                }
                Op::Reseat { bias, variance } => s.reseat_clock(bias, variance, 0.0, 1e4).is_ok(),
                Op::Shift(d) => s.shift_clock_bias(d).is_ok(),
                Op::Batch(rows) => {
                    let mut batch = Batch::new();
                    for (row, innovation, variance) in &rows {
                        let _ = batch.add(row, *innovation, *variance);
                    }
                    batch.count() > 0 && s.apply(&batch).is_ok()
                }
                Op::Release { velocity_var, position_var } => {
                    let a = s.free_velocity(velocity_var).is_ok();
                    let b = s.widen_position(position_var).is_ok();
                    a || b
                }
            };
            if !changed {
                prop_assert_eq!(s, before, "step {}: refused or gated but changed", n);
            }
            check(&s, n + 1);
        }
    }
}
