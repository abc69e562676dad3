use super::*;
use crate::integrity::slope::{slopes, Slope, SlopeRow};
use crate::measurements::record::Candidate;

/// A local frame whose axes are ECEF's own (east = x, north = y, up = z), so the rows of
/// the test epoch are its east/north/up rows.
fn identity_frame() -> LocalFrame {
    LocalFrame {
        origin: [0.0; 3],
        axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
    }
}

/// Eight satellites in unit directions (ECEF-like, any frame will do for the test), one
/// system, σ 2 m, residuals zero except `bias` on satellite `faulty`.
fn epoch(bias: f64, faulty: usize) -> [Measurement; 8] {
    let dirs: [[f64; 3]; 8] = [
        [0.0, 0.0, 1.0],
        [0.7, 0.0, 0.714],
        [-0.7, 0.1, 0.707],
        [0.1, 0.8, 0.59],
        [0.0, -0.9, 0.436],
        [0.6, 0.6, 0.529],
        [-0.5, -0.6, 0.624],
        [-0.8, 0.5, 0.332],
    ];
    core::array::from_fn(|i| {
        let u = dirs[i];
        let n = (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]).sqrt();
        Measurement {
            index: i,
            sat: Candidate {
                pos: [0.0; 3],
                clock_m: 0.0,
                pr_m: 2.2e7,
                sys: 0,
                cn0_factor: 1.0,
                iono_scale: 1.0,
                vel: [0.0; 3],
                clock_drift_mps: 0.0,
                range_rate_mps: None,
                reflection: false,
            },
            out: Outcome {
                fate: Fate::Used,
                row: [-u[0] / n, -u[1] / n, -u[2] / n],
                residual_m: if i == faulty { bias } else { 0.0 },
                sigma_m: 2.0,
                ..Outcome::default()
            },
        }
    })
}

fn run(meas: &mut [Measurement], max_exclusions: u8) -> Verdict {
    let mut table: Thresholds<8> = Thresholds::new();
    let frame = identity_frame();
    check(
        meas,
        Outcome::used,
        &mut TestSetup {
            frame: &frame,
            table: &mut table,
            false_alarm: 0.002 / 30.0,
            integrity_risk: 1e-3,
            max_exclusions,
            ure_sigma_m: 0.0,
            reflection_scale: 1.0,
        },
    )
}

/// A single bias b on satellite i makes the statistic b²(1 − h_ii)/σ² (the non-centrality
/// of ncx2.rs; Brown 1992 \[M\]); the satellite is identified, excluded, and the test
/// passes without it with nothing left.
#[test]
fn a_single_bias_is_found_and_excluded() {
    for faulty in 0..8 {
        let mut meas = epoch(40.0, faulty);
        let v = run(&mut meas, 2);
        assert_eq!(v.excluded, 1, "satellite {faulty}");
        assert!(v.passed);
        assert_eq!(v.dof, 3);
        // Nothing left but single-precision rounding of the statistic before (about 300).
        assert!(v.statistic < 1e-6 * 300.0, "{}", v.statistic);
        assert!(matches!(meas[faulty].out.fate, Fate::Excluded { .. }));
        // The identity: before the exclusion the statistic was b² r / σ² = stat².
        let Fate::Excluded { statistic } = meas[faulty].out.fate else {
            unreachable!()
        };
        let mut one = epoch(40.0, faulty);
        let t = run(&mut one, 0);
        assert!(!t.passed);
        let s = f64::from(statistic);
        assert!((s * s - t.statistic).abs() < 1e-4 * t.statistic);
    }
}

/// A bias too small for the test passes; the test's dof is n − 4.
#[test]
fn a_small_bias_passes() {
    let mut meas = epoch(3.0, 2);
    let v = run(&mut meas, 2);
    assert!(v.passed);
    assert_eq!((v.dof, v.excluded), (4, 0));
    assert!((v.threshold - 24.3914).abs() < 1e-3); // CHECKS.md, dof 4
}

/// With no exclusion allowed the test fails and says so; with four satellites (no
/// redundancy) there is no test at all.
#[test]
fn failing_and_untestable() {
    let mut meas = epoch(60.0, 5);
    let v = run(&mut meas, 0);
    assert!(!v.passed && v.excluded == 0);
    let mut four = epoch(60.0, 1);
    let v = run(&mut four[..4], 2);
    assert_eq!(v.dof, 0);
    assert!(!v.passed);
}

/// A NaN residual never passes.
#[test]
fn nan_never_passes() {
    let mut meas = epoch(f64::NAN, 3);
    let v = run(&mut meas, 0);
    assert!(!v.passed);
}

/// The protection levels are the largest slopes of slope.rs (checked against numpy's
/// explicit matrices) times √λ of the test's dof (CHECKS.md: 7.7880 for dof 4), plus
/// K = 3.2905 (the normal quantile of 1e-3 / 2) times the position σ.
#[test]
fn levels_are_largest_slope_times_pbias_plus_the_fault_free_term() {
    let mut meas = epoch(0.0, 0);
    let v = run(&mut meas, 2);
    let (h, vl) = v.levels.unwrap();
    let rows: heapless::Vec<SlopeRow, 8> = meas
        .iter()
        .map(|m| SlopeRow {
            los_enu: [-m.out.row[0], -m.out.row[1], -m.out.row[2]],
            system: 0,
            weight: 0.25,
        })
        .collect();
    let mut out = [Slope::default(); 8];
    slopes(&rows, &mut out).unwrap();
    let sh = out.iter().map(|s| s.horizontal).fold(0.0, f64::max);
    let sv = out.iter().map(|s| s.vertical).fold(0.0, f64::max);
    // σ of east, north, up from numpy-independent algebra: N⁻¹ = (GᵀWG)⁻¹ via slope.rs's
    // gains: Σ_i a_i a_iᵀ / w_i = N⁻¹ (A W⁻¹ Aᵀ = N⁻¹).
    let var = |k: usize| {
        out.iter()
            .map(|s| s.gain_enu[k] * s.gain_enu[k] / 0.25)
            .sum::<f64>()
    };
    let want_h = sh * 7.7880 + 3.2905 * (var(0) + var(1)).sqrt();
    let want_v = sv * 7.7880 + 3.2905 * var(2).sqrt();
    assert!((h / want_h - 1.0).abs() < 1e-5, "{h} vs {want_h}");
    assert!((vl / want_v - 1.0).abs() < 1e-5, "{vl} vs {want_v}");
}

/// Single precision: a common offset of 50 km (a receiver clock) and a position error of
/// 100 m on top of small residuals leave the statistic within 1e-3 of the offset-free one
/// (the fit takes them out; f32 keeps the metre-level residuals to a millimetre).
#[test]
fn offsets_leave_the_statistic() {
    let pattern = [0.9, -2.1, 1.4, 0.3, -1.7, 2.5, -0.6, 1.1];
    let mut clean = epoch(0.0, 0);
    for (m, p) in clean.iter_mut().zip(pattern) {
        m.out.residual_m = p;
    }
    let mut shifted = clean;
    for m in shifted.iter_mut() {
        let r = m.out.row;
        m.out.residual_m += 100.0 * r[0] - 60.0 * r[1] + 40.0 * r[2] + 5.0e4;
    }
    let (a, b) = (run(&mut clean, 0), run(&mut shifted, 0));
    assert!(a.statistic > 1.0, "{}", a.statistic);
    assert!(
        (a.statistic - b.statistic).abs() < 1e-3 * a.statistic,
        "{} vs {}",
        a.statistic,
        b.statistic
    );
}

/// Two faulty satellites: the first exclusion leaves the test failing, the second makes it
/// pass (eight satellites, one system: 4 degrees of freedom, 2 after both); with one
/// exclusion allowed the fix is an alert.
#[test]
fn a_second_exclusion_where_geometry_allows() {
    let mut meas = epoch(80.0, 1);
    meas[6].out.residual_m = -60.0;
    let v = run(&mut meas, 2);
    assert_eq!((v.excluded, v.dof), (2, 2));
    assert!(v.passed, "{v:?}");
    assert!(matches!(meas[1].out.fate, Fate::Excluded { .. }));
    assert!(matches!(meas[6].out.fate, Fate::Excluded { .. }));
    let mut once = epoch(80.0, 1);
    once[6].out.residual_m = -60.0;
    let v = run(&mut once, 1);
    assert!(!v.passed && v.excluded == 1);
}
