use super::*;
use crate::integrity::default_table::DEFAULT_MAX_DOF;

/// The residual-test thresholds and √λ of ../shared/CHECKS.md for Pfa = 0.002/30 and
/// 1e-5/30 per sample (its 6.667e-5 and 3.333e-7; scipy `chi2.isf`, and `ncx2.cdf` with
/// `brentq`, Pmd = 1e-3): the built-in table, and the engine's own searches.
#[test]
fn entries_match_the_published_values() {
    let t2 = [15.9032, 19.2316, 21.9546, 24.3914, 26.6521, 28.7899];
    let sl = [7.0781, 7.3883, 7.6091, 7.7880, 7.9413, 8.0769];
    let mut table: Thresholds<8> = Thresholds::new();
    for dof in 1..=6 {
        let (t, l) = table.get(dof, 0.002 / 30.0, 1e-3).unwrap();
        assert!((t - t2[dof - 1]).abs() < 1e-4, "dof {dof}: {t}");
        assert!((l - sl[dof - 1]).abs() < 1e-4, "dof {dof}: {l}");
    }
    let t2 = [26.0463, 29.8283, 32.9292, 35.7014, 38.2679, 40.6896];
    let sl = [8.1938, 8.4786, 8.6875, 8.8597, 9.0091, 9.1423];
    for dof in 1..=6 {
        let (t, l) = compute(dof as u32, 1e-5 / 30.0, 1e-3).unwrap();
        assert!((t - t2[dof - 1]).abs() < 1e-4, "dof {dof}: {t}");
        assert!((l - sl[dof - 1]).abs() < 1e-4, "dof {dof}: {l}");
    }
}

/// Every built-in entry equals scipy's value in tools/refvectors/thresholds_default.csv
/// rounded to single precision, and the engine's own searches to 1e-6 relative.
#[test]
fn built_in_table_matches_scipy_and_the_searches() {
    let csv = include_str!("../../../tools/refvectors/thresholds_default.csv");
    let mut rows = 0;
    for line in csv.lines().filter(|l| !l.starts_with('#')) {
        let v: heapless::Vec<f64, 3> = line.split(',').map(|x| x.parse().unwrap()).collect();
        let dof = v[0] as usize;
        if dof == 0 {
            assert_eq!(DEFAULT_K_MD, v[1] as f32);
            continue;
        }
        let (t, l) = DEFAULT_TABLE[dof - 1];
        assert_eq!(t, v[1] as f32, "dof {dof}");
        assert_eq!(l, libm::sqrt(v[2]) as f32, "dof {dof}");
        let (ct, cl) = compute(dof as u32, DEFAULT_FALSE_ALARM, DEFAULT_INTEGRITY_RISK).unwrap();
        assert!((ct / v[1] - 1.0).abs() < 1e-6 && (cl / libm::sqrt(v[2]) - 1.0).abs() < 1e-6);
        rows += 1;
    }
    assert_eq!(rows, DEFAULT_MAX_DOF);
    let k = normal_quantile(1e-3).unwrap();
    assert!((k - 3.2905).abs() < 1e-4, "{k}");
}

#[test]
fn outside_the_table_is_none() {
    let mut table: Thresholds<4> = Thresholds::new();
    assert!(table.get(0, DEFAULT_FALSE_ALARM, 1e-3).is_none());
    assert!(table.get(61, DEFAULT_FALSE_ALARM, 1e-3).is_none());
    assert!(table.get(2, f64::NAN, 1e-3).is_none());
}
