"""ions_of and ionic_strength: dissociation of strong electrolytes, and
I = 1/2 sum(c_i z_i^2) (G. N. Lewis and M. Randall, J. Am. Chem. Soc. 43 (1921)
1112; any physical chemistry text). Check values are worked by hand from the
definition unless another source is named; phreeqpython (the PHREEQC code) is
the outside oracle for ionic strength."""

import re
import warnings

import pytest

from cellchem import CellchemError, ionic_strength, ions_of
from cellchem.solutions import RangeWarning, solubility


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


# ---------------------------------------------------------------------------
# Solubility. Check values: Ksp at 25 C from the CRC Handbook table "Solubility
# Product Constants" and mass percent of the saturated solution at 25 C from its
# table "Aqueous Solubility of Inorganic Compounds at Various Temperatures" (both
# from memory), turned into solubilities by hand: s = (Ksp / (a^a b^b))^(1/(a+b))
# for a salt MaXb; m = w / ((100 - w) M) * 1000 for a mass percent w.
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "formula, expected",
    [
        ("AgCl", 1.330e-5),  # Ksp 1.77e-10: s = sqrt(Ksp)
        ("BaSO4", 1.039e-5),  # Ksp 1.08e-10
        ("Ag2CrO4", 6.542e-5),  # Ksp 1.12e-12: s = (Ksp / 4)^(1/3)
        ("PbI2", 1.348e-3),  # Ksp 9.8e-9
        ("Hg2Cl2", 7.097e-7),  # Ksp 1.43e-18: Hg2 2+ + 2 Cl-
        ("Ca(OH)2", 1.079e-2),  # Ksp 5.02e-6
        ("CaSO4·2H2O", 5.604e-3),  # Ksp of gypsum 3.14e-5
    ],
)
def test_solubility_from_ksp(formula, expected):
    s = solubility(formula)
    assert s == pytest.approx(expected, rel=1e-3)
    assert s.unit == "mol/kg"
    assert any("Ksp" in n and "CRC Handbook" in n for n in s.notes)
    assert solubility(formula, "mmol/L") == pytest.approx(expected * 1000, rel=1e-3)


@pytest.mark.parametrize(
    "formula, expected",
    [
        ("NaCl", 6.154),  # 26.45 % (58.44 g/mol): 26.45 / 73.55 / 58.44 * 1000
        ("KNO3", 3.791),  # 27.7 % (101.10 g/mol)
        ("CuSO4·5H2O", 1.375),  # 18.0 % of anhydrous CuSO4 (159.60 g/mol), solid the pentahydrate
    ],
)
def test_solubility_of_soluble_salts(formula, expected):
    s = solubility(formula)
    assert s == pytest.approx(expected, rel=2e-3)
    assert any("per 100 g of solution" in n and "CRC Handbook" in n for n in s.notes)
    with pytest.raises(CellchemError, match="density"):
        solubility(formula, "mol/L")
    # with the saturated solution's density: 26.45 % NaCl at 1.197 g/mL (CRC, from memory) is 5.42 mol/L
    if formula == "NaCl":
        assert solubility(formula, "mol/L", density=1.197) == pytest.approx(5.418, rel=2e-3)


@pytest.mark.parametrize(
    "formula, words",
    [
        ("C6H12O6", "no solubility"),  # not in the table
        ("KBrO3", "no solubility"),
        ("Fe(OH)3", "set by the pH"),  # its own OH- would be 3e-10 mol/L, below that of water
        ("Al(OH)3", "set by the pH"),
    ],
)
def test_solubility_refusals(formula, words):
    with pytest.raises(CellchemError, match=words):
        solubility(formula)


# Far above what dissolves at 25 C (the salts of a store that do not dissolve): refused,
# with the limit and the source in the message; with outside_range='warn' given with a
# RangeWarning and a note.
@pytest.mark.parametrize("formula", ["AgCl", "BaSO4", "CaCO3", "PbI2", "Hg2Cl2", "CaSO4", "Ag2SO4", "PbCl2"])
def test_ionic_strength_refuses_above_solubility(formula):
    with pytest.raises(CellchemError, match=r"above what dissolves in water at 25 C: .*Ksp .*CRC Handbook"):
        ionic_strength([(formula, 0.1)])
    with pytest.warns(RangeWarning, match="above what dissolves"):
        i = ionic_strength([(formula, 0.1)], outside_range="warn")
    assert any("above what dissolves" in n for n in i.notes)
    with pytest.raises(CellchemError, match="outside_range"):
        ionic_strength([(formula, 0.1)], outside_range="ignore")


@pytest.mark.parametrize(
    "solutes",
    [
        [("CaSO4", 0.015)],  # gypsum dissolves to 0.0151 mol/kg (CRC aqueous table, from memory)
        [("Ca(OH)2", 0.02)],  # limewater: 0.020 mol/kg (PHREEQC pitzer.dat, portlandite)
        [("PbCl2", 0.03)],  # about 0.039 mol/kg (1.08 g per 100 g water, CRC, from memory)
        [("AgCl", 1e-5)],  # 1.9 mg/L (common practice)
        [("NaCl", 6.0)],  # below 6.15 mol/kg
        [("NaCl", "6.1 mol/kg")],
        [("CuSO4·5H2O", 1.0)],  # below 1.375 mol/kg
        # artificial sea water (common practice): undersaturated in gypsum although
        # Ca2+ x SO4 2- is 9 times the Ksp of gypsum, for its ionic strength of 0.7
        [("NaCl", 0.42), ("MgSO4", 0.0282), ("CaCl2", 0.0103), ("KCl", 0.0102), ("MgCl2", 0.0266)],
    ],
)
def test_what_dissolves_is_not_refused(solutes):
    with warnings.catch_warnings():
        warnings.simplefilter("error", RangeWarning)
        assert ionic_strength(solutes) > 0
        ionic_strength(solutes, outside_range="warn")


@pytest.mark.parametrize(
    "solutes, words",
    [
        ([("NaCl", "6.5 mol/kg")], r"NaCl at 6\.5 mol/kg is above .* 6\.15 mol/kg"),  # 26.45 %, CRC
        ([("NaCl", 6.5)], "holds less than a kilogram of water"),  # mol/L against the molal figure
        ([("K2Cr2O7", 1.0)], "K2Cr2O7"),  # 13.1 %: 0.51 mol/kg
        ([("NaCl", 4.0), ("NaCl", 2.5)], "NaCl at 6.5"),  # one salt given twice is added up
    ],
)
def test_soluble_salts_above_saturation(solutes, words):
    with pytest.raises(CellchemError, match=words):
        ionic_strength(solutes)


# Precipitation between solutes and ions given singly: the ion product against Ksp.
@pytest.mark.parametrize(
    "solutes, salt",
    [
        ([("AgNO3", 0.1), ("NaCl", 0.1)], "AgCl"),
        ([("Ag+", 0.1), ("Cl-", 0.1)], "AgCl"),
        ([("BaCl2", 0.01), ("Na2SO4", 0.01)], "BaSO4"),
        ([("CaCl2", 0.01), ("Na2CO3", 0.01)], "CaCO3"),
        ([("Pb(NO3)2", 0.1), ("KI", 0.2)], "PbI2"),
        ([("MgCl2", 0.01), ("NaOH", 0.01)], "Mg(OH)2"),
    ],
)
def test_precipitation_between_solutes(solutes, salt):
    with pytest.raises(CellchemError, match=rf"{re.escape(salt)} would precipitate: .*solubility product"):
        ionic_strength(solutes)


def test_ionic_strength_of_a_clear_mixture_with_common_ions():
    # 0.1 mol/L AgNO3 with 1e-10 mol/L Cl-: ion product 1e-11, below Ksp(AgCl) 1.77e-10
    assert ionic_strength([("AgNO3", 0.1), ("NaCl", 1e-10)]) == pytest.approx(0.1, rel=1e-6)


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


# The margin of 3 on the Ksp solubility, against PHREEQC's saturation of pure water with
# the mineral (phreeqc.dat: calcite, strontianite, witherite, gypsum, celestite, barite,
# fluorite; pitzer.dat: portlandite, brucite): the real solubility lies between 0.8 and
# 3 times the figure from Ksp, so cellchem never refuses what dissolves and refuses
# what is more than three times it. The soluble salts' saturation molalities agree with
# pitzer.dat within 10 % (halite, sylvite, mirabilite, epsomite, arcanite, natron,
# nahcolite; water of crystallisation counted with the solvent).
MINERALS = [
    ("phreeqc.dat", "Calcite", "CaCO3", "Ca", 1),
    ("phreeqc.dat", "Strontianite", "SrCO3", "Sr", 1),
    ("phreeqc.dat", "Witherite", "BaCO3", "Ba", 1),
    ("phreeqc.dat", "Gypsum", "CaSO4", "Ca", 1),
    ("phreeqc.dat", "Celestite", "SrSO4", "Sr", 1),
    ("phreeqc.dat", "Barite", "BaSO4", "Ba", 1),
    ("phreeqc.dat", "Fluorite", "CaF2", "Ca", 1),
    ("pitzer.dat", "Portlandite", "Ca(OH)2", "Ca", 1),
    ("pitzer.dat", "Brucite", "Mg(OH)2", "Mg", 1),
]
SALTS = [
    ("pitzer.dat", "Halite", "NaCl", "Na", 1),
    ("pitzer.dat", "Sylvite", "KCl", "K", 1),
    ("pitzer.dat", "Mirabilite", "Na2SO4", "Na", 2),
    ("pitzer.dat", "Epsomite", "MgSO4", "Mg", 1),
    ("pitzer.dat", "Arcanite", "K2SO4", "K", 2),
    ("pitzer.dat", "Natron", "Na2CO3", "Na", 2),
    ("pitzer.dat", "Nahcolite", "NaHCO3", "Na", 1),
]


def saturated_molality(database: str, mineral: str, element: str, per_formula: int) -> float:
    s = phreeqpython.PhreeqPython(database=database).add_solution({})
    try:
        s.saturate(mineral, 0)
        return s.total_element(element, "mol") / s.mass / per_formula
    finally:
        s.forget()


@pytest.mark.parametrize("database, mineral, formula, element, n", MINERALS, ids=[m[1] for m in MINERALS])
def test_ksp_margin_against_phreeqpython(database, mineral, formula, element, n):
    ratio = saturated_molality(database, mineral, element, n) / solubility(formula)
    assert 0.8 <= ratio <= 3.0


@pytest.mark.parametrize("database, mineral, formula, element, n", SALTS, ids=[m[1] for m in SALTS])
def test_soluble_salts_against_phreeqpython(database, mineral, formula, element, n):
    assert solubility(formula) == pytest.approx(saturated_molality(database, mineral, element, n), rel=0.10)
