"""The worksheet functions in Pyodide, where xlwings Lite runs them, answer as in CPython.

xlwings Lite runs Python in Pyodide (CPython compiled to WebAssembly) inside
Excel. This test builds cellchem's wheel from the checkout, writes the
main.py of ``lite.main_source()``, and runs one set of cases through it three
times: in Pyodide under Node.js (tests/pyodide/run.mjs, offline: the npm
package's Pyodide and wheels unpacked from disk), in CPython, and in CPython
without sqlite3 (which the npm Pyodide lacks). xlwings' decorators are
replaced by a recording stand-in (tests/pyodide/stand_in) that hands the
arguments over as xlwings Lite does. The cases come from the function table:
for every function its example's arguments as single cells, a range with a
blank and a bad cell, a blank first argument, a bad first argument and an
error value (#N/A). Pyodide must give CPython's answers (numbers to 1e-12
relative) and the same refusals, except where the substance table is needed:
there it must give the refusal that names sqlite3 and requirements.txt.

    bash tests/pyodide/setup.sh                                   # once: npm ci, pip download
    python -m pytest -q tests/test_pyodide.py -p no:cacheprovider -s  # -s prints the timings

Skipped when Node.js, the npm package or the wheels are missing, unless
CELLCHEM_PYODIDE_TESTS=required (then it fails). Every test here has
"pyodide" in its name: ``-k pyodide`` selects them, ``-k "not pyodide"``
leaves them out.
"""

from __future__ import annotations

import ast
import importlib.util
import json
import math
import os
import re
import shutil
import subprocess
import sys
import zipfile
from pathlib import Path

import pytest
from packaging.specifiers import SpecifierSet

from cellchem.adapters.sheets import lite
from cellchem.adapters.sheets.functions import FUNCTIONS

ROOT = Path(__file__).resolve().parents[1]
HARNESS = ROOT / "tests" / "pyodide"
STAND_IN = HARNESS / "stand_in"
WHEELS = HARNESS / "wheels"
SETUP = "bash tests/pyodide/setup.sh"
REQUIRED = os.environ.get("CELLCHEM_PYODIDE_TESTS") == "required"

BAD = "Xx9"  # no element has the symbol Xx
BAD_NAME = "iron chloride"  # leaves the charge of iron open
NA = {"error": "#N/A"}  # an error cell, as lite_harness reads it
# functions whose example reads cells (A2:A7) instead of values: the arguments used in its place
# (sodium and chloride at 1 meq/L each: 22.99 and 35.45 mg/L, standard atomic weights, common practice)
CELL_EXAMPLES = {
    "ION_BALANCE": {
        "single": ["Na+", 22.99, "mg/L"],
        "range": [[["Na+"], ["Cl-"], [None]], [[22.99], [35.45], [None]], "mg/L"],
    },
}
# what xlwings documents for @func (the stand-in refuses every other keyword)
FUNC_KEYWORDS = {
    "name",
    "namespace",
    "volatile",
    "cache",
    "help_url",
    "required_roles",
    "category",
    "call_in_wizard",
    "async_mode",
}


def _missing() -> str | None:
    if shutil.which("node") is None:
        return "Node.js (node) is not on PATH"
    if not (HARNESS / "node_modules" / "pyodide" / "pyodide.mjs").is_file():
        return "the npm package pyodide is not installed in tests/pyodide/node_modules"
    for dependency in ("pint", "pyparsing"):
        if not list(WHEELS.glob(f"{dependency}-*.whl")):
            return f"no {dependency} wheel in tests/pyodide/wheels"
    return None


def _require() -> None:
    missing = _missing()
    if missing:
        message = f"Pyodide test: {missing}; run `{SETUP}`"
        if REQUIRED:
            pytest.fail(message + " (CELLCHEM_PYODIDE_TESTS=required)")
        pytest.skip(message)


# --- the cases ---------------------------------------------------------------------------------------


class _Reference:
    """A cell reference in an example (A2:A7): no value to pass."""


def _example_cells(example: str) -> list:
    """The arguments of an example formula such as '=CELLCHEM.GRAMS_TO_WEIGH("CuSO4",0.1,,"x") gives 6.2'
    as cell values: texts, numbers, booleans, None for a left-out argument, _Reference for a reference."""
    start = example.index("(")
    parts, current, depth, quoted = [], "", 0, False
    for ch in example[start + 1 :]:
        if quoted:
            current += ch
            quoted = ch != '"'
            continue
        if ch == '"':
            quoted = True
        elif ch == "(":
            depth += 1
        elif ch == ")":
            if depth == 0:
                parts.append(current)
                break
            depth -= 1
        elif ch == "," and depth == 0:
            parts.append(current)
            current = ""
            continue
        current += ch
    else:
        raise ValueError(f"no closing parenthesis in the example {example!r}")

    def cell(token: str):
        token = token.strip()
        if token == "":
            return None
        if len(token) >= 2 and token[0] == token[-1] == '"':
            return token[1:-1].replace('""', '"')
        if token.upper() in ("TRUE", "FALSE"):
            return token.upper() == "TRUE"
        if re.fullmatch(r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?", token):
            return float(token)
        return _Reference()

    return [cell(p) for p in parts]


def _cases() -> tuple[list[dict], dict[str, str]]:
    """The cases for every function of the table, and each function's Python name in main.py."""
    python_names = _declared_names(lite.main_source())
    cases = []
    for key, spec in FUNCTIONS.items():
        function = python_names[key]
        n = len(spec.arguments)
        if key in CELL_EXAMPLES:
            single = list(CELL_EXAMPLES[key]["single"])
            ranged = list(CELL_EXAMPLES[key]["range"])
        else:
            single = _example_cells(spec.example)
            if any(isinstance(v, _Reference) for v in single):
                raise AssertionError(f"the example of {key} reads cells: give its arguments in CELL_EXAMPLES")
            ranged = None
        assert len(single) <= n, f"{key}: the example has more arguments than the table"
        single += [None] * (n - len(single))
        bad = BAD_NAME if spec.arguments[0].name == "name" else BAD
        if ranged is None:
            ranged = list(single)
            if spec.ranges or n == 1:
                ranged[0] = [[single[0]], [None], [bad]]
            else:  # a function over whole ranges (solutes and their concentrations): parallel ranges
                ranged[0] = [[single[0]], [None], [single[0]]]
                ranged[1] = [[single[1]], [None], [single[1]]]

        kinds = [
            ("single", single),
            ("range", ranged),
            ("blank", [None, *single[1:]]),
            ("refusal", [bad, *single[1:]]),
            ("error", [NA, *single[1:]]),
        ]
        if spec.ranges:
            kinds.append(("error-in-range", [[[single[0]], [NA]], *single[1:]]))
        cases += [{"id": f"{key}:{kind}", "function": function, "args": args} for kind, args in kinds]
    return cases, python_names


def _declared_names(source: str) -> dict[str, str]:
    """Excel name -> Python name of every function main.py declares with @func(name=...)."""
    names = {}
    for node in ast.parse(source).body:
        if not isinstance(node, ast.FunctionDef):
            continue
        for decorator in node.decorator_list:
            if isinstance(decorator, ast.Call) and getattr(decorator.func, "id", None) == "func":
                given = {k.arg: k.value for k in decorator.keywords}
                excel = ast.literal_eval(given["name"]) if "name" in given else node.name.upper()
                assert excel not in names, f"{excel} is declared twice in main.py"
                names[excel] = node.name
    return names


# --- running them ------------------------------------------------------------------------------------


def _build_wheel(tmp: Path) -> Path:
    """cellchem's wheel, built from a copy of the checkout (the checkout gets no build/ or egg-info)."""
    source = tmp / "source"
    source.mkdir()
    for name in ("pyproject.toml", "README.md", "LICENSE", "MANIFEST.in"):
        if (ROOT / name).exists():
            shutil.copy2(ROOT / name, source / name)
    shutil.copytree(ROOT / "cellchem", source / "cellchem", ignore=shutil.ignore_patterns("__pycache__"))
    out = tmp / "dist"
    pip = [sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-index", "--quiet", "-w", str(out)]
    attempts = [
        pip + ["--no-build-isolation", str(source)],  # this Python's setuptools
        pip + ["--find-links", str(WHEELS / "build"), str(source)],  # the backend setup.sh downloaded
    ]
    errors = []
    for command in attempts:
        proc = subprocess.run(command, capture_output=True, text=True, timeout=300)
        if proc.returncode == 0:
            break
        errors.append(proc.stderr[-2000:])
    else:
        pytest.fail("cannot build cellchem's wheel offline (run `" + SETUP + "`):\n" + "\n".join(errors))
    (wheel,) = out.glob("cellchem-*.whl")
    return wheel


def _accepts_this_python(wheel: Path) -> bool:
    with zipfile.ZipFile(wheel) as zf:
        name = next(n for n in zf.namelist() if n.endswith(".dist-info/METADATA"))
        metadata = zf.read(name).decode("utf-8")
    found = re.search(r"^Requires-Python:\s*(.+)$", metadata, re.MULTILINE)
    return found is None or SpecifierSet(found.group(1).strip()).contains(
        f"{sys.version_info.major}.{sys.version_info.minor}.{sys.version_info.micro}"
    )


def _run(command: list[str]) -> dict:
    proc = subprocess.run(command, capture_output=True, text=True, timeout=300, cwd=ROOT)
    assert proc.returncode == 0, f"{command[:2]} failed:\n{proc.stderr[-6000:]}"
    return json.loads(proc.stdout.strip().splitlines()[-1])


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    """The cases and their answers: Pyodide, CPython, CPython without sqlite3."""
    _require()
    tmp = tmp_path_factory.mktemp("pyodide")
    cellchem_wheel = _build_wheel(tmp)
    dependencies = sorted(WHEELS.glob("*.whl"))
    wheels = tmp / "wheels"
    wheels.mkdir()
    for wheel in [cellchem_wheel, *dependencies]:
        shutil.copy2(wheel, wheels / wheel.name)
    main = tmp / "main.py"
    main.write_text(lite.main_source(), encoding="utf-8")
    cases, python_names = _cases()
    cases_file = tmp / "cases.json"
    cases_file.write_text(json.dumps(cases), encoding="utf-8")

    # CPython runs the same wheel; and the same dependency wheels where they accept this Python
    # (setup.sh resolves them for Pyodide's 3.13), else this environment's pint and pyparsing
    same_dependencies = all(_accepts_this_python(w) for w in dependencies)
    site = tmp / "site"
    for wheel in [cellchem_wheel, *(dependencies if same_dependencies else [])]:
        with zipfile.ZipFile(wheel) as zf:
            zf.extractall(site)

    pyodide = _run(["node", str(HARNESS / "run.mjs"), str(cases_file), str(wheels), str(main), str(STAND_IN)])
    cpython_command = [sys.executable, str(STAND_IN / "lite_harness.py"), str(cases_file), str(main)]
    cpython_command += ["--site", str(site)]
    cpython = _run(cpython_command)
    without_sqlite = _run([*cpython_command, "--without", "sqlite3", "--without", "_sqlite3"])
    return {
        "cases": cases,
        "python_names": python_names,
        "pyodide": pyodide,
        "cpython": cpython,
        "without_sqlite": without_sqlite,
        "same_dependencies": same_dependencies,
        "site": site,
    }


def _by_id(run: dict) -> dict[str, dict]:
    return {r["id"]: r for r in run["results"]}


def _same(a, b) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return type(a) is type(b) and a == b
    if isinstance(a, int | float) and isinstance(b, int | float):
        if math.isnan(a) or math.isnan(b):
            return math.isnan(a) and math.isnan(b)
        return a == b or math.isclose(a, b, rel_tol=1e-12, abs_tol=0.0)
    if isinstance(a, list) and isinstance(b, list):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b))
    return type(a) is type(b) and a == b


def _same_outcome(a: dict, b: dict) -> bool:
    if ("error" in a) != ("error" in b):
        return False
    if "error" in a:
        return a["error"] == b["error"] and a["type"] == b["type"]
    return _same(a["value"], b["value"])


def _flat(value) -> list:
    if isinstance(value, list):
        return [x for v in value for x in _flat(v)]
    return [value]


def _needs_sqlite3(runs) -> set[str]:
    """The cases whose answer changes when CPython has no sqlite3."""
    full, without = _by_id(runs["cpython"]), _by_id(runs["without_sqlite"])
    return {i for i in full if not _same_outcome(full[i], without[i])}


# --- the tests ---------------------------------------------------------------------------------------


def test_pyodide_answers_as_cpython(runs):
    pyodide, cpython = _by_id(runs["pyodide"]), _by_id(runs["cpython"])
    assert set(pyodide) == set(cpython) == {c["id"] for c in runs["cases"]}
    skipped = _needs_sqlite3(runs)
    differ = []
    for case in runs["cases"]:
        i = case["id"]
        for run in ("pyodide", "cpython", "without_sqlite"):
            assert "unexpected_types" not in _by_id(runs[run])[i], (run, _by_id(runs[run])[i])
        if i not in skipped and not _same_outcome(pyodide[i], cpython[i]):
            differ.append(f"{i} {case['args']!r}:\n  pyodide {pyodide[i]}\n  cpython {cpython[i]}")
    versions = f"pyodide {runs['pyodide']['versions']}, cpython {runs['cpython']['versions']}"
    assert not differ, f"{len(differ)} answers differ ({versions}):\n" + "\n".join(differ)
    _print_figures(runs, skipped)


def test_pyodide_refuses_single_cells_with_an_exception(runs):
    """A refused single cell raises (xlwings Lite shows #VALUE! and the message on the cell's error
    flag) rather than giving the bare error value, in both Pythons."""
    single = {c["id"] for c in runs["cases"] if not any(isinstance(a, list) for a in c["args"])}
    for run in ("pyodide", "cpython"):
        answers = _by_id(runs[run])
        raised = [i for i in single if "error" in answers[i]]
        assert any(i.endswith(":refusal") for i in raised), f"{run}: no bad input was refused"
        for i in raised:
            assert answers[i]["type"] == "Refused", answers[i]
            assert answers[i]["error"].strip() and "\n" not in answers[i]["error"], answers[i]
        for i in single - set(raised):
            assert answers[i]["value"] not in ("#VALUE!", [["#VALUE!"]]), f"{run} {i}: {answers[i]}"


def test_pyodide_refuses_the_substance_table_for_want_of_sqlite3(runs):
    pyodide, without = _by_id(runs["pyodide"]), _by_id(runs["without_sqlite"])
    needs = sorted(_needs_sqlite3(runs))
    assert any(i.startswith("SUBSTANCE:") for i in needs), "the substance table's cases did not need sqlite3"
    full = _by_id(runs["cpython"])
    for i in needs:
        answer = pyodide[i]
        assert _same_outcome(answer, without[i]), (answer, without[i])
        if "error" in answer:  # a single cell: the message says what to do
            assert "sqlite3" in answer["error"] and "requirements.txt" in answer["error"], answer
        else:  # a range: the cells that needed the table are #VALUE! (=CELLCHEM.WHY gives the message)
            changed = [
                got
                for got, wanted in zip(_flat(answer["value"]), _flat(full[i].get("value")))
                if not _same(got, wanted)
            ]
            assert changed and all(v == "#VALUE!" for v in changed), (answer, full[i])
    print(f"\nnote: {len(needs)} cases need the substance table (sqlite3), not compared: {', '.join(needs)}")


def test_pyodide_declares_every_function_for_xlwings_lite(runs):
    declared = {d["excel_name"]: d for d in runs["pyodide"]["declared"]}
    assert runs["pyodide"]["declared"] == runs["cpython"]["declared"]
    assert set(declared) == set(FUNCTIONS) == set(runs["python_names"])
    for key, spec in FUNCTIONS.items():
        d = declared[key]
        assert d["namespace"] == "cellchem" and d["name"] == key, d
        assert d["python_name"] == runs["python_names"][key]
        assert d["doc"] and d["doc"].strip(), f"{key}: no docstring"
        assert set(d["keywords"]["func"]) <= FUNC_KEYWORDS
        assert d["not_for_lite"] == [], f"{key} uses keywords xlwings Lite ignores: {d['not_for_lite']}"
        assert [a["name"] for a in d["args"]] == [a.name for a in spec.arguments]
        for recorded, argument in zip(d["args"], spec.arguments):
            where = f"{key}({argument.name})"
            assert recorded["arg_decorators"] == 1, f"{where}: one @arg per argument"
            assert isinstance(recorded["doc"], str) and recorded["doc"].strip(), f"{where}: no doc"
            assert recorded["options"].get("ndim") == 2, where
            assert recorded["options"].get("err_to_str") is True, where
            assert recorded["optional"] == argument.optional, where
            assert recorded["default"] is None, where


def test_pyodide_is_the_pinned_one_and_ran_offline(runs):
    lock = json.loads((HARNESS / "package-lock.json").read_text(encoding="utf-8"))
    assert runs["pyodide"]["pyodide"] == lock["packages"]["node_modules/pyodide"]["version"]
    assert runs["pyodide"]["platform"] == "emscripten"
    shipped = HARNESS / "node_modules" / "pyodide" / "pyodide-lock.json"  # the package's own description
    shipped = json.loads(shipped.read_text(encoding="utf-8"))
    assert runs["pyodide"]["python"].split()[0] == shipped["info"]["python"]
    assert runs["pyodide"]["versions"]["cellchem"] == runs["cpython"]["versions"]["cellchem"]
    # both ran the wheel built from the checkout, not an installed or editable cellchem
    assert Path(runs["cpython"]["cellchem_file"]).is_relative_to(runs["site"])
    assert runs["pyodide"]["cellchem_file"].endswith("site-packages/cellchem/__init__.py")
    if runs["same_dependencies"]:
        assert runs["pyodide"]["versions"] == runs["cpython"]["versions"]


def _print_figures(runs, skipped: set[str]) -> None:
    p, c = runs["pyodide"]["timings"], runs["cpython"]["timings"]
    per_call_p = p["calls_ms"] / max(p["calls"], 1)
    per_call_c = c["calls_ms"] / max(c["calls"], 1)
    print(
        f"\nPyodide {runs['pyodide']['pyodide']} (Python {runs['pyodide']['python'].split()[0]}), "
        f"{len(runs['cases'])} cases, {len(skipped)} need sqlite3:"
        f" load {p['load_pyodide_ms']:.0f} ms, install {p['install_ms']:.0f} ms,"
        f" import main.py {p['import_main_ms']:.0f} ms (CPython {c['import_main_ms']:.0f} ms),"
        f" first call {p['first_call_ms']:.1f} ms (CPython {c['first_call_ms']:.1f} ms),"
        f" later calls {per_call_p:.2f} ms each (CPython {per_call_c:.2f} ms)"
    )


# --- the stand-in itself (no Node.js needed) ---------------------------------------------------------


def _stand_in():
    """The stand-in, loaded under another name: the real xlwings stays what ``import xlwings`` gives."""
    path = STAND_IN / "xlwings" / "__init__.py"
    spec = importlib.util.spec_from_file_location("pyodide_stand_in_xlwings", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_pyodide_stand_in_refuses_undocumented_keywords():
    xw = _stand_in()
    with pytest.raises(TypeError, match="colour"):
        xw.func(colour="red")
    with pytest.raises(TypeError, match="descripton"):
        xw.arg("x", descripton="a typo of doc")
    with pytest.raises(TypeError, match="doc"):
        xw.ret(doc="ret takes no doc")
    with pytest.raises(TypeError, match="'y'"):

        @xw.func
        @xw.arg("y", ndim=2)
        def f(x):
            return x

    with pytest.raises(TypeError, match="below @func"):
        xw.arg("x", ndim=2)(xw.func(lambda x: x))


def test_pyodide_stand_in_hands_arguments_over_as_xlwings_lite():
    xw = _stand_in()

    @xw.func(name="ECHO", namespace="test")
    @xw.arg("x", ndim=2, err_to_str=True, doc="anything")
    @xw.arg("y", doc="left as xlwings gives it")
    def echo(x, y="default"):
        """Returns what it was given."""
        return [x, y]

    assert xw.call(echo, ["a", "b"]) == [[["a"]], "b"]  # ndim=2: one cell as a range of one
    assert xw.call(echo, [[["a"], [None]], [[1.0, 2.0]]]) == [[["a"], [None]], [1.0, 2.0]]
    assert xw.call(echo, [None]) == [None, "default"]  # empty or left out: the default, unconverted
    assert xw.call(echo, [xw.ErrorCell("#N/A"), xw.ErrorCell("#N/A")]) == [[["#N/A"]], None]
    (d,) = xw.declared(_module_with(echo))
    assert d["excel_name"] == "ECHO" and d["namespace"] == "test" and d["doc"] == "Returns what it was given."
    assert [(a["name"], a["optional"], a["doc"]) for a in d["args"]] == [
        ("x", False, "anything"),
        ("y", True, "left as xlwings gives it"),
    ]
    assert xw.cells([["#VALUE!", 1.0], [None, "#N/A"]])["error_values"] == [
        [0, 0, "Value"],
        [1, 1, "NotAvailable"],
    ]


def _module_with(f):
    module = type(sys)("pyodide_stand_in_probe")
    module.f = f
    return module
