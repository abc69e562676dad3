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
//! solve D² multiply-adds; inverse about D³/3 multiply-adds and D divisions.

/// A D×D matrix, row-major.
pub type Mat<const D: usize> = [[f64; D]; D];

/// A 6×6 matrix, row-major (the position solution's size).
pub type Mat6 = Mat<6>;

/// The precisions the engine's generic code runs in: f64 everywhere a range or a position
/// is solved, f32 for the integrity geometry (fde.rs shows the loss negligible there) and the
/// broadcast ionosphere (iono_tests.rs), which the Cortex-M4F computes in hardware.
pub trait Scalar:
    Copy
    + PartialOrd
    + core::ops::Add<Output = Self>
    + core::ops::Sub<Output = Self>
    + core::ops::Mul<Output = Self>
    + core::ops::Div<Output = Self>
    + core::ops::Neg<Output = Self>
    + core::ops::AddAssign
    + core::ops::SubAssign
{
    /// 0.
    const ZERO: Self;
    /// 1.
    const ONE: Self;
    /// The square root.
    fn sqrt(self) -> Self;
    /// Neither NaN nor infinite.
    fn finite(self) -> bool;
    /// The value of an f64 in this precision.
    fn of(v: f64) -> Self;
    /// This value as an f64.
    fn to_f64(self) -> f64;
    /// The cosine (the engine's own: `trig`).
    fn cos(self) -> Self;
    /// The absolute value.
    fn abs(self) -> Self;
}

impl Scalar for f64 {
    const ZERO: Self = 0.0;
    const ONE: Self = 1.0;
    fn sqrt(self) -> Self {
        libm::sqrt(self)
    }
    fn finite(self) -> bool {
        self.is_finite()
    }
    fn of(v: f64) -> Self {
        v
    }
    fn to_f64(self) -> f64 {
        self
    }
    fn cos(self) -> Self {
        crate::trig::cos(self)
    }
    fn abs(self) -> Self {
        libm::fabs(self)
    }
}

impl Scalar for f32 {
    const ZERO: Self = 0.0;
    const ONE: Self = 1.0;
    fn sqrt(self) -> Self {
        libm::sqrtf(self)
    }
    fn finite(self) -> bool {
        self.is_finite()
    }
    fn of(v: f64) -> Self {
        v as f32
    }
    fn to_f64(self) -> f64 {
        f64::from(self)
    }
    fn cos(self) -> Self {
        crate::trig::cos_f32(self)
    }
    fn abs(self) -> Self {
        libm::fabsf(self)
    }
}

fn at<T: Scalar, const D: usize>(m: &[[T; D]; D], i: usize, j: usize) -> T {
    m.get(i).and_then(|r| r.get(j)).copied().unwrap_or(T::ZERO)
}

fn set<T: Scalar, const D: usize>(m: &mut [[T; D]; D], i: usize, j: usize, v: T) {
    if let Some(x) = m.get_mut(i).and_then(|r| r.get_mut(j)) {
        *x = v;
    }
}

/// The lower median of `values` (O(n²) comparisons and no sorting code: the engine's lists
/// hold at most an epoch's observations); `None` when empty or when NaN leaves no value
/// with half the others on each side.
pub(crate) fn lower_median<T: Copy + PartialOrd>(values: &[T]) -> Option<T> {
    let half = values.len() / 2;
    values.iter().copied().find(|&v| {
        let below = values.iter().filter(|&&w| w < v).count();
        let at_most = values.iter().filter(|&&w| w <= v).count();
        below <= half && half < at_most
    })
}

/// Adds `v` to element (i, j); indices outside the matrix are ignored.
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is f32 or f64 (Scalar's only implementations): float arithmetic cannot panic"
)]
pub fn add<T: Scalar, const D: usize>(m: &mut [[T; D]; D], i: usize, j: usize, v: T) {
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
        Self::factor(*a)
    }

    /// As [`Cholesky::new`], consuming `a` (see [`factor_in_place`]).
    pub fn factor(mut a: Mat<D>) -> Option<Self> {
        factor_in_place(&mut a).then_some(Cholesky { l: a })
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

    /// A⁻¹, exactly symmetric (see [`invert_factor_in_place`]).
    pub fn inverse(self) -> Mat<D> {
        let mut m = self.l;
        invert_factor_in_place(&mut m);
        m
    }
}

/// Cholesky factorisation in place: L overwrites the lower triangle of `a` (the upper
/// triangle is left as it was and never read), so no second matrix is on the stack. `false`
/// when a pivot is not positive and finite (not positive definite, or NaN); `a` is then
/// partly overwritten.
pub fn factor_in_place<T: Scalar, const D: usize>(a: &mut [[T; D]; D]) -> bool {
    factor_in_place_with_margin(a, T::ZERO)
}

/// As [`factor_in_place`], and `false` also when a pivot falls to `margin` times its
/// diagonal element or below: when an unknown is determined by the others to that
/// relative precision, f64 has lost it (`margin` 1e-12 keeps four digits of sixteen).
/// Scale-free: the test compares each unknown's variance given the others with its own.
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is f32 or f64 (Scalar's only implementations): float arithmetic cannot panic"
)]
pub fn factor_in_place_with_margin<T: Scalar, const D: usize>(
    a: &mut [[T; D]; D],
    margin: T,
) -> bool {
    for j in 0..D {
        let ajj = at(a, j, j);
        let mut d = ajj;
        for k in 0..j {
            let v = at(a, j, k);
            d -= v * v;
        }
        if !(d > margin * ajj && d > T::ZERO && d.finite()) {
            return false;
        }
        let djj = d.sqrt();
        set(a, j, j, djj);
        for i in j.saturating_add(1)..D {
            let mut s = at(a, i, j);
            for k in 0..j {
                s -= at(a, i, k) * at(a, j, k);
            }
            set(a, i, j, s / djj);
        }
    }
    true
}

/// Turns a Cholesky factor L (lower triangle of `m`) into A⁻¹ = L⁻ᵀ·L⁻¹ in place, exactly
/// symmetric: L⁻¹ by forward substitution into the lower triangle (D divisions, about D³/6
/// multiply-adds), then the upper triangle of the product (about D³/6) and its mirror.
/// About a third of the work of D separate solves, D instead of 2·D² divisions (which
/// matters where f64 is emulated in software), and no second matrix on the stack.
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is f32 or f64 (Scalar's only implementations): float arithmetic cannot panic"
)]
pub fn invert_factor_in_place<T: Scalar, const D: usize>(m: &mut [[T; D]; D]) {
    // W = L⁻¹ row by row: W_ij = −(Σ_{k=j}^{i−1} L_ik W_kj)/L_ii. Going through j in
    // ascending order, row i still holds L from column j on; rows above hold W.
    for i in 0..D {
        let inv_d = T::ONE / at(m, i, i);
        for j in 0..i {
            let mut s = T::ZERO;
            for k in j..i {
                s += at(m, i, k) * at(m, k, j);
            }
            set(m, i, j, -s * inv_d);
        }
        set(m, i, i, inv_d);
    }
    // (A⁻¹)_ij = Σ_{k ≥ j} W_ki W_kj for i ≤ j, into the upper triangle column by column;
    // the diagonal W_jj is overwritten last in its column, after its last use.
    for j in 0..D {
        for i in 0..=j {
            let mut s = T::ZERO;
            for k in j..D {
                s += at(m, k, i) * at(m, k, j);
            }
            set(m, i, j, s);
        }
    }
    for i in 0..D {
        for j in i.saturating_add(1)..D {
            let v = at(m, i, j);
            set(m, j, i, v);
        }
    }
}

/// Inverts a symmetric positive-definite matrix in place (only its lower triangle is read).
/// `false` when it is not positive definite, or not by `margin` (see
/// [`factor_in_place_with_margin`]); `a` is then partly overwritten.
pub fn invert_spd_in_place<const D: usize>(a: &mut Mat<D>, margin: f64) -> bool {
    if !factor_in_place_with_margin(a, margin) {
        return false;
    }
    invert_factor_in_place(a);
    true
}
