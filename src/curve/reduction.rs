//! Reduction modulo a prime of good reduction: `#E(F_p)` and `a_p`.
//!
//! One word-level routine, [`PointCounter`], does the counting for the
//! whole crate (the curve methods, the root-number test and the L-series):
//! it keeps the invariants and a reusable table of quadratic characters, so
//! a run over many primes allocates only when the table has to grow.

use super::Curve;
use malachite::base::num::arithmetic::traits::Mod;
use malachite::Integer;

fn residue(n: &Integer, p: u64) -> u64 {
    let r: Integer = n.mod_op(Integer::from(p));
    // invariant: a residue mod p < 2^64 is in [0, p) and fits a u64
    u64::try_from(&r).expect("residue fits a word")
}

/// Counts points of the reductions of one curve modulo many primes, with
/// a reusable table of quadratic characters (no allocation per prime once
/// the table is large enough).
///
/// For odd `p` it sums the Legendre symbols of
/// `f(x) = 4x^3 + b2 x^2 + 2 b4 x + b6` over `x` in `F_p` (from
/// `(2y + a1 x + a3)^2 = f(x)`), stepping `f` by forward differences, so
/// the cost is `O(p)` additions of words plus `p/2` products for the table
/// of squares. Meant for primes below about `10^7`; primes must be below
/// `2^32` (a documented precondition; the methods panic otherwise).
///
/// ```
/// use twofold::{Curve, curve::PointCounter};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (Cremona 1997, Table 1): a_2 = -2, a_3 = -1, a_5 = 1, a_7 = -2
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let mut counter = PointCounter::new(&e);
/// let traces: Vec<i64> = [2, 3, 5, 7].iter().map(|&p| counter.trace(p)).collect();
/// assert_eq!(traces, vec![-2, -1, 1, -2]);
/// assert_eq!(counter.count(5), 5);
/// ```
#[derive(Clone, Debug)]
pub struct PointCounter {
    ainv: [Integer; 5],
    b: [Integer; 3],
    chi: Vec<i8>,
}

impl PointCounter {
    /// A counter for the reductions of `curve` (any integral model; the
    /// counts are those of this model's reduction).
    ///
    /// ```
    /// use twofold::{Curve, curve::PointCounter};
    /// let mut c = PointCounter::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap());
    /// assert_eq!(c.trace(2), -2); // y^2 + y = x^3 - x, the published table (Cremona 1997)
    /// ```
    pub fn new(curve: &Curve) -> PointCounter {
        let a = curve.coefficients();
        let b = curve.b_invariants();
        PointCounter {
            ainv: [a[0].clone(), a[1].clone(), a[2].clone(), a[3].clone(), a[4].clone()],
            b: [b[0].clone(), b[1].clone(), b[2].clone()],
            chi: Vec::new(),
        }
    }

    /// `#E~(F_p)`, the number of points of the reduction modulo the prime
    /// `p`, including the point at infinity (at a bad prime: the points of
    /// the singular cubic, the singular point included).
    ///
    /// ```
    /// use twofold::{Curve, curve::PointCounter};
    /// let mut c = PointCounter::new(&Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap());
    /// assert_eq!(c.count(2), 5); // y^2 + y = x^3 - x^2 - 10x - 20 has a rational 5-torsion point
    /// ```
    pub fn count(&mut self, p: u64) -> u64 {
        (p as i64 + 1 - self.trace(p)) as u64
    }

    /// `p + 1 - #E~(F_p)`: the trace of Frobenius `a_p` at a good prime.
    ///
    /// ```
    /// use twofold::{Curve, curve::PointCounter};
    /// let mut c = PointCounter::new(&Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap());
    /// assert_eq!(c.trace(2), -2); // y^2 + y = x^3 + x^2 - 2x: a_2 = -2 (published table, Cremona 1997, from memory)
    /// ```
    pub fn trace(&mut self, p: u64) -> i64 {
        assert!((2..(1 << 32)).contains(&p), "point counts need a prime below 2^32");
        if p == 2 {
            let a: Vec<u64> = self.ainv.iter().map(|c| residue(c, 2)).collect();
            let mut count = 1i64; // the point at infinity
            for x in 0..2u64 {
                for y in 0..2u64 {
                    let lhs = (y * y + a[0] * x * y + a[2] * y) % 2;
                    let rhs = (x * x * x + a[1] * x * x + a[3] * x + a[4]) % 2;
                    if lhs == rhs {
                        count += 1;
                    }
                }
            }
            return 3 - count;
        }
        let (b2, b4, b6) = (residue(&self.b[0], p), residue(&self.b[1], p), residue(&self.b[2], p));
        let pu = p as usize;
        let chi = &mut self.chi;
        chi.clear();
        chi.resize(pu, -1);
        chi[0] = 0;
        // squares s^2 mod p for s = 1..(p-1)/2 by (s+1)^2 = s^2 + 2s + 1
        let (mut sq, mut step) = (1u64, 3u64);
        for _ in 1..=(p / 2) {
            chi[sq as usize] = 1;
            sq += step;
            while sq >= p {
                sq -= p;
            }
            step += 2;
            if step >= p {
                step -= p;
            }
        }
        // f(x) = A x^3 + B x^2 + C x + D by forward differences:
        // Δf(0) = A + B + C, Δ²f(0) = 6A + 2B, Δ³f = 6A.
        let (ca, cb, cc) = (4 % p, b2, 2 * b4 % p);
        let add = |u: u64, v: u64| -> u64 {
            let w = u + v;
            if w >= p {
                w - p
            } else {
                w
            }
        };
        let mut f = b6;
        let mut d1 = (ca + cb + cc) % p;
        let mut d2 = (6 * ca + 2 * cb) % p;
        let d3 = 6 * ca % p;
        let mut total = 0i64;
        for _ in 0..p {
            total += i64::from(chi[f as usize]);
            f = add(f, d1);
            d1 = add(d1, d2);
            d2 = add(d2, d3);
        }
        -total
    }
}

impl Curve {
    /// The number of points of the reduction modulo `p`, `#E~(F_p)`, counted
    /// exactly, including the point at infinity. For a prime of bad reduction
    /// this counts the points of the singular cubic (the non-singular ones
    /// plus the singular point), which callers rarely want.
    ///
    /// Cost: O(p) word operations (see [`PointCounter`], which to prefer
    /// for many primes); meant for `p < 10^7`. Panics if `p` is not below
    /// 2^32 (a documented precondition).
    ///
    /// ```
    /// use twofold::Curve;
    /// // y^2 + y = x^3 - x^2 - 10x - 20 (y^2 + y = x^3 - x^2 - 10x - 20 in the published table (Cremona 1997)): a_2 = -2, a_3 = -1
    /// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
    /// assert_eq!(e.count_points_mod(2), 5);
    /// assert_eq!(e.count_points_mod(3), 5);
    /// ```
    pub fn count_points_mod(&self, p: u64) -> u64 {
        PointCounter::new(self).count(p)
    }

    /// The trace of Frobenius `a_p = p + 1 - #E(F_p)` at a prime `p`.
    ///
    /// ```
    /// use twofold::Curve;
    /// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(); // y^2 + y = x^3 - x, the published table (Cremona 1997)
    /// assert_eq!(e.trace_of_frobenius(2), -2);
    /// assert_eq!(e.trace_of_frobenius(3), -3);
    /// assert_eq!(e.trace_of_frobenius(5), -2);
    /// ```
    pub fn trace_of_frobenius(&self, p: u64) -> i64 {
        PointCounter::new(self).trace(p)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::primes_up_to;

    /// Brute force over all (x, y) in F_p^2.
    fn naive(e: &Curve, p: u64) -> u64 {
        let a: Vec<u64> = e.coefficients().iter().map(|c| residue(c, p)).collect();
        let mut n = 1;
        for x in 0..p {
            for y in 0..p {
                let lhs = (y * y + a[0] * x * y + a[2] * y) % p;
                let rhs = (x * x % p * x + a[1] * x % p * x + a[3] * x + a[4]) % p;
                if lhs == rhs {
                    n += 1;
                }
            }
        }
        n
    }

    #[test]
    fn counter_matches_brute_force() {
        for a in [[1, -1, 1, -29, 53], [0, 0, 1, -7, 6], [1, 0, 1, 4, -6], [0, 0, 0, -1, 0]] {
            let e = Curve::from_coefficients(a).unwrap();
            let mut c = PointCounter::new(&e);
            for p in primes_up_to(200) {
                assert_eq!(c.count(p), naive(&e, p), "{a:?} p = {p}");
            }
        }
    }
}
