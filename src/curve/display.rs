//! Written forms of curves and forms: polynomials with signs in the right
//! places (`-x^4 + 942x^2z^2 - 24649z^4`, never `-1x^4 + ... + -24649z^4`).

use super::Curve;
use malachite::base::num::arithmetic::traits::{Sign, UnsignedAbs};
use malachite::Integer;
use std::cmp::Ordering;
use std::fmt;

/// Writes `Σ c_i m_i` for integer coefficients and monomials `m_i` (the
/// empty string for the constant monomial), skipping zero terms, with unit
/// coefficients written as a bare sign and `0` for the zero polynomial.
pub fn signed_terms(coeffs: &[Integer], monomials: &[&str]) -> String {
    let mut out = String::new();
    for (c, m) in coeffs.iter().zip(monomials) {
        let sign = c.sign();
        if sign == Ordering::Equal {
            continue;
        }
        let a = c.unsigned_abs();
        let neg = sign == Ordering::Less;
        if out.is_empty() {
            if neg {
                out.push('-');
            }
        } else {
            out.push_str(if neg { " - " } else { " + " });
        }
        if a != 1u32 || m.is_empty() {
            out.push_str(&a.to_string());
        }
        out.push_str(m);
    }
    if out.is_empty() {
        out.push('0');
    }
    out
}

/// The Weierstrass equation `y^2 + a1 xy + a3 y = x^3 + a2 x^2 + a4 x + a6`
/// with zero terms left out.
///
/// ```
/// use twofold::Curve;
/// let e = Curve::from_coefficients([0, 0, 1, -7, 6]).unwrap();
/// assert_eq!(e.to_string(), "y^2 + y = x^3 - 7x + 6");
/// let f = Curve::from_coefficients([1, -1, 0, -4, 0]).unwrap();
/// assert_eq!(f.to_string(), "y^2 + xy = x^3 - x^2 - 4x");
/// ```
impl fmt::Display for Curve {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let [a1, a2, a3, a4, a6] = self.coefficients();
        let one = Integer::from(1);
        let lhs = signed_terms(&[one.clone(), a1.clone(), a3.clone()], &["y^2", "xy", "y"]);
        let rhs = signed_terms(&[one, a2.clone(), a4.clone(), a6.clone()], &["x^3", "x^2", "x", ""]);
        write!(f, "{lhs} = {rhs}")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn signed_terms_examples() {
        let c = [Integer::from(-1), Integer::from(0), Integer::from(942), Integer::from(0), Integer::from(-24649)];
        let s = signed_terms(&c, &["x^4", "x^3z", "x^2z^2", "xz^3", "z^4"]);
        assert_eq!(s, "-x^4 + 942x^2z^2 - 24649z^4");
        assert_eq!(signed_terms(&[Integer::from(0)], &[""]), "0");
    }
}
