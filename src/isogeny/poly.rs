//! Dense univariate polynomials over Z and Q, coefficients from the constant
//! term up, with no trailing zeros (the zero polynomial is empty).

use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Rational};

pub(crate) type ZPoly = Vec<Integer>;
pub(crate) type QPoly = Vec<Rational>;

pub(crate) fn trim<T: PartialEq + Zero>(mut v: Vec<T>) -> Vec<T> {
    while v.last().is_some_and(|c| *c == T::ZERO) {
        v.pop();
    }
    v
}

pub(crate) fn z_from(c: &[i64]) -> ZPoly {
    trim(c.iter().map(|&v| Integer::from(v)).collect())
}

/// `a + sign * b` coefficientwise.
fn combine<T>(a: &[T], b: &[T], negate: bool) -> Vec<T>
where
    T: Clone + PartialEq + Zero + for<'x> std::ops::AddAssign<&'x T> + for<'x> std::ops::SubAssign<&'x T>,
{
    let mut out: Vec<T> = a.to_vec();
    out.resize(a.len().max(b.len()), T::ZERO);
    for (o, c) in out.iter_mut().zip(b) {
        if negate {
            *o -= c;
        } else {
            *o += c;
        }
    }
    trim(out)
}

pub(crate) fn z_sub(a: &ZPoly, b: &ZPoly) -> ZPoly {
    combine(a, b, true)
}

pub(crate) fn z_mul(a: &ZPoly, b: &ZPoly) -> ZPoly {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![Integer::ZERO; a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if *x == 0 {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    trim(out)
}

/// Horner evaluation modulo `m`, result in `[0, m)`.
pub(crate) fn z_eval_mod(a: &ZPoly, x: &Integer, m: &Integer) -> Integer {
    let mut acc = Integer::ZERO;
    for c in a.iter().rev() {
        acc = (acc * x + c) % m;
    }
    if acc < 0 {
        acc += m;
    }
    acc
}

pub(crate) fn z_derivative(a: &ZPoly) -> ZPoly {
    trim(a.iter().enumerate().skip(1).map(|(k, c)| c * Integer::from(k as u64)).collect())
}

#[cfg(test)]
pub(crate) fn q_from_z(a: &ZPoly) -> QPoly {
    a.iter().map(|c| Rational::from(c.clone())).collect()
}

#[cfg(test)]
pub(crate) fn q_add(a: &QPoly, b: &QPoly) -> QPoly {
    combine(a, b, false)
}

pub(crate) fn q_mul(a: &QPoly, b: &QPoly) -> QPoly {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![Rational::ZERO; a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if *x == 0u32 {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    trim(out)
}

pub(crate) fn q_derivative(a: &QPoly) -> QPoly {
    trim(a.iter().enumerate().skip(1).map(|(k, c)| c * Rational::from(k as u64)).collect())
}

/// Quotient and remainder of `a` by a non-zero `b`.
pub(crate) fn q_divrem(a: &QPoly, b: &QPoly) -> (QPoly, QPoly) {
    assert!(!b.is_empty(), "division by the zero polynomial");
    let mut r = a.clone();
    let db = b.len() - 1;
    if r.len() <= db {
        return (Vec::new(), r);
    }
    let lead = b[db].clone();
    let mut q = vec![Rational::ZERO; r.len() - db];
    for k in (0..q.len()).rev() {
        let c = &r[k + db] / &lead;
        if c != 0u32 {
            for (j, bj) in b.iter().enumerate() {
                r[k + j] -= &c * bj;
            }
        }
        q[k] = c;
    }
    r.truncate(db);
    (trim(q), trim(r))
}

pub(crate) fn q_eval(a: &QPoly, x: &Rational) -> Rational {
    let mut acc = Rational::ZERO;
    for c in a.iter().rev() {
        acc = acc * x + c;
    }
    acc
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn divrem_reconstructs() {
        let a = q_from_z(&z_from(&[5, -3, 0, 2, 7]));
        let b = q_from_z(&z_from(&[1, 2, 3]));
        let (q, r) = q_divrem(&a, &b);
        assert!(r.len() < b.len());
        assert_eq!(q_add(&q_mul(&q, &b), &r), a);
    }

    #[test]
    fn ring_ops() {
        let a = z_from(&[1, 1]);
        let sq = z_mul(&a, &a);
        assert_eq!(sq, z_from(&[1, 2, 1]));
        assert_eq!(z_sub(&sq, &sq), ZPoly::new());
        assert_eq!(z_derivative(&sq), z_from(&[2, 2]));
        assert_eq!(z_eval_mod(&sq, &Integer::from(3), &Integer::from(7)), Integer::from(2));
    }
}
