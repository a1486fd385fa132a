"""Unit strings for solution work, read through pint.

Solution functions take a number with a unit keyword (``unit="mmol/L"``) or a
string holding both (``"250 mL"``, ``"0.1 M"``). This module turns a unit
string into its kind (amount concentration, molality, mass concentration,
equivalent concentration, mass fraction, volume, mass, amount) and the factor
to cellchem's base unit of that kind:

========================  ==========  ==========================================
kind                      base        examples
========================  ==========  ==========================================
``amount/volume``         mol/L       ``M``, ``mM``, ``mol/dm3``, ``mmol/L``
``amount/mass``           mol/kg      ``mol/kg``, ``mmol/kg``, ``molal``
``mass/volume``           g/L         ``g/L``, ``mg/L``, ``% w/v``, ``ppm``, ``ppb``
``equivalents/volume``    eq/L        ``eq/L``, ``meq/L``, ``mEq/L``
``mass fraction``         1           ``% w/w``, ``wt%``, ``mg/kg``
``volume``                L           ``L``, ``mL``, ``dm3``, ``cm3``, ``uL``
``mass``                  g           ``g``, ``mg``, ``kg``
``amount``                mol         ``mol``, ``mmol``
========================  ==========  ==========================================

pint reads the unit algebra; a short table of the words stores use that pint
does not know (``% w/v``, ``ppm``, ``molal``) comes first. A unit string is read
once and remembered, so a worksheet recalculating a column pays the cost of
pint only for the first cell of each unit (measured: about 130 microseconds a
conversion through pint, one dictionary look-up once remembered).

Refused rather than guessed: ``N`` (normality depends on the reaction),
``% v/v`` (needs the volumes of the liquids), a bare ``%`` and ``ppt``
(parts per thousand or per trillion), ``m`` for molal (pint reads metre).
"""

from __future__ import annotations

import math
import re
import unicodedata
from dataclasses import dataclass
from functools import cache, lru_cache

from .errors import CellchemError

AMOUNT_PER_VOLUME = "amount/volume"
AMOUNT_PER_MASS = "amount/mass"
MASS_PER_VOLUME = "mass/volume"
EQUIVALENTS_PER_VOLUME = "equivalents/volume"
MASS_FRACTION = "mass fraction"
VOLUME = "volume"
MASS = "mass"
AMOUNT = "amount"

BASE_UNITS = {
    AMOUNT_PER_VOLUME: "mol/L",
    AMOUNT_PER_MASS: "mol/kg",
    MASS_PER_VOLUME: "g/L",
    EQUIVALENTS_PER_VOLUME: "eq/L",
    MASS_FRACTION: "mass fraction",
    VOLUME: "L",
    MASS: "g",
    AMOUNT: "mol",
}

CONCENTRATION_KINDS = (
    AMOUNT_PER_VOLUME,
    AMOUNT_PER_MASS,
    MASS_PER_VOLUME,
    EQUIVALENTS_PER_VOLUME,
    MASS_FRACTION,
)

PPM_NOTE = (
    "ppm read as mg/L (mass of solute per volume of solution); this equals mg/kg only for dilute"
    " aqueous solutions with a density close to 1 g/mL"
)
PPB_NOTE = (
    "ppb read as ug/L (mass of solute per volume of solution); this equals ug/kg only for dilute"
    " aqueous solutions with a density close to 1 g/mL"
)


@dataclass(frozen=True)
class UnitReading:
    """What a unit string means.

    Attributes:
        text: the string as given.
        kind: one of the kinds in the module table.
        factor: the value in the base unit of the kind for 1 of this unit
            (``mmol/L`` gives 0.001: 1 mmol/L is 0.001 mol/L).
        note: an assumption the reading makes (ppm as mg/L), or ``""``.
    """

    text: str
    kind: str
    factor: float
    note: str = ""

    @property
    def base(self) -> str:
        return BASE_UNITS[self.kind]


# words pint does not know, or knows with another meaning, read before pint:
# normalised spelling -> (pint expression, forced kind or None, note)
_WORDS: dict[str, tuple[str, str | None, str]] = {
    "molar": ("mol/L", None, ""),
    "molal": ("mol/kg", None, ""),
    "%w/v": ("g/(100 mL)", None, ""),
    "%(w/v)": ("g/(100 mL)", None, ""),
    "w/v%": ("g/(100 mL)", None, ""),
    "%m/v": ("g/(100 mL)", None, ""),
    "g/100ml": ("g/(100 mL)", None, ""),
    "g%": ("g/(100 mL)", None, ""),
    "ppm": ("mg/L", None, PPM_NOTE),
    "ppmw/v": ("mg/L", None, PPM_NOTE),
    "ppb": ("ug/L", None, PPB_NOTE),
    "%w/w": ("percent", MASS_FRACTION, ""),
    "%(w/w)": ("percent", MASS_FRACTION, ""),
    "w/w%": ("percent", MASS_FRACTION, ""),
    "%m/m": ("percent", MASS_FRACTION, ""),
    "wt%": ("percent", MASS_FRACTION, ""),
    "wt.%": ("percent", MASS_FRACTION, ""),
    "%wt": ("percent", MASS_FRACTION, ""),
    "mass%": ("percent", MASS_FRACTION, ""),
    "ppmw/w": ("ppm", MASS_FRACTION, ""),
    "massfraction": ("dimensionless", MASS_FRACTION, ""),
}

_REFUSED: dict[str, str] = {
    "n": "normality (N) depends on the reaction the solution is for (acid-base or redox);"
    " give mol/L, or eq/L for charge equivalents",
    "normal": "normality depends on the reaction the solution is for (acid-base or redox);"
    " give mol/L, or eq/L for charge equivalents",
    "m": "'m' alone reads as metre; write 'mol/kg' or 'molal' for molality, 'M' or 'mol/L' for molarity",
    "%": "'%' alone does not say of what; write '% w/v' (g per 100 mL) or '% w/w' (g per 100 g,"
    " needs the solution's density)",
    "%v/v": "'% v/v' needs the volumes of the liquids mixed, which cellchem does not model;"
    " give the concentration as mol/L, g/L or % w/w with a density",
    "ppt": "'ppt' may mean parts per thousand or per trillion; write g/L, mg/L or ng/L",
    "ppmv": "'ppmv' is a gas-phase unit; give a concentration in solution",
}

_SUPERSCRIPTS = str.maketrans("⁰¹²³⁴⁵⁶⁷⁸⁹⁻⁺", "0123456789-+")


def _normalise(text: str) -> str:
    s = unicodedata.normalize("NFKC", text).translate(_SUPERSCRIPTS)
    s = s.replace("µ", "u").replace("μ", "u").replace("·", "*").replace("⋅", "*").replace("×", "*")
    s = s.replace("−", "-").replace("–", "-")
    s = " ".join(s.split())
    return s


def _word_key(s: str) -> str:
    return s.replace(" ", "").lower()


# 'dm3', 'cm-3', 'L-1' written without '**' or '^': pint needs the operator
_EXPONENT = re.compile(r"(?<=[A-Za-z])(-?[0-9])(?![0-9.])")
_CASED = {"mm": "mM", "um": "uM", "nm": "nM"}  # molar prefixes: 'mm' would read as millimetre


@cache
def _registry():
    try:
        import pint
    except ImportError as exc:  # pragma: no cover - pint is a dependency
        raise CellchemError("unit strings need the 'pint' package (pip install pint)") from exc
    ureg = pint.UnitRegistry(cache_folder=None)
    ureg.define("charge_equivalent = [charge_equivalent] = eq = Eq = equiv")
    return ureg


_KIND_OF_DIMENSION = {
    (("[length]", -3), ("[substance]", 1)): AMOUNT_PER_VOLUME,
    (("[mass]", -1), ("[substance]", 1)): AMOUNT_PER_MASS,
    (("[length]", -3), ("[mass]", 1)): MASS_PER_VOLUME,
    (("[charge_equivalent]", 1), ("[length]", -3)): EQUIVALENTS_PER_VOLUME,
    (): MASS_FRACTION,
    (("[length]", 3),): VOLUME,
    (("[mass]", 1),): MASS,
    (("[substance]", 1),): AMOUNT,
}

_TO_BASE = {
    AMOUNT_PER_VOLUME: "mol/L",
    AMOUNT_PER_MASS: "mol/kg",
    MASS_PER_VOLUME: "g/L",
    EQUIVALENTS_PER_VOLUME: "eq/L",
    MASS_FRACTION: "dimensionless",
    VOLUME: "L",
    MASS: "g",
    AMOUNT: "mol",
}


def read_unit(text: str) -> UnitReading:
    """Read a unit string.

    Args:
        text: ``'mmol/L'``, ``'M'``, ``'% w/v'``, ``'mg/L'``, ``'mL'``, ...

    Returns:
        A UnitReading with the kind and the factor to the kind's base unit.

    Raises:
        CellchemError: the string is not a unit cellchem reads, or is ambiguous.

    >>> read_unit("mmol/L").factor
    0.001
    >>> read_unit("% w/v").kind, read_unit("% w/v").factor
    ('mass/volume', 10.0)
    >>> read_unit("N")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.CellchemError: unit 'N': normality (N) depends on the reaction ...
    """
    if not isinstance(text, str) or not text.strip():
        raise CellchemError(f"no unit given (read {text!r}; expected a unit such as 'mol/L', 'g' or 'mL')")
    return _read_unit(text)


@lru_cache(maxsize=1024)
def _read_unit(text: str) -> UnitReading:
    s = _normalise(text)
    if re.match(r"^[+-]?[0-9.]", s):
        raise CellchemError(
            f"unit {text!r} starts with a number; give the number and the unit apart (value 0.1, unit"
            " 'mol/L')"
            " or as one text '0.1 mol/L'"
        )
    key = _word_key(s)
    if s.lower() in _REFUSED or key in _REFUSED:
        if not (s == "M"):
            raise CellchemError(f"unit {text!r}: {_REFUSED.get(s.lower()) or _REFUSED[key]}")
    expression, forced, note = s, None, ""
    if s in ("M", "mM", "uM", "nM"):
        expression = {"M": "mol/L", "mM": "mmol/L", "uM": "umol/L", "nM": "nmol/L"}[s]
    elif s.lower() in _CASED and s not in _CASED.values():
        raise CellchemError(
            f"unit {text!r}: write '{_CASED[s.lower()]}' for {'milli' if s.lower() == 'mm' else 'micro'}molar"
            f" or '{s.lower()[0]}mol/L'; '{s}' could also read as a length"
        )
    elif key in _WORDS:
        expression, forced, note = _WORDS[key]
    else:
        expression = _EXPONENT.sub(r"**\1", s.replace("^", "**"))
    ureg = _registry()
    try:
        quantity = ureg.Quantity(1.0, ureg.dimensionless) if expression == "dimensionless" else None
        if quantity is None:
            quantity = ureg.parse_expression(expression)
            if not hasattr(quantity, "dimensionality"):  # a bare number
                raise CellchemError(f"unit {text!r} is a number, not a unit")
        unit = quantity.units
        dims = tuple(sorted(quantity.dimensionality.items()))
        kind = _KIND_OF_DIMENSION.get(dims)
        if kind is None:
            raise CellchemError(
                f"unit {text!r} is a {unit.dimensionality} unit; expected a concentration, volume, mass"
                " or amount (for example 'mol/L', 'g/L', 'mL', 'g')"
            )
        if kind == MASS_FRACTION and forced is None and not _is_mass_ratio(unit):
            raise CellchemError(
                f"unit {text!r} has no dimension; for a mass fraction write '% w/w' or 'mg/kg'"
            )
        factor = float(f"{quantity.to(_TO_BASE[kind]).magnitude:.15g}")
    except CellchemError:
        raise
    except Exception as exc:  # pint's own errors: undefined unit, syntax
        raise CellchemError(
            f"unit {text!r} is not a unit cellchem reads ({type(exc).__name__}: {exc}); expected for example"
            " 'mol/L', 'mmol/L', 'g/L', 'mg/L', '% w/v', 'ppm', 'meq/L', '% w/w', 'L', 'mL', 'g' or 'mg'"
        ) from None
    if not math.isfinite(factor) or factor <= 0:
        raise CellchemError(f"unit {text!r} gives no usable scale")
    return UnitReading(text, forced or kind, factor, note)


def _is_mass_ratio(unit) -> bool:
    """A dimensionless unit written as mass over mass (mg/kg, g/kg)."""
    return any("gram" in str(name) for name in unit._units)


_NUMBER = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")


def read_quantity(value: float | int | str, unit: str, what: str) -> tuple[float, UnitReading]:
    """A number and its unit from a number plus a unit keyword, or from a string
    holding both (``'250 mL'``, ``'0.1 M'``).

    Args:
        value: a number, or text with a number then a unit.
        unit: the unit to use when ``value`` is a number (or text with no unit).
        what: what the value is, for messages (``'volume'``).

    Returns:
        (number, UnitReading) with the number in the unit read (not converted).

    Raises:
        CellchemError: not a number, not finite, or a unit that does not read.
    """
    if isinstance(value, bool):
        raise CellchemError(f"{what}: expected a number, read {value!r}")
    if isinstance(value, int | float):
        number = float(value)
        reading = read_unit(unit)
    elif isinstance(value, str):
        m = _NUMBER.match(_normalise(value))
        if not m:
            hint = ""
            if re.match(r"^\s*\d+,\d+", value):
                hint = " (write the decimal separator as a point: '0.1', not '0,1')"
            raise CellchemError(
                f"{what}: could not read {value!r} as a number with a unit{hint}; expected for example"
                f" '0.1 mol/L' or '250 mL'"
            )
        number = float(m.group(1))
        reading = read_unit(m.group(2) or unit)
    else:
        raise CellchemError(f"{what}: expected a number or text such as '0.1 mol/L', read {value!r}")
    if not math.isfinite(number):
        raise CellchemError(f"{what}: {value!r} is not a finite number")
    return number, reading


def in_base(
    value: float | int | str, unit: str, what: str, kinds: tuple[str, ...]
) -> tuple[float, UnitReading]:
    """Like read_quantity, converted to the base unit of its kind, which must
    be one of ``kinds``."""
    number, reading = read_quantity(value, unit, what)
    if reading.kind not in kinds:
        wanted = " or ".join(f"{k} (such as '{BASE_UNITS[k]}')" for k in kinds)
        raise CellchemError(f"{what}: unit {reading.text!r} is {reading.kind}; expected {wanted}")
    return number * reading.factor, reading
