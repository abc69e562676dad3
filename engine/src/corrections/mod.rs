//! Corrections to a pseudorange besides the satellite clock: the broadcast (Klobuchar)
//! ionosphere and the troposphere, and `site` (crate-private), which applies them to every
//! satellite seen from one receiver position.

pub mod iono;
pub(crate) mod site;
pub mod tropo;
