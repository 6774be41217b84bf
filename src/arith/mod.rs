//! Integer arithmetic: primes, valuations, residue symbols, square roots
//! modulo primes, factorisation and Hilbert symbols.
//!
//! Word-sized kernels (`u64`, `i64`, with `u128` intermediates) sit beside
//! functions on malachite [`Integer`](malachite::Integer)s; the big-integer
//! functions dispatch to the word kernels when the value fits.

mod word;
mod symbols;
mod primality;
mod mont;
mod factor;
mod siqs;
mod sqrt;
mod hilbert;

pub use word::{is_prime_u64, primes_up_to};
pub(crate) use word::{gcd_u64, inv_mod, is_small_prime, mul_mod, pow_mod};
pub use symbols::{jacobi_u64, kronecker_i64, jacobi, kronecker, valuation, sqrt_mod_prime, is_square};
pub use primality::{is_probable_prime, is_probable_prime_within};
pub use factor::{factor, factor_u64, FactorLimits, Factorization};
pub(crate) use factor::factor_with_known_primes;
pub use sqrt::sqrt_mod_prime_power;
pub use hilbert::{hilbert_symbol, hilbert_symbol_integers, Place};

impl FactorLimits {
    /// The limits of `work`: its deadline and cancellation flag.
    ///
    /// ```
    /// use twofold::{arith::FactorLimits, Work};
    /// assert!(format!("{:?}", FactorLimits::within(&Work::unlimited())).contains("deadline: None"));
    /// ```
    pub fn within(work: &crate::budget::Work) -> FactorLimits {
        FactorLimits { deadline: work.deadline(), cancel: work.cancel_flag().cloned() }
    }
}

#[cfg(feature = "serde")]
crate::decimal_serde::place_form!(arith);
