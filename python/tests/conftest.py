"""Shared helpers of the Python tests.

The tests run against the installed package (``pip install ./python`` or
the wheel from ``maturin build``), never the source folder, and compare it
with the ``rank`` example of the Rust crate: set ``TWOFOLD_RANK_BIN`` to its
path, or build it with ``cargo build --release --example rank`` (found in
``$CARGO_TARGET_DIR`` or ``target/`` of the repository).
"""

from __future__ import annotations

import json
import os
import subprocess
from pathlib import Path
from typing import Dict, List

import pytest

try:
    import twofold
    import twofold._native
except ImportError as e:  # the source folder python/twofold has no extension module
    raise ImportError(
        "install the package first (pip install ./python) and run pytest from outside "
        "python/ (e.g. `pytest python/tests` from the repository root)"
    ) from e

REPO = Path(__file__).resolve().parents[2]
DATA = REPO / "tests" / "data"
# The published tables: J. E. Cremona, Algorithms for Modular Elliptic
# Curves, 2nd ed., 1997, Table 1 (conductors 11-162), the curves with
# non-trivial Sha of conductor up to 390 from the same open tables, and the
# wider stretches of those tables (tests/data/README.md).
SMALL_TABLE = DATA / "curves-small-conductor.tsv"
SHA_TABLE = DATA / "curves-with-sha.tsv"
WIDER_TABLE = DATA / "curves-wider.tsv"


def read_table(path: Path) -> List[Dict[str, str]]:
    """The rows of a table of tests/data as dicts (header line starts with '#')."""
    rows, header = [], None
    for line in path.read_text().splitlines():
        if not line.strip():
            continue
        if line.startswith("#"):
            header = [h.strip() for h in line.lstrip("#").split("\t")]
            continue
        parts = line.split("\t")
        assert header is not None and len(parts) == len(header), f"{path}: bad row {line!r}"
        rows.append(dict(zip(header, parts)))
    return rows


def table_curves(path: Path) -> List[str]:
    """The curves of a table as ``[a1,a2,a3,a4,a6]`` lines (as
    ../shared/tools/published-check feeds them to ``rank --json``)."""
    return ["[" + ",".join(r[k] for k in ("a1", "a2", "a3", "a4", "a6")) + "]" for r in read_table(path)]


def rank_binary() -> Path:
    env = os.environ.get("TWOFOLD_RANK_BIN")
    candidates = [Path(env)] if env else []
    if os.environ.get("CARGO_TARGET_DIR"):
        candidates.append(Path(os.environ["CARGO_TARGET_DIR"]) / "release" / "examples" / "rank")
    candidates.append(REPO / "target" / "release" / "examples" / "rank")
    for c in candidates:
        if c.is_file() and os.access(c, os.X_OK):
            return c
    pytest.fail(
        "the rank example is not built: run `cargo build --release --example rank` "
        f"or set TWOFOLD_RANK_BIN (looked at {', '.join(map(str, candidates))})"
    )


def run_rank(lines: List[str], *args: str) -> List[str]:
    """The stdout lines of ``rank --json ARGS`` with ``lines`` on stdin."""
    p = subprocess.run(
        [str(rank_binary()), "--json", *args],
        input="\n".join(lines) + "\n",
        capture_output=True,
        text=True,
        timeout=1800,
    )
    assert p.returncode == 0, p.stderr[-2000:]
    out = p.stdout.splitlines()
    assert len(out) == len(lines), f"{len(out)} output lines for {len(lines)} inputs"
    return out


def without_time(d: dict) -> dict:
    """A report without ``elapsed_ms``, the only field that changes from run to run."""
    return {k: v for k, v in d.items() if k != "elapsed_ms"}


@pytest.fixture(scope="session", autouse=True)
def installed_package():
    """Fails early when the source folder shadows the installed package."""
    native = Path(twofold._native.__file__).resolve()
    assert native.exists(), native
    return twofold
