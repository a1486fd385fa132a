"""Writing a copy of an OpenDocument spreadsheet with cells added: the
rewrite of content.xml, the package around it, and the check of the result.

``content.xml`` is streamed with expat (``ods.scan_content``, which reports
where each row and cell of the sheet being filled lies in the part) and
written back byte for byte: only the rows that get a cell are rebuilt, and
in them only the cells a new value lands in (a repeated block of cells is
split around it; a repeated row keeps its repetition, since each copy gets
the same values, unless the header row lies inside it). Everything else,
down to the attribute quotes and the prefixes, is copied from the input.
Two additions may be made: number styles (``office:automatic-styles``) for
values shown with a fixed number of decimals, and a new sheet of plain
cells after the last sheet.

The package is written part by part in the input's order: ``mimetype``
first and stored, every other part with its own compression, every part
but content.xml copied unchanged (META-INF/manifest.xml included: no part
is added). A digitally signed document is refused, since any change breaks
the signature.

:func:`verify_package` reads the written package back before it is moved
into place: the same parts in the same order, each part other than
content.xml identical, and content.xml the same document but for the cells
added (every original element, attribute and text compared, every cell of
every sheet by type, value, text and formula).
"""

from __future__ import annotations

import math
import re
import zipfile
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from typing import IO
from xml.sax.saxutils import escape

from . import UnusableFile
from .ods import (
    A_COLUMNS_REPEATED,
    A_FORMULA,
    A_NAME,
    A_ROWS_REPEATED,
    A_STYLE_NAME,
    A_TABLE_STYLE,
    A_VALUE_TYPE,
    AUTOMATIC_STYLES,
    CELL,
    NS_CALCEXT,
    NS_NUMBER,
    NS_OFFICE,
    NS_STYLE,
    NS_TABLE,
    NS_TEXT,
    ROW,
    SPREADSHEET,
    TABLE,
    CellRun,
    Columns,
    Mark,
    OdsFacts,
    RowRecord,
    ScanOptions,
    qn,
    repeat_count,
    scan_content,
    xml_failure,
)

MAX_ROW_BYTES = 16 << 20  # one row of the sheet being filled, held while it is rebuilt
MAX_HELD_BYTES = 64 << 20  # bytes held back before a place the writer changes
_VALUE_ATTRS = frozenset(
    qn(NS_OFFICE, n)
    for n in ("value-type", "value", "date-value", "time-value", "boolean-value", "string-value", "currency")
) | {qn(NS_CALCEXT, "value-type")}
_TAG = re.compile(rb"<(?:[^\"'>]+|\"[^\"]*\"|'[^']*')*>")
_QNAME = re.compile(rb"<([^\s/>]+)")
_ENCODING = re.compile(rb"<\?xml[^>]*?encoding\s*=\s*[\"']([^\"']+)")
_ATTR = re.compile(rb"""\s+([^\s=/>]+)\s*=\s*("[^"]*"|'[^']*')""")
_XML_BAD = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ufffe\uffff\ud800-\udfff]")
_ATTR_ESCAPES = {'"': "&quot;", "\t": "&#9;", "\n": "&#10;", "\r": "&#13;"}
_PRIVATE = {
    NS_TABLE: "cctable",
    NS_OFFICE: "ccoffice",
    NS_TEXT: "cctext",
    NS_STYLE: "ccstyle",
    NS_NUMBER: "ccnumber",
}


# ---------------------------------------------------------------------------
# Bytes of tags
# ---------------------------------------------------------------------------


def tag_end(data: bytes | bytearray, i: int) -> int:
    """The offset just after the ``>`` that closes the tag starting at
    ``data[i]`` (quoted attribute values may hold ``>``)."""
    m = _TAG.match(data, i)
    if m is None:
        raise UnusableFile("a tag of content.xml has no end")
    return m.end()


_END_TAG = re.compile(rb"</([^\s>]+)\s*>")


def element_end(data: bytes | bytearray, at: int, local: bytes) -> int:
    """The offset just after an element named ``local`` (its local name) at
    whose end expat reported offset ``at``: the end tag's ``<``, or just
    after an empty-element tag. (The element's parent never has the same
    local name where the writer asks.)"""
    m = _END_TAG.match(data, at)
    if m is not None and m.group(1).rpartition(b":")[2] == local:
        return m.end()
    return at


def _attr_text(value: str) -> str:
    return escape(_XML_BAD.sub("\ufffd", value), _ATTR_ESCAPES)


class Namer:
    """Qualified names for what the writer adds: the document's own prefixes
    when its root declares them and nothing below the root declares any,
    else private prefixes declared on the element written."""

    def __init__(self, root_ns: dict[str, str], nested: bool) -> None:
        self.by_uri: dict[str, str] = {}
        if not nested:
            for prefix, uri in root_ns.items():
                if prefix and uri not in self.by_uri:
                    self.by_uri[uri] = prefix
        self.declared: dict[str, str] = {}  # uri -> private prefix, for the element being written

    def __call__(self, uri: str, local: str) -> str:
        prefix = self.by_uri.get(uri)
        if prefix is None:
            prefix = _PRIVATE[uri]
            self.declared[uri] = prefix
        return f"{prefix}:{local}"

    def declarations(self) -> str:
        out = "".join(f' xmlns:{p}="{_attr_text(u)}"' for u, p in self.declared.items())
        self.declared = {}
        return out


class Tag:
    """A start tag taken apart: its name, its attributes as written (each
    matched to the name expat gave it) and whether it closes itself."""

    def __init__(self, data: bytes, attrs: dict[str, str]) -> None:
        m = _QNAME.match(data)
        if m is None:
            raise UnusableFile("a start tag of content.xml could not be read back")
        self.qname = m.group(1)
        self.empty = data.endswith(b"/>")
        stop = len(data) - (2 if self.empty else 1)
        raw = list(_ATTR.finditer(data, m.end(), stop))
        plain = [a for a in raw if a.group(1) != b"xmlns" and not a.group(1).startswith(b"xmlns:")]
        names = list(attrs)
        if len(plain) != len(names):
            raise UnusableFile("the attributes of a tag of content.xml could not be matched")
        self.items: list[tuple[str | None, bytes]] = []  # (expat name or None for xmlns, text as written)
        expat_name = dict(zip((a.start() for a in plain), names, strict=True))
        for a in raw:
            self.items.append((expat_name.get(a.start()), a.group(0)))

    def qname_of(self, local: bytes) -> bytes:
        """The name of a sibling element of the same namespace: ``table:table-cell``."""
        prefix, colon, _ = self.qname.rpartition(b":")
        return prefix + colon + local if colon else local

    def written(
        self, drop: frozenset[str] | set[str] = frozenset(), add: str = "", empty: bool | None = None
    ) -> bytes:
        """The tag again, without the attributes ``drop`` names, with ``add``
        (attribute text, each with its leading space) added."""
        kept = b"".join(text for name, text in self.items if name is None or name not in drop)
        close = b"/>" if (self.empty if empty is None else empty) else b">"
        return b"<" + self.qname + kept + add.encode("utf-8") + close

    def raw_name(self, name: str) -> bytes | None:
        for expat_name, text in self.items:
            if expat_name == name:
                return _ATTR.match(text).group(1)  # type: ignore[union-attr]
        return None


# ---------------------------------------------------------------------------
# New cells
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class NewCell:
    column: int  # 0-based
    value: object  # str, int or float (a number cell), bool
    style: str | None = None  # table:style-name to give it (None: the cell's own)
    decimals: int | None = None  # a number shown with this many decimals (a style the writer adds)
    overwrite: bool = False  # a cell holding a value (not a formula) may be replaced


def paragraphs(text: str, q: Namer) -> str:
    """A text as the paragraphs of a cell: a line break starts a paragraph;
    spaces that OpenDocument would collapse (more than one, or at the start
    or end of a paragraph) and tabs written as ``text:s`` and ``text:tab``.

    >>> paragraphs("a  b", Namer({"text": NS_TEXT}, False))
    '<text:p>a <text:s/>b</text:p>'
    """
    if text and text.isprintable() and "  " not in text and text[0] != " " and text[-1] != " ":
        p = q(NS_TEXT, "p")
        return f"<{p}>{escape(text)}</{p}>"
    text = _XML_BAD.sub("\ufffd", text.replace("\r\n", "\n").replace("\r", "\n"))
    p, s, tab = q(NS_TEXT, "p"), q(NS_TEXT, "s"), q(NS_TEXT, "tab")
    c = q(NS_TEXT, "c")
    out = []
    for line in text.split("\n"):
        body = []
        tokens = re.findall(r" +|\t|[^ \t]+", line)
        for i, token in enumerate(tokens):
            if token == "\t":
                body.append(f"<{tab}/>")
            elif token[0] == " ":
                n = len(token)
                raw = 1 if 0 < i < len(tokens) - 1 and tokens[i - 1] != "\t" else 0
                if raw:
                    body.append(" ")
                if n - raw == 1:
                    body.append(f"<{s}/>")
                elif n - raw > 1:
                    body.append(f'<{s} {c}="{n - raw}"/>')
            else:
                body.append(escape(token))
        out.append(f"<{p}>{''.join(body)}</{p}>")
    return "".join(out)


def _number_text(value: float, decimals: int | None) -> str:
    if decimals is not None:
        return f"{value:.{decimals}f}"
    return f"{value:.10g}"


def value_attrs(value: object, q: Namer, decimals: int | None = None) -> tuple[str, str]:
    """(attribute text, content) of a cell holding ``value``; a number is
    shown with ``decimals`` decimals when given."""
    if isinstance(value, bool):
        flag = "true" if value else "false"
        return (
            f' {q(NS_OFFICE, "value-type")}="boolean" {q(NS_OFFICE, "boolean-value")}="{flag}"',
            paragraphs("TRUE" if value else "FALSE", q),
        )
    if isinstance(value, int | float) and math.isfinite(value):
        number = float(value)
        return (
            f' {q(NS_OFFICE, "value-type")}="float" {q(NS_OFFICE, "value")}="{number!r}"',
            paragraphs(_number_text(number, decimals), q),
        )
    return f' {q(NS_OFFICE, "value-type")}="string"', paragraphs(str(value), q)


def plain_cell(value: object, q: Namer, cell: str, style: str | None = None) -> str:
    """A whole cell element holding ``value`` (None: an empty cell)."""
    head = f' {q(NS_TABLE, "style-name")}="{_attr_text(style)}"' if style else ""
    if value is None or value == "":
        return f"<{cell}{head}/>"
    attrs, content = value_attrs(value, q)
    return f"<{cell}{head}{attrs}>{content}</{cell}>"


# ---------------------------------------------------------------------------
# Rewriting content.xml
# ---------------------------------------------------------------------------

RowHook = Callable[[RowRecord, int, int], list[NewCell]]  # (row, its first number, copies) -> new cells


@dataclass
class RewriteResult:
    rows: int = 0  # row elements rebuilt
    cells_written: int = 0
    kept_existing: int = 0  # cells holding a value (or a formula) left as they were
    overwritten: int = 0  # cells whose value was replaced
    added_styles: dict[int, str] = field(default_factory=dict)  # decimals -> the cell style added
    added_style_names: set[str] = field(default_factory=set)  # every style added (cell and number styles)
    added_styles_part: bool = False  # an office:automatic-styles element was added
    added_table: str = ""  # the title of the sheet added


def unique_name(wanted: str, taken: set[str]) -> str:
    """``wanted``, or ``wanted 2``, ``wanted 3`` ... not in ``taken`` (compared without case).

    >>> unique_name("cellchem findings", {"Stock", "Cellchem Findings"})
    'cellchem findings 2'
    """
    folded = {t.casefold() for t in taken}
    name = wanted
    k = 2
    while name.casefold() in folded:
        name = f"{wanted} {k}"
        k += 1
    return name


def writable(run: CellRun, new: NewCell) -> bool:
    """Whether a new value may go into the cell ``run``: an empty cell, or
    with ``overwrite`` a cell holding a value and paragraphs only; never a
    formula or a covered cell of a merged range."""
    if run.covered:
        return False
    if not (run.children or A_VALUE_TYPE in run.attrs or A_FORMULA in run.attrs):
        return True
    return new.overwrite and not run.formula and not run.other_children


def has_value(run: CellRun) -> bool:
    return not run.covered and (run.children or A_VALUE_TYPE in run.attrs or A_FORMULA in run.attrs)


class _Rewriter:
    """The state of one rewrite of content.xml (see ``rewrite_content``)."""

    def __init__(self, out: IO[bytes], options: ScanOptions, result: RewriteResult, shown: str) -> None:
        self.out = out
        self.options = options
        self.result = result
        self.shown = shown
        self.buf = bytearray()
        self.base = 0  # offset of buf[0] in the part
        self.copied = 0  # the part is written out up to here
        self.held = -1  # the start of a row being read: nothing from there on is written yet
        self._namer: Namer | None = None
        self._nested = False
        self._tags: dict[bytes, Tag] = {}

    def tag(self, data: bytes, attrs: dict[str, str]) -> Tag:
        """The start tag ``data`` taken apart (the same bytes in the same
        namespaces give the same tag: a row's trailing block of empty cells
        is the same in every row)."""
        if self.options.nested_ns:
            return Tag(data, attrs)
        found = self._tags.get(data)
        if found is None:
            if len(self._tags) > 1024:
                self._tags.clear()
            found = self._tags[data] = Tag(data, attrs)
        return found

    def namer(self) -> Namer:
        """The namer for what is written next (made again once a namespace
        is declared below the root)."""
        if self._namer is None or self._nested != self.options.nested_ns:
            self._nested = self.options.nested_ns
            self._namer = Namer(self.options.root_ns, self._nested)
        self._namer.declared = {}
        return self._namer

    def write_to(self, pos: int) -> None:
        if pos > self.copied:
            self.out.write(self.buf[self.copied - self.base : pos - self.base])
            self.copied = pos

    def skip_to(self, pos: int) -> None:
        self.copied = max(self.copied, pos)

    def take(self, chunk: bytes) -> None:
        """A new chunk of the part: first write out what no later change
        can reach (up to the last '<', where the next tag may start)."""
        buf = self.buf
        if self.held < 0:
            cut = buf.rfind(b"<")
            self.write_to(self.base + (cut if cut >= 0 else len(buf)))
        elif len(buf) - (self.held - self.base) > MAX_ROW_BYTES:
            raise UnusableFile(
                f"{self.shown}: a row of the sheet holds more than {MAX_ROW_BYTES:,} bytes of XML, more than"
                " cellchem rebuilds; nothing was written"
            )
        del buf[: self.copied - self.base]
        self.base = self.copied
        buf += chunk

    def bytes_between(self, start: int, end: int) -> bytes:
        return bytes(self.buf[start - self.base : end - self.base])

    def end_of(self, at: int, local: bytes) -> int:
        return element_end(self.buf, at - self.base, local) + self.base


def rewrite_content(
    zf: zipfile.ZipFile,
    facts: OdsFacts,
    table: int,
    out: IO[bytes],
    hook: RowHook,
    split_rows: frozenset[int] = frozenset(),
    decimals: frozenset[int] = frozenset(),
    extra_table: tuple[str, list[list[object]]] | None = None,
    shown: str = "",
    keep: frozenset[int] | None = None,
) -> RewriteResult:
    """Stream content.xml to ``out``, adding to the rows of sheet ``table``
    the cells ``hook(row, first number, copies)`` returns; each row number in
    ``split_rows`` becomes a row element of its own. ``decimals``: the
    numbers of decimals new number cells may ask for (a number style and a
    cell style are added for each). ``extra_table``: (title, rows of plain
    values) added as a sheet after the last one, its title made unique.
    ``keep``: the columns whose values the hook reads (None: all)."""
    with zf.open(facts.content) as fh:
        head = fh.read(256)
    declared = _ENCODING.match(head.removeprefix(b"\xef\xbb\xbf"))
    if head.startswith((b"\xff\xfe", b"\xfe\xff")) or (
        declared is not None and declared.group(1).lower() not in (b"utf-8", b"utf8")
    ):
        raise UnusableFile(
            f"{shown}: its '{facts.content}' is not written in UTF-8, which cellchem needs to change it in"
            " place; nothing was written: open it in LibreOffice Calc and save it again as .ods"
        )
    result = RewriteResult()
    options = ScanOptions(table, positions=True, stream=Columns(keep))
    w = _Rewriter(out, options, result, shown)
    styles_start = -1
    styles_seen: set[str] = set()
    last_sheet = len(facts.tables) - 1

    def styles_text(n: Namer) -> str:
        data_names: dict[int, str] = {}
        for places in sorted(decimals):
            data = unique_name(f"cellchem-N{places}", styles_seen)
            styles_seen.add(data)
            style = unique_name(f"cellchem-{places}dp", styles_seen)
            styles_seen.add(style)
            result.added_styles[places] = style
            data_names[places] = data
            result.added_style_names |= {data, style}
        return _styles_xml(result.added_styles, data_names, n)

    try:
        for item in scan_content(zf, facts.content, shown, options):
            if isinstance(item, bytes):
                w.take(item)
            elif isinstance(item, RowRecord):
                _rewrite_row(w, item, hook, split_rows)
                w.held = -1
            elif item.kind == "row-start":  # type: ignore[union-attr]
                w.write_to(item.at)  # type: ignore[union-attr]
                w.held = item.at  # type: ignore[union-attr]
            elif item.kind == "styles-start":  # type: ignore[union-attr]
                styles_start = item.at  # type: ignore[union-attr]
            elif item.kind == "styles-end" and decimals:  # type: ignore[union-attr]
                mark: Mark = item  # type: ignore[assignment]
                styles_seen |= mark.names
                n = w.namer()
                if w.end_of(mark.at, b"automatic-styles") == mark.at and styles_start >= 0:
                    # <office:automatic-styles/>: opened, given the styles, closed
                    w.write_to(styles_start)
                    tag = w.bytes_between(styles_start, mark.at)
                    qname = _QNAME.match(tag).group(1)  # type: ignore[union-attr]
                    inner = styles_text(n).encode()
                    w.out.write(tag[:-2] + n.declarations().encode() + b">" + inner + b"</" + qname + b">")
                    w.skip_to(mark.at)
                else:
                    w.write_to(mark.at)
                    w.out.write(_declared_each(styles_text(n), n.declarations()).encode())
            elif item.kind == "body-start" and decimals and not result.added_styles:  # type: ignore[union-attr]
                n = w.namer()
                w.write_to(item.at)  # type: ignore[union-attr]
                inner = styles_text(n)
                element = n(NS_OFFICE, "automatic-styles")
                w.out.write(f"<{element}{n.declarations()}>{inner}</{element}>".encode())
                result.added_styles_part = True
            elif item.kind == "sheet-end" and extra_table is not None and item.index == last_sheet:  # type: ignore[union-attr]
                n = w.namer()
                w.write_to(w.end_of(item.at, b"table"))  # type: ignore[union-attr]
                title = unique_name(extra_table[0], {t.name for t in facts.tables})
                w.out.write(_declared_each(_table_xml(title, extra_table[1], n), n.declarations()).encode())
                result.added_table = title
        w.write_to(w.base + len(w.buf))
    except UnusableFile:
        raise
    except Exception as exc:  # a tag that cannot be read back: the file, not a row
        raise xml_failure(shown, facts.content, exc) from None
    return result


def _declared_each(text: str, declarations: str) -> str:
    """``text`` (a run of sibling elements) with ``declarations`` made on
    each element at its top level."""
    if not declarations:
        return text
    out = []
    depth = 0
    for m in re.finditer(r"<(/?)([^\s/>]+)([^>]*?)(/?)>|[^<]+", text):
        token = m.group(0)
        if m.group(2) is None:
            out.append(token)
            continue
        closing, self_closing = m.group(1), m.group(4)
        if closing:
            depth -= 1
            out.append(token)
            continue
        if depth == 0:
            token = f"<{m.group(2)}{declarations}{m.group(3)}{self_closing}>"
        out.append(token)
        if not self_closing:
            depth += 1
    return "".join(out)


def _styles_xml(decimals: dict[int, str], data_names: dict[int, str], q: Namer) -> str:
    out = []
    for places, style in sorted(decimals.items()):
        data = data_names[places]
        number_style, number = q(NS_NUMBER, "number-style"), q(NS_NUMBER, "number")
        out.append(
            f'<{number_style} {q(NS_STYLE, "name")}="{_attr_text(data)}">'
            f'<{number} {q(NS_NUMBER, "decimal-places")}="{places}"'
            f' {q(NS_NUMBER, "min-decimal-places")}="{places}" {q(NS_NUMBER, "min-integer-digits")}="1"/>'
            f"</{number_style}>"
            f'<{q(NS_STYLE, "style")} {q(NS_STYLE, "name")}="{_attr_text(style)}"'
            f' {q(NS_STYLE, "family")}="table-cell" {q(NS_STYLE, "data-style-name")}="{_attr_text(data)}"/>'
        )
    return "".join(out)


def _table_xml(title: str, rows: list[list[object]], q: Namer) -> str:
    width = max((len(r) for r in rows), default=1) or 1
    table, row, cell = q(NS_TABLE, "table"), q(NS_TABLE, "table-row"), q(NS_TABLE, "table-cell")
    out = [
        f'<{table} {q(NS_TABLE, "name")}="{_attr_text(title)}">'
        f'<{q(NS_TABLE, "table-column")} {q(NS_TABLE, "number-columns-repeated")}="{width}"/>'
    ]
    for values in rows or [[None]]:
        out.append(f"<{row}>")
        out.extend(plain_cell(v, q, cell) for v in (values or [None]))
        out.append(f"</{row}>")
    out.append(f"</{table}>")
    return "".join(out)


def _rewrite_row(w: _Rewriter, row: RowRecord, hook: RowHook, split_rows: frozenset[int]) -> None:
    """Write the row ``row`` (its bytes are in the writer's buffer): as it
    was when no cell is added to it, else rebuilt (split where
    ``split_rows`` asks: each piece a row element of its own)."""
    first, last = row.number, row.number + row.repeat - 1
    ranges: list[tuple[int, int]] = []
    start = first
    for n in sorted(n for n in split_rows if first <= n <= last):
        if n > start:
            ranges.append((start, n - start))
        ranges.append((n, 1))
        start = n + 1
    if start <= last:
        ranges.append((start, last - start + 1))
    plans = [(copies, hook(row, number, copies)) for number, copies in ranges]
    end = w.end_of(row.end, b"table-row")
    if all(not new for _copies, new in plans):
        return  # copied as it is, with the bytes around it
    data = w.bytes_between(row.start, end)
    w.write_to(row.start)
    for copies, new in plans:
        w.out.write(_row_copy(data, row, copies, new, w))
    w.skip_to(end)
    w.result.rows += 1


def _repeat_attr(tag: Tag, name: str, local: str, count: int, n: Namer) -> str:
    if count <= 1:
        return ""
    raw = tag.raw_name(name)
    return f' {raw.decode() if raw is not None else n(NS_TABLE, local)}="{count}"'


def _row_copy(data: bytes, row: RowRecord, copies: int, new: list[NewCell], w: _Rewriter) -> bytes:
    """One row element for ``copies`` copies of the row ``data``, with the
    cells ``new`` added."""
    n = w.namer()
    te = tag_end(data, 0)
    tag = w.tag(data[:te], row.attrs or {})
    repeat = _repeat_attr(tag, A_ROWS_REPEATED, "number-rows-repeated", copies, n)
    if not new:
        return tag.written({A_ROWS_REPEATED}, repeat + n.declarations()) + data[te:]
    head = tag.written({A_ROWS_REPEATED}, repeat + n.declarations(), empty=False)
    close = row.end - row.start if not tag.empty else len(data)
    pieces = [head]
    cursor = te
    pending = sorted(new, key=lambda c: c.column)
    i = 0
    for run in row.cells or []:
        hi = run.column + run.repeat
        mine = []
        while i < len(pending) and pending[i].column < hi:
            if pending[i].column >= run.column:
                mine.append(pending[i])
            i += 1
        if not mine:
            continue
        local = b"covered-table-cell" if run.covered else b"table-cell"
        rs = run.start - row.start
        re_ = element_end(data, run.end - row.start, local)
        if not writable(run, mine[0]):
            if has_value(run):
                w.result.kept_existing += len(mine) * copies
            continue
        pieces.append(data[cursor:rs])
        pieces.append(_split_cell(data[rs:re_], run, mine, copies, w))
        cursor = re_
    pieces.append(data[cursor:close])
    column = row.width
    cell = tag.qname_of(b"table-cell").decode()
    for extra in pending[i:]:
        if extra.column > column:
            k = extra.column - column
            rep = f' {n(NS_TABLE, "number-columns-repeated")}="{k}"' if k > 1 else ""
            pieces.append(f"<{cell}{rep}{n.declarations()}/>".encode())
        pieces.append(_new_cell(cell, extra, w, n).encode())
        w.result.cells_written += copies
        column = extra.column + 1
    pieces.append(data[close:] if not tag.empty else b"</" + tag.qname + b">")
    return b"".join(pieces)


def _new_cell(qname: str, new: NewCell, w: _Rewriter, n: Namer, tag: Tag | None = None) -> str:
    """A cell element holding ``new``'s value; ``tag``: the cell it replaces
    (its attributes kept but for repetition, value and, when ``new`` names
    one, style)."""
    style = w.result.added_styles.get(new.decimals) if new.decimals is not None else None
    style = style or new.style
    attrs, content = value_attrs(new.value, n, new.decimals)
    if style:
        raw = tag.raw_name(A_TABLE_STYLE) if tag is not None else None
        attrs = (
            f' {raw.decode() if raw is not None else n(NS_TABLE, "style-name")}="{_attr_text(style)}"' + attrs
        )
    if tag is None:
        return f"<{qname}{attrs}{n.declarations()}>{content}</{qname}>"
    drop = _VALUE_ATTRS | {A_COLUMNS_REPEATED} | ({A_TABLE_STYLE} if style else set())
    head = tag.written(drop, attrs + n.declarations(), empty=False).decode("utf-8")
    return f"{head}{content}</{tag.qname.decode('utf-8')}>"


def _split_cell(element: bytes, run: CellRun, mine: list[NewCell], copies: int, w: _Rewriter) -> bytes:
    """The cell ``element`` (``run``, perhaps repeated) with the new values
    ``mine`` put in their columns: the repeated block split around them."""
    n = w.namer()
    te = tag_end(element, 0)
    tag = w.tag(element[:te], run.attrs)
    inner = element[te:] if not tag.empty else b""
    out = []
    column = run.column

    def copy(count: int) -> bytes:
        rep = _repeat_attr(tag, A_COLUMNS_REPEATED, "number-columns-repeated", count, n)
        return tag.written({A_COLUMNS_REPEATED}, rep + n.declarations()) + inner

    for new in mine:
        if new.column > column:
            out.append(copy(new.column - column))
        out.append(_new_cell("", new, w, n, tag).encode())
        if has_value(run):
            w.result.overwritten += copies
        w.result.cells_written += copies
        column = new.column + 1
    if run.column + run.repeat > column:
        out.append(copy(run.column + run.repeat - column))
    return b"".join(out)


# ---------------------------------------------------------------------------
# The package
# ---------------------------------------------------------------------------


def write_package(zin: zipfile.ZipFile, out: IO[bytes], content: str, content_data: IO[bytes]) -> None:
    """Write a package to ``out``: ``mimetype`` first and stored, then every
    other part of ``zin`` in its order with its own compression, copied
    byte for byte but ``content``, whose bytes are read from
    ``content_data``."""
    infos = zin.infolist()
    first = [i for i in infos if i.filename == "mimetype"]
    with zipfile.ZipFile(out, "w", allowZip64=True) as zout:
        for info in first + [i for i in infos if i.filename != "mimetype"]:
            target = zipfile.ZipInfo(info.filename, date_time=info.date_time)
            target.compress_type = zipfile.ZIP_STORED if info.filename == "mimetype" else info.compress_type
            target.external_attr = info.external_attr
            target.create_system = info.create_system
            target.comment = info.comment
            if info.filename == "mimetype" or info.is_dir():
                zout.writestr(target, zin.read(info))
                continue
            if info.filename == content:
                content_data.seek(0, 2)
                target.file_size = content_data.tell()
                content_data.seek(0)
                source: IO[bytes] = content_data
            else:
                target.file_size = info.file_size
                source = zin.open(info)
            with zout.open(target, "w", force_zip64=target.file_size > (1 << 31)) as dst:
                while chunk := source.read(1 << 20):
                    dst.write(chunk)
            if source is not content_data:
                source.close()
        zout.comment = zin.comment


@dataclass(frozen=True)
class Allowed:
    """What a fill may have changed in content.xml."""

    table: int  # the sheet filled
    header_row: int  # 1-based
    new_columns: frozenset[int]  # columns added (their header cell and data cells)
    fill_columns: frozenset[int]  # every column written (new ones and those filled in place)
    overwrite: bool
    added_style_names: frozenset[str] = frozenset()
    added_styles_part: bool = False
    added_table: str = ""


def verify_package(
    zin: zipfile.ZipFile, written: IO[bytes], content: str, allowed: Allowed, shown: str
) -> None:
    """Raise UnusableFile unless the package ``written`` holds the parts of
    ``zin`` in the same order (``mimetype`` first and stored), each part but
    ``content`` identical and with the same compression, and ``content``
    the same document but for what ``allowed`` permits."""
    written.seek(0)
    with zipfile.ZipFile(written) as zout:
        expected = [i.filename for i in zin.infolist()]
        if "mimetype" in expected:
            expected = ["mimetype"] + [n for n in expected if n != "mimetype"]
        names = [i.filename for i in zout.infolist()]
        if names != expected:
            raise _differs(shown, f"its parts are {names[:8]}..., expected {expected[:8]}...")
        if "mimetype" in names and zout.getinfo("mimetype").compress_type != zipfile.ZIP_STORED:
            raise _differs(shown, "its 'mimetype' part is compressed")
        for info in zin.infolist():
            name = info.filename
            if name == content or info.is_dir():
                continue
            other = zout.getinfo(name)
            if name != "mimetype" and other.compress_type != info.compress_type:
                raise _differs(shown, f"the part '{name}' is compressed differently")
            with zin.open(info) as a, zout.open(other) as b:
                while True:
                    x, y = a.read(1 << 20), b.read(1 << 20)
                    if x != y:
                        raise _differs(shown, f"the part '{name}' changed")
                    if not x:
                        break
        _verify_content(zin, zout, content, allowed, shown)


def _differs(shown: str, what: str) -> UnusableFile:
    return UnusableFile(
        f"{shown}: the copy written did not check out against the input ({what}); nothing was written"
    )


class _Text:
    """Character data between two tags: kept while short, else hashed."""

    LIMIT = 1 << 20

    def __init__(self) -> None:
        self.parts: list[str] = []
        self.size = 0
        self.digest = None
        self.pending = False

    def add(self, data: str) -> None:
        self.pending = True
        if self.digest is not None:
            self.digest.update(data.encode("utf-8", "surrogatepass"))
            return
        self.parts.append(data)
        self.size += len(data)
        if self.size > self.LIMIT:
            import hashlib

            self.digest = hashlib.blake2b()
            for part in self.parts:
                self.digest.update(part.encode("utf-8", "surrogatepass"))
            self.parts = []

    def take(self) -> tuple:
        item = ("T#", self.digest.hexdigest()) if self.digest is not None else ("T", "".join(self.parts))
        self.parts = []
        self.size = 0
        self.digest = None
        self.pending = False
        return item


def _canonical(zf: zipfile.ZipFile, part: str, shown: str, target: int) -> Iterator[tuple]:
    """The document as items: ("S", name, attributes), ("E", name), ("T",
    text) or ("T#", digest of a long text), and for each row of sheet
    ``target`` one ("ROW", attributes, copies, cells), cells being (facts,
    copies) with facts = (name, attributes, the bytes inside the cell, whether
    it holds anything but paragraphs). Attributes are dicts (compared
    without regard to order), without the repeat counts of rows and cells.

    Inside the cells of the sheet only depth is followed and the cell's
    bytes are kept: a cell that was copied is the same bytes."""
    from .ods import H, P, safe_parser, xml_chunks

    items: list[tuple] = []
    p = safe_parser()
    text = _Text()
    buf = bytearray()
    base = 0
    depth = 0
    in_spreadsheet = False
    top = -1
    table_depth = 0
    in_target = False
    row: list | None = None  # [attributes, copies, cells]
    row_depth = 0
    row_start = 0
    cell_name = ""
    cell_attrs: dict[str, str] = {}
    cell_copies = 1
    cell_start = 0
    cell_depth = 0
    cell_other = False

    def start(name: str, attrs: dict[str, str]) -> None:
        nonlocal depth, in_spreadsheet, top, table_depth, in_target, row, row_depth, row_start
        if text.pending:
            items.append(text.take())
        depth += 1
        if name == TABLE:
            if table_depth == 0 and in_spreadsheet:
                top += 1
                in_target = top == target
            table_depth += 1
        elif name == ROW and in_target and table_depth == 1:
            copies = 1
            if A_ROWS_REPEATED in attrs:
                copies = repeat_count(attrs.pop(A_ROWS_REPEATED))
            row = [attrs, copies, []]
            row_depth = depth
            row_start = p.CurrentByteIndex
            p.StartElementHandler = r_start
            p.EndElementHandler = r_end
            p.CharacterDataHandler = None
            return
        elif name == SPREADSHEET and table_depth == 0:
            in_spreadsheet = True
        items.append(("S", name, attrs))

    def end(name: str) -> None:
        nonlocal depth, in_spreadsheet, table_depth, in_target
        if text.pending:
            items.append(text.take())
        depth -= 1
        if name == TABLE:
            table_depth -= 1
            if table_depth == 0:
                in_target = False
        elif name == SPREADSHEET and table_depth == 0:
            in_spreadsheet = False
        items.append(("E", name))

    def r_start(name: str, attrs: dict[str, str]) -> None:
        nonlocal depth, cell_name, cell_attrs, cell_copies, cell_start, cell_depth, cell_other
        depth += 1
        cell_name = name
        cell_copies = 1
        if A_COLUMNS_REPEATED in attrs:
            cell_copies = repeat_count(attrs.pop(A_COLUMNS_REPEATED))
        cell_attrs = attrs
        cell_start = p.CurrentByteIndex
        cell_depth = depth
        cell_other = False
        p.StartElementHandler = c_start
        p.EndElementHandler = c_end

    def r_end(_name: str) -> None:
        nonlocal depth, row
        depth -= 1
        items.append(("ROW", row[0], row[1], row[2]))  # type: ignore[index]
        row = None
        p.StartElementHandler = start
        p.EndElementHandler = end
        p.CharacterDataHandler = text.add

    def c_start(name: str, _attrs: dict[str, str]) -> None:
        nonlocal depth, cell_other
        depth += 1
        if depth == cell_depth + 1 and name != P and name != H:
            cell_other = True

    def c_end(_name: str) -> None:
        nonlocal depth
        if depth == cell_depth:
            at = p.CurrentByteIndex
            inside = tag_end(buf, cell_start - base) + base
            inner = bytes(buf[inside - base : at - base]) if at > inside else b""
            row[2].append(((cell_name, cell_attrs, inner, cell_other), cell_copies))  # type: ignore[index]
            p.StartElementHandler = r_start
            p.EndElementHandler = r_end
        depth -= 1

    p.StartElementHandler = start
    p.EndElementHandler = end
    p.CharacterDataHandler = text.add
    try:
        for chunk in xml_chunks(zf, part, shown):
            if row is not None:
                keep = row_start
            else:
                cut = buf.rfind(b"<")
                keep = base + (cut if cut >= 0 else len(buf))
            del buf[: keep - base]
            base = keep
            buf += chunk
            p.Parse(chunk, False)
            yield from items
            items.clear()
        p.Parse(b"", True)
        yield from items
    except UnusableFile:
        raise
    except Exception as exc:
        raise xml_failure(shown, part, exc) from None


_STYLE_ELEMENTS = frozenset({qn(NS_STYLE, "style"), qn(NS_NUMBER, "number-style")})


def _skip_subtree(it: Iterator[tuple]) -> None:
    depth = 1
    for item in it:
        if item[0] == "S":
            depth += 1
        elif item[0] == "E":
            depth -= 1
            if depth == 0:
                return


def _added(item: tuple, allowed: Allowed, in_styles: bool, spreadsheet_level: bool) -> bool:
    """Whether ``item`` of the copy starts an element the writer added."""
    if item[0] != "S":
        return False
    name, attrs = item[1], item[2]
    if in_styles and name in _STYLE_ELEMENTS and attrs.get(A_STYLE_NAME) in allowed.added_style_names:
        return True
    if allowed.added_styles_part and name == AUTOMATIC_STYLES:
        return True
    return (
        spreadsheet_level
        and name == TABLE
        and bool(allowed.added_table)
        and attrs.get(A_NAME) == allowed.added_table
    )


def _verify_content(
    src: zipfile.ZipFile, dst: zipfile.ZipFile, part: str, allowed: Allowed, shown: str
) -> None:
    a_it = _canonical(src, part, shown, allowed.table)
    b_it = _canonical(dst, part, shown, allowed.table)
    a = next(a_it, None)
    b = next(b_it, None)
    stack: list[str] = []  # the copy's open elements
    a_left = b_left = 0  # copies of the current row not yet compared
    number = 1
    while a is not None or b is not None:
        if b is not None and a != b and (a is None or a[0] != "ROW" or b[0] != "ROW"):
            in_styles = bool(stack) and stack[-1] == AUTOMATIC_STYLES
            if _added(b, allowed, in_styles, bool(stack) and stack[-1] == SPREADSHEET):
                _skip_subtree(b_it)
                b = next(b_it, None)
                continue
            raise _differs(shown, f"the document's structure differs near {_what(a)} / {_what(b)}")
        if a is None or b is None:
            raise _differs(shown, "content.xml ends early")
        if a[0] == "ROW":
            if not a_left:
                a_left = a[2]
            if not b_left:
                b_left = b[2]
            if a[1] != b[1]:
                raise _differs(shown, f"row {number} of the sheet filled lost its attributes")
            k = min(a_left, b_left)
            _verify_row(a[3], b[3], number, k, allowed, shown)
            number += k
            a_left -= k
            b_left -= k
            if not a_left:
                a = next(a_it, None)
            if not b_left:
                b = next(b_it, None)
            continue
        if a[0] == "S":
            stack.append(a[1])
        elif a[0] == "E" and stack:
            stack.pop()
        a = next(a_it, None)
        b = next(b_it, None)


def _what(item: tuple | None) -> str:
    if item is None:
        return "the end"
    if item[0] in ("S", "E"):
        return f"<{'/' if item[0] == 'E' else ''}{item[1].rpartition(' ')[2]}>"
    return "a row" if item[0] == "ROW" else "text"


def _empty_cell(facts: tuple) -> bool:
    name, attrs, inner, _other = facts
    return name == CELL and not inner and A_VALUE_TYPE not in attrs and A_FORMULA not in attrs


def _replaceable(facts: tuple, overwrite: bool) -> bool:
    name, attrs, _inner, other = facts
    if name != CELL:
        return False
    if _empty_cell(facts):
        return True
    return overwrite and A_FORMULA not in attrs and not other


def _kept_attrs(attrs: dict[str, str], style_too: bool) -> dict[str, str]:
    drop = _VALUE_ATTRS | ({A_TABLE_STYLE} if style_too else set())
    return {k: v for k, v in attrs.items() if k not in drop}


def _verify_row(a_cells: list, b_cells: list, number: int, copies: int, allowed: Allowed, shown: str) -> None:
    if number <= allowed.header_row < number + copies:
        columns = allowed.new_columns if copies == 1 else frozenset()
    elif number > allowed.header_row:
        columns = allowed.fill_columns
    else:
        columns = frozenset()
    i = j = 0
    a_left = a_cells[0][1] if a_cells else 0
    b_left = b_cells[0][1] if b_cells else 0
    column = 0
    while i < len(a_cells):
        if j >= len(b_cells):
            raise _differs(shown, f"row {number} of the sheet filled lost cells from column {column + 1}")
        a_facts, b_facts = a_cells[i][0], b_cells[j][0]
        k = min(a_left, b_left)
        if a_facts != b_facts:
            inside = all(c in columns for c in range(column, column + k)) if k <= len(columns) else False
            if not (
                inside
                and _replaceable(a_facts, allowed.overwrite)
                and b_facts[0] == CELL
                and _kept_attrs(a_facts[1], True) == _kept_attrs(b_facts[1], True)
            ):
                raise _differs(shown, f"cell {_ref(column, number)} of the sheet filled changed")
        column += k
        a_left -= k
        b_left -= k
        if not a_left:
            i += 1
            a_left = a_cells[i][1] if i < len(a_cells) else 0
        if not b_left:
            j += 1
            b_left = b_cells[j][1] if j < len(b_cells) else 0
    while j < len(b_cells):  # cells after the row's last: empty ones, or new ones in the columns written
        b_facts = b_cells[j][0]
        k = b_left
        if not _empty_cell(b_facts) or b_facts[1]:
            if not (
                b_facts[0] == CELL
                and k <= len(columns)
                and all(c in columns for c in range(column, column + k))
            ):
                raise _differs(
                    shown,
                    f"cell {_ref(column, number)} of the sheet filled was added outside the new columns",
                )
        column += k
        j += 1
        b_left = b_cells[j][1] if j < len(b_cells) else 0


def _ref(column: int, row: int) -> str:
    from ...columns import column_letter

    return f"{column_letter(column)}{row}"
