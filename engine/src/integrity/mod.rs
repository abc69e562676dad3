//! Integrity (issue 9, in progress): the statistics its tests need. **Not yet called by
//! `engine.rs`**: the residual and innovation tests, protection levels and the integrity
//! state of each fix are to come (docs/integrity.md).
//!
//! - [`chi2`]: χ² quantiles for any degree of freedom and false-alarm probability;
//! - [`ncx2`]: the non-centrality a fault must reach to be detected with a given
//!   probability (the "pbias" of slope-based protection levels);
//! - [`slope`]: each satellite's slope in the weighted least-squares residual test;
//! - [`raim`]: identification and exclusion figures (normalised residual, statistic and
//!   position without each satellite) by closed forms, without re-solving.

pub mod chi2;
pub mod ncx2;
pub mod raim;
pub mod slope;
