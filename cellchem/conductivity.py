"""Electrical conductivity of a dilute solution of strong electrolytes.

The estimate starts from the limiting molar ionic conductivities at 25 C
(``data/ionic_conductivities.csv``, CRC Handbook, "Ionic conductivity and
diffusion at infinite dilution") and lowers each ion's conductivity with the
Debye-Huckel-Onsager theory, in the extended form of Robinson and Stokes
(R. A. Robinson and R. H. Stokes, *Electrolyte Solutions*, 2nd ed.,
Butterworths 1959, chapter 7): for an ion i with counter-ion j,

    lambda_i = lambda_i0 - (R_ij lambda_i0 + E_i) sqrt(I) / (1 + B a_ij sqrt(I))

where R_ij sqrt(I) is the relaxation term |z_i z_j| q l_B kappa / (3 (1 + sqrt q)),
q = |z_i z_j| (lambda_i0 + lambda_j0) / ((|z_i| + |z_j|)(|z_j| lambda_i0 + |z_i| lambda_j0)),
E_i sqrt(I) the electrophoretic term |z_i| F e kappa / (6 pi eta), and a_ij the mean of the
two Kielland ion sizes (3 A where one is missing). For a single salt this is
the Onsager equation of Robinson and Stokes; in a mixture each ion's counter-ion
is the equivalent-weighted mean of the ions of the other sign (an
approximation cellchem makes, stated in the result). Water at 25 C:
permittivity 78.30 (Malmberg and Maryott 1956), viscosity 0.8900 mPa s (IAPWS
2008; from memory).

Range: trusted to I = 0.02 mol/L (within about 0.5 % for 1:1 salts against
handbook conductivities), usable with a warning to I = 0.1 mol/L (within about
2 % for 1:1 salts). Salts of two doubly charged ions (MgSO4, CuSO4) form ion
pairs, which the model leaves out: it overstates their conductivity (by
about 5 % at 0.001 mol/L MgSO4, more above), so where ions of charge 2 or more
of both signs are present the trusted limit is I = 0.001 mol/L.

Other temperatures (15-35 C) use the linear compensation conductivity meters
use, kappa_T = kappa_25 (1 + alpha (T - 25)) with alpha = 0.019 per K by
default (common practice for salt solutions and KCl standards; acids and bases
differ), so the figure is what an uncompensated meter would read.
"""

from __future__ import annotations

import math
import warnings

from .activity import _sizes
from .errors import CellchemError, ChemistryError, RangeWarning
from .ions import Ion, ion_values
from .solutions import Value, ion_concentrations, read_solutes
from .water import AVOGADRO, BOLTZMANN, ELEMENTARY_CHARGE, VACUUM_PERMITTIVITY, water_permittivity

WATER_VISCOSITY_25 = 0.8900e-3  # Pa s, IAPWS 2008 at 25 C and 0.1 MPa (from memory)
TRUSTED_TO = 0.02  # mol/L
USABLE_TO = 0.1  # mol/L
PAIRED_TRUSTED_TO = 0.001  # mol/L, with multiply charged ions of both signs
DEFAULT_ALPHA = 0.019  # per K, common practice
DEFAULT_SIZE = 3.0  # angstrom, for ions without a Kielland size


def _limiting() -> dict[tuple, float]:
    return ion_values("ionic_conductivities.csv", "lambda")


def limiting_conductivity(ion: Ion) -> float | None:
    """The limiting conductivity per unit charge of an ion at 25 C in
    S cm2/mol (lambda of 1/z X^z), or None when the table has none."""
    return _limiting().get((ion.key, ion.charge))


def _constants() -> tuple[float, float, float]:
    """(kappa per sqrt(I) in 1/m, Bjerrum length in m, B in 1/angstrom) at 25 C, molar basis."""
    kelvin = 298.15
    eps = water_permittivity(25.0)
    e2 = ELEMENTARY_CHARGE**2
    kappa = math.sqrt(2 * e2 * AVOGADRO * 1000.0 / (VACUUM_PERMITTIVITY * eps * BOLTZMANN * kelvin))
    bjerrum = e2 / (4 * math.pi * VACUUM_PERMITTIVITY * eps * BOLTZMANN * kelvin)
    return kappa, bjerrum, kappa * 1e-10


def conductivity(
    solutes,
    temperature_c: float = 25.0,
    *,
    unit: str = "mol/L",
    temperature_coefficient: float = DEFAULT_ALPHA,
    outside_range: str = "refuse",
) -> Value:
    """Estimated electrical conductivity of a dilute solution, in uS/cm.

    Args:
        solutes: pairs ``(formula or ion, concentration)`` or a mapping, as
            for ``ionic_strength`` (molar units only: mol/L, mmol/L, g/L, mg/L,
            ppm, % w/v, eq/L, meq/L).
        temperature_c: 25 (the reference temperature of compensated meters),
            or 15-35 C through linear compensation.
        unit: unit of plain-number concentrations (default mol/L).
        temperature_coefficient: alpha of the linear compensation, per K.
        outside_range: ``'refuse'`` (default) past I = 0.02 mol/L, or
            ``'warn'`` to have the estimate to I = 0.1 mol/L, or above what dissolves,
            with a warning.

    Returns:
        A Value in uS/cm with notes (model, range, approximations) and
        details (each ion's concentration and conductivity).

    Raises:
        CellchemError: unreadable input; an ion without a limiting conductivity
            in the table; a weak electrolyte; outside the range.

    >>> round(conductivity([("KCl", 0.01)]))
    1411
    """
    if outside_range not in ("refuse", "warn"):
        raise CellchemError(f"outside_range: expected 'refuse' or 'warn', read {outside_range!r}")
    if isinstance(temperature_c, bool) or not isinstance(temperature_c, int | float):
        raise CellchemError(f"temperature_c: expected a number of degrees Celsius, read {temperature_c!r}")
    if not (15.0 <= float(temperature_c) <= 35.0):
        raise CellchemError(
            f"temperature_c: {temperature_c!r} is outside 15-35 C, where linear temperature compensation of"
            " conductivity holds; measure with a compensated meter and compare at 25 C"
        )
    if (
        isinstance(temperature_coefficient, bool)
        or not isinstance(temperature_coefficient, int | float)
        or not (0 <= temperature_coefficient <= 0.05)
    ):
        raise CellchemError(
            "temperature_coefficient: expected a fraction per K between 0 and 0.05, read"
            f" {temperature_coefficient!r}"
        )
    basis, read, notes = read_solutes(solutes, unit, what="conductivity", outside_range=outside_range)
    if basis != "mol/L":
        raise CellchemError(
            "conductivity needs molar concentrations (per litre of solution); give mol/L, mmol/L, g/L or mg/L"
        )
    conc = {ion: c for ion, c in ion_concentrations(read).items() if c > 0}
    if not conc:
        return Value(
            0.0, "uS/cm", ("no ions: the conductivity of pure water (about 0.055 uS/cm) is not added",)
        )
    lam0: dict[Ion, float] = {}
    missing = []
    for ion in conc:
        value = limiting_conductivity(ion)
        if value is None:
            missing.append(ion.label)
        else:
            lam0[ion] = value
    if missing:
        raise ChemistryError(
            f"no limiting ionic conductivity for {', '.join(missing)} in cellchem's table; the estimate needs"
            " one for every ion"
        )
    strength = 0.5 * sum(c * ion.charge**2 for ion, c in conc.items())
    extra: list[str] = []
    paired = any(i.charge >= 2 for i in conc) and any(i.charge <= -2 for i in conc)
    trusted = PAIRED_TRUSTED_TO if paired else TRUSTED_TO
    if strength > trusted * (1 + 1e-9):
        text = f"ionic strength {strength:g} mol/L is above {trusted:g}, to which the estimate is trusted"
        if paired:
            text += " for a solution of multiply charged cations and anions (ion pairs form)"
        if outside_range == "refuse" or strength > USABLE_TO * (1 + 1e-9):
            more = (
                "; pass outside_range='warn' for an estimate up to 0.1 mol/L"
                if strength <= USABLE_TO
                else f"; above {USABLE_TO:g} mol/L the model does not hold"
            )
            raise ChemistryError(text + more)
        text += " (expect an error of a few percent)"
        warnings.warn(text, RangeWarning, stacklevel=2)
        extra.append(text)

    kappa_per_root, bjerrum, b_per_root = _constants()
    root = math.sqrt(strength)
    kappa = kappa_per_root * root
    faraday = ELEMENTARY_CHARGE * AVOGADRO
    electrophoretic_unit = (
        faraday * ELEMENTARY_CHARGE * kappa / (6 * math.pi * WATER_VISCOSITY_25) * 1e4
    )  # S cm2/mol
    sizes = _sizes()

    def mean_counter(sign: int) -> tuple[float, float, float]:
        """Equivalent-weighted mean |z|, lambda0 and size of the ions of that sign."""
        group = [(ion, c) for ion, c in conc.items() if (ion.charge > 0) == (sign > 0)]
        eq = sum(c * abs(ion.charge) for ion, c in group)
        z = sum(c * abs(ion.charge) * abs(ion.charge) for ion, c in group) / eq
        lam = sum(c * abs(ion.charge) * lam0[ion] for ion, c in group) / eq
        size = (
            sum(c * abs(ion.charge) * sizes.get((ion.key, ion.charge), DEFAULT_SIZE) for ion, c in group) / eq
        )
        return z, lam, size

    signs = {ion.charge > 0 for ion in conc}
    if len(signs) < 2:
        raise ChemistryError("the solution holds ions of one sign only; give a neutral set of solutes")
    counter = {True: mean_counter(-1), False: mean_counter(1)}
    several = sum(1 for ion in conc if ion.charge > 0) > 1 or sum(1 for ion in conc if ion.charge < 0) > 1
    total = 0.0
    details = []
    for ion, c in conc.items():
        zi = abs(ion.charge)
        zj, lj, aj = counter[ion.charge > 0]
        li = lam0[ion]
        q = zi * zj * (li + lj) / ((zi + zj) * (zj * li + zi * lj))
        relaxation = zi * zj * q * bjerrum * kappa / (3 * (1 + math.sqrt(q)))
        ai = sizes.get((ion.key, ion.charge), DEFAULT_SIZE)
        damping = 1 + b_per_root * (ai + aj) / 2 * root
        lam = li - (relaxation * li + zi * electrophoretic_unit) / damping
        total += c * zi * lam  # S cm2/mol per equivalent, times eq/L
        details.append((ion.label, c, li, lam))
    kappa_25 = total * 1000.0  # uS/cm: (mol/L -> mol/cm3 is 1e-3) * 1e6
    notes_out = [
        f"estimate from limiting ionic conductivities (CRC) with the Onsager correction"
        f" (Robinson and Stokes), I = {strength:g} mol/L",
        *extra,
    ]
    if several:
        notes_out.append("mixture: each ion's counter-ion taken as the mean of the ions of the other sign")
    if paired:
        notes_out.append(
            "salts of two multiply charged ions (such as MgSO4) form ion pairs, which the model leaves out:"
            " the estimate is high"
        )
    t = float(temperature_c)
    value = kappa_25
    if t != 25.0:
        value = kappa_25 * (1 + temperature_coefficient * (t - 25.0))
        notes_out.append(
            f"at {t:g} C by linear compensation from 25 C with alpha = {temperature_coefficient:g} per K"
            " (common practice; acids and bases differ)"
        )
    notes_out.extend(notes)
    return Value(value, "uS/cm", notes_out, tuple(details))
