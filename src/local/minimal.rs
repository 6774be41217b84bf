//! Minimal models: minimality at a prime and the global minimal model in
//! reduced form, decided by Tate's algorithm (which is why they live here,
//! beside it, and not in `curve/`).

use super::{check_prime, checked_primes, strip_primes, tate};
use crate::curve::change::reduced_model_from_c4_c6;
use crate::curve::{Curve, ModelChange};
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::Pow;
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural, Rational};

impl Curve {
    /// Whether this model is minimal at the prime `p`, i.e. the valuation of
    /// its discriminant is the least among integral models (decided by Tate's
    /// algorithm). An error of kind [`ErrorKind::InvalidValue`] when `p` is
    /// not prime.
    ///
    /// ```
    /// use malachite::Natural;
    /// use twofold::Curve;
    /// // y^2 = x^3 - 16 * 64 is y^2 = x^3 - 16 scaled by u = 1/2.
    /// let e = Curve::from_coefficients([0, 0, 0, 0, -1024]).unwrap();
    /// assert!(!e.is_minimal_at(&Natural::from(2u32)).unwrap());
    /// assert!(e.is_minimal_at(&Natural::from(3u32)).unwrap());
    /// ```
    pub fn is_minimal_at(&self, p: &Natural) -> Result<bool, Error> {
        check_prime(p)?;
        let out = tate(self.coefficients(), self.discriminant(), p);
        Ok(out.scalings == 0)
    }

    /// A model minimal at the prime `p`, reached by a change with `u` a power
    /// of `p` and integral `r`, `s`, `t` (so its discriminant differs from
    /// this one by a power of `p^12` only, and minimality at other primes is
    /// kept), and the change to it. The model is the one Tate's algorithm
    /// ends in, not in any normal form. An error of kind
    /// [`ErrorKind::InvalidValue`] when `p` is not prime.
    ///
    /// ```
    /// use malachite::Natural;
    /// use twofold::Curve;
    /// let e = Curve::from_coefficients([0, 0, 0, 0, -1024]).unwrap();
    /// let (f, c) = e.minimal_model_at(&Natural::from(2u32)).unwrap();
    /// assert!(f.is_minimal_at(&Natural::from(2u32)).unwrap());
    /// assert_eq!(e.apply_change(&c).unwrap(), f);
    /// ```
    pub fn minimal_model_at(&self, p: &Natural) -> Result<(Curve, ModelChange), Error> {
        check_prime(p)?;
        let out = tate(self.coefficients(), self.discriminant(), p);
        // invariant: a change of model multiplies the discriminant by u^-12, so it stays non-zero
        let e = Curve::new(out.model).expect("a change of model keeps the discriminant non-zero");
        Ok((e, out.change))
    }

    /// A global minimal model in reduced form (a1, a3 in {0, 1}, a2 in
    /// {-1, 0, 1}) and the change from this model to it, by the method of
    /// Laska, Kraus and Connell as given in Cremona, *Algorithms for Modular
    /// Elliptic Curves*, 3.2: the scaling `u` comes from the minimal
    /// discriminant valuations found by Tate's algorithm at each prime, and
    /// the reduced model with invariants `c4/u^4`, `c6/u^6` is then unique.
    /// The result is the same for all models of one curve over Q.
    ///
    /// `primes` must contain every prime at which this model may fail to be
    /// minimal; every prime dividing the discriminant will do. An error of
    /// kind [`ErrorKind::InvalidValue`] when an entry is not prime or when a
    /// prime left out might matter (it divides `c4`, `c6` and the part of the
    /// discriminant prime to the list).
    ///
    /// ```
    /// use malachite::{Natural, Rational};
    /// use twofold::{Curve, ModelChange};
    /// let q = |n: i64| Rational::from(n);
    /// let e11 = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
    /// // a non-minimal model of the same curve
    /// let big = e11.apply_change(&ModelChange::new(Rational::from_signeds(1, 6), q(5), q(-2), q(7)).unwrap()).unwrap();
    /// let primes: Vec<Natural> = [2u32, 3, 11].map(Natural::from).to_vec();
    /// let (m, c) = big.minimal_model(&primes).unwrap();
    /// assert_eq!(m, e11);
    /// assert_eq!(big.apply_change(&c).unwrap(), e11);
    /// ```
    pub fn minimal_model(&self, primes: &[Natural]) -> Result<(Curve, ModelChange), Error> {
        let primes = checked_primes(primes)?;
        let cofactor = strip_primes(self.discriminant(), &primes);
        if cofactor != 1u32 {
            use malachite::base::num::arithmetic::traits::{Gcd, UnsignedAbs};
            let g = cofactor.gcd(self.c4().unsigned_abs()).gcd(self.c6().unsigned_abs());
            if g != 1u32 {
                return Err(Error::new(
                    ErrorKind::InvalidValue,
                    format!(
                        "the primes given leave out a factor of {g}, which divides c4, c6 and the discriminant; \
                         list every prime dividing the discriminant"
                    ),
                ));
            }
        }
        let mut u = Natural::ONE;
        for p in &primes {
            let out = tate(self.coefficients(), self.discriminant(), p);
            u *= p.pow(u64::from(out.scalings));
        }
        let ui = Integer::from(u.clone());
        let u4 = (&ui).pow(4);
        let u6 = (&ui).pow(6);
        let internal = || {
            Error::new(
                ErrorKind::InvalidValue,
                "no integral model with the scaled invariants; an entry of the prime list is probably composite",
            )
        };
        let m = reduced_model_from_c4_c6(&(self.c4() / &u4), &(self.c6() / &u6)).ok_or_else(internal)?;
        if &(m.c4() * &u4) != self.c4() || &(m.c6() * &u6) != self.c6() {
            return Err(internal());
        }
        // Solve the first three transformation formulas for s, r, t.
        let uq = Rational::from(u);
        let [a1, a2, a3, _, _] = self.coefficients().clone().map(Rational::from);
        let [b1, b2, b3, _, _] = m.coefficients().clone().map(Rational::from);
        let s = (&uq * b1 - &a1) / Rational::from(2u32);
        let r = (&uq * &uq * b2 - &a2 + &s * &a1 + &s * &s) / Rational::from(3u32);
        let t = (&uq * &uq * &uq * b3 - &a3 - &r * &a1) / Rational::from(2u32);
        let c = ModelChange { u: uq, r, s, t };
        match self.apply_change(&c) {
            Ok(ref f) if *f == m => Ok((m, c)),
            _ => Err(internal()),
        }
    }
}
