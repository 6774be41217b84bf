"""twofold: Mordell-Weil ranks of elliptic curves over Q by 2-descent.

Python bindings of the Rust library ``twofold``. Each report is a ``dict``
parsed from exactly the JSON line that ``rank --json`` prints for the same
curve (``RankReport::to_json``), so the keys and their meanings are the ones
documented in the project's README.md ("The ``rank`` example"): one schema
for the command line and for Python.

Exact numbers stay exact as **decimal strings**, as in the JSON: the
coefficients of ``minimal_model``, the ``conductor``, the coordinates of
``points`` and ``saturated_basis`` (``"-7/4"``), the primes of
``tamagawa_numbers``. Strings keep integers of any size and rationals
unambiguous across JSON, CSV and Dask; turn one into a
:class:`fractions.Fraction` with :func:`to_fraction` (``int(s)`` works for
the integers). Small counts (``rank``, ``torsion``, Selmer dimensions,
``root_number``, Tamagawa numbers ``c_p``) are Python ints. Numerical values
(``regulator``, ``period_omega``, ``sha_bsd_estimate``) are decimal strings
in scientific notation; ``float(s)`` reads them, ``to_fraction(s)`` gives the
exact value of the string printed.

>>> import twofold
>>> r = twofold.analyse("[0,0,1,-7,6]")      # y^2 + y = x^3 - 7x + 6
>>> r["rank"], r["conductor"]
(3, '5077')
"""

from __future__ import annotations

import json
import numbers
from fractions import Fraction
from typing import Any, Dict, Iterable, List, Optional, Sequence, Union

from ._errors import (
    BudgetError,
    InternalError,
    ParseError,
    SingularCurveError,
    TwofoldError,
)
from . import _native

__version__ = _native.__version__

__all__ = [
    "analyse",
    "analyse_many",
    "curve_text",
    "to_fraction",
    "TwofoldError",
    "ParseError",
    "SingularCurveError",
    "BudgetError",
    "InternalError",
]

Coefficient = Union[int, Fraction, str]
CurveLike = Union[str, Sequence[Coefficient]]


def _coefficient_text(a: Any) -> str:
    if isinstance(a, bool):
        raise TypeError("a coefficient must be an int, a Fraction or a string, not bool")
    if isinstance(a, numbers.Integral):
        return str(int(a))
    if isinstance(a, Fraction):
        return str(a.numerator) if a.denominator == 1 else f"{a.numerator}/{a.denominator}"
    if isinstance(a, numbers.Rational):
        return _coefficient_text(Fraction(a.numerator, a.denominator))
    if isinstance(a, str):
        return a.strip()
    raise TypeError(
        f"a coefficient must be an int, a Fraction or a string, not {type(a).__name__}"
        " (floats are refused: they are not exact)"
    )


def curve_text(curve: CurveLike) -> str:
    """The text form of a curve as the library reads it.

    A string is returned unchanged (``"[a1,a2,a3,a4,a6]"``, ``"[a4,a6]"`` or
    an equation such as ``"y^2 + y = x^3 - x"``); a sequence of 5 (or 2)
    coefficients (ints, ``Fraction``\\ s or strings of integers or
    rationals) becomes ``"[a1,a2,a3,a4,a6]"`` (or ``"[a4,a6]"``) without
    spaces, which is also the ``input`` field of its report.

    >>> curve_text([0, 0, 1, -7, 6])
    '[0,0,1,-7,6]'
    >>> curve_text((Fraction(-1, 16), 0))
    '[-1/16,0]'
    """
    if isinstance(curve, str):
        return curve
    if isinstance(curve, (bytes, bytearray)):
        raise TypeError("give the curve as str, not bytes")
    try:
        items = list(curve)  # type: ignore[arg-type]
    except TypeError:
        raise TypeError(
            f"a curve is a string or a sequence of coefficients, not {type(curve).__name__}"
        ) from None
    return "[" + ",".join(_coefficient_text(a) for a in items) + "]"


def analyse(
    curve: CurveLike,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> Dict[str, Any]:
    """Analyse one elliptic curve over Q: rank bounds by 2-descent and more.

    ``curve`` is text (``"[a1,a2,a3,a4,a6]"``, ``"[a4,a6]"``, an equation
    such as ``"y^2 + y = x^3 - x"``, rational coefficients allowed) or a
    sequence of 5 or 2 coefficients (see :func:`curve_text`).

    ``budget``: wall-clock seconds for this curve (``None``: no limit). When
    it runs out the report keeps what was proven before and says
    ``budget_exhausted: True``. ``height``: the first search height on the
    coverings (default 300; the search raises it while the bounds do not
    meet). ``evidence``: root number, saturated basis, regulator, period,
    Tamagawa numbers, analytic rank and the analytic order of Sha (turn it
    off for the fastest sweeps; those fields are then null).
    ``certificate``: include the text of the certificate of the descent.

    Returns the report as a dict with exactly the keys of ``rank --json``
    (README.md, "The ``rank`` example"); ``report["rank"]`` is the proven
    rank or ``None`` when the bounds ``rank_lower``, ``rank_upper`` do not
    meet. Exact numbers are decimal strings (see the module docstring and
    :func:`to_fraction`).

    The computation runs with the GIL released; Ctrl-C cancels it.

    Raises :class:`ParseError` (input that cannot be read),
    :class:`SingularCurveError` (discriminant zero), :class:`BudgetError`
    (the discriminant could not be factored within the budget),
    :class:`InternalError` (a bug: please report it), all subclasses of
    :class:`TwofoldError`, with the library's message; ``TypeError`` for an
    argument of the wrong type and ``ValueError`` for a negative budget.

    >>> analyse([0, 0, 1, -1, 0])["rank"]     # y^2 + y = x^3 - x, conductor 37
    1
    """
    text = curve_text(curve)
    line = _native.analyse_json(
        text,
        budget=None if budget is None else float(budget),
        height=None if height is None else int(height),
        evidence=bool(evidence),
        certificate=bool(certificate),
    )
    return json.loads(line)


def analyse_many(
    curves: Iterable[CurveLike],
    threads: Optional[int] = None,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> List[Dict[str, Any]]:
    """Analyse many curves with the library's batch runner.

    Runs on ``threads`` threads (``None``: one per core) with the GIL
    released, ``budget`` seconds per curve, and returns one dict per input
    in input order, each parsed from the JSON line ``rank --json`` prints
    for it. An input that cannot be analysed does not stop the batch: its
    item is ``{"input": text, "error": message}`` (the library's message,
    which starts with the kind, e.g. ``"singular curve: ..."``). The other
    arguments are those of :func:`analyse`. The results do not depend on
    the number of threads (except ``elapsed_ms``, and ``budget_exhausted``
    near a time limit). Ctrl-C cancels the batch.

    >>> [r.get("rank") for r in analyse_many(["[0,0,1,-1,0]", "[0,0,0,0,0]"], threads=2)]
    [1, None]
    """
    if threads is not None:
        threads = int(threads)
        if threads < 1:
            raise ValueError(f"threads must be at least 1, got {threads}")
    texts = [curve_text(c) for c in curves]
    lines = _native.analyse_many_json(
        texts,
        threads=0 if threads is None else threads,
        budget=None if budget is None else float(budget),
        height=None if height is None else int(height),
        evidence=bool(evidence),
        certificate=bool(certificate),
    )
    return [json.loads(line) for line in lines]


def to_fraction(s: Union[str, int, Fraction]) -> Fraction:
    """The exact value of a number from a report, as a ``Fraction``.

    Accepts the decimal strings of the reports: integers (``"5077"``),
    rationals (``"-7/4"``) and the scientific notation of the numerical
    fields (``"4.171435587584e-1"``, read exactly as printed); ints and
    Fractions pass through. Floats are refused (``TypeError``), as they are
    not what a report contains.

    >>> to_fraction("-7/4")
    Fraction(-7, 4)
    >>> to_fraction("2.5e-1")
    Fraction(1, 4)
    """
    if isinstance(s, bool) or not isinstance(s, (str, int, Fraction)):
        raise TypeError(f"expected a decimal string, an int or a Fraction, not {type(s).__name__}")
    if isinstance(s, str):
        try:
            return Fraction(s.strip())
        except (ValueError, ZeroDivisionError) as e:
            raise ValueError(f"not an exact decimal number: {s!r}") from e
    return Fraction(s)
