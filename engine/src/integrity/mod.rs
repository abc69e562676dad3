//! Integrity: how far each fix can be trusted (docs/integrity.md).
//!
//! The engine calls this stage around the solution, in data-flow order:
//! 1. before it, `signals::mark_reflections` down-weights pseudoranges whose C/N0 is far
//!    below what their elevation leads to expect, and `watch::Watch::keep_out` keeps out
//!    the satellites excluded in the last `integrity.exclusion_hold_s`;
//! 2. on the solution's residuals (the least squares' post-fit residuals, or the filter's
//!    innovations before its update), `fde::check` tests, identifies, excludes and bounds
//!    what is left with the protection levels;
//! 3. after it, the engine sets the state, and the indicators of `signals` judge the
//!    signals as a whole.
//!
//! The statistics behind them:
//! - [`chi2`]: χ² quantiles for any degree of freedom and false-alarm probability;
//! - [`ncx2`]: the non-centrality a fault must reach to be detected with a given
//!   probability (the "pbias" of slope-based protection levels);
//! - `table`: both, per degree of freedom, from the built-in table of the default
//!   probabilities or computed once per configuration;
//! - [`slope`]: each satellite's slope in the weighted least-squares residual test;
//! - [`raim`]: identification and exclusion figures (normalised residual, statistic and
//!   position without each satellite) by closed forms, without re-solving.

pub mod chi2;
pub(crate) mod default_table;
pub(crate) mod fde;
pub mod ncx2;
pub mod raim;
pub(crate) mod signals;
pub mod slope;
pub(crate) mod table;
pub(crate) mod watch;
