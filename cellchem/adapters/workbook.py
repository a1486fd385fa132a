"""Reading workbooks (.xlsx, .xlsm) with openpyxl, read-only and bounded.

The file has passed ``precheck`` before it gets here. openpyxl opens it in
read-only mode with cached values (a formula cell gives the value the
spreadsheet program last computed), external links not loaded. The declared
used range of each sheet is not trusted: dimensions are reset, rows are cut
at ``MAX_COLUMNS`` columns and reading stops at ``MAX_ROWS`` rows.
"""

from __future__ import annotations

import warnings
from collections.abc import Iterator
from dataclasses import dataclass
from pathlib import Path

from .files import MAX_COLUMNS, MAX_ROWS, UnusableFile, one_line
from .precheck import require_defusedxml, sheet_states


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
            for i, row in enumerate(ws.iter_rows(values_only=True)):
                if i >= MAX_ROWS:
                    break
                if len(row) > MAX_COLUMNS:
                    if any(v is not None for v in row[MAX_COLUMNS:]):
                        self.truncated = True
                    row = row[:MAX_COLUMNS]
                yield row
        except UnusableFile:
            raise
        except Exception as exc:
            raise UnusableFile(
                f"'{self.path.name}', sheet '{sheet}': the sheet could not be read ({type(exc).__name__}:"
                f" {exc})"
            ) from None
