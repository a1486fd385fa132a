"""The formula a reading of a name's words fixes. Never an invented ratio:
counts come from multiplicative prefixes (a missing one is 1, IUPAC 2005
IR-5.4.2.1), from the charges of exactly one cation and one anion, or from a
row of the established tables; a basicity word or the count on the cation
says how many acid hydrogens are replaced.
"""

from __future__ import annotations

from itertools import product
from math import gcd

from ..charge import charge_balance
from ..elements import element
from ..errors import CellchemError, NameReadError
from ..formula import Formula, Item, Number
from ..ions import Ion
from ..reading import parse_formula
from .compounds import _by_ion_set
from .folding import _ROMAN
from .pieces import _Piece
from .results import Component, NameReading, Qualifier, _components_of, _unknown
from .salts import _acid_base, _assemble, _protonated
from .tables import _DIATOMIC, _element_names, _ion_names, _metal_cations, _monatomic


def _build(
    text: str,
    pieces: list[_Piece],
    water: Number | str | None,
    qualifiers: list[Qualifier],
    forms: list[str],
    inverted: bool,
) -> NameReading:
    forms = list(forms)
    if inverted:
        forms.append("catalogue inversion")
    for p in pieces:
        forms.extend(p.forms)
    roles = [p.role for p in pieces]
    named = [p.ion for p in pieces if p.ion is not None]
    if len(named) != len(set(named)):
        raise _unknown(text, "it names the same ion twice")
    if "element" not in roles and any(p.count is not None and p.text in _ion_names() for p in pieces):
        # 'dihydrogenborate' names the ion H2BO3-, not two hydrogenborate ions: a
        # prefix is read off an ion's own name only in a molecular name ('carbon disulfide')
        raise _unknown(text, "a word that names an ion is not read as a prefix and another ion")
    basicity = [q.text for q in qualifiers if q.kind == "basicity"]
    if basicity:
        pieces = _apply_basicity(text, pieces, basicity[0])
    # a single element: the element itself
    if (
        len(pieces) == 1
        and pieces[0].role in ("element", "open")
        and pieces[0].count is None
        and not pieces[0].stock
    ):
        return _element_reading(text, pieces[0], water, qualifiers, forms)
    if (
        len(pieces) == 1
        and pieces[0].ion is not None
        and pieces[0].ion.is_monatomic
        and pieces[0].ion.charge > 0
    ):
        sym = pieces[0].ion.text
        if pieces[0].ion.name == element(sym).name or pieces[0].text in _element_names():
            return _element_reading(text, _Piece("element", None, sym), water, qualifiers, forms)
    # cations before anions
    seen_anion = False
    for p in pieces:
        if p.role == "anion":
            seen_anion = True
        elif seen_anion and p.role in ("cation", "open"):
            raise _unknown(text, "a cation name follows an anion name (expected cations first)")
    if not any(r in ("cation", "open", "element") for r in roles):
        raise _unknown(text, "it names anions but no cation")
    if "anion" not in roles:
        if all(r == "element" for r in roles) or any(r == "element" for r in roles):
            raise _unknown(text, "it names no anion")
        raise _unknown(text, "it names cations but no anion")
    opens = [p for p in pieces if p.role == "open" and not p.stock]
    counted = any(p.count for p in pieces)
    established = None
    if not counted and _species(pieces) > 2:
        established = _ratio_from_table(text, pieces)
        forms.append("established compound")
    elif opens and not counted:
        others = [p for p in pieces if p is not opens[0]]
        candidates = _candidates(opens[0].symbol, others)
        if water not in ("", 0):
            # the name's hydrate word holds for every candidate ('nickel sulfate 6-hydrate')
            candidates = [(n, parse_formula(fx).with_water(water).text()) for n, fx in candidates]  # type: ignore[arg-type]
        name = element(opens[0].symbol).name
        listing = "; ".join(f"{n} {rest_name(others)}: {fx}" for n, fx in candidates)
        raise NameReadError(
            f"'{text}' leaves the charge of {name} open; it may be {listing}"
            f" (give a Stock number such as '{candidates[0][0] if candidates else name + '(II)'}')",
            text=text,
            choices=tuple(fx for _, fx in candidates),
            reason="open-charge",
        )
    f = established if established is not None else _formula_of(pieces)
    if water not in ("", 0, None):
        f = f.with_water(water)  # type: ignore[arg-type]
    elif water is None:
        f = f.with_water(None)
    cations, anions, elements_ = _components_of(f)
    kind = "molecular" if any(p.role == "element" for p in pieces) else "salt"
    if kind == "salt" and cations and all(c.formula == "H" for c in cations):
        kind = "acid"
    return NameReading(
        text=text,
        compound=" ".join(p.text for p in pieces if p.text) or text,
        kind=kind,
        formula=f.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=f.water,
        qualifiers=tuple(qualifiers),
        forms=tuple(dict.fromkeys(forms)),
    )


def _candidates(symbol: str, others: list[_Piece]) -> list[tuple[str, str]]:
    out = []
    for ion in _metal_cations(symbol):
        try:
            pieces = [_Piece("cation", ion), *others]
            formula = _formula_of(pieces)
            out.append((ion.name, formula.text()))
        except CellchemError:
            continue
    return out


def _species(pieces: list[_Piece]) -> int:
    """How many kinds of ion a reading names (iron(II,III) counts two)."""
    return sum(len(p.stock) if p.stock else 1 for p in pieces)


def _ratio_from_table(text: str, pieces: list[_Piece]) -> Formula:
    """A name of three or more ions without multiplicative prefixes does not
    state their ratio ('ammonium iron(II) sulfate', 'sodium aluminium
    fluoride'): the compound is the one the tables of established compounds
    hold with exactly those ions, or the name is refused, listing the
    candidates the tables know."""
    options: list[list[tuple[str, int]]] = [[]]
    for p in pieces:
        if p.role == "element":
            raise _unknown(text, "it names an element beside ions")
        if p.role == "open" and p.stock:
            ions = [(p.symbol, ox) for ox in p.stock]
            options = [o + ions for o in options]
        elif p.role == "open":
            options = [o + [(ion.text, ion.charge)] for o in options for ion in _metal_cations(p.symbol)]
        else:
            assert p.ion is not None
            options = [o + [(p.ion.text, p.ion.charge)] for o in options]
    found: list[str] = []
    for option in options:
        for formula in _by_ion_set().get(frozenset(option), ()):
            if formula not in found:
                found.append(formula)
    names = ", ".join(p.ion.name if p.ion else p.text for p in pieces)
    if len(found) == 1:
        return parse_formula(found[0])
    if found:
        raise NameReadError(
            f"'{text}' names {names} but not their ratio; the compounds of these ions in the trade are"
            f" {' or '.join(found)}: write the formula, or the name of one of them",
            text=text,
            choices=tuple(found),
            reason="may-be",
        )
    raise NameReadError(
        f"'{text}' names {names} but not their ratio, and no established compound of these ions is"
        " known; write the formula, or give the counts with prefixes (such as 'aluminium potassium"
        " bis(sulfate)')",
        text=text,
        reason="ratio",
        ions=tuple(sorted({(i, c) for o in options for i, c in o})),
    )


def rest_name(pieces: list[_Piece]) -> str:
    return " ".join(p.ion.name if p.ion else element(p.symbol).name for p in pieces)


_BASICITY = {"monobasic": 1, "dibasic": 2, "tribasic": 3, "tetrabasic": 4}


def _apply_basicity(text: str, pieces: list[_Piece], word: str) -> list[_Piece]:
    """'sodium phosphate, dibasic' is Na2HPO4, 'sodium citrate tribasic'
    Na3C6H5O7, 'potassium phthalate monobasic' KHC8H4O4 (common practice):
    the word says how many of the acid's hydrogens the cations replace, for
    the anion of any polyprotic acid."""
    replaced = _BASICITY[word]
    out = []
    done = False
    for p in pieces:
        found = _acid_base(p.ion) if p.role == "anion" and p.ion is not None else None
        if found is None:
            out.append(p)
            continue
        base, held = found
        ion = _protonated(base, replaced)
        if ion is None:
            raise NameReadError(
                f"'{text}': '{word}' does not fit {base.name}, whose acid has {-base.charge} acid hydrogens"
                if replaced > -base.charge
                else f"'{text}': no catalog ion is {base.name} with"
                f" {-base.charge - replaced} of its acid hydrogens left ('{word}')",
                text=text,
                reason="basicity",
            )
        if held and ion != p.ion:
            raise NameReadError(
                f"'{text}' says both {p.ion.name} and '{word}' ({ion.name}); they disagree",  # type: ignore[union-attr]
                text=text,
                reason="basicity",
            )
        out.append(_Piece("anion", ion, forms=(f"'{word}' for {ion.name}",), text=p.text))
        done = True
    if not done:
        raise NameReadError(
            f"'{text}': '{word}' names no anion of a polyprotic acid in the name",
            text=text,
            reason="basicity",
        )
    return out


def _element_reading(
    text: str, piece: _Piece, water: Number | str | None, qualifiers: list[Qualifier], forms: list[str]
) -> NameReading:
    sym = piece.symbol
    n = 2 if sym in _DIATOMIC else 1
    f = parse_formula(sym + (str(n) if n > 1 else ""))
    return NameReading(
        text=text,
        compound=element(sym).name,
        kind="element",
        formula=f.text(),
        elements=(Component("element", element(sym).name, sym, 0, n),),
        water=0,
        qualifiers=tuple(qualifiers),
        forms=tuple(forms),
    )


def _formula_of(pieces: list[_Piece]) -> Formula:
    """The formula of a reading: counts from prefixes where given, else the
    lowest whole-number ratio that balances the charges."""
    species: list[tuple[str, Item | None, int | None, int | None, Ion | None]] = []
    for p in pieces:
        if p.role == "element":
            species.append(("element", None, None, p.count, None))
        elif p.role == "open" and p.stock:
            for ox in p.stock:
                ion = next((i for i in _monatomic(p.symbol, +1) if i.charge == ox), None)
                if ion is None:
                    raise NameReadError(
                        f"{element(p.symbol).name} has no {_ROMAN.get(ox, ox)} ion in the catalog"
                    )
                species.append(("cation", None, ox, None, ion))
        elif p.role == "open":
            species.append(("open", None, None, p.count, None))
        else:
            assert p.ion is not None
            species.append((p.role, None, p.ion.charge, p.count, p.ion))
    # a molecular binary compound: element + prefixed '-ide' anion, as named
    if any(s[0] == "element" for s in species):
        return _molecular_formula(pieces)
    # explicit counts on every piece, or a single open metal fixed by them
    counts = [s[3] for s in species]
    if any(c is not None for c in counts):
        fixed = [c if c is not None else 1 for c in counts]
        total = 0
        open_index = None
        for (role, _, charge, _, _), n in zip(species, fixed):
            if role == "open":
                open_index = fixed.index(n)
                continue
            total += (charge or 0) * n
        if open_index is not None:
            p = pieces[open_index]
            n = fixed[open_index]
            ox = -total // n if not (-total) % n else None
            ion = next((i for i in _monatomic(p.symbol, +1) if i.charge == ox), None)
            if ion is None:
                # mixed valence: the counts fix the composition ('triiron
                # tetraoxide' is Fe3O4) when the element's charges can make it up
                split = _mixed_valence(p.symbol, n, -total)
                if split is None:
                    raise NameReadError(
                        f"the counts named need {n} {element(p.symbol).name} atoms to carry {-total:+d},"
                        " which no mix of its catalog charges gives"
                    )
                rest = [(s[4], k) for j, (s, k) in enumerate(zip(species, fixed)) if j != open_index]
                return _assemble(split + rest)  # type: ignore[arg-type]
            species[open_index] = ("cation", None, ox, n, ion)
        elif total != 0:
            protonated = _protonate_by_counts(pieces, species, fixed, total)
            if protonated is None:
                raise NameReadError("the counts named do not balance the charges of the ions")
            species = protonated
        ions = [(s[4], n) for s, n in zip(species, fixed)]
    else:
        ions = _lowest_ratio([s[4] for s in species])  # type: ignore[misc]
    return _assemble(ions)


def _mixed_valence(symbol: str, atoms: int, charge: int) -> list[tuple[Ion, int]] | None:
    """One way for ``atoms`` atoms of an element to carry ``charge`` with its
    catalog charges, or None."""
    cations = [i for i in _monatomic(symbol, +1)]
    for combo in product(range(atoms + 1), repeat=len(cations)):
        if sum(combo) == atoms and sum(c.charge * k for c, k in zip(cations, combo)) == charge:
            return [(c, k) for c, k in zip(cations, combo) if k]
    return None


def _protonate_by_counts(pieces: list[_Piece], species: list, fixed: list[int], total: int) -> list | None:
    """'disodium phosphate' is Na2HPO4, 'monosodium citrate' NaH2C6H5O7,
    'disodium EDTA' Na2H2edta (common practice): when the counted cations
    carry less charge than one anion of a polyprotic acid, the anion keeps the
    rest as acid hydrogens. Only for one such anion, named without a count."""
    anions = [j for j, s in enumerate(species) if s[0] == "anion"]
    if len(anions) != 1 or pieces[anions[0]].count is not None:
        return None
    j = anions[0]
    ion = species[j][4]
    found = _acid_base(ion) if ion is not None else None
    if found is None or found[1]:
        return None
    base, _ = found
    carried = total - base.charge  # the cations' charge
    target = _protonated(base, carried)
    if target is None or target == base:
        return None
    out = list(species)
    out[j] = ("anion", None, target.charge, None, target)
    return out


def _lowest_ratio(ions: list[Ion]) -> list[tuple[Ion, int]]:
    if len(ions) == 2:
        a, b = ions
        g = gcd(a.charge, -b.charge)
        return [(a, -b.charge // g), (b, a.charge // g)]
    best = None
    ranges = [range(1, 13)] * len(ions)
    for combo in product(*ranges):
        if sum(i.charge * n for i, n in zip(ions, combo)) != 0:
            continue
        key = sum(combo)
        if best is None or key < best[0]:
            best = (key, [combo])
        elif key == best[0]:
            best[1].append(combo)
    if best is None:
        raise NameReadError("no whole-number ratio of these ions is neutral")
    if len(best[1]) > 1:
        raise NameReadError("more than one ratio of these ions is neutral; name the counts with prefixes")
    return list(zip(ions, best[1][0]))


# Non-metals with one oxidation state in their binary compounds, so that a name
# without prefixes fixes the ratio ('silicon nitride' is Si3N4, 'boron nitride'
# BN): common practice. Any other ('carbon oxide', 'nitrogen oxide', 'sulfur
# chloride') needs prefixes, and is refused without them.
_ONE_STATE = {"H": 1, "B": 3, "Si": 4}


def _molecular_formula(pieces: list[_Piece]) -> Formula:
    if len(pieces) == 2 and not any(p.count for p in pieces) and pieces[0].role == "element":
        first, second = pieces
        state = _ONE_STATE.get(first.symbol)
        anion = second.ion
        if state is None or anion is None or not anion.is_monatomic:
            name = element(first.symbol).name
            raise NameReadError(
                f"the name gives no counts, and {name} has more than one oxidation state in its molecular"
                " compounds; give the counts with prefixes (as in carbon monoxide, carbon dioxide)",
                reason="ratio",
            )
        g = gcd(state, -anion.charge)
        a, b = -anion.charge // g, state // g
        return parse_formula(f"{first.symbol}{a if a > 1 else ''}{anion.text}{b if b > 1 else ''}")
    out = []
    for i, p in enumerate(pieces):
        n = p.count or 1
        if p.role == "element":
            sym = p.symbol
        elif p.ion is not None and p.ion.is_monatomic and p.ion.charge < 0 and i > 0:
            sym = p.ion.text
        elif p.ion is not None and p.ion.is_monatomic and p.ion.charge > 0 and i == 0:
            sym = p.ion.text
        else:
            raise NameReadError(
                "a molecular name is an element and '-ide' names with multiplicative prefixes"
            )
        out.append(sym + (str(n) if n > 1 else ""))
    f = parse_formula("".join(out))
    if not charge_balance(f).balanced:
        raise NameReadError(f"{f.text()} does not balance: " + charge_balance(f).explanation)
    return f
