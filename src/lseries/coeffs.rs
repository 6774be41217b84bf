//! The Dirichlet coefficients `a_n` of `L(E, s)` by a sieve.

use crate::arith::primes_up_to;
use crate::curve::PointCounter;

/// `a_0 = 0, a_1 = 1, ..., a_m` from the traces at the good primes (counted
/// with `counter`) and `bad = [(p, a_p)]` at the bad primes (`a_p` in
/// `{-1, 0, 1}` from the reduction type): `a_{p^k}` by
/// `a_{p^k} = a_p a_{p^{k-1}} - p a_{p^{k-2}}` at good `p` and `a_p^k` at
/// bad `p`, and `a_{mn} = a_m a_n` for coprime `m, n`. One table of
/// smallest prime factors; no allocation per `n`.
pub(crate) fn coefficients_from(counter: &mut PointCounter, bad: &[(u64, i64)], m: usize) -> Vec<i64> {
    // invariant: the closure always returns Some, so coefficients_with never stops early
    coefficients_with(&mut |p| Some(counter.trace(p)), bad, m).expect("the exact counter never stops")
}

/// [`coefficients_from`] with the traces at the good primes from `trace`
/// (any exact counter); `None` as soon as `trace` answers `None` (the
/// caller's budget ended).
pub(crate) fn coefficients_with(trace: &mut dyn FnMut(u64) -> Option<i64>, bad: &[(u64, i64)], m: usize) -> Option<Vec<i64>> {
    let mut ap = vec![0i64; m + 1];
    let mut is_bad = vec![false; m + 1];
    for &(p, v) in bad {
        if (p as usize) <= m {
            ap[p as usize] = v;
            is_bad[p as usize] = true;
        }
    }
    let primes = primes_up_to(m as u64);
    for &p in &primes {
        if !is_bad[p as usize] {
            ap[p as usize] = trace(p)?;
        }
    }
    // Smallest prime factors.
    let mut spf = vec![0u32; m + 1];
    for &p in &primes {
        let p = p as usize;
        if spf[p] != 0 {
            continue;
        }
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
        while q.is_multiple_of(p) {
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
