//! Arithmetic of quadratic and cubic number fields: polynomials over Z, Q
//! and F_p, the maximal order, ideals, class groups, units and the groups
//! `K(S,2)` that a 2-descent over `Q[x]/(f)` needs.
//!
//! ```
//! use malachite::Integer;
//! use twofold::numfield::NumberField;
//! let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
//! // Q(sqrt(-5)): discriminant -20
//! let k = NumberField::new(&z(&[5, 0, 1])).unwrap();
//! assert_eq!(k.discriminant(), &Integer::from(-20));
//! ```

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
