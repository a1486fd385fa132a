"""Pack sizes as suppliers print them, their mass, and the densities of the
usual concentrated reagents.

``read_pack`` reads a pack text (``'500 g'``, ``'2,5 kg'``, ``'6 x 500 g'``,
``'2 × 2.5 L'``, ``'25 tablets'``) into a ``Pack``: how many containers, the
amount in each, its unit and its kind (mass, volume or a count of items), with
``total`` in grams, millilitres or items. Units are converted by pint through
``cellchem.units``; the spellings stores use that pint reads differently
(``ML`` and ``MG``, which pint reads as mega-units) are read here first.

Refused rather than guessed (CellchemError, one line quoting the text):

- a number with no unit (``'500'``) and a container with no amount
  (``'1 bottle'``): neither fixes a quantity;
- a range (``'1-5 kg'``), a bound (``'> 500 g'``) and an approximate amount
  (``'approx. 500 g'``, ``'ca. 1 L'``, ``'~500 g'``): the label disclaims the
  figure, so cellchem does not add it to a total; write the nominal amount if
  that is what the pack holds;
- zero or negative amounts and counts, and a count that is not a whole number;
- a separator followed by exactly three digits (``'1,000 g'``, ``'2.500 kg'``):
  a thousands separator in one country and a decimal separator in another;
- units that differ between US and imperial measure (gallon, quart, pint,
  fluid ounce, ton) and ``gr`` (grain, or a gram in several languages).

A count unit is one of a short list (tablets, ampoules, vials, capsules,
sachets, pieces): the pack is a number of items, never a mass or a volume.
A container word may follow an amount (``'2.5 L bottle'``); it adds nothing.

``pack_mass`` gives a pack's mass in grams: a mass pack as it is, a volume
pack only with a density (given, or from ``data/densities.csv`` for a
concentrated reagent at a strength the table lists), a count never.

``density_of(formula, percent)`` answers a density from the table for an exact
strength (% w/w) only, or None: it never interpolates between strengths.
"""

from __future__ import annotations

import math
import re
import unicodedata
from dataclasses import dataclass
from functools import cache, lru_cache

from .errors import CellchemError
from .formula import Formula
from .ions import counts_key
from .reading import as_formula, parse_formula
from .tables import read_table
from .units import MASS, MASS_PER_VOLUME, VOLUME, read_quantity, read_unit

MASS_KIND = "mass"
VOLUME_KIND = "volume"
COUNT_KIND = "count"

MAX_PACK_TEXT = 100  # characters; a pack size is a few words

# Count units (common practice: supplier catalogues of tablets, ampoule concentrates and
# vials): spelling, folded -> the unit as cellchem writes it.
COUNT_UNITS: dict[str, str] = {
    "tablet": "tablets",
    "tablets": "tablets",
    "tab": "tablets",
    "tabs": "tablets",
    "ampoule": "ampoules",
    "ampoules": "ampoules",
    "ampule": "ampoules",
    "ampules": "ampoules",
    "vial": "vials",
    "vials": "vials",
    "capsule": "capsules",
    "capsules": "capsules",
    "sachet": "sachets",
    "sachets": "sachets",
    "piece": "pieces",
    "pieces": "pieces",
    "pcs": "pieces",
    "stück": "pieces",
    "stk": "pieces",
}

# Container words (common practice): they say what the amount is packed in, never how much.
CONTAINER_WORDS = frozenset(
    "bottle bottles can cans tin tins jar jars drum drums bag bags box boxes pack packs packet packets"
    " pail pails carboy carboys canister canisters container containers flask flasks tube tubes"
    " flasche flaschen dose dosen kanister sack".split()
)

# Store spellings of mass and volume units, folded (case ignored) -> the expression pint reads.
# Only spellings whose case pint would read otherwise ('ML' is a megalitre to pint, 'MG' a
# megagram) or that pint does not know ('ltr', 'gms'); pint converts every one of them.
_SPELLINGS: dict[str, str] = {
    "g": "g",
    "gm": "g",
    "gms": "g",
    "grams": "g",
    "gramm": "g",
    "kg": "kg",
    "kgs": "kg",
    "mg": "mg",
    "ug": "ug",
    "mcg": "ug",
    "l": "L",
    "ltr": "L",
    "ltrs": "L",
    "lt": "L",
    "ml": "mL",
    "cl": "cL",
    "dl": "dL",
    "ul": "uL",
    "cc": "cm**3",
    "lb": "lb",
    "lbs": "lb",
    "oz": "oz",
}

# Units refused because they name two different amounts (common practice).
_AMBIGUOUS: dict[str, str] = {
    "gal": "differs between the US gallon (3.785 L) and the imperial gallon (4.546 L)",
    "gallon": "differs between the US gallon (3.785 L) and the imperial gallon (4.546 L)",
    "gallons": "differs between the US gallon (3.785 L) and the imperial gallon (4.546 L)",
    "qt": "differs between US and imperial measure",
    "quart": "differs between US and imperial measure",
    "quarts": "differs between US and imperial measure",
    "pt": "differs between US and imperial measure",
    "pint": "differs between US and imperial measure",
    "pints": "differs between US and imperial measure",
    "fl oz": "differs between US and imperial measure",
    "floz": "differs between US and imperial measure",
    "ton": "differs between the short, long and metric ton",
    "tons": "differs between the short, long and metric ton",
    "gr": "is a grain (64.8 mg) in English and a gram in several other languages",
}

_APPROXIMATE = re.compile(
    r"^(?:approx\.?|approximately|ca\.?|circa|c\.|about|around|~|≈|±|etwa|zirka|rund)\s*", re.IGNORECASE
)
_BOUND = re.compile(r"^(?:<|>|≤|≥|<=|>=|min\.?|max\.?|minimum|maximum|up to|at least)\s*", re.IGNORECASE)
_NUMBER = r"(?:\d+(?:[.,]\d+)?|[.,]\d+)"
_RANGE = re.compile(rf"^{_NUMBER}\s*[a-zA-Zµ]*\s*(?:-|–|—|to|bis)\s*{_NUMBER}")
_MULTIPLIED = re.compile(rf"^(?P<count>{_NUMBER})\s*[x×*]\s*(?P<rest>.*)$", re.IGNORECASE)
_AMOUNT = re.compile(rf"^(?P<number>[+-]?{_NUMBER})\s*(?P<unit>.*)$")
_THOUSANDS = re.compile(r"^[+-]?[1-9]\d{0,2}[.,]\d{3}$")


@dataclass(frozen=True)
class Pack:
    """A pack size as read by ``read_pack``.

    Attributes:
        count: how many containers the text names (6 for ``'6 x 500 g'``, else 1).
        amount: the amount in each container, in ``unit``.
        unit: the unit as cellchem writes it (``'g'``, ``'kg'``, ``'mL'``,
            ``'L'``, ``'lb'``, ``'tablets'``).
        kind: ``'mass'``, ``'volume'`` or ``'count'``.
        text: the text as given.
    """

    count: int
    amount: float
    unit: str
    kind: str
    text: str

    @property
    def total(self) -> float:
        """Grams for a mass pack, millilitres for a volume pack, items for a count."""
        return self.count * self.amount * _factor(self.unit, self.kind)

    @property
    def total_unit(self) -> str:
        return {MASS_KIND: "g", VOLUME_KIND: "mL", COUNT_KIND: "items"}[self.kind]


@lru_cache(maxsize=256)
def _factor(unit: str, kind: str) -> float:
    """Grams per unit (mass), millilitres per unit (volume), 1 (count)."""
    if kind == COUNT_KIND:
        return 1.0
    reading = read_unit(unit)
    return reading.factor if kind == MASS_KIND else reading.factor * 1000.0


def _fold(text: str) -> str:
    s = unicodedata.normalize("NFKC", text).replace("μ", "µ").replace("µ", "u")
    return " ".join(s.replace("−", "-").split())


def _number(text: str, whole: str, what: str) -> float:
    if _THOUSANDS.match(text):
        plain = text.replace(",", "").replace(".", "")
        as_decimal = text.replace(",", ".")
        raise CellchemError(
            f"pack {whole!r}: {text!r} may be {plain} (a thousands separator) or {as_decimal} (a decimal"
            f" separator); write the {what} without a thousands separator, such as {plain} or {as_decimal}"
        )
    return float(text.replace(",", "."))


def _unit_reading(word: str, whole: str) -> tuple[str, str]:
    """The unit as cellchem writes it and its kind, for the unit word of a pack text."""
    folded = word.lower()
    key = folded.rstrip(".")
    why = _AMBIGUOUS.get(folded) or _AMBIGUOUS.get(key)
    if why:
        raise CellchemError(f"pack {whole!r}: the unit {word!r} {why}; give the amount in g, kg, mL or L")
    if key in COUNT_UNITS:
        return COUNT_UNITS[key], COUNT_KIND
    if key in CONTAINER_WORDS:
        raise CellchemError(
            f"pack {whole!r}: {word!r} names a container, not its contents; give the amount it holds,"
            " such as '500 g' or '1 L'"
        )
    expression = _SPELLINGS.get(key, key)  # pint's unit names are lower case ('litre', 'kilogram')
    try:
        reading = read_unit(expression)
    except CellchemError:
        raise CellchemError(
            f"pack {whole!r}: {word!r} is not a unit of mass or volume cellchem reads; expected for example"
            " 'g', 'kg', 'mL', 'L' or a count such as 'tablets'"
        ) from None
    if reading.kind == MASS:
        return expression, MASS_KIND
    if reading.kind == VOLUME:
        return expression, VOLUME_KIND
    raise CellchemError(
        f"pack {whole!r}: {word!r} is a unit of {reading.kind}, not of mass or volume; give the pack size"
        " such as '500 g' or '1 L'"
    )


def read_pack(text: str) -> Pack:
    """Read a pack size.

    Args:
        text: ``'500 g'``, ``'2.5 kg'``, ``'2,5 kg'``, ``'500g'``, ``'6 x 500 g'``,
            ``'6x1L'``, ``'2 × 2.5 L'``, ``'100 mL'``, ``'1 l'``, ``'1 lb'``,
            ``'25 tablets'``, ``'10 ampoules'``, ``'2.5 L bottle'``.

    Returns:
        A Pack; ``total`` is in grams, millilitres or items.

    Raises:
        CellchemError: the text does not fix a quantity (see the module text).

    >>> read_pack("6 x 500 g").total
    3000.0
    >>> p = read_pack("2,5 L")
    >>> p.amount, p.unit, p.kind, p.total
    (2.5, 'L', 'volume', 2500.0)
    >>> read_pack("500")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.CellchemError: pack '500' has no unit; ...
    """
    if isinstance(text, bool) or isinstance(text, int | float):
        raise CellchemError(
            f"pack {text!r} has no unit; give the amount with its unit, such as '500 g' or '1 L'"
        )
    if not isinstance(text, str) or not text.strip():
        raise CellchemError(f"no pack size given (read {text!r}); expected for example '500 g' or '6 x 1 L'")
    if len(text) > MAX_PACK_TEXT:
        raise CellchemError(
            f"pack {text[:40]!r}... is {len(text)} characters long; a pack size is at most {MAX_PACK_TEXT}"
        )
    return _read_pack(text)


@lru_cache(maxsize=4096)
def _read_pack(text: str) -> Pack:
    s = _fold(text)
    if _APPROXIMATE.match(s):
        raise CellchemError(
            f"pack {text!r} is approximate; cellchem adds only stated amounts: write the nominal amount"
            " (such as '500 g') if that is what the pack holds"
        )
    if _BOUND.match(s):
        raise CellchemError(f"pack {text!r} is a bound, not an amount; give the amount the pack holds")
    count = 1
    m = _MULTIPLIED.match(s)
    if m:
        rest = m.group("rest")
        value = _number(m.group("count"), text, "count")
        if value != int(value) or value < 1:
            raise CellchemError(
                f"pack {text!r}: the number of containers {m.group('count')!r} is not a whole number of 1"
                " or more"
            )
        if _MULTIPLIED.match(rest):
            raise CellchemError(
                f"pack {text!r} multiplies more than once; write it as one count, such as '6 x 500 g'"
            )
        count, s = int(value), rest
    if _RANGE.match(s):
        raise CellchemError(f"pack {text!r} is a range, not an amount; give the amount one pack holds")
    m = _AMOUNT.match(s)
    if not m:
        raise CellchemError(
            f"pack {text!r} does not start with an amount; expected for example '500 g', '2.5 L' or '6 x 1 L'"
        )
    number_text, words = m.group("number"), m.group("unit").strip()
    amount = _number(number_text.lstrip("+-"), text, "amount")
    if number_text.startswith("-"):
        amount = -amount
    if not words:
        raise CellchemError(
            f"pack {text!r} has no unit; give the amount with its unit, such as '500 g' or '1 L'"
        )
    unit_word, _, trailing = words.partition(" ")
    if unit_word.lower().rstrip(".") == "fl" and trailing.lower().startswith("oz"):
        unit_word, trailing = "fl oz", trailing[2:].strip(" .")
    trailing = trailing.strip()
    if trailing and trailing.lower().rstrip(".") not in CONTAINER_WORDS:
        raise CellchemError(
            f"pack {text!r}: cellchem reads an amount and its unit, optionally followed by a container word"
            f" ('2.5 L bottle'), not {trailing!r}"
        )
    unit, kind = _unit_reading(unit_word, text)
    if not math.isfinite(amount) or amount <= 0:
        raise CellchemError(f"pack {text!r}: the amount is not above 0")
    if kind == COUNT_KIND and amount != int(amount):
        raise CellchemError(f"pack {text!r}: a number of {unit} is a whole number")
    return Pack(count, amount, unit, kind, text)


# ---------------------------------------------------------------------------
# Densities of concentrated reagents
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class DensityRow:
    """One row of ``data/densities.csv``: a reagent at one strength."""

    formula: str
    percent: float
    density: float
    temperature: float
    source: str

    @property
    def text(self) -> str:
        return (
            f"{self.density:g} g/mL for {self.percent:g} % w/w {self.formula} at {self.temperature:g} °C,"
            f" from cellchem's density table (source: {self.source})"
        )


def _reagent_key(f: Formula) -> tuple:
    """Inorganic reagents are matched by their element counts (HCl, H2SO4); a carbon compound
    only by its canonical text (CH3COOH, not C2H4O2, which is also methyl formate)."""
    if "C" in f.counts:
        return ("text", f.text())
    return ("counts", counts_key(f.counts))


@cache
def _density_table() -> dict[tuple, tuple[DensityRow, ...]]:
    table: dict[tuple, list[DensityRow]] = {}
    for row in read_table("densities.csv"):
        f = parse_formula(row["formula"])
        entry = DensityRow(
            f.text(),
            float(row["strength_percent_w_w"]),
            float(row["density_g_per_mL"]),
            float(row["temperature_c"]),
            row["source"],
        )
        table.setdefault(_reagent_key(f), []).append(entry)
    return {key: tuple(sorted(rows, key=lambda r: r.percent)) for key, rows in table.items()}


def _rows_for(formula: str | Formula) -> tuple[DensityRow, ...]:
    try:
        f = as_formula(formula)
    except CellchemError:
        return ()
    if f.charge or f.water or f.has_unknown_count:
        return ()
    return _density_table().get(_reagent_key(f), ())


def listed_strengths(formula: str | Formula) -> tuple[float, ...]:
    """The strengths (% w/w) the density table lists for a reagent; empty when it lists none.

    >>> listed_strengths("HNO3")
    (65.0, 68.0, 70.0)
    """
    return tuple(r.percent for r in _rows_for(formula))


def density_row(formula: str | Formula, percent: float) -> DensityRow | None:
    """The density table's row for a reagent at exactly this strength (% w/w), or None."""
    if isinstance(percent, bool) or not isinstance(percent, int | float) or not math.isfinite(percent):
        return None
    for row in _rows_for(formula):
        if abs(row.percent - percent) < 1e-9:
            return row
    return None


def density_of(formula: str | Formula, percent: float) -> float | None:
    """The density (g/mL, 20 °C) of a concentrated reagent at a strength (% w/w) the
    table lists, or None: no interpolation between the listed strengths.

    >>> density_of("H2SO4", 96)
    1.836
    >>> density_of("HCl", 33) is None
    True
    """
    row = density_row(formula, percent)
    return row.density if row else None


def _strengths_text(strengths: tuple[float, ...]) -> str:
    return ", ".join(f"{s:g}" for s in strengths) + " % w/w"


# Liquids held by volume run from about 0.6 g/mL (pentane) to mercury, 13.53 g/mL at 20 °C
# (CRC Handbook, from memory).
_LIQUID_DENSITY = (0.5, 13.6)


def read_density(density: float | str) -> float:
    """A liquid's density in g/mL from a number (g/mL) or text (``'1.18 g/mL'``, ``'1180 kg/m3'``)."""
    if isinstance(density, bool):
        raise CellchemError(f"density: expected a number in g/mL, read {density!r}")
    if isinstance(density, str):
        number, reading = read_quantity(density, "g/mL", "density")
        if reading.kind != MASS_PER_VOLUME:
            raise CellchemError(f"density: expected a mass per volume such as '1.18 g/mL', read {density!r}")
        value = number * reading.factor / 1000.0  # g/L -> g/mL
    elif isinstance(density, int | float):
        value = float(density)
    else:
        raise CellchemError(f"density: expected a number in g/mL, read {density!r}")
    low, high = _LIQUID_DENSITY
    if not math.isfinite(value) or not (low <= value <= high):
        raise CellchemError(
            f"density: {density!r} g/mL is outside {low:g}-{high:g} g/mL, the range of liquids held by volume"
        )
    return value


def read_strength_percent(strength: float | str) -> float:
    """A strength in % w/w from a number (37) or text (``'37 %'``, ``'37 % w/w'``)."""
    if isinstance(strength, bool):
        raise CellchemError(f"strength: expected a per cent w/w such as 37 or '37 %', read {strength!r}")
    if isinstance(strength, int | float):
        value = float(strength)
    elif isinstance(strength, str):
        m = re.match(r"^\s*(\d+(?:[.,]\d+)?)\s*(%|%\s*\(?\s*(?:w/w|m/m)\s*\)?|wt\s*\.?\s*%)?\s*$", strength)
        if not m:
            raise CellchemError(
                f"strength: could not read {strength!r} as a per cent w/w; expected for example '37 %' or"
                " '96 % w/w'"
            )
        value = float(m.group(1).replace(",", "."))
    else:
        raise CellchemError(f"strength: expected a per cent w/w such as 37 or '37 %', read {strength!r}")
    if not math.isfinite(value) or not (0 < value <= 100):
        raise CellchemError(f"strength: {strength!r} is not a per cent above 0 and up to 100")
    return value


def pack_mass(
    pack: Pack | str,
    formula: str | Formula | None = None,
    density: float | str | None = None,
    strength: float | str | None = None,
) -> float:
    """The mass in grams of what a pack holds.

    Args:
        pack: a Pack or a pack text.
        formula: the reagent, to find its density in the table (with ``strength``).
        density: the liquid's density in g/mL (number or text); always wins
            over the table.
        strength: the reagent's strength in % w/w (37 or ``'37 %'``), to find
            its density in the table.

    Raises:
        CellchemError: a count of items, or a volume with no density given
            and none in the table for this reagent and strength.

    >>> pack_mass("6 x 500 g")
    3000.0
    >>> round(pack_mass("2.5 L", "H2SO4", strength=96), 1)
    4590.0
    """
    p = pack if isinstance(pack, Pack) else read_pack(pack)
    if p.kind == MASS_KIND:
        return p.total
    if p.kind == COUNT_KIND:
        raise CellchemError(
            f"pack {p.text!r} counts {p.unit}, which have no mass here; give the pack as a mass (such as"
            " '25 g') to weigh it"
        )
    if density is not None:
        return p.total * read_density(density)
    if formula is not None and strength is not None:
        percent = read_strength_percent(strength)
        row = density_row(formula, percent)
        if row is not None:
            return p.total * row.density
        listed = listed_strengths(formula)
        shown = formula.text() if isinstance(formula, Formula) else formula
        if listed:
            raise CellchemError(
                f"pack {p.text!r} of {shown} at {percent:g} % w/w needs a density: the density table lists"
                f" {shown} at {_strengths_text(listed)} only; pass density=... (g/mL)"
            )
        raise CellchemError(
            f"pack {p.text!r} of {shown} needs a density: the density table does not list {shown}; pass"
            " density=... (g/mL)"
        )
    raise CellchemError(
        f"pack {p.text!r} is a volume and needs a density to be weighed: pass density=... (g/mL), or the"
        " formula and strength (% w/w) of a reagent the density table lists"
    )
