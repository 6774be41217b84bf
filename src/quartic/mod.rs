//! Binary quartic forms and 2-coverings of elliptic curves.
//!
//! A binary quartic `g(x,z) = a x^4 + b x^3 z + c x^2 z^2 + d x z^3 + e z^4`
//! with invariants `I`, `J` defines the curve `y^2 = g(x,z)`, a 2-covering of
//! the elliptic curve `E_{I,J}: Y^2 = X^3 - 27 I X - 27 J` (Birch and
//! Swinnerton-Dyer, *Notes on elliptic curves I*, J. reine angew. Math. 212
//! (1963); Cremona, *Algorithms for Modular Elliptic Curves*, 2nd ed., 3.5;
//! Cremona, *Classical invariants and 2-descent on elliptic curves*,
//! J. Symbolic Comput. 31 (2001)).
//!
//! This module provides
//! * the [`Quartic`] type with its invariants, seminvariants, covariants
//!   (Hessian `g_H` and sextic `g_6`) and the `GL2` action;
//! * the covering map from a point on `y^2 = g(x,z)` to `E_{I,J}` and to the
//!   user's Weierstrass model ([`Quartic::image_on_jacobian`],
//!   [`Quartic::image_on_curve`]);
//! * reduction and `GL2(Z)`-equivalence ([`reduce`], [`gl2z_equivalent`]);
//! * the enumeration of all `GL2(Z)`-classes with given invariants
//!   ([`quartics_with_invariants`]);
//! * the invariants to enumerate for a curve ([`covering_invariants`]);
//! * minimisation at a prime ([`minimise_at`], [`minimise_covering`]);
//! * the class of a quartic in `(Q[φ]/F(φ))^* / squares` and the
//!   `GL2(Q)`-equivalence test ([`covering_class`], [`same_covering`]).
//!
//! # Limits
//!
//! * The search box grows like `max(|I|^{1/2}, |J|^{1/3})^3`: about a
//!   millisecond for `|I|` in the hundreds, a tenth of a second for
//!   `I ≈ 4.5·10^4`, seconds for `I ≈ 5·10^6`. Use
//!   [`SearchOptions::with_max_candidates`] to bound it.
//! * The `GL2(Z)` test ([`gl2z_decide`], [`gl2z_equivalent`]) is proven
//!   at any size: the covariant point `τ` is enclosed by interval
//!   arithmetic in multiple precision (raised until it decides), which makes
//!   the finite set of candidate reduced forms provably complete, and a
//!   common candidate is checked in integers. [`reduce`] and the
//!   enumeration's grouping into classes use the same candidate sets; a
//!   double-precision (or 256-bit) `τ` only chooses the first moves.
//! * The covering-class test ([`same_covering`], [`CoveringClass::same_as`])
//!   is exact at any size: no floating-point step decides it.
//! * Local solubility is not decided here: the enumeration returns all
//!   classes (negative definite ones optionally), ELS or not.

// NaN-aware float comparisons (`!(x > 0.0)`) are intended; the scanners take many scalars.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::too_many_arguments, clippy::needless_range_loop)]

mod core;
mod reduction;
mod enumerate;
mod classes;
mod numeric;
mod proven;
mod quick_box;
mod minimise;

pub use self::core::{Matrix, Quartic, RootType};
pub use self::reduction::{gl2z_decide, gl2z_equivalence, gl2z_equivalent, reduce};
pub use self::enumerate::{covering_invariants, covering_invariants_conservative, quartics_with_invariants, SearchOptions};
pub use self::classes::{covering_class, same_covering, CoveringClass};
pub use self::minimise::{minimise_at, minimise_covering, MinimisedQuartic};
