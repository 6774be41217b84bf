//! Exact local solubility of the genus-one curves `y^2 = g(x, z)`.
//!
//! Here `g(x, z) = a x^4 + b x^3 z + c x^2 z^2 + d x z^3 + e z^4` is an
//! integral binary quartic, passed as `[a, b, c, d, e]`, with non-zero
//! discriminant. The curve `y^2 = g(x, z)` (in the weighted projective
//! plane with weights 1, 1, 2) is the smooth model of `y^2 = g(x, 1)`,
//! points at infinity included. It has a point over `Q_p` (resp. `R`) iff
//! `g` takes a **non-zero square** value (resp. a positive value) at some
//! primitive integer pair `(x, z)`: the curve is smooth, so if it has a
//! point at all its points form a one-dimensional manifold on which `y != 0`
//! off finitely many points, and integer pairs are dense.
//!
//! Every positive answer therefore comes with a [`LocalWitness`], a
//! primitive integer pair that [`check_witness`] verifies independently:
//! `v_p(g(x, z))` even and the unit part a square modulo `p` (`p` odd) or
//! `1 mod 8` (`p = 2`); `g(x, z) > 0` at the real place. Every negative
//! answer is a proof by exhaustion of residue classes (see the module
//! `padic` for the search, Hensel's lemma and the termination argument;
//! the method is the classical one, e.g. Cremona, *Algorithms for Modular
//! Elliptic Curves*, 2nd ed., section 3.5) or, at the real place, a Sturm
//! sequence count showing that a quartic with negative leading coefficient
//! has no real root.
//!
//! Quartics with zero discriminant (or `g = 0`) are not curves of genus one;
//! for them the functions answer the literal question "does `g` take a
//! non-zero square value (a positive value) at some point" and
//! [`try_local_witness`] reports them as [`ErrorKind::Singular`].

mod coeff;
mod kernel;
mod padic;
mod real;

use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Gcd, JacobiSymbol, Mod, Pow, Sign, UnsignedAbs};
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural};

/// A place of Q: the real place or the prime `p` (which must be prime).
///
/// ```
/// use malachite::Natural;
/// use twofold::solubility::Place;
/// let places = [Place::Real, Place::Prime(Natural::from(2u32))];
/// assert_ne!(places[0], places[1]);
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub enum Place {
    /// The real numbers.
    Real,
    /// The p-adic numbers for a prime `p`.
    Prime(Natural),
}

/// A primitive integer pair `(x, z)` at which `g(x, z)` is a non-zero square
/// in `Q_p` (a positive number at the real place): a point on
/// `y^2 = g(x, z)` over that completion, checkable with [`check_witness`].
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{check_witness, LocalWitness, Place};
/// // g = x^4 + 7 z^4; g(1, 1) = 8 is not a 2-adic square, g(1, 2) = 113 = 1 mod 8 is
/// let g = [1, 0, 0, 0, 7].map(Integer::from);
/// let two = Place::Prime(Natural::from(2u32));
/// assert!(!check_witness(&g, &two, &LocalWitness { x: Integer::from(1), z: Integer::from(1) }));
/// assert!(check_witness(&g, &two, &LocalWitness { x: Integer::from(1), z: Integer::from(2) }));
/// ```
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct LocalWitness {
    /// First coordinate.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub x: Integer,
    /// Second coordinate (`z = 0` is the point at infinity of the `x`-line).
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub z: Integer,
}

/// Scratch state for many local-solubility calls, kept apart from the
/// inputs (in the manner of a regex cache beside its immutable pattern): it
/// remembers the word-size primes already proven prime, so that a loop over
/// thousands of quartics with the same places does not repeat the primality
/// proofs. One workspace per thread; the plain functions
/// ([`local_witness`], [`everywhere_locally_soluble`]) use a fresh one.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{everywhere_locally_soluble_with, SolubilityWorkspace};
/// let mut ws = SolubilityWorkspace::default();
/// let primes = [Natural::from(2u32), Natural::from(17u32)];
/// for g in [[2, 0, 0, 0, -34], [1, 0, 0, 0, 1]] {
///     let g = g.map(Integer::from);
///     assert!(everywhere_locally_soluble_with(&g, &primes, &mut ws).is_ok());
/// }
/// ```
#[derive(Clone, Debug, Default)]
pub struct SolubilityWorkspace {
    primes: kernel::PrimeMemo,
}

/// The discriminant of the binary quartic `[a, b, c, d, e]`, computed as
/// `(4 I^3 - J^2) / 27` from the invariants
/// `I = 12ae - 3bd + c^2`, `J = 72ace + 9bcd - 27ad^2 - 27eb^2 - 2c^3`
/// (Cremona, *Algorithms for Modular Elliptic Curves*, section 3.2). It equals
/// the discriminant of the polynomial `g(x, 1)` when `a != 0`.
///
/// ```
/// use malachite::Integer;
/// use twofold::solubility::quartic_discriminant;
/// // disc(x^4 + t) = 256 t^3 (the formula (-1)^(n(n-1)/2) n^n t^(n-1) for x^n + t)
/// let g = [1, 0, 0, 0, -1].map(Integer::from);
/// assert_eq!(quartic_discriminant(&g), Integer::from(-256));
/// ```
pub fn quartic_discriminant(g: &[Integer; 5]) -> Integer {
    kernel::discriminant(g)
}

/// Whether `n` is the square of an element of `Q_p` (`0` counts as a
/// square). For a non-zero `n = p^v u` with `p` not dividing `u` this is `v`
/// even and `u` a square modulo `p` for odd `p`, `u = 1 mod 8` for `p = 2`
/// (Serre, *A Course in Arithmetic*, chapter II, section 3.3). Returns
/// `false` if `p` is not prime.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::is_p_adic_square;
/// let p = |q: u32| Natural::from(q);
/// assert!(is_p_adic_square(&Integer::from(-7), &p(2)));   // -7 = 1 mod 8
/// assert!(!is_p_adic_square(&Integer::from(-1), &p(3)));  // -1 is not a square mod 3
/// assert!(is_p_adic_square(&Integer::from(50), &p(7)));   // 50 = 1 mod 7
/// assert!(!is_p_adic_square(&Integer::from(20), &p(5)));  // odd valuation
/// ```
pub fn is_p_adic_square(n: &Integer, p: &Natural) -> bool {
    if !kernel::is_prime(p, &mut kernel::PrimeMemo::default()) {
        return false;
    }
    if *n == 0u32 {
        return true;
    }
    p_adic_square_prime(n, p)
}

fn p_adic_square_prime(n: &Integer, p: &Natural) -> bool {
    let pi = Integer::from(p.clone());
    let mut u = n.clone();
    if *p == 2u32 {
        // invariant: n is non-zero here (zero is answered by the caller)
        let tz = (&u).unsigned_abs().trailing_zeros().expect("non-zero");
        u >>= tz;
        return tz.is_multiple_of(2) && (&u).mod_op(Integer::from(8)) == 1u32;
    }
    let mut v = 0u64;
    loop {
        let (q, r) = {
            use malachite::base::num::arithmetic::traits::DivMod;
            (&u).div_mod(&pi)
        };
        if r != 0u32 {
            break;
        }
        u = q;
        v += 1;
    }
    v.is_multiple_of(2) && (&u).mod_op(&pi).jacobi_symbol(&pi) == 1
}

/// The independent exact check of a witness: `(x, z)` is primitive and
/// `g(x, z)` is a non-zero square in `Q_p`, or positive at the real place.
/// Returns `false` if the place is a `Prime` holding a non-prime.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{check_witness, LocalWitness, Place};
/// let g = [-1, 0, 0, 0, 2].map(Integer::from); // 2 z^4 - x^4
/// let w = LocalWitness { x: Integer::from(1), z: Integer::from(1) }; // value 1
/// assert!(check_witness(&g, &Place::Real, &w));
/// assert!(check_witness(&g, &Place::Prime(Natural::from(3u32)), &w));
/// let w0 = LocalWitness { x: Integer::from(1), z: Integer::from(0) }; // value -1
/// assert!(!check_witness(&g, &Place::Real, &w0));
/// ```
pub fn check_witness(g: &[Integer; 5], place: &Place, w: &LocalWitness) -> bool {
    if (&w.x).unsigned_abs().gcd((&w.z).unsigned_abs()) != 1u32 {
        return false;
    }
    let val = real::form_value(g, &w.x, &w.z);
    match place {
        Place::Real => val > 0u32,
        Place::Prime(p) => kernel::is_prime(p, &mut kernel::PrimeMemo::default()) && val != 0u32 && p_adic_square_prime(&val, p),
    }
}

/// A witness that `y^2 = g(x, z)` has a point over the completion `place`,
/// or `None` if it has none there (or `p` is not prime).
///
/// The p-adic search runs over residue classes of both charts of
/// `P^1(Z_p)` with Hensel's lemma (module documentation of `padic`); it
/// works in checked `i128` arithmetic for `p < 2^62` and falls back to
/// malachite integers on overflow. The real place uses exact signs and a
/// Sturm sequence.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{check_witness, local_witness, Place};
/// // y^2 = 2x^4 - 34z^4 (2w^2 = x^4 - 17z^4): soluble at 2 and 17
/// // (Lind 1940, Reichardt 1942), though it has no rational point
/// let g = [2, 0, 0, 0, -34].map(Integer::from);
/// for p in [2u32, 17] {
///     let place = Place::Prime(Natural::from(p));
///     let w = local_witness(&g, &place).unwrap();
///     assert!(check_witness(&g, &place, &w));
/// }
/// // y^2 = 2x^4 + 3z^4 has no 3-adic point (values are 2 mod 3 or 3 * unit)
/// let h = [2, 0, 0, 0, 3].map(Integer::from);
/// assert!(local_witness(&h, &Place::Prime(Natural::from(3u32))).is_none());
/// ```
pub fn local_witness(g: &[Integer; 5], place: &Place) -> Option<LocalWitness> {
    local_witness_with(g, place, &mut SolubilityWorkspace::default())
}

/// As [`local_witness`], reusing the scratch state `ws` across calls.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{local_witness_with, Place, SolubilityWorkspace};
/// let mut ws = SolubilityWorkspace::default();
/// let place = Place::Prime(Natural::from(1_000_003u32));
/// let g = [1, 0, 0, 0, 3].map(Integer::from);
/// assert!(local_witness_with(&g, &place, &mut ws).is_some());
/// ```
pub fn local_witness_with(g: &[Integer; 5], place: &Place, ws: &mut SolubilityWorkspace) -> Option<LocalWitness> {
    witness_given_disc(g, place, &kernel::discriminant(g), ws)
}

fn witness_given_disc(g: &[Integer; 5], place: &Place, disc: &Integer, ws: &mut SolubilityWorkspace) -> Option<LocalWitness> {
    if g.iter().all(|c| *c == 0u32) {
        return None;
    }
    if let Place::Prime(p) = place {
        if !kernel::is_prime(p, &mut ws.primes) {
            return None;
        }
    }
    if *disc != 0u32 {
        let w = squarefree_witness(g, place, disc.sign())?;
        debug_assert!(check_witness(g, place, &w), "witness {w:?} fails for {g:?} at {place:?}");
        return Some(w);
    }
    degenerate_witness(g, place)
}

/// As [`local_witness`], but rejecting bad input with a typed error:
/// [`ErrorKind::Singular`] for a quartic with zero discriminant (no genus
/// one curve) and [`ErrorKind::InvalidValue`] for a `Prime` place holding a
/// non-prime.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::{solubility::{try_local_witness, Place}, ErrorKind};
/// let sq = [1, 0, 2, 0, 1].map(Integer::from); // (x^2 + z^2)^2
/// assert_eq!(try_local_witness(&sq, &Place::Real).unwrap_err().kind(), &ErrorKind::Singular);
/// let g = [1, 0, 0, 0, 3].map(Integer::from);
/// let bad = Place::Prime(Natural::from(9u32));
/// assert_eq!(try_local_witness(&g, &bad).unwrap_err().kind(), &ErrorKind::InvalidValue);
/// assert!(try_local_witness(&g, &Place::Real).unwrap().is_some());
/// ```
pub fn try_local_witness(g: &[Integer; 5], place: &Place) -> Result<Option<LocalWitness>, Error> {
    if let Place::Prime(p) = place {
        if !kernel::is_prime(p, &mut kernel::PrimeMemo::default()) {
            return Err(Error::new(ErrorKind::InvalidValue, format!("the place {p} is not a prime")));
        }
    }
    if kernel::discriminant(g) == 0u32 {
        return Err(Error::new(
            ErrorKind::Singular,
            "the binary quartic has discriminant zero, so y^2 = g(x, z) is not a curve of genus one",
        ));
    }
    Ok(local_witness(g, place))
}

/// Whether `y^2 = g(x, z)` has a point over the completion `place`
/// (`false` if `p` is not prime). Same as `local_witness(g, place).is_some()`.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{is_locally_soluble, Place};
/// let g = [-1, 0, 0, 0, -1].map(Integer::from); // y^2 = -x^4 - z^4
/// assert!(!is_locally_soluble(&g, &Place::Real));
/// assert!(is_locally_soluble(&g, &Place::Prime(Natural::from(5u32)))); // g(1, 0) = -1 = 2^2 mod 5
/// ```
pub fn is_locally_soluble(g: &[Integer; 5], place: &Place) -> bool {
    local_witness(g, place).is_some()
}

/// Witnesses at the real place and at each prime of `primes`, or the first
/// place (real place first, then `primes` in order) where `y^2 = g(x, z)`
/// has no point. A non-prime entry of `primes` is reported as failing.
///
/// To decide solubility **everywhere**, pass `2` and every odd prime
/// dividing the discriminant of `g` ([`quartic_discriminant`]). No other
/// prime can fail: for an odd prime `p` not dividing the discriminant,
/// `g mod p` has four distinct roots on `P^1` over the algebraic closure, so
/// `y^2 = g(x, z)` reduces to a smooth curve of genus one over `F_p`, which
/// has at least `p + 1 - 2 sqrt(p) = (sqrt(p) - 1)^2 > 0` points by the
/// Hasse-Weil bound (Hasse 1933; see Silverman, *The Arithmetic of Elliptic
/// Curves*, V.1.1, applied to the Jacobian, which has the same number of
/// points over `F_p`), and a point of the smooth reduction lifts to `Z_p`
/// by Hensel's lemma.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::solubility::{everywhere_locally_soluble, Place};
/// // 2x^4 - 34z^4 is locally soluble everywhere (Lind 1940, Reichardt 1942);
/// // its discriminant is -2^14 17^3
/// let g = [2, 0, 0, 0, -34].map(Integer::from);
/// let ws = everywhere_locally_soluble(&g, &[Natural::from(2u32), Natural::from(17u32)]).unwrap();
/// assert_eq!(ws.len(), 3);
/// // 2x^4 + 3z^4 fails at 3 (values 2 mod 3 or of valuation 1) and at 2
/// // (values 2 * odd, 5 mod 8 or 3 mod 8); the first failure is reported
/// let h = [2, 0, 0, 0, 3].map(Integer::from);
/// assert_eq!(
///     everywhere_locally_soluble(&h, &[Natural::from(3u32), Natural::from(2u32)]),
///     Err(Place::Prime(Natural::from(3u32)))
/// );
/// ```
pub fn everywhere_locally_soluble(g: &[Integer; 5], primes: &[Natural]) -> Result<Vec<(Place, LocalWitness)>, Place> {
    everywhere_locally_soluble_with(g, primes, &mut SolubilityWorkspace::default())
}

/// As [`everywhere_locally_soluble`], reusing the scratch state `ws` across
/// calls (see [`SolubilityWorkspace`]).
pub fn everywhere_locally_soluble_with(
    g: &[Integer; 5],
    primes: &[Natural],
    ws: &mut SolubilityWorkspace,
) -> Result<Vec<(Place, LocalWitness)>, Place> {
    let disc = kernel::discriminant(g);
    let mut out = Vec::with_capacity(primes.len() + 1);
    let places = std::iter::once(Place::Real).chain(primes.iter().map(|p| Place::Prime(p.clone())));
    for place in places {
        match witness_given_disc(g, &place, &disc, ws) {
            Some(w) => out.push((place, w)),
            None => return Err(place),
        }
    }
    Ok(out)
}

// ---- internals ----

enum Hit {
    Real(Integer, Integer),
    Padic(padic::PadicHit),
}

fn hit_point(h: &padic::PadicHit, t: &Integer) -> LocalWitness {
    if h.x_chart {
        LocalWitness { x: t.clone(), z: Integer::ONE }
    } else {
        LocalWitness { x: Integer::ONE, z: t.clone() }
    }
}

/// Search on a squarefree form of even degree (`form[i]` the coefficient of
/// `x^(n-i) z^i`).
fn form_hit(form: &[Integer], place: &Place, disc_sign: Option<std::cmp::Ordering>) -> Option<Hit> {
    match place {
        Place::Real => real::real_positive_point(form, disc_sign).map(|(x, z)| Hit::Real(x, z)),
        Place::Prime(p) => {
            if *p < (1u64 << 62) {
                let mut words = [0i128; 5];
                let mut fits = true;
                for (w, c) in words.iter_mut().zip(form) {
                    match i128::try_from(c) {
                        Ok(v) => *w = v,
                        Err(_) => fits = false,
                    }
                }
                if fits {
                    // invariant: p < 2^62 was checked just above
                    let pw = i128::from(u64::try_from(p).expect("below 2^62"));
                    if let Ok(hit) = padic::padic_hit(&words[..form.len()], pw, p) {
                        return hit.map(Hit::Padic);
                    }
                }
            }
            let pi = Integer::from(p.clone());
            match padic::padic_hit(form, pi, p) {
                Ok(hit) => hit.map(Hit::Padic),
                // invariant: the Integer instance of Coeff never reports overflow
                Err(padic::Overflow) => unreachable!("Integer arithmetic does not overflow"),
            }
        }
    }
}

fn squarefree_witness(g: &[Integer; 5], place: &Place, disc_sign: std::cmp::Ordering) -> Option<LocalWitness> {
    match form_hit(g, place, Some(disc_sign))? {
        Hit::Real(x, z) => Some(LocalWitness { x, z }),
        Hit::Padic(h) => Some(hit_point(&h, &h.t)),
    }
}

/// Zero discriminant: `g = r q^2` with `r` squarefree; search on `r`, then
/// move within the certified neighbourhood off the zeros of `g`.
fn degenerate_witness(g: &[Integer; 5], place: &Place) -> Option<LocalWitness> {
    let r = kernel::odd_part(g);
    let nonzero = |w: &LocalWitness| real::form_value(g, &w.x, &w.z) != 0u32;
    match form_hit(&r, place, None)? {
        Hit::Padic(h) => {
            // invariant: form_hit gives a p-adic hit only at a Prime place
            let Place::Prime(p) = place else { unreachable!("p-adic hit at a prime") };
            let step = Integer::from(p.clone()).pow(u64::from(h.radius));
            // g has at most four zeros on P^1, so five distinct points of the
            // certified class contain one where g does not vanish
            for j in 0..5u32 {
                let t = &h.t + Integer::from(j) * &step;
                let w = hit_point(&h, &t);
                if nonzero(&w) {
                    return Some(w);
                }
            }
            // invariant: a non-zero quartic form has at most four zeros on P^1, so one of five points is not a zero
            unreachable!("a quartic form has at most four zeros on P^1")
        }
        Hit::Real(x, z) => {
            let w = LocalWitness { x: x.clone(), z: z.clone() };
            if nonzero(&w) {
                return Some(w);
            }
            // approach (x : z) along (x N - z, z N + x), N -> infinity: r stays
            // positive near (x : z) and g has finitely many zeros
            let mut n = Integer::from(2);
            loop {
                let (a, b) = (&x * &n - &z, &z * &n + &x);
                let d = Integer::from((&a).unsigned_abs().gcd((&b).unsigned_abs()));
                let w = LocalWitness { x: a / &d, z: b / &d };
                if real::form_value(&r, &w.x, &w.z) > 0u32 && nonzero(&w) {
                    return Some(w);
                }
                n *= Integer::from(2);
            }
        }
    }
}

#[cfg(feature = "serde")]
crate::decimal_serde::place_form!(solubility);
#[cfg(feature = "serde")]
crate::decimal_serde::plain!(LocalWitness);

#[cfg(test)]
mod tests;
