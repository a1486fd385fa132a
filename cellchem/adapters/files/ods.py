"""Reading OpenDocument spreadsheets (.ods): the package checks, the sheets
and a streaming cell reader.

The package has passed the generic zip checks of ``precheck`` (member count,
declared sizes, parts escaping the package) before it gets here.
:func:`check_ods` then checks what makes it an OpenDocument spreadsheet
(the ``mimetype``, no encryption in ``META-INF/manifest.xml``, a
``content.xml``) and lists its sheets with their visibility, in one pass
over ``content.xml``; :func:`open_ods` takes what it learned, so nothing is
parsed twice.

``content.xml`` is read with the standard library's expat parser, fed in
chunks of 64 KiB from the zip's streaming reader: memory holds one chunk
and the current row, never the part. A document type, entity declarations
and external references are refused the way defusedxml refuses them (its
exception classes). Caps apply while streaming, before anything is stored:
the inflated size of the part (``MAX_PART_BYTES``), the number of tags
(``MAX_XML_TAGS``, counted in each chunk before it is parsed), the size of
one tag or comment (``MAX_TOKEN_BYTES``: expat 2.5 rescans an unfinished
token on every chunk), ``MAX_COLUMNS`` cells of a row (the rest skipped
without being stored), ``MAX_ROWS`` rows and ``MAX_CELL_CHARS`` characters
of one text (the rest dropped as it arrives).

Repeated rows and cells (``table:number-rows-repeated``,
``table:number-columns-repeated``) are never expanded in memory: an empty
repeated block only moves the counter, a repeated cell with content is
stored once per column read (at most ``MAX_COLUMNS``), and a repeated row
with content is given once per copy as the consumer takes it.

Values, as the row stream promises them: a string cell gives its text
(paragraphs joined with a line break; ``text:s``, ``text:tab`` and
``text:line-break`` as the characters they stand for; spans and links
included; white space collapsed as OpenDocument 1.2 part 1, 6.1.2 says;
comments, drawings, notes and ruby text left out, 6.1.1); float, percentage
and currency cells a float; boolean cells a bool; date cells a
``datetime.date`` or ``datetime.datetime``; time cells their text; a
formula cell its saved value, or ``audit.NO_SAVED_VALUE`` when it has none;
an error value its text (``#DIV/0!``); covered cells of a merged range are
columns with no value. A value that cannot be read (a float cell whose
``office:value`` is not a number) gives the cell's text, so the checks see
what the user sees.
"""

from __future__ import annotations

import datetime as _dt
import re
import zipfile
import zlib
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from pathlib import Path
from xml.parsers import expat

from ...audit import NO_SAVED_VALUE
from . import MAX_CELL_CHARS, MAX_COLUMNS, MAX_PART_BYTES, MAX_ROWS, OTHER_CELLS, UnusableFile, one_line
from .parts import CHUNK as _CHUNK
from .parts import SheetInfo
from .parts import safe_parser as _safe_parser

ODS_MEDIA_TYPE = "application/vnd.oasis.opendocument.spreadsheet"
CONTENT = "content.xml"
MANIFEST = "META-INF/manifest.xml"
SIGNATURES = "META-INF/documentsignatures.xml"
MAX_XML_TAGS = 40_000_000  # tags ('<', start and end) in content.xml: about 10 million filled cells
MAX_TOKEN_BYTES = 4 << 20  # one tag, comment or processing instruction: 4 MiB
SPARSE_WINDOW = 64 << 20  # every 64 MiB of a part must hold at least
SPARSE_MIN_TAGS = SPARSE_WINDOW >> 10  # one tag per KiB on average (a sheet has one every 20 to 100 bytes)
MAX_REPEAT = 1 << 40  # a repeat count beyond any sheet is read as this many
SEP = " "  # expat's separator between a namespace and a local name

NS_OFFICE = "urn:oasis:names:tc:opendocument:xmlns:office:1.0"
NS_TABLE = "urn:oasis:names:tc:opendocument:xmlns:table:1.0"
NS_TEXT = "urn:oasis:names:tc:opendocument:xmlns:text:1.0"
NS_STYLE = "urn:oasis:names:tc:opendocument:xmlns:style:1.0"
NS_NUMBER = "urn:oasis:names:tc:opendocument:xmlns:datastyle:1.0"
NS_DRAW = "urn:oasis:names:tc:opendocument:xmlns:drawing:1.0"
NS_DR3D = "urn:oasis:names:tc:opendocument:xmlns:dr3d:1.0"
NS_MANIFEST = "urn:oasis:names:tc:opendocument:xmlns:manifest:1.0"
NS_CALCEXT = "urn:org:documentfoundation:names:experimental:calc:xmlns:calcext:1.0"


def qn(ns: str, local: str) -> str:
    """An element or attribute name as expat gives it."""
    return f"{ns}{SEP}{local}"


# elements
TABLE = qn(NS_TABLE, "table")
ROW = qn(NS_TABLE, "table-row")
CELL = qn(NS_TABLE, "table-cell")
COVERED = qn(NS_TABLE, "covered-table-cell")
TABLE_COLUMN = qn(NS_TABLE, "table-column")
SPREADSHEET = qn(NS_OFFICE, "spreadsheet")
BODY = qn(NS_OFFICE, "body")
AUTOMATIC_STYLES = qn(NS_OFFICE, "automatic-styles")
ANNOTATION = qn(NS_OFFICE, "annotation")
STYLE_STYLE = qn(NS_STYLE, "style")
TABLE_PROPERTIES = qn(NS_STYLE, "table-properties")
P = qn(NS_TEXT, "p")
H = qn(NS_TEXT, "h")
S = qn(NS_TEXT, "s")
TAB = qn(NS_TEXT, "tab")
LINE_BREAK = qn(NS_TEXT, "line-break")
_C = qn(NS_TEXT, "c")
NOTE_BODY = qn(NS_TEXT, "note-body")
RUBY_TEXT = qn(NS_TEXT, "ruby-text")
# attributes
A_NAME = qn(NS_TABLE, "name")
A_TABLE_STYLE = qn(NS_TABLE, "style-name")
A_PROTECTED = qn(NS_TABLE, "protected")
A_DISPLAY = qn(NS_TABLE, "display")
A_ROWS_REPEATED = qn(NS_TABLE, "number-rows-repeated")
A_COLUMNS_REPEATED = qn(NS_TABLE, "number-columns-repeated")
A_COLUMNS_SPANNED = qn(NS_TABLE, "number-columns-spanned")
A_FORMULA = qn(NS_TABLE, "formula")
A_VALUE_TYPE = qn(NS_OFFICE, "value-type")
A_VALUE = qn(NS_OFFICE, "value")
A_DATE_VALUE = qn(NS_OFFICE, "date-value")
A_TIME_VALUE = qn(NS_OFFICE, "time-value")
A_BOOLEAN_VALUE = qn(NS_OFFICE, "boolean-value")
A_STRING_VALUE = qn(NS_OFFICE, "string-value")
A_CALC_VALUE_TYPE = qn(NS_CALCEXT, "value-type")
A_STYLE_NAME = qn(NS_STYLE, "name")
A_STYLE_FAMILY = qn(NS_STYLE, "family")

# what a paragraph's character content leaves out (OpenDocument 1.2 part 1, 6.1.1), and sub-tables
_LEFT_OUT = frozenset({ANNOTATION, NOTE_BODY, RUBY_TEXT, TABLE})
_LEFT_OUT_NS = (NS_DRAW + SEP, NS_DR3D + SEP)
_WHITE = re.compile(r"[ \t\r\n]+")
_DATE = re.compile(
    r"(-?\d{4,})-(\d\d)-(\d\d)(?:T(\d\d):(\d\d)(?::(\d\d)(?:[.,](\d+))?)?)?(Z|[+-]\d\d:?\d\d)?$"
)

_OTHER_ODF = {
    "application/vnd.oasis.opendocument.text": "a text document (Writer)",
    "application/vnd.oasis.opendocument.text-template": "a text document template (Writer)",
    "application/vnd.oasis.opendocument.text-master": "a master text document (Writer)",
    "application/vnd.oasis.opendocument.presentation": "a presentation (Impress)",
    "application/vnd.oasis.opendocument.presentation-template": "a presentation template (Impress)",
    "application/vnd.oasis.opendocument.graphics": "a drawing (Draw)",
    "application/vnd.oasis.opendocument.graphics-template": "a drawing template (Draw)",
    "application/vnd.oasis.opendocument.chart": "a chart",
    "application/vnd.oasis.opendocument.formula": "a formula document (Math)",
    "application/vnd.oasis.opendocument.database": "a database (Base)",
    "application/vnd.oasis.opendocument.image": "an image document",
}
_TEMPLATE = "application/vnd.oasis.opendocument.spreadsheet-template"
_RESAVE = "open it in LibreOffice Calc and save it again as .ods"


# ---------------------------------------------------------------------------
# The parser and the part's bytes
# ---------------------------------------------------------------------------


def safe_parser() -> expat.XMLParserType:
    """The safe parser (``parts.safe_parser``), names as ``uri local``."""
    return _safe_parser(SEP)


def xml_chunks(zf: zipfile.ZipFile, part: str, shown: str) -> Iterator[bytes]:
    """The part's bytes in chunks of 64 KiB, stopped beyond ``MAX_PART_BYTES``
    inflated, beyond ``MAX_XML_TAGS`` tags, and at a stretch of
    ``SPARSE_WINDOW`` bytes holding fewer than ``SPARSE_MIN_TAGS`` tags (white
    space or text padding a part out); each limit is checked before the
    chunk is parsed. (The zip reader itself stops at the size the directory
    declares.)"""
    total = 0
    tags = 0
    window_end = SPARSE_WINDOW
    window_tags = 0
    with zf.open(part) as fh:
        while chunk := fh.read(_CHUNK):
            total += len(chunk)
            if total > MAX_PART_BYTES:
                raise UnusableFile(
                    f"{shown}: its part '{part}' inflates beyond {MAX_PART_BYTES:,} bytes, more than cellchem"
                    " reads from one part: export the sheet as CSV"
                )
            found = chunk.count(b"<")
            tags += found
            window_tags += found
            if total >= window_end:
                if window_tags < SPARSE_MIN_TAGS:
                    raise UnusableFile(
                        f"{shown}: its part '{part}' holds {SPARSE_WINDOW >> 20} MiB with fewer than"
                        f" {SPARSE_MIN_TAGS:,} XML tags (white space or text padding the part out), which no"
                        f" spreadsheet program writes: {_RESAVE}"
                    )
                window_end += SPARSE_WINDOW
                window_tags = 0
            if tags > MAX_XML_TAGS:
                raise UnusableFile(
                    f"{shown}: its part '{part}' holds more than {MAX_XML_TAGS:,} XML tags, more than"
                    " cellchem reads from one spreadsheet: split the data over smaller files or export the"
                    " sheet as CSV"
                )
            yield chunk


def feed(p: expat.XMLParserType, zf: zipfile.ZipFile, part: str, shown: str) -> Iterator[int]:
    """Feed the part to ``p`` chunk by chunk, yielding after each chunk the
    number of bytes fed so far; the last chunk is fed as final. A token still
    unfinished after ``MAX_TOKEN_BYTES`` is refused."""
    fed = 0
    for chunk in xml_chunks(zf, part, shown):
        p.Parse(chunk, False)
        fed += len(chunk)
        if fed - max(p.CurrentByteIndex, 0) > MAX_TOKEN_BYTES:
            raise UnusableFile(
                f"{shown}: its part '{part}' holds a single XML tag, comment or instruction of more than"
                f" {MAX_TOKEN_BYTES:,} bytes, which no spreadsheet program writes: {_RESAVE}"
            )
        yield fed
    p.Parse(b"", True)
    yield fed


def xml_failure(shown: str, part: str, exc: BaseException) -> UnusableFile:
    """The one-line refusal for a part that cannot be parsed."""
    import defusedxml

    if isinstance(exc, defusedxml.ExternalReferenceForbidden):
        return UnusableFile(
            f"{shown} holds an external XML reference in '{part}', which cellchem refuses (it could make a"
            " reader fetch other files): ask the supplier for a copy saved by a spreadsheet program"
        )
    if isinstance(exc, defusedxml.DefusedXmlException):
        return UnusableFile(
            f"{shown} holds an XML document type or entity declaration in '{part}', which cellchem"
            " refuses (a possible entity-expansion attack): ask the supplier for a copy saved by a"
            " spreadsheet program"
        )
    if isinstance(exc, expat.ExpatError):
        return UnusableFile(
            f"{shown} is damaged: '{part}' is not well-formed XML ({one_line(exc)}); {_RESAVE}"
        )
    if isinstance(exc, zipfile.BadZipFile | zlib.error | EOFError | OSError):
        return UnusableFile(
            f"{shown} is damaged: the part '{part}' cannot be read ({one_line(exc)}); {_RESAVE}"
        )
    return UnusableFile(
        f"{shown}: '{part}' could not be read ({type(exc).__name__}: {one_line(exc)}); {_RESAVE}"
    )


def parse_part(
    zf: zipfile.ZipFile, part: str, shown: str, setup: Callable[[expat.XMLParserType], None]
) -> None:
    """Parse a whole part with a safe parser whose handlers ``setup`` sets;
    every failure is an UnusableFile naming the file and the part."""
    p = safe_parser()
    setup(p)
    try:
        for _ in feed(p, zf, part, shown):
            pass
    except UnusableFile:
        raise
    except Exception as exc:
        raise xml_failure(shown, part, exc) from None


def repeat_count(text: str | None) -> int:
    """A repeat attribute as a count: 1 when missing or not a positive
    whole number, at most MAX_REPEAT.

    >>> repeat_count("3"), repeat_count(None), repeat_count("0"), repeat_count("x")
    (3, 1, 1, 1)
    """
    if not text:
        return 1
    text = text.strip()
    if not text.isdigit() or len(text) > 15:
        return MAX_REPEAT if text.isdigit() else 1
    return min(max(int(text), 1), MAX_REPEAT)


# ---------------------------------------------------------------------------
# The package
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class OdsTable:
    """A sheet as content.xml declares it."""

    name: str
    state: str  # "visible" or "hidden"
    protected: bool
    index: int  # its place among the sheets, from 0


@dataclass(frozen=True)
class OdsFacts:
    """What ``check_ods`` learned about a package."""

    content: str  # the part holding the sheets: content.xml
    tables: tuple[OdsTable, ...]
    signed: bool  # META-INF/documentsignatures.xml: the document carries a digital signature

    @property
    def sheets(self) -> list[SheetInfo]:
        return [SheetInfo(t.name, t.state) for t in self.tables]


def _member(zf: zipfile.ZipFile, name: str) -> zipfile.ZipInfo | None:
    try:
        return zf.getinfo(name)
    except KeyError:
        return None


def _media_type(zf: zipfile.ZipFile, shown: str) -> tuple[str, bool]:
    """The package's media type from its ``mimetype`` part (or, lacking one,
    the manifest's entry for "/"), and whether the manifest declares
    encrypted parts."""
    declared = ""
    info = _member(zf, "mimetype")
    if info is not None:
        if info.file_size > 256:
            raise UnusableFile(f"{shown} is not an OpenDocument spreadsheet: its 'mimetype' part is too long")
        try:
            declared = zf.read(info).decode("ascii", errors="replace").strip()
        except (zipfile.BadZipFile, zlib.error, EOFError, OSError) as exc:
            raise xml_failure(shown, "mimetype", exc) from None
    root_type = [""]
    encrypted = [False]
    if _member(zf, MANIFEST) is not None:
        entry = qn(NS_MANIFEST, "file-entry")
        path = qn(NS_MANIFEST, "full-path")
        media = qn(NS_MANIFEST, "media-type")
        encryption = qn(NS_MANIFEST, "encryption-data")

        def start(name: str, attrs: dict[str, str]) -> None:
            if name == entry and attrs.get(path) == "/":
                root_type[0] = attrs.get(media, "")
            elif name == encryption:
                encrypted[0] = True

        def setup(p: expat.XMLParserType) -> None:
            p.StartElementHandler = start

        parse_part(zf, MANIFEST, shown, setup)
    return declared or root_type[0], encrypted[0]


def check_ods(zf: zipfile.ZipFile, shown: str) -> OdsFacts:
    """The checks of an OpenDocument package after the generic zip checks:
    it is a spreadsheet (``mimetype``), it is not encrypted (the manifest
    declares no ``encryption-data``), it has a ``content.xml`` that parses
    (no document type or entities), and it has a visible sheet. The part's
    size and tags are counted before it is parsed (``xml_chunks``), so an
    inflation bomb costs its inflation, not its parsing.

    Args:
        zf: the package, open.
        shown: the file as messages show it, quoted (``'stock.ods'``).

    Returns:
        OdsFacts: the content part, the sheets in order with their
        visibility (a sheet whose table style says ``table:display="false"``
        is hidden) and protection, and whether the document is signed.

    Raises:
        UnusableFile: a one-line message that starts with ``shown``.
    """
    media_type, encrypted = _media_type(zf, shown)
    if media_type != ODS_MEDIA_TYPE:
        if media_type in _OTHER_ODF:
            raise UnusableFile(
                f"{shown} is an OpenDocument file but {_OTHER_ODF[media_type]}, not a spreadsheet: put the"
                " table in a spreadsheet (LibreOffice Calc) and save it as .ods"
            )
        if media_type == _TEMPLATE:
            raise UnusableFile(
                f"{shown} is an OpenDocument spreadsheet template (.ots): open it in LibreOffice Calc and"
                " save it as .ods"
            )
        found = f"'{media_type[:80]}'" if media_type else "no media type"
        raise UnusableFile(
            f"{shown} is not an OpenDocument spreadsheet ({found} in its 'mimetype' part, expected"
            f" '{ODS_MEDIA_TYPE}'): {_RESAVE}"
        )
    if encrypted:
        raise UnusableFile(
            f"{shown} is protected with a password (its parts are encrypted), so cellchem cannot read it:"
            " open it in LibreOffice Calc and save it without a password (File > Properties > Security, or"
            " Save As with 'Save with password' unticked)"
        )
    if _member(zf, CONTENT) is None:
        raise UnusableFile(
            f"{shown} is damaged: it has no '{CONTENT}', the part that holds the sheets; {_RESAVE}"
        )
    for _chunk in xml_chunks(zf, CONTENT, shown):  # the caps on size and tags, before anything is parsed
        pass
    tables = _scan_tables(zf, CONTENT, shown)
    if not tables:
        raise UnusableFile(
            f"{shown} has no sheets ('{CONTENT}' holds no table): {_RESAVE} with the data's sheets"
        )
    if all(t.state != "visible" for t in tables):
        listed = ", ".join(f"'{t.name}'" for t in tables[:5])
        more = f" and {len(tables) - 5} more" if len(tables) > 5 else ""
        raise UnusableFile(
            f"{shown} has no visible sheet: all its sheets are hidden: {listed}{more}; show the sheet that"
            " holds the data (Sheet > Show Sheet) and save it again"
        )
    return OdsFacts(CONTENT, tuple(tables), _member(zf, SIGNATURES) is not None)


def _scan_tables(zf: zipfile.ZipFile, part: str, shown: str) -> list[OdsTable]:
    """The sheets of content.xml: each top-level ``table:table`` of
    ``office:spreadsheet`` with its name, visibility and protection (inside
    a sheet only the depth is followed, to find its end)."""
    hidden_styles: set[str] = set()
    found: list[tuple[str, str, bool]] = []  # name, style, protected
    depth = 0
    table_at = 0  # the depth of the sheet being passed over
    style_name = ""  # the table-family style being read
    in_spreadsheet = False
    parser: list[expat.XMLParserType] = []

    def start(name: str, attrs: dict[str, str]) -> None:
        nonlocal depth, table_at, style_name, in_spreadsheet
        depth += 1
        if name == TABLE:
            if in_spreadsheet:
                found.append(
                    (
                        attrs.get(A_NAME, ""),
                        attrs.get(A_TABLE_STYLE, ""),
                        attrs.get(A_PROTECTED, "").strip().lower() == "true",
                    )
                )
            table_at = depth
            parser[0].StartElementHandler = in_table_start
            parser[0].EndElementHandler = in_table_end
        elif name == STYLE_STYLE:
            style_name = attrs.get(A_STYLE_NAME, "") if attrs.get(A_STYLE_FAMILY) == "table" else ""
        elif name == TABLE_PROPERTIES:
            if style_name and attrs.get(A_DISPLAY, "").strip().lower() == "false":
                hidden_styles.add(style_name)
        elif name == SPREADSHEET:
            in_spreadsheet = True

    def end(name: str) -> None:
        nonlocal depth, style_name, in_spreadsheet
        depth -= 1
        if name == STYLE_STYLE:
            style_name = ""
        elif name == SPREADSHEET:
            in_spreadsheet = False

    def in_table_start(_name: str, _attrs: dict[str, str]) -> None:
        nonlocal depth
        depth += 1

    def in_table_end(_name: str) -> None:
        nonlocal depth
        if depth == table_at:
            parser[0].StartElementHandler = start
            parser[0].EndElementHandler = end
        depth -= 1

    def setup(p: expat.XMLParserType) -> None:
        parser.append(p)
        p.StartElementHandler = start
        p.EndElementHandler = end

    parse_part(zf, part, shown, setup)
    missing = {style for _n, style, _p in found if style} - hidden_styles
    if missing and _member(zf, "styles.xml") is not None:
        hidden_styles |= _hidden_table_styles(zf, "styles.xml", shown)
    return [
        OdsTable(name, "hidden" if style in hidden_styles else "visible", protected, i)
        for i, (name, style, protected) in enumerate(found)
    ]


def _hidden_table_styles(zf: zipfile.ZipFile, part: str, shown: str) -> set[str]:
    """The table styles of styles.xml that hide their sheet."""
    hidden: set[str] = set()
    current = [""]

    def start(name: str, attrs: dict[str, str]) -> None:
        if name == STYLE_STYLE:
            current[0] = attrs.get(A_STYLE_NAME, "") if attrs.get(A_STYLE_FAMILY) == "table" else ""
        elif name == TABLE_PROPERTIES and current[0] and attrs.get(A_DISPLAY, "").strip().lower() == "false":
            hidden.add(current[0])

    def setup(p: expat.XMLParserType) -> None:
        p.StartElementHandler = start

    parse_part(zf, part, shown, setup)
    return hidden


# ---------------------------------------------------------------------------
# Cell values
# ---------------------------------------------------------------------------


def _date_value(text: str) -> object:
    """An ``office:date-value`` as a date (no time given) or a datetime;
    None when it is not a date."""
    m = _DATE.match(text.strip())
    if m is None:
        return None
    year, month, day, hour, minute, second, fraction, _zone = m.groups()
    try:
        if hour is None:
            return _dt.date(int(year), int(month), int(day))
        micro = int((fraction or "0")[:6].ljust(6, "0"))
        return _dt.datetime(int(year), int(month), int(day), int(hour), int(minute), int(second or 0), micro)
    except ValueError:
        return None


def cell_value(attrs: dict[str, str], text: str | None) -> object:
    """The value of a ``table:table-cell`` from its attributes and its
    paragraphs' text (None when it has no paragraph).

    >>> cell_value({A_VALUE_TYPE: "float", A_VALUE: "12"}, "12")
    12
    >>> cell_value({A_VALUE_TYPE: "float", A_VALUE: "58.44"}, "58.44")
    58.44
    >>> cell_value({A_VALUE_TYPE: "string"}, "NaCl")
    'NaCl'
    >>> cell_value({A_FORMULA: "of:=1+1"}, None) is NO_SAVED_VALUE
    True
    """
    kind = attrs.get(A_VALUE_TYPE)
    formula = A_FORMULA in attrs
    if kind is None:
        if formula:
            return NO_SAVED_VALUE
        return text if text else None
    if kind == "string":
        if attrs.get(A_CALC_VALUE_TYPE) == "error":
            return text if text is not None else attrs.get(A_STRING_VALUE, "")
        saved = attrs.get(A_STRING_VALUE)
        if saved is not None:
            return saved[:MAX_CELL_CHARS]
        return text if text is not None else ""
    if kind in ("float", "percentage", "currency"):
        raw = attrs.get(A_VALUE)
        if raw is None:
            return NO_SAVED_VALUE if formula else (text or None)
        try:
            number = float(raw)
        except ValueError:
            return text or None
        # a whole number written without a point is an integer, as the .xlsx reader gives it
        if number.is_integer() and not any(c in raw for c in ".eE"):
            return int(number)
        return number
    if kind == "boolean":
        raw = attrs.get(A_BOOLEAN_VALUE)
        if raw is None:
            return NO_SAVED_VALUE if formula else (text or None)
        flag = raw.strip().lower()
        if flag in ("true", "1"):
            return True
        if flag in ("false", "0"):
            return False
        return text or None
    if kind == "date":
        raw = attrs.get(A_DATE_VALUE)
        if raw is None:
            return NO_SAVED_VALUE if formula else (text or None)
        value = _date_value(raw)
        return value if value is not None else (text or raw)
    if kind == "time":
        raw = attrs.get(A_TIME_VALUE)
        if raw is None and formula and not text:
            return NO_SAVED_VALUE
        return text or raw or None
    return text or None  # a value type OpenDocument does not define: what the cell shows


# ---------------------------------------------------------------------------
# Reading the rows of a sheet
# ---------------------------------------------------------------------------


@dataclass
class CellRun:
    """A ``table:table-cell`` or ``table:covered-table-cell`` element of a row
    (positions are byte offsets in the part, as expat reports them)."""

    column: int  # 0-based, its first column
    repeat: int
    covered: bool
    start: int  # offset of its start tag
    end: int  # expat's offset at its end: the end tag's start, or just after an empty-element tag
    attrs: dict[str, str]
    children: bool  # it has child elements
    other_children: bool  # children other than paragraphs (comments, drawings, sub-tables)
    value: object  # None, or the value the reader gives it

    @property
    def formula(self) -> bool:
        return A_FORMULA in self.attrs


@dataclass
class RowRecord:
    """One ``table:table-row`` element of the sheet being read."""

    number: int  # 1-based number of its first row
    repeat: int
    values: list[object]  # by 0-based column, at most MAX_COLUMNS
    start: int = 0
    end: int = 0
    used: int = 0  # columns up to the last one with content (0: none)
    width: int = 0  # columns it declares
    cells: list[CellRun] | None = None
    attrs: dict[str, str] | None = None


@dataclass
class Mark:
    """A place in the part the writer needs: ``kind`` and expat's offset."""

    kind: str
    at: int
    names: frozenset[str] = frozenset()  # styles-end: the style names declared
    index: int = -1  # sheet-end: the sheet's place among the sheets


@dataclass
class Columns:
    """The columns a pass needs values of (``keep``, None for all), for a
    pass that is not a row stream; ``truncated`` as a row stream has it."""

    keep: frozenset[int] | None = None
    truncated: bool = False


@dataclass
class ScanOptions:
    table: int  # the sheet read, by index
    positions: bool = False  # give the cells of each row and the writer's marks
    stream: RowStream | Columns | None = None  # read its ``keep``; set its ``truncated``
    all_rows: bool = False  # give rows with no values too
    root_ns: dict[str, str] = field(
        default_factory=dict
    )  # prefix ('' for the default) -> namespace, of the root
    nested_ns: bool = False  # (set while reading) an element below the root declares a namespace


def scan_content(zf: zipfile.ZipFile, part: str, shown: str, options: ScanOptions) -> Iterator[object]:
    """Stream ``part``: yields, for the sheet ``options.table``, a RowRecord
    per row with values (every row with ``all_rows``), in order; with
    ``positions`` also each chunk's bytes (before the records it holds),
    the cells and attributes of each row, and Marks (``styles-start``,
    ``styles-end``, ``body-start``, ``table-start``, ``row-start`` and
    ``table-end`` of the sheet read, ``sheet-end`` of every sheet,
    ``spreadsheet-end``).

    The parser's handlers change with where it is (outside the sheet's
    rows, in a row, in a cell, in a sheet not read), so that each event
    costs only what that place needs."""
    want = options.table
    positions = options.positions
    stream = options.stream
    all_rows = options.all_rows or positions
    ready: list[object] = []
    p = safe_parser()
    done = False  # the sheet has been read (the reader stops there)

    depth = 0
    in_spreadsheet = False
    top_tables = -1  # index of the current (or last) top-level table
    table_depth = 0
    in_target = False  # inside the wanted sheet
    skip_until = 0  # the depth of a sheet not read, while inside it
    styles_depth = 0  # depth of office:automatic-styles while inside it
    style_names: set[str] = set()
    row_no = 0  # rows of the sheet counted so far
    # the row
    row_depth = 0
    row_repeat = 1
    row_start = 0
    row_attrs: dict[str, str] = {}
    values: list[object] = []
    column = 0
    used = 0
    cells: list[CellRun] | None = None
    # the cell
    in_cell = False
    cell_depth = 0
    cell_attrs: dict[str, str] = {}
    cell_repeat = 1
    cell_covered = False
    cell_start = 0
    cell_wanted = False
    cell_children = False
    cell_other = False
    collect = False  # the cell's text is collected
    # text
    skip_depth = 0  # depth of a left-out subtree inside the cell (0: none)
    para_depth = 0  # depth of the paragraph being read (0: none)
    paragraphs = 0
    parts: list[str] = []
    chars = 0
    last_white = True  # the last character is a collapsed white space, or the paragraph has none yet
    has_text = False

    # -- outside the rows of the sheet read ------------------------------------------------------------

    def g_start(name: str, attrs: dict[str, str]) -> None:
        nonlocal depth, in_spreadsheet, top_tables, table_depth, in_target, skip_until, styles_depth
        nonlocal row_depth, row_repeat, row_start, row_attrs, values, column, used, cells
        depth += 1
        if name == TABLE:
            if table_depth == 0 and in_spreadsheet:
                top_tables += 1
                table_depth = 1
                if top_tables == want:
                    in_target = True
                    if positions:
                        ready.append(Mark("table-start", p.CurrentByteIndex))
                else:  # a sheet not read: only its end matters
                    skip_until = depth
                    p.StartElementHandler = s_start
                    p.EndElementHandler = s_end
                return
            table_depth += 1
            return
        if in_target:
            if name == ROW and table_depth == 1:
                row_depth = depth
                rep = attrs.get(A_ROWS_REPEATED)
                row_repeat = repeat_count(rep) if rep else 1
                values = []
                column = 0
                used = 0
                if positions:
                    row_start = p.CurrentByteIndex
                    row_attrs = attrs
                    cells = []
                    ready.append(Mark("row-start", row_start))
                p.StartElementHandler = r_start
                p.EndElementHandler = r_end
                p.CharacterDataHandler = r_text
            return
        if table_depth:
            return
        if name == SPREADSHEET:
            in_spreadsheet = True
        elif positions:
            if name == AUTOMATIC_STYLES and depth == 2:
                styles_depth = depth
                ready.append(Mark("styles-start", p.CurrentByteIndex))
            elif styles_depth and depth == styles_depth + 1:
                style = attrs.get(A_STYLE_NAME)
                if style:
                    style_names.add(style)
            elif name == BODY and depth == 2:
                ready.append(Mark("body-start", p.CurrentByteIndex))

    def g_end(name: str) -> None:
        nonlocal depth, in_spreadsheet, table_depth, in_target, styles_depth, done
        if name == TABLE:
            table_depth -= 1
            if table_depth == 0 and in_spreadsheet:
                if positions:
                    ready.append(Mark("sheet-end", p.CurrentByteIndex, index=top_tables))
                if in_target:
                    in_target = False
                    done = True
                    if positions:
                        ready.append(Mark("table-end", p.CurrentByteIndex))
        elif name == SPREADSHEET and table_depth == 0:
            in_spreadsheet = False
            if positions:
                ready.append(Mark("spreadsheet-end", p.CurrentByteIndex))
        elif styles_depth and depth == styles_depth:
            styles_depth = 0
            ready.append(Mark("styles-end", p.CurrentByteIndex, frozenset(style_names)))
        depth -= 1

    # -- in a sheet not read ----------------------------------------------------------------------------

    def s_start(_name: str, _attrs: dict[str, str]) -> None:
        nonlocal depth
        depth += 1

    def s_end(name: str) -> None:
        nonlocal depth
        if depth == skip_until:
            p.StartElementHandler = g_start
            p.EndElementHandler = g_end
            g_end(name)
        else:
            depth -= 1

    # -- in a row of the sheet read (its cells too: no handlers are swapped per cell) --------------------

    def add(text: str) -> None:
        nonlocal chars
        room = MAX_CELL_CHARS - chars
        if room > 0:
            if len(text) > room:
                text = text[:room]
            parts.append(text)
            chars += len(text)

    def r_start(name: str, attrs: dict[str, str]) -> None:
        nonlocal depth, in_cell, cell_depth, cell_attrs, cell_covered, cell_repeat, cell_start, cell_children
        nonlocal cell_other, skip_depth, para_depth, paragraphs, has_text, cell_wanted, collect, chars
        nonlocal last_white
        depth += 1
        if in_cell:
            cell_children = True
            if skip_depth:
                return
            if name in _LEFT_OUT or name.startswith(_LEFT_OUT_NS):
                skip_depth = depth
                cell_other = True
                return
            if para_depth:
                if not collect:
                    return
                if name == S:
                    add(" " * min(repeat_count(attrs.get(_C)), MAX_CELL_CHARS))
                    last_white = False
                elif name == TAB:
                    add("\t")
                    last_white = False
                elif name == LINE_BREAK:
                    add("\n")
                    last_white = False
                return
            if name == P or name == H:
                para_depth = depth
                has_text = True
                if collect:
                    if paragraphs:
                        add("\n")
                    paragraphs += 1
                    last_white = True
            elif depth == cell_depth + 1:
                cell_other = True
            return
        if depth != row_depth + 1 or (name != CELL and name != COVERED):
            return
        in_cell = True
        cell_depth = depth
        cell_attrs = attrs
        cell_covered = name == COVERED
        rep = attrs.get(A_COLUMNS_REPEATED)
        cell_repeat = repeat_count(rep) if rep else 1
        if positions:
            cell_start = p.CurrentByteIndex
        cell_children = False
        cell_other = False
        skip_depth = 0
        para_depth = 0
        paragraphs = 0
        has_text = False
        cell_wanted = column < MAX_COLUMNS and not cell_covered
        if cell_wanted and stream is not None:
            keep = stream.keep
            if keep is not None:
                if cell_repeat == 1:
                    cell_wanted = column in keep
                else:
                    cell_wanted = any(
                        c in keep for c in range(column, min(column + cell_repeat, MAX_COLUMNS))
                    )
        collect = cell_wanted
        if collect:
            parts.clear()
            chars = 0

    def r_end(name: str) -> None:
        nonlocal depth, row_no, done, in_cell, column, used, skip_depth, para_depth
        if in_cell:
            if depth != cell_depth:
                if skip_depth:
                    if depth == skip_depth:
                        skip_depth = 0
                elif depth == para_depth:
                    para_depth = 0
                    if collect and last_white and parts and parts[-1].endswith(" "):
                        parts[-1] = parts[-1][:-1]
                depth -= 1
                return
            depth -= 1
            in_cell = False
            col = column
            column = col + cell_repeat
            value = None
            attrs = cell_attrs
            if collect:
                value = cell_value(attrs, "".join(parts) if has_text else None)
                if value is not None:
                    if len(values) < col:
                        values.extend([None] * (col - len(values)))
                    if cell_repeat == 1:
                        values.append(value)
                    else:
                        stop = min(column, MAX_COLUMNS)
                        keep = stream.keep if stream is not None else None
                        if keep is None:
                            values.extend([value] * (stop - col))
                        else:
                            values.extend(value if c in keep else None for c in range(col, stop))
            if cell_children or cell_covered or A_VALUE_TYPE in attrs or A_FORMULA in attrs:
                span = attrs.get(A_COLUMNS_SPANNED)
                last = column if not span else max(column, col + repeat_count(span))
                if last > used:
                    used = last
                if column > MAX_COLUMNS and stream is not None and not cell_covered:
                    stream.truncated = True
            if cells is not None:
                cells.append(
                    CellRun(
                        col,
                        cell_repeat,
                        cell_covered,
                        cell_start,
                        p.CurrentByteIndex,
                        attrs,
                        cell_children,
                        cell_other,
                        value,
                    )
                )
            return
        if depth == row_depth:
            first = row_no + 1
            row_no += row_repeat
            if row_no > MAX_ROWS and not positions:
                done = True
            if values or all_rows:
                record = RowRecord(first, row_repeat, values, used=used, width=column)
                if positions:
                    record.start = row_start
                    record.end = p.CurrentByteIndex
                    record.cells = cells
                    record.attrs = row_attrs
                ready.append(record)
            p.StartElementHandler = g_start
            p.EndElementHandler = g_end
            p.CharacterDataHandler = None
        depth -= 1

    def r_text(data: str) -> None:
        nonlocal last_white, chars
        if not para_depth or not collect or skip_depth or chars >= MAX_CELL_CHARS:
            return
        if not data.isprintable() or "  " in data:
            data = _WHITE.sub(" ", data)
        if last_white and data[:1] == " ":
            data = data[1:]
        if data:
            room = MAX_CELL_CHARS - chars
            if len(data) > room:
                data = data[:room]
            parts.append(data)
            chars += len(data)
            last_white = data[-1] == " "

    p.StartElementHandler = g_start
    p.EndElementHandler = g_end
    if positions:

        def declared(prefix: str | None, uri: str | None) -> None:
            if depth == 0:
                options.root_ns[prefix or ""] = uri or ""
            else:
                options.nested_ns = True

        p.StartNamespaceDeclHandler = declared
    try:
        fed = 0
        for chunk in xml_chunks(zf, part, shown):
            if positions:
                yield chunk
            elif done:
                return
            p.Parse(chunk, False)
            fed += len(chunk)
            if fed - max(p.CurrentByteIndex, 0) > MAX_TOKEN_BYTES:
                raise UnusableFile(
                    f"{shown}: its part '{part}' holds a single XML tag, comment or instruction of more than"
                    f" {MAX_TOKEN_BYTES:,} bytes, which no spreadsheet program writes: {_RESAVE}"
                )
            if ready:
                yield from ready
                ready.clear()
        p.Parse(b"", True)
        yield from ready
        ready.clear()
    except UnusableFile:
        raise
    except GeneratorExit:
        raise
    except Exception as exc:
        raise xml_failure(shown, part, exc) from None


class RowStream:
    """The rows of one sheet, streamed: ``(row number, values)``, empty rows
    left out.

    ``keep`` may be set at any time to the 0-based columns still needed;
    cells of other columns are then skipped without their text being
    collected. ``truncated`` says a row had cells with content beyond
    MAX_COLUMNS (not read).
    """

    def __init__(self, book: OdsBook, table: OdsTable) -> None:
        self._book = book
        self._table = table
        self.keep: frozenset[int] | None = None
        self.truncated = False
        self._it = self._rows()

    def __iter__(self) -> RowStream:
        return self

    def __next__(self) -> tuple[int, list[object]]:
        return next(self._it)

    def close(self) -> None:
        self._it.close()

    def _rows(self) -> Iterator[tuple[int, list[object]]]:
        book = self._book
        options = ScanOptions(self._table.index, stream=self)
        for record in scan_content(book.zf, book.facts.content, book.shown, options):
            if not isinstance(record, RowRecord):
                continue
            if record.number > MAX_ROWS:
                return
            values = record.values
            keep = self.keep
            if keep is not None and record.used and all(v is None for v in values):
                # nothing in the columns kept, something in another: not a blank row (as for .xlsx)
                free = next(i for i in range(MAX_COLUMNS + 1) if i not in keep)
                values = [None] * free + [OTHER_CELLS]
            last = min(record.number + record.repeat - 1, MAX_ROWS)
            if record.repeat == 1:
                yield record.number, values
                continue
            kept_for = self.keep
            for number in range(record.number, last + 1):
                if self.keep is not kept_for:  # the consumer narrowed the columns: the copies follow
                    kept_for = self.keep
                    if kept_for is not None:
                        width = min(len(values), max(kept_for, default=-1) + 1)
                        values = [values[i] if i in kept_for else None for i in range(width)]
                yield number, list(values)
            if last >= MAX_ROWS:
                return


class OdsBook:
    """An open OpenDocument spreadsheet; use as a context manager."""

    def __init__(self, path: str | Path, facts: OdsFacts | None = None) -> None:
        self.path = Path(path)
        self.shown = f"'{self.path.name}'"
        try:
            self.zf = zipfile.ZipFile(self.path)
        except (OSError, zipfile.BadZipFile, ValueError) as exc:
            raise UnusableFile(
                f"{self.shown} cannot be read as a zip package ({one_line(exc)}); {_RESAVE}"
            ) from None
        try:
            self.facts = facts if facts is not None else check_ods(self.zf, self.shown)
        except BaseException:
            self.zf.close()
            raise
        self.sheets = self.facts.sheets

    @property
    def sheet_names(self) -> list[str]:
        return [s.name for s in self.sheets]

    def table(self, name: str) -> OdsTable:
        for t in self.facts.tables:
            if t.name == name:
                return t
        raise KeyError(name)

    def rows(self, name: str) -> RowStream:
        return RowStream(self, self.table(name))

    def first_rows(self, name: str, count: int) -> list[list[object]]:
        """The values of the sheet's first ``count`` rows, row 1 first,
        missing rows empty."""
        out: list[list[object]] = []
        stream = self.rows(name)
        try:
            for number, values in stream:
                if number > count:
                    break
                while len(out) < number - 1:
                    out.append([])
                out.append(values)
        finally:
            stream.close()
        return out

    def close(self) -> None:
        self.zf.close()

    def __enter__(self) -> OdsBook:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()


def open_ods(path: str | Path, facts: OdsFacts | None = None) -> OdsBook:
    """Open an OpenDocument spreadsheet for reading. ``facts`` are what
    ``check_ods`` returned for it (checked again when not given).

    >>> open_ods("no-such-stock.ods")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.UnusableFile: 'no-such-stock.ods' cannot be read as a zip package ...
    """
    return OdsBook(path, facts)
