"""The audit over files: pre-check, read, find the header, check each row,
collect findings and counts. The command line prints and writes what this
returns; the checks themselves are ``cellchem.audit``'s."""

from __future__ import annotations

import sys
from collections import deque
from collections.abc import Callable, Iterator, Mapping, Sequence
from dataclasses import dataclass, field
from itertools import chain
from pathlib import Path

from ...audit import BLANK, STANDARD_WEIGHTS, WARNING, Summary, iter_audit
from ...columns import (
    HEADER_SEARCH_ROWS,
    NO_ROLES,
    NO_TABLE,
    NOT_MATCHED,
    ColumnOptions,
    Layout,
    LayoutError,
    column_letter,
    find_layout,
)
from ...errors import CellchemError
from . import MAX_COLUMNS, UnusableFile, one_line
from .reports import FindingRecord

COLUMNS_CHECK = "columns"  # the check of a table's columns (a table with no name or formula column)


@dataclass
class SheetReport:
    """What the audit made of one sheet (or one CSV file)."""

    file: str
    sheet: str
    header_row: int = 0
    roles: dict[str, str] = field(default_factory=dict)  # role -> "letter heading"
    summary: Summary = field(default_factory=Summary)
    notes: list[str] = field(default_factory=list)
    error: str = ""  # why the sheet could not be audited
    no_table: bool = False  # no header row found (a notes or cover sheet)
    no_roles: bool = False  # a table whose headings name no name or formula column (a warning)
    not_matched: bool = False  # a --column given for every sheet does not fit this sheet (a note)


@dataclass
class FileReport:
    path: str
    kind: str = ""
    sheets: list[SheetReport] = field(default_factory=list)
    hidden: list[str] = field(default_factory=list)  # hidden sheets not read
    notes: list[str] = field(default_factory=list)
    error: str = ""  # the file could not be used
    skipped: str = ""  # why the file was passed over (a spreadsheet's lock file): a note


@dataclass
class AuditRun:
    files: list[FileReport] = field(default_factory=list)
    findings: list[FindingRecord] = field(default_factory=list)

    @property
    def summary(self) -> Summary:
        total = Summary()
        for f in self.files:
            for s in f.sheets:
                total.merge(s.summary)
        return total

    @property
    def unusable(self) -> list[FileReport]:
        return [f for f in self.files if f.error]

    def order(self) -> dict[tuple[str, str], int]:
        """(file, sheet) -> its place in the run: files in the order given,
        sheets in workbook order."""
        out: dict[tuple[str, str], int] = {}
        for f in self.files:
            for s in f.sheets:
                out.setdefault((f.path, s.sheet), len(out))
        return out


@dataclass(frozen=True)
class Options:
    columns: Mapping[str, str] = field(default_factory=dict)  # for every sheet (kept for scripts)
    sheet: str | None = None
    hidden: bool = False
    encoding: str | None = None
    delimiter: str | None = None
    mass_allowance: float | None = None
    column_options: ColumnOptions | None = None  # --column [SHEET:]... and --header-row [SHEET:]N
    weights: str = STANDARD_WEIGHTS
    # called with (file, sheet, row number, layout, cells) for each data row that is not blank: the
    # survey of a whole store reads its lines this way, in the same pass as the audit
    collect: Callable[[str, str, int, Layout, Sequence[object]], None] | None = None

    def layout_options(self) -> ColumnOptions:
        if self.column_options is not None:
            return self.column_options
        return ColumnOptions(general=dict(self.columns))


def lock_file_target(path: str | Path) -> str | None:
    """The workbook a spreadsheet program's lock file stands for, or None:
    ``~$stock.xlsx`` (Excel's owner file) and ``.~lock.stock.xlsx#``
    (LibreOffice's) lie beside ``stock.xlsx`` while it is open.

    >>> lock_file_target("~$stock.xlsx"), lock_file_target(".~lock.stock.xlsx#"), lock_file_target("a.xlsx")
    ('stock.xlsx', 'stock.xlsx', None)
    """
    name = Path(path).name
    if name.startswith("~$") and len(name) > 2:
        return name[2:]
    if name.startswith(".~lock.") and name.endswith("#") and len(name) > 8:
        return name[len(".~lock.") : -1]
    return None


def lock_file_note(path: str | Path) -> str | None:
    target = lock_file_target(path)
    if target is None:
        return None
    return (
        f"'{Path(path).name}' is the lock file a spreadsheet program keeps while '{target}' is open,"
        " not a table: skipped"
    )


def _progress(iterable, total: int | None, label: str):
    if not sys.stderr.isatty():
        return iterable
    try:
        from tqdm import tqdm
    except ImportError:  # pragma: no cover - tqdm is a dependency
        return iterable
    return tqdm(iterable, total=total, desc=label, unit=" rows", leave=False, file=sys.stderr)


@dataclass(frozen=True)
class SheetColumns:
    """The user's columns and header row for one table."""

    specific: Mapping[str, str]
    general: Mapping[str, str]
    header_row: int | None  # 1-based sheet row (line number in a text file)


def sheet_columns(options: ColumnOptions, sheet: str, single_table: bool) -> SheetColumns:
    """The columns for one sheet; ``single_table``: the file has one table, so
    that the columns given for every sheet are meant for it."""
    specific, general, header_row = options.for_sheet(sheet)
    if single_table:
        specific, general = {**general, **specific}, {}
    return SheetColumns(specific, general, header_row)


def layout_of(head: Sequence[Sequence[object]], columns: SheetColumns, header_index: int | None) -> Layout:
    return find_layout(head, columns.specific, header_index=header_index, general=columns.general)


def _sheet_failed(report: SheetReport, exc: CellchemError, number_of: Callable[[int], int]) -> None:
    """Record why a table was not audited."""
    report.error = str(exc)
    kind = exc.kind if isinstance(exc, LayoutError) else ""
    if kind == NO_TABLE:
        report.no_table = True
    elif kind == NO_ROLES:
        report.no_roles = True
        if exc.header_index is not None:
            report.header_row = number_of(exc.header_index)
    elif kind == NOT_MATCHED and exc.general:
        report.not_matched = True


def _audit_table(
    report: SheetReport,
    rows: Iterator[tuple[int, Sequence[object]]],
    options: Options,
    findings: list[FindingRecord],
    *,
    columns: SheetColumns,
    decimal_comma: bool | None = None,
    total: int | None = None,
    cell_filter: Callable[[Layout, Iterator[Sequence[object]]], Iterator[Sequence[object]]] | None = None,
    gaps_are_rows: bool = True,
) -> None:
    """Audit one table. ``rows``: (sheet row or line number, cells) in order,
    as every reader streams them; when it has a ``keep`` attribute it is told
    which columns the checks need once the header is found."""
    head: list[tuple[int, Sequence[object]]] = []
    wanted = columns.header_row
    for pair in rows:
        head.append(pair)
        if len(head) >= HEADER_SEARCH_ROWS and (wanted is None or pair[0] >= wanted):
            break
    numbers = [n for n, _cells in head]
    header_index = None
    if wanted is not None:
        if wanted not in numbers:
            report.error = (
                f"--header-row {wanted}: no row starts there"
                if numbers and wanted < numbers[-1]
                else f"--header-row {wanted}: the table has only {numbers[-1] if numbers else 0} rows"
            )
            return
        header_index = numbers.index(wanted)

    def number_of(i: int) -> int:
        return numbers[i] if i < len(numbers) else i + 1

    try:
        layout = layout_of([cells for _n, cells in head], columns, header_index)
    except CellchemError as exc:
        _sheet_failed(report, exc, number_of)
        return
    report.header_row = number_of(layout.header_index)
    report.roles = {
        role: f"{column_letter(i)} {layout.headers[i]!r}" if i < len(layout.headers) else column_letter(i)
        for role, i in layout.roles.items()
    }
    for dup in layout.duplicates:
        report.notes.append(f"duplicate heading {dup}; the first is used")
    for text in layout.ambiguous:
        report.notes.append(f"heading {text}")
    report.notes.extend(layout.replaced)
    if hasattr(rows, "keep") and {"formula", "name"} <= layout.roles.keys():
        rows.keep = frozenset(layout.roles.values())  # the checks read the role columns only
    pending: deque[int] = deque()

    def body_rows() -> Iterator[Sequence[object]]:
        last = report.header_row
        for number, cells in chain(head[layout.header_index + 1 :], rows):
            if gaps_are_rows:  # sheet rows the file leaves out are blank rows of the table
                for gap in range(last + 1, number):
                    pending.append(gap)
                    yield ()
            last = number
            pending.append(number)
            yield cells

    def row_numbers() -> Iterator[int]:
        while True:
            yield pending.popleft()

    body: Iterator[Sequence[object]] = body_rows()
    if cell_filter is not None:
        body = cell_filter(layout, body)
    current: list[Sequence[object]] = [()]
    if options.collect is not None:

        def remembered(rows: Iterator[Sequence[object]]) -> Iterator[Sequence[object]]:
            for cells in rows:
                current[0] = cells  # iter_audit reads one row for each result it gives
                yield cells

        body = remembered(body)
    label = f"{Path(report.file).name} {report.sheet}".strip()
    for result in iter_audit(
        _progress(body, total, label),
        layout,
        report.header_row + 1,
        row_numbers=row_numbers(),
        mass_allowance=options.mass_allowance,
        decimal_comma=decimal_comma,
        weights=options.weights,
    ):
        report.summary.add(result)
        if options.collect is not None and result.status != BLANK:
            options.collect(report.file, report.sheet, result.row, layout, current[0])
        for f in result.findings:
            findings.append(
                FindingRecord(
                    report.file,
                    report.sheet,
                    result.row,
                    result.column_of(f),
                    f.check,
                    f.severity,
                    f.message,
                    f.suggestion,
                )
            )


def audit_file(path: str | Path, options: Options, run: AuditRun) -> FileReport:
    """Audit one file into ``run``; a file that cannot be used is reported in
    its FileReport's ``error``, never raised. A spreadsheet's lock file is
    passed over with a note."""
    from .precheck import inspect

    p = Path(path)
    report = FileReport(str(path))
    run.files.append(report)
    lock = lock_file_note(p)
    if lock is not None:
        report.skipped = lock
        return report
    try:
        checked = inspect(p)
        report.kind = checked.kind
        if checked.kind == "text":
            _audit_text(p, report, options, run)
        elif checked.kind == "ods":
            from .ods import open_ods

            book = open_ods(p, checked.facts)
            try:
                _audit_book(book, p, report, options, run)
            finally:
                book.close()
        else:
            _audit_workbook(p, report, options, run)
    except UnusableFile as exc:
        report.error = str(exc)
    except MemoryError:
        report.error = f"'{p.name}' needs more memory than this machine has to read"
    except CellchemError as exc:
        report.error = f"'{p.name}': {exc}"
    except Exception as exc:  # a reader's failure on a malformed file must not end the run
        report.error = (
            f"'{p.name}' could not be read ({type(exc).__name__}: {one_line(exc)}); open it in a spreadsheet"
            " program and save it again"
        )
    return report


def _mass_cells(decimal_comma: bool):
    """A filter for a text file's rows: a molar mass written with its digits
    grouped (``1.235,86``) is given to the checks without the grouping."""
    from .text import ungrouped_number

    def apply(layout: Layout, rows: Iterator[Sequence[object]]) -> Iterator[Sequence[object]]:
        index = layout.roles.get("molar_mass")
        if index is None:
            yield from rows
            return
        for row in rows:
            if index < len(row) and isinstance(row[index], str):
                cell = ungrouped_number(row[index], decimal_comma)
                if cell != row[index]:
                    row = (*row[:index], cell, *row[index + 1 :])
            yield row

    return apply


def _audit_text(path: Path, report: FileReport, options: Options, run: AuditRun) -> None:
    from .text import open_text_table

    table = open_text_table(path, encoding=options.encoding, delimiter=options.delimiter)
    names = {",": "commas", ";": "semicolons", "\t": "tabs"}
    report.notes.append(
        f"read as {table.encoding}, fields separated by {names.get(table.delimiter, repr(table.delimiter))}"
        + (", numbers with a decimal comma" if table.decimal_comma else "")
    )
    report.notes.extend(n for n in table.notes if "decimal comma" not in n)
    sheet = SheetReport(str(path), "")
    report.sheets.append(sheet)
    rows = table.rows()
    _audit_table(
        sheet,
        rows,
        options,
        run.findings,
        columns=sheet_columns(options.layout_options(), "", single_table=True),
        decimal_comma=table.decimal_comma,
        cell_filter=_mass_cells(table.decimal_comma),
        gaps_are_rows=False,
    )
    report.notes.extend(problem for _line, problem in rows.problems)
    if sheet.error:
        report.error = f"'{path.name}': {sheet.error}"


def tables_in(reader, names: Sequence[str], options: ColumnOptions) -> int:
    """How many of the sheets hold a table (a header row, whether or not the
    columns given for every sheet fit it)."""
    count = 0
    for name in names:
        columns = sheet_columns(options, name, single_table=False)
        pairs = []
        for pair in reader.rows(name):
            pairs.append(pair)
            if len(pairs) >= HEADER_SEARCH_ROWS and (
                columns.header_row is None or pair[0] >= columns.header_row
            ):
                break
        numbers = [n for n, _cells in pairs]
        index = None
        if columns.header_row is not None:
            index = numbers.index(columns.header_row) if columns.header_row in numbers else len(pairs)
        try:
            layout_of([cells for _n, cells in pairs], columns, index)
        except LayoutError as exc:
            if exc.kind == NO_TABLE and index is None:
                continue
        except CellchemError:
            pass
        count += 1
    return count


def _audit_workbook(path: Path, report: FileReport, options: Options, run: AuditRun) -> None:
    from .xlsx import Book

    with Book(path) as book:
        _audit_book(book, path, report, options, run)


def _audit_book(book, path: Path, report: FileReport, options: Options, run: AuditRun) -> None:
    """The audit of every chosen sheet of an open workbook (any reader with
    ``sheets`` and ``rows(name)``)."""
    sheets = book.sheets
    hidden = [s.name for s in sheets if s.state != "visible"]
    if options.sheet is not None:
        chosen = [s for s in sheets if s.name == options.sheet]
        if not chosen:
            raise UnusableFile(
                f"'{path.name}' has no sheet named '{options.sheet}'; its sheets are: "
                + ", ".join(repr(s.name) for s in sheets)
            )
    else:
        chosen = [s for s in sheets if s.state == "visible" or options.hidden]
        report.hidden = [] if options.hidden else hidden
    layout_options = options.layout_options()
    single = (
        options.sheet is not None
        or len(chosen) <= 1
        or not layout_options.general
        or tables_in(book, [i.name for i in chosen], layout_options) <= 1
    )
    for info in chosen:
        sheet = SheetReport(str(path), info.name)
        report.sheets.append(sheet)
        if info.state != "visible":
            sheet.notes.append(f"sheet '{info.name}' is {info.state}")
        rows = book.rows(info.name)
        _audit_table(
            sheet,
            rows,
            options,
            run.findings,
            columns=sheet_columns(layout_options, info.name, single),
        )
        if sheet.no_roles:
            sheet.summary.add_finding(WARNING, COLUMNS_CHECK)
            run.findings.append(
                FindingRecord(
                    str(path),
                    info.name,
                    sheet.header_row,
                    "",
                    COLUMNS_CHECK,
                    WARNING,
                    f"the sheet has a table but no column read as name or formula, so its lines were"
                    f" not checked: {sheet.error}",
                    f"--column '{info.name}:formula=LETTER'",
                )
            )
        if getattr(rows, "truncated", False):
            sheet.notes.append(f"columns beyond {column_letter(MAX_COLUMNS - 1)} were not read")
    if report.sheets and all(s.error for s in report.sheets):
        report.error = f"'{path.name}': " + "; ".join(f"sheet '{s.sheet}': {s.error}" for s in report.sheets)
