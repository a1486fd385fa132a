"""The ion catalog: the ions a chemical store meets, with charges and names.

Data: ``data/ions.csv``, one row per ion with its source. Ions are found by
name (IUPAC, legacy -ous/-ic, trade and regional spellings, any case), by
formula with a charge (``'Al3+'``, ``'SO4 2-'``), or by formula alone when only
one catalog ion has it (``'SO4'``). A metal with several charges and none
given is refused with the choices listed.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from functools import cache, cached_property
from math import gcd

from .elements import element, is_symbol
from .errors import CellchemError, UnknownIonError
from .formula import Atom, Formula, Group, Number, parse_formula, render_items
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
        read two ways. Every label reads back as this ion."""
        magnitude = "" if abs(self.charge) == 1 else str(abs(self.charge))
        sign = "+" if self.charge > 0 else "-"
        if self.is_monatomic or self.is_complex or magnitude == "":
            plain = self.text + magnitude + sign
        else:
            plain = f"{self.text} {magnitude}{sign}"
        try:
            back = parse_formula(plain)
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


def _ion_from_row(row: dict[str, str]) -> Ion:
    formula = parse_formula(row["formula"])
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
        f = parse_formula(row["formula"])
        table[(counts_key(f.counts), int(row["charge"]))] = float(row[column])
    return table


def catalog_name(counts: dict[str, Number], charge: int) -> str | None:
    """The name of the catalog ion with these element counts and charge, if any."""
    ion = _by_key().get((counts_key(counts), charge))
    return ion.name if ion else None


def lookup(counts: dict[str, Number], charge: int) -> Ion | None:
    """The catalog ion with these element counts and charge, if any."""
    return _by_key().get((counts_key(counts), charge))


# ---------------------------------------------------------------------------
# Finding an ion from what a user typed
# ---------------------------------------------------------------------------

_ROMAN = {1: "I", 2: "II", 3: "III", 4: "IV", 5: "V", 6: "VI", 7: "VII", 8: "VIII"}


def normalise_name(text: str) -> str:
    """Case-fold, collapse spaces, drop a trailing 'ion(s)', write a charge
    number '(3+)' or an Arabic Stock number '(3)' as the Roman '(iii)'."""
    name = " ".join(text.replace("\u00a0", " ").split()).casefold()
    name = re.sub(r"\s+ions?$", "", name)
    name = re.sub(r"\s*\(\s*", "(", name)
    name = re.sub(r"\s*\)", ")", name)

    def roman(m: re.Match[str]) -> str:
        n = int(m.group(1))
        return "(" + _ROMAN[n].casefold() + ")" if n in _ROMAN else m.group(0)

    name = re.sub(r"\(\+?(\d)\+?\)", roman, name)
    return name


@cache
def _by_name() -> dict[str, tuple[Ion, ...]]:
    table: dict[str, list[Ion]] = {}

    def add(name: str, ion: Ion) -> None:
        key = normalise_name(name)
        if ion not in table.setdefault(key, []):
            table[key].append(ion)

    for ion in catalog():
        add(ion.name, ion)
        if ion.legacy_name:
            add(ion.legacy_name, ion)
        for other in ion.other_names:
            add(other, ion)
        # element-name spellings (aluminum, cesium) for monatomic cations
        if ion.is_monatomic and ion.charge > 0:
            el = element(next(iter(ion.formula.counts)))
            stock = ion.name[len(el.name) :] if ion.name.startswith(el.name) else ""
            for variant in el.variants:
                add(variant + stock, ion)
    return {k: tuple(v) for k, v in table.items()}


def _say_which(ions: tuple[Ion, ...]) -> str:
    """'give the charge' when the charge tells the ions apart, else 'say which'."""
    return "give the charge" if len({i.charge for i in ions}) == len(ions) else "say which"


def _choices_text(ions: tuple[Ion, ...]) -> str:
    return ", ".join(f"{ion.label} ({ion.name})" for ion in ions)


def find_ion(text: str, role: str | None = None) -> Ion:
    """An ion of the catalog from a name, or a formula with or without charge.

    Args:
        text: ``'aluminium'``, ``'Iron (III)'``, ``'ferric'``, ``'sulphate'``,
            ``'Al3+'``, ``'SO4 2-'``, ``'[Fe(CN)6]4-'``, ``'SO4'``.
        role: ``'cation'`` or ``'anion'`` to say which is wanted (used to
            choose among names and to explain a mix-up), or None.

    Returns:
        The Ion.

    Raises:
        CellchemError: (an UnknownIonError) no catalog ion answers, or several
            do (a metal with several charges and none given); the message
            lists the choices.

    >>> find_ion("ferric").label
    'Fe3+'
    >>> find_ion("SO4 2-").name
    'sulfate'
    """
    if not isinstance(text, str) or not text.strip():
        raise UnknownIonError(
            "no ion given (expected a name such as 'sulfate' or a formula such as 'SO4 2-')", text=str(text)
        )
    raw = text.strip()
    wanted = {"cation": 1, "anion": -1}.get(role or "", 0)

    def pick(ions: tuple[Ion, ...]) -> tuple[Ion, ...]:
        if wanted:
            signed = tuple(i for i in ions if (i.charge > 0) == (wanted > 0))
            return signed or ions
        return ions

    named = _by_name().get(normalise_name(raw))
    if named:
        named = pick(named)
        if len(named) == 1:
            return named[0]
        raise UnknownIonError(
            f"'{raw}' names more than one ion: {_choices_text(named)}; say which"
            f" (for example '{named[0].label}' or '{named[1].label}')",
            text=raw,
            choices=tuple(i.label for i in named),
        )
    # an element name for a metal with several charges, or a non-metal
    el = None
    try:
        el = element(raw) if not is_symbol(raw) else None
    except CellchemError:
        el = None
    if el is not None:
        own = tuple(ion for ion in catalog() if tuple(ion.formula.counts) == (el.symbol,))
        own = pick(own)
        if len(own) > 1:
            raise UnknownIonError(
                f"'{raw}' forms more than one ion: {_choices_text(own)}; {_say_which(own)}"
                f" (for example '{own[0].name}' or '{own[0].label}')",
                text=raw,
                choices=tuple(i.label for i in own),
            )
        if len(own) == 1:
            ion = own[0]
            raise UnknownIonError(
                f"'{raw}' is the element; its ion is {ion.name} ({ion.label})", text=raw, choices=(ion.label,)
            )
    # an element name with a Stock number the catalog does not hold: 'iron(IV)'
    stock = re.fullmatch(r"([a-z]+)\((i{1,3}|iv|v|vi{0,3}|ix|x)\)", normalise_name(raw))
    if stock:
        try:
            metal = element(stock.group(1))
        except CellchemError:
            metal = None
        if metal is not None:
            own = tuple(
                ion for ion in catalog() if tuple(ion.formula.counts) == (metal.symbol,) and ion.charge > 0
            )
            held = f"; the catalog has {_choices_text(own)}" if own else ""
            raise UnknownIonError(
                f"'{raw}' is not an ion in the catalog{held} (see DEVELOPERS.md to add one)",
                text=raw,
                choices=tuple(i.label for i in own),
            )
    # a formula
    try:
        formula = parse_formula(raw)
    except CellchemError as exc:
        if exc.choices and "ambiguous" in str(exc):
            raise UnknownIonError(str(exc), text=raw, choices=exc.choices) from exc
        raise UnknownIonError(
            f"'{raw}' is neither an ion name cellchem knows nor a formula ({exc})", text=raw
        ) from exc
    if len(formula.parts) > 1 or formula.has_unknown_count:
        raise UnknownIonError(f"'{raw}' is a compound with hydrate or adduct parts, not an ion", text=raw)
    if formula.charge:
        ion = lookup(formula.counts, formula.charge)
        if ion is not None:
            return ion
        same = _by_formula_key().get(counts_key(formula.counts), ())
        also = f"; the catalog has {_choices_text(same)}" if same else ""
        raise UnknownIonError(
            f"'{raw}' is not an ion in the catalog{also} (see DEVELOPERS.md to add one)",
            text=raw,
            choices=tuple(i.label for i in same),
        )
    same = pick(_by_formula_key().get(counts_key(formula.counts), ()))
    if len(same) == 1:
        return same[0]
    if len(same) > 1:
        raise UnknownIonError(
            f"'{raw}' has no charge and matches more than one ion: {_choices_text(same)}; give the charge",
            text=raw,
            choices=tuple(i.label for i in same),
        )
    raise UnknownIonError(
        f"'{raw}' is not an ion in the catalog (expected a name such as 'sulfate' or a formula"
        " with its charge such as 'SO4 2-')",
        text=raw,
    )


# ---------------------------------------------------------------------------
# Salts by charge balance
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


def salt_formula(cation: str | Ion, anion: str | Ion) -> str:
    """The neutral compound of two ions, in the lowest whole-number ratio.

    Args:
        cation: by name, symbol or formula with charge (``'Al3+'``,
            ``'aluminium'``, ``'iron(III)'``, ``'NH4+'``).
        anion: likewise (``'sulfate'``, ``'SO4 2-'``).

    Returns:
        The canonical formula, e.g. ``'Al2(SO4)3'``.

    Raises:
        CellchemError: an ion is unknown, its charge is open (a metal with
            several charges), or the roles are the wrong way round.

    >>> salt_formula("aluminium", "sulfate")
    'Al2(SO4)3'
    >>> salt_formula("NH4+", "PO4 3-")
    '(NH4)3PO4'
    """
    cat = cation if isinstance(cation, Ion) else find_ion(cation, role="cation")
    an = anion if isinstance(anion, Ion) else find_ion(anion, role="anion")
    if cat.charge <= 0:
        raise UnknownIonError(
            f"the cation given, '{cation}', is {cat.name} ({cat.label}), an anion;"
            " give the cation first and the anion second",
            text=str(cation),
        )
    if an.charge >= 0:
        raise UnknownIonError(
            f"the anion given, '{anion}', is {an.name} ({an.label}), a cation;"
            " give the cation first and the anion second",
            text=str(anion),
        )
    g = gcd(cat.charge, -an.charge)
    n_cat = -an.charge // g
    n_an = cat.charge // g
    return str(parse_formula(ion_term(cat, n_cat) + ion_term(an, n_an)))
