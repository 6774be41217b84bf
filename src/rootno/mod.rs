//! The root number `w(E)` of an elliptic curve over Q: the sign in the
//! functional equation `Λ(s) = w Λ(2 - s)` of its L-function, and the local
//! root numbers `w_p` with `w = -∏_p w_p` (the real place contributes `-1`).
//!
//! Two independent routes are used.
//!
//! * **Local formulas** ([`local_root_number`]): `w_p = 1` at good primes;
//!   `-1` at split and `+1` at non-split multiplicative primes; for
//!   additive reduction with `v_p(j) < 0` (potentially multiplicative, any
//!   `p`) `w_p = (-1, -c6)_p`, a Hilbert symbol, since E is then the twist
//!   of a Tate curve by the ramified quadratic character of
//!   `Q_p(sqrt(-c6))` (Silverman, *Advanced Topics*, V.5.3), and the
//!   twist of the Steinberg representation by a ramified quadratic
//!   character `χ` has root number `χ(-1)` (D. Rohrlich, "Elliptic curves
//!   and the Weil–Deligne group", CRM Proc. 4, 1994; section from memory); for `p ≥ 5` and
//!   potentially good reduction, with `e = 12 / gcd(12, v_p(Δ_min))`,
//!   `w_p = (-1/p)` if `e = 2` or `6`, `(-3/p)` if `e = 3`, `(-2/p)` if
//!   `e = 4` (D. Rohrlich, "Variation of the root number in families of
//!   elliptic curves", Compositio Math. 87, 1993 (statement from memory,
//!   checked numerically in tests/rootno.rs); also his
//!   "Galois theory, elliptic curves, and root numbers", Compositio 100,
//!   1996). At `p = 2` and `3` with potentially good reduction the only
//!   case decided locally is a ramified quadratic twist of a curve with good
//!   reduction at `p`: if `E^d` has good reduction, `ρ_E = ρ_{E^d} ⊗ χ_d`
//!   with `ρ_{E^d}` unramified of trivial (unitary) determinant, so
//!   `w_p = ε(χ_d)^2 = χ_d(-1) = (-1, d)_p`. The other tamely ramified
//!   case (conductor exponent 2, so no Swan conductor) is also decided: the
//!   inertia image is then cyclic of order prime to `p` and not `{±1}`, so
//!   of order 3 at `p = 2` and 4 at `p = 3`. Frobenius acts on its
//!   characters by `θ ↦ θ^p = θ^{-1}`, so `ρ_E = Ind_K θ` from the
//!   unramified quadratic extension `K`, with `θ` restricted to `Q_p^*`
//!   the unramified quadratic character (the determinant is trivial). As
//!   `λ(K/Q_p) = 1` for unramified `K`, `w_p = w(θ) = θ(p) g / p = -g / p`
//!   with `g` the Gauss sum of a character of order 3 on `F_4` (`g = 2`) or
//!   of order 4 on `F_9` (`g = -3`) (Stickelberger's theorem; Berndt, Evans
//!   and Williams, *Gauss and Jacobi Sums*, Thm. 11.6.3). So `w_2 = -1` and
//!   `w_3 = +1` there, the values `(-3/2)` and `(-2/3)` of Rohrlich's
//!   formulas for `e = 3` and `e = 4`. The published tables of Halberstadt
//!   ("Signes locaux des courbes elliptiques en 2 et 3", C. R. Acad. Sci.
//!   Paris 326, 1998) for the remaining, wildly ramified, cases at 2 and 3
//!   are not reproduced; there [`local_root_number`] answers `None`, and
//!   [`root_number`] carries the product of the missing local root numbers
//!   over from an auxiliary twist isomorphic to the curve over `Q_2` and
//!   `Q_3` with a smaller conductor, where the functional-equation test
//!   below proves the global sign (see `transfer.rs`:
//!   [`RootNumberMethod::Transferred`]).
//!
//! * **The functional equation, numerically** ([`root_number_numerical`]):
//!   with the weight-2 newform `f = Σ a_n q^n` of level `N` (the conductor)
//!   and `F(y) = Σ a_n exp(-2π n y / sqrt N)`, the functional equation is
//!   equivalent to `F(1/y) = w y^2 F(y)` (Mellin transform of
//!   `Λ(s) = N^{s/2} (2π)^{-s} Γ(s) L(E, s) = ∫ F(y) y^{s-1} dy`; J. E.
//!   Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed., §2.11–2.13;
//!   T. Dokchitser, "Computing special values of motivic L-functions",
//!   Experiment. Math. 13, 2004). Both sides are enclosed in interval
//!   arithmetic at `y = t > 1` and `1/t` (our own enclosures of `π` and
//!   `exp`, every rounding outward, see [`crate::enclosure`]) with a proven
//!   truncation bound (from `|a_n| ≤ d(n) sqrt(n) ≤ 2n`); a sign is
//!   accepted when the enclosure for the other sign excludes 0, and both
//!   excluded is reported as an internal inconsistency. This is a proof
//!   given the modularity theorem (Wiles 1995; Taylor and Wiles 1995;
//!   Breuil, Conrad, Diamond and Taylor 2001) and the exact `a_n` and
//!   conductor (computed exactly here); the method is
//!   [`crate::lproof::prove_root_number`]. It honours the deadline and
//!   cancel flag of the [`FactorLimits`] passed in: when they end it, a
//!   sign that only it could decide is reported as "cut short" (an error
//!   of kind [`ErrorKind::Budget`]).
//!
//! [`root_number`] combines them: if every local root number is known the
//! global one follows, and for conductors up to [`NUMERIC_CHECK_CONDUCTOR`]
//! the numerical test is run as well and must agree. If a local root
//! number at 2 or 3 is unknown, the auxiliary twist decides it when one
//! with a smaller conductor (at most [`NUMERIC_MAX_CONDUCTOR`], or
//! [`NUMERIC_REACH_CONDUCTOR`] when the limits carry a deadline) exists, and
//! the curve's own numerical test runs beside it up to
//! [`NUMERIC_CHECK_CONDUCTOR`] (a disagreement is an internal error);
//! without a twist the curve's own test decides (conductors up to the same
//! limits). A single unknown local number is then
//! deduced, two (at 2 and 3) are reported as known only through their
//! product.

mod numeric;
mod parity;
mod transfer;

use crate::arith::{factor, hilbert_symbol_integers, kronecker, FactorLimits, Place};
use crate::curve::Curve;
use crate::error::{Error, ErrorKind};
use crate::local::{check_prime, tate, LocalData, Reduction};
use malachite::base::num::arithmetic::traits::Pow;
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural};

pub use numeric::{NUMERIC_CHECK_CONDUCTOR, NUMERIC_MAX_CONDUCTOR, NUMERIC_REACH_CONDUCTOR};
pub use parity::root_number_by_selmer_parity;

/// How the global root number in a [`RootNumber`] was decided.
///
/// ```
/// use twofold::{Curve, rootno::{root_number, RootNumberMethod}};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (Cremona 1997, Table 1): split multiplicative at 11, conductor 11
/// let r = root_number(&Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap()).unwrap();
/// assert_eq!(r.method, RootNumberMethod::LocalAndNumerical);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(tag = "kind", rename_all = "snake_case"))]
#[non_exhaustive]
pub enum RootNumberMethod {
    /// Every local root number came from a local formula; the conductor was
    /// above [`NUMERIC_CHECK_CONDUCTOR`], so the numerical test was not run.
    LocalFormulas,
    /// Every local root number came from a local formula, and the numerical
    /// test of the functional equation gave the same global sign.
    LocalAndNumerical,
    /// Some local root number (at 2 or 3) had no local formula; the
    /// numerical test decided the global sign. `deduced` lists the primes
    /// whose entry in [`RootNumber::local`] was deduced from it.
    Numerical {
        /// The primes whose local root number was deduced from the global one.
        #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
        deduced: Vec<Natural>,
    },
    /// Some local root number (at 2 or 3) had no local formula; the product
    /// of the missing ones was carried over from an auxiliary curve
    /// isomorphic to this one over `Q_p` at those primes (a twist by a class
    /// trivial there) whose global root number the functional equation
    /// proves (see the module documentation). `deduced` is as in
    /// [`RootNumberMethod::Numerical`].
    Transferred {
        /// The auxiliary curve (a short Weierstrass model).
        #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
        auxiliary: [Integer; 5],
        /// Its conductor.
        #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
        auxiliary_conductor: Natural,
        /// Whether the functional equation of the curve itself was tested as
        /// well (and agreed).
        cross_checked: bool,
        /// The primes whose local root number was deduced.
        #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
        deduced: Vec<Natural>,
    },
    /// The parity of an unconditionally computed 2-Selmer group decided the
    /// global sign: `w = (-1)^(dim Sel^2(E) - dim E(Q)[2])` (Monsky 1996,
    /// see [`root_number_by_selmer_parity`]). `deduced` is as in
    /// [`RootNumberMethod::Numerical`].
    SelmerParity {
        /// The primes whose local root number was deduced from the global one.
        #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
        deduced: Vec<Natural>,
    },
}

/// The global root number of a curve with its local root numbers.
///
/// ```
/// use twofold::{Curve, rootno::root_number};
/// // y^2 + y = x^3 - x (Cremona 1997, Table 1; rank 1, so w = -1): non-split at 37, so
/// // w_37 = +1 and w = -w_37
/// let r = root_number(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap()).unwrap();
/// assert_eq!(r.global, -1);
/// assert_eq!(r.local, vec![(37u32.into(), 1)]);
/// assert_eq!(r.conductor, 37u32);
/// assert!(r.joint.is_empty());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct RootNumber {
    /// The global root number `w(E)`, `1` or `-1`.
    pub global: i8,
    /// The local root numbers `w_p` at the primes of bad reduction that are
    /// known (by a local formula, or deduced as said in
    /// [`RootNumberMethod::Numerical`]), sorted by prime. Good primes have
    /// `w_p = 1` and are left out.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub local: Vec<(Natural, i8)>,
    /// Bad primes (only 2 and 3 can occur) whose local root numbers are
    /// known only through their product, which is
    /// `-global / ∏ local`. Empty in most cases.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub joint: Vec<Natural>,
    /// How the global sign was decided.
    pub method: RootNumberMethod,
    /// The conductor of the curve.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub conductor: Natural,
}

/// The local root number `w_p(E)` at a prime `p`, from local formulas (see
/// the module documentation): `Some(1)` or `Some(-1)`, or `None` at `p = 2`
/// or `3` when the reduction is additive, potentially good and wildly
/// ramified (conductor exponent above 2) and no ramified quadratic twist
/// has good reduction (cases of Halberstadt's tables not reproduced here).
/// Any integral model will do. An error of kind [`ErrorKind::InvalidValue`]
/// when `p` is not prime.
///
/// ```
/// use malachite::Natural;
/// use twofold::{Curve, rootno::local_root_number};
/// let p = |n: u32| Natural::from(n);
/// // y^2 + y = x^3 - x^2 - 10x - 20: split multiplicative at 11, good at 2 (Cremona 1997, Table 1)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// assert_eq!(local_root_number(&e, &p(11)).unwrap(), Some(-1));
/// assert_eq!(local_root_number(&e, &p(2)).unwrap(), Some(1));
/// // y^2 = x^3 - 25x: type I0* at 5, e = 12/gcd(12, 6) = 2, so (-1/5) = 1 (Rohrlich)
/// let f = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
/// assert_eq!(local_root_number(&f, &p(5)).unwrap(), Some(1));
/// assert!(local_root_number(&f, &p(6)).is_err());
/// ```
pub fn local_root_number(curve: &Curve, p: &Natural) -> Result<Option<i8>, Error> {
    check_prime(p)?;
    let out = tate(curve.coefficients(), curve.discriminant(), p);
    let model = Curve::new(out.model).map_err(|_| internal("Tate's algorithm returned a singular model"))?;
    local_sign(&model, &out.data)
}

/// The global root number of `curve` with its local root numbers; see the
/// module documentation for how it is decided. Factors the discriminant
/// without a time limit (use [`root_number_with_limits`] for one).
///
/// Errors: [`ErrorKind::TooLarge`] when a local root number at 2 or 3 is
/// not covered by the local formulas and the conductor exceeds
/// [`NUMERIC_MAX_CONDUCTOR`] (with no deadline: [`root_number_with_limits`]
/// with a deadline goes on up to [`NUMERIC_REACH_CONDUCTOR`]); [`ErrorKind::FactorBudget`] from the
/// factorisation; [`ErrorKind::InvalidValue`] if the local formulas and
/// the numerical test disagree (which would be a bug, reported rather than
/// answered).
///
/// ```
/// use twofold::{Curve, rootno::root_number};
/// // y^2 + y = x^3 + x^2 - 2x (rank 2) and y^2 + y = x^3 - 7x + 6 (rank 3) from the published tables (Cremona 1997) (from memory)
/// assert_eq!(root_number(&Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap()).unwrap().global, 1);
/// assert_eq!(root_number(&Curve::from_coefficients([0, 0, 1, -7, 6]).unwrap()).unwrap().global, -1);
/// ```
pub fn root_number(curve: &Curve) -> Result<RootNumber, Error> {
    root_number_with_limits(curve, &FactorLimits::default())
}

/// [`root_number`] with limits on the factorisation of the discriminant.
///
/// ```
/// use std::time::{Duration, Instant};
/// use twofold::{Curve, arith::FactorLimits, rootno::root_number_with_limits};
/// let limits = FactorLimits::default().with_deadline(Instant::now() + Duration::from_secs(10));
/// // y^2 = x^3 + 1, conductor 36 (Cremona 1997, Table 1, [0,0,0,0,1] has rank 0)
/// let r = root_number_with_limits(&Curve::from_coefficients([0, 0, 0, 0, 1]).unwrap(), &limits).unwrap();
/// assert_eq!(r.global, 1);
/// assert_eq!(r.conductor, 36u32);
/// ```
pub fn root_number_with_limits(curve: &Curve, limits: &FactorLimits) -> Result<RootNumber, Error> {
    root_number_from_setup(&Setup::new(curve, limits)?, limits)
}

/// [`root_number_with_limits`] for a curve whose data is known: the
/// minimal model, bad primes and local data come from `data` (nothing is
/// factored or recomputed).
///
/// ```
/// use twofold::{Curve, CurveData, Work, arith::FactorLimits, rootno::root_number_of};
/// // y^2 + y = x^3 - x (conductor 37, rank 1): w = -1
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// assert_eq!(root_number_of(&d, &FactorLimits::default()).unwrap().global, -1);
/// ```
pub fn root_number_of(data: &crate::local::CurveData, limits: &FactorLimits) -> Result<RootNumber, Error> {
    // local_sign reads only c4, c6 and the discriminant at p, which the
    // global minimal model shares with any model minimal at p
    let bad = data.local().iter().map(|d| (d.prime.clone(), data.minimal().clone(), d.clone())).collect();
    let setup = Setup { minimal: data.minimal().clone(), bad, conductor: data.conductor().clone() };
    root_number_from_setup(&setup, limits)
}

fn root_number_from_setup(setup: &Setup, limits: &FactorLimits) -> Result<RootNumber, Error> {
    let mut local = Vec::new();
    let mut unknown = Vec::new();
    let mut product: i8 = 1;
    for (p, model, data) in &setup.bad {
        match local_sign(model, data)? {
            Some(s) => {
                product *= s;
                local.push((p.clone(), s));
            }
            None => unknown.push(p.clone()),
        }
    }
    let n = &setup.conductor;
    if unknown.is_empty() {
        let global = -product;
        let method = if *n <= NUMERIC_CHECK_CONDUCTOR {
            match numeric::decide(setup, limits)? {
                numeric::Verdict::Sign(s) if s == global => RootNumberMethod::LocalAndNumerical,
                numeric::Verdict::Sign(s) => {
                    return Err(internal(&format!(
                        "local formulas give w = {global} but the functional equation gives {s} (conductor {n})"
                    )))
                }
                numeric::Verdict::Inconclusive | numeric::Verdict::CutShort(_) => RootNumberMethod::LocalFormulas,
            }
        } else {
            RootNumberMethod::LocalFormulas
        };
        return Ok(RootNumber { global, local, joint: vec![], method, conductor: n.clone() });
    }
    let unknown_names = unknown.iter().map(|p| p.to_string()).collect::<Vec<_>>().join(" and ");
    // the auxiliary-curve route (a proof of the product of the unknown local signs)
    let mut via_aux: Option<(i8, Setup)> = None;
    let mut aux_note = String::new();
    let reach = numeric::reach(limits);
    match transfer::auxiliary(setup, &unknown, limits)? {
        Some(aux) if aux.conductor <= reach => match numeric::decide(&aux, limits)? {
            numeric::Verdict::Sign(s) => {
                let u = transfer::unknown_product(setup, &aux, &unknown, s)?;
                via_aux = Some((-product * u, aux));
            }
            numeric::Verdict::CutShort(terms) => {
                aux_note = format!(" (the auxiliary curve's test was cut short after {terms} coefficients)")
            }
            numeric::Verdict::Inconclusive => aux_note = " (the auxiliary curve's test was inconclusive)".into(),
        },
        Some(aux) => aux_note = format!(" (the best auxiliary twist has conductor {}, also above it)", aux.conductor),
        None => {}
    }
    // the curve's own functional equation: the cross-check, or the only route
    let direct = if *n <= NUMERIC_CHECK_CONDUCTOR || (via_aux.is_none() && *n <= reach) {
        Some(numeric::decide(setup, limits)?)
    } else {
        None
    };
    let global = match (&via_aux, direct) {
        (Some((g, aux)), Some(numeric::Verdict::Sign(s))) if *g != s => {
            return Err(internal(&format!(
                "the auxiliary curve {:?} (conductor {}) gives w = {g} but the functional equation gives {s} (conductor {n})",
                aux.minimal.coefficients(),
                aux.conductor
            )))
        }
        (Some((g, _)), _) => *g,
        (None, Some(numeric::Verdict::Sign(s))) => s,
        (None, Some(numeric::Verdict::CutShort(terms))) => {
            return Err(Error::new(
                ErrorKind::Budget,
                format!(
                    "cut short: the budget ended the test of the functional equation after {terms} coefficients \
                     (conductor {n}); the local root number at {unknown_names} is not covered by the local formulas{aux_note}"
                ),
            ))
        }
        (None, Some(numeric::Verdict::Inconclusive)) => {
            return Err(Error::new(
                ErrorKind::Budget,
                format!("the numerical test of the functional equation was inconclusive (conductor {n}){aux_note}"),
            ))
        }
        (None, None) => {
            return Err(Error::new(
                ErrorKind::TooLarge,
                format!(
                    "the local root number at {unknown_names} is not covered by the local formulas, no twist trivial at \
                     {unknown_names} brings the conductor {n} under the limit {reach} of the numerical test{aux_note}"
                ),
            ))
        }
    };
    let cross_checked = matches!(direct, Some(numeric::Verdict::Sign(_)));
    let mut deduced = vec![];
    let mut joint = vec![];
    if unknown.len() == 1 {
        // -global = w_p * product, and product = ±1 is its own inverse.
        // invariant: unknown.len() == 1 was checked just above
        let p = unknown.pop().expect("one unknown prime");
        local.push((p.clone(), -global * product));
        local.sort();
        deduced.push(p);
    } else {
        joint = unknown;
    }
    let method = match via_aux {
        Some((_, aux)) => RootNumberMethod::Transferred {
            auxiliary: aux.minimal.coefficients().clone(),
            auxiliary_conductor: aux.conductor,
            cross_checked,
            deduced,
        },
        None => RootNumberMethod::Numerical { deduced },
    };
    Ok(RootNumber { global, local, joint, method, conductor: n.clone() })
}

/// The global root number decided by the numerical test of the functional
/// equation alone (see the module documentation), or `None` when the
/// conductor is above [`NUMERIC_MAX_CONDUCTOR`], the discriminant could not
/// be factored, or the test was inconclusive.
///
/// ```
/// use twofold::{Curve, rootno::root_number_numerical};
/// // y^2 + y = x^3 - x^2 - 10x - 20 (rank 0) and y^2 + y = x^3 - x (rank 1), Cremona 1997, Table 1
/// assert_eq!(root_number_numerical(&Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap()), Some(1));
/// assert_eq!(root_number_numerical(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap()), Some(-1));
/// ```
pub fn root_number_numerical(curve: &Curve) -> Option<i8> {
    let setup = Setup::new(curve, &FactorLimits::default()).ok()?;
    if setup.conductor > NUMERIC_MAX_CONDUCTOR {
        return None;
    }
    match numeric::decide(&setup, &FactorLimits::default()).ok()? {
        numeric::Verdict::Sign(s) => Some(s),
        _ => None,
    }
}

/// A global minimal model, its bad primes with p-minimal models and local
/// data, and the conductor.
pub(crate) struct Setup {
    pub(crate) minimal: Curve,
    pub(crate) bad: Vec<(Natural, Curve, LocalData)>,
    pub(crate) conductor: Natural,
}

impl Setup {
    fn new(curve: &Curve, limits: &FactorLimits) -> Result<Setup, Error> {
        let f = factor(curve.discriminant(), limits)?;
        let primes: Vec<Natural> = f.primes().cloned().collect();
        Setup::with_primes(curve, &primes)
    }

    /// The set-up from the primes dividing the discriminant (a list that
    /// may hold more primes).
    fn with_primes(curve: &Curve, primes: &[Natural]) -> Result<Setup, Error> {
        let primes: Vec<Natural> = primes.to_vec();
        let (minimal, _) = curve.minimal_model(&primes)?;
        let mut bad = Vec::new();
        let mut conductor = Natural::ONE;
        for p in primes {
            let out = tate(minimal.coefficients(), minimal.discriminant(), &p);
            if out.data.reduction == Reduction::Good {
                continue;
            }
            conductor *= (&p).pow(u64::from(out.data.conductor_exponent));
            let model = Curve::new(out.model).map_err(|_| internal("Tate's algorithm returned a singular model"))?;
            bad.push((p, model, out.data));
        }
        Ok(Setup { minimal, bad, conductor })
    }
}

fn internal(msg: &str) -> Error {
    Error::internal("root number", msg)
}

/// The exponent of `p` in a non-zero integer.
fn val(n: &Integer, p: &Natural) -> u32 {
    crate::arith::valuation(n, p).unwrap_or(u32::MAX)
}

/// The local root number from the local data and a model minimal at `p`.
pub(crate) fn local_sign(model: &Curve, data: &LocalData) -> Result<Option<i8>, Error> {
    let p = &data.prime;
    match data.reduction {
        Reduction::Good | Reduction::NonSplitMultiplicative => return Ok(Some(1)),
        Reduction::SplitMultiplicative => return Ok(Some(-1)),
        Reduction::Additive => {}
    }
    let place = Place::Prime(p.clone());
    let c4 = model.c4();
    let c6 = model.c6();
    let vd = val(model.discriminant(), p);
    // Potentially multiplicative: v(j) = 3 v(c4) - v(Δ) < 0 (so c4, c6 ≠ 0).
    if *c4 != 0u32 && 3 * u64::from(val(c4, p)) < u64::from(vd) {
        return Ok(Some(hilbert_symbol_integers(&Integer::from(-1), &-c6, &place)?));
    }
    if *p >= 5u32 {
        // Rohrlich (1993), potentially good reduction, p >= 5.
        let e = 12 / gcd12(vd);
        let pi = Integer::from(p.clone());
        let s = match e {
            2 | 6 => kronecker(&Integer::from(-1), &pi),
            3 => kronecker(&Integer::from(-3), &pi),
            4 => kronecker(&Integer::from(-2), &pi),
            _ => return Err(internal(&format!("additive potentially good reduction at {p} with e = {e}"))),
        };
        return Ok(Some(s));
    }
    // p = 2 or 3: a ramified quadratic twist with good reduction?
    let classes: &[i64] = if *p == 3u32 { &[3, -3] } else { &[-1, 3, 2, -2, 6, -6] };
    for &d in classes {
        if twist_has_good_reduction(c4, c6, d, p) {
            return Ok(Some(hilbert_symbol_integers(&Integer::from(-1), &Integer::from(d), &place)?));
        }
    }
    // Tame potentially good reduction (conductor exponent 2, i.e. no Swan
    // conductor) without a quadratic twist of good reduction: the inertia
    // image has order prime to p and is not {±1}, so it is cyclic of order 3
    // at p = 2 and of order 4 at p = 3.
    if data.conductor_exponent == 2 {
        return Ok(Some(if *p == 2u32 { -1 } else { 1 }));
    }
    Ok(None)
}

fn gcd12(v: u32) -> u32 {
    let mut a = 12u32;
    let mut b = v % 12;
    while b != 0 {
        (a, b) = (b, a % b);
    }
    a
}

/// Whether the quadratic twist by `d`, `y^2 = x^3 - 27 d^2 c4 x - 54 d^3 c6`,
/// has good reduction at `p`.
fn twist_has_good_reduction(c4: &Integer, c6: &Integer, d: i64, p: &Natural) -> bool {
    let d = Integer::from(d);
    let a4 = Integer::from(-27) * (&d).pow(2) * c4;
    let a6 = Integer::from(-54) * (&d).pow(3) * c6;
    let zero = Integer::from(0);
    match Curve::new([zero.clone(), zero.clone(), zero, a4, a6]) {
        Ok(t) => tate(t.coefficients(), t.discriminant(), p).data.reduction == Reduction::Good,
        Err(_) => false,
    }
}

/// A global minimal model of any integral `curve`, with its conductor and
/// global root number (factoring the discriminant without a time limit;
/// root number by [`root_number`]). For callers that have
/// none of these at hand.
///
/// ```
/// use twofold::{Curve, lseries::analytic_rank, rootno::minimal_conductor_sign};
/// // a non-minimal model of y^2 + y = x^3 - x: u = 2 scaling of y^2 + y = x^3 - x
/// let e = Curve::from_coefficients([0, 0, 8, -16, 0]).unwrap();
/// let (m, n, w) = minimal_conductor_sign(&e).unwrap();
/// assert_eq!(m, Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap());
/// assert_eq!((&n, w), (&37u32.into(), -1));
/// assert_eq!(analytic_rank(&m, &n, w).unwrap().rank, 1);
/// ```
pub fn minimal_conductor_sign(curve: &Curve) -> Result<(Curve, Natural, i8), Error> {
    let f = factor(curve.discriminant(), &FactorLimits::default())?;
    let primes: Vec<Natural> = f.primes().cloned().collect();
    let (minimal, _) = curve.minimal_model(&primes)?;
    let rn = root_number(&minimal)?;
    Ok((minimal, rn.conductor, rn.global))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gcd12_values() {
        let got: Vec<u32> = (0..13).map(gcd12).collect();
        assert_eq!(got, vec![12, 1, 2, 3, 4, 1, 6, 1, 4, 3, 2, 1, 12]);
    }
}
