"""Making up solutions: grams to weigh, hydrate substitution, dilution,
concentration units, and the cautions that go with them.

Defaults are mol/L, L and g; every amount may instead be given with its own
unit, as a keyword (``volume_unit="mL"``) or as text (``"250 mL"``). Unit
strings are read by ``cellchem.units``.

Safety: a recipe that can hurt someone (strong acids and bases, oxidisers,
toxic salts) carries hazard hints from ``data/solution_cautions.csv``. They are
reminders, not a hazard assessment: the supplier's safety data sheet, local
regulations and the site's safety officer decide. Every recipe says so.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import cache, lru_cache

from .errors import CellchemError, ChemistryError
from .formula import Formula, Number
from .ions import counts_key
from .mass import molar_mass
from .packs import density_row, listed_strengths
from .reading import parse_formula
from .solutions import (
    STRONG_ACID,
    STRONG_BASE,
    WEAK_BASE,
    Dissociation,
    SoluteAmount,
    Value,
    _check_outside,
    _read_solute,
    check_solubility,
    ions_of,
)
from .tables import read_table
from .units import (
    AMOUNT_PER_MASS,
    AMOUNT_PER_VOLUME,
    CONCENTRATION_KINDS,
    EQUIVALENTS_PER_VOLUME,
    MASS,
    MASS_FRACTION,
    MASS_PER_VOLUME,
    VOLUME,
    in_base,
    read_quantity,
    read_unit,
)

SDS_LINE = (
    "These hints do not replace the supplier's safety data sheet (SDS), local regulations or your site's"
    " rules: read the SDS and ask the safety officer when unsure."
)
NO_HINT_LINE = (
    "cellchem's caution table has no hint for this compound; that does not make it safe: read the"
    " supplier's SDS before you start."
)


@dataclass(frozen=True)
class Caution:
    hazard: str
    hint: str


@cache
def _caution_rows() -> tuple[tuple[str, object, Caution], ...]:
    rows = []
    for row in read_table("solution_cautions.csv"):
        kind = row["match_kind"]
        c = Caution(row["hazard"], row["hint"])
        if kind == "formula":
            rows.append((kind, counts_key(parse_formula(row["match"]).counts), c))
        elif kind == "ion":
            rows.append((kind, (counts_key(parse_formula(row["match"]).counts), int(row["charge"])), c))
        else:
            rows.append((kind, row["match"], c))
    return tuple(rows)


def cautions_for(formula: str | Formula) -> tuple[Caution, ...]:
    """The hazard hints for a compound (by its formula, its ions, its elements
    and its behaviour in water), most specific first; empty when none.

    >>> [c.hazard for c in cautions_for("K2Cr2O7")]
    ['toxic']
    """
    return _cautions(_read_solute(formula))


@cache
def _caution_ranks() -> dict[Caution, int]:
    """Each caution's rank: formula rows before ion, behaviour and element rows."""
    order = {"formula": 0, "ion": 1, "behaviour": 2, "element": 3}
    ranks: dict[Caution, int] = {}
    for kind, _match, c in _caution_rows():
        ranks[c] = min(ranks.get(c, 9), order[kind])
    return ranks


@lru_cache(maxsize=4096)
def _cautions(f: Formula) -> tuple[Caution, ...]:
    key = counts_key(f.anhydrous().counts)
    try:
        d: Dissociation | None = ions_of(f)
    except CellchemError:
        d = None
    ion_keys = {(c.ion.key, c.ion.charge) for c in d.ions} if d else set()
    elements = set(f.counts)
    found: list[Caution] = []
    for kind, match, c in _caution_rows():
        hit = (
            (kind == "formula" and match == key)
            or (kind == "ion" and match in ion_keys)
            or (kind == "element" and match in elements)
            or (kind == "behaviour" and d is not None and match == d.behaviour)
        )
        if hit and c not in found:
            found.append(c)
    ranks = _caution_ranks()
    return tuple(sorted(found, key=ranks.__getitem__))


def caution_text(formula: str | Formula) -> tuple[str, ...]:
    """The caution lines to print with a recipe: the hints, then the SDS line."""
    hints = cautions_for(formula)
    if not hints:
        return (NO_HINT_LINE,)
    return tuple(f"Caution ({c.hazard}): {c.hint}." for c in hints) + (SDS_LINE,)


# ---------------------------------------------------------------------------
# Reading amounts
# ---------------------------------------------------------------------------


def _purity(purity) -> float:
    if isinstance(purity, str):
        text = purity.strip()
        if text.endswith("%"):
            try:
                value = float(text[:-1]) / 100.0
            except ValueError:
                raise CellchemError(
                    f"purity: could not read {purity!r} (expected for example '99.5%' or 0.995)"
                ) from None
        else:
            try:
                value = float(text)
            except ValueError:
                raise CellchemError(
                    f"purity: could not read {purity!r} (expected for example '99.5%' or 0.995)"
                ) from None
    elif isinstance(purity, bool) or not isinstance(purity, int | float):
        raise CellchemError(
            f"purity: expected a fraction such as 0.995 or text such as '99.5%', read {purity!r}"
        )
    else:
        value = float(purity)
    if not math.isfinite(value) or value <= 0:
        raise CellchemError(f"purity: {purity!r} is not a fraction above 0")
    if value > 1:
        raise CellchemError(
            f"purity: {purity!r} read as a fraction is over 1; give 0.995 or '99.5%' for an assay of 99.5 %"
        )
    return value


def _density(density, what: str) -> float:
    if density is None:
        raise CellchemError(
            f"{what} needs the solution's density (g/mL), which cellchem never assumes: pass density=..."
        )
    if isinstance(density, str):
        number, reading = read_quantity(density, "g/mL", "density")
        if reading.kind != MASS_PER_VOLUME:
            raise CellchemError(f"density: expected a mass per volume such as '1.19 g/mL', read {density!r}")
        value = number * reading.factor / 1000.0  # g/L -> g/mL
    elif isinstance(density, bool) or not isinstance(density, int | float):
        raise CellchemError(f"density: expected a number in g/mL, read {density!r}")
    else:
        value = float(density)
    if not math.isfinite(value) or not (0.5 <= value <= 3.0):
        raise CellchemError(
            f"density: {density!r} g/mL is outside 0.5-3.0 g/mL, the range of aqueous solutions"
        )
    return value


def _equivalents(f: Formula, text: str) -> Number:
    d = ions_of(f)
    eq = d.equivalents
    if not eq:
        raise ChemistryError(f"{text} gives no ions, so it has no charge equivalents")
    return eq


def _to_molar(
    value: float, kind: str, f: Formula, density: float | None, what: str
) -> tuple[float, tuple[str, ...]]:
    """A concentration in the base unit of its kind, as mol/L of formula f."""
    if kind == AMOUNT_PER_VOLUME:
        return value, ()
    mm = float(molar_mass(f))
    if kind == MASS_PER_VOLUME:
        return value / mm, ()
    if kind == EQUIVALENTS_PER_VOLUME:
        return value / float(_equivalents(f, f.text())), ()
    if kind == MASS_FRACTION:
        rho = _density(density, what)
        return value * rho * 1000.0 / mm, ()
    if kind == AMOUNT_PER_MASS:
        rho = _density(density, what)
        # m mol per kg of water; 1 L of solution = 1000 rho g = water + solute
        return value * rho * 1000.0 / (1000.0 + value * mm), ()
    raise CellchemError(f"{what}: not a concentration")


def _from_molar(molar: float, kind: str, f: Formula, density: float | None, what: str) -> float:
    if kind == AMOUNT_PER_VOLUME:
        return molar
    mm = float(molar_mass(f))
    if kind == MASS_PER_VOLUME:
        return molar * mm
    if kind == EQUIVALENTS_PER_VOLUME:
        return molar * float(_equivalents(f, f.text()))
    if kind == MASS_FRACTION:
        rho = _density(density, what)
        return molar * mm / (rho * 1000.0)
    if kind == AMOUNT_PER_MASS:
        rho = _density(density, what)
        water_g = rho * 1000.0 - molar * mm
        if water_g <= 0:
            raise ChemistryError(f"{what}: {molar:g} mol/L of {f.text()} leaves no water at that density")
        return molar / (water_g / 1000.0)
    raise CellchemError(f"{what}: not a concentration")


def convert_concentration(
    value: float | str,
    from_unit: str,
    to_unit: str,
    formula: str | Formula | None = None,
    density: float | str | None = None,
) -> Value:
    """Convert a concentration between units.

    Args:
        value: the number (or text with its unit, which then overrides
            ``from_unit``).
        from_unit, to_unit: any concentration units of ``cellchem.units``:
            mol/L, mmol/L, g/L, mg/L, % w/v, ppm, eq/L, meq/L, % w/w, mol/kg.
        formula: the solute; needed whenever the conversion crosses between
            amount, mass and equivalents.
        density: the solution's density in g/mL (or text such as
            ``'1.18 g/mL'``); needed, and never assumed, to go between % w/w or
            mol/kg and a unit per volume. Between % w/w and mol/kg it is not
            needed: both are per mass, m = w / ((1 - w) M) and w = m M / (1 + m M).
            A given density always wins. Without one, a % w/w of a reagent that
            ``data/densities.csv`` lists (concentrated HCl, H2SO4, HNO3, H3PO4,
            HClO4, acetic acid, ammonia solution, hydrogen peroxide) at exactly
            that strength takes the table's density at 20 °C, with a note saying
            so; a strength the table does not list is refused (no interpolation).
            For such a reagent a plain ``'%'`` is read as % w/w, the way suppliers
            state these strengths, with a note; for any other solute a plain
            ``'%'`` is refused as before (w/w or w/v is not said).

    Returns:
        A Value in ``to_unit`` with notes for any assumption (ppm as mg/L, a
        density from the table, '%' read as % w/w).

    >>> round(convert_concentration(37, "% w/w", "mol/L", "HCl", density=1.18), 2)
    11.98
    >>> round(convert_concentration(37, "%", "mol/L", "HCl"), 2)  # 1.184 g/mL from the table
    12.02
    >>> round(convert_concentration(10, "% w/w", "mol/kg", "NaCl"), 3)
    1.901
    >>> convert_concentration(1, "mol/L", "meq/L", "CaCl2")
    2000.0
    """
    percent_note = ""
    bare = _bare_percent(value, from_unit)
    if bare is not None and formula is not None and listed_strengths(_reagent(formula)):
        # a plain '%' for a reagent of the density table is % w/w, as suppliers state the
        # strength of concentrated acids, ammonia and hydrogen peroxide (common practice)
        number, source = bare, read_unit("% w/w")
        percent_note = (
            f"'%' read as % w/w, the way suppliers state the strength of {_reagent(formula).text()} as sold"
            " (a reagent of cellchem's density table); give '% w/v' if a mass per volume is meant"
        )
    else:
        number, source = read_quantity(value, from_unit, "concentration")
    target = read_unit(to_unit)
    for r in (source, target):
        if r.kind not in CONCENTRATION_KINDS:
            raise CellchemError(f"unit {r.text!r} is {r.kind}, not a concentration")
    if number < 0:
        raise CellchemError(f"concentration: {value!r} is negative")
    notes = tuple(n for n in (percent_note, source.note, target.note) if n)
    base = number * source.factor
    if source.kind == target.kind:
        return Value(_round(base / target.factor), target.text, notes)
    if formula is None:
        raise CellchemError(
            f"converting {source.text} to {target.text} needs the solute's formula (for its molar mass or"
            " charge): pass formula=..."
        )
    f = _read_solute(formula)
    what = f"converting {source.text} to {target.text}"
    if {source.kind, target.kind} == {MASS_FRACTION, AMOUNT_PER_MASS}:
        out = _mass_fraction_molality(base, source.kind, f, value)
        return Value(_round(out / target.factor), target.text, notes)
    if source.kind == MASS_FRACTION and density is None:
        density, table_note = _table_density(f, base, value)
        notes += (table_note,) if table_note else ()
    molar, _ = _to_molar(base, source.kind, f, density, what)
    out = _from_molar(molar, target.kind, f, density, what)
    return Value(_round(out / target.factor), target.text, notes)


_BARE_PERCENT = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*%\s*$")


def _bare_percent(value, from_unit: str) -> float | None:
    """The number of a concentration written with a plain '%' (as the value's text or as
    the unit of a number), else None."""
    if isinstance(value, str):
        m = _BARE_PERCENT.match(value)
        if m:
            return float(m.group(1))
        if re.match(r"^\s*[+-]?(?:\d+(?:\.\d*)?|\.\d+)\s*$", value) and isinstance(from_unit, str):
            return float(value) if from_unit.strip() == "%" else None
        return None
    if isinstance(value, bool) or not isinstance(value, int | float):
        return None
    return float(value) if isinstance(from_unit, str) and from_unit.strip() == "%" else None


def _reagent(formula: str | Formula) -> Formula:
    try:
        return _read_solute(formula)
    except CellchemError:
        return parse_formula("H2O")  # not a reagent of the density table: the plain '%' stays refused


def _table_density(f: Formula, fraction: float, given) -> tuple[float | None, str]:
    """The density of a reagent at a strength from the density table, and the note that
    says so; (None, '') for a reagent the table does not list (the density stays needed)."""
    listed = listed_strengths(f)
    if not listed:
        return None, ""
    percent = fraction * 100.0
    row = density_row(f, _round(percent))
    if row is None:
        shown = ", ".join(f"{s:g}" for s in listed)
        raise CellchemError(
            f"concentration {given!r} ({_round(percent):g} % w/w {f.text()}) needs the solution's density:"
            f" cellchem's density table lists {f.text()} at {shown} % w/w only (no interpolation); pass"
            " density=... (g/mL)"
        )
    return row.density, f"density {row.text}"


def _mass_fraction_molality(base: float, kind: str, f: Formula, given) -> float:
    """Mass fraction w to molality m = w / ((1 - w) M), or back, w = m M / (1 + m M):
    both are per mass of solvent and solute, so no density is needed."""
    mm = float(molar_mass(f)) / 1000.0  # kg/mol
    if kind == MASS_FRACTION:
        if base >= 1:
            raise CellchemError(
                f"concentration: {given!r} is a mass fraction of 100 % or more, which leaves no water; give"
                " less than 100 % w/w"
            )
        return base / ((1.0 - base) * mm)
    return base * mm / (1.0 + base * mm)


def _round(x: float) -> float:
    return float(f"{x:.12g}")


# ---------------------------------------------------------------------------
# Recipes
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class Recipe:
    """What to weigh for a solution (the result of ``mass_for_solution``).

    Attributes:
        weigh: the formula of what goes on the balance (the shelf form).
        mass: how much of it, in ``mass_unit``.
        mass_unit: ``'g'`` unless asked otherwise.
        target: the formula the concentration is of.
        concentration: the target amount concentration, mol/L of ``target``.
        volume: the final volume in L.
        purity: the assay used (1.0 for none given).
        molar_mass: of the shelf form, g/mol.
        notes: substitutions and assumptions, one line each.
        cautions: hazard hints and the SDS line.
    """

    weigh: str
    mass: float
    mass_unit: str
    target: str
    concentration: float
    volume: float
    purity: float
    molar_mass: float
    notes: tuple[str, ...]
    cautions: tuple[str, ...]

    @property
    def text(self) -> str:
        """The recipe as one paragraph for a label or a worksheet."""
        amount = _fmt(self.mass)
        vol = f"{_fmt(self.volume * 1000)} mL" if self.volume < 1 else f"{_fmt(self.volume)} L"
        conc = f"{_fmt(self.concentration)} mol/L {self.target}"
        purity = f" (assay {_fmt(self.purity * 100)} %)" if self.purity != 1.0 else ""
        parts = [
            f"For {vol} of {conc}: weigh {amount} {self.mass_unit} of {self.weigh}{purity}, dissolve it in"
            f" less water than the final volume, then make up to {vol} with water in a volumetric flask and"
            " mix."
        ]
        parts.extend(self.notes)
        parts.extend(self.cautions)
        return " ".join(parts)

    def __str__(self) -> str:
        return self.text


def _fmt(x: float) -> str:
    if x == 0:
        return "0"
    digits = max(0, 4 - math.floor(math.log10(abs(x))) - 1)
    return f"{x:.{min(digits, 6)}f}"


def _fmt_volume(value: float, unit) -> str:
    """A volume in the call's unit, with mL beside litres below 1 L."""
    text = f"{_fmt(value)} {unit.text}"
    litres = value * unit.factor
    if unit.factor == 1.0 and litres < 1:
        text += f" ({_fmt(litres * 1000)} mL)"
    return text


def _shelf(target: Formula, shelf_form) -> tuple[Formula, str | None]:
    if shelf_form is None:
        return target, None
    if isinstance(shelf_form, bool):
        raise CellchemError(f"shelf_form: expected a formula or a number of waters, read {shelf_form!r}")
    if isinstance(shelf_form, int | float):
        try:
            shelf = target.with_water(shelf_form)
        except CellchemError as exc:
            raise CellchemError(f"shelf_form: {exc}") from None
    else:
        shelf = _read_solute(shelf_form)
    if counts_key(shelf.anhydrous().counts) != counts_key(target.anhydrous().counts):
        raise ChemistryError(
            f"shelf form {shelf.text()} is not a hydrate of {target.text()} (their anhydrous parts"
            f" {shelf.anhydrous().text()} and {target.anhydrous().text()} differ); give a shelf form of the"
            " same salt"
        )
    if shelf.water is None:
        raise ChemistryError(
            f"shelf form {shelf.text()} has an unknown number of waters; its molar mass, and so the mass to"
            " weigh, is not known: give the hydrate on the label"
        )
    if shelf == target:
        return shelf, None
    return shelf, (
        f"{target.text()} substituted by {shelf.text()} ({float(molar_mass(shelf)):.2f} g/mol for"
        f" {float(molar_mass(target)):.2f} g/mol): weigh the shelf form as given."
    )


def mass_for_solution(
    formula: str | Formula,
    concentration: float | str,
    volume: float | str,
    purity: float | str = 1.0,
    *,
    shelf_form: str | Formula | int | float | None = None,
    concentration_unit: str = "mol/L",
    volume_unit: str = "L",
    mass_unit: str = "g",
    density: float | str | None = None,
    outside_range: str = "refuse",
) -> Recipe:
    """How much to weigh to make up a solution.

    Args:
        formula: the solute the concentration is written for (``'CuSO4'``).
        concentration: the target, a number in ``concentration_unit`` or text
            (``'0.1 M'``, ``'25 g/L'``, ``'0.9 % w/v'``, ``'50 meq/L'``). A mass
            concentration is of ``formula`` as written.
        volume: the final volume, a number in ``volume_unit`` or text (``'250 mL'``).
        purity: the assay of what is on the shelf, a fraction (0.995) or text
            (``'99.5%'``); default 1.
        shelf_form: what is actually on the shelf when it differs in water of
            crystallisation: a formula (``'CuSO4·5H2O'``) or a number of waters
            (5, or 0 for anhydrous).
        concentration_unit, volume_unit, mass_unit: units for plain numbers.
        density: the solution's density in g/mL, needed only for % w/w and mol/kg.
        outside_range: ``'refuse'`` (default) or ``'warn'`` (a RangeWarning and
            a note) for a concentration above what dissolves in water at 25 C,
            for the salts of ``data/solubilities.csv``, by the rules of
            ``cellchem.solutions``.

    Returns:
        A Recipe: ``mass`` (in ``mass_unit``), ``weigh``, ``notes``,
        ``cautions`` and a ``text`` to print.

    Raises:
        CellchemError: unreadable input, a shelf form that is not a hydrate of
            the solute, an unknown water count, a purity over 1, a
            concentration above what dissolves.

    >>> r = mass_for_solution("CuSO4", 0.1, "250 mL", shelf_form="CuSO4·5H2O")
    >>> round(r.mass, 3), r.weigh
    (6.242, 'CuSO4·5H2O')
    >>> mass_for_solution("PbI2", 0.1, "1 L")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: PbI2 at 0.1 mol/L is above what dissolves in water at 25 C: ...
    """
    _check_outside(outside_range)
    target = _read_solute(formula)
    if target.water is None:
        raise ChemistryError(
            f"{target.text()} has an unknown number of waters; write the recipe for a definite hydrate or the"
            " anhydrous salt"
        )
    shelf, substitution = _shelf(target, shelf_form)
    p = _purity(purity)
    conc_base, conc_reading = in_base(concentration, concentration_unit, "concentration", CONCENTRATION_KINDS)
    if conc_base <= 0:
        raise CellchemError(f"concentration: {concentration!r} is not above 0")
    molar, _ = _to_molar(conc_base, conc_reading.kind, target, density, "the concentration")
    vol_l, _ = in_base(volume, volume_unit, "volume", (VOLUME,))
    if vol_l <= 0:
        raise CellchemError(f"volume: {volume!r} is not above 0")
    mass_reading = read_unit(mass_unit)
    if mass_reading.kind != MASS:
        raise CellchemError(f"mass_unit: {mass_unit!r} is not a unit of mass (expected 'g', 'mg' or 'kg')")
    moles = molar * vol_l
    mm_shelf = float(molar_mass(shelf))
    grams = moles * mm_shelf / p
    notes: list[str] = []
    if conc_reading.note:
        notes.append(conc_reading.note + ".")
    if substitution:
        notes.append(substitution)
    if p != 1.0:
        notes.append(f"Mass raised for an assay of {_fmt(p * 100)} %.")
    d = None
    try:
        d = ions_of(target)
    except CellchemError:
        pass
    if d is not None and d.fully_dissociated:
        for line in check_solubility((SoluteAmount(d, molar, str(concentration)),), "mol/L", outside_range):
            notes.append(line + ".")
    if d is not None and d.behaviour in (STRONG_ACID,):
        notes.append(
            "Concentrated acids are measured by volume from a stock of known % w/w and density rather than"
            " weighed: see convert_concentration and dilution."
        )
    if d is not None and d.behaviour == WEAK_BASE:
        notes.append("Ammonia solutions are made by dilution of a stock of known strength, not by weighing.")
    if d is not None and d.behaviour == STRONG_BASE:
        notes.append(
            "Hydroxide solids absorb water and CO2 from air: standardise the solution if it must be exact."
        )
    return Recipe(
        weigh=shelf.text(),
        mass=grams / mass_reading.factor,
        mass_unit=mass_reading.text,
        target=target.text(),
        concentration=molar,
        volume=vol_l,
        purity=p,
        molar_mass=mm_shelf,
        notes=tuple(notes),
        cautions=caution_text(shelf),
    )


def concentration_from_mass(
    formula: str | Formula,
    mass: float | str,
    volume: float | str,
    purity: float | str = 1.0,
    *,
    unit: str = "mol/L",
    mass_unit: str = "g",
    volume_unit: str = "L",
    density: float | str | None = None,
) -> Value:
    """The concentration made by dissolving a mass of a compound and making up
    to a volume (the reverse of ``mass_for_solution``).

    Args:
        formula: what was weighed, as on the shelf (``'CuSO4·5H2O'``).
        mass: how much, a number in ``mass_unit`` or text (``'6.24 g'``).
        volume: the final volume, a number in ``volume_unit`` or text.
        purity: the assay, as for ``mass_for_solution``.
        unit: the unit wanted (mol/L by default; any concentration unit; a
            mass concentration is of ``formula`` as weighed).
        density: needed only for % w/w and mol/kg.

    >>> round(concentration_from_mass("NaCl", "5.844 g", "1 L"), 4)
    0.1
    """
    f = _read_solute(formula)
    if f.water is None:
        raise ChemistryError(f"{f.text()} has an unknown number of waters, so its molar mass is not known")
    p = _purity(purity)
    grams, _ = in_base(mass, mass_unit, "mass", (MASS,))
    vol_l, _ = in_base(volume, volume_unit, "volume", (VOLUME,))
    if grams < 0 or vol_l <= 0:
        raise CellchemError("mass must be 0 or more and volume above 0")
    molar = grams * p / float(molar_mass(f)) / vol_l
    target = read_unit(unit)
    if target.kind not in CONCENTRATION_KINDS:
        raise CellchemError(f"unit {unit!r} is not a concentration")
    out = _from_molar(molar, target.kind, f, density, "the concentration")
    return Value(_round(out / target.factor), target.text, (target.note,) if target.note else ())


@dataclass(frozen=True)
class Dilution:
    """The result of ``dilution``: all four quantities of C1 V1 = C2 V2, in
    the units of the call, and the instruction to print."""

    c1: float
    v1: float
    c2: float
    v2: float
    concentration_unit: str
    volume_unit: str
    text: str
    cautions: tuple[str, ...]

    def __str__(self) -> str:
        return self.text


def dilution(
    c1: float | str | None = None,
    v1: float | str | None = None,
    c2: float | str | None = None,
    v2: float | str | None = None,
    *,
    concentration_unit: str = "mol/L",
    volume_unit: str = "L",
    formula: str | Formula | None = None,
    density: float | str | None = None,
) -> Dilution:
    """Solve C1 V1 = C2 V2 for the one quantity left as None.

    Args:
        c1, v1: the stock's concentration and the volume of it taken.
        c2, v2: the diluted solution's concentration and final volume.
        concentration_unit, volume_unit: units of plain numbers (and of the
            answer). Concentrations given as text may use different units of
            the same kind; % w/w and mol/kg need ``formula`` and ``density``
            (of the stock) and are converted to mol/L.
        formula: the solute, for cautions and for conversions between kinds.
        density: the stock's density in g/mL, for a stock given in % w/w.

    Returns:
        A Dilution with all four values and a ``text`` instruction.

    >>> d = dilution(c1=1.0, c2=0.1, v2="250 mL")
    >>> round(d.v1, 4), d.volume_unit
    (0.025, 'L')
    """
    given = {"c1": c1, "v1": v1, "c2": c2, "v2": v2}
    missing = [k for k, v in given.items() if v is None]
    if len(missing) != 1:
        raise CellchemError(
            "dilution: give exactly three of c1, v1, c2, v2 and leave one as None (left out:"
            f" {', '.join(missing) or 'none'})"
        )
    out_conc = read_unit(concentration_unit)
    out_vol = read_unit(volume_unit)
    if out_conc.kind not in CONCENTRATION_KINDS or out_vol.kind != VOLUME:
        raise CellchemError("concentration_unit must be a concentration and volume_unit a volume")
    f = _read_solute(formula) if formula is not None else None
    kind = out_conc.kind

    def conc(name: str, value) -> float:
        nonlocal kind
        number, reading = read_quantity(value, concentration_unit, name)
        if reading.kind not in CONCENTRATION_KINDS:
            raise CellchemError(f"{name}: unit {reading.text!r} is not a concentration")
        base = number * reading.factor
        if reading.kind in (MASS_FRACTION, AMOUNT_PER_MASS) or reading.kind != out_conc.kind:
            if f is None:
                raise CellchemError(
                    f"{name} is in {reading.text} but the answer is in {out_conc.text}: pass formula=... (and"
                    " density=... for % w/w) to convert"
                )
            molar, _ = _to_molar(base, reading.kind, f, density if name == "c1" else None, name)
            kind = AMOUNT_PER_VOLUME if out_conc.kind in (MASS_FRACTION, AMOUNT_PER_MASS) else out_conc.kind
            return _from_molar(molar, kind, f, None, name)
        return base

    values: dict[str, float] = {}
    for name in ("c1", "c2"):
        if given[name] is not None:
            values[name] = conc(name, given[name])
            if values[name] <= 0:
                raise CellchemError(f"{name}: {given[name]!r} is not above 0")
    for name in ("v1", "v2"):
        if given[name] is not None:
            values[name], _ = in_base(given[name], volume_unit, name, (VOLUME,))
            if values[name] <= 0:
                raise CellchemError(f"{name}: {given[name]!r} is not above 0")
    m = missing[0]
    if m == "v1":
        values["v1"] = values["c2"] * values["v2"] / values["c1"]
    elif m == "v2":
        values["v2"] = values["c1"] * values["v1"] / values["c2"]
    elif m == "c1":
        values["c1"] = values["c2"] * values["v2"] / values["v1"]
    else:
        values["c2"] = values["c1"] * values["v1"] / values["v2"]
    if values["c2"] > values["c1"] * (1 + 1e-12):
        raise ChemistryError(
            f"c2 ({values['c2']:g}) is above c1 ({values['c1']:g}): a dilution cannot raise the concentration"
        )
    if values["v1"] > values["v2"] * (1 + 1e-12):
        raise ChemistryError(f"v1 ({values['v1']:g} L) is more than v2 ({values['v2']:g} L)")
    conc_unit = out_conc.text if kind == out_conc.kind else "mol/L"
    factor = out_conc.factor if kind == out_conc.kind else 1.0
    c1o, c2o = values["c1"] / factor, values["c2"] / factor
    v1o, v2o = values["v1"] / out_vol.factor, values["v2"] / out_vol.factor
    cautions = caution_text(f) if f is not None else (SDS_LINE,)
    what = f" of {f.text()}" if f is not None else ""
    acid = False
    if f is not None:
        try:
            acid = ions_of(f).behaviour == STRONG_ACID
        except CellchemError:
            acid = False
    take = _fmt_volume(v1o, out_vol)
    final = _fmt_volume(v2o, out_vol)
    stock = f"the {_fmt(c1o)} {conc_unit} stock{what}"
    if acid:
        text = (
            f"Fill a {final} volumetric flask about half full with water, add {take} of {stock} slowly"
            f" with swirling, let it cool to room temperature, then make up to the mark with water and mix"
            f" ({_fmt(c2o)} {conc_unit})."
        )
    else:
        text = (
            f"Take {take} of {stock}, make up to {final} with water in a volumetric flask and mix"
            f" ({_fmt(c2o)} {conc_unit})."
        )
    text += " " + " ".join(cautions)
    return Dilution(c1o, v1o, c2o, v2o, conc_unit, out_vol.text, text, cautions)
