//! The navigation filter's core: a ten-state extended Kalman filter in fixed memory.
//!
//! - [`state`]: the state layout (ECEF position and velocity, receiver clock bias and drift,
//!   Galileo − GPS and BeiDou − GPS inter-system biases), [`FilterState`] with its
//!   covariance, constructors that refuse non-finite, asymmetric or indefinite input, and a
//!   Cholesky test of positive definiteness;
//! - [`noise`]: the process-noise parameters as plain data with `validate()` —
//!   [`MotionProfile`] (white-acceleration PSDs, horizontal and vertical, with presets for a
//!   static asset, a pedestrian, a road vehicle, a ship and a train), [`ClockNoise`] (Allan
//!   coefficients, TCXO preset) and [`ProcessNoise`] (both, plus the inter-system bias walk);
//! - [`process`]: [`FilterState::predict`] over a step `dt`;
//! - [`update`]: [`FilterState::update`], one scalar measurement with a χ²(1) gate, in Joseph
//!   form; a measurement more than 10¹² times more precise than the state along its row is
//!   refused ([`update::MAX_VARIANCE_RATIO`]), because f64 could not keep `P` positive
//!   definite after it.
//!
//! # Model
//! ```text
//! x = [p (3), v (3), b, ḃ, isb_E, isb_C]            ECEF, metres and m/s
//!
//! predict:  x' = F x,  P' = F P Fᵀ + Q(dt)
//!   F: p' = p + v·dt,  b' = b + ḃ·dt, the rest unchanged
//!   Q_pp = A dt³/3,  Q_pv = A dt²/2,  Q_vv = A dt,   A = q_h I₃ + (q_v − q_h) u uᵀ
//!        (u: the local up direction; white acceleration of PSD q_h east and north, q_v up)
//!   Q_bb = c²(S_f dt + S_g dt³/3),  Q_bḃ = c² S_g dt²/2,  Q_ḃḃ = c² S_g dt
//!        (S_f = h0/2, S_g = 2π² h₋₂: Brown & Hwang's two-state clock model [M])
//!   Q_isb = q_isb dt  (random walk)
//!
//! update (scalar, sequential):  u = P h,  S = hᵀu + R,  NIS = ν²/S,  gated if NIS > gate;
//!   otherwise k = u/S,  x' = x + k ν,
//!   P' = (I − k hᵀ) P (I − k hᵀ)ᵀ + k R kᵀ     (Joseph form, expanded to O(n²))
//! ```
//! Sources: the constant-velocity model with white acceleration and the Joseph form from
//! Bar-Shalom, Li & Kirubarajan, "Estimation with Applications to Tracking and Navigation"
//! (2001) \[M\]; the clock model from Brown & Hwang, "Introduction to Random Signals and Applied
//! Kalman Filtering" \[M\]; the presets' reasoning in [`noise`]. Checked against filterpy's
//! `KalmanFilter` (host-tests/tests/filter_reference.rs), by closed forms (this module's unit
//! tests) and by a property test that random valid and invalid steps keep the state finite
//! and positive definite (host-tests/tests/filter_properties.rs).
//!
//! # Cost (n = 10)
//! A prediction costs about 105 multiplications, four divisions and one square root; a
//! pseudorange update about 197 multiplications and two divisions (counts in [`process`]
//! and [`update`]). Neither forms a dense 10×10 product. A state is 880 bytes; neither step
//! keeps a second matrix on the stack (about 300 and 400 bytes of vectors).
//!
//! # Panics
//! Nothing here panics, whatever the input: every index is checked, and every step that
//! would leave a state non-finite, out of range or with a non-positive variance is refused
//! with the state unchanged.

pub mod batch;
pub mod hold;
pub mod noise;
pub mod process;
pub(crate) mod report;
pub mod state;
pub(crate) mod track;
pub mod update;
pub mod window;

pub use batch::Batch;
pub use noise::{ClockNoise, MotionProfile, ParameterError, ProcessNoise};
pub use process::PredictError;
pub use state::{FilterState, FixPrior, StateError};
pub use update::{MeasurementRow, UpdateError, UpdateOutcome};
