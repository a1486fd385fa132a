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


# -- the Excel declarations ----------------------------------------------------------------------


@pytest.mark.parametrize("name", sorted(sf.FUNCTIONS))
def test_each_function_is_declared_for_excel(name):
    spec = sf.FUNCTIONS[name]
    fn = getattr(xlwings_udfs, name)
    params = list(inspect.signature(fn).parameters)
    assert params == [a.name for a in spec.arguments]
    assert fn.__doc__ == spec.summary
    for a in spec.arguments:
        assert a.description and len(a.description) < 120
    assert spec.example.startswith("=" + name)


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
    for name, spec in sf.FUNCTIONS.items():

        def run(*args, _impl=spec.implementation):
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
