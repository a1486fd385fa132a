"""Water as the solvent: its relative permittivity and density at 0-100 C, and
the Debye-Huckel constants A and B that follow from them.

The relative permittivity of water follows C. G. Malmberg and A. A. Maryott,
J. Res. Natl. Bur. Stand. 56 (1956) 1 (eq. for 0-100 C); its density, for
molal ionic strength, G. S. Kell, J. Chem. Eng. Data 20 (1975) 97; the
constants are those of CODATA 2018. The activity models (``cellchem.activity``),
the conductivity estimate and the solubility check of ``cellchem.solutions``
all take A and B from here.
"""

from __future__ import annotations

import math
from functools import lru_cache

from .errors import CellchemError

# CODATA 2018 (the first three exact since the 2019 SI)
ELEMENTARY_CHARGE = 1.602176634e-19  # C
BOLTZMANN = 1.380649e-23  # J/K
AVOGADRO = 6.02214076e23  # 1/mol
VACUUM_PERMITTIVITY = 8.8541878128e-12  # F/m
LN10 = math.log(10.0)


def check_temperature(temperature_c: float) -> float:
    """A temperature in degrees Celsius as a float, refused outside 0-100 C."""
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
    t = check_temperature(temperature_c)
    return 87.740 - 0.40008 * t + 9.398e-4 * t**2 - 1.410e-6 * t**3


def water_density(temperature_c: float = 25.0) -> float:
    """Density of air-free water at 1 atm in kg/m3, 0-100 C (Kell 1975).

    >>> round(water_density(25), 2)
    997.04
    """
    t = check_temperature(temperature_c)
    num = (
        999.83952
        + 16.945176 * t
        - 7.9870401e-3 * t**2
        - 46.170461e-6 * t**3
        + 105.56302e-9 * t**4
        - 280.54253e-12 * t**5
    )
    return num / (1 + 16.879850e-3 * t)


def strength_basis(unit: str) -> str:
    """The basis of an ionic strength: 'mol/L' (also 'M') or 'mol/kg' (also 'molal')."""
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
    return _constants(check_temperature(temperature_c), strength_basis(unit))


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
