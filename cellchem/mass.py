"""Molar mass, composition and mass fractions, in g/mol.

Atomic weights come from ``elements`` (CIAAW; conventional values for the
elements with an interval). A molar mass that uses an element with no
standard atomic weight says so in its ``notes``.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

from .charge import charge_balance
from .elements import MASS_NUMBER, element
from .errors import CellchemError, ChemistryError
from .formula import Formula, Number, render_items
from .reading import as_formula, parse_formula


class MolarMass(float):
    """A molar mass in g/mol: a float that carries notes.

    ``notes`` is empty for a formula of elements with standard atomic weights;
    otherwise it says which elements used the mass number of their
    longest-lived isotope instead.
    """

    notes: tuple[str, ...]

    def __new__(cls, value: float, notes: tuple[str, ...] = ()) -> MolarMass:
        obj = super().__new__(cls, value)
        obj.notes = notes
        return obj

    def __reduce__(self):
        return (MolarMass, (float(self), self.notes))


@dataclass(frozen=True)
class ElementShare:
    """One element's part of a formula: count, mass contribution (g/mol), mass percent."""

    symbol: str
    count: Number
    mass: float
    percent: float


def _unknown_letter(text: str) -> str:
    m = re.search(r"(?<![A-Za-z])([xny])(?=\s*[A-Z(\[])", text)
    return m.group(1) if m else "x"


def _refuse_unknown(f: Formula, what: str) -> None:
    if f.has_unknown_count:
        text = f.source or f.text()
        if f.water is None:
            raise ChemistryError(
                f"the water count in '{text}' is unknown, so its {what} cannot be given;"
                f" write the number of waters in place of '{_unknown_letter(text)}', or the anhydrous"
                f" '{f.anhydrous().text()}'",
                text=text,
            )
        raise ChemistryError(
            f"'{text}' has a part with an unknown count, so its {what} cannot be given", text=text
        )


@lru_cache(maxsize=65536)
def _molar_mass(f: Formula) -> MolarMass:
    _refuse_unknown(f, "molar mass")
    total = 0.0
    notes = []
    for symbol, n in f.counts.items():
        el = element(symbol)
        total += el.atomic_weight * float(n)
        if el.weight_kind == MASS_NUMBER:
            notes.append(
                f"{el.name} has no standard atomic weight; the mass number of its longest-lived"
                f" isotope ({int(el.atomic_weight)}) was used"
            )
    return MolarMass(total, tuple(notes))


def molar_mass(formula: str | Formula) -> MolarMass:
    """Molar mass of a formula, g/mol.

    Args:
        formula: text (``'CuSO4·5H2O'``) or a parsed Formula.

    Returns:
        The molar mass in g/mol, a float with ``notes``.

    Raises:
        CellchemError: the formula cannot be read, or a count (such as the
            water in ``Na2CO3·xH2O``) is unknown.

    >>> round(molar_mass("CuSO4·5H2O"), 2)
    249.68
    """
    if type(formula) is str:
        found = _BY_TEXT.get(formula)
        if found is not None:
            return found
        value = _molar_mass(as_formula(formula))
        if len(_BY_TEXT) < 65536:
            _BY_TEXT[formula] = value
        return value
    return _molar_mass(as_formula(formula))


_BY_TEXT: dict[str, MolarMass] = {}  # repeated texts (a worksheet column, a stock list) skip the parse


def composition(formula: str | Formula) -> dict[str, ElementShare]:
    """Per element: count, mass contribution (g/mol) and mass percent.

    >>> composition("H2O")["O"].percent  # doctest: +ELLIPSIS
    88.8...
    """
    f = as_formula(formula)
    _refuse_unknown(f, "composition")
    total = molar_mass(f)
    out = {}
    for symbol, n in f.counts.items():
        mass = element(symbol).atomic_weight * float(n)
        out[symbol] = ElementShare(symbol, n, mass, 100.0 * mass / total)
    return out


def _part_count(f: Formula, part: Formula) -> Number:
    """How many units of ``part`` (an ion, group or water) one formula unit holds."""
    text = f.source or f.text()
    wanted = part.counts
    if part.parts[0].is_water and len(part.parts) == 1 and not part.charge:
        water = f.water
        assert water is not None
        return water
    result = charge_balance(f)
    shares = [s for s in result.charges if s.ion is not None and s.ion.formula.counts == wanted]
    if part.charge:
        shares = [s for s in shares if s.charge == part.charge]
    if shares:
        if len({s.charge for s in shares}) > 1 and not part.charge:
            pass  # mixed valence of one element: all of its atoms count
        return sum(Fraction(s.count) for s in shares)  # type: ignore[return-value]
    held = ", ".join(s.label for s in result.charges if s.ion is not None)
    also = f" (its ions are {held})" if held else ""
    raise ChemistryError(f"'{text}' holds no '{part.source or part.text()}' ion or group{also}", text=text)


def mass_fraction(formula: str | Formula, part: str) -> float:
    """Mass fraction (0 to 1) of an element, ion or group, or of the water of
    crystallisation, in a formula.

    Args:
        formula: e.g. ``'CuSO4·5H2O'``.
        part: an element symbol (``'Cu'``), an ion or group (``'SO4'``,
            ``'NH4'``), or ``'H2O'`` for the water of crystallisation.

    An element that the formula does not hold gives 0.0; an ion or group it
    does not hold is refused, since the formula may hold a related one
    (NaHCO3 holds HCO3-, not CO3 2-).

    Raises:
        CellchemError: the formula or part cannot be read, a count is
            unknown, or the formula holds no such ion or group.

    >>> round(mass_fraction("CuSO4·5H2O", "H2O"), 4)
    0.3608
    """
    f = as_formula(formula)
    _refuse_unknown(f, "mass fraction")
    total = float(molar_mass(f))
    try:
        p = parse_formula(part)
    except CellchemError as exc:
        raise ChemistryError(f"the part '{part}' cannot be read: {exc}", text=part) from exc
    if len(p.parts) > 1 or p.parts[0].multiplier != 1:
        raise ChemistryError(
            f"the part '{part}' has a multiplier or a hydrate dot; give one element, ion or group"
            " (such as 'Cu', 'SO4' or 'H2O')",
            text=part,
        )
    if len(p.counts) == 1 and len(p.parts) == 1 and not p.charge and len(p.parts[0].items) == 1:
        symbol = next(iter(p.counts))
        if p.counts[symbol] == 1:
            n = f.counts.get(symbol, 0)
            return element(symbol).atomic_weight * float(n) / total
    n = _part_count(f, p)
    return float(molar_mass(render_items(p.parts[0].items))) * float(n) / total
