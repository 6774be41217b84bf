//! Polynomials over Z and Q of the small degrees the module needs:
//! evaluation, derivative, resultant (Sylvester determinant by Bareiss),
//! discriminant, rational roots (roots mod a good prime lifted by Hensel
//! and checked exactly) and the factorisation of quadratics and cubics.
//!
//! A polynomial is a slice of coefficients from the constant term up.
//!
//! Reference: H. Cohen, GTM 138, §3.3 (resultants and discriminants) and
//! §3.5 (Hensel lifting).

use super::fp;
use super::linalg::{det, mod_word};
use crate::arith::is_prime_u64;
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, Mod, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Rational};

fn zero_free(f: &[Integer]) -> Vec<Integer> {
    let mut v = f.to_vec();
    while v.last() == Some(&Integer::ZERO) {
        v.pop();
    }
    v
}

/// Degree of a polynomial (`None` for the zero polynomial).
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// assert_eq!(poly::degree(&z(&[-2, 0, 0, 1])), Some(3));
/// assert_eq!(poly::degree(&z(&[5, 0, 0])), Some(0)); // trailing zeros do not count
/// assert_eq!(poly::degree(&z(&[0, 0])), None);
/// ```
pub fn degree(f: &[Integer]) -> Option<usize> {
    zero_free(f).len().checked_sub(1)
}

/// Value of `f` at the integer `x` (Horner).
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let f: Vec<Integer> = [-2, 0, 0, 1].iter().map(|&c| Integer::from(c)).collect(); // x^3 - 2
/// assert_eq!(poly::eval(&f, &Integer::from(3)), 25);
/// ```
pub fn eval(f: &[Integer], x: &Integer) -> Integer {
    let mut acc = Integer::ZERO;
    for c in f.iter().rev() {
        acc = acc * x + c;
    }
    acc
}

/// The derivative `f'`.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// assert_eq!(poly::derivative(&z(&[1, -3, 0, 1])), z(&[-3, 0, 3])); // (x^3 - 3x + 1)' = 3x^2 - 3
/// ```
pub fn derivative(f: &[Integer]) -> Vec<Integer> {
    f.iter().enumerate().skip(1).map(|(i, c)| c * Integer::from(i)).collect()
}

/// The resultant `Res(f, g)` as the determinant of the Sylvester matrix
/// (Cohen GTM 138, Definition 3.3.1), by Bareiss elimination; cost
/// `O((deg f + deg g)^3)` multiplications of integers. Zero if either is zero.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // Res(x^2 + 1, x - 2) = (2^2 + 1) = 5
/// assert_eq!(poly::resultant(&z(&[1, 0, 1]), &z(&[-2, 1])), 5);
/// ```
pub fn resultant(f: &[Integer], g: &[Integer]) -> Integer {
    let f = zero_free(f);
    let g = zero_free(g);
    if f.is_empty() || g.is_empty() {
        return Integer::ZERO;
    }
    let (m, n) = (f.len() - 1, g.len() - 1);
    if m + n == 0 {
        return Integer::ONE;
    }
    let size = m + n;
    let mut s = vec![vec![Integer::ZERO; size]; size];
    for i in 0..n {
        for (j, c) in f.iter().rev().enumerate() {
            s[i][i + j] = c.clone();
        }
    }
    for i in 0..m {
        for (j, c) in g.iter().rev().enumerate() {
            s[n + i][i + j] = c.clone();
        }
    }
    det(&s)
}

/// The discriminant `(-1)^(n(n-1)/2) Res(f, f') / lc(f)` of a polynomial
/// of degree `n >= 1` (Cohen GTM 138, Definition 3.3.5); zero for the zero
/// polynomial or a constant.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// assert_eq!(poly::discriminant(&z(&[-1, -1, 0, 1])), -23); // x^3 - x - 1: -4(-1)^3 - 27 = -23
/// assert_eq!(poly::discriminant(&z(&[1, 2, 3])), 4 - 12); // b^2 - 4ac
/// ```
pub fn discriminant(f: &[Integer]) -> Integer {
    let f = zero_free(f);
    if f.len() < 2 {
        return Integer::ZERO;
    }
    let n = f.len() - 1;
    let r = resultant(&f, &derivative(&f)) / &f[n];
    if (n * (n - 1) / 2) % 2 == 1 {
        -r
    } else {
        r
    }
}

/// Clears denominators of a rational polynomial: the primitive integer
/// polynomial with positive leading coefficient and the same roots.
pub(crate) fn primitive_part(f: &[Rational]) -> Vec<Integer> {
    use malachite::base::num::arithmetic::traits::{Gcd, Lcm};
    let mut l = malachite::Natural::ONE;
    for c in f {
        l = l.lcm(c.denominator_ref());
    }
    let lq = Rational::from(l);
    let mut v: Vec<Integer> = f.iter().map(|c| Integer::try_from(c * &lq).unwrap_or_default()).collect();
    let mut g = malachite::Natural::ZERO;
    for c in &v {
        g = g.gcd(malachite::base::num::arithmetic::traits::UnsignedAbs::unsigned_abs(c));
    }
    if g > 1 {
        let gi = Integer::from(g);
        for c in v.iter_mut() {
            *c /= &gi;
        }
    }
    let v = zero_free(&v);
    if v.last().is_some_and(|c| *c < 0) {
        v.into_iter().map(|c| -c).collect()
    } else {
        v
    }
}


/// The distinct rational roots of a non-zero integer polynomial, sorted.
///
/// Method: with `a` the leading coefficient, the roots of
/// `g(y) = a^(n-1) f(y/a)` are algebraic integers, so its rational roots
/// are integers bounded by `1 + max |g_i|` (Cauchy). The roots of `g`
/// modulo a prime not dividing `disc(g)` are lifted by Hensel's lemma to a
/// modulus above twice that bound and each candidate is checked exactly.
/// Cost: polynomial in `log` of the coefficients.
///
/// ```
/// use malachite::{Integer, Rational};
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // 2x^3 - 3x^2 - 3x + 2 = (x + 1)(2x - 1)(x - 2)
/// let r = poly::rational_roots(&z(&[2, -3, -3, 2])).unwrap();
/// assert_eq!(r, vec![Rational::from(-1), Rational::from_signeds(1, 2), Rational::from(2)]);
/// ```
pub fn rational_roots(f: &[Integer]) -> Result<Vec<Rational>, Error> {
    let f = zero_free(f);
    if f.is_empty() {
        return Err(Error::new(ErrorKind::InvalidValue, "the zero polynomial has every number as a root"));
    }
    let mut out = Vec::new();
    // strip roots at zero
    let mut f = f;
    if f[0] == 0 {
        out.push(Rational::ZERO);
        while f[0] == 0 {
            f.remove(0);
        }
    }
    let n = f.len() - 1;
    if n == 0 {
        return Ok(out);
    }
    // squarefree part over Q is not needed for roots: use g / gcd(g, g') via
    // distinct roots mod p of the squarefree polynomial; simplest is to take a
    // prime where f has the same number of distinct roots as over C, so we
    // first remove repeated factors with a rational gcd.
    let f = squarefree_integer(&f);
    let n = f.len() - 1;
    let a = f[n].clone();
    // g(y) = a^(n-1) f(y/a): g_i = f_i a^(n-1-i), g_n = 1
    let g: Vec<Integer> = (0..=n).map(|i| if i == n { Integer::ONE } else { &f[i] * (&a).pow((n - 1 - i) as u64) }).collect();
    let bound: Integer = g.iter().map(|c| c.clone().abs()).max().unwrap_or_default() + Integer::ONE;
    let disc = discriminant(&g);
    let mut p = 3u64;
    while !(is_prime_u64(p) && mod_word(&disc, p) != 0) {
        p += 2;
    }
    let gp: Vec<u64> = g.iter().map(|c| mod_word(c, p)).collect();
    let dg = derivative(&g);
    let target = Integer::from(2) * &bound + Integer::ONE;
    for r0 in fp::roots(&gp, p) {
        // Hensel: r <- r - g(r)/g'(r) mod p^k, doubling k
        let mut r = Integer::from(r0);
        let mut m = Integer::from(p);
        while m < target {
            let m2 = &m * &m;
            let gv = eval(&g, &r).mod_op(&m2);
            let dv = eval(&dg, &r).mod_op(&m2);
            let inv = mod_inverse(&dv, &m2);
            r = (r - gv * inv).mod_op(&m2);
            m = m2;
        }
        let cand = if &r * Integer::from(2) > m { r - &m } else { r };
        if eval(&g, &cand) == 0 {
            out.push(Rational::from_integers(cand, a.clone()));
        }
    }
    out.sort();
    out.dedup();
    Ok(out)
}

fn mod_inverse(a: &Integer, m: &Integer) -> Integer {
    // extended Euclid on integers
    let (mut r0, mut r1) = (a.mod_op(m), m.clone());
    let (mut s0, mut s1) = (Integer::ONE, Integer::ZERO);
    while r1 != 0 {
        let q = &r0 / &r1;
        let r2 = &r0 - &q * &r1;
        r0 = std::mem::replace(&mut r1, r2);
        let s2 = &s0 - &q * &s1;
        s0 = std::mem::replace(&mut s1, s2);
    }
    s0.mod_op(m)
}

/// `f / gcd(f, f')` made primitive (the product of the distinct irreducible factors).
fn squarefree_integer(f: &[Integer]) -> Vec<Integer> {
    let fq: Vec<Rational> = f.iter().map(|c| Rational::from(c.clone())).collect();
    let dq: Vec<Rational> = derivative(f).into_iter().map(Rational::from).collect();
    let g = gcd_q(&fq, &dq);
    if g.len() <= 1 {
        return f.to_vec();
    }
    let (q, _) = divrem_q(&fq, &g);
    primitive_part(&q)
}

/// Quotient and remainder over Q.
pub(crate) fn divrem_q(f: &[Rational], g: &[Rational]) -> (Vec<Rational>, Vec<Rational>) {
    let mut r: Vec<Rational> = f.to_vec();
    while r.last() == Some(&Rational::ZERO) {
        r.pop();
    }
    let dg = g.len() - 1;
    if r.len() <= dg {
        return (Vec::new(), r);
    }
    let mut q = vec![Rational::ZERO; r.len() - dg];
    while r.len() > dg {
        let top = r.len() - 1;
        let c = &r[top] / &g[dg];
        for i in 0..=dg {
            let t = &c * &g[i];
            r[top - dg + i] -= t;
        }
        q[top - dg] = c;
        r.pop();
    }
    while r.last() == Some(&Rational::ZERO) {
        r.pop();
    }
    (q, r)
}

/// Monic gcd over Q.
pub(crate) fn gcd_q(f: &[Rational], g: &[Rational]) -> Vec<Rational> {
    let mut a: Vec<Rational> = f.to_vec();
    let mut b: Vec<Rational> = g.to_vec();
    while b.last() == Some(&Rational::ZERO) {
        b.pop();
    }
    while !b.is_empty() {
        let (_, r) = divrem_q(&a, &b);
        a = b;
        b = r;
    }
    if let Some(l) = a.last().cloned() {
        for c in a.iter_mut() {
            *c /= &l;
        }
    }
    a
}

/// Factorisation over Q of a non-zero integer polynomial of degree at most
/// 3: the content-free monic-up-to-content irreducible factors as primitive
/// integer polynomials with multiplicities. Linear factors come from
/// [`rational_roots`]; what is left has degree at most 3 and no rational
/// root, hence is irreducible.
///
/// ```
/// use malachite::Integer;
/// use twofold::numfield::poly;
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// // x^3 - x^2 + x - 1 = (x - 1)(x^2 + 1)
/// let fac = poly::factor_small(&z(&[-1, 1, -1, 1])).unwrap();
/// assert_eq!(fac, vec![(z(&[-1, 1]), 1), (z(&[1, 0, 1]), 1)]);
/// ```
pub fn factor_small(f: &[Integer]) -> Result<Vec<(Vec<Integer>, u32)>, Error> {
    let f = zero_free(f);
    match f.len() {
        0 => return Err(Error::new(ErrorKind::InvalidValue, "cannot factor the zero polynomial")),
        1 => return Ok(Vec::new()),
        2..=4 => {}
        _ => return Err(Error::new(ErrorKind::TooLarge, "factor_small handles degree at most 3")),
    }
    let mut rest: Vec<Rational> = f.iter().map(|c| Rational::from(c.clone())).collect();
    let mut out = Vec::new();
    for r in rational_roots(&f)? {
        let lin = vec![-r.clone(), Rational::ONE];
        let mut e = 0;
        loop {
            let (q, rem) = divrem_q(&rest, &lin);
            if !rem.is_empty() {
                break;
            }
            rest = q;
            e += 1;
        }
        out.push((primitive_part(&lin), e));
    }
    if rest.len() > 1 {
        out.push((primitive_part(&rest), 1));
    }
    out.sort_by(|a, b| a.0.len().cmp(&b.0.len()).then(a.0.cmp(&b.0)));
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn discriminant_formulas() {
        // cubic x^3 + a x + b: -4a^3 - 27b^2 (Cohen GTM 138, Prop. 3.3.6 / classical)
        for a in -6i64..=6 {
            for b in -6i64..=6 {
                assert_eq!(discriminant(&z(&[b, a, 0, 1])), -4 * a * a * a - 27 * b * b);
            }
        }
        // independent: disc = prod (r_i - r_j)^2 for f = (x-1)(x-2)(x+3): (1)^2 (4)^2 (5)^2 = 400
        assert_eq!(discriminant(&z(&[6, -7, 0, 1])), 400);
    }

    #[test]
    fn resultant_is_product_over_roots() {
        // Res(f, g) = prod_{f(a)=0} g(a) for monic f with integer roots 1, 2, -3
        let f = z(&[6, -7, 0, 1]);
        for g in [z(&[5, 0, 1]), z(&[-1, 2, 3, 1]), z(&[7])] {
            let prod = eval(&g, &Integer::from(1)) * eval(&g, &Integer::from(2)) * eval(&g, &Integer::from(-3));
            assert_eq!(resultant(&f, &g), prod);
        }
    }

    #[test]
    fn rational_roots_of_products() {
        let mut s = 7u64;
        for _ in 0..300 {
            let mut pick = || {
                s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
                ((s >> 33) % 41) as i64 - 20
            };
            let (p1, q1, p2) = (pick(), pick().abs() + 1, pick());
            let c = pick();
            // (q1 x - p1)(x - p2)(x^2 + c^2 + 1): roots p1/q1, p2 only
            let lin1 = z(&[-p1, q1]);
            let lin2 = z(&[-p2, 1]);
            let quad = z(&[c * c + 1, 0, 1]);
            let mul = |a: &[Integer], b: &[Integer]| {
                let mut r = vec![Integer::ZERO; a.len() + b.len() - 1];
                for (i, x) in a.iter().enumerate() {
                    for (j, y) in b.iter().enumerate() {
                        r[i + j] += x * y;
                    }
                }
                r
            };
            let f = mul(&mul(&lin1, &lin2), &quad);
            let mut want = vec![Rational::from_signeds(p1, q1), Rational::from(p2)];
            want.sort();
            want.dedup();
            assert_eq!(rational_roots(&f).unwrap(), want);
        }
        // big roots: (x - 10^30)(x + 10^30 + 7)
        let big = Integer::from(10u64).pow(30);
        let f = vec![-(&big) * (&big + Integer::from(7)), Integer::from(7), Integer::ONE];
        assert_eq!(rational_roots(&f).unwrap(), vec![Rational::from(-(&big + Integer::from(7))), Rational::from(big)]);
    }

    #[test]
    fn factor_cubics() {
        assert_eq!(factor_small(&z(&[-2, 0, 0, 1])).unwrap(), vec![(z(&[-2, 0, 0, 1]), 1)]);
        // (x-1)^2 (x+2) = x^3 - 3x + 2
        assert_eq!(factor_small(&z(&[2, -3, 0, 1])).unwrap(), vec![(z(&[-1, 1]), 2), (z(&[2, 1]), 1)]);
    }
}
