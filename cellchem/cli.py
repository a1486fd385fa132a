"""The ``cellchem`` command: thin wiring of the core to files and the terminal.

Exit codes: 0 nothing wrong found, 1 findings of severity error, 2 a file or
the command line could not be used.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence
from pathlib import Path

from . import __version__
from .audit import ERROR, NOTE, STANDARD_WEIGHTS, WARNING, WEIGHT_PRESETS
from .errors import CellchemError, OutputError, UsageError

EXIT_CLEAN = 0
EXIT_FINDINGS = 1
EXIT_USAGE = 2

_FORMULA_HEADERS = ("formula", "molecular formula", "chemical formula", "formel")
_NAME_HEADERS = (
    "name",
    "chemical name",
    "item",
    "description",
    "product",
    "substance",
    "chemical",
    "product name",
)
_MASS_HEADERS = (
    "molar mass",
    "molar mass (g/mol)",
    "mw",
    "m.w.",
    "mol. wt.",
    "molecular weight",
    "fw",
    "formula weight",
)


def _cmd_check_formulas(args: argparse.Namespace) -> int:
    """The first command of the project, kept for scripts: ``audit`` of one
    file with every finding shown, its column options passed on as
    ``--column``."""
    argv = ["audit", args.file, "--show", "all"]
    for role, header in (
        ("formula", args.formula_column),
        ("name", args.name_column),
        ("molar_mass", args.mass_column),
    ):
        if header:
            argv += ["--column", f"{role}={header}"]
    return main(argv)


_SEVERITY_ORDER = {ERROR: 0, WARNING: 1, NOTE: 2}
_SEVERITY_GROUPS = {ERROR: "Lines with errors", WARNING: "Lines with warnings", NOTE: "Lines with notes"}
_ROLE_TITLES = {"molar_mass": "molar mass", "cas": "CAS RN"}


def _plural(n: int, word: str) -> str:
    return f"{n} {word}" if n == 1 else f"{n} {word}s"


def _summary_lines(run, min_severity: str = NOTE, unused: Sequence[str] = ()) -> list[str]:
    """The summary printed at the end of an audit (and written to the findings workbook)."""
    total = run.summary
    files = run.files
    sheets = sum(len(f.sheets) for f in files)
    skipped = sum(1 for f in files if f.skipped)
    out = [
        f"files: {len(files)} ({len(run.unusable)} could not be used"
        + (f", {skipped} skipped" if skipped else "")
        + f"); sheets and tables: {sheets}; data rows read: {total.rows} ({total.blank} blank)"
    ]
    for f in files:
        if f.skipped:
            out.append(f"  {f.path}: note: {f.skipped}")
            continue
        if f.error:
            out.append(f"  {f.path}: NOT READ: {f.error}")
            continue
        for note in f.notes:
            out.append(f"  {f.path}: {note}")
        for sh in f.sheets:
            where = f"{f.path}" + (f" [{sh.sheet}]" if sh.sheet else "")
            if sh.error and sh.no_roles and len(f.sheets) > 1:
                out.append(
                    f"  {where}: WARNING: a table with no name or formula column, not audited: {sh.error}"
                )
                continue
            if sh.error and sh.not_matched:
                out.append(
                    f"  {where}: note: not audited, the columns given do not match this sheet: {sh.error}"
                )
                continue
            if sh.error and sh.no_table and len(f.sheets) > 1:
                out.append(f"  {where}: not audited: no header row naming a name or formula column")
                continue
            if sh.error:
                out.append(f"  {where}: not audited: {sh.error}")
                continue
            roles = ", ".join(f"{_ROLE_TITLES.get(role, role)} {col}" for role, col in sh.roles.items())
            out.append(f"  {where}: header row {sh.header_row}; {roles}; {sh.summary.rows} rows")
            for note in sh.notes:
                out.append(f"    {note}")
        if f.hidden:
            out.append(
                f"  {f.path}: hidden sheets not read: {', '.join(repr(h) for h in f.hidden)} (--hidden"
                " reads them)"
            )
    out.extend(f"  note: {u}" for u in unused)
    out.append(f"lines checked: {total.checked}")
    not_checked = sum(total.not_checked.values())
    out.append(f"lines not checked: {not_checked}")
    for reason, n in total.not_checked.most_common():
        out.append(f"  {n:>6}  {reason}")
    sev = total.severities
    out.append(
        f"findings: {_plural(sev[ERROR], 'error')}, {_plural(sev[WARNING], 'warning')},"
        f" {_plural(sev[NOTE], 'note')}"
        + (
            f" (all counted; {'notes are' if min_severity == WARNING else 'warnings and notes are'} not"
            f" printed or reported: --min-severity {min_severity})"
            if min_severity != NOTE
            else ""
        )
    )
    for (severity, check), n in sorted(
        total.checks.items(), key=lambda kv: (_SEVERITY_ORDER[kv[0][0]], -kv[1])
    ):
        out.append(f"  {n:>6}  {severity:<8} {check}")
    return out


def _kept(records, min_severity: str) -> list:
    limit = _SEVERITY_ORDER[min_severity]
    return [r for r in records if _SEVERITY_ORDER[r.severity] <= limit]


def _column_key(column: str) -> tuple[int, str]:
    return (len(column), column)


def report_order(run, records) -> list:
    """Findings sorted for the reports: by severity, then file (in the order
    given), sheet (in workbook order), row and column."""
    order = run.order()
    return sorted(
        records,
        key=lambda r: (
            _SEVERITY_ORDER[r.severity],
            order.get((r.file, r.sheet), len(order)),
            r.row,
            _column_key(r.column),
        ),
    )


def print_order(run, records) -> list[tuple[str, list]]:
    """Findings grouped for printing: each line's findings together (by
    severity, then column), lines grouped by their worst finding (errors
    first), in file, sheet and row order within a group. Returns
    (severity, findings) for each group that has findings."""
    order = run.order()
    lines: dict[tuple, list] = {}
    for r in records:
        lines.setdefault((order.get((r.file, r.sheet), len(order)), r.row, r.file, r.sheet), []).append(r)
    groups: dict[str, list] = {ERROR: [], WARNING: [], NOTE: []}
    for key in sorted(lines, key=lambda k: k[:2]):
        found = sorted(lines[key], key=lambda r: (_SEVERITY_ORDER[r.severity], _column_key(r.column)))
        groups[found[0].severity].extend(found)
    return [(severity, found) for severity, found in groups.items() if found]


def _unused_sheet_options(run, options) -> list[str]:
    """Per-sheet --column and --header-row options that named no sheet of any file."""
    seen = set()
    for f in run.files:
        seen.update(s.sheet.casefold() for s in f.sheets)
        seen.update(h.casefold() for h in f.hidden)
    return [
        f"--column or --header-row for sheet '{name}': no file read has a sheet of that name"
        for name in sorted(options.sheets_named())
        if name.casefold() not in seen
    ]


def _column_options(args: argparse.Namespace):
    from .columns import read_column_options

    return read_column_options(args.column or [], args.header_row or [])


def _cmd_audit(args: argparse.Namespace) -> int:
    from .adapters.files import UnusableFile
    from .adapters.files.audit import AuditRun, Options, audit_file
    from .adapters.files.precheck import require_defusedxml
    from .errors import CellchemError

    try:
        require_defusedxml()
        column_options = _column_options(args)
    except (CellchemError, UnusableFile) as exc:
        raise UsageError(str(exc)) from None
    for target in (args.report, args.output):
        if target is None:
            continue
        for f in args.files:
            try:
                if Path(target).resolve() == Path(f).resolve():
                    raise UsageError(
                        f"the report '{target}' would overwrite the input '{f}'; choose another name"
                    )
            except OSError:
                pass
    if args.show != "all" and not (args.show.isdigit()):
        raise UsageError(f"--show {args.show!r}: expected a number of findings or 'all'")
    if args.report and Path(args.report).suffix.lower() not in (".json", ".csv"):
        raise UsageError(f"--report '{args.report}': the name must end in .json or .csv")
    if args.output and Path(args.output).suffix.lower() != ".xlsx":
        raise UsageError(f"-o '{args.output}': the findings workbook must be an .xlsx file")
    options = Options(
        columns=dict(column_options.general),
        sheet=args.sheet,
        hidden=args.hidden,
        encoding=args.encoding,
        delimiter=args.delimiter,
        mass_allowance=args.mass_allowance,
        column_options=column_options,
        weights=args.weights,
    )
    run = AuditRun()
    for f in args.files:
        audit_file(f, options, run)
    out = sys.stdout
    kept = _kept(run.findings, args.min_severity)
    groups = print_order(run, kept)
    total = sum(len(found) for _severity, found in groups)
    limit = total if args.show == "all" else int(args.show)
    printed = 0
    for severity, found in groups:
        if printed >= limit:
            break
        out.write(f"{_SEVERITY_GROUPS[severity]}:\n")
        for r in found[: limit - printed]:
            where = r.file + (f" [{r.sheet}]" if r.sheet else "") + f" {r.column}{r.row}"
            fix = f"  -> {r.suggestion}" if r.suggestion else ""
            out.write(f"{where}  {r.severity}  {r.check}: {r.message}{fix}\n")
            printed += 1
        out.write("\n")
    if total > printed:
        out.write(f"... {total - printed} more findings (--show all prints them; --report writes them)\n\n")
    lines = _summary_lines(run, args.min_severity, _unused_sheet_options(run, column_options))
    out.write("\n".join(lines) + "\n")
    from .adapters.files import reports

    ordered = report_order(run, kept)
    try:
        if args.report:
            if args.report.lower().endswith(".json"):
                reports.write_json(args.report, ordered)
            else:
                reports.write_csv(args.report, ordered)
            out.write(f"report written: {args.report}\n")
        if args.output:
            reports.write_workbook(args.output, ordered, [(line.strip(), "") for line in lines])
            out.write(f"findings workbook written: {args.output}\n")
    except OSError as exc:
        raise OutputError(f"could not write the report: {exc.strerror or exc}") from None
    if args.annotate and not _annotate(args, run, ordered, column_options, out):
        return EXIT_USAGE
    if run.unusable:
        return EXIT_USAGE
    return EXIT_FINDINGS if run.summary.severities[ERROR] else EXIT_CLEAN


def _annotate(args: argparse.Namespace, run, ordered, column_options, out) -> bool:
    """Write an annotated copy of each usable file: the verdict column, and for
    a workbook a sheet of its findings. False when a copy could not be
    written (the command then exits 2)."""
    from .adapters.files.fill import FillOptions, derived_output, fill_file
    from .adapters.files.ooxml import FINDINGS_HEADERS
    from .fill import read_columns

    usable = [f for f in run.files if not f.error and not f.skipped]
    written = True
    if isinstance(args.annotate, str) and len(args.files) > 1:
        raise UsageError("--annotate PATH names one output: give one input file, or --annotate alone")
    options = FillOptions(
        columns=read_columns("verdict"),
        overrides=dict(column_options.general),
        sheet=args.sheet,
        mass_allowance=args.mass_allowance,
        column_options=column_options,
        weights=args.weights,
    )
    for f in usable:
        src = Path(f.path)
        target = Path(args.annotate) if isinstance(args.annotate, str) else derived_output(src, "annotated")
        if target.resolve() == src.resolve():
            raise UsageError(f"--annotate '{target}' is the input; cellchem never writes the input file")
        extra = None
        if f.kind in ("xlsx", "ods"):
            rows: list[list[object]] = [list(FINDINGS_HEADERS)]
            for r in ordered:
                if r.file == f.path:
                    cell = f"{r.column or 'A'}{r.row}" if r.row else ""
                    rows.append(
                        [cell, r.sheet, r.row, r.column, r.check, r.severity, r.message, r.suggestion]
                    )
            extra = ("cellchem findings", rows)
        try:
            fill_file(src, target, options, extra)
        except CellchemError as exc:
            out.write(f"annotated copy not written for {f.path}: {exc}\n")
            written = False
            continue
        out.write(f"annotated copy written: {target}\n")
    return written


def _cmd_fill(args: argparse.Namespace) -> int:
    from .adapters.files import UnusableFile
    from .adapters.files.fill import FillOptions, derived_output, fill_file
    from .adapters.files.precheck import require_defusedxml
    from .errors import CellchemError
    from .fill import read_columns

    try:
        require_defusedxml()
        column_options = _column_options(args)
        options = FillOptions(
            columns=read_columns(args.add),
            overrides=dict(column_options.general),
            sheet=args.sheet,
            overwrite=args.overwrite,
            mass_allowance=args.mass_allowance,
            column_options=column_options,
            weights=args.weights,
        )
    except (CellchemError, UnusableFile) as exc:
        raise UsageError(str(exc)) from None
    src = Path(args.file)
    out = Path(args.output) if args.output else derived_output(src)
    if not args.output and out.exists():
        raise UsageError(f"'{out}' already exists; remove it or name another output with -o")
    report = fill_file(src, out, options)  # a CellchemError ends the command with its exit code
    w = sys.stdout.write
    where = f" sheet '{report.sheet}'," if report.sheet else ""
    w(f"written: {report.output} (from {report.source},{where} header row {report.header_row})\n")
    w("columns: " + ", ".join(f"{letter} '{header}'" for letter, header in report.columns) + "\n")
    w(f"lines filled: {report.filled}\n")
    if report.partly:
        w(
            f"  of which filled in part: {report.partly} (the name does not say the water of crystallisation:"
            " only cations and anions)\n"
        )
    not_filled = sum(report.not_filled.values())
    w(
        f"lines not filled: {not_filled}"
        + (" (the check column or cellchem audit says why)" if not_filled else "")
        + "\n"
    )
    if report.kept_existing:
        w(f"cells kept because they already hold a value or a formula: {report.kept_existing}\n")
    for note in report.notes:
        w(f"note: {note}\n")
    return EXIT_FINDINGS if not_filled else EXIT_CLEAN


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="cellchem",
        description="Ionic chemistry for chemical stores: check the formulas and molar masses of a list.",
    )
    parser.add_argument("--version", action="version", version=f"cellchem {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    check = sub.add_parser(
        "check-formulas",
        help="the same as 'audit FILE --show all' (kept for scripts that use it)",
        description=(
            "The same as 'cellchem audit FILE --show all': the column options become --column."
            " Example: cellchem check-formulas workbooks/demo-stock-list.csv"
        ),
    )
    check.add_argument("file", help="a CSV file or workbook, e.g. workbooks/demo-stock-list.csv")
    check.add_argument(
        "--formula-column",
        metavar="HEADER",
        help="the header of the formula column, e.g. --formula-column 'Formula'",
    )
    check.add_argument(
        "--mass-column", metavar="HEADER", help="the header of the molar-mass column, e.g. --mass-column 'MW'"
    )
    check.add_argument(
        "--name-column",
        metavar="HEADER",
        help="the header of the name column, e.g. --name-column 'Description'",
    )
    check.set_defaults(run=_cmd_check_formulas)

    audit = sub.add_parser(
        "audit",
        help="audit inventory workbooks and supplier tables: names, formulas, molar masses and CAS RNs",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Check every line of inventory workbooks and supplier tables (.xlsx, .xlsm, .csv, .txt): that"
            " the\n"
            "formula reads and balances, that the name describes the formula, that the stated molar mass\n"
            "matches, and that the CAS RN has a valid check digit. Files are only read, never changed.\n\n"
            "Example: cellchem audit workbooks/demo-inventory.xlsx --report findings.json\n"
            "         cellchem audit stock.xlsx --column 'Old stock:formula=B' --min-severity warning"
            " -o findings.xlsx\n\n"
            "Exit codes: 0 no errors found, 1 findings of severity error, 2 a file or the command line\n"
            "could not be used."
        ),
    )
    audit.add_argument("files", nargs="+", metavar="FILE", help="workbooks or CSV/TXT exports to audit")
    audit.add_argument(
        "--sheet", metavar="NAME", help="audit only this sheet of each workbook, e.g. --sheet 'Stock 2026'"
    )
    audit.add_argument(
        "--hidden", action="store_true", help="also audit hidden sheets (the summary lists them otherwise)"
    )
    audit.add_argument(
        "--column",
        action="append",
        metavar="[SHEET:]ROLE=HEADER_OR_LETTER",
        help="say which column holds a role when its heading is not recognised; roles: name, formula,"
        " molar_mass, cas, concentration, quantity, unit, count, location, ec, un, signal_word,"
        " hazard_statements (or h), precautionary_statements (or p), pictograms, storage_class."
        " Without SHEET it applies to every sheet (a"
        " sheet that lacks the heading is noted as not matched, not audited); with SHEET only to that"
        " sheet, and it wins there. Repeatable, e.g. --column formula=C --column 'molar_mass=Mol. Wt.'"
        " --column 'Old stock:formula=B'",
    )
    audit.add_argument(
        "--header-row",
        action="append",
        metavar="[SHEET:]N",
        help="the 1-based row of the header (the line number in a CSV/TXT file), when it is not found"
        " among the first 20 rows or another row is wanted; with SHEET for that sheet only;"
        " e.g. --header-row 4 --header-row 'Old stock:1'",
    )
    audit.add_argument(
        "--min-severity",
        choices=(ERROR, WARNING, NOTE),
        default=NOTE,
        help="the least severe findings printed and written to the reports (default note: all); the"
        " summary counts every finding, e.g. --min-severity warning",
    )
    audit.add_argument(
        "--report",
        metavar="PATH",
        help="write every finding to a new .json (a list of objects) or .csv file,"
        " e.g. --report findings.csv",
    )
    audit.add_argument(
        "-o",
        "--output",
        metavar="PATH.xlsx",
        help="write a findings workbook (a new file: a filterable table and a summary sheet),"
        " e.g. -o findings.xlsx",
    )
    audit.add_argument(
        "--encoding",
        metavar="NAME",
        help="the encoding of CSV/TXT files when it is not detected, e.g. --encoding cp1252 (detected:"
        " UTF-8 with or without BOM, UTF-16 with BOM, cp1252)",
    )
    audit.add_argument(
        "--delimiter",
        metavar="CHAR",
        help="the separator of CSV/TXT files: comma, semicolon or tab (detected when not given),"
        " e.g. --delimiter semicolon",
    )
    audit.add_argument(
        "--mass-allowance",
        type=float,
        metavar="G_PER_MOL",
        help="how far a stated molar mass may differ beyond its printed rounding, in g/mol (default: 0.01"
        " g/mol or 0.01 %%, whichever is larger), e.g. --mass-allowance 0.05",
    )
    audit.add_argument(
        "--weights",
        choices=WEIGHT_PRESETS,
        default=STANDARD_WEIGHTS,
        help="atomic weights a stated molar mass may be computed with: 'standard' (IUPAC/CIAAW, the"
        " default) or 'school', which also accepts the rounded weights of school data books (Cl 35.5,"
        " Cu 63.5), e.g. --weights school",
    )
    audit.add_argument(
        "--annotate",
        nargs="?",
        const=True,
        default=None,
        metavar="PATH",
        help="also write a copy of each file with a 'cellchem check' column (and, for a workbook, a sheet of"
        " its findings); the copy is named FILE-annotated unless PATH is given, e.g. --annotate",
    )
    audit.add_argument(
        "--show",
        default="50",
        metavar="N",
        help="how many findings to print before the summary (default 50; 'all' or 0). Lines with errors"
        " come first, then lines with warnings, then notes; each line's findings are printed together,"
        " lines in file, sheet and row order; e.g. --show all",
    )
    audit.set_defaults(run=_cmd_audit)

    fill = sub.add_parser(
        "fill",
        help="write a copy of a workbook or CSV with computed columns added (formula, name, molar mass, ...)",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Write a copy of FILE with computed columns added after the table: canonical formula,"
            " systematic\n"
            "name, molar mass, water of crystallisation, cations and anions (or the columns --add names).\n"
            "Everything else in the workbook is kept as it was; the input is never written. Nothing is\n"
            "written that a cell of the line contradicts, and nothing the line does not fix: a line whose\n"
            "cells disagree gets no values, and the check column (--add verdict) says why.\n\n"
            "Example: cellchem fill workbooks/demo-inventory.xlsx -o inventory-filled.xlsx\n"
            "         cellchem fill stock.xlsx --sheet Stock --header-row 3 --column formula=D\n\n"
            "Exit codes: 0 written, 1 written but some lines could not be filled, 2 nothing written."
        ),
    )
    fill.add_argument("file", metavar="FILE", help="a .xlsx, .xlsm, .csv or .txt file")
    fill.add_argument(
        "-o",
        "--output",
        metavar="PATH",
        help="the new file (default: FILE's name with -filled), e.g. -o out.xlsx",
    )
    fill.add_argument("--sheet", metavar="NAME", help="the sheet to fill (default: the first with a table)")
    fill.add_argument(
        "--add",
        metavar="LIST",
        help="the columns to add, comma-separated: formula, name, molar-mass, water, cations, anions,"
        " mass-fraction=X, ionic-strength, verdict; e.g. --add molar-mass,mass-fraction=Cu,verdict",
    )
    fill.add_argument(
        "--overwrite",
        action="store_true",
        help="replace values in a column cellchem filled before (cells with formulas are never written)",
    )
    fill.add_argument(
        "--column",
        action="append",
        metavar="[SHEET:]ROLE=HEADER_OR_LETTER",
        help="say which column holds a role, as for audit, e.g. --column formula=C or"
        " --column 'Stock:formula=C'",
    )
    fill.add_argument(
        "--header-row",
        action="append",
        metavar="[SHEET:]N",
        help="the 1-based row of the header, as for audit, e.g. --header-row 4",
    )
    fill.add_argument(
        "--mass-allowance", type=float, metavar="G_PER_MOL", help="as for audit, e.g. --mass-allowance 0.05"
    )
    fill.add_argument(
        "--weights",
        choices=WEIGHT_PRESETS,
        default=STANDARD_WEIGHTS,
        help="as for audit, e.g. --weights school",
    )
    fill.set_defaults(run=_cmd_fill)

    calc = sub.add_parser(
        "calc-extension",
        help="build the LibreOffice extension that adds the worksheet functions to Calc",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Build cellchem.oxt, a LibreOffice extension with the worksheet functions as a Calc\n"
            "add-in. Needs LibreOffice and its SDK's unoidl-write (Debian: libreoffice-calc-nogui,\n"
            "libreoffice-dev). Install the result with: unopkg add cellchem.oxt\n\n"
            "Example: cellchem calc-extension -o cellchem.oxt"
        ),
    )
    calc.add_argument("-o", "--output", metavar="PATH", default="cellchem.oxt", help="default cellchem.oxt")
    calc.add_argument("--office", metavar="DIR", help="LibreOffice's directory (default: found from soffice)")
    calc.add_argument(
        "--sdk", metavar="DIR", help="the SDK's directory or unoidl-write itself (default: found)"
    )
    calc.set_defaults(run=_cmd_calc_extension)

    survey = sub.add_parser(
        "survey",
        help="the whole store: totals per substance, duplicates, elements of concern, what should not share"
        " a shelf",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Read every line of the files given (as the audit reads them) and answer what no single line\n"
            "answers: how much of each substance is held across sheets and files (pack sizes as suppliers\n"
            "print them), the same substance twice at one location, the mass on site of elements and ions\n"
            "of concern, and families of substances that should not share a location. Files are only\n"
            "read.\n\n"
            "An empty list of families means only that these rules found nothing: the supplier's SDS\n"
            "(sections 7 and 10), local regulations and the site's safety officer decide.\n\n"
            "Example: cellchem survey workbooks/demo-store.xlsx -o survey.xlsx --json survey.json\n"
            "         cellchem survey stock.xlsx --concern Hg,Pb,Cr(VI),CN\n\n"
            "Exit codes: 0 nothing to act on, 1 families that should not share a location or audit\n"
            "errors, 2 a file or the command line could not be used."
        ),
    )
    survey.add_argument("files", nargs="+", metavar="FILE", help="workbooks or CSV/TXT exports of the store")
    survey.add_argument(
        "--concern",
        metavar="LIST",
        help="the elements and ions of concern, comma-separated (default: Hg, Pb, Cd, Cr(VI), As, Ba, Se,"
        " Ag, Tl, Be, Ni), e.g. --concern Hg,Pb,Cr(VI),CN",
    )
    survey.add_argument("-o", "--output", metavar="PATH.xlsx", help="write the survey as a new workbook")
    survey.add_argument("--json", metavar="PATH.json", help="write the survey as a new JSON file")
    survey.add_argument("--sheet", metavar="NAME", help="read only this sheet of each workbook")
    survey.add_argument("--hidden", action="store_true", help="also read hidden sheets")
    survey.add_argument(
        "--column", action="append", metavar="[SHEET:]ROLE=HEADER_OR_LETTER", help="as for audit"
    )
    survey.add_argument("--header-row", action="append", metavar="[SHEET:]N", help="as for audit")
    survey.add_argument("--encoding", metavar="NAME", help="as for audit")
    survey.add_argument("--delimiter", metavar="CHAR", help="as for audit")
    survey.set_defaults(run=_cmd_survey)

    lite = sub.add_parser(
        "excel-lite",
        help="write main.py and requirements.txt for the worksheet functions in Excel through xlwings Lite",
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Write main.py, requirements.txt and HOW-TO.txt into a folder: what to paste into the\n"
            "xlwings Lite add-in so that Excel (Windows, macOS, the web) has the worksheet functions\n"
            "as =CELLCHEM.MOLAR_MASS(...) and the others, with no Python installed.\n\n"
            "Example: cellchem excel-lite --wheel-url https://stores.example.org/py/"
            f"cellchem-{__version__}-py3-none-any.whl"
        ),
    )
    lite.add_argument(
        "--wheel-url",
        metavar="URL",
        help="the https:// address where the cellchem wheel is hosted (default: cellchem by name, from PyPI)",
    )
    lite.add_argument(
        "-o", "--output", metavar="DIR", default="cellchem-excel-lite", help="default cellchem-excel-lite"
    )
    lite.set_defaults(run=_cmd_excel_lite)
    return parser


def _cmd_survey(args: argparse.Namespace) -> int:
    import json

    from .adapters.files import UnusableFile
    from .adapters.files.audit import Options
    from .adapters.files.precheck import require_defusedxml
    from .adapters.files.reports import write_tables
    from .adapters.files.survey import as_json, summary_rows, survey, text_report, workbook_sheets
    from .adapters.files.writer import write_atomically
    from .store import DEFAULT_CONCERN

    try:
        require_defusedxml()
        column_options = _column_options(args)
    except (CellchemError, UnusableFile) as exc:
        raise UsageError(str(exc)) from None
    if args.output and Path(args.output).suffix.lower() != ".xlsx":
        raise UsageError(f"-o '{args.output}': the survey workbook must be an .xlsx file")
    if args.json and Path(args.json).suffix.lower() != ".json":
        raise UsageError(f"--json '{args.json}': the name must end in .json")
    for target in (args.output, args.json):
        for f in args.files:
            if target and Path(target).resolve() == Path(f).resolve():
                raise UsageError(f"'{target}' would overwrite the input '{f}'; choose another name")
    parts = (
        DEFAULT_CONCERN
        if not args.concern
        else tuple(p.strip() for p in args.concern.split(",") if p.strip())
    )
    options = Options(
        columns=dict(column_options.general),
        sheet=args.sheet,
        hidden=args.hidden,
        encoding=args.encoding,
        delimiter=args.delimiter,
        column_options=column_options,
    )
    try:
        result = survey(args.files, options, parts)
    except CellchemError as exc:
        raise UsageError(f"--concern: {exc}") from None
    out = sys.stdout
    out.write("\n".join(text_report(result)) + "\n\n")
    lines = _summary_lines(result.run, NOTE, _unused_sheet_options(result.run, column_options))
    out.write("audit of the same lines (cellchem audit FILE prints its findings):\n")
    out.write("\n".join(lines) + "\n")
    ordered = report_order(result.run, result.run.findings)
    if args.output:
        write_tables(args.output, workbook_sheets(result, ordered), summary_rows(result))
        out.write(f"survey workbook written: {args.output}\n")
    if args.json:
        data = json.dumps(as_json(result), ensure_ascii=False, indent=1).encode("utf-8")
        write_atomically(Path(args.json), lambda fh: fh.write(data))
        out.write(f"survey JSON written: {args.json}\n")
    if result.run.unusable:
        return EXIT_USAGE
    return EXIT_FINDINGS if result.conflicts or result.run.summary.severities[ERROR] else EXIT_CLEAN


def _cmd_excel_lite(args: argparse.Namespace) -> int:
    from .adapters.files.writer import write_atomically
    from .adapters.sheets import lite

    try:
        texts = {
            "main.py": lite.main_source(),
            "requirements.txt": lite.requirements(args.wheel_url),
            "HOW-TO.txt": lite.instructions(args.wheel_url),
        }
    except CellchemError as exc:
        raise UsageError(str(exc)) from None
    folder = Path(args.output)
    existing = [name for name in texts if (folder / name).exists()]
    if existing:
        raise UsageError(f"'{folder}' already holds {', '.join(existing)}; remove them or name another -o")
    try:
        folder.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise OutputError(f"cannot make the folder '{folder}': {exc.strerror or exc}") from None
    for name, text in texts.items():
        write_atomically(folder / name, lambda fh, t=text: fh.write(t.encode("utf-8")))
    print(f"wrote {folder / 'main.py'}, {folder / 'requirements.txt'} and {folder / 'HOW-TO.txt'}")
    print(lite.instructions(args.wheel_url).split("\n\n", 2)[1])
    return EXIT_CLEAN


def _cmd_calc_extension(args: argparse.Namespace) -> int:
    from .adapters.sheets.calc.build import BuildError, build

    try:
        path = build(args.output, office=args.office, sdk=args.sdk)
    except BuildError as exc:
        print(f"cellchem: {exc}", file=sys.stderr)
        return EXIT_USAGE
    print(f"wrote {path}; install it with: unopkg add {path}")
    return EXIT_CLEAN


def main(argv: Sequence[str] | None = None) -> int:
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse exits 2 on bad usage, 0 on --help
        return int(exc.code or 0)
    if not getattr(args, "run", None):
        parser.print_help()
        return EXIT_USAGE
    try:
        return args.run(args)
    except (
        CellchemError
    ) as exc:  # a usage error, a file that cannot be used, an output that cannot be written
        print(f"cellchem: {exc}", file=sys.stderr)
        return exc.exit_code
    except MemoryError:
        print(
            "cellchem: this machine has not enough memory for the command; nothing was written",
            file=sys.stderr,
        )
        return EXIT_USAGE
    except BrokenPipeError:  # the output was piped to a program that stopped reading (head, less)
        import os

        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())  # no second error when Python flushes stdout at exit
        return 141  # 128 + SIGPIPE, as a shell reports a command that a pipe stopped


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
