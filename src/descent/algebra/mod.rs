//! The 2-descent over the algebra `A = Q[X]/(f)` (Cassels, Lectures on
//! Elliptic Curves, chapters 14-15; Silverman, AEC X.1; Schaefer and Stoll,
//! How to do a p-descent on an elliptic curve, Trans. AMS 356 (2004)).
//!
//! From an integral Weierstrass model, `X = 4x`, `Y = 4(2y + a1 x + a3)`
//! gives `Y^2 = f(X) = X^3 + b2 X^2 + 8 b4 X + 16 b6`, a monic integral
//! cubic. The map `P -> X(P) - theta` sends `E(Q)/2E(Q)` injectively into
//! `A*/A*^2`, with the usual correction at the points of order 2 (there the
//! factor of `A` that vanishes takes the product of the other differences).
//! The image lies in the group of classes unramified outside
//! `S = {2, primes dividing disc(f)}` whose norm is a square, and `Sel^2(E)`
//! is the subgroup of those whose image in `(A (x) Q_v)*/squares` lies in
//! the image of `E(Q_v)` at every place `v` of `S` and at the real place.
//!
//! Each local image is found from local points (`X` in `Q_v` with `f(X)` a
//! non-zero square) until its dimension reaches the known value
//! `dim E(Q_v)[2]` (plus 1 at `v = 2`, minus 1 at the real place; Silverman,
//! AEC X.1 and VII.6); the points are kept as witnesses. A search that
//! does not reach the dimension, or a span that exceeds it, is an error,
//! never a smaller or larger Selmer group.
//!
//! Covered: the algebra `Q x Q x Q` (curves with full rational 2-torsion),
//! where `A(S,2)` is `Q(S,2)^2` and no class group is needed, and
//! `Q x K` with `K` quadratic (one rational point of order 2), where the
//! candidates are `K(S,2)` from [`crate::numfield`] (see `quadratic.rs` for
//! the local square classes of `K (x) Q_v`), and `K` cubic (no rational
//! point of order 2; see `cubic.rs`: the square test there goes through a
//! resolvent quartic). `K(S,2)` of a cubic field is unconditional (the
//! Minkowski bound) up to `|d_K| = 10^12`, else it may rest on GRH, and
//! [`AlgebraDescent::conditional_on_grh`] says so.
//!
//! ```
//! use twofold::descent::algebra::two_selmer_over_algebra;
//! use twofold::{Curve, Work};
//! use twofold::torsion::TorsionGroup;
//! use malachite::Natural;
//! // y^2 = x^3 - 36x (the congruent number 6; rank 1, Sha[2] trivial: published table, Cremona 1997)
//! let e = Curve::from_coefficients([0, 0, 0, -36, 0]).unwrap();
//! let primes = vec![Natural::from(2u32), Natural::from(3u32)];
//! let t = TorsionGroup::compute(&e, &primes);
//! let d = two_selmer_over_algebra(&e, &t, &primes, &Work::unlimited()).unwrap().unwrap();
//! assert_eq!((d.selmer_dim, d.two_torsion_dim, d.upper), (3, 2, 1));
//! ```

mod conic;
mod covering;
mod cubic;
pub mod local;
mod quadratic;
mod roots;
mod selmer;

pub use selmer::image_pair;
pub use covering::CoveringRun;
pub(crate) use covering::{class_mask, search_coverings, torsion_masks, CoveringContext};
use covering::{alg_mul, AlgElem, Factors};

use crate::budget::Work;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::solubility::Place;
use crate::torsion::TorsionGroup;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// How the algebra `Q[X]/(f)` splits.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum AlgebraShape {
    /// `f` has three rational roots: `A = Q x Q x Q`.
    ThreeRational,
    /// `f` has one rational root: `A = Q x K`, K quadratic.
    RationalTimesQuadratic,
    /// `f` is irreducible: `A = K`, K cubic.
    Cubic,
}

/// The local image at one place: its dimension and the `X`-coordinates of
/// local points (on `Y^2 = f(X)`, as rationals that lie in `Q_v`) whose
/// images, together with those of `E(Q)[2]`, span it.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct AlgebraLocalImage {
    /// The place.
    pub place: Place,
    /// Dimension of the image of `E(Q_v)/2E(Q_v)`.
    pub dim: usize,
    /// Local points `X` with `f(X)` a non-zero square in `Q_v`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub witnesses: Vec<Rational>,
}

/// `Sel^2(E)` from the descent over the algebra `Q[X]/(f)`.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct AlgebraDescent {
    /// The splitting of the algebra.
    pub shape: AlgebraShape,
    /// `[c0, c1, c2]` of `f(X) = X^3 + c2 X^2 + c1 X + c0` (`X = 4x` on the curve's model).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub cubic: [Integer; 3],
    /// The finite primes of `S`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub primes: Vec<Natural>,
    /// A basis of `Sel^2(E)`; for `Q x Q x Q` each element is the triple of
    /// square-free integers `(a1, a2, a1 a2 / square)` standing for
    /// `X - e1, X - e2, X - e3`; for `Q x K` the pair (square-free norm
    /// class, bit mask over the `K(S,2)` basis); for `K` cubic the bit mask
    /// over the `K(S,2)` basis alone.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub selmer_basis: Vec<Vec<Integer>>,
    /// The F2-dimension of `Sel^2(E)` (including the image of `E(Q)[2]`).
    pub selmer_dim: usize,
    /// `dim E(Q)[2]`.
    pub two_torsion_dim: usize,
    /// The upper bound `dim Sel^2(E) - dim E(Q)[2]` for the rank.
    pub upper: usize,
    /// The local images, one per place of `S` and the real place.
    pub local_images: Vec<AlgebraLocalImage>,
    /// Whether a class group behind the result used a bound that rests on
    /// the generalised Riemann hypothesis (never for `Q x Q x Q`).
    pub conditional_on_grh: bool,
    /// A basis of the candidate group as explicit elements of
    /// `A = Q[X]/(f)`: `[a0, a1, a2]` stands for `a0 + a1 X + a2 X^2`
    /// (for `Q x Q x Q` the classes `(b, 1, b)` and `(1, b, b)` of the
    /// basis `b` of `Q(S,2)`; for `Q x K` the pairs `(N(beta), beta)` for the
    /// `K(S,2)` basis; for `K` cubic the `K(S,2)` basis itself), each the
    /// product of the factors of odd exponent of its compact form.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub candidates: Vec<[Rational; 3]>,
    /// The basis of `Sel^2(E)` as bit masks over `candidates`.
    pub selmer_masks: Vec<u64>,
    /// The discriminant of the number field `K` behind the candidates
    /// (`None` for `Q x Q x Q`).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub field_discriminant: Option<Integer>,
    /// Every prime ideal of `K` of norm up to this was shown to have its
    /// class in the subgroup of the factor base (the class group and unit
    /// computation behind `K(S,2)`; `None` for `Q x Q x Q`).
    pub generation_bound: Option<u64>,
}

/// The element of `A = Q[X]/(f)` (coefficients `[a0, a1, a2]`) with the
/// values `values` at the three rational roots `roots` of `f` (Lagrange
/// interpolation: the Chinese remainder theorem for `Q x Q x Q`).
pub(crate) fn interpolate(roots: &[Rational; 3], values: &[Rational; 3]) -> [Rational; 3] {
    let mut out = [Rational::ZERO, Rational::ZERO, Rational::ZERO];
    for i in 0..3 {
        let (j, k) = ((i + 1) % 3, (i + 2) % 3);
        // L_i = (X - e_j)(X - e_k) / ((e_i - e_j)(e_i - e_k))
        let scale = &values[i] / ((&roots[i] - &roots[j]) * (&roots[i] - &roots[k]));
        out[0] += &scale * &roots[j] * &roots[k];
        out[1] -= &scale * (&roots[j] + &roots[k]);
        out[2] += scale;
    }
    out
}


/// The monic model `Y^2 = X^3 + b2 X^2 + 8 b4 X + 16 b6` of `curve`
/// (`X = 4x`): returns `[c0, c1, c2]`.
pub fn monic_cubic(curve: &Curve) -> [Integer; 3] {
    let [b2, b4, b6, _] = curve.b_invariants();
    [Integer::from(16) * b6, Integer::from(8) * b4, b2.clone()]
}

/// `f(X)` for the monic cubic `[c0, c1, c2]`.
pub(crate) fn eval_cubic(c: &[Integer; 3], x: &Rational) -> Rational {
    let mut v = x.clone();
    v += Rational::from(c[2].clone());
    v *= x;
    v += Rational::from(c[1].clone());
    v *= x;
    v += Rational::from(c[0].clone());
    v
}

/// The `X`-coordinate (`X = 4x`) of a point of the curve's model.
pub fn big_x(p: &Point) -> Option<Rational> {
    match p {
        Point::Infinity => None,
        Point::Affine(x, _) => Some(Rational::from(4) * x),
    }
}

/// `Sel^2(E)` of `curve` (an integral model; `primes` must contain every
/// prime dividing its discriminant) by the descent over `Q[X]/(f)`, or
/// `Ok(None)` where the algebra's shape is not handled yet.
///
/// Errors: [`ErrorKind::Budget`] when `work` runs out;
/// [`ErrorKind::Internal`] when a local image exceeds its known dimension,
/// the search for local points cannot complete one, or the image of
/// `E(Q)[2]` is not in the Selmer group.
pub fn two_selmer_over_algebra(
    curve: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    work: &Work,
) -> Result<Option<AlgebraDescent>, Error> {
    Ok(two_selmer_with_context(curve, torsion, primes, work)?.map(|(d, _)| d))
}

/// As [`two_selmer_over_algebra`], with what the 2-coverings of the
/// Selmer elements need (the algebra, an explicit basis, the torsion).
pub(crate) fn two_selmer_with_context(
    curve: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    work: &Work,
) -> Result<Option<(AlgebraDescent, CoveringContext)>, Error> {
    let cubic = monic_cubic(curve);
    let roots: Vec<Integer> = torsion
        .two_torsion()
        .iter()
        .filter_map(big_x)
        .map(|x| {
            let (n, _) = x.to_numerator_and_denominator();
            if x < Rational::ZERO {
                -Integer::from(n)
            } else {
                Integer::from(n)
            }
        })
        .collect();
    for r in &roots {
        if eval_cubic(&cubic, &Rational::from(r.clone())) != Rational::ZERO {
            return Err(Error::internal("the algebra descent", "a point of order 2 is not a root of the monic cubic"));
        }
    }
    let torsion_points: Vec<Point> = torsion.points().iter().filter(|p| matches!(p, Point::Affine(..))).cloned().collect();
    let s = s_primes(&cubic, &roots, primes, work)?;
    let rational_roots: Vec<Rational> = roots.iter().cloned().map(Rational::from).collect();
    let (d, factors, explicit) = match roots.len() {
        3 => {
            let d = selmer::three_rational(cubic.clone(), [roots[0].clone(), roots[1].clone(), roots[2].clone()], s, work)?;
            (d, Factors::Split { roots: rational_roots, quadratic: None }, None)
        }
        1 => {
            let d = quadratic::rational_times_quadratic(cubic.clone(), roots[0].clone(), s, work)?;
            // f = (X - e)(X^2 + u X + w)
            let e = &rational_roots[0];
            let u = Rational::from(cubic[2].clone()) + e;
            let w = Rational::from(cubic[1].clone()) + e * &u;
            (d, Factors::Split { roots: rational_roots, quadratic: Some((u, w)) }, None)
        }
        0 => {
            let (d, c) = cubic::cubic_field(cubic.clone(), s, work)?;
            let basis: Vec<AlgElem> = c
                .selmer
                .iter()
                .map(|el| {
                    let v = c.k.to_power_basis(el);
                    std::array::from_fn(|i| v.get(i).cloned().unwrap_or(Rational::ZERO))
                })
                .collect();
            (d, Factors::Field(c.k), Some(basis))
        }
        _ => return Err(Error::internal("the algebra descent", "two points of order 2 without the third")),
    };
    // the Selmer basis as explicit elements: products of the candidates
    let selmer = explicit.unwrap_or_else(|| {
        let one: AlgElem = [Rational::ONE, Rational::ZERO, Rational::ZERO];
        d.selmer_masks
            .iter()
            .map(|&m| d.candidates.iter().enumerate().filter(|(j, _)| m >> j & 1 == 1).fold(one.clone(), |acc, (_, c)| alg_mul(&cubic, &acc, c)))
            .collect()
    });
    let ctx = CoveringContext { cubic, factors, selmer, torsion: torsion_points, primes: d.primes.clone() };
    Ok(Some((d, ctx)))
}

/// `Sel^2(E)` over the algebra and a search for points on the 2-coverings
/// of its elements (each element's conic, quartic, minimisation and
/// reduction: see `covering.rs`), at the heights `heights` in turn, until
/// the classes found, with those of the torsion points, span `Sel^2(E)` or
/// `work` runs out. Every shape of the algebra (`K` cubic, `Q x K`,
/// `Q x Q x Q`). Every point returned is on `curve` and of the class of
/// its element (an internal error otherwise); the elements whose classes
/// the torsion points explain are not searched.
///
/// ```
/// use twofold::descent::algebra::points_on_coverings;
/// use twofold::{Curve, CurveData, Work};
/// use twofold::torsion::TorsionGroup;
/// // y^2 + y = x^3 - x: rank 1, Sha trivial (published table, Cremona 1997)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let work = Work::unlimited();
/// let data = CurveData::new(&e, &work).unwrap();
/// let t = TorsionGroup::compute(&e, data.bad_primes());
/// let (d, runs) = points_on_coverings(&e, &t, data.bad_primes(), &[64], &work).unwrap().unwrap();
/// assert_eq!(d.selmer_dim, 1);
/// assert!(runs[0].point.is_some());
/// ```
pub fn points_on_coverings(
    curve: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    heights: &[u64],
    work: &Work,
) -> Result<Option<(AlgebraDescent, Vec<CoveringRun>)>, Error> {
    let Some((d, ctx)) = two_selmer_with_context(curve, torsion, primes, work)? else { return Ok(None) };
    let runs = search_coverings(curve, &ctx, &[], d.upper, crate::budget::Rungs::Fixed(heights), work)?;
    Ok(Some((d, runs)))
}

/// `S`: 2 and the primes of `primes` that divide `disc(f)`; every prime of
/// `disc(f)` must be listed, and every listed number that divides it must
/// be prime ([`ErrorKind::InvalidValue`] otherwise; the test honours
/// `work` above 2048 bits). The fields of the
/// descent are built from these primes (`NumberField::with_known_primes`),
/// so `disc(f)` is never factored twice.
fn s_primes(cubic: &[Integer; 3], roots: &[Integer], primes: &[Natural], work: &Work) -> Result<Vec<Natural>, Error> {
    let mut disc = Integer::ONE;
    if roots.len() == 3 {
        for (i, j) in [(0, 1), (0, 2), (1, 2)] {
            let d = &roots[i] - &roots[j];
            disc *= &d * &d;
        }
    } else {
        let [c0, c1, c2] = cubic;
        // disc of X^3 + a X^2 + b X + c: a^2 b^2 - 4 b^3 - 4 a^3 c - 27 c^2 + 18 a b c
        let (a, b, c) = (c2, c1, c0);
        disc = a * a * b * b - Integer::from(4) * b * b * b - Integer::from(4) * a * a * a * c - Integer::from(27) * c * c
            + Integer::from(18) * a * b * c;
    }
    if disc == Integer::ZERO {
        return Err(Error::new(ErrorKind::Singular, "the cubic has a repeated root"));
    }
    let mut out = vec![Natural::from(2u32)];
    let mut rest = disc;
    for p in primes {
        let pi = Integer::from(p.clone());
        let mut divides = false;
        while (&rest).divisible_by(&pi) {
            rest /= &pi;
            divides = true;
        }
        if divides && *p != 2u32 {
            if !crate::arith::is_probable_prime_within(p, &crate::arith::FactorLimits::within(work))? {
                return Err(Error::new(ErrorKind::InvalidValue, format!("the listed bad prime {p} is not prime")));
            }
            out.push(p.clone());
        }
    }
    let two = Integer::from(2);
    while (&rest).divisible_by(&two) {
        rest /= &two;
    }
    if rest != Integer::ONE && rest != -Integer::ONE {
        return Err(Error::new(ErrorKind::InvalidValue, "a prime of the discriminant is missing from the list of bad primes"));
    }
    out.sort();
    Ok(out)
}

use malachite::base::num::arithmetic::traits::DivisibleBy;
