//! The engine: owns the ephemeris store, the configuration and what it remembers between
//! epochs, all in fixed memory. Time is passed in with each epoch; nothing reads a clock.

use crate::config::{Config, ConfigError, FilterMode};
use crate::corrections::iono::IonoCoefficients;
use crate::filter::track::{self, Context, Notes, Tracked};
use crate::frames::LocalFrame;
use crate::integrity::fde::{check, TestSetup, Verdict};
use crate::integrity::signals::{self, cn0_mean_spread};
use crate::integrity::table::Thresholds;
use crate::integrity::watch::Watch;
use crate::measurements::observation::{Epoch, Observation};
use crate::measurements::record::{Candidate, Fate, Measurement, Outcome};
use crate::nav::ephemeris::{BroadcastEphemeris, EphemerisError};
use crate::nav::store::{EphemerisStore, Ingested, StoredEphemeris};
use crate::sat::SPEED_OF_LIGHT;
use crate::snapshot::velocity::{solve_velocity, RateRow};
use crate::snapshot::wls::{solve, Setup};
use crate::solution::{
    DopplerUse, FilterEvent, Fix, FixKind, FixOutcome, FixSource, Flags, Integrity, IntegrityState,
    NoFixReason, SatStatus, SatUse, Solution, Velocity,
};
use crate::time::GnssTime;
use heapless::Vec;

/// Why an epoch was refused as a whole.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum EpochError {
    /// The epoch's time is not after the previous epoch's: the engine keeps time monotonic
    /// so that no state is applied out of order. Call [`Engine::reset_time`] after a
    /// deliberate rewind (e.g. a replay restarting).
    TimeNotIncreasing {
        /// Time of the previous epoch.
        previous: GnssTime,
        /// Time of the refused epoch.
        got: GnssTime,
    },
}

/// Why an input besides an epoch or an ephemeris was refused (the engine keeps what it had).
#[derive(Clone, Copy, Debug, PartialEq)]
#[cfg_attr(feature = "defmt", derive(defmt::Format))]
#[non_exhaustive]
pub enum InputError {
    /// A value is NaN or infinite.
    NotFinite,
    /// A position's ellipsoidal height lies outside the configured span.
    HeightOutOfSpan {
        /// The height found, m.
        height_m: f64,
    },
}

/// What solving an epoch gave: the fix (or why none), what the filter noticed and what the
/// residual test found.
struct Solved {
    result: Result<Fix, NoFixReason>,
    notes: Notes,
    verdict: Verdict,
}

/// The last 3-D fix, kept to seed the next solution and to hold height for a 2-D fix.
#[derive(Clone, Copy, Debug, PartialEq)]
struct Anchor {
    time: GnssTime,
    ecef_m: [f64; 3],
    height_m: f64,
}

/// The positioning engine for epochs of up to `N` observations and up to `EPH` stored
/// ephemerides. Memory is fixed: see `size_of` figures in the README. It can live in a
/// `static` (construction is `const`).
#[derive(Clone, Debug)]
pub struct Engine<const N: usize, const EPH: usize> {
    config: Config,
    store: EphemerisStore<EPH>,
    iono: Option<IonoCoefficients>,
    last_time: Option<GnssTime>,
    anchor: Option<Anchor>,
    tracked: Option<Tracked>,
    thresholds: Thresholds<N>,
    watch: Watch,
}

impl<const N: usize, const EPH: usize> Engine<N, EPH> {
    /// An engine with the default configuration, no ephemerides and no history; `const`,
    /// so it can live in a `static`.
    pub const fn with_defaults() -> Self {
        const { assert!(N >= 4, "an epoch must hold at least four observations") };
        Engine {
            config: Config::DEFAULT,
            store: EphemerisStore::new(),
            iono: None,
            last_time: None,
            anchor: None,
            tracked: None,
            thresholds: Thresholds::new(),
            watch: Watch::new(),
        }
    }

    /// An engine with `config`, no ephemerides and no history.
    ///
    /// # Errors
    /// The first field of `config` outside its documented range.
    pub fn new(config: Config) -> Result<Self, ConfigError> {
        config.validate()?;
        let mut engine = Self::with_defaults();
        engine.config = config;
        Ok(engine)
    }

    /// The configuration in force.
    pub fn config(&self) -> &Config {
        &self.config
    }

    /// Replaces the configuration (history and ephemerides are kept).
    ///
    /// # Errors
    /// The first field of `config` outside its documented range; the configuration in force
    /// stays.
    pub fn set_config(&mut self, config: Config) -> Result<(), ConfigError> {
        config.validate()?;
        self.config = config;
        Ok(())
    }

    /// The ephemeris store.
    pub fn store(&self) -> &EphemerisStore<EPH> {
        &self.store
    }

    /// Validates and stores a broadcast ephemeris (see [`EphemerisStore::ingest`]).
    ///
    /// # Errors
    /// What was wrong with the record, or a full store handing it back.
    pub fn ingest_ephemeris(
        &mut self,
        eph: BroadcastEphemeris,
    ) -> Result<Ingested, EphemerisError> {
        self.store.ingest(eph)
    }

    /// Sets the broadcast ionosphere coefficients.
    ///
    /// # Errors
    /// [`InputError::NotFinite`] for a NaN or infinite coefficient; the previous
    /// coefficients stay.
    pub fn set_ionosphere(&mut self, iono: IonoCoefficients) -> Result<(), InputError> {
        if !iono.is_finite() {
            return Err(InputError::NotFinite);
        }
        self.iono = Some(iono);
        Ok(())
    }

    /// Starts the next solution from a position the tracker remembers (kept in retained RAM
    /// or flash across a power cycle) instead of the Earth's centre: fewer iterations on the
    /// first epoch, and its height can hold a 2-D fix for `altitude_hold_max_age_s` after
    /// `time`.
    ///
    /// # Errors
    /// [`InputError::NotFinite`] for a non-finite position, [`InputError::HeightOutOfSpan`]
    /// for one whose height is outside the configured span; nothing is changed.
    pub fn seed_position(&mut self, ecef_m: [f64; 3], time: GnssTime) -> Result<(), InputError> {
        if !ecef_m.iter().all(|v| v.is_finite()) {
            return Err(InputError::NotFinite);
        }
        let height_m = crate::frames::Geodetic::from_ecef(ecef_m).height_m;
        let (lo, hi) = self.config.snapshot.height_span_m;
        if !(lo..=hi).contains(&height_m) {
            return Err(InputError::HeightOutOfSpan { height_m });
        }
        self.anchor = Some(Anchor {
            time,
            ecef_m,
            height_m,
        });
        Ok(())
    }

    /// Forgets the time of the last epoch and the last fix, e.g. before replaying again.
    pub fn reset_time(&mut self) {
        self.last_time = None;
        self.anchor = None;
        self.tracked = None;
        self.watch = Watch::new();
    }

    /// Computes the solution of one epoch.
    ///
    /// # Errors
    /// [`EpochError::TimeNotIncreasing`] when the epoch is not later than the previous one.
    /// Every other problem is reported inside the [`Solution`]: per observation in
    /// [`SatUse::status`], and for the epoch as [`FixOutcome::NoFix`].
    pub fn process(&mut self, epoch: &Epoch<N>) -> Result<Solution<N>, EpochError> {
        if let Some(previous) = self.last_time {
            if epoch.time <= previous {
                return Err(EpochError::TimeNotIncreasing {
                    previous,
                    got: epoch.time,
                });
            }
        }
        self.last_time = Some(epoch.time);

        let mut sats: Vec<SatUse, N> = Vec::new();
        // One record per screened observation, carried through every stage.
        let mut meas: Vec<Measurement, N> = Vec::new();
        for (i, obs) in epoch.obs.iter().enumerate() {
            let earlier = epoch.obs.iter().take(i);
            let range_rate = range_rate_mps(obs, &self.config);
            let status = match self.screen(obs, earlier, epoch.time, range_rate) {
                Ok(sat) => {
                    // Capacity N and at most one push per observation.
                    let _ = meas.push(Measurement {
                        index: i,
                        sat,
                        out: Outcome::default(),
                    });
                    SatStatus::NotSolved
                }
                Err(s) => s,
            };
            let _ = sats.push(SatUse {
                sat: obs.sat,
                signal: obs.signal,
                elevation_deg: None,
                azimuth_deg: None,
                residual_m: None,
                sigma_m: None,
                status,
                doppler: doppler_use(obs, range_rate),
                reflection: false,
            });
        }

        let t = epoch.time;
        let icfg = self.config.integrity;
        let prior = self.tracked.as_ref().map(Tracked::position);
        let prior = prior.or(self.anchor.map(|a| a.ecef_m));
        let reflections = match (icfg.enabled, prior) {
            (true, Some(at)) => signals::mark_reflections(&mut meas, &epoch.obs, at, &icfg),
            _ => 0,
        };
        if icfg.enabled {
            self.watch.keep_out(&mut meas, &epoch.obs, t);
        }
        let mut solved = Solved {
            result: Err(NoFixReason::NoConvergence),
            notes: Notes::default(),
            verdict: Verdict::default(),
        };
        self.solve_epoch(t, &mut meas, &mut solved);
        let Solved {
            result,
            notes,
            verdict,
        } = solved;
        let mut integrity = self.assess(&result, &verdict, &meas);
        integrity.reflections = reflections;
        if icfg.enabled {
            self.watch
                .remember(&meas, &epoch.obs, t, icfg.exclusion_hold_s);
            integrity.flags = self.flags(epoch, &notes, &result);
        }
        let filter_event = notes.event;
        self.mark(&result, &meas, &mut sats);
        let outcome = match result {
            Ok(fix) => {
                if fix.kind == FixKind::ThreeD {
                    self.anchor = Some(Anchor {
                        time: epoch.time,
                        ecef_m: fix.ecef_m,
                        height_m: fix.geodetic.height_m,
                    });
                }
                FixOutcome::Fix(fix)
            }
            Err(reason) => FixOutcome::NoFix(reason),
        };
        Ok(Solution {
            time: epoch.time,
            outcome,
            filter_event,
            integrity,
            sats,
        })
    }

    /// Checks one observation and, if usable, computes its satellite's state at transmit
    /// time. Returns the exclusion reason otherwise. `range_rate` is the observation's
    /// usable range rate from Doppler, if any.
    fn screen<'a>(
        &self,
        obs: &Observation,
        mut earlier: impl Iterator<Item = &'a Observation>,
        t_rx: GnssTime,
        range_rate: Option<f64>,
    ) -> Result<Candidate, SatStatus> {
        let cfg = &self.config;
        let system = obs.sat.system;
        if !cfg.uses(system) {
            return Err(SatStatus::SystemDisabled);
        }
        if cfg.signal(system) != obs.signal {
            return Err(SatStatus::SignalNotUsed);
        }
        let pr = obs.pseudorange_m;
        if pr == 0.0 {
            return Err(SatStatus::NotMeasured);
        }
        if !pr.is_finite()
            || !(cfg.measurements.pseudorange_span_m.0..=cfg.measurements.pseudorange_span_m.1)
                .contains(&pr)
        {
            return Err(SatStatus::BadPseudorange);
        }
        if earlier.any(|e| e.sat == obs.sat && e.signal == obs.signal) {
            return Err(SatStatus::Duplicate);
        }
        let cn0 = obs.cn0_dbhz.filter(|c| c.is_finite() && *c > 0.0);
        if let Some(c) = cn0 {
            if c < cfg.measurements.cn0_mask_dbhz {
                return Err(SatStatus::WeakSignal);
            }
        }
        let held: &StoredEphemeris = self.store.get(obs.sat).ok_or(SatStatus::NoEphemeris)?;
        if held.eph.health != 0 {
            return Err(SatStatus::Unhealthy);
        }
        if held.age_at_transmit_s(t_rx, pr).abs() > cfg.nav.max_ephemeris_age_s {
            return Err(SatStatus::Stale);
        }
        let state = held.state_at_transmit(t_rx, pr);
        let clock_s = state.clock_s - held.eph.group_delay_s(obs.signal);
        // σ grows as √(10^(deficit/10)) = 10^(deficit/20) = e^(deficit·ln 10/20); single
        // precision is ample for a weight (and `expf` is the float library's exponential the
        // target links anyway, where `powf` would add 700 B).
        let cn0_factor = cn0.map_or(1.0, |c| {
            let deficit = (cfg.snapshot.cn0_reference_dbhz - c).max(0.0);
            libm::expf(deficit * (core::f32::consts::LN_10 / 20.0))
        });
        Ok(Candidate {
            pos: state.pos,
            clock_m: clock_s * SPEED_OF_LIGHT,
            pr_m: pr,
            sys: system.index(),
            cn0_factor,
            iono_scale: obs.signal.iono_scale_from_l1() as f32,
            vel: state.vel,
            clock_drift_mps: state.clock_drift * SPEED_OF_LIGHT,
            range_rate_mps: range_rate,
            reflection: false,
        })
    }

    /// The epoch's fix, into `out`: the navigation filter's while it tracks; otherwise the
    /// least-squares solution, which (in tracking mode) starts the filter. Also what the
    /// filter noticed and what the residual test found. (Written in place: a fix is half a
    /// kilobyte, and this frame sits under the filter's.)
    #[inline(never)]
    fn solve_epoch(&mut self, t: GnssTime, meas: &mut [Measurement], out: &mut Solved) {
        if self.config.filter.mode != FilterMode::Tracking {
            self.tracked = None;
            self.checked_snapshot(t, meas, out);
            return;
        }
        let ctx = Context {
            cfg: &self.config,
            iono: self.iono.as_ref(),
            tow_s: t.tow_s(),
            time: t,
        };
        let event = match track::predict(&mut self.tracked, &ctx, meas) {
            Ok(predicted) => {
                // The residual test on the innovations, before the update uses them.
                let pending = |o: &Outcome| o.fate == Fate::Pending;
                let frame = predicted.frame();
                out.verdict = test(&mut self.thresholds, &self.config, meas, pending, frame);
                match track::update(&mut self.tracked, &ctx, meas, predicted, &mut out.result) {
                    Ok(notes) => {
                        out.notes = notes;
                        return;
                    }
                    Err(event) => event,
                }
            }
            Err(event) => event,
        };
        for m in meas.iter_mut() {
            let kept = m.out.fate == Fate::KeptOut;
            m.out = Outcome::default();
            if kept {
                m.out.fate = Fate::KeptOut;
            }
        }
        self.checked_snapshot(t, meas, out);
        match &out.result {
            Ok(fix) => track::start(&mut self.tracked, fix, t),
            Err(_) => self.tracked = None,
        }
        out.notes.event = match (event, &self.tracked) {
            (FilterEvent::Started, None) => FilterEvent::None,
            (FilterEvent::CoastEnded, _) | (_, None) => event,
            (FilterEvent::None, Some(_)) => FilterEvent::Started,
            (e, Some(_)) => e,
        };
    }

    /// The least-squares solution with the residual test, into `out`: after an exclusion,
    /// solved once more without the excluded satellites, from the first solution's position.
    #[inline(never)]
    fn checked_snapshot(&mut self, t: GnssTime, meas: &mut [Measurement], out: &mut Solved) {
        out.result = self.snapshot(t, meas, None);
        let Ok(fix) = &out.result else {
            return;
        };
        let frame = LocalFrame::new(fix.ecef_m, &fix.geodetic);
        let seed = fix.ecef_m;
        out.verdict = test(
            &mut self.thresholds,
            &self.config,
            meas,
            Outcome::used,
            &frame,
        );
        if out.verdict.excluded > 0 {
            out.result = self.snapshot(t, meas, Some(seed));
        }
    }

    /// The integrity of the epoch's fix: its state and protection levels from the residual
    /// test's verdict.
    fn assess(
        &mut self,
        result: &Result<Fix, NoFixReason>,
        verdict: &Verdict,
        meas: &[Measurement],
    ) -> Integrity {
        let limit = self.one_dof_limit();
        let excluded = meas
            .iter()
            .filter(|m| m.out.fate.is_exclusion(limit))
            .count();
        let mut out = Integrity {
            statistic: verdict.statistic as f32,
            threshold: verdict.threshold as f32,
            dof: verdict.dof,
            excluded: u8::try_from(excluded).unwrap_or(u8::MAX),
            ..Integrity::default()
        };
        let Ok(fix) = result else {
            return out;
        };
        if !self.config.integrity.enabled || fix.source == FixSource::Predicted || verdict.dof == 0
        {
            return out;
        }
        if !verdict.passed {
            out.state = IntegrityState::Alert;
            return out;
        }
        if let Some((h, v)) = verdict.levels {
            out.hpl_m = Some(h as f32);
            out.vpl_m = Some(v as f32);
            out.state = if excluded > 0 {
                IntegrityState::FaultExcluded
            } else {
                IntegrityState::Verified
            };
        }
        out
    }

    /// The residual test's threshold for one degree of freedom: beyond it, the filter's
    /// innovation test excludes at the residual test's false-alarm probability.
    fn one_dof_limit(&mut self) -> f32 {
        let c = self.config.integrity;
        self.thresholds
            .get(1, c.false_alarm, c.integrity_risk)
            .map_or(f32::INFINITY, |(t, _)| t as f32)
    }

    /// The interference and spoofing indicators of the epoch.
    #[inline(never)]
    fn flags(
        &mut self,
        epoch: &Epoch<N>,
        notes: &Notes,
        result: &Result<Fix, NoFixReason>,
    ) -> Flags {
        let c = self.config.integrity;
        let mut flags = Flags::default();
        let (mean, spread, n) = cn0_mean_spread(epoch.obs.iter().filter_map(|o| o.cn0_dbhz));
        if n > 0 {
            let drop = self.watch.cn0_drop(mean, epoch.time);
            if signals::jammed(drop, n, &c) {
                flags.insert(Flags::JAMMING);
            }
        }
        if signals::uniform(spread, n, &c) {
            flags.insert(Flags::UNIFORM_CN0);
        }
        // Within continuous tracking only: a wake-up's new clock and a parked asset moved
        // while the receiver slept are receiver events.
        let continuous = notes.dt_s > 0.0 && notes.dt_s <= 5.0;
        if continuous && notes.clock_shift_m != 0.0 && signals::odd_clock_jump(notes.clock_shift_m)
        {
            flags.insert(Flags::CLOCK_JUMP);
        }
        if let (Ok(fix), Some(a)) = (result, self.anchor) {
            let dt = epoch.time.since(a.time).as_secs_f64();
            let moved = crate::frames::norm(crate::frames::sub(fix.ecef_m, a.ecef_m));
            if signals::too_fast(moved, dt, &c) {
                flags.insert(Flags::INCONSISTENT_MOTION);
            }
        }
        // The hold's release test runs at 0.999: the flag asks the integrity test's own
        // false-alarm probability of the same spread.
        if let (true, Some((x, k))) = (continuous, notes.moved_without_doppler) {
            let t = self
                .thresholds
                .get(usize::from(k), c.false_alarm, c.integrity_risk);
            if t.is_some_and(|(t, _)| f64::from(x) > t) {
                flags.insert(Flags::DOPPLER_MISMATCH);
            }
        }
        flags
    }

    /// The least-squares solution of the epoch with its Doppler velocity.
    /// `seed` overrides the last fix as the starting point.
    #[inline(never)]
    fn snapshot(
        &self,
        t: GnssTime,
        meas: &mut [Measurement],
        seed: Option<[f64; 3]>,
    ) -> Result<Fix, NoFixReason> {
        let hold_height_m = self.anchor.and_then(|a| {
            (t.since(a.time).as_secs_f64() <= self.config.snapshot.altitude_hold_max_age_s)
                .then_some(a.height_m)
        });
        let setup = Setup {
            config: &self.config,
            iono: self.iono.as_ref(),
            tow_s: t.tow_s(),
            seed: seed.unwrap_or(self.anchor.map_or([0.0; 3], |a| a.ecef_m)),
            hold_height_m,
        };
        let mut fix = solve(meas, &setup)?;
        fix.velocity = self.velocity(&fix, meas);
        Ok(fix)
    }

    /// Writes into `sats` what the solution made of each measurement.
    fn mark(&self, result: &Result<Fix, NoFixReason>, meas: &[Measurement], sats: &mut [SatUse]) {
        let snapshot = result
            .as_ref()
            .is_ok_and(|f| f.source == FixSource::Snapshot);
        let sigma = self.config.snapshot.doppler_sigma_mps;
        for m in meas {
            let (c, o) = (&m.sat, &m.out);
            let Some(s) = sats.get_mut(m.index) else {
                continue;
            };
            if let Some((el, az)) = o.el_az {
                s.elevation_deg = Some(el.to_degrees());
                s.azimuth_deg = Some(crate::frames::azimuth_from_atan2(az.to_degrees(), 360.0));
            }
            match o.fate {
                Fate::Masked => s.status = SatStatus::BelowMask,
                Fate::Gated { nis } => s.status = SatStatus::Gated { nis },
                Fate::Used if result.is_ok() => {
                    s.status = SatStatus::Used;
                    s.residual_m = Some(o.residual_m);
                    s.sigma_m = Some(o.sigma_m as f32);
                }
                Fate::Excluded { statistic } => s.status = SatStatus::Excluded { statistic },
                Fate::KeptOut => s.status = SatStatus::KeptOut,
                Fate::Used | Fate::Pending => {}
            }
            s.reflection = c.reflection;
            let rate_residual = match (snapshot, result) {
                (true, Ok(fix)) => fix.velocity.and_then(|v| {
                    RateRow::of(c, o, sigma)
                        .map(|row| row.residual(v.ecef_mps, v.clock_drift_mps) as f32)
                }),
                _ => o.rate_innovation_mps,
            };
            if let Some(residual_mps) = rate_residual {
                s.doppler = DopplerUse::Used { residual_mps };
            }
        }
    }

    /// The velocity from the Doppler of the candidates the fix used.
    fn velocity(&self, fix: &Fix, meas: &[Measurement]) -> Option<Velocity> {
        let sigma = self.config.snapshot.doppler_sigma_mps;
        let rows = meas
            .iter()
            .filter_map(|m| RateRow::of(&m.sat, &m.out, sigma));
        let frame = LocalFrame::new(fix.ecef_m, &fix.geodetic);
        solve_velocity(rows, &frame)
    }
}

/// The residual test over the measurements `tested` accepts (nothing when integrity is
/// off).
fn test<const N: usize>(
    thresholds: &mut Thresholds<N>,
    config: &Config,
    meas: &mut [Measurement],
    tested: fn(&Outcome) -> bool,
    frame: &LocalFrame,
) -> Verdict {
    let c = &config.integrity;
    if !c.enabled {
        return Verdict::default();
    }
    check(
        meas,
        tested,
        &mut TestSetup {
            frame,
            table: thresholds,
            false_alarm: c.false_alarm,
            integrity_risk: c.integrity_risk,
            max_exclusions: c.max_exclusions,
            ure_sigma_m: config.filter.ure_sigma_m,
            reflection_scale: c.reflection_sigma_factor * c.reflection_sigma_factor,
        },
    )
}

/// The observation's range rate −λ·D in m/s, when its Doppler is reported (zero is
/// missing), finite and within the configured magnitude.
fn range_rate_mps(obs: &Observation, cfg: &Config) -> Option<f64> {
    let d = obs.doppler_hz.filter(|d| *d != 0.0)?;
    let rate = -d * SPEED_OF_LIGHT / obs.signal.frequency_hz();
    (rate.is_finite() && rate.abs() <= cfg.measurements.max_range_rate_mps).then_some(rate)
}

/// The first word on an observation's Doppler, given its usable range rate `range_rate`
/// (from [`range_rate_mps`]): missing, refused, or usable.
fn doppler_use(obs: &Observation, range_rate: Option<f64>) -> DopplerUse {
    match (obs.doppler_hz, range_rate) {
        (None | Some(0.0), _) => DopplerUse::NotReported,
        (Some(_), None) => DopplerUse::Rejected,
        (Some(_), Some(_)) => DopplerUse::NotUsed,
    }
}
