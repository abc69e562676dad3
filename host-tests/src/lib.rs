//! Host test harness for the Trackfix engine: RINEX replay, precise-orbit reading,
//! synthetic scenarios and accuracy metrics. The engine code it drives is the same code
//! the firmware links.

pub mod data;
pub mod dgnss;
pub mod export;
pub mod faults;
pub mod manifest;
pub mod metrics;
pub mod record;
pub mod replay;
pub mod rinex;
pub mod scenario;
pub mod sp3;
pub mod synth;
pub mod truth;
