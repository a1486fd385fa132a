"""Making up solutions: worked examples of the kind printed in preparation-room
guides and general chemistry texts. Each check value is worked by hand from the
molar masses (CIAAW 2021 conventional atomic weights) unless a source is named."""

import warnings

import pytest

from cellchem import (
    CellchemError,
    concentration_from_mass,
    convert_concentration,
    dilution,
    mass_for_solution,
)
from cellchem.recipes import SDS_LINE, cautions_for
from cellchem.solutions import RangeWarning


def test_copper_sulfate_from_the_pentahydrate():
    # 0.1 mol/L CuSO4 in 1 L needs 0.1 mol of CuSO4·5H2O, 249.68 g/mol: 24.97 g
    # (the textbook example of hydrate substitution; common practice)
    r = mass_for_solution("CuSO4", 0.1, 1.0, shelf_form="CuSO4·5H2O")
    assert r.mass == pytest.approx(24.97, abs=0.005)
    assert r.weigh == "CuSO4·5H2O"
    assert any("substituted" in n for n in r.notes)


def test_the_reverse_substitution():
    # a recipe for the pentahydrate made with the anhydrous salt: 0.1 mol x 159.60 g/mol
    r = mass_for_solution("CuSO4·5H2O", "0.1 M", "1 L", shelf_form=0)
    assert r.mass == pytest.approx(15.96, abs=0.005)
    assert r.weigh == "CuSO4"


def test_washing_soda_for_sodium_carbonate():
    # 250 mL of 0.05 mol/L Na2CO3 from Na2CO3·10H2O (286.14 g/mol): 3.577 g
    r = mass_for_solution("Na2CO3", "0.05 mol/L", "250 mL", shelf_form=10)
    assert r.mass == pytest.approx(0.0125 * 286.14, rel=1e-4)


def test_mass_concentration_is_of_the_formula_as_written():
    # 10 g/L of anhydrous CuSO4, made from the pentahydrate: 10 x 249.68 / 159.60 = 15.64 g per litre
    r = mass_for_solution("CuSO4", "10 g/L", "1 L", shelf_form="CuSO4·5H2O")
    assert r.mass == pytest.approx(15.644, abs=0.002)


def test_purity_raises_the_mass():
    # 1 L of 0.1 mol/L NaCl (58.44 g/mol) from 99.5 % salt: 5.844 / 0.995 = 5.873 g
    r = mass_for_solution("NaCl", 0.1, 1, purity="99.5%")
    assert r.mass == pytest.approx(5.8734, abs=0.0005)
    assert mass_for_solution("NaCl", 0.1, 1, purity=0.995).mass == pytest.approx(r.mass)


def test_normal_saline_and_kcl_standard():
    # 0.9 % w/v NaCl: 9.000 g per litre (the definition); 0.01 mol/L KCl
    # conductivity standard: 0.7455 g per litre (common practice, from memory: 0.7456 g)
    assert mass_for_solution("NaCl", "0.9 % w/v", "1 L").mass == pytest.approx(9.000, abs=1e-9)
    assert mass_for_solution("KCl", "0.01 M", "1000 mL").mass == pytest.approx(0.7456, abs=0.0002)


def test_units_of_the_answer():
    r = mass_for_solution("KCl", "1 mmol/L", "100 mL", mass_unit="mg")
    assert r.mass_unit == "mg"
    assert r.mass == pytest.approx(7.455, abs=0.001)


def test_equivalent_concentration():
    # 50 meq/L of CaCl2 is 25 mmol/L: 1 L needs 0.025 x 110.98 g = 2.775 g
    assert mass_for_solution("CaCl2", "50 meq/L", "1 L").mass == pytest.approx(2.7746, abs=0.0005)


@pytest.mark.parametrize(
    "kwargs, words",
    [
        (dict(formula="CuSO4", concentration=0.1, volume=1, shelf_form="CuCl2"), "not a hydrate"),
        (dict(formula="CuSO4", concentration=0.1, volume=1, purity=99), "over 1"),
        (dict(formula="Na2CO3", concentration=0.1, volume=1, shelf_form="Na2CO3·xH2O"), "unknown number"),
        (dict(formula="NaCl", concentration="5 % w/w", volume=1), "density"),
        (dict(formula="NaCl", concentration=0.1, volume="1 kg"), "volume"),
        (dict(formula="NaCl", concentration="1 N", volume=1), "normality"),
        (dict(formula="NaCl", concentration=-1, volume=1), "not above 0"),
    ],
)
def test_refusals(kwargs, words):
    with pytest.raises(CellchemError, match=words):
        mass_for_solution(**kwargs)


def test_recipe_text_carries_the_cautions():
    r = mass_for_solution("K2Cr2O7", "0.0167 M", "1 L")
    assert "chromium(VI)" in r.text
    assert SDS_LINE in r.text
    plain = mass_for_solution("NaCl", 0.1, 1)
    assert "SDS" in plain.text  # even with no hint, the SDS is named


@pytest.mark.parametrize(
    "formula, hazard",
    [
        ("NaOH", "corrosive"),
        ("HCl", "corrosive"),
        ("KMnO4", "oxidiser"),
        ("HgCl2", "toxic"),
        ("NaF", "toxic"),
    ],
)
def test_cautions(formula, hazard):
    # hazard classes of these compounds: common practice (any SDS section 2)
    assert hazard in [c.hazard for c in cautions_for(formula)]


def test_concentration_from_mass():
    assert concentration_from_mass("NaCl", "5.844 g", "1 L") == pytest.approx(0.1, rel=1e-3)
    assert concentration_from_mass("NaCl", 9.0, 1, unit="% w/v") == pytest.approx(0.9)
    assert concentration_from_mass("CuSO4·5H2O", 24.97, 1, unit="mmol/L") == pytest.approx(100.0, rel=1e-3)


# Concentrated reagents: 37 % HCl at 1.18 g/mL is about 12 mol/L; 98 % H2SO4 at
# 1.84 g/mL is 18.4 mol/L; 65 % HNO3 at 1.40 g/mL is 14.4 mol/L; 25 % NH3 at
# 0.91 g/mL is 13.4 mol/L (common practice: the figures on reagent bottles and
# in preparation-room tables, from memory).
@pytest.mark.parametrize(
    "formula, w, rho, molar",
    [
        ("HCl", 37, 1.18, 11.97),
        ("H2SO4", 98, 1.84, 18.39),
        ("HNO3", 65, 1.40, 14.44),
        ("NH3", 25, 0.91, 13.36),
    ],
)
def test_stock_reagent_strength(formula, w, rho, molar):
    assert convert_concentration(w, "% w/w", "mol/L", formula, density=rho) == pytest.approx(molar, rel=0.003)


def test_conversions():
    assert convert_concentration(1, "mol/L", "meq/L", "CaCl2") == pytest.approx(2000)
    # 100 mg/L Ca2+ is 2.495 mmol/L and 4.990 meq/L (40.078 g/mol)
    assert convert_concentration(100, "mg/L", "mmol/L", "Ca2+") == pytest.approx(2.4951, rel=1e-4)
    assert convert_concentration(100, "mg/L", "meq/L", "Ca2+") == pytest.approx(4.9903, rel=1e-4)
    assert convert_concentration(100, "ppm", "mg/L") == 100
    assert any("mg/L" in n for n in convert_concentration(100, "ppm", "mmol/L", "Ca2+").notes)
    assert convert_concentration("0.9 % w/v", "", "g/L") == pytest.approx(9.0)
    with pytest.raises(CellchemError, match="formula"):
        convert_concentration(1, "mol/L", "g/L")


def test_molality_round_trip_needs_a_density():
    # 1 mol/kg NaCl: 58.44 g in 1000 g water; at 1.0369 g/mL (CRC concentrative
    # properties, from memory) that is 1.0369 x 1000 / 1058.44 = 0.9797 mol/L
    assert convert_concentration(1, "mol/kg", "mol/L", "NaCl", density=1.0369) == pytest.approx(
        0.9797, rel=1e-3
    )
    with pytest.raises(CellchemError, match="density"):
        convert_concentration(1, "mol/kg", "mol/L", "NaCl")


# % w/w and mol/kg are both per mass: m = w / ((1 - w) M) and w = m M / (1 + m M), no
# density. Worked by hand with M(NaCl) = 58.44 g/mol: 10 % w/w is 10 g of NaCl in 90 g of
# water, 0.17112 mol in 0.090 kg = 1.9013 mol/kg; 1 mol/kg is 58.44 g in 1058.44 g of
# solution = 5.521 % w/w (the textbook definitions of both units).
@pytest.mark.parametrize(
    "value, source, target, formula, expected",
    [
        (10, "% w/w", "mol/kg", "NaCl", 1.9013),
        (1, "mol/kg", "% w/w", "NaCl", 5.5213),
        (100, "mmol/kg", "% w/w", "NaCl", 0.58103),  # 5.844 g in 1005.844 g
        (20, "% w/w", "mmol/kg", "CuSO4", 1566.4),  # 20 g of CuSO4 (159.60 g/mol) in 80 g of water
    ],
)
def test_mass_fraction_and_molality_need_no_density(value, source, target, formula, expected):
    assert convert_concentration(value, source, target, formula) == pytest.approx(expected, rel=2e-4)
    # the same with a density given (it is not used) and back again
    assert convert_concentration(value, source, target, formula, density=1.07) == pytest.approx(
        expected, rel=2e-4
    )
    back = convert_concentration(
        convert_concentration(value, source, target, formula), target, source, formula
    )
    assert back == pytest.approx(value, rel=1e-9)


def test_mass_fraction_of_100_percent_is_refused():
    with pytest.raises(CellchemError, match="no water"):
        convert_concentration(100, "% w/w", "mol/kg", "NaCl")
    with pytest.raises(CellchemError, match="formula"):
        convert_concentration(10, "% w/w", "mol/kg")


# Above what dissolves at 25 C (CRC Handbook tables, from memory): PbI2 dissolves to about
# 1.3 mmol/L (Ksp 9.8e-9), K2Cr2O7 to 0.51 mol/kg (13.1 g per 100 g of solution).
@pytest.mark.parametrize(
    "formula, concentration, kwargs",
    [
        ("PbI2", 0.1, {}),
        ("AgCl", "1 g/L", {}),  # 7 mmol/L against 13 umol/L
        ("BaSO4", 0.01, {}),
        ("K2Cr2O7", 1.0, {}),
        ("CuSO4", 2.0, {"shelf_form": "CuSO4·5H2O"}),  # 1.375 mol/kg of CuSO4 at most
    ],
)
def test_recipe_above_solubility_is_refused(formula, concentration, kwargs):
    with pytest.raises(CellchemError, match="above what dissolves in water at 25 C"):
        mass_for_solution(formula, concentration, 1, **kwargs)
    with pytest.warns(RangeWarning):
        r = mass_for_solution(formula, concentration, 1, outside_range="warn", **kwargs)
    assert any("above what dissolves" in n for n in r.notes)
    assert "above what dissolves" in r.text


def test_recipe_within_solubility_is_not_refused():
    # saturated limewater (0.020 mol/L Ca(OH)2, PHREEQC pitzer.dat) and 0.5 mol/L K2Cr2O7
    with warnings.catch_warnings():
        warnings.simplefilter("error", RangeWarning)
        assert mass_for_solution("Ca(OH)2", 0.02, 1).mass == pytest.approx(0.02 * 74.09, rel=1e-3)
        assert mass_for_solution("K2Cr2O7", 0.5, 1).mass > 0
    with pytest.raises(CellchemError, match="outside_range"):
        mass_for_solution("NaCl", 0.1, 1, outside_range="no")


def test_dilution_worked_examples():
    # 250 mL of 0.1 mol/L from a 1 mol/L stock: 25 mL (C1V1 = C2V2)
    d = dilution(c1=1.0, c2=0.1, v2="250 mL")
    assert d.v1 == pytest.approx(0.025)
    # 1 L of 1 mol/L HCl from 37 % w/w, 1.18 g/mL: 83.5 mL of the concentrate
    d = dilution(c1="37 % w/w", c2=1.0, v2="1 L", formula="HCl", density=1.18)
    assert d.v1 * 1000 == pytest.approx(83.5, abs=0.1)
    assert "add" in d.text and "slowly" in d.text and SDS_LINE in d.text
    # mmol/L throughout
    d = dilution(c1=100, v1=10, v2=1000, concentration_unit="mmol/L", volume_unit="mL")
    assert d.c2 == pytest.approx(1.0)
    with pytest.raises(CellchemError, match="exactly three"):
        dilution(c1=1, c2=0.1)


# A percent strength of a reagent of the density table converts without a density given.
# 37 % HCl: 37 g in 100 g of solution; at 1.18-1.19 g/mL (the label figures, common practice;
# CRC Handbook 1.18, from memory) a litre holds 1180-1190 g, of which 436.6-440.3 g HCl
# (36.46 g/mol): 11.97-12.08 mol/L, "about 12 M" on preparation-room charts (common practice).
@pytest.mark.parametrize("unit", ["%", "% w/w", "wt%"])
def test_37_percent_hydrochloric_acid_without_a_density(unit):
    v = convert_concentration(37, unit, "mol/L", "HCl")
    assert 11.97 - 0.03 <= v <= 12.08 + 0.03
    assert any("density table" in n and "37 % w/w HCl" in n and "from memory" in n for n in v.notes)
    assert convert_concentration(f"37 {unit}", "", "mol/L", "HCl") == v
    assert convert_concentration(37, unit, "mol/L", "hydrochloric acid") == v


def test_a_plain_percent_is_read_as_w_w_only_for_a_reagent_of_the_table():
    v = convert_concentration("37%", "mol/L", "mol/L", "HCl")
    assert any("'%' read as % w/w" in n for n in v.notes)
    # 96 % H2SO4 at 1.84 g/mL (label figure): 96 x 18.4 / 98.08 = 18.0 mol/L (by hand)
    assert convert_concentration(96, "%", "mol/L", "H2SO4") == pytest.approx(18.0, abs=0.07)
    # 25 % NH3 at 0.91 g/mL (label figure): 25 x 9.1 / 17.03 = 13.36 mol/L (by hand)
    assert convert_concentration(25, "%", "mol/L", "NH3") == pytest.approx(13.36, abs=0.08)
    # any other solute: '%' stays refused, quoting the unit
    with pytest.raises(CellchemError) as info:
        convert_concentration(10, "%", "mol/L", "NaCl")
    assert str(info.value) == (
        "unit '%': '%' alone does not say of what; write '% w/v' (g per 100 mL) or '% w/w' (g per 100 g,"
        " needs the solution's density)"
    )
    # ammonia solution written as NH4OH is not read: its strength is % NH3, not % NH4OH
    with pytest.raises(CellchemError, match="'%' alone does not say of what"):
        convert_concentration(25, "%", "mol/L", "NH4OH")


def test_a_given_density_wins_over_the_table():
    # 37 % at 1.18 g/mL: 37 x 11.8 / 36.46 = 11.97 mol/L (by hand), whatever the table holds
    v = convert_concentration(37, "%", "mol/L", "HCl", density=1.18)
    assert v == pytest.approx(11.975, abs=0.002)
    assert not any(n.startswith("density ") for n in v.notes)  # no density taken from the table


def test_a_strength_the_table_does_not_list_is_refused():
    with pytest.raises(CellchemError) as info:
        convert_concentration(33, "%", "mol/L", "HCl")
    assert str(info.value) == (
        "concentration 33 (33 % w/w HCl) needs the solution's density: cellchem's density table lists HCl"
        " at 32, 36, 37 % w/w only (no interpolation); pass density=... (g/mL)"
    )
    # per mass to per mass needs no density, table or not
    assert convert_concentration(37, "%", "mol/kg", "HCl") == pytest.approx(
        convert_concentration(37, "% w/w", "mol/kg", "HCl")
    )
