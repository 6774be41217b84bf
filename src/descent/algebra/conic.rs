//! A rational point on a conic `v^T M v = 0` (`M` a symmetric integer
//! 3x3 matrix of non-zero determinant).
//!
//! Method: the form is diagonalised over Q along small vectors (a zero
//! met on the way is the answer), each diagonal entry is factored (within
//! the limits), and the diagonal equation is brought to Legendre's normal
//! form `a x^2 + b y^2 + c z^2 = 0` with `a, b, c` square-free and
//! pairwise coprime. Then the solutions lie in the lattice cut out by
//! `b y = alpha z (mod a)`, `c z = beta x (mod b)`, `a x = gamma y (mod c)`
//! with `alpha^2 = -bc (mod a)` and so on, of index `|abc|`, on which the
//! form takes values divisible by `abc`; a reduced basis for the positive
//! form `|a| x^2 + |b| y^2 + |c| z^2` has a small combination that is a
//! zero (Legendre's theorem with Holzer's bound; Cremona and Rusin,
//! *Efficient solution of rational conics*, Math. Comp. 72 (2003)). A
//! missing square root proves the conic has no rational point.

use crate::arith::{factor, sqrt_mod_prime_power, FactorLimits};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, DivRound, Gcd};
use malachite::base::num::basic::traits::{NegativeOne, One, Zero};
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Natural, Rational};
use std::collections::BTreeMap;

/// A symmetric 3x3 integer matrix.
pub(crate) type Sym3 = [[Integer; 3]; 3];
/// An integer vector of length 3.
pub(crate) type Vec3 = [Integer; 3];

/// `v^T m w`.
pub(crate) fn bilinear(m: &Sym3, v: &Vec3, w: &Vec3) -> Integer {
    let mut s = Integer::ZERO;
    for i in 0..3 {
        if v[i] == 0 {
            continue;
        }
        for j in 0..3 {
            s += &m[i][j] * &v[i] * &w[j];
        }
    }
    s
}

fn content(v: &Vec3) -> Natural {
    v.iter().fold(Natural::ZERO, |g, c| g.gcd(c.unsigned_abs_ref()))
}

fn primitive(v: Vec3) -> Vec3 {
    let g = Integer::from(content(&v));
    if g <= 1u32 {
        return v;
    }
    v.map(|c| c / &g)
}

fn combine(s: &Integer, v: &Vec3, t: &Integer, w: &Vec3) -> Vec3 {
    [s * &v[0] + t * &w[0], s * &v[1] + t * &w[1], s * &v[2] + t * &w[2]]
}

fn cross(v: &Vec3, w: &Vec3) -> Vec3 {
    [&v[1] * &w[2] - &v[2] * &w[1], &v[2] * &w[0] - &v[0] * &w[2], &v[0] * &w[1] - &v[1] * &w[0]]
}

fn is_zero(v: &Vec3) -> bool {
    v.iter().all(|c| *c == 0)
}

/// The inverse of `a` modulo `m` (`m >= 1`), if it exists.
fn inv_mod(a: &Integer, m: &Integer) -> Option<Integer> {
    let (mut r0, mut r1) = (a.rem_euclid_ref(m), m.clone());
    let (mut s0, mut s1) = (Integer::ONE, Integer::ZERO);
    while r1 != 0 {
        let q = (&r0).div_round(&r1, RoundingMode::Floor).0;
        let r2 = &r0 - &q * &r1;
        let s2 = &s0 - &q * &s1;
        r0 = std::mem::replace(&mut r1, r2);
        s0 = std::mem::replace(&mut s1, s2);
    }
    (r0 == 1u32 || *m == 1u32).then(|| s0.rem_euclid_ref(m))
}

trait RemEuclidRef {
    fn rem_euclid_ref(&self, m: &Integer) -> Integer;
}
impl RemEuclidRef for Integer {
    fn rem_euclid_ref(&self, m: &Integer) -> Integer {
        let r = self % m;
        if r < 0 {
            r + m
        } else {
            r
        }
    }
}

/// A small vector `s v + t w` (coefficients up to `reach`) with the
/// smallest non-zero `|q|`, or one with `q = 0`.
fn small_value(m: &Sym3, gens: &[Vec3], reach: i64) -> Option<(Vec3, Integer)> {
    let mut best: Option<(Vec3, Integer)> = None;
    let n = gens.len();
    let span = (2 * reach + 1).pow(n as u32);
    for code in 0..span {
        let mut c = Vec::with_capacity(n);
        let mut x = code;
        for _ in 0..n {
            c.push(x % (2 * reach + 1) - reach);
            x /= 2 * reach + 1;
        }
        // one of each pair +-v, primitive coefficient vectors only
        if c.iter().all(|&t| t == 0) || c.iter().rev().find(|&&t| t != 0).is_some_and(|&t| t < 0) {
            continue;
        }
        if c.iter().fold(0i64, |g, &t| gcd_i64(g, t)) != 1 {
            continue;
        }
        let mut v: Vec3 = [Integer::ZERO, Integer::ZERO, Integer::ZERO];
        for (k, g) in gens.iter().enumerate() {
            v = combine(&Integer::ONE, &v, &Integer::from(c[k]), g);
        }
        let v = primitive(v);
        if is_zero(&v) {
            continue;
        }
        let q = bilinear(m, &v, &v);
        if q == 0 {
            return Some((v, q));
        }
        if best.as_ref().is_none_or(|(_, b)| q.unsigned_abs_ref() < b.unsigned_abs_ref()) {
            best = Some((v, q));
        }
    }
    best
}

fn gcd_i64(a: i64, b: i64) -> i64 {
    let (mut a, mut b) = (a.abs(), b.abs());
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a
}

/// A coefficient of the diagonal equation: a sign and its prime factorisation.
#[derive(Clone, Debug)]
struct Coefficient {
    negative: bool,
    primes: BTreeMap<Natural, u32>,
}

impl Coefficient {
    fn value(&self) -> Integer {
        let v = self.primes.iter().fold(Integer::ONE, |acc, (p, e)| {
            let mut acc = acc;
            for _ in 0..*e {
                acc *= Integer::from(p.clone());
            }
            acc
        });
        if self.negative {
            -v
        } else {
            v
        }
    }
}

/// A non-trivial integer zero of `v^T m v`, primitive. Errors:
/// [`ErrorKind::InvalidValue`] when the conic has no rational point (or
/// `m` is singular); [`ErrorKind::TooLarge`] when the short vectors held
/// no zero; factoring errors from `limits`.
pub(crate) fn conic_point(m: &Sym3, limits: &FactorLimits) -> Result<Vec3, Error> {
    let unit = |i: usize| {
        let mut v: Vec3 = [Integer::ZERO, Integer::ZERO, Integer::ZERO];
        v[i] = Integer::ONE;
        v
    };
    let units = [unit(0), unit(1), unit(2)];
    // the first diagonal vector: a small vector of small value
    let (v1, q1) = small_value(m, &units, 2).ok_or_else(|| Error::new(ErrorKind::InvalidValue, "the zero form"))?;
    if q1 == 0 {
        return Ok(v1);
    }
    // its orthogonal complement, spanned by two of l x e_k
    let l: Vec3 = [bilinear(m, &v1, &units[0]), bilinear(m, &v1, &units[1]), bilinear(m, &v1, &units[2])];
    let cands: Vec<Vec3> = units.iter().map(|e| primitive(cross(&l, e))).filter(|w| !is_zero(w)).collect();
    let mut pair = None;
    'outer: for i in 0..cands.len() {
        for j in i + 1..cands.len() {
            if !is_zero(&cross(&cands[i], &cands[j])) {
                pair = Some((cands[i].clone(), cands[j].clone()));
                break 'outer;
            }
        }
    }
    let (w1, w2) = pair.ok_or_else(|| Error::new(ErrorKind::InvalidValue, "a singular conic"))?;
    let (y, q2) = small_value(m, &[w1.clone(), w2.clone()], 3).ok_or_else(|| Error::new(ErrorKind::InvalidValue, "a singular conic"))?;
    if q2 == 0 {
        return Ok(y);
    }
    let z = primitive(combine(&bilinear(m, &y, &w2), &w1, &-bilinear(m, &y, &w1), &w2));
    let q3 = bilinear(m, &z, &z);
    if is_zero(&z) {
        return Err(Error::new(ErrorKind::InvalidValue, "a singular conic"));
    }
    if q3 == 0 {
        return Ok(z);
    }
    let diag = [q1, q2, q3];
    let frame = [v1, y, z];
    // Legendre's normal form, with the substitution X_i = scale_i Y_i
    let mut coefs = Vec::with_capacity(3);
    for d in &diag {
        let f = factor(d, limits)?;
        coefs.push(Coefficient { negative: *d < 0, primes: f.factors().iter().cloned().collect() });
    }
    let mut scale = [Rational::ONE, Rational::ONE, Rational::ONE];
    for (c, s) in coefs.iter_mut().zip(scale.iter_mut()) {
        for (p, e) in c.primes.iter_mut() {
            for _ in 0..*e / 2 {
                *s /= Rational::from(p.clone());
            }
            *e %= 2;
        }
        c.primes.retain(|_, e| *e > 0);
    }
    let all: std::collections::BTreeSet<Natural> = coefs.iter().flat_map(|c| c.primes.keys().cloned()).collect();
    for p in all {
        let has: Vec<usize> = (0..3).filter(|&i| coefs[i].primes.contains_key(&p)).collect();
        match has.len() {
            3 => {
                for c in coefs.iter_mut() {
                    c.primes.remove(&p);
                }
            }
            2 => {
                for &i in &has {
                    coefs[i].primes.remove(&p);
                    scale[i] /= Rational::from(p.clone());
                }
                let k = (0..3).find(|i| !has.contains(i)).unwrap_or(0);
                coefs[k].primes.insert(p.clone(), 1);
            }
            _ => {}
        }
    }
    if coefs.iter().all(|c| c.negative) || coefs.iter().all(|c| !c.negative) {
        return Err(Error::new(ErrorKind::InvalidValue, "the conic has no real point"));
    }
    let sol = legendre(&coefs, limits)?;
    // back to the frame: X_i = scale_i Y_i
    let mut v = [Rational::ZERO, Rational::ZERO, Rational::ZERO];
    for i in 0..3 {
        let xi = &scale[i] * Rational::from(sol[i].clone());
        for k in 0..3 {
            v[k] += &xi * Rational::from(frame[i][k].clone());
        }
    }
    let den = v.iter().fold(Natural::ONE, |acc, x| {
        let d = x.to_denominator();
        let g = (&acc).gcd(&d);
        acc * d / g
    });
    let out = primitive(v.map(|x| Integer::try_from(x * Rational::from(den.clone())).unwrap_or(Integer::ZERO)));
    if is_zero(&out) || bilinear(m, &out, &out) != 0 {
        return Err(Error::internal("the conic solver", "the point found is not on the conic"));
    }
    Ok(out)
}

/// A root of `r^2 = n` modulo the square-free `|modulus|` with the given
/// primes, by the Chinese remainder theorem; `None` when one prime has none.
fn sqrt_mod_squarefree(n: &Integer, primes: &BTreeMap<Natural, u32>) -> Option<Integer> {
    let mut r = Integer::ZERO;
    let mut modulus = Integer::ONE;
    for p in primes.keys() {
        let pi = Integer::from(p.clone());
        let rp = if *p == 2u32 { n.rem_euclid_ref(&Integer::from(2)) } else { sqrt_mod_prime_power(n, p, 1)? };
        // r = r + modulus * ((rp - r) / modulus mod p)
        let inv = inv_mod(&modulus, &pi)?;
        let t = ((&rp - &r) * inv).rem_euclid_ref(&pi);
        r += &modulus * t;
        modulus *= pi;
    }
    Some(r)
}

/// A zero of `a x^2 + b y^2 + c z^2` for square-free, pairwise coprime
/// coefficients of mixed signs: a short vector of Legendre's lattice, else
/// Lagrange's descent ([`lagrange`]).
fn legendre(coefs: &[Coefficient], limits: &FactorLimits) -> Result<Vec3, Error> {
    let v: Vec<Integer> = coefs.iter().map(Coefficient::value).collect();
    let (a, b, c) = (&v[0], &v[1], &v[2]);
    let none = || Error::new(ErrorKind::InvalidValue, "the conic has no rational point (no square root modulo a coefficient)");
    // the three congruences, each `l . v = 0 (mod |coef|)`
    let mut rows: Vec<(Vec3, Integer)> = Vec::new();
    let specs = [(0usize, 1usize, 2usize), (1, 2, 0), (2, 0, 1)];
    for (i, j, k) in specs {
        // mod |v_i|: v_j y_j^2 + v_k y_k^2 = 0, so v_j y_j = r y_k with r^2 = -v_j v_k
        let m = v[i].clone().abs();
        if m == 1u32 {
            continue;
        }
        let r = sqrt_mod_squarefree(&-(&v[j] * &v[k]), &coefs[i].primes).ok_or_else(none)?;
        let t = (r * inv_mod(&v[j], &m).ok_or_else(none)?).rem_euclid_ref(&m);
        let mut l: Vec3 = [Integer::ZERO, Integer::ZERO, Integer::ZERO];
        l[j] = Integer::ONE;
        l[k] = -t;
        rows.push((l, m));
    }
    let mut basis: [Vec3; 3] = [
        [Integer::ONE, Integer::ZERO, Integer::ZERO],
        [Integer::ZERO, Integer::ONE, Integer::ZERO],
        [Integer::ZERO, Integer::ZERO, Integer::ONE],
    ];
    for (l, m) in &rows {
        intersect(&mut basis, l, m);
    }
    let weights = [a.clone().abs(), b.clone().abs(), c.clone().abs()];
    lll(&mut basis, &weights);
    let value = |x: &Vec3| a * &x[0] * &x[0] + b * &x[1] * &x[1] + c * &x[2] * &x[2];
    let mut tries: Vec<[i64; 3]> = Vec::new();
    for i in -3i64..=3 {
        for j in -3i64..=3 {
            for k in -3i64..=3 {
                tries.push([i, j, k]);
            }
        }
    }
    tries.sort_by_key(|t| t.iter().map(|x| x.abs()).max().unwrap_or(0) * 16 + t.iter().map(|x| x.abs()).sum::<i64>());
    for t in tries {
        if t == [0, 0, 0] {
            continue;
        }
        let mut x: Vec3 = [Integer::ZERO, Integer::ZERO, Integer::ZERO];
        for (coef, row) in t.iter().zip(basis.iter()) {
            x = combine(&Integer::ONE, &x, &Integer::from(*coef), row);
        }
        if !is_zero(&x) && value(&x) == 0 {
            return Ok(x);
        }
    }
    // no short vector is a zero: Lagrange's descent on Z^2 = A X^2 + B Y^2
    // with A = -ac, B = -bc (square-free, as a, b, c are pairwise coprime),
    // Z = c z; its solution (X, Y, Z) gives the zero (c X, c Y, Z)
    let (x, y, z) = lagrange(-(a * c), -(b * c), limits)?;
    let out = primitive([c * &x, c * &y, z]);
    if is_zero(&out) || value(&out) != 0 {
        return Err(Error::internal("the conic solver", "Lagrange's descent gave a point off the conic"));
    }
    Ok(out)
}

/// The square-free part of a non-zero integer (sign kept) and the square
/// root of the rest: `n = s m^2`, with the primes of `s`.
fn squarefree_split(n: &Integer, limits: &FactorLimits) -> Result<(Integer, Integer, BTreeMap<Natural, u32>), Error> {
    let f = factor(n, limits)?;
    let mut s = if *n < 0 { Integer::NEGATIVE_ONE } else { Integer::ONE };
    let mut m = Integer::ONE;
    let mut primes = BTreeMap::new();
    for (p, e) in f.factors() {
        let pi = Integer::from(p.clone());
        for _ in 0..e / 2 {
            m *= &pi;
        }
        if e % 2 == 1 {
            s *= &pi;
            primes.insert(p.clone(), 1);
        }
    }
    Ok((s, m, primes))
}

/// A non-trivial solution of `Z^2 = A X^2 + B Y^2` (`A`, `B` square-free,
/// not zero) by Lagrange's descent (Lagrange 1768; Cremona and Rusin 2003,
/// section 2): with `|A| <= |B|`, a root `t^2 = A (mod B)` with
/// `|t| <= |B|/2` gives `t^2 - A = B B' m^2` with `B'` square-free and
/// `|B'| <= |B|/4 + 1 < |B|`; a solution `(X, Y, Z)` for `(A, B')` gives
/// `(t X + Z, B' m Y, t Z + A X)` for `(A, B)`, since
/// `N(t + sqrt A) N(Z + X sqrt A) = B (B' m Y)^2`. The larger coefficient
/// falls at every step. [`ErrorKind::InvalidValue`] when there is no
/// solution (no real point, or no square root modulo a coefficient:
/// Legendre's theorem).
fn lagrange(a: Integer, b: Integer, limits: &FactorLimits) -> Result<(Integer, Integer, Integer), Error> {
    let none = || Error::new(ErrorKind::InvalidValue, "the conic has no rational point (Lagrange's descent: no square root modulo a coefficient)");
    // the steps taken: Swap, or Step(t, A, B' m) to map a solution back
    enum Back {
        Swap,
        Diagonal(Integer),
        Step(Integer, Integer, Integer),
    }
    let mut back = Vec::new();
    let (mut a, mut b) = (a, b);
    let mut b_primes: Option<BTreeMap<Natural, u32>> = None;
    let mut guard = 0u32;
    let (mut x, mut y, mut z) = loop {
        guard += 1;
        if guard > 100_000 || a == 0 || b == 0 {
            return Err(Error::internal("the conic solver", "Lagrange's descent did not end"));
        }
        if a < 0 && b < 0 {
            return Err(Error::new(ErrorKind::InvalidValue, "the conic has no real point"));
        }
        if a == 1u32 {
            break (Integer::ONE, Integer::ZERO, Integer::ONE);
        }
        if b == 1u32 {
            break (Integer::ZERO, Integer::ONE, Integer::ONE);
        }
        if a == -b.clone() {
            break (Integer::ONE, Integer::ONE, Integer::ZERO);
        }
        if a == b {
            // A (X^2 + Y^2) = Z^2 from X'^2 + Z'^2 = A Y'^2, i.e. (-1, A)
            back.push(Back::Diagonal(a.clone()));
            a = Integer::NEGATIVE_ONE;
            b_primes = None;
            continue;
        }
        if a.unsigned_abs_ref() > b.unsigned_abs_ref() {
            back.push(Back::Swap);
            std::mem::swap(&mut a, &mut b);
            b_primes = None;
            continue;
        }
        let primes = match b_primes.take() {
            Some(pr) => pr,
            None => squarefree_split(&b, limits)?.2,
        };
        let modulus = b.clone().abs();
        let mut t = sqrt_mod_squarefree(&a, &primes).ok_or_else(none)?;
        if t.clone() * Integer::from(2) > modulus {
            t -= &modulus;
        }
        let k = (&t * &t - &a) / &b;
        if k == 0 {
            return Err(Error::internal("the conic solver", "a square-free coefficient that is a square"));
        }
        let (b2, m, primes2) = squarefree_split(&k, limits)?;
        back.push(Back::Step(t, a.clone(), &b2 * m));
        b = b2;
        b_primes = Some(primes2);
    };
    while let Some(step) = back.pop() {
        (x, y, z) = match step {
            Back::Swap => (y, x, z),
            // (X', Y', Z') for (-1, A): X'^2 + Z'^2 = A Y'^2, so (X', Z', A Y')
            Back::Diagonal(a) => (x, z, a * y),
            Back::Step(t, a, bm) => (&t * &x + &z, bm * y, &t * &z + a * &x),
        };
        let g = Integer::from([&x, &y, &z].iter().fold(Natural::ZERO, |g, c| g.gcd(c.unsigned_abs_ref())));
        if g > 1u32 {
            x /= &g;
            y /= &g;
            z /= &g;
        }
    }
    Ok((x, y, z))
}

/// Replaces the rows of `basis` by a basis of `{x in span : l . x = 0 (mod m)}`.
fn intersect(basis: &mut [Vec3; 3], l: &Vec3, m: &Integer) {
    let dot = |x: &Vec3| &l[0] * &x[0] + &l[1] * &x[1] + &l[2] * &x[2];
    let mut h: Vec<Integer> = basis.iter().map(dot).collect();
    for j in 1..3 {
        while h[j] != 0 {
            let q = h[0].clone().div_round(h[j].clone(), RoundingMode::Floor).0;
            let bj = basis[j].clone();
            basis[0] = combine(&Integer::ONE, &basis[0], &-q.clone(), &bj);
            h[0] = &h[0] - &q * &h[j];
            basis.swap(0, j);
            h.swap(0, j);
        }
    }
    let g = Integer::from(h[0].unsigned_abs_ref().gcd(m.unsigned_abs_ref()));
    let f = m.clone().abs() / g;
    basis[0] = basis[0].clone().map(|c| c * &f);
}

/// LLL reduction (factor 3/4) of three rows for `sum w_i x_i^2`.
fn lll(basis: &mut [Vec3; 3], w: &[Integer; 3]) {
    let dot = |x: &Vec3, y: &Vec3| Rational::from(&w[0] * &x[0] * &y[0] + &w[1] * &x[1] * &y[1] + &w[2] * &x[2] * &y[2]);
    let gram_schmidt = |b: &[Vec3; 3]| {
        let mut mu = [[Rational::ZERO, Rational::ZERO, Rational::ZERO], [Rational::ZERO, Rational::ZERO, Rational::ZERO], [
            Rational::ZERO,
            Rational::ZERO,
            Rational::ZERO,
        ]];
        let mut bn = [Rational::ZERO, Rational::ZERO, Rational::ZERO];
        for i in 0..3 {
            let mut r = dot(&b[i], &b[i]);
            for j in 0..i {
                let mut x = dot(&b[i], &b[j]);
                for k in 0..j {
                    x -= &mu[j][k] * &mu[i][k] * &bn[k];
                }
                mu[i][j] = if bn[j] == 0 { Rational::ZERO } else { x / &bn[j] };
                r -= &mu[i][j] * &mu[i][j] * &bn[j];
            }
            bn[i] = r;
        }
        (mu, bn)
    };
    let mut k = 1usize;
    let mut guard = 0u32;
    while k < 3 && guard < 10_000 {
        guard += 1;
        for j in (0..k).rev() {
            let (mu, _) = gram_schmidt(basis);
            let q = Integer::rounding_from(&mu[k][j], RoundingMode::Nearest).0;
            if q != 0 {
                let bj = basis[j].clone();
                basis[k] = combine(&Integer::ONE, &basis[k], &-q, &bj);
            }
        }
        let (mu, bn) = gram_schmidt(basis);
        let lhs = &bn[k];
        let rhs = (Rational::from_signeds(3, 4) - &mu[k][k - 1] * &mu[k][k - 1]) * &bn[k - 1];
        if *lhs >= rhs {
            k += 1;
        } else {
            basis.swap(k, k - 1);
            k = k.saturating_sub(1).max(1);
        }
    }
}

use malachite::base::num::conversion::traits::RoundingFrom;

#[cfg(test)]
mod tests {
    use super::*;

    fn sym(v: [[i64; 3]; 3]) -> Sym3 {
        v.map(|r| r.map(Integer::from))
    }

    /// x^2 + y^2 - 2 z^2 has (1, 1, 1); 3x^2 + 5y^2 - 7z^2 has no point
    /// (5 is not a square mod 3; checked by hand, Legendre's theorem).
    #[test]
    fn small_conics() {
        let m = sym([[1, 0, 0], [0, 1, 0], [0, 0, -2]]);
        let p = conic_point(&m, &FactorLimits::default()).unwrap();
        assert_eq!(bilinear(&m, &p, &p), 0);
        let m = sym([[3, 0, 0], [0, 5, 0], [0, 0, -7]]);
        assert_eq!(*conic_point(&m, &FactorLimits::default()).unwrap_err().kind(), ErrorKind::InvalidValue);
    }

    /// Lagrange's descent alone (the fallback when no short lattice vector
    /// is a zero): soluble pairs built by construction from a chosen
    /// solution, the diagonal and opposite cases, and insoluble ones
    /// (Legendre's theorem: 3x^2 + 5y^2 - 7z^2 as Z^2 = 21 X^2 + 35 Y^2 has
    /// no point since 5 is not a square mod 3; Z^2 = 3X^2 + 3Y^2 since -1 is
    /// not a square mod 3; Z^2 = -2X^2 - 5Y^2 has no real point; by hand).
    #[test]
    fn lagrange_descent() {
        let limits = FactorLimits::default();
        let check = |a: i64, b: i64| {
            let (x, y, z) = lagrange(Integer::from(a), Integer::from(b), &limits).unwrap();
            assert!(!(x == 0 && y == 0 && z == 0));
            assert_eq!(&z * &z, Integer::from(a) * &x * &x + Integer::from(b) * &y * &y, "A = {a}, B = {b}");
        };
        for (a, b) in [(2, 2), (5, 5), (-1, 5), (5, -1), (2, 7), (7, 2), (-7, 7), (13, 17), (-2, 3), (1, 1), (3, 1), (-6, 10)] {
            check(a, b);
        }
        for (a, b) in [(21, 35), (3, 3), (-2, -5), (3, 5), (-1, 3)] {
            assert_eq!(*lagrange(Integer::from(a), Integer::from(b), &limits).unwrap_err().kind(), ErrorKind::InvalidValue, "A = {a}, B = {b}");
        }
        // by construction: Z^2 - A X^2 = s m^2 gives the pair (A, s), soluble
        let mut seed = 777u64;
        let mut next = |r: u64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            (seed >> 33) % r
        };
        let mut tried = 0;
        while tried < 60 {
            let a = next(2_000_000) as i64 - 1_000_000;
            let (x, z) = (next(1_000_000) as i64 + 1, next(1_000_000_000) as i64);
            let (s, _, _) = squarefree_split(&Integer::from(a), &limits).unwrap();
            if s != a || a == 0 {
                continue; // A must be square-free
            }
            let n = Integer::from(z) * Integer::from(z) - Integer::from(a) * Integer::from(x) * Integer::from(x);
            if n == 0 {
                continue;
            }
            let (s, _, _) = squarefree_split(&n, &limits).unwrap();
            let s = i64::try_from(&s).unwrap();
            check(a, s);
            tried += 1;
        }
    }

    /// Legendre forms `a x^2 + b y^2 + c z^2` (square-free, pairwise
    /// coprime, mixed signs) built around a chosen zero `(x, y, m)`:
    /// `c m^2 = -(a x^2 + b y^2)`; coefficients up to about 1e15, where a
    /// short vector of the lattice may miss and Lagrange's descent takes
    /// over. Invented data; the zero found is checked exactly.
    #[test]
    fn legendre_forms_with_a_chosen_zero() {
        let limits = FactorLimits::default();
        let mut seed = 4242u64;
        let mut next = |r: u64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            (seed >> 33) % r
        };
        let coef = |n: &Integer| {
            let f = factor(n, &limits).unwrap();
            Coefficient { negative: *n < 0, primes: f.factors().iter().cloned().collect() }
        };
        let mut done = 0;
        while done < 40 {
            let a = Integer::from(next(1 << 24) + 1);
            let b = -Integer::from(next(1 << 24) + 1);
            let (x, y) = (Integer::from(next(1 << 16)), Integer::from(next(1 << 16) + 1));
            let n = -(&a * &x * &x + &b * &y * &y);
            if n == 0 {
                continue;
            }
            let (sa, _, _) = squarefree_split(&a, &limits).unwrap();
            let (sb, _, _) = squarefree_split(&b, &limits).unwrap();
            let (c, _, _) = squarefree_split(&n, &limits).unwrap();
            let g = |u: &Integer, v: &Integer| u.unsigned_abs_ref().gcd(v.unsigned_abs_ref());
            if sa != a || sb != b || g(&a, &b) != 1u32 || g(&a, &c) != 1u32 || g(&b, &c) != 1u32 {
                continue;
            }
            let coefs = [coef(&a), coef(&b), coef(&c)];
            let z = legendre(&coefs, &limits).unwrap();
            assert!(!is_zero(&z));
            assert_eq!(&a * &z[0] * &z[0] + &b * &z[1] * &z[1] + &c * &z[2] * &z[2], 0);
            // the fallback alone on the same form: Z^2 = -ac X^2 - bc Y^2
            let (x2, y2, z2) = lagrange(-(&a * &c), -(&b * &c), &limits).unwrap();
            assert_eq!(&z2 * &z2, -(&a * &c) * &x2 * &x2 - (&b * &c) * &y2 * &y2);
            assert!(!(x2 == 0 && y2 == 0 && z2 == 0));
            done += 1;
        }
    }

    /// Random soluble conics: the form built around a chosen zero always
    /// gives back a zero (invented data for the check).
    #[test]
    fn conics_through_a_chosen_point() {
        let mut seed = 12345u64;
        let mut next = || {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % 2001) as i64 - 1000
        };
        for _ in 0..40 {
            // M = A^T D A with D = diag(1, -1, d) has the zero A^{-1}(1, 1, 0)
            let a: [[i64; 3]; 3] = [[next(), next(), next()], [next(), next(), next()], [next(), next(), next()]];
            let d = next().abs() + 2;
            let dm = [1i64, -1, d];
            let mut m: Sym3 = Default::default();
            for i in 0..3 {
                for j in 0..3 {
                    let mut s = Integer::ZERO;
                    for k in 0..3 {
                        s += Integer::from(a[k][i]) * Integer::from(dm[k]) * Integer::from(a[k][j]);
                    }
                    m[i][j] = s;
                }
            }
            let det = &m[0][0] * (&m[1][1] * &m[2][2] - &m[1][2] * &m[2][1]) - &m[0][1] * (&m[1][0] * &m[2][2] - &m[1][2] * &m[2][0])
                + &m[0][2] * (&m[1][0] * &m[2][1] - &m[1][1] * &m[2][0]);
            if det == 0 {
                continue;
            }
            let p = conic_point(&m, &FactorLimits::default()).unwrap();
            assert!(!is_zero(&p));
            assert_eq!(bilinear(&m, &p, &p), 0);
        }
    }
}
