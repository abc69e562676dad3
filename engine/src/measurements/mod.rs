//! Measurements as the receiver reports them.

pub mod observation;
