"""OpenDocument spreadsheets (.ods): the reader (values of every type, text,
repeated rows and cells, hidden sheets, row groups and sub-tables), the
package checks and the caps on hostile files, and fill's copy (every part but
content.xml byte for byte, every original cell kept, new cells where they
belong, the result read back by LibreOffice where it is installed).

Expected values are OpenDocument 1.2 part 1 applied by hand to small
hand-written documents (from memory: 6.1.1 what a paragraph's text leaves
out, 6.1.2 white space, 9.1 tables, rows, cells and their repetition, 19.385
office:value-type, 19.726 table:display of a table style), and
python-calamine reading the same files as a second, independent reader.
Molar masses: CRC Handbook standard atomic weights (from memory), worked by
hand.
"""

from __future__ import annotations

import datetime as dt
import json
import os
import re
import shutil
import subprocess
import sys
import time
import zipfile
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from cellchem.adapters.files import MAX_CELL_CHARS, MAX_COLUMNS, MAX_ROWS, UnusableFile
from cellchem.adapters.files import fill_ods as fill_module
from cellchem.adapters.files.fill import FillOptions
from cellchem.adapters.files.fill_ods import fill_ods
from cellchem.adapters.files.ods import check_ods, open_ods
from cellchem.adapters.files.ods_write import Namer, paragraphs
from cellchem.audit import NO_SAVED_VALUE
from cellchem.columns import ColumnOptions
from cellchem.fill import read_columns

ROOT = Path(__file__).resolve().parents[1]
REQUIRED = os.environ.get("CELLCHEM_CALC_TESTS") == "required"
ODS = "application/vnd.oasis.opendocument.spreadsheet"
NS = {
    "office": "urn:oasis:names:tc:opendocument:xmlns:office:1.0",
    "table": "urn:oasis:names:tc:opendocument:xmlns:table:1.0",
    "text": "urn:oasis:names:tc:opendocument:xmlns:text:1.0",
    "style": "urn:oasis:names:tc:opendocument:xmlns:style:1.0",
    "draw": "urn:oasis:names:tc:opendocument:xmlns:drawing:1.0",
    "svg": "urn:oasis:names:tc:opendocument:xmlns:svg-compatible:1.0",
    "calcext": "urn:org:documentfoundation:names:experimental:calc:xmlns:calcext:1.0",
    "of": "urn:oasis:names:tc:opendocument:xmlns:of:1.2",
}
ROOT_TAG = (
    '<office:document-content xmlns:office="{office}" xmlns:table="{table}" xmlns:text="{text}"'
    ' xmlns:style="{style}" xmlns:draw="{draw}" xmlns:svg="{svg}" xmlns:calcext="{calcext}" xmlns:of="{of}"'
    ' office:version="1.3">'
).format(**NS)
MANIFEST = (
    '<?xml version="1.0" encoding="UTF-8"?>\n<manifest:manifest'
    ' xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.3">'
    '<manifest:file-entry manifest:full-path="/" manifest:media-type="{media}"/>'
    '<manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/>{extra}'
    "</manifest:manifest>"
)
FILL = read_columns("formula,name,molar-mass,water,verdict")


# -- building documents -------------------------------------------------------------------------------


def s(text: str, attrs: str = "") -> str:
    return f'<table:table-cell office:value-type="string"{attrs}><text:p>{text}</text:p></table:table-cell>'


def f(value: str, attrs: str = "") -> str:
    return (
        f'<table:table-cell office:value-type="float" office:value="{value}"{attrs}><text:p>{value}</text:p>'
        "</table:table-cell>"
    )


def cell(attrs: str, text: str | None = None) -> str:
    head = f"<table:table-cell {attrs}".rstrip()
    return f"{head}/>" if text is None else f"{head}><text:p>{text}</text:p></table:table-cell>"


def empty(repeat: int = 1) -> str:
    return (
        f'<table:table-cell table:number-columns-repeated="{repeat}"/>'
        if repeat > 1
        else "<table:table-cell/>"
    )


def row(*cells: str, repeat: int = 1, attrs: str = "") -> str:
    rep = f' table:number-rows-repeated="{repeat}"' if repeat > 1 else ""
    return f"<table:table-row{rep}{attrs}>{''.join(cells)}</table:table-row>"


def table(name: str, *rows: str, style: str = "", attrs: str = "") -> str:
    st_ = f' table:style-name="{style}"' if style else ""
    return f'<table:table table:name="{name}"{st_}{attrs}>{"".join(rows)}</table:table>'


def content(*tables: str, styles: str = "", after: str = "") -> str:
    return (
        f'<?xml version="1.0" encoding="UTF-8"?>\n{ROOT_TAG}<office:automatic-styles>{styles}'
        f"</office:automatic-styles><office:body><office:spreadsheet>{''.join(tables)}{after}"
        "</office:spreadsheet></office:body></office:document-content>"
    )


def write_ods(
    path: Path,
    xml: str | bytes,
    *,
    media: str = ODS,
    manifest_extra: str = "",
    extra: dict[str, tuple[bytes, int]] | None = None,
    mimetype: bool = True,
) -> Path:
    """A package as LibreOffice lays it out: mimetype first and stored,
    content.xml deflated, other parts as given (bytes, compression)."""
    with zipfile.ZipFile(path, "w") as z:
        if mimetype:
            z.writestr(zipfile.ZipInfo("mimetype", (2026, 1, 5, 9, 0, 0)), media, zipfile.ZIP_STORED)
        data = xml.encode("utf-8") if isinstance(xml, str) else xml
        z.writestr(zipfile.ZipInfo("content.xml", (2026, 1, 5, 9, 0, 0)), data, zipfile.ZIP_DEFLATED)
        for name, (blob, method) in (extra or {}).items():
            z.writestr(zipfile.ZipInfo(name, (2026, 1, 5, 9, 0, 0)), blob, method)
        z.writestr(
            zipfile.ZipInfo("META-INF/manifest.xml", (2026, 1, 5, 9, 0, 0)),
            MANIFEST.format(media=media, extra=manifest_extra),
            zipfile.ZIP_DEFLATED,
        )
    return path


def rows_of(path: Path, sheet: str | None = None) -> list[tuple[int, list[object]]]:
    with open_ods(path) as book:
        name = sheet or book.sheets[0].name
        return list(book.rows(name))


def stock_table(name: str = "Stock") -> str:
    return table(
        name,
        '<table:table-column table:number-columns-repeated="16384"/>',
        row(s("Item"), s("Formula"), s("MW"), s("CAS No."), empty(16380)),
        row(s("Sodium chloride"), s("NaCl"), f("58.44"), s("7647-14-5"), empty(16380)),
        row(s("Potassium nitrate"), s("KNO3"), f("101.1"), s("7757-79-1"), empty(16380)),
        row(s("Sodium chloride"), s("NaCl2"), f("58.44"), s("7647-14-5"), empty(16380)),
        row(empty(16384), repeat=1048572),
    )


# -- values -------------------------------------------------------------------------------------------


def test_values_of_every_type(tmp_path):
    cells = [
        s("NaCl"),
        f("12"),
        cell('office:value-type="percentage" office:value="0.25"', "25%"),
        cell('office:value-type="currency" office:currency="EUR" office:value="3.5"', "3.50 €"),
        cell('office:value-type="boolean" office:boolean-value="true"', "TRUE"),
        cell('office:value-type="boolean" office:boolean-value="false"', "FALSE"),
        cell('office:value-type="date" office:date-value="2024-01-05"', "05/01/24"),
        cell('office:value-type="date" office:date-value="2024-01-05T10:30:15.5"', "x"),
        cell('office:value-type="time" office:time-value="PT10H30M00S"', "10:30"),
        cell('table:formula="of:=[.B1]*2" office:value-type="float" office:value="24"', "24"),
        cell(
            'table:formula="of:=&quot;ab&quot;" office:value-type="string" office:string-value="ab"'
            ' calcext:value-type="string"',
            "ab",
        ),
        cell('table:formula="of:=ORG.CELLCHEM.SHEET.FUNCTIONS.FORMULA([.A1])"'),
        cell(
            'table:formula="of:=1/0" office:value-type="string" office:string-value=""'
            ' calcext:value-type="error"',
            "#DIV/0!",
        ),
        cell('table:number-columns-spanned="2" office:value-type="string"', "merged"),
        "<table:covered-table-cell/>",
        cell("", "no type"),
        cell('office:value-type="string" office:string-value="from the attribute"', "shown"),
        cell('office:value-type="float" office:value="twelve"', "12 g"),
        cell('office:value-type="float" office:value="1e-3"', "0.001"),
    ]
    path = write_ods(tmp_path / "types.ods", content(table("T", row(*cells))))
    [(number, values)] = rows_of(path)
    assert number == 1
    assert values[:9] == [
        "NaCl",
        12.0,
        0.25,
        3.5,
        True,
        False,
        dt.date(2024, 1, 5),
        dt.datetime(2024, 1, 5, 10, 30, 15, 500000),
        "10:30",  # a time as the cell shows it
    ]
    # a whole number written without a point is an int, as the .xlsx reader gives it (7783202, not 7783202.0)
    assert type(values[1]) is int and type(values[6]) is dt.date
    assert values[9] == 24.0 and values[10] == "ab"
    assert values[11] is NO_SAVED_VALUE  # a formula with no saved value is not an empty cell
    assert values[12] == "#DIV/0!"
    assert values[13] == "merged" and values[14] is None  # a covered cell is a column with no value
    assert values[15] == "no type"
    assert values[16] == "from the attribute"
    assert values[17] == "12 g"  # a value that cannot be read: the cell's text, the cell's problem
    assert values[18] == 0.001


def test_text_paragraphs_spans_spaces_and_what_is_left_out(tmp_path):
    pretty = """<table:table-cell office:value-type="string">
        <text:p>Copper(II)<text:s/> <text:span text:style-name="T1">sulfate</text:span>
            pentahydrate<text:tab/>5H2O<text:line-break/>CAS <text:a xlink:href="x">7758-99-8</text:a>
        </text:p>
        <text:p><text:s text:c="2"/>second   line <text:s/></text:p>
        <office:annotation><text:p>a comment, not the value</text:p></office:annotation>
        <text:p>third<draw:frame><draw:text-box><text:p>in a drawing</text:p></draw:text-box></draw:frame>
        </text:p>
      </table:table-cell>"""
    xml = content(table("T", row(pretty))).replace(
        "office:version", 'xmlns:xlink="http://www.w3.org/1999/xlink" office:version'
    )
    path = write_ods(tmp_path / "text.ods", xml)
    [(_, [value])] = rows_of(path)
    # 6.1.2: spaces and line ends collapse to one space, none at a paragraph's start or end;
    # text:s, text:tab and text:line-break stand for their characters; 6.1.1: comments and drawings left out
    # (a collapsed space before an explicit one stays: it is not the paragraph's last character)
    assert value == "Copper(II)  sulfate pentahydrate\t5H2O\nCAS 7758-99-8\n  second line  \nthird"


def test_hidden_sheets_follow_their_table_style(tmp_path):
    styles = (
        '<style:style style:name="ta1" style:family="table"><style:table-properties table:display="true"/>'
        '</style:style><style:style style:name="ta2" style:family="table">'
        '<style:table-properties table:display="false"/></style:style>'
    )
    styles_xml = (
        f'<?xml version="1.0" encoding="UTF-8"?>\n<office:document-styles xmlns:office="{NS["office"]}"'
        f' xmlns:style="{NS["style"]}" xmlns:table="{NS["table"]}"><office:styles>'
        '<style:style style:name="common" style:family="table">'
        '<style:table-properties table:display="false"/></style:style>'
        "</office:styles></office:document-styles>"
    )
    xml = content(
        table("Shown", row(s("a")), style="ta1"),
        table("Hidden", row(s("b")), style="ta2"),
        table("Plain", row(s("c"))),
        table("HiddenByCommonStyle", row(s("d")), style="common"),
        styles=styles,
    )
    path = write_ods(
        tmp_path / "hidden.ods", xml, extra={"styles.xml": (styles_xml.encode(), zipfile.ZIP_DEFLATED)}
    )
    with open_ods(path) as book:
        assert [(x.name, x.state) for x in book.sheets] == [
            ("Shown", "visible"),
            ("Hidden", "hidden"),
            ("Plain", "visible"),
            ("HiddenByCommonStyle", "hidden"),
        ]
        assert list(book.rows("Hidden")) == [(1, ["b"])]


def test_rows_in_groups_header_rows_and_sub_tables(tmp_path):
    sub = (
        '<table:table-cell office:value-type="string"><text:p>outer</text:p>'
        '<table:table table:name="inner" table:is-sub-table="true">'
        + row(s("inner row"))
        + row(s("another"))
        + "</table:table></table:table-cell>"
    )
    xml = content(
        table(
            "T",
            "<table:table-header-rows>" + row(s("Formula")) + "</table:table-header-rows>",
            "<table:table-row-group>" + row(s("NaCl")),
            "<table:table-row-group>" + row(s("KCl"), repeat=2) + "</table:table-row-group>",
            "</table:table-row-group>",
            "<table:table-rows>" + row(sub) + "</table:table-rows>",
            row(s("last")),
        ),
        table("Second", row(s("other sheet"))),
    )
    path = write_ods(tmp_path / "groups.ods", xml)
    assert rows_of(path) == [
        (1, ["Formula"]),
        (2, ["NaCl"]),
        (3, ["KCl"]),
        (4, ["KCl"]),
        (5, ["outer"]),
        (6, ["last"]),
    ]
    assert rows_of(path, "Second") == [(1, ["other sheet"])]


def test_repeated_rows_and_cells(tmp_path):
    xml = content(
        table(
            "T",
            row(s("Formula"), s("x", ' table:number-columns-repeated="3"'), empty(5), s("y")),
            row(empty(16384), repeat=4),
            row(s("NaCl"), repeat=3),
            row(empty(2), f("1.5")),
        )
    )
    path = write_ods(tmp_path / "repeat.ods", xml)
    assert rows_of(path) == [
        (1, ["Formula", "x", "x", "x", None, None, None, None, None, "y"]),
        (6, ["NaCl"]),
        (7, ["NaCl"]),
        (8, ["NaCl"]),
        (9, [None, None, 1.5]),
    ]


def test_a_row_repeated_a_million_times_and_a_cell_16384_times_cost_nothing(tmp_path):
    xml = content(
        table(
            "T",
            row(s("Formula"), empty(16383)),
            row(empty(16384), repeat=1_000_000),
            row(s("NaCl"), empty(16383)),
            row(empty(16384), repeat=48_574),
        )
    )
    path = write_ods(tmp_path / "million.ods", xml)
    assert path.stat().st_size < 2000
    start = time.process_time()
    assert rows_of(path) == [(1, ["Formula"]), (1_000_002, ["NaCl"])]
    assert time.process_time() - start < 1.0


def test_a_repeated_row_with_content_is_given_once_per_copy_up_to_max_rows(tmp_path):
    xml = content(
        table(
            "T",
            row(s("Formula")),
            row(s("NaCl"), s("x", ' table:number-columns-repeated="16384"'), repeat=2_000_000),
        )
    )
    path = write_ods(tmp_path / "copies.ods", xml)
    with open_ods(path) as book:
        stream = book.rows("T")
        first = [next(stream) for _ in range(3)]
        assert first[0] == (1, ["Formula"])
        assert first[1][0] == 2 and first[2][0] == 3
        assert len(first[1][1]) == MAX_COLUMNS and first[1][1][:2] == ["NaCl", "x"]
        assert stream.truncated  # cells with content beyond MAX_COLUMNS were not read
        stream.keep = frozenset({0})
        numbers = [number for number, _values in stream]
        assert len(numbers) + 3 == MAX_ROWS and numbers[-1] == MAX_ROWS


def test_keep_skips_the_columns_not_needed(tmp_path):
    rows = (row(s(f"a{i}"), s(f"b{i}"), s(f"c{i}")) for i in range(5000))  # several chunks of 64 KiB
    path = write_ods(tmp_path / "keep.ods", content(table("T", *rows)))
    with open_ods(path) as book:
        stream = book.rows("T")
        assert next(stream) == (1, ["a0", "b0", "c0"])
        stream.keep = frozenset({1})
        rest = list(stream)
    assert [values[1] for _n, values in rest] == [f"b{i}" for i in range(1, 5000)]
    # rows parsed before the consumer narrowed the columns may still carry them; the later ones do not
    assert rest[-1] == (5000, [None, "b4999"])
    assert all(values == [None, f"b{n - 1}"] for n, values in rest[-3000:])


def test_a_long_text_is_cut_at_the_cell_limit(tmp_path):
    long = "x" * (3 * MAX_CELL_CHARS)
    path = write_ods(tmp_path / "long.ods", content(table("T", row(s(long), s("after")))))
    [(_, values)] = rows_of(path)
    assert values == ["x" * MAX_CELL_CHARS, "after"]


def test_the_demo_workbook_reads(tmp_path):
    path = ROOT / "workbooks" / "demo-worksheet-functions.ods"
    with open_ods(path) as book:
        assert [x.name for x in book.sheets] == ["Functions"]
        rows = dict(book.rows("Functions"))
    assert rows[4][:4] == ["Item", "Formula", "MW", "CAS No."]
    assert rows[5][:4] == ["Copper(II) sulfate pentahydrate", "CuSO4·5H2O", 249.68, "7758-99-8"]
    assert rows[5][4] is NO_SAVED_VALUE  # an array formula of the add-in, never computed
    formulas = [v[2] for n, v in rows.items() if 11 <= n <= 28]
    assert all(isinstance(x, str) and x.startswith("=CELLCHEM.") for x in formulas)
    assert all(v[1] is NO_SAVED_VALUE for n, v in rows.items() if 11 <= n <= 28)


@given(text=st.text(alphabet=st.sampled_from(list("ab &<>é  \t\n;'\"")), max_size=40))
@settings(max_examples=150, deadline=None)
def test_written_text_reads_back_the_same(text, tmp_path_factory):
    cell = '<table:table-cell office:value-type="string">' + paragraphs(
        text, Namer({"text": NS["text"]}, False)
    )
    path = write_ods(
        tmp_path_factory.mktemp("t") / "t.ods",
        content(table("T", row(s("head")), row(cell + "</table:table-cell>"))),
    )
    got = dict(rows_of(path)).get(2, [None])[0]
    assert got == text


# -- the package ----------------------------------------------------------------------------------------


def check(path: Path):
    with zipfile.ZipFile(path) as z:
        return check_ods(z, f"'{path.name}'")


def test_a_text_document_is_refused(tmp_path):
    path = write_ods(
        tmp_path / "letter.ods",
        content(table("T", row(s("a")))),
        media="application/vnd.oasis.opendocument.text",
    )
    with pytest.raises(UnusableFile) as err:
        check(path)
    assert str(err.value) == (
        "'letter.ods' is an OpenDocument file but a text document (Writer), not a spreadsheet: put the table"
        " in a spreadsheet (LibreOffice Calc) and save it as .ods"
    )


def test_a_template_and_an_unknown_type_are_refused(tmp_path):
    ots = write_ods(tmp_path / "t.ods", content(table("T", row(s("a")))), media=ODS + "-template")
    with pytest.raises(UnusableFile, match="spreadsheet template"):
        check(ots)
    odd = write_ods(tmp_path / "odd.ods", content(table("T", row(s("a")))), media="text/plain")
    with pytest.raises(UnusableFile, match="is not an OpenDocument spreadsheet \\('text/plain'"):
        check(odd)


def test_without_mimetype_the_manifest_says_the_type(tmp_path):
    path = write_ods(tmp_path / "nomime.ods", content(table("T", row(s("a")))), mimetype=False)
    assert [x.name for x in check(path).sheets] == ["T"]


def test_a_password_protected_file_is_refused(tmp_path):
    encryption = (
        '<manifest:file-entry manifest:full-path="settings.xml" manifest:media-type="text/xml">'
        '<manifest:encryption-data manifest:checksum-type="SHA1/1K" manifest:checksum="x">'
        '<manifest:algorithm manifest:algorithm-name="Blowfish CFB" manifest:initialisation-vector="x"/>'
        "</manifest:encryption-data></manifest:file-entry>"
    )
    path = write_ods(tmp_path / "locked.ods", content(table("T", row(s("a")))), manifest_extra=encryption)
    with pytest.raises(UnusableFile) as err:
        check(path)
    assert str(err.value).startswith("'locked.ods' is protected with a password")
    assert "save it without a password" in str(err.value)


def test_no_content_no_sheets_or_no_visible_sheet(tmp_path):
    missing = tmp_path / "nocontent.ods"
    with zipfile.ZipFile(missing, "w") as z:
        z.writestr("mimetype", ODS)
    with pytest.raises(UnusableFile, match=r"has no 'content\.xml'"):
        check(missing)
    none = write_ods(tmp_path / "none.ods", content())
    with pytest.raises(UnusableFile, match="has no sheets"):
        check(none)
    hidden = (
        '<style:style style:name="ta2" style:family="table"><style:table-properties table:display="false"/>'
        "</style:style>"
    )
    allhidden = write_ods(
        tmp_path / "hidden.ods", content(table("Old", row(s("a")), style="ta2"), styles=hidden)
    )
    with pytest.raises(UnusableFile, match="has no visible sheet: all its sheets are hidden: 'Old'"):
        check(allhidden)


def test_malformed_xml_is_a_file_problem_named_in_one_line(tmp_path):
    path = write_ods(
        tmp_path / "broken.ods", content(table("T", row(s("a")))).replace("</table:table-row>", "", 1)
    )
    with pytest.raises(UnusableFile) as err:
        check(path)
    message = str(err.value)
    assert message.startswith("'broken.ods' is damaged: 'content.xml' is not well-formed XML (")
    assert "\n" not in message


@pytest.mark.parametrize(
    "prolog, words",
    [
        ('<!DOCTYPE office:document-content [<!ENTITY lol "lol">]>', "document type or entity declaration"),
        ("<!DOCTYPE office:document-content>", "document type or entity declaration"),
        ('<!DOCTYPE x SYSTEM "file:///etc/passwd">', "document type or entity declaration"),
    ],
    ids=["entity", "doctype", "external"],
)
def test_doctypes_and_entities_are_refused(tmp_path, prolog, words):
    xml = content(table("T", row(s("a")))).replace("\n", "\n" + prolog, 1)
    path = write_ods(tmp_path / "dtd.ods", xml)
    with pytest.raises(UnusableFile, match=words):
        check(path)


def test_an_external_entity_in_the_rows_is_refused(tmp_path):
    # no declaration: expat refuses the undefined entity as malformed XML
    path = write_ods(tmp_path / "ref.ods", content(table("T", row(s("&ext;")))))
    with pytest.raises(UnusableFile, match="not well-formed"):
        check(path)


def test_a_huge_tag_is_refused(tmp_path):
    attr = "A" * (5 << 20)
    path = write_ods(tmp_path / "tag.ods", content(table("T", row(s("a", f' office:string-value="{attr}"')))))
    start = time.process_time()
    with pytest.raises(UnusableFile, match="a single XML tag, comment or instruction of more than"):
        check(path)
    assert time.process_time() - start < 5


# -- bombs: a 1 GiB content.xml, read in a child process whose time and memory are measured ----------


def _bomb(path: Path, head: bytes, filler: bytes, tail: bytes, size: int = 1 << 30) -> Path:
    with zipfile.ZipFile(path, "w", compresslevel=1) as z:
        z.writestr("mimetype", ODS, zipfile.ZIP_STORED)
        info = zipfile.ZipInfo("content.xml")
        info.compress_type = zipfile.ZIP_DEFLATED
        block = filler * ((1 << 20) // len(filler))
        with z.open(info, "w", force_zip64=True) as fh:
            fh.write(head)
            written = len(head) + len(tail)
            while written + len(block) <= size:
                fh.write(block)
                written += len(block)
            fh.write(tail)
        z.writestr("META-INF/manifest.xml", MANIFEST.format(media=ODS, extra=""), zipfile.ZIP_DEFLATED)
    return path


@pytest.fixture(scope="module")
def bombs(tmp_path_factory):
    folder = tmp_path_factory.mktemp("bombs")
    head = f'<?xml version="1.0" encoding="UTF-8"?>\n{ROOT_TAG}<office:body><office:spreadsheet>'.encode()
    sheet = ('<table:table table:name="T">' + row(s("a"))).encode()
    tail = b"</table:table></office:spreadsheet></office:body></office:document-content>"
    return {
        "whitespace": _bomb(folder / "white.ods", head + sheet, b" \n", tail),
        "cells": _bomb(
            folder / "cells.ods",
            head + sheet + b"<table:table-row>",
            b"<table:table-cell/>",
            b"</table:table-row>" + tail,
        ),
        "rows": _bomb(
            folder / "rows.ods", head + sheet, b"<table:table-row><table:table-cell/></table:table-row>", tail
        ),
    }


_MEASURE = """
import resource, sys, time
from pathlib import Path
from cellchem.adapters.files.ods import open_ods
path = Path(sys.argv[1])
outcome = "finished"
try:
    with open_ods(path) as book:
        for sheet in book.sheets:
            for _ in book.rows(sheet.name):
                pass
except Exception as exc:
    outcome = type(exc).__name__ + ": " + str(exc)
usage = resource.getrusage(resource.RUSAGE_SELF)
cpu = usage.ru_utime + usage.ru_stime
print(json.dumps({"outcome": outcome, "cpu": cpu, "rss_mb": usage.ru_maxrss / 1024}))
"""


@pytest.mark.slow
@pytest.mark.parametrize("kind", ["whitespace", "cells", "rows"])
def test_a_one_gib_content_is_refused_or_read_within_10_s_and_1_gb(bombs, kind):
    done = subprocess.run(
        [sys.executable, "-c", "import json\n" + _MEASURE, str(bombs[kind])],
        capture_output=True,
        text=True,
        timeout=300,
        check=True,
    )
    result = json.loads(done.stdout.strip().splitlines()[-1])
    assert result["cpu"] < 10, result
    assert result["rss_mb"] < 1024, result
    assert result["outcome"].startswith("UnusableFile"), result
    assert "\n" not in result["outcome"]


# -- fill -------------------------------------------------------------------------------------------------


def _parts(path: Path) -> list[tuple[str, int, bytes]]:
    with zipfile.ZipFile(path) as z:
        return [(i.filename, i.compress_type, z.read(i)) for i in z.infolist()]


@pytest.fixture
def stock(tmp_path):
    """A stock list with the parts LibreOffice writes around content.xml."""
    extra = {
        "styles.xml": (
            b'<?xml version="1.0" encoding="UTF-8"?>\n<office:document-styles xmlns:office="'
            + NS["office"].encode()
            + b'"/>',
            zipfile.ZIP_DEFLATED,
        ),
        "meta.xml": (
            b"<?xml version='1.0'?><office:document-meta xmlns:office='" + NS["office"].encode() + b"'/>",
            zipfile.ZIP_DEFLATED,
        ),
        "settings.xml": (b"<settings/>", zipfile.ZIP_DEFLATED),
        "Thumbnails/thumbnail.png": (bytes(range(256)) * 4, zipfile.ZIP_STORED),
        "Configurations2/toolbar/": (b"", zipfile.ZIP_STORED),
    }
    named = (
        '<table:named-expressions><table:named-range table:name="stock" table:base-cell-address="$Stock.$A$1"'
        ' table:cell-range-address="$Stock.$A$1:.$D$4"/></table:named-expressions>'
    )
    return write_ods(
        tmp_path / "stock.ods",
        content(stock_table(), table("Notes", row(s("kept as it is"))), after=named),
        extra=extra,
    )


def test_fill_copies_every_other_part_byte_for_byte(stock, tmp_path):
    out = tmp_path / "stock-filled.ods"
    report = fill_ods(stock, out, FillOptions(columns=FILL))
    assert report.filled == 2 and report.header_row == 1 and report.sheet == "Stock"
    before, after = _parts(stock), _parts(out)
    assert [p[0] for p in after] == [p[0] for p in before]
    assert after[0][:2] == ("mimetype", zipfile.ZIP_STORED)
    with open(out, "rb") as fh:
        assert fh.read(38 + 46)[30:] == b"mimetype" + ODS.encode()  # readable at a fixed offset
    for (name, method, data), (_name, method2, data2) in zip(before, after, strict=True):
        assert method == method2, name
        if name != "content.xml":
            assert data == data2, name


def test_fill_takes_what_the_checks_learned(stock, tmp_path, monkeypatch):
    facts = check(stock)
    monkeypatch.setattr(fill_module, "check_ods", lambda *_a: pytest.fail("checked twice"))
    report = fill_ods(stock, tmp_path / "out.ods", FillOptions(columns=FILL), None, facts)
    assert report.filled == 2


def test_fill_keeps_every_original_cell_and_adds_after_the_last_used_column(stock, tmp_path):
    out = tmp_path / "stock-filled.ods"
    report = fill_ods(stock, out, FillOptions(columns=FILL))
    assert report.columns == [
        ("E", "Formula (canonical)"),
        ("F", "Systematic name"),
        ("G", "Molar mass (g/mol)"),
        ("H", "Water of crystallisation"),
        ("I", "cellchem check"),
    ]
    old, new = dict(rows_of(stock)), dict(rows_of(out))
    assert set(new) == set(old)
    for number, values in old.items():
        assert new[number][: len(values)] == values
    assert new[1][4:] == [
        "Formula (canonical)",
        "Systematic name",
        "Molar mass (g/mol)",
        "Water of crystallisation",
        "cellchem check",
    ]
    # CIAAW standard atomic weights, conventional values (from memory): Na 22.98977, Cl 35.45, K 39.0983,
    # N 14.007, O 15.999
    assert new[2][4:8] == ["NaCl", "sodium chloride", pytest.approx(22.98977 + 35.45, abs=0.01), 0.0]
    assert new[2][8] == "ok"
    assert new[3][6] == pytest.approx(39.0983 + 14.007 + 3 * 15.999, abs=0.01)  # KNO3
    assert new[4][4:8] == [None, None, None, None] and new[4][8].startswith(
        "error:"
    )  # NaCl2: nothing computed
    assert rows_of(out, "Notes") == [(1, ["kept as it is"])]
    with zipfile.ZipFile(out) as z:
        xml = z.read("content.xml").decode()
    # the trailing block of empty cells is split around the new cells, never expanded: each row still
    # declares 16,384 columns
    for element in re.findall(r"<table:table-row>.*?</table:table-row>", xml.split('table:name="Notes"')[0]):
        counts = [
            int(n or 1)
            for n in re.findall(
                r"<table:(?:covered-)?table-cell(?: table:number-columns-repeated=\"(\d+)\")?", element
            )
        ]
        assert sum(counts) == 16384
    assert xml.count("<table:table-row") == 6  # 5 rows in Stock, 1 in Notes: nothing expanded
    assert (
        '<table:table-cell table:style-name="cellchem-2dp" office:value-type="float" office:value="58.4'
        in xml
    )


def test_a_repeated_data_row_stays_repeated_and_a_header_inside_a_block_is_split(tmp_path):
    xml = content(
        table(
            "T",
            row(s("Formula"), s("Name"), repeat=2),
            row(s("KCl"), s("potassium chloride"), empty(100), repeat=3),
        )
    )
    path = write_ods(tmp_path / "rep.ods", xml)
    out = tmp_path / "rep-filled.ods"
    options = FillOptions(columns=read_columns("molar-mass"), column_options=ColumnOptions(header_row=1))
    report = fill_ods(path, out, options)
    assert report.header_row == 1 and report.filled == 3
    rows = rows_of(out)
    assert rows[0] == (1, ["Formula", "Name", "Molar mass (g/mol)"])
    assert rows[1][0] == 2 and rows[1][1][:2] == ["Formula", "Name"] and rows[1][1][2:] in ([], [None])
    for _number, values in rows[2:]:
        assert values == ["KCl", "potassium chloride", pytest.approx(39.0983 + 35.45, abs=0.01)]
    with zipfile.ZipFile(out) as z:
        text = z.read("content.xml").decode()
    assert text.count("<table:table-row") == 3  # the header block split in two, the data row still one
    assert 'table:number-rows-repeated="3"' in text


def test_an_existing_column_is_filled_in_place_only_where_empty(tmp_path):
    xml = content(
        table(
            "T",
            row(s("Name"), s("Formula"), s("Molar mass (g/mol)")),
            row(s("sodium chloride"), s("NaCl"), empty()),
            row(s("potassium chloride"), s("KCl"), f("70")),
            row(
                s("potassium nitrate"),
                s("KNO3"),
                cell('table:formula="of:=1+1" office:value-type="float" office:value="2"', "2"),
            ),
        )
    )
    path = write_ods(tmp_path / "inplace.ods", xml)
    out = tmp_path / "inplace-filled.ods"
    report = fill_ods(path, out, FillOptions(columns=read_columns("molar-mass")))
    assert report.columns == [("C", "Molar mass (g/mol)")]
    assert report.kept_existing == 2
    values = dict(rows_of(out))
    assert values[2][2] == pytest.approx(22.98977 + 35.45, abs=0.01)
    assert values[3][2] == 70.0 and values[4][2] == 2.0
    over = tmp_path / "over.ods"
    report = fill_ods(path, over, FillOptions(columns=read_columns("molar-mass"), overwrite=True))
    values = dict(rows_of(over))
    assert values[3][2] == pytest.approx(39.0983 + 35.45, abs=0.01)  # a stated value replaced
    assert values[4][2] == 2.0  # a formula never
    assert report.kept_existing == 1


def _renamed(xml: str, prefixes: dict[str, str]) -> str:
    """The document with its prefixes renamed (``table`` -> ``ta`` ...)."""
    for old, new in prefixes.items():
        xml = re.sub(rf"(?<=[<\s/]){old}:", f"{new}:", xml).replace(f"xmlns:{old}=", f"xmlns:{new}=")
    return xml


@pytest.mark.parametrize(
    "variant",
    ["own prefixes", "declared on the sheet", "default namespace"],
)
def test_fill_writes_in_the_documents_own_namespaces(tmp_path, variant):
    xml = content(stock_table())
    if variant == "own prefixes":
        xml = _renamed(xml, {"table": "ta", "office": "o", "text": "tx"})
    elif variant == "declared on the sheet":  # the sheet rebinds a prefix: new cells declare their own
        xml = xml.replace(
            '<table:table table:name="Stock"', f'<table:table xmlns:text="{NS["text"]}" table:name="Stock"'
        )
    else:  # the table elements unprefixed: attributes still need a prefix
        xml = re.sub(r"(</?)table:", r"\1", xml).replace(" table:", " t:")
        xml = xml.replace(f'xmlns:table="{NS["table"]}"', f'xmlns="{NS["table"]}" xmlns:t="{NS["table"]}"')
    path = write_ods(tmp_path / "ns.ods", xml)
    assert dict(rows_of(path))[2][:4] == ["Sodium chloride", "NaCl", 58.44, "7647-14-5"]
    out = tmp_path / "ns-filled.ods"
    report = fill_ods(path, out, FillOptions(columns=FILL))
    assert report.filled == 2
    new = dict(rows_of(out))
    assert new[1][4] == "Formula (canonical)"
    assert new[2][4:7] == ["NaCl", "sodium chloride", pytest.approx(22.98977 + 35.45, abs=0.01)]
    with zipfile.ZipFile(out) as z:
        written = z.read("content.xml").decode()
    if variant == "own prefixes":
        assert '<ta:table-cell o:value-type="string"><tx:p>NaCl</tx:p>' in written
        assert not re.search(r"[<\s/](table|office|text|cctable|ccoffice|cctext):", written)
    elif variant == "declared on the sheet":
        assert 'xmlns:cctext="' + NS["text"] + '"' in written


def test_fill_refuses_a_content_part_not_in_utf_8(tmp_path):
    xml = content(stock_table()).replace('encoding="UTF-8"', 'encoding="UTF-16"')
    path = write_ods(tmp_path / "utf16.ods", xml.encode("utf-16"))
    assert dict(rows_of(path))[2][1] == "NaCl"  # read as any XML parser reads it
    with pytest.raises(UnusableFile, match="is not written in UTF-8"):
        fill_ods(path, tmp_path / "out.ods", FillOptions(columns=FILL))


def test_fill_refuses_a_signed_document_and_a_protected_sheet(stock, tmp_path):
    signed = tmp_path / "signed.ods"
    shutil.copy(stock, signed)
    with zipfile.ZipFile(signed, "a") as z:
        z.writestr("META-INF/documentsignatures.xml", "<document-signatures/>")
    with pytest.raises(UnusableFile, match="carries a digital signature"):
        fill_ods(signed, tmp_path / "out.ods", FillOptions(columns=FILL))
    protected = write_ods(
        tmp_path / "protected.ods",
        content(stock_table().replace('table:name="Stock"', 'table:name="Stock" table:protected="true"')),
    )
    with pytest.raises(UnusableFile, match=r"sheet 'Stock' of 'protected\.ods' is protected"):
        fill_ods(protected, tmp_path / "out.ods", FillOptions(columns=FILL))
    assert not (tmp_path / "out.ods").exists()


def test_the_findings_sheet_goes_after_the_last_sheet_with_a_title_of_its_own(stock, tmp_path):
    out = tmp_path / "annotated.ods"
    rows = [
        ["Cell", "Sheet", "Row", "Message"],
        ["B4", "Stock", 4, "=the formula  NaCl2 & <its> name\tdisagree"],
    ]
    report = fill_ods(stock, out, FillOptions(columns=read_columns("verdict")), ("Notes", rows))
    assert "sheet 'Notes 2' added" in report.notes
    with open_ods(out) as book:
        assert [x.name for x in book.sheets] == ["Stock", "Notes", "Notes 2"]
        assert list(book.rows("Notes 2")) == [(1, rows[0]), (2, ["B4", "Stock", 4.0, rows[1][3]])]
    with zipfile.ZipFile(out) as z:
        xml = z.read("content.xml").decode()
    assert xml.index('table:name="Notes 2"') < xml.index("<table:named-expressions>")


def test_a_copy_that_does_not_check_out_is_not_written(stock, tmp_path, monkeypatch):
    original = fill_module.rewrite_content

    def tampered(zf, facts, table, out, *args, **kwargs):
        result = original(zf, facts, table, out, *args, **kwargs)
        out.seek(0)
        data = out.read().replace(b"<text:p>7757-79-1</text:p>", b"<text:p>7757-79-2</text:p>")
        out.seek(0)
        out.truncate()
        out.write(data)
        return result

    monkeypatch.setattr(fill_module, "rewrite_content", tampered)
    out = tmp_path / "never.ods"
    with pytest.raises(UnusableFile, match="cell D3 of the sheet filled changed"):
        fill_ods(stock, out, FillOptions(columns=FILL))
    assert not out.exists()
    assert [p.name for p in tmp_path.iterdir()] == ["stock.ods"]


def test_fill_and_audit_from_the_command_line(stock, tmp_path, capsys):
    from cellchem.cli import main

    out = tmp_path / "cli-filled.ods"
    assert main(["fill", str(stock), "-o", str(out)]) == 1  # one line not filled (its formula is wrong)
    assert "lines filled: 2" in capsys.readouterr().out
    assert dict(rows_of(out))[2][4] == "NaCl"
    report = tmp_path / "findings.json"
    main(["audit", str(stock), "--report", str(report)])
    found = json.loads(report.read_text(encoding="utf-8"))
    assert any(f["row"] == 4 and f["column"] == "B" and f["severity"] == "error" for f in found)


def test_memory_stays_flat_on_a_large_sheet(tmp_path):
    """A sheet ten times longer costs no more memory: a 2,000-row fill and then a 20,000-row fill in
    one process, the peak measured after each."""

    def sheet(rows: int) -> Path:
        body = "".join(
            row(s("Sodium chloride"), s("NaCl"), f("58.44"), s(f"S{i} " + "n" * 1000), empty(16380))
            for i in range(rows)
        )
        xml = content(table("Stock", row(s("Name"), s("Formula"), s("MW"), s("Notes"), empty(16380)) + body))
        return write_ods(tmp_path / f"rows-{rows}.ods", xml)

    small, large = sheet(2_000), sheet(20_000)
    script = (
        "import resource, sys\nfrom pathlib import Path\n"
        "from cellchem.adapters.files.fill import FillOptions\n"
        "from cellchem.adapters.files.fill_ods import fill_ods\n"
        "from cellchem.fill import read_columns\n"
        "options = FillOptions(columns=read_columns('formula,molar-mass'))\n"
        "for source in sys.argv[1:]:\n"
        "    r = fill_ods(Path(source), Path(source + '-filled.ods'), options)\n"
        "    print(r.filled, resource.getrusage(resource.RUSAGE_SELF).ru_maxrss // 1024)\n"
    )
    done = subprocess.run(
        [sys.executable, "-c", script, str(small), str(large)],
        capture_output=True,
        text=True,
        timeout=600,
        check=True,
    )
    (filled_small, peak_small), (filled_large, peak_large) = (
        map(int, x.split()) for x in done.stdout.splitlines()
    )
    assert (filled_small, filled_large) == (2_000, 20_000)
    # the large content.xml is 27 MB: memory holds a chunk and a row at a time, never the part
    assert peak_large - peak_small < 10, (peak_small, peak_large)


# -- LibreOffice ------------------------------------------------------------------------------------------


def _soffice() -> str | None:
    return shutil.which("soffice") or shutil.which("libreoffice")


@pytest.fixture(scope="module")
def office(tmp_path_factory):
    found = _soffice()
    if found is None:
        if REQUIRED:
            pytest.fail("CELLCHEM_CALC_TESTS=required but LibreOffice (soffice) is not installed")
        pytest.skip("LibreOffice is not installed (CI installs it)")
    profile = tmp_path_factory.mktemp("lo-profile")

    def convert(source: Path, to: str, outdir: Path) -> Path:
        subprocess.run(
            [
                found,
                f"-env:UserInstallation=file://{profile}",
                "--headless",
                "--convert-to",
                to,
                "--outdir",
                str(outdir),
                str(source),
            ],
            check=True,
            capture_output=True,
            timeout=180,
        )
        extension = to.split(":")[0]
        produced = sorted(outdir.glob(f"{source.stem}*.{extension}"))
        assert produced, f"LibreOffice wrote no {extension}"
        return produced[0]

    return convert


@pytest.fixture(scope="module")
def libreoffice_stock(office, tmp_path_factory):
    """A stock list made with openpyxl and saved as .ods by LibreOffice."""
    import openpyxl

    folder = tmp_path_factory.mktemp("lo")
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Stock"
    ws.append(["Item", "Formula", "MW", "CAS No.", "Received", "Checked"])
    ws.append(["Sodium chloride", "NaCl", 58.44, "7647-14-5", dt.date(2024, 1, 5), True])
    ws.append(
        [
            "Copper(II)  sulfate pentahydrate",
            "CuSO4.5H2O",
            249.68,
            "7758-99-8",
            dt.datetime(2024, 2, 1, 9, 30),
            False,
        ]
    )
    ws.append(["Potassium nitrate", "KNO3", "=50.55*2", "7757-79-1", None, None])
    ws.merge_cells("H2:I3")
    ws["H2"] = "merged note"
    hidden = wb.create_sheet("Old prices")
    hidden["A1"] = "kept"
    hidden.sheet_state = "hidden"
    source = folder / "stock.xlsx"
    wb.save(source)
    return office(source, "ods", folder)


def test_libreoffice_files_read_as_calamine_reads_them(libreoffice_stock):
    import python_calamine

    with open_ods(libreoffice_stock) as book:
        assert [(x.name, x.state) for x in book.sheets] == [("Stock", "visible"), ("Old prices", "hidden")]
        ours = dict(book.rows("Stock"))
    theirs = (
        python_calamine.CalamineWorkbook.from_path(str(libreoffice_stock))
        .get_sheet_by_name("Stock")
        .to_python()
    )
    for number, values in ours.items():
        other = theirs[number - 1]
        for column, value in enumerate(values):
            if isinstance(value, bool) or value is None:
                continue
            expected = other[column]
            if isinstance(value, dt.datetime | dt.date):
                assert value == expected or str(value)[:10] == str(expected)[:10]
            elif isinstance(value, float):
                assert value == pytest.approx(float(expected))
            else:
                assert value == expected, (number, column)
    assert ours[3][0] == "Copper(II)  sulfate pentahydrate"  # two spaces: text:s
    assert ours[4][2] == pytest.approx(101.1)  # a formula's saved value


def test_a_filled_copy_reads_back_in_libreoffice(libreoffice_stock, office, tmp_path):
    out = tmp_path / "stock-filled.ods"
    report = fill_ods(
        libreoffice_stock,
        out,
        FillOptions(columns=FILL),
        ("cellchem findings", [["Cell", "Message"], ["B3", "x"]]),
    )
    assert report.filled == 3
    assert [c[0] for c in report.columns] == ["J", "K", "L", "M", "N"]  # after the merged range H:I
    for name, method, data in _parts(libreoffice_stock):
        if name != "content.xml":
            assert (name, method, data) in _parts(out)
    csv_path = office(
        out, "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,true,false,false,1", tmp_path / "csv"
    )
    lines = csv_path.read_text(encoding="utf-8").splitlines()
    header = lines[0].split(",")
    assert header[:4] == ["Item", "Formula", "MW", "CAS No."]
    assert header[9:14] == [
        "Formula (canonical)",
        "Systematic name",
        "Molar mass (g/mol)",
        "Water of crystallisation",
        "cellchem check",
    ]
    first = lines[1].split(",")
    assert first[:4] == ["Sodium chloride", "NaCl", "58.44", "7647-14-5"]
    assert first[9:13] == ["NaCl", "sodium chloride", "58.44", "0"]  # shown with two decimals
    assert lines[3].split(",")[2] == "101.1"  # the formula's value, kept
    assert "merged note" in lines[1]
