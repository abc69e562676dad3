use super::super::noise::{ClockNoise, MotionProfile, ParameterError, ProcessNoise};
use super::super::state::{Covariance, FixPrior, POS_X, VEL_X};
use super::*;
use crate::frames::{Geodetic, LocalFrame};

/// The speed of light, m/s (IS-GPS-200 §20.3.4.3 [V]), typed here apart from the engine's.
const C: f64 = 299_792_458.0;

/// A state at `geo` with a diagonal covariance: position variance `pv` and velocity variance
/// `vv` on every axis, zero velocity.
fn state_at(geo: Geodetic, pv: f64, vv: f64) -> FilterState {
    FilterState::from_fix(&FixPrior {
        position_m: geo.to_ecef(),
        position_var_m2: pv,
        velocity_mps: [0.0; 3],
        velocity_var_m2ps2: vv,
        clock_bias_m: 1e5,
        clock_bias_var_m2: 4.0,
        clock_drift_mps: 20.0,
        clock_drift_var_m2ps2: 0.25,
        isb_m: [5.0, -7.0],
        isb_var_m2: 1.0,
    })
    .unwrap()
}

fn noise(qh: f64, qv: f64) -> ProcessNoise {
    ProcessNoise {
        motion: MotionProfile {
            accel_psd_horizontal: qh,
            accel_psd_vertical: qv,
        },
        clock: ClockNoise::TCXO,
        isb_psd: 1e-5,
    }
}

/// `R B Rᵀ` for the rows R of `frame` (ECEF → east/north/up) and the 3×3 block B of `p` at
/// (r0, c0).
fn to_enu(frame: &LocalFrame, p: &Covariance, r0: usize, c0: usize) -> [[f64; 3]; 3] {
    let r = frame.axes;
    let mut out = [[0.0; 3]; 3];
    for i in 0..3 {
        for j in 0..3 {
            let mut s = 0.0;
            for k in 0..3 {
                for l in 0..3 {
                    s += r[i][k] * p[r0 + k][c0 + l] * r[j][l];
                }
            }
            out[i][j] = s;
        }
    }
    out
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * b.abs()
}

// Closed form of the white-acceleration model (common practice; Bar-Shalom, Li &
// Kirubarajan 2001 [M]): from a diagonal prior (σ²_p, σ²_v per axis) after dt,
//   var(p) = σ²_p + σ²_v dt² + q dt³/3,  cov(p, v) = σ²_v dt + q dt²/2,  var(v) = σ²_v + q dt
// per east/north/up axis, with q = q_h east and north and q_v up, and no cross-axis terms.
// The east/north/up axes come from frames::LocalFrame (geodetic latitude, trigonometry),
// not from the prediction's own up direction; on the ellipsoid (h = 0) the two agree.
#[test]
fn kinematic_noise_matches_the_closed_form_in_east_north_up() {
    for geo in [
        Geodetic::from_degrees(48.0, 11.0, 0.0),
        Geodetic::from_degrees(-33.62, 150.31, 0.0),
        Geodetic::from_degrees(89.9, -120.0, 0.0),
    ] {
        let frame = LocalFrame::at_ecef(geo.to_ecef());
        let (pv, vv, qh, qv) = (9.0, 0.5, 5.0, 0.1);
        for dt in [0.1, 1.0, 30.0, 3_600.0] {
            let mut s = state_at(geo, pv, vv);
            s.predict(dt, 1e5, &noise(qh, qv)).unwrap();
            let pp = to_enu(&frame, &s.p, POS_X, POS_X);
            let pvb = to_enu(&frame, &s.p, POS_X, VEL_X);
            let vvb = to_enu(&frame, &s.p, VEL_X, VEL_X);
            for (axis, q) in [(0, qh), (1, qh), (2, qv)] {
                let want_pp = pv + vv * dt * dt + q * dt * dt * dt / 3.0;
                let want_pv = vv * dt + q * dt * dt / 2.0;
                let want_vv = vv + q * dt;
                assert!(close(pp[axis][axis], want_pp, 1e-12), "dt {dt} axis {axis}");
                assert!(
                    close(pvb[axis][axis], want_pv, 1e-12),
                    "dt {dt} axis {axis}"
                );
                assert!(
                    close(vvb[axis][axis], want_vv, 1e-12),
                    "dt {dt} axis {axis}"
                );
                for other in (0..3).filter(|&o| o != axis) {
                    assert!(pp[axis][other].abs() <= 1e-12 * want_pp, "dt {dt}");
                    assert!(pvb[axis][other].abs() <= 1e-12 * want_pv, "dt {dt}");
                    assert!(vvb[axis][other].abs() <= 1e-12 * want_vv, "dt {dt}");
                }
            }
        }
    }
}

// The case: a static state with a negligible prior gains q·dt³/3 of position
// variance on each axis (here the static-asset profile over ten minutes).
#[test]
fn static_state_gains_q_dt3_over_3() {
    let geo = Geodetic::from_degrees(52.0, 4.0, 0.0);
    let frame = LocalFrame::at_ecef(geo.to_ecef());
    let p = MotionProfile::STATIC_ASSET;
    let mut s = state_at(geo, 1e-12, 1e-12);
    let dt = 600.0;
    let model = ProcessNoise {
        motion: p,
        ..ProcessNoise::default()
    };
    s.predict(dt, 1e4, &model).unwrap();
    let pp = to_enu(&frame, &s.p, POS_X, POS_X);
    let want_h = p.accel_psd_horizontal * dt * dt * dt / 3.0; // 7,200 m²
    let want_v = p.accel_psd_vertical * dt * dt * dt / 3.0;
    assert!(close(pp[0][0], want_h, 1e-9));
    assert!(close(pp[1][1], want_h, 1e-9));
    assert!(close(pp[2][2], want_v, 1e-9));
}

// Brown & Hwang's two-state clock model [M], written out for a diagonal prior (b, d):
//   var(b) = σ²_b + σ²_d dt² + c²(S_f dt + S_g dt³/3), cov(b, d) = σ²_d dt + c² S_g dt²/2,
//   var(d) = σ²_d + c² S_g dt, with S_f = h0/2 and S_g = 2π² h₋₂; the bias moves by d·dt.
// The inter-system biases walk: var = σ² + q dt.
#[test]
fn clock_and_bias_noise_match_the_two_state_model() {
    let (h0, hm2) = (2e-19, 2e-20);
    let sf = h0 / 2.0 * C * C;
    let sg = 2.0 * core::f64::consts::PI.powi(2) * hm2 * C * C;
    for dt in [1.0, 60.0, 86_400.0] {
        let mut s = state_at(Geodetic::from_degrees(0.0, 0.0, 0.0), 1.0, 1.0);
        s.predict(dt, 1e5, &noise(1.0, 1.0)).unwrap();
        let c = s.clock_cov();
        assert!(close(
            c[0][0],
            4.0 + 0.25 * dt * dt + sf * dt + sg * dt.powi(3) / 3.0,
            1e-13
        ));
        assert!(close(c[0][1], 0.25 * dt + sg * dt * dt / 2.0, 1e-13));
        assert_eq!(c[0][1], c[1][0]);
        assert!(close(c[1][1], 0.25 + sg * dt, 1e-13));
        assert!(close(s.clock().0, 1e5 + 20.0 * dt, 1e-15));
        assert_eq!(s.clock().1, 20.0);
        let isb = s.inter_system_bias_cov();
        assert!(close(isb[0][0], 1.0 + 1e-5 * dt, 1e-15));
        assert!(close(isb[1][1], 1.0 + 1e-5 * dt, 1e-15));
        assert_eq!(isb[0][1], 0.0);
        assert_eq!(s.inter_system_biases(), [5.0, -7.0]);
        // No coupling of the clock to position or velocity appears from nothing.
        for k in 0..6 {
            assert_eq!(s.p[CLOCK_BIAS][k], 0.0);
            assert_eq!(s.p[CLOCK_DRIFT][k], 0.0);
        }
    }
    // The TCXO numbers over one second [C: Python 3.11 float arithmetic, math.pi]:
    // c²·h0/2 = 8.98755e-3 m², c²·2π²h₋₂/3 = 1.18271e-2 m² (the bias gains their sum);
    // the drift c²·2π²h₋₂ = 3.54814e-2 m²/s².
    assert!(close(sf, 8.98755e-3, 1e-5));
    assert!(close(sg / 3.0, 1.18271e-2, 1e-5));
    assert!(close(sg, 3.54814e-2, 1e-5));
}

// The model is the exact discretisation of a continuous one, so two steps of dt/2 equal one
// of dt (Chapman–Kolmogorov; common practice). Zero velocity keeps the up direction the same
// for both halves.
#[test]
fn two_half_steps_equal_one_step() {
    let p = FilterState::from_parts(
        {
            let mut x = [0.0; STATE_LEN];
            x[..3].copy_from_slice(&Geodetic::from_degrees(35.0, 139.0, 40.0).to_ecef());
            x[CLOCK_BIAS] = -2e4;
            x[CLOCK_DRIFT] = 3.0;
            x
        },
        {
            let mut p = [[0.0; STATE_LEN]; STATE_LEN];
            for i in 0..STATE_LEN {
                p[i][i] = 1.0 + i as f64;
            }
            p[0][3] = 0.5;
            p[3][0] = 0.5;
            p[6][7] = 0.3;
            p[7][6] = 0.3;
            p
        },
    )
    .unwrap();
    let model = noise(2.0, 0.2);
    for dt in [0.5, 10.0, 1_000.0] {
        let mut once = p;
        once.predict(dt, 1e4, &model).unwrap();
        let mut twice = p;
        twice.predict(dt / 2.0, 1e4, &model).unwrap();
        twice.predict(dt / 2.0, 1e4, &model).unwrap();
        for i in 0..STATE_LEN {
            assert!((once.x[i] - twice.x[i]).abs() <= 1e-15 * once.x[i].abs().max(1.0));
            for j in 0..STATE_LEN {
                let scale = libm::sqrt(once.p[i][i] * once.p[j][j]);
                assert!(
                    (once.p[i][j] - twice.p[i][j]).abs() <= 1e-12 * scale,
                    "dt {dt} ({i}, {j}): {} vs {}",
                    once.p[i][j],
                    twice.p[i][j]
                );
            }
        }
    }
}

#[test]
fn prediction_keeps_p_exactly_symmetric_and_positive_definite() {
    let mut s = state_at(Geodetic::from_degrees(10.0, 20.0, 300.0), 50.0, 3.0);
    s.x[VEL_X] = 12.0;
    for dt in [1.0, 0.25, 7.0, 120.0] {
        s.predict(dt, 1e3, &noise(5.0, 0.1)).unwrap();
        for i in 0..STATE_LEN {
            for j in 0..STATE_LEN {
                assert_eq!(s.p[i][j], s.p[j][i]);
            }
        }
        assert!(s.is_healthy() && s.is_positive_definite());
    }
}

// The up direction from the ellipsoid's gradient against the geodetic up of frames.rs
// (Bowring plus fixed-point steps, then trigonometry): equal on the ellipsoid; off it the
// gradient at p = p0 + h·n is (N + h)·n + h·e′²·sinφ·ẑ (e′² = e²/(1 − e²); common practice,
// written out from x0 = N cosφ cosλ, z0 = N(1 − e²) sinφ), which tilts it by
// atan(h·e′²·sinφ·cosφ / (N + h + h·e′²·sin²φ)): at most 1.06e-5 rad at 20 km.
#[test]
fn up_direction_is_the_ellipsoid_normal() {
    let (a, e2) = (6_378_137.0, 0.006_694_379_990_14); // WGS-84 (NGA TR8350.2 [V])
    let ep2 = e2 / (1.0 - e2);
    for lat in [-89.0, -60.0, -30.0, 0.0, 15.0, 45.0, 75.0, 90.0] {
        for lon in [-179.0, -90.0, 0.0, 33.0, 120.0] {
            for h in [0.0, 1_000.0, 20_000.0] {
                let geo = Geodetic::from_degrees(lat, lon, h);
                let up = up_direction(geo.to_ecef()).unwrap();
                let [_, _, want] = LocalFrame::new(geo.to_ecef(), &geo).axes;
                // |u × w| = sin(angle), well conditioned for small angles (acos is not).
                let cross = [
                    up[1] * want[2] - up[2] * want[1],
                    up[2] * want[0] - up[0] * want[2],
                    up[0] * want[1] - up[1] * want[0],
                ];
                let angle = libm::asin(libm::sqrt(cross.iter().map(|v| v * v).sum::<f64>()));
                let (sl, cl) = (geo.lat_rad.sin(), geo.lat_rad.cos());
                let n = a / (1.0 - e2 * sl * sl).sqrt();
                let tilt = (h * ep2 * (sl * cl).abs() / (n + h + h * ep2 * sl * sl)).atan();
                assert!(
                    (angle - tilt).abs() <= 1e-12,
                    "{lat} {lon} {h}: {angle} vs {tilt}"
                );
                assert!(angle <= 1.06e-5);
                let norm: f64 = up.iter().map(|v| v * v).sum();
                assert!((norm - 1.0).abs() < 1e-15);
            }
        }
    }
    assert_eq!(up_direction([0.0; 3]), None);
    assert_eq!(up_direction([1e-200, 0.0, 0.0]), None);
}

// A state at the Earth's centre has no up: every axis gets the larger PSD.
#[test]
fn no_up_direction_means_the_larger_psd_everywhere() {
    let mut p = [[0.0; STATE_LEN]; STATE_LEN];
    for i in 0..STATE_LEN {
        p[i][i] = 1.0;
    }
    let mut s = FilterState::from_parts([0.0; STATE_LEN], p).unwrap();
    s.predict(2.0, 10.0, &noise(0.3, 3.0)).unwrap();
    for k in 0..3 {
        assert!(close(s.p[k][k], 1.0 + 4.0 + 3.0 * 8.0 / 3.0, 1e-15));
        assert!(close(s.p[3 + k][3 + k], 1.0 + 3.0 * 2.0, 1e-15));
    }
    assert_eq!(s.p[0][1], 0.0);
}

#[test]
fn bad_steps_and_parameters_are_refused_and_change_nothing() {
    let s0 = state_at(Geodetic::from_degrees(48.0, 11.0, 500.0), 9.0, 1.0);
    let good = ProcessNoise::default();
    let cases: [(f64, f64, ProcessNoise, PredictError); 10] = [
        (0.0, 10.0, good, PredictError::InvalidStep),
        (-1.0, 10.0, good, PredictError::InvalidStep),
        (f64::NAN, 10.0, good, PredictError::InvalidStep),
        (
            f64::INFINITY,
            f64::INFINITY,
            good,
            PredictError::InvalidStep,
        ),
        (11.0, 10.0, good, PredictError::StepTooLong),
        (1.0, f64::NAN, good, PredictError::StepTooLong),
        (
            1.0,
            10.0,
            noise(0.0, 1.0),
            ParameterError::AccelPsdHorizontal.into(),
        ),
        (
            1.0,
            10.0,
            noise(1.0, f64::NAN),
            ParameterError::AccelPsdVertical.into(),
        ),
        (
            1.0,
            10.0,
            ProcessNoise {
                clock: ClockNoise {
                    h0: 2e-19,
                    h_minus2: -1.0,
                },
                ..good
            },
            ParameterError::ClockHMinus2.into(),
        ),
        (
            1.0,
            10.0,
            ProcessNoise {
                isb_psd: 1e3,
                ..good
            },
            ParameterError::IsbPsd.into(),
        ),
    ];
    for (dt, max, model, want) in cases {
        let mut s = s0;
        assert_eq!(s.predict(dt, max, &model), Err(want), "dt {dt} max {max}");
        assert_eq!(s, s0);
    }
    // A step so long that the position variance would pass 1e24 m².
    let mut s = s0;
    assert_eq!(
        s.predict(1e9, f64::INFINITY, &good),
        Err(PredictError::OutOfRange)
    );
    assert_eq!(s, s0);
    // A velocity so large that the position would pass 1e12 m.
    let mut s = s0;
    s.x[VEL_X] = 1e9;
    let before = s;
    assert_eq!(s.predict(1e4, 1e4, &good), Err(PredictError::OutOfRange));
    assert_eq!(s, before);
}

#[test]
fn every_preset_is_valid_and_validation_names_the_field() {
    for p in [
        MotionProfile::STATIC_ASSET,
        MotionProfile::PEDESTRIAN,
        MotionProfile::ROAD_VEHICLE,
        MotionProfile::SHIP,
        MotionProfile::RAIL,
        MotionProfile::default(),
    ] {
        assert_eq!(p.validate(), Ok(()));
        assert!(p.accel_psd_vertical <= p.accel_psd_horizontal);
    }
    assert_eq!(ClockNoise::TCXO.validate(), Ok(()));
    assert_eq!(ProcessNoise::default().validate(), Ok(()));
    let bad_h0 = ClockNoise {
        h0: f64::INFINITY,
        h_minus2: 2e-20,
    };
    assert_eq!(bad_h0.validate(), Err(ParameterError::ClockH0));
    let big = MotionProfile {
        accel_psd_horizontal: 1.0,
        accel_psd_vertical: 2e4,
    };
    assert_eq!(big.validate(), Err(ParameterError::AccelPsdVertical));
    extern crate std;
    use std::string::ToString;
    let e = PredictError::from(ParameterError::AccelPsdVertical);
    assert_eq!(
        e.to_string(),
        "process noise: accel_psd_vertical must be finite and within 1e-8..=1e4 m²/s³"
    );
    assert!(core::error::Error::source(&e).is_some());
}
