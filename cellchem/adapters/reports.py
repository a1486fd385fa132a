"""Writing the audit's findings: JSON, CSV and a findings workbook.

Reports are new files; the input is never touched. Text that came from the
input (sheet names, quoted cells inside messages) can start with ``=``, ``+``,
``-`` or ``@``, which a spreadsheet program would run as a formula: in CSV
such a field is written with a leading apostrophe, in the workbook every text
cell is stored as text (never as a formula). JSON is data and is written as is.
"""

from __future__ import annotations

import csv
import json
import os
import tempfile
from collections.abc import Sequence
from dataclasses import asdict, dataclass
from pathlib import Path

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


def _replace(path: Path, write) -> None:
    """Write to a temporary file beside ``path``, then move it into place."""
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=".cellchem-", suffix=path.suffix, dir=path.parent or ".")
    os.close(fd)
    try:
        write(Path(tmp))
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise


def write_json(path: str | Path, records: Sequence[FindingRecord]) -> None:
    """A JSON list of findings, each an object with the keys of FIELDS."""

    def write(tmp: Path) -> None:
        with tmp.open("w", encoding="utf-8") as fh:
            json.dump([asdict(r) for r in records], fh, ensure_ascii=False, indent=1)
            fh.write("\n")

    _replace(Path(path), write)


def write_csv(path: str | Path, records: Sequence[FindingRecord]) -> None:
    """A UTF-8 CSV with a BOM (so spreadsheet programs read it as UTF-8), one
    finding a row, text fields defused."""

    def write(tmp: Path) -> None:
        with tmp.open("w", encoding="utf-8-sig", newline="") as fh:
            w = csv.writer(fh)
            w.writerow(FIELDS)
            for r in records:
                w.writerow([defuse(v) if isinstance(v, str) else v for v in (getattr(r, f) for f in FIELDS)])

    _replace(Path(path), write)


def _text_cell(ws, row: int, col: int, value: object):
    cell = ws.cell(row=row, column=col)
    cell.value = value
    if isinstance(value, str):
        cell.data_type = "s"  # never a formula, whatever the first character
    return cell


def write_workbook(path: str | Path, records: Sequence[FindingRecord], summary_rows: Sequence[tuple]) -> None:
    """A findings workbook: sheet 'Findings' (a table with a header row, a
    filter, frozen header, one finding a row with its severity as a word) and
    sheet 'Summary' (label, value rows)."""
    from openpyxl import Workbook
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter
    from openpyxl.worksheet.table import Table, TableStyleInfo

    wb = Workbook()
    ws = wb.active
    ws.title = "Findings"
    headers = ("File", "Sheet", "Row", "Column", "Check", "Severity", "Message", "Suggestion")
    for c, h in enumerate(headers, 1):
        _text_cell(ws, 1, c, h).font = Font(bold=True)
    for i, r in enumerate(records, 2):
        for c, value in enumerate(
            (r.file, r.sheet, r.row, r.column, r.check, r.severity, r.message, r.suggestion), 1
        ):
            _text_cell(ws, i, c, value)
    last = max(2, len(records) + 1)
    if not records:
        for c in range(1, len(headers) + 1):
            _text_cell(ws, 2, c, "" if c != 7 else "no findings")
    ref = f"A1:{get_column_letter(len(headers))}{last}"
    table = Table(displayName="Findings", ref=ref)
    table.tableStyleInfo = TableStyleInfo(name="TableStyleLight9", showRowStripes=True)
    ws.add_table(table)
    ws.freeze_panes = "A2"
    for c, width in enumerate((28, 16, 7, 8, 14, 10, 90, 30), 1):
        ws.column_dimensions[get_column_letter(c)].width = width
    for row in ws.iter_rows(min_row=2, min_col=7, max_col=7):
        for cell in row:
            cell.alignment = Alignment(wrap_text=True, vertical="top")
    summary = wb.create_sheet("Summary")
    _text_cell(summary, 1, 1, "Item").font = Font(bold=True)
    _text_cell(summary, 1, 2, "Value").font = Font(bold=True)
    for i, (label, value) in enumerate(summary_rows, 2):
        _text_cell(summary, i, 1, label)
        _text_cell(summary, i, 2, value)
    summary.column_dimensions["A"].width = 60
    summary.column_dimensions["B"].width = 40
    summary.freeze_panes = "A2"

    _replace(Path(path), lambda tmp: wb.save(tmp))
