use super::*;

/// The residual-test thresholds and √λ of ../shared/CHECKS.md for Pfa = 0.002/30 and
/// 1e-5/30 per sample (its 6.667e-5 and 3.333e-7; scipy `chi2.isf`, and
/// `ncx2.cdf` with `brentq`, Pmd = 1e-3), as stored in the table.
#[test]
fn stored_entries_match_the_published_values() {
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
        let (t, l) = table.get(dof, 1e-5 / 30.0, 1e-3).unwrap();
        assert!((t - t2[dof - 1]).abs() < 1e-4, "dof {dof}: {t}");
        assert!((l - sl[dof - 1]).abs() < 1e-4, "dof {dof}: {l}");
    }
}

#[test]
fn outside_the_table_is_none() {
    let mut table: Thresholds<4> = Thresholds::new();
    assert!(table.get(0, 1e-3, 1e-3).is_none());
    assert!(table.get(5, 1e-3, 1e-3).is_none());
    assert!(table.get(2, f64::NAN, 1e-3).is_none());
}

/// The two-sided normal quantile of 1e-3 is 3.2905 (scipy.stats.norm.isf(5e-4); normal
/// tables \[M\]).
#[test]
fn normal_quantile_of_the_integrity_risk() {
    let mut table: Thresholds<4> = Thresholds::new();
    let k = table.k_md(1e-3, 1e-3).unwrap();
    assert!((k - 3.2905).abs() < 1e-4, "{k}");
}
