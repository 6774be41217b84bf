//! Serde helpers (feature `serde`) writing malachite numbers as decimal
//! strings, so that JSON readers never round them through floating point.
//!
//! An [`Integer`] is written `"-12"`, a [`Natural`] `"37"`, a [`Rational`]
//! `"-3/4"` (or `"5"` when integral). Containers of them (`Option`, `Vec`,
//! arrays, pairs) are handled by the same [`decimal`] module:
//!
//! ```
//! # #[cfg(feature = "serde")] {
//! use malachite::{Integer, Rational};
//! #[derive(serde::Serialize, serde::Deserialize, PartialEq, Debug)]
//! struct Sample {
//!     #[serde(with = "twofold::decimal_serde::decimal")]
//!     n: Integer,
//!     #[serde(with = "twofold::decimal_serde::decimal")]
//!     xs: Vec<(Integer, Rational)>,
//! }
//! let s = Sample { n: Integer::from(-12), xs: vec![(Integer::from(2), Rational::from_signeds(3, 4))] };
//! let text = serde_json::to_string(&s).unwrap();
//! assert_eq!(text, r#"{"n":"-12","xs":[["2","3/4"]]}"#);
//! assert_eq!(serde_json::from_str::<Sample>(&text).unwrap(), s);
//! # }
//! ```

use malachite::{Integer, Natural, Rational};
use serde::de::Error as _;
use serde::{Deserialize, Deserializer, Serialize, Serializer};
use std::str::FromStr;

/// A value with a decimal-string serialised form (numbers), or a container of
/// such values, or a value that is already serialisable as it is.
pub trait DecimalForm: Sized {
    /// Writes the value.
    fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error>;
    /// Reads the value back.
    fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error>;
}

struct Out<'a, T>(&'a T);
impl<T: DecimalForm> Serialize for Out<'_, T> {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        self.0.write(s)
    }
}
struct In<T>(T);
impl<'de, T: DecimalForm> Deserialize<'de> for In<T> {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        T::read(d).map(In)
    }
}

fn read_str<'de, D: Deserializer<'de>, T: FromStr>(d: D, what: &str) -> Result<T, D::Error> {
    let s = String::deserialize(d)?;
    T::from_str(s.trim()).map_err(|_| D::Error::custom(format!("expected {what} as a decimal string, got {s:?}")))
}

macro_rules! number {
    ($t:ty, $what:expr) => {
        impl DecimalForm for $t {
            fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                s.collect_str(self)
            }
            fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                read_str(d, $what)
            }
        }
    };
}
number!(Integer, "an integer");
number!(Natural, "a non-negative integer");
number!(Rational, "a rational number");

/// Types written by their own `Serialize` impl inside decimal containers.
macro_rules! plain {
    ($($t:ty),*) => {$(
        impl DecimalForm for $t {
            fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                self.serialize(s)
            }
            fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                <$t>::deserialize(d)
            }
        }
    )*};
}
plain!(i8, u32, u64, usize, crate::Point, crate::solubility::LocalWitness);

impl<T: DecimalForm> DecimalForm for Option<T> {
    fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        self.as_ref().map(Out).serialize(s)
    }
    fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        Ok(Option::<In<T>>::deserialize(d)?.map(|x| x.0))
    }
}

impl<T: DecimalForm> DecimalForm for Vec<T> {
    fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_seq(self.iter().map(Out))
    }
    fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        Ok(Vec::<In<T>>::deserialize(d)?.into_iter().map(|x| x.0).collect())
    }
}

impl<T: DecimalForm> DecimalForm for [T; 5] {
    fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_seq(self.iter().map(Out))
    }
    fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let v = <[In<T>; 5]>::deserialize(d)?;
        Ok(v.map(|x| x.0))
    }
}

impl<A: DecimalForm, B: DecimalForm> DecimalForm for (A, B) {
    fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        (Out(&self.0), Out(&self.1)).serialize(s)
    }
    fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let (a, b) = <(In<A>, In<B>)>::deserialize(d)?;
        Ok((a.0, b.0))
    }
}

/// For `#[serde(with = "twofold::decimal_serde::decimal")]` on a field whose
/// type is a malachite number or a container of them.
pub mod decimal {
    use super::DecimalForm;
    use serde::{Deserializer, Serializer};

    /// Serialises with numbers as decimal strings.
    pub fn serialize<T: DecimalForm, S: Serializer>(v: &T, s: S) -> Result<S::Ok, S::Error> {
        v.write(s)
    }
    /// Reads numbers from decimal strings.
    pub fn deserialize<'de, T: DecimalForm, D: Deserializer<'de>>(d: D) -> Result<T, D::Error> {
        T::read(d)
    }
}

// ---- hand-written forms for types whose derived form would be clumsy ----

/// A curve is written as its a-invariants `["a1","a2","a3","a4","a6"]`;
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

macro_rules! place_form {
    ($m:ident) => {
        /// A place is written `"real"` or as its prime, a decimal string.
        impl Serialize for crate::$m::Place {
            fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                match self {
                    crate::$m::Place::Real => s.serialize_str("real"),
                    crate::$m::Place::Prime(p) => s.collect_str(p),
                }
            }
        }
        impl<'de> Deserialize<'de> for crate::$m::Place {
            fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                let s = String::deserialize(d)?;
                if s == "real" {
                    return Ok(crate::$m::Place::Real);
                }
                Natural::from_str(&s)
                    .map(crate::$m::Place::Prime)
                    .map_err(|_| D::Error::custom(format!("expected \"real\" or a prime, got {s:?}")))
            }
        }
    };
}
place_form!(solubility);
place_form!(arith);
