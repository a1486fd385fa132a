"""Normalising a name before it is read: case, Unicode forms, quotes, dashes,
spaces, the spellings sulph/sulf, aluminum/aluminium and cesium/caesium, a
multiplicative prefix joined to its word ('di-Sodium'), and Stock numbers
written as '(iii)' (with a space, in Arabic digits, or as a charge number).
"""

from __future__ import annotations

import re
import unicodedata

_QUOTES = str.maketrans(
    {"’": "'", "‘": "'", "ʼ": "'", "′": "'", "`": "'", "´": "'", "“": '"', "”": '"', "„": '"'}
)


_DASHES = "‐‑‒–−"


def _fold(text: str) -> str:
    """Case-fold, NFKC, plain quotes and hyphens, single spaces, IUPAC spelling;
    a multiplicative prefix joined to its word ('di-Sodium' is 'disodium')."""
    s = re.sub(r"[\u00ad\u200b\u200c\u200d\u2060\ufeff]", "", text)  # soft hyphens, zero-width spaces
    s = re.sub(r"(\d)\s*½", r"\1.5", s).replace("½", " 0.5")
    s = unicodedata.normalize("NFKC", s).translate(_QUOTES)
    for d in _DASHES:
        s = s.replace(d, "-")
    s = s.replace("\u00a0", " ").casefold()
    s = re.sub(r"sulph", "sulf", s)
    s = re.sub(r"\baluminum", "aluminium", s)
    s = re.sub(r"\bcesium", "caesium", s)
    s = re.sub(r"\b(mono|di|tri|tetra|penta|hexa)-(?=[a-z]{3})", r"\1", s)
    s = re.sub(r"\s+", " ", s).strip()
    return s


def fold_name(text: str) -> str:
    """A name folded for exact comparison: case, Unicode forms, quotes, dashes,
    spaces, the spellings sulph/sulf, aluminum/aluminium, cesium/caesium, and
    Stock numbers written without a space ('copper (II)' is 'copper(ii)')."""
    return _stock(_fold(text))[0]


def _spelling_forms(text: str) -> list[str]:
    low = unicodedata.normalize("NFKC", text).casefold()
    forms = []
    if "sulph" in low:
        forms.append("British spelling 'sulph-'")
    if re.search(r"\baluminum", low):
        forms.append("American spelling 'aluminum'")
    if re.search(r"\bcesium", low):
        forms.append("American spelling 'cesium'")
    return forms


_ROMAN_VALUES = {"i": 1, "ii": 2, "iii": 3, "iv": 4, "v": 5, "vi": 6, "vii": 7, "viii": 8}


_ROMAN = {v: k.upper() for k, v in _ROMAN_VALUES.items()}


def _stock(s: str) -> tuple[str, list[str]]:
    """Write Stock numbers as '(iii)': join a space before '(', turn Arabic
    digits '(3)' and charge numbers '(3+)' of cations into Roman numerals."""
    forms = []
    if re.search(r"\s\((?:[ivx]+|\d\+?)\)", s):
        forms.append("Stock number written with a space")
    s = re.sub(r"\s+\(", "(", s)
    s = re.sub(r"\(\s+", "(", s)
    s = re.sub(r"\s+\)", ")", s)

    def arabic(m: re.Match[str]) -> str:
        n = int(m.group(1))
        if n in _ROMAN:
            forms.append("charge number" if m.group(2) else "Arabic Stock number")
            return "(" + _ROMAN[n].lower() + ")"
        return m.group(0)

    s = re.sub(r"(?<=[a-z])\(\+?(\d)(\+?)\)", arabic, s)
    return s, forms
