"""Runs the cases of tests/test_pyodide.py through a main.py written for xlwings Lite.

The same code runs in Pyodide (``run.mjs`` imports it) and in CPython (as a
script, in a child process), so the two answers differ only by the Python
that computed them. Each case is ``{"id", "function": python name, "args":
[...]}``; an argument is a cell value (``null`` for an empty cell), a list of
rows for a range, or ``{"error": "#N/A"}`` for an error cell. Each call goes
through the stand-in ``xlwings.call``, which hands the arguments over as
xlwings Lite does.

    python lite_harness.py CASES.json MAIN.py [--site DIR] [--without MODULE ...]

prints one JSON object: the timings, the Python version, one result per case
(``value`` or ``error`` with ``type``, and ``ms``, the call's time) and the
metadata main.py declared.
``--site`` puts a directory of unpacked wheels before the rest of
``sys.path``; ``--without`` makes a module unimportable, as it is in Pyodide.
"""

from __future__ import annotations

import importlib.abc
import importlib.metadata
import importlib.util
import json
import sys
import time
from typing import Any

import xlwings


class _Without(importlib.abc.MetaPathFinder):
    """Makes the named top-level modules unimportable."""

    def __init__(self, names: list[str]) -> None:
        self.names = set(names)

    def find_spec(self, fullname: str, path: Any, target: Any = None) -> None:
        if fullname.split(".")[0] in self.names:
            raise ModuleNotFoundError(f"No module named {fullname!r}", name=fullname)
        return None


def _decode(v: Any) -> Any:
    if isinstance(v, dict):
        return xlwings.ErrorCell(v["error"])
    if isinstance(v, list):
        return [_decode(x) for x in v]
    return v


def _plain(v: Any) -> tuple[Any, list[str]]:
    """The JSON form of a result, and the type names that have none."""
    if v is None or isinstance(v, bool | int | float | str):
        return v, []
    if isinstance(v, list | tuple):
        out, odd = [], []
        for x in v:
            p, o = _plain(x)
            out.append(p)
            odd += o
        return out, odd
    return repr(v), [type(v).__name__]


def _versions() -> dict[str, str | None]:
    out: dict[str, str | None] = {}
    for name in ("cellchem", "pint", "pyparsing"):
        try:
            out[name] = importlib.metadata.version(name)
        except importlib.metadata.PackageNotFoundError:
            out[name] = None
    return out


def run(main_path: str, cases: list[dict[str, Any]]) -> dict[str, Any]:
    """Import main.py as the module ``main`` and call every case."""
    t0 = time.perf_counter()
    spec = importlib.util.spec_from_file_location("main", main_path)
    module = importlib.util.module_from_spec(spec)
    sys.modules["main"] = module
    spec.loader.exec_module(module)
    import_ms = 1000 * (time.perf_counter() - t0)

    results = []
    first_ms, rest_ms = 0.0, 0.0
    for n, case in enumerate(cases):
        f = getattr(module, case["function"])
        args = _decode(case["args"])
        t = time.perf_counter()
        try:
            value = xlwings.call(f, args)
        except Exception as exc:
            entry: dict[str, Any] = {"id": case["id"], "error": str(exc), "type": type(exc).__name__}
        else:
            plain, odd = _plain(value)
            entry = {"id": case["id"], "value": plain, "shows": xlwings.cells(value)}
            if odd:
                entry["unexpected_types"] = odd
        elapsed = 1000 * (time.perf_counter() - t)
        entry["ms"] = elapsed
        if n == 0:
            first_ms = elapsed
        else:
            rest_ms += elapsed
        results.append(entry)
    return {
        "timings": {
            "import_main_ms": import_ms,
            "first_call_ms": first_ms,
            "calls": max(len(cases) - 1, 0),
            "calls_ms": rest_ms,
        },
        "python": sys.version,
        "platform": sys.platform,
        "versions": _versions(),
        "cellchem_file": getattr(sys.modules.get("cellchem"), "__file__", None),
        "results": results,
        "declared": xlwings.declared(module),
    }


def run_json(main_path: str, cases_json: str) -> str:
    """``run`` with the cases and the answer as JSON text (how run.mjs calls it)."""
    return json.dumps(run(main_path, json.loads(cases_json)))


def main(argv: list[str]) -> None:
    positional, site, without = [], [], []
    it = iter(argv)
    for a in it:
        if a == "--site":
            site.append(next(it))
        elif a == "--without":
            without.append(next(it))
        else:
            positional.append(a)
    cases_path, main_path = positional
    sys.path[1:1] = site  # after this script's directory (the stand-in), before the rest
    if without:
        sys.meta_path.insert(0, _Without(without))
    with open(cases_path, encoding="utf-8") as fh:
        cases = json.load(fh)
    print(json.dumps(run(main_path, cases)))


if __name__ == "__main__":
    main(sys.argv[1:])
