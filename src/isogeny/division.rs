//! Division polynomials in `x` alone.
//!
//! With `ψ_n` the classical division polynomials of
//! `y^2 + a1 xy + a3 y = x^3 + a2 x^2 + a4 x + a6` (Silverman, *The
//! Arithmetic of Elliptic Curves*, Exercise 3.7) and `ψ_2 = 2y + a1 x + a3`,
//! put `f_n = ψ_n` for odd `n` and `f_n = ψ_n / ψ_2` for even `n`; these lie
//! in `Z[x]`, and with `B = ψ_2^2 = 4x^3 + b2 x^2 + 2b4 x + b6` the classical
//! recurrences become
//!
//! ```text
//!   f_{2m+1} = B^2 f_{m+2} f_m^3 - f_{m-1} f_{m+1}^3    (m even)
//!   f_{2m+1} = f_{m+2} f_m^3 - B^2 f_{m-1} f_{m+1}^3    (m odd)
//!   f_{2m}   = f_m (f_{m+2} f_{m-1}^2 - f_{m-2} f_{m+1}^2)
//! ```
//!
//! For odd prime `l` the roots of `f_l` (degree `(l^2 - 1)/2`, leading
//! coefficient `l`) are the `x`-coordinates of the points of order `l`.

use super::poly::{trim, z_from, z_mul, z_sub, ZPoly};
use crate::curve::Curve;
use malachite::Integer;
use std::collections::HashMap;

pub(crate) struct DivisionPolys {
    b_sq: ZPoly,
    memo: HashMap<u64, ZPoly>,
}

impl DivisionPolys {
    pub(crate) fn new(curve: &Curve) -> DivisionPolys {
        let [b2, b4, b6, b8] = curve.b_invariants().clone();
        let b = vec![b6.clone(), Integer::from(2) * &b4, b2.clone(), Integer::from(4)];
        let f3 = vec![b8.clone(), Integer::from(3) * &b6, Integer::from(3) * &b4, b2.clone(), Integer::from(3)];
        let f4 = vec![
            &b4 * &b8 - &b6 * &b6,
            &b2 * &b8 - &b4 * &b6,
            Integer::from(10) * &b8,
            Integer::from(10) * &b6,
            Integer::from(5) * &b4,
            b2.clone(),
            Integer::from(2),
        ];
        let mut memo = HashMap::new();
        memo.insert(0, ZPoly::new());
        memo.insert(1, z_from(&[1]));
        memo.insert(2, z_from(&[1]));
        memo.insert(3, trim(f3));
        memo.insert(4, trim(f4));
        DivisionPolys { b_sq: z_mul(&b, &b), memo }
    }

    /// `f_n` (see the module documentation).
    #[cfg(test)]
    pub(crate) fn f(&mut self, n: u64) -> ZPoly {
        self.f_within(n, &|| false).unwrap_or_default()
    }

    /// `f_n`, or `None` when `stop` says so (checked before every product
    /// of the recursion, so a long computation for a large `n` ends
    /// promptly).
    pub(crate) fn f_within(&mut self, n: u64, stop: &dyn Fn() -> bool) -> Option<ZPoly> {
        if let Some(p) = self.memo.get(&n) {
            return Some(p.clone());
        }
        if stop() {
            return None;
        }
        let m = n / 2;
        let out = if n % 2 == 1 {
            let (a, b, c, d) = (self.f_within(m + 2, stop)?, self.f_within(m, stop)?, self.f_within(m - 1, stop)?, self.f_within(m + 1, stop)?);
            let b3 = z_mul(&z_mul(&b, &b), &b);
            if stop() {
                return None;
            }
            let d3 = z_mul(&z_mul(&d, &d), &d);
            if stop() {
                return None;
            }
            if m % 2 == 0 {
                z_sub(&z_mul(&z_mul(&self.b_sq, &a), &b3), &z_mul(&c, &d3))
            } else {
                z_sub(&z_mul(&a, &b3), &z_mul(&z_mul(&self.b_sq, &c), &d3))
            }
        } else {
            let (fm, a, c, e, d) = (
                self.f_within(m, stop)?,
                self.f_within(m + 2, stop)?,
                self.f_within(m - 1, stop)?,
                self.f_within(m - 2, stop)?,
                self.f_within(m + 1, stop)?,
            );
            let left = z_mul(&a, &z_mul(&c, &c));
            if stop() {
                return None;
            }
            let inner = z_sub(&left, &z_mul(&e, &z_mul(&d, &d)));
            if stop() {
                return None;
            }
            z_mul(&fm, &inner)
        };
        self.memo.insert(n, out.clone());
        Some(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn degrees_and_leading_coefficients() {
        let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
        let mut d = DivisionPolys::new(&e);
        for l in [3u64, 5, 7, 11] {
            let f = d.f(l);
            assert_eq!(f.len() as u64 - 1, (l * l - 1) / 2);
            assert_eq!(f.last().unwrap(), &Integer::from(l));
        }
        // y^2 + y = x^3 - x^2 - 10x - 20 has the 5-torsion point (5, 5) (published table, Cremona 1997): f_5(5) = 0
        let f5 = d.f(5);
        let v = f5.iter().rev().fold(Integer::from(0), |acc, c| acc * Integer::from(5) + c);
        assert_eq!(v, 0);
        // even index: f_6 = ψ_6/ψ_2 has degree 16 and leading coefficient 3
        let f6 = d.f(6);
        assert_eq!(f6.len(), 17);
        assert_eq!(f6.last().unwrap(), &Integer::from(3));
    }
}
