//! Consistency of the filter core (NEES and NIS) on a Monte Carlo simulation whose truth
//! follows the filter's own model: the truth state is propagated with the filter's F and
//! process noise drawn from its Q, measured through pseudorange and range-rate rows with
//! Gaussian noise of the stated variance. Then the average NEES over the runs at each step
//! lies in [χ²₀.₀₂₅(nN)/N, χ²₀.₉₇₅(nN)/N] (n = 10 states, N runs), and the average NIS of
//! the scalar updates in [χ²₀.₀₂₅(N)/N, χ²₀.₉₇₅(N)/N], 95 % of the time (Bar-Shalom, Li &
//! Kirubarajan, "Estimation with Applications to Tracking and Navigation", 2001, §5.4 [M];
//! the χ² quantiles from scipy.stats.chi2.ppf [C], pinned generator
//! tools/refvectors/gen_chi2.py, regenerated and compared by `cargo xtask test`).

use nalgebra::{SMatrix, SVector};
use rand::SeedableRng;
use rand_distr::{Distribution, Normal};
use trackfix_engine::filter::state::STATE_LEN;
use trackfix_engine::filter::{FilterState, MeasurementRow, MotionProfile, ProcessNoise};
use trackfix_engine::{Geodetic, System};

type Mat = SMatrix<f64, STATE_LEN, STATE_LEN>;
type Vect = SVector<f64, STATE_LEN>;

const RUNS: usize = 50;
const STEPS: usize = 60;
const DT: f64 = 1.0;

fn mat(p: &[[f64; STATE_LEN]; STATE_LEN]) -> Mat {
    Mat::from_fn(|i, j| p[i][j])
}

/// The filter's Q for one step: the covariance a prediction adds to a state known exactly
/// (P = 1e-12 I; F P Fᵀ then contributes below 1e-11).
fn process_q(noise: &ProcessNoise, at: [f64; 3]) -> Mat {
    let mut x = [0.0; STATE_LEN];
    x[..3].copy_from_slice(&at);
    let mut p = [[0.0; STATE_LEN]; STATE_LEN];
    for (i, row) in p.iter_mut().enumerate() {
        row[i] = 1e-12;
    }
    let mut s = FilterState::from_parts(x, p).unwrap();
    s.predict(DT, 10.0, noise).unwrap();
    mat(s.p())
}

const CHI2: &str = include_str!("../../tools/refvectors/chi2_scipy.csv");

/// The 0.025 and 0.975 quantiles of χ²(dof), divided by `runs`.
fn bounds(dof: usize, runs: usize) -> (f64, f64) {
    let row: Vec<f64> = CHI2
        .lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| {
            l.split(',')
                .map(|v| v.parse().unwrap())
                .collect::<Vec<f64>>()
        })
        .find(|r| r[0] == dof as f64)
        .unwrap_or_else(|| panic!("χ²({dof}) is not in chi2_scipy.csv: add it to gen_chi2.py"));
    (row[1] / runs as f64, row[2] / runs as f64)
}

// The generated file reproduces the bounds CHECKS.md lists [C: scipy.stats.chi2.ppf]:
// n = 3, N = 50: [2.360, 3.716]; n = 6, N = 50: [5.078, 6.998]; n = 8, N = 1000:
// [7.754, 8.250]. The listed values have three decimals, so the tolerance is one unit of the
// last one (6.998 is 6.99749 rounded up).
#[test]
fn chi_square_bounds_match_the_published_values() {
    for (dof, runs, want) in [
        (150, 50, (2.360, 3.716)),
        (300, 50, (5.078, 6.998)),
        (8000, 1000, (7.754, 8.250)),
    ] {
        let (lo, hi) = bounds(dof, runs);
        assert!(
            (lo - want.0).abs() < 1e-3 && (hi - want.1).abs() < 1e-3,
            "{lo} {hi}"
        );
    }
}

#[test]
fn nees_and_nis_lie_within_their_bounds() {
    let site = Geodetic::from_degrees(47.6, 8.9, 400.0).to_ecef();
    let noise = ProcessNoise {
        motion: MotionProfile::PEDESTRIAN,
        ..ProcessNoise::default()
    };
    let q = process_q(&noise, site);
    let q_chol = q.cholesky().expect("Q positive definite").l();
    let p0_diag = [100.0, 100.0, 100.0, 1.0, 1.0, 1.0, 1e4, 100.0, 25.0, 25.0];
    let p0 = Mat::from_diagonal(&Vect::from_row_slice(&p0_diag));
    let mut rng = rand::rngs::StdRng::seed_from_u64(8);
    let unit = Normal::new(0.0, 1.0).unwrap();
    let draw = |rng: &mut rand::rngs::StdRng| Vect::from_fn(|_, _| unit.sample(rng));
    let mut nees = vec![0.0; STEPS];
    let mut nis = vec![0.0; STEPS];
    let mut nis_count = vec![0usize; STEPS];
    let up = [site[0], site[1], site[2]].map(|v| v / (site[0].hypot(site[1]).hypot(site[2])));
    for _ in 0..RUNS {
        let mut x_hat = [0.0; STATE_LEN];
        x_hat[..3].copy_from_slice(&site);
        let mut p = [[0.0; STATE_LEN]; STATE_LEN];
        for (i, row) in p.iter_mut().enumerate() {
            row[i] = p0_diag[i];
        }
        let mut filter = FilterState::from_parts(x_hat, p).unwrap();
        let mut truth = Vect::from_row_slice(&x_hat) + p0.cholesky().unwrap().l() * draw(&mut rng);
        for k in 0..STEPS {
            filter.predict(DT, 10.0, &noise).unwrap();
            let mut next = truth;
            for a in 0..3 {
                next[a] += truth[3 + a] * DT;
            }
            next[6] += truth[7] * DT;
            truth = next + q_chol * draw(&mut rng);
            // Eight satellites above the horizon in random directions, each a pseudorange
            // (σ 1 m) and a range rate (σ 0.1 m/s), rows linear in the state.
            for m in 0..8 {
                let v = draw(&mut rng);
                let mut u = [v[0], v[1], v[2]];
                let along = u[0] * up[0] + u[1] * up[1] + u[2] * up[2];
                if along < 0.0 {
                    u = [0, 1, 2].map(|i| u[i] - 2.0 * along * up[i]);
                }
                let n = (u[0] * u[0] + u[1] * u[1] + u[2] * u[2]).sqrt();
                let u = u.map(|c| c / n);
                let system = [System::Gps, System::Galileo, System::Beidou][m % 3];
                for (row, r) in [
                    (MeasurementRow::pseudorange(u, system), 1.0f64),
                    (MeasurementRow::range_rate(u), 0.01),
                ] {
                    let h = Vect::from_row_slice(row.coefficients());
                    let z = h.dot(&truth) + r.sqrt() * unit.sample(&mut rng);
                    let innovation = z - h.dot(&Vect::from_row_slice(filter.x()));
                    let out = filter.update(&row, innovation, r, f64::INFINITY).unwrap();
                    nis[k] += out.nis();
                    nis_count[k] += 1;
                }
            }
            let e = truth - Vect::from_row_slice(filter.x());
            let p_inv = mat(filter.p()).try_inverse().unwrap();
            nees[k] += (e.transpose() * p_inv * e)[(0, 0)];
        }
    }
    let (nees_lo, nees_hi) = bounds(STATE_LEN * RUNS, RUNS);
    let inside_nees = nees
        .iter()
        .filter(|v| (nees_lo..=nees_hi).contains(&(**v / RUNS as f64)))
        .count();
    // NIS: each scalar update's statistic is χ²(1); averaged over the runs and the 16 updates
    // of a step it has 16·N degrees of freedom divided by 16·N.
    let per_step = nis_count[0];
    let (nis_lo, nis_hi) = bounds(per_step, per_step);
    let inside_nis = nis
        .iter()
        .zip(&nis_count)
        .filter(|(v, c)| (nis_lo..=nis_hi).contains(&(**v / **c as f64)))
        .count();
    let mean_nees = nees.iter().sum::<f64>() / (RUNS * STEPS) as f64;
    println!(
        "ANEES bounds [{nees_lo:.3}, {nees_hi:.3}]: {inside_nees} of {STEPS} steps inside, mean {mean_nees:.3}; \
         NIS bounds [{nis_lo:.3}, {nis_hi:.3}]: {inside_nis} of {STEPS} steps inside"
    );
    // 95 % of the steps are expected inside; the count of 60 has a binomial σ of 1.7 steps,
    // so at least 52 (about 2.5 σ below the expected 57) must be inside.
    assert!(inside_nees >= 52, "{inside_nees} of {STEPS} ANEES inside");
    assert!(inside_nis >= 52, "{inside_nis} of {STEPS} NIS inside");
}
