"""Writing the audit's findings: JSON, CSV and a findings workbook.

Reports are new files; the input is never touched. Text that came from the
input (sheet names, quoted cells inside messages) can start with ``=``, ``+``,
``-`` or ``@``, which a spreadsheet program would run as a formula: in CSV
such a field is written with a leading apostrophe, in the workbook every text
cell is stored as text (never as a formula). JSON is data and is written as is.
"""

from __future__ import annotations

import csv
import io
import json
from collections.abc import Callable, Sequence
from dataclasses import asdict, dataclass
from pathlib import Path

from .writer import write_atomically

FIELDS = ("file", "sheet", "row", "column", "check", "severity", "message", "suggestion")
_RISKY = ("=", "+", "-", "@", "\t", "\r")


@dataclass(frozen=True)
class FindingRecord:
    """One finding, located: the rows of every report."""

    file: str
    sheet: str
    row: int
    column: str
    check: str
    severity: str
    message: str
    suggestion: str


def defuse(text: str) -> str:
    """A text field made safe for a spreadsheet: a leading apostrophe before
    a first character that would start a formula.

    >>> defuse("=HYPERLINK(1)"), defuse("NaCl")
    ("'=HYPERLINK(1)", 'NaCl')
    """
    if text and text[0] in _RISKY:
        return "'" + text
    return text


def replace_atomically(path: str | Path, write: Callable[[Path], None]) -> None:
    """For a writer that needs a path: ``write(temporary path)`` in the
    output's folder, then ``write_atomically``'s promises. Prefer
    ``write_atomically`` with a file object."""
    import shutil
    import tempfile

    path = Path(path)
    with tempfile.TemporaryDirectory(prefix=".cellchem-", dir=path.parent if str(path.parent) else ".") as d:
        tmp = Path(d) / ("part" + path.suffix)
        write(tmp)

        def copy(fh) -> None:
            with tmp.open("rb") as src:
                shutil.copyfileobj(src, fh, 1 << 20)

        write_atomically(path, copy)


def write_json(path: str | Path, records: Sequence[FindingRecord]) -> None:
    """A JSON list of findings, each an object with the keys of FIELDS."""

    def write(raw) -> None:
        fh = io.TextIOWrapper(raw, encoding="utf-8")
        json.dump([asdict(r) for r in records], fh, ensure_ascii=False, indent=1)
        fh.write("\n")
        fh.flush()
        fh.detach()  # the writer closes the file

    write_atomically(Path(path), write)


def write_csv(path: str | Path, records: Sequence[FindingRecord]) -> None:
    """A UTF-8 CSV with a BOM (so spreadsheet programs read it as UTF-8), one
    finding a row, text fields defused."""

    def write(raw) -> None:
        fh = io.TextIOWrapper(raw, encoding="utf-8-sig", newline="")
        w = csv.writer(fh)
        w.writerow(FIELDS)
        for r in records:
            w.writerow([defuse(v) if isinstance(v, str) else v for v in (getattr(r, f) for f in FIELDS)])
        fh.flush()
        fh.detach()  # the writer closes the file

    write_atomically(Path(path), write)


def _text_cell(ws, row: int, col: int, value: object):
    cell = ws.cell(row=row, column=col)
    cell.value = value
    if isinstance(value, str):
        cell.data_type = "s"  # never a formula, whatever the first character
    return cell


_WORKBOOK_WIDTHS = (24, 14, 6, 8, 13, 8, 70, 26)
_WRAPPED_COLUMNS = (1, 7, 8)  # File, Message and Suggestion (1-based)


@dataclass(frozen=True)
class TableSheet:
    """One sheet of a report workbook: a table with a header row (``empty`` is
    shown in ``empty_column`` when there are no rows), its column widths (in
    characters) and the 1-based columns whose text wraps."""

    title: str
    headers: Sequence[str]
    rows: Sequence[Sequence[object]]
    widths: Sequence[float]
    wrapped: Sequence[int] = ()
    empty: str = "nothing found"
    empty_column: int = 1


def write_tables(path: str | Path, sheets: Sequence[TableSheet], summary_rows: Sequence[tuple]) -> None:
    """A report workbook: one sheet per table (a header row, a filter, frozen
    header) and a sheet 'Summary' (label, value rows).

    Made to be read on screen and on paper in any spreadsheet program: long
    text wraps inside its cell and each row is as high as its wrapped text
    (a program that does not size rows itself shows no text over the row
    below), and every sheet prints on A4 landscape, one page wide, with the
    header row repeated on every page."""
    from openpyxl import Workbook
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter
    from openpyxl.worksheet.properties import PageSetupProperties
    from openpyxl.worksheet.table import Table, TableStyleInfo

    from .ooxml import POINTS_PER_LINE, text_lines

    wrap = Alignment(wrap_text=True, vertical="top")
    top = Alignment(vertical="top")

    def for_print(sheet) -> None:
        sheet.page_setup.orientation = "landscape"
        sheet.page_setup.paperSize = sheet.PAPERSIZE_A4
        sheet.page_setup.fitToWidth = 1
        sheet.page_setup.fitToHeight = 0
        sheet.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
        sheet.print_title_rows = "1:1"
        sheet.page_margins.left = sheet.page_margins.right = 0.5

    wb = Workbook()
    for n, spec in enumerate(sheets):
        ws = wb.active if n == 0 else wb.create_sheet()
        ws.title = spec.title
        for c, h in enumerate(spec.headers, 1):
            _text_cell(ws, 1, c, h).font = Font(bold=True)
        for i, values in enumerate(spec.rows, 2):
            for c, value in enumerate(values, 1):
                _text_cell(ws, i, c, value).alignment = wrap if c in spec.wrapped else top
            if spec.wrapped:
                lines = max(text_lines(values[c - 1], spec.widths[c - 1]) for c in spec.wrapped)
                ws.row_dimensions[i].height = lines * POINTS_PER_LINE
        if not spec.rows:
            for c in range(1, len(spec.headers) + 1):
                _text_cell(ws, 2, c, spec.empty if c == spec.empty_column else "")
        last = max(2, len(spec.rows) + 1)
        table = Table(
            displayName="".join(w.capitalize() for w in spec.title.split()),
            ref=f"A1:{get_column_letter(len(spec.headers))}{last}",
        )
        table.tableStyleInfo = TableStyleInfo(name="TableStyleLight9", showRowStripes=True)
        ws.add_table(table)
        ws.freeze_panes = "A2"
        for c, width in enumerate(spec.widths, 1):
            ws.column_dimensions[get_column_letter(c)].width = width
        for_print(ws)
    summary = wb.create_sheet("Summary")
    _text_cell(summary, 1, 1, "Item").font = Font(bold=True)
    _text_cell(summary, 1, 2, "Value").font = Font(bold=True)
    for i, (label, value) in enumerate(summary_rows, 2):
        _text_cell(summary, i, 1, label).alignment = wrap
        _text_cell(summary, i, 2, value).alignment = wrap
        summary.row_dimensions[i].height = (
            max(text_lines(label, 100), text_lines(value, 30)) * POINTS_PER_LINE
        )
    summary.column_dimensions["A"].width = 100
    summary.column_dimensions["B"].width = 30
    summary.freeze_panes = "A2"
    for_print(summary)

    write_atomically(Path(path), wb.save)


def write_workbook(path: str | Path, records: Sequence[FindingRecord], summary_rows: Sequence[tuple]) -> None:
    """A findings workbook: sheet 'Findings' (one finding a row with its
    severity as a word, in the order given) and sheet 'Summary' (label, value
    rows); laid out as ``write_tables`` lays out every report workbook."""
    write_tables(path, [findings_sheet(records)], summary_rows)


def findings_sheet(records: Sequence[FindingRecord]) -> TableSheet:
    return TableSheet(
        "Findings",
        ("File", "Sheet", "Row", "Column", "Check", "Severity", "Message", "Suggestion"),
        [(r.file, r.sheet, r.row, r.column, r.check, r.severity, r.message, r.suggestion) for r in records],
        _WORKBOOK_WIDTHS,
        _WRAPPED_COLUMNS,
        "no findings",
        7,
    )
