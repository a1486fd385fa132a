"""Finding the header row of a table and the role of each column.

A supplier table or an inventory sheet has a header row somewhere in its
first rows (titles, logos and notes often sit above it). The header row is the
first of the first 20 rows whose cells name the most roles (at least two, or
one of name and formula when the table has a single column of either); a
column's role comes from its heading (``data/header_words.csv``), in any
case, with a bracketed unit or a trailing colon set aside. A user can name a
column for a role by its heading or its letter (``formula=C``).
"""

from __future__ import annotations

import re
import unicodedata
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from functools import cache, cached_property

from .errors import CellchemError
from .tables import read_table

ROLES = ("name", "formula", "molar_mass", "cas", "concentration", "quantity", "unit")
ROLE_WORDS = {  # how a user may write a role on the command line
    "name": "name",
    "formula": "formula",
    "molar_mass": "molar_mass",
    "molar-mass": "molar_mass",
    "mass": "molar_mass",
    "mw": "molar_mass",
    "cas": "cas",
    "concentration": "concentration",
    "quantity": "quantity",
    "unit": "unit",
}
HEADER_SEARCH_ROWS = 20


def column_letter(index: int) -> str:
    """The spreadsheet letter of a 0-based column index (0 -> 'A', 27 -> 'AB').

    >>> column_letter(0), column_letter(25), column_letter(26), column_letter(16383)
    ('A', 'Z', 'AA', 'XFD')
    """
    if index < 0:
        raise ValueError(index)
    letters = ""
    n = index + 1
    while n:
        n, r = divmod(n - 1, 26)
        letters = chr(65 + r) + letters
    return letters


def column_index(letters: str) -> int:
    """The 0-based index of a column letter ('A' -> 0, 'ab' -> 27)."""
    s = letters.strip().upper()
    if not re.fullmatch(r"[A-Z]{1,3}", s):
        raise CellchemError(f"'{letters}' is not a column letter (expected A to XFD)")
    n = 0
    for ch in s:
        n = n * 26 + (ord(ch) - 64)
    if n > 16384:
        raise CellchemError(f"'{letters}' is beyond the last spreadsheet column XFD")
    return n - 1


def fold_heading(text: object) -> str:
    """A heading folded for comparison: case, spaces, a trailing colon and a
    bracketed unit set aside.

    >>> fold_heading("  Molar Mass (g/mol): ")
    'molar mass'
    """
    if text is None:
        return ""
    s = unicodedata.normalize("NFKC", str(text)).casefold()
    s = re.sub(r"\s*[\(\[][^\)\]]*[\)\]]\s*", " ", s)
    s = " ".join(s.split()).rstrip(":").strip()
    return s


@cache
def _heading_roles() -> dict[str, str]:
    roles: dict[str, str] = {}
    for row in read_table("header_words.csv"):
        roles[" ".join(row["heading"].split())] = row["role"]
    return roles


def heading_role(text: object) -> str | None:
    """The role a heading names, or None.

    >>> heading_role("CAS No."), heading_role("Mol. Wt. (g/mol)"), heading_role("Catalogue number")
    ('cas', 'molar_mass', None)
    """
    folded = fold_heading(text)
    if not folded:
        return None
    roles = _heading_roles()
    if folded in roles:
        return roles[folded]
    raw = " ".join(unicodedata.normalize("NFKC", str(text)).casefold().split()).rstrip(":")
    return roles.get(raw)


@dataclass(frozen=True)
class Layout:
    """Where a table's header is and which column holds which role.

    Attributes:
        header_index: 0-based index of the header row among the rows given.
        headers: the header cells as text.
        roles: role -> 0-based column index.
        duplicates: headings that name a role already taken (the first is used).
        overridden: roles set by the user.
    """

    header_index: int
    headers: tuple[str, ...]
    roles: Mapping[str, int]
    duplicates: tuple[str, ...] = ()
    overridden: tuple[str, ...] = ()

    def letter(self, role: str) -> str:
        return column_letter(self.roles[role])

    @cached_property
    def letters(self) -> dict[str, str]:
        """role -> column letter, worked out once per table."""
        return {role: column_letter(i) for role, i in self.roles.items()}


def _text(cell: object) -> str:
    return "" if cell is None else str(cell).strip()


def _roles_of(row: Sequence[object]) -> tuple[dict[str, int], list[str]]:
    roles: dict[str, int] = {}
    duplicates: list[str] = []
    for i, cell in enumerate(row):
        role = heading_role(cell)
        if role is None:
            continue
        if role in roles:
            duplicates.append(
                f"{_text(cell)!r} in column {column_letter(i)} (the {role} column is"
                f" {column_letter(roles[role])})"
            )
        else:
            roles[role] = i
    return roles, duplicates


def read_overrides(specs: Sequence[str]) -> dict[str, str]:
    """``ROLE=HEADER_OR_LETTER`` strings from the command line as a mapping.

    >>> read_overrides(["formula=C", "mass=Mol. Wt."])
    {'formula': 'C', 'molar_mass': 'Mol. Wt.'}
    """
    out: dict[str, str] = {}
    for spec in specs:
        if "=" not in spec:
            raise CellchemError(f"--column {spec!r}: expected ROLE=HEADER_OR_LETTER, such as formula=C")
        role, _, value = spec.partition("=")
        key = ROLE_WORDS.get(role.strip().casefold())
        if key is None:
            raise CellchemError(
                f"--column {spec!r}: '{role}' is not a role; the roles are " + ", ".join(ROLES)
            )
        if not value.strip():
            raise CellchemError(f"--column {spec!r}: no heading or letter after '='")
        out[key] = value.strip()
    return out


def _resolve(role: str, value: str, headers: Sequence[str]) -> int:
    folded = [fold_heading(h) for h in headers]
    exact = [i for i, h in enumerate(headers) if _text(h).casefold() == value.casefold()]
    if not exact:
        exact = [i for i, h in enumerate(folded) if h and h == fold_heading(value)]
    letter = None
    if re.fullmatch(r"[A-Za-z]{1,3}", value):
        letter = column_index(value)
    if exact and letter is not None and exact[0] != letter:
        raise CellchemError(
            f"--column {role}={value}: '{value}' is both the heading of column {column_letter(exact[0])}"
            f" and the letter of column {column_letter(letter)}; write the other form to say which"
        )
    if exact:
        return exact[0]
    if letter is not None:
        return letter
    seen = ", ".join(repr(_text(h)) for h in headers if _text(h)) or "none"
    raise CellchemError(f"--column {role}={value}: no column headed '{value}'; the headings are: {seen}")


def find_layout(rows: Sequence[Sequence[object]], overrides: Mapping[str, str] | None = None) -> Layout:
    """Find the header row among the first 20 rows and the column of each role.

    Args:
        rows: the first rows of the table (at least the first 20 if it has them).
        overrides: role -> heading or column letter, from the user.

    Returns:
        The Layout.

    Raises:
        CellchemError: no header row names a name or formula column (the
            message lists the cells of the rows seen), or an override names
            no column.

    >>> layout = find_layout([["Stock list"], [], ["Item", "Formula", "MW", "CAS No."]])
    >>> layout.header_index, dict(layout.roles)
    (2, {'name': 0, 'formula': 1, 'molar_mass': 2, 'cas': 3})
    """
    overrides = dict(overrides or {})
    best: tuple[int, int] | None = None  # (score, index)
    for i, row in enumerate(rows[:HEADER_SEARCH_ROWS]):
        roles, _ = _roles_of(row)
        score = len(roles)
        if not ({"name", "formula"} & roles.keys()) and not overrides:
            continue
        if score >= 2 or (score == 1 and ({"name", "formula"} & roles.keys())):
            if best is None or score > best[0]:
                best = (score, i)
    if best is None and overrides:
        # the user named the columns: the first non-empty row is the header
        for i, row in enumerate(rows[:HEADER_SEARCH_ROWS]):
            if any(_text(c) for c in row):
                best = (0, i)
                break
    if best is None:
        seen = [
            ", ".join(repr(_text(c)[:40]) for c in row if _text(c))
            for row in rows[:HEADER_SEARCH_ROWS]
            if any(_text(c) for c in row)
        ][:3]
        raise CellchemError(
            "no header row with a name or formula column among the first 20 rows; the first rows read: "
            + ("; ".join(seen) or "nothing")
            + " (name the columns with --column formula=HEADER_OR_LETTER)"
        )
    index = best[1]
    header = rows[index]
    headers = tuple(_text(c) for c in header)
    roles, duplicates = _roles_of(header)
    for role, value in overrides.items():
        roles[role] = _resolve(role, value, headers)
    if not ({"name", "formula"} & roles.keys()):
        seen = ", ".join(repr(h) for h in headers if h) or "none"
        raise CellchemError(
            f"no name or formula column in the header row {index + 1}; the headings are: {seen}"
            " (name one with --column formula=HEADER_OR_LETTER)"
        )
    return Layout(index, headers, roles, tuple(duplicates), tuple(overrides))
