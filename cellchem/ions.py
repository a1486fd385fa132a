"""The ion catalog: the ions a chemical store meets, with charges and names.

Data: ``data/ions.csv``, one row per ion with its source. This module holds
the catalog, its lookups by element counts and charge, and how the catalog
settles a sign written right after a count ('NH4+' against 'Fe3+',
``settle``). Finding an ion from what a user typed (a name, or a formula with
or without its charge) is ``cellchem.reading.find_ion``.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cache, cached_property
from math import gcd

from .elements import element
from .errors import CellchemError
from .formula import Atom, Formula, Group, LoneSign, Number, read_notation, render_items
from .tables import read_table, split_names

CountsKey = tuple[tuple[str, Number], ...]


def counts_key(counts: dict[str, Number]) -> CountsKey:
    """An order-free key for element counts (so CH3COO and C2H3O2 match)."""
    return tuple(sorted(counts.items()))


@dataclass(frozen=True)
class Ion:
    """One ion of the catalog.

    Attributes:
        formula: the parsed formula of the ion, without its charge.
        charge: the charge number, e.g. -2 for sulfate.
        name: the IUPAC 2005 name cellchem writes, e.g. ``"iron(III)"``.
        legacy_name: the -ous/-ic name where suppliers still print one.
        other_names: other names suppliers print (``"bicarbonate"``, ``"sulphate"``).
        source: where the row comes from.
    """

    formula: Formula
    charge: int
    name: str
    legacy_name: str = ""
    other_names: tuple[str, ...] = ()
    source: str = field(default="", compare=False)

    @property
    def text(self) -> str:
        """Formula text without the charge, e.g. ``'SO4'``."""
        return render_items(self.formula.parts[0].items)

    @property
    def atoms(self) -> int:
        return int(sum(self.formula.counts.values()))

    @property
    def is_monatomic(self) -> bool:
        return self.atoms == 1

    @property
    def is_complex(self) -> bool:
        """A coordination entity written in square brackets."""
        items = self.formula.parts[0].items
        return len(items) == 1 and isinstance(items[0], Group) and items[0].bracket == "["

    @property
    def is_homonuclear(self) -> bool:
        """Two or more atoms of one element: Hg2 2+, O2 2-, N3-, ..."""
        return len(self.formula.counts) == 1 and self.atoms > 1

    @cached_property
    def label(self) -> str:
        """How the ion is written in messages: ``Na+``, ``Fe3+``, ``SO4 2-``;
        with a caret (``O^2-``, ``O2^-``, ``NH2^-``) where the plain form would
        read two ways. Every label reads back as this ion: a sign right after a
        count is settled as ``parse_formula`` settles it (``settle``)."""
        magnitude = "" if abs(self.charge) == 1 else str(abs(self.charge))
        sign = "+" if self.charge > 0 else "-"
        if self.is_monatomic or self.is_complex or magnitude == "":
            plain = self.text + magnitude + sign
        else:
            plain = f"{self.text} {magnitude}{sign}"
        try:
            found = read_notation(plain)
            back = settle(found) if isinstance(found, LoneSign) else found
            if back.charge == self.charge and counts_key(back.counts) == self.key:
                return plain
        except CellchemError:
            pass
        return f"{self.text}^{magnitude}{sign}"

    @property
    def key(self) -> CountsKey:
        return counts_key(self.formula.counts)

    def __str__(self) -> str:
        return self.label

    def __repr__(self) -> str:
        return f"Ion({self.label!r}, {self.name!r})"


def data_formula(text: str, filename: str) -> Formula:
    """A formula of a data table, as written (its charge, if any, is in a column
    of its own: a sign in the formula is a fault of the table)."""
    found = read_notation(text)
    if isinstance(found, LoneSign):
        raise ValueError(f"data file {filename}: formula {text!r} has a sign; give the charge in its column")
    return found


def _ion_from_row(row: dict[str, str]) -> Ion:
    formula = data_formula(row["formula"], "ions.csv")
    return Ion(
        formula=formula,
        charge=int(row["charge"]),
        name=row["name"],
        legacy_name=row.get("legacy_name", ""),
        other_names=split_names(row.get("other_names")),
        source=row.get("source", ""),
    )


@cache
def catalog() -> tuple[Ion, ...]:
    """Every ion of the catalog, in the order of the data file."""
    return tuple(_ion_from_row(row) for row in read_table("ions.csv"))


@cache
def _by_key() -> dict[tuple[CountsKey, int], Ion]:
    return {(ion.key, ion.charge): ion for ion in catalog()}


@cache
def _by_formula_key() -> dict[CountsKey, tuple[Ion, ...]]:
    table: dict[CountsKey, list[Ion]] = {}
    for ion in catalog():
        table.setdefault(ion.key, []).append(ion)
    return {k: tuple(v) for k, v in table.items()}


def _primitive(counts: dict[str, Number]) -> tuple[CountsKey, int]:
    """Counts divided by their greatest common divisor, and that divisor."""
    values = [int(v) for v in counts.values() if int(v) == v]
    if len(values) != len(counts):
        return counts_key(counts), 1
    g = 0
    for v in values:
        g = gcd(g, v)
    g = g or 1
    return counts_key({s: int(v) // g for s, v in counts.items()}), g


@cache
def _by_primitive() -> dict[CountsKey, tuple[tuple[Ion, int], ...]]:
    table: dict[CountsKey, list[tuple[Ion, int]]] = {}
    for ion in catalog():
        prim, factor = _primitive(ion.formula.counts)
        table.setdefault(prim, []).append((ion, factor))
    return {k: tuple(v) for k, v in table.items()}


def ions_in(counts: dict[str, Number]) -> tuple[tuple[Ion, int], ...]:
    """Catalog ions that make up ``counts`` k times over: ((ion, k), ...)."""
    prim, g = _primitive(counts)
    found = []
    for ion, factor in _by_primitive().get(prim, ()):
        if g % factor == 0:
            found.append((ion, g // factor))
    return tuple(found)


@cache
def ion_values(filename: str, column: str) -> dict[tuple[CountsKey, int], float]:
    """A data table of one number per ion (columns ``formula``, ``charge`` and
    ``column``), keyed by the ion's element counts and charge as ``Ion.key``
    and ``Ion.charge`` give them."""
    table = {}
    for row in read_table(filename):
        f = data_formula(row["formula"], filename)
        table[(counts_key(f.counts), int(row["charge"]))] = float(row[column])
    return table


def catalog_name(counts: dict[str, Number], charge: int) -> str | None:
    """The name of the catalog ion with these element counts and charge, if any."""
    ion = _by_key().get((counts_key(counts), charge))
    return ion.name if ion else None


def lookup(counts: dict[str, Number], charge: int) -> Ion | None:
    """The catalog ion with these element counts and charge, if any."""
    return _by_key().get((counts_key(counts), charge))


def with_counts(counts: dict[str, Number]) -> tuple[Ion, ...]:
    """The catalog ions with these element counts, of any charge (SO3: sulfite;
    Fe: iron(II) and iron(III)), in the order of the data file."""
    return _by_formula_key().get(counts_key(counts), ())


# ---------------------------------------------------------------------------
# A lone sign after a count, settled by the catalog
# ---------------------------------------------------------------------------


def settle(sign: LoneSign) -> Formula:
    """'NH4+' (ammonium) against 'Fe3+' (iron(III)): the reading of a lone sign
    after a count that the catalog settles. The reading that is a catalog ion
    wins (NH4+, SO42-, C(NH2)3+). When neither is, a bracketed group
    ('[Co(NH3)5Cl]2+') and a lone metal with one digit ('Ti4+') take the
    charge reading; otherwise, and when both are ions ('O2-': superoxide or
    oxide), the input is refused with the two readings and the explicit ways
    to write each.

    Raises:
        CellchemError: (a FormulaError) the catalog does not settle the sign.

    >>> settle(read_notation("NH4+")).counts, settle(read_notation("Fe3+")).charge
    ({'N': 1, 'H': 4}, 3)
    """
    count, charge = sign.as_count, sign.as_charge
    known_count = catalog_name(count.counts, count.charge)
    known_charge = catalog_name(charge.counts, charge.charge)
    if known_count and not known_charge:
        return count
    if known_charge and not known_count:
        return charge
    if not known_count and not known_charge:
        # Neither is a catalog ion: a bracketed group ('[Co(NH3)5Cl]2+') and a
        # lone element ('Ti4+', never tetratitanium(1+)) take the charge reading.
        if sign.group or (sign.lone_element and _variable_metal(sign.lone_element)):
            return charge
    raise sign.refusal(known_count, known_charge)


def _variable_metal(symbol: str) -> bool:
    """A metal the catalog gives more than one charge (Fe4+ reads as Fe 4+;
    Na2+ is refused, since sodium forms only Na+)."""
    charges = {ion.charge for ion, _ in ions_in({symbol: 1}) if ion.charge > 0}
    return element(symbol).is_metal and len(charges) > 1


# ---------------------------------------------------------------------------
# Ions in compound formulas
# ---------------------------------------------------------------------------


def ion_term(ion: Ion, count: int) -> str:
    """The text of ``count`` of ``ion`` inside a compound formula:
    parentheses around a polyatomic ion counted more than once, none around
    a coordination entity (already bracketed)."""
    body = render_items(ion.formula.parts[0].items)
    if count == 1:
        return body
    if ion.is_monatomic:
        items = ion.formula.parts[0].items
        assert isinstance(items[0], Atom)
        return items[0].symbol + str(count)
    if ion.is_complex:
        return body + str(count)
    return f"({body}){count}"
