//! Arithmetic of quadratic and cubic number fields: polynomials over Z, Q
//! and F_p, the maximal order, ideals, class groups, units and the groups
//! `K(S,2)` that a 2-descent over `Q[x]/(f)` needs.
//!
//! ```
//! use malachite::Integer;
//! use twofold::arith::FactorLimits;
//! use twofold::numfield::{ClassGroupOptions, FactorBaseBound, NumberField};
//! let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
//! // Q(sqrt -5): discriminant -20, class group of order 2
//! let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
//! assert_eq!(k.discriminant(), &Integer::from(-20));
//! let p2 = &k.primes_above(2).unwrap()[0]; // 2 ramifies: (2) = P^2, P not principal
//! assert_eq!((p2.e, p2.f), (2, 1));
//! let cg = k.class_group(&ClassGroupOptions::default()).unwrap();
//! assert_eq!(cg.class_number, 2);
//! assert_eq!(cg.bound_kind, FactorBaseBound::Minkowski); // small field: unconditional bound
//! // K(S,2) for S = {P}: -1 and a generator of P^2 = (2), dimension r + 1 + |S| + dim Cl_S[2] = 2
//! let ks = k.square_classes(&[2], &ClassGroupOptions::default()).unwrap();
//! assert_eq!(ks.dimension(), 2);
//! ```
//!
//! # Overview
//!
//! - [`NumberField`]: `Q[x]/(f)` for an irreducible `f` of degree 2 or 3,
//!   built with its maximal order (Round 2 at the primes whose square
//!   divides `disc(f)`; the discriminant is factored, or supplied by the
//!   caller with [`NumberField::with_factored_discriminant`]). Its
//!   [`Element`]s have integer coordinates on the integral basis over a
//!   common denominator.
//! - [`Ideal`]: fractional ideals in Hermite normal form; [`PrimeIdeal`]s
//!   from [`NumberField::primes_above`], valuations, factorisation.
//! - [`NumberField::class_group`] gives a [`ClassGroup`]: structure,
//!   regulator, fundamental units as [`CompactProduct`]s.
//! - [`NumberField::square_classes`] gives [`SquareClasses`], the group
//!   `K(S,2)` with a basis and a coordinate map.
//! - [`poly`]: resultants, discriminants, rational roots and factorisation
//!   of small polynomials over Z and Q.
//!
//! # What is proven
//!
//! Maximal orders, discriminants, ideals, decompositions and valuations are
//! exact. Class groups and units rest on two further statements: the factor
//! base generates the class group (unconditional with the Minkowski bound,
//! conditional on GRH with Bach's bound, see [`FactorBaseBound`]), and `h R`
//! is the computed `h* R*` rather than a proper divisor of it, checked
//! against an Euler-product estimate of the zeta residue (numerical, not a
//! proof). Regulators and embeddings are f64.
//!
//! # Performance and limits
//!
//! Written for small fields: the class group completes for quadratic
//! fields of small regulator and cubic fields of discriminant up to about
//! 10^4; beyond, it ends with [`ErrorKind::Budget`](crate::ErrorKind::Budget)
//! (never a wrong answer). Primes above 2^63 in Round 2 or decompositions
//! give [`ErrorKind::TooLarge`](crate::ErrorKind::TooLarge).

// Matrix code reads best with explicit indices.
#![allow(clippy::needless_range_loop)]

pub(crate) mod fp;
pub(crate) mod linalg;
pub mod poly;
mod order;
mod field;
mod ideal;
mod classgroup;
mod sunits;

pub use field::{Element, NumberField};
pub use ideal::{Ideal, PrimeIdeal};
pub use classgroup::{ClassGroup, ClassGroupOptions, CompactProduct, FactorBaseBound, EULER_PRODUCT_LIMIT, MAX_ROUNDS, MIN_FACTOR_BASE_BOUND};
pub use sunits::SquareClasses;
