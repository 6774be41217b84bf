//! Serde form (feature `serde`) of the Kodaira symbol.

use serde::de::Error as _;
use serde::{Deserialize, Deserializer, Serialize, Serializer};

/// A Kodaira symbol is written as printed: `"I0"`, `"I5"`, `"I1*"`, `"IV*"`.
impl Serialize for crate::local::Kodaira {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}
impl<'de> Deserialize<'de> for crate::local::Kodaira {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        use crate::local::Kodaira as K;
        let s = String::deserialize(d)?;
        let (base, star) = match s.strip_suffix('*') {
            Some(b) => (b, true),
            None => (s.as_str(), false),
        };
        let k = match (base, star) {
            ("I0", false) => Some(K::I0),
            ("II", false) => Some(K::II),
            ("III", false) => Some(K::III),
            ("IV", false) => Some(K::IV),
            ("I0", true) => Some(K::I0Star),
            ("IV", true) => Some(K::IVStar),
            ("III", true) => Some(K::IIIStar),
            ("II", true) => Some(K::IIStar),
            _ => base
                .strip_prefix('I')
                .and_then(|n| n.parse::<u32>().ok())
                .filter(|&n| n >= 1)
                .map(|n| if star { K::InStar(n) } else { K::In(n) }),
        };
        k.ok_or_else(|| D::Error::custom(format!("not a Kodaira symbol: {s:?}")))
    }
}
