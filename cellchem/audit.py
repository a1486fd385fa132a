"""Checks of one inventory line, over plain values: the pure part of the audit.

A bad line is a *finding*, recorded and reported; it never stops a run. The
command line and the worksheet functions call these checks; neither a
workbook nor a spreadsheet library is needed here.
"""

from __future__ import annotations

import math
import re
from collections import Counter
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from functools import cache

from .cas import read_cas
from .charge import ORGANIC, RADICAL, charge_balance
from .columns import Layout, find_layout
from .elements import all_elements
from .errors import CellchemError
from .formula import Formula, case_readings, parse_formula
from .ions import catalog, counts_key
from .mass import molar_mass
from .memo import Memo, typed
from .names import known_hydrates, name_from_formula, read_name, same_substance
from .tables import read_table

ERROR = "error"
WARNING = "warning"
NOTE = "note"


@dataclass(frozen=True)
class Finding:
    """One thing found on a line.

    Attributes:
        check: which check found it (``'formula'``, ``'molar-mass'``, ``'charge'``).
        severity: ``'error'``, ``'warning'`` or ``'note'``.
        message: one line saying what is wrong, quoting the input.
        suggestion: what would resolve it ('' if nothing to suggest).
        field: which field of the line it concerns (``'formula'``, ``'molar_mass'``).
    """

    check: str
    severity: str
    message: str
    suggestion: str = ""
    field: str = ""


@dataclass(frozen=True)
class LineResult:
    """What the checks made of one line: the formula read (or None), its molar
    mass (or None) and the findings."""

    formula: Formula | None
    molar_mass: float | None
    findings: tuple[Finding, ...]

    @property
    def worst(self) -> str:
        for level in (ERROR, WARNING, NOTE):
            if any(f.severity == level for f in self.findings):
                return level
        return ""


_NUMBER = re.compile(r"^\s*([0-9]+(?:[.,][0-9]+)?)\s*(?:g\s*/\s*mol|g·mol⁻¹|g mol-1)?\s*$", re.IGNORECASE)


def read_stated_mass(value: object, decimal_comma: bool | None = None) -> tuple[float, int] | None:
    """A stated molar mass and its number of decimals, from a cell value
    (a number, or text such as '58.44', '58,44 g/mol'); None if empty.

    Args:
        value: the cell value.
        decimal_comma: True when the file writes decimal commas (semicolon
            exports); False or None when it does not, in which case a comma
            followed by exactly three digits ('1,234') is refused as ambiguous.

    Raises:
        CellchemError: the value is not a molar mass.
    """
    if value is None or (isinstance(value, str) and not value.strip()):
        return None
    if isinstance(value, bool):
        raise CellchemError(f"{value!r} is not a molar mass (expected a number in g/mol)")
    if isinstance(value, (int, float)):
        if not math.isfinite(value) or value <= 0:
            raise CellchemError(f"{value!r} is not a molar mass (expected a positive number in g/mol)")
        text = repr(float(value))
        decimals = len(text.split(".")[1].rstrip("0")) if "." in text and "e" not in text else 0
        return float(value), min(decimals, 6)
    m = _NUMBER.match(str(value))
    if not m:
        raise CellchemError(f"'{value}' is not a molar mass (expected a number in g/mol, such as '58.44')")
    number = m.group(1)
    if "," in number and not decimal_comma and len(number.split(",")[1]) == 3:
        raise CellchemError(
            f"'{value}' is ambiguous: a decimal comma ({number.replace(',', '.')}) or a thousands separator"
            f" ({number.replace(',', '')}); write the molar mass with a decimal point"
        )
    number = number.replace(",", ".")
    decimals = len(number.split(".")[1]) if "." in number else 0
    return float(number), decimals


def mass_tolerance(stated: float, decimals: int, allowance: float | None = None) -> float:
    """How far a stated molar mass may lie from the computed one and still
    agree: half a unit in its last printed decimal (suppliers round to the
    decimals they print), plus an allowance for the small differences between
    editions of the atomic-weight table: 0.01 g/mol or 0.01 % of the value,
    whichever is larger (common practice), or ``allowance`` g/mol when given.

    >>> round(mass_tolerance(58.44, 2), 4)
    0.015
    """
    extra = max(0.01, 1e-4 * stated) if allowance is None else allowance
    return 0.5 * 10.0 ** (-decimals) + extra


def _blank(value: object) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _same(a: Formula, b: Formula) -> bool:
    return counts_key(a.counts) == counts_key(b.counts) and a.charge == b.charge


def _ions(f: Formula) -> list[tuple[str, int, str, str]] | None:
    """(formula text, charge, name, label) of each ion of a formula, or None
    when it does not read as ions."""
    balance = charge_balance(f.anhydrous())
    if not balance.balanced or balance.kind != "ionic":
        return None
    return [(s.ion.text, s.ion.charge, s.ion.name, s.ion.label) for s in balance.charges if s.ion is not None]


def _element_key(ion: tuple[str, int, str, str]) -> tuple:
    return counts_key(parse_formula(ion[0]).counts)


def _listing(ions: list[tuple[str, int, str, str]]) -> str:
    return " and ".join(f"{i[2]} ({i[3]})" for i in ions)


def how_they_differ(named: Formula, formula: Formula) -> str:
    """Say how the formula a name reads as differs from a line's formula:
    water of crystallisation, a charge (Stock number), a different ion, or
    parentheses; '' when none of these explains it.

    >>> how_they_differ(parse_formula("FeCl2"), parse_formula("FeCl3"))
    'a different charge: the name has iron(II) (Fe2+), the formula iron(III) (Fe3+)'
    >>> how_they_differ(parse_formula("Na2SO3"), parse_formula("Na2SO4"))
    'a different ion: the name has sulfite (SO3 2-), the formula sulfate (SO4 2-)'
    """
    if _same(named.anhydrous(), formula.anhydrous()):
        return (
            f"the water of crystallisation: the name has {named.water or 'no'} H2O, the formula"
            f" {formula.water if formula.water is not None else 'an unknown number of'} H2O"
        )
    written = formula.source or formula.text()
    if (
        written
        and "(" not in written
        and "(" in named.text()
        and named.text().replace("(", "").replace(")", "") == written.replace(" ", "")
    ):
        return f"missing parentheses: the formula is written {written}, the name gives {named.text()}"
    if "(" in written and formula.text().replace("(", "").replace(")", "") == named.text():
        return f"extra parentheses: the formula is written {written}, the name gives {named.text()}"
    a, b = _ions(named), _ions(formula)
    if not a or not b:
        return ""
    cat_a = [i for i in a if i[1] > 0]
    cat_b = [i for i in b if i[1] > 0]
    an_a = [i for i in a if i[1] < 0]
    an_b = [i for i in b if i[1] < 0]
    same_anions = {(i[0], i[1]) for i in an_a} == {(i[0], i[1]) for i in an_b}
    same_cations = {(i[0], i[1]) for i in cat_a} == {(i[0], i[1]) for i in cat_b}
    if same_anions and not same_cations:
        if {_element_key(i) for i in cat_a} == {_element_key(i) for i in cat_b}:
            keys_a = {(j[0], j[1]) for j in cat_a}
            keys_b = {(j[0], j[1]) for j in cat_b}
            x = _listing([i for i in cat_a if (i[0], i[1]) not in keys_b]) or "only " + _listing(cat_a)
            y = _listing([i for i in cat_b if (i[0], i[1]) not in keys_a]) or "only " + _listing(cat_b)
            return f"a different charge: the name has {x}, the formula {y}"
        x = ", ".join(f"{i[2]} ({i[3]})" for i in cat_a)
        y = ", ".join(f"{i[2]} ({i[3]})" for i in cat_b)
        return f"a different cation: the name has {x}, the formula {y}"
    if same_cations and not same_anions:
        x = ", ".join(f"{i[2]} ({i[3]})" for i in an_a if (i[0], i[1]) not in {(j[0], j[1]) for j in an_b})
        y = ", ".join(f"{i[2]} ({i[3]})" for i in an_b if (i[0], i[1]) not in {(j[0], j[1]) for j in an_a})
        return f"a different ion: the name has {x}, the formula {y}"
    return ""


# ---------------------------------------------------------------------------
# Spelling: a name that does not read, one word away from one that does
# ---------------------------------------------------------------------------

_WORD = re.compile(r"[A-Za-z]{4,}")


def _words(text: str) -> set[str]:
    return {w for w in re.findall(r"[a-z]+", text.casefold()) if len(w) >= 4}


@cache
def _main_vocabulary() -> frozenset[str]:
    """Words of ion, element and compound names."""
    words: set[str] = set()
    for ion in catalog():
        for name in (ion.name, ion.legacy_name, *ion.other_names):
            words |= _words(name)
    for table in (
        "elements.csv",
        "trivial_names.csv",
        "named_compounds.csv",
        "acids.csv",
        "hydrate_words.csv",
    ):
        for row in read_table(table):
            words |= _words(row.get("name", row.get("word", "")))
    return frozenset(words)


@cache
def _vocabulary() -> tuple[str, ...]:
    words = set(_main_vocabulary())
    for table, column in (("qualifiers.csv", "phrase"), ("ligands.csv", "name")):
        for row in read_table(table):
            words |= _words(row.get(column, ""))
    return tuple(sorted(words))


# A respelling must never turn one real name into another: a word that ends
# in one of these suffixes is not respelled into a word that differs from it
# only there (dithionate is not a misspelled dithionite, sulfate not sulfite).
_SUFFIXES = ("ate", "ite", "ide", "ine", "ium", "ous", "ic", "yl")


def _one_edit(a: str, b: str) -> bool:
    """True when b is a with one letter added, dropped, changed, or two
    neighbouring letters swapped (a typing slip)."""
    if a == b or abs(len(a) - len(b)) > 1:
        return False
    if len(a) == len(b):
        diff = [i for i in range(len(a)) if a[i] != b[i]]
        if len(diff) == 1:
            return True
        return (
            len(diff) == 2
            and diff[1] == diff[0] + 1
            and a[diff[0]] == b[diff[1]]
            and a[diff[1]] == b[diff[0]]
        )
    short, long_ = (a, b) if len(a) < len(b) else (b, a)
    i = 0
    while i < len(short) and short[i] == long_[i]:
        i += 1
    return short[i:] == long_[i + 1 :]


def _doubling(a: str, b: str) -> bool:
    """True when a and b differ by one letter typed once instead of twice (or the reverse)."""
    short, long_ = (a, b) if len(a) < len(b) else (b, a)
    if len(long_) != len(short) + 1:
        return False
    i = 0
    while i < len(short) and short[i] == long_[i]:
        i += 1
    return (i > 0 and long_[i] == long_[i - 1]) or (i + 1 < len(long_) and long_[i] == long_[i + 1])


def _swaps_suffix(word: str, candidate: str) -> bool:
    """True when both words end in a chemical suffix and differ only in it."""
    for a in _SUFFIXES:
        for b in _SUFFIXES:
            if (
                a != b
                and word.endswith(a)
                and candidate.endswith(b)
                and word[: -len(a)] == candidate[: -len(b)]
            ):
                return True
    return False


@cache
def _real_words() -> frozenset[str]:
    """Words of real substance names that cellchem does not read: never respelled."""
    return frozenset(row["word"].casefold() for row in read_table("unread_words.csv"))


def respell(name: str) -> str | None:
    """The name with each word that cellchem does not know replaced by the one
    known word a single typing slip away (``'Sodium Cloride'`` -> ``'Sodium
    Chloride'``), or None when no word needed replacing or a word has no such
    unique neighbour. A word that is a real word cellchem does not read
    (``sorbate``) is left alone, and no word is respelled into one that differs
    from it only in its chemical suffix (``dithionate`` stays, it is not
    ``dithionite``). A respelling is a hint: the audit reports it as a note
    and never builds an error on it.

    >>> respell("Sodium Cloride")
    'Sodium Chloride'
    >>> respell("sodium dithionate") is None
    True
    """
    vocab = _vocabulary()
    known = set(vocab)
    real = _real_words()
    changed = False

    def fix(m: re.Match[str]) -> str:
        nonlocal changed
        word = m.group(0)
        low = word.casefold()
        if low in known or low in real or len(low) < 5:
            return word
        close = [w for w in vocab if _one_edit(low, w) and not _swaps_suffix(low, w)]
        if len(close) > 1:
            # the commonest slip first: a doubled letter typed once or twice
            # ('amonium', 'potasium'), then a main vocabulary word over a ligand
            # or grade word ('sulfat' is sulfate, not sulfato)
            doubled = [w for w in close if _doubling(low, w)]
            close = doubled or [w for w in close if w in _main_vocabulary()] or close
        if len(close) != 1:
            return word
        changed = True
        return close[0].capitalize() if word[0].isupper() else close[0]

    out = _WORD.sub(fix, name)
    return out if changed else None


def check_name(name: object, formula: Formula | None) -> list[Finding]:
    """Does the line's name describe the line's formula?

    Args:
        name: the name cell (text).
        formula: the line's formula, read, or None when the line has none.

    Returns:
        Findings: an error when they disagree (saying how: hydrate, charge,
        ion, parentheses), a warning when the name is silent about the
        hydrate or the acid hydrogens the formula has, a note when the name
        cannot be read (organic names, mixtures, product codes are not
        checked), is misspelled, or leaves open what the formula settles. No
        error rests on a name cellchem refuses to read or on a respelling:
        those give notes and warnings only.
    """
    if _blank(name):
        return []
    text = str(name).strip()
    try:
        reading = read_name(text)
    except CellchemError as exc:
        return _refused_name(text, exc, formula)
    named = parse_formula(reading.formula)
    out: list[Finding] = []
    if formula is None:
        out.append(
            Finding(
                "name",
                NOTE,
                f"no formula on the line; the name '{text}' reads as {named.text()}",
                named.text(),
                "formula",
            )
        )
        return out
    if _same(named, formula) or same_substance(named, formula):
        return out
    if _same(named.anhydrous(), formula.anhydrous()) or same_substance(
        named.anhydrous(), formula.anhydrous()
    ):
        if formula.water is None or named.water is None:
            return out
        stated = any(q.kind == "hydrate" for q in reading.qualifiers) or bool(named.water)
        if not stated and named.water == 0:
            out.append(
                Finding(
                    "name-hydrate",
                    WARNING,
                    f"the name '{text}' does not say which hydrate; the formula {formula.text()} has"
                    f" {formula.water} H2O",
                    _full_name(formula),
                    "name",
                )
            )
            return out
        out.append(
            Finding(
                "name-hydrate",
                ERROR,
                f"the name '{text}' reads as {named.text()}, but the formula is {formula.text()}:"
                f" {how_they_differ(named, formula)}",
                named.text(),
                "formula",
            )
        )
        return out
    if _acid_hydrogens_only(named, formula) and not _says_hydrogens(reading):
        out.append(
            Finding(
                "name",
                WARNING,
                f"the name '{text}' reads as {named.text()}, the formula is {formula.text()}: the same"
                " ions, but the name does not say how many of the acid's hydrogens the formula's anion keeps",
                _full_name(formula),
                "name",
            )
        )
        return out
    how = how_they_differ(named, formula)
    out.append(
        Finding(
            "name",
            ERROR,
            f"the name '{text}' reads as {named.text()}, but the formula is {formula.text()}"
            + (f": {how}" if how else ""),
            named.text(),
            "formula",
        )
    )
    return out


def _refused_name(text: str, exc: CellchemError, formula: Formula | None) -> list[Finding]:
    """Findings for a name the reader refuses: never an error built on a
    reading it does not make, except where the refusal lists every reading
    the name allows (a charge left open) and the formula fits none of them."""
    reason = getattr(exc, "reason", "")
    if formula is not None and exc.choices:
        dry = formula.anhydrous()
        matches = [c for c in exc.choices if _same(parse_formula(c).anhydrous(), dry)]
        matches = matches or [c for c in exc.choices if same_substance(parse_formula(c).anhydrous(), dry)]
        if reason == "open-charge":
            if len(matches) == 1:
                full = _full_name(parse_formula(matches[0]).anhydrous().with_water(formula.water))
                return [
                    Finding(
                        "name",
                        NOTE,
                        f"the name '{text}' leaves a charge open; the formula {formula.text()} settles it:"
                        f" {full}",
                        full,
                        "name",
                    )
                ]
            if not matches:
                return [
                    Finding(
                        "name",
                        ERROR,
                        f"the name '{text}' fits none of its readings to the formula {formula.text()}: {exc}",
                        "",
                        "name",
                    )
                ]
        elif matches:
            full = _full_name(formula)
            return [
                Finding(
                    "name",
                    NOTE,
                    f"the name '{text}' is used for more than one compound ({', '.join(exc.choices)}); the"
                    f" formula {formula.text()} is one of them: {full}",
                    full,
                    "name",
                )
            ]
        else:
            return [
                Finding(
                    "name",
                    WARNING,
                    f"the name '{text}' is used for {' or '.join(exc.choices)}; the formula {formula.text()}"
                    " is none of them (one of the two cells may be wrong)",
                    "",
                    "name",
                )
            ]
    ions = getattr(exc, "ions", ())
    if reason == "ratio" and formula is not None and ions:
        held = _ion_keys(formula)
        if held is not None and set(held) == set(ions):
            return [
                Finding(
                    "name",
                    NOTE,
                    f"the name '{text}' names the ions of the formula {formula.text()} but not their ratio;"
                    " the formula gives it",
                    _full_name(formula),
                    "name",
                )
            ]
        if held is not None:
            named = ", ".join(f"{f}{_sign(c)}" for f, c in ions)
            have = ", ".join(f"{f}{_sign(c)}" for f, c in held)
            return [
                Finding(
                    "name",
                    WARNING,
                    f"the name '{text}' names the ions {named}; the formula {formula.text()} holds {have}",
                    "",
                    "name",
                )
            ]
    out = [Finding("name", NOTE, f"name not checked: {exc}", "", "name")]
    respelled = respell(text) if reason in ("unknown", "") else None
    if respelled is not None:
        try:
            spelled = parse_formula(read_name(respelled).formula)
        except CellchemError:
            return out
        if formula is None or _same(spelled, formula) or _same(spelled.anhydrous(), formula.anhydrous()):
            return [
                Finding(
                    "name-spelling",
                    NOTE,
                    f"the name '{text}' is misspelled; it reads as '{respelled}' ({spelled.text()})",
                    respelled,
                    "name",
                )
            ]
        return [
            Finding(
                "name",
                NOTE,
                f"name not checked: {exc}; it may be a misspelling of '{respelled}' ({spelled.text()}),"
                f" which is not the formula {formula.text()}",
                "",
                "name",
            )
        ]
    return out


def _sign(charge: int) -> str:
    return ("" if abs(charge) == 1 else str(abs(charge))) + ("+" if charge > 0 else "-")


def _ion_keys(f: Formula) -> set[tuple[str, int]] | None:
    """The (formula, charge) of each ion of a formula, coordination entities
    also as their metal ion and ligand anions; None when it is not ionic."""
    from .names import ion_sets

    sets = ion_sets(f.anhydrous())
    if not sets:
        return None
    return set().union(*sets)


def _acid_hydrogens_only(named: Formula, formula: Formula) -> bool:
    """True when the two formulas hold the same cations and anions of the same
    acids, and differ only in how many acid hydrogens the anions keep
    (Na3C6H5O7 and Na2HC6H5O7)."""
    from .names import acid_families

    a, b = acid_families(named.anhydrous()), acid_families(formula.anhydrous())
    return (
        a is not None
        and a == b
        and counts_key(named.anhydrous().counts) != counts_key(formula.anhydrous().counts)
    )


def _says_hydrogens(reading) -> bool:
    words = reading.text.casefold()
    return bool(
        re.search(r"hydrogen|\bbi[a-z]|basic|\b(?:mono|di|tri|tetra)-?[a-z]|\bacid\b", words)
        or any(q.kind == "basicity" for q in reading.qualifiers)
    )


def _named_formula(name: object) -> Formula | None:
    """The formula a name cell reads as, or None (blank, refused)."""
    if _blank(name):
        return None
    try:
        return parse_formula(read_name(str(name).strip()).formula)
    except CellchemError:
        return None


def _full_name(f: Formula) -> str:
    try:
        return name_from_formula(f)
    except CellchemError:
        return f.text()


def check_cas(cas: object) -> list[Finding]:
    """Findings for a CAS RN cell: an error for a bad format or check digit
    (with the check digit the other digits call for), a note for a number
    written in another form (without hyphens, with a prefix)."""
    if _blank(cas):
        return []
    try:
        reading = read_cas(cas if not isinstance(cas, float) or not cas.is_integer() else int(cas))
    except CellchemError as exc:
        suggestion = exc.choices[0] if exc.choices else ""
        return [Finding("cas", ERROR, str(exc), suggestion, "cas")]
    if reading.forms:
        return [
            Finding(
                "cas",
                NOTE,
                f"CAS RN '{str(cas).strip()}' is written {' and '.join(reading.forms)}; the standard form is"
                f" {reading.number}",
                reading.number,
                "cas",
            )
        ]
    return []


# Elements a stores formula seldom holds: a capitals reading that needs one of
# them, where another reading does not, is flagged (CUO reads as C, U, O).
_UNUSUAL = frozenset({"He", "Ne", "Ar", "Kr", "Xe", "Rn", "Tc", "Pm"}) | frozenset(
    el.symbol for el in all_elements() if el.z >= 84
)


def _unusual(f: Formula) -> bool:
    return any(symbol in _UNUSUAL for symbol in f.counts)


def check_line(
    formula: object,
    stated_molar_mass: object = None,
    name: object = None,
    cas: object = None,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
) -> LineResult:
    """Check a line's formula, its stated molar mass against the formula, its
    name against the formula, and its CAS RN.

    Args:
        formula: the formula cell (text); empty gives no formula findings.
        stated_molar_mass: the molar-mass cell (number or text, g/mol), or None.
        name: the name cell (text), or None.
        cas: the CAS RN cell, or None.
        mass_allowance: g/mol allowed beyond the rounding of the stated value
            (default: 0.01 g/mol or 0.01 %, whichever is larger).
        decimal_comma: whether text numbers use a decimal comma.

    Returns:
        A LineResult with the findings.
    """
    findings: list[Finding] = list(check_cas(cas))
    if _blank(formula):
        return LineResult(None, None, tuple(check_name(name, None) + findings))
    text = str(formula)
    try:
        f = parse_formula(text)
    except CellchemError as exc:
        suggestion = ""
        if exc.choices:
            suggestion = "write one of: " + ", ".join(exc.choices)
        findings.append(Finding("formula", ERROR, str(exc), suggestion, "formula"))
        try:
            read_stated_mass(stated_molar_mass, decimal_comma)
        except CellchemError as mass_exc:
            findings.append(Finding("molar-mass", ERROR, str(mass_exc), "", "molar_mass"))
        return LineResult(None, None, tuple(findings))
    name_findings = check_name(name, f)
    ahead = len(findings)  # the name's findings go before the formula's, after the CAS RN's
    if not any(c.islower() for c in text) and len(f.counts) > 1:
        other = [o for o in case_readings(text) if not _unusual(parse_formula(o))]
        if other and _unusual(f):
            findings.append(
                Finding(
                    "formula-case",
                    WARNING,
                    f"'{text}' is written in capitals; it reads as {f.text()}, but the letters also allow "
                    + ", ".join(other),
                    "write the formula with the case of its element symbols",
                    "formula",
                )
            )
    balance = charge_balance(f)
    if balance.kind == RADICAL:
        findings.append(Finding("charge", WARNING, balance.explanation, "", "formula"))
    elif not balance.balanced and balance.kind != ORGANIC:
        findings.append(Finding("charge", ERROR, balance.explanation, "", "formula"))
    mass: float | None = None
    try:
        mass = float(molar_mass(f))
    except CellchemError as exc:
        findings.append(Finding("molar-mass", WARNING, str(exc), "", "formula"))
    try:
        stated = read_stated_mass(stated_molar_mass, decimal_comma)
    except CellchemError as exc:
        findings.append(Finding("molar-mass", ERROR, str(exc), "", "molar_mass"))
        stated = None
    named = _named_formula(name)
    tolerance = mass_tolerance(stated[0], stated[1], mass_allowance) if stated is not None else 0.0

    def agrees(g: Formula | None) -> bool:
        if g is None or stated is None or g.has_unknown_count:
            return False
        try:
            return abs(stated[0] - float(molar_mass(g))) <= tolerance
        except CellchemError:
            return False

    # Which cell is wrong: the stated molar mass is a witness between the name and the formula.
    mass_agrees, name_agrees = agrees(f), agrees(named)
    formula_in_doubt = any(x.check in ("charge", "formula-case") for x in findings)
    blamed_formula = False
    formula_findings, findings = findings[ahead:], findings[:ahead]
    for finding in name_findings:
        if finding.severity != ERROR or finding.check not in ("name", "name-hydrate") or named is None:
            findings.append(finding)
            continue
        if mass_agrees and not name_agrees:
            full = _full_name(f)
            findings.append(
                Finding(
                    finding.check,
                    ERROR,
                    f"{finding.message}; the formula and the stated molar mass agree, so the name is the cell"
                    " to check",
                    full if full != f.text() else "",
                    "name",
                )
            )
        elif name_agrees and not mass_agrees:
            blamed_formula = True
            findings.append(
                Finding(
                    finding.check,
                    ERROR,
                    f"{finding.message}; the name and the stated molar mass agree, so the formula is the"
                    " cell to check",
                    finding.suggestion,
                    "formula",
                )
            )
        else:
            findings.append(
                Finding(
                    finding.check,
                    ERROR,
                    finding.message
                    + (
                        "; the stated molar mass agrees with neither, so either cell may be wrong"
                        if stated is not None
                        else "; nothing else on the line says which of the two cells is wrong"
                    ),
                    "",
                    "formula",
                )
            )
    findings.extend(formula_findings)
    if stated is not None and mass is not None and not mass_agrees and not blamed_formula:
        value = stated[0]
        hint = ""
        dry = f.anhydrous()
        # only hydrates that exist (data/hydrates.csv): never a hint of KNO3·0.5H2O
        for n in sorted({0, *known_hydrates(dry)}):
            other = dry.with_water(n)
            if other == f or other.has_unknown_count:
                continue
            if abs(value - float(molar_mass(other))) <= tolerance:
                hint = f"; {value:g} g/mol is the molar mass of {other.text()}"
                break
        message = f"the stated molar mass {value:g} g/mol does not match {f.text()}, {mass:.2f} g/mol{hint}"
        corroborated = named is not None and (_same(named, f) or same_substance(named, f))
        if formula_in_doubt:
            findings.append(
                Finding(
                    "molar-mass",
                    WARNING,
                    f"{message}; the formula itself is in doubt (see the formula's finding)",
                    "",
                    "molar_mass",
                )
            )
        elif corroborated:
            findings.append(Finding("molar-mass", ERROR, message, f"{mass:.2f}", "molar_mass"))
        else:
            findings.append(
                Finding(
                    "molar-mass",
                    ERROR,
                    f"{message}; nothing else on the line confirms the formula, so either cell may be wrong",
                    "",
                    "molar_mass",
                )
            )
    return LineResult(f, mass, tuple(findings))


# ---------------------------------------------------------------------------
# Tables of rows
# ---------------------------------------------------------------------------

CHECKED = "checked"
NOT_CHECKED = "not checked"
BLANK = "blank"


@dataclass(frozen=True)
class RowResult:
    """The audit of one row of a table.

    Attributes:
        row: the 1-based row number in the sheet (or line number in a file).
        status: ``'checked'``, ``'not checked'`` or ``'blank'``.
        reason: why a row was not checked ('' otherwise).
        findings: the findings, each with ``field`` naming its role.
        columns: role -> column letter for each finding's field.
        result: the LineResult, when the row was checked.
    """

    row: int
    status: str
    reason: str
    findings: tuple[Finding, ...]
    columns: Mapping[str, str] = field(default_factory=dict)
    result: LineResult | None = None

    def column_of(self, finding: Finding) -> str:
        return self.columns.get(finding.field, "")


INTERNAL = "internal"


def _guarded(formula, mass, name, cas, allowance, decimal_comma) -> LineResult:
    """check_line, with a failure of cellchem's own (not of the input) kept to
    this line: one bad row never hides the rest of a file."""
    try:
        return check_line(formula, mass, name, cas, mass_allowance=allowance, decimal_comma=decimal_comma)
    except RecursionError as exc:
        why = f"{type(exc).__name__}"
    except Exception as exc:  # a defect of cellchem: reported on the row, never raised
        why = f"{type(exc).__name__}: {str(exc).splitlines()[0] if str(exc) else ''}".rstrip(": ")
    return LineResult(
        None,
        None,
        (
            Finding(
                INTERNAL,
                WARNING,
                f"cellchem failed on this line ({why}); the line was not checked: please report it with"
                " the line's cells",
                "",
                "",
            ),
        ),
    )


def _check_line_cached(formula, mass, name, cas, allowance, decimal_comma) -> LineResult:
    """check_line, remembered for repeated lines (stock lists repeat compounds)."""
    return _LINES.get(
        (typed(formula, mass, name, cas), allowance, decimal_comma),
        lambda: _guarded(formula, mass, name, cas, allowance, decimal_comma),
    )


_LINES: Memo[LineResult] = Memo(50_000)


def _cell(cells: Sequence[object], index: int | None) -> object:
    if index is None or index >= len(cells):
        return None
    return cells[index]


def audit_row(
    cells: Sequence[object],
    layout: Layout,
    row: int,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
) -> RowResult:
    """Audit one data row of a table whose layout is known."""
    roles = layout.roles
    values = {role: _cell(cells, roles.get(role)) for role in ("name", "formula", "molar_mass", "cas")}
    if all(_blank(v) for v in cells):
        return RowResult(row, BLANK, "", ())
    letters = layout.letters
    if all(_blank(values[r]) for r in values):
        return RowResult(row, NOT_CHECKED, "no name, formula, molar mass or CAS RN", (), letters)
    result = _check_line_cached(
        values["formula"], values["molar_mass"], values["name"], values["cas"], mass_allowance, decimal_comma
    )
    findings = result.findings
    if any(f.check == INTERNAL for f in findings):
        return RowResult(
            row, NOT_CHECKED, "cellchem failed on the line (reported as a finding)", findings, letters
        )
    if _blank(values["formula"]):
        unread = any(f.check == "name" and f.message.startswith("name not checked") for f in findings)
        if unread or _blank(values["name"]):
            reason = (
                "no formula, and the name is not one cellchem reads (organic, mixture or product name)"
                if unread
                else "no name or formula"
            )
            return RowResult(row, NOT_CHECKED, reason, findings, letters, result)
    return RowResult(row, CHECKED, "", findings, letters, result)


@dataclass
class Summary:
    """Counts over an audit: rows read, lines checked, not checked (by
    reason), and findings by severity and by check."""

    rows: int = 0
    blank: int = 0
    checked: int = 0
    not_checked: Counter = field(default_factory=Counter)
    severities: Counter = field(default_factory=Counter)
    checks: Counter = field(default_factory=Counter)

    def add(self, r: RowResult) -> None:
        self.rows += 1
        if r.status == BLANK:
            self.blank += 1
            return
        if r.status == CHECKED:
            self.checked += 1
        else:
            self.not_checked[r.reason] += 1
        for f in r.findings:
            self.severities[f.severity] += 1
            self.checks[(f.severity, f.check)] += 1

    def merge(self, other: Summary) -> None:
        self.rows += other.rows
        self.blank += other.blank
        self.checked += other.checked
        self.not_checked.update(other.not_checked)
        self.severities.update(other.severities)
        self.checks.update(other.checks)


@dataclass(frozen=True)
class TableAudit:
    """The result of ``audit_rows``: the layout found, every row's result and
    the summary."""

    layout: Layout
    rows: tuple[RowResult, ...]
    summary: Summary

    @property
    def findings(self) -> list[tuple[int, str, Finding]]:
        """(row, column letter, finding) for every finding, in row order."""
        return [(r.row, r.column_of(f), f) for r in self.rows for f in r.findings]


def iter_audit(
    rows: Iterable[Sequence[object]],
    layout: Layout,
    first_row: int,
    *,
    row_numbers: Iterable[int] | None = None,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
) -> Iterable[RowResult]:
    """Audit the data rows after a header, one at a time (memory does not grow
    with the table). ``first_row`` is the 1-based number of the first row
    given; ``row_numbers`` gives each row's number instead (CSV line numbers)."""
    numbers = iter(row_numbers) if row_numbers is not None else None
    for i, cells in enumerate(rows):
        number = next(numbers) if numbers is not None else first_row + i
        yield audit_row(cells, layout, number, mass_allowance=mass_allowance, decimal_comma=decimal_comma)


def audit_rows(
    rows: Iterable[Sequence[object]],
    columns: Mapping[str, str] | None = None,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
) -> TableAudit:
    """Audit a table given as plain rows (lists of cell values), header
    included: the checks of ``cellchem audit`` without a workbook.

    Args:
        rows: the table's rows, the header row among the first 20.
        columns: role -> heading or column letter, to override the roles read
            from the headings (roles: name, formula, molar_mass, cas,
            concentration, quantity, unit).
        mass_allowance: g/mol allowed beyond the rounding of a stated molar
            mass (default 0.01 g/mol or 0.01 %, whichever is larger).
        decimal_comma: whether text numbers use a decimal comma.

    Returns:
        A TableAudit: ``layout``, ``rows`` (a RowResult per data row, numbered
        from 1 as in a sheet) and ``summary``.

    Raises:
        CellchemError: no header row found, or a column override that names no column.

    >>> audit = audit_rows([["Name", "Formula", "MW"], ["Sodium chloride", "NaCl", 58.44],
    ...                     ["Sodium sulfite", "Na2SO4", 142.04]])
    >>> [(row, col, f.severity, f.check) for row, col, f in audit.findings]
    [(3, 'A', 'error', 'name')]
    """
    materialised = [list(r) for r in rows]
    layout = find_layout(materialised, columns)
    body = materialised[layout.header_index + 1 :]
    summary = Summary()
    results = []
    for r in iter_audit(
        body, layout, layout.header_index + 2, mass_allowance=mass_allowance, decimal_comma=decimal_comma
    ):
        summary.add(r)
        results.append(r)
    return TableAudit(layout, tuple(results), summary)
