//! Local data of an elliptic curve at a prime: Kodaira symbol, conductor
//! exponent, Tamagawa number and reduction type, by Tate's algorithm
//! (Tate 1975; Silverman, *Advanced Topics in the Arithmetic of Elliptic
//! Curves*, IV.9; Cremona, *Algorithms for Modular Elliptic Curves*, 3.2),
//! and the conductor and Tamagawa product built from them.
//!
//! [`CurveData`] holds all of it for one curve, built once per analysis; it
//! also owns the minimal model and the change to it (minimal models are
//! decided by Tate's algorithm, so they live here). The free functions take
//! a list of primes: those that need every bad prime check that the list
//! covers the discriminant and return an error otherwise.

mod data;
mod minimal;
mod modp;
#[cfg(feature = "serde")]
mod serde_forms;
mod tate;

pub use data::CurveData;
pub(crate) use tate::tate;

use crate::arith::{is_prime_u64, valuation};
use crate::curve::Curve;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{DivisibleBy, ModPow, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural};
use std::fmt;

/// The Kodaira symbol of the special fibre of the Néron model at a prime
/// (Silverman, *Advanced Topics*, IV.8 and Table 4.1).
///
/// ```
/// use twofold::local::Kodaira;
/// assert_eq!(Kodaira::In(5).to_string(), "I5");
/// assert_eq!(Kodaira::InStar(1).to_string(), "I1*");
/// assert_eq!(Kodaira::IVStar.to_string(), "IV*");
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Kodaira {
    /// Good reduction.
    I0,
    /// Multiplicative reduction, `n >= 1` components in a cycle.
    In(u32),
    /// A cusp (one component).
    II,
    /// Two components tangent at a point.
    III,
    /// Three components through one point.
    IV,
    /// Type I0* (five components).
    I0Star,
    /// Type In* with `n >= 1` (`n + 5` components).
    InStar(u32),
    /// Type IV* (seven components).
    IVStar,
    /// Type III* (eight components).
    IIIStar,
    /// Type II* (nine components).
    IIStar,
}

impl Kodaira {
    /// The number of irreducible components of the special fibre over the
    /// algebraic closure, the `m` in Ogg's formula
    /// `f = v(Delta_min) - m + 1` (Silverman, *Advanced Topics*, IV.11.1).
    ///
    /// ```
    /// use twofold::local::Kodaira;
    /// assert_eq!(Kodaira::In(5).components(), 5);
    /// assert_eq!(Kodaira::InStar(2).components(), 7);
    /// assert_eq!(Kodaira::II.components(), 1);
    /// ```
    pub fn components(&self) -> u32 {
        match *self {
            Kodaira::I0 | Kodaira::II => 1,
            Kodaira::In(n) => n,
            Kodaira::III => 2,
            Kodaira::IV => 3,
            Kodaira::I0Star => 5,
            Kodaira::InStar(n) => n + 5,
            Kodaira::IVStar => 7,
            Kodaira::IIIStar => 8,
            Kodaira::IIStar => 9,
        }
    }
}

impl fmt::Display for Kodaira {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Kodaira::I0 => write!(f, "I0"),
            Kodaira::In(n) => write!(f, "I{n}"),
            Kodaira::II => write!(f, "II"),
            Kodaira::III => write!(f, "III"),
            Kodaira::IV => write!(f, "IV"),
            Kodaira::I0Star => write!(f, "I0*"),
            Kodaira::InStar(n) => write!(f, "I{n}*"),
            Kodaira::IVStar => write!(f, "IV*"),
            Kodaira::IIIStar => write!(f, "III*"),
            Kodaira::IIStar => write!(f, "II*"),
        }
    }
}

/// The reduction type at a prime.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, local::{local_data, Reduction}};
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// assert_eq!(local_data(&e, &Natural::from(11u32)).unwrap().reduction, Reduction::SplitMultiplicative);
/// ```
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
pub enum Reduction {
    /// Good reduction.
    Good,
    /// Multiplicative reduction with the tangents at the node defined over F_p.
    SplitMultiplicative,
    /// Multiplicative reduction with the tangents conjugate over F_p.
    NonSplitMultiplicative,
    /// Additive reduction.
    Additive,
}

/// Written in words: "good", "split multiplicative", "non-split
/// multiplicative", "additive".
///
/// ```
/// use twofold::local::Reduction;
/// assert_eq!(Reduction::NonSplitMultiplicative.to_string(), "non-split multiplicative");
/// ```
impl fmt::Display for Reduction {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Reduction::Good => "good",
            Reduction::SplitMultiplicative => "split multiplicative",
            Reduction::NonSplitMultiplicative => "non-split multiplicative",
            Reduction::Additive => "additive",
        })
    }
}

/// The local data of a curve at one prime, as found by Tate's algorithm.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, local::{local_data, Kodaira}};
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let d = local_data(&e, &Natural::from(11u32)).unwrap();
/// assert_eq!((d.kodaira, d.conductor_exponent, d.tamagawa), (Kodaira::In(5), 1, 5));
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct LocalData {
    /// The prime p.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub prime: Natural,
    /// The Kodaira symbol.
    pub kodaira: Kodaira,
    /// The exponent of p in the conductor.
    pub conductor_exponent: u32,
    /// The Tamagawa number c_p = [E(Q_p) : E_0(Q_p)].
    pub tamagawa: u32,
    /// The reduction type.
    pub reduction: Reduction,
    /// The valuation at p of the minimal discriminant.
    pub minimal_valuation_disc: u32,
}

/// The local data of `curve` at the prime `p`. Any integral model will do:
/// the algorithm minimises at p itself. An error of kind
/// [`ErrorKind::InvalidValue`] when `p` is not prime.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, local::{local_data, Kodaira, Reduction}};
/// // y^2 = x^3 - x has conductor 32 and type III at 2 (Ogg: 5 = 6 - 2 + 1).
/// let e = Curve::from_coefficients([0, 0, 0, -1, 0]).unwrap();
/// let d = local_data(&e, &Natural::from(2u32)).unwrap();
/// assert_eq!(d.kodaira, Kodaira::III);
/// assert_eq!(d.conductor_exponent, 5);
/// assert_eq!(d.reduction, Reduction::Additive);
/// assert!(local_data(&e, &Natural::from(6u32)).is_err());
/// ```
pub fn local_data(curve: &Curve, p: &Natural) -> Result<LocalData, Error> {
    check_prime(p)?;
    Ok(tate(curve.coefficients(), curve.discriminant(), p).data)
}

/// The local data at every prime of bad reduction. `primes` must contain
/// every prime dividing the discriminant of this model (other primes are
/// allowed and skipped when they give good reduction); an error of kind
/// [`ErrorKind::InvalidValue`] otherwise, or when an entry is not prime.
/// The result is sorted by prime.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, local::bad_primes_data};
/// let e = Curve::from_coefficients([1, 0, 1, 4, -6]).unwrap(); // [1,0,1,4,-6], Delta = -2^6 7^3
/// let primes = [2u32, 7].map(Natural::from);
/// let data = bad_primes_data(&e, &primes).unwrap();
/// assert_eq!(data.len(), 2);
/// assert!(bad_primes_data(&e, &primes[..1]).is_err());
/// ```
pub fn bad_primes_data(curve: &Curve, primes: &[Natural]) -> Result<Vec<LocalData>, Error> {
    let primes = checked_primes(primes)?;
    let cofactor = strip_primes(curve.discriminant(), &primes);
    if cofactor != 1u32 {
        return Err(Error::new(
            ErrorKind::InvalidValue,
            format!("the primes given do not cover the discriminant {}: the factor {cofactor} is left", curve.discriminant()),
        ));
    }
    Ok(primes
        .iter()
        .map(|p| tate(curve.coefficients(), curve.discriminant(), p).data)
        .filter(|d| d.reduction != Reduction::Good)
        .collect())
}

/// The conductor `N = prod p^f_p`, with the exponents from Tate's algorithm.
/// `primes` must contain every prime dividing the discriminant (see
/// [`bad_primes_data`]).
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::{Curve, local::conductor};
/// // y^2 + y = x^3 - x (y^2 + y = x^3 - x), y^2 = x^3 + 1 (Delta = -2^4 3^3, conductor 36)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// assert_eq!(conductor(&e, &[Natural::from(37u32)]).unwrap(), Integer::from(37));
/// let f = Curve::from_coefficients([0, 0, 0, 0, 1]).unwrap();
/// assert_eq!(conductor(&f, &[2u32, 3].map(Natural::from)).unwrap(), Integer::from(36));
/// ```
pub fn conductor(curve: &Curve, primes: &[Natural]) -> Result<Integer, Error> {
    let mut n = Natural::ONE;
    for d in bad_primes_data(curve, primes)? {
        n *= d.prime.pow(u64::from(d.conductor_exponent));
    }
    Ok(Integer::from(n))
}

/// The product of the Tamagawa numbers `c_p` over the primes of bad
/// reduction. `primes` must contain every prime dividing the discriminant
/// (see [`bad_primes_data`]).
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, local::tamagawa_product};
/// // y^2 + y = x^3 - x^2 - 10x - 20: c_11 = 5 (Cremona, Algorithms for Modular Elliptic Curves, Table 3; from memory)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// assert_eq!(tamagawa_product(&e, &[Natural::from(11u32)]).unwrap(), 5u32);
/// ```
pub fn tamagawa_product(curve: &Curve, primes: &[Natural]) -> Result<Natural, Error> {
    let mut c = Natural::ONE;
    for d in bad_primes_data(curve, primes)? {
        c *= Natural::from(d.tamagawa);
    }
    Ok(c)
}

/// Checks that `p` is prime: exactly for `p < 2^64`, by strong probable-prime
/// tests to the first 20 prime bases above.
pub(crate) fn check_prime(p: &Natural) -> Result<(), Error> {
    let ok = match u64::try_from(p) {
        Ok(small) => is_prime_u64(small),
        Err(_) => is_probable_prime(p),
    };
    if ok {
        Ok(())
    } else {
        Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not a prime")))
    }
}

/// The list checked for primality, sorted, without repeats.
pub(crate) fn checked_primes(primes: &[Natural]) -> Result<Vec<Natural>, Error> {
    let mut v = primes.to_vec();
    v.sort();
    v.dedup();
    for p in &v {
        check_prime(p)?;
    }
    Ok(v)
}

/// `|n|` with every factor from `primes` removed.
/// Checks that `local` describes `curve` as a globally minimal model: every
/// prime dividing the discriminant is listed and the discriminant valuation
/// at each listed prime is the minimal one (an error of kind
/// [`ErrorKind::InvalidValue`] otherwise).
pub(crate) fn check_minimal(curve: &Curve, local: &[LocalData]) -> Result<(), Error> {
    let primes: Vec<Natural> = local.iter().map(|d| d.prime.clone()).collect();
    let rest = strip_primes(curve.discriminant(), &primes);
    if rest != 1u32 {
        return Err(Error::new(
            ErrorKind::InvalidValue,
            format!("the local data do not cover the discriminant {} (factor {rest} left)", curve.discriminant()),
        ));
    }
    for d in local {
        let v = valuation(curve.discriminant(), &d.prime).unwrap_or(0);
        if v != d.minimal_valuation_disc {
            return Err(Error::new(
                ErrorKind::InvalidValue,
                format!("the model is not minimal at {} (v(Delta) = {v}, minimal {})", d.prime, d.minimal_valuation_disc),
            ));
        }
    }
    Ok(())
}

pub(crate) fn strip_primes(n: &Integer, primes: &[Natural]) -> Natural {
    let mut m = n.unsigned_abs();
    for p in primes {
        while m != 0u32 && (&m).divisible_by(p) {
            m /= p;
        }
    }
    m
}

fn is_probable_prime(n: &Natural) -> bool {
    const BASES: [u32; 20] = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61, 67, 71];
    for b in BASES {
        if n.divisible_by(Natural::from(b)) {
            return *n == b;
        }
    }
    let n1 = n - Natural::ONE;
    // invariant: n has no factor among the bases (checked above) and n > 1, so n - 1 > 0
    let s = n1.trailing_zeros().expect("n - 1 > 0");
    let d = &n1 >> s;
    'bases: for b in BASES {
        let mut x = Natural::from(b).mod_pow(&d, n);
        if x == 1u32 || x == n1 {
            continue;
        }
        for _ in 1..s {
            x = (&x * &x) % n;
            if x == n1 {
                continue 'bases;
            }
        }
        return false;
    }
    true
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn probable_primes() {
        // 2^89 - 1 is a Mersenne prime; 2^67 - 1 = 193707721 * 761838257287 (Cole, 1903).
        let m89 = (Natural::ONE << 89u64) - Natural::ONE;
        assert!(check_prime(&m89).is_ok());
        let m67 = (Natural::ONE << 67u64) - Natural::ONE;
        assert!(check_prime(&m67).is_err());
        assert!(check_prime(&Natural::from(1u32)).is_err());
        assert!(check_prime(&Natural::from(0u32)).is_err());
        // the square of a prime > 2^32 just above 2^64
        let q = Natural::from(4294967311u64);
        assert!(check_prime(&(&q * &q)).is_err());
    }
}
