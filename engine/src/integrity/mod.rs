//! Integrity (issue 9, in progress): the statistics its tests need. **Not yet called by
//! `engine.rs`**: the residual and innovation tests, protection levels and the integrity
//! state of each fix are to come (docs/integrity.md).
//!
//! - [`chi2`]: χ² quantiles for any degree of freedom and false-alarm probability.

pub mod chi2;
