"""Type stubs of twofold (see the docstrings in __init__.py)."""

from fractions import Fraction
from typing import Any, Dict, Iterable, List, Optional, Sequence, Tuple, TypedDict, Union

from ._errors import (
    BudgetError as BudgetError,
    InternalError as InternalError,
    ParseError as ParseError,
    SingularCurveError as SingularCurveError,
    TwofoldError as TwofoldError,
)

__version__: str

Coefficient = Union[int, Fraction, str]
CurveLike = Union[str, Sequence[Coefficient]]

class DescentCurve(TypedDict):
    coefficients: List[str]
    isogeny_degree: int

# "class" is a keyword, hence the functional form
ShaSuspect = TypedDict(
    "ShaSuspect",
    {
        "origin": str,
        "quartic": List[str],
        "class": Optional[str],
        "everywhere_locally_soluble": bool,
        "searched_height": int,
        "in_sha": bool,
    },
)

class AnalyticRoute(TypedDict):
    """The analytic route: the proven root number, the enclosure of
    L(E,1) (order 0) or L'(E,1) (order 1) as decimal strings rounded
    outward, the number of terms, and the rank it proves (0, 1 or None)."""

    root_number: Optional[int]
    order: Optional[int]
    enclosure: Optional[List[str]]
    terms: Optional[int]
    rank: Optional[int]

class Report(TypedDict):
    """One report: the JSON line of ``rank --json`` (README.md lists the
    meaning of every field). Exact numbers are decimal strings."""

    input: str
    minimal_model: List[str]
    conductor: str
    torsion: Optional[List[int]]  # null when the budget ran out in the torsion step
    rank_lower: Optional[int]
    rank_upper: Optional[int]
    rank: Optional[int]
    rank_proven_by: List[str]
    descent_bounds: List[Optional[int]]
    route: str
    isogeny_selmer_dims: Optional[List[int]]
    two_selmer_dim: Optional[int]
    two_selmer_route: Optional[str]
    descent_curve: Optional[DescentCurve]
    analytic_route: Optional[AnalyticRoute]
    sha2_order: Optional[str]
    isogeny_sha_dims: Optional[List[List[int]]]
    points: List[List[str]]
    sha_suspects: List[ShaSuspect]
    root_number: Optional[int]
    vanishing_order: Optional[int]
    saturated_basis: Optional[List[List[str]]]
    regulator: Optional[str]
    period_omega: Optional[str]
    tamagawa_numbers: Optional[List[Tuple[str, int]]]
    sha_bsd_estimate: Optional[str]
    certificate: Optional[str]
    budget_exhausted: bool
    elapsed_ms: int

class ErrorItem(TypedDict):
    """An item of :func:`analyse_many` for an input that gave an error."""

    input: str
    error: str

def curve_text(curve: CurveLike) -> str: ...
def analyse(
    curve: CurveLike,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> Report: ...
def analyse_many(
    curves: Iterable[CurveLike],
    threads: Optional[int] = None,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
) -> List[Union[Report, ErrorItem]]: ...
def to_fraction(s: Union[str, int, Fraction]) -> Fraction: ...
