"""Activity coefficients of ions in dilute aqueous solution.

Three models, each with the ionic strength up to which it is commonly trusted
(W. Stumm and J. J. Morgan, *Aquatic Chemistry*, 3rd ed., Wiley 1996,
Table 3.3; from memory):

=============  =================================================  ===========
model          log10 gamma                                         trusted to
=============  =================================================  ===========
``limiting``   -A z^2 sqrt(I)                                      I = 0.005
``extended``   -A z^2 sqrt(I) / (1 + B a sqrt(I))                  I = 0.1
``davies``     -A z^2 (sqrt(I) / (1 + sqrt(I)) - 0.3 I)            I = 0.5
=============  =================================================  ===========

``limiting`` is the Debye-Huckel limiting law; ``extended`` the extended
Debye-Huckel equation with Kielland's ion-size parameters ``a``
(``data/ion_sizes.csv``; J. Kielland, J. Am. Chem. Soc. 59 (1937) 1675);
``davies`` the Davies equation (C. W. Davies, *Ion Association*, Butterworths
1962), which needs no ion size.

A and B follow from the temperature (0-100 C) through the relative
permittivity of water (C. G. Malmberg and A. A. Maryott, J. Res. Natl. Bur.
Stand. 56 (1956) 1, eq. for 0-100 C) and, for molal ionic strength, its
density (G. S. Kell, J. Chem. Eng. Data 20 (1975) 97), with the CODATA 2018
constants. Past a model's limit the functions refuse (the default) or, with
``outside_range='warn'``, give the value with a warning and a note.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass
from functools import lru_cache

from .errors import CellchemError, ChemistryError
from .ions import Ion, find_ion, ion_values
from .solutions import Value, ion_concentrations, ions_of, read_solutes

# CODATA 2018 (the first three exact since the 2019 SI)
ELEMENTARY_CHARGE = 1.602176634e-19  # C
BOLTZMANN = 1.380649e-23  # J/K
AVOGADRO = 6.02214076e23  # 1/mol
VACUUM_PERMITTIVITY = 8.8541878128e-12  # F/m
LN10 = math.log(10.0)


class RangeWarning(UserWarning):
    """A value computed outside the range its model is trusted in."""


@dataclass(frozen=True)
class ActivityModel:
    name: str
    title: str
    trusted_to: float  # ionic strength, mol/L or mol/kg
    needs_size: bool


MODELS = {
    "limiting": ActivityModel("limiting", "Debye-Huckel limiting law", 0.005, False),
    "extended": ActivityModel("extended", "extended Debye-Huckel (Kielland ion sizes)", 0.1, True),
    "davies": ActivityModel("davies", "Davies equation", 0.5, False),
}

_OUTSIDE = ("refuse", "warn")


def _check_temperature(temperature_c: float) -> float:
    if isinstance(temperature_c, bool) or not isinstance(temperature_c, int | float):
        raise CellchemError(f"temperature_c: expected a number of degrees Celsius, read {temperature_c!r}")
    t = float(temperature_c)
    if not (0.0 <= t <= 100.0):
        raise CellchemError(
            f"temperature_c: {temperature_c!r} is outside 0-100 C, the range of the permittivity correlation"
            " used (Malmberg and Maryott 1956)"
        )
    return t


def water_permittivity(temperature_c: float = 25.0) -> float:
    """Relative permittivity of water at 0-100 C (Malmberg and Maryott 1956):
    87.740 - 0.40008 t + 9.398e-4 t^2 - 1.410e-6 t^3.

    >>> round(water_permittivity(25), 2)
    78.3
    """
    t = _check_temperature(temperature_c)
    return 87.740 - 0.40008 * t + 9.398e-4 * t**2 - 1.410e-6 * t**3


def water_density(temperature_c: float = 25.0) -> float:
    """Density of air-free water at 1 atm in kg/m3, 0-100 C (Kell 1975).

    >>> round(water_density(25), 2)
    997.04
    """
    t = _check_temperature(temperature_c)
    num = (
        999.83952
        + 16.945176 * t
        - 7.9870401e-3 * t**2
        - 46.170461e-6 * t**3
        + 105.56302e-9 * t**4
        - 280.54253e-12 * t**5
    )
    return num / (1 + 16.879850e-3 * t)


def _basis(unit: str) -> str:
    if not isinstance(unit, str):
        raise CellchemError(f"unit: expected 'mol/L' or 'mol/kg' for an ionic strength, read {unit!r}")
    if unit in ("mol/L", "M"):
        return "mol/L"
    if unit in ("mol/kg", "molal"):
        return "mol/kg"
    raise CellchemError(f"unit: expected 'mol/L' or 'mol/kg' for an ionic strength, read {unit!r}")


def debye_huckel_constants(temperature_c: float = 25.0, unit: str = "mol/L") -> tuple[float, float]:
    """The Debye-Huckel constants (A, B) for log10 gamma.

    Args:
        temperature_c: 0-100 C.
        unit: ``'mol/L'`` (ionic strength per litre of solution, taken as
            per litre of water: dilute solutions) or ``'mol/kg'`` (molal).

    Returns:
        A in (unit)^-1/2 and B in 1/angstrom (unit)^-1/2.

    >>> a, b = debye_huckel_constants(25, "mol/kg")
    >>> round(a, 3), round(b, 3)
    (0.511, 0.329)
    """
    return _constants(_check_temperature(temperature_c), _basis(unit))


@lru_cache(maxsize=512)
def _constants(t: float, basis: str) -> tuple[float, float]:
    kelvin = t + 273.15
    eps = water_permittivity(t)
    # amount of ions per m3 for I = 1 of the basis
    per_m3 = 1000.0 if basis == "mol/L" else water_density(t)
    e2 = ELEMENTARY_CHARGE**2
    kappa = math.sqrt(2 * e2 * AVOGADRO * per_m3 / (VACUUM_PERMITTIVITY * eps * BOLTZMANN * kelvin))  # 1/m
    a = e2 / (8 * math.pi * VACUUM_PERMITTIVITY * eps * BOLTZMANN * kelvin * LN10) * kappa
    return a, kappa * 1e-10


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


def _range_check(model: ActivityModel, strength: float, outside_range: str, unit: str) -> tuple[str, ...]:
    if outside_range not in _OUTSIDE:
        raise CellchemError(f"outside_range: expected 'refuse' or 'warn', read {outside_range!r}")
    if strength <= model.trusted_to * (1 + 1e-9):  # 10 mmol/L is 0.010000000000000002 mol/L
        return ()
    better = [m.name for m in MODELS.values() if m.trusted_to >= strength]
    advice = (
        f"use model '{better[0]}'"
        if better
        else "no model here covers it (a specific-interaction model is needed)"
    )
    text = (
        f"ionic strength {strength:g} {unit} is above {model.trusted_to:g}, the limit to which the"
        f" {model.title}"
        f" is trusted; {advice}"
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


def _strength_of(ionic_strength, unit: str | None) -> tuple[float, str]:
    if isinstance(ionic_strength, Value) and ionic_strength.unit in ("mol/L", "mol/kg"):
        if unit is not None and _basis(unit) != ionic_strength.unit:
            raise CellchemError(
                f"unit {unit!r} does not match the ionic strength given in {ionic_strength.unit}"
            )
        return float(ionic_strength), ionic_strength.unit
    if isinstance(ionic_strength, bool) or not isinstance(ionic_strength, int | float):
        raise CellchemError(f"ionic_strength: expected a number, read {ionic_strength!r}")
    value = float(ionic_strength)
    if not math.isfinite(value) or value < 0:
        raise CellchemError(f"ionic_strength: expected a number of 0 or more, read {ionic_strength!r}")
    return value, _basis("mol/L" if unit is None else unit)


def activity_coefficient(
    ion: str | Ion,
    ionic_strength: float,
    model: str = "davies",
    temperature_c: float = 25.0,
    *,
    unit: str | None = None,
    size: float | None = None,
    outside_range: str = "refuse",
) -> Value:
    """The activity coefficient of one ion.

    Args:
        ion: an ion label (``'Ca2+'``, ``'SO4 2-'``), name or Ion.
        ionic_strength: a number (in ``unit``), or the Value that
            ``ionic_strength()`` returns (its unit is then used).
        model: ``'davies'`` (default), ``'extended'`` or ``'limiting'``.
        temperature_c: 0-100 C.
        unit: ``'mol/L'`` (default) or ``'mol/kg'`` for a plain number.
        size: the ion-size parameter in angstrom, for ``'extended'`` when
            Kielland's table has none for the ion (or to override it).
        outside_range: ``'refuse'`` (default) or ``'warn'`` past the model's limit.

    Returns:
        A Value (a float between 0 and 1) with notes naming the model.

    >>> round(activity_coefficient("Ca2+", 0.01, "extended"), 3)
    0.675
    >>> activity_coefficient("Na+", 0.2, "limiting")  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    cellchem.errors.ChemistryError: ionic strength 0.2 mol/L is above 0.005, ...; use model 'davies', ...
    """
    m = _model(model)
    i = _ion(ion)
    strength, basis = _strength_of(ionic_strength, unit)
    a, b = debye_huckel_constants(_check_temperature(temperature_c), basis)
    notes = list(_range_check(m, strength, outside_range, basis))
    ion_a = None
    if m.needs_size:
        ion_a = size if size is not None else ion_size(i)
        if ion_a is None:
            raise ChemistryError(
                f"Kielland's table gives no ion size for {i.label}; pass size=... (angstrom) or use model"
                " 'davies'"
            )
        if isinstance(ion_a, bool) or not isinstance(ion_a, int | float) or not (0 < ion_a < 20):
            raise CellchemError(f"size: expected an ion size in angstrom between 0 and 20, read {ion_a!r}")
    value = 10 ** _log_gamma(m, i.charge, strength, a, b, ion_a)
    notes.insert(0, f"{m.title} at {float(temperature_c):g} C, I = {strength:g} {basis}")
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
        outside_range: ``'refuse'`` (default) or ``'warn'``.

    >>> round(mean_activity_coefficient("NaCl", 0.01, unit="mol/kg"), 3)
    0.902
    """
    d = ions_of(formula)
    if not d.fully_dissociated or not d.ions:
        raise ChemistryError(
            f"{d.formula} is a {d.behaviour}; a mean activity coefficient needs a strong electrolyte"
        )
    solutes = [(formula, concentration)]
    if background is not None:
        from .solutions import _pairs

        solutes += _pairs(background)
    basis, read, notes = read_solutes(solutes, unit)
    conc = ion_concentrations(read)
    strength = 0.5 * sum(c * ion.charge**2 for ion, c in conc.items())
    total = 0.0
    nu = 0.0
    extra: list[str] = []
    for c in d.ions:
        g = activity_coefficient(
            c.ion, Value(strength, basis), model, temperature_c, outside_range=outside_range
        )
        extra.extend(n for n in g.notes[1:] if n not in extra)
        total += float(c.count) * math.log(g)
        nu += float(c.count)
    value = math.exp(total / nu)
    m = _model(model)
    head = f"{m.title} at {float(temperature_c):g} C, I = {strength:g} {basis}"
    return Value(value, "", (head, *extra, *notes), (("ionic strength", strength, basis),))
