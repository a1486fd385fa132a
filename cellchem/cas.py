"""CAS Registry Numbers: format and check digit.

A CAS RN is written as three groups of digits joined by hyphens: two to seven
digits, two digits, and one check digit (``7732-18-5``). The check digit is the
sum of the other digits, each multiplied by its position counted from the
right starting at 1, modulo 10 (the rule published by CAS, "Check Digit
Verification of CAS Registry Numbers").

Suppliers' sheets also show the number without hyphens, with spaces or with
dashes pasted from a PDF (``7732‑18‑5``), and sometimes as "CAS 7732-18-5";
those are read, and the reading says how it was written.
"""

from __future__ import annotations

import re
import unicodedata
from dataclasses import dataclass

from .errors import CellchemError

_DASHES = dict.fromkeys(map(ord, "‐‑‒–—―−﹣－"), "-")
_WRITTEN = re.compile(
    r"^(?:CAS(?:\s*(?:RN|No\.?|Number|#))?\s*[:.]?\s*)?([0-9][0-9\s-]*[0-9])$", re.IGNORECASE
)
_GROUPED = re.compile(r"^([0-9]{2,7})-([0-9]{2})-([0-9])$")


@dataclass(frozen=True)
class CasReading:
    """A CAS RN read from a cell.

    Attributes:
        number: the number in its standard form, ``'7732-18-5'``.
        forms: how the cell wrote it where that is not the standard form
            (``'without hyphens'``, ``'with a prefix'``), possibly empty.
    """

    number: str
    forms: tuple[str, ...] = ()


def _check_digit(digits: str) -> int:
    return sum(int(d) * i for i, d in enumerate(reversed(digits), 1)) % 10


def read_cas(text: object) -> CasReading:
    """Read and verify a CAS RN.

    Args:
        text: the cell value (text; a number is read as its digits).

    Returns:
        A CasReading with the standard form.

    Raises:
        CellchemError: not the format of a CAS RN, or a wrong check digit (the
            message gives the check digit the other digits call for).

    >>> read_cas("7732-18-5").number
    '7732-18-5'
    >>> read_cas("7732185").forms
    ('without hyphens',)
    >>> read_cas("7732-18-4")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.CellchemError: CAS RN '7732-18-4' fails its check digit: ... call for 5, not 4
    """
    if isinstance(text, bool) or text is None:
        raise CellchemError(f"no CAS RN given (read {text!r})")
    if isinstance(text, int):
        raw = str(text)
    elif isinstance(text, str):
        raw = text
    else:
        raise CellchemError(f"a CAS RN is text such as '7732-18-5'; read {text!r}")
    shown = raw.strip()
    s = unicodedata.normalize("NFKC", shown).translate(_DASHES)
    forms: list[str] = []
    m = _WRITTEN.match(s)
    if not m:
        raise CellchemError(
            f"'{shown}' is not a CAS RN (expected digits in three groups joined by hyphens, such as"
            " '7732-18-5')",
            text=shown,
        )
    if m.group(1) != s:
        forms.append("with a prefix")
    body = m.group(1)
    if " " in body:
        forms.append("with spaces")
        body = re.sub(r"\s*-\s*", "-", body)
        body = re.sub(r"\s+", "-" if "-" not in body else "", body)
    if "-" not in body:
        digits = body
        if not 5 <= len(digits) <= 10:
            raise CellchemError(
                f"'{shown}' is not a CAS RN: {len(digits)} digits without hyphens (a CAS RN has 5 to 10)",
                text=shown,
            )
        body = f"{digits[:-3]}-{digits[-3:-1]}-{digits[-1]}"
        forms.append("without hyphens")
    g = _GROUPED.match(body)
    if not g:
        raise CellchemError(
            f"'{shown}' is not a CAS RN: the groups must be 2 to 7 digits, 2 digits and 1 check digit"
            " (such as '7732-18-5')",
            text=shown,
        )
    first, second, check = g.groups()
    if first.startswith("0"):
        raise CellchemError(f"'{shown}' is not a CAS RN: the first group may not start with 0", text=shown)
    expected = _check_digit(first + second)
    if expected != int(check):
        raise CellchemError(
            f"CAS RN '{shown}' fails its check digit: the digits {first}-{second} call for {expected},"
            f" not {check}",
            text=shown,
            choices=(f"{first}-{second}-{expected}",),
        )
    return CasReading(f"{first}-{second}-{check}", tuple(forms))


def cas_is_valid(text: object) -> bool:
    """True when the text is a CAS RN in the standard form with a correct
    check digit (``'7647-14-5'``); False for anything else, never an error.

    >>> cas_is_valid("7647-14-5"), cas_is_valid("7647-14-4"), cas_is_valid("sodium chloride")
    (True, False, False)
    """
    try:
        return not read_cas(text).forms
    except CellchemError:
        return False
