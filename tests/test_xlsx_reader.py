"""The one workbook reader (cellchem.adapters.files.xlsx) against openpyxl as
an oracle, and against cell layouts written here as the OOXML standard lays
them out (ECMA-376 Part 1, 18.3.1.4 c, 18.3.1.40 f, 18.3.1.96 v, 18.3.1.73
row; from memory): formula cells with and without a saved value, rows and
cells without references, prefixed element names, any chunking of the part,
and the columns a consumer keeps."""

from __future__ import annotations

import datetime as dt
import zipfile
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from cellchem.adapters.files import MAX_CELL_CHARS, MAX_COLUMNS, OTHER_CELLS, UnusableFile, xlsx
from cellchem.audit import NO_SAVED_VALUE, NOT_RECALCULATED
from cellchem.columns import column_letter

openpyxl = pytest.importorskip("openpyxl")

MAIN = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
R = "http://schemas.openxmlformats.org/officeDocument/2006/relationships"
PR = "http://schemas.openxmlformats.org/package/2006/relationships"


def package(path: Path, sheet: bytes, *, recalculate: bool = False, styles: bytes | None = None) -> Path:
    """A minimal workbook package around one sheet part."""
    calc = '<calcPr fullCalcOnLoad="1"/>' if recalculate else ""
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as z:
        z.writestr(
            "[Content_Types].xml",
            '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
            '<Default Extension="rels"'
            ' ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
            '<Default Extension="xml" ContentType="application/xml"/></Types>',
        )
        z.writestr(
            "_rels/.rels",
            f'<Relationships xmlns="{PR}"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/'
            'officeDocument/2006/relationships/officeDocument" Target="xl/workbook.xml"/></Relationships>',
        )
        z.writestr(
            "xl/workbook.xml",
            f'<workbook xmlns="{MAIN}" xmlns:r="{R}"><sheets><sheet name="Stock" sheetId="1" r:id="rId1"/>'
            f"</sheets>{calc}</workbook>",
        )
        rels = (
            '<Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/'
            'relationships/worksheet" Target="worksheets/sheet1.xml"/>'
        )
        if styles is not None:
            rels += (
                '<Relationship Id="rId2" Type="http://schemas.openxmlformats.org/officeDocument/2006/'
                'relationships/styles" Target="styles.xml"/>'
            )
            z.writestr("xl/styles.xml", styles)
        z.writestr("xl/_rels/workbook.xml.rels", f'<Relationships xmlns="{PR}">{rels}</Relationships>')
        z.writestr("xl/worksheets/sheet1.xml", sheet)
    return path


KINDS = ("value", "saved", "empty", "none", "shared", "text", "blank")


def _cell(ref: str | None, kind: str, p: str) -> str:
    body = {
        "value": f"<{p}v>58.44</{p}v>",
        "saved": f"<{p}f>22.99+35.45</{p}f><{p}v>58.44</{p}v>",
        "empty": f"<{p}f>22.99+35.45</{p}f><{p}v></{p}v>",
        "none": f"<{p}f>22.99+35.45</{p}f>",
        "shared": f'<{p}f t="shared" si="0"/>',
        "text": f"<{p}is><{p}t>Na&amp;Cl &lt;1&gt;</{p}t></{p}is>",
        "blank": "",
    }[kind]
    t = ' t="inlineStr"' if kind == "text" else ""
    r = f' r="{ref}"' if ref else ""
    return f'<{p}c{r} s="1"{t}>{body}</{p}c>' if body else f'<{p}c{r} s="1"/>'


def _expected(kind: str, recalculate: bool) -> object:
    if kind in ("empty", "none", "shared"):
        return NO_SAVED_VALUE
    if kind == "saved":
        return NOT_RECALCULATED if recalculate else 58.44
    return {"value": 58.44, "text": "Na&Cl <1>", "blank": None}[kind]


@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(
    rows=st.lists(st.lists(st.sampled_from(KINDS), min_size=1, max_size=6), min_size=1, max_size=20),
    prefix=st.sampled_from(["", "x"]),
    recalculate=st.booleans(),
    refs=st.booleans(),
    chunk=st.sampled_from([1, 7, 64, 1 << 16]),
    keep=st.one_of(st.none(), st.frozensets(st.integers(0, 5), min_size=1)),
)
def test_cells_read_however_written_and_chunked(
    tmp_path, monkeypatch, rows, prefix, recalculate, refs, chunk, keep
):
    p = f"{prefix}:" if prefix else ""
    ns = f' xmlns:{prefix}="{MAIN}"' if prefix else f' xmlns="{MAIN}"'
    out = [f'<?xml version="1.0" encoding="UTF-8"?><{p}worksheet{ns}><{p}sheetData>']
    for r, kinds in enumerate(rows, 1):
        out.append(f'<{p}row r="{r}">' if refs else f"<{p}row>")
        out.extend(_cell(f"{column_letter(c)}{r}" if refs else None, k, p) for c, k in enumerate(kinds))
        out.append(f"</{p}row>")
    out.append(f"</{p}sheetData></{p}worksheet>")
    path = package(tmp_path / f"t{chunk}{prefix}{refs}.xlsx", "".join(out).encode(), recalculate=recalculate)
    monkeypatch.setattr(xlsx, "_CHUNK", chunk)
    with xlsx.Book(path) as book:
        stream = book.rows("Stock")
        stream.keep = keep
        got = {n: v for n, v in stream}
    for r, kinds in enumerate(rows, 1):
        expected = [_expected(k, recalculate) for k in kinds]
        if keep is not None:
            expected = [v if i in keep else None for i, v in enumerate(expected)]
            if all(v is None for v in expected) and any(
                k != "blank" for i, k in enumerate(kinds) if i not in keep
            ):  # a row with content only in columns not kept is not blank
                free = min(i for i in range(7) if i not in keep)
                expected = [None] * free + [OTHER_CELLS]
        values = got.get(r, [])
        values = values + [None] * (len(expected) - len(values))
        assert values == expected, (r, kinds)


TEXT = st.text(
    alphabet=st.characters(blacklist_categories=("Cs", "Cc"), blacklist_characters="\r"), max_size=20
).filter(lambda s: not s.startswith("="))  # openpyxl writes a text starting with = as a formula
VALUE = st.one_of(
    st.none(),
    TEXT,
    st.integers(-(10**12), 10**12),
    st.floats(allow_nan=False, allow_infinity=False, width=64),
    st.booleans(),
    st.datetimes(min_value=dt.datetime(1901, 1, 1), max_value=dt.datetime(2099, 12, 31)).map(
        lambda d: d.replace(microsecond=0)
    ),
)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(grid=st.lists(st.lists(VALUE, min_size=1, max_size=8), min_size=1, max_size=15), shared=st.booleans())
def test_same_values_as_openpyxl(tmp_path, grid, shared):
    """openpyxl (a general-purpose reader, used here as the oracle) and the
    reader give the same value for every cell, strings shared or inline."""
    path = tmp_path / "oracle.xlsx"
    if shared:
        wb = openpyxl.Workbook()
        ws = wb.active
    else:
        wb = openpyxl.Workbook(write_only=True)
        ws = wb.create_sheet()
    ws.title = "Stock"
    for row in grid:
        ws.append(row)
    wb.save(path)
    oracle = openpyxl.load_workbook(path, read_only=True, data_only=True)
    expected = {i: [v for v in row] for i, row in enumerate(oracle["Stock"].iter_rows(values_only=True), 1)}
    oracle.close()
    with xlsx.Book(path) as book:
        got = dict(book.rows("Stock"))
    for number, row in expected.items():
        values = got.get(number, [])
        values = values + [None] * (len(row) - len(values))
        assert values == list(row), number


def test_caps_while_streaming(tmp_path):
    """A text longer than a cell holds is cut as it arrives; cells beyond
    the column cap are not kept and the stream says so."""
    long_text = "x" * (MAX_CELL_CHARS * 3)
    cells = "".join(f'<c r="{column_letter(i)}1"><v>{i}</v></c>' for i in range(MAX_COLUMNS + 5))
    sheet = (
        f'<worksheet xmlns="{MAIN}"><sheetData><row r="1">{cells}</row><row r="2"><c r="A2" t="inlineStr">'
        f"<is><t>{long_text}</t></is></c></row></sheetData></worksheet>"
    ).encode()
    with xlsx.Book(package(tmp_path / "caps.xlsx", sheet)) as book:
        stream = book.rows("Stock")
        rows = dict(stream)
    assert len(rows[1]) == MAX_COLUMNS and stream.truncated
    assert rows[2][0] == "x" * MAX_CELL_CHARS


def test_dates_by_number_format(tmp_path):
    """A number in a cell whose format shows a date reads as the date (the
    1900 date system: 45000 is 2023-03-15, common practice)."""
    styles = (
        f'<styleSheet xmlns="{MAIN}"><numFmts count="1"><numFmt numFmtId="164" formatCode="dd/mm/yyyy"/>'
        '</numFmts><cellXfs count="3"><xf numFmtId="0"/><xf numFmtId="164"/><xf numFmtId="14"/></cellXfs>'
        "</styleSheet>"
    ).encode()
    sheet = (
        f'<worksheet xmlns="{MAIN}"><sheetData><row r="1"><c r="A1" s="1"><v>45000</v></c>'
        '<c r="B1" s="2"><v>45000.5</v></c><c r="C1"><v>45000</v></c></row></sheetData></worksheet>'
    ).encode()
    with xlsx.Book(package(tmp_path / "dates.xlsx", sheet, styles=styles)) as book:
        rows = dict(book.rows("Stock"))
    assert rows[1] == [dt.datetime(2023, 3, 15), dt.datetime(2023, 3, 15, 12), 45000]


def test_a_document_type_is_refused(tmp_path):
    sheet = (
        f'<?xml version="1.0"?><!DOCTYPE worksheet [<!ENTITY a "NaCl">]><worksheet xmlns="{MAIN}">'
        '<sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>&a;</t></is></c></row></sheetData></worksheet>'
    ).encode()
    with xlsx.Book(package(tmp_path / "dtd.xlsx", sheet)) as book:
        with pytest.raises(UnusableFile, match="could not be read"):
            list(book.rows("Stock"))
