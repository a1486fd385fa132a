"""Conductivity estimates against conductivity standards, handbook tables and
phreeqpython.

Sources of check values:
- KCl standards: 0.001 mol/L 147 uS/cm, 0.01 mol/L 1413 uS/cm, 0.1 mol/L
  12.88 mS/cm at 25 C; 0.01 mol/L at 15/18/20 C 1147/1225/1278 uS/cm (common
  practice: the figures printed on KCl conductivity standards; see also IUPAC,
  Pure Appl. Chem. 73 (2001) 1783).
- HD = W. J. Hamer and H. J. DeWane, NSRDS-NBS 33 (1970), molar conductivity of
  HCl at 25 C, as tabulated in the CRC Handbook (read from a stored copy).
- RS = R. A. Robinson and R. H. Stokes, Electrolyte Solutions, 2nd ed. 1959,
  Appendix 6.1, molar conductivities of NaCl and KCl at 25 C (from memory).
- CRC limiting ionic conductivities (the cellchem data table, read where marked).
"""

import pytest

from cellchem import CellchemError, conductivity
from cellchem.activity import RangeWarning


@pytest.mark.parametrize("c, standard, tolerance", [(0.001, 147.0, 0.005), (0.01, 1413.0, 0.005)])
def test_kcl_standards(c, standard, tolerance):
    assert conductivity([("KCl", c)]) == pytest.approx(standard, rel=tolerance)


def test_kcl_01_molar_standard_with_warning():
    with pytest.warns(RangeWarning):
        value = conductivity([("KCl", 0.1)], outside_range="warn")
    assert value == pytest.approx(12880, rel=0.02)
    with pytest.raises(CellchemError, match=r"0\.02"):
        conductivity([("KCl", 0.1)])


@pytest.mark.parametrize("t, standard", [(15, 1147), (18, 1225), (20, 1278), (25, 1413)])
def test_kcl_001_molar_over_temperature(t, standard):
    assert conductivity([("KCl", 0.01)], t) == pytest.approx(standard, rel=0.01)


# Molar conductivity (S cm2/mol) = kappa(uS/cm) / (1000 c)
@pytest.mark.parametrize(
    "salt, c, molar, source, tolerance",
    [
        ("HCl", 0.001, 421.2, "HD", 0.003),
        ("HCl", 0.005, 415.7, "HD", 0.003),
        ("HCl", 0.01, 411.9, "HD", 0.005),
        ("NaCl", 0.001, 123.74, "RS", 0.003),
        ("NaCl", 0.005, 120.65, "RS", 0.004),
        ("NaCl", 0.01, 118.51, "RS", 0.005),
        ("KCl", 0.005, 143.55, "RS", 0.004),
        ("KCl", 0.01, 141.27, "RS", 0.005),
        ("KCl", 0.02, 138.34, "RS", 0.005),
        ("NaCl", 0.02, 115.76, "RS", 0.005),
    ],
)
def test_molar_conductivity_against_tables(salt, c, molar, source, tolerance):
    assert source in ("HD", "RS")
    assert conductivity([(salt, c)]) / (1000 * c) == pytest.approx(molar, rel=tolerance)


@pytest.mark.parametrize("c, molar", [(0.05, 398.9), (0.1, 391.1)])  # HD
def test_hcl_above_the_trusted_range(c, molar):
    with pytest.warns(RangeWarning):
        value = conductivity([("HCl", c)], outside_range="warn")
    assert value / (1000 * c) == pytest.approx(molar, rel=0.015)


def test_kcl_standard_made_up_by_mass():
    # 0.7456 g KCl per litre is the 0.01 mol/L standard (common practice): it sits at I = 0.0100016
    assert conductivity([("KCl", "0.7456 g/L")]) == pytest.approx(1413, rel=0.005)
    assert conductivity([("KCl", "10 mmol/L")]) == conductivity([("KCl", 0.01)])


def test_limiting_law_at_infinite_dilution():
    # CRC (read): lambda(K+) 73.48; lambda(Cl-) 76.31 (from memory) -> 149.79 S cm2/mol
    c = 1e-7
    assert conductivity([("KCl", c)]) / (1000 * c) == pytest.approx(149.79, rel=1e-3)


def test_pairing_salts_are_limited_and_flagged():
    with pytest.raises(CellchemError, match="ion pairs"):
        conductivity([("MgSO4", 0.001)])
    value = conductivity([("MgSO4", 0.0002)])
    assert any("ion pairs" in n for n in value.notes)


def test_refusals():
    with pytest.raises(CellchemError, match="15-35"):
        conductivity([("KCl", 0.01)], 50)
    with pytest.raises(CellchemError, match="weak acid"):
        conductivity([("CH3COOH", 0.001)])
    with pytest.raises(CellchemError, match="molar"):
        conductivity([("KCl", 0.001)], unit="mol/kg")
    with pytest.raises(CellchemError, match="no limiting ionic conductivity"):
        conductivity([("[Cu(NH3)4]SO4", 0.0001)])


phreeqpython = pytest.importorskip("phreeqpython")


@pytest.fixture(scope="module")
def pp():
    return phreeqpython.PhreeqPython()


# phreeqpython's specific conductance (PHREEQC's own model from diffusion
# coefficients and activities) for salts at I <= 0.015: within 1.5 %.
@pytest.mark.filterwarnings("ignore::cellchem.activity.RangeWarning")
@pytest.mark.parametrize(
    "salt, mmol",
    [("KCl", 10), ("NaCl", 10), ("CaCl2", 1), ("CaCl2", 5), ("Na2SO4", 1), ("KNO3", 5), ("MgCl2", 2)],
)
def test_against_phreeqpython(pp, salt, mmol):
    s = pp.add_solution_simple({salt: mmol})
    try:
        ours = conductivity([(salt, mmol / 1000)], outside_range="warn")
        assert ours == pytest.approx(s.sc, rel=0.015)
    finally:
        s.forget()


def test_mixture_against_phreeqpython(pp):
    s = pp.add_solution_simple({"NaCl": 1.0, "CaCl2": 0.5, "NaHCO3": 2.0})
    try:
        ours = conductivity({"NaCl": "1 mmol/L", "CaCl2": "0.5 mmol/L", "NaHCO3": "2 mmol/L"})
        assert ours == pytest.approx(s.sc, rel=0.02)
        assert any("mixture" in n for n in ours.notes)
    finally:
        s.forget()
