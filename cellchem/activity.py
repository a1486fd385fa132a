"""Activity coefficients of ions in dilute aqueous solution.

Three models:

- ``limiting``: the Debye-Huckel limiting law, log10 gamma = -A z^2 sqrt(I);
- ``extended``: the extended Debye-Huckel equation,
  log10 gamma = -A z^2 sqrt(I) / (1 + B a sqrt(I)), with Kielland's ion-size
  parameters ``a`` (``data/ion_sizes.csv``; J. Kielland, J. Am. Chem. Soc. 59
  (1937) 1675);
- ``davies``: the Davies equation, log10 gamma = -A z^2 (sqrt(I) / (1 + sqrt(I))
  - 0.3 I) (C. W. Davies, *Ion Association*, Butterworths 1962), which needs no
  ion size.

None of them knows about ion association, which makes the ions of a salt of
two multiply charged ions (MgSO4, CuSO4, ZnSO4) far less active than any of
them says (R. A. Robinson and R. H. Stokes, *Electrolyte Solutions*, 2nd ed.,
Butterworths 1959, ch. 14), nor about the specific interactions that set in as
the solution grows concentrated. So each model is trusted up to an ionic
strength that depends on the charge type of the solution: the product
|z+ z-| of the highest cation charge and the highest anion charge present
(1 for NaCl, 2 for CaCl2 or Na2SO4, 3 for LaCl3, 4 for MgSO4 or K4[Fe(CN)6]).
The limits, as ionic strength in mol/kg (applied as they are to mol/L):

=============  =====  =====  =====  =====
model          1:1    2:1    3:1    2:2
=============  =====  =====  =====  =====
``limiting``   0.005  0.005  0.004  0.005
``extended``   0.1    0.1    0.004  0.004
``davies``     0.1    0.1    0.004  0.004
=============  =====  =====  =====  =====

Where they come from: every model was compared with published mean activity
coefficients of strong electrolytes at 25 C (tests/reference/
mean_activity_coefficients.csv: Robinson and Stokes 1959, Appendix 8.10; the
CRC Handbook table from W. J. Hamer and Y.-C. Wu, J. Phys. Chem. Ref. Data 1
(1972) 1047 and later NBS evaluations; Lewis and Randall for the dilute 2:2
sulfates), and a limit is the highest ionic strength below which the model is
within 10 % of every published value of its charge type, lowered to the limit
commonly stated for the model (W. Stumm and J. J. Morgan, *Aquatic Chemistry*,
3rd ed., Wiley 1996, Table 3.3: limiting law to I = 0.005, extended equation to
0.1, Davies equation to 0.5; from memory) where that is tighter:

- 1:1. The limiting law holds to 10 % up to I = 0.05, the extended equation up
  to 0.2; the commonly stated 0.005 and 0.1 are kept. The Davies equation is
  more than 10 % above the nitrates, which associate (KNO3 0.663 and AgNO3 0.656
  published at 0.2 mol/kg against 0.746), above I = 0.1: its limit falls from
  0.5 to 0.1.
- 2:1 and 1:2. The limiting law holds to I = 0.03 and the extended equation to
  0.3; 0.005 and 0.1 are kept. The Davies equation is 21 % above Na2SO4 at
  I = 0.3 (0.538 against 0.445 published) and 7-9 % above Na2SO4 and K2SO4 at
  0.15: its limit is 0.1.
- 2:2 (and 4:1). Ion association of the sulfates (Robinson and Stokes ch. 14):
  the extended and Davies equations are 13-14 % above ZnSO4 at 0.002 mol/kg
  (I = 0.008), and at 0.1 mol/kg the Davies value is 0.28 against 0.150
  published for MgSO4, CuSO4, ZnSO4, CdSO4 and NiSO4 (89 % high); their limit
  is I = 0.004 (0.001 mol/kg of a 2:2 salt, within 9 %). The limiting law, whose
  low values happen to track the association, keeps its 0.005.
- 3:1 and 1:3. The table holds no value below 0.1 mol/kg (I = 0.6, where every
  model is 8 % or more off for LaCl3, AlCl3 and K3[Fe(CN)6]), so nothing is checked:
  the tightest limit found above, I = 0.004, is applied to all three models.
- Higher products (3:2 as in Al2(SO4)3 and the alums, 3:3, 4:2): ions of such
  charges associate strongly (Robinson and Stokes ch. 14) and no published
  value lies within reach of a model; every ionic strength above 0 is outside.

A solution's charge type comes from the ions the call can see: the ions of the
salt and its ``background`` for ``mean_activity_coefficient``; for
``activity_coefficient``, the ion asked about and, when the ionic strength is
the Value that ``ionic_strength`` returns, the ions of that solution. A plain
number tells nothing of the other ions: the counter-ions are then taken as
singly charged (a NaCl or KNO3 background), or of the charge given as
``counter_charge``, and the result's notes say so. A trace of a multiply
charged salt makes the whole solution of its charge type.

A and B follow from the temperature (0-100 C) through the relative
permittivity of water (C. G. Malmberg and A. A. Maryott, J. Res. Natl. Bur.
Stand. 56 (1956) 1, eq. for 0-100 C) and, for molal ionic strength, its
density (G. S. Kell, J. Chem. Eng. Data 20 (1975) 97), with the CODATA 2018
constants. The limits were found at 25 C and are applied at every temperature.
Past a limit the functions refuse (the default) or, with
``outside_range='warn'``, give the value with a RangeWarning and a note that
names the limit and its source.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

from .errors import CellchemError, ChemistryError, RangeWarning
from .ions import Ion, ion_values
from .reading import find_ion
from .solutions import Value, _pairs, ion_concentrations, ions_of, read_solutes
from .water import check_temperature, debye_huckel_constants, strength_basis
from .water import water_density as water_density  # the water's properties, as they were found here
from .water import water_permittivity as water_permittivity


@dataclass(frozen=True)
class ActivityModel:
    name: str
    title: str
    trusted_to: float  # ionic strength for 1:1 solutions, mol/L or mol/kg (MODEL_LIMITS for the others)
    needs_size: bool


MODELS = {
    "limiting": ActivityModel("limiting", "Debye-Huckel limiting law", 0.005, False),
    "extended": ActivityModel("extended", "extended Debye-Huckel (Kielland ion sizes)", 0.1, True),
    "davies": ActivityModel("davies", "Davies equation", 0.1, False),
}

# Charge types by |z+ z-|: the column headings of the module docstring's table of limits.
CHARGE_TYPES = {1: "1:1", 2: "2:1", 3: "3:1", 4: "2:2"}

_COMMON = "the limit commonly stated for the model (Stumm and Morgan 1996, Table 3.3)"
_UNCHECKED_3 = (
    "the published 3:1 values (Robinson and Stokes 1959, App. 8.10) start at 0.1 mol/kg, where every"
    " model is 8 % or more off; nothing below was checked, so the tightest limit found for any charge type"
    " is applied"
)
_PAIRS_22 = (
    "ion association of the 2:2 sulfates ({}Robinson and Stokes 1959, ch. 14): above it the model is more"
    " than 10 % above the published ZnSO4 values (Lewis and Randall 1961)"
)

# (ionic strength limit, why and where from) per model and charge type |z+ z-|; see the
# module docstring for the evidence. Charge types above 4 are outside every model.
MODEL_LIMITS: dict[str, dict[int, tuple[float, str]]] = {
    "limiting": {
        1: (0.005, _COMMON),
        2: (0.005, _COMMON),
        3: (0.004, _UNCHECKED_3),
        4: (0.005, _COMMON),
    },
    "extended": {
        1: (0.1, _COMMON),
        2: (0.1, _COMMON),
        3: (0.004, _UNCHECKED_3),
        4: (0.004, _PAIRS_22.format("")),
    },
    "davies": {
        1: (
            0.1,
            "above it the associating 1:1 nitrates (KNO3, AgNO3) are more than 10 % below the model"
            " (Robinson and Stokes 1959, App. 8.10; CRC Handbook, Hamer and Wu 1972)",
        ),
        2: (
            0.1,
            "above it Na2SO4 and K2SO4 fall away from the model (Na2SO4 0.1 mol/kg: 0.445 published against"
            " 0.538; Robinson and Stokes 1959, App. 8.10)",
        ),
        3: (0.004, _UNCHECKED_3),
        4: (0.004, _PAIRS_22.format("Davies 1962; ")),
    },
}
_BEYOND = (
    "ions of these charges associate strongly (3:2 as in Al2(SO4)3 and the alums; Robinson and Stokes 1959,"
    " ch. 14) and no published value lies within reach of a model"
)

_OUTSIDE = ("refuse", "warn")


def charge_type(cation_charge: int, anion_charge: int) -> int:
    """The charge type |z+ z-| of a cation and an anion, by which the models'
    limits are set (1 for Na+ Cl-, 2 for Ca2+ Cl-, 4 for Mg2+ SO4 2-).

    >>> charge_type(2, -2)
    4
    """
    return abs(int(cation_charge) * int(anion_charge))


def trusted_limit(model: str, charge_product: int) -> float:
    """The ionic strength up to which a model is trusted for a solution of
    charge type |z+ z-| = ``charge_product`` (see the module docstring); 0 for
    the charge types no model covers.

    >>> trusted_limit("davies", 4)
    0.004
    """
    m = _model(model)
    if isinstance(charge_product, bool) or not isinstance(charge_product, int) or charge_product < 1:
        raise CellchemError(
            f"charge_product: expected a whole number |z+ z-| of 1 or more, read {charge_product!r}"
        )
    return MODEL_LIMITS[m.name].get(charge_product, (0.0, ""))[0]


def _sizes() -> dict[tuple, float]:
    return ion_values("ion_sizes.csv", "size")


def ion_size(ion: str | Ion) -> float | None:
    """Kielland's ion-size parameter of an ion in angstrom, or None if the
    table has none.

    >>> ion_size("Ca2+")
    6.0
    """
    i = _ion(ion)
    return _sizes().get((i.key, i.charge))


def _ion(ion: str | Ion) -> Ion:
    if isinstance(ion, Ion):
        return ion
    return find_ion(ion)


def _model(model: str) -> ActivityModel:
    m = MODELS.get(model) if isinstance(model, str) else None
    if m is None:
        raise CellchemError(f"model: expected one of {', '.join(repr(k) for k in MODELS)}, read {model!r}")
    return m


def _check_outside(outside_range: str) -> None:
    if outside_range not in _OUTSIDE:
        raise CellchemError(f"outside_range: expected 'refuse' or 'warn', read {outside_range!r}")


def _type_text(cation: int, anion: int) -> str:
    return f"a {cation}:{abs(anion)} solution (highest charges +{cation} and -{abs(anion)})"


def _range_check(
    model: ActivityModel, strength: float, outside_range: str, unit: str, cation: int, anion: int
) -> tuple[str, ...]:
    """Refuse or warn when ``strength`` is past the model's limit for the charge
    type of the highest cation and anion charges; the notes to add otherwise."""
    _check_outside(outside_range)
    product = charge_type(cation, anion)
    limit, why = MODEL_LIMITS[model.name].get(product, (0.0, _BEYOND))
    if strength <= limit * (1 + 1e-9):  # 10 mmol/L is 0.010000000000000002 mol/L
        return ()
    better = [
        m.name
        for m in MODELS.values()
        if MODEL_LIMITS[m.name].get(product, (0.0, ""))[0] * (1 + 1e-9) >= strength
    ]
    advice = (
        f"use model '{better[0]}'"
        if better
        else "no model here covers it (a specific-interaction or ion-association model is needed)"
    )
    text = (
        f"ionic strength {strength:g} {unit} is above {limit:g}, the limit to which the {model.title} is"
        f" trusted for {_type_text(cation, anion)}: {why}; {advice}"
    )
    if outside_range == "refuse":
        raise ChemistryError(text + ", or pass outside_range='warn' to have the value anyway")
    warnings.warn(text, RangeWarning, stacklevel=3)
    return (text,)


def _log_gamma(
    model: ActivityModel, z: int, strength: float, a: float, b: float, size: float | None
) -> float:
    root = math.sqrt(strength)
    if model.name == "limiting":
        return -a * z * z * root
    if model.name == "extended":
        assert size is not None
        return -a * z * z * root / (1 + b * size * root)
    return -a * z * z * (root / (1 + root) - 0.3 * strength)


def _solution_charges(details) -> tuple[int, int]:
    """The highest cation charge and the lowest (most negative) anion charge in
    the details of an ``ionic_strength`` Value; 0 for a sign with no ion."""
    cation, anion = 0, 0
    for item in details:
        if not (isinstance(item, tuple) and len(item) == 3):
            continue
        _, z, c = item
        if isinstance(z, bool) or not isinstance(z, int) or not isinstance(c, int | float) or c <= 0:
            continue
        cation, anion = max(cation, z), min(anion, z)
    return cation, anion


def _strength_of(ionic_strength, unit: str | None) -> tuple[float, str, tuple[int, int] | None]:
    """The ionic strength, its basis and, for an ``ionic_strength`` Value, the
    highest charges of its ions (None for a plain number)."""
    if isinstance(ionic_strength, Value) and ionic_strength.unit in ("mol/L", "mol/kg"):
        if unit is not None and strength_basis(unit) != ionic_strength.unit:
            raise CellchemError(
                f"unit {unit!r} does not match the ionic strength given in {ionic_strength.unit}"
            )
        charges = _solution_charges(ionic_strength.details)
        return float(ionic_strength), ionic_strength.unit, (charges if charges != (0, 0) else None)
    if isinstance(ionic_strength, bool) or not isinstance(ionic_strength, int | float):
        raise CellchemError(f"ionic_strength: expected a number, read {ionic_strength!r}")
    value = float(ionic_strength)
    if not math.isfinite(value) or value < 0:
        raise CellchemError(f"ionic_strength: expected a number of 0 or more, read {ionic_strength!r}")
    return value, strength_basis("mol/L" if unit is None else unit), None


def _counter(counter_charge) -> int | None:
    if counter_charge is None:
        return None
    if (
        isinstance(counter_charge, bool)
        or not isinstance(counter_charge, int)
        or not (1 <= abs(counter_charge) <= 6)
    ):
        raise CellchemError(
            f"counter_charge: expected the charge of the counter-ions as a whole number from 1 to 6 (its sign"
            f" does not matter), read {counter_charge!r}"
        )
    return abs(counter_charge)


def _size_of(m: ActivityModel, i: Ion, size) -> float | None:
    if not m.needs_size:
        return None
    ion_a = size if size is not None else ion_size(i)
    if ion_a is None:
        raise ChemistryError(
            f"Kielland's table gives no ion size for {i.label}; pass size=... (angstrom) or use model"
            " 'davies'"
        )
    if isinstance(ion_a, bool) or not isinstance(ion_a, int | float) or not (0 < ion_a < 20):
        raise CellchemError(f"size: expected an ion size in angstrom between 0 and 20, read {ion_a!r}")
    return float(ion_a)


def activity_coefficient(
    ion: str | Ion,
    ionic_strength: float,
    model: str = "davies",
    temperature_c: float = 25.0,
    *,
    unit: str | None = None,
    size: float | None = None,
    counter_charge: int | None = None,
    outside_range: str = "refuse",
) -> Value:
    """The activity coefficient of one ion.

    Args:
        ion: an ion label (``'Ca2+'``, ``'SO4 2-'``), name or Ion.
        ionic_strength: a number (in ``unit``), or the Value that
            ``ionic_strength()`` returns (its unit is then used, and its ions
            set the charge type the model's limit is read for).
        model: ``'davies'`` (default), ``'extended'`` or ``'limiting'``.
        temperature_c: 0-100 C.
        unit: ``'mol/L'`` (default) or ``'mol/kg'`` for a plain number.
        size: the ion-size parameter in angstrom, for ``'extended'`` when
            Kielland's table has none for the ion (or to override it).
        counter_charge: with a plain-number ionic strength, the highest charge
            of the ions of the other sign in the solution (2 for Ca2+ in a
            sulfate solution). Default: singly charged counter-ions, stated in
            the notes.
        outside_range: ``'refuse'`` (default) or ``'warn'`` past the model's
            limit for the solution's charge type (module table).

    Returns:
        A Value (a float between 0 and 1) with notes naming the model.

    >>> round(activity_coefficient("Ca2+", 0.01, "extended"), 3)
    0.675
    >>> activity_coefficient("Na+", 0.2, "limiting")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: ionic strength 0.2 mol/L is above 0.005, ...; no model here covers it ...
    >>> activity_coefficient("Mg2+", 0.04, counter_charge=2)  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: ionic strength 0.04 mol/L is above 0.004, ... for a 2:2 solution ...
    """
    m = _model(model)
    i = _ion(ion)
    strength, basis, solution = _strength_of(ionic_strength, unit)
    counter = _counter(counter_charge)
    a, b = debye_huckel_constants(check_temperature(temperature_c), basis)
    assumed = ""
    if solution is not None:
        cation, anion = solution
        if counter is not None:
            raise CellchemError(
                "counter_charge: the ionic strength given is the Value of ionic_strength(), whose ions"
                " already fix the charges; leave counter_charge out"
            )
    else:
        cation, anion = 0, 0
    if i.charge > 0:
        cation = max(cation, i.charge)
    elif i.charge < 0:
        anion = min(anion, i.charge)
    if cation == 0 or anion == 0:  # the other sign is not known: singly charged, or as given
        other = counter or 1
        if cation == 0:
            cation = other
        else:
            anion = -other
        if counter is None and strength > 0:
            assumed = (
                "counter-ions taken as singly charged for the model's limit (pass the Value of"
                " ionic_strength() or counter_charge=... for a solution of multiply charged ions)"
            )
    notes = list(_range_check(m, strength, outside_range, basis, cation, anion))
    ion_a = _size_of(m, i, size)
    value = 10 ** _log_gamma(m, i.charge, strength, a, b, ion_a)
    notes.insert(0, f"{m.title} at {float(temperature_c):g} C, I = {strength:g} {basis}")
    if assumed:
        notes.append(assumed)
    return Value(value, "", notes, (("ion", i.label), ("size", ion_a), ("A", a), ("B", b)))


def mean_activity_coefficient(
    formula: str,
    concentration,
    model: str = "davies",
    temperature_c: float = 25.0,
    *,
    unit: str = "mol/L",
    background=None,
    outside_range: str = "refuse",
) -> Value:
    """The mean activity coefficient of a salt, gamma± = (prod gamma_i^nu_i)^(1/nu).

    Args:
        formula: the salt (``'NaCl'``, ``'CaCl2'``, ``'Na2SO4·10H2O'``).
        concentration: its concentration, a number in ``unit`` or text with a
            unit; the ionic strength comes from it (and from ``background``).
        model: as for ``activity_coefficient``.
        temperature_c: 0-100 C.
        unit: unit of a plain-number concentration: mol/L (default) or mol/kg
            (the handbook tables of mean activity coefficients are molal).
        background: other solutes present, as for ``ionic_strength``.
        outside_range: ``'refuse'`` (default) or ``'warn'``, past the model's
            limit for the charge type of the salt and its background (module
            table), and for a concentration above what dissolves (see
            ``ionic_strength``).

    >>> round(mean_activity_coefficient("NaCl", 0.01, unit="mol/kg"), 3)
    0.902
    >>> mean_activity_coefficient("MgSO4", 0.1, unit="mol/kg")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: ionic strength 0.4 mol/kg is above 0.004, ... for a 2:2 solution ...
    """
    m = _model(model)
    _check_outside(outside_range)
    t = check_temperature(temperature_c)
    d = ions_of(formula)
    if not d.fully_dissociated or not d.ions:
        raise ChemistryError(
            f"{d.formula} is a {d.behaviour}; a mean activity coefficient needs a strong electrolyte"
        )
    solutes = [(formula, concentration)]
    if background is not None:
        solutes += _pairs(background)
    basis, read, notes = read_solutes(solutes, unit, outside_range=outside_range)
    conc = {ion: c for ion, c in ion_concentrations(read).items() if c > 0}
    strength = 0.5 * sum(c * ion.charge**2 for ion, c in conc.items())
    charges = [ion.charge for ion in conc] + [c.charge for c in d.ions]
    cation = max(z for z in charges if z > 0)
    anion = min(z for z in charges if z < 0)
    extra = list(_range_check(m, strength, outside_range, basis, cation, anion))
    a, b = debye_huckel_constants(t, basis)
    total = 0.0
    nu = 0.0
    for c in d.ions:
        log_g = _log_gamma(m, c.ion.charge, strength, a, b, _size_of(m, c.ion, None))
        total += float(c.count) * log_g
        nu += float(c.count)
    value = 10 ** (total / nu)
    head = f"{m.title} at {t:g} C, I = {strength:g} {basis}"
    return Value(value, "", (head, *extra, *notes), (("ionic strength", strength, basis),))
