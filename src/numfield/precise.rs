//! Logarithmic embeddings at any precision (malachite `Float`), for units
//! given as products whose exponents are too large for f64 logs: the log
//! embedding of `prod a_i^e_i` is `sum e_i Log(a_i)`, and its absolute
//! error is about `sum |e_i| |Log(a_i)|` times the relative error of the
//! logs, so the logs are computed with `log2 sum |e_i| |Log a_i|` bits
//! more than the answer needs (H. Cohen, GTM 138, §4.9.3 and §5.8: the
//! error of products of many factors; J. Buchmann, 1990: units kept as
//! products).
//!
//! The roots of the defining polynomial are refined by Newton's method
//! from the f64 roots the field keeps (quadratic convergence: each step
//! doubles the correct bits), elements are evaluated at them by Horner's
//! rule with the loss of bits to cancellation estimated from f64 and added
//! to the working precision.

use super::field::{Element, NumberField};
use crate::heights::real::{fi, fq, fz, ln, to_f64, Cx};
use malachite::base::num::basic::traits::Zero;
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Float, Integer};

/// Precision cap (bits) of the logarithms: a product that would need more
/// is refused by the caller.
pub(crate) const MAX_LOG_BITS: u64 = 1 << 14;

/// The roots of the field at one precision and the logs of stored
/// elements computed with them (a cache indexed by the caller's numbering).
pub(crate) struct PreciseLogs {
    prec: u64,
    roots: Vec<Cx>,
    /// `log 2` at the precision of the last call of [`ln_cached`] (malachite's
    /// logarithm recomputes it on every call: most of the time spent here).
    ln2: Option<(u64, Float)>,
    cache: Vec<Option<(u64, Vec<Float>)>>,
}

impl PreciseLogs {
    pub(crate) fn new() -> PreciseLogs {
        PreciseLogs { prec: 0, roots: Vec::new(), ln2: None, cache: Vec::new() }
    }

    fn ensure_roots(&mut self, k: &NumberField, prec: u64) {
        if prec <= self.prec {
            return;
        }
        let prec = prec.max(2 * self.prec).max(128);
        self.roots = refined_roots(k, prec);
        self.prec = prec;
    }

    /// `Log(a)` with about `prec` correct bits after the point (relative
    /// to `max(1, |Log a|)`); `idx` names `a` in the cache.
    pub(crate) fn log_of(&mut self, k: &NumberField, a: &Element, idx: usize, prec: u64) -> Vec<Float> {
        if let Some(Some((p, v))) = self.cache.get(idx) {
            if *p >= prec {
                return v.clone();
            }
        }
        let c = k.to_power_basis(a);
        // bits lost to cancellation in the Horner sum (f64 estimate)
        let cf: Vec<f64> = c.iter().map(|x| f64::rounding_from(x, RoundingMode::Nearest).0.abs()).collect();
        let mut loss = 0.0f64;
        for (&(re, im), e) in k.roots().0.iter().zip(k.embeddings(a)) {
            let r = (re * re + im * im).sqrt();
            let size: f64 = cf.iter().enumerate().map(|(j, x)| x * (j as f64 + 1.0) * r.powi(j as i32)).sum();
            let val = (e.0 * e.0 + e.1 * e.1).sqrt();
            if val > 0.0 && size.is_finite() {
                loss = loss.max((size / val).log2());
            } else {
                loss = loss.max(64.0);
            }
        }
        let work = prec + loss.max(0.0).ceil() as u64 + 32;
        self.ensure_roots(k, work);
        let coeffs: Vec<Float> = c.iter().map(|x| fq(x, work)).collect();
        let out: Vec<Float> = self.roots.iter().enumerate().map(|(i, z)| {
            let mut s = Cx::real(fi(0, work));
            for cj in coeffs.iter().rev() {
                s = s.mul(z).add(&Cx::real(cj.clone()));
            }
            // log |s|^2: halved at real places, as is at complex ones (e_i = 2)
            let l2 = ln_cached(&s.norm2(), work, &mut self.ln2);
            if i < k.r1 { l2 / fi(2, work) } else { l2 }
        }).collect();
        if self.cache.len() <= idx {
            self.cache.resize(idx + 1, None);
        }
        self.cache[idx] = Some((prec, out.clone()));
        out
    }

    /// `sum e_i Log(elems[i])` with absolute error about `2^-prec` times
    /// `sum |e_i| max(1, |Log elems[i]|)`.
    pub(crate) fn combination(&mut self, k: &NumberField, elems: &[Element], exps: &[(usize, Integer)], prec: u64) -> Vec<f64> {
        let m = k.r1 + k.r2;
        // whole blocks of 256 bits, so that growing exponents reuse the cache
        let prec = prec.div_ceil(256) * 256;
        let mut acc: Vec<Float> = vec![fi(0, prec); m];
        for (i, e) in exps {
            let l = self.log_of(k, &elems[*i], *i, prec);
            let ef = fz(e, prec);
            for (x, y) in acc.iter_mut().zip(&l) {
                *x += &ef * y;
            }
        }
        acc.iter().map(to_f64).collect()
    }
}

/// Square roots taken in [`ln_cached`] before the series.
const LN_HALVINGS: u32 = 8;

/// `log x` for a positive `x` with about `prec` correct bits (relative to
/// `max(1, |log x|)`): `x = m 2^e`, `m` in `[1/2, 1)`, `m` brought near 1 by
/// [`LN_HALVINGS`] square roots, then `log m = 2^(k+1) atanh(z)`,
/// `z = (y - 1) / (y + 1)`, by its series (`|z| < 2^-9`: about 18 bits a
/// term), plus `e log 2` with `log 2` computed once per precision.
pub(crate) fn ln_cached(x: &Float, prec: u64, ln2: &mut Option<(u64, Float)>) -> Float {
    let w = prec + 64;
    let Some(e) = x.get_exponent() else { return ln(x, prec) };
    if *x <= 0u32 {
        return ln(x, prec);
    }
    if ln2.as_ref().is_none_or(|(p, _)| *p < w) {
        *ln2 = Some((w, Float::ln_2_prec(w).0));
    }
    let l2 = &ln2.as_ref().map(|(_, f)| f.clone()).unwrap_or_default();
    let mut y = Float::from_float_prec_ref(x, w).0 >> e;
    for _ in 0..LN_HALVINGS {
        y = y.sqrt_prec_ref(w).0;
    }
    let one = fi(1, w);
    let z = (&y - &one).div_prec_ref_ref(&(&y + &one), w).0;
    let z2 = &z * &z;
    let mut t = z.clone();
    let mut sum = z;
    let mut n = 1i64;
    loop {
        t *= &z2;
        n += 2;
        let term = t.div_prec_ref_ref(&fi(n, w), w).0;
        let small = term == 0u32 || term.get_exponent().is_none_or(|te| i64::from(te) < -(w as i64));
        sum += term;
        if small {
            break;
        }
    }
    let lm = sum << (LN_HALVINGS + 1);
    let out = lm + Float::from_float_prec_ref(l2, w).0 * fi(i64::from(e), w);
    Float::from_float_prec(out, prec).0
}

/// The roots of the field's polynomial (in the order of
/// [`NumberField::roots`]) to `prec` bits, by Newton's method.
pub(crate) fn refined_roots(k: &NumberField, prec: u64) -> Vec<Cx> {
    let f: Vec<Float> = k.polynomial().iter().map(|c| fz(c, prec)).collect();
    let steps = (prec as f64 / 30.0).log2().ceil().max(1.0) as usize + 3;
    k.roots().0.iter().map(|&(re, im)| {
        let mut z = Cx::new(Float::from_primitive_float_prec(re, prec).0, Float::from_primitive_float_prec(im, prec).0);
        for _ in 0..steps {
            let mut v = Cx::real(fi(0, prec));
            let mut d = Cx::real(fi(0, prec));
            for c in f.iter().rev() {
                d = d.mul(&z).add(&v);
                v = v.mul(&z).add(&Cx::real(c.clone()));
            }
            if d.norm2() == Float::ZERO {
                break;
            }
            z = z.sub(&v.div(&d));
        }
        z
    }).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cached_logarithm_agrees_with_the_library_one() {
        // two ways: the halving-and-series logarithm against malachite's
        let mut ln2 = None;
        for prec in [64u64, 200, 700, 3000] {
            for (num, sh) in [(3i64, 0i64), (1, 0), (123456789, -40), (987654321, 300), (5, -2000), (999_999_937, 1)] {
                let x = fi(num, prec + 64) << sh;
                let a = ln_cached(&x, prec, &mut ln2);
                let b = ln(&x, prec + 64);
                let diff = &a - &b;
                let scale = to_f64(&b).abs().max(1.0).log2().ceil() as i64;
                // |a - b| <= 2^(scale - prec + 4), read off the exponent (no f64 underflow)
                let ok = diff == 0u32 || diff.get_exponent().is_some_and(|e| i64::from(e) <= scale - prec as i64 + 4);
                assert!(ok, "{num} << {sh} at {prec}: {:?}", diff.get_exponent());
            }
        }
    }
    use malachite::base::num::arithmetic::traits::Abs;

    #[test]
    fn precise_logs_agree_with_f64_and_sum_to_the_norm() {
        // two ways: the f64 log embedding, and the exact log |N(a)| (the logs sum to it)
        for f in [vec![-2i64, 0, 0, 1], vec![-1, -1, 0, 1], vec![5, 0, 1], vec![1, -3, -1, 1], vec![56789, 1234, 0, 1]] {
            let fz_: Vec<Integer> = f.iter().map(|&c| Integer::from(c)).collect();
            let k = NumberField::new(&fz_).unwrap();
            let mut pl = PreciseLogs::new();
            let elems: Vec<Element> = (1..6i64).map(|t| {
                let c: Vec<Integer> = (0..k.degree()).map(|j| Integer::from((t * 7 + 3 * j as i64) % 11 - 5)).collect();
                k.element(&c).unwrap()
            }).collect();
            for (i, a) in elems.iter().enumerate() {
                if a.is_zero() {
                    continue;
                }
                let l = pl.log_of(&k, a, i, 300);
                let lf = k.log_embedding(a);
                for (x, y) in l.iter().zip(&lf) {
                    assert!((to_f64(x) - y).abs() < 1e-8 * (1.0 + y.abs()), "{f:?} {a:?}");
                }
                let mut s = fi(0, 300);
                for x in &l {
                    s += x;
                }
                let n = k.norm(a).abs();
                let exact = crate::heights::real::ln_q(&n, 300);
                let diff = to_f64(&(s - exact)).abs();
                assert!(diff < 1e-70, "{f:?} {diff}");
            }
        }
    }
}
