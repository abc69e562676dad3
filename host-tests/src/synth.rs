//! Synthetic measurements: GPS-, Galileo- and BeiDou-like constellations of our own
//! elements, a static receiver, and pseudoranges built from the physics the engine models
//! (orbit, satellite clock with relativity and group delay, Sagnac, receiver clock) as
//! computed by the independent truth models of [`crate::truth`], plus Gaussian code noise of
//! known σ. Deterministic from a seed.

use crate::truth::{self, atmosphere, clock, Mutation};
use rand::{Rng, SeedableRng};
use rand_distr::{Distribution, Normal};
use trackfix_engine::{
    BroadcastEphemeris, Epoch, Geodetic, GnssTime, IonoCoefficients, LocalFrame, Observation,
    SatId, Signal, System, SPEED_OF_LIGHT,
};

/// Errors added to the true pseudoranges.
#[derive(Clone, Copy, Debug, Default)]
pub struct ErrorModel {
    /// Code noise σ at zenith, m; grows as 1/sin(elevation) (common practice).
    pub sigma_m: f64,
    /// σ independent of elevation, m (for checks that need a known, constant σ).
    pub constant_sigma: bool,
    /// True ionosphere: the broadcast model's delay times this factor (1.0 = the model is
    /// exact; real residual errors after Klobuchar are often quoted as 30–50 %, common
    /// practice).
    pub iono: Option<(IonoCoefficients, f64)>,
    /// Add a standard-atmosphere troposphere.
    pub troposphere: bool,
}

/// A constellation's broadcast ephemerides, valid around `toe`.
#[derive(Clone, Debug)]
pub struct Constellation {
    /// One record per satellite.
    pub ephemerides: Vec<BroadcastEphemeris>,
    /// Common reference time.
    pub toe: GnssTime,
}

/// Walker-like shells: GPS 6 planes × 5 slots at 55°, 26,560 km; Galileo 3 × 8 at 56°,
/// 29,600 km; BeiDou MEO 3 × 8 at 55°, 27,910 km (PRN 19–42), BeiDou IGSO 3 at 55°,
/// 42,164 km, centred on 118° E (PRN 6–8) and BeiDou GEO at 58.75°, 80°, 110.5°, 140° and
/// 160° E (PRN 1–5): the published nominal shapes of the constellations (common practice).
/// Eccentricities, clock offsets and group delays are drawn from the seed.
pub fn constellation(seed: u64, toe: GnssTime, systems: &[System]) -> Constellation {
    let mut rng = rand::rngs::StdRng::seed_from_u64(seed);
    let mut ephemerides = Vec::new();
    let week_toe = |system: System| week_tow_in(system, toe);
    let mut push = |sat: SatId,
                    a_m: f64,
                    inc: f64,
                    omega0: f64,
                    arg_lat: f64,
                    rng: &mut rand::rngs::StdRng,
                    e_max: f64| {
        let (week, toe_s) = week_toe(sat.system);
        let omega = rng.random_range(0.0..std::f64::consts::TAU);
        ephemerides.push(BroadcastEphemeris {
            sat,
            week,
            toe_s,
            toc_s: toe_s,
            af0: rng.random_range(-3e-4..3e-4),
            af1: rng.random_range(-5e-12..5e-12),
            sqrt_a: a_m.sqrt(),
            e: if e_max > 0.0 {
                rng.random_range(0.0..e_max)
            } else {
                0.0
            },
            i0: inc,
            omega0,
            omega_dot: if a_m > 40.0e6 { 0.0 } else { -8.0e-9 },
            omega,
            // Keep the argument of latitude at the slot's phase whatever ω is.
            m0: arg_lat - omega,
            tgd_s: rng.random_range(-1e-8..1e-8),
            iode: 1,
            iodc: 1,
            ..Default::default()
        });
    };
    let tau = std::f64::consts::TAU;
    let mut walker = |system: System,
                      planes: u8,
                      slots: u8,
                      a_m: f64,
                      inc_deg: f64,
                      first_prn: u8,
                      rng: &mut rand::rngs::StdRng| {
        for p in 0..planes {
            for s in 0..slots {
                let phase = (f64::from(s) / f64::from(slots)
                    + f64::from(p) / f64::from(planes * slots))
                    * tau;
                let inc = inc_deg.to_radians() + rng.random_range(-0.01..0.01);
                let node = f64::from(p) / f64::from(planes) * tau;
                push(
                    SatId {
                        system,
                        prn: p * slots + s + first_prn,
                    },
                    a_m,
                    inc,
                    node,
                    phase,
                    rng,
                    0.015,
                );
            }
        }
    };
    for system in systems {
        match system {
            System::Gps => walker(System::Gps, 6, 5, 26_559_700.0, 55.0, 1, &mut rng),
            System::Galileo => walker(System::Galileo, 3, 8, 29_600_000.0, 56.0, 1, &mut rng),
            System::Beidou => walker(System::Beidou, 3, 8, 27_906_100.0, 55.0, 19, &mut rng),
        }
    }
    if systems.contains(&System::Beidou) {
        let (_, toe_bdt) = week_toe(System::Beidou);
        let we = System::Beidou.constants().omega_e;
        let a_geo = (System::Beidou.constants().mu / (we * we)).cbrt();
        // IGSO: three planes 120° apart, ascending nodes over 118° E at toe.
        for k in 0..3u8 {
            let node = 118f64.to_radians() + we * toe_bdt + f64::from(k) * tau / 3.0;
            let arg = -f64::from(k) * tau / 3.0;
            push(
                SatId::beidou(6 + k),
                a_geo,
                55f64.to_radians(),
                node,
                arg,
                &mut rng,
                0.003,
            );
        }
        // GEO: with the ICD's −5° tilt, i = 5° and a node at 180° give an equatorial orbit;
        // the argument of latitude λ − 180° puts the satellite over longitude λ at toe.
        for (k, lon) in [58.75f64, 80.0, 110.5, 140.0, 160.0]
            .into_iter()
            .enumerate()
        {
            let node = std::f64::consts::PI + we * toe_bdt;
            let arg = lon.to_radians() - std::f64::consts::PI;
            push(
                SatId::beidou(1 + k as u8),
                a_geo,
                5f64.to_radians(),
                node,
                arg,
                &mut rng,
                0.0,
            );
        }
    }
    Constellation { ephemerides, toe }
}

/// Week and seconds of week of `t` in `system`'s own time scale (BDT for BeiDou; GPS-aligned
/// weeks for Galileo, as RINEX writes them).
fn week_tow_in(system: System, t: GnssTime) -> (u32, f64) {
    match system {
        System::Beidou => {
            let (w, s) = t.bdt_week_tow();
            (u32::try_from(w).unwrap_or(0), s)
        }
        _ => (u32::try_from(t.week()).unwrap_or(0), t.tow_s()),
    }
}

/// The same satellites' broadcast set re-referenced to a later (or earlier) `toe`: a new
/// upload describing the same orbit, as the control segment sends every two hours.
pub fn rereference(eph: &BroadcastEphemeris, toe: GnssTime) -> BroadcastEphemeris {
    let old = eph.toe().unwrap_or(toe);
    let dt = toe.seconds_since(old);
    let c = eph.sat.system.constants();
    let a = eph.sqrt_a * eph.sqrt_a;
    let n = (c.mu / (a * a * a)).sqrt() + eph.delta_n;
    let (week, toe_s) = week_tow_in(eph.sat.system, toe);
    let weeks = f64::from(week) - f64::from(eph.week);
    // Keep Ωk(t) unchanged. MEO/IGSO: Ωk = Ω0 + Ω̇·tk − Ω̇e·(t − start of toe's week).
    // GEO: the ICD's frame is the Earth-fixed frame at toe, tilted; a stationary satellite
    // keeps its argument of latitude and its node moves with toe's seconds of week.
    let (omega0, m0) = if eph.sat.is_beidou_geo() {
        (eph.omega0 + c.omega_e * (toe_s - eph.toe_s), eph.m0)
    } else {
        (
            eph.omega0 + eph.omega_dot * dt - c.omega_e * 604_800.0 * weeks,
            eph.m0 + n * dt,
        )
    };
    let iode = (eph.iode + 1) % 256;
    BroadcastEphemeris {
        week,
        toe_s,
        toc_s: toe_s,
        af0: eph.af0 + eph.af1 * dt,
        m0,
        omega0,
        i0: eph.i0 + eph.idot * dt,
        iode,
        iodc: iode,
        ..*eph
    }
}

/// A static receiver observing a constellation.
#[derive(Clone, Debug)]
pub struct StaticReceiver {
    /// True antenna position, ECEF m.
    pub position: [f64; 3],
    /// Elevation below which a satellite is not reported, degrees.
    pub horizon_deg: f64,
    /// Receiver clock bias, m (its time tags run this far ahead of true time).
    pub clock_bias_m: f64,
    /// Galileo minus GPS receiver clock, m.
    pub inter_system_bias_m: f64,
}

/// The true pseudorange (no atmosphere, no noise) and the satellite's Sagnac-rotated
/// position for reception at true time `t_true`, from the independent truth models of
/// [`crate::truth`] (never the engine's own orbit, clock or group-delay functions).
pub fn true_pseudorange(
    eph: &BroadcastEphemeris,
    t_true: GnssTime,
    rx: [f64; 3],
    rx_clock_m: f64,
) -> (f64, [f64; 3]) {
    let signal = primary_signal(eph.sat.system);
    let r = truth::pseudorange(eph, signal, t_true, rx, rx_clock_m, &Mutation::default());
    (r.pseudorange_m, r.sat_ecef_m)
}

/// The signal synthetic observations carry for a system.
pub fn primary_signal(system: System) -> Signal {
    match system {
        System::Gps => Signal::GpsL1Ca,
        System::Galileo => Signal::GalE1,
        System::Beidou => Signal::BdsB1I,
    }
}

/// Satellites above the horizon at true time `t_true`, with Gaussian pseudorange noise of
/// constant σ `sigma_m` and no atmosphere (see [`observe_with`]).
pub fn observe<const N: usize>(
    rx: &StaticReceiver,
    constellation: &Constellation,
    t_true: GnssTime,
    sigma_m: f64,
    rng: &mut impl Rng,
) -> Epoch<N> {
    let errors = ErrorModel {
        sigma_m,
        constant_sigma: true,
        ..ErrorModel::default()
    };
    observe_with(rx, constellation, t_true, &errors, rng)
}

/// Satellites above the horizon at true time `t_true`, with the errors of `errors`. The
/// epoch is tagged by the receiver clock (true time + bias/c), as a real receiver tags it.
pub fn observe_with<const N: usize>(
    rx: &StaticReceiver,
    constellation: &Constellation,
    t_true: GnssTime,
    errors: &ErrorModel,
    rng: &mut impl Rng,
) -> Epoch<N> {
    let tag = t_true.add_seconds(rx.clock_bias_m / SPEED_OF_LIGHT);
    // Use the exact (nanosecond-rounded) tag so the pseudoranges match it.
    let bias = tag.seconds_since(t_true) * SPEED_OF_LIGHT;
    let frame = LocalFrame::at_ecef(rx.position);
    let geo = Geodetic::from_ecef(rx.position);
    let unit = Normal::new(0.0, 1.0).ok();
    let mut epoch = Epoch::new(tag);
    for eph in &constellation.ephemerides {
        let clock = if eph.sat.system == System::Gps {
            bias
        } else {
            bias + rx.inter_system_bias_m
        };
        let (mut pr, sat) = true_pseudorange(eph, t_true, rx.position, clock);
        let (az, el) = frame.az_el(sat);
        if el.to_degrees() < rx.horizon_deg {
            continue;
        }
        let signal = primary_signal(eph.sat.system);
        if let Some((k, scale)) = errors.iono {
            let coefficients = (k.alpha, k.beta);
            pr += scale
                * clock::iono_scale_from_l1(signal)
                * atmosphere::klobuchar_l1_m(
                    &coefficients,
                    geo.lat_rad,
                    geo.lon_rad,
                    az,
                    el,
                    t_true.tow_s(),
                );
        }
        if errors.troposphere {
            pr += atmosphere::troposphere_m(geo.lat_rad, geo.height_m, el);
        }
        let sigma = if errors.constant_sigma {
            errors.sigma_m
        } else {
            errors.sigma_m / el.sin().max(0.1)
        };
        pr += sigma * unit.map_or(0.0, |n| n.sample(rng));
        let mut o = Observation::code(eph.sat, signal, pr);
        // C/N0 falls towards the horizon like a patch antenna's gain (common practice);
        // with a constant σ it is constant too, so the σ model stays matched.
        o.cn0_dbhz = Some(if errors.constant_sigma {
            45.0
        } else {
            (35.0 + 15.0 * el.sin()) as f32
        });
        if epoch.push(o).is_err() {
            break;
        }
    }
    epoch
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pos(e: &BroadcastEphemeris, t: GnssTime) -> [f64; 3] {
        e.evaluate(t.seconds_since(e.toe().unwrap()), 0.0).pos
    }

    // A re-referenced set describes the same orbit: 1 mm at a common time, for MEO, IGSO
    // and GEO, across a week boundary too.
    #[test]
    fn rereferenced_sets_describe_the_same_orbit() {
        let toe = GnssTime::from_week_tow(2300, 597_600.0).unwrap();
        let c = constellation(3, toe, &[System::Gps, System::Beidou]);
        let t = toe.add_seconds(5_400.0);
        for e in &c.ephemerides {
            let later = rereference(e, toe.add_seconds(7_200.0));
            let (a, b) = (pos(e, t), pos(&later, t));
            let d = ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt();
            assert!(d < 1e-3, "{:?}: {d} m", e.sat);
        }
    }

    // BeiDou GEO satellites stay put over their longitude (10 km over 6 h with our e = 0,
    // exact-period elements; real GEOs drift within ±0.1° by station-keeping, common practice).
    #[test]
    fn beidou_geo_is_geostationary() {
        let toe = GnssTime::from_week_tow(2300, 100_000.0).unwrap();
        let c = constellation(3, toe, &[System::Beidou]);
        for e in c.ephemerides.iter().filter(|e| e.sat.is_beidou_geo()) {
            let a = pos(e, toe);
            let b = pos(e, toe.add_seconds(21_600.0));
            let d = ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt();
            assert!(d < 10_000.0, "{:?} moved {d} m", e.sat);
            let g = trackfix_engine::Geodetic::from_ecef(a);
            assert!(
                g.lat_rad.to_degrees().abs() < 0.5,
                "{:?} latitude {}",
                e.sat,
                g.lat_rad.to_degrees()
            );
        }
    }
}
