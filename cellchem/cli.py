"""The ``cellchem`` command: thin wiring of the core to files and the terminal.

Exit codes: 0 nothing wrong found, 1 findings of severity error, 2 a file or
the command line could not be used.
"""

from __future__ import annotations

import argparse
import csv
import sys
from collections.abc import Sequence
from pathlib import Path

from . import __version__
from .audit import ERROR, NOTE, WARNING, check_line

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


class UsageError(Exception):
    """A file or the command line cannot be used (exit code 2)."""


def _find_column(headers: list[str], wanted: Sequence[str], override: str | None) -> int | None:
    cleaned = [h.strip().casefold() for h in headers]
    if override:
        key = override.strip().casefold()
        if key in cleaned:
            return cleaned.index(key)
        raise UsageError(
            f"no column headed '{override}'; the headers are: " + ", ".join(repr(h) for h in headers)
        )
    for i, h in enumerate(cleaned):
        if h in wanted:
            return i
    for i, h in enumerate(cleaned):
        if any(h.startswith(w) for w in wanted):
            return i
    return None


def _read_csv(path: Path) -> list[list[str]]:
    try:
        raw = path.read_bytes()
    except OSError as exc:
        raise UsageError(f"cannot read '{path}': {exc.strerror}") from exc
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise UsageError(
            f"'{path}' is not UTF-8 text (byte {exc.start + 1} cannot be read); save it as CSV UTF-8"
        ) from exc
    sample = text[:4096]
    try:
        dialect = csv.Sniffer().sniff(sample, delimiters=",;\t")
    except csv.Error:
        dialect = csv.excel
    return [row for row in csv.reader(text.splitlines(), dialect)]


def _cmd_check_formulas(args: argparse.Namespace) -> int:
    rows = _read_csv(Path(args.file))
    if not rows:
        raise UsageError(f"'{args.file}' is empty")
    headers = rows[0]
    fcol = _find_column(headers, _FORMULA_HEADERS, args.formula_column)
    if fcol is None:
        raise UsageError(
            f"no formula column found in '{args.file}'; the headers are: "
            + ", ".join(repr(h) for h in headers)
            + " (name one with --formula-column)"
        )
    mcol = _find_column(headers, _MASS_HEADERS, args.mass_column)
    ncol = _find_column(headers, _NAME_HEADERS, args.name_column)
    out = sys.stdout
    errors = warnings = checked = 0
    out.write(f"{'line':>5}  {'formula as written':<24} {'reads as':<24} {'g/mol':>10}  verdict\n")
    notes = 0
    for number, row in enumerate(rows[1:], start=2):
        formula = row[fcol] if fcol < len(row) else ""
        stated = row[mcol] if mcol is not None and mcol < len(row) else None
        name = row[ncol] if ncol is not None and ncol < len(row) else None
        if not formula.strip():
            continue
        checked += 1
        result = check_line(formula, stated, name)
        reads = result.formula.text() if result.formula else "-"
        mass = f"{result.molar_mass:.2f}" if result.molar_mass is not None else "-"
        verdict = (
            "ok" if not result.findings else f"{result.findings[0].severity}: {result.findings[0].message}"
        )
        out.write(f"{number:>5}  {formula[:24]:<24} {reads[:24]:<24} {mass:>10}  {verdict}\n")
        for extra in result.findings[1:]:
            out.write(f"{'':>5}  {'':<24} {'':<24} {'':>10}  {extra.severity}: {extra.message}\n")
        errors += sum(1 for f in result.findings if f.severity == ERROR)
        warnings += sum(1 for f in result.findings if f.severity == WARNING)
        notes += sum(1 for f in result.findings if f.severity == NOTE)
    out.write(
        f"\n{checked} lines checked in '{args.file}': {errors} errors, {warnings} warnings, {notes} notes\n"
    )
    return EXIT_FINDINGS if errors else EXIT_CLEAN


def build_parser() -> argparse.ArgumentParser:
    parser = argparse.ArgumentParser(
        prog="cellchem",
        description="Ionic chemistry for chemical stores: check the formulas and molar masses of a list.",
    )
    parser.add_argument("--version", action="version", version=f"cellchem {__version__}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND")
    check = sub.add_parser(
        "check-formulas",
        help="check the formula, name and molar-mass columns of a CSV list against each other",
        description=(
            "Read the formula column of a CSV inventory list, check that each formula can be read and"
            " balances, that the name on the line describes it, and compare its molar mass with the"
            " stated one. The file is only read."
            " Example: cellchem check-formulas workbooks/demo-stock-list.csv"
        ),
    )
    check.add_argument(
        "file", help="a CSV file (UTF-8) with a header row, e.g. workbooks/demo-stock-list.csv"
    )
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
    return parser


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
    except UsageError as exc:
        print(f"cellchem: {exc}", file=sys.stderr)
        return EXIT_USAGE


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
