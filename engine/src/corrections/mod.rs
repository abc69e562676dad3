//! Corrections to a pseudorange besides the satellite clock: the broadcast (Klobuchar)
//! ionosphere and the troposphere.

pub mod iono;
pub mod tropo;
