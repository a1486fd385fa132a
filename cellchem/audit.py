"""Checks of one inventory line, over plain values: the pure part of the audit.

A bad line is a *finding*, recorded and reported; it never stops a run. The
command line and the worksheet functions call these checks; neither a
workbook nor a spreadsheet library is needed here.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from .charge import charge_balance
from .errors import CellchemError
from .formula import Formula, case_readings, parse_formula
from .ions import counts_key
from .mass import molar_mass
from .names import read_name

ERROR = "error"
WARNING = "warning"
NOTE = "note"


@dataclass(frozen=True)
class Finding:
    """One thing found on a line.

    Attributes:
        check: which check found it (``'formula'``, ``'molar-mass'``, ``'charge'``).
        severity: ``'error'``, ``'warning'`` or ``'note'``.
        message: one line saying what is wrong, quoting the input.
        suggestion: what would resolve it ('' if nothing to suggest).
        field: which field of the line it concerns (``'formula'``, ``'molar_mass'``).
    """

    check: str
    severity: str
    message: str
    suggestion: str = ""
    field: str = ""


@dataclass(frozen=True)
class LineResult:
    """What the checks made of one line: the formula read (or None), its molar
    mass (or None) and the findings."""

    formula: Formula | None
    molar_mass: float | None
    findings: tuple[Finding, ...]

    @property
    def worst(self) -> str:
        for level in (ERROR, WARNING, NOTE):
            if any(f.severity == level for f in self.findings):
                return level
        return ""


_NUMBER = re.compile(r"^\s*([0-9]+(?:[.,][0-9]+)?)\s*(?:g\s*/\s*mol|g·mol⁻¹|g mol-1)?\s*$", re.IGNORECASE)


def read_stated_mass(value: object) -> tuple[float, int] | None:
    """A stated molar mass and its number of decimals, from a cell value
    (a number, or text such as '58.44', '58,44 g/mol'); None if empty.

    Raises:
        CellchemError: the value is not a molar mass.
    """
    if value is None or (isinstance(value, str) and not value.strip()):
        return None
    if isinstance(value, bool):
        raise CellchemError(f"{value!r} is not a molar mass (expected a number in g/mol)")
    if isinstance(value, (int, float)):
        if not math.isfinite(value) or value <= 0:
            raise CellchemError(f"{value!r} is not a molar mass (expected a positive number in g/mol)")
        text = repr(float(value))
        decimals = len(text.split(".")[1].rstrip("0")) if "." in text and "e" not in text else 0
        return float(value), min(decimals, 6)
    m = _NUMBER.match(str(value))
    if not m:
        raise CellchemError(f"'{value}' is not a molar mass (expected a number in g/mol, such as '58.44')")
    number = m.group(1).replace(",", ".")
    decimals = len(number.split(".")[1]) if "." in number else 0
    return float(number), decimals


def mass_tolerance(stated: float, decimals: int) -> float:
    """How far a stated molar mass may lie from the computed one and still
    agree: half a unit in its last printed decimal, plus 0.01 g/mol or 0.01 %
    (whichever is larger) for the small differences between editions of the
    atomic-weight table (common practice)."""
    return 0.5 * 10.0 ** (-decimals) + max(0.01, 1e-4 * stated)


def _blank(value: object) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _same(a: Formula, b: Formula) -> bool:
    return counts_key(a.counts) == counts_key(b.counts) and a.charge == b.charge


def check_name(name: object, formula: Formula | None) -> list[Finding]:
    """Does the line's name describe the line's formula?

    Args:
        name: the name cell (text).
        formula: the line's formula, read, or None when the line has none.

    Returns:
        Findings: an error when they disagree, a warning when the name is
        silent about the hydrate the formula has, a note when the name cannot
        be read (organic names, mixtures, product codes are not checked) or
        leaves a charge open that the formula settles.
    """
    if _blank(name):
        return []
    text = str(name)
    try:
        reading = read_name(text)
    except CellchemError as exc:
        if exc.choices and formula is not None:
            dry = formula.anhydrous()
            matches = [c for c in exc.choices if _same(parse_formula(c), dry)]
            if matches:
                return [
                    Finding(
                        "name",
                        NOTE,
                        f"the name '{text}' leaves a charge open; the formula {formula.text()} settles it",
                        "",
                        "name",
                    )
                ]
            return [
                Finding(
                    "name",
                    ERROR,
                    f"the name '{text}' fits none of its readings to the formula {formula.text()}: {exc}",
                    "",
                    "name",
                )
            ]
        return [Finding("name", NOTE, f"name not checked: {exc}", "", "name")]
    named = parse_formula(reading.formula)
    if formula is None:
        return [
            Finding(
                "name",
                NOTE,
                f"no formula on the line; the name '{text}' reads as {named.text()}",
                named.text(),
                "formula",
            )
        ]
    if _same(named, formula):
        return []
    if _same(named.anhydrous(), formula.anhydrous()):
        if formula.water is None or named.water is None:
            return []
        stated = any(q.kind == "hydrate" for q in reading.qualifiers)
        if not stated and named.water == 0:
            return [
                Finding(
                    "name",
                    WARNING,
                    f"the name '{text}' does not say which hydrate; the formula {formula.text()} has"
                    f" {formula.water} H2O",
                    "",
                    "name",
                )
            ]
        return [
            Finding(
                "name",
                ERROR,
                f"the name '{text}' reads as {named.text()}, but the formula is {formula.text()}"
                " (a different hydrate)",
                named.text(),
                "formula",
            )
        ]
    return [
        Finding(
            "name",
            ERROR,
            f"the name '{text}' reads as {named.text()}, but the formula is {formula.text()}",
            named.text(),
            "formula",
        )
    ]


def check_line(formula: object, stated_molar_mass: object = None, name: object = None) -> LineResult:
    """Check a line's formula, its stated molar mass against the formula, and
    its name against the formula.

    Args:
        formula: the formula cell (text); empty gives no formula findings.
        stated_molar_mass: the molar-mass cell (number or text, g/mol), or None.
        name: the name cell (text), or None.

    Returns:
        A LineResult with the findings.
    """
    findings: list[Finding] = []
    if _blank(formula):
        return LineResult(None, None, tuple(check_name(name, None)))
    text = str(formula)
    try:
        f = parse_formula(text)
    except CellchemError as exc:
        suggestion = ""
        if exc.choices:
            suggestion = "write one of: " + ", ".join(exc.choices)
        findings.append(Finding("formula", ERROR, str(exc), suggestion, "formula"))
        return LineResult(None, None, tuple(findings))
    findings.extend(check_name(name, f))
    if not any(c.islower() for c in text) and len(f.counts) > 1:
        other = case_readings(text)
        if other:
            findings.append(
                Finding(
                    "formula",
                    WARNING,
                    f"'{text}' is written in capitals; it reads as {f.text()}, but the letters also allow "
                    + ", ".join(other),
                    "write the formula with the case of its element symbols",
                    "formula",
                )
            )
    balance = charge_balance(f)
    if not balance.balanced:
        findings.append(Finding("charge", ERROR, balance.explanation, "", "formula"))
    mass: float | None = None
    try:
        mass = float(molar_mass(f))
    except CellchemError as exc:
        findings.append(Finding("molar-mass", WARNING, str(exc), "", "formula"))
    try:
        stated = read_stated_mass(stated_molar_mass)
    except CellchemError as exc:
        findings.append(Finding("molar-mass", ERROR, str(exc), "", "molar_mass"))
        stated = None
    if stated is not None and mass is not None:
        value, decimals = stated
        if abs(value - mass) > mass_tolerance(value, decimals):
            hint = ""
            dry = f.anhydrous()
            for n in (0, 0.5, 1, 1.5, 2, 3, 4, 5, 6, 7, 8, 9, 10, 12):
                other = dry.with_water(n)
                if other == f or other.has_unknown_count:
                    continue
                if abs(value - float(molar_mass(other))) <= mass_tolerance(value, decimals):
                    hint = f"; {value:g} g/mol is the molar mass of {other.text()}"
                    break
            findings.append(
                Finding(
                    "molar-mass",
                    ERROR,
                    f"the stated molar mass {value:g} g/mol does not match {f.text()},"
                    f" {mass:.2f} g/mol{hint}",
                    f"{mass:.2f}",
                    "molar_mass",
                )
            )
    return LineResult(f, mass, tuple(findings))
