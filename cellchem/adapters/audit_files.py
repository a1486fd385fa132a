"""The audit over files: pre-check, read, find the header, check each row,
collect findings and counts. The command line prints and writes what this
returns; the checks themselves are ``cellchem.audit``'s."""

from __future__ import annotations

import sys
from collections.abc import Callable, Iterator, Mapping, Sequence
from dataclasses import dataclass, field
from itertools import chain, islice
from pathlib import Path

from ..audit import Summary, iter_audit
from ..columns import HEADER_SEARCH_ROWS, column_letter, find_layout
from ..errors import CellchemError
from .files import MAX_COLUMNS, UnusableFile, one_line
from .reports import FindingRecord


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


@dataclass
class FileReport:
    path: str
    kind: str = ""
    sheets: list[SheetReport] = field(default_factory=list)
    hidden: list[str] = field(default_factory=list)  # hidden sheets not read
    notes: list[str] = field(default_factory=list)
    error: str = ""  # the file could not be used


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


@dataclass(frozen=True)
class Options:
    columns: Mapping[str, str] = field(default_factory=dict)
    sheet: str | None = None
    hidden: bool = False
    encoding: str | None = None
    delimiter: str | None = None
    mass_allowance: float | None = None


def _progress(iterable, total: int | None, label: str):
    if not sys.stderr.isatty():
        return iterable
    try:
        from tqdm import tqdm
    except ImportError:  # pragma: no cover - tqdm is a dependency
        return iterable
    return tqdm(iterable, total=total, desc=label, unit=" rows", leave=False, file=sys.stderr)


def _audit_table(
    report: SheetReport,
    rows: Iterator[Sequence[object]],
    options: Options,
    findings: list[FindingRecord],
    *,
    numbers: Callable[[int], int] | None = None,
    decimal_comma: bool | None = None,
    total: int | None = None,
) -> None:
    head = list(islice(rows, HEADER_SEARCH_ROWS))
    try:
        layout = find_layout(head, options.columns)
    except CellchemError as exc:
        report.error = str(exc)
        report.no_table = True
        return
    number_of = numbers or (lambda i: i + 1)
    report.header_row = number_of(layout.header_index)
    report.roles = {
        role: f"{column_letter(i)} {layout.headers[i]!r}" if i < len(layout.headers) else column_letter(i)
        for role, i in layout.roles.items()
    }
    for dup in layout.duplicates:
        report.notes.append(f"duplicate heading {dup}; the first is used")
    body = chain(head[layout.header_index + 1 :], rows)
    first = layout.header_index + 1
    row_numbers = (number_of(i) for i in range(first, 1 << 62))
    label = f"{Path(report.file).name} {report.sheet}".strip()
    for result in iter_audit(
        _progress(body, total, label),
        layout,
        first + 1,
        row_numbers=row_numbers,
        mass_allowance=options.mass_allowance,
        decimal_comma=decimal_comma,
    ):
        report.summary.add(result)
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
    its FileReport's ``error``, never raised."""
    from .precheck import precheck

    p = Path(path)
    report = FileReport(str(path))
    run.files.append(report)
    try:
        report.kind = precheck(p)
        if report.kind == "text":
            _audit_text(p, report, options, run)
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


def _audit_text(path: Path, report: FileReport, options: Options, run: AuditRun) -> None:
    from .textfile import read_text_table

    table = read_text_table(path, encoding=options.encoding, delimiter=options.delimiter)
    names = {",": "commas", ";": "semicolons", "\t": "tabs"}
    report.notes.append(
        f"read as {table.encoding}, fields separated by {names.get(table.delimiter, repr(table.delimiter))}"
        + (", numbers with a decimal comma" if table.decimal_comma else "")
    )
    report.notes.extend(n for n in table.notes if "decimal comma" not in n)
    sheet = SheetReport(str(path), "")
    report.sheets.append(sheet)
    lines = table.line_numbers
    _audit_table(
        sheet,
        iter(table.rows),
        options,
        run.findings,
        numbers=lambda i: lines[i] if i < len(lines) else i + 1,
        decimal_comma=table.decimal_comma,
        total=len(table.rows),
    )
    if sheet.error:
        report.error = f"'{path.name}': {sheet.error}"


def _audit_workbook(path: Path, report: FileReport, options: Options, run: AuditRun) -> None:
    from .workbook import WorkbookReader, list_sheets

    sheets = list_sheets(path)
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
    with WorkbookReader(path) as reader:
        names = set(reader.sheet_names)
        for info in chosen:
            if info.name not in names:
                continue  # a chartsheet or a dialog sheet: no cells
            sheet = SheetReport(str(path), info.name)
            report.sheets.append(sheet)
            if info.state != "visible":
                sheet.notes.append(f"sheet '{info.name}' is {info.state}")
            _audit_table(sheet, reader.rows(info.name), options, run.findings)
            if getattr(reader, "truncated", False):
                sheet.notes.append(f"columns beyond {column_letter(MAX_COLUMNS - 1)} were not read")
    if report.sheets and all(s.error for s in report.sheets):
        report.error = f"'{path.name}': " + "; ".join(f"sheet '{s.sheet}': {s.error}" for s in report.sheets)
