"""Setting aside what a name says besides the compound: strengths,
concentrations, purities, particle sizes, 'for ...' grade phrases, impurity
statements, hydrate statements and the words of ``qualifiers.csv``.
Patterns are constants here (ranges of per cent, volume strengths, specific
gravities, particle sizes: common practice).
"""

from __future__ import annotations

import re
import unicodedata
from fractions import Fraction

from ..formula import Number
from .results import Qualifier
from .tables import _element_names, _hydrate_words, _ion_names, _number, _qualifier_phrases

_CONCENTRATION = re.compile(
    r"(?<![\w.])\d+(?:[.,]\d+)?\s*"
    r"(?:mol\s*/\s*l|mol\s*l-1|mol·l-1|mol\s*dm-3|mol\s*/\s*dm3|mol\s*/\s*kg|mmol\s*/\s*l|g\s*/\s*l|mg\s*/\s*l|"
    r"ppm|%\s*\(?\s*(?:w/v|w/w|v/v|m/v|m/m|wt)\s*\)?|wt\s*\.?\s*%|m(?![\w])|mm(?![\w])|n(?![\w]))"
)


_PURITY = re.compile(
    r"(?:(?:min\.?|minimum|assay|purity|approx\.?|ca\.?)\s*)?(?:≥|>=|>|≤|<=|<|~)?\s*\d+(?:[.,]\d+)?\+?\s*%(?:\s*min\.?)?"
)


# Strengths as suppliers print them (common practice): a range of per cent
# ('28-30%', '95-97 %', '10-15% available chlorine'), a volume strength of
# hydrogen peroxide ('100 vol', '(20 volumes)'), a specific gravity ('0.88',
# '.880', 's.g. 1.84'); the words that may follow a strength are in
# qualifiers.csv (kind 'strength').
_RANGE = re.compile(
    r"(?<![\w.])\d+(?:[.,]\d+)?\s*%?\s*(?:-|to)\s*\d+(?:[.,]\d+)?\s*%(?:\s*\(?\s*(?:w/w|w/v|v/v)\s*\)?)?"
)


_VOLUME_STRENGTH = re.compile(r"(?<![\w.])\d+\s*(?:vol\.?|volumes?)(?![\w])")


_GRAVITY = re.compile(
    r"(?:(?<![\w.])(?:sp\.?\s*gr\.?|s\.\s*g\.?|sg|d|density)\s*=?\s*\d?\.\d{2,3}(?![\w.]))"
    r"|(?:(?<![\w.,%])(?:\d\.\d{2,3}|\.\d{3})\s*$)"
)


_HYDRATE_NUMBER = re.compile(r"(?<![\w])(\d+(?:[.,]\d+)?|x|n)\s*-?\s*hydrate(?![\w])")


_HYDRATE_FORMULA = re.compile(
    r"(?:[·•∙⋅*.]\s*|(?<![\w])(?=\d|x\s*h2o|n\s*h2o))(\d+(?:[.,]\d+)?|x|n|½)?\s*h2o(?![\w])"
)


# '-5-water', '5-water' (the British Pharmacopoeia's and older catalogues' form)
# and 'hemi(pentahydrate)' (common practice)
_HYDRATE_WATER = re.compile(r"(?:(?<=[a-z)])-|(?<![\w-]))(\d+(?:[.,]\d+)?)\s*-?\s*water(?![\w])")


_HYDRATE_HEMI = re.compile(r"(?<![\w])hemi\s*\(\s*([a-z]+hydrate)\s*\)")


# A grade phrase from 'for' to the next comma ('for molecular biology', 'for
# HPLC'), and impurity statements ('low in lead', 'arsenic free', 'iron-free'):
# none of them is part of a compound name (common practice).
_FOR_PHRASE = re.compile(r"(?<![\w])for [a-z0-9 .\-/]+?(?=,|;|\)|$)")


# A particle size or sieve mesh ('<5 µm', '-100 mesh', '325 mesh'), a grade named by
# its use ('FT-IR grade', 'HPLC grade') and a stabiliser statement ('stabilised
# with amylene'): none is part of a compound name (common practice).
_PARTICLE = re.compile(r"(?<![\w.])[<>≤≥~+-]?\s*\d+(?:[.,]\d+)?\s*(?:µm|μm|um|nm|microns?|mesh)(?![\w])")


_USE_GRADE = re.compile(r"(?<![\w])[a-z0-9][a-z0-9.+-]* grade(?![\w])")


_STABILISED = re.compile(r"(?<![\w])stabili[sz]ed(?: with [a-z0-9 .%-]+?)?(?=,|;|\)|$)")


_IMPURITY = re.compile(r"(?<![\w])(?:low in|poor in) ([a-z]+)(?![\w])|(?<![\w])([a-z]+)[ -]free(?![\w])")


def _take_impurities(s: str, found: list[Qualifier]) -> tuple[str, bool]:
    """Set aside 'low in lead', 'arsenic free', 'chloride-free' (the word must
    name an element or an ion, so 'EDTA free acid' is left alone); returns the
    rest and whether 'water-free' said the compound is anhydrous."""
    dry = False

    def keep(m: re.Match[str]) -> str:
        nonlocal dry
        word = m.group(1) or m.group(2)
        if word == "water":
            dry = True
        elif word not in _element_names() and word not in _ion_names() and word not in ("metal", "metals"):
            return m.group(0)
        found.append(Qualifier("hydrate" if word == "water" else "grade", m.group(0)))
        return " "

    return _IMPURITY.sub(keep, s), dry


def _as_written(q: Qualifier, text: str) -> Qualifier:
    """The qualifier as the input wrote it ('0.1 M', not the folded '0.1 m')."""
    pattern = r"\s*".join(re.escape(part) for part in q.text.split())
    m = re.search(pattern, unicodedata.normalize("NFKC", text), re.IGNORECASE)
    return Qualifier(q.kind, m.group(0)) if m else q


def _take(pattern: re.Pattern[str], s: str, kind: str, found: list[Qualifier]) -> str:
    def keep(m: re.Match[str]) -> str:
        found.append(Qualifier(kind, m.group(0).strip()))
        return " "

    return pattern.sub(keep, s)


def _set_aside(s: str) -> tuple[str, list[Qualifier], Number | str | None]:
    """Remove qualifiers and the hydrate statement. Returns the rest, the
    qualifiers, and the water: a count, None for unknown, '' if not stated."""
    found: list[Qualifier] = []
    water: Number | str | None = ""
    s = _take(_RANGE, s, "strength", found)
    s = _take(_VOLUME_STRENGTH, s, "strength", found)
    s = _take(_CONCENTRATION, s, "concentration", found)
    s = _take(_PURITY, s, "purity", found)
    s = _take(_FOR_PHRASE, s, "grade", found)
    s = _take(_PARTICLE, s, "form", found)
    s = _take(_STABILISED, s, "grade", found)
    s, dry = _take_impurities(s, found)
    if dry:
        water = 0

    m = _HYDRATE_HEMI.search(s)
    if m and m.group(1) in _hydrate_words() and _hydrate_words()[m.group(1)] is not None:
        water = _hydrate_words()[m.group(1)] / 2  # type: ignore[operator]
        water = int(water) if water == int(water) else Fraction(water)  # type: ignore[arg-type]
        found.append(Qualifier("hydrate", m.group(0)))
        s = s[: m.start()] + " " + s[m.end() :]
    for pattern in (_HYDRATE_FORMULA, _HYDRATE_WATER):
        m = pattern.search(s) if water == "" else None
        if m:
            water = _number(m.group(1)) if m.group(1) else 1
            found.append(Qualifier("hydrate", m.group(0).strip(" -")))
            s = s[: m.start()] + " " + s[m.end() :]
    m = _HYDRATE_NUMBER.search(s)
    if m:
        water = _number(m.group(1))
        found.append(Qualifier("hydrate", m.group(0).strip()))
        s = s[: m.start()] + " " + s[m.end() :]
    for word, count in sorted(_hydrate_words().items(), key=lambda kv: -len(kv[0])):
        pattern = re.compile(r"(?<![\w])" + re.escape(word) + r"(?![\w])")
        if pattern.search(s):
            water = count
            found.append(Qualifier("hydrate", word))
            s = pattern.sub(" ", s, count=1)
            break
    for pattern, kind in _qualifier_phrases():
        if pattern.search(s):
            text = pattern.search(s).group(0)  # type: ignore[union-attr]
            if kind == "hydrate":
                if text in ("anhydrous", "dried", "anhyd.", "anhyd", "dry"):
                    water = 0 if water == "" else water
                elif water == "":
                    water = None
            found.append(Qualifier(kind, text))
            s = pattern.sub(" ", s)
    s = _take(_USE_GRADE, s, "grade", found)
    s = _take(_GRAVITY, s.strip(" ,;"), "strength", found)
    for word, kind in (("monobasic", "basicity"), ("dibasic", "basicity"), ("tribasic", "basicity")):
        if re.search(rf"(?<![\w]){word}(?![\w])", s):
            found.append(Qualifier(kind, word))
            s = re.sub(rf"(?<![\w]){word}(?![\w])", " ", s)
    # brackets left empty, stray punctuation
    s = re.sub(r"[\(\[]\s*[,;/]*\s*[\)\]]", " ", s)
    s = re.sub(r"\s*;\s*|\s+/\s+", ", ", s)
    s = re.sub(r"\s+", " ", s).strip(" ,-")
    return s, found, water


_CRYSTAL_WORDS = frozenset({"crystals", "crystal", "crystalline", "cryst.", "cryst"})
