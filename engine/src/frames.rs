//! WGS-84 frames: ECEF ↔ geodetic, the local east/north/up frame, azimuth and elevation.
//!
//! Constants from NGA TR8350.2 (WGS-84): a = 6,378,137 m, 1/f = 298.257223563.

use crate::trig::sin_cos;
use libm::{atan2, sqrt};

/// WGS-84 semi-major axis, metres.
pub const WGS84_A: f64 = 6_378_137.0;
/// WGS-84 inverse flattening.
pub const WGS84_INV_F: f64 = 298.257_223_563;
/// WGS-84 flattening.
pub const WGS84_F: f64 = 1.0 / WGS84_INV_F;
/// WGS-84 semi-minor axis, metres.
pub const WGS84_B: f64 = WGS84_A * (1.0 - WGS84_F);
/// WGS-84 first eccentricity squared.
pub const WGS84_E2: f64 = WGS84_F * (2.0 - WGS84_F);
/// Bound on `d²·|sin φ|/cos φ` for which [`Geodetic::nudged`] takes its first-order step,
/// m² (6,400 km × 1 mm).
pub const NUDGE_LIMIT_M2: f64 = 6.4e3;
/// WGS-84 second eccentricity squared.
const WGS84_EP2: f64 = WGS84_E2 / (1.0 - WGS84_E2);

/// A geodetic position on the WGS-84 ellipsoid.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Geodetic {
    /// Geodetic latitude, radians, −π/2…π/2.
    pub lat_rad: f64,
    /// Longitude, radians, −π…π.
    pub lon_rad: f64,
    /// Height above the ellipsoid, metres.
    pub height_m: f64,
}

impl Geodetic {
    /// From degrees and metres.
    pub fn from_degrees(lat_deg: f64, lon_deg: f64, height_m: f64) -> Self {
        Geodetic {
            lat_rad: lat_deg.to_radians(),
            lon_rad: lon_deg.to_radians(),
            height_m,
        }
    }

    /// The ECEF position of this point.
    pub fn to_ecef(&self) -> [f64; 3] {
        let (sl, cl) = sin_cos(self.lat_rad);
        let (so, co) = sin_cos(self.lon_rad);
        let n = WGS84_A / sqrt(1.0 - WGS84_E2 * sl * sl);
        [
            (n + self.height_m) * cl * co,
            (n + self.height_m) * cl * so,
            (n * (1.0 - WGS84_E2) + self.height_m) * sl,
        ]
    }

    /// The geodetic position of `p`, an ECEF point near `origin` (whose geodetic position
    /// is `self` and local frame `frame`), by one first-order step: `Δφ = Δn/(M + h)`,
    /// `Δλ = Δe/((N + h) cos φ)`, `Δh = Δu`. Its error grows as `d²·tan φ/R` for a move of
    /// `d`: the step is taken only where that stays under about 1 mm
    /// (`d² |sin φ| ≤ NUDGE_LIMIT_M2 · cos φ`, about 80 m at 45°; frames_tests.rs), else the
    /// exact conversion. Saves the iterative conversion's trigonometry where a filter moves
    /// its position by metres per epoch.
    pub fn nudged(&self, origin: [f64; 3], frame: &LocalFrame, p: [f64; 3]) -> Geodetic {
        let d = sub(p, origin);
        let [de, dn, du] = frame.rotate(d);
        let [_, _, [ux, uy, uz]] = frame.axes;
        let (sl, cl) = (uz, sqrt(ux * ux + uy * uy));
        let w2 = 1.0 - WGS84_E2 * sl * sl;
        let d2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
        if d2 * sl.abs() > NUDGE_LIMIT_M2 * cl || w2 <= 0.0 {
            return Geodetic::from_ecef(p);
        }
        let w = sqrt(w2);
        let n = WGS84_A / w;
        let m = n * (1.0 - WGS84_E2) / w2;
        Geodetic {
            lat_rad: self.lat_rad + dn / (m + self.height_m),
            lon_rad: self.lon_rad + de / ((n + self.height_m) * cl),
            height_m: self.height_m + du,
        }
    }

    /// The geodetic coordinates of an ECEF position.
    ///
    /// Bowring's 1976 closed form as a start, then two fixed-point steps on
    /// `tan φ = (z + e²N sin φ)/p`, which contract by at most e² ≈ 0.0067 each: better than
    /// 0.1 mm from −400 m to 20,000 km altitude, poles included (checked against pymap3d on
    /// 1,000+ points). At the Earth's centre it returns latitude 0, height −a.
    // Not inlined: called from several stages, one copy of its code saves flash on the target.
    #[inline(never)]
    pub fn from_ecef(p: [f64; 3]) -> Self {
        let [x, y, z] = p;
        let rho = sqrt(x * x + y * y);
        let lon = atan2(y, x);
        let theta = atan2(z * WGS84_A, rho * WGS84_B);
        let (st, ct) = sin_cos(theta);
        let mut lat = atan2(
            z + WGS84_EP2 * WGS84_B * st * st * st,
            rho - WGS84_E2 * WGS84_A * ct * ct * ct,
        );
        let mut height = 0.0;
        for _ in 0..3 {
            let (sl, cl) = sin_cos(lat);
            let w = sqrt(1.0 - WGS84_E2 * sl * sl);
            let n = WGS84_A / w;
            // Valid at the poles too (no division by cos φ).
            height = rho * cl + z * sl - WGS84_A * w;
            let denom = n + height;
            if denom <= 0.0 {
                break;
            }
            lat = atan2(z, rho * (1.0 - WGS84_E2 * n / denom));
        }
        Geodetic {
            lat_rad: lat,
            lon_rad: lon,
            height_m: height,
        }
    }
}

/// The local east/north/up frame at a point, with its rotation precomputed.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct LocalFrame {
    /// ECEF origin of the frame, metres.
    pub origin: [f64; 3],
    /// Rows: east, north and up unit vectors in ECEF.
    pub axes: [[f64; 3]; 3],
}

impl LocalFrame {
    /// The frame at `origin`, oriented by the geodetic latitude/longitude `at`.
    #[inline(never)]
    pub fn new(origin: [f64; 3], at: &Geodetic) -> Self {
        let (sl, cl) = sin_cos(at.lat_rad);
        let (so, co) = sin_cos(at.lon_rad);
        LocalFrame {
            origin,
            axes: [
                [-so, co, 0.0],
                [-sl * co, -sl * so, cl],
                [cl * co, cl * so, sl],
            ],
        }
    }

    /// The frame at an ECEF origin.
    pub fn at_ecef(origin: [f64; 3]) -> Self {
        Self::new(origin, &Geodetic::from_ecef(origin))
    }

    /// Rotates an ECEF vector (a difference, not a position) into east/north/up.
    pub fn rotate(&self, v: [f64; 3]) -> [f64; 3] {
        let [e, n, u] = self.axes;
        [dot(e, v), dot(n, v), dot(u, v)]
    }

    /// East/north/up coordinates of an ECEF position relative to the origin.
    pub fn enu(&self, p: [f64; 3]) -> [f64; 3] {
        self.rotate(sub(p, self.origin))
    }

    /// Azimuth (0…2π from north through east) and elevation (−π/2…π/2) of the ECEF
    /// position `target` seen from the origin, radians.
    pub fn az_el(&self, target: [f64; 3]) -> (f64, f64) {
        let [e, n, u] = self.enu(target);
        (
            azimuth_from_atan2(atan2(e, n), 2.0 * core::f64::consts::PI),
            atan2(u, sqrt(e * e + n * n)),
        )
    }
}

/// An azimuth from `atan2(east, north)` (−half turn … half turn) moved into 0 … `full_turn`,
/// in the caller's precision and unit (f64 radians here, f32 degrees for the per-epoch
/// report, so the microcontroller's path stays in single precision).
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is a float in every use (f32, f64): adding a full turn cannot panic"
)]
pub fn azimuth_from_atan2<T>(az: T, full_turn: T) -> T
where
    T: Copy + PartialOrd + Default + core::ops::Add<Output = T>,
{
    if az < T::default() {
        az + full_turn
    } else {
        az
    }
}

/// Dot product of two 3-vectors.
pub(crate) fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

/// Difference `a − b` of two 3-vectors.
pub(crate) fn sub(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}

/// Euclidean norm of a 3-vector.
pub(crate) fn norm(a: [f64; 3]) -> f64 {
    sqrt(dot(a, a))
}

#[cfg(test)]
#[path = "frames_tests.rs"]
mod tests;
