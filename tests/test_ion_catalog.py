"""Checks on the ion catalog cellchem/data/ions.csv.

These tests read the CSV directly with the csv module (they do not import cellchem), so
they check the data file itself: its shape, its formula notation, its names, and a table of
values typed in from the sources.
"""

import csv
import re
from collections import Counter, defaultdict
from pathlib import Path

import pytest

CSV_PATH = Path(__file__).resolve().parents[1] / "cellchem" / "data" / "ions.csv"
COLUMNS = ["formula", "charge", "name", "legacy_name", "other_names", "source"]

ROMAN = {"I": 1, "II": 2, "III": 3, "IV": 4, "V": 5, "VI": 6, "VII": 7, "VIII": 8}
STOCK_RE = re.compile(r"\((VIII|VII|VI|IV|V|III|II|I)\)$")
# Tokens of the plain formula notation: element symbol with optional count, opening
# bracket, closing bracket with optional count.
TOKEN_RE = re.compile(r"[A-Z][a-z]?\d*|[(\[]|[)\]]\d*")
FORMULA_RE = re.compile(r"^(?:[A-Z][a-z]?\d*|[(\[]|[)\]]\d*)+$")


def _read_lines():
    with CSV_PATH.open(newline="", encoding="ascii") as fh:
        return fh.read().splitlines()


def _read_rows():
    lines = [ln for ln in _read_lines() if not ln.startswith("#")]
    reader = csv.DictReader(lines)
    assert reader.fieldnames == COLUMNS
    return list(reader)


ROWS = _read_rows()


def parse_formula(formula):
    """Return {symbol: count} for a formula in the catalog notation; raise on bad notation."""
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
            if count == 0:
                raise ValueError(f"zero count in {formula!r}")
            inner = stack.pop()
            if not inner:
                raise ValueError(f"empty group in {formula!r}")
            for sym, n in inner.items():
                stack[-1][sym] += n * count
        else:
            m = re.match(r"([A-Z][a-z]?)(\d*)$", tok)
            count = int(m.group(2)) if m.group(2) else 1
            if count == 0 or (m.group(2) and m.group(2).startswith("0")):
                raise ValueError(f"bad count in {formula!r}")
            stack[-1][m.group(1)] += count
    if openers:
        raise ValueError(f"unclosed bracket in {formula!r}")
    if "".join(TOKEN_RE.findall(formula)) != formula:
        raise ValueError(f"unparsed text in {formula!r}")
    return dict(stack[0])


def atom_count(formula):
    return sum(parse_formula(formula).values())


def homonuclear_cation_element(row):
    """Element symbol if the row is a cation made of one element only (Fe, Hg2), else None."""
    comp = parse_formula(row["formula"])
    if int(row["charge"]) > 0 and len(comp) == 1:
        return next(iter(comp))
    return None


# --------------------------------------------------------------------------- shape


def test_file_opens_with_comment_header():
    lines = _read_lines()
    assert lines[0].startswith("#")
    header_at = next(i for i, ln in enumerate(lines) if not ln.startswith("#"))
    assert lines[header_at] == ",".join(COLUMNS)
    comments = "\n".join(lines[:header_at])
    assert "ISBN 0-85404-438-8" in comments
    assert "Connelly" in comments
    # no comment lines after the CSV header
    assert not any(ln.startswith("#") for ln in lines[header_at:])


def test_every_row_has_all_columns():
    for row in ROWS:
        assert None not in row, row
        assert all(row[c] is not None for c in COLUMNS), row
        assert row["formula"] and row["name"], row


def test_formula_charge_pairs_unique():
    pairs = Counter((r["formula"], int(r["charge"])) for r in ROWS)
    dupes = [p for p, n in pairs.items() if n > 1]
    assert not dupes, dupes


def test_names_unique():
    names = Counter(r["name"] for r in ROWS)
    dupes = [n for n, k in names.items() if k > 1]
    assert not dupes, dupes


# Names that honestly mean more than one ion; cellchem refuses them alone and
# lists the choices. "carbide": C4- in Al4C3, C2 2- in CaC2 (common practice).
SHARED_NAMES = {"carbide"}


def test_all_names_identify_one_row():
    """name, legacy_name and every other name, case ignored, occur on one row only
    (except the listed shared names)."""
    seen = {}
    clashes = []
    for i, r in enumerate(ROWS):
        labels = [r["name"]]
        if r["legacy_name"]:
            labels.append(r["legacy_name"])
        if r["other_names"]:
            labels.extend(r["other_names"].split("|"))
        for label in labels:
            assert label == label.strip() and label, (r["formula"], labels)
            key = label.lower()
            if key in seen and seen[key] != i and key not in SHARED_NAMES:
                clashes.append(label)
            seen[key] = i
    assert not clashes, clashes


def test_every_row_has_source():
    for r in ROWS:
        assert r["source"].strip(), r


def test_sources_name_a_known_kind():
    for r in ROWS:
        assert "IUPAC 2005" in r["source"] or "common practice" in r["source"], r


def test_names_are_lower_case_ascii():
    for r in ROWS:
        # lower case apart from roman Stock numbers such as iron(III)
        bare = re.sub(r"\((?:VIII|VII|VI|IV|V|III|II|I)\)", "", r["name"])
        assert bare == bare.lower(), r["name"]
        assert r["name"].isascii()
        assert r["legacy_name"] == r["legacy_name"].lower()


def test_charges_are_nonzero_integers():
    for r in ROWS:
        assert re.fullmatch(r"-?[1-9]\d*", r["charge"]), r
        assert int(r["charge"]) != 0


def test_formula_notation():
    for r in ROWS:
        parse_formula(r["formula"])  # raises on bad notation
        assert r["formula"].isascii()


def test_same_formula_two_charges_only_for_known_cases():
    charges = defaultdict(set)
    for r in ROWS:
        charges[r["formula"]].add(int(r["charge"]))
    multi = {f for f, c in charges.items() if len(c) > 1}
    monatomic = {f for f in multi if atom_count(f) == 1}
    # BO3: borate 3- and the store formula of perborate 1- (ions.csv header; common practice)
    assert multi - monatomic <= {"O2", "MnO4", "[Fe(CN)6]", "NO2", "BO3"}, multi - monatomic


def test_elements_are_real():
    periodictable = pytest.importorskip("periodictable")
    known = {el.symbol for el in periodictable.elements if el.number > 0}
    for r in ROWS:
        for sym in parse_formula(r["formula"]):
            assert sym in known, (r["formula"], sym)


def test_at_least_80_polyatomic_rows():
    poly = [r for r in ROWS if atom_count(r["formula"]) > 1]
    assert len(poly) >= 80, len(poly)


# --------------------------------------------------------------------------- Stock numbers


def _cation_rows_by_element():
    by_el = defaultdict(list)
    for r in ROWS:
        el = homonuclear_cation_element(r)
        if el is not None:
            by_el[el].append(r)
    return by_el


def _oxidation_number(row):
    comp = parse_formula(row["formula"])
    (n,) = comp.values()
    ox, rem = divmod(int(row["charge"]), n)
    assert rem == 0, row
    return ox


def test_multi_charge_metals_have_stock_numbers_on_every_row():
    for el, rows in _cation_rows_by_element().items():
        states = {_oxidation_number(r) for r in rows}
        if len(states) > 1:
            for r in rows:
                m = STOCK_RE.search(r["name"])
                assert m, (el, r["name"])


def test_single_charge_metals_have_no_stock_number():
    for el, rows in _cation_rows_by_element().items():
        states = {_oxidation_number(r) for r in rows}
        if len(states) == 1:
            for r in rows:
                assert "(" not in r["name"], (el, r["name"])


def test_stock_number_matches_charge():
    for _el, rows in _cation_rows_by_element().items():
        for r in rows:
            m = STOCK_RE.search(r["name"])
            if m:
                assert ROMAN[m.group(1)] == _oxidation_number(r), r


def test_charge_number_other_name_matches_charge():
    for rows in _cation_rows_by_element().values():
        for r in rows:
            for other in r["other_names"].split("|"):
                m = re.search(r"\((\d)\+\)$", other)
                if m and len(parse_formula(r["formula"])) == 1 and atom_count(r["formula"]) == 1:
                    assert int(m.group(1)) == int(r["charge"]), r


# Charges of ligands in the coordination entities of the catalog (IUPAC 2005 IR-9;
# values from memory).
LIGAND_CHARGE = {
    "CN": -1,
    "NH3": 0,
    "NO2": -1,
    "C2O4": -2,
    "Cl": -1,
    "I": -1,
    "F": -1,
    "OH": -1,
    "H2O": 0,
    "C6H5": -1,
}


def _split_complex(formula):
    """[M(L)n...] -> (M, [(L, n), ...]) for the simple complexes of the catalog."""
    m = re.fullmatch(r"\[([A-Z][a-z]?)((?:\([^()]+\)\d*|[A-Z][a-z]?\d*)*)\]", formula)
    if not m:
        return None
    ligands = []
    for lig in re.findall(r"\(([^()]+)\)(\d*)|([A-Z][a-z]?)(\d*)", m.group(2)):
        name = lig[0] or lig[2]
        count = int(lig[1] or lig[3] or 1)
        ligands.append((name, count))
    return m.group(1), ligands


def test_complex_oxidation_numbers_match_charge():
    checked = 0
    for r in ROWS:
        split = _split_complex(r["formula"])
        m = STOCK_RE.search(r["name"])
        if not split or not m:
            continue
        _, ligands = split
        if not all(lig in LIGAND_CHARGE for lig, _ in ligands):
            continue
        ox = int(r["charge"]) - sum(LIGAND_CHARGE[lig] * n for lig, n in ligands)
        assert ox == ROMAN[m.group(1)], (r["formula"], r["charge"], r["name"])
        checked += 1
    assert checked >= 15


# Oxidation numbers met in the simple oxoanions/oxocations (common practice, from memory).
# Guards against a typed charge that does not fit the formula. Peroxo anions are left out
# (their O is not all oxide): S2O8 2-, HSO5-.
PEROXO = {"S2O8", "HSO5"}  # peroxomonosulfate too (from memory)
OXO_STATES = {
    "B": {3, 5},  # 5: the store formula of perborate BO3- (its O is partly peroxo; from memory)
    "C": {4},
    "N": {-1, 3, 5},
    "Si": {4},
    "P": {1, 3, 5},
    "S": {2, 2.5, 3, 4, 5, 6},  # 5: dithionate S2O6 2- (from memory)
    "Cl": {1, 3, 5, 7},
    "Br": {1, 5, 7},
    "I": {1, 5, 7},
    "Cr": {6},
    "Fe": {6},  # ferrate(VI) FeO4 2- (from memory)
    "Os": {6},  # osmate(VI) OsO4 2- (from memory)
    "Zr": {4},  # zirconate ZrO3 2- (from memory)
    "Nb": {5},  # niobate NbO3- (from memory)
    "Ta": {5},  # tantalate TaO3- (from memory)
    "Mn": {6, 7},
    "Re": {7},
    "As": {3, 5},
    "Se": {4, 6},
    "Te": {4, 6},
    "Mo": {6},
    "W": {6},
    "V": {4, 5},
    "Sn": {4},
    "Al": {3},
    "Zn": {2},
    "Bi": {3, 5},
    "Sb": {3},
    "U": {6},
    "Ti": {4},
}


def test_oxoion_oxidation_numbers_fit():
    checked = 0
    for r in ROWS:
        comp = parse_formula(r["formula"])
        central = [s for s in comp if s not in ("O", "H")]
        if "O" not in comp or len(central) != 1 or "[" in r["formula"] or "(" in r["formula"]:
            continue
        if r["formula"] in PEROXO:
            continue
        organic = comp.get("C", 0) > 1 or ("C" in comp and "H" in comp and r["formula"] != "HCO3")
        if organic:
            continue
        x = central[0]
        ox = (int(r["charge"]) + 2 * comp["O"] - comp.get("H", 0)) / comp[x]
        assert x in OXO_STATES, (r["formula"], x)
        assert ox in OXO_STATES[x], (r["formula"], r["charge"], ox)
        checked += 1
    assert checked >= 50


# --------------------------------------------------------------------------- check values

CHECK_VALUES = [
    ("Cl", -1, "chloride"),  # IUPAC 2005 IR-5.3.3.1
    ("S2", -2, "disulfide"),  # IUPAC 2005 IR-5.3.3.1 (disulfide(2-))
    ("O", -2, "oxide"),  # IUPAC 2005 IR-5.3.3.2
    ("N", -3, "nitride"),  # IUPAC 2005 IR-5.3.3.2
    ("O2", -1, "superoxide"),  # IUPAC 2005 IR-5.3.3.3
    ("O2", -2, "peroxide"),  # IUPAC 2005 IR-5.3.3.3
    ("O3", -1, "ozonide"),  # IUPAC 2005 IR-5.3.3.3
    ("I3", -1, "triiodide"),  # IUPAC 2005 IR-5.3.3.3
    ("C2", -2, "acetylide"),  # IUPAC 2005 IR-5.3.3.3
    ("N3", -1, "azide"),  # IUPAC 2005 IR-5.3.3.3
    ("NH2", -1, "amide"),  # IUPAC 2005 IR-5.3.3.4
    ("SO3", -2, "sulfite"),  # IUPAC 2005 IR-5.3.3.4
    ("OCl", -1, "hypochlorite"),  # IUPAC 2005 IR-5.3.3.4
    ("ClO3", -1, "chlorate"),  # IUPAC 2005 IR-5.3.3.4
    ("PF6", -1, "hexafluoridophosphate"),  # IUPAC 2005 IR-5.3.3.4
    ("[CuCl4]", -2, "tetrachloridocuprate(II)"),  # IUPAC 2005 IR-5.3.3.4
    ("HSO4", -1, "hydrogensulfate"),  # IUPAC 2005 IR-8.5
    ("HCO3", -1, "hydrogencarbonate"),  # IUPAC 2005 IR-8.5
    ("H2PO4", -1, "dihydrogenphosphate"),  # IUPAC 2005 IR-8.5
    ("HPO4", -2, "hydrogenphosphate"),  # IUPAC 2005 IR-8.5
    ("H2BO3", -1, "dihydrogenborate"),  # IUPAC 2005 IR-8.5
    ("HBO3", -2, "hydrogenborate"),  # IUPAC 2005 IR-8.5
    ("BO3", -3, "borate"),  # IUPAC 2005 Table IR-8.1
    ("BO2", -1, "metaborate"),  # IUPAC 2005 Table IR-8.1
    ("CO3", -2, "carbonate"),  # IUPAC 2005 Table IR-8.1
    ("SiO4", -4, "silicate"),  # IUPAC 2005 Table IR-8.1
    ("HC8H4O4", -1, "hydrogen phthalate"),  # IUPAC 2005 IR-8.4
    ("SO4", -2, "sulfate"),  # IUPAC 2005 Table IX (from memory)
    ("NO3", -1, "nitrate"),  # IUPAC 2005 Table IX (from memory)
    ("NO2", -1, "nitrite"),  # IUPAC 2005 Table IX (from memory)
    ("PO4", -3, "phosphate"),  # IUPAC 2005 Table IX (from memory)
    ("OH", -1, "hydroxide"),  # IUPAC 2005 Table IX (from memory)
    ("CN", -1, "cyanide"),  # IUPAC 2005 Table IX (from memory)
    ("SCN", -1, "thiocyanate"),  # IUPAC 2005 Table IX (from memory)
    ("S2O3", -2, "thiosulfate"),  # IUPAC 2005 Table IR-8.1 (from memory)
    ("HPO3", -2, "phosphonate"),  # IUPAC 2005 Table IR-8.1 (from memory)
    ("H2PO2", -1, "phosphinate"),  # IUPAC 2005 Table IR-8.1 (from memory)
    ("ClO4", -1, "perchlorate"),  # IUPAC 2005 Table IR-8.1 (from memory)
    ("NH4", 1, "ammonium"),  # IUPAC 2005 IR-5.3.2.4 (from memory)
    ("Hg2", 2, "dimercury(I)"),  # IUPAC 2005 IR-5.3.2.3 (from memory)
    ("[Fe(CN)6]", -4, "hexacyanidoferrate(II)"),  # IUPAC 2005 IR-9 (from memory)
    ("[Fe(CN)6]", -3, "hexacyanidoferrate(III)"),  # IUPAC 2005 IR-9 (from memory)
    ("Fe", 2, "iron(II)"),  # IUPAC 2005 IR-5.4.2.2 (from memory)
    ("Fe", 3, "iron(III)"),  # IUPAC 2005 IR-5.4.2.2 (from memory)
    ("Cu", 1, "copper(I)"),  # IUPAC 2005 IR-5.4.2.2 (from memory)
    ("Cu", 2, "copper(II)"),  # IUPAC 2005 IR-5.4.2.2 (from memory)
    ("Na", 1, "sodium"),  # IUPAC 2005 IR-5.3.2.2 (from memory)
    ("Al", 3, "aluminium"),  # IUPAC 2005 IR-5.3.2.2 (from memory)
    ("MnO4", -1, "permanganate"),  # common practice (from memory)
    ("MnO4", -2, "manganate"),  # common practice (from memory)
    ("Cr2O7", -2, "dichromate"),  # common practice (from memory)
    ("CH3COO", -1, "acetate"),  # common practice (from memory)
]

LEGACY_VALUES = [
    ("Fe", 2, "ferrous"),  # common practice (from memory)
    ("Fe", 3, "ferric"),  # common practice (from memory)
    ("Cu", 1, "cuprous"),  # common practice (from memory)
    ("Cu", 2, "cupric"),  # common practice (from memory)
    ("Sn", 2, "stannous"),  # common practice (from memory)
    ("Sn", 4, "stannic"),  # common practice (from memory)
    ("Hg2", 2, "mercurous"),  # common practice (from memory)
    ("Hg", 2, "mercuric"),  # common practice (from memory)
    ("[Fe(CN)6]", -4, "ferrocyanide"),  # common practice (from memory)
    ("[Fe(CN)6]", -3, "ferricyanide"),  # common practice (from memory)
]

BY_KEY = {(r["formula"], int(r["charge"])): r for r in ROWS}


@pytest.mark.parametrize("formula,charge,name", CHECK_VALUES)
def test_check_values(formula, charge, name):
    assert (formula, charge) in BY_KEY, (formula, charge)
    assert BY_KEY[(formula, charge)]["name"] == name


@pytest.mark.parametrize("formula,charge,legacy", LEGACY_VALUES)
def test_legacy_values(formula, charge, legacy):
    assert BY_KEY[(formula, charge)]["legacy_name"] == legacy


def test_rows_checked_against_source_cite_it():
    """Rows whose name was read from IUPAC 2005 cite a section without 'from memory'."""
    read = {
        ("Cl", -1),
        ("O", -2),
        ("N", -3),
        ("O2", -1),
        ("O2", -2),
        ("O3", -1),
        ("I3", -1),
        ("C2", -2),
        ("N3", -1),
        ("NH2", -1),
        ("SO3", -2),
        ("OCl", -1),
        ("ClO3", -1),
        ("PF6", -1),
        ("[CuCl4]", -2),
        ("H2BO3", -1),
        ("HBO3", -2),
    }
    for key in read:
        src = BY_KEY[key]["source"]
        assert src.startswith("IUPAC 2005") and "from memory" not in src, (key, src)
