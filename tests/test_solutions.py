"""ions_of and ionic_strength: dissociation of strong electrolytes, and
I = 1/2 sum(c_i z_i^2) (G. N. Lewis and M. Randall, J. Am. Chem. Soc. 43 (1921)
1112; any physical chemistry text). Check values are worked by hand from the
definition unless another source is named; phreeqpython (the PHREEQC code) is
the outside oracle for ionic strength."""

import pytest

from cellchem import CellchemError, ionic_strength, ions_of


def ions(formula):
    return [(c.ion.label, c.count) for c in ions_of(formula).ions]


# The issue's own examples; the ions are those every general chemistry text gives.
@pytest.mark.parametrize(
    "formula, expected, water",
    [
        ("Al2(SO4)3", [("Al3+", 2), ("SO4 2-", 3)], 0),
        ("CuSO4·5H2O", [("Cu2+", 1), ("SO4 2-", 1)], 5),
        ("NaHCO3", [("Na+", 1), ("HCO3-", 1)], 0),
        ("KAl(SO4)2·12H2O", [("K+", 1), ("Al3+", 1), ("SO4 2-", 2)], 12),
        ("(NH4)2Fe(SO4)2·6H2O", [("NH4+", 2), ("Fe2+", 1), ("SO4 2-", 2)], 6),
        ("K4[Fe(CN)6]", [("K+", 4), ("[Fe(CN)6]4-", 1)], 0),
        ("[Cu(NH3)4]SO4", [("[Cu(NH3)4]2+", 1), ("SO4 2-", 1)], 0),
        ("Hg2Cl2", [("Hg2 2+", 1), ("Cl-", 2)], 0),
        ("CH3COONa", [("Na+", 1), ("CH3COO-", 1)], 0),
        ("Ca(OH)2", [("Ca2+", 1), ("OH-", 2)], 0),
        ("HCl", [("H+", 1), ("Cl-", 1)], 0),
    ],
)
def test_ions_of_strong_electrolytes(formula, expected, water):
    d = ions_of(formula)
    assert ions(formula) == expected
    assert d.water == water
    assert d.fully_dissociated


def test_ions_of_reads_a_name():
    assert ions("copper(II) sulfate pentahydrate") == [("Cu2+", 1), ("SO4 2-", 1)]


@pytest.mark.parametrize(
    "formula, behaviour",
    [
        ("CH3COOH", "weak acid"),
        ("H3PO4", "weak acid"),
        ("NH3", "weak base"),
        ("NH4OH", "weak base"),
        ("HNO3", "strong acid"),
        ("H2SO4", "strong acid"),
        ("NaOH", "strong base"),
        ("C6H12O6", "non-electrolyte"),
        ("SO4 2-", "ion"),
    ],
)
def test_behaviour(formula, behaviour):
    # strong and weak acids and bases: common practice (the short list of strong
    # acids and bases every general chemistry text gives)
    assert ions_of(formula).behaviour == behaviour


def test_weak_electrolytes_say_their_equilibria_are_not_modelled():
    for formula in ("CH3COOH", "NH3"):
        d = ions_of(formula)
        assert not d.fully_dissociated
        assert any("not modelled" in n for n in d.notes)


def test_complex_and_hydrogen_anions_carry_a_note():
    assert any("complex equilibria are not modelled" in n for n in ions_of("K3[Fe(CN)6]").notes)
    assert any("acid-base equilibrium" in n for n in ions_of("NaH2PO4").notes)


@pytest.mark.parametrize(
    "formula, words",
    [
        ("Na2O", "oxide"),
        ("NaH", "hydride"),
        ("Mg(OH)2", "sparingly soluble"),
        ("CO2", "molecular"),
        ("Cl2", "element"),
        ("H2O", "solvent"),
        ("NaCl2", "not balanced"),
    ],
)
def test_refused_solutes(formula, words):
    with pytest.raises(CellchemError, match=words):
        ions_of(formula)


def test_equivalents_per_formula_unit():
    assert ions_of("CaCl2").equivalents == 2
    assert ions_of("Al2(SO4)3").equivalents == 6
    assert ions_of("SO4 2-").equivalents == 2


# Ionic strength, worked from the definition: 1:1 salt I = c, 2:1 salt I = 3c,
# 2:2 salt I = 4c, 3:2 salt (Al2(SO4)3) I = 15c.
@pytest.mark.parametrize(
    "formula, factor",
    [
        ("NaCl", 1),
        ("MgCl2", 3),
        ("Na2SO4", 3),
        ("MgSO4", 4),
        ("Al2(SO4)3", 15),
        ("LaCl3", 6),
        ("K4[Fe(CN)6]", 10),
    ],
)
def test_ionic_strength_of_single_salts(formula, factor):
    assert ionic_strength([(formula, 0.01)]) == pytest.approx(0.01 * factor, rel=1e-12)


def test_ionic_strength_units_and_mixtures():
    i = ionic_strength({"NaCl": "10 mmol/L", "K2SO4": "5 mmol/L"})
    assert i == pytest.approx(0.010 + 0.015)
    assert i.unit == "mol/L"
    molal = ionic_strength([("CaCl2", 0.002)], unit="mol/kg")
    assert molal.unit == "mol/kg" and molal == pytest.approx(0.006)
    with pytest.raises(CellchemError, match="cannot be mixed"):
        ionic_strength([("NaCl", "0.01 mol/L"), ("KCl", "0.01 mol/kg")])


def test_ionic_strength_of_normal_saline():
    # 0.9 % w/v NaCl is 154 mmol/L (common practice: the pharmacopoeial figure
    # for sodium chloride 0.9 % infusion, from memory)
    assert ionic_strength([("NaCl", "0.9 % w/v")]) == pytest.approx(0.154, abs=0.0005)


def test_ionic_strength_refuses_weak_electrolytes_unless_told():
    with pytest.raises(CellchemError, match="weak acid"):
        ionic_strength([("CH3COOH", 0.1)])
    i = ionic_strength([("CH3COOH", 0.1), ("NaCl", 0.01)], weak_electrolytes="neutral")
    assert i == pytest.approx(0.01)
    assert any("undissociated" in n for n in i.notes)


def test_ionic_strength_from_equivalents():
    # 2 meq/L of Ca2+ is 1 mmol/L: I = 1/2 (0.001 * 4) = 0.002
    assert ionic_strength([("Ca2+", "2 meq/L")]) == pytest.approx(0.002)


phreeqpython = pytest.importorskip("phreeqpython")


@pytest.fixture(scope="module")
def pp():
    return phreeqpython.PhreeqPython()


# phreeqpython (PHREEQC with phreeqc.dat) as the oracle. It speciates, so
# salts that form ion pairs (MgSO4, CaSO4) have a lower ionic strength there;
# for salts of singly charged ions the two agree to 0.1 %.
@pytest.mark.parametrize(
    "salt, mmol, tolerance",
    [("NaCl", 10, 0.001), ("KCl", 5, 0.001), ("KNO3", 2, 0.001), ("CaCl2", 1, 0.002), ("Na2SO4", 1, 0.01)],
)
def test_ionic_strength_against_phreeqpython(pp, salt, mmol, tolerance):
    s = pp.add_solution_simple({salt: mmol})  # mmol per kg of water
    try:
        ours = ionic_strength([(salt, mmol / 1000)], unit="mol/kg")
        assert ours == pytest.approx(s.I, rel=tolerance)
    finally:
        s.forget()


def test_ion_pairing_is_what_separates_us_from_phreeqpython_for_mgso4(pp):
    # MgSO4 pairs into MgSO4(aq) even at 10 mmol/kg: PHREEQC's I is lower than
    # the full-dissociation figure, which is the stated limit of cellchem's model.
    s = pp.add_solution_simple({"MgSO4": 10})
    try:
        ours = ionic_strength([("MgSO4", 0.010)], unit="mol/kg")
        assert s.I < ours
        assert s.species_molalities.get("MgSO4", 0) > 0
    finally:
        s.forget()
