//! The `Curve` type: an integral Weierstrass model and its invariants.

use crate::error::{Error, ErrorKind};
use malachite::base::num::basic::traits::Zero;
use malachite::Integer;

/// An elliptic curve over Q given by an integral Weierstrass model
/// `y^2 + a1 xy + a3 y = x^3 + a2 x^2 + a4 x + a6` with non-zero discriminant.
///
/// ```
/// use twofold::Curve;
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// assert_eq!(e.discriminant().to_string(), "37");
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Curve {
    a: [Integer; 5],
    b: [Integer; 4],
    c4: Integer,
    c6: Integer,
    disc: Integer,
}

/// A change of Weierstrass model `x = u^2 x' + r`, `y = u^3 y' + s u^2 x' + t`
/// with rational `u != 0`, `r`, `s`, `t` (Silverman, AEC III.1).
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct ModelChange {
    /// The scaling `u`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub u: malachite::Rational,
    /// The shift `r` of x.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub r: malachite::Rational,
    /// The shear `s`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub s: malachite::Rational,
    /// The shift `t` of y.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub t: malachite::Rational,
}

impl Curve {
    /// The curve with integral a-invariants `[a1, a2, a3, a4, a6]`; an error
    /// of kind [`ErrorKind::Singular`] when the discriminant is zero.
    ///
    /// ```
    /// use twofold::Curve;
    /// assert!(Curve::from_coefficients([0, 0, 0, -1, 0]).is_ok());
    /// assert!(Curve::from_coefficients([0, 0, 0, 0, 0]).is_err());
    /// ```
    pub fn from_coefficients<T: Into<Integer>>(a: [T; 5]) -> Result<Curve, Error> {
        let [a1, a2, a3, a4, a6] = a;
        Curve::new([a1.into(), a2.into(), a3.into(), a4.into(), a6.into()])
    }

    /// The curve with the given integral a-invariants.
    pub fn new(a: [Integer; 5]) -> Result<Curve, Error> {
        let [a1, a2, a3, a4, a6] = &a;
        let b2 = a1 * a1 + Integer::from(4) * a2;
        let b4 = a1 * a3 + Integer::from(2) * a4;
        let b6 = a3 * a3 + Integer::from(4) * a6;
        let b8 = a1 * a1 * a6 + Integer::from(4) * a2 * a6 - a1 * a3 * a4 + a2 * a3 * a3 - a4 * a4;
        let c4 = &b2 * &b2 - Integer::from(24) * &b4;
        let c6 = -(&b2 * &b2 * &b2) + Integer::from(36) * &b2 * &b4 - Integer::from(216) * &b6;
        let disc = -(&b2 * &b2 * &b8) - Integer::from(8) * &b4 * &b4 * &b4 - Integer::from(27) * &b6 * &b6
            + Integer::from(9) * &b2 * &b4 * &b6;
        if disc == Integer::ZERO {
            return Err(Error::new(
                ErrorKind::Singular,
                format!("the model [{a1},{a2},{a3},{a4},{a6}] has discriminant 0"),
            ));
        }
        Ok(Curve { a, b: [b2, b4, b6, b8], c4, c6, disc })
    }

    /// The a-invariants `[a1, a2, a3, a4, a6]`.
    pub fn coefficients(&self) -> &[Integer; 5] {
        &self.a
    }
    /// The b-invariants `[b2, b4, b6, b8]`.
    pub fn b_invariants(&self) -> &[Integer; 4] {
        &self.b
    }
    /// The invariant c4.
    pub fn c4(&self) -> &Integer {
        &self.c4
    }
    /// The invariant c6.
    pub fn c6(&self) -> &Integer {
        &self.c6
    }
    /// The discriminant of this model.
    pub fn discriminant(&self) -> &Integer {
        &self.disc
    }
    /// The j-invariant `c4^3 / Delta`.
    ///
    /// ```
    /// use twofold::Curve;
    /// let e = Curve::from_coefficients([0, 0, 0, -1, 0]).unwrap();
    /// assert_eq!(e.j_invariant().to_string(), "1728");
    /// ```
    pub fn j_invariant(&self) -> malachite::Rational {
        malachite::Rational::from_integers(&self.c4 * &self.c4 * &self.c4, self.disc.clone())
    }
}
