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
from .columns import SDS_ROLES, Layout, find_layout
from .elements import all_elements, element
from .errors import CellchemError
from .formula import Formula, case_readings
from .ions import catalog, counts_key
from .mass import molar_mass
from .memo import Memo, typed
from .names import (
    fold_name,
    hydrate_word,
    known_hydrates,
    name_core,
    name_from_formula,
    read_name,
    same_substance,
)
from .reading import parse_formula
from .substances import by_composition, composition_key, name_match
from .substances import substance as substance_record
from .tables import read_table
from .witness import CAS, FORMULA, MASS, NAME, Dispute, Witness, formula_of_record, weigh

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


# Elements a stores formula seldom holds: a capitals reading that needs one of
# them, where another reading does not, is flagged (CUO reads as C, U, O).
_UNUSUAL = frozenset({"He", "Ne", "Ar", "Kr", "Xe", "Rn", "Tc", "Pm"}) | frozenset(
    el.symbol for el in all_elements() if el.z >= 84
)


def _unusual(f: Formula) -> bool:
    return any(symbol in _UNUSUAL for symbol in f.counts)


STANDARD_WEIGHTS, SCHOOL_WEIGHTS = "standard", "school"
WEIGHT_PRESETS = (STANDARD_WEIGHTS, SCHOOL_WEIGHTS)


def check_line(
    formula: object,
    stated_molar_mass: object = None,
    name: object = None,
    cas: object = None,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
    weights: str = STANDARD_WEIGHTS,
) -> LineResult:
    """Check a line: the formula reads and balances, the molar mass is a number, the CAS
    RN is well formed, and the four witnesses (name, formula, molar mass, CAS RN through
    the substance table) agree. Where they do not, the finding names the cell the other
    witnesses agree against and suggests a value for that cell alone; where no majority
    settles it, it names both sides and suggests nothing.

    Args:
        formula: the formula cell (text); empty gives no formula findings.
        stated_molar_mass: the molar-mass cell (number or text, g/mol), or None.
        name: the name cell (text), or None.
        cas: the CAS RN cell, or None.
        mass_allowance: g/mol allowed beyond the rounding of the stated value
            (default: 0.01 g/mol or 0.01 %, whichever is larger).
        decimal_comma: whether text numbers use a decimal comma.
        weights: ``'standard'`` (CIAAW), or ``'school'`` to accept also a molar mass
            computed with the rounded atomic weights of school data books (Cl 35.5,
            Cu 63.5; data/school_weights.csv).

    Returns:
        A LineResult with the findings.
    """
    if weights not in WEIGHT_PRESETS:
        raise CellchemError(f"weights: expected one of {', '.join(WEIGHT_PRESETS)}, read {weights!r}")
    findings: list[Finding] = []
    cas_number, cas_findings = _cas_cell(cas)
    f: Formula | None = None
    formula_findings: list[Finding] = []
    text = "" if _blank(formula) else str(formula)
    if text:
        try:
            f = parse_formula(text)
        except CellchemError as exc:
            suggestion = "write one of: " + ", ".join(exc.choices) if exc.choices else ""
            formula_findings.append(Finding("formula", ERROR, str(exc), suggestion, "formula"))
    stated = None
    try:
        stated = read_stated_mass(stated_molar_mass, decimal_comma)
    except CellchemError as exc:
        formula_findings.append(Finding("molar-mass", ERROR, str(exc), "", "molar_mass"))
    mass: float | None = None
    if f is not None:
        formula_findings.extend(_formula_findings(text, f))
        try:
            mass = float(molar_mass(f))
        except CellchemError as exc:
            formula_findings.append(Finding("molar-mass", WARNING, str(exc), "", "formula"))
    tolerance = mass_tolerance(stated[0], stated[1], mass_allowance) if stated is not None else 0.0

    def matches(g: Formula) -> bool:
        if stated is None:
            return False
        if abs(stated[0] - float(molar_mass(g))) <= tolerance:
            return True
        return weights == SCHOOL_WEIGHTS and abs(stated[0] - school_mass(g)) <= tolerance

    name_findings, name_witness, reading = _name_witness(name, f, not text)
    witnesses = [w for w in (name_witness,) if w is not None]
    if f is not None and not f.has_unknown_count:
        witnesses.append(Witness(FORMULA, f, "the formula"))
    record_findings, cas_witness = _cas_witness(cas_number, f, name_witness)
    if cas_witness is not None:
        witnesses.append(cas_witness)
        if name_witness is None and reading is not None:
            name_findings, name_witness = _acid_salt_name(str(name).strip(), reading, name_findings)
            witnesses += [name_witness] if name_witness is not None else []
    disputes = weigh(witnesses, stated[0] if stated is not None else None, matches)
    findings.extend(cas_findings)
    findings.extend(name_findings)
    settled = {d.role for d in disputes}
    for d in disputes:
        findings.append(_dispute_finding(d, reading, f, stated[0] if stated else None, tolerance))
    findings.extend(formula_findings)
    findings.extend(record_findings)
    if (
        f is not None
        and mass is not None
        and stated is not None
        and not matches(f)
        and not settled & {FORMULA, MASS}
        and not any(d.role in ("", "?") for d in disputes)
    ):
        findings.append(_mass_finding(f, mass, stated[0], tolerance, formula_findings, named=name_witness))
    findings.extend(_other_substance_finding(name_witness, cas_witness, disputes))
    if cas_number and cas_findings and cas_findings[0].severity == ERROR:
        findings = _suggest_cas(findings, cas_number, witnesses)
    elif cas_number and cas_witness is None and not record_findings:
        findings.extend(_unknown_cas(cas_number, witnesses))
    return LineResult(f, mass, tuple(findings))


@cache
def _school_weights() -> dict[str, float]:
    return {row["symbol"]: float(row["weight"]) for row in read_table("school_weights.csv")}


def school_mass(f: Formula) -> float:
    """The molar mass with the rounded atomic weights of school data books
    (data/school_weights.csv), the standard weight for any element they leave out.

    >>> round(school_mass(parse_formula("CuSO4·5H2O")), 1)
    249.5
    """
    table = _school_weights()
    total = 0.0
    for symbol, n in f.counts.items():
        weight = table.get(symbol)
        total += float(n) * (weight if weight is not None else element(symbol).atomic_weight)
    return total


# What a CAS RN cell says when the line has none: a mixture, a dash, "n/a" (common practice of SDS
# summaries and stock lists, English and German)
_NO_CAS = re.compile(
    r"^(?:[-–—/]+|n\.?\s?a\.?|n/a|none|keine?|mixture|gemisch|mischung|various|verschiedene|proprietary"
    r"|trade secret|not (?:applicable|available|assigned))\.?$",
    re.IGNORECASE,
)


def _cas_cell(cas: object) -> tuple[str, list[Finding]]:
    """The CAS RN in its standard form ('' when there is none or it is malformed) and the
    findings of its format: an error for a bad format or check digit (no number is
    suggested here: only a number the substance table holds can be), a note for another
    way of writing it."""
    if _blank(cas) or _NO_CAS.match(str(cas).strip()):
        return "", []
    raw = cas if not isinstance(cas, float) or not cas.is_integer() else int(cas)
    try:
        reading = read_cas(raw)
    except CellchemError as exc:
        digits = re.sub(r"\D", "", str(raw))
        message = str(exc).split("; the check digit")[0] if "check digit" in str(exc) else str(exc)
        return (digits if len(digits) >= 5 else ""), [Finding("cas", ERROR, message, "", "cas")]
    if reading.forms:
        return reading.number, [
            Finding(
                "cas",
                NOTE,
                f"CAS RN '{str(cas).strip()}' is written {' and '.join(reading.forms)}; the standard form is"
                f" {reading.number}",
                reading.number,
                "cas",
            )
        ]
    return reading.number, []


def check_cas(cas: object) -> list[Finding]:
    """Findings for a CAS RN cell alone: an error for a bad format or check digit, a note
    for a number written in another form (without hyphens, with a prefix)."""
    return _cas_cell(cas)[1]


def _formula_findings(text: str, f: Formula) -> list[Finding]:
    out: list[Finding] = []
    if not any(c.islower() for c in text) and len(f.counts) > 1:
        other = [o for o in case_readings(text) if not _unusual(parse_formula(o))]
        if other and _unusual(f):
            out.append(
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
        out.append(Finding("charge", WARNING, balance.explanation, "", "formula"))
    elif not balance.balanced and balance.kind != ORGANIC:
        out.append(Finding("charge", ERROR, balance.explanation, "", "formula"))
    return out


def _name_witness(name: object, f: Formula | None, formula_blank: bool = False):
    """(findings, witness or None, reading or None) of a name cell: the name read by
    cellchem; or, when cellchem refuses it, the one substance the substance table matches
    it to exactly (a synonym match never grounds an error)."""
    if _blank(name):
        return [], None, None
    text = str(name).strip()
    try:
        reading = read_name(text)
    except CellchemError as exc:
        findings = _refused_name(text, exc, f)
        witness = None
        if f is not None and exc.choices and any(x.severity == NOTE for x in findings):
            # the formula is one of the name's readings: the name stands with that reading
            # (with the water the name states); an open charge settled by the formula is a
            # full witness, a trade name used for several compounds a weak one
            dry = f.anhydrous()
            fits = [parse_formula(c) for c in exc.choices if _same(parse_formula(c).anhydrous(), dry)]
            reading_of_name = fits[0] if len(fits) == 1 and fits[0].water else f  # water 0: not stated
            open_charge = getattr(exc, "reason", "") == "open-charge"
            witness = Witness(NAME, reading_of_name, f"the name '{text}'", grounds=open_charge)
        elif getattr(exc, "reason", "") in ("unknown", ""):
            witness = _table_name_witness(text)
            if witness is not None:
                findings = [x for x in findings if not x.message.startswith("name not checked")]
        return findings, witness, None
    named = parse_formula(reading.formula)
    findings = check_name(text, f) if f is not None or formula_blank else []
    # keep the name's warnings and notes (silent about the hydrate or the acid hydrogens);
    # its disagreements are weighed with the other witnesses
    findings = [x for x in findings if x.severity != ERROR]
    said = f"the name '{text}'"
    if f is not None:
        stated_water = any(q.kind == "hydrate" for q in reading.qualifiers) or bool(named.water)
        if not stated_water and _same(named.anhydrous(), f.anhydrous()):
            return findings, Witness(NAME, f, said, grounds=False), reading
        if any(x.check == "name" and x.severity == WARNING for x in findings):
            return findings, None, reading  # silent about the acid hydrogens: not a witness
    return findings, Witness(NAME, named, said), reading


def _acid_salt_name(text: str, reading, findings: list[Finding]) -> tuple[list[Finding], Witness | None]:
    """A name that reads as a salt whose formula keeps acid hydrogens the name does not
    state ('sodium carbonate' on NaHCO3) is a warning alone; on a line with a CAS RN it is
    a witness like any other when the substance table gives the name exactly to the
    compound cellchem reads (sodium carbonate is Na2CO3 there too), so the CAS RN and the
    molar mass can settle which cell is wrong."""
    silent = [
        x for x in findings if x.check == "name" and x.severity == WARNING and "acid's hydrogens" in x.message
    ]
    if not silent:
        return findings, None
    named = parse_formula(reading.formula)
    core, water = name_core(text)
    found = name_match(text) or (name_match(core) if water in ("", 0) else None)
    if found is None or found[1] != "name" or not found[0].certain:
        return findings, None
    record_formula = formula_of_record(found[0])
    if record_formula is None or composition_key(record_formula) != composition_key(named):
        return findings, None
    kept = [x for x in findings if x not in silent]
    return kept, Witness(NAME, named, f"the name '{text}'", record=found[0])


def _table_name_witness(text: str) -> Witness | None:
    found = name_match(text)
    if found is None:
        # the name without grade, form and strength words ('Ethanol, absolute, AR'), with
        # the water it states as the table writes it ('citric acid monohydrate')
        core, water = name_core(text)
        if core and core != fold_name(text):
            if water == "" or water == 0:
                found = name_match(core)
            elif water is not None:
                found = name_match(f"{core} {hydrate_word(water)}")
    if found is None:
        return None
    record, how = found
    g = formula_of_record(record) if record.certain else None
    if g is None:
        return None
    said = f"the name '{text}' ({'a synonym of ' if how == 'synonym' else ''}{record.name}, CAS {record.cas})"
    return Witness(NAME, g, said, grounds=how == "name", record=record)


def _cas_witness(
    number: str, f: Formula | None, name: Witness | None
) -> tuple[list[Finding], Witness | None]:
    if not number or not re.fullmatch(r"\d{2,7}-\d\d-\d", number):
        return [], None
    record = substance_record(number)
    if record is None:
        return [], None
    if not record.certain:
        if _record_name_fits(record, [g for g in (f, name.formula if name else None) if g is not None]):
            return [], None  # its name says the line's substance: nothing to doubt on this line
        return [
            Finding(
                "cas",
                NOTE,
                f"CAS RN {number} not checked: the substance table's record ({record.name},"
                f" {record.formula}) failed a check when the table was built"
                f" ({record.doubt.split(': ')[0]})",
                "",
                "cas",
            )
        ], None
    g = formula_of_record(record)
    if g is None:
        return [], None
    return [], Witness(CAS, g, f"CAS {number} ({record.name})", record=record)


def _record_name_fits(record, formulas: list[Formula]) -> bool:
    """Whether cellchem reads an uncertain record's name as the line's composition: the
    record's formula is in doubt, but its name agrees with the line (the record of
    cobalt(II) chloride hexahydrate whose formula lost its water)."""
    try:
        readings = [read_name(record.name).formula]
    except CellchemError as exc:  # a name that leaves the charge open: any of its readings
        readings = list(exc.choices or ())
    keys = {composition_key(g) for g in formulas if not g.has_unknown_count}
    return any(composition_key(parse_formula(r)) in keys for r in readings)


def _dispute_finding(
    d: Dispute, reading, f: Formula | None, stated: float | None = None, tolerance: float = 0.0
) -> Finding:
    if d.role == NAME or (d.role == FORMULA and reading is not None):
        named = parse_formula(reading.formula) if reading is not None else None
        how = how_they_differ(named, f) if named is not None and f is not None else ""
        check = (
            "name-hydrate"
            if named is not None and f is not None and _same(named.anhydrous(), f.anhydrous())
            else "name"
        )
        message = d.message + (f" ({how})" if how else "")
        if not d.firm:
            message = message.replace(
                ", so the name is the cell to check",
                "; the name matches only a synonym in the substance table, and synonyms may be loose:"
                " check the name against the label",
            )
            return Finding(check, NOTE, message, d.suggestion, "name" if d.role == NAME else "formula")
        return Finding(check, ERROR, message, d.suggestion, "name" if d.role == NAME else "formula")
    if d.role == MASS:
        hint = _hydrate_hint_of(f, stated, tolerance) if f is not None and stated is not None else ""
        return Finding("molar-mass", ERROR, d.message + hint, d.suggestion, "molar_mass")
    if d.role == CAS:
        return Finding("cas", ERROR, d.message, d.suggestion, "cas")
    if d.role == FORMULA:
        return Finding("formula", ERROR, d.message, d.suggestion, "formula")
    severity = WARNING if d.role == "?" else ERROR
    message = d.message
    if reading is not None and f is not None:
        how = how_they_differ(parse_formula(reading.formula), f)
        message += f" ({how})" if how else ""
    return Finding("agreement", severity, message, "", "formula" if f is not None else "name")


def _hydrate_hint_of(f: Formula, value: float, tolerance: float) -> str:
    """'; 159.61 g/mol is the molar mass of CuSO4' when a stated molar mass is another
    hydrate's that exists (data/hydrates.csv), or the anhydrous salt's; a hint of the
    school weights when it is the molar mass they give; '' otherwise."""
    dry = f.anhydrous()
    for n in sorted({0, *known_hydrates(dry)}):
        other = dry.with_water(n)
        if other == f or other.has_unknown_count:
            continue
        if abs(value - float(molar_mass(other))) <= tolerance:
            return f"; {value:g} g/mol is the molar mass of {other.text()}"
    if not f.has_unknown_count and abs(value - school_mass(f)) <= tolerance:
        return (
            f"; {value:g} g/mol is the molar mass with the rounded atomic weights of school data books"
            " (data/school_weights.csv): the 'school' weights accept it"
        )
    return ""


def _mass_finding(
    f: Formula, mass: float, value: float, tolerance: float, formula_findings: list[Finding], named
) -> Finding:
    # only hydrates that exist (data/hydrates.csv): never a hint of KNO3·0.5H2O
    hint = _hydrate_hint_of(f, value, tolerance)
    message = f"the stated molar mass {value:g} g/mol does not match {f.text()}, {mass:.2f} g/mol{hint}"
    if any(x.check in ("charge", "formula-case") for x in formula_findings):
        return Finding(
            "molar-mass",
            WARNING,
            f"{message}; the formula itself is in doubt (see the formula's finding)",
            "",
            "molar_mass",
        )
    if named is not None and named.grounds and _same(named.formula, f):
        return Finding("molar-mass", ERROR, message, f"{mass:.2f}", "molar_mass")
    return Finding(
        "molar-mass",
        ERROR,
        f"{message}; nothing else on the line confirms the formula, so either cell may be wrong",
        "",
        "molar_mass",
    )


def _suggest_cas(findings: list[Finding], digits: str, witnesses: list[Witness]) -> list[Finding]:
    """A CAS RN with a wrong check digit: the numbers of the substance table one typing slip
    away (one digit changed, two neighbours swapped) that belong to the line's substance."""
    compositions = [w.formula for w in witnesses if w.role != CAS and w.grounds]
    if not compositions:
        return findings
    near = [
        s
        for s in cas_neighbours(digits)
        if s.certain
        and any(composition_key(formula_of_record(s) or c) == composition_key(c) for c in compositions)
    ]
    out = []
    for x in findings:
        if x.check == "cas" and x.severity == ERROR and len(near) == 1:
            x = Finding(
                x.check,
                x.severity,
                f"{x.message}; one typing slip away, the substance table holds {near[0].cas}"
                f" ({near[0].name}), the line's substance",
                near[0].cas,
                x.field,
            )
        out.append(x)
    return out


def _unknown_cas(number: str, witnesses: list[Witness]) -> list[Finding]:
    """A well-formed CAS RN the table does not hold, one typing slip (two neighbouring
    digits swapped, one digit changed) from the number the table gives the line's
    substance: the slip passed the check digit (61-95-0 for 61-90-5)."""
    compositions = [w.formula for w in witnesses if w.role != CAS and w.grounds]
    if len(compositions) < 1:
        return []
    keys = {composition_key(c) for c in compositions}
    if len(keys) != 1:
        return []
    near = [s for s in cas_neighbours(number) if s.certain and composition_key(s.formula) in keys]
    if len(near) != 1:
        return _not_in_table(number, witnesses, keys)
    return [
        Finding(
            "cas",
            ERROR,
            f"CAS RN {number} is not in the substance table, and {near[0].cas}, one typing slip away, is the"
            f" number of the line's substance ({near[0].name}): the slip passes the check digit",
            near[0].cas,
            "cas",
        )
    ]


def _not_in_table(number: str, witnesses: list[Witness], keys: set[str]) -> list[Finding]:
    """A warning for a well-formed CAS RN the table does not hold on a line whose substance
    the table holds under another number: the name matched to one record, or the one
    certain record of the line's composition. Not an error: a substance may have more
    numbers than the table knows."""
    named = [w.record for w in witnesses if w.role == NAME and w.record is not None and w.grounds]
    key = next(iter(keys))
    # a composition names one substance only without carbon: organic formulas have isomers
    carbon = any(w.formula.counts.get("C") for w in witnesses if composition_key(w.formula) == key)
    known = named or ([] if carbon else [r for r in by_composition(key) if r.certain])
    if len(known) != 1 or known[0].cas == number:
        return []
    record = known[0]
    return [
        Finding(
            "cas",
            WARNING,
            f"CAS RN {number} is not in the substance table, which gives the line's substance"
            f" ({record.name}) as {record.cas}: check the number on the label or the SDS",
            "",
            "cas",
        )
    ]


_FORM_WORDS = re.compile(
    r"^(?:(?:d|l|dl|rac|cis|trans|o|m|p|ortho|meta|para|n)-|\((?:[rs+\-±]|r,s|\+/-)\)-?|[dl]\([+\-]\)-)"
)


def _name_of_form(name: str) -> str:
    """A substance name without the descriptor of its stereo or ring-position form
    ('l-alanine', '(s)-alanine' and 'dl-alanine' are all 'alanine'; 'o-xylene' is 'xylene')."""
    folded = fold_name(name)
    while True:
        shorter = _FORM_WORDS.sub("", folded)
        if shorter == folded:
            return folded
        folded = shorter


def _other_substance_finding(name: Witness | None, cas: Witness | None, disputes: list) -> list[Finding]:
    """The name, matched exactly to one record of the substance table, and the CAS RN name
    two substances of the same formula (isomers: isobutanol and butan-2-ol): no majority of
    cells can say which is wrong, so the finding names both and suggests nothing. An error
    when the names differ as substances, a warning when they differ only in the form
    descriptor (l-alanine and dl-alanine; xylene and o-xylene) or the name is a synonym."""
    if name is None or cas is None or name.record is None or cas.record is None or disputes:
        return []
    a, b = name.record, cas.record
    if a.cas == b.cas or composition_key(name.formula) != composition_key(cas.formula):
        return []
    same_form = _name_of_form(a.name) == _name_of_form(b.name)
    severity = ERROR if name.grounds and not same_form else WARNING
    how = "another form of it" if same_form else "another substance of the same formula"
    return [
        Finding(
            "cas",
            severity,
            f"CAS RN {b.cas} belongs to {b.name} ({b.formula}), {how}; the name is {a.name}, {a.cas} in"
            " the substance table: either the name or the CAS RN is wrong",
            "",
            "cas",
        )
    ]


def cas_neighbours(digits: str) -> list:
    """Substance records whose CAS RN is one typing slip from these digits: one digit
    changed, or two neighbouring digits swapped, with a valid check digit."""
    digits = re.sub(r"\D", "", digits)
    seen: set[str] = set()
    out = []
    candidates = []
    for i in range(len(digits)):
        for d in "0123456789":
            if d != digits[i]:
                candidates.append(digits[:i] + d + digits[i + 1 :])
        if i + 1 < len(digits) and digits[i] != digits[i + 1]:
            candidates.append(digits[:i] + digits[i + 1] + digits[i] + digits[i + 2 :])
    for c in candidates:
        if len(c) < 5 or c in seen:
            continue
        seen.add(c)
        number = f"{c[:-3]}-{c[-3:-1]}-{c[-1]}"
        try:
            record = substance_record(number)
        except CellchemError:
            continue
        if record is not None:
            out.append(record)
    return out


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
SAVED_VALUE = "saved-value"


class UnsavedValue:
    """A spreadsheet formula cell whose value cannot be read: the file holds no
    saved (cached) value for it, or asks for every formula to be recalculated
    when it is opened, which programs that write workbooks without computing
    them do (their saved values are empty or 0). Readers give this in place of
    the cell's value; the audit reports it and checks the line without it."""

    __slots__ = ("recalculate",)

    def __init__(self, recalculate: bool = False) -> None:
        self.recalculate = recalculate

    @property
    def message(self) -> str:
        if self.recalculate:
            return (
                "the cell holds a spreadsheet formula whose saved value was never computed (the file asks"
                " for its formulas to be recalculated when opened): open and save the file in your"
                " spreadsheet program"
            )
        return (
            "the cell holds a spreadsheet formula with no saved value: open and save the file in your"
            " spreadsheet program"
        )

    def __repr__(self) -> str:
        return "UnsavedValue(recalculate=True)" if self.recalculate else "UnsavedValue()"

    def __str__(self) -> str:
        return "(a formula with no saved value)"


NO_SAVED_VALUE = UnsavedValue()
NOT_RECALCULATED = UnsavedValue(recalculate=True)


def _guarded(formula, mass, name, cas, allowance, decimal_comma, weights=STANDARD_WEIGHTS) -> LineResult:
    """check_line, with a failure of cellchem's own (not of the input) kept to
    this line: one bad row never hides the rest of a file."""
    try:
        return check_line(
            formula, mass, name, cas, mass_allowance=allowance, decimal_comma=decimal_comma, weights=weights
        )
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


def _check_line_cached(
    formula, mass, name, cas, allowance, decimal_comma, weights=STANDARD_WEIGHTS
) -> LineResult:
    """check_line, remembered for repeated lines (stock lists repeat compounds)."""
    return _LINES.get(
        (typed(formula, mass, name, cas), allowance, decimal_comma, weights),
        lambda: _guarded(formula, mass, name, cas, allowance, decimal_comma, weights),
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
    weights: str = STANDARD_WEIGHTS,
) -> RowResult:
    """Audit one data row of a table whose layout is known.

    A cell given as an UnsavedValue (a spreadsheet formula with no saved
    value) gets a warning of its own, and the line is checked without it.
    Rows the same in every cell and read with the same columns are audited
    once (stock lists repeat their lines)."""
    key = (typed(*cells), tuple(layout.roles.items()), mass_allowance, decimal_comma, weights)
    done = _ROWS.get(
        key,
        lambda: _with_sds(
            cells,
            layout,
            _audit_row(
                cells, layout, 0, mass_allowance=mass_allowance, decimal_comma=decimal_comma, weights=weights
            ),
        ),
    )
    return RowResult(row, done.status, done.reason, done.findings, done.columns, done.result)


_ROWS: Memo[RowResult] = Memo(50_000)

# the check and role of each field of an SDS finding (cellchem.sds)
_SDS_FIELDS = {
    "ec": ("ec", "ec"),
    "un": ("un", "un"),
    "hazard statements": ("hazard-statements", "hazard_statements"),
    "precautionary statements": ("precautionary-statements", "precautionary_statements"),
    "signal word": ("signal-word", "signal_word"),
    "pictograms": ("pictograms", "pictograms"),
}


def _with_sds(cells: Sequence[object], layout: Layout, done: RowResult) -> RowResult:
    """The row's result with the checks of its safety-data-sheet columns added (EC number, UN
    number, H and P statements, signal word, pictograms), where the table has such columns."""
    roles = layout.roles
    if done.status == BLANK or not any(role in roles for role in SDS_ROLES):
        return done
    from .sds import check_ec, check_hazards, check_un

    def cell(role: str) -> str | None:
        v = _cell(cells, roles.get(role))
        if _blank(v) or isinstance(v, UnsavedValue):
            return None
        return str(int(v)) if isinstance(v, float) and v.is_integer() else str(v).strip()

    found = []
    found += _sds_findings(check_ec(cell("ec")))
    un = cell("un")
    if un is not None:
        formula = done.result.formula if done.result is not None else None
        found += _sds_findings(
            check_un(un, cas=cell("cas"), formula=None if formula is None else str(formula))
        )
    found += _sds_findings(
        check_hazards(
            cell("hazard_statements"),
            cell("precautionary_statements"),
            cell("signal_word"),
            cell("pictograms") if "pictograms" in roles else None,
            statements_column="hazard_statements" in roles,
        )
    )
    if not found:
        return done
    letters = done.columns or layout.letters
    return RowResult(done.row, done.status, done.reason, done.findings + tuple(found), letters, done.result)


def _sds_findings(found) -> list[Finding]:
    return [
        Finding(_SDS_FIELDS[f.field][0], f.severity, f.message, f.suggestion or "", _SDS_FIELDS[f.field][1])
        for f in found
    ]


def _audit_row(
    cells: Sequence[object],
    layout: Layout,
    row: int,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
    weights: str = STANDARD_WEIGHTS,
) -> RowResult:
    roles = layout.roles
    values = {role: _cell(cells, roles.get(role)) for role in ("name", "formula", "molar_mass", "cas")}
    if all(_blank(v) for v in cells):
        return RowResult(row, BLANK, "", ())
    letters = layout.letters
    unsaved: tuple[Finding, ...] = ()
    if any(isinstance(v, UnsavedValue) for v in values.values()):
        unsaved = tuple(
            Finding(SAVED_VALUE, WARNING, v.message, "", role)
            for role, v in values.items()
            if isinstance(v, UnsavedValue)
        )
        values = {role: None if isinstance(v, UnsavedValue) else v for role, v in values.items()}
        if all(_blank(values[r]) for r in values):
            return RowResult(
                row, NOT_CHECKED, "the cells hold spreadsheet formulas with no saved value", unsaved, letters
            )
    if all(_blank(values[r]) for r in values):
        return RowResult(row, NOT_CHECKED, "no name, formula, molar mass or CAS RN", (), letters)
    result = _check_line_cached(
        values["formula"],
        values["molar_mass"],
        values["name"],
        values["cas"],
        mass_allowance,
        decimal_comma,
        weights,
    )
    findings = unsaved + result.findings
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

    def add_finding(self, severity: str, check: str) -> None:
        """Count a finding that belongs to no row (a table's columns)."""
        self.severities[severity] += 1
        self.checks[(severity, check)] += 1

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
    weights: str = STANDARD_WEIGHTS,
) -> Iterable[RowResult]:
    """Audit the data rows after a header, one at a time (memory does not grow
    with the table). ``first_row`` is the 1-based number of the first row
    given; ``row_numbers`` gives each row's number instead (CSV line numbers)."""
    numbers = iter(row_numbers) if row_numbers is not None else None
    for i, cells in enumerate(rows):
        number = next(numbers) if numbers is not None else first_row + i
        yield audit_row(
            cells, layout, number, mass_allowance=mass_allowance, decimal_comma=decimal_comma, weights=weights
        )


def audit_rows(
    rows: Iterable[Sequence[object]],
    columns: Mapping[str, str] | None = None,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
    header_row: int | None = None,
    weights: str = STANDARD_WEIGHTS,
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
        header_row: the 1-based row of the header, when it is known (it is
            found among the first 20 rows otherwise).
        weights: ``'standard'`` or ``'school'``, as for ``check_line``.

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
    layout = find_layout(materialised, columns, header_index=None if header_row is None else header_row - 1)
    body = materialised[layout.header_index + 1 :]
    summary = Summary()
    results = []
    for r in iter_audit(
        body,
        layout,
        layout.header_index + 2,
        mass_allowance=mass_allowance,
        decimal_comma=decimal_comma,
        weights=weights,
    ):
        summary.add(r)
        results.append(r)
    return TableAudit(layout, tuple(results), summary)
