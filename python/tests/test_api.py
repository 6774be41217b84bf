"""The Python API: one schema with the JSON line, exact numbers, stubs,
the GIL released, exceptions with the library's messages."""

import ast
import json
import pickle
import re
import threading
import time
from fractions import Fraction
from pathlib import Path

import pytest

import twofold
from conftest import REPO, run_rank, without_time


def json_keys_listed_in_rust_test():
    """The keys tests/json_keys.rs lists for a full report (the stable format)."""
    src = (REPO / "tests" / "json_keys.rs").read_text()
    block = src[src.index("let mut expected = vec![") : src.index("];", src.index("let mut expected = vec!["))]
    return re.findall(r'"([a-z0-9_]+)"', block)


def test_keys_are_the_json_keys_of_the_rust_crate():
    # y^2 + y = x^3 - x, rank 1 (Cremona 1997, Table 1), with a certificate:
    # every key carries a value (the same curve as tests/json_keys.rs)
    r = twofold.analyse([0, 0, 1, -1, 0], certificate=True)
    assert sorted(r) == sorted(json_keys_listed_in_rust_test())
    assert r["minimal_model"] == ["0", "0", "1", "-1", "0"]
    assert r["conductor"] == "37"
    assert (r["rank_lower"], r["rank_upper"], r["rank"]) == (1, 1, 1)
    assert isinstance(r["certificate"], str) and r["certificate"]


def test_stub_report_lists_the_same_keys():
    tree = ast.parse((Path(twofold.__file__).with_suffix(".pyi")).read_text())
    report = next(n for n in tree.body if isinstance(n, ast.ClassDef) and n.name == "Report")
    keys = [n.target.id for n in report.body if isinstance(n, ast.AnnAssign)]
    assert sorted(keys) == sorted(json_keys_listed_in_rust_test())


def test_readme_example_rank_three():
    # y^2 + y = x^3 - 7x + 6, conductor 5077, rank 3 (Cremona 1997, Table 1 lists it)
    r = twofold.analyse("[0,0,1,-7,6]")
    assert r["rank"] == 3 and r["conductor"] == "5077"
    assert r["points"] and all(len(p) == 2 for p in r["points"])


def test_input_forms_give_one_report():
    # y^2 + y = x^3 - x as text, as an equation and as coefficients
    a = without_time(twofold.analyse("[0,0,1,-1,0]"))
    b = without_time(twofold.analyse((0, 0, 1, -1, 0)))
    assert a == b
    c = without_time(twofold.analyse("y^2 + y = x^3 - x"))
    assert {k: v for k, v in c.items() if k != "input"} == {k: v for k, v in a.items() if k != "input"}
    assert c["input"] == "y^2 + y = x^3 - x"


def test_rational_coefficients_and_points_on_the_input_model():
    # y^2 = x^3 - x/16 is y^2 = x^3 - x scaled by u = 2: rank 0, conductor 32
    # (Cremona 1997, Table 1; the same check as the doctest of analyse_text)
    r = twofold.analyse([0, 0, 0, Fraction(-1, 16), 0])
    assert r["input"] == "[0,0,0,-1/16,0]"
    assert r["rank"] == 0 and r["conductor"] == "32"
    # y^2 = x^3 - 36x: the area-6 triangle curve, rank 1 (congruent number 6);
    # every point lies on the model as given, checked here with Fractions
    r = twofold.analyse("y^2 = x^3 - 36x")
    assert r["rank"] == 1
    for x, y in r["points"]:
        X, Y = twofold.to_fraction(x), twofold.to_fraction(y)
        assert Y * Y == X**3 - 36 * X


def test_to_fraction():
    assert twofold.to_fraction("-7/4") == Fraction(-7, 4)
    assert twofold.to_fraction("5077") == 5077
    assert twofold.to_fraction("4.171435587584e-1") == Fraction(4171435587584, 10**13)
    assert twofold.to_fraction(3) == 3
    big = "123456789012345678901234567890123456789"
    assert twofold.to_fraction(big) == int(big)
    with pytest.raises(TypeError):
        twofold.to_fraction(0.5)
    with pytest.raises(ValueError):
        twofold.to_fraction("one half")


def test_curve_text():
    assert twofold.curve_text([0, 0, 1, -7, 6]) == "[0,0,1,-7,6]"
    assert twofold.curve_text((Fraction(-1, 16), 0)) == "[-1/16,0]"
    assert twofold.curve_text("y^2 = x^3 + 1") == "y^2 = x^3 + 1"
    with pytest.raises(TypeError):
        twofold.curve_text([0, 0, 1, -1.0, 0])
    with pytest.raises(TypeError):
        twofold.curve_text([0, 0, 1, True, 0])
    with pytest.raises(TypeError):
        twofold.curve_text(37)


def test_analyse_many_keeps_input_order_and_error_items():
    # ranks 0, 1, 2 (Cremona 1997, Table 1: conductors 11, 37, 389), then bad lines
    curves = ["[0,-1,1,-10,-20]", "[0,0,1,-1,0]", [0, 1, 1, -2, 0], "[0,0,0,0,0]", "not a curve"]
    out = twofold.analyse_many(curves, threads=2)
    assert [r.get("rank") for r in out] == [0, 1, 2, None, None]
    assert out[2]["input"] == "[0,1,1,-2,0]"
    assert set(out[3]) == {"input", "error"} and out[3]["error"].startswith("singular curve")
    assert out[4]["error"].startswith("parse error")
    # the error items are exactly the lines rank --json prints
    assert [json.loads(l) for l in run_rank(["[0,0,0,0,0]", "not a curve"])] == out[3:]
    assert twofold.analyse_many([]) == []


def test_results_do_not_depend_on_threads():
    curves = ["[0,-1,1,-10,-20]", "[0,0,1,-1,0]", "[0,1,1,-2,0]", "[1,0,1,4,-6]"]
    one = [without_time(r) for r in twofold.analyse_many(curves, threads=1)]
    two = [without_time(r) for r in twofold.analyse_many(curves, threads=2)]
    assert one == two


def test_gil_is_released():
    # a Python thread keeps running while the batch computes
    curves = ["[0,0,1,-7,6]"] * 40
    ticks = 0
    stop = threading.Event()

    def count():
        nonlocal ticks
        while not stop.is_set():
            ticks += 1
            time.sleep(0.001)

    t = threading.Thread(target=count)
    t.start()
    start = time.perf_counter()
    twofold.analyse_many(curves, threads=1)
    took = time.perf_counter() - start
    stop.set()
    t.join()
    # with the GIL held the counter could not move at all during the call
    assert took > 0.2 and ticks > 20, (took, ticks)


def test_version():
    assert re.fullmatch(r"\d+\.\d+\.\d+.*", twofold.__version__)
