"""The elements: symbol, name, atomic number and standard atomic weight.

Data: ``data/elements.csv`` (CIAAW standard atomic weights, edition recorded in
its header). The weight used for molar masses is the CIAAW conventional value
for elements whose standard atomic weight is an interval (H 1.008, C 12.011,
Cl 35.45, ...), because those are what suppliers print; the standard value at
its full stated precision for the others; and for elements with no standard
atomic weight the mass number of the longest-lived isotope, flagged by
``weight_kind == "mass number"`` so that a molar mass using one can say so.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cache

from .errors import CellchemError
from .tables import read_table, split_names, table_header

STANDARD = "standard"
CONVENTIONAL = "conventional"
MASS_NUMBER = "mass number"
NUCLIDE = "nuclide"


@dataclass(frozen=True, slots=True)
class Element:
    """One element of the periodic table.

    Attributes:
        z: atomic number.
        symbol: case-sensitive symbol, e.g. ``"Na"``.
        name: IUPAC name, e.g. ``"aluminium"``.
        variants: other spellings suppliers use, e.g. ``("aluminum",)``.
        group: group 1-18, or None for the lanthanides Ce-Lu and actinides Th-Lr.
        period: period 1-7.
        atomic_weight: the value used for molar masses, g/mol (see module doc).
        uncertainty: stated uncertainty of a single-valued standard atomic weight.
        interval: (low, high) for elements whose standard atomic weight is an interval.
        weight_kind: ``"standard"``, ``"conventional"``, ``"mass number"``, or
            ``"nuclide"`` for the hydrogen isotopes D and T (their atomic mass).
        electronegativity: Pauling electronegativity, or None.
    """

    z: int
    symbol: str
    name: str
    variants: tuple[str, ...]
    group: int | None
    period: int
    atomic_weight: float
    uncertainty: float | None
    interval: tuple[float, float] | None
    weight_kind: str
    electronegativity: float | None

    @property
    def is_metal(self) -> bool:
        """True for the metals (everything left of the B-Si-As-Te-At staircase),
        counting the lanthanides and actinides; hydrogen is not a metal."""
        return self.symbol not in _NON_METALS


# Nonmetals and metalloids, which do not form simple cations in salts
# (common practice; IUPAC 2005 IR-3.6 lists the collective names).
_NON_METALS = frozenset("H He B C N O F Ne Si P S Cl Ar Ge As Se Br Kr Sb Te I Xe At Rn Ts Og".split())


def _optional_float(text: str) -> float | None:
    return float(text) if text else None


def _element_from_row(row: dict[str, str]) -> Element:
    interval = None
    uncertainty = None
    if row["standard_value"]:
        weight = float(row["standard_value"])
        uncertainty = float(row["uncertainty"])
        kind = STANDARD
    elif row["conventional_value"]:
        weight = float(row["conventional_value"])
        interval = (float(row["interval_low"]), float(row["interval_high"]))
        kind = CONVENTIONAL
    else:
        weight = float(int(row["mass_number"]))
        kind = MASS_NUMBER
    return Element(
        z=int(row["z"]),
        symbol=row["symbol"],
        name=row["name"],
        variants=split_names(row["variants"]),
        group=int(row["group"]) if row["group"] else None,
        period=int(row["period"]),
        atomic_weight=weight,
        uncertainty=uncertainty,
        interval=interval,
        weight_kind=kind,
        electronegativity=_optional_float(row["electronegativity"]),
    )


@cache
def all_elements() -> tuple[Element, ...]:
    """Every element, in order of atomic number."""
    return tuple(_element_from_row(row) for row in read_table("elements.csv"))


@cache
def nuclides() -> tuple[Element, ...]:
    """D (deuterium) and T (tritium): hydrogen isotopes with symbols of their
    own (``data/nuclides.csv``), read in formulas and weighed with their
    atomic mass; not in ``all_elements()`` nor in ``symbols()``."""
    out = []
    for row in read_table("nuclides.csv"):
        parent = _element_from_row(
            next(r for r in read_table("elements.csv") if r["symbol"] == row["element"])
        )
        out.append(
            Element(
                z=parent.z,
                symbol=row["symbol"],
                name=row["name"],
                variants=(),
                group=parent.group,
                period=parent.period,
                atomic_weight=float(row["atomic_mass"]),
                uncertainty=None,
                interval=None,
                weight_kind=NUCLIDE,
                electronegativity=parent.electronegativity,
            )
        )
    return tuple(out)


@cache
def _by_symbol() -> dict[str, Element]:
    return {e.symbol: e for e in all_elements()}


@cache
def _with_nuclides() -> dict[str, Element]:
    return {**_by_symbol(), **{n.symbol: n for n in nuclides()}}


@cache
def _by_name() -> dict[str, Element]:
    table: dict[str, Element] = {}
    for e in all_elements():
        table[e.name.casefold()] = e
        for variant in e.variants:
            table[variant.casefold()] = e
    return table


def symbols() -> frozenset[str]:
    """All element symbols (not the nuclide symbols D and T)."""
    return frozenset(_by_symbol())


def is_symbol(text: str) -> bool:
    """True if ``text`` is an element symbol, or the nuclide symbol D or T, in its exact case."""
    return text in _with_nuclides()


def element(key: str | int) -> Element:
    """Look an element up by symbol (case-sensitive), name or name variant
    (any case), or atomic number.

    Args:
        key: ``"Na"``, ``"sodium"``, ``"Aluminum"``, ``11``.

    Returns:
        The Element.

    Raises:
        CellchemError: no element answers to ``key``.

    >>> element("Cl").atomic_weight
    35.45
    >>> element("sulphur").symbol
    'S'
    """
    if isinstance(key, bool):
        raise CellchemError(f"{key!r} is not an element symbol, name or atomic number")
    if isinstance(key, int):
        elements = all_elements()
        if 1 <= key <= len(elements):
            return elements[key - 1]
        raise CellchemError(
            f"there is no element with atomic number {key} (expected 1 to {len(elements)})",
            text=str(key),
        )
    text = str(key).strip()
    found = _with_nuclides().get(text) or _by_name().get(text.casefold())
    if found is not None:
        return found
    cased = _by_symbol().get(text.capitalize())
    if cased is not None:
        raise CellchemError(
            f"unknown element '{text}': element symbols are case-sensitive;"
            f" did you mean '{cased.symbol}' ({cased.name})?",
            text=text,
            choices=(cased.symbol,),
        )
    raise CellchemError(
        f"unknown element '{text}' (expected a symbol such as 'Na' or a name such as 'sodium')",
        text=text,
    )


def edition() -> str:
    """The header of the atomic-weight table: its source and edition."""
    return table_header("elements.csv")
