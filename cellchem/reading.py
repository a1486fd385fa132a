"""Reading what users type with the ion catalog: formulas, ions and salts.

The formula notation (``cellchem.formula``) knows the element table only. Two
steps of reading a formula need more, and ``parse_formula`` here takes both:

- a lone sign right after a count ('NH4+' against 'Fe3+') is settled against
  the ion catalog (``cellchem.ions.settle``: the reading that is a catalog ion
  wins; where neither is, a bracketed group and a lone metal of several
  charges take the charge reading; where both are ions, 'O2-', the input is
  refused with the two readings);
- the canonical text writes cations first (CH3COONa is NaCH3COO): the parts
  are read as ions by the charge solver (``cellchem.solver``), and the order
  is kept in the Formula (``Formula.order``).

``parse_formula`` is the reader every module above the charge solver calls.
An ion from a name or a formula (``find_ion``) and the salt of two ions
(``salt_formula``) read what users type the same way.
"""

from __future__ import annotations

import re
from functools import cache, lru_cache
from math import gcd

from . import formula as formula_module
from .elements import element, is_symbol
from .errors import CellchemError, UnknownIonError
from .formula import Formula, Item, LoneSign, Part, check_text, read_notation
from .ions import Ion, catalog, ion_term, lookup, settle, with_counts
from .solver import best_reading

# ---------------------------------------------------------------------------
# Formulas
# ---------------------------------------------------------------------------


def parse_formula(text: str) -> Formula:
    """Read a formula as inventories and supplier sheets write it.

    Args:
        text: e.g. ``"CuSO4·5H2O"``, ``"Na2B4O7.10H2O"``, ``"SO4 2-"``,
            ``"[Fe(CN)6]4-"``, ``"CuSO₄·5H₂O"``, ``"NH4+"``.

    Returns:
        An immutable Formula; ``str()`` of it is the canonical text.

    Raises:
        CellchemError: (a FormulaError) the text is not a formula; the message
            quotes it, gives the position counted from 1 and says what was
            expected. A text longer than ``cellchem.formula.MAX_LENGTH`` (300)
            characters is refused before it is read.

    >>> str(parse_formula("CuSO₄ . 5 H₂O"))
    'CuSO4·5H2O'
    >>> parse_formula("SO4--").charge
    -2
    >>> str(parse_formula("CH3COONa")), parse_formula("NH4+").charge
    ('NaCH3COO', 1)
    """
    return _parse_formula(check_text(text))  # a text too long is refused before it is remembered


@lru_cache(maxsize=65536)
def _parse_formula(text: str) -> Formula:
    found = read_notation(text)
    return settle(found) if isinstance(found, LoneSign) else found  # its text is ordered when printed


def as_formula(formula: str | Formula) -> Formula:
    """Accept a Formula or text (parsed, cached)."""
    if isinstance(formula, Formula):
        return formula
    return parse_formula(formula)


def _order_parts(f: Formula) -> tuple[Part, ...]:
    """The parts in the order of the canonical text (``formula.ORDER_PARTS``)."""
    return tuple(cations_first(part, f.charge if i == 0 else 0) for i, part in enumerate(f.parts))


def canonical(f: Formula) -> Formula:
    """The formula with the order its canonical text writes its parts in (cations
    first, ``Formula.order``). ``parse_formula`` gives every formula so; a
    Formula built in code goes through this before it is written or weighed
    against one read."""
    order = tuple(cations_first(part, f.charge if i == 0 else 0) for i, part in enumerate(f.parts))
    if order == f.parts:
        order = ()
    if order == f.order:
        return f
    return Formula(f.parts, f.charge, f.source, order)


def cations_first(part: Part, target: int = 0) -> Part:
    """The part with its cation runs moved before the others (CH3COONa ->
    NaCH3COO), when it reads as ions; otherwise as written. Hydrogen stays
    where it was written, so NH3 and CH3COOH keep their order."""
    if part.is_water or len(part.items) < 2:
        return part
    try:
        solution = best_reading(part.items, target)
    except CellchemError:
        return part
    if solution is None:
        return part
    path = solution[1]
    runs = [
        (opt, any(s.charge > 0 and not (s.ion and s.ion.text == "H") for s in opt.shares)) for opt in path
    ]
    flags = [is_cation for _, is_cation in runs]
    if flags == sorted(flags, reverse=True):
        return part
    ordered = [opt for opt, c in runs if c] + [opt for opt, c in runs if not c]
    items: list[Item] = []
    for opt in ordered:
        items.extend(part.items[opt.start : opt.end])
    return Part(tuple(items), part.multiplier)


# ---------------------------------------------------------------------------
# An ion from what a user typed
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
        same = with_counts(formula.counts)
        also = f"; the catalog has {_choices_text(same)}" if same else ""
        raise UnknownIonError(
            f"'{raw}' is not an ion in the catalog{also} (see DEVELOPERS.md to add one)",
            text=raw,
            choices=tuple(i.label for i in same),
        )
    same = pick(with_counts(formula.counts))
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


formula_module.ORDER_PARTS = _order_parts
