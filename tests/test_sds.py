"""Safety-data-sheet cells: EC numbers, UN numbers, H/P/EUH statements, signal words, pictograms.

Check values and their sources:

- EC check digit: the European Commission's / ECHA's description of the EC number format
  (from memory): the first six digits weighted 1 to 6 from the left, summed, modulo 11; a
  remainder of 10 is never assigned. The EC numbers below are well known (from memory); each
  one's check digit is worked by hand in the comment beside it. Witness: the EINECS numbers
  among the synonyms of the PubChem-derived tables of the PyPI package chemicals (1.5.2),
  which give water EINECS 231-791-2.
- UN numbers: UN Recommendations on the Transport of Dangerous Goods, Model Regulations,
  Dangerous Goods List (from memory), typed in below, not read from cellchem's table.
- Signal words and pictograms of H codes: GHS Rev. 9 Annexes 1 and 3 and the CLP Annex I label
  tables (from memory), typed in below.
- Pictogram precedence: CLP Article 26(1) (a)-(e).
- The SDS cells are spelled as supplier SDSs write them (common practice).
"""

import csv
import io
import re
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

from cellchem import audit, sds
from cellchem.cas import cas_is_valid
from cellchem.errors import CellchemError
from cellchem.sds import (
    SdsFinding,
    check_ec,
    check_hazards,
    check_un,
    ec_is_valid,
    expected_pictograms,
    expected_signal_word,
    read_ec,
    read_pictograms,
    read_signal_word,
    read_statements,
    read_un,
    un_numbers_for,
)

DATA = Path(__file__).resolve().parents[1] / "cellchem" / "data"


def read_rows(filename: str) -> tuple[list[str], list[dict[str, str]]]:
    text = (DATA / filename).read_text(encoding="utf-8")
    lines = [line for line in text.splitlines() if line.strip() and not line.startswith("#")]
    reader = csv.DictReader(io.StringIO("\n".join(lines)))
    return list(reader.fieldnames or []), [dict(row) for row in reader]


# ---------------------------------------------------------------------------
# EC numbers
# ---------------------------------------------------------------------------


def _weighted(six: str) -> int:
    """The published rule, worked here independently of cellchem."""
    return sum(int(d) * i for i, d in enumerate(six, 1)) % 11


KNOWN_EC = [
    "231-791-2",  # water: 2+6+3+28+45+6 = 90 = 8x11 + 2
    "231-598-3",  # sodium chloride: 2+6+3+20+45+48 = 124 = 11x11 + 3
    "200-578-6",  # ethanol: 2+0+0+20+35+48 = 105 = 9x11 + 6
    "200-662-2",  # acetone: 2+0+0+24+30+12 = 68 = 6x11 + 2
    "231-639-5",  # sulfuric acid: 2+6+3+24+15+54 = 104 = 9x11 + 5
    "215-185-5",  # sodium hydroxide: 2+2+15+4+40+30 = 93 = 8x11 + 5
]


def test_hand_worked_ec_check_digits():
    assert [_weighted(n[:3] + n[4:7]) for n in KNOWN_EC] == [2, 3, 6, 2, 5, 5]


@pytest.mark.parametrize("number", KNOWN_EC)
def test_known_ec_numbers(number):
    assert read_ec(number) == number
    assert ec_is_valid(number)


@pytest.mark.parametrize(
    "text",
    ["231-791-2", "2317912", "  231-791-2 ", "EC 231-791-2", "EC No. 231-791-2", "EG-Nr.: 231-791-2",
     "EINECS 231-791-2", "einecs: 2317912", "231‑791‑2", "231 791 2"],
)  # fmt: skip
def test_ec_written_forms(text):
    assert read_ec(text) == "231-791-2"


def test_wrong_ec_check_digit_names_both_digits():
    with pytest.raises(CellchemError) as info:
        read_ec("231-791-3")
    message = str(info.value)
    assert "'231-791-3'" in message and "call for 2, found 3" in message and "typo" in message
    assert info.value.choices == ("231-791-2",)
    assert not ec_is_valid("231-791-3")


def test_check_ec_findings():
    (finding,) = check_ec("200-578-5")  # ethanol's number with a wrong last digit
    assert (finding.severity, finding.field) == ("error", "ec") and "'200-578-5'" in finding.message
    assert check_ec("EC 200-578-6") == [] and check_ec(None) == [] and check_ec(" ") == []


def test_ec_remainder_ten_is_never_valid():
    # 200-005: 2x1 + 5x6 = 32 = 2x11 + 10: no check digit can follow
    assert _weighted("200005") == 10
    for check in range(10):
        with pytest.raises(CellchemError, match="leave 10"):
            read_ec(f"200-005-{check}")


@pytest.mark.parametrize("text", ["231-79-12", "23179", "abc", "", "231-791", "CAS 231-791-2", "231-791-22"])
def test_ec_format_refusals(text):
    with pytest.raises(CellchemError, match="not an EC number"):
        read_ec(text)
    assert not ec_is_valid(text)


def test_ec_witness_chemicals_package():
    """Every EINECS/EC number among the synonyms of the chemicals package's identifier
    tables passes cellchem's check (the tables are PubChem-derived, not cellchem's)."""
    chemicals = pytest.importorskip("chemicals")
    folder = Path(chemicals.__file__).parent / "Identifiers"
    pattern = re.compile(r"(?:EINECS|EC)\s*:?\s*([0-9]{3}-[0-9]{3}-[0-9])(?![0-9])", re.IGNORECASE)
    numbers: dict[str, set[str]] = {}
    for name in ("chemical identifiers pubchem small.tsv", "Inorganic db.tsv"):
        for line in (folder / name).read_text(encoding="utf-8").splitlines():
            fields = line.split("\t")
            for m in pattern.finditer(line):
                numbers.setdefault(m.group(1), set()).add(fields[1] if len(fields) > 1 else "")
    assert len(numbers) > 100
    assert "7732-18-5" in numbers["231-791-2"]  # water, as given from memory above
    assert all(ec_is_valid(n) for n in numbers), [n for n in numbers if not ec_is_valid(n)]


def _valid_ec():
    return (
        st.text("0123456789", min_size=6, max_size=6)
        .filter(lambda six: _weighted(six) != 10)
        .map(lambda six: f"{six}{_weighted(six)}")
    )


@given(_valid_ec(), st.sampled_from(["{a}-{b}-{c}", "{a}{b}{c}", " EC {a}-{b}-{c} ", "EINECS {a}{b}{c}"]))
def test_any_accepted_writing_gives_the_canonical_form(seven, pattern):
    a, b, c = seven[:3], seven[3:6], seven[6]
    assert read_ec(pattern.format(a=a, b=b, c=c)) == f"{a}-{b}-{c}"


@given(_valid_ec(), st.integers(1, 9))
def test_any_other_check_digit_is_refused(seven, shift):
    wrong = (int(seven[6]) + shift) % 10
    if wrong == int(seven[6]):
        return
    with pytest.raises(CellchemError, match="fails its check digit"):
        read_ec(seven[:6] + str(wrong))


# ---------------------------------------------------------------------------
# UN numbers
# ---------------------------------------------------------------------------


@pytest.mark.parametrize("text", ["UN1789", "UN 1789", "1789", "UN-1789", "un1789", " UN 1789 ", 1789])
def test_un_written_forms(text):
    assert read_un(text) == "UN1789"


def test_un_explosives_keep_leading_zeros():
    assert read_un("UN0222") == "UN0222"


@pytest.mark.parametrize(
    "text, words",
    [("UN789", "3 digits"), ("789", "3 digits"), ("UN17890", "5 digits"), ("UN0000", "not assigned"),
     ("NA1993", "not a UN number"), ("UN", "not a UN number"), ("", "not a UN number")],
)  # fmt: skip
def test_un_refusals(text, words):
    with pytest.raises(CellchemError, match=words):
        read_un(text)


# From the Dangerous Goods List (from memory): substance -> UN numbers it ships under.
UN_CHECKS = [
    ("7647-01-0", None, {"UN1789", "UN1050"}),  # hydrochloric acid; hydrogen chloride, anhydrous
    ("7664-93-9", None, {"UN1830", "UN2796"}),  # sulphuric acid > 51 %, <= 51 %
    ("7697-37-2", None, {"UN2031", "UN2032"}),  # nitric acid; red fuming
    ("64-19-7", None, {"UN2789", "UN2790"}),  # acetic acid glacial / > 80 %; solution
    ("1310-73-2", None, {"UN1823", "UN1824"}),  # sodium hydroxide solid; solution
    ("1310-58-3", None, {"UN1813", "UN1814"}),  # potassium hydroxide solid; solution
    ("7722-84-1", None, {"UN2014", "UN2015", "UN2984"}),  # hydrogen peroxide solutions
    ("1336-21-6", None, {"UN2672", "UN2073", "UN3318"}),  # ammonia solutions
    ("67-56-1", None, {"UN1230"}),  # methanol
    ("64-17-5", None, {"UN1170"}),  # ethanol
    ("67-64-1", None, {"UN1090"}),  # acetone
    (None, "H3PO4", {"UN1805", "UN3453"}),  # phosphoric acid, solution; solid
]


@pytest.mark.parametrize("cas, formula, expected", UN_CHECKS)
def test_un_numbers_of_common_reagents(cas, formula, expected):
    assert expected <= {entry.un for entry in un_numbers_for(cas, formula)}


def test_un_entry_fields():
    (entry,) = un_numbers_for(cas="67-64-1")
    assert (entry.un, entry.shipping_name, entry.cas) == ("UN1090", "ACETONE", "67-64-1")


def test_unlisted_and_isomeric_formulas_find_nothing():
    assert un_numbers_for(cas="7732-18-5") == ()  # water: not dangerous goods
    assert un_numbers_for(formula="C3H6O") == ()  # acetone, propanal, allyl alcohol ...
    assert un_numbers_for() == ()
    assert un_numbers_for(cas="64-19-6") == ()  # a wrong check digit finds nothing


def test_un_number_of_another_substance_is_a_warning():
    (finding,) = check_un("UN1830", cas="7647-01-0")
    assert (finding.severity, finding.field) == ("warning", "un")
    assert "'UN1830'" in finding.message and "UN1789" in finding.message
    assert "UN1830 is listed for CAS RN 7664-93-9" in finding.message  # sulphuric acid
    assert "\n" not in finding.message


def test_un_checks_that_find_nothing():
    assert check_un("UN1789", cas="7647-01-0") == []
    assert check_un("UN 2789", formula="CH3COOH") == []
    assert check_un("UN1090", cas="7732-18-5") == []  # water is not listed: never a guess
    assert check_un("UN1090", formula="C3H6O") == []
    assert check_un("", cas="7647-01-0") == [] and check_un(None) == []


def test_un_with_three_digits_is_an_error():
    (finding,) = check_un("UN789", cas="7647-01-0")
    assert (finding.severity, finding.field) == ("error", "un") and "'UN789'" in finding.message


def test_un_table_rows_witnessed_by_the_chemicals_package():
    chemicals = pytest.importorskip("chemicals")
    from chemicals.elements import nested_formula_parser
    from chemicals.identifiers import search_chemical

    columns, rows = read_rows("un_numbers.csv")
    assert columns == ["cas", "formula", "un", "shipping_name", "condition", "source"]
    assert 30 <= len(rows) <= 60
    for row in rows:
        assert cas_is_valid(row["cas"]), row
        assert re.fullmatch(r"UN[0-9]{4}", row["un"]), row
        assert "UN Model Regulations" in row["source"] and "(from memory)" in row["source"]
        record = search_chemical(row["cas"])
        for formula in filter(None, row["formula"].split("|")):
            assert nested_formula_parser(formula) == nested_formula_parser(record.formula), (row, record)
    assert chemicals is not None


# ---------------------------------------------------------------------------
# Reading cells of statements
# ---------------------------------------------------------------------------

REAL_CELLS = [
    ("H225, H319, H336", (("H225",), ("H319",), ("H336",))),
    ("H301+H311+H331", (("H301", "H311", "H331"),)),
    ("H301 + H311 + H331", (("H301", "H311", "H331"),)),
    ("P210 - P233 - P240", (("P210",), ("P233",), ("P240",))),
    ("EUH066", (("EUH066",),)),
    ("H314 Causes severe skin burns and eye damage.", (("H314",),)),
    ("H290; H314", (("H290",), ("H314",))),
    ("h302", (("H302",),)),
    ("P305+P351+P338", (("P305", "P351", "P338"),)),
    ("P305 + P351 + P338 IF IN EYES: Rinse cautiously with water.", (("P305", "P351", "P338"),)),
    ("H225 Highly flammable liquid and vapour.\nH319 Causes serious eye irritation.", (("H225",), ("H319",))),
    ("H373 (Liver, Kidney)", (("H373",),)),
    ("H360FD, H361fd", (("H360FD",), ("H361fd",))),
    ("H350i", (("H350i",),)),
    ("P403+P233 Store in a well-ventilated place. Keep container tightly closed.", (("P403", "P233"),)),
    ("P501 / P273", (("P501",), ("P273",))),
    ("EUH 066", (("EUH066",),)),
    ("H360D***, H361f***", (("H360D",), ("H361f",))),  # CLP Annex VI marks translated classifications
    ("-", ()),
    ("", ()),
]  # fmt: skip


@pytest.mark.parametrize("cell, expected", REAL_CELLS)
def test_real_sds_spellings(cell, expected):
    assert read_statements(cell) == expected


@pytest.mark.parametrize(
    "cell, words, position",
    [
        ("H999", "unknown statement code 'H999'", 1),
        ("H225, H999", "unknown statement code 'H999'", 7),
        ("H3O1", "malformed statement code 'H3O1'", 1),
        ("H225, H3O1", "letter O for a zero", 7),
        ("P210+P301", "different sections", 1),
        ("P301+P310, P260+P304", "different sections", 12),
        ("H225+EUH066", "different kinds", 1),
        ("H301+", "ends the cell", 5),
        ("+H301", "does not join two codes", 1),
        ("H301+toxic", "not a code", 5),
        ("h360fd", "H360FD or H360Fd", 1),
    ],
)
def test_statement_refusals_name_token_and_position(cell, words, position):
    with pytest.raises(CellchemError, match=re.escape(words)) as info:
        read_statements(cell)
    assert info.value.position == position
    assert f"position {position}" in str(info.value)


def test_text_without_codes_is_refused():
    with pytest.raises(CellchemError, match="no statement code"):
        read_statements("Highly flammable")


def test_h2o_inside_statement_text_is_text():
    assert read_statements("EUH014 Reacts violently with water (H2O)") == (("EUH014",),)


# ---------------------------------------------------------------------------
# The table against the GHS and CLP (check values typed in, from memory)
# ---------------------------------------------------------------------------

D, W, N = "Danger", "Warning", ""
# code: (signal words, pictograms) as GHS Rev. 9 Annex 1/3 and CLP Annex I give them (from memory)
GHS_LABELS = {
    "H200": ({D}, {"GHS01"}),
    "H201": ({D}, {"GHS01"}),
    "H204": ({W}, {"GHS01"}),
    "H205": ({D}, set()),  # division 1.5: no pictogram
    "H220": ({D}, {"GHS02"}),
    "H222": ({D}, {"GHS02"}),
    "H223": ({W}, {"GHS02"}),
    "H224": ({D}, {"GHS02"}),
    "H225": ({D}, {"GHS02"}),
    "H226": ({W}, {"GHS02"}),
    "H227": ({W}, set()),  # GHS flammable liquid category 4
    "H228": ({D, W}, {"GHS02"}),
    "H240": ({D}, {"GHS01"}),
    "H241": ({D}, {"GHS01", "GHS02"}),
    "H242": ({D, W}, {"GHS02"}),
    "H250": ({D}, {"GHS02"}),
    "H251": ({D}, {"GHS02"}),
    "H252": ({W}, {"GHS02"}),
    "H260": ({D}, {"GHS02"}),
    "H261": ({D, W}, {"GHS02"}),
    "H270": ({D}, {"GHS03"}),
    "H271": ({D}, {"GHS03"}),
    "H272": ({D, W}, {"GHS03"}),
    "H280": ({W}, {"GHS04"}),
    "H281": ({W}, {"GHS04"}),
    "H290": ({W}, {"GHS05"}),
    "H300": ({D}, {"GHS06"}),
    "H301": ({D}, {"GHS06"}),
    "H302": ({W}, {"GHS07"}),
    "H303": ({W}, set()),
    "H304": ({D}, {"GHS08"}),
    "H305": ({W}, {"GHS08"}),
    "H310": ({D}, {"GHS06"}),
    "H312": ({W}, {"GHS07"}),
    "H314": ({D}, {"GHS05"}),
    "H315": ({W}, {"GHS07"}),
    "H316": ({W}, set()),
    "H317": ({W}, {"GHS07"}),
    "H318": ({D}, {"GHS05"}),
    "H319": ({W}, {"GHS07"}),
    "H320": ({W}, set()),
    "H330": ({D}, {"GHS06"}),
    "H331": ({D}, {"GHS06"}),
    "H332": ({W}, {"GHS07"}),
    "H334": ({D}, {"GHS08"}),
    "H335": ({W}, {"GHS07"}),
    "H336": ({W}, {"GHS07"}),
    "H340": ({D}, {"GHS08"}),
    "H341": ({W}, {"GHS08"}),
    "H350": ({D}, {"GHS08"}),
    "H351": ({W}, {"GHS08"}),
    "H360": ({D}, {"GHS08"}),
    "H361": ({W}, {"GHS08"}),
    "H362": ({N}, set()),  # lactation: no signal word, no pictogram
    "H370": ({D}, {"GHS08"}),
    "H371": ({W}, {"GHS08"}),
    "H372": ({D}, {"GHS08"}),
    "H373": ({W}, {"GHS08"}),
    "H400": ({W}, {"GHS09"}),
    "H401": ({N}, set()),
    "H410": ({W}, {"GHS09"}),
    "H411": ({N}, {"GHS09"}),  # chronic 2: pictogram, no signal word
    "H412": ({N}, set()),
    "H413": ({N}, set()),
    "H420": ({W}, {"GHS07"}),
    "EUH066": ({N}, set()),
    "EUH071": ({N}, set()),
}


@pytest.mark.parametrize("code", sorted(GHS_LABELS))
def test_signal_word_and_pictograms_of_each_code(code):
    words, pictograms = GHS_LABELS[code]
    allowed, reason = expected_signal_word([code])
    assert allowed == words and "\n" not in reason
    required, also = expected_pictograms([code])
    assert required == pictograms and also == pictograms


def test_h221_flammable_gas_1b_or_2():
    # 1B: Danger with the flame; 2: Warning without pictogram (CLP Table 2.2.2)
    assert expected_signal_word(["H221"])[0] == {D, W}
    assert expected_pictograms(["H221"]) == (frozenset(), frozenset({"GHS02"}))


# Every H code of GHS Annex 3 and CLP (from memory), EU suffixed codes included.
H_CODES = (
    "H200 H201 H202 H203 H204 H205 H206 H207 H208 H220 H221 H222 H223 H224 H225 H226 H227 H228 H229"
    " H230 H231 H232 H240 H241 H242 H250 H251 H252 H260 H261 H270 H271 H272 H280 H281 H290 H300 H301"
    " H302 H303 H304 H305 H310 H311 H312 H313 H314 H315 H316 H317 H318 H319 H320 H330 H331 H332 H333"
    " H334 H335 H336 H340 H341 H350 H350i H351 H360 H360F H360D H360FD H360Fd H360Df H361 H361f H361d"
    " H361fd H362 H370 H371 H372 H373 H400 H401 H402 H410 H411 H412 H413 H420"
).split()
EUH_CODES = (
    "EUH014 EUH018 EUH019 EUH029 EUH031 EUH032 EUH044 EUH066 EUH070 EUH071 EUH201 EUH201A EUH202"
    " EUH203 EUH204 EUH205 EUH206 EUH207 EUH208 EUH209 EUH209A EUH210 EUH211 EUH212 EUH380 EUH381"
    " EUH401 EUH430 EUH431 EUH440 EUH441 EUH450 EUH451"
).split()
P_CODES = (
    "P101 P102 P103 P201 P202 P210 P211 P220 P222 P223 P230 P231 P232 P233 P234 P235 P240 P241 P242"
    " P243 P244 P250 P251 P260 P261 P262 P263 P264 P270 P271 P272 P273 P280 P282 P283 P284 P301 P302"
    " P303 P304 P305 P306 P308 P310 P311 P312 P313 P314 P315 P320 P321 P330 P331 P332 P333 P334 P335"
    " P336 P337 P338 P340 P342 P351 P352 P353 P360 P361 P362 P363 P364 P370 P371 P372 P373 P375 P376"
    " P377 P378 P380 P381 P390 P391 P401 P402 P403 P404 P405 P406 P407 P410 P411 P412 P413 P420 P501"
    " P502"
).split()


def test_table_holds_every_code():
    _, rows = read_rows("ghs_statements.csv")
    codes = {row["code"] for row in rows}
    missing = [code for code in H_CODES + EUH_CODES + P_CODES if code not in codes]
    assert not missing


def test_table_shape_and_sources():
    columns, rows = read_rows("ghs_statements.csv")
    assert columns == [
        "code",
        "kind",
        "hazard_class",
        "category",
        "signal_word",
        "pictograms",
        "note",
        "source",
    ]
    assert len({row["code"] for row in rows}) == len(rows)
    pictogram_cell = re.compile(
        r"^$|^not given$|^(?:GHS0[1-9](?:\|GHS0[1-9])*|none)( or (?:GHS0[1-9]|none))*$"
    )
    for row in rows:
        assert row["kind"] in ("H", "P", "EUH") and row["code"].startswith(row["kind"]), row
        assert row["signal_word"] in ("", "Danger", "Warning", "Danger|Warning", "not given"), row
        assert pictogram_cell.match(row["pictograms"]), row
        assert "(read)" in row["source"] or "(from memory)" in row["source"] or "read in" in row["source"], (
            row
        )
        if row["kind"] == "P":
            assert not (row["hazard_class"] or row["category"] or row["signal_word"] or row["pictograms"]), (
                row
            )
    header = (DATA / "ghs_statements.csv").read_text(encoding="utf-8")
    assert "GHS" in header and "Rev. 9" in header and "from memory" in header


@pytest.mark.parametrize("code", ["H227", "H303", "H305", "H313", "H316", "H320", "H333", "H401", "H402"])
def test_codes_the_eu_does_not_use_are_marked(code):
    assert "GHS only" in sds.statement(code).note


# ---------------------------------------------------------------------------
# Signal words
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, word",
    [("Danger", D), ("DANGER", D), ("danger", D), ("Gefahr", D), ("Warning", W), ("WARNING", W),
     ("Achtung", W), ("-", N), ("none", N), ("n/a", N), ("keine", N), ("Danger!", D)],
)  # fmt: skip
def test_read_signal_word(text, word):
    assert read_signal_word(text) == word


def test_unknown_signal_word():
    with pytest.raises(CellchemError, match="'Caution' is not a signal word"):
        read_signal_word("Caution")


def test_signal_word_precedence():
    assert expected_signal_word(["H225", "H319"])[0] == {D}  # Danger wins over Warning
    assert expected_signal_word(["H228", "H315"])[0] == {D, W}  # H228 decides
    assert expected_signal_word(["H228", "H314"])[0] == {D}  # H314 only carries Danger
    assert expected_signal_word(["H412", "EUH066"])[0] == {N}
    assert expected_signal_word(["EUH380"])[0] == {D}  # CLP 2023 hazard class ED HH 1
    assert "H228" in expected_signal_word(["H228"])[1]


def test_signal_word_of_p_codes_is_refused():
    with pytest.raises(CellchemError, match="precautionary"):
        expected_signal_word(["P210"])


def _only(findings, field):
    return [f for f in findings if f.field == field]


def test_warning_where_danger_is_needed():
    (finding,) = check_hazards("H225, H319", signal_word="Warning")
    assert (finding.severity, finding.field, finding.suggestion) == ("error", "signal word", "Danger")
    assert "'Warning'" in finding.message and "'H225, H319'" in finding.message


def test_danger_where_only_warning():
    (finding,) = check_hazards("H315, H319, H335", signal_word="Danger")
    assert (finding.severity, finding.suggestion) == ("error", "Warning")


def test_signal_word_without_any_statement_that_carries_one():
    (finding,) = check_hazards("H412", signal_word="Warning")
    assert finding.severity == "error" and "none of which carries a signal word" in finding.message


def test_missing_signal_word_where_one_is_needed():
    (finding,) = check_hazards("H314", signal_word="-")
    assert (finding.severity, finding.suggestion) == ("error", "Danger")


def test_ambiguous_code_is_noted_only_when_it_decides():
    (note,) = check_hazards("H228, H315", signal_word="Warning")
    assert (note.severity, note.field) == ("note", "signal word") and "H228" in note.message
    assert check_hazards("H228, H314", signal_word="Danger") == []  # H314 decides: no note


def test_consistent_lines_give_no_finding():
    assert check_hazards("H225, H319", "P210, P233, P305+P351+P338", "Danger", "GHS02, GHS07") == []
    assert check_hazards("H290, H314", "P280, P301+P330+P331", "Gefahr", "GHS05") == []
    assert check_hazards("H412", "P273", "-", "-") == []
    assert check_hazards("H302, H315, H319", None, "Achtung", "exclamation mark") == []


def test_blank_cells_are_not_given():
    assert check_hazards() == []
    assert check_hazards("H314", "", "", "  ") == []
    assert check_hazards(None, None, "Danger", "GHS05") == []


def test_codes_whose_label_elements_the_table_lacks_are_not_judged():
    findings = check_hazards("H209", signal_word="Danger", pictograms="GHS01")
    assert [f.severity for f in findings] == ["note", "note"]


# ---------------------------------------------------------------------------
# Pictograms
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "text, pictograms",
    [("GHS02, GHS07", {"GHS02", "GHS07"}), ("GHS02/GHS07", {"GHS02", "GHS07"}), ("ghs05", {"GHS05"}),
     ("GHS 06", {"GHS06"}), ("GHS2", {"GHS02"}), ("GHS02 GHS07", {"GHS02", "GHS07"}),
     ("flame, exclamation mark", {"GHS02", "GHS07"}), ("Skull and crossbones", {"GHS06"}),
     ("corrosion; health hazard; environment", {"GHS05", "GHS08", "GHS09"}),
     ("gas cylinder, exploding bomb, flame over circle", {"GHS01", "GHS03", "GHS04"}),
     ("Flamme, Ausrufezeichen", {"GHS02", "GHS07"}), ("-", set()), ("none", set()),
     ("GHS 02 GHS 07", {"GHS02", "GHS07"}), ("GHS07 (exclamation mark)", {"GHS07"}),
     ("GHS02 - GHS07", {"GHS02", "GHS07"}), ("flame over circle", {"GHS03"})],
)  # fmt: skip
def test_read_pictograms(text, pictograms):
    assert read_pictograms(text) == pictograms


@pytest.mark.parametrize(
    "text, words",
    [("02, 07", "bare number"), ("GHS10", "unknown pictogram 'GHS10'"), ("GHS00", "unknown"),
     ("Xi", "former EU directives"), ("flame, skull", "unknown pictogram 'skull' at position 8")],
)  # fmt: skip
def test_pictogram_refusals(text, words):
    with pytest.raises(CellchemError, match=re.escape(words)):
        read_pictograms(text)


# CLP Article 26(1): (required, allowed)
PRECEDENCE = [
    (["H301", "H302"], {"GHS06"}, {"GHS06", "GHS07"}),  # (b) GHS06 takes GHS07 away
    (["H331", "H319"], {"GHS06"}, {"GHS06", "GHS07"}),  # (b) GHS07 does not appear at all
    (["H314", "H315", "H319"], {"GHS05"}, {"GHS05", "GHS07"}),  # (c) irritation under corrosion
    (["H290", "H319"], {"GHS05"}, {"GHS05", "GHS07"}),  # (c) GHS05 from corrosive to metals
    (["H314", "H302"], {"GHS05", "GHS07"}, {"GHS05", "GHS07"}),  # (c) not for acute toxicity
    (["H334", "H317", "H319"], {"GHS08"}, {"GHS07", "GHS08"}),  # (d)
    (["H334", "H335"], {"GHS07", "GHS08"}, {"GHS07", "GHS08"}),  # (d) not for STOT SE 3
    (["H351", "H317"], {"GHS07", "GHS08"}, {"GHS07", "GHS08"}),  # (d) only for H334's GHS08
    (["H201", "H272"], {"GHS01"}, {"GHS01", "GHS03"}),  # (a)
    (["H241", "H225"], {"GHS01", "GHS02"}, {"GHS01", "GHS02"}),  # (a) type B carries both
    (["H220", "H280"], {"GHS02"}, {"GHS02", "GHS04"}),  # (e)
    (["H270", "H280"], {"GHS03", "GHS04"}, {"GHS03", "GHS04"}),  # oxygen: both
]


@pytest.mark.parametrize("codes, required, allowed", PRECEDENCE)
def test_pictogram_precedence(codes, required, allowed):
    assert expected_pictograms(codes) == (frozenset(required), frozenset(allowed))


def test_missing_pictogram_is_an_error():
    # H314 (skin corrosion 1) carries GHS05 in every category (GHS Annex 3, from memory)
    (finding,) = check_hazards("H225, H314", pictograms="GHS02")
    assert (finding.severity, finding.field) == ("error", "pictograms")
    assert "GHS05" in finding.message and "H314" in finding.message


def test_extra_pictogram_is_a_warning():
    (finding,) = check_hazards("H225", pictograms="GHS02, GHS06")
    assert finding.severity == "warning" and "GHS06" in finding.message and "none" in finding.message


def test_signal_word_without_statements_where_the_table_has_their_column():
    (finding,) = check_hazards(None, signal_word="Warning", statements_column=True)
    assert (finding.severity, finding.field) == ("warning", "signal word")
    assert check_hazards(None, signal_word="Warning") == []  # no statements column: nothing to compare
    assert check_hazards(None, signal_word="-", statements_column=True) == []


def test_optional_pictogram_shown_is_fine():
    assert check_hazards("H301, H315", pictograms="GHS06, GHS07") == []
    assert check_hazards("H301, H315", pictograms="GHS06") == []


def test_unreadable_pictogram_cell_is_an_error():
    (finding,) = check_hazards("H225", pictograms="02")
    assert (finding.severity, finding.field) == ("error", "pictograms")


# ---------------------------------------------------------------------------
# Findings
# ---------------------------------------------------------------------------


def test_severity_words_are_the_audits():
    assert (sds.ERROR, sds.WARNING, sds.NOTE) == (audit.ERROR, audit.WARNING, audit.NOTE)


def test_finding_is_frozen():
    finding = SdsFinding("error", "ec", "m", None)
    with pytest.raises(AttributeError):
        finding.severity = "note"  # type: ignore[misc]


@pytest.mark.parametrize(
    "kwargs, field",
    [(dict(h_text="H999"), "hazard statements"), (dict(h_text="H3O1"), "hazard statements"),
     (dict(p_text="P210+P301"), "precautionary statements"),
     (dict(h_text="H225", signal_word="Vorsicht"), "signal word"),
     (dict(h_text="H225", pictograms="skull"), "pictograms")],
)  # fmt: skip
def test_every_input_error_is_one_finding_on_one_line(kwargs, field):
    (finding,) = check_hazards(**kwargs)
    assert (finding.severity, finding.field) == ("error", field)
    assert "\n" not in finding.message and finding.suggestion


def test_misplaced_codes_are_warnings():
    findings = check_hazards("H225, P210", "H319")
    assert [(f.severity, f.field) for f in findings] == [
        ("warning", "hazard statements"),
        ("warning", "precautionary statements"),
    ]


# ---------------------------------------------------------------------------
# Properties
# ---------------------------------------------------------------------------

_, _ROWS = read_rows("ghs_statements.csv")
ALL_CODES = [row["code"] for row in _ROWS]


@given(st.sampled_from(ALL_CODES))
def test_every_code_reads_back(code):
    assert read_statements(code) == ((code,),)
    assert read_statements(f"{code} some statement text.") == ((code,),)


@given(
    st.lists(st.sampled_from([c for c in ALL_CODES if c.startswith("H")]), min_size=1, max_size=6),
    st.sampled_from([", ", "; ", " ", " / ", "\n", " - "]),
)
def test_separators_do_not_change_the_reading(codes, separator):
    assert read_statements(separator.join(codes)) == tuple((code,) for code in codes)


@given(st.lists(st.sampled_from(["H300", "H310", "H330", "H301", "H311", "H331"]), min_size=2, max_size=3))
def test_combined_statements_read_as_one_group(codes):
    assert read_statements(" + ".join(codes)) == (tuple(codes),)


@given(st.sampled_from([c for c in ALL_CODES if c[-1].isdigit()]))
def test_lower_case_reads_as_upper_case(code):
    assert read_statements(code.lower()) == ((code,),)
