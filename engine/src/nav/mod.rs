//! Navigation data: the broadcast ephemeris with its user algorithm, and the causal store
//! that holds one record per satellite.

pub mod ephemeris;
pub mod store;
