//! The Dirichlet coefficients `a_n` of `L(E, s)` for the modular
//! parametrisation, from the Frobenius traces `a_p` of the shared
//! baby-step giant-step counter of the analytic route
//! ([`crate::lproof`]'s trace oracle: Shanks' method with Mestre's use of
//! the quadratic twist, H. Cohen, A Course in Computational Algebraic
//! Number Theory, 1993, Algorithm 7.4.12; the exact character sum below its
//! threshold and whenever the search is undecided).

use crate::curve::Curve;
use crate::lproof::TraceOracle;

/// The Dirichlet coefficients `a_0 = 0, a_1, ..., a_m` of `L(E, s)` from the
/// traces at the good primes and `bad = [(p, a_p)]` (`a_p` in `{-1, 0, 1}`)
/// at the primes dividing the conductor, by the Hecke recursion at prime
/// powers and multiplicativity.
pub(crate) fn dirichlet_coefficients_fast(
    curve: &Curve,
    bad: &[(u64, i64)],
    m: usize,
    stop: &dyn Fn() -> bool,
) -> Option<Vec<i64>> {
    let mut a = Vec::new();
    extend_dirichlet_coefficients(&mut a, curve, bad, m, stop)?;
    Some(a)
}

/// Extends the coefficients `a` of [`dirichlet_coefficients_fast`] (or an
/// empty vector) to `a_0, ..., a_m`, counting points only at the new primes;
/// `None` (and `a` unchanged) when `stop` answers `true`.
pub(crate) fn extend_dirichlet_coefficients(a: &mut Vec<i64>, curve: &Curve, bad: &[(u64, i64)], m: usize, stop: &dyn Fn() -> bool) -> Option<()> {
    let mut oracle = TraceOracle::new(curve);
    let mut asked = 0u32;
    crate::lseries::extend_coefficients_with(
        a,
        &mut |p| {
            asked = asked.wrapping_add(1);
            if asked % 1024 == 0 && stop() {
                return None;
            }
            Some(oracle.trace(p))
        },
        bad,
        m,
    )
}
