//! Serde forms (feature `serde`) of this room's types; numbers inside them
//! are decimal strings (see [`crate::decimal_serde`]).

use crate::decimal_serde::{DecimalForm, In, Out};
use malachite::{Integer, Rational};
use serde::de::Error as _;
use serde::{Deserialize, Deserializer, Serialize, Serializer};

/// A curve is written as its coefficients `["a1","a2","a3","a4","a6"]`;
/// reading checks the discriminant again.
impl Serialize for crate::Curve {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_seq(self.coefficients().iter().map(Out))
    }
}
impl<'de> Deserialize<'de> for crate::Curve {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let a = <[Integer; 5]>::read(d)?;
        crate::Curve::new(a).map_err(D::Error::custom)
    }
}

/// A point is written `["x","y"]` (rational strings), the point at infinity
/// as the string `"infinity"`.
impl Serialize for crate::Point {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self {
            crate::Point::Infinity => s.serialize_str("infinity"),
            crate::Point::Affine(x, y) => (Out(x), Out(y)).serialize(s),
        }
    }
}
impl<'de> Deserialize<'de> for crate::Point {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        #[derive(Deserialize)]
        #[serde(untagged)]
        enum Form {
            Word(String),
            Pair(In<Rational>, In<Rational>),
        }
        match Form::deserialize(d)? {
            Form::Word(w) if w == "infinity" => Ok(crate::Point::Infinity),
            Form::Word(w) => Err(D::Error::custom(format!("expected [x, y] or \"infinity\", got {w:?}"))),
            Form::Pair(x, y) => Ok(crate::Point::Affine(x.0, y.0)),
        }
    }
}

crate::decimal_serde::plain!(crate::Point);
