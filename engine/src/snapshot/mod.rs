//! The snapshot solution: one epoch's weighted least squares, DOP and residuals.

pub(crate) mod wls;
