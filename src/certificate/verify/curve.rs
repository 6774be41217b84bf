//! The curve record: the two models and the change between them, the bad
//! primes, the torsion points with dim `E(Q)[2]`, and the independence of
//! the points of infinite order.

use super::{as_integer, reject, CertificateError, Ctx, CHARACTER_PRIMES};
use crate::certificate::check::{
    cubic_mod, cubic_rootless_somewhere, eval_cubic, f2_rank, is_rational_square, legendre_u64, rational_mod, small_primes, split,
    Model,
};
use crate::certificate::Certificate;
use malachite::base::num::arithmetic::traits::{Mod, UnsignedAbs};
use malachite::{Integer, Rational};

/// What the checks of the other records need from the curve record.
pub(super) struct CheckedCurve {
    /// The minimal model.
    pub(super) min: Model,
    pub(super) c4: Integer,
    pub(super) c6: Integer,
    /// The minimal discriminant.
    pub(super) disc: Integer,
    pub(super) b2: Integer,
    /// The primes where minimality rests on Tate's algorithm (trusted).
    pub(super) minimality_trust: Vec<String>,
}

/// Checks the models, the model change and the listed primes.
pub(super) fn check_curve(ctx: &mut Ctx, c: &Certificate) -> Result<CheckedCurve, CertificateError> {
    let inp = Model::new(&c.input);
    let min = Model::new(&c.minimal);
    if inp.c4_c6_disc().2 == 0u32 {
        return reject("the input model is singular");
    }
    let (c4r, c6r, discr) = min.c4_c6_disc();
    if discr == 0u32 {
        return reject("the minimal model is singular");
    }
    if c.change[0] == 0u32 {
        return reject("the model change has u = 0");
    }
    if apply_change(&inp.a, &c.change) != min.a {
        return reject("the model change does not map the input model onto the minimal model");
    }
    let c4 = as_integer(&c4r, "c4")?;
    let c6 = as_integer(&c6r, "c6")?;
    let disc = as_integer(&discr, "the discriminant")?;
    let b2 = as_integer(&min.b_invariants()[0], "b2")?;
    let mut rest = disc.clone();
    // minimality matters only to the quartic route (its completeness theorem)
    let mut minimality_trust: Vec<String> = Vec::new();
    for (k, p) in c.primes.iter().enumerate() {
        if c.primes[..k].contains(p) {
            return reject(format!("the prime {p} is listed twice"));
        }
        ctx.check_prime(p)?;
        let pi = Integer::from(p.clone());
        let (v, u) = split(&rest, &pi);
        if v == 0 {
            return reject(format!("{p} does not divide the minimal discriminant"));
        }
        rest = u;
        let minimal_here = v < 12 || split(&c4, &pi).0 < 4 || split(&c6, &pi).0 < 6;
        if !minimal_here {
            minimality_trust.push(format!("the model is minimal at {p} (Tate's algorithm; needed by the quartic route)"));
        }
    }
    if (&rest).unsigned_abs() != 1u32 {
        return reject(format!("the listed primes leave the cofactor {rest} of the discriminant"));
    }
    Ok(CheckedCurve { min, c4, c6, disc, b2, minimality_trust })
}

/// Checks the torsion points and returns dim `E(Q)[2]`.
pub(super) fn two_torsion_dim(ctx: &mut Ctx, c: &Certificate, cc: &CheckedCurve) -> Result<usize, CertificateError> {
    let (min, b2, disc) = (&cc.min, &cc.b2, &cc.disc);
    let [a1, _, a3, _, _] = &min.a;
    let mut two_torsion = Vec::new();
    for (x, y) in &c.torsion {
        if !min.contains(x, y) {
            return reject(format!("the torsion point ({x}, {y}) is not on the minimal model"));
        }
        if min.small_order(&(x.clone(), y.clone()), 16).is_none() {
            return reject(format!("the point ({x}, {y}) is not a torsion point"));
        }
        ctx.points += 1;
        if Rational::from(2) * y + a1 * x + a3 == 0u32 {
            two_torsion.push(x.clone());
        }
    }
    let [b2q, b4q, b6q, _] = min.b_invariants();
    Ok(match two_torsion.len() {
        3 => 2,
        1 => {
            let e1 = &two_torsion[0];
            let lin = &b2q + Rational::from(4) * e1;
            let cst = Rational::from(2) * &b4q + &b2q * e1 + Rational::from(4) * e1 * e1;
            if is_rational_square(&(&lin * &lin - Rational::from(16) * cst)) {
                return reject("E(Q)[2] has points missing from the torsion list");
            }
            1
        }
        0 => {
            let b = [b2.clone(), as_integer(&b4q, "b4")?, as_integer(&b6q, "b6")?];
            if !cubic_rootless_somewhere(&b, disc) {
                ctx.trust("E(Q)[2] is trivial (no prime with an irreducible 2-division cubic found)".to_string());
            }
            0
        }
        _ => return reject("the torsion list has an impossible number of points of order 2"),
    })
}

/// Checks the points of infinite order and returns the rank they prove
/// (independence modulo torsion by quadratic characters).
pub(super) fn points_lower_bound(ctx: &mut Ctx, c: &Certificate, cc: &CheckedCurve, t: usize) -> Result<usize, CertificateError> {
    let (min, disc) = (&cc.min, &cc.disc);
    let mut rows: Vec<(Rational, Rational)> = Vec::new();
    for p in &c.points {
        if !min.contains(&p.x, &p.y) {
            return reject(format!("the point ({}, {}) is not on the minimal model", p.x, p.y));
        }
        ctx.points += 1;
        rows.push((p.x.clone(), p.y.clone()));
    }
    rows.extend(c.torsion.iter().cloned());
    if rows.len() > 64 {
        return reject("too many points for the independence test");
    }
    let char_rank = character_rank(&rows, &c.minimal, disc);
    let lower = char_rank.saturating_sub(t).min(c.points.len());
    Ok(lower)
}

/// The model `E'` obtained from `a` by `[u, r, s, t]` (Silverman, AEC, Table 3.1).
fn apply_change(a: &[Rational; 5], c: &[Rational; 4]) -> [Rational; 5] {
    let [a1, a2, a3, a4, a6] = a;
    let [u, r, s, t] = c;
    let two = Rational::from(2);
    let three = Rational::from(3);
    let u2 = u * u;
    let u3 = &u2 * u;
    let u4 = &u2 * &u2;
    let u6 = &u3 * &u3;
    [
        (a1 + &two * s) / u,
        (a2 - s * a1 + &three * r - s * s) / u2,
        (a3 + r * a1 + &two * t) / u3,
        (a4 - s * a3 + &two * r * a2 - (t + r * s) * a1 + &three * r * r - &two * s * t) / u4,
        (a6 + r * a4 + r * r * a2 + r * r * r - t * a3 - t * t - r * t * a1) / u6,
    ]
}

/// The F2 rank of the images of `rows` under the quadratic characters
/// at good odd primes.
fn character_rank(rows: &[(Rational, Rational)], coefficients: &[Integer; 5], disc: &Integer) -> usize {
    if rows.is_empty() {
        return 0;
    }
    let m = Model::new(coefficients);
    let [b2, b4, b6, _] = m.b_invariants();
    // invariant: b2, b4, b6 are integer polynomials in integral coefficients
    let b = [b2, b4, b6].map(|x| Integer::try_from(x).expect("integral model"));
    let mut columns: Vec<u64> = Vec::new();
    let mut used = 0;
    for q in small_primes(u64::MAX) {
        if used >= CHARACTER_PRIMES || f2_rank(&columns) == rows.len() {
            break;
        }
        if disc.mod_op(Integer::from(q)) == 0u32 {
            continue;
        }
        used += 1;
        let f = cubic_mod(&b, q);
        // f'(x) = 12 x^2 + 2 b2 x + 2 b4
        let fp = |x: u64| -> u64 {
            let qq = q as u128;
            let x = x as u128;
            ((12 * x % qq * x + 2 * f[1] as u128 * x + f[2] as u128) % qq) as u64
        };
        let roots: Vec<u64> = if q < 5000 { (0..q).filter(|&x| eval_cubic(&f, x, q) == 0).collect() } else { vec![] };
        for r in roots {
            let mut col = 0u64;
            for (i, (x, _)) in rows.iter().enumerate() {
                let Some(xm) = rational_mod(x, q) else {
                    continue; // reduces to the point at infinity
                };
                let val = if xm == r { legendre_u64(fp(r), q) } else { legendre_u64((xm + q - r) % q, q) };
                if val == -1 {
                    col |= 1 << i;
                }
            }
            columns.push(col);
        }
    }
    f2_rank(&columns)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn model_change_formula_matches_the_curve_module() {
        let e = crate::Curve::from_coefficients([1, -1, 1, -7, 3]).unwrap();
        let ch = crate::ModelChange::new(Rational::from(2), Rational::from(3), Rational::from(-1), Rational::from(5)).unwrap();
        let f = e.apply_change(&ch).map(|c| c.coefficients().clone().map(Rational::from));
        let ours = apply_change(&e.coefficients().clone().map(Rational::from), &[ch.u, ch.r, ch.s, ch.t]);
        match f {
            Ok(theirs) => assert_eq!(ours, theirs),
            Err(_) => assert!(ours.iter().any(|a| a.to_numerator_and_denominator().1 != 1u32)),
        }
    }
}

