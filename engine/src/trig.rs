//! Double-precision sine and cosine for the engine, in place of the float library's.
//!
//! Why not libm's: its `sin` and `cos` carry the argument reduction for any finite
//! argument, up to 1e308 (Payne–Hanek), which links about 4 KB of code on the Cortex-M4F
//! that the engine's arguments never need: orbit angles, latitudes and longitudes stay
//! within tens of radians. Measured on the firmware example: see docs/dependencies.md.
//!
//! Method (textbook, common practice):
//! - reduction by the nearest multiple `n` of π/2, with π/2 split into three parts of 33,
//!   33 and 53 bits (Cody & Waite 1980), so that `n·P1` and `n·P2` are exact for
//!   `|n| < 2²⁰` (`|x|` up to about 1.6e6 rad); the remainder `r` lies in [−π/4, π/4];
//! - sine and cosine of `r` by their Taylor series to the x¹⁷ and x¹⁶ terms, whose first
//!   omitted terms are below 1e-17 on that interval (`(π/4)¹⁹/19!` ≈ 8e-20,
//!   `(π/4)¹⁸/18!` ≈ 2e-18), in Horner form;
//! - the quadrant `n mod 4` picks and signs the pair.
//!
//! Checked against the host's `f64::sin_cos` on a million arguments in ±1e5 rad and near
//! multiples of π/2: within 2 ulp of 1 (trig_tests.rs). Beyond ±1.6e6 rad (never an
//! engine argument) the reduction goes through `floor` and loses accuracy, but stays finite.

/// 2/π.
const TWO_OVER_PI: f64 = core::f64::consts::FRAC_2_PI;
/// π/2 in three parts: 33 bits, the next 33 bits, the rest (computed from 80 digits of π).
const P1: f64 = 1.570_796_326_734_125_6;
const P2: f64 = 6.077_100_506_303_966e-11;
const P3: f64 = 2.022_266_248_795_950_6e-21;
/// Largest `|x|` for which the three-part reduction is exact.
const EXACT_REDUCTION: f64 = 1.6e6;

/// sin x and cos x; NaN for a non-finite `x`.
pub fn sin_cos(x: f64) -> (f64, f64) {
    if !x.is_finite() {
        return (f64::NAN, f64::NAN);
    }
    let x = if x.abs() > EXACT_REDUCTION {
        let turns = libm::floor(x / core::f64::consts::TAU);
        x - turns * core::f64::consts::TAU
    } else {
        x
    };
    let n = libm::floor(x * TWO_OVER_PI + 0.5);
    let r = ((x - n * P1) - n * P2) - n * P3;
    let (s, c) = kernel(r);
    // n is an integer below 2²² in magnitude here: the conversion is exact.
    match (n as i64) & 3 {
        0 => (s, c),
        1 => (c, -s),
        2 => (-s, -c),
        _ => (-c, s),
    }
}

/// sin x.
pub fn sin(x: f64) -> f64 {
    sin_cos(x).0
}

/// cos x.
pub fn cos(x: f64) -> f64 {
    sin_cos(x).1
}

/// Sine and cosine of `r` in [−π/4, π/4] by their Taylor series.
fn kernel(r: f64) -> (f64, f64) {
    let z = r * r;
    // 1/3!, 1/5!, … 1/17! and 1/2!, 1/4!, … 1/16!, alternating in sign.
    let s = -1.0 / 6.0
        + z * (1.0 / 120.0
            + z * (-1.0 / 5_040.0
                + z * (1.0 / 362_880.0
                    + z * (-1.0 / 39_916_800.0
                        + z * (1.0 / 6_227_020_800.0
                            + z * (-1.0 / 1_307_674_368_000.0
                                + z * (1.0 / 355_687_428_096_000.0)))))));
    let c = 1.0 / 24.0
        + z * (-1.0 / 720.0
            + z * (1.0 / 40_320.0
                + z * (-1.0 / 3_628_800.0
                    + z * (1.0 / 479_001_600.0
                        + z * (-1.0 / 87_178_291_200.0 + z * (1.0 / 20_922_789_888_000.0))))));
    (r + r * z * s, 1.0 - 0.5 * z + z * z * c)
}

#[cfg(test)]
#[path = "trig_tests.rs"]
mod tests;

/// Largest `|x|` [`cos_f32`] reduces accurately; beyond it the result is NaN.
const COS_F32_SPAN: f32 = 100.0;

/// Single-precision cosine for the broadcast ionosphere model's arguments (latitudes and
/// longitudes in radians, `|x|` below 10): reduction by the nearest multiple of π/2 with
/// π/2 in three parts (Cody & Waite 1980), then the Taylor series of sine or cosine on
/// [−π/4, π/4] to the x⁸ and x⁹ terms (first omitted terms below 4e-9 and 3e-10). Replaces
/// the float library's `cosf`, whose reduction for any argument links 3 KB on the target
/// (docs/dependencies.md). Within 2e-7 of the host's f64 cosine on ±100 rad
/// (trig_tests.rs); NaN beyond that span.
pub fn cos_f32(x: f32) -> f32 {
    // π/2 in three parts of few bits each (Cephes' sinf constants, doubled), so that
    // n·P1 and n·P2 are exact for the n this span meets.
    const P1: f32 = 1.570_312_5;
    const P2: f32 = 4.837_513e-4;
    const P3: f32 = 7.549_79e-8;
    // NaN fails the comparison too.
    if x.is_nan() || x.abs() > COS_F32_SPAN {
        return f32::NAN;
    }
    let n = libm::floorf(x * core::f32::consts::FRAC_2_PI + 0.5);
    let r = ((x - n * P1) - n * P2) - n * P3;
    let r2 = r * r;
    let c = 1.0 + r2 * (-0.5 + r2 * (1.0 / 24.0 + r2 * (-1.0 / 720.0 + r2 * (1.0 / 40_320.0))));
    let s = r
        * (1.0
            + r2 * (-1.0 / 6.0
                + r2 * (1.0 / 120.0 + r2 * (-1.0 / 5_040.0 + r2 * (1.0 / 362_880.0)))));
    // cos(x) = cos(r + nπ/2): cos r, −sin r, −cos r, sin r by n mod 4.
    match (n as i32).rem_euclid(4) {
        0 => c,
        1 => -s,
        2 => -c,
        _ => s,
    }
}
