//! Corrections to a pseudorange besides the satellite clock: the broadcast (Klobuchar)
//! ionosphere, the dual-frequency combination (`dual`, not yet called by the engine)
//! and the troposphere, and `site` (crate-private), which applies them to every
//! satellite seen from one receiver position.

pub mod dual;
pub mod iono;
pub(crate) mod site;
pub mod tropo;
