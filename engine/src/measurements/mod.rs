//! Measurements as the receiver reports them, and the record each screened one becomes.

pub mod observation;
pub(crate) mod record;
