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

import errno
import tempfile
import zipfile
from collections import Counter
from pathlib import Path

from ...audit import NO_SAVED_VALUE, NOT_RECALCULATED, _blank
from ...columns import (
    column_letter,
)
from ...errors import CellchemError
from ...fill import MASS, NUMBER, FillColumn
from . import UnusableFile, one_line
from .audit import lock_file_note
from .fill_common import (  # noqa: F401  (FillOptions, FillReport, derived_output: the command line imports them here)
    FillOptions,
    FillReport,
    _choose_sheet,
    _fill_from_roles,
    _place_columns,
    derived_output,
)
from .ooxml import (
    MAIN_NS,
    NewCell,
    Styles,
    cell_value,
    rewrite_sheet,
    scan_sheet,
    verify,
    write_package,
)
from .writer import output_error, write_atomically

_OUTPUT_ERRNOS = {errno.ENOSPC, errno.EDQUOT, errno.EFBIG, errno.EROFS}

_F = f"{{{MAIN_NS}}}f"


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
    from .precheck import inspect

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
    checked = inspect(src)
    kind = checked.kind
    if kind == "text":
        from .fill_text import fill_text

        return fill_text(src, dst, options)
    if dst.suffix.lower() != src.suffix.lower():
        raise UnusableFile(
            f"the output '{dst.name}' must keep the input's extension '{src.suffix}' (a workbook with macros"
            " stays .xlsm)"
        )
    try:
        if kind == "ods":
            from .fill_ods import fill_ods

            return fill_ods(src, dst, options, extra_sheet, facts=checked.facts)
        return _fill_workbook(src, dst, options, extra_sheet)
    except (UnusableFile, CellchemError):
        raise
    except MemoryError:
        raise UnusableFile(
            f"'{src.name}' needs more memory than this machine has; nothing was written"
        ) from None
    except OSError as exc:
        if exc.errno in _OUTPUT_ERRNOS:  # the disk or folder the output goes to (or the temporary space)
            raise output_error(dst, exc) from None
        raise UnusableFile(f"'{src.name}' could not be read ({one_line(exc)}); nothing was written") from None
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


def _fill_workbook(
    src: Path, dst: Path, options: FillOptions, extra_sheet: tuple[str, list[list[object]]] | None = None
) -> FillReport:
    from .xlsx import Book

    report = FillReport(str(src))
    with Book(src) as book:
        zin = book.zin
        pmap = book.map
        sheet, layout = _choose_sheet(src, options, book, report)
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
        targets = _place_columns(
            options, layout.headers, start, f"sheet '{sheet.name}' of '{src.name}'", report
        )
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

        made: dict[tuple[int | None, str], int | None] = {}

        def number_style(base: int | None, kind: str) -> int | None:
            if styles.root is None:
                return base
            key = (base, kind)
            if key not in made:
                made[key] = styles.with_number_format(base or 0, 2 if kind == MASS else 0)
            return made[key]

        def new_cells(number: int, value_at, style_at, others_of) -> list[NewCell]:
            if number < header_row:
                return []
            if number == header_row:
                header_style[0] = style_at(last_heading)
                return [NewCell(i, c.header, header_style[0]) for c, i, new in targets if new]
            values = {role: value_at(index) for role, index in roles.items()}
            if all(_blank(v) for v in values.values()):
                return []
            others = others_of() if degraded else None
            line = _fill_from_roles(values, options, report, None, others)
            base = style_at(last_heading)
            out = []
            for (column, index, _new), value in zip(targets, line.values):
                if value is None:
                    continue
                style = number_style(base, column.kind) if column.kind in (MASS, NUMBER) else base
                out.append(NewCell(index, value, style, options.overwrite))
            return out

        strings = book.strings

        def hook(number: int, cells) -> list[NewCell]:
            """For the element-by-element rewrite: cells are ``<c>`` elements."""
            return new_cells(
                number,
                lambda i: _value_of(cells[i], strings, pmap.recalculate) if i in cells else None,
                lambda i: style_of(cells, i),
                lambda: [
                    cell_value(c, strings) for i, c in cells.items() if i not in role_columns and i not in own
                ],
            )

        def splice_hook(number: int, values: list[object], row_styles: dict[int, int]) -> list[NewCell]:
            """For the splice: values as the audit's reader reads them."""
            return new_cells(
                number,
                lambda i: values[i] if i < len(values) else None,
                lambda i: row_styles[i] if row_styles.get(i, -1) >= 0 else None,
                lambda: [v for i, v in enumerate(values) if i not in role_columns and i not in own],
            )

        widths = [(i, _widths(c)) for c, i, new in targets if new and not _covered(scan.col_ranges, i)]
        last = max([scan.max_column] + [i for _c, i, _n in targets])
        with tempfile.TemporaryFile() as sheet_tmp:
            edits = None
            overwritten: frozenset[str] = frozenset()
            if all(new for _c, _i, new in targets):
                from .xlsx_splice import NeedsRewrite, splice_sheet

                counts = (report.filled, report.partly, Counter(report.not_filled))
                try:
                    spliced = splice_sheet(
                        book,
                        sheet.part,
                        sheet_tmp,
                        splice_hook,
                        None if degraded else frozenset(role_columns),
                        frozenset({last_heading}),
                        widths,
                        last,
                        start,
                    )
                    edits = spliced.edits
                except NeedsRewrite:
                    report.filled, report.partly, report.not_filled = counts
                    sheet_tmp.seek(0)
                    sheet_tmp.truncate()
            if edits is None:
                result = rewrite_sheet(zin, sheet.part, sheet_tmp, hook, widths, last)
                report.kept_existing = result.skipped_existing
                overwritten = frozenset(result.overwritten)

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
                zin, dst, replacements, changed, sheet.part, overwritten, additions or None, edits
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


def _covered(ranges: list[tuple[int, int]], index: int) -> bool:
    return any(lo <= index <= hi for lo, hi in ranges)


def _write_verified(
    zin, dst: Path, replacements, changed, sheet_part, overwritten, additions=None, edits=None
) -> None:
    """Write the package, check it and move it into place. ``edits``: the
    splice's record of what it changed in the sheet part, which is then
    checked byte for byte instead of cell by cell."""

    def write(fh) -> None:
        write_package(zin, fh, replacements, additions)
        fh.flush()
        fh.seek(0)
        with zipfile.ZipFile(fh) as zcheck:
            if edits is None:
                verify(zin, zcheck, changed, sheet_part, set(additions or {}), overwritten)
            else:
                from .xlsx_splice import verify_splice

                verify(zin, zcheck, changed, None, set(additions or {}), overwritten)
                verify_splice(zin, zcheck, sheet_part, edits)

    write_atomically(dst, write)
