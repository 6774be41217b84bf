//! The descents: through a rational 2-isogeny and (later) through quartic
//! 2-coverings, with the F2 bookkeeping of Selmer groups.

pub(crate) mod f2;
pub mod full;
pub mod isogeny;
pub mod algebra;
pub(crate) mod cubic_second;
pub(crate) mod cube_isogeny;
