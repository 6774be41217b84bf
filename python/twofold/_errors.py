"""The exceptions of twofold (raised by the extension module as well)."""

from __future__ import annotations

__all__ = [
    "TwofoldError",
    "ParseError",
    "SingularCurveError",
    "BudgetError",
    "InternalError",
]


class TwofoldError(Exception):
    """Base class of every error that twofold raises for a curve.

    ``str(err)`` and ``err.message`` are the library's message (for example
    ``"singular curve: ..."``); ``err.kind`` names the library's error kind
    in snake case: ``parse``, ``too_large``, ``invalid_value``,
    ``singular``, ``budget``, ``factor_budget`` or ``internal``.
    """

    def __init__(self, message: str, kind: str = "internal") -> None:
        super().__init__(message)
        self.message = message
        self.kind = kind

    def __reduce__(self):  # picklable across processes (Dask workers)
        return (type(self), (self.message, self.kind))


class ParseError(TwofoldError, ValueError):
    """The input could not be read as a curve: malformed text, a number too
    large for the parser (kind ``too_large``), or an invalid value such as a
    zero denominator (kind ``invalid_value``)."""


class SingularCurveError(TwofoldError, ValueError):
    """The Weierstrass model has discriminant zero: not an elliptic curve."""


class BudgetError(TwofoldError, TimeoutError):
    """The time budget ran out before anything could be reported; in
    practice the discriminant could not be factored in time (kind
    ``factor_budget``). A budget that runs out later gives a report with
    ``budget_exhausted`` true instead, never this error."""


class InternalError(TwofoldError, RuntimeError):
    """Two computations that must agree did not, or the computation
    panicked: a bug in twofold, never a property of the curve. Please
    report it with the input."""
