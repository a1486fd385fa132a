"""The worksheet functions, called as the spreadsheet layers call them, and the demo
workbook evaluated by an independent formula engine (the `formulas` package)
with the functions registered as custom functions. Expected values come from
the core's own functions (the layer must give what the core gives; the core's
numbers are tested against their sources elsewhere); the shape, naming and
error rules are those of README's "Worksheet functions" section."""

from __future__ import annotations

import inspect
import re
import sys
import types
from pathlib import Path

import pytest
from demo_values import check_demo_values

from cellchem import (
    conductivity,
    convert_concentration,
    ionic_strength,
    mass_for_solution,
    mass_fraction,
    molar_mass,
)
from cellchem.adapters.sheets import excel as xlwings_udfs
from cellchem.adapters.sheets import functions as sf
from cellchem.adapters.sheets import lite
from cellchem.adapters.sheets.cells import CellError

ROOT = Path(__file__).resolve().parents[1]
run = sf.run


def _refused(v, words=""):
    return isinstance(v, CellError) and v.code == "#VALUE!" and words in v.message


# -- as the layers call them: ndim=2 lists, None for empty, floats, error text -------------------


def test_single_cell_and_range_shapes():
    assert run("MOLAR_MASS", "NaCl") == pytest.approx(float(molar_mass("NaCl")))
    assert run("MOLAR_MASS", [["NaCl"]]) == [[pytest.approx(float(molar_mass("NaCl")))]]
    column = run("MOLAR_MASS", [["NaCl"], ["KCl"], [None]])
    assert len(column) == 3 and all(len(r) == 1 for r in column)
    assert column[2] == [None]  # empty in, empty out
    row = run("MOLAR_MASS", [["NaCl", "KCl", "CaCl2"]])
    assert len(row) == 1 and len(row[0]) == 3
    block = run("MOLAR_MASS", [["NaCl", "KCl"], ["MgO", None]])
    assert block[1][0] == pytest.approx(float(molar_mass("MgO")))


def test_numbers_stay_numbers_and_errors_pass_through():
    out = run("MOLAR_MASS", [["NaCl"], ["#N/A"], [-2146826281], ["Xx"]])
    assert isinstance(out[0][0], float)
    assert out[1][0] == CellError("#N/A")  # the same error value out, with nothing to explain
    assert out[2][0] == CellError("#DIV/0!")  # the COM code of an error cell
    assert _refused(out[3][0], "unknown element symbol 'Xx'")


def test_a_refusal_is_an_error_value_with_the_whole_message():
    refused = run("FORMULA", "iron chloride")
    assert _refused(refused, "leaves the charge of iron open")
    assert len(refused.message) > 80  # the whole one-line message, not a cut


def test_mixed_types():
    assert run("CAS_VALID", 7732185.0) is False  # a number is read as its digits: no hyphens, not valid
    assert run("CAS_VALID", "7732-18-5") is True
    assert run("OXIDATION_STATE", "KMnO4", "Mn") == 7.0
    assert _refused(run("CHARGES_BALANCE", True))  # a boolean is not a formula
    # an organic salt with no catalog anion is neither balanced nor not: refused with the reason
    assert _refused(run("CHARGES_BALANCE", "C9H19N2NaO4S"))
    assert run("CHARGES_BALANCE", "C2H3NaO2") is True  # sodium acetate in Hill order (common practice)


def test_broadcast_and_shape_mismatch():
    out = run("MASS_FRACTION", [["CuSO4", "CuCl2"]], "Cu")
    assert out[0][1] == pytest.approx(mass_fraction("CuCl2", "Cu"))
    assert _refused(run("SALT", [["Na+", "K+"]], [["Cl-"], ["Br-"]]), "shapes")


def test_check_line():
    assert run("CHECK_LINE", "Sodium chloride", "NaCl", 58.44, "7647-14-5") == ""
    # the name and the formula disagree and nothing else on the line settles which is wrong
    assert run("CHECK_LINE", "Sodium sulfite", "Na2SO4").startswith("error: the cells disagree")
    # with the molar mass of sodium sulfate (142.04, CRC, from memory) the name is the odd one
    assert "so the name is the cell to check" in run("CHECK_LINE", "Sodium sulfite", "Na2SO4", 142.04)
    assert run("CHECK_LINE", None, None) is None
    assert run("CHECK_LINE", None, "NaCl2").startswith("error:")


def test_solution_functions_take_ranges():
    assert run("IONIC_STRENGTH", [["MgCl2"], ["NaCl"]], [[0.1], ["10 mmol/L"]]) == pytest.approx(
        float(ionic_strength([("MgCl2", 0.1), ("NaCl", 0.01)]))
    )
    assert _refused(run("IONIC_STRENGTH", [["NaCl"]], [[0.1], [0.2]]))
    assert run("CONDUCTIVITY", "KCl", 0.01) == pytest.approx(float(conductivity([("KCl", 0.01)])))
    assert run("IONS", "Al2(SO4)3") == [["Al3+", 2.0, 3.0], ["SO4 2-", 3.0, -2.0]]
    assert _refused(run("IONS", [["NaCl", "KCl"]]), "one formula")
    balance = run("ION_BALANCE", [["Ca2+"], ["HCO3-"]], [[2.0], [2.0]])
    assert balance == [[2.0, 2.0, 0.0, True]]


def test_grams_and_convert():
    assert run("GRAMS_TO_WEIGH", "CuSO4", 0.1, "250 mL", None, "CuSO4.5H2O") == pytest.approx(
        mass_for_solution("CuSO4", 0.1, "250 mL", shelf_form="CuSO4·5H2O").mass
    )
    assert run("CONVERT_CONCENTRATION", 37, "% w/w", "mol/L", "HCl", 1.18) == pytest.approx(
        float(convert_concentration(37, "% w/w", "mol/L", "HCl", density=1.18))
    )
    assert _refused(run("GRAMS_TO_WEIGH", "NaCl", 0.1, 1, 99))  # a purity over 1 is refused, not guessed


def test_sds_functions():
    # water's EC number 231-791-2 (EC inventory, from memory); the last digit changed fails its check
    assert run("EC_VALID", "231-791-2") is True and run("EC_VALID", "231-791-3") is False
    # H225 (flammable liquid 2) carries Danger, H319 (eye irritation 2) Warning: Danger wins; their
    # pictograms GHS02 and GHS07 (GHS Annex 3 / CLP Annex I, from memory)
    assert run("SIGNAL_WORD", "H225, H319") == "Danger"
    assert run("PICTOGRAMS", "H225, H319") == "GHS02, GHS07"
    assert run("SIGNAL_WORD", "H412") == ""  # chronic aquatic 3: no signal word
    assert run("SIGNAL_WORD", "H272") == "Danger or Warning"  # oxidising solid 2 or 3
    assert _refused(run("SIGNAL_WORD", "H999"), "unknown statement code 'H999'")
    assert run("CHECK_HAZARDS", "H290, H314", "Warning").startswith("error: signal word 'Warning'")
    assert run("CHECK_HAZARDS", "H290, H314", "Danger", "GHS05") == ""
    # hydrochloric acid ships as UN1789 (UN Model Regulations, from memory); nitric acid does not
    assert run("CHECK_UN", "UN1789", "7647-01-0") == ""
    assert run("CHECK_UN", "UN1789", "7697-37-2").startswith("warning: UN number 'UN1789'")


# -- WHY: the message where a platform cannot show it ---------------------------------------------


def test_why_gives_the_message_of_the_same_call():
    assert run("WHY", "MOLAR_MASS", "NaCl2Xx") == "unknown element symbol 'Xx' at position 6 in 'NaCl2Xx'"
    assert run("WHY", "MOLAR_MASS", "NaCl") is None  # an answer: nothing to explain
    # the name as each platform writes it, in any case
    for typed in ("CELLCHEM.MOLAR_MASS", "cellchem_molar_mass", "molar_mass"):
        assert run("WHY", typed, "Xx") == run("MOLAR_MASS", "Xx").message
    assert run("WHY", "MOLAR_MASS", [["NaCl"], ["Xx"], [None]]) == [
        [None],
        [run("MOLAR_MASS", "Xx").message],
        [None],
    ]
    assert run("WHY", "MOLAR_MASS", "#N/A") == "the input is the error value #N/A"
    assert "is not a cellchem worksheet function" in run("WHY", "MOLARMASS", "NaCl")
    assert "is not a cellchem worksheet function" in run("WHY", "WHY", "MOLAR_MASS")
    assert "takes 1 arguments" in run("WHY", "MOLAR_MASS", "NaCl", "extra")


@pytest.mark.parametrize("name", sorted(set(sf.FUNCTIONS) - {"WHY"}))
def test_why_explains_every_refusal_of_every_function(name):
    spec = sf.FUNCTIONS[name]
    for args in _inputs(spec):
        result = spec.implementation(*args)
        explained = run("WHY", name, *args)
        if isinstance(result, CellError):
            assert explained == result.message, args
        elif isinstance(result, list):
            flat = [c for row in result for c in row]
            messages = [c for row in explained for c in row] if isinstance(explained, list) else [explained]
            assert messages == [c.message if isinstance(c, CellError) else None for c in flat], args
        else:
            assert explained is None, args


# -- the Excel declarations, generated from FUNCTIONS ------------------------------------------


def _example_arguments(spec):
    """The arguments of a function's README example (``=CC_X("a",0.1,,"b")``): strings and numbers as
    a cell gives them, an omitted argument or a cell reference as None."""
    inner = spec.example.split(" gives ")[0].split(" spills ")[0]
    inner = inner[inner.index("(") + 1 : inner.rindex(")")]
    tokens = re.findall(r'"[^"]*"|[^,]+|(?<=,)(?=,|$)|^(?=,)', inner)
    values = []
    for token in tokens:
        if token.startswith('"'):
            values.append(token[1:-1])
        elif re.fullmatch(r"-?\d+(\.\d+)?", token):
            values.append(float(token))
        else:
            values.append(None)  # empty, or a reference such as A2:A7
    return values


def test_example_arguments_are_read_as_written():
    grams = sf.FUNCTIONS["GRAMS_TO_WEIGH"]
    assert _example_arguments(grams) == ["CuSO4", 0.1, "250 mL", None, "CuSO4.5H2O"]
    assert _example_arguments(sf.FUNCTIONS["ION_BALANCE"]) == [None, None, "mg/L"]


def _inputs(spec):
    """A few argument lists for one function: its example, every argument empty, the example with its
    first argument as a column of two cells, a cell that does not read, and a wrong type."""
    example = _example_arguments(spec)
    assert len(example) <= len(spec.arguments), spec.example
    example += [None] * (len(spec.arguments) - len(example))
    first = example[0]
    return [
        example,
        [None] * len(spec.arguments),
        [[[first], [None]]] + example[1:],
        ["Xx(("] + example[1:],
        [True] + example[1:],
    ]


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_entry_is_complete(name):
    spec = sf.FUNCTIONS[name]
    assert re.fullmatch(r"[A-Z][A-Z_]*[A-Z]", name) and spec.python_name == name.lower()
    assert spec.example.startswith(f"={sf.spelled(name)}(")
    optional = [a.optional for a in spec.arguments]
    assert optional == sorted(optional), "an optional argument before a required one"
    for a in spec.arguments:
        assert a.description and len(a.description) < 120
    # the name each platform shows: a period in Excel, an underscore where names cannot hold one
    assert sf.spelled(name, "excel") == f"CELLCHEM.{name}"
    assert sf.spelled(name, "calc") == sf.spelled(name, "classic") == f"CELLCHEM_{name}"


# -- xlwings Lite: main.py, generated from FUNCTIONS ------------------------------------------


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_lite_gives_what_the_table_gives_as_excel_takes_it(name):
    spec = sf.FUNCTIONS[name]
    for args in _inputs(spec):
        expected = spec.implementation(*args)
        if isinstance(expected, CellError):
            # a single refused cell: an exception, which xlwings Lite shows as #VALUE! and its message
            with pytest.raises(lite.Refused) as raised:
                lite.call(name, *args)
            assert str(raised.value) == expected.message
            continue
        got = lite.call(name, *args)
        if isinstance(expected, list):
            every = [c for row in expected for c in row]
            if len(every) == 1 and isinstance(every[0], CellError):
                continue  # raised above's way
            # in a range each refused cell is the text of the error value, which xlwings makes an error
            assert got == [[c.code if isinstance(c, CellError) else c for c in row] for row in expected]
        else:
            assert got == expected


def test_lite_single_cells_raise_and_ranges_hold_error_values():
    with pytest.raises(lite.Refused, match="unknown element symbol 'Xx'"):
        lite.call("MOLAR_MASS", [["Xx"]])  # xlwings passes one cell as [[v]] (ndim=2)
    column = lite.call("MOLAR_MASS", [["NaCl"], ["Xx"], [None], ["#N/A"]])
    assert column[1:] == [["#VALUE!"], [None], ["#N/A"]]
    assert lite.call("MOLAR_MASS", [["#N/A"]]) == [["#N/A"]]  # an error value in: the same out


class _Recorder(types.ModuleType):
    """Stands in for xlwings' func and arg decorators while main.py is run: records what they are
    given (xlwings Lite's own decorators are not imported by the tests; see tests/pyodide)."""

    def __init__(self):
        super().__init__("xlwings")
        self.declared = {}

    def func(self, f=None, **options):
        def mark(fn):
            self.declared.setdefault(fn.__name__, {"args": []})["func"] = options
            return fn

        return mark if f is None else mark(f)

    def arg(self, name, convert=None, **options):
        def mark(fn):
            self.declared.setdefault(fn.__name__, {"args": []})["args"].insert(0, (name, options))
            return fn

        return mark


def _run_main(monkeypatch, source=None):
    recorder = _Recorder()
    monkeypatch.setitem(sys.modules, "xlwings", recorder)
    module = types.ModuleType("main")
    exec(compile(source or lite.main_source(), "main.py", "exec"), module.__dict__)
    return module, recorder.declared


def test_main_py_declares_every_function_in_the_namespace(monkeypatch):
    module, declared = _run_main(monkeypatch)
    assert set(declared) == {spec.python_name for spec in sf.FUNCTIONS.values()}
    for name, spec in sf.FUNCTIONS.items():
        info = declared[spec.python_name]
        assert info["func"] == {"name": name, "namespace": "cellchem"}
        assert info["args"] == [
            (a.name, {"ndim": 2, "err_to_str": True, "doc": a.description}) for a in spec.arguments
        ]
        fn = getattr(module, spec.python_name)
        assert fn.__doc__ == spec.summary  # the function's description in Excel
        params = inspect.signature(fn).parameters
        assert list(params) == [a.name for a in spec.arguments]
        for p, a in zip(params.values(), spec.arguments):
            assert (p.default is None) if a.optional else (p.default is inspect.Parameter.empty)
    assert module.molar_mass([["NaCl"], ["KCl"]]) == lite.call("MOLAR_MASS", [["NaCl"], ["KCl"]])


def test_main_py_refuses_a_wheel_of_another_version(monkeypatch):
    from cellchem import __version__

    older = lite.main_source().replace(f"lite.require({__version__!r})", "lite.require('0.0.1')")
    assert older != lite.main_source()
    with pytest.raises(Exception, match=r"written for cellchem 0\.0\.1, but requirements.txt installed"):
        _run_main(monkeypatch, older)


def test_requirements_name_the_wheel_and_sqlite3():
    text = lite.requirements("https://stores.example.org/py/cellchem-0.1.0-py3-none-any.whl")
    assert text.splitlines() == ["https://stores.example.org/py/cellchem-0.1.0-py3-none-any.whl", "sqlite3"]


# -- classic xlwings: names without periods, COM error values ------------------------------------


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_function_is_declared_for_classic_excel(name):
    spec = sf.FUNCTIONS[name]
    classic = sf.spelled(name, "classic")
    fn = getattr(xlwings_udfs, classic)
    assert classic in xlwings_udfs.__all__
    assert fn.__name__ == classic and fn.__doc__ == spec.summary
    params = inspect.signature(fn).parameters
    assert list(params) == [a.name for a in spec.arguments]
    # xlwings reads the signature: every argument positional, optional, None when left out in the cell
    for p in params.values():
        assert p.kind is inspect.Parameter.POSITIONAL_OR_KEYWORD and p.default is None
    assert inspect.signature(fn) == inspect.signature(spec.implementation)


class _Variant:
    def __init__(self, kind, value):
        self.kind, self.value = kind, value

    def __eq__(self, other):
        return isinstance(other, _Variant) and (self.kind, self.value) == (other.kind, other.value)

    __hash__ = None


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_classic_function_gives_com_error_values(name, monkeypatch):
    # pywin32's VARIANT(VT_ERROR, code) is what COM takes for an error value; VT_ERROR is 10 (from memory)
    monkeypatch.setattr(xlwings_udfs, "VARIANT", _Variant)
    monkeypatch.setattr(xlwings_udfs, "VT_ERROR", 10)
    spec = sf.FUNCTIONS[name]
    fn = getattr(xlwings_udfs, sf.spelled(name, "classic"))
    names = [a.name for a in spec.arguments]

    def com(v):
        return _Variant(10, xlwings_udfs.COM_CODES[v.code]) if isinstance(v, CellError) else v

    for args in _inputs(spec):
        expected = spec.implementation(*args)
        if isinstance(expected, list):
            expected = [[com(c) for c in row] for row in expected]
        else:
            expected = com(expected)
        assert fn(*args) == expected, args
        assert fn(**dict(zip(names, args))) == expected, args
    with pytest.raises(TypeError):
        fn(*[None] * (len(names) + 1))
    with pytest.raises(TypeError):
        fn(no_such_argument=1)


def test_classic_error_codes_are_excels():
    # CVErr(xlErrValue) and CVErr(xlErrNA) as COM passes them (the table of xlwings' _xlwindows.py)
    assert xlwings_udfs.COM_CODES["#VALUE!"] == -2146826273
    assert xlwings_udfs.COM_CODES["#N/A"] == -2146826246


class _ClassicRecorder:
    """Stands in for xlwings: records the declarations made through func and arg."""

    def __init__(self):
        self.calls = []

    def func(self, **options):
        def mark(f):
            self.calls.append(("func", f.__name__, options))
            return f

        return mark

    def arg(self, name, **options):
        def mark(f):
            self.calls.append(("arg", f.__name__, name, options))
            return f

        return mark


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_function_is_declared_through_xlwings_decorators(name, monkeypatch):
    recorder = _ClassicRecorder()
    monkeypatch.setattr(xlwings_udfs, "xw", recorder)
    spec = sf.FUNCTIONS[name]
    xlwings_udfs.declare(spec)
    classic = sf.spelled(name, "classic")
    # arguments first, then the function, as stacked decorators apply them
    assert recorder.calls == [
        ("arg", classic, a.name, {"doc": a.description, "ndim": 2, "err_to_str": True})
        for a in reversed(spec.arguments)
    ] + [("func", classic, {"category": "cellchem"})]


_CLASSIC_ADDIN = """
import inspect, json, sys, types
# xlwings' classic (Windows, COM) decorators, imported here with the Windows modules stubbed
for module in ("pythoncom", "pywintypes", "win32com", "win32com.client"):
    sys.modules[module] = types.ModuleType(module)
sys.modules["pythoncom"].CoInitialize = lambda: None
sys.modules["win32com.client"].Dispatch = None
try:
    import xlwings, xlwings.udfs
except Exception as exc:
    print(json.dumps({"skip": repr(exc)}))
    raise SystemExit(0)
xlwings.func, xlwings.arg = xlwings.udfs.xlfunc, xlwings.udfs.xlarg
from cellchem.adapters.sheets import excel
found = {}
for attr in dir(excel):  # as xlwings' import_udfs looks for functions
    info = getattr(getattr(excel, attr), "__xlfunc__", None)
    if info is not None:
        found[attr] = {k: v for k, v in info.items() if k != "argmap"}
print(json.dumps(found))
"""


def test_the_classic_xlwings_addin_reads_the_table():
    import json
    import subprocess

    done = subprocess.run([sys.executable, "-c", _CLASSIC_ADDIN], capture_output=True, text=True, check=True)
    found = json.loads(done.stdout)
    if "skip" in found:
        pytest.skip(f"xlwings' classic decorators cannot be loaded here: {found['skip']}")
    assert set(found) == {sf.spelled(n, "classic") for n in sf.FUNCTIONS}
    for name, spec in sf.FUNCTIONS.items():
        info = found[sf.spelled(name, "classic")]
        assert (info["name"], info["category"], info["sub"]) == (
            sf.spelled(name, "classic"),
            "cellchem",
            False,
        )
        # a VBA name: letters, digits and underscores, starting with a letter, at most 255 characters
        assert re.fullmatch(r"[A-Za-z][A-Za-z0-9_]{0,254}", info["name"])
        assert info["ret"]["doc"] == spec.summary  # the description in Excel's function wizard
        assert [a["name"] for a in info["args"]] == [a.name for a in spec.arguments]
        assert [a["doc"] for a in info["args"]] == [a.description for a in spec.arguments]
        for a in info["args"]:
            assert a["options"] == {"ndim": 2, "err_to_str": True}
            assert "optional" in a and a["optional"] is None and not a["vararg"]


def test_without_xlwings_the_functions_are_plain_python():
    import subprocess

    code = (
        "import sys; sys.modules['xlwings'] = None\n"  # import xlwings then raises ImportError
        "from cellchem.adapters.sheets import excel\n"
        "assert excel.xw is None\n"
        "assert not hasattr(excel.CELLCHEM_FORMULA, '__xlfunc__')\n"
        "print(excel.CELLCHEM_FORMULA('ferric chloride'), excel.CELLCHEM_NAME.__doc__)\n"
    )
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert done.stdout.strip() == "FeCl3 " + sf.FUNCTIONS["NAME"].summary


def test_readme_lists_every_function_for_every_platform():
    import runpy

    text = (ROOT / "README.md").read_text(encoding="utf-8")
    rows = re.findall(r"^\| `CELLCHEM\.([A-Z_]+)\(.*?\| `CELLCHEM_([A-Z_]+)`", text, re.M)
    assert {excel for excel, _ in rows} == set(sf.FUNCTIONS)
    assert all(excel == other for excel, other in rows)
    # the table is the one tools/functions_table.py prints from FUNCTIONS
    table = runpy.run_path(str(ROOT / "tools" / "functions_table.py"))["rows"]()
    assert "\n".join(table) in text


# -- the demo workbook through an independent formula engine ----------------------------------

formulas = pytest.importorskip("formulas")


def _cell(v):
    import numpy as np
    import schedula as sh

    if hasattr(v, "value"):
        v = v.value
    if isinstance(v, np.ndarray):
        return [[_cell(x) for x in row] for row in v]
    if v is sh.EMPTY or (isinstance(v, str) and v == ""):
        return None
    if isinstance(v, np.generic):
        return v.item()
    return v


@pytest.fixture(scope="module")
def evaluated():
    import numpy as np
    from formulas.tokens.operand import Error

    functions = formulas.get_functions()
    for name in sf.FUNCTIONS:
        # the demo through the xlwings Lite layer: Excel shows a raised refusal as #VALUE!

        def call(*args, _name=name):
            try:
                result = lite.call(_name, *[_cell(a) for a in args])
            except lite.Refused:
                return Error.errors["#VALUE!"]
            return np.array(result, dtype=object) if isinstance(result, list) else result

        functions[sf.spelled(name)] = call
    model = formulas.ExcelModel().loads(str(ROOT / "workbooks" / "demo-worksheet-functions.xlsx")).finish()
    solution = model.calculate()
    values = {}
    for key, value in solution.items():
        ref = key.split("!")[1]
        values[ref] = value.value.tolist() if hasattr(value, "value") else value
    return values


def _one(values, ref):
    from formulas.tokens.operand import XlError

    v = values[ref]
    while isinstance(v, list):
        v = v[0]
    return str(v) if isinstance(v, XlError) else v


def test_demo_cells_against_the_core(evaluated):
    check_demo_values(lambda ref: _one(evaluated, ref))


def test_demo_ranges_spill(evaluated):
    masses = evaluated["E5:E9"]
    assert [r[0] for r in masses] == [
        pytest.approx(float(molar_mass(f))) for f in ("CuSO4·5H2O", "NaCl", "FeCl3", "KMnO4", "NaCl2")
    ]
    assert evaluated["B31:D32"] == [["Al3+", 2.0, 3.0], ["SO4 2-", 3.0, -2.0]]
    cations, anions, error, ok = evaluated["C34:F34"][0]
    # Ca2+ 2.0 + Mg2+ 1.0 = 3.0 meq/L; HCO3- 2.5 + Cl- 0.45 = 2.95 (worked by hand)
    assert (cations, anions) == (pytest.approx(3.0), pytest.approx(2.95)) and ok is True
    assert error == pytest.approx(100 * 0.05 / 5.95)


def test_the_excel_lite_command_writes_the_three_files(tmp_path, capsys):
    from cellchem import __version__
    from cellchem.cli import main

    url = f"https://stores.example.org/py/cellchem-{__version__}-py3-none-any.whl"
    out = tmp_path / "lite"
    assert main(["excel-lite", "--wheel-url", url, "-o", str(out)]) == 0
    assert (out / "main.py").read_text(encoding="utf-8") == lite.main_source()
    assert (out / "requirements.txt").read_text(encoding="utf-8") == f"{url}\nsqlite3\n"
    assert "Access-Control-Allow-Origin" in (out / "HOW-TO.txt").read_text(encoding="utf-8")
    # never over what is there; an address Excel's runtime cannot read, or of another version, refused
    assert main(["excel-lite", "--wheel-url", url, "-o", str(out)]) == 2
    assert main(["excel-lite", "--wheel-url", r"\\server\share\cellchem.whl", "-o", str(tmp_path / "b")]) == 2
    other = url.replace(__version__, "9.9.9")
    assert main(["excel-lite", "--wheel-url", other, "-o", str(tmp_path / "c")]) == 2
    assert not (tmp_path / "b").exists() and not (tmp_path / "c").exists()
    assert main(["excel-lite", "-o", str(tmp_path / "d")]) == 0  # by name, from an index
    assert (tmp_path / "d" / "requirements.txt").read_text().splitlines()[0] == f"cellchem=={__version__}"
    err = capsys.readouterr().err
    for said in ("already holds main.py", "reads web addresses only", "expected it to end in"):
        assert said in err
