//! twofold: Mordell-Weil ranks of elliptic curves over Q by 2-descent.
#![forbid(unsafe_code)]

pub mod arith;
pub mod curve;
pub mod quartic;
mod error;

pub use curve::{Curve, ModelChange};
pub use error::{Error, ErrorKind};
