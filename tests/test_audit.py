"""The line checks over plain values (cellchem.audit): name, formula and molar
mass against each other. Check values: handbook molar masses (CRC Handbook,
"Physical Constants of Inorganic Compounds", from memory) and common practice."""

import pytest

from cellchem.audit import ERROR, NOTE, WARNING, check_line, mass_tolerance, read_stated_mass


def kinds(result):
    return [(f.check, f.severity) for f in result.findings]


# (name, formula, stated molar mass, expected (check, severity) findings)
LINES = [
    # all three agree (CuSO4·5H2O 249.68 g/mol, CRC Handbook, from memory)
    ("copper(II) sulfate pentahydrate", "CuSO4·5H2O", "249.68", []),
    # the anhydrous molar mass (159.61) written against the pentahydrate formula
    ("copper(II) sulfate pentahydrate", "CuSO4·5H2O", "159.61", [("molar-mass", ERROR)]),
    # the name says a different hydrate from the formula
    ("copper(II) sulfate pentahydrate", "CuSO4", "159.61", [("name-hydrate", ERROR)]),
    # the name is silent about the hydrate the formula has: common practice to warn
    ("copper(II) sulfate", "CuSO4·5H2O", "249.68", [("name-hydrate", WARNING)]),
    # a name that leaves the charge open, settled by the formula
    ("iron chloride", "FeCl3", "162.20", [("name", NOTE)]),
    # an open charge that no candidate fits
    ("iron chloride", "FeBr3", "", [("name", ERROR)]),
    # a different compound altogether
    ("sodium chloride", "KCl", "74.55", [("name", ERROR)]),
    # an organic name the substance table matches exactly is checked there, and agrees
    # (glucose C6H12O6, 180.16 g/mol, CRC Handbook, from memory)
    ("glucose", "C6H12O6", "180.16", []),
    # an organic name the table does not hold is not checked, said in a note (bromothymol blue
    # sodium salt, 646.36 g/mol, supplier labels, from memory)
    ("bromothymol blue sodium salt indicator", "C27H27Br2NaO5S", "646.36", [("name", NOTE)]),
    # a formula that does not balance, and its molar mass then disagrees with NaCl's
    # the name and the stated molar mass agree (NaCl 58.44 g/mol, CRC, from memory): the formula is
    # blamed, and the molar mass is not
    ("sodium chloride", "NaCl2", "58.44", [("name", ERROR), ("charge", ERROR)]),
    # wrong case is refused with readings
    ("cobalt(II) chloride hexahydrate", "co Cl2·6H2O", "237.93", [("formula", ERROR)]),
    # an unknown water count: molar mass cannot be given
    ("sodium carbonate hydrate", "Na2CO3·xH2O", "", [("molar-mass", WARNING)]),
    # a legacy name agrees with the formula (ferric = iron(III), common practice)
    ("ferric chloride hexahydrate", "FeCl3·6H2O", "270.30", []),
    # a trivial name agrees (Epsom salt = MgSO4·7H2O, common practice)
    ("Epsom salt", "MgSO4·7H2O", "246.47", []),
    # a stated molar mass that is not a number
    ("sodium chloride", "NaCl", "n/a", [("molar-mass", ERROR)]),
]


@pytest.mark.parametrize("name,formula,stated,expected", LINES, ids=[f"{n}|{f}" for n, f, _, _ in LINES])
def test_line(name, formula, stated, expected):
    assert kinds(check_line(formula, stated, name)) == expected


def test_hydrate_hint_names_the_form_whose_mass_was_given():
    # CuSO4 is 159.61 g/mol, CuSO4·5H2O 249.68 g/mol (CRC Handbook, from memory)
    result = check_line("CuSO4·5H2O", "159.61")
    assert result.findings[0].message == (
        "the stated molar mass 159.61 g/mol does not match CuSO4·5H2O, 249.68 g/mol;"
        " 159.61 g/mol is the molar mass of CuSO4; nothing else on the line confirms the formula,"
        " so either cell may be wrong"
    )
    # no name says which hydrate the line holds: no value is suggested for either cell
    assert result.findings[0].suggestion == ""


def test_a_name_that_confirms_the_formula_lets_the_mass_be_corrected():
    result = check_line("CuSO4·5H2O", "159.61", "copper(II) sulfate pentahydrate")
    assert [(f.check, f.field, f.suggestion) for f in result.findings] == [
        ("molar-mass", "molar_mass", "249.68")
    ]


def test_a_name_and_mass_that_agree_blame_the_formula():
    # sodium chloride, 58.44 g/mol (CRC Handbook, from memory), on a line whose formula is KCl
    result = check_line("KCl", "58.44", "sodium chloride")
    assert [(f.check, f.field, f.suggestion) for f in result.findings] == [("name", "formula", "NaCl")]


def test_a_formula_and_mass_that_agree_blame_the_name():
    # potassium chloride, 74.55 g/mol (CRC Handbook, from memory), on a line named sodium chloride
    result = check_line("KCl", "74.55", "Sodium chloride, AR")
    assert [(f.check, f.field, f.suggestion) for f in result.findings] == [
        ("name", "name", "potassium chloride")
    ]


def test_hydrate_hint_the_other_way():
    # CuSO4·5H2O is 249.68 g/mol (CRC Handbook, from memory)
    result = check_line("CuSO4", "249.68")
    assert "249.68 g/mol is the molar mass of CuSO4·5H2O" in result.findings[0].message


def test_name_without_formula_suggests_it():
    result = check_line("", None, "sodium hydrogen carbonate")
    assert [(f.check, f.severity, f.suggestion) for f in result.findings] == [("name", NOTE, "NaHCO3")]


def test_all_capitals_are_flagged():
    result = check_line("CUO", "79.55", "copper(II) oxide")
    messages = [f.message for f in result.findings]
    assert "'CUO' is written in capitals; it reads as CUO, but the letters also allow CuO" in messages


@pytest.mark.parametrize(
    "value,expected",
    [
        ("58.44", (58.44, 2)),
        ("58,44 g/mol", (58.44, 2)),
        (58.44, (58.44, 2)),
        ("58", (58.0, 0)),
        ("", None),
        (None, None),
    ],
)
def test_read_stated_mass(value, expected):
    assert read_stated_mass(value) == expected


def test_tolerance_follows_printed_decimals():
    # half a unit in the last decimal plus 0.01 g/mol (or 0.01 %): common practice
    assert mass_tolerance(58.44, 2) == pytest.approx(0.015)
    assert mass_tolerance(58.4, 1) == pytest.approx(0.06)
    assert mass_tolerance(474.4, 1) == pytest.approx(0.05 + 0.04744)


# -- tables of rows -------------------------------------------------------------------------------


def test_a_formula_cell_with_no_saved_value_is_reported_as_such():
    from cellchem.audit import NO_SAVED_VALUE, NOT_RECALCULATED, SAVED_VALUE, audit_row
    from cellchem.columns import find_layout

    layout = find_layout([["Name", "Formula", "MW"]])
    row = audit_row(["sodium chloride", "NaCl", NO_SAVED_VALUE], layout, 2)
    assert [(f.check, f.severity, row.column_of(f)) for f in row.findings] == [(SAVED_VALUE, WARNING, "C")]
    assert "spreadsheet formula with no saved value: open and save the file" in row.findings[0].message
    assert row.status == "checked"  # the name and the formula are still checked against each other
    # the same line with a wrong formula still gets its error: the unread cell hides nothing else
    row = audit_row(["sodium chloride", "KCl", NO_SAVED_VALUE], layout, 2)
    assert {f.check for f in row.findings} >= {SAVED_VALUE} and any(f.severity == ERROR for f in row.findings)
    assert not any("is not a molar mass" in f.message for f in row.findings)
    # every cell a formula without a value: not checked, and said so
    row = audit_row([NOT_RECALCULATED, NOT_RECALCULATED, None], layout, 3)
    assert row.status == "not checked" and "no saved value" in row.reason
    assert [f.field for f in row.findings] == ["name", "formula"]
    assert "recalculated" in row.findings[0].message


def test_audit_rows_with_a_header_row_given():
    from cellchem.audit import audit_rows

    rows = [["x"]] * 22 + [["Name", "Formula", "MW"], ["sodium chloride", "NaCl", "10"]]
    audit = audit_rows(rows, header_row=23)
    assert [(row, col, f.check) for row, col, f in audit.findings] == [(24, "C", "molar-mass")]
