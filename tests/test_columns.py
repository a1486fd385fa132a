"""Header rows and column roles. Headings are those printed on supplier price
lists and stores inventories (common practice); column letters follow the
spreadsheet convention A..Z, AA.. (common practice, the OOXML cell reference)."""

import pytest

from cellchem import CellchemError
from cellchem.columns import column_index, column_letter, find_layout, heading_role, read_overrides


@pytest.mark.parametrize(
    "index, letters",
    [(0, "A"), (25, "Z"), (26, "AA"), (51, "AZ"), (52, "BA"), (701, "ZZ"), (702, "AAA"), (16383, "XFD")],
)
def test_column_letters(index, letters):
    assert column_letter(index) == letters
    assert column_index(letters) == index
    assert column_index(letters.lower()) == index


def test_column_letter_limits():
    with pytest.raises(CellchemError, match="XFD"):
        column_index("XFE")
    with pytest.raises(CellchemError, match="not a column letter"):
        column_index("A1")


@pytest.mark.parametrize(
    "heading, role",
    [
        ("Item", "name"),
        ("PRODUCT DESCRIPTION", "name"),
        ("Chemical name:", "name"),
        ("Formula", "formula"),
        ("Mol. formula", "formula"),
        ("MW", "molar_mass"),
        ("Mol. wt. (g/mol)", "molar_mass"),
        ("Molecular Weight [g/mol]", "molar_mass"),
        ("Formula weight", "molar_mass"),
        ("CAS No.", "cas"),
        ("CAS-Nr", "cas"),
        ("cas rn", "cas"),
        ("Qty", "quantity"),
        ("Pack size", "quantity"),
        ("UoM", "unit"),
        ("Conc.", "concentration"),
        ("Catalogue number", None),
        ("Product code", None),
        ("Price", None),
        ("", None),
        (None, None),
    ],
)
def test_heading_roles(heading, role):
    assert heading_role(heading) == role


def test_header_below_titles():
    rows = [
        ["Quillbrook price list"],
        ["prices excl. VAT"],
        [],
        ["Cat. no.", "Product description", "Mol. wt."],
    ]
    layout = find_layout(rows)
    assert layout.header_index == 3
    assert dict(layout.roles) == {"name": 1, "molar_mass": 2}


def test_best_row_wins_and_duplicates_are_listed():
    rows = [["Name"], ["Name", "Formula", "Formula", "MW"]]
    layout = find_layout(rows)
    assert layout.header_index == 1
    assert layout.roles["formula"] == 1
    assert layout.duplicates and "column C" in layout.duplicates[0]


def test_header_beyond_row_20_is_not_found():
    rows = [["note"]] * 20 + [["Name", "Formula"]]
    with pytest.raises(CellchemError, match="first 20 rows"):
        find_layout(rows)


def test_overrides_by_letter_and_heading():
    rows = [["Stuff", "Chem", "Weight"], ["Sodium chloride", "NaCl", 58.44]]
    layout = find_layout(rows, read_overrides(["formula=B", "molar_mass=Weight", "name=A"]))
    assert dict(layout.roles) == {"formula": 1, "molar_mass": 2, "name": 0}
    with pytest.raises(CellchemError, match="no column headed"):
        find_layout(rows, {"formula": "Formel"})


def test_an_override_that_reads_two_ways_is_refused():
    # 'B' is the heading of column A and the letter of column B
    rows = [["B", "Formula"], ["x", "NaCl"]]
    with pytest.raises(CellchemError, match="both the heading of column A and the letter of column B"):
        find_layout(rows, {"formula": "B"})


@pytest.mark.parametrize(
    "spec, words", [("formula", "ROLE=HEADER"), ("colour=B", "not a role"), ("formula=", "no heading")]
)
def test_bad_override_specs(spec, words):
    with pytest.raises(CellchemError, match=words):
        read_overrides([spec])
