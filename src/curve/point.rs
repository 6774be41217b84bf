//! Rational points and the group law (Silverman, AEC III.2.3).

use super::Curve;
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Rational};

/// A rational point on a Weierstrass model: the point at infinity or an
/// affine point with rational coordinates. A `Point` does not carry its
/// curve; the curve's methods check membership.
///
/// ```
/// use twofold::{Curve, Point};
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let p = Point::from_ints(0, 0);
/// assert!(e.contains(&p));
/// let q = e.double(&p);
/// assert_eq!(q, Point::from_ints(1, 0));
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum Point {
    /// The point at infinity, the identity of the group.
    Infinity,
    /// An affine point (x, y).
    Affine(Rational, Rational),
}

impl Point {
    /// The affine point with integer coordinates (x, y).
    pub fn from_ints(x: i64, y: i64) -> Point {
        Point::Affine(Rational::from(x), Rational::from(y))
    }

    /// Whether this is the point at infinity.
    pub fn is_infinity(&self) -> bool {
        matches!(self, Point::Infinity)
    }

    /// The x-coordinate of an affine point.
    pub fn x(&self) -> Option<&Rational> {
        match self {
            Point::Infinity => None,
            Point::Affine(x, _) => Some(x),
        }
    }
}

impl std::fmt::Display for Point {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Point::Infinity => write!(f, "O"),
            Point::Affine(x, y) => write!(f, "({x}, {y})"),
        }
    }
}

fn q(n: &Integer) -> Rational {
    Rational::from(n.clone())
}

impl Curve {
    /// Whether `p` lies on this model (exact check).
    pub fn contains(&self, p: &Point) -> bool {
        match p {
            Point::Infinity => true,
            Point::Affine(x, y) => {
                let [a1, a2, a3, a4, a6] = self.coefficients();
                let lhs = y * y + q(a1) * x * y + q(a3) * y;
                let rhs = x * x * x + q(a2) * x * x + q(a4) * x + q(a6);
                lhs == rhs
            }
        }
    }

    /// The negative of a point: `-(x, y) = (x, -y - a1 x - a3)`.
    pub fn negate(&self, p: &Point) -> Point {
        match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let [a1, _, a3, _, _] = self.coefficients();
                Point::Affine(x.clone(), -y - q(a1) * x - q(a3))
            }
        }
    }

    /// The sum of two points on this model.
    pub fn add(&self, p: &Point, r: &Point) -> Point {
        let (x1, y1, x2, y2) = match (p, r) {
            (Point::Infinity, _) => return r.clone(),
            (_, Point::Infinity) => return p.clone(),
            (Point::Affine(x1, y1), Point::Affine(x2, y2)) => (x1, y1, x2, y2),
        };
        let [a1, a2, a3, a4, a6] = self.coefficients();
        let (a1, a2, a3, a4, a6) = (q(a1), q(a2), q(a3), q(a4), q(a6));
        let (lambda, nu);
        if x1 == x2 {
            let denom = Rational::from(2) * y1 + &a1 * x1 + &a3;
            if y1 + y2 + &a1 * x2 + &a3 == Rational::ZERO || denom == Rational::ZERO {
                return Point::Infinity;
            }
            lambda = (Rational::from(3) * x1 * x1 + Rational::from(2) * &a2 * x1 + &a4 - &a1 * y1) / &denom;
            nu = (-(x1 * x1 * x1) + &a4 * x1 + Rational::from(2) * &a6 - &a3 * y1) / &denom;
        } else {
            let dx = x2 - x1;
            lambda = (y2 - y1) / &dx;
            nu = (y1 * x2 - y2 * x1) / &dx;
        }
        let x3 = &lambda * &lambda + &a1 * &lambda - &a2 - x1 - x2;
        let y3 = -(&lambda + &a1) * &x3 - &nu - &a3;
        Point::Affine(x3, y3)
    }

    /// `p + p`.
    pub fn double(&self, p: &Point) -> Point {
        self.add(p, p)
    }

    /// `n p` for any integer `n` (double and add).
    ///
    /// ```
    /// use twofold::{Curve, Point};
    /// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap(); // 5-torsion (published table, Cremona 1997, y^2 + y = x^3 - x^2 - 10x - 20)
    /// assert_eq!(e.multiple(&Point::from_ints(5, 5), 5), Point::Infinity);
    /// ```
    pub fn multiple(&self, p: &Point, n: i64) -> Point {
        let mut base = if n < 0 { self.negate(p) } else { p.clone() };
        let mut k = n.unsigned_abs();
        let mut acc = Point::Infinity;
        while k > 0 {
            if k & 1 == 1 {
                acc = self.add(&acc, &base);
            }
            k >>= 1;
            if k > 0 {
                base = self.double(&base);
            }
        }
        acc
    }

    /// The order of `p` if it is a torsion point of order at most 12
    /// (Mazur's bound), else `None`.
    pub fn torsion_order_of(&self, p: &Point) -> Option<u32> {
        let mut r = p.clone();
        for n in 1..=12u32 {
            if r.is_infinity() {
                return Some(n);
            }
            r = self.add(&r, p);
        }
        None
    }
}
