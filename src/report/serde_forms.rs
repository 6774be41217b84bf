//! Serde form (feature `serde`) of the route names.

use serde::de::Error as _;
use serde::{Deserialize, Deserializer, Serialize, Serializer};

/// A route is written by its report name (`"quartic"`, `"2-isogeny"`,
/// `"2-isogeny+quartic"`, `"none"`).
impl Serialize for crate::Route {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(self.name())
    }
}
impl<'de> Deserialize<'de> for crate::Route {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        use crate::Route as R;
        let s = String::deserialize(d)?;
        [R::Isogeny, R::Quartic, R::IsogenyAndQuartic, R::None]
            .into_iter()
            .find(|r| r.name() == s)
            .ok_or_else(|| D::Error::custom(format!("not a route name: {s:?}")))
    }
}
