//! The engine's only matrix kernels: a symmetric positive-definite (Cholesky) factorisation,
//! solve and inverse of any fixed size `D`, in place on plain arrays (6×6 for the position
//! solution, 4×4 for the velocity).
//!
//! Why hand-written rather than nalgebra (which the engine used at first): these kernels have
//! no dimension assertions, so the engine is free of panic paths whatever the optimisation
//! settings (nalgebra's vanish only at opt-level "s" with fat LTO), and on the Cortex-M4F they
//! measured 760 B less flash, 252 B less stack and slightly fewer instructions per epoch.
//! They are checked against nalgebra on random normal matrices in
//! `host-tests/tests/linalg.rs`.
//!
//! Cost for size D: factorisation D³/6 multiply-adds and D square roots (6×6: 36 and 6);
//! solve D² multiply-adds; inverse D solves.

/// A D×D matrix, row-major.
pub type Mat<const D: usize> = [[f64; D]; D];

/// A 6×6 matrix, row-major (the position solution's size).
pub type Mat6 = Mat<6>;

fn at<const D: usize>(m: &Mat<D>, i: usize, j: usize) -> f64 {
    m.get(i).and_then(|r| r.get(j)).copied().unwrap_or(0.0)
}

fn set<const D: usize>(m: &mut Mat<D>, i: usize, j: usize, v: f64) {
    if let Some(x) = m.get_mut(i).and_then(|r| r.get_mut(j)) {
        *x = v;
    }
}

/// Adds `v` to element (i, j); indices outside the matrix are ignored.
pub fn add<const D: usize>(m: &mut Mat<D>, i: usize, j: usize, v: f64) {
    if let Some(x) = m.get_mut(i).and_then(|r| r.get_mut(j)) {
        *x += v;
    }
}

/// The lower-triangular Cholesky factor L of a symmetric positive-definite matrix (A = LLᵀ).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Cholesky<const D: usize> {
    l: Mat<D>,
}

/// The 6×6 factorisation of the position solution.
pub type Cholesky6 = Cholesky<6>;

impl<const D: usize> Cholesky<D> {
    /// Factorises the lower triangle of `a`. `None` when a pivot is not positive and finite
    /// (the matrix is not positive definite, or holds NaN).
    pub fn new(a: &Mat<D>) -> Option<Self> {
        let mut l = [[0.0; D]; D];
        for j in 0..D {
            let mut d = at(a, j, j);
            for k in 0..j {
                let v = at(&l, j, k);
                d -= v * v;
            }
            if !(d > 0.0 && d.is_finite()) {
                return None;
            }
            let djj = libm::sqrt(d);
            set(&mut l, j, j, djj);
            for i in j.saturating_add(1)..D {
                let mut s = at(a, i, j);
                for k in 0..j {
                    s -= at(&l, i, k) * at(&l, j, k);
                }
                set(&mut l, i, j, s / djj);
            }
        }
        Some(Cholesky { l })
    }

    /// Solves A·x = b.
    pub fn solve(&self, b: &[f64; D]) -> [f64; D] {
        let l = &self.l;
        let mut y = [0.0; D];
        for i in 0..D {
            let mut s = b.get(i).copied().unwrap_or(0.0);
            for k in 0..i {
                s -= at(l, i, k) * y.get(k).copied().unwrap_or(0.0);
            }
            if let Some(v) = y.get_mut(i) {
                *v = s / at(l, i, i);
            }
        }
        let mut x = [0.0; D];
        for i in (0..D).rev() {
            let mut s = y.get(i).copied().unwrap_or(0.0);
            for k in i.saturating_add(1)..D {
                s -= at(l, k, i) * x.get(k).copied().unwrap_or(0.0);
            }
            if let Some(v) = x.get_mut(i) {
                *v = s / at(l, i, i);
            }
        }
        x
    }

    /// A⁻¹, column by column.
    pub fn inverse(&self) -> Mat<D> {
        let mut inv = [[0.0; D]; D];
        for c in 0..D {
            let mut e = [0.0; D];
            if let Some(v) = e.get_mut(c) {
                *v = 1.0;
            }
            let col = self.solve(&e);
            for (r, v) in col.iter().enumerate() {
                set(&mut inv, r, c, *v);
            }
        }
        inv
    }
}
