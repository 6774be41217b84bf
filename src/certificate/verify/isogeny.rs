//! The 2-isogeny record: for each run, the kernel point, the two side
//! models, their local tables and Selmer bases, and the images of points.

use super::{place_name, q, reject, CertificateError, Ctx};
use super::curve::CheckedCurve;
use crate::certificate::check::{f2_rank, local_coords, split, square_class_vector, Model};
use crate::certificate::{IsogenyProof, SideProof};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{Mod, UnsignedAbs};
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural, Rational};

/// The side model's point moved to the minimal model.
fn side_to_minimal(min: &Model, b2: &Integer, x0: &Integer, u: &Integer, x: &Rational, y: &Rational) -> (Rational, Rational) {
    let [a1, _, a3, _, _] = &min.a;
    let uq = q(u);
    let big_x = &uq * &uq * x + q(x0);
    let big_y = &uq * &uq * &uq * y;
    let ex = (big_x - q(&(Integer::from(3) * b2))) / Rational::from(36);
    let ey = (big_y / Rational::from(108) - a1 * &ex - a3) / Rational::from(2);
    (ex, ey)
}

pub(super) fn verify_run(ctx: &mut Ctx, cc: &CheckedCurve, primes: &[Natural], run: &IsogenyProof, k: usize) -> Result<(usize, Option<usize>), CertificateError> {
    let (min, c4, c6, b2) = (&cc.min, &cc.c4, &cc.c6, &cc.b2);
    let what = format!("2-isogeny run {k}");
    let (xt, yt) = &run.kernel;
    let [a1, _, a3, _, _] = &min.a;
    if !min.contains(xt, yt) || Rational::from(2) * yt + a1 * xt + a3 != 0u32 {
        return reject(format!("{what}: the kernel point is not a point of order 2"));
    }
    let x0 = &run.x0;
    if Rational::from(36) * xt + q(&(Integer::from(3) * b2)) != q(x0) {
        return reject(format!("{what}: x0 does not belong to the kernel point"));
    }
    if x0 * x0 * x0 - Integer::from(27) * c4 * x0 - Integer::from(54) * c6 != 0u32 || run.u == 0u32 {
        return reject(format!("{what}: x0 is not a root of X^3 - 27 c4 X - 54 c6"));
    }
    let [se, sp] = &run.sides;
    let u2 = &run.u * &run.u;
    if &se.a * &u2 != Integer::from(3) * x0 || &se.b * &u2 * &u2 != Integer::from(3) * x0 * x0 - Integer::from(27) * c4 {
        return reject(format!("{what}: the side model does not come from the minimal model"));
    }
    if sp.a != Integer::from(-2) * &se.a || sp.b != &se.a * &se.a - Integer::from(4) * &se.b {
        return reject(format!("{what}: the isogenous side is not y^2 = x(x^2 - 2a x + a^2 - 4b)"));
    }
    if se.b == 0u32 || sp.b == 0u32 {
        return reject(format!("{what}: a side model is singular"));
    }
    let bb = &se.b * &sp.b;
    let mut dims = [0usize; 2];
    let mut sels: [Option<usize>; 2] = [None, None];
    for (side_k, side) in run.sides.iter().enumerate() {
        let what = format!("{what}, side {}", if side_k == 0 { "E" } else { "E'" });
        let (dim, sel) = verify_side(ctx, side, &bb, primes, &what)?;
        dims[side_k] = dim;
        sels[side_k] = sel;
        // the recorded points, moved to the minimal model
        for img in &side.images {
            let on_e = if side_k == 0 {
                (img.x.clone(), img.y.clone())
            } else {
                if img.x == 0u32 {
                    continue;
                }
                let x2 = &img.x * &img.x;
                (
                    &img.y * &img.y / (Rational::from(4) * &x2),
                    &img.y * (q(&sp.b) - &x2) / (Rational::from(8) * &x2),
                )
            };
            let side_model = Model::new(&[Integer::ZERO, se.a.clone(), Integer::ZERO, se.b.clone(), Integer::ZERO]);
            if !side_model.contains(&on_e.0, &on_e.1) {
                return reject(format!("{what}: the image of ({}, {}) under the dual isogeny is off E", img.x, img.y));
            }
            let (ex, ey) = side_to_minimal(min, b2, x0, &run.u, &on_e.0, &on_e.1);
            if !min.contains(&ex, &ey) {
                return reject(format!("{what}: ({}, {}) does not map onto the minimal model", img.x, img.y));
            }
        }
    }
    let lower = (dims[0] + dims[1]).saturating_sub(2);
    if run.lower > lower {
        return reject(format!("{what}: the claimed lower bound {} exceeds the recomputed {lower}", run.lower));
    }
    let upper = match sels {
        [Some(s), Some(t)] => Some((s + t).checked_sub(2).ok_or_else(|| CertificateError::Rejected(format!("{what}: Selmer groups too small")))?),
        _ => None,
    };
    if upper != run.upper {
        return reject(format!("{what}: the claimed upper bound {:?} differs from the recomputed {upper:?}", run.upper));
    }
    Ok((lower, upper))
}

/// Checks one side; returns (dim of the span of the known images, Selmer dimension if complete).
fn verify_side(
    ctx: &mut Ctx,
    side: &SideProof,
    bb: &Integer,
    primes: &[Natural],
    what: &str,
) -> Result<(usize, Option<usize>), CertificateError> {
    let (a, b) = (&side.a, &side.b);
    let model = Model::new(&[Integer::ZERO, a.clone(), Integer::ZERO, b.clone(), Integer::ZERO]);
    // the places and the primes of b
    let place_primes: Vec<Natural> =
        side.local.iter().filter_map(|t| if let Place::Prime(p) = &t.place { Some(p.clone()) } else { None }).collect();
    // the primes of b are among those of 6 Δ (disc of the side model = 16 b^2 (a^2 - 4b))
    let mut side_primes: Vec<Integer> = Vec::new();
    for p in place_primes.iter().chain(primes).cloned().chain([Natural::from(2u32), Natural::from(3u32)]) {
        let p = Integer::from(p);
        if p > 1u32 && b.mod_op(&p) == 0u32 && !side_primes.contains(&p) {
            side_primes.push(p);
        }
    }
    side_primes.sort();
    if side_primes.len() > 62 {
        return reject(format!("{what}: too many primes"));
    }
    // images of torsion, T and the recorded points
    let mut span: Vec<u64> = Vec::new();
    let vec_of = |r: &Rational| square_class_vector(r, &side_primes);
    let alpha = |x: &Rational| if *x == 0u32 { q(b) } else { x.clone() };
    span.push(vec_of(&q(b)).ok_or_else(|| CertificateError::Rejected(format!("{what}: b has primes outside the places")))?);
    for (x, y) in &side.torsion {
        if !model.contains(x, y) || model.small_order(&(x.clone(), y.clone()), 16).is_none() {
            return reject(format!("{what}: ({x}, {y}) is not a torsion point of the side model"));
        }
        ctx.points += 1;
        span.push(vec_of(&alpha(x)).ok_or_else(|| CertificateError::Rejected(format!("{what}: torsion image outside the divisors of b")))?);
    }
    for img in &side.images {
        if !model.contains(&img.x, &img.y) {
            return reject(format!("{what}: the point ({}, {}) is not on the side model", img.x, img.y));
        }
        ctx.points += 1;
        let v = vec_of(&alpha(&img.x)).ok_or_else(|| CertificateError::Rejected(format!("{what}: image outside the divisors of b")))?;
        if Some(v) != vec_of(&q(&img.class)) {
            return reject(format!("{what}: the image of ({}, {}) is not the class {}", img.x, img.y, img.class));
        }
        span.push(v);
        ctx.explained += 1;
    }
    let dim = f2_rank(&span);
    let Some(claimed) = side.selmer_dim else { return Ok((dim, None)) };
    // the places must be R, 2 and every prime of b b'
    if !side.local.iter().any(|t| t.place == Place::Real) || !place_primes.contains(&Natural::from(2u32)) {
        return reject(format!("{what}: the local tables miss R or 2"));
    }
    let mut rest = bb.clone();
    for p in &place_primes {
        ctx.check_prime(p)?;
        rest = split(&rest, &Integer::from(p.clone())).1;
    }
    if (&rest).unsigned_abs() != 1u32 {
        return reject(format!("{what}: a prime of b b' has no local table"));
    }
    // the basis -1, primes of b, and the Selmer conditions
    let n = side_primes.len() + 1;
    let basis: Vec<Integer> = std::iter::once(Integer::from(-1)).chain(side_primes.iter().cloned()).collect();
    let mut conditions: Vec<u64> = Vec::new();
    for table in &side.local {
        let bits = match &table.place {
            Place::Real => 1,
            Place::Prime(p) if *p == 2u32 => 3,
            _ => 2,
        };
        let mut seen: Vec<u8> = Vec::new();
        let mut soluble: Vec<u8> = Vec::new();
        for (c, w) in &table.soluble {
            if *c == 0u32 {
                return reject(format!("{what}: zero class"));
            }
            let g = [c * c * c, Integer::ZERO, a * c * c, Integer::ZERO, b * c];
            ctx.check_local(&g, w, &table.place, &format!("{what}, class {c}"))?;
            soluble.push(local_coords(c, &table.place));
            seen.push(local_coords(c, &table.place));
        }
        for c in &table.insoluble {
            if *c == 0u32 {
                return reject(format!("{what}: zero class"));
            }
            let g = [c * c * c, Integer::ZERO, a * c * c, Integer::ZERO, b * c];
            ctx.check_insoluble(&g, &table.place, &format!("{what}, class {c}"))?;
            seen.push(local_coords(c, &table.place));
        }
        let mut sorted = seen.clone();
        sorted.sort_unstable();
        sorted.dedup();
        if sorted.len() != seen.len() || seen.len() != 1 << bits {
            return reject(format!("{what}: the table at {} does not list each square class once", place_name(&table.place)));
        }
        for &x in &soluble {
            for &y in &soluble {
                if !soluble.contains(&(x ^ y)) {
                    return reject(format!("{what}: the local image at {} is not a group", place_name(&table.place)));
                }
            }
        }
        let coords: Vec<u8> = basis.iter().map(|d| local_coords(d, &table.place)).collect();
        for f in 1u8..(1 << bits) {
            if soluble.iter().all(|&s| (f & s).count_ones() % 2 == 0) {
                let row = coords.iter().enumerate().fold(0u64, |acc, (i, &cc)| acc | (((f & cc).count_ones() % 2) as u64) << i);
                conditions.push(row);
            }
        }
    }
    let sel_dim = n - f2_rank(&conditions);
    if sel_dim != claimed {
        return reject(format!("{what}: the Selmer group has dimension {sel_dim}, not the claimed {claimed}"));
    }
    // the recorded basis: in the Selmer group, independent, complete
    let mut vs = Vec::new();
    for class in &side.classes {
        let Some(d) = &class.label else { return reject(format!("{what}: a class without its integer")) };
        let v = square_class_vector(&q(d), &side_primes).ok_or_else(|| CertificateError::Rejected(format!("{what}: class {d} is not a divisor of b")))?;
        // bit 0 of the vector is the sign, then the primes: the same order as `basis`
        if conditions.iter().any(|row| (row & v).count_ones() % 2 == 1) {
            return reject(format!("{what}: class {d} fails a local condition"));
        }
        if *d == 0u32 || b.mod_op(d) != 0u32 {
            return reject(format!("{what}: class {d} does not divide b"));
        }
        let g = [d.clone(), Integer::ZERO, a.clone(), Integer::ZERO, b / d];
        if class.quartic != g {
            return reject(format!("{what}: the covering of class {d} is not d M^4 + a M^2 e^2 + (b/d) e^4"));
        }
        for table in &side.local {
            let Some(w) = class.local_points.iter().find(|w| w.place == table.place) else {
                return reject(format!("{what}: class {d} has no local point at {}", place_name(&table.place)));
            };
            ctx.check_local(&g, w, &table.place, &format!("{what}, covering of {d}"))?;
        }
        vs.push(v);
    }
    if vs.len() != sel_dim || f2_rank(&vs) != sel_dim {
        return reject(format!("{what}: the recorded classes are not a basis of the Selmer group (dimension {sel_dim})"));
    }
    if dim > sel_dim {
        return reject(format!("{what}: the images of points exceed the Selmer group"));
    }
    Ok((dim, Some(sel_dim)))
}