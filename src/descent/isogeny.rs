//! Descent via a rational 2-isogeny (Silverman, AEC X.4 and X.6;
//! Silverman-Tate, Rational Points on Elliptic Curves, III.5-III.6;
//! Cremona, Algorithms for Modular Elliptic Curves, 3.2-3.4).
//!
//! With a rational point T of order 2 moved to (0,0) on an integral model
//! `E: y^2 = x(x^2 + a x + b)`, the isogenous curve is
//! `E': y^2 = x(x^2 - 2a x + a^2 - 4b)`, with `phi: E -> E'` of kernel {O, T}
//! and dual `phi': E' -> E`. The connecting map
//! `alpha: E(Q) -> Q*/Q*^2`, `(x, y) -> x`, `T -> b`, `O -> 1`, has kernel
//! `phi'(E'(Q))` and image inside the square-free divisors `d` of `b`;
//! `d` is in the image iff the quartic `N^2 = d M^4 + a M^2 e^2 + (b/d) e^4`
//! has a rational point, and in the Selmer group iff it has points
//! everywhere locally. Likewise `alpha'` on E'. Then
//! `rank E(Q) = (dim alpha(E(Q)) - dim alpha(E(Q)_tors)) + (dim alpha'(E'(Q)) - dim alpha'(E'(Q)_tors))`.

use super::f2::{kernel, F2Span, SquareClasses};
use crate::arith::{jacobi, valuation};
use crate::budget::{Ladder, RankOptions, Stage, Work, QUARTIC_GROWTH};
use crate::curve::{Curve, Point};
use crate::error::Error;
use crate::search::{search_curve, search_quartic, SearchLimits};
use crate::solubility::{local_witness_with, LocalWitness, Place, SolubilityWorkspace};
use crate::torsion::TorsionGroup;
use malachite::base::num::arithmetic::traits::{DivisibleBy, Mod};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// One side of a 2-isogeny descent: the curve `y^2 = x(x^2 + a x + b)` and
/// the Selmer group of square-free divisors `d` of `b` whose coverings
/// `N^2 = d M^4 + a M^2 e^2 + (b/d) e^4` are everywhere locally soluble.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct IsogenySide {
    /// `a` of the model `y^2 = x(x^2 + a x + b)`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub a: Integer,
    /// `b` of the model.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub b: Integer,
    /// A basis of the Selmer group, as square-free integers.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub selmer_basis: Vec<Integer>,
    /// Dimension of the Selmer group over F2.
    pub selmer_dim: usize,
    /// Dimension of the image of the torsion subgroup.
    pub torsion_dim: usize,
    /// Dimension of the image of the torsion and of the points found.
    pub found_dim: usize,
    /// Points of infinite order found on this side, on this side's model,
    /// with their images `d` (independent modulo the torsion image).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub points: Vec<(Integer, Point)>,
    /// Selmer classes (a basis of a complement of the found image) whose
    /// coverings are everywhere locally soluble but where the search found no point.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub unexplained: Vec<Integer>,
    /// For every place tested, the local image (classes of `Q_v*/Q_v*^2`,
    /// as integer representatives) with a witness for each soluble class.
    pub local_images: Vec<LocalImage>,
    /// The torsion points of this side's model `y^2 = x(x^2 + a x + b)`
    /// (the whole torsion subgroup, the point at infinity included), as the
    /// descent found them for the torsion images: the curve's own torsion
    /// carried over on the side of E, computed on the side of E'. The
    /// certificate records them from here.
    #[cfg_attr(feature = "serde", serde(default))]
    pub torsion_points: Vec<Point>,
    /// For each class of `selmer_basis` (same order) and each place of
    /// `local_images` (same order), a local point on the class's covering
    /// `N^2 = d M^4 + a M^2 e^2 + (b/d) e^4`: the descent tests every basis
    /// class once after the linear algebra, so the certificate reads the
    /// witnesses from here. Empty when the Selmer group is incomplete.
    #[cfg_attr(feature = "serde", serde(default))]
    pub basis_witnesses: Vec<Vec<LocalWitness>>,
}

/// The local image at one place: the classes of `Q_v*/Q_v*^2` (given by
/// integer representatives) whose covering is soluble over `Q_v`, each with
/// a witness point.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct LocalImage {
    /// The place.
    pub place: Place,
    /// Soluble classes with their witnesses.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub soluble: Vec<(Integer, LocalWitness)>,
    /// Classes whose covering has no point over `Q_v`.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub insoluble: Vec<Integer>,
}

/// The result of descent through one 2-isogeny.
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// // y^2 = x^3 - 82x has rank 3 (its Selmer groups are sharp; checked by the descent itself)
/// let e = Curve::from_coefficients([0, 0, 0, -82, 0]).unwrap();
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// let run = &r.isogeny_runs[0];
/// assert_eq!((run.lower, run.upper), (3, Some(3)));
/// assert_eq!(run.side_e.selmer_dim + run.side_e_prime.selmer_dim - 2, 3);
/// for img in &run.side_e.local_images {
///     assert!(!img.soluble.is_empty()); // the trivial class is always soluble
/// }
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct IsogenyDescent {
    /// The kernel point T, on the curve's own model.
    pub kernel_point: Point,
    /// The side of E (images of alpha, divisors of b).
    pub side_e: IsogenySide,
    /// The side of E' (images of alpha', divisors of b').
    pub side_e_prime: IsogenySide,
    /// Lower bound for the rank.
    pub lower: usize,
    /// Upper bound for the rank; `None` if the budget ran out before the
    /// Selmer groups were complete.
    pub upper: Option<usize>,
    /// Points of infinite order on the curve's own model, independent
    /// modulo torsion (their number is `lower`).
    pub points: Vec<Point>,
    /// Whether the search was cut short by the budget.
    pub search_complete: bool,
    /// The height up to which every covering of a Selmer class left
    /// unexplained was searched (raised step by step from
    /// `RankOptions::search_height` while the bounds did not meet and the
    /// budget allowed).
    pub searched_height: u64,
    /// The Tamagawa ratio as an exponent of 2: `e` with
    /// `∏_v #coker(φ_v) / #ker(φ_v) = 2^e`, `φ_v: E(Q_v) → E'(Q_v)`, found
    /// from the Tamagawa numbers of both sides, the scaling of the invariant
    /// differential at 2 and the real place alone (see [`tamagawa_ratio`]).
    /// By Cassels' formula it equals `dim S^φ(E) - dim S^φ'(E')`
    /// (`side_e_prime.selmer_dim - side_e.selmer_dim`), and each local
    /// factor equals the size of the descent's local image over 2; both are
    /// checked, a mismatch being an internal error. `None` when the Selmer
    /// groups are incomplete (budget).
    pub tamagawa_ratio: Option<i64>,
}

/// The change between the curve's own model and `y^2 = x(x^2 + a x + b)`:
/// `X = 36 x + 3 b2 = u^2 x'' + x0`, `Y = 108 (2 y + a1 x + a3) = u^3 y''`.
#[derive(Clone, Debug)]
struct TwoTorsionModel {
    a: Integer,
    b: Integer,
    x0: Integer,
    u: Integer,
}

impl TwoTorsionModel {
    fn new(curve: &Curve, t: &Point) -> Option<TwoTorsionModel> {
        let Point::Affine(x, _) = t else { return None };
        let b2 = &curve.b_invariants()[0];
        let big_x = Rational::from(36) * x + Rational::from(Integer::from(3) * b2);
        let (n, d) = big_x.to_numerator_and_denominator();
        if d != Natural::ONE {
            return None;
        }
        let x0 = if big_x < 0 { -Integer::from(n) } else { Integer::from(n) };
        let mut a = Integer::from(3) * &x0;
        let mut b = Integer::from(3) * &x0 * &x0 - Integer::from(27) * curve.c4();
        let mut u = Integer::ONE;
        for p in [2i32, 3] {
            let p = Integer::from(p);
            let (p2, p4) = (&p * &p, &p * &p * &p * &p);
            while (&a).divisible_by(&p2) && (&b).divisible_by(&p4) {
                a /= &p2;
                b /= &p4;
                u *= &p;
            }
        }
        Some(TwoTorsionModel { a, b, x0, u })
    }

    fn to_user(&self, curve: &Curve, p: &Point) -> Point {
        match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x2, y2) => {
                let [a1, _, a3, _, _] = curve.coefficients();
                let u = Rational::from(self.u.clone());
                let big_x = &u * &u * x2 + Rational::from(self.x0.clone());
                let big_y = &u * &u * &u * y2;
                let x = (big_x - Rational::from(Integer::from(3) * &curve.b_invariants()[0])) / Rational::from(36);
                let y = (big_y / Rational::from(108) - Rational::from(a1.clone()) * &x - Rational::from(a3.clone()))
                    / Rational::from(2);
                Point::Affine(x, y)
            }
        }
    }

    fn from_user(&self, curve: &Curve, p: &Point) -> Point {
        match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let [a1, _, a3, _, _] = curve.coefficients();
                let big_x = Rational::from(36) * x + Rational::from(Integer::from(3) * &curve.b_invariants()[0]);
                let big_y = Rational::from(108)
                    * (Rational::from(2) * y + Rational::from(a1.clone()) * x + Rational::from(a3.clone()));
                let u = Rational::from(self.u.clone());
                Point::Affine((big_x - Rational::from(self.x0.clone())) / (&u * &u), big_y / (&u * &u * &u))
            }
        }
    }
}

fn side_curve(a: &Integer, b: &Integer) -> Curve {
    // invariant: disc = 16 b^2 (a^2 - 4b) is non-zero for both sides of a 2-isogeny of a non-singular curve
    Curve::new([Integer::ZERO, a.clone(), Integer::ZERO, b.clone(), Integer::ZERO]).expect("isogenous model is non-singular")
}

/// alpha on the side model y^2 = x(x^2 + a x + b).
fn alpha(p: &Point, b: &Integer) -> Rational {
    match p {
        Point::Infinity => Rational::ONE,
        Point::Affine(x, _) if *x == Rational::ZERO => Rational::from(b.clone()),
        Point::Affine(x, _) => x.clone(),
    }
}

/// phi': E' -> E for E' = (a', b'): (x, y) -> (y^2 / 4x^2, y (b' - x^2) / 8x^2).
fn dual_map(p: &Point, b_prime: &Integer) -> Point {
    match p {
        Point::Affine(x, y) if *x != Rational::ZERO => {
            let x2 = x * x;
            Point::Affine(
                y * y / (Rational::from(4) * &x2),
                y * (Rational::from(b_prime.clone()) - &x2) / (Rational::from(8) * &x2),
            )
        }
        _ => Point::Infinity,
    }
}

/// Representatives of Q_v*/Q_v*^2 and the coordinates of a square-free integer there.
fn local_reps(place: &Place) -> Vec<Integer> {
    match place {
        Place::Real => vec![Integer::ONE, Integer::from(-1)],
        Place::Prime(p) if *p == 2u32 => [1, 5, -1, -5, 2, 10, -2, -10].iter().map(|&c| Integer::from(c)).collect(),
        Place::Prime(p) => {
            let pi = Integer::from(p.clone());
            let mut n = Integer::from(2);
            while jacobi(&n, &pi) != -1 {
                n += Integer::ONE;
            }
            vec![Integer::ONE, n.clone(), pi.clone(), n * pi]
        }
    }
}

/// Coordinates of a non-zero integer in Q_v*/Q_v*^2 (1 bit at R, 2 at odd p, 3 at 2).
fn local_coords(d: &Integer, place: &Place) -> u8 {
    match place {
        Place::Real => (*d < 0) as u8,
        Place::Prime(p) => {
            let v = valuation(d, p).unwrap_or(0);
            let mut u = d.clone();
            let pi = Integer::from(p.clone());
            for _ in 0..v {
                u /= &pi;
            }
            if *p == 2u32 {
                // invariant: a residue mod 8 is in [0, 8) and fits a u64
                let r = u64::try_from(&(&u).mod_op(Integer::from(8))).unwrap();
                let minus = (r % 4 == 3) as u8;
                let five = (r == 3 || r == 5) as u8;
                ((v % 2) as u8) | minus << 1 | five << 2
            } else {
                ((v % 2) as u8) | ((jacobi(&u, &pi) == -1) as u8) << 1
            }
        }
    }
}

/// The covering quartic for the class `c` at a place: `c^2 (c M^4 + a M^2 e^2 + (b/c) e^4)`.
fn local_quartic(c: &Integer, a: &Integer, b: &Integer) -> [Integer; 5] {
    [c * c * c, Integer::ZERO, a * c * c, Integer::ZERO, b * c]
}

/// The global covering quartic `d M^4 + a M^2 e^2 + (b/d) e^4` for `d | b`.
pub(crate) fn covering_quartic(d: &Integer, a: &Integer, b: &Integer) -> [Integer; 5] {
    [d.clone(), Integer::ZERO, a.clone(), Integer::ZERO, b / d]
}

struct SideWork {
    a: Integer,
    b: Integer,
    classes: SquareClasses,
    selmer: F2Span,
    torsion: F2Span,
    torsion_points: Vec<Point>,
    found: F2Span,
    points: Vec<(Integer, Point)>,
    local_images: Vec<LocalImage>,
    basis_witnesses: Vec<Vec<LocalWitness>>,
}

impl SideWork {
    /// The side `y^2 = x(x^2 + a x + b)`, with the square classes of the
    /// primes `side_primes` (those dividing `b`) and nothing computed yet.
    fn new(a: Integer, b: Integer, side_primes: Vec<Natural>) -> SideWork {
        SideWork {
            a,
            b,
            classes: SquareClasses::new(side_primes),
            selmer: F2Span::new(),
            torsion: F2Span::new(),
            torsion_points: vec![],
            found: F2Span::new(),
            points: vec![],
            local_images: vec![],
            basis_witnesses: vec![],
        }
    }

    /// The record of this side: Selmer basis, dimensions, points, and (for a
    /// complete Selmer group) the classes not explained by points.
    fn record(&self, complete_selmer: bool) -> IsogenySide {
        let mut complement = self.found.clone();
        let mut unexplained = Vec::new();
        for &v in self.selmer.basis() {
            if complement.insert(v) {
                unexplained.push(self.classes.integer_of(v));
            }
        }
        IsogenySide {
            a: self.a.clone(),
            b: self.b.clone(),
            selmer_basis: self.selmer.basis().iter().map(|&v| self.classes.integer_of(v)).collect(),
            selmer_dim: self.selmer.dim(),
            torsion_dim: self.torsion.dim(),
            found_dim: self.found.dim(),
            points: self.points.clone(),
            unexplained: if complete_selmer { unexplained } else { vec![] },
            local_images: self.local_images.clone(),
            torsion_points: self.torsion_points.clone(),
            basis_witnesses: if complete_selmer { self.basis_witnesses.clone() } else { vec![] },
        }
    }
}


/// Computes the Selmer group of one side by local images at R, 2 and the
/// odd primes of `b b'`. Returns `Ok(false)` if the budget ran out.
/// `primes` lists 2 and every prime dividing `b b'`; elsewhere the local
/// condition holds automatically (good reduction at an odd prime, with `d`
/// a unit there).
fn selmer_of_side(w: &mut SideWork, primes: &[Natural], work: &Work) -> Result<bool, Error> {
    let mut places = vec![Place::Real];
    places.extend(primes.iter().cloned().map(Place::Prime));
    let mut basis: Vec<u64> = (0..w.classes.dim()).map(|i| 1u64 << i).collect();
    let mut ws = SolubilityWorkspace::default();
    for place in places {
        if work.exhausted() {
            return Ok(false);
        }
        let mut soluble = Vec::new();
        let mut insoluble = Vec::new();
        let mut local_span: Vec<u8> = Vec::new();
        for c in local_reps(&place) {
            let g = local_quartic(&c, &w.a, &w.b);
            match local_witness_with(&g, &place, &mut ws) {
                Some(wit) => {
                    local_span.push(local_coords(&c, &place));
                    soluble.push((c, wit));
                }
                None => insoluble.push(c),
            }
        }
        // the soluble classes must form a subgroup (they are the image of a homomorphism)
        for &x in &local_span {
            for &y in &local_span {
                if !local_span.contains(&(x ^ y)) {
                    return Err(Error::internal("the 2-isogeny descent", "local image is not a subgroup"));
                }
            }
        }
        let nbits = match &place {
            Place::Real => 1,
            Place::Prime(p) if *p == 2u32 => 3,
            _ => 2,
        };
        let annihilators: Vec<u8> = (1u8..(1 << nbits))
            .filter(|f| local_span.iter().all(|&s| (f & s).count_ones() % 2 == 0))
            .collect();
        if !annihilators.is_empty() {
            let images: Vec<u128> = basis
                .iter()
                .map(|&v| {
                    let c = local_coords(&w.classes.integer_of(v), &place);
                    annihilators
                        .iter()
                        .enumerate()
                        .fold(0u128, |acc, (k, f)| acc | (((f & c).count_ones() % 2) as u128) << k)
                })
                .collect();
            let ker = kernel(&images);
            basis = ker
                .iter()
                .map(|combo| {
                    (0..basis.len()).filter(|i| combo >> i & 1 == 1).fold(0u64, |acc, i| acc ^ basis[i])
                })
                .collect();
        }
        w.local_images.push(LocalImage { place, soluble, insoluble });
    }
    for v in basis {
        w.selmer.insert(v);
    }
    // every basis class is tested at every place once, so that its local
    // points travel with the record (the certificate never searches again);
    // a basis class with no local point contradicts the linear algebra
    let mut witnesses = Vec::with_capacity(w.selmer.dim());
    for &v in w.selmer.basis() {
        if work.exhausted() {
            return Ok(false);
        }
        let d = w.classes.integer_of(v);
        let g = [d.clone(), Integer::ZERO, w.a.clone(), Integer::ZERO, &w.b / &d];
        let mut per_place = Vec::with_capacity(w.local_images.len());
        for img in &w.local_images {
            let wit = local_witness_with(&g, &img.place, &mut ws)
                .ok_or_else(|| Error::internal("the 2-isogeny descent", "a Selmer basis class has no local point"))?;
            per_place.push(wit);
        }
        witnesses.push(per_place);
    }
    w.basis_witnesses = witnesses;
    Ok(true)
}

/// Runs the descent via the 2-isogeny with kernel {O, t}, where `t` is a
/// rational point of order 2 on `curve`. `bad_primes` must contain every
/// prime dividing the discriminant of `curve`.
///
/// The steps, in order: the model `y^2 = x(x^2 + a x + b)` and its isogenous
/// side, the Selmer group of each side ([`selmer_of_side`]), the torsion
/// images ([`add_torsion_images`]), the points on both side curves
/// ([`add_side_curve_points`]), the coverings not yet explained at rising
/// heights ([`lift_side_coverings`]), and the points carried back to the
/// input model ([`points_on_input`]).
pub(crate) fn descend_via_isogeny(
    curve: &Curve,
    t: &Point,
    torsion: &TorsionGroup,
    bad_primes: &[Natural],
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
) -> Result<IsogenyDescent, Error> {
    let model = TwoTorsionModel::new(curve, t).ok_or_else(|| Error::internal("the 2-isogeny descent", "2-torsion point is not integral on the short model"))?;
    let (a, b) = (model.a.clone(), model.b.clone());
    let (a1, b1) = (Integer::from(-2) * &a, &a * &a - Integer::from(4) * &b);
    let mut all_primes: Vec<Natural> = bad_primes.to_vec();
    for q in [2u32, 3] {
        if !all_primes.contains(&Natural::from(q)) {
            all_primes.push(Natural::from(q));
        }
    }
    all_primes.sort();
    let primes_dividing = |n: &Integer| -> Vec<Natural> {
        all_primes.iter().filter(|p| n.divisible_by(&Integer::from((*p).clone()))).cloned().collect()
    };
    // the primes of b b' are among those of 6 * disc(curve): disc(y^2=x(x^2+ax+b)) = 16 b^2 (a^2 - 4b)
    let both: Vec<Natural> = {
        let mut v = primes_dividing(&(&b * &b1));
        if !v.contains(&Natural::from(2u32)) {
            v.insert(0, Natural::from(2u32));
        }
        v
    };
    let models = [side_curve(&a, &b), side_curve(&a1, &b1)];
    work.report(Stage::Solubility, "2-isogeny Selmer groups");
    let mut sides = [SideWork::new(a, b.clone(), primes_dividing(&b)), SideWork::new(a1, b1.clone(), primes_dividing(&b1))];
    let mut complete_selmer = true;
    for w in sides.iter_mut() {
        complete_selmer &= selmer_of_side(w, &both, work)?;
    }
    add_torsion_images(curve, &model, torsion, &models[1], &both, complete_selmer, &mut sides)?;
    work.report(Stage::Search, "2-isogeny point search");
    let mut search_complete = add_side_curve_points(&models, options, work, &mut sides);
    let selmer_bound: Option<usize> = if complete_selmer { Some(sides.iter().map(|w| w.selmer.dim() - w.torsion.dim()).sum()) } else { None };
    let (height, lifted_complete) = lift_side_coverings(&models, selmer_bound, options, work, enough, &mut sides)?;
    search_complete &= lifted_complete;
    let lower = sides.iter().map(|w| w.found.dim() - w.torsion.dim()).sum();
    let upper = selmer_bound;
    if let Some(u) = upper {
        if u < lower {
            return Err(Error::internal("the 2-isogeny descent", "lower bound exceeds the Selmer bound"));
        }
    }
    let tamagawa_ratio = if complete_selmer { Some(check_cassels(&both, &sides)?) } else { None };
    let points = points_on_input(curve, &model, &models[0], &b1, &sides)?;
    Ok(IsogenyDescent {
        kernel_point: t.clone(),
        side_e: sides[0].record(complete_selmer),
        side_e_prime: sides[1].record(complete_selmer),
        lower,
        upper,
        points,
        search_complete,
        searched_height: height,
        tamagawa_ratio,
    })
}

/// The local Tamagawa ratios `#coker(φ_v) / #ker(φ_v)` of the 2-isogeny
/// `φ: E → E'` between `E: y^2 = x(x^2 + a x + b)` and
/// `E': y^2 = x(x^2 - 2a x + a^2 - 4b)` (kernel `T = (0, 0)`), as exponents of
/// 2, at the real place (`None` in the list) and at each prime of `primes`
/// (which must hold 2 and every prime of `b (a^2 - 4b)`; elsewhere the ratio
/// is 1, as the reduction is good and the primes odd).
///
/// * At a prime `p` (E. F. Schaefer, "Class groups and Selmer groups",
///   J. Number Theory 56 (1996), Lemma 3.8):
///   `#coker / #ker = |α|_p^{-1} c_p(E') / c_p(E)`, where `φ^* ω'_min = α ω_min`
///   for the invariant differentials of models minimal at `p`. On the two
///   models above `φ^*(dx/2y) = -dx/2y` (from `φ(x, y) = (y^2/x^2, y(b - x^2)/x^2)`),
///   so `α = -u'/u` with `u`, `u'` the scalings that take each model to a
///   minimal one (`v_p(u)` = the number of times Tate's algorithm scales by
///   `p`); `|α|_p = 1` for odd `p`, as `α α̂ = 2` with both integral.
/// * At the real place `#ker = 2` (T is real) and `coker φ_R` is the image of
///   the connecting map `E'(R) → R^*/R^{*2}`, `(x, y) ↦ x`, `T' ↦ a^2 - 4b`:
///   it holds `-1` exactly when `x^2 - 2a x + a^2 - 4b` has a negative real
///   root, i.e. when `b > 0` and (`a < 0` or `a^2 < 4b`) (its roots are `a ± 2√b`).
///
/// An error of kind [`crate::ErrorKind::Internal`] when the ratio at a
/// prime is not a power of 2 (which the lemma excludes).
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::descent::isogeny::tamagawa_ratio;
/// // y^2 = x^3 - x = x(x^2 - 1): a = 0, b = -1; E' is y^2 = x(x^2 + 4) (from memory:
/// // both have conductor 32, Cremona 1997, Table 1). b < 0, so coker φ_R is trivial: 2^-1 at R.
/// let r = tamagawa_ratio(&Integer::from(0), &Integer::from(-1), &[Natural::from(2u32)]).unwrap();
/// assert_eq!(r[0], (None, -1));
/// ```
pub fn tamagawa_ratio(a: &Integer, b: &Integer, primes: &[Natural]) -> Result<Vec<(Option<Natural>, i64)>, Error> {
    let a1 = Integer::from(-2) * a;
    let b1 = a * a - Integer::from(4) * b;
    let (e, e1) = (side_curve(a, b), side_curve(&a1, &b1));
    let real_neg = *b > 0u32 && (*a < 0u32 || a * a < Integer::from(4) * b);
    let mut out = vec![(None, if real_neg { 0 } else { -1 })];
    for p in primes {
        let t = crate::local::tate(e.coefficients(), e.discriminant(), p);
        let t1 = crate::local::tate(e1.coefficients(), e1.discriminant(), p);
        // ratio = p^(v(u') - v(u)) c(E') / c(E)
        let mut num = u64::from(t1.data.tamagawa);
        let mut den = u64::from(t.data.tamagawa);
        let shift = i64::from(t1.scalings) - i64::from(t.scalings);
        let pw = u64::try_from(p).ok().and_then(|q| q.checked_pow(shift.unsigned_abs() as u32));
        let Some(pw) = pw else {
            return Err(Error::internal("the Tamagawa ratio", format!("|alpha|_{p} = {p}^{shift} is not a power of 2")));
        };
        if shift >= 0 {
            num *= pw;
        } else {
            den *= pw;
        }
        let g = gcd_u64(num, den);
        let (num, den) = (num / g, den / g);
        let exp = match (num.is_power_of_two(), den.is_power_of_two()) {
            (true, true) => i64::from(num.trailing_zeros()) - i64::from(den.trailing_zeros()),
            _ => {
                return Err(Error::internal(
                    "the Tamagawa ratio",
                    format!("the local ratio {num}/{den} at {p} is not a power of 2 (y^2 = x(x^2 + {a} x + {b}))"),
                ))
            }
        };
        out.push((Some(p.clone()), exp));
    }
    Ok(out)
}

fn gcd_u64(mut x: u64, mut y: u64) -> u64 {
    while y != 0 {
        (x, y) = (y, x % y);
    }
    x
}

/// Cassels' formula as a check on a finished descent (J. W. S. Cassels,
/// "Arithmetic on curves of genus 1. VIII", J. reine angew. Math. 217
/// (1965); in the form of T. and V. Dokchitser, "Root numbers and parity of
/// ranks of elliptic curves", J. reine angew. Math. 658 (2011), §4, and
/// T. Dokchitser, "Notes on the parity conjecture", Thm. 4.3):
/// `#S^φ(E) / #S^φ'(E') = (#E(Q)[φ] / #E'(Q)[φ']) ∏_v #coker(φ_v) / #ker(φ_v)`,
/// with `#E(Q)[φ] = #E'(Q)[φ'] = 2` here. Each local factor from
/// [`tamagawa_ratio`] must equal `#(local image of E' at v) / 2` (the image
/// of `E'(Q_v)/φ(E(Q_v))` that the descent found by local solubility), and
/// their sum must equal `dim S^φ(E) - dim S^φ'(E')`. Returns the sum.
fn check_cassels(primes: &[Natural], sides: &[SideWork; 2]) -> Result<i64, Error> {
    let (a, b) = (&sides[0].a, &sides[0].b);
    let ratios = tamagawa_ratio(a, b, primes)?;
    let mut total = 0i64;
    for (place, exp) in &ratios {
        total += exp;
        let found = sides[1].local_images.iter().find(|img| match (&img.place, place) {
            (Place::Real, None) => true,
            (Place::Prime(q), Some(p)) => q == p,
            _ => false,
        });
        let Some(img) = found else { continue };
        let dim = img.soluble.len().trailing_zeros() as i64;
        if img.soluble.len() != 1 << dim || dim - 1 != *exp {
            let at = place.as_ref().map_or("the real place".to_string(), |p| p.to_string());
            return Err(Error::internal(
                "the 2-isogeny descent",
                format!(
                    "at {at} the local image of E' has {} classes but the Tamagawa ratio is 2^{exp} (Schaefer's lemma; y^2 = x(x^2 + {a} x + {b}))",
                    img.soluble.len()
                ),
            ));
        }
    }
    let selmer_diff = sides[1].selmer.dim() as i64 - sides[0].selmer.dim() as i64;
    if selmer_diff != total {
        return Err(Error::internal(
            "the 2-isogeny descent",
            format!(
                "Cassels' formula fails: dim S^phi(E) - dim S^phi'(E') = {selmer_diff} but the Tamagawa ratio is 2^{total} (y^2 = x(x^2 + {a} x + {b}))"
            ),
        ));
    }
    Ok(total)
}

/// The images of the torsion of both sides (the torsion of `e1_model` is
/// computed here, that of the side of E carried over from `torsion`; both
/// lists are kept for the record); with a complete Selmer group they must
/// lie in it. The points found start as the torsion.
fn add_torsion_images(
    curve: &Curve,
    model: &TwoTorsionModel,
    torsion: &TorsionGroup,
    e1_model: &Curve,
    both: &[Natural],
    complete_selmer: bool,
    sides: &mut [SideWork; 2],
) -> Result<(), Error> {
    let tors_e1 = TorsionGroup::compute(e1_model, both);
    for p in torsion.points() {
        let q = model.from_user(curve, p);
        let v = sides[0].classes.vector_of(&alpha(&q, &sides[0].b)).ok_or_else(|| Error::internal("the 2-isogeny descent", "torsion image outside S"))?;
        sides[0].torsion.insert(v);
        sides[0].torsion_points.push(q);
    }
    for p in tors_e1.points() {
        let v = sides[1].classes.vector_of(&alpha(p, &sides[1].b)).ok_or_else(|| Error::internal("the 2-isogeny descent", "torsion image outside S"))?;
        sides[1].torsion.insert(v);
        sides[1].torsion_points.push(p.clone());
    }
    for w in sides.iter_mut() {
        w.found = w.torsion.clone();
        if complete_selmer {
            for &v in w.torsion.basis() {
                if !w.selmer.contains(v) {
                    return Err(Error::internal("the 2-isogeny descent", "torsion image outside the Selmer group"));
                }
            }
        }
    }
    Ok(())
}

/// Points on the two side curves themselves up to `curve_search_height`;
/// returns whether both searches ran to their bound.
fn add_side_curve_points(models: &[Curve; 2], options: &RankOptions, work: &Work, sides: &mut [SideWork; 2]) -> bool {
    let mut search_complete = true;
    let curve_limits = SearchLimits {
        height: options.curve_search_height,
        first_only: false,
        deadline: work.deadline(),
        cancel: work.cancel_flag().cloned(),
    };
    for (k, model_curve) in models.iter().enumerate() {
        let out = search_curve(model_curve, &curve_limits);
        search_complete &= out.complete;
        let bb = sides[k].b.clone();
        for (x, y) in out.points {
            let pt = Point::Affine(x, y);
            let Some(v) = sides[k].classes.vector_of(&alpha(&pt, &bb)) else { continue };
            if sides[k].found.insert(v) {
                let d = sides[k].classes.integer_of(v);
                sides[k].points.push((d, pt));
            }
        }
    }
    search_complete
}

/// The part of a ladder's budget (wall-clock share and CPU cap) that the
/// isogeny coverings climb within (see [`lift_side_coverings`]).
const ISOGENY_LADDER_FRACTION: f64 = 0.125;

/// Search on the coverings of Selmer classes not yet explained, at heights
/// doubled from `search_height` towards `search_height_ceiling`, each rung
/// only when its cost predicted from the last one fits an eighth of a
/// ladder's share of the budget ([`Ladder`], growth [`QUARTIC_GROWTH`],
/// [`ISOGENY_LADDER_FRACTION`]), while the bounds
/// do not meet; a rank proven by another route (`enough`) also ends the
/// ladder. Returns the height every unexplained covering was searched to
/// and whether every search ran to its bound (a rung stopped by the
/// ladder's own share is not a search cut short).
fn lift_side_coverings(
    models: &[Curve; 2],
    selmer_bound: Option<usize>,
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
    sides: &mut [SideWork; 2],
) -> Result<(u64, bool), Error> {
    let upper_now = match (selmer_bound, enough) {
        (Some(u), Some(e)) => Some(u.min(e)),
        (u, e) => u.or(e),
    };
    let mut search_complete = true;
    // an eighth of a ladder's budget: when these bounds do not meet, the
    // full 2-descent runs next, and its coverings (of degree 4 over E, not
    // 2) reach a point of a given height at about the square root of the
    // height needed here; a gap left by Sha(E')[phi'] closes there at once
    let mut ladder = Ladder::new(options.search_height, options.search_height_ceiling, QUARTIC_GROWTH, work, options.search_time_limit)
        .scaled(ISOGENY_LADDER_FRACTION);
    let mut reached = 0u64;
    loop {
        let height = ladder.height();
        let rung = ladder.rung_work(work);
        ladder.start_rung();
        let mut rung_done = true;
        for (k, side) in sides.iter_mut().enumerate() {
            rung_done &= lift_one_side(&models[k], side, &rung, height)?;
        }
        ladder.end_rung();
        search_complete &= rung_done || !work.exhausted();
        if rung_done {
            reached = height;
        }
        let lower_now: usize = sides.iter().map(|w| w.found.dim() - w.torsion.dim()).sum();
        let met = upper_now.is_some_and(|u| lower_now >= u);
        if met || upper_now.is_none() || work.exhausted() || !rung_done || !ladder.climb() {
            return Ok((reached.max(if met { height } else { 0 }), search_complete));
        }
    }
}

/// One pass over the unexplained Selmer classes of one side at `height`
/// (smallest `|d|` first; all elements when the group is small, a basis
/// otherwise); returns whether every search ran to its bound.
fn lift_one_side(side_model: &Curve, side: &mut SideWork, work: &Work, height: u64) -> Result<bool, Error> {
    let mut search_complete = true;
    let sel_elems = if side.selmer.dim() <= 16 { side.selmer.elements() } else { side.selmer.basis().to_vec() };
    let mut order: Vec<(Integer, u64)> = sel_elems.into_iter().map(|v| (side.classes.integer_of(v), v)).collect();
    order.sort_by_key(|(d, _)| {
        use malachite::base::num::arithmetic::traits::UnsignedAbs;
        d.unsigned_abs()
    });
    for (d, v) in order {
        if side.found.contains(v) {
            continue;
        }
        if work.exhausted() {
            search_complete = false;
            break;
        }
        let g = covering_quartic(&d, &side.a, &side.b);
        let limits = SearchLimits { first_only: true, ..SearchLimits::within(work, height) };
        let out = search_quartic(&g, &limits);
        // a search stopped by its first point did its job
        search_complete &= out.complete || !out.points.is_empty();
        for qp in out.points {
            if qp.z == 0 {
                continue;
            }
            // (M, e, N) -> (d M^2 / e^2, d M N / e^3)
            let m = Rational::from(qp.x.clone());
            let e = Rational::from(qp.z.clone());
            let n = Rational::from(qp.y.clone());
            let dq = Rational::from(d.clone());
            let pt = Point::Affine(&dq * &m * &m / (&e * &e), &dq * &m * &n / (&e * &e * &e));
            if !side_model.contains(&pt) {
                return Err(Error::internal("the 2-isogeny descent", "covering point does not map onto the curve"));
            }
            let Some(vv) = side.classes.vector_of(&alpha(&pt, &side.b)) else { continue };
            if side.found.insert(vv) {
                side.points.push((d.clone(), pt));
            }
            break;
        }
    }
    Ok(search_complete)
}

/// The points found on both sides, carried to the input model (the second
/// side's through the dual isogeny), each checked to lie on `curve`.
fn points_on_input(curve: &Curve, model: &TwoTorsionModel, e_model: &Curve, b1: &Integer, sides: &[SideWork; 2]) -> Result<Vec<Point>, Error> {
    let mut points = Vec::new();
    for (_, p) in &sides[0].points {
        let q = model.to_user(curve, p);
        if !curve.contains(&q) {
            return Err(Error::internal("the 2-isogeny descent", "point does not lie on the input model"));
        }
        points.push(q);
    }
    for (_, p) in &sides[1].points {
        let on_e = dual_map(p, b1);
        if !e_model.contains(&on_e) {
            return Err(Error::internal("the 2-isogeny descent", "dual isogeny image not on the curve"));
        }
        let q = model.to_user(curve, &on_e);
        if !curve.contains(&q) {
            return Err(Error::internal("the 2-isogeny descent", "point does not lie on the input model"));
        }
        points.push(q);
    }
    Ok(points)
}
