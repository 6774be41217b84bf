#!/usr/bin/env python3
"""Sweep of the rank-one rows of a published table (issue 16): feeds the rows
chosen by conductor ranges to `rank --json` in one process and prints, per
curve, whether a point of infinite order was found and how long it took.

Usage: rank_one_sweep.py RANK_CMD TABLE LO-HI [LO-HI ...]
  e.g. scripts/rank_one_sweep.py "$CARGO_TARGET_DIR/release/examples/rank --json --budget 30 --threads 1" \
       ../shared/data/curves-wider.tsv 7155-7155 7182-7182 130017-130050

The table's published ranks (J. E. Cremona's open tables extending
Algorithms for Modular Elliptic Curves, 1997; see ../shared/data/README.md)
are the reference: a row counts as a hit when the number of independent
points reported equals the published rank; each row also says whether the
report carries a saturated basis (`saturated_basis`).
"""
import json, shlex, subprocess, sys, threading, time

def main():
    cmd, table, ranges = sys.argv[1], sys.argv[2], sys.argv[3:]
    spans = [tuple(int(x) for x in r.split("-")) for r in ranges]
    rows = []
    for line in open(table):
        if line.startswith("#") or not line.strip():
            continue
        f = line.rstrip("\n").split("\t")
        n, rank = int(f[0]), int(f[7])
        if rank == 1 and any(lo <= n <= hi for lo, hi in spans):
            rows.append((n, [int(x) for x in f[2:7]]))
    proc = subprocess.Popen(shlex.split(cmd), stdin=subprocess.PIPE, stdout=subprocess.PIPE, text=True)
    # feed from a thread, read the answers as they come (one line per curve)
    feeder = threading.Thread(target=lambda: (proc.stdin.write("".join(f"[{','.join(map(str, c))}]\n" for _, c in rows)), proc.stdin.close()))
    feeder.start()
    start = time.time()
    hits, misses, unsat = 0, [], 0
    for (n, c) in rows:
        line = proc.stdout.readline()
        if not line:
            break
        r = json.loads(line)
        pts = len(r.get("points") or [])
        ok = pts >= 1
        hits += ok
        if not ok:
            misses.append((n, c))
        sat = "saturated" if r.get("saturated_basis") else "unsaturated"
        unsat += ok and not r.get("saturated_basis")
        print(f"{n}\t{c}\t{'hit' if ok else 'MISS'}\t{sat}\t{r.get('elapsed_ms')} ms\tcut_short={r.get('budget_exhausted')}", flush=True)
    feeder.join()
    proc.wait()
    print(f"# {hits}/{len(rows)} rank-one rows got a point; {len(misses)} misses; {unsat} with a point but no saturated basis; {time.time() - start:.0f} s wall")

main()
