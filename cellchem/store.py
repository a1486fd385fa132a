"""Questions of the whole store, over plain records (``StoreLine``): how much of
each substance is held (``totals``), which lines hold the same substance in the
same place (``duplicates``), how much of an element or ion of concern is on site
(``concern``), and which incompatible substances share a location
(``families``, ``segregation``).

What identifies a substance (``substance_key``): the canonical formula of the
line's formula cell, else of its name (``formula_from_name``), else of the
substance table's record for its CAS RN, with the CAS RN as a tie-breaker:
the key is ``(formula, CAS RN or '')``. Hydrates are separate substances from
the anhydrous salt. A line is not identified (None, with the reason from
``identify``) when its formula or name cannot be read, when its CAS RN fails
its check digit, or when its cells disagree (a name or a CAS RN of another
substance than its formula). ``totals`` and ``duplicates`` put a line with no
CAS RN with the lines of the same formula when the list holds that formula
under one CAS RN only.

A line's strength (``line_strength``): the line's own ``strength`` field, else
a strength the name states (``'Hydrochloric acid 37%'``, ``'silver nitrate
solution 0.1 M'``). A plain per cent is % w/w for a reagent of the density
table (``cellchem.packs``), as suppliers state it; for another substance it is
a purity (``'sodium chloride 99.5%'``) unless the name says it is a solution,
when it is refused (w/w or w/v is not said). % w/v, mol/L (M), g/L, mg/L and
ppm (as mg/L) are read; ranges (``'95-97%'``), volume strengths
(``'100 vol'``), specific gravities (``'0.88'``) and normalities are found
but not read. A line with a strength is a solution: its mass is the
solution's, and its substance's mass (for ``concern``) is worked out from the
strength, or not at all (the line is then listed apart). A purity is ignored:
a pack of 99 % mercury(II) chloride counts as mercury(II) chloride.

Segregation: the families and the pairs that must not share a shelf are in
``data/segregation_families.csv`` and ``data/segregation.csv``, with their
sources (Prudent Practices in the Laboratory, 2011, chapter 5; the CLP meanings
of the H statements; common practice). Flammability is read from H statements
only, never guessed from a formula. A solution is placed in its solute's
families whatever its strength, except that the solution of an oxidising salt
(0.1 M silver nitrate, 0.02 M permanganate) is an oxidiser only by its H
statements, and not in the "chlorate or permanganate" family: the salts' H272
and their reactions with concentrated acids are those of the solid (common
practice); nitric and perchloric acid and hydrogen peroxide stay oxidisers by
their formulas, and a hypochlorite solution stays a hypochlorite. Lines with no
location are never put together.

Elements of concern (``DEFAULT_CONCERN``): Hg, Pb, Cd and Cr(VI) are the
metals restricted in electrical equipment by the EU RoHS Directive 2011/65/EU,
Annex II, and (with Cr(VI) and Cd compounds) by entries of REACH Annex XVII
(from memory); As, Ba, Se, Ag are, with Hg, Pb, Cd and Cr, the eight metals of
the US RCRA toxicity characteristic (40 CFR 261.24, from memory); Tl, Be and
Ni are the further toxic metals stores and waste contractors commonly report
(common practice). An element counts whatever its compound (the barium of
BaSO4 counts though it is insoluble). "Cr(VI)" is the chromium of the
chromate and dichromate ions and of the Cr6+ of chromium(VI) oxide, as the
charge balance reads the formula: an element with an oxidation state
(``'Cr(VI)'``, ``'Cr(III)'``) counts the atoms of that element in monatomic
ions of that charge and in oxoanions of that element alone (CrO4 2-:
(-2 + 2x4)/1 = +6); where the element sits in another ion (a complex) or in
a molecular compound, or where that reading disagrees with the usual
oxidation numbers of oxygen (-2), the halogens (-1) and the group 1 and 2
metals (chromyl chloride CrO2Cl2, which the ionic reading takes for Cr2+ with
two hypochlorite ions), its oxidation state is not read and the line is
listed apart (``Concern.not_counted``), never counted as 0. An ion or group (``'CN'``) counts where the
formula's ionic reading holds it (``mass_fraction``): the cyanide inside a
hexacyanidoferrate, or a nitrile, is not counted, and such lines are listed
as holding the elements otherwise.
"""

from __future__ import annotations

import math
import re
import unicodedata
from collections.abc import Iterable
from dataclasses import dataclass
from fractions import Fraction
from functools import cache, lru_cache
from typing import NamedTuple

from .cas import read_cas
from .charge import IONIC, charge_balance
from .elements import element, is_symbol
from .errors import CellchemError
from .formula import Formula
from .ions import counts_key
from .mass import mass_fraction, molar_mass
from .names import formula_from_name, name_core, same_substance
from .packs import (
    COUNT_KIND,
    MASS_KIND,
    Pack,
    density_row,
    listed_strengths,
    read_density,
    read_pack,
)
from .reading import parse_formula
from .solutions import ions_of
from .substances import composition_key, substance
from .tables import read_table
from .units import AMOUNT_PER_VOLUME, MASS_FRACTION, MASS_PER_VOLUME, read_quantity

SEGREGATION_CAUTION = (
    "An empty list means only that cellchem's segregation rules found nothing: they know a short list"
    " of families and pairs, read from each line's formula and H statements, and compare only lines"
    " with the same location. The supplier's safety data sheet (sections 7 and 10), local regulations"
    " and the site's safety officer decide how chemicals are stored."
)
TOTALS_NOTE = (
    "Masses are of what the packs hold as sold (a solution's mass, not its solute's). Volumes of liquids"
    " with no known density are kept in mL and never added to grams; counted items (tablets, ampoules)"
    " are kept apart. Lines that could not be weighed or identified are listed with the reason and left"
    " out of the figures."
)
CONCERN_NOTE = (
    "Each figure is the mass of the element or ion itself, summed over the lines that could be weighed;"
    " lines listed apart could not be weighed or their share could not be read, so the amount on site"
    " may be larger. Waste contractors and local regulations decide what must be declared."
)

DEFAULT_CONCERN: tuple[str, ...] = ("Hg", "Pb", "Cd", "Cr(VI)", "As", "Ba", "Se", "Ag", "Tl", "Be", "Ni")


# ---------------------------------------------------------------------------
# Lines
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class StoreLine:
    """One line of a store list, as plain values.

    Attributes:
        source: the file the line comes from.
        sheet: the sheet (or '' for a text file).
        row: the row number in the sheet.
        name: the name cell, or None.
        formula: the formula cell, or None.
        cas: the CAS RN cell, or None.
        quantity: the pack text (``'500 g'``, ``'6 x 1 L'``), or None.
        count: how many packs the line holds (a "Qty"/"Anzahl" column), default 1.
        location: where it is kept (``'Prep room B, shelf 3'``), or None.
        hazards: the H statements (``'H290, H314'``), or None.
        strength: the strength, where a column gives it (``'37 %'``, ``'0.1 M'``),
            else None (the name's strength is read).
        density: the liquid's density in g/mL (number or text), where a
            column gives it, else None; it wins over the density table.
    """

    source: str
    sheet: str
    row: int
    name: str | None = None
    formula: str | None = None
    cas: str | None = None
    quantity: str | None = None
    count: float = 1
    location: str | None = None
    hazards: str | None = None
    strength: str | None = None
    density: float | str | None = None

    @property
    def where(self) -> str:
        """The line's place, for messages: ``'stock.xlsx, sheet Acids, row 12'``."""
        sheet = f", sheet {self.sheet}" if self.sheet else ""
        return f"{self.source}{sheet}, row {self.row}"


def _text(value: object) -> str:
    return value.strip() if isinstance(value, str) else ""


# ---------------------------------------------------------------------------
# What a line holds
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Identity:
    """What ``identify`` made of a line: the key and formula, or why not.

    Attributes:
        key: ``(canonical formula, CAS RN or '')``, or None.
        formula: the formula read, or None.
        reason: why the line is not identified ('' when it is).
        source: which cell gave the formula (``'formula'``, ``'name'``, ``'CAS RN'``).
    """

    key: tuple[str, str] | None
    formula: Formula | None
    reason: str = ""
    source: str = ""


def _unidentified(reason: str) -> Identity:
    return Identity(None, None, reason)


_AMMONIA = frozenset({counts_key({"N": 1, "H": 3}), counts_key({"N": 1, "H": 5, "O": 1})})


def _agree_with_name(f: Formula, name_formula: Formula, name: str) -> bool:
    """Whether a name's formula fits the formula cell: the same substance, with water
    compared only where the name states it; NH3 and NH4OH (ammonia solution as labels
    write it) agree."""
    if {counts_key(f.anhydrous().counts), counts_key(name_formula.anhydrous().counts)} <= _AMMONIA:
        return True
    try:
        stated = name_core(name)[1]
    except CellchemError:
        stated = ""
    if stated == "" or stated is None:
        a, b = f.anhydrous(), name_formula.anhydrous()
        # a multiple of the salt is the same salt: 3CdSO4·8H2O is cadmium sulfate hydrate
        return same_substance(a, b) or _reduced(a.counts) == _reduced(b.counts)
    return same_substance(f, name_formula)


def _reduced(counts) -> tuple:
    """Element counts divided by their greatest common divisor (whole counts only)."""
    values = list(counts.values())
    if not values or not all(isinstance(v, int) for v in values):
        return tuple(sorted(counts.items()))
    g = math.gcd(*values)
    return tuple(sorted((k, v // g) for k, v in counts.items()))


def _agree_with_record(f: Formula, record_formula: str) -> bool:
    try:
        if composition_key(record_formula) == composition_key(f):
            return True
        if same_substance(record_formula, f):
            return True
    except CellchemError:
        return False
    # ammonia solution is sold under the CAS RN of "ammonium hydroxide" (H5NO)
    return {counts_key(f.counts), counts_key(parse_formula(record_formula).counts)} <= _AMMONIA


def _record_formula(record) -> Formula:
    """The formula of a substance-table record as cellchem writes it: from its name where
    that reads to the same composition, else the record's Hill formula."""
    try:
        from_name = parse_formula(formula_from_name(record.name))
        if composition_key(from_name) == composition_key(record.formula):
            return from_name
    except CellchemError:
        pass
    return parse_formula(record.formula)


def identify(line: StoreLine) -> Identity:
    """What substance a line holds, or why that cannot be said.

    >>> identify(StoreLine("a.xlsx", "S", 2, name="Sodium chloride")).key
    ('NaCl', '')
    >>> identify(StoreLine("a.xlsx", "S", 3, name="ethanol")).reason  # doctest: +ELLIPSIS
    "name 'ethanol' cannot be read ..."
    """
    return _identify(line)


@lru_cache(maxsize=65536)
def _identify(line: StoreLine) -> Identity:
    cas_text, formula_text, name = _text(line.cas), _text(line.formula), _text(line.name)
    cas = ""
    record = None
    if cas_text:
        try:
            cas = read_cas(cas_text).number
        except CellchemError as exc:
            return _unidentified(f"{exc}; correct the CAS RN or leave its cell empty")
        try:
            record = substance(cas)
        except CellchemError:
            record = None
        if record is not None and not record.certain:
            record = None
    f: Formula | None = None
    source = ""
    name_agrees = False  # the name read and fits the formula: two witnesses against the record
    if formula_text:
        try:
            f = parse_formula(formula_text)
        except CellchemError as exc:
            return _unidentified(f"formula {formula_text!r} cannot be read: {exc}")
        if f.charge:
            return _unidentified(
                f"formula {formula_text!r} is an ion, not a substance on a shelf; give a compound"
            )
        source = "formula"
        if name:
            try:
                named = parse_formula(formula_from_name(name))
            except CellchemError:
                named = None  # a name cellchem does not read (organic, a product name): the formula decides
            if named is not None and not _agree_with_name(f, named, name):
                return _unidentified(
                    f"the name {name!r} reads as {named.text()} but the formula cell holds {f.text()};"
                    " correct one of them"
                )
            name_agrees = named is not None
    elif name:
        try:
            f = parse_formula(formula_from_name(name))
            source = "name"
        except CellchemError as exc:
            if record is None:
                return _unidentified(
                    f"name {name!r} cannot be read ({exc}); give the formula or a CAS RN the substance table"
                    " holds"
                )
    if f is None and record is not None:
        try:
            f = _record_formula(record)
            source = "CAS RN"
        except CellchemError as exc:
            return _unidentified(f"the substance table's formula for CAS RN {cas} cannot be read: {exc}")
    if f is None:
        if cas:
            return _unidentified(
                f"CAS RN {cas} is not in cellchem's substance table and the line has no formula or name"
                " cellchem reads; give the formula"
            )
        return _unidentified("the line has no formula, name or CAS RN; give the formula")
    # open data is one witness: a record outvoted by the name and the formula does not refuse the line
    if (
        record is not None
        and source != "CAS RN"
        and not name_agrees
        and not _agree_with_record(f, record.formula)
    ):
        return _unidentified(
            f"CAS RN {cas} is {record.name} ({record.formula}) in cellchem's substance table, but the line's"
            f" formula is {f.text()}; correct one of them"
        )
    return Identity((f.text(), cas), f, "", source)


def substance_key(line: StoreLine) -> tuple[str, str] | None:
    """What identifies the substance of a line: ``(canonical formula, CAS RN or '')``,
    or None when it cannot be identified (``identify(line).reason`` says why).

    >>> substance_key(StoreLine("a.xlsx", "S", 2, formula="CuSO4.5H2O", cas="7758-99-8"))
    ('CuSO4·5H2O', '7758-99-8')
    """
    return _identify(line).key


# ---------------------------------------------------------------------------
# Strength
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Strength:
    """The strength of a line in solution.

    Attributes:
        text: as found (the strength field, or the words of the name).
        label: as cellchem writes it (``'37 % w/w'``, ``'0.1 mol/L'``,
            ``'5 g/L'``), or ``''`` when it could not be read.
        kind: ``cellchem.units``' kind (mass fraction, amount/volume,
            mass/volume), or ``''``.
        value: in the base unit of the kind (a fraction, mol/L, g/L).
        reason: why it could not be read (``''`` when it was).
        notes: assumptions made in reading it.
    """

    text: str
    label: str
    kind: str
    value: float
    reason: str = ""
    notes: tuple[str, ...] = ()

    @property
    def group(self) -> str:
        """What ``totals`` groups by: the label, or what was found when it was not read."""
        return self.label or f"solution, strength not read ({self.text})"


_NUM = r"\d+(?:[.,]\d+)?"
_PERCENT_RANGE = re.compile(rf"(?<![\w.,])({_NUM})\s*%?\s*(?:-|–|to|bis)\s*({_NUM})\s*%")
_PERCENT = re.compile(
    rf"(?<![\w.,])({_NUM})\s*(\+)?\s*%(\s*\(?\s*(?:w/w|w/v|v/v|m/m|m/v|wt)\s*\)?)?", re.IGNORECASE
)
_PURITY_BEFORE = re.compile(
    r"(?:≥|>=|>|min\.?|minimum|assay|purity|pure|reinst|gehalt|content)\s*$", re.IGNORECASE
)
_MOLAR = re.compile(
    rf"(?<![\w.,])({_NUM})\s*(M|mM|N|mol\s*/\s*[lL]|mol\s*/\s*dm3|mol\s*[lL]-1|mmol\s*/\s*[lL]|g\s*/\s*[lL]"
    r"|mg\s*/\s*[lL]|ppm)(?![\w/])"
)
# Strengths stores print that do not fix a concentration cellchem uses (common practice): the
# volume strength of hydrogen peroxide ('100 vol') and a specific gravity ('0.88', 's.g. 1.84').
_UNREAD = re.compile(
    r"(?<![\w.,])\d+\s*(?:vol\.?|volumes?)(?![\w])"
    r"|(?:(?<![\w.])(?:sp\.?\s*gr\.?|s\.\s*g\.?|sg)\s*=?\s*\d?\.\d{2,3}(?![\w.]))"
    r"|(?:(?<![\w.,%])(?:\d\.\d{2,3}|\.\d{3})\s*$)",
    re.IGNORECASE,
)
_SOLUTION_WORD = re.compile(r"(?<![\w])(?:solution|soln\.?|lösung|loesung|lsg\.?)(?![\w])", re.IGNORECASE)


def _strength_tokens(name: str) -> tuple[list[str], bool]:
    """The strengths a name states (purities set aside), and whether it says 'solution'."""
    s = unicodedata.normalize("NFKC", name)
    tokens: list[tuple[int, str]] = []
    for m in _PERCENT_RANGE.finditer(s):
        tokens.append((m.start(), m.group(0).strip()))
    covered = [(m.start(), m.end()) for m in _PERCENT_RANGE.finditer(s)]
    for m in _PERCENT.finditer(s):
        if any(a <= m.start() < b for a, b in covered):
            continue
        if m.group(2) or _PURITY_BEFORE.search(s[: m.start()]):
            continue  # '99+%', '≥ 99 %', 'assay 99 %': a purity
        tokens.append((m.start(), m.group(0).strip()))
    for m in _MOLAR.finditer(s):
        tokens.append((m.start(), m.group(0).strip()))
    for m in _UNREAD.finditer(s):
        tokens.append((m.start(), m.group(0).strip()))
    return [t for _, t in sorted(tokens)], bool(_SOLUTION_WORD.search(s))


def _read_strength(text: str, f: Formula | None, from_name: bool, solution: bool) -> Strength | None:
    folded = " ".join(unicodedata.normalize("NFKC", text).split())
    if _UNREAD.fullmatch(folded):
        return Strength(
            text,
            "",
            "",
            0.0,
            f"the strength {text!r} is a volume strength or a specific gravity, which cellchem does not"
            " convert; give the strength as % w/w",
        )
    if _PERCENT_RANGE.fullmatch(folded):
        return Strength(
            text,
            "",
            "",
            0.0,
            f"the strength {text!r} is a range; give one strength (such as the lower figure)",
        )
    m = _PERCENT.fullmatch(folded)
    if m:
        value = float(m.group(1).replace(",", "."))
        qualifier = (m.group(3) or "").lower().replace(" ", "").strip("()")
        if qualifier in ("w/w", "m/m", "wt"):
            return _fraction_strength(text, value, ())
        if qualifier in ("w/v", "m/v"):
            return Strength(text, f"{value:g} % w/v", MASS_PER_VOLUME, value * 10.0)
        if qualifier == "v/v":
            return Strength(
                text,
                "",
                "",
                0.0,
                f"the strength {text!r} is % v/v, which needs the densities of the liquids mixed",
            )
        if f is not None and listed_strengths(f):
            note = f"'{text}' read as % w/w, the way suppliers state the strength of {f.text()}"
            return _fraction_strength(text, value, (note,))
        if from_name and not solution:
            return None  # a plain per cent in the name of a substance not sold as a solution: a purity
        return Strength(
            text,
            "",
            "",
            0.0,
            f"the strength {text!r} does not say % w/w or % w/v; write the strength as '% w/w' or '% w/v'",
        )
    try:
        number, reading = read_quantity(re.sub(r"(?<=\d),(?=\d)", ".", folded), "", "strength")
    except CellchemError as exc:
        return Strength(text, "", "", 0.0, f"the strength {text!r} cannot be read: {exc}")
    value = number * reading.factor
    if not (math.isfinite(value) and value > 0):
        return Strength(text, "", "", 0.0, f"the strength {text!r} is not above 0")
    notes = (reading.note,) if reading.note else ()
    if reading.kind == AMOUNT_PER_VOLUME:
        return Strength(text, f"{value:g} mol/L", AMOUNT_PER_VOLUME, value, "", notes)
    if reading.kind == MASS_PER_VOLUME:
        return Strength(text, f"{value:g} g/L", MASS_PER_VOLUME, value, "", notes)
    if reading.kind == MASS_FRACTION:
        return _fraction_strength(text, value * 100.0, ())
    return Strength(
        text, "", "", 0.0, f"the strength {text!r} is {reading.kind}; give % w/w, % w/v, mol/L or g/L"
    )


def _fraction_strength(text: str, percent: float, notes: tuple[str, ...]) -> Strength:
    if not (0 < percent <= 100):
        return Strength(text, "", "", 0.0, f"the strength {text!r} is not a per cent above 0 and up to 100")
    return Strength(text, f"{percent:g} % w/w", MASS_FRACTION, percent / 100.0, "", notes)


def line_strength(line: StoreLine) -> Strength | None:
    """The strength of a line in solution, or None for a substance as such.

    >>> line_strength(StoreLine("a", "", 2, name="Hydrochloric acid 37%")).label
    '37 % w/w'
    >>> line_strength(StoreLine("a", "", 3, name="Sodium chloride 99.5%")) is None
    True
    """
    return _line_strength(line)


@lru_cache(maxsize=65536)
def _line_strength(line: StoreLine) -> Strength | None:
    f = _identify(line).formula
    given = line.strength
    if isinstance(given, int | float) and not isinstance(given, bool):
        given = f"{given:g} %"
    if _text(given):
        return _read_strength(_text(given), f, False, True)
    name = _text(line.name)
    if not name:
        return None
    tokens, solution = _strength_tokens(name)
    if len(tokens) > 1:
        return Strength(
            ", ".join(tokens),
            "",
            "",
            0.0,
            f"the name {name!r} states more than one strength ({', '.join(tokens)}); give the strength apart",
        )
    if tokens:
        found = _read_strength(tokens[0], f, True, solution)
        if found is not None:
            return found
    if solution:
        return Strength("solution", "", "", 0.0, f"the name {name!r} says solution but gives no strength")
    return None


# ---------------------------------------------------------------------------
# Weighing a line
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class LineAmount:
    """What one line holds, as ``totals`` adds it.

    Attributes:
        line: the line.
        mass_g: grams (mass packs, and volume packs with a density), or None.
        volume_ml: millilitres of a liquid with no known density, or None.
        items: counted items, or None.
        pack_volume_ml: the volume of a volume pack (whether weighed or not), or None.
        notes: the density used and where it came from.
    """

    line: StoreLine
    mass_g: float | None
    volume_ml: float | None
    items: float | None
    pack_volume_ml: float | None
    notes: tuple[str, ...] = ()


def _count(line: StoreLine) -> float:
    n = line.count
    if isinstance(n, bool) or not isinstance(n, int | float) or not math.isfinite(n) or n < 0:
        raise CellchemError(f"count {n!r} is not a number of packs (0 or more)")
    return float(n)


def weigh_line(line: StoreLine) -> LineAmount:
    """What a line holds: its packs times its count, in grams where they can be
    weighed, else in millilitres or items.

    Raises:
        CellchemError: the pack text or the count cannot be read.

    >>> weigh_line(StoreLine("a", "", 2, formula="NaCl", quantity="500 g", count=3)).mass_g
    1500.0
    """
    if not _text(line.quantity):
        raise CellchemError(f"no pack size given (read {line.quantity!r}); give it such as '500 g' or '1 L'")
    pack: Pack = read_pack(line.quantity)  # type: ignore[arg-type]
    n = _count(line)
    total = pack.total * n
    if pack.kind == MASS_KIND:
        return LineAmount(line, total, None, None, None)
    if pack.kind == COUNT_KIND:
        return LineAmount(line, None, None, total, None)
    if line.density is not None and _text(str(line.density)):
        rho = read_density(line.density)
        return LineAmount(line, total * rho, None, None, total, (f"density {rho:g} g/mL given on the line",))
    strength = _line_strength(line)
    f = _identify(line).formula
    if f is not None and strength is not None and strength.kind == MASS_FRACTION:
        row = density_row(f, round(strength.value * 100.0, 9))
        if row is not None:
            return LineAmount(line, total * row.density, None, None, total, (f"density {row.text}",))
    return LineAmount(line, None, total, None, total)


class _NotWeighed(Exception):
    """A line's share of a part cannot be given; the message says why."""


def _substance_grams(line: StoreLine, f: Formula) -> float:
    """Grams of the line's substance (the solute, for a solution)."""
    try:
        amount = weigh_line(line)
    except CellchemError as exc:
        raise _NotWeighed(str(exc)) from None
    if amount.items is not None:
        raise _NotWeighed(f"pack {line.quantity!r} counts items, which have no mass")
    strength = _line_strength(line)
    if strength is None:
        if amount.mass_g is None:
            raise _NotWeighed(
                f"pack {line.quantity!r} is a volume with no known density; give the density or the mass"
            )
        return amount.mass_g
    if strength.reason:
        raise _NotWeighed(strength.reason)
    if strength.kind == MASS_FRACTION:
        if amount.mass_g is None:
            raise _NotWeighed(
                f"pack {line.quantity!r} of {f.text()} at {strength.label} is a volume with no known density;"
                " give the density"
            )
        return amount.mass_g * strength.value
    volume_ml = amount.pack_volume_ml
    if volume_ml is None:
        if line.density is None:
            raise _NotWeighed(
                f"pack {line.quantity!r} is a mass of a solution at {strength.label}, whose volume needs the"
                " solution's density; give the density or the volume"
            )
        volume_ml = (amount.mass_g or 0.0) / read_density(line.density)
    if strength.kind == AMOUNT_PER_VOLUME:
        if f.has_unknown_count:
            raise _NotWeighed(f"{f.text()} has an unknown water count, so its molar mass is not known")
        return strength.value * volume_ml / 1000.0 * float(molar_mass(f))
    return strength.value * volume_ml / 1000.0  # g/L


# ---------------------------------------------------------------------------
# Grouping lines of one substance
# ---------------------------------------------------------------------------


def _group_keys(lines: Iterable[StoreLine]) -> dict[StoreLine, tuple[str, str]]:
    """Each identified line's key, a line with no CAS RN taking the one CAS RN its
    formula has among the lines, where there is exactly one."""
    keys = {line: _identify(line).key for line in lines}
    cas_of: dict[str, set[str]] = {}
    for key in keys.values():
        if key is not None and key[1]:
            cas_of.setdefault(key[0], set()).add(key[1])
    out: dict[StoreLine, tuple[str, str]] = {}
    for line, key in keys.items():
        if key is None:
            continue
        if not key[1] and len(cas_of.get(key[0], ())) == 1:
            key = (key[0], next(iter(cas_of[key[0]])))
        out[line] = key
    return out


def _strength_group(line: StoreLine) -> str:
    strength = _line_strength(line)
    return strength.group if strength is not None else ""


# ---------------------------------------------------------------------------
# Totals
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Total:
    """The store's holding of one substance at one strength.

    Attributes:
        key: ``(formula, CAS RN or '')``, or None for the lines no substance
            could be named for (always the last Total, when there are any).
        formula: the canonical formula ('' for the unidentified lines).
        cas: the CAS RN, or ''.
        strength: ``''`` for the substance as such, else the strength
            (``'37 % w/w'``, ``'0.1 mol/L'``, ``'solution, strength not read (...)'``).
        lines: every line behind it, refused ones included.
        mass_g: grams of what the packs hold (solution included).
        volume_ml: millilitres of liquid with no known density (never in ``mass_g``).
        items: counted items (tablets, ampoules).
        entries: what each weighed line added.
        refused: (line, reason) for lines that could not be weighed or identified.
    """

    key: tuple[str, str] | None
    formula: str
    cas: str
    strength: str
    lines: tuple[StoreLine, ...]
    mass_g: float
    volume_ml: float
    items: float
    entries: tuple[LineAmount, ...]
    refused: tuple[tuple[StoreLine, str], ...]


def totals(lines: Iterable[StoreLine]) -> list[Total]:
    """Per substance and strength, how much the store holds (see ``TOTALS_NOTE``).

    >>> t = totals([StoreLine("a", "", 2, formula="NaCl", quantity="500 g"),
    ...             StoreLine("a", "", 3, name="sodium chloride", quantity="6 x 1 kg", location="B")])
    >>> [(x.formula, x.mass_g) for x in t]
    [('NaCl', 6500.0)]
    """
    lines = list(lines)
    keys = _group_keys(lines)
    groups: dict[tuple[tuple[str, str], str], list[StoreLine]] = {}
    unknown: list[StoreLine] = []
    for line in lines:
        key = keys.get(line)
        if key is None:
            unknown.append(line)
        else:
            groups.setdefault((key, _strength_group(line)), []).append(line)
    out: list[Total] = []
    for (key, strength), members in sorted(groups.items(), key=lambda kv: (kv[0][0], kv[0][1])):
        mass = volume = items = 0.0
        entries: list[LineAmount] = []
        refused: list[tuple[StoreLine, str]] = []
        for line in members:
            try:
                amount = weigh_line(line)
            except CellchemError as exc:
                refused.append((line, str(exc)))
                continue
            entries.append(amount)
            mass += amount.mass_g or 0.0
            volume += amount.volume_ml or 0.0
            items += amount.items or 0.0
        out.append(
            Total(
                key,
                key[0],
                key[1],
                strength,
                tuple(members),
                mass,
                volume,
                items,
                tuple(entries),
                tuple(refused),
            )
        )
    if unknown:
        refused = tuple((line, f"substance not identified: {_identify(line).reason}") for line in unknown)
        out.append(Total(None, "", "", "", tuple(unknown), 0.0, 0.0, 0.0, (), refused))
    return out


# ---------------------------------------------------------------------------
# Duplicates
# ---------------------------------------------------------------------------


def fold_location(text: str | None) -> str:
    """A location folded for comparison: case, Unicode forms, spaces (also around
    commas, semicolons, colons and slashes); '' for none.

    >>> fold_location("  Prep room B ,shelf 3 ")
    'prep room b, shelf 3'
    """
    if not isinstance(text, str):
        return ""
    s = unicodedata.normalize("NFKC", text).casefold()
    s = re.sub(r"\s*([,;:/])\s*", r"\1 ", s)
    return " ".join(s.split()).strip(" ,;:/")


class Duplicate(NamedTuple):
    """Lines of one substance, at one strength, at one location."""

    key: tuple[str, str]
    location: str
    lines: tuple[StoreLine, ...]

    @property
    def strength(self) -> str:
        return _strength_group(self.lines[0])


def duplicates(lines: Iterable[StoreLine]) -> list[Duplicate]:
    """Lines of the same substance (and the same strength: 37 % and 2 M hydrochloric
    acid are different products) at the same location, folded for case and spaces.
    Lines with no location or no identified substance are left out.

    >>> a = StoreLine("a", "", 2, formula="NaCl", quantity="1 kg", location="Shelf 1")
    >>> b = StoreLine("a", "", 9, name="Sodium chloride", quantity="500 g", location="shelf  1")
    >>> [(d.key, d.location, len(d.lines)) for d in duplicates([a, b])]
    [(('NaCl', ''), 'Shelf 1', 2)]
    """
    lines = list(lines)
    keys = _group_keys(lines)
    groups: dict[tuple, list[StoreLine]] = {}
    for line in lines:
        place = fold_location(line.location)
        key = keys.get(line)
        if not place or key is None:
            continue
        groups.setdefault((key, _strength_group(line), place), []).append(line)
    return [
        Duplicate(key, _text(members[0].location), tuple(members))
        for (key, _strength, _place), members in groups.items()
        if len(members) > 1
    ]


# ---------------------------------------------------------------------------
# Elements and ions of concern
# ---------------------------------------------------------------------------

_ROMAN = {"I": 1, "II": 2, "III": 3, "IV": 4, "V": 5, "VI": 6, "VII": 7, "VIII": 8}
_STATE_PART = re.compile(r"^([A-Z][a-z]?)\s*\(\s*([IVX]+)\s*\)$")


@dataclass(frozen=True)
class _Part:
    text: str
    kind: str  # 'element', 'state', 'ion'
    symbol: str = ""
    state: int = 0
    formula: Formula | None = None


@lru_cache(maxsize=256)
def _read_part(text: str) -> _Part:
    if not isinstance(text, str) or not text.strip():
        raise CellchemError(
            f"part {text!r}: give an element symbol ('Hg'), 'Cr(VI)' or an ion or group ('CN')"
        )
    s = text.strip()
    m = _STATE_PART.match(s)
    if m:
        if not is_symbol(m.group(1)) or m.group(2) not in _ROMAN:
            raise CellchemError(
                f"part {text!r}: expected an element symbol with an oxidation state in Roman numerals,"
                " such as 'Cr(VI)'"
            )
        return _Part(s, "state", m.group(1), _ROMAN[m.group(2)])
    if is_symbol(s):
        return _Part(s, "element", s)
    try:
        f = parse_formula(s)
    except CellchemError:
        raise CellchemError(
            f"part {text!r} is not an element symbol ('Hg'), an element with an oxidation state ('Cr(VI)') or"
            " an ion or group ('CN')"
        ) from None
    return _Part(s, "ion", formula=f)


class _NotCounted(Exception):
    """A formula holds the part's elements, but not as the part; the message says how."""


def _state_atoms(f: Formula, symbol: str, state: int) -> Fraction:
    """How many atoms of ``symbol`` at oxidation state ``state`` one formula unit holds,
    from the ions of its charge balance (monatomic ions, and oxoanions of the element alone)."""
    balance = charge_balance(f)
    if balance.kind == "element":
        return Fraction(f.counts.get(symbol, 0)) if state == 0 else Fraction(0)
    if balance.kind != IONIC:
        raise _NotCounted(
            f"{f.text()} reads as a {balance.kind} compound; the oxidation state of its {symbol} is not read"
        )
    atoms = Fraction(0)
    by_rule = _state_by_rule(f, symbol)
    for share in balance.charges:
        ion = share.ion
        if ion is None:
            if symbol in parse_formula(share.label).counts:
                raise _NotCounted(
                    f"the oxidation state of {symbol} in {share.label} of {f.text()} is not read"
                )
            continue
        counts = ion.formula.counts
        n = counts.get(symbol, 0)
        if not n:
            continue
        if set(counts) == {symbol}:
            found = Fraction(ion.charge, n)
        elif set(counts) == {symbol, "O"}:
            found = Fraction(ion.charge + 2 * counts["O"], n)
        else:
            raise _NotCounted(f"the oxidation state of {symbol} in {ion.label} of {f.text()} is not read")
        if found == state:
            atoms += Fraction(n) * Fraction(share.count)
        if by_rule is not None and by_rule != found:
            raise _NotCounted(
                f"the charge balance reads {symbol} in {f.text()} as {_signed(found)} but the usual"
                f" oxidation numbers of its other elements give {_signed(by_rule)}; its oxidation state is"
                " not read"
            )
    return atoms


# Oxidation numbers that hold in the compounds stores keep, for the cross-check of a reading
# (IUPAC 2005 IR-4.6.1 rules, from memory): oxygen -2 (not in peroxides), the halogens -1,
# group 1 metals +1, group 2 metals +2.
_FIXED_STATES = {"O": -2, "F": -1, "Cl": -1, "Br": -1, "I": -1}
_FIXED_STATES.update(dict.fromkeys(("Li", "Na", "K", "Rb", "Cs"), 1))
_FIXED_STATES.update(dict.fromkeys(("Be", "Mg", "Ca", "Sr", "Ba"), 2))


def _state_by_rule(f: Formula, symbol: str) -> Fraction | None:
    """The oxidation state of ``symbol`` in a neutral formula of it and elements of fixed
    oxidation number only, or None where the rule does not apply (other elements, a peroxide)."""
    counts = f.anhydrous().counts
    others = {s: n for s, n in counts.items() if s != symbol}
    if f.charge or not others or any(s not in _FIXED_STATES for s in others):
        return None
    balance = charge_balance(f)
    if any(share.ion is not None and share.ion.text == "O2" for share in balance.charges):
        return None  # a peroxide or superoxide: oxygen is not -2
    total = sum(Fraction(_FIXED_STATES[s]) * Fraction(n) for s, n in others.items())
    return -total / Fraction(counts[symbol])


def _signed(x: Fraction) -> str:
    return f"{'+' if x > 0 else ''}{x}"


def _part_fraction(f: Formula, part: _Part) -> float:
    """The mass fraction of a part in a formula; 0.0 when the formula holds none of it."""
    if part.kind in ("element", "state"):
        if part.symbol not in f.counts:
            return 0.0
    elif part.formula is not None and any(s not in f.counts for s in part.formula.counts):
        return 0.0
    if f.has_unknown_count:
        raise _NotWeighed(f"{f.text()} has an unknown water count, so its molar mass is not known")
    if part.kind == "element":
        return mass_fraction(f, part.symbol)
    if part.kind == "state":
        atoms = _state_atoms(f, part.symbol, part.state)
        return float(atoms) * element(part.symbol).atomic_weight / float(molar_mass(f))
    try:
        return mass_fraction(f, part.text)
    except CellchemError as exc:
        raise _NotCounted(str(exc)) from None


@dataclass(frozen=True)
class Share:
    """One line's share of a part of concern."""

    line: StoreLine
    substance_g: float  # grams of the line's substance (the solute, for a solution)
    fraction: float  # mass fraction of the part in the line's formula
    mass_g: float  # grams of the part


@dataclass(frozen=True)
class Concern:
    """The mass of one element or ion of concern on site.

    Attributes:
        part: as asked (``'Hg'``, ``'Cr(VI)'``, ``'CN'``).
        mass_g: the sum of the shares, in grams.
        shares: each contributing line and its share.
        unweighed: (line, reason) for lines that hold the part (or may: an
            unidentified line) but could not be weighed; left out of ``mass_g``.
        not_counted: (line, reason) for lines whose formula holds the part's
            elements otherwise (in another ion, or with an oxidation state not
            read); left out of ``mass_g``.
    """

    part: str
    mass_g: float
    shares: tuple[Share, ...]
    unweighed: tuple[tuple[StoreLine, str], ...]
    not_counted: tuple[tuple[StoreLine, str], ...]


def concern(lines: Iterable[StoreLine], parts: Iterable[str] = DEFAULT_CONCERN) -> list[Concern]:
    """Per element or ion of concern, the mass on site: the sum over lines of the
    substance's mass times the part's mass fraction in the line's formula.

    Raises:
        CellchemError: a part that is not an element, an element with an
            oxidation state or an ion.

    >>> [c] = concern([StoreLine("a", "", 2, formula="HgCl2", quantity="100 g")], ["Hg"])
    >>> round(c.mass_g, 2)
    73.89
    """
    lines = list(lines)
    wanted = [_read_part(p) for p in parts]
    out: list[Concern] = []
    for part in wanted:
        shares: list[Share] = []
        unweighed: list[tuple[StoreLine, str]] = []
        not_counted: list[tuple[StoreLine, str]] = []
        for line in lines:
            ident = _identify(line)
            if ident.formula is None:
                unweighed.append((line, f"substance not identified: {ident.reason}"))
                continue
            f = ident.formula
            try:
                fraction = _part_fraction(f, part)
            except _NotCounted as exc:
                not_counted.append((line, str(exc)))
                continue
            except (_NotWeighed, CellchemError) as exc:
                unweighed.append((line, str(exc)))
                continue
            if fraction == 0.0:
                continue
            try:
                grams = _substance_grams(line, f)
            except _NotWeighed as exc:
                unweighed.append((line, str(exc)))
                continue
            shares.append(Share(line, grams, fraction, grams * fraction))
        out.append(
            Concern(
                part.text,
                sum((s.mass_g for s in shares), 0.0),
                tuple(shares),
                tuple(unweighed),
                tuple(not_counted),
            )
        )
    return out


# ---------------------------------------------------------------------------
# Segregation
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Family:
    """A segregation family of a line, and what placed the line in it."""

    name: str
    reasons: tuple[str, ...]


@dataclass(frozen=True)
class _Rules:
    ions: dict[tuple, tuple[tuple[str, str], ...]]
    formulas: dict[tuple, tuple[tuple[str, str], ...]]
    elements: dict[str, tuple[tuple[str, str], ...]]
    behaviours: dict[str, tuple[tuple[str, str], ...]]
    hazards: dict[str, tuple[tuple[str, str], ...]]
    acid_hazards: dict[str, tuple[tuple[str, str], ...]]
    order: tuple[str, ...]


@cache
def _rules() -> _Rules:
    tables: dict[str, dict] = {
        k: {} for k in ("ion", "formula", "element", "behaviour", "hazard", "acid hazard")
    }
    order: list[str] = []
    for row in read_table("segregation_families.csv"):
        kind, match, family, note = row["match_kind"], row["match"], row["family"], row["note"]
        if family not in order:
            order.append(family)
        if kind == "ion":
            key: object = (counts_key(parse_formula(match).counts), int(row["charge"]))
        elif kind == "formula":
            key = counts_key(parse_formula(match).counts)
        elif kind in ("hazard", "acid hazard"):
            key = match.upper()
        elif kind in ("element", "behaviour"):
            key = match
        else:
            raise ValueError(f"segregation_families.csv: unknown match_kind {kind!r}")
        tables[kind].setdefault(key, []).append((family, note))
    frozen = {kind: {k: tuple(v) for k, v in table.items()} for kind, table in tables.items()}
    return _Rules(
        frozen["ion"],
        frozen["formula"],
        frozen["element"],
        frozen["behaviour"],
        frozen["hazard"],
        frozen["acid hazard"],
        tuple(order),
    )


@cache
def _pairs() -> tuple[tuple[str, str, str, str], ...]:
    known = set(_rules().order)
    pairs = []
    for row in read_table("segregation.csv"):
        a, b = row["family_a"], row["family_b"]
        for family in (a, b):
            if family not in known:
                raise ValueError(f"segregation.csv: family {family!r} is not in segregation_families.csv")
        pairs.append((a, b, row["caution"], row["source"]))
    return tuple(pairs)


# Families of oxidising salts as solids, not given to their solutions (see the module text)
_SOLID_OXIDISER_FAMILIES = frozenset({"oxidiser", "chlorate or permanganate"})

_H_CODE = re.compile(r"(?<![A-Za-z0-9])(EUH\s?\d{3}|H\s?\d{3})(?!\d)", re.IGNORECASE)


def hazard_codes(text: str | None) -> tuple[str, ...]:
    """The H and EUH statement codes in a hazard cell, in order, each once.

    >>> hazard_codes("H290, H314; H302+H332 EUH071")
    ('H290', 'H314', 'H302', 'H332', 'EUH071')
    """
    if not isinstance(text, str):
        return ()
    codes = [m.group(1).upper().replace(" ", "") for m in _H_CODE.finditer(text)]
    return tuple(dict.fromkeys(codes))


def families(line: StoreLine) -> tuple[Family, ...]:
    """The segregation families of a line, from its formula (ions, formula, behaviour
    in water) and its H statements; empty when none is known.

    >>> [f.name for f in families(StoreLine("a", "", 2, formula="NaCN"))]
    ['cyanide']
    """
    return _families(line)


@lru_cache(maxsize=65536)
def _families(line: StoreLine) -> tuple[Family, ...]:
    rules = _rules()
    found: dict[str, list[str]] = {}

    def add(hits) -> None:
        for family, note in hits:
            reasons = found.setdefault(family, [])
            if note not in reasons:
                reasons.append(note)

    codes = hazard_codes(line.hazards)
    f = _identify(line).formula
    if f is not None:
        plain = f.anhydrous()
        add(rules.formulas.get(counts_key(plain.counts), ()))
        try:
            balance = charge_balance(plain)
        except CellchemError:
            balance = None
        if balance is not None and balance.kind == "element" and len(plain.counts) == 1:
            add(rules.elements.get(next(iter(plain.counts)), ()))
        if balance is not None and balance.kind == IONIC:
            ions = [s.ion for s in balance.charges if s.ion is not None]
            cations = [ion for ion in ions if ion.charge > 0]
            only_h = bool(cations) and all(dict(ion.formula.counts) == {"H": 1} for ion in cations)
            hydroxide = any(ion.text == "OH" and ion.charge == -1 for ion in ions)
            solution = _line_strength(line) is not None
            if not only_h:  # an acid (or a carbon compound read as H+ ions) is placed by its formula rows
                for ion in ions:
                    hits = rules.ions.get((ion.key, ion.charge), ())
                    if ion.text == "NH4" and hydroxide:
                        hits = tuple(h for h in hits if h[0] != "ammonium salt")  # NH4OH: ammonia solution
                    if solution:  # an oxidising salt's solution: by its H statements only
                        hits = tuple(h for h in hits if h[0] not in _SOLID_OXIDISER_FAMILIES)
                    add(hits)
            if only_h:
                for code in codes:
                    add(rules.acid_hazards.get(code, ()))
        try:
            behaviour = ions_of(plain).behaviour
        except CellchemError:
            behaviour = ""
        add(rules.behaviours.get(behaviour, ()))
    for code in codes:
        add(rules.hazards.get(code, ()))
    return tuple(Family(name, tuple(found[name])) for name in rules.order if name in found)


@dataclass(frozen=True)
class Conflict:
    """Two incompatible families at one location.

    Attributes:
        location: the location as the first of its lines writes it.
        family_a, family_b: the two families (as in ``data/segregation.csv``).
        lines_a, lines_b: the lines of each family there.
        caution: what happens when they meet.
        source: where the pair comes from.
    """

    location: str
    family_a: str
    family_b: str
    lines_a: tuple[StoreLine, ...]
    lines_b: tuple[StoreLine, ...]
    caution: str
    source: str


def segregation(lines: Iterable[StoreLine]) -> list[Conflict]:
    """Incompatible families that share a location (see ``SEGREGATION_CAUTION``).

    >>> acid = StoreLine("a", "", 2, formula="HCl", quantity="1 L", location="Shelf 3")
    >>> salt = StoreLine("a", "", 3, formula="KCN", quantity="100 g", location="shelf 3")
    >>> [(c.family_a, c.family_b) for c in segregation([acid, salt])]
    [('acid', 'cyanide')]
    """
    places: dict[str, list[StoreLine]] = {}
    for line in lines:
        place = fold_location(line.location)
        if place:
            places.setdefault(place, []).append(line)
    out: list[Conflict] = []
    for members in places.values():
        by_family: dict[str, list[StoreLine]] = {}
        for line in members:
            for family in _families(line):
                by_family.setdefault(family.name, []).append(line)
        for a, b, caution, source in _pairs():
            la, lb = by_family.get(a, []), by_family.get(b, [])
            if any(x is not y and x != y for x in la for y in lb):
                out.append(Conflict(_text(members[0].location), a, b, tuple(la), tuple(lb), caution, source))
    return out


def unchecked(lines: Iterable[StoreLine]) -> list[tuple[StoreLine, str]]:
    """The lines ``segregation`` could not fully check, with the reason: no location,
    or a substance not identified (placed by its H statements only, if any)."""
    out: list[tuple[StoreLine, str]] = []
    for line in lines:
        if not fold_location(line.location):
            out.append((line, "no location: not compared with any other line"))
            continue
        ident = _identify(line)
        if ident.formula is None:
            how = "placed by its H statements only" if hazard_codes(line.hazards) else "no family known"
            out.append((line, f"substance not identified ({ident.reason}); {how}"))
    return out
