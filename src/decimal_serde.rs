//! Serde helpers (feature `serde`) writing malachite numbers as decimal
//! strings, so that JSON readers never round them through floating point.
//!
//! An [`Integer`] is written `"-12"`, a [`Natural`] `"37"`, a [`Rational`]
//! `"-3/4"` (or `"5"` when integral). Containers of them (`Option`, `Vec`,
//! arrays, pairs) are handled by the same [`decimal`] module:
//!
//! ```ignore
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

pub(crate) struct Out<'a, T>(pub(crate) &'a T);
impl<T: DecimalForm> Serialize for Out<'_, T> {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        self.0.write(s)
    }
}
pub(crate) struct In<T>(pub(crate) T);
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
        impl $crate::decimal_serde::DecimalForm for $t {
            fn write<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                serde::Serialize::serialize(self, s)
            }
            fn read<'de, D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                <$t as serde::Deserialize>::deserialize(d)
            }
        }
    )*};
}
plain!(i8, u32, u64, usize);
pub(crate) use plain;

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

macro_rules! array_form {
    ($($n:literal),*) => {$(
        impl<T: DecimalForm> DecimalForm for [T; $n] {
            fn write<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                s.collect_seq(self.iter().map(Out))
            }
            fn read<'de, D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                let v = <[In<T>; $n]>::deserialize(d)?;
                Ok(v.map(|x| x.0))
            }
        }
    )*};
}
array_form!(3, 5);

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

// The hand-written forms of the library's own types (curves, points,
// Kodaira symbols, routes, places) live beside those types, in each room's
// `serde_forms.rs`; this module stays a leaf that every room may use.

/// The serde form of a `Place` enum (`Real` or `Prime(Natural)`) of room
/// `$m`: `"real"` or the prime as a decimal string.
macro_rules! place_form {
    ($m:ident) => {
        /// A place is written `"real"` or as its prime, a decimal string.
        impl serde::Serialize for crate::$m::Place {
            fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                match self {
                    crate::$m::Place::Real => s.serialize_str("real"),
                    crate::$m::Place::Prime(p) => s.collect_str(p),
                }
            }
        }
        impl<'de> serde::Deserialize<'de> for crate::$m::Place {
            fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                let s = <String as serde::Deserialize>::deserialize(d)?;
                if s == "real" {
                    return Ok(crate::$m::Place::Real);
                }
                <malachite::Natural as std::str::FromStr>::from_str(&s)
                    .map(crate::$m::Place::Prime)
                    .map_err(|_| <D::Error as serde::de::Error>::custom(format!("expected \"real\" or a prime, got {s:?}")))
            }
        }
    };
}
pub(crate) use place_form;
