"""Reading a name: name -> formula.

The text is folded, a formula or a name in brackets set aside as a second
witness, qualifiers set aside, then the whole-name tables are tried (trivial,
established, acids), then a catalogue or registry inversion ('acetic acid,
sodium salt'), then every split of the words into pieces, and the reading of
fewest pieces is kept. A refusal says why (``NameReadError.reason``).

A name is at most ``MAX_NAME_LENGTH`` characters long: a longer text is
refused before it is read. The splitting of words into pieces recurses once
per word, and no name a store uses comes near the limit.
"""

from __future__ import annotations

import re
from dataclasses import replace
from functools import lru_cache

from ..charge import charge_balance
from ..errors import CellchemError, NameReadError
from ..formula import Formula, Number, too_long
from ..ions import Ion, counts_key
from ..reading import parse_formula
from .building import _build
from .compounds import _crystals, _established_reading, same_substance
from .folding import _fold, _spelling_forms, _stock
from .pieces import _pieces_for, _segment
from .qualifiers import _CONCENTRATION, _CRYSTAL_WORDS, _PURITY, _as_written, _set_aside, _take
from .results import NameReading, Qualifier, _components_of, _kind_of, _rewet, _unknown, _whole_reading
from .salts import _canonical, _protonated
from .tables import (
    MAY_BE,
    _acid_anions,
    _acids,
    _allotropes,
    _ambiguous_acids,
    _established,
    _ion_names,
    _named,
    _prefixes,
    _trivial,
)

# Characters; a longer text is refused before it is read. The longest name of
# the substance table is 428 characters (a registry name of an organic
# compound); names on store labels and in inventories are far shorter.
MAX_NAME_LENGTH = 500


def read_name(name: str) -> NameReading:
    """The analysis of a name: ions with charges and counts, water, qualifiers,
    and the legacy or regional forms used.

    Args:
        name: a name as found in a file, e.g. ``'Copper (II) Sulphate, 5-hydrate,
            AR, 99.5%'`` or ``'ferric chloride hexahydrate'``.

    Returns:
        A NameReading.

    Raises:
        CellchemError: (a NameReadError) the name leaves a metal's charge open
            (the message lists the candidates with their formulas), is not a
            name cellchem knows, or is longer than ``MAX_NAME_LENGTH`` (500)
            characters (``reason`` 'too-long').

    >>> r = read_name("Copper (II) Sulphate, 5-hydrate, AR")
    >>> r.formula, [q.text for q in r.qualifiers]
    ('CuSO4·5H2O', ['5-hydrate', 'AR'])
    """
    if not isinstance(name, str) or not name.strip():
        raise NameReadError("no name given (the text is empty)", text=str(name))
    long = too_long(name, "a name", MAX_NAME_LENGTH)
    if long:  # refused before the memory of readings keeps it
        raise NameReadError(long, text=name[:MAX_NAME_LENGTH], reason="too-long")
    return _read_name(name)


def formula_from_name(name: str) -> str:
    """The canonical formula of a name.

    >>> formula_from_name("aluminium potassium sulfate dodecahydrate")
    'AlK(SO4)2·12H2O'
    >>> formula_from_name("ferric chloride")
    'FeCl3'
    """
    return read_name(name).formula


def name_core(name: str) -> tuple[str, Number | str | None]:
    """The words of a name left when its grade, form, purity, strength and hydrate
    words are set aside (folded as ``read_name`` folds them), and the water the name
    states: a count, None for an unknown count, '' when it says none.

    >>> name_core("Ethanol, absolute, AR 99.8%")
    ('ethanol', '')
    >>> name_core("Citric acid monohydrate, ACS reagent")
    ('citric acid', 1)
    """
    plain_text, _ = _bracketed_formulas(name.strip())
    folded, _ = _bracketed_names(_fold(plain_text))
    folded, _ = _stock(folded)
    rest, _, water = _set_aside(folded)
    rest = re.sub(r"\s*,(?:\s*,)*\s*", ", ", " ".join(rest.split()))
    return rest.strip(" ,;"), water


@lru_cache(maxsize=32768)
def _read_name(name: str) -> NameReading:
    text = name.strip()
    forms = _spelling_forms(text)
    plain_text, formulas = _bracketed_formulas(text)
    folded, synonyms = _bracketed_names(_fold(plain_text))
    synonyms += formulas
    folded, stock_forms = _stock(folded)
    forms.extend(stock_forms)
    rest, qualifiers, water = _set_aside(folded)
    qualifiers = [_as_written(q, text) for q in qualifiers] + [Qualifier("synonym", n) for n, _ in synonyms]
    if not rest:
        raise _unknown(text, "only qualifiers were found (" + ", ".join(q.text for q in qualifiers) + ")")
    try:
        reading = _read_rest(text, folded, rest, qualifiers, water, forms)
    except NameReadError as exc:
        chosen = _chosen_by_synonym(text, exc, synonyms)
        if chosen is None:
            raise
        reading = _whole_reading(
            text, rest, "salt", chosen, water, qualifiers, [*forms, "the name in brackets"]
        )
        reading = _with_kind(reading)
    reading = _agree_with_synonyms(text, reading, synonyms)
    _check_colours(text, reading)
    if water == "" and any(q.kind == "form" and q.text.casefold() in _CRYSTAL_WORDS for q in qualifiers):
        reading = _crystals(reading)
    return reading


def _bracketed_names(folded: str) -> tuple[str, list[tuple[str, NameReading]]]:
    """Set aside a name written in brackets after another ('magnesium sulfate
    heptahydrate (Epsom salt)', 'sodium tetraborate (borax)') when it reads as
    a compound on its own; brackets that do not read stay in the text."""
    found: list[tuple[str, NameReading]] = []

    def aside(m: re.Match[str]) -> str:
        inner = m.group(1).strip()
        if not re.search(r"[a-z]{3}", inner) or re.fullmatch(r"[ivx,\s]+|[\d\s+-]+", inner):
            return m.group(0)
        try:
            reading = _read_name(inner)
        except CellchemError:
            return m.group(0)
        found.append((inner, reading))
        return " "

    out = re.sub(r"(?<=\s)\(([^()]*(?:\([ivx,]+\)[^()]*)*)\)(?=\s|,|$)", aside, folded)
    out = re.sub(r'(?<![\w])"([^"]+)"(?![\w])', aside, out)  # a quoted name: '"sugar of lead"'
    return out, found


def _bracketed_formulas(text: str) -> tuple[str, list[tuple[str, NameReading]]]:
    """Set aside a formula written in brackets after a name, as catalogues print
    it ('Copper oxide (CuO)', 'Iron chloride (FeCl3)'): it stands beside the
    name as a second witness of the compound. Roman numerals are Stock numbers,
    not formulas."""
    found: list[tuple[str, NameReading]] = []

    def aside(m: re.Match[str]) -> str:
        inner = m.group(1).strip()
        if re.fullmatch(r"[IVX]+(?:,[IVX]+)*", inner) or not re.search(r"[A-Z]", inner):
            return m.group(0)
        try:
            f = parse_formula(inner)
        except CellchemError:
            return m.group(0)
        if f.charge or len(f.counts) < 2:
            return m.group(0)
        found.append(
            (inner, _whole_reading(inner, inner, _kind_of(f.anhydrous()), f, "", [], ["formula in brackets"]))
        )
        return " "

    out = re.sub(r"(?<=[\w)\]])\s*\(([A-Za-z0-9·.\[\]() ]+?)\)(?=\s|,|;|$)", aside, text)
    return out, found


def _same_dry(a: Formula, b: Formula) -> bool:
    return counts_key(a.anhydrous().counts) == counts_key(b.anhydrous().counts)


def _chosen_by_synonym(
    text: str, exc: NameReadError, synonyms: list[tuple[str, NameReading]]
) -> Formula | None:
    """A refusal that listed candidates, settled by the name in brackets
    ('sodium borate (borax)')."""
    if not synonyms or not exc.choices:
        return None
    picked = {
        c for c in exc.choices for _, r in synonyms if _same_dry(parse_formula(c), parse_formula(r.formula))
    }
    if len(picked) != 1:
        return None
    wet = [parse_formula(r.formula) for _, r in synonyms]
    return (
        wet[0] if _same_dry(wet[0], parse_formula(next(iter(picked)))) else parse_formula(next(iter(picked)))
    )


def _with_kind(reading: NameReading) -> NameReading:
    return replace(reading, kind=_kind_of(parse_formula(reading.formula).anhydrous()))


def _agree_with_synonyms(
    text: str, reading: NameReading, synonyms: list[tuple[str, NameReading]]
) -> NameReading:
    """The name in brackets must name the same compound; where the name before
    it says nothing of water and the one in brackets does (borax is the
    decahydrate), the water is the bracketed name's."""
    f = parse_formula(reading.formula)
    for inner, other in synonyms:
        g = parse_formula(other.formula)
        if not _same_dry(f, g) and not same_substance(f.anhydrous(), g.anhydrous()):
            what = "formula" if any(c.isupper() for c in inner) else "name"
            raise NameReadError(
                f"'{text}' names two compounds: the name reads as {f.text()}, the {what} in brackets"
                f" '{inner}' as {g.text()}; write one name",
                text=text,
                choices=(f.text(), g.text()),
                reason="may-be",
            )
        stated = any(q.kind == "hydrate" for q in reading.qualifiers)
        if f.water != g.water:
            if stated and other.water != 0 and any(q.kind == "hydrate" for q in other.qualifiers):
                raise NameReadError(
                    f"'{text}' names two hydrates: the name reads as {f.text()}, the name in brackets"
                    f" '{inner}' as {g.text()}",
                    text=text,
                    choices=(f.text(), g.text()),
                    reason="may-be",
                )
            if not stated:
                reading = _rewet(reading, g.water, f"water from the name in brackets '{inner}'")
                f = parse_formula(reading.formula)
    return reading


def _check_colours(text: str, reading: NameReading) -> None:
    """A colour word before an element name is read only where it names a form
    of the element (red phosphorus): 'white arsenic' is arsenic trioxide."""
    if reading.kind != "element":
        return
    symbol = reading.elements[0].formula if reading.elements else ""
    for q in reading.qualifiers:
        if q.kind == "colour" and (symbol, q.text.casefold()) not in _allotropes():
            raise NameReadError(
                f"'{text}' is not read: '{q.text}' before an element name may name a compound of it"
                f" (white arsenic is arsenic trioxide), and no form of {reading.compound} is called"
                f" '{q.text}'; write the formula or the compound's name",
                text=text,
                reason="unknown",
            )


_SALT = re.compile(r"^(?P<body>.+?)\s+salt(?:\s*\(\s*(?P<m>\d+)\s*:\s*(?P<n>\d+)\s*\))?$")


def _acid_salt_inversion(text: str, rest: str) -> tuple[str, str] | None:
    """'acetic acid, sodium salt', 'phosphoric acid, disodium salt', 'EDTA
    disodium salt', 'sulfuric acid, copper(2+) salt (1:1)' (catalogue and
    registry style): the cation's name, then the acid's anion; a ratio in
    brackets gives the counts. A polyprotic acid's salt with no count on the
    cation ('citric acid, sodium salt') does not say how many hydrogens are
    replaced: refused."""
    m = _SALT.match(rest.replace(" ,", ","))
    if not m:
        return None
    words = m.group("body").replace(",", " , ").split()
    for k in range(len(words) - 1, 0, -1):
        acid = " ".join(w for w in words[:k] if w != ",").strip()
        cation = " ".join(w for w in words[k:] if w != ",").strip()
        if not acid or not cation or len(cation.split()) > 2:
            continue
        anion = _anion_of_acid(acid)
        if anion is None:
            continue
        if m.group("m"):
            # a registry ratio of cation to anion: counts for both
            a, b = int(m.group("m")), int(m.group("n"))
            simple, _ = _prefixes()
            cation_word = (simple[a] if a > 1 else "") + cation
            anion_word = (simple[b] if b > 1 else "") + anion.name if b > 1 else anion.name
            return f"{cation_word} {anion_word}", "catalogue form 'acid, cation salt (ratio)'"
        counted = re.match(r"(mono|di|tri|tetra)(?=[a-z])", cation)
        if not counted and anion.charge < -1:
            bases = [i for i in (_protonated(anion, j) for j in range(1, -anion.charge + 1)) if i is not None]
            raise NameReadError(
                f"'{text}' does not say how many of the {-anion.charge} acid hydrogens the {cation} replaces;"
                f" write mono-, di- or tri{cation} salt, or the formula",
                text=text,
                choices=tuple(i.name for i in bases),
                reason="ratio",
            )
        return f"{cation} {anion.name}", "catalogue form 'acid, cation salt'"
    return None


def _anion_of_acid(words: str) -> Ion | None:
    """The anion of an acid named in acids.csv, or an anion named directly ('EDTA')."""
    if words in _acids()[0]:
        return next((ion for name, ion in _acid_anions() if name == words), None)
    named = [ion for ion, _ in _ion_names().get(words, []) if ion.charge < 0]
    return named[0] if len(named) == 1 else None


def _read_rest(
    text: str,
    folded: str,
    rest: str,
    qualifiers: list[Qualifier],
    water: Number | str | None,
    forms: list[str],
) -> NameReading:
    # whole-name tables (trivial names, established names, acids): first with
    # only numbers set aside ('ammonia solution 35%', 'laughing gas'), then
    # with every qualifier set aside ('caustic soda pellets')
    numbers_only = _take(_PURITY, _take(_CONCENTRATION, folded, "concentration", []), "purity", [])
    for candidate in (_plain(numbers_only), _plain(rest)):
        whole = _whole_lookup(text, candidate, water, qualifiers, forms)
        if whole is not None:
            return whole

    if "—" in rest:
        return _read_addition(text, rest, qualifiers, forms)
    salt = _acid_salt_inversion(text, rest)
    if salt is not None:
        rest = salt[0]
        forms = [*forms, salt[1]]
    chunks = [c.strip() for c in re.split(r"(?<!\d),(?![^()]*\))|,(?!\d)(?![^()]*\))", rest) if c.strip()]
    errors: list[CellchemError] = []
    built: list[NameReading] = []
    sized: list[tuple[NameReading, int]] = []
    for chunk_order in _chunk_orders(chunks):
        words = " ".join(chunk_order).split()
        for pieces in _segment(words):
            try:
                reading = _build(text, pieces, water, qualifiers, forms, chunk_order != chunks)
                built.append(reading)
                # fewest pieces, then fewest counts read from prefixes ('dichromate'
                # is the dichromate ion before it is two chromate ions)
                sized.append((reading, (len(pieces), sum(1 for p in pieces if p.count is not None))))
            except CellchemError as exc:
                errors.append(exc)
        if built:
            break
    if not built and not errors:
        raise _unknown(text, _why_unread(rest))
    if len({b.formula for b in built}) > 1:
        # the reading of fewest pieces wins ('hydrogen tartrate' as one anion,
        # not H+ and tartrate)
        fewest = min(size for _, size in sized)
        built = [b for b, size in sized if size == fewest]
    unique = {b.formula: b for b in built}
    if len(unique) == 1:
        return next(iter(unique.values()))
    if len(unique) > 1:
        listing = ", ".join(f"{f}" for f in unique)
        raise NameReadError(
            f"'{text}' can be read more than one way: {listing}",
            text=text,
            choices=tuple(unique),
            reason="may-be",
        )
    first = min(errors, key=_error_rank)
    if f"'{text}'" not in str(first):
        raise NameReadError(
            f"'{text}' cannot be read: {first}",
            text=text,
            choices=first.choices,
            reason=getattr(first, "reason", ""),
            ions=getattr(first, "ions", ()),
        ) from first
    raise first


def _error_rank(exc: CellchemError) -> int:
    """Which refusal to report when several readings fail: the one that says most."""
    order = ("may-be", "ratio", "open-charge", "basicity", "")
    reason = getattr(exc, "reason", "")
    return order.index(reason) if reason in order else len(order)


def _read_addition(text: str, rest: str, qualifiers: list[Qualifier], forms: list[str]) -> NameReading:
    """An addition compound (IUPAC 2005 IR-5.5): 'sodium carbonate—hydrogen
    peroxide (2/3)', 'potassium sulfate—aluminium sulfate—water (1/1/24)'."""
    m = re.search(r"\(\s*(\d+(?:\s*/\s*\d+)+)\s*\)\s*$", rest)
    if not m:
        raise _unknown(text, "an addition compound name needs the ratio of its parts, e.g. '(2/3)'")
    ratio = [int(x) for x in m.group(1).replace(" ", "").split("/")]
    names = [n.strip() for n in rest[: m.start()].split("—")]
    if len(names) != len(ratio):
        raise _unknown(text, f"it names {len(names)} parts but gives {len(ratio)} numbers in the ratio")
    pieces = []
    for name, n in zip(names, ratio):
        f = parse_formula("H2O") if name == "water" else parse_formula(_read_name(name).formula)
        body = f.text()
        pieces.append((str(n) if n != 1 else "") + body)
    formula = parse_formula("·".join(pieces))
    cations, anions, elements_ = _components_of(formula)
    return NameReading(
        text=text,
        compound=rest,
        kind="salt",
        formula=formula.text(),
        cations=cations,
        anions=anions,
        elements=elements_,
        water=formula.water,
        qualifiers=tuple(qualifiers),
        forms=(*forms, "addition compound"),
    )


def _plain(rest: str) -> str:
    """Commas (outside Stock numbers such as '(ii,iii)') as spaces, single spaces."""
    return re.sub(r"\s+", " ", re.sub(r",(?![^()]*\))", " ", rest)).strip(" ,")


def _whole_lookup(
    text: str, plain: str, water: Number | str | None, qualifiers: list[Qualifier], forms: list[str]
) -> NameReading | None:
    ambiguous = _ambiguous_acids().get(plain)
    if ambiguous is not None:
        _, why, candidates = ambiguous
        wet = [parse_formula(c).with_water(water).text() if water not in ("", 0) else c for c in candidates]
        raise NameReadError(
            f"'{text}' is used for more than one substance ({why}): it may be {' or '.join(wet)}; write"
            " the formula, or a name that fixes it",
            text=text,
            choices=tuple(wet),
            reason="may-be",
        )
    for table, kind, label in (
        (_trivial(), "trivial", "trivial name"),
        (_named()[0], "", "established name"),
        (_acids()[0], "acid", ""),
    ):
        found = table.get(plain)
        if found is None:
            continue
        formula_text = found[0] if isinstance(found, tuple) else found
        if kind == "trivial" and found[2].startswith("Ambiguous:") and _fold(found[1]) == plain:
            # the table marks a name the trade also uses for other substances
            why = found[2][len("Ambiguous:") :].strip().split(";")[0].rstrip(".")
            usual = _canonical(parse_formula(formula_text)).text()
            raise NameReadError(
                f"'{text}' is used for more than one substance ({why}); the usual meaning is {usual}:"
                " write the formula or the systematic name",
                text=text,
                choices=(usual,),
                reason="may-be",
            )
        f = parse_formula(formula_text)
        extra = [f"{label} '{plain}'"] if label else []
        balance = charge_balance(f)
        if kind == "acid" and balance.kind != "ionic":
            kind = ""
        if not kind:
            kind = _kind_of(f)
        if kind == "trivial":
            f = _canonical(f)
        kept = [q for q in qualifiers if q.kind != "state" or q.text not in plain]
        if kind == "acid" or "solution" in plain:
            kept = [Qualifier("concentration", q.text) if q.kind == "purity" else q for q in kept]
        return _whole_reading(text, plain, kind, f, water, kept, forms + extra)
    rows = _established()[0].get(plain)
    if rows and not (any(q.kind == "basicity" for q in qualifiers) and all(st == MAY_BE for st, _ in rows)):
        # ('sodium phosphate, dibasic': the basicity word, not the table, decides)
        return _established_reading(text, plain, rows, water, qualifiers, forms)
    return None


def _chunk_orders(chunks: list[str]) -> list[list[str]]:
    """The chunks as written, then (catalogue inversion) with the anion chunk
    moved after the others: 'sulfate, copper(ii)' -> 'copper(ii) sulfate'."""
    orders = [chunks]
    if len(chunks) > 1:
        orders.append(chunks[1:] + chunks[:1])
        orders.append(list(reversed(chunks)))
    return orders


def _why_unread(rest: str) -> str:
    words = rest.replace(",", " ").split()
    unknown = [w for w in words if not _pieces_for(w)]
    if unknown:
        return (
            "no ion, element or known compound answers to "
            + ", ".join(f"'{w}'" for w in unknown[:3])
            + " (organic names, mixtures and product codes are not read)"
        )
    return "its words do not make up a compound (expected cation names, then anion names)"
