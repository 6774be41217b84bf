//! Discriminants, a primality check for the place, and the squarefree
//! "odd part" used when a quartic has a repeated factor.

use malachite::base::num::arithmetic::traits::{Lcm, ModPow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// The discriminant of `a x^4 + b x^3 z + c x^2 z^2 + d x z^3 + e z^4`,
/// `(4 I^3 - J^2) / 27` with `I = 12ae - 3bd + c^2` and
/// `J = 72ace + 9bcd - 27ad^2 - 27eb^2 - 2c^3`.
pub(crate) fn discriminant(g: &[Integer; 5]) -> Integer {
    if let Some(d) = discriminant_word(g) {
        return Integer::from(d);
    }
    let [a, b, c, d, e] = g;
    let i = Integer::from(12) * a * e - Integer::from(3) * b * d + c * c;
    let j = Integer::from(72) * a * c * e + Integer::from(9) * b * c * d
        - Integer::from(27) * a * d * d
        - Integer::from(27) * e * b * b
        - Integer::from(2) * c * c * c;
    (Integer::from(4) * &i * &i * &i - &j * &j) / Integer::from(27)
}

fn discriminant_word(g: &[Integer; 5]) -> Option<i128> {
    let mut w = [0i128; 5];
    for (k, x) in g.iter().enumerate() {
        w[k] = i128::try_from(x).ok()?;
    }
    let [a, b, c, d, e] = w;
    if w.iter().all(|x| x.unsigned_abs() < 1 << 18) {
        // |I| < 16 * 2^36 = 2^40 and |J| < 137 * 2^54 < 2^62: no overflow
        let i = 12 * a * e - 3 * b * d + c * c;
        let j = 72 * a * c * e + 9 * b * c * d - 27 * a * d * d - 27 * e * b * b - 2 * c * c * c;
        return Some((4 * i * i * i - j * j) / 27);
    }
    let m = |x: i128, y: i128| x.checked_mul(y);
    let i = m(m(12, a)?, e)?.checked_sub(m(m(3, b)?, d)?)?.checked_add(m(c, c)?)?;
    let j = m(m(m(72, a)?, c)?, e)?
        .checked_add(m(m(m(9, b)?, c)?, d)?)?
        .checked_sub(m(m(m(27, a)?, d)?, d)?)?
        .checked_sub(m(m(m(27, e)?, b)?, b)?)?
        .checked_sub(m(m(m(2, c)?, c)?, c)?)?;
    let num = m(m(m(4, i)?, i)?, i)?.checked_sub(m(j, j)?)?;
    Some(num / 27)
}

/// Whether `p` is prime: deterministic below `2^64`; above, a strong
/// probable-prime test to the 13 prime bases up to 41, which is a proof
/// below 3.3 * 10^24 (Sorenson and Webster, "Strong pseudoprimes to twelve
/// prime bases", Math. Comp. 86 (2017)) and never rejects a prime.
///
/// Below `2^20` the answer is read from the process-wide prime table
/// (`arith::is_small_prime`), so the plain calls, which start from an empty
/// memo, pay no primality proof for such places. Above, `memo` remembers
/// the word-size primes proven recently: the same few places are asked
/// about for millions of quartics.
pub(crate) fn is_prime(p: &Natural, memo: &mut PrimeMemo) -> bool {
    if let Ok(w) = u64::try_from(p) {
        if w < 41 * 41 {
            // trial division inside is_prime_u64 settles these quickly
            return crate::arith::is_prime_u64(w);
        }
        if let Some(known) = crate::arith::is_small_prime(w) {
            return known;
        }
        if memo.recent.contains(&w) {
            return true;
        }
        let ok = crate::arith::is_prime_u64(w);
        if ok {
            memo.recent.rotate_right(1);
            memo.recent[0] = w;
        }
        return ok;
    }
    let one = Natural::ONE;
    let pm1 = p - &one;
    // invariant: p >= 2^64 in this branch, so p - 1 > 0
    let s = pm1.trailing_zeros().expect("p > 1");
    let d = &pm1 >> s;
    for b in [2u32, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41] {
        let b = Natural::from(b);
        if (p % &b) == 0u32 {
            return false;
        }
        let mut x = (&b).mod_pow(&d, p);
        if x == one || x == pm1 {
            continue;
        }
        let mut passed = false;
        for _ in 1..s {
            x = (&x * &x) % p;
            if x == pm1 {
                passed = true;
                break;
            }
        }
        if !passed {
            return false;
        }
    }
    true
}

/// Word primes proven prime recently (0 = empty slot), most recent first:
/// an explicit value owned by the caller (see `SolubilityWorkspace`), no
/// hidden per-thread state.
#[derive(Clone, Debug, Default)]
pub(crate) struct PrimeMemo {
    recent: [u64; 8],
}

// ---- polynomials over Q, lowest degree first, no trailing zeros ----

fn trim(f: &mut Vec<Rational>) {
    while f.last().is_some_and(|c| *c == 0u32) {
        f.pop();
    }
}

fn deriv(f: &[Rational]) -> Vec<Rational> {
    let mut d: Vec<Rational> = (1..f.len()).map(|i| Rational::from(i as u64) * &f[i]).collect();
    trim(&mut d);
    d
}

fn sub(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let n = a.len().max(b.len());
    let mut r: Vec<Rational> = (0..n)
        .map(|i| {
            let x = a.get(i).cloned().unwrap_or(Rational::ZERO);
            let y = b.get(i).cloned().unwrap_or(Rational::ZERO);
            x - y
        })
        .collect();
    trim(&mut r);
    r
}

/// Quotient and remainder by a non-zero `b`.
fn divrem(a: &[Rational], b: &[Rational]) -> (Vec<Rational>, Vec<Rational>) {
    let mut r = a.to_vec();
    trim(&mut r);
    let db = b.len() - 1;
    if r.len() <= db {
        return (vec![], r);
    }
    let mut q = vec![Rational::ZERO; r.len() - db];
    while r.len() > db {
        let k = r.len() - 1;
        let c = &r[k] / &b[db];
        for j in 0..=db {
            let t = &c * &b[j];
            r[k - db + j] -= t;
        }
        q[k - db] = c;
        r.pop();
        trim(&mut r);
    }
    trim(&mut q);
    (q, r)
}

fn monic(f: &[Rational]) -> Vec<Rational> {
    // invariant: callers pass trimmed, non-zero polynomials
    let l = f.last().expect("non-zero").clone();
    f.iter().map(|c| c / &l).collect()
}

fn gcd(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let mut x = a.to_vec();
    let mut y = b.to_vec();
    trim(&mut x);
    trim(&mut y);
    while !y.is_empty() {
        let (_, r) = divrem(&x, &y);
        x = y;
        y = r;
    }
    if x.is_empty() {
        x
    } else {
        monic(&x)
    }
}

fn mul(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    if a.is_empty() || b.is_empty() {
        return vec![];
    }
    let mut r = vec![Rational::ZERO; a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            r[i + j] += x * y;
        }
    }
    r
}

/// Yun's squarefree decomposition of a monic `f` of positive degree:
/// monic squarefree pairwise coprime `a_1, a_2, ...` with `f = prod a_i^i`.
fn yun(f: &[Rational]) -> Vec<Vec<Rational>> {
    let df = deriv(f);
    let a0 = gcd(f, &df);
    let mut b = divrem(f, &a0).0;
    let c = divrem(&df, &a0).0;
    let mut d = sub(&c, &deriv(&b));
    let mut out = Vec::new();
    while b.len() > 1 {
        let a = gcd(&b, &d);
        let nb = divrem(&b, &a).0;
        let nc = divrem(&d, &a).0;
        d = sub(&nc, &deriv(&nb));
        b = nb;
        out.push(a);
    }
    out
}

/// For a non-zero quartic form `g`, a squarefree integral binary form `r` of
/// even degree (coefficient `r[i]` of `x^(n-i) z^i`) with `g = r q^2` for a
/// binary form `q` over Q. Where `g(x, z) != 0`, `g(x, z)` and `r(x, z)` lie
/// in the same square class.
pub(crate) fn odd_part(g: &[Integer; 5]) -> Vec<Integer> {
    let k = g.iter().take_while(|c| **c == 0u32).count();
    debug_assert!(k < 5, "g is not zero");
    // f(t) = g(t, 1) of degree 4 - k, lowest first
    let f: Vec<Rational> = (0..=4 - k).map(|j| Rational::from(g[4 - j].clone())).collect();
    // invariant: f has 5 - k >= 1 entries: g is not zero (the callers check it)
    let lc = f.last().expect("non-zero").clone();
    let mut odd = vec![lc.clone()];
    if f.len() > 1 {
        for (i, a) in yun(&monic(&f)).iter().enumerate() {
            if (i + 1) % 2 == 1 {
                odd = mul(&odd, a);
            }
        }
    }
    let d_o = odd.len() - 1;
    let n = k % 2 + d_o;
    // clear denominators with a square
    let mut den = Natural::ONE;
    for c in &odd {
        den = den.lcm(c.denominator_ref());
    }
    let sq = Rational::from(&den * &den);
    let mut r = vec![Integer::ZERO; n + 1];
    for (j, c) in odd.iter().enumerate() {
        let v = c * &sq;
        // invariant: multiplying by the square of the lcm of the denominators clears them
        r[n - j] = Integer::try_from(v).expect("denominators cleared");
    }
    r
}
