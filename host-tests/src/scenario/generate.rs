//! The scenario generator: a stream of engine-ready epochs with their truth, and the
//! ephemerides that become available on the way, deterministic from the seed.

use super::motion::Mover;
use super::spec::{ClockKind, EphemerisSource, ScenarioSpec};
use crate::synth::{constellation, primary_signal, rereference};
use crate::truth::{self, atmosphere, clock, orbit, Mutation};
use rand::{Rng, SeedableRng};
use rand_distr::{Distribution, Normal};
use std::collections::HashMap;
use trackfix_engine::{
    BroadcastEphemeris, Epoch, GnssTime, IonoCoefficients, LocalFrame, Observation, SatId, Signal,
    System, SPEED_OF_LIGHT,
};

/// Observations per generated epoch.
pub const GEN_N: usize = 64;

/// The broadcast ionosphere coefficients every scenario uses (the first Klobuchar vector
/// of CHECKS.md, a mid-latitude daytime set).
pub const SCENARIO_IONO: IonoCoefficients = IonoCoefficients {
    alpha: [1.49e-8, 2.24e-8, -1.19e-7, -1.19e-7],
    beta: [1.17e5, 1.80e5, -1.31e5, -4.95e5],
};

/// One generated epoch.
#[derive(Clone, Debug)]
pub struct GenEpoch {
    /// What the receiver reports (tagged by its own clock).
    pub epoch: Epoch<GEN_N>,
    /// True antenna position, ECEF m.
    pub truth_ecef: [f64; 3],
    /// True antenna velocity, ECEF m/s.
    pub truth_velocity_ecef: [f64; 3],
    /// First epoch after a wake-up.
    pub wake_start: bool,
    /// Ephemerides that became available to the tracker at this epoch, in broadcast order.
    pub new_ephemerides: Vec<BroadcastEphemeris>,
    /// Satellites received only by reflection (NLOS) at this epoch: the truth the
    /// reflection figures are measured against.
    pub reflected: Vec<SatId>,
}

/// Slowly varying per-satellite error state.
#[derive(Clone, Copy, Debug)]
struct SatProcess {
    sis_phase: [f64; 2],
    sis_amp: [f64; 2],
    iono_phase: f64,
    multipath: f64,
    nlos_draw: f64,
    nlos_bias: f64,
    next_redraw: f64,
}

struct BroadcastSet {
    eph: BroadcastEphemeris,
    transmitted: GnssTime,
    delivered: bool,
}

/// The generator; iterate it for epochs.
pub struct Generator {
    spec: ScenarioSpec,
    start: GnssTime,
    k: u64,
    steps: u64,
    mover: Mover,
    base: Vec<BroadcastEphemeris>,
    sets: Vec<BroadcastSet>,
    rng: rand::rngs::StdRng,
    procs: HashMap<SatId, SatProcess>,
    clock_bias_m: f64,
    clock_drift_mps: f64,
    isb_m: [f64; 3],
    tracking_since: Option<f64>,
    was_awake: bool,
    faults: Vec<(SatId, f64, f64, f64)>,
    mutation: Mutation,
    /// Doppler noise draws: a stream of their own, so adding Doppler left every other draw
    /// (and so every earlier scenario result) unchanged.
    doppler_rng: rand::rngs::StdRng,
}

/// Parses "G07"-style satellite names.
pub fn parse_sat(s: &str) -> Option<SatId> {
    let mut c = s.chars();
    let system = match c.next()? {
        'G' => System::Gps,
        'E' => System::Galileo,
        'C' => System::Beidou,
        _ => return None,
    };
    let prn = c.as_str().parse().ok()?;
    Some(SatId { system, prn })
}

impl Generator {
    /// A generator for `spec`.
    ///
    /// # Errors
    /// A message naming the first field that cannot be used.
    pub fn new(spec: &ScenarioSpec) -> Result<Self, String> {
        if !(spec.duration_s > 0.0 && spec.interval_s > 0.0) {
            return Err("duration_s and interval_s must be positive".into());
        }
        let start = GnssTime::from_week_tow(spec.start.0, spec.start.1)
            .map_err(|e| format!("start: {e:?}"))?;
        let systems: Vec<System> = spec.systems.iter().map(|s| (*s).into()).collect();
        if systems.is_empty() {
            return Err("systems: at least one system is needed".into());
        }
        // Broadcast sets every 2 h, each sent 1 h before its toe (as GPS does, seen in the
        // real navigation files), from 4 h before the start to 2 h after the end.
        let first_toe_s = ((spec.start.1 / 7_200.0).floor() - 2.0) * 7_200.0;
        let toe0 = GnssTime::from_week_tow(spec.start.0, 0.0)
            .map_err(|e| format!("start: {e:?}"))?
            .add_seconds(first_toe_s);
        let base = constellation(spec.seed, toe0, &systems).ephemerides;
        let mut sets = Vec::new();
        let n_sets = ((spec.duration_s + 6.0 * 3_600.0) / 7_200.0).ceil() as u32 + 1;
        for k in 0..n_sets {
            let toe = toe0.add_seconds(7_200.0 * f64::from(k));
            for b in &base {
                let eph = if k == 0 { *b } else { rereference(b, toe) };
                sets.push(BroadcastSet {
                    eph,
                    transmitted: toe.add_seconds(-3_600.0),
                    delivered: false,
                });
            }
        }
        let mut faults = Vec::new();
        for f in &spec.faults {
            let sat = parse_sat(&f.sat)
                .ok_or_else(|| format!("faults: unknown satellite {:?}", f.sat))?;
            faults.push((sat, f.start_s, f.step_m, f.ramp_mps));
        }
        let mut rng =
            rand::rngs::StdRng::seed_from_u64(spec.seed.wrapping_mul(0x9e37_79b9_7f4a_7c15));
        let (clock_bias_m, clock_drift_mps) = match spec.errors.clock {
            // A TCXO within ±0.5 ppm (±150 m/s), bias anywhere within the ±0.5 ms window.
            ClockKind::Tcxo => (
                rng.random_range(-1.4e5..1.4e5),
                rng.random_range(-150.0..150.0),
            ),
            ClockKind::Ideal => (0.0, 0.0),
        };
        let isb_m = [
            0.0,
            rng.random_range(-10.0..10.0),
            rng.random_range(-10.0..10.0),
        ];
        Ok(Generator {
            mover: Mover::new(spec.origin, spec.motion, spec.seed),
            steps: (spec.duration_s / spec.interval_s).floor() as u64,
            spec: spec.clone(),
            start,
            k: 0,
            base,
            sets,
            rng,
            procs: HashMap::new(),
            clock_bias_m,
            clock_drift_mps,
            isb_m,
            tracking_since: None,
            was_awake: false,
            faults,
            mutation: Mutation::default(),
            doppler_rng: rand::rngs::StdRng::seed_from_u64(spec.seed ^ 0x0064_6f70_706c_6572),
        })
    }

    /// The same generator with a deliberate error in its truth models (for the test that
    /// shows such an error reaches the accuracy gates).
    #[must_use]
    pub fn with_mutation(mut self, mutation: Mutation) -> Self {
        self.mutation = mutation;
        self
    }

    fn awake(&self, s: f64) -> (bool, bool) {
        match self.spec.duty_cycle {
            None => (true, false),
            Some(d) => {
                let phase = s.rem_euclid(d.period_s);
                (phase < d.awake_s, phase < d.acquisition_s)
            }
        }
    }

    fn step_clock(&mut self, dt: f64) {
        if self.spec.errors.clock == ClockKind::Ideal {
            return;
        }
        // q_bias = h0/2, q_drift = 2π²·h−2 (TCXO coefficients in ClockKind::Tcxo).
        let c = SPEED_OF_LIGHT;
        let sb = (1e-19f64).sqrt() * c * dt.sqrt();
        let sd = (2.0 * std::f64::consts::PI.powi(2) * 2e-20f64).sqrt() * c * dt.sqrt();
        let n = Normal::new(0.0, 1.0).ok();
        let mut draw = || n.map_or(0.0, |n| n.sample(&mut self.rng));
        self.clock_drift_mps += sd * draw();
        self.clock_bias_m += self.clock_drift_mps * dt + sb * draw();
        // Millisecond steering.
        let ms = 1e-3 * c;
        if self.clock_bias_m > 0.5 * ms {
            self.clock_bias_m -= ms;
        } else if self.clock_bias_m < -0.5 * ms {
            self.clock_bias_m += ms;
        }
    }

    fn process_for(&mut self, sat: SatId) -> SatProcess {
        let sis = self.spec.errors.sis_rms_m;
        let rng = &mut self.rng;
        *self.procs.entry(sat).or_insert_with(|| SatProcess {
            sis_phase: [rng.random_range(0.0..6.3), rng.random_range(0.0..6.3)],
            sis_amp: [
                sis * rng.random_range(0.5..1.5),
                sis * rng.random_range(0.5..1.5),
            ],
            iono_phase: rng.random_range(0.0..6.3),
            multipath: 0.0,
            nlos_draw: rng.random_range(0.0..1.0),
            nlos_bias: 0.0,
            next_redraw: 0.0,
        })
    }
}

/// The receiver's ECEF velocity from its speed over ground and heading (level motion).
fn velocity_ecef(kin: &super::motion::Kinematics) -> [f64; 3] {
    let frame = LocalFrame::new(kin.ecef, &kin.geodetic);
    let (ve, vn) = (
        kin.speed_mps * kin.heading_rad.sin(),
        kin.speed_mps * kin.heading_rad.cos(),
    );
    let [e, n, _] = frame.axes;
    [0, 1, 2].map(|k| e[k] * ve + n[k] * vn)
}

impl Generator {
    /// The true range rate (m/s) of `eph`'s satellite on `signal`: the central difference of
    /// the truth pseudorange over ±0.5 s, with the receiver moving at its velocity and its
    /// clock drifting (the derivative of everything the pseudorange holds but the
    /// atmosphere, whose rate is millimetres per second).
    fn true_range_rate(
        &self,
        eph: &BroadcastEphemeris,
        signal: Signal,
        t_true: GnssTime,
        kin: &super::motion::Kinematics,
        clock_m: f64,
    ) -> f64 {
        let v = velocity_ecef(kin);
        let at = |h: f64| {
            let rx = [0, 1, 2].map(|k| kin.ecef[k] + v[k] * h);
            let clk = clock_m + self.clock_drift_mps * h;
            truth::pseudorange(
                eph,
                signal,
                orbit::shift(t_true, h),
                rx,
                clk,
                &self.mutation,
            )
            .pseudorange_m
        };
        at(0.5) - at(-0.5)
    }
}

impl Iterator for Generator {
    type Item = GenEpoch;

    fn next(&mut self) -> Option<GenEpoch> {
        loop {
            if self.k > self.steps {
                return None;
            }
            let s = self.k as f64 * self.spec.interval_s;
            if self.k > 0 {
                self.mover.advance(self.spec.interval_s);
                self.step_clock(self.spec.interval_s);
            }
            self.k += 1;
            let (awake, acquiring) = self.awake(s);
            let wake_start = awake && !self.was_awake;
            self.was_awake = awake;
            if !awake {
                self.tracking_since = None;
                continue;
            }
            return Some(self.make_epoch(s, wake_start, acquiring));
        }
    }
}

impl Generator {
    fn make_epoch(&mut self, s: f64, wake_start: bool, acquiring: bool) -> GenEpoch {
        let tag = self.start.add_seconds(s);
        let t_true = tag.add_seconds(-self.clock_bias_m / SPEED_OF_LIGHT);
        let kin = self.mover.now();
        let in_outage = self.spec.outages.iter().any(|[a, b]| s >= *a && s < *b);
        let receiving = !acquiring && !in_outage;
        if !receiving {
            self.tracking_since = None;
        } else if self.tracking_since.is_none() {
            self.tracking_since = Some(s);
        }
        // Ephemerides that became available.
        let mut new_ephemerides = Vec::new();
        let decode_ready = |transmitted: GnssTime, since: Option<f64>, start: GnssTime| -> bool {
            since.is_some_and(|since| {
                let from = transmitted.max(start.add_seconds(since));
                tag.seconds_since(from) >= 30.0
            })
        };
        for set in self
            .sets
            .iter_mut()
            .filter(|x| !x.delivered && x.transmitted <= tag)
        {
            let ok = match self.spec.ephemeris {
                EphemerisSource::Downloaded => true,
                EphemerisSource::Decoded => {
                    decode_ready(set.transmitted, self.tracking_since, self.start)
                }
            };
            if ok {
                set.delivered = true;
                new_ephemerides.push(set.eph);
            }
        }
        let mut epoch = Epoch::new(tag);
        let mut reflected = Vec::new();
        if receiving {
            self.observe_all(&mut epoch, &mut reflected, t_true, s, &kin);
        }
        GenEpoch {
            epoch,
            truth_ecef: kin.ecef,
            truth_velocity_ecef: velocity_ecef(&kin),
            wake_start,
            new_ephemerides,
            reflected,
        }
    }

    fn observe_all(
        &mut self,
        epoch: &mut Epoch<GEN_N>,
        reflected: &mut Vec<SatId>,
        t_true: GnssTime,
        s: f64,
        kin: &super::motion::Kinematics,
    ) {
        let frame = LocalFrame::new(kin.ecef, &kin.geodetic);
        let geo = kin.geodetic;
        let klobuchar = (SCENARIO_IONO.alpha, SCENARIO_IONO.beta);
        let errs = self.spec.errors.clone();
        let unit = Normal::new(0.0, 1.0).ok();
        let base = self.base.clone();
        for eph in &base {
            // Cheap visibility test first: one orbit evaluation, 2° of margin for the
            // ~75 ms of travel time it ignores.
            let rough = orbit::position(eph, orbit::shift(t_true, -0.075));
            if frame.az_el(rough).1.to_degrees() < errs.horizon_deg - 2.0 {
                continue;
            }
            let sys = eph.sat.system;
            let clock = self.clock_bias_m + self.isb_m[sys.index()];
            let signal = primary_signal(sys);
            let truth = truth::pseudorange(eph, signal, t_true, kin.ecef, clock, &self.mutation);
            let (pr0, sat_pos) = (truth.pseudorange_m, truth.sat_ecef_m);
            let rate = self.true_range_rate(eph, signal, t_true, kin, clock);
            let (az, el) = frame.az_el(sat_pos);
            let el_deg = el.to_degrees();
            if el_deg < errs.horizon_deg {
                continue;
            }
            let mut p = self.process_for(eph.sat);
            // Street canyon: blocked, or received by reflection (NLOS) with an extra path.
            let mut nlos = 0.0;
            if let Some(c) = errs.urban_canyon {
                if s >= p.next_redraw {
                    p.nlos_draw = self.rng.random_range(0.0..1.0);
                    p.nlos_bias = self.rng.random_range(5.0..c.nlos_max_m.max(5.0));
                    p.next_redraw = s + 60.0;
                }
                let mask =
                    c.along_deg + (c.across_deg - c.along_deg) * (az - kin.heading_rad).sin().abs();
                if el_deg < mask {
                    if p.nlos_draw >= c.nlos_share {
                        self.procs.insert(eph.sat, p);
                        continue;
                    }
                    nlos = p.nlos_bias;
                }
            }
            let mut draw = || unit.map_or(0.0, |n| n.sample(&mut self.rng));
            let sin_el = el.sin();
            let cn0 = 34.0 + 14.0 * sin_el - if nlos > 0.0 { 10.0 } else { 0.0 } + draw();
            let sigma = errs.code_sigma_m * 10f64.powf((45.0 - cn0) / 20.0);
            // Multipath: first-order Gauss–Markov, 15 s correlation time.
            let mp_sigma = errs.multipath_m * (-el_deg / 20.0).exp();
            let a = (-self.spec.interval_s / 15.0).exp();
            p.multipath = a * p.multipath + (1.0 - a * a).sqrt() * mp_sigma * draw();
            let hours = s / 3_600.0;
            let sis = p.sis_amp[0] * (std::f64::consts::TAU * hours / 6.0 + p.sis_phase[0]).sin()
                + p.sis_amp[1] * (std::f64::consts::TAU * hours / 12.0 + p.sis_phase[1]).sin();
            let iono_l1 = (errs.iono_scale
                + errs.iono_wander * (std::f64::consts::TAU * hours / 2.0 + p.iono_phase).sin())
                * atmosphere::klobuchar_l1_m(
                    &klobuchar,
                    geo.lat_rad,
                    geo.lon_rad,
                    az,
                    el,
                    t_true.tow_s(),
                );
            let tropo =
                atmosphere::troposphere_m(geo.lat_rad, geo.height_m, el) * (1.0 + errs.tropo_error);
            let fault: f64 = self
                .faults
                .iter()
                .filter(|(sat, start, _, _)| *sat == eph.sat && s >= *start)
                .map(|(_, start, step, ramp)| step + ramp * (s - start))
                .sum();
            let common = pr0 + sis + tropo + nlos + p.multipath + fault;
            let mut o = Observation::code(
                eph.sat,
                signal,
                common + iono_l1 * clock::iono_scale_from_l1(signal) + sigma * draw(),
            );
            o.cn0_dbhz = Some(cn0 as f32);
            if nlos > 0.0 {
                reflected.push(eph.sat);
            }
            let unit_draw = unit.map_or(0.0, |n| n.sample(&mut self.doppler_rng));
            let noise = errs.doppler_sigma_mps * 10f64.powf((45.0 - cn0) / 20.0) * unit_draw;
            o.doppler_hz = Some(-(rate + noise) * clock::frequency_hz(signal) / SPEED_OF_LIGHT);
            let _ = epoch.push(o);
            if self.spec.dual_frequency {
                let second = match sys {
                    System::Gps => Signal::GpsL2,
                    System::Galileo => Signal::GalE5a,
                    System::Beidou => Signal::BdsB2I,
                };
                // The second signal's group delay differs from the first's by the broadcast
                // TGD/BGD terms.
                let gd = (clock::group_delay_s(eph, second) - clock::group_delay_s(eph, signal))
                    * self.mutation.group_delay
                    * SPEED_OF_LIGHT;
                let mut o2 = Observation::code(
                    eph.sat,
                    second,
                    common
                        + gd
                        + iono_l1 * clock::iono_scale_from_l1(second)
                        + 1.2 * sigma * draw(),
                );
                o2.cn0_dbhz = Some((cn0 - 3.0) as f32);
                let _ = epoch.push(o2);
            }
            self.procs.insert(eph.sat, p);
        }
    }
}
