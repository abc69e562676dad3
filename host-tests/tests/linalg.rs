//! The engine's 6×6 kernels against nalgebra (a general-purpose linear-algebra library) on
//! random symmetric positive-definite matrices, as the engine builds them (HᵀWH plus pins).

use nalgebra::{DMatrix, DVector};
use proptest::prelude::*;
use trackfix_engine::linalg::{Cholesky6, Mat6};

fn spd() -> impl Strategy<Value = Mat6> {
    // Rows of H (unit line of sight, clock 1) and weights, like the normal equations.
    proptest::collection::vec(
        (
            (-1.0f64..1.0, -1.0f64..1.0, 0.05f64..1.0),
            0usize..3,
            0.1f64..10.0,
        ),
        7..24,
    )
    .prop_map(|rows| {
        let mut n = [[0.0; 6]; 6];
        let mut present = [false; 3];
        for ((x, y, z), sys, w) in rows {
            let r = (x * x + y * y + z * z).sqrt();
            let mut h = [0.0; 6];
            h[0] = -x / r;
            h[1] = -y / r;
            h[2] = -z / r;
            h[3 + sys] = 1.0;
            present[sys] = true;
            for i in 0..6 {
                for j in 0..6 {
                    n[i][j] += h[i] * h[j] * w;
                }
            }
        }
        for k in 0..3 {
            if !present[k] {
                n[3 + k][3 + k] += 1.0;
            }
        }
        n
    })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(500))]
    // Inverse and solve agree with nalgebra's LU-based inverse to 1e-9 relative (double
    // precision on condition numbers up to ~1e4).
    #[test]
    fn inverse_and_solve_match_nalgebra(a in spd(), b in proptest::array::uniform6(-100.0f64..100.0)) {
        let m = DMatrix::from_fn(6, 6, |i, j| a[i][j]);
        let reference = m.clone().try_inverse().unwrap();
        let chol = Cholesky6::new(&a).unwrap();
        let inv = chol.inverse();
        let scale = reference.amax();
        for i in 0..6 {
            for j in 0..6 {
                prop_assert!((inv[i][j] - reference[(i, j)]).abs() <= 1e-9 * scale);
            }
        }
        let x = chol.solve(&b);
        let xr = reference * DVector::from_row_slice(&b);
        for i in 0..6 {
            prop_assert!((x[i] - xr[i]).abs() <= 1e-9 * xr.amax().max(1.0));
        }
    }
}

#[test]
fn indefinite_and_nan_matrices_are_refused() {
    let mut a = [[0.0; 6]; 6];
    for (i, row) in a.iter_mut().enumerate() {
        row[i] = 1.0;
    }
    a[2][2] = -1.0;
    assert!(Cholesky6::new(&a).is_none());
    a[2][2] = f64::NAN;
    assert!(Cholesky6::new(&a).is_none());
}
