"""The values ``cellchem fill`` writes for one line, over plain values.

For each line of a table the compound is read from the formula cell (or, when
it is empty, from the name), checked as the audit checks it, and the asked-for
columns are computed from it. Nothing is written that a cell of the line
contradicts, and nothing the line does not fix:

- a line with an error of the audit other than a molar-mass one (its name
  and formula disagree, its formula does not read or balance, its CAS RN is
  wrong), or whose name leaves a charge open with no formula to settle it,
  gets no computed values: filling a column from one of two cells that
  disagree would write a value that looks right and may be wrong;
- a stated molar mass that does not match the compound is a second opinion:
  the line is filled only when its name and formula both say the same
  compound (then the stated value is the one to correct), never on the word
  of one cell against the molar mass;
- when the table's formula or name column is not known, the line's other
  cells are looked at: one that reads as a formula or a name of another
  compound stops the line (``others``);
- a compound read from a name alone, when the name does not say its water of
  crystallisation and the compound has hydrates that exist, gets only the
  columns that do not depend on the water (cations, anions);
- a cell holding a spreadsheet formula with no saved value
  (``audit.UnsavedValue``) is a cell whose content is not known: the line is
  not filled.

The verdict column says why. The columns are a registry, ``COLUMNS``: each
is one ``ColumnEntry`` (key, header, kind, and the function that computes its
value from the line's compound), so a new fill column is one entry.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass

from .audit import (
    ERROR,
    SCHOOL_WEIGHTS,
    STANDARD_WEIGHTS,
    UnsavedValue,
    _blank,
    _check_line_cached,
    mass_tolerance,
    read_stated_mass,
    school_mass,
)
from .errors import CellchemError
from .formula import Formula
from .mass import mass_fraction, molar_mass
from .memo import Memo, typed
from .names import known_hydrates, name_from_formula, read_name, same_substance
from .reading import parse_formula
from .solutions import ionic_strength, ions_of

TEXT = "text"
NUMBER = "number"
MASS = "mass"  # a number shown with two decimals


@dataclass(frozen=True)
class FillColumn:
    """One computed column as asked for: its key, its header and how its cells
    are shown (``kind``); ``part`` is what a column of a part names
    (``mass-fraction=Cu``: 'Cu')."""

    key: str
    header: str
    kind: str
    part: str = ""  # for mass-fraction: the element or ion


@dataclass(frozen=True)
class LineCompound:
    """What a column's value is computed from: the compound a line reads as, the
    line's concentration and unit cells, and the verdict on the line."""

    compound: Formula
    concentration: object
    unit: object
    verdict: str


@dataclass(frozen=True)
class ColumnEntry:
    """One fill column of the registry (``COLUMNS``): a new fill column is one entry.

    Attributes:
        key: the name ``--add`` asks for it by.
        header: its heading; ``{part}`` stands for the part of a column that
            takes one (``Mass fraction of {part} (%)``).
        kind: TEXT, NUMBER or MASS (a number shown with two decimals).
        value: its value for a line and a part (``''`` for a column of none);
            None leaves the cell empty, and so does an error.
        needs_water: False for a value the water of crystallisation leaves alone
            (filled also from a name silent about the water).
        default: in the columns filled when ``--add`` is not given.
        part: for a column that takes a part, what to name (for the message
            when it is missing); '' for a column of none.
        check_part: for a column that takes a part, refuses a part it cannot use.
        verdict: the column that says why a line was or was not filled (it gets
            the verdict on every line).
    """

    key: str
    header: str
    kind: str
    value: Callable[[LineCompound, str], object]
    needs_water: bool = True
    default: bool = False
    part: str = ""
    check_part: Callable[[str], object] | None = None
    verdict: bool = False

    def column(self, part: str = "") -> FillColumn:
        """The column as asked for, with its part ('' for a column of none)."""
        return FillColumn(self.key, self.header.format(part=part), self.kind, part)


def _formula(line: LineCompound, part: str) -> object:
    return line.compound.text()


def _name(line: LineCompound, part: str) -> object:
    return name_from_formula(line.compound)


def _molar_mass(line: LineCompound, part: str) -> object:
    return float(molar_mass(line.compound))


def _water(line: LineCompound, part: str) -> object:
    water = line.compound.water
    return None if water is None else (int(water) if float(water).is_integer() else float(water))


def _cations(line: LineCompound, part: str) -> object:
    return _ions_text(line.compound, 1) or None


def _anions(line: LineCompound, part: str) -> object:
    return _ions_text(line.compound, -1) or None


def _ionic_strength(line: LineCompound, part: str) -> object:
    conc = _concentration(line.concentration, line.unit)
    if conc is None:
        return None
    return float(ionic_strength([(line.compound, conc)]))


def _the_verdict(line: LineCompound, part: str) -> object:
    return line.verdict


def _mass_fraction(line: LineCompound, part: str) -> object:
    return 100.0 * mass_fraction(line.compound, part)


# The fill columns, in the order ``--add`` lists them.
COLUMNS: tuple[ColumnEntry, ...] = (
    ColumnEntry("formula", "Formula (canonical)", TEXT, _formula, default=True),
    ColumnEntry("name", "Systematic name", TEXT, _name, default=True),
    ColumnEntry("molar-mass", "Molar mass (g/mol)", MASS, _molar_mass, default=True),
    ColumnEntry("water", "Water of crystallisation", NUMBER, _water, default=True),
    ColumnEntry("cations", "Cations", TEXT, _cations, needs_water=False, default=True),
    ColumnEntry("anions", "Anions", TEXT, _anions, needs_water=False, default=True),
    ColumnEntry("ionic-strength", "Ionic strength (mol/L)", NUMBER, _ionic_strength),
    ColumnEntry("verdict", "cellchem check", TEXT, _the_verdict, needs_water=False, verdict=True),
    ColumnEntry(
        "mass-fraction",
        "Mass fraction of {part} (%)",
        MASS,
        _mass_fraction,
        part="name the element or ion, e.g. mass-fraction=Cu",
        check_part=parse_formula,
    ),
)
REGISTRY: dict[str, ColumnEntry] = {entry.key: entry for entry in COLUMNS}
DEFAULT_COLUMNS = tuple(entry.key for entry in COLUMNS if entry.default)


def read_columns(spec: str | None) -> tuple[FillColumn, ...]:
    """The columns of a ``--add`` list (default: formula, name, molar-mass,
    water, cations, anions).

    >>> [c.header for c in read_columns("molar-mass,mass-fraction=Cu")]
    ['Molar mass (g/mol)', 'Mass fraction of Cu (%)']
    """
    if spec is None or not spec.strip():
        return tuple(REGISTRY[k].column() for k in DEFAULT_COLUMNS)
    out: list[FillColumn] = []
    for raw in spec.split(","):
        item = raw.strip()
        if not item:
            continue
        key, _, part = item.partition("=")
        key = key.strip().casefold()
        entry = REGISTRY.get(key)
        if entry is not None and entry.part:
            part = part.strip()
            if not part:
                raise CellchemError(f"--add {key}=X: {entry.part}")
            if entry.check_part is not None:
                try:
                    entry.check_part(part)
                except CellchemError as exc:
                    raise CellchemError(f"--add {key}={part}: {exc}") from None
            column = entry.column(part)
        elif entry is not None and not part:
            column = entry.column()
        else:
            raise CellchemError(
                f"--add: '{item}' is not a column cellchem fills; the columns are "
                + ", ".join(
                    [e.key for e in COLUMNS if not e.part] + [f"{e.key}=X" for e in COLUMNS if e.part]
                )
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
    partly: str = ""  # why only some columns were filled


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
    others: Sequence[object] = (),
    mass_allowance: float | None = None,
    decimal_comma: bool | None = None,
    weights: str = STANDARD_WEIGHTS,
) -> FillLine:
    """The computed values of one line.

    Args:
        columns: what to compute (``read_columns``).
        formula, name, molar_mass_cell, cas: the line's cells (plain values).
        concentration, unit: the concentration cell and a unit cell, for the
            ionic strength (a concentration without a unit gives none).
        others: the line's cells in columns of no known role, given when the
            table's formula or name column is not known: a cell that reads as
            a formula or a name of another compound stops the line.
        mass_allowance, decimal_comma, weights: as for ``check_line``; a
            stated molar mass that does not match stops the line.

    Returns:
        A FillLine.

    >>> cols = read_columns("formula,molar-mass,cations,anions")
    >>> fill_line(cols, "CuSO4.5H2O", "copper(II) sulfate pentahydrate").values[:1]
    ('CuSO4·5H2O',)
    >>> fill_line(cols, "FeCl3", "iron(II) chloride").filled
    False
    >>> fill_line(cols, None, "Iron(III) sulfate", others=("FeSO4",)).filled
    False
    """
    args = (formula, name, molar_mass_cell, cas, concentration, unit)
    if any(isinstance(v, UnsavedValue) for v in args[:4]):
        verdict = next(v for v in args[:4] if isinstance(v, UnsavedValue)).message
        return FillLine(_verdict_only(columns, verdict), False, verdict)
    seen = tuple(str(o).strip() for o in others if isinstance(o, str) and o.strip())
    return _LINES.get(
        (columns, typed(*args), seen, mass_allowance, decimal_comma, weights),
        lambda: _fill_line(columns, *args, seen, mass_allowance, decimal_comma, weights),
    )


_LINES: Memo[FillLine] = Memo(50_000)


def _verdict_only(columns: tuple[FillColumn, ...], verdict: str) -> tuple[object, ...]:
    """The values of a line that is not filled: the verdict in the verdict column."""
    return tuple(verdict if _entry(c).verdict else None for c in columns)


def _entry(column: FillColumn) -> ColumnEntry:
    return REGISTRY[column.key]


def _same(a: Formula, b: Formula) -> bool:
    try:
        return a.water == b.water and same_substance(a, b)
    except Exception:  # a formula the comparison cannot take: not the same
        return False


def _as_formula(text: str) -> Formula | None:
    """A cell read as the formula of a compound, when it reads as one and looks
    like one. Codes and words that happen to read as formulas are left out: a
    word in capitals ('OK', 'NO'), a formula of one element ('No', 'In', 'B14'
    on a shelf label) and a formula with a charge ('KF-0001', a stock number)."""
    if text.isalpha() and text.isupper():
        return None
    try:
        formula = parse_formula(text)
    except Exception:  # not a formula
        return None
    if formula.charge or len(formula.counts) < 2:
        return None
    return formula


def _as_named(text: str) -> Formula | None:
    try:
        return parse_formula(read_name(text).formula)
    except Exception:  # not a name cellchem reads
        return None


def _contradicting(compound: Formula, others: Sequence[str]) -> str:
    """The first of the line's other cells that reads as another compound, as
    a reason; '' when none does."""
    for text in others:
        other = _as_formula(text)
        kind = "formula"
        if other is None:
            other, kind = _as_named(text), "name"
        if other is not None and not _same(other, compound):
            return (
                f"not filled: the cell {text!r} reads as the {kind} of {other.text()}, not"
                f" {compound.text()}; the table's formula or name column is not known, so which cell is"
                " right cannot be told (name the columns with --column)"
            )
    return ""


def _mass_contradicts(
    compound: Formula,
    cell: object,
    allowance: float | None,
    decimal_comma: bool | None,
    weights: str = STANDARD_WEIGHTS,
) -> str:
    """A reason when the stated molar mass does not match the compound; ''
    when it matches, is empty or is not a molar mass."""
    try:
        stated = read_stated_mass(cell, decimal_comma)
        if stated is None or compound.has_unknown_count:
            return ""
        mass = float(molar_mass(compound))
    except Exception:  # not a molar mass (the audit says so), or none to compare
        return ""
    tolerance = mass_tolerance(stated[0], stated[1], allowance)
    if abs(stated[0] - mass) <= tolerance:
        return ""
    if weights == SCHOOL_WEIGHTS and abs(stated[0] - school_mass(compound)) <= tolerance:
        return ""
    return (
        f"not filled: the stated molar mass {stated[0]:g} g/mol does not match {compound.text()},"
        f" {mass:.2f} g/mol, and the line has no second cell to say which is right"
    )


def _name_fixes_water(text: str, compound: Formula) -> bool:
    """Whether a name fixes the water of crystallisation of the compound read
    from it: it names a hydrate, says anhydrous, is a trivial name of one
    form, or the compound has no hydrate a table knows."""
    try:
        reading = read_name(text)
        if reading.water != 0 or any(q.kind == "hydrate" for q in reading.qualifiers):
            return True
        if any(form.startswith("trivial name") for form in reading.forms):
            return True
        return not known_hydrates(compound.anhydrous())
    except Exception:  # the name was read once already; a failure here fixes nothing
        return False


def _fill_line(
    columns,
    formula,
    name,
    molar_mass_cell,
    cas,
    concentration,
    unit,
    others,
    mass_allowance,
    decimal_comma,
    weights=STANDARD_WEIGHTS,
):
    result = _check_line_cached(formula, molar_mass_cell, name, cas, mass_allowance, decimal_comma, weights)
    verdict = _verdict(result.findings)
    compound: Formula | None = None
    # every error but a molar-mass one stops the line (a stated molar mass is weighed below): the
    # cells disagree, or a cell does not read
    blocking = [f for f in result.findings if f.severity == ERROR and f.check != "molar-mass"]
    from_name = False
    if not _blank(formula):
        if result.formula is not None and not blocking:
            compound = result.formula
    elif not _blank(name):
        try:
            compound = parse_formula(read_name(str(name)).formula)
            from_name = True
        except Exception:  # a refusal, or a failure of cellchem's own: nothing is filled
            compound = None
    reason = ""
    if compound is not None:
        reason = _contradicting(compound, others)
        if not reason:
            named = None if _blank(name) or _blank(formula) else _as_named(str(name))
            if named is None or not _same(named, compound):
                reason = _mass_contradicts(compound, molar_mass_cell, mass_allowance, decimal_comma, weights)
    if compound is None or reason:
        verdict = reason + (f" ({verdict})" if reason and verdict != "ok" else "") if reason else verdict
        return FillLine(_verdict_only(columns, verdict), False, verdict)
    partly = ""
    if from_name and not _name_fixes_water(str(name), compound):
        partly = (
            f"the name {str(name).strip()!r} does not say the water of crystallisation, and"
            f" {compound.text()} has hydrates: only the columns that do not depend on it were filled"
        )
    line = LineCompound(compound, concentration, unit, verdict if not partly else f"note: {partly}")
    values: list[object] = []
    for c in columns:
        entry = _entry(c)
        if partly and entry.needs_water:
            values.append(None)
            continue
        try:
            values.append(entry.value(line, c.part))
        except Exception:  # a refusal, or a failure of cellchem's own: the cell stays empty
            values.append(None)
    return FillLine(tuple(values), True, verdict, partly)
