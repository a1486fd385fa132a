"""The values ``cellchem fill`` writes for one line, over plain values.

For each line of a table the compound is read from the formula cell (or, when
it is empty, from the name), checked as the audit checks it, and the asked-for
columns are computed from it. A line whose name and formula disagree, whose
formula does not read or balance, or whose name leaves a charge open with no
formula to settle it, gets no computed values: filling a column from one of two
cells that disagree would write a value that looks right and may be wrong. The
verdict column says why.
"""

from __future__ import annotations

from dataclasses import dataclass

from .audit import ERROR, _blank, _check_line_cached
from .errors import CellchemError
from .formula import Formula, parse_formula
from .mass import mass_fraction, molar_mass
from .memo import Memo, typed
from .names import name_from_formula, read_name
from .solutions import ionic_strength, ions_of

TEXT = "text"
NUMBER = "number"
MASS = "mass"  # a number shown with two decimals


@dataclass(frozen=True)
class FillColumn:
    """One computed column: its key, its header and how its cells are shown."""

    key: str
    header: str
    kind: str
    part: str = ""  # for mass-fraction: the element or ion


_FIXED = {
    "formula": FillColumn("formula", "Formula (canonical)", TEXT),
    "name": FillColumn("name", "Systematic name", TEXT),
    "molar-mass": FillColumn("molar-mass", "Molar mass (g/mol)", MASS),
    "water": FillColumn("water", "Water of crystallisation", NUMBER),
    "cations": FillColumn("cations", "Cations", TEXT),
    "anions": FillColumn("anions", "Anions", TEXT),
    "ionic-strength": FillColumn("ionic-strength", "Ionic strength (mol/L)", NUMBER),
    "verdict": FillColumn("verdict", "cellchem check", TEXT),
}
DEFAULT_COLUMNS = ("formula", "name", "molar-mass", "water", "cations", "anions")


def read_columns(spec: str | None) -> tuple[FillColumn, ...]:
    """The columns of a ``--add`` list (default: formula, name, molar-mass,
    water, cations, anions).

    >>> [c.header for c in read_columns("molar-mass,mass-fraction=Cu")]
    ['Molar mass (g/mol)', 'Mass fraction of Cu (%)']
    """
    if spec is None or not spec.strip():
        return tuple(_FIXED[k] for k in DEFAULT_COLUMNS)
    out: list[FillColumn] = []
    for raw in spec.split(","):
        item = raw.strip()
        if not item:
            continue
        key, _, part = item.partition("=")
        key = key.strip().casefold()
        if key == "mass-fraction":
            part = part.strip()
            if not part:
                raise CellchemError("--add mass-fraction=X: name the element or ion, e.g. mass-fraction=Cu")
            try:
                parse_formula(part)
            except CellchemError as exc:
                raise CellchemError(f"--add mass-fraction={part}: {exc}") from None
            column = FillColumn("mass-fraction", f"Mass fraction of {part} (%)", MASS, part)
        elif key in _FIXED and not part:
            column = _FIXED[key]
        else:
            raise CellchemError(
                f"--add: '{item}' is not a column cellchem fills; the columns are "
                + ", ".join(list(_FIXED) + ["mass-fraction=X"])
            )
        if column in out:
            raise CellchemError(f"--add: '{item}' is asked for twice")
        out.append(column)
    if not out:
        raise CellchemError("--add: no columns named")
    return tuple(out)


@dataclass(frozen=True)
class FillLine:
    """The values for one line, in the order of the columns, ``None`` for a
    cell left empty; ``filled`` is False when the line got no values."""

    values: tuple[object, ...]
    filled: bool
    verdict: str


def _verdict(findings) -> str:
    if not findings:
        return "ok"
    order = {"error": 0, "warning": 1, "note": 2}
    first = sorted(findings, key=lambda f: order[f.severity])[0]
    return f"{first.severity}: {first.message}"


def _ions_text(f: Formula, sign: int) -> str:
    try:
        d = ions_of(f)
    except CellchemError:
        return ""
    parts = [str(c) for c in d.ions if (c.charge > 0) == (sign > 0)]
    return ", ".join(parts)


def _concentration(conc: object, unit: object) -> object | None:
    if _blank(conc):
        return None
    if isinstance(conc, str):
        text = conc.strip()
        if any(ch.isalpha() or ch == "%" for ch in text):
            return text
        if _blank(unit):
            return None
        return f"{text} {str(unit).strip()}"
    if isinstance(conc, int | float) and not isinstance(conc, bool):
        if _blank(unit):
            return None
        return f"{conc} {str(unit).strip()}"
    return None


def fill_line(
    columns: tuple[FillColumn, ...],
    formula: object = None,
    name: object = None,
    molar_mass_cell: object = None,
    cas: object = None,
    concentration: object = None,
    unit: object = None,
    *,
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
) -> FillLine:
    """The computed values of one line.

    Args:
        columns: what to compute (``read_columns``).
        formula, name, molar_mass_cell, cas: the line's cells (plain values).
        concentration, unit: the concentration cell and a unit cell, for the
            ionic strength (a concentration without a unit gives none).

    Returns:
        A FillLine.

    >>> cols = read_columns("formula,molar-mass,cations,anions")
    >>> fill_line(cols, "CuSO4.5H2O", "copper(II) sulfate pentahydrate").values[:1]
    ('CuSO4·5H2O',)
    >>> fill_line(cols, "FeCl3", "iron(II) chloride").filled
    False
    """
    args = (formula, name, molar_mass_cell, cas, concentration, unit)
    return _LINES.get(
        (columns, typed(*args), mass_allowance, decimal_comma),
        lambda: _fill_line(columns, *args, mass_allowance, decimal_comma),
    )


_LINES: Memo[FillLine] = Memo(50_000)


def _fill_line(
    columns, formula, name, molar_mass_cell, cas, concentration, unit, mass_allowance, decimal_comma
):
    result = _check_line_cached(formula, molar_mass_cell, name, cas, mass_allowance, decimal_comma)
    verdict = _verdict(result.findings)
    compound: Formula | None = None
    blocking = [
        f
        for f in result.findings
        if f.severity == ERROR and f.check in ("formula", "name", "name-hydrate", "charge")
    ]
    if not _blank(formula):
        if result.formula is not None and not blocking:
            compound = result.formula
    elif not _blank(name):
        try:
            compound = parse_formula(read_name(str(name)).formula)
        except Exception:  # a refusal, or a failure of cellchem's own: nothing is filled
            compound = None
    if compound is None:
        values = tuple(verdict if c.key == "verdict" else None for c in columns)
        return FillLine(values, False, verdict)
    values: list[object] = []
    for c in columns:
        values.append(_value(c, compound, concentration, unit, verdict))
    return FillLine(tuple(values), True, verdict)


def _value(c: FillColumn, f: Formula, concentration: object, unit: object, verdict: str) -> object:
    try:
        if c.key == "formula":
            return f.text()
        if c.key == "name":
            return name_from_formula(f)
        if c.key == "molar-mass":
            return float(molar_mass(f))
        if c.key == "water":
            water = f.water
            return None if water is None else (int(water) if float(water).is_integer() else float(water))
        if c.key == "cations":
            return _ions_text(f, 1) or None
        if c.key == "anions":
            return _ions_text(f, -1) or None
        if c.key == "mass-fraction":
            return 100.0 * mass_fraction(f, c.part)
        if c.key == "ionic-strength":
            conc = _concentration(concentration, unit)
            if conc is None:
                return None
            return float(ionic_strength([(f, conc)]))
        if c.key == "verdict":
            return verdict
    except Exception:  # a refusal, or a failure of cellchem's own: the cell stays empty
        return None
    return None
