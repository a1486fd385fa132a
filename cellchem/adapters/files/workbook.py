"""Reading workbooks (.xlsx, .xlsm) with openpyxl, read-only and bounded.

The file has passed ``precheck`` before it gets here. openpyxl opens it in
read-only mode with cached values (a formula cell gives the value the
spreadsheet program last computed), external links not loaded. The declared
used range of each sheet is not trusted: dimensions are reset, rows are cut
at ``MAX_COLUMNS`` columns and reading stops at ``MAX_ROWS`` rows.

A formula cell whose value cannot be read is given as an
``audit.UnsavedValue``, never as the empty cell or the 0 a library reads
there: a cell with a formula and no saved value (a workbook written by a
program that does not compute, such as openpyxl), and every formula cell of
a workbook that asks for its formulas to be recalculated when opened
(``fullCalcOnLoad``: XlsxWriter writes 0 as each formula's value and sets it).
These cells are found by a scan of the sheet part's bytes for ``<f>``
elements before the rows are read.
"""

from __future__ import annotations

import re
import warnings
from collections.abc import Iterable, Iterator
from dataclasses import dataclass
from itertools import chain
from pathlib import Path

from ...audit import NO_SAVED_VALUE, NOT_RECALCULATED, UnsavedValue
from ...columns import column_index
from . import MAX_COLUMNS, MAX_ROWS, UnusableFile, one_line
from .precheck import require_defusedxml, sheet_states

_FORMULA_START = re.compile(rb"<(?:[A-Za-z0-9_]+:)?f[\s>/]")
_CELL_END = re.compile(rb"</(?:[A-Za-z0-9_]+:)?c>")
_CELL_REF = re.compile(rb'\sr="([A-Z]{1,3})([0-9]+)"')
_SAVED = re.compile(rb"<(?:[A-Za-z0-9_]+:)?v>[^<]")


def unsaved_formula_cells(
    data_chunks: Iterable[bytes], recalculate: bool
) -> dict[int, dict[int, UnsavedValue]]:
    """1-based row -> 0-based column -> UnsavedValue for each formula cell of a
    sheet part (given as chunks of its bytes) whose value cannot be read: no
    saved value, or any saved value when ``recalculate`` (the workbook asks
    for recalculation on opening)."""
    found: dict[int, dict[int, UnsavedValue]] = {}
    tail = b""
    for chunk in chain(data_chunks, [None]):  # streamed: memory holds one chunk, not the part
        data = tail + (chunk or b"")
        if chunk is not None:
            ends = list(_CELL_END.finditer(data, max(0, len(data) - (1 << 16))))
            if not ends:
                tail = data
                continue
            cut = ends[-1].end()
        else:
            cut = len(data)
        body, tail = data[:cut], data[cut:]
        for m in _FORMULA_START.finditer(body):
            # the cell's start tag is the last one before the <f>: only its attributes lie between
            plain, prefixed = body.rfind(b"<c ", 0, m.start()), body.rfind(b":c ", 0, m.start())
            start = max(plain, body.rfind(b"<", 0, prefixed) if prefixed >= 0 else -1)
            end = _CELL_END.search(body, m.end())
            if start < 0 or end is None:
                continue
            cell = body[start : end.end()]
            opening = cell[: cell.find(b">") + 1]
            ref = _CELL_REF.search(opening)
            if ref is None:
                continue
            saved = _SAVED.search(cell) is not None
            if saved and not recalculate:
                continue
            value = NOT_RECALCULATED if saved else NO_SAVED_VALUE
            found.setdefault(int(ref.group(2)), {})[column_index(ref.group(1).decode())] = value
    return found


@dataclass(frozen=True)
class SheetInfo:
    name: str
    state: str  # visible | hidden | veryHidden


def list_sheets(path: str | Path) -> list[SheetInfo]:
    """The sheets of a workbook in order, with their visibility."""
    return [SheetInfo(name, state) for name, state in sheet_states(path)]


class WorkbookReader:
    """An open workbook, read-only; use as a context manager."""

    def __init__(self, path: str | Path) -> None:
        require_defusedxml()
        import openpyxl

        self.path = Path(path)
        self._recalculate: bool | None = None
        self._scanned: dict[str, dict[int, dict[int, UnsavedValue]]] = {}  # sheet part -> its unsaved cells
        try:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")  # openpyxl warns about extensions it does not read
                self._wb = openpyxl.load_workbook(self.path, read_only=True, data_only=True, keep_links=False)
        except UnusableFile:
            raise
        except Exception as exc:  # openpyxl raises many kinds on a malformed package
            raise UnusableFile(
                f"'{self.path.name}' could not be read as a workbook ({type(exc).__name__}: {one_line(exc)});"
                " open it in a spreadsheet program and save it again as .xlsx"
            ) from None

    def __enter__(self) -> WorkbookReader:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()

    def close(self) -> None:
        self._wb.close()

    @property
    def sheet_names(self) -> list[str]:
        return list(self._wb.sheetnames)

    def rows(self, sheet: str) -> Iterator[tuple[object, ...]]:
        """The sheet's rows as tuples of values, bounded in rows and columns.
        A row wider than MAX_COLUMNS is cut; see ``truncated``."""
        ws = self._wb[sheet]
        try:
            ws.reset_dimensions()
        except AttributeError:  # a chartsheet has no cells
            return
        self.truncated = False
        try:
            unsaved = self._unsaved(ws)
            for i, row in enumerate(ws.iter_rows(values_only=True)):
                if i >= MAX_ROWS:
                    break
                if len(row) > MAX_COLUMNS:
                    if any(v is not None for v in row[MAX_COLUMNS:]):
                        self.truncated = True
                    row = row[:MAX_COLUMNS]
                cells = unsaved.get(i + 1)
                if cells:
                    values = list(row)
                    for column, value in cells.items():
                        if column < MAX_COLUMNS:
                            values.extend([None] * (column + 1 - len(values)))
                            values[column] = value
                    row = tuple(values)
                yield row
        except UnusableFile:
            raise
        except Exception as exc:
            raise UnusableFile(
                f"'{self.path.name}', sheet '{sheet}': the sheet could not be read ({type(exc).__name__}:"
                f" {exc})"
            ) from None

    def _unsaved(self, ws) -> dict[int, dict[int, UnsavedValue]]:
        path = getattr(ws, "_worksheet_path", None)
        archive = getattr(self._wb, "_archive", None)
        if path is None or archive is None:
            return {}
        if path not in self._scanned:
            self._scanned[path] = self._scan(archive, path)
        return self._scanned[path]

    def _scan(self, archive, path: str) -> dict[int, dict[int, UnsavedValue]]:
        if self._recalculate is None:
            from .ooxml import package_map

            try:
                self._recalculate = package_map(archive).recalculate
            except Exception:  # an odd package: openpyxl read it; take its values as saved
                self._recalculate = False
        recalculate = self._recalculate

        def chunks():
            with archive.open(path) as fh:
                while chunk := fh.read(1 << 20):
                    yield chunk

        return unsaved_formula_cells(chunks(), recalculate)
