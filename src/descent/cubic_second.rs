//! The second descent of a binary cubic covering `m w^3 = C(u, v)` over
//! the cubic field of `C`, giving plane-cubic coverings whose points are
//! much smaller than those of the binary covering.
//!
//! The binary coverings come from a descent by 3-isogeny on
//! `y^2 = x^3 + k` (the map `P -> y + sqrt k` modulo cubes; Cassels,
//! *Lectures on Elliptic Curves*, sections 18 and 19): a point of `E` whose
//! class is `alpha` gives a point `(u : v : w)` with `m w^3 = C(u, v)`, and
//! its coordinates are about as large as `exp(h(P) / 2)`. The second step,
//! as in the classical second descent (Cassels; for cubic twists and
//! 3-coverings Cremona, Fisher and Stoll, *Minimisation and reduction of
//! 2-, 3- and 4-coverings of elliptic curves*, Algebra & Number Theory 4
//! (2010), section 6 for the reduction):
//!
//! - `L = Q(theta')`, `theta' = c0 theta` for a root `theta` of `C(t, 1)`,
//!   and `xi = c0 u - theta' v` has norm `c0^2 m w^3`; for coprime `u`, `v`
//!   its class modulo cubes lies in `L(S, 3)` for `S` the primes of 3,
//!   `c0`, `m` and the discriminant of `C` (the caller's list), with norm in
//!   `c0^2 m Q*^3`;
//! - `L(S, 3) = O_S* / O_S*^3` when 3 does not divide the order of the
//!   S-class group (otherwise refused), from [`NumberField::s_unit_group`];
//!   candidates are taken modulo the image of `Q(S, 3)` too (a rational
//!   factor only rescales the plane cubic);
//! - for each candidate `beta`, `xi = beta zeta^3` with
//!   `zeta = x w0 + y w1 + z w2` (the integral basis) says that the
//!   `theta'^2` coordinate of `beta zeta^3` vanishes: a plane cubic `F_beta`, kept if
//!   it has a point over `Q_p` for every `p` in `S` (a p-adic lifting tree,
//!   below; the real place always has points);
//! - each kept cubic is reduced by an LLL basis of `Z^3` for the quadratic
//!   form `sum_sigma |sigma(beta)|^(2/3) |sigma(zeta)|^2`, whose values at
//!   the points are about `H^(2/3)` for `(u, v)` of size `H`, computed at a
//!   precision that covers the spread of the conjugates of `beta`.
//!
//! A point of `F_beta` then maps back to `(u : v : w)` exactly. Nothing
//! here is used as a proof: the coverings guide a point search, and each
//! point is checked on the binary covering.

use crate::arith::FactorLimits;
use crate::budget::Work;
use crate::error::{Error, ErrorKind};
use crate::heights::real::{fi, fq, ln, to_f64, Cx};
use crate::numfield::{ClassGroupOptions, Element, NumberField};
use crate::search::{PlanePoint, MONOMIALS};
use malachite::base::num::arithmetic::traits::{CheckedRoot, Gcd, Lcm, Mod};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Float, Integer, Natural, Rational};

/// Most `F_3`-dimensions of `L(S, 3)` enumerated (`3^12` candidates).
const MAX_DIMENSION: usize = 12;

/// A binary cubic covering `m w^3 = c0 u^3 + c1 u^2 v + c2 u v^2 + c3 v^3`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct BinaryCubicCovering {
    pub(crate) c: [Integer; 4],
    pub(crate) m: Integer,
}

/// A plane cubic from the second descent: `form` in reduced coordinates
/// `s`; `zeta = basis s` on the integral basis; `p0`, `p1` the
/// coordinates 0 and 1 of `beta zeta^3` as cubic forms in `zeta`'s
/// coordinates (rational coefficients, monomials as `form`).
#[derive(Clone, Debug)]
pub(crate) struct PlaneCovering {
    pub(crate) form: [Integer; 10],
    basis: [[Integer; 3]; 3],
    p0: [Rational; 10],
    p1: [Rational; 10],
}

/// The outcome: the locally soluble plane cubics, how many candidates the
/// norm condition left (modulo `Q(S, 3)`), and the dimension of `L(S, 3)`.
#[derive(Clone, Debug)]
pub(crate) struct SecondDescent {
    /// The covering with `c0 != 0` (after `(u, v) -> (v, u)` if needed).
    covering: BinaryCubicCovering,
    swapped: bool,
    pub(crate) coverings: Vec<PlaneCovering>,
    // the counts below are read by the tests (the prototype's figures) and
    // kept for a report of the descent
    #[allow(dead_code)]
    pub(crate) candidates: usize,
    #[allow(dead_code)]
    pub(crate) dimension: usize,
    /// Candidates whose local solubility was left undecided (kept).
    #[allow(dead_code)]
    pub(crate) undecided: usize,
}

fn bad(kind: ErrorKind, msg: impl Into<String>) -> Error {
    Error::new(kind, msg).in_stage("the second 3-descent")
}

fn z(v: i64) -> Integer {
    Integer::from(v)
}

fn eval_form_q(c: &[Rational; 10], p: &[Integer; 3]) -> Rational {
    let mut s = Rational::ZERO;
    for (k, e) in MONOMIALS.iter().enumerate() {
        let mut t = c[k].clone();
        for i in 0..3 {
            for _ in 0..e[i] {
                t *= Rational::from(p[i].clone());
            }
        }
        s += t;
    }
    s
}

/// The coefficients of `F(M s)` (`M` given by rows: old coordinate `i` is
/// `sum_j M[i][j] s_j`).
pub(crate) fn substitute(c: &[Integer; 10], m: &[[Integer; 3]; 3]) -> [Integer; 10] {
    let index = |e: [usize; 3]| MONOMIALS.iter().position(|&f| f == e).unwrap_or(0);
    let mut out: [Integer; 10] = Default::default();
    for (k, e) in MONOMIALS.iter().enumerate() {
        if c[k] == 0 {
            continue;
        }
        let mut poly: Vec<([usize; 3], Integer)> = vec![([0, 0, 0], c[k].clone())];
        for i in 0..3 {
            for _ in 0..e[i] {
                let mut next: Vec<([usize; 3], Integer)> = Vec::with_capacity(poly.len() * 3);
                for (mono, coef) in &poly {
                    for j in 0..3 {
                        if m[i][j] != 0 {
                            let mut m2 = *mono;
                            m2[j] += 1;
                            next.push((m2, coef * &m[i][j]));
                        }
                    }
                }
                poly = next;
            }
        }
        for (mono, coef) in poly {
            out[index(mono)] += coef;
        }
    }
    out
}

fn primitive(c: [Integer; 10]) -> [Integer; 10] {
    let g = c.iter().fold(Natural::ZERO, |g, v| g.gcd(v.unsigned_abs_ref().clone()));
    if g <= 1u32 {
        return c;
    }
    let g = Integer::from(g);
    c.map(|v| v / &g)
}

/// `v_p(q)` of a non-zero rational.
fn val_q(q: &Rational, p: u64) -> i64 {
    let pn = Natural::from(p);
    let vn = |n: &Natural| {
        let mut n = n.clone();
        let mut v = 0;
        while n != 0u32 && (&n).mod_op(&pn) == 0u32 {
            n /= &pn;
            v += 1;
        }
        v
    };
    vn(q.numerator_ref()) - vn(q.denominator_ref())
}

fn mod3(e: &Integer) -> usize {
    usize::try_from(&e.mod_op(Integer::from(3))).unwrap_or(0)
}

/// Runs the second descent of `cov` with `s_primes` (which must contain 3
/// and every prime of `c0`, `m` and the discriminant of `C`).
pub(crate) fn second_descent(cov: &BinaryCubicCovering, s_primes: &[u64], work: &Work) -> Result<SecondDescent, Error> {
    if cov.m == 0 {
        return Err(bad(ErrorKind::InvalidValue, "m = 0: not a covering"));
    }
    let (covering, swapped) = if cov.c[0] != 0 {
        (cov.clone(), false)
    } else if cov.c[3] != 0 {
        let c = &cov.c;
        (BinaryCubicCovering { c: [c[3].clone(), c[2].clone(), c[1].clone(), c[0].clone()], m: cov.m.clone() }, true)
    } else {
        return Err(bad(ErrorKind::InvalidValue, "the binary cubic has the factor u v: reducible"));
    };
    let [c0, c1, c2, c3] = covering.c.clone();
    let mut s: Vec<u64> = s_primes.to_vec();
    s.sort_unstable();
    s.dedup();
    if !s.contains(&3) {
        return Err(bad(ErrorKind::InvalidValue, "S must contain 3"));
    }
    // theta' = c0 theta: t^3 + c1 t^2 + c0 c2 t + c0^2 c3
    let poly = vec![&c0 * &c0 * &c3, &c0 * &c2, c1.clone(), Integer::ONE];
    let known: Vec<Natural> = s.iter().map(|&p| Natural::from(p)).collect();
    let field = NumberField::with_known_primes(&poly, &known, &FactorLimits::within(work)).map_err(|e| {
        if e.kind() == &ErrorKind::InvalidValue {
            bad(ErrorKind::InvalidValue, format!("the binary cubic does not define a cubic field: {e}"))
        } else {
            e
        }
    })?;
    if field.degree() != 3 {
        return Err(bad(ErrorKind::InvalidValue, "the binary cubic does not define a cubic field"));
    }
    let opts = ClassGroupOptions { deadline: work.deadline(), cancel: work.cancel_flag().cloned(), ..ClassGroupOptions::default() };
    let su = field.s_unit_group(&s, &opts)?;
    let cl_s = &su.class_group.class_number / Integer::from(su.valuation_index());
    if (&cl_s).mod_op(Integer::from(3)) == 0 {
        return Err(bad(ErrorKind::InvalidValue, format!("3 divides the S-class number {cl_s}: the second descent needs its 3-part (not handled)")));
    }
    // generators modulo cubes: fundamental units, then the S-generators
    let wides: Vec<&crate::numfield::WideProduct> = su.units.iter().chain(su.generators.iter()).collect();
    let mut gens: Vec<Element> = Vec::with_capacity(wides.len());
    for w in &wides {
        let mut g = field.one();
        for (base, e) in &w.factors {
            let r = mod3(e);
            if r > 0 {
                g = field.mul(&g, &field.pow(base, r as i64)?);
            }
        }
        gens.push(g);
    }
    let d = gens.len();
    if d > MAX_DIMENSION {
        return Err(bad(ErrorKind::TooLarge, format!("L(S,3) of dimension {d} above {MAX_DIMENSION}")));
    }
    // the norm condition, as linear equations over F_3 at the primes of S
    let target = Rational::from(&c0 * &c0 * &cov.m);
    let norm_vals: Vec<Vec<i64>> = gens.iter().map(|g| {
        let n = field.norm(g);
        s.iter().map(|&p| val_q(&n, p)).collect()
    }).collect();
    let target_vals: Vec<i64> = s.iter().map(|&p| val_q(&target, p)).collect();
    // the image of Q(S, 3): coordinates of each rational prime of S
    let q_image = rational_prime_coordinates(&field, &su, &s)?;
    let (pivots, span) = echelon_f3(q_image);
    // enumerate exponent vectors
    let mut coverings = Vec::new();
    let mut candidates = 0;
    let mut undecided = 0;
    let total = 3usize.pow(d as u32);
    for code in 0..total {
        if work.exhausted() {
            return Err(bad(ErrorKind::Budget, "the second 3-descent ran out of its budget"));
        }
        let e: Vec<usize> = (0..d).map(|i| (code / 3usize.pow(i as u32)) % 3).collect();
        let ok = (0..s.len()).all(|j| {
            let v: i64 = (0..d).map(|i| e[i] as i64 * norm_vals[i][j]).sum::<i64>() - target_vals[j];
            v.rem_euclid(3) == 0
        });
        if !ok || !is_canonical(&e, &pivots, &span) {
            continue;
        }
        candidates += 1;
        let mut beta = field.one();
        for (i, g) in gens.iter().enumerate() {
            if e[i] > 0 {
                beta = field.mul(&beta, &field.pow(g, e[i] as i64)?);
            }
        }
        let beta = without_rational_cubes(&field, &beta)?;
        let (form, p0, p1) = ternary_cubic(&field, &beta);
        let mut soluble = Some(true);
        for &p in &s {
            match soluble_at(&form, p) {
                Some(true) => {}
                Some(false) => {
                    soluble = Some(false);
                    break;
                }
                None => soluble = None,
            }
        }
        if soluble == Some(false) {
            continue;
        }
        if soluble.is_none() {
            undecided += 1;
        }
        let mp = minimisation_primes(&field, &beta, &s);
        let start = minimise(&form, &mp);
        let basis = reduction_basis(&field, &beta, &start)?;
        let reduced = primitive(substitute(&form, &basis));
        coverings.push(PlaneCovering { form: reduced, basis, p0, p1 });
    }
    Ok(SecondDescent { covering, swapped, coverings, candidates, dimension: d, undecided })
}

impl SecondDescent {
    /// The point `(u, v, w)` (integers, `m w^3 = C(u, v)` on the caller's
    /// covering) of a point of `pc`, or `None` if it is the zero vector or
    /// does not map (an internal inconsistency the caller reports).
    pub(crate) fn binary_point(&self, pc: &PlaneCovering, p: &PlanePoint) -> Option<[Integer; 3]> {
        let sv = [p.x.clone(), p.y.clone(), p.z.clone()];
        let x: [Integer; 3] = [0, 1, 2].map(|i| (0..3).map(|j| &pc.basis[i][j] * &sv[j]).sum());
        let c0 = Rational::from(self.covering.c[0].clone());
        let u = eval_form_q(&pc.p0, &x) / c0;
        let v = -eval_form_q(&pc.p1, &x);
        if u == 0 && v == 0 {
            return None;
        }
        // coprime integers
        let den = Integer::from(u.denominator_ref().clone().lcm(v.denominator_ref().clone()));
        let (u, v) = (Integer::try_from(u * Rational::from(den.clone())).ok()?, Integer::try_from(v * Rational::from(den)).ok()?);
        let g = Integer::from(u.unsigned_abs_ref().clone().gcd(v.unsigned_abs_ref().clone()));
        let (u, v) = (u / &g, v / &g);
        let c = &self.covering.c;
        let val = &c[0] * &u * &u * &u + &c[1] * &u * &u * &v + &c[2] * &u * &v * &v + &c[3] * &v * &v * &v;
        let w3 = Rational::from_integers(val, self.covering.m.clone());
        let wn = Integer::from(w3.numerator_ref().clone()) * if w3 < 0 { z(-1) } else { z(1) };
        let wn = wn.checked_root(3)?;
        let wd = Integer::from(w3.denominator_ref().clone()).checked_root(3)?;
        // (u, v, w) = (wd u, wd v, wn)
        let (u, v) = (&wd * u, &wd * v);
        Some(if self.swapped { [v, u, wn] } else { [u, v, wn] })
    }
}

/// Points `(u, v, w)` of the binary covering `cov` found through the second
/// descent: `C` is GL2-reduced, descended over its cubic field with `S` =
/// `s_primes` and the primes of the reduced leading coefficient and of `m`
/// (by trial division below `2^20`; refused if they do not factor so),
/// each locally soluble plane cubic searched to the first of `heights`
/// that gives a point (in turn), and each point
/// mapped back and checked on `cov`. Points with `w = 0` are dropped.
pub(crate) fn binary_covering_points(cov: &BinaryCubicCovering, s_primes: &[u64], heights: &[u64], work: &Work) -> Result<Vec<[Integer; 3]>, Error> {
    let (reduced, t) = reduce_binary_cubic(&cov.c)?;
    let mut s: Vec<u64> = s_primes.to_vec();
    s.push(3);
    for n in [&reduced[0], &cov.m] {
        s.extend(small_prime_factors(n).ok_or_else(|| bad(ErrorKind::TooLarge, format!("{n} has a prime factor above 2^20")))?);
    }
    s.sort_unstable();
    s.dedup();
    let red = BinaryCubicCovering { c: reduced, m: cov.m.clone() };
    let sd = second_descent(&red, &s, work)?;
    let mut out = Vec::new();
    for &height in heights {
      for pc in &sd.coverings {
        let limits = crate::search::SearchLimits::within(work, height);
        let found = crate::search::search_plane_cubic(&pc.form, &limits)?;
        for p in &found.points {
            let Some([x, y, w]) = sd.binary_point(pc, p) else {
                return Err(Error::internal("descent::cubic_second", "a point of a plane covering does not map to the binary covering"));
            };
            if w == 0 {
                continue;
            }
            let u = &t[0][0] * &x + &t[0][1] * &y;
            let v = &t[1][0] * &x + &t[1][1] * &y;
            let c = &cov.c;
            let lhs = &c[0] * &u * &u * &u + &c[1] * &u * &u * &v + &c[2] * &u * &v * &v + &c[3] * &v * &v * &v;
            if lhs != &cov.m * &w * &w * &w {
                return Err(Error::internal("descent::cubic_second", "a mapped point is not on the binary covering"));
            }
            out.push([u, v, w]);
        }
      }
      if !out.is_empty() {
          break;
      }
    }
    Ok(out)
}

/// Points of `E_k: y^2 = x^3 + k` from the second descent of the coverings
/// of the non-zero Selmer elements of both sides of `cd` (one of each pair
/// of inverse classes), searched at `heights` in turn, mapped to `E_k` (through
/// `phi^` from `E_{-27k}`) and each checked on `E_k`. A covering whose
/// binary cubic is reducible or whose cubic field has 3 dividing its
/// S-class number is skipped (`skipped` counts them).
pub(crate) fn points_by_second_descent(cd: &crate::descent::cube_isogeny::CubeDescent, heights: &[u64], work: &Work) -> Result<(Vec<crate::Point>, usize), Error> {
    use crate::descent::cube_isogeny::{phi_hat, side_curve};
    let e = side_curve(&cd.k)?;
    let limits = FactorLimits::within(work);
    let mut out = Vec::new();
    let mut skipped = 0;
    for (dual, side) in [(false, &cd.own), (true, &cd.dual)] {
        let d = side.selmer.len();
        let n = side.candidates.len();
        for code in 1..3usize.pow(d as u32) {
            let coeffs: Vec<u8> = (0..d).map(|i| ((code / 3usize.pow(i as u32)) % 3) as u8).collect();
            if coeffs.iter().find(|&&c| c != 0) == Some(&2) {
                continue;
            }
            let mut w = vec![0u8; n];
            for (c, row) in coeffs.iter().zip(&side.selmer) {
                for (x, y) in w.iter_mut().zip(row) {
                    *x = (*x + c * y) % 3;
                }
            }
            if work.exhausted() {
                return Err(bad(ErrorKind::Budget, "the second 3-descent ran out of its budget"));
            }
            let cov = side.covering(&w, &limits)?;
            let bc = BinaryCubicCovering { c: cov.form.clone(), m: cov.c.clone() };
            let pts = match binary_covering_points(&bc, &side.s_primes, heights, work) {
                Ok(p) => p,
                Err(err) if err.kind() == &ErrorKind::InvalidValue => {
                    skipped += 1;
                    continue;
                }
                Err(err) => return Err(err),
            };
            for [u, v, z] in pts {
                let Some(p) = cov.map(&Rational::from(u), &Rational::from(v), &Rational::from(z)) else { continue };
                let p = if dual { phi_hat(&cd.k, &p) } else { p };
                if p.is_infinity() {
                    continue;
                }
                if !e.contains(&p) {
                    return Err(Error::internal("descent::cubic_second", "a point of the second 3-descent is not on the curve"));
                }
                out.push(p);
            }
        }
    }
    Ok((out, skipped))
}

/// The prime factors of `n` if all are below `2^20`.
fn small_prime_factors(n: &Integer) -> Option<Vec<u64>> {
    let mut rest = n.unsigned_abs_ref().clone();
    let mut out = Vec::new();
    let mut p = 2u64;
    while rest > 1u32 && p < 1 << 20 {
        let pn = Natural::from(p);
        if (&rest).mod_op(&pn) == 0u32 {
            out.push(p);
            while (&rest).mod_op(&pn) == 0u32 {
                rest /= &pn;
            }
        }
        p += 1;
    }
    (rest <= 1u32).then_some(out)
}

/// `C(T (x, y))` for a binary cubic `C` and a 2x2 matrix `T` (rows).
pub(crate) fn substitute_binary(c: &[Integer; 4], t: &[[Integer; 2]; 2]) -> [Integer; 4] {
    // (u, v) = (t00 x + t01 y, t10 x + t11 y); C = c0 u^3 + c1 u^2 v + c2 u v^2 + c3 v^3
    let lin = |a: &Integer, b: &Integer| -> [Integer; 2] { [a.clone(), b.clone()] };
    let u = lin(&t[0][0], &t[0][1]);
    let v = lin(&t[1][0], &t[1][1]);
    // product of linear forms as coefficient vectors in x^k y^(n-k), highest x first
    let mul = |p: &[Integer], q: &[Integer; 2]| -> Vec<Integer> {
        let mut out = vec![Integer::ZERO; p.len() + 1];
        for (i, a) in p.iter().enumerate() {
            out[i] += a * &q[0];
            out[i + 1] += a * &q[1];
        }
        out
    };
    let one = [Integer::ONE];
    let terms = [(3, 0), (2, 1), (1, 2), (0, 3)];
    let mut out: [Integer; 4] = Default::default();
    for (k, &(a, b)) in terms.iter().enumerate() {
        let mut poly: Vec<Integer> = one.to_vec();
        for _ in 0..a {
            poly = mul(&poly, &u);
        }
        for _ in 0..b {
            poly = mul(&poly, &v);
        }
        for (i, coef) in poly.iter().enumerate() {
            out[i] += &c[k] * coef;
        }
    }
    out
}

/// A GL2(Z)-reduced binary cubic equivalent to `c`, and the unimodular
/// `T` (rows) with `reduced = C o T`: Gauss reduction for Julia's quadratic
/// covariant `sum_i |C'(theta_i)|^(-2) |x - theta_i y|^2` over the roots
/// `theta_i` of `C(t, 1)` (G. Julia, 1917; for cubics Cremona, *Reduction of
/// binary cubic and quartic forms*, LMS JCM 2 (1999)), computed at a
/// precision that covers the coefficients' size.
pub(crate) fn reduce_binary_cubic(c: &[Integer; 4]) -> Result<([Integer; 4], [[Integer; 2]; 2]), Error> {
    let mut t: [[Integer; 2]; 2] = [[z(1), z(0)], [z(0), z(1)]];
    let mut cur = c.clone();
    if cur[0] == 0 {
        // x <-> y (a root at infinity otherwise)
        t = [[z(0), z(1)], [z(1), z(0)]];
        cur = substitute_binary(c, &t);
        if cur[0] == 0 {
            return Err(bad(ErrorKind::InvalidValue, "the binary cubic has the factor x y: reducible"));
        }
    }
    let bits = cur.iter().map(|v| v.unsigned_abs_ref().significant_bits()).max().unwrap_or(1);
    let prec = 128 + 4 * bits;
    let a = crate::heights::real::fz(&cur[0], prec);
    let coef = |i: usize| crate::heights::real::fz(&cur[i], prec) / a.clone();
    let roots = crate::heights::real::cubic_roots(&coef(1), &coef(2), &coef(3), prec)?;
    // weights |C'(theta)|^-2 with C' the derivative of C(t, 1)
    let d = [crate::heights::real::fz(&(Integer::from(3) * &cur[0]), prec), crate::heights::real::fz(&(Integer::from(2) * &cur[1]), prec), crate::heights::real::fz(&cur[2], prec)];
    let mut w: Vec<Float> = Vec::with_capacity(3);
    for r in &roots {
        let v = r.mul(r).mul(&Cx::real(d[0].clone())).add(&r.mul(&Cx::real(d[1].clone()))).add(&Cx::real(d[2].clone()));
        let n2 = v.norm2();
        if n2 == Float::ZERO {
            return Err(bad(ErrorKind::InvalidValue, "the binary cubic has a repeated root"));
        }
        w.push(fi(1, prec) / n2);
    }
    // Q(x, y) = sum w_i |x - theta_i y|^2 = A x^2 + B x y + C y^2 (B the full cross term)
    let mut qa = Float::ZERO;
    let mut qb = Float::ZERO;
    let mut qc = Float::ZERO;
    for (r, wi) in roots.iter().zip(&w) {
        qa = qa + wi.clone();
        qb = qb - fi(2, prec) * wi.clone() * r.re.clone();
        qc = qc + wi.clone() * r.norm2();
    }
    let q = |x: &Integer, y: &Integer| -> Float {
        let (xf, yf) = (crate::heights::real::fz(x, prec), crate::heights::real::fz(y, prec));
        qa.clone() * xf.clone() * xf.clone() + qb.clone() * xf * yf.clone() + qc.clone() * yf.clone() * yf
    };
    let bil = |p: &[Integer; 2], r: &[Integer; 2]| -> Float {
        // B(p, r) = (Q(p + r) - Q(p) - Q(r)) / 2
        let s0 = &p[0] + &r[0];
        let s1 = &p[1] + &r[1];
        (q(&s0, &s1) - q(&p[0], &p[1]) - q(&r[0], &r[1])) / fi(2, prec)
    };
    // columns of T as vectors: b1 = (t00, t10), b2 = (t01, t11) in the
    // coordinates of `cur`; reduce starting from the identity
    let mut b1 = [z(1), z(0)];
    let mut b2 = [z(0), z(1)];
    for _ in 0..10_000 {
        let q1 = q(&b1[0], &b1[1]);
        let mu = bil(&b1, &b2) / q1.clone();
        let m = {
            use malachite::base::num::conversion::traits::RoundingFrom;
            use malachite::base::rounding_modes::RoundingMode;
            Integer::rounding_from(&mu, RoundingMode::Nearest).0
        };
        if m != 0 {
            b2 = [&b2[0] - &m * &b1[0], &b2[1] - &m * &b1[1]];
        }
        if q(&b2[0], &b2[1]) < q1 {
            std::mem::swap(&mut b1, &mut b2);
        } else {
            break;
        }
    }
    let red_t: [[Integer; 2]; 2] = [[b1[0].clone(), b2[0].clone()], [b1[1].clone(), b2[1].clone()]];
    let reduced = substitute_binary(&cur, &red_t);
    // total: original (u, v) = t (cur coords) = t red_t (reduced coords)
    let total: [[Integer; 2]; 2] = [0, 1].map(|i| [0, 1].map(|j| &t[i][0] * &red_t[0][j] + &t[i][1] * &red_t[1][j]));
    Ok((reduced, total))
}

/// The ternary cubic `F_beta` (primitive integer coefficients) and the
/// forms of the coordinates 0 and 1 of `beta zeta^3`.
fn ternary_cubic(field: &NumberField, beta: &Element) -> ([Integer; 10], [Rational; 10], [Rational; 10]) {
    // zeta = x w0 + y w1 + z w2 on the integral basis: each monomial
    // x^a y^b z^c of zeta^3 has the element 3!/(a! b! c!) w0^a w1^b w2^c
    let omega = integral_basis(field);
    let mut coord: [[Rational; 10]; 3] = Default::default();
    for (k, e) in MONOMIALS.iter().enumerate() {
        let fact = |n: usize| (1..=n).product::<usize>().max(1);
        let multi = 6 / (fact(e[0]) * fact(e[1]) * fact(e[2]));
        let mut el = beta.clone();
        for i in 0..3 {
            for _ in 0..e[i] {
                el = field.mul(&el, &omega[i]);
            }
        }
        let pb = field.to_power_basis(&el);
        for i in 0..3 {
            coord[i][k] = Rational::from(multi as u64) * &pb[i];
        }
    }
    let den = coord[2].iter().fold(Natural::ONE, |l, q| l.lcm(q.denominator_ref().clone()));
    let form: [Integer; 10] = coord[2].clone().map(|q| Integer::try_from(q * Rational::from(Integer::from(den.clone()))).unwrap_or(Integer::ZERO));
    let [p0, p1, _] = coord;
    (primitive(form), p0, p1)
}

/// The integral basis of a cubic field as elements.
fn integral_basis(field: &NumberField) -> [Element; 3] {
    [0, 1, 2].map(|i| {
        let mut e = vec![Integer::ZERO; 3];
        e[i] = Integer::ONE;
        field.element(&e).unwrap_or_else(|_| field.one())
    })
}

/// F_3-coordinates (unit exponents, then S-generator exponents) of each
/// rational prime of `s` in `L(S, 3)`.
fn rational_prime_coordinates(field: &NumberField, su: &crate::numfield::SUnitBasis, s: &[u64]) -> Result<Vec<Vec<usize>>, Error> {
    let r = su.units.len();
    let ns = su.generators.len();
    let unit_logs: Vec<Vec<f64>> = su.units.iter().map(|u| u.log_embedding(field)).collect();
    let gen_logs: Vec<Vec<f64>> = su.generators.iter().map(|g| g.log_embedding(field)).collect();
    let (r1, _) = field.signature();
    let mut out = Vec::with_capacity(s.len());
    for &p in s {
        let pe = field.rational(&Rational::from(p));
        // exponents of the S-generators from the valuations (triangular)
        let vals: Vec<i64> = su.ideals.iter().map(|pr| field.valuation(&pe, pr)).collect::<Result<_, _>>()?;
        let a = solve_integer(&su.valuations, &vals).ok_or_else(|| Error::internal("descent::cubic_second", "a rational prime is not an S-unit of the basis"))?;
        // unit part: log|p| minus the generators' logs, on the unit logs
        let places = unit_logs.first().map(|l| l.len()).unwrap_or(r1);
        let mut target: Vec<f64> = (0..places).map(|i| if i < r1 { (p as f64).ln() } else { 2.0 * (p as f64).ln() }).collect();
        for (i, ai) in a.iter().enumerate() {
            for (t, lg) in target.iter_mut().zip(&gen_logs[i]) {
                *t -= *ai as f64 * lg;
            }
        }
        let b = least_squares_round(&unit_logs, &target);
        let mut v: Vec<usize> = b.iter().map(|&x| x.rem_euclid(3) as usize).collect();
        v.extend(a.iter().map(|&x| x.rem_euclid(3) as usize));
        debug_assert_eq!(v.len(), r + ns);
        out.push(v);
    }
    Ok(out)
}

/// Integer `a` with `sum_i a_i V[i] = vals` for the upper-triangular
/// valuation rows `V` (row `i`: the valuations of generator `i`).
fn solve_integer(v: &[Vec<i64>], vals: &[i64]) -> Option<Vec<i64>> {
    let n = v.len();
    let mut rest: Vec<i64> = vals.to_vec();
    let mut a = vec![0i64; n];
    // generator i has its first non-zero valuation at some column; process
    // columns left to right
    for col in 0..rest.len() {
        if rest[col] == 0 {
            continue;
        }
        let i = (0..n).find(|&i| v[i][col] != 0 && (0..col).all(|c| v[i][c] == 0))?;
        if rest[col] % v[i][col] != 0 {
            return None;
        }
        let q = rest[col] / v[i][col];
        a[i] += q;
        for (c, r) in rest.iter_mut().enumerate() {
            *r -= q * v[i][c];
        }
    }
    rest.iter().all(|&x| x == 0).then_some(a)
}

/// The integer vector nearest to the least-squares solution of
/// `sum_j b_j logs[j] = target` (over the first `r` places: the unit logs
/// sum to zero, so one place is dropped).
fn least_squares_round(logs: &[Vec<f64>], target: &[f64]) -> Vec<i64> {
    let r = logs.len();
    if r == 0 {
        return Vec::new();
    }
    // normal equations
    let mut a = vec![vec![0.0; r + 1]; r];
    for i in 0..r {
        for j in 0..r {
            a[i][j] = logs[i].iter().zip(&logs[j]).map(|(x, y)| x * y).sum();
        }
        a[i][r] = logs[i].iter().zip(target).map(|(x, y)| x * y).sum();
    }
    for col in 0..r {
        let piv = (col..r).max_by(|&x, &y| a[x][col].abs().total_cmp(&a[y][col].abs())).unwrap_or(col);
        a.swap(col, piv);
        let p = a[col][col];
        if p == 0.0 {
            continue;
        }
        for row in 0..r {
            if row != col {
                let f = a[row][col] / p;
                for k in col..=r {
                    a[row][k] -= f * a[col][k];
                }
            }
        }
    }
    (0..r).map(|i| if a[i][i] != 0.0 { (a[i][r] / a[i][i]).round() as i64 } else { 0 }).collect()
}

/// Row echelon form over F_3: the pivot columns and the reduced rows.
fn echelon_f3(mut rows: Vec<Vec<usize>>) -> (Vec<usize>, Vec<Vec<usize>>) {
    let mut pivots = Vec::new();
    let mut out: Vec<Vec<usize>> = Vec::new();
    let width = rows.first().map(|r| r.len()).unwrap_or(0);
    for col in 0..width {
        let Some(i) = rows.iter().position(|r| r[col] % 3 != 0) else { continue };
        let mut row = rows.remove(i);
        let inv = if row[col] == 1 { 1 } else { 2 };
        for x in row.iter_mut() {
            *x = (*x * inv) % 3;
        }
        for r in rows.iter_mut().chain(out.iter_mut()) {
            let f = r[col];
            if f != 0 {
                for (x, y) in r.iter_mut().zip(&row) {
                    *x = (*x + 3 * 3 - f * y) % 3;
                }
            }
        }
        pivots.push(col);
        out.push(row);
    }
    (pivots, out)
}

/// Whether `e` is the representative of its coset modulo the span (the
/// one with zeros at the pivot columns).
fn is_canonical(e: &[usize], pivots: &[usize], _span: &[Vec<usize>]) -> bool {
    pivots.iter().all(|&c| e[c] == 0)
}

/// An LLL-reduced basis (columns) of `Z^3`, the coordinates on the
/// integral basis, for the form `sum_sigma |sigma(beta)|^(2/3) |sigma(zeta)|^2`.
fn reduction_basis(field: &NumberField, beta: &Element, start: &[[Integer; 3]; 3]) -> Result<[[Integer; 3]; 3], Error> {
    let (r1, _) = field.signature();
    let logs = field.log_embedding(beta);
    let spread = logs.iter().fold(0.0f64, |m, l| m.max(l.abs())) / std::f64::consts::LN_2;
    let prec = 160 + 2 * spread.ceil() as u64;
    let roots = crate::numfield::precise_roots(field, prec);
    let bc: Vec<Float> = field.to_power_basis(beta).iter().map(|q| fq(q, prec)).collect();
    // weights sqrt(w_sigma) = |sigma(beta)|^(1/3), from precise values
    let mut scale: Vec<Float> = Vec::with_capacity(roots.len());
    for (i, t) in roots.iter().enumerate() {
        let mut v = Cx::real(fi(0, prec));
        for c in bc.iter().rev() {
            v = v.mul(t).add(&Cx::real(c.clone()));
        }
        let a = v.abs(prec);
        if a == Float::ZERO {
            return Err(Error::internal("descent::cubic_second", "a conjugate of beta vanished"));
        }
        let third = ln(&a, prec) / fi(3, prec);
        let w = exp_float(&third, prec);
        scale.push(if i < r1 { w } else { w * crate::heights::real::sqrt(&fi(2, prec), prec) });
    }
    // the conjugates of the integral basis
    let omega = integral_basis(field);
    let conj: Vec<Vec<Cx>> = omega.iter().map(|w| {
        let c: Vec<Float> = field.to_power_basis(w).iter().map(|q| fq(q, prec)).collect();
        roots.iter().map(|t| {
            let mut v = Cx::real(fi(0, prec));
            for ci in c.iter().rev() {
                v = v.mul(t).add(&Cx::real(ci.clone()));
            }
            v
        }).collect()
    }).collect();
    let image = |x: &[Integer; 3]| -> Vec<Float> {
        let mut out = Vec::with_capacity(3);
        for i in 0..roots.len() {
            let mut v = Cx::real(fi(0, prec));
            for (j, xj) in x.iter().enumerate() {
                v = v.add(&conj[j][i].mul(&Cx::real(crate::heights::real::fz(xj, prec))));
            }
            out.push(v.re.clone() * scale[i].clone());
            if i >= r1 {
                out.push(v.im.clone() * scale[i].clone());
            }
        }
        out
    };
    // rows: the vectors of the starting lattice (columns of `start`)
    let mut b: [[Integer; 3]; 3] = [0, 1, 2].map(|j| [0, 1, 2].map(|i| start[i][j].clone()));
    lll_float(&mut b, &image, prec);
    // columns
    Ok([0, 1, 2].map(|i| [0, 1, 2].map(|j| b[j][i].clone())))
}

/// `beta / p^(3t)` for each prime `p` of its norm (below `2^16`), `t` the
/// largest with `3 e(P|p) t <= v_P(beta)` at every prime `P` above `p`
/// (the same class modulo cubes, a smaller representative).
fn without_rational_cubes(field: &NumberField, beta: &Element) -> Result<Element, Error> {
    let n = field.norm(beta);
    let mut primes = Vec::new();
    for part in [n.numerator_ref().clone(), n.denominator_ref().clone()] {
        primes.extend(small_prime_factors(&Integer::from(part)).unwrap_or_default());
    }
    primes.sort_unstable();
    primes.dedup();
    let mut beta = beta.clone();
    for p in primes {
        let mut t: Option<i64> = None;
        for pr in field.primes_above(p)? {
            let v = field.valuation(&beta, &pr)?;
            let e = i64::from(pr.e);
            let q = v.div_euclid(3 * e);
            t = Some(t.map_or(q, |t0| t0.min(q)));
        }
        if let Some(t) = t.filter(|&t| t != 0) {
            let scale = malachite::base::num::arithmetic::traits::Pow::pow(Rational::from(p), -3 * t);
            beta = field.mul(&beta, &field.rational(&scale));
        }
    }
    Ok(beta)
}

/// The primes of `S` and the small primes outside `S` dividing the norm of
/// `beta` (its generators, reduced modulo cubes, carry cubes of ideals
/// outside `S`, which make the plane cubic non-minimal there).
fn minimisation_primes(field: &NumberField, beta: &Element, s: &[u64]) -> Vec<u64> {
    let n = field.norm(beta);
    let mut out: Vec<u64> = s.to_vec();
    for part in [n.numerator_ref().clone(), n.denominator_ref().clone()] {
        let mut rest = part;
        for &p in s {
            let pn = Natural::from(p);
            while rest != 0u32 && (&rest).mod_op(&pn) == 0u32 {
                rest /= &pn;
            }
        }
        let mut p = 2u64;
        while rest > 1u32 && p < 1 << 16 {
            let pn = Natural::from(p);
            if (&rest).mod_op(&pn) == 0u32 {
                if !out.contains(&p) {
                    out.push(p);
                }
                while (&rest).mod_op(&pn) == 0u32 {
                    rest /= &pn;
                }
            }
            p += 1;
        }
    }
    out
}

/// The largest prime at which [`minimise`] tries the sublattices.
const MINIMISE_MAX_PRIME: u64 = 50;

/// A lattice (columns, in the coordinates of `form`) on which the form,
/// divided by its content, has a smaller discriminant: sublattices of
/// index `p` (`l(x) = 0 mod p` for a line `l`) where the content gains
/// `p^2` or more, and of index `p^2` (the multiples of a point mod `p`)
/// where it gains `p^3` or more, repeated while one is found. The
/// discriminant of `F(M s) / c` is `det(M)^12 / c^12` times that of `F`, so
/// each step lowers it; a linear change over Q keeps the curve, so no point
/// is lost (the coordinates of a point only change). A partial version of
/// the minimisation of Cremona, Fisher and Stoll (2010), for small primes.
pub(crate) fn minimise(form: &[Integer; 10], primes: &[u64]) -> [[Integer; 3]; 3] {
    let mut basis: [[Integer; 3]; 3] = [[z(1), z(0), z(0)], [z(0), z(1), z(0)], [z(0), z(0), z(1)]];
    let mut cur = primitive(form.clone());
    let mul = |a: &[[Integer; 3]; 3], b: &[[Integer; 3]; 3]| -> [[Integer; 3]; 3] {
        [0, 1, 2].map(|i| [0, 1, 2].map(|j| (0..3).map(|k| &a[i][k] * &b[k][j]).sum()))
    };
    // a move at p has a determinant prime to every other prime, so the
    // primes are done one after the other
    for &p in primes {
        for _step in 0..1000 {
            let subs = if p <= MINIMISE_MAX_PRIME { sublattices(p) } else { singular_sublattices(&cur, p) };
            let mut improved = false;
            for (sub, need) in subs {
                let f2 = substitute(&cur, &sub);
                let g = f2.iter().fold(Natural::ZERO, |g, v| g.gcd(v.unsigned_abs_ref().clone()));
                if g == 0u32 {
                    continue;
                }
                if val_q(&Rational::from(g), p) >= need {
                    cur = primitive(f2);
                    basis = mul(&basis, &sub);
                    improved = true;
                    break;
                }
            }
            if !improved {
                break;
            }
        }
    }
    basis
}

/// For a large `p`: the index-`p^2` sublattices at the singular points of
/// `F` modulo `p` (a gain of `p^3` in the content forces the gradient to
/// vanish there), and the index-`p` ones of the lines through two of them.
fn singular_sublattices(f: &[Integer; 10], p: u64) -> Vec<([[Integer; 3]; 3], i64)> {
    let pz = Integer::from(p);
    if p >= 1 << 32 {
        return Vec::new();
    }
    let c: Vec<u64> = f.iter().map(|v| u64::try_from(&v.mod_op(&pz)).unwrap_or(0)).collect();
    let pm = p;
    let grad_zero = |q: [u64; 3]| -> bool {
        // dF/dx_i at q modulo p, from the monomials
        (0..3).all(|i| {
            let mut s = 0u64;
            for (k, e) in MONOMIALS.iter().enumerate() {
                if e[i] == 0 || c[k] == 0 {
                    continue;
                }
                let mut t = c[k] * e[i] as u64 % pm;
                for j in 0..3 {
                    let ej = if j == i { e[j] - 1 } else { e[j] };
                    for _ in 0..ej {
                        t = t * q[j] % pm;
                    }
                }
                s = (s + t) % pm;
            }
            s == 0
        })
    };
    let mut sing: Vec<[i64; 3]> = Vec::new();
    let pi = p as i64;
    let consider = |q: [i64; 3], sing: &mut Vec<[i64; 3]>| {
        if sing.len() < 8 && grad_zero(q.map(|v| v as u64)) {
            sing.push(q);
        }
    };
    for a in 0..pi {
        for b in 0..pi {
            consider([1, a, b], &mut sing);
        }
    }
    for b in 0..pi {
        consider([0, 1, b], &mut sing);
    }
    consider([0, 0, 1], &mut sing);
    let mut out = Vec::new();
    for q in &sing {
        out.push((point_sublattice(q, &pz), 3));
    }
    for (i, q) in sing.iter().enumerate() {
        for r in &sing[i + 1..] {
            // the line through q and r: the cross product
            let l = [q[1] * r[2] - q[2] * r[1], q[2] * r[0] - q[0] * r[2], q[0] * r[1] - q[1] * r[0]].map(|v| v.rem_euclid(pi));
            if let Some(k) = l.iter().position(|&v| v != 0) {
                let inv = modinv(l[k], pi);
                let ln = l.map(|v| v * inv % pi);
                out.push((line_sublattice(&ln, &pz, pi), 2));
            }
        }
    }
    out
}

fn modinv(a: i64, p: i64) -> i64 {
    let (mut t, mut nt, mut r, mut nr) = (0i64, 1i64, p, a.rem_euclid(p));
    while nr != 0 {
        let q = r / nr;
        (t, nt) = (nt, t - q * nt);
        (r, nr) = (nr, r - q * nr);
    }
    t.rem_euclid(p)
}

/// `{x : x = t q mod p}` (index `p^2`), columns.
fn point_sublattice(q: &[i64; 3], pz: &Integer) -> [[Integer; 3]; 3] {
    match q {
        [1, a, b] => [[z(1), z(0), z(0)], [z(*a), pz.clone(), z(0)], [z(*b), z(0), pz.clone()]],
        [0, 1, b] => [[z(0), pz.clone(), z(0)], [z(1), z(0), z(0)], [z(*b), z(0), pz.clone()]],
        _ => [[z(0), pz.clone(), z(0)], [z(0), z(0), pz.clone()], [z(1), z(0), z(0)]],
    }
}

/// `{x : l . x = 0 mod p}` (index `p`), columns; `l` normalised (its first
/// non-zero entry 1).
fn line_sublattice(l: &[i64; 3], pz: &Integer, pi: i64) -> [[Integer; 3]; 3] {
    let i = l.iter().position(|&c| c != 0).unwrap_or(0);
    let mut cols: Vec<[Integer; 3]> = Vec::with_capacity(3);
    for k in 0..3 {
        let mut v = [z(0), z(0), z(0)];
        if k == i {
            v[i] = pz.clone();
        } else {
            v[k] = z(1);
            v[i] = z((-l[k]).rem_euclid(pi));
        }
        cols.push(v);
    }
    [0, 1, 2].map(|r| [0, 1, 2].map(|c| cols[c][r].clone()))
}

/// The sublattices of index `p` and `p^2` (columns) with the content they
/// must gain, `2` and `3` powers of `p`.
fn sublattices(p: u64) -> Vec<([[Integer; 3]; 3], i64)> {
    let pz = Integer::from(p);
    let mut out = Vec::new();
    let pi = p as i64;
    // projective points q mod p, normalised
    let mut points: Vec<[i64; 3]> = Vec::new();
    for a in 0..pi {
        for b in 0..pi {
            points.push([1, a, b]);
        }
    }
    for b in 0..pi {
        points.push([0, 1, b]);
    }
    points.push([0, 0, 1]);
    for q in &points {
        out.push((point_sublattice(q, &pz), 3));
        out.push((line_sublattice(q, &pz, pi), 2));
    }
    out
}

fn exp_float(x: &Float, prec: u64) -> Float {
    // exp by argument halving and the Taylor series (|x| moderate)
    let mut k = 0u32;
    let mut y = x.clone();
    let one = fi(1, prec);
    while to_f64(&y).abs() > 0.5 {
        y = y / fi(2, prec);
        k += 1;
    }
    let mut term = one.clone();
    let mut sum = one.clone();
    for n in 1..200 {
        term = term * y.clone() / fi(n, prec);
        sum = sum + term.clone();
        if to_f64(&term).abs() < 2f64.powi(-(prec as i32)) {
            break;
        }
    }
    for _ in 0..k {
        sum = sum.clone() * sum;
    }
    sum
}

fn dotf(a: &[Float], b: &[Float]) -> Float {
    a.iter().zip(b).fold(Float::ZERO, |s, (x, y)| s + x.clone() * y.clone())
}

/// LLL (delta 0.99) on the rows of `b`, the images recomputed from the
/// integer vectors after every change.
fn lll_float(b: &mut [[Integer; 3]; 3], image: &dyn Fn(&[Integer; 3]) -> Vec<Float>, prec: u64) {
    let mut k = 1;
    let mut rounds = 0;
    while k < 3 && rounds < 2000 {
        rounds += 1;
        let img: Vec<Vec<Float>> = b.iter().map(image).collect();
        let mut star: Vec<Vec<Float>> = Vec::with_capacity(3);
        let mut norm: Vec<Float> = Vec::with_capacity(3);
        let mut mu = vec![vec![Float::ZERO; 3]; 3];
        for i in 0..3 {
            let mut v = img[i].clone();
            for j in 0..i {
                mu[i][j] = dotf(&img[i], &star[j]) / norm[j].clone();
                for (t, sj) in v.iter_mut().zip(&star[j]) {
                    *t = t.clone() - mu[i][j].clone() * sj.clone();
                }
            }
            norm.push(dotf(&v, &v));
            star.push(v);
        }
        let mut changed = false;
        for j in (0..k).rev() {
            let q = to_f64(&mu[k][j]).round();
            if q != 0.0 && q.is_finite() {
                // exact integer rounding of mu when it is large
                let qi = if q.abs() < 1e15 { Integer::from(q as i64) } else { round_float(&mu[k][j], prec) };
                for t in 0..3 {
                    let sub = &qi * &b[j][t];
                    b[k][t] -= sub;
                }
                changed = true;
                break;
            }
        }
        if changed {
            continue;
        }
        let m = to_f64(&mu[k][k - 1]);
        let lhs = to_f64(&(norm[k].clone() / norm[k - 1].clone()));
        if lhs >= 0.99 - m * m {
            k += 1;
        } else {
            b.swap(k, k - 1);
            k = (k - 1).max(1);
        }
    }
}

fn round_float(x: &Float, _prec: u64) -> Integer {
    use malachite::base::num::conversion::traits::RoundingFrom;
    use malachite::base::rounding_modes::RoundingMode;
    Integer::rounding_from(x, RoundingMode::Nearest).0
}

/// Whether the plane cubic `F = 0` has a point over `Q_p`: `Some(true)` on
/// finding a point of the reduction where the gradient is not zero modulo
/// `p` (Hensel's lemma), `Some(false)` when every branch of the lifting tree
/// dies, `None` when the tree exceeded its work cap.
pub(crate) fn soluble_at(f: &[Integer; 10], p: u64) -> Option<bool> {
    let pz = Integer::from(p);
    // charts: F(1, y, z); F(p x, 1, z); F(p x, p y, 1)
    let charts: [[[Integer; 3]; 3]; 3] = [
        // (x, y, z) = M (1, a, b) with the constant as the first "variable"
        [[z(1), z(0), z(0)], [z(0), z(1), z(0)], [z(0), z(0), z(1)]],
        [[z(0), pz.clone(), z(0)], [z(1), z(0), z(0)], [z(0), z(0), z(1)]],
        [[z(0), pz.clone(), z(0)], [z(0), z(0), pz.clone()], [z(1), z(0), z(0)]],
    ];
    let mut budget: u64 = 40_000_000;
    any_branch(charts.iter().map(|m| {
        let g = substitute(f, m);
        // g(1, a, b) as a polynomial in (a, b): coefficients by the exponents of the last two
        let mut poly = [[Integer::ZERO, Integer::ZERO, Integer::ZERO, Integer::ZERO], Default::default(), Default::default(), Default::default()];
        for (k, e) in MONOMIALS.iter().enumerate() {
            poly[e[1]][e[2]] += g[k].clone();
        }
        zero_mod_tree(poly, p, 0, &mut budget)
    }))
}

/// `g[i][j]` multiplies `a^i b^j` (`i + j <= 3`): does `g` have a zero in
/// `Z_p^2`?
fn zero_mod_tree(g: [[Integer; 4]; 4], p: u64, depth: u32, budget: &mut u64) -> Option<bool> {
    let pn = Integer::from(p);
    // divide by the p-part of the content
    let mut g = g;
    loop {
        let all_zero = g.iter().flatten().all(|c| *c == 0);
        if all_zero {
            return Some(true);
        }
        if g.iter().flatten().all(|c| (c).mod_op(&pn) == 0) {
            for c in g.iter_mut().flatten() {
                *c /= &pn;
            }
        } else {
            break;
        }
    }
    if depth > 24 {
        return None;
    }
    let gm: Vec<Vec<u64>> = g.iter().map(|r| r.iter().map(|c| u64::try_from(&c.mod_op(&pn)).unwrap_or(0)).collect()).collect();
    let pm = p as u128;
    let ev = |a: u64, b: u64, c: &Vec<Vec<u64>>| -> (u64, u64, u64) {
        // value, d/da, d/db modulo p
        let (a, b) = (a as u128, b as u128);
        let mut apow = [1u128; 4];
        let mut bpow = [1u128; 4];
        for i in 1..4 {
            apow[i] = apow[i - 1] * a % pm;
            bpow[i] = bpow[i - 1] * b % pm;
        }
        let (mut v, mut da, mut db) = (0u128, 0u128, 0u128);
        for i in 0..4 {
            for j in 0..(4 - i) {
                let cij = c[i][j] as u128;
                if cij == 0 {
                    continue;
                }
                v = (v + cij * apow[i] % pm * bpow[j]) % pm;
                if i > 0 {
                    da = (da + cij * (i as u128) % pm * apow[i - 1] % pm * bpow[j]) % pm;
                }
                if j > 0 {
                    db = (db + cij * (j as u128) % pm * apow[i] % pm * bpow[j - 1]) % pm;
                }
            }
        }
        (v as u64, da as u64, db as u64)
    };
    let mut singular: Vec<(u64, u64)> = Vec::new();
    for a in 0..p {
        for b in 0..p {
            if *budget == 0 {
                return None;
            }
            *budget -= 1;
            let (v, da, db) = ev(a, b, &gm);
            if v == 0 {
                if da != 0 || db != 0 {
                    return Some(true);
                }
                singular.push((a, b));
            }
        }
    }
    any_branch(singular.into_iter().map(|(a, b)| {
        // h(a', b') = g(a + p a', b + p b')
        let mut h: [[Integer; 4]; 4] = Default::default();
        for i in 0..4 {
            for j in 0..(4 - i) {
                if g[i][j] == 0 {
                    continue;
                }
                // (a + p a')^i (b + p b')^j
                for s in 0..=i {
                    for t in 0..=j {
                        let coef = &g[i][j] * Integer::from(binom(i, s) * binom(j, t)) * Integer::from(a).pow_u(i - s) * Integer::from(b).pow_u(j - t) * pn.pow_u(s + t);
                        h[s][t] += coef;
                    }
                }
            }
        }
        zero_mod_tree(h, p, depth + 1, budget)
    }))
}

/// `Some(true)` at the first branch that has a point (the rest are not
/// run), else `None` if a branch was left undecided, else `Some(false)`.
fn any_branch(branches: impl Iterator<Item = Option<bool>>) -> Option<bool> {
    let mut undecided = false;
    for b in branches {
        match b {
            Some(true) => return Some(true),
            Some(false) => {}
            None => undecided = true,
        }
    }
    if undecided {
        None
    } else {
        Some(false)
    }
}

fn binom(n: usize, k: usize) -> u64 {
    let mut r = 1u64;
    for i in 0..k {
        r = r * (n - i) as u64 / (i + 1) as u64;
    }
    r
}

trait PowU {
    fn pow_u(&self, e: usize) -> Integer;
}

impl PowU for Integer {
    fn pow_u(&self, e: usize) -> Integer {
        let mut r = Integer::ONE;
        for _ in 0..e {
            r *= self;
        }
        r
    }
}

#[cfg(test)]
mod tests;
