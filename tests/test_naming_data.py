"""Checks on the naming reference data in cellchem/data.

Files: ligands.csv (ligand names for additive names), prefixes.csv (multiplicative
prefixes), hydrate_words.csv (hydrate multiplier words) and metal_anion_names.csv (central
atom names in complex anions).

These tests read the CSV files directly with the csv module (they do not import cellchem),
so they check the data files themselves: their shape, their formula notation, their names,
and tables of values typed in from the sources, each with its source beside it.
"""

import csv
import re
from collections import Counter
from decimal import Decimal
from pathlib import Path

import pytest

DATA = Path(__file__).resolve().parents[1] / "cellchem" / "data"

COLUMNS = {
    "ligands.csv": ["formula", "charge", "name", "other_names", "abbreviation", "donor", "source"],
    "prefixes.csv": ["number", "simple", "complex", "source"],
    "hydrate_words.csv": ["word", "count", "source"],
    "metal_anion_names.csv": ["symbol", "ate_name", "other_names", "source"],
}

# Tokens of the plain formula notation: element symbol with optional count, opening
# bracket, closing bracket with optional count.
TOKEN_RE = re.compile(r"[A-Z][a-z]?\d*|[(\[]|[)\]]\d*")
FORMULA_RE = re.compile(r"^(?:[A-Z][a-z]?\d*|[(\[]|[)\]]\d*)+$")
SYMBOL_RE = re.compile(r"^[A-Z][a-z]?$")
SOURCE_RE = re.compile(r"^(IUPAC 2005 (IR-\d|Table [IVX]+)|common practice)")
# lower-case ASCII name, optionally ending in a donor descriptor -N / -kappaN (IR-9.2.4.4)
NAME_RE = re.compile(r"^[a-z0-9][a-z0-9,'()\- ]*?(-(kappa)?[A-Z][a-z]?)?$")


def _read_lines(filename):
    with (DATA / filename).open(newline="", encoding="ascii") as fh:
        return fh.read().splitlines()


def _read_rows(filename):
    lines = [ln for ln in _read_lines(filename) if not ln.startswith("#")]
    reader = csv.DictReader(lines)
    assert reader.fieldnames == COLUMNS[filename]
    return list(reader)


LIGANDS = _read_rows("ligands.csv")
PREFIXES = _read_rows("prefixes.csv")
HYDRATES = _read_rows("hydrate_words.csv")
ANIONS = _read_rows("metal_anion_names.csv")
ALL_ROWS = {
    "ligands.csv": LIGANDS,
    "prefixes.csv": PREFIXES,
    "hydrate_words.csv": HYDRATES,
    "metal_anion_names.csv": ANIONS,
}

LIGAND_BY_NAME = {r["name"]: r for r in LIGANDS}
PREFIX_BY_NUMBER = {int(r["number"]): r for r in PREFIXES}
ANION_BY_SYMBOL = {r["symbol"]: r for r in ANIONS}
HYDRATE_BY_WORD = {r["word"]: r for r in HYDRATES}


def split(field):
    return [part for part in field.split("|") if part] if field else []


def parse_formula(formula):
    """Return {symbol: count} for a formula in the cellchem notation; raise on bad notation."""
    if not FORMULA_RE.match(formula):
        raise ValueError(f"bad characters or order in {formula!r}")
    stack = [Counter()]
    openers = []
    for tok in TOKEN_RE.findall(formula):
        if tok in "([":
            stack.append(Counter())
            openers.append(tok)
        elif tok[0] in ")]":
            if not openers:
                raise ValueError(f"unbalanced {tok[0]!r} in {formula!r}")
            opener = openers.pop()
            if (opener, tok[0]) not in (("(", ")"), ("[", "]")):
                raise ValueError(f"mismatched brackets in {formula!r}")
            count = int(tok[1:]) if len(tok) > 1 else 1
            inner = stack.pop()
            if count == 0 or not inner:
                raise ValueError(f"zero count or empty group in {formula!r}")
            for sym, n in inner.items():
                stack[-1][sym] += n * count
        else:
            m = re.match(r"([A-Z][a-z]?)(\d*)$", tok)
            if m.group(2) and (m.group(2).startswith("0")):
                raise ValueError(f"bad count in {formula!r}")
            stack[-1][m.group(1)] += int(m.group(2)) if m.group(2) else 1
    if openers:
        raise ValueError(f"unclosed bracket in {formula!r}")
    return dict(stack[0])


# --------------------------------------------------------------------------- shape, all files


@pytest.mark.parametrize("filename", sorted(COLUMNS))
def test_file_opens_with_cited_comment_header(filename):
    lines = _read_lines(filename)
    assert lines[0].startswith("#")
    header_at = next(i for i, ln in enumerate(lines) if not ln.startswith("#"))
    assert lines[header_at] == ",".join(COLUMNS[filename])
    comments = "\n".join(lines[:header_at])
    assert "ISBN 0-85404-438-8" in comments
    assert "Connelly" in comments
    assert "Columns" in comments
    assert not any(ln.startswith("#") for ln in lines[header_at:])


@pytest.mark.parametrize("filename", sorted(COLUMNS))
def test_every_row_complete_and_sourced(filename):
    for row in ALL_ROWS[filename]:
        assert None not in row, row
        assert all(row[c] is not None for c in COLUMNS[filename]), row
        assert row["source"].strip(), row
        assert SOURCE_RE.match(row["source"]), row["source"]
        assert row == {k: v.strip() for k, v in row.items()}, row


# --------------------------------------------------------------------------- ligands


def test_at_least_35_ligands():
    assert len(LIGANDS) >= 35


def test_ligand_names_and_other_names_unique():
    # every name cellchem reads must lead to one ligand
    seen = Counter()
    for row in LIGANDS:
        for name in [row["name"], *split(row["other_names"])]:
            seen[name.lower()] += 1
    dupes = [n for n, k in seen.items() if k > 1]
    assert not dupes, dupes


def test_ligand_names_lower_case_ascii():
    for row in LIGANDS:
        for name in [row["name"], *split(row["other_names"])]:
            assert NAME_RE.match(name), name


@pytest.mark.parametrize("row", LIGANDS, ids=[r["name"] for r in LIGANDS])
def test_ligand_formula_notation(row):
    comp = parse_formula(row["formula"])
    assert comp


def test_ligand_elements_real():
    periodictable = pytest.importorskip("periodictable")
    for row in LIGANDS:
        for sym in [*parse_formula(row["formula"]), *split(row["donor"])]:
            assert periodictable.elements.symbol(sym).symbol == sym, row


def test_ligand_charges_integers():
    for row in LIGANDS:
        assert re.fullmatch(r"0|-?[1-9]\d*", row["charge"]), row
        assert int(row["charge"]) <= 0, row  # no cationic ligands in this table


def test_anionic_ligand_names_end_in_o():
    # IUPAC 2005 IR-9.2.2.3(i): anionic ligand names end in 'o' (ido, ito, ato); the donor
    # suffix -N, -O, -S of IR-9.2.4.4 follows.
    for row in LIGANDS:
        base = re.sub(r"-[A-Z][a-z]?$", "", row["name"])
        if int(row["charge"]) < 0:
            assert base.endswith("o"), row["name"]
        else:
            assert not base.endswith(("ido", "ato", "ito")), row["name"]


def test_ligand_donor_in_formula():
    for row in LIGANDS:
        donors = split(row["donor"])
        assert donors, row
        comp = parse_formula(row["formula"])
        for sym in donors:
            assert SYMBOL_RE.match(sym), row
            assert sym in comp, row


def test_ligand_abbreviations():
    # IUPAC 2005 IR-4.4.4(vi): lower-case letters, with well-established exceptions
    abbrs = [r["abbreviation"] for r in LIGANDS if r["abbreviation"]]
    assert len(abbrs) == len(set(abbrs))
    for abbr in abbrs:
        assert re.fullmatch(r"[a-z]{2,}", abbr) or abbr in {"PPh3"}, abbr


def test_formula_charge_pairs_unique():
    triples = Counter((r["formula"], r["charge"]) for r in LIGANDS)
    dupes = [t for t, k in triples.items() if k > 1]
    assert not dupes, dupes


LIGAND_CHECKS = [
    ("CN", -1, "cyanido", "C"),  # IUPAC 2005 IR-9.2.2.3, IR-1.6.4
    ("F", -1, "fluorido", "F"),  # IUPAC 2005 IR-9.2.2.3
    ("Cl", -1, "chlorido", "Cl"),  # IUPAC 2005 IR-9.2.2.3
    ("Br", -1, "bromido", "Br"),  # IUPAC 2005 IR-9.2.2.3
    ("I", -1, "iodido", "I"),  # IUPAC 2005 IR-9.2.2.3
    ("H", -1, "hydrido", "H"),  # IUPAC 2005 IR-9.2.2.3
    ("OH", -1, "hydroxido", "O"),  # IUPAC 2005 IR-1.6.4
    ("O", -2, "oxido", "O"),  # IUPAC 2005 IR-1.6.4
    ("S", -2, "sulfido", "S"),  # IUPAC 2005 IR-1.6.4
    ("N", -3, "nitrido", "N"),  # IUPAC 2005 IR-9.2.2.4 (pentachloridonitridoosmate)
    ("NO3", -1, "nitrato", "O"),  # IUPAC 2005 IR-2.2.3 (tetranitratoborate(III))
    ("NO2", -1, "nitrito-N", "N"),  # IUPAC 2005 IR-9.2.4.4
    ("ONO", -1, "nitrito-O", "O"),  # IUPAC 2005 IR-9.2.4.4; ONO as in IR-2.2.3
    ("SCN", -1, "thiocyanato-S", "S"),  # IUPAC 2005 IR-9.2.4.4
    ("NCS", -1, "thiocyanato-N", "N"),  # IUPAC 2005 IR-9.2.4.4; NCS as in IR-9.2.3.3
    ("NCO", -1, "cyanato-N", "N"),  # IUPAC 2005 IR-7.2 (bis(cyanato-N)...tellurium)
    ("S2", -2, "disulfido", "S"),  # IUPAC 2005 IR-2.15.2 ((disulfido)sulfidoaurate(1-))
    ("H2O", 0, "aqua", "O"),  # IUPAC 2005 IR-7.2 (hexaaquaaluminium(3+))
    ("NH3", 0, "ammine", "N"),  # IUPAC 2005 IR-9.2.2.2
    ("CO", 0, "carbonyl", "C"),  # IUPAC 2005 IR-2.13 (tetracarbonylbis(phenylethynyl)iron)
    ("NO", 0, "nitrosyl", "N"),  # IUPAC 2005 IR-2.8.1 (...dicarbonylnitrosyl...chromium(1+))
    ("C5H5N", 0, "pyridine", "N"),  # IUPAC 2005 IR-7.2 (bis(pyridine)hydrogen(1+))
    ("C2H8N2", 0, "ethane-1,2-diamine", "N"),  # IUPAC 2005 IR-2.2.3 ([Co(en)3]Cl3)
    ("CO(NH2)2", 0, "urea", "O"),  # IUPAC 2005 IR-9.2.2.4 (dichloridobis(urea)copper(II))
    ("CH3NH2", 0, "methanamine", "N"),  # IUPAC 2005 IR-9.2.2.4 Example 5
    ("C2H4", 0, "ethene", "C"),  # IUPAC 2005 IR-2.2.3 (trichlorido(eta2-ethene)platinate(II))
    ("C10H12N2O8", -4, "ethylenediaminetetraacetato", "N|O"),  # IUPAC 2005 Table VII (from memory)
    ("C2O4", -2, "oxalato", "O"),  # IUPAC 2005 Table VII (from memory)
]


@pytest.mark.parametrize(
    ("formula", "charge", "name", "donor"), LIGAND_CHECKS, ids=[c[2] for c in LIGAND_CHECKS]
)
def test_ligand_check_values(formula, charge, name, donor):
    row = LIGAND_BY_NAME[name]
    assert (row["formula"], int(row["charge"]), row["donor"]) == (formula, charge, donor)


ABBREVIATION_CHECKS = [
    ("en", "ethane-1,2-diamine"),  # IUPAC 2005 IR-2.2.3 ([Co(en)3]Cl3)
    ("py", "pyridine"),  # IUPAC 2005 IR-7.2 ([H(py)2]+)
    ("gly", "glycinato"),  # IUPAC 2005 IR-9.2.3.4
    ("PPh3", "triphenylphosphane"),  # IUPAC 2005 IR-2.13 ([Pt(PPh3)4])
    ("bpy", "2,2'-bipyridine"),  # IUPAC 2005 Table VII (from memory)
    ("phen", "1,10-phenanthroline"),  # IUPAC 2005 Table VII (from memory)
    ("edta", "ethylenediaminetetraacetato"),  # IUPAC 2005 Table VII (from memory)
    ("ox", "oxalato"),  # IUPAC 2005 Table VII (from memory)
]


@pytest.mark.parametrize(
    ("abbreviation", "name"), ABBREVIATION_CHECKS, ids=[c[0] for c in ABBREVIATION_CHECKS]
)
def test_abbreviation_check_values(abbreviation, name):
    assert LIGAND_BY_NAME[name]["abbreviation"] == abbreviation


OTHER_NAME_CHECKS = [
    ("chloro", "chlorido"),  # common practice (from memory)
    ("cyano", "cyanido"),  # common practice (from memory)
    ("hydroxo", "hydroxido"),  # common practice (from memory)
    ("oxo", "oxido"),  # common practice (from memory)
    ("nitro", "nitrito-N"),  # common practice (from memory)
    ("nitrito", "nitrito-O"),  # common practice (from memory)
    ("isothiocyanato", "thiocyanato-N"),  # common practice (from memory)
    ("thiocyanato", "thiocyanato-S"),  # common practice (from memory)
    ("aquo", "aqua"),  # common practice (from memory)
    ("ethylenediamine", "ethane-1,2-diamine"),  # common practice (from memory)
    ("methylamine", "methanamine"),  # IUPAC 2005 IR-9.2.2.2 (bis(methylamine))
    ("azanido", "amido"),  # IUPAC 2005 IR-9.2.2.3 Example 11 by analogy
]


@pytest.mark.parametrize(("other", "name"), OTHER_NAME_CHECKS, ids=[c[0] for c in OTHER_NAME_CHECKS])
def test_other_name_check_values(other, name):
    row = LIGAND_BY_NAME[name]
    assert other == row["name"] or other in split(row["other_names"])


# --------------------------------------------------------------------------- prefixes


def test_prefix_numbers_in_order_and_complete():
    numbers = [int(r["number"]) for r in PREFIXES]
    assert numbers == sorted(numbers)
    assert len(numbers) == len(set(numbers))
    assert numbers[:12] == list(range(1, 13))
    assert 20 in numbers


def test_prefix_forms_unique_and_lower_case():
    simple = [r["simple"] for r in PREFIXES]
    complex_ = [r["complex"] for r in PREFIXES if r["complex"]]
    assert len(simple) == len(set(simple))
    assert len(complex_) == len(set(complex_))
    for word in simple + complex_:
        assert re.fullmatch(r"[a-z]+", word), word
    assert PREFIX_BY_NUMBER[1]["complex"] == ""


def test_complex_prefixes_follow_kis_rule():
    # IUPAC 2005 IR-2.13: tetrakis, pentakis, ... pentatriacontakis; bis and tris special
    for number, row in PREFIX_BY_NUMBER.items():
        if number >= 4:
            assert row["complex"] == row["simple"] + "kis", row


PREFIX_CHECKS = [
    (1, "mono", ""),  # IUPAC 2005 IR-2.7 (monoooxygen); Table IV (from memory)
    (2, "di", "bis"),  # IUPAC 2005 IR-2.13
    (3, "tri", "tris"),  # IUPAC 2005 IR-2.13
    (4, "tetra", "tetrakis"),  # IUPAC 2005 Table IV, IR-2.13
    (5, "penta", "pentakis"),  # IUPAC 2005 IR-2.13
    (6, "hexa", "hexakis"),  # IUPAC 2005 IR-7.2
    (7, "hepta", "heptakis"),  # IUPAC 2005 Table IV (from memory)
    (8, "octa", "octakis"),  # IUPAC 2005 Table IV (from memory)
    (9, "nona", "nonakis"),  # IUPAC 2005 Table IV (from memory)
    (10, "deca", "decakis"),  # IUPAC 2005 Table IV (from memory)
    (11, "undeca", "undecakis"),  # IUPAC 2005 Table IV (from memory)
    (12, "dodeca", "dodecakis"),  # IUPAC 2005 Table IV (from memory)
    (20, "icosa", "icosakis"),  # IUPAC 2005 Table IV (from memory)
]


@pytest.mark.parametrize(("number", "simple", "complex_"), PREFIX_CHECKS, ids=[c[1] for c in PREFIX_CHECKS])
def test_prefix_check_values(number, simple, complex_):
    row = PREFIX_BY_NUMBER[number]
    assert (row["simple"], row["complex"]) == (simple, complex_)


# --------------------------------------------------------------------------- hydrate words


def test_hydrate_words_unique_with_positive_counts():
    words = [r["word"] for r in HYDRATES]
    assert len(words) == len(set(words))
    for row in HYDRATES:
        assert re.fullmatch(r"[a-z]*hydrate", row["word"]), row
        if row["count"] == "x":
            assert row["word"] == "hydrate"
            continue
        assert Decimal(row["count"]) > 0, row
    counts = [r["count"] for r in HYDRATES]
    assert len(counts) == len(set(counts))


def test_integer_hydrate_words_use_the_prefix_table():
    # IUPAC 2005 IR-5.5: multiplicative prefix + "hydrate" (sodium sulfate decahydrate)
    for row in HYDRATES:
        if re.fullmatch(r"\d+", row["count"]):
            prefix = PREFIX_BY_NUMBER[int(row["count"])]["simple"]
            assert row["word"] == prefix + "hydrate", row


def test_hydrate_counts_1_to_12_present():
    counts = {r["count"] for r in HYDRATES}
    assert {str(n) for n in range(1, 13)} <= counts


HYDRATE_CHECKS = [
    ("decahydrate", "10"),  # IUPAC 2005 IR-5.5 (sodium sulfate decahydrate)
    ("dodecahydrate", "12"),  # IUPAC 2005 IR-5.5 (aluminium potassium bis(sulfate) dodecahydrate)
    ("pentahydrate", "5"),  # common practice: copper(II) sulfate pentahydrate
    ("heptahydrate", "7"),  # common practice: magnesium sulfate heptahydrate (from memory)
    ("octadecahydrate", "18"),  # common practice: aluminium sulfate (from memory)
    ("hemihydrate", "0.5"),  # common practice: calcium sulfate hemihydrate (from memory)
    ("sesquihydrate", "1.5"),  # common practice (from memory)
    ("hydrate", "x"),  # common practice; count unspecified (n in IUPAC 2005 IR-5.5)
]


@pytest.mark.parametrize(("word", "count"), HYDRATE_CHECKS, ids=[c[0] for c in HYDRATE_CHECKS])
def test_hydrate_check_values(word, count):
    assert HYDRATE_BY_WORD[word]["count"] == count


# --------------------------------------------------------------------------- anion names


def test_anion_names_shape():
    symbols = [r["symbol"] for r in ANIONS]
    assert len(symbols) == len(set(symbols))
    names = Counter()
    for row in ANIONS:
        assert SYMBOL_RE.match(row["symbol"]), row
        for name in [row["ate_name"], *split(row["other_names"])]:
            assert re.fullmatch(r"[a-z]+ate", name), row
            names[name] += 1
    dupes = [n for n, k in names.items() if k > 1]
    assert not dupes, dupes


def test_anion_symbols_real():
    periodictable = pytest.importorskip("periodictable")
    for row in ANIONS:
        assert periodictable.elements.symbol(row["symbol"]).symbol == row["symbol"]


ANION_CHECKS = [
    ("Fe", "ferrate"),  # IUPAC 2005 IR-2.8.2 (tetraoxidoferrate(VI)), IR-9.2.2.4
    ("Co", "cobaltate"),  # IUPAC 2005 IR-5.3.3.1 (tetrachloridocobaltate(2-))
    ("Al", "aluminate"),  # IUPAC 2005 IR-2.8.1 (tetrachloridoaluminate(1-))
    ("Au", "aurate"),  # IUPAC 2005 IR-2.15.2 ((disulfido)sulfidoaurate(1-))
    ("Pt", "platinate"),  # IUPAC 2005 IR-2.13 (tetrachloridoplatinate(2-))
    ("Pd", "palladate"),  # IUPAC 2005 IR-9.2.2.4 (tetrachloridopalladate(II))
    ("Os", "osmate"),  # IUPAC 2005 IR-9.2.2.4 (pentachloridonitridoosmate(2-))
    ("Cr", "chromate"),  # IUPAC 2005 IR-9.2.5.1 (heptaoxidodichromate(2-))
    ("Re", "rhenate"),  # IUPAC 2005 IR-9.2.5.1 (octabromidodirhenate(2-))
    ("Sb", "antimonate"),  # IUPAC 2005 IR-7.2 (hexahydroxidoantimonate(1-))
    ("B", "borate"),  # IUPAC 2005 IR-7.2 (tetrahydridoborate(1-))
    ("P", "phosphate"),  # IUPAC 2005 IR-7.2 (hexafluoridophosphate(1-))
    ("H", "hydrogenate"),  # IUPAC 2005 IR-7.2 (difluoridohydrogenate(1-))
    ("Mo", "molybdate"),  # IUPAC 2005 IR-8.4
    ("W", "tungstate"),  # IUPAC 2005 IR-8.4
    ("Cu", "cuprate"),  # IUPAC 2005 Table X (from memory)
    ("Ag", "argentate"),  # IUPAC 2005 Table X (from memory)
    ("Sn", "stannate"),  # IUPAC 2005 Table X (from memory)
    ("Pb", "plumbate"),  # IUPAC 2005 Table X (from memory)
    ("Hg", "mercurate"),  # IUPAC 2005 Table X (from memory)
    ("Zn", "zincate"),  # IUPAC 2005 Table X (from memory)
]


@pytest.mark.parametrize(("symbol", "ate_name"), ANION_CHECKS, ids=[c[0] for c in ANION_CHECKS])
def test_anion_check_values(symbol, ate_name):
    assert ANION_BY_SYMBOL[symbol]["ate_name"] == ate_name


# --------------------------------------------------------------------------- composed names

# Names printed in IUPAC 2005, rebuilt from the three tables: prefix + ligand + central atom.
COMPOSED_CHECKS = [
    (6, "cyanido", "Fe", "hexacyanidoferrate"),  # IUPAC 2005 IR-9.2.2.4 Example 1
    (4, "chlorido", "Pd", "tetrachloridopalladate"),  # IUPAC 2005 IR-9.2.2.4 Example 7
    (4, "chlorido", "Al", "tetrachloridoaluminate"),  # IUPAC 2005 IR-2.8.1
    (4, "chlorido", "Co", "tetrachloridocobaltate"),  # IUPAC 2005 IR-5.3.3.1
    (4, "oxido", "Fe", "tetraoxidoferrate"),  # IUPAC 2005 IR-2.8.2
    (6, "hydroxido", "Sb", "hexahydroxidoantimonate"),  # IUPAC 2005 IR-7.2
    (6, "fluorido", "P", "hexafluoridophosphate"),  # IUPAC 2005 IR-7.2
    (4, "hydrido", "B", "tetrahydridoborate"),  # IUPAC 2005 IR-7.2
    (4, "nitrato", "B", "tetranitratoborate"),  # IUPAC 2005 IR-2.2.3
    (6, "chlorido", "Pt", "hexachloridoplatinate"),  # IUPAC 2005 IR-8.4
]


@pytest.mark.parametrize(
    ("number", "ligand", "symbol", "expected"), COMPOSED_CHECKS, ids=[c[3] for c in COMPOSED_CHECKS]
)
def test_composed_anion_names(number, ligand, symbol, expected):
    name = (
        PREFIX_BY_NUMBER[number]["simple"]
        + LIGAND_BY_NAME[ligand]["name"]
        + ANION_BY_SYMBOL[symbol]["ate_name"]
    )
    assert name == expected


def test_composed_complex_prefix():
    # IUPAC 2005 IR-2.13 Example 6: tetrakis(triphenylphosphane)platinum(0)
    name = f"{PREFIX_BY_NUMBER[4]['complex']}({LIGAND_BY_NAME['triphenylphosphane']['name']})platinum(0)"
    assert name == "tetrakis(triphenylphosphane)platinum(0)"
    # IUPAC 2005 IR-9.2.2.4 Example 2: hexaamminecobalt(III), no elision (IR-9.2.2.2)
    assert PREFIX_BY_NUMBER[6]["simple"] + LIGAND_BY_NAME["ammine"]["name"] == "hexaammine"
