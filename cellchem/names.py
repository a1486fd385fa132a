"""Inorganic names both ways: name -> formula and formula -> name.

Follows the IUPAC 2005 recommendations (Nomenclature of Inorganic Chemistry,
IR-5 compositional names, IR-8 acids, IR-9 coordination compounds) on top of
the ion catalog and the formula engine. Names are read as stores and
suppliers write them: any case, British and American spellings, legacy
-ous/-ic names, trade forms (bicarbonate), trivial names (borax), catalogue
inversions ("sulfate, copper(II), pentahydrate"), Stock numbers with a space,
in either case, or as Arabic digits or charge numbers, and grade, purity,
form and concentration words, which are set aside as qualifiers.

Names that leave a variable metal's charge open ("iron chloride") and names
cellchem does not know (organic names, mixtures, product codes) are refused
with a message that says why; for the first kind the message lists the
candidates with their formulas.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass, replace
from fractions import Fraction
from functools import cache, lru_cache
from itertools import product
from math import gcd

import pyparsing as pp

from .charge import charge_balance
from .elements import element, symbols
from .errors import CellchemError
from .formula import Atom, Formula, Group, Item, Number, as_formula, parse_formula, render_items
from .ions import Ion, catalog, counts_key, ion_term, ions_in, lookup
from .tables import read_table, split_names

# ---------------------------------------------------------------------------
# Results
# ---------------------------------------------------------------------------


class NameError_(CellchemError):
    """A name that cannot be read, or a formula that cannot be named.

    Attributes (beyond CellchemError's):
        reason: why a name was refused, for programs that weigh the refusal
            (the audit): ``'open-charge'`` (a metal's charge is left open; the
            choices are the charges it may have), ``'ratio'`` (the name names
            its ions but not their ratio), ``'may-be'`` (the name is used for
            several compounds; the choices are those a cited table knows),
            ``'unknown'`` (no reading), or ``''``.
        ions: for ``'ratio'``, the ions the name names, as (formula, charge).
    """

    def __init__(
        self,
        message: str,
        *,
        text: str | None = None,
        position: int | None = None,
        choices: tuple[str, ...] = (),
        reason: str = "",
        ions: tuple[tuple[str, int], ...] = (),
    ) -> None:
        super().__init__(message, text=text, position=position, choices=choices)
        self.reason = reason
        self.ions = tuple(ions)

    def __reduce__(self):
        return (
            _rebuild_name_error,
            (type(self), self.message, self.text, self.position, self.choices, self.reason, self.ions),
        )


def _rebuild_name_error(cls, message, text, position, choices, reason, ions):
    return cls(message, text=text, position=position, choices=choices, reason=reason, ions=ions)


@dataclass(frozen=True)
class Component:
    """One ion or element of a name, as read.

    Attributes:
        role: ``'cation'``, ``'anion'`` or ``'element'`` (of a molecular compound).
        name: the name cellchem writes for it (``'iron(III)'``, ``'sulfate'``).
        formula: its formula without charge (``'Fe'``, ``'SO4'``).
        charge: its charge (0 for an element of a molecular compound).
        count: how many per formula unit.
    """

    role: str
    name: str
    formula: str
    charge: int
    count: Number


@dataclass(frozen=True)
class Qualifier:
    """A word or phrase set aside from a name: ``kind`` is one of grade,
    form, state, hydrate, purity, concentration, basicity; ``text`` is as found."""

    kind: str
    text: str


@dataclass(frozen=True)
class NameReading:
    """What ``read_name`` made of a name.

    Attributes:
        text: the input.
        compound: the compound part, as read after the qualifiers were set aside.
        kind: ``'salt'``, ``'acid'``, ``'molecular'``, ``'element'`` or ``'trivial'``.
        formula: the canonical formula.
        cations, anions: the ions with charges and counts (empty for elements
            and molecular compounds, whose parts are in ``elements``).
        elements: for molecular compounds and elements, the elements with counts.
        water: water of crystallisation per formula unit (0 none, None unknown).
        qualifiers: every qualifier found and set aside.
        forms: the legacy, regional, trivial or catalogue forms used, in words.
    """

    text: str
    compound: str
    kind: str
    formula: str
    cations: tuple[Component, ...] = ()
    anions: tuple[Component, ...] = ()
    elements: tuple[Component, ...] = ()
    water: Number | None = 0
    qualifiers: tuple[Qualifier, ...] = ()
    forms: tuple[str, ...] = ()


# ---------------------------------------------------------------------------
# Reference tables
# ---------------------------------------------------------------------------


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


def _formula_key(text: str) -> tuple:
    f = parse_formula(text)
    return (counts_key(f.counts), f.water)


# ---------------------------------------------------------------------------
# Normalising a name
# ---------------------------------------------------------------------------

_QUOTES = str.maketrans(
    {"’": "'", "‘": "'", "ʼ": "'", "′": "'", "`": "'", "´": "'", "“": '"', "”": '"', "„": '"'}
)
_DASHES = "‐‑‒–−"


def _fold(text: str) -> str:
    """Case-fold, NFKC, plain quotes and hyphens, single spaces, IUPAC spelling;
    a multiplicative prefix joined to its word ('di-Sodium' is 'disodium')."""
    s = re.sub(r"[\u00ad\u200b\u200c\u200d\u2060\ufeff]", "", text)  # soft hyphens, zero-width spaces
    s = re.sub(r"(\d)\s*½", r"\1.5", s).replace("½", " 0.5")
    s = unicodedata.normalize("NFKC", s).translate(_QUOTES)
    for d in _DASHES:
        s = s.replace(d, "-")
    s = s.replace("\u00a0", " ").casefold()
    s = re.sub(r"sulph", "sulf", s)
    s = re.sub(r"\baluminum", "aluminium", s)
    s = re.sub(r"\bcesium", "caesium", s)
    s = re.sub(r"\b(mono|di|tri|tetra|penta|hexa)-(?=[a-z]{3})", r"\1", s)
    s = re.sub(r"\s+", " ", s).strip()
    return s


def fold_name(text: str) -> str:
    """A name folded for exact comparison: case, Unicode forms, quotes, dashes,
    spaces, the spellings sulph/sulf, aluminum/aluminium, cesium/caesium, and
    Stock numbers written without a space ('copper (II)' is 'copper(ii)')."""
    return _stock(_fold(text))[0]


def _spelling_forms(text: str) -> list[str]:
    low = unicodedata.normalize("NFKC", text).casefold()
    forms = []
    if "sulph" in low:
        forms.append("British spelling 'sulph-'")
    if re.search(r"\baluminum", low):
        forms.append("American spelling 'aluminum'")
    if re.search(r"\bcesium", low):
        forms.append("American spelling 'cesium'")
    return forms


_ROMAN_VALUES = {"i": 1, "ii": 2, "iii": 3, "iv": 4, "v": 5, "vi": 6, "vii": 7, "viii": 8}
_ROMAN = {v: k.upper() for k, v in _ROMAN_VALUES.items()}


def _stock(s: str) -> tuple[str, list[str]]:
    """Write Stock numbers as '(iii)': join a space before '(', turn Arabic
    digits '(3)' and charge numbers '(3+)' of cations into Roman numerals."""
    forms = []
    if re.search(r"\s\((?:[ivx]+|\d\+?)\)", s):
        forms.append("Stock number written with a space")
    s = re.sub(r"\s+\(", "(", s)
    s = re.sub(r"\(\s+", "(", s)
    s = re.sub(r"\s+\)", ")", s)

    def arabic(m: re.Match[str]) -> str:
        n = int(m.group(1))
        if n in _ROMAN:
            forms.append("charge number" if m.group(2) else "Arabic Stock number")
            return "(" + _ROMAN[n].lower() + ")"
        return m.group(0)

    s = re.sub(r"(?<=[a-z])\(\+?(\d)(\+?)\)", arabic, s)
    return s, forms


# ---------------------------------------------------------------------------
# Qualifiers and hydrates
# ---------------------------------------------------------------------------

_CONCENTRATION = re.compile(
    r"(?<![\w.])\d+(?:[.,]\d+)?\s*"
    r"(?:mol\s*/\s*l|mol\s*l-1|mol·l-1|mol\s*dm-3|mol\s*/\s*dm3|mol\s*/\s*kg|mmol\s*/\s*l|g\s*/\s*l|mg\s*/\s*l|"
    r"ppm|%\s*\(?\s*(?:w/v|w/w|v/v|m/v|m/m|wt)\s*\)?|wt\s*\.?\s*%|m(?![\w])|mm(?![\w])|n(?![\w]))"
)
_PURITY = re.compile(
    r"(?:(?:min\.?|minimum|assay|purity|approx\.?|ca\.?)\s*)?(?:≥|>=|>|≤|<=|<|~)?\s*\d+(?:[.,]\d+)?\+?\s*%(?:\s*min\.?)?"
)
# Strengths as suppliers print them (common practice): a range of per cent
# ('28-30%', '95-97 %', '10-15% available chlorine'), a volume strength of
# hydrogen peroxide ('100 vol', '(20 volumes)'), a specific gravity ('0.88',
# '.880', 's.g. 1.84'); the words that may follow a strength are in
# qualifiers.csv (kind 'strength').
_RANGE = re.compile(
    r"(?<![\w.])\d+(?:[.,]\d+)?\s*%?\s*(?:-|to)\s*\d+(?:[.,]\d+)?\s*%(?:\s*\(?\s*(?:w/w|w/v|v/v)\s*\)?)?"
)
_VOLUME_STRENGTH = re.compile(r"(?<![\w.])\d+\s*(?:vol\.?|volumes?)(?![\w])")
_GRAVITY = re.compile(
    r"(?:(?<![\w.])(?:sp\.?\s*gr\.?|s\.\s*g\.?|sg|d|density)\s*=?\s*\d?\.\d{2,3}(?![\w.]))"
    r"|(?:(?<![\w.,%])(?:\d\.\d{2,3}|\.\d{3})\s*$)"
)
_HYDRATE_NUMBER = re.compile(r"(?<![\w])(\d+(?:[.,]\d+)?|x|n)\s*-?\s*hydrate(?![\w])")
_HYDRATE_FORMULA = re.compile(
    r"(?:[·•∙⋅*.]\s*|(?<![\w])(?=\d|x\s*h2o|n\s*h2o))(\d+(?:[.,]\d+)?|x|n|½)?\s*h2o(?![\w])"
)
# '-5-water', '5-water' (the British Pharmacopoeia's and older catalogues' form)
# and 'hemi(pentahydrate)' (common practice)
_HYDRATE_WATER = re.compile(r"(?:(?<=[a-z)])-|(?<![\w-]))(\d+(?:[.,]\d+)?)\s*-?\s*water(?![\w])")
_HYDRATE_HEMI = re.compile(r"(?<![\w])hemi\s*\(\s*([a-z]+hydrate)\s*\)")
# A grade phrase from 'for' to the next comma ('for molecular biology', 'for
# HPLC'), and impurity statements ('low in lead', 'arsenic free', 'iron-free'):
# none of them is part of a compound name (common practice).
_FOR_PHRASE = re.compile(r"(?<![\w])for [a-z0-9 .\-/]+?(?=,|;|\)|$)")
# A particle size or sieve mesh ('<5 µm', '-100 mesh', '325 mesh'), a grade named by
# its use ('FT-IR grade', 'HPLC grade') and a stabiliser statement ('stabilised
# with amylene'): none is part of a compound name (common practice).
_PARTICLE = re.compile(r"(?<![\w.])[<>≤≥~+-]?\s*\d+(?:[.,]\d+)?\s*(?:µm|μm|um|nm|microns?|mesh)(?![\w])")
_USE_GRADE = re.compile(r"(?<![\w])[a-z0-9][a-z0-9.+-]* grade(?![\w])")
_STABILISED = re.compile(r"(?<![\w])stabili[sz]ed(?: with [a-z0-9 .%-]+?)?(?=,|;|\)|$)")
_IMPURITY = re.compile(r"(?<![\w])(?:low in|poor in) ([a-z]+)(?![\w])|(?<![\w])([a-z]+)[ -]free(?![\w])")


def _take_impurities(s: str, found: list[Qualifier]) -> tuple[str, bool]:
    """Set aside 'low in lead', 'arsenic free', 'chloride-free' (the word must
    name an element or an ion, so 'EDTA free acid' is left alone); returns the
    rest and whether 'water-free' said the compound is anhydrous."""
    dry = False

    def keep(m: re.Match[str]) -> str:
        nonlocal dry
        word = m.group(1) or m.group(2)
        if word == "water":
            dry = True
        elif word not in _element_names() and word not in _ion_names() and word not in ("metal", "metals"):
            return m.group(0)
        found.append(Qualifier("hydrate" if word == "water" else "grade", m.group(0)))
        return " "

    return _IMPURITY.sub(keep, s), dry


def _as_written(q: Qualifier, text: str) -> Qualifier:
    """The qualifier as the input wrote it ('0.1 M', not the folded '0.1 m')."""
    pattern = r"\s*".join(re.escape(part) for part in q.text.split())
    m = re.search(pattern, unicodedata.normalize("NFKC", text), re.IGNORECASE)
    return Qualifier(q.kind, m.group(0)) if m else q


def _number(text: str) -> Number | None:
    if text in ("x", "n"):
        return None
    if text == "½":
        return Fraction(1, 2)
    value = Fraction(text.replace(",", "."))
    return int(value) if value.denominator == 1 else value


def _take(pattern: re.Pattern[str], s: str, kind: str, found: list[Qualifier]) -> str:
    def keep(m: re.Match[str]) -> str:
        found.append(Qualifier(kind, m.group(0).strip()))
        return " "

    return pattern.sub(keep, s)


def _set_aside(s: str) -> tuple[str, list[Qualifier], Number | str | None]:
    """Remove qualifiers and the hydrate statement. Returns the rest, the
    qualifiers, and the water: a count, None for unknown, '' if not stated."""
    found: list[Qualifier] = []
    water: Number | str | None = ""
    s = _take(_RANGE, s, "strength", found)
    s = _take(_VOLUME_STRENGTH, s, "strength", found)
    s = _take(_CONCENTRATION, s, "concentration", found)
    s = _take(_PURITY, s, "purity", found)
    s = _take(_FOR_PHRASE, s, "grade", found)
    s = _take(_PARTICLE, s, "form", found)
    s = _take(_STABILISED, s, "grade", found)
    s, dry = _take_impurities(s, found)
    if dry:
        water = 0

    m = _HYDRATE_HEMI.search(s)
    if m and m.group(1) in _hydrate_words() and _hydrate_words()[m.group(1)] is not None:
        water = _hydrate_words()[m.group(1)] / 2  # type: ignore[operator]
        water = int(water) if water == int(water) else Fraction(water)  # type: ignore[arg-type]
        found.append(Qualifier("hydrate", m.group(0)))
        s = s[: m.start()] + " " + s[m.end() :]
    for pattern in (_HYDRATE_FORMULA, _HYDRATE_WATER):
        m = pattern.search(s) if water == "" else None
        if m:
            water = _number(m.group(1)) if m.group(1) else 1
            found.append(Qualifier("hydrate", m.group(0).strip(" -")))
            s = s[: m.start()] + " " + s[m.end() :]
    m = _HYDRATE_NUMBER.search(s)
    if m:
        water = _number(m.group(1))
        found.append(Qualifier("hydrate", m.group(0).strip()))
        s = s[: m.start()] + " " + s[m.end() :]
    for word, count in sorted(_hydrate_words().items(), key=lambda kv: -len(kv[0])):
        pattern = re.compile(r"(?<![\w])" + re.escape(word) + r"(?![\w])")
        if pattern.search(s):
            water = count
            found.append(Qualifier("hydrate", word))
            s = pattern.sub(" ", s, count=1)
            break
    for pattern, kind in _qualifier_phrases():
        if pattern.search(s):
            text = pattern.search(s).group(0)  # type: ignore[union-attr]
            if kind == "hydrate":
                if text in ("anhydrous", "dried", "anhyd.", "anhyd", "dry"):
                    water = 0 if water == "" else water
                elif water == "":
                    water = None
            found.append(Qualifier(kind, text))
            s = pattern.sub(" ", s)
    s = _take(_USE_GRADE, s, "grade", found)
    s = _take(_GRAVITY, s.strip(" ,;"), "strength", found)
    for word, kind in (("monobasic", "basicity"), ("dibasic", "basicity"), ("tribasic", "basicity")):
        if re.search(rf"(?<![\w]){word}(?![\w])", s):
            found.append(Qualifier(kind, word))
            s = re.sub(rf"(?<![\w]){word}(?![\w])", " ", s)
    # brackets left empty, stray punctuation
    s = re.sub(r"[\(\[]\s*[,;/]*\s*[\)\]]", " ", s)
    s = re.sub(r"\s*;\s*|\s+/\s+", ", ", s)
    s = re.sub(r"\s+", " ", s).strip(" ,-")
    return s, found, water


# ---------------------------------------------------------------------------
# The lexicon of ion names
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class _Piece:
    """A word or words of a name, read: an ion, an element, or an open-charge metal."""

    role: str  # 'cation', 'anion', 'element', 'open'
    ion: Ion | None
    symbol: str = ""
    count: int | None = None  # from a multiplicative prefix
    forms: tuple[str, ...] = ()
    text: str = ""
    stock: tuple[int, ...] = ()  # mixed-valence Stock numbers


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


def _strip_prefix(word: str) -> list[tuple[int, str]]:
    """Readings of a word as multiplicative prefix + rest, with elision
    ('tetroxide' = tetra + oxide, 'monoxide' = mono + oxide)."""
    out = []
    for prefix, n in _prefix_values():
        if word.startswith(prefix) and len(word) > len(prefix) + 2:
            out.append((n, word[len(prefix) :]))
        if prefix[-1] in "ao" and word.startswith(prefix[:-1]) and len(word) > len(prefix) + 1:
            rest = word[len(prefix) - 1 :]
            if rest[0] in "aeiou":
                out.append((n, rest))
    return out


def _lookup_piece(phrase: str) -> list[_Piece]:
    """Every reading of a phrase (one or more words) as an ion, element or open metal."""
    pieces: list[_Piece] = []
    entries = _ion_names().get(phrase, [])
    if len(entries) > 1 and any(form == "" for _, form in entries):
        # a phrase that is one ion's own name and another's other name means
        # the first ('carbide' is C4-; CaC2 is read from its established name)
        entries = [(ion, form) for ion, form in entries if form == ""]
    for ion, form in entries:
        role = "cation" if ion.charge > 0 else "anion"
        pieces.append(_Piece(role, ion, forms=(form,) if form else (), text=phrase))
    group = _oxo_groups()[0].get(phrase)
    if group is not None and not pieces:
        pieces.append(_Piece("cation", group, forms=(f"oxo group '{phrase}'",), text=phrase))
    if not pieces:
        oxo = _oxoanion_by_state(phrase)
        if oxo is not None:
            pieces.append(_Piece("anion", oxo[0], forms=oxo[1], text=phrase))
    if not pieces:
        complex_ion = _read_complex(phrase)
        if complex_ion is None and " " in phrase and len(phrase.split()) <= 3:
            # 'hexammine cobalt(III)': the ligands written apart from the metal
            head = "".join(phrase.split()[:-1])
            try:
                _ligand_terms(head)
            except ValueError:
                pass
            else:
                complex_ion = _read_complex(phrase.replace(" ", ""))
        if complex_ion is not None:
            ion, form = complex_ion
            pieces.append(_Piece("cation" if ion.charge > 0 else "anion", ion, forms=form, text=phrase))
        else:
            for ion, form in _read_open_complex(phrase):
                pieces.append(_Piece("cation" if ion.charge > 0 else "anion", ion, forms=form, text=phrase))
    m = re.fullmatch(r"([a-z]+)\(((?:[ivx]+,)+[ivx]+)\)", phrase)
    if m and m.group(1) in _element_names():
        values = tuple(_ROMAN_VALUES.get(v, 0) for v in m.group(2).split(","))
        if all(values):
            pieces.append(_Piece("open", None, _element_names()[m.group(1)], stock=values, text=phrase))
    sym = _element_names().get(phrase)
    if sym is not None:
        cations = [ion for ion in catalog() if ion.charge > 0 and tuple(ion.formula.counts) == (sym,)]
        if len(cations) > 1 or not cations:
            pieces.append(_Piece("open" if cations else "element", None, sym, text=phrase))
        elif not element(sym).is_metal and not pieces:
            pieces.append(_Piece("element", None, sym, text=phrase))
    return pieces


def _central_state(ion: Ion) -> tuple[str, int] | None:
    """The central atom of an anion (its metal, else its one element besides O
    and H) and that atom's oxidation state, or None."""
    from .charge import oxidation_state

    symbols_ = list(ion.formula.counts)
    metals = [x for x in symbols_ if element(x).is_metal]
    others = [x for x in symbols_ if x not in ("O", "H")]
    centre = metals[0] if len(metals) == 1 else (others[0] if len(others) == 1 else None)
    if centre is None:
        return None
    try:
        state = oxidation_state(Formula(ion.formula.parts, ion.charge), centre)
    except CellchemError:
        return None
    return (centre, state) if isinstance(state, int) else None


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


@lru_cache(maxsize=4096)
def _oxoanion_by_state(phrase: str) -> tuple[Ion, tuple[str, ...]] | None:
    """An anion named with its central atom's oxidation state. A known name
    with a Stock number that agrees with it is that ion (ferricyanide(III),
    hexafluoroaluminate(III), sulfate(VI)); one that does not agree is never
    read past its words. An oxoanion's '-ate' stem with another oxidation
    state names the oxoanion of that state, as schools and stores write it:
    manganate(VII) is MnO4-, sulfate(IV) is SO3 2-, chlorate(I) is ClO-
    (IUPAC 2005 IR-5.4.2.2 gives the oxidation number in Roman numerals; the
    use with -ate names is common practice)."""
    m = re.fullmatch(r"([a-z]+)\(([ivx]+)\)", phrase)
    if not m or m.group(2) not in _ROMAN_VALUES:
        return None
    base, state = m.group(1), _ROMAN_VALUES[m.group(2)]
    named = [ion for ion, _ in _ion_names().get(base, []) if ion.charge < 0]
    for ion in named:
        central = _central_state(ion)
        if central is not None and central[1] == state:
            return ion, (f"Stock number after '{base}'",)
    plain_oxo = all("O" in i.formula.counts and len(set(i.formula.counts) - {"O"}) == 1 for i in named)
    if not base.endswith("ate") or not plain_oxo:
        return None  # only a plain oxoanion stem names another oxidation state
    stem_symbol = None
    _, back = _ate_names()
    stem = re.sub(r"^(?:di|tri|tetra|per|hypo)", "", base)
    stem_symbol = back.get(stem) or back.get(base)
    if stem_symbol is None and named:
        stem_symbol = next((x for x in named[0].formula.counts if x != "O"), None)
    if stem_symbol is None:
        return None
    from .charge import rule_states

    candidates = []
    for ion in catalog():
        counts = ion.formula.counts
        if ion.charge >= 0 or set(counts) != {stem_symbol, "O"}:
            continue
        states = rule_states(counts, ion.charge)
        if states is not None and states.get(stem_symbol) == state:
            candidates.append(ion)
    exact = [ion for ion in candidates if ion in named]
    if len(exact) == 1:
        return exact[0], ()
    single = [ion for ion in candidates if ion.formula.counts[stem_symbol] == 1]
    if len(single) == 1:
        return single[0], (f"oxidation-state name '{phrase}' for {single[0].name}",)
    return None


def _pieces_for(phrase: str) -> list[_Piece]:
    found = _lookup_piece(phrase)
    if found:
        if " " not in phrase and re.match(r"(?:di|tri|tetra|penta|hexa)", phrase):
            return found + _prefixed_pieces(phrase)
        return found
    m = re.fullmatch(r"([a-z]+?kis|bis|tris)\((.+)\)", phrase)
    if m and m.group(1) in _complex_prefix_values():
        n = _complex_prefix_values()[m.group(1)]
        for piece in _lookup_piece(m.group(2)):
            found.append(_Piece(piece.role, piece.ion, piece.symbol, n, piece.forms, phrase, piece.stock))
        return found
    if " " in phrase:
        return found
    return found + _prefixed_pieces(phrase)


def _prefixed_pieces(phrase: str) -> list[_Piece]:
    """Readings of one word as a multiplicative prefix and a name:
    'disulfide' as two sulfide (CS2) as well as the disulfide ion (FeS2)."""
    found: list[_Piece] = []
    for n, rest in _strip_prefix(phrase):
        for piece in _lookup_piece(rest):
            if piece.ion is not None and piece.ion.is_complex:
                continue
            found.append(_Piece(piece.role, piece.ion, piece.symbol, n, piece.forms, phrase, piece.stock))
    return found


def _segment(words: list[str]) -> list[list[_Piece]]:
    """All readings of a word list as a sequence of pieces (longest phrases first)."""
    results: list[list[_Piece]] = []

    @cache
    def at(i: int) -> tuple[tuple[_Piece, ...], ...]:
        if i == len(words):
            return ((),)
        out: list[tuple[_Piece, ...]] = []
        for j in range(min(len(words), i + 5), i, -1):
            phrase = " ".join(words[i:j])
            for piece in _pieces_for(phrase):
                for rest in at(j):
                    out.append((piece, *rest))
                    if len(out) > 64:
                        return tuple(out)
        return tuple(out)

    for reading in at(0):
        results.append(list(reading))
    return results


# ---------------------------------------------------------------------------
# Coordination entities by the additive rules (IUPAC 2005 IR-9)
# ---------------------------------------------------------------------------


@cache
def _complex_grammar() -> pp.ParserElement:
    by_name, _ = _ligands()
    simple, complex_ = _prefixes()
    prefix = pp.one_of([p for n, p in simple.items() if n >= 2]).set_name("prefix")
    cprefix = pp.one_of([p for n, p in complex_.items() if n >= 2 and p]).set_name(
        "prefix for a complex ligand"
    )
    ligand = pp.one_of(sorted(by_name, key=len, reverse=True)).set_name("ligand")
    term = pp.Group(
        (cprefix + pp.Suppress("(") + ligand + pp.Suppress(")"))
        | (prefix + ligand)
        | (pp.Empty().set_parse_action(lambda: "") + ligand)
    )
    metal = pp.Regex(r"[a-z]+").set_name("central atom")
    state = pp.Regex(r"\((?:[ivx]+|0|\d[+-])\)").set_name("oxidation state")
    grammar = pp.Group(pp.OneOrMore(term)) + metal + pp.Opt(state, default="") + pp.StringEnd()
    grammar.leave_whitespace()
    return grammar


@cache
def _prefix_numbers() -> dict[str, int]:
    simple, complex_ = _prefixes()
    numbers = {word: n for n, word in simple.items()}
    numbers.update({word: n for n, word in complex_.items() if word})
    return numbers


def _prefix_number(p: str) -> int:
    return _prefix_numbers().get(p, 1) if p else 1


@lru_cache(maxsize=4096)
def _read_complex(word: str) -> tuple[Ion, tuple[str, ...]] | None:
    """A coordination entity named by the additive rules, as an Ion, or None."""
    if " " in word or len(word) < 6:
        return None
    try:
        tree = _complex_grammar().parse_string(word, parse_all=True)
    except pp.ParseBaseException:
        # the ligands may have eaten the start of the metal name: try shorter splits
        return _read_complex_backtrack(word)
    return _complex_from_tree(tree, word)


def _complex_split(word: str) -> tuple[list[tuple[str, str]], str, str] | None:
    """(ligand terms, central-atom name, Stock number or '') of a coordination
    entity's name, or None."""
    try:
        tree = _complex_grammar().parse_string(word, parse_all=True)
        return [(t[0], t[1]) for t in tree[0]], tree[1], tree[2]
    except pp.ParseBaseException:
        pass
    m = re.fullmatch(r"(.*?)(\((?:[ivx]+|0|\d[+-])\))?", word)
    assert m is not None
    body, state = m.group(1), m.group(2) or ""
    _, back = _ate_names()
    names = {**{_fold(element(s).name): s for s in symbols()}, **{k: v for k, v in back.items()}}
    for metal_name in sorted(names, key=len, reverse=True):
        if body.endswith(metal_name) and len(body) > len(metal_name):
            try:
                return _ligand_terms(body[: -len(metal_name)]), metal_name, state
            except ValueError:
                continue
    return None


@lru_cache(maxsize=4096)
def _read_open_complex(word: str) -> tuple[tuple[Ion, tuple[str, ...]], ...]:
    """A coordination entity named without the oxidation state of a central
    atom that has several ('hexacyanoferrate'): one reading for each state,
    so that counts elsewhere in the name ('tripotassium hexacyanoferrate')
    settle it, and a name without counts is refused with the choices."""
    if " " in word or len(word) < 6:
        return ()
    split = _complex_split(word)
    if split is None or split[2]:
        return ()
    terms, metal_name, _ = split
    _, back = _ate_names()
    symbol = back.get(metal_name) or _element_names().get(metal_name)
    if symbol is None:
        return ()
    states = sorted({i.charge for i in _monatomic(symbol, +1)})
    if len(states) < 2:
        return ()
    out = []
    for ox in states:
        if ox not in _ROMAN:
            continue
        found = _complex_from_parts(terms, metal_name, f"({_ROMAN[ox].lower()})", word)
        if found is not None:
            out.append((found[0], (*found[1], f"'{word}' without the oxidation state of the central atom")))
    return tuple(out)


def _read_complex_backtrack(word: str) -> tuple[Ion, tuple[str, ...]] | None:
    m = re.fullmatch(r"(.*?)(\((?:[ivx]+|0|\d[+-])\))?", word)
    assert m is not None
    body, state = m.group(1), m.group(2) or ""
    _, back = _ate_names()
    names = {**{_fold(element(s).name): s for s in symbols()}, **{k: v for k, v in back.items()}}
    for metal_name in sorted(names, key=len, reverse=True):
        if body.endswith(metal_name) and len(body) > len(metal_name):
            head = body[: -len(metal_name)]
            try:
                terms = _ligand_terms(head)
            except ValueError:
                continue
            return _complex_from_parts(terms, metal_name, state, word)
    return None


@lru_cache(maxsize=4096)
def _ligand_terms_cached(text: str) -> tuple[tuple[str, str], ...]:
    by_name, _ = _ligands()
    simple, complex_ = _prefixes()
    prefixes = sorted(
        {p for n, p in simple.items() if n >= 2} | {p for n, p in complex_.items() if p},
        key=len,
        reverse=True,
    )
    ligands = sorted(by_name, key=len, reverse=True)

    def walk(i: int) -> tuple[tuple[str, str], ...] | None:
        if i == len(text):
            return ()
        options = []
        for p in ["", *prefixes]:
            # 'hexammine', 'tetrammine', 'hexaquo': the prefix's last vowel dropped
            # before a ligand that starts with one, as the trade writes them
            written = [p, p[:-1]] if p.endswith("a") else [p]
            for w in written:
                if not text.startswith(w, i):
                    continue
                j = i + len(w)
                paren = text.startswith("(", j)
                k = j + 1 if paren else j
                for lig in ligands:
                    if w != p and (paren or not lig.startswith("a")):
                        continue
                    if text.startswith(lig, k):
                        end = k + len(lig)
                        if paren:
                            if not text.startswith(")", end):
                                continue
                            end += 1
                        options.append(((p, lig), end))
        for term, end in options:
            rest = walk(end)
            if rest is not None:
                return (term, *rest)
        return None

    found = walk(0)
    if found is None:
        raise ValueError(text)
    return found


def _ligand_terms(text: str) -> list[tuple[str, str]]:
    return list(_ligand_terms_cached(text))


def _complex_from_tree(tree: pp.ParseResults, word: str) -> tuple[Ion, tuple[str, ...]] | None:
    terms = [(t[0], t[1]) for t in tree[0]]
    return _complex_from_parts(terms, tree[1], tree[2], word)


def _complex_from_parts(
    terms: list[tuple[str, str]], metal_name: str, state: str, word: str
) -> tuple[Ion, tuple[str, ...]] | None:
    by_name, _ = _ligands()
    _, back = _ate_names()
    forms: list[str] = []
    anion = False
    if metal_name in back:
        symbol = back[metal_name]
        anion = True
    elif metal_name in _element_names():
        symbol = _element_names()[metal_name]
    else:
        return None
    ligand_items: list[Item] = []
    ligand_charge = 0
    for prefix, lig in terms:
        f, charge, official = by_name[lig]
        n = _prefix_number(prefix)
        if lig != official.casefold():
            forms.append(f"older ligand name '{lig}' for {official}")
        ligand_charge += charge * n
        items = f.parts[0].items
        if len(items) == 1 and isinstance(items[0], Atom):
            ligand_items.append(Atom(items[0].symbol, items[0].count * n))
        else:
            ligand_items.append(Group(items, n, "("))
    if not state:
        # a central atom with one common charge needs no Stock number
        charges = [i.charge for i in _monatomic(symbol, +1)]
        if len(charges) != 1:
            return None
        ox = charges[0]
    elif state[1:-1] in _ROMAN_VALUES or state == "(0)":
        ox = _ROMAN_VALUES.get(state[1:-1], 0)
    else:
        total = int(state[1:-2]) * (1 if state[-2] == "+" else -1)
        ox = total - ligand_charge
    charge = ox + ligand_charge
    if charge == 0 or (charge < 0) != anion:
        return None
    group = Group((Atom(symbol, 1), *_ordered_ligands(ligand_items)), 1, "[")
    formula = Formula((_part((group,)),), 0, render_items((group,)))
    known = lookup(formula.counts, charge)
    name = complex_name(symbol, ligand_items, charge)
    ion = Ion(formula, charge, name, "", (), "IUPAC 2005 IR-9 additive name")
    if known is not None:
        ion = known
    return ion, tuple(forms)


def _part(items: tuple[Item, ...]):
    from .formula import Part

    return Part(items, 1)


def _ligand_formula_key(item: Item) -> str:
    return render_items((Group(item.items, 1, "("),)) if isinstance(item, Group) else item.symbol


def _ordered_ligands(items: list[Item]) -> list[Item]:
    """Ligands in a formula in alphabetical order of their formulas (IUPAC 2005 IR-9.2.3.1):
    [CoCl(NH3)5]."""
    return sorted(items, key=_ligand_formula_key)


def _ligand_name_of(item: Item) -> tuple[str, int, int] | None:
    """(ligand name, charge, how many) of one ligand item."""
    _, by_key = _ligands()
    if isinstance(item, Group):
        inner = Formula((_part(item.items),), 0)
        found = by_key.get(counts_key(inner.counts))
        n = item.count
    else:
        found = by_key.get(counts_key({item.symbol: 1}))
        n = item.count
        if found is None and item.count > 1:
            found = by_key.get(counts_key({item.symbol: item.count}))
            n = 1
    if found is None:
        return None
    return found[0], found[1], n


def complex_name(symbol: str, ligand_items: list[Item], charge: int) -> str:
    """The additive name of a coordination entity (IUPAC 2005 IR-9.2): ligands
    in alphabetical order with multiplicative prefixes, then the central atom
    (its '-ate' name in an anion) and its oxidation state as a Stock number
    where the central atom has more than one common charge or is a d-block or
    heavy p-block metal (silver too, diamminesilver(I), as stores write it;
    not Sc, Y, Zn, Cd, whose one charge IUPAC 2005 IR-9.2.2.4 lets go unsaid)."""
    simple, complex_ = _prefixes()
    parts = []
    ligand_charge = 0
    for item in ligand_items:
        found = _ligand_name_of(item)
        if found is None:
            raise NameError_(f"no ligand in the ligand table matches '{render_items((item,))}'")
        name, lig_charge, n = found
        ligand_charge += lig_charge * n
        parts.append((name, n))
    merged: dict[str, int] = {}
    for name, n in parts:
        # the donor-atom mark of an ambidentate ligand is left out in writing
        # (hexanitritocobaltate(III), as stores name it)
        name = re.sub(r"-(?:kappa)?[A-Z][a-z]?$", "", name)
        merged[name] = merged.get(name, 0) + n
    words = []
    for name in sorted(merged, key=lambda x: re.sub(r"[^a-z]", "", x)):
        n = merged[name]
        needs_complex = bool(re.search(r"[\d,()\- ]", name)) or name.startswith(("di", "tri", "tetra"))
        if n == 1:
            words.append(f"({name})" if needs_complex and re.search(r"[\d,\- ]", name) else name)
        elif needs_complex:
            words.append(f"{complex_[n]}({name})")
        else:
            words.append(f"{simple[n]}{name}")
    ox = charge - ligand_charge
    el = element(symbol)
    if charge < 0:
        forward, _ = _ate_names()
        centre = forward.get(symbol)
        if centre is None:
            raise NameError_(f"no anion name is known for {el.name} as the central atom of a complex anion")
    else:
        centre = el.name
    charges = [i.charge for i in _monatomic(symbol, +1)]
    d_block = (el.group is not None and 3 <= el.group <= 12) or symbol in ("Sn", "Sb", "Pb", "Tl", "Bi")
    if len(charges) > 1 or (d_block and symbol not in ("Sc", "Y", "Zn", "Cd")) or ox not in charges:
        centre += f"({_ROMAN.get(ox, str(ox))})" if ox > 0 else f"({ox})"
    return "".join(words) + centre


# ---------------------------------------------------------------------------
# Reading a name
# ---------------------------------------------------------------------------


def _unknown(text: str, why: str) -> NameError_:
    return NameError_(f"'{text}' is not a name cellchem can read: {why}", text=text)


def read_name(name: str) -> NameReading:
    """The analysis of a name: ions with charges and counts, water, qualifiers,
    and the legacy or regional forms used.

    Args:
        name: a name as found in a file, e.g. ``'Copper (II) Sulphate, 5-hydrate,
            AR, 99.5%'`` or ``'ferric chloride hexahydrate'``.

    Returns:
        A NameReading.

    Raises:
        CellchemError: the name leaves a metal's charge open (the message lists
            the candidates with their formulas), or is not a name cellchem knows.

    >>> r = read_name("Copper (II) Sulphate, 5-hydrate, AR")
    >>> r.formula, [q.text for q in r.qualifiers]
    ('CuSO4·5H2O', ['5-hydrate', 'AR'])
    """
    if not isinstance(name, str) or not name.strip():
        raise NameError_("no name given (the text is empty)", text=str(name))
    return _read_name(name)


def name_core(name: str) -> tuple[str, Number | str | None]:
    """The words of a name left when its grade, form, purity, strength and hydrate
    words are set aside (folded as ``read_name`` folds them), and the water the name
    states: a count, None for an unknown count, '' when it says none.

    >>> name_core("Ethanol, absolute, AR 99.8%")
    ('ethanol', '')
    >>> name_core("Citric acid monohydrate, ACS reagent")
    ('citric acid', 1)
    """
    plain_text, _ = _bracketed_formulas(name.strip())
    folded, _ = _bracketed_names(_fold(plain_text))
    folded, _ = _stock(folded)
    rest, _, water = _set_aside(folded)
    rest = re.sub(r"\s*,(?:\s*,)*\s*", ", ", " ".join(rest.split()))
    return rest.strip(" ,;"), water


@lru_cache(maxsize=32768)
def _read_name(name: str) -> NameReading:
    text = name.strip()
    forms = _spelling_forms(text)
    plain_text, formulas = _bracketed_formulas(text)
    folded, synonyms = _bracketed_names(_fold(plain_text))
    synonyms += formulas
    folded, stock_forms = _stock(folded)
    forms.extend(stock_forms)
    rest, qualifiers, water = _set_aside(folded)
    qualifiers = [_as_written(q, text) for q in qualifiers] + [Qualifier("synonym", n) for n, _ in synonyms]
    if not rest:
        raise _unknown(text, "only qualifiers were found (" + ", ".join(q.text for q in qualifiers) + ")")
    try:
        reading = _read_rest(text, folded, rest, qualifiers, water, forms)
    except NameError_ as exc:
        chosen = _chosen_by_synonym(text, exc, synonyms)
        if chosen is None:
            raise
        reading = _whole_reading(
            text, rest, "salt", chosen, water, qualifiers, [*forms, "the name in brackets"]
        )
        reading = _with_kind(reading)
    reading = _agree_with_synonyms(text, reading, synonyms)
    _check_colours(text, reading)
    if water == "" and any(q.kind == "form" and q.text.casefold() in _CRYSTAL_WORDS for q in qualifiers):
        reading = _crystals(reading)
    return reading


# ---------------------------------------------------------------------------
# Words around the compound: a name in brackets, colours, 'acid, X salt'
# ---------------------------------------------------------------------------


def _bracketed_names(folded: str) -> tuple[str, list[tuple[str, NameReading]]]:
    """Set aside a name written in brackets after another ('magnesium sulfate
    heptahydrate (Epsom salt)', 'sodium tetraborate (borax)') when it reads as
    a compound on its own; brackets that do not read stay in the text."""
    found: list[tuple[str, NameReading]] = []

    def aside(m: re.Match[str]) -> str:
        inner = m.group(1).strip()
        if not re.search(r"[a-z]{3}", inner) or re.fullmatch(r"[ivx,\s]+|[\d\s+-]+", inner):
            return m.group(0)
        try:
            reading = _read_name(inner)
        except CellchemError:
            return m.group(0)
        found.append((inner, reading))
        return " "

    out = re.sub(r"(?<=\s)\(([^()]*(?:\([ivx,]+\)[^()]*)*)\)(?=\s|,|$)", aside, folded)
    out = re.sub(r'(?<![\w])"([^"]+)"(?![\w])', aside, out)  # a quoted name: '"sugar of lead"'
    return out, found


def _bracketed_formulas(text: str) -> tuple[str, list[tuple[str, NameReading]]]:
    """Set aside a formula written in brackets after a name, as catalogues print
    it ('Copper oxide (CuO)', 'Iron chloride (FeCl3)'): it stands beside the
    name as a second witness of the compound. Roman numerals are Stock numbers,
    not formulas."""
    found: list[tuple[str, NameReading]] = []

    def aside(m: re.Match[str]) -> str:
        inner = m.group(1).strip()
        if re.fullmatch(r"[IVX]+(?:,[IVX]+)*", inner) or not re.search(r"[A-Z]", inner):
            return m.group(0)
        try:
            f = parse_formula(inner)
        except CellchemError:
            return m.group(0)
        if f.charge or len(f.counts) < 2:
            return m.group(0)
        found.append(
            (inner, _whole_reading(inner, inner, _kind_of(f.anhydrous()), f, "", [], ["formula in brackets"]))
        )
        return " "

    out = re.sub(r"(?<=[\w)\]])\s*\(([A-Za-z0-9·.\[\]() ]+?)\)(?=\s|,|;|$)", aside, text)
    return out, found


def _same_dry(a: Formula, b: Formula) -> bool:
    return counts_key(a.anhydrous().counts) == counts_key(b.anhydrous().counts)


def _chosen_by_synonym(text: str, exc: NameError_, synonyms: list[tuple[str, NameReading]]) -> Formula | None:
    """A refusal that listed candidates, settled by the name in brackets
    ('sodium borate (borax)')."""
    if not synonyms or not exc.choices:
        return None
    picked = {
        c for c in exc.choices for _, r in synonyms if _same_dry(parse_formula(c), parse_formula(r.formula))
    }
    if len(picked) != 1:
        return None
    wet = [parse_formula(r.formula) for _, r in synonyms]
    return (
        wet[0] if _same_dry(wet[0], parse_formula(next(iter(picked)))) else parse_formula(next(iter(picked)))
    )


def _with_kind(reading: NameReading) -> NameReading:
    return replace(reading, kind=_kind_of(parse_formula(reading.formula).anhydrous()))


def _agree_with_synonyms(
    text: str, reading: NameReading, synonyms: list[tuple[str, NameReading]]
) -> NameReading:
    """The name in brackets must name the same compound; where the name before
    it says nothing of water and the one in brackets does (borax is the
    decahydrate), the water is the bracketed name's."""
    f = parse_formula(reading.formula)
    for inner, other in synonyms:
        g = parse_formula(other.formula)
        if not _same_dry(f, g) and not same_substance(f.anhydrous(), g.anhydrous()):
            what = "formula" if any(c.isupper() for c in inner) else "name"
            raise NameError_(
                f"'{text}' names two compounds: the name reads as {f.text()}, the {what} in brackets"
                f" '{inner}' as {g.text()}; write one name",
                text=text,
                choices=(f.text(), g.text()),
                reason="may-be",
            )
        stated = any(q.kind == "hydrate" for q in reading.qualifiers)
        if f.water != g.water:
            if stated and other.water != 0 and any(q.kind == "hydrate" for q in other.qualifiers):
                raise NameError_(
                    f"'{text}' names two hydrates: the name reads as {f.text()}, the name in brackets"
                    f" '{inner}' as {g.text()}",
                    text=text,
                    choices=(f.text(), g.text()),
                    reason="may-be",
                )
            if not stated:
                reading = _rewet(reading, g.water, f"water from the name in brackets '{inner}'")
                f = parse_formula(reading.formula)
    return reading


def _rewet(reading: NameReading, water: Number | None, form: str) -> NameReading:
    """The reading with this water of crystallisation, and the form that says why."""
    dry = parse_formula(reading.formula).anhydrous()
    wet = dry.with_water(water) if water else dry
    cations, anions, elements_ = _components_of(wet)
    return replace(
        reading,
        formula=wet.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=wet.water,
        forms=(*reading.forms, form),
    )


@cache
def _allotropes() -> frozenset[tuple[str, str]]:
    return frozenset((row["symbol"], row["word"]) for row in read_table("allotropes.csv"))


def _check_colours(text: str, reading: NameReading) -> None:
    """A colour word before an element name is read only where it names a form
    of the element (red phosphorus): 'white arsenic' is arsenic trioxide."""
    if reading.kind != "element":
        return
    symbol = reading.elements[0].formula if reading.elements else ""
    for q in reading.qualifiers:
        if q.kind == "colour" and (symbol, q.text.casefold()) not in _allotropes():
            raise NameError_(
                f"'{text}' is not read: '{q.text}' before an element name may name a compound of it"
                f" (white arsenic is arsenic trioxide), and no form of {reading.compound} is called"
                f" '{q.text}'; write the formula or the compound's name",
                text=text,
                reason="unknown",
            )


_SALT = re.compile(r"^(?P<body>.+?)\s+salt(?:\s*\(\s*(?P<m>\d+)\s*:\s*(?P<n>\d+)\s*\))?$")


def _acid_salt_inversion(text: str, rest: str) -> tuple[str, str] | None:
    """'acetic acid, sodium salt', 'phosphoric acid, disodium salt', 'EDTA
    disodium salt', 'sulfuric acid, copper(2+) salt (1:1)' (catalogue and
    registry style): the cation's name, then the acid's anion; a ratio in
    brackets gives the counts. A polyprotic acid's salt with no count on the
    cation ('citric acid, sodium salt') does not say how many hydrogens are
    replaced: refused."""
    m = _SALT.match(rest.replace(" ,", ","))
    if not m:
        return None
    words = m.group("body").replace(",", " , ").split()
    for k in range(len(words) - 1, 0, -1):
        acid = " ".join(w for w in words[:k] if w != ",").strip()
        cation = " ".join(w for w in words[k:] if w != ",").strip()
        if not acid or not cation or len(cation.split()) > 2:
            continue
        anion = _anion_of_acid(acid)
        if anion is None:
            continue
        if m.group("m"):
            # a registry ratio of cation to anion: counts for both
            a, b = int(m.group("m")), int(m.group("n"))
            simple, _ = _prefixes()
            cation_word = (simple[a] if a > 1 else "") + cation
            anion_word = (simple[b] if b > 1 else "") + anion.name if b > 1 else anion.name
            return f"{cation_word} {anion_word}", "catalogue form 'acid, cation salt (ratio)'"
        counted = re.match(r"(mono|di|tri|tetra)(?=[a-z])", cation)
        if not counted and anion.charge < -1:
            bases = [i for i in (_protonated(anion, j) for j in range(1, -anion.charge + 1)) if i is not None]
            raise NameError_(
                f"'{text}' does not say how many of the {-anion.charge} acid hydrogens the {cation} replaces;"
                f" write mono-, di- or tri{cation} salt, or the formula",
                text=text,
                choices=tuple(i.name for i in bases),
                reason="ratio",
            )
        return f"{cation} {anion.name}", "catalogue form 'acid, cation salt'"
    return None


def _anion_of_acid(words: str) -> Ion | None:
    """The anion of an acid named in acids.csv, or an anion named directly ('EDTA')."""
    if words in _acids()[0]:
        return next((ion for name, ion in _acid_anions() if name == words), None)
    named = [ion for ion, _ in _ion_names().get(words, []) if ion.charge < 0]
    return named[0] if len(named) == 1 else None


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


def _read_rest(
    text: str,
    folded: str,
    rest: str,
    qualifiers: list[Qualifier],
    water: Number | str | None,
    forms: list[str],
) -> NameReading:
    # whole-name tables (trivial names, established names, acids): first with
    # only numbers set aside ('ammonia solution 35%', 'laughing gas'), then
    # with every qualifier set aside ('caustic soda pellets')
    numbers_only = _take(_PURITY, _take(_CONCENTRATION, folded, "concentration", []), "purity", [])
    for candidate in (_plain(numbers_only), _plain(rest)):
        whole = _whole_lookup(text, candidate, water, qualifiers, forms)
        if whole is not None:
            return whole

    if "—" in rest:
        return _read_addition(text, rest, qualifiers, forms)
    salt = _acid_salt_inversion(text, rest)
    if salt is not None:
        rest = salt[0]
        forms = [*forms, salt[1]]
    chunks = [c.strip() for c in re.split(r"(?<!\d),(?![^()]*\))|,(?!\d)(?![^()]*\))", rest) if c.strip()]
    errors: list[CellchemError] = []
    built: list[NameReading] = []
    sized: list[tuple[NameReading, int]] = []
    for chunk_order in _chunk_orders(chunks):
        words = " ".join(chunk_order).split()
        for pieces in _segment(words):
            try:
                reading = _build(text, pieces, water, qualifiers, forms, chunk_order != chunks)
                built.append(reading)
                # fewest pieces, then fewest counts read from prefixes ('dichromate'
                # is the dichromate ion before it is two chromate ions)
                sized.append((reading, (len(pieces), sum(1 for p in pieces if p.count is not None))))
            except CellchemError as exc:
                errors.append(exc)
        if built:
            break
    if not built and not errors:
        raise _unknown(text, _why_unread(rest))
    if len({b.formula for b in built}) > 1:
        # the reading of fewest pieces wins ('hydrogen tartrate' as one anion,
        # not H+ and tartrate)
        fewest = min(size for _, size in sized)
        built = [b for b, size in sized if size == fewest]
    unique = {b.formula: b for b in built}
    if len(unique) == 1:
        return next(iter(unique.values()))
    if len(unique) > 1:
        listing = ", ".join(f"{f}" for f in unique)
        raise NameError_(
            f"'{text}' can be read more than one way: {listing}",
            text=text,
            choices=tuple(unique),
            reason="may-be",
        )
    first = min(errors, key=_error_rank)
    if f"'{text}'" not in str(first):
        raise NameError_(
            f"'{text}' cannot be read: {first}",
            text=text,
            choices=first.choices,
            reason=getattr(first, "reason", ""),
            ions=getattr(first, "ions", ()),
        ) from first
    raise first


def _error_rank(exc: CellchemError) -> int:
    """Which refusal to report when several readings fail: the one that says most."""
    order = ("may-be", "ratio", "open-charge", "basicity", "")
    reason = getattr(exc, "reason", "")
    return order.index(reason) if reason in order else len(order)


def _read_addition(text: str, rest: str, qualifiers: list[Qualifier], forms: list[str]) -> NameReading:
    """An addition compound (IUPAC 2005 IR-5.5): 'sodium carbonate—hydrogen
    peroxide (2/3)', 'potassium sulfate—aluminium sulfate—water (1/1/24)'."""
    m = re.search(r"\(\s*(\d+(?:\s*/\s*\d+)+)\s*\)\s*$", rest)
    if not m:
        raise _unknown(text, "an addition compound name needs the ratio of its parts, e.g. '(2/3)'")
    ratio = [int(x) for x in m.group(1).replace(" ", "").split("/")]
    names = [n.strip() for n in rest[: m.start()].split("—")]
    if len(names) != len(ratio):
        raise _unknown(text, f"it names {len(names)} parts but gives {len(ratio)} numbers in the ratio")
    pieces = []
    for name, n in zip(names, ratio):
        f = parse_formula("H2O") if name == "water" else parse_formula(_read_name(name).formula)
        body = f.text()
        pieces.append((str(n) if n != 1 else "") + body)
    formula = parse_formula("·".join(pieces))
    cations, anions, elements_ = _components_of(formula)
    return NameReading(
        text=text,
        compound=rest,
        kind="salt",
        formula=formula.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=formula.water,
        qualifiers=tuple(qualifiers),
        forms=(*forms, "addition compound"),
    )


def as_ions(formula: str | Formula) -> Formula:
    """A formula in Hill order or as a table writes it, rewritten cations first as the
    rules write it where it reads as one salt; unchanged otherwise.

    >>> as_ions("CHNaO3").text(), as_ions("C2H6O").text()
    ('NaHCO3', 'C2H6O')
    """
    return _canonical(as_formula(formula))


def _canonical(f: Formula) -> Formula:
    """A table formula written as the rules write it (alum KAl(SO4)2·12H2O as
    AlK(SO4)2·12H2O), so a trivial name and its systematic name agree."""
    if (len(f.parts) > 1 and not all(p.is_water for p in f.parts[1:])) or f.charge:
        return f
    balance = charge_balance(f.anhydrous())
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return f
    try:
        rebuilt = _assemble([(s.ion, int(s.count)) for s in balance.charges])  # type: ignore[misc]
    except (CellchemError, TypeError, ValueError):
        return f
    if counts_key(rebuilt.counts) != counts_key(f.anhydrous().counts):
        return f
    return rebuilt.with_water(f.water) if f.water else rebuilt


def _plain(rest: str) -> str:
    """Commas (outside Stock numbers such as '(ii,iii)') as spaces, single spaces."""
    return re.sub(r"\s+", " ", re.sub(r",(?![^()]*\))", " ", rest)).strip(" ,")


def _kind_of(f: Formula) -> str:
    balance = charge_balance(f)
    kind = {"ionic": "salt", "molecular": "molecular", "element": "element"}.get(balance.kind, "salt")
    cations = [c for c in balance.charges if c.charge > 0]
    if kind == "salt" and cations and all(c.ion is not None and c.ion.text == "H" for c in cations):
        kind = "acid"
    return kind


def _whole_lookup(
    text: str, plain: str, water: Number | str | None, qualifiers: list[Qualifier], forms: list[str]
) -> NameReading | None:
    ambiguous = _ambiguous_acids().get(plain)
    if ambiguous is not None:
        _, why, candidates = ambiguous
        wet = [parse_formula(c).with_water(water).text() if water not in ("", 0) else c for c in candidates]
        raise NameError_(
            f"'{text}' is used for more than one substance ({why}): it may be {' or '.join(wet)}; write"
            " the formula, or a name that fixes it",
            text=text,
            choices=tuple(wet),
            reason="may-be",
        )
    for table, kind, label in (
        (_trivial(), "trivial", "trivial name"),
        (_named()[0], "", "established name"),
        (_acids()[0], "acid", ""),
    ):
        found = table.get(plain)
        if found is None:
            continue
        formula_text = found[0] if isinstance(found, tuple) else found
        if kind == "trivial" and found[2].startswith("Ambiguous:") and _fold(found[1]) == plain:
            # the table marks a name the trade also uses for other substances
            why = found[2][len("Ambiguous:") :].strip().split(";")[0].rstrip(".")
            usual = _canonical(parse_formula(formula_text)).text()
            raise NameError_(
                f"'{text}' is used for more than one substance ({why}); the usual meaning is {usual}:"
                " write the formula or the systematic name",
                text=text,
                choices=(usual,),
                reason="may-be",
            )
        f = parse_formula(formula_text)
        extra = [f"{label} '{plain}'"] if label else []
        balance = charge_balance(f)
        if kind == "acid" and balance.kind != "ionic":
            kind = ""
        if not kind:
            kind = _kind_of(f)
        if kind == "trivial":
            f = _canonical(f)
        kept = [q for q in qualifiers if q.kind != "state" or q.text not in plain]
        if kind == "acid" or "solution" in plain:
            kept = [Qualifier("concentration", q.text) if q.kind == "purity" else q for q in kept]
        return _whole_reading(text, plain, kind, f, water, kept, forms + extra)
    rows = _established()[0].get(plain)
    if rows and not (any(q.kind == "basicity" for q in qualifiers) and all(st == MAY_BE for st, _ in rows)):
        # ('sodium phosphate, dibasic': the basicity word, not the table, decides)
        return _established_reading(text, plain, rows, water, qualifiers, forms)
    return None


# ---------------------------------------------------------------------------
# Established compounds, hydrates that exist, the charges stores stock
# ---------------------------------------------------------------------------

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


def same_substance(a: str | Formula, b: str | Formula) -> bool:
    """True when two formulas are printed for one substance by a cited table
    (P2O5 and P4O10, As2O3 and As4O6: data/established_compounds.csv), or
    have the same element counts and water.

    >>> same_substance("P2O5", "P4O10")
    True
    """
    fa, fb = as_formula(a), as_formula(b)
    if counts_key(fa.counts) == counts_key(fb.counts) and fa.water == fb.water:
        return True
    if fa.water != fb.water:
        return False
    by_key = _established()[1]
    da, db = fa.anhydrous(), fb.anhydrous()
    for x, y in ((da, db), (db, da)):
        for other in by_key.get(counts_key(x.counts), ()):
            if counts_key(parse_formula(other).counts) == counts_key(y.counts):
                return True
    return False


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


def known_hydrates(formula: str | Formula) -> frozenset[Number]:
    """The numbers of water molecules of the hydrates of a compound that a cited
    table knows (data/hydrates.csv), not counting 0; empty when it knows none.

    >>> sorted(known_hydrates("CuSO4"))
    [1, 5]
    """
    key = counts_key(as_formula(formula).anhydrous().counts)
    return _hydrates().get(key, (frozenset(), None))[0]


_CRYSTAL_WORDS = frozenset({"crystals", "crystal", "crystalline", "cryst.", "cryst"})


def _crystals(reading: NameReading) -> NameReading:
    """'crystals' on a label means the hydrate the compound is sold as when it
    has one (copper sulfate crystals are CuSO4·5H2O, washing soda crystals
    Na2CO3·10H2O); nothing when the table knows none."""
    f = parse_formula(reading.formula)
    if f.water:
        return reading
    crystals = _hydrates().get(counts_key(f.counts), (frozenset(), None))[1]
    if crystals is None:
        return reading
    return _rewet(reading, crystals, f"'crystals' for the {_hydrate_suffix(crystals).strip()}")


@cache
def _commerce_order() -> dict[str, tuple[int, ...]]:
    """data/commerce_states.csv: symbol -> oxidation states, commonest in stores first."""
    return {
        row["symbol"]: tuple(int(x) for x in row["states"].split())
        for row in read_table("commerce_states.csv")
    }


def _established_reading(
    text: str,
    plain: str,
    rows: list[tuple[str, str]],
    water: Number | str | None,
    qualifiers: list[Qualifier],
    forms: list[str],
) -> NameReading:
    """A name found in the established-compounds table: its 'is' formula, or
    the one 'may be' formula that the stated hydrate selects, or a refusal
    that lists the candidates."""
    main = [f for status, f in rows if status == IS]
    if main:
        f = _canonical(parse_formula(main[0]))
        return _whole_reading(
            text, plain, _kind_of(f), f, water, qualifiers, [*forms, f"established compound '{plain}'"]
        )
    candidates = [parse_formula(f) for status, f in rows if status == MAY_BE]
    if water not in ("", 0, None):
        fitting = [c for c in candidates if water in known_hydrates(c)]
        if len(fitting) == 1:
            return _whole_reading(
                text,
                plain,
                _kind_of(fitting[0]),
                fitting[0],
                water,
                qualifiers,
                [
                    *forms,
                    f"established compound '{plain}' (the {_hydrate_suffix(water).strip()} that exists)",
                ],
            )
    wet = [c.with_water(water) if water not in ("", 0) else c for c in candidates]  # type: ignore[arg-type]
    listing = " or ".join(c.text() for c in wet)
    raise NameError_(
        f"'{text}' names more than one compound in the trade: it may be {listing}; write the formula,"
        " or a name that fixes it",
        text=text,
        choices=tuple(c.text() for c in wet),
        reason="may-be",
    )


@cache
def _by_ion_set() -> dict[frozenset[tuple[str, int]], tuple[str, ...]]:
    """Established compounds (established_compounds.csv 'is' and 'may be' rows,
    named_compounds.csv, trivial_names.csv) by the set of ions they hold, with
    a coordination entity also counted as its metal ion and ligand anions, so
    that a name which does not state the ratio of its ions ('ammonium iron(II)
    sulfate', 'potassium ferric oxalate') finds the compounds the trade means."""
    formulas: list[str] = [f for status, f in _established_rows() if status in (IS, MAY_BE)]
    formulas += [row["formula"] for row in read_table("named_compounds.csv")]
    formulas += [row["formula"] for row in read_table("trivial_names.csv")]
    table: dict[frozenset[tuple[str, int]], list[str]] = {}
    for text in formulas:
        f = parse_formula(text).anhydrous()
        if len(f.parts) > 1:
            continue
        for key in ion_sets(f):
            entries = table.setdefault(key, [])
            canonical = _canonical(f).text()
            if canonical not in entries:
                entries.append(canonical)
    return {k: tuple(v) for k, v in table.items()}


def _established_rows() -> list[tuple[str, str]]:
    return [(row["status"], row["formula"]) for row in read_table("established_compounds.csv")]


def ion_sets(f: Formula) -> list[frozenset[tuple[str, int]]]:
    """The set of ions of an ionic formula, and (when it holds a coordination
    entity whose ligands are all catalog anions) the set with the entity split
    into its metal ion and ligand anions."""
    balance = charge_balance(f)
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return []
    direct = frozenset((s.ion.text, s.ion.charge) for s in balance.charges if s.ion is not None)
    split: set[tuple[str, int]] = set()
    for share in balance.charges:
        ion = share.ion
        assert ion is not None
        inner = _split_entity(ion)
        if inner is None:
            split.add((ion.text, ion.charge))
        else:
            split |= inner
    return [direct] if frozenset(split) == direct else [direct, frozenset(split)]


def _split_entity(ion: Ion) -> set[tuple[str, int]] | None:
    """A coordination entity [M(L)n] as its metal ion and ligand anions, or None."""
    items = ion.formula.parts[0].items
    if not ion.is_complex and not (
        len(items) >= 2 and isinstance(items[0], Atom) and element(items[0].symbol).is_metal
    ):
        return None
    if ion.is_complex:
        group = items[0]
        assert isinstance(group, Group)
        items = group.items
    metal = items[0]
    if not isinstance(metal, Atom) or metal.count != 1 or not element(metal.symbol).is_metal:
        return None
    out: set[tuple[str, int]] = set()
    ligand_charge = 0
    for item in items[1:]:
        inner = item.items if isinstance(item, Group) else (Atom(item.symbol, 1),)
        n = item.count
        counts = Formula((_part(inner),), 0).counts
        anion = next(
            (i for i in catalog() if i.charge < 0 and counts_key(i.formula.counts) == counts_key(counts)),
            None,
        )
        if anion is None:
            return None
        out.add((anion.text, anion.charge))
        ligand_charge += anion.charge * n
    state = ion.charge - ligand_charge
    cation = next((i for i in _monatomic(metal.symbol, +1) if i.charge == state), None)
    if cation is None:
        return None
    out.add((cation.text, cation.charge))
    return out


def _chunk_orders(chunks: list[str]) -> list[list[str]]:
    """The chunks as written, then (catalogue inversion) with the anion chunk
    moved after the others: 'sulfate, copper(ii)' -> 'copper(ii) sulfate'."""
    orders = [chunks]
    if len(chunks) > 1:
        orders.append(chunks[1:] + chunks[:1])
        orders.append(list(reversed(chunks)))
    return orders


def _why_unread(rest: str) -> str:
    words = rest.replace(",", " ").split()
    unknown = [w for w in words if not _pieces_for(w)]
    if unknown:
        return (
            "no ion, element or known compound answers to "
            + ", ".join(f"'{w}'" for w in unknown[:3])
            + " (organic names, mixtures and product codes are not read)"
        )
    return "its words do not make up a compound (expected cation names, then anion names)"


def _whole_reading(
    text: str,
    compound: str,
    kind: str,
    f: Formula,
    water: Number | str | None,
    qualifiers: list[Qualifier],
    forms: list[str],
) -> NameReading:
    if water != "" and f.water != water:
        if water == 0:
            f = f.anhydrous()
        else:
            f = f.with_water(water)  # type: ignore[arg-type]
    cations, anions, elements_ = _components_of(f)
    return NameReading(
        text=text,
        compound=compound,
        kind=kind,
        formula=f.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=f.water,
        qualifiers=tuple(qualifiers),
        forms=tuple(forms),
    )


def _components_of(f: Formula) -> tuple[tuple[Component, ...], tuple[Component, ...], tuple[Component, ...]]:
    result = charge_balance(f)
    cations: list[Component] = []
    anions: list[Component] = []
    elements_: list[Component] = []
    if result.kind == "ionic":
        for share in result.charges:
            if share.ion is None:
                continue
            comp = Component(
                "cation" if share.charge > 0 else "anion",
                share.ion.name,
                share.ion.text,
                share.charge,
                share.count,
            )
            (cations if share.charge > 0 else anions).append(comp)
    else:
        for sym, n in f.anhydrous().counts.items():
            elements_.append(Component("element", element(sym).name, sym, 0, n))
    return tuple(cations), tuple(anions), tuple(elements_)


def _metal_cations(symbol: str) -> list[Ion]:
    """The catalog cations of one element, the charges stores stock most often
    first (data/commerce_states.csv: copper(II) before copper(I))."""
    ions = [i for i in catalog() if i.charge > 0 and tuple(i.formula.counts) == (symbol,)]
    order = _commerce_order().get(symbol, ())

    def rank(ion: Ion) -> tuple[int, int]:
        state = ion.charge // int(next(iter(ion.formula.counts.values())))
        return (order.index(state) if state in order else len(order), state)

    return sorted(ions, key=rank)


def _candidates(symbol: str, others: list[_Piece]) -> list[tuple[str, str]]:
    out = []
    for ion in _metal_cations(symbol):
        try:
            pieces = [_Piece("cation", ion), *others]
            formula = _formula_of(pieces)
            out.append((ion.name, formula.text()))
        except CellchemError:
            continue
    return out


def _build(
    text: str,
    pieces: list[_Piece],
    water: Number | str | None,
    qualifiers: list[Qualifier],
    forms: list[str],
    inverted: bool,
) -> NameReading:
    forms = list(forms)
    if inverted:
        forms.append("catalogue inversion")
    for p in pieces:
        forms.extend(p.forms)
    roles = [p.role for p in pieces]
    named = [p.ion for p in pieces if p.ion is not None]
    if len(named) != len(set(named)):
        raise _unknown(text, "it names the same ion twice")
    if "element" not in roles and any(p.count is not None and p.text in _ion_names() for p in pieces):
        # 'dihydrogenborate' names the ion H2BO3-, not two hydrogenborate ions: a
        # prefix is read off an ion's own name only in a molecular name ('carbon disulfide')
        raise _unknown(text, "a word that names an ion is not read as a prefix and another ion")
    basicity = [q.text for q in qualifiers if q.kind == "basicity"]
    if basicity:
        pieces = _apply_basicity(text, pieces, basicity[0])
    # a single element: the element itself
    if (
        len(pieces) == 1
        and pieces[0].role in ("element", "open")
        and pieces[0].count is None
        and not pieces[0].stock
    ):
        return _element_reading(text, pieces[0], water, qualifiers, forms)
    if (
        len(pieces) == 1
        and pieces[0].ion is not None
        and pieces[0].ion.is_monatomic
        and pieces[0].ion.charge > 0
    ):
        sym = pieces[0].ion.text
        if pieces[0].ion.name == element(sym).name or pieces[0].text in _element_names():
            return _element_reading(text, _Piece("element", None, sym), water, qualifiers, forms)
    # cations before anions
    seen_anion = False
    for p in pieces:
        if p.role == "anion":
            seen_anion = True
        elif seen_anion and p.role in ("cation", "open"):
            raise _unknown(text, "a cation name follows an anion name (expected cations first)")
    if not any(r in ("cation", "open", "element") for r in roles):
        raise _unknown(text, "it names anions but no cation")
    if "anion" not in roles:
        if all(r == "element" for r in roles) or any(r == "element" for r in roles):
            raise _unknown(text, "it names no anion")
        raise _unknown(text, "it names cations but no anion")
    opens = [p for p in pieces if p.role == "open" and not p.stock]
    counted = any(p.count for p in pieces)
    established = None
    if not counted and _species(pieces) > 2:
        established = _ratio_from_table(text, pieces)
        forms.append("established compound")
    elif opens and not counted:
        others = [p for p in pieces if p is not opens[0]]
        candidates = _candidates(opens[0].symbol, others)
        if water not in ("", 0):
            # the name's hydrate word holds for every candidate ('nickel sulfate 6-hydrate')
            candidates = [(n, parse_formula(fx).with_water(water).text()) for n, fx in candidates]  # type: ignore[arg-type]
        name = element(opens[0].symbol).name
        listing = "; ".join(f"{n} {rest_name(others)}: {fx}" for n, fx in candidates)
        raise NameError_(
            f"'{text}' leaves the charge of {name} open; it may be {listing}"
            f" (give a Stock number such as '{candidates[0][0] if candidates else name + '(II)'}')",
            text=text,
            choices=tuple(fx for _, fx in candidates),
            reason="open-charge",
        )
    f = established if established is not None else _formula_of(pieces)
    if water not in ("", 0, None):
        f = f.with_water(water)  # type: ignore[arg-type]
    elif water is None:
        f = f.with_water(None)
    cations, anions, elements_ = _components_of(f)
    kind = "molecular" if any(p.role == "element" for p in pieces) else "salt"
    if kind == "salt" and cations and all(c.formula == "H" for c in cations):
        kind = "acid"
    return NameReading(
        text=text,
        compound=" ".join(p.text for p in pieces if p.text) or text,
        kind=kind,
        formula=f.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=f.water,
        qualifiers=tuple(qualifiers),
        forms=tuple(dict.fromkeys(forms)),
    )


def _species(pieces: list[_Piece]) -> int:
    """How many kinds of ion a reading names (iron(II,III) counts two)."""
    return sum(len(p.stock) if p.stock else 1 for p in pieces)


def _ratio_from_table(text: str, pieces: list[_Piece]) -> Formula:
    """A name of three or more ions without multiplicative prefixes does not
    state their ratio ('ammonium iron(II) sulfate', 'sodium aluminium
    fluoride'): the compound is the one the tables of established compounds
    hold with exactly those ions, or the name is refused, listing the
    candidates the tables know."""
    options: list[list[tuple[str, int]]] = [[]]
    for p in pieces:
        if p.role == "element":
            raise _unknown(text, "it names an element beside ions")
        if p.role == "open" and p.stock:
            ions = [(p.symbol, ox) for ox in p.stock]
            options = [o + ions for o in options]
        elif p.role == "open":
            options = [o + [(ion.text, ion.charge)] for o in options for ion in _metal_cations(p.symbol)]
        else:
            assert p.ion is not None
            options = [o + [(p.ion.text, p.ion.charge)] for o in options]
    found: list[str] = []
    for option in options:
        for formula in _by_ion_set().get(frozenset(option), ()):
            if formula not in found:
                found.append(formula)
    names = ", ".join(p.ion.name if p.ion else p.text for p in pieces)
    if len(found) == 1:
        return parse_formula(found[0])
    if found:
        raise NameError_(
            f"'{text}' names {names} but not their ratio; the compounds of these ions in the trade are"
            f" {' or '.join(found)}: write the formula, or the name of one of them",
            text=text,
            choices=tuple(found),
            reason="may-be",
        )
    raise NameError_(
        f"'{text}' names {names} but not their ratio, and no established compound of these ions is"
        " known; write the formula, or give the counts with prefixes (such as 'aluminium potassium"
        " bis(sulfate)')",
        text=text,
        reason="ratio",
        ions=tuple(sorted({(i, c) for o in options for i, c in o})),
    )


def rest_name(pieces: list[_Piece]) -> str:
    return " ".join(p.ion.name if p.ion else element(p.symbol).name for p in pieces)


_BASICITY = {"monobasic": 1, "dibasic": 2, "tribasic": 3, "tetrabasic": 4}


def _acid_base(ion: Ion) -> tuple[Ion, int] | None:
    """The fully deprotonated anion an anion belongs to and the acid hydrogens
    it still holds (HPO4 2-: phosphate, 1), or None for an anion that is not
    of a polyprotic acid (catalog ions; the acid hydrogens are written first)."""
    if ion.charge >= 0:
        return None
    items = ion.formula.parts[0].items
    held = 0
    if len(items) > 1 and isinstance(items[0], Atom) and items[0].symbol == "H":
        held = items[0].count
        base_items = items[1:]
        counts = Formula((_part(base_items),), 0).counts
        base = lookup(counts, ion.charge - held)
        if base is None:
            return None
    else:
        base = ion
    if base.charge > -2:
        return None
    return base, held


def acid_families(f: Formula) -> tuple[frozenset, frozenset] | None:
    """The cations of an ionic formula and the fully deprotonated anions of
    its anions (HPO4 2- counts as phosphate): two salts with the same families
    differ at most in the acid hydrogens their anions keep. None when the
    formula is not ionic."""
    balance = charge_balance(f)
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return None
    cations = frozenset((s.ion.text, s.ion.charge) for s in balance.charges if s.charge > 0 and s.ion)
    if ("H", 1) in cations:
        return None
    bases = set()
    for share in balance.charges:
        if share.charge < 0 and share.ion is not None:
            found = _acid_base(share.ion)
            base = found[0] if found else share.ion
            bases.add((base.text, base.charge))
    return cations, frozenset(bases)


def _protonated(base: Ion, replaced: int) -> Ion | None:
    """The anion of base's acid with ``replaced`` of its hydrogens replaced by
    cations: phosphate with 2 replaced is hydrogen phosphate HPO4 2-."""
    n = -base.charge
    if not 0 < replaced <= n:
        return None
    if replaced == n:
        return base
    counts = dict(base.formula.counts)
    counts["H"] = counts.get("H", 0) + (n - replaced)
    return lookup(counts, -replaced)


def _apply_basicity(text: str, pieces: list[_Piece], word: str) -> list[_Piece]:
    """'sodium phosphate, dibasic' is Na2HPO4, 'sodium citrate tribasic'
    Na3C6H5O7, 'potassium phthalate monobasic' KHC8H4O4 (common practice):
    the word says how many of the acid's hydrogens the cations replace, for
    the anion of any polyprotic acid."""
    replaced = _BASICITY[word]
    out = []
    done = False
    for p in pieces:
        found = _acid_base(p.ion) if p.role == "anion" and p.ion is not None else None
        if found is None:
            out.append(p)
            continue
        base, held = found
        ion = _protonated(base, replaced)
        if ion is None:
            raise NameError_(
                f"'{text}': '{word}' does not fit {base.name}, whose acid has {-base.charge} acid hydrogens"
                if replaced > -base.charge
                else f"'{text}': no catalog ion is {base.name} with"
                f" {-base.charge - replaced} of its acid hydrogens left ('{word}')",
                text=text,
                reason="basicity",
            )
        if held and ion != p.ion:
            raise NameError_(
                f"'{text}' says both {p.ion.name} and '{word}' ({ion.name}); they disagree",  # type: ignore[union-attr]
                text=text,
                reason="basicity",
            )
        out.append(_Piece("anion", ion, forms=(f"'{word}' for {ion.name}",), text=p.text))
        done = True
    if not done:
        raise NameError_(
            f"'{text}': '{word}' names no anion of a polyprotic acid in the name",
            text=text,
            reason="basicity",
        )
    return out


def _element_reading(
    text: str, piece: _Piece, water: Number | str | None, qualifiers: list[Qualifier], forms: list[str]
) -> NameReading:
    sym = piece.symbol
    n = 2 if sym in _DIATOMIC else 1
    f = parse_formula(sym + (str(n) if n > 1 else ""))
    return NameReading(
        text=text,
        compound=element(sym).name,
        kind="element",
        formula=f.text(),
        elements=(Component("element", element(sym).name, sym, 0, n),),
        water=0,
        qualifiers=tuple(qualifiers),
        forms=tuple(forms),
    )


_DIATOMIC = frozenset("H N O F Cl Br I".split())


def _formula_of(pieces: list[_Piece]) -> Formula:
    """The formula of a reading: counts from prefixes where given, else the
    lowest whole-number ratio that balances the charges."""
    species: list[tuple[str, Item | None, int | None, int | None, Ion | None]] = []
    for p in pieces:
        if p.role == "element":
            species.append(("element", None, None, p.count, None))
        elif p.role == "open" and p.stock:
            for ox in p.stock:
                ion = next((i for i in _monatomic(p.symbol, +1) if i.charge == ox), None)
                if ion is None:
                    raise NameError_(
                        f"{element(p.symbol).name} has no {_ROMAN.get(ox, ox)} ion in the catalog"
                    )
                species.append(("cation", None, ox, None, ion))
        elif p.role == "open":
            species.append(("open", None, None, p.count, None))
        else:
            assert p.ion is not None
            species.append((p.role, None, p.ion.charge, p.count, p.ion))
    # a molecular binary compound: element + prefixed '-ide' anion, as named
    if any(s[0] == "element" for s in species):
        return _molecular_formula(pieces)
    # explicit counts on every piece, or a single open metal fixed by them
    counts = [s[3] for s in species]
    if any(c is not None for c in counts):
        fixed = [c if c is not None else 1 for c in counts]
        total = 0
        open_index = None
        for (role, _, charge, _, _), n in zip(species, fixed):
            if role == "open":
                open_index = fixed.index(n)
                continue
            total += (charge or 0) * n
        if open_index is not None:
            p = pieces[open_index]
            n = fixed[open_index]
            ox = -total // n if not (-total) % n else None
            ion = next((i for i in _monatomic(p.symbol, +1) if i.charge == ox), None)
            if ion is None:
                # mixed valence: the counts fix the composition ('triiron
                # tetraoxide' is Fe3O4) when the element's charges can make it up
                split = _mixed_valence(p.symbol, n, -total)
                if split is None:
                    raise NameError_(
                        f"the counts named need {n} {element(p.symbol).name} atoms to carry {-total:+d},"
                        " which no mix of its catalog charges gives"
                    )
                rest = [(s[4], k) for j, (s, k) in enumerate(zip(species, fixed)) if j != open_index]
                return _assemble(split + rest)  # type: ignore[arg-type]
            species[open_index] = ("cation", None, ox, n, ion)
        elif total != 0:
            protonated = _protonate_by_counts(pieces, species, fixed, total)
            if protonated is None:
                raise NameError_("the counts named do not balance the charges of the ions")
            species = protonated
        ions = [(s[4], n) for s, n in zip(species, fixed)]
    else:
        ions = _lowest_ratio([s[4] for s in species])  # type: ignore[misc]
    return _assemble(ions)


def _mixed_valence(symbol: str, atoms: int, charge: int) -> list[tuple[Ion, int]] | None:
    """One way for ``atoms`` atoms of an element to carry ``charge`` with its
    catalog charges, or None."""
    cations = [i for i in _monatomic(symbol, +1)]
    for combo in product(range(atoms + 1), repeat=len(cations)):
        if sum(combo) == atoms and sum(c.charge * k for c, k in zip(cations, combo)) == charge:
            return [(c, k) for c, k in zip(cations, combo) if k]
    return None


def _protonate_by_counts(pieces: list[_Piece], species: list, fixed: list[int], total: int) -> list | None:
    """'disodium phosphate' is Na2HPO4, 'monosodium citrate' NaH2C6H5O7,
    'disodium EDTA' Na2H2edta (common practice): when the counted cations
    carry less charge than one anion of a polyprotic acid, the anion keeps the
    rest as acid hydrogens. Only for one such anion, named without a count."""
    anions = [j for j, s in enumerate(species) if s[0] == "anion"]
    if len(anions) != 1 or pieces[anions[0]].count is not None:
        return None
    j = anions[0]
    ion = species[j][4]
    found = _acid_base(ion) if ion is not None else None
    if found is None or found[1]:
        return None
    base, _ = found
    carried = total - base.charge  # the cations' charge
    target = _protonated(base, carried)
    if target is None or target == base:
        return None
    out = list(species)
    out[j] = ("anion", None, target.charge, None, target)
    return out


def _lowest_ratio(ions: list[Ion]) -> list[tuple[Ion, int]]:
    if len(ions) == 2:
        a, b = ions
        g = gcd(a.charge, -b.charge)
        return [(a, -b.charge // g), (b, a.charge // g)]
    best = None
    ranges = [range(1, 13)] * len(ions)
    for combo in product(*ranges):
        if sum(i.charge * n for i, n in zip(ions, combo)) != 0:
            continue
        key = sum(combo)
        if best is None or key < best[0]:
            best = (key, [combo])
        elif key == best[0]:
            best[1].append(combo)
    if best is None:
        raise NameError_("no whole-number ratio of these ions is neutral")
    if len(best[1]) > 1:
        raise NameError_("more than one ratio of these ions is neutral; name the counts with prefixes")
    return list(zip(ions, best[1][0]))


def _assemble(ions: list[tuple[Ion, int]]) -> Formula:
    merged: dict[Ion, int] = {}
    for ion, n in ions:
        merged[ion] = merged.get(ion, 0) + n
    cations = [(i, n) for i, n in merged.items() if i.charge > 0]
    anions = [(i, n) for i, n in merged.items() if i.charge < 0]
    if len(cations) > 1:
        cations.sort(key=lambda x: _sort_name(x[0].name))
    if len(anions) > 1:
        anions.sort(key=lambda x: _sort_name(x[0].name))
    terms: list[str] = []
    done: set[str] = set()
    for ion, n in cations:
        if ion.is_monatomic:
            # mixed valence: one term for the element (Fe3O4, not FeFe2O4)
            if ion.text in done:
                continue
            total = sum(m for i, m in cations if i.is_monatomic and i.text == ion.text)
            done.add(ion.text)
            terms.append(ion.text + (str(total) if total > 1 else ""))
        else:
            terms.append(ion_term(ion, n))
    terms.extend(ion_term(i, n) for i, n in anions)
    return parse_formula("".join(terms))


def _sort_name(name: str) -> str:
    """Alphabetical order of names ignoring multiplicative prefixes, Stock
    numbers and locants (IUPAC 2005 IR-5.4)."""
    return re.sub(r"[^a-z]", "", re.sub(r"\(.*?\)", "", name.casefold()))


# Non-metals with one oxidation state in their binary compounds, so that a name
# without prefixes fixes the ratio ('silicon nitride' is Si3N4, 'boron nitride'
# BN): common practice. Any other ('carbon oxide', 'nitrogen oxide', 'sulfur
# chloride') needs prefixes, and is refused without them.
_ONE_STATE = {"H": 1, "B": 3, "Si": 4}


def _molecular_formula(pieces: list[_Piece]) -> Formula:
    if len(pieces) == 2 and not any(p.count for p in pieces) and pieces[0].role == "element":
        first, second = pieces
        state = _ONE_STATE.get(first.symbol)
        anion = second.ion
        if state is None or anion is None or not anion.is_monatomic:
            name = element(first.symbol).name
            raise NameError_(
                f"the name gives no counts, and {name} has more than one oxidation state in its molecular"
                " compounds; give the counts with prefixes (as in carbon monoxide, carbon dioxide)",
                reason="ratio",
            )
        g = gcd(state, -anion.charge)
        a, b = -anion.charge // g, state // g
        return parse_formula(f"{first.symbol}{a if a > 1 else ''}{anion.text}{b if b > 1 else ''}")
    out = []
    for i, p in enumerate(pieces):
        n = p.count or 1
        if p.role == "element":
            sym = p.symbol
        elif p.ion is not None and p.ion.is_monatomic and p.ion.charge < 0 and i > 0:
            sym = p.ion.text
        elif p.ion is not None and p.ion.is_monatomic and p.ion.charge > 0 and i == 0:
            sym = p.ion.text
        else:
            raise NameError_("a molecular name is an element and '-ide' names with multiplicative prefixes")
        out.append(sym + (str(n) if n > 1 else ""))
    f = parse_formula("".join(out))
    if not charge_balance(f).balanced:
        raise NameError_(f"{f.text()} does not balance: " + charge_balance(f).explanation)
    return f


def formula_from_name(name: str) -> str:
    """The canonical formula of a name.

    >>> formula_from_name("aluminium potassium sulfate dodecahydrate")
    'AlK(SO4)2·12H2O'
    >>> formula_from_name("ferric chloride")
    'FeCl3'
    """
    return read_name(name).formula


# ---------------------------------------------------------------------------
# Naming a formula
# ---------------------------------------------------------------------------

SPELLINGS = ("iupac", "british", "american")


def _respell(name: str, spelling: str) -> str:
    if spelling == "british":
        return re.sub(r"sulf", "sulph", name)
    if spelling == "american":
        return name.replace("aluminium", "aluminum").replace("caesium", "cesium")
    return name


def _ion_display_name(ion: Ion, legacy: bool) -> str:
    if legacy and ion.legacy_name and ion.charge > 0:
        return ion.legacy_name
    return ion.name


def name_from_formula(formula: str | Formula, spelling: str = "iupac", legacy: bool = False) -> str:
    """The systematic name of a formula.

    Args:
        formula: text or a parsed Formula.
        spelling: ``'iupac'`` (aluminium, caesium, sulfate), ``'british'``
            (sulphate) or ``'american'`` (aluminum, cesium).
        legacy: write the -ous/-ic name of a cation where one exists
            (ferric chloride) instead of the Stock name (iron(III) chloride).

    Raises:
        CellchemError: the formula cannot be read, does not balance, or is not
            a compound cellchem names (organic and other molecular compounds
            beyond binary ones).

    >>> name_from_formula("CuSO4·5H2O")
    'copper(II) sulfate pentahydrate'
    >>> name_from_formula("FeCl3", legacy=True)
    'ferric chloride'
    """
    if spelling not in SPELLINGS:
        raise CellchemError(f"unknown spelling '{spelling}' (expected one of: {', '.join(SPELLINGS)})")
    f = as_formula(formula)
    return _respell(_name(f, legacy), spelling)


@lru_cache(maxsize=32768)
def _name(f: Formula, legacy: bool) -> str:
    text = f.source or f.text()
    if f.charge:
        ion = lookup(f.counts, f.charge)
        if ion is not None and len(f.parts) == 1:
            return _ion_display_name(ion, legacy)
        raise NameError_(f"'{text}' is an ion cellchem does not know by name", text=text)
    parts_names = []
    base = f.anhydrous()
    # established names and acids, by composition
    key = (counts_key(f.counts), f.water)
    named = _named()[1].get(key)
    if named:
        return named
    if not f.water and len(f.parts) == 1:
        group = _oxo_groups()[1].get(counts_key(f.counts))
        if group and charge_balance(f).kind == "molecular":
            return group
    if charge_balance(base).kind == "established":
        # a compound that reads as no simple ions: the name the table gives it, if one
        own = _established_names().get(counts_key(base.counts))
        if own is None:
            raise NameError_(f"'{text}' reads as no simple ions and no table names it", text=text)
        return own + _hydrate_suffix(f.water)
    if len(base.parts) == 1:
        acid = _acids()[1].get(counts_key(base.counts))
        if acid and _acid_matches(base):
            return acid + _hydrate_suffix(f.water)
    for part in base.parts:
        single = Formula((part.__class__(part.items, 1),), 0, render_items(part.items))
        own = _named()[1].get((counts_key(single.counts), 0))
        parts_names.append(own or _salt_name(single, text, legacy))
    if len(parts_names) == 1 and base.parts[0].multiplier == 1:
        return parts_names[0] + _hydrate_suffix(f.water)
    # an addition compound (IUPAC 2005 IR-5.5): names joined by em dashes and
    # the ratio of the parts in whole numbers
    amounts: list[Number] = [p.multiplier or 1 for p in base.parts]
    names = list(parts_names)
    if f.water:
        names.append("water")
        amounts.append(f.water)
    scale = 1
    for a in amounts:
        scale = scale * Fraction(a).denominator // gcd(scale, Fraction(a).denominator)
    whole = [int(Fraction(a) * scale) for a in amounts]
    return "—".join(names) + f" ({'/'.join(str(w) for w in whole)})"


def _acid_matches(base: Formula) -> bool:
    result = charge_balance(base)
    if result.kind != "ionic":
        return True
    return all(s.ion is None or s.charge < 0 or s.ion.text == "H" for s in result.charges)


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


def _salt_name(f: Formula, text: str, legacy: bool) -> str:
    result = charge_balance(f)
    counts = f.counts
    if result.kind == "element":
        sym = next(iter(counts))
        n = counts[sym]
        el = element(sym)
        if n == 1 or (n == 2 and sym in _DIATOMIC):
            return el.name
        simple, _ = _prefixes()
        return simple.get(n, str(n)) + el.name
    if not result.balanced:
        raise NameError_(f"'{text}' cannot be named: {result.explanation}", text=text)
    if result.kind == "molecular":
        return _molecular_name(f, text)
    cations = [s for s in result.charges if s.charge > 0]
    anions = [s for s in result.charges if s.charge < 0]
    cation_words = _cation_words(cations, legacy, f)
    anion_words = sorted({_share_name(s, legacy, f) for s in anions}, key=_sort_name)
    name = " ".join(cation_words + anion_words)
    # Does the name read back to this formula? If not, say the counts. A name
    # the trade uses for this and other compounds (copper(II) carbonate, also
    # said of the basic carbonate) is still this formula's name.
    try:
        back = _read_name(name)
        if counts_key(parse_formula(back.formula).counts) == counts_key(counts):
            return name
    except NameError_ as exc:
        if exc.reason == "may-be" and any(
            counts_key(parse_formula(c).anhydrous().counts) == counts_key(counts) for c in exc.choices
        ):
            # the short name the trade uses for several compounds: the prefixed
            # name when it fixes this one ('trisodium phosphate'), else the short name
            try:
                prefixed = _prefixed_name(cations, anions, legacy, f, text)
                if counts_key(parse_formula(_read_name(prefixed).formula).counts) == counts_key(counts):
                    return prefixed
            except CellchemError:
                pass
            return name
    except CellchemError:
        pass
    return _prefixed_name(cations, anions, legacy, f, text)


def _share_name(share, legacy: bool, f: Formula) -> str:
    ion = share.ion
    if ion is not None:
        if ion.is_complex:
            items = ion.formula.parts[0].items[0]
            assert isinstance(items, Group)
            try:
                return complex_name(items.items[0].symbol, list(items.items[1:]), ion.charge)  # type: ignore[union-attr]
            except CellchemError:
                return ion.name
        return _ion_display_name(ion, legacy)
    # a bracketed group read from its contents: name it by the additive rules
    label = share.label
    group = parse_formula(re.sub(r"\d*[+-]$", "", label)).parts[0].items[0]
    if isinstance(group, Group) and isinstance(group.items[0], Atom):
        return complex_name(group.items[0].symbol, list(group.items[1:]), share.charge)
    raise NameError_(f"cellchem cannot name the group '{label}'")


def _cation_words(cations, legacy: bool, f: Formula) -> list[str]:
    by_element: dict[str, list] = {}
    others = []
    for s in cations:
        if s.ion is not None and s.ion.is_monatomic:
            by_element.setdefault(s.ion.text, []).append(s)
        else:
            others.append(_share_name(s, legacy, f))
    words = list(others)
    for sym, shares in by_element.items():
        if len(shares) == 1:
            words.append(_ion_display_name(shares[0].ion, legacy))
        else:
            states = ",".join(_ROMAN[s.charge] for s in sorted(shares, key=lambda s: s.charge))
            words.append(f"{element(sym).name}({states})")
    return sorted(words, key=_sort_name)


def _prefixed_name(cations, anions, legacy: bool, f: Formula, text: str) -> str:
    simple, complex_ = _prefixes()

    def word(name: str, n: Number) -> str:
        if n == 1:
            return name
        if not isinstance(n, int) or n not in simple:
            raise NameError_(f"'{text}' cannot be named with multiplicative prefixes")
        if (
            re.search(r"[\d,()\- ]", name)
            or name.startswith(("di", "tri", "tetra", "hydrogen"))
            or _fold(simple[n] + name) in _ion_names()  # 'bis(phosphate)', not 'diphosphate' (P2O7 4-)
        ):
            return f"{complex_[n]}({name})"
        return simple[n] + name

    def cation_name(share) -> str:
        if share.ion is not None and share.ion.is_monatomic:
            return element(share.ion.text).name  # the counts say the charge: 'tetraarsenic hexaoxide'
        return _share_name(share, legacy, f)

    # one word per element for a monatomic cation of mixed valence ('digold dioxide')
    merged: dict[str, list] = {}
    for share in cations:
        key = share.ion.text if share.ion is not None and share.ion.is_monatomic else id(share)
        merged.setdefault(key, []).append(share)  # type: ignore[arg-type]
    words = sorted(
        (word(cation_name(group[0]), sum(x.count for x in group)) for group in merged.values()),
        key=_sort_name,
    )
    words += sorted((word(_share_name(s, legacy, f), s.count) for s in anions), key=_sort_name)
    return " ".join(words)


def _molecular_name(f: Formula, text: str) -> str:
    counts = f.counts
    if len(counts) != 2 or len(f.parts[0].items) != 2:
        raise NameError_(
            f"cellchem names salts, acids, binary compounds and elements; '{text}' is a molecular"
            " compound of more than two elements or groups",
            text=text,
        )
    simple, _ = _prefixes()
    (first, n1), (second, n2) = counts.items()
    anions = _monatomic(second, -1)
    if not anions:
        raise NameError_(f"'{text}': {element(second).name} has no '-ide' name in the catalog", text=text)
    ide = anions[0].name
    lead = element(first).name
    if n1 != 1:
        lead = simple[int(n1)] + lead
    prefix = simple[int(n2)]
    if prefix == "mono":
        # 'carbon monoxide' (IUPAC 2005 IR-5.2 allows the elided 'monoxide');
        # otherwise one of each needs no prefix: 'silicon carbide'
        prefix = "mon" if ide == "oxide" else ""
    return f"{lead} {prefix}{ide}"


__all__ = [
    "Component",
    "NameReading",
    "Qualifier",
    "fold_name",
    "formula_from_name",
    "name_from_formula",
    "read_name",
]
