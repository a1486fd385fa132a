"""The substance table's cost to a process: the first lookup and later ones,
against loading the whole table into a dict (what a process would pay if the
table were not indexed on disk), measured in the same run.

    python benchmarks/substance_lookup.py

Each step runs in a fresh process; the time is wall-clock inside the process
(the interpreter's start-up is left out) and the memory the process's peak
resident size. Ratios, not absolute times, are what to compare.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys

FIRST = """
import json, resource, time
t0 = time.perf_counter()
from cellchem import substance
t1 = time.perf_counter()
record = substance("7758-99-8")
t2 = time.perf_counter()
for cas in ("64-17-5", "67-64-1", "7647-14-5", "7447-40-7", "77-92-9"):
    substance(cas)
t3 = time.perf_counter()
print(json.dumps({"import": t1 - t0, "first": t2 - t1, "later": (t3 - t2) / 5,
                  "mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""
WHOLE = """
import json, resource, sqlite3, time
from importlib import resources
t0 = time.perf_counter()
import cellchem
t1 = time.perf_counter()
path = resources.files("cellchem") / "data" / "substances.sqlite"
con = sqlite3.connect(f"file:{path}?mode=ro", uri=True)
table = {row[1]: row for row in con.execute("SELECT * FROM substances")}
names = {}
for name, key, kind in con.execute("SELECT * FROM names"):
    names.setdefault(name, []).append(key)
record = table["7758-99-8"]
t2 = time.perf_counter()
print(json.dumps({"import": t1 - t0, "first": t2 - t1, "later": 0.0,
                  "mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024}))
"""


def run(code: str) -> dict:
    out = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, check=True, env=os.environ
    )
    return json.loads(out.stdout)


def main() -> None:
    lookup = min((run(FIRST) for _ in range(3)), key=lambda r: r["first"])
    whole = min((run(WHOLE) for _ in range(3)), key=lambda r: r["first"])
    print("| step | ms | peak MB | ratio to loading the whole table |")
    print("| --- | ---: | ---: | --- |")
    base = whole["first"]
    print(f"| load the whole table into a dict (baseline) | {1000 * base:.1f} | {whole['mb']:.0f} | 1 |")
    print(
        f"| `substance()`: first lookup in a process | {1000 * lookup['first']:.2f} | {lookup['mb']:.0f}"
        f" | {lookup['first'] / whole['first']:.4f} (memory {lookup['mb'] / whole['mb']:.2f}) |"
    )
    later = lookup["later"]
    print(f"| `substance()`: each later lookup | {1000 * later:.3f} | | {later / base:.5f} |")


if __name__ == "__main__":
    main()
