//! The error type for bad input and exhausted budgets.

use std::fmt;

/// What went wrong, for callers that want to branch on it.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "snake_case"))]
#[non_exhaustive]
pub enum ErrorKind {
    /// The text could not be read as a curve or number.
    Parse,
    /// The Weierstrass model has discriminant zero.
    Singular,
    /// A number is too large for the operation asked of it.
    TooLarge,
    /// A rational number with denominator zero, or a similar invalid value.
    InvalidValue,
    /// An integer could not be factored within the budget.
    FactorBudget,
    /// The time budget ran out or the work was cancelled.
    Budget,
}

/// An error from twofold: a kind and a message saying what was expected.
///
/// ```
/// use twofold::{Curve, ErrorKind};
/// let err = Curve::parse("[0,0,0,0,0]").unwrap_err();
/// assert_eq!(err.kind(), &ErrorKind::Singular);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct Error {
    kind: ErrorKind,
    message: String,
}

impl Error {
    pub(crate) fn new(kind: ErrorKind, message: impl Into<String>) -> Self {
        Error { kind, message: message.into() }
    }

    /// The kind of error.
    pub fn kind(&self) -> &ErrorKind {
        &self.kind
    }

    /// The human-readable message.
    pub fn message(&self) -> &str {
        &self.message
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let k = match self.kind {
            ErrorKind::Parse => "parse error",
            ErrorKind::Singular => "singular curve",
            ErrorKind::TooLarge => "input too large",
            ErrorKind::InvalidValue => "invalid value",
            ErrorKind::FactorBudget => "factorisation budget exhausted",
            ErrorKind::Budget => "budget exhausted",
        };
        write!(f, "{k}: {}", self.message)
    }
}

impl std::error::Error for Error {}
