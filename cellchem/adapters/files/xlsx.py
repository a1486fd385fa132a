"""The one reader of workbook packages (.xlsx, .xlsm): sheets, shared strings,
date formats and a streaming cell reader for the columns that matter.

Every command that reads a workbook goes through here: the audit, fill (its
header rows and its cells), ``--annotate``. The package has passed
``precheck`` first, which returns what it learned (the workbook part and its
sheets), so nothing is parsed twice.

Sheets are read with the standard library's expat parser, fed in chunks from
the zip's streaming reader: memory holds one chunk and the current row, never
the part. Document type declarations, entity declarations and external
references are refused the way defusedxml refuses them (its exception
classes). Every cap applies while streaming, before anything is stored:
``MAX_COLUMNS`` cells of a row are read and the rest skipped without being
kept, ``MAX_ROWS`` rows, ``MAX_CELL_CHARS`` characters of one text (the rest
is dropped as it arrives), and the inflated size of each part is counted as
it is read.

Once the consumer knows which columns it needs it sets ``keep`` on the row
stream, and from then on only the text of those cells is collected and
converted: the floor of the audit is the decompression and the XML scan.
"""

from __future__ import annotations

import datetime as _dt
import re
import zipfile
from collections.abc import Iterator
from pathlib import Path
from xml.parsers import expat

from ...audit import NO_SAVED_VALUE, NOT_RECALCULATED
from . import MAX_CELL_CHARS, MAX_COLUMNS, MAX_PART_BYTES, MAX_ROWS, OTHER_CELLS, UnusableFile, one_line
from .parts import CHUNK as _CHUNK
from .parts import SheetInfo
from .parts import safe_parser as _safe_parser

MAX_SHARED_CHARS = 1 << 28  # characters kept from the shared-string table in all (256 Mi)
_MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
_SEP = "}"


def _qn(local: str) -> str:
    return f"{_MAIN}{_SEP}{local}"


_ROW, _C, _V, _F, _IS, _T, _RPH, _SI, _NUMFMT, _XF, _CELLXFS = (
    _qn(n) for n in ("row", "c", "v", "f", "is", "t", "rPh", "si", "numFmt", "xf", "cellXfs")
)
_DATE_FORMATS = frozenset({14, 15, 16, 17, 18, 19, 20, 21, 22, 45, 46, 47})  # ECMA-376 18.8.30, built in
_QUOTED = re.compile(r'"[^"]*"|\[[^\]]*\]|\\.|_.|\*.')


def safe_parser(namespaces: bool = True) -> expat.XMLParserType:
    """The safe parser (``parts.safe_parser``); ``namespaces``: element names
    as '{uri}}local' (else as written, with their prefixes)."""
    return _safe_parser(_SEP if namespaces else None)


def cell_value(kind: str, raw: str, is_date: bool, strings: list[str], date1904: bool) -> object:
    """The value of a cell that has a value: ``kind`` is its ``t`` attribute, ``raw`` the text of its
    ``v`` (or inline string); numbers as int where written whole, dates by the cell's number format."""
    if kind == "s":
        try:
            return strings[int(raw)]
        except (ValueError, IndexError):
            return None
    if kind in ("inlineStr", "str", "e"):
        return raw
    if kind == "b":
        return raw.strip() == "1"
    try:
        number = float(raw)
    except ValueError:
        return raw
    if is_date:
        return _as_date(number, date1904)
    if number.is_integer() and "." not in raw and "e" not in raw and "E" not in raw:
        return int(number)
    return number


def _chunks(zin: zipfile.ZipFile, part: str, shown: str) -> Iterator[bytes]:
    """The part's bytes in chunks, stopped at MAX_PART_BYTES inflated (the zip
    reader itself stops at the size the directory declares)."""
    total = 0
    with zin.open(part) as fh:
        while chunk := fh.read(_CHUNK):
            total += len(chunk)
            if total > MAX_PART_BYTES:
                raise UnusableFile(
                    f"'{shown}': the part '{part}' inflates beyond {MAX_PART_BYTES >> 20} MiB, more than"
                    " cellchem reads from one part"
                )
            yield chunk


def _date_styles(zin: zipfile.ZipFile, part: str | None, shown: str) -> frozenset[int]:
    """The cell formats (``cellXfs`` indexes) whose number format shows a date
    or a time: the built-in ones, and custom codes with d, m, y, h or s
    outside quotes and brackets (ECMA-376 18.8.31)."""
    if not part or part not in zin.namelist():
        return frozenset()
    custom: dict[int, bool] = {}
    formats: list[int] = []
    depth = [0]
    in_xfs = [False]

    def start(name: str, attrs: dict[str, str]) -> None:
        depth[0] += 1
        if name == _NUMFMT:
            try:
                code = _QUOTED.sub("", attrs.get("formatCode", "")).lower()
                custom[int(attrs.get("numFmtId", ""))] = (
                    any(ch in code for ch in "dmyhs") and "general" != code
                )
            except ValueError:
                pass
        elif name == _CELLXFS:
            in_xfs[0] = True
        elif name == _XF and in_xfs[0]:
            try:
                formats.append(int(attrs.get("numFmtId", "0")))
            except ValueError:
                formats.append(0)

    def end(name: str) -> None:
        if name == _CELLXFS:
            in_xfs[0] = False

    p = safe_parser()
    p.StartElementHandler = start
    p.EndElementHandler = end
    for chunk in _chunks(zin, part, shown):
        p.Parse(chunk, False)
    p.Parse(b"", True)
    return frozenset(i for i, fmt in enumerate(formats) if fmt in _DATE_FORMATS or custom.get(fmt, False))


def shared_strings(zin: zipfile.ZipFile, part: str | None, shown: str) -> list[str]:
    """The shared-string table as plain text (rich-text runs joined, phonetic
    runs left out), each cut at MAX_CELL_CHARS as it is read."""
    if not part or part not in zin.namelist():
        return []
    out: list[str] = []
    buf: list[str] = []
    size = [0, 0]  # this string's characters, all strings' characters
    state = {"t": False, "rph": 0}

    def start(name: str, _attrs: dict[str, str]) -> None:
        if name == _T and not state["rph"]:
            state["t"] = True
        elif name == _RPH:
            state["rph"] += 1

    def end(name: str) -> None:
        if name == _T:
            state["t"] = False
        elif name == _RPH:
            state["rph"] -= 1
        elif name == _SI:
            out.append("".join(buf))
            buf.clear()
            size[0] = 0

    def text(data: str) -> None:
        if state["t"] and size[0] < MAX_CELL_CHARS:
            data = data[: MAX_CELL_CHARS - size[0]]
            buf.append(data)
            size[0] += len(data)
            size[1] += len(data)
            if size[1] > MAX_SHARED_CHARS:
                raise UnusableFile(
                    f"'{shown}': its shared-string table holds more than {MAX_SHARED_CHARS:,} characters,"
                    " more than cellchem reads"
                )

    p = safe_parser()
    p.StartElementHandler = start
    p.EndElementHandler = end
    p.CharacterDataHandler = text
    for chunk in _chunks(zin, part, shown):
        p.Parse(chunk, False)
    p.Parse(b"", True)
    return out


_COLUMN_OF: dict[str, int] = {}


def _letters(ref: str) -> int | None:
    """The 0-based column of a reference such as 'AB12', or None."""
    letters = ref.rstrip("0123456789")
    found = _COLUMN_OF.get(letters)
    if found is not None:
        return found
    if not letters or len(letters) > 3 or len(letters) == len(ref) or not letters.isascii():
        return None
    if not (letters.isalpha() and letters.isupper()):
        return None
    n = 0
    for ch in letters:
        n = n * 26 + ord(ch) - 64
    _COLUMN_OF[letters] = n - 1
    return n - 1


def _row_number(attrs: dict[str, str], previous: int) -> int:
    r = attrs.get("r")
    if r:
        try:
            n = int(r)
            if n > previous:
                return n
        except ValueError:
            pass
    return previous + 1


_EPOCH_1900 = _dt.datetime(1899, 12, 30)
_EPOCH_1904 = _dt.datetime(1904, 1, 1)


def _as_date(number: float, date1904: bool) -> object:
    """A date serial as the spreadsheet shows it (1900 system with its leap
    day of 1900, or the 1904 system); a number no date has stays a number."""
    if not (0 <= number < 2_958_466):
        return number
    base = _EPOCH_1904 if date1904 else _EPOCH_1900
    if not date1904 and number < 61:
        number += 1 if number < 60 else 0
        if number == 60:
            return number
    try:
        return base + _dt.timedelta(milliseconds=round(number * 86_400_000))  # to the millisecond
    except OverflowError:
        return number


class RowStream:
    """The rows of one sheet, streamed: ``(row number, values)``.

    ``keep`` may be set at any time to the 0-based columns still needed;
    cells of other columns are then skipped without their text being
    collected. ``truncated`` says a row had cells beyond MAX_COLUMNS.
    """

    def __init__(self, book: Book, sheet: SheetInfo) -> None:
        self._book = book
        self._sheet = sheet
        self.keep: frozenset[int] | None = None
        self.truncated = False
        self._it = self._rows()

    def __iter__(self) -> RowStream:
        return self

    def __next__(self) -> tuple[int, list[object]]:
        return next(self._it)

    def _rows(self) -> Iterator[tuple[int, list[object]]]:
        book = self._book
        strings = book.strings
        dates = book.date_styles
        date1904 = book.date1904
        unsaved = NOT_RECALCULATED if book.recalculate else None
        ready: list[tuple[int, list[object]]] = []
        # parser state (closures over locals are the fastest Python handlers)
        row_no = 0
        values: list[object] = []
        column = -1
        in_row = False
        cell_kind = ""
        cell_style = -1
        collecting = False
        wanted = False
        has_formula = False
        has_value = False
        text: list[str] = []
        chars = 0
        rows_seen = 0
        other = False
        stream = self

        # element names as this part writes them: the main namespace is the
        # default one, or bound to a prefix ('x:c'); found at the root
        tag_c, tag_v, tag_t, tag_f, tag_row, tag_rph = "c", "v", "t", "f", "row", "rPh"

        def root(name: str, attrs: dict[str, str]) -> None:
            nonlocal tag_c, tag_v, tag_t, tag_f, tag_row, tag_rph
            prefix = ""
            for key, value in attrs.items():
                if value == _MAIN and key.startswith("xmlns:"):
                    prefix = key[6:] + ":"
                    if name.startswith(prefix):
                        break
            if attrs.get("xmlns") == _MAIN and ":" not in name:
                prefix = ""
            tag_c, tag_v, tag_t, tag_f, tag_row, tag_rph = (
                prefix + n for n in ("c", "v", "t", "f", "row", "rPh")
            )
            p.StartElementHandler = start

        def start(name: str, attrs: dict[str, str]) -> None:
            nonlocal row_no, values, column, in_row, cell_kind, cell_style, collecting, wanted
            nonlocal has_formula, has_value, chars, rows_seen, other
            if name == tag_c:
                ref = attrs.get("r")
                col = _letters(ref) if ref else None
                column = col if col is not None and col > column else column + 1
                keep = stream.keep
                wanted = column < MAX_COLUMNS and (keep is None or column in keep)
                if wanted:
                    cell_kind = attrs.get("t", "n")
                    s = attrs.get("s")
                    cell_style = int(s) if s and s.isdigit() else -1
                    has_formula = False
                    has_value = False
            elif name == tag_v:
                if wanted:
                    collecting = True
                    has_value = True
                    text.clear()
                    chars = 0
                    p.CharacterDataHandler = chars_in
                else:
                    other = True
                    if column >= MAX_COLUMNS:
                        stream.truncated = True
            elif name == tag_t:
                if wanted and cell_kind == "inlineStr":
                    if not has_value:
                        text.clear()
                        chars = 0
                    collecting = True
                    has_value = True
                    p.CharacterDataHandler = chars_in
                else:
                    other = True
                    if column >= MAX_COLUMNS:
                        stream.truncated = True
            elif name == tag_f:
                if wanted:
                    has_formula = True
                else:
                    other = True
            elif name == tag_rph:
                wanted_rph[0] = wanted
                wanted = False
            elif name == tag_row:
                rows_seen += 1
                row_no = _row_number(attrs, row_no)
                values = []
                column = -1
                other = False
                in_row = True

        wanted_rph = [False]

        def end(name: str) -> None:
            nonlocal collecting, wanted, in_row, values
            if name == tag_c:
                if not wanted:
                    return
                wanted = False
                collecting = False
                value = (
                    cell_value(cell_kind, "".join(text), cell_style in dates, strings, date1904)
                    if has_value
                    else None
                )
                if has_formula:
                    if value is None or value == "":
                        value = NO_SAVED_VALUE
                    elif unsaved is not None:
                        value = unsaved
                if value is not None:
                    if len(values) < column:
                        values.extend([None] * (column - len(values)))
                    values.append(value)
            elif name == tag_v or name == tag_t:
                if collecting:
                    collecting = False
                    p.CharacterDataHandler = None
            elif name == tag_rph:
                wanted = wanted_rph[0]
            elif name == tag_row:
                in_row = False
                if not values and other and stream.keep is not None:
                    # nothing in the columns kept, something in another: not a blank row
                    free = next(i for i in range(MAX_COLUMNS + 1) if i not in stream.keep)
                    values = [None] * free + [OTHER_CELLS]
                ready.append((row_no, values))

        def chars_in(data: str) -> None:
            nonlocal chars
            if chars < MAX_CELL_CHARS:
                if chars + len(data) > MAX_CELL_CHARS:
                    data = data[: MAX_CELL_CHARS - chars]
                text.append(data)
                chars += len(data)

        def mark(_target: str, _data: str) -> None:  # a cell of another column with content, skipped
            nonlocal other
            other = True

        p = safe_parser(namespaces=False)
        p.StartElementHandler = root
        p.ProcessingInstructionHandler = mark
        p.EndElementHandler = end
        shown = book.shown
        try:
            skip = _Skipper(self)
            for chunk in _chunks(book.zin, self._sheet.part, shown):
                p.Parse(skip.feed(chunk, tag_c == "c"), False)
                if ready:
                    for item in ready:
                        if item[0] > MAX_ROWS:
                            return
                        yield item
                    ready.clear()
                if rows_seen > MAX_ROWS and not in_row:
                    return
            p.Parse(skip.rest(), True)
            for item in ready:
                if item[0] > MAX_ROWS:
                    return
                yield item
        except UnusableFile:
            raise
        except expat.ExpatError as exc:
            raise UnusableFile(
                f"'{shown}', sheet '{self._sheet.name}': the sheet's XML is damaged ({one_line(exc)}); open"
                " it in a spreadsheet program and save it again"
            ) from None
        except Exception as exc:  # a bad CRC, a refused declaration: the file, not a row
            raise UnusableFile(
                f"'{shown}', sheet '{self._sheet.name}' could not be read ({type(exc).__name__}:"
                f" {one_line(exc)}); open it in a spreadsheet program and save it again"
            ) from None


_RAW_TEXT = (b"<![CDATA[", b"<!--", b"<?")
_CUT_LIMIT = 1 << 20


class _Skipper:
    """Cells of the columns the consumer does not need, removed from the
    bytes before the parser sees them (the parser's work is per element, and
    most cells of a wide sheet are not needed).

    A cell with content becomes a processing instruction ``<?x?>``, so that
    the reader still knows the row holds something in another column (a row
    of only a quantity is not a blank row); an empty cell is dropped. Only
    whole cells that carry their reference as their first attribute
    (as spreadsheet programs write them) are removed, and only up to
    the last complete cell or row of what has arrived, so every cut lies
    between elements. Wherever the bytes hold what could hide markup from a
    byte scan (a CDATA section, a comment, a processing instruction) or a
    cell without a reference (its column is counted from the one before), the
    bytes go to the parser unchanged.
    """

    def __init__(self, stream: RowStream) -> None:
        self.stream = stream
        self.keep: frozenset[int] | None = None
        self.pattern: re.Pattern[bytes] | None = None
        self.tail = b""
        self.off = False

    def _pattern(self) -> re.Pattern[bytes] | None:
        keep = self.stream.keep
        if keep is not self.keep:
            self.keep = keep
            if keep is None:
                self.pattern = None
            else:
                letters = b"|".join(re.escape(_column_letters(i).encode()) for i in sorted(keep))
                other = rb'<c r="(?!(?:' + letters + rb')[0-9])[A-Z]{1,3}[0-9]+"[^>]*?'
                self.pattern = re.compile(other + rb"/>")  # an empty cell of another column: dropped
                # a cell with content: a processing instruction, a mark the parser reports
                self.full = re.compile(other + rb">.*?</c>", re.DOTALL)
        return self.pattern

    def feed(self, chunk: bytes, plain_names: bool) -> bytes:
        pattern = None if self.off or not plain_names else self._pattern()
        if pattern is None:
            if self.tail:
                chunk, self.tail = self.tail + chunk, b""
            return chunk
        data = self.tail + chunk if self.tail else chunk
        if any(mark in data for mark in _RAW_TEXT):
            self.off = True
            self.tail = b""
            return data
        cut = data.rfind(b"</row>")
        cut = cut + 6 if cut >= 0 else data.rfind(b"</c>")
        if cut < 0:
            if len(data) > _CUT_LIMIT:  # no cell ends here (a long text, whitespace): pass it on
                self.tail = b""
                return data
            self.tail = data
            return b""
        if cut == data.rfind(b"</c>"):
            cut += 4
        head, self.tail = data[:cut], data[cut:]
        if head.count(b'<c r="') != head.count(b"<c ") + head.count(b"<c>") + head.count(b"<c/>"):
            return head  # a cell without its reference first: its column may be counted
        return self.full.sub(b"<?x?>", pattern.sub(b"", head))

    def rest(self) -> bytes:
        tail, self.tail = self.tail, b""
        return tail


def _column_letters(index: int) -> str:
    out = ""
    index += 1
    while index:
        index, r = divmod(index - 1, 26)
        out = chr(65 + r) + out
    return out


class Book:
    """An open workbook package; use as a context manager."""

    def __init__(self, path: str | Path, facts=None) -> None:
        from .ooxml import package_map

        self.path = Path(path)
        self.shown = self.path.name
        self.zin = zipfile.ZipFile(self.path)
        try:
            pmap = package_map(self.zin)
            self.map = pmap
            self.sheets = [
                SheetInfo(s.name, s.state, s.part) for s in pmap.sheets if s.part in self.zin.NameToInfo
            ]
            self.recalculate = pmap.recalculate
            self.date1904 = _date1904(self.zin, pmap.workbook, self.shown)
            self.date_styles = _date_styles(self.zin, pmap.styles, self.shown)
            self._strings: list[str] | None = None
            self._shared_part = pmap.shared_strings
        except BaseException:
            self.zin.close()
            raise

    @property
    def strings(self) -> list[str]:
        if self._strings is None:
            self._strings = shared_strings(self.zin, self._shared_part, self.shown)
        return self._strings

    @property
    def sheet_names(self) -> list[str]:
        return [s.name for s in self.sheets]

    def sheet(self, name: str) -> SheetInfo:
        for s in self.sheets:
            if s.name == name:
                return s
        raise KeyError(name)

    def rows(self, name: str) -> RowStream:
        return RowStream(self, self.sheet(name))

    def first_rows(self, name: str, count: int) -> list[list[object]]:
        """The values of the sheet's first ``count`` rows, row 1 first, missing
        rows empty."""
        out: list[list[object]] = []
        for number, values in self.rows(name):
            if number > count:
                break
            while len(out) < number - 1:
                out.append([])
            out.append(values)
        return out

    def close(self) -> None:
        self.zin.close()

    def __enter__(self) -> Book:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def _date1904(zin: zipfile.ZipFile, workbook: str, shown: str) -> bool:
    found = [False]

    def start(name: str, attrs: dict[str, str]) -> None:
        if name == _qn("workbookPr") and attrs.get("date1904", "").strip().lower() in ("1", "true"):
            found[0] = True

    p = safe_parser()
    p.StartElementHandler = start
    for chunk in _chunks(zin, workbook, shown):
        p.Parse(chunk, False)
    p.Parse(b"", True)
    return found[0]
