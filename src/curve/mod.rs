//! Weierstrass curves over Q, their invariants, changes of model and points.

pub(crate) mod change;
mod display;
mod model;
mod parse;
mod point;
mod reduction;
#[cfg(feature = "serde")]
mod serde_forms;
pub(crate) use display::signed_terms;
pub use model::{Curve, ModelChange};
pub use parse::{parse_coefficients, parse_rational, MAX_INPUT_LEN};
pub use point::Point;
pub use reduction::PointCounter;
