"""``cellchem fill`` and ``cellchem audit --annotate`` over an OpenDocument
spreadsheet (.ods): a copy with the computed columns added, everything else
kept.

The sheet and its layout are chosen from the first rows as for a workbook.
The new columns go right after the last column used anywhere in the sheet
(a cell with a value, a formula, a comment or a drawing, or a covered cell
of a merged range; the repeated empty cells a spreadsheet program writes
to the sheet's edge do not count). The header row gets the headings (in the
style of the last heading); each line gets the values ``fill.fill_line``
gives it, numbers as float cells (a molar mass shown with two decimals),
text as string cells. A column whose heading is already one of cellchem's
is filled in place: its empty cells get values, cells holding a value are
kept unless ``overwrite`` is set, and a formula is never replaced.

Refused (nothing written): a digitally signed document (any change breaks
the signature), a protected sheet, new columns beyond the last spreadsheet
column, and any file the checks refuse. The copy is checked against the
input before it is moved into place (``ods_write.verify_package``).
"""

from __future__ import annotations

import tempfile
import zipfile
from pathlib import Path

from ...audit import _blank
from ...fill import MASS
from . import UnusableFile
from .fill_common import FillOptions, FillReport, _choose_sheet, _fill_from_roles, _place_columns
from .ods import A_TABLE_STYLE, OdsBook, OdsFacts, OdsTable, RowRecord, ScanOptions, check_ods, scan_content
from .ods_write import Allowed, NewCell, rewrite_content, verify_package, write_package

MASS_DECIMALS = 2  # a molar mass is shown with two decimals, as in the .xlsx fill


def fill_ods(
    src: Path,
    dst: Path,
    options: FillOptions,
    extra_sheet: tuple[str, list[list[object]]] | None = None,
    facts: OdsFacts | None = None,
) -> FillReport:
    """Fill the .ods ``src`` into a new file ``dst``; ``extra_sheet`` (title,
    rows of plain values) adds a sheet after the last one; ``facts``: what
    ``check_ods`` learned of ``src`` (checked here when not given). Raises
    UnusableFile when nothing could be written."""
    from .writer import write_atomically

    src, dst = Path(src), Path(dst)
    report = FillReport(str(src))
    shown = f"'{src.name}'"
    with zipfile.ZipFile(src) as zin:
        if facts is None:
            facts = check_ods(zin, shown)
        if facts.signed:
            raise UnusableFile(
                f"{shown} carries a digital signature, which any change would break: cellchem does not write"
                " into a signed document; remove the signature (File > Digital Signatures) in a copy and fill"
                " that"
            )
        with OdsBook(src, facts) as book:
            sheet, layout = _choose_sheet(src, options, book, report)
        table = next(t for t in facts.tables if t.name == sheet.name)
        report.sheet = table.name
        if table.protected:
            raise UnusableFile(
                f"sheet '{table.name}' of {shown} is protected; cellchem does not write into a protected"
                " sheet: unprotect it (Tools > Protect Sheet) and run fill again"
            )
        header_row = layout.header_index + 1
        report.header_row = header_row
        start = _used_columns(zin, facts.content, table, shown)
        targets = _place_columns(options, layout.headers, start, f"sheet '{table.name}' of {shown}", report)
        roles = layout.roles
        role_columns = set(roles.values())
        own = {i for _c, i, _new in targets}
        degraded = not ({"formula", "name"} <= roles.keys())
        last_heading = max((i for i, h in enumerate(layout.headers) if h), default=0)

        def hook(row: RowRecord, number: int, copies: int) -> list[NewCell]:
            if number < header_row:
                return []
            if number == header_row:
                style = _style_at(row, last_heading)
                return [NewCell(i, c.header, style) for c, i, new in targets if new]
            cells = row.values
            values = {role: cells[i] if i < len(cells) else None for role, i in roles.items()}
            if all(_blank(v) for v in values.values()):
                return []
            others = None
            if degraded:
                others = [v for i, v in enumerate(cells) if i not in role_columns and i not in own]
            before = (report.filled, report.partly, report.not_filled.copy())
            line = _fill_from_roles(values, options, report, None, others)
            if copies > 1:  # a repeated row: every copy is a line, and gets the same values
                _count_copies(report, before, copies)
            style = _style_at(row, last_heading)
            out = []
            for (column, index, _new), value in zip(targets, line.values, strict=True):
                if value is None:
                    continue
                number_cell = isinstance(value, int | float) and not isinstance(value, bool)
                decimals = MASS_DECIMALS if column.kind == MASS and number_cell else None
                out.append(NewCell(index, value, style, decimals, options.overwrite))
            return out

        decimals = frozenset({MASS_DECIMALS}) if any(c.kind == MASS for c, _i, _n in targets) else frozenset()
        with tempfile.TemporaryFile() as content:
            result = rewrite_content(
                zin,
                facts,
                table.index,
                content,
                hook,
                split_rows=frozenset({header_row}),
                decimals=decimals,
                extra_table=extra_sheet,
                shown=shown,
                keep=None if degraded else frozenset(role_columns),
            )
            report.kept_existing = result.kept_existing
            if result.added_table:
                report.notes.append(f"sheet '{result.added_table}' added")
            allowed = Allowed(
                table=table.index,
                header_row=header_row,
                new_columns=frozenset(i for _c, i, new in targets if new),
                fill_columns=frozenset(own),
                overwrite=options.overwrite,
                added_style_names=frozenset(result.added_style_names),
                added_styles_part=result.added_styles_part,
                added_table=result.added_table,
            )

            def write(fh) -> None:
                write_package(zin, fh, facts.content, content)
                verify_package(zin, fh, facts.content, allowed, shown)

            write_atomically(dst, write)
    report.output = str(dst)
    return report


class _NoValues:
    """A row stream's settings for a pass that needs no values."""

    keep: frozenset[int] = frozenset()
    truncated = False


def _used_columns(zin: zipfile.ZipFile, part: str, table: OdsTable, shown: str) -> int:
    """The number of columns up to the last one used in the sheet (a value, a
    formula, a comment or drawing, a merged range), counted over every row."""
    used = 0
    options = ScanOptions(table.index, stream=_NoValues(), all_rows=True)  # type: ignore[arg-type]
    for record in scan_content(zin, part, shown, options):
        if isinstance(record, RowRecord) and record.used > used:
            used = record.used
    return used


def _style_at(row: RowRecord, column: int) -> str | None:
    """The style of the row's cell in ``column``, if it names one."""
    for run in row.cells or []:
        if run.column <= column < run.column + run.repeat:
            return run.attrs.get(A_TABLE_STYLE) if not run.covered else None
    return None


def _count_copies(report: FillReport, before: tuple, copies: int) -> None:
    """Count a line that stands for ``copies`` lines (a repeated row) as
    many times."""
    filled, partly, not_filled = before
    report.filled += (report.filled - filled) * (copies - 1)
    report.partly += (report.partly - partly) * (copies - 1)
    for key, count in report.not_filled.items():
        added = count - not_filled.get(key, 0)
        if added:
            report.not_filled[key] += added * (copies - 1)
