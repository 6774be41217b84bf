//! Weierstrass curves over Q, their invariants, changes of model and points.

mod model;
pub use model::{Curve, ModelChange};
