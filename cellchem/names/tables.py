"""The naming tables of ``cellchem/data`` loaded and indexed for reading and
writing names: multiplicative prefixes, hydrate words, ligands, -ate names of
central atoms, acids, trivial and established names, qualifier words, oxo
groups, established compounds, hydrates that exist, the charges stores stock,
allotropes; and the indexes of ion and element names the reader looks words
up in. Each table cites its sources in its own header (``data/SOURCES.md``).
"""

from __future__ import annotations

import re
from fractions import Fraction
from functools import cache

from ..elements import element, symbols
from ..errors import CellchemError
from ..formula import Formula, Number
from ..ions import Ion, catalog, counts_key, ions_in, lookup
from ..reading import parse_formula
from ..tables import read_table, split_names
from .folding import _fold, _stock


@cache
def _prefixes() -> tuple[dict[int, str], dict[int, str]]:
    simple: dict[int, str] = {}
    complex_: dict[int, str] = {}
    for row in read_table("prefixes.csv"):
        n = int(row["number"])
        simple[n] = row["simple"]
        if row.get("complex"):
            complex_[n] = row["complex"]
    return simple, complex_


@cache
def _prefix_values() -> list[tuple[str, int]]:
    """(prefix, number), longest first, for reading; includes the elided
    forms before a vowel (mon-, tetr-, pent-, hex-, ...)."""
    simple, _ = _prefixes()
    out: dict[str, int] = {}
    for n, p in simple.items():
        if n == 1 and p in ("", "-"):
            continue
        out[p] = n
    return sorted(out.items(), key=lambda kv: -len(kv[0]))


@cache
def _complex_prefix_values() -> dict[str, int]:
    """bis 2, tris 3, tetrakis 4, ... (IUPAC 2005 Table IV)."""
    _, complex_ = _prefixes()
    return {p: n for n, p in complex_.items() if p}


@cache
def _prefix_numbers() -> dict[str, int]:
    simple, complex_ = _prefixes()
    numbers = {word: n for n, word in simple.items()}
    numbers.update({word: n for n, word in complex_.items() if word})
    return numbers


def _prefix_number(p: str) -> int:
    return _prefix_numbers().get(p, 1) if p else 1


@cache
def _hydrate_words() -> dict[str, Number | None]:
    """Hydrate words and their water counts (None for an unknown count)."""
    table: dict[str, Number | None] = {}
    for row in read_table("hydrate_words.csv"):
        if row["count"].strip() in ("x", "n"):
            table[row["word"].casefold()] = None
            continue
        count = Fraction(row["count"])
        table[row["word"].casefold()] = int(count) if count.denominator == 1 else count
    return table


@cache
def _hydrate_names() -> dict[Number | None, str]:
    names: dict[Number | None, str] = {}
    for word, count in _hydrate_words().items():
        names.setdefault(count, word)
    return names


def hydrate_word(water: Number) -> str:
    """The word for a count of water of crystallisation (data/hydrate_words.csv).

    >>> hydrate_word(2), hydrate_word(Fraction(1, 2)), hydrate_word(13)
    ('dihydrate', 'hemihydrate', '13-hydrate')
    """
    return _hydrate_names().get(water) or f"{_fmt_number(water)}-hydrate"


def _hydrate_suffix(water: Number | None) -> str:
    if water == 0:
        return ""
    if water is None:
        return " hydrate"
    word = _hydrate_names().get(water)
    if word:
        return " " + word
    return f" {_fmt_number(water)}-hydrate"


def _fmt_number(n: Number) -> str:
    if isinstance(n, Fraction):
        return f"{float(n):g}"
    return str(n)


def _number(text: str) -> Number | None:
    if text in ("x", "n"):
        return None
    if text == "½":
        return Fraction(1, 2)
    value = Fraction(text.replace(",", "."))
    return int(value) if value.denominator == 1 else value


def _index(table: dict, row: dict[str, str], value, fold=str.casefold) -> None:
    """Index ``value`` under a row's name and its other names; an other name never
    displaces an entry already in the table."""
    table[fold(row["name"])] = value
    for other in split_names(row.get("other_names")):
        table.setdefault(fold(other), value)


@cache
def _ligands() -> tuple[dict[str, tuple[Formula, int, str]], dict[tuple, tuple[str, int]]]:
    """By name (and older names): (formula, charge, name); by counts key: (name, charge)."""
    by_name: dict[str, tuple[Formula, int, str]] = {}
    by_key: dict[tuple, tuple[str, int]] = {}
    for row in read_table("ligands.csv"):
        f = parse_formula(row["formula"])
        charge = int(row["charge"])
        _index(by_name, row, (f, charge, row["name"]))
        if row.get("abbreviation"):
            by_name.setdefault(row["abbreviation"].strip().casefold(), (f, charge, row["name"]))
        by_key.setdefault(counts_key(f.counts), (row["name"], charge))
    return by_name, by_key


@cache
def _ate_names() -> tuple[dict[str, str], dict[str, str]]:
    """symbol -> '-ate' name of the metal in a complex anion, and the reverse."""
    forward: dict[str, str] = {}
    back: dict[str, str] = {}
    for row in read_table("metal_anion_names.csv"):
        forward[row["symbol"]] = row["ate_name"]
        _index(back, {**row, "name": row["ate_name"]}, row["symbol"])
    return forward, back


@cache
def _acids() -> tuple[dict[str, str], dict[tuple, str]]:
    """name -> formula text; counts key -> name."""
    by_name: dict[str, str] = {}
    by_key: dict[tuple, str] = {}
    for row in read_table("acids.csv"):
        _index(by_name, row, row["formula"], _fold)
        key = counts_key(parse_formula(row["formula"]).counts)
        by_key.setdefault(key, row["name"])
    return by_name, by_key


@cache
def _ambiguous_acids() -> dict[str, tuple[str, str, tuple[str, ...]]]:
    """Acid names the table marks "Ambiguous:" (the trade also uses them for another
    substance): folded name -> (the name as written, the reason, the candidate formulas:
    the acid's own, then those the note names, such as H5IO6 for periodic acid)."""
    table: dict[str, tuple[str, str, tuple[str, ...]]] = {}
    for row in read_table("acids.csv"):
        note = row.get("note", "")
        if not note.startswith("Ambiguous:"):
            continue
        own = parse_formula(row["formula"])
        candidates = [own.text()]
        for token in re.findall(r"(?<![\w.])[A-Z][A-Za-z0-9]*\d[A-Za-z0-9]*(?![\w.])", note):
            try:
                other = parse_formula(token)
            except CellchemError:
                continue
            if len(other.counts) > 1 and other.text() not in candidates:
                candidates.append(other.text())
        why = note[len("Ambiguous:") :].strip().split(";")[0].rstrip(".")
        table[_fold(row["name"])] = (row["name"], why, tuple(candidates))
    return table


@cache
def _acid_anions() -> tuple[tuple[str, Ion | None], ...]:
    """(folded acid name, its anion) for every name of acids.csv."""
    out = []
    for row in read_table("acids.csv"):
        if not row.get("anion"):
            continue
        counts = parse_formula(row["anion"]).counts
        acid_h = parse_formula(row["formula"]).counts.get("H", 0) - counts.get("H", 0)
        ion = lookup(counts, -int(acid_h)) if acid_h else None
        for name in (row["name"], *split_names(row.get("other_names"))):
            out.append((_fold(name), ion))
    return tuple(out)


@cache
def _trivial() -> dict[str, tuple[str, str, str]]:
    """trivial name -> (formula text, the name as the table writes it, its note)."""
    table: dict[str, tuple[str, str, str]] = {}
    for row in read_table("trivial_names.csv"):
        _index(table, row, (row["formula"], row["name"], row.get("note", "")), _fold)
    return table


@cache
def _named() -> tuple[dict[str, str], dict[tuple, str]]:
    """Established names the rules do not give (water, ammonia, calcium carbide):
    name -> formula, and formula counts key -> the name cellchem writes."""
    by_name: dict[str, str] = {}
    by_key: dict[tuple, str] = {}
    for row in read_table("named_compounds.csv"):
        _index(by_name, row, row["formula"], _fold)
        if row.get("write", "yes") != "no":
            by_key.setdefault(_formula_key(row["formula"]), row["name"])
    return by_name, by_key


def _formula_key(text: str) -> tuple:
    f = parse_formula(text)
    return (counts_key(f.counts), f.water)


@cache
def _qualifier_phrases() -> list[tuple[re.Pattern[str], str]]:
    rows = sorted(read_table("qualifiers.csv"), key=lambda r: -len(r["phrase"]))
    out = []
    for row in rows:
        phrase = _fold(row["phrase"])
        if not phrase:
            continue
        pattern = re.compile(r"(?<![\w])" + re.escape(phrase) + r"(?![\w])")
        out.append((pattern, row["kind"]))
    return out


@cache
def _ion_names() -> dict[str, list[tuple[Ion, str]]]:
    """Folded name -> [(ion, which form of name)]."""
    table: dict[str, list[tuple[Ion, str]]] = {}

    def add(name: str, ion: Ion, form: str) -> None:
        key, _ = _stock(_fold(name))
        entries = table.setdefault(key, [])
        if all(e[0] != ion for e in entries):
            entries.append((ion, form))

    for ion in catalog():
        add(ion.name, ion, "")
        if ion.legacy_name:
            add(ion.legacy_name, ion, f"legacy name '{ion.legacy_name}' for {ion.name}")
        for other in ion.other_names:
            add(other, ion, f"other name '{other}' for {ion.name}")
    return table


@cache
def _element_names() -> dict[str, str]:
    table = {}
    for sym in symbols():
        el = element(sym)
        table[_fold(el.name)] = sym
        for v in el.variants:
            table[_fold(v)] = sym
    return table


def _monatomic(symbol: str, sign: int) -> list[Ion]:
    return [ion for ion, k in ions_in({symbol: 1}) if (ion.charge > 0) == (sign > 0) and ion.is_monatomic]


@cache
def _oxo_groups() -> tuple[dict[str, Ion], dict[tuple, str]]:
    """data/oxo_groups.csv: name -> the group as an Ion-like value (its valence
    as its charge, for counting only), and the counts of each group's halides
    (SOCl2, POCl3) -> the name stores write ('thionyl chloride')."""
    by_name: dict[str, Ion] = {}
    by_key: dict[tuple, str] = {}
    halides = [i for i in catalog() if i.charge == -1 and i.is_monatomic and i.text in ("F", "Cl", "Br", "I")]
    for row in read_table("oxo_groups.csv"):
        group = Ion(parse_formula(row["formula"]), int(row["valence"]), row["name"], "", (), row["source"])
        _index(by_name, row, group)
        for halide in halides:
            counts = dict(group.formula.counts)
            counts[halide.text] = counts.get(halide.text, 0) + group.charge
            by_key.setdefault(counts_key(counts), f"{row['name']} {halide.name}")
    return by_name, by_key


IS, ALSO, MAY_BE = "is", "also", "may be"


@cache
def _established() -> tuple[dict[str, list[tuple[str, str]]], dict[tuple, tuple[str, ...]]]:
    """data/established_compounds.csv: folded name -> [(status, formula)], and
    the anhydrous counts key of an 'is' formula -> the 'also' formulas printed
    for the same substance (P4O10 beside P2O5)."""
    by_name: dict[str, list[tuple[str, str]]] = {}
    also: dict[str, list[str]] = {}
    main: dict[str, str] = {}
    for row in read_table("established_compounds.csv"):
        entry = (row["status"], row["formula"])
        for name in (row["name"], *split_names(row.get("other_names"))):
            entries = by_name.setdefault(_fold(name), [])
            if entry not in entries:
                entries.append(entry)
        if row["status"] == IS:
            main[_fold(row["name"])] = row["formula"]
        elif row["status"] == ALSO:
            also.setdefault(_fold(row["name"]), []).append(row["formula"])
    by_key: dict[tuple, tuple[str, ...]] = {}
    for name, formula in main.items():
        if name in also:
            key = counts_key(parse_formula(formula).counts)
            by_key[key] = tuple(also[name])
    return by_name, by_key


@cache
def _established_names() -> dict[tuple, str]:
    """Anhydrous counts key -> the name of an 'is' row of established_compounds.csv."""
    out: dict[tuple, str] = {}
    for status, formula in _established_rows():
        if status == IS:
            row_name = next(
                r["name"] for r in read_table("established_compounds.csv") if r["formula"] == formula
            )
            out.setdefault(counts_key(parse_formula(formula).anhydrous().counts), row_name)
    return out


def _established_rows() -> list[tuple[str, str]]:
    return [(row["status"], row["formula"]) for row in read_table("established_compounds.csv")]


@cache
def _hydrates() -> dict[tuple, tuple[frozenset[Number], Number | None]]:
    """data/hydrates.csv: anhydrous counts key -> (water counts that exist, the
    hydrate a label means by 'crystals' or None)."""
    table: dict[tuple, tuple[set[Number], list[Number]]] = {}
    for row in read_table("hydrates.csv"):
        key = counts_key(parse_formula(row["formula"]).counts)
        n = _number(row["water"])
        counts, crystals = table.setdefault(key, (set(), []))
        counts.add(n)  # type: ignore[arg-type]
        if row.get("sold_as") == "crystals":
            crystals.append(n)  # type: ignore[arg-type]
    return {k: (frozenset(v[0]), v[1][0] if v[1] else None) for k, v in table.items()}


@cache
def _commerce_order() -> dict[str, tuple[int, ...]]:
    """data/commerce_states.csv: symbol -> oxidation states, commonest in stores first."""
    return {
        row["symbol"]: tuple(int(x) for x in row["states"].split())
        for row in read_table("commerce_states.csv")
    }


def _metal_cations(symbol: str) -> list[Ion]:
    """The catalog cations of one element, the charges stores stock most often
    first (data/commerce_states.csv: copper(II) before copper(I))."""
    ions = [i for i in catalog() if i.charge > 0 and tuple(i.formula.counts) == (symbol,)]
    order = _commerce_order().get(symbol, ())

    def rank(ion: Ion) -> tuple[int, int]:
        state = ion.charge // int(next(iter(ion.formula.counts.values())))
        return (order.index(state) if state in order else len(order), state)

    return sorted(ions, key=rank)


@cache
def _allotropes() -> frozenset[tuple[str, str]]:
    return frozenset((row["symbol"], row["word"]) for row in read_table("allotropes.csv"))


_DIATOMIC = frozenset("H N O F Cl Br I".split())
