"""``cellchem survey``: the questions of a whole store, over every line of the files given.

The files are read by the audit (``audit_file`` with ``Options.collect``), so a
survey reads each file once, with the audit's readers, limits and column
rules, and its findings come with it. Each data row becomes a
``store.StoreLine`` (its name, formula, CAS RN, pack size, number of packs,
location and H statements, from the columns the headings name); the core's
``store`` module answers the questions: totals per substance, duplicate
lines, elements and ions of concern, and families that should not share a
location.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path

from ...audit import UnsavedValue, _blank
from ...columns import Layout
from ...store import (
    CONCERN_NOTE,
    DEFAULT_CONCERN,
    SEGREGATION_CAUTION,
    TOTALS_NOTE,
    Concern,
    Conflict,
    Duplicate,
    StoreLine,
    Total,
    concern,
    duplicates,
    segregation,
    totals,
    unchecked,
)
from .audit import AuditRun, Options, audit_file
from .reports import TableSheet, findings_sheet

STOCK_ROLES = frozenset({"quantity", "location"})


@dataclass
class Survey:
    """The audit run over the files, every line read, and the answers to the store's questions
    (filled by ``answer``)."""

    run: AuditRun
    lines: list[StoreLine] = field(default_factory=list)
    parts: tuple[str, ...] = DEFAULT_CONCERN
    totals: list[Total] = field(default_factory=list)
    duplicates: list[Duplicate] = field(default_factory=list)
    concern: list[Concern] = field(default_factory=list)
    conflicts: list[Conflict] = field(default_factory=list)
    unchecked: list[tuple[StoreLine, str]] = field(default_factory=list)


def _text(value: object) -> str | None:
    if _blank(value) or isinstance(value, UnsavedValue):
        return None
    if isinstance(value, float) and value.is_integer():
        value = int(value)
    return str(value).strip()


def _cell(cells: Sequence[object], index: int | None) -> object:
    return cells[index] if index is not None and index < len(cells) else None


def store_line(file: str, sheet: str, row: int, layout: Layout, cells: Sequence[object]) -> StoreLine:
    """One data row as a line of the store: a pack size in one cell ('500 g'), or its number and a
    unit column ('500' and 'g'), and the number of packs where a column gives it."""
    roles = layout.roles

    def get(role: str) -> str | None:
        return _text(_cell(cells, roles.get(role)))

    quantity = get("quantity")
    unit = get("unit")
    if quantity is not None and unit is not None and not any(c.isalpha() for c in quantity):
        quantity = f"{quantity} {unit}"
    count_text = get("count")
    count: object = 1
    if count_text is not None:
        try:
            count = float(count_text.replace(",", "."))
        except ValueError:
            count = count_text  # refused with its reason when the line is weighed
    return StoreLine(
        source=Path(file).name,
        sheet=sheet,
        row=row,
        name=get("name"),
        formula=get("formula"),
        cas=get("cas"),
        quantity=quantity,
        count=count,
        location=get("location"),
        hazards=get("hazard_statements"),
    )


def survey(paths: Sequence[str | Path], options: Options, parts: Sequence[str] = DEFAULT_CONCERN) -> Survey:
    """Audit the files, gather their lines and answer the store's questions over all of them.

    Raises:
        CellchemError: an element or ion of concern that does not read (before any file is read).
    """
    result = Survey(AuditRun(), parts=tuple(parts))
    concern([], result.parts)  # the parts are read before the files are

    def collect(file: str, sheet: str, row: int, layout: Layout, cells: Sequence[object]) -> None:
        # a table with neither a pack size nor a location (an SDS summary, a price list) is audited
        # but holds no stock to total or place
        if STOCK_ROLES & layout.roles.keys():
            result.lines.append(store_line(file, sheet, row, layout, cells))

    opts = replace(options, collect=collect)
    for p in paths:
        audit_file(p, opts, result.run)
    result.totals = totals(result.lines)
    result.duplicates = duplicates(result.lines)
    result.concern = concern(result.lines, result.parts)
    result.conflicts = segregation(result.lines)
    result.unchecked = unchecked(result.lines)
    return result


# -- what the survey shows -------------------------------------------------------------------------


def where(line: StoreLine) -> str:
    return f"{line.source}" + (f" [{line.sheet}]" if line.sheet else "") + f" row {line.row}"


def _g(x: float | None) -> str:
    if x is None:
        return ""
    return f"{x:,.1f}" if x >= 10 else f"{x:.3g}"


def _name(line: StoreLine) -> str:
    return line.name or line.formula or line.cas or ""


def _substance(t: Total) -> str:
    if t.key is None:
        return "(not identified)"
    return t.formula + (f", {t.strength}" if t.strength else "")


def _amount(t: Total) -> str:
    parts = []
    if t.mass_g:
        parts.append(f"{_g(t.mass_g)} g")
    if t.volume_ml:
        parts.append(f"{_g(t.volume_ml)} mL (no density)")
    if t.items:
        parts.append(f"{t.items:g} items")
    return " + ".join(parts) or "nothing weighed"


def text_report(s: Survey) -> list[str]:
    """The survey as lines for the terminal: each question with the lines behind its figures."""
    out = ["Totals per substance (over every sheet and file):"]
    for t in s.totals:
        if t.key is None:
            continue
        out.append(
            f"  {_substance(t)}{f' (CAS {t.cas})' if t.cas else ''}: {_amount(t)}, {len(t.lines)} line(s)"
        )
        for line, why in t.refused:
            out.append(f"      not counted: {where(line)} {_name(line)!r}: {why}")
    unknown = [t for t in s.totals if t.key is None]
    for t in unknown:
        out.append(f"  not identified: {len(t.lines)} line(s)")
        for line, why in t.refused:
            out.append(f"      {where(line)} {_name(line)!r}: {why}")
    out.append(f"  ({TOTALS_NOTE})")
    out.append("")
    out.append("The same substance more than once at one location:")
    for d in s.duplicates:
        rows = ", ".join(where(line) for line in d.lines)
        out.append(f"  {d.key[0]} at {d.location!r}: {rows}")
    if not s.duplicates:
        out.append("  none")
    out.append("")
    out.append("Elements and ions of concern on site:")
    for c in s.concern:
        if not c.shares and not c.unweighed:
            continue
        out.append(f"  {c.part}: {_g(c.mass_g)} g in {len(c.shares)} line(s)")
        for sh in c.shares:
            out.append(
                f"      {_g(sh.mass_g)} g from {_g(sh.substance_g)} g of {_name(sh.line)} ({where(sh.line)})"
            )
        for line, why in c.unweighed:
            out.append(f"      not weighed: {where(line)} {_name(line)!r}: {why}")
    quiet = [c.part for c in s.concern if not c.shares and not c.unweighed]
    if quiet:
        out.append(f"  none found of: {', '.join(quiet)}")
    out.append(f"  ({CONCERN_NOTE})")
    out.append("")
    out.append("Families that should not share a location:")
    for c in s.conflicts:
        a = ", ".join(f"{_name(line)} ({where(line)})" for line in c.lines_a)
        b = ", ".join(f"{_name(line)} ({where(line)})" for line in c.lines_b)
        out.append(f"  {c.location}: {c.family_a} with {c.family_b}: {c.caution}")
        out.append(f"      {c.family_a}: {a}")
        out.append(f"      {c.family_b}: {b}")
    if not s.conflicts:
        out.append("  none found by these rules")
    if s.unchecked:
        out.append(
            f"  {len(s.unchecked)} line(s) not compared or only partly (the workbook report lists them)"
        )
    out.append(f"  CAUTION: {SEGREGATION_CAUTION}")
    return out


def sheets(s: Survey) -> list[TableSheet]:
    """The survey as report sheets, one per question, with the lines behind every figure."""
    total_rows = []
    for t in s.totals:
        entries = {id(e.line): e for e in t.entries}
        refused = {id(line): why for line, why in t.refused}
        for line in t.lines:
            e = entries.get(id(line))
            total_rows.append(
                (
                    _substance(t),
                    t.cas,
                    round(t.mass_g, 3),
                    round(t.volume_ml, 3),
                    t.items,
                    where(line),
                    _name(line),
                    line.quantity or "",
                    line.count,
                    line.location or "",
                    None if e is None or e.mass_g is None else round(e.mass_g, 3),
                    None if e is None or e.volume_ml is None else round(e.volume_ml, 3),
                    refused.get(id(line), "; ".join(e.notes) if e is not None else ""),
                )
            )
    dup_rows = [
        (d.key[0], d.location, where(line), _name(line), line.quantity or "", line.count)
        for d in s.duplicates
        for line in d.lines
    ]
    concern_rows = []
    for c in s.concern:
        for sh in c.shares:
            concern_rows.append(
                (
                    c.part,
                    round(c.mass_g, 3),
                    where(sh.line),
                    _name(sh.line),
                    sh.line.formula or "",
                    round(sh.substance_g, 3),
                    round(sh.fraction, 5),
                    round(sh.mass_g, 3),
                    "",
                )
            )
        for line, why in c.unweighed:
            concern_rows.append(
                (
                    c.part,
                    round(c.mass_g, 3),
                    where(line),
                    _name(line),
                    line.formula or "",
                    None,
                    None,
                    None,
                    f"not weighed: {why}",
                )
            )
        for line, why in c.not_counted:
            concern_rows.append(
                (
                    c.part,
                    round(c.mass_g, 3),
                    where(line),
                    _name(line),
                    line.formula or "",
                    None,
                    None,
                    None,
                    f"not counted: {why}",
                )
            )
    conflict_rows = []
    for c in s.conflicts:
        for family, lines in ((c.family_a, c.lines_a), (c.family_b, c.lines_b)):
            for line in lines:
                conflict_rows.append(
                    (
                        c.location,
                        f"{c.family_a} with {c.family_b}",
                        family,
                        where(line),
                        _name(line),
                        c.caution,
                        c.source,
                    )
                )
    return [
        TableSheet(
            "Totals",
            (
                "Substance",
                "CAS RN",
                "Total g",
                "Total mL (no density)",
                "Total items",
                "Line",
                "Name",
                "Pack",
                "Packs",
                "Location",
                "Line g",
                "Line mL",
                "Note",
            ),
            total_rows,
            (22, 12, 11, 11, 8, 30, 30, 12, 7, 22, 10, 10, 50),
            (6, 7, 13),
        ),
        TableSheet(
            "Duplicates",
            ("Substance", "Location", "Line", "Name", "Pack", "Packs"),
            dup_rows,
            (18, 26, 30, 34, 12, 7),
            (3, 4),
            "no substance more than once at one location",
        ),
        TableSheet(
            "Concern",
            (
                "Element or ion",
                "Total g on site",
                "Line",
                "Name",
                "Formula",
                "Substance g",
                "Mass fraction",
                "Share g",
                "Note",
            ),
            concern_rows,
            (10, 12, 30, 30, 16, 11, 10, 10, 50),
            (3, 4, 9),
            "none of the elements or ions asked for",
        ),
        TableSheet(
            "Segregation",
            ("Location", "Pair", "Family", "Line", "Name", "Caution", "Source"),
            conflict_rows,
            (24, 26, 14, 30, 30, 50, 30),
            (4, 5, 6, 7),
            "none found by these rules; see the caution on the Summary sheet",
        ),
        TableSheet(
            "Not compared",
            ("Line", "Name", "Location", "Reason"),
            [(where(line), _name(line), line.location or "", why) for line, why in s.unchecked],
            (30, 34, 24, 70),
            (1, 2, 4),
            "every line was compared",
        ),
    ]


def summary_rows(s: Survey) -> list[tuple[str, object]]:
    sev = s.run.summary.severities
    return [
        ("CAUTION: " + SEGREGATION_CAUTION, ""),
        ("Lines read", len(s.lines)),
        ("Substances totalled", sum(1 for t in s.totals if t.key is not None)),
        ("Duplicate groups", len(s.duplicates)),
        ("Pairs that should not share a location", len(s.conflicts)),
        ("Elements and ions of concern asked for", ", ".join(s.parts)),
        ("Audit findings (errors, warnings, notes)", f"{sev['error']}, {sev['warning']}, {sev['note']}"),
        (TOTALS_NOTE, ""),
        (CONCERN_NOTE, ""),
    ]


def _line_json(line: StoreLine) -> dict:
    return {
        "file": line.source,
        "sheet": line.sheet,
        "row": line.row,
        "name": line.name,
        "formula": line.formula,
        "cas": line.cas,
        "pack": line.quantity,
        "packs": line.count,
        "location": line.location,
    }


def as_json(s: Survey) -> dict:
    """The survey as plain data (the same figures and lines as the workbook)."""
    return {
        "caution": SEGREGATION_CAUTION,
        "totals_note": TOTALS_NOTE,
        "concern_note": CONCERN_NOTE,
        "totals": [
            {
                "formula": t.formula,
                "cas": t.cas,
                "strength": t.strength,
                "identified": t.key is not None,
                "mass_g": t.mass_g,
                "volume_ml_without_density": t.volume_ml,
                "items": t.items,
                "lines": [_line_json(line) for line in t.lines],
                "not_counted": [{"line": _line_json(line), "reason": why} for line, why in t.refused],
            }
            for t in s.totals
        ],
        "duplicates": [
            {
                "formula": d.key[0],
                "cas": d.key[1],
                "location": d.location,
                "lines": [_line_json(x) for x in d.lines],
            }
            for d in s.duplicates
        ],
        "concern": [
            {
                "part": c.part,
                "mass_g": c.mass_g,
                "shares": [
                    {
                        "line": _line_json(sh.line),
                        "substance_g": sh.substance_g,
                        "fraction": sh.fraction,
                        "mass_g": sh.mass_g,
                    }
                    for sh in c.shares
                ],
                "not_weighed": [{"line": _line_json(line), "reason": why} for line, why in c.unweighed],
                "not_counted": [{"line": _line_json(line), "reason": why} for line, why in c.not_counted],
            }
            for c in s.concern
        ],
        "segregation": [
            {
                "location": c.location,
                "family_a": c.family_a,
                "family_b": c.family_b,
                "caution": c.caution,
                "source": c.source,
                "lines_a": [_line_json(x) for x in c.lines_a],
                "lines_b": [_line_json(x) for x in c.lines_b],
            }
            for c in s.conflicts
        ],
        "not_compared": [{"line": _line_json(line), "reason": why} for line, why in s.unchecked],
    }


def workbook_sheets(s: Survey, findings) -> list[TableSheet]:
    """The report workbook's sheets: the store's questions, then the audit's findings."""
    return [*sheets(s), findings_sheet(findings)]
