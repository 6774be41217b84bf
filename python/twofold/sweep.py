"""Sweeps over sharded curve files on a Dask cluster.

A sweep reads every shard of an input directory, runs each shard as one
Dask task (:func:`run_shard`, which calls :func:`twofold.analyse_many`), and
writes one output shard per input shard, ``OUTPUT_DIR/<shard-stem>.jsonl``:
one JSON line per curve, in input order, each exactly the line that
``rank --json`` prints for it (errors as ``{"input": ..., "error": ...}``).

Input shards (files directly in the input directory, read in name order):

- ``*.jsonl``, ``*.ndjson``, ``*.json``: JSON lines, one object per curve
  with a ``curve`` field (text such as ``"[0,0,1,-1,0]"`` or a list of
  coefficients); other fields are ignored. A line that is not such an
  object becomes an error item, so the output keeps one line per record.
- ``*.csv``: a header row with a ``curve`` column (other columns ignored).
- ``*.txt``: plain text, one curve per line; blank lines and lines starting
  with ``#`` are skipped.

Other files are ignored (and listed in the summary). Two shards may not
share a stem.

Resuming: beside each output shard the task writes ``<stem>.check.json``
with the SHA-256 and record count of the input shard, the SHA-256 and line
count of the output shard, and the options of the run. A shard is skipped
when its output exists, its line count equals the number of records of the
input, and the check file matches the input and output as they are now and
the options of this run; anything else (a deleted or truncated output, a
changed input, another budget) recomputes the shard. Outputs and check
files are written to temporary names and renamed, so an interrupted sweep
leaves no half-written shard behind that would look complete.

The sweep ends with a summary (curves, proven, open with the total gap,
errors, budget cut-offs, seconds, curves per second per core), printed and
written to ``OUTPUT_DIR/summary.json``.

Command line::

    python -m twofold.sweep INPUT_DIR OUTPUT_DIR --workers N \\
        [--threads-per-worker T] [--budget S] [--scheduler ADDRESS] \\
        [--height H] [--no-evidence] [--certificate] [--no-progress]

Without ``--scheduler`` a ``LocalCluster`` of N worker processes is
started; with it the sweep joins that cluster (waiting for N workers).
Each task runs its shard on T threads of the Rust batch runner, so start
remote workers with one Dask thread each (``--nthreads 1``) and give each
worker T cores. Progress shows through ``dask.distributed.progress`` and on
the dashboard.
"""

from __future__ import annotations

import argparse
import csv
import hashlib
import io
import json
import os
import socket
import sys
import time
from pathlib import Path
from typing import Any, Dict, List, Optional, Tuple

import twofold

__all__ = [
    "SHARD_SUFFIXES",
    "list_shards",
    "read_shard",
    "run_shard",
    "shard_is_done",
    "summarise",
    "run",
    "main",
]

#: Input suffixes and their formats.
SHARD_SUFFIXES = {
    ".jsonl": "jsonl",
    ".ndjson": "jsonl",
    ".json": "jsonl",
    ".csv": "csv",
    ".txt": "text",
}

_COUNTS = ("curves", "proven", "open", "open_gap", "no_upper_bound", "errors", "budget_exhausted")


def list_shards(input_dir: os.PathLike) -> Tuple[List[Path], List[str]]:
    """The input shards of a directory in name order, and the names of the
    files ignored. Raises ``ValueError`` when two shards share a stem."""
    shards, ignored = [], []
    for p in sorted(Path(input_dir).iterdir()):
        if p.name.startswith(".") or not p.is_file():
            continue
        if p.suffix.lower() in SHARD_SUFFIXES:
            shards.append(p)
        else:
            ignored.append(p.name)
    stems: Dict[str, str] = {}
    for p in shards:
        if p.stem in stems:
            raise ValueError(f"shards {stems[p.stem]} and {p.name} share the stem {p.stem!r}: their outputs would collide")
        stems[p.stem] = p.name
    return shards, ignored


def read_shard(path: os.PathLike) -> List[Any]:
    """The records of one input shard, in order: a curve text for each
    curve, or a dict ``{"input", "error"}`` for a JSON line that is not an
    object with a ``curve`` field. Raises ``ValueError`` for a CSV shard
    without a ``curve`` column."""
    path = Path(path)
    kind = SHARD_SUFFIXES.get(path.suffix.lower(), "text")
    text = path.read_text(encoding="utf-8")
    records: List[Any] = []
    if kind == "jsonl":
        for n, line in enumerate(text.splitlines(), 1):
            if not line.strip():
                continue
            try:
                obj = json.loads(line)
                records.append(twofold.curve_text(obj["curve"]))
            except (ValueError, KeyError, TypeError) as e:
                what = "not valid JSON" if isinstance(e, json.JSONDecodeError) else "not an object with a \"curve\" field holding a curve"
                records.append({"input": line, "error": f"parse error: line {n} of {path.name} is {what}"})
    elif kind == "csv":
        reader = csv.DictReader(io.StringIO(text))
        if reader.fieldnames is None or "curve" not in [f.strip() for f in reader.fieldnames]:
            raise ValueError(f"{path.name}: a CSV shard needs a header row with a 'curve' column")
        column = next(f for f in reader.fieldnames if f.strip() == "curve")
        for row in reader:
            records.append((row.get(column) or "").strip())
    else:
        for line in text.splitlines():
            t = line.strip()
            if t and not t.startswith("#"):
                records.append(t)
    return records


def _sha256(path: Path) -> str:
    h = hashlib.sha256()
    with open(path, "rb") as f:
        for block in iter(lambda: f.read(1 << 20), b""):
            h.update(block)
    return h.hexdigest()


def _count_lines(path: Path) -> int:
    n = 0
    with open(path, "rb") as f:
        for block in iter(lambda: f.read(1 << 20), b""):
            n += block.count(b"\n")
    return n


def _outputs(shard: Path, output_dir: Path) -> Tuple[Path, Path]:
    return output_dir / f"{shard.stem}.jsonl", output_dir / f"{shard.stem}.check.json"


def _write_atomic(path: Path, data: str) -> None:
    tmp = path.with_name(f".{path.name}.tmp-{os.getpid()}")
    with open(tmp, "w", encoding="utf-8", newline="\n") as f:
        f.write(data)
        f.flush()
        os.fsync(f.fileno())
    os.replace(tmp, path)


def shard_is_done(shard: os.PathLike, output_dir: os.PathLike, options: Dict[str, Any], records: Optional[int] = None) -> Tuple[bool, str]:
    """Whether the output of ``shard`` is complete for ``options``, and why
    not. ``records`` is the number of records of the input (read from the
    shard when not given)."""
    shard, output_dir = Path(shard), Path(output_dir)
    out, check = _outputs(shard, output_dir)
    if not out.exists():
        return False, "no output"
    if not check.exists():
        return False, "no check file"
    try:
        rec = json.loads(check.read_text(encoding="utf-8"))
    except ValueError:
        return False, "unreadable check file"
    if records is None:
        records = len(read_shard(shard))
    lines = _count_lines(out)
    if lines != records:
        return False, f"output has {lines} lines for {records} records"
    if rec.get("input_records") != records or rec.get("output_lines") != lines:
        return False, "counts differ from the check file"
    if rec.get("input_sha256") != _sha256(shard):
        return False, "input changed"
    if rec.get("output_sha256") != _sha256(out):
        return False, "output changed"
    if rec.get("options") != options:
        return False, "options changed"
    return True, "complete"


def summarise(items: List[Dict[str, Any]]) -> Dict[str, int]:
    """Counts over report dicts: ``curves``, ``proven`` (the bounds meet),
    ``open`` (analysed, bounds apart or missing), ``open_gap`` (sum of
    upper - lower over open curves with both bounds), ``no_upper_bound``,
    ``errors`` and ``budget_exhausted``."""
    c = dict.fromkeys(_COUNTS, 0)
    for d in items:
        c["curves"] += 1
        if "error" in d:
            c["errors"] += 1
            continue
        if d.get("budget_exhausted"):
            c["budget_exhausted"] += 1
        if d.get("rank") is not None:
            c["proven"] += 1
        else:
            c["open"] += 1
            lo, hi = d.get("rank_lower"), d.get("rank_upper")
            if hi is None:
                c["no_upper_bound"] += 1
            elif lo is not None:
                c["open_gap"] += hi - lo
    return c


def _options(budget: Optional[float], height: Optional[int], evidence: bool, certificate: bool) -> Dict[str, Any]:
    return {
        "budget": None if budget is None else float(budget),
        "height": None if height is None else int(height),
        "evidence": bool(evidence),
        "certificate": bool(certificate),
        "version": twofold.__version__,
    }


def run_shard(shard: str, output_dir: str, options: Dict[str, Any], threads: int = 1) -> Dict[str, Any]:
    """One task of a sweep: analyses the shard at path ``shard`` with
    :func:`twofold.analyse_many` on ``threads`` threads and writes
    ``output_dir/<stem>.jsonl`` and its check file, unless the output is
    already complete (see the module docstring); returns the shard's counts
    (:func:`summarise`) with ``shard``, ``computed`` (False when skipped),
    ``seconds`` (wall-clock time), ``cpu_seconds`` (CPU time of the worker
    process) and ``worker``."""
    start, cpu_start = time.perf_counter(), time.process_time()
    path, out_dir = Path(shard), Path(output_dir)
    out, check = _outputs(path, out_dir)
    records = read_shard(path)
    done, reason = shard_is_done(path, out_dir, options, len(records))
    if done:
        items = [json.loads(line) for line in out.read_text(encoding="utf-8").splitlines()]
        computed = False
    else:
        if check.exists():
            check.unlink()
        texts = [r for r in records if isinstance(r, str)]
        results = iter(
            twofold.analyse_many(
                texts,
                threads=max(1, int(threads)),
                budget=options.get("budget"),
                height=options.get("height"),
                evidence=options.get("evidence", True),
                certificate=options.get("certificate", False),
            )
        )
        items = [next(results) if isinstance(r, str) else r for r in records]
        body = "".join(json.dumps(d, ensure_ascii=False, separators=(",", ":")) + "\n" for d in items)
        _write_atomic(out, body)
        record = {
            "input": path.name,
            "input_sha256": _sha256(path),
            "input_records": len(records),
            "output": out.name,
            "output_sha256": hashlib.sha256(body.encode("utf-8")).hexdigest(),
            "output_lines": len(items),
            "options": options,
        }
        _write_atomic(check, json.dumps(record, indent=1) + "\n")
        computed = True
    result: Dict[str, Any] = {"shard": path.name, "computed": computed, "reason": reason}
    result.update(summarise(items))
    result["seconds"] = time.perf_counter() - start
    # CPU time of the worker process (all threads of the batch runner)
    result["cpu_seconds"] = time.process_time() - cpu_start
    result["worker"] = socket.gethostname()
    return result


def run(
    input_dir: os.PathLike,
    output_dir: os.PathLike,
    *,
    workers: int = 1,
    threads_per_worker: int = 1,
    budget: Optional[float] = None,
    height: Optional[int] = None,
    evidence: bool = True,
    certificate: bool = False,
    scheduler: Optional[str] = None,
    client: Any = None,
    show_progress: bool = True,
    summary_path: Optional[os.PathLike] = None,
) -> Dict[str, Any]:
    """Runs a sweep and returns its summary (also written to
    ``output_dir/summary.json`` or ``summary_path``).

    Uses ``client`` (a ``dask.distributed.Client``) when given; else joins
    the scheduler at ``scheduler`` and waits for ``workers`` workers; else
    starts a ``LocalCluster`` of ``workers`` processes with one Dask thread
    each. Every shard is one task running on ``threads_per_worker`` threads
    of the Rust batch runner with ``budget`` seconds per curve (the other
    options are those of :func:`twofold.analyse`).

    The summary holds the counts of :func:`summarise` over all shards,
    ``shards``, ``shards_computed``, ``shards_skipped``, ``computed`` (the
    names of the shards computed), ``failed_shards`` (``[{"shard",
    "error"}]``), ``ignored_files``, ``seconds`` (wall clock), ``workers``,
    ``threads_per_worker``, ``cores`` (workers x threads per worker),
    ``curves_computed``, ``cpu_seconds`` (CPU time of the computed shards,
    all threads), ``curves_per_second_per_core`` (curves of the computed
    shards per wall-clock second per core: includes the cluster's start
    and any load from other programs) and ``curves_per_cpu_second`` (the
    same per CPU second: the cost of a curve itself), and the ``options``.
    """
    from dask.distributed import Client, LocalCluster, progress

    start = time.perf_counter()
    input_dir, output_dir = Path(input_dir), Path(output_dir)
    if not input_dir.is_dir():
        raise FileNotFoundError(f"input directory {input_dir} does not exist")
    output_dir.mkdir(parents=True, exist_ok=True)
    shards, ignored = list_shards(input_dir)
    options = _options(budget, height, evidence, certificate)
    threads_per_worker = max(1, int(threads_per_worker))
    cluster = None
    own_client = client is None
    if client is None:
        if scheduler:
            client = Client(scheduler)
            client.wait_for_workers(max(1, int(workers)))
        else:
            cluster = LocalCluster(
                n_workers=max(1, int(workers)),
                threads_per_worker=1,
                processes=True,
                dashboard_address=":0",
            )
            client = Client(cluster)
    try:
        n_workers = len(client.scheduler_info().get("workers", {})) or int(workers)
        # the largest shards first, for a balanced finish
        order = sorted(shards, key=lambda p: p.stat().st_size, reverse=True)
        futures = [
            client.submit(
                run_shard,
                str(p.resolve()),
                str(output_dir.resolve()),
                options,
                threads_per_worker,
                key=f"twofold-shard-{p.stem}-{hashlib.sha1(str(p.resolve()).encode()).hexdigest()[:10]}",
                pure=False,
            )
            for p in order
        ]
        if show_progress and futures:
            progress(futures)
        results, failed = [], []
        for p, f in zip(order, futures):
            try:
                results.append(f.result())
            except Exception as e:  # a shard that cannot be read or written
                failed.append({"shard": p.name, "error": f"{type(e).__name__}: {e}"})
    finally:
        if own_client:
            client.close()
            if cluster is not None:
                cluster.close()
    seconds = time.perf_counter() - start
    results.sort(key=lambda r: r["shard"])
    summary: Dict[str, Any] = dict.fromkeys(_COUNTS, 0)
    for r in results:
        for k in _COUNTS:
            summary[k] += r[k]
    computed = [r for r in results if r["computed"]]
    curves_computed = sum(r["curves"] for r in computed)
    cpu_seconds = sum(r["cpu_seconds"] for r in computed)
    cores = n_workers * threads_per_worker
    summary.update(
        {
            "shards": len(shards),
            "shards_computed": len(computed),
            "shards_skipped": len(results) - len(computed),
            "computed": [r["shard"] for r in computed],
            "failed_shards": failed,
            "ignored_files": ignored,
            "seconds": round(seconds, 3),
            "workers": n_workers,
            "threads_per_worker": threads_per_worker,
            "cores": cores,
            "curves_computed": curves_computed,
            "shard_seconds": round(sum(r["seconds"] for r in computed), 3),
            "cpu_seconds": round(cpu_seconds, 3),
            "curves_per_second_per_core": round(curves_computed / seconds / cores, 3) if seconds > 0 and cores else None,
            "curves_per_cpu_second": round(curves_computed / cpu_seconds, 3) if cpu_seconds > 0 else None,
            "options": options,
        }
    )
    path = Path(summary_path) if summary_path else output_dir / "summary.json"
    _write_atomic(path, json.dumps(summary, indent=1) + "\n")
    return summary


def _summary_line(s: Dict[str, Any]) -> str:
    return (
        f"sweep: {s['curves']} curves in {s['shards']} shards ({s['shards_computed']} computed, "
        f"{s['shards_skipped']} skipped, {len(s['failed_shards'])} failed): {s['proven']} proven, "
        f"{s['open']} open (total gap {s['open_gap']}, {s['no_upper_bound']} without upper bound), "
        f"{s['errors']} errors, {s['budget_exhausted']} cut short; {s['seconds']:.1f} s on {s['cores']} core(s)"
        + (
            f", {s['curves_per_second_per_core']} curves/s/core ({s['curves_per_cpu_second']} per CPU second)"
            if s["curves_computed"]
            else ""
        )
    )


def main(argv: Optional[List[str]] = None) -> int:
    """The command line (see the module docstring); returns the exit status:
    0, or 1 when a shard failed."""
    ap = argparse.ArgumentParser(
        prog="python -m twofold.sweep",
        description="Rank reports for every curve of a directory of shards, one Dask task per shard.",
    )
    ap.add_argument("input_dir", metavar="INPUT_DIR", help="directory of input shards (.jsonl with a 'curve' field, .csv with a 'curve' column, .txt one curve per line)")
    ap.add_argument("output_dir", metavar="OUTPUT_DIR", help="where OUTPUT_DIR/<shard-stem>.jsonl and summary.json go")
    ap.add_argument("--workers", type=int, default=1, metavar="N", help="worker processes of the local cluster, or workers to wait for with --scheduler (default 1)")
    ap.add_argument("--threads-per-worker", type=int, default=1, metavar="T", help="threads of the Rust batch runner in each task (default 1)")
    ap.add_argument("--budget", type=float, default=None, metavar="S", help="wall-clock seconds per curve (default: none)")
    ap.add_argument("--height", type=int, default=None, metavar="H", help="first search height on the coverings (default 300)")
    ap.add_argument("--no-evidence", action="store_true", help="skip root number, heights, L-series and BSD quotient (faster)")
    ap.add_argument("--certificate", action="store_true", help="include the certificate text in every report")
    ap.add_argument("--scheduler", default=None, metavar="ADDRESS", help="join the Dask scheduler at ADDRESS instead of starting a LocalCluster")
    ap.add_argument("--no-progress", action="store_true", help="no progress bar (there is none either when standard output is not a terminal)")
    a = ap.parse_args(argv)
    if a.workers < 1 or a.threads_per_worker < 1:
        ap.error("--workers and --threads-per-worker must be at least 1")
    if a.budget is not None and not (a.budget >= 0 and a.budget != float("inf")):
        ap.error("--budget must be a finite number of seconds >= 0")
    if a.height is not None and a.height < 1:
        ap.error("--height must be at least 1")
    s = run(
        a.input_dir,
        a.output_dir,
        workers=a.workers,
        threads_per_worker=a.threads_per_worker,
        budget=a.budget,
        height=a.height,
        evidence=not a.no_evidence,
        certificate=a.certificate,
        scheduler=a.scheduler,
        # the text bar redraws ten times a second: only on a terminal
        show_progress=not a.no_progress and sys.stdout.isatty(),
    )
    print(_summary_line(s))
    for f in s["failed_shards"]:
        print(f"failed: {f['shard']}: {f['error']}", file=sys.stderr)
    print(f"summary written to {Path(a.output_dir) / 'summary.json'}")
    return 1 if s["failed_shards"] else 0


if __name__ == "__main__":
    from twofold.sweep import main as _main  # the importable module, so tasks pickle by reference

    sys.exit(_main())
