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
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass
from fractions import Fraction
from functools import cache, lru_cache

from .charge import IONIC, MOLECULAR, charge_balance
from .errors import CellchemError, ChemistryError
from .formula import Formula, Number, parse_formula
from .ions import Ion, counts_key
from .mass import molar_mass
from .tables import read_table
from .units import (
    AMOUNT_PER_MASS,
    AMOUNT_PER_VOLUME,
    EQUIVALENTS_PER_VOLUME,
    MASS_PER_VOLUME,
    in_base,
)

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
        from .names import read_name  # names sit beside solutions in the core

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

    assert balance.kind == IONIC
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
) -> tuple[str, tuple[SoluteAmount, ...], tuple[str, ...]]:
    """Read (formula, concentration) pairs into dissociations and amounts.

    Concentrations are numbers in ``unit`` or text with a unit; mol/L,
    mmol/L, g/L, mg/L, % w/v, ppm, eq/L and meq/L give a molar basis, mol/kg
    and mmol/kg a molal one; the two may not be mixed.

    Returns:
        (basis ``'mol/L'`` or ``'mol/kg'``, the solutes, notes).
    """
    if weak_electrolytes not in ("refuse", "neutral"):
        raise CellchemError(f"weak_electrolytes: expected 'refuse' or 'neutral', read {weak_electrolytes!r}")
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


def ionic_strength(solutes, unit: str = "mol/L", weak_electrolytes: str = "refuse") -> Value:
    """Ionic strength I = 1/2 sum(c_i z_i^2) of a solution, with full
    dissociation of strong electrolytes.

    Args:
        solutes: pairs ``(formula or ion, concentration)`` or a mapping of
            them. A concentration is a number in ``unit`` or text with its own
            unit (``'5 mmol/L'``, ``'0.9 % w/v'``, ``'0.01 mol/kg'``).
        unit: the unit of plain-number concentrations (default mol/L).
        weak_electrolytes: ``'refuse'`` (default) or ``'neutral'`` to count weak
            acids and bases as undissociated molecules.

    Returns:
        A Value: the ionic strength in mol/L (molar inputs) or mol/kg (molal
        inputs), with ``unit``, ``notes`` and ``details`` (each ion's label,
        charge and concentration).

    Raises:
        CellchemError: a solute or concentration that cannot be read, molar and
            molal inputs mixed, or a weak electrolyte with ``'refuse'``.

    Source: G. N. Lewis and M. Randall, J. Am. Chem. Soc. 43 (1921) 1112.

    >>> ionic_strength([("MgCl2", 0.1)])
    0.3
    >>> ionic_strength({"NaCl": "10 mmol/L", "K2SO4": "5 mmol/L"}).unit
    'mol/L'
    """
    basis, read, notes = read_solutes(solutes, unit, weak_electrolytes)
    conc = ion_concentrations(read)
    total = 0.5 * sum(c * ion.charge**2 for ion, c in conc.items())
    details = tuple((ion.label, ion.charge, c) for ion, c in conc.items())
    return Value(float(f"{total:.15g}"), basis, notes, details)
