//! Weierstrass curves over Q, their invariants, changes of model and points.

mod model;
mod parse;
mod point;
pub use model::{Curve, ModelChange};
pub use parse::{parse_ainvs, parse_rational, MAX_INPUT_LEN};
pub use point::Point;
mod reduction;
