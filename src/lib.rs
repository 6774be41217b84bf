//! twofold: Mordell-Weil ranks of elliptic curves over Q by 2-descent.
#![forbid(unsafe_code)]

pub mod arith;
pub mod budget;
pub mod certificate;
pub mod curve;
pub mod descent;
pub mod local;
pub mod quartic;
pub mod report;
pub mod rootno;
pub mod search;
pub mod solubility;
pub mod torsion;
mod error;

pub use budget::{RankOptions, Stage};
pub use curve::{Curve, ModelChange, Point};
pub use error::{Error, ErrorKind};
pub use report::{analyse, RankReport, Route, ShaSuspect};
