//! The verifier's own small exact arithmetic. Nothing here calls the code
//! that produced a certificate (solubility, descent, quartic modules): the
//! point of a certificate check is that it rests on these few lines and on
//! malachite alone.

use malachite::base::num::arithmetic::traits::{CheckedSqrt, DivisibleBy, Mod, ModPow, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use crate::solubility::Place;
use malachite::{Integer, Natural, Rational};

/// `v_p(n)` and the unit part `n / p^v` of a non-zero integer.
pub(crate) fn split(n: &Integer, p: &Integer) -> (u64, Integer) {
    if *p <= 1u32 {
        return (0, n.clone());
    }
    let mut u = n.clone();
    let mut v = 0u64;
    while u != 0u32 && (&u).divisible_by(p) {
        u /= p;
        v += 1;
    }
    (v, u)
}

/// The Legendre symbol of `u` modulo an odd prime `p` by Euler's criterion: 1, -1 or 0.
pub(crate) fn legendre(u: &Integer, p: &Integer) -> i8 {
    // invariant: callers pass an odd prime p > 0
    let pn = Natural::try_from(p.clone()).expect("positive prime");
    // invariant: mod_op by a positive p gives a value in [0, p)
    let r = Natural::try_from(u.mod_op(p)).expect("reduced mod p is non-negative");
    if r == 0u32 {
        return 0;
    }
    let e = (&pn - Natural::ONE) >> 1u64;
    if r.mod_pow(e, &pn) == 1u32 {
        1
    } else {
        -1
    }
}

/// Whether the non-zero integer `n` is a square in `Q_p` (Serre, A Course in
/// Arithmetic, II.3.3): even valuation and unit part a square mod `p`, or
/// `1 mod 8` for `p = 2`.
pub(crate) fn is_padic_square(n: &Integer, p: &Integer) -> bool {
    if *n == 0u32 {
        return false;
    }
    let (v, u) = split(n, p);
    if v % 2 == 1 {
        return false;
    }
    if *p == 2u32 {
        u.mod_op(Integer::from(8)) == 1u32
    } else {
        legendre(&u, p) == 1
    }
}

/// The value of the binary quartic `[a, b, c, d, e]` at `(x, z)`.
pub(crate) fn eval4(g: &[Integer; 5], x: &Integer, z: &Integer) -> Integer {
    let mut acc = Integer::ZERO;
    let mut xp = Integer::ONE;
    let mut zp = Integer::ONE;
    let mut xs = Vec::with_capacity(5);
    let mut zs = Vec::with_capacity(5);
    for _ in 0..5 {
        xs.push(xp.clone());
        zs.push(zp.clone());
        xp *= x;
        zp *= z;
    }
    for i in 0..5 {
        acc += &g[i] * &xs[4 - i] * &zs[i];
    }
    acc
}

/// The invariants `I = 12ae - 3bd + c^2`, `J = 72ace + 9bcd - 27ad^2 - 27eb^2 - 2c^3`.
pub(crate) fn invariants4(g: &[Integer; 5]) -> (Integer, Integer) {
    let [a, b, c, d, e] = g;
    let i = Integer::from(12) * a * e - Integer::from(3) * b * d + c * c;
    let j = Integer::from(72) * a * c * e + Integer::from(9) * b * c * d
        - Integer::from(27) * a * d * d
        - Integer::from(27) * e * b * b
        - Integer::from(2) * c * c * c;
    (i, j)
}

/// Deterministic Miller-Rabin for `n < 2^64` (the first twelve primes as
/// bases suffice below 3.3 * 10^24). `None` above 2^64.
pub(crate) fn is_prime_small(n: &Natural) -> Option<bool> {
    let n = u64::try_from(n).ok()?;
    if n < 2 {
        return Some(false);
    }
    const BASES: [u64; 12] = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37];
    for &b in &BASES {
        if n == b {
            return Some(true);
        }
        if n.is_multiple_of(b) {
            return Some(false);
        }
    }
    let mul = |a: u64, b: u64| ((a as u128 * b as u128) % n as u128) as u64;
    let pow = |mut a: u64, mut e: u64| {
        let mut r = 1u64;
        while e > 0 {
            if e & 1 == 1 {
                r = mul(r, a);
            }
            a = mul(a, a);
            e >>= 1;
        }
        r
    };
    let s = (n - 1).trailing_zeros();
    let d = (n - 1) >> s;
    'outer: for &b in &BASES {
        let mut x = pow(b, d);
        if x == 1 || x == n - 1 {
            continue;
        }
        for _ in 1..s {
            x = mul(x, x);
            if x == n - 1 {
                continue 'outer;
            }
        }
        return Some(false);
    }
    Some(true)
}

/// Whether a rational is the square of a rational.
pub(crate) fn is_rational_square(q: &Rational) -> bool {
    if *q < 0u32 {
        return false;
    }
    let (n, d) = q.to_numerator_and_denominator();
    (&n).checked_sqrt().is_some() && (&d).checked_sqrt().is_some()
}

/// The F2 vector of a non-zero rational over `-1` (bit 0) and `primes`
/// (bit i + 1): sign and exponent parities, provided the rest of the
/// rational is a square. `None` otherwise (or if more than 63 primes).
pub(crate) fn square_class_vector(q: &Rational, primes: &[Integer]) -> Option<u64> {
    if *q == 0u32 || primes.len() > 63 {
        return None;
    }
    let (n, d) = q.to_numerator_and_denominator();
    let mut v = (*q < 0u32) as u64;
    let mut rest = Vec::with_capacity(2);
    for part in [n, d] {
        let mut m = Integer::from(part);
        for (i, p) in primes.iter().enumerate() {
            let (e, u) = split(&m, p);
            m = u;
            if e % 2 == 1 {
                v ^= 1 << (i + 1);
            }
        }
        rest.push(m);
    }
    let r = Natural::try_from(&rest[0] * &rest[1]).ok()?;
    r.checked_sqrt()?;
    Some(v)
}

/// Rank over F2 of a set of vectors packed in `u64`.
pub(crate) fn f2_rank(vs: &[u64]) -> usize {
    let mut basis: Vec<u64> = Vec::new();
    for &v in vs {
        let mut w = v;
        for &b in &basis {
            w = w.min(w ^ b);
        }
        if w != 0 {
            basis.push(w);
            basis.sort_unstable_by(|a, b| b.cmp(a));
        }
    }
    basis.len()
}

/// A Weierstrass model for the verifier: invariants by the textbook
/// formulas (Silverman, AEC III.1) and the chord-and-tangent law (AEC III.2.3).
#[derive(Clone, Debug)]
pub(crate) struct Model {
    pub(crate) a: [Rational; 5],
}

impl Model {
    pub fn new(a: &[Integer; 5]) -> Model {
        Model { a: a.clone().map(Rational::from) }
    }
    pub fn b_invariants(&self) -> [Rational; 4] {
        let [a1, a2, a3, a4, a6] = &self.a;
        let b2 = a1 * a1 + Rational::from(4) * a2;
        let b4 = Rational::from(2) * a4 + a1 * a3;
        let b6 = a3 * a3 + Rational::from(4) * a6;
        let b8 = a1 * a1 * a6 + Rational::from(4) * a2 * a6 - a1 * a3 * a4 + a2 * a3 * a3 - a4 * a4;
        [b2, b4, b6, b8]
    }
    pub fn c4_c6_disc(&self) -> (Rational, Rational, Rational) {
        let [b2, b4, b6, b8] = self.b_invariants();
        let c4 = &b2 * &b2 - Rational::from(24) * &b4;
        let c6 = -(&b2 * &b2 * &b2) + Rational::from(36) * &b2 * &b4 - Rational::from(216) * &b6;
        let disc = -(&b2 * &b2 * &b8) - Rational::from(8) * &b4 * &b4 * &b4 - Rational::from(27) * &b6 * &b6
            + Rational::from(9) * &b2 * &b4 * &b6;
        (c4, c6, disc)
    }
    pub fn contains(&self, x: &Rational, y: &Rational) -> bool {
        let [a1, a2, a3, a4, a6] = &self.a;
        y * y + a1 * x * y + a3 * y == x * x * x + a2 * x * x + a4 * x + a6
    }
    /// `P + Q` with `None` for the point at infinity.
    pub fn add(&self, p: &Option<(Rational, Rational)>, q: &Option<(Rational, Rational)>) -> Option<(Rational, Rational)> {
        let [a1, a2, a3, a4, _] = &self.a;
        let (Some((x1, y1)), Some((x2, y2))) = (p, q) else {
            return p.clone().or(q.clone());
        };
        let lambda = if x1 == x2 {
            let yneg = -y1 - a1 * x1 - a3;
            if *y2 == yneg {
                return None;
            }
            let den = Rational::from(2) * y1 + a1 * x1 + a3;
            (Rational::from(3) * x1 * x1 + Rational::from(2) * a2 * x1 + a4 - a1 * y1) / den
        } else {
            (y2 - y1) / (x2 - x1)
        };
        let nu = y1 - &lambda * x1;
        let x3 = &lambda * &lambda + a1 * &lambda - a2 - x1 - x2;
        let y3 = -(&lambda + a1) * &x3 - &nu - a3;
        Some((x3, y3))
    }
    /// The order of a point if it is at most `bound`.
    pub fn small_order(&self, p: &(Rational, Rational), bound: u32) -> Option<u32> {
        let start = Some(p.clone());
        let mut q = start.clone();
        for n in 1..=bound {
            if q.is_none() {
                return Some(n);
            }
            if n == bound {
                break;
            }
            q = self.add(&q, &start);
        }
        None
    }
}

/// The outcome of the finite search for a point of `y^2 = g(x, z)` over `Q_p`.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) enum LocalAnswer {
    /// Every residue class was closed: no `Q_p` point.
    NoPoint,
    /// A residue class on which `g` is a non-zero square was found.
    HasPoint,
    /// The node budget ran out.
    Undecided,
}

/// Decides whether `g` takes a non-zero square value in `Q_p` on
/// `P^1(Q_p)`, by residue classes of the charts `(t, 1)`, `t in Z_p`, and
/// `(1, p t)`. A class `x0 + p^k Z_p` is closed when, writing
/// `g(x0 + p^k t) = h0 + h1 t + ...`, `v(h0) < v(hi)` for all `i >= 1` (so
/// the valuation is `v(h0)` on the whole class) and either `v(h0)` is odd
/// or the higher terms are divisible by `p^(v(h0)+1)` (`p^(v(h0)+3)` for
/// `p = 2`) and the unit part of `h0` is not a square mod `p` (mod 8); if
/// it is a square the class holds a point. Otherwise the class is split
/// into `p` subclasses. Common factors `p^2` are removed (they do not
/// change squareness).
pub(crate) fn padic_point_search(g: &[Integer; 5], p: &Integer, node_budget: usize) -> LocalAnswer {
    let pu = match u64::try_from(p) {
        Ok(v) if v <= 50_000 => v,
        _ => return LocalAnswer::Undecided,
    };
    let [a, b, c, d, e] = g;
    // low-to-high coefficients in t
    let chart1 = vec![e.clone(), d.clone(), c.clone(), b.clone(), a.clone()];
    let chart2 = vec![a.clone(), b * p, c * p.pow(2), d * p.pow(3), e * p.pow(4)];
    let mut stack = vec![chart1, chart2];
    let mut nodes = 0usize;
    let two = *p == 2u32;
    while let Some(mut h) = stack.pop() {
        nodes += 1;
        if nodes > node_budget {
            return LocalAnswer::Undecided;
        }
        let mut vals: Vec<Option<u64>> = h.iter().map(|c| if *c == 0u32 { None } else { Some(split(c, p).0) }).collect();
        let Some(w) = vals.iter().flatten().min().copied() else { return LocalAnswer::Undecided };
        if w >= 2 {
            let k = 2 * (w / 2);
            let q = p.pow(k);
            for c in h.iter_mut() {
                *c /= &q;
            }
            for v in vals.iter_mut().flatten() {
                *v -= k;
            }
        }
        let v0 = vals[0];
        let m = vals[1..].iter().flatten().min().copied();
        if let Some(v0) = v0 {
            if m.is_none_or(|m| v0 < m) {
                if v0 % 2 == 1 {
                    continue;
                }
                let need = if two { v0 + 3 } else { v0 + 1 };
                if m.is_none_or(|m| m >= need) {
                    if is_padic_square(&h[0], p) {
                        return LocalAnswer::HasPoint;
                    }
                    continue;
                }
            }
        }
        if nodes + stack.len() + pu as usize > node_budget {
            return LocalAnswer::Undecided;
        }
        split_class(&mut stack, &h, p, pu);
    }
    LocalAnswer::NoPoint
}

/// Pushes `h(r + p t)` for `r = 0..p`.
fn split_class(stack: &mut Vec<Vec<Integer>>, h: &[Integer], p: &Integer, pu: u64) {
    for r in 0..pu {
        let r = Integer::from(r);
        // Taylor shift by r (Horner), then scale t -> p t
        let mut s = h.to_vec();
        let n = s.len();
        for i in 0..n {
            for j in (i..n - 1).rev() {
                let t = &s[j + 1] * &r;
                s[j] += t;
            }
        }
        let mut pk = Integer::ONE;
        for c in s.iter_mut() {
            *c *= &pk;
            pk *= p;
        }
        stack.push(s);
    }
}

/// Whether `g` takes no positive value on `R^2 \ 0`, decided exactly for
/// biquadratic forms `A x^4 + C x^2 z^2 + E z^4` (the coverings of the
/// isogeny route); `None` for other forms.
pub(crate) fn real_negative(g: &[Integer; 5]) -> Option<bool> {
    let [a, b, c, d, e] = g;
    if *b != 0u32 || *d != 0u32 {
        return None;
    }
    Some(*a < 0u32 && *e < 0u32 && (*c <= 0u32 || c * c <= Integer::from(4) * a * e))
}

// ---- modular arithmetic in machine words (moved from verify.rs) ----

pub(crate) fn small_primes(limit: u64) -> impl Iterator<Item = u64> {
    (3..limit).filter(|&n| (2..).take_while(|d| d * d <= n).all(|d| n % d != 0))
}

pub(crate) fn modq(n: &Integer, q: u64) -> u64 {
    // invariant: a residue mod q < 2^64 is in [0, q) and fits a u64
    u64::try_from(&n.mod_op(Integer::from(q))).expect("reduced")
}

pub(crate) fn cubic_mod(b: &[Integer; 3], q: u64) -> [u64; 4] {
    // f(x) = 4x^3 + b2 x^2 + 2 b4 x + b6 mod q, high to low
    [4 % q, modq(&b[0], q), modq(&(Integer::from(2) * &b[1]), q), modq(&b[2], q)]
}

pub(crate) fn eval_cubic(f: &[u64; 4], x: u64, q: u64) -> u64 {
    let mut acc = 0u128;
    for &c in f {
        acc = (acc * x as u128 + c as u128) % q as u128;
    }
    acc as u64
}

/// Whether the 2-division cubic has no root modulo some good prime below 3000
/// (then it has no rational root).
pub(crate) fn cubic_rootless_somewhere(b: &[Integer; 3], disc: &Integer) -> bool {
    for q in small_primes(3000) {
        if disc.mod_op(Integer::from(q)) == 0u32 {
            continue;
        }
        let f = cubic_mod(b, q);
        if (0..q).all(|x| eval_cubic(&f, x, q) != 0) {
            return true;
        }
    }
    false
}

pub(crate) fn legendre_u64(a: u64, q: u64) -> i8 {
    legendre(&Integer::from(a), &Integer::from(q))
}

pub(crate) fn pow_mod(mut a: u64, mut e: u64, q: u64) -> u64 {
    let mut r = 1u128;
    let mut b = a as u128 % q as u128;
    while e > 0 {
        if e & 1 == 1 {
            r = r * b % q as u128;
        }
        b = b * b % q as u128;
        e >>= 1;
    }
    a = r as u64;
    a
}

/// F2 coordinates of a non-zero integer in `Q_v*/Q_v*^2`: 1 bit at R,
/// (valuation, non-residue) at odd p, (valuation, -1, 5) at 2.
pub(crate) fn local_coords(d: &Integer, place: &Place) -> u8 {
    match place {
        Place::Real => (*d < 0u32) as u8,
        Place::Prime(p) => {
            let pi = Integer::from(p.clone());
            let (v, u) = split(d, &pi);
            if *p == 2u32 {
                // invariant: a residue mod 8 is in [0, 8) and fits a u64
                let r = u64::try_from(&u.mod_op(Integer::from(8))).expect("reduced");
                ((v % 2) as u8) | (((r % 4) == 3) as u8) << 1 | ((r == 3 || r == 5) as u8) << 2
            } else {
                ((v % 2) as u8) | ((legendre(&u, &pi) == -1) as u8) << 1
            }
        }
    }
}

/// `x mod q` for a rational `x` and a prime `q`, or `None` when `q`
/// divides the denominator (the point reduces to infinity).
pub(crate) fn rational_mod(x: &Rational, q: u64) -> Option<u64> {
    let (n, d) = x.to_numerator_and_denominator();
    let dq = modq(&Integer::from(d), q);
    if dq == 0 {
        return None;
    }
    let nq = if *x < 0u32 { modq(&-Integer::from(n), q) } else { modq(&Integer::from(n), q) };
    let inv = pow_mod(dq, q - 2, q);
    Some((nq as u128 * inv as u128 % q as u128) as u64)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn i(v: i64) -> Integer {
        Integer::from(v)
    }

    #[test]
    fn padic_search_known_cases() {
        // y^2 = 2x^4 + 3z^4: no 3-adic point (values 2 mod 3 or 3 * unit) -- checked by hand
        let g = [2, 0, 0, 0, 3].map(i);
        assert_eq!(padic_point_search(&g, &i(3), 10_000), LocalAnswer::NoPoint);
        // 2x^4 - 34z^4 has points at 2 and 17 (Lind 1940, Reichardt 1942)
        let h = [2, 0, 0, 0, -34].map(i);
        assert_eq!(padic_point_search(&h, &i(2), 10_000), LocalAnswer::HasPoint);
        assert_eq!(padic_point_search(&h, &i(17), 10_000), LocalAnswer::HasPoint);
        // against brute force on small forms: a point mod p^6 search by the library's own decision
        for coeffs in [[1, 0, 0, 0, 3], [3, 0, 1, 0, 3], [-1, 2, 0, 5, 7], [5, 0, 0, 0, 5], [2, 1, 0, 0, 6]] {
            let g = coeffs.map(i);
            for p in [2u32, 3, 5, 7] {
                let lib = crate::solubility::local_witness(&g, &crate::solubility::Place::Prime(Natural::from(p))).is_some();
                let ours = padic_point_search(&g, &Integer::from(p), 100_000);
                assert_eq!(ours == LocalAnswer::HasPoint, lib, "{coeffs:?} at {p}");
                assert_ne!(ours, LocalAnswer::Undecided);
            }
        }
    }

    #[test]
    fn primes_and_squares() {
        assert_eq!(is_prime_small(&Natural::from(1_000_000_007u64)), Some(true));
        assert_eq!(is_prime_small(&Natural::from(3215031751u64)), Some(false)); // strong pseudoprime to 2,3,5,7 (from memory)
        assert!(is_padic_square(&i(-7), &i(2)));
        assert!(!is_padic_square(&i(-1), &i(3)));
        assert_eq!(square_class_vector(&Rational::from(-18), &[i(2), i(3)]), Some(0b011));
        assert_eq!(square_class_vector(&Rational::from(10), &[i(2), i(3)]), None);
        assert_eq!(f2_rank(&[0b11, 0b01, 0b10]), 2);
    }
}
