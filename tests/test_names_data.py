"""Checks of the name tables in cellchem/data (trivial_names.csv, acids.csv, qualifiers.csv).

The tables are read with the csv module only, as cellchem's loader reads them (lines that
start with "#" are the cited header and are skipped); cellchem itself is not imported, so
these checks do not depend on the code that will use the tables. Molar masses come from
periodictable (an oracle from PyPI) and are compared with values typed in below, each with
its source.
"""

import csv
import io
import re
from collections import Counter
from fractions import Fraction
from pathlib import Path

import pytest

from cellchem.tables import table_header

DATA = Path(__file__).resolve().parents[1] / "cellchem" / "data"

TRIVIAL_COLUMNS = ["name", "formula", "other_names", "note", "source"]
ACID_COLUMNS = ["name", "formula", "anion", "other_names", "source", "note"]
QUALIFIER_COLUMNS = ["phrase", "kind", "meaning", "source"]
KINDS = {"grade", "form", "hydrate", "state", "purity-word", "strength", "colour"}
NOTE_TAGS = {"Ambiguous", "Approximate"}

# Acid anions that ions.csv did not hold when acids.csv was written (stated in its header).
ANIONS_NOT_IN_CATALOG = {"IO6", "TeO6"}

# Symbols periodictable accepts that are not chemical elements in cellchem's notation.
NOT_ELEMENTS = {"D", "T", "n"}


def read_rows(filename: str) -> tuple[list[str], list[dict[str, str]]]:
    text = (DATA / filename).read_text(encoding="utf-8")
    lines = [line for line in text.splitlines() if line.strip() and not line.startswith("#")]
    reader = csv.DictReader(io.StringIO("\n".join(lines)))
    rows = [{key: (value or "").strip() for key, value in row.items()} for row in reader]
    return list(reader.fieldnames or []), rows


TRIVIAL_FIELDS, TRIVIAL = read_rows("trivial_names.csv")
ACID_FIELDS, ACIDS = read_rows("acids.csv")
QUALIFIER_FIELDS, QUALIFIERS = read_rows("qualifiers.csv")
_, IONS = read_rows("ions.csv")


def names_of(row: dict[str, str]) -> list[str]:
    """The row's name and its "|"-separated other names."""
    others = [n.strip() for n in row["other_names"].split("|") if n.strip()]
    return [row["name"], *others]


# ---------------------------------------------------------------------------
# A reader of cellchem's formula notation, written here so that the tests do not use
# cellchem's own parser: symbols with integer counts, () and [] groups with counts,
# hydrate/adduct parts after "·" with a leading multiplier (integer or decimal).
# ---------------------------------------------------------------------------

TOKEN = re.compile(r"[A-Z][a-z]?|[1-9]\d*(?:\.\d+)?|0\.\d+|[()\[\]·]")
CLOSE = {"(": ")", "[": "]"}


class NotationError(ValueError):
    pass


def tokens(formula: str) -> list[str]:
    found = TOKEN.findall(formula)
    if "".join(found) != formula:
        raise NotationError(f"characters outside the notation in {formula!r}")
    return found


def parse(formula: str) -> Counter:
    """Element counts of a formula in cellchem notation (Fraction counts)."""
    toks = tokens(formula)
    pos = 0

    def peek() -> str | None:
        return toks[pos] if pos < len(toks) else None

    def count() -> int:
        nonlocal pos
        tok = peek()
        if tok is not None and tok[0].isdigit():
            if "." in tok:
                raise NotationError(f"decimal count inside a part of {formula!r}")
            pos += 1
            return int(tok)
        return 1

    def items(closing: str | None) -> Counter:
        nonlocal pos
        total: Counter = Counter()
        while True:
            tok = peek()
            if tok is None or tok == "·" or tok == closing:
                break
            if tok in CLOSE:
                pos += 1
                inner = items(CLOSE[tok])
                if peek() != CLOSE[tok]:
                    raise NotationError(f"unclosed {tok!r} in {formula!r}")
                pos += 1
                n = count()
                for sym, k in inner.items():
                    total[sym] += k * n
            elif tok[0].isupper():
                pos += 1
                total[tok] += count()
            else:
                raise NotationError(f"unexpected {tok!r} in {formula!r}")
        if not total:
            raise NotationError(f"empty part or group in {formula!r}")
        return total

    result = Counter(items(None))
    while peek() == "·":
        pos += 1
        tok = peek()
        multiplier = Fraction(1)
        if tok is not None and tok[0].isdigit():
            multiplier = Fraction(tok)
            pos += 1
        for sym, k in items(None).items():
            result[sym] += k * multiplier
    if pos != len(toks):
        raise NotationError(f"unexpected {toks[pos]!r} in {formula!r}")
    return result


def to_periodictable(formula: str) -> str:
    """cellchem notation to periodictable's: [] as (), and "·5H2O" as "+5H2O"."""
    return formula.replace("[", "(").replace("]", ")").replace("·", "+")


def periodictable_counts(formula: str) -> dict[str, float]:
    pt = pytest.importorskip("periodictable")
    return {str(el): float(n) for el, n in pt.formula(to_periodictable(formula)).atoms.items()}


def molar_mass(formula: str) -> float:
    pt = pytest.importorskip("periodictable")
    return pt.formula(to_periodictable(formula)).mass


# ---------------------------------------------------------------------------
# Structure
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("filename", "fields", "expected"),
    [
        ("trivial_names.csv", TRIVIAL_FIELDS, TRIVIAL_COLUMNS),
        ("acids.csv", ACID_FIELDS, ACID_COLUMNS),
        ("qualifiers.csv", QUALIFIER_FIELDS, QUALIFIER_COLUMNS),
    ],
)
def test_header_and_columns(filename, fields, expected):
    text = (DATA / filename).read_text(encoding="utf-8")
    assert text.startswith("#"), "a data file opens with its cited header"
    header = [line for line in text.splitlines() if line.startswith("#")]
    assert "# Sources" in header and "# Columns" in header
    assert fields == expected


def test_row_counts():
    assert len(TRIVIAL) >= 45
    assert len(ACIDS) >= 40
    assert len(QUALIFIERS) >= 60


@pytest.mark.parametrize(
    ("filename", "rows"),
    [("trivial_names.csv", TRIVIAL), ("acids.csv", ACIDS), ("qualifiers.csv", QUALIFIERS)],
)
def test_every_row_has_a_source(filename, rows):
    missing = [row.get("name") or row.get("phrase") for row in rows if not row["source"]]
    assert not missing
    assert all(None not in row for row in rows), "a row has more fields than the header"


@pytest.mark.parametrize(("filename", "rows"), [("trivial_names.csv", TRIVIAL), ("acids.csv", ACIDS)])
def test_names_unique_within_file(filename, rows):
    seen: dict[str, str] = {}
    clashes = []
    for row in rows:
        for name in names_of(row):
            key = name.casefold()
            if key in seen:
                clashes.append((name, seen[key], row["name"]))
            seen[key] = row["name"]
    assert not clashes


def test_qualifier_phrases_unique():
    counts = Counter(row["phrase"].casefold() for row in QUALIFIERS)
    assert [p for p, n in counts.items() if n > 1] == []


def test_no_trivial_name_is_an_acid_name():
    trivial = {n.casefold() for row in TRIVIAL for n in names_of(row)}
    acid = {n.casefold() for row in ACIDS for n in names_of(row)}
    assert sorted(trivial & acid) == []


def test_no_name_is_a_qualifier():
    phrases = {row["phrase"].casefold() for row in QUALIFIERS}
    names = {n.casefold() for rows in (TRIVIAL, ACIDS) for row in rows for n in names_of(row)}
    assert sorted(phrases & names) == []


def test_qualifier_kinds():
    assert {row["phrase"]: row["kind"] for row in QUALIFIERS if row["kind"] not in KINDS} == {}
    assert {row["kind"] for row in QUALIFIERS} == KINDS
    assert all(row["meaning"] for row in QUALIFIERS)


# Grade marks that stores write as grade words are set aside when read, and said to be marks
# in their meaning; no other is listed (the table's header names them).
GRADE_MARKS = {"analar", "gpr"}


def test_grade_marks_among_qualifiers_are_the_named_ones():
    marks = {row["phrase"].casefold() for row in QUALIFIERS if "grade mark" in row["meaning"]}
    assert marks == GRADE_MARKS
    header = table_header("qualifiers.csv")
    assert "GPR" in header and "AnalaR" in header


@pytest.mark.parametrize(("filename", "rows"), [("trivial_names.csv", TRIVIAL), ("acids.csv", ACIDS)])
def test_note_tags(filename, rows):
    bad = []
    for row in rows:
        match = re.match(r"\s*([A-Za-z]+)\s*:", row["note"])
        if match and match.group(1) not in NOTE_TAGS:
            bad.append((row["name"], match.group(1)))
    assert not bad


# ---------------------------------------------------------------------------
# Formulae
# ---------------------------------------------------------------------------

FORMULA_ROWS = [("trivial", r["name"], r["formula"]) for r in TRIVIAL] + [
    ("acid", r["name"], r["formula"]) for r in ACIDS
]


@pytest.mark.parametrize(("table", "name", "formula"), FORMULA_ROWS, ids=[f[1] for f in FORMULA_ROWS])
def test_formula_notation_and_elements(table, name, formula):
    pt = pytest.importorskip("periodictable")
    if table == "acid":
        assert formula.isascii() and "·" not in formula, "acids.csv formulae are ASCII, without hydrates"
    counts = parse(formula)
    for symbol in counts:
        assert symbol not in NOT_ELEMENTS, f"{symbol} is not an element symbol"
        assert pt.elements.symbol(symbol).symbol == symbol
    # periodictable reads the converted formula as the same atoms.
    theirs = periodictable_counts(formula)
    assert theirs == pytest.approx({s: float(n) for s, n in counts.items()})
    assert molar_mass(formula) > 0


@pytest.mark.parametrize(
    "bad", ["cuso4", "CuSO4.5H2O", "Fe(CN", "K]", "Na2 SO4", "H2SO4·", "NaCl·0H2O", "Xx2O", "(SO4)0"]
)
def test_notation_reader_refuses(bad):
    pt = pytest.importorskip("periodictable")
    with pytest.raises((NotationError, ValueError)):
        for symbol in parse(bad):
            pt.elements.symbol(symbol)


def test_acid_anions_match_catalog():
    charges: dict[str, set[int]] = {}
    for ion in IONS:
        charges.setdefault(ion["formula"], set()).add(int(ion["charge"]))
    missing, wrong = set(), []
    for row in ACIDS:
        anion = row["anion"]
        if not anion:
            assert row["name"] == "ammonia solution"
            continue
        acid, base = parse(row["formula"]), parse(anion)
        difference = {s: acid[s] - base[s] for s in set(acid) | set(base) if acid[s] != base[s]}
        assert set(difference) == {"H"}, (row["name"], difference)
        if anion not in charges:
            missing.add(anion)
        elif -difference["H"] not in charges[anion]:
            wrong.append((row["name"], difference["H"], charges[anion]))
    assert missing == ANIONS_NOT_IN_CATALOG
    assert not wrong


# ---------------------------------------------------------------------------
# Molar masses against values typed in from the sources named on each line, g/mol.
# CRC = CRC Handbook of Chemistry and Physics, "Physical Constants of Inorganic (or Organic)
# Compounds"; all recalled, not read. Tolerance 0.02 g/mol covers the change of standard
# atomic weights between handbook editions (S 32.065 -> 32.06, and so on).
# ---------------------------------------------------------------------------

TRIVIAL_MASSES = [
    ("Epsom salt", 246.47),  # CRC, magnesium sulfate heptahydrate (from memory)
    ("borax", 381.37),  # CRC, sodium tetraborate decahydrate (from memory)
    ("alum", 474.39),  # CRC, aluminium potassium sulfate dodecahydrate (from memory)
    ("Glauber's salt", 322.20),  # CRC, sodium sulfate decahydrate (from memory)
    ("Mohr's salt", 392.14),  # CRC, ammonium iron(II) sulfate hexahydrate (from memory)
    ("Rochelle salt", 282.22),  # CRC, potassium sodium tartrate tetrahydrate (from memory)
    ("washing soda", 286.14),  # CRC, sodium carbonate decahydrate (from memory)
    ("baking soda", 84.01),  # CRC, sodium hydrogencarbonate (from memory)
    ("caustic soda", 40.00),  # CRC, sodium hydroxide (from memory)
    ("quicklime", 56.08),  # CRC, calcium oxide (from memory)
    ("slaked lime", 74.09),  # CRC, calcium hydroxide (from memory)
    ("gypsum", 172.17),  # CRC, calcium sulfate dihydrate (from memory)
    ("blue vitriol", 249.69),  # CRC, copper(II) sulfate pentahydrate (from memory)
    ("green vitriol", 278.01),  # CRC, iron(II) sulfate heptahydrate (from memory)
    ("lunar caustic", 169.87),  # CRC, silver nitrate (from memory)
    ("calomel", 472.09),  # CRC, mercury(I) chloride (from memory)
    ("corrosive sublimate", 271.50),  # CRC, mercury(II) chloride (from memory)
    ("Condy's crystals", 158.03),  # CRC, potassium permanganate (from memory)
    ("yellow prussiate of potash", 422.39),  # CRC, potassium hexacyanoferrate(II) trihydrate (from memory)
    ("red prussiate of potash", 329.24),  # CRC, potassium hexacyanoferrate(III) (from memory)
    ("hypo", 248.18),  # CRC, sodium thiosulfate pentahydrate (from memory)
    ("sugar of lead", 379.33),  # CRC, lead(II) acetate trihydrate (from memory)
    ("cream of tartar", 188.18),  # CRC Organic, potassium hydrogen tartrate (from memory)
    ("microcosmic salt", 209.07),  # CRC, sodium ammonium hydrogenphosphate tetrahydrate (from memory)
]

ACID_MASSES = [
    ("sulfuric acid", 98.08),  # CRC, sulfuric acid (from memory)
    ("nitric acid", 63.01),  # CRC, nitric acid (from memory)
    ("hydrochloric acid", 36.46),  # CRC, hydrogen chloride (from memory)
    ("phosphoric acid", 97.99),  # CRC, phosphoric acid (from memory)
    ("boric acid", 61.83),  # CRC, boric acid (from memory)
    ("orthoperiodic acid", 227.94),  # CRC, orthoperiodic acid H5IO6 (from memory)
    ("acetic acid", 60.05),  # CRC Organic, acetic acid (from memory)
    ("oxalic acid", 90.03),  # CRC Organic, oxalic acid (from memory)
    ("citric acid", 192.12),  # CRC Organic, citric acid (from memory)
    ("ethylenediaminetetraacetic acid", 292.24),  # CRC Organic, EDTA free acid (from memory)
]


def _formula_of(rows: list[dict[str, str]], name: str) -> str:
    found = [row["formula"] for row in rows if row["name"] == name]
    assert len(found) == 1, f"no single row named {name!r}"
    return found[0]


@pytest.mark.parametrize(("name", "expected"), TRIVIAL_MASSES, ids=[m[0] for m in TRIVIAL_MASSES])
def test_trivial_molar_mass(name, expected):
    assert molar_mass(_formula_of(TRIVIAL, name)) == pytest.approx(expected, abs=0.02)


@pytest.mark.parametrize(("name", "expected"), ACID_MASSES, ids=[m[0] for m in ACID_MASSES])
def test_acid_molar_mass(name, expected):
    assert molar_mass(_formula_of(ACIDS, name)) == pytest.approx(expected, abs=0.02)
