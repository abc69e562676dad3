//! Corrections to a pseudorange besides the satellite clock: the broadcast (Klobuchar)
//! ionosphere and the troposphere, and `site` (crate-private), which applies them to every
//! satellite seen from one receiver position. The dual-frequency combination (`dual`) and
//! differential corrections (`dgnss`) are not yet called by the engine.

pub mod dgnss;
pub mod dual;
pub mod iono;
pub(crate) mod site;
pub mod tropo;
