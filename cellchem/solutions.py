"""Solutions of ions: what a solute gives in water, and the ionic strength.

The model is full dissociation of strong electrolytes: a salt, a strong acid or
a strong base gives the ions of its formula, as the charge balance reads them
(``Al2(SO4)3`` gives 2 Al3+ and 3 SO4 2-), and its water of crystallisation
joins the solvent. Nothing else is modelled, and cellchem says so rather than
guess:

- weak acids and weak bases (acetic acid, phosphoric acid, ammonia) ionise only
  in part; their equilibria are not computed. ``ions_of`` reports them with
  ``fully_dissociated`` False, and ``ionic_strength`` refuses them unless told
  to count them as neutral molecules;
- complex ions (``[Cu(NH3)4]2+``) are counted as one ion each; complex
  equilibria are not computed;
- hydrogen anions (HCO3-, H2PO4-, HSO4-) are counted as written; their own
  acid-base equilibria are not computed;
- hydroxides other than those of group 1 and of Ca, Sr, Ba are sparingly
  soluble, and oxides, hydrides, nitrides and the like react with water: they
  are refused;
- molecular compounds of carbon and hydrogen (glucose, urea, ethanol) are non-electrolytes
  (no ions); other molecular compounds (CO2, SO2, PCl5) react with water or
  ionise in part, and are refused.
- ion pairing (significant for 2:2 salts such as MgSO4 even at 0.01 mol/L) is
  not modelled.

Solubility. A concentration is only a solution if it dissolves. For the salts
of ``data/solubilities.csv`` the functions built on ``read_solutes``
(``ionic_strength``, the activity coefficients, ``conductivity``) refuse, or
with ``outside_range='warn'`` warn, when a stated concentration is above what
dissolves in pure water at 25 C:

- sparingly soluble salts (a solubility product Ksp, CRC Handbook): the ion
  product of the solution, prod c_i^nu_i over the salt's ions from every
  solute, is compared with Ksp. For the salt alone that is its molar
  solubility in pure water, s = (Ksp / prod nu_i^nu_i)^(1/nu), and cellchem
  allows 3 s: activity coefficients below 1, hydrolysis of the anion (CO3 2-)
  and ion pairs such as CaSO4(aq) make real solubilities larger than s, by up
  to 2.7 times for the salts of the table (gypsum; checked with PHREEQC). In a
  mixture the ions of the other solutes raise the allowance further, by
  1 / gamma±^nu with gamma± from the Davies equation at their ionic strength
  (at most 0.5), so that sea water is not taken for a gypsum slurry. The check
  covers ions given singly (``('Ag+', c)``) and precipitation between solutes
  (AgNO3 and NaCl together); it does not model the complexes that dissolve a
  salt again in a large excess of one ion (AgCl2-, PbI4 2-, Al(OH)4-): those
  solutions are refused, with ``outside_range='warn'`` as the way through;
- soluble salts (a mass fraction of the saturated solution, CRC Handbook):
  each salt is compared, on its own, with its molality at saturation, with
  5 % allowed for the recalled values. A molar concentration is compared with
  the same molal figure: a litre of these solutions holds less than a
  kilogram of water, so a molar figure above it cannot dissolve (one a little
  below it may not either, and is let through). Mixtures of soluble salts
  (NaCl with KCl) and ions given singly are not checked against each other.

Solutions made warm, supersaturated solutions and water holding CO2 (which
dissolves carbonates as hydrogencarbonate) can hold more than these figures;
``solubility`` answers the figure for one salt, with its source.
"""

from __future__ import annotations

import math
import warnings
from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from fractions import Fraction
from functools import cache, cached_property, lru_cache

from .charge import IONIC, MOLECULAR, charge_balance
from .errors import CellchemError, ChemistryError, RangeWarning
from .formula import Formula, Number
from .ions import Ion, counts_key
from .mass import molar_mass
from .names import read_name
from .reading import parse_formula
from .tables import read_table
from .units import (
    AMOUNT_PER_MASS,
    AMOUNT_PER_VOLUME,
    EQUIVALENTS_PER_VOLUME,
    MASS_PER_VOLUME,
    in_base,
    read_quantity,
)
from .water import debye_huckel_constants

STRONG_ELECTROLYTE = "strong electrolyte"
STRONG_ACID = "strong acid"
STRONG_BASE = "strong base"
WEAK_ACID = "weak acid"
WEAK_BASE = "weak base"
NON_ELECTROLYTE = "non-electrolyte"
SPARINGLY_SOLUBLE = "sparingly soluble"
REACTS_WITH_WATER = "reacts with water"
ION = "ion"

FULLY_DISSOCIATED = (STRONG_ELECTROLYTE, STRONG_ACID, STRONG_BASE, ION)

_STRONG_BASE_METALS = frozenset({"Li", "Na", "K", "Rb", "Cs", "Ca", "Sr", "Ba"})


class Value(float):
    """A number with its unit and the notes that qualify it.

    It is a float (so it goes into a cell or a sum as it is) that also carries
    ``unit`` (``'mol/L'``, ``'uS/cm'``, ``''`` for a pure number), ``notes``
    (assumptions and warnings, one line each) and ``details`` (what it was
    computed from, for example the ions and their concentrations).
    """

    unit: str
    notes: tuple[str, ...]
    details: tuple

    def __new__(
        cls, value: float, unit: str = "", notes: Iterable[str] = (), details: Iterable = ()
    ) -> Value:
        obj = super().__new__(cls, value)
        obj.unit = unit
        obj.notes = tuple(notes)
        obj.details = tuple(details)
        return obj

    def __reduce__(self):
        return (Value, (float(self), self.unit, self.notes, self.details))


@dataclass(frozen=True)
class IonCount:
    """One ion a solute gives, and how many per formula unit."""

    ion: Ion
    count: Number

    @property
    def charge(self) -> int:
        return self.ion.charge

    def __str__(self) -> str:
        return f"{self.count} {self.ion.label}" if self.count != 1 else self.ion.label


@dataclass(frozen=True)
class Dissociation:
    """What a solute gives in water (the result of ``ions_of``).

    Attributes:
        formula: the canonical formula read.
        behaviour: ``'strong electrolyte'``, ``'strong acid'``, ``'strong base'``,
            ``'weak acid'``, ``'weak base'``, ``'non-electrolyte'`` or ``'ion'``.
        ions: the ions per formula unit under full dissociation (for a weak
            electrolyte: the ions it would give if it dissociated fully,
            which it does not).
        water: water of crystallisation per formula unit, which joins the
            solvent (0 for none, None when the count is unknown).
        fully_dissociated: True when full dissociation is cellchem's model
            for this solute.
        notes: what the model leaves out for this solute, one line each.
    """

    formula: str
    behaviour: str
    ions: tuple[IonCount, ...]
    water: Number | None
    fully_dissociated: bool
    notes: tuple[str, ...]

    @property
    def equivalents(self) -> Number:
        """Charge equivalents per formula unit: the total positive charge (2
        for CaCl2, 6 for Al2(SO4)3, 2 for SO4 2-)."""
        positive = sum(c.count * c.charge for c in self.ions if c.charge > 0)
        negative = -sum(c.count * c.charge for c in self.ions if c.charge < 0)
        return positive or negative

    def __str__(self) -> str:
        ions = " + ".join(str(c) for c in self.ions) or "no ions"
        return f"{self.formula}: {ions} ({self.behaviour})"


@cache
def _behaviour_table() -> tuple[dict[tuple, tuple[str, str]], dict[tuple, tuple[str, str]]]:
    compounds: dict[tuple, tuple[str, str]] = {}
    ions: dict[tuple, tuple[str, str]] = {}
    for row in read_table("electrolytes.csv"):
        f = parse_formula(row["match"])
        if row["match_kind"] == "formula":
            compounds[counts_key(f.counts)] = (row["behaviour"], row["note"])
        else:
            ions[(counts_key(f.counts), int(row["charge"]))] = (row["behaviour"], row["note"])
    return compounds, ions


def _read_solute(solute: str | Formula) -> Formula:
    if isinstance(solute, Formula):
        return solute
    if not isinstance(solute, str) or not solute.strip():
        raise CellchemError(
            f"no solute given (read {solute!r}; expected a formula such as 'NaCl' or 'SO4 2-')"
        )
    try:
        return parse_formula(solute)
    except CellchemError as formula_error:
        try:
            return parse_formula(read_name(solute).formula)
        except CellchemError:
            raise formula_error from None


def _is_hydrogen_ion(ion: Ion) -> bool:
    return ion.charge == 1 and dict(ion.formula.counts) == {"H": 1}


@lru_cache(maxsize=4096)
def _ions_of(f: Formula) -> Dissociation:
    text = f.text()
    compounds, ion_rows = _behaviour_table()
    balance = charge_balance(f)
    if not balance.balanced:
        raise ChemistryError(f"{text} cannot be split into ions: {balance.explanation}", text=f.source)
    water = f.water
    anhydrous = f.anhydrous()
    key = counts_key(anhydrous.counts)

    if f.charge:
        shares = [s for s in balance.charges if s.ion is not None]
        if len(shares) == 1 and shares[0].count == 1:
            ion = shares[0].ion
            assert ion is not None
            row = ion_rows.get((ion.key, ion.charge))
            if row and row[0] == REACTS_WITH_WATER:
                raise ChemistryError(f"{ion.label} does not exist in water: {row[1]}", text=f.source)
            return Dissociation(ion.label, ION, (IonCount(ion, 1),), 0, True, ())
        raise ChemistryError(
            f"{text} is charged but is not one ion of the catalog; give a neutral compound or a single ion",
            text=f.source,
        )

    if balance.kind == "element":
        raise ChemistryError(
            f"{text} is an element, not a solute cellchem models (metals and halogens react with water);"
            " give a compound",
            text=f.source,
        )

    if key in compounds and compounds[key][0] in (WEAK_BASE, WEAK_ACID) and balance.kind == MOLECULAR:
        behaviour, note = compounds[key]
        return Dissociation(text, behaviour, (), water, False, (note, _WEAK_NOTE))

    if balance.kind == MOLECULAR:
        if key == counts_key({"H": 2, "O": 1}):
            raise ChemistryError("H2O is the solvent, not a solute", text=f.source)
        if "C" in anhydrous.counts and "H" in anhydrous.counts:
            return Dissociation(
                text,
                NON_ELECTROLYTE,
                (),
                water,
                True,
                (
                    f"{text} is molecular and counted as a non-electrolyte (no ions); an organic acid or"
                    " base would ionise in part: give its ions if so",
                ),
            )
        raise ChemistryError(
            f"{text} is a molecular compound that reacts with water or ionises in part (as CO2 gives"
            " carbonic acid); cellchem does not model that: give the ions you expect instead",
            text=f.source,
        )

    if balance.kind != IONIC:
        raise ChemistryError(
            f"{text} does not read as simple ions ({balance.explanation}); cellchem does not model it in"
            " solution: give the ions you expect instead",
            text=f.source,
        )
    counts: dict[Ion, Number] = {}
    neutral: list[str] = []
    for share in balance.charges:
        if share.ion is None:
            if share.label.replace(" ", "") not in ("H2O",):
                neutral.append(share.label)
            continue
        if share.count == "x":
            raise ChemistryError(f"{text}: the number of {share.label} is not known", text=f.source)
        counts[share.ion] = counts.get(share.ion, 0) + share.count
    ordered = sorted(counts.items(), key=lambda item: item[0].charge < 0)  # cations first, stable
    ions = tuple(IonCount(ion, _norm(n)) for ion, n in ordered)
    notes: list[str] = []
    for c in ions:
        row = ion_rows.get((c.ion.key, c.ion.charge))
        if row and row[0] == REACTS_WITH_WATER:
            raise ChemistryError(f"{text} reacts with water: {row[1]}", text=f.source)
    cations = [c for c in ions if c.charge > 0]
    anions = [c for c in ions if c.charge < 0]

    behaviour = STRONG_ELECTROLYTE
    if cations and all(_is_hydrogen_ion(c.ion) for c in cations):
        behaviour, note = compounds.get(key, (WEAK_ACID, ""))
        if behaviour == STRONG_ACID:
            if note and note != "fully dissociated in dilute solution":
                notes.append(note)
        else:
            behaviour = WEAK_ACID
            notes.append(f"{text} is a weak acid: only part of it is present as ions")
            notes.append(_WEAK_NOTE)
    elif key in compounds and compounds[key][0] == WEAK_BASE:
        behaviour, note = compounds[key]
        notes.extend((note, _WEAK_NOTE))
    elif any(c.ion.text == "OH" and c.charge == -1 for c in anions):
        metals = {s for c in cations for s in c.ion.formula.counts}
        if metals <= _STRONG_BASE_METALS:
            behaviour = STRONG_BASE
        else:
            raise ChemistryError(
                f"{text} is a sparingly soluble hydroxide; its solution is not modelled (only the hydroxides"
                " of group 1 metals and of Ca, Sr and Ba are counted as strong bases)",
                text=f.source,
            )
    for c in ions:
        if c.ion.is_complex:
            notes.append(f"{c.ion.label} is counted as one ion; complex equilibria are not modelled")
        elif (
            c.charge < 0
            and "H" in c.ion.formula.counts
            and c.ion.text not in ("OH", "HS")
            and (c.ion.formula.counts.get("C", 0) == 0 or c.ion.text in ("HCO3",))
        ):
            notes.append(
                f"{c.ion.label} is counted as written; its own acid-base equilibrium is not modelled"
            )
    if neutral:
        notes.append(
            f"the neutral part {', '.join(neutral)} joins the solution as molecules (no ions counted for it)"
        )
    fully = behaviour in FULLY_DISSOCIATED
    return Dissociation(text, behaviour, ions, water, fully, tuple(dict.fromkeys(notes)))


_WEAK_NOTE = "weak-electrolyte equilibria are not modelled by cellchem"


def _norm(x: Number) -> Number:
    if isinstance(x, Fraction) and x.denominator == 1:
        return int(x)
    return x


def ions_of(formula: str | Formula) -> Dissociation:
    """The ions a solute gives in water, under full dissociation.

    Args:
        formula: a formula (``'Al2(SO4)3'``, ``'CuSO4·5H2O'``), an ion
            (``'SO4 2-'``), or a name cellchem reads (``'copper(II) sulfate'``).

    Returns:
        A Dissociation: ``ions`` (each with ``ion`` and ``count``),
        ``behaviour``, ``water``, ``fully_dissociated`` and ``notes``.

    Raises:
        CellchemError: the formula cannot be read, is not charge-balanced, or is
            a solute whose solution cellchem does not model (an oxide, a
            sparingly soluble hydroxide, an element, an inorganic molecule).

    >>> str(ions_of("Al2(SO4)3"))
    'Al2(SO4)3: 2 Al3+ + 3 SO4 2- (strong electrolyte)'
    >>> d = ions_of("CuSO4·5H2O")
    >>> [str(c) for c in d.ions], d.water
    (['Cu2+', 'SO4 2-'], 5)
    >>> ions_of("CH3COOH").behaviour, ions_of("CH3COOH").fully_dissociated
    ('weak acid', False)
    """
    return _ions_of(_read_solute(formula))


def _pairs(solutes) -> list[tuple[object, object]]:
    if isinstance(solutes, str | bytes) or not isinstance(solutes, Iterable):
        raise CellchemError(
            f"solutes: expected pairs of (formula, concentration) or a mapping, read {solutes!r}"
        )
    if isinstance(solutes, Mapping):
        if not solutes:
            raise CellchemError("solutes: none given; expected pairs of (formula, concentration)")
        return list(solutes.items())
    pairs = []
    for i, item in enumerate(solutes, 1):
        if isinstance(item, str) or not isinstance(item, tuple | list) or len(item) != 2:
            raise CellchemError(
                f"solutes: item {i} is {item!r}; expected a pair (formula, concentration) such as ('NaCl',"
                " 0.1)"
            )
        pairs.append((item[0], item[1]))
    if not pairs:
        raise CellchemError("solutes: none given; expected pairs of (formula, concentration)")
    return pairs


@dataclass(frozen=True)
class SoluteAmount:
    """One solute of a solution, read: its dissociation and its amount
    concentration in the basis of the call (mol/L or mol/kg)."""

    dissociation: Dissociation
    concentration: float
    given: str


def read_solutes(
    solutes,
    unit: str = "mol/L",
    weak_electrolytes: str = "refuse",
    what: str = "ionic strength",
    outside_range: str = "refuse",
) -> tuple[str, tuple[SoluteAmount, ...], tuple[str, ...]]:
    """Read (formula, concentration) pairs into dissociations and amounts.

    Concentrations are numbers in ``unit`` or text with a unit; mol/L,
    mmol/L, g/L, mg/L, % w/v, ppm, eq/L and meq/L give a molar basis, mol/kg
    and mmol/kg a molal one; the two may not be mixed. A concentration above
    what dissolves (module docstring) is refused, or with
    ``outside_range='warn'`` warned of (RangeWarning) and noted.

    Returns:
        (basis ``'mol/L'`` or ``'mol/kg'``, the solutes, notes).
    """
    if weak_electrolytes not in ("refuse", "neutral"):
        raise CellchemError(f"weak_electrolytes: expected 'refuse' or 'neutral', read {weak_electrolytes!r}")
    _check_outside(outside_range)
    basis = None
    read: list[SoluteAmount] = []
    notes: list[str] = []
    for solute, conc in _pairs(solutes):
        d = ions_of(solute)  # type: ignore[arg-type]
        value, reading = in_base(
            conc,  # type: ignore[arg-type]
            unit,
            f"concentration of {d.formula}",
            (AMOUNT_PER_VOLUME, AMOUNT_PER_MASS, MASS_PER_VOLUME, EQUIVALENTS_PER_VOLUME),
        )
        if value < 0:
            raise CellchemError(f"concentration of {d.formula}: {conc!r} is negative")
        this_basis = "mol/kg" if reading.kind == AMOUNT_PER_MASS else "mol/L"
        if basis is None:
            basis = this_basis
        elif basis != this_basis:
            raise CellchemError(
                f"concentration of {d.formula} is in {reading.text} but an earlier one is {basis}:"
                " molar (per litre of solution) and molal (per kg of water) cannot be mixed"
            )
        if reading.note:
            notes.append(reading.note)
        if reading.kind == MASS_PER_VOLUME:
            value = value / float(molar_mass(d.formula))
        elif reading.kind == EQUIVALENTS_PER_VOLUME:
            eq = d.equivalents
            if not eq:
                raise CellchemError(
                    f"concentration of {d.formula} in {reading.text}: it gives no ions to count"
                )
            value = value / float(eq)
        if not d.fully_dissociated:
            if weak_electrolytes == "refuse":
                raise ChemistryError(
                    f"{d.formula} is a {d.behaviour}; its {what} needs its equilibrium, which cellchem does"
                    " not"
                    " model. Give the ions you expect instead (for example ('CH3COO-', c) and ('H+', c)),"
                    " or pass weak_electrolytes='neutral' to count it as undissociated molecules"
                )
            notes.append(f"{d.formula} ({d.behaviour}) counted as undissociated molecules")
        notes.extend(d.notes)
        read.append(SoluteAmount(d, value, str(conc)))
    assert basis is not None
    notes.extend(check_solubility(tuple(read), basis, outside_range))
    return basis, tuple(read), tuple(dict.fromkeys(notes))


def ion_concentrations(read: tuple[SoluteAmount, ...]) -> dict[Ion, float]:
    """Each ion's concentration over all solutes (fully dissociated ones only)."""
    total: dict[Ion, float] = {}
    for s in read:
        if not s.dissociation.fully_dissociated:
            continue
        for c in s.dissociation.ions:
            total[c.ion] = total.get(c.ion, 0.0) + s.concentration * float(c.count)
    return total


def ionic_strength(
    solutes, unit: str = "mol/L", weak_electrolytes: str = "refuse", *, outside_range: str = "refuse"
) -> Value:
    """Ionic strength I = 1/2 sum(c_i z_i^2) of a solution, with full
    dissociation of strong electrolytes.

    Args:
        solutes: pairs ``(formula or ion, concentration)`` or a mapping of
            them. A concentration is a number in ``unit`` or text with its own
            unit (``'5 mmol/L'``, ``'0.9 % w/v'``, ``'0.01 mol/kg'``).
        unit: the unit of plain-number concentrations (default mol/L).
        weak_electrolytes: ``'refuse'`` (default) or ``'neutral'`` to count weak
            acids and bases as undissociated molecules.
        outside_range: ``'refuse'`` (default) or ``'warn'`` for a
            concentration above what dissolves at 25 C (module docstring).

    Returns:
        A Value: the ionic strength in mol/L (molar inputs) or mol/kg (molal
        inputs), with ``unit``, ``notes`` and ``details`` (each ion's label,
        charge and concentration).

    Raises:
        CellchemError: a solute or concentration that cannot be read, molar and
            molal inputs mixed, a weak electrolyte with ``'refuse'``, or a salt
            above what dissolves with ``outside_range='refuse'``.

    Source: G. N. Lewis and M. Randall, J. Am. Chem. Soc. 43 (1921) 1112.

    >>> ionic_strength([("MgCl2", 0.1)])
    0.3
    >>> ionic_strength({"NaCl": "10 mmol/L", "K2SO4": "5 mmol/L"}).unit
    'mol/L'
    >>> ionic_strength([("BaSO4", 0.1)])  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: BaSO4 at 0.1 mol/L is above what dissolves in water at 25 C: ...
    """
    basis, read, notes = read_solutes(solutes, unit, weak_electrolytes, outside_range=outside_range)
    conc = ion_concentrations(read)
    total = 0.5 * sum(c * ion.charge**2 for ion, c in conc.items())
    details = tuple((ion.label, ion.charge, c) for ion, c in conc.items())
    return Value(float(f"{total:.15g}"), basis, notes, details)


# ---------------------------------------------------------------------------
# Solubility
# ---------------------------------------------------------------------------

KSP = "Ksp"
MASS_PERCENT = "mass %"
KSP_MARGIN = 3.0  # on the molar solubility from Ksp in pure water: module docstring
SOLUBLE_MARGIN = 1.05  # on the molality of a tabled saturated solution (recalled values)
DAVIES_CAP = 0.5  # highest ionic strength at which the salt-effect allowance is evaluated
HYDROXIDE_FLOOR = 1e-6  # mol/L of OH- from the salt below which water's own ions set the solubility

_OUTSIDE = ("refuse", "warn")
_SOLUBILITY_SOURCES = {
    "CRC Ksp": 'CRC Handbook, "Solubility Product Constants"',
    "CRC aq": 'CRC Handbook, "Aqueous Solubility of Inorganic Compounds at Various Temperatures"',
    "textbook": "textbook tables",
}

Signature = tuple[tuple[tuple, Number], ...]


def _check_outside(outside_range: str) -> None:
    if outside_range not in _OUTSIDE:
        raise CellchemError(f"outside_range: expected 'refuse' or 'warn', read {outside_range!r}")


def _signature(ions: Iterable[tuple[Ion, Number]]) -> Signature:
    """A salt's identity by its ions and their counts (hydrate water left out)."""
    return tuple(sorted(((ion.key, ion.charge), _norm(n)) for ion, n in ions))


@dataclass(frozen=True, eq=False)  # one object per table row: compared and hashed by identity
class _SolubilityRow:
    formula: str
    quantity: str
    value: float
    solid: str
    source: str
    ions: tuple[tuple[Ion, Number], ...]

    @cached_property
    def keys(self) -> tuple[tuple, ...]:
        """(ion key, charge) of each ion, in the order of ``ions``."""
        return tuple((ion.key, ion.charge) for ion, _ in self.ions)

    @property
    def cited(self) -> str:
        """The source as a message cites it: the table's full title, then the remark."""
        head, _, rest = self.source.partition(" (")
        return _SOLUBILITY_SOURCES.get(head, head) + (f", {rest.removesuffix(')')}" if rest else "")

    @property
    def nu(self) -> float:
        return float(sum(n for _, n in self.ions))

    def pure_water(self) -> float:
        """The molar solubility in pure water from Ksp, s = (Ksp / prod n^n)^(1/nu)."""
        denominator = math.prod(float(n) ** float(n) for _, n in self.ions)
        return (self.value / denominator) ** (1.0 / self.nu)

    def molality(self) -> float:
        """The molality of the saturated solution from its mass percent (anhydrous)."""
        w = self.value / 100.0
        return w / (1.0 - w) * 1000.0 / float(molar_mass(self.formula))


@cache
def _solubility_table() -> tuple[dict[Signature, _SolubilityRow], dict[tuple, tuple[_SolubilityRow, ...]]]:
    """The rows by their salt's signature, and the Ksp rows by each ion of theirs."""
    by_signature: dict[Signature, _SolubilityRow] = {}
    for row in read_table("solubilities.csv"):
        f = parse_formula(row["formula"])
        balance = charge_balance(f)
        ions = tuple((share.ion, _norm(share.count)) for share in balance.charges if share.ion is not None)
        if not balance.balanced or len(ions) < 2 or row["quantity"] not in (KSP, MASS_PERCENT):
            raise ValueError(
                f"data file solubilities.csv: row {row['formula']!r} is not a salt of known ions"
            )
        entry = _SolubilityRow(
            row["formula"], row["quantity"], float(row["value"]), row["solid"], row["source"], ions
        )
        if _signature(ions) in by_signature:
            raise ValueError(f"data file solubilities.csv: {row['formula']!r} is listed twice")
        by_signature[_signature(ions)] = entry
    by_ion: dict[tuple, list[_SolubilityRow]] = {}
    for entry in by_signature.values():
        if entry.quantity == KSP:
            for ion, _ in entry.ions:
                by_ion.setdefault((ion.key, ion.charge), []).append(entry)
    return by_signature, {key: tuple(rows) for key, rows in by_ion.items()}


@lru_cache(maxsize=4096)
def _row_of(d: Dissociation) -> _SolubilityRow | None:
    """The table row of a fully dissociated salt (any hydrate of it), or None."""
    if not d.fully_dissociated or len(d.ions) < 2:
        return None
    return _solubility_table()[0].get(_signature((c.ion, c.count) for c in d.ions))


def _davies_mean(z_product: int, strength: float, basis: str) -> float:
    """gamma± of the Davies equation at 25 C for a charge type |z+ z-|."""
    if strength <= 0:
        return 1.0
    a, _ = debye_huckel_constants(25.0, basis)
    root = math.sqrt(strength)
    return 10 ** (-a * z_product * (root / (1 + root) - 0.3 * strength))


def check_solubility(
    read: tuple[SoluteAmount, ...], basis: str, outside_range: str = "refuse"
) -> tuple[str, ...]:
    """Refuse (or warn of) a solute above what dissolves at 25 C, by the rules
    of the module docstring; returns the notes to add (the warnings given).

    Args:
        read: the solutes, as ``read_solutes`` reads them.
        basis: ``'mol/L'`` or ``'mol/kg'``, the basis of their concentrations.
        outside_range: ``'refuse'`` or ``'warn'``.
    """
    _check_outside(outside_range)
    by_ion = _solubility_table()[1]
    problems: list[str] = []

    totals: dict[_SolubilityRow, float] = {}
    for s in read:
        row = _row_of(s.dissociation)
        if row is not None and row.quantity == MASS_PERCENT:
            totals[row] = totals.get(row, 0.0) + s.concentration
    for row, c in totals.items():
        limit = row.molality()
        if c > limit * SOLUBLE_MARGIN:
            molar = (
                " (a litre of the solution holds less than a kilogram of water)" if basis == "mol/L" else ""
            )
            problems.append(
                f"{row.formula} at {c:.4g} {basis} is above what dissolves in water at 25 C:"
                f" {limit:.3g} mol/kg{molar}, from {row.value:g} g per 100 g of saturated solution"
                f" ({row.cited}); give a concentration it can reach"
            )

    conc = ion_concentrations(read)
    by_key = {(ion.key, ion.charge): c for ion, c in conc.items() if c > 0}
    candidates = dict.fromkeys(row for key in by_key for row in by_ion.get(key, ()))
    for row in candidates:
        if all(k in by_key for k in row.keys):
            problem = _ion_product_problem(row, read, row.keys, by_key, basis)
            if problem:
                problems.append(problem)

    notes: list[str] = []
    for text in problems:
        if outside_range == "refuse":
            raise ChemistryError(text + ", or pass outside_range='warn' to have the value anyway")
        warnings.warn(text, RangeWarning, stacklevel=4)
        notes.append(text)
    return tuple(notes)


def _ion_product_problem(row: _SolubilityRow, read, keys, by_key, basis: str) -> str | None:
    """The message if the ion product of a Ksp row's ions is past its allowance, else None."""
    q = math.prod(by_key[k] ** float(n) for k, (_, n) in zip(keys, row.ions))
    other = 0.5 * sum(c * key[1] ** 2 for key, c in by_key.items() if key not in keys)
    z_product = max(ion.charge for ion, _ in row.ions) * -min(ion.charge for ion, _ in row.ions)
    gamma = _davies_mean(z_product, min(other, DAVIES_CAP), basis)
    factor = KSP_MARGIN / gamma
    if q <= row.value * factor**row.nu * (1 + 1e-9):
        return None
    return _ksp_problem(row, read, keys, by_key, q, factor, gamma, basis)


def _ksp_problem(
    row: _SolubilityRow, read, keys, by_key, q: float, factor: float, gamma: float, basis: str
) -> str:
    s0 = row.pure_water()
    row_signature = _signature(row.ions)
    givers = [
        s
        for s in read
        if s.dissociation.fully_dissociated
        and any((c.ion.key, c.ion.charge) in keys for c in s.dissociation.ions)
    ]
    if givers and all(
        _signature((c.ion, c.count) for c in s.dissociation.ions) == row_signature for s in givers
    ):
        c = sum(s.concentration for s in givers)
        salt_effect = f", {1 / gamma:.3g} more for the other ions present" if gamma < 1 else ""
        return (
            f"{row.formula} at {c:.4g} {basis} is above what dissolves in water at 25 C: {s0:.3g} mol/L"
            f" from its Ksp {row.value:g} ({row.cited}), with {KSP_MARGIN:g} times that allowed for activity"
            f" effects{salt_effect}; give a concentration it can reach"
        )
    parts = []
    for k, (ion, _) in zip(keys, row.ions):
        sources = sorted(
            {
                s.dissociation.formula
                for s in givers
                if any((c.ion.key, c.ion.charge) == k for c in s.dissociation.ions)
            }
        )
        parts.append(f"{ion.label} {by_key[k]:.4g} {basis} (from {', '.join(sources)})")
    return (
        f"{row.formula} would precipitate: {' and '.join(parts)} give an ion product of {q:.3g}, above its"
        f" solubility product {row.value:g} ({row.cited}) by more than the {factor**row.nu:.3g} allowed for"
        " activity effects (complexes that an excess of one ion forms are not modelled); give concentrations"
        " that stay in solution"
    )


def solubility(formula: str | Formula, unit: str = "mol/kg", *, density=None) -> Value:
    """How much of a salt dissolves in pure water at 25 C, from cellchem's
    table (``data/solubilities.csv``), with its source.

    Args:
        formula: the salt, anhydrous or as a hydrate (``'CuSO4·5H2O'`` is
            answered as CuSO4, in mol of CuSO4).
        unit: ``'mol/kg'`` (default; per kg of water), ``'mol/L'``, or a
            prefixed form of either (``'mmol/L'``).
        density: the saturated solution's density in g/mL, needed only for
            ``'mol/L'`` of a salt tabled as a mass fraction.

    Returns:
        A Value in ``unit``. For a salt with a solubility product, the molar
        solubility in pure water s = (Ksp / prod nu_i^nu_i)^(1/nu), taken as
        the same in mol/L and mol/kg at that dilution; activity coefficients,
        hydrolysis and ion pairs make the real figure larger (up to about 3
        times, which the checks of ``ionic_strength`` allow). For a soluble
        salt, the saturated solution's molality from its mass fraction. Notes
        say which, with the source; details hold the tabled quantity.

    Raises:
        CellchemError: a formula not in the table; a hydroxide whose own OH-
            would be below that of pure water (its solubility is set by the
            pH); mol/L of a mass-fraction salt without a density.

    >>> round(solubility("AgCl"), 7)
    1.33e-05
    >>> round(solubility("NaCl"), 2)
    6.15
    """
    f = _read_solute(formula)
    try:
        d = ions_of(f)
        signature = _signature((c.ion, c.count) for c in d.ions)
    except ChemistryError:  # a sparingly soluble hydroxide ions_of refuses: read its ions directly
        balance = charge_balance(f.anhydrous())
        signature = _signature((sh.ion, sh.count) for sh in balance.charges if sh.ion is not None)
    row = _solubility_table()[0].get(signature)
    if row is None:
        raise ChemistryError(
            f"no solubility for {f.text()} in cellchem's table (data/solubilities.csv: the common sparingly"
            " soluble salts and store salts); give its solubility from a handbook"
        )
    _, target = read_quantity(1.0, unit, "unit")
    if target.kind not in (AMOUNT_PER_MASS, AMOUNT_PER_VOLUME):
        raise CellchemError(f"unit: expected mol/L or mol/kg (or mmol/L, mmol/kg), read {unit!r}")
    notes: list[str] = []
    if row.quantity == KSP:
        value = row.pure_water()
        hydroxide = [
            n for ion, n in row.ions if ion.charge == -1 and dict(ion.formula.counts) == {"O": 1, "H": 1}
        ]
        if hydroxide and value * float(hydroxide[0]) < HYDROXIDE_FLOOR:
            raise ChemistryError(
                f"{row.formula} is so insoluble that the OH- it gives"
                f" ({value * float(hydroxide[0]):.2g} mol/L from its Ksp) is below that of water itself: its"
                " solubility is set by the pH, which cellchem does not model"
            )
        notes.append(
            f"molar solubility in pure water at 25 C from Ksp {row.value:g} ({row.cited}), taken as equal in"
            " mol/L and mol/kg at this dilution; activity effects, hydrolysis and ion pairs make the real"
            f" solubility larger (cellchem's checks allow {KSP_MARGIN:g} times this figure)"
        )
        details: tuple = (("Ksp", row.value), ("solid", row.solid), ("source", row.source))
    else:
        value = row.molality()
        notes.append(
            f"molality of the solution saturated at 25 C, from {row.value:g} g of {row.formula} per 100 g of"
            f" solution ({row.cited}; solid phase {row.solid}; mass of the anhydrous salt)"
        )
        details = (("mass %", row.value), ("solid", row.solid), ("source", row.source))
        if target.kind == AMOUNT_PER_VOLUME:
            rho = _solution_density(density, row.formula)
            value = row.value / 100.0 * rho * 1000.0 / float(molar_mass(row.formula))
            notes.append(f"mol/L through the density given, {rho:g} g/mL")
    return Value(float(f"{value / target.factor:.6g}"), target.text, notes, details)


def _solution_density(density, formula: str) -> float:
    if density is None:
        raise CellchemError(
            f"the solubility of {formula} is tabled as a mass fraction; in mol/L it needs the saturated"
            " solution's density: pass density=... (g/mL) or ask for mol/kg"
        )
    if isinstance(density, bool) or not isinstance(density, int | float) or not (0.5 <= density <= 3.0):
        raise CellchemError(f"density: expected a number of g/mL between 0.5 and 3.0, read {density!r}")
    return float(density)
