//! The Dirichlet coefficients `a_n` of `L(E, s)` by a sieve.

use crate::arith::primes_up_to;
#[cfg(test)]
use crate::curve::PointCounter;

/// `a_0 = 0, a_1 = 1, ..., a_m` from the traces at the good primes (counted
/// with `counter`) and `bad = [(p, a_p)]` at the bad primes (`a_p` in
/// `{-1, 0, 1}` from the reduction type): `a_{p^k}` by
/// `a_{p^k} = a_p a_{p^{k-1}} - p a_{p^{k-2}}` at good `p` and `a_p^k` at
/// bad `p`, and `a_{mn} = a_m a_n` for coprime `m, n`. One table of
/// smallest prime factors; no allocation per `n`. (The library counts with
/// [`crate::lproof::TraceOracle`]; this exact count is the tests' second
/// computation.)
#[cfg(test)]
pub(crate) fn coefficients_from(counter: &mut PointCounter, bad: &[(u64, i64)], m: usize) -> Vec<i64> {
    // invariant: the closure always returns Some, so coefficients_with never stops early
    coefficients_with(&mut |p| Some(counter.trace(p)), bad, m).expect("the exact counter never stops")
}

/// [`coefficients_from`] with the traces at the good primes from `trace`
/// (any exact counter); `None` as soon as `trace` answers `None` (the
/// caller's budget ended).
pub(crate) fn coefficients_with(trace: &mut dyn FnMut(u64) -> Option<i64>, bad: &[(u64, i64)], m: usize) -> Option<Vec<i64>> {
    let mut a = Vec::new();
    extend_coefficients_with(&mut a, trace, bad, m)?;
    Some(a)
}

/// Extends `a = [a_0, ..., a_m0]` (as left by this function or
/// [`coefficients_with`], or empty) to `a_0, ..., a_m`, asking `trace` only
/// at the good primes in `(m0, m]` (the traces at smaller primes are
/// `a_p` themselves). On `None` from `trace`, `a` is left as it was.
pub(crate) fn extend_coefficients_with(a: &mut Vec<i64>, trace: &mut dyn FnMut(u64) -> Option<i64>, bad: &[(u64, i64)], m: usize) -> Option<()> {
    if a.is_empty() {
        a.push(0);
    }
    let m0 = a.len() - 1;
    if m <= m0 {
        return Some(());
    }
    let mut is_bad = vec![false; m + 1];
    for &(p, _) in bad {
        if (p as usize) <= m {
            is_bad[p as usize] = true;
        }
    }
    a.resize(m + 1, 0);
    let primes = primes_up_to(m as u64);
    for &p in primes.iter().filter(|&&p| p as usize > m0) {
        let p = p as usize;
        a[p] = if is_bad[p] {
            bad.iter().find(|b| b.0 as usize == p).map_or(0, |b| b.1)
        } else {
            match trace(p as u64) {
                Some(t) => t,
                None => {
                    a.truncate(m0 + 1);
                    return None;
                }
            }
        };
    }
    // smallest prime factors of the new range (m0, m], offset by m0 + 1
    let mut spf = vec![0u32; m - m0];
    for &p in &primes {
        let p = p as usize;
        let mut k = p.max((m0 / p + 1) * p);
        while k <= m {
            if spf[k - m0 - 1] == 0 {
                spf[k - m0 - 1] = p as u32;
            }
            k += p;
        }
    }
    if m0 < 1 {
        a[1] = 1;
    }
    for n in (m0 + 1).max(2)..=m {
        let p = spf[n - m0 - 1] as usize;
        if p == n {
            continue; // a_p set above
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
            a[p] * a[n / p]
        } else {
            a[p] * a[n / p] - (p as i64) * a[n / p / p]
        };
    }
    Some(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::Curve;

    /// Extending in steps (through prime, prime-power and composite ends)
    /// gives the coefficients of one pass, and a pass cut short by the
    /// trace leaves the vector as it was. y^2 + y = x^3 - x (conductor 37,
    /// a_37 = -1 from the split multiplicative reduction; Cremona 1997,
    /// Table 1: a_2 = -2, a_3 = -3, a_5 = -2, a_7 = -1, from memory) and
    /// y^2 + xy + y = x^3 - x^2 - 29x + 53 (bad primes from the library's
    /// local data).
    #[test]
    fn extensions_equal_one_pass() {
        let work = crate::Work::unlimited();
        for c in [[0, 0, 1, -1, 0], [1, -1, 1, -29, 53]] {
            let e = Curve::from_coefficients(c).unwrap();
            let bad = crate::local::CurveData::new(&e, &work).unwrap().bad_prime_traces().unwrap();
            let mut counter = PointCounter::new(&e);
            let whole = coefficients_from(&mut counter, &bad, 5000);
            if c == [0, 0, 1, -1, 0] {
                assert_eq!(&whole[..8], &[0, 1, -2, -3, 2, -2, 6, -1]);
                assert_eq!(whole[37], -1);
            }
            let mut a = Vec::new();
            for m in [0usize, 1, 2, 36, 37, 64, 1024, 1031, 4999, 5000, 300] {
                let before = a.len();
                extend_coefficients_with(&mut a, &mut |p| Some(counter.trace(p)), &bad, m).unwrap();
                assert_eq!(a.len(), before.max(m + 1), "{c:?} to {m}");
                assert_eq!(&a[..], &whole[..a.len()], "{c:?} to {m}");
            }
            assert_eq!(a.len(), 5001);
            let mut short = whole[..2000].to_vec();
            let mut asked = 0;
            assert!(extend_coefficients_with(&mut short, &mut |p| {
                asked += 1;
                (asked < 50).then(|| counter.trace(p))
            }, &bad, 5000).is_none());
            assert_eq!(&short[..], &whole[..2000]);
        }
    }
}
