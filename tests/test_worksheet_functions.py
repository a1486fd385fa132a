"""The CC_ worksheet functions, called as xlwings calls them, and the demo
workbook evaluated by an independent formula engine (the `formulas` package)
with the functions registered as custom functions. Expected values come from
the core's own functions (the layer must give what the core gives; the core's
numbers are tested against their sources elsewhere); the shape and conversion
rules are those of README's "Worksheet functions" section."""

from __future__ import annotations

import inspect
import re
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
from cellchem.adapters.sheets.cells import MARK, full_message

ROOT = Path(__file__).resolve().parents[1]


# -- as xlwings calls them: ndim=2 lists, None for empty, floats, error text -------------------


def test_single_cell_and_range_shapes():
    assert sf.cc_molarmass("NaCl") == pytest.approx(float(molar_mass("NaCl")))
    assert sf.cc_molarmass([["NaCl"]]) == [[pytest.approx(float(molar_mass("NaCl")))]]
    column = sf.cc_molarmass([["NaCl"], ["KCl"], [None]])
    assert len(column) == 3 and all(len(r) == 1 for r in column)
    assert column[2] == [None]  # empty in, empty out
    row = sf.cc_molarmass([["NaCl", "KCl", "CaCl2"]])
    assert len(row) == 1 and len(row[0]) == 3
    block = sf.cc_molarmass([["NaCl", "KCl"], ["MgO", None]])
    assert block[1][0] == pytest.approx(float(molar_mass("MgO")))


def test_numbers_stay_numbers_and_errors_pass_through():
    out = sf.cc_molarmass([["NaCl"], ["#N/A"], [-2146826281], ["Xx"]])
    assert isinstance(out[0][0], float)
    assert out[1][0] == "#N/A"
    assert out[2][0] == "#DIV/0!"  # the COM code of an error cell
    assert out[3][0].startswith(MARK)


def test_refusals_are_short_and_the_full_text_is_kept():
    short = sf.cc_formula("iron chloride")
    assert short.startswith(MARK) and len(short) <= len(MARK) + 80
    full = sf.cc_fullmessage(short)
    assert "leaves the charge of iron open" in full and len(full) > len(short) - len(MARK)


def test_mixed_types():
    assert sf.cc_casvalid(7732185.0) is False  # a number is read as its digits: no hyphens, not valid
    assert sf.cc_casvalid("7732-18-5") is True
    assert sf.cc_oxstate("KMnO4", "Mn") == 7.0
    assert sf.cc_balanced(True).startswith(MARK)  # a boolean is not a formula
    # an organic salt with no catalog anion is neither balanced nor not: refused with the reason
    assert sf.cc_balanced("C9H19N2NaO4S").startswith(MARK)
    assert sf.cc_balanced("C2H3NaO2") is True  # sodium acetate in Hill order (common practice)


def test_broadcast_and_shape_mismatch():
    out = sf.cc_massfraction([["CuSO4", "CuCl2"]], "Cu")
    assert out[0][1] == pytest.approx(mass_fraction("CuCl2", "Cu"))
    bad = sf.cc_salt([["Na+", "K+"]], [["Cl-"], ["Br-"]])
    assert bad.startswith(MARK) and "shapes" in bad


def test_checkline():
    assert sf.cc_checkline("Sodium chloride", "NaCl", 58.44, "7647-14-5") == ""
    # the name and the formula disagree and nothing else on the line settles which is wrong
    assert sf.cc_checkline("Sodium sulfite", "Na2SO4").startswith("error: the cells disagree")
    # with the molar mass of sodium sulfate (142.04, CRC, from memory) the name is the odd one
    assert "so the name is the cell to check" in sf.cc_checkline("Sodium sulfite", "Na2SO4", 142.04)
    assert sf.cc_checkline(None, None) is None
    assert sf.cc_checkline(None, "NaCl2").startswith("error:")


def test_solution_functions_take_ranges():
    assert sf.cc_ionicstrength([["MgCl2"], ["NaCl"]], [[0.1], ["10 mmol/L"]]) == pytest.approx(
        float(ionic_strength([("MgCl2", 0.1), ("NaCl", 0.01)]))
    )
    assert sf.cc_ionicstrength([["NaCl"]], [[0.1], [0.2]]).startswith(MARK)
    assert sf.cc_conductivity("KCl", 0.01) == pytest.approx(float(conductivity([("KCl", 0.01)])))
    assert sf.cc_ions("Al2(SO4)3") == [["Al3+", 2.0, 3.0], ["SO4 2-", 3.0, -2.0]]
    assert sf.cc_ions([["NaCl", "KCl"]]).startswith(MARK)
    balance = sf.cc_ionbalance([["Ca2+"], ["HCO3-"]], [[2.0], [2.0]])
    assert balance == [[2.0, 2.0, 0.0, True]]


def test_grams_and_convert():
    assert sf.cc_grams("CuSO4", 0.1, "250 mL", None, "CuSO4.5H2O") == pytest.approx(
        mass_for_solution("CuSO4", 0.1, "250 mL", shelf_form="CuSO4·5H2O").mass
    )
    assert sf.cc_convert(37, "% w/w", "mol/L", "HCl", 1.18) == pytest.approx(
        float(convert_concentration(37, "% w/w", "mol/L", "HCl", density=1.18))
    )
    assert sf.cc_grams("NaCl", 0.1, 1, 99).startswith(MARK)  # a purity over 1 is refused, not guessed


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
    grams = sf.FUNCTIONS["CC_GRAMS"]
    assert _example_arguments(grams) == ["CuSO4", 0.1, "250 mL", None, "CuSO4.5H2O"]
    assert _example_arguments(sf.FUNCTIONS["CC_IONBALANCE"]) == [None, None, "mg/L"]


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
def test_each_function_is_declared_for_excel(name):
    spec = sf.FUNCTIONS[name]
    fn = getattr(xlwings_udfs, name)
    assert name in xlwings_udfs.__all__
    assert fn.__name__ == name and fn.__doc__ == spec.summary
    params = inspect.signature(fn).parameters
    assert list(params) == [a.name for a in spec.arguments]
    # xlwings reads the signature: every argument positional, optional, None when left out in the cell
    for p in params.values():
        assert p.kind is inspect.Parameter.POSITIONAL_OR_KEYWORD and p.default is None
    # the signature Excel sees is the one the table's function is written with
    assert inspect.signature(fn) == inspect.signature(spec.implementation)
    for a in spec.arguments:
        assert a.description and len(a.description) < 120
    assert spec.example.startswith("=" + name)


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_excel_function_gives_what_the_table_gives(name):
    spec = sf.FUNCTIONS[name]
    fn = getattr(xlwings_udfs, name)
    names = [a.name for a in spec.arguments]
    for args in _inputs(spec):
        expected = spec.implementation(*args)
        assert fn(*args) == expected, args
        assert fn(**dict(zip(names, args))) == expected, args
    with pytest.raises(TypeError):
        fn(*[None] * (len(names) + 1))
    with pytest.raises(TypeError):
        fn(no_such_argument=1)


class _Recorder:
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
    recorder = _Recorder()
    monkeypatch.setattr(xlwings_udfs, "xw", recorder)
    spec = sf.FUNCTIONS[name]
    xlwings_udfs.declare(spec)
    # arguments first, then the function, as stacked decorators apply them
    assert recorder.calls == [
        ("arg", name, a.name, {"doc": a.description, "ndim": 2, "err_to_str": True})
        for a in reversed(spec.arguments)
    ] + [("func", name, {"category": "cellchem"})]


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
    import sys

    run = subprocess.run([sys.executable, "-c", _CLASSIC_ADDIN], capture_output=True, text=True, check=True)
    found = json.loads(run.stdout)
    if "skip" in found:
        pytest.skip(f"xlwings' classic decorators cannot be loaded here: {found['skip']}")
    assert set(found) == set(sf.FUNCTIONS)
    for name, spec in sf.FUNCTIONS.items():
        info = found[name]
        assert (info["name"], info["category"], info["sub"]) == (name, "cellchem", False)
        assert info["ret"]["doc"] == spec.summary  # the description in Excel's function wizard
        assert [a["name"] for a in info["args"]] == [a.name for a in spec.arguments]
        assert [a["doc"] for a in info["args"]] == [a.description for a in spec.arguments]
        for a in info["args"]:
            assert a["options"] == {"ndim": 2, "err_to_str": True}
            assert "optional" in a and a["optional"] is None and not a["vararg"]


def test_without_xlwings_the_functions_are_plain_python():
    import subprocess
    import sys

    code = (
        "import sys; sys.modules['xlwings'] = None\n"  # import xlwings then raises ImportError
        "from cellchem.adapters.sheets import excel\n"
        "assert excel.xw is None\n"
        "assert not hasattr(excel.CC_FORMULA, '__xlfunc__')\n"
        "print(excel.CC_FORMULA('ferric chloride'), excel.CC_NAME.__doc__)\n"
    )
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert run.stdout.strip() == "FeCl3 " + sf.FUNCTIONS["CC_NAME"].summary


def test_readme_lists_every_function():
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    listed = set(re.findall(r"^\| `(CC_[A-Z]+)\(", text, re.M))
    assert listed == set(sf.FUNCTIONS)


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

    functions = formulas.get_functions()
    for name in sf.FUNCTIONS:
        udf = getattr(xlwings_udfs, name)  # the demo through the Excel layer

        def run(*args, _impl=udf):
            result = _impl(*[_cell(a) for a in args])
            return np.array(result, dtype=object) if isinstance(result, list) else result

        functions[name] = run
    model = formulas.ExcelModel().loads(str(ROOT / "workbooks" / "demo-worksheet-functions.xlsx")).finish()
    solution = model.calculate()
    values = {}
    for key, value in solution.items():
        ref = key.split("!")[1]
        values[ref] = value.value.tolist() if hasattr(value, "value") else value
    return values


def _one(values, ref):
    v = values[ref]
    while isinstance(v, list):
        v = v[0]
    return v


def test_demo_cells_against_the_core(evaluated):
    check_demo_values(lambda ref: _one(evaluated, ref))


def test_demo_ranges_spill(evaluated):
    masses = evaluated["E5:E9"]
    assert [r[0] for r in masses] == [
        pytest.approx(float(molar_mass(f))) for f in ("CuSO4·5H2O", "NaCl", "FeCl3", "KMnO4", "NaCl2")
    ]
    assert evaluated["B30:D31"] == [["Al3+", 2.0, 3.0], ["SO4 2-", 3.0, -2.0]]
    cations, anions, error, ok = evaluated["C33:F33"][0]
    # Ca2+ 2.0 + Mg2+ 1.0 = 3.0 meq/L; HCO3- 2.5 + Cl- 0.45 = 2.95 (worked by hand)
    assert (cations, anions) == (pytest.approx(3.0), pytest.approx(2.95)) and ok is True
    assert error == pytest.approx(100 * 0.05 / 5.95)


def test_full_message_function_matches_the_layer():
    short = sf.cc_molarmass("NaCl2Xx")
    assert full_message(short) == "unknown element symbol 'Xx' at position 6 in 'NaCl2Xx'"
