//! The full 2-descent record: the quartic classes with their local points
//! and lifts, the quartics ruled out, and the Selmer dimension.

use super::{as_integer, place_name, q, reject, CertificateError, Ctx};
use super::curve::CheckedCurve;
use crate::certificate::check::{eval4, invariants4, Model};
use crate::certificate::QuarticProof;
use crate::solubility::Place;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// `(g4, g6)` at `(x, z)`: the Hessian-type quartic covariant
/// `(3b^2 - 8ac) x^4 + 4(bc - 6ad) x^3 z + 2(2c^2 - 24ae - 3bd) x^2 z^2 + 4(cd - 6be) x z^3 + (3d^2 - 8ce) z^4`
/// and the sextic covariant, with the syzygy `27 g6^2 = g4^3 - 48 I g^2 g4 - 64 J g^3`.
fn covariants_at(g: &[Integer; 5], x: &Integer, z: &Integer) -> (Integer, Integer) {
    let [a, b, c, d, e] = g;
    let i = |v: i64| Integer::from(v);
    let g4 = [
        i(3) * b * b - i(8) * a * c,
        i(4) * (b * c - i(6) * a * d),
        i(2) * (i(2) * c * c - i(24) * a * e - i(3) * b * d),
        i(4) * (c * d - i(6) * b * e),
        i(3) * d * d - i(8) * c * e,
    ];
    let g6 = [
        b * b * b + i(8) * a * a * d - i(4) * a * b * c,
        i(2) * (i(16) * a * a * e + i(2) * a * b * d - i(4) * a * c * c + b * b * c),
        i(5) * (i(8) * a * b * e + b * b * d - i(4) * a * c * d),
        i(20) * (b * b * e - a * d * d),
        -(i(5) * (i(8) * a * d * e + b * d * d - i(4) * b * c * e)),
        -(i(2) * (i(16) * a * e * e + i(2) * b * d * e - i(4) * c * c * e + c * d * d)),
        -(d * d * d + i(8) * b * e * e - i(4) * c * d * e),
    ];
    let ev = |cs: &[Integer]| -> Integer {
        let n = cs.len() - 1;
        let mut acc = Integer::ZERO;
        let mut xp = vec![Integer::ONE];
        let mut zp = vec![Integer::ONE];
        for k in 1..=n {
            xp.push(&xp[k - 1] * x);
            zp.push(&zp[k - 1] * z);
        }
        for (k, cc) in cs.iter().enumerate() {
            acc += cc * &xp[n - k] * &zp[k];
        }
        acc
    };
    (ev(&g4), ev(&g6))
}

pub(super) fn verify_quartic(ctx: &mut Ctx, cc: &CheckedCurve, primes: &[Natural], t: usize, qp: &QuarticProof) -> Result<Option<(usize, String)>, CertificateError> {
    let (min, c4, c6, b2) = (&cc.min, &cc.c4, &cc.c6, &cc.b2);
    let what = "quartic route";
    if qp.two_torsion_dim != t {
        return reject(format!("{what}: dim `E(Q)[2]` is {t}, not {}", qp.two_torsion_dim));
    }
    // the curve the quartics cover: the minimal model, or an odd-degree
    // isogenous curve (its discriminant must use only the listed primes,
    // as isogenous curves have the same bad primes)
    let other: Option<(Model, u64)> = match &qp.descent_curve {
        None => None,
        Some((a, d)) => {
            if *d % 2 == 0 || *d < 3 {
                return reject(format!("{what}: the descent curve's isogeny degree {d} is not odd"));
            }
            let m = Model::new(a);
            let (_, _, disc) = m.c4_c6_disc();
            if disc == 0u32 {
                return reject(format!("{what}: the descent curve is singular"));
            }
            let mut rest = as_integer(&disc, "the descent curve's discriminant")?;
            for p in primes {
                let pz = Integer::from(p.clone());
                while (&rest % &pz) == 0u32 {
                    rest /= &pz;
                }
            }
            if rest != 1u32 && rest != -1i32 {
                return reject(format!("{what}: the descent curve has a bad prime that the curve does not have"));
            }
            Some((m, *d))
        }
    };
    let (other_c4, other_c6, other_b2);
    let (min, c4, c6, b2) = match &other {
        None => (min, c4, c6, b2),
        Some((m, _)) => {
            let (k4, k6, _) = m.c4_c6_disc();
            other_c4 = as_integer(&k4, "c4")?;
            other_c6 = as_integer(&k6, "c6")?;
            other_b2 = as_integer(&m.b_invariants()[0], "b2")?;
            (m, &other_c4, &other_c6, &other_b2)
        }
    };
    let j = Integer::from(2) * c6;
    let mut places = vec![Place::Real, Place::Prime(Natural::from(2u32)), Place::Prime(Natural::from(3u32))];
    for p in primes {
        let pl = Place::Prime(p.clone());
        if !places.contains(&pl) {
            places.push(pl);
        }
    }
    let [a1, _, a3, _, _] = &min.a;
    for (n, class) in qp.classes.iter().enumerate() {
        let g = &class.quartic;
        if invariants4(g) != (c4.clone(), j.clone()) {
            return reject(format!("{what}: class {n} does not have invariants (c4, 2 c6)"));
        }
        for pl in &places {
            let Some(w) = class.local_points.iter().find(|w| w.place == *pl) else {
                return reject(format!("{what}: class {n} has no local point at {}", place_name(pl)));
            };
            ctx.check_local(g, w, pl, &format!("{what}, class {n}"))?;
        }
        if let Some(l) = &class.lift {
            if l.y == 0u32 || eval4(g, &l.x, &l.z) != &l.y * &l.y {
                return reject(format!("{what}: the rational point on class {n} is not on its covering"));
            }
            let (g4, g6) = covariants_at(g, &l.x, &l.z);
            let y2 = q(&l.y) * q(&l.y);
            let big_x = Rational::from(3) * q(&g4) / (Rational::from(4) * &y2);
            let big_y = Rational::from(27) * q(&g6) / (Rational::from(8) * &y2 * q(&l.y));
            let (px, py) = &l.image;
            if !min.contains(px, py) {
                return reject(format!("{what}: the image point of class {n} is not on the minimal model"));
            }
            let ex = Rational::from(36) * px + q(&(Integer::from(3) * b2));
            let ey = Rational::from(108) * (Rational::from(2) * py + a1 * px + a3);
            if big_x != ex || (big_y != ey && big_y != -ey) {
                return reject(format!("{what}: the covering map does not send the point on class {n} to the recorded point"));
            }
            ctx.points += 1;
            ctx.explained += 1;
        }
    }
    for (g, pl) in &qp.ruled_out {
        if invariants4(g) != (c4.clone(), j.clone()) {
            return reject(format!("{what}: a ruled-out quartic does not have invariants (c4, 2 c6)"));
        }
        if !places.contains(pl) {
            return reject(format!("{what}: a quartic is ruled out at an unexpected place"));
        }
        ctx.check_insoluble(g, pl, &format!("{what}, ruled out"))?;
    }
    let Some(s) = qp.selmer_dim else {
        if qp.upper.is_some() {
            return reject(format!("{what}: an upper bound without a Selmer dimension"));
        }
        return Ok(None);
    };
    if s >= usize::BITS as usize || qp.classes.len() != 1usize << s {
        return reject(format!("{what}: {} classes listed for a Selmer group of dimension {s}", qp.classes.len()));
    }
    if s < t {
        return reject(format!("{what}: the Selmer group is smaller than E(Q)[2]"));
    }
    if qp.upper != Some(s - t) {
        return reject(format!("{what}: the claimed upper bound {:?} is not dim Sel^2 - dim `E(Q)[2]` = {}", qp.upper, s - t));
    }
    let accounted = qp.classes.len() + qp.ruled_out.len();
    if qp.enumerated < accounted {
        return reject(format!("{what}: more quartics recorded than enumerated"));
    }
    let mut enumeration = format!(
        "{what}: the enumeration of GL2(Z)-classes of quartics with invariants (c4, 2c6) is complete ({} classes), and the {} everywhere locally soluble ones not listed are equivalent to listed classes",
        qp.enumerated,
        qp.enumerated - accounted
    );
    if let Some((m, d)) = &other {
        enumeration.push_str(&format!(
            "; the quartics cover the curve {:?}, which is isogenous to the minimal model by an isogeny of odd degree {d} (so Sel^2 and E(Q)[2] agree; the isogeny is not re-checked here)",
            m.a
        ));
    }
    Ok(Some((s - t, enumeration)))
}
#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn syzygy_of_the_covariants() {
        // 27 g6^2 = g4^3 - 48 I g^2 g4 - 64 J g^3 (Cremona, Classical invariants and
        // 2-descent, J. Symbolic Comput. 31 (2001), from memory), checked at sample points
        for coeffs in [[1i64, 0, -5, 0, 4], [2, 1, -3, 5, 1], [-3, 7, 2, -1, 6], [1, 2, 3, 4, 5]] {
            let g = coeffs.map(Integer::from);
            let (i, j) = invariants4(&g);
            for (x, z) in [(1i64, 0i64), (0, 1), (2, 3), (-5, 7)] {
                let (x, z) = (Integer::from(x), Integer::from(z));
                let (g4, g6) = covariants_at(&g, &x, &z);
                let gv = eval4(&g, &x, &z);
                let lhs = Integer::from(27) * &g6 * &g6;
                let rhs = &g4 * &g4 * &g4 - Integer::from(48) * &i * &gv * &gv * &g4 - Integer::from(64) * &j * &gv * &gv * &gv;
                assert_eq!(lhs, rhs, "{coeffs:?}");
            }
        }
    }
}
