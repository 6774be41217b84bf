//! Heights on elliptic curves over Q: periods, canonical heights, the height
//! pairing and regulator, LLL reduction and saturation.

mod basis;
mod canonical;
mod lattice;
mod real;
mod saturation;

pub use canonical::{canonical_height, naive_height};
pub use real::PeriodLattice;
pub use basis::{height_difference_bound, is_p_saturated, local_height_bound, mordell_weil_basis, MordellWeilBasis, Saturation, SaturationOptions};
pub use lattice::{height_pairing_matrix, lll_reduce, regulator, LllReduction};

/// A malachite Float rounded to the nearest f64.
pub fn float_to_f64(x: &malachite::Float) -> f64 {
    real::to_f64(x)
}
