"""What fill shares across formats: its options and report, where the table
is (the sheet and its layout from the first rows), and the values of one line
from its cells by role. The writers of each format (``fill`` for .xlsx and
.xlsm, ``fill_ods``, ``fill_text``) build on it."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

from ...audit import STANDARD_WEIGHTS
from ...columns import (
    HEADER_SEARCH_ROWS,
    NO_TABLE,
    NOT_MATCHED,
    ColumnOptions,
    Layout,
    LayoutError,
    column_letter,
)
from ...errors import CellchemError
from ...fill import FillColumn, fill_line
from . import MAX_SHEET_COLUMNS, UnusableFile
from .audit import layout_of, sheet_columns


@dataclass
class FillReport:
    """What a fill wrote."""

    source: str
    output: str = ""
    sheet: str = ""
    header_row: int = 0
    columns: list[tuple[str, str]] = field(default_factory=list)  # (letter, header)
    filled: int = 0
    partly: int = 0  # lines filled only in the columns their name fixes
    not_filled: Counter = field(default_factory=Counter)
    kept_existing: int = 0
    notes: list[str] = field(default_factory=list)


@dataclass(frozen=True)
class FillOptions:
    columns: tuple[FillColumn, ...]
    overrides: dict[str, str] = field(default_factory=dict)
    sheet: str | None = None
    overwrite: bool = False
    mass_allowance: float | None = None
    column_options: ColumnOptions | None = None  # --column [SHEET:]... and --header-row [SHEET:]N
    weights: str = STANDARD_WEIGHTS

    def layout_options(self) -> ColumnOptions:
        if self.column_options is not None:
            return self.column_options
        return ColumnOptions(general=dict(self.overrides))


def derived_output(path: Path, word: str = "filled") -> Path:
    """``stock.xlsx`` -> ``stock-filled.xlsx`` beside it."""
    return path.with_name(f"{path.stem}-{word}{path.suffix}")


def _layout(head, columns, header_index: int | None) -> Layout:
    return layout_of(head, columns, header_index)


def _choose_sheet(src: Path, options: FillOptions, book, report: FillReport) -> tuple[object, Layout]:
    """The sheet to fill and its layout, from the first rows of each visible
    sheet (any reader with ``sheets`` and ``first_rows``)."""
    sheets = book.sheets
    wanted = (
        [s for s in sheets if s.name == options.sheet]
        if options.sheet
        else [s for s in sheets if s.state == "visible"]
    )
    if options.sheet and not wanted:
        raise UnusableFile(
            f"'{src.name}' has no sheet named '{options.sheet}'; its sheets are: "
            + ", ".join(repr(s.name) for s in sheets)
        )
    layout_options = options.layout_options()
    heads = {}
    for sheet in wanted:
        _specific, _general, header_row = layout_options.for_sheet(sheet.name)
        heads[sheet.name] = (
            book.first_rows(sheet.name, max(HEADER_SEARCH_ROWS, header_row or 0)),
            header_row,
        )
    single = bool(options.sheet) or len(wanted) <= 1 or not layout_options.general
    if not single:
        tables = 0
        for sheet in wanted:
            head, header_row = heads[sheet.name]
            try:
                _layout(
                    head,
                    sheet_columns(layout_options, sheet.name, False),
                    None if header_row is None else header_row - 1,
                )
            except LayoutError as exc:
                if exc.kind == NO_TABLE and header_row is None:
                    continue
            except CellchemError:
                pass
            tables += 1
        single = tables <= 1
    errors = []
    for sheet in wanted:
        head, header_row = heads[sheet.name]
        columns = sheet_columns(layout_options, sheet.name, single)
        index = None if header_row is None else header_row - 1
        try:
            return sheet, _layout(head, columns, index)
        except LayoutError as exc:
            if exc.kind == NOT_MATCHED and exc.general:
                report.notes.append(
                    f"sheet '{sheet.name}' not filled, the columns given do not match it: {exc}"
                )
            errors.append(f"sheet '{sheet.name}': {exc}")
        except CellchemError as exc:
            raise UnusableFile(f"'{src.name}', sheet '{sheet.name}': {exc}") from None
    raise UnusableFile(
        f"'{src.name}': nothing was written: fill needs a table with a name or formula column"
        f" ({'; '.join(errors) or 'no sheets'})"
    )


def _fill_from_roles(
    values: dict,
    options: FillOptions,
    report: FillReport,
    decimal_comma: bool | None,
    others: list[object] | None = None,
):
    """fill_line over a row's cells by role, counted in the report; ``others``:
    the row's cells of no role, when the formula or name column is not known."""
    line = fill_line(
        options.columns,
        values.get("formula"),
        values.get("name"),
        values.get("molar_mass"),
        values.get("cas"),
        values.get("concentration"),
        values.get("unit"),
        others=tuple(others or ()),
        mass_allowance=options.mass_allowance,
        decimal_comma=decimal_comma,
        weights=options.weights,
    )
    if line.filled:
        report.filled += 1
        if line.partly:
            report.partly += 1
    else:
        report.not_filled[line.verdict.split(":", 1)[0] if line.verdict else "not read"] += 1
    return line


def _same_heading(text: str) -> str:
    """A heading compared exactly, but for case and spaces ('Formula (canonical)' is not 'Formula')."""
    return " ".join(str(text).split()).casefold()


def _place_columns(
    options: FillOptions, headers: list, start: int, where: str, report: FillReport
) -> list[tuple[FillColumn, int, bool]]:
    """(column, 0-based index, new?) for each column to fill: in place under a heading that is already
    there (with a note), else in the next free column from ``start``. ``where`` names the sheet and
    file in the message when the sheet has no room."""
    folded = {_same_heading(h): i for i, h in enumerate(headers) if h}
    targets: list[tuple[FillColumn, int, bool]] = []
    next_col = start
    for column in options.columns:
        existing = folded.get(_same_heading(column.header))
        if existing is not None:
            targets.append((column, existing, False))
            report.notes.append(
                f"column {column_letter(existing)} '{column.header}' already exists: filled in place"
            )
        else:
            targets.append((column, next_col, True))
            next_col += 1
    if next_col > MAX_SHEET_COLUMNS:
        raise UnusableFile(
            f"{where} has no room for {len(options.columns)} more columns after column"
            f" {column_letter(start - 1)} (the last column is XFD)"
        )
    report.columns = [(column_letter(i), c.header) for c, i, _new in targets]
    return targets
