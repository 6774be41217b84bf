//! The descents: through a rational 2-isogeny, through quartic 2-coverings
//! and (first stage, `cube_isogeny`) through the 3-isogeny of y^2 = x^3 + k,
//! with the F2 bookkeeping of Selmer groups.

pub(crate) mod f2;
pub mod full;
pub mod isogeny;
pub mod algebra;
pub(crate) mod cubic_second;
pub(crate) mod cube_isogeny;
