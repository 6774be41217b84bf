//! Heights on elliptic curves over Q: the period lattice, canonical heights
//! as sums of local heights, the height pairing and regulator, LLL
//! reduction, and saturation of a set of points (issue 5).
//!
//! # Normalisation
//!
//! `hhat(P) = lim h(x(nP)) / n^2` with `h(a/b) = log max(|a|, |b|)`: the
//! normalisation in which the regulator enters the Birch and
//! Swinnerton-Dyer formula ((0, 0) on `y^2 + y = x^3 - x` has height
//! 0.0511114082...); twice the height of Silverman's 1988 paper. The height
//! pairing is `<P, Q> = (hhat(P + Q) - hhat(P) - hhat(Q)) / 2`, so that
//! `<P, P> = hhat(P)`, and the regulator is `det <P_i, P_j>`.
//!
//! # What is proven and what is numerical
//!
//! | statement | status |
//! |---|---|
//! | points on the curve, sums, multiples, divisions `pQ = g + t` | exact (rational arithmetic) |
//! | torsion points have height 0 | exact (order found by the group law) |
//! | non-archimedean local heights | exact rational multiples of `log p` (Silverman 1988, Thm 5.2), cross-checked with the Kodaira symbol |
//! | archimedean local height, periods, heights, pairing, regulator | numerical, about the requested number of bits (no interval arithmetic) |
//! | LLL dependencies removed | exact: each removed combination is checked to be torsion |
//! | height-difference bound `hhat >= h(x) - B` | from the local decomposition ([`local_height_bound`]: exact at the finite primes, a sampled infimum with a factor-2 margin at infinity): numerical with a margin; Silverman's 1990 bound (constants from memory) only as a fallback |
//! | index bound `index^2 <= gamma_r^r Reg / lambda^r` | rests on the numerical regulator and heights (relative margin 1e-6) and on the difference bound with a complete point search |
//! | p-saturation for each listed prime | exact (Siksek's test: the reductions, the group law mod q and the F_p ranks are exact) |
//!
//! So "saturated" from [`mordell_weil_basis`] means: proven at every prime
//! up to the index bound, where the bound itself is numerical with margins.
//!
//! # Example
//!
//! ```
//! use malachite::Natural;
//! use twofold::{Curve, Point};
//! use twofold::local::bad_primes_data;
//! use twofold::heights::{mordell_weil_basis, PeriodLattice, SaturationOptions};
//! // y^2 + y = x^3 + x^2 - 2x (published tables, Cremona 1997: rank 2, regulator 0.152460177943..., from memory)
//! let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
//! let local = bad_primes_data(&e, &[Natural::from(389u32)]).unwrap();
//! let pts = [Point::from_ints(0, 0), Point::from_ints(1, 0)];
//! let b = mordell_weil_basis(&e, &pts, &local, 96, &SaturationOptions::default()).unwrap();
//! assert_eq!(b.generators.len(), 2);
//! assert!(b.saturation.is_saturated());
//! assert!((b.regulator_f64() - 0.152460177943).abs() < 1e-10);
//! let omega = PeriodLattice::compute(&e, 96).unwrap().real_period_f64();
//! assert!(omega > 0.0);
//! ```

#![deny(missing_docs)]

mod basis;
mod canonical;
mod lattice;
pub(crate) mod elliptic;
pub(crate) mod real;
mod saturation;

pub use basis::{
    height_difference_bound, is_p_saturated, local_height_bound, mordell_weil_basis, mordell_weil_basis_of, MordellWeilBasis, Saturation,
    SaturationOptions,
};
pub use canonical::{canonical_height, canonical_height_of, canonical_height_on_model, local_heights, naive_height, LocalHeights};
pub use lattice::{height_pairing_matrix, lll_reduce, regulator, LllReduction};
pub use real::PeriodLattice;

/// A malachite Float rounded to the nearest f64.
///
/// ```
/// use twofold::heights::float_to_f64;
/// assert_eq!(float_to_f64(&malachite::Float::from(1.5f64)), 1.5);
/// ```
pub fn float_to_f64(x: &malachite::Float) -> f64 {
    real::to_f64(x)
}
