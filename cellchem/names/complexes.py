"""Coordination entities by the additive rules (IUPAC 2005 IR-9), both ways:
a name such as 'hexaamminecobalt(III)' or 'tetrachloridocuprate(2-)' read as
its ligand terms, central atom and oxidation state, and the additive name of
an entity written from its formula.

Names are read by one recursive-descent parser over the ligand and prefix
tables (``_complex_split``): the central atom is the longest central-atom name
(an element, or an -ate name for an anion) that ends the word, and the rest
must be a sequence of ligand terms, each a ligand name with a multiplicative
prefix ('hexa', or 'bis(...)' for a complex ligand), the prefix's last vowel
dropped before a ligand that starts with one ('hexammine', as the trade
writes it), or none.
"""

from __future__ import annotations

import re
from functools import cache, lru_cache

from ..elements import element
from ..errors import NameReadError
from ..formula import Atom, Formula, Group, Item, Part, render_items
from ..ions import Ion, catalog, counts_key, lookup
from .folding import _ROMAN, _ROMAN_VALUES
from .tables import _ate_names, _element_names, _ligands, _monatomic, _prefix_number, _prefixes


@cache
def _term_words() -> tuple[tuple[str, ...], tuple[str, ...], tuple[str, ...]]:
    """Ligand names (and older names and abbreviations), the prefixes of complex
    ligands ('bis', 'tris', 'tetrakis', ...) and the multiplicative prefixes
    ('di', 'tri', ...), each longest first."""
    by_name, _ = _ligands()
    simple, complex_ = _prefixes()
    ligands = tuple(sorted(by_name, key=len, reverse=True))
    complex_prefixes = tuple(sorted({p for n, p in complex_.items() if n >= 2 and p}, key=len, reverse=True))
    simple_prefixes = tuple(sorted({p for n, p in simple.items() if n >= 2 and p}, key=len, reverse=True))
    return ligands, complex_prefixes, simple_prefixes


def _terms_at(text: str, i: int) -> list[tuple[tuple[str, str], int]]:
    """The ligand terms that may start at ``i`` of ``text``, as ((prefix, ligand),
    where the term ends), in the order they are tried: a complex-ligand prefix
    with its ligand in brackets ('bis(ethylenediamine)'), a multiplicative prefix
    with its ligand ('hexaammine'; 'hexammine', the prefix's last vowel dropped
    before a ligand that starts with one, as the trade writes it; 'di(...)'),
    the ligand alone, bare or in brackets ('(disulfido)'), and last a
    complex-ligand prefix without brackets ('bisammine')."""
    ligands, complex_prefixes, simple_prefixes = _term_words()
    out: list[tuple[tuple[str, str], int]] = []

    def ligand_after(prefix: str, j: int, bracketed: bool, vowel_dropped: bool = False) -> None:
        for lig in ligands:
            if vowel_dropped and not lig.startswith("a"):
                continue
            written = f"({lig})" if bracketed else lig
            if text.startswith(written, j):
                out.append(((prefix, lig), j + len(written)))

    for p in complex_prefixes:
        if text.startswith(p + "(", i):
            ligand_after(p, i + len(p), True)
    for p in simple_prefixes:
        if text.startswith(p, i):
            ligand_after(p, i + len(p), text.startswith("(", i + len(p)))
        if p.endswith("a") and text.startswith(p, i):
            ligand_after(p, i + len(p) - 1, False, vowel_dropped=True)
    for lig in ligands:
        if text.startswith(lig, i):
            out.append((("", lig), i + len(lig)))
        if text.startswith(f"({lig})", i):
            out.append((("", lig), i + len(lig) + 2))
    for p in complex_prefixes:
        if text.startswith(p, i) and not text.startswith(p + "(", i):
            ligand_after(p, i + len(p), False)
    return out


@lru_cache(maxsize=4096)
def _ligand_terms_cached(text: str) -> tuple[tuple[str, str], ...]:
    """The ligand terms that make up ``text``: the first complete sequence, the
    terms at each place tried in the order ``_terms_at`` gives. Depth first with
    a stack of its own (a name may hold many terms), and a place from which no
    sequence completes is not tried twice."""
    path: list[tuple[str, str]] = []
    stack: list[tuple[int, list[tuple[tuple[str, str], int]], int]] = [(0, _terms_at(text, 0), 0)]
    dead: set[int] = set()
    while stack:
        start, options, tried = stack[-1]
        if start == len(text):
            return tuple(path)
        if tried == len(options) or start in dead:
            dead.add(start)
            stack.pop()
            if path:
                path.pop()
            continue
        stack[-1] = (start, options, tried + 1)
        term, end = options[tried]
        path.append(term)
        stack.append((end, _terms_at(text, end), 0))
    raise ValueError(text)


def _ligand_terms(text: str) -> list[tuple[str, str]]:
    """The ligand terms of ``text`` as (prefix, ligand name); ValueError when it is none."""
    return list(_ligand_terms_cached(text))


@cache
def _central_names() -> tuple[tuple[str, str, bool], ...]:
    """(name, symbol, anion) of the central atoms a coordination entity's name may
    end with, longest first: the -ate names of central atoms in anions
    (metal_anion_names.csv) and the names of the metals for cations and neutral
    entities."""
    _, back = _ate_names()
    names = {name: (symbol, True) for name, symbol in back.items()}
    for name, symbol in _element_names().items():
        if name not in names and element(symbol).is_metal:
            names[name] = (symbol, False)
    return tuple((name, *names[name]) for name in sorted(names, key=len, reverse=True))


@lru_cache(maxsize=4096)
def _complex_split(word: str) -> tuple[tuple[tuple[str, str], ...], str, str] | None:
    """(ligand terms, central-atom name, Stock number or '') of a coordination
    entity's name, or None: the longest central-atom name that ends the word
    and leaves ligand terms before it."""
    m = re.fullmatch(r"(.*?)(\((?:[ivx]+|0|\d[+-])\))?", word)
    assert m is not None
    body, state = m.group(1), m.group(2) or ""
    for name, _, _ in _central_names():
        if body.endswith(name) and len(body) > len(name):
            try:
                return _ligand_terms_cached(body[: -len(name)]), name, state
            except ValueError:
                continue
    return None


@lru_cache(maxsize=4096)
def _read_complex(word: str) -> tuple[Ion, tuple[str, ...]] | None:
    """A coordination entity named by the additive rules, as an Ion, or None."""
    if " " in word or len(word) < 6:
        return None
    split = _complex_split(word)
    if split is None:
        return None
    terms, name, state = split
    return _complex_from_parts(list(terms), name, state, word)


@lru_cache(maxsize=4096)
def _read_open_complex(word: str) -> tuple[tuple[Ion, tuple[str, ...]], ...]:
    """A coordination entity named without the oxidation state of a central
    atom that has several ('hexacyanoferrate'): one reading for each state,
    so that counts elsewhere in the name ('tripotassium hexacyanoferrate')
    settle it, and a name without counts is refused with the choices."""
    if " " in word or len(word) < 6:
        return ()
    split = _complex_split(word)
    if split is None or split[2]:
        return ()
    terms, metal_name, _ = split
    _, back = _ate_names()
    symbol = back.get(metal_name) or _element_names().get(metal_name)
    if symbol is None:
        return ()
    states = sorted({i.charge for i in _monatomic(symbol, +1)})
    if len(states) < 2:
        return ()
    out = []
    for ox in states:
        if ox not in _ROMAN:
            continue
        found = _complex_from_parts(terms, metal_name, f"({_ROMAN[ox].lower()})", word)
        if found is not None:
            out.append((found[0], (*found[1], f"'{word}' without the oxidation state of the central atom")))
    return tuple(out)


def _complex_from_parts(
    terms: list[tuple[str, str]], metal_name: str, state: str, word: str
) -> tuple[Ion, tuple[str, ...]] | None:
    by_name, _ = _ligands()
    _, back = _ate_names()
    forms: list[str] = []
    anion = False
    if metal_name in back:
        symbol = back[metal_name]
        anion = True
    elif metal_name in _element_names():
        symbol = _element_names()[metal_name]
    else:
        return None
    ligand_items: list[Item] = []
    ligand_charge = 0
    for prefix, lig in terms:
        f, charge, official = by_name[lig]
        n = _prefix_number(prefix)
        if lig != official.casefold():
            forms.append(f"older ligand name '{lig}' for {official}")
        ligand_charge += charge * n
        items = f.parts[0].items
        if len(items) == 1 and isinstance(items[0], Atom):
            ligand_items.append(Atom(items[0].symbol, items[0].count * n))
        else:
            ligand_items.append(Group(items, n, "("))
    if not state:
        # a central atom with one common charge needs no Stock number
        charges = [i.charge for i in _monatomic(symbol, +1)]
        if len(charges) != 1:
            return None
        ox = charges[0]
    elif state[1:-1] in _ROMAN_VALUES or state == "(0)":
        ox = _ROMAN_VALUES.get(state[1:-1], 0)
    else:
        total = int(state[1:-2]) * (1 if state[-2] == "+" else -1)
        ox = total - ligand_charge
    charge = ox + ligand_charge
    if charge == 0 or (charge < 0) != anion:
        return None
    group = Group((Atom(symbol, 1), *_ordered_ligands(ligand_items)), 1, "[")
    formula = Formula((_part((group,)),), 0, render_items((group,)))
    known = lookup(formula.counts, charge)
    if known is not None:
        return known, tuple(forms)
    try:
        name = complex_name(symbol, ligand_items, charge)
    except NameReadError:  # an entity cellchem cannot name (more ligands than a prefix counts) is not read
        return None
    return Ion(formula, charge, name, "", (), "IUPAC 2005 IR-9 additive name"), tuple(forms)


def _part(items: tuple[Item, ...]) -> Part:
    return Part(items, 1)


def _ligand_formula_key(item: Item) -> str:
    return render_items((Group(item.items, 1, "("),)) if isinstance(item, Group) else item.symbol


def _ordered_ligands(items: list[Item]) -> list[Item]:
    """Ligands in a formula in alphabetical order of their formulas (IUPAC 2005 IR-9.2.3.1):
    [CoCl(NH3)5]."""
    return sorted(items, key=_ligand_formula_key)


def _ligand_name_of(item: Item) -> tuple[str, int, int] | None:
    """(ligand name, charge, how many) of one ligand item."""
    _, by_key = _ligands()
    if isinstance(item, Group):
        inner = Formula((_part(item.items),), 0)
        found = by_key.get(counts_key(inner.counts))
        n = item.count
    else:
        found = by_key.get(counts_key({item.symbol: 1}))
        n = item.count
        if found is None and item.count > 1:
            found = by_key.get(counts_key({item.symbol: item.count}))
            n = 1
    if found is None:
        return None
    return found[0], found[1], n


def complex_name(symbol: str, ligand_items: list[Item], charge: int) -> str:
    """The additive name of a coordination entity (IUPAC 2005 IR-9.2): ligands
    in alphabetical order with multiplicative prefixes, then the central atom
    (its '-ate' name in an anion) and its oxidation state as a Stock number
    where the central atom has more than one common charge or is a d-block or
    heavy p-block metal (silver too, diamminesilver(I), as stores write it;
    not Sc, Y, Zn, Cd, whose one charge IUPAC 2005 IR-9.2.2.4 lets go unsaid)."""
    simple, complex_ = _prefixes()
    parts = []
    ligand_charge = 0
    for item in ligand_items:
        found = _ligand_name_of(item)
        if found is None:
            raise NameReadError(f"no ligand in the ligand table matches '{render_items((item,))}'")
        name, lig_charge, n = found
        ligand_charge += lig_charge * n
        parts.append((name, n))
    merged: dict[str, int] = {}
    for name, n in parts:
        # the donor-atom mark of an ambidentate ligand is left out in writing
        # (hexanitritocobaltate(III), as stores name it)
        name = re.sub(r"-(?:kappa)?[A-Z][a-z]?$", "", name)
        merged[name] = merged.get(name, 0) + n
    words = []
    for name in sorted(merged, key=lambda x: re.sub(r"[^a-z]", "", x)):
        n = merged[name]
        needs_complex = bool(re.search(r"[\d,()\- ]", name)) or name.startswith(("di", "tri", "tetra"))
        prefixes = complex_ if needs_complex else simple
        if n != 1 and n not in prefixes:
            entity = render_items((Group((Atom(symbol, 1), *ligand_items), 1, "["),))
            raise NameReadError(
                f"'{entity}' cannot be named: the prefix table has no multiplicative prefix for {n}"
                f" '{name}' ligands (it counts up to {max(prefixes)})"
            )
        if n == 1:
            words.append(f"({name})" if needs_complex and re.search(r"[\d,\- ]", name) else name)
        elif needs_complex:
            words.append(f"{complex_[n]}({name})")
        else:
            words.append(f"{simple[n]}{name}")
    ox = charge - ligand_charge
    el = element(symbol)
    if charge < 0:
        forward, _ = _ate_names()
        centre = forward.get(symbol)
        if centre is None:
            raise NameReadError(
                f"no anion name is known for {el.name} as the central atom of a complex anion"
            )
    else:
        centre = el.name
    charges = [i.charge for i in _monatomic(symbol, +1)]
    d_block = (el.group is not None and 3 <= el.group <= 12) or symbol in ("Sn", "Sb", "Pb", "Tl", "Bi")
    if len(charges) > 1 or (d_block and symbol not in ("Sc", "Y", "Zn", "Cd")) or ox not in charges:
        centre += f"({_ROMAN.get(ox, str(ox))})" if ox > 0 else f"({ox})"
    return "".join(words) + centre


def _split_entity(ion: Ion) -> set[tuple[str, int]] | None:
    """A coordination entity [M(L)n] as its metal ion and ligand anions, or None."""
    items = ion.formula.parts[0].items
    if not ion.is_complex and not (
        len(items) >= 2 and isinstance(items[0], Atom) and element(items[0].symbol).is_metal
    ):
        return None
    if ion.is_complex:
        group = items[0]
        assert isinstance(group, Group)
        items = group.items
    metal = items[0]
    if not isinstance(metal, Atom) or metal.count != 1 or not element(metal.symbol).is_metal:
        return None
    out: set[tuple[str, int]] = set()
    ligand_charge = 0
    for item in items[1:]:
        inner = item.items if isinstance(item, Group) else (Atom(item.symbol, 1),)
        n = item.count
        counts = Formula((_part(inner),), 0).counts
        anion = next(
            (i for i in catalog() if i.charge < 0 and counts_key(i.formula.counts) == counts_key(counts)),
            None,
        )
        if anion is None:
            return None
        out.add((anion.text, anion.charge))
        ligand_charge += anion.charge * n
    state = ion.charge - ligand_charge
    cation = next((i for i in _monatomic(metal.symbol, +1) if i.charge == state), None)
    if cation is None:
        return None
    out.add((cation.text, cation.charge))
    return out
