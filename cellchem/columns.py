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
from dataclasses import dataclass, field
from functools import cache, cached_property

from .errors import CellchemError
from .tables import read_table

ROLES = (
    "name",
    "formula",
    "molar_mass",
    "cas",
    "concentration",
    "quantity",
    "unit",
    "count",
    "location",
    "ec",
    "un",
    "signal_word",
    "hazard_statements",
    "precautionary_statements",
    "pictograms",
    "storage_class",
)
# the columns of a safety-data-sheet summary beside a line's identity, checked by cellchem.sds
SDS_ROLES = ("ec", "un", "signal_word", "hazard_statements", "precautionary_statements", "pictograms")
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
    **{
        role: role for role in ("count", "location", "ec", "un", "signal_word", "storage_class", "pictograms")
    },
    "signal-word": "signal_word",
    "h": "hazard_statements",
    "hazard_statements": "hazard_statements",
    "p": "precautionary_statements",
    "precautionary_statements": "precautionary_statements",
    "storage-class": "storage_class",
}
HEADER_SEARCH_ROWS = 20
MAX_HEADER_ROW = 1_048_576  # the last row of a sheet


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
    s = re.sub(r"\s*[\(\[\{][^\)\]\}]*[\)\]\}]\s*", " ", s)
    s = " ".join(s.split()).rstrip(":").strip()
    return s


# ---------------------------------------------------------------------------
# Reading a heading: words, abbreviations, punctuation and word order
# ---------------------------------------------------------------------------

IDENTITY_ROLES = frozenset({"name", "formula", "molar_mass", "cas"})
_BRACKETED = re.compile(r"[\(\[\{]([^\)\]\}]*)[\)\]\}]")
_INITIALS = re.compile(r"(?<!\w)(?:[^\W\d_]\.)+[^\W\d_]\.?(?!\w)")  # M.W., f.w
_SEPARATORS = re.compile(r"[\s.\-_\u2010-\u2015/\\,;:'\"\u2018\u2019`+&|*!?=<>~^]+")
_STRONG_SPLIT = re.compile(r"\s*(?:/|&|\+|\||\band\b|\bor\b|\bund\b|\boder\b)\s*")
_COMMA_SPLIT = re.compile(r"\s*[,;]\s*")


@dataclass(frozen=True)
class _Vocabulary:
    as_written: dict[str, str]  # folded heading -> role
    in_order: dict[str, str]  # words joined in order -> role
    any_order: dict[str, str]  # words sorted and joined -> role
    words: dict[str, tuple[str, ...]]  # a word -> the words it means
    dropped: frozenset[str]  # single words set aside
    phrases: re.Pattern[str] | None  # phrases set aside (units such as g/mol)


def _words_of(text: str, words: Mapping[str, tuple[str, ...]], dropped, phrases) -> tuple[str, ...]:
    s = fold_heading(text)
    if phrases is not None:
        s = phrases.sub(" ", s)
    s = _INITIALS.sub(lambda m: m.group(0).replace(".", ""), s)
    s = s.replace("#", " # ").replace("\u2116", " # ")
    out: list[str] = []
    for word in _SEPARATORS.split(s):
        if not word or word in dropped:
            continue
        out.extend(words.get(word, (word,)))
    return tuple(out)


@cache
def _vocabulary() -> _Vocabulary:
    """data/header_words.csv read into lookups; two headings whose words are
    the same in another order but whose roles differ are refused."""
    rows = read_table("header_words.csv")
    words: dict[str, tuple[str, ...]] = {}
    dropped: set[str] = set()
    phrases: list[str] = []
    for row in rows:
        if row["role"] == "word":
            words[row["heading"]] = tuple(row["means"].split())
        elif row["role"] == "drop":
            if _SEPARATORS.search(row["heading"]) or not row["heading"].isalpha():
                phrases.append(row["heading"])
            else:
                dropped.add(row["heading"])
    pattern = None
    if phrases:
        alternatives = "|".join(re.escape(p) for p in sorted(phrases, key=len, reverse=True))
        pattern = re.compile(rf"(?<!\w)(?:{alternatives})(?!\w)")
    as_written: dict[str, str] = {}
    in_order: dict[str, str] = {}
    any_order: dict[str, str] = {}
    for row in rows:
        role = row["role"]
        if role in ("word", "drop"):
            continue
        heading = row["heading"]
        if role == "none":
            as_written[fold_heading(heading)] = ""
            continue
        if role not in ROLES:
            raise ValueError(f"data file header_words.csv: {role!r} is not a role")
        as_written[fold_heading(heading)] = role
        key = _words_of(heading, words, dropped, pattern)
        if not key:
            continue
        for table, joined in ((in_order, " ".join(key)), (any_order, " ".join(sorted(key)))):
            if table.get(joined, role) != role:
                raise ValueError(
                    f"data file header_words.csv: the heading {heading!r} reads as {joined!r}, which"
                    f" another heading gives the role {table[joined]!r}"
                )
            table[joined] = role
    return _Vocabulary(as_written, in_order, any_order, words, frozenset(dropped), pattern)


def heading_words(text: object) -> tuple[str, ...]:
    """The words a heading is read as: abbreviations spelled out, units and
    joining words set aside.

    >>> heading_words("CAS-Nr."), heading_words("Name of chemical"), heading_words("M.W. (g/mol)")
    (('cas', 'number'), ('name', 'chemical'), ('mw',))
    """
    if text is None:
        return ()
    v = _vocabulary()
    return _words_of(str(text), v.words, v.dropped, v.phrases)


def _lookup(text: str) -> str | None:
    v = _vocabulary()
    folded = fold_heading(text)
    if not folded:
        return None
    if folded in v.as_written:
        return v.as_written[folded] or None
    key = _words_of(text, v.words, v.dropped, v.phrases)
    if not key:
        return None
    return v.in_order.get(" ".join(key)) or v.any_order.get(" ".join(sorted(key)))


def _part_role(text: str) -> str | None:
    """The role a part of a heading names; a part that is only a unit ('g/mol') names none."""
    v = _vocabulary()
    if not _words_of(text, v.words, v.dropped, v.phrases):
        return None
    return _lookup(text)


@dataclass(frozen=True)
class HeadingReading:
    """What a heading names: ``role`` (or None), and ``ambiguous``: the
    roles its parts name when they name more than one (then ``role`` is None)."""

    role: str | None
    ambiguous: tuple[str, ...] = ()


@cache
def read_heading(text: str) -> HeadingReading:
    """The role a heading names, or the roles it names when they are more than one.

    >>> read_heading("Chem. formula"), read_heading("Name/Formula")
    (HeadingReading(role='formula', ambiguous=()), HeadingReading(role=None, ambiguous=('name', 'formula')))
    """
    role = _lookup(text)
    s = unicodedata.normalize("NFKC", str(text)).casefold()
    bracketed = [b for b in _BRACKETED.findall(s) if b.strip()]
    body = _BRACKETED.sub(" ", s)
    v = _vocabulary()
    if v.phrases is not None:
        body = v.phrases.sub(" ", body)
    for splitter in (_STRONG_SPLIT, _COMMA_SPLIT):
        if splitter is _COMMA_SPLIT and role is not None:
            break  # "Weight, molecular": a comma also inverts a heading
        parts = [p for p in splitter.split(body) if p.strip()] + bracketed
        if len(parts) < 2:
            continue
        found = [_part_role(p) for p in parts]
        named = [r for r in dict.fromkeys(found) if r]
        if role is not None and role not in named:
            named.insert(0, role)
        if len(named) >= 2 and IDENTITY_ROLES & set(named):
            return HeadingReading(None, tuple(named))
        if role is None and len(named) == 1 and all(found):
            role = named[0]
        if role is not None:
            break
    if role is None and any(_MOLAR_MASS_UNIT.search(b) for b in bracketed):
        # a column in g/mol holds molar masses, whatever its words ("M (g/mol)")
        role = "molar_mass"
    return HeadingReading(role)


_MOLAR_MASS_UNIT = re.compile(r"^\s*g\s*(?:/|·|\s)\s*mol(?:-1|⁻¹)?\s*$|^\s*g\s*mol\s*(?:-1|⁻¹)\s*$")


def heading_role(text: object) -> str | None:
    """The role a heading names, or None (also for a heading that names two roles).

    >>> heading_role("CAS No."), heading_role("Mol. Wt. (g/mol)"), heading_role("Catalogue number")
    ('cas', 'molar_mass', None)
    >>> heading_role("Summenformel"), heading_role("Name of chemical"), heading_role("Name/Formula")
    ('formula', 'name', None)
    >>> heading_role("M (g/mol)"), heading_role("Conc. (mol/L)")
    ('molar_mass', 'concentration')
    """
    if text is None or not str(text).strip():
        return None
    return read_heading(str(text)).role


# ---------------------------------------------------------------------------
# The layout of a table
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Layout:
    """Where a table's header is and which column holds which role.

    Attributes:
        header_index: 0-based index of the header row among the rows given.
        headers: the header cells as text.
        roles: role -> 0-based column index; no column holds two roles.
        duplicates: headings that name a role already taken (the first is used).
        overridden: roles set by the user.
        ambiguous: headings whose parts name two roles ("Name/Formula"), used for neither.
        replaced: headings whose own role gave way to a role the user set for their column.
    """

    header_index: int
    headers: tuple[str, ...]
    roles: Mapping[str, int]
    duplicates: tuple[str, ...] = ()
    overridden: tuple[str, ...] = ()
    ambiguous: tuple[str, ...] = ()
    replaced: tuple[str, ...] = ()

    def letter(self, role: str) -> str:
        return column_letter(self.roles[role])

    @cached_property
    def letters(self) -> dict[str, str]:
        """role -> column letter, worked out once per table."""
        return {role: column_letter(i) for role, i in self.roles.items()}


NO_TABLE = "no table"
NO_ROLES = "no name or formula column"
NOT_MATCHED = "not matched"


class LayoutError(CellchemError):
    """The layout of a table could not be found.

    Attributes:
        kind: NO_TABLE (no header row: a notes or cover sheet), NO_ROLES (a
            table whose headings name no name or formula column), or
            NOT_MATCHED (a column the user named is not in this table).
        header_index: the 0-based index of the table's header row, when one was seen.
        general: True when the cause is a mapping given for every table
            (``general`` in find_layout), which need not fit this one.
    """

    def __init__(self, message: str, kind: str, header_index: int | None = None, general: bool = False):
        super().__init__(message)
        self.kind = kind
        self.header_index = header_index
        self.general = general

    def __reduce__(self):
        return (LayoutError, (self.message, self.kind, self.header_index, self.general))


def _text(cell: object) -> str:
    return "" if cell is None else str(cell).strip()


@dataclass
class _RowRoles:
    roles: dict[str, int]
    duplicates: list[str]
    ambiguous: list[str]


# Headings of the amount in one pack; beside one of them, a plain quantity heading ("Qty", "Quantity",
# "Stock") counts the packs (common practice of stock lists: "Pack size | Qty").
_PACK_HEADINGS = frozenset(
    {
        "pack size",
        "pack",
        "size",
        "contents",
        "net quantity",
        "packungsgrösse",
        "gebindegrösse",
        "gebinde",
        "inhalt",
    }
)


def _roles_of(row: Sequence[object]) -> _RowRoles:
    out = _RowRoles({}, [], [])
    quantities: list[tuple[int, str]] = []
    for i, cell in enumerate(row):
        text = _text(cell)
        if not text or not isinstance(cell, str):
            continue
        reading = read_heading(text)
        if reading.ambiguous:
            letter = column_letter(i)
            out.ambiguous.append(
                f"{text!r} in column {letter} names {' and '.join(_title(r) for r in reading.ambiguous)};"
                f" it is read as neither (say which with --column {reading.ambiguous[0]}={letter})"
            )
            continue
        role = reading.role
        if role is None:
            continue
        if role == "quantity":
            quantities.append((i, text))
        if role in out.roles:
            out.duplicates.append(
                f"{text!r} in column {column_letter(i)} (the {role} column is"
                f" {column_letter(out.roles[role])})"
            )
        else:
            out.roles[role] = i
    packs = [(i, t) for i, t in quantities if " ".join(heading_words(t)) in _PACK_HEADINGS]
    plain = [(i, t) for i, t in quantities if (i, t) not in packs]
    if packs and plain and "count" not in out.roles:
        out.roles["quantity"], out.roles["count"] = packs[0][0], plain[0][0]
        out.duplicates[:] = [
            d for d in out.duplicates if not any(d.startswith(repr(t)) for _i, t in quantities)
        ]
    return out


_ROLE_TITLES = {"molar_mass": "molar mass", "cas": "CAS RN"}

_ROLE_SPEC = re.compile(r"^(?:(?P<sheet>.*?):)?\s*(?P<role>[A-Za-z_\-]+)\s*=(?P<value>.*)$", re.S)
_ROW_SPEC = re.compile(r"^(?:(?P<sheet>.*):)?\s*(?P<row>[0-9]+)\s*$", re.S)


def _role_spec(spec: str) -> tuple[str | None, str, str]:
    m = _ROLE_SPEC.match(spec)
    if m is None:
        raise CellchemError(
            f"--column {spec!r}: expected ROLE=HEADER_OR_LETTER or SHEET:ROLE=HEADER_OR_LETTER,"
            " such as formula=C"
        )
    role = m["role"]
    key = ROLE_WORDS.get(role.strip().casefold())
    if key is None:
        raise CellchemError(f"--column {spec!r}: '{role}' is not a role; the roles are " + ", ".join(ROLES))
    value = m["value"].strip()
    if not value:
        raise CellchemError(f"--column {spec!r}: no heading or letter after '='")
    sheet = m["sheet"]
    if sheet is not None and not sheet.strip():
        raise CellchemError(f"--column {spec!r}: no sheet name before ':'")
    return (sheet.strip() if sheet is not None else None), key, value


def read_overrides(specs: Sequence[str]) -> dict[str, str]:
    """``ROLE=HEADER_OR_LETTER`` strings from the command line as a mapping
    (the ones for every sheet; see ``read_column_options`` for per-sheet ones).

    >>> read_overrides(["formula=C", "mass=Mol. Wt."])
    {'formula': 'C', 'molar_mass': 'Mol. Wt.'}
    """
    options = read_column_options(specs)
    if options.by_sheet:
        sheet = next(iter(options.by_sheet))
        raise CellchemError(
            f"--column for sheet {sheet!r}: this command reads one table; leave out the sheet"
        )
    return dict(options.general)


@dataclass(frozen=True)
class ColumnOptions:
    """The ``--column`` and ``--header-row`` options of a run.

    Attributes:
        general: role -> heading or letter, for every sheet.
        by_sheet: sheet name -> role -> heading or letter; wins over ``general`` on its sheet.
        header_row: the 1-based header row of every sheet, or None to find it.
        header_rows: sheet name -> 1-based header row; wins over ``header_row``.
    """

    general: Mapping[str, str] = field(default_factory=dict)
    by_sheet: Mapping[str, Mapping[str, str]] = field(default_factory=dict)
    header_row: int | None = None
    header_rows: Mapping[str, int] = field(default_factory=dict)

    def _sheet_key(self, table: Mapping[str, object], sheet: str) -> str | None:
        if sheet in table:
            return sheet
        folded = [k for k in table if k.casefold() == sheet.casefold()]
        return folded[0] if folded else None

    def for_sheet(self, sheet: str) -> tuple[dict[str, str], dict[str, str], int | None]:
        """(roles set for this sheet, roles set for every sheet and not
        overridden here, the 1-based header row or None) for a sheet (''
        for a text file)."""
        key = self._sheet_key(self.by_sheet, sheet)
        specific = dict(self.by_sheet[key]) if key is not None else {}
        general = {role: value for role, value in self.general.items() if role not in specific}
        row_key = self._sheet_key(self.header_rows, sheet)
        return specific, general, self.header_rows[row_key] if row_key is not None else self.header_row

    def sheets_named(self) -> set[str]:
        """Every sheet an option names."""
        return set(self.by_sheet) | set(self.header_rows)


def read_column_options(columns: Sequence[str] = (), header_rows: Sequence[str] = ()) -> ColumnOptions:
    """``--column [SHEET:]ROLE=HEADER_OR_LETTER`` and ``--header-row [SHEET:]N``
    options as a ColumnOptions.

    >>> o = read_column_options(["formula=C", "Old stock:formula=B"], ["4", "Old stock:1"])
    >>> o.for_sheet("Old stock"), o.for_sheet("Stock")
    (({'formula': 'B'}, {}, 1), ({}, {'formula': 'C'}, 4))
    """
    general: dict[str, str] = {}
    by_sheet: dict[str, dict[str, str]] = {}
    for spec in columns:
        sheet, role, value = _role_spec(spec)
        table = general if sheet is None else by_sheet.setdefault(sheet, {})
        if role in table and table[role] != value:
            where = "" if sheet is None else f" of sheet {sheet!r}"
            raise CellchemError(
                f"--column {spec!r}: the {role} column{where} is already given as {table[role]!r}"
            )
        table[role] = value
    for sheet, table in [(None, general), *by_sheet.items()]:
        seen: dict[str, str] = {}
        for role, value in table.items():
            key = value.casefold()
            if key in seen:
                where = "" if sheet is None else f" on sheet {sheet!r}"
                raise CellchemError(
                    f"--column: {value!r} is given for both {seen[key]} and {role}{where};"
                    " a column holds one role"
                )
            seen[key] = role
    row: int | None = None
    rows: dict[str, int] = {}
    for spec in header_rows:
        m = _ROW_SPEC.match(spec)
        if m is None:
            raise CellchemError(
                f"--header-row {spec!r}: expected a row number or SHEET:N, such as 4 or 'Stock:4'"
            )
        number = int(m["row"])
        if not 1 <= number <= MAX_HEADER_ROW:
            raise CellchemError(f"--header-row {spec!r}: the row must be from 1 to {MAX_HEADER_ROW}")
        sheet = m["sheet"]
        if sheet is None:
            if row is not None and row != number:
                raise CellchemError(f"--header-row {spec!r}: the header row is already given as {row}")
            row = number
        else:
            sheet = sheet.strip()
            if not sheet:
                raise CellchemError(f"--header-row {spec!r}: no sheet name before ':'")
            if rows.get(sheet, number) != number:
                raise CellchemError(
                    f"--header-row {spec!r}: the header row of sheet {sheet!r} is already given as"
                    f" {rows[sheet]}"
                )
            rows[sheet] = number
    return ColumnOptions(general, by_sheet, row, rows)


def _resolve(role: str, value: str, headers: Sequence[str]) -> int:
    exact = [i for i, h in enumerate(headers) if _text(h).casefold() == value.casefold()]
    if not exact:
        exact = [
            i for i, h in enumerate(headers) if fold_heading(h) and fold_heading(h) == fold_heading(value)
        ]
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
    raise LayoutError(
        f"--column {role}={value}: no column headed '{value}'; the headings are: {seen}", NOT_MATCHED
    )


def _is_letter(value: str, headers: Sequence[str]) -> bool:
    """Whether an override names a column by its letter (and not by a heading of this row)."""
    if not re.fullmatch(r"[A-Za-z]{1,3}", value):
        return False
    return not any(_text(h).casefold() == value.casefold() for h in headers)


@dataclass
class _Candidate:
    index: int
    headers: tuple[str, ...]
    roles: dict[str, int]
    auto: int
    score: int
    duplicates: list[str]
    ambiguous: list[str]
    replaced: list[str]


def _title(role: str) -> str:
    return _ROLE_TITLES.get(role, role)


def _candidate(
    index: int, row: Sequence[object], specific: Mapping[str, str], general: Mapping[str, str]
) -> _Candidate:
    """The roles of a row read as the header, with the user's columns applied.

    Raises LayoutError (NOT_MATCHED) when a heading the user named is not in
    the row, or when a letter given for every table points here at a column
    whose heading names another role, or the role's own column is another."""
    headers = tuple(_text(c) for c in row)
    found = _roles_of(row)
    auto_at = {i: r for r, i in found.roles.items()}
    user_roles = set(specific) | set(general)
    chosen: dict[str, int] = {}
    taken: dict[int, str] = {}
    for role, value, is_general in [(r, v, False) for r, v in specific.items()] + [
        (r, v, True) for r, v in general.items()
    ]:
        try:
            i = _resolve(role, value, headers)
        except LayoutError as exc:
            exc.general = is_general
            exc.header_index = index
            raise
        if i in taken:
            raise CellchemError(
                f"--column: column {column_letter(i)} is given two roles,"
                f" {_title(taken[i])} and {_title(role)}"
            )
        taken[i] = role
        if is_general and _is_letter(value, headers):
            holder = auto_at.get(i)
            heading = headers[i] if i < len(headers) else ""
            if holder is not None and holder != role and holder not in user_roles:
                raise LayoutError(
                    f"--column {role}={value}: column {column_letter(i)} is headed {heading!r} here, which"
                    f" is the {_title(holder)} column",
                    NOT_MATCHED,
                    index,
                    general=True,
                )
            own = found.roles.get(role)
            if own is not None and own != i:
                raise LayoutError(
                    f"--column {role}={value}: the {_title(role)} column here is {column_letter(own)}"
                    f" {headers[own]!r}",
                    NOT_MATCHED,
                    index,
                    general=True,
                )
        chosen[role] = i
    roles = dict(found.roles)
    replaced: list[str] = []
    for role, i in chosen.items():
        holder = auto_at.get(i)
        if holder is not None and holder != role and roles.get(holder) == i:
            replaced.append(
                f"column {column_letter(i)} {headers[i]!r} is read as {_title(role)} (--column),"
                f" not as {_title(holder)}"
            )
            del roles[holder]
        own = roles.get(role)
        if own is not None and own != i:
            replaced.append(
                f"column {column_letter(own)} {headers[own]!r} is not read as {_title(role)}:"
                f" --column names column {column_letter(i)}"
            )
        roles[role] = i
    letters = sum(1 for v in {**general, **specific}.values() if _is_letter(v, headers))
    score = len(found.roles) + len(chosen) - letters
    return _Candidate(
        index, headers, roles, len(found.roles), score, found.duplicates, found.ambiguous, replaced
    )


def _looks_like_a_header(rows: Sequence[Sequence[object]], index: int) -> bool:
    """A row of headings: at least two cells, one naming a role, or at least
    three short text cells that are not numbers; with a row of at least two
    cells soon after it."""
    row = rows[index]
    cells = [c for c in row if _text(c)]
    if len(cells) < 2:
        return False
    if not _roles_of(row).roles:
        if len(cells) < 3 or not all(isinstance(c, str) and len(c.strip()) <= 60 for c in cells):
            return False
        if any(re.fullmatch(r"[-+]?[0-9][0-9.,\s]*", str(c).strip()) for c in cells):
            return False
    return any(sum(1 for c in later if _text(c)) >= 2 for later in rows[index + 1 : index + 4])


def _no_layout(
    rows: Sequence[Sequence[object]], window: Sequence[tuple[int, Sequence[object]]], header_index: int | None
) -> LayoutError:
    table = header_index
    if table is None:
        table = next((i for i, _row in window if _looks_like_a_header(rows, i)), None)
    if table is not None:
        headers = [_text(c) for c in rows[table]]
        seen = ", ".join(repr(h) for h in headers if h) or "none"
        return LayoutError(
            f"no name or formula column in the header row {table + 1}; the headings are: {seen}"
            " (name one with --column formula=HEADER_OR_LETTER)",
            NO_ROLES,
            table,
        )
    seen_rows = [
        ", ".join(repr(_text(c)[:40]) for c in row if _text(c))
        for _i, row in window
        if any(_text(c) for c in row)
    ][:3]
    return LayoutError(
        "no header row with a name or formula column among the first 20 rows; the first rows read: "
        + ("; ".join(seen_rows) or "nothing")
        + " (name the columns with --column formula=HEADER_OR_LETTER)",
        NO_TABLE,
    )


def table_header_row(rows: Sequence[Sequence[object]]) -> int | None:
    """The 0-based index of the first of the first 20 rows that reads as the
    header of a table (headings naming roles, or a row of text headings with
    data under it), whether or not it has a name or formula column; None for
    a sheet of notes."""
    for i in range(min(len(rows), HEADER_SEARCH_ROWS)):
        if _looks_like_a_header(rows, i):
            return i
    return None


def find_layout(
    rows: Sequence[Sequence[object]],
    overrides: Mapping[str, str] | None = None,
    *,
    header_index: int | None = None,
    general: Mapping[str, str] | None = None,
) -> Layout:
    """Find the header row among the first 20 rows and the column of each role.

    Args:
        rows: the first rows of the table (at least the first 20 if it has
            them, and the header row when ``header_index`` is given).
        overrides: role -> heading or column letter, from the user, for this table.
        header_index: the 0-based index of the header row among ``rows``,
            when the user gave it; otherwise the header row is found: the
            first of the first 20 rows that names the most roles.
        general: role -> heading or column letter given for every table of a
            run (``--column`` without a sheet); ``overrides`` win over it. A
            heading it names that this table lacks, or a letter whose column
            here is headed for another role (or whose role this table has in
            another column), gives a LayoutError NOT_MATCHED with ``general``
            set, never a layout with the wrong columns.

    Returns:
        The Layout. No column holds two roles: a column the user names gives up
        the role its heading names (said in ``replaced``).

    Raises:
        LayoutError: no header row names a name or formula column (NO_TABLE,
            or NO_ROLES for a table whose headings name neither; the message
            lists what was seen), or a column the user named is not in the
            table (NOT_MATCHED).
        CellchemError: two roles given for one column, or a heading that is
            also the letter of another column.

    >>> layout = find_layout([["Stock list"], [], ["Item", "Formula", "MW", "CAS No."]])
    >>> layout.header_index, dict(layout.roles)
    (2, {'name': 0, 'formula': 1, 'molar_mass': 2, 'cas': 3})
    """
    specific = dict(overrides or {})
    general = {r: v for r, v in (general or {}).items() if r not in specific}
    if header_index is not None:
        if not 0 <= header_index < len(rows) or not any(_text(c) for c in rows[header_index]):
            raise LayoutError(f"the header row {header_index + 1} is empty", NO_TABLE, header_index)
        window: list[tuple[int, Sequence[object]]] = [(header_index, rows[header_index])]
    else:
        window = list(enumerate(rows[:HEADER_SEARCH_ROWS]))
    best: _Candidate | None = None
    refused: tuple[int, LayoutError] | None = None  # (roles the row's headings name, why)
    for i, row in window:
        if not any(_text(c) for c in row):
            continue
        try:
            cand = _candidate(i, row, specific, general)
        except LayoutError as exc:
            auto = len(_roles_of(row).roles)
            if refused is None or auto > refused[0]:
                refused = (auto, exc)
            continue
        if not ({"name", "formula"} & cand.roles.keys()):
            continue
        if header_index is None and cand.score == 0:
            # only columns named by letter: the header row has a heading in each of them
            if not all(j < len(row) and _text(row[j]) for j in cand.roles.values()):
                continue
        if best is None or cand.score > best.score:
            best = cand
    if refused is not None and (best is None or refused[0] > best.auto):
        raise refused[1]
    if best is None:
        raise _no_layout(rows, window, header_index)
    return Layout(
        best.index,
        best.headers,
        best.roles,
        tuple(best.duplicates),
        tuple({**general, **specific}),
        tuple(best.ambiguous),
        tuple(best.replaced),
    )
