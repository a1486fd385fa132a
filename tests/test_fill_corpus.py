"""`cellchem fill` over a corpus of workbooks a load-and-save would damage.

Each workbook is built here (no binary fixtures are committed) around a small
inventory table and holds one kind of content that openpyxl drops or rewrites
when it loads and saves a file: comments, threaded comments, images, charts,
data validation, conditional formats, macros, Excel tables, pivot tables,
cached formula values, a sensitivity label, and workbook-level settings. The
tests hold the writer to its contract: the input is never modified, the output
has the same parts, every part but the filled sheet and the styles is
byte-identical, every original cell of the filled sheet is unchanged, and the
added columns hold the values the core computes (the core's own functions are
used only to check that the writer copies their values; the chemistry is tested
elsewhere). Each output is read back with openpyxl, python-calamine and, where
it is installed, LibreOffice Calc.
"""

from __future__ import annotations

import csv
import datetime
import hashlib
import io
import itertools
import random
import re
import shutil
import struct
import subprocess
import zipfile
import zlib
from collections.abc import Callable
from dataclasses import dataclass, field
from pathlib import Path

import openpyxl
import pytest
import xlsxwriter
from hypothesis import given, settings
from hypothesis import strategies as st
from lxml import etree
from python_calamine import CalamineWorkbook

from cellchem import CellchemError, molar_mass, name_from_formula, parse_formula
from cellchem.cli import main

MAIN_NS = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
REL_NS = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PKG_REL_NS = "http://schemas.openxmlformats.org/package/2006/relationships"

DEFAULT_HEADERS = (
    "Formula (canonical)",
    "Systematic name",
    "Molar mass (g/mol)",
    "Water of crystallisation",
    "Cations",
    "Anions",
)


# ---------------------------------------------------------------------------
# The inventory lines. ``water``, ``cations`` and ``anions`` are typed from the
# formula (a hydrate's water count and the ions of a salt, in cellchem's
# notation); the canonical formula, the name and the molar mass are taken from
# the core's own functions at check time. A line with ``good=False`` must get
# empty computed cells.


@dataclass(frozen=True)
class Line:
    item: str
    formula: str  # as written in the formula cell ("" for none)
    mw: float | None
    good: bool
    reads_as: str = ""  # the formula the line is read as, when the cell is empty
    water: int | None = None
    cations: str | None = None
    anions: str | None = None

    @property
    def compound(self) -> str:
        return self.reads_as or self.formula


SODIUM_CHLORIDE = Line("Sodium chloride", "NaCl", 58.44, True, water=0, cations="Na+", anions="Cl-")
COPPER_SULFATE = Line(
    "Copper(II) sulfate pentahydrate", "CuSO4·5H2O", 249.68, True, water=5, cations="Cu2+", anions="SO4 2-"
)
POTASSIUM_NITRATE = Line("Potassium nitrate", "KNO3", 101.10, True, water=0, cations="K+", anions="NO3-")
GLUCOSE = Line("Glucose", "C6H12O6", 180.16, True, water=0)
MOHR_SALT = Line(
    "Ammonium iron(II) sulfate hexahydrate",
    "(NH4)2Fe(SO4)2·6H2O",
    392.14,
    True,
    water=6,
    cations="2 NH4+, Fe2+",
    anions="2 SO4 2-",
)
BAD_SODIUM_CHLORIDE = Line("Sodium chloride", "NaCl2", 58.44, False)

INVENTORY = (SODIUM_CHLORIDE, COPPER_SULFATE, POTASSIUM_NITRATE, GLUCOSE, MOHR_SALT, BAD_SODIUM_CHLORIDE)

# The pool of the property test: good lines, and lines that must stay empty.
POOL = (
    *INVENTORY[:5],
    Line(
        "Magnesium sulfate heptahydrate", "MgSO4.7H2O", 246.47, True, water=7, cations="Mg2+", anions="SO4 2-"
    ),
    Line("Calcium carbonate", "CaCO3", 100.09, True, water=0, cations="Ca2+", anions="CO3 2-"),
    Line("Sodium hydroxide", "", 40.00, True, reads_as="NaOH", water=0, cations="Na+", anions="OH-"),
    BAD_SODIUM_CHLORIDE,
    Line("Iron(III) chloride", "FeCl2", 126.75, False),
    Line("Sample tray", "Xy3", None, False),
    Line("Stores trolley", "", None, False),
)


def expected_values(line: Line) -> tuple[object, ...]:
    """The six default computed values of a line, None for an empty cell."""
    if not line.good:
        return (None,) * 6
    f = parse_formula(line.compound)
    try:
        name: str | None = name_from_formula(f)
    except CellchemError:
        name = None
    return (f.text(), name, float(molar_mass(f)), line.water, line.cations, line.anions)


# ---------------------------------------------------------------------------
# Package helpers


def _sha(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def _local(tag: object) -> str:
    return etree.QName(tag).localname if isinstance(tag, str) else ""


def sheet_parts(path: Path) -> dict[str, str]:
    """Sheet name -> part name, from workbook.xml and its relationships."""
    with zipfile.ZipFile(path) as z:
        wb = etree.fromstring(z.read("xl/workbook.xml"))
        rels = etree.fromstring(z.read("xl/_rels/workbook.xml.rels"))
    targets = {r.get("Id"): r.get("Target") for r in rels}
    out = {}
    for s in wb.iter(f"{{{MAIN_NS}}}sheet"):
        target = targets[s.get(f"{{{REL_NS}}}id")]
        out[s.get("name")] = target.lstrip("/") if target.startswith("/") else "xl/" + target
    return out


def rewrite_zip(path: Path, add: dict[str, bytes], edit: dict[str, Callable[[bytes], bytes]]) -> None:
    """Rewrite a package in place with parts added and parts edited."""
    with zipfile.ZipFile(path) as z:
        parts = [(i.filename, z.read(i.filename)) for i in z.infolist()]
    names = {n for n, _ in parts}
    missing = set(edit) - names
    assert not missing, f"parts to edit are not in the package: {missing}"
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in parts:
            z.writestr(name, edit[name](data) if name in edit else data)
        for name, data in add.items():
            assert name not in names
            z.writestr(name, data)


def _add_override(part: str, content_type: str) -> Callable[[bytes], bytes]:
    def edit(data: bytes) -> bytes:
        text = data.decode("utf-8")
        return text.replace(
            "</Types>", f'<Override PartName="/{part}" ContentType="{content_type}"/></Types>'
        ).encode("utf-8")

    return edit


def _chain(*edits: Callable[[bytes], bytes]) -> Callable[[bytes], bytes]:
    def edit(data: bytes) -> bytes:
        for e in edits:
            data = e(data)
        return data

    return edit


def _add_relationship(rel_id: str, rel_type: str, target: str) -> Callable[[bytes], bytes]:
    def edit(data: bytes) -> bytes:
        text = data.decode("utf-8")
        return text.replace(
            "</Relationships>",
            f'<Relationship Id="{rel_id}" Type="{rel_type}" Target="{target}"/></Relationships>',
        ).encode("utf-8")

    return edit


def _rels_part(*relationships: tuple[str, str, str]) -> bytes:
    body = "".join(f'<Relationship Id="{i}" Type="{t}" Target="{g}"/>' for i, t, g in relationships)
    return (
        '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
        f'<Relationships xmlns="{PKG_REL_NS}">{body}</Relationships>'
    ).encode()


def tiny_png(width: int = 4, height: int = 4) -> bytes:
    """A small red RGB PNG, built from its chunks."""

    def chunk(kind: bytes, data: bytes) -> bytes:
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data))

    raw = b"".join(b"\x00" + bytes((200, 40, 40)) * width for _ in range(height))
    header = struct.pack(">IIBBBBB", width, height, 8, 2, 0, 0, 0)
    return (
        b"\x89PNG\r\n\x1a\n"
        + chunk(b"IHDR", header)
        + chunk(b"IDAT", zlib.compress(raw))
        + chunk(b"IEND", b"")
    )


# ---------------------------------------------------------------------------
# The corpus


@dataclass
class Case:
    path: Path
    sheet: str
    header_row: int  # 1-based
    first_new: int  # 1-based column of the first added column
    rows: dict[int, Line]  # row number -> line
    suffix: str = ".xlsx"
    checks: list[Callable[[Case, Path], None]] = field(default_factory=list)


def _write_inventory(ws, header_row: int = 1, extra: tuple[str, ...] = ()) -> dict[int, Line]:
    """Write the header and the inventory lines (xlsxwriter, 0-based calls)."""
    ws.write_row(header_row - 1, 0, ["Item", "Formula", "MW", *extra])
    rows = {}
    for i, line in enumerate(INVENTORY):
        r = header_row + i  # 0-based index of the row below the header
        ws.write_string(r, 0, line.item)
        ws.write_string(r, 1, line.formula)
        if line.mw is not None:
            ws.write_number(r, 2, line.mw)
        rows[r + 1] = line
    return rows


def build_comments(d: Path) -> Case:
    path = d / "comments.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    ws.write_comment("A3", "Keep the lid closed; it cakes in damp air.", {"author": "Stores desk"})
    ws.write_comment("C2", "Checked against the label.", {"author": "Stores desk"})
    wb.close()
    return Case(path, "Stock", 1, 4, rows)


THREADED = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    '<ThreadedComments xmlns="http://schemas.microsoft.com/office/spreadsheetml/2018/threadedcomments" '
    f'xmlns:x="{MAIN_NS}">'
    '<threadedComment ref="A3" dT="2024-03-01T09:30:00.00" '
    'personId="{5D0C1A2E-0000-4000-8000-000000000001}" id="{5D0C1A2E-0000-4000-8000-0000000000A1}">'
    "<text>Re-order when fewer than two bottles are left.</text></threadedComment>"
    '<threadedComment ref="A3" dT="2024-03-02T11:00:00.00" '
    'personId="{5D0C1A2E-0000-4000-8000-000000000001}" id="{5D0C1A2E-0000-4000-8000-0000000000A2}" '
    'parentId="{5D0C1A2E-0000-4000-8000-0000000000A1}"><text>Ordered.</text></threadedComment>'
    "</ThreadedComments>"
).encode()
PERSONS = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    '<personList xmlns="http://schemas.microsoft.com/office/spreadsheetml/2018/threadedcomments" '
    f'xmlns:x="{MAIN_NS}">'
    '<person displayName="Stores Desk" id="{5D0C1A2E-0000-4000-8000-000000000001}" '
    'userId="stores.desk" providerId="None"/></personList>'
).encode()


def build_threaded_comments(d: Path) -> Case:
    path = d / "threaded.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    # Excel writes a legacy comment beside each thread, for older readers.
    ws.write_comment("A3", "[Threaded comment] Re-order when fewer than two bottles are left.")
    wb.close()
    rewrite_zip(
        path,
        add={"xl/threadedComments/threadedComment1.xml": THREADED, "xl/persons/person.xml": PERSONS},
        edit={
            "xl/worksheets/_rels/sheet1.xml.rels": _add_relationship(
                "rIdTc1",
                "http://schemas.microsoft.com/office/2017/10/relationships/threadedComment",
                "../threadedComments/threadedComment1.xml",
            ),
            "xl/_rels/workbook.xml.rels": _add_relationship(
                "rIdPs1",
                "http://schemas.microsoft.com/office/2017/10/relationships/person",
                "persons/person.xml",
            ),
            "[Content_Types].xml": _chain(
                _add_override(
                    "xl/threadedComments/threadedComment1.xml",
                    "application/vnd.ms-excel.threadedcomments+xml",
                ),
                _add_override("xl/persons/person.xml", "application/vnd.ms-excel.person+xml"),
            ),
        },
    )
    return Case(path, "Stock", 1, 4, rows)


def build_image(d: Path) -> Case:
    path = d / "image.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    ws.write("A1", "Stores inventory, prep room", wb.add_format({"bold": True, "font_size": 14}))
    rows = _write_inventory(ws, header_row=3)
    ws.insert_image("B1", "logo.png", {"image_data": io.BytesIO(tiny_png()), "x_scale": 4, "y_scale": 4})
    wb.close()
    return Case(path, "Stock", 3, 4, rows)


def build_chart(d: Path) -> Case:
    path = d / "chart.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    chart = wb.add_chart({"type": "column"})
    chart.add_series({"name": "MW", "categories": "=Stock!$A$2:$A$7", "values": "=Stock!$C$2:$C$7"})
    chart.set_title({"name": "Molar masses on the list"})
    ws.insert_chart("A10", chart)
    # A note below the table, right of it: the new columns start after it.
    ws.write("F9", "Masses as printed on the supplier labels.")
    wb.close()
    return Case(path, "Stock", 1, 7, rows)


def build_data_validation(d: Path) -> Case:
    path = d / "validation.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws, extra=("Hazard",))
    for r, word in zip(range(1, 7), ("none", "irritant", "oxidiser", "none", "irritant", "none")):
        ws.write_string(r, 3, word)
    ws.data_validation("D2:D40", {"validate": "list", "source": ["none", "irritant", "oxidiser", "toxic"]})
    ws.data_validation("C2:C40", {"validate": "decimal", "criteria": ">", "value": 0})
    wb.close()
    return Case(path, "Stock", 1, 5, rows)


def build_conditional_formats(d: Path) -> Case:
    path = d / "conditional.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    red = wb.add_format({"font_color": "#9C0006", "bg_color": "#FFC7CE"})
    ws.conditional_format("C2:C7", {"type": "cell", "criteria": ">", "value": 200, "format": red})
    ws.conditional_format("C2:C7", {"type": "data_bar"})
    ws.conditional_format("B2:B7", {"type": "duplicate", "format": red})
    wb.close()
    return Case(path, "Stock", 1, 4, rows)


def build_macros(d: Path) -> Case:
    path = d / "macros.xlsm"
    vba = d / "vbaProject.bin"
    vba.write_bytes(random.Random(7).randbytes(3000))
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    wb.add_vba_project(str(vba))
    wb.close()

    def check(case: Case, out: Path) -> None:
        with zipfile.ZipFile(out) as z:
            assert z.read("xl/vbaProject.bin") == vba.read_bytes()
            types = z.read("[Content_Types].xml").decode()
        assert "application/vnd.ms-excel.sheet.macroEnabled.main+xml" in types

    return Case(path, "Stock", 1, 4, rows, suffix=".xlsm", checks=[check])


def build_excel_table(d: Path) -> Case:
    path = d / "listobject.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    data = [[line.item, line.formula, line.mw] for line in INVENTORY]
    ws.add_table(
        "A1:C7",
        {
            "name": "StockList",
            "data": data,
            "style": "Table Style Medium 2",
            "columns": [{"header": "Item"}, {"header": "Formula"}, {"header": "MW"}],
        },
    )
    wb.close()
    rows = {i + 2: line for i, line in enumerate(INVENTORY)}

    def check(case: Case, out: Path) -> None:
        with zipfile.ZipFile(out) as z:
            table = etree.fromstring(z.read("xl/tables/table1.xml"))
        last = table.get("ref").split(":")[1]
        last_col = openpyxl.utils.column_index_from_string(re.match(r"[A-Z]+", last).group())
        assert case.first_new > last_col, f"new columns start inside the table {table.get('ref')}"

    return Case(path, "Stock", 1, 4, rows, checks=[check])


PIVOT_DEF = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    f'<pivotCacheDefinition xmlns="{MAIN_NS}" xmlns:r="{REL_NS}" r:id="rId1" refreshOnLoad="1" '
    'createdVersion="6" refreshedVersion="6" minRefreshableVersion="3" recordCount="6">'
    '<cacheSource type="worksheet"><worksheetSource ref="A1:C7" sheet="Stock"/></cacheSource>'
    '<cacheFields count="3"><cacheField name="Item" numFmtId="0"><sharedItems/></cacheField>'
    '<cacheField name="Formula" numFmtId="0"><sharedItems/></cacheField>'
    '<cacheField name="MW" numFmtId="0"><sharedItems containsSemiMixedTypes="0" containsString="0" '
    'containsNumber="1" minValue="58.44" maxValue="392.14"/></cacheField></cacheFields>'
    "</pivotCacheDefinition>"
).encode()
PIVOT_RECORDS = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    f'<pivotCacheRecords xmlns="{MAIN_NS}" xmlns:r="{REL_NS}" count="6">'
    + "".join(f'<r><s v="{ln.item}"/><s v="{ln.formula}"/><n v="{ln.mw}"/></r>' for ln in INVENTORY)
    + "</pivotCacheRecords>"
).encode()
PIVOT_TABLE = (
    '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    f'<pivotTableDefinition xmlns="{MAIN_NS}" name="StockPivot" cacheId="1" dataCaption="Values" '
    'updatedVersion="6" minRefreshableVersion="3" createdVersion="6" outline="1" outlineData="1">'
    '<location ref="A3:A4" firstHeaderRow="1" firstDataRow="1" firstDataCol="0"/>'
    '<pivotFields count="3"><pivotField showAll="0"/><pivotField showAll="0"/>'
    '<pivotField dataField="1" showAll="0"/></pivotFields>'
    '<rowItems count="1"><i/></rowItems><colItems count="1"><i/></colItems>'
    '<dataFields count="1"><dataField name="Sum of MW" fld="2" baseField="0" baseItem="0"/></dataFields>'
    "</pivotTableDefinition>"
).encode()
_OD = "http://schemas.openxmlformats.org/officeDocument/2006/relationships/"
_SS = "application/vnd.openxmlformats-officedocument.spreadsheetml."


def build_pivot(d: Path) -> Case:
    path = d / "pivot.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    summary = wb.add_worksheet("Summary")
    summary.write("A3", "Sum of MW")
    summary.write("A4", sum(line.mw for line in INVENTORY))
    wb.close()

    def workbook_edit(data: bytes) -> bytes:
        text = data.decode("utf-8")
        caches = '<pivotCaches><pivotCache cacheId="1" r:id="rIdPc1"/></pivotCaches>'
        new, n = re.subn(r"(<calcPr[^>]*/>)", lambda m: m.group(1) + caches, text)
        assert n == 1
        return new.encode("utf-8")

    rewrite_zip(
        path,
        add={
            "xl/pivotCache/pivotCacheDefinition1.xml": PIVOT_DEF,
            "xl/pivotCache/pivotCacheRecords1.xml": PIVOT_RECORDS,
            "xl/pivotCache/_rels/pivotCacheDefinition1.xml.rels": _rels_part(
                ("rId1", _OD + "pivotCacheRecords", "pivotCacheRecords1.xml")
            ),
            "xl/pivotTables/pivotTable1.xml": PIVOT_TABLE,
            "xl/pivotTables/_rels/pivotTable1.xml.rels": _rels_part(
                ("rId1", _OD + "pivotCacheDefinition", "../pivotCache/pivotCacheDefinition1.xml")
            ),
            "xl/worksheets/_rels/sheet2.xml.rels": _rels_part(
                ("rId1", _OD + "pivotTable", "../pivotTables/pivotTable1.xml")
            ),
        },
        edit={
            "xl/workbook.xml": workbook_edit,
            "xl/_rels/workbook.xml.rels": _add_relationship(
                "rIdPc1", _OD + "pivotCacheDefinition", "pivotCache/pivotCacheDefinition1.xml"
            ),
            "[Content_Types].xml": _chain(
                _add_override("xl/pivotCache/pivotCacheDefinition1.xml", _SS + "pivotCacheDefinition+xml"),
                _add_override("xl/pivotCache/pivotCacheRecords1.xml", _SS + "pivotCacheRecords+xml"),
                _add_override("xl/pivotTables/pivotTable1.xml", _SS + "pivotTable+xml"),
            ),
        },
    )
    return Case(path, "Stock", 1, 4, rows)


def _shared_formulas(data: bytes) -> bytes:
    """Turn the plain formulas =C<n>*2 of column D into one shared formula."""
    text = data.decode("utf-8")
    first = True

    def repl(m: re.Match) -> str:
        nonlocal first
        if first:
            first = False
            return f'<f t="shared" ref="D2:D7" si="0">C{m.group(1)}*2</f>'
        return '<f t="shared" si="0"/>'

    new, n = re.subn(r"<f>C(\d+)\*2</f>", repl, text)
    assert n == 6, n
    return new.encode("utf-8")


def build_cached_formulas(d: Path) -> Case:
    path = d / "formulas.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws, extra=("Twice MW", "Label"))
    two = wb.add_format({"num_format": "0.0"})
    for r, line in zip(range(1, 7), INVENTORY):
        ws.write_formula(r, 3, f"=C{r + 1}*2", two, round(line.mw * 2, 2))
        ws.write_formula(r, 4, f'=A{r + 1}&" (shelf)"', None, f"{line.item} (shelf)")
    ws.write_formula("C9", "=SUM(C2:C7)", None, round(sum(line.mw for line in INVENTORY), 2))
    wb.close()
    rewrite_zip(path, add={}, edit={"xl/worksheets/sheet1.xml": _shared_formulas})

    def check(case: Case, out: Path) -> None:
        grid = CalamineWorkbook.from_path(out).get_sheet_by_name("Stock").to_python(skip_empty_area=False)
        for r, line in case.rows.items():
            assert grid[r - 1][3] == pytest.approx(round(line.mw * 2, 2)), f"cached D{r}"
            assert grid[r - 1][4] == f"{line.item} (shelf)", f"cached E{r}"
        assert grid[8][2] == pytest.approx(round(sum(line.mw for line in INVENTORY), 2)), "cached C9"

    return Case(path, "Stock", 1, 6, rows, checks=[check])


LABEL_INFO = (
    b'<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n'
    b'<clbl:labelList xmlns:clbl="http://schemas.microsoft.com/office/2020/mipLabelMetadata">'
    b'<clbl:label id="{0F1E2D3C-4B5A-4969-8877-665544332211}" enabled="1" method="Standard" '
    b'siteId="{11223344-5566-4778-8899-AABBCCDDEEFF}" removed="0"/></clbl:labelList>'
)


def build_sensitivity_label(d: Path) -> Case:
    path = d / "label.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    wb.close()
    rewrite_zip(
        path,
        add={"docMetadata/LabelInfo.xml": LABEL_INFO},
        edit={
            "_rels/.rels": _add_relationship(
                "rIdLbl1",
                "http://schemas.microsoft.com/office/2020/02/relationships/classificationlabels",
                "docMetadata/LabelInfo.xml",
            ),
            "[Content_Types].xml": _add_override(
                "docMetadata/LabelInfo.xml", "application/vnd.ms-office.classificationlabels+xml"
            ),
        },
    )
    return Case(path, "Stock", 1, 4, rows)


def build_workbook_settings(d: Path) -> Case:
    path = d / "settings.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    notes = wb.add_worksheet("Notes")
    lists = wb.add_worksheet("Lists")
    rows = _write_inventory(ws)
    ws.set_column("A:A", 36)
    ws.set_column("B:B", 24)
    ws.set_column("C:C", 9)
    ws.freeze_panes(1, 0)
    ws.set_row(0, 30, wb.add_format({"bold": True}))
    ws.set_row(4, None, None, {"hidden": True})
    ws.set_row(5, 22)
    two = wb.add_format({"num_format": "0.00"})
    for r, line in zip(range(1, 7), INVENTORY):
        ws.write_number(r, 2, line.mw, two)
    ws.autofilter("A1:C7")
    merged = wb.add_format({"align": "center", "bold": True})
    ws.merge_range("E1:G1", "Checked by stores", merged)
    ws.merge_range("E3:G4", "Stocktake due in June", merged)
    notes.write("A1", "Read me: one line per container; masses in g/mol.")
    lists.write_column("A1", ["none", "irritant", "oxidiser"])
    lists.hide()
    wb.define_name("StockMasses", "=Stock!$C$2:$C$7")
    wb.define_name("Stock!LocalItems", "=Stock!$A$2:$A$7")
    wb.define_name("Hazards", "=Lists!$A$1:$A$3")
    wb.close()
    return Case(path, "Stock", 1, 8, rows)


def build_cell_types(d: Path) -> Case:
    """Booleans, dates, cached errors, rich text and spaced text beside the table."""
    path = d / "cell-types.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws, extra=("Checked", "Received", "Ratio", "Remark"))
    day = wb.add_format({"num_format": "yyyy-mm-dd"})
    bold = wb.add_format({"bold": True})
    for r in range(1, 7):
        ws.write_boolean(r, 3, r % 2 == 0)
        ws.write_datetime(r, 4, datetime.datetime(2024, 1, r), day)
        ws.write_formula(r, 5, f"=C{r + 1}/0", None, "#DIV/0!")
    ws.write_rich_string("G2", "keep ", bold, "dry", " and cool")
    ws.write_string("G3", "  two spaces each side  ")
    ws.write_string("G4", "=not a formula")
    ws.write_blank("G5", None, bold)
    wb.close()
    return Case(path, "Stock", 1, 8, rows)


def build_column_range(d: Path) -> Case:
    """One width set for every column right of the table, up to the last (XFD)."""
    path = d / "column-range.xlsx"
    wb = xlsxwriter.Workbook(path)
    ws = wb.add_worksheet("Stock")
    rows = _write_inventory(ws)
    ws.set_column("A:A", 30)
    ws.set_column("D:XFD", 12)
    wb.close()
    return Case(path, "Stock", 1, 4, rows)


def build_second_sheet_table(d: Path) -> Case:
    """The inventory on the second sheet, picked with --sheet."""
    path = d / "second-sheet.xlsx"
    wb = xlsxwriter.Workbook(path)
    cover = wb.add_worksheet("Cover")
    cover.write("A1", "Prep room stock list")
    ws = wb.add_worksheet("Bench stock")
    rows = _write_inventory(ws)
    wb.close()
    return Case(path, "Bench stock", 1, 4, rows)


BUILDERS: dict[str, Callable[[Path], Case]] = {
    "comments": build_comments,
    "threaded-comments": build_threaded_comments,
    "image": build_image,
    "chart": build_chart,
    "data-validation": build_data_validation,
    "conditional-formats": build_conditional_formats,
    "macros": build_macros,
    "excel-table": build_excel_table,
    "pivot-table": build_pivot,
    "cached-formulas": build_cached_formulas,
    "sensitivity-label": build_sensitivity_label,
    "workbook-settings": build_workbook_settings,
    "cell-types": build_cell_types,
    "column-range": build_column_range,
    "second-sheet": build_second_sheet_table,
}
EXTRA_ARGS = {"second-sheet": ["--sheet", "Bench stock"]}


# ---------------------------------------------------------------------------
# Checks shared by the corpus and the property test


def _same(a: etree._Element, b: etree._Element) -> bool:
    if a.tag != b.tag or dict(a.attrib) != dict(b.attrib) or (a.text or "") != (b.text or ""):
        return False
    if len(a) != len(b):
        return False
    return all(_same(x, y) and (x.tail or "").strip() == (y.tail or "").strip() for x, y in zip(a, b))


def _describe(el: etree._Element) -> str:
    return etree.tostring(el, encoding="unicode")


def _cells(root: etree._Element) -> dict[str, etree._Element]:
    return {c.get("r"): c for c in root.iter(f"{{{MAIN_NS}}}c")}


def _split_ref(ref: str) -> tuple[int, int]:
    m = re.fullmatch(r"([A-Z]+)(\d+)", ref)
    assert m, ref
    return openpyxl.utils.column_index_from_string(m.group(1)), int(m.group(2))


def check_package(src: Path, out: Path, sheet: str) -> None:
    """Same part names; every part but the sheet and the styles byte-identical."""
    part = sheet_parts(src)[sheet]
    assert sheet_parts(out)[sheet] == part
    with zipfile.ZipFile(src) as zi, zipfile.ZipFile(out) as zo:
        names_in, names_out = set(zi.namelist()), set(zo.namelist())
        assert names_out == names_in, (
            f"parts added: {sorted(names_out - names_in)}, parts lost: {sorted(names_in - names_out)}"
        )
        changed = [
            n for n in sorted(names_in) if n not in (part, "xl/styles.xml") and zi.read(n) != zo.read(n)
        ]
    assert not changed, f"parts that should be byte-identical differ: {changed}"


def check_sheet(src: Path, out: Path, sheet: str, first_new: int) -> dict[str, etree._Element]:
    """Every original cell and sheet setting unchanged; returns the new cells."""
    part = sheet_parts(src)[sheet]
    with zipfile.ZipFile(src) as zi, zipfile.ZipFile(out) as zo:
        old = etree.fromstring(zi.read(part))
        new = etree.fromstring(zo.read(part))
    old_cells, new_cells = _cells(old), _cells(new)
    for ref, c in old_cells.items():
        assert ref in new_cells, f"cell {ref} is gone"
        assert _same(c, new_cells[ref]), f"cell {ref} changed: {_describe(c)} -> {_describe(new_cells[ref])}"
    new_rows = {r.get("r"): r for r in new.iter(f"{{{MAIN_NS}}}row")}
    for row in old.iter(f"{{{MAIN_NS}}}row"):
        kept = {k: v for k, v in row.attrib.items() if k != "spans"}
        got = new_rows.get(row.get("r"))
        assert got is not None, f"row {row.get('r')} is gone"
        got_kept = {k: v for k, v in got.attrib.items() if k != "spans"}
        assert got_kept == kept, f"row {row.get('r')} attributes changed: {kept} -> {got_kept}"
    # Sheet settings other than the cells, the dimension and the column widths
    # (which may gain entries for the new columns) are carried as they were.
    skip = {"sheetData", "dimension", "cols"}
    old_rest = [ch for ch in old if _local(ch.tag) not in skip]
    new_rest = [ch for ch in new if _local(ch.tag) not in skip]
    assert [_local(x.tag) for x in new_rest] == [_local(x.tag) for x in old_rest]
    for x, y in zip(old_rest, new_rest):
        assert _same(x, y), f"<{_local(x.tag)}> changed: {_describe(x)} -> {_describe(y)}"
    old_cols = old.find(f"{{{MAIN_NS}}}cols")
    if old_cols is not None:
        new_cols = list(new.find(f"{{{MAIN_NS}}}cols"))
        for col in old_cols:
            assert any(_same(col, y) for y in new_cols), f"column width lost: {_describe(col)}"
    spans = sorted((int(c.get("min")), int(c.get("max"))) for c in new.iter(f"{{{MAIN_NS}}}col"))
    for (_, hi), (lo, _) in itertools.pairwise(spans):
        assert lo > hi, f"column width ranges overlap: {spans}"
    added = {ref: c for ref, c in new_cells.items() if ref not in old_cells}
    for ref, c in added.items():
        col, _ = _split_ref(ref)
        assert col >= first_new, f"new cell {ref} lies before the first new column"
        assert c.get("t") in (None, "n", "inlineStr"), f"new cell {ref} has type {c.get('t')!r}"
        assert c.find(f"{{{MAIN_NS}}}f") is None, f"new cell {ref} holds a formula"
    return added


def _is_number(v: object) -> bool:
    return isinstance(v, int | float) and not isinstance(v, bool)


def check_values(
    out: Path, sheet: str, header_row: int, first_new: int, rows: dict[int, Line], headers=DEFAULT_HEADERS
) -> None:
    """The new headers and values, read with openpyxl and with python-calamine."""
    wb = openpyxl.load_workbook(out, data_only=True)
    ws = wb[sheet]
    grid = CalamineWorkbook.from_path(out).get_sheet_by_name(sheet).to_python(skip_empty_area=False)

    def cal(r: int, c: int) -> object:
        if r - 1 < len(grid) and c - 1 < len(grid[r - 1]):
            return grid[r - 1][c - 1]
        return ""

    for k, text in enumerate(headers):
        where = openpyxl.utils.get_column_letter(first_new + k) + str(header_row)
        assert ws.cell(header_row, first_new + k).value == text, f"openpyxl header {where}"
        assert cal(header_row, first_new + k) == text, f"calamine header {where}"
    assert ws.cell(header_row, first_new + len(headers)).value is None, "a column more than asked for"
    for r, line in rows.items():
        for k, want in enumerate(expected_values(line)):
            c = first_new + k
            where = f"{openpyxl.utils.get_column_letter(c)}{r} ({headers[k]}, {line.item} / {line.formula})"
            got, got_cal = ws.cell(r, c).value, cal(r, c)
            if want is None:
                assert got is None, f"{where}: expected empty, openpyxl reads {got!r}"
                assert got_cal == "", f"{where}: expected empty, calamine reads {got_cal!r}"
            elif isinstance(want, float):
                assert _is_number(got) and got == pytest.approx(want, rel=1e-9), f"{where}: openpyxl {got!r}"
                assert _is_number(got_cal) and got_cal == pytest.approx(want, rel=1e-9), f"{where}: calamine"
                assert ws.cell(r, c).number_format == "0.00", f"{where}: format {ws.cell(r, c).number_format}"
            elif isinstance(want, int):
                assert _is_number(got) and got == want, f"{where}: openpyxl {got!r}"
                assert _is_number(got_cal) and got_cal == want, f"{where}: calamine {got_cal!r}"
            else:
                assert got == want, f"{where}: openpyxl {got!r}"
                assert got_cal == want, f"{where}: calamine {got_cal!r}"
    wb.close()


def run_fill(args: list[str], capsys) -> tuple[int, str]:
    rc = main(["fill", *args])
    captured = capsys.readouterr()
    return rc, captured.out + captured.err


def fill_case(case: Case, out: Path, kind: str) -> int:
    return main(["fill", str(case.path), "-o", str(out), *EXTRA_ARGS.get(kind, [])])


# ---------------------------------------------------------------------------
# The builders themselves


@pytest.mark.parametrize("kind", BUILDERS)
def test_corpus_workbook_opens(kind, tmp_path):
    case = BUILDERS[kind](tmp_path)
    wb = openpyxl.load_workbook(case.path, read_only=True)
    ws = wb[case.sheet]
    assert [c.value for c in next(ws.iter_rows(min_row=case.header_row, max_row=case.header_row))][:3] == [
        "Item",
        "Formula",
        "MW",
    ]
    wb.close()
    grid = (
        CalamineWorkbook.from_path(case.path).get_sheet_by_name(case.sheet).to_python(skip_empty_area=False)
    )
    for r, line in case.rows.items():
        assert grid[r - 1][:2] == [line.item, line.formula]
    with zipfile.ZipFile(case.path) as z:
        assert z.testzip() is None


# ---------------------------------------------------------------------------
# The corpus through `cellchem fill`


@pytest.mark.parametrize("kind", BUILDERS)
def test_fill_keeps_everything_else(kind, tmp_path, capsys):
    case = BUILDERS[kind](tmp_path)
    before = _sha(case.path)
    out = tmp_path / f"out{case.suffix}"
    rc = fill_case(case, out, kind)
    captured = capsys.readouterr()
    # The NaCl2 line cannot be filled: written, with lines left empty.
    assert rc == 1, captured.out + captured.err
    assert _sha(case.path) == before, "the input was modified"
    assert out.exists()
    check_package(case.path, out, case.sheet)
    added = check_sheet(case.path, out, case.sheet, case.first_new)
    assert added, "no cells were added"
    check_values(out, case.sheet, case.header_row, case.first_new, case.rows)
    for check in case.checks:
        check(case, out)


@pytest.mark.parametrize("kind", BUILDERS)
def test_audit_reads_what_openpyxl_reads(kind, tmp_path, capsys):
    """Every corpus workbook, and its filled copy, read by the one reader
    give the values openpyxl (the oracle) gives; the audit checks every line."""
    from cellchem.adapters.files.xlsx import Book
    from cellchem.audit import UnsavedValue

    case = BUILDERS[kind](tmp_path)
    out = tmp_path / f"out{case.suffix}"
    fill_case(case, out, kind)
    for path in (case.path, out):
        wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
        expected = {
            i: [v for v in row] for i, row in enumerate(wb[case.sheet].iter_rows(values_only=True), 1)
        }
        wb.close()
        with Book(path) as book:
            got = dict(book.rows(case.sheet))
        for number, row in expected.items():
            values = list(got.get(number, []))
            values += [None] * (len(row) - len(values))
            # a formula cell whose saved value cannot be trusted is marked, by design (README)
            mine = [v for v in values[: len(row)] if not isinstance(v, UnsavedValue)]
            theirs = [w for v, w in zip(values, row) if not isinstance(v, UnsavedValue)]
            assert mine == theirs, (path.name, number)
    capsys.readouterr()
    rc = main(["audit", str(case.path), "--sheet", case.sheet, *EXTRA_ARGS.get(kind, [])])
    text = capsys.readouterr().out
    assert rc in (0, 1), text
    assert f"lines checked: {len(case.rows)}" in text, text


def test_default_output_name_keeps_macro_suffix(tmp_path, capsys):
    case = build_macros(tmp_path)
    before = _sha(case.path)
    rc, text = run_fill([str(case.path)], capsys)
    assert rc == 1, text
    out = tmp_path / "macros-filled.xlsm"
    assert out.exists(), sorted(p.name for p in tmp_path.iterdir())
    assert _sha(case.path) == before
    with zipfile.ZipFile(out) as z:
        assert z.read("xl/vbaProject.bin") == (tmp_path / "vbaProject.bin").read_bytes()
    check_values(out, case.sheet, case.header_row, case.first_new, case.rows)


def test_fill_through_python_m(tmp_path):
    import sys

    case = build_comments(tmp_path)
    out = tmp_path / "via-module.xlsx"
    proc = subprocess.run(
        [sys.executable, "-m", "cellchem", "fill", str(case.path), "-o", str(out)],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert proc.returncode == 1, proc.stdout + proc.stderr
    check_package(case.path, out, case.sheet)
    check_values(out, case.sheet, case.header_row, case.first_new, case.rows)


def test_add_list_columns(tmp_path, capsys):
    case = build_workbook_settings(tmp_path)
    out = tmp_path / "added.xlsx"
    rc, text = run_fill(
        [str(case.path), "-o", str(out), "--add", "molar-mass,mass-fraction=Cu,verdict"], capsys
    )
    assert rc == 1, text
    check_package(case.path, out, case.sheet)
    check_sheet(case.path, out, case.sheet, case.first_new)
    ws = openpyxl.load_workbook(out, data_only=True)[case.sheet]
    h = case.first_new
    assert [ws.cell(1, h + k).value for k in range(4)] == [
        "Molar mass (g/mol)",
        "Mass fraction of Cu (%)",
        "cellchem check",
        None,
    ]
    for r, line in case.rows.items():
        mass, fraction, verdict = (ws.cell(r, h + k).value for k in range(3))
        assert isinstance(verdict, str) and verdict, f"row {r}: no verdict"
        if not line.good:
            assert mass is None and fraction is None, f"row {r}"
            assert verdict.startswith("error"), f"row {r}: {verdict}"
            continue
        assert mass == pytest.approx(float(molar_mass(line.compound)), rel=1e-9)
        if line is COPPER_SULFATE:
            # Cu 63.546 in CuSO4·5H2O 249.68 g/mol: 25.45 %
            assert fraction == pytest.approx(25.45, abs=0.01)
        elif "Cu" not in line.compound:
            assert fraction in (None, 0, 0.0), f"row {r}: {fraction!r}"


# ---------------------------------------------------------------------------
# Refusals and text files


def test_protected_sheet_is_refused(tmp_path, capsys):
    src = tmp_path / "locked.xlsx"
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Stock"
    ws.append(["Item", "Formula", "MW"])
    for line in INVENTORY:
        ws.append([line.item, line.formula, line.mw])
    ws.protection.sheet = True
    wb.save(src)
    before = _sha(src)
    out = tmp_path / "locked-out.xlsx"
    rc, text = run_fill([str(src), "-o", str(out)], capsys)
    assert rc == 2, text
    assert not out.exists()
    rc, text = run_fill([str(src)], capsys)
    assert rc == 2, text
    assert not (tmp_path / "locked-filled.xlsx").exists()
    assert _sha(src) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["locked.xlsx"]


CSV_LINES = (
    "Item;Formula;MW;Shelf note",
    "Sodium chloride;NaCl;58,44;Regal 3 – Süd",
    "Copper(II) sulfate pentahydrate;CuSO4·5H2O;249,68;=1+2",
    "Potassium nitrate;KNO3;101,10;+ keep dry",
    "Sodium chloride;NaCl2;58,44;@doppelt",
)


def test_csv_keeps_encoding_separator_and_lines(tmp_path, capsys):
    src = tmp_path / "stock.csv"
    raw = "".join(line + "\r\n" for line in CSV_LINES).encode("cp1252")
    src.write_bytes(raw)
    out = tmp_path / "stock-out.csv"
    rc, text = run_fill([str(src), "-o", str(out)], capsys)
    assert rc == 1, text
    assert src.read_bytes() == raw
    data = out.read_bytes()
    assert not data.startswith(b"\xef\xbb\xbf"), "a UTF-8 byte-order mark was added"
    data.decode("cp1252")  # the output is cp1252 text
    assert data.count(b"\n") == data.count(b"\r\n"), "a line ending other than CRLF"
    assert data.endswith(b"\r\n")
    in_lines = raw.split(b"\r\n")[:-1]
    out_lines = data.split(b"\r\n")[:-1]
    assert len(out_lines) == len(in_lines)
    added_rows = []
    for i, (a, b) in enumerate(zip(in_lines, out_lines)):
        assert b.startswith(a), f"line {i + 1}: {b!r} does not start with {a!r}"
        rest = b[len(a) :].decode("cp1252")
        assert rest == "" or rest.startswith(";"), f"line {i + 1}: {rest!r}"
        fields = next(csv.reader([rest[1:]], delimiter=";")) if rest else []
        for f in fields:
            assert not f.startswith(("=", "+", "-", "@")), f"line {i + 1}: new cell {f!r}"
        added_rows.append(fields)
    assert added_rows[0] == list(DEFAULT_HEADERS)
    for fields, line in zip(added_rows[1:], (SODIUM_CHLORIDE, COPPER_SULFATE, POTASSIUM_NITRATE)):
        want = expected_values(line)
        assert fields[0] == want[0] and fields[1] == want[1], fields
        assert float(fields[2].replace(",", ".")) == pytest.approx(want[2], abs=0.0051), fields
        assert fields[4:6] == [want[4], want[5]], fields
    assert all(f == "" for f in added_rows[4]), added_rows[4]


# ---------------------------------------------------------------------------
# LibreOffice Calc reads every filled workbook


def _soffice() -> str | None:
    return shutil.which("soffice") or shutil.which("libreoffice")


@pytest.mark.skipif(_soffice() is None, reason="LibreOffice is not installed (CI installs it)")
def test_filled_corpus_opens_in_libreoffice(tmp_path):
    cases = {}
    for kind, build in BUILDERS.items():
        d = tmp_path / kind
        d.mkdir()
        case = build(d)
        out = tmp_path / f"{kind}-filled{case.suffix}"
        assert fill_case(case, out, kind) == 1, kind
        cases[kind] = (case, out)
    lo = tmp_path / "lo"
    subprocess.run(
        [
            _soffice(),
            f"-env:UserInstallation=file://{tmp_path / 'lo-profile'}",
            "--headless",
            "--convert-to",
            # UTF-8, values at full precision, every sheet to its own file
            "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1",
            "--outdir",
            str(lo),
            *(str(out) for _, out in cases.values()),
        ],
        check=True,
        capture_output=True,
        timeout=180,
    )
    problems = []
    for kind, (case, out) in cases.items():
        produced = lo / f"{out.stem}-{case.sheet}.csv"
        if not produced.exists():
            problems.append(f"{kind}: no CSV of sheet {case.sheet!r}")
            continue
        rows = list(csv.reader(io.StringIO(produced.read_text(encoding="utf-8"))))
        j = case.first_new - 1
        headers = rows[case.header_row - 1][j : j + len(DEFAULT_HEADERS)]
        if headers != list(DEFAULT_HEADERS):
            problems.append(f"{kind}: headers {headers}")
        for r, line in case.rows.items():
            want = expected_values(line)[2]
            got = rows[r - 1][j + 2] if len(rows[r - 1]) > j + 2 else ""
            if want is None:
                if got != "":
                    problems.append(f"{kind}: row {r} ({line.formula}) molar mass {got!r}, expected empty")
            elif not got or float(got) != pytest.approx(want, rel=1e-9):
                problems.append(f"{kind}: row {r} ({line.formula}) molar mass {got!r}, expected {want}")
    assert not problems, problems


# ---------------------------------------------------------------------------
# Property: random small tables written with openpyxl

EXTRA_HEADERS = ("Shelf", "Supplier note", "Lot")
extra_value = st.one_of(
    st.none(),
    st.text(alphabet="abcdefgh XYZ0123456789-/()", min_size=1, max_size=10).filter(lambda s: s.strip()),
    st.integers(min_value=-1000, max_value=100000),
    st.floats(min_value=-1e6, max_value=1e6, allow_nan=False).map(lambda x: round(x, 3)),
    st.sampled_from(["=1+1", '=LEN("shelf")']),  # formulas without a cached value
)


@st.composite
def tables(draw):
    lines = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=7))
    n_extra = draw(st.integers(min_value=0, max_value=3))
    order = draw(st.permutations(["Item", "Formula", "MW", *EXTRA_HEADERS[:n_extra]]))
    rows = []
    for line in lines:
        cells = {"Item": line.item, "Formula": line.formula or None, "MW": line.mw}
        if draw(st.booleans()):
            cells["MW"] = None
        for h in EXTRA_HEADERS[:n_extra]:
            cells[h] = draw(extra_value)
        rows.append([cells[h] for h in order])
    titles = draw(st.integers(min_value=0, max_value=2))
    return list(order), lines, rows, titles


@settings(max_examples=25, deadline=None)
@given(table=tables())
def test_fill_random_tables(table, tmp_path_factory):
    order, lines, rows, titles = table
    d = tmp_path_factory.mktemp("prop")
    src = d / "table.xlsx"
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Stock"
    for k in range(titles):  # title lines above the header
        ws.append([f"Prep room stock, page {k + 1}"])
    ws.append(order)
    for row in rows:
        ws.append(row)
    wb.save(src)
    before = _sha(src)
    out = d / "table-out.xlsx"
    rc = main(["fill", str(src), "-o", str(out)])
    assert rc == (0 if all(line.good for line in lines) else 1)
    assert _sha(src) == before
    first_new = len(order) + 1
    check_package(src, out, "Stock")
    check_sheet(src, out, "Stock", first_new)
    header = titles + 1
    check_values(out, "Stock", header, first_new, {header + 1 + i: line for i, line in enumerate(lines)})
    got = openpyxl.load_workbook(out)["Stock"]
    for r, row in enumerate([order, *rows], start=header):
        for c, value in enumerate(row, start=1):
            v = got.cell(r, c).value
            assert v == value or (isinstance(value, float) and v == pytest.approx(value)), (r, c, value, v)


def _grid(path: Path, sheet: str) -> list[list[object]]:
    ws = openpyxl.load_workbook(path, data_only=True)[sheet]
    return [[c.value for c in row] for row in ws.iter_rows()]


def test_refill_with_overwrite_reuses_the_columns(tmp_path, capsys):
    case = build_workbook_settings(tmp_path)
    once = tmp_path / "once.xlsx"
    twice = tmp_path / "twice.xlsx"
    rc, text = run_fill([str(case.path), "-o", str(once)], capsys)
    assert rc == 1, text
    before = _sha(once)
    rc, text = run_fill([str(once), "-o", str(twice), "--overwrite"], capsys)
    assert rc == 1, text
    assert _sha(once) == before
    check_package(once, twice, case.sheet)
    assert _grid(twice, case.sheet) == _grid(once, case.sheet)
    check_values(twice, case.sheet, case.header_row, case.first_new, case.rows)


def test_column_overrides_name_the_roles(tmp_path, capsys):
    src = tmp_path / "odd-headings.xlsx"
    wb = xlsxwriter.Workbook(src)
    ws = wb.add_worksheet("Stock")
    ws.write_row(0, 0, ["Bin", "Label", "Composition"])
    rows = {}
    for i, line in enumerate(INVENTORY, start=1):
        ws.write_row(i, 0, [f"B-{i:02d}", line.item, line.formula])
        rows[i + 1] = line
    wb.close()
    out = tmp_path / "odd-out.xlsx"
    rc, text = run_fill(
        [str(src), "-o", str(out), "--column", "name=Label", "--column", "formula=C"],
        capsys,
    )
    assert rc == 1, text
    check_package(src, out, "Stock")
    check_sheet(src, out, "Stock", 4)
    check_values(out, "Stock", 1, 4, rows)
