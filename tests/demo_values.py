"""The values the worksheet-functions demo must show, from the core: shared
by the Excel-layer test (an independent formula engine evaluates the .xlsx)
and the LibreOffice test (Calc evaluates the .ods twin)."""

import pytest

from cellchem import (
    activity_coefficient,
    conductivity,
    convert_concentration,
    formula_from_name,
    ionic_strength,
    mass_for_solution,
    mass_fraction,
    molar_mass,
    name_from_formula,
    substance,
)


def check_demo_values(cell):
    """``cell(ref)`` gives what the demo shows at ref. Calc has no boolean
    value: TRUE and FALSE show as 1 and 0, which compare equal."""
    assert cell("B11") == formula_from_name("Copper(II) sulfate pentahydrate")
    assert cell("B12") == name_from_formula("NaCl")
    assert cell("B13") == name_from_formula("FeCl3", legacy=True)
    assert cell("B14") == "Al2(SO4)3"
    assert cell("B15") == pytest.approx(float(molar_mass("CuSO4·5H2O")))
    assert cell("B16") == pytest.approx(mass_fraction("CuSO4·5H2O", "Cu"))
    assert cell("B17") == -2
    assert cell("B18") == 7
    assert cell("B19") == False  # noqa: E712 (Calc shows FALSE as 0)
    # the name, the CAS RN and the molar mass agree on NaCl; the formula cell NaCl2 is blamed
    assert cell("B20").startswith("error: the name 'Sodium chloride', CAS 7647-14-5")
    assert "so the formula is the cell to check" in cell("B20")
    assert cell("B21") == True  # noqa: E712 (Calc shows TRUE as 1)
    assert cell("B22") == substance("7758-99-8").formula
    assert cell("B23") == pytest.approx(float(ionic_strength([("MgCl2", 0.1)])))
    assert cell("B24") == pytest.approx(float(activity_coefficient("Ca2+", 0.01, "extended")))
    assert cell("B25") == pytest.approx(float(conductivity([("KCl", 0.01)])))
    assert cell("B26") == pytest.approx(
        mass_for_solution("CuSO4", 0.1, "250 mL", shelf_form="CuSO4·5H2O").mass
    )
    assert cell("B27") == pytest.approx(
        float(convert_concentration(37, "% w/w", "mol/L", "HCl", density=1.18))
    )
    # a refusal is the spreadsheet's own error value, and CELLCHEM.WHY gives the message
    assert cell("B28") == "#VALUE!"
    assert cell("B29") == "unknown element symbol 'Xx' at position 6 in 'NaCl2Xx'"
