//! Fault-injection Monte Carlo: the integrity figures the manifest's `[[integrity]]` rows
//! gate. Each row draws thousands of epochs from a fixed seed, each at its own place on the
//! Earth and its own time (so its own geometry), from the synthetic constellations of
//! [`crate::synth`] and the independent truth models of [`crate::truth`].
//!
//! - **Residual-test rows** (`fault-free`, `bias`) run every epoch on its own (snapshot
//!   mode, no history), so the epochs are independent trials. Their pseudorange errors are
//!   drawn from exactly the distribution the test assumes (the hypothesis under test, not
//!   the engine's code: σ² = σ_floor² + σ_URE² + (0.12 m · m(E))², the documented σ model
//!   with the elevation term and the atmosphere delays off), so the false-alarm count must
//!   fall inside the binomial interval of the configured probability. A bias row adds a bias
//!   to one satellite, sized in σ of that satellite's normalised residual
//!   (`b = k·σᵢ/√(1 − hᵢᵢ)`, the non-centrality `λ = k²` of ncx2.rs), computed here with
//!   nalgebra from the true geometry.
//! - **Indicator rows** (`jammer`, `spoofer`) run trials of 120 one-second epochs through the
//!   default engine (filter and integrity): 60 s clean, then the attack. They measure the
//!   delay to the flag and count flags raised in the clean part.

use crate::synth::{self, Constellation};
use crate::truth::{atmosphere, clock as truth_clock};
use nalgebra::{DMatrix, DVector};
use rand::{Rng, SeedableRng};
use rand_distr::{Distribution, Normal};
use serde::Deserialize;
use statrs::distribution::{Binomial, DiscreteCDF};
use trackfix_engine::config::FilterMode;
use trackfix_engine::{
    Config, Engine, Epoch, Flags, Geodetic, GnssTime, IntegrityState, LocalFrame, Observation,
    SatId, SatStatus, Solution, System, SPEED_OF_LIGHT,
};

/// Observations per epoch (GPS and Galileo in view at 10°: at most about 24).
const N: usize = 32;
/// Ephemeris slots (30 GPS + 24 Galileo).
const EPH: usize = 64;
/// Generated satellites lie above this elevation, °: above the engine's 10° mask even at
/// the solved position.
const HORIZON_DEG: f64 = 10.5;
/// Clean seconds before an attack, and the attack's length.
const CLEAN_S: usize = 60;
/// Seconds of attack per trial.
const ATTACK_S: usize = 60;

/// What a row injects.
#[derive(Clone, Copy, Debug, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "kebab-case")]
pub enum FaultKind {
    /// Nothing: the residual test's false alarms.
    FaultFree,
    /// A bias on one satellite.
    Bias,
    /// C/N0 falling on every satellite at `ramp_db_per_s`.
    Jammer,
    /// Every signal replaced by one transmitter's, for a position walking away.
    Spoofer,
    /// A step bias of `bias_sigmas` σ of its pseudorange on one satellite, through the
    /// filter (or the snapshot fixes with `snapshot_only`).
    TrackedBias,
    /// A bias growing by `ramp_sigmas_per_s` σ of its pseudorange per second on one
    /// satellite.
    TrackedRamp,
}

/// Which satellite a bias row biases.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq, Eq)]
#[serde(rename_all = "kebab-case")]
pub enum Victim {
    /// Any satellite in view, drawn at random.
    #[default]
    Random,
    /// The one with the largest horizontal slope: the case the protection level is built on.
    LargestSlope,
}

/// Limits of an integrity row; absent limits are not checked.
#[derive(Clone, Copy, Debug, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct FaultThreshold {
    /// The false alarms must fall inside the binomial 99 % interval of the configured
    /// probability.
    #[serde(default)]
    pub false_alarms_in_interval: bool,
    /// Detected faults, at least, %.
    pub detection_min_pct: Option<f64>,
    /// Detected faults whose excluded satellite is the faulty one, at least, %.
    pub exclusion_min_pct: Option<f64>,
    /// Epochs whose error exceeds the protection level must stay within the binomial 99 %
    /// upper bound of the configured integrity risk.
    #[serde(default)]
    pub bounded: bool,
    /// Longest delay from the attack to its flag, s.
    pub delay_max_s: Option<f64>,
    /// Flags raised in the clean part, at most.
    pub clean_flags_max: Option<f64>,
}

/// One Monte Carlo row.
#[derive(Clone, Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FaultRow {
    /// Row name.
    pub name: String,
    /// What it represents.
    pub note: String,
    /// What it injects.
    pub kind: FaultKind,
    /// Seed of every draw.
    pub seed: u64,
    /// Epochs to draw (trials of 120 epochs for the indicator rows).
    pub epochs: usize,
    /// False-alarm probability configured for the row (default: the engine's).
    pub false_alarm: Option<f64>,
    /// Bias size in σ of the satellite's normalised residual.
    pub bias_sigmas: Option<f64>,
    /// Which satellite is biased.
    #[serde(default)]
    pub victim: Victim,
    /// C/N0 fall of the jammer, dB/s.
    pub ramp_db_per_s: Option<f64>,
    /// Speed of the spoofed position, m/s.
    pub walk_mps: Option<f64>,
    /// Growth of a ramp, σ of its pseudorange per second.
    pub ramp_sigmas_per_s: Option<f64>,
    /// Trials run by snapshot fixes only (no filter).
    #[serde(default)]
    pub snapshot_only: bool,
    /// Limits.
    pub threshold: FaultThreshold,
}

/// What a row measured.
#[derive(Clone, Debug, Default)]
pub struct FaultFigures {
    /// Epochs run.
    pub epochs: usize,
    /// Epochs where the residual test ran (at least one degree of freedom).
    pub tested: usize,
    /// Epochs where it failed (an exclusion or an alert).
    pub alarms: usize,
    /// The binomial 99 % interval of the alarm count under the configured probability.
    pub alarm_interval: (u64, u64),
    /// Of the alarms, those that excluded the faulty satellite.
    pub right_exclusions: usize,
    /// Epochs with a protection level and with the error above it.
    pub misleading: usize,
    /// Epochs with a protection level.
    pub protected: usize,
    /// The binomial 99 % upper bound of misleading epochs under the integrity risk.
    pub misleading_bound: u64,
    /// Delays from attack to flag, s, one per trial (NaN: never flagged).
    pub delays_s: Vec<f64>,
    /// Flags raised in the clean parts.
    pub clean_flags: usize,
    /// Trials (indicator and tracked-fault rows).
    pub trials: usize,
}

impl FaultFigures {
    /// Detected share of the tested epochs (of the trials, for the trial rows), %.
    pub fn detection_pct(&self) -> f64 {
        if self.trials > 0 {
            pct(
                self.delays_s.iter().filter(|d| !d.is_nan()).count(),
                self.trials,
            )
        } else {
            pct(self.alarms, self.tested)
        }
    }

    /// Share of alarms that excluded the faulty satellite, %.
    pub fn exclusion_pct(&self) -> f64 {
        pct(self.right_exclusions, self.alarms)
    }

    /// The longest delay to the flag, s (infinite when a trial was never flagged).
    pub fn delay_max_s(&self) -> f64 {
        self.delays_s
            .iter()
            .map(|d| if d.is_nan() { f64::INFINITY } else { *d })
            .fold(f64::NAN, f64::max)
    }

    /// The median delay of the trials that were caught, s.
    pub fn delay_median_s(&self) -> f64 {
        let mut d: Vec<f64> = self
            .delays_s
            .iter()
            .copied()
            .filter(|d| !d.is_nan())
            .collect();
        d.sort_by(f64::total_cmp);
        d.get(d.len().saturating_sub(1) / 2)
            .copied()
            .unwrap_or(f64::NAN)
    }

    /// Whether the figures pass `t`.
    pub fn passes(&self, t: &FaultThreshold) -> bool {
        let alarms = self.alarms as u64;
        (!t.false_alarms_in_interval
            || (self.alarm_interval.0..=self.alarm_interval.1).contains(&alarms))
            && t.detection_min_pct
                .is_none_or(|m| self.detection_pct() >= m)
            && t.exclusion_min_pct
                .is_none_or(|m| self.exclusion_pct() >= m)
            && (!t.bounded || self.misleading as u64 <= self.misleading_bound)
            && t.delay_max_s.is_none_or(|m| self.delay_max_s() <= m)
            && t.clean_flags_max
                .is_none_or(|m| self.clean_flags as f64 <= m)
    }
}

fn pct(k: usize, n: usize) -> f64 {
    if n == 0 {
        f64::NAN
    } else {
        100.0 * k as f64 / n as f64
    }
}

/// The 99 % central interval of Binomial(n, p): the smallest counts whose distribution
/// function (statrs) reaches 0.005 and 0.995.
pub fn binomial_interval(n: usize, p: f64) -> (u64, u64) {
    let Ok(b) = Binomial::new(p, n as u64) else {
        return (0, u64::MAX);
    };
    let quantile = |q: f64| (0..=n as u64).find(|k| b.cdf(*k) >= q).unwrap_or(n as u64);
    (quantile(0.005), quantile(0.995))
}

/// The configuration of the residual-test rows: snapshot fixes, no troposphere model and
/// no ionosphere coefficients (so no atmosphere delay is applied or drawn), a constant code
/// σ (no elevation term; every C/N0 above the reference), reflection weighting off.
fn test_config(false_alarm: Option<f64>) -> Config {
    let mut c = Config::default().with_systems(&[System::Gps, System::Galileo]);
    c.filter.mode = FilterMode::Snapshot;
    c.corrections.troposphere = trackfix_engine::config::TropoModel::Off;
    c.snapshot.sigma_elevation_m = 0.0;
    c.snapshot.cn0_reference_dbhz = 20.0;
    c.integrity.reflection_sigma_factor = 1.0;
    if let Some(p) = false_alarm {
        c.integrity.false_alarm = p;
    }
    c
}

/// The pseudorange σ the residual test assumes at elevation `el` (rad) under `c`: the code
/// floor, the signal-in-space σ and the troposphere σ the model leaves, 0.12 m through the
/// mapping function 1.001/√(0.002001 + sin²E) (RTCA DO-229 \[M\]).
fn hypothesis_sigma(c: &Config, el: f64) -> f64 {
    let m = 1.001 / (0.002_001 + el.sin().powi(2)).sqrt();
    let tropo = 0.12 * m;
    (c.snapshot.sigma_floor_m.powi(2) + c.filter.ure_sigma_m.powi(2) + tropo * tropo).sqrt()
}

/// A random place on land or sea below 70° of latitude, 0–500 m high.
fn draw_place(rng: &mut impl Rng) -> [f64; 3] {
    let lat = (rng.random_range(-0.94f64..0.94)).asin();
    let lon = rng.random_range(-std::f64::consts::PI..std::f64::consts::PI);
    let h = rng.random_range(0.0..500.0);
    Geodetic {
        lat_rad: lat,
        lon_rad: lon,
        height_m: h,
    }
    .to_ecef()
}

/// One satellite in view: its id, true pseudorange, true range rate (m/s; the satellite's
/// clock drift included, as a Doppler measures it), elevation (rad) and ENU line of sight.
struct InView {
    sat: SatId,
    pr_m: f64,
    rate_mps: f64,
    el: f64,
    los_enu: [f64; 3],
}

/// The satellites above [`HORIZON_DEG`] at `rx` at true time `t` (receiver clock exact),
/// with the signals as received at `signals_from` moving at `velocity` (ECEF, m/s): the
/// receiver itself, or a spoofer's false position. The range rate is the central difference
/// of the true pseudorange over ±0.5 s.
fn in_view(
    c: &Constellation,
    t: GnssTime,
    rx: [f64; 3],
    signals_from: [f64; 3],
    velocity: [f64; 3],
) -> Vec<InView> {
    let frame = LocalFrame::at_ecef(rx);
    let mut out = Vec::new();
    let at = |dt: f64| [0, 1, 2].map(|k| signals_from[k] + velocity[k] * dt);
    for eph in &c.ephemerides {
        let (pr, sat) = synth::true_pseudorange(eph, t, signals_from, 0.0);
        let (_, el) = frame.az_el(sat);
        if el.to_degrees() < HORIZON_DEG {
            continue;
        }
        let d = frame.enu(sat);
        let n = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
        let (after, _) = synth::true_pseudorange(eph, t.add_seconds(0.5), at(0.5), 0.0);
        let (before, _) = synth::true_pseudorange(eph, t.add_seconds(-0.5), at(-0.5), 0.0);
        out.push(InView {
            sat: eph.sat,
            pr_m: pr,
            rate_mps: after - before,
            el,
            los_enu: [d[0] / n, d[1] / n, d[2] / n],
        });
    }
    out
}

/// Redundancy `1 − hᵢᵢ` and horizontal slope of each satellite (../shared/CHECKS.md,
/// Integrity: `A = (GᵀWG)⁻¹GᵀW`, `S = I − GA`), by nalgebra from the true geometry.
fn redundancy_and_slope(view: &[InView], sigma: &[f64]) -> Option<Vec<(f64, f64)>> {
    let systems: Vec<System> = [System::Gps, System::Galileo]
        .into_iter()
        .filter(|s| view.iter().any(|v| v.sat.system == *s))
        .collect();
    let cols = 3 + systems.len();
    let g = DMatrix::from_fn(view.len(), cols, |i, j| match j {
        0..=2 => -view[i].los_enu[j],
        _ => f64::from(u8::from(systems[j - 3] == view[i].sat.system)),
    });
    let w = DMatrix::from_diagonal(&DVector::from_iterator(
        sigma.len(),
        sigma.iter().map(|s| 1.0 / (s * s)),
    ));
    let n_inv = (g.transpose() * &w * &g).try_inverse()?;
    let a = &n_inv * g.transpose() * &w;
    let s = DMatrix::identity(view.len(), view.len()) - &g * &a;
    Some(
        (0..view.len())
            .map(|i| {
                let r = s[(i, i)];
                let slope = (a[(0, i)].powi(2) + a[(1, i)].powi(2)).sqrt() * sigma[i] / r.sqrt();
                (r, slope)
            })
            .collect(),
    )
}

/// An engine configured with `c` holding every ephemeris of `constellation`.
fn engine_with(c: Config, constellation: &Constellation) -> Result<Box<Engine<N, EPH>>, String> {
    let mut e: Box<Engine<N, EPH>> =
        Box::new(Engine::new(c).map_err(|e| format!("configuration: {e}"))?);
    for eph in &constellation.ephemerides {
        e.ingest_ephemeris(*eph)
            .map_err(|e| format!("ephemeris: {e}"))?;
    }
    Ok(e)
}

/// The horizontal and vertical error of a solution's fix against `truth`.
fn errors(sol: &Solution<N>, truth: [f64; 3]) -> Option<(f64, f64)> {
    let f = sol.fix()?;
    let e = LocalFrame::at_ecef(truth).enu(f.ecef_m);
    Some((e[0].hypot(e[1]), e[2].abs()))
}

impl FaultRow {
    /// Runs the row.
    ///
    /// # Errors
    /// A configuration or ephemeris the engine refuses.
    pub fn run(&self) -> Result<FaultFigures, String> {
        match self.kind {
            FaultKind::FaultFree | FaultKind::Bias => self.run_test_row(),
            _ => self.run_attack_row(),
        }
    }

    fn run_test_row(&self) -> Result<FaultFigures, String> {
        let cfg = test_config(self.false_alarm);
        let toe = GnssTime::from_week_tow(2300, 302_400.0).map_err(|e| e.to_string())?;
        let constellation = synth::constellation(self.seed, toe, &[System::Gps, System::Galileo]);
        let mut engine = engine_with(cfg, &constellation)?;
        let mut rng = rand::rngs::StdRng::seed_from_u64(self.seed);
        let unit = Normal::new(0.0, 1.0).map_err(|e| e.to_string())?;
        let mut fig = FaultFigures {
            epochs: self.epochs,
            ..FaultFigures::default()
        };
        for _ in 0..self.epochs {
            engine.reset_time();
            let t = toe.add_seconds(rng.random_range(-5_400.0..5_400.0));
            let rx = draw_place(&mut rng);
            let view = in_view(&constellation, t, rx, rx, [0.0; 3]);
            let sigma: Vec<f64> = view.iter().map(|v| hypothesis_sigma(&cfg, v.el)).collect();
            let mut victim = None;
            if self.kind == FaultKind::Bias {
                let Some(rs) = redundancy_and_slope(&view, &sigma) else {
                    continue;
                };
                let i = match self.victim {
                    Victim::Random => rng.random_range(0..view.len()),
                    Victim::LargestSlope => (0..view.len())
                        .filter(|i| rs[*i].0 > 1e-6)
                        .max_by(|a, b| rs[*a].1.total_cmp(&rs[*b].1))
                        .unwrap_or(0),
                };
                if rs[i].0 > 1e-6 {
                    let k = self.bias_sigmas.unwrap_or(0.0);
                    let sign = if rng.random_bool(0.5) { 1.0 } else { -1.0 };
                    victim = Some((i, sign * k * sigma[i] / rs[i].0.sqrt()));
                }
            }
            let mut epoch: Epoch<N> = Epoch::new(t);
            for (i, (v, s)) in view.iter().zip(&sigma).enumerate() {
                let bias = victim.filter(|(k, _)| *k == i).map_or(0.0, |(_, b)| b);
                let pr = v.pr_m + s * unit.sample(&mut rng) + bias;
                let signal = synth::primary_signal(v.sat.system);
                let _ = epoch.push(Observation::code(v.sat, signal, pr));
            }
            let Ok(sol) = engine.process(&epoch) else {
                continue;
            };
            self.count_test_epoch(&sol, rx, victim.map(|(i, _)| view[i].sat), &mut fig);
        }
        let p = cfg.integrity.false_alarm;
        fig.alarm_interval = binomial_interval(fig.tested, p);
        fig.misleading_bound = binomial_interval(fig.protected, cfg.integrity.integrity_risk).1;
        Ok(fig)
    }

    fn count_test_epoch(
        &self,
        sol: &Solution<N>,
        truth: [f64; 3],
        victim: Option<SatId>,
        fig: &mut FaultFigures,
    ) {
        let i = &sol.integrity;
        if i.dof == 0 {
            return;
        }
        fig.tested += 1;
        let excluded: Vec<SatId> = sol
            .sats
            .iter()
            .filter(|s| matches!(s.status, SatStatus::Excluded { .. }))
            .map(|s| s.sat)
            .collect();
        if !excluded.is_empty() || i.state == IntegrityState::Alert {
            fig.alarms += 1;
            if victim.is_some_and(|v| excluded.contains(&v)) {
                fig.right_exclusions += 1;
            }
        }
        if let (Some(h), Some(v), Some((eh, ev))) = (i.hpl_m, i.vpl_m, errors(sol, truth)) {
            fig.protected += 1;
            if eh > f64::from(h) || ev > f64::from(v) {
                fig.misleading += 1;
            }
        }
    }

    fn run_attack_row(&self) -> Result<FaultFigures, String> {
        let biased = matches!(self.kind, FaultKind::TrackedBias | FaultKind::TrackedRamp);
        let mut cfg = if biased {
            // The biased rows size their bias in σ of the test's own hypothesis: the code σ
            // without its elevation term, so that σ is the engine's (troposphere modelled and
            // drawn alike).
            let mut c = test_config(None);
            c.filter.mode = FilterMode::Tracking;
            c.corrections.troposphere = trackfix_engine::config::TropoModel::StandardAtmosphere;
            c
        } else {
            Config::default().with_systems(&[System::Gps, System::Galileo])
        };
        if self.snapshot_only {
            cfg.filter.mode = FilterMode::Snapshot;
        }
        let toe = GnssTime::from_week_tow(2300, 302_400.0).map_err(|e| e.to_string())?;
        let constellation = synth::constellation(self.seed, toe, &[System::Gps, System::Galileo]);
        let mut engine = engine_with(cfg, &constellation)?;
        let mut rng = rand::rngs::StdRng::seed_from_u64(self.seed);
        let unit = Normal::new(0.0, 1.0).map_err(|e| e.to_string())?;
        let trial_len = CLEAN_S + ATTACK_S;
        let trials = self.epochs.div_ceil(trial_len);
        let mut fig = FaultFigures {
            epochs: trials * trial_len,
            trials,
            ..FaultFigures::default()
        };
        let spoof_flags = Flags(
            Flags::UNIFORM_CN0.0
                | Flags::CLOCK_JUMP.0
                | Flags::INCONSISTENT_MOTION.0
                | Flags::DOPPLER_MISMATCH.0,
        );
        let flag = match self.kind {
            FaultKind::Jammer => Flags::JAMMING,
            _ => spoof_flags,
        };
        for _ in 0..trials {
            engine.reset_time();
            let start = toe.add_seconds(rng.random_range(-5_400.0..5_280.0));
            let rx = draw_place(&mut rng);
            let frame = LocalFrame::at_ecef(rx);
            let heading = rng.random_range(0.0..std::f64::consts::TAU);
            let walk = self.walk_mps.unwrap_or(1.4);
            let mut delay = f64::NAN;
            let mut victim: Option<SatId> = None;
            for s in 0..trial_len {
                let t = start.add_seconds(s as f64);
                let attacked = s >= CLEAN_S;
                let since = (s as f64) - CLEAN_S as f64;
                // The spoofer's false position walks away from the true one.
                let from = if self.kind == FaultKind::Spoofer && attacked {
                    let d = walk * since;
                    let e = [d * heading.sin(), d * heading.cos(), 0.0];
                    let ax = frame.axes;
                    [0, 1, 2].map(|k| rx[k] + ax[0][k] * e[0] + ax[1][k] * e[1] + ax[2][k] * e[2])
                } else {
                    rx
                };
                let velocity = if self.kind == FaultKind::Spoofer && attacked {
                    let ax = frame.axes;
                    let (e, n) = (walk * heading.sin(), walk * heading.cos());
                    [0, 1, 2].map(|k| ax[0][k] * e + ax[1][k] * n)
                } else {
                    [0.0; 3]
                };
                let view = in_view(&constellation, t, rx, from, velocity);
                if biased && attacked && victim.is_none() && !view.is_empty() {
                    victim = Some(view[rng.random_range(0..view.len())].sat);
                }
                let geo = Geodetic::from_ecef(rx);
                let mut epoch: Epoch<N> = Epoch::new(t);
                for v in &view {
                    // A patch antenna's C/N0: 33 dB-Hz at the horizon to 49 at the zenith,
                    // with 1 dB of jitter (common practice).
                    let mut cn0 = 33.0 + 16.0 * v.el.sin() + unit.sample(&mut rng);
                    if attacked && self.kind == FaultKind::Jammer {
                        cn0 -= self.ramp_db_per_s.unwrap_or(2.0) * (since + 1.0);
                    }
                    if attacked && self.kind == FaultKind::Spoofer {
                        // One transmitter: every signal at about the same power.
                        cn0 = 46.0 + 0.3 * unit.sample(&mut rng);
                    }
                    if cn0 < 20.0 {
                        continue; // lock lost
                    }
                    let sigma0 = hypothesis_sigma(&cfg, v.el);
                    // Weaker signals are noisier (DLL noise as 1/√(C/N0), common practice),
                    // except in the biased rows, whose noise is the test's hypothesis.
                    let sigma = if biased {
                        sigma0
                    } else {
                        sigma0 * 10f64.powf((45.0 - cn0).max(0.0) / 20.0)
                    };
                    let bias = match (victim == Some(v.sat), self.kind) {
                        (true, FaultKind::TrackedBias) => self.bias_sigmas.unwrap_or(0.0) * sigma0,
                        (true, FaultKind::TrackedRamp) => {
                            self.ramp_sigmas_per_s.unwrap_or(0.0) * sigma0 * (since + 1.0)
                        }
                        _ => 0.0,
                    };
                    let tropo = atmosphere::troposphere_m(geo.lat_rad, geo.height_m, v.el);
                    let pr = v.pr_m + tropo + bias + sigma * unit.sample(&mut rng);
                    let signal = synth::primary_signal(v.sat.system);
                    let mut o = Observation::code(v.sat, signal, pr);
                    o.cn0_dbhz = Some(cn0 as f32);
                    // Doppler as a tracker reports it: 5 cm/s of noise at 45 dB-Hz (common
                    // practice), scaled like the code noise.
                    let rate = v.rate_mps + 0.05 * sigma / sigma0 * unit.sample(&mut rng);
                    o.doppler_hz = Some(-rate * truth_clock::frequency_hz(signal) / SPEED_OF_LIGHT);
                    let _ = epoch.push(o);
                }
                let Ok(sol) = engine.process(&epoch) else {
                    continue;
                };
                let flags = sol.integrity.flags;
                let refused = victim.is_some_and(|v| {
                    sol.sats.iter().any(|s| {
                        s.sat == v
                            && matches!(
                                s.status,
                                SatStatus::Excluded { .. }
                                    | SatStatus::KeptOut
                                    | SatStatus::Gated { .. }
                            )
                    })
                });
                let caught = if biased {
                    refused
                } else {
                    flags.0 & flag.0 != 0
                };
                if !attacked {
                    fig.clean_flags += usize::from(!flags.is_empty());
                } else if delay.is_nan() && caught {
                    delay = since;
                }
            }
            fig.delays_s.push(delay);
        }
        Ok(fig)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Binomial(10,000, 0.01): mean 100, σ 9.95; the 99 % central interval from the normal
    // approximation is 100 ± 2.576 σ = 74.4–125.6, so the exact one is within a count or
    // two of 75–126 (common practice: the normal approximation is good at np = 100).
    #[test]
    fn binomial_interval_matches_the_normal_approximation() {
        let (lo, hi) = binomial_interval(10_000, 0.01);
        assert!((74..=77).contains(&lo), "{lo}");
        assert!((125..=128).contains(&hi), "{hi}");
        // p = 1e-3, n = 10,000: Poisson(10), whose 0.995 quantile is 19 (tables of the
        // Poisson distribution).
        assert_eq!(binomial_interval(10_000, 1e-3).1, 19);
    }
}
