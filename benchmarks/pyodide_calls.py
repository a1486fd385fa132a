"""What the worksheet functions cost in Pyodide (where xlwings Lite runs them) next to CPython.

    bash tests/pyodide/setup.sh            # once: Pyodide from npm, the dependency wheels
    python benchmarks/pyodide_calls.py [--repeat 20]

Runs the main.py of ``lite.main_source()`` through the harness of
tests/test_pyodide.py: in Pyodide under Node.js (tests/pyodide/run.mjs) and
in CPython (a child process), in the same run, with the same cellchem wheel
built from the checkout. The cold start is loading Pyodide, unpacking the
wheels into it, importing main.py (and with it cellchem) and the first call
(``=CELLCHEM.MOLAR_MASS("CuSO4.5H2O")``). Then each function's example is
called ``--repeat`` times: its first call (which loads what the function
needs) and the median of the later ones (the same arguments again, so
cellchem's caches answer much of it) are shown. Times are wall-clock
inside each runtime; Node's own start and CPython's interpreter start are
left out. Ratios, not absolute times, are what to compare. Printed, not
asserted.
"""

from __future__ import annotations

import argparse
import importlib.util
import json
import shutil
import statistics
import subprocess
import sys
import tempfile
import zipfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _harness():
    """tests/test_pyodide.py (by path), for its cases, wheel build and checks."""
    spec = importlib.util.spec_from_file_location("pyodide_harness_tests", ROOT / "tests" / "test_pyodide.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _run(command: list[str]) -> dict:
    proc = subprocess.run(command, capture_output=True, text=True, timeout=600, cwd=ROOT)
    if proc.returncode != 0:
        raise SystemExit(f"{command[0]} failed:\n{proc.stderr[-4000:]}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=20, help="calls of each function's example")
    options = parser.parse_args()

    t = _harness()
    missing = t._missing()
    if missing:
        raise SystemExit(f"{missing}; run `{t.SETUP}` first")
    from cellchem.adapters.sheets import lite

    single = [c for c in t._cases()[0] if c["id"].endswith(":single")]
    first = next(c for c in single if c["id"] == "MOLAR_MASS:single")
    cases = [dict(first, id="first")]
    cases += [dict(c, id=f"{c['id']}#{n}") for c in single for n in range(options.repeat)]

    with tempfile.TemporaryDirectory() as tmp_name:
        tmp = Path(tmp_name)
        cellchem_wheel = t._build_wheel(tmp)
        dependencies = sorted(t.WHEELS.glob("*.whl"))
        wheels = tmp / "wheels"
        wheels.mkdir()
        for wheel in [cellchem_wheel, *dependencies]:
            shutil.copy2(wheel, wheels / wheel.name)
        same = all(t._accepts_this_python(w) for w in dependencies)
        site = tmp / "site"
        for wheel in [cellchem_wheel, *(dependencies if same else [])]:
            with zipfile.ZipFile(wheel) as zf:
                zf.extractall(site)
        main_py = tmp / "main.py"
        main_py.write_text(lite.main_source(), encoding="utf-8")
        cases_file = tmp / "cases.json"
        cases_file.write_text(json.dumps(cases), encoding="utf-8")
        run_mjs = str(t.HARNESS / "run.mjs")
        py = _run(["node", run_mjs, str(cases_file), str(wheels), str(main_py), str(t.STAND_IN)])
        harness = str(t.STAND_IN / "lite_harness.py")
        cp = _run([sys.executable, harness, str(cases_file), str(main_py), "--site", str(site)])

    pt, ct = py["timings"], cp["timings"]
    print(
        f"Pyodide {py['pyodide']} (Python {py['python'].split()[0]}, pint {py['versions']['pint']}) against "
        f"CPython {cp['python'].split()[0]} (pint {cp['versions']['pint']});"
        f" {options.repeat} calls of each function's example"
    )
    print()
    print("| step | Pyodide ms | CPython ms | ratio |")
    print("| --- | ---: | ---: | ---: |")
    print(f"| load Pyodide (Node.js, from node_modules) | {pt['load_pyodide_ms']:.0f} | | |")
    print(f"| unpack {len(py['wheels'])} wheels into site-packages | {pt['install_ms']:.0f} | | |")
    print(
        f"| import main.py (and cellchem) | {pt['import_main_ms']:.0f} | {ct['import_main_ms']:.0f}"
        f" | {pt['import_main_ms'] / ct['import_main_ms']:.1f} |"
    )
    print(
        f'| first call: MOLAR_MASS("CuSO4.5H2O") | {pt["first_call_ms"]:.1f} | {ct["first_call_ms"]:.1f}'
        f" | {pt['first_call_ms'] / ct['first_call_ms']:.1f} |"
    )
    cold_p = pt["load_pyodide_ms"] + pt["install_ms"] + pt["import_main_ms"] + pt["first_call_ms"]
    cold_c = ct["import_main_ms"] + ct["first_call_ms"]
    print(f"| cold start in all | {cold_p:.0f} | {cold_c:.0f} | {cold_p / cold_c:.0f} |")

    print()
    print(
        "| function | first call: Pyodide ms | CPython ms | ratio"
        " | repeated call (median): Pyodide ms | CPython ms | ratio |"
    )
    print("| --- | ---: | ---: | ---: | ---: | ---: | ---: |")
    c_results = {r["id"]: r for r in cp["results"]}
    ratios = []
    for spec in single:
        key = spec["id"].split(":")[0]
        mine = [r for r in py["results"] if r["id"].startswith(spec["id"] + "#")]
        theirs = [c_results[r["id"]] for r in mine]
        p_first, c_first = mine[0]["ms"], theirs[0]["ms"]
        p_ms = statistics.median(r["ms"] for r in mine[1:])
        c_ms = statistics.median(r["ms"] for r in theirs[1:])
        note = ""
        if "error" in mine[0] and "sqlite3" in mine[0]["error"]:
            note = " (Pyodide refuses: no sqlite3)"
        else:
            ratios.append((p_first / c_first, p_ms / c_ms))
        print(
            f"| {key}{note} | {p_first:.2f} | {c_first:.2f} | {p_first / c_first:.1f}"
            f" | {p_ms:.3f} | {c_ms:.3f} | {p_ms / c_ms:.1f} |"
        )
    if ratios:
        first_ratio = statistics.median(r[0] for r in ratios)
        repeat_ratio = statistics.median(r[1] for r in ratios)
        print(f"| median ratio, functions Pyodide answers | | | {first_ratio:.1f} | | | {repeat_ratio:.1f} |")


if __name__ == "__main__":
    main()
