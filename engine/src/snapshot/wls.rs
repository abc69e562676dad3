//! Snapshot solution: iterative weighted least squares for position and one receiver clock
//! per system, with DOP, covariance and post-fit residuals.
//!
//! Unknowns: ECEF x, y, z and a clock bias for each of GPS, Galileo and BeiDou. A system
//! with no satellite in the epoch has its clock pinned (a unit diagonal in the normal
//! matrix), so the 6×6 solve is the same size every epoch and never singular on its account.
//!
//! Corrections that need the receiver's position (elevation mask, ionosphere, troposphere,
//! elevation weights) switch on once the iteration is within 1 km of a point near the Earth
//! and are then computed once (again only if the solution moves by more than 1 km); before
//! that every satellite has unit weight. Satellite positions are not re-evaluated per
//! iteration: only the Earth-rotation (Sagnac) rotation over the travel time is.
//!
//! Cost per iteration and satellite: 1 sqrt for the range and a rank-one update of the 6×6
//! normal matrix; once per epoch and satellite 2 atan2, 3 cos, 1 sin and 2 sqrt for
//! azimuth/elevation, Klobuchar and the troposphere mapping; per iteration one 6×6
//! Cholesky; once per epoch one geodetic conversion and the standard atmosphere.

use crate::config::Config;
use crate::corrections::iono::IonoCoefficients;
use crate::corrections::site::Site;
use crate::frames::{dot, norm, sub, Geodetic, LocalFrame};
use crate::linalg::{add, Cholesky6, Mat, Mat6, Scalar};
use crate::measurements::record::{Fate, Measurement};
use crate::sat::SPEED_OF_LIGHT;
use crate::solution::{Dop, Fix, FixKind, FixSource, IonoCorrection, NoFixReason};
use libm::sqrt;

/// The shortest range to a navigation satellite from the ground, m (MEO at zenith).
const MIN_RANGE_M: f64 = 1.9e7;

/// Inputs of one solution besides the candidates.
pub(crate) struct Setup<'a> {
    pub config: &'a Config,
    pub iono: Option<&'a IonoCoefficients>,
    /// GPS time of week of the epoch, s (for the Klobuchar local time).
    pub tow_s: f64,
    /// Starting position (last fix, or the Earth's centre).
    pub seed: [f64; 3],
    /// Height to hold for a 2-D fix, when one is recent enough.
    pub hold_height_m: Option<f64>,
}

/// Iterates the weighted least squares over the measurement records, writing into each its
/// corrections, whether it was used and its post-fit residual.
// Not inlined: its frame (the normal matrices) is off the stack while the velocity is
// solved and while the filter runs.
#[inline(never)]
pub(crate) fn solve(meas: &mut [Measurement], setup: &Setup<'_>) -> Result<Fix, NoFixReason> {
    let cfg = setup.config;
    let mut pos = setup.seed;
    let mut clk = [0.0f64; 3];
    let mut corrections_on = norm(pos) > 6.0e6;
    let mut iterations = 0u8;
    let mut corr_at: Option<[f64; 3]> = None;
    let mut site: Option<Site<'_>> = None;
    loop {
        iterations = iterations.saturating_add(1);
        // Elevation, mask, atmosphere and weights change by far less than the noise over a
        // kilometre: compute them once near the Earth, again only if the solution moves
        // more than 1 km from where they were computed.
        let refresh = corrections_on && corr_at.is_none_or(|p| norm(sub(pos, p)) > 1_000.0);
        if refresh {
            site = Some(Site::new(cfg, setup.iono, setup.tow_s, pos));
            corr_at = Some(pos);
        }
        let mut normal: Mat6 = [[0.0; 6]; 6];
        let mut geometry: Mat6 = [[0.0; 6]; 6];
        let mut rhs = [0.0f64; 6];
        let mut present = [false; 3];
        let mut used = 0u8;
        for m in meas.iter_mut() {
            let (c, o) = (&m.sat, &mut m.out);
            if o.used() {
                o.fate = Fate::Pending;
            }
            let Some((u, rho)) = c.line_of_sight(pos) else {
                continue;
            };
            if let (true, Some(site)) = (refresh, &site) {
                let k = site.apply(c.sat_input(), u);
                o.correct(&k);
            } else if !corrections_on {
                o.delay_m = 0.0;
                o.sigma_m = 1.0;
            }
            if o.masked() || o.excluded() {
                continue;
            }
            let clock = clk.get(c.sys).copied().unwrap_or(0.0);
            let v = c.pr_m - (rho + clock - c.clock_m + o.delay_m);
            let w = 1.0 / (o.sigma_m * o.sigma_m);
            let row = [-u[0], -u[1], -u[2]];
            add_range_row(&mut normal, row, c.sys, w);
            add_range_row(&mut geometry, row, c.sys, 1.0);
            for (x, a) in rhs.iter_mut().zip(row) {
                *x += a * v * w;
            }
            if let Some(x) = rhs.get_mut(c.sys.saturating_add(3)) {
                *x += v * w;
            }
            if let Some(p) = present.get_mut(c.sys) {
                *p = true;
            }
            used = used.saturating_add(1);
            o.fate = Fate::Used;
            o.residual_m = v;
            o.row = row;
        }
        let systems = present.iter().filter(|p| **p).count() as u8;
        let unknowns = 3u8.saturating_add(systems);
        let hold = if corrections_on {
            setup.hold_height_m
        } else {
            None
        };
        let mut kind = FixKind::ThreeD;
        if used < unknowns {
            match hold {
                Some(h_hold) if used.saturating_add(1) >= unknowns && used >= 3 => {
                    // The held height needs the exact height at this iteration's position.
                    let here = Geodetic::from_ecef(pos);
                    let up = LocalFrame::new(pos, &here).axes[2];
                    let w = 1.0
                        / (cfg.snapshot.altitude_hold_sigma_m * cfg.snapshot.altitude_hold_sigma_m);
                    let v = h_hold - here.height_m;
                    for (i, a) in up.iter().enumerate() {
                        for (j, b) in up.iter().enumerate() {
                            add(&mut normal, i, j, a * b * w);
                            add(&mut geometry, i, j, a * b);
                        }
                        if let Some(x) = rhs.get_mut(i) {
                            *x += a * v * w;
                        }
                    }
                    kind = FixKind::TwoD;
                }
                _ => {
                    return Err(NoFixReason::TooFewSatellites {
                        usable: used,
                        needed: unknowns,
                    });
                }
            }
        }
        pin_absent_clocks(&mut normal, &present);
        pin_absent_clocks(&mut geometry, &present);
        let chol = Cholesky6::factor(normal).ok_or(NoFixReason::SingularGeometry)?;
        let d = chol.solve(&rhs);
        if d.iter().any(|v| !v.is_finite()) {
            return Err(NoFixReason::SingularGeometry);
        }
        pos = [pos[0] + d[0], pos[1] + d[1], pos[2] + d[2]];
        clk = [clk[0] + d[3], clk[1] + d[4], clk[2] + d[5]];
        let step = norm([d[0], d[1], d[2]]);
        // After a Gauss–Newton step of length s the range linearisation leaves an error of
        // about s²/(2ρ) with ρ ≥ 19,000 km: converged when that is below the tolerance.
        if corrections_on && step * step / (2.0 * MIN_RANGE_M) < cfg.snapshot.convergence_m {
            let dpos = [d[0], d[1], d[2]];
            let normal_inv = chol.inverse();
            return finish(
                &FinishInput {
                    pos,
                    clk,
                    present,
                    kind,
                    used,
                    iterations,
                    iono_used: site.as_ref().is_some_and(Site::iono_applied),
                    normal_inv: &normal_inv,
                    geometry: &geometry,
                    dpos,
                    dclk: [d[3], d[4], d[5]],
                    cfg,
                },
                meas,
            );
        }
        if !corrections_on && step < 1_000.0 && norm(pos) > 5.0e6 {
            corrections_on = true;
        }
        if iterations >= cfg.snapshot.max_iterations {
            return Err(NoFixReason::NoConvergence);
        }
    }
}

struct FinishInput<'a> {
    pos: [f64; 3],
    clk: [f64; 3],
    present: [bool; 3],
    kind: FixKind,
    used: u8,
    iterations: u8,
    iono_used: bool,
    normal_inv: &'a Mat6,
    geometry: &'a Mat6,
    dpos: [f64; 3],
    dclk: [f64; 3],
    cfg: &'a Config,
}

fn finish(f: &FinishInput<'_>, meas: &mut [Measurement]) -> Result<Fix, NoFixReason> {
    let geodetic = Geodetic::from_ecef(f.pos);
    if !(f.cfg.snapshot.height_span_m.0..=f.cfg.snapshot.height_span_m.1)
        .contains(&geodetic.height_m)
    {
        return Err(NoFixReason::ImplausiblePosition);
    }
    let frame = LocalFrame::new(f.pos, &geodetic);
    let mut sse = 0.0;
    for m in meas.iter_mut() {
        let (c, o) = (&m.sat, &mut m.out);
        if o.used() {
            // Post-fit residual: the last update moved the state by (dpos, dclk).
            let dclk = f.dclk.get(c.sys).copied().unwrap_or(0.0);
            o.residual_m -= dot(o.row, f.dpos) + dclk;
            let z = o.residual_m / o.sigma_m;
            sse += z * z;
        }
    }
    let cov = enu_block(&frame, f.normal_inv);
    let dop = dop(f.geometry, &f.present, &frame).ok_or(NoFixReason::SingularGeometry)?;
    let first = f.present.iter().position(|p| *p).unwrap_or(0);
    let mut system_clock_m = [None; 3];
    for ((s, p), c) in system_clock_m.iter_mut().zip(f.present).zip(f.clk) {
        if p {
            *s = Some(c);
        }
    }
    Ok(Fix {
        kind: f.kind,
        ecef_m: f.pos,
        geodetic,
        clock_bias_m: f.clk.get(first).copied().unwrap_or(0.0),
        system_clock_m,
        covariance_enu_m2: cov,
        dop,
        used: f.used,
        iterations: f.iterations,
        iono: if f.iono_used {
            IonoCorrection::Klobuchar
        } else {
            IonoCorrection::None
        },
        weighted_sse: sse,
        velocity: None,
        source: FixSource::Snapshot,
    })
}

/// Adds `w·g gᵀ` for a pseudorange row `g = [row, 1 on the clock of system sys]` to the
/// lower triangle and diagonal of a 6×6 normal matrix: the four non-zeros of the row, and
/// only what the Cholesky factor reads (the least squares, the filter's DOP and the
/// residual-test slopes all build their matrices so).
#[expect(
    clippy::arithmetic_side_effects,
    reason = "T is f32 or f64 (Scalar's only implementations): float arithmetic cannot panic"
)]
pub(crate) fn add_range_row<T: Scalar>(m: &mut [[T; 6]; 6], row: [T; 3], sys: usize, w: T) {
    // Nine multiplications: the clock coefficient is 1.
    let [x, y, z] = row;
    let (xw, yw, zw) = (x * w, y * w, z * w);
    add(m, 0, 0, xw * x);
    add(m, 1, 0, yw * x);
    add(m, 1, 1, yw * y);
    add(m, 2, 0, zw * x);
    add(m, 2, 1, zw * y);
    add(m, 2, 2, zw * z);
    let c = sys.saturating_add(3);
    add(m, c, 0, xw);
    add(m, c, 1, yw);
    add(m, c, 2, zw);
    add(m, c, c, w);
}

/// A unit diagonal for the clock of each system without a satellite, so that the 6×6
/// matrix stays regular whatever the systems present.
pub(crate) fn pin_absent_clocks<T: Scalar>(m: &mut [[T; 6]; 6], present: &[bool; 3]) {
    for (k, p) in present.iter().enumerate() {
        if !p {
            add(m, k.saturating_add(3), k.saturating_add(3), T::ONE);
        }
    }
}

/// The dilution of precision of an unweighted geometry matrix `GᵀG` (position and the three
/// system clocks, absent systems pinned), in the local frame; TDOP is that of the first
/// system present. `None` when the matrix is singular.
pub(crate) fn dop(geometry: &Mat6, present: &[bool; 3], frame: &LocalFrame) -> Option<Dop> {
    let ginv = Cholesky6::new(geometry)?.inverse();
    let q = enu_block(frame, &ginv);
    let first = present.iter().position(|p| *p).unwrap_or(0);
    let tdop2 = ginv
        .get(first.saturating_add(3))
        .and_then(|r| r.get(first.saturating_add(3)))
        .copied()
        .unwrap_or(0.0);
    let [[qe, _, _], [_, qn, _], [_, _, qu]] = q;
    let hdop2 = qe + qn;
    let pdop2 = hdop2 + qu;
    Some(Dop {
        gdop: sqrt(pdop2 + tdop2),
        pdop: sqrt(pdop2),
        hdop: sqrt(hdop2),
        vdop: sqrt(qu),
        tdop: sqrt(tdop2),
    })
}

/// The leading 3×3 block (position or velocity) of an ECEF covariance rotated to
/// east/north/up: R·Q·Rᵀ.
pub(crate) fn enu_block<const D: usize>(frame: &LocalFrame, qd: &Mat<D>) -> [[f64; 3]; 3] {
    let q = |i: usize, j: usize| qd.get(i).and_then(|r| r.get(j)).copied().unwrap_or(0.0);
    let mut out = [[0.0; 3]; 3];
    for (a, ra) in out.iter_mut().zip(frame.axes) {
        for (v, rb) in a.iter_mut().zip(frame.axes) {
            let mut s = 0.0;
            for (i, x) in ra.iter().enumerate() {
                for (j, y) in rb.iter().enumerate() {
                    s += x * q(i, j) * y;
                }
            }
            *v = s;
        }
    }
    out
}

/// Rotates a satellite position about the z axis by the Earth's rotation during the
/// signal's flight, so it is expressed in the ECEF frame of reception (the Sagnac
/// correction). The angle is ≤ 7e-6 rad, so sin θ = θ and cos θ = 1 − θ²/2 are exact to
/// far below a millimetre and save two trigonometric calls per satellite.
pub(crate) fn sagnac(sat: [f64; 3], rx: [f64; 3], omega_e: f64) -> [f64; 3] {
    let theta = omega_e * norm(sub(sat, rx)) / SPEED_OF_LIGHT;
    let c = 1.0 - 0.5 * theta * theta;
    [
        c * sat[0] + theta * sat[1],
        c * sat[1] - theta * sat[0],
        sat[2],
    ]
}
