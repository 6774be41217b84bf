//! One value for a curve and everything local about it: the model the
//! caller gave, the global minimal model and the change between them, the
//! primes of bad reduction (the factored discriminant), the local data at
//! each of them and the conductor. Built once per analysis; every stage
//! reads it instead of factoring or running Tate's algorithm again.

use super::{local_data, LocalData, Reduction};
use crate::arith::{factor, is_probable_prime_within, valuation, FactorLimits};
use crate::budget::Work;
use crate::curve::{Curve, ModelChange, Point};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Abs, DivisibleBy, Pow};
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural};

/// A curve with its global minimal model, its bad primes, the local data
/// at each and its conductor (Tate's algorithm; Cremona 1997, §3.2 for the
/// minimal model by Laska-Kraus-Connell).
///
/// ```
/// use malachite::Rational;
/// use twofold::{Curve, CurveData, ModelChange, Work};
/// // y^2 + y = x^3 - x^2 - 10x - 20: conductor 11, split I5 at 11 (Cremona
/// // 1997, Table 1), here given by a non-minimal model
/// let e11 = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let q = |n: i64| Rational::from(n);
/// let big = e11.apply_change(&ModelChange::new(Rational::from_signeds(1, 6), q(5), q(-2), q(7)).unwrap()).unwrap();
/// let d = CurveData::new(&big, &Work::unlimited()).unwrap();
/// assert_eq!(d.minimal(), &e11);
/// assert_eq!(d.conductor().to_string(), "11");
/// assert_eq!(d.bad_primes().len(), 1);
/// assert_eq!(d.local()[0].kodaira.to_string(), "I5");
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CurveData {
    input: Curve,
    minimal: Curve,
    change: ModelChange,
    primes: Vec<Natural>,
    local: Vec<LocalData>,
    conductor: Natural,
}

impl CurveData {
    /// Factors the discriminant of `curve` (within the limits of `work`:
    /// an error of kind [`ErrorKind::FactorBudget`] when it cannot), then
    /// finds the minimal model, the local data and the conductor.
    pub fn new(curve: &Curve, work: &Work) -> Result<CurveData, Error> {
        let primes: Vec<Natural> = factor(curve.discriminant(), &FactorLimits::within(work))?.primes().cloned().collect();
        CurveData::from_primes(curve, primes)
    }

    /// As [`CurveData::new`], with the primes dividing the discriminant given
    /// by the caller (for discriminants too hard to factor): each must be a
    /// (probable) prime (BPSW) and together they must account for the
    /// whole discriminant, else an error of kind [`ErrorKind::InvalidValue`].
    ///
    /// ```
    /// use malachite::Natural;
    /// use twofold::{Curve, CurveData};
    /// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(); // discriminant 37
    /// assert!(CurveData::with_known_primes(&e, &[Natural::from(37u32)]).is_ok());
    /// assert!(CurveData::with_known_primes(&e, &[Natural::from(2u32)]).is_err());
    /// ```
    pub fn with_known_primes(curve: &Curve, primes: &[Natural]) -> Result<CurveData, Error> {
        CurveData::with_known_primes_within(curve, primes, &Work::unlimited())
    }

    /// [`CurveData::with_known_primes`] with the primality tests held to
    /// the deadline and cancel flag of `work` (an error of kind
    /// [`ErrorKind::FactorBudget`] when they end it).
    pub fn with_known_primes_within(curve: &Curve, primes: &[Natural], work: &Work) -> Result<CurveData, Error> {
        let limits = FactorLimits::within(work);
        let mut rest = curve.discriminant().clone().abs();
        let mut out = Vec::new();
        for p in primes {
            if !is_probable_prime_within(p, &limits)? {
                return Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not prime")));
            }
            let pi = Integer::from(p.clone());
            while (&rest).divisible_by(&pi) {
                rest /= &pi;
            }
            if !out.contains(p) {
                out.push(p.clone());
            }
        }
        if rest != 1 {
            return Err(Error::new(
                ErrorKind::InvalidValue,
                format!("the given primes do not account for the discriminant: cofactor {rest} remains"),
            ));
        }
        out.sort();
        CurveData::from_primes(curve, out)
    }

    fn from_primes(curve: &Curve, primes: Vec<Natural>) -> Result<CurveData, Error> {
        let (minimal, change) = curve.minimal_model(&primes)?;
        let primes: Vec<Natural> =
            primes.into_iter().filter(|p| valuation(minimal.discriminant(), p).unwrap_or(0) > 0).collect();
        let local: Vec<LocalData> = primes.iter().map(|p| local_data(&minimal, p)).collect::<Result<_, _>>()?;
        let conductor = conductor_of(&local);
        Ok(CurveData { input: curve.clone(), minimal, change, primes, local, conductor })
    }

    /// The value recorded in a report: the models, the change between them
    /// and the local data, checked for consistency without factoring or
    /// running Tate's algorithm (the local data must cover the minimal
    /// discriminant with minimal valuations, the change must carry `input`
    /// to `minimal`).
    pub(crate) fn from_parts(input: &Curve, minimal: &Curve, change: &ModelChange, local: &[LocalData]) -> Result<CurveData, Error> {
        super::check_minimal(minimal, local)?;
        if input.apply_change(change)? != *minimal {
            return Err(Error::new(ErrorKind::InvalidValue, "the change of model does not carry the input model to the minimal one"));
        }
        let conductor = conductor_of(local);
        let primes = local.iter().map(|d| d.prime.clone()).collect();
        Ok(CurveData { input: input.clone(), minimal: minimal.clone(), change: change.clone(), primes, local: local.to_vec(), conductor })
    }

    /// The model the caller gave.
    pub fn input(&self) -> &Curve {
        &self.input
    }
    /// The global minimal model in reduced form.
    pub fn minimal(&self) -> &Curve {
        &self.minimal
    }
    /// The change of model from [`input`](Self::input) to [`minimal`](Self::minimal).
    pub fn change(&self) -> &ModelChange {
        &self.change
    }
    /// The primes dividing the minimal discriminant, increasing.
    pub fn bad_primes(&self) -> &[Natural] {
        &self.primes
    }
    /// The local data at each bad prime, in the order of [`bad_primes`](Self::bad_primes).
    pub fn local(&self) -> &[LocalData] {
        &self.local
    }
    /// The local data at `p`, if `p` is a bad prime.
    pub fn local_at(&self, p: &Natural) -> Option<&LocalData> {
        self.local.iter().find(|d| &d.prime == p)
    }
    /// The conductor.
    pub fn conductor(&self) -> &Natural {
        &self.conductor
    }
    /// `(p, a_p)` at the primes dividing the conductor: `1` at split and
    /// `-1` at non-split multiplicative primes, `0` at additive ones (the
    /// Euler factors of the L-series at the bad primes), read from the
    /// local data. An error of kind [`ErrorKind::TooLarge`] when a prime
    /// does not fit a word.
    ///
    /// ```
    /// use twofold::{Curve, CurveData, Work};
    /// // y^2 + y = x^3 - x^2 - 10x - 20: split I5 at 11 (Cremona 1997, Table 1)
    /// let d = CurveData::new(&Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap(), &Work::unlimited()).unwrap();
    /// assert_eq!(d.bad_prime_traces().unwrap(), vec![(11, 1)]);
    /// ```
    pub fn bad_prime_traces(&self) -> Result<Vec<(u64, i64)>, Error> {
        let mut out = Vec::new();
        for d in &self.local {
            let ap = match d.reduction {
                Reduction::SplitMultiplicative => 1,
                Reduction::NonSplitMultiplicative => -1,
                Reduction::Additive => 0,
                Reduction::Good => continue,
            };
            let p = u64::try_from(&d.prime)
                .map_err(|_| Error::new(ErrorKind::TooLarge, format!("the bad prime {} does not fit a word", d.prime)))?;
            out.push((p, ap));
        }
        Ok(out)
    }
    /// A point of the minimal model, on the input model.
    pub fn to_input(&self, p: &Point) -> Point {
        match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let (x, y) = self.change.unmap_point(&(x.clone(), y.clone()));
                Point::Affine(x, y)
            }
        }
    }
    /// A point of the input model, on the minimal model (an error when it
    /// is not on the input model).
    pub fn to_minimal(&self, p: &Point) -> Result<Point, Error> {
        if !self.input.contains(p) {
            return Err(Error::new(ErrorKind::InvalidValue, format!("{p} is not on the curve {}", self.input)));
        }
        match p {
            Point::Infinity => Ok(Point::Infinity),
            Point::Affine(x, y) => self.change.map_point(&(x.clone(), y.clone())).map(|(x, y)| Point::Affine(x, y)),
        }
    }
}

/// The product of `p^f_p` over the local data.
fn conductor_of(local: &[LocalData]) -> Natural {
    let mut conductor = Natural::ONE;
    for d in local {
        conductor *= (&d.prime).pow(u64::from(d.conductor_exponent));
    }
    conductor
}
