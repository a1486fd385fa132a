"""A workbook package rewritten part by part, changing only what must change.

A workbook (.xlsx, .xlsm) is a zip of XML and binary parts. A load-and-save
through a workbook library rebuilds every part from what the library models,
and drops the rest (threaded comments, pivot caches, sensitivity labels,
cached formula values...). This module instead copies every part byte for
byte and rewrites only:

- the one sheet that gets new cells, streamed with lxml (``iterparse`` in,
  ``xmlfile`` out; processed rows are freed, so memory does not grow with the
  sheet): every original element is written back, new cells are appended to
  their rows, the ``dimension`` grows to cover them and new columns get a
  width;
- ``xl/styles.xml`` when new cells need a number format their neighbours'
  style does not have (a copy of the neighbour's cell format with the number
  format changed);
- when a sheet is added: ``xl/workbook.xml``, its relationships and
  ``[Content_Types].xml``, plus the new sheet part.

New text is written as inline strings, so the shared-string table is not
touched. After writing, ``verify`` checks that every unchanged part is
byte-identical and that every original cell of the changed sheet reads back
the same (value, formula, cached value, style, type).
"""

from __future__ import annotations

import posixpath
import re
import zipfile
from collections.abc import Callable, Iterator
from dataclasses import dataclass, field
from functools import lru_cache
from typing import IO

from lxml import etree

from ...columns import column_index, column_letter
from . import UnusableFile

MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PKG_REL_NS = "http://schemas.openxmlformats.org/package/2006/relationships"
CT_NS = "http://schemas.openxmlformats.org/package/2006/content-types"
OFFICE_DOCUMENT = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/officeDocument"
WORKSHEET_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet"
SHARED_STRINGS_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/sharedStrings"
STYLES_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/styles"
TABLE_REL = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/table"
WORKSHEET_CT = "application/vnd.openxmlformats-officedocument.spreadsheetml.worksheet+xml"
_C = f"{{{MAIN_NS}}}c"
_V = f"{{{MAIN_NS}}}v"
_F = f"{{{MAIN_NS}}}f"
_IS = f"{{{MAIN_NS}}}is"
_T = f"{{{MAIN_NS}}}t"

_CELL_REF = re.compile(r"^([A-Z]{1,3})([0-9]+)$")
_DIGITS = "0123456789"


@lru_cache(maxsize=65536)
def _letters_index(letters: str) -> int:
    return column_index(letters)


def _column_of(ref: str | None) -> int | None:
    """The 0-based column of a cell reference such as 'AB12', or None."""
    if not ref:
        return None
    letters = ref.rstrip(_DIGITS)
    if (
        not letters
        or len(letters) > 3
        or len(letters) == len(ref)
        or not letters.isalpha()
        or not letters.isupper()
    ):
        return None
    return _letters_index(letters)


def _parser() -> etree.XMLParser:
    return etree.XMLParser(resolve_entities=False, no_network=True, huge_tree=False, remove_blank_text=False)


def _xml(zin: zipfile.ZipFile, part: str) -> etree._Element:
    return etree.fromstring(zin.read(part), _parser())


def _q(tag: str, ns: str = MAIN_NS) -> str:
    return f"{{{ns}}}{tag}"


def _rels_of(part: str) -> str:
    folder, name = posixpath.split(part)
    return posixpath.join(folder, "_rels", name + ".rels")


def _target(source: str, target: str) -> str:
    if target.startswith("/"):
        return target.lstrip("/")
    return posixpath.normpath(posixpath.join(posixpath.dirname(source), target))


def _relationships(zin: zipfile.ZipFile, part: str) -> list[tuple[str, str, str, str]]:
    """(Id, Type, resolved target, TargetMode) of a part's relationships."""
    rels = _rels_of(part)
    if rels not in zin.namelist():
        return []
    out = []
    for rel in _xml(zin, rels):
        mode = rel.get("TargetMode", "")
        target = rel.get("Target", "")
        out.append(
            (
                rel.get("Id", ""),
                rel.get("Type", ""),
                target if mode == "External" else _target(part, target),
                mode,
            )
        )
    return out


@dataclass(frozen=True)
class SheetPart:
    name: str
    rel_id: str
    part: str
    state: str


@dataclass(frozen=True)
class PackageMap:
    workbook: str
    sheets: tuple[SheetPart, ...]
    shared_strings: str | None
    styles: str | None
    recalculate: bool = False  # the workbook asks for its formulas to be recalculated on opening


def package_map(zin: zipfile.ZipFile) -> PackageMap:
    """Where the workbook part, its sheets, shared strings and styles are."""
    workbook = None
    for _id, kind, target, _mode in _relationships(zin, ""):
        if kind == OFFICE_DOCUMENT:
            workbook = target
    if workbook is None or workbook not in zin.namelist():
        raise UnusableFile("the package has no workbook part")
    rels = {rid: (kind, target) for rid, kind, target, _m in _relationships(zin, workbook)}
    root = _xml(zin, workbook)
    sheets = []
    for sheet in root.iter(_q("sheet")):
        rid = sheet.get(_q("id", REL_NS), "")
        kind, target = rels.get(rid, ("", ""))
        if kind != WORKSHEET_REL:
            continue  # a chartsheet or a dialog sheet
        sheets.append(SheetPart(sheet.get("name", ""), rid, target, sheet.get("state", "visible")))
    shared = next((t for k, t in rels.values() if k == SHARED_STRINGS_REL), None)
    styles = next((t for k, t in rels.values() if k == STYLES_REL), None)
    calc = root.find(_q("calcPr"))
    recalculate = calc is not None and calc.get("fullCalcOnLoad", "0").strip() in ("1", "true")
    return PackageMap(workbook, tuple(sheets), shared, styles, recalculate)


def shared_strings(zin: zipfile.ZipFile, part: str | None) -> list[str]:
    """The shared-string table as plain text (rich-text runs joined, phonetic runs left out)."""
    if not part or part not in zin.namelist():
        return []
    out: list[str] = []
    with zin.open(part) as fh:
        for _event, si in etree.iterparse(
            fh, events=("end",), tag=_q("si"), resolve_entities=False, no_network=True
        ):
            out.append("".join(t.text or "" for t in si.iter(_q("t")) if t.getparent().tag != _q("rPh")))
            si.clear()
    return out


# ---------------------------------------------------------------------------
# Scanning the sheet
# ---------------------------------------------------------------------------


@dataclass
class SheetScan:
    """What the writer must know about a sheet before it writes."""

    max_column: int = -1  # 0-based index of the last column holding a cell
    protected: bool = False
    merged: list[tuple[int, int, int, int]] = field(
        default_factory=list
    )  # min col, max col, min row, max row
    tables: list[tuple[str, int, int, int, int]] = field(default_factory=list)  # name, cols and rows
    col_ranges: list[tuple[int, int]] = field(default_factory=list)  # <col min max> as 0-based


def _range(ref: str) -> tuple[int, int, int, int] | None:
    cells = ref.replace("$", "").split(":")
    parsed = []
    for c in cells:
        m = _CELL_REF.match(c)
        if not m:
            return None
        parsed.append((column_index(m.group(1)), int(m.group(2))))
    if len(parsed) == 1:
        parsed.append(parsed[0])
    (c1, r1), (c2, r2) = parsed
    return min(c1, c2), max(c1, c2), min(r1, r2), max(r1, r2)


_SCAN_CELL = re.compile(rb"<(?:[A-Za-z0-9_]+:)?c\b([^>]*)>|<(?:[A-Za-z0-9_]+:)?c\s*/>")
_SCAN_REF = re.compile(rb'\sr="([A-Z]{1,3})[0-9]+"')
_SCAN_KEYED = re.compile(rb'<(?:[A-Za-z0-9_]+:)?c\b[^>]*?\sr="([A-Z]{1,3})[0-9]+"')
_SCAN_MERGE = re.compile(rb'<(?:[A-Za-z0-9_]+:)?mergeCell\b[^>]*\sref="([^"]+)"')
_SCAN_PROTECTION = re.compile(rb"<(?:[A-Za-z0-9_]+:)?sheetProtection\b([^>]*)>")
_SCAN_COL = re.compile(rb"<(?:[A-Za-z0-9_]+:)?col\b([^>]*)>")
_SCAN_ATTR = re.compile(rb'\s(min|max|sheet)="([^"]*)"')


def scan_sheet(zin: zipfile.ZipFile, part: str) -> SheetScan:
    """Last column used, protection, merged ranges, table ranges and column
    ranges of a sheet part, read by a pattern scan of the part's bytes (a
    cell without an ``r`` reference makes it fall back to a full parse)."""
    scan = SheetScan()
    exact = True
    with zin.open(part) as fh:
        tail = b""
        while True:
            chunk = fh.read(1 << 22)
            if not chunk:
                break
            data = tail + chunk
            cut = data.rfind(b">") + 1
            body, tail = data[:cut], data[cut:]
            keyed = _SCAN_KEYED.findall(body)  # the column letters of every cell with a reference
            if len(keyed) != len(_SCAN_CELL.findall(body)):
                exact = False
            for letters in set(keyed):
                column = _letters_index(letters.decode())
                if column > scan.max_column:
                    scan.max_column = column
            for m in _SCAN_MERGE.finditer(body):
                r = _range(m.group(1).decode("ascii", "replace"))
                if r:
                    scan.merged.append(r)
            for m in _SCAN_PROTECTION.finditer(body):
                attrs = dict(_SCAN_ATTR.findall(m.group(1)))
                scan.protected = attrs.get(b"sheet", b"0") in (b"1", b"true")
            for m in _SCAN_COL.finditer(body):
                attrs = dict(_SCAN_ATTR.findall(m.group(1)))
                try:
                    scan.col_ranges.append(
                        (int(attrs.get(b"min", b"1")) - 1, int(attrs.get(b"max", b"1")) - 1)
                    )
                except ValueError:
                    pass
    if not exact:
        scan = _scan_parsed(zin, part)
    for _rid, kind, target, _mode in _relationships(zin, part):
        if kind == TABLE_REL and target in zin.namelist():
            table = _xml(zin, target)
            r = _range(table.get("ref", ""))
            if r:
                scan.tables.append((table.get("displayName", table.get("name", "")), *r))
    return scan


def _scan_parsed(zin: zipfile.ZipFile, part: str) -> SheetScan:
    scan = SheetScan()
    with zin.open(part) as fh:
        column = -1
        for event, el in etree.iterparse(
            fh, events=("start", "end"), resolve_entities=False, no_network=True
        ):
            tag = etree.QName(el).localname
            if event == "start":
                if tag == "row":
                    column = -1
                continue
            if tag == "c":
                found = _column_of(el.get("r"))
                column = found if found is not None else column + 1
                scan.max_column = max(scan.max_column, column)
                el.clear()
            elif tag == "row":
                el.clear()
                while el.getprevious() is not None:
                    del el.getparent()[0]
            elif tag == "sheetProtection":
                scan.protected = el.get("sheet", "0") in ("1", "true")
            elif tag == "mergeCell":
                r = _range(el.get("ref", ""))
                if r:
                    scan.merged.append(r)
            elif tag == "col":
                try:
                    scan.col_ranges.append((int(el.get("min", "1")) - 1, int(el.get("max", "1")) - 1))
                except ValueError:
                    pass
    return scan


def first_rows(zin: zipfile.ZipFile, part: str, strings: list[str], count: int) -> list[list[object]]:
    """The values of a sheet's first ``count`` rows (row 1 first, missing rows empty)."""
    rows: list[list[object]] = []
    with zin.open(part) as fh:
        for _event, row in etree.iterparse(
            fh, events=("end",), tag=f"{{{MAIN_NS}}}row", resolve_entities=False, no_network=True
        ):
            try:
                number = int(row.get("r", "0") or 0) or len(rows) + 1
            except ValueError:
                number = len(rows) + 1
            if number > count:
                break
            while len(rows) < number - 1:
                rows.append([])
            values: list[object] = []
            column = -1
            for c in row.iter(_C):
                found = _column_of(c.get("r"))
                column = found if found is not None else column + 1
                if column >= 256:
                    break
                while len(values) < column:
                    values.append(None)
                values.append(cell_value(c, strings))
            rows.append(values)
            row.clear()
    return rows


# ---------------------------------------------------------------------------
# Styles
# ---------------------------------------------------------------------------


class Styles:
    """The cell formats of ``xl/styles.xml``, with copies made on demand."""

    def __init__(self, data: bytes | None) -> None:
        self.original = data
        self.root = etree.fromstring(data, _parser()) if data else None
        self.changed = False
        self._made: dict[tuple[int, int], int] = {}
        self._added: dict[str, int | None] = {}

    def _xfs(self):
        if self.root is None:
            return None
        return self.root.find(_q("cellXfs"))

    def with_number_format(self, base: int, numfmt: int) -> int:
        """The index of a cell format like ``base`` with built-in number format
        ``numfmt`` (2 is '0.00', 0 is General); made if missing."""
        xfs = self._xfs()
        if xfs is None or base >= len(xfs):
            return base
        key = (base, numfmt)
        if key in self._made:
            return self._made[key]
        xf = xfs[base]
        if xf.get("numFmtId", "0") == str(numfmt):
            self._made[key] = base
            return base
        copy = etree.fromstring(etree.tostring(xf))
        copy.set("numFmtId", str(numfmt))
        copy.set("applyNumberFormat", "1")
        xfs.append(copy)
        xfs.set("count", str(len(xfs)))
        self.changed = True
        index = len(xfs) - 1
        self._made[key] = index
        return index

    def _font(self, bold: bool = False, link: bool = False) -> int | None:
        """The index of a new font like the default one, bold or in the
        hyperlink's blue, underlined; None when the styles have no fonts."""
        fonts = self.root.find(_q("fonts")) if self.root is not None else None
        if fonts is None or len(fonts) == 0:
            return None
        font = etree.fromstring(etree.tostring(fonts[0]))
        for child in list(font):
            if etree.QName(child).localname in ("b", "u", "color"):
                font.remove(child)
        # children in the order of the schema: b, i, ..., u, vertAlign, sz, color, name, ...
        if bold:
            font.insert(0, etree.Element(_q("b")))
        if link:
            names = [etree.QName(c).localname for c in font]
            at = names.index("sz") if "sz" in names else len(names)
            font.insert(at, etree.Element(_q("u")))
            names = [etree.QName(c).localname for c in font]
            after = names.index("sz") + 1 if "sz" in names else at + 1
            font.insert(after, etree.Element(_q("color"), rgb="FF0563C1"))
        fonts.append(font)
        fonts.set("count", str(len(fonts)))
        return len(fonts) - 1

    def added_format(
        self, key: str, *, bold: bool = False, link: bool = False, wrap: bool = False, top: bool = False
    ) -> int | None:
        """The index of a new cell format (bold, a hyperlink's font, text at
        the top of the cell, wrapped or not), made once per ``key``; None when
        the workbook has no styles to add to."""
        if key in self._added:
            return self._added[key]
        xfs = self._xfs()
        if xfs is None or len(xfs) == 0:
            return None
        xf = etree.Element(_q("xf"), numFmtId="0", fontId=xfs[0].get("fontId", "0"), fillId="0", borderId="0")
        xf.set("xfId", "0")
        if bold or link:
            font = self._font(bold=bold, link=link)
            if font is None:
                return None
            xf.set("fontId", str(font))
            xf.set("applyFont", "1")
        if wrap or top:
            xf.set("applyAlignment", "1")
            alignment = etree.SubElement(xf, _q("alignment"), vertical="top")
            if wrap:
                alignment.set("wrapText", "1")
        xfs.append(xf)
        xfs.set("count", str(len(xfs)))
        self.changed = True
        self._added[key] = len(xfs) - 1
        return self._added[key]

    def data(self) -> bytes | None:
        if not self.changed or self.root is None:
            return self.original
        return etree.tostring(self.root, xml_declaration=True, encoding="UTF-8", standalone=True)


# ---------------------------------------------------------------------------
# Streaming the sheet
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class NewCell:
    column: int  # 0-based
    value: object  # str, int, float or None (leave empty)
    style: int | None  # cell format index, or None for the default
    overwrite: bool = False


def cell_value(c: etree._Element, strings: list[str]) -> object:
    """The value of a ``<c>`` element: text, number, bool or None."""
    t = c.get("t", "n")
    if t == "inlineStr":
        node = c.find(_q("is"))
        if node is None:
            return None
        return "".join(x.text or "" for x in node.iter(_q("t")) if x.getparent().tag != _q("rPh"))
    v = c.find(_q("v"))
    if v is None or v.text is None:
        return None
    if t == "s":
        try:
            return strings[int(v.text)]
        except (ValueError, IndexError):
            return None
    if t in ("str", "e"):
        return v.text
    if t == "b":
        return v.text.strip() == "1"
    try:
        number = float(v.text)
    except ValueError:
        return v.text
    return int(number) if number.is_integer() and "." not in v.text and "E" not in v.text.upper() else number


def _is_empty(c: etree._Element) -> bool:
    return c.find(_q("v")) is None and c.find(_q("is")) is None and c.find(_q("f")) is None


def _make_cell(row_number: int, new: NewCell) -> etree._Element:
    c = etree.Element(_q("c"))
    _set_cell(c, row_number, new)
    return c


def _set_cell(c: etree._Element, row_number: int, new: NewCell) -> None:
    c.set("r", f"{column_letter(new.column)}{row_number}")
    if new.style is not None:
        c.set("s", str(new.style))
    for child in list(c):
        c.remove(child)
    value = new.value
    if isinstance(value, bool):
        c.set("t", "b")
        etree.SubElement(c, _q("v")).text = "1" if value else "0"
    elif isinstance(value, int | float):
        c.attrib.pop("t", None)
        etree.SubElement(c, _q("v")).text = repr(float(value)) if isinstance(value, float) else str(value)
    else:
        c.set("t", "inlineStr")
        node = etree.SubElement(c, _q("is"))
        t = etree.SubElement(node, _q("t"))
        t.text = str(value)
        if t.text != t.text.strip():
            t.set("{http://www.w3.org/XML/1998/namespace}space", "preserve")


RowHook = Callable[[int, dict[int, etree._Element]], list[NewCell]]


@dataclass
class RewriteResult:
    rows: int = 0
    last_row: int = 0  # the number of the last row read
    cells_written: int = 0
    skipped_existing: int = 0
    overwritten: set[str] = field(default_factory=set)  # refs of cells whose value was replaced


_ROOT_START = re.compile(rb"<(?![?!])((?:[A-Za-z_][\w.-]*:)?)worksheet\b[^>]*>")


def rewrite_sheet(
    zin: zipfile.ZipFile,
    part: str,
    out: IO[bytes],
    hook: RowHook,
    new_columns: list[tuple[int, float]],
    last_column: int,
) -> RewriteResult:
    """Stream a sheet part to ``out``, calling ``hook(row_number, cells)`` for
    each row (cells: 0-based column -> ``<c>``) and adding the cells it
    returns. ``new_columns`` lists (column, width) for columns that get a
    ``<col>`` width; ``last_column`` is the new last column, for the dimension.

    The prolog and the root start tag are copied as they were; each element
    below the root is serialized by lxml with the namespace declarations the
    root already makes left out, so the part reads as the original did."""
    result = RewriteResult()
    with zin.open(part) as raw:
        head = raw.read(1 << 16)
    m = _ROOT_START.search(head)
    if m is None:
        raise UnusableFile(f"the sheet part '{part}' has no worksheet element in its first 64 KiB")
    prefix = m.group(1)
    out.write(head[: m.end()])
    declarations: list[bytes] = []
    nsmap: dict = {}

    def emit(el: etree._Element) -> None:
        data = etree.tostring(el, with_tail=False)
        for decl in declarations:
            data = data.replace(decl, b"")
        out.write(data)

    with zin.open(part) as src:
        depth = 0
        wrote_cols = False
        for event, el in etree.iterparse(
            src, events=("start", "end"), resolve_entities=False, no_network=True
        ):
            if event == "start":
                depth += 1
                if depth == 1:
                    nsmap = dict(el.nsmap)
                    for key, uri in nsmap.items():
                        name = b"xmlns" if key is None else b"xmlns:" + key.encode()
                        declarations.append(b" " + name + b'="' + uri.encode() + b'"')
                elif depth == 2 and el.tag == _q("sheetData"):
                    if not wrote_cols and new_columns:
                        emit(_cols(new_columns, nsmap))
                        wrote_cols = True
                    shell = etree.Element(el.tag, dict(el.attrib), nsmap=nsmap)
                    opening = etree.tostring(shell)
                    for decl in declarations:
                        opening = opening.replace(decl, b"")
                    out.write(opening[:-2] + b">" if opening.endswith(b"/>") else opening.split(b"</")[0])
                continue
            depth -= 1
            if depth == 0:
                out.write(b"</" + prefix + b"worksheet>")
                continue
            if depth == 1:
                tag = el.tag
                if tag == _q("sheetData"):
                    out.write(b"</" + prefix + b"sheetData>")
                else:
                    if tag == _q("dimension"):
                        _grow_dimension(el, last_column)
                    elif tag == _q("cols") and new_columns:
                        for col in _cols(new_columns, nsmap):
                            el.append(col)
                        wrote_cols = True
                    emit(el)
                el.clear()
                parent = el.getparent()
                if parent is not None:
                    while el.getprevious() is not None:
                        del parent[0]
                continue
            if depth == 2 and el.tag == _q("row"):
                _process_row(el, hook, result)
                emit(el)
                el.clear()
                parent = el.getparent()
                while el.getprevious() is not None:
                    del parent[0]
    return result


def _cols(columns: list[tuple[int, float]], nsmap: dict | None = None) -> etree._Element:
    cols = etree.Element(_q("cols"), nsmap=nsmap)
    for column, width in columns:
        etree.SubElement(
            cols, _q("col"), min=str(column + 1), max=str(column + 1), width=f"{width:g}", customWidth="1"
        )
    return cols


def _grow_dimension(el: etree._Element, last_column: int) -> None:
    r = _range(el.get("ref", ""))
    if r is None:
        return
    c1, c2, r1, r2 = r
    if last_column > c2:
        el.set("ref", f"{column_letter(c1)}{r1}:{column_letter(last_column)}{r2}")


def _process_row(row: etree._Element, hook: RowHook, result: RewriteResult) -> None:
    result.rows += 1
    try:
        number = int(row.get("r", "0"))
    except ValueError:
        number = 0
    if number <= result.last_row:  # a row written without its number (valid) follows the one before
        number = result.last_row + 1
    result.last_row = number
    cells: dict[int, etree._Element] = {}
    column = -1
    for c in row.iter(_C):
        found = _column_of(c.get("r"))
        column = found if found is not None else column + 1
        cells[column] = c
    if number == 0:
        return
    new = hook(number, cells)
    if not new:
        return
    changed = False
    for cell in new:
        if cell.value is None:
            continue
        existing = cells.get(cell.column)
        if existing is not None:
            if existing.find(_q("f")) is not None or (not _is_empty(existing) and not cell.overwrite):
                result.skipped_existing += 1
                continue
            style = existing.get("s")
            if not _is_empty(existing):
                result.overwritten.add(existing.get("r") or f"{column_letter(cell.column)}{number}")
            _set_cell(existing, number, NewCell(cell.column, cell.value, int(style) if style else cell.style))
        else:
            c = _make_cell(number, cell)
            cells[cell.column] = c
            # keep the cells in column order
            after = [k for k in cells if k < cell.column and cells[k] is not c]
            if after:
                cells[max(after)].addnext(c)
            else:
                row.insert(0, c)
        result.cells_written += 1
        changed = True
    if changed and row.get("spans"):
        del row.attrib["spans"]  # an optional hint that no longer holds


# ---------------------------------------------------------------------------
# Writing the package and checking it
# ---------------------------------------------------------------------------


def write_package(
    zin: zipfile.ZipFile,
    out_path: str | IO[bytes],
    replacements: dict[str, Callable[[IO[bytes]], None]],
    additions: dict[str, bytes] | None = None,
) -> None:
    """Write a package: every part of ``zin`` copied byte for byte, except the
    parts in ``replacements`` (each written by its callable), then the new
    ``additions``."""
    with zipfile.ZipFile(out_path, "w", zipfile.ZIP_DEFLATED, allowZip64=True) as zout:
        for info in zin.infolist():
            target = zipfile.ZipInfo(info.filename, date_time=info.date_time)
            target.compress_type = zipfile.ZIP_DEFLATED
            target.external_attr = info.external_attr
            if info.filename in replacements:
                with zout.open(target, "w", force_zip64=True) as dst:
                    replacements[info.filename](dst)
            else:
                with (
                    zin.open(info) as src,
                    zout.open(target, "w", force_zip64=info.file_size > (1 << 31)) as dst,
                ):
                    while chunk := src.read(1 << 20):
                        dst.write(chunk)
        for name, data in (additions or {}).items():
            zout.writestr(zipfile.ZipInfo(name, date_time=(2026, 1, 1, 0, 0, 0)), data, zipfile.ZIP_DEFLATED)


def _cell_facts(c: etree._Element) -> tuple:
    f = v = inline = None
    fattrs: tuple = ()
    for child in c:
        tag = child.tag
        if tag == _V:
            v = child.text
        elif tag == _F:
            f = child.text
            fattrs = tuple(sorted(child.attrib.items()))
        elif tag == _IS:
            inline = "".join(x.text or "" for x in child.iter(_T))
    get = c.get
    return (get("r"), get("s"), get("t"), f, fattrs, v, inline)


def _sheet_cells(zin: zipfile.ZipFile, part: str) -> Iterator[tuple[int, list[tuple]]]:
    with zin.open(part) as fh:
        for _event, row in etree.iterparse(
            fh, events=("end",), tag=_q("row"), resolve_entities=False, no_network=True
        ):
            yield int(row.get("r", "0") or 0), [_cell_facts(c) for c in row.iter(_C)]
            row.clear()
            while row.getprevious() is not None:
                del row.getparent()[0]


def verify(
    src: zipfile.ZipFile,
    dst: zipfile.ZipFile,
    changed: set[str],
    sheet: str | None,
    added: set[str],
    overwritten: frozenset[str] = frozenset(),
) -> None:
    """Raise UnusableFile (with what differs) unless every unchanged part of
    ``src`` is byte-identical in ``dst`` and every original cell of the
    changed sheet reads back the same."""
    src_names = set(src.namelist())
    dst_names = set(dst.namelist())
    if dst_names != src_names | added:
        missing = sorted(src_names - dst_names)
        extra = sorted(dst_names - src_names - added)
        raise UnusableFile(f"the parts differ after writing (missing {missing}, unexpected {extra})")
    for name in src_names - changed:
        with src.open(name) as a, dst.open(name) as b:
            while True:
                x, y = a.read(1 << 20), b.read(1 << 20)
                if x != y:
                    raise UnusableFile(f"the part '{name}' changed in writing")
                if not x:
                    break
    if sheet is None:
        return
    theirs = _sheet_cells(dst, sheet)
    for number, cells in _sheet_cells(src, sheet):
        try:
            other_number, other_cells = next(theirs)
        except StopIteration:
            raise UnusableFile(f"row {number} of '{sheet}' is missing after writing") from None
        if other_number != number:
            raise UnusableFile(f"row {number} of '{sheet}' moved to {other_number} in writing")
        by_ref = {c[0]: c for c in other_cells}
        for c in cells:
            if c[0] is None or c[0] in overwritten:
                continue
            now = by_ref.get(c[0])
            if c[3] is None and c[5] is None and c[6] is None:  # an empty cell, filled: its style must stay
                if now is None or now[1] != c[1]:
                    raise UnusableFile(f"cell {c[0]} of '{sheet}' lost its style in writing")
                continue
            if now != c:
                raise UnusableFile(f"cell {c[0]} of '{sheet}' changed in writing: {c} became {now}")


# ---------------------------------------------------------------------------
# Adding a sheet
# ---------------------------------------------------------------------------


FINDINGS_HEADERS = ("Cell", "Sheet", "Row", "Column", "Check", "Severity", "Message", "Suggestion")
_FINDINGS_WIDTHS = (8, 14, 6, 8, 13, 8, 70, 26)
_WRAPPED = (6, 7)  # the columns whose text is wrapped: Message and Suggestion
POINTS_PER_LINE = 15.0  # the height of a line of 11-point text, as spreadsheet programs set it


def text_lines(text: object, width: float) -> int:
    """How many lines a text takes when wrapped in a column ``width``
    characters wide (a character of the default font is narrower than the
    digit the width is counted in: about 1.1 characters a unit, common practice)."""
    per_line = max(1, int(width * 1.1))
    if text is None or text == "":
        return 1
    return sum(max(1, -(-len(part) // per_line)) for part in str(text).split("\n"))


def _sheet_ref(sheet: str, cell: str) -> str:
    return "'" + sheet.replace("'", "''") + "'!" + cell


def _sheet_xml(rows: list[list[object]], formats: dict[str, int | None] | None = None) -> bytes:
    """A findings sheet: a bold header row, frozen and filtered; Message and
    Suggestion wrapped with each row as high as its text; the first column
    ('Cell') a link to the finding's cell when the rows follow
    FINDINGS_HEADERS; printed on A4 landscape, one page wide, the header
    repeated (its print titles are a defined name of the workbook)."""
    formats = formats or {}
    findings = bool(rows) and tuple(rows[0]) == FINDINGS_HEADERS
    root = etree.Element(_q("worksheet"), nsmap={None: MAIN_NS, "r": REL_NS})
    props = etree.SubElement(root, _q("sheetPr"))
    etree.SubElement(props, _q("pageSetUpPr"), fitToPage="1")
    views = etree.SubElement(root, _q("sheetViews"))
    view = etree.SubElement(views, _q("sheetView"), workbookViewId="0")
    etree.SubElement(view, _q("pane"), ySplit="1", topLeftCell="A2", activePane="bottomLeft", state="frozen")
    etree.SubElement(root, _q("sheetFormatPr"), defaultRowHeight="15")
    cols = etree.SubElement(root, _q("cols"))
    widths = _FINDINGS_WIDTHS if findings else (14, 7, 8, 14, 10, 90, 30)
    for i, width in enumerate(widths, 1):
        etree.SubElement(cols, _q("col"), min=str(i), max=str(i), width=str(width), customWidth="1")
    data = etree.SubElement(root, _q("sheetData"))
    links: list[tuple[str, str, str]] = []
    for r, values in enumerate(rows, 1):
        row = etree.SubElement(data, _q("row"), r=str(r))
        if r > 1 and findings:
            lines = max(text_lines(values[c], widths[c]) for c in _WRAPPED if c < len(values))
            if lines > 1:
                row.set("ht", f"{lines * POINTS_PER_LINE:g}")
                row.set("customHeight", "1")
        for c, value in enumerate(values):
            if value is None or value == "":
                continue
            style = None
            if r == 1:
                style = formats.get("bold")
            elif findings and c in _WRAPPED:
                style = formats.get("wrap")
            elif findings and c == 0:
                style = formats.get("link")
            elif findings:
                style = formats.get("top")
            row.append(_make_cell(r, NewCell(c, value, style)))
        if r > 1 and findings and values and values[0] and values[1]:
            links.append((f"A{r}", _sheet_ref(str(values[1]), str(values[0])), str(values[0])))
    if rows:
        last = column_letter(max(len(r) for r in rows) - 1)
        etree.SubElement(root, _q("autoFilter"), ref=f"A1:{last}{len(rows)}")
    if links:
        hyperlinks = etree.SubElement(root, _q("hyperlinks"))
        for ref, location, display in links:
            etree.SubElement(hyperlinks, _q("hyperlink"), ref=ref, location=location, display=display)
    etree.SubElement(
        root, _q("pageMargins"), left="0.5", right="0.5", top="0.6", bottom="0.6", header="0.3", footer="0.3"
    )
    etree.SubElement(
        root, _q("pageSetup"), paperSize="9", orientation="landscape", fitToWidth="1", fitToHeight="0"
    )
    return etree.tostring(root, xml_declaration=True, encoding="UTF-8", standalone=True)


def added_sheet(
    zin: zipfile.ZipFile,
    pmap: PackageMap,
    title: str,
    rows: list[list[object]],
    styles: Styles | None = None,
) -> tuple[dict[str, bytes], dict[str, bytes], str]:
    """The parts to change and add for a new sheet of plain cells: (changed
    parts -> new bytes, new parts -> bytes, the sheet's title as written).
    With ``styles`` (the workbook's, changed in place) the header is bold,
    long text wrapped and the links shown as links; the header row is
    repeated on each printed page."""
    names = set(zin.namelist())
    folder = posixpath.dirname(pmap.workbook)
    n = 1
    while posixpath.join(folder, f"worksheets/sheet{n}.xml") in names:
        n += 1
    part = posixpath.join(folder, f"worksheets/sheet{n}.xml")
    wb = _xml(zin, pmap.workbook)
    sheets = wb.find(_q("sheets"))
    taken = {s.get("name", "").casefold() for s in sheets}
    name = title
    k = 2
    while name.casefold() in taken:
        name = f"{title} {k}"
        k += 1
    ids = [int(s.get("sheetId", "0")) for s in sheets if s.get("sheetId", "0").isdigit()]
    rels_part = _rels_of(pmap.workbook)
    rels = _xml(zin, rels_part)
    rids = {r.get("Id") for r in rels}
    j = 1
    while f"rId{j}" in rids:
        j += 1
    rid = f"rId{j}"
    etree.SubElement(
        sheets, _q("sheet"), {"name": name, "sheetId": str(max(ids, default=0) + 1), _q("id", REL_NS): rid}
    )
    if rows:
        _print_titles(wb, sheets, len(sheets) - 1, name)
    etree.SubElement(
        rels,
        _q("Relationship", PKG_REL_NS),
        Id=rid,
        Type=WORKSHEET_REL,
        Target=posixpath.relpath(part, folder) if folder else part,
    )
    ct = _xml(zin, "[Content_Types].xml")
    etree.SubElement(ct, _q("Override", CT_NS), PartName="/" + part, ContentType=WORKSHEET_CT)

    def out(el: etree._Element) -> bytes:
        return etree.tostring(el, xml_declaration=True, encoding="UTF-8", standalone=True)

    formats: dict[str, int | None] = {}
    if styles is not None:
        formats = {
            "bold": styles.added_format("bold", bold=True),
            "wrap": styles.added_format("wrap", wrap=True),
            "link": styles.added_format("link", link=True, top=True),
            "top": styles.added_format("top", top=True),
        }
    changed = {pmap.workbook: out(wb), rels_part: out(rels), "[Content_Types].xml": out(ct)}
    return changed, {part: _sheet_xml(rows, formats)}, name


_BEFORE_DEFINED_NAMES = ("sheets", "functionGroups", "externalReferences")


def _print_titles(wb: etree._Element, sheets: etree._Element, position: int, name: str) -> None:
    """Add the defined name that repeats row 1 of sheet ``position`` on each printed page."""
    defined = wb.find(_q("definedNames"))
    if defined is None:
        defined = etree.Element(_q("definedNames"))
        anchor = sheets
        for child in wb:
            if etree.QName(child).localname in _BEFORE_DEFINED_NAMES:
                anchor = child
        anchor.addnext(defined)
    item = etree.SubElement(defined, _q("definedName"), name="_xlnm.Print_Titles", localSheetId=str(position))
    item.text = _sheet_ref(name, "$1:$1")
