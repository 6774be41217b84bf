//! Imaginary quadratic discriminants, reduced binary quadratic forms, and
//! the Heegner forms of level `N` (Gross and Zagier 1986, §I.1; Cohen,
//! A Course in Computational Algebraic Number Theory, §5.3 for reduction
//! and §7.5 for the Heegner forms).

use crate::arith::{factor_u64, kronecker_i64};
use crate::error::Error;

/// A positive definite binary quadratic form `a x^2 + b xy + c y^2`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct QuadraticForm {
    /// `a > 0`.
    pub a: i128,
    /// `b`.
    pub b: i128,
    /// `c > 0`.
    pub c: i128,
}

impl QuadraticForm {
    /// The discriminant `b^2 - 4ac`.
    pub fn discriminant(&self) -> i128 {
        self.b * self.b - 4 * self.a * self.c
    }

    /// The reduced form equivalent under SL2(Z): `|b| <= a <= c`, and
    /// `b >= 0` when `|b| = a` or `a = c` (Cohen, Algorithm 5.4.2).
    pub fn reduced(mut self) -> QuadraticForm {
        loop {
            // normalise b into (-a, a]
            if !(-self.a < self.b && self.b <= self.a) {
                let two_a = 2 * self.a;
                let mut r = self.b.rem_euclid(two_a);
                if r > self.a {
                    r -= two_a;
                }
                let k = (r - self.b) / two_a; // b + 2ak = r
                self.c += k * k * self.a + k * self.b;
                self.b = r;
            }
            if self.a > self.c {
                self = QuadraticForm { a: self.c, b: -self.b, c: self.a };
                continue;
            }
            if self.a == self.c && self.b < 0 {
                self.b = -self.b;
            }
            return self;
        }
    }
}

/// Whether `d` is a fundamental discriminant: `d = 1 mod 4` squarefree, or
/// `d = 4m` with `m = 2, 3 mod 4` squarefree.
pub fn is_fundamental(d: i64) -> bool {
    let squarefree = |m: i64| -> bool {
        let m = m.unsigned_abs();
        if m == 0 {
            return false;
        }
        let mut k = 2u64;
        let mut r = m;
        while k * k <= r {
            if r % (k * k) == 0 {
                return false;
            }
            if r % k == 0 {
                r /= k;
            }
            k += 1;
        }
        true
    };
    match d.rem_euclid(4) {
        1 => d != 1 && squarefree(d),
        0 => {
            let m = d / 4;
            matches!(m.rem_euclid(4), 2 | 3) && squarefree(m)
        }
        _ => false,
    }
}

/// The reduced primitive forms of discriminant `d < 0` (one per class of the
/// form class group; their number is the class number `h(d)`).
pub(crate) fn reduced_forms(d: i64) -> Vec<QuadraticForm> {
    // machine words while b^2 - d fits (|b| <= a <= sqrt(|d| / 3)): the
    // ranking of the Heegner discriminants calls this some 10^4 times
    let d = i128::from(d);
    let mut out = Vec::new();
    let mut a: i128 = 1;
    while 3 * a * a <= -d {
        let step = |b: i128| -> Option<QuadraticForm> {
            let (b64, d64, a64) = (b as i64, d as i64, a as i64);
            let num = if d > i128::from(i64::MIN / 4) { b64 * b64 - d64 } else { return slow(a, b, d) };
            if num % (4 * a64) != 0 {
                return None;
            }
            let c = num / (4 * a64);
            if c < a64 || (b < 0 && a64 == c) {
                return None;
            }
            (gcd128(gcd128(a, b.abs()), i128::from(c)) == 1).then_some(QuadraticForm { a, b, c: i128::from(c) })
        };
        out.extend((-a + 1..=a).filter_map(step));
        a += 1;
    }
    out
}

/// One candidate `[a, b, c]` of [`reduced_forms`] in 128-bit arithmetic.
fn slow(a: i128, b: i128, d: i128) -> Option<QuadraticForm> {
    if (b * b - d) % (4 * a) != 0 {
        return None;
    }
    let c = (b * b - d) / (4 * a);
    if c < a || (b < 0 && a == c) {
        return None;
    }
    (gcd128(gcd128(a, b.abs()), c) == 1).then_some(QuadraticForm { a, b, c })
}

fn gcd128(mut a: i128, mut b: i128) -> i128 {
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a.abs()
}

/// A discriminant satisfying the Heegner hypothesis for level `N`, with a
/// square root `beta` of `D` modulo `4N` and one Heegner form
/// `[A, B, C]` (`N | A`, `B = beta mod 2N`, `B^2 - 4AC = D`) per ideal
/// class, each with the least `A` found.
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct HeegnerData {
    /// The fundamental discriminant `D < -4`.
    pub discriminant: i64,
    /// `beta` with `beta^2 = D mod 4N`, `0 <= beta < 2N`.
    pub beta: i64,
    /// One form per class.
    pub forms: Vec<QuadraticForm>,
}

impl HeegnerData {
    /// The sum over the forms of `A / N`: the cost of the series is
    /// proportional to it divided by `sqrt |D|`.
    pub fn cost(&self, n: u64) -> f64 {
        let s: f64 = self.forms.iter().map(|f| f.a as f64 / n as f64).sum();
        s / ((-self.discriminant) as f64).sqrt()
    }

    /// The largest `A / N / sqrt |D|`: the number of coefficients needed is
    /// proportional to it.
    pub fn reach(&self, n: u64) -> f64 {
        let m = self.forms.iter().map(|f| f.a).max().unwrap_or(1) as f64;
        m / n as f64 / ((-self.discriminant) as f64).sqrt()
    }
}

/// Whether every prime dividing `n` splits in `Q(sqrt d)` (with `d`
/// fundamental): the Heegner hypothesis. Then `d` is a square modulo `4n`.
pub(crate) fn heegner_hypothesis(d: i64, primes_of_n: &[u64]) -> bool {
    primes_of_n.iter().all(|&p| kronecker_i64(d, p) == 1)
}

/// The least `beta` in `[0, 2n)` with `beta^2 = d mod 4n` (`beta^2 mod 4n`
/// depends on `beta mod 2n` only), from the square roots modulo the prime
/// powers of `4n` (Hensel lifting in [`crate::arith::sqrt_mod_prime_power`]),
/// every combination joined by the Chinese remainder theorem: `O(2^ω(n))`
/// work instead of a scan of `[0, 2n)`. `None` when there is none.
pub(crate) fn least_beta(d: i64, n: u64) -> Result<Option<i128>, Error> {
    use malachite::{Integer, Natural};
    let four_n = 4 * i128::from(n);
    let dd = i128::from(d);
    // (modulus, square roots of d modulo it)
    let mut parts: Vec<(i128, Vec<i128>)> = Vec::new();
    let mut two_part = 4i128;
    for (p, k) in factor_u64(n)? {
        if p == 2 {
            two_part <<= k;
            continue;
        }
        let pk = i128::from(p).pow(k as u32);
        let Some(r) = crate::arith::sqrt_mod_prime_power(&Integer::from(d), &Natural::from(p), k as u32) else { return Ok(None) };
        let r = i128::try_from(&r).map_err(|_| Error::internal("the Heegner forms", "a square root out of range"))?.rem_euclid(pk);
        parts.push((pk, if r == 0 || 2 * r == pk { vec![r] } else { vec![r, pk - r] }));
    }
    if two_part > 1 << 24 {
        return Err(Error::new(crate::error::ErrorKind::TooLarge, format!("level {n}: the power of 2 is too large for the Heegner forms")));
    }
    let roots_two: Vec<i128> = (0..two_part).filter(|x| (x * x - dd).rem_euclid(two_part) == 0).collect();
    if roots_two.is_empty() {
        return Ok(None);
    }
    parts.push((two_part, roots_two));
    // x = a mod m1 and x = b mod m2 (coprime): a + m1 ((b - a) / m1 mod m2)
    let join = |a: i128, m1: i128, b: i128, m2: i128| -> i128 {
        let (mut r0, mut r1, mut s0, mut s1) = (m1.rem_euclid(m2), m2, 1i128, 0i128);
        while r1 != 0 {
            let q = r0.div_euclid(r1);
            (r0, r1) = (r1, r0 - q * r1);
            (s0, s1) = (s1, s0 - q * s1);
        }
        // r0 = gcd = 1 and s0 m1 = 1 mod m2
        let t = ((b - a).rem_euclid(m2) * s0.rem_euclid(m2)).rem_euclid(m2);
        a + m1 * t
    };
    let mut residues: Vec<i128> = vec![0];
    let mut modulus = 1i128;
    for (m, roots) in &parts {
        residues = residues.iter().flat_map(|&x| roots.iter().map(move |&r| (x, r))).map(|(x, r)| join(x, modulus, r, *m)).collect();
        modulus *= m;
    }
    debug_assert_eq!(modulus, four_n);
    let beta = residues.into_iter().map(|x| x.rem_euclid(2 * i128::from(n))).min();
    Ok(beta.filter(|b| (b * b - dd).rem_euclid(four_n) == 0))
}

/// The Heegner data for `(d, n)`: `beta` and one form per class. `None` if
/// the hypothesis fails.
pub(crate) fn heegner_data(d: i64, n: u64) -> Result<Option<HeegnerData>, Error> {
    let primes: Vec<u64> = factor_u64(n)?.into_iter().map(|(p, _)| p).collect();
    if !heegner_hypothesis(d, &primes) || d >= -4 || !is_fundamental(d) {
        return Ok(None);
    }
    let dd = d as i128;
    let Some(beta) = least_beta(d, n)? else { return Ok(None) };
    let classes = reduced_forms(d);
    let h = classes.len();
    let mut found: Vec<(QuadraticForm, QuadraticForm)> = Vec::new(); // (reduced, heegner form)
    let n128 = n as i128;
    let mut k: i128 = 1;
    while found.len() < h && k < 100_000 {
        let a = n128 * k;
        // B = beta + 2N j, j = 0..k-1 covers B mod 2A
        for j in 0..k {
            let b = beta + 2 * n128 * j;
            if (b * b - dd) % (4 * a) != 0 {
                continue;
            }
            let c = (b * b - dd) / (4 * a);
            let f = QuadraticForm { a, b, c };
            let r = f.reduced();
            if !found.iter().any(|(g, _)| *g == r) {
                found.push((r, f));
            }
        }
        k += 1;
    }
    if found.len() < h {
        return Ok(None);
    }
    Ok(Some(HeegnerData { discriminant: d, beta: beta as i64, forms: found.into_iter().map(|(_, f)| f).collect() }))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Class numbers of imaginary quadratic fields (Cohen, Table B.1 /
    /// Gauss: h = 1 exactly for D = -3, -4, -7, -8, -11, -19, -43, -67,
    /// -163; h(-23) = 3, h(-47) = 5, h(-71) = 7, h(-84) = 4; from memory).
    #[test]
    fn class_numbers() {
        for d in [-3, -4, -7, -8, -11, -19, -43, -67, -163] {
            assert!(is_fundamental(d));
            assert_eq!(reduced_forms(d).len(), 1, "{d}");
        }
        assert_eq!(reduced_forms(-23).len(), 3);
        assert_eq!(reduced_forms(-47).len(), 5);
        assert_eq!(reduced_forms(-71).len(), 7);
        assert_eq!(reduced_forms(-84).len(), 4);
        assert!(!is_fundamental(-12) && !is_fundamental(-16) && !is_fundamental(-5));
    }

    /// `least_beta` equals the least root found by scanning `[0, 2n)`
    /// (the definition) for every fundamental `d` down to -400 and levels
    /// with odd and even prime powers.
    #[test]
    fn least_beta_equals_the_scan() {
        for n in [11u64, 37, 800, 7130, 130050, 4 * 27 * 25, 256 * 7] {
            for d in (5i64..400).map(|k| -k).filter(|&d| is_fundamental(d)) {
                let scan = (0..2 * n as i128).find(|b| (b * b - d as i128).rem_euclid(4 * n as i128) == 0);
                assert_eq!(least_beta(d, n).unwrap(), scan, "d = {d}, n = {n}");
            }
        }
    }

    #[test]
    fn heegner_forms_have_the_right_shape() {
        // level 37: D = -7 (37 splits: -7 = 30 is a square mod 37, 17^2 = 289 = 30 + 7*37)
        let h = heegner_data(-7, 37).unwrap().unwrap();
        assert_eq!(h.forms.len(), 1);
        for f in &h.forms {
            assert_eq!(f.discriminant(), -7);
            assert_eq!(f.a % 37, 0);
            assert_eq!((f.b - h.beta as i128).rem_euclid(74), 0);
        }
        let h = heegner_data(-47, 37).unwrap();
        if let Some(h) = h {
            assert_eq!(h.forms.len(), 5);
            let mut r: Vec<_> = h.forms.iter().map(|f| f.reduced()).collect();
            r.sort();
            r.dedup();
            assert_eq!(r.len(), 5);
        }
    }
}
