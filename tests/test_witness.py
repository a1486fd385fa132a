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
    # the standard check says where the value comes from
    assert any("school data books" in f.message for f in _check(*line))
    # the school weights accept a rounded value, not any value: 250.0 is neither weight set's
    wrong = check_line(line[1], "250.0", line[0], line[3], weights="school").findings
    assert [f.field for f in wrong if f.severity == ERROR] == ["molar_mass"]


def test_school_weights_through_the_command(tmp_path, capsys):
    from cellchem.cli import main

    # NaCl with Na 23, Cl 35.5: 58.5 (school data books, common practice)
    table = tmp_path / "school.csv"
    table.write_text("Name,Formula,Molar mass\nSodium chloride,NaCl,58.5\n", encoding="utf-8")
    assert main(["audit", str(table)]) == 1
    capsys.readouterr()
    assert main(["audit", str(table), "--weights", "school"]) == 0
    assert main(["audit", str(table), "--weights", "rounded"]) == 2


# isomers: the same formula, told apart only by the name (CAS RNs: Merck Index monographs,
# from memory; beta-alanine 107-95-9, L-alanine 56-41-7, DL-alanine 302-72-7)
def test_a_cas_rn_of_an_isomer_is_an_error_that_names_both_and_fixes_neither():
    found = [f for f in _check("beta-Alanine", "C3H7NO2", "89.09", "56-41-7") if f.severity == ERROR]
    assert [(f.field, f.suggestion) for f in found] == [("cas", "")]
    assert "107-95-9" in found[0].message and "either the name or the CAS RN" in found[0].message


def test_another_stereo_form_is_only_a_warning():
    found = _check("L-Alanine", "C3H7NO2", "89.09", "302-72-7")
    assert [f for f in found if f.severity == ERROR] == []
    assert [(f.field, f.severity) for f in found if f.field == "cas"] == [("cas", "warning")]


def test_a_correct_isomer_line_gives_nothing():
    assert _check("beta-Alanine", "C3H7NO2", "89.09", "107-95-9") == ()


def test_a_valid_cas_rn_the_table_lacks_is_a_warning_naming_the_known_number():
    # 12345-67-4 is well formed (check digit 4) and no substance of the table; it was made up for
    # this test. KCl, 74.55 g/mol, CAS 7447-40-7 (CRC Handbook, from memory)
    found = _check("Potassium chloride", "KCl", "74.55", "12345-67-4")
    assert [f for f in found if f.severity == ERROR] == []
    assert [(f.field, f.severity) for f in found] == [("cas", "warning")]
    assert "7447-40-7" in found[0].message
    # an organic formula names no one substance (isomers): nothing is said without a name match
    assert _check("", "C2H6O", "46.07", "12345-67-4") == ()


def test_grade_words_do_not_hide_an_organic_name_from_the_table():
    # ethanol C2H6O, 46.07 g/mol, CAS 64-17-5 (CRC Handbook, from memory)
    found = [f for f in _check("Ethanol, absolute, AR", "C2H6O2", "46.07", "") if f.severity == ERROR]
    assert [(f.field, f.suggestion) for f in found] == [("formula", "C2H6O")]


def test_a_hydrate_fix_keeps_the_way_the_formula_cell_is_written():
    # citric acid monohydrate C6H8O7·H2O, 210.14 g/mol (CRC Handbook, from memory)
    found = [f for f in _check("Citric acid monohydrate", "C6H8O7", "210.14", "") if f.severity == ERROR]
    assert [(f.field, f.suggestion) for f in found] == [("formula", "C6H8O7·H2O")]


def test_an_outvoted_synonym_gives_a_note_not_an_error():
    # pyridoxine hydrochloride C8H11NO3·HCl, 205.64 g/mol, CAS 58-56-0 (Merck Index, from memory);
    # "vitamin B6" names a family (pyridoxine, pyridoxal, pyridoxamine), so a synonym match of it
    # to one member cannot call the name wrong
    found = _check("Vitamin B6 hydrochloride", "C8H12ClNO3", "205.64", "58-56-0")
    assert [f for f in found if f.severity == ERROR] == []


def test_a_trade_acid_name_with_two_meanings_accepts_either_formula():
    # periodic acid: HIO4 (metaperiodic, 191.91) by the rules, H5IO6 (orthoperiodic, 227.94) as sold;
    # chromic acid: H2CrO4 by the rules, CrO3 as sold (CRC Handbook and Merck Index, from memory)
    for line in [
        ("Periodic acid", "H5IO6", "227.94", "10450-60-9"),
        ("Periodic acid", "HIO4", "191.91", ""),
        ("Chromic acid", "CrO3", "99.99", "1333-82-0"),
    ]:
        assert [f for f in _check(*line) if f.severity == ERROR] == [], line
    # a formula that is neither still gets a finding on the name
    assert [f.field for f in _check("Periodic acid", "HIO3", "175.91", "") if f.field == "name"]


def test_a_name_of_the_full_salt_on_an_acid_salt_line_is_weighed_when_a_cas_rn_is_there():
    # NaHCO3 84.01 g/mol, CAS 144-55-8; Na2CO3 105.99 g/mol, CAS 497-19-8 (CRC Handbook, from memory)
    alone = _check("Sodium carbonate", "NaHCO3", "84.01", "")
    assert [(f.field, f.severity) for f in alone] == [("name", "warning")]
    found = [
        f for f in _check("Sodium carbonate anhydrous", "NaHCO3", "84.01", "144-55-8") if f.severity == ERROR
    ]
    assert [(f.field, f.suggestion) for f in found] == [("name", "sodium hydrogencarbonate")]


def test_molybdenum_pentachloride_is_a_clean_line():
    # MoCl5, 273.21 g/mol, CAS 10241-05-1 (Greenwood and Earnshaw, Chemistry of the Elements;
    # CRC Handbook; from memory): molybdenum(V) is a charge stores meet
    assert _check("Molybdenum pentachloride", "MoCl5", "273.21", "10241-05-1") == ()
