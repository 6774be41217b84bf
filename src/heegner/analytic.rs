//! The analytic half of the Heegner point method in multiple precision
//! (malachite `Float`): the modular parametrisation `z(tau) = Σ a_n/n q^n`
//! summed over the Heegner points, reduction modulo the period lattice, the
//! Weierstrass `℘` function by its q-expansion, and recognition of a
//! rational x-coordinate by continued fractions.

use super::forms::QuadraticForm;
use super::spend::Halt;
use crate::error::{Error, ErrorKind};
use crate::heights::real::{fi, fz, pi, sqrt, to_f64, Cx};
use crate::heights::elliptic::{exp, expi};
use malachite::base::num::arithmetic::traits::Floor;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Float, Integer, Rational};

/// An evaluation point of the modular series and how its value enters the
/// sum: whole, or twice its real part (for a point standing for itself and
/// a partner whose value is the complex conjugate modulo the periods).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub(crate) struct Evaluation {
    pub(crate) form: QuadraticForm,
    pub(crate) twice_real: bool,
}

impl Evaluation {
    pub(crate) fn whole(form: QuadraticForm) -> Evaluation {
        Evaluation { form, twice_real: false }
    }
}

/// `Σ_i Σ_{n <= M} a_n / n q_i^n` with `q_i = e^{2 pi i tau_i}`,
/// `tau_i = (-B_i + sqrt D) / (2 A_i)`, to an absolute error of about
/// `2^-prec` (the tail after `M` terms is bounded by `|a_n|/n <= 2`
/// (Hasse; `d(n) <= 2 sqrt n`) as `2 |q|^{M+1} / (1 - |q|)`). Horner's rule,
/// one complex product per term, at a precision that falls with `n` (see
/// [`form_sum`]). Honours the budget every few thousand terms.
pub(crate) fn modular_sum(a: &[i64], forms: &[QuadraticForm], d: i64, prec: u64, budget: &dyn Halt) -> Result<Cx, Error> {
    let points: Vec<Evaluation> = forms.iter().map(|&f| Evaluation::whole(f)).collect();
    modular_sum_at(a, &points, d, prec, budget)
}

/// [`modular_sum`] over evaluation points, each value whole or twice its
/// real part (the error bound doubles for the latter: the 8 guard bits of
/// [`terms_needed`] cover it).
pub(crate) fn modular_sum_at(a: &[i64], points: &[Evaluation], d: i64, prec: u64, budget: &dyn Halt) -> Result<Cx, Error> {
    let forms: Vec<QuadraticForm> = points.iter().map(|p| p.form).collect();
    if prec <= double_double_capacity(&forms, d) {
        return modular_sum_dd(a, points, d, prec, budget);
    }
    let mut total: Option<Cx> = None;
    for p in points {
        let z = form_sum(a, &p.form, d, prec, budget)?;
        let z = if p.twice_real { Cx::real(&z.re + &z.re) } else { z };
        total = Some(match total {
            Some(t) => t.add(&z),
            None => z,
        });
    }
    Ok(total.unwrap_or_else(|| Cx::real(fi(0, prec + 24))))
}

/// The series `Σ_{n <= M} a_n / n q^n` of one Heegner point, summed in
/// segments of falling precision.
///
/// The terms from `n = s` on are `q^{s-1} P_s(q)` with
/// `P_s(q) = Σ_{n >= s} a_n / n q^{n-s+1}`, and `|q^{s-1}| = 2^{-(s-1) c}`
/// (`c = pi sqrt|D| / (A ln 2)` bits per term). For an absolute error of
/// `2^-b` in the sum, `P_s` needs only `b - (s-1) c` bits after the point:
/// the range `1..=M` is cut where that need drops by a 64-bit limb, each
/// segment is summed by Horner's rule in fixed point with as many limbs as
/// its first term needs, and the segments are multiplied by `q^{s-1}`
/// (computed directly as `e^{2 pi i (s-1) tau}`) and added in multiple
/// precision. A product of `k` limbs costs about `k^2`, so with the need
/// falling linearly from the full precision to nothing the series costs
/// about a third of a sum at full precision throughout.
///
/// Error: a segment of `L` terms summed with `F >= b - (s-1) c` fraction
/// bits is off by at most `4 L` units of `2^-F` (truncated products, `|q| < 1`),
/// which the factor `|q^{s-1}|` brings below `4 L 2^-b`; the guard bits
/// `log2 M + 24` over `prec` cover the sum of these over all segments.
pub(crate) fn form_sum(a: &[i64], f: &QuadraticForm, d: i64, prec: u64, budget: &dyn Halt) -> Result<Cx, Error> {
    let m = terms_needed(f.a as f64, (-d) as f64, prec);
    if m + 1 > a.len() {
        return Err(Error::new(ErrorKind::InvalidValue, "not enough coefficients for the series"));
    }
    let bits = prec + 24 + (m.max(2) as f64).log2().ceil() as u64;
    // the angle (s - 1) pi B / A grows to about pi M: 64 more bits keep
    // the powers q^{s-1} accurate
    let wp = bits + 64;
    let per_term = std::f64::consts::PI * ((-d) as f64).sqrt() / (f.a as f64) / std::f64::consts::LN_2;
    let pi = pi(wp);
    let sd = sqrt(&fi(-d, wp), wp);
    let af = fz(&Integer::from(f.a), wp);
    let bf = fz(&Integer::from(f.b), wp);
    // q = e^{-pi sqrt|D| / A} e^{-i pi B / A}; its powers q^k by squaring
    // (about 2 log2 k products at the working precision, each losing at
    // most a few units of the last place: far inside the 64 extra bits;
    // exp and sin/cos of the large arguments k pi B / A cost far more)
    let q = {
        let r = exp(&-(&pi * &sd / &af), wp);
        let e = expi(&-(&pi * &bf / &af), wp);
        Cx::new(&r * &e.re, &r * &e.im)
    };
    let power = |k: usize| -> Cx {
        let mut result = Cx::real(fi(1, wp));
        let mut base = q.clone();
        let mut k = k;
        while k > 0 {
            if k & 1 == 1 {
                result = result.mul(&base);
            }
            k >>= 1;
            if k > 0 {
                base = base.mul(&base);
            }
        }
        result
    };
    let mut total = Cx::real(fi(0, wp));
    let mut s = 1usize;
    while s <= m {
        // bits after the point that P_s needs, and the limbs for them
        let need = (bits as f64 - (s - 1) as f64 * per_term).max(1.0);
        let limbs = (need.ceil() as u64).div_ceil(64).max(1);
        let fb = 64 * limbs;
        // the segment ends where the need falls to the next limb below
        let end = if limbs == 1 {
            m
        } else {
            let last = ((bits - (fb - 64)) as f64 / per_term).floor() as usize;
            last.clamp(s, m)
        };
        let (re, im) = if (limbs as usize) < super::words::MAX_LIMBS {
            segment_in_words(a, s, end, &q, limbs as usize, budget)?
        } else {
            segment_in_integers(a, s, end, &q, fb, budget)?
        };
        let scale = Rational::from(Integer::ONE << fb);
        let back = |x: Integer| Float::from_rational_prec(Rational::from(x) / &scale, wp).0;
        let part = Cx::new(back(re), back(im));
        total = total.add(&if s == 1 { part } else { part.mul(&power(s - 1)) });
        s = end + 1;
    }
    Ok(total)
}

/// `P = Σ_{n = s}^{e} a_n / n q^{n-s+1}` by Horner's rule in machine words
/// with `limbs` fraction limbs, as integers scaled by `2^(64 limbs)`.
fn segment_in_words(a: &[i64], s: usize, e: usize, q: &Cx, limbs: usize, budget: &dyn Halt) -> Result<(Integer, Integer), Error> {
    macro_rules! by_limbs {
        ($($k:literal),*) => {
            match limbs + 1 {
                $($k => segment_limbs::<$k>(a, s, e, q, budget),)*
                _ => Err(Error::internal("the modular series in machine words", "precision outside the table")),
            }
        };
    }
    by_limbs!(2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17)
}

fn segment_limbs<const K: usize>(a: &[i64], s: usize, e: usize, q: &Cx, budget: &dyn Halt) -> Result<(Integer, Integer), Error> {
    use super::words::{CWord, Multiplier, Word};
    let fb = 64 * (K as u64 - 1);
    let overflow = || Error::internal("the modular series in machine words", "a value outside the fixed-point range");
    let qr = Word::from_scaled(&fixed(&q.re, fb)).ok_or_else(overflow)?;
    let qi = Word::from_scaled(&fixed(&q.im, fb)).ok_or_else(overflow)?;
    let q = Multiplier::new(CWord { re: qr, im: qi });
    let mut acc = CWord::<K>::ZERO;
    for n in (s..=e).rev() {
        if n % 8192 == 0 && budget.exhausted() {
            return Err(Error::new(ErrorKind::Budget, "time budget spent in the modular parametrisation"));
        }
        if n < e {
            acc = acc.mul_by(&q);
        }
        let an = a[n];
        if an != 0 {
            acc.re = super::words::add(&acc.re, &Word::ratio(an, n as u64));
        }
    }
    let acc = acc.mul_by(&q);
    Ok((acc.re.to_scaled(), acc.im.to_scaled()))
}

/// [`segment_in_words`] in multiple-precision integers scaled by `2^fb`
/// (for precisions beyond the machine-word table).
fn segment_in_integers(a: &[i64], s: usize, e: usize, q: &Cx, fb: u64, budget: &dyn Halt) -> Result<(Integer, Integer), Error> {
    let qr = fixed(&q.re, fb);
    let qi = fixed(&q.im, fb);
    let one = Integer::ONE << fb;
    let (mut sr, mut si) = (Integer::ZERO, Integer::ZERO);
    for n in (s..=e).rev() {
        if n % 4096 == 0 && budget.exhausted() {
            return Err(Error::new(ErrorKind::Budget, "time budget spent in the modular parametrisation"));
        }
        if n < e {
            let nr = (&sr * &qr - &si * &qi) >> fb;
            let ni = (&sr * &qi + &si * &qr) >> fb;
            sr = nr;
            si = ni;
        }
        let an = a[n];
        if an != 0 {
            sr += (&one * Integer::from(an)) / Integer::from(n as u64);
        }
    }
    Ok(((&sr * &qr - &si * &qi) >> fb, (&sr * &qi + &si * &qr) >> fb))
}

/// `x` as an integer scaled by `2^wp` (rounded down).
fn fixed(x: &Float, wp: u64) -> Integer {
    let Ok(q) = Rational::try_from(x) else { return Integer::ZERO };
    Integer::from((q * Rational::from(Integer::ONE << wp)).floor())
}

/// A double-double number `hi + lo` (about 106 bits), with Dekker's exact
/// products (no fused multiply-add needed): T. J. Dekker, A floating-point
/// technique for extending the available precision, Numer. Math. 18 (1971).
#[derive(Clone, Copy, Debug, Default)]
struct Dd {
    hi: f64,
    lo: f64,
}

#[inline(always)]
fn two_sum(a: f64, b: f64) -> (f64, f64) {
    let s = a + b;
    let bb = s - a;
    (s, (a - (s - bb)) + (b - bb))
}

#[inline(always)]
fn quick_two_sum(a: f64, b: f64) -> (f64, f64) {
    let s = a + b;
    (s, b - (s - a))
}

#[inline(always)]
fn split(a: f64) -> (f64, f64) {
    let c = 134_217_729.0 * a;
    let h = c - (c - a);
    (h, a - h)
}

#[inline(always)]
fn two_prod(a: f64, b: f64) -> (f64, f64) {
    let p = a * b;
    let (ah, al) = split(a);
    let (bh, bl) = split(b);
    (p, ((ah * bh - p) + ah * bl + al * bh) + al * bl)
}

impl Dd {
    #[inline(always)]
    fn add(self, y: Dd) -> Dd {
        let (s, e) = two_sum(self.hi, y.hi);
        let (t, f) = two_sum(self.lo, y.lo);
        let (s, e) = quick_two_sum(s, e + t);
        let (hi, lo) = quick_two_sum(s, e + f);
        Dd { hi, lo }
    }
    #[inline(always)]
    fn neg(self) -> Dd {
        Dd { hi: -self.hi, lo: -self.lo }
    }
    #[inline(always)]
    fn mul(self, y: Dd) -> Dd {
        let (p, e) = two_prod(self.hi, y.hi);
        let (hi, lo) = quick_two_sum(p, e + (self.hi * y.lo + self.lo * y.hi));
        Dd { hi, lo }
    }
    fn from_float(x: &Float) -> Dd {
        let hi = to_f64(x);
        let lo = to_f64(&(x - Float::from(hi)));
        Dd { hi, lo }
    }
    fn to_float(self, prec: u64) -> Float {
        Float::from_primitive_float_prec(self.hi, prec).0 + Float::from_primitive_float_prec(self.lo, prec).0
    }
    /// `a / n` for integers below 2^53.
    #[inline(always)]
    fn ratio(a: i64, n: i64) -> Dd {
        let (af, nf) = (a as f64, n as f64);
        let hi = af / nf;
        let (p, e) = two_prod(hi, nf);
        let lo = ((af - p) - e) / nf;
        let (hi, lo) = quick_two_sum(hi, lo);
        Dd { hi, lo }
    }
}

/// [`modular_sum`] in double-double arithmetic, for precisions up to
/// about 90 bits: the same Horner scheme, about 30 times faster than
/// multiple precision at this size.
fn modular_sum_dd(a: &[i64], points: &[Evaluation], d: i64, prec: u64, budget: &dyn Halt) -> Result<Cx, Error> {
    let wp = 160;
    let pi = pi(wp);
    let sd = sqrt(&fi(-d, wp), wp);
    let (mut tre, mut tim) = (Dd::default(), Dd::default());
    for p in points {
        let f = &p.form;
        let m = terms_needed(f.a as f64, (-d) as f64, prec);
        if m + 1 > a.len() {
            return Err(Error::new(ErrorKind::InvalidValue, "not enough coefficients for the series"));
        }
        let af = fz(&Integer::from(f.a), wp);
        let r = exp(&-(&pi * &sd / &af), wp);
        let theta = -(&pi * fz(&Integer::from(f.b), wp)) / &af;
        let e = expi(&theta, wp);
        let (qr, qi) = (Dd::from_float(&(&r * &e.re)), Dd::from_float(&(&r * &e.im)));
        let (mut sr, mut si) = (Dd::default(), Dd::default());
        for n in (1..=m).rev() {
            if n % 65536 == 0 && budget.exhausted() {
                return Err(Error::new(ErrorKind::Budget, "time budget spent in the modular parametrisation"));
            }
            if n < m {
                let nr = sr.mul(qr).add(si.mul(qi).neg());
                let ni = sr.mul(qi).add(si.mul(qr));
                sr = nr;
                si = ni;
            }
            let an = a[n];
            if an != 0 {
                sr = sr.add(Dd::ratio(an, n as i64));
            }
        }
        let nr = sr.mul(qr).add(si.mul(qi).neg());
        let ni = sr.mul(qi).add(si.mul(qr));
        if p.twice_real {
            tre = tre.add(nr).add(nr);
        } else {
            tre = tre.add(nr);
            tim = tim.add(ni);
        }
    }
    Ok(Cx::new(tre.to_float(wp), tim.to_float(wp)))
}

/// The largest precision the double-double sum reaches for these forms
/// (106 bits less the rounding growth over the terms and a margin).
pub(crate) fn double_double_capacity(forms: &[QuadraticForm], d: i64) -> u64 {
    let total: usize = forms.iter().map(|f| terms_needed(f.a as f64, (-d) as f64, 90)).sum();
    // rounding errors of the Horner steps add up like a random walk in
    // practice (sqrt of the count); a shortfall only costs a retry, as
    // every point is verified exactly
    let loss = ((total.max(2) as f64).log2() / 2.0).ceil() as u64 + 4;
    104u64.saturating_sub(loss + 8).max(32)
}

/// The number of terms for an absolute error below `2^-(prec+8)` at a
/// Heegner point with first coefficient `a` and discriminant `-abs_d`.
pub(crate) fn terms_needed(a: f64, abs_d: f64, prec: u64) -> usize {
    let decay = std::f64::consts::PI * abs_d.sqrt() / a; // -log |q|
    let q = (-decay).exp();
    let target = (prec as f64 + 8.0) * std::f64::consts::LN_2 + (2.0 / (1.0 - q)).ln();
    (target / decay).ceil().max(1.0) as usize
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::curve::Curve;
    use crate::heights::elliptic::{square_denominator_convergents, Lattice};
    use crate::heights::PeriodLattice;

    /// ℘ on the lattice of y^2 + y = x^3 - x at the elliptic logarithm of a
    /// point is its x-coordinate plus b2/12: checked by mapping the points
    /// (0, 0), (1, 0), (2, -3) through numerical z values found by
    /// bisection is too long a detour; instead check the differential
    /// equation's consequence that ℘(w1/2) is a root e_i of 4x^3 - g2 x - g3,
    /// here of 4x^3 + b2 x^2 + 2 b4 x + b6 after the shift by b2/12.
    #[test]
    fn half_period_is_a_two_division_root() {
        let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
        let prec = 128;
        let l = PeriodLattice::compute(&e, prec).unwrap();
        let lat = Lattice::new(&l, prec);
        let half = Cx::real(&l.omega1 / fi(2, prec));
        let p = lat.weierstrass_p(&half);
        // b2 = 0 here: x = ℘; 4x^3 - 4x + 1 = 0 (b4 = -2, b6 = 1)
        let x = p.re.clone();
        let f = fi(4, prec) * &x * &x * &x - fi(4, prec) * &x + fi(1, prec);
        assert!(to_f64(&f).abs() < 1e-30, "{}", to_f64(&f));
        assert!(to_f64(&p.im).abs() < 1e-30);
    }

    /// The segmented sum (falling precision) equals the plain Horner sum at
    /// full precision throughout, to the precision asked, for the Heegner
    /// forms of y^2 + y = x^3 - x (conductor 37, Cremona 1997, Table 1) at
    /// D = -139 (any fundamental D with 37 split works) and several
    /// precisions that cross the machine-word table (up to 1400 bits).
    #[test]
    fn segments_of_falling_precision_equal_the_plain_sum() {
        let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
        let work = crate::budget::Work::unlimited();
        let bad = crate::local::CurveData::new(&e, &work).unwrap().bad_prime_traces().unwrap();
        let hs = crate::heegner::heegner_discriminants(37, 2).unwrap();
        let mut checked = 0;
        for h in hs {
            for prec in [150u64, 700, 1400] {
                let m = h.forms.iter().map(|f| terms_needed(f.a as f64, (-h.discriminant) as f64, prec)).max().unwrap();
                let a = super::super::traces::dirichlet_coefficients_fast(&e, &bad, m + 1, &|| false).unwrap();
                for f in &h.forms {
                    let z = form_sum(&a, f, h.discriminant, prec, &work).unwrap();
                    let mf = terms_needed(f.a as f64, (-h.discriminant) as f64, prec);
                    let fb = prec + 64;
                    let wp = fb + 64;
                    let q = {
                        let pi = pi(wp);
                        let r = exp(&-(&pi * sqrt(&fi(-h.discriminant, wp), wp) / fz(&Integer::from(f.a), wp)), wp);
                        let t = expi(&-(&pi * fz(&Integer::from(f.b), wp) / fz(&Integer::from(f.a), wp)), wp);
                        Cx::new(&r * &t.re, &r * &t.im)
                    };
                    let (re, im) = segment_in_integers(&a, 1, mf, &q, fb, &work).unwrap();
                    let scale = Rational::from(Integer::ONE << fb);
                    let plain = Cx::new(Float::from_rational_prec(Rational::from(re) / &scale, wp).0, Float::from_rational_prec(Rational::from(im) / &scale, wp).0);
                    let diff = z.sub(&plain);
                    let err = to_f64(&diff.re).abs().max(to_f64(&diff.im).abs());
                    assert!(err == 0.0 || err.log2() < -(prec as f64), "D = {}, {f:?}, {prec} bits: error 2^{}", h.discriminant, err.log2());
                    checked += 1;
                }
            }
        }
        assert!(checked >= 6);
    }

    #[test]
    fn convergents_find_a_square_denominator() {
        let x = Float::from_rational_prec(Rational::from_signeds(1234567i64, 10201), 200).0; // 101^2
        let tol = Rational::from_signeds(1i64, 1_000_000_000_000i64);
        let c = square_denominator_convergents(&x, &tol, 500);
        assert!(c.contains(&Rational::from_signeds(1234567i64, 10201)));
    }
}
