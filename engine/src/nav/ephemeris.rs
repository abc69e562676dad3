//! Broadcast Keplerian ephemeris and the user algorithm that turns it into a satellite's
//! position, velocity and clock at transmit time.
//!
//! One code path serves GPS (IS-GPS-200 Table 20-IV), Galileo (OS SIS ICD §5.1.1) and
//! BeiDou MEO/IGSO (B1I ICD §5.2.4.12), parameterised by [`OrbitConstants`]; BeiDou GEO
//! satellites take the ICD's extra −5° tilt and Earth-rotation step.
//!
//! Cost: 4 sin/cos pairs (M, ω, i, Ω; one more in Kepler's iteration when e > 0.02, two more
//! for BeiDou GEO), 2 sqrt and a few dozen multiplications per evaluation; evaluate each
//! satellite once per epoch.

use crate::sat::{OrbitConstants, SatId, Signal, System};
use crate::time::{wrap_half_week, GnssTime, TimeError};
use crate::trig::sin_cos;
use libm::sqrt;

/// One broadcast ephemeris and clock set, in the symbols of IS-GPS-200.
///
/// Angles are radians and rates rad/s (RINEX navigation files and decoded subframes give
/// them so once semicircles are scaled by π). Times of week are in the satellite system's
/// own scale (GPS, GST or BDT seconds of week); `week` is the full week number of that
/// scale to which `toe_s` belongs.
#[derive(Clone, Copy, Debug, PartialEq, Default)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct BroadcastEphemeris {
    /// The satellite.
    pub sat: SatId,
    /// Full week number of `toe_s` in the system's own time scale.
    pub week: u32,
    /// Reference time of ephemeris, seconds of week (toe).
    pub toe_s: f64,
    /// Reference time of clock, seconds of week (toc).
    pub toc_s: f64,
    /// Clock bias af0, s.
    pub af0: f64,
    /// Clock drift af1, s/s.
    pub af1: f64,
    /// Clock drift rate af2, s/s².
    pub af2: f64,
    /// Square root of the semi-major axis √A, √m.
    pub sqrt_a: f64,
    /// Eccentricity e.
    pub e: f64,
    /// Inclination at reference time i0, rad.
    pub i0: f64,
    /// Rate of inclination IDOT, rad/s.
    pub idot: f64,
    /// Longitude of ascending node at weekly epoch Ω0, rad.
    pub omega0: f64,
    /// Rate of right ascension Ω̇, rad/s.
    pub omega_dot: f64,
    /// Argument of perigee ω, rad.
    pub omega: f64,
    /// Mean anomaly at reference time M0, rad.
    pub m0: f64,
    /// Mean motion difference Δn, rad/s.
    pub delta_n: f64,
    /// Argument of latitude harmonic corrections Cuc, Cus, rad.
    pub cuc: f64,
    /// See `cuc`.
    pub cus: f64,
    /// Orbit radius harmonic corrections Crc, Crs, m.
    pub crc: f64,
    /// See `crc`.
    pub crs: f64,
    /// Inclination harmonic corrections Cic, Cis, rad.
    pub cic: f64,
    /// See `cic`.
    pub cis: f64,
    /// Group delay for the system's first signal, s: GPS TGD (L1/L2), Galileo BGD E1/E5b,
    /// BeiDou TGD1 (B1I).
    pub tgd_s: f64,
    /// Second group delay, s: Galileo BGD E1/E5a, BeiDou TGD2 (B2I); unused for GPS.
    pub tgd2_s: f64,
    /// Issue of data, ephemeris (GPS IODE, Galileo IODnav, BeiDou AODE).
    pub iode: u16,
    /// Issue of data, clock (GPS IODC; set equal to `iode` where a system has none).
    pub iodc: u16,
    /// Health word as broadcast; any non-zero value marks the satellite unusable.
    pub health: u16,
}

/// Position, velocity and clock of a satellite at one transmit time.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
pub struct SatState {
    /// ECEF position at transmit time (frame of that instant), m.
    pub pos: [f64; 3],
    /// ECEF velocity, m/s.
    pub vel: [f64; 3],
    /// Satellite clock offset including the relativistic term, without group delay, s.
    pub clock_s: f64,
    /// Satellite clock drift, s/s.
    pub clock_drift: f64,
    /// The relativistic eccentricity term Δtr alone, s (already inside `clock_s`).
    pub relativity_s: f64,
    /// Eccentric anomaly Ek, rad (useful for checks).
    pub ecc_anomaly: f64,
}

/// Why an ephemeris was refused.
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum EphemerisError {
    /// A field is NaN or infinite.
    NotFinite,
    /// Eccentricity outside 0 ≤ e < 0.3 (navigation orbits are near circular; the most
    /// eccentric in service, Galileo E14 and E18 in their unplanned orbits, have e ≈ 0.17).
    Eccentricity,
    /// √A outside 4,000–7,000 √m (16,000–49,000 km: MEO to GEO).
    SemiMajorAxis,
    /// toe or toc outside a week.
    TimeOfWeek,
    /// GPS: the low 8 bits of IODC differ from IODE (IS-GPS-200 §20.3.4.4).
    IssueMismatch,
    /// PRN zero or above the system's range.
    Prn,
    /// The week number cannot be placed on the time line.
    Week,
    /// The store is full and every held ephemeris is newer; the item is handed back.
    StoreFull(BroadcastEphemeris),
}

impl From<TimeError> for EphemerisError {
    fn from(_: TimeError) -> Self {
        EphemerisError::Week
    }
}

impl BroadcastEphemeris {
    /// Names of the real-valued fields, in the order of [`BroadcastEphemeris::fields`] (the
    /// wire frame's order too).
    pub const FIELD_NAMES: [&'static str; 22] = [
        "toe_s",
        "toc_s",
        "af0",
        "af1",
        "af2",
        "sqrt_a",
        "e",
        "i0",
        "idot",
        "omega0",
        "omega_dot",
        "omega",
        "m0",
        "delta_n",
        "cuc",
        "cus",
        "crc",
        "crs",
        "cic",
        "cis",
        "tgd_s",
        "tgd2_s",
    ];

    /// The real-valued fields, in the order of [`BroadcastEphemeris::FIELD_NAMES`].
    pub fn fields(&self) -> [f64; 22] {
        [
            self.toe_s,
            self.toc_s,
            self.af0,
            self.af1,
            self.af2,
            self.sqrt_a,
            self.e,
            self.i0,
            self.idot,
            self.omega0,
            self.omega_dot,
            self.omega,
            self.m0,
            self.delta_n,
            self.cuc,
            self.cus,
            self.crc,
            self.crs,
            self.cic,
            self.cis,
            self.tgd_s,
            self.tgd2_s,
        ]
    }

    /// This record with its real-valued fields replaced by `v`, in the order of
    /// [`BroadcastEphemeris::FIELD_NAMES`].
    #[must_use]
    pub fn with_fields(self, v: [f64; 22]) -> Self {
        let [toe_s, toc_s, af0, af1, af2, sqrt_a, e, i0, idot, omega0, omega_dot, omega, m0, delta_n, cuc, cus, crc, crs, cic, cis, tgd_s, tgd2_s] =
            v;
        BroadcastEphemeris {
            toe_s,
            toc_s,
            af0,
            af1,
            af2,
            sqrt_a,
            e,
            i0,
            idot,
            omega0,
            omega_dot,
            omega,
            m0,
            delta_n,
            cuc,
            cus,
            crc,
            crs,
            cic,
            cis,
            tgd_s,
            tgd2_s,
            ..self
        }
    }

    /// Checks every field a malformed or corrupted message could break.
    ///
    /// # Errors
    /// The first problem found, as an [`EphemerisError`].
    pub fn validate(&self) -> Result<(), EphemerisError> {
        let fields = self.fields();
        if fields.iter().any(|v| !v.is_finite()) {
            return Err(EphemerisError::NotFinite);
        }
        if !(0.0..0.3).contains(&self.e) {
            return Err(EphemerisError::Eccentricity);
        }
        if !(4_000.0..7_000.0).contains(&self.sqrt_a) {
            return Err(EphemerisError::SemiMajorAxis);
        }
        let week_span = 0.0..604_800.0;
        if !week_span.contains(&self.toe_s) || !week_span.contains(&self.toc_s) {
            return Err(EphemerisError::TimeOfWeek);
        }
        let max_prn = match self.sat.system {
            System::Gps => 32,
            System::Galileo => 36,
            System::Beidou => 63,
        };
        if self.sat.prn == 0 || self.sat.prn > max_prn {
            return Err(EphemerisError::Prn);
        }
        if self.sat.system == System::Gps && (self.iodc & 0xff) != (self.iode & 0xff) {
            return Err(EphemerisError::IssueMismatch);
        }
        self.toe()?;
        Ok(())
    }

    /// toe as an absolute GPS-scale time.
    ///
    /// # Errors
    /// [`EphemerisError::Week`] when the week cannot be represented.
    pub fn toe(&self) -> Result<GnssTime, EphemerisError> {
        Ok(system_time(self.sat.system, self.week, self.toe_s)?)
    }

    /// toc as an absolute GPS-scale time, taken in the week closest to toe.
    ///
    /// # Errors
    /// [`EphemerisError::Week`] when the week cannot be represented.
    pub fn toc(&self) -> Result<GnssTime, EphemerisError> {
        let toe = self.toe()?;
        let toc_same_week = system_time(self.sat.system, self.week, self.toc_s)?;
        let shift =
            wrap_half_week(toc_same_week.seconds_since(toe)) - toc_same_week.seconds_since(toe);
        Ok(toc_same_week.add_seconds(shift))
    }

    /// The group delay to remove from the satellite clock for `signal`, s (positive delays
    /// make the satellite look late). GPS: TGD scaled by (f_L1/f)² (IS-GPS-200
    /// §20.3.3.3.3.2); Galileo: BGD(E1,E5b) for E1/E5b, BGD(E1,E5a) for E5a (OS SIS ICD
    /// §5.1.5); BeiDou: TGD1 for B1I, TGD2 for B2I, zero for B3I (B1I ICD §5.2.4.10).
    pub fn group_delay_s(&self, signal: Signal) -> f64 {
        match signal {
            Signal::GpsL1Ca | Signal::GpsL1P | Signal::GpsL2 => {
                self.tgd_s * signal.iono_scale_from_l1()
            }
            Signal::GalE1 => self.tgd_s,
            Signal::GalE5b => self.tgd_s * Signal::GalE5b.iono_scale_from_l1(),
            Signal::GalE5a => self.tgd2_s * Signal::GalE5a.iono_scale_from_l1(),
            Signal::BdsB1I => self.tgd_s,
            Signal::BdsB2I => self.tgd2_s,
            // L5 needs the CNAV inter-signal corrections, E6 and B3I are the clock
            // reference signals or carry none: no broadcast group delay applies.
            Signal::GpsL5 | Signal::GalE6 | Signal::BdsB3I => 0.0,
        }
    }

    /// Satellite clock polynomial at `t`, without relativity or group delay, s.
    pub fn clock_polynomial_s(&self, dt_toc_s: f64) -> f64 {
        let dt = wrap_half_week(dt_toc_s);
        self.af0 + self.af1 * dt + self.af2 * dt * dt
    }

    /// Evaluates the orbit and clock at `tk_s` seconds from toe (crossover-wrapped here),
    /// with `dt_toc_s` seconds from toc for the clock.
    ///
    /// Trigonometry is kept to four sine/cosine pairs (M, ω, i, Ω): ν and 2Φ come from
    /// identities, the small harmonic corrections from their series, and Kepler's iteration
    /// updates sin E and cos E incrementally.
    pub fn evaluate(&self, tk_s: f64, dt_toc_s: f64) -> SatState {
        let c: &OrbitConstants = self.sat.system.constants();
        let tk = wrap_half_week(tk_s);
        let a = self.sqrt_a * self.sqrt_a;
        let n0 = sqrt(c.mu / (a * a * a));
        let n = n0 + self.delta_n;
        let mk = self.m0 + n * tk;
        let (ek, se, ce) = solve_kepler(mk, self.e);
        let one_minus_ecos = 1.0 - self.e * ce;
        let sq1me2 = sqrt(1.0 - self.e * self.e);
        // True anomaly ν through its sine and cosine (IS-GPS-200 Table 20-IV).
        let (snu, cnu) = (sq1me2 * se / one_minus_ecos, (ce - self.e) / one_minus_ecos);
        let (sw, cw) = sin_cos(self.omega);
        // Φ = ν + ω, and 2Φ by the double-angle identities.
        let (sp, cp) = (snu * cw + cnu * sw, cnu * cw - snu * sw);
        let (s2, c2) = (2.0 * sp * cp, cp * cp - sp * sp);
        let du = self.cus * s2 + self.cuc * c2;
        let dr = self.crs * s2 + self.crc * c2;
        let di = self.cis * s2 + self.cic * c2;
        // u = Φ + δu with |δu| < 1e-4 rad: the series below are exact to 1e-20.
        let (sdu, cdu) = small_sin_cos(du);
        let (su, cu) = (sp * cdu + cp * sdu, cp * cdu - sp * sdu);
        let r = a * one_minus_ecos + dr;
        let i = self.i0 + di + self.idot * tk;
        let (si, ci) = sin_cos(i);
        let xp = r * cu;
        let yp = r * su;

        // Rates (derivatives of the Table 20-IV expressions).
        let ek_dot = n / one_minus_ecos;
        let nu_dot = ek_dot * sq1me2 / one_minus_ecos;
        let u_dot = nu_dot * (1.0 + 2.0 * (self.cus * c2 - self.cuc * s2));
        let r_dot = a * self.e * se * ek_dot + 2.0 * nu_dot * (self.crs * c2 - self.crc * s2);
        let i_dot = self.idot + 2.0 * nu_dot * (self.cis * c2 - self.cic * s2);
        let xp_dot = r_dot * cu - r * u_dot * su;
        let yp_dot = r_dot * su + r * u_dot * cu;

        let geo = self.sat.is_beidou_geo();
        let (omega_k, omega_k_dot) = if geo {
            // B1I ICD: the GEO node is kept in inertial space, rotated afterwards.
            (
                self.omega0 + self.omega_dot * tk - c.omega_e * self.toe_s,
                self.omega_dot,
            )
        } else {
            (
                self.omega0 + (self.omega_dot - c.omega_e) * tk - c.omega_e * self.toe_s,
                self.omega_dot - c.omega_e,
            )
        };
        let (so, co) = sin_cos(omega_k);
        let pos = [xp * co - yp * ci * so, xp * so + yp * ci * co, yp * si];
        let vel = [
            xp_dot * co - yp_dot * ci * so + yp * si * so * i_dot - pos[1] * omega_k_dot,
            xp_dot * so + yp_dot * ci * co - yp * si * i_dot * co + pos[0] * omega_k_dot,
            yp_dot * si + yp * ci * i_dot,
        ];
        let (pos, vel) = if geo {
            beidou_geo_rotation(pos, vel, c.omega_e, tk)
        } else {
            (pos, vel)
        };

        let relativity_s = c.f_rel * self.e * self.sqrt_a * se;
        let dt = wrap_half_week(dt_toc_s);
        SatState {
            pos,
            vel,
            clock_s: self.clock_polynomial_s(dt_toc_s) + relativity_s,
            clock_drift: self.af1 + 2.0 * self.af2 * dt,
            relativity_s,
            ecc_anomaly: ek,
        }
    }
}

/// sin and cos of a small angle by their series: exact to the last bit of an f64 for
/// |x| < 0.02 (the first omitted term is below x⁸/8! ≈ 6e-18).
fn small_sin_cos(x: f64) -> (f64, f64) {
    let x2 = x * x;
    let s = x * (1.0 - x2 / 6.0 * (1.0 - x2 / 20.0 * (1.0 - x2 / 42.0)));
    let c = 1.0 - x2 / 2.0 * (1.0 - x2 / 12.0 * (1.0 - x2 / 30.0));
    (s, c)
}

/// The absolute time of a week and time of week in `system`'s own scale.
fn system_time(system: System, week: u32, tow_s: f64) -> Result<GnssTime, TimeError> {
    match system {
        System::Gps => GnssTime::from_week_tow(week, tow_s),
        // RINEX and the Galileo message give the Galileo week continuous with GPS weeks
        // (the RINEX convention); a raw GST week is below 1024 + ~1000 so is converted.
        System::Galileo if week < 1024 => GnssTime::from_gst(week, tow_s),
        System::Galileo => GnssTime::from_week_tow(week, tow_s),
        System::Beidou => GnssTime::from_bdt(week, tow_s),
    }
}

/// Solves Kepler's equation M = E − e·sin E by Newton's method from E = M, returning E,
/// sin E and cos E (quadratic convergence: 3–4 steps to 1e-14 rad for GPS-like e ≈ 0.01,
/// ≤ 7 for e < 0.3). sin E and cos E are carried along by the angle-addition formulas, with
/// the series of [`small_sin_cos`] for small steps, so a GPS orbit needs only sin M and cos M.
fn solve_kepler(m: f64, e: f64) -> (f64, f64, f64) {
    let (sm, cm) = sin_cos(m);
    let (mut ek, mut se, mut ce) = (m, sm, cm);
    for _ in 0..10 {
        let d = (m - ek + e * se) / (1.0 - e * ce);
        ek += d;
        let (sd, cd) = if d.abs() < 0.02 {
            small_sin_cos(d)
        } else {
            sin_cos(d)
        };
        (se, ce) = (se * cd + ce * sd, ce * cd - se * sd);
        if d.abs() < 1e-14 {
            break;
        }
    }
    (ek, se, ce)
}

/// B1I ICD §5.2.4.12: GEO position = Rz(Ω̇e·tk)·Rx(−5°)·(XG, YG, ZG).
fn beidou_geo_rotation(p: [f64; 3], v: [f64; 3], omega_e: f64, tk: f64) -> ([f64; 3], [f64; 3]) {
    // sin(−5°), cos(−5°).
    let (sx, cx) = (-0.087_155_742_747_658_17, 0.996_194_698_091_745_5);
    let rx = |a: [f64; 3]| [a[0], cx * a[1] + sx * a[2], -sx * a[1] + cx * a[2]];
    let (sz, cz) = sin_cos(omega_e * tk);
    let rz = |a: [f64; 3]| [cz * a[0] + sz * a[1], -sz * a[0] + cz * a[1], a[2]];
    let pg = rx(p);
    let vg = rx(v);
    let pos = rz(pg);
    // d/dt Rz(ωt)·q = Rz·q̇ + ω·dRz/dθ·q, dRz/dθ·q = (−sz·q0 + cz·q1, −cz·q0 − sz·q1, 0).
    let rv = rz(vg);
    let vel = [
        rv[0] + omega_e * (-sz * pg[0] + cz * pg[1]),
        rv[1] + omega_e * (-cz * pg[0] - sz * pg[1]),
        rv[2],
    ];
    (pos, vel)
}

#[cfg(test)]
#[path = "ephemeris_tests.rs"]
mod tests;
