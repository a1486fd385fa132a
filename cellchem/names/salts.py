"""Salts written from their ions: cations first, each group in alphabetical
order of names (IUPAC 2005 IR-5.4), a formula from a table rewritten so, and
the acid family of an anion (HPO4 2- is phosphate with one acid hydrogen).
"""

from __future__ import annotations

import re

from ..charge import charge_balance
from ..errors import CellchemError
from ..formula import Atom, Formula, Part
from ..ions import Ion, counts_key, ion_term, lookup
from ..reading import as_formula, parse_formula


def _assemble(ions: list[tuple[Ion, int]]) -> Formula:
    merged: dict[Ion, int] = {}
    for ion, n in ions:
        merged[ion] = merged.get(ion, 0) + n
    cations = [(i, n) for i, n in merged.items() if i.charge > 0]
    anions = [(i, n) for i, n in merged.items() if i.charge < 0]
    if len(cations) > 1:
        cations.sort(key=lambda x: _sort_name(x[0].name))
    if len(anions) > 1:
        anions.sort(key=lambda x: _sort_name(x[0].name))
    terms: list[str] = []
    done: set[str] = set()
    for ion, n in cations:
        if ion.is_monatomic:
            # mixed valence: one term for the element (Fe3O4, not FeFe2O4)
            if ion.text in done:
                continue
            total = sum(m for i, m in cations if i.is_monatomic and i.text == ion.text)
            done.add(ion.text)
            terms.append(ion.text + (str(total) if total > 1 else ""))
        else:
            terms.append(ion_term(ion, n))
    terms.extend(ion_term(i, n) for i, n in anions)
    return parse_formula("".join(terms))


def _sort_name(name: str) -> str:
    """Alphabetical order of names ignoring multiplicative prefixes, Stock
    numbers and locants (IUPAC 2005 IR-5.4)."""
    return re.sub(r"[^a-z]", "", re.sub(r"\(.*?\)", "", name.casefold()))


def as_ions(formula: str | Formula) -> Formula:
    """A formula in Hill order or as a table writes it, rewritten cations first as the
    rules write it where it reads as one salt; unchanged otherwise.

    >>> as_ions("CHNaO3").text(), as_ions("C2H6O").text()
    ('NaHCO3', 'C2H6O')
    """
    return _canonical(as_formula(formula))


def _canonical(f: Formula) -> Formula:
    """A table formula written as the rules write it (alum KAl(SO4)2·12H2O as
    AlK(SO4)2·12H2O), so a trivial name and its systematic name agree."""
    if (len(f.parts) > 1 and not all(p.is_water for p in f.parts[1:])) or f.charge:
        return f
    balance = charge_balance(f.anhydrous())
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return f
    try:
        rebuilt = _assemble([(s.ion, int(s.count)) for s in balance.charges])  # type: ignore[misc]
    except (CellchemError, TypeError, ValueError):
        return f
    if counts_key(rebuilt.counts) != counts_key(f.anhydrous().counts):
        return f
    return rebuilt.with_water(f.water) if f.water else rebuilt


def _acid_base(ion: Ion) -> tuple[Ion, int] | None:
    """The fully deprotonated anion an anion belongs to and the acid hydrogens
    it still holds (HPO4 2-: phosphate, 1), or None for an anion that is not
    of a polyprotic acid (catalog ions; the acid hydrogens are written first)."""
    if ion.charge >= 0:
        return None
    items = ion.formula.parts[0].items
    held = 0
    if len(items) > 1 and isinstance(items[0], Atom) and items[0].symbol == "H":
        held = items[0].count
        base_items = items[1:]
        counts = Formula((Part(base_items, 1),), 0).counts
        base = lookup(counts, ion.charge - held)
        if base is None:
            return None
    else:
        base = ion
    if base.charge > -2:
        return None
    return base, held


def acid_families(f: Formula) -> tuple[frozenset, frozenset] | None:
    """The cations of an ionic formula and the fully deprotonated anions of
    its anions (HPO4 2- counts as phosphate): two salts with the same families
    differ at most in the acid hydrogens their anions keep. None when the
    formula is not ionic."""
    balance = charge_balance(f)
    if balance.kind != "ionic" or any(s.ion is None for s in balance.charges):
        return None
    cations = frozenset((s.ion.text, s.ion.charge) for s in balance.charges if s.charge > 0 and s.ion)
    if ("H", 1) in cations:
        return None
    bases = set()
    for share in balance.charges:
        if share.charge < 0 and share.ion is not None:
            found = _acid_base(share.ion)
            base = found[0] if found else share.ion
            bases.add((base.text, base.charge))
    return cations, frozenset(bases)


def _protonated(base: Ion, replaced: int) -> Ion | None:
    """The anion of base's acid with ``replaced`` of its hydrogens replaced by
    cations: phosphate with 2 replaced is hydrogen phosphate HPO4 2-."""
    n = -base.charge
    if not 0 < replaced <= n:
        return None
    if replaced == n:
        return base
    counts = dict(base.formula.counts)
    counts["H"] = counts.get("H", 0) + (n - replaced)
    return lookup(counts, -replaced)
