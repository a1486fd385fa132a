r"""Reading a supplier table exported as CSV or TXT into plain Python values.

Supplier files are untrusted and arrive in many encodings and layouts, so this
reader never guesses silently: a byte-order mark decides the encoding, then
strict UTF-8, then Windows-1252 only when no UTF-8 sequence is present at all
(a note says so); a file that mixes encodings, holds NUL bytes or cannot be
split into columns one way only is refused with a one-line message that starts
with the file name in quotes and says what would make it usable.

The file is never held whole. :func:`open_text_table` reads it once, in
chunks, to check that all of it decodes (a decoding error anywhere is
reported with its byte and line before any row is given), decides the
separator from a bounded sample of the start, and gives a
:class:`TextStream` whose ``rows()`` and ``records()`` read the records one
at a time. Caps hold while streaming: ``MAX_TEXT_BYTES`` bytes, ``MAX_ROWS``
records (more refuses the file), ``MAX_COLUMNS`` cells of a row (the rest
are not kept; ``truncated`` says so), ``MAX_CELL_CHARS`` characters of one
cell (the rest of a longer one streams past) and ``MAX_RECORD_CHARS`` of one
record, which is never held whole: a row over either cap is that row's
problem (read with its long cells cut, a note names its line), never the
file's. :func:`read_text_table` collects the rows of a stream into a
:class:`TextTable`.

Cells are returned exactly as written (nothing stripped or converted);
:func:`parse_number` reads a number from a cell under the file's decimal
convention, refusing the readings it cannot tell apart.
"""

from __future__ import annotations

import codecs
import csv
import math
import os
import re
from collections import Counter
from collections.abc import Callable, Iterator
from dataclasses import dataclass
from typing import BinaryIO, NamedTuple

from ...columns import column_letter
from ...errors import CellchemError
from . import MAX_CELL_CHARS, MAX_COLUMNS, MAX_ROWS, MAX_TEXT_BYTES, OTHER_CELLS, UnusableFile

MAX_RECORD_CHARS = 1 << 20  # one record (a row, with any line breaks in its quoted cells): 1 Mi characters

_CANDIDATES = (",", ";", "\t")
_DELIMITER_ARGUMENTS = {
    ",": ",",
    ";": ";",
    "\t": "\t",
    "\\t": "\t",  # a tab typed at a command line as backslash-t
    "comma": ",",
    "semicolon": ";",
    "tab": "\t",
}
_DELIMITER_WORDS = {",": "comma", ";": "semicolon", "\t": "tab"}
_DELIMITER_PLURALS = {",": "commas", ";": "semicolons", "\t": "tabs"}
_SAMPLE_LINES = 50  # non-empty records looked at to choose the delimiter
_SAMPLE_CHARS = 1 << 20  # the start of the file those records are looked for in (whole lines only)
_READ_CHUNK = 1 << 20  # bytes read at a time, so that the size limit holds for any file
_RESAVE = 're-save it as "CSV UTF-8" or pass --encoding'

_LINE = re.compile(r"[^\r\n]*(?:\r\n|\r|\n)|[^\r\n]+\Z")
_WHOLE_LINE = re.compile(r"[^\r\n]*(?:\r\n|\r|\n)")
_BREAK = re.compile(r"[\r\n]")
_SEP_HINT = re.compile(r"sep=([,;\t])(?:\r\n|\r|\n|\Z)", re.IGNORECASE)
_NOT_ASCII_NOR_ESCAPED = re.compile("[^\x00-\x7f\udc80-\udcff]")
_CP1252_UNDEFINED = (b"\x81", b"\x8d", b"\x8f", b"\x90", b"\x9d")


@dataclass(frozen=True)
class TextTable:
    """The rows of a text export, with what was used and assumed to read them.

    Attributes:
        rows: every record read, each a tuple of cells as ``str`` ('' for an
            empty cell; at most MAX_COLUMNS of them, each cut at MAX_CELL_CHARS
            characters); an empty line is an empty tuple. Trailing empty lines
            are dropped.
        line_numbers: the 1-based physical line on which each row starts (a
            quoted cell may hold line breaks, so rows and lines can differ).
        encoding: the codec used: 'utf-8', 'utf-8-sig', 'utf-16' or 'cp1252'
            when detected, else Python's name of the codec passed.
        delimiter: ',', ';' or '\t'.
        decimal_comma: True when the numbers of the file are written with a
            decimal comma (semicolon files, the European export convention).
        line_ending: the most frequent line break, '\r\n', '\n' or '\r'
            ('\r\n' for a file of one line without a break).
        notes: what was assumed to read the file, then the rows over a cap
            (a cell cut, a record too long to hold) and the columns not read,
            one line each.
    """

    rows: tuple[tuple[str, ...], ...]
    line_numbers: tuple[int, ...]
    encoding: str
    delimiter: str
    decimal_comma: bool
    line_ending: str
    notes: tuple[str, ...]


def read_text_table(
    path: str | os.PathLike[str],
    encoding: str | None = None,
    delimiter: str | None = None,
) -> TextTable:
    r"""Read a CSV or TXT table exported by a spreadsheet or a supplier system.

    The rows are collected from :func:`open_text_table`'s stream; a caller
    that can take the rows one at a time should use the stream instead.

    Args:
        path: the file to read.
        encoding: a codec name to decode with strictly, or None to decide from
            the bytes (byte-order mark, else strict UTF-8, else Windows-1252
            when no UTF-8 sequence is present at all).
        delimiter: ',', ';', '\t' or the words 'comma', 'semicolon', 'tab'; None
            to choose from the first 50 non-empty lines (the candidate found a
            consistent number of times outside quotes). A first line
            ``sep=;`` (a spreadsheet hint) names it too, and is not read as a row.

    Returns:
        The rows with their line numbers, the encoding, delimiter, decimal
        convention and line ending used, and notes on what was assumed and
        on the rows and columns not read.

    Raises:
        UnusableFile: the file cannot be read, is larger than MAX_TEXT_BYTES or
            holds more than MAX_ROWS rows, is empty, is not text in one
            encoding, has a quote that is not closed, or could be split by
            two delimiters equally well.

    Example:
        >>> import pathlib, tempfile
        >>> folder = tempfile.TemporaryDirectory()
        >>> path = pathlib.Path(folder.name) / "stock.csv"
        >>> _ = path.write_bytes(b"Name;Molar mass\r\nSodium chloride;58,44\r\n")
        >>> table = read_text_table(path)
        >>> table.rows
        (('Name', 'Molar mass'), ('Sodium chloride', '58,44'))
        >>> table.encoding, table.delimiter, table.decimal_comma, table.line_ending
        ('utf-8', ';', True, '\r\n')
        >>> folder.cleanup()
    """
    stream = open_text_table(path, encoding, delimiter)
    reading = RecordStream(stream, None)
    rows: list[tuple[str, ...]] = []
    line_numbers: list[int] = []
    for record in reading:
        rows.append(tuple(record.fields))
        line_numbers.append(record.line)
    while rows and not rows[-1]:
        rows.pop()
        line_numbers.pop()
    notes = [*stream.notes, *(problem for _line, problem in reading.problems)]
    if reading.truncated_at:
        notes.append(
            f"columns beyond {column_letter(MAX_COLUMNS - 1)} were not read"
            f" (first on line {reading.truncated_at})"
        )
    return TextTable(
        rows=tuple(rows),
        line_numbers=tuple(line_numbers),
        encoding=stream.encoding,
        delimiter=stream.delimiter,
        decimal_comma=stream.decimal_comma,
        line_ending=_dominant(reading.endings),
        notes=tuple(notes),
    )


def open_text_table(
    path: str | os.PathLike[str],
    encoding: str | None = None,
    delimiter: str | None = None,
) -> TextStream:
    r"""Open a CSV or TXT export for streaming: its encoding, delimiter and
    decimal convention decided, its rows not yet read.

    The whole file is read once, in chunks, to check that it decodes (the
    same refusals as :func:`read_text_table`, before any row is given);
    the delimiter is chosen from the first 50 non-empty records within the
    first ``_SAMPLE_CHARS`` characters. Nothing of the file is kept but that
    sample's decisions.

    Args:
        path, encoding, delimiter: as for :func:`read_text_table`.

    Returns:
        A :class:`TextStream`.

    Raises:
        UnusableFile: as :func:`read_text_table`; an empty file, too many
            rows, an unclosed quote or text after a closing quote are found
            while streaming, and raised from the iteration.

    Example:
        >>> import pathlib, tempfile
        >>> folder = tempfile.TemporaryDirectory()
        >>> path = pathlib.Path(folder.name) / "stock.csv"
        >>> _ = path.write_bytes(b"Name;Molar mass\r\nSodium chloride;58,44\r\n\r\nWater;\r\n")
        >>> stream = open_text_table(path)
        >>> stream.encoding, stream.delimiter, stream.decimal_comma
        ('utf-8', ';', True)
        >>> list(stream.rows())
        [(1, ['Name', 'Molar mass']), (2, ['Sodium chloride', '58,44']), (3, []), (4, ['Water', None])]
        >>> folder.cleanup()
    """
    shown = _shown(path)
    chosen = None if delimiter is None else _delimiter_argument(shown, delimiter)
    notes: list[str] = []
    plan = _inspect(path, shown, encoding, notes)
    sample = _sample(plan)
    line_ending = _dominant(_ending_counts(sample))

    start = 0
    hint = _SEP_HINT.match(sample)
    if hint:
        start = hint.end()
        named = hint.group(1)
        note = f"the first line is a spreadsheet hint naming the delimiter ({_DELIMITER_WORDS[named]})"
        if chosen is not None and chosen != named:
            note += f"; the delimiter given ({_DELIMITER_WORDS[chosen]}) was used instead"
        notes.append(note + "; it was not read as a row")
        if chosen is None:
            chosen = named
    if chosen is None:
        chosen = _detect_delimiter(sample, start, shown, notes)
    if chosen == ";":
        notes.append(
            "numbers read with a decimal comma: the columns are separated by semicolons"
            " (the European export convention)"
        )
    return TextStream(
        plan=plan,
        shown=shown,
        encoding=plan.encoding,
        delimiter=chosen,
        decimal_comma=chosen == ";",
        line_ending=line_ending,
        notes=tuple(notes),
        preamble=sample[:start],
    )


class Record(NamedTuple):
    """One record of a text export, as a writer needs it.

    Attributes:
        line: the 1-based physical line the record starts on.
        fields: its cells as written ('' for an empty one; an empty line gives
            []): at most MAX_COLUMNS, each cut at MAX_CELL_CHARS characters.
        raw: the record's text exactly as in the file, with its line ending;
            None when the record was longer than MAX_RECORD_CHARS, its text
            then having gone to the ``spill`` of :meth:`TextStream.records`.
        problem: '' for a record read as written, else a note naming its line:
            the record was longer than MAX_RECORD_CHARS, or a cell was cut.
    """

    line: int
    fields: list[str] | None
    raw: str | None
    problem: str = ""


@dataclass(frozen=True)
class TextStream:
    r"""An opened text export: what was decided from the file, and its rows
    read one at a time (each call of ``rows()`` or ``records()`` reads the
    file again from the start).

    Attributes:
        encoding: the codec reported, as ``TextTable.encoding``.
        delimiter, decimal_comma, notes: as ``TextTable``'s (``notes`` only
            what was assumed; rows over a cap are in ``RowStream.problems``).
        line_ending: the most frequent line break in the sample.
        bom: the byte-order mark the file starts with (b'' when none; the
            decoded text never holds it).
        codec: the codec of the bytes after ``bom``: the file is ``bom +
            text.encode(codec)``.
        preamble: the text before the first record (a ``sep=;`` hint line
            with its line break), never given as a row.
        size: the file's size in bytes.
    """

    plan: _Plan
    shown: str
    encoding: str
    delimiter: str
    decimal_comma: bool
    line_ending: str
    notes: tuple[str, ...]
    preamble: str

    @property
    def bom(self) -> bytes:
        return self.plan.bom

    @property
    def codec(self) -> str:
        return self.plan.codec

    @property
    def size(self) -> int:
        return self.plan.identity[2]

    def rows(self, sheet: str = "") -> RowStream:
        """The rows as every reader gives them: ``(line number, values)``,
        values None for an empty cell, else the cell's text (an empty line
        gives ``[]``, so that a header row named by its line is found); a
        row over a cap is given with its long cells cut
        (``problems`` names it). ``sheet`` is ignored (a text file has one)."""
        return RowStream(self)

    def records(self, spill: Callable[[str], object] | None = None) -> RecordStream:
        """Every record with its raw text, empty lines included, for a
        writer that copies the file. The text of a record
        longer than MAX_RECORD_CHARS is passed to ``spill`` piece by piece
        as it is read (dropped when ``spill`` is None), then the record is
        given with ``raw`` None."""
        return RecordStream(self, spill)


class RowStream:
    """The rows of a text export, streamed: ``(line number, values)``.

    Attributes:
        keep: may be set at any time to the 0-based columns still needed;
            the cells of other columns are then given as None.
        truncated: a row had non-empty cells beyond MAX_COLUMNS (not read).
        problems: ``(line, message)`` for each row over a cap so far.
    """

    def __init__(self, stream: TextStream) -> None:
        self.keep: frozenset[int] | None = None
        self._reading = RecordStream(stream, None)
        self.problems = self._reading.problems
        self._it = self._rows()

    @property
    def truncated(self) -> bool:
        return self._reading.truncated_at > 0

    def __iter__(self) -> Iterator[tuple[int, list[object]]]:
        return self._it  # the generator itself: a for loop then runs at its speed

    def __next__(self) -> tuple[int, list[object]]:
        return next(self._it)

    def _rows(self) -> Iterator[tuple[int, list[object]]]:
        for record in self._reading._it:
            fields = record.fields
            keep = self.keep
            if keep is None:
                yield record.line, [f if f else None for f in fields]
            else:
                values = [f if f and i in keep else None for i, f in enumerate(fields)]
                if not any(values) and any(fields):
                    # nothing in the columns kept, something in another: not a blank row (as for .xlsx)
                    free = next(i for i in range(MAX_COLUMNS + 1) if i not in keep)
                    values = [None] * free + [OTHER_CELLS]
                yield record.line, values


def parse_number(text: str, decimal_comma: bool) -> float | None:
    """A number from a cell, read under the file's decimal convention.

    Digits may be grouped in threes by spaces (also no-break and thin spaces)
    or by the separator that is not the decimal one: a point when
    ``decimal_comma``, else a comma. A sign and an exponent (``1.5e-3``, not
    with grouped digits) are allowed; whitespace around the number is ignored.

    Args:
        text: the cell as read.
        decimal_comma: True when the file writes decimals with a comma.

    Returns:
        The value (a plain number, no unit), or None for an empty cell.

    Raises:
        CellchemError: the text is not a number; it uses the other decimal
            convention (the message gives the number as this file writes it);
            or it is ambiguous: one comma (one point when ``decimal_comma``)
            followed by exactly three digits could group thousands or mark
            decimals, so both readings are given in ``choices``.

    Example:
        >>> parse_number(" 1 234,5 ", decimal_comma=True)
        1234.5
        >>> parse_number("1,234.5", decimal_comma=False)
        1234.5
        >>> parse_number("", decimal_comma=False) is None
        True
        >>> parse_number("1,234", decimal_comma=False)  # doctest: +ELLIPSIS
        Traceback (most recent call last):
        ...
        cellchem.errors.CellchemError: '1,234' is ambiguous: 1234 if ',' groups thousands, or 1.234 if ...
    """
    stripped = text.strip()
    if not stripped:
        return None
    own = _number_parts(stripped, decimal_comma)
    if own is None:
        other = _number_parts(stripped, not decimal_comma)
        if other is None:
            example = "58,44" if decimal_comma else "58.44"
            raise CellchemError(
                f"{text!r} is not a number; expected digits with a decimal {_mark(decimal_comma)},"
                f" such as {example}",
                text=text,
            )
        raise CellchemError(
            f"{text!r} is written with a decimal {_mark(not decimal_comma)}, but this file writes"
            f" decimals with a {_mark(decimal_comma)}: write {_written(other, decimal_comma)}",
            text=text,
            choices=(_written(other, decimal_comma),),
        )
    if own.ambiguous:
        group = "." if decimal_comma else ","
        grouped = _Number(own.sign, own.whole, "", "", ambiguous=False)
        decimals = _Number(own.sign, own.whole[:-3], own.whole[-3:], "", ambiguous=False)
        readings = (_written(grouped, decimal_comma), _written(decimals, decimal_comma))
        raise CellchemError(
            f"{text!r} is ambiguous: {_written(grouped, False)} if {group!r} groups thousands,"
            f" or {_written(decimals, False)} if it marks decimals; write {readings[0]} or {readings[1]}",
            text=text,
            choices=readings,
        )
    value = float(_written(own, False))
    if not math.isfinite(value):
        raise CellchemError(f"{text!r} is too large for a number", text=text)
    return value


_MASS_UNIT = re.compile(r"\s*(?:g\s*/\s*mol|g\s*·\s*mol⁻¹|g\s*mol-1)\s*$", re.IGNORECASE)


def ungrouped_number(text: str, decimal_comma: bool) -> str:
    """A number cell with its digit grouping taken out when the grouping is
    certain, the decimal mark and any g/mol unit kept as written: ``1.235,86``
    in a decimal-comma file is ``1235,86``, ``1 235,86`` too, ``1,235.86`` in
    a decimal-point file is ``1235.86``. Anything else is given back as it is:
    text that is no number, a number without grouping, and a grouping that
    could also be a decimal mark (``1.235`` in a decimal-comma file), which
    the reader of the cell refuses or reads by its own rules.

    >>> ungrouped_number("1.235,86", True), ungrouped_number("1 235,86 g/mol", True)
    ('1235,86', '1235,86 g/mol')
    >>> ungrouped_number("1.235", True), ungrouped_number("58,44", True), ungrouped_number("n/a", True)
    ('1.235', '58,44', 'n/a')
    """
    if not isinstance(text, str):
        return text
    unit = _MASS_UNIT.search(text)
    number = text[: unit.start()] if unit else text
    stripped = number.strip()
    parts = _number_parts(stripped, decimal_comma)
    group = "." if decimal_comma else ","
    grouped = any(sep in stripped for sep in group + _SPACES)
    if parts is None or parts.ambiguous or not grouped:
        return text
    return _written(parts, decimal_comma) + (unit.group(0) if unit else "")


# --- numbers -------------------------------------------------------------------------------------


@dataclass(frozen=True)
class _Number:
    """A number taken apart: sign ('' or '-'), whole digits, fraction digits,
    exponent ('' or such as 'e-3'); ambiguous when one group separator and
    exactly three digits after it could also be a decimal mark."""

    sign: str
    whole: str
    fraction: str
    exponent: str
    ambiguous: bool


_SPACES = " \u00a0\u202f\u2009"  # space, no-break space, narrow no-break space, thin space


def _number_pattern(decimal: str, group: str) -> re.Pattern[str]:
    d, g = re.escape(decimal), re.escape(group + _SPACES)
    return re.compile(
        rf"(?P<sign>[+\-\u2212]?)"
        rf"(?:(?P<plain>\d+)(?:{d}(?P<pfrac>\d*))?(?P<exp>[eE][+\-]?\d+)?"
        rf"|{d}(?P<lfrac>\d+)(?P<lexp>[eE][+\-]?\d+)?"
        rf"|(?P<grouped>\d{{1,3}}(?P<sep>[{g}])\d{{3}}(?:(?P=sep)\d{{3}})*)(?:{d}(?P<gfrac>\d*))?)"
    )


_PATTERNS = {False: _number_pattern(".", ","), True: _number_pattern(",", ".")}


def _number_parts(text: str, decimal_comma: bool) -> _Number | None:
    m = _PATTERNS[decimal_comma].fullmatch(text)
    if m is None:
        return None
    sign = "-" if m["sign"] in ("-", "\u2212") else ""
    if m["plain"] is not None:
        return _Number(sign, m["plain"], m["pfrac"] or "", m["exp"] or "", ambiguous=False)
    if m["lfrac"] is not None:
        return _Number(sign, "0", m["lfrac"], m["lexp"] or "", ambiguous=False)
    sep = m["sep"]
    grouped = m["grouped"]
    ambiguous = sep not in _SPACES and grouped.count(sep) == 1 and m["gfrac"] is None
    return _Number(sign, grouped.replace(sep, ""), m["gfrac"] or "", "", ambiguous=ambiguous)


def _written(number: _Number, decimal_comma: bool) -> str:
    """The number as plain digits with the decimal mark of the convention."""
    mark = "," if decimal_comma else "."
    fraction = mark + number.fraction if number.fraction else ""
    return number.sign + number.whole + fraction + number.exponent


def _mark(decimal_comma: bool) -> str:
    return "comma" if decimal_comma else "point"


# --- bytes and encodings -------------------------------------------------------------------------


def _shown(path: str | os.PathLike[str]) -> str:
    """The path as given, in quotes, with control characters escaped (one line)."""
    name = os.fsdecode(os.fspath(path))
    if not name.isprintable():
        name = "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in name)
    return f"'{name}'"


def _delimiter_argument(shown: str, delimiter: str) -> str:
    chosen = _DELIMITER_ARGUMENTS.get(delimiter.lower() if delimiter.isalpha() else delimiter)
    if chosen is None:
        raise UnusableFile(
            f"{shown}: the delimiter {delimiter!r} is not one cellchem reads;"
            " pass comma, semicolon or tab (or ',', ';', a tab character)"
        )
    return chosen


def _size(n: int) -> str:
    for unit, shift in (("GiB", 30), ("MiB", 20), ("KiB", 10)):
        if n >= 1 << shift and n % (1 << shift) == 0:
            return f"{n >> shift} {unit}"
    return f"{n} bytes"


@dataclass(frozen=True)
class _Plan:
    """How the file's bytes become text: skip ``bom`` (its length in bytes),
    decode the rest with ``codec``; ``drop_mark``: the first character decoded
    is a byte-order mark to drop (an encoding given that does not drop it)."""

    path: str | os.PathLike[str]
    shown: str
    encoding: str  # the name reported
    codec: str
    bom: bytes
    drop_mark: bool
    identity: tuple[int, int, int, int]  # device, inode, size, modification time: the file read


def _identity(f: BinaryIO) -> tuple[int, int, int, int]:
    st = os.fstat(f.fileno())
    return (st.st_dev, st.st_ino, st.st_size, st.st_mtime_ns)


def _too_large(shown: str) -> UnusableFile:
    return UnusableFile(
        f"{shown} is larger than {_size(MAX_TEXT_BYTES)}, the limit for a text file;"
        " split it into smaller files"
    )


def _chunks(f: BinaryIO, shown: str) -> Iterator[bytes]:
    """The file's bytes in chunks of _READ_CHUNK, refused past MAX_TEXT_BYTES."""
    total = 0
    while chunk := f.read(_READ_CHUNK):
        total += len(chunk)
        if total > MAX_TEXT_BYTES:
            raise _too_large(shown)
        yield chunk


class _Lines:
    """Counts line breaks ('\\r\\n', '\\r', '\\n') over text or bytes given in
    pieces: ``line`` is the 1-based line on which the next piece starts."""

    __slots__ = ("_cr_last", "cr", "crlf", "lf", "line")

    def __init__(self, line: int = 1) -> None:
        self.line = line
        self.crlf = self.lf = self.cr = 0
        self._cr_last = False

    def feed(self, piece) -> None:
        if not piece:
            return
        if isinstance(piece, bytes):
            crlf, lf, cr = piece.count(b"\r\n"), piece.count(b"\n"), piece.count(b"\r")
            joined = self._cr_last and piece[0] == 10
            self._cr_last = piece[-1] == 13
        else:
            crlf, lf, cr = piece.count("\r\n"), piece.count("\n"), piece.count("\r")
            joined = self._cr_last and piece[0] == "\n"
            self._cr_last = piece[-1] == "\r"
        lf -= crlf
        cr -= crlf
        if joined:  # a CR at the end of the last piece and this LF are one break, counted once
            lf -= 1
            self.cr -= 1
            crlf += 1
            self.line -= 1
        self.crlf += crlf
        self.lf += lf
        self.cr += cr
        self.line += crlf + lf + cr


def _dominant(counts: tuple[int, int, int]) -> str:
    """The most frequent line break from (CRLF, LF, CR) counts; ties go to the first."""
    endings = ("\r\n", "\n", "\r")
    best = max(range(3), key=lambda i: counts[i])
    return endings[best] if counts[best] else "\r\n"


def _ending_counts(text: str) -> tuple[int, int, int]:
    lines = _Lines()
    lines.feed(text)
    return lines.crlf, lines.lf, lines.cr


def _where_text(offset: int, byte: int | None, line: int) -> str:
    """'byte N (0xXX, line L)' for the 0-based ``offset`` of a byte."""
    shown = f"0x{byte:02X}, " if byte is not None else ""
    return f"byte {offset + 1} ({shown}line {line})"


def _inspect(path: str | os.PathLike[str], shown: str, encoding: str | None, notes: list[str]) -> _Plan:
    """Read the whole file once, in chunks, and decide how it decodes; refuse
    it (UnusableFile) as a whole when it does not."""
    try:
        with open(path, "rb") as f:
            identity = _identity(f)
            if identity[2] > MAX_TEXT_BYTES:
                raise _too_large(shown)
            head = f.read(4)
            f.seek(0)
            if not head:
                raise UnusableFile(f"{shown} is empty: it holds no rows")
            if encoding is not None:
                return _inspect_as(f, path, shown, encoding, head, identity, notes)
            if head.startswith((codecs.BOM_UTF32_LE, codecs.BOM_UTF32_BE)):
                raise UnusableFile(
                    f'{shown} starts with a UTF-32 byte-order mark: re-save it as "CSV UTF-8"'
                    " or pass --encoding utf-32"
                )
            for bom, codec, reported, label in (
                (codecs.BOM_UTF8, "utf-8", "utf-8-sig", "UTF-8"),
                (codecs.BOM_UTF16_LE, "utf-16-le", "utf-16", "UTF-16"),
                (codecs.BOM_UTF16_BE, "utf-16-be", "utf-16", "UTF-16"),
            ):
                if head.startswith(bom):
                    f.seek(len(bom))
                    problem, _first = _decode_all(f, shown, codec, len(bom))
                    if problem is not None and problem[0] == "undecodable":
                        raise UnusableFile(
                            f"{shown} starts with a {label} byte-order mark, but {problem[1]} is not {label}:"
                            f" it mixes encodings; {_RESAVE}"
                        )
                    plan = _Plan(path, shown, reported, codec, bom, False, identity)
                    return _checked(plan, problem)
            return _inspect_auto(f, shown, path, identity, notes)
    except OSError as exc:
        raise UnusableFile(f"{shown} cannot be read: {exc.strerror or exc}") from None


def _checked(plan: _Plan, problem: tuple[str, str] | None) -> _Plan:
    """The plan, unless the text holds a NUL character."""
    if problem is not None:  # a NUL character; decoding errors are refused by the caller
        raise UnusableFile(
            f"{plan.shown}: line {problem[1]} holds a NUL character: it is not a text table;"
            " export the table again as CSV"
        )
    return plan


def _decode_all(f: BinaryIO, shown: str, codec: str, base: int) -> tuple[tuple[str, str] | None, str]:
    """Decode the rest of ``f`` strictly with ``codec`` in chunks. Returns
    the problem: None, ('undecodable', where) for the first byte that does
    not decode, or ('nul', line) for the first NUL character; and the first
    character decoded."""
    decoder = codecs.getincrementaldecoder(codec)(errors="strict")
    lines = _Lines()
    fed = 0
    nul_line = 0
    first = ""
    for chunk, final in _with_final(_chunks(f, shown)):
        state = decoder.getstate()
        pending = state[0] if isinstance(state[0], bytes) else b""
        try:
            text = decoder.decode(chunk, final)
        except UnicodeDecodeError as exc:
            decoder.setstate(state)
            try:
                lines.feed(decoder.decode(chunk[: max(exc.start - len(pending), 0)], False))
            except UnicodeDecodeError:  # pragma: no cover - the prefix decoded before
                pass
            offset = base + fed - len(pending) + exc.start
            byte = exc.object[exc.start] if exc.start < len(exc.object) else None
            return ("undecodable", _where_text(offset, byte, lines.line)), first
        fed += len(chunk)
        if not first and text:
            first = text[0]
        if not nul_line:
            at = text.find("\x00")
            if at >= 0:
                lines.feed(text[:at])
                nul_line = lines.line
                text = text[at:]
        lines.feed(text)
    return (("nul", str(nul_line)) if nul_line else None), first


def _with_final(chunks: Iterator[bytes]) -> Iterator[tuple[bytes, bool]]:
    """Each chunk with True for the last one (an empty last chunk when there is none)."""
    previous = None
    for chunk in chunks:
        if previous is not None:
            yield previous, False
        previous = chunk
    yield (previous or b""), True


def _inspect_as(
    f: BinaryIO,
    path: str | os.PathLike[str],
    shown: str,
    encoding: str,
    head: bytes,
    identity: tuple[int, int, int, int],
    notes: list[str],
) -> _Plan:
    """The plan for an encoding the caller named, the whole file checked."""
    unknown = UnusableFile(
        f"{shown}: {encoding!r} is not a text encoding Python knows; pass a name such as utf-8, cp1252"
        " or utf-16-le"
    )
    try:
        codec = codecs.lookup(encoding).name
        b"a".decode(codec)  # a codec that is not a text encoding (base64) raises LookupError
    except UnicodeDecodeError:
        pass  # a text encoding in which 'a' alone is not text (utf-16, utf-32)
    except (LookupError, ValueError):  # ValueError: a name with a NUL character
        raise unknown from None
    bom = b""
    if codec == "utf-8-sig":  # decoded as UTF-8 after its mark, so that byte positions count from the start
        bom = codecs.BOM_UTF8 if head.startswith(codecs.BOM_UTF8) else b""
        f.seek(len(bom))
    problem, first = _decode_all(f, shown, "utf-8" if codec == "utf-8-sig" else codec, len(bom))
    if problem is not None and problem[0] == "undecodable":
        raise UnusableFile(
            f"{shown} is not {codec} text: {problem[1]} cannot be read as {codec};"
            ' pass the encoding it was saved in, or re-save it as "CSV UTF-8"'
        )
    plan = _Plan(
        path, shown, codec, "utf-8" if codec == "utf-8-sig" else codec, bom, codec != "utf-8-sig", identity
    )
    plan = _checked(plan, problem)
    if first == "\ufeff" and plan.drop_mark:
        notes.append(f"a byte-order mark at the start was dropped (read as {codec}, as asked)")
    return plan


def _inspect_auto(
    f: BinaryIO,
    shown: str,
    path: str | os.PathLike[str],
    identity: tuple[int, int, int, int],
    notes: list[str],
) -> _Plan:
    """The plan for a file without a byte-order mark: strict UTF-8, else
    Windows-1252 when no UTF-8 sequence is present at all; NUL bytes refused
    first (UTF-16 without a mark named as such)."""
    lines = _Lines()
    position = 0
    zeros = [0, 0]  # NUL bytes at even and odd offsets
    first_nul = None  # (offset, line)
    undefined = None  # (offset, byte, line): the first byte cp1252 leaves undefined
    utf8 = codecs.getincrementaldecoder("utf-8")(errors="strict")
    escaped = None  # a surrogateescape decoder, once strict UTF-8 has failed
    bad_utf8 = None  # (offset, byte, line)
    utf8_seen = False  # a UTF-8 sequence of two or more bytes decoded somewhere

    for chunk, final in _with_final(_chunks(f, shown)):
        if b"\x00" in chunk:
            parity = position % 2
            zeros[parity] += chunk[0::2].count(0)
            zeros[1 - parity] += chunk[1::2].count(0)
            if first_nul is None:
                at = chunk.index(0)
                first_nul = (position + at, _line_after(lines, chunk[:at]))
        if undefined is None:
            hits = [i for i in (chunk.find(b) for b in _CP1252_UNDEFINED) if i >= 0]
            if hits:
                at = min(hits)
                undefined = (position + at, chunk[at], _line_after(lines, chunk[:at]))
        if bad_utf8 is None:
            state = utf8.getstate()
            try:
                text = utf8.decode(chunk, final)
                if not utf8_seen and not text.isascii():
                    utf8_seen = True
            except UnicodeDecodeError as exc:
                pending = state[0]
                cut = max(exc.start - len(pending), 0)
                byte = exc.object[exc.start] if exc.start < len(exc.object) else None
                bad_utf8 = (position - len(pending) + exc.start, byte, _line_after(lines, chunk[:cut]))
                escaped = codecs.getincrementaldecoder("utf-8")(errors="surrogateescape")
                escaped.setstate(state)
        if escaped is not None and not utf8_seen:
            utf8_seen = _NOT_ASCII_NOR_ESCAPED.search(escaped.decode(chunk, final)) is not None
        lines.feed(chunk)
        position += len(chunk)

    if first_nul is not None:
        half = max(position // 2, 1)
        even, odd = zeros
        for nuls, others, codec in ((odd, even, "utf-16-le"), (even, odd, "utf-16-be")):
            if nuls >= half / 4 and others * 4 <= nuls:
                raise UnusableFile(
                    f"{shown} looks like UTF-16 without a byte-order mark: save it with a BOM"
                    f" or pass --encoding {codec}"
                )
        raise UnusableFile(
            f"{shown} holds a NUL byte at {_where_text(first_nul[0], 0, first_nul[1])}: it is not a text"
            " table; export the table again as CSV"
        )
    if bad_utf8 is None:
        return _Plan(path, shown, "utf-8", "utf-8", b"", False, identity)
    if utf8_seen:
        raise UnusableFile(
            f"{shown} mixes encodings: it holds UTF-8 sequences, but {_where_text(*bad_utf8)}"
            f" is not UTF-8; {_RESAVE}"
        )
    if undefined is not None:
        raise UnusableFile(
            f"{shown} is neither UTF-8 nor Windows-1252 (cp1252): {_where_text(*undefined)}"
            f" is not defined in either; {_RESAVE}"
        )
    notes.append("read as cp1252 (Windows Western): no UTF-8 sequences found")
    return _Plan(path, shown, "cp1252", "cp1252", b"", False, identity)


def _line_after(lines: _Lines, prefix: bytes) -> int:
    """The line on which the byte after ``prefix`` (the start of the current chunk) stands."""
    probe = _Lines(lines.line)
    probe._cr_last = lines._cr_last
    probe.feed(prefix)
    return probe.line


def _changed(shown: str) -> UnusableFile:
    return UnusableFile(
        f"{shown} changed while it was being read; read it again when nothing is writing to it"
    )


def _texts(plan: _Plan) -> Iterator[str]:
    """The file's text in pieces (after its byte-order mark), checked to be
    the file that was inspected."""
    try:
        with open(plan.path, "rb") as f:
            if _identity(f) != plan.identity:
                raise _changed(plan.shown)
            f.seek(len(plan.bom))
            decoder = codecs.getincrementaldecoder(plan.codec)(errors="strict")
            first = plan.drop_mark
            for chunk, final in _with_final(_chunks(f, plan.shown)):
                try:
                    text = decoder.decode(chunk, final)
                except UnicodeDecodeError:
                    raise _changed(plan.shown) from None
                if first and text:
                    first = False
                    if text[0] == "\ufeff":
                        text = text[1:]
                if text:
                    yield text
    except OSError as exc:
        raise UnusableFile(f"{plan.shown} cannot be read: {exc.strerror or exc}") from None


def _sample(plan: _Plan) -> str:
    """The start of the text for choosing the delimiter: whole lines, about
    _SAMPLE_CHARS characters; a line longer than MAX_RECORD_CHARS is left
    out (its line break kept)."""
    kept: list[str] = []
    size = 0
    partial: list[str] = []
    partial_size = 0
    overlong = False
    for text in _texts(plan):
        start = 0
        for m in _BREAK.finditer(text):
            end = m.end()
            if m.group() == "\r" and end == len(text):
                break  # perhaps the first half of CRLF: decided with the next piece
            if overlong:
                kept.append(text[m.start() : end])
            else:
                kept.append("".join(partial) + text[start:end])
                size += partial_size + end - start
            partial, partial_size, overlong = [], 0, False
            start = end
            if size >= _SAMPLE_CHARS:
                return "".join(kept)
        rest = text[start:]
        if not overlong:
            partial.append(rest)
            partial_size += len(rest)
            if partial_size > MAX_RECORD_CHARS:
                partial, partial_size, overlong = [], 0, True
    if not overlong:
        kept.append("".join(partial))
    return "".join(kept)


# --- delimiter and records -------------------------------------------------------------------------


def _lines(text: str, start: int) -> Iterator[str]:
    """The physical lines of ``text`` from ``start``, with their breaks ('\\r\\n', '\\n', '\\r')."""
    for m in _LINE.finditer(text, start):
        yield m.group()


def _detect_delimiter(text: str, start: int, shown: str, notes: list[str]) -> str:
    """The candidate whose count outside quotes agrees on the most sampled lines."""
    agreeing: dict[str, int] = {}
    sampled = 0
    for candidate in _CANDIDATES:
        counts: list[int] = []
        reader = csv.reader(_lines(text, start), delimiter=candidate, strict=False)
        try:
            for row in reader:
                if not row or (len(row) == 1 and not row[0].strip()):
                    continue
                counts.append(len(row) - 1)
                if len(counts) == _SAMPLE_LINES:
                    break
        except csv.Error:
            pass  # a quote left open, or a cell over the csv module's limit: the reading reports it
        sampled = max(sampled, len(counts))
        agreeing[candidate] = max(Counter(c for c in counts if c).values(), default=0)
    best = max(agreeing.values())
    if best == 0:
        notes.append("no comma, semicolon or tab found between cells: read as one column")
        return ","
    tied = [c for c in _CANDIDATES if agreeing[c] == best]
    if len(tied) > 1:
        plurals = [_DELIMITER_PLURALS[c] for c in tied]
        listed = " and ".join([", ".join(plurals[:-1]), plurals[-1]])
        options = " or ".join(f"--delimiter {_DELIMITER_WORDS[c]}" for c in tied)
        raise UnusableFile(
            f"{shown}: cannot tell the delimiter: {listed} each split {best} of {sampled} sampled lines"
            f" into the same number of columns; pass {options}"
        )
    return tied[0]


# where a record's scan stands: at the start of a cell, in a cell without quotes, in a quoted
# cell, just after a quote inside a quoted cell, just after a CR that ends the record
_START, _FIELD, _QUOTED, _AFTER_QUOTE, _AFTER_CR = range(5)


class RecordStream:
    r"""One pass over the records of a text export, as :class:`Record`\ s.

    Records are split where the csv module splits them (a line break inside
    a quoted cell belongs to the cell) and parsed by it; no more than
    MAX_RECORD_CHARS of one record (and one chunk of the file) is held.

    Attributes:
        problems: ``(line, message)`` for each record over a cap so far.
        truncated_at: the first line with non-empty cells beyond MAX_COLUMNS (0: none so far).
        endings: the CRLF, LF and CR line breaks of the file, once the pass is over.
    """

    def __init__(self, stream: TextStream, spill: Callable[[str], object] | None) -> None:
        self.stream = stream
        self.spill = spill
        self.problems: list[tuple[int, str]] = []
        self.truncated_at = 0
        self.endings = (0, 0, 0)
        self._it = self._records()

    def __iter__(self) -> Iterator[Record]:
        return self._it  # the generator itself: a for loop then runs at its speed

    def __next__(self) -> Record:
        return next(self._it)

    def _records(self) -> Iterator[Record]:  # one state machine, kept in one function for speed
        stream = self.stream
        shown = stream.shown
        d = stream.delimiter
        spill = self.spill
        lines = _Lines()
        lines.feed(stream.preamble)
        skip = len(stream.preamble)
        parts: list[str] = []
        size = 0
        overflow = False
        cutter = _Cutter(d)  # the cells of a record too long to hold, collected as it streams past
        state = _START
        record_line = lines.line
        scan_from = -1  # where a record is left to the scan, in the current piece
        count = 0
        content = False

        def finish(broke: bool) -> Record:
            """The record just scanned; ``broke``: it ends with a line break."""
            nonlocal count, content
            count += 1
            if count > MAX_ROWS:
                raise _too_many_rows(shown)
            if overflow:
                content = True
                fields, cut = cutter.close(self, record_line)
                return self._problem(
                    record_line, fields, None, _note(record_line, lines.line - broke, True, cut)
                )
            raw = parts[0] if len(parts) == 1 else "".join(parts)
            fields, cut = self._fields(raw, d, record_line)
            if fields:
                content = True
            if cut:
                return self._problem(
                    record_line, fields, raw, _note(record_line, lines.line - broke, False, cut)
                )
            return Record(record_line, fields, raw)

        for text in _texts(stream.plan):
            if skip:  # the sep= hint, given as the preamble
                if len(text) <= skip:
                    skip -= len(text)
                    continue
                text, skip = text[skip:], 0
            i = 0
            n = len(text)
            scan_from = -1
            while i < n:
                if state == _START and not size and i != scan_from:
                    # the whole lines of the piece, read by the csv module in one go; a record it
                    # cannot finish here (a quoted cell going on into the next piece, a quote
                    # misplaced, a cell over its limit) is left to the scan below
                    e = text.rfind("\n", i) + 1
                    if e > i:
                        block = _WHOLE_LINE.findall(text, i, e)
                        reader = csv.reader(block, delimiter=d, strict=True)
                        base = lines.line
                        used = 0
                        try:
                            for fields in reader:
                                first, used = used, reader.line_num
                                raw = block[first] if used - first == 1 else "".join(block[first:used])
                                line = base + first
                                count += 1
                                if count > MAX_ROWS:
                                    raise _too_many_rows(shown)
                                if len(raw) > MAX_RECORD_CHARS:
                                    if spill is not None:
                                        spill(raw)
                                    content = True
                                    cutter = _Cutter(d)
                                    cutter.feed(raw)
                                    fields, cut = cutter.close(self, line)
                                    note = _note(line, base + used - 1, True, cut)
                                    yield self._problem(line, fields, None, note)
                                    continue
                                cut = False
                                if len(fields) > MAX_COLUMNS or len(raw) > MAX_CELL_CHARS:
                                    fields, cut = self._capped(fields, line)
                                if fields:
                                    content = True
                                if cut:
                                    note = _note(line, base + used - 1, False, cut)
                                    yield self._problem(line, fields, raw, note)
                                else:
                                    yield Record(line, fields, raw)
                        except csv.Error:
                            done = sum(map(len, block[:used]))
                            lines.feed(text[i : i + done])
                            i += done
                            scan_from = i  # this record is scanned below
                        else:
                            lines.feed(text[i:e])
                            i = e
                        record_line = lines.line
                        continue
                end = -1
                j = i
                while j < n:
                    if state == _QUOTED:
                        q = text.find('"', j)
                        if q < 0:
                            j = n
                            break
                        j = q + 1
                        state = _AFTER_QUOTE
                        continue
                    if state == _AFTER_QUOTE:
                        c = text[j]
                        if c == '"':  # a doubled quote stands for one
                            state = _QUOTED
                            j += 1
                        elif c == d:
                            state = _START
                            j += 1
                        elif c == "\n":
                            end = j + 1
                            break
                        elif c == "\r":
                            state = _AFTER_CR
                            j += 1
                        else:
                            line = _line_after(lines, text[i:j])
                            raise UnusableFile(
                                f"{shown}: line {line}: a quoted cell is followed by text before the next"
                                ' delimiter; inside quotes write a quote twice ("")'
                            )
                        continue
                    if state == _AFTER_CR:
                        end = j + 1 if text[j] == "\n" else j
                        break
                    # at the start of a cell or in a cell without quotes
                    m = _BREAK.search(text, j)
                    k = m.start() if m is not None else n
                    if text.find('"', j, k) >= 0:  # a quote before the line break: cell by cell
                        if state == _START and text[j] == '"':
                            state = _QUOTED
                            j += 1
                            continue
                        at = text.find(d, j, k)
                        if at >= 0:
                            state = _START
                            j = at + 1
                            continue
                    # no quoted cell starts before the line break: the record ends there
                    if m is None:
                        state = _START if text[n - 1] == d else _FIELD
                        j = n
                        break
                    if text[k] == "\n":
                        end = k + 1
                    elif k + 1 < n:
                        end = k + 2 if text[k + 1] == "\n" else k + 1
                    else:  # a CR at the end of the piece: an LF may follow in the next one
                        state = _AFTER_CR
                        j = n
                    break
                piece = text[i:] if end < 0 else text[i:end]
                i = n if end < 0 else end
                lines.feed(piece)
                if overflow:
                    cutter.feed(piece)
                    if spill is not None:
                        spill(piece)
                else:
                    parts.append(piece)
                    size += len(piece)
                    if size > MAX_RECORD_CHARS:  # never held whole: what was kept goes on, the rest follows
                        overflow = True
                        cutter = _Cutter(d)
                        for part in parts:
                            cutter.feed(part)
                            if spill is not None:
                                spill(part)
                        parts = []
                if end >= 0:
                    yield finish(True)
                    parts, size, overflow, state = [], 0, False, _START
                    record_line = lines.line
        if state == _QUOTED:
            raise UnusableFile(
                f"{shown}: a quote opened in the row starting on line {record_line} is never closed"
            )
        if size:
            yield finish(state == _AFTER_CR)
        self.endings = (lines.crlf, lines.lf, lines.cr)
        if not content:
            raise UnusableFile(f"{shown} is empty: it holds no rows")

    def _problem(self, line: int, fields: list[str], raw: str | None, message: str) -> Record:
        self.problems.append((line, message))
        return Record(line, fields, raw, message)

    def _fields(self, raw: str, d: str, line: int) -> tuple[list[str], bool]:
        """The cells of a held record (at most MAX_COLUMNS, each cut at MAX_CELL_CHARS), and
        whether one was cut."""
        if '"' not in raw:
            body = raw.rstrip("\r\n")
            fields = body.split(d) if body else []
        else:
            try:
                fields = next(csv.reader((raw,), delimiter=d, strict=True))
            except csv.Error as exc:
                if not str(exc).startswith("field larger than field limit"):
                    raise UnusableFile(f"{self.stream.shown}: line {line}: {exc}") from None
                cutter = _Cutter(d)  # a cell over the csv module's own limit
                cutter.feed(raw)
                return cutter.close(self, line)
        return self._capped(fields, line)

    def _capped(self, fields: list[str], line: int) -> tuple[list[str], bool]:
        """The first MAX_COLUMNS cells, each cut at MAX_CELL_CHARS, and whether one was cut."""
        if len(fields) > MAX_COLUMNS:
            if not self.truncated_at and any(fields[MAX_COLUMNS:]):
                self.truncated_at = line
            del fields[MAX_COLUMNS:]
        if any(len(f) > MAX_CELL_CHARS for f in fields):
            return [f[:MAX_CELL_CHARS] for f in fields], True
        return fields, False


class _Cutter:
    """The cells of one record given in pieces (its text, up to and with its line
    break), as the csv module reads them, keeping at most MAX_COLUMNS cells of at
    most MAX_CELL_CHARS characters: the rest streams past without being held."""

    __slots__ = ("cell", "cells", "cut", "d", "more", "room", "state", "stop")

    def __init__(self, d: str) -> None:
        self.d = d
        self.stop = re.compile("[" + re.escape(d) + "\r\n]")
        self.cells: list[str] = []
        self.cell: list[str] = []
        self.room = MAX_CELL_CHARS
        self.state = _START
        self.cut = False  # a cell longer than MAX_CELL_CHARS
        self.more = False  # a non-empty cell beyond MAX_COLUMNS

    def _add(self, s: str, a: int, b: int) -> None:
        if b <= a:
            return
        if len(self.cells) >= MAX_COLUMNS:
            self.more = True
            return
        take = min(b - a, self.room)
        if take:
            self.cell.append(s[a : a + take])
            self.room -= take
        if take < b - a:
            self.cut = True

    def _end_cell(self) -> None:
        if len(self.cells) < MAX_COLUMNS:
            self.cells.append("".join(self.cell))
        self.cell = []
        self.room = MAX_CELL_CHARS

    def feed(self, s: str) -> None:
        i, n, d = 0, len(s), self.d
        while i < n:
            state = self.state
            if state == _QUOTED:
                q = s.find('"', i)
                self._add(s, i, n if q < 0 else q)
                if q < 0:
                    return
                i = q + 1
                self.state = _AFTER_QUOTE
            elif state == _AFTER_QUOTE:
                c = s[i]
                if c == '"':
                    self._add(s, i, i + 1)
                    self.state = _QUOTED
                    i += 1
                elif c == d:
                    self._end_cell()
                    self.state = _START
                    i += 1
                else:  # the line break that ends the record (the scan refused anything else)
                    self._end_cell()
                    self.state = _AFTER_CR
                    return
            elif state == _AFTER_CR:
                return
            elif state == _START and s[i] == '"':
                self.state = _QUOTED
                i += 1
            else:
                self.state = _FIELD
                m = self.stop.search(s, i)
                if m is None:
                    self._add(s, i, n)
                    return
                self._add(s, i, m.start())
                self._end_cell()
                if m.group() != d:
                    self.state = _AFTER_CR
                    return
                self.state = _START
                i = m.end()

    def close(self, reading: RecordStream, line: int) -> tuple[list[str], bool]:
        """The cells read, and whether one was cut (a record ending at the end of the file ends its cell)."""
        if self.state != _AFTER_CR and (self.cell or self.state != _START or self.cells):
            self._end_cell()
        if self.more and not reading.truncated_at:
            reading.truncated_at = line
        return self.cells, self.cut


def _too_many_rows(shown: str) -> UnusableFile:
    return UnusableFile(
        f"{shown} holds more than {MAX_ROWS} rows, the limit of a spreadsheet; split it into smaller files"
    )


def _note(line: int, last: int, overlong: bool, cut: bool) -> str:
    """The note for a record starting on ``line`` and ending on ``last`` that is
    longer than MAX_RECORD_CHARS (``overlong``) or has a cell cut at MAX_CELL_CHARS."""
    what = []
    if overlong:
        what.append(f"the row is longer than {MAX_RECORD_CHARS:,} characters")
    if cut:
        what.append(
            f"a cell is longer than {MAX_CELL_CHARS:,} characters, more than a spreadsheet cell holds:"
            f" only its first {MAX_CELL_CHARS:,} were read"
        )
    return f"line {line}: " + "; ".join(what) + _runs_to(line, last)


def _runs_to(first: int, last: int) -> str:
    """For a record over several lines: where it ends (a quote never closed is the likely cause)."""
    if last <= first:
        return ""
    return f" (it runs to line {last}: look for a quote that is never closed)"
