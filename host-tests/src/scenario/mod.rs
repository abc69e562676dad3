//! Synthetic scenarios: a spec ([`spec`]), a trajectory ([`motion`]), a generator of epochs
//! and truth ([`generate`]), and a runner that feeds them through the engine.

pub mod generate;
pub mod motion;
pub mod spec;

use crate::record::EpochRecord;
use crate::truth::Mutation;
use generate::{Generator, GEN_N, SCENARIO_IONO};
pub use spec::ScenarioSpec;
use trackfix_engine::{Config, Engine};

/// Ephemeris slots of the scenario engine (30 GPS + 24 Galileo + 32 BeiDou + margin).
pub const SCENARIO_EPH: usize = 96;

/// Runs a scenario through an engine with `config`.
///
/// # Errors
/// A message naming the scenario field that cannot be used.
pub fn run(spec: &ScenarioSpec, config: Config) -> Result<Vec<EpochRecord>, String> {
    run_mutated(spec, config, Mutation::default())
}

/// Runs a scenario whose truth models carry a deliberate error (see [`Mutation`]): the
/// engine's models then disagree with the measurements as a mistake in the engine would
/// make them disagree.
///
/// # Errors
/// As [`run`].
pub fn run_mutated(
    spec: &ScenarioSpec,
    config: Config,
    mutation: Mutation,
) -> Result<Vec<EpochRecord>, String> {
    let gen = Generator::new(spec)?.with_mutation(mutation);
    let mut engine: Box<Engine<GEN_N, SCENARIO_EPH>> =
        Box::new(Engine::new(config).map_err(|e| format!("engine configuration: {e}"))?);
    engine
        .set_ionosphere(SCENARIO_IONO)
        .map_err(|e| format!("scenario ionosphere: {e}"))?;
    let mut out = Vec::new();
    for g in gen {
        for e in &g.new_ephemerides {
            let _ = engine.ingest_ephemeris(*e);
        }
        if let Ok(sol) = engine.process(&g.epoch) {
            let mut record = EpochRecord::from_solution(&sol, Some(g.truth_ecef), g.wake_start);
            record.truth_velocity_ecef_mps = Some(g.truth_velocity_ecef);
            record.reflected_truth = g.reflected;
            out.push(record);
        }
    }
    Ok(out)
}

/// Reads a scenario from TOML text; `origin` names the source in errors.
///
/// # Errors
/// The TOML parser's message, which names the line, column and the unknown or bad key.
pub fn parse(text: &str, origin: &str) -> Result<ScenarioSpec, String> {
    toml::from_str(text).map_err(|e| format!("{origin}: {e}"))
}
