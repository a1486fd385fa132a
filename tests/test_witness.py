"""Which cell is wrong: a line's name, formula, molar mass and CAS RN weighed against each
other (cellchem.witness through audit.check_line).

Check values: formulas, molar masses and CAS RNs of common reagents, CRC Handbook of Chemistry
and Physics, "Physical Constants of Inorganic Compounds" / "... Organic Compounds", and supplier
labels (from memory). Each case plants one defect in an otherwise correct line.
"""

from __future__ import annotations

import pytest

from cellchem.audit import ERROR, check_line

# a correct line each: name, formula, molar mass (g/mol), CAS RN (CRC and labels, from memory)
SODIUM_CHLORIDE = ("Sodium chloride", "NaCl", "58.44", "7647-14-5")
POTASSIUM_CHLORIDE = ("Potassium chloride", "KCl", "74.55", "7447-40-7")
COPPER_SULFATE_5 = ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "249.68", "7758-99-8")
COPPER_SULFATE = ("Copper(II) sulfate, anhydrous", "CuSO4", "159.60", "7758-98-7")
MAGNESIUM_SULFATE_7 = ("Magnesium sulfate heptahydrate", "MgSO4·7H2O", "246.47", "10034-99-8")
ETHANOL = ("Ethanol", "C2H6O", "46.07", "64-17-5")
ACETONE = ("Acetone", "C3H6O", "58.08", "67-64-1")
METHANOL = ("Methanol", "CH4O", "32.04", "67-56-1")
UREA = ("Urea", "CH4N2O", "60.06", "57-13-6")
CITRIC_ACID = ("Citric acid", "C6H8O7", "192.12", "77-92-9")
CLEAN = [SODIUM_CHLORIDE, POTASSIUM_CHLORIDE, COPPER_SULFATE_5, COPPER_SULFATE, MAGNESIUM_SULFATE_7, ETHANOL,
         ACETONE, METHANOL, UREA, CITRIC_ACID]  # fmt: skip


def _check(name, formula, mass, cas):
    return check_line(formula, mass, name, cas).findings


@pytest.mark.parametrize("line", CLEAN, ids=[line[0] for line in CLEAN])
def test_a_correct_line_gives_no_error(line):
    assert [f for f in _check(*line) if f.severity == ERROR] == []


def _errors(line):
    return [(f.field, f.suggestion) for f in _check(*line) if f.severity == ERROR]


PLANTED = [
    # (line with one defect, the cell the finding must name, the value it must suggest)
    (("Potassium chloride", "KCl", "74.55", "7647-14-5"), "cas", "7447-40-7"),  # sodium chloride's RN
    (
        ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "249.68", "7758-98-7"),
        "cas",
        "7758-99-8",
    ),  # anhydrous
    (("Copper(II) sulfate, anhydrous", "CuSO4", "159.60", "7758-99-8"), "cas", "7758-98-7"),  # the hydrate's
    (("Ethanol", "C2H6O", "46.07", "67-56-1"), "cas", "64-17-5"),  # methanol's RN, an organic line
    (("Acetone", "C3H8O", "58.08", "67-64-1"), "formula", "C3H6O"),  # organic formula typo
    (("Urea", "CH4N2O", "60.60", "57-13-6"), "molar_mass", "60.06"),  # two digits swapped
    (("Magnesium sulfate heptahydrate", "MgSO4", "246.47", "10034-99-8"), "formula", "MgSO4·7H2O"),
    (("Sodium chloride", "KCl", "74.55", "7447-40-7"), "name", "potassium chloride"),
    (
        ("Sodium chloride", "NaCl", "58.44", "7647-41-5"),
        "cas",
        "",
    ),  # transposed: no table number is a slip away
    (("Sodium chloride", "NaCl", "58.44", "7647-14-4"), "cas", "7647-14-5"),  # wrong check digit
]


@pytest.mark.parametrize(("line", "cell", "value"), PLANTED, ids=[f"{p[0][0]}|{p[1]}" for p in PLANTED])
def test_the_finding_names_the_planted_cell(line, cell, value):
    errors = _errors(line)
    assert [field for field, _ in errors] == [cell], errors
    if value:
        assert errors[0][1] == value


def test_an_even_split_names_both_sides_and_suggests_nothing():
    # the name says sodium chloride, the formula potassium chloride; nothing else on the line
    findings = [f for f in _check("Sodium chloride", "KCl", None, None) if f.severity == ERROR]
    assert len(findings) == 1 and findings[0].suggestion == ""
    assert "NaCl" in findings[0].message and "KCl" in findings[0].message


def test_a_wrong_check_digit_never_gets_a_recomputed_digit_alone():
    # 7647-14-4 with no other witness: no number is suggested (the table's neighbours are not
    # confirmed by anything on the line)
    findings = _check(None, None, None, "7647-14-4")
    assert [(f.field, f.suggestion) for f in findings] == [("cas", "")]


def test_an_uncertain_record_grounds_no_error():
    # 12054-85-2 is ammonium heptamolybdate tetrahydrate (CRC, from memory); the open-data record
    # is wrong and marked uncertain, so a correct line gets no error from it
    line = ("Ammonium molybdate tetrahydrate", "(NH4)6Mo7O24·4H2O", "1235.86", "12054-85-2")
    assert [f for f in _check(*line) if f.severity == ERROR] == []


def test_a_synonym_match_alone_grounds_no_error():
    # "ethyl alcohol" is a synonym of ethanol: it supports but does not by itself make a formula
    # of methanol an error on a line with no other witness
    errors = [f for f in _check("ethyl alcohol", "CH4O", None, None) if f.severity == ERROR]
    assert errors == []


def test_school_atomic_weights_are_accepted_when_asked():
    # CuSO4·5H2O with Cu 63.5, S 32, O 16, H 1: 249.5 (school data books, common practice)
    line = ("Copper(II) sulfate pentahydrate", "CuSO4·5H2O", "249.5", "7758-99-8")
    assert [f for f in _check(*line) if f.severity == ERROR]
    school = check_line(line[1], line[2], line[0], line[3], weights="school").findings
    assert [f for f in school if f.severity == ERROR] == []
