//! Heights on elliptic curves over Q: periods, canonical heights, the height
//! pairing and regulator, LLL reduction and saturation.

mod canonical;
mod real;

pub use canonical::{canonical_height, naive_height};
pub use real::PeriodLattice;

/// A malachite Float rounded to the nearest f64.
pub fn float_to_f64(x: &malachite::Float) -> f64 {
    real::to_f64(x)
}
