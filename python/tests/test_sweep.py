"""A sweep over 2,000 curves in 8 shards on a LocalCluster with 2 workers
gives the results of the Rust batch (one analyse_many call over all the
curves), and resumes: after one output shard is deleted, a second run
(through the command line) recomputes only that shard.

Curves: the 572 of J. E. Cremona, Algorithms for Modular Elliptic Curves,
2nd ed., 1997, Table 1, and the first 1,428 of the wider stretches of the
same open tables (tests/data/curves-wider.tsv) outside the stretch of
conductors 130002-130050 (some of its curves run for seconds past a short
budget, which would only make this test slow). Short budget, no evidence,
so that it stays fast.

With a wall-clock budget per curve, a curve near its limit may be cut short
in one run and not in the other; such lines are compared on what does not
depend on the budget (model, conductor, torsion, compatible bounds), every
other line must be equal except ``elapsed_ms``.
"""

import csv
import json
import os
import subprocess
import sys
from pathlib import Path

import pytest

import twofold
import twofold.sweep as sweep
from conftest import SMALL_TABLE, WIDER_TABLE, read_table, table_curves, without_time

BUDGET = 0.5  # seconds per curve
SHARDS = 8


def same_result(a, b):
    """Equal except elapsed_ms; a curve cut short by its time budget in
    either run may have got further in the other, so there only the data
    that does not depend on the budget must agree, and the bounds must be
    compatible."""
    a, b = without_time(a), without_time(b)
    if a == b:
        return "equal"
    if "error" in a or "error" in b or not (a["budget_exhausted"] or b["budget_exhausted"]):
        return None
    for k in ("input", "minimal_model", "conductor"):
        if a[k] != b[k]:
            return None
    # a torsion step cut short by the budget leaves "torsion": null
    if a["torsion"] is not None and b["torsion"] is not None and a["torsion"] != b["torsion"]:
        return None
    lo = max(x for x in (a["rank_lower"], b["rank_lower"], 0) if x is not None)
    his = [x for x in (a["rank_upper"], b["rank_upper"]) if x is not None]
    if his and lo > min(his):
        return None
    return "budget"


def compare(got, expected, what):
    assert len(got) == len(expected), what
    kinds = [same_result(g, e) for g, e in zip(got, expected)]
    bad = [i for i, k in enumerate(kinds) if k is None]
    assert not bad, f"{what}: lines {bad[:5]} differ: {got[bad[0]]} vs {expected[bad[0]]}"
    return kinds.count("budget")


@pytest.fixture(scope="module")
def curves():
    wider = [r for r in read_table(WIDER_TABLE) if not 130002 <= int(r["conductor"]) <= 130050][:1428]
    c = table_curves(SMALL_TABLE) + ["[" + ",".join(r[k] for k in ("a1", "a2", "a3", "a4", "a6")) + "]" for r in wider]
    assert len(c) == 2000
    return c


def write_shards(curves, directory: Path):
    """8 shards of 250 curves in the three input formats."""
    directory.mkdir()
    size = len(curves) // SHARDS
    parts = [curves[i * size : (i + 1) * size] for i in range(SHARDS)]
    names = []
    for i, part in enumerate(parts):
        stem = f"part-{i:02d}"
        if i < 3:  # JSON lines, with other fields; coefficients as a list in one shard
            path = directory / f"{stem}.jsonl"
            with open(path, "w") as f:
                for j, c in enumerate(part):
                    curve = [int(x) for x in c.strip("[]").split(",")] if i == 2 else c
                    f.write(json.dumps({"id": f"{i}-{j}", "curve": curve}) + "\n")
        elif i < 6:  # CSV with a header and a curve column
            path = directory / f"{stem}.csv"
            with open(path, "w", newline="") as f:
                w = csv.writer(f)
                w.writerow(["id", "curve"])
                for j, c in enumerate(part):
                    w.writerow([f"{i}-{j}", c])
        else:  # plain text, one curve per line
            path = directory / f"{stem}.txt"
            path.write_text("# one curve per line\n" + "\n".join(part) + "\n")
        names.append(path)
    (directory / "notes.md").write_text("not a shard\n")
    return names, parts


def read_output(out_dir: Path, stem: str):
    return [json.loads(l) for l in (out_dir / f"{stem}.jsonl").read_text().splitlines()]


def test_sweep_matches_the_rust_batch_and_resumes(curves, tmp_path):
    in_dir, out_dir = tmp_path / "in", tmp_path / "out"
    shard_paths, parts = write_shards(curves, in_dir)

    # the reference: the Rust batch over all 2,000 curves in one call
    reference = twofold.analyse_many(curves, threads=2, budget=BUDGET, evidence=False)

    s = sweep.run(in_dir, out_dir, workers=2, budget=BUDGET, evidence=False, show_progress=False)
    assert s["curves"] == 2000 and s["shards"] == SHARDS and s["shards_computed"] == SHARDS
    assert s["failed_shards"] == [] and s["ignored_files"] == ["notes.md"]
    assert s["workers"] == 2 and s["errors"] == 0
    assert s["proven"] + s["open"] == 2000
    assert json.loads((out_dir / "summary.json").read_text())["curves"] == 2000

    got = []
    for p, part in zip(shard_paths, parts):
        lines = read_output(out_dir, p.stem)
        assert [d["input"] for d in lines] == part, p.name  # input order, one line per curve
        got += lines
    cut = compare(got, reference, "sweep vs batch")
    # on an idle machine few lines are cut short; under heavy load more are
    assert cut <= len(got) // 2, f"{cut} of {len(got)} lines cut short by the budget differ between the runs"
    print(f"{len(got) - cut} lines equal, {cut} cut short by the budget in one run")
    # the summary counts are those of the output lines
    assert s["proven"] == sum(1 for d in got if d["rank"] is not None)

    # resume: delete one output shard, run again through the command line
    victim = shard_paths[4].stem
    (out_dir / f"{victim}.jsonl").unlink()
    before = {p.stem: (out_dir / f"{p.stem}.jsonl").stat().st_mtime_ns for p in shard_paths if p.stem != victim}
    r = subprocess.run(
        [sys.executable, "-m", "twofold.sweep", str(in_dir), str(out_dir), "--workers", "2",
         "--budget", str(BUDGET), "--no-evidence", "--no-progress"],
        capture_output=True, text=True, timeout=1200, cwd=tmp_path,
    )
    assert r.returncode == 0, r.stderr[-3000:]
    assert "sweep: 2000 curves in 8 shards (1 computed, 7 skipped" in r.stdout, r.stdout
    s2 = json.loads((out_dir / "summary.json").read_text())
    assert s2["computed"] == [f"{victim}.csv"] and s2["shards_skipped"] == 7
    assert s2["curves"] == 2000 and s2["curves_computed"] == 250
    after = {p.stem: (out_dir / f"{p.stem}.jsonl").stat().st_mtime_ns for p in shard_paths if p.stem != victim}
    assert after == before  # the other shards were not rewritten
    compare(read_output(out_dir, victim), reference[4 * 250 : 5 * 250], "recomputed shard vs batch")

    # a changed option recomputes: the check file records them
    done, why = sweep.shard_is_done(shard_paths[0], out_dir, dict(s2["options"], budget=9.0))
    assert not done and why == "options changed"
    done, why = sweep.shard_is_done(shard_paths[0], out_dir, s2["options"])
    assert done, why


def test_shard_reading(tmp_path):
    (tmp_path / "a.jsonl").write_text('{"curve": "[0,0,1,-1,0]"}\n\nnot json\n{"x": 1}\n{"curve": [0, 1, 1, -2, 0]}\n')
    recs = sweep.read_shard(tmp_path / "a.jsonl")
    assert recs[0] == "[0,0,1,-1,0]" and recs[3] == "[0,1,1,-2,0]"
    assert recs[1]["error"].startswith("parse error: line 3") and recs[2]["input"] == '{"x": 1}'
    (tmp_path / "b.csv").write_text("id,curve\n1,\"[0,0,1,-1,0]\"\n2,\n")
    assert sweep.read_shard(tmp_path / "b.csv") == ["[0,0,1,-1,0]", ""]
    (tmp_path / "c.csv").write_text("id,equation\n1,x\n")
    with pytest.raises(ValueError):
        sweep.read_shard(tmp_path / "c.csv")
    (tmp_path / "a.txt").write_text("[0,0,1,-1,0]\n")
    with pytest.raises(ValueError):  # a.jsonl and a.txt would both write a.jsonl
        sweep.list_shards(tmp_path)


def test_summarise():
    items = [
        {"rank": 1, "rank_lower": 1, "rank_upper": 1, "budget_exhausted": False},
        {"rank": None, "rank_lower": 0, "rank_upper": 2, "budget_exhausted": True},
        {"rank": None, "rank_lower": 0, "rank_upper": None, "budget_exhausted": True},
        {"input": "x", "error": "parse error: ..."},
    ]
    assert sweep.summarise(items) == {
        "curves": 4, "proven": 1, "open": 2, "open_gap": 2, "no_upper_bound": 1, "errors": 1, "budget_exhausted": 2,
    }
