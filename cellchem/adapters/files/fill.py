"""``cellchem fill`` and ``cellchem audit --annotate``: a copy of the user's
workbook (or CSV) with computed columns added, everything else kept.

Where the new columns go: right after the last column used anywhere in the
sheet, and after any merged range or table that reaches further on the rows
from the header down (so no table has to grow and no merged range is cut). A
column whose header is already one of cellchem's (a file filled before) is
filled in place: its empty cells get values, cells holding a value are kept
unless ``overwrite`` is set, and a cell holding a formula is never written.

Refused (nothing written): a protected sheet, new columns that would pass the
last spreadsheet column (XFD), an output path that is the input, and any file
the pre-checks refuse. After writing, the package is verified (see
``package.verify``); any difference removes the output.
"""

from __future__ import annotations

import tempfile
import zipfile
from collections import Counter
from dataclasses import dataclass, field
from pathlib import Path

from ...audit import NO_SAVED_VALUE, NOT_RECALCULATED, STANDARD_WEIGHTS, _blank
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
from ...fill import MASS, NUMBER, FillColumn, fill_line
from . import UnusableFile, one_line
from .audit import lock_file_note, sheet_columns
from .ooxml import (
    MAIN_NS,
    MAX_SHEET_COLUMNS,
    NewCell,
    Styles,
    cell_value,
    package_map,
    rewrite_sheet,
    scan_sheet,
    shared_strings,
    verify,
    write_package,
)
from .reports import replace_atomically

_F = f"{{{MAIN_NS}}}f"


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


def _widths(column: FillColumn) -> float:
    return {"name": 36.0, "verdict": 60.0}.get(column.key, max(12.0, len(column.header) + 2.0))


def fill_file(
    path: str | Path,
    out: str | Path,
    options: FillOptions,
    extra_sheet: tuple[str, list[list[object]]] | None = None,
) -> FillReport:
    """Fill ``path`` into a new file ``out``; ``extra_sheet`` (title, rows)
    adds a sheet of plain cells to a workbook. Raises UnusableFile when
    nothing could be written."""
    from .precheck import precheck

    src = Path(path)
    dst = Path(out)
    lock = lock_file_note(src)
    if lock is not None:
        raise UnusableFile(lock.replace(": skipped", "; fill the workbook itself"))
    try:
        if dst.resolve() == src.resolve():
            raise UnusableFile(f"the output '{dst}' is the input; cellchem never writes the input file")
    except OSError:
        pass
    kind = precheck(src)
    if kind == "text":
        from .fill_text import fill_text

        return fill_text(src, dst, options)
    if dst.suffix.lower() != src.suffix.lower():
        raise UnusableFile(
            f"the output '{dst.name}' must keep the input's extension '{src.suffix}' (a workbook with macros"
            " stays .xlsm)"
        )
    try:
        return _fill_workbook(src, dst, options, extra_sheet)
    except (UnusableFile, CellchemError):
        raise
    except MemoryError:
        raise UnusableFile(
            f"'{src.name}' needs more memory than this machine has; nothing was written"
        ) from None
    except (
        Exception
    ) as exc:  # a damaged part found while streaming (bad XML, a bad CRC): refuse, write nothing
        raise UnusableFile(
            f"'{src.name}' could not be filled ({type(exc).__name__}: {one_line(exc)}); nothing was written:"
            " open it in a spreadsheet program and save it again"
        ) from None


# ---------------------------------------------------------------------------
# Workbooks
# ---------------------------------------------------------------------------


def _layout(head, columns, header_index: int | None) -> Layout:
    from .audit import layout_of

    return layout_of(head, columns, header_index)


def _choose_sheet(
    src: Path, options: FillOptions, zin, pmap, strings, report: FillReport
) -> tuple[object, Layout]:
    from .ooxml import first_rows

    sheets = pmap.sheets
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
            first_rows(zin, sheet.part, strings, max(HEADER_SEARCH_ROWS, header_row or 0)),
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


def _fill_workbook(
    src: Path, dst: Path, options: FillOptions, extra_sheet: tuple[str, list[list[object]]] | None = None
) -> FillReport:
    report = FillReport(str(src))
    with zipfile.ZipFile(src) as zin:
        pmap = package_map(zin)
        strings = shared_strings(zin, pmap.shared_strings)
        sheet, layout = _choose_sheet(src, options, zin, pmap, strings, report)
        report.sheet = sheet.name
        header_row = layout.header_index + 1
        report.header_row = header_row
        scan = scan_sheet(zin, sheet.part)
        if scan.protected:
            raise UnusableFile(
                f"sheet '{sheet.name}' of '{src.name}' is protected; cellchem does not write into a protected"
                " sheet: unprotect it (Review > Unprotect Sheet) and run fill again"
            )
        # where the columns go
        start = scan.max_column + 1
        for _c1, c2, _r1, r2 in scan.merged:
            if r2 >= header_row:
                start = max(start, c2 + 1)
        for _name, _c1, c2, _r1, r2 in scan.tables:
            if r2 >= header_row:
                start = max(start, c2 + 1)
        folded = {_same_heading(h): i for i, h in enumerate(layout.headers) if h}
        targets: list[tuple[FillColumn, int, bool]] = []  # column, index, new?
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
                f"sheet '{sheet.name}' of '{src.name}' has no room for {len(options.columns)} more columns"
                f" after column {column_letter(start - 1)} (the last column is XFD)"
            )
        report.columns = [(column_letter(i), c.header) for c, i, _new in targets]
        for name, _c1, c2, _r1, r2 in scan.tables:
            if r2 >= header_row:
                report.notes.append(
                    f"table '{name}' ends at column {column_letter(c2)}; the new columns sit beside it, not"
                    " in it"
                )
        styles = Styles(zin.read(pmap.styles) if pmap.styles and pmap.styles in zin.namelist() else None)
        roles = layout.roles
        role_columns = set(roles.values())
        own = {i for _c, i, _new in targets}
        degraded = not ({"formula", "name"} <= roles.keys())
        last_heading = max((i for i, h in enumerate(layout.headers) if h), default=0)
        header_style: list[int | None] = [None]

        def style_of(cells, index) -> int | None:
            c = cells.get(index)
            if c is None or c.get("s") is None:
                return None
            try:
                return int(c.get("s"))
            except ValueError:
                return None

        def number_style(base: int | None, kind: str) -> int | None:
            if styles.root is None:
                return base
            return styles.with_number_format(base or 0, 2 if kind == MASS else 0)

        def hook(number: int, cells) -> list[NewCell]:
            if number < header_row:
                return []
            if number == header_row:
                header_style[0] = style_of(cells, last_heading)
                return [NewCell(i, c.header, header_style[0]) for c, i, new in targets if new]
            values = {
                role: _value_of(cells[index], strings, pmap.recalculate) if index in cells else None
                for role, index in roles.items()
            }
            if all(_blank(v) for v in values.values()):
                return []
            others = None
            if degraded:
                others = [
                    cell_value(c, strings) for i, c in cells.items() if i not in role_columns and i not in own
                ]
            line = _fill_from_roles(values, options, report, None, others)
            base = style_of(cells, last_heading)
            out = []
            for (column, index, _new), value in zip(targets, line.values):
                if value is None:
                    continue
                style = number_style(base, column.kind) if column.kind in (MASS, NUMBER) else base
                out.append(NewCell(index, value, style, options.overwrite))
            return out

        widths = [(i, _widths(c)) for c, i, new in targets if new and not _covered(scan.col_ranges, i)]
        last = max([scan.max_column] + [i for _c, i, _n in targets])
        with tempfile.TemporaryFile() as sheet_tmp:
            result = rewrite_sheet(zin, sheet.part, sheet_tmp, hook, widths, last)
            report.kept_existing = result.skipped_existing

            def copy_sheet(out_fh) -> None:
                sheet_tmp.seek(0)
                while chunk := sheet_tmp.read(1 << 20):
                    out_fh.write(chunk)

            replacements = {sheet.part: copy_sheet}
            changed = {sheet.part}
            additions: dict[str, bytes] = {}
            if extra_sheet is not None:
                from .ooxml import added_sheet

                parts, additions, title = added_sheet(zin, pmap, extra_sheet[0], extra_sheet[1], styles)
                for name, data in parts.items():
                    replacements[name] = (lambda d: lambda fh: fh.write(d))(data)
                    changed.add(name)
                report.notes.append(f"sheet '{title}' added")
            styles_data = styles.data()
            if styles.changed and pmap.styles:
                replacements[pmap.styles] = lambda fh: fh.write(styles_data)
                changed.add(pmap.styles)
            _write_verified(
                zin, dst, replacements, changed, sheet.part, frozenset(result.overwritten), additions or None
            )
    report.output = str(dst)
    return report


def _value_of(c, strings: list[str], recalculate: bool) -> object:
    """A cell's value; a formula cell whose value cannot be read (none saved,
    or the workbook asks for recalculation on opening) gives an UnsavedValue."""
    value = cell_value(c, strings)
    if c.find(_F) is None:
        return value
    if _blank(value):
        return NO_SAVED_VALUE
    return NOT_RECALCULATED if recalculate else value


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


def _covered(ranges: list[tuple[int, int]], index: int) -> bool:
    return any(lo <= index <= hi for lo, hi in ranges)


def _write_verified(zin, dst: Path, replacements, changed, sheet_part, overwritten, additions=None) -> None:
    def write(tmp: Path) -> None:
        write_package(zin, str(tmp), replacements, additions)
        with zipfile.ZipFile(tmp) as zcheck:
            verify(zin, zcheck, changed, sheet_part, set(additions or {}), overwritten)

    replace_atomically(dst, write)
