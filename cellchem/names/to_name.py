"""Naming a formula: formula -> name, by charge balance, and read back: where
the name written does not give the same formula, the counts are spelled out
with multiplicative prefixes.
"""

from __future__ import annotations

import re
from fractions import Fraction
from functools import lru_cache
from math import gcd

from ..charge import charge_balance
from ..elements import element
from ..errors import CellchemError, NameReadError
from ..formula import Atom, Formula, Group, Number, render_items
from ..ions import Ion, counts_key, lookup
from ..reading import as_formula, canonical, parse_formula
from .complexes import complex_name
from .folding import _ROMAN, _fold
from .salts import _sort_name
from .tables import (
    _DIATOMIC,
    _acids,
    _established_names,
    _hydrate_suffix,
    _ion_names,
    _monatomic,
    _named,
    _oxo_groups,
    _prefixes,
)
from .to_formula import _read_name

SPELLINGS = ("iupac", "british", "american")


def name_from_formula(formula: str | Formula, spelling: str = "iupac", legacy: bool = False) -> str:
    """The systematic name of a formula.

    Args:
        formula: text or a parsed Formula.
        spelling: ``'iupac'`` (aluminium, caesium, sulfate), ``'british'``
            (sulphate) or ``'american'`` (aluminum, cesium).
        legacy: write the -ous/-ic name of a cation where one exists
            (ferric chloride) instead of the Stock name (iron(III) chloride).

    Raises:
        CellchemError: the formula cannot be read, does not balance, or is not
            a compound cellchem names (organic and other molecular compounds
            beyond binary ones).

    >>> name_from_formula("CuSO4·5H2O")
    'copper(II) sulfate pentahydrate'
    >>> name_from_formula("FeCl3", legacy=True)
    'ferric chloride'
    """
    if spelling not in SPELLINGS:
        raise CellchemError(f"unknown spelling '{spelling}' (expected one of: {', '.join(SPELLINGS)})")
    f = as_formula(formula)
    return _respell(_name(f, legacy), spelling)


def _respell(name: str, spelling: str) -> str:
    if spelling == "british":
        return re.sub(r"sulf", "sulph", name)
    if spelling == "american":
        return name.replace("aluminium", "aluminum").replace("caesium", "cesium")
    return name


def _ion_display_name(ion: Ion, legacy: bool) -> str:
    if legacy and ion.legacy_name and ion.charge > 0:
        return ion.legacy_name
    return ion.name


@lru_cache(maxsize=32768)
def _name(f: Formula, legacy: bool) -> str:
    text = f.source or f.text()
    if f.charge:
        ion = lookup(f.counts, f.charge)
        if ion is not None and len(f.parts) == 1:
            return _ion_display_name(ion, legacy)
        raise NameReadError(f"'{text}' is an ion cellchem does not know by name", text=text)
    parts_names = []
    base = f.anhydrous()
    # established names and acids, by composition
    key = (counts_key(f.counts), f.water)
    named = _named()[1].get(key)
    if named:
        return named
    if not f.water and len(f.parts) == 1:
        group = _oxo_groups()[1].get(counts_key(f.counts))
        if group and charge_balance(f).kind == "molecular":
            return group
    if charge_balance(base).kind == "established":
        # a compound that reads as no simple ions: the name the table gives it, if one
        own = _established_names().get(counts_key(base.counts))
        if own is None:
            raise NameReadError(f"'{text}' reads as no simple ions and no table names it", text=text)
        return own + _hydrate_suffix(f.water)
    if len(base.parts) == 1:
        acid = _acids()[1].get(counts_key(base.counts))
        if acid and _acid_matches(base):
            return acid + _hydrate_suffix(f.water)
    for part in base.parts:
        single = canonical(Formula((part.__class__(part.items, 1),), 0, render_items(part.items)))
        own = _named()[1].get((counts_key(single.counts), 0))
        parts_names.append(own or _salt_name(single, text, legacy))
    if len(parts_names) == 1 and base.parts[0].multiplier == 1:
        return parts_names[0] + _hydrate_suffix(f.water)
    # an addition compound (IUPAC 2005 IR-5.5): names joined by em dashes and
    # the ratio of the parts in whole numbers
    amounts: list[Number] = [p.multiplier or 1 for p in base.parts]
    names = list(parts_names)
    if f.water:
        names.append("water")
        amounts.append(f.water)
    scale = 1
    for a in amounts:
        scale = scale * Fraction(a).denominator // gcd(scale, Fraction(a).denominator)
    whole = [int(Fraction(a) * scale) for a in amounts]
    return "—".join(names) + f" ({'/'.join(str(w) for w in whole)})"


def _acid_matches(base: Formula) -> bool:
    result = charge_balance(base)
    if result.kind != "ionic":
        return True
    return all(s.ion is None or s.charge < 0 or s.ion.text == "H" for s in result.charges)


def _salt_name(f: Formula, text: str, legacy: bool) -> str:
    result = charge_balance(f)
    counts = f.counts
    if result.kind == "element":
        sym = next(iter(counts))
        n = counts[sym]
        el = element(sym)
        if n == 1 or (n == 2 and sym in _DIATOMIC):
            return el.name
        simple, _ = _prefixes()
        return simple.get(n, str(n)) + el.name
    if not result.balanced:
        raise NameReadError(f"'{text}' cannot be named: {result.explanation}", text=text)
    if result.kind == "molecular":
        return _molecular_name(f, text)
    cations = [s for s in result.charges if s.charge > 0]
    anions = [s for s in result.charges if s.charge < 0]
    cation_words = _cation_words(cations, legacy, f)
    anion_words = sorted({_share_name(s, legacy, f) for s in anions}, key=_sort_name)
    name = " ".join(cation_words + anion_words)
    # Does the name read back to this formula? If not, say the counts. A name
    # the trade uses for this and other compounds (copper(II) carbonate, also
    # said of the basic carbonate) is still this formula's name.
    try:
        back = _read_name(name)
        if counts_key(parse_formula(back.formula).counts) == counts_key(counts):
            return name
    except NameReadError as exc:
        if exc.reason == "may-be" and any(
            counts_key(parse_formula(c).anhydrous().counts) == counts_key(counts) for c in exc.choices
        ):
            # the short name the trade uses for several compounds: the prefixed
            # name when it fixes this one ('trisodium phosphate'), else the short name
            try:
                prefixed = _prefixed_name(cations, anions, legacy, f, text)
                if counts_key(parse_formula(_read_name(prefixed).formula).counts) == counts_key(counts):
                    return prefixed
            except CellchemError:
                pass
            return name
    except CellchemError:
        pass
    return _prefixed_name(cations, anions, legacy, f, text)


def _share_name(share, legacy: bool, f: Formula) -> str:
    ion = share.ion
    if ion is not None:
        if ion.is_complex:
            items = ion.formula.parts[0].items[0]
            assert isinstance(items, Group)
            try:
                return complex_name(items.items[0].symbol, list(items.items[1:]), ion.charge)  # type: ignore[union-attr]
            except CellchemError:
                return ion.name
        return _ion_display_name(ion, legacy)
    # a bracketed group read from its contents: name it by the additive rules
    label = share.label
    group = parse_formula(re.sub(r"\d*[+-]$", "", label)).parts[0].items[0]
    if isinstance(group, Group) and isinstance(group.items[0], Atom):
        return complex_name(group.items[0].symbol, list(group.items[1:]), share.charge)
    raise NameReadError(f"cellchem cannot name the group '{label}'")


def _cation_words(cations, legacy: bool, f: Formula) -> list[str]:
    by_element: dict[str, list] = {}
    others = []
    for s in cations:
        if s.ion is not None and s.ion.is_monatomic:
            by_element.setdefault(s.ion.text, []).append(s)
        else:
            others.append(_share_name(s, legacy, f))
    words = list(others)
    for sym, shares in by_element.items():
        if len(shares) == 1:
            words.append(_ion_display_name(shares[0].ion, legacy))
        else:
            states = ",".join(_ROMAN[s.charge] for s in sorted(shares, key=lambda s: s.charge))
            words.append(f"{element(sym).name}({states})")
    return sorted(words, key=_sort_name)


def _prefixed_name(cations, anions, legacy: bool, f: Formula, text: str) -> str:
    simple, complex_ = _prefixes()

    def word(name: str, n: Number) -> str:
        if n == 1:
            return name
        if not isinstance(n, int) or n not in simple:
            raise NameReadError(f"'{text}' cannot be named with multiplicative prefixes")
        if (
            re.search(r"[\d,()\- ]", name)
            or name.startswith(("di", "tri", "tetra", "hydrogen"))
            or _fold(simple[n] + name) in _ion_names()  # 'bis(phosphate)', not 'diphosphate' (P2O7 4-)
        ):
            return f"{complex_[n]}({name})"
        return simple[n] + name

    def cation_name(share) -> str:
        if share.ion is not None and share.ion.is_monatomic:
            return element(share.ion.text).name  # the counts say the charge: 'tetraarsenic hexaoxide'
        return _share_name(share, legacy, f)

    # one word per element for a monatomic cation of mixed valence ('digold dioxide')
    merged: dict[str, list] = {}
    for share in cations:
        key = share.ion.text if share.ion is not None and share.ion.is_monatomic else id(share)
        merged.setdefault(key, []).append(share)  # type: ignore[arg-type]
    words = sorted(
        (word(cation_name(group[0]), sum(x.count for x in group)) for group in merged.values()),
        key=_sort_name,
    )
    words += sorted((word(_share_name(s, legacy, f), s.count) for s in anions), key=_sort_name)
    return " ".join(words)


def _molecular_name(f: Formula, text: str) -> str:
    counts = f.counts
    if len(counts) != 2 or len(f.parts[0].items) != 2:
        raise NameReadError(
            f"cellchem names salts, acids, binary compounds and elements; '{text}' is a molecular"
            " compound of more than two elements or groups",
            text=text,
        )
    simple, _ = _prefixes()
    (first, n1), (second, n2) = counts.items()
    anions = _monatomic(second, -1)
    if not anions:
        raise NameReadError(f"'{text}': {element(second).name} has no '-ide' name in the catalog", text=text)
    ide = anions[0].name
    lead = element(first).name
    if n1 != 1:
        lead = simple[int(n1)] + lead
    prefix = simple[int(n2)]
    if prefix == "mono":
        # 'carbon monoxide' (IUPAC 2005 IR-5.2 allows the elided 'monoxide');
        # otherwise one of each needs no prefix: 'silicon carbide'
        prefix = "mon" if ide == "oxide" else ""
    return f"{lead} {prefix}{ide}"
