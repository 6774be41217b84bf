//! The class of a 2-covering in `(Q[φ]/F(φ))^* / squares` and the
//! `GL2(Q)`-equivalence test.
//!
//! # Theory
//!
//! Let `A = Q[φ]/(F)`, `F(φ) = φ^3 - 3Iφ + J`. For a quartic `g` with these
//! invariants, `4φ g - g_H = 3 q_φ^2` with `q_φ` defined over `Q(φ)` up to a
//! scalar, so `ξ(g) = 3(4aφ - H) = 9 q_φ(1,0)^2` is, up to squares, independent
//! of the point `(1, 0)`: replacing `g` by `μ^2 g∘M` (`M ∈ GL2(Q)`) multiplies it
//! by a square of `A`. Its norm is `N(4aφ - H) = 27 R^2`, a square times 27, so
//! `ξ(g)` lies in the kernel of the norm modulo squares; it is a unit iff
//! `R ≠ 0`. When `y^2 = g` has a rational point `P`, `ξ(g)` equals the Kummer
//! image `X(π(P)) + 3φ` of its image on `E_{I,J}: Y^2 = X^3 - 27IX - 27J`
//! (whose 2-torsion points are `X = -3φ_k`). This is the classical description
//! of the 2-covering attached to `g` (Birch and Swinnerton-Dyer 1963; Cremona,
//! *Classical invariants and 2-descent on elliptic curves*, J. Symbolic Comput.
//! 31 (2001)): two quartics with invariants `(I, J)` and `(λ^4 I, λ^6 J)`,
//! `λ ∈ Q^*`, are equivalent as 2-coverings of the same curve iff their classes
//! agree under `φ ↦ λ^2 φ`.
//!
//! # Squares in `A`
//!
//! `A` splits according to the rational roots of `F` (which are integers):
//!
//! * a rational component: squares of `Q`;
//! * a quadratic field `Q[φ]/(G)`: `x ∉ Q` is a square iff `N(x) = m^2` and
//!   `Tr(x) ± 2m` is a non-zero rational square (then `((x ± m)/t)^2 = x`);
//!   `x ∈ Q` is a square iff `x` or `x·disc(G)` is a rational square;
//! * a cubic field: scale `x` to an algebraic integer; if `x = γ^2` then the
//!   characteristic polynomial `ψ(t) = t^3 + p1 t^2 + p2 t + p3` of `γ` has
//!   integer coefficients and `ψ(t)ψ(-t) = -χ_x(t^2)`, i.e. `p3^2 = N(x)`,
//!   `p2 = (p1^2 - Tr x)/2` and `p1` is an integer root of
//!   `(t^2 - s1)^2 - 8 p3 t - 4 s2` (`s1, s2` the first two symmetric functions
//!   of the conjugates of `x`). Conversely such a rational `ψ` has a root
//!   `γ` with `γ^2` a conjugate of `x`, and `γ` lies in the cubic field
//!   because `Q(γ) ⊇ Q(x)` has degree at most 3. Integer roots are found
//!   exactly (bisection over the integers between the sign changes of the
//!   derivatives, no floating point), so the test is exact at any size.

use super::core::{Matrix, Quartic};
use super::numeric::{integer_roots, isqrt_exact};
use crate::curve::Curve;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, Lcm, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Natural, Rational};

/// The class of a 2-covering: an element `u0 + u1 φ + u2 φ^2` of
/// `A = Q[φ]/(φ^3 - 3Iφ + J)`, up to squares.
///
/// ```
/// use twofold::quartic::{covering_class, Quartic};
/// // x^4 - z^4 has the rational root (1 : 1), so its class is trivial.
/// let c = covering_class(&Quartic::from_coeffs([1, 0, 0, 0, -1])).unwrap();
/// assert!(c.is_trivial());
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct CoveringClass {
    i: Integer,
    j: Integer,
    elt: [Rational; 3],
}

fn rat(v: &Integer) -> Rational {
    Rational::from(v.clone())
}

/// Product in `Q[φ]/(φ^3 - 3Iφ + J)`.
fn alg_mul(x: &[Rational; 3], y: &[Rational; 3], i: &Integer, j: &Integer) -> [Rational; 3] {
    // raw product coefficients up to φ^4
    let mut c: [Rational; 5] = Default::default();
    for p in 0..3 {
        for q in 0..3 {
            if x[p] != 0 && y[q] != 0 {
                c[p + q] += &x[p] * &y[q];
            }
        }
    }
    let i3 = Rational::from(Integer::from(3) * i);
    let jr = rat(j);
    // φ^4 = 3I φ^2 - J φ ; φ^3 = 3I φ - J
    let c4 = std::mem::take(&mut c[4]);
    c[2] += &i3 * &c4;
    c[1] -= &jr * &c4;
    let c3 = std::mem::take(&mut c[3]);
    c[1] += &i3 * &c3;
    c[0] -= &jr * &c3;
    [c[0].clone(), c[1].clone(), c[2].clone()]
}

fn is_rational_square(q: &Rational) -> bool {
    if *q < 0 {
        return false;
    }
    let (n, d) = q.numerator_and_denominator_ref();
    use malachite::base::num::arithmetic::traits::CheckedSqrt;
    n.checked_sqrt().is_some() && d.checked_sqrt().is_some()
}

fn rational_sqrt(q: &Rational) -> Option<Rational> {
    if *q < 0 {
        return None;
    }
    use malachite::base::num::arithmetic::traits::CheckedSqrt;
    let (n, d) = q.numerator_and_denominator_ref();
    Some(Rational::from_naturals(n.checked_sqrt()?, d.checked_sqrt()?))
}

fn cubic_at(i: &Integer, j: &Integer, t: &Integer) -> Integer {
    t * t * t - Integer::from(3) * i * t + j
}

/// The integer (= rational) roots of `t^3 - 3It + J`, exactly (see
/// [`integer_roots`]: no floating point, any size).
pub(crate) fn integer_roots_of_resolvent(i: &Integer, j: &Integer) -> Vec<Integer> {
    let poly = [j.clone(), Integer::from(-3) * i, Integer::ZERO, Integer::ONE];
    integer_roots(&poly)
}

/// Whether `x` (integer coordinates, not rational) is a square in the cubic
/// field `Q[φ]/(φ^3 - 3Iφ + J)`.
fn is_square_cubic_field(u: &[Integer; 3], i: &Integer, j: &Integer) -> bool {
    let [u0, u1, u2] = u;
    let i3 = Integer::from(3) * i;
    // multiplication matrix columns: x*1, x*φ, x*φ^2
    let m = [
        [u0.clone(), -(j * u2), -(j * u1)],
        [u1.clone(), u0 + &i3 * u2, &i3 * u1 - j * u2],
        [u2.clone(), u1.clone(), u0 + &i3 * u2],
    ];
    let s1 = &m[0][0] + &m[1][1] + &m[2][2];
    let minor = |a: usize, b: usize| &m[a][a] * &m[b][b] - &m[a][b] * &m[b][a];
    let s2 = minor(0, 1) + minor(0, 2) + minor(1, 2);
    let s3 = &m[0][0] * (&m[1][1] * &m[2][2] - &m[1][2] * &m[2][1]) - &m[0][1] * (&m[1][0] * &m[2][2] - &m[1][2] * &m[2][0])
        + &m[0][2] * (&m[1][0] * &m[2][1] - &m[1][1] * &m[2][0]);
    let Some(p3) = isqrt_exact(&s3) else { return false };
    let poly = [
        &s1 * &s1 - Integer::from(4) * &s2,
        Integer::from(-8) * &p3,
        Integer::from(-2) * &s1,
        Integer::ZERO,
        Integer::ONE,
    ];
    // exact integer roots: no floating-point step can miss one
    !integer_roots(&poly).is_empty()
}

/// Whether `w0 + w1 φ` is a square in `Q[φ]/(φ^2 + rφ + s)` (irreducible).
fn is_square_quadratic_field(w0: &Rational, w1: &Rational, r: &Integer, s: &Integer) -> bool {
    let disc = Rational::from(r * r - Integer::from(4) * s);
    if *w1 == 0 {
        return is_rational_square(w0) || is_rational_square(&(w0 * &disc));
    }
    let (rr, sr) = (rat(r), rat(s));
    let tr = Rational::from(2) * w0 - &rr * w1;
    let nm = w0 * w0 - &rr * w0 * w1 + &sr * w1 * w1;
    let Some(m) = rational_sqrt(&nm) else { return false };
    for cand in [&tr + Rational::from(2) * &m, &tr - Rational::from(2) * &m] {
        if cand != 0 && is_rational_square(&cand) {
            return true;
        }
    }
    false
}

/// Whether a unit `x` of `A` is a square; `None` when `x` is not a unit.
fn is_square_in_algebra(x: &[Rational; 3], i: &Integer, j: &Integer) -> Option<bool> {
    let roots = integer_roots_of_resolvent(i, j);
    for r in &roots {
        let rr = rat(r);
        let v = &x[0] + &x[1] * &rr + &x[2] * &rr * &rr;
        if v == 0 {
            return None;
        }
    }
    match roots.len() {
        3 => Some(roots.iter().all(|r| {
            let rr = rat(r);
            is_rational_square(&(&x[0] + &x[1] * &rr + &x[2] * &rr * &rr))
        })),
        1 => {
            let r = &roots[0];
            let rr = rat(r);
            if !is_rational_square(&(&x[0] + &x[1] * &rr + &x[2] * &rr * &rr)) {
                return Some(false);
            }
            let s = r * r - Integer::from(3) * i;
            // φ^2 = -r φ - s
            let w0 = &x[0] - &x[2] * rat(&s);
            let w1 = &x[1] - &x[2] * &rr;
            if w0 == 0 && w1 == 0 {
                return None;
            }
            Some(is_square_quadratic_field(&w0, &w1, r, &s))
        }
        _ => {
            if x.iter().all(|c| *c == 0) {
                return None;
            }
            if x[1] == 0 && x[2] == 0 {
                return Some(is_rational_square(&x[0]));
            }
            // scale by the square of the common denominator
            let mut den = Natural::ONE;
            for c in x {
                den = den.lcm(c.denominator_ref());
            }
            let k = Rational::from(den);
            let k2 = &k * &k;
            let u: [Integer; 3] = std::array::from_fn(|t| Integer::rounding_from(&x[t] * &k2, RoundingMode::Exact).0);
            Some(is_square_cubic_field(&u, i, j))
        }
    }
}

/// A unimodular matrix with first column `(α, γ)` (coprime).
fn complete_column(al: i64, ga: i64) -> Matrix {
    // find β, δ with α δ - β γ = 1
    fn ext(a: i64, b: i64) -> (i64, i64, i64) {
        if b == 0 {
            (a, 1, 0)
        } else {
            let (g, x, y) = ext(b, a % b);
            (g, y, x - (a / b) * y)
        }
    }
    let (g, x, y) = ext(al, ga); // x α + y γ = g = ±1
    let (x, y) = if g < 0 { (-x, -y) } else { (x, y) };
    // α δ - β γ = 1 with δ = x, β = -y
    [[Integer::from(al), Integer::from(-y)], [Integer::from(ga), Integer::from(x)]]
}

/// The class `ξ(g) = 3(4aφ - H)` of a quartic in `(Q[φ]/F(φ))^*/squares`, computed
/// at a point `(α, γ)` where the seminvariant `R` does not vanish.
/// Error [`ErrorKind::InvalidValue`] for zero discriminant.
///
/// ```
/// use twofold::quartic::{covering_class, Quartic};
/// let g = Quartic::from_coeffs([1, 0, -5, 0, 4]);
/// let c = covering_class(&g).unwrap();
/// assert_eq!(c.invariants(), (g.invariant_i(), g.invariant_j()));
/// ```
pub fn covering_class(g: &Quartic) -> Result<CoveringClass, Error> {
    if g.discriminant() == 0 {
        return Err(Error::new(ErrorKind::InvalidValue, format!("{g:?} has zero discriminant")));
    }
    // at most 6 points (α:γ) make R vanish (zeros of the three q_φ)
    let cols: [(i64, i64); 12] = [(1, 0), (0, 1), (1, 1), (1, -1), (2, 1), (1, 2), (2, -1), (1, -2), (3, 1), (1, 3), (3, -1), (1, -3)];
    for (al, ga) in cols {
        let m = complete_column(al, ga);
        let h = g.transform(&m);
        if h.seminvariant_r() != 0 {
            let hh = h.seminvariant_h();
            let elt = [Rational::from(Integer::from(-3) * hh), Rational::from(Integer::from(12) * &h.a), Rational::ZERO];
            return Ok(CoveringClass { i: g.invariant_i(), j: g.invariant_j(), elt });
        }
    }
    // R(α, γ) is a non-zero sextic form when the discriminant is not zero
    // (the product of the three q_φ), so it vanishes at no more than six of
    // the twelve points above: this line is never reached
    Err(Error::new(ErrorKind::InvalidValue, format!("internal error: the seminvariant R of {g:?} vanishes at twelve points")))
}

impl CoveringClass {
    /// The invariants `(I, J)` of the algebra `Q[φ]/(φ^3 - 3Iφ + J)`.
    ///
    /// ```
    /// use twofold::quartic::{covering_class, Quartic};
    /// let c = covering_class(&Quartic::from_coeffs([1, 0, 0, 0, -1])).unwrap();
    /// assert_eq!(c.invariants().0, -12);
    /// ```
    pub fn invariants(&self) -> (Integer, Integer) {
        (self.i.clone(), self.j.clone())
    }

    /// The representing element `[u0, u1, u2]` (meaning `u0 + u1 φ + u2 φ^2`).
    ///
    /// ```
    /// use twofold::quartic::{covering_class, Quartic};
    /// // x^4 + x^3 z + z^4: H = -3, R = 1, so the element is 3(4φ + 3) = 9 + 12φ.
    /// let c = covering_class(&Quartic::from_coeffs([1, 1, 0, 0, 1])).unwrap();
    /// assert_eq!(c.element()[0], 9);
    /// assert_eq!(c.element()[1], 12);
    /// ```
    pub fn element(&self) -> &[Rational; 3] {
        &self.elt
    }

    /// Whether the class is trivial (a square in the algebra), i.e. the
    /// covering is isomorphic to the Jacobian `E_{I,J}` as a 2-covering.
    ///
    /// ```
    /// use twofold::quartic::{covering_class, Quartic};
    /// // 4x^3 z + z^4 vanishes at (1 : 0): the point (1 : 0 : 0) maps to the origin,
    /// // so the covering is the trivial one.
    /// let c = covering_class(&Quartic::from_coeffs([0, 4, 0, 0, 1])).unwrap();
    /// assert!(c.is_trivial());
    /// ```
    pub fn is_trivial(&self) -> bool {
        is_square_in_algebra(&self.elt, &self.i, &self.j).unwrap_or(false)
    }

    /// The product class (same invariants required, else `None`).
    ///
    /// ```
    /// use twofold::quartic::{covering_class, Quartic};
    /// let c = covering_class(&Quartic::from_coeffs([1, 0, -5, 0, 4])).unwrap();
    /// assert!(c.mul(&c).unwrap().is_trivial());
    /// ```
    pub fn mul(&self, other: &CoveringClass) -> Option<CoveringClass> {
        let o = other.in_algebra_of(&self.i, &self.j)?;
        Some(CoveringClass { i: self.i.clone(), j: self.j.clone(), elt: alg_mul(&self.elt, &o, &self.i, &self.j) })
    }

    /// Whether two classes are equal (after identifying the algebras by
    /// `φ ↦ λ^2 φ` when the invariants differ by `(λ^4, λ^6)`, `λ ∈ Q`).
    ///
    /// ```
    /// use twofold::quartic::{covering_class, Quartic};
    /// let c = covering_class(&Quartic::from_coeffs([1, 0, -5, 0, 4])).unwrap();
    /// assert!(c.same_as(&c));
    /// ```
    pub fn same_as(&self, other: &CoveringClass) -> bool {
        match self.mul(other) {
            Some(p) => is_square_in_algebra(&p.elt, &self.i, &self.j).unwrap_or(false),
            None => false,
        }
    }

    /// The Kummer image `δ(P)` of a rational point `P = (x, y)` on the curve,
    /// in the algebra of `(I, J) = (c4, 2c6)`: with `X = 36x + 3b2`,
    /// `δ(P) = X + 3φ` (the 2-torsion of `Y^2 = X^3 - 27c4X - 54c6` is
    /// `X = -3φ_k`); at a 2-torsion point the vanishing rational component is
    /// replaced by the product of the others (the standard rule). `None` when
    /// the point is not on the curve.
    ///
    /// ```
    /// use malachite::Rational;
    /// use twofold::{Curve, quartic::CoveringClass};
    /// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    /// let p = CoveringClass::kummer_image(&e, &Rational::from(0), &Rational::from(0)).unwrap();
    /// assert!(!p.is_trivial());
    /// ```
    pub fn kummer_image(curve: &Curve, x: &Rational, y: &Rational) -> Option<CoveringClass> {
        let [a1, a2, a3, a4, a6] = curve.coefficients().clone().map(Rational::from);
        if y * y + &a1 * x * y + &a3 * y != x * x * x + &a2 * x * x + &a4 * x + &a6 {
            return None;
        }
        let i = curve.c4().clone();
        let j = Integer::from(2) * curve.c6();
        let bx = Rational::from(36) * x + Rational::from(Integer::from(3) * &curve.b_invariants()[0]);
        let mut elt = [bx.clone(), Rational::from(3), Rational::ZERO];
        // 2-torsion: X = -3 r for a root r of F; fix that component
        let r = -(&bx / Rational::from(3));
        let (fr_n, fr_d) = (r.numerator_and_denominator_ref().0.clone(), r.numerator_and_denominator_ref().1.clone());
        if fr_d == 1u32 {
            let rint = if r < 0 { -Integer::from(fr_n) } else { Integer::from(fr_n) };
            if cubic_at(&i, &j, &rint) == 0 {
                // idempotent for the root r: G(φ)/G(r), G = F/(φ - r) = φ^2 + rφ + (r^2 - 3I)
                let rr = rat(&rint);
                let s = &rr * &rr - Rational::from(Integer::from(3) * &i);
                let gr = Rational::from(3) * &rr * &rr - Rational::from(Integer::from(3) * &i); // G(r) = F'(r)
                let want = Rational::from(9) * &gr; // product of X + 3φ_j over the other roots
                let coef = &want / &gr;
                elt[0] += &coef * &s;
                elt[1] += &coef * &rr;
                elt[2] += coef;
            }
        }
        Some(CoveringClass { i, j, elt })
    }

    #[cfg(test)]
    fn with_invariants(mut self, i: &Integer, j: &Integer) -> CoveringClass {
        // the trivial class in another algebra (test helper): element 1
        self.i = i.clone();
        self.j = j.clone();
        self.elt = [Rational::ONE, Rational::ZERO, Rational::ZERO];
        self
    }

    /// This class's element moved into the algebra of `(i, j)`, if
    /// `(self.i, self.j) = (λ^4 i, λ^6 j)` with `λ ∈ Q`.
    fn in_algebra_of(&self, i: &Integer, j: &Integer) -> Option<[Rational; 3]> {
        if self.i == *i && self.j == *j {
            return Some(self.elt.clone());
        }
        let l2 = invariant_ratio(i, j, &self.i, &self.j)?;
        // φ_self = λ^2 φ
        Some([self.elt[0].clone(), &self.elt[1] * &l2, &self.elt[2] * &l2 * &l2])
    }
}

/// `λ^2` with `(i2, j2) = (λ^4 i1, λ^6 j1)` for a rational `λ`, if any.
fn invariant_ratio(i1: &Integer, j1: &Integer, i2: &Integer, j2: &Integer) -> Option<Rational> {
    use super::core::rational_root;
    let l2 = if *i1 != 0 && *j1 != 0 {
        if *i2 == 0 || *j2 == 0 {
            return None;
        }
        Rational::from_integers(j2 * i1, j1 * i2)
    } else if *i1 == 0 {
        if *i2 != 0 || *j1 == 0 {
            return None;
        }
        let t = Rational::from_integers(j2.clone(), j1.clone());
        let l = rational_root(&(&t).abs(), 6)?;
        if t < 0 {
            return None;
        }
        &l * &l
    } else {
        if *j2 != 0 {
            return None;
        }
        let t = Rational::from_integers(i2.clone(), i1.clone());
        rational_root(&t, 2)?
    };
    let l = rational_root(&l2, 2)?;
    let l4 = (&l).pow(4u64);
    let l6 = (&l).pow(6u64);
    (Rational::from(i2.clone()) == l4 * rat(i1) && Rational::from(j2.clone()) == l6 * rat(j1)).then_some(l2)
}

/// Whether two quartics define the same 2-covering (`GL2(Q)`-equivalent up
/// to a square factor, with invariants related by `(λ^4, λ^6)`, `λ ∈ Q`).
///
/// ```
/// use malachite::Integer;
/// use twofold::quartic::{same_covering, Quartic};
/// let g = Quartic::from_coeffs([1, 0, -5, 0, 4]);
/// // a transformation of determinant 2 keeps the covering
/// let h = g.transform(&[[Integer::from(1), Integer::from(1)], [Integer::from(-1), Integer::from(1)]]);
/// assert!(same_covering(&g, &h));
/// ```
pub fn same_covering(g1: &Quartic, g2: &Quartic) -> bool {
    match (covering_class(g1), covering_class(g2)) {
        (Ok(c1), Ok(c2)) => c1.same_as(&c2),
        _ => false,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::quartic::core::mat_from_i64;
    use crate::quartic::quartics_with_invariants;

    fn q(v: [i64; 5]) -> Quartic {
        Quartic::from_coeffs(v)
    }

    #[test]
    fn resolvent_integer_roots() {
        // F = (t-1)(t-2)(t+3) = t^3 - 7t + 6: 3I = 7 not integral; use (t-1)(t-2)(t+3)*...:
        // (t - 3)(t + 1)(t + 2) = t^3 - 7t - 6: no. Take roots 4, -1, -3: t^3 - 13 t + 12: 3I = 13 no.
        // roots 3, 3?, use 6, -3, -3 is not squarefree; roots 5, -2, -3: t^3 - 19t + 30 no;
        // roots 4, 2, -6: t^3 - 28 t + 48? e2 = 8 - 24 - 12 = -28 no (3 ∤ 28). roots 5, 1, -6: e2 = 5 - 30 - 6 = -31.
        // roots 7, -2, -5: e2 = -14 - 35 + 10 = -39 = -3*13 -> I = 13, J = -e3 = 70: t^3 - 39t + 70.
        assert_eq!(integer_roots_of_resolvent(&Integer::from(13), &Integer::from(70)), [-7, 2, 5].map(Integer::from));
        // t^3 - 3*48 t - 432: y^2 + y = x^3 - x (I,J)=(48,-432) → F(φ)=φ^3-144φ-432, no rational roots (E(Q)[2] = 0)
        assert!(integer_roots_of_resolvent(&Integer::from(48), &Integer::from(-432)).is_empty());
    }

    #[test]
    fn squares_are_squares() {
        // random y in A, y^2 is a square; y^2 * (non-square rational) is not, for cubic,
        // quadratic and split algebras.
        let algebras = [(48i64, -432i64), (13, 70), (7, 0), (16, 0), (3, 1)];
        let mut seed = 5u64;
        let mut rnd = |m: i64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % (2 * m as u64 + 1)) as i64 - m
        };
        for (i, j) in algebras {
            let (ii, jj) = (Integer::from(i), Integer::from(j));
            if Integer::from(4) * &ii * &ii * &ii == &jj * &jj {
                continue;
            }
            for _ in 0..40 {
                let y = [Rational::from(rnd(20)), Rational::from_signeds(rnd(20), 3), Rational::from(rnd(5))];
                let y2 = alg_mul(&y, &y, &ii, &jj);
                match is_square_in_algebra(&y2, &ii, &jj) {
                    Some(b) => assert!(b, "{y:?} in ({i},{j})"),
                    None => continue,
                }
                let t = alg_mul(&y2, &[Rational::from(-7), Rational::ZERO, Rational::ZERO], &ii, &jj);
                // -7 is not a square in Q nor in the components unless a component contains sqrt(-7)
                let roots = integer_roots_of_resolvent(&ii, &jj);
                if roots.len() != 1 {
                    assert_eq!(is_square_in_algebra(&t, &ii, &jj), Some(false));
                }
                // y^2 * (1 + φ) is a square only if 1 + φ is
                let w = [Rational::from(1), Rational::from(1), Rational::ZERO];
                let t2 = alg_mul(&y2, &w, &ii, &jj);
                assert_eq!(is_square_in_algebra(&t2, &ii, &jj), is_square_in_algebra(&w, &ii, &jj));
            }
        }
    }

    #[test]
    fn class_invariant_under_gl2q_and_scaling() {
        let mut seed = 11u64;
        let mut rnd = |m: i64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % (2 * m as u64 + 1)) as i64 - m
        };
        for _ in 0..60 {
            let g = q([rnd(6), rnd(6), rnd(6), rnd(6), rnd(6)]);
            if g.discriminant() == 0 {
                continue;
            }
            let m = mat_from_i64([[rnd(3), rnd(3)], [rnd(3), rnd(3)]]);
            if super::super::core::det(&m) == 0 {
                continue;
            }
            let h = g.transform(&m);
            assert!(same_covering(&g, &h), "{g:?} vs {h:?}");
            // times a square
            let h2 = Quartic::new(h.coeffs().map(|c| c * Integer::from(9)));
            assert!(same_covering(&g, &h2));
        }
    }

    #[test]
    fn kummer_image_matches_quartic_class_at_points() {
        // For quartics with a rational point, the class equals the Kummer image of the
        // image point on the Jacobian (y^2 + y = x^3 - x, y^2 + y = x^3 + x^2 - 2x from the published tables (Cremona 1997)).
        for ai in [[0i64, 0, 1, -1, 0], [0, 1, 1, -2, 0]] {
            let e = Curve::from_coefficients(ai).unwrap();
            let (i, j) = (e.c4().clone(), Integer::from(2) * e.c6());
            let list = quartics_with_invariants(&i, &j, &Default::default()).unwrap();
            let mut with_points = 0;
            for g in &list {
                let cg = covering_class(g).unwrap();
                'search: for x0 in -8i64..=8 {
                    for z0 in 0i64..=6 {
                        let v = g.eval(&Integer::from(x0), &Integer::from(z0));
                        if (x0 == 0 && z0 == 0) || v < 0 {
                            continue;
                        }
                        let Some(y0) = isqrt_exact(&v) else { continue };
                        let img = g.image_on_curve(&e, &Rational::from(x0), &Rational::from(z0), &Rational::from(y0.clone())).unwrap();
                        let Some((px, py)) = img else { continue };
                        let k = CoveringClass::kummer_image(&e, &px, &py).unwrap();
                        assert!(k.same_as(&cg), "{g:?} point ({x0},{z0},{y0})");
                        with_points += 1;
                        break 'search;
                    }
                }
            }
            assert!(with_points >= 2);
        }
    }

    /// Small rational points on a curve (x = n/d^2).
    fn small_points(e: &Curve, nmax: i64, dmax: i64) -> Vec<(Rational, Rational)> {
        let [a1, a2, a3, a4, a6] = e.coefficients().clone().map(Rational::from);
        let mut pts = Vec::new();
        for d in 1..=dmax {
            for n in -nmax..=nmax {
                let x = Rational::from_signeds(n, d * d);
                let lin = &a1 * &x + &a3;
                let disc = &lin * &lin + Rational::from(4) * (&x * &x * &x + &a2 * &x * &x + &a4 * &x + &a6);
                if let Some(s) = rational_sqrt(&disc) {
                    let y = (-&lin + s) / Rational::from(2);
                    if !pts.iter().any(|(px, _): &(Rational, Rational)| *px == x) {
                        pts.push((x, y));
                    }
                }
            }
        }
        pts
    }

    fn kummer_images_covered(ai: [i64; 5], scaled: bool) -> (usize, usize) {
        let e = Curve::from_coefficients(ai).unwrap();
        let mut invs = vec![(e.c4().clone(), Integer::from(2) * e.c6())];
        if scaled {
            invs.push((Integer::from(16) * e.c4(), Integer::from(128) * e.c6()));
        }
        let mut classes = Vec::new();
        for (i, j) in &invs {
            for g in quartics_with_invariants(i, j, &Default::default()).unwrap() {
                classes.push(covering_class(&g).unwrap());
            }
        }
        let mut total = 0;
        let mut covered = 0;
        for (x, y) in small_points(&e, 60, 3) {
            let k = CoveringClass::kummer_image(&e, &x, &y).unwrap();
            total += 1;
            if k.is_trivial() || classes.iter().any(|c| c.same_as(&k)) {
                covered += 1;
            } else {
                eprintln!("curve {ai:?}: Kummer image of ({x}, {y}) not covered (scaled = {scaled})");
            }
        }
        (total, covered)
    }

    /// Every Kummer image of a rational point is the class of some quartic with
    /// invariants (c4, 2c6) of the model (Cremona, Fisher and Stoll 2010: a
    /// locally soluble 2-covering of a minimal model has a level-0 model).
    /// Curves: y^2 + y = x^3 - x, y^2 + y = x^3 + x^2 - 2x, y^2 + y = x^3 - 7x + 6 (ranks 1, 2, 3), y^2 + y = x^3 - x^2 - 10x - 20, [1,0,1,4,-6], [1,1,1,-10,-10], [1,-1,1,-1,-14], [1,0,0,-4,-1],
    /// [0,-1,0,-4,4], [1,0,1,1,2], [0,-1,1,-2,2], [1,0,0,-1,0] (published tables, Cremona 1997; a-invariants from memory).
    #[test]
    fn kummer_images_of_points_are_covered() {
        let curves: [[i64; 5]; 12] = [
            [0, 0, 1, -1, 0],
            [0, 1, 1, -2, 0],
            [0, 0, 1, -7, 6],
            [0, -1, 1, -10, -20],
            [1, 0, 1, 4, -6],
            [1, 1, 1, -10, -10],
            [1, -1, 1, -1, -14],
            [1, 0, 0, -4, -1],
            [0, -1, 0, -4, 4],
            [1, 0, 1, 1, 2],
            [0, 1, 1, -2, 2],
            [1, 0, 0, -1, 0],
        ];
        for ai in curves {
            let (t, c) = kummer_images_covered(ai, false);
            assert_eq!(t, c, "{ai:?}");
        }
    }

    /// Experiment over random small models: does (c4, 2c6) alone cover every
    /// Kummer image of a small point? (run with --ignored --nocapture)
    #[test]
    #[ignore]
    fn kummer_experiment_random_models() {
        let mut seed = 2024u64;
        let mut rnd = |m: i64| {
            seed = seed.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            ((seed >> 33) % (2 * m as u64 + 1)) as i64 - m
        };
        let (mut tt, mut cc, mut curves) = (0, 0, 0);
        for _ in 0..400 {
            let ai = [rnd(1).abs(), rnd(1), rnd(1).abs(), rnd(25), rnd(40)];
            let Ok(e) = Curve::from_coefficients(ai) else { continue };
            if e.c4().clone() * e.c4() > Integer::from(1_000_000_000i64) {
                continue;
            }
            let (t, c) = kummer_images_covered(ai, false);
            tt += t;
            cc += c;
            curves += 1;
        }
        eprintln!("curves {curves}: points {tt}, covered {cc}");
        assert_eq!(tt, cc);
    }

    fn distinct(classes: Vec<CoveringClass>) -> usize {
        let mut reps: Vec<CoveringClass> = Vec::new();
        for c in classes {
            if !reps.iter().any(|r| r.same_as(&c)) {
                reps.push(c);
            }
        }
        reps.len()
    }

    /// Ranks and torsion from the published tables (Cremona 1997): y^2 + y = x^3 - x rank 1, y^2 + y = x^3 + x^2 - 2x rank 2, y^2 + y = x^3 - 7x + 6
    /// rank 3, all with trivial torsion, so E(Q)/2E(Q) has 2, 4, 8 elements; the
    /// Kummer images of small points realise all of them, and the quartics with
    /// invariants (c4, 2c6) that have a small rational point fall into exactly as
    /// many GL2(Q)-classes.
    #[test]
    fn counts_of_classes_with_points() {
        for (ai, size) in [([0i64, 0, 1, -1, 0], 2usize), ([0, 1, 1, -2, 0], 4), ([0, 0, 1, -7, 6], 8)] {
            let e = Curve::from_coefficients(ai).unwrap();
            let mut ks: Vec<CoveringClass> =
                small_points(&e, 60, 3).iter().map(|(x, y)| CoveringClass::kummer_image(&e, x, y).unwrap()).collect();
            ks.push(covering_class(&Quartic::from_coeffs([0, 4, 0, 0, 1])).unwrap().with_invariants(e.c4(), &(Integer::from(2) * e.c6())));
            assert_eq!(distinct(ks), size, "{ai:?}");
            let (i, j) = (e.c4().clone(), Integer::from(2) * e.c6());
            let mut with_pts = Vec::new();
            for g in quartics_with_invariants(&i, &j, &Default::default()).unwrap() {
                let mut has = false;
                'p: for x0 in -10i64..=10 {
                    for z0 in 0i64..=10 {
                        let v = g.eval(&Integer::from(x0), &Integer::from(z0));
                        if !(x0 == 0 && z0 == 0) && isqrt_exact(&v).is_some() {
                            has = true;
                            break 'p;
                        }
                    }
                }
                if has {
                    with_pts.push(covering_class(&g).unwrap());
                }
            }
            assert_eq!(distinct(with_pts), size, "{ai:?}");
        }
    }

    /// Curves with rational 2-torsion, rank 0 (published tables, Cremona 1997, from memory):
    /// y^2 = x^3 - x (conductor 32, E(Q) = Z/2 x Z/2), [1,0,1,4,-6] (Z/6), [1,1,1,-10,-10] (Z/2 x Z/4), y^2 + y = x^3 - x^2 - 10x - 20 (Z/5):
    /// |E(Q)/2E(Q)| = 4, 2, 4, 1; this exercises split algebras and the 2-torsion rule.
    #[test]
    fn kummer_images_with_two_torsion() {
        for (ai, size) in [([0i64, 0, 0, -1, 0], 4usize), ([1, 0, 1, 4, -6], 2), ([1, 1, 1, -10, -10], 4), ([0, -1, 1, -10, -20], 1)] {
            let e = Curve::from_coefficients(ai).unwrap();
            let mut ks: Vec<CoveringClass> =
                small_points(&e, 60, 3).iter().map(|(x, y)| CoveringClass::kummer_image(&e, x, y).unwrap()).collect();
            ks.push(covering_class(&Quartic::from_coeffs([0, 4, 0, 0, 1])).unwrap().with_invariants(e.c4(), &(Integer::from(2) * e.c6())));
            assert_eq!(distinct(ks), size, "{ai:?}");
        }
    }
}
