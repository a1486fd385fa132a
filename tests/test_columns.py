"""Header rows and column roles. Headings are those printed on supplier price
lists and stores inventories (common practice); column letters follow the
spreadsheet convention A..Z, AA.. (common practice, the OOXML cell reference)."""

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cellchem import CellchemError
from cellchem.columns import (
    NO_ROLES,
    NO_TABLE,
    NOT_MATCHED,
    ROLES,
    LayoutError,
    column_index,
    column_letter,
    find_layout,
    heading_role,
    read_column_options,
    read_heading,
    read_overrides,
)


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


# -- headings as people write them ----------------------------------------------------------------

# Every heading the table held before headings were read by their words (common practice): each must
# keep its role.
EARLIER_HEADINGS = {
    "name": "name|chemical name|chemical|substance|substance name|product|product name|product description|"
    "description|item|item name|item description|reagent|reagent name|material|material name|compound|"
    "compound name|iupac name|common name|chemical description",
    "formula": "formula|chemical formula|molecular formula|empirical formula|linear formula|mol. formula|"
    "hill formula|sum formula",
    "molar_mass": "molar mass|molar mass g/mol|molecular weight|molecular mass|mol. wt.|mol. wt|mol wt|mw|"
    "m.w.|fw|f.w.|formula weight|formula mass|relative molecular mass|relative formula mass|mr|g/mol",
    "cas": "cas|cas no|cas no.|cas number|cas rn|cas#|cas #|cas-no|cas-no.|cas-nr|cas nr|"
    "cas registry number|cas reg. no.|cas-number",
    "concentration": "concentration|conc|conc.|strength|molarity|solution strength",
    "quantity": "quantity|qty|qty.|amount|pack size|size|stock|on hand|qty on hand|quantity in stock|"
    "contents|net quantity",
    "unit": "unit|units|uom|unit of measure|pack unit",
}


@pytest.mark.parametrize(
    "heading, role", [(h, role) for role, hs in EARLIER_HEADINGS.items() for h in hs.split("|")]
)
def test_earlier_headings_keep_their_roles(heading, role):
    assert heading_role(heading) == role
    assert heading_role(heading.upper()) == role


@pytest.mark.parametrize(
    "heading, role",
    [
        # English, as printed on stock lists (common practice)
        ("Chem. formula", "formula"),
        ("Mol formula", "formula"),
        ("Name of chemical", "name"),
        ("Name of substance", "name"),
        ("Substance", "name"),
        ("Solute formula", "formula"),
        ("Weight, molecular", "molar_mass"),
        ("Formula, chemical", "formula"),
        ("MW [g/mol]", "molar_mass"),
        ("Molar mass g/mol", "molar_mass"),
        ("M.W.", "molar_mass"),
        ("Conc mol/L", "concentration"),
        ("CAS_No", "cas"),
        ("cas#", "cas"),
        ("CAS Reg. No.", "cas"),
        ("CASRN", "cas"),
        ("molar_mass", "molar_mass"),
        ("Formula / Formel", "formula"),  # both parts name the formula
        # German (common practice; the meaning of the words from memory)
        ("Summenformel", "formula"),
        ("Chemische Formel", "formula"),
        ("Bezeichnung", "name"),
        ("Stoffname", "name"),
        ("Name des Stoffes", "name"),
        ("Artikel", "name"),
        ("Molmasse", "molar_mass"),
        ("Molare Masse", "molar_mass"),
        ("Molare Masse (g/mol)", "molar_mass"),
        ("Mol.-Gew.", "molar_mass"),
        ("Molekulargewicht", "molar_mass"),
        ("CAS-Nummer", "cas"),
        ("CAS-Nr.", "cas"),
        ("Menge", "quantity"),
        ("Packungsgröße", "quantity"),
        ("Einheit", "unit"),
        ("Konz.", "concentration"),
    ],
)
def test_headings_read_by_their_words(heading, role):
    assert heading_role(heading) == role


@pytest.mark.parametrize(
    "heading",
    [
        "Artikel-Nr.",  # an article number, not the article
        "Art.-Nr.",
        "Stock no.",  # a stock number, not the quantity in stock
        "Cat. no.",
        "Item no.",
        "Product code",
        "No.",
        "Unit price",
        "Particle size",
        "Chem.",  # a name or a formula: not said
        "Supplier",
        "Location code",
        "CAS / EC No.",  # a CAS RN and an EC number: two roles, neither used
        "Quantity/Unit",
    ],
)
def test_headings_that_name_no_role(heading):
    assert heading_role(heading) is None


@pytest.mark.parametrize(
    "heading, role",
    [  # the columns of safety-data-sheet summaries and stock lists, English and German (common practice)
        ("EC No.", "ec"),
        ("EG-Nr.", "ec"),
        ("EINECS", "ec"),
        ("UN No.", "un"),
        ("UN-Nr.", "un"),
        ("Signal word", "signal_word"),
        ("Signalwort", "signal_word"),
        ("Hazard statements", "hazard_statements"),
        ("H-Sätze", "hazard_statements"),
        ("Gefahrenhinweise (H-Sätze)", "hazard_statements"),
        ("P-Statements", "precautionary_statements"),
        ("Sicherheitshinweise", "precautionary_statements"),
        ("GHS pictograms", "pictograms"),
        ("Piktogramme", "pictograms"),
        ("Storage class", "storage_class"),
        ("LGK", "storage_class"),
        ("Location", "location"),
        ("Lagerort", "location"),
        ("No. of packs", "count"),
        ("Anzahl", "count"),
        ("Pack size", "quantity"),
    ],
)
def test_headings_of_sds_and_store_columns(heading, role):
    assert heading_role(heading) == role


@pytest.mark.parametrize(
    "heading, roles",
    [
        ("Name/Formula", ("name", "formula")),
        ("Name (formula)", ("name", "formula")),
        ("Name, formula", ("name", "formula")),
        ("Formula & MW", ("formula", "molar_mass")),
        ("Bezeichnung / Summenformel", ("name", "formula")),
    ],
)
def test_a_heading_that_names_two_roles_is_used_for_neither(heading, roles):
    assert heading_role(heading) is None
    assert set(read_heading(heading).ambiguous) == set(roles)
    layout = find_layout([["Item", heading, "CAS No."], ["Sodium chloride", "NaCl", "7647-14-5"]])
    assert set(layout.roles) == {"name", "cas"}
    assert layout.roles["name"] == 0
    assert len(layout.ambiguous) == 1 and "column B" in layout.ambiguous[0]


_SEPARATORS = [" ", "-", "_", ". ", ".", " - ", "  "]


@settings(max_examples=300, deadline=None)
@given(
    data=st.data(),
    words_role=st.sampled_from(
        [
            (("cas", "no"), "cas"),
            (("cas", "number"), "cas"),
            (("molar", "mass"), "molar_mass"),
            (("mol", "wt"), "molar_mass"),
            (("molecular", "weight"), "molar_mass"),
            (("chem", "formula"), "formula"),
            (("molecular", "formula"), "formula"),
            (("chemical", "name"), "name"),
            (("product", "description"), "name"),
            (("qty", "on", "hand"), "quantity"),
            (("unit", "of", "measure"), "unit"),
        ]
    ),
)
def test_punctuation_and_case_do_not_change_a_role(data, words_role):
    words, role = words_role
    seps = [data.draw(st.sampled_from(_SEPARATORS)) for _ in words[1:]]
    text = words[0] + "".join(s + w for s, w in zip(seps, words[1:]))
    text = "".join(c.upper() if data.draw(st.booleans()) else c for c in text)
    text += data.draw(st.sampled_from(["", ".", ":", " (g/mol)", " [%]", " :"]))
    assert heading_role(text) == role, text


def test_the_heading_table_has_no_two_headings_with_the_same_words_and_other_roles(monkeypatch):
    from cellchem import columns

    columns._vocabulary.cache_clear()
    try:
        assert columns._vocabulary().in_order  # the shipped table loads
        rows = (
            {"role": "formula", "heading": "formula name", "means": ""},
            {"role": "name", "heading": "name formula", "means": ""},
        )
        monkeypatch.setattr(columns, "read_table", lambda name: rows)
        columns._vocabulary.cache_clear()
        with pytest.raises(ValueError, match="another heading gives the role"):
            columns._vocabulary()
    finally:
        monkeypatch.undo()
        columns._vocabulary.cache_clear()
        columns.read_heading.cache_clear()


def test_every_word_row_means_something_and_every_heading_row_has_a_role():
    from cellchem.tables import read_table

    for row in read_table("header_words.csv"):
        assert row["source"]
        assert row["role"] in ROLES + ("word", "drop", "none"), row
        if row["role"] == "word":
            assert row["means"], row
        else:
            assert not row["means"], row


# -- one role a column; columns the user names ---------------------------------------------------

SHEET = [["Item", "Formula", "CAS No.", "Chem"], ["Sodium chloride", "NaCl", "7647-14-5", "NaCl"]]


def test_a_column_the_user_names_gives_up_the_role_of_its_heading():
    layout = find_layout(SHEET, {"formula": "C"})
    assert layout.roles["formula"] == 2 and "cas" not in layout.roles
    assert sorted(layout.roles.values()) == sorted(set(layout.roles.values()))
    assert any("column C 'CAS No.' is read as formula" in r for r in layout.replaced)
    assert any("column B 'Formula' is not read as formula" in r for r in layout.replaced)


def test_two_roles_for_one_column_are_refused():
    with pytest.raises(CellchemError, match="two roles"):
        find_layout(SHEET, {"formula": "D", "name": "Chem"})


def test_columns_for_every_table_that_do_not_fit_are_not_matched():
    # a heading the table lacks
    with pytest.raises(LayoutError) as info:
        find_layout(SHEET, general={"formula": "Summenformel"})
    assert info.value.kind == NOT_MATCHED and info.value.general
    # a letter whose heading here names another role
    with pytest.raises(LayoutError) as info:
        find_layout(SHEET, general={"formula": "C"})
    assert info.value.kind == NOT_MATCHED and "CAS No." in str(info.value)
    # a letter for a role this table has in another column
    with pytest.raises(LayoutError) as info:
        find_layout(SHEET, general={"formula": "D"})
    assert info.value.kind == NOT_MATCHED and "column here is B" in str(info.value)
    # a letter that fits: the table's own heading is not recognised there
    layout = find_layout([["Item", "Zusammensetzung"], ["Salt", "NaCl"]], general={"formula": "B"})
    assert layout.roles == {"name": 0, "formula": 1}
    # the same for this table alone is the user's word
    assert find_layout(SHEET, {"formula": "D"}).roles["formula"] == 3


def test_the_header_row_the_user_gives():
    rows = [["Note"]] * 25 + [["Bezeichnung", "Summenformel"], ["Natriumchlorid", "NaCl"]]
    with pytest.raises(LayoutError) as info:
        find_layout(rows)
    assert info.value.kind == NO_TABLE
    layout = find_layout(rows, header_index=25)
    assert layout.header_index == 25 and layout.roles == {"name": 0, "formula": 1}
    with pytest.raises(LayoutError, match="empty"):
        find_layout([["Name"], []], header_index=1)


def test_a_table_without_name_or_formula_is_told_from_a_page_of_notes():
    with pytest.raises(LayoutError) as info:
        find_layout([["Stores list"], ["Code", "Menge", "Einheit", "CAS-Nr."], ["A1", 5, "g", "7647-14-5"]])
    assert info.value.kind == NO_ROLES and info.value.header_index == 1
    with pytest.raises(LayoutError) as info:
        find_layout([["These notes are about the stores."], ["Ask the technician before use."]])
    assert info.value.kind == NO_TABLE


def test_column_options_by_sheet():
    options = read_column_options(
        ["formula=C", "Old stock:formula=B", "Old stock: mass=MW", "name=Item"], ["4", "Old stock:1"]
    )
    assert options.for_sheet("Old stock") == ({"formula": "B", "molar_mass": "MW"}, {"name": "Item"}, 1)
    assert options.for_sheet("old STOCK")[2] == 1  # sheet names are compared without case, as Excel does
    assert options.for_sheet("Stock") == ({}, {"formula": "C", "name": "Item"}, 4)
    assert options.sheets_named() == {"Old stock"}


@pytest.mark.parametrize(
    "columns, rows, words",
    [
        (["formula=C", "formula=D"], [], "already given"),
        (["formula=C", "name=c"], [], "a column holds one role"),
        ([":formula=C"], [], "no sheet name"),
        (["Stock:colour=C"], [], "not a role"),
        ([], ["0"], "from 1 to"),
        ([], ["four"], "expected a row number"),
        ([], ["2", "3"], "already given"),
        ([], ["S:2", "S:3"], "already given"),
    ],
)
def test_bad_column_options(columns, rows, words):
    with pytest.raises(CellchemError, match=words):
        read_column_options(columns, rows)


def test_read_overrides_refuses_a_sheet():
    assert read_overrides(["formula=Formel: chem"]) == {"formula": "Formel: chem"}
    with pytest.raises(CellchemError, match="one table"):
        read_overrides(["Stock:formula=C"])
