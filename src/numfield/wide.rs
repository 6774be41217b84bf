//! Products of field elements with exponents of any size: the form in
//! which the class-group computation hands out units when their
//! exponents pass 64 bits (J. Buchmann, 1990, and H. Cohen, GTM 193,
//! §7.1: units kept as power products, never expanded). The log embedding
//! is computed at the precision the exponents need; the norm is checked
//! exactly on a coprime base of the factors' norms, without expanding.

use super::classgroup::CompactProduct;
use super::field::{Element, NumberField};
use super::precise::PreciseLogs;
use malachite::base::num::arithmetic::traits::{Gcd, Sign};
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Natural};
use std::cmp::Ordering;

/// A product `prod base_i^exp_i` with exponents in [`Integer`].
///
/// ```
/// use malachite::base::num::arithmetic::traits::Pow;
/// use malachite::Integer;
/// use twofold::numfield::{NumberField, WideProduct};
/// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
/// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
/// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, a unit
/// let big = Integer::from(10u32).pow(30);
/// let p = WideProduct::new(vec![(u.clone(), big.clone())]);
/// assert_eq!(p.is_unit(&k), true);
/// assert!(p.to_compact().is_none()); // 10^30 passes 64 bits
/// let l = p.log_embedding(&k); // 10^30 log|2^(1/3) - 1| at the real place
/// assert!((l[0] / 1e30 - (2f64.cbrt() - 1.0).ln()).abs() < 1e-12);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct WideProduct {
    /// The factors and their exponents.
    pub factors: Vec<(Element, Integer)>,
}

impl WideProduct {
    /// The product of the given factors.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{NumberField, WideProduct};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, norm 1 (hand computation)
    /// let p = WideProduct::new(vec![(u.clone(), Integer::from(2)), (k.generator(), Integer::from(-3))]);
    /// assert_eq!(p.exponent_bits(), 2);
    /// ```
    pub fn new(factors: Vec<(Element, Integer)>) -> WideProduct {
        WideProduct { factors }
    }

    /// The same product with word-size exponents, when they all fit.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{NumberField, WideProduct};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, norm 1 (hand computation)
    /// let p = WideProduct::new(vec![(u.clone(), Integer::from(5))]);
    /// assert_eq!(p.to_compact().unwrap().factors, vec![(u, 5)]);
    /// ```
    pub fn to_compact(&self) -> Option<CompactProduct> {
        let factors = self.factors.iter().map(|(b, e)| Some((b.clone(), i64::try_from(e).ok()?))).collect::<Option<Vec<_>>>()?;
        Some(CompactProduct { factors })
    }

    /// The largest `|exp_i|` in bits.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{NumberField, WideProduct};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, norm 1 (hand computation)
    /// let p = WideProduct::new(vec![(u, Integer::from(-1000))]);
    /// assert_eq!(p.exponent_bits(), 10); // 1000 < 2^10
    /// ```
    pub fn exponent_bits(&self) -> u64 {
        use malachite::base::num::logic::traits::SignificantBits;
        self.factors.iter().map(|(_, e)| e.significant_bits()).max().unwrap_or(0)
    }

    /// The logarithmic embedding `sum exp_i Log(base_i)`, accurate to
    /// about `1e-15` relative to the largest term (the logs are taken at
    /// the precision the exponents need).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{NumberField, WideProduct};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, norm 1 (hand computation)
    /// let p = WideProduct::new(vec![(u, Integer::from(3))]);
    /// let l = p.log_embedding(&k); // real place, then the complex one (doubled): sum 0
    /// assert!((l[0] - 3.0 * (2f64.cbrt() - 1.0).ln()).abs() < 1e-12);
    /// assert!((l[0] + l[1]).abs() < 1e-12);
    /// ```
    pub fn log_embedding(&self, k: &NumberField) -> Vec<f64> {
        let elems: Vec<Element> = self.factors.iter().map(|(b, _)| b.clone()).collect();
        let exps: Vec<(usize, Integer)> = self.factors.iter().enumerate().map(|(i, (_, e))| (i, e.clone())).collect();
        let mag: f64 = self.factors.iter().map(|(b, e)| {
            let l = k.log_embedding(b).iter().fold(1.0f64, |a, x| a.max(x.abs()));
            f64::rounding_from(e, RoundingMode::Nearest).0.abs() * l
        }).sum();
        let prec = mag.max(1.0).log2().ceil() as u64 + 64;
        PreciseLogs::new().combination(k, &elems, &exps, prec)
    }

    /// Whether the norm of the product is `1` or `-1`, decided exactly:
    /// the factors' norms are split over a coprime base and the exponent
    /// of every base element must sum to zero.
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::numfield::{NumberField, WideProduct};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3))
    /// let u = k.element(&z(&[-1, 1, 0])).unwrap(); // 2^(1/3) - 1, norm 1 (hand computation)
    /// assert!(WideProduct::new(vec![(u.clone(), Integer::from(7))]).is_unit(&k));
    /// // 2^(1/3) has norm 2: not a unit, but its cube over 2 is
    /// let t = k.generator();
    /// assert!(!WideProduct::new(vec![(t.clone(), Integer::from(1))]).is_unit(&k));
    /// let two = k.add(&k.one(), &k.one());
    /// assert!(WideProduct::new(vec![(t, Integer::from(3)), (two, Integer::from(-1))]).is_unit(&k));
    /// ```
    pub fn is_unit(&self, k: &NumberField) -> bool {
        let norms: Vec<(Natural, Natural)> = self.factors.iter().map(|(b, _)| {
            let n = k.norm(b);
            (n.numerator_ref().clone(), n.denominator_ref().clone())
        }).collect();
        let mut pieces: Vec<Natural> = Vec::new();
        for (a, b) in &norms {
            pieces.push(a.clone());
            pieces.push(b.clone());
        }
        let base = coprime_base(pieces);
        base.iter().all(|q| {
            let mut total = Integer::from(0);
            for ((a, b), (_, e)) in norms.iter().zip(&self.factors) {
                let v = valuation(a, q) as i64 - valuation(b, q) as i64;
                total += Integer::from(v) * e;
            }
            total.sign() == Ordering::Equal
        })
    }
}

/// The exponent of `q > 1` in `a > 0`.
fn valuation(a: &Natural, q: &Natural) -> u64 {
    let mut a = a.clone();
    let mut v = 0;
    while a > 0u32 && (&a % q) == 0u32 {
        a /= q;
        v += 1;
    }
    v
}

/// A coprime base of the given positive integers: pairwise coprime
/// integers `> 1` such that each input is a product of their powers (found
/// by splitting with gcds until no two share a factor).
pub(crate) fn coprime_base(xs: Vec<Natural>) -> Vec<Natural> {
    let mut base: Vec<Natural> = Vec::new();
    let mut todo: Vec<Natural> = xs.into_iter().filter(|x| *x > 1u32).collect();
    while let Some(x) = todo.pop() {
        if x <= 1u32 {
            continue;
        }
        let mut split = false;
        for i in 0..base.len() {
            let g = (&x).gcd(&base[i]);
            if g > 1u32 {
                let b = base.swap_remove(i);
                let (x1, b1) = (&x / &g, &b / &g);
                todo.push(g);
                todo.push(x1);
                todo.push(b1);
                split = true;
                break;
            }
        }
        if !split && !base.contains(&x) {
            base.push(x);
        }
    }
    base.sort();
    base.dedup();
    base
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coprime_base_is_coprime_and_spans() {
        // two ways: pairwise gcds are 1, and every input is a product of base powers
        let xs: Vec<Natural> = [12u64, 18, 35, 49, 1001, 2u64.pow(40) * 3, 97 * 89].iter().map(|&x| Natural::from(x)).collect();
        let base = coprime_base(xs.clone());
        for (i, a) in base.iter().enumerate() {
            for b in &base[i + 1..] {
                assert_eq!(a.gcd(b), 1u32);
            }
        }
        for x in xs {
            let mut y = x.clone();
            for q in &base {
                while (&y % q) == 0u32 {
                    y /= q;
                }
            }
            assert_eq!(y, 1u32, "{x}");
        }
    }
}
