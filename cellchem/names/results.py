"""What ``read_name`` returns: the reading of a name (``NameReading``), its
ions and elements (``Component``) and the words set aside (``Qualifier``),
and how a formula becomes a reading.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

from ..charge import charge_balance
from ..elements import element
from ..errors import NameReadError
from ..formula import Formula, Number
from ..reading import parse_formula


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


def _unknown(text: str, why: str) -> NameReadError:
    return NameReadError(f"'{text}' is not a name cellchem can read: {why}", text=text)


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


def _kind_of(f: Formula) -> str:
    balance = charge_balance(f)
    kind = {"ionic": "salt", "molecular": "molecular", "element": "element"}.get(balance.kind, "salt")
    cations = [c for c in balance.charges if c.charge > 0]
    if kind == "salt" and cations and all(c.ion is not None and c.ion.text == "H" for c in cations):
        kind = "acid"
    return kind
