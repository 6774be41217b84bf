//! Small polynomial questions over the prime field F_p that Tate's algorithm
//! asks: roots of quadratics and cubics, with multiplicities.

use malachite::base::num::arithmetic::traits::{DivisibleBy, Mod, ModInverse};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::logic::traits::{BitAccess, SignificantBits};
use malachite::{Integer, Natural};

/// The prime field F_p, elements kept as integers in `[0, p)`.
#[derive(Clone, Debug)]
pub(crate) struct Fp {
    pub(crate) p: Natural,
    pub(crate) pi: Integer,
}

/// The roots in F_p of a quadratic `a X^2 + b X + c` with `a` a unit.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) enum QuadRoots {
    /// Two distinct roots over the algebraic closure; how many lie in F_p (0 or 2).
    Distinct(u32),
    /// One double root, which lies in F_p.
    Double(Integer),
}

/// The roots in F_p of a monic cubic.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) enum CubicRoots {
    /// Three distinct roots over the algebraic closure; how many lie in F_p.
    Distinct(u32),
    /// A double root (in F_p) and a simple one.
    Double(Integer),
    /// A triple root (in F_p).
    Triple(Integer),
}

impl Fp {
    pub(crate) fn new(p: &Natural) -> Fp {
        Fp { p: p.clone(), pi: Integer::from(p.clone()) }
    }

    pub(crate) fn red(&self, x: &Integer) -> Integer {
        x.mod_op(&self.pi)
    }

    pub(crate) fn is_zero(&self, x: &Integer) -> bool {
        x.divisible_by(&self.pi)
    }

    /// The inverse of a unit; panics on a multiple of p (internal use only).
    pub(crate) fn inv(&self, x: &Integer) -> Integer {
        // invariant: red gives a value in [0, p)
        let n = Natural::try_from(self.red(x)).expect("reduced value is non-negative");
        // invariant: callers invert only units mod p (documented above)
        Integer::from(n.mod_inverse(&self.p).expect("inverse of a non-unit mod p"))
    }

    fn mul(&self, x: &Integer, y: &Integer) -> Integer {
        self.red(&(x * y))
    }

    fn is_two(&self) -> bool {
        self.p == 2u32
    }

    /// The Legendre symbol (x/p) for odd p.
    fn legendre(&self, x: &Integer) -> i8 {
        crate::arith::jacobi(&self.red(x), &self.pi)
    }

    /// The roots of `a X^2 + b X + c`, `a` a unit mod p.
    pub(crate) fn quadratic(&self, a: &Integer, b: &Integer, c: &Integer) -> QuadRoots {
        if self.is_two() {
            // a = 1 in F_2: X^2 + X + c has two roots iff c = 0, none otherwise;
            // X^2 + c = (X + c)^2.
            return if self.is_zero(b) {
                QuadRoots::Double(self.red(c))
            } else if self.is_zero(c) {
                QuadRoots::Distinct(2)
            } else {
                QuadRoots::Distinct(0)
            };
        }
        let d = self.red(&(b * b - Integer::from(4) * a * c));
        if d == 0u32 {
            let two_a = self.red(&(Integer::from(2) * a));
            QuadRoots::Double(self.mul(&(-b), &self.inv(&two_a)))
        } else if self.legendre(&d) == 1 {
            QuadRoots::Distinct(2)
        } else {
            QuadRoots::Distinct(0)
        }
    }

    /// The roots of `T^3 + b T^2 + c T + d`.
    pub(crate) fn cubic(&self, b: &Integer, c: &Integer, d: &Integer) -> CubicRoots {
        let (b, c, d) = (self.red(b), self.red(c), self.red(d));
        if self.p < 5u32 {
            return self.cubic_by_search(&b, &c, &d);
        }
        // p >= 5: discriminant, then closed forms for the repeated root.
        let disc = self.red(
            &(&b * &b * &c * &c - Integer::from(4) * &c * &c * &c - Integer::from(4) * &b * &b * &b * &d
                - Integer::from(27) * &d * &d
                + Integer::from(18) * &b * &c * &d),
        );
        if disc != 0u32 {
            return CubicRoots::Distinct(self.count_cubic_roots(&b, &c, &d));
        }
        let alpha = self.mul(&(-&b), &self.inv(&Integer::from(3)));
        if self.red(&(&c - Integer::from(3) * &alpha * &alpha)) == 0u32
            && self.red(&(&d + &alpha * &alpha * &alpha)) == 0u32
        {
            return CubicRoots::Triple(alpha);
        }
        // P = (T - beta)^2 (T - gamma): beta = (9d - bc) / (2 (b^2 - 3c)).
        let num = self.red(&(Integer::from(9) * &d - &b * &c));
        let den = self.red(&(Integer::from(2) * (&b * &b - Integer::from(3) * &c)));
        CubicRoots::Double(self.mul(&num, &self.inv(&den)))
    }

    /// Root structure by trying every element (p = 2, 3), with multiplicities
    /// found by repeated synthetic division.
    fn cubic_by_search(&self, b: &Integer, c: &Integer, d: &Integer) -> CubicRoots {
        // invariant: this path runs only for p = 2, 3
        let p = u32::try_from(&self.p).expect("small prime");
        let mut simple = 0;
        for x in 0..p {
            let x = Integer::from(x);
            let mut poly = vec![d.clone(), c.clone(), b.clone(), Integer::ONE];
            let mut mult = 0;
            while poly.len() > 1 {
                // divide by (T - x)
                let n = poly.len();
                let mut q = vec![Integer::ZERO; n - 1];
                let mut carry = Integer::ZERO;
                for i in (0..n).rev() {
                    let v = self.red(&(&poly[i] + &carry * &x));
                    if i == 0 {
                        carry = v;
                    } else {
                        q[i - 1] = v.clone();
                        carry = v;
                    }
                }
                if carry != 0u32 {
                    break;
                }
                mult += 1;
                poly = q;
            }
            match mult {
                0 => {}
                1 => simple += 1,
                2 => return CubicRoots::Double(x),
                _ => return CubicRoots::Triple(x),
            }
        }
        CubicRoots::Distinct(simple)
    }

    /// The number of roots in F_p of a squarefree monic cubic, as the degree
    /// of gcd(T^p - T, P).
    fn count_cubic_roots(&self, b: &Integer, c: &Integer, d: &Integer) -> u32 {
        // Polynomials of degree < 3 modulo P, as [x0, x1, x2].
        let mulmod = |x: &[Integer; 3], y: &[Integer; 3]| -> [Integer; 3] {
            let mut z = vec![Integer::ZERO; 5];
            for i in 0..3 {
                for j in 0..3 {
                    z[i + j] += &x[i] * &y[j];
                }
            }
            // T^3 = -(b T^2 + c T + d)
            for k in (3..5).rev() {
                let top = self.red(&z[k]);
                z[k] = Integer::ZERO;
                z[k - 1] -= &top * b;
                z[k - 2] -= &top * c;
                z[k - 3] -= &top * d;
            }
            [self.red(&z[0]), self.red(&z[1]), self.red(&z[2])]
        };
        let t = [Integer::ZERO, Integer::ONE, Integer::ZERO];
        let mut acc = [Integer::ONE, Integer::ZERO, Integer::ZERO];
        let bits = self.p.significant_bits();
        for i in (0..bits).rev() {
            acc = mulmod(&acc, &acc);
            if self.p.get_bit(i) {
                acc = mulmod(&acc, &t);
            }
        }
        // h = T^p - T mod P
        let h = vec![acc[0].clone(), self.red(&(&acc[1] - Integer::ONE)), acc[2].clone()];
        let p_poly = vec![d.clone(), c.clone(), b.clone(), Integer::ONE];
        let g = self.poly_gcd(p_poly, h);
        // invariant: the gcd with a cubic has degree at most 3
        u32::try_from(g.len() - 1).expect("small degree")
    }

    fn trim(v: &mut Vec<Integer>) {
        // invariant: v.len() > 1 was checked first
        while v.len() > 1 && *v.last().unwrap() == 0u32 {
            v.pop();
        }
    }

    /// Monic gcd of two polynomials (low degree first); [0] is zero.
    fn poly_gcd(&self, mut f: Vec<Integer>, mut g: Vec<Integer>) -> Vec<Integer> {
        for x in f.iter_mut().chain(g.iter_mut()) {
            *x = self.red(x);
        }
        Self::trim(&mut f);
        Self::trim(&mut g);
        while !(g.len() == 1 && g[0] == 0u32) {
            // f mod g
            // invariant: g is trimmed and never empty (the zero polynomial is [0])
            let lead_inv = self.inv(g.last().unwrap());
            while f.len() >= g.len() && !(f.len() == 1 && f[0] == 0u32) {
                let k = f.len() - g.len();
                // invariant: f.len() >= 1 in the loop, so f has a last entry
                let coef = self.mul(f.last().unwrap(), &lead_inv);
                for (i, gi) in g.iter().enumerate() {
                    f[i + k] = self.red(&(&f[i + k] - &coef * gi));
                }
                f.pop();
                if f.is_empty() {
                    f.push(Integer::ZERO);
                }
                Self::trim(&mut f);
            }
            std::mem::swap(&mut f, &mut g);
        }
        f
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// Brute force: all roots of T^3 + bT^2 + cT + d mod p with multiplicities.
    fn brute_cubic(p: u64, b: i64, c: i64, d: i64) -> CubicRoots {
        let ev = |x: i64| (x * x * x + b * x * x + c * x + d).rem_euclid(p as i64);
        let dv = |x: i64| (3 * x * x + 2 * b * x + c).rem_euclid(p as i64);
        let dv2 = |x: i64| (3 * x + b).rem_euclid(p as i64); // P''/2
        let mut simple = 0;
        for x in 0..p as i64 {
            if ev(x) == 0 {
                if dv(x) != 0 {
                    simple += 1;
                } else if dv2(x) != 0 {
                    return CubicRoots::Double(Integer::from(x));
                } else {
                    return CubicRoots::Triple(Integer::from(x));
                }
            }
        }
        CubicRoots::Distinct(simple)
    }

    proptest! {
        // Second computation: root search over F_p for p >= 5 (where P''/2
        // detects a triple root) against the discriminant/gcd path.
        #[test]
        fn cubic_matches_search(pi in 0usize..8, b in -200i64..200, c in -200i64..200, d in -200i64..200) {
            let p = [5u64, 7, 11, 13, 31, 101, 211, 1009][pi];
            let f = Fp::new(&Natural::from(p));
            let got = f.cubic(&Integer::from(b), &Integer::from(c), &Integer::from(d));
            prop_assert_eq!(got, brute_cubic(p, b, c, d));
        }

        #[test]
        fn quadratic_matches_search(pi in 0usize..6, a in 1i64..50, b in -200i64..200, c in -200i64..200) {
            let p = [2u64, 3, 5, 7, 13, 101][pi];
            let a = if a % p as i64 == 0 { a + 1 } else { a };
            let f = Fp::new(&Natural::from(p));
            let ev = |x: i64| (a * x * x + b * x + c).rem_euclid(p as i64);
            let dv = |x: i64| (2 * a * x + b).rem_euclid(p as i64);
            let roots: Vec<i64> = (0..p as i64).filter(|&x| ev(x) == 0).collect();
            let want = match roots.iter().find(|&&x| dv(x) == 0) {
                Some(&x) => QuadRoots::Double(Integer::from(x)),
                None => QuadRoots::Distinct(roots.len() as u32),
            };
            prop_assert_eq!(f.quadratic(&Integer::from(a), &Integer::from(b), &Integer::from(c)), want);
        }
    }

    #[test]
    fn small_field_cubics() {
        // In F_2, T^3 + T^2 = T^2 (T + 1); in F_3, T^3 + 2 = (T + 2)^3.
        let f2 = Fp::new(&Natural::from(2u32));
        assert_eq!(f2.cubic(&Integer::ONE, &Integer::ZERO, &Integer::ZERO), CubicRoots::Double(Integer::ZERO));
        assert_eq!(f2.cubic(&Integer::ZERO, &Integer::ONE, &Integer::ONE), CubicRoots::Distinct(0));
        let f3 = Fp::new(&Natural::from(3u32));
        assert_eq!(f3.cubic(&Integer::ZERO, &Integer::ZERO, &Integer::from(2)), CubicRoots::Triple(Integer::ONE));
        // T^3 - T = T (T - 1)(T + 1) splits in F_3
        assert_eq!(f3.cubic(&Integer::ZERO, &Integer::from(-1), &Integer::ZERO), CubicRoots::Distinct(3));
    }
}
