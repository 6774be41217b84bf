//! Real and complex multiprecision helpers (malachite `Float`), the roots
//! of the 2-division cubic and the period lattice by the arithmetic-geometric
//! mean.

use crate::curve::Curve;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::Abs;
use malachite::base::num::basic::traits::Zero;
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::num::logic::traits::SignificantBits;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Float, Integer, Rational};

/// A Float at precision `prec` from a rational.
pub(crate) fn fq(x: &Rational, prec: u64) -> Float {
    Float::from_rational_prec_ref(x, prec).0
}

/// A Float at precision `prec` from an integer.
pub(crate) fn fz(x: &Integer, prec: u64) -> Float {
    Float::from_rational_prec(Rational::from(x.clone()), prec).0
}

/// A Float at precision `prec` from a small integer.
pub(crate) fn fi(x: i64, prec: u64) -> Float {
    Float::from_signed_prec(x, prec).0
}

/// The nearest f64 (saturating to infinity for huge values).
pub(crate) fn to_f64(x: &Float) -> f64 {
    f64::rounding_from(x, RoundingMode::Nearest).0
}

/// The natural logarithm of a positive Float.
pub(crate) fn ln(x: &Float, prec: u64) -> Float {
    x.ln_prec_ref(prec).0
}

/// The natural logarithm of a positive rational, at precision `prec`.
pub(crate) fn ln_q(x: &Rational, prec: u64) -> Float {
    Float::ln_rational_prec_ref(x, prec).0
}

pub(crate) fn sqrt(x: &Float, prec: u64) -> Float {
    x.sqrt_prec_ref(prec).0
}

pub(crate) fn pi(prec: u64) -> Float {
    Float::pi_prec(prec).0
}

pub(crate) fn abs(x: &Float) -> Float {
    x.abs()
}

/// A complex number with Float parts.
#[derive(Clone, Debug)]
pub(crate) struct Cx {
    pub(crate) re: Float,
    pub(crate) im: Float,
}

impl Cx {
    pub fn new(re: Float, im: Float) -> Cx {
        Cx { re, im }
    }
    pub fn real(re: Float) -> Cx {
        Cx { re, im: Float::ZERO }
    }
    pub fn add(&self, o: &Cx) -> Cx {
        Cx::new(&self.re + &o.re, &self.im + &o.im)
    }
    pub fn sub(&self, o: &Cx) -> Cx {
        Cx::new(&self.re - &o.re, &self.im - &o.im)
    }
    pub fn mul(&self, o: &Cx) -> Cx {
        Cx::new(&self.re * &o.re - &self.im * &o.im, &self.re * &o.im + &self.im * &o.re)
    }
    pub fn norm2(&self) -> Float {
        &self.re * &self.re + &self.im * &self.im
    }
    pub fn abs(&self, prec: u64) -> Float {
        sqrt(&self.norm2(), prec)
    }
    pub fn div(&self, o: &Cx) -> Cx {
        let n = o.norm2();
        Cx::new(
            (&self.re * &o.re + &self.im * &o.im) / &n,
            (&self.im * &o.re - &self.re * &o.im) / &n,
        )
    }
    /// The principal square root (real part >= 0).
    pub fn sqrt(&self, prec: u64) -> Cx {
        if self.im == 0u32 {
            if self.re >= 0u32 {
                return Cx::real(sqrt(&self.re, prec));
            }
            return Cx::new(Float::ZERO, sqrt(&-&self.re, prec));
        }
        let r = self.abs(prec);
        let two = fi(2, prec);
        if self.re >= 0u32 {
            let a = sqrt(&((&r + &self.re) / &two), prec);
            let b = &self.im / (&two * &a);
            Cx::new(a, b)
        } else {
            let mut b = sqrt(&((&r - &self.re) / &two), prec);
            if self.im < 0u32 {
                b = -b;
            }
            let a = &self.im / (&two * &b);
            Cx::new(a, b)
        }
    }
}

/// The three complex roots of the monic cubic `x^3 + c2 x^2 + c1 x + c0`
/// (Weierstrass-Durand-Kerner iteration, started in f64 when the
/// coefficients fit, then refined at precision `prec`).
pub(crate) fn cubic_roots(c2: &Float, c1: &Float, c0: &Float, prec: u64) -> Result<[Cx; 3], Error> {
    let eval = |z: &Cx| -> Cx {
        let t = z.add(&Cx::real(c2.clone()));
        let t = t.mul(z).add(&Cx::real(c1.clone()));
        t.mul(z).add(&Cx::real(c0.clone()))
    };
    let bound = 1.0 + to_f64(&abs(c2)).max(to_f64(&abs(c1)).max(to_f64(&abs(c0))).cbrt());
    let mut z: [Cx; 3] = if bound.is_finite() {
        let mut w = f64_durand_kerner(to_f64(c2), to_f64(c1), to_f64(c0), bound);
        if w.iter().any(|(a, b)| !a.is_finite() || !b.is_finite()) {
            w = [(0.4 * bound, 0.9 * bound), (-0.65 * bound, 0.72 * bound), (-0.5 * bound, -0.9 * bound)];
        }
        w.map(|(a, b)| Cx::new(Float::from_primitive_float_prec(a, prec).0, Float::from_primitive_float_prec(b, prec).0))
    } else {
        return Err(Error::new(ErrorKind::TooLarge, "curve coefficients too large for the period computation"));
    };
    let tol = bound * 2f64.powi(-(prec as i32) + 8);
    for _ in 0..(prec + 200) {
        let mut maxd = 0f64;
        for i in 0..3 {
            let mut den = Cx::real(fi(1, prec));
            for j in 0..3 {
                if j != i {
                    den = den.mul(&z[i].sub(&z[j]));
                }
            }
            if den.norm2() == 0u32 {
                return Err(Error::new(ErrorKind::InvalidValue, "cubic with a repeated root"));
            }
            let d = eval(&z[i]).div(&den);
            maxd = maxd.max(to_f64(&d.abs(prec)));
            z[i] = z[i].sub(&d);
        }
        if maxd <= tol {
            break;
        }
    }
    Ok(z)
}

fn f64_durand_kerner(c2: f64, c1: f64, c0: f64, bound: f64) -> [(f64, f64); 3] {
    type C = (f64, f64);
    let mul = |a: C, b: C| (a.0 * b.0 - a.1 * b.1, a.0 * b.1 + a.1 * b.0);
    let sub = |a: C, b: C| (a.0 - b.0, a.1 - b.1);
    let div = |a: C, b: C| {
        let n = b.0 * b.0 + b.1 * b.1;
        ((a.0 * b.0 + a.1 * b.1) / n, (a.1 * b.0 - a.0 * b.1) / n)
    };
    let eval = |z: C| {
        let t = (z.0 + c2, z.1);
        let t = mul(t, z);
        let t = (t.0 + c1, t.1);
        let t = mul(t, z);
        (t.0 + c0, t.1)
    };
    let mut z = [(0.4 * bound, 0.9 * bound), (-0.65 * bound, 0.72 * bound), (-0.5 * bound, -0.9 * bound)];
    for _ in 0..500 {
        for i in 0..3 {
            let mut den = (1.0, 0.0);
            for j in 0..3 {
                if j != i {
                    den = mul(den, sub(z[i], z[j]));
                }
            }
            z[i] = sub(z[i], div(eval(z[i]), den));
        }
    }
    z
}

/// The period lattice of the Néron differential `dx / (2y + a1 x + a3)` of a
/// Weierstrass model, with a basis `omega1` (real, the least positive real
/// period) and `omega2` (with positive imaginary part; purely imaginary when
/// the discriminant is positive, real part `omega1 / 2` when it is
/// negative), computed with the arithmetic-geometric mean at a requested
/// precision in bits (numerical).
///
/// ```
/// use twofold::Curve;
/// use twofold::heights::PeriodLattice;
/// // y^2 + y = x^3 - x^2 - 10x - 20 (published tables, Cremona 1997): real period 1.26920930... (from memory)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let l = PeriodLattice::compute(&e, 64).unwrap();
/// assert!((l.real_period_f64() - 1.2692093).abs() < 1e-6);
/// assert_eq!(l.real_components, 1);
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct PeriodLattice {
    /// The least positive real period.
    pub omega1: malachite::Float,
    /// The real part of the second basis period.
    pub omega2_re: malachite::Float,
    /// The imaginary part (> 0) of the second basis period.
    pub omega2_im: malachite::Float,
    /// The number of connected components of E(R): 2 if the discriminant
    /// is positive, else 1.
    pub real_components: u32,
    /// The precision in bits asked for.
    pub precision: u64,
}

impl PeriodLattice {
    /// Computes the lattice of `curve` to about `precision` bits.
    pub fn compute(curve: &Curve, precision: u64) -> Result<PeriodLattice, Error> {
        let wp = precision + 40 + curve.discriminant().significant_bits();
        let [b2, b4, b6, _] = curve.b_invariants();
        let four = fi(4, wp);
        let c2 = fz(b2, wp) / &four;
        let c1 = fz(b4, wp) / fi(2, wp);
        let c0 = fz(b6, wp) / &four;
        let roots = cubic_roots(&c2, &c1, &c0, wp)?;
        let pi = pi(wp);
        let positive = *curve.discriminant() > 0u32;
        if positive {
            let mut e: Vec<Float> = roots.iter().map(|z| z.re.clone()).collect();
            e.sort_by(|a, b| b.partial_cmp(a).unwrap_or(std::cmp::Ordering::Equal));
            let s13 = sqrt(&(&e[0] - &e[2]), wp);
            let s12 = sqrt(&(&e[0] - &e[1]), wp);
            let s23 = sqrt(&(&e[1] - &e[2]), wp);
            let omega1 = &pi / s13.agm_prec_ref_ref(&s12, wp).0;
            let omega2_im = &pi / s13.agm_prec_ref_ref(&s23, wp).0;
            Ok(PeriodLattice { omega1, omega2_re: Float::ZERO, omega2_im, real_components: 2, precision })
        } else {
            let mut idx: Vec<usize> = (0..3).collect();
            idx.sort_by(|&i, &j| abs(&roots[i].im).partial_cmp(&abs(&roots[j].im)).unwrap_or(std::cmp::Ordering::Equal));
            let e1 = roots[idx[0]].re.clone();
            let e2 = if roots[idx[1]].im > 0u32 { roots[idx[1]].clone() } else { roots[idx[2]].clone() };
            // omega1 = 2 * int_{e1}^oo dx / sqrt(4 (x - e1)(x - e2)(x - e3)).
            let z = Cx::real(e1.clone()).sub(&e2).sqrt(wp);
            let omega1 = &pi / z.re.agm_prec_ref_ref(&z.abs(wp), wp).0;
            // The purely imaginary cycle below e1: the same integral for -x.
            let w = e2.sub(&Cx::real(e1)).sqrt(wp);
            let y = &pi / w.re.agm_prec_ref_ref(&w.abs(wp), wp).0;
            let half = Float::from(0.5f64);
            Ok(PeriodLattice { omega2_re: &omega1 * &half, omega1, omega2_im: y * half, real_components: 1, precision })
        }
    }

    /// The real period `Omega = c_inf * omega1` with `c_inf` the number of
    /// connected components of E(R): the integral of `|dx / (2y + a1 x + a3)|`
    /// over E(R), the factor entering the Birch and Swinnerton-Dyer formula
    /// when the model is minimal.
    pub fn real_period(&self) -> Float {
        &self.omega1 * Float::from(self.real_components)
    }

    /// [`PeriodLattice::real_period`] as an f64.
    pub fn real_period_f64(&self) -> f64 {
        to_f64(&self.real_period())
    }
}
