//! The Dirichlet coefficients `a_n` of `L(E, s)` for the modular
//! parametrisation, from the Frobenius traces `a_p` of the shared
//! baby-step giant-step counter of the analytic route
//! ([`crate::lproof`]'s trace oracle: Shanks' method with Mestre's use of
//! the quadratic twist, H. Cohen, A Course in Computational Algebraic
//! Number Theory, 1993, Algorithm 7.4.12; the exact character sum below its
//! threshold and whenever the search is undecided).

use crate::arith::primes_up_to;
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
    let mut counter = TraceOracle::new(curve);
    let mut ap = vec![0i64; m + 1];
    let mut is_bad = vec![false; m + 1];
    for &(p, v) in bad {
        if (p as usize) <= m {
            ap[p as usize] = v;
            is_bad[p as usize] = true;
        }
    }
    let primes = primes_up_to(m as u64);
    for (i, &p) in primes.iter().enumerate() {
        if i % 1024 == 1023 && stop() {
            return None;
        }
        if !is_bad[p as usize] {
            ap[p as usize] = counter.trace(p);
        }
    }
    let mut spf = vec![0u32; m + 1];
    for &p in &primes {
        let p = p as usize;
        let mut k = p;
        while k <= m {
            if spf[k] == 0 {
                spf[k] = p as u32;
            }
            k += p;
        }
    }
    let mut a = vec![0i64; m + 1];
    if m >= 1 {
        a[1] = 1;
    }
    for n in 2..=m {
        let p = spf[n] as usize;
        if p == n {
            a[n] = ap[p];
            continue;
        }
        let mut q = n / p;
        let mut pk = p;
        while q % p == 0 {
            q /= p;
            pk *= p;
        }
        a[n] = if q > 1 {
            a[pk] * a[q]
        } else if is_bad[p] {
            ap[p] * a[n / p]
        } else {
            ap[p] * a[n / p] - (p as i64) * a[n / p / p]
        };
    }
    Some(a)
}
