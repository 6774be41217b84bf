//! From an element of `Sel^2(E)` over a cubic field to its 2-covering, and
//! the search for points on it (Cassels, Lectures on Elliptic Curves,
//! chapter 15; Cremona, Fisher and Stoll 2010 for minimisation and
//! reduction).
//!
//! For `delta` in `K = Q(theta)`, `f(theta) = 0`, a point of `E` has class
//! `delta` exactly when `X - theta = delta z^2` for some
//! `z = u + v theta + w theta^2`. Write `delta z^2 = q0 + q1 theta + q2 theta^2`
//! with ternary quadratic forms `q0, q1, q2` in `(u, v, w)`. Then
//! `q2(u, v, w) = 0` (a conic: it has a rational point by Hasse-Minkowski
//! as `delta` is everywhere locally soluble), `q1 = -1` and `X = q0`. The
//! conic's points are `lambda Q(s, t)` for a binary quadratic map `Q`
//! (the lines through one point), so `-q1(Q(s, t)) = (1 / lambda)^2`: the
//! binary quartic `G = -q1 o Q` gives the 2-covering `y^2 = G(s, t)` of
//! `E`. It is made integral (scaled by a square), minimised at the primes
//! of its invariants ([`crate::quartic::minimise_covering`]), reduced
//! ([`crate::quartic::reduce`]) and searched by the sieved quartic search;
//! each point found is mapped to `E` by the covering map of the quartic's
//! invariants ([`crate::quartic::Quartic::image_on_curve`]) and checked:
//! on the curve, and of class `delta` (`(X - theta) delta` a square in
//! `K`, else an internal error).

use super::conic::{bilinear, conic_point, Sym3, Vec3};
use crate::arith::FactorLimits;
use crate::budget::Work;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::numfield::{poly, Element, NumberField};
use crate::quartic::{minimise_covering, reduce, Quartic};
use crate::search::{search_quartic, SearchLimits};
use malachite::base::num::arithmetic::traits::{CheckedSqrt, Gcd, Lcm};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// The cubic field and the explicit `Sel^2(E)` basis the cubic route found,
/// kept for the coverings.
#[derive(Clone, Debug)]
pub(crate) struct CubicContext {
    /// `K = Q[X]/(f)`.
    pub(crate) k: NumberField,
    /// A basis of `Sel^2(E)` as elements of `K`.
    pub(crate) selmer: Vec<Element>,
}

/// The ternary forms `q_c` (`c = 0, 1, 2`) with `delta z^2 = sum q_c(z) theta^c`,
/// as rational symmetric matrices.
fn ternary_forms(k: &NumberField, delta: &Element) -> [[[Rational; 3]; 3]; 3] {
    let theta = k.generator();
    let mut power = delta.clone();
    let mut coords: Vec<Vec<Rational>> = Vec::with_capacity(5);
    for _ in 0..5 {
        coords.push(k.to_power_basis(&power));
        power = k.mul(&power, &theta);
    }
    std::array::from_fn(|c| std::array::from_fn(|i| std::array::from_fn(|j| coords[i + j].get(c).cloned().unwrap_or(Rational::ZERO))))
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
pub(crate) fn covering_quartic(k: &NumberField, delta: &Element, limits: &FactorLimits) -> Result<Quartic, Error> {
    let forms = ternary_forms(k, delta);
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

/// The mask (over `ctx.selmer`) of the class of the point `(x, y)` of
/// `curve` (no rational 2-torsion): the `m` with `(X - theta) delta_m` a
/// square, `X = 4x`. `None` when no element of the span fits.
pub(crate) fn class_mask(ctx: &CubicContext, x: &Rational) -> Result<Option<u64>, Error> {
    let k = &ctx.k;
    let big_x = Rational::from(4) * x;
    let diff = k.sub(&k.rational(&big_x), &k.generator());
    let n = ctx.selmer.len().min(20);
    for mask in 0u64..(1u64 << n) {
        let delta = (0..n).filter(|j| mask >> j & 1 == 1).fold(k.one(), |acc, j| k.mul(&acc, &ctx.selmer[j]));
        if is_square_in_field(k, &k.mul(&diff, &delta))? {
            return Ok(Some(mask));
        }
    }
    Ok(None)
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
/// `known` (masks of classes already explained) for points on `curve`,
/// raising the height over `heights`, until the classes found span `goal`
/// dimensions or `work` runs out. Returns one run per element tried.
pub(crate) fn search_coverings(
    curve: &Curve,
    ctx: &CubicContext,
    known: &[u64],
    goal: usize,
    heights: &[u64],
    work: &Work,
) -> Result<Vec<CoveringRun>, Error> {
    let n = ctx.selmer.len().min(16);
    let limits = FactorLimits::within(work);
    let mut span = crate::descent::f2::F2Span::new();
    for &m in known {
        span.insert(m);
    }
    let mut runs: Vec<CoveringRun> = Vec::new();
    let mut quartics: Vec<(u64, Result<Quartic, Error>)> = Vec::new();
    for &h in heights {
        for mask in 1u64..(1u64 << n) {
            if span.dim() >= goal || work.exhausted() {
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
            let out = search_quartic(&g.coeffs(), &SearchLimits::within(work, h).with_first_only(true));
            runs[idx].height = runs[idx].height.max(out.height_reached);
            for p in &out.points {
                let (xs, zs, ys) = (Rational::from(p.x.clone()), Rational::from(p.z.clone()), Rational::from(p.y.clone()));
                let Some((x, y)) = g.image_on_curve(curve, &xs, &zs, &ys)? else { continue };
                let point = Point::Affine(x.clone(), y);
                if !curve.contains(&point) {
                    return Err(Error::internal("the 2-covering", "a covering point maps off the curve"));
                }
                let class = class_mask(ctx, &x)?;
                if class != Some(mask) {
                    return Err(Error::internal(
                        "the 2-covering",
                        format!("a point of the covering of Selmer element {mask} has class {class:?}"),
                    ));
                }
                span.insert(mask);
                runs[idx].point = Some(point);
                break;
            }
        }
    }
    Ok(runs)
}

/// The minimised and reduced 2-covering quartic of the element `mask`.
fn reduced_covering(curve: &Curve, ctx: &CubicContext, mask: u64, limits: &FactorLimits) -> Result<Quartic, Error> {
    let k = &ctx.k;
    let delta = (0..ctx.selmer.len()).filter(|j| mask >> j & 1 == 1).fold(k.one(), |acc, j| k.mul(&acc, &ctx.selmer[j]));
    let g = covering_quartic(k, &delta, limits)?;
    let m = minimise_covering(&g, curve, limits).map_err(|e| {
        if *e.kind() == ErrorKind::InvalidValue {
            Error::internal("the 2-covering", format!("the covering quartic is not a 2-covering of the curve: {e}"))
        } else {
            e
        }
    })?;
    Ok(reduce(&m.quartic).0)
}
