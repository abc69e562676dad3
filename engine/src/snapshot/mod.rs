//! The snapshot solution: one epoch's weighted least squares, DOP and residuals, and the
//! velocity and clock drift from Doppler.

pub(crate) mod velocity;
pub(crate) mod wls;
