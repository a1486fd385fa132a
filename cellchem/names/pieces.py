"""The lexicon of a name: its words read as ions, elements, oxo groups, open
metals (a charge not given) and coordination entities, with or without a
multiplicative prefix, and every way a name's words split into such pieces.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import cache, lru_cache

from ..charge import oxidation_state
from ..elements import element
from ..errors import CellchemError
from ..formula import Formula
from ..ions import Ion, catalog
from ..reading import canonical
from ..solver import rule_states
from .complexes import _ligand_terms, _read_complex, _read_open_complex
from .folding import _ROMAN_VALUES
from .tables import (
    _ate_names,
    _complex_prefix_values,
    _element_names,
    _ion_names,
    _oxo_groups,
    _prefix_values,
)


@dataclass(frozen=True)
class _Piece:
    """A word or words of a name, read: an ion, an element, or an open-charge metal."""

    role: str  # 'cation', 'anion', 'element', 'open'
    ion: Ion | None
    symbol: str = ""
    count: int | None = None  # from a multiplicative prefix
    forms: tuple[str, ...] = ()
    text: str = ""
    stock: tuple[int, ...] = ()  # mixed-valence Stock numbers


def _strip_prefix(word: str) -> list[tuple[int, str]]:
    """Readings of a word as multiplicative prefix + rest, with elision
    ('tetroxide' = tetra + oxide, 'monoxide' = mono + oxide)."""
    out = []
    for prefix, n in _prefix_values():
        if word.startswith(prefix) and len(word) > len(prefix) + 2:
            out.append((n, word[len(prefix) :]))
        if prefix[-1] in "ao" and word.startswith(prefix[:-1]) and len(word) > len(prefix) + 1:
            rest = word[len(prefix) - 1 :]
            if rest[0] in "aeiou":
                out.append((n, rest))
    return out


def _lookup_piece(phrase: str) -> list[_Piece]:
    """Every reading of a phrase (one or more words) as an ion, element or open metal."""
    pieces: list[_Piece] = []
    entries = _ion_names().get(phrase, [])
    if len(entries) > 1 and any(form == "" for _, form in entries):
        # a phrase that is one ion's own name and another's other name means
        # the first ('carbide' is C4-; CaC2 is read from its established name)
        entries = [(ion, form) for ion, form in entries if form == ""]
    for ion, form in entries:
        role = "cation" if ion.charge > 0 else "anion"
        pieces.append(_Piece(role, ion, forms=(form,) if form else (), text=phrase))
    group = _oxo_groups()[0].get(phrase)
    if group is not None and not pieces:
        pieces.append(_Piece("cation", group, forms=(f"oxo group '{phrase}'",), text=phrase))
    if not pieces:
        oxo = _oxoanion_by_state(phrase)
        if oxo is not None:
            pieces.append(_Piece("anion", oxo[0], forms=oxo[1], text=phrase))
    if not pieces:
        complex_ion = _read_complex(phrase)
        if complex_ion is None and " " in phrase and len(phrase.split()) <= 3:
            # 'hexammine cobalt(III)': the ligands written apart from the metal
            head = "".join(phrase.split()[:-1])
            try:
                _ligand_terms(head)
            except ValueError:
                pass
            else:
                complex_ion = _read_complex(phrase.replace(" ", ""))
        if complex_ion is not None:
            ion, form = complex_ion
            pieces.append(_Piece("cation" if ion.charge > 0 else "anion", ion, forms=form, text=phrase))
        else:
            for ion, form in _read_open_complex(phrase):
                pieces.append(_Piece("cation" if ion.charge > 0 else "anion", ion, forms=form, text=phrase))
    m = re.fullmatch(r"([a-z]+)\(((?:[ivx]+,)+[ivx]+)\)", phrase)
    if m and m.group(1) in _element_names():
        values = tuple(_ROMAN_VALUES.get(v, 0) for v in m.group(2).split(","))
        if all(values):
            pieces.append(_Piece("open", None, _element_names()[m.group(1)], stock=values, text=phrase))
    sym = _element_names().get(phrase)
    if sym is not None:
        cations = [ion for ion in catalog() if ion.charge > 0 and tuple(ion.formula.counts) == (sym,)]
        if len(cations) > 1 or not cations:
            pieces.append(_Piece("open" if cations else "element", None, sym, text=phrase))
        elif not element(sym).is_metal and not pieces:
            pieces.append(_Piece("element", None, sym, text=phrase))
    return pieces


def _central_state(ion: Ion) -> tuple[str, int] | None:
    """The central atom of an anion (its metal, else its one element besides O
    and H) and that atom's oxidation state, or None."""
    symbols_ = list(ion.formula.counts)
    metals = [x for x in symbols_ if element(x).is_metal]
    others = [x for x in symbols_ if x not in ("O", "H")]
    centre = metals[0] if len(metals) == 1 else (others[0] if len(others) == 1 else None)
    if centre is None:
        return None
    try:
        state = oxidation_state(canonical(Formula(ion.formula.parts, ion.charge)), centre)
    except CellchemError:
        return None
    return (centre, state) if isinstance(state, int) else None


@lru_cache(maxsize=4096)
def _oxoanion_by_state(phrase: str) -> tuple[Ion, tuple[str, ...]] | None:
    """An anion named with its central atom's oxidation state. A known name
    with a Stock number that agrees with it is that ion (ferricyanide(III),
    hexafluoroaluminate(III), sulfate(VI)); one that does not agree is never
    read past its words. An oxoanion's '-ate' stem with another oxidation
    state names the oxoanion of that state, as schools and stores write it:
    manganate(VII) is MnO4-, sulfate(IV) is SO3 2-, chlorate(I) is ClO-
    (IUPAC 2005 IR-5.4.2.2 gives the oxidation number in Roman numerals; the
    use with -ate names is common practice)."""
    m = re.fullmatch(r"([a-z]+)\(([ivx]+)\)", phrase)
    if not m or m.group(2) not in _ROMAN_VALUES:
        return None
    base, state = m.group(1), _ROMAN_VALUES[m.group(2)]
    named = [ion for ion, _ in _ion_names().get(base, []) if ion.charge < 0]
    for ion in named:
        central = _central_state(ion)
        if central is not None and central[1] == state:
            return ion, (f"Stock number after '{base}'",)
    plain_oxo = all("O" in i.formula.counts and len(set(i.formula.counts) - {"O"}) == 1 for i in named)
    if not base.endswith("ate") or not plain_oxo:
        return None  # only a plain oxoanion stem names another oxidation state
    stem_symbol = None
    _, back = _ate_names()
    stem = re.sub(r"^(?:di|tri|tetra|per|hypo)", "", base)
    stem_symbol = back.get(stem) or back.get(base)
    if stem_symbol is None and named:
        stem_symbol = next((x for x in named[0].formula.counts if x != "O"), None)
    if stem_symbol is None:
        return None
    candidates = []
    for ion in catalog():
        counts = ion.formula.counts
        if ion.charge >= 0 or set(counts) != {stem_symbol, "O"}:
            continue
        states = rule_states(counts, ion.charge)
        if states is not None and states.get(stem_symbol) == state:
            candidates.append(ion)
    exact = [ion for ion in candidates if ion in named]
    if len(exact) == 1:
        return exact[0], ()
    single = [ion for ion in candidates if ion.formula.counts[stem_symbol] == 1]
    if len(single) == 1:
        return single[0], (f"oxidation-state name '{phrase}' for {single[0].name}",)
    return None


def _pieces_for(phrase: str) -> list[_Piece]:
    found = _lookup_piece(phrase)
    if found:
        if " " not in phrase and re.match(r"(?:di|tri|tetra|penta|hexa)", phrase):
            return found + _prefixed_pieces(phrase)
        return found
    m = re.fullmatch(r"([a-z]+?kis|bis|tris)\((.+)\)", phrase)
    if m and m.group(1) in _complex_prefix_values():
        n = _complex_prefix_values()[m.group(1)]
        for piece in _lookup_piece(m.group(2)):
            found.append(_Piece(piece.role, piece.ion, piece.symbol, n, piece.forms, phrase, piece.stock))
        return found
    if " " in phrase:
        return found
    return found + _prefixed_pieces(phrase)


def _prefixed_pieces(phrase: str) -> list[_Piece]:
    """Readings of one word as a multiplicative prefix and a name:
    'disulfide' as two sulfide (CS2) as well as the disulfide ion (FeS2)."""
    found: list[_Piece] = []
    for n, rest in _strip_prefix(phrase):
        for piece in _lookup_piece(rest):
            if piece.ion is not None and piece.ion.is_complex:
                continue
            found.append(_Piece(piece.role, piece.ion, piece.symbol, n, piece.forms, phrase, piece.stock))
    return found


def _segment(words: list[str]) -> list[list[_Piece]]:
    """All readings of a word list as a sequence of pieces (longest phrases first)."""
    results: list[list[_Piece]] = []

    @cache
    def at(i: int) -> tuple[tuple[_Piece, ...], ...]:
        if i == len(words):
            return ((),)
        out: list[tuple[_Piece, ...]] = []
        for j in range(min(len(words), i + 5), i, -1):
            phrase = " ".join(words[i:j])
            for piece in _pieces_for(phrase):
                for rest in at(j):
                    out.append((piece, *rest))
                    if len(out) > 64:
                        return tuple(out)
        return tuple(out)

    for reading in at(0):
        results.append(list(reading))
    return results
