"""New cells spliced into a sheet's bytes: the fast way fill writes a workbook.

When every new cell lies to the right of every cell of its row (fill's new
columns always do), the sheet need not be parsed into elements and written
back: its bytes are copied as they are, and the new cells are inserted just
before each row's end tag. The same streaming expat pass that finds those
places reads the row's values for the checks (the audit's reader, so fill and
the audit read the same values). Outside the rows only two small edits are
made: the ``dimension`` grows to cover the new columns and the new columns
get a width (a ``<col>`` in ``<cols>``, or a new ``<cols>`` before
``<sheetData>``); a row that gets cells loses its optional ``spans`` hint.

Every edit is recorded, so that after writing, the output part can be
checked against the input byte for byte: the output must be the input with
exactly those insertions and replacements, which proves every original cell
unchanged (stronger than comparing what a parser reads back).

Where the rule does not hold (a new cell in an existing column, a cell to be
overwritten, a row written as an empty element that gets cells) the caller
falls back to ``ooxml.rewrite_sheet``.
"""

from __future__ import annotations

import re
import struct
import tempfile
import zipfile
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from typing import IO
from xml.parsers import expat
from xml.sax.saxutils import escape

from ...columns import column_letter
from . import MAX_CELL_CHARS, MAX_COLUMNS, UnusableFile, one_line
from .ooxml import NewCell
from .xlsx import _MAIN, Book, _chunks, _letters, _row_number, cell_value, safe_parser

MAX_ROW_BYTES = 64 << 20  # one row of a sheet held while its end is looked for


class NeedsRewrite(Exception):
    """The splice cannot place a new cell; rewrite the sheet element by element."""


@dataclass
class Edit:
    start: int  # offset in the input part
    end: int  # the input bytes [start, end) are replaced by ``data``
    data: bytes


class EditLog:
    """The splice's edits, in order, spooled to a temporary file so that
    memory does not grow with the rows (one edit per filled row)."""

    _HEAD = struct.Struct("<QQI")

    def __init__(self) -> None:
        self._file = tempfile.TemporaryFile()
        self.count = 0

    def append(self, edit: Edit) -> None:
        self._file.write(self._HEAD.pack(edit.start, edit.end, len(edit.data)) + edit.data)
        self.count += 1

    def __iter__(self) -> Iterator[Edit]:
        self._file.flush()
        self._file.seek(0)
        for _ in range(self.count):
            start, end, size = self._HEAD.unpack(self._file.read(self._HEAD.size))
            yield Edit(start, end, self._file.read(size))

    def close(self) -> None:
        self._file.close()


@dataclass
class SpliceResult:
    rows: int = 0
    cells_written: int = 0
    skipped_existing: int = 0
    edits: EditLog = field(default_factory=EditLog)
    overwritten: set[str] = field(default_factory=set)


SpliceHook = Callable[[int, list[object], dict[int, int]], list[NewCell]]

_SPANS = re.compile(rb'\sspans="[^"]*"')
_DIM_REF = re.compile(rb'(\sref=")([^"]*)(")')
_RANGE_PART = re.compile(r"^\$?([A-Z]{1,3})\$?([0-9]+)$")


_LETTERS: dict[int, str] = {}
_CELL_REST: dict[tuple, str] = {}  # the cell's markup after its reference, by (prefix, style, value)


def _cell_xml(prefix: str, row: int, new: NewCell) -> str:
    """A new cell's markup: numbers as numbers, text inline (the shared
    strings are never touched)."""
    letters = _LETTERS.get(new.column)
    if letters is None:
        letters = _LETTERS[new.column] = column_letter(new.column)
    value = new.value
    key = (prefix, new.style, type(value), value)
    rest = _CELL_REST.get(key)
    if rest is None:
        style = f' s="{new.style}"' if new.style is not None else ""
        if isinstance(value, bool):
            rest = f'{style} t="b"><{prefix}v>{int(value)}</{prefix}v></{prefix}c>'
        elif isinstance(value, int | float):
            text = repr(float(value)) if isinstance(value, float) else str(value)
            rest = f"{style}><{prefix}v>{text}</{prefix}v></{prefix}c>"
        else:
            text = str(value)
            space = ' xml:space="preserve"' if text != text.strip() else ""
            rest = (
                f'{style} t="inlineStr"><{prefix}is><{prefix}t{space}>{escape(text)}</{prefix}t>'
                f"</{prefix}is></{prefix}c>"
            )
        if len(_CELL_REST) > 100_000:
            _CELL_REST.clear()
        _CELL_REST[key] = rest
    return f'<{prefix}c r="{letters}{row}"{rest}'


def _grown_ref(ref: bytes, last_column: int) -> bytes | None:
    cells = ref.decode("ascii", "replace").split(":")
    parts = [_RANGE_PART.match(x) for x in cells]
    if not parts or any(m is None for m in parts):
        return None
    first = parts[0]
    last = parts[-1]
    c2 = _letters(last.group(1) + last.group(2))
    if c2 is None or last_column <= c2:
        return None
    return f"{first.group(1)}{first.group(2)}:{column_letter(last_column)}{last.group(2)}".encode()


def splice_sheet(
    book: Book,
    part: str,
    out: IO[bytes],
    hook: SpliceHook,
    keep: frozenset[int] | None,
    style_columns: frozenset[int],
    new_columns: list[tuple[int, float]],
    last_column: int,
    first_new_column: int,
) -> SpliceResult:
    """Copy the sheet ``part`` to ``out`` with the cells ``hook(row number,
    values, styles)`` returns inserted at the end of each row. ``keep``: the
    columns whose values the hook needs (None: all); ``style_columns``: those
    whose cell format it needs. Raises NeedsRewrite where the bytes cannot
    take a new cell."""
    result = SpliceResult()
    strings = book.strings
    dates = book.date_styles
    date1904 = book.date1904
    pending: list[tuple[int, int, int, list[object], dict[int, int], bool, int]] = []
    # (row start offset, row end-tag offset, row number, values, styles, empty element, last cell)
    marks: dict[str, int] = {}
    prefix = ""
    row_no = 0
    row_start = -1
    column = -1
    wanted = False
    kind = ""
    cell_style = -1
    formula = False
    has_value = False
    chars = 0
    depth = 0
    values: list[object] = []
    styles: dict[int, int] = {}
    text: list[str] = []
    tag_c, tag_v, tag_t, tag_f, tag_row = "c", "v", "t", "f", "row"
    from ...audit import NO_SAVED_VALUE, NOT_RECALCULATED

    p = safe_parser(namespaces=False)

    def chars_in(data: str) -> None:
        nonlocal chars
        if chars < MAX_CELL_CHARS:
            data = data[: MAX_CELL_CHARS - chars]
            text.append(data)
            chars += len(data)

    def start(name: str, attrs: dict[str, str]) -> None:
        nonlocal values, styles, depth, prefix, tag_c, tag_v, tag_t, tag_f, tag_row, column, wanted
        nonlocal kind, cell_style, formula, has_value, chars, row_no, row_start
        depth += 1
        if name == tag_c:
            ref = attrs.get("r")
            col = _letters(ref) if ref else None
            column = col if col is not None and col > column else column + 1
            s = attrs.get("s")
            if column in style_columns:
                styles[column] = int(s) if s and s.isdigit() else -1
            wanted = column < MAX_COLUMNS and (keep is None or column in keep)
            if wanted:
                kind = attrs.get("t", "n")
                cell_style = int(s) if s and s.isdigit() else -1
                formula = False
                has_value = False
                text.clear()
                chars = 0
        elif name == tag_v or name == tag_t:
            if wanted and (name == tag_v or kind == "inlineStr"):
                has_value = True
                p.CharacterDataHandler = chars_in
        elif name == tag_f:
            if wanted:
                formula = True
        elif name == tag_row:
            row_no = _row_number(attrs, row_no)
            row_start = p.CurrentByteIndex
            column = -1
            values = []
            styles = {}
        elif depth == 1:
            for key, value in attrs.items():
                if value == _MAIN and key.startswith("xmlns:") and name.startswith(key[6:] + ":"):
                    prefix = key[6:] + ":"
            tag_c, tag_v, tag_t, tag_f, tag_row = (prefix + n for n in ("c", "v", "t", "f", "row"))
        elif depth == 2:
            marks.setdefault(name.split(":")[-1], p.CurrentByteIndex)

    def end(name: str) -> None:
        nonlocal depth, wanted
        depth -= 1
        if name == tag_c:
            if not wanted:
                return
            wanted = False
            p.CharacterDataHandler = None
            value = (
                cell_value(kind, "".join(text), cell_style in dates, strings, date1904) if has_value else None
            )
            if formula:
                if value is None or value == "":
                    value = NO_SAVED_VALUE
                elif book.recalculate:
                    value = NOT_RECALCULATED
            if value is not None:
                if len(values) < column:
                    values.extend([None] * (column - len(values)))
                values.append(value)
        elif name == tag_v or name == tag_t:
            p.CharacterDataHandler = None
        elif name == tag_row:
            at = p.CurrentByteIndex
            pending.append((row_start, at, row_no, values, styles, at == row_start, column))
        elif depth == 1:
            marks.setdefault("/" + name.split(":")[-1], p.CurrentByteIndex)

    p.StartElementHandler = start
    p.EndElementHandler = end

    buffer = bytearray()  # input bytes from offset ``base`` on, not yet written
    base = 0
    head_done = False

    def write_to(offset: int) -> None:
        nonlocal base
        if offset > base:
            out.write(bytes(buffer[: offset - base]))
            del buffer[: offset - base]
            base = offset

    def edit(start: int, end: int, data: bytes) -> None:
        """Write the input up to ``start``, then ``data`` instead of [start, end)."""
        nonlocal base
        write_to(start)
        out.write(data)
        result.edits.append(Edit(start, end, data))
        if end > base:
            del buffer[: end - base]
            base = end

    def do_head() -> None:
        """The dimension and the column widths, once the sheet's data begins."""
        dim = marks.get("dimension")
        if dim is not None:
            tag_end = buffer.find(b">", dim - base)
            if tag_end >= 0:
                tag = bytes(buffer[dim - base : tag_end + 1])
                m = _DIM_REF.search(tag)
                grown = _grown_ref(m.group(2), last_column) if m else None
                if grown is not None:
                    edit(dim + m.start(2), dim + m.end(2), grown)
        if new_columns:
            cols = "".join(
                f'<{prefix}col min="{c + 1}" max="{c + 1}" width="{w:g}" customWidth="1"/>'
                for c, w in new_columns
            ).encode()
            close = marks.get("/cols")
            if close is not None and close == marks.get("cols"):
                raise NeedsRewrite("the sheet has an empty <cols/> element")
            if close is not None and close >= base:
                edit(close, close, cols)
            else:
                at = marks["sheetData"]
                edit(at, at, f"<{prefix}cols>".encode() + cols + f"</{prefix}cols>".encode())

    try:
        for chunk in _chunks(book.zin, part, book.shown):
            buffer += chunk
            p.Parse(chunk, False)
            if not head_done and "sheetData" in marks:
                do_head()
                head_done = True
            for row_start, at, number, row_values, row_styles, empty_element, last_cell in pending:
                result.rows += 1
                new = hook(number, row_values, row_styles)
                new = [n for n in new if n.value is not None]
                if not new:
                    continue
                if empty_element:
                    raise NeedsRewrite(f"row {number} is written as an empty element")
                if any(n.column <= last_cell for n in new):
                    raise NeedsRewrite(f"row {number} has a cell where a new one goes")
                if row_start >= base:
                    tag_end = buffer.find(b">", row_start - base)
                    tag = bytes(buffer[row_start - base : tag_end + 1])
                    m = _SPANS.search(tag)
                    if m is not None:
                        edit(row_start + m.start(), row_start + m.end(), b"")
                cells = "".join(_cell_xml(prefix, number, n) for n in sorted(new, key=lambda n: n.column))
                edit(at, at, cells.encode("utf-8"))
                result.cells_written += len(new)
            pending.clear()
            if head_done:
                # never write past an open row's start (its spans may change) or a tag not yet read
                keep_from = base + max(buffer.rfind(b"<"), 0)
                if depth >= 3:
                    keep_from = min(keep_from, row_start)
                write_to(max(base, keep_from))
            if len(buffer) > MAX_ROW_BYTES:
                raise UnusableFile(
                    f"'{book.shown}': a row or the start of sheet part '{part}' is longer than"
                    f" {MAX_ROW_BYTES >> 20} MiB; nothing was written"
                )
        p.Parse(b"", True)
        write_to(base + len(buffer))
    except (UnusableFile, NeedsRewrite):
        raise
    except expat.ExpatError as exc:
        raise UnusableFile(
            f"'{book.shown}': the sheet's XML is damaged ({one_line(exc)}); nothing was written: open it in a"
            " spreadsheet program and save it again"
        ) from None
    return result


def verify_splice(src: zipfile.ZipFile, dst: zipfile.ZipFile, part: str, edits: EditLog | list[Edit]) -> None:
    """Raise UnusableFile unless the output part is the input part with
    exactly ``edits`` applied: every original byte outside the edits, and so
    every original cell, is unchanged."""
    with src.open(part) as a, dst.open(part) as b:
        position = 0  # in the input
        pending = bytearray()

        def expect(data: bytes) -> None:
            """The output must continue with ``data``."""
            nonlocal pending
            while len(pending) < len(data):
                more = b.read(1 << 20)
                if not more:
                    raise UnusableFile(f"the part '{part}' is cut short after writing")
                pending += more
            if pending[: len(data)] != data:
                raise UnusableFile(f"the part '{part}' changed in writing near byte {position:,}")
            del pending[: len(data)]

        for e in edits:
            while position < e.start:
                data = a.read(min(1 << 20, e.start - position))
                if not data:
                    raise UnusableFile(f"the part '{part}' is shorter than its edits")
                expect(data)
                position += len(data)
            expect(e.data)
            skip = e.end - e.start
            while skip:
                dropped = a.read(min(skip, 1 << 20))
                if not dropped:
                    raise UnusableFile(f"the part '{part}' is shorter than its edits")
                skip -= len(dropped)
                position += len(dropped)
        while data := a.read(1 << 20):
            expect(data)
            position += len(data)
        if pending or b.read(1):
            raise UnusableFile(f"the part '{part}' has more bytes after writing than it should")
