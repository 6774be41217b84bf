"""Bad input raises the documented exceptions, with the library's messages
(the same text as the ``error`` field of ``rank --json``)."""

import json
import pickle

import pytest

import twofold
from conftest import run_rank


@pytest.mark.parametrize(
    "text, cls, kind",
    [
        ("not a curve", twofold.ParseError, "parse"),
        ("", twofold.ParseError, "parse"),
        ("[1,2,3]", twofold.ParseError, "parse"),
        ("[1/0,0]", twofold.ParseError, "invalid_value"),
        ("[" + "1" * 30000 + ",0]", twofold.ParseError, "too_large"),
        ("[0,0,0,0,0]", twofold.SingularCurveError, "singular"),
        # y^2 = x^3: a cusp (discriminant 0)
        ("y^2 = x^3", twofold.SingularCurveError, "singular"),
        # y^2 = x^3 + x^2: a node (discriminant 0)
        ("y^2 = x^3 + x^2", twofold.SingularCurveError, "singular"),
    ],
)
def test_bad_input_raises(text, cls, kind):
    with pytest.raises(cls) as info:
        twofold.analyse(text)
    err = info.value
    assert isinstance(err, twofold.TwofoldError) and isinstance(err, ValueError)
    assert err.kind == kind
    # the message is the library's: the error field of rank --json for the same input
    if text and "\n" not in text:
        [line] = run_rank([text])
        assert json.loads(line)["error"] == str(err) == err.message


def test_exception_hierarchy():
    for cls in (twofold.ParseError, twofold.SingularCurveError, twofold.BudgetError, twofold.InternalError):
        assert issubclass(cls, twofold.TwofoldError)
    assert issubclass(twofold.BudgetError, TimeoutError)
    assert issubclass(twofold.InternalError, RuntimeError)


def test_exceptions_pickle():
    # they cross process boundaries (Dask workers) intact
    try:
        twofold.analyse("[0,0,0,0,0]")
    except twofold.SingularCurveError as e:
        back = pickle.loads(pickle.dumps(e))
        assert type(back) is twofold.SingularCurveError
        assert (back.message, back.kind) == (e.message, e.kind)


def _is_prime(n):
    if n < 2:
        return False
    for p in (2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37):
        if n % p == 0:
            return n == p
    d, s = n - 1, 0
    while d % 2 == 0:
        d, s = d // 2, s + 1
    for a in (2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41):
        x = pow(a, d, n)
        if x in (1, n - 1):
            continue
        for _ in range(s - 1):
            x = x * x % n
            if x == n - 1:
                break
        else:
            return False
    return True


def _next_prime(n):
    while not _is_prime(n):
        n += 1
    return n


def test_budget_error_when_the_discriminant_cannot_be_factored_in_time():
    # y^2 = x^3 + pq with p, q primes of 30 digits: the discriminant
    # -432 (pq)^2 needs a 60-digit semiprime factored (seconds of SIQS,
    # README.md), far beyond a budget of 10 ms
    p = _next_prime(10**29 + 12345)
    q = _next_prime(3 * 10**29 + 67890)
    with pytest.raises(twofold.BudgetError) as info:
        twofold.analyse([0, 0, 0, 0, p * q], budget=0.01)
    assert info.value.kind in ("budget", "factor_budget")
    # in a batch the same input is an error item, and the batch goes on
    out = twofold.analyse_many([[0, 0, 0, 0, p * q], "[0,0,1,-1,0]"], budget=0.01, threads=2)
    assert set(out[0]) == {"input", "error"}
    assert out[1].get("rank") == 1 or out[1]["budget_exhausted"]


def test_argument_errors():
    with pytest.raises(ValueError):
        twofold.analyse("[0,0,1,-1,0]", budget=-1)
    with pytest.raises(ValueError):
        twofold.analyse("[0,0,1,-1,0]", budget=float("nan"))
    with pytest.raises(ValueError):
        twofold.analyse("[0,0,1,-1,0]", height=0)
    with pytest.raises(ValueError):
        twofold.analyse_many(["[0,0,1,-1,0]"], threads=0)
    with pytest.raises(TypeError):
        twofold.analyse([0, 0, 1, -1.5, 0])
    with pytest.raises(TypeError):
        twofold.analyse(None)
