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
    /// Two computations that must agree did not, or a result failed its
    /// exact re-check: a bug in twofold, never a property of the input.
    /// The message asks for a report.
    Internal,
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
    /// The error of the stage this one wraps, if any (see [`Error::source`](std::error::Error::source)).
    cause: Option<Box<Error>>,
}

impl Error {
    pub(crate) fn new(kind: ErrorKind, message: impl Into<String>) -> Self {
        Error { kind, message: message.into(), cause: None }
    }

    /// An internal inconsistency: two routes disagree, or a result failed its
    /// exact re-check. `place` names the stage.
    pub(crate) fn internal(place: &str, message: impl AsRef<str>) -> Self {
        Error::new(
            ErrorKind::Internal,
            format!(
                "internal inconsistency in {place}: {} (a bug in twofold, not a property of the curve; please report it with the input)",
                message.as_ref()
            ),
        )
    }

    /// Wraps `self` as the cause of a new error of the same kind that says
    /// which stage failed (`source()` returns the original).
    pub(crate) fn in_stage(self, stage: &str) -> Self {
        Error { kind: self.kind.clone(), message: format!("{stage} failed"), cause: Some(Box::new(self)) }
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
            ErrorKind::Internal => "internal error",
        };
        write!(f, "{k}: {}", self.message)?;
        if let Some(c) = &self.cause {
            write!(f, " ({c})")?;
        }
        Ok(())
    }
}

/// `source()` gives the error of the stage that this one wraps.
///
/// ```
/// use std::error::Error as _;
/// use twofold::Curve;
/// let err = Curve::parse("[0,0,0,0,0]").unwrap_err();
/// assert!(err.source().is_none());
/// ```
impl std::error::Error for Error {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        self.cause.as_deref().map(|e| e as &(dyn std::error::Error + 'static))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::error::Error as _;

    /// The three families of kinds stay apart through `in_stage`: an
    /// internal inconsistency keeps its kind and its request for a report,
    /// and `source()` gives back the stage's own error.
    #[test]
    fn a_wrapped_stage_error_keeps_its_kind_and_source() {
        let inner = Error::internal("the descent", "two routes disagree");
        assert!(inner.message().contains("please report"));
        let outer = inner.clone().in_stage("the analytic route");
        assert_eq!(outer.kind(), &ErrorKind::Internal);
        let src = outer.source().and_then(|s| s.downcast_ref::<Error>()).expect("the wrapped error");
        assert_eq!(*src, inner);
        let budget = Error::new(ErrorKind::Budget, "out of time").in_stage("the torsion");
        assert_eq!(budget.kind(), &ErrorKind::Budget);
        assert!(budget.to_string().contains("out of time"));
        assert!(Error::new(ErrorKind::Parse, "x").source().is_none());
    }
}
