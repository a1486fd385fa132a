r"""Reading a supplier table exported as CSV or TXT into plain Python values.

Supplier files are untrusted and arrive in many encodings and layouts, so this
reader never guesses silently: a byte-order mark decides the encoding, then
strict UTF-8, then Windows-1252 only when no UTF-8 sequence is present at all
(a note says so); a file that mixes encodings, holds NUL bytes or cannot be
split into columns one way only is refused with a one-line message that starts
with the file name in quotes and says what would make it usable.

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
from collections.abc import Iterator
from dataclasses import dataclass

from ...errors import CellchemError
from . import MAX_ROWS, MAX_TEXT_BYTES, UnusableFile

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
_READ_CHUNK = 1 << 20  # bytes read at a time, so that the size limit holds for any file
_RESAVE = 're-save it as "CSV UTF-8" or pass --encoding'

_LINE = re.compile(r"[^\r\n]*(?:\r\n|\r|\n)|[^\r\n]+\Z")
_SEP_HINT = re.compile(r"sep=([,;\t])(?:\r\n|\r|\n|\Z)", re.IGNORECASE)
_NOT_ASCII_NOR_ESCAPED = re.compile("[^\x00-\x7f\udc80-\udcff]")


@dataclass(frozen=True)
class TextTable:
    """The rows of a text export, with what was used and assumed to read them.

    Attributes:
        rows: every record as read, each a tuple of cells as ``str`` ('' for an
            empty cell); an empty line is an empty tuple. Trailing empty lines
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
        notes: what was assumed to read the file, one line each.
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
        convention and line ending used, and notes on what was assumed.

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
    shown = _shown(path)
    chosen = None if delimiter is None else _delimiter_argument(shown, delimiter)
    data = _read_bytes(path, shown)
    notes: list[str] = []
    text, used = _decode(data, shown, encoding, notes)
    nul = text.find("\x00")
    if nul >= 0:
        raise UnusableFile(
            f"{shown}: line {_line_at(text[:nul])} holds a NUL character: it is not a text table;"
            " export the table again as CSV"
        )
    line_ending = _dominant_line_ending(text)

    start, first_line = 0, 1
    hint = _SEP_HINT.match(text)
    if hint:
        start, first_line = hint.end(), 2
        named = hint.group(1)
        note = f"the first line is a spreadsheet hint naming the delimiter ({_DELIMITER_WORDS[named]})"
        if chosen is not None and chosen != named:
            note += f"; the delimiter given ({_DELIMITER_WORDS[chosen]}) was used instead"
        notes.append(note + "; it was not read as a row")
        if chosen is None:
            chosen = named
    if chosen is None:
        chosen = _detect_delimiter(text, start, shown, notes)
    if chosen == ";":
        notes.append(
            "numbers read with a decimal comma: the columns are separated by semicolons"
            " (the European export convention)"
        )

    rows, line_numbers = _parse(text, start, first_line, chosen, shown)
    while rows and not rows[-1]:
        rows.pop()
        line_numbers.pop()
    if not rows:
        raise UnusableFile(f"{shown} is empty: it holds no rows")
    return TextTable(
        rows=tuple(rows),
        line_numbers=tuple(line_numbers),
        encoding=used,
        delimiter=chosen,
        decimal_comma=chosen == ";",
        line_ending=line_ending,
        notes=tuple(notes),
    )


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


def _read_bytes(path: str | os.PathLike[str], shown: str) -> bytes:
    too_large = UnusableFile(
        f"{shown} is larger than {_size(MAX_TEXT_BYTES)}, the limit for a text file;"
        " split it into smaller files"
    )
    try:
        with open(path, "rb") as f:
            if os.fstat(f.fileno()).st_size > MAX_TEXT_BYTES:
                raise too_large
            chunks: list[bytes] = []
            total = 0
            while chunk := f.read(_READ_CHUNK):
                total += len(chunk)
                if total > MAX_TEXT_BYTES:
                    raise too_large
                chunks.append(chunk)
    except OSError as exc:
        raise UnusableFile(f"{shown} cannot be read: {exc.strerror or exc}") from None
    data = b"".join(chunks)
    if not data:
        raise UnusableFile(f"{shown} is empty: it holds no rows")
    return data


def _line_at(prefix: str) -> int:
    """The 1-based physical line on which the text after ``prefix`` starts."""
    return 1 + prefix.count("\n") + prefix.count("\r") - prefix.count("\r\n")


def _where(data: bytes, offset: int, codec: str) -> str:
    """'byte N (0xXX, line L)' for the 0-based ``offset`` of a byte decoded with ``codec``."""
    byte = f"0x{data[offset]:02X}, " if offset < len(data) else ""
    line = _line_at(data[:offset].decode(codec, errors="replace"))
    return f"byte {offset + 1} ({byte}line {line})"


def _start(exc: UnicodeDecodeError, data: bytes, codec: str) -> int:
    """The 0-based offset in ``data`` of the byte that failed (utf-8-sig counts from after its mark)."""
    if codec == "utf-8-sig" and data.startswith(codecs.BOM_UTF8):
        return exc.start + len(codecs.BOM_UTF8)
    return exc.start


def _decode(data: bytes, shown: str, encoding: str | None, notes: list[str]) -> tuple[str, str]:
    """The text of the file and the name of the codec used."""
    if encoding is not None:
        return _decode_as(data, shown, encoding, notes)
    if data.startswith((codecs.BOM_UTF32_LE, codecs.BOM_UTF32_BE)):
        raise UnusableFile(
            f'{shown} starts with a UTF-32 byte-order mark: re-save it as "CSV UTF-8"'
            " or pass --encoding utf-32"
        )
    for bom, codec, label in (
        (codecs.BOM_UTF8, "utf-8-sig", "UTF-8"),
        (codecs.BOM_UTF16_LE, "utf-16", "UTF-16"),
        (codecs.BOM_UTF16_BE, "utf-16", "UTF-16"),
    ):
        if data.startswith(bom):
            try:
                return data.decode(codec), codec
            except UnicodeDecodeError as exc:
                where = _where(data, _start(exc, data, codec), codec)
                raise UnusableFile(
                    f"{shown} starts with a {label} byte-order mark, but {where} is not {label}:"
                    f" it mixes encodings; {_RESAVE}"
                ) from None
    if b"\x00" in data:
        raise _nul_bytes(data, shown)
    try:
        return data.decode("utf-8"), "utf-8"
    except UnicodeDecodeError as exc:
        first_bad = exc.start
    if _NOT_ASCII_NOR_ESCAPED.search(data.decode("utf-8", errors="surrogateescape")):
        raise UnusableFile(
            f"{shown} mixes encodings: it holds UTF-8 sequences, but {_where(data, first_bad, 'utf-8')}"
            f" is not UTF-8; {_RESAVE}"
        )
    try:
        text = data.decode("cp1252")
    except UnicodeDecodeError as exc:
        raise UnusableFile(
            f"{shown} is neither UTF-8 nor Windows-1252 (cp1252): {_where(data, exc.start, 'cp1252')}"
            f" is not defined in either; {_RESAVE}"
        ) from None
    notes.append("read as cp1252 (Windows Western): no UTF-8 sequences found")
    return text, "cp1252"


def _decode_as(data: bytes, shown: str, encoding: str, notes: list[str]) -> tuple[str, str]:
    unknown = UnusableFile(
        f"{shown}: {encoding!r} is not a text encoding Python knows; pass a name such as utf-8, cp1252"
        " or utf-16-le"
    )
    try:
        codec = codecs.lookup(encoding).name
    except (LookupError, ValueError):  # ValueError: a name with a NUL character
        raise unknown from None
    try:
        text = data.decode(codec)
    except LookupError:  # a codec that is not a text encoding, such as base64
        raise unknown from None
    except UnicodeDecodeError as exc:
        where = _where(data, _start(exc, data, codec), codec)
        raise UnusableFile(
            f"{shown} is not {codec} text: {where} cannot be read as {codec};"
            ' pass the encoding it was saved in, or re-save it as "CSV UTF-8"'
        ) from None
    if text.startswith("\ufeff"):
        text = text[1:]
        notes.append(f"a byte-order mark at the start was dropped (read as {codec}, as asked)")
    return text, codec


def _nul_bytes(data: bytes, shown: str) -> UnusableFile:
    """The refusal of a file with NUL bytes and no UTF-16 byte-order mark."""
    even, odd = data[0::2].count(0), data[1::2].count(0)
    half = max(len(data) // 2, 1)
    for zeros, others, codec in ((odd, even, "utf-16-le"), (even, odd, "utf-16-be")):
        if zeros >= half / 4 and others * 4 <= zeros:
            return UnusableFile(
                f"{shown} looks like UTF-16 without a byte-order mark: save it with a BOM"
                f" or pass --encoding {codec}"
            )
    return UnusableFile(
        f"{shown} holds a NUL byte at {_where(data, data.index(0), 'latin-1')}: it is not a text"
        " table; export the table again as CSV"
    )


# --- lines, delimiter, records -------------------------------------------------------------------


def _lines(text: str, start: int) -> Iterator[str]:
    """The physical lines of ``text`` from ``start``, with their breaks ('\\r\\n', '\\n', '\\r')."""
    for m in _LINE.finditer(text, start):
        yield m.group()


def _dominant_line_ending(text: str) -> str:
    crlf = text.count("\r\n")
    counts = {"\r\n": crlf, "\n": text.count("\n") - crlf, "\r": text.count("\r") - crlf}
    best = max(counts, key=lambda ending: counts[ending])  # ties go to the first: CRLF, LF, CR
    return best if counts[best] else "\r\n"


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
            pass  # a quote left open: the reading of the file reports it
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


def _parse(
    text: str, start: int, first_line: int, delimiter: str, shown: str
) -> tuple[list[tuple[str, ...]], list[int]]:
    """The records of the text as tuples, and the physical line each starts on."""
    reader = csv.reader(_lines(text, start), delimiter=delimiter, strict=True)
    rows: list[tuple[str, ...]] = []
    line_numbers: list[int] = []
    while True:
        begins = reader.line_num + first_line
        try:
            row = next(reader)
        except StopIteration:
            break
        except csv.Error as exc:
            raise _malformed(shown, str(exc), begins, reader.line_num + first_line - 1) from None
        rows.append(tuple(row))
        line_numbers.append(begins)
        if len(rows) > MAX_ROWS:
            raise UnusableFile(
                f"{shown} holds more than {MAX_ROWS} rows, the limit of a spreadsheet; split it"
                " into smaller files"
            )
    return rows, line_numbers


def _malformed(shown: str, problem: str, begins: int, line: int) -> UnusableFile:
    if problem.startswith("field larger than field limit"):
        return UnusableFile(
            f"{shown}: line {line}: a cell is longer than {csv.field_size_limit()} characters,"
            " more than a table cell holds; look for a quote that is never closed"
        )
    if problem == "unexpected end of data":
        return UnusableFile(f"{shown}: a quote opened in the row starting on line {begins} is never closed")
    if "expected after" in problem:
        return UnusableFile(
            f"{shown}: line {line}: a quoted cell is followed by text before the next delimiter;"
            ' inside quotes write a quote twice ("")'
        )
    return UnusableFile(f"{shown}: line {line}: {problem}")
