//! Weierstrass curves over Q, their invariants, changes of model and points.

mod model;
pub(crate) mod change;
pub use model::{Curve, ModelChange};
