//! From an element of `Sel^2(E)` to its 2-covering, and the search for
//! points on it (Cassels, Lectures on Elliptic Curves, chapter 15;
//! Cremona, Fisher and Stoll 2010 for minimisation and reduction), for
//! every shape of the algebra `A = Q[X]/(f)`: `K` cubic, `Q x K` with `K`
//! quadratic, and `Q x Q x Q`.
//!
//! Let `theta` be the class of `X` in `A`. A point of `E` (not of order 2)
//! has class `delta` exactly when `X - theta = delta z^2` for some
//! `z = u + v theta + w theta^2` in `A`. Write `delta z^2 = q0 + q1 theta + q2 theta^2`
//! with ternary quadratic forms `q0, q1, q2` in `(u, v, w)`. Then
//! `q2(u, v, w) = 0` (a conic, non-degenerate as `q2(z) = Tr(delta z^2 / f'(theta))`
//! and `A` is étale; it has a rational point by Hasse-Minkowski as
//! `delta` is everywhere locally soluble), `q1 = -1` and `X = q0`. The
//! conic's points are `lambda Q(s, t)` for a binary quadratic map `Q`
//! (the lines through one point), so `-q1(Q(s, t)) = (1 / lambda)^2`: the
//! binary quartic `G = -q1 o Q` gives the 2-covering `y^2 = G(s, t)` of
//! `E`. Nothing here depends on how `A` splits: the arithmetic is that of
//! `Q[X]/(f)` on the power basis; only the square test (is an element of
//! `A` a square?) looks at the factors (`Q`: a rational square; `K`
//! quadratic: the norm and `(a +- n)/2`; `K` cubic: a resolvent quartic).
//! For `Q x Q x Q` the quartic is the classical one of the intersection of
//! two quadrics `d1 z1^2 - d2 z2^2 = e2 - e1`, `d1 z1^2 - d3 z3^2 = e3 - e1`
//! in other coordinates.
//!
//! The quartic is made integral (scaled by a square), minimised at the
//! primes of its invariants ([`crate::quartic::minimise_covering`]),
//! reduced ([`crate::quartic::reduce`]) and searched by the sieved quartic
//! search; each point found is mapped to `E` by the covering map of the
//! quartic's invariants ([`crate::quartic::Quartic::image_on_curve`]) and
//! checked: on the curve, and of class `delta` (`(X - theta) delta` a
//! square in `A`, with the usual correction at the points of order 2). Where
//! the covering map lands in the class `delta` times the class of a
//! rational point `T` of order 2, the point found is translated by `T`;
//! any other class is an internal error.

use super::conic::{bilinear, conic_point, Sym3, Vec3};
use super::interpolate;
use crate::arith::FactorLimits;
use crate::budget::{Rungs, Work};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::numfield::{poly, Element, NumberField};
use crate::quartic::{minimise_covering, reduce, Quartic};
use crate::search::{search_quartic, SearchLimits};
use malachite::base::num::arithmetic::traits::{CheckedSqrt, DivRound, Gcd, Lcm};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::base::rounding_modes::RoundingMode;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// The cubic field and the explicit `Sel^2(E)` basis the cubic route found.
#[derive(Clone, Debug)]
pub(crate) struct CubicContext {
    /// `K = Q[X]/(f)`.
    pub(crate) k: NumberField,
    /// A basis of `Sel^2(E)` as elements of `K`.
    pub(crate) selmer: Vec<Element>,
}

/// How `A = Q[X]/(f)` splits, for the square test.
#[derive(Clone, Debug)]
pub(crate) enum Factors {
    /// `A = K` cubic.
    Field(NumberField),
    /// `A = Q x Q x Q` (three rational roots) or `Q x K` (one rational root
    /// and `q = X^2 + u X + w` irreducible, given as `(u, w)`).
    Split { roots: Vec<Rational>, quadratic: Option<(Rational, Rational)> },
}

/// An element `a0 + a1 theta + a2 theta^2` of `A`.
pub(crate) type AlgElem = [Rational; 3];

/// What the 2-coverings need from a finished descent over the algebra:
/// the algebra, an explicit `Sel^2(E)` basis and the torsion points of
/// the curve's model (their classes are explained without a search).
#[derive(Clone, Debug)]
pub(crate) struct CoveringContext {
    /// `[c0, c1, c2]` of `f(X) = X^3 + c2 X^2 + c1 X + c0`, `X = 4x`.
    pub(crate) cubic: [Integer; 3],
    pub(crate) factors: Factors,
    /// A basis of `Sel^2(E)` as elements of `A`.
    pub(crate) selmer: Vec<AlgElem>,
    /// The affine torsion points of the model.
    pub(crate) torsion: Vec<Point>,
    /// The finite primes of `S`.
    pub(crate) primes: Vec<Natural>,
}

/// `a theta` in `A`.
fn mul_theta(c: &[Integer; 3], a: &AlgElem) -> AlgElem {
    let [c0, c1, c2] = c.clone().map(Rational::from);
    [-(&c0 * &a[2]), &a[0] - &c1 * &a[2], &a[1] - &c2 * &a[2]]
}

/// `a b` in `A`.
pub(crate) fn alg_mul(c: &[Integer; 3], a: &AlgElem, b: &AlgElem) -> AlgElem {
    let mut out: AlgElem = [Rational::ZERO, Rational::ZERO, Rational::ZERO];
    let mut p = a.clone();
    for (i, bi) in b.iter().enumerate() {
        if i > 0 {
            p = mul_theta(c, &p);
        }
        if *bi != 0u32 {
            for (o, x) in out.iter_mut().zip(p.iter()) {
                *o += x * bi;
            }
        }
    }
    out
}

/// `a` times a rational square that makes it integral with a content free
/// of squares of primes below 1000 (the same class in `A*/A*^2`).
fn trim_squares(a: &AlgElem) -> AlgElem {
    let d = common_denominator(a.iter());
    let d2 = Rational::from(&d * &d);
    let mut ints: Vec<Integer> = a.iter().map(|x| Integer::try_from(x * &d2).unwrap_or(Integer::ZERO)).collect();
    let content = ints.iter().fold(Natural::ZERO, |acc, c| acc.gcd(c.unsigned_abs_ref()));
    if content > 1u32 {
        for p in crate::arith::primes_up_to(1000) {
            let p2 = Integer::from(p * p);
            while ints.iter().all(|c| (c % &p2) == 0) {
                for c in ints.iter_mut() {
                    *c /= &p2;
                }
            }
        }
    }
    std::array::from_fn(|i| Rational::from(ints[i].clone()))
}

/// The product of the basis elements in `mask`.
pub(crate) fn element_of_mask(ctx: &CoveringContext, mask: u64) -> AlgElem {
    let one: AlgElem = [Rational::ONE, Rational::ZERO, Rational::ZERO];
    let product = ctx.selmer.iter().enumerate().filter(|(j, _)| mask >> j & 1 == 1).fold(one, |acc, (_, d)| trim_squares(&alg_mul(&ctx.cubic, &acc, d)));
    small_representative(ctx, &product)
}

/// The integer `z` (non-zero) without the even part of its `S`-part, and
/// without its other part when that is a perfect square (the same class in
/// `Q*/Q*^2`).
fn s_squarefree(z: &Integer, primes: &[Natural]) -> Integer {
    let mut rest = z.clone();
    let mut out = Integer::ONE;
    for p in primes {
        let pi = Integer::from(p.clone());
        let mut odd = false;
        while (&rest % &pi) == 0 {
            rest /= &pi;
            odd = !odd;
        }
        if odd {
            out *= &pi;
        }
    }
    if rest < 0 {
        out = -out;
        rest = -rest;
    }
    match Natural::try_from(&rest).ok().and_then(|n| n.checked_sqrt()) {
        Some(_) => out,
        None => out * rest,
    }
}

/// `x + y T` (`T^2 = D`) with the square part of its content dropped where
/// the content is an `S`-part times a square (the same class).
fn primitive_pair(x: &Integer, y: &Integer, primes: &[Natural]) -> (Integer, Integer) {
    let g = Integer::from(x.unsigned_abs_ref().gcd(y.unsigned_abs_ref()));
    if g <= 1u32 {
        return (x.clone(), y.clone());
    }
    let keep = s_squarefree(&g, primes);
    // g / keep is a rational square when the non-S part of g is a square
    let q = Rational::from_integers(g.clone(), keep.clone());
    let (Some(rn), Some(rd)) = (q.numerator_ref().checked_sqrt(), q.denominator_ref().checked_sqrt()) else { return (x.clone(), y.clone()) };
    let root = Rational::from_naturals(rn, rd);
    let scale = Rational::ONE / (&root * &root);
    let to_int = |v: &Integer| Integer::try_from(Rational::from(v.clone()) * &scale).ok();
    match (to_int(x), to_int(y)) {
        (Some(a), Some(b)) => (a, b),
        _ => (x.clone(), y.clone()),
    }
}

/// A representative of the class of `delta` in `A*/A*^2` with small
/// coefficients where the algebra splits: for `Q x Q x Q` the values at the
/// three roots without their square factors; for `Q x K` the rational
/// value likewise and the quadratic part `beta = x + y T` (`T^2 = D`)
/// made primitive and divided by the square of the ideal `J` (coprime to
/// `S`) with `(beta) = S-part J^2`: `J = Z n + Z (b + T)`, `n^2` the norm's
/// part outside `S`, `b = x / y mod n`; a short vector `gamma` of `J` for
/// `x^2 + |D| y^2` (Gauss reduction) gives `beta conj(gamma)^2 / n^2`,
/// whose ideal is `S`-part times the square of an ideal of small norm.
/// The cubic field keeps `delta` (its basis comes from `K(S,2)` already
/// small).
fn small_representative(ctx: &CoveringContext, delta: &AlgElem) -> AlgElem {
    let Factors::Split { roots, quadratic } = &ctx.factors else { return delta.clone() };
    let value = |e: &Rational| &delta[0] + &delta[1] * e + &delta[2] * e * e;
    let class_int = |r: &Rational| -> Integer {
        let (n, d) = r.to_numerator_and_denominator();
        let z = Integer::from(n) * Integer::from(d);
        s_squarefree(&if *r < 0u32 { -z } else { z }, &ctx.primes)
    };
    match quadratic {
        None => {
            if roots.len() != 3 {
                return delta.clone();
            }
            let values: [Rational; 3] = std::array::from_fn(|i| Rational::from(class_int(&value(&roots[i]))));
            let r: [Rational; 3] = std::array::from_fn(|i| roots[i].clone());
            interpolate(&r, &values)
        }
        Some((u, w)) => {
            let e = &roots[0];
            let r0 = Rational::from(class_int(&value(e)));
            // modulo q: alpha + beta T, T = sqrt(D) = 2 theta' + u
            let (s0, s1) = (&delta[0] - &delta[2] * w, &delta[1] - &delta[2] * u);
            let half = Rational::from_integers(Integer::ONE, Integer::from(2));
            let alpha = &s0 - &s1 * u * &half;
            let beta = &s1 * &half;
            let dd = u * u - Rational::from(4) * w;
            let Ok(d) = Integer::try_from(dd.clone()) else { return delta.clone() };
            let den = Rational::from(common_denominator([&alpha, &beta].into_iter()));
            let (x, y) = (Integer::try_from(&alpha * &den * &den), Integer::try_from(&beta * &den * &den));
            let (Ok(x), Ok(y)) = (x, y) else { return delta.clone() };
            let (mut x, mut y) = primitive_pair(&x, &y, &ctx.primes);
            if y != 0u32 {
                if let Some((gx, gy, n)) = ideal_short_vector(&x, &y, &d, &ctx.primes) {
                    // beta conj(gamma)^2 / n^2, scaled back to integers by n^2 (a square)
                    let (cx, cy) = (&gx * &gx + &d * &gy * &gy, -(Integer::from(2) * &gx * &gy));
                    let (nx, ny) = (&x * &cx + &d * &y * &cy, &x * &cy + &y * &cx);
                    let (px, py) = primitive_pair(&nx, &ny, &ctx.primes);
                    // accept only a smaller element
                    if px.unsigned_abs_ref().significant_bits() + py.unsigned_abs_ref().significant_bits()
                        < x.unsigned_abs_ref().significant_bits() + y.unsigned_abs_ref().significant_bits()
                    {
                        (x, y) = (px, py);
                    }
                    let _ = n;
                }
            }
            // back to A: beta = a + b T with T = 2 X + u modulo q, value r0 at e
            let (a, b) = (Rational::from(x), Rational::from(y));
            let c0 = &a + &b * u;
            let c1 = Rational::from(2) * &b;
            let qe = e * e + u * e + w;
            let kq = (&r0 - (&c0 + &c1 * e)) / &qe;
            [c0 + &kq * w, c1 + &kq * u, kq]
        }
    }
}

/// For a primitive `x + y T` (`T^2 = D`, `y != 0`) whose norm is an
/// `S`-part times `n^2`: a short vector `gx + gy T` of `J = Z n + Z (b + T)`,
/// `b = x / y mod n`, under `X^2 + |D| Y^2`, and `n`. `None` when `n = 1`
/// or the norm's other part is not a square.
fn ideal_short_vector(x: &Integer, y: &Integer, d: &Integer, primes: &[Natural]) -> Option<(Integer, Integer, Integer)> {
    let norm = x * x - d * y * y;
    let mut rest = Integer::from(norm.unsigned_abs_ref().clone());
    for p in primes {
        let pi = Integer::from(p.clone());
        while rest != 0u32 && (&rest % &pi) == 0 {
            rest /= &pi;
        }
    }
    let n = Integer::from(Natural::try_from(&rest).ok()?.checked_sqrt()?);
    if n <= 1u32 {
        return None;
    }
    let y_inv = mod_inverse(&(y % &n), &n)?;
    let mut b = (x * y_inv) % &n;
    if b < 0 {
        b += &n;
    }
    // lattice vectors (X, Y) for X + Y T; basis (n, 0), (b, 1)
    let ad = Integer::from(d.unsigned_abs_ref().clone());
    let size = |v: &(Integer, Integer)| &v.0 * &v.0 + &ad * &v.1 * &v.1;
    let dot = |v: &(Integer, Integer), w: &(Integer, Integer)| &v.0 * &w.0 + &ad * &v.1 * &w.1;
    let (mut v1, mut v2) = ((n.clone(), Integer::ZERO), (b, Integer::ONE));
    // Lagrange-Gauss reduction
    for _ in 0..10_000 {
        if size(&v1) > size(&v2) {
            std::mem::swap(&mut v1, &mut v2);
        }
        let s1 = size(&v1);
        if s1 == 0u32 {
            return None;
        }
        let (m, _) = dot(&v1, &v2).div_round(s1.clone(), RoundingMode::Nearest);
        if m == 0u32 {
            break;
        }
        v2 = (&v2.0 - &m * &v1.0, &v2.1 - &m * &v1.1);
    }
    let best = if size(&v1) <= size(&v2) { v1 } else { v2 };
    Some((best.0, best.1, n))
}

/// `a^-1 mod m` for `gcd(a, m) = 1`.
fn mod_inverse(a: &Integer, m: &Integer) -> Option<Integer> {
    let (mut r0, mut r1) = (m.clone(), if *a < 0 { a + m } else { a.clone() });
    let (mut t0, mut t1) = (Integer::ZERO, Integer::ONE);
    while r1 != 0u32 {
        let q = &r0 / &r1;
        (r0, r1) = (r1.clone(), &r0 - &q * &r1);
        (t0, t1) = (t1.clone(), &t0 - &q * &t1);
    }
    if r0 != 1u32 {
        return None;
    }
    Some(if t0 < 0 { t0 + m } else { t0 })
}

fn is_rational_square(r: &Rational) -> bool {
    *r > 0u32 && r.numerator_ref().checked_sqrt().is_some() && r.denominator_ref().checked_sqrt().is_some()
}

/// Whether `alpha + beta sqrt(D)` is a non-zero square in `Q(sqrt(D))`
/// (`D` not a rational square): for `beta != 0` exactly when its norm is a
/// square `n^2` and `(alpha + n)/2` or `(alpha - n)/2` is a non-zero square
/// (`(x + y sqrt D)^2` has `alpha +- n = 2x^2, 2 D y^2`); for `beta = 0`
/// when `alpha` or `alpha / D` is a square.
fn is_square_quadratic(alpha: &Rational, beta: &Rational, d: &Rational) -> bool {
    if *beta == 0u32 {
        return *alpha != 0u32 && (is_rational_square(alpha) || is_rational_square(&(alpha / d)));
    }
    let norm = alpha * alpha - d * beta * beta;
    if norm <= 0u32 {
        return false;
    }
    let (Some(rn), Some(rd)) = (norm.numerator_ref().checked_sqrt(), norm.denominator_ref().checked_sqrt()) else { return false };
    let n = Rational::from_naturals(rn, rd);
    let half = Rational::from_integers(Integer::ONE, Integer::from(2));
    is_rational_square(&((alpha + &n) * &half)) || is_rational_square(&((alpha - &n) * &half))
}

/// Whether the element `a` of `A` is a non-zero square.
pub(crate) fn is_square_in_algebra(ctx: &CoveringContext, a: &AlgElem) -> Result<bool, Error> {
    match &ctx.factors {
        Factors::Field(k) => {
            if a.iter().all(|x| *x == 0u32) {
                return Ok(false);
            }
            is_square_in_field(k, &k.from_power_basis(a)?)
        }
        Factors::Split { roots, quadratic } => {
            for e in roots {
                if !is_rational_square(&(&a[0] + &a[1] * e + &a[2] * e * e)) {
                    return Ok(false);
                }
            }
            let Some((u, w)) = quadratic else { return Ok(true) };
            // modulo q: (a0 - a2 w) + (a1 - a2 u) theta', theta' = (-u + sqrt D)/2
            let (r0, r1) = (&a[0] - &a[2] * w, &a[1] - &a[2] * u);
            let half = Rational::from_integers(Integer::ONE, Integer::from(2));
            let alpha = &r0 - &r1 * u * &half;
            let beta = &r1 * &half;
            let d = u * u - Rational::from(4) * w;
            Ok(is_square_quadratic(&alpha, &beta, &d))
        }
    }
}

/// The image of the point with abscissa `big_x` (`X = 4x`) in `A`: `X - theta`,
/// with the usual correction at a point of order 2 (the factor of `A`
/// where `X - theta` vanishes takes the norm of the other factors' part).
pub(crate) fn point_element(ctx: &CoveringContext, big_x: &Rational) -> AlgElem {
    let plain: AlgElem = [big_x.clone(), -Rational::ONE, Rational::ZERO];
    let Factors::Split { roots, quadratic } = &ctx.factors else { return plain };
    let Some(i) = roots.iter().position(|e| e == big_x) else { return plain };
    match quadratic {
        // (e - X) + q(X): q(e) at e, e - theta' modulo q
        Some((u, w)) => [big_x + w, u - Rational::ONE, Rational::ONE],
        None => {
            let mut values: [Rational; 3] = std::array::from_fn(|j| big_x - &roots[j]);
            values[i] = (0..3).filter(|&j| j != i).fold(Rational::ONE, |acc, j| acc * (big_x - &roots[j]));
            let r: [Rational; 3] = std::array::from_fn(|j| roots[j].clone());
            interpolate(&r, &values)
        }
    }
}

/// The ternary forms `q_c` (`c = 0, 1, 2`) with `delta z^2 = sum q_c(z) theta^c`,
/// as rational symmetric matrices.
fn ternary_forms(c: &[Integer; 3], delta: &AlgElem) -> [[[Rational; 3]; 3]; 3] {
    let mut power = delta.clone();
    let mut coords: Vec<AlgElem> = Vec::with_capacity(5);
    for _ in 0..5 {
        let next = mul_theta(c, &power);
        coords.push(power);
        power = next;
    }
    std::array::from_fn(|k| std::array::from_fn(|i| std::array::from_fn(|j| coords[i + j][k].clone())))
}

fn common_denominator<'a>(xs: impl Iterator<Item = &'a Rational>) -> Natural {
    xs.fold(Natural::ONE, |acc, x| acc.lcm(x.to_denominator()))
}

fn scaled(m: &[[Rational; 3]; 3]) -> Sym3 {
    let d = Rational::from(common_denominator(m.iter().flatten()));
    std::array::from_fn(|i| std::array::from_fn(|j| Integer::try_from(&m[i][j] * &d).unwrap_or(Integer::ZERO)))
}

/// Binary quadratic forms `[s^2, st, t^2]` times each other: a quartic.
fn times(p: &[Integer; 3], q: &[Integer; 3]) -> [Integer; 5] {
    let mut out: [Integer; 5] = Default::default();
    for i in 0..3 {
        for j in 0..3 {
            out[i + j] += &p[i] * &q[j];
        }
    }
    out
}

/// The integral binary quartic `G` (up to a square factor) of the
/// 2-covering of class `delta`, before minimisation.
pub(crate) fn covering_quartic(cubic: &[Integer; 3], delta: &AlgElem, limits: &FactorLimits) -> Result<Quartic, Error> {
    let forms = ternary_forms(cubic, delta);
    let m2 = scaled(&forms[2]);
    let m1 = scaled(&forms[1]);
    let p0 = conic_point(&m2, limits)?;
    // lines through p0: R(s, t) = s A + t B with A, B unit vectors
    let pivot = (0..3).find(|&i| p0[i] != 0).ok_or_else(|| Error::internal("the 2-covering", "the conic point is zero"))?;
    let others: Vec<usize> = (0..3).filter(|&i| i != pivot).collect();
    let unit = |i: usize| -> Vec3 { std::array::from_fn(|k| if k == i { Integer::ONE } else { Integer::ZERO }) };
    let (a, b) = (unit(others[0]), unit(others[1]));
    let (qa, qab, qb) = (bilinear(&m2, &a, &a), bilinear(&m2, &a, &b), bilinear(&m2, &b, &b));
    let (al, be) = (bilinear(&m2, &p0, &a), bilinear(&m2, &p0, &b));
    let two = Integer::from(2);
    // Q_c = q(R) p0_c - 2 (al s + be t)(A_c s + B_c t)
    let q: [[Integer; 3]; 3] = std::array::from_fn(|c| {
        [
            &qa * &p0[c] - &two * &al * &a[c],
            &two * &qab * &p0[c] - &two * (&al * &b[c] + &be * &a[c]),
            &qb * &p0[c] - &two * &be * &b[c],
        ]
    });
    let mut g: [Integer; 5] = Default::default();
    for i in 0..3 {
        for j in 0..3 {
            if m1[i][j] == 0 {
                continue;
            }
            for (o, t) in g.iter_mut().zip(times(&q[i], &q[j])) {
                *o -= &m1[i][j] * t;
            }
        }
    }
    // m1 was scaled by its denominator d: multiply once more by d (a square in all)
    let d = Integer::from(common_denominator(forms[1].iter().flatten()));
    let mut g = g.map(|c| c * &d);
    // divide out square factors of the content made of small primes
    let content = g.iter().fold(Natural::ZERO, |acc, c| acc.gcd(c.unsigned_abs_ref()));
    if content == 0u32 {
        return Err(Error::internal("the 2-covering", "the covering quartic is zero"));
    }
    for p in crate::arith::primes_up_to(1000) {
        let p2 = Integer::from(p * p);
        while g.iter().all(|c| (c % &p2) == 0) {
            for c in g.iter_mut() {
                *c /= &p2;
            }
        }
    }
    Ok(Quartic::new(g))
}


/// Whether `gamma` (a non-zero element whose norm is a rational square)
/// is a square in `K`: for `gamma` not rational, exactly when the resolvent
/// `(s^2 - a1)^2 - 8 n s - 4 a2` has a rational root (see `cubic.rs`).
pub(crate) fn is_square_in_field(k: &NumberField, gamma: &Element) -> Result<bool, Error> {
    let c = k.to_power_basis(gamma);
    let norm = k.norm(gamma);
    if norm <= 0u32 {
        return Ok(false);
    }
    let (Some(rn), Some(rd)) = (norm.numerator_ref().checked_sqrt(), norm.denominator_ref().checked_sqrt()) else { return Ok(false) };
    if c.iter().skip(1).all(|x| *x == 0) {
        // a rational r with r^3 a square: r is a square
        return Ok(c[0] > 0u32 && c[0].numerator_ref().checked_sqrt().is_some() && c[0].denominator_ref().checked_sqrt().is_some());
    }
    let n = Rational::from_naturals(rn, rd);
    let a1 = k.trace(gamma);
    let a2 = (&a1 * &a1 - k.trace(&k.mul(gamma, gamma))) / Rational::from(2);
    let r = [&a1 * &a1 - Rational::from(4) * &a2, Rational::from(-8) * n, Rational::from(-2) * &a1, Rational::ZERO, Rational::ONE];
    let d = Rational::from(common_denominator(r.iter()));
    let ints: Vec<Integer> = r.iter().map(|x| Integer::try_from(x * &d).unwrap_or(Integer::ZERO)).collect();
    Ok(!poly::rational_roots(&ints)?.is_empty())
}

/// The mask (over `ctx.selmer`) of the class of the point of `curve` with
/// abscissa `x`: the `m` with `(X - theta) delta_m` a square in `A`,
/// `X = 4x` (corrected at a point of order 2). `None` when no element of
/// the span fits.
pub(crate) fn class_mask(ctx: &CoveringContext, x: &Rational) -> Result<Option<u64>, Error> {
    let big_x = Rational::from(4) * x;
    let diff = point_element(ctx, &big_x);
    let n = ctx.selmer.len().min(20);
    for mask in 0u64..(1u64 << n) {
        let delta = element_of_mask(ctx, mask);
        if is_square_in_algebra(ctx, &alg_mul(&ctx.cubic, &diff, &delta))? {
            return Ok(Some(mask));
        }
    }
    Ok(None)
}

/// The masks of the classes of the torsion points of the model (zero for
/// points of odd order); an internal error if one is outside `Sel^2(E)`.
pub(crate) fn torsion_masks(ctx: &CoveringContext) -> Result<Vec<u64>, Error> {
    let mut out = Vec::new();
    for p in &ctx.torsion {
        let Point::Affine(x, _) = p else { continue };
        match class_mask(ctx, x)? {
            Some(m) => out.push(m),
            None => return Err(Error::internal("the 2-covering", "the class of a torsion point is not in Sel^2(E)")),
        }
    }
    Ok(out)
}

/// What the covering search did for one element of `Sel^2(E)`.
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct CoveringRun {
    /// The element, as a mask over the Selmer basis.
    pub mask: u64,
    /// The minimised and reduced quartic `g` of `y^2 = g(x, z)`, when built.
    pub quartic: Option<Quartic>,
    /// The point found on `E` (the curve's model), if any.
    pub point: Option<Point>,
    /// The height the search reached.
    pub height: u64,
    /// Why the quartic was not built or not searched, if so.
    pub note: Option<String>,
}

/// Searches the 2-coverings of the elements of `Sel^2(E)` not spanned by
/// the classes of the torsion points and `known` (masks of classes already
/// explained) for points on `curve`, raising the height over `rungs` (a
/// fixed list or a ladder driven by the budget, see [`Ladder`](crate::budget::Ladder)),
/// until the classes found span `goal` dimensions beyond the torsion
/// classes or `work` runs out. Returns one run per element tried; every
/// point returned is on `curve` and of the class of its element (an
/// internal error otherwise).
pub(crate) fn search_coverings(
    curve: &Curve,
    ctx: &CoveringContext,
    known: &[u64],
    goal: usize,
    mut rungs: Rungs<'_>,
    work: &Work,
) -> Result<Vec<CoveringRun>, Error> {
    let n = ctx.selmer.len().min(16);
    let limits = FactorLimits::within(work);
    let mut span = crate::descent::f2::F2Span::new();
    for m in torsion_masks(ctx)? {
        span.insert(m);
    }
    let goal = goal + span.dim();
    for &m in known {
        span.insert(m);
    }
    let mut runs: Vec<CoveringRun> = Vec::new();
    let mut quartics: Vec<(u64, Result<Quartic, Error>)> = Vec::new();
    while let Some(h) = rungs.height() {
        let rung = rungs.rung_work(work);
        rungs.start_rung();
        for mask in 1u64..(1u64 << n) {
            if span.dim() >= goal || work.exhausted() {
                return Ok(runs);
            }
            if rung.exhausted() {
                // the ladder's own share is spent: no further rung
                return Ok(runs);
            }
            if span.contains(mask) {
                continue;
            }
            // the reduced quartic, built once; an internal error stops the search
            let built = match quartics.iter().find(|(m, _)| *m == mask) {
                Some((_, q)) => q.clone(),
                None => {
                    let q = reduced_covering(curve, ctx, mask, &limits);
                    if let Err(e) = &q {
                        if *e.kind() == ErrorKind::Internal {
                            return Err(e.clone());
                        }
                    }
                    quartics.push((mask, q.clone()));
                    q
                }
            };
            let idx = match runs.iter().position(|r| r.mask == mask) {
                Some(i) => i,
                None => {
                    runs.push(CoveringRun { mask, quartic: built.clone().ok(), point: None, height: 0, note: built.clone().err().map(|e| e.to_string()) });
                    runs.len() - 1
                }
            };
            let Ok(g) = built else { continue };
            let out = search_quartic(&g.coeffs(), &SearchLimits::within(&rung, h).with_first_only(true));
            runs[idx].height = runs[idx].height.max(out.height_reached);
            for p in &out.points {
                let (xs, zs, ys) = (Rational::from(p.x.clone()), Rational::from(p.z.clone()), Rational::from(p.y.clone()));
                let Some((x, y)) = g.image_on_curve(curve, &xs, &zs, &ys)? else { continue };
                let point = Point::Affine(x, y);
                if !curve.contains(&point) {
                    return Err(Error::internal("the 2-covering", "a covering point maps off the curve"));
                }
                let point = in_class(curve, ctx, point, mask)?;
                span.insert(mask);
                runs[idx].point = Some(point);
                break;
            }
        }
        if !rungs.advance() {
            break;
        }
    }
    Ok(runs)
}

/// `p` or `p + T` for a rational point `T` of order 2, whichever has the
/// class `mask` (the covering map of the quartic's invariants may differ
/// from that of `X - theta = delta z^2` by such a translation); an
/// internal error when neither does.
fn in_class(curve: &Curve, ctx: &CoveringContext, p: Point, mask: u64) -> Result<Point, Error> {
    let class_of = |q: &Point| -> Result<Option<u64>, Error> {
        match q {
            Point::Affine(x, _) => class_mask(ctx, x),
            Point::Infinity => Ok(Some(0)),
        }
    };
    let class = class_of(&p)?;
    if class == Some(mask) {
        return Ok(p);
    }
    for t in &ctx.torsion {
        if curve.add(t, t) != Point::Infinity {
            continue;
        }
        let q = curve.add(&p, t);
        if class_of(&q)? == Some(mask) {
            return Ok(q);
        }
    }
    Err(Error::internal("the 2-covering", format!("a point of the covering of Selmer element {mask} has class {class:?}")))
}

/// The minimised and reduced 2-covering quartic of the element `mask`.
fn reduced_covering(curve: &Curve, ctx: &CoveringContext, mask: u64, limits: &FactorLimits) -> Result<Quartic, Error> {
    let delta = element_of_mask(ctx, mask);
    let g = covering_quartic(&ctx.cubic, &delta, limits)?;
    let m = minimise_covering(&g, curve, limits).map_err(|e| {
        if *e.kind() == ErrorKind::InvalidValue {
            Error::internal("the 2-covering", format!("the covering quartic is not a 2-covering of the curve: {e}"))
        } else {
            e
        }
    })?;
    Ok(reduce(&m.quartic).0)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The square test of `Q(sqrt D)` against squares built by hand:
    /// `(x + y sqrt D)^2` is a square, and `c (x + y sqrt D)^2` is not for
    /// `c` a non-square of `Q(sqrt D)` (a prime that does not divide `D`,
    /// and `-1` in a real field).
    #[test]
    fn squares_of_quadratic_fields() {
        for d in [-7i64, -1, 2, 5, 6, -15] {
            let dr = Rational::from(d);
            for (x, y) in [(1i64, 1i64), (3, -2), (0, 5), (7, 0), (-4, 9), (11, 13)] {
                let (x, y) = (Rational::from(x), Rational::from(y));
                let alpha = &x * &x + &dr * &y * &y;
                let beta = Rational::from(2) * &x * &y;
                assert!(is_square_quadratic(&alpha, &beta, &dr), "{d} {x} {y}");
                for c in [Rational::from(11), Rational::from(-1)] {
                    if c < 0u32 && d < 0 {
                        continue; // -1 is a norm from Q(sqrt D), maybe a square (D = -1)
                    }
                    assert!(!is_square_quadratic(&(&alpha * &c), &(&beta * &c), &dr), "{c} times a square, D = {d}");
                }
            }
        }
    }

    /// `small_representative` keeps the class: on the even-torsion shapes,
    /// the product of an element with its small representative is a square
    /// in `A` (`Q x K`: y^2 = x^3 + x^2 - 188x + 924 (X = 4x), one rational point of
    /// order 2; `Q^3`: y^2 = x^3 - 36x).
    #[test]
    fn small_representatives_keep_the_class() {
        use crate::torsion::TorsionGroup;
        use crate::{Curve, CurveData, Work};
        for c in [[0i64, 1, 0, -188, 924], [0, 0, 0, -36, 0], [0, -1, 0, -5232, -99828]] {
            let e = Curve::from_coefficients(c).unwrap();
            let work = Work::unlimited();
            let data = CurveData::new(&e, &work).unwrap();
            let t = TorsionGroup::compute(&e, data.bad_primes());
            let (_, ctx) = super::super::two_selmer_with_context(&e, &t, data.bad_primes(), &work).unwrap().unwrap();
            for mask in 1u64..(1u64 << ctx.selmer.len()) {
                let one: AlgElem = [Rational::ONE, Rational::ZERO, Rational::ZERO];
                let raw = ctx.selmer.iter().enumerate().filter(|(j, _)| mask >> j & 1 == 1).fold(one, |acc, (_, d)| alg_mul(&ctx.cubic, &acc, d));
                let small = element_of_mask(&ctx, mask);
                assert!(is_square_in_algebra(&ctx, &alg_mul(&ctx.cubic, &raw, &small)).unwrap(), "{c:?} mask {mask}");
            }
        }
    }
}
